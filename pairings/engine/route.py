"""The route to the optimal pairs of one round, chosen in one place.

Two routes, both exact, both ending in the same canonical optimum
(:mod:`pairings.engine.canonical`; the argument in :mod:`pairings.engine.sparse`):

- **implicit** (:mod:`pairings.engine.implicit`): the pruned pairs walked by the
  compiled scan, never listed; taken when both compiled kernels are built and
  :data:`USE_IMPLICIT` is true;
- **listed** (:mod:`pairings.engine.listed`): the pruned pairs held in arrays;
  taken otherwise, or when the implicit route cannot certify (values beyond
  the kernels' integers, no certificate within its solves).

When no greedy pairing is found there is no safe-pruning bound
(:mod:`pairings.engine.candidates`): the engine's blossom then solves the full
candidate graph. networkx (:mod:`pairings.engine.solver`) is no route of the
engine: it is the independent reference of ``draft_round(..., reference=True)``.
"""

from __future__ import annotations

from typing import Collection, Sequence

import numpy as np

from pairings.engine import blossom, candidates, canonical, implicit, listed, solver
from pairings.engine.candidates import Graph, Sided
from pairings.engine.criteria import REMATCH, Field
from pairings.engine.sparse import Route
from pairings.engine.vector import Arrays, IntArray
from pairings.errors import NoPairingError
from pairings.state import PlayerId

USE_IMPLICIT = True
"""Take the implicit route when the compiled kernels are built (tests set it False to take the listed one)."""

Pairs = list[tuple[int, int]]


def engine_matching(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId]
                    ) -> tuple[Pairs, Route | None, bool]:
    """The engine's index pairs, the route that found them (None: the full graph), and whether every
    pruned pair is a rematch."""
    arrays = Arrays(fld, players)
    bound = candidates.greedy_bound(fld, players, no_bye, arrays)
    if bound is None:
        g = candidates.full_graph(fld, players, no_bye)
        return solve(g, reference=False), None, _every_pair_a_rematch(g)
    if USE_IMPLICIT and implicit.available():
        found = implicit.implicit_matching(fld, players, no_bye, bound, arrays)
        if found is not None:
            return found.pairs, found.route, found.every_pair_a_rematch
    solved = listed.listed_matching(fld, players, no_bye, bound, arrays)
    return solved.pairs, solved.route, solved.every_pair_a_rematch


def _every_pair_a_rematch(g: Graph) -> bool:
    rematch = [c[REMATCH] for (_, j), c in zip(g.edges, g.costs) if j != g.bye_vertex]
    return len(rematch) > 0 and all(rematch)


def solve(g: Graph, reference: bool) -> Pairs:
    """A maximum-cardinality optimum of the full graph ``g``, canonical when it is a full pairing.

    The engine's blossom, or networkx when ``reference`` (the independent check).
    """
    wedges = g.weighted()
    u = np.array([i for i, _ in g.edges], dtype=np.int64)
    v = np.array([j for _, j in g.edges], dtype=np.int64)
    ws = [x for _, _, x in wedges]
    w = np.array(ws, dtype=np.int64 if max(ws, default=0) < 2**62 else object)
    if reference:
        found = solver.reference_matching(g.n, wedges)
        if 2 * len(found) < g.n:
            return found  # someone is left without an opponent: the caller refuses the round
        return canonical.settle(g.n, u, v, w, found)
    solved = blossom.perfect_matching_arrays(g.n, u, v, w)
    if solved is None:
        return most_paired(g.n, u, v)
    return canonical.settle(g.n, u, v, w, *solved)


def most_paired(n: int, u: IntArray, v: IntArray) -> Pairs:
    """A maximum-cardinality matching of the edges ``(u, v)`` by the blossom's perfect matching.

    On two copies of the graph (vertex ``x`` and ``x + n``), each edge weighs 1
    in both copies and each ``x`` is joined to ``x + n`` with weight 0: that
    graph always has a perfect matching, and one of maximum weight holds a
    maximum matching in each copy (common practice, no source: a matching of
    size ``k`` in each copy plus the joins reaches ``2 k``, and neither copy can
    hold more than the maximum). The first copy's pairs are returned.
    """
    x = np.arange(n, dtype=np.int64)
    du = np.concatenate([u, u + n, x])
    dv = np.concatenate([v, v + n, x + n])
    dw = np.concatenate([np.ones(2 * len(u), dtype=np.int64), np.zeros(n, dtype=np.int64)])
    solved = blossom.perfect_matching_arrays(2 * n, du, dv, dw)
    assert solved is not None  # the joins are a perfect matching
    return sorted((a, b) for a, b in solved[0] if b < n)


def optimal_pairs(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                  reference: bool = False) -> tuple[list[Sided], PlayerId | None]:
    """The optimal pairs of ``players`` (rank order) and the pairing bye, if any.

    ``reference`` runs networkx on the full graph instead of the engine's route.

    Raises
    ------
    NoPairingError
        When everyone to pair has met everyone, or the do-not-pair list or the
        no-bye list leaves players without an opponent.
    """
    if not players:
        return [], None
    if reference:
        g = candidates.full_graph(fld, players, no_bye)
        rematches = _every_pair_a_rematch(g)
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
