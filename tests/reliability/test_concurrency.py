"""Concurrency: two processes append to one event file at once.

Each writer (``writer_child.py race``) reads the head, waits a moment, and
appends one registration expecting that head; it reports ``ok`` or
``conflict`` per attempt. Afterwards every attempt reported ``ok`` is stored
exactly once at the sequence number it was told, no refused attempt is stored,
and the state equals a serial replay of the stored events into a fresh file.
"""

from __future__ import annotations

import os
import subprocess
import time
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.errors import ConflictError
from pairings.fold import fold
from pairings.store import EventStore

from .conftest import HERE, new_event, python, snapshot


def run_race(tmp_path: Path, attempts: int, seed: int) -> dict[str, float]:
    path = tmp_path / "race.pairings"
    new_event(path).close()
    env = dict(os.environ, PYTHONPATH=str(HERE.parents[1]))
    started = time.monotonic()
    children = [
        subprocess.Popen(
            [python(), str(HERE / "writer_child.py"), "race", str(path), tag, str(attempts // 2), str(seed + i)],
            stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env,
        )
        for i, tag in enumerate(("a", "b"))
    ]
    outputs = [child.communicate(timeout=600) for child in children]
    elapsed = time.monotonic() - started
    landed: dict[str, int] = {}
    refused: set[str] = set()
    for child, (out, err) in zip(children, outputs):
        assert child.returncode == 0, err.decode()  # any error other than a conflict would end the child
        lines = out.decode().splitlines()
        assert len(lines) == attempts // 2
        for line in lines:
            word, name, *seq = line.split()
            if word == "ok":
                landed[name] = int(seq[0])
            else:
                assert word == "conflict"
                refused.add(name)
    assert len(landed) + len(refused) == attempts

    with EventStore.open(path) as store:
        assert store.check_chain().ok
        log = store.log
        state = store.state
    stored = [(s.seq, s.event.id) for s in log[1:] if isinstance(s.event, ev.PlayerRegistered)]
    assert len(stored) == len(log) - 1
    ids = [pid for _, pid in stored]
    assert len(ids) == len(set(ids)), "an append is stored twice"
    assert dict((pid, seq) for seq, pid in stored) == landed, "stored appends differ from the acknowledged ones"
    assert not refused & set(ids), "a refused append was stored"

    # Serial replay: the stored events, appended one by one by a single writer, give the same state.
    replay = EventStore.create(tmp_path / "replay.pairings", log[0].event)  # type: ignore[arg-type]
    for s in log[1:]:
        replay.append([s.event])
    assert replay.state == state
    assert fold((s.seq, s.event) for s in log) == state
    replay.close()
    figures = {"attempts": attempts, "landed": len(landed), "conflicts": len(refused), "seconds": round(elapsed, 1)}
    print("race figures:", figures)
    return figures


def test_two_writers_nothing_lost_or_doubled(tmp_path: Path) -> None:
    figures = run_race(tmp_path, attempts=200, seed=11)
    assert figures["conflicts"] > 0, "the writers never overlapped: the test did not test anything"


@pytest.mark.full
def test_two_writers_nothing_lost_or_doubled_full(tmp_path: Path) -> None:
    figures = run_race(tmp_path, attempts=1000, seed=int(time.time()))
    assert figures["conflicts"] > 0


def test_stale_store_refuses_and_writes_nothing(tmp_path: Path) -> None:
    path = tmp_path / "stale.pairings"
    desk = new_event(path, players=2)
    cli = EventStore.open(path)
    cli.append([ev.PlayerRegistered(id="late", name="Late Entry")])
    cli.close()
    before = snapshot(path)
    assert desk.changed_elsewhere()
    with pytest.raises(ConflictError) as info:
        desk.append([ev.PlayerWithdrawn(player="p1", from_round=1)])
    assert (info.value.expected, info.value.found) == (3, 4)
    assert snapshot(path) == before
    # the refused store has reloaded: it sees the other write, and its next append lands after it
    assert "late" in desk.state.players and desk.state.head == 4
    desk.append([ev.PlayerWithdrawn(player="p1", from_round=1)])
    desk.close()
    with EventStore.open(path) as again:
        assert again.state.head == 5 and again.check_chain().ok
