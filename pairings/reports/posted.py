"""Sheets organisers post besides the round's own: the starting rank list, the round-robin
grid and the prize list (format-neutral tables, like :mod:`.sheets`)."""

from __future__ import annotations

from datetime import datetime

from pairings.categories import describe_rule
from pairings.errors import InputError
from pairings.prizes import format_amount, prize_list
from pairings.points import Points
from pairings.reports.sheets import (
    Cell, Column, Sheet, Table, _sheet, _tiebreak_columns, _tiebreak_notes, outcome_mark, start_numbers,
)
from pairings.standings import standings
from pairings.state import EventState, PlayerId, RoundState, System


def start_list_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """The starting rank list: start number, title, name, federation, rating, club (no round needed)."""
    if not state.players:
        raise InputError("nothing to print yet: no player is registered")
    number = start_numbers(state)
    rows = tuple(
        (number[p.id], p.id, p.details.title, p.name, p.details.federation, p.rating, p.club,
         p.details.fide_id, "withdrawn" if p.withdrawn_from is not None else None)
        for p in sorted(state.players.values(), key=lambda p: number[p.id])
    )
    columns = (Column("no", "No.", "number"), Column("player_id", "Id", "id"), Column("title", "Title"),
               Column("player", "Player", "name"), Column("federation", "Fed"), Column("rating", "Rating", "number"),
               Column("club", "Club"), Column("fide_id", "FIDE ID", "id"), Column("note", "Note"))
    notes = (f"{len(rows)} players, ranked by rating, then name. Unrated players count as "
             f"{state.settings.default_rating} for the order.",)
    label = f"Round {state.rounds[-1].number}" if state.rounds else "Before round 1"
    return _sheet(state, "start-list", "Starting rank list", 0, label, now, notes, (Table("Players", columns, rows),))


def _grid_mark(points: Points | None, played: bool, win: Points, draw: Points) -> str:
    if points is not None and not played:
        return "+" if points == win else "−"
    return outcome_mark(points, win, draw)


def grid_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """The N × N round-robin crosstable: rows and columns by start number (the Berger seat);
    each cell the row player's result against the column player (both cycles in a double round)."""
    if state.settings.system is not System.ROUND_ROBIN:
        raise InputError("the grid is for round-robin events: print the crosstable instead")
    table = standings(state, after_round=round_number)
    number = start_numbers(state)
    seats = sorted(state.players, key=lambda pid: number[pid])
    win, draw = state.settings.scoring.win, state.settings.scoring.draw
    cells: dict[tuple[PlayerId, PlayerId], list[str]] = {}
    for rnd in state.rounds:
        if rnd.number > table.after_round or rnd.state is RoundState.DRAFT:
            continue
        for entry_pid, record in state.records.items():
            entry = record.entry(rnd.number)
            if entry is not None and entry.opponent is not None:
                cells.setdefault((entry_pid, entry.opponent), []).append(
                    _grid_mark(entry.points, entry.played, win, draw))
    rows: list[tuple[Cell, ...]] = []
    for pid in seats:
        row = table.row_of(pid)
        marks = tuple("×" if other == pid else " ".join(cells.get((pid, other), [])) for other in seats)
        rows.append((number[pid], pid, row.name, state.players[pid].rating, *marks, row.points, row.rank,
                     *(row.tiebreaks[k] for k in table.tiebreaks)))
    columns = (Column("no", "No.", "number"), Column("player_id", "Id", "id"), Column("player", "Player", "name"),
               Column("rating", "Rtg", "number"),
               *(Column(f"v{number[pid]}", str(number[pid])) for pid in seats),
               Column("points", "Points", "points"), Column("rank", "Rank", "rank"),
               *_tiebreak_columns(table))
    legend = "Cells: the row player's result against the column's number (+ / − forfeit, ? to come)."
    return _sheet(state, "grid", "Round-robin grid", table.after_round, f"After round {table.after_round}",
                  now, _tiebreak_notes(table, state) + (legend,), (Table("Grid", columns, tuple(rows)),))


def prize_sheet(state: EventState, round_number: int | None, now: datetime) -> Sheet:
    """The prize list: per list (overall first, then each category) its places, winners and amounts."""
    if not state.prizes:
        raise InputError("no prizes defined yet: add them with `pairings prize add`")
    result = prize_list(state, after_round=round_number)
    policy = result.policy
    number = start_numbers(state)
    tables = []
    for name in [None, *state.categories]:
        awards = [a for a in result.awards if a.category == name]
        if not awards:
            continue
        rows = tuple(
            (a.place, a.player, number[a.player] if a.player else None,
             state.players[a.player].name if a.player else None, a.points, format_amount(a.amount, policy),
             a.amount, a.note)
            for a in awards
        )
        columns = (Column("place", "Place", "rank"), Column("player_id", "Id", "id"),
                   Column("no", "No.", "number"), Column("player", "Player", "name"),
                   Column("points", "Points", "points"), Column("prize", "Prize"),
                   Column("amount_minor", "Amount (minor units)", "id"), Column("note", "Note"))
        caption = "Overall" if name is None else f"{name} ({describe_rule(state.categories[name].rule)})"
        tables.append(Table(caption, columns, rows))
    better = {"amount": "the larger amount (equal amounts: the list named first)",
              "order": "the list named first"}[policy.better.value]
    ties = {"tiebreaks": "the tiebreaks decide between players equal on points",
            "shared": "players equal on points share the prizes of their places equally",
            "hort": "Hort system: half of each prize by tiebreaks, half shared equally (from memory)"}[policy.ties.value]
    notes = (f"One prize per player: each receives {better}.", f"Ties: {ties}.",
             *_tiebreak_notes(result.table, state))
    return _sheet(state, "prizes", "Prize list", result.table.after_round,
                  f"After round {result.table.after_round}", now, notes, tuple(tables))
