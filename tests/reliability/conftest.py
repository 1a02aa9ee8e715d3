"""Shared helpers of the reliability tests; ``full``-marked tests run only when asked for (``-m full``)."""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.store import EventStore

HERE = Path(__file__).parent


def pytest_collection_modifyitems(config: pytest.Config, items: list[pytest.Item]) -> None:
    """Skip the full-count runs unless the marker expression names them (CI runs ``-m 'not full'``)."""
    if "full" in (config.getoption("markexpr") or ""):
        return
    skip = pytest.mark.skip(reason="full-count run: use -m full")
    for item in items:
        if item.get_closest_marker("full") is not None and Path(str(item.fspath)).is_relative_to(HERE):
            item.add_marker(skip)


def python() -> str:
    return sys.executable


def new_event(path: Path, players: int = 0, name: str = "Reliability Open") -> EventStore:
    """A fresh event file with ``players`` plain registrations."""
    store = EventStore.create(path, ev.EventCreated(name=name, rounds=5, seed=7))
    if players:
        store.append([ev.PlayerRegistered(id=f"p{i}", name=f"Player {i}", rating=1500 + i) for i in range(1, players + 1)])
    return store


def snapshot(path: Path) -> tuple[bytes, bytes | None]:
    """The bytes of an event file and of its write-ahead log (if any): what 'unchanged' compares."""
    wal = Path(f"{path}-wal")
    return path.read_bytes(), wal.read_bytes() if wal.exists() else None
