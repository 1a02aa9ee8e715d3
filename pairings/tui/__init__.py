"""The full-screen desk (textual): Roster, Round, Results, Standings and Log over one event file.

Thin by design: every change is an action of :mod:`pairings.actions`; the
engine, standings and reports do the work, in worker threads when it is slow.
"""

from __future__ import annotations

from pathlib import Path


def run_desk(path: Path) -> None:
    """Open the event file at ``path`` in the desk until the organiser quits (Ctrl+Q)."""
    from pairings.tui.app import run_desk as run

    run(path)


__all__ = ["run_desk"]
