"""A real terminal: the demo in a detached tmux session, keys sent, the screen captured.

Every place and the dialogs are looked at in 80 x 24 (the size the design
promises) and 120 x 40: the top line says where the event stands in full,
names are not cut where there is room, the bottom line shows whole keys, the
Why panel opens with one key, and the Log shows its newest entry. The
captures are kept beside the test's files (``PAIRINGS_SMOKE_CAPTURES=DIR``
copies them to DIR, to look at them).
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
import time
from pathlib import Path
from typing import Callable

import pytest

SESSION = "pairings-desk-smoke"
SERVER = ["tmux", "-L", "pairings-desk-smoke", "-f", "/dev/null"]
"""A tmux server of the test's own: a window made in a server with other windows may take their size."""
LONGEST_NAME = "Perpetua Pennywhistle"  # the demo's longest name (invented)


def tmux(*args: str) -> str:
    return subprocess.run([*SERVER, *args], capture_output=True, text=True, timeout=30, check=True).stdout


def screen() -> str:
    return tmux("capture-pane", "-t", SESSION, "-p")


def wait_for(text: str, timeout: float = 30.0) -> str:
    """The pane's text once it shows ``text`` (a real terminal gives no other signal to wait on)."""
    deadline = time.monotonic() + timeout
    shown = ""
    while time.monotonic() < deadline:
        shown = screen()
        if text in shown:
            return shown
        time.sleep(0.2)
    raise AssertionError(f"{text!r} never showed; the screen was:\n{shown}")


def wait_until(done: Callable[[str], bool], timeout: float = 30.0) -> str:
    deadline = time.monotonic() + timeout
    shown = ""
    while time.monotonic() < deadline:
        shown = screen()
        if done(shown):
            return shown
        time.sleep(0.2)
    raise AssertionError(f"the screen never got there; it was:\n{shown}")


def laid_out(text: str) -> bool:
    """The desk has drawn itself for the pane's size (a new pane starts at 80 x 24 and is then resized)."""
    lines = text.splitlines()
    return len(lines) > 1 and "f1 Help" in lines[-1] and LONGEST_NAME in text


def wait_gone(text: str, timeout: float = 15.0) -> str:
    deadline = time.monotonic() + timeout
    shown = ""
    while time.monotonic() < deadline:
        shown = screen()
        if text not in shown:
            return shown
        time.sleep(0.2)
    raise AssertionError(f"{text!r} stayed; the screen was:\n{shown}")


def keys(*names: str) -> None:
    tmux("send-keys", "-t", SESSION, *names)


class Captures:
    def __init__(self, folder: Path, size: tuple[int, int]) -> None:
        self.folder, self.size = folder, size

    def keep(self, name: str, text: str) -> str:
        path = self.folder / f"{self.size[0]}x{self.size[1]}-{name}.txt"
        path.write_text(text, encoding="utf-8")
        copy = os.environ.get("PAIRINGS_SMOKE_CAPTURES")
        if copy:
            Path(copy).mkdir(parents=True, exist_ok=True)
            shutil.copy(path, Path(copy) / path.name)
        width, height = self.size
        lines = text.splitlines()
        assert len(lines) <= height and all(len(line) <= width for line in lines), text
        return text


def check_frame(text: str, place: str) -> None:
    """The top line names the place and where the event stands, uncut; the bottom line ends in whole keys."""
    lines = text.splitlines()
    top = lines[0].rstrip()
    assert f"{place} · round 4 of 7: published, 13 of 19 boards open" in top and top.endswith("open"), top
    bottom = lines[-1].rstrip()
    assert "f1 Help" in bottom and (bottom.endswith("^p") or bottom.endswith("palette")), bottom
    assert "…" not in bottom.replace("▏^p", ""), bottom


@pytest.mark.parametrize("size", [(80, 24), (120, 40)], ids=["80x24", "120x40"])
def test_every_place_and_dialog_in_a_real_terminal(tmp_path: Path, size: tuple[int, int]) -> None:
    if shutil.which("tmux") is None:
        print("skipped: tmux is not installed (.ci/run installs it)")
        pytest.skip("tmux is not installed")
    width, height = size
    shots = Captures(tmp_path, size)
    demo = tmp_path / "demo.pairings"
    # The shell puts the pane's first size (80 x 24, before tmux resizes it) in COLUMNS and LINES, which would
    # win over the terminal's own size: the desk is to ask the terminal.
    command = f"cd {Path.cwd()} && unset COLUMNS LINES && {sys.executable} -m pairings demo --file {demo}"
    subprocess.run([*SERVER, "kill-server"], capture_output=True)
    tmux("new-session", "-d", "-s", SESSION, "-x", str(width), "-y", str(height), command)
    try:
        # Round: every board with its full names, the byes, whole keys.
        wait_for("Byes:")
        text = shots.keep("round", wait_until(laid_out))
        check_frame(text, "Round")
        lines = text.splitlines()
        assert any(line.split()[:1] == ["Bd"] for line in lines), text
        boards = [line for line in lines if line.split() and line.split()[0].isdigit()]
        assert len(boards) == 19, text
        assert LONGEST_NAME in text and "Yorick Zeller-Moss" in text, text
        assert "w Why" in lines[-1], lines[-1]

        # The Why panel: one key, a visible focus (its framed title), the same key back.
        keys("w")
        text = shots.keep("round-why", wait_for("Why · "))
        assert "Board 1 of round 4" in text and "Cost by criterion" in text
        keys("w")
        text = wait_gone("Why · ")
        assert LONGEST_NAME in text

        keys("F2")
        text = shots.keep("roster", wait_for("Roster · "))
        check_frame(text, "Roster")
        assert LONGEST_NAME in text and "filter by name, id or club" in text

        keys("a")
        text = shots.keep("add-player", wait_for("Add player"))
        assert "Rating (empty: unrated)" in text and "Enter: next field" in text
        keys("Escape")
        wait_gone("Add player")

        keys("F4")
        text = shots.keep("results", wait_for("Results · "))
        check_frame(text, "Results")
        assert LONGEST_NAME in text and "13 of 19 boards open" in text.splitlines()[1]
        assert "0-1  Black wins" in text  # the code and its words in the event's side names

        keys("F5")
        text = shots.keep("standings", wait_for("After round 4"))
        check_frame(text, "Standings")
        assert "Hester Ivybridge" in text and "…" not in text and "virtual opponent" in text  # nothing cut

        keys("F6")
        text = shots.keep("log", wait_for("u undoes"))
        check_frame(text, "Log")
        count = int(re.search(r"(\d+) events", text).group(1))  # type: ignore[union-attr]
        rows = [line.split()[0] for line in text.splitlines()[3:-1] if line.split()]
        assert rows[-1] == str(count), text  # the newest entry is on screen
        keys("Enter")
        text = shots.keep("log-entry", wait_for("Esc / Enter: close"))
        assert f"Event {count}," in text
        keys("Escape")
        wait_gone("Esc / Enter: close")

        keys("F7")
        text = shots.keep("print", wait_for("Print / export"))
        assert "[pairings]" in text and "crosstable" in text and "[text]" in text and "pdf" in text
        assert "demo-pairings-round4.txt" in text
        keys("Right", "Enter", "p")  # names, pdf: the file name follows
        text = shots.keep("print-pdf", wait_for("demo-names-round4.pdf"))
        keys("Escape")
        wait_gone("Print / export")

        keys("F1")
        text = shots.keep("help", wait_for("Keys of the desk"))
        assert "Add player" in text and "Esc: close" in text
        keys("Escape")
        wait_gone("Keys of the desk")

        keys("C-q")  # the desk quits and the session ends with it
        deadline = time.monotonic() + 15
        while time.monotonic() < deadline:
            alive = subprocess.run([*SERVER, "has-session", "-t", SESSION], capture_output=True)
            if alive.returncode != 0:
                break
            time.sleep(0.2)
        else:
            raise AssertionError("the desk did not quit on Ctrl+Q")
    finally:
        subprocess.run([*SERVER, "kill-server"], capture_output=True)
