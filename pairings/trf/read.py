"""Read a FIDE tournament report file (TRF16, column positions from memory) back into events.

:func:`read_trf` is the inverse of :func:`pairings.trf.write.write_trf`: it reads the
header and the 001 records by column (never by splitting on blanks), checks that the
two sides of every game agree and that each player's points equal the sum of the
slots, and returns the events that rebuild the event (restored rounds, as the JSON
restore makes them). Anything it cannot read raises
:class:`~pairings.errors.ReportFileError` naming the line and the column. Unknown
record tags are skipped, as the standard asks.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from pairings import events as ev
from pairings.actions import clean_text
from pairings.errors import InputError, ReportFileError
from pairings.eventinfo import InfoChange, check_date, checked_info
from pairings.standings import check_tiebreaks, default_tiebreaks
from pairings.state import TITLES, ByeKind, Result, Side, System, Unplayed
from pairings.trf.layout import (
    BLACK, BYE_CODES, FORFEIT_CODES, HEADER, NO_COLOUR, PLAYED_CODES, PLAYER, PLAYER_TAG, ROUNDS_TAG,
    SCORING_TAG, TIEBREAK_TAG, UNRATED_CODES, WHITE, Span, slot_spans, slot_start,
)
from pairings.points import ZERO, Points, PointsError, exact, parse_points, points_text
from pairings.trf.write import DEFAULT_POINTS, TYPES, ScoringValues

RESULTS = {
    ("1", "0"): Result.FIRST_WINS, ("0", "1"): Result.SECOND_WINS, ("=", "="): Result.DRAW,
    ("+", "-"): Result.FIRST_WINS_BY_FORFEIT, ("-", "+"): Result.SECOND_WINS_BY_FORFEIT,
    ("-", "-"): Result.DOUBLE_FORFEIT, ("0", "0"): Result.BOTH_LOSE,
    ("=", "0"): Result.FIRST_HALF_SECOND_LOSES, ("0", "="): Result.FIRST_LOSES_SECOND_HALF,
}
"""(white's code, black's code) → the game's result; blank and blank is a game still to be played."""


def _fail(line: int, column: int, message: str) -> ReportFileError:
    return ReportFileError(f"line {line}, column {column}: {message}")


@dataclass(frozen=True, slots=True)
class _Slot:
    opponent: int | None
    colour: str
    code: str
    column: int
    """First column of the slot (for messages)."""


@dataclass
class _Entry:
    line: int
    rank: int
    name: str
    sex: str | None
    title: str | None
    rating: int | None
    federation: str | None
    fide_id: str | None
    birth: str | None
    points: Points
    slots: dict[int, _Slot] = field(default_factory=dict)


def _digits(line_no: int, span: Span, text: str, what: str) -> int | None:
    value = span.cut(text)
    if not value:
        return None
    if not value.isdigit():
        raise _fail(line_no, span.first, f"{what} {value!r} is not a number")
    return int(value)


def _birth(line_no: int, value: str) -> str | None:
    column = PLAYER["birth"].first
    if not value:
        return None
    if len(value) == 4 and value.isdigit():
        return value
    parts = value.split("/")
    if len(parts) == 3 and parts[0].isdigit() and len(parts[0]) == 4:
        if parts[1:] in (["00", "00"], ["", ""]):
            return parts[0]
        try:
            return check_date(value, "birth date")
        except InputError:
            pass
    raise _fail(line_no, column, f"birth date {value!r} is not YYYY/MM/DD or YYYY")


def _slot(line_no: int, text: str, r: int) -> _Slot | None:
    opp_span, colour_span, code_span = slot_spans(r)
    start = opp_span.first
    raw = text[start - 1:start + 9].ljust(10)
    for offset in (4, 6, 8, 9):
        if raw[offset] != " ":
            raise _fail(line_no, start + offset, f"round {r}: unexpected {raw[offset]!r} (the slot is "
                        f"opponent in {start}-{start + 3}, colour in {start + 5}, result in {start + 7})")
    opp_text, colour, code = opp_span.cut(text), raw[5], raw[7]
    if not raw.strip():
        return None
    if not opp_text.isdigit() and opp_text:
        raise _fail(line_no, start, f"round {r}: opponent {opp_text!r} is not a start rank")
    opponent = int(opp_text) if opp_text else 0
    if opponent == 0:
        if colour not in (NO_COLOUR, " "):
            raise _fail(line_no, colour_span.first, f"round {r}: colour {colour!r} without an opponent")
        if code == " ":
            return None  # not paired
        if code not in BYE_CODES:
            raise _fail(line_no, code_span.first, f"round {r}: {code!r} is not a bye code (U, H, F, Z)")
        return _Slot(None, NO_COLOUR, code, start)
    if colour not in (WHITE, BLACK):
        raise _fail(line_no, colour_span.first, f"round {r}: colour {colour!r} of a game is not w or b")
    if code in UNRATED_CODES:
        raise _fail(line_no, code_span.first, f"round {r}: {code!r} (a game not to be rated) is not held by the desk")
    if code != " " and code not in PLAYED_CODES and code not in FORFEIT_CODES:
        raise _fail(line_no, code_span.first, f"round {r}: unknown result code {code!r}")
    return _Slot(opponent, colour, code, start)


def _player(line_no: int, text: str) -> _Entry:
    f = PLAYER
    rank = _digits(line_no, f["start_rank"], text, "start rank")
    if not rank:
        raise _fail(line_no, f["start_rank"].first, "no start rank")
    sex_text = f["sex"].cut(text)
    if sex_text not in ("", "m", "w", "f"):
        raise _fail(line_no, f["sex"].first, f"sex {sex_text!r} is not m or w")
    title = f["title"].cut(text) or None
    if title is not None and title not in TITLES:
        raise _fail(line_no, f["title"].first, f"title {title!r} is not one of {', '.join(TITLES)}")
    name = f["name"].cut(text)
    try:
        name = clean_text(name, "name")
    except InputError as exc:
        raise _fail(line_no, f["name"].first, str(exc)) from None
    federation = f["federation"].cut(text) or None
    if federation is not None and not (len(federation) == 3 and federation.isalpha()):
        raise _fail(line_no, f["federation"].first, f"federation {federation!r} is not a three-letter code")
    fide_id = _digits(line_no, f["fide_id"], text, "FIDE ID")
    written = f["points"].cut(text)
    try:
        points = exact(written)
    except PointsError:
        raise _fail(line_no, f["points"].first, f"points {written!r} are not a number") from None
    entry = _Entry(
        line=line_no, rank=rank, name=name, sex={"m": "m", "w": "f", "f": "f"}.get(sex_text),
        title=title, rating=_digits(line_no, f["rating"], text, "rating") or None,
        federation=federation.upper() if federation else None,
        fide_id=str(fide_id) if fide_id is not None else None,
        birth=_birth(line_no, f["birth"].cut(text)), points=points,
    )
    r = 1
    while slot_start(r) <= len(text):
        slot = _slot(line_no, text, r)
        if slot is not None:
            entry.slots[r] = slot
        r += 1
    return entry


@dataclass
class _Header:
    values: dict[str, str] = field(default_factory=dict)
    lines: dict[str, int] = field(default_factory=dict)
    """The line of each header tag (the last one, for 112)."""
    deputies: list[str] = field(default_factory=list)
    round_dates: tuple[str, ...] = ()
    rounds: int | None = None
    points: ScoringValues = DEFAULT_POINTS
    tiebreaks: tuple[tuple[str, ...], Unplayed] | None = None


def _round_dates(line_no: int, text: str) -> tuple[str, ...]:
    dates: list[str] = []
    r = 1
    while slot_start(r) <= len(text):
        c = slot_start(r)
        value = text[c - 1:c + 7].strip()
        if value:
            if len(dates) != r - 1:
                raise _fail(line_no, c, f"round {r} has a date but round {len(dates) + 1} has none")
            try:
                dates.append(check_date("20" + value, f"round {r} date"))
            except InputError:
                raise _fail(line_no, c, f"round {r} date {value!r} is not YY/MM/DD") from None
        r += 1
    return tuple(dates)


def _header_line(h: _Header, line_no: int, tag: str, text: str) -> None:
    value = text[4:].strip()
    h.lines[tag] = line_no
    if tag == "112":
        h.deputies.append(value)
    elif tag == "132":
        h.round_dates = _round_dates(line_no, text)
    elif tag in ("042", "052") and value:
        try:
            h.values[tag] = check_date(value, "date")
        except InputError:
            raise _fail(line_no, 5, f"date {value!r} is not YYYY/MM/DD") from None
    elif tag == ROUNDS_TAG:
        if not value.isdigit() or not 1 <= int(value) <= 1000:
            raise _fail(line_no, 5, f"number of rounds {value!r} is not a number from 1 to 1000")
        h.rounds = int(value)
    elif tag == SCORING_TAG:
        try:
            numbers = tuple(parse_points(x) for x in value.split())
        except PointsError:
            numbers = ()
        if len(numbers) not in (5, 6):
            raise _fail(line_no, 5, "points must be five or six numbers: win, draw, loss, pairing bye, "
                        "requested bye (and per round missed before a late entry)")
        n = (*numbers, ZERO)
        h.points = (n[0], n[1], n[2], n[3], n[4], n[5])
    elif tag == TIEBREAK_TAG:
        names, _, unplayed = value.partition(" ")
        try:
            h.tiebreaks = (check_tiebreaks([n for n in names.split(",") if n != "-"]), Unplayed(unplayed))
        except ValueError as exc:
            raise _fail(line_no, 5, f"tiebreaks: {exc}") from None
    else:
        h.values[tag] = value


def _system(type_text: str) -> tuple[System, bool]:
    for key, text in TYPES.items():
        if text == type_text:
            return key
    folded = type_text.casefold()
    if "round robin" in folded or "round-robin" in folded:
        return System.ROUND_ROBIN, "double" in folded
    return (System.DUTCH if "dutch" in folded else System.SWISS), False


def _parse(text: str) -> tuple[_Header, list[_Entry]]:
    header, players = _Header(), []
    for line_no, line in enumerate(text.splitlines(), 1):
        if not line.strip():
            continue
        if "\t" in line:
            raise _fail(line_no, line.index("\t") + 1, "a tab: TRF fields are padded with blanks")
        tag = line[:3]
        if len(line) > 3 and line[3] != " ":
            raise _fail(line_no, 4, f"column 4 after the tag {tag!r} must be blank")
        if tag == PLAYER_TAG:
            players.append(_player(line_no, line))
        elif tag in HEADER or tag in (ROUNDS_TAG, SCORING_TAG, TIEBREAK_TAG):
            _header_line(header, line_no, tag, line)
    if not header.values.get("012"):
        raise ReportFileError("no tournament name (record 012): not a report file")
    if not players:
        raise ReportFileError("no player record (001) in the file")
    return header, players


def _check_ranks(players: list[_Entry]) -> dict[int, _Entry]:
    by_rank: dict[int, _Entry] = {}
    for p in players:
        if p.rank in by_rank:
            raise _fail(p.line, PLAYER["start_rank"].first, f"start rank {p.rank} also on line {by_rank[p.rank].line}")
        by_rank[p.rank] = p
    if sorted(by_rank) != list(range(1, len(players) + 1)):
        missing = next(n for n in range(1, len(players) + 1) if n not in by_rank)
        raise ReportFileError(f"start ranks must run 1-{len(players)}: {missing} is missing")
    return by_rank


def _round(r: int, by_rank: dict[int, _Entry], points: ScoringValues) -> ev.RoundDrafted:
    win, _, _, bye, half, _ = points
    boards: list[tuple[int, ev.BoardModel]] = []
    byes: list[ev.ByeModel] = []
    for p in sorted(by_rank.values(), key=lambda e: e.rank):
        slot = p.slots.get(r)
        if slot is None:
            continue
        if slot.opponent is None:
            kind, value = {"U": (ByeKind.PAIRING, bye), "H": (ByeKind.REQUESTED, half),
                           "F": (ByeKind.REQUESTED, win), "Z": (ByeKind.ABSENCE, ZERO)}[slot.code]
            byes.append(ev.ByeModel(player=f"p{p.rank}", kind=kind, points=value))
            continue
        other = by_rank.get(slot.opponent)
        back = other.slots.get(r) if other is not None else None
        if other is None or back is None or back.opponent != p.rank or back.colour == slot.colour:
            raise _fail(p.line, slot.column, f"round {r}: start rank {slot.opponent} does not list this player "
                        "as its opponent with the other colour")
        if slot.colour != WHITE:
            continue
        result = None if (slot.code, back.code) == (" ", " ") else RESULTS.get((slot.code, back.code))
        if result is None and (slot.code, back.code) != (" ", " "):
            raise _fail(p.line, slot.column + 7, f"round {r}: results {slot.code!r} and {back.code!r} "
                        f"(start rank {other.rank}) do not make one game's result")
        boards.append((min(p.rank, other.rank), ev.BoardModel(
            board=1, first=f"p{p.rank}", second=f"p{other.rank}", result=result)))
    if not boards and not byes:
        raise ReportFileError(f"round {r}: no player has a game or a bye in it")
    boards.sort(key=lambda b: b[0])
    numbered = tuple(b.model_copy(update={"board": n}) for n, (_, b) in enumerate(boards, 1))
    return ev.RoundDrafted(round=r, boards=numbered, byes=tuple(byes), source="restored")


def _check_points(p: _Entry, rounds: list[ev.RoundDrafted], points: ScoringValues) -> None:
    win, draw, loss, late = points[0], points[1], points[2], points[5]
    pid = f"p{p.rank}"
    total = late * (min(p.slots) - 1) if p.slots else ZERO  # the rounds missed before a late entry
    for rnd in rounds:
        total += sum(y.points for y in rnd.byes if y.player == pid)
        for g in rnd.boards:
            if pid in (g.first, g.second) and g.result is not None:
                outcome = g.result.outcome(Side.FIRST if g.first == pid else Side.SECOND)
                total += {"win": win, "draw": draw, "loss": loss}[outcome]
    if abs(total - p.points) > Points(1, 20):  # the column holds one decimal
        raise _fail(p.line, PLAYER["points"].first,
                    f"points {points_text(p.points)} but the rounds give {points_text(total)}")


INFO_TAGS = {"city": "022", "federation": "032", "start_date": "042", "end_date": "052",
             "chief_arbiter": "102", "deputy_arbiters": "112", "time_control": "122", "round_dates": "132"}


def _info(header: _Header, first: ev.EventCreated) -> dict[str, object]:
    """The header's report-file details, each checked as ``pairings settings`` checks it."""
    from pairings.fold import fold

    settings = fold([(1, first)]).settings
    given: dict[str, object] = {key: header.values[tag] for key, tag in INFO_TAGS.items() if tag in header.values}
    if header.deputies:
        given["deputy_arbiters"] = tuple(header.deputies)
    if header.round_dates:
        given["round_dates"] = header.round_dates
    out: dict[str, object] = {}
    for key, value in given.items():  # one at a time, so that an error names its record's line
        try:
            out |= checked_info(InfoChange(**{key: value}), replace(settings, **out))  # type: ignore[arg-type]
        except InputError as exc:
            raise _fail(header.lines[INFO_TAGS[key]], 5, str(exc)) from None
    return out


def read_trf(text: str) -> list[ev.Event]:
    """The events that rebuild the event a report file describes; ReportFileError on what it cannot read."""
    header, players = _parse(text)
    by_rank = _check_ranks(players)
    played = max((r for p in players for r in p.slots), default=0)
    rounds = [_round(r, by_rank, header.points) for r in range(1, played + 1)]
    for rnd in rounds[:-1]:
        if any(g.result is None for g in rnd.boards):
            raise ReportFileError(f"round {rnd.round} has games without a result but later rounds follow")
    for p in players:
        _check_points(p, rounds, header.points)
    total = header.rounds or max(played, 1)
    if total < played:
        raise ReportFileError(f"{played} rounds are played but the file says the event has {total} ({ROUNDS_TAG})")
    system, double = _system(header.values.get("092", ""))
    win, draw, loss, bye, half, late = header.points
    v = header.values
    tiebreaks, unplayed = header.tiebreaks or (default_tiebreaks(system, True), Unplayed.VIRTUAL_OPPONENT)
    try:
        first = ev.EventCreated(
            name=clean_text(v["012"], "tournament name"), rounds=total,
            scoring=ev.ScoringModel(win=win, draw=draw, loss=loss), bye_points=bye, requested_bye_points=half,
            late_entry_points=late,
            system=system, double_round=double, tiebreaks=tiebreaks, unplayed=unplayed, seed=0,
        )
    except InputError as exc:
        raise _fail(header.lines["012"], 5, str(exc)) from None
    first = first.model_copy(update=_info(header, first))
    out: list[ev.Event] = [first]
    withdrawn: list[ev.Event] = []
    for p in sorted(players, key=lambda e: e.rank):
        entered = sorted(p.slots)
        details = ev.PlayerDetailsModel(
            title=p.title, federation=p.federation, fide_id=p.fide_id, birth=p.birth, sex=p.sex,  # type: ignore[arg-type]
            ratings={"fide": p.rating} if p.rating else {},
        )
        out.append(ev.PlayerRegistered(id=f"p{p.rank}", name=p.name, rating=p.rating,
                                       entry_round=entered[0] if entered else 1, details=details))
        if entered and entered[-1] < played:  # blank slots to the end: the player withdrew
            withdrawn.append(ev.PlayerWithdrawn(player=f"p{p.rank}", from_round=entered[-1] + 1,
                                                reason="restored from a report file"))
    for rnd in rounds:
        out += [rnd, ev.RoundPublished(round=rnd.round)]
    return out + withdrawn
