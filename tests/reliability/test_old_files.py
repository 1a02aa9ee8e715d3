"""Old files: the checked-in event file of schema version 1 opens and folds to what was recorded.

The expected content below is written out by hand from the fixture's story
(tests/fixtures/build_v1.py), not recomputed by the code under test.
"""

from __future__ import annotations

import importlib.util
import shutil
import sqlite3
from pathlib import Path

import pytest

from pairings.events import SCHEMA_VERSION
from pairings.state import ByeKind, Result, RoundState, Status
from pairings.store import EventStore

FIXTURES = Path(__file__).parents[1] / "fixtures"
FIXTURE = FIXTURES / "event-v1.pairings"


@pytest.fixture
def copy(tmp_path: Path) -> Path:
    """A copy: opening in WAL mode may touch the file, and the checked-in one must stay as it is."""
    path = tmp_path / "old.pairings"
    shutil.copyfile(FIXTURE, path)
    return path


def test_fixture_is_schema_version_1(copy: Path) -> None:
    conn = sqlite3.connect(f"file:{copy.as_posix()}?mode=ro", uri=True)
    try:
        meta = dict(conn.execute("SELECT key, value FROM meta").fetchall())
        versions = {v for (v,) in conn.execute("SELECT DISTINCT schema_version FROM events")}
    finally:
        conn.close()
    assert meta == {"format": "pairings-event-log", "schema_version": "1"}
    assert versions == {1}


def test_version_1_file_opens_and_folds(copy: Path) -> None:
    with EventStore.open(copy) as store:
        assert store.check_chain().ok
        state = store.state
        log = store.log
    assert state.head == len(log) == 16
    assert state.settings.name == "Lakeside Spring Open – Ærø"
    assert state.settings.rounds == 3 and state.settings.sides == ("White", "Black")
    assert [(p.id, p.name, p.rating, p.club) for p in state.players.values()] == [
        ("p1", "Ines Farrow", 2010, "Lakeside"), ("p2", "Tomas Wren", 1890, None),
        ("p3", "Ulla Brink", 1755, "Harbour"), ("p4", "Kai Moreno", None, None), ("p5", "Zofia Leland", 1600, None),
    ]
    assert state.players["p5"].status is Status.WITHDRAWN  # type: ignore[index]
    assert [(f.a, f.b) for f in state.forbidden] == [("p1", "p3")]
    one, two = state.rounds
    assert one.state is RoundState.COMPLETE
    assert [(g.board, g.first, g.second, g.result) for g in one.games] == [
        (1, "p1", "p5", Result.FIRST_WINS), (2, "p2", "p4", Result.SECOND_WINS),  # board 2 was corrected
    ]
    assert [(y.player, y.kind, y.points) for y in one.byes] == [("p3", ByeKind.PAIRING, 1.0)]
    # the discard of round 2's draft was undone, so the draft stands
    assert two.state is RoundState.DRAFT and [(g.first, g.second) for g in two.games] == [("p4", "p1"), ("p3", "p2")]
    # win 1, draw 0.5, loss 0; a pairing bye scores a win by default
    assert {pid: state.score(pid) for pid in state.players} == {"p1": 1.0, "p2": 0.0, "p3": 1.0, "p4": 1.0, "p5": 0.0}


def test_version_1_file_takes_new_events(copy: Path, capsys: pytest.CaptureFixture[str]) -> None:
    from pairings.cli import main

    assert main(["player", "add", str(copy), "--name", "Noor Castell", "--rating", "1500"]) == 0
    capsys.readouterr()
    with EventStore.open(copy) as store:
        assert store.state.head == 17 and store.check_chain().ok


@pytest.mark.skipif(SCHEMA_VERSION != 1, reason="the builder writes schema version 1 only")
def test_builder_writes_what_is_checked_in(tmp_path: Path) -> None:
    spec = importlib.util.spec_from_file_location("build_v1", FIXTURES / "build_v1.py")
    assert spec is not None and spec.loader is not None
    builder = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(builder)
    rebuilt = builder.build(tmp_path / "rebuilt.pairings")

    def rows(path: Path) -> list[tuple[object, ...]]:  # everything but the clock and the hashes over it
        conn = sqlite3.connect(f"file:{path.as_posix()}?mode=ro", uri=True)
        try:
            return conn.execute("SELECT seq, type, schema_version, payload FROM events ORDER BY seq").fetchall()
        finally:
            conn.close()

    kept = tmp_path / "checked-in.pairings"
    shutil.copyfile(FIXTURE, kept)
    assert rows(rebuilt) == rows(kept)
