"""The compiled blossom kernel (pairings.engine._blossom_c) against networkx and the pure-Python search.

networkx ``max_weight_matching(maxcardinality=True)`` is the independent solver throughout; every
returned dual is checked for feasibility and complementary slackness by
:func:`tests.engine.engine_support.assert_optimal_dual` (code of its own, not the solver's) or, on
large graphs, by :func:`pairings.engine.certificate.certify` (weak LP duality). The pure-Python
search (``blossom.USE_COMPILED = False``) is the same design as the kernel, so on the same input
both must return the same matching and the same dual, ties included.
"""

from __future__ import annotations

import random
from typing import Any, Iterator

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tests.engine.engine_support import (Edges, assert_optimal_dual, checked_perfect, columns, networkx_perfect,
                                         weight)
from pairings.engine import blossom, candidates, certificate, sparse
from pairings.engine.blossom import Dual, perfect_matching, perfect_matching_arrays
from pairings.engine.criteria import Field
from pairings.engine.weights import weight_array
from pairings.fold import fold
from pairings.simulate import simulate_events

Result = tuple[list[tuple[int, int]], Dual] | None

pytestmark = pytest.mark.skipif(blossom._kernel is None, reason="compiled blossom kernel not built")


def certifies(n: int, edges: Edges, result: Result) -> bool:
    assert result is not None
    return certificate.certify(n, *columns(edges), *result)


@pytest.fixture
def python_only(monkeypatch: pytest.MonkeyPatch) -> Iterator[None]:
    monkeypatch.setattr(blossom, "USE_COMPILED", False)
    yield


def python_solve(n: int, edges: Edges, warm: list[int] = [], dual: Dual | None = None) -> Result:
    saved = blossom.USE_COMPILED
    blossom.USE_COMPILED = False
    try:
        return perfect_matching(n, edges, warm, dual)
    finally:
        blossom.USE_COMPILED = saved


def random_graph(seed: int) -> tuple[int, Edges, list[int]]:
    rng = random.Random(seed)
    n = rng.choice([0, 2, 4, 6, 8, 10, 14, 20, 28, 40])
    p = rng.choice([0.15, 0.3, 0.6, 1.0])
    top = rng.choice([1, 2, 3, 10, 10**6, 2**62, 2**80, 2**100])  # 1, 2 and 3: many ties
    low = rng.choice([0, 0, -top])
    edges = [(i, j, rng.randint(low, top)) for i in range(n) for j in range(i + 1, n) if rng.random() < p]
    rng.shuffle(edges)
    edges = [(b, a, w) if rng.random() < 0.5 else (a, b, w) for a, b, w in edges]
    where = {(min(a, b), max(a, b)): k for k, (a, b, _) in enumerate(edges)}
    best = networkx_perfect(n, edges)
    kind = rng.choice(["none", "good", "bad"])
    if kind == "good" and best is not None:
        warm = [where[p] for p in best]
    elif kind == "bad":
        warm = [k for k in range(len(edges)) if rng.random() < 0.3]
    else:
        warm = []
    return n, edges, warm


@settings(max_examples=400, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.integers(0, 10**9))
def test_kernel_equals_networkx_and_its_dual_certifies(seed: int) -> None:
    n, edges, warm = random_graph(seed)
    assert blossom.compiled()
    got = checked_perfect(n, edges, warm)
    if got is None:
        return
    assert_optimal_dual(n, edges, *got)
    assert python_solve(n, edges, warm) == got  # one design: the same matching and the same dual


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.integers(0, 10**9))
def test_carried_dual_and_previous_pairs_as_warm_start(seed: int) -> None:
    # As sparse.certify does: solve a subset, then more edges from that dual and matching.
    rng = random.Random(seed)
    n, edges, _ = random_graph(seed)
    chosen = networkx_perfect(n, edges)
    if chosen is None:
        return
    sub = [e for e in edges if rng.random() < rng.choice([0.3, 0.6, 0.9])]
    if rng.random() < 0.7:  # usually keep some perfect matching inside the subset
        have = {(min(a, b), max(a, b)) for a, b, _ in sub}
        sub += [e for e in edges if (min(e[0], e[1]), max(e[0], e[1])) in set(chosen) - have]
    first = perfect_matching(n, sub)
    if first is None:
        assert networkx_perfect(n, sub) is None
        return
    assert certifies(n, sub, first)
    pairs, dual = first
    where = {(min(a, b), max(a, b)): k for k, (a, b, _) in enumerate(edges)}
    warm = [where[p] for p in pairs]
    got = perfect_matching(n, edges, warm, dual)
    assert got is not None
    assert weight(edges, got[0]) == weight(edges, chosen)
    assert_optimal_dual(n, edges, *got)
    assert python_solve(n, edges, warm, dual) == got
    u, v, w = columns(edges)
    arrays = perfect_matching_arrays(n, u, v, w, [(b, a) for a, b in pairs], dual)  # pairs in either order
    assert arrays == got


def test_arrays_entry_point_takes_int64_and_object_weights_and_ignores_non_edges() -> None:
    rng = random.Random(5)
    n = 30
    edges = [(i, j, rng.randint(0, 2**70)) for i in range(n) for j in range(i + 1, n) if rng.random() < 0.4]
    expected = networkx_perfect(n, edges)
    assert expected is not None
    u, v, w = columns(edges)
    assert w.dtype == object
    small = [(a, b, x % 1000) for a, b, x in edges]
    for es, ws in ((edges, w), (small, np.array([e[2] for e in small], dtype=np.int64)),
                   (small, np.array([e[2] for e in small], dtype=object))):
        best = networkx_perfect(n, es)
        assert best is not None
        for warm in ([], best, [(0, 0), (1, 2), (n + 5, 3)]):
            got = perfect_matching_arrays(n, u, v, ws, warm)
            assert got is not None
            assert weight(es, got[0]) == weight(es, best)
            assert certifies(n, es, got)


def test_no_perfect_matching_is_none() -> None:
    assert perfect_matching(3, [(0, 1, 1), (1, 2, 1)]) is None  # odd
    assert perfect_matching(4, [(0, 1, 1), (0, 2, 1), (0, 3, 1)]) is None  # a star
    assert perfect_matching(4, [(0, 1, 1)]) is None  # isolated vertices
    empty = np.zeros(0, dtype=np.int64)
    assert perfect_matching_arrays(2, empty, empty, empty) is None
    got = perfect_matching_arrays(0, empty, empty, empty)
    assert got is not None and got[0] == [] and got[1].y2 == []


def test_weights_beyond_the_kernel_run_the_python_code() -> None:
    # |w| >= 2**118 is outside the kernel's __int128 range guarantee: same answer, from Python.
    rng = random.Random(11)
    n = 12
    edges = [(i, j, rng.randint(0, 2**130)) for i in range(n) for j in range(i + 1, n)]
    expected = networkx_perfect(n, edges)
    assert expected is not None
    got = perfect_matching(n, edges)
    assert got is not None and weight(edges, got[0]) == weight(edges, expected)
    assert certifies(n, edges, got)


def test_same_input_same_output() -> None:
    rng = random.Random(3)
    n = 200
    edges = [(i, j, rng.randint(0, 5)) for i in range(n) for j in range(i + 1, n) if rng.random() < 0.1]
    first = perfect_matching(n, edges)
    assert first is not None
    for _ in range(3):
        again = perfect_matching(n, edges)
        assert again is not None
        assert again[0] == first[0] and again[1].y2 == first[1].y2 and again[1].blossoms == first[1].blossoms


def test_python_only_fixture_switches_the_kernel_off(python_only: None) -> None:
    assert not blossom.compiled()
    got = perfect_matching(4, [(0, 1, 5), (2, 3, 5), (1, 2, 1), (0, 3, 1)])
    assert got is not None and got[0] == [(0, 1), (2, 3)]


def engine_sparse(n: int, seed: int) -> tuple[int, Any, Any, Any, Any] | None:
    """The engine's pruned graph and a sparse mask of it: the pairs near the rank-order ideal and the heaviest."""
    state = fold(enumerate(simulate_events(n, 9, 4, seed, withdrawals=0.02, requested_byes=0.03), 1))
    rnd = state.next_round_number
    fld = Field(state, rnd, state.available(rnd))
    pr = candidates.pruned_edges(fld, list(fld.order), ())
    if pr is None:
        return None
    w = weight_array(pr.costs, pr.n)
    rank = pr.costs[:, candidates.RANK_INDEX]
    split = certificate.limbs(w)
    score = w if split is None or w.dtype != object else split[0] * 2.0**certificate.SHIFT + split[1]
    mask = (rank <= 3) | sparse.best_per_vertex(pr.u, pr.v, score, np.ones(len(pr.u), dtype=bool),
                                                sparse.SPARSE_BEST)
    return pr.n, pr.u, pr.v, w, mask


@pytest.mark.parametrize(("n", "seed"), [(40, 1), (61, 2), (120, 3), (255, 4), (400, 5)])
def test_engine_fields_compiled_equals_python(n: int, seed: int) -> None:
    built = engine_sparse(n, seed)
    assert built is not None
    nn, u, v, w, mask = built
    idx = np.flatnonzero(mask)
    su, sv, sw = u[idx], v[idx], w[idx]
    sub = list(zip(su.tolist(), sv.tolist(), sw.tolist()))
    got = perfect_matching_arrays(nn, su, sv, sw)
    assert got is not None and python_solve(nn, sub) == got
    assert got[1].objective2() == 2 * weight(sub, got[0])
    assert certificate.certify(nn, su, sv, sw, *got)
    # The engine's next round: every pruned edge, from the sparse dual and matching.
    full = list(zip(u.tolist(), v.tolist(), w.tolist()))
    where = {(a, b): k for k, (a, b, _) in enumerate(full)}
    again = perfect_matching_arrays(nn, u, v, w, got[0], got[1])
    assert again is not None and python_solve(nn, full, [where[p] for p in got[0]], got[1]) == again
    assert again[1].objective2() == 2 * weight(full, again[0])
    assert certificate.certify(nn, u, v, w, *again)
    expected = networkx_perfect(nn, full) if nn <= 130 else None
    if expected is not None:
        assert weight(full, again[0]) == weight(full, expected)


def test_weights_around_the_int64_edges() -> None:
    # numpy would read [-1, 2**63] as float64: the wrapper must keep them exact.
    edges = [(0, 1, -1), (2, 3, 2**63), (0, 2, 2**64 - 1), (1, 3, -2**63 - 1), (0, 3, 5), (1, 2, 2**63 - 1)]
    expected = networkx_perfect(4, edges)
    assert expected is not None
    got = perfect_matching(4, edges)
    assert got is not None and weight(edges, got[0]) == weight(edges, expected)
    assert certifies(4, edges, got)
    u, v, w = columns(edges)
    again = perfect_matching_arrays(4, u, v, w)
    assert again is not None and again[1].objective2() == got[1].objective2()
    unsigned = perfect_matching_arrays(4, u, v, np.array([abs(e[2]) for e in edges], dtype=np.uint64))
    plain = [(a, b, abs(x)) for a, b, x in edges]
    assert unsigned is not None and weight(plain, unsigned[0]) == weight(plain, networkx_perfect(4, plain) or [])


@pytest.mark.parametrize("seed", range(6))
def test_many_ties_on_larger_graphs_same_matching_from_python_and_c(seed: int) -> None:
    # Weights 0..2 on a few hundred vertices: nearly every step has ties, and blossoms nest.
    rng = random.Random(seed)
    n = rng.choice([120, 200, 300])
    edges = [(i, j, rng.randint(0, 2)) for i in range(n) for j in range(i + 1, n) if rng.random() < 0.05]
    edges += [(i, i + 1, 0) for i in range(0, n, 2)]  # some perfect matching exists
    edges = list({(a, b): (a, b, x) for a, b, x in edges}.values())
    got = perfect_matching(n, edges)
    assert got is not None and python_solve(n, edges) == got
    assert certifies(n, edges, got)
    sub = [e for e in edges if rng.random() < 0.5] + [(i, i + 1, 0) for i in range(0, n, 2)]
    sub = list({(a, b): (a, b, x) for a, b, x in sub}.values())
    first = perfect_matching(n, sub)
    assert first is not None
    where = {(a, b): k for k, (a, b, _) in enumerate(edges)}
    warm = [where[p] for p in first[0]]
    again = perfect_matching(n, edges, warm, first[1])
    assert again is not None and python_solve(n, edges, warm, first[1]) == again
    assert weight(edges, again[0]) == weight(edges, got[0]) and certifies(n, edges, again)


def nested_triangles(k: int) -> tuple[int, Edges, list[int]]:
    """Root 0, warm pairs (1, 2), (3, 4), ...: the search shrinks each pair with the blossom before.

    Every edge weighs 10 but the last one (1): from the plain start all others are tight, and the
    scan shrinks k triangles, each holding the one before (nesting depth k), before a dual step
    reaches the last vertex.
    """
    n = 2 * k + 2
    edges = [(0, 1, 10), (0, 2, 10), (1, 2, 10)]
    for i in range(1, k):
        a, b = 2 * i + 1, 2 * i + 2
        edges += [(a, b, 10), (a - 1, a, 10), (a - 2, b, 10)]
    edges.append((n - 2, n - 1, 1))
    warm = [j for j, (u, v, _) in enumerate(edges) if v == u + 1 and u % 2 == 1]
    return n, edges, warm


def test_deeply_nested_blossoms_need_no_recursion() -> None:
    n, edges, warm = nested_triangles(1000)
    got = perfect_matching(n, edges, warm)
    assert got is not None and python_solve(n, edges, warm) == got  # Python: no recursion limit reached
    assert certifies(n, edges, got)
    n, edges, warm = nested_triangles(10_000)  # the C kernel: 10,000 levels, explicit stacks only
    got = perfect_matching(n, edges, warm)
    assert got is not None and certifies(n, edges, got)
    assert weight(edges, got[0]) == 10 * (n // 2 - 1) + 1
