"""Checks over a replayed mechanism. Each check is one small class registered in CHECKS; it reads
the Trace and yields Diagnostics, never prints. Adding a check is one class and one line below."""
from __future__ import annotations

from typing import Iterable, Protocol

from ..diagnostics import Diagnostic, sort_key
from ..trace import Trace


class Check(Protocol):
    name: str
    codes: tuple[str, ...]

    def run(self, trace: Trace) -> Iterable[Diagnostic]: ...


def _registry() -> list[Check]:
    from .checkpoints import CheckpointsMatch
    from .conservation import ChargeAndAtomsConserved
    from .protons import UphillProtonTransfers
    from .rings import RingClosures
    from .stereo import StereoChanges
    from .structure import NothingAfterProduct, SomethingToCheck, StepsHaveMoves
    from .valence import UnusualElectronCounts
    return [SomethingToCheck(), NothingAfterProduct(), StepsHaveMoves(), UnusualElectronCounts(), ChargeAndAtomsConserved(),
            RingClosures(), CheckpointsMatch(),
            UphillProtonTransfers(),
            StereoChanges()]


def run_checks(trace: Trace) -> list[Diagnostic]:
    """The replay's own diagnostics plus every registered check, sorted by location."""
    found = list(trace.diagnostics)
    for check in _registry():
        found.extend(check.run(trace))
    return sorted(found, key=sort_key)
