"""Shared pieces of the bad-input fuzz tests: the in-process command line and the outcome rule."""

from __future__ import annotations

import shutil
from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

import pytest
from hypothesis import strategies as st

from pairings import events as ev
from pairings.cli import main
from pairings.store import EventStore

from .conftest import snapshot

# Text that has broken parsers and terminals before (common practice, no source).
NASTY = (
    "", " ", "\t", "\n", "\r\n", "\x00", "\x1b[31m", "\x1b]0;title\x07", "\x9b2J", "\x7f", "\u202e", "\u200f",
    "\ufeff", "\ud7ff", "😀", "e\u0301", '"', "'", ",", ";", '""', "=1+1", "+1", "-1", "@SUM(A1)", "<script>",
    "x" * 301, "1e9", "-0", "NaN", "Infinity", "99999999999999999999", "0x10", "١٢٣",
)
nasty_text = st.one_of(st.sampled_from(NASTY), st.text(max_size=12), st.text(st.characters(max_codepoint=0x20), max_size=4))
# Paths must stay in the test's scratch folder: no separators in generated tokens.
token_text = nasty_text.map(lambda s: s.replace("/", "").replace("\\", ""))


@dataclass
class Ran:
    code: int
    out: str
    err: str


def run(capsys: pytest.CaptureFixture[str], argv: Sequence[str]) -> Ran:
    """The command line in-process; SystemExit (from --help or verify) counts as its exit status."""
    try:
        code = main(list(argv))
    except SystemExit as exc:
        code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 2)
    captured = capsys.readouterr()
    return Ran(code, captured.out, captured.err)


def assert_refused_cleanly(ran: Ran, before: object, after: object) -> None:
    """Exit 2 means: one ``pairings: ...`` line on stderr and nothing changed on disk."""
    assert ran.code == 2, ran
    lines = ran.err.split("\n")
    assert lines[-1] == "", f"stderr does not end with a newline: {ran.err!r}"
    lines = lines[:-1]
    assert len(lines) == 1, f"not a one-line error: {ran.err!r}"
    assert lines[0].startswith("pairings: ")
    assert "Traceback" not in ran.err
    assert after == before, "the event file changed on a refused command"


def base_events() -> list[ev.Event]:
    """A small event with round 1 published and one result in: most commands have something to act on."""
    return [
        ev.EventCreated(name="Fuzz Club Rapid", rounds=4, seed=3),
        *(ev.PlayerRegistered(id=f"p{i}", name=n, rating=r) for i, (n, r) in enumerate(
            (("Ada Quince", 1800), ("Bo Rill", 1700), ("Cy Rill", 1650), ("Dee Marsh", 1500)), start=1)),
        ev.RoundDrafted(round=1, boards=(ev.BoardModel(board=1, first="p1", second="p3"),
                                         ev.BoardModel(board=2, first="p4", second="p2"))),
        ev.RoundPublished(round=1),
        ev.ResultRecorded(round=1, board=1, result="1-0"),  # type: ignore[arg-type]
    ]


def pristine(folder: Path) -> Path:
    path = folder / "pristine.pairings"
    EventStore.create_from(path, base_events()).close()
    return path


def fresh_copy(source: Path, folder: Path) -> tuple[Path, tuple[bytes, bytes | None]]:
    """A throw-away copy of the event file for one example, and its snapshot."""
    path = folder / "event.pairings"
    for leftover in (path, Path(f"{path}-wal"), Path(f"{path}-shm")):
        leftover.unlink(missing_ok=True)
    shutil.copyfile(source, path)
    return path, snapshot(path)
