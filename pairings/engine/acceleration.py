"""Accelerated pairings: the Baku method's virtual points (FIDE Handbook C.04.5.1).

Both Swiss systems pair on the *pairing score*: the real score plus the
player's virtual points (VP) for the round being paired. Virtual points never
reach the standings, the tiebreaks or any report of points.

Rules (C.04.5.1 as read in the pre-2025 Handbook text; the 2025 page of C.04.5
was not at hand):

- The field is split once, before round 1: group A (GA) is the top of the
  players to be paired in initial order, ``2 * ceil(N / 4)`` players (half the
  field rounded up to an even number); everybody else is group B.
- A late entrant joins GA when the initial order puts him at or above the last
  GA player of round 1 (the boundary stays with that person), else GB: the text
  states only that the boundary player stays last of GA; membership by
  "ranked at or above him" is our reading.
- Accelerated rounds: the first ``A = ceil(R / 2)`` of the event's ``R`` rounds.
  In rounds ``1 .. ceil(A / 2)`` every GA player carries 1 virtual point, in
  rounds ``ceil(A / 2) + 1 .. A`` half a point, afterwards none; GB players
  never carry any. A bye does not change a player's VP (from memory: the VP
  depends only on the group and the round).

Decisions where the text at hand is silent: "the players to be paired" before
round 1 are all players registered before round 1 (``entry_round == 1``),
whatever their availability in round 1; the method is meant for the standard
scoring 1 / 0.5 / 0, and :func:`pairings.actions.new_event` refuses it for any
other scoring.
"""

from __future__ import annotations

from fractions import Fraction
from typing import Mapping, Sequence

from pairings.state import Acceleration, EventState, PlayerId


def accelerated_rounds(rounds: int) -> tuple[int, int]:
    """``(last round with VP 1, last round with VP 0.5)`` for an event of ``rounds`` rounds (C.04.5.1)."""
    a = -(-rounds // 2)
    return -(-a // 2), a


def group_a(state: EventState, order: Sequence[PlayerId]) -> frozenset[PlayerId]:
    """GA of C.04.5.1: ``2 * ceil(N / 4)`` players from the top of ``order`` before round 1, late entrants placed.

    ``order`` is the system's initial order of every registered player (best first).
    """
    first = [p for p in order if state.players[p].entry_round <= 1]
    size = 2 * (-(-len(first) // 4))
    if not first or size == 0:
        return frozenset()
    boundary = first[min(size, len(first)) - 1]
    cut = list(order).index(boundary)
    return frozenset(order[:cut + 1])


def virtual_points(state: EventState, round_number: int, order: Sequence[PlayerId]) -> Mapping[PlayerId, Fraction]:
    """Each player's virtual points when ``round_number`` is paired (empty without acceleration)."""
    if state.settings.acceleration is not Acceleration.BAKU:
        return {}
    full, half = accelerated_rounds(state.settings.rounds)
    if round_number > half:
        return {}
    value = Fraction(1) if round_number <= full else Fraction(1, 2)
    return {p: value for p in group_a(state, order)}
