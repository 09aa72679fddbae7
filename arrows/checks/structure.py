"""Checks on the shape of the mechanism text itself."""
from __future__ import annotations

from itertools import islice
from typing import Iterator

from ..diagnostics import Diagnostic
from ..model import Location
from . import Check, Ending


class SomethingToCheck(Check):
    name = "something to check"
    codes = ("AR112",)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        mechanism = end.mechanism
        if not mechanism.species and not mechanism.steps:
            yield Diagnostic("AR112", "the file holds no species and no steps",
                             Location(mechanism.source_name, 1, 1),
                             hint='start with a species, e.g. species water = "[OH2:1]", then the steps')


class NothingAfterProduct(Check):
    name = "nothing after product"
    codes = ("AR107",)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        for loc in end.mechanism.after_product:
            yield Diagnostic("AR107", "this comes after `product`, which closes the mechanism", loc,
                             hint="move `product` to the end of the file")


class StepsHaveMoves(Check):
    name = "steps have moves"
    codes = ("AR506",)

    def step(self, st, context) -> Iterator[Diagnostic]:
        return self._judge(st.index, st.step)

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        # The steps after one the replay could not apply (the text is read again only then).
        if end.steps_replayed < len(end.mechanism.steps):
            for index, step in islice(enumerate(end.mechanism.steps), end.steps_replayed, None):
                yield from self._judge(index, step)

    @staticmethod
    def _judge(index: int, step) -> Iterator[Diagnostic]:
        if not step.moves:
            yield Diagnostic("AR506", f'step "{step.label}" names no electron moves', step.loc,
                             hint="add the arrows of this step, or merge it with its neighbour", step=index)
