"""Each player's rounds, normalised once for every tiebreak.

A :class:`Slot` says what one player did in one round up to the cut-off round:
a game played over the board, a game still waiting for its result, or an
*unplayed* round (forfeit won or lost, any kind of bye, an absence, a round
before the player entered or after they withdrew). The tiebreak functions in
:mod:`pairings.standings.tiebreaks` read only a :class:`Context`.

The treatment of unplayed rounds follows docs/tiebreaks.md ("Unplayed rounds"):

* *as they stand*: an unplayed round adds no opponent, and every player counts
  with their actual score in other players' tiebreaks;
* *virtual opponent* (FIDE 2009 Congress decision on unplayed games, restated in
  FIDE Handbook C.07 of 2022): an unplayed round R of a player counts as a game
  against a virtual opponent scoring ``SPR + (1 - SfPR) + 0.5 * (n - R)``, and
  towards other players' tiebreaks a player's own unplayed rounds count as draws;
* *dummy opponent* (FIDE Handbook C.07, the 2023 regulations as remembered; low
  confidence): an unplayed round counts as a game against a dummy opponent
  holding the player's own final score, and towards other players' tiebreaks a
  player counts with an *adjusted score* in which each voluntary unplayed round
  (requested bye, absence, forfeit loss, a round before entry or after
  withdrawal) counts as a draw, while a pairing bye and a forfeit win keep the
  points given. Cuts drop voluntary unplayed rounds first.

Rounds before a late entrant's entry round are *not entered*, under every
treatment (:mod:`pairings.standings.entry`): they add no opponent of any kind.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum
from types import MappingProxyType
from typing import Mapping

from pairings.points import ZERO, Points, total
from pairings.standings.entry import entered
from pairings.state import (
    ByeKind, EventState, PlayerId, RoundEntry, Scoring, Side, Unplayed, late_entry_points,
)


class SlotKind(StrEnum):
    PLAYED = "played"
    """A game played over the board, with its result."""
    PENDING = "pending"
    """A published game whose result is not in yet (provisional standings)."""
    UNPLAYED = "unplayed"
    """A forfeit, a bye of any kind, an absence, or a round after the player withdrew."""
    NOT_ENTERED = "not_entered"
    """A round before a late entrant's entry round: no round of theirs (:mod:`pairings.standings.entry`)."""


@dataclass(frozen=True, slots=True)
class Slot:
    round: int
    kind: SlotKind
    opponent: PlayerId | None
    """The opponent over the board (also for a pending game); None when unplayed."""
    side: Side | None
    """The side of a played or pending game; None when unplayed."""
    points: Points
    """Points the player scored this round (0 while pending)."""
    fraction: Points
    """The round's score as a share of a win: 1, ½, 0 for a game; points / win when unplayed."""
    won: bool
    """Scored a win's points, with or without play."""
    score_before: Points
    voluntary: bool = False
    """An unplayed round the player chose (VUR, C.07 2023 as remembered): a requested bye,
    an absence, a forfeit loss, a round before entry or after withdrawal. A pairing bye
    and a forfeit win are not voluntary."""


@dataclass(frozen=True, slots=True)
class Context:
    """Everything the tiebreaks need, over rounds ``1 .. last``."""

    state: EventState
    last: int
    unplayed: Unplayed
    slots: Mapping[PlayerId, tuple[Slot, ...]]
    """One slot per round 1..last for every player, in round order."""
    points: Mapping[PlayerId, Points]
    """Actual points after round ``last``."""
    for_others: Mapping[PlayerId, Points]
    """The score a player counts with in other players' tiebreaks (see module notes)."""

    last_drawn: bool = False
    """The last round's games counted as draws (Fore Buchholz)."""

    @property
    def scoring(self) -> Scoring:
        return self.state.settings.scoring

    def rating(self, player: PlayerId) -> int:
        """The player's rating, or the event's default rating for an unrated player."""
        rating = self.state.players[player].rating
        return rating if rating is not None else self.state.settings.default_rating

    def opponent_values(self, player: PlayerId) -> list[tuple[Slot, Points]]:
        """Each round that contributes an opponent, with the score that opponent counts with.

        Played and pending games give the real opponent's :attr:`for_others`
        score; unplayed rounds give the virtual or dummy opponent's score, or
        nothing when unplayed games count as they stand.
        """
        out: list[tuple[Slot, Points]] = []
        for slot in self.slots[player]:
            if slot.kind is SlotKind.NOT_ENTERED:
                continue
            if slot.opponent is not None:
                out.append((slot, self.for_others[slot.opponent]))
            elif self.unplayed is Unplayed.VIRTUAL_OPPONENT:
                out.append((slot, virtual_opponent_score(slot, self.last, self.scoring)))
            elif self.unplayed is Unplayed.DUMMY_OPPONENT:
                out.append((slot, self.points[player]))
        return out


def opposite_points(points: Points, scoring: Scoring) -> Points:
    """The points of the other side of a result worth ``points`` (``1 - SfPR`` for 1-½-0)."""
    if points == scoring.win:
        return scoring.loss
    if points == scoring.loss:
        return scoring.win
    if points == scoring.draw:
        return scoring.draw
    return scoring.win + scoring.loss - points


def virtual_opponent_score(slot: Slot, last: int, scoring: Scoring) -> Points:
    """``Svon = SPR + (1 - SfPR) + 0.5 * (n - R)`` (FIDE 2009 decision on unplayed games).

    ``SPR`` is the player's score before round ``R``, ``SfPR`` the player's
    points in round ``R``, ``n`` the last round counted. With other scoring the
    ``1 - SfPR`` is the opposite result and ``0.5`` a draw's points.
    """
    later = last - slot.round
    return slot.score_before + opposite_points(slot.points, scoring) + scoring.draw * later


_SHARE = {"win": Points(1), "draw": Points(1, 2), "loss": ZERO}
"""A game's result as a share of a win, whatever the event's points."""


def _share(points: Points, scoring: Scoring) -> Points:
    """``points`` as a share of a win's points (a half-point bye is ½ of a 1-point win, 1 point ⅓ of 3)."""
    return points / scoring.win if scoring.win else ZERO


def _slot(entry: RoundEntry | None, round_number: int, before: Points, scoring: Scoring, drawn: bool,
          missed: Points) -> Slot:
    """``missed``: the late-entry points for this round when the player had not entered yet."""
    if entry is None:
        return Slot(round_number, SlotKind.UNPLAYED, None, None, missed, _share(missed, scoring), False, before,
                    voluntary=True)
    points = entry.points if entry.points is not None else ZERO
    if drawn and entry.opponent is not None and (entry.played or entry.result is None):
        # Fore Buchholz: every game of the last round counts as a draw.
        return Slot(round_number, SlotKind.PLAYED, entry.opponent, entry.side, scoring.draw, _SHARE["draw"], False,
                    before)
    if entry.opponent is not None and entry.result is None:
        return Slot(round_number, SlotKind.PENDING, entry.opponent, entry.side, ZERO, ZERO, False, before)
    won = scoring.win > scoring.loss and points >= scoring.win
    if entry.played and entry.result is not None and entry.side is not None:
        outcome = entry.result.outcome(entry.side)
        return Slot(round_number, SlotKind.PLAYED, entry.opponent, entry.side, points, _SHARE[outcome], won, before)
    fraction = _share(points, scoring)
    voluntary = entry.bye in (ByeKind.REQUESTED, ByeKind.ABSENCE) or (entry.bye is None and not won)
    return Slot(round_number, SlotKind.UNPLAYED, None, None, points, fraction, won, before, voluntary)


def build_context(state: EventState, last: int, unplayed: Unplayed, last_drawn: bool = False) -> Context:
    """Normalise every player's rounds ``1 .. last`` into slots (see :class:`Slot`).

    ``last_drawn`` counts every game of round ``last`` as a draw (for Fore Buchholz).
    """
    scoring = state.settings.scoring
    slots: dict[PlayerId, tuple[Slot, ...]] = {}
    points: dict[PlayerId, Points] = {}
    for pid, record in state.records.items():
        row: list[Slot] = []
        score = ZERO
        for r in range(1, last + 1):
            missed = late_entry_points(record.late_points, record.first_round, r)
            slot = _slot(record.entry(r), r, score, scoring, last_drawn and r == last, missed)
            if not entered(state, pid, r):
                slot = Slot(r, SlotKind.NOT_ENTERED, None, None, slot.points, slot.fraction, slot.won, score)
            row.append(slot)
            if slot.points:   # a loss or a game to come adds nothing (and a new fraction costs time)
                score += slot.points
        slots[pid] = tuple(row)
        points[pid] = score
    if unplayed is Unplayed.VIRTUAL_OPPONENT:
        # A player's own unplayed rounds count as draws towards other players' tiebreaks.
        for_others = {
            pid: total(scoring.draw if s.kind is SlotKind.UNPLAYED else s.points for s in row)
            for pid, row in slots.items()
        }
    elif unplayed is Unplayed.DUMMY_OPPONENT:
        # The adjusted score: voluntary unplayed rounds count as draws (C.07 2023, as remembered).
        for_others = {
            pid: total(scoring.draw if s.voluntary else s.points for s in row) for pid, row in slots.items()
        }
    else:
        for_others = dict(points)
    return Context(
        state=state, last=last, unplayed=unplayed, slots=MappingProxyType(slots),
        points=MappingProxyType(points), for_others=MappingProxyType(for_others), last_drawn=last_drawn,
    )
