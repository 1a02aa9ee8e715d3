"""Overrides in the Round place, the publish check, undo, stale-state refusal and small terminals."""

from __future__ import annotations

import asyncio
from pathlib import Path

from pairings import actions
from pairings import events as ev
from pairings.state import ByeKind, RoundState
from pairings.store import EventStore
from pairings.tui.app import DeskApp
from pairings.tui.dialogs import ConfirmDialog, FormDialog, HelpDialog
from pairings.tui.text import safe
from tests.tui.desk_support import Notes, new_event, settle, type_text


async def give_reason(app: DeskApp, pilot: object, reason: str) -> list[str]:
    """Answer the override's reason dialog; returns its intro lines (title, cost difference)."""
    await settle(app, pilot)
    dialog = app.screen
    assert isinstance(dialog, FormDialog)
    intro = [str(w.content) for w in dialog.query(".dialog-intro")]
    await type_text(pilot, reason)
    await pilot.press("enter")  # type: ignore[attr-defined]
    await settle(app, pilot)  # the override is recorded by the engine's worker
    return intro


def test_pin_forbid_bye_discard_each_with_a_reason(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=5)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(100, 32)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None and rnd.state is RoundState.DRAFT and len(rnd.games) == 2

            # Forbid board 1's pair: the re-draft must not hold it.
            pair = {rnd.games[0].first, rnd.games[0].second}
            await pilot.press("f")
            intro = await give_reason(app, pilot, "family")
            assert any(line.startswith("Against the optimum: ") for line in intro)
            rnd = app.state.last_round
            assert rnd.source == "override" and "family" in rnd.notes[-1]
            assert all({g.first, g.second} != pair for g in rnd.games)

            # Pin board 2 and re-pair the rest: the pin survives, flagged.
            kept = (rnd.games[1].first, rnd.games[1].second)
            await pilot.press("down", "k")
            await give_reason(app, pilot, "arbiter")
            rnd = app.state.last_round
            assert any((g.first, g.second) == kept and "pinned" in g.flags for g in rnd.games)

            # Move someone else onto the bye.
            target = next(p for g in rnd.games for p in (g.first, g.second) if p not in kept)
            await pilot.press("b", "ctrl+a", "ctrl+k")
            await type_text(pilot, target)
            await pilot.press("enter")
            await give_reason(app, pilot, "late arrival")
            rnd = app.state.last_round
            assert any(y.player == target and y.kind is ByeKind.PAIRING for y in rnd.byes)

            # An override without a reason is not saved.
            await pilot.press("f")
            await settle(app, pilot)
            await pilot.press("enter")
            assert isinstance(app.screen, FormDialog)
            assert "reason" in str(app.screen.query_one("#problem").content)
            await pilot.press("escape")

            # The publish check lists the flags still open (pinned is the organiser's own).
            await pilot.press("p")
            assert isinstance(app.screen, ConfirmDialog)
            await pilot.press("n")
            assert app.state.last_round.state is RoundState.DRAFT

            await pilot.press("x")
            await type_text(pilot, "start over")
            await pilot.press("enter")
            assert app.state.last_round is None or app.state.last_round.state is not RoundState.DRAFT

            # The Log shows it and undoes the discard after a confirmation.
            await pilot.press("f6", "u")
            assert isinstance(app.screen, ConfirmDialog)
            await pilot.press("y")
            assert app.state.last_round is not None and app.state.last_round.state is RoundState.DRAFT

    asyncio.run(run())
    store.close()


def test_changes_from_another_process_reload_and_stale_actions_are_refused(tmp_path: Path) -> None:
    path = tmp_path / "e.pairings"
    store = new_event(path, players=4)
    store.apply(actions.pair)
    store.apply(actions.publish)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(100, 32)) as pilot:
            notes = Notes(app)
            await pilot.press("f4")
            with EventStore.open(path) as other:  # the command line, meanwhile
                other.apply(lambda s: actions.record_result(s, 1, "1-0"))
            head = store.log[-1].seq
            await pilot.press("2", "d")  # decided on the stale screen
            assert "changed elsewhere, reloaded" in notes.last()
            assert store.log[-1].seq == head + 1  # the other process's result only
            assert app.state.rounds[0].game_on(2).result is None
            assert app.state.rounds[0].game_on(1).result is not None  # and the desk shows it now

            with EventStore.open(path) as other:
                other.apply(lambda s: actions.record_result(s, 2, "0-1"))
            app.poll()
            await pilot.pause()
            assert notes.last() == "changed elsewhere, reloaded"
            assert "0 of 2 boards open" in str(app.screen.query_one("#open-count").content)

    asyncio.run(run())
    store.close()


def test_every_place_and_the_help_work_in_80_by_24(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=5)
    store.apply(actions.pair)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            boards = app.screen.query_one("#boards")
            assert boards.size.width >= 40 and boards.size.height >= 3 and boards.row_count == 2
            why = str(app.screen.query_one("#why-text").content)
            assert "Board 1 of round 1" in why and "Cost by criterion" in why
            for key in ("f2", "f4", "f5", "f6", "f3"):
                await pilot.press(key)
                await settle(app, pilot)
                assert app.screen.query_one("#topline").outer_size.width == 80
            await pilot.press("f1")
            assert isinstance(app.screen, HelpDialog)
            text = " ".join(str(w.content) for w in app.screen.query("Label"))
            for words in ("Draft next", "Swap", "Pin board", "first side wins", "Undo last action", "Print"):
                assert words in text

    asyncio.run(run())
    store.close()


def test_names_with_escape_sequences_are_shown_cleaned(tmp_path: Path) -> None:
    evil = "Mallory\x1b[2J\x1b]0;owned\x07 \x1b[31mRed\u202e"
    store = EventStore.create_from(tmp_path / "e.pairings", [
        actions.new_event("Test Open", 3, seed=7),
        ev.PlayerRegistered(id="p1", name=evil, rating=1500),
        ev.PlayerRegistered(id="p2", name="Plain Name", rating=1400),
    ])

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600, start="roster")
        async with app.run_test(size=(100, 32)) as pilot:
            await settle(app, pilot)
            table = app.screen.query_one("#players")
            shown = table.cell("p1", "name")
            assert shown == "Mallory Red"
            assert all(ord(c) >= 32 for c in shown)

    asyncio.run(run())
    store.close()
    # ECMA-48, from memory: 0x9B is the 8-bit CSI and "d" a final byte, so "\x9bd" is one sequence, removed whole.
    assert safe("a\tb\x00c\x9bd") == "a bc"
    assert safe("a\tb\x00c\x9b") == "a bc"


def test_a_click_on_the_key_line_presses_that_key(tmp_path: Path) -> None:
    store = new_event(tmp_path / "e.pairings", players=4)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(100, 32)) as pilot:
            notes = Notes(app)
            keys = app.screen.query_one("KeyList.keys")
            assert str(keys.content).startswith(" n Draft s Swap")  # the short words: the full ones do not fit
            await pilot.click(keys, offset=(len(" n Draft s Sw"), 0))  # on "Swap": no draft yet
            assert "no open draft" in notes.last() and not isinstance(app.screen, FormDialog)
            # On "Draft next": the notice now covers the keys, and a click on it is a click on the key below.
            await pilot.click(app.screen.query_one("KeyLine"), offset=(3, 0))
            await settle(app, pilot)
            assert app.state.last_round is not None and app.state.last_round.state is RoundState.DRAFT
            await pilot.click(app.screen.query_one("KeyList.palette"), offset=(3, 0))
            await pilot.pause()
            assert type(app.screen).__name__ == "CommandPalette"

    asyncio.run(run())
    store.close()
