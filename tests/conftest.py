"""Run-wide pieces: one command-line parser for the in-process calls, and the check that a test run
leaves the checked-in fixtures (tests/fixtures) exactly as they were.

Tests copy a fixture to a temporary folder before opening it: SQLite creates ``-wal``
and ``-shm`` files beside a WAL-mode file even when it only reads, and a changed
fixture would make the next run test something else. The run fails when any file
there was added, removed or changed (bytecode caches aside).
"""

from __future__ import annotations

import hashlib
from collections.abc import Iterator
from pathlib import Path

import pytest

from pairings import cli

FIXTURES = Path(__file__).parent / "fixtures"
_BEFORE = pytest.StashKey[dict[str, str]]()


@pytest.fixture(autouse=True, scope="session")
def one_command_line_parser() -> Iterator[None]:
    """Every in-process ``pairings.cli.main`` call of the run parses with one parser, built once.

    Building it costs some 10 ms (hundreds of arguments, each help text looked up through
    gettext), which in-process calls by the thousand paid again on every call. The parser
    depends on nothing but the code (``parse_args`` leaves it as it was), so one built at the
    start parses as a fresh one would; real processes (exit-status tests, the wheel) still
    build their own.
    """
    parser = cli.build_parser()
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(cli, "build_parser", lambda: parser)
        yield


def _contents() -> dict[str, str]:
    return {str(p.relative_to(FIXTURES)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(FIXTURES.rglob("*")) if p.is_file() and "__pycache__" not in p.parts}


def pytest_sessionstart(session: pytest.Session) -> None:
    session.config.stash[_BEFORE] = _contents()


def pytest_sessionfinish(session: pytest.Session, exitstatus: int) -> None:
    before, after = session.config.stash[_BEFORE], _contents()
    changed = sorted(name for name in before.keys() | after.keys() if before.get(name) != after.get(name))
    if changed:
        reporter = session.config.pluginmanager.get_plugin("terminalreporter")
        message = f"tests/fixtures changed during the run (copy fixtures to tmp_path first): {', '.join(changed)}"
        if reporter is not None:
            reporter.write_line(message, red=True)
        session.exitstatus = pytest.ExitCode.TESTS_FAILED
