"""The column map of the FIDE tournament report file, TRF16 edition, from memory.

The 2016 edition ("TRF16") of the FIDE Data Exchange Format, as remembered: the
Handbook annex itself was not at hand, so every position below is from memory and
must be checked against the annex before an event is submitted. The TRF-26
edition's additions are not covered. Columns are 1-based and inclusive, as the
standard counts them; one record per line, its tag in columns 1-3, data from
column 5.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

EDITION = "TRF16 (FIDE Data Exchange Format, 2016 edition), column positions from memory"


@dataclass(frozen=True, slots=True)
class Span:
    """Columns ``first`` to ``last`` of a line (1-based, inclusive), and how a value is aligned there."""

    first: int
    last: int
    align: Literal["left", "right"] = "left"

    @property
    def width(self) -> int:
        return self.last - self.first + 1

    def cut(self, line: str) -> str:
        """The field's text in ``line`` without padding (a short line gives what is there)."""
        return line[self.first - 1:self.last].strip()

    def put(self, value: str) -> str:
        """``value`` padded (or cut) to the field's width."""
        text = value[: self.width]
        return text.rjust(self.width) if self.align == "right" else text.ljust(self.width)


PLAYER_TAG = "001"
"""The player record."""

PLAYER = {
    "start_rank": Span(5, 8, "right"),
    "sex": Span(10, 10),
    "title": Span(11, 13, "right"),
    "name": Span(15, 47),
    "rating": Span(49, 52, "right"),
    "federation": Span(54, 56),
    "fide_id": Span(58, 68, "right"),
    "birth": Span(70, 79),
    "points": Span(81, 84, "right"),
    "rank": Span(86, 89, "right"),
}
"""The 001 record's fields before the round slots (TRF16 as remembered)."""

FIRST_SLOT = 92
SLOT_STEP = 10


def slot_start(round_number: int) -> int:
    """The first column of round ``round_number``'s slot: 92 + 10 × (r − 1)."""
    return FIRST_SLOT + SLOT_STEP * (round_number - 1)


def slot_spans(round_number: int) -> tuple[Span, Span, Span]:
    """Opponent's start rank (4 columns), colour (1), result code (1) of one round's slot."""
    c = slot_start(round_number)
    return Span(c, c + 3, "right"), Span(c + 5, c + 5), Span(c + 7, c + 7)


HEADER = {
    "012": "name",
    "022": "city",
    "032": "federation",
    "042": "start_date",
    "052": "end_date",
    "062": "players",
    "072": "rated_players",
    "092": "type",
    "102": "chief_arbiter",
    "112": "deputy_arbiter",
    "122": "time_control",
    "132": "round_dates",
}
"""The tournament header records read and written (the team count 082 is not: individual events only)."""

ROUNDS_TAG = "XXR"
"""Number of rounds: the extension record of the FIDE pairing-program endorsement rules (C.04.A),
from memory, low confidence."""
COLOUR_TAG = "XXC"
"""Initial colour (``white1`` / ``black1``: the side of start rank 1 in round 1), same source and caution."""
SCORING_TAG = "PTS"
"""Our own record, not part of TRF16: points for a win, a draw, a loss, a pairing bye, a requested
half-point bye and each round missed before a late entry, written only when they differ from
1, 0.5, 0, 1, 0.5, 0. Readers that do not know it skip it, as the standard asks of unknown tags."""
TIEBREAK_TAG = "TBK"
"""Our own record, not part of TRF16: the event's tiebreak acronyms and its treatment of unplayed
rounds, which decide the places in columns 86-89; written only when they differ from the defaults."""

WHITE, BLACK, NO_COLOUR = "w", "b", "-"
PLAYED_CODES = {"1": "win", "=": "draw", "0": "loss"}
FORFEIT_CODES = {"+": "win", "-": "loss"}
BYE_CODES = ("U", "H", "F", "Z")
"""Pairing-allocated bye, half-point bye, full-point bye, zero-point bye (absence)."""
UNRATED_CODES = ("W", "D", "L")
"""Games not to be rated (TRF16, from memory, uncertain): the desk holds no such result and refuses them."""
