"""The independent reference solvers: maximum-weight matching by libraries outside the engine.

The engine finds its optimum on its own (its Edmonds blossom,
:mod:`pairings.engine.blossom`, on the route of :mod:`pairings.engine.route`)
and never calls this module. The checks do, so that a result is confirmed by
code that shares nothing with the engine's solve:

- :func:`reference_matching`: networkx ``max_weight_matching`` (pure Python,
  exact Python integers of any size, a maximum-weight matching among those of
  maximum cardinality) for ``draft_round(..., reference=True)``,
  ``pairings verify --deep`` (and small fields) and the tests;
- :func:`maximum_cardinality`: the size of a maximum matching, for Berge's
  certificate in ``pairings verify``: rustworkx (compiled) when installed,
  else networkx.

Both libraries are imported on first use only, so that drafting a round does
not pay for them. Vertices are ``0..n-1``; edges are ``(u, v, weight)`` with
integer weights.

References
----------
J. Edmonds, "Paths, trees, and flowers", Canad. J. Math. 17 (1965).
Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
ACM Computing Surveys 18 (1986).
C. Berge, "Two theorems in graph theory", PNAS 43 (1957): a matching is
maximum if and only if it admits no augmenting path.
"""

from __future__ import annotations

from typing import Sequence

Edge = tuple[int, int, int]


def _normalise(pairs: object) -> list[tuple[int, int]]:
    return sorted((min(u, v), max(u, v)) for u, v in pairs)  # type: ignore[attr-defined]


def reference_matching(n: int, edges: Sequence[Edge]) -> list[tuple[int, int]]:
    """networkx ``max_weight_matching(maxcardinality=True)`` on exact integers."""
    import networkx as nx  # type: ignore[import-untyped]

    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_weighted_edges_from(edges)
    return _normalise(nx.max_weight_matching(g, maxcardinality=True))


def maximum_cardinality(n: int, edges: Sequence[tuple[int, int]]) -> int:
    """Size of a maximum matching (unit weights), for Berge's certificate: rustworkx if installed, else networkx."""
    try:
        import rustworkx as rx
    except ImportError:  # the optional extra is not installed: the slower exact reference
        return len(reference_matching(n, [(u, v, 1) for u, v in edges]))
    g = rx.PyGraph()
    g.add_nodes_from(range(n))
    g.add_edges_from([(u, v, 1) for u, v in edges])
    return len(rx.max_weight_matching(g, max_cardinality=True, weight_fn=lambda w: w))


def matching_weight(edges: Sequence[Edge], pairs: Sequence[tuple[int, int]]) -> int:
    """Total weight of ``pairs`` under ``edges`` (an independent tally)."""
    weight = {(min(u, v), max(u, v)): w for u, v, w in edges}
    return sum(weight[(min(u, v), max(u, v))] for u, v in pairs)
