"""`arrows explain CODE`: what a diagnostic means, with a small example."""
from __future__ import annotations

import sys
import textwrap

import click

from ..diagnostics import CODES


@click.command("explain")
@click.argument("code", required=False)
def explain_command(code):
    """Explain a diagnostic CODE (e.g. AR201); with no CODE, list them all."""
    if not code:
        for c in CODES.values():
            click.echo(f"{c.code}  {c.severity:<7}  {c.title}")
        return
    entry = CODES.get(code.upper())
    if entry is None:
        click.echo(f"unknown code {code!r}; `arrows explain` lists them all", err=True)
        sys.exit(2)
    click.echo(f"{entry.code} ({entry.severity}): {entry.title}\n\n{textwrap.fill(entry.explanation, 88)}")
    if entry.example:
        click.echo("\nExample:\n" + "\n".join("    " + line for line in entry.example.splitlines()))
