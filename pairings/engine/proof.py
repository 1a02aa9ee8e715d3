"""Proof that a stored pairing is optimal: a dual certificate over every pair that could beat it.

``pairings verify`` used to re-solve each round with networkx on the full
graph (hours from 1,000 players). This module proves the same thing from an
Edmonds dual instead, in three steps whose arguments are stated where the
code is:

1. **Which pairs matter.** The stored pairing ``M`` of the free players (the
   round less its pinned boards) is itself a feasible full pairing, so the
   safe-pruning lemma (:mod:`pairings.engine.candidates`, module Notes, with
   :func:`candidates.bound_of` of ``M``) drops every pair that lies in no
   pairing at least as good as ``M``. A pairing that beats ``M`` uses pruned
   pairs only.
2. **A dual** (the producer: not trusted). The compiled blossom
   (:func:`blossom.perfect_matching_arrays`, warm-started from ``M``) solves a
   sparse graph of those pairs; pairs the dual violates are added until it
   holds on all of them (the engine's own repeated solve,
   :func:`pairings.engine.sparse.certify`, on the sparse graph
   :func:`implicit.start` builds). Without the compiled kernels the pruned
   pairs are listed and solved whole.
3. **The check** (trusted, independent of the producer):
   :func:`certificate.check` verifies in numpy, on the sparse graph's edges
   (every bye edge among them), that the dual is feasible and that ``M``
   satisfies complementary slackness with it (every board tight, every
   blossom with a positive ``z`` full); the rest of the pruned pairs are
   checked for feasibility by the compiled pair scan
   (:class:`pairings.engine.scan.PairScan`, its own enumeration and costs,
   tested pair by pair against :meth:`Field.pair`), or in numpy on the listed
   pairs. Feasibility and complementary slackness prove ``M`` a
   maximum-weight perfect matching of the pruned graph (LP duality over
   Edmonds' perfect-matching polytope, :mod:`certificate`), and the weights
   encode the lexicographic cost order there (:mod:`pairings.engine.weights`),
   so no pairing of the free players costs less than ``M``.

When ``M`` is not optimal the producer's own matching, certified the same
way, is the cheaper pairing the verdict reports.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Collection, Sequence

from pairings.engine import blossom, candidates, certificate, implicit, sparse, weights
from pairings.engine.criteria import Field
from pairings.engine.vector import AnyArray, Arrays, IntArray
from pairings.state import PlayerId

@dataclass(frozen=True)
class Proof:
    """The outcome of :func:`prove`."""

    optimal: bool
    """The check passed for the stored pairing: no pairing of the free players costs less."""
    best: list[tuple[int, int]]
    """A certified optimum (index pairs; the bye vertex is ``len(players)``): the stored one when optimal."""
    pairs: int
    """Pruned pairs and bye edges the feasibility check covered."""
    checker: str
    """Where the pairs outside the sparse graph were checked: ``"pair scan"`` or ``"numpy"``."""


def prove(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
          matched: Sequence[tuple[int, int]]) -> Proof | None:
    """Prove ``matched`` (index pairs of ``players`` in rank order, a full pairing) optimal, or not.

    None when no certificate is reached (values beyond the kernels' integers,
    or no dual within ``sparse.SOLVES`` solves): the caller then re-solves.
    """
    n = len(players)
    own = [(min(i, j), max(i, j)) for i, j in matched]
    costs = [fld.bye(players[i]) if j == n else fld.pair(players[i], players[j])[1] for i, j in own]
    bound = candidates.bound_of(fld, players, no_bye, costs, own)
    if implicit.available():
        return _by_scan(fld, players, no_bye, own, bound)
    return _listed(fld, players, no_bye, own, bound)


def _verdict(n: int, u: IntArray, v: IntArray, w: AnyArray, own: list[tuple[int, int]],
             found: list[tuple[int, int]], dual: blossom.Dual, covered: int, checker: str) -> Proof | None:
    """Step 3 of the module notes, once the pruned pairs beyond the edges ``u, v`` hold the dual."""
    if certificate.check(n, u, v, w, own, dual).ok:
        return Proof(True, own, covered, checker)
    if certificate.check(n, u, v, w, found, dual).ok:
        return Proof(False, found, covered, checker)
    return None  # the dual does not hold: nothing is proved either way


def _by_scan(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
             own: list[tuple[int, int]], bound: candidates.Bound) -> Proof | None:
    """Steps 2 and 3 with the compiled scan: the repeated sparse solve started from ``M`` (:mod:`sparse`)."""
    started = implicit.start(fld, players, no_bye, Arrays(fld, players), bound)
    if started is None:
        return _listed(fld, players, no_bye, own, bound)
    found = sparse.certify(started.graph, started.pricing, warm=own)
    if found is None:
        return None
    u, v, w = started.graph.edges()
    return _verdict(started.graph.n, u, v, w, own, found.pairs, found.dual, started.stats.count + started.byes,
                    "pair scan")


def _listed(fld: Field, players: Sequence[PlayerId], no_bye: Collection[PlayerId],
            own: list[tuple[int, int]], bound: candidates.Bound) -> Proof | None:
    """Without the compiled kernels: every pruned pair listed, solved and checked in numpy."""
    pr = candidates.pruned_edges(fld, players, no_bye, bound)
    if pr is None:
        return None
    w = weights.weight_array(pr.costs, pr.n)
    solved = blossom.perfect_matching_arrays(pr.n, pr.u, pr.v, w, own)
    if solved is None:
        return None
    found, dual = solved
    return _verdict(pr.n, pr.u, pr.v, w, own, found, dual, len(pr.u), "numpy")


def index_pairs(players: Sequence[PlayerId], pairs: Sequence[tuple[PlayerId, PlayerId]],
                bye: PlayerId | None) -> list[tuple[int, int]] | None:
    """``pairs`` (and the pairing bye) as index pairs of ``players``; None unless they pair them all once."""
    at = {p: k for k, p in enumerate(players)}
    out = [(at[a], at[b]) for a, b in pairs if a in at and b in at]
    if bye is not None and bye in at:
        out.append((at[bye], len(players)))
    covered = sorted(x for pair in out for x in pair if x < len(players))
    if covered != list(range(len(players))) or len(out) != len(pairs) + (bye is not None):
        return None
    if len(players) % 2 != (bye is not None):
        return None
    return [(min(a, b), max(a, b)) for a, b in out]
