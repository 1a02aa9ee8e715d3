"""What the organiser can do, as pure functions: state (+ arguments) → events to append.

Each action checks its request against the event's state and the round
lifecycle (``draft`` → ``published`` → ``complete``) and raises an
:class:`~pairings.errors.InputError` with a one-line reason when the request is
not allowed, so nothing is ever written for bad input. The command line and
the desk both call these; neither holds any rule of its own.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterable, Mapping, Sequence

from pairings import events as ev
from pairings.costs import CRITERIA
from pairings.errors import (
    AmbiguousPlayerError, DuplicatePlayerError, HardRuleError, InputError, NoPairingError, NoShowError,
    RoundStateError, UnknownPlayerError,
)
from pairings.points import Points, points_text
from pairings.state import ByeKind, EventState, PlayerDetails, PlayerId, Result, Round, RoundState, Status, System
from pairings.store import StoredEvent, undo_target
from pairings.standings.tiebreaks import default_tiebreaks
from pairings.text import counted, fold

if TYPE_CHECKING:  # the engine (and networkx) load only for the commands that pair
    from pairings.engine import Draft, Overrides

MAX_NAME = 300



def new_event(
    name: str, rounds: int, scoring: str = "1,0.5,0", sides: bool = True, bye_points: Points | None = None,
    seed: int | None = None, round_robin: bool = False, double_round: bool = False,
) -> ev.EventCreated:
    """The first event of a new event file, from the command line's options.

    ``seed`` fixes the round-1 side lot; when not given it is drawn now and recorded.
    """
    import secrets  # only here: every other command spares its import

    from pairings.regulations import parse_scoring

    name = clean_text(name, "event name")
    if rounds < 1:
        raise InputError(f"the number of rounds must be 1 or more (got {rounds})")
    points_of = parse_scoring(scoring)
    win, draw, loss = points_of.win, points_of.draw, points_of.loss
    points = win if bye_points is None else bye_points
    if not 0 <= points <= win:
        raise InputError(f"bye points {points_text(points)} must lie between 0 and a win ({points_text(win)})")
    system = System.ROUND_ROBIN if round_robin or double_round else System.SWISS
    return ev.EventCreated(
        name=name, rounds=rounds, scoring=ev.ScoringModel(win=win, draw=draw, loss=loss),
        sides=("White", "Black") if sides else None, bye_points=points, requested_bye_points=draw,
        seed=secrets.randbelow(2**31) if seed is None else seed,
        system=system, double_round=double_round,
        tiebreaks=default_tiebreaks(system, sides),  # the C.07 recommendations (pairings.standings.tiebreaks)
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
    """A player by id, by exact name, or by a part of the name that only one has (case and accents ignored)."""
    key = text.strip()
    if key in state.players:
        return PlayerId(key)
    folded = fold(key)
    if not folded:
        raise UnknownPlayerError("no player given")
    same = [p.id for p in state.players.values() if p.name.casefold() == key.casefold()]
    if len(same) == 1:  # "Zoe" is Zoe even when a Zoë plays too
        return same[0]
    by_id = {p.id: fold(p.name) for p in state.players.values()}
    exact = [pid for pid, n in by_id.items() if n == folded]
    if len(exact) == 1:
        return exact[0]
    matches = exact or [pid for pid, n in by_id.items() if folded in n]
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
    state: EventState, name: str, rating: int | None = None, club: str | None = None, pid: str | None = None,
    allow_duplicates: bool = False,
    details: PlayerDetails | None = None,
) -> list[ev.Event]:
    from pairings.details import details_model

    name, club = _player_fields(name, rating, club)
    if pid is not None:
        pid = clean_text(pid, "id", limit=40)
        if pid in state.players:
            raise InputError(f"id {pid!r} is already taken by {state.players[PlayerId(pid)].name}")
    events: list[ev.Event] = [
        ev.PlayerRegistered(
            id=pid or new_id(state), name=name, rating=rating, club=club, entry_round=entry_round(state),
            details=details_model(details) if details is not None else None,
        )
    ]
    return refuse_duplicates(state, events, allow_duplicates)


def folded_name(name: str) -> str:
    """A name as duplicates are compared: folded as for matching (:func:`pairings.text.fold`), spaces collapsed."""
    return " ".join(fold(name).split())


def likely_duplicates(state: EventState, events: Iterable[ev.Event]) -> list[str]:
    """Registrations among ``events`` that look like a player already there, or an earlier one of them.

    Likely the same person: the same folded name (:func:`folded_name`) or the same id
    (common practice, no source: a roster imported twice, a name typed twice).
    """
    seen = {folded_name(p.name): f"{p.name} ({p.id})" for p in state.players.values()}
    ids = set(state.players)
    found: list[str] = []
    for e in events:
        if not isinstance(e, ev.PlayerRegistered):
            continue
        key = folded_name(e.name)
        if key in seen or e.id in ids:
            found.append(f"{e.name} looks like {seen.get(key) or e.id}")
        seen.setdefault(key, f"{e.name} ({e.id})")
        ids.add(PlayerId(e.id))
    return found


def refuse_duplicates(state: EventState, events: list[ev.Event], allow: bool = False) -> list[ev.Event]:
    """``events`` unchanged, unless they register likely duplicates and ``allow`` is not given."""
    found = [] if allow else likely_duplicates(state, events)
    if found:
        more = f" and {len(found) - 3} more" if len(found) > 3 else ""
        raise DuplicatePlayerError(
            f"{len(found)} likely duplicate{'s' if len(found) != 1 else ''} ({'; '.join(found[:3])}{more}); "
            "nothing registered (--allow-duplicates registers them anyway)"
        )
    return events


def edit_player(
    state: EventState, player: str, name: str, rating: int | None, club: str | None,
    details: PlayerDetails | None = None,
) -> list[ev.Event]:
    """Change a player's name, rating and club; ``details`` (when given) replaces the details whole."""
    from pairings.details import details_model

    pid = find_player(state, player)
    name, club = _player_fields(name, rating, club)
    stored = None if details is None else details_model(details) or ev.PlayerDetailsModel()
    return [ev.PlayerEdited(id=pid, name=name, rating=rating, club=club, details=stored)]


def _round_exists(state: EventState, number: int) -> None:
    if not 1 <= number <= state.settings.rounds:
        raise InputError(f"round {number} does not exist (the event has rounds 1-{state.settings.rounds})")


def _future_round(state: EventState, round_number: int | None) -> int:
    first_open = entry_round(state)
    number = first_open if round_number is None else round_number
    _round_exists(state, number)
    if number < first_open:
        raise RoundStateError(f"round {number} is already published; the earliest round to change is {first_open}")
    return number


def withdraw(state: EventState, player: str, round_number: int | None = None, reason: str = "") -> list[ev.Event]:
    pid = find_player(state, player)
    if state.players[pid].status is Status.WITHDRAWN:
        raise InputError(f"{state.players[pid].name} is already withdrawn")
    number = entry_round(state) if round_number is None else round_number
    if round_number is not None:
        _round_exists(state, number)
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
    if kind is ByeKind.REQUESTED:
        _check_bye_request(state, pid, number)
    return [ev.ByeRequested(player=pid, round=number, kind=kind)]  # type: ignore[arg-type]


def requested_bye_rounds(state: EventState, pid: PlayerId) -> tuple[int, ...]:
    """The rounds the player has a requested bye in: announced, or given in a round already made."""
    asked = {r for r, who in state.requests.items() if who.get(pid) is ByeKind.REQUESTED}
    given = {r.number for r in state.rounds for y in r.byes if y.player == pid and y.kind is ByeKind.REQUESTED}
    return tuple(sorted(asked | given))


def _check_bye_request(state: EventState, pid: PlayerId, number: int) -> None:
    """The event's limits on requested byes: how many per player, and the last round one may be asked for."""
    s, name = state.settings, state.players[pid].name
    if s.requested_bye_last_round is not None and number > s.requested_bye_last_round:
        raise InputError(
            f"{name}: a bye can be requested up to round {s.requested_bye_last_round} only (asked for round {number})"
        )
    taken = [r for r in requested_bye_rounds(state, pid) if r != number]
    if s.requested_bye_limit is not None and len(taken) >= s.requested_bye_limit:
        rounds = ", ".join(map(str, taken)) or "none"
        raise InputError(
            f"{name} already has {len(taken)} requested bye{'s' if len(taken) != 1 else ''} (rounds: {rounds}); "
            f"the event allows {s.requested_bye_limit} per player"
        )


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
    for entry in state.forbidden:
        covers = entry.until_round is None or (until_round is not None and entry.until_round >= until_round)
        if {entry.a, entry.b} == {pa, pb} and covers:
            until = f" up to round {entry.until_round}" if entry.until_round else ""
            raise InputError(f"{state.players[pa].name} and {state.players[pb].name} are already on the "
                             f"do-not-pair list{until}: nothing recorded")
    return [ev.PairForbidden(a=pa, b=pb, until_round=until_round, reason=reason)]


# -- rounds ------------------------------------------------------------------------------


def draft_event(draft: Draft, source: str = "engine", reason: str = "") -> ev.RoundDrafted:
    """The event that stores ``draft`` as the round's draft (``source``: who made it, ``reason``: why)."""
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
            f"round {last.number} is not finished ({counted(len(last.open_boards), 'board')} without a result)"
        )
    if state.next_round_number > state.settings.rounds:
        raise RoundStateError(f"all {state.settings.rounds} rounds have been paired")
    return engine.draft_round(state, overrides or engine.Overrides())


def pair(
    state: EventState, overrides: Overrides | None = None, reason: str = "", *, replace: bool = False,
    keep: Sequence[str] = (),
) -> list[ev.Event]:
    """Draft the next round (or the open one again).

    Refused over a draft the organiser changed unless ``replace`` (the override would be lost), and
    while players who lost the last round by double forfeit wait for a decision: ``keep`` names
    those who stay in (recorded), the others are withdrawn with ``player withdraw`` (:func:`no_shows`).
    """
    last = state.last_round
    if last is not None and last.state is RoundState.DRAFT and last.source != "engine" and not replace:
        why = f" ({'; '.join(last.notes)})" if last.notes else ""
        raise RoundStateError(
            f"the draft of round {last.number} holds the organiser's changes{why}; "
            "give --replace to draft it again from scratch"
        )
    kept = [find_player(state, k) for k in keep]
    waiting = no_shows(state)
    if any(pid not in waiting for pid in kept):
        stray = next(pid for pid in kept if pid not in waiting)
        raise InputError(f"--keep {state.players[stray].name}: no double forfeit of theirs waits for a decision")
    left = [pid for pid in waiting if pid not in kept]
    if left:
        names = ", ".join(state.players[pid].name for pid in left)
        raise NoShowError(
            f"{names} lost round {state.next_round_number - 1} by double forfeit (no-show), which counts as a "
            "withdrawal unless the regulations say otherwise: give --keep NAME to keep a player in, or "
            "withdraw them (player withdraw EVENT NAME)"
        )
    source = "override" if reason else "engine"
    decisions: list[ev.Event] = [ev.NoShowKept(player=pid, round=state.next_round_number - 1) for pid in kept]
    return decisions + [draft_event(draft_next(state, overrides), source, reason)]


def keep_after_no_show(state: EventState, player: str) -> list[ev.Event]:
    """Keep a player in the event after their double forfeit (the desk's answer to :func:`no_shows`)."""
    pid = find_player(state, player)
    if pid not in no_shows(state):
        raise InputError(f"no double forfeit of {state.players[pid].name} waits for a decision")
    return [ev.NoShowKept(player=pid, round=state.next_round_number - 1)]


def no_shows(state: EventState) -> tuple[PlayerId, ...]:
    """Players who lost the round before the next by double forfeit and are still to be paired.

    The general handling rules (FIDE C.04.2, from memory) treat a player absent without notice as
    withdrawn unless the regulations say otherwise, so the organiser is asked before the next draft;
    a player already withdrawn, on an announced bye or absence, or kept in (:class:`NoShowKept`) is
    not asked about again.
    """
    previous = state.round(state.next_round_number - 1)
    if previous is None or previous.state is not RoundState.COMPLETE or state.next_round_number > state.settings.rounds:
        return ()
    available = set(state.available(state.next_round_number))
    out = [p for g in previous.games if g.result is Result.DOUBLE_FORFEIT for p in (g.first, g.second)]
    return tuple(p for p in out if p in available and (p, previous.number) not in state.kept_after_no_show)


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
    if pa == pb:
        raise InputError(f"{a!r} and {b!r} are the same player ({state.players[pa].name}): give two players to swap")
    changed = engine.swap(state, draft_of(state), pa, pb)
    return [draft_event(changed, "override", f"swap {state.players[pa].name} and {state.players[pb].name}: {why}")]


def against_optimum(state: EventState, optimum: Draft | None = None) -> str:
    """The open draft's cost against the engine's optimum, in words (as the desk's override preview)."""
    from pairings import engine

    return engine.compare(optimum or draft_next(state), draft_of(state)).describe()


def discard(state: EventState, reason: str = "") -> list[ev.Event]:
    rnd = open_draft(state)
    return [ev.DraftDiscarded(round=rnd.number, reason=reason)]


def stale_draft(state: EventState) -> list[str]:
    """Why the open draft no longer fits the event (empty when it fits, or there is no draft).

    Availability (H4) is checked player by player: everyone available is in it, everyone on a board
    or the pairing bye may be paired, and every announced bye or absence is in it as announced; a
    result of an earlier round corrected since the draft also makes it stale.
    """
    rnd = state.last_round
    if rnd is None or rnd.state is not RoundState.DRAFT:
        return []
    name = {pid: p.name for pid, p in state.players.items()}
    ranked = state.available(rnd.number)
    available = set(ranked)
    asked = state.requests.get(rnd.number, {})
    paired = dict.fromkeys([p for g in rnd.games for p in (g.first, g.second)]
                           + [y.player for y in rnd.byes if y.kind is ByeKind.PAIRING])
    on_bye = {y.player: y.kind for y in rnd.byes if y.kind is not ByeKind.PAIRING}
    out = [f"{name[p]} is not in it" for p in ranked if p not in paired and p not in on_bye]
    for pid in paired:
        if pid in asked:
            what = "an absence" if asked[pid] is ByeKind.ABSENCE else "a requested bye"
            out.append(f"{name[pid]} is paired but has {what} announced")
        elif pid not in available:
            out.append(f"{name[pid]} is paired but cannot play this round (withdrawn or not yet entered)")
    for pid, kind in on_bye.items():
        if asked.get(pid) is not kind and (pid in available or pid in asked or kind is ByeKind.REQUESTED):
            out.append(f"{name[pid]} has a {kind.value} bye in it, but none is announced")
    for pid, announced in asked.items():
        if pid not in on_bye and pid not in paired and state.players[pid].status is Status.ACTIVE:
            out.append(f"{name[pid]}'s {announced.value} bye is not in it")
    out += [f"paired before the correction {note}" for note in rnd.paired_before]
    return out


def publish(state: EventState, accept: str = "") -> list[ev.Event]:
    """Publish the open draft: never one that breaks availability or predates a correction; one the
    organiser changed so that it breaks a hard rule the engine's optimum keeps only with ``accept``
    (the reason, recorded)."""
    rnd = open_draft(state)
    stale = stale_draft(state)
    if stale:
        raise RoundStateError(f"the draft of round {rnd.number} is out of date ({'; '.join(stale[:3])}); pair again")
    if not rnd.games:
        raise RoundStateError(f"the draft of round {rnd.number} has no boards")
    why = clean_text(accept, "reason", required=False, limit=500)
    breaches = override_breaches(state)
    if breaches and not why:
        raise HardRuleError(
            f"the draft of round {rnd.number} breaks a hard rule the engine's pairing keeps "
            f"({'; '.join(breaches[:3])}); give --accept --reason TEXT to publish it anyway"
        )
    accepted: list[ev.Event] = [ev.BreachAccepted(round=rnd.number, reason=why, breaches=tuple(breaches))]
    return (accepted if breaches else []) + [ev.RoundPublished(round=rnd.number)]


_HARD_COSTS = {c.rule: c.key for c in CRITERIA if c.hard}
"""The engine's cost criteria that count the relaxations of each hard rule (H5 is never relaxed)."""


def override_breaches(state: EventState, optimum: Draft | None = None) -> list[str]:
    """The hard-rule breaches (H1-H5) of the open draft that the organiser's changes brought in.

    A draft the engine made relaxes a hard rule only when no pairing keeps it (flagged); one the
    organiser changed is compared rule by rule with the engine's optimum for the same round.
    """
    from pairings import engine
    from pairings.engine.verify import hard_breaches

    rnd = open_draft(state)
    if rnd.source == "engine":
        return []
    breaches = hard_breaches(state, rnd.number, lambda pid: state.players[pid].name)
    if not breaches:
        return []
    try:
        best = (optimum or engine.draft_round(state)).cost
    except NoPairingError:
        return list(breaches)
    over = {rule for rule, key in _HARD_COSTS.items() if rnd.cost.get(key, 0) > best.get(key, 0)}
    return [b for b in breaches if b[:2] in over or b.startswith(("H4", "H5"))]


def unpublish(state: EventState, reason: str) -> list[ev.Event]:
    why = _need_reason(reason)
    last = state.last_round
    if last is None or last.state is RoundState.DRAFT:
        raise RoundStateError("no published round to take back")
    if any(g.result is not None for g in last.games):
        raise RoundStateError(f"round {last.number} already has results; clear them first "
                              "(result EVENT BOARD clear --correct; c in the desk's Results place)")
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
    correct: bool = False, reason: str = "",
) -> list[ev.Event]:
    """Enter (or, with ``correct``, change or clear) the result on one board.

    A result of a round that later rounds were already paired on can still be corrected, with a
    reason: the general handling rules (FIDE C.04.2, from memory) let a wrongly recorded result be
    put right, affecting only the pairings yet to be made. Standings follow the corrected result;
    the later rounds stay as paired and are marked as paired on the old score (the log, the desk's
    Round place, ``verify``); an open draft among them must be paired again.
    """
    code = Result.parse(result) if isinstance(result, str) else result
    rnd = results_round(state, round_number)
    game = rnd.game_on(board)
    if game is None:
        raise InputError(f"round {rnd.number} has no board {board} (boards 1-{len(rnd.games)})")
    if game.result is not None and not correct:
        raise InputError(
            f"board {board} of round {rnd.number} already has {game.result.value}; "
            "give --correct to change it"
        )
    if game.result is None and code is None:
        raise InputError(f"board {board} of round {rnd.number} has no result to clear")
    if game.result == code:
        raise InputError(f"board {board} of round {rnd.number} already has {code.value if code else 'no result'}")
    why = clean_text(reason, "reason", required=False, limit=500)
    later = tuple(r.number for r in state.rounds if r.number > rnd.number)
    if later and code is None:
        raise RoundStateError(
            f"round {later[0]} is already paired on this result: it can be corrected (give the new result "
            "with --correct --reason TEXT), not cleared"
        )
    if later and not why:
        raise InputError(
            f"round {later[0]} is already paired on this result: give --reason TEXT to correct it "
            "(the later rounds stay as paired)"
        )
    if why and game.result is not None and code is not None:
        return [ev.ResultCorrected(round=rnd.number, board=board, result=code, reason=why, paired_rounds=later)]
    return [ev.ResultRecorded(round=rnd.number, board=board, result=code)]


def undo(log: Sequence[StoredEvent], names: Mapping[str, str] | None = None) -> list[ev.Event]:
    """Take back the newest action still in effect; ``names`` (player id to name) word its summary."""
    from pairings.logtext import describe

    target = undo_target(log)
    if target is None:
        raise InputError("nothing to undo")
    return [ev.Undone(target=target.seq, summary=describe(target.event, names))]
