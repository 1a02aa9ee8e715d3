"""Type stub of the compiled kernel of :mod:`pairings.engine.blossom` (Edmonds 1965, Galil 1986)."""

from typing import Any

Buffer = Any
"""Any contiguous bytes-like object (bytes, a numpy array)."""

class Unsupported(ArithmeticError):
    """A value out of the kernel's range: the caller runs the pure-Python version."""

def solve(n: int, u: Buffer, v: Buffer, w: Buffer, warm_edges: Buffer, warm_pairs: Buffer, has_dual: bool,
          y2: Buffer, members: Buffer, offsets: Buffer, z: Buffer
          ) -> tuple[bytes, bytes, bytes, bytes, bytes] | None: ...
