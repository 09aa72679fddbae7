"""Electron counts that are legal but unusual enough to deserve a second look."""
from __future__ import annotations

from typing import Iterator

from ..diagnostics import Diagnostic
from ..rdkit_io import period
from ..trace import Trace

# Metals whose ions routinely carry +2 (Mg2+, Ca2+, Zn2+ ...): no unusual-charge warning for them.
_IONIC_METALS = {3, 4, 11, 12, 19, 20, 30, 37, 38, 55, 56}


class UnusualElectronCounts:
    name = "unusual electron counts"
    codes = ("AR503", "AR504", "AR505")

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        for st in trace.steps:
            after = st.after
            if after is None:
                continue
            pair_arrows_only = all(m.electrons == 2 for m in st.step.moves)
            for i in st.change.touched_atoms:
                atom = after.mol.GetAtomWithIdx(i)
                label = after.label(i)
                charge = atom.GetFormalCharge()
                z = atom.GetAtomicNum()
                if abs(charge) >= 2 and z not in _IONIC_METALS:
                    yield Diagnostic("AR503", f"{label} ends the step with formal charge {charge:+d}", st.step.loc,
                                     hint="a charge of two on one atom is rare; check the moves onto this atom",
                                     atoms=(label,), step=st.index)
                bonds = after.bond_order_sum(i)
                shell = after.nonbonding[i] + 2 * bonds
                if period(z) >= 3 and shell > 8:
                    yield Diagnostic("AR504", f"{label} holds {shell} valence electrons (expanded octet)", st.step.loc,
                                     hint="fine for hypervalent P, S or I; otherwise a bond should break",
                                     atoms=(label,), step=st.index)
                if pair_arrows_only and after.nonbonding[i] % 2 and not st.before.nonbonding[i] % 2:
                    yield Diagnostic("AR505", f"{label} is left with an unpaired electron by pair arrows",
                                     st.step.loc, hint="single-electron moves are written with fishhooks `~>`",
                                     atoms=(label,), step=st.index)
