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

from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine.blossom import Dual
from pairings.engine.vector import AnyArray


def reduced_costs(u: NDArray[np.int64], v: NDArray[np.int64], w: AnyArray, dual: Dual
                  ) -> AnyArray:
    """Doubled reduced costs ``2 (y_u + y_v + sum z_B - w_uv)`` of edges ``(u[k], v[k], w[k])``."""
    big = w.dtype == object or max(map(abs, dual.y2), default=0) > 2**60 or \
        any(z > 2**60 for _, z in dual.blossoms)
    dtype = object if big else np.int64
    y2 = np.array(dual.y2, dtype=dtype)
    ww = w.astype(dtype)
    rc = y2[u] + y2[v] - 2 * ww
    n = len(dual.y2)
    for members, z in dual.blossoms:
        inside = np.zeros(n, dtype=bool)
        inside[list(members)] = True
        both = inside[u] & inside[v]
        if both.any():
            rc[both] = rc[both] + 2 * z
    return np.asarray(rc)


def certify(n: int, u: NDArray[np.int64], v: NDArray[np.int64], w: AnyArray,
            pairs: Sequence[tuple[int, int]], dual: Dual) -> bool:
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
    rc = reduced_costs(u, v, w, dual)
    return bool((rc >= 0).all()) and dual.objective2() == 2 * weight
