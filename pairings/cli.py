"""The command line: every desk action as a subcommand (see docs/ and design.md).

Thin by design: it parses arguments, calls :mod:`pairings.actions` (pure rules)
and the store, and prints. Exit status 0 on success, 1 when ``verify`` finds a
problem, 2 on bad input with a one-line reason on stderr; on any error the
event file is left exactly as it was.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path
from typing import Any, Callable, NoReturn, Sequence

from pairings import actions
from pairings.errors import InputError, PairingsError
from pairings.events import Undone
from pairings.state import ByeKind, EventState
from pairings.store import EventStore
from pairings.text import one_line, plain

PREVAIL = "The event's regulations and the chief arbiter's decision prevail over this tool."


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> NoReturn:
        command = self.prog.removeprefix("pairings").strip()
        raise InputError(f"{command}: {message}" if command else message)


def _open(path: str) -> EventStore:
    return EventStore.open(Path(path))


def _run(path: str, action: Callable[[EventState], Sequence[Any]]) -> EventState:
    with _open(path) as store:
        return store.apply(action)


def _say(text: str) -> None:
    print(text)


def _json(data: object) -> None:
    print(json.dumps(data, indent=2, ensure_ascii=False))


# -- commands ----------------------------------------------------------------------------


def cmd_new(a: argparse.Namespace) -> None:
    first = actions.new_event(
        a.name, a.rounds, a.scoring, not a.no_sides, a.bye_points, a.seed, a.round_robin, a.double,
        a.system, a.acceleration,
    )
    EventStore.create(Path(a.event), first).close()
    _say(f"created {a.event}: {first.name}, {first.rounds} rounds")


def cmd_player_add(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.add_player(s, a.name, a.rating, a.club, a.id))
    p = list(state.players.values())[-1]
    _say(f"registered {p.id}: {plain(p.name)}")


def cmd_player_edit(a: argparse.Namespace) -> None:
    def act(s: EventState) -> Sequence[Any]:
        p = s.players[actions.find_player(s, a.player)]
        return actions.edit_player(
            s, p.id, a.name if a.name is not None else p.name,
            a.rating if a.rating is not None else p.rating, a.club if a.club is not None else p.club,
        )

    _run(a.event, act)
    _say("player edited")


def cmd_player_import(a: argparse.Namespace) -> None:
    from pairings.roster import decode, import_roster

    try:
        data = Path(a.roster).read_bytes()
    except OSError as exc:
        raise InputError(f"{a.roster}: cannot read ({exc.strerror})") from None
    text = decode(data)
    state = _run(a.event, lambda s: import_roster(s, text))
    _say(f"imported; {len(state.players)} players registered")


def _bye_command(kind: ByeKind | None) -> Callable[[argparse.Namespace], None]:
    def command(a: argparse.Namespace) -> None:
        if kind is None:
            _run(a.event, lambda s: actions.withdraw(s, a.player, a.round, a.reason or ""))
            _say("withdrawn")
        else:
            _run(a.event, lambda s: actions.announce_bye(s, a.player, kind, a.round))
            _say(f"{kind.value} bye recorded")

    return command


def cmd_player_reinstate(a: argparse.Namespace) -> None:
    _run(a.event, lambda s: actions.reinstate(s, a.player))
    _say("reinstated")


def cmd_player_cancel_bye(a: argparse.Namespace) -> None:
    _run(a.event, lambda s: actions.cancel_bye(s, a.player, a.round))
    _say("bye cancelled")


def cmd_player_list(a: argparse.Namespace) -> None:
    with _open(a.event) as store:
        s = store.state
    if a.json:
        from pairings.interchange import export_event

        _json(export_event(s)["players"])
        return
    for p in s.players.values():
        rating = str(p.rating) if p.rating is not None else "-"
        name, club = plain(p.name)[:40], plain(p.club or "")[:20]
        _say(f"{plain(p.id):>6}  {name:<40} {rating:>5}  {club:<20} {s.score(p.id):>4g}  {p.status.value}")


def _draft_json(state: EventState, rnd_number: int) -> dict[str, Any]:
    from pairings.interchange import export_event

    doc = export_event(state)["rounds"][rnd_number - 1]
    rnd = state.rounds[rnd_number - 1]
    for game, out in zip(rnd.games, doc["games"]):
        out["flags"] = list(game.flags)
        out["cost"] = dict(game.cost)
    doc["cost"] = dict(rnd.cost)
    return doc  # type: ignore[no-any-return]


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
            f"{g.board:>4}  {first[:28]:<28} {before[g.first]:>4g}  -  "
            f"{second[:28]:<28} {before[g.second]:>4g}  {res:<7} {flags}"
        )
    for y in rnd.byes:
        _say(f"  bye  {plain(state.players[y.player].name)} ({y.kind.value}, {y.points:g})")
    if sides[0]:
        _say(f"(first named plays {sides[0]})")


def cmd_pair(a: argparse.Namespace) -> None:
    state = _run(a.event, actions.pair)
    number = state.rounds[-1].number
    if a.json:
        _json(_draft_json(state, number))
    else:
        print_round(state, number)


def cmd_swap(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.swap(s, a.a, a.b, a.reason))
    print_round(state, state.rounds[-1].number)


def cmd_discard(a: argparse.Namespace) -> None:
    _run(a.event, lambda s: actions.discard(s, a.reason or ""))
    _say("draft discarded")


def cmd_forbid(a: argparse.Namespace) -> None:
    _run(a.event, lambda s: actions.forbid_pair(s, a.a, a.b, a.until, a.reason or ""))
    _say("do-not-pair entry recorded")


def cmd_publish(a: argparse.Namespace) -> None:
    state = _run(a.event, actions.publish)
    _say(f"round {state.rounds[-1].number} published")


def cmd_unpublish(a: argparse.Namespace) -> None:
    state = _run(a.event, lambda s: actions.unpublish(s, a.reason))
    _say(f"round {state.rounds[-1].number} is a draft again")


def cmd_result(a: argparse.Namespace) -> None:
    code = a.result.removeprefix(_CODE_MARK)
    result = None if code == "clear" else code
    state = _run(a.event, lambda s: actions.record_result(s, a.board, result, a.round, a.correct))
    rnd = actions.results_round(state, a.round)
    left = len(rnd.open_boards)
    _say(f"round {rnd.number} board {a.board}: {code}; " + (f"{left} boards open" if left else "round complete"))


def cmd_standings(a: argparse.Namespace) -> None:
    _report(a, "standings")


def cmd_print(a: argparse.Namespace) -> None:
    _report(a, a.kind)


def _report(a: argparse.Namespace, kind: str) -> None:
    from pairings.reports import render

    with _open(a.event) as store:
        out = render(store.state, kind, a.format, getattr(a, "round", None))
    if a.output:
        data = out.encode("utf-8") if isinstance(out, str) else out
        try:
            Path(a.output).write_bytes(data)
        except OSError as exc:
            raise InputError(f"{a.output}: cannot write ({exc.strerror})") from None
        _say(f"wrote {a.output}")
    elif isinstance(out, bytes):
        raise InputError(f"{a.format} output is binary: give -o FILE")
    else:
        sys.stdout.write(out if out.endswith("\n") else out + "\n")


def cmd_publish_web(a: argparse.Namespace) -> None:
    from pairings.reports import publish_web

    with _open(a.event) as store:
        written = publish_web(store.state, Path(a.directory))
    _say(f"wrote {len(written)} files to {a.directory}")


def cmd_export(a: argparse.Namespace) -> None:
    from pairings.interchange import export_event

    with _open(a.event) as store:
        _json(export_event(store.state))


def cmd_restore(a: argparse.Namespace) -> None:
    from pairings.interchange import restore_events

    try:
        doc = json.loads(Path(a.file).read_text(encoding="utf-8-sig"))
    except OSError as exc:
        raise InputError(f"{a.file}: cannot read ({exc.strerror})") from None
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise InputError(f"{a.file}: not JSON ({exc})") from None
    events = restore_events(doc)
    EventStore.create_from(Path(a.event), events).close()
    _say(f"restored {a.event}")


def cmd_log(a: argparse.Namespace) -> None:
    from pairings.logtext import describe

    with _open(a.event) as store:
        log = store.log
    undone = {s.event.target for s in log if isinstance(s.event, Undone)}
    for s in log:
        mark = "  (undone)" if s.seq in undone else ""
        _say(f"{s.seq:>5}  {s.recorded_at[:19].replace('T', ' ')}  {describe(s.event)}{mark}")


def cmd_undo(a: argparse.Namespace) -> None:
    with _open(a.event) as store:
        events = actions.undo(store.log)
        store.append(events)
    _say(f"undone: {events[0].summary}")  # type: ignore[union-attr]


def cmd_verify(a: argparse.Namespace) -> None:
    from pairings.verify import verify_file

    ok, lines = verify_file(Path(a.event))
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
            sp.add_argument("event", metavar="EVENT", help="the event file")
        sp.set_defaults(fn=fn)
        return sp

    sp = add("new", cmd_new, "create a new event file")
    sp.add_argument("--name", required=True)
    sp.add_argument("--rounds", required=True, type=int)
    sp.add_argument("--scoring", default="1,0.5,0", help="points for win,draw,loss (default 1,0.5,0)")
    sp.add_argument("--no-sides", action="store_true", help="the game has no first/second side")
    sp.add_argument("--bye-points", type=float, default=None, help="points for a pairing bye (default: a win)")
    sp.add_argument("--seed", type=int, default=None, help="seed of the round-1 side lot (default: drawn now)")
    sp.add_argument("--round-robin", action="store_true", help="all-play-all by the Berger tables (3-24 players)")
    sp.add_argument("--double", action="store_true", help="double round robin, sides reversed in the second cycle")
    sp.add_argument("--system", default="whole-round", help="Swiss system: whole-round (default) or dutch "
                    "(the FIDE Dutch System, C.04.3; not endorsed by FIDE)")
    sp.add_argument("--acceleration", default="none", help="baku (FIDE C.04.5.1 virtual points) or none (default)")

    player = sub.add_parser("player", help="register and manage players")
    psub = player.add_subparsers(dest="player_command", required=True, parser_class=_Parser)

    def padd(name: str, fn: Callable[[argparse.Namespace], None], help_: str) -> argparse.ArgumentParser:
        sp = psub.add_parser(name, help=help_, description=help_)
        sp.add_argument("event", metavar="EVENT")
        sp.set_defaults(fn=fn)
        return sp

    sp = padd("add", cmd_player_add, "register a player (late entries join from the next round)")
    sp.add_argument("--name", required=True)
    sp.add_argument("--rating", type=int)
    sp.add_argument("--club")
    sp.add_argument("--id")
    sp = padd("edit", cmd_player_edit, "change a player's name, rating or club")
    sp.add_argument("player", metavar="PLAYER")
    sp.add_argument("--name")
    sp.add_argument("--rating", type=int)
    sp.add_argument("--club")
    sp = padd("import", cmd_player_import, "register every player of a CSV roster (header row)")
    sp.add_argument("roster", metavar="ROSTER.csv")
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
    add("publish", cmd_publish, "publish the draft")
    sp = add("unpublish", cmd_unpublish, "take a published round without results back to draft")
    sp.add_argument("--reason", required=True)
    sp = add("result", cmd_result, "enter a result: 1-0 0-1 1/2-1/2 +- -+ -- (or 'clear' with --correct)")
    sp.add_argument("board", type=int, metavar="BOARD")
    sp.add_argument("result", metavar="RESULT")
    sp.add_argument("--round", type=int)
    sp.add_argument("--correct", action="store_true", help="change a result already entered")
    sp = add("standings", cmd_standings, "the standings with the event's tiebreaks")
    sp.add_argument("--format", default="text", choices=("text", "csv", "json", "html", "pdf"))
    sp.add_argument("-o", "--output", metavar="FILE")
    sp = add("print", cmd_print, "a printout: pairings, names, slips, standings, crosstable")
    sp.add_argument("kind", choices=("pairings", "names", "slips", "standings", "crosstable"))
    sp.add_argument("--round", type=int)
    sp.add_argument("--format", default="text", choices=("text", "csv", "json", "html", "pdf"))
    sp.add_argument("-o", "--output", metavar="FILE")
    sp = add("publish-web", cmd_publish_web, "write static web pages (pairings, standings) to a folder")
    sp.add_argument("directory", metavar="DIR")
    add("export", cmd_export, "print the event as one JSON document")
    sp = add("restore", cmd_restore, "rebuild an event file from an exported JSON document", event=False)
    sp.add_argument("file", metavar="FILE.json")
    sp.add_argument("event", metavar="EVENT")
    add("log", cmd_log, "the event's history")
    add("undo", cmd_undo, "take back the last action still in effect")
    add("verify", cmd_verify, "check the hash chain and every round against the pairing rules")
    add("open", cmd_open, "the full-screen desk on an event file")
    sp = add("demo", cmd_demo, "the full-screen desk on a fresh copy of the demo event", event=False)
    sp.add_argument("--file", help="where to write the demo copy (default: a new temporary folder)")
    sp.add_argument("--no-desk", action="store_true", help="print the demo's round instead of opening the desk")
    return p


_CODE_MARK = "result:"


def _protect_result_codes(argv: list[str]) -> list[str]:
    """Keep ``-+`` and ``--`` after ``result`` as result codes, not as option syntax.

    argparse reads ``--`` as "end of options" and ``-+`` as an unknown option;
    both are the trade's forfeit codes, so they are marked before parsing.
    """
    if not argv or argv[0] != "result":
        return argv
    return [argv[0]] + [_CODE_MARK + a if a in ("-+", "--") else a for a in argv[1:]]


def main(argv: Sequence[str] | None = None) -> int:
    try:
        args = build_parser().parse_args(_protect_result_codes(list(sys.argv[1:] if argv is None else argv)))
        args.fn(args)
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
