"""The Grid builds only the rows it draws, sizes columns from the widths it is given, and keeps its cursor."""

from __future__ import annotations

import asyncio

from textual.app import App, ComposeResult

from pairings.tui.grid import Column, Grid


class OneGrid(App[None]):
    def compose(self) -> ComposeResult:
        yield Grid(id="g")


def test_ten_thousand_rows_build_only_the_visible_ones() -> None:
    made: list[int] = []

    def row(i: int) -> tuple[str, ...]:
        made.append(i)
        return (str(i), f"name {i}\x1b[31m", "x" * (i % 7))

    async def run() -> None:
        app = OneGrid()
        async with app.run_test(size=(60, 20)) as pilot:
            grid = app.query_one(Grid)
            grid.set_columns([Column("n", "N", limit=6), Column("name", "Name", flex=True), Column("x", "X", limit=4)])
            keys = [str(i) for i in range(10_000)]
            grid.set_source(keys, row, [5, 15, None])
            await pilot.pause()
            assert grid.row_count == 10_000
            assert len(set(made)) <= 20  # the rows on a 20-line screen, not ten thousand
            assert grid._widths == [5, 15, 4]  # the flex column as wide as its longest cell, the other to its limit
            grid.focus()
            await pilot.press("end")
            await pilot.pause()
            assert grid.cursor_key == "9999"
            assert len(set(made)) <= 40
            assert grid.cell("9999", "name") == "name 9999"  # cleaned of its escape sequence
            grid.update_cell("9999", "x", "new")
            assert grid.cell("9999", "x") == "new"
            assert grid.index_of("5000") == 5000 and grid.index_of("nobody") is None
            grid.remake(lambda i: (str(i), "again", ""))
            assert grid.cell("9999", "name") == "again"
            grid.set_source(keys[:3], row, [1, 100, 1])
            assert grid.cursor == 2  # kept inside the new rows
            assert grid._widths == [1, 60 - 1 - 1 - 3 - 2, 1]  # at most what the other columns leave

    asyncio.run(run())
