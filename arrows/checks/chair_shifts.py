"""AR605: the product (or a checkpoint) of a [3,3] shift written with a configuration that no chair
transition state gives. An open-chain Cope or Claisen rearrangement goes through a chair: meso-3,4-
dimethylhexa-1,5-diene gives (E,Z)-octa-2,6-diene (99.7%), the (3R*,4R*) diene (E,E) with some (Z,Z)
(Doering & Roth, Tetrahedron 1962; Clayden, pericyclic rearrangements; from memory). In the chair a
group on a breaking-bond carbon stands pseudo-equatorial (its new double bond E) or pseudo-axial (Z),
and a terminus's group trans to the chain pseudo-equatorial: the two chairs (one the ring flip of
the other) fix the new double bonds and the new centres from the configuration written in the
starting material. A position written without configuration may take either place.

Judged: three arrows, bond to bond, round six atoms of C, N, O and uncharged sulfur bonded to
nothing off the array, none of which is in a ring (acyclic 1,5-dienes, allyl vinyl ethers, their
aza forms, allyl vinyl sulfides and S-allyl ketene N,S-acetals: the thio-Claisen takes the Claisen's
chair, common practice, from memory). A ring on the array can force a boat (a
cis-divinylcyclopropane, bridged systems): not judged. The chair outcomes are carried to later
checkpoints and the product while no later step touches their atoms; a configuration AR603 already
finds wrong is AR603's alone. The chair model is configuration.py's, built once by the replay and
read off the step (StepChange.chair): the replay sets the outcome when both chairs give one
product, and a mismatch there only is this check's (AR603 leaves it); each outcome is tried on the
state with the replay's chair configuration cleared."""
from __future__ import annotations

from dataclasses import replace
from typing import Iterator, Optional

from rdkit import Chem

from ..configuration import ChairModel, Outcome, set_chair_outcome, without_chair_configuration
from ..diagnostics import Diagnostic
from ..electrons import ElectronState
from ..judgement.stereo import ENANTIOMERS, is_chiral, relation
from ..model import Checkpoint
from ..trace import StepTrace
from . import Check, Ending
from .pericyclic import photochemical
from .written_stereo import ChiralityWatch, compared_pieces, holds_chirality, mismatches


def _chair_model(st: StepTrace) -> Optional[ChairModel]:
    """The chair model the replay built for a thermal [3,3] shift outside any ring from a
    configured state (configuration.carry_configuration), else None."""
    change = st.change
    if st.after is None or len(change.moves) != 3 or not change.pericyclic or photochemical(st):
        return None
    return change.chair


def configured_as(state: ElectronState, outcome: Outcome, kept: set[int]) -> Optional[ElectronState]:
    """`state` with a chair outcome's configuration set at the elements whose atoms are in `kept`
    (no later step touched them) and the state leaves unset; None when nothing is set."""
    work = Chem.RWMol(state.mol)
    if not set_chair_outcome(work, outcome, kept):
        return None
    return replace(state, mol=work.GetMol(), configured=True, judged={})


def without_chair(state: ElectronState) -> ElectronState:
    """`state` with the configuration the replay set from a chair cleared: the chairs' outcomes
    are judged one by one against the written configuration."""
    bare = without_chair_configuration(state.mol)
    return state if bare is None else replace(state, mol=bare, judged={})


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


class ChairShift:
    """A judged [3,3] shift: its step, its array and the chair outcomes still standing."""

    def __init__(self, step: int, chain: list[int], outcomes: list[Outcome]) -> None:
        self.step, self.chain, self.outcomes = step, chain, outcomes
        self.kept = set(chain)   # the atoms no later step has touched


class StandingChairShifts:
    """The [3,3] shifts of a replay, from a configured state, whose chair outcomes still stand at
    some atom of their array (no later step touched it). Fed each derived step in order; AR605
    judges written configurations against them, AR602's end count and `arrows trace --stereo`
    read them."""

    def __init__(self) -> None:
        self.shifts: list[ChairShift] = []

    def step(self, st: StepTrace) -> None:
        for shift in self.shifts:
            shift.kept -= set(st.change.touched_atoms)
        self.shifts = [s for s in self.shifts if s.kept]
        chair = _chair_model(st) if st.before.configured else None
        if chair is not None:
            self.shifts.append(ChairShift(st.index, list(chair.chain), list(chair.outcomes)))


class ChairChiralityWatch(ChiralityWatch):
    """ChiralityWatch, with a state counted as chiral when a standing chair shift's outcome makes
    it so. A shift from a chiral state whose two chairs give diastereomers (the (E)-propenyl ether
    of (R)-but-3-en-2-ol: E with one configuration of the new centre, Z with the other) leaves the
    new centre unset, as one state holds one configuration, yet each chair gives one enantiomer
    (chirality transfer, Clayden; from memory): the product is no racemate, and its mirror image is
    no chair's."""

    def __init__(self, standing: StandingChairShifts) -> None:
        super().__init__()
        self.standing = standing

    def holds_chirality(self, state: ElectronState) -> bool:
        return holds_chirality(state) or any(
            holds_chirality(variant) for shift in self.standing.shifts for variant in
            (configured_as(state, outcome, shift.kept) for outcome in shift.outcomes) if variant is not None)


def forms_racemate(trace) -> bool:
    """Whether a replayed mechanism ends as a racemate: ChairChiralityWatch's verdict, as AR605's
    (a [3,3] shift from a chiral start whose chairs give diastereomers keeps the product chiral)."""
    standing = StandingChairShifts()
    watch = ChairChiralityWatch(standing)
    for st in trace.steps:
        watch.before(st)
        if st.after is not None:
            standing.step(st)
        watch.after(st)
    return watch.racemic


class ChairThreeThreeShift(Check):
    name = "[3,3] shift through a chair"
    codes = ("AR605",)

    def __init__(self) -> None:
        self.standing = StandingChairShifts()
        self.watch = ChairChiralityWatch(self.standing)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.index == 0:
            self.standing = StandingChairShifts()
            self.watch = ChairChiralityWatch(self.standing)
        self.watch.before(st)
        if st.after is None:
            return
        self.standing.step(st)   # first: the watch counts the chairs' outcomes on the state after
        self.watch.after(st)
        for checkpoint in st.step.expects:
            yield from self._judged(st.after, checkpoint, "checkpoint", st.index)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        product_line = end.mechanism.product
        if product_line is not None and end.final is not None:
            yield from self._judged(end.final, product_line, "product", None)

    def _judged(self, state: ElectronState, written: Checkpoint, what: str, step: Optional[int]
                ) -> Iterator[Diagnostic]:
        if not self.standing.shifts or not any(mark in written.smiles for mark in ("@", "/", "\\")):
            return
        racemic = self.watch.racemic
        state = without_chair(state)   # each chair outcome is tried on the state, the replay's one too
        if mismatches(state, written, what, step, racemic):
            return   # AR603's to say
        for shift in self.standing.shifts:
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
