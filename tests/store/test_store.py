"""The event store: append, reload, conflicts, tampering, undo; on a real file and in a temp dir."""

from __future__ import annotations

import sqlite3
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.errors import ChainBrokenError, ConflictError, NewerSchemaError, NotAnEventFileError
from pairings.store import EventStore, undo_target


def _new(tmp_path: Path) -> EventStore:
    return EventStore.create(tmp_path / "e.pairings", ev.EventCreated(name="Test", rounds=3))


def test_append_and_reopen(tmp_path: Path) -> None:
    store = _new(tmp_path)
    store.append([ev.PlayerRegistered(id="p1", name="Ada Quince"), ev.PlayerRegistered(id="p2", name="Bo Rill")])
    store.close()
    again = EventStore.open(tmp_path / "e.pairings")
    assert list(again.state.players) == ["p1", "p2"]
    assert again.state.head == 3
    assert again.check_chain().ok


def test_the_file_alone_is_up_to_date_while_a_window_keeps_it_open(tmp_path: Path) -> None:
    # a backup copied without its -wal while the desk is open holds every acknowledged entry
    store = _new(tmp_path)
    store.append([ev.PlayerRegistered(id="p1", name="Ada Quince")])
    store.append([ev.PlayerRegistered(id="p2", name="Bo Rill")])
    copy = tmp_path / "copy.pairings"
    copy.write_bytes((tmp_path / "e.pairings").read_bytes())
    assert not Path(f"{copy}-wal").exists()
    assert list(EventStore.open(copy).state.players) == ["p1", "p2"]
    store.close()


def test_second_writer_conflicts_and_writes_nothing(tmp_path: Path) -> None:
    one = _new(tmp_path)
    two = EventStore.open(tmp_path / "e.pairings")
    two.append([ev.PlayerRegistered(id="p1", name="Ada Quince")])
    assert one.changed_elsewhere()
    with pytest.raises(ConflictError):
        one.append([ev.PlayerRegistered(id="p9", name="Stale Window")])
    # the stale writer reloaded: it now sees the other's write, and its own was not stored
    assert list(one.state.players) == ["p1"]
    assert EventStore.open(tmp_path / "e.pairings").state.head == 2


def test_tampered_byte_is_detected_with_its_sequence(tmp_path: Path) -> None:
    store = _new(tmp_path)
    for i in range(5):
        store.append([ev.PlayerRegistered(id=f"p{i}", name=f"Player {i}")])
    store.close()
    path = tmp_path / "e.pairings"
    conn = sqlite3.connect(path)
    payload = conn.execute("SELECT payload FROM events WHERE seq = 4").fetchone()[0]
    conn.execute("UPDATE events SET payload = ? WHERE seq = 4", (payload.replace("Player 2", "Player 7"),))
    conn.commit()
    conn.close()
    with pytest.raises(ChainBrokenError) as info:
        EventStore.open(path)
    assert info.value.seq == 4


def test_not_an_event_file(tmp_path: Path) -> None:
    text = tmp_path / "roster.csv"
    text.write_text("name\nAda\n")
    with pytest.raises(NotAnEventFileError):
        EventStore.open(text)
    with pytest.raises(NotAnEventFileError):
        EventStore.open(tmp_path / "missing.pairings")
    assert not (tmp_path / "missing.pairings").exists()
    other = tmp_path / "other.db"
    sqlite3.connect(other).execute("CREATE TABLE t (x)").connection.close()
    before = other.read_bytes()
    with pytest.raises(NotAnEventFileError):
        EventStore.open(other)
    assert other.read_bytes() == before


def test_newer_schema_refused(tmp_path: Path) -> None:
    _new(tmp_path).close()
    conn = sqlite3.connect(tmp_path / "e.pairings")
    conn.execute("UPDATE meta SET value = '99' WHERE key = 'schema_version'")
    conn.commit()
    conn.close()
    with pytest.raises(NewerSchemaError):
        EventStore.open(tmp_path / "e.pairings")


def test_undo_is_a_stack_of_compensating_events(tmp_path: Path) -> None:
    store = _new(tmp_path)
    store.append([ev.PlayerRegistered(id="p1", name="Ada Quince")])
    store.append([ev.PlayerRegistered(id="p2", name="Bo Rill")])
    target = undo_target(store.log)
    assert target is not None and target.seq == 3
    store.append([ev.Undone(target=3)])
    assert list(store.state.players) == ["p1"]
    target = undo_target(store.log)
    assert target is not None and target.seq == 2
    store.append([ev.Undone(target=2)])
    assert list(store.state.players) == []
    assert undo_target(store.log) is None
    assert len(store.log) == 5  # nothing was removed
