"""Charge and atoms are conserved by moves; only `uses` may add to them. Judged with RDKit's own
formal charges and formula (an independent count of the derived Mol)."""
from __future__ import annotations

from collections import Counter
from typing import Iterator

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..trace import Trace


def _totals(mol: Chem.Mol, atoms=None) -> tuple[int, Counter]:
    indices = range(mol.GetNumAtoms()) if atoms is None else atoms
    charge, elements = 0, Counter()
    for i in indices:
        atom = mol.GetAtomWithIdx(i)
        charge += atom.GetFormalCharge()
        elements[atom.GetSymbol()] += 1
        elements["H"] += atom.GetNumExplicitHs() + atom.GetNumImplicitHs()
    return charge, elements


def _formula(elements: Counter) -> str:
    return " ".join(f"{el}{n}" for el, n in sorted(elements.items()) if n)


class ChargeAndAtomsConserved:
    name = "charge and atoms conserved"
    codes = ("AR403", "AR404")

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        derived = [st for st in trace.steps if st.after is not None]
        if not derived:
            return
        # One count of the start, of what each `uses` brings and of the end; only when those disagree
        # is every step counted, to say where.
        charge, atoms = _totals(trace.initial.mol)
        for st in derived:
            if st.entered:
                extra_charge, extra_atoms = _totals(st.before.mol, st.entered)
                charge, atoms = charge + extra_charge, atoms + extra_atoms
        if _totals(derived[-1].after.mol) == (charge, atoms):
            return
        yield from self._per_step(derived)

    def _per_step(self, derived) -> Iterator[Diagnostic]:
        for st in derived:
            charge_before, atoms_before = _totals(st.before.mol)
            charge_after, atoms_after = _totals(st.after.mol)
            if charge_after != charge_before:
                yield Diagnostic("AR403", f"total charge goes from {charge_before:+d} to {charge_after:+d}", st.step.loc,
                                 hint="charge moves with electrons; check `uses` and the charges written in SMILES",
                                 step=st.index)
            if atoms_after != atoms_before:
                yield Diagnostic("AR404", f"atoms go from {_formula(atoms_before)} to {_formula(atoms_after)}",
                                 st.step.loc, hint="moves neither make nor destroy atoms", step=st.index)
