"""The sparse graph and the certified solve repeated on it, shared by both routes to the optimum.

Both routes (:mod:`pairings.engine.listed`: the pruned pairs held in arrays;
:mod:`pairings.engine.implicit`: the pruned pairs walked by the compiled scan)
solve a *sparse* graph of the pruned pairs and prove its answer optimal on all
of them. They differ only in how the pairs outside the sparse graph are priced
under a dual (a :class:`Pricing`).

Notes
-----
**The first sparse graph** (both routes build it alike): every bye edge; per player,
its compatible partners near the rank-order ideal (:func:`ideal_partners`);
each player's :data:`SPARSE_BEST` heaviest pairs; and the bound's own pairing
(so that the sparse graph has a full pairing whenever the bound has one).

**The repeated solve** (:func:`certify`, column generation): solve the sparse
graph (the engine's blossom, :func:`blossom.perfect_matching_arrays`, which
returns an optimal dual; later solves warm-start from the previous matching and
dual); check the dual on the sparse graph (:func:`certificate.certify`: dual
feasible there and equal objectives) and price every pair outside it; when no
pair has a negative reduced cost, the dual is feasible on every pruned pair and
the matching is optimal on all of them (LP duality over Edmonds' perfect
matching polytope, :mod:`pairings.engine.certificate`). Otherwise each
player's :data:`SPARSE_ADD` most violated pairs join the sparse graph and the
solve repeats, at most :data:`SOLVES` times.

**The canonical optimum** (:func:`canonical_optimum`): among optima of equal
cost, the tie-break of :mod:`pairings.engine.canonical`, on the pairs tight
under the certified dual (the sparse graph's and the priced ones). The optima
are the same whatever the optimal dual (canonical's Notes), so both routes
return the same pairs.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Protocol, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine import blossom, canonical, certificate
from pairings.engine.candidates import Bound
from pairings.engine.vector import AnyArray, Arrays, IntArray

SPARSE_BEST = 3
"""Each player's heaviest pairs in the first sparse graph."""
SPARSE_CLASS = 4
"""Players of the player's own side-wish class either side of its rank-order ideal (:func:`ideal_partners`)."""
SPARSE_WIDE = 12
"""... and of a compatible side-wish class."""
SPARSE_ADD = 2
"""Violated pairs added per player and solve (the most violated first)."""
SOLVES = 12
"""Sparse solves before :func:`certify` gives up (the caller then takes a slower exact way)."""

Pairs = list[tuple[int, int]]


@dataclass(frozen=True)
class Route:
    """How the engine's matching was found (for tests and the benchmark)."""

    path: str
    """``"implicit"`` (the compiled scan) or ``"listed"`` (the pruned pairs in arrays)."""
    certified: bool
    """True: sparse graph plus a dual certificate on every pruned pair; False: solved on every pruned pair."""
    rounds: int
    """Sparse solves made."""
    sparse_edges: int
    pruned: int = 0
    """Pruned edges the certificate covered (0: not counted)."""


@dataclass(frozen=True)
class Solved:
    """A route's answer for one round."""

    pairs: list[tuple[int, int]]
    """The canonical optimum (:mod:`pairings.engine.canonical`)."""
    route: Route
    every_pair_a_rematch: bool
    """The pruned player pairs exist and all are rematches (the engine then refuses the round)."""
    bound: Bound
    """The limits the certificate covered (the greedy bound, or :func:`candidates.restricted` ones)."""


@dataclass(frozen=True)
class Priced:
    """What pricing the pairs outside the sparse graph under a dual found."""

    i: IntArray
    j: IntArray
    """Each player's most violated pairs ``(i, j)``, ``i < j``."""
    count: int
    """How many pairs violate the dual."""
    tight_i: IntArray
    tight_j: IntArray
    """Pairs with a zero reduced cost (any of them may also be in the sparse graph)."""


class Pricing(Protocol):
    """Prices every pruned pair under a dual; raises ``ValueError`` when values leave its integers."""

    def __call__(self, dual: blossom.Dual) -> Priced: ...


class SparseGraph:
    """The growing sparse graph over ``n`` vertices: pairs without duplicates and their weights.

    ``weigh(i, j)`` gives the weights of pairs added without them.
    """

    def __init__(self, n: int, weigh: Callable[[IntArray, IntArray], AnyArray]) -> None:
        self.n = n
        self.weigh = weigh
        self.keys: set[int] = set()
        self.u: list[IntArray] = []
        self.v: list[IntArray] = []
        self.w: list[AnyArray] = []

    def add(self, i: IntArray, j: IntArray, w: AnyArray | None = None) -> None:
        """Add the pairs ``i < j`` not yet present, with weights ``w`` (default: ``weigh``)."""
        keys = i * self.n + j
        fresh = np.array([k not in self.keys for k in keys.tolist()], dtype=bool)
        if not fresh.any():
            return
        _, first = np.unique(keys[fresh], return_index=True)
        take = np.flatnonzero(fresh)[first]
        i, j = i[take], j[take]
        self.keys.update(keys[take].tolist())
        self.u.append(i)
        self.v.append(j)
        self.w.append(self.weigh(i, j) if w is None else w[take])

    def size(self) -> int:
        return len(self.keys)

    def edges(self) -> tuple[IntArray, IntArray, AnyArray]:
        if not self.w:
            return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64)
        dtype = object if any(x.dtype == object for x in self.w) else np.int64
        return np.concatenate(self.u), np.concatenate(self.v), np.concatenate([x.astype(dtype) for x in self.w])


@dataclass(frozen=True)
class Certified:
    """An optimum of every pruned pair, its certified dual, the sparse solves made and the last pricing."""

    pairs: Pairs
    dual: blossom.Dual
    solves: int
    priced: Priced


def certify(sparse: SparseGraph, pricing: Pricing, warm: Sequence[tuple[int, int]] = (),
            solves: int | None = None) -> Certified | None:
    """The sparse solve repeated until its dual holds on every pruned pair (module Notes).

    ``warm``: a full pairing to start the first solve from. None when the
    sparse graph has no full pairing, values leave the kernels' range, or no
    certificate is reached within ``solves`` solves (default :data:`SOLVES`).
    """
    pairs: Sequence[tuple[int, int]] = warm
    dual: blossom.Dual | None = None
    for attempt in range(1, (SOLVES if solves is None else solves) + 1):
        u, v, w = sparse.edges()
        result = blossom.perfect_matching_arrays(sparse.n, u, v, w, pairs, dual)
        if result is None:
            return None
        pairs, dual = result
        try:
            priced = pricing(dual)
        except ValueError:
            return None
        if priced.count == 0:
            if not certificate.certify(sparse.n, u, v, w, pairs, dual):
                return None  # nothing left to add: the producer's dual is wrong, trust nothing
            return Certified(list(pairs), dual, attempt, priced)
        sparse.add(priced.i, priced.j)
    return None


def canonical_optimum(sparse: SparseGraph, found: Certified) -> Pairs:
    """The canonical optimum among the pairs tight under the certified dual (module Notes)."""
    u, v, w = sparse.edges()
    keep = canonical.tight(u, v, w, found.dual)
    n = sparse.n
    keys = np.unique(np.concatenate([u[keep] * n + v[keep], found.priced.tight_i * n + found.priced.tight_j]))
    tu, tv = keys // n, keys % n
    return canonical.canonical(n, tu, tv, canonical.depths(n, tu, tv, found.dual), found.pairs)


def ideal_partners(a: Arrays, near: int = SPARSE_CLASS, wide: int | None = None) -> tuple[IntArray, IntArray]:
    """Pairs ``i < j`` of one score group where ``j`` is near ``i``'s rank-order ideal within its side class.

    For each player and each side-wish class (first, second, none) of its
    score group, the ``near`` players of that class on each side of the
    ideal position (group rank plus or minus half the group, docs/engine.md S6),
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


def best_per_vertex(u: IntArray, v: IntArray, score: AnyArray, among: NDArray[np.bool_],
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
