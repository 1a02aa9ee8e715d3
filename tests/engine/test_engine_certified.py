"""The certified sparse path: blossom duals, the certificate checker, vectorised costs, fallback.

networkx max_weight_matching as independent solver throughout; the engine's
own full-graph path (compiled solver on every pruned edge) for the larger fields.
"""

from __future__ import annotations

import random
from typing import Any

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tests.engine.engine_support import (
    Edges, checked_perfect, columns, networkx_perfect, random_history, state_of, weight,
)
from pairings.engine import candidates, draft_round, listed, route, solver, sparse
from pairings.engine.blossom import Dual, perfect_matching
from pairings.engine.certificate import certify, reduced_costs
from pairings.engine.criteria import Field
from pairings.engine.vector import Arrays
from pairings.engine.weights import encoder, weight_array
from pairings.fold import fold
from pairings.simulate import simulate_events
from pairings.state import EventState



graphs = st.integers(0, 10**6).map(lambda seed: _graph(seed))


def _graph(seed: int) -> tuple[int, Edges, list[int]]:
    rng = random.Random(seed)
    n = rng.choice([2, 4, 6, 8, 10, 14, 20, 28])
    p = rng.choice([0.3, 0.6, 1.0])
    top = rng.choice([1, 3, 10, 10**6, 2**80])
    edges = [(i, j, rng.randint(0, top)) for i in range(n) for j in range(i + 1, n) if rng.random() < p]
    warm = [k for k in range(len(edges)) if rng.random() < 0.5]
    return n, edges, warm


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(graphs)
def test_blossom_equals_networkx_and_its_dual_certifies(graph: tuple[int, Edges, list[int]]) -> None:
    # networkx max_weight_matching as independent solver; weak LP duality as the check.
    checked_perfect(*graph)


def test_certificate_rejects_a_matching_that_is_not_optimal() -> None:
    # A 4-cycle 0-1-2-3 with weights 5, 1, 5, 1: {01, 23} weighs 10, {12, 03} weighs 2.
    edges = [(0, 1, 5), (1, 2, 1), (2, 3, 5), (0, 3, 1)]
    best = networkx_perfect(4, edges)
    assert best is not None and weight(edges, best) == 10
    got = perfect_matching(4, edges)
    assert got is not None
    pairs, dual = got
    u, v, w = columns(edges)
    assert certify(4, u, v, w, pairs, dual)
    assert certify(4, u, v, w, best, dual)  # networkx's optimum passes with the same dual
    assert not certify(4, u, v, w, [(1, 2), (0, 3)], dual)  # weight 2 < dual objective
    assert not certify(4, u, v, w, [(0, 1)], dual)  # not perfect
    assert not certify(4, u, v, w, [(0, 2), (1, 3)], dual)  # not edges


def test_certificate_rejects_an_infeasible_dual() -> None:
    # The dual of a subgraph does not certify on a graph with a heavier left-out edge.
    sub = [(0, 1, 5), (2, 3, 5), (1, 2, 1), (0, 3, 1)]
    full = sub + [(0, 2, 9), (1, 3, 9)]
    got = perfect_matching(4, sub)
    assert got is not None
    pairs, dual = got
    u, v, w = columns(full)
    assert (reduced_costs(u, v, w, dual) < 0).any()
    assert not certify(4, u, v, w, pairs, dual)
    assert not certify(4, *columns(sub), pairs, Dual([0, 0, 0, 0], []))  # objective 0 != 10
    assert not certify(4, *columns(sub), pairs, Dual(dual.y2, [(frozenset({0, 1, 2}), -1)]))


def test_triangle_blossom_dual_is_needed_and_checked() -> None:
    # Two triangles joined by one light edge: the fractional bound (1/2 on each triangle)
    # is not tight, so a certificate needs odd-set duals (Edmonds 1965).
    edges = [(0, 1, 10), (1, 2, 10), (0, 2, 10), (3, 4, 10), (4, 5, 10), (3, 5, 10), (2, 3, 1)]
    got = perfect_matching(6, edges)
    assert got is not None
    pairs, dual = got
    assert weight(edges, pairs) == 21
    assert dual.blossoms, "no blossom dual: the bound could not be tight"
    assert certify(6, *columns(edges), pairs, dual)
    assert not certify(6, *columns(edges), pairs, Dual(dual.y2, []))


def fields(count: int, seed: int, low: int = 2, top: int = 60) -> list[tuple[int, int, int, bool]]:
    rng = random.Random(seed)
    return [(rng.randint(low, top), rng.randint(0, 8),
             rng.randint(0, 10**6), rng.random() < 0.3) for k in range(count)]


def field_of(n: int, played: int, seed: int, rough: bool) -> tuple[Field, list[str]]:
    if rough:  # random pairings: rematches, side trouble, odd structure
        state = state_of(random_history(min(n, 40), played, seed, withdraw=0.03, byes=0.03))
    else:
        state = fold(enumerate(simulate_events(n, 9, played, seed, withdrawals=0.02, requested_byes=0.03), 1))
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    return fld, list(fld.order)


@pytest.mark.parametrize(("n", "played", "seed", "rough"), fields(40, 3))
def test_vector_costs_equal_field_pair(n: int, played: int, seed: int, rough: bool) -> None:
    fld, order = field_of(min(n, 80), played, seed, rough)
    i, j = (x.astype(np.int64) for x in np.triu_indices(len(order), 1))
    rows = Arrays(fld, order).costs(i, j)
    for k in range(len(i)):
        assert tuple(rows[k]) == fld.pair(order[i[k]], order[j[k]])[1]


@pytest.mark.parametrize(("n", "played", "seed", "rough"),
                         [*fields(100, 5), *(pytest.param(*f, marks=pytest.mark.full) for f in fields(20, 6, 150, 300))])
def test_certified_path_equals_full_graph_path(n: int, played: int, seed: int, rough: bool) -> None:
    fld, order = field_of(n, played, seed, rough)
    bound = candidates.greedy_bound(fld, order, ())
    if bound is None or len(order) < 2:
        return
    pr = candidates.pruned_edges(fld, order, (), bound)
    assert pr is not None
    w = weight_array(pr.costs, pr.n)
    enc = encoder([tuple(r) for r in pr.costs.tolist()], pr.n)  # once: it reads every row
    assert w.tolist() == [enc.weight(tuple(r)) for r in pr.costs.tolist()]
    solved = listed.listed_matching(fld, order, (), bound)
    edges = list(zip(pr.u.tolist(), pr.v.tolist(), w.tolist()))
    full = networkx_perfect(pr.n, edges)  # networkx as independent solver on every pruned pair
    assert full is not None  # the greedy pairing is a full pairing of the pruned pairs
    assert weight(edges, solved.pairs) == weight(edges, full)
    if solved.route.certified:
        assert solved.route.sparse_edges <= len(edges)


def simulated_pruned(n: int, seed: int) -> tuple[EventState, Field, list[str], candidates.Pruned, Any]:
    """A simulated field drafting round 5 of 9: state, field, rank order, listed pruned graph, weights."""
    state = fold(enumerate(simulate_events(n, 9, 4, seed), 1))
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    order = list(fld.order)
    pr = candidates.pruned_edges(fld, order, ())
    assert pr is not None
    return state, fld, order, pr, weight_array(pr.costs, pr.n)


def test_fallback_engages_and_stays_exact(monkeypatch: pytest.MonkeyPatch) -> None:
    # Without the side-class seed and with one heaviest pair per player, the first sparse optimum
    # of a 160-player field fails the certificate; with one solve only, the blossom on every
    # listed pair must take over, same cost vector.
    state, fld, order, _, _ = simulated_pruned(160, 2)
    monkeypatch.setattr(sparse, "ideal_partners", lambda a, near=0, wide=0: (a.units[:0], a.units[:0]))
    monkeypatch.setattr(sparse, "SPARSE_BEST", 1)
    bound = candidates.greedy_bound(fld, order, ())
    assert bound is not None
    first = listed.listed_matching(fld, order, (), bound)
    assert first.route.certified and first.route.rounds > 1  # the first sparse solve alone was not optimal
    monkeypatch.setattr(sparse, "SOLVES", 1)
    monkeypatch.setattr(route, "USE_IMPLICIT", False)  # the listed route (implicit: its own test)
    again, used, _ = route.engine_matching(fld, order, ())
    assert used is not None and used.path == "listed" and not used.certified
    assert again == first.pairs  # the same canonical optimum
    assert draft_round(state).key() == draft_round(state, reference=True).key()


@pytest.mark.full
@pytest.mark.parametrize("seed", range(3))
def test_certified_path_at_1000(seed: int) -> None:
    rx = pytest.importorskip("rustworkx")  # rustworkx as independent (compiled) solver
    _, fld, order, pr, w = simulated_pruned(1000, seed)
    bound = candidates.greedy_bound(fld, order, ())
    assert bound is not None
    solved = listed.listed_matching(fld, order, (), bound)
    edges = list(zip(pr.u.tolist(), pr.v.tolist(), w.tolist()))
    assert solved.route.certified
    g = rx.PyGraph()
    g.add_nodes_from(range(pr.n))
    g.add_edges_from(edges)
    full = rx.max_weight_matching(g, max_cardinality=True, weight_fn=lambda x: x)
    assert weight(edges, solved.pairs) == weight(edges, list(full))


def ideal_partners_by_hand(a: Arrays, near: int, wide: int) -> set[tuple[int, int]]:
    """Brute force, player by player, of the rule in sparse.ideal_partners' docstring."""
    out = set()
    n = a.n
    for i in range(n):
        group = [j for j in range(n) if a.units[j] == a.units[i]]
        half = int(a.gsize[i]) // 2
        for c in (-1, 0, 1):
            members = [j for j in group if a.want[j] == c]  # group rank order
            reach = near if a.want[i] != 0 and a.want[i] == c else wide
            for target in (a.grank[i] + half, a.grank[i] - half):
                below = [j for j in members if a.grank[j] < target][-reach:]
                above = [j for j in members if a.grank[j] >= target][:reach]
                out |= {(min(i, j), max(i, j)) for j in below + above if j != i}
        lower = [j for j in range(n) if a.units[j] < a.units[i]]
        if a.grank[i] >= a.gsize[i] - 2 * near and lower:
            nxt = [j for j in lower if a.units[j] == a.units[lower[0]]]
            for c in (-1, 0, 1):
                out |= {(i, j) for j in [j for j in nxt if a.want[j] == c][:2 * near]}
    return out


@pytest.mark.parametrize(("n", "played", "seed", "rough"), fields(12, 7))
def test_ideal_partners_equal_brute_force(n: int, played: int, seed: int, rough: bool) -> None:
    fld, order = field_of(n, played, seed, rough)
    a = Arrays(fld, order)
    for near, wide in ((1, 1), (2, 2), (4, 4), (1, 3), (2, 7)):
        i, j = sparse.ideal_partners(a, near, wide)
        assert set(zip(i.tolist(), j.tolist())) == ideal_partners_by_hand(a, near, wide)


@settings(max_examples=60, deadline=None)
@given(st.integers(0, 10**6), st.sampled_from([2**20, 2**70, 2**95, 2**130]))
def test_reduced_costs_equal_python_integers(seed: int, top: int) -> None:
    # Exact Python-integer arithmetic as the reference for the two-limb int64 computation.
    rng = random.Random(seed)
    n = 8
    edges = [(i, j, rng.randint(0, top)) for i in range(n) for j in range(i + 1, n) if rng.random() < 0.7]
    if not edges:
        return
    y2 = [rng.randint(-top, 2 * top) for _ in range(n)]
    if seed % 2:  # laminar, as Edmonds' duals are: nested odd prefixes of a shuffle, one disjoint triple
        order = rng.sample(range(n), n)
        sets = [order[:1 + 2 * k] for k in (1, 2) if rng.random() < 0.8] + [order[:3], order[5:8], order[6:7]]
    else:  # any odd sets: the certificate's bound holds for every family
        sets = [rng.sample(range(n), 3) for _ in range(3)]
    blossoms = [(frozenset(b), rng.randint(0, top)) for b in sets]
    u, v, _ = columns([(a, b, 0) for a, b, _ in edges])
    w = np.array([e[2] for e in edges], dtype=object if top > 2**60 else np.int64)
    got = reduced_costs(u, v, w, Dual(y2, blossoms)).tolist()
    for (a, b, wt), rc in zip(edges, got):
        exact = y2[a] + y2[b] - 2 * wt + 2 * sum(z for m, z in blossoms if a in m and b in m)
        assert rc == max(-2**62, min(2**62, exact))


def greedy_pair_by_pair(fld: Field, order: list[str]) -> tuple[list[tuple[int, ...]], list[tuple[int, int]]] | None:
    """candidates.greedy's rule, read from its docstring, with Field.pair one pair at a time."""
    index = {p: k for k, p in enumerate(order)}
    free = list(order)
    out: list[tuple[int, ...]] = []
    pairs: list[tuple[int, int]] = []
    if len(free) % 2:
        bye = min(reversed(free), key=lambda p: (not fld.forced(p), fld.bye(p)))
        out.append(fld.bye(bye))
        pairs.append((index[bye], len(order)))
        free.remove(bye)
    while free:
        p = free.pop(0)
        found = None
        for scope in (free[:candidates.GREEDY_WINDOW], free):
            costs = [(fld.pair(p, q)[1], k) for k, q in enumerate(scope) if not fld.forbidden(p, q)]
            found = min(costs) if costs else None
            if found is not None and not any(found[0][:candidates.HARD]):
                break
        if found is None:
            return None
        out.append(found[0])
        pairs.append((index[p], index[free.pop(found[1])]))
    return out, pairs


@pytest.mark.parametrize("window", [candidates.GREEDY_WINDOW, 3])
@pytest.mark.parametrize(("n", "played", "seed", "rough"), [*fields(30, 13, 2, 400), *fields(15, 14)])
def test_greedy_equals_pair_by_pair(n: int, played: int, seed: int, rough: bool, window: int,
                                    monkeypatch: pytest.MonkeyPatch) -> None:
    # A window of 3 also takes the costs of pairs beyond the ones costed in bulk (candidates._Ahead).
    monkeypatch.setattr(candidates, "GREEDY_WINDOW", window)
    fld, order = field_of(n, played, seed, rough)
    assert candidates.greedy(fld, order, ()) == greedy_pair_by_pair(fld, order)


@pytest.mark.parametrize("seed", range(40))
def test_most_paired_is_a_maximum_matching(seed: int) -> None:
    # networkx's maximum-cardinality matching as the independent reference for its size.
    rng = random.Random(seed)
    n = rng.choice([2, 5, 8, 11, 16])
    p = rng.choice([0.1, 0.25, 0.5])
    edges = [(i, j) for i in range(n) for j in range(i + 1, n) if rng.random() < p]
    u = np.array([i for i, _ in edges], dtype=np.int64)
    v = np.array([j for _, j in edges], dtype=np.int64)
    pairs = route.most_paired(n, u, v)
    assert set(pairs) <= set(edges) and len({x for pair in pairs for x in pair}) == 2 * len(pairs)
    assert len(pairs) == len(solver.reference_matching(n, [(i, j, 1) for i, j in edges]))
