"""AR605: the product (or a checkpoint) of a [3,3] shift written with a configuration that no chair
transition state gives. An open-chain Cope or Claisen rearrangement goes through a chair: meso-3,4-
dimethylhexa-1,5-diene gives (E,Z)-octa-2,6-diene (99.7%), the (3R*,4R*) diene (E,E) with some (Z,Z)
(Doering & Roth, Tetrahedron 1962; Clayden, pericyclic rearrangements; from memory). In the chair a
group on a breaking-bond carbon stands pseudo-equatorial (its new double bond E) or pseudo-axial (Z),
and a terminus's group trans to the chain pseudo-equatorial: the two chairs (one the ring flip of
the other) fix the new double bonds and the new centres from the configuration written in the
starting material. A position written without configuration may take either place.

Judged: three arrows, bond to bond, round six atoms of C, N and O none of which is in a ring
(acyclic 1,5-dienes, allyl vinyl ethers, their aza forms). A ring on the array can force a boat (a
cis-divinylcyclopropane, bridged systems): not judged. The chair outcomes are carried to later
checkpoints and the product while no later step touches their atoms; a configuration AR603 already
finds wrong is AR603's alone."""
from __future__ import annotations

import math
from dataclasses import replace
from itertools import product
from typing import Iterator, Optional

from rdkit import Chem

from ..configuration import model_at, neighbours_round, tag_kept, written_geometry
from ..diagnostics import Diagnostic
from ..electrons import ElectronState
from ..judgement.stereo import ENANTIOMERS, is_chiral, relation
from ..model import Checkpoint
from ..trace import StepTrace
from . import Check, Ending
from .pericyclic import photochemical
from .written_stereo import ChiralityWatch, compared_pieces, mismatches

_ARRAY_ELEMENTS = frozenset({6, 7, 8})
_UNREAD = object()   # a configuration RDKit could not read off a model
_RADIUS, _PUCKER, _REACH = 1.45, 0.25, 1.1   # an ideal cyclohexane chair, in angstroms

# A chair outcome: (centre, chiral tag, its neighbours as neighbours_round gives them) for each new
# stereocentre and (a, b, neighbour of a, neighbour of b, cis) for each new stereogenic double bond,
# by atom indices, which later steps keep.
Outcome = tuple[tuple[tuple[int, Chem.ChiralType, tuple[int, ...]], ...], tuple[tuple[int, int, int, int, bool], ...]]


def three_three_array(st: StepTrace) -> Optional[list[int]]:
    """The six atoms a1..a6 of a thermal [3,3] shift (a1=a2 and a5=a6 made single, a2=a3 and a4=a5
    double, a3-a4 broken, a1-a6 made) of first-row atoms C, N, O outside any ring, else None."""
    change = st.change
    if st.after is None or len(change.moves) != 3 or not change.pericyclic or photochemical(st):
        return None
    if len(change.formed) != 1 or len(change.broken) != 1 or len(change.reordered) != 4:
        return None
    lowered = {frozenset(key) for key, was, now in change.reordered if (was, now) == (2, 1)}
    raised = {frozenset(key) for key, was, now in change.reordered if (was, now) == (1, 2)}
    a1, a6 = change.formed[0]
    a3, a4 = change.broken[0]
    for first, last in ((a3, a4), (a4, a3)):
        a2 = next((next(iter(b - {a1})) for b in lowered if a1 in b), None)
        a5 = next((next(iter(b - {a6})) for b in lowered if a6 in b), None)
        if a2 is not None and a5 is not None and raised == {frozenset((a2, first)), frozenset((last, a5))}:
            chain = [a1, a2, first, last, a5, a6]
            break
    else:
        return None
    before = st.before.mol
    if len(set(chain)) != 6 or any(st.before.elements[i] not in _ARRAY_ELEMENTS for i in chain):
        return None
    rings = Chem.Mol(before)
    Chem.FastFindRings(rings)
    if any(rings.GetAtomWithIdx(i).IsInRing() for i in chain):
        return None
    return chain


def _corner(k: int, flip: bool) -> tuple[float, float, float]:
    angle = math.pi * k / 3
    up = (k % 2 == 0) != flip
    return _RADIUS * math.cos(angle), _RADIUS * math.sin(angle), _PUCKER if up else -_PUCKER


def _slot(k: int, flip: bool, axial: bool) -> tuple[float, float, float]:
    """Where a group on ring corner k stands: axial (along the chair's axis, on the corner's side)
    or equatorial (outward, tilted a little the other way)."""
    x, y, z = _corner(k, flip)
    side = 1.0 if z > 0 else -1.0
    if axial:
        return x, y, z + _REACH * side
    out = math.hypot(x, y)
    return x + _REACH * 0.94 * x / out, y + _REACH * 0.94 * y / out, z - _REACH * 0.33 * side


def _groups(mol: Chem.Mol, atom: int, chain: list[int]) -> list[int]:
    return [n.GetIdx() for n in mol.GetAtomWithIdx(atom).GetNeighbors() if n.GetIdx() not in chain]


def _placed(k: int, flip: bool, groups: list[int], first_axial: bool) -> dict[int, tuple[float, float, float]]:
    """The groups of corner k (one or two; a hydrogen held as a count takes the other place) with
    the first axial or equatorial, the second in the other place."""
    slots = (True, False) if first_axial else (False, True)
    return {n: _slot(k, flip, axial) for n, axial in zip(groups, slots)}


def chair_outcomes(before: Chem.Mol, after: Chem.Mol, chain: list[int]) -> Optional[list[Outcome]]:
    """Each configuration the two chairs give the new centres (at a1, a6) and new double bonds
    (a2=a3, a4=a5), read by RDKit off a model of the chair (AssignStereochemistryFrom3D), so no
    convention of tag and bond order is ours. A configured a3 or a4 puts its groups where its tag
    says; a terminus written E or Z puts its group trans to the chain equatorial; each position
    left unconfigured is tried both ways. None when the array carries more groups than a chain
    of the kind has, or a model cannot be read."""
    corners = {}
    for k, atom in enumerate(chain):
        groups = _groups(before, atom, chain)
        if len(groups) > (1 if k in (1, 4) else 2):
            return None
        corners[k] = groups
    outcomes: list[Outcome] = []
    for flip in (False, True):
        place = {atom: _corner(k, flip) for k, atom in enumerate(chain)}
        for k in (1, 4):   # the middle atoms' groups point out of the ring
            x, y, z = _corner(k, flip)
            place.update({n: (1.75 * x, 1.75 * y, z) for n in corners[k]})
        options = []
        for k in (0, 2, 3, 5):
            if not corners[k]:
                continue
            first_axial = _set_by_configuration(before, chain, k, corners[k], place, flip)
            if first_axial is _UNREAD:
                return None
            options.append([(k, axial) for axial in ((True, False) if first_axial is None else (first_axial,))])
        for picked in product(*options):
            here = dict(place)
            for k, first_axial in picked:
                here.update(_placed(k, flip, corners[k], first_axial))
            read = _read_outcome(after, chain, here)
            if read is None:
                return None
            if read not in outcomes:
                outcomes.append(read)
    return outcomes


def _set_by_configuration(before: Chem.Mol, chain: list[int], k: int, groups: list[int], place, flip: bool):
    """Whether the first of the groups at corner k is axial, as the starting material's
    configuration sets it: at a terminus written E or Z the group trans to the chain is equatorial;
    at a configured a3 or a4 the tag decides. None when nothing is written there (either place
    is possible), _UNREAD when RDKit cannot read the tag off the model."""
    atom = chain[k]
    if k in (0, 5):
        inner, beyond = (chain[1], chain[2]) if k == 0 else (chain[4], chain[3])
        geometry = written_geometry(before, atom, inner)
        if geometry is None:
            return None
        first, second, cis = geometry
        if first not in groups:
            return None
        trans_to_chain = (second == beyond) != cis   # of `first`
        return (not trans_to_chain) if groups[0] == first else trans_to_chain
    tag = before.GetAtomWithIdx(atom).GetChiralTag()
    if tag == Chem.ChiralType.CHI_UNSPECIFIED:
        return None
    model = model_at(before, {**place, **_placed(k, flip, groups, True)})
    read = None if model is None else model.GetAtomWithIdx(atom).GetChiralTag()
    if read in (None, Chem.ChiralType.CHI_UNSPECIFIED):
        return _UNREAD
    return read == tag


def _read_outcome(after: Chem.Mol, chain: list[int], place) -> Optional[Outcome]:
    """(centres, double bonds) the product gets from the chair `place` holds: the tag of each new
    stereocentre at a1 and a6 (against its neighbours), read by RDKit off the model, and the
    geometry of each new stereogenic double bond a2=a3, a4=a5 against a1 (or a6) and a group of
    a3 (or a4), read off the torsion: the chair's groups stand 60 or 180 degrees round the bond,
    which RDKit's reading of a flat double bond does not take (it answered E for an axial group
    held beside an explicit hydrogen). None when RDKit cannot read the model."""
    model = model_at(after, place)
    if model is None:
        return None
    centres = []
    for atom in (chain[0], chain[5]):
        tag = model.GetAtomWithIdx(atom).GetChiralTag()
        if tag != Chem.ChiralType.CHI_UNSPECIFIED:
            centres.append((atom, tag, tuple(neighbours_round(model, atom))))
    bonds = []
    for end, a, b in ((chain[0], chain[1], chain[2]), (chain[5], chain[4], chain[3])):
        bond = model.GetBondBetweenAtoms(a, b)
        groups = _groups(after, b, chain)
        if bond is None or bond.GetStereo() == Chem.BondStereo.STEREONONE or not groups:
            continue   # RDKit finds the bond not stereogenic (two equal groups on an end)
        bonds.append((a, b, end, groups[0], _cis(*(place[i] for i in (end, a, b, groups[0])))))
    return tuple(centres), tuple(bonds)


def _cis(p0, p1, p2, p3) -> bool:
    """Whether p0 (on p1) and p3 (on p2) stand on one side of the bond p1-p2: the torsion
    p0-p1-p2-p3 under 90 degrees."""
    axis = [q - p for p, q in zip(p1, p2)]
    length = math.sqrt(sum(c * c for c in axis))
    axis = [c / length for c in axis]
    def across(start, tip):
        v = [t - s for s, t in zip(start, tip)]
        along = sum(c * u for c, u in zip(v, axis))
        return [c - along * u for c, u in zip(v, axis)]
    return sum(x * y for x, y in zip(across(p1, p0), across(p2, p3))) > 0


def configured_as(state: ElectronState, outcome: Outcome, kept: set[int]) -> Optional[ElectronState]:
    """`state` with a chair outcome's configuration set at the elements whose atoms are in `kept`
    (no later step touched them) and the state leaves unset; None when nothing is set."""
    centres, bonds = outcome
    work = Chem.RWMol(state.mol)
    changed = False
    for atom, tag, around in centres:
        if atom not in kept or work.GetAtomWithIdx(atom).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED:
            continue
        now = tag_kept(tag, list(around), work, atom)
        if now is not None:
            work.GetAtomWithIdx(atom).SetChiralTag(now)
            changed = True
    for a, b, ref_a, ref_b, cis in bonds:
        bond = work.GetBondBetweenAtoms(a, b)
        if not {a, b} <= kept or bond is None or bond.GetStereo() != Chem.BondStereo.STEREONONE \
                or work.GetBondBetweenAtoms(a, ref_a) is None or work.GetBondBetweenAtoms(b, ref_b) is None:
            continue
        if bond.GetBeginAtomIdx() != a:
            ref_a, ref_b = ref_b, ref_a
        bond.SetStereoAtoms(ref_a, ref_b)
        bond.SetStereo(Chem.BondStereo.STEREOCIS if cis else Chem.BondStereo.STEREOTRANS)
        changed = True
    if not changed:
        return None
    Chem.SetDoubleBondNeighborDirections(work)
    return replace(state, mol=work.GetMol(), configured=True, judged={})


def _chair_products(variants: list[ElectronState], smiles: str, racemic: bool) -> list[str]:
    """The pieces the chair outcomes give of the written constitutions, each named once (with
    no chiral species, an enantiomer pair once: the racemate forms)."""
    named: list[str] = []
    for variant in variants:
        compared = compared_pieces(variant, smiles)
        for constitution, piece in (compared[1].items() if compared else ()):
            if constitution not in compared[0] or piece.smiles in named:
                continue
            if racemic and any(relation(piece.smiles, other) == ENANTIOMERS for other in named):
                continue
            named.append(piece.smiles)
    return named


class _Shift:
    """A judged [3,3] shift: its step, its array and the chair outcomes still standing."""

    def __init__(self, step: int, chain: list[int], outcomes: list[Outcome]) -> None:
        self.step, self.chain, self.outcomes = step, chain, outcomes
        self.kept = set(chain)   # the atoms no later step has touched


class ChairThreeThreeShift(Check):
    name = "[3,3] shift through a chair"
    codes = ("AR605",)

    def __init__(self) -> None:
        self.watch = ChiralityWatch()
        self.shifts: list[_Shift] = []

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.index == 0:
            self.watch, self.shifts = ChiralityWatch(), []
        self.watch.before(st)
        if st.after is None:
            return
        self.watch.after(st)
        for shift in self.shifts:
            shift.kept -= set(st.change.touched_atoms)
        self.shifts = [s for s in self.shifts if s.kept]
        if st.before.configured:
            chain = three_three_array(st)
            outcomes = chair_outcomes(st.before.mol, st.after.mol, chain) if chain else None
            if outcomes:
                self.shifts.append(_Shift(st.index, chain, outcomes))
        for checkpoint in st.step.expects:
            yield from self._judged(st.after, checkpoint, "checkpoint", st.index)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        product_line = end.mechanism.product
        if product_line is not None and end.final is not None:
            yield from self._judged(end.final, product_line, "product", None)

    def _judged(self, state: ElectronState, written: Checkpoint, what: str, step: Optional[int]
                ) -> Iterator[Diagnostic]:
        if not self.shifts or not any(mark in written.smiles for mark in ("@", "/", "\\")):
            return
        racemic = self.watch.racemic
        if mismatches(state, written, what, step, racemic):
            return   # AR603's to say
        for shift in self.shifts:
            variants = [v for v in (configured_as(state, o, shift.kept) for o in shift.outcomes) if v is not None]
            if not variants or any(not mismatches(v, written, what, step, racemic) for v in variants):
                continue
            chair = _chair_products(variants, written.smiles, racemic)
            label = state.label
            array = "-".join(label(i) for i in shift.chain)
            yield Diagnostic(
                "AR605", f"the {what} is written {written.smiles}, which no chair transition state of the [3,3] "
                f"shift at step {shift.step + 1} ({array}) gives: a chair gives {' or '.join(chair)}"
                f"{' (as the racemate)' if racemic and any(is_chiral(c) for c in chair) else ''}",
                written.loc, step=step,
                hint=("an open-chain Cope or Claisen rearrangement goes through a chair: a group on a breaking-bond "
                      "carbon equatorial gives an E double bond, axial a Z one; a terminus's group trans to the "
                      "chain stands equatorial (Doering-Roth: the meso 3,4-dimethylhexa-1,5-diene gives "
                      "(E,Z)-octa-2,6-diene). Write the chair product, or check the configuration written in the "
                      "starting material"),
                atoms=tuple(label(i) for i in shift.chain))
            return
