"""`arrows trace FILE`: every derived state, with what changed at each step."""
from __future__ import annotations

import sys

import click

from ._args import LocatedPath
from ..api import check_file
from ..diagnostics import ERROR
from ..electrons import ElectronState, bond_label, order_word
from ..rdkit_io import canonical, formula


def _released(state: ElectronState, atoms) -> str:
    """Each fragment let go, as its SMILES with the numbered atoms it holds (`CCO (O4)`): an
    unnumbered atom's position in the state (`C(atom 13)`) means nothing to the author."""
    from rdkit import Chem
    from ..rdkit_io import fragment
    pieces = []
    for frag in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False):
        if not set(frag) & set(atoms):
            continue
        numbered = [state.label(i) for i in frag if state.mol.GetAtomWithIdx(i).GetAtomMapNum()
                    and state.elements[i] != 1]
        smiles = canonical(fragment(state.mol, frag))
        pieces.append(f"{smiles} ({', '.join(numbered)})" if numbered else smiles)
    return "; ".join(pieces)


def _state_lines(state: ElectronState) -> list[str]:
    from rdkit import Chem
    mol = Chem.Mol(state.mol)
    Chem.SanitizeMol(mol)
    charge = Chem.GetFormalCharge(mol)
    return [f"  SMILES   {canonical(state.mol)}",
            f"  formula  {formula(mol)}   net charge {charge:+d}" if charge else
            f"  formula  {formula(mol)}   net charge 0"]


@click.command("trace")
@click.argument("file", type=LocatedPath())   # a missing file or a folder is reported as AR100
@click.option("--stereo", is_flag=True, help="Also show stereo elements made or lost at each step, each "
              "with its CIP label (R/S, E/Z) or `unset`, the stereoisomers of the final state, and how "
              "stereo-specified checkpoints relate.")
def trace_command(file, stereo):
    """Print the starting state and the state after every step: canonical SMILES, formula, net
    charge, the bonds formed, broken and changed in order, and for each atom the step's moves
    touch its formal charge and lone pairs."""
    trace, diags = check_file(file)
    if trace is None or trace.initial is None or trace.initial.mol.GetNumAtoms() == 0:
        # (an empty file has an empty starting state: no SMILES or formula to print)
        for d in diags:
            click.echo(d.to_text(), err=True)
        sys.exit(2 if any(d.code == "AR100" for d in diags) else 1)
    click.echo("start")
    for line in _state_lines(trace.initial):
        click.echo(line)
    for st in trace.steps:
        kind = "" if st.step.kind == "forward" else f" ({st.step.kind})"
        click.echo(f"\nstep {st.index + 1}: {st.step.label}{kind}")
        if st.after is None:
            click.echo("  not derived: the moves of this step cannot be applied (see the errors below)")
            break
        for line in _state_lines(st.after):
            click.echo(line)
        after = st.after
        for i, j in st.change.formed:
            click.echo(f"  formed   {bond_label(after.mol, i, j)}")
        for i, j in st.change.broken:
            click.echo(f"  broken   {bond_label(st.before.mol, i, j)}")
        for (i, j), old, new in st.change.reordered:
            click.echo(f"  bond     {after.label(i)}-{after.label(j)} {order_word(old)} -> {order_word(new)}")
        for i in st.change.touched_atoms:
            atom = after.mol.GetAtomWithIdx(i)
            if atom.GetAtomicNum() == 1:
                continue
            pairs, unpaired = divmod(after.nonbonding[i], 2)
            charge = atom.GetFormalCharge()
            text = f"  atom     {after.label(i)}: charge {charge:+d}" if charge else f"  atom     {after.label(i)}: charge 0"
            text += f", {pairs} lone pair{'s' if pairs != 1 else ''}"
            if unpaired:
                text += ", 1 unpaired electron"
            click.echo(text)
        if st.released_now:
            click.echo(f"  released {_released(after, st.released_now)}")
        for d in diags:
            if d.step == st.index and d.severity != ERROR:
                click.echo(f"  {d.severity} {d.code} {d.message}")
        if stereo:
            from ._stereo_lines import step_lines
            click.echo("\n".join(step_lines(st)))
    if stereo:
        from ._stereo_lines import final_lines
        click.echo("\n".join(final_lines(trace)))
    problems = [d for d in diags if d.severity == ERROR]
    if problems:
        click.echo("")
        for d in problems:
            click.echo(d.to_text())
        sys.exit(1)
