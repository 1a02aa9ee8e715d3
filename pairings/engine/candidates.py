"""Candidate graphs for one round and the optimal pairs on them.

Two graphs over the same vertices (the free players, plus a bye vertex when
their number is odd):

- the **full** graph: every pair not on the do-not-pair list (H5), every
  player allowed the bye - what the reference solver runs on;
- the **pruned** graph: the full graph less the edges that provably belong to
  no optimum (safe pruning, below) - what the engine runs on.

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
from pairings.engine import blossom, canonical, certificate, solver, weights
from pairings.engine.criteria import RANK_ORDER, REMATCH, SIDE_RULE, Cost, Field
from pairings.engine.vector import WIDTH, AnyArray, Arrays, IntArray
from pairings.errors import NoPairingError
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
SPARSE_WINDOW = 3
"""Start the sparse graph with the pairs at most this far from the rank-order ideal."""
SPARSE_ROUNDS = 8
SPARSE_BEST = 3
"""... and each player's three heaviest edges."""
SPARSE_CLASS = 4
"""... and, per side-wish class, this many players either side of each player's ideal partner."""
SPARSE_ADD = 2
"""Violated edges added per player and round (the most violated first)."""


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


def greedy(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]
           ) -> tuple[list[Cost], list[tuple[int, int]]] | None:
    """A feasible full pairing built greedily in rank order: its costs and index pairs, or None.

    The bye goes to a player with an unavoidable H3 break when one is allowed it
    (:meth:`Field.forced`), else to the cheapest bye, lowest-ranked first (pair
    ``(i, len(players))``); then each player, top down, takes the cheapest of the next ``GREEDY_WINDOW``
    free players (all of them when none of those is free of hard-rule relaxations).
    """
    index = {p: k for k, p in enumerate(players)}
    free = list(players)
    out: list[Cost] = []
    pairs: list[tuple[int, int]] = []
    if len(free) % 2:
        allowed = [p for p in free if p not in no_bye]
        if not allowed:
            return None
        # A player who breaks H3 on any board is best off on the bye (H3 outranks the bye's rules).
        by_cost = min(reversed(allowed), key=lambda p: (not fld.forced(p), fld.bye(p)))
        out.append(fld.bye(by_cost))
        pairs.append((index[by_cost], len(players)))
        free.remove(by_cost)
    while free:
        p = free.pop(0)
        best: tuple[Cost, int] | None = None
        for scope in (free[:GREEDY_WINDOW], free):
            for k, q in enumerate(scope):
                if fld.forbidden(p, q):
                    continue
                cost = fld.pair(p, q)[1]
                if best is None or cost < best[0]:
                    best = (cost, k)
            if best is not None and not any(best[0][:HARD]):
                break
        if best is None:
            return None
        out.append(best[0])
        pairs.append((index[p], index[free.pop(best[1])]))
    return out, pairs


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


def greedy_bound(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]) -> Bound | None:
    """The safe-pruning bound of a greedy pairing; None when no greedy pairing is found."""
    found = greedy(fld, players, no_bye)
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
    """The players' arrays (for :func:`ideal_partners`)."""


def _index_pairs(units: IntArray, max_gap: int | None, rows: range) -> tuple[IntArray, IntArray]:
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
                 bound: Bound | None = None) -> Pruned | None:
    """The full graph less the edges that cannot be in any optimum (module Notes), as arrays.

    None when no greedy pairing is found (the caller then uses the full graph).
    ``bound`` is :func:`greedy_bound`'s, when the caller has it already.
    """
    bound = bound if bound is not None else greedy_bound(fld, players, no_bye)
    if bound is None:
        return None
    arrays = Arrays(fld, players)
    us, vs, cs = [], [], []
    for lo in range(0, len(players), CHUNK):
        i, j, rows = admissible(arrays, *_index_pairs(arrays.units, bound.max_gap,
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


def ideal_partners(a: Arrays, near: int = SPARSE_CLASS, wide: int | None = None) -> tuple[IntArray, IntArray]:
    """Pairs ``i < j`` of one score group where ``j`` is near ``i``'s rank-order ideal within its side class.

    For each player and each side-wish class (first, second, none) of its
    score group, the ``near`` players of that class on each side of the
    ideal position (group rank plus or minus half the group, rules.md S6),
    or the ``wide`` ones (default ``near``) when the class is compatible with
    the player's own wish (no wish, or not the same side). Side preferences
    (S4) outrank the rank order, so a player's partner in an optimum is
    usually a compatible one near the ideal, not the nearest one; where the
    wishes are unevenly spread over the group, several places away.
    Floaters: the last ``2 * near`` players of a group with the first
    ``2 * near`` of each class of the next group down.
    """
    n = a.n
    if n == 0:
        return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64)
    span = n + 1
    cls = a.want + 1
    key = (a.units * 3 + cls) * span + a.grank
    order = np.argsort(key, kind="stable")
    sorted_key = key[order]
    half = a.gsize // 2
    rows = np.arange(n, dtype=np.int64)
    us, vs = [], []
    wide = near if wide is None else wide
    for c in range(3):
        block = (a.units * 3 + c) * span
        lo_pos = np.searchsorted(sorted_key, block, side="left")
        hi_pos = np.searchsorted(sorted_key, block + span, side="left")
        reach = np.where((a.want != 0) & (a.want == c - 1), near, wide)
        for target in (a.grank + half, a.grank - half):
            at = np.searchsorted(sorted_key, block + np.clip(target, 0, n), side="left")
            for off in range(-max(near, wide), max(near, wide)):
                pos = at + off
                ok = (pos >= lo_pos) & (pos < hi_pos) & (off < reach) & (-off <= reach)
                j = order[np.where(ok, pos, 0)]
                us.append(rows[ok])
                vs.append(j[ok])
    # Floaters: the last 2 * near of a group with the first 2 * near of each class of the next one.
    end = rows - a.grank + a.gsize
    floater = (a.grank >= a.gsize - 2 * near) & (end < n)
    below = a.units[np.minimum(end, n - 1)]
    for c in range(3):
        block = (below * 3 + c) * span
        lo_pos = np.searchsorted(sorted_key, block, side="left")
        hi_pos = np.searchsorted(sorted_key, block + span, side="left")
        for off in range(2 * near):
            pos = lo_pos + off
            ok = floater & (pos < hi_pos)
            us.append(rows[ok])
            vs.append(order[pos[ok]])
    i, j = np.concatenate(us), np.concatenate(vs)
    keep = i != j
    return np.minimum(i, j)[keep], np.maximum(i, j)[keep]


def seed_mask(pr: Pruned) -> NDArray[np.bool_]:
    """The pruned edges that are :func:`ideal_partners` pairs."""
    keys = pr.u * pr.n + pr.v
    order = np.argsort(keys, kind="stable")
    i, j = ideal_partners(pr.arrays)
    wanted = np.unique(i * pr.n + j)
    at = np.searchsorted(keys[order], wanted)
    hit = at < len(order)
    hit[hit] = keys[order][at[hit]] == wanted[hit]
    out = np.zeros(len(keys), dtype=bool)
    out[order[at[hit]]] = True
    return out


@dataclass(frozen=True)
class Route:
    """How the engine's matching was found (for tests and the benchmark)."""

    certified: bool
    """True: sparse subgraph plus a dual certificate on every pruned edge; False: the fallback."""
    rounds: int
    """Sparse solves made."""
    sparse_edges: int
    pruned: int = 0
    """Pruned edges the certificate covered (0: not counted)."""


def _best_per_vertex(u: IntArray, v: IntArray, score: AnyArray, among: NDArray[np.bool_],
                     k: int) -> NDArray[np.bool_]:
    """Edges of ``among`` that are among the ``k`` highest-``score`` edges at one of their ends."""
    idx = np.flatnonzero(among)
    order = idx[np.argsort(-score[idx], kind="stable")]
    ends = np.concatenate([u[order], v[order]])
    edge = np.concatenate([order, order])
    pos = np.tile(np.arange(len(order)), 2)
    s = np.lexsort((pos, ends))
    ends = ends[s]
    place = np.arange(len(s)) - np.searchsorted(ends, ends, side="left")
    out = np.zeros(len(u), dtype=bool)
    out[edge[s][place < k]] = True
    return out


def certified_matching(n: int, u: IntArray, v: IntArray, w: AnyArray, rank: IntArray,
                       window: int = SPARSE_WINDOW, rounds: int = SPARSE_ROUNDS, *,
                       seed: NDArray[np.bool_] | None = None
                       ) -> tuple[list[tuple[int, int]], Route, blossom.Dual | None]:
    """A maximum-weight perfect matching of the edges ``(u, v, w)``, certified when possible, and its dual.

    Start from the edges with ``rank <= window`` (each player's partners
    around the rank-order ideal, and every bye edge); solve them (compiled
    solver, then :func:`blossom.perfect_matching` warm-started from its
    answer, for the dual; later rounds warm-start the blossom from the
    previous round's matching and dual alone);
    certify on every edge (:mod:`certificate`); add the
    edges with negative reduced cost (or, when the subgraph has no perfect
    matching, widen the window) and repeat. After ``rounds`` solves, the
    compiled solver runs on all edges (still exact, only slower; no dual).
    """
    split = certificate.limbs(w)
    score = w if split is None or w.dtype != object else split[0] * 2.0**certificate.SHIFT + split[1]
    mask = (rank <= window) | _best_per_vertex(u, v, score, np.ones(len(u), dtype=bool), SPARSE_BEST)
    if seed is not None:
        mask |= seed
    last: tuple[list[tuple[int, int]], blossom.Dual] | None = None
    for attempt in range(1, rounds + 1):
        idx = np.flatnonzero(mask)
        sub = list(zip(u[idx].tolist(), v[idx].tolist(), w[idx].tolist()))
        where = {(a, b): k for k, (a, b, _) in enumerate(sub)}
        if last is None:  # later rounds start from the previous round's matching and dual instead
            found = solver.matching(n, sub)
            if 2 * len(found) < n:
                window *= 4
                mask |= rank <= window
                continue
            result = blossom.perfect_matching(n, sub, [where[p] for p in found])
        else:
            result = blossom.perfect_matching(n, sub, [where[p] for p in last[0]], last[1])
        if result is None:  # cannot happen after a perfect matching was found; stay exact anyway
            break
        pairs, dual = last = result
        rc = certificate.reduced_costs(u, v, w, dual, split)
        bad = rc < 0
        if not bad.any() and certificate.certify(n, u, v, w, pairs, dual, split):
            return pairs, Route(True, attempt, len(idx), len(u)), dual
        mask |= _best_per_vertex(u, v, -rc, bad, SPARSE_ADD)
    edges = list(zip(u.tolist(), v.tolist(), w.tolist()))
    return solver.matching(n, edges), Route(False, rounds, len(u)), None


def _all_rematches(rematch: Sequence[int]) -> bool:
    return len(rematch) > 0 and all(rematch)


def engine_matching(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]
                    ) -> tuple[list[tuple[int, int]], Route | None, bool]:
    """The engine's path: index pairs, how they were found, and whether every pruned pair is a rematch.

    With the compiled kernels, the implicit certified solve (:mod:`implicit`);
    else, or when it cannot certify, the listed pruned pairs and the certified
    sparse solve; the full graph when no greedy pairing exists. Whatever the
    path, a full pairing is the canonical optimum (:mod:`canonical`).
    """
    from pairings.engine import implicit  # it builds on this module

    bound = greedy_bound(fld, players, no_bye)
    if bound is None:
        g = full_graph(fld, players, no_bye)
        real = [c[REMATCH] for (i, j), c in zip(g.edges, g.costs) if j != g.bye_vertex]
        return solve(g, False), None, _all_rematches(real)
    if implicit.available():
        solved = implicit.implicit_matching(fld, players, no_bye, bound)
        if solved is not None:
            return solved.pairs, solved.route, solved.every_pair_a_rematch
    pr = pruned_edges(fld, players, no_bye, bound)
    assert pr is not None
    w = weights.weight_array(pr.costs, pr.n)
    pairs, route, dual = certified_matching(pr.n, pr.u, pr.v, w, pr.costs[:, RANK_INDEX], seed=seed_mask(pr))
    if 2 * len(pairs) == pr.n:
        pairs = canonical.settle(pr.n, pr.u, pr.v, w, pairs, dual)
    return pairs, route, _all_rematches(pr.costs[pr.v != len(players), REMATCH].tolist())


def solve(g: Graph, reference: bool) -> list[tuple[int, int]]:
    """A maximum-cardinality optimum of ``g`` (networkx when ``reference``), canonical when it is a full pairing."""
    wedges = g.weighted()
    found = solver.reference_matching(g.n, wedges) if reference else solver.matching(g.n, wedges)
    if 2 * len(found) < g.n:
        return found  # someone is left without an opponent: the caller refuses the round
    u = np.array([i for i, _ in g.edges], dtype=np.int64)
    v = np.array([j for _, j in g.edges], dtype=np.int64)
    ws = [x for _, _, x in wedges]
    w = np.array(ws, dtype=np.int64 if max(ws, default=0) < 2**62 else object)
    return canonical.settle(g.n, u, v, w, found)


def optimal_pairs(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                  reference: bool = False) -> tuple[list[Sided], PlayerId | None]:
    """The optimal pairs of ``players`` (rank order) and the pairing bye, if any.

    ``reference`` runs networkx on the full graph instead of the engine's path.

    Raises
    ------
    NoPairingError
        When everyone to pair has met everyone, or the do-not-pair list or the
        no-bye list leaves players without an opponent.
    """
    if not players:
        return [], None
    if reference:
        g = full_graph(fld, players, no_bye)
        rematches = _all_rematches([c[REMATCH] for (i, j), c in zip(g.edges, g.costs) if j != g.bye_vertex])
        matched = solve(g, True)
    else:
        matched, _, rematches = engine_matching(fld, players, no_bye)
    if len(players) > 1 and rematches:
        raise NoPairingError(
            f"round {fld.round}: every player to pair has already met every other "
            f"(max meetings {fld.max_meetings}); no Swiss round can be paired"
        )
    covered = {v for e in matched for v in e}
    missing = [players[i] for i in range(len(players)) if i not in covered]
    if missing:
        names = ", ".join(fld.state.players[p].name for p in missing)
        raise NoPairingError(
            f"round {fld.round}: no pairing gives {names} an opponent: the do-not-pair list "
            "or the no-bye list leaves no legal partner"
        )
    out: list[Sided] = []
    bye: PlayerId | None = None
    for i, j in matched:
        if j == len(players):
            bye = players[i]
        else:
            p, q = players[i], players[j]
            out.append((fld.pair(p, q)[0], (p, q)))
    return out, bye
