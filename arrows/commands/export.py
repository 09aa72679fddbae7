"""`arrows export FILE --to rxn-smiles|json`: the mechanism for other software."""
from __future__ import annotations

import re
import sys

import click

from ._args import LocatedPath
from ..api import checked
from ..diagnostics import ERROR, MechanismError
from ..language import load
from .output import emit, refuse_unsafe_outputs


def _one_line(label: str) -> str:
    return re.sub(r"\s+", " ", label).strip()


@click.command("export")
@click.argument("file", type=LocatedPath())
@click.option("--to", "target", type=click.Choice(["rxn-smiles", "json"]), required=True,
              help="rxn-smiles: one atom-mapped reaction SMILES per step, a tab, the step label; "
                   "json: the mechanism and every derived state (schema: arrows/mechanism.schema.json).")
@click.option("-o", "--output", type=LocatedPath(dir_okay=False),
              help="Write to this file (atomically) instead of standard output.")
def export_command(file, target, output):
    """Export FILE for data sets and other software. Only a mechanism without errors is exported.

    Exit status: 0 written, 1 the mechanism has errors, 2 unreadable input.
    """
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
        from ..reaction_smiles import reaction_lines
        text = "".join(f"{reaction}\t{_one_line(label)}\n" for reaction, label in reaction_lines(trace))
    else:
        from ..mechanism_json import dumps
        text = dumps(mechanism, trace, diagnostics)
    emit(text, output)
