"""The Round: draft, look at the boards and the Why panel, override with a reason, publish.

The engine runs only in workers (drafting, override previews and records,
explanations), through :mod:`pairings.tui.offload`, which moves big fields
to a separate process; the workers return events or text through messages
and the handlers write them, so the keys keep answering while a big field
is paired.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from time import perf_counter
from typing import Sequence

from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, VerticalScroll
from textual.message import Message
from textual.timer import Timer
from textual.widgets import Label, LoadingIndicator, Static
from textual.worker import get_current_worker

from pairings import actions
from pairings.errors import InputError
from pairings.events import Event
from pairings.state import EventState, PlayerId, Round, RoundState
from pairings.tui import overrides as ov
from pairings.tui.base import Place
from pairings.tui.dialogs import ConfirmDialog, Field, FormDialog, open_dialog
from pairings.tui.grid import Column, Grid
from pairings.tui.offload import Job
from pairings.tui.text import (
    cell, describe_round, flag_words, flagged_games, name, open_flags, points, safe, short_result, widest,
)

WHY_DELAY = 0.25
"""Seconds the cursor rests on a board before the engine is asked why."""
WIDE = 96
"""From this terminal width on the screen has the ``-wide`` class (desk.tcss), below ``-narrow``."""



def prefill(state: EventState, pid: PlayerId) -> str:
    """What a player field starts with: the name, or the id when the name alone would not find them."""
    player = state.players[pid]
    try:
        return player.name if actions.find_player(state, player.name) == pid else pid
    except InputError:
        return pid


class RoundPlace(Place):
    TITLE = "Round"
    BINDINGS = [
        Binding("n", "draft", "Draft next"),
        Binding("s", "swap", "Swap"),
        Binding("k", "pin", "Pin board"),
        Binding("f", "forbid", "Forbid pair"),
        Binding("b", "bye", "To/from bye"),
        Binding("x", "discard", "Discard draft"),
        Binding("p", "publish", "Publish"),
        Binding("w", "why", "Why panel"),
        Binding("comma", "browse(-1)", "Earlier round", key_display=","),
        Binding("full_stop", "browse(1)", "Later round", key_display="."),
    ]

    @dataclass
    class Drafted(Message):
        """Events worked out by the engine, to append on ``base`` (a draft, or an override with its reason)."""

        events: Sequence[Event]
        base: int
        done: str

    @dataclass
    class Previewed(Message):
        title: str
        spec: ov.PlanSpec
        difference: str
        base: int

    @dataclass
    class Explained(Message):
        round: int
        board: int
        head: int
        lines: list[str] = field(default_factory=list)

    @dataclass
    class EngineFailed(Message):
        problem: str

    def __init__(self) -> None:
        super().__init__()
        self.number: int | None = None
        """The round on screen; None follows the latest."""
        self._wanted: tuple[int, int, int] | None = None
        """(head, round, board) the Why panel should explain next."""
        self._explaining = False
        self._why_timer: Timer | None = None
        self._boards: object = ()
        """What the boards table holds now (rebuilt only when it changes)."""

    def body(self) -> ComposeResult:
        yield Label("", id="round-status", classes="status")
        with Horizontal(id="busy", classes="busy"):
            yield LoadingIndicator()
            yield Label("", id="busy-text")
        with Horizontal(id="round-main"):
            yield Grid(id="boards")
            with VerticalScroll(id="why"):
                yield Static("", id="why-text", markup=False)
        yield Label("", id="byes", classes="byes")

    def on_mount(self) -> None:
        self.query_one("#busy").display = False
        self.query_one("#why").border_title = "Why · ↑↓ PgUp PgDn · w/Esc: back"
        self.query_one("#boards", Grid).focus()

    def action_why(self) -> None:
        """Into the Why panel (opened beside the boards in a narrow terminal) and back out of it."""
        why, main = self.query_one("#why", VerticalScroll), self.query_one("#round-main")
        if why.has_focus:
            main.remove_class("-why-open")
            self.query_one("#boards", Grid).focus()
            return
        main.add_class("-why-open")
        why.focus()
        self.explain_selected()

    def key_escape(self) -> None:
        if self.query_one("#why").has_focus:
            self.action_why()

    # -- showing ---------------------------------------------------------------------------

    def round(self) -> Round | None:
        state = self.state
        if self.number is not None and state.round(self.number) is not None:
            return state.round(self.number)
        return state.last_round

    def show(self, state: EventState) -> None:
        rnd = self.round()
        grid = self.query_one("#boards", Grid)
        status = self.query_one("#round-status", Label)
        byes = self.query_one("#byes", Label)
        if rnd is None:
            grid.set_rows([])
            status.update(cell(f"No round drafted yet: press n to draft round 1 ({len(state.players)} players)."))
            byes.update("")
            self.query_one("#why-text", Static).update("")
            self._boards = ()
            return
        sides = state.settings.sides or ("First", "Second")
        costs = [f"{k} {v}" for k, v in rnd.cost.items() if v]
        # The topline says how the latest round stands; this line says it for a round browsed back to.
        what = f"Round {rnd.number}" if rnd is state.last_round else f"Round {rnd.number}: {describe_round(rnd)}"
        what += " · cost: " + (", ".join(costs) if costs else "none")
        if rnd.paired_before:
            what += f" · paired on scores since corrected ({len(rnd.paired_before)}: see the Log)"
        if rnd.state is RoundState.DRAFT and actions.stale_draft(state):
            what += " · out of date: press n to draft again"
        status.update(cell(what))
        shape = (rnd.number, tuple((g.board, g.first, g.second, g.flags, g.result) for g in rnd.games))
        if shape != self._boards:
            if [c.label for c in grid.columns][1:2] != [sides[0]]:
                grid.set_columns([
                    Column("board", "Bd", 3), Column("first", sides[0], flex=True), Column("p1", "Pts", 4),
                    Column("second", sides[1], flex=True), Column("p2", "Pts", 4), Column("result", "Res", 3),
                    Column("flags", "Flags", limit=14),
                ])
            games = rnd.games

            def row(i: int) -> tuple[str, ...]:
                g = games[i]
                return (str(g.board), name(state, g.first), points(state.records[g.first].score_before(rnd.number)),
                        name(state, g.second), points(state.records[g.second].score_before(rnd.number)),
                        short_result(g.result), " ".join(g.flags) or "-")

            grid.set_source([str(g.board) for g in games], row, [
                3, widest(name(state, g.first) for g in games), 4, widest(name(state, g.second) for g in games), 4, 3,
                widest(" ".join(g.flags) or "-" for g in games),
            ])
            self._boards = shape
        byes.update(cell("Byes: " + ("; ".join(
            f"{name(state, y.player)} ({y.kind.value}, {points(y.points)})" for y in rnd.byes) or "none")))
        self.explain_selected()

    def selected_board(self) -> int | None:
        key = self.query_one("#boards", Grid).cursor_key
        return int(key) if key is not None else None

    @on(Grid.Highlighted, "#boards")
    def board_highlighted(self) -> None:
        self.explain_selected()

    def explain_selected(self) -> None:
        rnd, board = self.round(), self.selected_board()
        if rnd is None or board is None:
            return
        game = rnd.game_on(board)
        if game is None:
            return
        state = self.state
        sides = state.settings.sides or ("first", "second")
        lines = [
            f"Board {board} of round {rnd.number}",
            f"{sides[0]}: {name(state, game.first)}",
            f"{sides[1]}: {name(state, game.second)}",
            "",
            "Flags: " + ("none" if not game.flags else ""),
            *(f"  {flag_words(f)}" for f in game.flags),
            "",
            "Cost by criterion:",
        ]
        costs = [(k, v) for k, v in game.cost.items() if v]
        lines += [f"  {k:<15}{v}" for k, v in costs] or ["  nothing: every criterion met"]
        if rnd.state is RoundState.DRAFT:
            lines += ["", "Why: working it out …"]
            self._wanted = (state.head, rnd.number, board)
            if self._why_timer is not None:
                self._why_timer.stop()
            self._why_timer = self.set_timer(WHY_DELAY, self.start_explain)
        self.query_one("#why-text", Static).update("\n".join(safe(x) for x in lines))

    def start_explain(self) -> None:
        """One explanation at a time (each is a full re-draft), for the board the cursor rests on."""
        if self._explaining or self._wanted is None or self._wanted[0] != self.state.head:
            return
        if not self.query_one("#why").display:  # closed in a narrow terminal: worked out when opened (w)
            return
        self._explaining = True
        _, number, board = self._wanted
        self.explain(self.state, number, Job("explain", self.state.head, board=board))

    @work(thread=True, group="why", description="explain a board")
    def explain(self, state: EventState, number: int, job: Job) -> None:
        outcome = self.desk.offload.run(state, job)
        lines = list(outcome.lines) if not outcome.problem else [f"alternatives not available: {outcome.problem}"]
        if not get_current_worker().is_cancelled:
            self.post_message(self.Explained(number, job.board, job.head, lines))

    @on(Explained)
    def explained(self, message: Explained) -> None:
        self._explaining = False
        if self._wanted != (message.head, message.round, message.board):
            self.start_explain()
            return
        text = self.query_one("#why-text", Static)
        base = str(text.content).removesuffix("Why: working it out …")
        text.update(base + "Why:\n" + "\n".join(safe(x) for x in message.lines))

    def action_browse(self, step: int) -> None:
        last = self.state.last_round
        if last is None:
            return
        current = self.round()
        number = (current.number if current else last.number) + step
        if not 1 <= number <= last.number:
            self.notify(f"no round {number}", severity="warning")
            return
        self.number = None if number == last.number else number
        self.refresh_place()

    # -- drafting --------------------------------------------------------------------------

    def busy(self, text: str | None) -> None:
        self.query_one("#busy").display = text is not None
        self.query_one("#busy-text", Label).update(cell(text or ""))

    def action_draft(self) -> None:
        if self.query_one("#busy").display:
            self.notify("the engine is still working; keys keep working meanwhile", severity="warning")
            return
        state, base = self.state, self.shown_head
        last = state.last_round

        def go(yes: bool | None = True) -> None:
            if yes:
                self.number = None
                self.busy(f"drafting round {state.next_round_number} of {len(state.players)} players …")
                self.engine(state, Job("draft", base), "drafted in {seconds:.1f} s")

        waiting = actions.no_shows(state)
        if waiting:
            self.ask_no_show(waiting[0], base)
            return
        if last is not None and last.state is RoundState.DRAFT and last.source != "engine":
            notes = [f"override: {n}" for n in last.notes]
            open_dialog(self.app, ConfirmDialog(f"Draft round {last.number} again from scratch?", notes), go)
        else:
            go()

    def ask_no_show(self, player: PlayerId, base: int) -> None:
        """A double forfeit counts as a withdrawal unless the regulations say otherwise: ask, then draft."""
        who = name(self.state, player)
        number = self.state.next_round_number

        def answered(keep: bool | None) -> None:
            if keep is None:
                return
            act = (lambda s: actions.keep_after_no_show(s, player)) if keep else (
                lambda s: actions.withdraw(s, player, number, f"no-show in round {number - 1}"))
            if self.apply(act, f"{who} kept in" if keep else f"{who} withdrawn from round {number}", base):
                self.action_draft()

        lines = [f"{who} lost round {number - 1} by double forfeit (no-show).",
                 "A no-show counts as a withdrawal unless the regulations say otherwise.",
                 f"y: keep in the event and pair    n: withdraw from round {number} on",
                 "Esc: neither for now (nothing recorded, no draft)"]
        open_dialog(self.app, ConfirmDialog(f"Keep {who} in the event?", lines, cancel=True), answered)

    @work(thread=True, exclusive=True, group="engine", description="engine work")
    def engine(self, state: EventState, job: Job, done: str, title: str = "") -> None:
        """Run ``job`` (draft, preview or record) and hand its outcome to the screen.

        ``done`` is the note once it is written (``{seconds}`` filled in), ``title`` names an override.
        """
        start = perf_counter()
        outcome = self.desk.offload.run(state, job)
        if get_current_worker().is_cancelled:
            return
        if outcome.problem:
            self.post_message(self.EngineFailed(f"{title}: {outcome.problem}" if title else outcome.problem))
        elif job.kind == "preview":
            assert job.plan is not None
            self.post_message(self.Previewed(done, job.plan, outcome.difference, job.head))
        else:
            self.post_message(self.Drafted(outcome.events, job.head, done.format(seconds=perf_counter() - start)))

    @on(Drafted)
    def drafted(self, message: Drafted) -> None:
        self.busy(None)
        self.apply(lambda s: message.events, message.done, message.base)

    @on(EngineFailed)
    def engine_failed(self, message: EngineFailed) -> None:
        self.busy(None)
        self.notify(message.problem, severity="error", timeout=10)

    # -- overrides -------------------------------------------------------------------------

    def draft_round(self) -> Round | None:
        rnd = self.state.last_round
        if rnd is None or rnd.state is not RoundState.DRAFT:
            self.notify("no open draft: press n to draft the next round", severity="warning")
            return None
        return rnd

    def start_preview(self, spec: ov.PlanSpec, base: int) -> None:
        title = ov.make_plan(self.state, spec).title
        self.busy(f"{title}: working out the cost …")
        self.engine(self.state, Job("preview", base, plan=spec), title, title)

    @on(Previewed)
    def previewed(self, message: Previewed) -> None:
        self.busy(None)
        spec, base, title = message.spec, message.base, message.title

        def check(values: dict[str, str]) -> str | None:
            return None if values["reason"].strip() else "an override needs a short reason for the log"

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                self.busy(f"{title}: recording it …")
                self.engine(self.state, Job("record", base, plan=spec, reason=values["reason"]), f"{title}: done",
                            title)

        intro = [title, f"Against the optimum: {message.difference}"]
        open_dialog(self.app, FormDialog("Override", [Field("reason", "Reason (goes into the log)")], check, intro),
                             done)

    def _board_plan(self, kind: str) -> None:
        rnd, board = self.draft_round(), self.selected_board()
        if rnd is None or board is None:
            return
        self.start_preview((kind, (str(board),)), self.shown_head)

    def action_pin(self) -> None:
        self._board_plan("pin")

    def action_forbid(self) -> None:
        self._board_plan("forbid")

    def _ask_players(self, title: str, labels: Sequence[str], kind: str) -> None:
        rnd, board = self.draft_round(), self.selected_board()
        if rnd is None:
            return
        game = rnd.game_on(board) if board is not None else None
        base = self.shown_head
        found: list[PlayerId] = []

        def check(values: dict[str, str]) -> str | None:
            found.clear()
            try:
                found.extend(actions.find_player(self.state, values[f"p{i}"]) for i in range(len(labels)))
            except InputError as exc:
                return str(exc)
            if len(set(found)) != len(found):
                return "give two different players"
            return None

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                self.start_preview((kind, tuple(found)), base)

        first = prefill(self.state, game.first) if game is not None else ""
        fields = [Field(f"p{i}", label, first if i == 0 else "", "id or name") for i, label in enumerate(labels)]
        open_dialog(self.app, FormDialog(title, fields, check), done)

    def action_swap(self) -> None:
        self._ask_players("Swap two players", ["Player", "Swap with"], "swap")

    def action_bye(self) -> None:
        self._ask_players("Move a player to or from the bye", ["Player"], "bye")

    def action_discard(self) -> None:
        rnd = self.draft_round()
        if rnd is None:
            return
        base = self.shown_head

        def done(values: dict[str, str] | None) -> None:
            if values is not None:
                self.apply(lambda s: actions.discard(s, values["reason"]), f"draft of round {rnd.number} discarded",
                           base)

        open_dialog(self.app, FormDialog(f"Discard the draft of round {rnd.number}",
                                        [Field("reason", "Reason (optional)")]), done)

    def action_publish(self) -> None:
        rnd = self.draft_round()
        if rnd is None:
            return
        state, base = self.state, self.shown_head
        lines = [
            f"board {g.board}: {', '.join(open_flags(g.flags))} ({name(state, g.first)} – {name(state, g.second)})"
            for g in flagged_games(rnd)
        ]
        lines = [f"Flags still open: {len(lines)}"] + lines if lines else ["No flags open."]
        lines += [f"bye: {name(state, y.player)} ({y.kind.value})" for y in rnd.byes]

        stale = actions.stale_draft(state)
        if stale:
            self.notify(f"the draft of round {rnd.number} is out of date ({'; '.join(stale[:3])}): press n to pair "
                        "again", severity="error", timeout=10)
            return
        breaches = actions.override_breaches(state)
        if breaches:
            def accepted(values: dict[str, str] | None) -> None:
                if values is not None:
                    self.apply(lambda s: actions.publish(s, values["reason"]), f"round {rnd.number} published", base)

            intro = ["Your changes break a hard rule the engine's pairing keeps:", *breaches]
            open_dialog(self.app, FormDialog(f"Publish round {rnd.number} anyway?",
                                             [Field("reason", "Reason for accepting it (goes into the log)")],
                                             lambda v: None if v["reason"].strip() else "give a reason", intro),
                        accepted)
            return

        def done(yes: bool | None) -> None:
            if yes:
                self.apply(actions.publish, f"round {rnd.number} published", base)

        open_dialog(self.app, ConfirmDialog(f"Publish round {rnd.number} ({len(rnd.games)} boards)?", lines), done)
