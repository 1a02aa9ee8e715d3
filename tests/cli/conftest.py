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
