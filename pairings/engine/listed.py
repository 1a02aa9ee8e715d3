"""The listed route to the optimum: every pruned pair held in arrays, priced in numpy.

The route without the compiled scan (or when the implicit route,
:mod:`pairings.engine.implicit`, cannot certify): :func:`candidates.pruned_edges`
lists the pruned pairs with their cost rows, :func:`weights.weight_array` weighs
them, and the repeated sparse solve (:func:`pairings.engine.sparse.certify`)
prices every listed pair under each dual with
:func:`certificate.reduced_costs`. When no certificate is reached within
:data:`sparse.SOLVES` solves, the blossom solves every listed pair at once
(still exact, only slower) and its own optimal dual makes the answer canonical
(:func:`canonical.settle`). Either way the pairs are the canonical optimum, the
same as the implicit route's (:mod:`pairings.engine.sparse`, Notes).
"""

from __future__ import annotations

from typing import Collection, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine import blossom, candidates, canonical, certificate, sparse, weights
from pairings.engine.criteria import REMATCH, Field
from pairings.engine.vector import AnyArray, Arrays, IntArray
from pairings.state import PlayerId


def _where(keys: IntArray, order: IntArray, wanted: IntArray) -> tuple[IntArray, NDArray[np.bool_]]:
    """Per wanted key: its row in ``keys`` (sorted by ``order``) and whether it is there at all."""
    at = np.searchsorted(keys[order], wanted)
    hit = at < len(order)
    hit[hit] = keys[order][at[hit]] == wanted[hit]
    return order[np.where(hit, at, 0)], hit


def listed_matching(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
                    bound: candidates.Bound, arrays: Arrays | None = None) -> sparse.Solved:
    """The canonical optimum of ``players`` over the listed pruned pairs of ``bound`` (module notes).

    ``arrays`` are the players' (:class:`Arrays`), when the caller has them.
    """
    pr = candidates.pruned_edges(fld, players, no_bye, bound, arrays)
    assert pr is not None  # a bound was given
    n = pr.n
    w = weights.weight_array(pr.costs, n)
    split = certificate.limbs(w)
    keys = pr.u * n + pr.v
    order = np.argsort(keys, kind="stable")

    def weigh(i: IntArray, j: IntArray) -> AnyArray:
        rows, _ = _where(keys, order, i * n + j)
        return w[rows]

    def pricing(dual: blossom.Dual) -> sparse.Priced:
        rc = certificate.reduced_costs(pr.u, pr.v, w, dual, split)
        bad = rc < 0
        add = sparse.best_per_vertex(pr.u, pr.v, -rc, bad, sparse.SPARSE_ADD)
        tight = rc == 0
        return sparse.Priced(pr.u[add], pr.v[add], int(bad.sum()), pr.u[tight], pr.v[tight])

    score = w if split is None or w.dtype != object else split[0] * 2.0**certificate.SHIFT + split[1]
    first = (pr.v == len(players)) | sparse.best_per_vertex(pr.u, pr.v, score, np.ones(len(w), dtype=bool),
                                                            sparse.SPARSE_BEST)
    near_i, near_j = sparse.ideal_partners(pr.arrays, sparse.SPARSE_CLASS, sparse.SPARSE_WIDE)
    own = np.array(bound.pairs, dtype=np.int64).reshape(-1, 2)
    for i, j in ((near_i, near_j), (own[:, 0], own[:, 1])):
        rows, hit = _where(keys, order, i * n + j)
        first[rows[hit]] = True
    graph = sparse.SparseGraph(n, weigh)
    graph.add(pr.u[first], pr.v[first], w[first])
    rematches = _all_rematches(pr.costs[pr.v != len(players), REMATCH])
    found = sparse.certify(graph, pricing)
    if found is not None:
        route = sparse.Route("listed", True, found.solves, graph.size(), len(pr.u))
        return sparse.Solved(sparse.canonical_optimum(graph, found), route, rematches, bound)
    solved = blossom.perfect_matching_arrays(n, pr.u, pr.v, w)
    assert solved is not None  # the bound's own pairing is a full pairing of the pruned pairs
    pairs = canonical.settle(n, pr.u, pr.v, w, *solved)
    return sparse.Solved(pairs, sparse.Route("listed", False, sparse.SOLVES, len(pr.u), len(pr.u)), rematches,
                         bound)


def _all_rematches(rematch: IntArray) -> bool:
    """There are pruned player pairs and every one is a rematch."""
    return len(rematch) > 0 and bool(rematch.all())
