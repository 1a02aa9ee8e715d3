"""The SQLite recorder: the only code in the project that opens an event file.

An event file is one SQLite database with two tables:

``meta(key, value)``
    ``format`` = ``pairings-event-log`` and ``schema_version``.
``events(seq, type, schema_version, recorded_at, payload, prev_hash, hash)``
    Append-only. ``seq`` is the primary key, so a second writer that raced us
    cannot insert the same number; ``payload`` is the event's canonical JSON;
    ``hash`` is SHA-256 over every other column of the row (see :func:`row_hash`),
    and ``prev_hash`` is the previous row's ``hash`` (64 zeros for the first).

Every append is one ``BEGIN IMMEDIATE`` transaction that first checks the
sequence number the caller expects (optimistic concurrency); the file runs in
WAL mode with ``synchronous=FULL`` so an acknowledged append survives a crash; each
append ends with a passive checkpoint, so the file alone is up to date between writes.

A file that cannot be opened for writing (a read-only medium or folder, a full
disk) is still read: SQLite's read-only mode, or its ``immutable`` mode where not
even the WAL index can be created and there is no write-ahead log to apply
(the SQLite documentation, "Read-Only Databases" of wal.html and "URI filenames").
Such a recorder refuses every append with the reason.
"""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import sqlite3
import tempfile
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path
from typing import Callable, Iterator, Sequence

from pairings.errors import (
    ChainBrokenError, ConflictError, NewerSchemaError, NotAnEventFileError, ReadOnlyError, StoreError,
)
from pairings.events import SCHEMA_VERSION, Event, dump_event, parse_event

FORMAT = "pairings-event-log"
GENESIS = "0" * 64

_SCHEMA = """
CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE events (
    seq INTEGER PRIMARY KEY,
    type TEXT NOT NULL,
    schema_version INTEGER NOT NULL,
    recorded_at TEXT NOT NULL,
    payload TEXT NOT NULL,
    prev_hash TEXT NOT NULL,
    hash TEXT NOT NULL
);
"""


def canonical_json(data: object) -> str:
    """The one JSON form we hash: sorted keys, no spaces, UTF-8 text kept as is."""
    return json.dumps(data, sort_keys=True, separators=(",", ":"), ensure_ascii=False)


def row_hash(seq: int, type_: str, schema_version: int, recorded_at: str, payload: str, prev_hash: str) -> str:
    """SHA-256 over the row's stored text, so any changed byte of any column shows."""
    text = "\n".join((str(seq), type_, str(schema_version), recorded_at, prev_hash, payload))
    return hashlib.sha256(text.encode("utf-8", "surrogateescape")).hexdigest()


@dataclass(frozen=True, slots=True)
class StoredEvent:
    seq: int
    recorded_at: str
    event: Event
    hash: str


@dataclass(frozen=True, slots=True)
class ChainReport:
    """Outcome of a full check of the hash chain."""

    events: int
    broken_at: int | None
    reason: str = ""

    @property
    def ok(self) -> bool:
        return self.broken_at is None


_CANNOT_WRITE_HERE = {3, 8, 10, 13, 14}
"""SQLite's primary result codes PERM, READONLY, IOERR, FULL and CANTOPEN: the file may still be read another way."""


def _utc_now() -> str:
    return datetime.now(timezone.utc).isoformat(timespec="microseconds")


class Recorder:
    """Inserts and selects event rows; nothing else."""

    def __init__(self, path: Path, conn: sqlite3.Connection, clock: Callable[[], str] = _utc_now,
                 read_only: bool = False) -> None:
        self.path = path
        self._conn = conn
        self._clock = clock
        self.read_only = read_only
        """True when the file could only be opened for reading; :meth:`append` then refuses."""
        self._scratch: Path | None = None  # the private copy read instead (see _open_copy)

    # -- opening ---------------------------------------------------------------------------

    @staticmethod
    def _connect(path: Path, mode: str) -> sqlite3.Connection:
        """A connection in SQLite URI ``mode``; raises :class:`sqlite3.Error` as SQLite does."""
        conn = sqlite3.connect(
            f"file:{path.as_posix()}?mode={mode}", uri=True, timeout=10.0, isolation_level=None,
            check_same_thread=False,
        )
        try:
            # A stored byte changed into invalid UTF-8 must still read, so the chain check can name it.
            conn.text_factory = lambda raw: raw.decode("utf-8", "surrogateescape")
            conn.execute("PRAGMA busy_timeout = 10000")
            conn.execute("PRAGMA synchronous = FULL")
        except BaseException:
            conn.close()
            raise
        return conn

    @classmethod
    def create(cls, path: Path) -> "Recorder":
        if path.exists():
            raise StoreError(f"{path}: already exists; choose another name or open it")
        if not path.parent.exists():
            raise NotAnEventFileError(f"{path.parent}: no such folder")
        try:
            conn = cls._connect(path, "rwc")
        except sqlite3.Error as exc:
            raise NotAnEventFileError(f"{path}: cannot create ({exc})") from None
        try:
            conn.execute("PRAGMA journal_mode = WAL")
            conn.execute("BEGIN IMMEDIATE")
            for statement in _SCHEMA.strip().split(";"):
                if statement.strip():
                    conn.execute(statement)
            conn.execute("INSERT INTO meta VALUES ('format', ?), ('schema_version', ?)", (FORMAT, str(SCHEMA_VERSION)))
            conn.execute("COMMIT")
        except sqlite3.Error as exc:
            conn.close()
            for leftover in (path, Path(f"{path}-wal"), Path(f"{path}-shm")):
                leftover.unlink(missing_ok=True)
            raise StoreError(f"{path}: cannot create ({exc})") from None
        return cls(path, conn)

    @classmethod
    def open(cls, path: Path) -> "Recorder":
        if path.is_dir():
            raise NotAnEventFileError(f"{path}: is a folder, not an event file")
        if not path.is_file():
            raise NotAnEventFileError(f"{path}: no such event file")
        with open(path, "rb") as fh:
            if fh.read(16) != b"SQLite format 3\x00":
                raise NotAnEventFileError(f"{path}: not an event file (not an SQLite database)")
        conn, meta, mode, scratch = cls._open_readable(path)
        if meta.get("format") != FORMAT:
            conn.close()
            raise NotAnEventFileError(f"{path}: not an event file (format {meta.get('format')!r})")
        try:
            version = int(meta.get("schema_version", ""))
        except ValueError:
            conn.close()
            raise NotAnEventFileError(f"{path}: not an event file (bad schema version)") from None
        if version > SCHEMA_VERSION:
            conn.close()
            raise NewerSchemaError(
                f"{path}: written by a newer version of the desk (schema {version}, this one reads up to "
                f"{SCHEMA_VERSION}); upgrade pairings to open it"
            )
        recorder = cls(path, conn, read_only=mode != "rw")
        recorder._scratch = scratch
        return recorder

    @classmethod
    def _open_readable(cls, path: Path) -> tuple[sqlite3.Connection, dict[str, str], str, Path | None]:
        """A connection that can read the file, its meta table, the mode that worked and the private copy if any.

        Read-write first where the file and its folder look writable; a folder that
        cannot be written (or a full disk, where SQLite cannot create the WAL index)
        falls back to read-only, then to ``immutable`` when there is no write-ahead
        log whose events it would miss, then to a private copy (:meth:`_open_copy`).
        """
        wal = Path(f"{path}-wal")
        pending = wal.exists() and wal.stat().st_size > 0
        modes = ["rw"] if os.access(path, os.W_OK) and os.access(path.parent, os.W_OK) else []
        modes += ["ro"] if pending else ["ro", "ro&immutable=1"]
        failure = ""
        for mode in modes:
            conn: sqlite3.Connection | None = None
            try:
                conn = cls._connect(path, mode)
                return conn, dict(conn.execute("SELECT key, value FROM meta").fetchall()), mode, None
            except sqlite3.DatabaseError as exc:
                if conn is not None:
                    conn.close()
                if (exc.sqlite_errorcode & 0xFF) not in _CANNOT_WRITE_HERE:
                    if "no such table" in str(exc) or not isinstance(exc, sqlite3.OperationalError):
                        raise NotAnEventFileError(f"{path}: not an event file (no event log inside)") from None
                    raise NotAnEventFileError(f"{path}: cannot read ({exc})") from None
                failure = str(exc)
        if pending:
            conn, meta, scratch = cls._open_copy(path)
            return conn, meta, "ro", scratch
        raise NotAnEventFileError(f"{path}: cannot read ({failure})")

    @classmethod
    def _open_copy(cls, path: Path) -> tuple[sqlite3.Connection, dict[str, str], Path]:
        """Read a file whose write-ahead log cannot be used where it lies from a private copy of both.

        SQLite needs the WAL index (``-shm``) beside the log to read it; on a read-only
        medium without one, a copy in a temporary folder is the only way to see every event.
        """
        scratch = Path(tempfile.mkdtemp(prefix="pairings-read-"))
        copy = scratch / path.name
        try:
            shutil.copyfile(path, copy)
            shutil.copyfile(f"{path}-wal", f"{copy}-wal")
            conn = cls._connect(copy, "ro")
            meta = dict(conn.execute("SELECT key, value FROM meta").fetchall())
        except (OSError, sqlite3.Error) as exc:
            shutil.rmtree(scratch, ignore_errors=True)
            raise NotAnEventFileError(f"{path}: cannot read, not even from a copy ({exc})") from None
        return conn, meta, scratch

    def close(self) -> None:
        self._conn.close()
        if self._scratch is not None:
            shutil.rmtree(self._scratch, ignore_errors=True)

    # -- reading ---------------------------------------------------------------------------

    def head(self) -> int:
        """The sequence number of the newest event (0 when empty); cheap, for change detection."""
        try:
            row = self._conn.execute("SELECT COALESCE(MAX(seq), 0) FROM events").fetchone()
        except sqlite3.Error as exc:
            raise NotAnEventFileError(f"{self.path}: cannot read ({exc})") from None
        return int(row[0])

    def _rows(self, after: int = 0) -> Iterator[tuple[int, str, int, str, str, str, str]]:
        try:
            cursor = self._conn.execute(
                "SELECT seq, type, schema_version, recorded_at, payload, prev_hash, hash FROM events "
                "WHERE seq > ? ORDER BY seq",
                (after,),
            )
            yield from cursor
        except sqlite3.Error as exc:
            raise NotAnEventFileError(f"{self.path}: cannot read ({exc})") from None

    def check_chain(self) -> ChainReport:
        """Walk the whole chain; report the first sequence number where it breaks."""
        prev = GENESIS
        count = 0
        for seq, type_, version, at, payload, prev_hash, digest in self._rows():
            count += 1
            if seq != count:
                return ChainReport(count, count, f"event {count} is missing")
            if prev_hash != prev:
                return ChainReport(count, seq, "does not link to the event before it")
            if row_hash(seq, type_, version, at, payload, prev_hash) != digest:
                return ChainReport(count, seq, "its content does not match its hash")
            prev = digest
        return ChainReport(count, None)

    def read(self, after: int = 0, prev: str = GENESIS) -> list[StoredEvent]:
        """The events after ``after`` (whose hash is ``prev``), oldest first, checking the chain.

        Raises :class:`ChainBrokenError` at the first row that does not verify.
        """
        out: list[StoredEvent] = []
        for seq, type_, version, at, payload, prev_hash, digest in self._rows(after):
            if seq != after + len(out) + 1:
                raise ChainBrokenError(after + len(out) + 1, "an event is missing")
            if prev_hash != prev or row_hash(seq, type_, version, at, payload, prev_hash) != digest:
                raise ChainBrokenError(seq, "content does not match its hash")
            if version > SCHEMA_VERSION:
                raise NewerSchemaError(f"{self.path}: event {seq} has a newer schema ({version})")
            try:
                event = parse_event(payload, type_)
            except ValueError:
                raise ChainBrokenError(seq, "unreadable event") from None
            if event.type != type_:
                raise ChainBrokenError(seq, "type column does not match the event")
            out.append(StoredEvent(seq, at, event, digest))
            prev = digest
        return out

    # -- writing ---------------------------------------------------------------------------

    def append(self, events: Sequence[Event], expected: int) -> int:
        """Append ``events`` after event ``expected``; all or nothing. Returns the new head.

        Raises :class:`ConflictError` (and writes nothing) when the log's head is not
        ``expected``: another window or process wrote meanwhile.
        """
        if not events:
            return expected
        if self.read_only:
            raise ReadOnlyError(
                f"{self.path}: can only be read here (a read-only medium or folder, or a full disk); "
                "nothing written; copy it to a writable folder to change it"
            )
        conn = self._conn
        try:
            conn.execute("BEGIN IMMEDIATE")
        except sqlite3.Error as exc:
            raise StoreError(f"{self.path}: cannot write ({exc})") from None
        try:
            row = conn.execute("SELECT seq, hash FROM events ORDER BY seq DESC LIMIT 1").fetchone()
            head, prev = (int(row[0]), str(row[1])) if row else (0, GENESIS)
            if head != expected:
                raise ConflictError(expected, head)
            at = self._clock()
            for offset, event in enumerate(events, start=1):
                seq = head + offset
                payload = canonical_json(dump_event(event))
                digest = row_hash(seq, event.type, SCHEMA_VERSION, at, payload, prev)
                conn.execute(
                    "INSERT INTO events VALUES (?, ?, ?, ?, ?, ?, ?)",
                    (seq, event.type, SCHEMA_VERSION, at, payload, prev, digest),
                )
                prev = digest
            conn.execute("COMMIT")
        except BaseException as exc:
            conn.execute("ROLLBACK")
            if isinstance(exc, sqlite3.IntegrityError):
                raise ConflictError(expected, self.head()) from None
            if isinstance(exc, sqlite3.Error):
                raise StoreError(f"{self.path}: write failed, nothing written ({exc})") from None
            raise
        self._checkpoint()
        return head + len(events)

    def _checkpoint(self) -> None:
        """Copy the committed write-ahead log into the file itself, so that a copy of the file alone (a
        backup, a USB stick) taken while a desk keeps it open holds every acknowledged entry.

        PASSIVE never waits: a reader in another window may keep the newest pages in ``-wal`` a little
        longer, which loses nothing (the SQLite documentation, wal.html, "Checkpointing"). The append is
        already durable, so a checkpoint that cannot run is not an error.
        """
        try:
            self._conn.execute("PRAGMA wal_checkpoint(PASSIVE)")
        except sqlite3.Error:
            pass

