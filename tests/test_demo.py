"""The demo scenario: a fresh copy each time, the data file never touched, the story as documented."""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

from pairings import events as ev
from pairings.demo import SCENARIO, build_scenario, make_demo
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
