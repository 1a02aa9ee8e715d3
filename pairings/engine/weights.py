"""Integer edge weights that make one maximum-weight matching the lexicographic optimum.

Notes
-----
**Components.** A pair's cost tuple (:data:`pairings.costs.LAYOUT` order) is
expanded into components: ``score_gap`` becomes ``gap_L, ..., gap_1`` in its
place (with the default order ``rematch, side_rule, repeat_bye, gap_L, ...,
gap_1, bye_rank, pref_absolute, ..., rank_order``), where ``gap_d`` is 1 when
the pair's score gap is ``d`` units (``L`` is the largest gap among the
candidate edges). Comparing the per-level
counts ``(c_L, ..., c_1)`` highest level first is the same as comparing the
sorted-largest-first gap lists lexicographically (docs/engine.md S2), because all
maximum-cardinality matchings have the same number of pairs: at the highest
level where the counts differ, the list with more entries at that level has the
larger element at the first position where the lists differ.

**Bound (proof of strict priority).** Let ``P`` be the number of edges of a
matching (at most ``floor(V / 2)`` for ``V`` vertices) and ``m_k`` the largest
value of component ``k`` over the candidate edges. Every matching's total in
component ``k`` is an integer ``S_k`` with ``0 <= S_k <= T_k := P * m_k``. With
radices ``R_k = T_k + 1`` and place values ``M_last = 1``,
``M_k = M_{k+1} * R_{k+1}``, a matching's total cost is
``C = sum_k S_k * M_k``: the mixed-radix number with digits ``S_k`` (each digit
below its radix). Two digit strings compare as numbers exactly as they compare
lexicographically, so no amount of lower components can outweigh one unit of
a higher one, whatever the field size. Each edge gets the weight
``w(e) = K - cost(e)`` with ``K = 1 + max_e cost(e)`` > 0; for matchings of the
same cardinality ``c``, ``W = c * K - C``, so the maximum-weight matching among
those of maximum cardinality (Edmonds' blossom algorithm with
``maxcardinality``) is the lexicographic minimum of the cost vector. S1 (pair as
many as possible) is the cardinality itself.

Two refinements keep the weights short. A matching has at most one bye edge,
so for the bye's own components (``repeat_bye``, ``bye_rank``, zero on every
pair), and for gap levels that only bye edges reach, ``T_k = m_k``; and a component with ``m_k = 0`` contributes nothing, so
its place value is left 0 (its radix is 1, so it does not widen the others).
A component that is a sum over the pair's two players (a preference missed, a
repeated float, a side-rule break) totals at most what all players together
can contribute, which may be far less than ``P * m_k`` (few players floated
last round): ``T_k`` is then that sum.

The weights are exact Python integers (no floats, any size); the fast solver
path checks that they fit its integer type before it is used.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Collection, Mapping, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.costs import LAYOUT
from pairings.engine.criteria import Cost
from pairings.engine.vector import AnyArray

GAP_INDEX = LAYOUT.gap
"""Position of ``score_gap`` in a cost tuple."""
BYE_ONLY = LAYOUT.bye_only
"""Positions of the criteria non-zero only on bye edges (``repeat_bye``, ``bye_rank``: :meth:`Field.pair`
leaves them 0)."""


@dataclass(frozen=True, slots=True)
class Encoder:
    """Place values for the expanded components of the candidate edges' costs."""

    levels: int
    """Largest score gap ``L`` (in units) among the candidate edges."""
    place: tuple[int, ...]
    """``M_k`` for each expanded component, highest priority first."""
    top: int
    """``K``: one more than the largest edge cost."""

    def expand(self, cost: Cost) -> tuple[int, ...]:
        gap = cost[GAP_INDEX]
        levels = tuple(1 if gap == d else 0 for d in range(self.levels, 0, -1))
        return cost[:GAP_INDEX] + levels + cost[GAP_INDEX + 1:]

    def cost(self, cost: Cost) -> int:
        """``sum_k c_k * M_k`` over the expanded components, without building them."""
        place = self.place
        gap = cost[GAP_INDEX]
        total = 0
        for k in range(GAP_INDEX):
            total += cost[k] * place[k]
        if gap:
            total += place[GAP_INDEX + self.levels - gap]
        k = GAP_INDEX + self.levels
        for v in cost[GAP_INDEX + 1:]:
            total += v * place[k]
            k += 1
        return total

    def weight(self, cost: Cost) -> int:
        return self.top - self.cost(cost)


def encoder(costs: Sequence[Cost], vertices: int) -> Encoder:
    """Build the place values for these candidate edge costs (see the module Notes)."""
    if not costs:
        return Encoder(0, (), 1)
    columns = [max(col) for col in zip(*costs)]
    enc = from_maxima(columns, {c[GAP_INDEX] for c in costs}, vertices)
    return Encoder(enc.levels, enc.place, 1 + max(enc.cost(c) for c in costs))


def from_maxima(columns: Sequence[int], gaps: Collection[int], vertices: int,
                bye_gaps: Collection[int] = (), bye_columns: Collection[int] = (),
                shares: Mapping[int, int] | None = None) -> Encoder:
    """Place values from each criterion's largest value and the gaps present (``top`` left 0).

    A component that is 0 on every edge gets place value 0 (it never counts);
    the bye's own components (:data:`BYE_ONLY`, and ``bye_columns`` when the
    caller knows more), and the levels of ``bye_gaps`` (gaps that only bye
    edges have), get radix ``m_k + 1`` (module Notes). ``shares`` maps a
    column counted player by player to the most its players can add up to
    over any pairing: its radix is at most that plus one.
    """
    levels = columns[GAP_INDEX]
    maxima = list(columns[:GAP_INDEX]) + [1 if d in gaps else 0 for d in range(levels, 0, -1)] \
        + list(columns[GAP_INDEX + 1:])
    bye_only = {k if k < GAP_INDEX else k - 1 + levels for k in (*BYE_ONLY, *bye_columns) if k != GAP_INDEX} \
        | {GAP_INDEX + levels - d for d in bye_gaps if 0 < d <= levels}
    pairs = vertices // 2
    place = [1] * len(maxima)
    limit = {k if k < GAP_INDEX else k - 1 + levels: v for k, v in (shares or {}).items() if k != GAP_INDEX}
    for k in range(len(maxima) - 2, -1, -1):
        most = maxima[k + 1] * (1 if k + 1 in bye_only else pairs)
        place[k] = place[k + 1] * (min(most, limit.get(k + 1, most)) + 1)
    return Encoder(levels, tuple(p if m else 0 for p, m in zip(place, maxima)), 0)


def _totals(enc: Encoder, costs: NDArray[np.int64]) -> AnyArray:
    """:meth:`Encoder.cost` of every row of ``costs``: int64 when it fits, Python integers otherwise."""
    gap = costs[:, GAP_INDEX]
    levels = enc.levels
    col_place = list(enc.place[:GAP_INDEX]) + list(enc.place[GAP_INDEX + levels:])
    gap_place = [0] + [enc.place[GAP_INDEX + levels - d] for d in range(1, levels + 1)]
    cols = [k for k in range(costs.shape[1]) if k != GAP_INDEX]
    used = [(p, k) for p, k in zip(col_place, cols) if costs[:, k].any()]
    bound = max(enc.top, sum(p * int(costs[:, k].max()) for p, k in used) + max(gap_place))
    dtype = np.int64 if 2 * bound + 2 < 2**62 else object
    total = np.array(gap_place, dtype=dtype)[gap]
    for p, k in used:
        total = total + costs[:, k].astype(dtype) * p
    return np.asarray(total)


def encode(enc: Encoder, costs: NDArray[np.int64]) -> AnyArray:
    """:meth:`Encoder.weight` of every row of ``costs``, exact (int64 when it fits)."""
    if len(costs) == 0:
        return np.zeros(0, dtype=np.int64)
    return np.asarray(enc.top - _totals(enc, costs))


def bounding(maxima: Sequence[int], gaps: Collection[int], vertices: int,
             bye_gaps: Collection[int] = (), bye_columns: Collection[int] = (),
             shares: Mapping[int, int] | None = None) -> Encoder:
    """:func:`from_maxima` with ``top`` one more than any cost those maxima allow.

    For edge sets known only by their column maxima (the engine's implicit
    pruned pairs): ``top`` bounds every edge's cost from above, so every weight
    is positive; a common shift of all weights changes no comparison between
    perfect matchings (they all have the same number of edges).
    """
    enc = from_maxima(maxima, gaps, vertices, bye_gaps, bye_columns, shares)
    levels = enc.levels
    rest = list(maxima[:GAP_INDEX]) + list(maxima[GAP_INDEX + 1:])
    places = list(enc.place[:GAP_INDEX]) + list(enc.place[GAP_INDEX + levels:])
    top = 1 + sum(p * m for p, m in zip(places, rest)) + (enc.place[GAP_INDEX] if levels else 0)
    return Encoder(levels, enc.place, top)


def weight_array(costs: NDArray[np.int64], vertices: int) -> AnyArray:
    """:meth:`Encoder.weight` of every row of ``costs`` under :func:`encoder` of those rows.

    Exact: ``int64`` when the largest weight fits, Python integers otherwise.
    """
    if len(costs) == 0:
        return np.zeros(0, dtype=np.int64)
    gap = costs[:, GAP_INDEX]
    enc = from_maxima([int(x) for x in costs.max(axis=0)], set(np.unique(gap).tolist()), vertices)
    total = _totals(enc, costs)
    return np.asarray(1 + max(total.tolist()) - total)
