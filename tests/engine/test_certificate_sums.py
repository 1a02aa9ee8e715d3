"""The certificate's per-edge blossom sums against a blossom-by-blossom sum.

``reduced_costs`` adds, per edge, the ``z`` of every blossom holding both ends. The fast
route (:func:`pairings.engine.certificate._common_z`: lowest common ancestors in the blossom
tree, tabled per pair of tree nodes when there are few, else by binary lifting over the edges)
must give what summing blossom by blossom gives (``_each_z``, which needs no tree; common
practice, no source), on random laminar families of odd sets with large ``z``.
"""

from __future__ import annotations

import random

import numpy as np
import pytest

from pairings.engine import certificate
from pairings.engine.blossom import Dual


def _family(rng: random.Random, verts: list[int], depth: int) -> list[frozenset[int]]:
    """Disjoint odd sets inside ``verts`` (never all of it when nested), each with its own nested sets."""
    out: list[frozenset[int]] = []
    pool = verts[:]
    rng.shuffle(pool)
    while len(pool) >= 3 and rng.random() < 0.7:
        size = rng.randrange(3, len(pool) + 1, 2)
        if depth < 3 and size == len(verts):
            size -= 2
        if size < 3:
            break
        take, pool = pool[:size], pool[size:]
        out.append(frozenset(take))
        if depth:
            out += _family(rng, take, depth - 1)
    return out


@pytest.mark.parametrize("table", [0, certificate.PAIR_TABLE])
def test_blossom_sums_match_blossom_by_blossom(table: int, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(certificate, "PAIR_TABLE", table)
    rng = random.Random(7)
    for _ in range(200):
        n = rng.randint(3, 40)
        blossoms = [(b, rng.randint(1, 2**70)) for b in _family(rng, list(range(n)), 3)]
        dual = Dual([0] * n, blossoms)
        m = rng.randint(1, 120)
        u = np.array([rng.randrange(n) for _ in range(m)], dtype=np.int64)
        v = np.array([rng.randrange(n) for _ in range(m)], dtype=np.int64)
        z = certificate.limbs(np.array([zb for _, zb in blossoms], dtype=object))
        assert z is not None
        fast = certificate._common_z(n, u, v, dual, z)
        assert fast is not None
        slow = certificate._each_z(n, u, v, dual, z)
        assert _values(fast) == _values(slow)


def _values(sums: certificate.Limbs) -> list[int]:
    """Limbs as Python integers (a sum of limbs may carry differently, the value may not)."""
    return [(h << certificate.SHIFT) + low for h, low in zip(sums[0].tolist(), sums[1].tolist())]
