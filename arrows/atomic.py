"""Atomic outputs: a file or a folder appears complete or not at all.

Everything is written under a temporary name in the destination's own folder (same file system),
then moved into place with os.replace, so an interrupted run leaves the previous output as it was.
"""
from __future__ import annotations

import os
import shutil
import tempfile
from contextlib import contextmanager
from pathlib import Path
from typing import IO, Iterator

TEMP_MARK = ".arrows-tmp-"


def temp_prefix(name: str) -> str:
    # The process id in the name tells a leftover of a dead run from a run still going.
    return f"{TEMP_MARK}{name}.{os.getpid()}."


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


@contextmanager
def atomic_file(path: str | Path, mode: str = "w", encoding: str | None = "utf-8") -> Iterator[IO]:
    """Open a temporary file beside `path`; on a clean exit it replaces `path`, otherwise it is removed."""
    path = Path(path)
    if path.exists() and not path.is_file():
        # A device or a pipe (-o /dev/null, a FIFO): replacing it would put a plain file in its
        # place, so it is written in place.
        with open(path, mode, encoding=None if "b" in mode else encoding) as handle:
            yield handle
        return
    fd, temp = tempfile.mkstemp(prefix=temp_prefix(path.name), dir=path.parent)
    try:
        os.chmod(temp, 0o666 & ~_umask())   # mkstemp makes 0600; the output gets the usual mode
        with os.fdopen(fd, mode, encoding=None if "b" in mode else encoding) as handle:
            yield handle
        os.replace(temp, path)
    except BaseException:
        _remove(Path(temp))
        raise


def write_bytes(path: str | Path, data: bytes) -> None:
    with atomic_file(path, "wb") as handle:
        handle.write(data)


def write_text(path: str | Path, text: str) -> None:
    with atomic_file(path, "w") as handle:
        handle.write(text)


def temp_dir_beside(path: str | Path) -> Path:
    """A fresh temporary folder in the folder of `path`, for building an output before swapping it in."""
    path = Path(path)
    made = Path(tempfile.mkdtemp(prefix=temp_prefix(path.name), dir=path.parent))
    made.chmod(0o777 & ~_umask())
    return made


def replace_dir(new: Path, destination: Path) -> None:
    """Put folder `new` at `destination`. An existing destination is first renamed aside, so that a
    complete folder is in place at every moment but one rename."""
    old = None
    if destination.exists():
        old = Path(tempfile.mkdtemp(prefix=temp_prefix(destination.name), dir=destination.parent))
        os.replace(destination, old / destination.name)
    os.replace(new, destination)
    if old is not None:
        _remove(old)


def remove_stale_temps(folder: Path) -> None:
    """Leftovers in `folder` of earlier runs that were killed before they could clean up (their
    process is gone); temporaries of runs still going are left alone."""
    for leftover in folder.glob(TEMP_MARK + "*"):
        # names are TEMP_MARK + name + "." + pid + "." + random suffix (no dots)
        pid = leftover.name.rpartition(".")[0].rpartition(".")[2]
        if pid.isdigit() and not _alive(int(pid)):
            _remove(leftover)


def _alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


def _remove(path: Path) -> None:
    if path.is_dir() and not path.is_symlink():
        shutil.rmtree(path, ignore_errors=True)
    else:
        try:
            path.unlink()
        except FileNotFoundError:
            pass
