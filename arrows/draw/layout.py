"""2D coordinates for every state of a mechanism, one scale, aligned by atom identity.

Atom indices are identities across states (atoms are only appended), so one position per atom
serves every panel and nothing jumps between panels. The positions come from the union of all
bonds the mechanism ever makes: a ring about to close is drawn already curled, a nucleophile
already faces the atom it attacks, and a forming bond has bond length in every panel.

Hydrogens that moves touch are drawn as atoms; the rest stay implicit in labels. A hydrogen that
travels between two separate species (a proton transfer) is not part of either species' layout:
the species that receives it is placed so that donor, hydrogen and acceptor are in line, and the
hydrogen sits on whichever atom holds it in each panel.

Units: one bond length; y grows downwards (the SVG convention).
"""
from __future__ import annotations

import cmath
import math
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Iterable, Iterator, Optional, Sequence

from rdkit import Chem
from rdkit.Chem import rdDepictor

from ..electrons import ElectronState, ResolvedMove

# Gap between a transferred hydrogen and the atom that is about to take it, in bond lengths:
# wide enough for a curved arrow, close enough to read as one event.
TRANSFER_GAP = 1.55
_CLEARANCE = 1.25    # nearest approach of atoms of two separately placed species


@dataclass(frozen=True)
class PanelAtoms:
    """The atoms one panel draws and where (bond lengths, y down)."""

    state: ElectronState
    visible: tuple[int, ...]
    positions: dict[int, complex]


@dataclass(frozen=True)
class Layout:
    panels: tuple[PanelAtoms, ...]
    drawn_hydrogens: frozenset[int]    # hydrogens drawn as atoms in every panel that has them


class _UnionFind:
    def __init__(self, items: Iterable[int]):
        self.parent = {i: i for i in items}

    def find(self, i: int) -> int:
        while self.parent[i] != i:
            self.parent[i] = self.parent[self.parent[i]]
            i = self.parent[i]
        return i

    def join(self, i: int, j: int) -> None:
        a, b = self.find(i), self.find(j)
        if a != b:
            self.parent[max(a, b)] = min(a, b)

    def groups(self) -> list[list[int]]:
        out: dict[int, list[int]] = {}
        for i in self.parent:
            out.setdefault(self.find(i), []).append(i)
        return [sorted(g) for _, g in sorted(out.items())]


@contextmanager
def _rdkit_depictor() -> Iterator[None]:
    """RDKit's own depictor (not coordgen), whatever another caller chose, for stable output."""
    previous = rdDepictor.GetPreferCoordGen()
    rdDepictor.SetPreferCoordGen(False)
    try:
        yield
    finally:
        rdDepictor.SetPreferCoordGen(previous)


def moving_hydrogens(states: Sequence[ElectronState], moves: Iterable[ResolvedMove]) -> frozenset[int]:
    """Hydrogen atoms that some move names: these are drawn; every other hydrogen is implicit."""
    mol = states[-1].mol
    out = set()
    for move in moves:
        for i in move.source_atoms + move.sink_atoms:
            if i < mol.GetNumAtoms() and mol.GetAtomWithIdx(i).GetAtomicNum() == 1:
                out.add(i)
    return frozenset(out)


def visible_atoms(state: ElectronState, drawn_hydrogens: frozenset[int]) -> tuple[int, ...]:
    return tuple(a.GetIdx() for a in state.mol.GetAtoms()
                 if a.GetIdx() not in state.released
                 and (a.GetAtomicNum() != 1 or a.GetIdx() in drawn_hydrogens))


def compute_layout(states: Sequence[ElectronState], moves: Sequence[Sequence[ResolvedMove]]) -> Layout:
    """Positions for the atoms of every state. `moves[k]` are the moves drawn on panel k."""
    biggest = max(states, key=lambda s: s.mol.GetNumAtoms()).mol
    drawn_h = moving_hydrogens(states, (m for ms in moves for m in ms))
    atoms = [a.GetIdx() for a in biggest.GetAtoms() if a.GetAtomicNum() != 1 or a.GetIdx() in drawn_h]
    elements = {i: biggest.GetAtomWithIdx(i).GetAtomicNum() for i in atoms}
    drawn = set(atoms)

    # Every bond between drawn atoms in any state, with its highest order (for linear triple bonds).
    union: dict[tuple[int, int], int] = {}
    for state in states:
        for bond in state.mol.GetBonds():
            i, j = sorted((bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()))
            if i in drawn and j in drawn:
                union[(i, j)] = max(union.get((i, j), 0), int(bond.GetBondTypeAsDouble()))

    heavy = _UnionFind(i for i in atoms if elements[i] != 1)
    for i, j in union:
        if elements[i] != 1 and elements[j] != 1:
            heavy.join(i, j)
    neighbours: dict[int, set[int]] = {i: set() for i in atoms}
    for i, j in union:
        neighbours[i].add(j)
        neighbours[j].add(i)
    bridging = {h for h in drawn_h
                if len({heavy.find(n) for n in neighbours[h] if elements[n] != 1}) > 1}

    clusters = _UnionFind(i for i in atoms if i not in bridging)
    for i, j in union:
        if i not in bridging and j not in bridging:
            clusters.join(i, j)
    groups = clusters.groups()
    local = {tuple(g): _cluster_coordinates(g, elements, union, states) for g in groups}

    positions = _place_clusters(groups, local, union, bridging, states)
    panels = []
    for state in states:
        visible = visible_atoms(state, drawn_h)
        where = {i: positions[i] for i in visible if i not in bridging}
        for h in bridging:
            if h in visible:
                where[h] = _hydrogen_position(h, state, positions, neighbours)
        panels.append(PanelAtoms(state, visible, where))
    return Layout(tuple(panels), drawn_h)


def _cluster_coordinates(group: list[int], elements: dict[int, int], union: dict[tuple[int, int], int],
                         states: Sequence[ElectronState]) -> dict[int, complex]:
    """RDKit 2D coordinates of one cluster's union graph, scaled to unit bond length."""
    if len(group) == 1:
        return {group[0]: 0j}
    index = {atom: k for k, atom in enumerate(group)}
    mol = Chem.RWMol()
    for atom in group:
        mol.AddAtom(Chem.Atom(elements[atom]))
    orders = {1: Chem.BondType.SINGLE, 2: Chem.BondType.DOUBLE, 3: Chem.BondType.TRIPLE}
    for (i, j), order in sorted(union.items()):
        if i in index and j in index:
            mol.AddBond(index[i], index[j], orders.get(order, Chem.BondType.SINGLE))
    mol.UpdatePropertyCache(strict=False)
    Chem.FastFindRings(mol)
    with _rdkit_depictor():
        rdDepictor.Compute2DCoords(mol, canonOrient=True)
    conf = mol.GetConformer()
    lengths = [(conf.GetAtomPosition(b.GetBeginAtomIdx()) - conf.GetAtomPosition(b.GetEndAtomIdx())).Length()
               for b in mol.GetBonds()]
    scale = 1.0 / (sum(lengths) / len(lengths)) if lengths else 1.0
    # y is flipped: RDKit's y grows upwards, ours downwards.
    return {atom: complex(conf.GetAtomPosition(k).x * scale, -conf.GetAtomPosition(k).y * scale)
            for atom, k in index.items()}


def free_direction(centre: complex, others: Sequence[complex], prefer: Optional[complex] = None) -> complex:
    """Unit vector from centre into the widest gap between the directions to `others`.

    With no neighbours any direction is free: `prefer` (or +x) is used."""
    directions = sorted(cmath.phase(o - centre) for o in others if abs(o - centre) > 1e-9)
    if not directions:
        return prefer / abs(prefer) if prefer else 1 + 0j
    if len(directions) == 1:
        return -cmath.rect(1.0, directions[0])
    best_gap, best_mid = -1.0, 0.0
    for k, a in enumerate(directions):
        b = directions[(k + 1) % len(directions)] + (2 * math.pi if k + 1 == len(directions) else 0)
        if b - a > best_gap + 1e-9:
            best_gap, best_mid = b - a, (a + b) / 2
    return cmath.rect(1.0, best_mid)


def _place_clusters(groups: list[list[int]], local: dict[tuple, dict[int, complex]],
                    union: dict[tuple[int, int], int], bridging: set[int],
                    states: Sequence[ElectronState]) -> dict[int, complex]:
    """Put every cluster on one drawing: the biggest where RDKit left it, each other next to the
    atom it first exchanges a hydrogen with, or (a spectator) to the right of the rest."""
    cluster_of = {atom: k for k, g in enumerate(groups) for atom in g}
    links = _hydrogen_links(bridging, states, cluster_of)
    order = sorted(range(len(groups)), key=lambda k: (-len(groups[k]), groups[k][0]))
    placed: dict[int, complex] = dict(local[tuple(groups[order[0]])])
    done = {order[0]}
    slots: dict[int, list[complex]] = {}     # directions already promised to a hydrogen at an atom

    def neighbours_of(atom: int) -> list[complex]:
        near = [placed[j] for (i, j) in union if i == atom and j in placed and j not in bridging]
        near += [placed[i] for (i, j) in union if j == atom and i in placed and i not in bridging]
        return near + [placed[atom] + d for d in slots.get(atom, [])]

    while len(done) < len(groups):
        link = next(((step, donor, acceptor, h) for step, donor, acceptor, h in links
                     if (cluster_of[donor] in done) != (cluster_of[acceptor] in done)), None)
        if link is None:
            k = min((k for k in range(len(groups)) if k not in done), key=lambda k: (-len(groups[k]), groups[k][0]))
            _place_aside(placed, local[tuple(groups[k])])
            done.add(k)
            continue
        _, first, second, _h = link
        anchor, mover = (first, second) if cluster_of[first] in done else (second, first)
        k = cluster_of[mover]
        coords = local[tuple(groups[k])]
        u = free_direction(placed[anchor], neighbours_of(anchor))
        own = [coords[j] for (i, j) in union if i == mover and j in coords] + \
              [coords[i] for (i, j) in union if j == mover and i in coords]
        v = free_direction(coords[mover], own, prefer=-u)
        best = None
        for turn in (0, 1, -1, 2, -2, 3, -3):
            for extra in (0.0, 0.5, 1.0, 2.0):
                direction = u * cmath.rect(1.0, turn * math.pi / 9) if turn else u
                target = placed[anchor] + direction * (1 + TRANSFER_GAP + extra)
                rotation = (-direction / v) if abs(v) > 0 else 1
                rotation /= abs(rotation)
                moved = {a: target + (p - coords[mover]) * rotation for a, p in coords.items()}
                gap = min((abs(p - q) for p in moved.values() for q in placed.values()), default=9.0)
                score = (gap >= _CLEARANCE, -abs(turn) - extra, gap)
                if best is None or score > best[0]:
                    best = (score, moved, direction, rotation)
            if best and best[0][0]:
                break
        _, moved, direction, rotation = best
        placed.update(moved)
        slots.setdefault(anchor, []).append(direction)
        slots.setdefault(mover, []).append(-direction)
        done.add(k)
    return placed


def _hydrogen_links(bridging: set[int], states: Sequence[ElectronState],
                    cluster_of: dict[int, int]) -> list[tuple[int, int, int, int]]:
    """(panel, atom holding the hydrogen, atom taking it, hydrogen) for every hop of a bridging
    hydrogen between clusters, in the order they happen."""
    hops = []
    for h in sorted(bridging):
        previous = None
        for k, state in enumerate(states):
            if h >= state.mol.GetNumAtoms():
                continue
            holder = _holder(state, h)
            if holder is not None and previous is not None and holder != previous[1] \
                    and cluster_of.get(holder) != cluster_of.get(previous[1]):
                hops.append((previous[0], previous[1], holder, h))
            if holder is not None:
                previous = (k, holder)
    return sorted(hops)


def _holder(state: ElectronState, h: int) -> Optional[int]:
    atom = state.mol.GetAtomWithIdx(h)
    for n in atom.GetNeighbors():
        return n.GetIdx()
    return None


def _place_aside(placed: dict[int, complex], coords: dict[int, complex]) -> None:
    """A species that exchanges nothing with the rest goes to the right of the drawing."""
    right = max((p.real for p in placed.values()), default=0.0)
    mid_y = sum(p.imag for p in placed.values()) / len(placed) if placed else 0.0
    left = min(p.real for p in coords.values())
    cy = sum(p.imag for p in coords.values()) / len(coords)
    shift = complex(right + 1.8 - left, mid_y - cy)
    placed.update({a: p + shift for a, p in coords.items()})


def _hydrogen_position(h: int, state: ElectronState, positions: dict[int, complex],
                       neighbours: dict[int, set[int]]) -> complex:
    """A travelling hydrogen sits one bond from its holder, pointing at the partner it moves
    to or came from; a free proton sits between the atoms it will join."""
    holder = _holder(state, h)
    partners = sorted(n for n in neighbours[h] if n in positions and n != holder)
    if holder is None:
        ends = [positions[n] for n in sorted(neighbours[h]) if n in positions]
        return sum(ends) / len(ends) if ends else 0j
    base = positions[holder]
    if partners:
        target = min((positions[n] for n in partners), key=lambda p: abs(p - base))
        if abs(target - base) > 1e-9:
            return base + (target - base) / abs(target - base)
    return base + 1
