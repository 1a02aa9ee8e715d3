"""The tiebreaks: one pure function each, and the registry :data:`TIEBREAKS`.

Definitions follow FIDE Handbook C.07 ("Tie-break regulations"), restated
from memory where the text was not at hand; the performance rating uses the
p → dp table of FIDE Handbook B.02 (rating regulations), also from memory.
Every function reads a :class:`~pairings.standings.context.Context`, so the
treatment of unplayed rounds is decided once, there.
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import ROUND_HALF_UP, Decimal
from types import MappingProxyType
from typing import Callable, Mapping

from pairings.errors import InputError
from pairings.standings.context import Context, SlotKind
from pairings.state import PlayerId, Side


def buchholz(ctx: Context, player: PlayerId) -> float:
    """Sum of the scores of the player's opponents (C.07, Buchholz).

    Opponents count with :attr:`Context.for_others`; unplayed rounds add a
    virtual or dummy opponent, or nothing, as the context's treatment says.
    """
    return sum(value for _, value in ctx.opponent_values(player))


def buchholz_cut1(ctx: Context, player: PlayerId) -> float:
    """Buchholz less the lowest single opponent value (C.07, Buchholz Cut 1)."""
    values = sorted(value for _, value in ctx.opponent_values(player))
    return sum(values[1:])


def median_buchholz(ctx: Context, player: PlayerId) -> float:
    """Buchholz less the highest and the lowest opponent values (C.07, Median Buchholz)."""
    values = sorted(value for _, value in ctx.opponent_values(player))
    return sum(values[1:-1])


def sonneborn_berger(ctx: Context, player: PlayerId) -> float:
    """Scores of the opponents beaten plus half the scores of those drawn (C.07).

    Each opponent value (as for Buchholz) is weighted by the player's result
    against them as a share of a win: 1, ½ or 0. An unplayed round weighs the
    virtual or dummy opponent by the points the player was given (a half-point
    bye weighs ½).
    """
    return sum(slot.fraction * value for slot, value in ctx.opponent_values(player))


def direct_encounter(ctx: Context, player: PlayerId, tied: frozenset[PlayerId]) -> float:
    """Points scored in the games among the players still tied (C.07, Direct encounter).

    Applies only when every pair of the tied players has met over the board
    (C.07, from memory); otherwise, and for a player not tied, it is 0 for all,
    so it does not separate them. Forfeits are not meetings (as in the pairing
    rules), so they do not count here.
    """
    if len(tied) < 2:
        return 0.0
    met: dict[PlayerId, set[PlayerId]] = {pid: set() for pid in tied}
    for pid in tied:
        for slot in ctx.slots[pid]:
            if slot.kind is SlotKind.PLAYED and slot.opponent in tied:
                met[pid].add(slot.opponent)
    if any(met[pid] != tied - {pid} for pid in tied):
        return 0.0
    return sum(
        slot.points
        for slot in ctx.slots[player]
        if slot.kind is SlotKind.PLAYED and slot.opponent in tied
    )


def wins(ctx: Context, player: PlayerId) -> float:
    """Rounds in which the player scored a win's points, with or without play.

    C.07 of 2023 (from memory) counts forfeit wins and full-point byes here.
    """
    return float(sum(1 for slot in ctx.slots[player] if slot.won))


def games_second(ctx: Context, player: PlayerId) -> float:
    """Games played over the board with the second side (C.07, games with Black).

    In an event without sides this counts games as the second-listed player,
    which carries no meaning; such events should not use it.
    """
    return float(
        sum(1 for s in ctx.slots[player] if s.kind is SlotKind.PLAYED and s.side is Side.SECOND)
    )


def progressive(ctx: Context, player: PlayerId) -> float:
    """Sum of the player's running score after each round (C.07, progressive/cumulative score).

    Points won without play count like any other points here (from memory;
    some regulations subtract them).
    """
    running = 0.0
    total = 0.0
    for slot in ctx.slots[player]:
        running += slot.points
        total += running
    return total


def _round_half_up(value: Decimal, places: str = "1") -> Decimal:
    return value.quantize(Decimal(places), rounding=ROUND_HALF_UP)


def average_rating_opponents(ctx: Context, player: PlayerId) -> float:
    """Mean rating of the opponents met over the board, rounded to a whole number (C.07, ARO).

    Unrated opponents count with the event's default rating; unplayed rounds
    are left out. 0 when the player has played no game.
    """
    ratings = [
        ctx.rating(s.opponent)
        for s in ctx.slots[player]
        if s.kind is SlotKind.PLAYED and s.opponent is not None
    ]
    if not ratings:
        return 0.0
    return float(_round_half_up(Decimal(sum(ratings)) / Decimal(len(ratings))))


# FIDE Handbook B.02, table 8.1(a): score fraction p (in hundredths, 50..100) → rating
# difference dp. From memory. Below 0.50 the table is the mirror image: dp(1 - p) = -dp(p).
_DP_TABLE: Mapping[int, int] = MappingProxyType(dict(zip(range(100, 49, -1), (
    800, 677, 589, 538, 501, 470, 444, 422, 401, 383,
    366, 351, 336, 322, 309, 296, 284, 273, 262, 251,
    240, 230, 220, 211, 202, 193, 184, 175, 166, 158,
    149, 141, 133, 125, 117, 110, 102, 95, 87, 80,
    72, 65, 57, 50, 43, 36, 29, 21, 14, 7,
    0,
))))


def dp_from_fraction(p: float) -> int:
    """The B.02 rating difference for a score fraction ``p`` in [0, 1], p rounded to 0.01.

    Raises :class:`ValueError` outside [0, 1].
    """
    if not 0.0 <= p <= 1.0:
        raise ValueError(f"score fraction {p} outside 0..1")
    hundredths = int(_round_half_up(Decimal(str(p)) * 100))
    if hundredths >= 50:
        return _DP_TABLE[hundredths]
    return -_DP_TABLE[100 - hundredths]


def performance_rating(ctx: Context, player: PlayerId) -> float:
    """Tournament performance rating ``Ra + dp(p)`` (FIDE Handbook B.02, from memory).

    ``Ra`` is :func:`average_rating_opponents`, ``p`` the share of the points
    scored in the games played over the board. 0 when the player has played no game.
    """
    played = [s for s in ctx.slots[player] if s.kind is SlotKind.PLAYED]
    if not played:
        return 0.0
    p = sum(s.fraction for s in played) / len(played)
    return average_rating_opponents(ctx, player) + dp_from_fraction(p)


@dataclass(frozen=True, slots=True)
class Tiebreak:
    """A registry entry: the function, how printouts name it, and its source."""

    key: str
    label: str
    short: str
    """Column heading for narrow tables."""
    citation: str
    compute: Callable[[Context, PlayerId], float] | None
    compute_tied: Callable[[Context, PlayerId, frozenset[PlayerId]], float] | None = None
    """Set instead of ``compute`` for tiebreaks that look at the players still tied."""
    uses_unplayed: bool = False
    """True when the unplayed-games treatment changes the value."""


_C07 = "FIDE Handbook C.07"
TIEBREAKS: Mapping[str, Tiebreak] = MappingProxyType({
    t.key: t
    for t in (
        Tiebreak("buchholz", "Buchholz", "Bh", _C07, buchholz, uses_unplayed=True),
        Tiebreak("buchholz_cut1", "Buchholz cut 1", "Bh-1", _C07, buchholz_cut1, uses_unplayed=True),
        Tiebreak("median_buchholz", "Median Buchholz", "MBh", _C07, median_buchholz, uses_unplayed=True),
        Tiebreak("sonneborn_berger", "Sonneborn–Berger", "SB", _C07, sonneborn_berger, uses_unplayed=True),
        Tiebreak("direct_encounter", "Direct encounter", "DE", _C07, None, compute_tied=direct_encounter),
        Tiebreak("wins", "Wins", "Win", _C07, wins),
        Tiebreak("games_second", "Games with the second side", "2nd", _C07, games_second),
        Tiebreak("progressive", "Progressive score", "Prog", _C07, progressive),
        Tiebreak("average_rating_opponents", "Average rating of opponents", "ARO", _C07,
                 average_rating_opponents),
        Tiebreak("performance_rating", "Performance rating", "TPR", "FIDE Handbook B.02",
                 performance_rating),
    )
})

ALIASES: Mapping[str, str] = MappingProxyType({
    "aro": "average_rating_opponents",
    "tpr": "performance_rating",
})


def check_tiebreaks(names: tuple[str, ...] | list[str]) -> tuple[str, ...]:
    """Validate an ordered tiebreak list and return it with aliases resolved.

    Raises :class:`~pairings.errors.InputError` naming the unknown or repeated entry.
    """
    out: list[str] = []
    for raw in names:
        key = ALIASES.get(raw.strip().lower(), raw.strip().lower())
        if key not in TIEBREAKS:
            known = ", ".join(TIEBREAKS)
            raise InputError(f"unknown tiebreak {raw!r}: use one of {known} (or aro, tpr)")
        if key in out:
            raise InputError(f"tiebreak {key!r} is listed twice")
        out.append(key)
    return tuple(out)
