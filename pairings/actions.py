"""What the organiser can do, as pure functions: state (+ arguments) → events to append.

Each action checks its request against the event's state and the round
lifecycle (``draft`` → ``published`` → ``complete``) and raises an
:class:`~pairings.errors.InputError` with a one-line reason when the request is
not allowed, so nothing is ever written for bad input. The command line and
the desk both call these; neither holds any rule of its own.
"""

from __future__ import annotations

import secrets
from typing import TYPE_CHECKING, Sequence

from pairings import events as ev
from pairings.errors import AmbiguousPlayerError, InputError, RoundStateError, UnknownPlayerError
from pairings.state import Acceleration, ByeKind, EventState, PlayerId, Result, Round, RoundState, Status, System
from pairings.store import StoredEvent, undo_target

if TYPE_CHECKING:  # the engine (and networkx) load only for the commands that pair
    from pairings.engine import Draft, Overrides

MAX_NAME = 300


SWISS_SYSTEMS: dict[str, System] = {"whole-round": System.SWISS, "dutch": System.DUTCH}
"""The Swiss systems by their command-line names."""


def new_event(
    name: str, rounds: int, scoring: str = "1,0.5,0", sides: bool = True, bye_points: float | None = None,
    seed: int | None = None, round_robin: bool = False, double_round: bool = False,
    system: str = "whole-round", acceleration: str = "none",
) -> ev.EventCreated:
    """The first event of a new event file, from the command line's options.

    ``seed`` fixes the round-1 side lot; when not given it is drawn now and recorded.
    ``system`` names a Swiss system (:data:`SWISS_SYSTEMS`); ``acceleration``
    ``baku`` (C.04.5.1, standard scoring 1, 0.5, 0 only) or ``none``.
    """
    if system not in SWISS_SYSTEMS:
        raise InputError(f"unknown system {system!r}: use {' or '.join(SWISS_SYSTEMS)}")
    if acceleration not in {a.value for a in Acceleration}:
        raise InputError(f"unknown acceleration {acceleration!r}: use baku or none")
    if acceleration != Acceleration.NONE and (round_robin or double_round):
        raise InputError("acceleration applies to Swiss systems, not to a round robin")
    name = clean_text(name, "event name")
    if rounds < 1:
        raise InputError(f"the number of rounds must be 1 or more (got {rounds})")
    try:
        win, draw, loss = (float(x) for x in scoring.split(","))
    except ValueError:
        raise InputError(f"scoring {scoring!r} must be three numbers: win,draw,loss (e.g. 1,0.5,0)") from None
    if not (win > loss >= 0 and loss <= draw <= win):
        raise InputError(f"scoring {scoring!r}: a win must score more than a loss, and draws lie between")
    if acceleration == Acceleration.BAKU and (win, draw, loss) != (1.0, 0.5, 0.0):
        raise InputError("the Baku acceleration (C.04.5.1) is for the standard scoring 1,0.5,0 only")
    points = win if bye_points is None else bye_points
    if not 0 <= points <= win:
        raise InputError(f"bye points {points} must lie between 0 and a win ({win})")
    return ev.EventCreated(
        name=name, rounds=rounds, scoring=ev.ScoringModel(win=win, draw=draw, loss=loss),
        sides=("White", "Black") if sides else None, bye_points=points, requested_bye_points=draw,
        seed=secrets.randbelow(2**31) if seed is None else seed,
        system=System.ROUND_ROBIN if round_robin or double_round else SWISS_SYSTEMS[system],
        double_round=double_round, acceleration=Acceleration(acceleration),
    )


def clean_text(value: str, what: str, *, required: bool = True, limit: int = MAX_NAME) -> str:
    """Trim a name-like field; refuse empty (when required), over-long or control-character text."""
    text = " ".join(value.split())
    if required and not text:
        raise InputError(f"{what} is empty")
    if len(text) > limit:
        raise InputError(f"{what} is longer than {limit} characters")
    if any(ord(c) < 32 or 0x7F <= ord(c) < 0xA0 for c in text):
        raise InputError(f"{what} holds control characters")
    return text


def find_player(state: EventState, text: str) -> PlayerId:
    """A player by id, by exact name (any case), or by a part of the name that only one has."""
    key = text.strip()
    if key in state.players:
        return PlayerId(key)
    folded = key.casefold()
    if not folded:
        raise UnknownPlayerError("no player given")
    exact = [p.id for p in state.players.values() if p.name.casefold() == folded]
    if len(exact) == 1:
        return exact[0]
    matches = exact or [p.id for p in state.players.values() if folded in p.name.casefold()]
    if not matches:
        raise UnknownPlayerError(f"no player {text!r} (give an id or a name)")
    if len(matches) > 1:
        names = ", ".join(f"{state.players[m].name} ({m})" for m in matches[:4])
        raise AmbiguousPlayerError(f"{text!r} matches {len(matches)} players: {names}; give the id")
    return matches[0]


def new_id(state: EventState, taken: set[str] | None = None) -> str:
    used = set(state.players) | (taken or set())
    n = len(state.players) + 1
    while f"p{n}" in used:
        n += 1
    return f"p{n}"


def entry_round(state: EventState) -> int:
    """The first round a player registered now can be paired in."""
    last = state.last_round
    if last is None:
        return 1
    return last.number if last.state is RoundState.DRAFT else last.number + 1


def _player_fields(name: str, rating: int | None, club: str | None) -> tuple[str, str | None]:
    """A player's name and club cleaned, and the rating checked (shared by add and edit)."""
    if rating is not None and not 0 <= rating <= 4000:
        raise InputError(f"rating {rating} is outside 0-4000")
    cleaned = clean_text(name, "name")
    return cleaned, (clean_text(club, "club", required=False) or None) if club is not None else None


def add_player(
    state: EventState, name: str, rating: int | None = None, club: str | None = None, pid: str | None = None
) -> list[ev.Event]:
    name, club = _player_fields(name, rating, club)
    if pid is not None:
        pid = clean_text(pid, "id", limit=40)
        if pid in state.players:
            raise InputError(f"id {pid!r} is already taken by {state.players[PlayerId(pid)].name}")
    return [
        ev.PlayerRegistered(
            id=pid or new_id(state), name=name, rating=rating, club=club, entry_round=entry_round(state)
        )
    ]


def edit_player(state: EventState, player: str, name: str, rating: int | None, club: str | None) -> list[ev.Event]:
    pid = find_player(state, player)
    name, club = _player_fields(name, rating, club)
    return [ev.PlayerEdited(id=pid, name=name, rating=rating, club=club)]


def _future_round(state: EventState, round_number: int | None) -> int:
    first_open = entry_round(state)
    number = first_open if round_number is None else round_number
    if number < first_open:
        raise RoundStateError(f"round {number} is already published; the earliest round to change is {first_open}")
    if number > state.settings.rounds:
        raise InputError(f"round {number} does not exist (the event has {state.settings.rounds} rounds)")
    return number


def withdraw(state: EventState, player: str, round_number: int | None = None, reason: str = "") -> list[ev.Event]:
    pid = find_player(state, player)
    if state.players[pid].status is Status.WITHDRAWN:
        raise InputError(f"{state.players[pid].name} is already withdrawn")
    number = entry_round(state) if round_number is None else round_number
    if number < entry_round(state):
        raise RoundStateError(f"round {number} is already published; withdraw from round {entry_round(state)} on")
    return [ev.PlayerWithdrawn(player=pid, from_round=number, reason=reason)]


def reinstate(state: EventState, player: str) -> list[ev.Event]:
    pid = find_player(state, player)
    if state.players[pid].status is not Status.WITHDRAWN:
        raise InputError(f"{state.players[pid].name} is not withdrawn")
    return [ev.PlayerReinstated(player=pid, from_round=entry_round(state))]


def announce_bye(state: EventState, player: str, kind: ByeKind, round_number: int | None = None) -> list[ev.Event]:
    """A requested bye (fixed points) or an absence (no points) for one round to come."""
    pid = find_player(state, player)
    number = _future_round(state, round_number)
    if state.requests.get(number, {}).get(pid) is kind:
        raise InputError(f"{state.players[pid].name} already has a {kind.value} bye in round {number}")
    return [ev.ByeRequested(player=pid, round=number, kind=kind)]  # type: ignore[arg-type]


def cancel_bye(state: EventState, player: str, round_number: int | None = None) -> list[ev.Event]:
    pid = find_player(state, player)
    number = _future_round(state, round_number)
    if pid not in state.requests.get(number, {}):
        raise InputError(f"{state.players[pid].name} has no bye announced for round {number}")
    return [ev.ByeCancelled(player=pid, round=number)]


def forbid_pair(
    state: EventState, a: str, b: str, until_round: int | None = None, reason: str = ""
) -> list[ev.Event]:
    pa, pb = find_player(state, a), find_player(state, b)
    if pa == pb:
        raise InputError("a do-not-pair entry needs two different players")
    if until_round is not None and until_round < 1:
        raise InputError("--until must be a round number of 1 or more")
    return [ev.PairForbidden(a=pa, b=pb, until_round=until_round, reason=reason)]


# -- rounds ------------------------------------------------------------------------------


def _draft_event(draft: Draft, source: str = "engine", reason: str = "") -> ev.RoundDrafted:
    return ev.RoundDrafted(
        round=draft.round,
        boards=tuple(
            ev.BoardModel(board=b.board, first=b.first, second=b.second, flags=b.flags, cost=dict(b.cost))
            for b in draft.boards
        ),
        byes=tuple(ev.ByeModel(player=y.player, kind=y.kind, points=y.points) for y in draft.byes),
        cost=dict(draft.cost),
        engine_version=draft.engine_version,
        source=source,  # type: ignore[arg-type]
        reason=reason,
    )


def draft_next(state: EventState, overrides: Overrides | None = None) -> Draft:
    """The engine's draft of the next round (or a fresh draft of the open one)."""
    from pairings import engine

    last = state.last_round
    if last is not None and last.state is RoundState.PUBLISHED:
        raise RoundStateError(
            f"round {last.number} is not finished ({len(last.open_boards)} boards without a result)"
        )
    if state.next_round_number > state.settings.rounds:
        raise RoundStateError(f"all {state.settings.rounds} rounds have been paired")
    return engine.draft_round(state, overrides or engine.Overrides())


def pair(state: EventState, overrides: Overrides | None = None, reason: str = "") -> list[ev.Event]:
    source = "override" if reason else "engine"
    return [_draft_event(draft_next(state, overrides), source, reason)]


def open_draft(state: EventState) -> Round:
    last = state.last_round
    if last is None or last.state is not RoundState.DRAFT:
        raise RoundStateError("there is no draft: pair the next round first")
    return last


def draft_of(state: EventState) -> Draft:
    """The open draft as the engine's value (to explain or change it), boards and flags as stored."""
    from dataclasses import replace

    from pairings import engine

    rnd = open_draft(state)
    stored = engine.Draft(
        rnd.number,
        tuple(engine.DraftBoard(g.board, g.first, g.second, g.cost, g.flags) for g in rnd.games),
        rnd.byes, rnd.cost, rnd.engine_version or engine.ENGINE_VERSION,
    )
    bye = next((y.player for y in rnd.byes if y.kind is ByeKind.PAIRING), None)
    scored = engine.rebuild(state, rnd.number, [(g.first, g.second) for g in rnd.games], bye, base=stored)
    return replace(scored, boards=stored.boards)


def _need_reason(reason: str) -> str:
    text = clean_text(reason, "reason", required=False, limit=500)
    if not text:
        raise InputError("an override needs a short reason for the log")
    return text


def swap(state: EventState, a: str, b: str, reason: str) -> list[ev.Event]:
    why = _need_reason(reason)
    from pairings import engine

    pa, pb = find_player(state, a), find_player(state, b)
    changed = engine.swap(state, draft_of(state), pa, pb)
    return [_draft_event(changed, "override", f"swap {state.players[pa].name} and {state.players[pb].name}: {why}")]


def discard(state: EventState, reason: str = "") -> list[ev.Event]:
    rnd = open_draft(state)
    return [ev.DraftDiscarded(round=rnd.number, reason=reason)]


def publish(state: EventState) -> list[ev.Event]:
    rnd = open_draft(state)
    in_draft = {p for g in rnd.games for p in (g.first, g.second)} | {y.player for y in rnd.byes}
    wanted = set(state.available(rnd.number)) | set(state.requests.get(rnd.number, {}))
    wanted = {p for p in wanted if state.players[p].status is Status.ACTIVE}
    missing, extra = wanted - in_draft, in_draft - wanted
    if missing or extra:
        who = [f"{state.players[p].name} is not in it" for p in sorted(missing)]
        who += [f"{state.players[p].name} should not be in it" for p in sorted(extra)]
        raise RoundStateError(f"the draft of round {rnd.number} is out of date ({'; '.join(who[:3])}); pair again")
    if not rnd.games:
        raise RoundStateError(f"the draft of round {rnd.number} has no boards")
    return [ev.RoundPublished(round=rnd.number)]


def unpublish(state: EventState, reason: str) -> list[ev.Event]:
    why = _need_reason(reason)
    last = state.last_round
    if last is None or last.state is RoundState.DRAFT:
        raise RoundStateError("no published round to take back")
    if any(g.result is not None for g in last.games):
        raise RoundStateError(f"round {last.number} already has results; clear them first")
    return [ev.RoundUnpublished(round=last.number, reason=why)]


def results_round(state: EventState, round_number: int | None) -> Round:
    """The round results go into: the given one, else the newest published one."""
    if round_number is None:
        for played in reversed(state.rounds):
            if played.state is not RoundState.DRAFT:
                return played
        raise RoundStateError("no round has been published yet")
    rnd = state.round(round_number)
    if rnd is None:
        raise InputError(f"round {round_number} does not exist yet")
    if rnd.state is RoundState.DRAFT:
        raise RoundStateError(f"round {round_number} is not published; publish it before entering results")
    return rnd


def record_result(
    state: EventState, board: int, result: str | Result | None, round_number: int | None = None,
    correct: bool = False,
) -> list[ev.Event]:
    """Enter (or, with ``correct``, change or clear) the result on one board."""
    code = Result.parse(result) if isinstance(result, str) else result
    rnd = results_round(state, round_number)
    game = rnd.game_on(board)
    if game is None:
        raise InputError(f"round {rnd.number} has no board {board} (boards 1-{len(rnd.games)})")
    if game.result is not None and not correct:
        raise InputError(
            f"board {board} of round {rnd.number} already has {game.result.value}; "
            "confirm the correction to change it"
        )
    if game.result is None and code is None:
        raise InputError(f"board {board} of round {rnd.number} has no result to clear")
    if game.result == code:
        raise InputError(f"board {board} of round {rnd.number} already has {code.value if code else 'no result'}")
    later = [r.number for r in state.rounds if r.number > rnd.number]
    if later and correct:
        raise RoundStateError(
            f"round {later[0]} is already paired on these scores; discard or un-publish it first"
        )
    return [ev.ResultRecorded(round=rnd.number, board=board, result=code)]


def undo(log: Sequence[StoredEvent]) -> list[ev.Event]:
    """Take back the newest action still in effect."""
    from pairings.logtext import describe

    target = undo_target(log)
    if target is None:
        raise InputError("nothing to undo")
    return [ev.Undone(target=target.seq, summary=describe(target.event))]
