"""The desk's heavy work (drafts, explanations, override previews and records, printouts) as plain-data jobs.

:func:`run` does a :class:`Job` on a state in this process. The engine's
compiled kernels (the blossom and the pair scan) let go of the interpreter
lock while they run, but the Python around them (the field, the bounds, sides,
boards, explanations) and the printouts hold it, so in a worker thread a
large job still takes turns with the screen and keys wait.
From :data:`PROCESS_FROM` registered players on, :class:`Offload` therefore runs the job
in a child process (a fresh interpreter running :func:`main`): the child gets the
event file's path and the job on its standard input, opens the file itself,
folds the log up to the job's head (the very state the organiser decided on,
even if the file has moved on since), runs the job and writes the outcome
back. Nothing is written to the file by the child; the desk appends the
events it returns, refused as usual when the file is no longer at that head.

The child is a plain subprocess with pipes, not a ``multiprocessing`` pool:
no fork inside the desk's threads, no pickled event log on the way in.
"""

from __future__ import annotations

import os
import pickle
import subprocess
import sys
import threading
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

from pairings import actions
from pairings.errors import InputError
from pairings.events import Event
from pairings.state import EventState
from pairings.tui import overrides as ov
from pairings.tui.why import why_lines

PROCESS_FROM = 300
"""Players from which engine jobs run in a child process (below, a thread is quicker than starting one)."""

Kind = Literal["draft", "explain", "preview", "record", "report"]


@dataclass(frozen=True)
class Job:
    """One piece of engine work on the state at ``head``."""

    kind: Kind
    head: int
    board: int = 0
    """The board to explain."""
    plan: ov.PlanSpec | None = None
    """The override to preview or record."""
    reason: str = ""
    """The organiser's reason, for a record."""
    report: tuple[str, str, int | None, str] | None = None
    """A printout: (kind, format, round or None for the latest, file to write)."""


@dataclass(frozen=True)
class Outcome:
    events: tuple[Event, ...] = ()
    """What to append (draft, record)."""
    lines: tuple[str, ...] = ()
    """The explanation (explain)."""
    difference: str = ""
    """The cost difference against the optimum, in words (preview)."""
    problem: str = ""
    """Why the job could not be done (the refusal's one line); empty when it was."""


_CACHE = ov.OptimumCache()
"""Optimum drafts kept between previews done in this process."""


def run(state: EventState, job: Job) -> Outcome:
    """Do ``job`` on ``state`` (whose head is ``job.head``) here and now."""
    try:
        if job.kind == "draft":
            return Outcome(events=tuple(actions.pair(state, replace=True)))  # the Round place has asked
        if job.kind == "explain":
            return Outcome(lines=tuple(why_lines(state, job.board)))
        if job.kind == "report":
            assert job.report is not None
            write_report(state, *job.report)
            return Outcome()
        assert job.plan is not None
        plan = ov.make_plan(state, job.plan)
        if job.kind == "preview":
            return Outcome(difference=ov.preview(state, plan, _CACHE)[1])
        return Outcome(events=tuple(plan.record(state, job.reason)))
    except (InputError, OSError) as exc:  # OSError: a printout's file
        return Outcome(problem=str(exc))


def write_report(state: EventState, kind: str, fmt: str, number: int | None, path: str) -> None:
    """Render a printout (pairings.reports) and write it to ``path``."""
    from pairings.reports import render
    from pairings.reports.files import write_file

    write_file(Path(path), render(state, kind, fmt, number))


def state_at(path: Path, head: int) -> EventState:
    """The event file's state after event ``head`` (read-only)."""
    from pairings.fold import fold
    from pairings.store import EventStore

    with EventStore.open(path) as store:
        if store.state.head == head:
            return store.state
        return fold((s.seq, s.event) for s in store.log if s.seq <= head)


_CHILD = "from pairings.tui.offload import main; main()"
"""The child's program (not ``-m``: its classes must pickle under this module's name)."""


class Offload:
    """Runs jobs for the desk: in the calling (worker) thread for small fields, else in a child process."""

    def __init__(self, path: Path) -> None:
        self.path = path
        self._children: set[subprocess.Popen[bytes]] = set()
        self._lock = threading.Lock()
        self._closed = False

    def run(self, state: EventState, job: Job) -> Outcome:
        """The outcome of ``job`` on ``state``; blocks, so call it from a worker thread."""
        if len(state.players) < PROCESS_FROM:
            return run(state, job)
        return self._in_child(job)

    def _in_child(self, job: Job) -> Outcome:
        root = Path(__file__).resolve().parents[2]
        env = {**os.environ, "PYTHONPATH": os.pathsep.join(p for p in (str(root), os.environ.get("PYTHONPATH")) if p)}
        with self._lock:
            if self._closed:
                return Outcome(problem="the desk is closing")
            child = subprocess.Popen([sys.executable, "-c", _CHILD], stdin=subprocess.PIPE,
                                     stdout=subprocess.PIPE, stderr=subprocess.PIPE, env=env, cwd=root)
            self._children.add(child)
        try:
            out, err = child.communicate(pickle.dumps((str(self.path), job)))
        finally:
            with self._lock:
                self._children.discard(child)
        if child.returncode != 0:
            tail = err.decode("utf-8", "replace").strip().splitlines()[-1:] or [f"exit status {child.returncode}"]
            return Outcome(problem=f"the engine's process failed: {tail[0]}")
        outcome = pickle.loads(out)
        assert isinstance(outcome, Outcome)
        return outcome

    def close(self) -> None:
        """Stop every child at once, even mid-draft (a child never writes to the file)."""
        with self._lock:
            self._closed = True
            for child in self._children:
                child.kill()


def main() -> None:
    """The child's side: a pickled (path, job) on standard input, the pickled outcome on standard output."""
    path, job = pickle.loads(sys.stdin.buffer.read())
    assert isinstance(job, Job)
    try:
        outcome = run(state_at(Path(path), job.head), job)
    except InputError as exc:  # the file itself cannot be read
        outcome = Outcome(problem=str(exc))
    sys.stdout.buffer.write(pickle.dumps(outcome))
