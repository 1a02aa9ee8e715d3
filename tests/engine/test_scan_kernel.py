"""The compiled pair scan against the numpy path it replaces.

Reference: the materialised pruned graph (candidates.pruned_edges, less its bye
edges), weights.weight_array, sparse.best_per_vertex, and reduced costs in
Python integers (checked against certificate.reduced_costs where they are not
clipped). Duals come from blossom.perfect_matching on a sparse subgraph, so real
nested blossoms appear, and from random laminar families.
"""

from __future__ import annotations

import random
from dataclasses import dataclass
from typing import Any

import numpy as np
import pytest

from tests.engine.engine_support import random_history, state_of
from pairings.engine import candidates, certificate, implicit, scan, sparse, weights
from pairings.engine.blossom import Dual, perfect_matching
from pairings.engine.criteria import REMATCH, Field
from pairings.engine.vector import WIDTH, Arrays
from pairings.fold import fold
from pairings.simulate import simulate_events

pytestmark = pytest.mark.skipif(not scan.available(), reason="the scan kernel is not built")


@dataclass
class Case:
    n: int
    """Vertices of the pruned graph (players, plus the bye vertex when odd)."""
    players: int
    u: Any
    v: Any
    costs: Any
    w: Any
    enc: weights.Encoder
    scan: scan.PairScan
    pruned: candidates.Pruned


def field(kind: str, n: int, played: int, seed: int) -> Field:
    rng = random.Random(seed)
    if kind == "simulated":
        state = fold(enumerate(simulate_events(n, 9, played, seed, withdrawals=0.02, requested_byes=0.03), 1))
    else:  # random pairings: rematches, side trouble; sides off, two meetings, final-round exemption
        settings: dict[str, Any] = rng.choice([{}, {"sides": None}, {"max_meetings": 2}, {"final_round_side_exception": True},
                               {"scoring": {"win": 3, "draw": 1, "loss": 0}}])
        state = state_of(random_history(n, played, seed, withdraw=0.03, byes=0.03, **settings))
    rnd = state.next_round_number
    here = list(state.available(rnd))
    # Do-not-pair pairs for this draft (H5): the scan must skip them.
    extra = [tuple(rng.sample(here, 2)) for _ in range(rng.randint(0, len(here)))] if len(here) > 1 else []
    return Field(state, rnd, here, extra_forbidden=extra)  # type: ignore[arg-type]


def case_of(fld: Field, threads: int = scan.THREADS) -> Case | None:
    """The pruned graph as pruned_edges builds it, and a scan over the same arguments."""
    order = list(fld.order)
    bound = candidates.greedy_bound(fld, order, ())
    if bound is None or len(order) < 2:
        return None
    pr = candidates.pruned_edges(fld, order, (), bound)
    assert pr is not None
    # The scan's rows are what the engine weighs: side-rule net of unavoidable breaks (implicit.net).
    costs = implicit.net(pr.arrays, pr.u, pr.v, pr.costs.astype(np.int64))
    w = weights.weight_array(costs, pr.n)
    enc = weights.from_maxima([int(x) for x in costs.max(axis=0)], set(costs[:, weights.GAP_INDEX].tolist()), pr.n)
    enc = weights.Encoder(enc.levels, enc.place, int(w[0]) + enc.cost(tuple(costs[0].tolist())))
    real = pr.v < len(order)
    sc = scan.PairScan(Arrays(fld, order), bound.max_gap, bound.totals, bound.levels, threads=threads)
    return Case(pr.n, len(order), pr.u[real], pr.v[real], costs[real], w[real], enc, sc, pr)


def pairs_of(u: Any, v: Any, mask: Any) -> list[tuple[int, int]]:
    return sorted(zip(u[mask].tolist(), v[mask].tolist()))


def exact_rc(c: Case, dual: Dual) -> Any:
    """Doubled reduced costs in Python integers, blossom by blossom (any family of odd sets)."""
    y2 = np.array(dual.y2, dtype=object)
    rc = y2[c.u] + y2[c.v] - 2 * c.w.astype(object)
    for members, z in dual.blossoms:
        inside = np.zeros(c.n, dtype=bool)
        inside[list(members)] = True
        both = inside[c.u] & inside[c.v]
        rc[both] = rc[both] + 2 * z
    return rc


def check_stats(c: Case) -> None:
    st = c.scan.stats()
    assert st.count == len(c.u)
    assert st.maxima == (tuple(int(x) for x in c.costs.max(axis=0)) if len(c.u) else (0,) * WIDTH)
    assert st.gaps == frozenset(c.costs[:, weights.GAP_INDEX].tolist())
    assert st.rematch_free == int((c.costs[:, REMATCH] == 0).sum())


def fits(c: Case) -> bool:
    """The encoder is within the kernel's integers (scan.COST_LIMIT, from the column bounds)."""
    return c.enc.top < scan.COST_LIMIT and max(2 * c.players, 2) * sum(c.enc.place) < scan.COST_LIMIT


def check_heaviest(c: Case, k: int) -> None:
    if not fits(c):
        with pytest.raises(ValueError):
            c.scan.heaviest(c.enc, k)
        return
    i, j = c.scan.heaviest(c.enc, k)
    assert list(zip(i.tolist(), j.tolist())) == \
        pairs_of(c.u, c.v, sparse.best_per_vertex(c.u, c.v, c.w, np.ones(len(c.u), dtype=bool), k))
    # The encoder's weight is the one weight_array gives (the reference's scores).
    some = range(0, len(c.u), max(1, len(c.u) // 50))
    assert [c.enc.weight(tuple(c.costs[x].tolist())) for x in some] == [int(c.w[x]) for x in some]


def check_violated(c: Case, dual: Dual, k: int) -> None:
    rc = exact_rc(c, dual)
    if not fits(c) or max(abs(x) for x in dual.y2) >= scan.LIMIT:
        with pytest.raises(ValueError):
            c.scan.violated(c.enc, dual, k)
        return
    bad = np.array([x < 0 for x in rc.tolist()], dtype=bool)
    i, j, count = c.scan.violated(c.enc, dual, k)
    assert count == int(bad.sum())
    assert list(zip(i.tolist(), j.tolist())) == pairs_of(c.u, c.v, sparse.best_per_vertex(c.u, c.v, -rc, bad, k))
    # The same walk's tight pairs (canonical.py reads them): exactly the rows with a zero reduced cost.
    found = c.scan.check(c.enc, dual, k)
    zero = np.array([x == 0 for x in rc.tolist()], dtype=bool)
    assert list(zip(found.tight_i.tolist(), found.tight_j.tolist())) == pairs_of(c.u, c.v, zero)


def sparse_dual(c: Case) -> Dual | None:
    """The dual of blossom.perfect_matching on the engine's first sparse subgraph."""
    pr = c.pruned
    w = weights.weight_array(pr.costs, pr.n)
    rank = pr.costs[:, candidates.RANK_INDEX]
    mask = rank <= 3
    for _ in range(4):
        idx = np.flatnonzero(mask)
        sub = list(zip(pr.u[idx].tolist(), pr.v[idx].tolist(), w[idx].tolist()))
        result = perfect_matching(pr.n, sub)
        if result is not None:
            return result[1]
        mask |= rank <= 12
        mask[::2] = True
    return None


def laminar(n: int, rng: random.Random, top: int) -> list[tuple[frozenset[int], int]]:
    """A random laminar family of odd sets: merge an odd number of odd clusters, again and again."""
    clusters = [frozenset([v]) for v in range(n)]
    out = []
    for _ in range(rng.randint(0, n)):
        if len(clusters) < 3:
            break
        rng.shuffle(clusters)
        take = rng.choice([3, 3, 3, 5])
        if take > len(clusters):
            take = 3
        merged = frozenset().union(*clusters[:take])
        clusters = [merged] + clusters[take:]
        out.append((merged, rng.randint(0, top)))
    return out


def random_dual(c: Case, rng: random.Random) -> Dual:
    top = max(int(x) for x in c.w)
    style = rng.choice(["spread", "ties", "tight"])
    if style == "ties":  # equal y: reduced costs repeat, so ties by (i, j) decide
        y2 = [top + rng.randint(-2, 2) // 2 * 2] * c.n
        blossoms = laminar(c.n, rng, 2)
    elif style == "tight":
        y2 = [top + rng.randint(-3, 3) for _ in range(c.n)]
        blossoms = laminar(c.n, rng, max(1, top // 1000))
    else:
        y2 = [rng.randint(0, 2 * top) for _ in range(c.n)]
        blossoms = laminar(c.n, rng, max(1, top // 4))
    return Dual(y2, blossoms)


SMALL = [("simulated" if s % 3 else "rough", random.Random(s).randint(2, 120), random.Random(s + 1).randint(0, 8), s)
         for s in range(60)]
LARGER = [("simulated", random.Random(s).randint(150, 300), random.Random(s).randint(1, 7), s) for s in range(8)]


@pytest.mark.parametrize(("kind", "n", "played", "seed"), SMALL + LARGER)
def test_scan_equals_numpy_path(kind: str, n: int, played: int, seed: int) -> None:
    c = case_of(field(kind, n, played, seed))
    if c is None:
        return
    check_stats(c)
    if not len(c.u):
        return
    rng = random.Random(seed)
    for k in (1, 2, 3, 5):
        check_heaviest(c, k)
    dual = sparse_dual(c)
    if dual is not None:
        rc = exact_rc(c, dual)
        clipped = np.array([max(-certificate.CLIP, min(certificate.CLIP, x)) for x in rc.tolist()], dtype=np.int64)
        assert (certificate.reduced_costs(c.u, c.v, c.w, dual) == clipped).all()  # the reference is the engine's
        for k in (1, 2, 4):
            check_violated(c, dual, k)
    for _ in range(3):
        check_violated(c, random_dual(c, rng), rng.choice([1, 2, 3]))


@pytest.mark.parametrize("seed", range(6))
def test_real_duals_nest_and_threads_agree(seed: int) -> None:
    fld = field("simulated", 200 + 20 * seed, 4, seed)
    c = case_of(fld)
    one = case_of(fld, threads=1)
    assert c is not None and one is not None
    assert c.scan.stats() == one.scan.stats()
    dual = sparse_dual(c)
    assert dual is not None
    if not fits(c):  # a greedy pairing with a hard-rule relaxation: weights beyond 124 bits
        check_heaviest(c, 1)
        check_violated(c, dual, 1)
        return
    for k in (1, 3):
        a, b = c.scan.heaviest(c.enc, k), one.scan.heaviest(c.enc, k)
        assert (a[0] == b[0]).all() and (a[1] == b[1]).all()
        x, y = c.scan.violated(c.enc, dual, k), one.scan.violated(c.enc, dual, k)
        assert (x[0] == y[0]).all() and (x[1] == y[1]).all() and x[2] == y[2]
    deep = Dual(dual.y2, laminar(c.n, random.Random(seed), 5))
    check_violated(c, deep, 2)


@pytest.mark.parametrize("seed", range(2))
def test_scan_at_1000(seed: int) -> None:
    c = case_of(field("simulated", 1000, 4, seed))
    assert c is not None
    check_stats(c)
    check_heaviest(c, 3)
    dual = sparse_dual(c)
    assert dual is not None
    check_violated(c, dual, 2)


def test_values_beyond_the_kernel_range_are_refused() -> None:
    c = case_of(field("simulated", 40, 3, 1))
    assert c is not None
    assert fits(c)
    with pytest.raises(ValueError):
        c.scan.violated(c.enc, Dual([2**122] * c.n, []), 2)
    with pytest.raises(ValueError):  # a z sum along the blossom tree
        c.scan.violated(c.enc, Dual([0] * c.n, [(frozenset([0, 1, 2]), 2**121), (frozenset(range(5)), 2**121)]), 2)
    big = weights.Encoder(c.enc.levels, tuple(2**117 for _ in c.enc.place), 2**118)
    with pytest.raises(ValueError):
        c.scan.heaviest(big, 2)
    short = weights.Encoder(0, c.enc.place[:c.enc.levels + 9], c.enc.top)
    with pytest.raises(ValueError):
        c.scan.heaviest(short, 2)


def test_crossing_sets_are_refused() -> None:
    c = case_of(field("simulated", 40, 3, 2))
    assert c is not None
    crossing = Dual([0] * c.n, [(frozenset([0, 1, 2]), 1), (frozenset([2, 3, 4]), 1)])
    with pytest.raises(ValueError):
        c.scan.violated(c.enc, crossing, 2)


@pytest.mark.parametrize(("n", "played", "seed", "shift"),
                         [(60, 6, 7, 60), (80, 4, 7, 130), (60, 6, 0, 61), (60, 6, 0, 130), (60, 6, 2, 62)])
def test_side_alternation_across_history_words(n: int, played: int, seed: int, shift: int) -> None:
    # Renumbering the rounds keeps their order, so no side allocation changes; with the shift the
    # rounds straddle the kernel's 64-round history words. These fields have sides and pruned pairs
    # whose sides the alternation decides (seeds 0 and 2: some where that changes the side rule cost,
    # the only column it can change: equal wishes of equal strength miss one preference either way).
    fld = field("rough", n, played, seed)
    c = case_of(fld)
    assert c is not None and fld.sides and fits(c)
    order = list(fld.order)
    later = Arrays(fld, order)
    rounds, size = later.history.shape
    history = np.zeros((rounds + shift, size), dtype=np.int64)
    history[1 + shift:] = later.history[1:]
    later.history = history
    # The numpy reference agrees it is the same field.
    assert (implicit.net(later, c.u, c.v, later.costs(c.u, c.v)) == c.costs).all()
    bound = candidates.greedy_bound(fld, order, ())
    assert bound is not None
    moved = Case(c.n, c.players, c.u, c.v, c.costs, c.w, c.enc,
                 scan.PairScan(later, bound.max_gap, bound.totals, bound.levels), c.pruned)
    check_stats(moved)
    for k in (1, 3):
        check_heaviest(moved, k)
    rng = random.Random(seed)
    for _ in range(4):  # many violated pairs per player: the count and lists see most pair weights
        check_violated(moved, random_dual(c, rng), 40)
