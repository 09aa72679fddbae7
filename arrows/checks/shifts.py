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


def trans_across(mol: Chem.Mol, first: int, a: int, b: int, second: int) -> Optional[bool]:
    """Whether `first` (a neighbour of a) and `second` (a neighbour of b) stand trans across the
    double bond a=b; None when its geometry is not written. The other neighbour of an end than
    the one the geometry is given against is opposite it."""
    written = written_geometry(mol, a, b)
    if written is None:
        return None
    ref_a, ref_b, cis = written
    return (not cis) ^ (ref_a != first) ^ (ref_b != second)


class MigrationAntiToLeavingGroup(Check):
    name = "migrating group"
    codes = ("AR509",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.before.configured:
            return
        broken = {tuple(sorted(pair)) for pair in st.change.broken}
        for move in st.change.moves:
            if move.source_kind != "bond" or len(move.sink_atoms) != 2:
                continue
            migrating, destination = move.sink_atoms
            if migrating not in move.source_atoms:
                continue
            origin = next(i for i in move.source_atoms if i != migrating)
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
