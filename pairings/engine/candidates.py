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
"""

from __future__ import annotations

from bisect import bisect_right
from typing import Collection, Iterator, Sequence

from pairings.engine import solver, weights
from pairings.engine.criteria import Cost, Field
from pairings.errors import NoPairingError
from pairings.state import PlayerId

Pair = tuple[PlayerId, PlayerId]
Sided = tuple[Pair | None, Pair]
HARD = 3
"""Cost tuple positions 0..2 are the hard-rule relaxations (H1, H3, H2)."""
GREEDY_WINDOW = 24


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


def greedy(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]) -> list[Cost] | None:
    """Costs of a feasible full pairing built greedily in rank order, or None if it fails.

    The bye goes to the lowest-ranked player allowed one; then each player, top
    down, takes the cheapest of the next ``GREEDY_WINDOW`` free players (all
    of them when none of those is free of hard-rule relaxations).
    """
    free = list(players)
    out: list[Cost] = []
    if len(free) % 2:
        allowed = [p for p in free if p not in no_bye]
        if not allowed:
            return None
        by_cost = min(reversed(allowed), key=fld.bye)
        out.append(fld.bye(by_cost))
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
        free.pop(best[1])
    return out


def pruned_graph(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]) -> Graph:
    """The full graph less the edges that cannot be in any optimum (module Notes)."""
    feasible = greedy(fld, players, no_bye)
    if feasible is None:
        return full_graph(fld, players, no_bye)
    enc = weights.encoder(feasible, len(players) + 1)
    bound = tuple(sum(col) for col in zip(*(enc.expand(c) for c in feasible)))
    hard_free = not any(bound[:HARD])
    max_gap = max(c[weights.GAP_INDEX] for c in feasible) if hard_free else None
    g = Graph(fld, players, no_bye)

    def keep(cost: Cost) -> bool:
        if cost[:HARD] != bound[:HARD]:
            return cost[:HARD] < bound[:HARD]
        if cost[weights.GAP_INDEX] > enc.levels:
            return False  # one pair above every level F uses, with equal hard-rule counts
        return enc.expand(cost) <= bound

    for i, j in _pairs(fld, players, max_gap):
        sides, cost = fld.pair(players[i], players[j])
        if keep(cost):
            g.edges.append((i, j))
            g.costs.append(cost)
            g.sides.append(sides)
    for i in range(len(players)):
        if g.bye_allowed(i) and keep(fld.bye(players[i])):
            g.add(i, g.bye_vertex)
    return g


def solve(g: Graph, reference: bool) -> list[tuple[int, int]]:
    wedges = g.weighted()
    if reference:
        return solver.reference_matching(g.n, wedges)
    return solver.matching(g.n, wedges)


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
    g = full_graph(fld, players, no_bye) if reference else pruned_graph(fld, players, no_bye)
    real = [c for (i, j), c in zip(g.edges, g.costs) if j != g.bye_vertex]
    if len(players) > 1 and real and all(c[0] for c in real):
        raise NoPairingError(
            f"round {fld.round}: every player to pair has already met every other "
            f"(max meetings {fld.max_meetings}); no Swiss round can be paired"
        )
    matched = solve(g, reference)
    index = {(i, j): k for k, (i, j) in enumerate(g.edges)}
    covered = {v for e in matched for v in e}
    missing = [g.players[i] for i in range(len(g.players)) if i not in covered]
    if missing:
        names = ", ".join(fld.state.players[p].name for p in missing)
        raise NoPairingError(
            f"round {fld.round}: no pairing gives {names} an opponent: the do-not-pair list "
            "or the no-bye list leaves no legal partner"
        )
    out: list[Sided] = []
    bye: PlayerId | None = None
    for i, j in matched:
        if j == g.bye_vertex:
            bye = g.players[i]
        else:
            out.append((g.sides[index[(i, j)]], (g.players[i], g.players[j])))
    return out, bye
