"""Each elementary step as an atom-mapped reaction SMILES (Daylight reaction SMILES:
reactants>>products).

Which molecules: the fragments that take part in the step, i.e. every fragment holding an atom
whose electrons the step moves, before the step on the left and after it on the right. The two
sides hold the same atoms: a bond that breaks or forms has both its atoms touched. Spectators and
fragments released in earlier steps are left out. A step without moves changes nothing and is
written as `>>`.

Atom maps: every atom keeps the map number written in the mechanism; each unmapped atom (and every
hydrogen of an atom a move names a hydrogen of, `H(C3)`, which the engine makes explicit: all of
them, as a move does not say which one) gets a fresh number above the largest one written, by its
index in the replay. Atom indices are identities across the whole replay, so
an atom carries the same number in every step of one mechanism.
"""
from __future__ import annotations

from rdkit import Chem

from .trace import StepTrace, Trace


def fresh_map_numbers(trace: Trace) -> dict[int, int]:
    """Atom index -> map number for every atom of the mechanism (written maps kept)."""
    states = list(trace.states())
    if not states:
        return {}
    # The last state holds every atom: atoms are only appended along a replay.
    mol = max((s.mol for s in states), key=lambda m: m.GetNumAtoms())
    written = {a.GetIdx(): a.GetAtomMapNum() for a in mol.GetAtoms() if a.GetAtomMapNum()}
    following = max(written.values(), default=0) + 1
    numbers = dict(written)
    for atom in mol.GetAtoms():
        if atom.GetIdx() not in numbers:
            numbers[atom.GetIdx()] = following
            following += 1
    return numbers


def _taking_part(mol: Chem.Mol, touched: set[int]) -> list[int]:
    atoms: list[int] = []
    for fragment in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False):
        if touched.intersection(fragment):
            atoms.extend(fragment)
    return sorted(atoms)


def _side(mol: Chem.Mol, atoms: list[int], numbers: dict[int, int]) -> str:
    if not atoms:
        return ""
    work = Chem.Mol(mol)
    for index in atoms:
        work.GetAtomWithIdx(index).SetAtomMapNum(numbers[index])
    return Chem.MolFragmentToSmiles(work, atomsToUse=atoms, kekuleSmiles=True)


def step_reaction(step: StepTrace, numbers: dict[int, int]) -> str:
    """reactants>>products of one derived step, every atom mapped."""
    if step.after is None:
        raise ValueError(f"step {step.index + 1} was not derived; it has no products")
    touched = set(step.change.touched_atoms)
    left = _side(step.before.mol, _taking_part(step.before.mol, touched), numbers)
    right = _side(step.after.mol, _taking_part(step.after.mol, touched), numbers)
    return f"{left}>>{right}"


def reaction_lines(trace: Trace) -> list[tuple[str, str]]:
    """(reaction SMILES, step label) for every derived step, in order."""
    numbers = fresh_map_numbers(trace)
    return [(step_reaction(step, numbers), step.step.label) for step in trace.steps if step.after is not None]
