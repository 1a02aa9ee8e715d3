"""Error messages stay on one line even when they quote input that holds line breaks or escapes."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from pairings.fold import fold
from pairings.interchange import export_event

from .conftest import snapshot
from .fuzzkit import assert_refused_cleanly, base_events, fresh_copy, pristine, run

@pytest.mark.parametrize("case", ["argument", "json-key", "path"])
def test_quoted_line_break_stays_on_one_line(tmp_path: Path, capsys: pytest.CaptureFixture[str], case: str) -> None:
    event, before = fresh_copy(pristine(tmp_path), tmp_path)
    if case == "argument":
        argv = ["player", "list", str(event), "--colour\nred"]
    elif case == "json-key":
        doc = tmp_path / "doc.json"
        data = export_event(fold(enumerate(base_events(), 1))) | {"a\nb": 1}  # valid but for one extra key
        doc.write_text(json.dumps(data), encoding="utf-8")
        argv = ["restore", str(doc), str(tmp_path / "new.pairings")]
    else:
        argv = ["log", str(tmp_path / "two\nlines.pairings")]
    assert_refused_cleanly(run(capsys, argv), before, snapshot(event))
