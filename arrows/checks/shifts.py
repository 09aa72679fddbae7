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
from .valence import D_BLOCK


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


# Metals and metalloids between which a group passes through a four-centre array (M-X-M'-R to
# M-R with X on M'): transmetalation (an aryl from boron to palladium over the Pd-O-B bridge of a
# Suzuki coupling, from zinc or tin to palladium) and sigma-bond metathesis (Hartwig, Organotransition
# Metal Chemistry, from memory). The d block (groups 3-12), Li, B, Mg, Al, Si, Sn.
_TRANSMETALATING = D_BLOCK | {3, 5, 12, 13, 14, 50}


class ShiftBetweenNeighbours(Check):
    """AR519: a group (a hydrogen with its pair, an alkyl or aryl group) moved in one step to an
    electron-poor atom of its own molecule that is not a neighbour of the atom it leaves: a
    carbocation, or an atom whose leaving group departs in the same step. Such shifts are 1,2
    (common practice: hydride and alkyl shifts of the Wagner-Meerwein and pinacol rearrangements,
    the Baeyer-Villiger and Beckmann migrations); a suprafacial thermal [1,3]-shift of hydrogen is
    forbidden by the Woodward-Hoffmann rules. A pericyclic step is not judged, nor a group passed
    from or to a metal or metalloid across one bridging atom (a transmetalation, a sigma-bond
    metathesis: a four-centre exchange, not a cation's 1,3-shift)."""
    name = "shift between neighbours"
    codes = ("AR519",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        before, after = st.before, st.after
        if after is None or st.change.pericyclic:
            return
        mol = before.mol
        for move, migrating, origin, destination in shift_moves(st):
            if move.electrons != 2 or origin == destination or 1 in (before.elements[origin], before.elements[destination]):
                continue   # (a hydrogen as the "origin": a pair moving on from an X-H bond, not a shift)
            if mol.GetBondBetweenAtoms(origin, migrating) is None or after.mol.GetBondBetweenAtoms(origin, migrating) \
                    is not None or mol.GetBondBetweenAtoms(destination, migrating) is not None \
                    or mol.GetBondBetweenAtoms(origin, destination) is not None:
                continue   # not a group leaving one atom for another that is not its neighbour
            path = Chem.GetShortestPath(mol, origin, destination)
            if not path:
                continue   # another molecule: a transfer, not a shift
            if len(path) == 3 and _TRANSMETALATING.intersection((before.elements[origin], before.elements[destination])):
                continue   # a four-centre exchange at a metal (Pd-O-B-Ar to Pd-Ar): a transmetalation
            if not (_electron_poor(before, destination) or _loses_leaving_group(st, destination)):
                continue
            label = before.label
            between = [label(i) for i in path[1:-1]]
            n = len(between)
            yield Diagnostic(
                "AR519", f"{label(migrating)} shifts from {label(origin)} to {label(destination)}, which are not "
                f"neighbours ({n} atom{'s' if n != 1 else ''} between: {', '.join(between)}): a 1,{n + 2}-shift",
                move.move.loc,
                hint=_far_shift_hint(label(destination), between, _electron_poor(before, destination)),
                atoms=(label(migrating), label(origin), label(destination)), step=st.index)


def _electron_poor(state, atom: int) -> bool:
    """A cation short of its octet before the step (a carbocation): no lone pair, fewer than four bonds."""
    return state.formal_charge(atom) > 0 and state.nonbonding[atom] == 0 and state.bond_sums[atom] < 4


def _loses_leaving_group(st: StepTrace, atom: int) -> bool:
    """Whether a sigma bond of `atom` breaks in this step with its pair going to the other atom."""
    for move in st.change.moves:
        if move.source_kind == "bond" and move.electrons == 2 and atom in move.source_atoms \
                and len(move.sink_atoms) == 1 and move.sink_atoms[0] != atom \
                and st.before.mol.GetBondBetweenAtoms(*move.source_atoms).GetBondTypeAsDouble() == 1:
            return True
    return False


def _far_shift_hint(destination: str, between: list[str], cation: bool) -> str:
    """AR519's hint: successive 1,2-shifts in a cation; in a migration as a leaving group departs,
    the group goes to the neighbour of the atom it leaves, whose own leaving group departs."""
    rule = ("hydride and alkyl shifts go to a neighbouring atom (common practice: 1,2-shifts; a thermal "
            "suprafacial [1,3]-H shift is forbidden by the Woodward-Hoffmann rules)")
    if cation:
        return (f"{rule}: write it as successive 1,2-shifts, the first to {between[0]}, or move a group from a "
                f"neighbour of {destination}; a transannular shift across a medium ring, the 6,2-hydride shift "
                f"of the norbornyl cation or a 1,3- or 1,5-hydride shift of a terpene cyclisation is known and "
                f"may be meant")
    return (f"{rule}: a group migrates to the atom next to the one it leaves, here {between[0]}, as the leaving "
            f"group departs from {between[0]} in the same step")
