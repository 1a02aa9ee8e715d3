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
pruned edge (LP duality over Edmonds' perfect-matching polytope, see
:mod:`pairings.engine.certificate`): the sparse matching and its dual pass
:func:`certificate.certify` on the sparse edges (dual feasible there, equal
objectives), the bye edges are all in the sparse graph, and the scan finds no
pruned player pair with a negative reduced cost. Otherwise the violated pairs
are added and the solve repeats; after ``SOLVES`` solves the caller
falls back to the listed path. The weights are :func:`weights.bounding`'s
over the :func:`net` cost rows, with radices from the pairs' maxima and
:func:`shares`: another valid mixed-radix encoding of the same lexicographic
order, so the optimum is the same lexicographic optimum. Among optima of equal
cost the answer is then made canonical (:mod:`pairings.engine.canonical`) on the
pairs tight under the certified dual: the sparse graph's, and every pruned pair
the certifying scan found tight (:meth:`scan.PairScan.check`), so both paths
return the same pairs.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Collection, Sequence

import numpy as np

from pairings.engine import blossom, candidates, canonical, certificate, scan, weights
from pairings.engine.criteria import ABSOLUTE, MILD, SIDE_RULE, STRONG, Field
from pairings.engine.types import CRITERIA
from pairings.engine.vector import WIDTH, AnyArray, Arrays, IntArray
from pairings.state import PlayerId

SPARSE_WIDE = 12
"""Players of a compatible side-wish class this near the rank-order ideal join the first sparse graph
(:func:`candidates.ideal_partners`; ``candidates.SPARSE_CLASS`` of the player's own wish)."""
RESTRICTED_GAPS = (1, 2)
"""Score gaps tried first when the greedy bound is weak (:func:`implicit_matching`)."""
SOLVES = 12
"""Sparse solves before the caller falls back to the listed path."""


def available() -> bool:
    """True when both compiled kernels are installed."""
    return scan.available() and blossom.compiled()


@dataclass(frozen=True)
class Solved:
    pairs: list[tuple[int, int]]
    """The canonical optimum (:mod:`pairings.engine.canonical`)."""
    route: candidates.Route
    every_pair_a_rematch: bool
    """The pruned player pairs exist and all are rematches (the engine then refuses the round)."""
    bound: candidates.Bound
    """The limits the certificate covered (the greedy bound, or :func:`candidates.restricted` ones)."""


class _Sparse:
    """The growing sparse graph: edges, cost rows and weights, without duplicates."""

    def __init__(self, arrays: Arrays, enc: weights.Encoder) -> None:
        self.arrays = arrays
        self.enc = enc
        self.n = arrays.n + arrays.n % 2
        self.keys: set[int] = set()
        self.u: list[IntArray] = []
        self.v: list[IntArray] = []
        self.w: list[AnyArray] = []

    def add(self, i: IntArray, j: IntArray, rows: IntArray | None = None) -> None:
        """Add the pairs not yet present, weighed by their cost rows (:func:`net` of them)."""
        keys = i * self.n + j
        fresh = np.array([k not in self.keys for k in keys.tolist()], dtype=bool)
        if not fresh.any():
            return
        i, j, keys = i[fresh], j[fresh], keys[fresh]
        _, first = np.unique(keys, return_index=True)
        i, j = i[first], j[first]
        self.keys.update(keys[first].tolist())
        self.u.append(i)
        self.v.append(j)
        rows = self.arrays.costs(i, j) if rows is None else rows[fresh][first]
        self.w.append(weights.encode(self.enc, net(self.arrays, i, j, rows)))

    def edges(self) -> tuple[IntArray, IntArray, AnyArray]:
        w = self.w
        if not w:
            return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64)
        dtype = object if any(x.dtype == object for x in w) else np.int64
        return np.concatenate(self.u), np.concatenate(self.v), np.concatenate([x.astype(dtype) for x in w])


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


def _start(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId], arrays: Arrays,
           bound: candidates.Bound) -> tuple[scan.PairScan, scan.Stats, _Sparse, int] | None:
    """The scan of the pairs within ``bound``, the first sparse graph and its bye edges' count.

    None when values go beyond the kernels' integers.

    The first sparse graph: the bye edges, each player's compatible partners
    near the rank-order ideal (:func:`candidates.ideal_partners`), each
    player's heaviest pairs, and the bound's own pairing, if any (so that the
    sparse graph has a full pairing).
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
        sparse = _Sparse(arrays, enc)
        sparse.add(bu, bv, brows)
        near = candidates.ideal_partners(arrays, candidates.SPARSE_CLASS, SPARSE_WIDE)
        i, j, rows = candidates.admissible(arrays, *near, bound)
        sparse.add(i, j, rows)
        sparse.add(*pairscan.heaviest(enc, candidates.SPARSE_BEST))
    except ValueError:
        return None
    own = np.array(bound.pairs, dtype=np.int64).reshape(-1, 2)
    own = own[own[:, 1] < n]  # its bye edge is among the bye edges
    sparse.add(own[:, 0], own[:, 1])  # within the bound by the bound's own argument
    return pairscan, stats, sparse, len(bu)


Certified = tuple[list[tuple[int, int]], blossom.Dual, int, scan.Checked]
"""An optimum, its certified dual, the sparse solves made and the scan under that dual."""


def _certified(sparse: _Sparse, pairscan: scan.PairScan) -> Certified | None:
    """The sparse solve repeated until its dual holds on every pair of the scan.

    None when no certificate is reached within ``SOLVES`` solves (or values leave the kernels' range).
    """
    last: tuple[list[tuple[int, int]], blossom.Dual] | None = None
    for attempt in range(1, SOLVES + 1):
        u, v, w = sparse.edges()
        if last is None:
            result = blossom.perfect_matching_arrays(sparse.n, u, v, w)
        else:
            result = blossom.perfect_matching_arrays(sparse.n, u, v, w, last[0], last[1])
        if result is None:  # the sparse graph has no full pairing (possible within restricted limits)
            return None
        pairs, dual = last = result
        try:
            found = pairscan.check(sparse.enc, dual, candidates.SPARSE_ADD)
        except ValueError:
            return None
        if found.count == 0 and certificate.certify(sparse.n, u, v, w, pairs, dual):
            return pairs, dual, attempt, found
        sparse.add(found.i, found.j)
    return None


def _canonical(sparse: _Sparse, checked: scan.Checked, pairs: list[tuple[int, int]], dual: blossom.Dual
               ) -> list[tuple[int, int]]:
    """The canonical optimum among the pruned pairs and bye edges tight under the certified ``dual``.

    Every bye edge is in the sparse graph; the pruned player pairs outside it
    are those the certifying scan found tight (``checked``).
    """
    u, v, w = sparse.edges()
    keep = canonical.tight(u, v, w, dual)
    keys = np.unique(np.concatenate([u[keep] * sparse.n + v[keep],
                                     checked.tight_i * sparse.n + checked.tight_j]))
    tu, tv = keys // sparse.n, keys % sparse.n
    return canonical.canonical(sparse.n, tu, tv, canonical.depths(sparse.n, tu, tv, dual), pairs)


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
                      bound: candidates.Bound) -> Solved | None:
    """The optimal index pairs of ``players`` with their certificate route; None: use the listed path.

    When ``bound`` (the greedy pairing's) is weak, tries the
    :func:`candidates.restricted` limits first (no avoidable hard-rule
    relaxation, at most one, then two, units apart), then ``bound`` itself.
    An optimum certified among the pairs within limits of ``g`` units is the
    optimum when the safe-pruning bound it proves itself
    (:func:`candidates.bound_of`) relaxes no hard rule and floats at most
    ``g`` units: every pair that bound keeps lies within the limits, where
    nothing beats it.
    """
    arrays = Arrays(fld, players)
    tries = [candidates.restricted(g) for g in RESTRICTED_GAPS if bound.max_gap is None or g < bound.max_gap]
    tries.append(bound)
    for limits in tries:
        started = _start(fld, players, no_bye, arrays, limits)
        if started is None:
            continue
        pairscan, stats, sparse, byes = started
        found = _certified(sparse, pairscan)
        if found is None:
            continue
        pairs, dual, attempts, checked = found
        if limits is not bound and not _proves_itself(fld, players, no_bye, pairs, limits.levels):
            continue
        pairs = _canonical(sparse, checked, pairs, dual)
        route = candidates.Route(True, attempts, sum(len(x) for x in sparse.u), stats.count + byes)
        return Solved(pairs, route, stats.count > 0 and stats.rematch_free == 0, limits)
    return None
