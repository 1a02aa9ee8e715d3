"""The places' smaller promises: the Roster filter, the Log's newest entry, names in the swap dialog."""

from __future__ import annotations

import asyncio
from pathlib import Path

from pairings import actions
from pairings.store import EventStore
from pairings.tui.app import DeskApp
from pairings.tui.grid import Grid
from tests.tui.desk_support import settle, type_text

# Invented names and clubs.
ROSTER = [("Zoë Quillfeather", "Tarnside"), ("Anders Ångström", "Nordvik"), ("Brisa Bray", "Old Mill"),
          ("Corvin Cole", "Tarnside")]


def roster_event(path: Path) -> EventStore:
    store = EventStore.create(path, actions.new_event("Test Open", 3, seed=7))
    for name, club in ROSTER:
        store.append(actions.add_player(store.state, name, None, club))
    return store


def test_roster_filter_ignores_accents_and_matches_ids_and_clubs(tmp_path: Path) -> None:
    store = roster_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(80, 24)) as pilot:
            grid = app.screen.query_one("#players", Grid)

            async def shown(text: str) -> list[str]:
                await pilot.press("slash", "ctrl+a", "ctrl+k")
                await type_text(pilot, text)
                await settle(app, pilot)
                return [grid.cell(grid._keys[i], "name") for i in range(grid.row_count)]

            assert await shown("Zoe") == ["Zoë Quillfeather"]
            assert await shown("angstrom") == ["Anders Ångström"]
            assert await shown("tarnside") == ["Zoë Quillfeather", "Corvin Cole"]
            assert await shown("p3") == ["Brisa Bray"]
            assert await shown("OLD MILL") == ["Brisa Bray"]

    asyncio.run(run())
