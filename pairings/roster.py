"""Roster import from a spreadsheet's CSV (or tab-separated) export.

A header row names the columns (any case, any order, common spellings: see
:data:`HEADERS`): ``name`` is required; ``rating``, ``club``, ``id``, ``title``,
``federation``, ``fide_id``, ``national_id``, ``birth``, ``sex`` and
``categories`` are optional, and ``<list> rating`` (``fide rating``, ``rating
national``) gives a rating on a named list. Columns the import does not read are
named in a warning, never dropped silently. UTF-8 with or without a byte-order
mark; comma, semicolon or tab separated. Every bad row (also a row with more or
fewer cells than the header, or a quote that is never closed) is reported with
its line number and nothing is imported unless all rows are good.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, replace

from pairings import events as ev
from pairings.actions import MAX_NAME, clean_text, entry_round, new_id
from pairings.details import DETAIL_KEYS, details_model, read_details, read_rating, read_ratings
from pairings.errors import InputError, RosterError
from pairings.state import EventState

HEADERS: dict[str, str] = {
    **dict.fromkeys(("name", "player", "player name", "full name", "names"), "name"),
    **dict.fromkeys(("rating", "rtg", "elo", "ratings"), "rating"),
    **dict.fromkeys(("club", "team", "club name"), "club"),
    **dict.fromkeys(("id", "player id", "pid"), "id"),
    **dict.fromkeys(("title", "tit", "fide title"), "title"),
    **dict.fromkeys(("federation", "fed", "nation", "fed code"), "federation"),
    **dict.fromkeys(("fide id", "fideid", "fide no", "fide number", "id fide"), "fide_id"),
    **dict.fromkeys(("national id", "nat id", "national number", "member id", "membership number"), "national_id"),
    **dict.fromkeys(("birth", "born", "birthday", "birth date", "birthdate", "date of birth", "dob",
                     "birth year", "year of birth", "yob"), "birth"),
    **dict.fromkeys(("sex", "gender"), "sex"),
    **dict.fromkeys(("categories", "category", "cat", "labels"), "categories"),
}
"""Header spellings (folded: lower case, ``_ - .`` as spaces) → the column they fill."""
_LIST_RATING = re.compile(r"(?:(?:rating|rtg|elo) ([a-z][a-z0-9]*)|([a-z][a-z0-9]*) (?:rating|rtg|elo))")


def decode(data: bytes) -> str:
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(f"roster is not UTF-8 text (byte {exc.start})") from None


def _delimiter(text: str) -> str:
    header = text.split("\n", 1)[0]
    return max((",", ";", "\t"), key=header.count) if any(c in header for c in ",;\t") else ","


def _fold(header: str) -> str:
    return " ".join(re.sub(r"[_\-.:]", " ", header).casefold().split())


def column_of(header: str) -> str | None:
    """The column a header fills (``rating:fide`` for a rating on a named list), or None when not read."""
    folded = _fold(header)
    if folded in HEADERS:
        return HEADERS[folded]
    match = _LIST_RATING.fullmatch(folded)
    if match:
        return f"rating:{match.group(1) or match.group(2)}"
    return None


def _check_text(value: str, what: str, limit: int) -> str | None:
    """The problem with a name-like cell (the entry rule of :func:`clean_text`), or None when it is fine."""
    try:
        clean_text(value, what, limit=limit)
    except InputError as exc:
        return str(exc)
    return None


@dataclass(frozen=True)
class RosterImport:
    events: list[ev.Event]
    warnings: list[str]
    """Columns not read, one line each."""


def _rows(text: str) -> tuple[list[tuple[int, list[str]]], list[str]]:
    """(first line, cells) of each row read, and the problems: an unclosed quote, a cell over several lines."""
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=_delimiter(text), strict=True)
    rows: list[tuple[int, list[str]]] = []
    problems: list[str] = []
    start = 1
    try:
        for row in reader:
            if reader.line_num > start:
                problems.append(f"line {start}: a quoted cell runs over {reader.line_num - start + 1} lines "
                                "(a quote left open?)")
            rows.append((start, row))
            start = reader.line_num + 1
    except csv.Error as exc:
        why = "a quote is opened and never closed" if "end of data" in str(exc) or "EOF" in str(exc) else str(exc)
        problems.append(f"line {start}: {why}")
    return rows, problems


def read_roster(state: EventState, text: str) -> RosterImport:
    """The registrations for every row of ``text``, and warnings; raises RosterError listing all bad rows."""
    if "\x00" in text:
        raise InputError("roster holds NUL bytes: not a CSV text file")
    rows, quoting = _rows(text)
    if quoting and len(rows) < 2:
        raise RosterError(quoting)  # the header itself, or everything after it, is inside the open quote
    if not rows or not any(cell.strip() for cell in rows[0][1]):
        raise InputError("roster is empty: it needs a header row with a 'name' column")
    header = [cell.strip() for cell in rows[0][1]]
    columns = [column_of(h) for h in header]
    if "name" not in columns:
        raise InputError(f"roster header has no 'name' column (found: {', '.join(h for h in header if h) or 'nothing'})")
    dupes = sorted({c for c in columns if c is not None and columns.count(c) > 1})
    if dupes:
        raise InputError(f"roster header names {', '.join(d.replace('rating:', 'rating ') for d in dupes)} twice")
    col = {c: i for i, c in enumerate(columns) if c is not None}
    warnings = [f"column {i + 1} ({h!r}) is not read: its values are not imported"
                for i, (h, c) in enumerate(zip(header, columns)) if c is None and h]

    problems: list[str] = quoting
    out: list[ev.PlayerRegistered] = []
    ids_seen: dict[str, int] = {}
    taken: set[str] = set()
    start = entry_round(state)
    for line, row in rows[1:]:
        if not any(cell.strip() for cell in row):
            continue
        if len(row) != len(header):
            cells = f"{len(row)} cell{'s' if len(row) != 1 else ''}"
            problems.append(f"line {line}: {cells} where the header has {len(header)}")
            continue

        def cell(key: str) -> str:
            i = col.get(key)
            return " ".join(row[i].split()) if i is not None else ""

        name, rating_text, club, pid = cell("name"), cell("rating"), cell("club"), cell("id")
        bad: list[str] = []
        if not name:
            bad.append("name is missing")
        elif (why := _check_text(name, "name", MAX_NAME)) is not None:
            bad.append(why)
        if club and (why := _check_text(club, "club", MAX_NAME)) is not None:
            bad.append(why)
        rating: int | None = None
        try:
            rating = read_rating(rating_text)
        except InputError as exc:
            bad.append(str(exc))
        details = None
        try:
            details = read_details({k: cell(k) for k in DETAIL_KEYS if k in col and k != "ratings"})
            lists = [f"{c.removeprefix('rating:')}={cell(c)}" for c in col if c.startswith("rating:") and cell(c)]
            if lists:
                details = replace(details, ratings=read_ratings(lists))
        except InputError as exc:
            bad.append(str(exc))
        if pid:
            if (why := _check_text(pid, "id", 40)) is not None:
                bad.append(why)
            elif pid in state.players:
                bad.append(f"id {pid!r} is already registered")
            elif pid in ids_seen:
                bad.append(f"id {pid!r} repeats line {ids_seen[pid]}")
            else:
                ids_seen[pid] = line
        if bad or details is None:
            problems.append(f"line {line}: {'; '.join(bad)}")
            continue
        if pid:
            taken.add(pid)
        out.append(ev.PlayerRegistered(id=pid or "", name=name, rating=rating, club=club or None, entry_round=start,
                                       details=details_model(details)))
    if problems:
        raise RosterError(sorted(problems, key=lambda p: int(p.split(":")[0].removeprefix("line "))))
    if not out:
        raise InputError("roster has a header but no players")
    # Rows without an id get the next free one, skipping every id given in the file.
    fixed: list[ev.Event] = []
    for reg in out:
        if not reg.id:
            reg = reg.model_copy(update={"id": new_id(state, taken)})
            taken.add(reg.id)
        fixed.append(reg)
    return RosterImport(fixed, warnings)


def import_roster(state: EventState, text: str) -> list[ev.Event]:
    """The registrations for every row of ``text`` (see :func:`read_roster` for the warnings)."""
    return read_roster(state, text).events
