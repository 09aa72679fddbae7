"""Where a command's result goes: standard output, or a file written atomically (a failed write
is a located message and exit status 2, never a traceback)."""
from __future__ import annotations

import sys
from pathlib import Path
from typing import NoReturn, Optional, Union

import click


def emit(result: Union[str, bytes], output: Optional[str]) -> None:
    """Text to standard output when no file is named; otherwise the file, replaced atomically."""
    if not output:
        click.echo(result, nl=False)
        return
    from ..atomic import write_bytes
    try:
        write_bytes(output, result.encode("utf-8") if isinstance(result, str) else result)
    except OSError as exc:
        cannot_write(output, exc)


def cannot_write(path, exc: OSError) -> NoReturn:
    """The message for an output that cannot be written (a missing or read-only folder), and exit
    status 2. A file or folder made on the way that failed (a cache) is named too; a temporary
    file (arrows.atomic) is not."""
    from ..atomic import TEMP_MARK
    detail = _folder_problem(Path(path))
    if detail is None:
        detail = exc.strerror or str(exc)
        if exc.filename and Path(exc.filename) != Path(path) and TEMP_MARK not in Path(exc.filename).name:
            detail += f" ({exc.filename})"
    click.echo(f"{path}:1:1: error: cannot write {path}: {detail}\n"
               "    hint: check that the folder exists and is writable", err=True)
    sys.exit(2)


def _folder_problem(path: Path) -> Optional[str]:
    """What is wrong with the folders on the way to `path`, in words: the first that is a file or
    does not exist; None when they are all there (the fault is elsewhere: permissions, space)."""
    for folder in reversed(path.parents):
        if str(folder) in ("", "."):
            continue
        if not folder.exists():
            return f"the folder {folder} does not exist"
        if not folder.is_dir():
            return f"{folder} is a file, not a folder"
    return None
