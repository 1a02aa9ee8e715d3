"""A real terminal: the demo in a detached tmux session, keys sent, the screen captured."""

from __future__ import annotations

import shutil
import subprocess
import sys
import time
from pathlib import Path

import pytest

SESSION = "pairings-desk-smoke"


def tmux(*args: str) -> str:
    return subprocess.run(["tmux", *args], capture_output=True, text=True, timeout=30, check=True).stdout


def wait_for(text: str, timeout: float = 30.0) -> str:
    """The pane's text once it shows ``text`` (a real terminal gives no other signal to wait on)."""
    deadline = time.monotonic() + timeout
    screen = ""
    while time.monotonic() < deadline:
        screen = tmux("capture-pane", "-t", SESSION, "-p")
        if text in screen:
            return screen
        time.sleep(0.2)
    raise AssertionError(f"{text!r} never showed; the screen was:\n{screen}")


def test_demo_shows_the_round_with_its_boards(tmp_path: Path) -> None:
    if shutil.which("tmux") is None:
        print("skipped: tmux is not installed (.ci/run installs it)")
        pytest.skip("tmux is not installed")
    demo = tmp_path / "demo.pairings"
    command = f"cd {Path.cwd()} && {sys.executable} -m pairings demo --file {demo}"
    subprocess.run(["tmux", "kill-session", "-t", SESSION], capture_output=True)
    tmux("new-session", "-d", "-s", SESSION, "-x", "100", "-y", "30", command)
    try:
        wait_for("Winter Weekend Open")
        tmux("send-keys", "-t", SESSION, "F2")
        wait_for("· Roster ·")
        tmux("send-keys", "-t", SESSION, "F3")
        screen = wait_for("· Round ·")
        screen = wait_for("Board 1 of round")
        lines = screen.splitlines()
        assert any(line.split()[:1] == ["Bd"] for line in lines), screen
        boards = [line for line in lines if line.split() and line.split()[0].isdigit()]
        assert len(boards) >= 10, screen
        assert "Byes:" in screen
        tmux("send-keys", "-t", SESSION, "C-q")  # the desk quits and the session ends with it
        deadline = time.monotonic() + 15
        while time.monotonic() < deadline:
            alive = subprocess.run(["tmux", "has-session", "-t", SESSION], capture_output=True)
            if alive.returncode != 0:
                break
            time.sleep(0.2)
        else:
            raise AssertionError("the desk did not quit on Ctrl+Q")
    finally:
        subprocess.run(["tmux", "kill-session", "-t", SESSION], capture_output=True)
