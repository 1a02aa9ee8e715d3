"""The JSON interchange document (``format: pairings-event``, version 1) of design.md.

:func:`export_event` writes it from a state; :func:`restore_events` checks a
document completely and turns it into the events that rebuild the event, or
raises an :class:`~pairings.errors.InputError` naming the first inconsistency.
"""

from __future__ import annotations

from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from pairings import events as ev
from pairings.actions import clean_text
from pairings.errors import InputError
from pairings.state import Acceleration, ByeKind, EventState, Result, RoundState, Settings, Status, System

FORMAT = "pairings-event"
VERSION = 1


def _number(x: float) -> float | int:
    return int(x) if float(x).is_integer() else x


def export_event(state: EventState) -> dict[str, Any]:
    s = state.settings
    return {
        "format": FORMAT,
        "version": VERSION,
        "event": {
            "name": s.name,
            "rounds": s.rounds,
            "scoring": {"win": _number(s.scoring.win), "draw": _number(s.scoring.draw), "loss": _number(s.scoring.loss)},
            "sides": list(s.sides) if s.sides else None,
            "bye_points": _number(s.bye_points),
            "system": _system_name(s),
            "acceleration": None if s.acceleration is Acceleration.NONE else s.acceleration.value,
        },
        "players": [
            {"id": p.id, "name": p.name, "rating": p.rating, "club": p.club, "status": p.status.value}
            for p in state.players.values()
        ],
        "rounds": [
            {
                "number": r.number,
                "state": r.state.value,
                "games": [
                    {"board": g.board, "first": g.first, "second": g.second,
                     "result": g.result.value if g.result else None}
                    for g in r.games
                ],
                "byes": [{"player": y.player, "kind": y.kind.value, "points": _number(y.points)} for y in r.byes],
            }
            for r in state.rounds
        ],
    }


SYSTEM_NAMES: dict[str, tuple[System, bool]] = {
    "whole-round": (System.SWISS, False), "dutch": (System.DUTCH, False),
    "round-robin": (System.ROUND_ROBIN, False), "double-round-robin": (System.ROUND_ROBIN, True),
}
"""The document's ``event.system`` values: the system and whether the round robin is double."""


def _system_name(s: Settings) -> str:
    return next(name for name, value in SYSTEM_NAMES.items() if value == (s.system, s.double_round))


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=False)


class _Scoring(_Strict):
    win: float
    draw: float
    loss: float


class _Event(_Strict):
    name: str = Field(min_length=1, max_length=300)
    rounds: int = Field(ge=1, le=1000)
    scoring: _Scoring
    sides: tuple[str, str] | None
    bye_points: float
    system: Literal["whole-round", "dutch", "round-robin", "double-round-robin"] = "whole-round"
    acceleration: Literal["baku"] | None = None


class _Player(_Strict):
    id: str = Field(min_length=1, max_length=40)
    name: str = Field(min_length=1, max_length=300)
    rating: int | None = Field(default=None, ge=0, le=4000)
    club: str | None = Field(default=None, max_length=300)
    status: Literal["active", "withdrawn"]


class _Game(_Strict):
    board: int = Field(ge=1)
    first: str
    second: str
    result: Result | None


class _Bye(_Strict):
    player: str
    kind: ByeKind
    points: float = Field(ge=0)


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


def restore_events(data: object) -> list[ev.Event]:
    """The events that rebuild the event described by an interchange document."""
    try:
        doc = _Document.model_validate(data)
    except ValidationError as exc:
        err = exc.errors()[0]
        where = ".".join(str(x) for x in err["loc"]) or "document"
        raise InputError(f"not a pairings-event document: {where}: {err['msg']}") from None
    _check(doc)
    e = doc.event
    out: list[ev.Event] = [
        ev.EventCreated(
            name=e.name, rounds=e.rounds,
            scoring=ev.ScoringModel(win=e.scoring.win, draw=e.scoring.draw, loss=e.scoring.loss),
            sides=e.sides, bye_points=e.bye_points, requested_bye_points=e.scoring.draw,
            system=SYSTEM_NAMES[e.system][0], double_round=SYSTEM_NAMES[e.system][1],
            acceleration=Acceleration(e.acceleration or "none"),
        )
    ]
    out += [ev.PlayerRegistered(id=p.id, name=p.name, rating=p.rating, club=p.club) for p in doc.players]
    after = len(doc.rounds) + 1
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
    out += [
        ev.PlayerWithdrawn(player=p.id, from_round=after, reason="restored as withdrawn")
        for p in doc.players if p.status == Status.WITHDRAWN.value
    ]
    return out
