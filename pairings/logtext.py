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
from pairings.points import points_text
from pairings.state import ByeKind, EventState
from pairings.text import counted, plain

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


@singledispatch
def _line(event: object) -> str:
    return type(event).__name__


@_line.register
def _(e: ev.EventCreated) -> str:
    sides = f"sides {e.sides[0]}/{e.sides[1]}" if e.sides else "no sides"
    s = e.scoring
    scoring = "/".join(points_text(x) for x in (s.win, s.draw, s.loss))
    return f"event {e.name!r} created: {e.rounds} rounds, scoring {scoring}, {sides}"


@_line.register
def _(e: ev.SettingsChanged) -> str:
    from pairings.regulations import change_words

    after = f" after round {e.after_round}" if e.after_round else ""
    return f"settings changed{after}: " + "; ".join(change_words(e))


@_line.register
def _(e: ev.PlayerRegistered) -> str:
    extra = [f"rating {e.rating}" if e.rating is not None else "unrated"]
    if e.club:
        extra.append(e.club)
    extra += _detail_words(e.details)
    late = f", from round {e.entry_round}" if e.entry_round > 1 else ""
    return f"{e.name} ({e.id}) registered: {', '.join(extra)}{late}"


def _detail_words(d: ev.PlayerDetailsModel | None) -> list[str]:
    """The details a reader looks for first: title, federation, ratings by list."""
    if d is None:
        return []
    return [x for x in (d.title, d.federation) if x] + [f"{k} {v}" for k, v in sorted(d.ratings.items())]


@_line.register
def _(e: ev.PlayerEdited) -> str:
    details = "".join(f", {w}" for w in _detail_words(e.details))
    why = f" ({e.reason})" if e.reason else ""
    return (f"{e.name} ({e.id}) edited: rating {e.rating if e.rating is not None else '-'}, "
            f"club {e.club or '-'}{details}{why}")


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
    return f"round {e.round} {what} ({counted(len(e.boards), 'board')}, {counted(len(e.byes), 'bye')}){why}"


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
def _(e: ev.ResultCorrected) -> str:
    rounds = ", ".join(str(n) for n in e.paired_rounds)
    later = f"; round{'s' if len(e.paired_rounds) > 1 else ''} {rounds} paired on the old score" if rounds else ""
    return f"round {e.round} board {e.board}: corrected to {e.result.value} ({e.reason}){later}"


@_line.register
def _(e: ev.BreachAccepted) -> str:
    return f"round {e.round}: hard-rule breach accepted ({e.reason}): {'; '.join(e.breaches)}"


@_line.register
def _(e: ev.NoShowKept) -> str:
    return f"{_who(e.player)} kept in the event after the double forfeit of round {e.round}"


@_line.register
def _(e: ev.Undone) -> str:
    return f"undo of event {e.target}" + (f" ({e.summary})" if e.summary else "")


@_line.register
def _(e: ev.CategoryDefined) -> str:
    if e.rule is None:
        return f"category {e.name!r} defined (members by hand)"
    rule = {k: v for k, v in e.rule.model_dump().items() if v not in (None, False)}
    return f"category {e.name!r} defined: " + ", ".join(
        k.replace('_', ' ') if v is True else f"{k.replace('_', ' ')} {v}" for k, v in rule.items())


@_line.register
def _(e: ev.CategoryRemoved) -> str:
    return f"category {e.name!r} removed"


@_line.register
def _(e: ev.CategoryMember) -> str:
    return f"{_who(e.player)} {'put in' if e.member else 'left out of'} category {e.category!r} by hand"


@_line.register
def _(e: ev.PrizeSet) -> str:
    where = f"category {e.category!r}" if e.category is not None else "the overall standings"
    if e.amount is None:
        return f"prize for place {e.place} of {where} removed"
    return f"prize for place {e.place} of {where}: {e.amount} minor units"


@_line.register
def _(e: ev.PrizePolicySet) -> str:
    changed = {k: v for k, v in e.model_dump(exclude={"type"}).items() if v is not None}
    return "prize rules changed: " + ", ".join(f"{k.replace('_', ' ')} {v}" for k, v in changed.items())
