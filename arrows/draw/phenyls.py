"""Spectator phenyls on phosphorus, written "Ph".

Schemes draw triphenylphosphine, its oxide, ylides and betaines as Ph3P, Ph3P=O, Ph3P+ (common
practice): three hexagons round the phosphorus only crowd the centre that reacts. A phenyl ring
whose ipso carbon is single-bonded to a phosphorus, none of whose atoms any step touches (so it is
the same in every panel), is drawn as one label "Ph" at its ipso carbon; its other five carbons,
and any hydrogen of theirs written as an atom, are left out of the layout and of every panel.
"""
from __future__ import annotations

from typing import Iterable, Optional, Sequence

from ..electrons import ElectronState

PHENYL_LABEL = "Ph"
_CARBON, _HYDROGEN, _PHOSPHORUS = 6, 1, 15


def spectator_phenyls(states: Sequence[ElectronState], touched: Iterable[int]) -> dict[int, frozenset[int]]:
    """ipso carbon -> the atoms its "Ph" label stands for (the ring's other five carbons and
    their hydrogens written as atoms), for each phenyl on a phosphorus in `states` none of whose
    atoms is in `touched` (the atoms any step's arrows or changes reach)."""
    touched = set(touched)
    found: dict[int, frozenset[int]] = {}
    for state in states:
        mol = state.mol
        for p in range(mol.GetNumAtoms()):
            if state.elements[p] != _PHOSPHORUS:
                continue
            for bond in mol.GetAtomWithIdx(p).GetBonds():
                ipso = bond.GetOtherAtomIdx(p)
                if ipso in found or bond.GetBondTypeAsDouble() != 1.0:
                    continue
                ring = _phenyl_from(state, ipso, p)
                if ring is not None and touched.isdisjoint(ring | {ipso}):
                    found[ipso] = ring
    return found


def _phenyl_from(state: ElectronState, ipso: int, phosphorus: int) -> Optional[frozenset[int]]:
    """The atoms of a plain phenyl ring hung on `phosphorus` by `ipso`, but ipso itself (five C-H
    carbons, their hydrogens if written as atoms); None for anything else (a substituted, charged,
    labelled or fused ring, a ring that is not a benzene)."""
    mol = state.mol
    if not _plain_carbon(state, ipso):
        return None
    atom = mol.GetAtomWithIdx(ipso)
    ring_neighbours = [n.GetIdx() for n in atom.GetNeighbors() if n.GetIdx() != phosphorus]
    if atom.GetDegree() != 3 or atom.GetTotalNumHs() or len(ring_neighbours) != 2:
        return None
    # Walk round the ring from one ortho carbon: five C-H carbons, each with two ring neighbours.
    path, previous, current = [ipso], ipso, ring_neighbours[0]
    hydrogens: list[int] = []
    while current != ipso:
        if len(path) > 6 or not _plain_carbon(state, current):
            return None
        c = mol.GetAtomWithIdx(current)
        heavy = [n.GetIdx() for n in c.GetNeighbors() if n.GetAtomicNum() != _HYDROGEN]
        written = [n for n in c.GetNeighbors() if n.GetAtomicNum() == _HYDROGEN]
        if len(heavy) != 2 or c.GetTotalNumHs(includeNeighbors=True) != 1 \
                or any(h.GetIsotope() or h.GetDegree() != 1 for h in written):
            return None
        hydrogens += [h.GetIdx() for h in written]
        path.append(current)
        previous, current = current, heavy[0] if heavy[1] == previous else heavy[1]
    if len(path) != 6 or not _benzene_bonds(mol, path):
        return None
    return frozenset(path[1:] + hydrogens)


def _plain_carbon(state: ElectronState, i: int) -> bool:
    """An unlabelled carbon without charge or electrons of its own."""
    return (state.elements[i] == _CARBON and not state.nonbonding[i] and not state.formal_charge(i)
            and not state.mol.GetAtomWithIdx(i).GetIsotope())


def _benzene_bonds(mol, ring: list[int]) -> bool:
    """Whether the bonds round `ring` (in order) are a benzene's: aromatic, or single and double by turns."""
    orders = [mol.GetBondBetweenAtoms(a, b).GetBondTypeAsDouble() for a, b in zip(ring, ring[1:] + ring[:1])]
    if all(o == 1.5 for o in orders):
        return True
    evens, odds = set(orders[0::2]), set(orders[1::2])
    return len(evens) == len(odds) == 1 and evens | odds == {1.0, 2.0}
