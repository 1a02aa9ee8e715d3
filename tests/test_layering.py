"""The core imports neither the UI toolkit nor (below reports) the terminal renderer (design.md, style.md)."""

from __future__ import annotations

import subprocess
import sys

import pytest


@pytest.mark.parametrize(
    ("module", "forbidden"),
    [
        ("pairings.store", ("textual", "rich")),
        ("pairings.fold", ("textual", "rich")),
        ("pairings.actions", ("textual", "rich", "networkx")),
        ("pairings.engine", ("textual", "rich")),
        ("pairings.standings", ("textual", "rich")),
        ("pairings.reports", ("textual",)),
        ("pairings.cli", ("textual", "networkx")),
    ],
)
def test_core_does_not_import_ui(module: str, forbidden: tuple[str, ...]) -> None:
    code = (
        f"import sys, {module}\n"
        f"bad = [m for m in {forbidden!r} if m in sys.modules]\n"
        "print(','.join(bad))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.strip()
    assert out == "", f"{module} pulled in {out}"


HEAVY = ("networkx", "fpdf", "jinja2", "textual", "rich")
"""Libraries the ``pair`` command never needs (the PDF writer, HTML templates, the desk, the reference solver)."""


def test_pair_runs_without_the_heavy_libraries(tmp_path) -> None:  # type: ignore[no-untyped-def]
    from pairings.simulate import simulate_events
    from pairings.store import EventStore

    path = tmp_path / "club.pairings"
    log = simulate_events(40, 5, 2, 3)
    EventStore.create(path, log[0]).append(log[1:])
    code = (
        "import sys\n"
        "from pairings.cli import main\n"
        f"code = main(['pair', {str(path)!r}])\n"
        f"bad = [m for m in {HEAVY!r} if m in sys.modules]\n"
        "print('loaded:', ','.join(bad), 'exit:', code, file=sys.stderr)"
    )
    ran = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert ran.stderr.strip().splitlines()[-1] == "loaded:  exit: 0", ran.stderr
    assert "round 3 (draft)" in ran.stdout.splitlines()[0], ran.stdout
