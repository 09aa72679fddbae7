"""A molecule that has done its part stands clear of the others: checked on the Scene.

The rule (the layout's own: _CLEARANCE, 1.2 bond lengths, is the nearest approach between atoms of
separately placed molecules; common practice in organic chemistry texts: a by-stander drawn
touching another molecule, its proton pointing at an atom, reads as a proton transfer that is not
there): in a panel whose step leaves a molecule alone, no drawn atom of it, the hydrogen it has taken
for good included, is nearer than 1.2 bond lengths to an atom of another molecule.
"""
from __future__ import annotations

import math

from rdkit import Chem

import arrows
from arrows.draw import STYLES, build_scene

from textbook_mechanisms import TEXTBOOK

_CLEARANCE = 1.2


def _stand_by_gap(name: str, panel: int, map_number: int) -> float:
    """The nearest approach, in bond lengths, of the molecule holding atom `map_number` in `panel`
    of the textbook scheme `name` (two-column) to any other molecule's atom there; the step leaving
    the panel must touch no atom of that molecule."""
    trace, diags = arrows.check_text(TEXTBOOK[name][0], name)
    scene = build_scene(trace, STYLES["two-column"], diags)
    step = trace.steps[scene.panels[panel].step]
    mol = step.before.mol
    atom = next(a.GetIdx() for a in mol.GetAtoms() if a.GetAtomMapNum() == map_number)
    molecule = set(next(f for f in Chem.GetMolFrags(mol, sanitizeFrags=False) if atom in f))
    assert not molecule & set(step.change.touched_atoms), "the molecule acts in this panel's step"
    atoms = scene.panels[panel].atoms
    return min(math.dist(a.position, b.position) for a in atoms if a.index in molecule
               for b in atoms if b.index not in molecule) / scene.bond_length


def test_ethanol_standing_by_in_a_robinson_annulation_keeps_clear():
    """Robinson annulation (textbook account: ethoxide and ethanol shuttle the protons), panel 7:
    the ethanol made by the proton transfer before it stands by in the E1cB step. Its new O-H
    pointed 0.96 bond lengths straight at the OH that step pushes out."""
    assert _stand_by_gap("robinson annulation", 7, 14) >= _CLEARANCE


def test_bromide_let_go_in_a_corey_fuchs_keeps_clear():
    """Corey-Fuchs (textbook account: the tribromomethanide takes the bromine's place on the
    phosphonium, and a second triphenylphosphine takes a bromine off its carbon), panel 2: the
    bromide the carbanion pushed off phosphorus stands by while the second phosphine acts. It was
    left where it fell off, 0.48 bond lengths from the ylide's carbon, as if still bonded there."""
    assert _stand_by_gap("corey-fuchs", 2, 3) >= _CLEARANCE
