"""The Log: the event's history, one readable line per event, with undo of the latest action."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import Label

from pairings import actions
from pairings.events import Undone
from pairings.logtext import describe
from pairings.state import EventState
from pairings.store import undo_target
from pairings.tui.base import Place
from pairings.tui.dialogs import ConfirmDialog, open_dialog
from pairings.tui.grid import Column, Grid
from pairings.tui.text import cell


class LogPlace(Place):
    TITLE = "Log"
    BINDINGS = [Binding("u", "undo", "Undo last action")]

    def body(self) -> ComposeResult:
        yield Label("", id="log-status", classes="status")
        yield Grid(id="events")

    def on_mount(self) -> None:
        grid = self.query_one("#events", Grid)
        grid.set_columns([Column("seq", "#", limit=7), Column("when", "When", 19), Column("what", "What", flex=True,
                          limit=200), Column("undone", "", 6)])
        grid.focus()

    def show(self, state: EventState) -> None:
        log = self.desk.store.log
        grid = self.query_one("#events", Grid)
        undone = {s.event.target for s in log if isinstance(s.event, Undone)}

        def row(i: int) -> tuple[str, ...]:
            s = log[i]
            return (str(s.seq), s.recorded_at[:19].replace("T", " "), describe(s.event),
                    "undone" if s.seq in undone else "")

        keys = [str(s.seq) for s in log]
        grid.set_source(keys, row, [len(keys[-1]) if keys else 0, 19, None, 6], cursor=len(log) - 1)
        target = undo_target(log)
        self.query_one("#log-status", Label).update(cell(
            f"{len(log)} events · u undoes: {describe(target.event)}" if target else f"{len(log)} events · nothing to undo"))

    def action_undo(self) -> None:
        log, base = self.desk.store.log, self.shown_head
        target = undo_target(log)
        if target is None:
            self.notify("nothing to undo", severity="warning")
            return

        def done(yes: bool | None) -> None:
            if yes:
                self.apply(lambda s: actions.undo(self.desk.store.log), f"undone: {describe(target.event)}", base)

        open_dialog(self.app, ConfirmDialog("Undo this action?", [f"{target.seq}: {describe(target.event)}"]), done)

