"""Stereocentres and stereogenic double bonds made or lost in each step (those configured, or
lasting to the product or a checkpoint), and how many stereoisomers of the final product can form
when the mechanism controls none of them, or the chairs of its [3,3] shifts allow (AR602)."""
from __future__ import annotations

from itertools import product
from math import prod
from typing import Iterator, Optional, Sequence

from rdkit import Chem

from ..configuration import (chair_configured, electrocyclic_turn, names_light, open_face_groups, set_chair_outcome,
                             step_changes)
from ..diagnostics import Diagnostic
from ..judgement.stereo import CENTRE, StereoElement, describe, state_stereo, stereoisomer_count, stereoisomers
from ..rdkit_io import fragment, readable_smiles
from ..electrons import ElectronState
from ..judgement.perception import RecentViews
from ..trace import StepTrace, Trace
from . import Check, Ending
from .chair_shifts import ChairShift, StandingChairShifts
from ..model import frozen


@frozen
class ProductStereo:
    smiles: str
    elements: tuple[StereoElement, ...]
    stereoisomers: Optional[int]     # None: RDKit could not enumerate them
    # The stereoisomers the chairs of standing [3,3] shifts allow, where fewer than `stereoisomers`,
    # and those shifts' steps (from 1) whose chairs give a choice
    allowed: Optional[frozenset[str]] = None
    chair_steps: tuple[int, ...] = ()


def step_stereo(st: StepTrace, views: Optional[RecentViews] = None) -> tuple[list[StereoElement], list[StereoElement]]:
    """(made, lost) in one step; `views` holds the perceived views of the states met lately (the
    state after one step is usually the state before the next)."""
    if st.after is None:
        return [], []
    views = RecentViews() if views is None else views
    old = state_stereo(st.before, views)
    new = state_stereo(st.after, views)
    return sorted(new - old), sorted(old - new)


def _electrocyclic_turn(st: StepTrace) -> Optional[str]:
    """How the step turned the termini of an electrocyclic closure it configured, else None."""
    pairs = sum(1 for m in st.change.moves if m.electrons == 2)
    return electrocyclic_turn(st.before.mol, step_changes(st.change), pairs, names_light(st.step.over, st.step.under))


def final_stereo(trace: Trace) -> list[ProductStereo]:
    """Each fragment of the final state (released by-products aside) that has stereo elements,
    with the number of its stereoisomers when no configuration made by the mechanism is fixed, and
    those the chairs of its [3,3] shifts allow (as AR602's end count reads them)."""
    touched = {i for st in trace.steps for i in st.change.touched_atoms}
    chairs = StandingChairShifts()
    for st in trace.steps:
        if st.after is not None:
            chairs.step(st)
    return product_stereo(trace.final, touched, chairs=chairs.shifts)


def product_stereo(final: Optional[ElectronState], touched: set[int], views: Optional[RecentViews] = None,
                   several_only: bool = False, arisen: frozenset[StereoElement] = frozenset(),
                   chairs: Sequence[ChairShift] = ()) -> list[ProductStereo]:
    """final_stereo for a final state and the atoms the mechanism's moves touched; `several_only`
    keeps only the fragments with more than one stereoisomer (no SMILES is written for the others),
    naming the elements a step touched or made (`arisen`: not in the species as written).
    `chairs`: the [3,3] shifts whose chairs still stand (StandingChairShifts); a piece they allow
    fewer stereoisomers of says so."""
    if final is None:
        return []
    elements = state_stereo(final, views or RecentViews())
    if not elements:
        return []
    variants = _chair_variants(final.mol, chairs)
    chair_steps = tuple(shift.step + 1 for shift in chairs if len(shift.outcomes) > 1)
    out = []
    for indices in Chem.GetMolFrags(final.mol, asMols=False, sanitizeFrags=False):
        if set(indices) & final.released:
            continue
        mine = tuple(sorted(e for e in elements if e.atoms[0] in indices))
        if several_only:
            # The note names only what the steps made or cleared: a centre no step touched (a
            # racemic acid written without configuration, only giving its proton; glucose's four
            # untouched centres beside the anomeric one) is the species as written. A centre the
            # steps made without touching it is theirs: the quaternary carbon of a
            # 2-methylcyclopentane-1,3-dione that an aldol at one carbonyl desymmetrises.
            mine = tuple(e for e in mine if e in arisen or touched.intersection(e.atoms))
        if not mine:
            continue
        piece, uncontrolled, turning = _open_piece(final.mol, indices, touched, final.configured)
        count = stereoisomer_count(piece, uncontrolled, turning)
        allowed = _chair_allowed(variants, indices, touched, count)
        if several_only and ((count or 0) if allowed is None else len(allowed)) <= 1:
            continue
        out.append(ProductStereo(readable_smiles(piece), mine, count, allowed,
                                 chair_steps if allowed is not None else ()))
    return out


def _open_piece(mol: Chem.Mol, indices: Sequence[int], touched: set[int], configured: bool
                ) -> tuple[Chem.Mol, list[int], list[list[int]]]:
    """The fragment of `mol` on `indices`, its atoms free to take either configuration and its
    groups of centres that may turn over as one (stereoisomer_count's arguments)."""
    position = {old: new for new, old in enumerate(sorted(indices))}
    # A touched atom is free to take either configuration unless the replay carried one
    # through the step (a backside substitution inverts the written one, a 1,2-shift keeps it).
    # So does a double bond whose geometry a concerted elimination set. A state with no
    # configuration (most) has none to clear.
    uncontrolled = [position[i] for i in touched if i in position and not _configured_at(mol, i)] \
        if configured else []
    turning = [[position[i] for i in group] for group in open_face_groups(mol)
               if all(i in position for i in group)]
    return fragment(mol, indices), uncontrolled, turning


def _chair_allowed(variants: Sequence[Chem.Mol], indices: Sequence[int], touched: set[int],
                   count: Optional[int]) -> Optional[frozenset[str]]:
    """The stereoisomers of the piece on `indices` that some chair variant of the final state
    allows (each variant's own open elements left free), where fewer than `count`; else None."""
    if not variants or count is None:
        return None
    allowed: set[str] = set()
    for variant in variants:
        found = stereoisomers(*_open_piece(variant, indices, touched, True))
        if found is None:
            return None   # a variant RDKit cannot enumerate: the free count stands
        allowed |= found
    return frozenset(allowed) if len(allowed) < count else None


_MOST_VARIANTS = 64   # combinations of chair outcomes tried; past it the free count stands


def _chair_variants(final: Chem.Mol, shifts: Sequence[ChairShift]) -> list[Chem.Mol]:
    """`final` with each combination of the shifts' chair outcomes set where its atoms are kept
    (no later step touched them) and `final` leaves them unset; none when no shift has a choice
    (the replay set the one product both chairs give) or there are too many combinations."""
    if not any(len(shift.outcomes) > 1 for shift in shifts) \
            or prod(len(shift.outcomes) for shift in shifts) > _MOST_VARIANTS:
        return []
    variants = []
    for picked in product(*(shift.outcomes for shift in shifts)):
        work = Chem.RWMol(final)
        for shift, outcome in zip(shifts, picked):
            set_chair_outcome(work, outcome, shift.kept)
        variants.append(work.GetMol())
    return variants


def _configured_at(mol: Chem.Mol, i: int) -> bool:
    """Whether atom i carries a chiral tag or ends a double bond of set geometry."""
    atom = mol.GetAtomWithIdx(i)
    return atom.GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED or any(
        b.GetStereo() != Chem.BondStereo.STEREONONE for b in atom.GetBonds())


def _said(elements: list[StereoElement], label) -> str:
    centres = [describe(e, label) for e in elements if e.kind == CENTRE]
    bonds = [describe(e, label) for e in elements if e.kind != CENTRE]
    parts = []
    if centres:
        parts.append(f"stereocentre{'s' if len(centres) > 1 else ''} {', '.join(centres)}")
    if bonds:
        parts.append(f"stereogenic double bond{'s' if len(bonds) > 1 else ''} {', '.join(bonds)}")
    return " and ".join(parts)


_CHAIR = ("a [3,3] shift through a chair transition state, the one product both chairs give from the "
          "configuration written")


def _configured_centres(state: ElectronState, elements: list[StereoElement]) -> list[int]:
    return [e.atoms[0] for e in elements if e.kind == CENTRE
            and state.mol.GetAtomWithIdx(e.atoms[0]).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED]


def _configured_in(state: ElectronState, e: StereoElement) -> bool:
    """Whether a state carries a configuration at the element: a chiral tag on the centre, a set
    geometry on the double bond."""
    if not state.configured:
        return False
    if e.kind == CENTRE:
        return state.mol.GetAtomWithIdx(e.atoms[0]).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED
    bond = state.mol.GetBondBetweenAtoms(*e.atoms)
    return bond is not None and bond.GetStereo() != Chem.BondStereo.STEREONONE


class _StepNote:
    """What one step made and lost, held until the end of the replay says which new elements
    lived long enough to be reported."""

    def __init__(self, st: StepTrace, made: list[StereoElement], lost: list[StereoElement], why: str,
                 set_here: list[int], geometry: str) -> None:
        self.index, self.loc = st.index, st.step.loc
        self.made, self.lost = made, lost
        self.shown_made: set[StereoElement] = set()
        # why: how the step configured set_here; geometry: the words on the double bonds it set, if any
        self.why, self.set_here, self.geometry = why, set_here, geometry

    def diagnostic(self, label) -> Optional[Diagnostic]:
        made = [e for e in self.made if e in self.shown_made]
        if not made and not self.lost:
            return None
        parts = []
        if made:
            parts.append(f"new {_said(made, label)}")
            if self.set_here:
                if len(self.set_here) == sum(e.kind == CENTRE for e in made):
                    parts[-1] += f", {self.why}"
                else:
                    parts[-1] += f"; of them {', '.join(label(i) for i in self.set_here)} {self.why}, the others left open"
            parts[-1] += self.geometry
        if self.lost:
            parts.append(f"no longer stereogenic: {_said(self.lost, label)}")
        return Diagnostic("AR602", "; ".join(parts), self.loc, step=self.index,
                          atoms=tuple(label(i) for e in made + self.lost for i in e.atoms))


class StereoChanges(Check):
    name = "stereo changes"
    codes = ("AR602",)

    def __init__(self) -> None:
        self.touched: set[int] = set()
        self.written: Optional[frozenset[StereoElement]] = None   # the stereo elements of the first state
        self.arisen: set[StereoElement] = set()                    # made by a step, not in the first state
        self.last_loc = None
        # A stereo element's atoms are heavy atoms, whose labels (element and map number, or
        # position) never change in a replay: each is read off a Mol once.
        self.labels: dict[int, str] = {}
        self.notes: list[_StepNote] = []
        # New unconfigured elements not yet known to last: one lost again before the end or a
        # checkpoint (a transient enolate's E/Z, a tetrahedral intermediate's centre) is not reported.
        self.pending: dict[StereoElement, _StepNote] = {}
        self.chairs = StandingChairShifts()   # a chair allows fewer product stereoisomers than the free count

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        self.touched.update(st.change.touched_atoms)
        if st.after is not None:
            self.chairs.step(st)
        self.last_loc = st.step.loc
        made, lost = step_stereo(st, context.views)
        if self.written is None:
            self.written = state_stereo(st.before, context.views)
        self.arisen.update(e for e in made if e not in self.written)
        if made or lost:
            self._note(st, made, lost)
        if st.step.expects:
            self._shown(list(self.pending))   # a checkpoint is written on the state they stand in
        return iter(())

    def _note(self, st: StepTrace, made: list[StereoElement], lost: list[StereoElement]) -> None:
        labels = self.labels
        for e in made + lost:
            for i in e.atoms:
                if i not in labels:
                    labels[i] = st.after.label(i)
        for e in lost:
            self.pending.pop(e, None)
        # Losing a configuration is a racemisation or scrambling risk; losing one never set is not news.
        shown_lost = [e for e in lost if _configured_in(st.before, e)]
        if not made and not shown_lost:
            return
        configured = st.after.configured   # the rules below can only have acted in a configured state
        set_here = _configured_centres(st.after, made) if configured else []
        why = ""
        if set_here:
            # configuration.py sets a new centre's configuration for a few rules only; the others stay free
            if all(chair_configured(st.after.mol, i) for i in set_here):
                why = f"configured by the step ({_CHAIR})"
            elif turn := _electrocyclic_turn(st):
                why = f"configured by the step (an electrocyclic closure, its termini turning {turn}: Woodward-Hoffmann rules)"
            else:
                why = "configured by the step (both new bonds on one face of the double bond or diene)"
            if any(set(group) & set(set_here) for group in open_face_groups(st.after.mol)):
                why += "; endo or exo left open (each pair fixed within itself)"
        set_bonds = [e for e in made if e.kind != CENTRE and _configured_in(st.after, e)]
        geometry = ""
        if set_bonds:
            by_chair = all(chair_configured(st.after.mol, i) for e in set_bonds for i in e.atoms)
            geometry = (f", {'their geometry' if len(set_bonds) > 1 else 'its geometry'} set by the step ("
                        + (_CHAIR if by_chair else
                           "a concerted elimination from two configured centres, the two groups leaving periplanar")
                        + ")")
        note = _StepNote(st, made, shown_lost, why, set_here, geometry)
        self.notes.append(note)
        for e in made:
            if _configured_in(st.after, e):
                note.shown_made.add(e)
            else:
                self.pending[e] = note

    def _shown(self, elements: list[StereoElement]) -> None:
        for e in elements:
            self.pending.pop(e).shown_made.add(e)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        self._shown(list(self.pending))   # they reach the product, or the replay stopped with them standing
        label = self.labels.__getitem__
        for note in self.notes:
            found = note.diagnostic(label)
            if found is not None:
                yield found
        if not end.steps_replayed:
            return   # no step: the mechanism makes nothing to count
        many = product_stereo(end.final, self.touched, context.views, several_only=True, arisen=frozenset(self.arisen),
                              chairs=self.chairs.shifts)
        if not many:
            return
        mechanism = end.mechanism
        loc = mechanism.product.loc if mechanism.product else self.last_loc   # a final state: every step was seen
        label = end.final.label
        free = [f"{p.smiles} ({_said(list(p.elements), label)}): {p.stereoisomers} stereoisomers can form"
                for p in many if p.allowed is None]
        parts = [f"with no stereocontrol, {'; '.join(free)}"] if free else []
        parts += [f"{chair_allowance(p)} of {p.smiles} ({_said(list(p.elements), label)}){chairs_named(p)}"
                  for p in many if p.allowed is not None]
        yield Diagnostic("AR602", "; ".join(parts), loc, step=end.steps_replayed - 1)


_NAMED_MOST = 4   # the stereoisomers a chair allows are written out up to this many


def chair_allowance(p: ProductStereo) -> str:
    """The count of a product whose stereoisomers the chairs of [3,3] shifts narrow down (the
    racemic 3,4-dimethylhexa-1,5-diene's two chairs give (E,E)- and (Z,Z)-octa-2,6-diene, not
    (E,Z)): `a chair [3,3] shift (step 1) allows 2 of the 3 stereoisomers`. For AR602's end count
    and `arrows trace --stereo`, which say it alike."""
    steps = p.chair_steps
    shifts = (f"a chair [3,3] shift (step {steps[0]}) allows" if len(steps) == 1 else
              f"chair [3,3] shifts (steps {', '.join(map(str, steps))}) allow")
    return f"{shifts} {len(p.allowed)} of the {p.stereoisomers} stereoisomers"


def chairs_named(p: ProductStereo) -> str:
    """`: A and B`, the stereoisomers the chairs allow, when few enough to write out; else nothing."""
    return f": {' and '.join(sorted(p.allowed))}" if len(p.allowed) <= _NAMED_MOST else ""
