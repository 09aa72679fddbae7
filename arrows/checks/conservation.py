"""Charge and atoms are conserved by moves; only `uses` may add to them. Judged with RDKit's own
formal charges and hydrogen counts (an independent count of the derived Mol); an atom keeps its
element from state to state (atoms are only appended)."""
from __future__ import annotations

from collections import Counter
from functools import lru_cache
from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ElectronState
from ..trace import StepTrace
from . import Check, Ending


@lru_cache(maxsize=None)
def _symbol(atomic_number: int) -> str:
    return Chem.GetPeriodicTable().GetElementSymbol(atomic_number)


def _state_totals(state: ElectronState) -> tuple[int, Counter]:
    """_totals of a whole state: charge and hydrogens summed by RDKit in C++, the elements read
    off the state's numbers."""
    mol = state.mol
    elements = Counter()
    for z, n in Counter(state.elements).items():
        elements[_symbol(z)] += n
    if state.elements:
        elements["H"] += mol.GetNumAtoms(onlyExplicit=False) - mol.GetNumAtoms()   # the counts, explicit and implicit
    return Chem.GetFormalCharge(mol), elements


def _totals(mol: Chem.Mol, atoms=None) -> tuple[int, Counter]:
    indices = range(mol.GetNumAtoms()) if atoms is None else atoms
    atom_at = mol.GetAtomWithIdx
    charge, hydrogens, symbols = 0, 0, []
    for i in indices:
        atom = atom_at(i)
        charge += atom.GetFormalCharge()
        symbols.append(atom.GetSymbol())
        hydrogens += atom.GetTotalNumHs()   # the atom's own count, explicit and implicit
    elements = Counter(symbols)
    if symbols:
        elements["H"] += hydrogens
    return charge, elements


def _formula(elements: Counter) -> str:
    return " ".join(f"{el}{n}" for el, n in sorted(elements.items()) if n)


class ChargeAndAtomsConserved(Check):
    """One count of the start, of what each `uses` brings and of the end. Moves alone cannot change
    either total (a safety net); a difference is reported at the last step."""

    name = "charge and atoms conserved"
    codes = ("AR403", "AR404")

    def __init__(self) -> None:
        self.brought: tuple[int, Counter] = (0, Counter())
        self.last: Optional[StepTrace] = None

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None:
            return ()
        if st.entered:
            charge, atoms = _totals(st.before.mol, st.entered)
            self.brought = (self.brought[0] + charge, self.brought[1] + atoms)
        self.last = st
        return ()

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        if self.last is None:
            return
        start_charge, start_atoms = _state_totals(end.initial)
        charge_before, atoms_before = start_charge + self.brought[0], start_atoms + self.brought[1]
        charge_after, atoms_after = _state_totals(self.last.after)
        where = dict(step=self.last.index)
        span = "from the start to this step" if self.last.index else "in this step"
        if charge_after != charge_before:
            yield Diagnostic("AR403", f"total charge goes from {charge_before:+d} to {charge_after:+d} {span}",
                             self.last.step.loc, hint="charge moves with electrons; check `uses` and the charges "
                             "written in SMILES", **where)
        if atoms_after != atoms_before:
            yield Diagnostic("AR404", f"atoms go from {_formula(atoms_before)} to {_formula(atoms_after)} {span}",
                             self.last.step.loc, hint="moves neither make nor destroy atoms", **where)
