"""Where a command's result goes: standard output, or a file written atomically (a failed write
is a located message and exit status 2, never a traceback)."""
from __future__ import annotations

import sys
from typing import Optional, Union

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
        click.echo(f"{output}:1:1: error: cannot write {output}: {exc.strerror or exc}\n"
                   "    hint: check that the folder exists and is writable", err=True)
        sys.exit(2)
