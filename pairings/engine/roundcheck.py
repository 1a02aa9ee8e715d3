"""The verdict on one stored round (``pairings verify``), shared by both Swiss systems' checks.

:mod:`pairings.engine.verify` checks the whole-round system's rounds and
:mod:`pairings.engine.dutch.verify` the FIDE (Dutch) System's; both report a :class:`RoundCheck`.
"""

from __future__ import annotations

from dataclasses import dataclass
from types import MappingProxyType

from pairings.engine.types import DraftBoard
from pairings.state import Round


@dataclass(frozen=True)
class RoundCheck:
    round: int
    breaches: tuple[str, ...]
    notes: tuple[str, ...]
    optimal: bool | None
    """Engine rounds: True when the reference optimum has the same cost; None otherwise."""
    certified: bool
    """Berge: no augmenting path in the allowed graph."""

    @property
    def ok(self) -> bool:
        return not self.breaches and self.optimal is not False

    def lines(self) -> list[str]:
        n = len(self.breaches)
        head = f"round {self.round}: " + ("ok" if self.ok else f"{n} breach{'es' if n != 1 else ''}")
        return [head, *(f"  breach: {b}" for b in self.breaches), *(f"  {n}" for n in self.notes)]


def stored_boards(stored: Round) -> tuple[DraftBoard, ...]:
    """A stored round's games as draft boards (no costs: the checks recompute them)."""
    return tuple(DraftBoard(g.board, g.first, g.second, MappingProxyType({}), g.flags) for g in stored.games)
