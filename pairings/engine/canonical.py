"""The canonical optimum: one documented choice among pairings of equal cost.

Many pairings of a round often share the optimal cost (the rank-order
distances of docs/engine.md S6 tie freely), and which one a maximum-weight matching
returns depends on the solver, so without a rule two installations (compiled
kernels or not, rustworkx or networkx) could draft different boards from one
log. The engine's final tie-break, below every criterion of docs/engine.md, is:

    **Among the pairings of optimal cost, the one whose players, taken in
    pairing rank order (score, then initial rank), have the best-ranked
    partners: the first player's partner as high in the ranking as any
    optimum allows; among those optima, the second player's; and so on. The
    pairing bye counts as a partner ranked after everyone.**

That is the lexicographic minimum of the partner sequence, a total order on
pairings, so the optimum it picks is unique; sides and board numbers follow
from the pairs by rules (:meth:`Field.allocate`, :func:`boards.assemble`), so
the whole draft is. Vertices here are numbered in that rank order (the
candidate graphs' players are in rank order and the bye vertex is last), so a
partner's rank is its vertex number.

Notes
-----
**Where the optima are (complementary slackness).** Let ``(y, z)`` be any
optimal dual of the maximum-weight perfect matching LP over Edmonds'
polytope (:mod:`pairings.engine.certificate`) and ``M*`` an optimum. For a
perfect matching ``M`` using only *tight* edges (reduced cost 0):
``w(M) = sum_v y_v + sum_B z_B |M cap E(B)|`` and ``|M cap E(B)| <= (|B|-1)/2``,
so ``w(M) = D(y, z) = w(M*)`` exactly when every blossom ``B`` with
``z_B > 0`` is *full* in ``M``. An optimum uses no edge with a positive
reduced cost (it would fall short of ``D``). Hence the optima are exactly the
perfect matchings ``M`` of the tight graph ``T`` that maximise
``d(M) = sum_{e in M} d(e)``, where ``d(e)`` counts the blossoms with
``z_B > 0`` holding both ends of ``e`` (``d(M) <= sum_B (|B|-1)/2``, with
equality exactly when every such blossom is full, and ``M*`` reaches it).
The original weights drop out: ``d`` is a small integer.

**Components.** A perfect matching of ``T`` is the union of perfect matchings
of its connected components, and ``d`` adds up over them, so the optima are
the products of each component's ``d``-maximal perfect matchings. The
lexicographic minimum of a product is the product of the components'
minima: at the first player where two products differ, the component holding
that player decides, and its own minimum is at least as good there. The same
holds after fixing some pairs: the optima that contain fixed pairs ``F`` are
``F`` plus the ``d``-maximal perfect matchings of ``T`` less ``F``'s players
(one such completion, the current optimum's, reaches the bound).

**Fixing partners in rank order.** Players are settled in rank order. The
first unsettled player ``x`` of a component has every earlier player settled,
so its partner is one of its tight neighbours ranked after it; when its
current partner is the first of them, no optimum does better and the pair is
fixed without a solve. Otherwise a *batch* of the component's next unsettled
players ``x = b_1 < b_2 < ... < b_t`` is settled by one maximum-weight perfect
matching of the component (:func:`blossom.perfect_matching_arrays`, started
from the current optimum) under the weights

    ``W(e) = d(e) * R - L(e)``,  ``L(e) = sum over ends b_k of e of digit_k(e) * P_k``,

where ``digit_k(e)`` is 0 when the other end is ranked before ``b_k`` and
``1 + i`` when it is ``b_k``'s ``i``-th unsettled later tight neighbour,
``r_k`` is one more than the number of those neighbours, ``P_t = 1``,
``P_k = P_{k+1} r_{k+1}`` and ``R = P_1 r_1``. Every perfect matching meets
each ``b_k`` once, so ``L(M) = sum_k digit_k(M) P_k``: a mixed-radix number
with digits below their radices, below ``R``; hence one unit of ``d`` outweighs
any ``L`` and the answer is an optimum (previous paragraph) whose digit string
is the smallest. Digit order is partner order: two optima that agree on the
digits of ``b_1..b_{k-1}`` give those players the same partners (a digit names
a later partner; digit 0 means an earlier one, itself settled by its own digit
or before the batch), so a partner ranked before ``b_k`` is the same in both,
and later partners keep their rank order. So the batch gets the
lexicographically smallest partners among all optima, and its pairs are fixed.
``t`` is as large as keeps ``W`` an int64.

**Swapping in the first choice (no solve).** Before a batch, the settling
tries to give ``x`` its first unsettled later tight neighbour ``c`` directly:
no optimum does better, so any optimum that pairs ``x`` with ``c`` proves the
pair. If ``M`` is the current optimum and ``C`` a cycle alternating between
``M`` and live tight edges through ``x, c`` and ``x``'s mate, over unsettled
players only, then ``M xor C`` is a perfect matching of the same edges with
``d(M xor C) = d(M) + d(C less M) - d(C cap M)``; when that balance is 0 it
is ``d``-maximal, an optimum (first paragraph, after any earlier fixing:
second paragraph), and it pairs ``x`` with ``c``. The cycle is found by a
breadth-first search from ``c``'s mate for ``x``'s mate (each reached player
enters the tree with its mate, so the tree path is a simple alternating
path); it does not shrink odd cycles, so it can miss a cycle that exists,
and it stops after :data:`SEARCH_LIMIT` edges. Every miss, or a cycle with a
negative balance, falls back to the batch solve, which decides exactly. A
success is a proof and a failure decides nothing, so the result is the one
of the solves alone. In a round-5 field of 10,000 players the search settles
about 4,400 first choices and about 60 solves remain, each where ``c`` is in
fact out of reach.
Whatever the route, the result is the same unique optimum; only the number of
solves differs.
"""

from __future__ import annotations

from bisect import bisect_left
from typing import Callable, Sequence

import numpy as np

from pairings.engine import blossom, certificate
from pairings.engine.blossom import Dual
from pairings.engine.vector import AnyArray, IntArray

BATCH_BITS = 62
"""A batch's weights ``W`` stay below ``2**BATCH_BITS`` (int64 all the way into the compiled blossom)."""
SEARCH_LIMIT = 20000
"""Edges :meth:`_Settler.swap_in` looks at before it leaves the player to a solve."""
Later = Callable[[int], IntArray]
"""A player's unsettled tight neighbours ranked after it, in rank order."""


def tight(u: IntArray, v: IntArray, w: AnyArray, dual: Dual) -> IntArray:
    """Indices of the edges ``(u[k], v[k], w[k])`` whose reduced cost under ``dual`` is zero."""
    return np.flatnonzero(certificate.reduced_costs(u, v, w, dual) == 0)


def depths(n: int, u: IntArray, v: IntArray, dual: Dual) -> IntArray:
    """Per edge ``(u[k], v[k])``: how many blossoms of ``dual`` with ``z_B > 0`` hold both ends (``d``, Notes)."""
    counted = Dual([0] * n, [(b, 1) for b, z in dual.blossoms if z > 0])
    if not counted.blossoms or len(u) == 0:
        return np.zeros(len(u), dtype=np.int64)
    return certificate.reduced_costs(u, v, np.zeros(len(u), dtype=np.int64), counted) // 2


def settle(n: int, u: IntArray, v: IntArray, w: AnyArray, matched: Sequence[tuple[int, int]],
           dual: Dual | None = None) -> list[tuple[int, int]]:
    """The canonical optimum of the edges ``(u, v, w)``, given one optimum ``matched``.

    ``dual`` is an optimal dual of those edges; without one, it is computed
    (:func:`blossom.perfect_matching_arrays`, started from ``matched``).
    """
    if dual is None:
        solved = blossom.perfect_matching_arrays(n, u, v, w, matched)
        if solved is None:
            raise ValueError("no perfect matching: there is nothing to make canonical")
        dual = solved[1]
    keep = tight(u, v, w, dual)
    tu, tv = u[keep], v[keep]
    return canonical(n, tu, tv, depths(n, tu, tv, dual), matched)


def _labels(n: int, u: IntArray, v: IntArray) -> IntArray:
    """Connected components of the edges ``(u, v)``: the least vertex of each, by label propagation."""
    lab = np.arange(n, dtype=np.int64)
    ends = np.concatenate([u, v])
    order = np.argsort(ends, kind="stable")
    ends = ends[order]
    first = np.flatnonzero(np.r_[True, ends[1:] != ends[:-1]]) if len(ends) else np.zeros(0, dtype=np.int64)
    while True:
        low = np.minimum(lab[u], lab[v])
        new = lab.copy()
        if len(ends):  # each end takes the least label over its edges (a sort-based minimum.at)
            least = np.minimum.reduceat(np.concatenate([low, low])[order], first)
            new[ends[first]] = np.minimum(new[ends[first]], least)
        new = new[new]
        if np.array_equal(new, lab):
            return lab
        lab = new


def canonical(n: int, u: IntArray, v: IntArray, depth: IntArray, matched: Sequence[tuple[int, int]]
              ) -> list[tuple[int, int]]:
    """The lexicographically smallest optimum (module Notes), pairs ``(a, b)`` with ``a < b``, sorted.

    ``(u, v)`` are the tight edges (``u < v``) of an optimal dual, ``depth``
    their ``d`` (:func:`depths`) and ``matched`` an optimum using only them.
    """
    return _Settler(n, u, v, depth, matched).run()


class _Settler:
    """The settling of players in rank order (module Notes), over the tight edges still in play."""

    def __init__(self, n: int, u: IntArray, v: IntArray, depth: IntArray, matched: Sequence[tuple[int, int]]
                 ) -> None:
        self.n = n
        self.u, self.v = u, v
        self.depth = depth.astype(np.int64)
        self.alive = np.ones(len(u), dtype=bool)
        self.mate = np.full(n, -1, dtype=np.int64)
        for a, b in matched:
            self.mate[a], self.mate[b] = b, a
        ends = np.concatenate([u, v])
        order = np.lexsort((np.concatenate([v, u]), ends))
        self.start = np.searchsorted(ends[order], np.arange(n + 1))
        self.neighbour = np.concatenate([v, u])[order]  # per vertex, its tight neighbours in rank order
        self.edge = np.concatenate([np.arange(len(u)), np.arange(len(u))])[order]
        self.fixed = np.zeros(n, dtype=bool)
        self.label = _labels(n, u, v)
        self.near_l: list[int] = self.neighbour.tolist()
        self.edge_l: list[int] = self.edge.tolist()
        self.start_l: list[int] = self.start.tolist()
        self.mirror()

    def mirror(self) -> None:
        """Python-list copies of ``mate``, ``fixed``, ``alive`` and ``depth`` for :meth:`swap_in`'s search."""
        self.mate_l: list[int] = self.mate.tolist()
        self.fixed_l: list[bool] = self.fixed.tolist()
        self.alive_l: list[bool] = self.alive.tolist()
        self.depth_l: list[int] = self.depth.tolist()

    def later(self, x: int) -> IntArray:
        """``x``'s unsettled tight neighbours ranked after it, in rank order."""
        lo, hi = self.start[x], self.start[x + 1]
        near: IntArray = self.neighbour[lo:hi]
        keep = (near > x) & ~self.fixed[near] & self.alive[self.edge[lo:hi]]
        out: IntArray = near[keep]
        return out

    def run(self) -> list[tuple[int, int]]:
        mate, fixed = self.mate, self.fixed
        for x in range(self.n):
            if self.fixed_l[x]:
                continue
            first = int(self.later(x)[0])
            if self.mate_l[x] != first and not self.swap_in(x, first):
                self.solve_batch(x)
                self.mirror()
            y = self.mate_l[x]
            fixed[x] = fixed[y] = self.fixed_l[x] = self.fixed_l[y] = True
        return [(a, int(mate[a])) for a in range(self.n) if a < mate[a]]

    def key(self, a: int, b: int) -> int:
        """The index of the tight edge ``ab`` (``a``'s neighbours are in rank order)."""
        return self.edge_l[bisect_left(self.near_l, b, self.start_l[a], self.start_l[a + 1])]

    def swap_in(self, x: int, c: int) -> bool:
        """Give ``x`` the partner ``c`` by an alternating cycle that keeps the optimum (Notes); False if none found.

        A breadth-first search from ``c`` over unsettled players along live
        edges, alternately matched and unmatched, for ``x``'s mate; it does
        not shrink odd cycles, so it can miss a cycle (the caller then
        solves), and it gives up after :data:`SEARCH_LIMIT` edges.
        """
        mate, fixed, alive = self.mate_l, self.fixed_l, self.alive_l
        near, edge, start = self.near_l, self.edge_l, self.start_l
        target = mate[x]
        back: dict[int, tuple[int, int]] = {}  # reached player q -> (the player p before it, edge pq)
        seen = {x, target, c, mate[c]}
        queue = [mate[c]]
        scanned = 0
        end = -1
        for p in queue:
            for k in range(start[p], start[p + 1]):
                q = near[k]
                if q == target and alive[edge[k]] and q != mate[p]:
                    back[q], end = (p, edge[k]), q
                    break
                if q in seen or fixed[q] or not alive[edge[k]]:
                    continue
                back[q] = (p, edge[k])
                seen.add(q)
                seen.add(mate[q])
                queue.append(mate[q])
            scanned += start[p + 1] - start[p]
            if end >= 0 or scanned > SEARCH_LIMIT:
                break
        if end < 0:
            return False
        cycle: list[tuple[int, int]] = [(x, c)]  # the new pairs
        gain = self.depth_l[self.key(x, c)] - self.depth_l[self.key(x, target)]
        q = end
        while q != c:
            p, k = back[q]
            gain += self.depth_l[k] - self.depth_l[self.key(p, mate[p])]
            cycle.append((p, q))
            q = mate[p]
        if gain != 0:  # an optimum has the most d; this cycle would lose some
            return False
        for a, b in cycle:
            mate[a], mate[b] = b, a
            self.mate[a], self.mate[b] = b, a
        return True

    def component(self, x: int) -> tuple[IntArray, IntArray]:
        """The unsettled players of ``x``'s component as it is now, and the live edges among them."""
        u, v = self.u, self.v
        inside = (self.label == self.label[x]) & ~self.fixed
        edges = np.flatnonzero(inside[u] & inside[v] & self.alive)
        self.label[inside] = _labels(self.n, u[edges], v[edges])[inside]
        inside &= self.label == self.label[x]
        return np.flatnonzero(inside), edges[inside[u[edges]]]

    def solve_batch(self, x: int) -> None:
        """Settle a batch from ``x`` by one solve of its component under the weights ``W`` (Notes).

        The solve's dual then replaces the component's tight edges and ``d``:
        the optima that keep the batch's pairs are the ``W``-optimal perfect
        matchings that contain them, so the Notes' argument holds for ``W``.
        """
        verts, edges = self.component(x)
        u, v, depth = self.u[edges], self.v[edges], self.depth[edges]
        cap = (1 << BATCH_BITS) // (int(depth.max(initial=0)) + 1)
        players, lists, radix = _batch(x, verts, self.later, cap)
        low = np.zeros(len(edges), dtype=np.int64)
        by_u, by_v = np.argsort(u, kind="stable"), np.argsort(v, kind="stable")
        place = 1
        for y, near in zip(reversed(players), reversed(lists)):
            digit = np.zeros(self.n, dtype=np.int64)
            digit[near] = np.arange(1, len(near) + 1, dtype=np.int64)
            for side, ends, other in ((by_u, u, v), (by_v, v, u)):
                at = side[np.searchsorted(ends[side], y):np.searchsorted(ends[side], y, side="right")]
                low[at] += digit[other[at]] * place
            place *= len(near) + 1
        w = depth * radix - low
        index = np.full(self.n, -1, dtype=np.int64)
        index[verts] = np.arange(len(verts), dtype=np.int64)
        mate = self.mate
        lower = verts[mate[verts] > verts]
        warm = np.stack([index[lower], index[mate[lower]]], axis=1)
        iu, iv = index[u], index[v]
        solved = blossom.perfect_matching_arrays(len(verts), iu, iv, w, warm.tolist())
        if solved is None:  # the current optimum is a perfect matching of these edges
            raise RuntimeError("canonical: a component lost its perfect matching")
        pairs, dual = solved
        ends = verts[np.array(pairs, dtype=np.int64).reshape(-1, 2)]
        mate[ends[:, 0]], mate[ends[:, 1]] = ends[:, 1], ends[:, 0]
        settled = np.array(players, dtype=np.int64)
        self.fixed[settled] = self.fixed[mate[settled]] = True
        keep = certificate.reduced_costs(iu, iv, w, dual) == 0
        self.alive[edges[~keep]] = False
        self.depth[edges[keep]] = depths(len(verts), iu[keep], iv[keep], dual)


def _batch(x: int, verts: IntArray, later: Later, cap: int) -> tuple[list[int], list[IntArray], int]:
    """The batch from ``x``: its players, each one's later unsettled neighbours, and ``R`` (Notes)."""
    players: list[int] = []
    lists: list[IntArray] = []
    radix = 1
    for y in verts[verts >= x].tolist():
        near = later(y)
        if players and radix * (len(near) + 1) > cap:  # x itself always (int64 holds any one radix)
            break
        players.append(y)
        lists.append(near)
        radix *= len(near) + 1
    return players, lists, radix
