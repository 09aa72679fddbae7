"""`arrows check FILE...`: compiler-style diagnostics and an exit code."""
from __future__ import annotations

import json
import sys

import click

from ..api import check_file
from ..diagnostics import ERROR, WARNING


@click.command("check")
@click.argument("files", nargs=-1, required=True, type=click.Path(dir_okay=False))
@click.option("--format", "fmt", type=click.Choice(["text", "json"]), default="text", show_default=True,
              help="text: file:line:col: severity CODE message; json: one array of diagnostics.")
@click.option("--strict", is_flag=True, help="Treat warnings as failures (exit 1).")
@click.option("--quiet", "-q", is_flag=True, help="Print only errors.")
def check_command(files, fmt, strict, quiet):
    """Replay every electron move in FILES and check every intermediate.

    Exit status: 0 clean, 1 errors found (or warnings with --strict), 2 unreadable input or bad usage.
    """
    everything, unreadable, failing = [], False, False
    for path in files:
        _, diags = check_file(path)
        if any(d.code == "AR100" for d in diags):
            unreadable = True
        if any(d.severity == ERROR or (strict and d.severity == WARNING) for d in diags):
            failing = True
        everything.extend(diags)
        if fmt == "text":
            for d in diags:
                if quiet and d.severity != ERROR:
                    continue
                click.echo(d.to_text())
    if fmt == "json":
        click.echo(json.dumps([d.to_dict() for d in everything], indent=2, ensure_ascii=False))
    elif not quiet:
        n_err = sum(d.severity == ERROR for d in everything)
        n_warn = sum(d.severity == WARNING for d in everything)
        click.echo(f"{len(files)} file{'s' if len(files) != 1 else ''} checked: "
                   f"{n_err} error{'s' if n_err != 1 else ''}, {n_warn} warning{'s' if n_warn != 1 else ''}", err=True)
    sys.exit(2 if unreadable else 1 if failing else 0)
