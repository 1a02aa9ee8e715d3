"""Crash: a writer killed with SIGKILL at random moments loses nothing it acknowledged.

The child (``writer_child.py crash``) appends batches of 1-3 registrations and
prints the sequence number of each batch's last event only after the append
returned. After each kill the parent reopens the file (the chain is checked as
it is read), runs the full chain check, and checks that every batch is whole
and every acknowledged sequence number is stored. The same file carries on
across all kills, so recovery after recovery is exercised too.

A SIGKILL stops the process, not the machine: what the operating system had
already accepted reaches the disk. Power loss (what ``synchronous=FULL`` is
for) cannot be simulated here.
"""

from __future__ import annotations

import os
import random
import re
import select
import signal
import subprocess
import time
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.store import EventStore

from .conftest import HERE, new_event, python

_BATCH = re.compile(r"batch (\d+) part (\d+) of (\d+)")


def _kill_once(path: Path, rng: random.Random) -> list[int]:
    """Start a writer, SIGKILL it after a random delay; the sequence numbers it acknowledged."""
    env = dict(os.environ, PYTHONPATH=str(HERE.parents[1]))
    child = subprocess.Popen(
        [python(), str(HERE / "writer_child.py"), "crash", str(path), str(rng.randrange(2**31))],
        stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env,
    )
    assert child.stdout is not None
    first = b""
    if rng.random() < 0.2:  # one kill in five lands during start-up (imports, open, reading the log)
        time.sleep(rng.uniform(0.0, 0.3))
    else:  # the rest while appending: after the first acknowledgement, at a random moment
        ready, _, _ = select.select([child.stdout], [], [], 60)
        assert ready, "the writer never acknowledged an append"
        first = child.stdout.readline()
        time.sleep(rng.uniform(0.0, 0.25))
    child.send_signal(signal.SIGKILL)
    out, err = child.communicate(timeout=30)
    assert child.returncode == -signal.SIGKILL, err.decode()
    # A line cut short by the kill was never fully acknowledged; only whole lines count.
    return [int(line) for line in (first + out).decode().split("\n")[:-1]]


def _check_after_kill(path: Path, acknowledged: list[int]) -> int:
    with EventStore.open(path) as store:  # reading checks the chain row by row
        report = store.check_chain()
        assert report.ok, report
        log = store.log
        head = store.state.head
    assert report.events == head == len(log)
    assert [s.seq for s in log] == list(range(1, head + 1))
    if acknowledged:
        assert max(acknowledged) <= head, f"acknowledged {max(acknowledged)} but the log ends at {head}"
    parts: dict[int, set[int]] = {}
    sizes: dict[int, int] = {}
    for stored in log[1:]:
        event = stored.event
        assert isinstance(event, ev.PlayerRegistered)
        if event.id.startswith("p"):
            continue
        m = _BATCH.fullmatch(event.name)
        assert m is not None, event.name
        start, part, size = (int(x) for x in m.groups())
        assert stored.seq == start + part - 1
        parts.setdefault(start, set()).add(part)
        sizes[start] = size
    for start, got in parts.items():
        assert got == set(range(1, sizes[start] + 1)), f"batch starting at {start} is partial: {sorted(got)}"
    for seq in acknowledged:
        assert any(start + sizes[start] - 1 == seq for start in sizes), f"acknowledged {seq} is not a batch end"
    return head


def run_crashes(tmp_path: Path, kills: int, seed: int) -> dict[str, float]:
    path = tmp_path / "crash.pairings"
    new_event(path, players=4).close()
    rng = random.Random(seed)
    started = time.monotonic()
    acked_total = 0
    kills_mid_run = 0
    for _ in range(kills):
        acknowledged = _kill_once(path, rng)
        _check_after_kill(path, acknowledged)
        acked_total += len(acknowledged)
        kills_mid_run += bool(acknowledged)
    with EventStore.open(path) as store:
        events = store.state.head
    figures = {
        "kills": kills, "kills_after_first_ack": kills_mid_run, "acknowledged_appends": acked_total,
        "events_stored": events, "seconds": round(time.monotonic() - started, 1),
    }
    print("crash figures:", figures)
    return figures


def test_sigkill_loses_nothing_acknowledged(tmp_path: Path) -> None:
    figures = run_crashes(tmp_path, kills=25, seed=20240601)
    assert figures["kills_after_first_ack"] >= 10  # most kills land while appending


@pytest.mark.full
def test_sigkill_loses_nothing_acknowledged_full(tmp_path: Path) -> None:
    figures = run_crashes(tmp_path, kills=200, seed=int(time.time()))
    assert figures["kills_after_first_ack"] >= 100
