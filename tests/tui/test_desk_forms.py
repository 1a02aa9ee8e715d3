"""Forms under fast typing: a second Enter does nothing, keys land in the field they were typed for."""

from __future__ import annotations

import asyncio
from pathlib import Path

from pairings.state import PlayerId, RoundState, Status
from pairings.tui.app import DeskApp
from pairings.tui.roster import RosterPlace
from pairings.tui.round import RoundPlace
from tests.tui.desk_support import burst, new_event, settle


def test_double_enter_in_a_form_submits_once(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=3)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(80, 24)) as pilot:
            first = store.state.players[PlayerId("p1")].name
            burst(app, "w", "enter", "enter")
            await settle(app, pilot)
            assert isinstance(app.screen, RosterPlace)  # the desk is still there (it used to exit)
            assert app.state.players[PlayerId("p1")].status is Status.WITHDRAWN, first
            assert len(store.log) == 5  # created, three players, one withdrawal: not two

    asyncio.run(run())


def test_fast_typing_lands_in_the_field_it_was_typed_for(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(80, 24)) as pilot:
            burst(app, "a", *"Test Typeahead", "enter", *"1234", "enter", *"Some Club", "enter", "enter")
            await settle(app, pilot)
            assert isinstance(app.screen, RosterPlace), app.screen.values()  # type: ignore[attr-defined]
            players = list(app.state.players.values())
            assert [(p.name, p.rating, p.club) for p in players] == [("Test Typeahead", 1234, "Some Club")]
            # The same once the form's widgets exist already (the dialog is kept and refilled).
            burst(app, "a", *"Second Entry", "enter", "enter", *"Other Club", "enter")
            await settle(app, pilot)
            players = list(app.state.players.values())
            assert [(p.name, p.rating, p.club) for p in players][1:] == [("Second Entry", None, "Other Club")]

    asyncio.run(run())


def test_double_enter_on_a_question_answers_once(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=4)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            before = len(store.log)
            burst(app, "p", "enter", "enter")
            await settle(app, pilot)
            assert isinstance(app.screen, RoundPlace)
            assert len(store.log) == before + 1  # published once
            assert app.state.last_round is not None and app.state.last_round.state is RoundState.PUBLISHED

    asyncio.run(run())
