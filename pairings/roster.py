"""Roster import from a spreadsheet's CSV export.

A header row names the columns (any case, any order): ``name`` is required;
``rating``, ``club`` and ``id`` are optional; other columns are ignored. UTF-8
with or without a byte-order mark; comma or semicolon separated. Every bad row
is reported with its line number and nothing is imported unless all rows are good.
"""

from __future__ import annotations

import csv
import io

from pairings import events as ev
from pairings.actions import MAX_NAME, clean_text, entry_round, new_id
from pairings.errors import InputError, RosterError
from pairings.state import EventState

_COLUMNS = {"name", "rating", "club", "id"}


def decode(data: bytes) -> str:
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(f"roster is not UTF-8 text (byte {exc.start})") from None


def _dialect(text: str) -> str:
    header = text.split("\n", 1)[0]
    return ";" if header.count(";") > header.count(",") else ","


def _check_text(value: str, what: str, limit: int) -> str | None:
    """The problem with a name-like cell (the entry rule of :func:`clean_text`), or None when it is fine."""
    try:
        clean_text(value, what, limit=limit)
    except InputError as exc:
        return str(exc)
    return None


def import_roster(state: EventState, text: str) -> list[ev.Event]:
    """The registrations for every row of ``text``; raises RosterError listing all bad rows."""
    if "\x00" in text:
        raise InputError("roster holds NUL bytes: not a CSV text file")
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=_dialect(text))
    try:
        rows = list(reader)
    except csv.Error as exc:
        raise InputError(f"roster is not readable CSV ({exc})") from None
    if not rows or not any(cell.strip() for cell in rows[0]):
        raise InputError("roster is empty: it needs a header row with a 'name' column")
    header = [cell.strip().casefold() for cell in rows[0]]
    if "name" not in header:
        raise InputError(f"roster header has no 'name' column (found: {', '.join(h for h in header if h) or 'nothing'})")
    dupes = {h for h in header if h in _COLUMNS and header.count(h) > 1}
    if dupes:
        raise InputError(f"roster header names {', '.join(sorted(dupes))} twice")
    col = {h: i for i, h in enumerate(header) if h in _COLUMNS}

    problems: list[str] = []
    out: list[ev.Event] = []
    ids_seen: dict[str, int] = {}
    taken: set[str] = set()
    start = entry_round(state)
    for line, row in enumerate(rows[1:], start=2):
        if not any(cell.strip() for cell in row):
            continue

        def cell(key: str) -> str:
            i = col.get(key)
            return " ".join(row[i].split()) if i is not None and i < len(row) else ""

        name, rating_text, club, pid = cell("name"), cell("rating"), cell("club"), cell("id")
        bad: list[str] = []
        if not name:
            bad.append("name is missing")
        elif (why := _check_text(name, "name", MAX_NAME)) is not None:
            bad.append(why)
        if club and (why := _check_text(club, "club", MAX_NAME)) is not None:
            bad.append(why)
        rating: int | None = None
        if rating_text:
            try:
                rating = int(rating_text)
            except ValueError:
                bad.append(f"rating {rating_text!r} is not a number")
            else:
                if not 0 <= rating <= 4000:
                    bad.append(f"rating {rating} is outside 0-4000")
        if pid:
            if (why := _check_text(pid, "id", 40)) is not None:
                bad.append(why)
            elif pid in state.players:
                bad.append(f"id {pid!r} is already registered")
            elif pid in ids_seen:
                bad.append(f"id {pid!r} repeats line {ids_seen[pid]}")
            else:
                ids_seen[pid] = line
        if bad:
            problems.append(f"line {line}: {'; '.join(bad)}")
            continue
        if pid:
            taken.add(pid)
        out.append(ev.PlayerRegistered(id=pid or "", name=name, rating=rating, club=club or None, entry_round=start))
    if problems:
        raise RosterError(problems)
    if not out:
        raise InputError("roster has a header but no players")
    # Rows without an id get the next free one, skipping every id given in the file.
    fixed: list[ev.Event] = []
    for reg in out:
        assert isinstance(reg, ev.PlayerRegistered)
        if not reg.id:
            reg = reg.model_copy(update={"id": new_id(state, taken)})
            taken.add(reg.id)
        fixed.append(reg)
    return fixed
