"""`arrows import FILE.json`: a mechanism exported as JSON, back to .mech text."""
from __future__ import annotations

import sys

import click

from ..diagnostics import MechanismError
from ..mechanism_json import load
from ..writer import to_text
from .output import emit


@click.command("import")
@click.argument("file", type=click.Path())
@click.option("-o", "--output", type=click.Path(dir_okay=False),
              help="Write the .mech text to this file (atomically) instead of standard output.")
def import_command(file, output):
    """Read a JSON mechanism (arrows/mechanism.schema.json) and print it as .mech text.

    Only the mechanism as written is read; derived states and diagnostics in the file are
    ignored, because `arrows check` derives them again. Exit status: 0 written, 2 unreadable input.
    """
    try:
        mechanism = load(file)
    except MechanismError as exc:
        for d in exc.diagnostics:
            click.echo(d.to_text(), err=True)
        sys.exit(2)
    text = to_text(mechanism)
    emit(text, output)
