"""The one module that talks to maximum-weight matching solvers.

Two interchangeable back ends compute a maximum-weight matching among the
matchings of maximum cardinality (Edmonds' blossom algorithm):

- ``reference``: networkx ``max_weight_matching`` (pure Python, exact Python
  integers of any size) - the reference every test compares against;
- ``fast``: rustworkx ``max_weight_matching`` (compiled), used when installed
  and when every weight fits its 128-bit signed integers; otherwise the
  reference is used.

Vertices are ``0..n-1``; edges are ``(u, v, weight)`` with integer weights.

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

import networkx as nx  # type: ignore[import-untyped]

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
