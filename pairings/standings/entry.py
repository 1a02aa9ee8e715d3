"""Late entries in the standings: which rounds count as a player's own rounds of the event.

The rule, the same for every table (command line, desk, printouts): a player who entered
late is listed with their points (points given for the rounds before entry included, when
the event gives any) and their tiebreaks come from the rounds they were in the event. A
round before the player's entry round is *not entered*: it is no unplayed game of theirs,
so it adds no virtual or dummy opponent to their Buchholz or Sonneborn-Berger, and towards
other players' tiebreaks it counts with the points it gave (not as a draw).

FIDE Handbook C.07 (from memory) defines the virtual opponent for rounds a player of the
event did not play; it says nothing of rounds before a late entry, so this is our decision,
in line with common practice (no source): a late entrant's first round is their first.
"""

from __future__ import annotations

from pairings.state import EventState, PlayerId


def entered(state: EventState, player: PlayerId, round_number: int) -> bool:
    """True when ``round_number`` is one of the player's rounds of the event (on or after entry)."""
    return round_number >= state.players[player].entry_round
