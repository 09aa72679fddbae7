"""`arrows new NAME`: a starter NAME.mech with one species and an empty step."""
from __future__ import annotations

import os
import sys
import tempfile
from pathlib import Path

import click

from ..numbering import numbered, numbered_smiles
from ..rdkit_io import reading_hint, unreadable
from .output import cannot_write, refuse

STARTER_SMILES = "CC(C)=O"   # acetone: a demo species to replace with your own

STARTER = """\
# {name}: a new mechanism. Replace the species with your own; `arrows number "SMILES"` prints a
# SMILES with every heavy atom numbered, and `arrows check {file}` checks what you write.
title "{name}"

species start = "{smiles}"

step "first step"
    # one electron move per line, e.g.
    #   :O4 -> H(O5)      a lone pair of O4 takes a proton from O5
    #   C2=O4 -> O4       the C=O pi pair moves onto O4
end
"""


def _create_new(path: Path, text: str) -> None:
    """Write `text` to `path` atomically, failing if `path` exists (a hard link never replaces)."""
    handle, temp = tempfile.mkstemp(prefix=f".{path.name}.", dir=path.parent)
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as out:
            out.write(text)
        os.chmod(temp, 0o644)
        os.link(temp, path)
    finally:
        os.unlink(temp)


@click.command("new")
@click.argument("name")
@click.argument("species_smiles", metavar="[SMILES]", required=False)
@click.option("--smiles", default=None,
              help=f"The starting species (or give it after NAME); its heavy atoms are numbered as "
                   f"`arrows number` does.  [default: {STARTER_SMILES}]")
def new_command(name, species_smiles, smiles):
    """Write NAME.mech: a title, one species with numbered atoms, and an empty step to fill in.

    An existing file is never overwritten. Exit status: 0 written, 2 the file exists or bad input.
    """
    path = Path(name if name.endswith(".mech") else name + ".mech")
    if species_smiles is not None and smiles is not None and species_smiles != smiles:
        refuse(f"two starting species given: {species_smiles} and --smiles {smiles}",
               "give the SMILES once, after NAME or with --smiles")
    smiles = species_smiles or smiles or STARTER_SMILES
    if not name.strip() or name.strip() == ".mech":
        refuse("an empty name would make a hidden file `.mech`", "give the mechanism a name: arrows new aldol")
    from ..language import first_unwritable
    bad = first_unwritable(path.stem)
    if bad is not None:   # the name is the file's title too: it must be text a figure can hold
        column, what = bad
        refuse(f"the name holds {what} (character {column}); nothing written",
               "choose a plain file name, typed in UTF-8")
    if '"' in path.stem or "\n" in path.stem:
        refuse("a name cannot hold a double quote or a line break", "choose a plain file name")
    try:
        species = numbered_smiles(numbered(smiles))
    except ValueError as exc:
        column = (getattr(exc, "position", None) or 0) + 1
        hint = reading_hint(str(exc), "check brackets, ring-closure digits and charges")
        click.echo(f"<SMILES>:1:{column}: error AR102 {unreadable('the SMILES', str(exc))}\n"
                   f"    hint: {hint}", err=True)
        sys.exit(2)
    try:
        _create_new(path, STARTER.format(name=path.stem, file=path.name, smiles=species))
    except FileExistsError:
        refuse(f"{path} already exists; nothing written", f"choose another name, or edit {path} itself")
    except OSError as exc:
        cannot_write(path, exc)
    click.echo(f"wrote {path}", err=True)
