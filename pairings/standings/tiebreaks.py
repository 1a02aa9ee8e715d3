"""The tiebreaks by their official acronyms: the one table every consumer reads (:data:`TIEBREAKS`).

Acronyms, names and modifiers follow the FIDE Handbook C.07 Tie-Break
Regulations, the 2023 text as remembered (:data:`EDITION`; the definitions
were not read from the document). An organiser writes an ordered list such as
``BH-C1,BH,SB,WIN`` (any case): an acronym, optionally a modifier, cut ``-C1``
/ ``-C2`` or median ``-M1`` / ``-M2`` where the table allows it.
:func:`check_tiebreaks` turns such a list, or the snake_case names stored by
older event files, into canonical acronyms; :func:`tiebreak` describes one
(full name, JSON key, function).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from types import MappingProxyType
from typing import Callable, Iterable, Mapping

from pairings.errors import InputError
from pairings.standings import encounter, measures, ratings
from pairings.standings.context import Context
from pairings.standings.measures import Measure, Modifier, Values
from pairings.state import PlayerId, System

EDITION = "FIDE Handbook C.07 Tie-Break Regulations, 2023 edition as remembered"
"""Printed with every legend: the definitions were restated from memory, not read."""

GroupMeasure = Callable[[Context, Iterable[frozenset[PlayerId]]], tuple[Values, Values]]
_CUTS = ("C1", "C2", "M1", "M2")


@dataclass(frozen=True, slots=True)
class Kind:
    """One row of the table: a tiebreak before any modifier."""

    acronym: str
    name: str
    key: str
    """snake_case name in JSON (the interchange keeps the older keys stable)."""
    measure: Measure | None
    group_measure: GroupMeasure | None = None
    """Set instead of ``measure`` for a tiebreak worked out among the players still tied (DE)."""
    modifiers: tuple[str, ...] = ()
    uses_unplayed: bool = False
    """True when the treatment of unplayed rounds changes the value."""
    uses_ratings: bool = False


TIEBREAKS: Mapping[str, Kind] = MappingProxyType({k.acronym: k for k in (
    Kind("BH", "Buchholz", "buchholz", measures.buchholz, modifiers=_CUTS, uses_unplayed=True),
    Kind("SB", "Sonneborn-Berger", "sonneborn_berger", measures.sonneborn_berger, modifiers=_CUTS,
         uses_unplayed=True),
    Kind("FB", "Fore Buchholz", "fore_buchholz", measures.fore_buchholz, modifiers=_CUTS, uses_unplayed=True),
    Kind("AOB", "Average of opponents' Buchholz", "average_opponents_buchholz",
         measures.average_opponents_buchholz, uses_unplayed=True),
    Kind("DE", "Direct encounter", "direct_encounter", None, group_measure=encounter.direct_encounter),
    Kind("WIN", "Number of wins (played or not)", "wins", measures.wins),
    Kind("WON", "Number of games won over the board", "games_won", measures.games_won),
    Kind("BPG", "Number of games played with Black (second side)", "games_second", measures.games_second),
    Kind("BWG", "Number of games won with Black (second side)", "wins_second", measures.wins_second),
    Kind("PS", "Progressive score", "progressive", measures.progressive, modifiers=("C1", "C2")),
    Kind("KS", "Koya system (points against opponents with 50 % or more)", "koya", measures.koya),
    Kind("ARO", "Average rating of opponents", "average_rating_opponents", ratings.average_rating_opponents,
         modifiers=_CUTS, uses_ratings=True),
    Kind("TPR", "Tournament performance rating", "performance_rating", ratings.performance_rating,
         uses_ratings=True),
    Kind("PTP", "Perfect tournament performance", "perfect_performance", ratings.perfect_performance,
         uses_ratings=True),
    Kind("APRO", "Average performance rating of opponents", "average_opponents_performance",
         ratings.average_opponents_performance, uses_ratings=True),
    Kind("APPO", "Average perfect performance of opponents", "average_opponents_perfect",
         ratings.average_opponents_perfect, uses_ratings=True),
)})

_MODIFIER_WORDS = {"C": "cut", "M": "median"}
_LEGACY_KEYS = {"BH-M1": "median_buchholz"}
"""JSON keys kept from before the acronyms (the derived key would be ``buchholz_median1``)."""


@dataclass(frozen=True, slots=True)
class Tiebreak:
    """A chosen tiebreak: a table row with its modifier."""

    acronym: str
    """Canonical, e.g. ``BH-C1``: the heading on every screen and sheet."""
    kind: Kind
    modifier: Modifier
    name: str
    """In full, e.g. "Buchholz cut 1": the legend."""
    key: str
    """snake_case, for JSON."""

    def evaluate(self, ctx: Context, groups: Iterable[frozenset[PlayerId]]) -> tuple[Values, Values]:
        """Every player's shown value and sort key (equal, except for DE)."""
        if self.kind.group_measure is not None:
            return self.kind.group_measure(ctx, groups)
        assert self.kind.measure is not None
        values = self.kind.measure(ctx, self.modifier)
        return values, values


@cache
def tiebreak(acronym: str) -> Tiebreak:
    """The chosen tiebreak for a canonical acronym (see :func:`check_tiebreaks`)."""
    base, _, suffix = acronym.partition("-")
    kind = TIEBREAKS[base]
    if not suffix:
        return Tiebreak(acronym, kind, None, kind.name, kind.key)
    modifier = (suffix[0], int(suffix[1:]))
    word = _MODIFIER_WORDS[modifier[0]]
    key = _LEGACY_KEYS.get(acronym, f"{kind.key}_{word}{modifier[1]}")
    return Tiebreak(acronym, kind, modifier, f"{kind.name}, {word} {modifier[1]}", key)


@cache
def _by_key() -> Mapping[str, str]:
    """Stored snake_case names of older event files → acronyms (also the two old aliases)."""
    out = {"aro": "ARO", "tpr": "TPR"}
    for kind in TIEBREAKS.values():
        for acronym in (kind.acronym, *(f"{kind.acronym}-{m}" for m in kind.modifiers)):
            out[tiebreak(acronym).key] = acronym
    return MappingProxyType(out)


def _canonical(raw: str) -> str:
    text = raw.strip()
    if text.lower() in _by_key():
        return _by_key()[text.lower()]
    base, dash, suffix = text.upper().partition("-")
    if base not in TIEBREAKS:
        known = ", ".join(TIEBREAKS)
        raise InputError(f"unknown tiebreak {raw!r}: use one of {known} (modifiers -C1 -C2 -M1 -M2 where allowed)")
    kind = TIEBREAKS[base]
    if dash and suffix not in kind.modifiers:
        allowed = ", ".join(f"{base}-{m}" for m in kind.modifiers) or "none"
        raise InputError(f"tiebreak {raw!r}: {base} takes no modifier {suffix!r} (allowed: {allowed})")
    return f"{base}-{suffix}" if dash else base


def check_tiebreaks(names: Iterable[str] | str) -> tuple[str, ...]:
    """Validate an ordered tiebreak list; return its canonical acronyms (``bh-c1`` → ``BH-C1``).

    ``names`` is a sequence of names or one comma-separated string (``"BH-C1,BH,SB,WIN"``).
    Accepts the acronyms in any case and the snake_case names older event files
    stored (``buchholz_cut1`` → ``BH-C1``). Raises
    :class:`~pairings.errors.InputError` naming the unknown, badly modified or
    repeated entry.
    """
    if isinstance(names, str):
        names = [n for n in names.split(",") if n.strip()]
    out: list[str] = []
    for raw in names:
        acronym = _canonical(raw)
        if acronym in out:
            raise InputError(f"tiebreak {acronym} is listed twice")
        out.append(acronym)
    return tuple(out)


def default_tiebreaks(system: System, sides: bool = True) -> tuple[str, ...]:
    """The list a new event gets when the organiser chooses none (C.07 recommendations, as remembered).

    Swiss: BH-C1, BH, DE, WIN, BPG (an event without sides takes WON instead of
    BPG, which would mean nothing there). Round robin: DE, WIN, SB, KS.
    """
    if system is System.ROUND_ROBIN:
        return ("DE", "WIN", "SB", "KS")
    return ("BH-C1", "BH", "DE", "WIN", "BPG" if sides else "WON")


def legend(acronyms: Iterable[str]) -> tuple[str, ...]:
    """One line per tiebreak, ``BH-C1 = Buchholz, cut 1``, then the edition."""
    return tuple(f"{a} = {tiebreak(a).name}" for a in acronyms) + (f"Tiebreaks: {EDITION}.",)


__all__ = [
    "EDITION", "TIEBREAKS", "Kind", "Tiebreak", "check_tiebreaks", "default_tiebreaks",
    "legend", "tiebreak",
]
