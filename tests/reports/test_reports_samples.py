"""The sample generator on the demo event (events/winter-open.events.json)."""

from __future__ import annotations

import io
import json
from pathlib import Path

import pytest
from pypdf import PdfReader

from pairings.reports.samples import SCENARIO, demo_state, write_samples
from pairings.standings import standings


@pytest.mark.skipif(not SCENARIO.exists(), reason="no demo event data file")
def test_samples_of_the_demo_event(tmp_path: Path) -> None:
    state = demo_state()
    written = write_samples(tmp_path, state)
    assert len(written) == 8 * 5 + 5 + state.rounds[-1].number   # no grid: the demo is a Swiss event
    rows = json.loads((tmp_path / "standings.json").read_text(encoding="utf-8"))
    assert rows == json.loads(json.dumps(standings(state).to_json()))
    # pypdf as an independent extractor: every player of the event is on the PDF standings.
    text = "".join(p.extract_text() for p in PdfReader(io.BytesIO((tmp_path / "standings.pdf").read_bytes())).pages)
    assert all(p.name in text for p in state.players.values())
