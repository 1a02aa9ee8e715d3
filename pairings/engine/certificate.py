"""Proof that a perfect matching has maximum weight: an Edmonds dual checked edge by edge.

Notes
-----
**Soundness (LP duality over Edmonds' perfect matching polytope).** The
perfect matchings of a graph are the vertices of the polytope
``x >= 0``, ``x(delta(v)) = 1`` for every vertex ``v``,
``x(E(B)) <= (|B| - 1) / 2`` for every odd set ``B`` (Edmonds 1965). Take
any ``y`` (free) and ``z >= 0`` on odd sets with
``y_u + y_v + sum(z_B : u, v in B) >= w_uv`` for **every** edge ``uv``. For
any perfect matching ``M'``::

    w(M') <= sum_{uv in M'} (y_u + y_v + sum_B z_B [u, v in B])
           = sum_v y_v + sum_B z_B |M' cap E(B)|
          <= sum_v y_v + sum_B z_B (|B| - 1) / 2 =: D(y, z).

So a perfect matching ``M`` with ``w(M) = D(y, z)`` has maximum weight among
all perfect matchings of the graph: :func:`certify` checks exactly this, on
the edges it is given, whatever produced ``M`` and the dual. The engine
computes ``M`` and the dual on a sparse subgraph
(:func:`pairings.engine.blossom.perfect_matching`) and certifies it on every
candidate edge.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine.blossom import Dual
from pairings.engine.vector import AnyArray, IntArray


SHIFT = 40
"""Limb width: exact values are split as ``hi * 2**SHIFT + lo`` with ``0 <= lo < 2**SHIFT``."""
CLIP = 2**62
PAIR_TABLE = 4096
"""With at most this many pairs of blossom-tree nodes, the blossom sums are tabled per pair of nodes."""


Limbs = tuple[IntArray, IntArray]


def limbs(x: AnyArray) -> Limbs | None:
    """``(hi, lo)`` int64 limbs of exact integers ``x``, or None when ``hi`` would not fit in 2**56."""
    if x.dtype != object:
        return x >> SHIFT, x & ((1 << SHIFT) - 1)
    values = x.tolist()
    if max(map(abs, values), default=0) >= 2**(56 + SHIFT):
        return None
    return (np.array([a >> SHIFT for a in values], dtype=np.int64),
            np.array([a & ((1 << SHIFT) - 1) for a in values], dtype=np.int64))


def _top(x: IntArray) -> int:
    return int(np.abs(x).max()) if len(x) else 0


def reduced_costs(u: IntArray, v: IntArray, w: AnyArray, dual: Dual, split: Limbs | None = None) -> IntArray:
    """Doubled reduced costs ``2 (y_u + y_v + sum z_B - w_uv)`` of edges ``(u[k], v[k], w[k])``.

    Exact where ``|rc| < 2**62``; larger values are clipped to ``+-2**62``
    (their sign stays exact), which is all the certificate and the column
    generation read. Computed on two int64 limbs per value, so weights and
    duals beyond 64 bits (up to about 96) cost no Python integers per edge.
    ``split`` is ``limbs(w)`` when the caller already has it.
    """
    n = len(dual.y2)
    y = limbs(np.array(dual.y2, dtype=object))
    ww = split if split is not None else limbs(w)
    z = limbs(np.array([zb for _, zb in dual.blossoms], dtype=object))
    if y is None or ww is None or z is None or 2 * (_top(y[0]) + _top(ww[0]) + int(np.abs(z[0]).sum())) >= 2**62:
        return _exact(u, v, w, dual)  # the high limbs' sum could overflow int64
    hi = y[0][u] + y[0][v] - 2 * ww[0]
    lo = y[1][u] + y[1][v] - 2 * ww[1]
    zh, zl = _common_z(n, u, v, dual, z) or _each_z(n, u, v, dual, z)
    hi += 2 * zh
    lo += 2 * zl
    hi += lo >> SHIFT  # carry: now rc = hi * 2**SHIFT + lo with 0 <= lo < 2**SHIFT
    lo &= (1 << SHIFT) - 1
    limit = CLIP >> SHIFT
    small = np.abs(hi) < limit
    rc = np.where(hi < 0, -CLIP, CLIP)
    rc[small] = (hi[small] << SHIFT) + lo[small]
    return np.clip(rc, -CLIP, CLIP)


def _each_z(n: int, u: IntArray, v: IntArray, dual: Dual, z: Limbs) -> Limbs:
    """``sum(z_B : u[k], v[k] in B)`` per edge, blossom by blossom (any family of odd sets)."""
    zh, zl = np.zeros(len(u), dtype=np.int64), np.zeros(len(u), dtype=np.int64)
    for (members, _), h, low in zip(dual.blossoms, z[0].tolist(), z[1].tolist()):
        inside = np.zeros(n, dtype=bool)
        inside[list(members)] = True
        both = inside[u] & inside[v]
        zh[both] += h
        zl[both] += low
    return zh, zl


@dataclass(frozen=True)
class Laminar:
    """The blossoms of a dual as a tree: blossom ``b`` is node ``b``, node ``m`` a virtual root."""

    owner: IntArray
    """Per vertex: its innermost blossom, or the root ``m`` when it is in none."""
    parent: IntArray
    """Per node (``m + 1``): the smallest blossom holding it, or the root; the root's parent is itself."""
    depth: IntArray
    prefix: list[int]
    """Per node: ``z`` of the blossom plus ``z`` of every blossom holding it (0 at the root)."""
    order: list[int]
    """The blossoms, every one after the blossoms holding it."""


def laminar(n: int, dual: Dual) -> Laminar:
    """The tree of ``dual.blossoms`` over vertices ``0..n-1``.

    Raises ValueError when the sets are not laminar (not a blossom dual) or
    hold a vertex outside the graph.
    """
    m = len(dual.blossoms)
    order = sorted(range(m), key=lambda b: -len(dual.blossoms[b][0]))  # parents (larger) first
    owner = np.full(n, m, dtype=np.int64)
    parent = np.full(m + 1, m, dtype=np.int64)
    depth = np.zeros(m + 1, dtype=np.int64)
    prefix = [0] * (m + 1)
    for b in order:
        members, z = dual.blossoms[b]
        idx = np.fromiter(members, dtype=np.int64, count=len(members))
        p = m
        if len(idx):
            if idx.min() < 0 or idx.max() >= n:
                raise ValueError("a blossom holds a vertex outside the graph")
            p = int(owner[idx[0]])
            if (owner[idx] != p).any():
                raise ValueError("the blossoms are not laminar")
            owner[idx] = b
        parent[b], depth[b], prefix[b] = p, depth[p] + 1, prefix[p] + z
    return Laminar(owner, parent, depth, prefix, order)


def _common_z(n: int, u: IntArray, v: IntArray, dual: Dual, z: Limbs) -> Limbs | None:
    """``sum(z_B : u[k], v[k] in B)`` per edge, as limbs, by lowest common ancestors.

    The blossoms are laminar, so the blossoms holding both ends of an edge are
    the common ancestors of the smallest blossoms holding each end; with
    ``P[B]`` the sum of ``z`` over ``B`` and its ancestors the answer is
    ``P[lca]``. The ancestors are found by binary lifting over all edges at
    once: a few array passes instead of one per blossom. None when the
    sets are not laminar (not a blossom dual; :func:`_each_z` then sums).
    """
    try:
        tree = laminar(n, dual)
    except ValueError:
        return None
    sums = limbs(np.array(tree.prefix, dtype=object))
    if sums is None:
        return None
    owner, parent, depth = tree.owner, tree.parent, tree.depth
    ph, pl = sums
    up = [parent]
    while (1 << len(up)) <= int(depth.max()):
        up.append(up[-1][up[-1]])
    a, c = owner[u], owner[v]
    nodes = len(parent)
    if nodes * nodes <= PAIR_TABLE:  # few blossoms: every pair of nodes once, then one lookup per edge
        x, y = np.divmod(np.arange(nodes * nodes, dtype=np.int64), nodes)
        th, tl = _lca_sums(x, y, up, depth, parent, ph, pl)
        key = a * nodes + c
        return th[key], tl[key]
    root = len(dual.blossoms)
    inner = np.flatnonzero((a != root) & (c != root))  # an end in no blossom: no common blossom
    if len(inner) < len(u):
        zh, zl = np.zeros(len(u), dtype=np.int64), np.zeros(len(u), dtype=np.int64)
        if len(inner):
            zh[inner], zl[inner] = _lca_sums(a[inner], c[inner], up, depth, parent, ph, pl)
        return zh, zl
    return _lca_sums(a, c, up, depth, parent, ph, pl)


def _lca_sums(a: IntArray, c: IntArray, up: list[IntArray], depth: IntArray, parent: IntArray, ph: IntArray,
              pl: IntArray) -> Limbs:
    """``P[lca(a[k], c[k])]`` as limbs, by binary lifting (``up[k]``: the ``2**k``-th ancestor)."""
    swap = depth[a] < depth[c]
    a, c = np.where(swap, c, a), np.where(swap, a, c)
    diff = depth[a] - depth[c]
    for k, table in enumerate(up):
        a = np.where((diff >> k) & 1 == 1, table[a], a)
    for table in reversed(up):
        differ = table[a] != table[c]
        a, c = np.where(differ, table[a], a), np.where(differ, table[c], c)
    lca = np.where(a == c, a, parent[a])
    return ph[lca], pl[lca]


def _exact(u: IntArray, v: IntArray, w: AnyArray, dual: Dual) -> IntArray:
    """:func:`reduced_costs` with Python integers (values beyond the two limbs), clipped the same way."""
    y2 = np.array(dual.y2, dtype=object)
    rc = y2[u] + y2[v] - 2 * w.astype(object)
    n = len(dual.y2)
    for members, z in dual.blossoms:
        inside = np.zeros(n, dtype=bool)
        inside[list(members)] = True
        both = inside[u] & inside[v]
        if both.any():
            rc[both] = rc[both] + 2 * z
    return np.array([max(-CLIP, min(CLIP, x)) for x in rc.tolist()], dtype=np.int64)


def certify(n: int, u: NDArray[np.int64], v: NDArray[np.int64], w: AnyArray,
            pairs: Sequence[tuple[int, int]], dual: Dual, split: Limbs | None = None) -> bool:
    """True when ``pairs`` is a perfect matching of maximum weight on these edges (module Notes)."""
    if len(dual.y2) != n or any(z < 0 for _, z in dual.blossoms) or \
            any(len(b) % 2 == 0 for b, _ in dual.blossoms):
        return False
    covered = [x for p in pairs for x in p]
    if len(covered) != n or len(set(covered)) != n:
        return False
    keys = np.minimum(u, v) * n + np.maximum(u, v)
    order = np.argsort(keys, kind="stable")
    wanted = np.array([min(a, b) * n + max(a, b) for a, b in pairs], dtype=np.int64)
    at = np.minimum(np.searchsorted(keys[order], wanted), max(len(order) - 1, 0))
    if len(wanted) and (len(order) == 0 or (keys[order][at] != wanted).any()):
        return False  # a pair that is not an edge
    weight = sum(w[order[at]].tolist())
    rc = reduced_costs(u, v, w, dual, split)
    return bool((rc >= 0).all()) and dual.objective2() == 2 * weight


@dataclass(frozen=True)
class Verdict:
    """What :func:`check` found: the dual's feasibility and complementary slackness with a matching.

    For a feasible dual ``(y, z)`` and a perfect matching ``M``,
    ``w(M) = D(y, z)`` holds exactly when every edge of ``M`` is tight
    (reduced cost 0) and every blossom with ``z_B > 0`` is full
    (``|M cap E(B)| = (|B| - 1) / 2``): in the chain of the module Notes both
    inequalities are then equalities, and conversely. So feasibility and
    complementary slackness prove ``M`` a maximum-weight perfect matching.
    """

    perfect: bool
    """The matching covers every vertex once, with edges of the graph only."""
    violated: int
    """Edges with a negative reduced cost (the dual is feasible when 0)."""
    loose: int
    """Edges of the matching that are not tight."""
    short: int
    """Blossoms with ``z_B > 0`` that the matching does not fill."""
    sound: bool
    """``z >= 0`` on odd sets of the graph's vertices, one ``y`` per vertex."""

    @property
    def ok(self) -> bool:
        return self.perfect and self.sound and not self.violated and not self.loose and not self.short


def check(n: int, u: IntArray, v: IntArray, w: AnyArray, matched: Sequence[tuple[int, int]], dual: Dual,
          split: Limbs | None = None) -> Verdict:
    """Check ``dual`` on the edges ``(u[k], v[k], w[k])`` and against the perfect matching ``matched``.

    Computed here from the arrays alone (reduced costs by :func:`reduced_costs`,
    blossom contents from the dual's vertex sets), with no code of the solver
    that produced the dual; :class:`Verdict` says why each check is needed.
    ``violated`` counts only the edges given: a caller that checks the rest
    elsewhere adds its own count.
    """
    sound = len(dual.y2) == n and all(z >= 0 and len(b) % 2 == 1 and min(b) >= 0 and max(b) < n
                                      for b, z in dual.blossoms)
    ends = [x for pair in matched for x in pair]
    keys = np.minimum(u, v) * n + np.maximum(u, v)
    order = np.argsort(keys, kind="stable")
    wanted = np.array([min(a, b) * n + max(a, b) for a, b in matched], dtype=np.int64)
    at = np.minimum(np.searchsorted(keys[order], wanted), max(len(order) - 1, 0))
    present = len(order) > 0 and bool((keys[order][at] == wanted).all()) if len(wanted) else True
    perfect = sorted(ends) == list(range(n)) and present
    if not sound:
        return Verdict(perfect, 0, 0, 0, False)
    violated = int((reduced_costs(u, v, w, dual, split) < 0).sum())
    loose = len(matched)
    if perfect and len(wanted):
        mine = order[at]
        loose = int((reduced_costs(u[mine], v[mine], w[mine], dual) != 0).sum())
    partner = np.full(n, -1, dtype=np.int64)
    if perfect:
        pairs = np.array(ends, dtype=np.int64).reshape(-1, 2)
        partner[pairs[:, 0]], partner[pairs[:, 1]] = pairs[:, 1], pairs[:, 0]
    inside = np.zeros(n + 1, dtype=bool)  # inside[-1] stays False: an unmatched vertex's partner
    short = 0
    for members, z in dual.blossoms:
        if z > 0:
            idx = np.fromiter(members, dtype=np.int64, count=len(members))
            inside[idx] = True
            short += int(inside[partner[idx]].sum()) != len(idx) - 1  # each inner pair counted twice
            inside[idx] = False
    return Verdict(perfect, violated, loose, short, sound)
