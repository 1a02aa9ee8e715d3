"""Helpers to run the command line in-process (fast) or as a real subprocess."""

from __future__ import annotations

import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

import pytest

from pairings.cli import main


@dataclass
class Ran:
    code: int
    out: str
    err: str


def file_bytes(path: Path) -> bytes:
    return path.read_bytes() if path.exists() else b""


@pytest.fixture
def cli(capsys: pytest.CaptureFixture[str]):  # type: ignore[no-untyped-def]
    def run(*args: str) -> Ran:
        code = main([str(a) for a in args])
        captured = capsys.readouterr()
        return Ran(code, captured.out, captured.err)

    return run


def run_process(*args: str, cwd: Path | None = None) -> Ran:
    proc = subprocess.run(
        [sys.executable, "-m", "pairings", *map(str, args)], capture_output=True, text=True, cwd=cwd, timeout=120
    )
    return Ran(proc.returncode, proc.stdout, proc.stderr)


SIX = (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Rill", 1650), ("Dee Marsh", 1500), ("Eve Tarn", 1400),
       ("Fay Orrin", 1300))
"""Invented players: round 1 pairs Ada-Dee, Eve-Bo, Cy-Fay (seed 1), round 2 Cy-Ada, Dee-Eve, Bo-Fay after 1-0s."""


def six_players(cli, path: Path, rounds: int = 5) -> Path:  # type: ignore[no-untyped-def]
    """A fresh event of the six players of :data:`SIX`, side lot seed 1, nothing paired."""
    assert cli("new", path, "--name", "Thursday Rapid", "--rounds", str(rounds), "--seed", "1").code == 0
    for name, rating in SIX:
        assert cli("player", "add", path, "--name", name, "--rating", str(rating)).code == 0
    return path


def play_round(cli, path: Path, *results: str) -> None:  # type: ignore[no-untyped-def]
    """Pair, publish and enter ``results`` board by board."""
    for args in (("pair", path), ("publish", path)):
        ran = cli(*args)
        assert ran.code == 0, ran
    for board, result in enumerate(results, 1):
        ran = cli("result", path, str(board), result)
        assert ran.code == 0, ran


def refused(cli, path: Path, *args: object, says: str) -> str:  # type: ignore[no-untyped-def]
    """Run a command that must be refused: exit 2, one line naming ``says``, the file's bytes unchanged."""
    before = file_bytes(path)
    ran = cli(*args)
    assert ran.code == 2, ran
    lines = ran.err.strip().splitlines()
    assert len(lines) == 1 and says in lines[0], ran.err
    assert file_bytes(path) == before
    return str(lines[0])
