"""The five sheets as format-neutral tables; every format renders these.

A :class:`Sheet` holds raw values (names as entered, points as numbers); each
renderer formats and escapes them for its own medium.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime
from typing import Callable, Literal

from pairings.errors import InputError
from pairings.points import Points, points_text
from pairings.regulations import changed_after_notes
from pairings.reports.clean import stamp
from pairings.categories import describe_rule, find_category, members
from pairings.standings import UNPLAYED_LABELS, Standings, category_rows, legend, standings, tiebreak
from pairings.state import Acceleration, ByeKind, EventState, PlayerId, Round, RoundEntry, RoundState, Side, System

Cell = str | int | Points | None
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


def start_numbers(state: EventState) -> dict[PlayerId, int]:
    """Each player's start number: the place in the initial rank (rating, then name), from 1.

    The round-robin seats follow the same order, so on a grid the number is also the seat.
    """
    return {pid: n for n, pid in enumerate(state.initial_rank(), 1)}


def surname_key(name: str) -> tuple[str, str]:
    """Sort key by surname: the part before a comma ("Amberlight, Zinnia"), else the last word
    (common practice, no source; particles such as "van" are not recognised)."""
    folded = name.casefold().strip()
    family = folded.split(",", 1)[0] if "," in folded else (folded.split() or [""])[-1]
    return family, folded


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
    number = start_numbers(state)
    players = state.players
    rows = tuple(
        (g.board, g.first, number[g.first], players[g.first].name, players[g.first].rating, before[g.first],
         g.second, number[g.second], players[g.second].name, players[g.second].rating, before[g.second],
         g.result.value if g.result else None)
        for g in rnd.games
    )
    columns = (
        Column("board", "Board", "number"),
        Column("first_id", "Id", "id"), Column("first_no", "No.", "number"), Column("first", first, "name"),
        Column("first_rating", "Rtg", "number"), Column("first_score", "Score", "points"),
        Column("second_id", "Id", "id"), Column("second_no", "No.", "number"), Column("second", second, "name"),
        Column("second_rating", "Rtg", "number"), Column("second_score", "Score", "points"),
        Column("result", "Result", "result"),
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
    """Every player by surname: their board and side, their bye, or why they are not paired."""
    rnd = pick_round(state, round_number)
    where: dict[PlayerId, tuple[Cell, Cell, Cell]] = {}
    sides = state.settings.sides
    for g in rnd.games:
        where[g.first] = (g.board, sides[0] if sides else None, state.players[g.second].name)
        where[g.second] = (g.board, sides[1] if sides else None, state.players[g.first].name)
    for b in rnd.byes:
        where[b.player] = (None, BYE_WORDS[b.kind], None)
    rows = []
    for p in sorted(state.players.values(), key=lambda p: (surname_key(p.name), p.order)):
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
    notes = list(legend(table.tiebreaks))
    if any(tiebreak(a).kind.uses_unplayed for a in table.tiebreaks):   # only where the treatment changes a value
        notes.insert(0, f"Tiebreaks with {UNPLAYED_LABELS[table.unplayed]}.")
    if any(tiebreak(a).kind.uses_ratings for a in table.tiebreaks):
        notes.append(f"Unrated players count as {state.settings.default_rating}.")
    notes += changed_after_notes(state.settings)
    if table.provisional:
        missing = [r.number for r in state.rounds
                   if r.number <= table.after_round and r.state is RoundState.PUBLISHED]
        notes.insert(0, "PROVISIONAL — results missing in round " + ", ".join(map(str, missing)) + ".")
    return tuple(notes)


def _tiebreak_columns(table: Standings) -> tuple[Column, ...]:
    return tuple(Column(tiebreak(a).key, a, "points") for a in table.tiebreaks)


def standings_sheet(state: EventState, round_number: int | None, now: datetime,
                    category: str | None = None) -> Sheet:
    """Rank, start number, player, rating, points and the event's tiebreaks after a round.

    With ``category``, only its players, ranked among themselves (players tied
    overall stay tied), with their overall rank beside.
    """
    table = standings(state, after_round=round_number)
    number = start_numbers(state)
    rows_in = table.rows
    title, notes = "Standings", _tiebreak_notes(table, state)
    overall: tuple[tuple[Cell, ...], ...] = ()
    if category is not None:
        found = find_category(state, category)
        inside = members(state, found)
        rows_in = category_rows(table, inside)
        title = f"Standings — {found.name}"
        notes = (f"Category {found.name}: {describe_rule(found.rule)}.", *notes)
        overall = tuple((r.rank,) for r in table.rows if r.player in inside)
    ranks = [r.rank for r in rows_in]
    rows = tuple(
        (rank, row.player, number[row.player], row.name, state.players[row.player].rating, row.points,
         *(row.tiebreaks[k] for k in table.tiebreaks), *((overall[i][0],) if overall else ()),
         "withdrawn" if row.withdrawn else None)
        for i, (rank, row) in enumerate(zip(ranks, rows_in))
    )
    columns = (Column("rank", "Rank", "rank"), Column("player_id", "Id", "id"), Column("no", "No.", "number"),
               Column("player", "Player", "name"), Column("rating", "Rtg", "number"),
               Column("points", "Points", "points"), *_tiebreak_columns(table),
               *((Column("overall_rank", "Overall", "rank"),) if category is not None else ()),
               Column("note", "Note"))
    return _sheet(state, "standings", title, table.after_round, f"After round {table.after_round}",
                  now, notes, (Table(title, columns, rows),))


def _marks(state: EventState) -> dict[Side, str]:
    sides = state.settings.sides
    if sides is None:
        return {Side.FIRST: "", Side.SECOND: ""}
    a, b = sides[0][:1].upper(), sides[1][:1].upper()
    return {Side.FIRST: a, Side.SECOND: b} if a != b else {Side.FIRST: "1", Side.SECOND: "2"}


def _cross_cell(entry: RoundEntry | None, number: dict[PlayerId, int], marks: dict[Side, str],
                win: Points, draw: Points) -> str:
    if entry is None:
        return "–"
    if entry.bye is not None:
        return {ByeKind.PAIRING: "bye", ByeKind.REQUESTED: "req", ByeKind.ABSENCE: "abs"}[entry.bye] + (
            " " + outcome_mark(entry.points, win, draw))
    assert entry.opponent is not None and entry.side is not None
    head = f"{number[entry.opponent]}{marks[entry.side]}"
    if entry.result is None:
        return f"{head} ?"
    if entry.played:
        return f"{head} {outcome_mark(entry.points, win, draw)}"
    return f"{head} {'+' if entry.result.outcome(entry.side) == 'win' else '−'}"


def outcome_mark(value: Points | None, win: Points, draw: Points) -> str:
    """A round's mark in a crosstable or grid cell: ``1``, ``½``, ``0`` for a win's, a draw's or no
    points (a mark of the outcome in every format, see :mod:`pairings.points`), other points as a
    decimal, ``?`` while the result is to come."""
    if value is None:
        return "?"
    return "1" if value == win else "½" if value == draw else "0" if value == 0 else points_text(value)


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
