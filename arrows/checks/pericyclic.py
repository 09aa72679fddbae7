"""AR521: a pericyclic step the Woodward-Hoffmann rules forbid under heat. Two cases, each with
4 electrons (two arrows) or another multiple of four moving round the array of first-row atoms:

- a cycloaddition, two new sigma bonds made from pi bonds and none broken: two alkenes joined into
  a cyclobutane in one step ([2s+2s]). Photochemically allowed; thermally it needs an antarafacial
  component, which a cumulene partner offers (a ketene's, an allene's, an isocyanate's [2+2]).
- a [1,3]-shift of hydrogen, the H passed from one end of an allyl (or enol, enamine) array to the
  other in one step. The suprafacial path is forbidden and a three-atom chain cannot reach the
  antarafacial one (textbook); a tautomerisation goes by two proton transfers (common practice).

Not judged: 4-electron electrocyclic steps (conrotatory, allowed: a cyclobutene opening), [1,j]-shifts
of carbon (inversion at the migrating carbon makes [1,3] allowed), [1,7]-H shifts (antarafacial,
allowed), cycloreversions (a dioxetane's or a beta-lactone's thermal cleavage), and any array with
boron or an atom beyond the second period (hydroboration, a Wittig oxaphosphetane, metathesis),
whose empty or d orbitals lift the restriction. A step written `over` or `under` light ("hv",
"light", "photo", "UV") is photochemical and not judged."""
from __future__ import annotations

from typing import Iterator, Optional

from ..configuration import names_light
from ..diagnostics import Diagnostic
from ..electrons import ElectronState
from ..trace import StepTrace
from . import Check

_FIRST_ROW_ARRAY = frozenset({1, 6, 7, 8})   # H, C, N, O: no empty or d orbital to share the pairs


def photochemical(st: StepTrace) -> bool:
    """Whether the step's conditions (the text over or under its arrow) name light."""
    return names_light(st.step.over, st.step.under)


def _cumulene_centre(state: ElectronState, atoms: set[int]) -> Optional[int]:
    """An atom of the array with two double bonds (a ketene's, an allene's or an isocyanate's
    central carbon): its orthogonal pi bonds give the antarafacial component."""
    mol = state.mol
    for i in atoms:
        doubles = sum(1 for n in mol.GetAtomWithIdx(i).GetNeighbors() if state.bond_electrons(i, n.GetIdx()) == 4)
        if doubles >= 2:
            return i
    return None


def _judged_array(st: StepTrace) -> Optional[set[int]]:
    """The atoms of the step's arrows when AR521 judges the step (a thermal pericyclic step of
    first-row atoms with an even number of arrows), else None."""
    change = st.change
    if st.after is None or not change.pericyclic or len(change.moves) % 2 or photochemical(st):
        return None
    atoms = {a for m in change.moves for a in m.source_atoms + m.sink_atoms}
    return atoms if {st.before.elements[a] for a in atoms} <= _FIRST_ROW_ARRAY else None


def forbidden_hydrogen_shift(st: StepTrace) -> Optional[tuple[int, int, int]]:
    """(hydrogen, origin, destination) of a [1,3]-shift of hydrogen that AR521 warns on: two arrows,
    bond to bond, one bond to the hydrogen broken and one made; else None."""
    change = st.change
    if len(change.moves) != 2 or len(change.formed) != 1 or len(change.broken) != 1 or _judged_array(st) is None:
        return None
    formed, broken = tuple(change.formed[0]), tuple(change.broken[0])
    hydrogen = set(formed) & set(broken)
    if len(hydrogen) != 1 or st.before.elements[next(iter(hydrogen))] != 1:
        return None
    h = hydrogen.pop()
    return h, next(a for a in broken if a != h), next(a for a in formed if a != h)


class ForbiddenPericyclic(Check):
    name = "pericyclic selection rules"
    codes = ("AR521",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        change = st.change
        atoms = _judged_array(st)
        if atoms is None:
            return
        before = st.before
        electrons = 2 * len(change.moves)
        label = before.label
        formed = [tuple(b) for b in change.formed]
        broken = [tuple(b) for b in change.broken]
        loc = change.moves[0].move.loc
        if len(formed) == 2 and not broken and all(1 not in (before.elements[i], before.elements[j]) for i, j in formed):
            if _cumulene_centre(before, atoms) is not None:
                return
            bonds = " and ".join(f"{label(i)}-{label(j)}" for i, j in formed)
            name = {4: "a [2+2] cycloaddition", 8: "an 8-electron cycloaddition (a [4+4] or [6+2])"}.get(
                electrons, f"a cycloaddition of {electrons} electrons")
            yield Diagnostic(
                "AR521", f"{bonds} form in one step from pi bonds: {name}, {electrons} electrons round a ring of "
                f"{len(atoms)} atoms, forbidden under heat with both components suprafacial "
                f"(Woodward-Hoffmann rules)", loc,
                hint=("it goes photochemically: if light drives it, say so with `over \"hv\"`; under heat, draw it "
                      "stepwise (a diradical or a zwitterion), or check the partner: a ketene or other cumulene adds "
                      "thermally, a diene and an alkene make six-membered rings ([4+2])"),
                bonds=tuple((label(i), label(j)) for i, j in formed), step=st.index)
            return
        shift = forbidden_hydrogen_shift(st)
        if shift is not None:
            h, origin, destination = shift
            hetero = any(before.elements[a] in (7, 8) for a in (origin, destination))
            yield Diagnostic(
                "AR521", f"{label(h)} moves from {label(origin)} to {label(destination)} in one step: a [1,3]-shift "
                f"of hydrogen, 4 electrons round a four-centre array, forbidden under heat suprafacially, and a "
                f"three-atom chain cannot reach the antarafacial path (Woodward-Hoffmann rules)", loc,
                hint=(("a tautomerisation goes by two proton transfers, with an acid or base (water will do) bringing "
                       "the proton on and another taking it off (common practice): write them as two steps, bringing "
                       "the acid or base in with `uses`") if hetero else
                      ("move the hydrogen by two proton transfers (through a carbanion or carbocation) or, if light "
                       "drives it, say so with `over \"hv\"`; a hydrogen passes suprafacially under heat round six "
                       "centres ([1,5]-shift)")),
                atoms=(label(h), label(origin), label(destination)), step=st.index)
