"""The one module that talks to the external maximum-weight matching solvers.

The engine's own solve is its Edmonds blossom (:mod:`pairings.engine.blossom`,
which also returns the dual its certificate needs). Two external solvers of
the same problem (a maximum-weight matching among the matchings of maximum
cardinality) are called from here only:

- ``reference``: networkx ``max_weight_matching`` (pure Python, exact Python
  integers of any size): the independent solver of ``draft_round(...,
  reference=True)``, ``pairings verify --deep`` and the tests;
- ``fast``: rustworkx ``max_weight_matching`` (compiled) when installed and
  every weight fits its 128-bit signed integers (otherwise the reference):
  the listed path's first sparse solve and fallback, the full graph when no
  greedy pairing exists, and Berge's maximum cardinality in ``verify``.

networkx is imported on first use only, so that drafting a round does not pay
for it. Vertices are ``0..n-1``; edges are ``(u, v, weight)`` with integer weights.

References
----------
J. Edmonds, "Paths, trees, and flowers", Canad. J. Math. 17 (1965).
Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
ACM Computing Surveys 18 (1986).
C. Berge, "Two theorems in graph theory", PNAS 43 (1957): a matching is
maximum if and only if it admits no augmenting path.
"""

from __future__ import annotations

from typing import Any, Sequence

Edge = tuple[int, int, int]
_I128 = 2**127 - 1

_rx: Any
try:  # optional compiled back end
    import rustworkx as _rx
except ImportError:  # pragma: no cover - depends on the environment
    _rx = None


def fast_available() -> bool:
    return _rx is not None


def _normalise(pairs: object) -> list[tuple[int, int]]:
    return sorted((min(u, v), max(u, v)) for u, v in pairs)  # type: ignore[attr-defined]


def reference_matching(n: int, edges: Sequence[Edge]) -> list[tuple[int, int]]:
    """networkx ``max_weight_matching(maxcardinality=True)`` on exact integers."""
    import networkx as nx  # type: ignore[import-untyped]

    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_weighted_edges_from(edges)
    return _normalise(nx.max_weight_matching(g, maxcardinality=True))


def matching(n: int, edges: Sequence[Edge]) -> list[tuple[int, int]]:
    """Maximum-cardinality maximum-weight matching with the fastest exact back end."""
    if _rx is None or not edges or max(w for _, _, w in edges) > _I128 // max(n, 1):
        return reference_matching(n, edges)
    g = _rx.PyGraph()
    g.add_nodes_from(range(n))
    g.add_edges_from(list(edges))
    return _normalise(_rx.max_weight_matching(g, max_cardinality=True, weight_fn=lambda w: w))


def maximum_cardinality(n: int, edges: Sequence[tuple[int, int]]) -> int:
    """Size of a maximum matching (unit weights), for Berge's certificate."""
    unit = [(u, v, 1) for u, v in edges]
    return len(matching(n, unit))


def matching_weight(edges: Sequence[Edge], pairs: Sequence[tuple[int, int]]) -> int:
    """Total weight of ``pairs`` under ``edges`` (an independent tally)."""
    weight = {(min(u, v), max(u, v)): w for u, v, w in edges}
    return sum(weight[(min(u, v), max(u, v))] for u, v in pairs)
