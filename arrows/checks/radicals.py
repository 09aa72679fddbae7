"""Radical steps: a radical taking a hydrogen atom across a bond much stronger than the one it
makes (AR535), and a hydrogen atom set free (AR536).

A hydrogen-atom transfer `X. + H-Y -> X-H + .Y` (three fishhooks: `.X ~> X-H(Y)`, `Y-H ~> X-H(Y)`,
`Y-H ~> Y`) is downhill or nearly so when the bond made is at least as strong as the bond broken:
the enthalpy change is the bond dissociation enthalpy of H-Y less that of X-H. A radical chain
runs through steps no more than about 15 kcal/mol uphill (bromine atoms take a primary C-H, about
13 uphill, slowly; common practice, from memory); a step further uphill is not a chain step (a
bromine atom taking a vinylic C-H, 24 uphill; a tin radical taking a C-H). Values from
judgement/bond_energies.py; a transfer whose bond is not in that table is not judged, nor one that
is not a hydrogen atom moving alone (a hydride, a proton).

A step that splits a bond to a hydrogen one electron each way, with no radical taking the
hydrogen, leaves a free hydrogen atom. In solution radicals abstract hydrogen; they do not set
hydrogen atoms free, and H* carries no chain (common practice): nothing bonds to the hydrogen to
pay for the X-H bond it leaves (87-111 kcal/mol for the C-H, O-H, S-H and H-halogen bonds of chain
reactions; Blanksby & Ellison 2003, from memory). Written so, a step is most often a substitution
at the atom the hydrogen leaves (a chlorine atom bonding to the carbon of methane, SH2) where the
radical should take the hydrogen. A step under light (a photolysis) is not judged."""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import bond_label, nameable
from ..judgement.bond_energies import BondEnergy, x_h_energy
from ..judgement.perception import Perceived
from ..trace import StepTrace
from . import Check
from .pericyclic import photochemical
from .protons import freed_hydrogens

HAT_UPHILL_KCAL = 15.0   # kcal/mol: a hydrogen-atom transfer further uphill than this is flagged


class UphillHydrogenAtomTransfers(Check):
    name = "hydrogen atom transfers"
    codes = ("AR535",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after = st.after
        if after is None or not st.change.formed or not st.change.broken:
            return
        before = st.before
        elements = before.elements
        if not any(m.electrons == 1 for m in st.change.moves):
            return   # a polar step: no hydrogen atom moves
        broken = {k: pair for pair in st.change.broken for k in pair if elements[k] == 1}
        for pair in st.change.formed:
            h = next((k for k in pair if elements[k] == 1), None)
            if h is None or h not in broken:
                continue
            taker = pair[0] if pair[1] == h else pair[1]
            giver = broken[h][0] if broken[h][1] == h else broken[h][1]
            if elements[taker] == 1 or elements[giver] == 1 or before.nonbonding[taker] % 2 != 1:
                continue   # not a radical taking the hydrogen
            moved = [m for m in st.change.moves if h in m.source_atoms or h in m.sink_atoms]
            if not moved or any(m.electrons != 1 for m in moved):
                continue   # the hydrogen moves with a pair: a hydride or a proton
            made = _energy(context.views.of(after), taker)
            lost = _energy(context.views.of(before), giver)
            if made is None or lost is None or lost.kcal - made.kcal <= HAT_UPHILL_KCAL:
                continue
            label = before.label
            t, g = label(taker), label(giver)
            weaker = _weakest_other(context.views.of(before), before, giver, lost)
            instead = (f"; the weakest X-H of that molecule is at {label(weaker[0])} ({weaker[1].bond}, "
                       f"{weaker[1].shown})" if weaker else "")
            loc = next((m.move.loc for m in moved if taker in m.source_atoms), st.step.loc)
            yield Diagnostic(
                "AR535", f"{t} takes the hydrogen of {g} ({lost.bond}, {lost.shown} kcal/mol) and makes {made.bond} "
                f"({made.shown}): uphill by about {lost.kcal - made.kcal:.0f} kcal/mol", loc,
                hint=f"a radical takes a hydrogen whose bond is weaker than the one it makes, or not much stronger "
                     f"(an allylic, benzylic or alpha-heteroatom C-H, a tin hydride's Sn-H){instead}; a transfer more "
                     f"than {HAT_UPHILL_KCAL:g} kcal/mol uphill is not a chain step",
                atoms=(t, g), step=st.index)


def _energy(view: Perceived, atom: int) -> Optional[BondEnergy]:
    position = view.position(atom)
    return None if position is None else x_h_energy(view.mol, position)


def _weakest_other(view: Perceived, state, giver: int, lost: BondEnergy) -> Optional[tuple[int, BondEnergy]]:
    """The atom of the giver's molecule (other than the giver) holding its weakest X-H by the table,
    if that bond is at least 5 kcal/mol weaker than the one taken: the hydrogen a radical takes."""
    position = view.position(giver)
    if position is None:
        return None
    mol = view.mol
    fragment = next(f for f in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if position in f)
    best = None
    for k in fragment:
        if k == position or not mol.GetAtomWithIdx(k).GetTotalNumHs():
            continue
        energy = x_h_energy(mol, k)
        if energy is not None and energy.kcal <= lost.kcal - 5 and (best is None or energy.kcal < best[1].kcal):
            best = (view.original[k], energy)
    return best


class FreeHydrogenAtoms(Check):
    """AR536: a step sets a hydrogen atom free (see the module's account)."""
    name = "free hydrogen atoms"
    codes = ("AR536",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        freed = freed_hydrogens(st, charge=0)
        if not freed or photochemical(st):
            return
        label = st.before.label
        for h in freed:
            holder = next(i for bond in st.change.broken if h in bond for i in bond if i != h)
            loc = next((m.move.loc for m in st.change.moves if m.sink_atoms == (h,)), st.step.loc)
            yield Diagnostic(
                "AR536", f"{label(h)} leaves {label(holder)} as a free hydrogen atom: no radical takes it in this "
                f"step", loc, hint=_abstraction_hint(st, h, holder), atoms=(label(h), label(holder)), step=st.index)


def _abstraction_hint(st: StepTrace, h: int, holder: int) -> str:
    """The hydrogen-atom transfer written out: by the radical whose electron the step moves, when
    there is one and the atoms can be named."""
    before = st.before
    radical = _radical_of_step(st, holder)
    why = "radicals abstract hydrogen; a hydrogen atom is not set free in solution (common practice)"
    if radical is None or not (nameable(before.mol, h) and nameable(before.mol, holder)):
        return (f"let a radical X take the hydrogen in the step that breaks the bond: {why}; a photolysis is "
                f"written with its light (`over \"hv\"`) and not judged")
    x, hydrogen, y = before.label(radical), before.label(h), before.label(holder)
    bond = bond_label(before.mol, holder, h)
    return (f"let {x} take the hydrogen instead, `.{x} ~> {x}-{hydrogen}`, `{bond} ~> {x}-{hydrogen}` and "
            f"`{bond} ~> {y}`: {why}")


def _radical_of_step(st: StepTrace, holder: int) -> Optional[int]:
    """A nameable atom (not `holder`) whose unpaired electron one of the step's arrows moves."""
    mol = st.before.mol
    return next((m.source_atoms[0] for m in st.change.moves if m.source_kind == "unpaired"
                 and m.source_atoms[0] != holder and nameable(mol, m.source_atoms[0])), None)
