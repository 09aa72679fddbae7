"""Checks on the shape of the mechanism text itself."""
from __future__ import annotations

from typing import Iterator

from ..diagnostics import Diagnostic
from ..model import Location
from ..trace import Trace


class SomethingToCheck:
    name = "something to check"
    codes = ("AR112",)

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        mechanism = trace.mechanism
        if not mechanism.species and not mechanism.steps:
            yield Diagnostic("AR112", "the file holds no species and no steps",
                             Location(mechanism.source_name, 1, 1),
                             hint='start with a species, e.g. species water = "[OH2:1]", then the steps')


class NothingAfterProduct:
    name = "nothing after product"
    codes = ("AR107",)

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        for loc in trace.mechanism.after_product:
            yield Diagnostic("AR107", "this comes after `product`, which closes the mechanism", loc,
                             hint="move `product` to the end of the file")


class StepsHaveMoves:
    name = "steps have moves"
    codes = ("AR506",)

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        for index, step in enumerate(trace.mechanism.steps):
            if not step.moves:
                yield Diagnostic("AR506", f'step "{step.label}" names no electron moves', step.loc,
                                 hint="add the arrows of this step, or merge it with its neighbour", step=index)
