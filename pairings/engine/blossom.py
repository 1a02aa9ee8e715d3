"""Maximum-weight perfect matching with its optimal dual (Edmonds' blossom algorithm).

The primal-dual method of Edmonds (1965) in the O(n^3) form surveyed by
Galil (1986): an alternating tree grows from one exposed vertex at a time
(a stage ends when a tight edge reaches another exposed vertex: an augmenting
path), odd cycles are shrunk into blossoms, and the dual of the tree moves by
the largest step that keeps every reduced cost non-negative. Unlike the solvers in
:mod:`pairings.engine.solver` it returns the dual, which
:mod:`pairings.engine.certificate` checks against edges the search never saw.

Notes
-----
**Perfect-matching form.** Vertex duals are free in sign, so the search may
start from any feasible dual and any matching of tight edges (a warm start);
there is no step that stops when an exposed vertex's dual reaches zero. When
no dual step is possible the graph has no perfect matching (``None``).

**Integers.** ``d[v]`` is ``2 * y_v``; a blossom's ``d[b]`` is ``z_B``; the
doubled reduced cost of edge ``uv`` is ``d[u] + d[v] + 2 * sum(z_B over
blossoms holding both) - 2 * w_uv``. Every vertex of the tree has the
parity of its root (tree edges are tight, so their ends' ``d`` sum to an even
number, and inside a blossom likewise), so an edge between two outer blossoms
of the one tree has an even reduced cost and every step is an integer (Galil
1986, section 3).

**Locality.** Labels, best edges and dual steps touch only the current
tree, so with a warm start that leaves few exposed vertices a stage costs
what its tree costs, not ``O(n)``; the vertices of each blossom are cached
(they never change while it exists).

**Compiled kernel.** :func:`perfect_matching` and :func:`perfect_matching_arrays`
run the C port of this module (``_blossom_c``: the same algorithm and warm
starts on ``__int128`` integers) whenever it is built, :data:`USE_COMPILED` is
true and every ``|w| < 2**118``; otherwise, or when a dual would leave the
kernel's range (``2**124``), the pure-Python code below runs. Both return an
optimum of equal weight with an optimal dual; among optima of equal weight
they may pick different ones. Values cross into C as buffers: vertex ids as
int64, weights and duals as 16-byte little-endian two's complement integers.

References
----------
J. Edmonds, "Maximum matching and a polyhedron with 0,1-vertices",
J. Res. Nat. Bur. Standards 69B (1965).
Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
ACM Computing Surveys 18 (1986).
"""

from __future__ import annotations

import sys
from dataclasses import dataclass
from importlib import import_module
from itertools import chain
from types import ModuleType
from typing import Any, Sequence

import numpy as np
from numpy.typing import NDArray

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


class _Blossom:
    """One run. Vertices ``0..n-1``, blossoms ``n..2n-1``; endpoint ``p`` of edge ``p // 2``."""

    def __init__(self, n: int, edges: Sequence[Edge], d: list[int], mate: list[int]) -> None:
        self.n = n
        self.end = [x for u, v, _ in edges for x in (u, v)]
        self.w = [w for _, _, w in edges]
        self.nb: list[list[int]] = [[] for _ in range(n)]
        for k, (u, v, _) in enumerate(edges):
            self.nb[u].append(2 * k + 1)
            self.nb[v].append(2 * k)
        self.d = d + [0] * n
        self.mate = mate  # endpoint index of the mate, or -1
        self.top = list(range(n))
        self.parent = [-1] * (2 * n)
        self.childs: list[list[int]] = [[] for _ in range(2 * n)]
        self.endps: list[list[int]] = [[] for _ in range(2 * n)]
        self.leaf_cache: list[list[int]] = [[] for _ in range(2 * n)]
        self.base = list(range(n)) + [-1] * n
        self.unused = list(range(2 * n - 1, n - 1, -1))
        self.label = [0] * (2 * n)
        self.labelend = [-1] * (2 * n)
        self.best = [-1] * (2 * n)
        self.bestlist: list[list[int] | None] = [None] * (2 * n)
        self.allowed = [False] * len(edges)
        self.queue: list[int] = []
        self.touched: set[int] = set()  # ids whose label or best edge changed this stage
        self.free_best: set[int] = set()  # vertices with a best edge (delta 2 candidates)
        self.forest: set[int] = set()  # labelled top-level ids
        self.opened: list[int] = []  # edges allowed this stage
        self.exposed = [v for v in range(n - 1, -1, -1) if mate[v] == -1]

    def slack(self, k: int) -> int:
        return self.d[self.end[2 * k]] + self.d[self.end[2 * k + 1]] - 2 * self.w[k]

    def leaves(self, b: int) -> list[int]:
        """The vertices of ``b`` (cached per blossom: a blossom's vertices never change). Read only."""
        return [b] if b < self.n else self.leaf_cache[b]

    def allow(self, k: int) -> None:
        self.allowed[k] = True
        self.opened.append(k)

    def assign(self, w: int, t: int, p: int) -> None:
        b = self.top[w]
        self.label[w] = self.label[b] = t
        self.labelend[w] = self.labelend[b] = p
        self.best[w] = self.best[b] = -1
        self.touched.update((w, b))
        self.forest.add(b)
        if t == 1:
            self.queue.extend(self.leaves(b))
        else:
            m = self.mate[self.base[b]]
            self.assign(self.end[m], 1, m ^ 1)

    def scan(self, v: int, w: int) -> int:
        path, base = [], -1
        while v != -1 or w != -1:
            b = self.top[v]
            if self.label[b] & 4:
                base = self.base[b]
                break
            path.append(b)
            self.label[b] = 5
            if self.labelend[b] == -1:
                v = -1
            else:
                v = self.end[self.labelend[self.top[self.end[self.labelend[b]]]]]
            if w != -1:
                v, w = w, v
        for b in path:
            self.label[b] = 1
        return base

    def add_blossom(self, base: int, k: int) -> None:
        v, w = self.end[2 * k], self.end[2 * k + 1]
        bb, bv, bw = self.top[base], self.top[v], self.top[w]
        b = self.unused.pop()
        self.base[b], self.parent[b], self.parent[bb] = base, -1, b
        path, endps = [], []
        while bv != bb:
            self.parent[bv] = b
            path.append(bv)
            endps.append(self.labelend[bv])
            bv = self.top[self.end[self.labelend[bv]]]
        path.append(bb)
        path.reverse()
        endps.reverse()
        endps.append(2 * k)
        while bw != bb:
            self.parent[bw] = b
            path.append(bw)
            endps.append(self.labelend[bw] ^ 1)
            bw = self.top[self.end[self.labelend[bw]]]
        self.childs[b], self.endps[b] = path, endps
        self.leaf_cache[b] = [x for sub in path for x in self.leaves(sub)]
        self.label[b], self.labelend[b], self.d[b] = 1, self.labelend[bb], 0
        self.touched.add(b)
        self.forest.difference_update(path)
        self.forest.add(b)
        for x in self.leaves(b):
            if self.label[self.top[x]] == 2:
                self.queue.append(x)
            self.top[x] = b
        best_to: dict[int, tuple[int, int]] = {}  # outer blossom -> (slack, edge) of the least slack
        end, top, label, d, wt = self.end, self.top, self.label, self.d, self.w
        for sub in path:
            lists = self.bestlist[sub]
            cands = lists if lists is not None else [p >> 1 for x in self.leaves(sub) for p in self.nb[x]]
            for kk in cands:
                i, j = end[2 * kk], end[2 * kk + 1]
                if top[j] == b:
                    i, j = j, i
                bj = top[j]
                if bj != b and label[bj] == 1:
                    sl = d[i] + d[j] - 2 * wt[kk]
                    old = best_to.get(bj)
                    if old is None or sl < old[0]:
                        best_to[bj] = (sl, kk)
            self.bestlist[sub] = None
            self.best[sub] = -1
        self.bestlist[b] = [kk for _, kk in best_to.values()]
        self.best[b] = min(best_to.values(), key=lambda t: t[0], default=(0, -1))[1]

    def expand(self, b: int, end_of_stage: bool) -> None:
        for s in self.childs[b]:
            self.parent[s] = -1
            if s < self.n:
                self.top[s] = s
            elif end_of_stage and self.d[s] == 0:
                self.expand(s, end_of_stage)
            else:
                for x in self.leaves(s):
                    self.top[x] = s
        self.forest.discard(b)
        if not end_of_stage and self.label[b] == 2:
            childs, endps = self.childs[b], self.endps[b]
            entry = self.top[self.end[self.labelend[b] ^ 1]]
            j = childs.index(entry)
            if j & 1:
                j -= len(childs)
                step, trick = 1, 0
            else:
                step, trick = -1, 1
            p = self.labelend[b]
            while j != 0:
                self.label[self.end[p ^ 1]] = 0
                self.label[self.end[endps[j - trick] ^ trick ^ 1]] = 0
                self.assign(self.end[p ^ 1], 2, p)
                self.allow(endps[j - trick] // 2)
                j += step
                p = endps[j - trick] ^ trick
                self.allow(p // 2)
                j += step
            bv = childs[j]
            self.label[self.end[p ^ 1]] = self.label[bv] = 2
            self.labelend[self.end[p ^ 1]] = self.labelend[bv] = p
            self.best[bv] = -1
            self.touched.update((self.end[p ^ 1], bv))
            self.forest.add(bv)
            j += step
            while childs[j] != entry:
                bv = childs[j]
                if self.label[bv] == 1:
                    j += step
                    continue
                hit = next((x for x in self.leaves(bv) if self.label[x] != 0), None)
                if hit is not None:
                    self.label[hit] = 0
                    self.label[self.end[self.mate[self.base[bv]]]] = 0
                    self.assign(hit, 2, self.labelend[hit])
                j += step
        self.label[b], self.labelend[b], self.best[b] = 0, -1, -1
        self.childs[b], self.endps[b], self.bestlist[b] = [], [], None
        self.base[b] = -1
        self.unused.append(b)

    def augment_blossom(self, b: int, v: int) -> None:
        t = v
        while self.parent[t] != b:
            t = self.parent[t]
        if t >= self.n:
            self.augment_blossom(t, v)
        childs, endps = self.childs[b], self.endps[b]
        i = j = childs.index(t)
        if i & 1:
            j -= len(childs)
            step, trick = 1, 0
        else:
            step, trick = -1, 1
        while j != 0:
            j += step
            t = childs[j]
            p = endps[j - trick] ^ trick
            if t >= self.n:
                self.augment_blossom(t, self.end[p])
            j += step
            t = childs[j]
            if t >= self.n:
                self.augment_blossom(t, self.end[p ^ 1])
            self.mate[self.end[p]] = p ^ 1
            self.mate[self.end[p ^ 1]] = p
        self.childs[b], self.endps[b] = childs[i:] + childs[:i], endps[i:] + endps[:i]
        self.base[b] = self.base[self.childs[b][0]]

    def augment(self, k: int) -> None:
        for s, p in ((self.end[2 * k], 2 * k + 1), (self.end[2 * k + 1], 2 * k)):
            while True:
                bs = self.top[s]
                if bs >= self.n:
                    self.augment_blossom(bs, s)
                self.mate[s] = p
                if self.labelend[bs] == -1:
                    break
                bt = self.top[self.end[self.labelend[bs]]]
                s, j = self.end[self.labelend[bt]], self.end[self.labelend[bt] ^ 1]
                if bt >= self.n:
                    self.augment_blossom(bt, j)
                self.mate[j] = self.labelend[bt]
                p = self.labelend[bt] ^ 1

    def reset_stage(self) -> None:
        for x in self.touched:
            self.label[x], self.labelend[x], self.best[x] = 0, -1, -1
            if x >= self.n:
                self.bestlist[x] = None
        for k in self.opened:
            self.allowed[k] = False
        self.touched, self.free_best, self.forest, self.opened = set(), set(), set(), []
        self.queue = []

    def scan_queue(self) -> bool:
        """Grow the forest along tight edges; True when a stage augmented."""
        label, top, end, d, wt, allowed = self.label, self.top, self.end, self.d, self.w, self.allowed
        while self.queue:
            v = self.queue.pop()
            dv = d[v]
            for p in self.nb[v]:
                k, w = p >> 1, end[p]
                if top[v] == top[w]:
                    continue
                kslack = 0
                if not allowed[k]:
                    kslack = dv + d[w] - 2 * wt[k]
                    if kslack <= 0:
                        self.allow(k)
                if allowed[k]:
                    lw = label[top[w]]
                    if lw == 0 and self.mate[self.base[top[w]]] == -1:
                        self.augment(k)  # another exposed vertex: an augmenting path
                        return True
                    if lw == 0:
                        self.assign(w, 2, p ^ 1)
                    elif lw == 1:
                        base = self.scan(v, w)
                        if base >= 0:
                            self.add_blossom(base, k)
                        else:
                            self.augment(k)
                            return True
                    elif label[w] == 0:
                        label[w], self.labelend[w] = 2, p ^ 1
                        self.touched.add(w)
                elif label[top[w]] == 1:
                    b = top[v]
                    if self.best[b] == -1 or kslack < self.slack(self.best[b]):
                        self.best[b] = k
                        self.touched.add(b)
                elif label[w] == 0:
                    if self.best[w] == -1 or kslack < self.slack(self.best[w]):
                        self.best[w] = k
                        self.touched.add(w)
                        self.free_best.add(w)
        return False

    def step(self) -> bool:
        """One dual step; False when none is possible (no perfect matching)."""
        kind, delta, arg = 0, 0, -1
        label, top, best, slack = self.label, self.top, self.best, self.slack
        for v in self.free_best:
            k = best[v]
            if k != -1 and label[top[v]] == 0:
                s = slack(k)
                if kind == 0 or s < delta:
                    kind, delta, arg = 2, s, k
        for b in self.forest:
            if label[b] == 1 and best[b] != -1:
                s = slack(best[b])
                assert s % 2 == 0, "odd slack between outer blossoms"
                if kind == 0 or s // 2 < delta:
                    kind, delta, arg = 3, s // 2, self.best[b]
            elif self.label[b] == 2 and b >= self.n and (kind == 0 or self.d[b] < delta):
                kind, delta, arg = 4, self.d[b], b
        if kind == 0:
            return False
        for b in self.forest:
            sign = -1 if self.label[b] == 1 else 1
            for x in self.leaves(b):
                self.d[x] += sign * delta
            if b >= self.n:
                self.d[b] -= sign * delta
        if kind == 4:
            self.expand(arg, False)
        else:
            self.allow(arg)
            i, j = self.end[2 * arg], self.end[2 * arg + 1]
            if kind == 2 and self.label[self.top[i]] == 0:
                i = j
            self.queue.append(i)
        return True

    def run(self) -> bool:
        while True:
            self.reset_stage()
            while self.exposed and self.mate[self.exposed[-1]] != -1:
                self.exposed.pop()
            if not self.exposed:
                return True
            self.assign(self.exposed[-1], 1, -1)
            while not self.scan_queue():
                if not self.step():
                    return False
            for b in list(self.forest):
                if b >= self.n and self.parent[b] == -1 and self.label[b] == 1 and self.d[b] == 0:
                    self.expand(b, True)

    def dual(self) -> Dual:
        out = []
        for b in range(self.n, 2 * self.n):
            if self.base[b] >= 0 and self.d[b] > 0:
                out.append((frozenset(self.leaves(b)), self.d[b]))
        return Dual(self.d[:self.n], out)


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


def perfect_matching_arrays(n: int, u: NDArray[np.int64], v: NDArray[np.int64], w: NDArray[Any],
                            warm_pairs: Sequence[tuple[int, int]] = (), dual: Dual | None = None
                            ) -> tuple[list[tuple[int, int]], Dual] | None:
    """:func:`perfect_matching` of the edges ``(u[k], v[k], w[k])`` given as arrays.

    ``u``, ``v``: int64 vertex arrays; ``w``: exact integers (dtype int64, or
    object of Python ints). ``warm_pairs`` are vertex pairs ``(a, b)`` (either
    order) of a good matching rather than edge indices; a pair that is no edge
    is ignored. No Python tuple per edge is built on the compiled path.
    """
    if n % 2:
        return None
    uu = np.ascontiguousarray(u, dtype=np.int64)
    vv = np.ascontiguousarray(v, dtype=np.int64)
    if compiled():
        ww = _weights(w)
        if ww is not None:
            flat = np.asarray(warm_pairs, dtype=np.int64).reshape(-1)
            try:
                return _solve(n, uu, vv, ww, np.zeros(0, dtype=np.int64), flat, dual)
            except _OutOfRange:
                pass
    edges = list(zip(uu.tolist(), vv.tolist(), np.asarray(w).tolist()))
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
    return b"".join(int(x).to_bytes(16, "little", signed=True) for x in values)


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
    mate = [-1] * n
    for k in warm:
        u, v, w = edges[k]
        if mate[u] == -1 and mate[v] == -1 and d[u] + d[v] == 2 * w:
            mate[u], mate[v] = 2 * k + 1, 2 * k
    for v in range(n):  # exposed vertices start even: a feasible raise, kept from the all-trees search
        if mate[v] == -1 and d[v] % 2:
            d[v] += 1
    run = _Blossom(n, edges, d, mate)
    # Blossoms nest up to n / 2 deep (thousands at 10,000 players) and expand/augment recurse per level.
    limit = sys.getrecursionlimit()
    sys.setrecursionlimit(max(limit, 2 * n + 1000))
    try:
        if not run.run():
            return None
    finally:
        sys.setrecursionlimit(limit)
    pairs = sorted({tuple(sorted((v, run.end[run.mate[v]]))) for v in range(n)})
    return [(u, v) for u, v in pairs], run.dual()


def _carried(edges: Sequence[Edge], dual: Dual) -> list[int]:
    """A feasible flat doubled dual from ``dual``: each vertex takes the ``z_B`` of its blossoms.

    With ``d_v = y2_v + sum(z_B : v in B)`` every edge's doubled reduced cost
    gains ``sum(z_B : B holds exactly one end)`` >= 0, so ``d`` is feasible
    wherever ``dual`` was and edges inside blossoms stay tight; then each
    edge that is still violated (a new one) raises one end by the deficit.
    Matched edges leaving a blossom lose tightness, so a few vertices start
    exposed; the rest of the previous matching can be kept.
    """
    d = list(dual.y2)
    for members, z in dual.blossoms:
        for x in members:
            d[x] += z
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
