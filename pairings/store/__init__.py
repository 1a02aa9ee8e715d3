"""The event store: an append-only, hash-chained log in one SQLite file per event.

:class:`EventStore` is what the command line and the desk hold. It reads the
log (checking the chain), folds it into an :class:`~pairings.state.EventState`,
and appends new events with an optimistic-concurrency check. Undo appends an
:class:`~pairings.events.Undone` event; history is never rewritten.
"""

from __future__ import annotations

from pathlib import Path
from typing import Callable, Sequence

from pairings.errors import InputError
from pairings.events import Event, EventCreated, Undone
from pairings.fold import Folder, fold
from pairings.state import EventState
from pairings.store.recorder import ChainReport, Recorder, StoredEvent

__all__ = ["EventStore", "StoredEvent", "ChainReport", "undo_target"]


def undo_target(log: Sequence[StoredEvent]) -> StoredEvent | None:
    """The newest event still in effect (not undone, not an undo, not the event's creation).

    Undo works as a stack: each undo takes back the newest action still in effect,
    so no action in effect ever depends on one that was taken back.
    """
    undone = {s.event.target for s in log if isinstance(s.event, Undone)}
    for stored in reversed(log):
        if isinstance(stored.event, (Undone, EventCreated)) or stored.seq in undone:
            continue
        return stored
    return None


class EventStore:
    """One open event file."""

    def __init__(self, recorder: Recorder) -> None:
        self._recorder = recorder
        self._log: list[StoredEvent] = []
        self._folder = Folder()
        self._state: EventState | None = None

    @property
    def path(self) -> Path:
        return self._recorder.path

    @classmethod
    def create(cls, path: Path | str, first: EventCreated) -> "EventStore":
        path = Path(path)
        recorder = Recorder.create(path)
        store = cls(recorder)
        store._recorder.append([first], expected=0)
        store.reload()
        return store

    @classmethod
    def create_from(cls, path: Path | str, events: Sequence[Event]) -> "EventStore":
        """A new event file holding ``events`` (restore, demo); folded first, so a bad list writes nothing."""
        try:
            fold(enumerate(events, 1))
        except (KeyError, IndexError, ValueError, AttributeError) as exc:
            raise InputError(f"inconsistent event data ({exc!r})") from None
        if not events or not isinstance(events[0], EventCreated):
            raise InputError("the events do not start with the event's creation")
        store = cls.create(path, events[0])
        store.append(events[1:])
        return store

    @classmethod
    def open(cls, path: Path | str) -> "EventStore":
        store = cls(Recorder.open(Path(path)))
        try:
            store.reload()
        except BaseException:
            store.close()
            raise
        return store

    def close(self) -> None:
        self._recorder.close()

    def __enter__(self) -> "EventStore":
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    # -- reading ---------------------------------------------------------------------------

    def reload(self) -> EventState:
        """Read what is new since the last read (the chain is checked as it is read) and refold."""
        if self._log:
            last = self._log[-1]
            new = self._recorder.read(after=last.seq, prev=last.hash)
        else:
            new = self._recorder.read()
            if not new or not isinstance(new[0].event, EventCreated):
                raise InputError(f"{self.path}: the log does not start with the event's creation")
        if new or self._state is None:
            self._log.extend(new)
            self._state = self._folder.extend((s.seq, s.event) for s in new).state()
        return self._state

    @property
    def state(self) -> EventState:
        assert self._state is not None
        return self._state

    @property
    def log(self) -> Sequence[StoredEvent]:
        return tuple(self._log)

    def changed_elsewhere(self) -> bool:
        """True when another window or process appended since our last read."""
        return self._recorder.head() != self.state.head

    def check_chain(self) -> ChainReport:
        return self._recorder.check_chain()

    # -- writing ---------------------------------------------------------------------------

    def append(self, events: Sequence[Event], expected: int | None = None) -> EventState:
        """Append after the state we last read (or ``expected``); reloads and returns the new state.

        On :class:`~pairings.errors.ConflictError` nothing is written and the store has
        reloaded, so the caller sees what changed elsewhere.
        """
        base = self.state.head if expected is None else expected
        try:
            self._recorder.append(events, expected=base)
        except InputError:
            self.reload()
            raise
        return self.reload()

    def apply(self, action: Callable[[EventState], Sequence[Event]]) -> EventState:
        """Run a pure action on the current state and append what it returns."""
        return self.append(action(self.state))
