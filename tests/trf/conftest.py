"""The command line run in-process for the report-file tests (as tests/cli does)."""

from __future__ import annotations

from dataclasses import dataclass

import pytest

from pairings.cli import main


@dataclass
class Ran:
    code: int
    out: str
    err: str


@pytest.fixture
def cli(capsys: pytest.CaptureFixture[str]):  # type: ignore[no-untyped-def]
    def run(*args: object) -> Ran:
        code = main([str(a) for a in args])
        captured = capsys.readouterr()
        return Ran(code, captured.out, captured.err)

    return run
