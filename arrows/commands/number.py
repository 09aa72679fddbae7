"""`arrows number SMILES`: the SMILES with a map number on every heavy atom, to write moves against."""
from __future__ import annotations

import re
import sys
from pathlib import Path

import click

from ._args import LocatedPath
from ..numbering import numbered, numbered_smiles
from ..rdkit_io import reading_hint, unreadable
from .output import emit, refuse

FIGURE_SUFFIXES = (".svg", ".png")


@click.command("number")
@click.argument("smiles")
@click.option("--first", type=click.IntRange(min=1, max=999_999), default=1, show_default=True,
              help="The first map number (to keep numbers unique across the species of a mechanism).")
@click.option("-o", "--output", type=LocatedPath(dir_okay=False),
              help="Also draw the molecule with its numbers to this .svg or .png file.")
def number_command(smiles, first, output):
    """Print SMILES with a map number on every heavy atom, numbered along the main chain.

    The main chain is the longest path between two carbons (through heteroatoms and around rings),
    numbered from the end nearer its first branch; branches follow, chain atom by chain atom.
    The SMILES keeps the order it was written in and shows double bonds in Kekulé form, so the
    bonds a move can name are visible. Exit status: 0 done, 2 unreadable SMILES or bad usage.
    """
    if output and Path(output).suffix.lower() not in FIGURE_SUFFIXES:
        refuse(f"-o {output} does not end in .svg or .png: the drawing is written as one of those",
               f"for example -o {Path(output).with_suffix('.svg')}")
    try:
        mol = numbered(smiles, first)
    except ValueError as exc:
        column = (getattr(exc, "position", None) or 0) + 1
        hint = reading_hint(str(exc), "check brackets, ring-closure digits and charges")
        click.echo(f"<SMILES>:1:{column}: error AR102 {unreadable('the SMILES', str(exc))}\n"
                   f"    hint: {hint}", err=True)
        sys.exit(2)
    if ":" in smiles and re.search(r"\[[^\]]*:\d+\]", smiles):
        click.echo("<SMILES>:1:1: note: the map numbers written in the SMILES are replaced; to keep some, "
                   "number the rest by hand", err=True)
    click.echo(numbered_smiles(mol))
    if output:
        from ..numbering import numbered_svg
        svg = numbered_svg(mol).encode("utf-8")
        if output.lower().endswith(".png"):
            import cairosvg
            svg = cairosvg.svg2png(bytestring=svg, scale=2)
        emit(svg, output)
        click.echo(f"drew {output}", err=True)
