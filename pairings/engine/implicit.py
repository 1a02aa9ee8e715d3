"""The certified sparse solve over pruned pairs that are never listed (compiled kernels).

:func:`candidates.pruned_edges` lists every pruned pair with its cost row: at
10,000 players about 20 million rows, which take minutes and gigabytes to cost,
weigh and check. This path keeps them implicit. A compiled scan
(:class:`pairings.engine.scan.PairScan`) walks them to find the column maxima
(for the weights), each player's heaviest pairs (to start the sparse graph)
and the pairs a dual violates; only the sparse graph is ever held. Its
matching and optimal dual come from the compiled blossom
(:func:`pairings.engine.blossom.perfect_matching_arrays`).

Notes
-----
**Exactness.** The answer is returned only with a certificate over every
pruned edge, from the repeated solve both routes share
(:func:`pairings.engine.sparse.certify`): the bye edges are all in the sparse
graph, and the scan prices every pruned player pair under the dual. When no
certificate is reached the caller takes the listed route
(:mod:`pairings.engine.listed`). The weights are :func:`weights.bounding`'s
over the :func:`net` cost rows, with radices from the pairs' maxima and
:func:`shares`: another valid mixed-radix encoding of the same lexicographic
order, so the optimum is the same lexicographic optimum. Among optima of equal
cost the answer is then made canonical (:func:`sparse.canonical_optimum`) on the
pairs tight under the certified dual: the sparse graph's, and every pruned pair
the certifying scan found tight (:meth:`scan.PairScan.check`), so both routes
return the same pairs.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Collection, Sequence

import numpy as np

from pairings.engine import blossom, candidates, scan, sparse, weights
from pairings.engine.criteria import ABSOLUTE, MILD, SIDE_RULE, STRONG, Field
from pairings.engine.types import CRITERIA
from pairings.engine.vector import WIDTH, Arrays, IntArray
from pairings.state import PlayerId

RESTRICTED_GAPS = (1, 2)
"""Score gaps tried first when the greedy bound is weak (:func:`implicit_matching`)."""


def available() -> bool:
    """True when both compiled kernels are installed."""
    return scan.available() and blossom.compiled()


def net(arrays: Arrays, i: IntArray, j: IntArray, rows: IntArray) -> IntArray:
    """The cost rows the engine weighs: the side-rule column net of unavoidable breaks.

    A pair's side-rule cost less its players' unavoidable breaks
    (:meth:`Field.forced`, the Notes of :mod:`candidates`); a bye edge
    (``j == arrays.n``) gets 1 when its player has no unavoidable break and
    some other player has one. Any full pairing's total in that column is then
    its true side-rule total less a constant (the number of such players, less
    one when the field is odd and some exist), so both rank every pairing
    alike; the column is then usually 0 on every pair, which keeps the
    weights short (:func:`weights.from_maxima`).
    """
    out = rows.copy()
    if not arrays.fld.sides or not arrays.forced.any():
        return out
    bye = j == arrays.n
    jj = np.where(bye, 0, j)
    out[:, SIDE_RULE] -= np.where(bye, 0, arrays.forced[i] + arrays.forced[jj])
    out[:, SIDE_RULE] += np.where(bye, 1 - arrays.forced[i], 0)
    return out


def shares(a: Arrays) -> dict[int, int]:
    """The most all players together can add to each column counted player by player (see :func:`net`).

    A preference can only be missed by a player who has one of that
    strength; a repeated float only by a player who floated in that round; a
    net side-rule break only by a player with a side H3 forbids and no
    unavoidable break, plus one for the bye edge.
    """
    wish = a.want != 0
    avoidable = (a.breaks_first | a.breaks_second) & (a.forced == 0)
    column = CRITERIA.index
    return {
        column("side_rule"): int(avoidable.sum()) + 1,
        column("pref_absolute"): int((wish & (a.strength == ABSOLUTE)).sum()),
        column("pref_strong"): int((wish & (a.strength == STRONG)).sum()),
        column("pref_mild"): int((wish & (a.strength == MILD)).sum()),
        column("float_repeat"): int((a.down1 + a.up1 > 0).sum()),
        column("float_repeat_2"): int((a.down2 + a.up2 > 0).sum()),
    }


@dataclass(frozen=True)
class Started:
    """The scan of the pairs within a bound and the first sparse graph (:func:`start`)."""

    pairscan: scan.PairScan
    stats: scan.Stats
    graph: sparse.SparseGraph
    enc: weights.Encoder
    """The weights of the pairs (:func:`weights.bounding` over the :func:`net` cost rows)."""
    byes: int
    """Bye edges within the bound (all of them in the sparse graph)."""

    def pricing(self, dual: blossom.Dual) -> sparse.Priced:
        """Every pruned player pair priced under ``dual`` by one walk of the scan."""
        found = self.pairscan.check(self.enc, dual, sparse.SPARSE_ADD)
        return sparse.Priced(found.i, found.j, found.count, found.tight_i, found.tight_j)


def start(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId], arrays: Arrays,
          bound: candidates.Bound) -> Started | None:
    """The scan of the pairs within ``bound`` and the first sparse graph (:mod:`sparse`, Notes).

    None when values go beyond the kernels' integers.
    """
    n = arrays.n
    try:
        pairscan = scan.PairScan(arrays, bound.max_gap, bound.totals, bound.levels)
        stats = pairscan.stats()
        bu, bv, brows = candidates.bye_rows(fld, players, no_bye, bound)
        bye_net = net(arrays, bu, bv, brows)
        maxima = [max(a, int(b)) for a, b in zip(stats.maxima, bye_net.max(axis=0) if len(brows) else stats.maxima)]
        bye_gaps = set(brows[:, weights.GAP_INDEX].tolist()) - set(stats.gaps)
        bye_columns = [k for k in range(WIDTH) if stats.maxima[k] == 0]
        enc = weights.bounding(maxima, set(stats.gaps) | bye_gaps, n + n % 2, bye_gaps, bye_columns,
                               shares(arrays))

        def weigh(i: IntArray, j: IntArray, rows: IntArray | None = None) -> IntArray:
            return weights.encode(enc, net(arrays, i, j, arrays.costs(i, j) if rows is None else rows))

        graph = sparse.SparseGraph(n + n % 2, weigh)
        graph.add(bu, bv, weigh(bu, bv, brows))
        i, j, rows = candidates.admissible(arrays, *sparse.ideal_partners(arrays, sparse.SPARSE_CLASS,
                                                                          sparse.SPARSE_WIDE), bound)
        graph.add(i, j, weigh(i, j, rows))
        graph.add(*pairscan.heaviest(enc, sparse.SPARSE_BEST))
    except ValueError:
        return None
    own = np.array(bound.pairs, dtype=np.int64).reshape(-1, 2)
    own = own[own[:, 1] < n]  # its bye edge is among the bye edges
    graph.add(own[:, 0], own[:, 1])  # within the bound by the bound's own argument
    return Started(pairscan, stats, graph, enc, len(bu))


def _proves_itself(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                   pairs: Sequence[tuple[int, int]], gap: int) -> bool:
    """True when the bound that ``pairs`` prove keeps only pairs within :func:`candidates.restricted` ``(gap)``."""
    n = len(players)
    costs = [fld.bye(players[i]) if j == n else fld.pair(players[i], players[j])[1] for i, j in pairs]
    own = candidates.bound_of(fld, players, no_bye, costs, pairs)
    # Nothing above the gap levels allowed: then no kept pair floats beyond the bound's levels.
    return not any(own.totals[:weights.GAP_INDEX]) and not any(own.bye_totals[:candidates.HARD]) \
        and own.levels <= gap


def implicit_matching(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                      bound: candidates.Bound, arrays: Arrays | None = None) -> sparse.Solved | None:
    """The optimal index pairs of ``players`` with their certificate route; None: take the listed route.

    When ``bound`` (the greedy pairing's) is weak, tries the
    :func:`candidates.restricted` limits first (no avoidable hard-rule
    relaxation, at most one, then two, units apart), then ``bound`` itself.
    An optimum certified among the pairs within limits of ``g`` units is the
    optimum when the safe-pruning bound it proves itself
    (:func:`candidates.bound_of`) relaxes no hard rule and floats at most
    ``g`` units: every pair that bound keeps lies within the limits, where
    nothing beats it. ``arrays`` are the players' (:class:`Arrays`), when the caller has them.
    """
    arrays = Arrays(fld, players) if arrays is None else arrays
    tries = [candidates.restricted(g) for g in RESTRICTED_GAPS if bound.max_gap is None or g < bound.max_gap]
    tries.append(bound)
    for limits in tries:
        started = start(fld, players, no_bye, arrays, limits)
        if started is None:
            continue
        found = sparse.certify(started.graph, started.pricing)
        if found is None:
            continue
        if limits is not bound and not _proves_itself(fld, players, no_bye, found.pairs, limits.levels):
            continue
        pairs = sparse.canonical_optimum(started.graph, found)
        stats = started.stats
        route = sparse.Route("implicit", True, found.solves, started.graph.size(), stats.count + started.byes)
        return sparse.Solved(pairs, route, stats.count > 0 and stats.rematch_free == 0, limits)
    return None
