"""Standings: points, ranks and tiebreaks as pure functions of the event's state.

Imports only the standard library and :mod:`pairings.state` (no rich, no textual).
See ``docs/tiebreaks.md`` for the definitions and their sources.
"""

from pairings.standings.context import Context, Slot, SlotKind, build_context
from pairings.standings.table import Standings, StandingsRow, category_rows, counted_rounds, standings
from pairings.standings.ratings import dp_from_fraction
from pairings.standings.tiebreaks import (
    EDITION, TIEBREAKS, Kind, Tiebreak, check_tiebreaks, default_tiebreaks, legend, tiebreak,
)
from pairings.state import Unplayed

UNPLAYED_LABELS = {
    Unplayed.AS_THEY_STAND: "unplayed games as they stand",
    Unplayed.VIRTUAL_OPPONENT: "unplayed games against a virtual opponent (FIDE 2009)",
    Unplayed.DUMMY_OPPONENT: "unplayed games against a dummy opponent (FIDE C.07 2023, as remembered)",
}
"""How printouts name each treatment of unplayed games."""

__all__ = [
    "EDITION", "TIEBREAKS", "UNPLAYED_LABELS", "Context", "Kind", "Slot", "SlotKind", "Standings",
    "StandingsRow", "Tiebreak", "Unplayed", "build_context", "category_rows", "check_tiebreaks", "counted_rounds",
    "default_tiebreaks", "dp_from_fraction", "legend", "standings", "tiebreak",
]
