"""Engine work for big fields in a separate process, so the desk's own thread keeps the keys.

The engine is pure Python; in a thread it shares one interpreter lock with
the screen, and a 2,000-player draft then slows every key. From
:data:`PROCESS_FROM` players on, the worker thread hands the event log to a
child process, which folds it and runs the engine; small fields stay in the
thread (no process start-up to wait for).
"""

from __future__ import annotations

import multiprocessing
from multiprocessing.pool import Pool
from typing import Sequence

from pairings import actions
from pairings.events import Event
from pairings.fold import fold
from pairings.state import EventState
from pairings.tui.why import why_lines

PROCESS_FROM = 300
"""Players from which drafting and explanations run in a child process."""

Log = list[tuple[int, Event]]


def _pair(log: Log) -> list[Event]:
    return actions.pair(fold(log))


def _why(log: Log, board: int) -> list[str]:
    return why_lines(fold(log), board)


class Offload:
    """One child process per desk, started on first use and stopped with the desk."""

    def __init__(self) -> None:
        self._pool: Pool | None = None

    def _executor(self) -> Pool:
        if self._pool is None:
            self._pool = multiprocessing.get_context("spawn").Pool(1)
        return self._pool

    def pair(self, state: EventState, log: Log) -> Sequence[Event]:
        """``actions.pair(state)``; ``log`` is the log ``state`` was folded from."""
        if len(state.players) < PROCESS_FROM:
            return actions.pair(state)
        return self._executor().apply_async(_pair, (log,)).get()

    def why(self, state: EventState, log: Log, board: int) -> list[str]:
        if len(state.players) < PROCESS_FROM:
            return why_lines(state, board)
        return self._executor().apply_async(_why, (log, board)).get()

    def close(self) -> None:
        """Stop the child at once, even mid-draft (nothing it computes is written by itself)."""
        if self._pool is not None:
            self._pool.terminate()
            self._pool = None
