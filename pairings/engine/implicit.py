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
are added and the solve repeats; after ``SPARSE_ROUNDS`` solves the caller
falls back to the listed path. The weights are those of
:func:`weights.bounding` (same place values as the listed path, ``top`` from
the maxima), so the optimum is the same lexicographic optimum.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Collection, Sequence

import numpy as np

from pairings.engine import blossom, candidates, certificate, scan, weights
from pairings.engine.criteria import Field
from pairings.engine.vector import AnyArray, Arrays, IntArray
from pairings.state import PlayerId

SPARSE_BEST = 3
"""Each player's heaviest pruned pairs in the first sparse graph."""
SPARSE_ADD = 2
"""Violated pairs added per player and round (the most violated first)."""
SPARSE_ROUNDS = 12


def available() -> bool:
    """True when both compiled kernels are installed."""
    return scan.available() and blossom.compiled()


@dataclass(frozen=True)
class Solved:
    pairs: list[tuple[int, int]]
    route: candidates.Route
    every_pair_a_rematch: bool
    """The pruned player pairs exist and all are rematches (the engine then refuses the round)."""


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
        keys = i * self.n + j
        fresh = np.array([k not in self.keys for k in keys.tolist()], dtype=bool)
        if not fresh.any():
            return
        i, j, keys = i[fresh], j[fresh], keys[fresh]
        _, first = np.unique(keys, return_index=True)
        i, j = i[first], j[first]
        self.keys.update(keys[first].tolist())
        rows = self.arrays.costs(i, j) if rows is None else rows[fresh][first]
        self.u.append(i)
        self.v.append(j)
        self.w.append(weights.encode(self.enc, rows))

    def arrays_(self) -> tuple[IntArray, IntArray, AnyArray]:
        w = self.w
        dtype = object if any(x.dtype == object for x in w) else np.int64
        return np.concatenate(self.u), np.concatenate(self.v), np.concatenate([x.astype(dtype) for x in w])


def implicit_matching(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                      bound: candidates.Bound) -> Solved | None:
    """The optimal index pairs of ``players`` with their certificate route; None: use the listed path."""
    arrays = Arrays(fld, players)
    try:
        pairscan = scan.PairScan(arrays, bound.max_gap, bound.totals, bound.levels)
    except ValueError:  # values beyond the kernel's integers
        return None
    stats = pairscan.stats()
    bu, bv, brows = candidates.bye_rows(fld, players, no_bye, bound)
    maxima = [max(a, int(b)) for a, b in zip(stats.maxima, brows.max(axis=0) if len(brows) else stats.maxima)]
    gaps = set(stats.gaps) | set(brows[:, weights.GAP_INDEX].tolist())
    enc = weights.bounding(maxima, gaps, arrays.n + arrays.n % 2)
    sparse = _Sparse(arrays, enc)
    sparse.add(bu, bv, brows)
    greedy = np.array([p for p in bound.pairs if p[1] < arrays.n], dtype=np.int64).reshape(-1, 2)
    sparse.add(greedy[:, 0], greedy[:, 1])  # pruned edges by the bound's own argument
    i, j, rows = candidates.admissible(arrays, *candidates.ideal_partners(arrays), bound)
    sparse.add(i, j, rows)
    try:
        sparse.add(*pairscan.heaviest(enc, SPARSE_BEST))
    except ValueError:
        return None
    last: tuple[list[tuple[int, int]], blossom.Dual] | None = None
    for attempt in range(1, SPARSE_ROUNDS + 1):
        u, v, w = sparse.arrays_()
        if last is None:
            result = blossom.perfect_matching_arrays(sparse.n, u, v, w)
        else:
            result = blossom.perfect_matching_arrays(sparse.n, u, v, w, last[0], last[1])
        if result is None:  # cannot happen: the greedy pairing is in the sparse graph
            return None
        pairs, dual = last = result
        try:
            vi, vj, count = pairscan.violated(enc, dual, SPARSE_ADD)
        except ValueError:
            return None
        if count == 0 and certificate.certify(sparse.n, u, v, w, pairs, dual):
            route = candidates.Route(True, attempt, len(u), stats.count + len(bu))
            return Solved(pairs, route, stats.count > 0 and stats.rematch_free == 0)
        sparse.add(vi, vj)
    return None
