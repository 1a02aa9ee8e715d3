"""Reading an event file wherever it can be read: a read-only medium or folder, a full disk.

Tests run as root in CI, where ``chmod`` does not stop a write. The real cases are
therefore made with a private mount namespace (``unshare -m``): a read-only bind
mount stands for a USB stick or a mounted backup, a 300 KiB tmpfs filled to the last
block for a full disk. They skip where the machine allows no mount namespace. The
last test needs no mount: it makes the store believe the folder is not writable
(``os.access``) and so proves only the choice of the read-only path and the refusal
to write, not the behaviour of a real read-only medium.
"""

from __future__ import annotations

import os
import shlex
import shutil
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.errors import InputError, ReadOnlyError
from pairings.store import EventStore
from pairings.store import recorder as recorder_module

from .conftest import snapshot
from .fuzzkit import base_events
from .namespaces import in_namespace, needs_mounts


def _event(folder: Path) -> Path:
    """Four players, round 1 published with one result in (see fuzzkit.base_events)."""
    folder.mkdir()
    path = folder / "club.pairings"
    EventStore.create_from(path, base_events()).close()
    return path


@needs_mounts
def test_read_only_medium_reads_and_refuses_writes(tmp_path: Path) -> None:
    path = _event(tmp_path / "stick")
    before = snapshot(path)
    folder = shlex.quote(str(path.parent))
    ran = in_namespace(
        f"mount --bind {folder} {folder}; mount -o remount,bind,ro {folder}; ! touch {folder}/probe 2>/dev/null",
        [["standings", str(path)], ["log", str(path)], ["verify", str(path)], ["player", "list", str(path)],
         ["player", "add", str(path), "--name", "Late Entry"]],
    )
    standings, log, verify, roster, add = ran
    for done in (standings, log, verify, roster):
        assert done.returncode == 0 and done.stderr == "", done
    assert "Dee Marsh" in standings.stdout and "Dee Marsh" in roster.stdout
    assert len(log.stdout.splitlines()) == 8 and "hash chain: ok (8 events" in verify.stdout
    assert add.returncode == 2 and "can only be read here" in add.stderr and str(path) in add.stderr
    assert snapshot(path) == before and sorted(p.name for p in path.parent.iterdir()) == ["club.pairings"]


@needs_mounts
def test_read_only_medium_with_an_unapplied_write_ahead_log(tmp_path: Path) -> None:
    """A stick pulled out while the desk had it open, the file copied with its -wal: both are read."""
    source = _event(tmp_path / "desk")
    stick = tmp_path / "stick"
    stick.mkdir()
    with EventStore.open(source) as store:
        store.append([ev.PlayerRegistered(id="p5", name="Only In The Log", rating=1400)])
        assert Path(f"{source}-wal").stat().st_size > 0
        for suffix in ("", "-wal"):  # copied while open
            shutil.copyfile(f"{source}{suffix}", stick / f"club.pairings{suffix}")
    path = stick / "club.pairings"
    folder = shlex.quote(str(stick))
    (log,) = in_namespace(f"mount --bind {folder} {folder}; mount -o remount,bind,ro {folder}", [["log", str(path)]])
    assert log.returncode == 0, log
    assert "Only In The Log" in log.stdout.splitlines()[-1]


@needs_mounts
def test_full_disk_still_reads(tmp_path: Path) -> None:
    path = _event(tmp_path / "disk")
    disk = shlex.quote(str(tmp_path / "full"))
    (tmp_path / "full").mkdir()
    inside = f"{disk}/club.pairings"
    setup = (f"mount -t tmpfs -o size=300k tmpfs {disk}; cp {shlex.quote(str(path))} {inside}; "
             f"dd if=/dev/zero of={disk}/filler bs=4k 2>/dev/null || true")
    standings, add = in_namespace(setup, [["standings", inside], ["player", "add", inside, "--name", "Late Entry"]])
    assert standings.returncode == 0 and "Dee Marsh" in standings.stdout, standings
    assert add.returncode == 2 and inside in add.stderr, add
    assert add.stderr.count("\n") == 1


def test_folder_that_cannot_be_written_opens_read_only(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    """Proves the mode choice only: the store is told the folder is not writable (os.access)."""
    path = _event(tmp_path / "backup")
    before = snapshot(path)
    real = os.access
    monkeypatch.setattr(recorder_module.os, "access", lambda p, mode: False if mode & os.W_OK else real(p, mode))
    with EventStore.open(path) as store:
        assert store._recorder.read_only
        assert len(store.state.players) == 4 and store.check_chain().ok
        with pytest.raises(ReadOnlyError, match="can only be read here") as refused:
            store.append([ev.PlayerRegistered(id="p5", name="Late Entry")])
        assert isinstance(refused.value, InputError)  # the desk shows it as a notice, like any refusal
    data, wal = snapshot(path)
    assert data == before[0] and not wal  # nothing written (SQLite may leave an empty -wal beside it)


def test_a_folder_given_as_the_event_file_says_so(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    from pairings.cli import main

    assert main(["standings", str(tmp_path)]) == 2
    assert capsys.readouterr().err == f"pairings: {tmp_path}: is a folder, not an event file\n"


@needs_mounts
def test_printout_and_web_folder_on_a_really_full_disk(tmp_path: Path) -> None:
    """The old PDF and the old web pages survive a write that meets a full disk."""
    path = _event(tmp_path / "event")
    disk = tmp_path / "full"
    disk.mkdir()
    d = shlex.quote(str(disk))
    setup = (f"mount -t tmpfs -o size=400k tmpfs {d}; printf 'old pdf' >{d}/sheet.pdf; mkdir {d}/site; "
             f"printf 'old index' >{d}/site/index.html; dd if=/dev/zero of={d}/filler bs=4k 2>/dev/null || true")
    seen = tmp_path / "seen"  # outside the tmpfs, kept after the namespace is gone
    seen.mkdir()
    s = shlex.quote(str(seen))
    after = f"cp {d}/sheet.pdf {d}/site/index.html {s}/; ls -A {d} {d}/site >{s}/listing"
    pdf, web = in_namespace(setup, [["print", str(path), "standings", "--format", "pdf", "-o", f"{disk}/sheet.pdf"],
                                    ["publish-web", str(path), f"{disk}/site"]], after)
    assert pdf.returncode == 2 and pdf.stderr.startswith(f"pairings: {disk}/sheet.pdf: cannot write ("), pdf
    assert web.returncode == 2 and f"{disk}/site/" in web.stderr and web.stderr.count("\n") == 1, web
    assert "the file there is unchanged" in pdf.stderr
    assert (seen / "sheet.pdf").read_text() == "old pdf" and (seen / "index.html").read_text() == "old index"
    assert ".part" not in (seen / "listing").read_text()


def test_desk_on_a_read_only_file_refuses_a_change_with_a_notice(tmp_path: Path,
                                                                 monkeypatch: pytest.MonkeyPatch) -> None:
    """The desk opens a file it can only read, and a change is refused with the reason, not a crash."""
    import asyncio

    from pairings import actions
    from pairings.tui.app import DeskApp

    path = _event(tmp_path / "backup")
    before = snapshot(path)[0]
    real = os.access
    monkeypatch.setattr(recorder_module.os, "access", lambda p, mode: False if mode & os.W_OK else real(p, mode))
    notices: list[str] = []

    async def drive() -> bool:
        with EventStore.open(path) as store:
            app = DeskApp(store, poll_seconds=3600)
            app.notify = lambda message, **kw: notices.append(str(message))  # type: ignore[method-assign]
            try:
                async with app.run_test(size=(100, 32)) as pilot:
                    await pilot.pause()
                    return app.apply(lambda s: actions.add_player(s, "Late Entry", 1500, None), "added",
                                     store.state.head)
            finally:
                app.offload.close()

    assert asyncio.run(drive()) is False
    assert any("can only be read here" in n for n in notices), notices
    data, wal = snapshot(path)
    assert data == before and not wal
