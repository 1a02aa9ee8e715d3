"""Maximum-weight perfect matching with its optimal dual (Edmonds' blossom algorithm).

The entry points of the engine's own blossom kernel. The search itself is
:class:`pairings.engine.edmonds.Search` (its module notes give the
formulation: the primal-dual method of Edmonds 1965, in the weighted form of
Galil 1986 and Korte & Vygen, chapter 11); this module prepares its start
and carries values in and out of the compiled twin. Unlike the solvers in
:mod:`pairings.engine.solver` it returns the dual, which
:mod:`pairings.engine.certificate` checks against edges the search never saw.

Notes
-----
**Start.** Vertex duals are free in sign, so the search may start from any
feasible dual and any matching of tight edges: each vertex starts at its
heaviest edge (``y2[v] = max w``), or at a carried dual (:func:`_carried`),
lowered around a warm matching (:func:`_tighten`) whose tight disjoint edges
are matched before the search. When no dual step is possible the graph has
no perfect matching (``None``).

**Compiled kernel.** :func:`perfect_matching` and :func:`perfect_matching_arrays`
run ``_blossom_c`` (the same design, the same names, the same choices, on
``__int128`` integers, without the GIL) whenever it is built,
:data:`USE_COMPILED` is true and every ``|w| < 2**118``; otherwise, or when a
dual would leave the kernel's range (``2**124``), the pure-Python search
runs. On the same input both return the same matching and the same dual.
Values cross into C as buffers: vertex ids as int64, weights and duals as
16-byte little-endian two's complement integers.

References
----------
J. Edmonds, "Paths, trees, and flowers", Canadian J. Math. 17 (1965).
J. Edmonds, "Maximum matching and a polyhedron with 0,1-vertices",
J. Res. Nat. Bur. Standards 69B (1965).
Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
ACM Computing Surveys 18 (1986).
B. Korte and J. Vygen, *Combinatorial Optimization*, chapter 11 (weighted matching).
"""

from __future__ import annotations

from dataclasses import dataclass
from importlib import import_module
from itertools import chain
from types import ModuleType
from typing import Any, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine.edmonds import NONE, Search

Edge = tuple[int, int, int]

_kernel: ModuleType | None
try:  # optional compiled kernel (setup.py builds it when a C compiler is there)
    _kernel = import_module("pairings.engine._blossom_c")
except ImportError:  # pragma: no cover - depends on the build
    _kernel = None

USE_COMPILED = True
"""Use the compiled kernel when it is built (tests set it False to force the pure-Python code)."""
WEIGHT_BOUND = 2**118
"""The kernel takes weights with ``|w| < WEIGHT_BOUND``."""
DUAL_BOUND = 2**124
"""... and carried duals below this; larger values run the pure-Python code."""


@dataclass(frozen=True)
class Dual:
    """An optimal dual: ``y2[v] = 2 * y_v`` and, per blossom, ``z_B`` with its vertices."""

    y2: list[int]
    blossoms: list[tuple[frozenset[int], int]]
    """(vertices, z_B) for every blossom with ``z_B > 0``."""

    def objective2(self) -> int:
        """Twice the dual objective ``sum y_v + sum z_B * (|B| - 1) / 2``."""
        return sum(self.y2) + sum(z * (len(b) - 1) for b, z in self.blossoms)

    def flat(self) -> list[int]:
        """``y2`` with each blossom's ``z_B`` added to its vertices: feasible wherever this dual is, with
        the edges inside blossoms still tight (a start for another solve, :func:`_carried`)."""
        d = list(self.y2)
        for members, z in self.blossoms:
            for x in members:
                d[x] += z
        return d


@dataclass(frozen=True)
class Wide:
    """Exact weights ``0 <= w < 2**126`` wider than int64, two 64-bit limbs each: ``hi * 2**64 + lo``.

    ``lo`` is read unsigned. Built in numpy by the caller (no Python integer per edge) and handed
    to the compiled kernel as they are (:func:`perfect_matching_arrays`).
    """

    hi: NDArray[np.int64]
    lo: NDArray[np.uint64]

    def ints(self) -> NDArray[Any]:
        """The weights as Python integers (an object array), for the pure-Python search."""
        return self.hi.astype(object) * 2**64 + self.lo.astype(object)  # type: ignore[no-any-return]

    def packed(self, bound: int = WEIGHT_BOUND) -> bytes | None:
        """16-byte little-endian integers for the kernel, or None when some weight reaches ``bound``."""
        if len(self.hi) and int(self.hi.max()) >= bound >> 64:
            return None
        return np.stack([self.lo.view(np.int64), self.hi], axis=1).astype("<i8").tobytes()


def compiled() -> bool:
    """True when :func:`perfect_matching` runs the compiled kernel (built and not switched off)."""
    return _kernel is not None and USE_COMPILED


def perfect_matching(n: int, edges: Sequence[Edge], warm: Sequence[int] = (), dual: Dual | None = None
                     ) -> tuple[list[tuple[int, int]], Dual] | None:
    """A maximum-weight perfect matching and an optimal dual, or None if there is none.

    Edmonds (1965), Galil (1986): see the module notes. Runs the compiled
    kernel when :func:`compiled` and the values fit, else :func:`python_perfect_matching`
    (same parameters, same kind of result).

    Parameters
    ----------
    n
        Vertices ``0..n-1``.
    edges
        ``(u, v, w)`` with integer ``w``; at most one edge per pair.
    warm
        Edge indices of a good perfect matching (e.g. a compiled solver's), a
        heuristic start: the dual is lowered around them by a few passes of
        coordinate descent, and those that end tight and disjoint are matched
        before the search. The result does not depend on ``warm`` being good.
    dual
        An optimal dual of a previous solve on fewer edges (column
        generation), another heuristic start: see :func:`_carried`.
    """
    if n % 2:
        return None
    if compiled():
        m = len(edges)
        u = np.fromiter((e[0] for e in edges), dtype=np.int64, count=m)
        v = np.fromiter((e[1] for e in edges), dtype=np.int64, count=m)
        w = _weights([e[2] for e in edges])
        if w is not None:
            try:
                return _solve(n, u, v, w, np.asarray(warm, dtype=np.int64), np.zeros(0, dtype=np.int64), dual)
            except _OutOfRange:
                pass
    return python_perfect_matching(n, edges, warm, dual)


def perfect_matching_arrays(n: int, u: NDArray[np.int64], v: NDArray[np.int64], w: NDArray[Any] | Wide,
                            warm_pairs: Sequence[tuple[int, int]] = (), dual: Dual | None = None
                            ) -> tuple[list[tuple[int, int]], Dual] | None:
    """:func:`perfect_matching` of the edges ``(u[k], v[k], w[k])`` given as arrays.

    ``u``, ``v``: int64 vertex arrays; ``w``: exact integers (dtype int64, an
    object array of Python ints, or :class:`Wide`). ``warm_pairs`` are vertex pairs ``(a, b)`` (either
    order) of a good matching rather than edge indices; a pair that is no edge
    is ignored. No Python tuple per edge is built on the compiled path.
    """
    if n % 2:
        return None
    uu = np.ascontiguousarray(u, dtype=np.int64)
    vv = np.ascontiguousarray(v, dtype=np.int64)
    if compiled():
        ww = w.packed() if isinstance(w, Wide) else _weights(w)
        if ww is not None:
            flat = np.asarray(warm_pairs, dtype=np.int64).reshape(-1)
            try:
                return _solve(n, uu, vv, ww, np.zeros(0, dtype=np.int64), flat, dual)
            except _OutOfRange:
                pass
    edges = list(zip(uu.tolist(), vv.tolist(), (w.ints() if isinstance(w, Wide) else np.asarray(w)).tolist()))
    where = {(min(a, b), max(a, b)): k for k, (a, b, _) in enumerate(edges)}
    warm = [where[key] for key in ((min(a, b), max(a, b)) for a, b in warm_pairs) if key in where]
    return python_perfect_matching(n, edges, warm, dual)


class _OutOfRange(Exception):
    """A value beyond the compiled kernel's integers: run the pure-Python code."""


def _weights(w: Sequence[int] | NDArray[Any], bound: int = WEIGHT_BOUND) -> bytes | None:
    """``w`` as 16-byte little-endian integers, or None when some ``|w| >= bound``."""
    if isinstance(w, np.ndarray) and w.dtype != object:
        if w.dtype.kind in "bi" or (w.dtype.kind == "u" and w.dtype.itemsize < 8):
            return _int128_bytes(w.astype(np.int64))
        if w.dtype.kind != "u":
            raise TypeError(f"weights must be exact integers, not {w.dtype}")
    values = w.tolist() if isinstance(w, np.ndarray) else list(w)
    if not values:
        return b""
    top, low = max(values), min(values)
    if -2**63 <= low and top < 2**63:
        return _int128_bytes(np.array(values, dtype=np.int64))
    if top >= bound or low <= -bound:
        return None
    exact = np.array(values, dtype=object)
    low_limb = (exact & (2**64 - 1)).astype(np.uint64).view(np.int64)
    return np.stack([low_limb, (exact >> 64).astype(np.int64)], axis=1).astype("<i8").tobytes()


def _int128_bytes(x: NDArray[np.int64]) -> bytes:
    """int64 values as 16-byte little-endian two's complement (low limb, then the sign limb)."""
    return np.stack([x, x >> 63], axis=1).astype("<i8").tobytes()


def _ints(buf: bytes) -> list[int]:
    """Python ints of 16-byte little-endian two's complement values."""
    limbs = np.frombuffer(buf, dtype="<i8").reshape(-1, 2)
    lo, hi = limbs[:, 0], limbs[:, 1]
    if bool((hi == lo >> 63).all()):
        return lo.astype(np.int64).tolist()  # type: ignore[no-any-return]
    return [int.from_bytes(buf[k:k + 16], "little", signed=True) for k in range(0, len(buf), 16)]


def _solve(n: int, u: NDArray[np.int64], v: NDArray[np.int64], w: bytes, warm_edges: NDArray[np.int64],
           warm_pairs: NDArray[np.int64], dual: Dual | None) -> tuple[list[tuple[int, int]], Dual] | None:
    """The compiled kernel's answer as :func:`perfect_matching`'s; raises :class:`_OutOfRange`."""
    assert _kernel is not None
    y2 = members = offsets = z = b""
    if dual is not None:
        y2_or_none = _weights(dual.y2, DUAL_BOUND)
        z_or_none = _weights([zb for _, zb in dual.blossoms], DUAL_BOUND)
        if len(dual.y2) != n or y2_or_none is None or z_or_none is None:
            raise _OutOfRange
        y2, z = y2_or_none, z_or_none
        sizes = [len(b) for b, _ in dual.blossoms]
        members = np.fromiter(chain.from_iterable(b for b, _ in dual.blossoms), dtype=np.int64,
                              count=sum(sizes)).tobytes()
        offsets = np.concatenate([[0], np.cumsum(sizes, dtype=np.int64)]).astype(np.int64).tobytes()
    try:
        got = _kernel.solve(n, u, v, w, warm_edges, warm_pairs, dual is not None, y2, members, offsets, z)
    except _kernel.Unsupported as exc:
        raise _OutOfRange from exc
    if got is None:
        return None
    partner_b, y2_b, members_b, offsets_b, z_b = got
    partner = np.frombuffer(partner_b, dtype=np.int64)
    rows = np.flatnonzero(partner > np.arange(n))
    pairs = list(zip(rows.tolist(), partner[rows].tolist()))
    flat = np.frombuffer(members_b, dtype=np.int64).tolist()
    ends = np.frombuffer(offsets_b, dtype=np.int64).tolist()
    blossoms = [(frozenset(flat[a:b]), zb) for a, b, zb in zip(ends, ends[1:], _ints(z_b))]
    return pairs, Dual(_ints(y2_b), blossoms)


def python_perfect_matching(n: int, edges: Sequence[Edge], warm: Sequence[int] = (), dual: Dual | None = None
                            ) -> tuple[list[tuple[int, int]], Dual] | None:
    """:func:`perfect_matching` in pure Python (the fallback without the compiled kernel)."""
    if n % 2:
        return None
    d = [0] * n
    seen = [False] * n
    for u, v, w in edges:
        if not seen[u] or w > d[u]:
            d[u], seen[u] = w, True
        if not seen[v] or w > d[v]:
            d[v], seen[v] = w, True
    if not all(seen):
        return None
    if dual is not None:
        d = _carried(edges, dual)
    _tighten(n, edges, d, warm)
    mate = [NONE] * n
    for k in warm:
        u, v, w = edges[k]
        if mate[u] == NONE and mate[v] == NONE and d[u] + d[v] == 2 * w:
            mate[u], mate[v] = v, u
    search = Search(n, [e[0] for e in edges], [e[1] for e in edges], [e[2] for e in edges], d, mate)
    if not search.run():
        return None
    return [(v, search.mate[v]) for v in range(n) if v < search.mate[v]], Dual(search.y2, search.blossoms())


def _carried(edges: Sequence[Edge], dual: Dual) -> list[int]:
    """A feasible flat doubled dual from ``dual``: each vertex takes the ``z_B`` of its blossoms.

    With ``d_v = y2_v + sum(z_B : v in B)`` every edge's doubled reduced cost
    gains ``sum(z_B : B holds exactly one end)`` >= 0, so ``d`` is feasible
    wherever ``dual`` was and edges inside blossoms stay tight; then each
    edge that is still violated (a new one) raises one end by the deficit.
    Matched edges leaving a blossom lose tightness, so a few vertices start
    exposed; the rest of the previous matching can be kept.
    """
    d = dual.flat()
    for u, v, w in edges:
        short = 2 * w - d[u] - d[v]
        if short > 0:
            d[u] += short
    return d


def _tighten(n: int, edges: Sequence[Edge], d: list[int], warm: Sequence[int], passes: int = 3) -> None:
    """Lower the (feasible) doubled dual ``d`` so that the ``warm`` edges become tight.

    Each pass sets, for a warm edge ``uv``, ``d[u]`` to the least value the
    other edges at ``u`` allow and ``d[v] = 2 w_uv - d[u]`` when that is
    feasible for ``v`` too; every assignment keeps every edge's reduced cost
    non-negative.
    """
    if not warm:
        return
    adj: list[list[tuple[int, int]]] = [[] for _ in range(n)]
    for u, v, w in edges:
        adj[u].append((v, 2 * w))
        adj[v].append((u, 2 * w))

    def least(u: int, skip: int) -> int | None:
        vals = [w2 - d[x] for x, w2 in adj[u] if x != skip]
        return max(vals) if vals else None

    for _ in range(passes):
        for k in warm:
            u, v, w = edges[k]
            if d[u] + d[v] == 2 * w:
                continue
            mu, mv = least(u, v), least(v, u)
            lu = mu if mu is not None else 2 * w - d[v]
            lv = mv if mv is not None else 2 * w - lu
            if lu + lv <= 2 * w:
                d[u], d[v] = lu, 2 * w - lu
