"""The rating report sheet and the standings' optional rating columns (FIDE B.02, as remembered).

Both read :func:`pairings.standings.ratingchange.rating_changes`; nothing is computed here.
"""

from __future__ import annotations

from dataclasses import replace
from datetime import datetime
from decimal import Decimal

from pairings.points import Points
from pairings.reports.sheets import Cell, Column, Sheet, Table, _sheet, start_numbers
from pairings.standings import counted_rounds
from pairings.standings.ratingchange import CAP, CAP_EXEMPT_FROM, RatingChange, rating_changes
from pairings.errors import InputError
from pairings.state import EventState
from pairings.text import counted

NOTES = (
    "Rating changes as the FIDE Rating Regulations (B.02) are remembered, not read from the Handbook: "
    "check them before submitting. The event's regulations and the chief arbiter's decision prevail.",
    f"Only games played over the board against rated opponents count; D is cut to ±{CAP} "
    f"(not for players rated {CAP_EXEMPT_FROM} or more: an amendment known from press reports only).",
    "K: 40 for players up to the year they turn 18 while below 2300, 10 from 2400, else 20 (K × games ≤ 700); "
    "the desk cannot know a player's first 30 games (K 40): check K by hand.",
    "Performance: average rating of the rated opponents + dp of table 8.1(a), p rounded half up.",
    "An unrated player's first rating (five rated games or more) counts two 1800-rated opponents drawn with "
    "(the rule of March 2024 as remembered): ratings below the list's floor are not published.",
)


def _number(value: Decimal | None) -> Points | None:
    """A score, expected score or change (exact decimals) as a sheet's points cell."""
    return None if value is None else Points(value)


def _note(c: RatingChange) -> str | None:
    parts = []
    if c.rating is None:
        first = f", first rating {c.first_rating} if this event alone counts" if c.first_rating else ""
        parts.append(f"unrated: {counted(len(c.games), 'game')} against rated opponents{first}")
    if c.unrated_opponents:
        parts.append(f"{counted(c.unrated_opponents, 'game')} against unrated opponents not rated")
    return "; ".join(parts) or None


def _after(state: EventState, round_number: int | None) -> int:
    last = counted_rounds(state)
    if last == 0:
        raise InputError("no rating report yet: no round has been published")
    if round_number is not None and not 1 <= round_number <= last:
        raise InputError(f"no rating report after round {round_number}: rounds 1 to {last} have been published")
    return round_number or last


def rating_report_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """Per player: rating, K, rated games, score, expected score, change, new rating, performance;
    then every rated game with its D, expected score and change."""
    after = _after(state, round_number)
    changes = rating_changes(state, after)
    number = start_numbers(state)
    order = sorted(state.players, key=lambda pid: number[pid])
    rows: list[tuple[Cell, ...]] = []
    games: list[tuple[Cell, ...]] = []
    for pid in order:
        c = changes[pid]
        name = state.players[pid].name
        rows.append((number[pid], pid, name, c.rating, c.k, len(c.games), _number(c.scored),
                     _number(c.expected) if c.rating is not None else None, _number(c.change), c.new_rating,
                     c.performance, _note(c)))
        if c.rating is not None:
            games += [(number[pid], name, g.round, state.players[g.opponent].name, g.opponent_rating,
                       g.difference, _number(g.expected), _number(g.score), _number(g.change)) for g in c.games]
    columns = (Column("no", "No.", "number"), Column("player_id", "Id", "id"), Column("player", "Player", "name"),
               Column("rating", "Rtg", "number"), Column("k", "K", "number"), Column("games", "Games", "number"),
               Column("score", "Score", "points"), Column("expected", "Exp", "points"),
               Column("change", "Change", "points"), Column("new", "New", "number"),
               Column("performance", "Perf", "number"), Column("note", "Note"))
    game_columns = (Column("no", "No.", "number"), Column("player", "Player", "name"),
                    Column("round", "Rd", "number"), Column("opponent", "Opponent", "name"),
                    Column("opponent_rating", "Rtg", "number"), Column("difference", "D", "number"),
                    Column("expected", "PD", "points"), Column("score", "Score", "points"),
                    Column("change", "K×(S−PD)", "points"))
    tables = (Table("Rating changes", columns, tuple(rows)), Table("Rated games", game_columns, tuple(games)))
    return _sheet(state, "rating-report", "Rating report", after, f"After round {after}", now, NOTES, tables)


def with_rating_columns(sheet: Sheet, state: EventState) -> Sheet:
    """The standings sheet with Exp, Change and Perf beside each player (before the Note column)."""
    changes = rating_changes(state, sheet.round_number)
    table = sheet.tables[0]
    keys = [c.key for c in table.columns]
    at, who = keys.index("note"), keys.index("player_id")
    added = (Column("expected", "Exp", "points"), Column("change", "Change", "points"),
             Column("performance", "Perf", "number"))
    rows = []
    for row in table.rows:
        c = changes[row[who]]  # type: ignore[index]
        extra = (_number(c.expected) if c.rating is not None else None, _number(c.change), c.performance)
        rows.append(row[:at] + extra + row[at:])
    columns = table.columns[:at] + added + table.columns[at:]
    notes = sheet.notes + (NOTES[1].replace("Only games", "Rating columns: only games"),)
    return replace(sheet, notes=notes, tables=(replace(table, columns=columns, rows=tuple(rows)),) + sheet.tables[1:])
