"""The desk's side of issue 15: arbiter results by key, the no-show question, corrections under a
later round, hard-rule breaches of an override at publish, and late entrants in the standings."""

from __future__ import annotations

import asyncio
from functools import partial
from pathlib import Path

import pytest

from pairings import actions
from pairings.state import Result, RoundState
from pairings.store import EventStore
from pairings.tui.app import DeskApp
from pairings.tui.dialogs import ConfirmDialog, FormDialog
from textual.widgets import Label

from pairings.tui.grid import Grid
from tests.tui.desk_support import Notes, new_event, settle, type_text


def played_round(store: EventStore, *results: str) -> None:
    store.apply(lambda s: actions.pair(s))
    store.apply(actions.publish)
    for board, result in enumerate(results, 1):
        store.apply(partial(actions.record_result, board=board, result=result))


def test_arbiter_results_by_key_and_the_no_show_question(tmp_path: Path) -> None:
    store = new_event(tmp_path / "desk.pairings", players=4)
    store.apply(lambda s: actions.add_player(s, "Fenna Ford", 1500))
    store.apply(lambda s: actions.add_player(s, "Gil Grove", 1450))
    store.apply(lambda s: actions.pair(s))
    store.apply(actions.publish)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="results")
        async with app.run_test(size=(100, 32)) as pilot:
            notes = Notes(app)
            await pilot.press("1", "x", "2", "h", "3", "j")
            rnd = app.state.rounds[0]
            assert [g.result for g in rnd.games] == [
                Result.DOUBLE_FORFEIT, Result.FIRST_HALF_SECOND_LOSES, Result.FIRST_LOSES_SECOND_HALF], notes.messages
            await pilot.press("f3", "n")
            assert isinstance(app.screen, ConfirmDialog)  # board 1's first player
            # Esc is no answer: nothing recorded, no draft (it used to withdraw the player and draft).
            head = app.state.head
            await pilot.press("escape")
            await settle(app, pilot)
            assert not isinstance(app.screen, ConfirmDialog) and app.state.head == head, notes.messages
            assert app.state.players[rnd.games[0].first].withdrawn_from is None and len(app.state.rounds) == 1
            await pilot.press("n")
            assert isinstance(app.screen, ConfirmDialog)
            assert "Esc: cancel" in str(app.screen.query_one("#confirm-keys", Label).content)
            await pilot.press("y")
            assert isinstance(app.screen, ConfirmDialog)  # board 1's second player
            await pilot.press("n")
            await settle(app, pilot)
            first, second = rnd.games[0].first, rnd.games[0].second
            assert (first, 1) in app.state.kept_after_no_show
            assert app.state.players[second].withdrawn_from == 2
            last = app.state.last_round
            assert last is not None and last.number == 2 and last.state is RoundState.DRAFT, notes.messages

    asyncio.run(run())


def test_a_correction_under_a_later_round_asks_for_a_reason_and_marks_it(tmp_path: Path) -> None:
    store = new_event(tmp_path / "desk.pairings", players=4)
    played_round(store, "1-0", "1-0")
    store.apply(lambda s: actions.pair(s))

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="results")
        async with app.run_test(size=(100, 32)) as pilot:
            notes = Notes(app)
            await pilot.press("1", "s")
            assert isinstance(app.screen, FormDialog), notes.messages
            await type_text(pilot, "scoresheet misread")
            await pilot.press("enter")
            await settle(app, pilot)
            assert app.state.rounds[0].game_on(1).result is Result.SECOND_WINS  # type: ignore[union-attr]
            await pilot.press("f3")
            await settle(app, pilot)
            status = str(app.screen.query_one("#round-status", Label).content)
            assert "paired on scores since corrected" in status
            await pilot.press("p")
            assert "out of date" in notes.last() and "paired before the correction" in notes.last()

    asyncio.run(run())


def test_publishing_an_override_that_breaks_a_hard_rule_asks_for_a_reason(tmp_path: Path) -> None:
    store = new_event(tmp_path / "desk.pairings", players=4)
    played_round(store, "1-0", "1-0")
    store.apply(lambda s: actions.pair(s))
    met = store.state.rounds[0].games[0]
    board = actions.draft_of(store.state).board_of(met.first)
    assert board is not None
    opponent = board.second if board.first == met.first else board.first
    # Swap round 1's board-1 loser in for the winner's new opponent: the two meet again (H1).
    store.apply(lambda s: actions.swap(s, met.second, opponent, "test"))
    assert actions.override_breaches(store.state)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="round")
        async with app.run_test(size=(100, 32)) as pilot:
            await pilot.press("p")
            assert isinstance(app.screen, FormDialog)
            await type_text(pilot, "agreed by both")
            await pilot.press("enter")
            await settle(app, pilot)
            assert app.state.rounds[1].state is RoundState.PUBLISHED
            assert app.state.rounds[1].accepted == "agreed by both"

    asyncio.run(run())


def test_a_late_entrant_is_in_the_desks_standings(tmp_path: Path) -> None:
    store = new_event(tmp_path / "desk.pairings", players=4)
    played_round(store, "1-0", "1-0")
    store.apply(lambda s: actions.add_player(s, "Fenna Ford", 1500))

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="standings")
        async with app.run_test(size=(100, 32)) as pilot:
            await settle(app, pilot)
            grid = app.screen.query_one("#standings", Grid)
            assert grid.row_count == 5
            # No virtual opponent for round 1, before Fenna entered (it would add 0 + 1 + 0.5 * 0 = 1).
            assert grid.cell("p5", "BH") == "0" and grid.cell("p5", "points") == "0"

    asyncio.run(run())


def test_the_desk_refuses_to_import_a_roster_twice(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(tmp_path)  # the roster's name typed alone: each key of a long path costs a redraw
    store = new_event(tmp_path / "desk.pairings")
    roster = tmp_path / "roster.csv"
    roster.write_text("name,rating\nAnsel Ash,1910\nBrisa Bray,1785\n", encoding="utf-8")

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(100, 32)) as pilot:
            for _ in range(2):
                await pilot.press("i")
                await type_text(pilot, roster.name)
                await pilot.press("enter")
                await settle(app, pilot)
            assert len(app.state.players) == 2
            assert isinstance(app.screen, FormDialog)
            assert "likely duplicates" in str(app.screen.query_one("#problem", Label).content)

    asyncio.run(run())
