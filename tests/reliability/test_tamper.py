"""Tampering: any single changed byte of any stored event is reported with the sequence number.

Row level: each column of each row of a small event file is changed one byte
(one character) at a time through SQLite, then restored. File level: each byte
of one event's payload is changed in the raw database file.
"""

from __future__ import annotations

import shutil
import sqlite3
from pathlib import Path
from typing import Iterator

import pytest

from pairings.errors import ChainBrokenError
from pairings.store import EventStore
from pairings.store.recorder import Recorder

from .fuzzkit import pristine, run

TEXT_COLUMNS = ("type", "recorded_at", "payload", "prev_hash", "hash")


def _flip(text: str, at: int) -> str:
    """``text`` with the character at ``at`` changed to another printable ASCII one (one byte)."""
    c = text[at]
    other = chr(ord(c) ^ 1) if 33 <= (ord(c) ^ 1) < 127 else ("A" if c != "A" else "B")
    return text[:at] + other + text[at + 1 :]


def _tamperings(conn: sqlite3.Connection, full_payload_rows: set[int]) -> Iterator[tuple[int, str, object]]:
    """(seq, column, new value) for every change to try; the payload of some rows at every position."""
    rows = conn.execute("SELECT seq, type, schema_version, recorded_at, payload, prev_hash, hash FROM events").fetchall()
    for seq, *values in rows:
        record = dict(zip(("type", "schema_version", "recorded_at", "payload", "prev_hash", "hash"), values))
        for column in TEXT_COLUMNS:
            text = record[column]
            positions = range(len(text)) if column != "payload" or seq in full_payload_rows else range(0, len(text), 7)
            for at in positions:
                yield seq, column, _flip(text, at)
        for version in (0, 2, -1):
            yield seq, "schema_version", version
        yield seq, "seq", seq + 1000


def test_every_changed_character_breaks_the_chain_at_its_row(tmp_path: Path) -> None:
    path = pristine(tmp_path)
    conn = sqlite3.connect(path, isolation_level=None)
    conn.execute("PRAGMA synchronous = OFF")  # a test copy: speed over durability
    recorder = Recorder.open(path)
    assert recorder.check_chain().ok
    small = {2, 3}  # two player registrations: every byte of their payload
    tried = 0
    for seq, column, value in list(_tamperings(conn, small)):
        original = conn.execute(f"SELECT {column} FROM events WHERE seq = ?", (seq,)).fetchone()[0]
        conn.execute(f"UPDATE events SET {column} = ? WHERE seq = ?", (value, seq))
        report = recorder.check_chain()
        assert report.broken_at == seq, (seq, column, value, report)
        now_at = value if column == "seq" else seq
        conn.execute(f"UPDATE events SET {column} = ? WHERE seq = ?", (original, now_at))
        tried += 1
    assert recorder.check_chain().ok
    recorder.close()
    conn.close()
    print("tamperings tried:", tried)
    assert tried > 1000


@pytest.mark.parametrize("column", [*TEXT_COLUMNS, "schema_version", "seq"])
def test_verify_names_the_broken_event(tmp_path: Path, capsys: pytest.CaptureFixture[str], column: str) -> None:
    source = pristine(tmp_path)
    with EventStore.open(source) as store:
        count = store.state.head
    for seq in range(1, count + 1):
        path = tmp_path / f"t{seq}.pairings"
        shutil.copyfile(source, path)
        conn = sqlite3.connect(path, isolation_level=None)
        if column == "seq":
            conn.execute("UPDATE events SET seq = seq + 1000 WHERE seq = ?", (seq,))
        elif column == "schema_version":
            conn.execute("UPDATE events SET schema_version = 0 WHERE seq = ?", (seq,))
        else:
            text = conn.execute(f"SELECT {column} FROM events WHERE seq = ?", (seq,)).fetchone()[0]
            conn.execute(f"UPDATE events SET {column} = ? WHERE seq = ?", (_flip(text, len(text) // 2), seq))
        conn.close()
        ran = run(capsys, ["verify", str(path)])
        assert ran.code == 1, ran
        assert f"BROKEN at event {seq}" in ran.out, ran
        with pytest.raises(ChainBrokenError) as info:
            EventStore.open(path)
        assert info.value.seq == seq


def _payload_span(path: Path, seq: int) -> tuple[int, int]:
    conn = sqlite3.connect(path)
    payload = conn.execute("SELECT payload FROM events WHERE seq = ?", (seq,)).fetchone()[0].encode("utf-8")
    conn.close()
    data = path.read_bytes()
    at = data.find(payload)
    assert at >= 0 and data.find(payload, at + 1) < 0, "the payload is not stored once, contiguously"
    return at, at + len(payload)


@pytest.mark.parametrize("xor", [0x01, 0x20])
def test_raw_file_byte_changes_in_a_payload(tmp_path: Path, xor: int) -> None:
    source = pristine(tmp_path)
    seq = 3
    start, end = _payload_span(source, seq)
    original = source.read_bytes()
    path = tmp_path / "raw.pairings"
    for at in range(start, end):
        data = bytearray(original)
        data[at] ^= xor
        path.write_bytes(bytes(data))
        recorder = Recorder.open(path)
        try:
            assert recorder.check_chain().broken_at == seq, at - start
        finally:
            recorder.close()


def test_raw_byte_change_to_invalid_utf8_still_names_the_event(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    source = pristine(tmp_path)
    start, _ = _payload_span(source, 3)
    data = bytearray(source.read_bytes())
    data[start + 5] ^= 0x80
    path = tmp_path / "raw.pairings"
    path.write_bytes(bytes(data))
    ran = run(capsys, ["verify", str(path)])
    assert ran.code == 1 and "BROKEN at event 3" in ran.out, ran
