"""Standings: ranks, points and the event's tiebreaks (computed by pairings.standings in a worker).

``c`` steps through the prize categories (the overall list first), ``z`` shows
the prize list instead of the standings and back.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, ClassVar

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding, BindingType
from textual.message import Message
from textual.widgets import Label
from textual.worker import get_current_worker

from pairings.errors import InputError
from pairings.state import EventState
from pairings.tui.base import Place
from pairings.tui.grid import Column, Grid
from pairings.tui.text import cell, points, safe, widest

if TYPE_CHECKING:  # standings and prizes load in the worker
    from pairings.prizes import PrizeList
    from pairings.standings import Standings, StandingsRow


class StandingsPlace(Place):
    TITLE = "Standings"
    BINDINGS: ClassVar[list[BindingType]] = [
        Binding("c", "next_category", "Category"),
        Binding("z", "toggle_prizes", "Prizes"),
    ]

    category: str | None = None
    """The prize category shown (None: the overall standings)."""
    prizes: bool = False
    """Showing the prize list instead of the standings."""

    @dataclass
    class Computed(Message):
        head: int
        table: "Standings | None"
        rows: "tuple[StandingsRow, ...]" = ()
        prize_list: "PrizeList | None" = None
        problem: str = ""

    def body(self) -> ComposeResult:
        yield Label("", id="standings-status", classes="status")
        yield Grid(id="standings")
        yield Label("", id="standings-legend", classes="status")

    def on_mount(self) -> None:
        self.query_one("#standings", Grid).focus()

    def show(self, state: EventState) -> None:
        if self.category is not None and self.category not in state.categories:
            self.category = None
        self.query_one("#standings-status", Label).update("working out the standings …")
        self.compute(state, self.category, self.prizes)

    def action_next_category(self) -> None:
        names: list[str | None] = [None, *self.state.categories]
        self.category = names[(names.index(self.category) + 1) % len(names)]
        self.prizes = False
        self.show(self.state)

    def action_toggle_prizes(self) -> None:
        self.prizes = not self.prizes
        self.show(self.state)

    @work(thread=True, exclusive=True, group="standings", description="work out the standings")
    def compute(self, state: EventState, category: str | None, prizes: bool) -> None:
        from pairings.categories import members
        from pairings.prizes import prize_list
        from pairings.standings import category_rows, standings

        try:
            if prizes:
                if not state.prizes:
                    raise InputError("no prizes defined yet: add them with `pairings prize add`")
                found = prize_list(state)
                message = self.Computed(state.head, found.table, found.table.rows, found)
            else:
                table = standings(state)
                rows = table.rows if category is None else category_rows(
                    table, members(state, state.categories[category]))
                message = self.Computed(state.head, table, rows)
        except InputError as exc:
            message = self.Computed(state.head, None, problem=str(exc))
        if not get_current_worker().is_cancelled:
            self.post_message(message)

    @on(Computed)
    def computed(self, message: Computed) -> None:
        if message.head != self.state.head:
            return
        from pairings.standings import UNPLAYED_LABELS, legend

        status = self.query_one("#standings-status", Label)
        grid = self.query_one("#standings", Grid)
        st = message.table
        if st is None:
            grid.set_rows([])
            status.update(cell(message.problem))
            self.query_one("#standings-legend", Label).update("")
            return
        note = "provisional: results still open" if st.provisional else "final for this round"
        what = "Prize list" if message.prize_list else self.category or "Overall"
        status.update(cell(f"{what} · After round {st.after_round} ({note}); {UNPLAYED_LABELS[st.unplayed]}"
                           " · c category · z prizes"))
        self.query_one("#standings-legend", Label).update(cell(" · ".join(legend(st.tiebreaks))))
        if message.prize_list is not None:
            self._show_prizes(grid, message.prize_list)
            return
        grid.set_columns([Column("rank", "Rank", limit=9), Column("name", "Name", flex=True),
                          Column("points", "Points", 6)]
                         + [Column(key, key, limit=8) for key in st.tiebreaks]
                         + [Column("status", "Status", 9)])
        rows = message.rows

        def row(i: int) -> tuple[str, ...]:
            r = rows[i]
            return (str(r.rank), r.name, points(r.points), *(points(r.tiebreaks[k]) for k in st.tiebreaks),
                    "withdrawn" if r.withdrawn else "")

        grid.set_source([r.player for r in rows], row, [
            widest(str(r.rank) for r in rows), widest(r.name for r in rows), 6, *(widest(points(r.tiebreaks[k]) for r in rows) for k in st.tiebreaks), 9,
        ])

    def _show_prizes(self, grid: Grid, found: "PrizeList") -> None:
        from pairings.prizes import format_amount

        players = self.state.players
        grid.set_columns([Column("list", "List", limit=20), Column("place", "Place", limit=7),
                          Column("name", "Name", flex=True), Column("points", "Points", 6),
                          Column("prize", "Prize", limit=16), Column("note", "Note", limit=30)])
        grid.set_rows([
            (f"{a.category}-{a.place}-{a.player}", (a.category or "Overall", a.place.replace("-", "–"),
                                                    players[a.player].name if a.player else "—",
                                                    points(a.points), format_amount(a.amount, found.policy), a.note))
            for a in found.awards
        ])
