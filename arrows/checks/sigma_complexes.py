"""A sigma complex that is never rearomatised (AR532): an electrophile bonds to a carbon of an
aromatic ring (RDKit's perception judging the state before), leaving that carbon sp3 with its
hydrogen and the ring a cation (an arenium ion, a 2H-pyrrolium, a 3H-indolium); a later step takes
the cation away some other way (a proton taken off the ring's N-H, a nucleophile bonded to the
ring) while the sp3 carbon keeps its hydrogen, and the mechanism ends with that carbon not
aromatic. An electrophilic aromatic substitution ends with a base taking the proton on the sp3
carbon, which restores the ring (common practice; Clayden, from memory).

Not judged: a proton as the electrophile (a ring protonated at carbon is an electrophile that a
nucleophile traps, as an indole dimerises in acid: Joule & Mills, from memory), an sp3 carbon with
no hydrogen (an ipso attack, a dearomatising spirocyclisation), a sigma complex with no cation (a
phenoxide's dienone, a Diels-Alder of furan, a Birch reduction's radical anion), a nucleophile
adding to an aromatic ring (Chichibabin, SNAr), and a ring aromatic again by the end (a dienone
that tautomerises to the phenol)."""
from __future__ import annotations

from typing import Iterator, NamedTuple, Optional

from ..diagnostics import Diagnostic
from ..electrons import pair
from ..judgement.perception import aromatic
from ..judgement.sigma_complexes import rearomatising_moves, rearomatising_path, sp3_carbon_with_hydrogen
from ..model import Location
from ..trace import StepTrace
from . import Check, Ending


class SigmaComplex(NamedTuple):
    carbon: int                 # the sp3 ring carbon the electrophile bonded to
    electrophile: int
    step: int                   # the step that made it
    path: tuple[int, ...]       # from the carbon to the cation, in the latest state


class Quench(NamedTuple):
    """A step that took a sigma complex's cation away while its sp3 carbon kept the hydrogen."""
    carbon: int
    loc: Location
    message: str
    hint: str
    atoms: tuple[str, ...]
    step: int


class SigmaComplexesRearomatise(Check):
    name = "sigma complexes rearomatise"
    codes = ("AR532",)

    def __init__(self) -> None:
        self.open: list[SigmaComplex] = []
        self.quenched: list[Quench] = []

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after = st.after
        if after is None:
            return ()
        if self.open:
            self._follow(st)
        for carbon, electrophile in _electrophiles_bonded_to_carbon(st):
            path = rearomatising_path(after, carbon)
            if path is not None and aromatic(context.views.of(st.before), carbon):
                self.open.append(SigmaComplex(carbon, electrophile, st.index, path))
        return ()

    def _follow(self, st: StepTrace) -> None:
        """Each open sigma complex after this step: still a cation on the way back to the ring,
        changed at its sp3 carbon (rearomatised, or the electrophile gone again: left alone), or
        quenched some other way (kept for `finish`)."""
        after, still = st.after, []
        for c in self.open:
            if after.mol.GetBondBetweenAtoms(c.carbon, c.electrophile) is None:
                continue
            path = rearomatising_path(after, c.carbon)
            if path is not None:
                still.append(c._replace(path=path))
            elif sp3_carbon_with_hydrogen(after, c.carbon):
                self.quenched.append(_quench(st, c))
        self.open = still

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        if not self.quenched or end.final is None:
            return
        final = context.views.of(end.final)
        for q in self.quenched:
            if not aromatic(final, q.carbon):
                yield Diagnostic("AR532", q.message, q.loc, hint=q.hint, atoms=q.atoms, step=q.step)


def _electrophiles_bonded_to_carbon(st: StepTrace) -> Iterator[tuple[int, int]]:
    """(carbon, electrophile) for each arrow that sends a pi or sigma pair of a carbon into a new bond
    from that carbon to an atom other than hydrogen (`C3=C4 -> C4-Br12`)."""
    elements, formed = st.before.elements, None
    for m in st.change.moves:
        if m.electrons != 2 or m.source_kind != "bond" or len(m.sink_atoms) != 2:
            continue
        first, second = m.sink_atoms
        for carbon, electrophile in ((first, second), (second, first)):
            if carbon in m.source_atoms and electrophile not in m.source_atoms and elements[carbon] == 6 \
                    and elements[electrophile] != 1:
                if formed is None:
                    formed = set(st.change.formed)
                if pair(carbon, electrophile) in formed:
                    yield carbon, electrophile


def _quench(st: StepTrace, c: SigmaComplex) -> Quench:
    """The diagnostic for the step that took the cation away: at the arrow that took a proton, or
    else the one that bonded a nucleophile to an atom of the way back; the hint writes the
    rearomatisation with the same base."""
    before, label = st.before, st.before.label
    elements = before.elements
    taking = next((m for m in st.change.moves if m.electrons == 2 and len(m.sink_atoms) == 2
                   and elements[m.sink_atoms[1]] == 1 and m.sink_atoms[1] not in m.source_atoms), None)
    adding = next((m for m in st.change.moves if m.electrons == 2 and m.source_kind == "lone_pair"
                   and len(m.sink_atoms) == 2 and elements[m.sink_atoms[1]] != 1), None)
    carbon, electrophile = label(c.carbon), label(c.electrophile)
    if taking is not None:
        base, move = taking.sink_atoms[0], taking
        holder = next((n.GetIdx() for n in before.mol.GetAtomWithIdx(taking.sink_atoms[1]).GetNeighbors()), None)
        what = f"takes the proton of {label(holder)}" if holder is not None else "takes a proton"
    elif adding is not None:
        base, move = adding.source_atoms[0], adding
        target = next(k for k in adding.sink_atoms if k != base)
        what = f"bonds {label(base)} to {label(target)}"
    else:
        base, move, what = None, None, "takes the cation away"
    arrows = rearomatising_moves(before, c.path, base)
    restore = (f"the base takes the proton on {carbon} instead: {arrows}" if arrows and base is not None else
               f"a base takes the proton on {carbon}" + (f": {arrows}" if arrows else ""))
    hint = (f"{restore}; the ring's pi pairs move back toward the cation and the ring is aromatic again, "
            f"as an electrophilic aromatic substitution ends")
    message = (f"this step {what} while {carbon}, made sp3 as {electrophile} bonded to it in step {c.step + 1}, "
               f"keeps its hydrogen: the sigma complex loses its cation without rearomatising, and the ring "
               f"ends the mechanism not aromatic")
    loc = move.move.loc if move is not None else st.step.loc
    return Quench(c.carbon, loc, message, hint, (carbon, electrophile), st.index)
