"""The command line: every desk action as a subcommand (see docs/ and design.md).

Thin by design: it parses arguments, calls :mod:`pairings.actions` (pure rules)
and the store, and prints. Exit status 0 on success, 1 when ``verify`` finds a
problem, 2 on bad input with a one-line reason on stderr; on any error the
event file is left exactly as it was.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
from dataclasses import replace
from pathlib import Path
from typing import Any, Callable, NoReturn, Sequence

from pairings import actions
from pairings.cliawards import add_award_commands
from pairings.clirated import add_info_options, add_rated_commands
from pairings.errors import InputError, NoPairingError, PairingsError
from pairings.events import BreachAccepted, NoShowKept, Undone
from pairings.printouts import FORMATS, KINDS, PAPERS
from pairings.points import points_text
from pairings.state import ByeKind, EventState, PlayerDetails, RoundState, Settings
from pairings.store import EventStore
from pairings.text import cells, counted, fit, one_line, plain

PREVAIL = "The event's regulations and the chief arbiter's decision prevail over this tool."


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> NoReturn:
        command = self.prog.removeprefix("pairings").strip()
        raise InputError(f"{command}: {message}" if command else message)


def _path(text: str) -> str:
    """A path argument; a NUL byte (possible only in-process, never from a shell) is refused as bad input."""
    if "\0" in text:
        raise argparse.ArgumentTypeError("a path cannot contain a NUL byte")
    return text


def _open(path: str) -> EventStore:
    return EventStore.open(Path(path))


def _run(path: str, action: Callable[[EventState], Sequence[Any]]) -> EventState:
    with _open(path) as store:
        return store.apply(action)


def _run_kept(path: str, action: Callable[[EventState], Sequence[Any]]) -> tuple[EventState, Sequence[Any]]:
    """As :func:`_run`, also returning the events written (for the confirmation)."""
    written: list[Any] = []

    def act(state: EventState) -> Sequence[Any]:
        written.extend(action(state))
        return written

    return _run(path, act), written


def _say(text: str) -> None:
    print(text)


def _json(data: object) -> None:
    print(json.dumps(data, indent=2, ensure_ascii=False))


# -- commands ----------------------------------------------------------------------------


def _setting_texts(a: argparse.Namespace, skip: tuple[str, ...] = ()) -> dict[str, str]:
    """The settings given as options (see :func:`_setting_options`), as text."""
    from pairings.regulations import SETTINGS

    return {s.key: getattr(a, s.key) for s in SETTINGS if s.key not in skip and getattr(a, s.key) is not None}


def cmd_new(a: argparse.Namespace) -> None:
    from pairings.regulations import created_settings

    first = actions.new_event(
        a.name, a.rounds, a.scoring or "1,0.5,0", not a.no_sides, None, a.seed, a.round_robin, a.double
    )
    first = created_settings(first, _setting_texts(a, skip=("name", "rounds", "scoring")))
    EventStore.create(Path(a.event), first).close()
    _say(f"created {a.event}: {first.name}, {first.rounds} rounds")


def _details(a: argparse.Namespace, base: PlayerDetails = PlayerDetails()) -> PlayerDetails:
    """``base`` with the detail options given (see :func:`_detail_options`)."""
    from pairings.details import read_categories, read_details, read_ratings

    texts = {k: getattr(a, k) for k in ("title", "federation", "fide_id", "national_id", "birth", "sex")
             if getattr(a, k) is not None}
    details = read_details(texts, base)
    if a.rating_list:
        details = replace(details, ratings=read_ratings(a.rating_list, details.ratings))
    if a.categories is not None:
        details = replace(details, categories=read_categories(a.categories))
    return details


def cmd_player_add(a: argparse.Namespace) -> None:
    details = _details(a)
    state = _run(a.event, lambda s: actions.add_player(s, a.name, a.rating, a.club, a.id, a.allow_duplicates, details))
    p = list(state.players.values())[-1]
    late = f", plays from round {p.entry_round}" if p.entry_round > 1 else ""
    _say(f"registered {plain(p.name)} as {plain(p.id)}{late}")


def cmd_player_edit(a: argparse.Namespace) -> None:
    edited: list[str] = []

    def act(s: EventState) -> Sequence[Any]:
        p = s.players[actions.find_player(s, a.player)]
        edited.append(p.id)
        return actions.edit_player(
            s, p.id, a.name if a.name is not None else p.name,
            a.rating if a.rating is not None else p.rating, a.club if a.club is not None else p.club,
            _details(a, p.details),
        )

    state = _run(a.event, act)
    _say(f"edited {_who(state, edited[0])}")


def cmd_player_import(a: argparse.Namespace) -> None:
    from pairings.roster import decode, read_roster

    try:
        data = Path(a.roster).read_bytes()
    except OSError as exc:
        raise InputError(f"{a.roster}: cannot read ({exc.strerror})") from None
    text = decode(data)
    warnings: list[str] = []
    before: list[int] = []

    def act(s: EventState) -> Sequence[Any]:
        before.append(len(s.players))
        read = read_roster(s, text)
        warnings[:] = read.warnings
        return actions.refuse_duplicates(s, read.events, a.allow_duplicates)

    state = _run(a.event, act)
    for line in warnings:
        print(f"pairings: warning: {one_line(line)}", file=sys.stderr)
    _say(f"imported {counted(len(state.players) - before[0], 'player')}; {len(state.players)} registered")


def _who(state: EventState, player: str) -> str:
    """A player's name for a confirmation (after the action, so the name is the one now held)."""
    return plain(state.players[actions.find_player(state, player)].name)


def _say_stale(state: EventState) -> None:
    """After a change of who plays: say when the open draft no longer fits (publish refuses it)."""
    stale = actions.stale_draft(state)
    if stale:
        number = state.rounds[-1].number
        _say(f"the draft of round {number} is now out of date ({plain('; '.join(stale[:2]))}): pair again")


def _bye_command(kind: ByeKind | None) -> Callable[[argparse.Namespace], None]:
    def command(a: argparse.Namespace) -> None:
        if kind is None:
            state = _run(a.event, lambda s: actions.withdraw(s, a.player, a.round, a.reason or ""))
            pid = actions.find_player(state, a.player)
            _say(f"{_who(state, pid)} withdrawn from round {state.players[pid].withdrawn_from} on")
        else:
            state, events = _run_kept(a.event, lambda s: actions.announce_bye(s, a.player, kind, a.round))
            what = "absent" if kind is ByeKind.ABSENCE else "on a requested bye"
            _say(f"{_who(state, events[0].player)} is {what} in round {events[0].round}")
        _say_stale(state)

    return command


def cmd_player_reinstate(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.reinstate(s, a.player))
    pid = actions.find_player(state, a.player)
    _say(f"{_who(state, pid)} is back in from round {state.players[pid].entry_round}")
    _say_stale(state)


def cmd_player_cancel_bye(a: argparse.Namespace) -> None:
    state, events = _run_kept(a.event, lambda s: actions.cancel_bye(s, a.player, a.round))
    _say(f"{_who(state, events[0].player)}: the bye in round {events[0].round} is cancelled")
    _say_stale(state)


def cmd_player_list(a: argparse.Namespace) -> None:
    with _open(a.event) as store:
        s = store.state
    if a.json:
        from pairings.interchange import export_event

        _json(export_event(s)["players"])
        return
    for p in s.players.values():
        rating = str(p.rating) if p.rating is not None else "-"
        name, club = fit(plain(p.name), 40), fit(plain(p.club or ""), 20)
        title, fed = p.details.title or "", p.details.federation or ""
        _say(f"{plain(p.id):>6}  {title:<3} {_pad(name, 40)} {fed:<3} {rating:>5}  {_pad(club, 20)} "
             f"{points_text(s.score(p.id)):>4}  {p.status.value}")


def _draft_json(state: EventState, rnd_number: int) -> dict[str, Any]:
    from pairings.interchange import export_event

    doc = export_event(state)["rounds"][rnd_number - 1]
    rnd = state.rounds[rnd_number - 1]
    for game, out in zip(rnd.games, doc["games"]):
        out["flags"] = list(game.flags)
        out["cost"] = dict(game.cost)
    doc["cost"] = dict(rnd.cost)
    return doc  # type: ignore[no-any-return]


def _pad(text: str, width: int) -> str:
    """``text`` padded to ``width`` terminal cells (a wide character takes two)."""
    return text + " " * max(0, width - cells(text))


def print_round(state: EventState, number: int) -> None:
    rnd = state.rounds[number - 1]
    sides = state.settings.sides or ("", "")
    _say(f"{plain(state.settings.name)} — round {rnd.number} ({rnd.state.value})")
    before = {pid: rec.score_before(rnd.number) for pid, rec in state.records.items()}
    for g in rnd.games:
        first, second = plain(state.players[g.first].name), plain(state.players[g.second].name)
        res = g.result.value if g.result else ""
        flags = " ".join(g.flags)
        _say(
            f"{g.board:>4}  {_pad(fit(first, 28), 28)} {points_text(before[g.first]):>4}  -  "
            f"{_pad(fit(second, 28), 28)} {points_text(before[g.second]):>4}  {res:<7} {flags}"
        )
    for y in rnd.byes:
        _say(f"  bye  {plain(state.players[y.player].name)} ({y.kind.value}, {points_text(y.points)})")
    if sides[0]:
        _say(f"(first named plays {sides[0]})")


def cmd_pair(a: argparse.Namespace) -> None:
    state, events = _run_kept(a.event, lambda s: actions.pair(s, replace=a.replace, keep=a.keep))
    number = state.rounds[-1].number
    if a.json:
        _json(_draft_json(state, number))
        return
    for e in events:
        if isinstance(e, NoShowKept):
            _say(f"{_who(state, e.player)} stays in after the double forfeit of round {e.round}")
    print_round(state, number)


def cmd_swap(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.swap(s, a.a, a.b, a.reason))
    print_round(state, state.rounds[-1].number)
    try:
        optimum = actions.draft_next(state)
    except NoPairingError as exc:  # the swap is written; only the comparison is missing
        _say(f"against the optimum: no engine pairing to compare with ({plain(str(exc))})")
        return
    _say(f"against the optimum: {actions.against_optimum(state, optimum)}")
    breaches = actions.override_breaches(state, optimum)
    if breaches:
        _say(f"breaks a hard rule ({plain('; '.join(breaches[:3]))}): publish needs --accept --reason TEXT")


def cmd_discard(a: argparse.Namespace) -> None:
    _, events = _run_kept(a.event, lambda s: actions.discard(s, a.reason or ""))
    _say(f"the draft of round {events[0].round} is discarded")


def cmd_forbid(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.forbid_pair(s, a.a, a.b, a.until, a.reason or ""))
    until = f" up to round {a.until}" if a.until else ""
    _say(f"{_who(state, a.a)} and {_who(state, a.b)} will not be paired{until}")


def cmd_publish(a: argparse.Namespace) -> None:
    if a.accept and not (a.reason or "").strip():
        raise InputError("--accept needs --reason TEXT (it goes into the log)")
    if a.reason and not a.accept:
        raise InputError("--reason goes with --accept (publishing a draft that breaks a hard rule)")
    state, events = _run_kept(a.event, lambda s: actions.publish(s, a.reason or ""))
    accepted = [e for e in events if isinstance(e, BreachAccepted)]
    what = f", breaking {plain('; '.join(accepted[0].breaches))} (accepted)" if accepted else ""
    _say(f"round {state.rounds[-1].number} published{what}")


def cmd_unpublish(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.unpublish(s, a.reason))
    _say(f"round {state.rounds[-1].number} is a draft again")


def cmd_result(a: argparse.Namespace) -> None:
    code = a.result.removeprefix(_CODE_MARK)
    result = None if code == "clear" else code
    if a.reason and not a.correct:
        raise InputError("--reason goes with --correct (changing a result already entered)")
    state = _run(a.event, lambda s: actions.record_result(s, a.board, result, a.round, a.correct, a.reason or ""))
    rnd = actions.results_round(state, a.round)
    left = len(rnd.open_boards)
    _say(f"round {rnd.number} board {a.board}: {code}; " + (f"{counted(left, 'board')} open" if left else "round complete"))
    later = [r.number for r in state.rounds if rnd.number < r.number and r.paired_before]
    kept = [r.number for r in state.rounds if r.number in later and r.state is not RoundState.DRAFT]
    if kept:
        many = len(kept) > 1
        _say(f"standings follow the correction; round{'s' if many else ''} {', '.join(map(str, kept))} "
             f"{'stay' if many else 'stays'} as paired on the old score")
    if later:
        _say_stale(state)


def cmd_standings(a: argparse.Namespace) -> None:
    _report(a, "standings")


def cmd_print(a: argparse.Namespace) -> None:
    _report(a, a.kind)


def cmd_prizes(a: argparse.Namespace) -> None:
    _report(a, "prizes")


def _report(a: argparse.Namespace, kind: str) -> None:
    from dataclasses import replace

    from pairings.reports import render
    from pairings.standings import check_tiebreaks

    with _open(a.event) as store:
        state = store.state
    if getattr(a, "tiebreaks", None):   # another list for this printout only; the event keeps its own
        chosen = check_tiebreaks(a.tiebreaks)
        state = replace(state, settings=replace(state.settings, tiebreaks=chosen))
    out = render(state, kind, a.format, getattr(a, "round", None), category=getattr(a, "category", None),
                 paper=getattr(a, "paper", None), ratings=getattr(a, "ratings", False))
    if a.output:
        from pairings.reports.files import write_file

        write_file(Path(a.output), out)
        _say(f"wrote {a.output}")
    elif isinstance(out, bytes):
        raise InputError(f"{a.format} output is binary: give -o FILE")
    else:
        sys.stdout.write(out if out.endswith("\n") else out + "\n")


def cmd_publish_web(a: argparse.Namespace) -> None:
    from pairings.reports import publish_web

    with _open(a.event) as store:
        written = publish_web(store.state, Path(a.directory))
    _say(f"wrote {counted(len(written), 'file')} to {a.directory}")


def cmd_settings(a: argparse.Namespace) -> None:
    from pairings.clirated import info_change
    from pairings.eventinfo import info_lines, set_event_info
    from pairings.regulations import change_settings, changed_after_notes, settings_lines

    texts, info = _setting_texts(a), info_change(a)
    if texts or info:
        before = _open_state(a.event)
        state = _run(a.event, lambda s: (change_settings(s, texts) if texts else [])
                     + (set_event_info(s, info) if info else []))
        if a.json:
            _json(_settings_json(state.settings))
            return
        for line in _changed_lines(before, state):
            _say(line)
        for (label, old), (_, new) in zip(info_lines(before.settings), info_lines(state.settings)):
            if old != new:
                _say(f"{label}: {plain(old)} -> {plain(new)}")
        for note in changed_after_notes(state.settings)[len(before.settings.changed_after):]:
            _say(note)
        return
    with _open(a.event) as store:
        settings = store.state.settings
    if a.json:
        _json(_settings_json(settings))
        return
    for label, value in settings_lines(settings) + info_lines(settings):
        _say(f"{label + ':':<32} {plain(value)}")


def _settings_json(settings: Settings) -> dict[str, Any]:
    """The interchange document's ``event`` object (its ``report`` part only when a detail is set)."""
    from pairings.eventinfo import info_document
    from pairings.regulations import settings_document

    report = info_document(settings)
    return settings_document(settings) | ({"report": report} if report else {})


def _open_state(path: str) -> EventState:
    with _open(path) as store:
        return store.state


def _changed_lines(before: EventState, after: EventState) -> list[str]:
    from pairings.regulations import settings_lines

    old = dict(settings_lines(before.settings))
    return [f"{label}: {plain(old[label])} -> {plain(value)}"
            for label, value in settings_lines(after.settings) if old[label] != value]


def cmd_export(a: argparse.Namespace) -> None:
    from pairings.interchange import export_event, export_log

    with _open(a.event) as store:
        state = store.state
        log = store.log if a.log else None
    if a.format == "trf":
        if a.log:
            raise InputError("export: --log goes with the JSON document, not the report file")
        from pairings.trf import write_trf

        text = write_trf(state)
    else:
        doc = export_event(state)
        if log is not None:
            doc["log"] = export_log(log)
        text = json.dumps(doc, indent=2, ensure_ascii=False) + "\n"
    if a.output:
        from pairings.reports.files import write_file

        write_file(Path(a.output), text)
        _say(f"wrote {a.output}")
    else:
        sys.stdout.write(text)


def cmd_restore(a: argparse.Namespace) -> None:
    from pairings.interchange import restore

    if _is_trf(a.file):
        from pairings.trf import read_trf

        EventStore.create_from(Path(a.event), read_trf(_read_text(a.file))).close()
        _say(f"restored {a.event} from the report file")
        return
    try:
        doc = json.loads(Path(a.file).read_text(encoding="utf-8-sig"))
    except OSError as exc:
        raise InputError(f"{a.file}: cannot read ({exc.strerror})") from None
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise InputError(f"{a.file}: not JSON ({exc})") from None
    restored = restore(doc)
    EventStore.create_from(Path(a.event), restored.events).close()
    for line in restored.lost:
        print(f"pairings: not restored: {one_line(line)}", file=sys.stderr)
    _say(f"restored {a.event}")


def _read_text(path: str) -> str:
    try:
        return Path(path).read_bytes().decode("utf-8-sig")
    except OSError as exc:
        raise InputError(f"{path}: cannot read ({exc.strerror})") from None
    except UnicodeDecodeError as exc:
        raise InputError(f"{path}: not UTF-8 text (byte {exc.start + 1})") from None


def _is_trf(path: str) -> bool:
    """A FIDE report file: named ``*.trf``, or a file whose first record is a TRF tag (``012 ...``)."""
    if path.lower().endswith(".trf"):
        return True
    try:
        with open(path, "rb") as f:
            head = f.read(4).removeprefix(b"\xef\xbb\xbf")
    except OSError:
        return False
    return len(head) == 4 and head[:3].isdigit() and head[3:] == b" "


def cmd_log(a: argparse.Namespace) -> None:
    from pairings.logtext import describe, roster_names

    with _open(a.event) as store:
        log, names = store.log, roster_names(store.state)
    undone = {s.event.target for s in log if isinstance(s.event, Undone)}
    for s in log:
        mark = "  (undone)" if s.seq in undone else ""
        _say(f"{s.seq:>5}  {s.recorded_at[:19].replace('T', ' ')}  {describe(s.event, names)}{mark}")


def cmd_undo(a: argparse.Namespace) -> None:
    from pairings.logtext import roster_names

    with _open(a.event) as store:
        events = actions.undo(store.log, roster_names(store.state))
        store.append(events)
    _say(f"undone: {events[0].summary}")  # type: ignore[union-attr]


def cmd_verify(a: argparse.Namespace) -> None:
    from pairings.verify import verify_file

    ok, lines = verify_file(Path(a.event), a.deep)
    for line in lines:
        _say(line)
    if not ok:
        sys.exit(1)


def cmd_open(a: argparse.Namespace) -> None:
    from pairings.tui import run_desk

    run_desk(Path(a.event))


def cmd_demo(a: argparse.Namespace) -> None:
    from pairings.demo import make_demo

    path = make_demo(Path(a.file) if a.file else None)
    if a.no_desk:
        with _open(str(path)) as store:
            state = store.state
        print_round(state, state.rounds[-1].number)
        _say(f"demo event written to {path}")
        return
    from pairings.tui import run_desk

    run_desk(path)
    print(f"the demo event is kept in {path}")


# -- parser ------------------------------------------------------------------------------


def build_parser() -> argparse.ArgumentParser:
    p = _Parser(prog="pairings", description="Run Swiss-system and round-robin events. " + PREVAIL)
    sub = p.add_subparsers(dest="command", required=True, parser_class=_Parser)

    def add(name: str, fn: Callable[[argparse.Namespace], None], help_: str, event: bool = True) -> argparse.ArgumentParser:
        sp = sub.add_parser(name, help=help_, description=help_)
        if event:
            sp.add_argument("event", metavar="EVENT", help="the event file", type=_path)
        sp.set_defaults(fn=fn)
        return sp

    sp = add("new", cmd_new, "create a new event file")
    sp.add_argument("--name", required=True)
    sp.add_argument("--rounds", required=True, type=int)
    _setting_options(sp, skip=("name", "rounds"))
    sp.add_argument("--no-sides", action="store_true", help="the game has no first/second side")
    sp.add_argument("--seed", type=int, default=None, help="seed of the round-1 side lot (default: drawn now)")
    sp.add_argument("--round-robin", action="store_true", help="all-play-all by the Berger tables (3-24 players)")
    sp.add_argument("--double", action="store_true", help="double round robin, sides reversed in the second cycle")

    player = sub.add_parser("player", help="register and manage players")
    psub = player.add_subparsers(dest="player_command", required=True, parser_class=_Parser)

    def padd(name: str, fn: Callable[[argparse.Namespace], None], help_: str) -> argparse.ArgumentParser:
        sp = psub.add_parser(name, help=help_, description=help_)
        sp.add_argument("event", metavar="EVENT", type=_path)
        sp.set_defaults(fn=fn)
        return sp

    sp = padd("add", cmd_player_add, "register a player (late entries join from the next round)")
    sp.add_argument("--name", required=True)
    sp.add_argument("--rating", type=int)
    sp.add_argument("--club")
    sp.add_argument("--id")
    sp.add_argument("--allow-duplicates", action="store_true", help="register even if the name is already there")
    _detail_options(sp)
    sp = padd("edit", cmd_player_edit, "change a player's name, rating, club or details (an empty value clears)")
    sp.add_argument("player", metavar="PLAYER")
    sp.add_argument("--name")
    sp.add_argument("--rating", type=int)
    sp.add_argument("--club")
    _detail_options(sp)
    sp = padd("import", cmd_player_import, "register every player of a CSV roster (header row)")
    sp.add_argument("roster", metavar="ROSTER.csv", type=_path)
    sp.add_argument("--allow-duplicates", action="store_true", help="import even rows that look registered")
    sp = padd("list", cmd_player_list, "list the roster")
    sp.add_argument("--json", action="store_true")
    for name, kind, help_ in (
        ("withdraw", None, "withdraw a player from a round on"),
        ("absent", ByeKind.ABSENCE, "mark a player absent for a round (no points)"),
        ("request-bye", ByeKind.REQUESTED, "record a requested bye for a round"),
    ):
        sp = padd(name, _bye_command(kind), help_)
        sp.add_argument("player", metavar="PLAYER", help="id or unambiguous name")
        sp.add_argument("--round", type=int)
        if kind is None:
            sp.add_argument("--reason")
    sp = padd("reinstate", cmd_player_reinstate, "bring a withdrawn player back from the next round")
    sp.add_argument("player", metavar="PLAYER")
    sp = padd("cancel-bye", cmd_player_cancel_bye, "cancel an announced bye or absence")
    sp.add_argument("player", metavar="PLAYER")
    sp.add_argument("--round", type=int)

    sp = add("pair", cmd_pair, "draft the next round")
    sp.add_argument("--json", action="store_true")
    sp.add_argument("--replace", action="store_true", help="draft again over a draft holding overrides")
    sp.add_argument("--keep", action="append", default=[], metavar="PLAYER",
                    help="keep a player in after a double forfeit (no-show) in the last round; repeatable")
    sp = add("swap", cmd_swap, "swap two players in the draft (with a reason)")
    sp.add_argument("a", metavar="PLAYER")
    sp.add_argument("b", metavar="PLAYER")
    sp.add_argument("--reason", required=True)
    sp = add("discard", cmd_discard, "discard the draft")
    sp.add_argument("--reason")
    sp = add("forbid", cmd_forbid, "never pair two players (optionally up to a round)")
    sp.add_argument("a", metavar="PLAYER")
    sp.add_argument("b", metavar="PLAYER")
    sp.add_argument("--until", type=int, help="the entry applies up to and including this round")
    sp.add_argument("--reason")
    sp = add("publish", cmd_publish, "publish the draft")
    sp.add_argument("--accept", action="store_true", help="publish a changed draft that breaks a hard rule")
    sp.add_argument("--reason", help="why the breach is accepted (with --accept; goes into the log)")
    sp = add("unpublish", cmd_unpublish, "take a published round without results back to draft")
    sp.add_argument("--reason", required=True)
    sp = add("result", cmd_result, "enter a result: 1-0 0-1 1/2-1/2 +- -+ -- or the arbiter's 0-0 1/2-0 0-1/2 "
             "(or 'clear' with --correct)")
    sp.add_argument("board", type=int, metavar="BOARD")
    sp.add_argument("result", metavar="RESULT")
    sp.add_argument("--round", type=int)
    sp.add_argument("--correct", action="store_true", help="change a result already entered")
    sp.add_argument("--reason", help="why (with --correct; needed once a later round is paired)")
    sp = add("standings", cmd_standings, "the standings with the event's tiebreaks")
    sp.add_argument("--round", type=int, help="after this round (default: the last published)")
    _sheet_options(sp, category=True)
    sp.add_argument("--tiebreaks", metavar="LIST",
                    help="another tiebreak list for this printout only, e.g. BH-C1,BH,SB,WIN")
    sp.add_argument("--ratings", action="store_true",
                    help="add each player's expected score, rating change and performance (FIDE rating rules)")
    sp = add("print", cmd_print, "a printout: " + ", ".join(KINDS))
    sp.add_argument("kind", choices=KINDS)
    sp.add_argument("--round", type=int)
    _sheet_options(sp, category=True)
    sp = add("prizes", cmd_prizes, "the prize list: places, winners and amounts per category")
    sp.add_argument("--round", type=int, help="after this round (default: the last published)")
    _sheet_options(sp)

    add_award_commands(sub, _Parser)
    add_rated_commands(sub, _Parser)
    sp = add("publish-web", cmd_publish_web, "write static web pages (pairings, standings) to a folder")
    sp.add_argument("directory", metavar="DIR", type=_path)
    sp = add("settings", cmd_settings, "show the event's settings, or change them (one logged change)")
    sp.add_argument("--json", action="store_true", help="print the settings as JSON")
    _setting_options(sp)
    add_info_options(sp)
    sp = add("export", cmd_export, "print the event as one JSON document, or as a FIDE report file (TRF16)")
    sp.add_argument("--log", action="store_true", help="add the whole history (every logged event)")
    sp.add_argument("--format", choices=("json", "trf"), default="json")
    sp.add_argument("-o", "--output", metavar="FILE", type=_path)
    sp = add("restore", cmd_restore, "rebuild an event file from an exported JSON document or a FIDE report "
             "file (*.trf)", event=False)
    sp.add_argument("file", metavar="FILE", type=_path)
    sp.add_argument("event", metavar="EVENT", type=_path)
    add("log", cmd_log, "the event's history")
    add("undo", cmd_undo, "take back the last action still in effect")
    sp = add("verify", cmd_verify, "check the hash chain and every round against the pairing rules")
    sp.add_argument("--deep", action="store_true", help="also re-solve every round with networkx on the full "
                    "graph (always done below 300 players; slow beyond)")
    add("open", cmd_open, "the full-screen desk on an event file")
    sp = add("demo", cmd_demo, "the full-screen desk on a fresh copy of the demo event", event=False)
    sp.add_argument("--file", type=_path, help="where to write the demo copy (default: a new temporary folder)")
    sp.add_argument("--no-desk", action="store_true", help="print the demo's round instead of opening the desk")
    return p


def _sheet_options(sp: argparse.ArgumentParser, category: bool = False) -> None:
    sp.add_argument("--format", default="text", choices=FORMATS)
    sp.add_argument("-o", "--output", metavar="FILE", type=_path)
    sp.add_argument("--paper", choices=PAPERS, help="PDF and HTML page size (default: from the locale; US/CA letter)")
    if category:
        sp.add_argument("--category", metavar="NAME", help="the standings of one prize category")


def _setting_options(sp: argparse.ArgumentParser, skip: tuple[str, ...] = ()) -> None:
    """The settings as options, for ``new`` and ``settings`` alike."""
    from pairings.regulations import SETTINGS

    for s in SETTINGS:
        if s.key not in skip:
            sp.add_argument(s.option, dest=s.key, metavar="|".join(s.choices) or s.metavar, help=s.help)


def _detail_options(sp: argparse.ArgumentParser) -> None:
    sp.add_argument("--title", help="GM, IM, FM, CM, WGM, WIM, WFM or WCM")
    sp.add_argument("--federation", help="three-letter code, e.g. ENG")
    sp.add_argument("--fide-id", dest="fide_id")
    sp.add_argument("--national-id", dest="national_id")
    sp.add_argument("--birth", help="year (1987) or date (1987-04-23)")
    sp.add_argument("--sex", help="m or f")
    sp.add_argument("--rating-list", dest="rating_list", action="append", metavar="LIST=N",
                    help="a rating on a named list, e.g. fide=2010 (repeat for more lists; LIST= removes)")
    sp.add_argument("--categories", help="category labels, comma-separated (empty clears)")


_CODE_MARK = "result:"


def _protect_result_codes(argv: list[str]) -> list[str]:
    """Keep ``-+`` and ``--`` after ``result`` as result codes, not as option syntax.

    argparse reads ``--`` as "end of options" and ``-+`` as an unknown option;
    both are the trade's forfeit codes, so they are marked before parsing.
    """
    if not argv or argv[0] != "result":
        return argv
    return [argv[0]] + [_CODE_MARK + a if a in ("-+", "--") else a for a in argv[1:]]


def _reader_gone() -> int:
    """The program reading our output stopped (``| head``): end quietly, as Unix tools do.

    Further output goes nowhere, and the status is 128 + SIGPIPE, the one a shell
    reports for a tool that the signal ended (common practice, no source).
    """
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):  # a stdout without a descriptor (in-process capture)
        pass
    return 128 + 13  # SIGPIPE is 13 on every POSIX system; the signal module lacks it on Windows


def main(argv: Sequence[str] | None = None) -> int:
    try:
        args = build_parser().parse_args(_protect_result_codes(list(sys.argv[1:] if argv is None else argv)))
        args.fn(args)
        sys.stdout.flush()  # here, so that a reader gone away (`| head`) is seen below, not at exit
    except BrokenPipeError:
        return _reader_gone()
    except PairingsError as exc:
        print(f"pairings: {one_line(str(exc))}", file=sys.stderr)
        return 2
    except OSError as exc:  # a folder or output file the system refuses; the event file is untouched
        where = f"{exc.filename}: " if exc.filename else ""
        print(f"pairings: {one_line(where + (exc.strerror or str(exc)))}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("pairings: interrupted; nothing half-written is kept", file=sys.stderr)
        return 130
    return 0


if __name__ == "__main__":
    sys.exit(main())
