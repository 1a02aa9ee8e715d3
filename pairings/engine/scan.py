"""The pruned player pairs of one round, walked in C without materialising them.

:func:`pairings.engine.candidates.pruned_edges` keeps the pairs ``i < j`` (rank
order) at most ``max_gap`` score units apart, not on the do-not-pair list, whose
cost row (:meth:`pairings.engine.vector.Arrays.costs`) is not above the greedy
pairing's expanded total (``candidates._not_above``). At 10,000 players those
are some 20 million pairs; :class:`PairScan` visits them one by one in the
compiled kernel ``_scan_c`` (same enumeration, same side allocation, same cost
tuple, same test against the bound) and keeps only what the engine reads:

- :meth:`PairScan.stats`: the count, the column maxima, the score gaps present
  and the rematch-free count (what :func:`pairings.engine.weights.from_maxima`
  and the encoder need);
- :meth:`PairScan.heaviest`: every player's ``k`` heaviest pairs under a
  :class:`~pairings.engine.weights.Encoder` (the sparse graph's seed);
- :meth:`PairScan.violated`: every player's ``k`` most violated pairs under an
  Edmonds dual, and how many pairs violate it. The doubled reduced cost
  ``rc = y2[i] + y2[j] + 2 * sum(z_B : i, j in B) - 2 * w(i, j)`` is the dual
  constraint of the pair in LP duality over Edmonds' perfect matching polytope
  (:mod:`pairings.engine.certificate`): a perfect matching whose weight equals
  the dual objective is optimal when ``rc >= 0`` on every pruned pair, and the
  violated pairs are what the column generation adds next.

The blossoms are laminar, so the blossoms holding both ends of a pair are the
common ancestors of the innermost blossoms of its ends; with ``P[B]`` the sum of
``z`` over ``B`` and its ancestors the sum is ``P[lca]``. The kernel answers the
lowest common ancestor in constant time (Euler tour of the blossom tree and a
sparse table of depth minima), as blossoms nest thousands deep at 10,000 players.

Exact integers throughout: the kernel computes weights, duals and reduced costs
in 128-bit integers. The wrapper raises ``ValueError`` when a value could come
near that range (an encoded cost or ``top`` from ``2**124``, a vertex dual or a
blossom's z sum from ``2**122``: then every doubled reduced cost stays below
``2**127``) or when the inputs are not what the kernel handles (a family of odd sets that
is not laminar, a score gap beyond the encoder's levels): the caller then takes
the numpy path. The bye vertex is not part of the scan.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Sequence

import numpy as np

from pairings.costs import LAYOUT
from pairings.engine import certificate, weights
from pairings.engine.blossom import Dual
from pairings.engine.criteria import ABSOLUTE, MILD
from pairings.engine.vector import FIRST, SECOND, WIDTH, Arrays, IntArray

try:
    from pairings.engine import _scan_c  # type: ignore[attr-defined]
except ImportError:  # built without a compiler: the caller keeps the numpy path
    _scan_c = None

LIMIT = 2**122
"""Largest magnitude of a vertex dual or blossom z sum handed to the kernel."""
COST_LIMIT = 2**124
"""Largest encoded cost (any pair's, from its column bounds) and ``top`` the kernel takes.

With these limits ``|2 w| < 2**125`` and ``|y2[i] + y2[j] + 2 P| < 2**124``, so a
doubled reduced cost stays inside the 128-bit integers."""
MAX_PLAYERS = 2**20
"""Cost columns stay below this, so a column times a place value stays far inside 128 bits."""
THREADS = 2
"""Threads of one scan (interleaved row blocks; the answer does not depend on them)."""


def available() -> bool:
    """True when the compiled kernel imported."""
    return _scan_c is not None


def layout() -> bytes:
    """The kernel's cost row layout: the column (:data:`pairings.costs.LAYOUT`) of each criterion it costs.

    ``_scan_c.ROLES`` names them in the order the kernel reads. ``ValueError``
    when the table has a criterion the kernel does not cost and that is not
    the pairing bye's own (0 on every pair): its scan would be wrong.
    """
    roles = tuple(_scan_c.ROLES)
    missing = [c.key for c in LAYOUT.criteria if c.key not in roles and not c.bye_only]
    if missing:
        raise ValueError(f"the scan kernel does not cost {', '.join(missing)}")
    return _int64([LAYOUT.column(name) for name in roles])


@dataclass(frozen=True)
class Stats:
    """What the encoder needs to know about the pruned player pairs."""

    count: int
    """Number of pruned player-player pairs."""
    maxima: tuple[int, ...]
    """Column maxima of their cost rows (length ``WIDTH``), zeros if there are none."""
    gaps: frozenset[int]
    """Score gaps (cost column ``weights.GAP_INDEX``) present among them."""
    rematch_free: int
    """How many of them are not rematches (a zero ``rematch`` column)."""


def _int128(values: Sequence[int], what: str, limit: int = LIMIT) -> bytes:
    """Little-endian 16-byte two's complement values, each below ``limit`` in magnitude."""
    out = []
    for x in values:
        x = int(x)
        if not -limit < x < limit:
            raise ValueError(f"{what} beyond the scan kernel's integers")
        out.append(x.to_bytes(16, "little", signed=True))
    return b"".join(out)


def _int64(x: Any) -> bytes:
    return np.ascontiguousarray(x, dtype=np.int64).tobytes()


def _history_bits(history: IntArray, n: int) -> tuple[int, bytes, bytes]:
    """Per player, bit ``r`` set when it had the first (second) side in round ``r``."""
    rounds = history.shape[0]
    words = rounds // 64 + 1
    first = np.zeros((n, words), dtype=np.uint64)
    second = np.zeros((n, words), dtype=np.uint64)
    for r in range(1, rounds):
        bit = np.uint64(1 << (r % 64))
        first[history[r] == FIRST, r // 64] |= bit
        second[history[r] == SECOND, r // 64] |= bit
    return words, first.tobytes(), second.tobytes()


def _tree(n: int, dual: Dual) -> tuple[bytes, bytes, bytes]:
    """(owner per player, parent per blossom, prefix z sum per node) of :func:`certificate.laminar`.

    Renumbered for the kernel so that a parent comes after its children; node
    ``m`` is the virtual root above every top-level blossom, and a player in no
    blossom sits at it. ``ValueError`` when the family is not laminar.
    """
    tree = certificate.laminar(max(len(dual.y2), n), dual)
    m = len(dual.blossoms)
    node = np.full(m + 1, m, dtype=np.int64)
    node[tree.order] = m - 1 - np.arange(m, dtype=np.int64)
    parent = np.empty(m, dtype=np.int64)
    parent[node[:m]] = node[tree.parent[:m]]
    prefix = [0] * (m + 1)
    for b in range(m):
        prefix[int(node[b])] = tree.prefix[b]
    return _int64(node[tree.owner[:n]]), _int64(parent), _int128(prefix, "a blossom z sum")


@dataclass(frozen=True)
class Checked:
    """What one walk under a dual found (:meth:`PairScan.check`)."""

    i: IntArray
    j: IntArray
    """Each vertex's most violated pairs ``(i, j)``."""
    count: int
    """How many pairs violate the dual."""
    tight_i: IntArray
    tight_j: IntArray
    """Every pair with a zero reduced cost, sorted by ``(i, j)``."""


class PairScan:
    """The pruned player pairs of one round (``candidates.pruned_edges`` less the bye edges).

    ``arrays`` holds the players in rank order; ``max_gap`` (None: any),
    ``bound`` and ``levels`` are the arguments ``pruned_edges`` uses
    (``bound`` the greedy pairing's expanded cost totals, ``levels`` its
    encoder's gap levels).
    """

    def __init__(self, arrays: Arrays, max_gap: int | None, bound: Sequence[int], levels: int,
                 *, threads: int = THREADS) -> None:
        if _scan_c is None:
            raise ValueError("the scan kernel is not built")
        a = arrays
        n = a.n
        if n >= MAX_PLAYERS:
            raise ValueError("too many players for the scan kernel")
        if len(bound) != levels + WIDTH - 1 or any(not 0 <= int(b) < 2**62 for b in bound):
            raise ValueError("the bound does not fit the scan kernel")
        if n and (int(np.abs(a.units).max()) >= 2**30 or int(a.abs_sd.max()) >= 2**30):
            raise ValueError("scores beyond the scan kernel's range")
        self.n = n
        self.threads = threads
        self._stats: Stats | None = None
        want, strength = a.want, a.strength
        graded = (strength >= MILD) & (strength <= ABSOLUTE)  # the strength of a preference a side misses
        miss_first = np.where((want == SECOND) & graded, strength, 0)
        miss_second = np.where((want == FIRST) & graded, strength, 0)
        players = np.stack([a.units, a.grank, a.gsize, a.abs_sd, want, strength,
                            a.breaks_first, a.breaks_second, a.down1, a.up1, a.down2, a.up2,
                            miss_first, miss_second], axis=1) if n else np.zeros((0, 14))
        # units are non-increasing (rank order), so the partners of i within the gap are a prefix.
        ends = np.full(n, n, dtype=np.int64) if max_gap is None else \
            np.searchsorted(-a.units, max_gap - a.units, side="right").astype(np.int64)
        words, first, second = _history_bits(a.history, n)
        self._scan = _scan_c.prepare(n, _int64(players), _int64(ends), words, first, second,
                                     _int64(a.rematch_keys), _int64(a.forbidden_keys), bool(a.fld.sides),
                                     levels, _int64([int(b) for b in bound]), WIDTH, layout())

    def stats(self) -> Stats:
        count, maxima, gaps, free = _scan_c.stats(self._scan, self.threads)
        self._stats = Stats(count, tuple(maxima), frozenset(gaps), free)
        return self._stats

    def _cost_bound(self, enc: weights.Encoder) -> int:
        """An upper bound on any scanned pair's encoded cost under ``enc``."""
        if self._stats is None:  # every cost column is at most 2 n (rank order) and a gap counts once
            return max(2 * self.n, 2) * sum(enc.place)
        maxima, levels = self._stats.maxima, enc.levels
        columns = [k for k in range(WIDTH) if k != weights.GAP_INDEX]
        places = list(enc.place[:weights.GAP_INDEX]) + list(enc.place[weights.GAP_INDEX + levels:])
        gap = max((enc.place[weights.GAP_INDEX + levels - d] for d in self._stats.gaps if 0 < d <= levels),
                  default=0)
        return sum(p * maxima[k] for p, k in zip(places, columns)) + gap

    def _encoder(self, enc: weights.Encoder) -> tuple[bytes, bytes]:
        if len(enc.place) != enc.levels + WIDTH - 1 or not 0 < enc.top < COST_LIMIT or min(enc.place) < 0:
            raise ValueError("the encoder does not fit the scan kernel")
        if self._cost_bound(enc) >= COST_LIMIT:
            raise ValueError("place values beyond the scan kernel's integers")
        return _int128(enc.place, "a place value", COST_LIMIT), _int128([enc.top], "top", COST_LIMIT)

    def _pairs(self, keys: bytes) -> tuple[IntArray, IntArray]:
        unique = np.unique(np.frombuffer(keys, dtype=np.int64))
        return unique // max(self.n, 1), unique % max(self.n, 1)

    def heaviest(self, enc: weights.Encoder, k: int) -> tuple[IntArray, IntArray]:
        """Union over vertices of each vertex's ``k`` heaviest pruned pairs (weight ``enc.weight``).

        Ties by ``(i, j)`` ascending; returned sorted by ``(i, j)``, ``i < j``, no duplicates.
        """
        if k < 1 or self.n < 2:
            return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64)
        place, top = self._encoder(enc)
        return self._pairs(_scan_c.heaviest(self._scan, self.threads, k, enc.levels, place, top))

    def violated(self, enc: weights.Encoder, dual: Dual, k: int) -> tuple[IntArray, IntArray, int]:
        """Each vertex's ``k`` most violated pruned pairs and the number of violated pairs.

        A pair violates the dual when its doubled reduced cost
        ``y2[i] + y2[j] + 2 * sum(z_B : i, j in B) - 2 * enc.weight(cost)`` is
        negative (LP duality over Edmonds' perfect matching polytope, see
        :mod:`pairings.engine.certificate`). Most negative first, ties by
        ``(i, j)``; the union over vertices, sorted by ``(i, j)``, no duplicates.
        """
        found = self.check(enc, dual, k)
        return found.i, found.j, found.count

    def check(self, enc: weights.Encoder, dual: Dual, k: int) -> Checked:
        """:meth:`violated`, and every pruned pair whose doubled reduced cost is zero, from one walk."""
        if len(dual.y2) < self.n:
            raise ValueError("the dual has fewer vertices than the scan")
        empty = np.zeros(0, dtype=np.int64)
        if self.n < 2:
            return Checked(empty, empty, 0, empty, empty)
        place, top = self._encoder(enc)
        y2 = _int128(dual.y2[:self.n], "a vertex dual")
        owner, parent, prefix = _tree(self.n, dual)
        keys, count, tight = _scan_c.violated(self._scan, self.threads, max(k, 1), enc.levels, place, top, y2,
                                              owner, parent, prefix)
        ti, tj = self._pairs(tight)
        if k < 1:
            return Checked(empty, empty, int(count), ti, tj)
        i, j = self._pairs(keys)
        return Checked(i, j, int(count), ti, tj)
