"""Electron counts that are legal but unusual enough to deserve a second look."""
from __future__ import annotations

from typing import Iterator

from ..diagnostics import Diagnostic
from ..trace import StepTrace
from . import Check

# Metals whose ions routinely carry +2 (Mg2+, Ca2+, Zn2+ ...): no unusual-charge warning for them.
_IONIC_METALS = {3, 4, 11, 12, 19, 20, 30, 37, 38, 55, 56}
# Elements drawn hypervalent as a matter of course (common practice): Si (five-coordinate
# silicates: fluoride on a silyl ether, the Peterson elimination), P, S, Cl, As, Se, Br, Sn, Sb,
# Te, I, Xe.
_HYPERVALENT = {14: "Si", 15: "P", 16: "S", 17: "Cl", 33: "As", 34: "Se", 35: "Br", 50: "Sn", 51: "Sb",
                52: "Te", 53: "I", 54: "Xe"}


class UnusualElectronCounts(Check):
    name = "unusual electron counts"
    codes = ("AR503", "AR504")

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after, before = st.after, st.before
        if after is None:
            return
        for i, old_charge, charge in st.change.charges:
            # As for the shell below: a charge the species was written with and the step keeps
            # (a sulfonyl S written S2+ with two O-) is not the step's doing.
            if abs(charge) >= 2 and after.elements[i] not in _IONIC_METALS:
                label = after.label(i)
                yield Diagnostic("AR503", f"{label} ends the step with formal charge {charge:+d}", st.step.loc,
                                 hint="a charge of two on one atom is rare; check the moves onto this atom",
                                 atoms=(label,), step=st.index)
        for i, shell in st.change.shells.items():
            # Only a step that expands the shell: a sulfonyl S substituted (an alcohol onto MsCl)
            # keeps the twelve electrons its species was written with.
            if shell > 8 and after.elements[i] > 10 and shell > before.nonbonding[i] + 2 * before.bond_sums[i]:
                label = after.label(i)
                symbol = _HYPERVALENT.get(after.elements[i])
                hint = (f"fine for hypervalent {symbol} (common practice); otherwise a bond should break"
                        if symbol else "rare for this element: a bond to it should break in the same step")
                yield Diagnostic("AR504", f"{label} holds {shell} valence electrons (expanded octet)", st.step.loc,
                                 hint=hint, atoms=(label,), step=st.index)
