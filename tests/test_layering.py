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
