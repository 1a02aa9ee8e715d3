"""A whole 3-round event driven through the desk by keyboard, checked against the command line.

The same actions are then replayed through the command line (``pairings.cli.main``,
in this process) on a second file; the two events' interchange documents must be equal.
"""

from __future__ import annotations

import asyncio
import json
from pathlib import Path

from pairings import actions
from pairings.interchange import export_event
from pairings.state import RoundState
from pairings.store import EventStore
from pairings.tui.app import DeskApp
from pairings.tui.dialogs import ConfirmDialog, FormDialog
from tests.cli.conftest import run_in_process
from tests.tui.desk_support import PLAYERS, Notes, new_event, press_keys, settle, type_text


def cli(*args: object) -> str:
    ran = run_in_process(*args)
    assert ran.code == 0, ran.err
    return ran.out


async def drive(path: Path, sheet: Path) -> tuple[dict[str, object], list[list[object]]]:
    """Run the event in the desk; returns its export and the command lines that redo it."""
    store = new_event(path)
    app = DeskApp(store, poll_seconds=3600)
    commands: list[list[object]] = []
    async with app.run_test(size=(100, 32)) as pilot:
        notes = Notes(app)
        await pilot.press("f2")
        for name, rating, club in PLAYERS:
            await pilot.press("a")
            assert isinstance(app.screen, FormDialog)
            await type_text(pilot, name)
            await pilot.press("enter")
            await type_text(pilot, rating)
            await pilot.press("enter")
            await type_text(pilot, club)
            await pilot.press("enter")
            args: list[object] = ["player", "add", "E", "--name", name]
            args += ["--rating", rating] if rating else []
            args += ["--club", club] if club else []
            commands.append(args)
        assert [p.name for p in app.state.players.values()] == [p[0] for p in PLAYERS]

        # A bad rating is refused inside the form, with the action's own message.
        await pilot.press("a")
        await type_text(pilot, "Fenna")
        await pilot.press("enter")
        await type_text(pilot, "99999")
        await pilot.press("enter", "enter")
        assert isinstance(app.screen, FormDialog)
        assert "outside 0-4000" in str(app.screen.query_one("#problem").content)
        await pilot.press("escape")
        assert len(app.state.players) == len(PLAYERS)

        plans = [["f", "d"], ["2", "d", "x"], ["-", "+"]]
        for number, keys in enumerate(plans, 1):
            await pilot.press("f3", "n")
            kept = []
            while isinstance(app.screen, ConfirmDialog):  # round 2's double forfeit: keep both players in
                kept += ["--keep", app.state.players[actions.no_shows(app.state)[0]].name]
                await pilot.press("y")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None and rnd.number == number and rnd.state is RoundState.DRAFT
            assert len(kept) == (4 if number == 3 else 0)
            commands.append(["pair", "E", *kept])
            if number == 1:
                a, b = rnd.games[0].first, rnd.games[1].second
                await pilot.press("s")
                await pilot.press("ctrl+a", "ctrl+k")  # the first field holds board 1's first player
                await type_text(pilot, a)
                await pilot.press("enter")
                await type_text(pilot, b)
                await pilot.press("enter")
                await settle(app, pilot)
                dialog = app.screen
                assert isinstance(dialog, FormDialog), notes.messages
                intro = [str(w.content) for w in dialog.query(".dialog-intro")]
                assert any("Against the optimum" in line for line in intro), (dialog._c_title, dialog.values(), str(dialog.query_one("#problem").content))
                await type_text(pilot, "club mates")
                await pilot.press("enter")
                await settle(app, pilot)  # the override is recorded by the engine's worker
                rnd = app.state.last_round
                assert rnd is not None and rnd.source == "override" and "club mates" in rnd.notes[-1]
                commands.append(["swap", "E", a, b, "--reason", "club mates"])
            await pilot.press("p")
            assert isinstance(app.screen, ConfirmDialog)
            await pilot.press("y")
            assert app.state.rounds[number - 1].state is RoundState.PUBLISHED
            commands.append(["publish", "E"])

            await pilot.press("f4")
            for key in keys:
                await pilot.press(key)
            rnd = app.state.rounds[number - 1]
            assert rnd.state is RoundState.COMPLETE, (rnd, notes.messages)
            commands += [["result", "E", g.board, g.result.value] for g in rnd.games if g.result]
            assert "0 of" in str(app.screen.query_one("#open-count").content)

        # A correction asks first; board 1 of round 3 becomes a second-side win.
        await pilot.press("1", "d")
        assert isinstance(app.screen, ConfirmDialog)
        await pilot.press("y")
        assert app.state.rounds[2].game_on(1).result.value == "1/2-1/2"
        commands.append(["result", "E", 1, "1/2-1/2", "--correct"])

        await pilot.press("f5")
        await settle(app, pilot)
        table = app.screen.query_one("#standings")
        assert table.row_count == len(PLAYERS)
        assert "After round 3" in str(app.screen.query_one("#standings-status").content)

        await pilot.press("f7")
        assert isinstance(app.screen, FormDialog)
        await pilot.press("enter")           # pairings
        await press_keys(pilot, "json")  # the choice follows the letters typed
        await pilot.press("enter", "enter")  # the latest round
        await type_text(pilot, str(sheet))
        await pilot.press("enter")
        await settle(app, pilot)
        assert app.last_output == sheet, notes.messages
        assert any(str(sheet) in m for m in notes.messages)
        exported = export_event(app.state)
    store.close()
    return exported, commands


def test_whole_event_through_the_desk_equals_the_command_line(tmp_path: Path) -> None:
    sheet = tmp_path / "round3-pairings.json"
    desk_doc, commands = asyncio.run(drive(tmp_path / "desk.pairings", sheet))
    doc = json.loads(sheet.read_text(encoding="utf-8"))
    assert doc  # the pairing sheet is real JSON from the reports

    other = tmp_path / "cli.pairings"
    cli("new", other, "--name", "Test Open", "--rounds", "3", "--seed", "7")
    for args in commands:
        cli(*[other if a == "E" else a for a in args])
    cli_doc = json.loads(cli("export", other))
    assert desk_doc == cli_doc
    with EventStore.open(other) as store:
        assert len(store.state.rounds) == 3
