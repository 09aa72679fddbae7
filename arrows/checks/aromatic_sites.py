"""An aromatic ring's oxygen used as a nucleophile (AR537).

The lone pair of a furan-type oxygen (two ring bonds, in a ring RDKit perceives as aromatic) is
part of the ring's aromatic sextet. Bonded to an electrophile it would make an oxonium ion and give
the aromaticity up: furans react at a ring carbon next to the oxygen (C2 or C5) with electrophiles,
and as dienes in cycloadditions (Joule & Mills, Heterocyclic Chemistry; from memory). A bond made
inside the ring (the oxygen's pair pushing into a ring C=O+ as a ring carbon bonds, the usual
attack at C2) is not judged, nor a pyrrole-type nitrogen (an indole's N-Mannich reaction is real)
nor a thiophene's sulfur (oxidised at S by peracids)."""
from __future__ import annotations

from typing import Iterator

from ..diagnostics import Diagnostic
from ..trace import StepTrace
from . import Check
from .valence import doubly_bonded


class AromaticOxygenNucleophile(Check):
    name = "aromatic oxygen as a nucleophile"
    codes = ("AR537",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None:
            return
        before = st.before
        for m in st.change.moves:
            if m.source_kind != "lone_pair" or m.electrons != 2 or len(m.sink_atoms) != 2:
                continue
            o = m.source_atoms[0]
            if before.elements[o] != 8 or o not in m.sink_atoms:
                continue
            target = next(a for a in m.sink_atoms if a != o)
            if before.mol.GetBondBetweenAtoms(o, target) is not None:
                continue   # a pair pushed into a bond the oxygen has (C=O+ forming in the ring)
            neighbours = [n.GetIdx() for n in before.mol.GetAtomWithIdx(o).GetNeighbors()]
            if len(neighbours) != 2 or not all(doubly_bonded(before, n) is not None for n in neighbours):
                continue   # (a furan's O stands between two C=C carbons: most oxygens fail this at once)
            view = context.views.of(before)
            position = view.position(o)
            if position is None:
                continue
            atom = view.mol.GetAtomWithIdx(position)
            if not atom.GetIsAromatic() or atom.GetDegree() != 2 or atom.GetFormalCharge() != 0:
                continue
            label = before.label
            ring_carbons = sorted(label(view.original[n.GetIdx()])
                                  for n in atom.GetNeighbors() if n.GetAtomicNum() == 6)
            x, t = label(o), label(target)
            yield Diagnostic(
                "AR537", f"{x}'s lone pair is part of its aromatic ring's sextet: bonding it to {t} makes an oxonium "
                f"ion and gives up the ring's aromaticity", m.move.loc,
                hint=f"a furan reacts at the ring carbon next to {x} ({' or '.join(ring_carbons)}), its pair from the "
                     f"ring's C=C with {x}'s pair pushing in, or as a diene in a cycloaddition (Joule & Mills, from memory)",
                atoms=(x, t), step=st.index)
