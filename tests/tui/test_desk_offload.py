"""Engine work in a child process (as for big fields), checked against the same work done in-process."""

from __future__ import annotations

import asyncio
from pathlib import Path

import pytest

from pairings import actions
from pairings.state import RoundState
from pairings.tui import offload
from pairings.tui.app import DeskApp
from pairings.tui.dialogs import FormDialog
from pairings.tui.offload import Job, Offload
from tests.tui.desk_support import new_event, settle, type_text


def test_child_process_drafts_and_explains_as_the_engine_does_here(tmp_path: Path,
                                                                   monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(offload, "PROCESS_FROM", 0)
    store = new_event(tmp_path / "e.pairings", players=5)
    before = store.state
    work = Offload(store.path)
    drafted = work.run(before, Job("draft", before.head))
    assert drafted.problem == "" and drafted.events == tuple(actions.pair(before))

    store.append(list(drafted.events))
    state = store.state
    why = work.run(state, Job("explain", state.head, board=1))
    assert why.problem == "" and why.lines == offload.run(state, Job("explain", state.head, board=1)).lines

    # The child folds the file only up to the job's head, whatever was written after it.
    store.append(actions.discard(state, "start over"))
    again = work.run(before, Job("draft", before.head))
    assert again.events == drafted.events
    stale = work.run(state, Job("preview", state.head, plan=("pin", ("1",))))
    assert stale.problem == "" and stale.difference == offload.run(state, Job("preview", state.head,
                                                                              plan=("pin", ("1",)))).difference

    sheet, here = tmp_path / "child.txt", tmp_path / "here.txt"
    assert work.run(state, Job("report", state.head, report=("pairings", "text", None, str(sheet)))).problem == ""
    offload.write_report(state, "pairings", "text", None, str(here))
    assert sheet.read_bytes() == here.read_bytes() and sheet.stat().st_size > 0
    missing = work.run(state, Job("report", state.head, report=("pairings", "text", None, str(tmp_path / "no/x"))))
    assert "No such file" in missing.problem
    store.close()


def test_desk_drafts_and_overrides_through_the_child_process(tmp_path: Path,
                                                             monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(offload, "PROCESS_FROM", 0)
    store = new_event(tmp_path / "e.pairings", players=5)

    async def run() -> None:
        app = DeskApp(store, poll_seconds=3600)
        async with app.run_test(size=(100, 32)) as pilot:
            await pilot.press("n")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None and rnd.state is RoundState.DRAFT and rnd.source == "engine"
            await pilot.pause(0.4)  # the cursor rests: the Why panel asks the child
            await settle(app, pilot)
            why = str(app.screen.query_one("#why-text").content)
            assert "Why:" in why and "working it out" not in why, why

            kept = (rnd.games[0].first, rnd.games[0].second)
            await pilot.press("k")
            await settle(app, pilot)
            assert isinstance(app.screen, FormDialog)
            assert any("Against the optimum" in str(w.content) for w in app.screen.query(".dialog-intro"))
            await type_text(pilot, "arbiter")
            await pilot.press("enter")
            await settle(app, pilot)
            rnd = app.state.last_round
            assert rnd is not None and rnd.source == "override" and "arbiter" in rnd.notes[-1]
            assert any((g.first, g.second) == kept and "pinned" in g.flags for g in rnd.games)

    asyncio.run(run())
    store.close()
