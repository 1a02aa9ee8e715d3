"""The blossom search's structures (pairings.engine.edmonds) keep the invariants their comments state.

After every stage of random searches (many ties, warm starts, carried duals, graphs without a
perfect matching) the blossom tree, the matching and the dual are checked against the stated
invariants by code of this file; every kind of dual step must occur across the cases.
"""

from __future__ import annotations

import random
from collections import Counter
from typing import Iterator

import pytest

from pairings.engine import blossom
from pairings.engine.edmonds import NONE, DualStep, Label, Search
from tests.engine.engine_support import Edges, assert_optimal_dual, networkx_perfect


def blossom_ids(s: Search) -> list[int]:
    return [b for b in range(s.n, 2 * s.n) if s.cycle[b]]


def holders(s: Search, v: int) -> list[int]:
    """The blossoms holding vertex ``v``, innermost first (by parent pointers)."""
    out, x = [], s.parent[v]
    while x != NONE:
        out.append(x)
        x = s.parent[x]
    return out


def reduced2(s: Search, weights: dict[tuple[int, int], int], u: int, v: int) -> int:
    both = set(holders(s, u)) & set(holders(s, v))
    return s.y2[u] + s.y2[v] + 2 * sum(s.z[b] for b in both) - 2 * weights[(min(u, v), max(u, v))]


def check_between_stages(s: Search, weights: dict[tuple[int, int], int]) -> None:
    n = s.n
    assert all(reduced2(s, weights, u, v) >= 0 for u, v in weights), "dual infeasible"
    for v in range(n):
        m = s.mate[v]
        if m != NONE:
            assert s.mate[m] == v and reduced2(s, weights, v, m) == 0, "matched edge not tight"
        chain = holders(s, v)
        assert s.top[v] == (chain[-1] if chain else v)
    for b in blossom_ids(s):
        cycle, links = s.cycle[b], s.links[b]
        k = len(cycle)
        assert k >= 3 and k % 2 == 1 and len(links) == k
        assert all(s.parent[c] == b for c in cycle)
        assert sorted(s.members[b]) == sorted(v for c in cycle for v in s.members[c])
        assert s.base[b] == s.base[cycle[0]]
        outside = s.mate[s.base[b]]
        assert outside == NONE or outside not in s.members[b], "the base is matched inside"
        for i, (a, c) in enumerate(links):
            assert a in s.members[cycle[i]] and c in s.members[cycle[(i + 1) % k]]
            assert reduced2(s, weights, a, c) == 0, "a cycle edge not tight"
            assert (s.mate[a] == c) == (i % 2 == 1), "cycle edges matched at odd positions only"
        assert s.z[b] >= 0
        assert s.z[b] > 0 or s.parent[b] != NONE, "a top-level blossom of z = 0 outlives its stage"
    assert all(label == Label.FREE for label in s.label)
    assert all(r == NONE for r in s.reach) and not any(s.in_tree) and not any(s.vertex_in_tree)
    assert sorted(s.unused + blossom_ids(s)) == list(range(n, 2 * n))


@pytest.fixture
def checked_stages(monkeypatch: pytest.MonkeyPatch) -> Iterator[Counter[DualStep]]:
    """Run the Python search with invariant checks after each stage; count the dual steps taken."""
    monkeypatch.setattr(blossom, "USE_COMPILED", False)
    steps: Counter[DualStep] = Counter()
    end_stage, dual_step = Search.end_stage, Search.dual_step

    def checked_end_stage(self: Search) -> None:
        end_stage(self)
        check_between_stages(self, {(min(u, v), max(u, v)): w for u, v, w in
                                    zip(self.eu, self.ev, self.w)})

    def counted_dual_step(self: Search) -> tuple[DualStep, int, int]:
        got = dual_step(self)
        steps[got[0]] += 1
        return got

    monkeypatch.setattr(Search, "end_stage", checked_end_stage)
    monkeypatch.setattr(Search, "dual_step", counted_dual_step)
    yield steps


def graph(seed: int) -> tuple[int, Edges]:
    rng = random.Random(seed)
    n = rng.choice([2, 4, 6, 10, 16, 24, 32])
    p = rng.choice([0.2, 0.4, 0.8])
    top = rng.choice([1, 2, 5, 1000, 2**100])
    edges = [(i, j, rng.randint(0, top)) for i in range(n) for j in range(i + 1, n) if rng.random() < p]
    rng.shuffle(edges)
    return n, edges


def test_invariants_hold_after_every_stage_and_every_step_kind_occurs(checked_stages: Counter[DualStep]) -> None:
    blossoms_in_duals = 0
    for seed in range(250):
        n, edges = graph(seed)
        rng = random.Random(seed)
        warm = [k for k in range(len(edges)) if rng.random() < 0.3] if seed % 2 else []
        got = blossom.perfect_matching(n, edges, warm)
        expected = networkx_perfect(n, edges)
        assert (got is None) == (expected is None)
        if got is None:
            continue
        assert_optimal_dual(n, edges, *got)
        blossoms_in_duals += len(got[1].blossoms)
        sub = [e for e in edges if rng.random() < 0.6]
        first = blossom.perfect_matching(n, sub)
        if first is not None:  # a carried dual and the previous pairs as the start
            where = {(min(a, b), max(a, b)): k for k, (a, b, _) in enumerate(edges)}
            again = blossom.perfect_matching(n, edges, [where[p] for p in first[0]], first[1])
            assert again is not None
            assert_optimal_dual(n, edges, *again)
    assert set(checked_stages) == set(DualStep), checked_stages
    assert blossoms_in_duals > 0


def test_no_perfect_matching_is_an_unbounded_dual(checked_stages: Counter[DualStep]) -> None:
    # Two triangles joined by nothing: every perfect matching fails on parity.
    edges = [(0, 1, 3), (1, 2, 3), (0, 2, 3), (3, 4, 1), (4, 5, 1), (3, 5, 1)]
    assert blossom.perfect_matching(6, edges) is None
    assert checked_stages[DualStep.UNBOUNDED] == 1


def test_two_triangles_need_blossoms_in_the_dual(checked_stages: Counter[DualStep]) -> None:
    # The only perfect matching takes the bridge 0-3 (weight 20 in all); vertex duals alone cannot
    # price it (each triangle's three edges of 10 force y-sums of 15 per triangle, 30 > 20), so the
    # optimal dual must carry blossoms: the search has to shrink.
    edges = [(0, 1, 10), (1, 2, 10), (0, 2, 10), (3, 4, 10), (4, 5, 10), (3, 5, 10), (0, 3, 0)]
    got = blossom.perfect_matching(6, edges)
    assert got is not None and got[0] == [(0, 3), (1, 2), (4, 5)]
    assert got[1].blossoms  # a shrunk triangle
    assert_optimal_dual(6, edges, *got)
