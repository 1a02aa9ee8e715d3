"""Writing printouts and web pages so that a failed write leaves the old file whole.

Every file is first written to a temporary file beside its target, flushed to the
disk, and only then renamed over the target (a rename within one folder replaces
the file in one step: POSIX ``rename``, Windows ``MoveFileEx`` through
:func:`os.replace`). A full disk or a refused folder therefore never leaves a
truncated PDF or an empty ``index.html``: the target keeps its old content, the
temporary files are removed, and the error names the path.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Sequence

from pairings.errors import OutputError

__all__ = ["write_file", "write_files"]


def _write_all(fd: int, data: bytes) -> None:
    view = memoryview(data)
    while view:
        view = view[os.write(fd, view):]


def _staged(target: Path, data: bytes) -> Path:
    """``data`` in a new temporary file in ``target``'s folder, flushed to the disk."""
    fd, name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=target.parent)
    try:
        _write_all(fd, data)
        os.fchmod(fd, _mode(target))
        os.fsync(fd)
    except BaseException:
        os.close(fd)
        os.unlink(name)
        raise
    os.close(fd)
    return Path(name)


def _mode(target: Path) -> int:
    """The old file's permissions, or what a plain new file gets under the umask."""
    try:
        return target.stat().st_mode & 0o777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def write_files(files: Sequence[tuple[Path, str | bytes]]) -> None:
    """Write every ``(path, data)`` (text as UTF-8): all files are staged first, then renamed into place.

    Raises :class:`~pairings.errors.OutputError` naming the path that failed; then no
    target has changed (a failure while renaming, after every file was staged, can
    leave the earlier targets new and the later ones old, each of them whole).
    """
    staged: list[tuple[Path, Path]] = []
    current = Path()
    try:
        for current, data in files:
            raw = data.encode("utf-8") if isinstance(data, str) else data
            staged.append((_staged(current, raw), current))
        for temporary, current in staged:
            os.replace(temporary, current)
    except BaseException as exc:
        for temporary, _ in staged:
            temporary.unlink(missing_ok=True)
        if not isinstance(exc, OSError):
            raise
        kept = "the file there is unchanged" if current.exists() else "nothing written there"
        raise OutputError(f"{current}: cannot write ({exc.strerror or exc}); {kept}") from None


def write_file(path: Path, data: str | bytes) -> None:
    """Write one printout (see :func:`write_files`)."""
    write_files([(path, data)])
