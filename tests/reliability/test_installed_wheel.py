"""An installed wheel, not the checkout: `pairings demo` must work from what the wheel carries.

The wheel is built from a copy of the sources (so no build folder lands in the
checkout) and installed without its dependencies into a fresh virtual environment
outside the checkout; the dependencies are lent from the test's own environment by
a path file, which adds their folder to ``sys.path`` but runs none of the path
files in it, so the checkout's editable install stays out of sight (the test checks
that ``pairings`` is imported from the new environment). About 15 s.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import sysconfig
import time
from pathlib import Path

import pytest

from pairings.store import EventStore

ROOT = Path(__file__).parents[2]
SESSION = "pairings-wheel-demo"


def _run(*args: str | Path, cwd: Path, env: dict[str, str]) -> subprocess.CompletedProcess[str]:
    return subprocess.run([str(a) for a in args], cwd=cwd, env=env, capture_output=True, text=True, timeout=300)


@pytest.fixture(scope="module")
def installed(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, dict[str, str]]:
    """(the new environment's bin folder, an environment without the checkout on any path)."""
    work = tmp_path_factory.mktemp("wheel")
    source = work / "source"
    # .hypothesis too: a parallel worker's hypothesis tests write there while this copy runs.
    shutil.copytree(ROOT, source, ignore=shutil.ignore_patterns(
        ".git", ".venv", "build", "*.egg-info", "__pycache__", "*.so", ".*_cache", ".hypothesis", "tests"))
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHOME", "VIRTUAL_ENV")}
    built = _run(sys.executable, "-m", "pip", "wheel", source, "--no-deps", "-q", "-w", work / "dist", cwd=work, env=env)
    assert built.returncode == 0, built.stderr
    (wheel,) = (work / "dist").glob("pairings-*.whl")
    venv = work / "venv"
    made = _run(sys.executable, "-m", "venv", "--without-pip", venv, cwd=work, env=env)
    assert made.returncode == 0, made.stderr
    python = venv / "bin" / "python"
    done = _run(sys.executable, "-m", "pip", "--python", python, "install", "--no-deps", "--no-index", "-q", wheel,
                cwd=work, env=env)
    assert done.returncode == 0, done.stderr
    purelib = Path(_run(python, "-c", "import sysconfig; print(sysconfig.get_path('purelib'))", cwd=work,
                        env=env).stdout.strip())
    (purelib / "lent-dependencies.pth").write_text(sysconfig.get_path("purelib") + "\n", encoding="utf-8")
    return venv / "bin", env


def test_the_installed_package_is_the_wheel(installed: tuple[Path, dict[str, str]], tmp_path: Path) -> None:
    bin_, env = installed
    where = _run(bin_ / "python", "-c", "import pairings; print(pairings.__file__)", cwd=tmp_path, env=env)
    assert Path(where.stdout.strip()).is_relative_to(bin_.parent), where


def test_demo_from_the_wheel_writes_a_loadable_copy(installed: tuple[Path, dict[str, str]], tmp_path: Path) -> None:
    bin_, env = installed
    demo = tmp_path / "demo.pairings"
    ran = _run(bin_ / "pairings", "demo", "--no-desk", "--file", demo, cwd=tmp_path, env=env)
    assert ran.returncode == 0, ran.stderr
    assert f"demo event written to {demo}" in ran.stdout
    with EventStore.open(demo) as store:
        assert store.state.settings.name == "Winter Weekend Open 2026" and len(store.state.players) == 40


def test_desk_opens_on_the_demo_from_the_wheel(installed: tuple[Path, dict[str, str]], tmp_path: Path) -> None:
    """A real terminal (tmux): the desk's stylesheet and the scenario both come from the wheel."""
    if shutil.which("tmux") is None:
        pytest.skip("tmux is not installed (.ci/run installs it)")
    bin_, env = installed
    command = f"cd {tmp_path} && env -u PYTHONPATH {bin_ / 'pairings'} demo --file {tmp_path / 'demo.pairings'}"
    subprocess.run(["tmux", "kill-session", "-t", SESSION], capture_output=True)
    subprocess.run(["tmux", "new-session", "-d", "-s", SESSION, "-x", "100", "-y", "30", command], check=True, env=env)
    try:
        deadline, screen = time.monotonic() + 30, ""
        while time.monotonic() < deadline and not ("Winter Weekend Open" in screen and " Round · round 4 of 7" in screen):
            time.sleep(0.2)
            screen = subprocess.run(["tmux", "capture-pane", "-t", SESSION, "-p"], capture_output=True,
                                    text=True).stdout
        assert "Winter Weekend Open" in screen and " Round · round 4 of 7" in screen, screen
        assert "Traceback" not in screen and "scenario missing" not in screen
    finally:
        subprocess.run(["tmux", "kill-session", "-t", SESSION], capture_output=True)
