"""A private mount namespace (``unshare -m``) for tests of read-only media and full disks.

Tests run as root in CI, where ``chmod`` stops no write; a read-only bind mount or
a small tmpfs inside a namespace of the test's own is a real read-only medium or
full disk, and vanishes with the namespace.
"""

from __future__ import annotations

import os
import shlex
import shutil
import subprocess
import sys
import tempfile
from functools import cache
from pathlib import Path

import pytest

ROOT = Path(__file__).parents[2]


@cache
def namespaces() -> bool:
    if not shutil.which("unshare") or not shutil.which("mount"):
        return False
    probe = subprocess.run(["unshare", "-m", "sh", "-c", "mount -t tmpfs tmpfs /mnt"], capture_output=True, timeout=30)
    return probe.returncode == 0


needs_mounts = pytest.mark.skipif(not namespaces(), reason="no mount namespace here (unshare -m)")


def in_namespace(setup: str, commands: list[list[str]], after: str = "") -> list[subprocess.CompletedProcess[str]]:
    """Run ``setup`` (mounts), each pairings command, then ``after``, inside one private mount namespace.

    The shell variable ``$OUT`` names a folder outside the namespace's mounts, for
    ``after`` to copy what the test should look at.
    """
    script = [setup]
    for n, command in enumerate(commands):
        args = " ".join(shlex.quote(a) for a in command)
        script.append(f'rc=0; {shlex.quote(sys.executable)} -m pairings {args} >"$OUT/{n}.out" 2>"$OUT/{n}.err" '
                      f'|| rc=$?; echo $rc >"$OUT/{n}.rc"')
    script.append(after)
    out = Path(tempfile.mkdtemp(prefix="pairings-ns-"))
    try:
        env = dict(os.environ, PYTHONPATH=str(ROOT), OUT=str(out))
        proc = subprocess.run(["unshare", "-m", "sh", "-ec", "\n".join(script)], env=env, capture_output=True,
                              text=True, timeout=120)
        assert proc.returncode == 0, proc.stderr
        return [subprocess.CompletedProcess(c, int((out / f"{n}.rc").read_text()), (out / f"{n}.out").read_text(),
                                            (out / f"{n}.err").read_text()) for n, c in enumerate(commands)]
    finally:
        shutil.rmtree(out, ignore_errors=True)
