"""The Settings place (F8) and the player details of the Roster's form, driven with the pilot."""

from __future__ import annotations

import asyncio
from pathlib import Path

import pytest
from textual.widgets import Input, Label, Select

from pairings import actions
from pairings.state import Acceleration, RoundState, System
from pairings.tui.app import DeskApp
from pairings.tui.dialogs import FormDialog
from tests.tui.desk_support import Notes, new_event, settle, type_text


async def _set_input(app: DeskApp, pilot: object, key: str, text: str) -> None:
    field = app.screen.query_one(f"#setting-{key}", Input)
    field.focus()
    field.value = ""
    await type_text(pilot, text)
    await pilot.press("enter")  # type: ignore[attr-defined]
    await settle(app, pilot)


def test_settings_place_changes_each_kind_of_setting(tmp_path: Path) -> None:
    async def drive() -> None:
        store = new_event(tmp_path / "e.pairings", players=5)
        app = DeskApp(store, poll_seconds=60)
        notes = Notes(app)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f8")
            await settle(app, pilot)
            assert app.screen.TITLE == "Settings"
            head = app.state.head
            await _set_input(app, pilot, "name", "Spring Open")
            await _set_input(app, pilot, "rounds", "5")
            await _set_input(app, pilot, "tiebreaks", "bh,WIN")
            await _set_input(app, pilot, "late_entry_points", "0.5")
            await _set_input(app, pilot, "requested_bye_limit", "2")
            s = app.state.settings
            assert (s.name, s.rounds, s.tiebreaks, s.late_entry_points, s.requested_bye_limit) == (
                "Spring Open", 5, ("BH", "WIN"), 0.5, 2), notes.messages
            assert app.state.head == head + 5  # one logged change each

            app.screen.query_one("#setting-system", Select).value = "dutch"
            await settle(app, pilot)
            app.screen.query_one("#setting-acceleration", Select).value = "baku"
            await settle(app, pilot)
            app.screen.query_one("#setting-final_round_side_exception", Select).value = "yes"
            await settle(app, pilot)
            s = app.state.settings
            assert (s.system, s.acceleration, s.final_round_side_exception) == (
                System.DUTCH, Acceleration.BAKU, True), notes.messages

            # A bad value: refused with the reason, the field back at the event's value, nothing written.
            head = app.state.head
            await _set_input(app, pilot, "scoring", "1,2,0")
            assert app.state.head == head
            assert "draws lie between" in notes.last()
            assert app.screen.query_one("#setting-scoring", Input).value == "1,0.5,0"
            assert "not changed" in str(app.screen.query_one("#settings-note", Label).content)
        store.close()

    asyncio.run(drive())


def test_settings_place_refuses_what_would_change_a_published_round(tmp_path: Path) -> None:
    async def drive() -> None:
        store = new_event(tmp_path / "e.pairings", players=4)
        store.apply(actions.pair)
        store.apply(actions.publish)
        app = DeskApp(store, poll_seconds=60)
        notes = Notes(app)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f8")
            await settle(app, pilot)
            head, before = app.state.head, store.path.read_bytes()
            app.screen.query_one("#setting-system", Select).value = "round-robin"
            await settle(app, pilot)
            assert app.state.head == head and app.state.settings.system is System.SWISS
            assert "round 1 is published" in notes.last()
            assert app.screen.query_one("#setting-system", Select).value == "whole-round"
            await _set_input(app, pilot, "bye_points", "0.5")
            assert app.state.head == head and "round 1 is published" in notes.last()
            assert store.path.read_bytes() == before
            # The note says it once ("bye-points not changed: bye-points not changed: ..." before) and whole.
            note = app.screen.query_one("#settings-note", Label)
            said = str(note.content)
            assert said.count("not changed") == 1 and "would change published rounds" in said, said
            assert note.region.height * (note.region.width - 2) >= len(said), (note.region, said)
            # Allowed after publication: the tiebreaks; the standings note says so.
            await _set_input(app, pilot, "tiebreaks", "SB")
            assert app.state.settings.tiebreaks == ("SB",)
            assert app.state.settings.changed_after == ((1, "tiebreaks"),)
            assert app.state.rounds[0].state is RoundState.PUBLISHED
        store.close()

    asyncio.run(drive())


def test_roster_form_takes_player_details(tmp_path: Path) -> None:
    async def drive() -> None:
        store = new_event(tmp_path / "e.pairings")
        app = DeskApp(store, poll_seconds=60, start="roster")
        notes = Notes(app)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("a")
            assert isinstance(app.screen, FormDialog)
            await pilot.pause()
            assert app.screen.query_one("#form-title").region.y >= 0  # the tall form opens at its title (80x24)
            await type_text(pilot, "Orla Penhallow")
            await pilot.press("tab")
            await type_text(pilot, "1600")
            await pilot.press("tab")
            await pilot.press("tab")             # no club
            await type_text(pilot, "wfm")        # title
            await pilot.press("tab")
            await type_text(pilot, "eng")
            await pilot.press("tab", "tab", "tab")
            await type_text(pilot, "1990")       # birth
            await pilot.press("tab")
            await type_text(pilot, "f")
            await pilot.press("tab")
            await type_text(pilot, "fide=1650,national=1700")
            await pilot.press("tab")
            await type_text(pilot, "junior,local")
            await pilot.press("enter")
            await settle(app, pilot)
            (player,) = app.state.players.values()
            d = player.details
            assert (d.title, d.federation, d.birth, d.sex, d.ratings, d.categories) == (
                "WFM", "ENG", "1990", "f", (("fide", 1650), ("national", 1700)), ("junior", "local")), notes.messages

            # Quick entry still saves from the club field, and a bad detail is refused in place.
            await pilot.press("e")
            dialog = app.screen
            assert isinstance(dialog, FormDialog)
            dialog.query_one("#field-4", Input).value = "ENGLAND"
            dialog.query_one("#field-2", Input).focus()
            await pilot.press("enter")
            assert "three-letter code" in str(dialog.query_one("#problem", Label).content)
            await pilot.press("escape")
            assert app.state.players[player.id].details.federation == "ENG"
            rows = app.screen.query_one("#players")
            line = str(rows.render_line(1).text)
            assert "WFM Orla Penhallow" in line and "ENG" in line, line
        store.close()

    asyncio.run(drive())


# Every setting, the text it is changed to in the desk (each one a change from the default). The Baku
# acceleration needs the standard scoring, so it is changed on an event of its own (ALONE).
ALONE = [("acceleration", "baku")]
EVERY = [
    ("name", "Spring Open"), ("rounds", "6"), ("system", "dutch"),
    ("scoring", "3,1,0"), ("bye_points", "2"), ("requested_bye_points", "0"), ("requested_bye_limit", "1"),
    ("requested_bye_last_round", "4"), ("late_entry_points", "1"), ("tiebreaks", "wins"),
    ("unplayed", "as-they-stand"), ("max_meetings", "2"), ("final_round_side_exception", "yes"),
    ("forfeit_is_meeting", "no"),
]


def test_every_setting_changes_from_the_desk_with_one_logged_event(tmp_path: Path) -> None:
    from pairings.regulations import SETTINGS, parse_settings

    assert sorted(k for k, _ in EVERY + ALONE) == sorted(s.key for s in SETTINGS)

    async def drive(name: str, changes: list[tuple[str, str]]) -> None:
        store = new_event(tmp_path / name, players=2)
        app = DeskApp(store, poll_seconds=60)
        notes = Notes(app)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("f8")
            await settle(app, pilot)
            for key, text in changes:
                head = app.state.head
                widget = app.screen.query_one(f"#setting-{key}")
                if isinstance(widget, Select):
                    widget.value = text
                    await settle(app, pilot)
                else:
                    await _set_input(app, pilot, key, text)
                assert app.state.head == head + 1, (key, notes.messages)
                for field, value in parse_settings({key: text}).items():
                    assert getattr(app.state.settings, field) == value, (key, field)
        store.close()

    asyncio.run(drive("every.pairings", EVERY))
    asyncio.run(drive("alone.pairings", ALONE))


def test_roster_import_in_the_desk_names_the_columns_it_does_not_read(tmp_path: Path,
                                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(tmp_path)  # the roster's name typed alone: each key of a long path costs a redraw
    roster = tmp_path / "roster.tsv"
    roster.write_text("Name\tElo\tFed\tShirt size\nAda Quince\t1500.0\tWLS\tM\n", encoding="utf-8")

    async def drive() -> None:
        store = new_event(tmp_path / "e.pairings")
        app = DeskApp(store, poll_seconds=60, start="roster")
        notes = Notes(app)
        async with app.run_test(size=(80, 24)) as pilot:
            await pilot.press("i")
            await type_text(pilot, roster.name)
            await pilot.press("enter")
            await settle(app, pilot)
            (player,) = app.state.players.values()
            assert (player.rating, player.details.federation) == (1500, "WLS")
            assert any("column 4 ('Shirt size') is not read" in m for m in notes.messages), notes.messages
        store.close()

    asyncio.run(drive())
