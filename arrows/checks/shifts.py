"""Which group a 1,2-shift moves, where the geometry decides it: across a double bond of known
geometry (E or Z written), the group that migrates to an atom whose leaving group departs in the
same step is the one anti (trans) to that leaving group, as in the Beckmann rearrangement of an
oxime (textbook: the migration and the loss of the leaving group are concerted, the migrating
group entering from the back)."""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..configuration import written_geometry
from ..diagnostics import Diagnostic
from ..trace import StepTrace
from . import Check
from .leaving import in_small_ring


def trans_across(mol: Chem.Mol, first: int, a: int, b: int, second: int) -> Optional[bool]:
    """Whether `first` (a neighbour of a) and `second` (a neighbour of b) stand trans across the
    double bond a=b; None when its geometry is not written. The other neighbour of an end than
    the one the geometry is given against is opposite it."""
    written = written_geometry(mol, a, b)
    if written is None:
        return None
    ref_a, ref_b, cis = written
    return (not cis) ^ (ref_a != first) ^ (ref_b != second)


def shift_moves(st: StepTrace) -> Iterator[tuple]:
    """(move, migrating atom, origin, destination) of each move that takes a bond's pair, with one
    of its atoms, to a bond to another atom: `C3-H -> C2-H(C3)`, a group moving from C3 to C2."""
    for move in st.change.moves:
        if move.source_kind != "bond" or len(move.sink_atoms) != 2:
            continue
        migrating, destination = move.sink_atoms
        if migrating in move.source_atoms:
            yield move, migrating, next(i for i in move.source_atoms if i != migrating), destination


class MigrationAntiToLeavingGroup(Check):
    name = "migrating group"
    codes = ("AR509",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.before.configured:
            return
        broken = {tuple(sorted(pair)) for pair in st.change.broken}
        for move, migrating, origin, destination in shift_moves(st):
            for pair in broken:
                if destination not in pair:
                    continue
                leaving = pair[0] if pair[1] == destination else pair[1]
                if leaving in (origin, migrating):
                    continue
                trans = trans_across(st.before.mol, migrating, origin, destination, leaving)
                if trans is False:
                    label = st.before.label
                    yield Diagnostic(
                        "AR509", f"{label(migrating)} migrates to {label(destination)} from the side of the "
                        f"leaving group {label(leaving)}; the group anti to the leaving group migrates",
                        move.move.loc, hint=f"let the group trans to {label(leaving)} across "
                        f"{label(origin)}={label(destination)} migrate, or write the other isomer of the species",
                        atoms=(label(migrating), label(destination), label(leaving)), step=st.index)


def cation_stability(mol: Chem.Mol, atom: int) -> int:
    """A rank of the carbocation at `atom` (common practice): one per carbon substituent (methyl 0,
    primary 1, secondary 2, tertiary 3), two more for each pi bond or arene beside it (allyl,
    benzyl), six more beside a heteroatom with a lone pair, whose oxocarbenium or iminium form
    gives every atom an octet and outranks even a diaryl cation (the pinacol rearrangement runs
    from the diaryl cation to the protonated ketone)."""
    rank = 0
    for n in mol.GetAtomWithIdx(atom).GetNeighbors():
        z = n.GetAtomicNum()
        if z == 6:
            rank += 1
            if n.GetIsAromatic() or any(b.GetBondTypeAsDouble() > 1 for b in n.GetBonds()):
                rank += 2
        elif z in (7, 8, 16) and n.GetFormalCharge() <= 0:
            rank += 6
    return rank


def _cation_words(rank: int) -> str:
    return {0: "methyl", 1: "primary", 2: "secondary", 3: "tertiary"}.get(
        rank, "stabilised by a pi bond, an arene or a lone pair beside it")


class CationShiftDirection(Check):
    """AR516: a 1,2-shift of a hydrogen or a carbon group to a carbocation that leaves a less
    stabilised cation behind (tertiary to secondary). Shifts run toward the more stable cation
    (common practice: hydride and alkyl shifts in carbocation chemistry, the Wagner-Meerwein and
    pinacol rearrangements); one that runs the other way is almost always drawn backwards. A
    shift that widens a three- or four-membered ring is left alone: the strain released outweighs
    the substitution lost (a cyclobutylcarbinyl cation expanding to a cyclopentyl one, textbook)."""
    name = "cation shift direction"
    codes = ("AR516",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        before, after = st.before, st.after
        if after is None:
            return
        for move, migrating, origin, destination in shift_moves(st):
            if after.mol.GetBondBetweenAtoms(origin, migrating) is not None:
                continue   # a pi pair moving on (an allyl cation's other form), not a group shifting
            if in_small_ring(before.mol, origin, migrating):
                continue   # a three- or four-membered ring widened: the strain released pays for it (textbook)
            if (before.elements[destination] != 6 or before.formal_charge(destination) != 1
                    or before.nonbonding[destination] or after.elements[origin] != 6
                    or after.formal_charge(origin) != 1 or after.nonbonding[origin]):
                continue
            was, now = cation_stability(before.mol, destination), cation_stability(after.mol, origin)
            if now >= was:
                continue
            label = before.label
            yield Diagnostic(
                "AR516", f"the shift of {label(migrating)} to {label(destination)} moves the positive charge from "
                f"{label(destination)} ({_cation_words(was)}) to {label(origin)} ({_cation_words(now)}), a less "
                f"stable cation: uphill", move.move.loc,
                hint="1,2-shifts run toward the more stable cation; reverse the shift, or check which carbon "
                     "carries the charge",
                atoms=(label(migrating), label(destination), label(origin)), step=st.index)
