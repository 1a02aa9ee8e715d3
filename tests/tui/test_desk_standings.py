"""The desk's Standings place: the C.07 acronyms with their legend, the category selector and the prize list."""

from __future__ import annotations

import asyncio
from pathlib import Path

from pairings import actions
from pairings.categories import define_category, set_member
from pairings.prizes import set_prize
from pairings.tui.app import DeskApp
from pairings.tui.grid import Grid
from tests.tui.desk_support import new_event, settle


def test_category_selector_and_prize_list(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=5)
    store.apply(lambda s: define_category(s, "Juniors", None))
    for who in ("Brisa", "Eamon"):
        store.apply(lambda s, w=who: set_member(s, "Juniors", w, True))
    store.apply(lambda s: set_prize(s, "overall", 1, "100"))
    store.apply(lambda s: set_prize(s, "Juniors", 1, "40"))
    store.apply(actions.pair)
    store.apply(actions.publish)
    for board in (1, 2):
        store.apply(lambda s, b=board: actions.record_result(s, b, "1-0"))

    async def drive() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(120, 32)) as pilot:
            await pilot.press("f5")
            await settle(app, pilot)
            grid = app.screen.query_one("#standings", Grid)
            status = app.screen.query_one("#standings-status")
            assert grid.row_count == 5 and "Overall · After round 1" in str(status.content)
            legend = str(app.screen.query_one("#standings-legend").content)
            assert "BH-C1 = Buchholz, cut 1" in legend and "2023 edition as remembered" in legend
            await pilot.press("c")
            await settle(app, pilot)
            assert grid.row_count == 2 and "Juniors · After round 1" in str(status.content)
            await pilot.press("z")
            await settle(app, pilot)
            assert grid.row_count == 2 and "Prize list" in str(status.content)   # one prize per list
            await pilot.press("c")                                                 # back to the overall list
            await settle(app, pilot)
            assert grid.row_count == 5 and "Overall" in str(status.content)

    asyncio.run(drive())
    store.close()


def test_the_legend_wraps_whole_at_80_columns(tmp_path: Path) -> None:
    """One line cut it at "WIN = Number" at 80 columns (and before the edition even at 120)."""
    store = new_event(tmp_path / "e.pairings", players=5)
    store.apply(actions.pair)
    store.apply(actions.publish)

    async def drive() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f5")
            await settle(app, pilot)
            legend = app.screen.query_one("#standings-legend")
            text = str(legend.content)
            assert "2023 edition as remembered" in text
            room = legend.region.height * (legend.region.width - 2)
            assert room >= len(text), (legend.region, len(text))
            assert app.screen.query_one("#standings", Grid).region.height >= 8

    asyncio.run(drive())
