"""Checks over a replayed mechanism. Each check is one small class registered in _registry(); it is
fed the steps in order as the replay makes them (`step`), then the end of the replay (`finish`),
and yields Diagnostics, never prints. A check keeps what it needs of earlier steps itself, so a
long mechanism is checked without holding every state. Adding a check is one class and one line
below."""
from __future__ import annotations

from typing import Iterable, Optional

from ..diagnostics import Diagnostic, sort_key
from ..electrons import ElectronState
from ..judgement.perception import RecentViews
from ..model import Mechanism, frozen
from ..trace import Replay, StepTrace, Trace


class Context:
    """What the checks of one replay share: the perceived views of the latest states."""

    def __init__(self) -> None:
        self.views = RecentViews()


@frozen
class Ending:
    """The end of a replay, as the checks see it in `finish`."""

    mechanism: Mechanism
    initial: Optional[ElectronState]
    final: Optional[ElectronState]        # None unless every step was derived
    steps_replayed: int


class Check:
    """The base of every check: `step` is called for each replayed step in order, `finish` once at
    the end; either may be left out."""

    name: str = ""
    codes: tuple[str, ...] = ()

    def step(self, st: StepTrace, context: Context) -> Iterable[Diagnostic]:
        return ()

    def finish(self, end: Ending, context: Context) -> Iterable[Diagnostic]:
        return ()

    def run(self, trace: Trace) -> list[Diagnostic]:
        """This check alone over a finished trace."""
        context = Context()
        found = [d for st in trace.steps for d in self.step(st, context)]
        return found + list(self.finish(_ending(trace), context))


_CHECK_CLASSES: list[type[Check]] = []   # filled on first use: the modules import this one


def _registry() -> list[Check]:
    """A fresh instance of every check (each keeps what it needs of one replay)."""
    if not _CHECK_CLASSES:
        from .aromatic_sites import AromaticOxygenNucleophile
        from .carboxylates import CarbonNucleophileOnCarboxylate
        from .chair_shifts import ChairThreeThreeShift
        from .checkpoints import CheckpointsMatch
        from .conservation import ChargeAndAtomsConserved
        from .hypohalites import CarbonOnHypohaliteOxygen
        from .leaving import ConcertedAcylSubstitution, StrongBaseLeavingGroups, TertiarySubstitution
        from .pericyclic import ForbiddenPericyclic
        from .radicals import FreeHydrogenAtoms, UphillHydrogenAtomTransfers
        from .protons import (BareProtons, CarbeneFromCH, CHPairBondsAsProtonGoes, FourCentreProtonTransfers,
                              OniumBesideAte, UphillProtonTransfers)
        from .ring_eliminations import RingEliminationGeometry
        from .rings import RingClosures, StrainedCumulenes
        from .shifts import CationShiftDirection, MigrationAntiToLeavingGroup, ShiftBetweenNeighbours
        from .sigma_complexes import SigmaComplexesRearomatise
        from .stereo import StereoChanges
        from .structure import NothingAfterProduct, SomethingToCheck, StepsHaveMoves
        from .valence import UnpairedElectronsInPolarMechanism, UnusualElectronCounts
        from .written_stereo import WrittenConfigurationMatches
        _CHECK_CLASSES.extend([SomethingToCheck, NothingAfterProduct, StepsHaveMoves, UnusualElectronCounts,
                               ChargeAndAtomsConserved, RingClosures, CheckpointsMatch, UphillProtonTransfers, BareProtons,
                               StereoChanges, MigrationAntiToLeavingGroup, CationShiftDirection, ShiftBetweenNeighbours,
                               StrongBaseLeavingGroups, TertiarySubstitution, ConcertedAcylSubstitution,
                               WrittenConfigurationMatches, ChairThreeThreeShift, RingEliminationGeometry, ForbiddenPericyclic,
                               StrainedCumulenes, CarbeneFromCH, FourCentreProtonTransfers,
                               CHPairBondsAsProtonGoes, UnpairedElectronsInPolarMechanism, OniumBesideAte,
                               SigmaComplexesRearomatise, UphillHydrogenAtomTransfers,
                               FreeHydrogenAtoms, AromaticOxygenNucleophile, CarbonNucleophileOnCarboxylate,
                               CarbonOnHypohaliteOxygen])
    return [cls() for cls in _CHECK_CLASSES]


def _ending(trace: Trace) -> Ending:
    return Ending(trace.mechanism, trace.initial, trace.final, len(trace.steps))


def _checked(steps: Iterable[StepTrace], end) -> list[Diagnostic]:
    checks, context = _registry(), Context()
    stepwise = [c for c in checks if type(c).step is not Check.step]   # the others only finish
    found: list[Diagnostic] = []
    for st in steps:
        for check in stepwise:
            found.extend(check.step(st, context))
    ending = end()
    for check in checks:
        found.extend(check.finish(ending, context))
    return found


def run_checks(trace: Trace) -> list[Diagnostic]:
    """The replay's own diagnostics plus every registered check, sorted by location."""
    found = _checked(trace.steps, lambda: _ending(trace))
    return sorted(list(trace.diagnostics) + found, key=sort_key)


def check_streaming(mechanism: Mechanism) -> list[Diagnostic]:
    """run_checks(replay(mechanism)), but each state is let go once the checks have seen it: the
    memory does not grow with the number of steps."""
    replay = Replay(mechanism)
    found = _checked(replay, lambda: Ending(mechanism, replay.initial, replay.final, replay.steps_replayed))
    return sorted(list(replay.diagnostics) + found, key=sort_key)
