"""The demo scenario: a fresh copy each time, the data file never touched, the story as documented."""

from __future__ import annotations

import hashlib
import json
from pathlib import Path
from typing import Any

from pairings import events as ev
from pairings.demo import LAYOUT_COPY, SCENARIO, build_scenario, make_demo
from pairings.state import ByeKind, RoundState, Status
from pairings.store import EventStore


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_demo_is_a_fresh_copy_and_leaves_the_scenario_alone(tmp_path: Path) -> None:
    before = _digest(SCENARIO)
    first, second = make_demo(tmp_path / "a.pairings"), make_demo(tmp_path / "b.pairings")
    assert _digest(SCENARIO) == before
    with EventStore.open(first) as a, EventStore.open(second) as b:
        assert a.state == b.state
        state = a.state
    assert len(state.players) == 40 and state.settings.rounds == 7
    assert [r.state for r in state.rounds] == [RoundState.COMPLETE] * 3 + [RoundState.PUBLISHED]
    assert 0 < len(state.rounds[3].open_boards) < len(state.rounds[3].games)
    assert any(y.kind is ByeKind.REQUESTED for y in state.rounds[2].byes)
    assert any(p.status is Status.WITHDRAWN for p in state.players.values())


def test_scenario_file_is_what_this_engine_drafts() -> None:
    """The checked-in data is reproducible: rebuild it with `python -m pairings.demo --rebuild`.

    Compared as events, so a stored field added later with a default (absent from the file) reads as equal.
    """
    stored = [ev.EVENT_ADAPTER.validate_python(x) for x in json.loads(SCENARIO.read_text(encoding="utf-8"))]
    assert build_scenario() == stored


def test_checkout_copy_in_events_matches_the_packaged_scenario() -> None:
    """events/ keeps the project layout's copy; the package carries the one the demo reads."""
    assert SCENARIO.is_relative_to(Path(__file__).parents[1] / "pairings")
    assert LAYOUT_COPY.read_bytes() == SCENARIO.read_bytes()


def test_rebuild_writes_the_packaged_scenario_and_the_checkout_copy(tmp_path: Path, monkeypatch: Any) -> None:
    import pairings.demo as demo

    (tmp_path / "pkg").mkdir()
    (tmp_path / "events").mkdir()
    monkeypatch.setattr(demo, "SCENARIO", tmp_path / "pkg" / "s.json")
    monkeypatch.setattr(demo, "LAYOUT_COPY", tmp_path / "events" / "s.json")
    monkeypatch.setattr(demo, "build_scenario", lambda: [ev.EventCreated(name="Tiny", rounds=1, seed=1)])
    demo._write_scenario()
    written = demo.SCENARIO.read_bytes()
    assert json.loads(written)[0]["name"] == "Tiny" and demo.LAYOUT_COPY.read_bytes() == written
