"""Rating-based tiebreaks: ARO, TPR, PTP, APRO, APPO (FIDE Handbook C.07 with the B.02 tables).

Only games played over the board count (C.07, from memory); an unrated
opponent counts with the event's default rating, which the printouts state.
The two B.02 tables (8.1(a) p → dp and 8.1(b) D → expected score) are
lookup tables as remembered, not formulas: the Handbook applies them as printed.
"""

from __future__ import annotations

import math
from bisect import bisect_left
from decimal import ROUND_HALF_UP, Decimal
from types import MappingProxyType
from typing import Callable, Mapping

from pairings.points import ZERO, Points, total
from pairings.standings.context import Context, Slot, SlotKind
from pairings.standings.measures import Modifier, Values, trim
from pairings.state import PlayerId

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

# FIDE Handbook B.02, table 8.1(b) (from memory): the upper end of each rating-difference
# band, for the higher-rated player's expected score 0.50, 0.51, ... 0.99; above 735 it is 1.00.
_PD_UPPER = (3, 10, 17, 25, 32, 39, 46, 53, 61, 68, 76, 83, 91, 98, 106, 113, 121, 129, 137, 145,
             153, 162, 170, 179, 188, 197, 206, 215, 225, 235, 245, 256, 267, 278, 290, 302, 315,
             328, 344, 357, 374, 391, 411, 432, 456, 484, 517, 559, 619, 735)


def round_half_up(value: Decimal | Points) -> int:
    """The nearest whole number, halves away from zero (Decimal's ROUND_HALF_UP)."""
    if isinstance(value, Decimal):
        return int(value.quantize(Decimal("1"), rounding=ROUND_HALF_UP))
    whole = math.floor(abs(value) + Points(1, 2))
    return whole if value >= 0 else -whole


def dp_from_fraction(p: Points) -> int:
    """The B.02 rating difference for a score fraction ``p`` in [0, 1], p rounded half up to 0.01.

    Raises :class:`ValueError` outside [0, 1].
    """
    if not 0 <= p <= 1:
        raise ValueError(f"score fraction {p} outside 0..1")
    hundredths = round_half_up(p * 100)
    if hundredths >= 50:
        return _DP_TABLE[hundredths]
    return -_DP_TABLE[100 - hundredths]


def expected_hundredths(difference: int) -> int:
    """B.02 table 8.1(b): the expected score, in hundredths, of a player ``difference`` points
    above (negative: below) the opponent."""
    higher = 50 + bisect_left(_PD_UPPER, abs(difference))
    return higher if difference >= 0 else 100 - higher


def _played(ctx: Context, player: PlayerId) -> list[Slot]:
    return [s for s in ctx.slots[player] if s.kind is SlotKind.PLAYED and s.opponent is not None]


def _opponent_ratings(ctx: Context, player: PlayerId) -> list[int]:
    return [ctx.rating(s.opponent) for s in _played(ctx, player) if s.opponent is not None]


def _mean(values: list[int]) -> Points:
    return Points(round_half_up(Points(sum(values), len(values)))) if values else ZERO


def average_rating_opponents(ctx: Context, modifier: Modifier) -> Values:
    """ARO: the mean rating of the opponents met over the board, rounded half up (C.07, from memory).

    A cut drops the lowest ratings, a median the lowest and the highest. 0 without a game.
    """
    return {
        pid: _mean([int(r) for r in trim((((r,), r) for r in _opponent_ratings(ctx, pid)), modifier)])
        for pid in ctx.slots
    }


def _fraction(ctx: Context, player: PlayerId) -> tuple[Points, int]:
    played = _played(ctx, player)
    return total(s.fraction for s in played), len(played)


def performance_rating(ctx: Context, modifier: Modifier) -> Values:
    """TPR: ``ARO + dp(p)``, p the share of the points from games played over the board
    (C.07 with B.02 table 8.1(a), from memory; 100 % gives +800, 0 % gives −800). 0 without a game."""
    aro = average_rating_opponents(ctx, None)
    out: Values = {}
    for pid in ctx.slots:
        scored, games = _fraction(ctx, pid)
        out[pid] = aro[pid] + dp_from_fraction(scored / games) if games else ZERO
    return out


def _lowest_rating(ratings: list[int], reaches: Callable[[int], bool]) -> int:
    """The lowest whole rating in [min − 800, max + 800] for which ``reaches`` holds (it is monotone)."""
    low, high = min(ratings) - 800, max(ratings) + 800
    while low < high:
        mid = (low + high) // 2
        if reaches(mid):
            high = mid
        else:
            low = mid + 1
    return low


def perfect_performance(ctx: Context, modifier: Modifier) -> Values:
    """PTP: the rating at which the expected scores against the opponents met over the board
    (B.02 table 8.1(b)) add up to the points scored in those games (C.07, from memory).

    The table is a step function, so a whole range of ratings may give exactly
    the points: PTP is the middle of that range, rounded half up; when no rating
    gives exactly the points, the lowest rating that passes them (our decision).
    A perfect score gives the highest opponent's rating + 800, a zero score the
    lowest − 800 (from memory, low confidence). 0 without a game.
    """
    out: Values = {}
    for pid in ctx.slots:
        ratings = _opponent_ratings(ctx, pid)
        scored, games = _fraction(ctx, pid)
        if not games:
            out[pid] = ZERO
        elif scored == games:
            out[pid] = Points(max(ratings) + 800)
        elif scored == 0:
            out[pid] = Points(min(ratings) - 800)
        else:
            target = round_half_up(scored * 100)

            def expected(rating: int) -> int:
                return sum(expected_hundredths(rating - r) for r in ratings)

            low = _lowest_rating(ratings, lambda r: expected(r) >= target)
            if expected(low) == target:
                high = _lowest_rating(ratings, lambda r: expected(r) > target) - 1
                out[pid] = Points(round_half_up(Points(low + high, 2)))
            else:
                out[pid] = Points(low)
    return out


def _opponents_mean(ctx: Context, of: Values) -> Values:
    return {
        pid: _mean([int(of[s.opponent]) for s in _played(ctx, pid) if s.opponent is not None])
        for pid in ctx.slots
    }


def average_opponents_performance(ctx: Context, modifier: Modifier) -> Values:
    """APRO: the mean TPR of the opponents met over the board, rounded half up (C.07, from memory)."""
    return _opponents_mean(ctx, performance_rating(ctx, None))


def average_opponents_perfect(ctx: Context, modifier: Modifier) -> Values:
    """APPO: the mean PTP of the opponents met over the board, rounded half up (C.07, from memory)."""
    return _opponents_mean(ctx, perfect_performance(ctx, None))
