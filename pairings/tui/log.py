"""The Log: the event's history, one readable line per event, with undo of the latest action."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable, Label

from pairings import actions
from pairings.events import Undone
from pairings.logtext import describe
from pairings.state import EventState
from pairings.store import undo_target
from pairings.tui.base import Place
from pairings.tui.dialogs import ConfirmDialog
from pairings.tui.text import cell


class LogPlace(Place):
    TITLE = "Log"
    BINDINGS = [Binding("u", "undo", "Undo last action")]

    def __init__(self) -> None:
        super().__init__()
        self._rows = 0
        """Events in the table; new ones are appended, not redrawn."""

    def body(self) -> ComposeResult:
        yield Label("", id="log-status", classes="status")
        table: DataTable[object] = DataTable(id="events", cursor_type="row", zebra_stripes=True)
        yield table

    def on_mount(self) -> None:
        table = self.query_one("#events", DataTable)
        for label, key in (("#", "seq"), ("When", "when"), ("What", "what"), ("", "undone")):
            table.add_column(label, key=key)
        table.focus()

    def show(self, state: EventState) -> None:
        log = self.desk.store.log
        table = self.query_one("#events", DataTable)
        undone = {s.event.target for s in log if isinstance(s.event, Undone)}
        if len(log) < self._rows:
            table.clear()
            self._rows = 0
        for s in log[self._rows:]:
            table.add_row(str(s.seq), s.recorded_at[:19].replace("T", " "), cell(describe(s.event)), "",
                          key=str(s.seq))
        for seq in undone:
            if table.get_cell(str(seq), "undone") != "undone":
                table.update_cell(str(seq), "undone", "undone")
        self._rows = len(log)
        target = undo_target(log)
        self.query_one("#log-status", Label).update(cell(
            f"{len(log)} events · u undoes: {describe(target.event)}" if target else f"{len(log)} events · nothing to undo"))
        table.move_cursor(row=table.row_count - 1)

    def action_undo(self) -> None:
        log, base = self.desk.store.log, self.shown_head
        target = undo_target(log)
        if target is None:
            self.notify("nothing to undo", severity="warning")
            return

        def done(yes: bool | None) -> None:
            if yes:
                self.apply(lambda s: actions.undo(self.desk.store.log), f"undone: {describe(target.event)}", base)

        self.app.push_screen(ConfirmDialog("Undo this action?", [f"{target.seq}: {describe(target.event)}"]), done)

