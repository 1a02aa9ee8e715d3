"""One readable line per event, for `pairings log`, the desk's Log place and undo messages.

Players are named by name and id ("Ansel Ashgrove (p1)") when the caller
gives the names (:func:`describe`'s ``names``, usually the event's current
roster); without them by id ("player p1").
"""

from __future__ import annotations

from contextvars import ContextVar
from functools import singledispatch
from typing import Mapping

from pairings import events as ev
from pairings.state import ByeKind, EventState
from pairings.text import plain

_NAMES: ContextVar[Mapping[str, str]] = ContextVar("names", default={})


def describe(event: ev.Event, names: Mapping[str, str] | None = None) -> str:
    """One line for ``event``, safe to print on a terminal (names may hold anything).

    ``names`` maps player ids to names (see :func:`roster_names`).
    """
    token = _NAMES.set(names or {})
    try:
        return plain(_line(event))
    finally:
        _NAMES.reset(token)


def roster_names(state: EventState) -> dict[str, str]:
    """Every player's id and current name, for :func:`describe`."""
    return {p.id: p.name for p in state.players.values()}


def _who(player: str) -> str:
    name = _NAMES.get().get(player)
    return f"{name} ({player})" if name else f"player {player}"


def _count(n: int, word: str) -> str:
    return f"{n} {word}" if n == 1 else f"{n} {word}s"


@singledispatch
def _line(event: object) -> str:
    return type(event).__name__


@_line.register
def _(e: ev.EventCreated) -> str:
    sides = f"sides {e.sides[0]}/{e.sides[1]}" if e.sides else "no sides"
    s = e.scoring
    return f"event {e.name!r} created: {e.rounds} rounds, scoring {s.win:g}/{s.draw:g}/{s.loss:g}, {sides}"


@_line.register
def _(e: ev.SettingsChanged) -> str:
    changed = {k: v for k, v in e.model_dump(exclude={"type"}).items() if v is not None}
    return "settings changed: " + ", ".join(f"{k}={v}" for k, v in changed.items())


@_line.register
def _(e: ev.PlayerRegistered) -> str:
    extra = [f"rating {e.rating}" if e.rating is not None else "unrated"]
    if e.club:
        extra.append(e.club)
    late = f", from round {e.entry_round}" if e.entry_round > 1 else ""
    return f"{e.name} ({e.id}) registered: {', '.join(extra)}{late}"


@_line.register
def _(e: ev.PlayerEdited) -> str:
    return f"{e.name} ({e.id}) edited: rating {e.rating if e.rating is not None else '-'}, club {e.club or '-'}"


@_line.register
def _(e: ev.PlayerWithdrawn) -> str:
    why = f" ({e.reason})" if e.reason else ""
    return f"{_who(e.player)} withdrawn from round {e.from_round} on{why}"


@_line.register
def _(e: ev.PlayerReinstated) -> str:
    return f"{_who(e.player)} back in from round {e.from_round}"


@_line.register
def _(e: ev.ByeRequested) -> str:
    what = "asked for a bye" if e.kind is ByeKind.REQUESTED else "announced absent"
    return f"{_who(e.player)} {what} in round {e.round}"


@_line.register
def _(e: ev.ByeCancelled) -> str:
    return f"{_who(e.player)}: bye or absence in round {e.round} cancelled"


@_line.register
def _(e: ev.PairForbidden) -> str:
    until = f" until round {e.until_round}" if e.until_round else ""
    why = f" ({e.reason})" if e.reason else ""
    return f"do not pair {_who(e.a)} with {_who(e.b)}{until}{why}"


@_line.register
def _(e: ev.RoundDrafted) -> str:
    what = {"engine": "drafted", "override": "changed by the organiser", "restored": "restored"}[e.source]
    why = f": {e.reason}" if e.reason else ""
    return f"round {e.round} {what} ({_count(len(e.boards), 'board')}, {_count(len(e.byes), 'bye')}){why}"


@_line.register
def _(e: ev.DraftDiscarded) -> str:
    why = f" ({e.reason})" if e.reason else ""
    return f"draft of round {e.round} discarded{why}"


@_line.register
def _(e: ev.RoundPublished) -> str:
    return f"round {e.round} published"


@_line.register
def _(e: ev.RoundUnpublished) -> str:
    return f"round {e.round} taken back to draft ({e.reason})"


@_line.register
def _(e: ev.ResultRecorded) -> str:
    if e.result is None:
        return f"round {e.round} board {e.board}: result cleared"
    return f"round {e.round} board {e.board}: {e.result.value}"


@_line.register
def _(e: ev.Undone) -> str:
    return f"undo of event {e.target}" + (f" ({e.summary})" if e.summary else "")
