"""Checks on the shape of the mechanism text itself."""
from __future__ import annotations

from typing import Iterator

from ..diagnostics import Diagnostic
from ..trace import Trace


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
