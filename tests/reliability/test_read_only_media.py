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
import subprocess
import sys
from functools import cache
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.errors import StoreError
from pairings.store import EventStore
from pairings.store import recorder as recorder_module

from .conftest import snapshot
from .fuzzkit import base_events

ROOT = Path(__file__).parents[2]


@cache
def _namespaces() -> bool:
    if not shutil.which("unshare") or not shutil.which("mount"):
        return False
    probe = subprocess.run(["unshare", "-m", "sh", "-c", "mount -t tmpfs tmpfs /mnt"], capture_output=True, timeout=30)
    return probe.returncode == 0


needs_mounts = pytest.mark.skipif("not _namespaces()", reason="no mount namespace here (unshare -m)")


def _in_namespace(setup: str, commands: list[list[str]]) -> list[subprocess.CompletedProcess[str]]:
    """Run ``setup`` (mounts) and then each pairings command inside one private mount namespace."""
    script = [setup]
    for n, command in enumerate(commands):
        args = " ".join(shlex.quote(a) for a in command)
        script.append(f'rc=0; {shlex.quote(sys.executable)} -m pairings {args} >"$OUT/{n}.out" 2>"$OUT/{n}.err" '
                      f'|| rc=$?; echo $rc >"$OUT/{n}.rc"')
    out = Path(os.environ.get("TMPDIR", "/tmp")) / f"pairings-ns-{os.getpid()}"
    shutil.rmtree(out, ignore_errors=True)
    out.mkdir()
    try:
        env = dict(os.environ, PYTHONPATH=str(ROOT), OUT=str(out))
        proc = subprocess.run(["unshare", "-m", "sh", "-ec", "\n".join(script)], env=env, capture_output=True,
                              text=True, timeout=120)
        assert proc.returncode == 0, proc.stderr
        return [subprocess.CompletedProcess(c, int((out / f"{n}.rc").read_text()), (out / f"{n}.out").read_text(),
                                            (out / f"{n}.err").read_text()) for n, c in enumerate(commands)]
    finally:
        shutil.rmtree(out, ignore_errors=True)


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
    ran = _in_namespace(
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
    """A stick pulled out while the desk had it open: the newest events are only in the -wal file."""
    source = _event(tmp_path / "desk")
    stick = tmp_path / "stick"
    stick.mkdir()
    with EventStore.open(source) as store:
        store.append([ev.PlayerRegistered(id="p5", name="Only In The Log", rating=1400)])
        assert Path(f"{source}-wal").stat().st_size > 0
        for suffix in ("", "-wal"):  # copied while open: the log is not checkpointed into the file
            shutil.copyfile(f"{source}{suffix}", stick / f"club.pairings{suffix}")
    path = stick / "club.pairings"
    folder = shlex.quote(str(stick))
    (log,) = _in_namespace(f"mount --bind {folder} {folder}; mount -o remount,bind,ro {folder}", [["log", str(path)]])
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
    standings, add = _in_namespace(setup, [["standings", inside], ["player", "add", inside, "--name", "Late Entry"]])
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
        with pytest.raises(StoreError, match="can only be read here"):
            store.append([ev.PlayerRegistered(id="p5", name="Late Entry")])
    data, wal = snapshot(path)
    assert data == before[0] and not wal  # nothing written (SQLite may leave an empty -wal beside it)


def test_a_folder_given_as_the_event_file_says_so(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    from pairings.cli import main

    assert main(["standings", str(tmp_path)]) == 2
    assert capsys.readouterr().err == f"pairings: {tmp_path}: is a folder, not an event file\n"
