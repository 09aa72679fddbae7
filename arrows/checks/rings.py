"""Ring closures: a bond formed between two atoms already joined closes a ring."""
from __future__ import annotations

from typing import Iterator

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..trace import StepTrace, Trace


def ring_size_closed(st: StepTrace, i: int, j: int) -> int:
    """Size of the smallest ring the new bond i-j closes (0 if it joins two fragments). The path is
    taken in the state after the step without the new bond, so bonds broken in the step do not count."""
    work = Chem.RWMol(st.after.mol)
    work.RemoveBond(i, j)
    path = Chem.GetShortestPath(work, i, j)
    return len(path) if path else 0


class RingClosures:
    name = "ring closures"
    codes = ("AR501",)

    def run(self, trace: Trace) -> Iterator[Diagnostic]:
        for st in trace.steps:
            if st.after is None:
                continue
            for i, j in st.change.formed:
                size = ring_size_closed(st, i, j)
                if size in (3, 4):
                    a, b = st.after.label(i), st.after.label(j)
                    yield Diagnostic("AR501", f"the new bond {a}-{b} closes a {size}-membered ring", st.step.loc,
                                     hint="five- and six-membered closures usually win when the substrate offers one",
                                     bonds=((a, b),), step=st.index)
