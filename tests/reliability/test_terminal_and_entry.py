"""Control characters at entry (refused), and through restore into the terminal and the desk (stripped)."""

from __future__ import annotations

import asyncio
import json
import re
from html import unescape
from pathlib import Path

import pytest

from pairings import actions
from pairings.errors import InputError
from pairings.fold import fold
from pairings.interchange import export_event
from pairings.store import EventStore

from .conftest import new_event, snapshot
from .fuzzkit import assert_refused_cleanly, run
from .injection_names import HOSTILE, hostile_events

UNSAFE_ON_TERMINAL = re.compile("[\x00-\x09\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")
CONTROLS = ("\x1b[31mRed", "\x1b]0;t\x07Tess", "Bell\x07", "C1\x9b2J", "Del\x7f", "Nul\x00l", "Back\x08space")
ALLOWED = ("\u202eLeft Right\u202c Ivo", "Emoji 😀♟ Kiri", "<script>alert(1)</script>", "=1+1", "L" * 300)


@pytest.mark.parametrize("name", CONTROLS)
def test_entry_refuses_control_characters(tmp_path: Path, capsys: pytest.CaptureFixture[str], name: str) -> None:
    with new_event(tmp_path / "e.pairings", players=2) as store:
        with pytest.raises(InputError, match="control characters"):
            actions.add_player(store.state, name)
        with pytest.raises(InputError, match="control characters"):
            actions.edit_player(store.state, "p1", name, None, None)
        with pytest.raises(InputError, match="control characters"):
            actions.new_event(name, 3)
    before = snapshot(tmp_path / "e.pairings")
    for argv in (["player", "add", str(tmp_path / "e.pairings"), "--name", name],
                 ["player", "add", str(tmp_path / "e.pairings"), "--name", "Ok Name", "--club", name]):
        assert_refused_cleanly(run(capsys, argv), before, snapshot(tmp_path / "e.pairings"))
    roster = tmp_path / "r.csv"
    roster.write_text(f"name,club\nFine Person,x\n{name},y\n", encoding="utf-8")
    ran = run(capsys, ["player", "import", str(tmp_path / "e.pairings"), str(roster)])
    assert_refused_cleanly(ran, before, snapshot(tmp_path / "e.pairings"))
    assert "control characters" in ran.err or "NUL bytes" in ran.err


@pytest.mark.parametrize("name", ALLOWED)
def test_entry_keeps_marks_emoji_markup_and_300_characters(tmp_path: Path, name: str) -> None:
    with new_event(tmp_path / "e.pairings") as store:
        store.apply(lambda s: actions.add_player(s, name))
        assert store.state.players["p1"].name == name  # type: ignore[index]
        with pytest.raises(InputError, match="longer than 300"):
            actions.add_player(store.state, "L" * 301)


def _restored_hostile(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> Path:
    """An event file whose names never passed the entry check (written by another program, say)."""
    path = tmp_path / "restored.pairings"
    EventStore.create_from(path, hostile_events()).close()
    return path


def test_restore_refuses_control_characters(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    doc = tmp_path / "hostile.json"
    doc.write_text(json.dumps(export_event(fold(enumerate(hostile_events(), 1)))), encoding="utf-8")
    ran = run(capsys, ["restore", str(doc), str(tmp_path / "restored.pairings")])
    assert ran.code == 2 and "control characters" in ran.err, ran
    assert not (tmp_path / "restored.pairings").exists()


def test_hostile_file_keeps_the_names_it_was_given(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    with EventStore.open(_restored_hostile(tmp_path, capsys)) as store:
        assert [p.name for p in store.state.players.values()] == list(HOSTILE)


@pytest.mark.parametrize("command", [["player", "list"], ["log"]])
def test_command_line_output_strips_escapes(tmp_path: Path, capsys: pytest.CaptureFixture[str], command: list[str]) -> None:
    path = _restored_hostile(tmp_path, capsys)
    ran = run(capsys, [*command, str(path)])
    assert ran.code == 0
    assert not UNSAFE_ON_TERMINAL.findall(ran.out), sorted(set(UNSAFE_ON_TERMINAL.findall(ran.out)))
    assert "Tess Mara" in ran.out


def test_desk_shows_names_without_escapes(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    app_module = pytest.importorskip("pairings.tui.app")
    path = _restored_hostile(tmp_path, capsys)
    screens: dict[str, str] = {}

    async def drive() -> None:
        with EventStore.open(path) as store:
            app = app_module.DeskApp(store, poll_seconds=3600)
            async with app.run_test(size=(200, 60)) as pilot:
                for key, place in (("f2", "roster"), ("f3", "round"), ("f4", "results"), ("f5", "standings"), ("f6", "log")):
                    await pilot.press(key)
                    await app.workers.wait_for_complete()
                    await pilot.pause()
                    screens[place] = app.export_screenshot()

    asyncio.run(drive())
    for place, svg in screens.items():
        bad = UNSAFE_ON_TERMINAL.findall(svg.replace("\n", ""))
        assert not bad, (place, sorted(set(bad)))
        shown = unescape(svg).replace("\xa0", " ")
        assert "title-hijack" not in shown, place
    everything = unescape(" ".join(screens.values())).replace("\xa0", " ")
    for fragment in ("alert(1)", "Tess", "Kiri"):
        assert fragment in everything, fragment
