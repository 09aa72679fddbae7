"""`arrows export FILE... --to rxn-smiles|json`: the mechanism for other software.

One FILE gives what it always gave: one JSON document (indented), or one line per step. Several
FILEs, or a folder (the .mech files below it, in natural order, as `arrows check` takes them),
give one output for them all: JSON Lines, one record per mechanism (the document of one FILE on
one line; its `source` is the path as reached from the command line, the folder as given and the
path inside it), or the step lines with that path as a first column. A mechanism with errors is
left out, its errors on stderr; the others are written.
"""
from __future__ import annotations

import re
import sys
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator

import click

from ._args import LocatedPath, with_folders_opened
from ..api import check, checked
from ..diagnostics import ERROR, MechanismError
from ..language import load
from .output import cannot_write, emit, refuse_unsafe_outputs

# Characters that end a line or a column of a tab-separated line (str.splitlines breaks at all but the tab).
_NOT_IN_A_COLUMN = re.compile("[\t\n\r\v\f\x1c-\x1e\x85\u2028\u2029]")


def _one_line(label: str) -> str:
    return re.sub(r"\s+", " ", label).strip()


@click.command("export")
@click.argument("files", nargs=-1, required=True, type=LocatedPath(), metavar="FILE...")
@click.option("--to", "target", type=click.Choice(["rxn-smiles", "json"]), required=True,
              help="rxn-smiles: one atom-mapped reaction SMILES per step, a tab, the step label; "
                   "json: the mechanism and every derived state (schema: arrows/mechanism.schema.json).")
@click.option("-o", "--output", type=LocatedPath(dir_okay=False),
              help="Write to this file (atomically) instead of standard output.")
def export_command(files, target, output):
    """Export FILE for data sets and other software. Only a mechanism without errors is exported.

    Several FILEs, or a folder (every .mech file below it, in natural order: 2-a before 10-b;
    dot-files and dot-folders left out), make one output: with --to json, JSON Lines, one
    record per line, each the document one FILE gives, its "source" the file's path as reached
    from the command line; with --to rxn-smiles, each line starts with that path and a tab. A
    mechanism with errors is left out (its errors on stderr) and the others are written. A
    folder gives this form even when it holds one file; a file named twice is written once.

    Exit status: 0 written, 1 a mechanism has errors (left out), 2 unreadable input.
    """
    if len(files) == 1 and not Path(files[0]).is_dir():
        _export_one(files[0], target, output)
    else:
        sys.exit(_export_many(files, target, output))


def _export_one(file, target, output) -> None:
    """One FILE: one document, or nothing and exit 1 (2 unreadable) when it has errors."""
    refuse_unsafe_outputs({"-o": output}, [file])
    try:
        mechanism = load(file)
    except MechanismError as exc:
        for d in exc.diagnostics:
            click.echo(d.to_text(), err=True)
        sys.exit(2 if any(d.code == "AR100" for d in exc.diagnostics) else 1)
    trace, diagnostics = checked(mechanism)
    problems = [d for d in diagnostics if d.severity == ERROR]
    if problems:
        for d in problems:
            click.echo(d.to_text(), err=True)
        click.echo(f"nothing exported: {file} has {len(problems)} error{'s' if len(problems) != 1 else ''} "
                   "(`arrows check` shows them all)", err=True)
        sys.exit(1)
    if target == "rxn-smiles":
        text = "".join(f"{reaction}\t{label}\n" for reaction, label in _step_lines(trace))
    else:
        from ..mechanism_json import dumps
        text = dumps(mechanism, trace, diagnostics)
    emit(text, output)


def _step_lines(trace) -> list[tuple[str, str]]:
    from ..reaction_smiles import reaction_lines
    return [(reaction, _one_line(label)) for reaction, label in reaction_lines(trace)]


@dataclass
class _Tally:
    exported: int = 0
    left_out: int = 0
    unreadable: bool = False


class _NothingExported(Exception):
    """Every mechanism was left out: the output file is left as it was."""


class _CannotWrite(Exception):
    """Writing the output failed (an OSError of the write, not of reading a mechanism)."""


def _export_many(given, target: str, output) -> int:
    """Several FILEs or folders: one JSON Lines record, or the step lines, per mechanism without
    errors, streamed to stdout or (atomically) to `output`. Returns the exit status."""
    from ..atomic import atomic_file

    paths = with_folders_opened(given)   # files, and an AR100 for a folder without one
    refuse_unsafe_outputs({"-o": output}, list(given) + [p for p in paths if isinstance(p, str)])
    tally = _Tally()
    texts = _exported(paths, target, tally)
    if not output:
        for text in texts:
            click.echo(text, nl=False)
    else:
        reading = False
        try:
            with atomic_file(output) as out:
                reading = True
                for text in texts:
                    try:
                        out.write(text)
                    except OSError as exc:   # (the disk filled up)
                        raise _CannotWrite(exc) from exc
                reading = False
                if not tally.exported:
                    raise _NothingExported
        except _NothingExported:
            pass
        except _CannotWrite as exc:
            cannot_write(output, exc.args[0])
        except OSError as exc:
            if reading:   # a fault of reading or checking a mechanism, not of the output: shown as it is
                raise
            cannot_write(output, exc)   # making the temporary file, or moving it into place
    total = tally.exported + tally.left_out
    where = f" to {output}" if output and tally.exported else ""
    kept = f"; {output} was not written" if output and not tally.exported else ""
    click.echo(f"{tally.exported} of {total} mechanism{'s' if total != 1 else ''} exported{where}"
               + (f", {tally.left_out} left out (errors above; `arrows check` shows every diagnostic)"
                  if tally.left_out else "") + kept, err=True)
    return 2 if tally.unreadable else 1 if tally.left_out else 0


def _exported(paths, target: str, tally: _Tally) -> Iterator[str]:
    """The text of each mechanism without errors (a JSON Lines record, or its step lines); the
    diagnostics of the others go to stderr. `paths`: as with_folders_opened gives them."""
    if target == "json":
        import json

        from .. import mechanism_json

        def text_of(mechanism, trace, diagnostics) -> str:
            line = json.dumps(mechanism_json.document(mechanism, trace, diagnostics), ensure_ascii=False)
            # U+2028 and U+2029, which the language lets through in a title, end a line for
            # str.splitlines; escaped, the record stays one line for every reader.
            return line.replace("\u2028", "\\u2028").replace("\u2029", "\\u2029") + "\n"
    else:
        def text_of(mechanism, trace, diagnostics) -> str:
            name = mechanism.source_name
            return "".join(f"{name}\t{reaction}\t{label}\n" for reaction, label in _step_lines(trace))

    for path in paths:
        if not isinstance(path, str):   # a folder with no .mech file below it
            click.echo(path.to_text(), err=True)
            tally.unreadable = True
            continue
        try:
            mechanism = load(path)
        except MechanismError as exc:
            for d in exc.diagnostics:
                click.echo(d.to_text(), err=True)
            tally.unreadable |= any(d.code == "AR100" for d in exc.diagnostics)
            tally.left_out += 1
            continue
        trace, diagnostics = check(mechanism)   # (nothing asks for this replay again: not remembered)
        problems = [d for d in diagnostics if d.severity == ERROR]
        if problems:
            for d in problems:
                click.echo(d.to_text(), err=True)
            click.echo(f"{path}: not exported: {len(problems)} error{'s' if len(problems) != 1 else ''}", err=True)
            tally.left_out += 1
        elif target == "rxn-smiles" and _NOT_IN_A_COLUMN.search(mechanism.source_name):
            click.echo(f"{path}:1:1: error: the file's path holds a tab or a line break, which the first column "
                       "of --to rxn-smiles cannot hold\n    hint: rename the file, or export it on its own", err=True)
            tally.left_out += 1
        else:
            tally.exported += 1
            yield text_of(mechanism, trace, diagnostics)
