"""Candidate graphs for one round: the full graph, the greedy pairing's safe-pruning bound, the pruned pairs.

Two graphs over the same vertices (the free players, plus a bye vertex when
their number is odd):

- the **full** graph: every pair not on the do-not-pair list (H5), every
  player allowed the bye - what the reference solver runs on, and the engine
  when no greedy pairing is found;
- the **pruned** graph: the full graph less the edges that provably belong to
  no optimum (safe pruning, below) - what both routes to the optimum run on
  (:mod:`pairings.engine.route`): listed here (:func:`pruned_edges`), or walked
  by the compiled scan with the same limits (:class:`pairings.engine.scan.PairScan`).

Notes
-----
**Safe pruning.** Costs are non-negative vectors compared lexicographically
(:mod:`pairings.engine.weights`). Let ``F`` be any feasible pairing of maximum
cardinality (here: a greedy one) with total cost vector ``C(F)``, and ``O`` an
optimum, so ``C(O) <= C(F)``. Every edge ``e`` of ``O`` has
``c(e) <= C(O)`` componentwise, hence lexicographically, so
``c(e) <= C(F)``. Edges with ``c(e) > C(F)`` can therefore be dropped without
losing any optimum, and the pruned graph still contains ``F`` (so its maximum
cardinality is unchanged). When ``F`` relaxes no hard rule and its largest gap
is ``D`` units, every edge relaxing a hard rule or ``D`` + 1 units apart is
pruned, so only score groups at most ``D`` apart are ever enumerated.

**Unavoidable breaks.** A player whose side difference is already beyond the
H3 limit (after an organiser's change, an imported history) breaks H3 on any
board, so any pairing that relaxes nothing else still has a side-rule total,
and the argument above would then keep every pair. Let ``f`` count those
players and ``a(e)`` be an edge's side-rule cost less its players'
unavoidable breaks (``a(e) >= 0``; a bye edge has no side). Any full pairing
``P`` has side-rule total ``sum_P a(e) + f - [P's bye goes to one of them]``.
From ``C(O) <= C(F)``: ``sum_O a(e) <= sum_F a(e) + s`` with ``s = 1`` when
the field is odd, one of them may have the bye and ``F`` gives it to someone
else, ``s = 0`` otherwise; the other columns are unchanged. So the argument
holds with ``a(e)`` in place of the side-rule cost and ``sum_F a(e) + s`` in
place of ``F``'s total (:func:`bound_of`); the greedy pairing gives the bye to
such a player when it can, so that ``s = 0``.

**The bye's share.** A pair ``e`` of ``O`` and ``O``'s bye edge ``b`` are
disjoint parts of ``O``, so ``c(e) + c(b) <= C(O)`` componentwise, and
``c(e) <= C(F) - m`` lexicographically for any ``m`` componentwise below every
bye edge ``O`` may use. ``m`` is the componentwise least bye cost over the
players allowed the bye, or over those with an unavoidable break when ``F``
gives the bye to one of them and relaxes nothing else (then so must ``O``).
Without this, a bye far above the lowest group in ``F`` (such a player's)
would let every pair up to that gap through.
"""

from __future__ import annotations

from bisect import bisect_right
from dataclasses import dataclass
from typing import Collection, Iterator, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.costs import LAYOUT
from pairings.engine import weights
from pairings.engine.criteria import RANK_ORDER, SIDE_RULE, Cost, Field
from pairings.engine.vector import WIDTH, Arrays, IntArray
from pairings.state import PlayerId

Pair = tuple[PlayerId, PlayerId]
Sided = tuple[Pair | None, Pair]
HARD = LAYOUT.hard
"""Cost tuple positions ``0 .. HARD - 1`` are the hard-rule relaxations (H1, H3, H2)."""
GREEDY_WINDOW = 24
RANK_INDEX = RANK_ORDER
"""Position of ``rank_order`` in a cost tuple."""
CHUNK = 512
"""Rows of players costed at once (bounds the arrays' memory)."""


class Graph:
    """A candidate graph: vertex ``len(players)`` is the bye vertex when present."""

    def __init__(self, fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]) -> None:
        self.fld = fld
        self.players = list(players)
        self.has_bye = len(self.players) % 2 == 1
        self.bye_vertex = len(self.players)
        self.n = len(self.players) + (1 if self.has_bye else 0)
        self.no_bye = frozenset(no_bye)
        self.edges: list[tuple[int, int]] = []
        self.costs: list[Cost] = []
        self.sides: list[Pair | None] = []

    def add(self, i: int, j: int) -> None:
        if j == self.bye_vertex:
            cost, sides = self.fld.bye(self.players[i]), None
        else:
            sides, cost = self.fld.pair(self.players[i], self.players[j])
        self.edges.append((i, j))
        self.costs.append(cost)
        self.sides.append(sides)

    def bye_allowed(self, i: int) -> bool:
        return self.has_bye and self.players[i] not in self.no_bye

    def weighted(self) -> list[tuple[int, int, int]]:
        enc = weights.encoder(self.costs, self.n)
        return [(i, j, enc.weight(c)) for (i, j), c in zip(self.edges, self.costs)]


def _lexicographic_rank(rows: IntArray) -> IntArray:
    """Per row of non-negative integers, a number that orders the rows as their tuples do.

    The rows read as mixed-radix numbers (radix: a column's maximum plus one)
    when those fit an int64, else their ranks in a lexicographic sort.
    """
    if len(rows) == 0:
        return np.zeros(0, dtype=np.int64)
    place, places = 1, []
    for top in reversed(rows.max(axis=0).tolist()):
        places.append(place)
        place *= int(top) + 1
    if place < 2**63:
        return rows @ np.array(places[::-1], dtype=np.int64)
    order = np.lexsort(rows.T[::-1])
    ranked = rows[order]
    rank = np.zeros(len(rows), dtype=np.int64)
    rank[order] = np.concatenate([[0], np.cumsum((ranked[1:] != ranked[:-1]).any(axis=1))])
    return rank


def _pairs(fld: Field, players: Sequence[PlayerId], max_gap: int | None) -> Iterator[tuple[int, int]]:
    """Index pairs (i < j) not forbidden, at most ``max_gap`` units apart (None: any)."""
    units = [fld.units[p] for p in players]
    # players are in rank order, so units are non-increasing: a gap bound is a prefix.
    neg = [-u for u in units]
    for i, p in enumerate(players):
        end = len(players) if max_gap is None else bisect_right(neg, max_gap - units[i], i + 1)
        for j in range(i + 1, end):
            if not fld.forbidden(p, players[j]):
                yield i, j


def full_graph(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]) -> Graph:
    g = Graph(fld, players, no_bye)
    for i, j in _pairs(fld, players, None):
        g.add(i, j)
    for i in range(len(players)):
        if g.bye_allowed(i):
            g.add(i, g.bye_vertex)
    return g


def greedy(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId], arrays: Arrays | None = None
           ) -> tuple[list[Cost], list[tuple[int, int]]] | None:
    """A feasible full pairing built greedily in rank order: its costs and index pairs, or None.

    The bye goes to a player with an unavoidable H3 break when one is allowed it
    (:meth:`Field.forced`), else to the cheapest bye, lowest-ranked first (pair
    ``(i, len(players))``); then each player, top down, takes the cheapest of the next ``GREEDY_WINDOW``
    free players (all of them when none of those is free of hard-rule relaxations), the first of
    equally cheap ones. ``arrays`` are the players' (:class:`Arrays`), when the caller has them.
    """
    n = len(players)
    free = list(range(n))
    out: list[Cost] = []
    pairs: list[tuple[int, int]] = []
    if n % 2:
        allowed = [k for k in free if players[k] not in no_bye]
        if not allowed:
            return None
        # A player who breaks H3 on any board is best off on the bye (H3 outranks the bye's rules).
        by_cost = min(reversed(allowed), key=lambda k: (not fld.forced(players[k]), fld.bye(players[k])))
        out.append(fld.bye(players[by_cost]))
        pairs.append((by_cost, n))
        free.remove(by_cost)
    ahead = _Ahead(Arrays(fld, players) if arrays is None else arrays, 2 * GREEDY_WINDOW)
    while free:
        i = free.pop(0)
        best = ahead.cheapest(i, free[:GREEDY_WINDOW])
        if best is None or any(best[0][:HARD]):
            best = ahead.cheapest(i, free)
        if best is None:
            return None
        out.append(best[0])
        pairs.append((i, free.pop(best[1])))
    return out, pairs


class _Ahead:
    """The costs of each player's pairs with the next ``reach`` players, costed at once for :func:`greedy`.

    :meth:`Arrays.costs` gives the rows :meth:`Field.pair` gives (the tests
    compare them pair by pair); each row's rank in the lexicographic order of
    all of them makes a comparison one integer comparison. Pairs further ahead
    are costed when asked for.
    """

    def __init__(self, arrays: Arrays, reach: int) -> None:
        n = arrays.n
        first = np.arange(n, dtype=np.int64)
        counts = np.clip(n - 1 - first, 0, reach)
        i = np.repeat(first, counts)
        j = i + 1 + np.arange(len(i), dtype=np.int64) - np.repeat(np.cumsum(counts) - counts, counts)
        rows = arrays.costs(i, j)
        self.arrays = arrays
        self.reach = reach
        self.rows = rows
        self.rank: list[int] = _lexicographic_rank(rows).tolist()
        self.ok: list[bool] = arrays.allowed(i, j).tolist()
        self.base: list[int] = (np.cumsum(counts) - counts - first - 1).tolist()
        """Row of the pair ``(i, j)``: ``base[i] + j``."""

    def cheapest(self, i: int, scope: Sequence[int]) -> tuple[Cost, int] | None:
        """The first of the cheapest allowed pairs of ``i`` with ``scope`` (increasing, after ``i``): its
        cost and place in ``scope``; None when every one is on the do-not-pair list."""
        if not scope:
            return None
        if scope[-1] - i <= self.reach:
            base, rank, ok = self.base[i], self.rank, self.ok
            best, least = -1, 0
            for k, j in enumerate(scope):
                row = base + j
                if ok[row] and (best < 0 or rank[row] < least):
                    best, least = k, rank[row]
            return None if best < 0 else (tuple(self.rows[base + scope[best]].tolist()), best)
        a = self.arrays
        js = np.array(scope, dtype=np.int64)
        iis = np.full(len(js), i, dtype=np.int64)
        costs: list[Cost] = [tuple(r) for r in a.costs(iis, js).tolist()]
        allowed = a.allowed(iis, js).tolist()
        found = [(c, k) for k, (c, yes) in enumerate(zip(costs, allowed)) if yes]
        return min(found) if found else None


@dataclass(frozen=True)
class Bound:
    """What a greedy pairing ``F`` proves about the optimum (module Notes, safe pruning)."""

    totals: tuple[int, ...]
    """What a pair's expanded cost (:meth:`weights.Encoder.expand`) must not exceed: ``C(F)`` less
    what the optimum's bye surely costs (module Notes)."""
    levels: int
    """The largest score gap in F (the expanded gap levels)."""
    max_gap: int | None
    """Pairs further apart can be skipped unseen (None when ``totals`` relaxes a hard rule)."""
    pairs: tuple[tuple[int, int], ...]
    """F itself, as index pairs (the bye vertex is ``len(players)``)."""
    bye_totals: tuple[int, ...] = ()
    """What a bye edge's expanded cost must not exceed: ``C(F)`` (``totals`` when empty)."""


def greedy_bound(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                 arrays: Arrays | None = None) -> Bound | None:
    """The safe-pruning bound of a greedy pairing; None when no greedy pairing is found.

    ``arrays`` are the players' (:class:`Arrays`), when the caller has them.
    """
    found = greedy(fld, players, no_bye, arrays)
    return None if found is None else bound_of(fld, players, no_bye, *found)


def bound_of(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
             feasible: Sequence[Cost], pairs: Sequence[tuple[int, int]]) -> Bound:
    """The safe-pruning bound of any feasible full pairing of ``players`` (its costs and index pairs).

    The side-rule total counts only avoidable breaks (module Notes); it is
    one more when the field is odd, a player with an unavoidable break may
    have the bye and this pairing gives it to someone else.
    """
    n = len(players)
    enc = weights.encoder(feasible, n + 1)
    totals = [sum(col) for col in zip(*(enc.expand(c) for c in feasible))]
    totals[SIDE_RULE] -= sum(fld.forced(players[i]) + fld.forced(players[j]) for i, j in pairs if j < n)
    bye = [i for i, j in pairs if j == n]
    allowed = [p for p in players if p not in no_bye]
    if bye and not fld.forced(players[bye[0]]) and any(fld.forced(p) for p in allowed):
        totals[SIDE_RULE] += 1
    pair_totals = totals
    if bye:
        # The optimum's bye: one of these players (module Notes), so pairs get C(F) less its least cost.
        forced = [p for p in allowed if fld.forced(p)]
        byes = forced if fld.forced(players[bye[0]]) and totals[SIDE_RULE] == 0 else allowed
        least = [min(col) for col in zip(*(enc.expand(fld.bye(p)) for p in byes))]
        pair_totals = [t - m for t, m in zip(totals, least)]
    gap = weights.GAP_INDEX
    gaps = [d for d in range(enc.levels, 0, -1) if pair_totals[gap + enc.levels - d]]
    # Only when nothing above the gap levels is allowed does F's largest gap bound every kept pair's.
    max_gap = max(gaps, default=0) if not any(pair_totals[:gap]) else None
    return Bound(tuple(pair_totals), enc.levels, max_gap, tuple(pairs), tuple(totals))


def restricted(gap: int) -> Bound:
    """A bound that admits exactly the pairs at most ``gap`` units apart with no avoidable hard-rule relaxation.

    Not a safe-pruning bound (no pairing proves it): the engine uses it only to
    look for a feasible pairing within it, whose own :func:`bound_of` then is one.
    """
    unlimited = 2**40
    return Bound((0,) * HARD + (unlimited,) * (gap + WIDTH - HARD - 1), gap, gap, ())


def bye_rows(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId], bound: Bound
             ) -> tuple[IntArray, IntArray, IntArray]:
    """The pruned bye edges ``(u, v, costs)``: players allowed the bye whose bye cost is within the bound."""
    n = len(players)
    if n % 2 == 0:
        return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros((0, WIDTH), dtype=np.int64)
    byes = [(k, fld.bye(p)) for k, p in enumerate(players) if p not in no_bye]
    rows = np.array([c for _, c in byes], dtype=np.int64).reshape(-1, WIDTH)
    keep = _not_above(rows, bound.bye_totals or bound.totals, bound.levels)
    u = np.array([k for k, _ in byes], dtype=np.int64)[keep]
    return u, np.full(len(u), n, dtype=np.int64), rows[keep]


def admissible(arrays: Arrays, i: IntArray, j: IntArray, bound: Bound) -> tuple[IntArray, IntArray, IntArray]:
    """The index pairs ``i < j`` that are pruned edges, with their cost rows."""
    ok = arrays.allowed(i, j)
    if bound.max_gap is not None:
        ok &= arrays.units[i] - arrays.units[j] <= bound.max_gap
    i, j = i[ok], j[ok]
    rows = arrays.costs(i, j)
    keep = _not_above(rows, bound.totals, bound.levels, arrays.forced[i] + arrays.forced[j])
    return i[keep], j[keep], rows[keep]


@dataclass(frozen=True)
class Pruned:
    """The pruned graph as arrays: row ``k`` joins ``u[k]`` and ``v[k]`` (``v = n - 1``: the bye)."""

    n: int
    u: IntArray
    v: IntArray
    costs: IntArray
    arrays: Arrays
    """The players' arrays (for :func:`pairings.engine.sparse.ideal_partners`)."""


def index_pairs(units: IntArray, max_gap: int | None, rows: range) -> tuple[IntArray, IntArray]:
    """Index pairs ``i < j`` with ``i`` in ``rows``, at most ``max_gap`` units apart (None: any)."""
    n = len(units)
    first = np.arange(rows.start, rows.stop, dtype=np.int64)
    # units are non-increasing (rank order), so the partners of i within the gap are a prefix.
    ends = np.full(len(first), n, dtype=np.int64) if max_gap is None else \
        np.searchsorted(-units, max_gap - units[first], side="right").astype(np.int64)
    counts = np.maximum(ends - first - 1, 0)
    i = np.repeat(first, counts)
    offsets = np.arange(int(counts.sum()), dtype=np.int64) - np.repeat(np.cumsum(counts) - counts, counts)
    return i, i + 1 + offsets


def _not_above(rows: IntArray, bound: Sequence[int], levels: int, forced: IntArray | None = None
               ) -> NDArray[np.bool_]:
    """Rows whose expanded cost (:meth:`weights.Encoder.expand`) is lexicographically <= ``bound``.

    ``forced`` (per row) is subtracted from the side-rule column first: the
    unavoidable breaks of the pair's players (module Notes).
    """
    gap = rows[:, weights.GAP_INDEX]
    columns = [rows[:, k] - forced if k == SIDE_RULE and forced is not None else rows[:, k]
               for k in range(weights.GAP_INDEX)] \
        + [(gap == d).astype(np.int64) for d in range(levels, 0, -1)] \
        + [rows[:, k] for k in range(weights.GAP_INDEX + 1, rows.shape[1])]
    keep = np.ones(len(rows), dtype=bool)
    open_ = np.ones(len(rows), dtype=bool)
    for k, (col, b) in enumerate(zip(columns, bound)):
        if k == weights.GAP_INDEX:  # one pair above every level F uses, with equal hard-rule counts
            keep &= ~(open_ & (gap > levels))
            open_ &= gap <= levels
        keep &= ~(open_ & (col > b))
        open_ &= col == b
    return keep


def pruned_edges(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                 bound: Bound | None = None, arrays: Arrays | None = None) -> Pruned | None:
    """The full graph less the edges that cannot be in any optimum (module Notes), as arrays.

    None when no greedy pairing is found (the caller then uses the full graph).
    ``bound`` is :func:`greedy_bound`'s and ``arrays`` the players' :class:`Arrays`, when the caller
    has them already.
    """
    arrays = Arrays(fld, players) if arrays is None else arrays
    bound = bound if bound is not None else greedy_bound(fld, players, no_bye, arrays)
    if bound is None:
        return None
    us, vs, cs = [], [], []
    for lo in range(0, len(players), CHUNK):
        i, j, rows = admissible(arrays, *index_pairs(arrays.units, bound.max_gap,
                                                      range(lo, min(lo + CHUNK, len(players)))), bound)
        us.append(i)
        vs.append(j)
        cs.append(rows.astype(np.int32))  # small counts and ranks: half the memory
    bu, bv, brows = bye_rows(fld, players, no_bye, bound)
    us.append(bu)
    vs.append(bv)
    cs.append(brows.astype(np.int32))
    n = len(players)
    return Pruned(n + n % 2, np.concatenate(us), np.concatenate(vs), np.concatenate(cs), arrays)
