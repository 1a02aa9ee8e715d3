"""Rating lists: the FIDE download (fixed-width text) and a national list (CSV), streamed.

A list of two million lines is read one line at a time and never held whole: a
line is looked at beyond its ID (and the surname, while players without an ID are
looked for) only when it belongs to a player of the event. So a bad line of a
player who is not in the event is not reported, except a short line, which every
line is checked for.

The FIDE layout, as remembered (the download's own description was not at hand;
check it before relying on it): a heading line ``ID Number  Name  Fed  Sex  Tit
WTit  OTit  FOA  SRtng  SGm  SK  RRtng  RGm  Rk  BRtng  BGm  BK  B-day  Flag``, then
one player per line, each field starting under its heading. The columns are taken
from the heading line when there is one, else from the remembered positions in
:data:`FIDE_COLUMNS`.

The national list is a CSV file with a header row: ``id``, ``name`` and ``rating``
are needed, ``title``, ``federation``, ``birth`` and ``sex`` are taken when present.
"""

from __future__ import annotations

import csv
from dataclasses import dataclass, field
from pathlib import Path
from typing import Iterable, Iterator

from pairings import events as ev
from pairings.actions import folded_name
from pairings.errors import RatingListError
from pairings.state import TITLES, EventState, Player, PlayerId, RoundState
from pairings.text import counted

FIDE_HEADINGS = ("ID Number", "Name", "Fed", "Sex", "Tit", "WTit", "OTit", "FOA", "SRtng", "SGm", "SK",
                 "RRtng", "RGm", "Rk", "BRtng", "BGm", "BK", "B-day", "Flag")
FIDE_COLUMNS = (0, 15, 76, 80, 84, 89, 94, 109, 113, 119, 123, 126, 132, 136, 139, 145, 149, 152, 158)
"""0-based first column of each heading (from memory, low confidence)."""
RATING_HEADINGS = {"standard": "SRtng", "rapid": "RRtng", "blitz": "BRtng"}
LIST_NAMES = {"standard": "fide", "rapid": "fide-rapid", "blitz": "fide-blitz"}
"""The rating list name a FIDE rating is kept under in the player's details."""
SHOWN = 5
"""How many bad lines of one kind the report names."""


@dataclass(frozen=True, slots=True)
class ListEntry:
    line: int
    id: str
    name: str
    rating: int | None
    title: str | None = None
    federation: str | None = None
    birth: str | None = None
    """The birth year (``YYYY``) or date as the list gives it."""
    sex: str | None = None


@dataclass
class Found:
    """What one pass over a list found for the event's players."""

    list_name: str
    by_id: dict[str, ListEntry] = field(default_factory=dict)
    by_name: dict[str, list[ListEntry]] = field(default_factory=dict)
    problems: list[str] = field(default_factory=list)
    duplicates: set[str] = field(default_factory=set)
    lines: int = 0
    short: list[int] = field(default_factory=list)


def _name_key(name: str) -> tuple[str, ...]:
    """A name compared word by word in any order, accents and commas aside ("Alder, Ann" = "Ann Alder")."""
    return tuple(sorted(folded_name(name.replace(",", " ")).split()))


class _Wanted:
    """The IDs and the name words of the players a pass looks for."""

    def __init__(self, state: EventState, national: bool) -> None:
        self.ids: dict[str, PlayerId] = {}
        self.names: dict[tuple[str, ...], list[PlayerId]] = {}
        for p in state.players.values():
            pid = p.details.national_id if national else p.details.fide_id
            if pid:
                self.ids[pid] = p.id
            else:
                self.names.setdefault(_name_key(p.name), []).append(p.id)
        self.words = {w for key in self.names for w in key}


def _int(text: str) -> int | None:
    return int(text) if text else None


def _fide_spans(heading: str | None) -> dict[str, slice]:
    starts = list(FIDE_COLUMNS)
    if heading is not None:
        at = 0
        for i, name in enumerate(FIDE_HEADINGS):
            found = heading.find(name, at)
            if found < 0:
                raise RatingListError(f"line 1: the heading has no {name!r} column (FIDE layout, as remembered)")
            starts[i], at = found, found + len(name)
    ends: list[int | None] = [*starts[1:], None]
    return {name: slice(s, e) for name, s, e in zip(FIDE_HEADINGS, starts, ends)}


def _fide_entry(line_no: int, line: str, spans: dict[str, slice], rating_heading: str) -> ListEntry:
    """One list line in full; RatingListError on a field it cannot read."""
    rating_text = line[spans[rating_heading]].strip()
    if rating_text and not rating_text.isdigit():
        raise RatingListError(f"line {line_no}: rating {rating_text!r} is not a number")
    birth = line[spans["B-day"]].strip()
    if birth and not (birth.isdigit() and len(birth) == 4):
        birth = ""  # some lines carry 0000 or nothing; a year of birth is all the list gives
    title = line[spans["Tit"]].strip().upper() or line[spans["WTit"]].strip().upper()
    sex = line[spans["Sex"]].strip().upper()
    return ListEntry(
        line=line_no, id=line[spans["ID Number"]].strip(), name=" ".join(line[spans["Name"]].split()),
        rating=_int(rating_text) or None, title=title if title in TITLES else None,
        federation=line[spans["Fed"]].strip().upper() or None, birth=birth if birth not in ("", "0000") else None,
        sex={"M": "m", "F": "f"}.get(sex),
    )


def _keep(found: Found, wanted: _Wanted, entry: ListEntry, by_name: bool) -> None:
    if not by_name:
        first = found.by_id.get(entry.id)
        if first is not None:
            found.problems.append(f"line {entry.line}: ID {entry.id} also on line {first.line}: neither is used")
            found.duplicates.add(entry.id)
        else:
            found.by_id[entry.id] = entry
    else:
        found.by_name.setdefault(" ".join(_name_key(entry.name)), []).append(entry)


def scan_fide(lines: Iterable[str], state: EventState, kind: str = "standard") -> Found:
    """One pass over a FIDE list (any iterable of lines, e.g. an open file): the event's players' lines."""
    wanted = _Wanted(state, national=False)
    found = Found(LIST_NAMES[kind])
    spans: dict[str, slice] | None = None
    rating_heading = RATING_HEADINGS[kind]
    for line_no, raw in enumerate(lines, 1):
        line = raw.rstrip("\r\n")
        if line_no == 1 and line.startswith("ID Number"):
            spans = _fide_spans(line)
            continue
        if spans is None:
            spans = _fide_spans(None)
        found.lines += 1
        if len(line) < spans["Fed"].start:
            if line.strip():
                found.short.append(line_no)
            continue
        pid = line[spans["ID Number"]].strip()
        by_name = False
        if pid not in wanted.ids:
            if not wanted.words:
                continue
            # A cheap test first: the name's first word must be a word of a wanted name.
            first = line[spans["Name"]].split(None, 1)[:1]
            if not first or first[0].rstrip(",").casefold() not in wanted.words \
                    or _name_key(line[spans["Name"]]) not in wanted.names:
                continue
            by_name = True
        try:
            _keep(found, wanted, _fide_entry(line_no, line, spans, rating_heading), by_name)
        except RatingListError as exc:
            found.problems.append(str(exc))
            found.duplicates.add(pid)
    return found


def scan_national(lines: Iterable[str], state: EventState) -> Found:
    """One pass over a national list in CSV (header row: id, name, rating; title, federation, birth, sex)."""
    wanted = _Wanted(state, national=True)
    found = Found("national")
    rows: Iterator[list[str]] = csv.reader(lines)
    header = [h.strip().casefold() for h in next(rows, [])]
    missing = [h for h in ("id", "name", "rating") if h not in header]
    if missing:
        raise RatingListError(f"line 1: the national list has no {', '.join(missing)} column (header row needed)")
    col = {h: header.index(h) for h in ("id", "name", "rating", "title", "federation", "birth", "sex") if h in header}
    for line_no, row in enumerate(rows, 2):
        found.lines += 1
        if len(row) < len(header):
            if any(c.strip() for c in row):
                found.short.append(line_no)
            continue
        pid = row[col["id"]].strip()
        by_name = pid not in wanted.ids
        if by_name and (not wanted.words or _name_key(row[col["name"]]) not in wanted.names):
            continue
        rating = row[col["rating"]].strip()
        if rating and not rating.isdigit():
            found.problems.append(f"line {line_no}: rating {rating!r} is not a number")
            found.duplicates.add(pid)
            continue
        get = {k: row[i].strip() or None for k, i in col.items()}
        title = (get.get("title") or "").upper() or None
        sex = (get.get("sex") or "").lower() or None
        _keep(found, wanted, ListEntry(
            line=line_no, id=pid, name=row[col["name"]].strip(), rating=_int(rating) or None,
            title=title if title in TITLES else None, federation=(get.get("federation") or "").upper() or None,
            birth=get.get("birth"), sex=sex if sex in ("m", "f") else None), by_name)
    return found


def read_list_file(path: Path, state: EventState, kind: str = "standard") -> Found:
    """Stream ``path``: a national list when it ends in ``.csv``, else the FIDE download."""
    try:
        with open(path, encoding="utf-8", errors="replace", newline="") as f:
            return scan_national(f, state) if path.suffix.lower() == ".csv" else scan_fide(f, state, kind)
    except OSError as exc:
        raise RatingListError(f"{path}: cannot read ({exc.strerror})") from None


@dataclass(frozen=True, slots=True)
class Change:
    player: PlayerId
    entry: ListEntry
    by_name: bool


@dataclass
class Plan:
    """What an update would do, and what it found wanting (the command prints :meth:`report`)."""

    list_name: str
    changes: list[Change]
    offers: list[Change]
    """Name matches not applied (without ``--accept-names``)."""
    not_found: list[PlayerId]
    problems: list[str]
    names: dict[PlayerId, str]
    keep_rating: bool
    lines: int

    def report(self) -> list[str]:
        out = [f"read {self.lines:,} list lines; {counted(len(self.changes), 'player')} updated from the "
               f"{self.list_name} list"]
        out += [f"problem: {p}" for p in self.problems]
        for c in self.offers:
            out.append(f"name match (not applied; --accept-names applies it): {self.names[c.player]} = "
                       f"{c.entry.name}, ID {c.entry.id}, rating {c.entry.rating or 'unrated'} (line {c.entry.line})")
        out += [f"not found: {self.names[pid]}" for pid in self.not_found]
        return out


def plan_update(state: EventState, found: Found, accept_names: bool = False, keep_rating: bool = False) -> Plan:
    """Match the event's players to what a list pass found: by ID, else (offered) by name."""
    national = found.list_name == "national"
    problems = list(found.problems)
    if found.short:
        shown = ", ".join(map(str, found.short[:SHOWN]))
        more = f" and {len(found.short) - SHOWN} more" if len(found.short) > SHOWN else ""
        problems.append(f"{counted(len(found.short), 'short line')} skipped: line {shown}{more}")
    changes: list[Change] = []
    offers: list[Change] = []
    missing: list[PlayerId] = []
    for p in state.players.values():
        pid = p.details.national_id if national else p.details.fide_id
        if pid:
            entry = found.by_id.get(pid)
            if entry is not None and pid not in found.duplicates:
                changes.append(Change(p.id, entry, False))
            elif pid not in found.duplicates:
                missing.append(p.id)
            continue
        matches = found.by_name.get(" ".join(_name_key(p.name)), [])
        if len(matches) == 1:
            (changes if accept_names else offers).append(Change(p.id, matches[0], True))
        elif matches:
            lines = ", ".join(str(m.line) for m in matches[:SHOWN])
            problems.append(f"{p.name}: {len(matches)} list entries of that name (lines {lines}): give the ID")
        else:
            missing.append(p.id)
    names = {p.id: p.name for p in state.players.values()}
    return Plan(found.list_name, changes, offers, missing, problems, names, keep_rating, found.lines)


def _updated(player: Player, change: Change, list_name: str, keep_rating: bool, reason: str) -> ev.PlayerEdited:
    d, e = player.details, change.entry
    ratings = {k: v for k, v in d.ratings if k != list_name}
    if e.rating is not None:
        ratings[list_name] = e.rating
    birth = d.birth if d.birth and e.birth and d.birth[:4] == e.birth[:4] else (e.birth or d.birth)
    national = list_name == "national"
    details = ev.PlayerDetailsModel(
        title=e.title if not national or e.title else d.title,
        federation=e.federation or d.federation,
        fide_id=d.fide_id if national else e.id, national_id=e.id if national else d.national_id,
        birth=birth, sex=e.sex or d.sex,  # type: ignore[arg-type]
        ratings=ratings, categories=d.categories,
    )
    rating = player.rating if keep_rating else e.rating
    return ev.PlayerEdited(id=player.id, name=player.name, rating=rating, club=player.club, details=details,
                           reason=reason)


def update_events(state: EventState, plan: Plan, force: bool = False, reason: str = "") -> list[ev.Event]:
    """One PlayerEdited per updated player (written together, in one transaction).

    Refused once round 1 is published (the ratings in force when the event starts fix the
    order of the players: common practice, no source), unless ``force`` with a ``reason`` for the log.
    """
    if any(r.state is not RoundState.DRAFT for r in state.rounds) and not force:
        raise RatingListError("round 1 is already published: ratings are taken before the event "
                              "(--force --reason TEXT updates them anyway)")
    why = reason.strip() if force else ""
    return [_updated(state.players[c.player], c, plan.list_name, plan.keep_rating, why) for c in plan.changes]
