"""Why a board was made, its cheapest alternative, and cost differences between drafts."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from fractions import Fraction
from types import MappingProxyType
from typing import Mapping

from pairings.costs import LAYOUT
from pairings.engine.criteria import ABSOLUTE, MILD, STRONG, Field
from pairings.engine.draft import draft_round
from pairings.engine.types import CRITERIA, Draft, Overrides
from pairings.errors import NoPairingError
from pairings.state import ByeKind, EventState, PlayerId, System

_STRENGTH = {ABSOLUTE: "absolute", STRONG: "strong", MILD: "mild"}


def _points(units: int, unit: float) -> str:
    value = Fraction(units) * Fraction(unit).limit_denominator(1000)
    return str(int(value)) if value.denominator == 1 else str(float(value))


@dataclass(frozen=True)
class CostDelta:
    """``other`` minus ``optimum``, criterion by criterion (S2 also level by level)."""

    changes: Mapping[str, int]
    gap_levels: Mapping[int, int]
    """Change in the number of pairs at each score gap (in scoring units, gap > 0)."""
    worse: bool
    """True when ``other`` is lexicographically costlier than ``optimum``."""
    unit: float = 0.5

    def describe(self) -> str:
        """E.g. ``"+1 floater, +2 side preferences missed"``; ``"no change"``."""
        parts: list[str] = []
        for criterion in LAYOUT.criteria:
            name = criterion.key
            if criterion.words is None:  # score_gap: floaters, then pairs level by level
                floaters = sum(self.gap_levels.values())
                if floaters:
                    parts.append(f"{floaters:+d} floater{'s' if abs(floaters) != 1 else ''}")
                for level in sorted(self.gap_levels, reverse=True):
                    d = self.gap_levels[level]
                    if d and floaters != d:
                        parts.append(f"{d:+d} pair{'s' if abs(d) != 1 else ''} "
                                     f"{_points(level, self.unit)} apart")
                continue
            d = self.changes[name]
            if d:
                one, many = criterion.words
                parts.append(f"{d:+d} {one if abs(d) == 1 else many}")
        return ", ".join(parts) if parts else "no change"


def compare(optimum: Draft, other: Draft) -> CostDelta:
    """The cost difference of ``other`` against ``optimum`` (e.g. an override against the draft)."""
    changes = {k: other.cost[k] - optimum.cost[k] for k in CRITERIA}
    levels = Counter(g for g in other.gaps if g)
    levels.subtract(Counter(g for g in optimum.gaps if g))
    return CostDelta(
        changes=MappingProxyType(changes),
        gap_levels=MappingProxyType({k: v for k, v in sorted(levels.items()) if v}),
        worse=other.key() > optimum.key(),
        unit=optimum.unit,
    )


@dataclass(frozen=True)
class Explanation:
    board: int
    first: PlayerId
    second: PlayerId
    cost: Mapping[str, int]
    reasons: tuple[str, ...]
    alternative: Draft | None
    """The cheapest pairing of the round in which this board is not made (None: none exists)."""
    first_instead: PlayerId | None
    """``first``'s opponent in the alternative (None: the bye or no alternative)."""
    second_instead: PlayerId | None
    delta: CostDelta | None

    def lines(self) -> list[str]:
        out = [f"board {self.board}: {self.first} - {self.second}", *self.reasons]
        if self.alternative is None or self.delta is None:
            out.append("no other pairing of this round exists without this board")
        else:
            a = self.first_instead or "the bye"
            b = self.second_instead or "the bye"
            out.append(f"cheapest alternative: {self.first} meets {a}, {self.second} meets {b}: "
                       f"{self.delta.describe()}")
        return out


def _overrides_of(state: EventState, draft: Draft) -> Overrides:
    """The overrides a draft was made under, as far as the draft shows them."""
    asked = state.requests.get(draft.round, {})
    absent = frozenset(y.player for y in draft.byes if y.kind is ByeKind.ABSENCE and y.player not in asked)
    pinned = tuple((b.first, b.second) for b in draft.boards if "pinned" in b.flags)
    return Overrides(pinned=pinned, absent=absent)


def _reasons(state: EventState, draft: Draft, p: PlayerId, q: PlayerId) -> tuple[str, ...]:
    fld = Field(state, draft.round, [x for b in draft.boards for x in (b.first, b.second)]
                + [y.player for y in draft.byes if y.kind is ByeKind.PAIRING])
    unit = float(fld.unit)
    out = []
    up, uq = fld.units[p], fld.units[q]
    if up == uq:
        size = fld.group_size[up]
        out.append(f"same score group ({_points(up, unit)} points, {size} players): ranks "
                   f"{fld.group_rank[p] + 1} and {fld.group_rank[q] + 1}")
    else:
        hi, lo = (p, q) if up > uq else (q, p)
        out.append(f"{hi} ({_points(fld.units[hi], unit)}) floats down to {lo} "
                   f"({_points(fld.units[lo], unit)}): gap {_points(abs(up - uq), unit)}")
    for pid in (p, q):
        if fld.virtual.get(pid):
            out.append(f"{pid} carries {float(fld.virtual[pid]):g} virtual point(s) this round (Baku acceleration, "
                       "pairing only)")
    if fld.sides:
        for pid in (p, q):
            pref = fld.pref[pid]
            if pref.side is not None:
                out.append(f"{pid} wants {pref.side.value} ({_STRENGTH[pref.strength]}, SD {pref.sd:+d})")
    return tuple(out)


def explain(state: EventState, draft: Draft, board: int) -> Explanation:
    """Why ``board`` was made and the cheapest pairing of the round without it.

    The alternative is exact: the round re-drafted with this pair added to the
    do-not-pair list (and the draft's pins and absences kept), so it is the
    optimum among all pairings in which neither player keeps this opponent.
    Available for the round being drafted (``state.next_round_number``).
    """
    b = next((x for x in draft.boards if x.board == board), None)
    if b is None:
        raise NoPairingError(f"round {draft.round} has no board {board}")
    if state.settings.system is System.DUTCH:
        from pairings.engine.dutch.explain import reasons as dutch_reasons  # C.04.3's own terms

        said = dutch_reasons(state, draft, b)
    else:
        said = _reasons(state, draft, b.first, b.second)
    reasons = said + tuple(f"flag: {f}" for f in b.flags)
    alt: Draft | None = None
    if draft.round == state.next_round_number and "pinned" not in b.flags:
        ov = _overrides_of(state, draft)
        try:
            alt = draft_round(state, Overrides(pinned=ov.pinned, absent=ov.absent,
                                               forbidden=((b.first, b.second),)))
        except NoPairingError:
            alt = None

    def opponent(pid: PlayerId) -> PlayerId | None:
        x = alt.board_of(pid) if alt is not None else None
        return None if x is None else (x.second if x.first == pid else x.first)

    return Explanation(
        board=board, first=b.first, second=b.second, cost=b.cost, reasons=reasons, alternative=alt,
        first_instead=opponent(b.first), second_instead=opponent(b.second),
        delta=compare(draft, alt) if alt is not None else None,
    )
