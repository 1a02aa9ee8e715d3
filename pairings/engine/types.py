"""Value objects of the pairing engine: overrides in, drafts and reports out.

Cost maps use the criterion keys of :data:`CRITERIA` (snake_case, documented
for arbiters in ``docs/engine.md``); they go into ``pairings pair --json`` as
``"cost": {criterion: number}``. Every value is a non-negative integer.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping

from pairings.costs import LAYOUT
from pairings.state import Bye, PlayerId

ENGINE_VERSION = "1.4"
"""Recorded with every draft; bumped whenever the same log could yield a different draft."""

CRITERIA: tuple[str, ...] = LAYOUT.keys
"""Criterion keys in strict priority order (highest first), from :data:`pairings.costs.CRITERIA`."""


def _frozen(values: Mapping[str, int]) -> Mapping[str, int]:
    return MappingProxyType({k: int(values.get(k, 0)) for k in CRITERIA})


@dataclass(frozen=True)
class Overrides:
    """The organiser's constraints for one draft (each already carries a reason in the log)."""

    pinned: tuple[tuple[PlayerId, PlayerId], ...] = ()
    """Pairs kept as boards, sides as given; the rest is re-paired."""
    forbidden: tuple[tuple[PlayerId, PlayerId], ...] = ()
    """Extra do-not-pair entries for this draft, besides ``state.forbidden``."""
    absent: frozenset[PlayerId] = frozenset()
    """Not paired this round (an absence bye), besides ``state.requests``."""
    bye: PlayerId | None = None
    """Force this player onto the pairing bye."""
    no_bye: frozenset[PlayerId] = frozenset()
    """Never give these players the pairing bye."""


@dataclass(frozen=True)
class DraftBoard:
    board: int
    first: PlayerId
    second: PlayerId
    cost: Mapping[str, int]
    flags: tuple[str, ...]


@dataclass(frozen=True)
class Draft:
    """A drafted round.

    ``byes`` holds the pairing bye (if any) first, then requested byes and
    absences. ``cost`` is the round total by criterion, the pairing bye's own
    cost included (``bye_cost``). ``gaps`` is S2's object: the score gaps of
    every pair and of the pairing bye, in scoring units, largest first.
    """

    round: int
    boards: tuple[DraftBoard, ...]
    byes: tuple[Bye, ...]
    cost: Mapping[str, int]
    engine_version: str
    gaps: tuple[int, ...] = ()
    bye_cost: Mapping[str, int] = field(default_factory=lambda: _frozen({}))
    unit: float = 0.5
    """Points per scoring unit (to read ``score_gap`` and ``gaps`` in points)."""

    @property
    def pairing_bye(self) -> PlayerId | None:
        from pairings.state import ByeKind

        for bye in self.byes:
            if bye.kind is ByeKind.PAIRING:
                return bye.player
        return None

    def board_of(self, player: PlayerId) -> DraftBoard | None:
        for b in self.boards:
            if player in (b.first, b.second):
                return b
        return None

    def key(self) -> tuple[object, ...]:
        """The lexicographic cost key (smaller is better), in :data:`CRITERIA` order.

        ``score_gap`` is replaced by the sorted gap list (docs/engine.md S2).
        """
        out: list[object] = []
        for name in CRITERIA:
            out.append(self.gaps if name == "score_gap" else self.cost[name])
        return tuple(out)


def total_cost(costs: list[Mapping[str, int]]) -> Mapping[str, int]:
    """Sum cost maps criterion by criterion."""
    return _frozen({k: sum(c.get(k, 0) for c in costs) for k in CRITERIA})


def cost_map(values: tuple[int, ...]) -> Mapping[str, int]:
    """A read-only cost map from a tuple in :data:`CRITERIA` order."""
    return MappingProxyType(dict(zip(CRITERIA, values)))
