"""The Log: the event's history, one readable line per event, with undo of the latest action.

It opens at the newest entry; Enter on a row shows the whole entry (a row is cut to the screen's width).
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import Label

from pairings import actions
from pairings.events import Event, Undone
from pairings.logtext import describe, roster_names
from pairings.state import EventState
from pairings.store import StoredEvent, undo_target
from pairings.tui.base import Place
from pairings.tui.dialogs import ConfirmDialog, ReadDialog, open_dialog
from pairings.tui.grid import Column, Grid
from pairings.tui.text import cell


def when(entry: StoredEvent) -> str:
    """When an entry was recorded, to the second, without the year (``12-02 06:39:20``)."""
    return entry.recorded_at[5:19].replace("T", " ")


class LogPlace(Place):
    TITLE = "Log"
    BINDINGS = [Binding("u", "undo", "Undo last action"), Binding("enter", "read", "Read whole", key_display="⏎")]

    def __init__(self) -> None:
        super().__init__()
        self._names: dict[str, str] = {}
        """Player names by id for the entries (the roster as it stands now)."""

    def body(self) -> ComposeResult:
        yield Label("", id="log-status", classes="status")
        yield Grid(id="events")

    def on_mount(self) -> None:
        grid = self.query_one("#events", Grid)
        grid.set_columns([Column("seq", "#", limit=7), Column("when", "When", 14), Column("what", "What", flex=True,
                          limit=200), Column("undone", "", limit=6)])
        grid.focus()

    def describe(self, event: Event) -> str:
        return describe(event, self._names)

    def show(self, state: EventState) -> None:
        log = self.desk.store.log
        grid = self.query_one("#events", Grid)
        undone = {s.event.target for s in log if isinstance(s.event, Undone)}
        self._names = roster_names(state)

        def row(i: int) -> tuple[str, ...]:
            s = log[i]
            return (str(s.seq), when(s), self.describe(s.event), "undone" if s.seq in undone else "")

        keys = [str(s.seq) for s in log]
        grid.set_source(keys, row, [len(keys[-1]) if keys else 0, 14, None, 6 if undone else 0], cursor=len(log) - 1)
        target = undo_target(log)
        self.query_one("#log-status", Label).update(cell(
            f"{len(log)} events · u undoes: {self.describe(target.event)}" if target
            else f"{len(log)} events · nothing to undo"))

    @on(Grid.Selected, "#events")
    def action_read(self) -> None:
        key = self.query_one("#events", Grid).cursor_key
        log = self.desk.store.log
        entry = next((s for s in log if str(s.seq) == key), None) if key is not None else None
        if entry is not None:
            open_dialog(self.app, ReadDialog(f"Event {entry.seq}, {entry.recorded_at[:19].replace('T', ' ')}",
                                             [self.describe(entry.event)]))

    def action_undo(self) -> None:
        log, base = self.desk.store.log, self.shown_head
        target = undo_target(log)
        if target is None:
            self.notify("nothing to undo", severity="warning")
            return

        def done(yes: bool | None) -> None:
            if yes:
                self.apply(lambda s: actions.undo(self.desk.store.log, self._names), f"undone: {self.describe(target.event)}", base)

        open_dialog(self.app, ConfirmDialog("Undo this action?", [f"{target.seq}: {self.describe(target.event)}"]), done)

