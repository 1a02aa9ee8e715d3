"""A failed write of a printout or of the web folder keeps the old files whole and names the path.

The disk filling up is simulated by a writer that writes part of the data and then
fails with ENOSPC, as a write on a full disk does (a real full disk is in
tests/reliability/test_read_only_media.py).
"""

from __future__ import annotations

import errno
import os
import stat
from datetime import datetime
from pathlib import Path
from typing import Any

import pytest

from pairings.cli import main
from pairings.errors import OutputError
from pairings.reports import files, publish_web
from pairings.state import EventState
from pairings.store import EventStore

from .conftest import hostile_log


def _disk_fills_after(monkeypatch: pytest.MonkeyPatch, budget: int) -> None:
    """``os.write`` in the writer takes ``budget`` bytes in all, then fails as a full disk does."""
    left = [budget]
    real = os.write

    def write(fd: int, data: Any) -> int:
        if left[0] <= 0:
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))
        taken = real(fd, bytes(data[: left[0]]))
        left[0] -= taken
        return taken

    monkeypatch.setattr(files.os, "write", write)


def _leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".part"))


def test_pdf_printout_on_a_full_disk_keeps_the_old_file(tmp_path: Path, monkeypatch: pytest.MonkeyPatch,
                                                         capsys: pytest.CaptureFixture[str]) -> None:
    event = tmp_path / "club.pairings"
    EventStore.create_from(event, hostile_log()).close()
    out = tmp_path / "pairings.pdf"
    assert main(["print", str(event), "pairings", "--format", "pdf", "-o", str(out)]) == 0
    old = out.read_bytes()
    capsys.readouterr()
    _disk_fills_after(monkeypatch, 1000)
    assert main(["print", str(event), "standings", "--format", "pdf", "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert err == f"pairings: {out}: cannot write (No space left on device); the file there is unchanged\n"
    assert out.read_bytes() == old and _leftovers(tmp_path) == []


def test_new_printout_on_a_full_disk_leaves_no_file(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    _disk_fills_after(monkeypatch, 10)
    target = tmp_path / "slips.txt"
    with pytest.raises(OutputError, match=f"{target}: cannot write .*nothing written there"):
        files.write_file(target, "x" * 100)
    assert list(tmp_path.iterdir()) == []


def test_web_folder_on_a_full_disk_keeps_every_old_page(tmp_path: Path, monkeypatch: pytest.MonkeyPatch,
                                                         hostile: EventState, now: datetime) -> None:
    site = tmp_path / "site"
    written = publish_web(hostile, site, now=now)
    old = {p.name: p.read_bytes() for p in written}
    assert old["index.html"]
    budget = len(old["index.html"]) + len(old["pairings.html"]) + 100  # runs out in the third page
    _disk_fills_after(monkeypatch, budget)
    with pytest.raises(OutputError, match=f"{site / 'standings.html'}: cannot write"):
        publish_web(hostile, site, now=now.replace(hour=20))
    assert {p.name: p.read_bytes() for p in written} == old and _leftovers(site) == []


def test_written_file_keeps_the_old_permissions(tmp_path: Path) -> None:
    target = tmp_path / "names.html"
    files.write_file(target, "old")
    mask = os.umask(0)
    os.umask(mask)
    assert stat.S_IMODE(target.stat().st_mode) == 0o666 & ~mask  # a new file: as open() would make it
    target.chmod(0o640)
    files.write_file(target, "new ✓")
    assert target.read_text(encoding="utf-8") == "new ✓" and stat.S_IMODE(target.stat().st_mode) == 0o640
