"""Where a command's result goes: standard output, or a file written atomically (a failed write
is a message naming the file, a hint and exit status 2, never a traceback)."""
from __future__ import annotations

import os
import sys
from pathlib import Path
from typing import Iterable, NoReturn, Optional, Union

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
    problem = _folder_problem(Path(path))
    if problem is not None:
        _refuse_folder(path, problem)
    detail = exc.strerror or str(exc)
    if exc.filename and Path(exc.filename) != Path(path) and TEMP_MARK not in Path(exc.filename).name:
        detail += f" ({exc.filename})"
    refuse(f"cannot write {path}: {detail}", "check that the folder exists and is writable")


def refuse(message: str, hint: str) -> NoReturn:
    """A bad output (the message names it), with a hint; exit status 2 (bad usage)."""
    from ._args import EXIT_USAGE, Refused
    click.echo(Refused(message, hint).format_message(), err=True)
    sys.exit(EXIT_USAGE)


def refuse_unsafe_outputs(outputs: dict[str, Optional[str]], inputs: Iterable[Union[str, Path]],
                          writes_mechanism: bool = False, stdout: bool = True,
                          inside: Optional[Path] = None, makes_its_folder: tuple[str, ...] = ()) -> None:
    """Stop before any work when an output (option name: path; None when not given; `-` standard
    output, where `stdout` allows it) would destroy an input or another output, or cannot be the
    file it names: one of the inputs, however reached (another spelling, a symlink; `-` among the
    inputs is standard input, the file it was redirected from); another of the outputs; a file
    inside the folder `inside` (collect's figures folder, replaced whole on every run); a name
    ending in .mech, which a later batch would read as a mechanism (unless the command writes
    mechanism text: `writes_mechanism`); a name ending in a slash, or one with nothing before its
    extension (`.pdf`, a hidden file); a folder that does not exist, found before the work (except
    for the options in `makes_its_folder`, whose command makes it: collect's document)."""
    inputs_by_file = {}
    for path in inputs:
        identity = _file_identity(path)
        if identity is not None:
            inputs_by_file.setdefault(identity, path)
    given: dict[Path, str] = {}
    # The folders the command makes on the way to the outputs it makes a folder for: others may go there.
    made = {folder for option in makes_its_folder if outputs.get(option) not in (None, "-")
            for folder in Path(os.path.abspath(outputs[option])).parents}
    for option, output in outputs.items():
        if output is None:
            continue
        if output == "-":
            if stdout:
                continue
            refuse(f"{option} - names standard output, which cannot hold this file",
                   f"name a file: {option} out/{option.strip('-') or 'output'}")
        if not output.strip():
            raise click.BadParameter("an empty name: give a file name", param_hint=option)
        source = inputs_by_file.get(_file_identity(output))
        if source is not None:
            shown = "read from standard input" if str(source) == "-" else str(source)
            refuse(f"{option} {output} is the input {shown}: writing it would replace that input",
                   f"give {option} another file name")
        if output.endswith(("/", os.sep)):
            refuse(f"{option} {output} names a folder; it takes a file name",
                   f"name the file inside the folder: {option} {output}NAME")
        name = Path(output).name
        if name.startswith(".") and "." not in name[1:]:
            refuse(f"{option} {output} has nothing before its extension: it would be a hidden file",
                   f"give it a name: {option} {Path(output).with_name('out' + name)}")
        if Path(output).suffix.lower() == ".mech" and not writes_mechanism:
            refuse(f"{option} {output} ends in .mech, the name of a mechanism file",
                   "name the output for what it holds: figure.svg, si.pdf, report.json")
        where = Path(os.path.abspath(output))
        if where in given:
            refuse(f"{option} {output} is also given to {given[where]}: one would replace the other",
                   f"give {option} a file name of its own")
        given[where] = option
        if inside is not None and Path(os.path.abspath(inside)) in where.parents:
            refuse(f"{option} {output} is inside {inside}, which every run replaces whole",
                   f"write {option} beside that folder")
        folder = (_folder_problem(Path(output)) if option not in makes_its_folder
                  and Path(os.path.abspath(output)).parent not in made else None)
        if folder is not None:
            _refuse_folder(output, folder)
    for option, output in outputs.items():
        problem = _cannot_create(output) if output not in (None, "-") else None
        if problem is not None:   # (--junit /proc/j.xml was refused only after the document was written)
            refuse(f"cannot write {output}: {problem}", "check that the folder exists and is writable")


def _cannot_create(output: str) -> Optional[str]:
    """Why no file can be made beside `output` (a read-only folder, /proc, /sys), in words; None
    when one can, or when the folder does not exist yet (the command makes it, or says so). A
    temporary file is made and removed, as arrows.atomic makes one to write the output."""
    path = Path(os.path.abspath(output))
    if path.exists() and not path.is_file():
        return None   # a device or a pipe (-o /dev/null) is written in place; a folder is refused elsewhere
    if not path.parent.is_dir():
        return None
    import tempfile

    from ..atomic import temp_prefix
    try:
        handle, temp = tempfile.mkstemp(prefix=temp_prefix(path.name), dir=path.parent)
    except OSError as exc:
        return f"no file can be made in {path.parent} ({exc.strerror or exc})"
    os.close(handle)
    os.unlink(temp)
    return None


def _file_identity(path) -> Optional[tuple[int, int]]:
    """The file a path leads to (device and inode, through any symlink; `-`: the file standard
    input reads from); None when there is none."""
    try:
        found = os.fstat(sys.stdin.fileno()) if str(path) == "-" else os.stat(path)
    except (OSError, ValueError):
        return None
    return found.st_dev, found.st_ino


def _folder_problem(path: Path) -> Optional[Path]:
    """The first folder on the way to `path` that is a file or does not exist; None when they are
    all there (the fault is elsewhere: permissions, space)."""
    for folder in reversed(path.parents):
        if str(folder) in ("", "."):
            continue
        if not folder.is_dir():
            return folder
    return None


def _refuse_folder(output, folder: Path) -> NoReturn:
    """`output` cannot be written because `folder`, on its way, is missing or is a file."""
    if folder.exists():
        refuse(f"cannot write {output}: {folder} is a file, not a folder",
               f"name a file in a folder that exists, or move {folder} away")
    refuse(f"cannot write {output}: the folder {folder} does not exist",
           "make that folder first, or name a file in a folder that exists")
