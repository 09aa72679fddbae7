"""`arrows import FILE.json`: a mechanism exported as JSON, back to .mech text."""
from __future__ import annotations

import sys

import click

from ._args import LocatedPath
from ..diagnostics import MechanismError
from ..language import MAX_FILE_BYTES
from ..mechanism_json import load
from ..writer import to_text
from .output import emit, refuse_unsafe_outputs


@click.command("import")
@click.argument("file", type=LocatedPath())
@click.option("-o", "--output", type=LocatedPath(dir_okay=False),
              help="Write the .mech text to this file (atomically) instead of standard output.")
def import_command(file, output):
    """Read a JSON mechanism (arrows/mechanism.schema.json) and print it as .mech text.

    Only the mechanism as written is used: derived states and diagnostics in the file are checked
    against the schema and then set aside, because `arrows check` derives them again. FILE is one
    document, as `arrows export FILE --to json` writes it; JSON Lines (several FILEs exported
    together) is refused. A mechanism that `arrows check` could not read back (a SMILES RDKit
    cannot read, a move naming no atom: the AR1xx errors) is refused, located in FILE, and
    nothing is written; its chemistry is left to `arrows check`. Exit status: 0 written, 2
    unreadable input.
    """
    refuse_unsafe_outputs({"-o": output}, [file], writes_mechanism=True)
    try:
        mechanism = load(file)
    except MechanismError as exc:
        for d in exc.diagnostics:
            click.echo(d.to_text(), err=True)
        sys.exit(2)
    unreadable = _reading_errors(mechanism)
    if unreadable:
        for d in unreadable:
            click.echo(d.to_text(), err=True)
        click.echo(f"{file}: not imported: {len(unreadable)} error{'s' if len(unreadable) != 1 else ''}; "
                   "nothing written", err=True)
        sys.exit(2)
    text = to_text(mechanism)
    if len(text.encode("utf-8")) > MAX_FILE_BYTES:
        click.echo(f"{file}:1:1: error AR100 the mechanism text would be {len(text.encode('utf-8')):,} bytes, over the "
                   f"{MAX_FILE_BYTES:,} a mechanism file may hold; nothing written\n"
                   "    hint: split the mechanism into several files", err=True)
        sys.exit(2)
    emit(text, output)


def _reading_errors(mechanism) -> list:
    """The errors of the family "reading the file" (AR1xx) that `arrows check` would give the
    written text: what makes the .mech file one that cannot be read back."""
    from ..api import check
    from ..diagnostics import ERROR
    _, diagnostics = check(mechanism)
    return [d for d in diagnostics if d.severity == ERROR and d.code.startswith("AR1")]
