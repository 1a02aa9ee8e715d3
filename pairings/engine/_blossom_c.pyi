"""Type stub of the compiled twin of :mod:`pairings.engine.edmonds` (Edmonds 1965, Galil 1986).

The same search (structures, names, choices) in C on ``__int128`` integers, run by
:mod:`pairings.engine.blossom` without the GIL.
"""

from typing import Any

Buffer = Any
"""Any contiguous bytes-like object (bytes, a numpy array)."""

class Unsupported(ArithmeticError):
    """A value out of the kernel's range: the caller runs the pure-Python search."""

def solve(n: int, u: Buffer, v: Buffer, w: Buffer, warm_edges: Buffer, warm_pairs: Buffer, has_dual: bool,
          y2: Buffer, members: Buffer, offsets: Buffer, z: Buffer
          ) -> tuple[bytes, bytes, bytes, bytes, bytes] | None: ...
