"""The JSON interchange document (``format: pairings-event``, version 1) of design.md.

:func:`export_event` writes it from a state; :func:`restore_events` checks a
document completely and turns it into the events that rebuild the event, or
raises an :class:`~pairings.errors.InputError` naming the first inconsistency.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any, Literal, Sequence

from pydantic import BaseModel, ConfigDict, Field, ValidationError, field_validator

from pairings import events as ev
from pairings.actions import clean_text
from pairings.details import check_details, details_model
from pairings.errors import InputError
from pairings.prizedoc import awards_document, awards_events
from pairings.regulations import (
    BY_KEY, check_consistent, parse_settings, replay_changed_after, settings_document,
)
from pairings.points import ZERO, Points, points_number
from pairings.state import (
    Acceleration, ByeKind, EventState, ForbiddenPair, Player, PlayerDetails, Result, RoundState, Settings, Status,
)
from pairings.store import StoredEvent
from pairings.text import one_line

FORMAT = "pairings-event"
VERSION = 1
"""Still 1: the keys added since (every setting, player details, announcements, the log) are optional."""


def export_event(state: EventState) -> dict[str, Any]:
    s = state.settings
    doc = {
        "format": FORMAT,
        "version": VERSION,
        "event": settings_document(s) | {"forbidden": [_forbidden(f) for f in state.forbidden]} | _report(s),
        "players": [_player(state, p) for p in state.players.values()],
        "rounds": [
            {
                "number": r.number,
                "state": r.state.value,
                "games": [
                    {"board": g.board, "first": g.first, "second": g.second,
                     "result": g.result.value if g.result else None}
                    for g in r.games
                ],
                "byes": [{"player": y.player, "kind": y.kind.value, "points": points_number(y.points)} for y in r.byes],
            }
            for r in state.rounds
        ],
    }
    awards = awards_document(state)
    if awards is not None:   # only events with prizes carry the part
        doc["awards"] = awards
    return doc


def _forbidden(f: ForbiddenPair) -> list[Any]:
    """``[a, b]``, or ``[a, b, {"until_round": N, "reason": "..."}]`` when the entry has either."""
    if f.until_round is None and not f.reason:
        return [f.a, f.b]
    return [f.a, f.b, {"until_round": f.until_round, "reason": f.reason}]


def _player(state: EventState, p: Player) -> dict[str, Any]:
    d = p.details
    return {
        "id": p.id, "name": p.name, "rating": p.rating, "club": p.club, "status": p.status.value,
        "title": d.title, "federation": d.federation, "fide_id": d.fide_id, "national_id": d.national_id,
        "birth": d.birth, "sex": d.sex, "ratings": dict(d.ratings), "categories": list(d.categories),
        "announced": [{"round": number, "kind": asked[p.id].value}
                      for number, asked in sorted(state.requests.items()) if p.id in asked],
        "entry_round": p.first_round,
        "withdrawn_from": p.withdrawn_from,
        "reinstated_from": p.entry_round if p.entry_round != p.first_round else None,
    }


def export_log(log: Sequence[StoredEvent]) -> list[dict[str, Any]]:
    """The whole history, one entry per logged event (``pairings export --log``)."""
    return [{"seq": x.seq, "recorded_at": x.recorded_at, "event": ev.dump_event(x.event)} for x in log]


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=False)


class _Until(_Strict):
    until_round: int | None = Field(default=None, ge=1)
    reason: str = Field(default="", max_length=500)


class _Scoring(_Strict):
    win: ev.StoredPoints
    draw: ev.StoredPoints
    loss: ev.StoredPoints


class _Report(_Strict):
    """The report-file details (:mod:`pairings.eventinfo`), only those set."""

    city: str | None = None
    federation: str | None = None
    start_date: str | None = None
    end_date: str | None = None
    chief_arbiter: str | None = None
    deputy_arbiters: tuple[str, ...] | None = None
    time_control: str | None = None
    round_dates: tuple[str, ...] | None = None


def _report(s: Settings) -> dict[str, Any]:
    from pairings.eventinfo import info_document

    report = info_document(s)
    return {"report": report} if report else {}


class _Event(_Strict):
    name: str = Field(min_length=1, max_length=300)
    rounds: int = Field(ge=1, le=1000)
    scoring: _Scoring
    sides: tuple[str, str] | None
    bye_points: ev.StoredPoints
    # Optional keys (added after version 1's first form): an older document takes the defaults.
    system: str = "whole-round"
    acceleration: Literal["baku"] | None = None
    tiebreaks: list[str] | None = None
    unplayed: str = "virtual-opponent"
    requested_bye_points: ev.StoredPoints | None = None
    """Default: a draw's points."""
    requested_bye_limit: int | None = Field(default=None, ge=0)
    requested_bye_last_round: int | None = Field(default=None, ge=1)
    late_entry_points: ev.StoredPoints = ZERO
    max_meetings: int = Field(default=1, ge=1)
    final_round_side_exception: bool = False
    forfeit_is_meeting: bool = True
    default_rating: int = Field(default=1000, ge=0, le=4000)
    seed: int = 0
    changed_after: list[tuple[int, str]] = []
    forbidden: list[tuple[str, str] | tuple[str, str, _Until]] = []
    report: _Report | None = None


class _Announced(_Strict):
    round: int = Field(ge=1)
    kind: Literal["requested", "absence"]


class _Player(_Strict):
    id: str = Field(min_length=1, max_length=40)
    name: str = Field(min_length=1, max_length=300)
    rating: int | None = Field(default=None, ge=0, le=4000)
    club: str | None = Field(default=None, max_length=300)
    status: Literal["active", "withdrawn"]
    title: str | None = None
    federation: str | None = None
    fide_id: str | None = None
    national_id: str | None = None
    birth: str | None = None
    sex: str | None = None
    ratings: dict[str, int] = {}
    categories: list[str] = []
    announced: list[_Announced] = []
    entry_round: int = Field(default=1, ge=1)
    withdrawn_from: int | None = Field(default=None, ge=1)
    reinstated_from: int | None = Field(default=None, ge=1)

    def details(self) -> PlayerDetails:
        return PlayerDetails(
            title=self.title, federation=self.federation, fide_id=self.fide_id, national_id=self.national_id,
            birth=self.birth, sex=self.sex, ratings=tuple(sorted(self.ratings.items())),
            categories=tuple(self.categories),
        )


class _Game(_Strict):
    board: int = Field(ge=1)
    first: str
    second: str
    result: Result | None


class _Bye(_Strict):
    player: str
    kind: ByeKind
    points: ev.StoredPoints

    @field_validator("points")
    @classmethod
    def _not_negative(cls, value: Points) -> Points:
        if value < 0:
            raise ValueError("Input should be greater than or equal to 0")
        return value


class _Round(_Strict):
    number: int = Field(ge=1)
    state: RoundState
    games: list[_Game]
    byes: list[_Bye]


class _Document(_Strict):
    format: Literal["pairings-event"]
    version: Literal[1]
    event: _Event
    players: list[_Player]
    rounds: list[_Round]
    awards: Any = None
    """Prize categories, prizes and prize rules (pairings.prizedoc); absent when the event has none."""
    log: list[dict[str, Any]] | None = None


def _check(doc: _Document) -> None:
    clean_text(doc.event.name, "event name")
    for p in doc.players:
        clean_text(p.id, f"player id {p.id!r}", limit=40)
        clean_text(p.name, f"name of player {p.id!r}")
        if p.club is not None:
            clean_text(p.club, f"club of player {p.id!r}", required=False)
    if doc.event.sides is not None:
        for label in doc.event.sides:
            clean_text(label, "side label", limit=40)
    ids = [p.id for p in doc.players]
    dup = next((i for i in ids if ids.count(i) > 1), None)
    if dup is not None:
        raise InputError(f"player id {dup!r} appears twice")
    known = set(ids)
    if len(doc.rounds) > doc.event.rounds:
        raise InputError(f"{len(doc.rounds)} rounds given for an event of {doc.event.rounds}")
    for index, rnd in enumerate(doc.rounds, start=1):
        where = f"round {rnd.number}"
        if rnd.number != index:
            raise InputError(f"rounds must be numbered 1, 2, ...; found {rnd.number} in place {index}")
        if rnd.state is not RoundState.COMPLETE and index != len(doc.rounds):
            raise InputError(f"{where} is {rnd.state.value} but later rounds follow it")
        boards = [g.board for g in rnd.games]
        if sorted(boards) != list(range(1, len(boards) + 1)):
            raise InputError(f"{where}: boards must be numbered 1-{len(boards)} once each")
        seen: set[str] = set()
        for pid in [p for g in rnd.games for p in (g.first, g.second)] + [y.player for y in rnd.byes]:
            if pid not in known:
                raise InputError(f"{where}: unknown player {pid!r}")
            if pid in seen:
                raise InputError(f"{where}: player {pid!r} appears twice")
            seen.add(pid)
        results = [g.result for g in rnd.games]
        if rnd.state is RoundState.COMPLETE and None in results:
            raise InputError(f"{where} is complete but a board has no result")
        if rnd.state is RoundState.PUBLISHED and None not in results and results:
            raise InputError(f"{where} is published but every board has a result (it is complete)")
        if rnd.state is RoundState.DRAFT and any(r is not None for r in results):
            raise InputError(f"{where} is a draft but has results")


def _settings(e: _Event) -> ev.EventCreated:
    """The first event, every setting checked by the rules :mod:`pairings.regulations` applies."""
    texts = {"system": e.system, "unplayed": e.unplayed, "acceleration": e.acceleration or "none"}
    if e.tiebreaks is not None:
        texts["tiebreaks"] = ",".join(e.tiebreaks)
    try:
        typed = parse_settings(texts)
    except InputError as exc:
        raise InputError(f"event: {exc}") from None
    created = ev.EventCreated(
        name=e.name, rounds=e.rounds,
        scoring=ev.ScoringModel(win=e.scoring.win, draw=e.scoring.draw, loss=e.scoring.loss),
        sides=e.sides, bye_points=e.bye_points,
        requested_bye_points=e.scoring.draw if e.requested_bye_points is None else e.requested_bye_points,
        requested_bye_limit=e.requested_bye_limit, requested_bye_last_round=e.requested_bye_last_round,
        late_entry_points=e.late_entry_points, max_meetings=e.max_meetings,
        final_round_side_exception=e.final_round_side_exception, forfeit_is_meeting=e.forfeit_is_meeting,
        default_rating=e.default_rating, seed=e.seed, **typed,
    )
    from pairings.fold import fold

    if e.report is not None:
        from pairings.eventinfo import InfoChange, checked_info

        try:
            info = checked_info(InfoChange(**e.report.model_dump()), fold([(1, created)]).settings)
        except InputError as exc:
            raise InputError(f"event.report: {exc}") from None
        created = created.model_copy(update=info)

    check_consistent(fold([(1, created)]).settings)
    for number, key in e.changed_after:
        if key not in BY_KEY or not 1 <= number <= e.rounds:
            raise InputError(f"event: changed_after names {key!r} after round {number}, which cannot be")
    return created


def _check_more(doc: _Document) -> None:
    """The keys added to version 1: known players, rounds inside the event, details by their rules."""
    known = {p.id for p in doc.players}
    for pair in doc.event.forbidden:
        a, b = pair[0], pair[1]
        if a not in known or b not in known or a == b:
            raise InputError(f"event: forbidden pair {a!r}, {b!r} must name two different known players")
    for p in doc.players:
        try:
            check_details(p.details())
        except InputError as exc:
            raise InputError(f"player {p.id!r}: {exc}") from None
        for item in p.announced:
            if item.round > doc.event.rounds:
                raise InputError(f"player {p.id!r}: bye announced for round {item.round} of {doc.event.rounds}")
        if p.status != Status.WITHDRAWN.value and p.withdrawn_from is not None:
            raise InputError(f"player {p.id!r}: withdrawn_from is given but the player is active")


def _players(doc: _Document) -> list[ev.Event]:
    after = len(doc.rounds) + 1
    out: list[ev.Event] = []
    for p in doc.players:
        if p.status == Status.WITHDRAWN.value:
            out.append(ev.PlayerWithdrawn(player=p.id, from_round=p.withdrawn_from or after,
                                          reason="restored as withdrawn"))
        elif p.reinstated_from is not None:
            out += [ev.PlayerWithdrawn(player=p.id, from_round=p.reinstated_from, reason="restored"),
                    ev.PlayerReinstated(player=p.id, from_round=p.reinstated_from)]
    return out


@dataclass(frozen=True)
class Restored:
    events: list[ev.Event]
    lost: list[str]
    """One line per thing the document could not carry into the restored event file."""


def restore(data: object) -> Restored:
    """The events that rebuild the event of an interchange document, and what they cannot carry.

    A document with the whole history (``export --log``) is restored by replaying
    it, after checking that the replayed history gives exactly the rest of the document.
    """
    try:
        doc = _Document.model_validate(data)
    except ValidationError as exc:
        err = exc.errors()[0]
        where = ".".join(str(x) for x in err["loc"]) or "document"
        raise InputError(f"not a pairings-event document: {where}: {err['msg']}") from None
    _check(doc)
    _check_more(doc)
    if doc.log is not None:
        return Restored(_replay(doc.log, data), [
            "the times of the logged entries: each is dated at restore (the document keeps the original times)",
        ])
    e = doc.event
    out: list[ev.Event] = [_settings(e)]
    from pairings.fold import fold

    out += replay_changed_after(replace(fold(enumerate(out, 1)).settings, changed_after=tuple(
        (number, key) for number, key in e.changed_after)))
    out += [
        ev.PlayerRegistered(id=p.id, name=p.name, rating=p.rating, club=p.club, entry_round=p.entry_round,
                            details=details_model(p.details()))
        for p in doc.players
    ]
    out += [
        ev.PairForbidden(a=f[0], b=f[1], until_round=f[2].until_round if len(f) == 3 else None,
                         reason=f[2].reason if len(f) == 3 else "")
        for f in e.forbidden
    ]
    out += [ev.ByeRequested(player=p.id, round=a.round, kind=ByeKind(a.kind))  # type: ignore[arg-type]
            for p in doc.players for a in p.announced]
    if doc.awards is not None:
        out += awards_events(doc.awards, {p.id for p in doc.players})
    for rnd in doc.rounds:
        out.append(
            ev.RoundDrafted(
                round=rnd.number, source="restored",
                boards=tuple(ev.BoardModel(board=g.board, first=g.first, second=g.second, result=g.result) for g in rnd.games),
                byes=tuple(ev.ByeModel(player=y.player, kind=y.kind, points=y.points) for y in rnd.byes),
            )
        )
        if rnd.state is not RoundState.DRAFT:
            out.append(ev.RoundPublished(round=rnd.number))
    out += _players(doc)
    lost = ["the history: one restored entry per setting, player and round stands for it "
            "(export with --log to carry the whole history)"]
    if doc.rounds:
        lost.append("each round's pairing explanation (board flags, costs, engine version, override reasons)")
    return Restored(out, lost)


def _replay(log: list[dict[str, Any]], data: object) -> list[ev.Event]:
    """The logged events, checked: numbered 1, 2, ..., each a known event, folding to the document."""
    from pairings.fold import fold

    events: list[ev.Event] = []
    for index, item in enumerate(log, start=1):
        try:
            if item.get("seq") != index:
                raise ValueError(f"entry {index} is numbered {item.get('seq')!r}")
            events.append(ev.EVENT_ADAPTER.validate_python(item.get("event")))
        except (ValidationError, ValueError, AttributeError) as exc:
            raise InputError(f"log entry {index} cannot be read ({one_line(str(exc))[:120]})") from None
    if not events or not isinstance(events[0], ev.EventCreated):
        raise InputError("log: the first entry must create the event")
    try:
        state = fold(enumerate(events, 1))
    except (KeyError, IndexError, TypeError, ValueError, AssertionError) as exc:
        raise InputError(f"log cannot be replayed ({type(exc).__name__}: {exc})") from None
    expected = {k: v for k, v in data.items() if k != "log"} if isinstance(data, dict) else {}
    replayed = export_event(state)
    if replayed != expected:
        part = next((k for k in replayed if replayed[k] != expected.get(k)), "document")
        raise InputError(f"log does not give the document's {part!r}: the document was changed after export")
    return events


def restore_events(data: object) -> list[ev.Event]:
    """The events that rebuild the event described by an interchange document (see :func:`restore`)."""
    return restore(data).events
