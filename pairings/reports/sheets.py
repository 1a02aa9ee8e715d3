"""The five sheets as format-neutral tables; every format renders these.

A :class:`Sheet` holds raw values (names as entered, points as numbers); each
renderer formats and escapes them for its own medium.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime
from typing import Callable, Literal

from pairings.errors import InputError
from pairings.reports.clean import stamp
from pairings.standings import TIEBREAKS, UNPLAYED_LABELS, Standings, standings
from pairings.state import Acceleration, ByeKind, EventState, PlayerId, Round, RoundEntry, RoundState, Side, System

Cell = str | int | float | None
ColumnKind = Literal["text", "name", "points", "number", "rank", "result", "id"]


@dataclass(frozen=True, slots=True)
class Column:
    key: str
    label: str
    kind: ColumnKind = "text"
    """``name`` cells hold player names (wrapped, isolated); ``id`` columns appear in CSV/JSON only;
    ``blank`` columns are left empty for writing in."""


@dataclass(frozen=True, slots=True)
class Table:
    caption: str
    columns: tuple[Column, ...]
    rows: tuple[tuple[Cell, ...], ...]

    def printed_columns(self) -> list[int]:
        """Indexes of the columns shown on paper and screen (all but ``id`` columns)."""
        return [i for i, c in enumerate(self.columns) if c.kind != "id"]


@dataclass(frozen=True, slots=True)
class Sheet:
    kind: str
    title: str
    event: str
    round_number: int
    round_label: str
    printed: str
    notes: tuple[str, ...]
    tables: tuple[Table, ...]
    sides: tuple[str, str] | None


BYE_WORDS = {ByeKind.PAIRING: "pairing bye", ByeKind.REQUESTED: "requested bye", ByeKind.ABSENCE: "absent"}


def pick_round(state: EventState, number: int | None) -> Round:
    """Round ``number``, or the latest round in any state; InputError when there is none."""
    if not state.rounds:
        raise InputError("nothing to print yet: the event has no rounds")
    if number is None:
        return state.rounds[-1]
    found = state.round(number)
    if found is None:
        raise InputError(f"no round {number}: the event has rounds 1 to {len(state.rounds)}")
    return found


def side_labels(state: EventState) -> tuple[str, str]:
    sides = state.settings.sides
    return sides if sides is not None else ("Player", "Player")


def _round_notes(rnd: Round) -> tuple[str, ...]:
    if rnd.state is RoundState.DRAFT:
        return ("DRAFT — not published: boards may still change.",)
    if rnd.state is RoundState.PUBLISHED and any(g.result is None for g in rnd.games):
        return ("Results still to come on some boards.",)
    return ()


def _sheet(state: EventState, kind: str, title: str, number: int, label: str, now: datetime,
           notes: tuple[str, ...], tables: tuple[Table, ...]) -> Sheet:
    return Sheet(kind=kind, title=title, event=state.settings.name, round_number=number,
                 round_label=label, printed=stamp(now), notes=notes, tables=tables,
                 sides=state.settings.sides)


def _byes_table(state: EventState, rnd: Round) -> Table:
    rows = tuple((b.player, state.players[b.player].name, BYE_WORDS[b.kind], b.points) for b in rnd.byes)
    columns = (Column("player_id", "Id", "id"), Column("player", "Player", "name"),
               Column("bye", "Bye"), Column("points", "Points", "points"))
    return Table("Byes", columns, rows)


def pairing_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """Boards in order: board, first side with score, second side with score, result."""
    rnd = pick_round(state, round_number)
    first, second = side_labels(state)
    before = {pid: state.records[pid].score_before(rnd.number) for pid in state.players}
    rows = tuple(
        (g.board, g.first, state.players[g.first].name, before[g.first],
         g.second, state.players[g.second].name, before[g.second], g.result.value if g.result else None)
        for g in rnd.games
    )
    columns = (
        Column("board", "Board", "number"),
        Column("first_id", "Id", "id"), Column("first", first, "name"), Column("first_score", "Score", "points"),
        Column("second_id", "Id", "id"), Column("second", second, "name"),
        Column("second_score", "Score", "points"), Column("result", "Result", "result"),
    )
    tables = (Table("Boards", columns, rows),) + ((_byes_table(state, rnd),) if rnd.byes else ())
    return _sheet(state, "pairings", "Pairings", rnd.number, f"Round {rnd.number}", now,
                  _round_notes(rnd) + _system_notes(state), tables)


def _system_notes(state: EventState) -> tuple[str, ...]:
    """The pairing system and acceleration a pairing sheet was made under, when they need saying."""
    out = []
    if state.settings.system is System.DUTCH:
        out.append("Paired by the FIDE (Dutch) System, Handbook C.04.3, as implemented by this program; "
                   "the implementation is not endorsed by FIDE.")
    if state.settings.acceleration is Acceleration.BAKU:
        out.append("Baku acceleration (C.04.5.1): virtual points decide the pairing only; scores shown are "
                   "real points.")
    return tuple(out)


def name_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """Every player by name: their board and side, their bye, or why they are not paired."""
    rnd = pick_round(state, round_number)
    where: dict[PlayerId, tuple[Cell, Cell, Cell]] = {}
    sides = state.settings.sides
    for g in rnd.games:
        where[g.first] = (g.board, sides[0] if sides else None, state.players[g.second].name)
        where[g.second] = (g.board, sides[1] if sides else None, state.players[g.first].name)
    for b in rnd.byes:
        where[b.player] = (None, BYE_WORDS[b.kind], None)
    rows = []
    for p in sorted(state.players.values(), key=lambda p: (p.name.casefold(), p.order)):
        if p.id in where:
            board, side, opponent = where[p.id]
        else:
            out = p.withdrawn_from is not None and p.withdrawn_from <= rnd.number
            board, side, opponent = None, "withdrawn" if out else "not paired", None
        rows.append((p.id, p.name, board, side, opponent))
    # Without sides the column keeps only byes and absences.
    columns = (Column("player_id", "Id", "id"), Column("player", "Player", "name"),
               Column("board", "Board", "number"), Column("side", "Side" if sides else "Bye"),
               Column("opponent", "Opponent", "name"))
    return _sheet(state, "names", "Players by name", rnd.number, f"Round {rnd.number}", now,
                  _round_notes(rnd), (Table("Players", columns, tuple(rows)),))


def slip_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """One result slip per board (laid out by each renderer; the table lists the boards)."""
    rnd = pick_round(state, round_number)
    first, second = side_labels(state)
    rows = tuple(
        (g.board, g.first, state.players[g.first].name, g.second, state.players[g.second].name)
        for g in rnd.games
    )
    columns = (Column("board", "Board", "number"), Column("first_id", "Id", "id"),
               Column("first", first, "name"), Column("second_id", "Id", "id"),
               Column("second", second, "name"))
    return _sheet(state, "slips", "Result slips", rnd.number, f"Round {rnd.number}", now,
                  _round_notes(rnd), (Table("Boards", columns, rows),))


def _tiebreak_notes(table: Standings, state: EventState) -> tuple[str, ...]:
    notes = [f"Tiebreaks with {UNPLAYED_LABELS[table.unplayed]}."]
    for key in table.tiebreaks:
        tb = TIEBREAKS[key]
        notes.append(f"{tb.short} = {tb.label} ({tb.citation})")
    if any(k in ("average_rating_opponents", "performance_rating") for k in table.tiebreaks):
        notes.append(f"Unrated players count as {state.settings.default_rating}.")
    if table.provisional:
        missing = [r.number for r in state.rounds
                   if r.number <= table.after_round and r.state is RoundState.PUBLISHED]
        notes.insert(0, "PROVISIONAL — results missing in round " + ", ".join(map(str, missing)) + ".")
    return tuple(notes)


def _tiebreak_columns(table: Standings) -> tuple[Column, ...]:
    return tuple(Column(key, TIEBREAKS[key].short, "points") for key in table.tiebreaks)


def standings_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """Rank, player, points and the event's tiebreaks after a round."""
    table = standings(state, after_round=round_number)
    rows = tuple(
        (row.rank, row.player, row.name, row.points,
         *(row.tiebreaks[k] for k in table.tiebreaks), "withdrawn" if row.withdrawn else None)
        for row in table.rows
    )
    columns = (Column("rank", "Rank", "rank"), Column("player_id", "Id", "id"),
               Column("player", "Player", "name"), Column("points", "Points", "points"),
               *_tiebreak_columns(table), Column("note", "Note"))
    return _sheet(state, "standings", "Standings", table.after_round, f"After round {table.after_round}",
                  now, _tiebreak_notes(table, state), (Table("Standings", columns, rows),))


def _marks(state: EventState) -> dict[Side, str]:
    sides = state.settings.sides
    if sides is None:
        return {Side.FIRST: "", Side.SECOND: ""}
    a, b = sides[0][:1].upper(), sides[1][:1].upper()
    return {Side.FIRST: a, Side.SECOND: b} if a != b else {Side.FIRST: "1", Side.SECOND: "2"}


def _cross_cell(entry: RoundEntry | None, number: dict[PlayerId, int], marks: dict[Side, str],
                win: float, draw: float) -> str:
    if entry is None:
        return "–"
    if entry.bye is not None:
        return {ByeKind.PAIRING: "bye", ByeKind.REQUESTED: "req", ByeKind.ABSENCE: "abs"}[entry.bye] + (
            " " + _outcome_mark(entry.points, win, draw))
    assert entry.opponent is not None and entry.side is not None
    head = f"{number[entry.opponent]}{marks[entry.side]}"
    if entry.result is None:
        return f"{head} ?"
    if entry.played:
        return f"{head} {_outcome_mark(entry.points, win, draw)}"
    return f"{head} {'+' if entry.result.outcome(entry.side) == 'win' else '−'}"


def _outcome_mark(value: float | None, win: float, draw: float) -> str:
    if value is None:
        return "?"
    return "1" if value == win else "½" if value == draw else "0" if value == 0 else f"{value:g}"


def crosstable_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """Standings order; each round's cell is the opponent's row number, side mark and result."""
    table = standings(state, after_round=round_number)
    number = {row.player: i for i, row in enumerate(table.rows, 1)}
    marks = _marks(state)
    scoring = state.settings.scoring
    rows = []
    for row in table.rows:
        record = state.records[row.player]
        cells = tuple(_cross_cell(record.entry(r), number, marks, scoring.win, scoring.draw)
                      for r in range(1, table.after_round + 1))
        rows.append((number[row.player], row.rank, row.player, row.name, *cells, row.points,
                     *(row.tiebreaks[k] for k in table.tiebreaks)))
    columns = (Column("no", "No.", "number"), Column("rank", "Rank", "rank"), Column("player_id", "Id", "id"),
               Column("player", "Player", "name"),
               *(Column(f"r{r}", f"R{r}") for r in range(1, table.after_round + 1)),
               Column("points", "Points", "points"), *_tiebreak_columns(table))
    legend = "Cells: opponent's number, side, result (+ / − forfeit, ? to come); bye, req(uested), abs(ent), – not in the event."
    return _sheet(state, "crosstable", "Crosstable", table.after_round, f"After round {table.after_round}",
                  now, _tiebreak_notes(table, state) + (legend,), (Table("Crosstable", tuple(columns), tuple(rows)),))


Builder = Callable[[EventState, "int | None", datetime], Sheet]

BUILDERS: dict[str, Builder] = {
    "pairings": pairing_sheet,
    "names": name_sheet,
    "slips": slip_sheet,
    "standings": standings_sheet,
    "crosstable": crosstable_sheet,
}
