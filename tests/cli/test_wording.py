"""What the command line says: counts that agree with their noun, standings after an earlier round,
and a quiet end when the reader of its output goes away."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.demo import make_demo
from pairings.store import EventStore

ROOT = Path(__file__).parents[2]


@pytest.fixture(scope="module")
def demo(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """Rounds 1-3 complete, round 4 published with some results in (see pairings/demo.py)."""
    return make_demo(tmp_path_factory.mktemp("demo") / "demo.pairings")


def test_counts_agree_with_their_noun(demo: Path, tmp_path: Path, cli) -> None:  # type: ignore[no-untyped-def]
    log = cli("log", demo).out
    assert "(20 boards, 0 byes)" in log and "(19 boards, 1 bye)" in log and "1 byes" not in log
    event = tmp_path / "small.pairings"
    assert cli("new", event, "--name", "Tiny Rapid", "--rounds", "2", "--seed", "4").code == 0
    for name in ("Ada Quince", "Bo Rill", "Cy Marsh", "Dee Fenn"):
        assert cli("player", "add", event, "--name", name).code == 0
    assert cli("pair", event).code == 0 and cli("publish", event).code == 0
    assert cli("result", event, "1", "1-0").out.strip() == "round 1 board 1: 1-0; 1 board open"
    refused = cli("pair", event)
    assert refused.code == 2 and "(1 board without a result)" in refused.err
    assert cli("publish-web", event, tmp_path / "site").out.strip() == f"wrote 6 files to {tmp_path / 'site'}"  # index, 4 sheets, round-1.html


def test_standings_after_an_earlier_round(demo: Path, cli) -> None:  # type: ignore[no-untyped-def]
    """docs/tiebreaks.md: `--round N` gives the standings after round N."""
    text = cli("standings", demo, "--round", "2")
    assert text.code == 0 and "Standings — After round 2" in text.out
    rows = json.loads(cli("standings", demo, "--round", "2", "--format", "json").out)
    with EventStore.open(demo) as store:
        state = store.state
    points: dict[str, float] = {pid: 0.0 for pid in state.players}  # recounted here from rounds 1 and 2 only
    wins = {"1-0": (1.0, 0.0), "0-1": (0.0, 1.0), "1/2-1/2": (0.5, 0.5), "+-": (1.0, 0.0), "-+": (0.0, 1.0)}
    for rnd in state.rounds[:2]:
        for g in rnd.games:
            assert g.result is not None
            a, b = wins[g.result.value]
            points[g.first] += a
            points[g.second] += b
        for y in rnd.byes:
            points[y.player] += y.points
    assert {row["player"]: row["points"] for row in rows} == points
    late = cli("standings", demo, "--round", "6")
    assert late.code == 2 and late.err.count("\n") == 1 and "round 6" in late.err


def test_reader_gone_away_ends_quietly(tmp_path: Path) -> None:
    """`pairings player list EVENT | head -1`: no "Broken pipe" message, the status a shell gives SIGPIPE."""
    event = tmp_path / "big.pairings"
    players = [ev.PlayerRegistered(id=f"p{i}", name=f"Player Number {i}", rating=1000 + i) for i in range(1, 2001)]
    EventStore.create_from(event, [ev.EventCreated(name="Big Open", rounds=5, seed=1), *players]).close()
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    proc = subprocess.Popen([sys.executable, "-m", "pairings", "player", "list", str(event)], env=env,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    assert proc.stdout is not None and proc.stderr is not None
    first = proc.stdout.readline()
    proc.stdout.close()  # more than a pipe's buffer is still to come: the next write fails
    err = proc.stderr.read()
    assert proc.wait(timeout=60) == 141
    assert b"Player Number 1 " in first and err == b""
