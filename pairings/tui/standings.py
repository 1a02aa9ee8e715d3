"""Standings: ranks, points and the event's tiebreaks (computed by pairings.standings in a worker)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, ClassVar

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.binding import BindingType
from textual.message import Message
from textual.widgets import Label
from textual.worker import get_current_worker

from pairings.errors import InputError
from pairings.state import EventState
from pairings.tui.base import Place
from pairings.tui.grid import Column, Grid
from pairings.tui.text import cell, points, safe, widest

if TYPE_CHECKING:  # standings loads in the worker
    from pairings.standings import Standings


class StandingsPlace(Place):
    TITLE = "Standings"
    BINDINGS: ClassVar[list[BindingType]] = []

    @dataclass
    class Computed(Message):
        head: int
        table: "Standings | None"
        problem: str = ""

    def body(self) -> ComposeResult:
        yield Label("", id="standings-status", classes="status")
        yield Grid(id="standings")

    def on_mount(self) -> None:
        self.query_one("#standings", Grid).focus()

    def show(self, state: EventState) -> None:
        self.query_one("#standings-status", Label).update("working out the standings …")
        self.compute(state)

    @work(thread=True, exclusive=True, group="standings", description="work out the standings")
    def compute(self, state: EventState) -> None:
        from pairings.standings import standings

        try:
            table, problem = standings(state), ""
        except InputError as exc:
            table, problem = None, str(exc)
        if not get_current_worker().is_cancelled:
            self.post_message(self.Computed(state.head, table, problem))

    @on(Computed)
    def computed(self, message: Computed) -> None:
        if message.head != self.state.head:
            return
        from pairings.standings import TIEBREAKS, UNPLAYED_LABELS

        status = self.query_one("#standings-status", Label)
        grid = self.query_one("#standings", Grid)
        st = message.table
        if st is None:
            grid.set_rows([])
            status.update(cell(message.problem))
            return
        note = "provisional: results still open" if st.provisional else "final for this round"
        status.update(Text(safe(f"After round {st.after_round} ({note}); tiebreaks count "
                                f"{UNPLAYED_LABELS[st.unplayed]}")))  # two lines in 80 columns
        grid.set_columns([Column("rank", "Rank", limit=9), Column("name", "Name", flex=True),
                          Column("points", "Points", 6)]
                         + [Column(key, TIEBREAKS[key].short, limit=8) for key in st.tiebreaks]
                         + [Column("status", "Status", 9)])
        rows = st.rows

        def row(i: int) -> tuple[str, ...]:
            r = rows[i]
            return (str(r.rank), r.name, points(r.points), *(f"{r.tiebreaks[k]:g}" for k in st.tiebreaks),
                    "withdrawn" if r.withdrawn else "")

        grid.set_source([r.player for r in rows], row, [
            widest(str(r.rank) for r in rows), widest(r.name for r in rows), 6, *(widest(f"{r.tiebreaks[k]:g}" for r in rows) for k in st.tiebreaks), 9,
        ])
