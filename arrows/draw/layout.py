"""2D coordinates for every state of a mechanism, one scale, aligned by atom identity.

Atom indices are identities across states (atoms are only appended), and an atom may move
between two panels only if the step between them touches it. Positions come from RDKit's
depiction of the union of all bonds the mechanism ever makes: a ring about to close is drawn
already curled, a nucleophile already faces the atom it attacks, and a forming bond has bond
length in every panel, so nothing else needs to move.

Two kinds of bond stay out of that union, because they would crowd it with bonds that never
exist together: bonds to fragments that leave (`releases`), and hydrogens travelling between
separate species (proton transfers). Each such species is a cluster of its own, placed per run
of panels in which it cannot move: next to the atom it is bonded to, or in line with the
hydrogen it is about to exchange (donor, hydrogen and acceptor in a row, with room for an
arrow; within an arrow's reach of every partner it exchanges a hydrogen with during the run; and
where that arrow crosses no bond, if any such spot is clear), or where it was last. A travelling hydrogen sits on whichever atom holds it, pointing at
the partner it came from or goes to.

Units: one bond length; y grows downwards (the SVG convention).
"""
from __future__ import annotations

import cmath
import math
from contextlib import contextmanager
from dataclasses import dataclass, field
from functools import lru_cache
from types import MappingProxyType
from typing import Callable, Iterable, Iterator, Mapping, Optional, Sequence

import numpy as np
from rdkit import Chem
from rdkit.Chem import rdDepictor

from ..electrons import ElectronState, ResolvedMove
from ..rdkit_io import bond_list
from .branches import ease_clashes, side_beyond, slot_beside
from .cages import draw_cages_in_perspective
from .plane import (angular_gaps, any_inside_polygons, collinear, crosses_any, distance_to_segment, free_direction,
                    gap_around, gap_beside, gap_facing, inside_polygon, segments_cross, unit, unit_or_zero)
from .untangle import Untangler

# Gap between a transferred hydrogen and the atom that takes it, in bond lengths: room for a
# curved arrow, close enough to read as one event.
TRANSFER_GAP = 1.5
# Heavy atom to heavy atom across a proton hop, in bond lengths: near enough for a short arrow,
# far enough for the hydrogen between them.
PARTNER_REACH = (2.0, 2.6)
OPEN_BOND = 1.5      # a bond about to form between two species, as chemists draw it
LEFTOVER_GAP = 0.8   # between the labels of species that meet no other, set in a row on the right
# Partners of a cycloaddition: wider, so each of the arrows around the forming ring has room
# to bend and no head sits under another.
CYCLOADDITION_GAP = 1.8
# Two molecules about to bond wait this far apart (atom to atom, bond lengths), facing each
# other, so the curved arrow between them has room to bend.
APPROACH = 2.2
_CLEARANCE = 1.2     # nearest approach allowed between atoms of separately placed clusters
# A by-product left where it acted, with nothing nearer than this (bond lengths), is stranded.
_STRANDED = 1.8
_CARRIED_NEARER = 0.3   # ...and carried with the molecule it left only if that brings it this much nearer
_LET_GO = 1.6        # a leaving group's atom stands this far from the atom it left, once gone
_LET_GO_REACH = 3.0  # ...and no further than this from the atom it takes a proton from next
_LET_GO_CLEAR = 1.5  # ...and, where it can, keeps other atoms this far off
_HELD_APART_ROOM = 0.8   # least room for a cycloaddition partner held off its partner
_CURLED = 1.3        # a bond about to form, depicted shorter than this, is drawn curled into its ring
_TAKEN = 0.4         # an atom this near a spot stands on it
_CROWDED = 0.8       # atoms of two clusters nearer than this read as one jumble (labels overlap)
# Furthest a bystander steps clear. One left where it acted, lying right across a molecule placed
# there since (a spent Et3NH+ over the enone that enters next), clears it only past its own width.
_STEP_CLEAR_REACH = 6.0
_HYDROGEN_ROOM = 0.85   # nearest approach of any other atom to a travelling hydrogen
_HYDROGEN_ROOM_SCORED = 1.2   # more room than this round a travelling hydrogen counts no more
_FED_ANGLE = math.radians(80)   # least angle between a C-H and the bond its pair goes into
# ...or, where every spot that wide sends the arrow across another bond of the carbon or onto it
# (three other bonds round the carbon), the least angle of the hydrogen in the gap next to it.
_NEAR_FED_ANGLE = math.radians(50)
# A spot that wide stands squeezed against another bond nearer than this: in a regular 120-degree
# gap the one spot 80 degrees from the fed bond stands 40 from the other bond.
_SQUEEZED = math.radians(41)
_FAR_FROM_PARTNER = 0.5   # bond lengths off a comfortable hop: a partner placed out of reach of that gap
_WAITING_CLEARANCE = 1.5   # a molecule waiting its turn keeps further clear of the arrows at work
_COMPASS = np.exp(1j * np.arange(36) * np.pi / 18)     # directions tried, every 10 degrees
_COMPASS_COLUMN = _COMPASS[:, None]                     # (the same, one per row: a view made once)
# Directions a travelling hydrogen may turn to, every 15 degrees.
_HYDROGEN_COMPASS = tuple(cmath.rect(1.0, step * math.pi / 12) for step in range(24))
_HYDROGEN_COMPASS_ARRAY = np.array(_HYDROGEN_COMPASS)
_ALONG_BOND = math.radians(35)   # least angle between a travelling hydrogen and its holder's bonds
_SEVENTY = math.radians(70)
_BEHIND_A_BOND = math.radians(45)   # a partner this near a bond's direction lies behind the bond
_CURLED_REACH = 1.75   # farthest a curled ring's atom stands from its middle, in circumradii of the regular ring
_ROOM_OUT_OF_CURL = 0.55   # least room that takes a hydrogen out of a curled ring (less, its label meets another)
_OPEN_ANGLE = math.radians(105)   # least angle a hydrogen leaning toward its partner keeps from a lone other bond
_HIDDEN_VERTEX = math.radians(160)   # two bonds of a bare vertex straighter than this hide it
_OFF_A_BOND = math.radians(35)   # least angle between a travelling hydrogen's bond and its holder's others
_SIXTY = math.radians(60)
# Least angle between a hydrogen turned round its holder to face the atom that takes it and the
# holder's bonds (its holder's neighbours are kept off by it, not by _HYDROGEN_ROOM: in a
# 90-degree gap it stands 0.7-0.8 bond lengths from them).
_FACING_OFF_A_BOND = math.radians(40)
_RING_ANGLE_SLACK = math.radians(30)   # a ring angle further than this from the regular polygon's reads as squeezed
_STANDING_BY_REACH = 2.1   # bond lengths: a molecule this near an atom in the panel before its new bond takes room
_CROWDED_MIRROR = 0.95   # least room round a leaving branch mirrored to stand anti to a shift
_BACKSIDE_ROOM = math.radians(55)   # a nucleophile's line of approach from the centre's other bonds
# Ways to place a cluster next to its partner, in order of preference: (penalty, turn of the
# approach line in 20-degree steps, spin of the cluster in 30-degree steps, extra distance). A
# proton partner keeps close: half a bond length further out costs as much as an 80-degree turn.
_BOND_OPTIONS = sorted((abs(t) + abs(s) * 0.7, t, s, 0.0) for t in (0, 1, -1, 2, -2, 3, -3) for s in (0, 1, -1, 2, -2, 6))
_HOP_OPTIONS = sorted((abs(t) + abs(s) * 0.7 + 8 * e, t, s, e) for t in (0, 1, -1, 2, -2, 3, -3)
                      for s in (0, 1, -1, 2, -2, 6) for e in (0.0, 0.5, 1.0))

# A molecule about to bond that finds every spot near its preferred side crowded looks all round
# its anchor (turns of 20 degrees, the same spins).
_ROUND_BOND_OPTIONS = sorted((abs(t) + abs(s) * 0.7, t, s, 0.0) for t in range(-9, 10) for s in (0, 1, -1, 2, -2, 6))
# The same without spins, for a cluster that bonds by an sp atom (a diazo compound's middle N).
_STRAIGHT_BOND_OPTIONS = [o for o in _BOND_OPTIONS if o[2] == 0]
_STRAIGHT_ROUND_BOND_OPTIONS = [o for o in _ROUND_BOND_OPTIONS if o[2] == 0]
# A separate piece set to face the one it bonds to in the next step: the distances from its
# partner tried, and the turns from the partner's free direction, every 10 degrees, nearest first.
_FACING_DISTANCES = (CYCLOADDITION_GAP, 2.2, 2.6, 3.0)
_FACING_TURNS = tuple(cmath.rect(1.0, math.radians(10 * k)) for k in sorted(range(-17, 19), key=abs))
# A chain end (one bond of its own) bonds on at 120 degrees to that bond (_joining_side): a spin
# about it opens the angle to 150 or 180 (a methylamine's N straight between its methyl and the
# C it joins) or closes it. Where a spot is clear with the angle kept or mirrored (a spin of 120
# degrees), it is taken before any other.
_CHAIN_END_OPTIONS = sorted((abs(t) + (2.8 if s else 0.0), t, s, 0.0) for t in (0, 1, -1, 2, -2, 3, -3)
                            for s in (0, 4, -4))
# A partner that hops twice while it stands still looks further round its anchor for a spot near both.
# (Turns in steps of 10 degrees here, distances in quarter bond lengths.)
_PARTNER_OPTIONS = sorted((abs(t) + abs(s) * 0.7 + e, t, s, e) for t in np.arange(-5.0, 5.5, 0.5)
                          for s in (0, 1, -1, 2, -2, 6) for e in (0.0, 0.25, 0.5, 0.75, 1.0))
_PARTNER_PREFERENCE = np.array([o[0] for o in _PARTNER_OPTIONS])
_PARTNER_EXTRA = np.array([o[3] for o in _PARTNER_OPTIONS])
# A partner whose arrow would cross a bond from every spot on its preferred side looks all round.
_ROUND_OPTIONS = sorted((abs(t) + abs(s) * 0.7 + 8 * e, t, s, e) for t in np.arange(-9.0, 9.5, 0.5)
                        for s in (0, 1, -1, 2, -2, 6) for e in (0.0, 0.5, 1.0))


# Atoms written as a group: none (compute_layout's default), and the characters of such a label ("Ph").
_NONE_ABBREVIATED: Mapping[int, frozenset[int]] = MappingProxyType({})
_GROUP_LABEL_CHARACTERS = 2


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
    labelled_hydrogens: frozenset[int]   # of those, D and T: shown in every panel, moved or not


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
        if a < b:   # the lower root stays (compared in line: no min and max calls)
            self.parent[b] = a
        elif b < a:
            self.parent[a] = b

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
    """Hydrogen atoms that some move names: these are drawn, with the labelled ones
    (labelled_hydrogens); every other hydrogen is implicit."""
    elements = max(states, key=lambda s: len(s.elements)).elements
    out = set()
    for move in moves:
        for i in move.source_atoms + move.sink_atoms:
            if i < len(elements) and elements[i] == 1:
                out.add(i)
    return frozenset(out)


def labelled_hydrogens(states: Sequence[ElectronState]) -> frozenset[int]:
    """Deuterium and tritium atoms: drawn in every panel, as the label is what the scheme is
    about (a hydrogen that stays implicit would hide it)."""
    last = max(states, key=lambda s: len(s.elements))
    atom = last.mol.GetAtomWithIdx
    return frozenset(i for i, z in enumerate(last.elements) if z == 1 and atom(i).GetIsotope())


def _bonds_fed_by_hydrogens(moves: Sequence[Sequence[ResolvedMove]], elements: Sequence[int]
                            ) -> dict[tuple[int, int], set[int]]:
    """(hydrogen, holder) -> the atoms X whose bond to the holder the pair of the holder-H bond
    goes into (C-H -> C=C of an enolisation or an E2)."""
    feeds: dict[tuple[int, int], set[int]] = {}
    for move in (m for ms in moves for m in ms):
        if move.source_kind != "bond" or len(move.sink_atoms) != 2:
            continue
        hydrogens = [a for a in move.source_atoms if elements[a] == 1]
        if len(hydrogens) != 1:
            continue
        h = hydrogens[0]
        holder, = (a for a in move.source_atoms if a != h)
        if holder in move.sink_atoms and h not in move.sink_atoms:
            other, = (a for a in move.sink_atoms if a != holder)
            feeds.setdefault((h, holder), set()).add(other)
    return feeds


def visible_atoms(state: ElectronState, drawn_hydrogens: frozenset[int]) -> tuple[int, ...]:
    released = state.released
    return tuple([i for i, z in enumerate(state.elements)
                  if i not in released and (z != 1 or i in drawn_hydrogens)])


def _cis(local: dict[int, complex], i: int, j: int, a: int, b: int) -> Optional[bool]:
    """Whether a (on i) and b (on j) are drawn on one side of the bond i=j; None if either lies
    on its line."""
    axis = local[j] - local[i]
    side_a = (axis.conjugate() * (local[a] - local[i])).imag
    side_b = (axis.conjugate() * (local[b] - local[j])).imag
    if abs(side_a) < 1e-6 or abs(side_b) < 1e-6:
        return None
    return side_a * side_b > 0


def _written_double_bonds(states: Sequence[ElectronState]) -> dict[tuple[int, int], tuple[int, int, bool]]:
    """(i, j) -> (a, b, cis) for each double bond i=j (i < j) with a written E or Z in some state
    (the first such state decides): a on i and b on j are cis or trans. A species's E or Z is
    the double bond's own configuration (trace.species_mol), carried from state to state; its
    stereo atoms are the substituents E and Z refer to."""
    found: dict[tuple[int, int], tuple[int, int, bool]] = {}
    for state in states:
        if not state.configured:
            continue
        mol = state.mol
        for k in range(mol.GetNumBonds()):
            bond = mol.GetBondWithIdx(k)
            stereo = bond.GetStereo()
            if stereo in _CIS or stereo in _TRANS:
                i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
                a, b = bond.GetStereoAtoms()
                if i > j:
                    i, j, a, b = j, i, b, a
                found.setdefault((i, j), (a, b, stereo in _CIS))
    return found


_CIS = (Chem.BondStereo.STEREOZ, Chem.BondStereo.STEREOCIS)
_TRANS = (Chem.BondStereo.STEREOE, Chem.BondStereo.STEREOTRANS)


def molecules_of(state: ElectronState) -> tuple[tuple[int, ...], ...]:
    """The atoms of each separate molecule of a state."""
    return Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False)


def _joining(before: ElectronState, before_molecules: Sequence[Sequence[int]],
             after_molecules: Sequence[Sequence[int]]) -> set[int]:
    """Atoms of the separate molecules that become one in the step from `before` to the state
    after it (a nucleophile and the carbonyl it adds to; not two partners of a proton transfer,
    which stay apart). Such a molecule may move as a whole between the two panels."""
    molecule = {}
    for number, frag in enumerate(before_molecules):
        for atom in frag:
            molecule[atom] = number
    heavy = {i for i, z in enumerate(before.elements) if z != 1}
    out: set[int] = set()
    for frag in after_molecules:
        parts = {molecule[a] for a in frag if a in heavy}
        if len(parts) > 1:
            out |= {a for a, number in molecule.items() if number in parts}
    return out


def _aligned(moving: dict[int, complex], fixed: dict[int, complex], anchors: list[int],
             fallback: Optional[Iterable[int]] = None) -> dict[int, complex]:
    """`moving` turned (or mirrored) and shifted onto `fixed` by least squares over `anchors` (over
    the `fallback` atoms, by default every shared one, when fewer than two anchors are left; a lone
    anchor then stays exactly in place, the turn fitted on the others: the one atom the step leaves
    alone does not move)."""
    shared = [a for a in anchors if a in moving and a in fixed]
    pivot = shared[0] if len(shared) == 1 else None
    if len(shared) < 2:
        shared = [a for a in (moving if fallback is None else fallback) if a in moving and a in fixed]
    if len(shared) < 2:
        return moving
    best = None
    for mirror in (False, True):
        points = {a: (p.conjugate() if mirror else p) for a, p in moving.items()}
        if pivot is None:
            m = sum(points[a] for a in shared) / len(shared)
            f = sum(fixed[a] for a in shared) / len(shared)
        else:
            m, f = points[pivot], fixed[pivot]
        turn = unit(sum((fixed[a] - f) * (points[a] - m).conjugate() for a in shared))
        placed = {a: f + turn * (p - m) for a, p in points.items()}
        misfit = sum(abs(placed[a] - fixed[a]) ** 2 for a in shared)
        if best is None or misfit < best[0] - 1e-9:
            best = (misfit, placed)
    return best[1]


def _kept_at_joint(moving: dict[int, complex], fixed: dict[int, complex], joint: int, spokes: list[int],
                   anchors: list[int]) -> dict[int, complex]:
    """`moving` shifted so that `joint` stays exactly where `fixed` has it, turned so that its bonds
    to `spokes` point as they did there (by least squares), of the two mirror images the one nearer
    `fixed` over `anchors` (every shared atom when none is)."""
    anchors = [a for a in anchors if a in moving and a in fixed] or [a for a in moving if a in fixed]
    best = None
    for mirror in (False, True):
        points = {a: (p.conjugate() if mirror else p) for a, p in moving.items()}
        m, f = points[joint], fixed[joint]
        turn = unit(sum((fixed[a] - f) * (points[a] - m).conjugate() for a in spokes))
        placed = {a: f + turn * (p - m) for a, p in points.items()}
        misfit = (round(sum(abs(placed[a] - fixed[a]) ** 2 for a in spokes), 6),
                  sum(abs(placed[a] - fixed[a]) ** 2 for a in anchors))
        if best is None or misfit < best[0]:
            best = (misfit, placed)
    return best[1]


def _bonds_between(a: int, b: int, neighbours, passable) -> int:
    """Bonds on the shortest way from a to b, stepping from x to n only where passable(x, n) (0 when
    there is none)."""
    seen, frontier, steps = {a}, [a], 0
    while frontier:
        steps += 1
        following = []
        for x in frontier:
            for n in neighbours[x]:
                if n in seen or not passable(x, n):
                    continue
                if n == b:
                    return steps
                seen.add(n)
                following.append(n)
        frontier = following
    return 0


def _adjacency(bonds: Iterable[tuple[int, int]]) -> dict[int, list[int]]:
    adjacent: dict[int, list[int]] = {}
    for i, j in bonds:
        adjacent.setdefault(i, []).append(j)
        adjacent.setdefault(j, []).append(i)
    return adjacent


def _on_the_way(start: int, goal: int, adjacent: dict[int, list[int]], direct: bool = True) -> list[int]:
    """The atoms of a shortest way from `start` to `goal`, both included (none if there is none);
    with `direct` False, one that does not take a bond between the two themselves (the rest of the
    smallest ring through that bond)."""
    came_from = {start: start}
    frontier = [start]
    while frontier and goal not in came_from:
        following = []
        for a in frontier:
            for n in adjacent.get(a, ()):
                if n not in came_from and (direct or (a, n) != (start, goal)):
                    came_from[n] = a
                    following.append(n)
        frontier = following
    if goal not in came_from:
        return []
    way = [goal]
    while way[-1] != start:
        way.append(came_from[way[-1]])
    return way


def _ring_core(bonds: set[tuple[int, int]]) -> dict[int, set[int]]:
    """The graph of `bonds` (atom -> neighbours) with chain ends stripped off over and over: what
    is left holds every ring."""
    core = {a: set(around) for a, around in _adjacency(bonds).items()}
    ends = [a for a, around in core.items() if len(around) < 2]
    while ends:
        a = ends.pop()
        for n in core.pop(a, ()):
            core[n].discard(a)
            if len(core[n]) == 1:
                ends.append(n)
    return core


def _smallest_rings(core: dict[int, set[int]]) -> list[list[int]]:
    """The smallest ring through each bond of a ring core (_ring_core) that lies on one, each
    once, atoms in ring order."""
    rings, seen = [], set()
    for i, around in core.items():
        for j in around:
            if j < i:
                continue
            ring = _on_the_way(i, j, core, direct=False)
            if not ring:
                continue   # a bond between two rings (biphenyl's) lies on none
            if frozenset(ring) not in seen:
                seen.add(frozenset(ring))
                rings.append(ring)
    return rings


def _distance(a: list[float], b: list[float]) -> float:
    """Between two points of RDKit's conformer (x, y, z)."""
    dx, dy, dz = a[0] - b[0], a[1] - b[1], a[2] - b[2]
    return math.sqrt(dx * dx + dy * dy + dz * dz)


def _near_any_way(points, ways: list[tuple[complex, complex]], reach: float = 0.5) -> bool:
    """Whether any of `points` lies within `reach` of one of the segments `ways`: a fragment left
    standing where the next step's arrow runs (the water of an Eschweiler-Clarke iminium, between
    it and the formate whose hydride comes in next)."""
    return any(distance_to_segment(p, a, b) < reach for a, b in ways for p in points)


def _any_inside_ring(points, rings: Iterable[list[int]], atoms: Iterable[int]) -> bool:
    """Whether one of `atoms` stands inside one of `rings` (atom indices in ring order) that it is
    not part of; `points` gives each atom's position (complex), by index."""
    atoms = list(atoms)
    for ring in rings:
        polygon = [points[a] for a in ring]
        if any(a not in ring and inside_polygon(points[a], polygon) for a in atoms):
            return True
    return False


def _held_off(local: dict[int, complex], atoms: frozenset[int], ends: list[tuple[int, int]], out: complex,
              gap: float, enough: float, avoid: Sequence[complex] = ()) -> complex:
    """How far to shift `atoms` of a depiction so that the bonds `ends` (moving atom, fixed atom)
    open to `gap` on average: along `out`, or turned up to 60 degrees either way, as little as
    gives `enough` room from the atoms that stay and the spots to `avoid` (else the roomiest)."""
    moving = np.array([local[a] for a in sorted(atoms)], dtype=complex)
    still = np.array([p for a, p in local.items() if a not in atoms] + list(avoid), dtype=complex)
    offset, best = 0j, -1.0
    for degrees in (0, 15, -15, 30, -30, 45, -45, 60, -60):
        away = out * cmath.rect(1.0, math.radians(degrees))
        for step_out in range(1, 101):
            shift = away * 0.02 * step_out
            mean = sum(abs(local[i] + shift - local[j]) for i, j in ends) / len(ends)
            if mean >= gap:
                break
        room = float(np.abs(moving[:, None] + shift - still[None, :]).min()) if len(still) else 9.0
        if room > best:
            offset, best = shift, room
        if room >= enough:
            break
    return offset


def _rigid_move(before: dict[int, complex], after: dict[int, complex], atoms: list[int]
                ) -> Optional[tuple[complex, int]]:
    """(turn, pivot atom) of the rigid motion taking `atoms` from `before` to `after` (after[x] -
    after[pivot] == turn * (before[x] - before[pivot])); None for fewer than two atoms or a motion
    that is not rigid."""
    if len(atoms) < 2:
        return None
    a = atoms[0]
    b = max(atoms, key=lambda x: abs(before[x] - before[a]))
    turn = 1 + 0j if abs(before[b] - before[a]) < 1e-9 else (after[b] - after[a]) / (before[b] - before[a])
    if abs(abs(turn) - 1.0) > 1e-6 or any(abs(after[x] - after[a] - turn * (before[x] - before[a])) > 1e-6
                                           for x in atoms):
        return None
    return turn, a


@lru_cache(maxsize=None)
def _rotor(count: int, divisions: int) -> complex:
    """The unit turn by count * pi / divisions (a placement tries a few dozen of the same turns)."""
    return cmath.rect(1.0, count * math.pi / divisions)


_COLUMNS: dict[int, tuple[list, tuple[np.ndarray, np.ndarray, np.ndarray]]] = {}
_SPINS = {spin: _rotor(spin, 6) for spin in {o[2] for options in (_BOND_OPTIONS, _HOP_OPTIONS, _PARTNER_OPTIONS,
                                                                   _ROUND_OPTIONS, _CHAIN_END_OPTIONS) for o in options}}
_FEW_OPTIONS = 64   # fewer options than this are worked out one by one


def _option_columns(options: list[tuple]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A list of placement options as columns: turns, the spins' unit turns, extra distances
    (the option lists are module constants: each is worked out once)."""
    if id(options) not in _COLUMNS:
        _COLUMNS[id(options)] = (options, (np.array([o[1] for o in options], dtype=float),
                                           np.array([_rotor(o[2], 6) for o in options], dtype=complex),
                                           np.array([o[3] for o in options], dtype=float)))
    return _COLUMNS[id(options)][1]


_DISTINCT: dict[tuple[int, int, int], tuple[np.ndarray, np.ndarray]] = {}


def _distinct_turns(options: list[tuple], first: int, last: int) -> tuple[np.ndarray, np.ndarray]:
    """The distinct turns of options first..last-1 and which of them each option takes (the same
    few ranges of the module's option lists are asked for again and again)."""
    key = (id(options), first, last)
    if key not in _DISTINCT:
        _DISTINCT[key] = np.unique(_option_columns(options)[0][first:last], return_inverse=True)
    return _DISTINCT[key]


_FACING_OPTIONS: dict[tuple[int, frozenset[int]], list[tuple]] = {}
_GAP_TIE = math.radians(10)   # gaps this near the widest count as widest too (a trigonal centre's three)


def _facing_spins(own: Sequence[complex], v: complex) -> frozenset[int]:
    """The spins of the placement options that keep the bond a mover makes, turned by the spin
    from `v` (its joining side), within 60 degrees of the middle of a widest gap between its own
    bonds (`own`, directions from it): spun further, the bond would leave the mover between its
    bonds, and the arrow toward the partner swing round them."""
    spins = {o[2] for o in _BOND_OPTIONS}
    gaps = angular_gaps(0j, own)
    if len(gaps) < 2:
        return frozenset(spins)   # a lone atom or a chain end (set at 120 degrees to its bond) turns freely
    widest = max(b - a for a, b in gaps)
    middles = [cmath.rect(1.0, (a + b) / 2) for a, b in gaps if b - a >= widest - _GAP_TIE]
    return frozenset(spin for spin in spins
                     if min(abs(cmath.phase(v / _SPINS[spin] / m)) for m in middles) <= _SIXTY + 1e-6)


def _facing_options(options: list[tuple], spins: frozenset[int]) -> list[tuple]:
    """`options` with only the given spins: one list per choice, kept, as the option lists' columns
    are worked out once per list."""
    key = (id(options), spins)
    if key not in _FACING_OPTIONS:
        kept = [o for o in options if o[2] in spins]
        _FACING_OPTIONS[key] = kept if len(kept) < len(options) else options
    return _FACING_OPTIONS[key]


class _Placements:
    """The ways of placing a cluster next to its anchor, in the order they are tried: for each,
    the direction from the anchor, the cluster's rotation, the target of the atom that bonds,
    the cluster's atoms moved there, their nearest approach to the atoms around and whether the
    arrow of a proton transfer from there would cross one of `walls` (bonds). Worked out
    in batches as the search reaches them: the first few settle most placements, and numpy's
    cost is per call."""

    batch = 8

    def __init__(self, options: list[tuple], u: complex, v: complex, anchor_at: complex, distance: float,
                 depicted: dict[int, complex], mover: int, near: np.ndarray, carries_hydrogen: bool,
                 walls: np.ndarray):
        """`depicted`: the cluster's depiction in the panel it is placed for; `mover` its atom
        that bonds or hops."""
        self.options, self.u, self.v, self.anchor_at, self.distance = options, u, v, anchor_at, distance
        self.depicted, self.mover, self.mover_at = depicted, mover, depicted[mover]
        self.local = np.array(list(depicted.values()), dtype=complex) - self.mover_at   # about the mover
        # For a bond, the cluster's atoms other than the mover, which must keep off the anchor (gaps).
        # (as their column numbers: a take costs less than indexing by a mask)
        self.beside = np.flatnonzero(self.local != 0) if distance == 1.0 and len(self.local) > 1 else None
        self.near, self.carries_hydrogen, self.walls = near, carries_hydrogen, walls
        self.done: list[tuple[float, bool, np.ndarray, complex, complex, complex]] = []
        self.turned: dict[int, tuple[complex, complex]] = {}   # turn -> (direction, rotation facing back along it)

    def like(self, options: list[tuple]) -> "_Placements":
        """The same cluster and surroundings, tried over other options."""
        return _Placements(options, self.u, self.v, self.anchor_at, self.distance, self.depicted, self.mover,
                           self.near, self.carries_hydrogen, self.walls)

    def at(self, index: int) -> tuple[float, bool, np.ndarray, complex, complex, complex]:
        """Option `index`: its gap, whether its arrow is blocked, its moved atoms, direction,
        rotation and target."""
        while index >= len(self.done):
            # Each batch at least as large as all before it: a search that goes past the first
            # few spots usually goes through most of them, so the second takes all the spots
            # up to _FEW_OPTIONS at once (a bond placement past its first batch takes all 42).
            first = len(self.done)
            size = _FEW_OPTIONS - first if first == self.batch < _FEW_OPTIONS else max(self.batch, first)
            directions, rotations, targets, moved = self.spots(first, first + size)
            self.done += zip(self.gaps(moved, targets, directions), self.blocked(targets, directions),
                             moved, directions, rotations, targets.tolist())
        return self.done[index]

    def __iter__(self) -> Iterator[tuple[float, bool, np.ndarray, complex, complex, complex]]:
        """Every option in order, as `at` gives them, a batch at a time."""
        index = 0
        while index < len(self.options):
            self.at(index)
            batch = self.done[index:]
            yield from batch
            index += len(batch)

    def blocked(self, targets: np.ndarray, directions: list[complex]) -> list[bool]:
        """Whether the proton-transfer arrow of each placement, from the base's atom to the
        hydrogen it takes, would cross one of the walls."""
        if not len(self.walls):
            return [False] * len(targets)
        if len(targets) == 1:
            # One spot (a hop's first, which usually settles it): crosses_any's arithmetic in
            # plain Python, a few walls costing less than numpy's calls.
            target, ahead = complex(targets[0]), directions[0]
            p, q = (self.anchor_at, target - ahead) if self.carries_hydrogen else (target, self.anchor_at + ahead)
            return [any(segments_cross(p, q, a, b) for a, b in self.walls.tolist())]
        ahead = np.array(directions, dtype=complex)
        if self.carries_hydrogen:
            return crosses_any(np.full(len(targets), self.anchor_at), targets - ahead, self.walls)
        return crosses_any(targets, self.anchor_at + ahead, self.walls)

    def spots(self, first: int, last: int) -> tuple[list[complex], list[complex], np.ndarray, np.ndarray]:
        """Directions, rotations, targets and moved atoms of options first..last-1, worked out
        per turn (a handful, shared by many options) and then, for many options, all at once."""
        if last - first <= _FEW_OPTIONS:    # numpy's cost per call outweighs a short loop
            directions, rotations, targets = [], [], []
            turned, anchor_at, distance = self.turned, self.anchor_at, self.distance
            options = self.options[first:last]
            self._turn([o[1] for o in options])
            for _, turn, spin, extra in options:
                direction, facing = turned[turn]
                directions.append(direction)
                rotations.append(facing * _SPINS[spin])
                targets.append(anchor_at + direction * (distance + extra))
            target_array, rotation_array = np.array(targets, dtype=complex), np.array(rotations, dtype=complex)
            moved = target_array[:, None] + self.local[None, :] * rotation_array[:, None]
            return directions, rotations, target_array, moved
        turns, spins, extras = _option_columns(self.options)
        distinct, which = _distinct_turns(self.options, first, last)
        self._turn(distinct.tolist())
        direction_array = np.array([self.turned[turn][0] for turn in distinct.tolist()], dtype=complex)[which]
        rotation_array = np.array([self.turned[turn][1] for turn in distinct.tolist()], dtype=complex)[which] \
            * spins[first:last]
        extras = extras[first:last]
        target_array = self.anchor_at + direction_array * (self.distance + extras)
        return (direction_array.tolist(), rotation_array.tolist(), target_array,
                target_array[:, None] + self.local[None, :] * rotation_array[:, None])

    def _turn(self, turns: list[int]) -> None:
        """Each of `turns` not met before: its direction from the anchor and the rotation that
        faces the cluster back along it (its _unit written out: a few hundred a figure)."""
        turned = self.turned
        for turn in turns:
            if turn not in turned:
                direction = self.u * _rotor(turn, 9)
                facing = -direction / self.v
                size = abs(facing)
                turned[turn] = (direction, facing / size if size > 1e-12 else 1 + 0j)

    def gaps(self, moved: np.ndarray, targets: np.ndarray, directions: list[complex]) -> list[float]:
        """Each placement's nearest approach to the atoms around (rows of `moved`); for a bond,
        the anchor included for the cluster's atoms other than the mover: one of them on the anchor (a
        methyl of a tert-alkyl radical turned onto the nitrogen it bonds to) is no placement.
        Beside the mover's bond, a neighbour a bond length from the anchor (a fourth bond
        squeezed between two at 120 degrees) is tight but clear; only one nearer than _CROWDED
        counts against the placement."""
        beside = None
        if self.beside is not None:   # a bond (a hop's partner waits further out)
            beside = np.minimum.reduce(np.abs(moved.take(self.beside, axis=1) - self.anchor_at), axis=1) + (_CLEARANCE - _CROWDED)
        if not len(self.near):
            return [9.0] * len(moved) if beside is None else np.minimum(beside, 9.0).tolist()
        # numpy's ufuncs called directly (minimum.reduce is .min): the wrappers cost more than these few numbers
        gaps = np.minimum.reduce(np.abs(moved[:, :, None] - self.near), axis=(1, 2))
        if beside is not None:
            gaps = np.minimum(gaps, beside)
        if self.carries_hydrogen:
            # The hydrogen it brings needs room too, though less than a whole molecule.
            brought = np.abs((targets - np.array(directions, dtype=complex))[:, None] - self.near)
            gaps = np.minimum(gaps, np.minimum.reduce(brought, axis=1) + _CLEARANCE - _HYDROGEN_ROOM)
        return gaps.tolist()


@dataclass
class _Residence:
    """A travelling hydrogen on one holder for a run of panels."""

    hydrogen: int
    holder: Optional[int]
    first: int
    last: int
    direction: Optional[complex] = None


@dataclass
class _Cluster:
    atoms: list[int]
    local: dict[int, complex]
    segments: list[tuple[int, int]] = field(default_factory=list)   # runs of panels it cannot move in
    segment_at: dict[int, tuple[int, int]] = field(default_factory=dict)   # panel -> the run that holds it
    # segment start -> (rotation, shift, direction it came in on, how far it waits back along it)
    placement: dict[int, tuple] = field(default_factory=dict)
    # Partners of a cycloaddition held apart before they bond: (atoms, first panel, last panel,
    # offset in local coordinates).
    openings: list[tuple[frozenset[int], int, int, complex]] = field(default_factory=list)
    waited: set[int] = field(default_factory=set)   # segment starts placed as a wait before acting
    redrawn: set[int] = field(default_factory=set)  # segment starts where an acid or base is redrawn
    # Later depictions of a cluster whose ring changes size (first panel, local coordinates aligned
    # on the atoms the step between leaves alone); before the first of them, `local` holds.
    phases: list[tuple[int, dict[int, complex]]] = field(default_factory=list)

    def local_at(self, k: int) -> dict[int, complex]:
        local = self.local
        for first, later in self.phases:
            if first <= k:
                local = later
        return local

    def held_off_at(self, k: int) -> dict[int, complex]:
        """The depiction as panel k draws it: local_at(k) with the partners held apart there
        moved off by their openings (as _apply sets them)."""
        local = self.local_at(k)
        held = [(atoms, offset) for atoms, first, last, offset in self.openings if first <= k <= last]
        if not held:
            return local
        local = dict(local)
        for atoms, offset in held:
            for atom in atoms & local.keys():
                local[atom] += offset
        return local


def compute_layout(states: Sequence[ElectronState], moves: Sequence[Sequence[ResolvedMove]],
                   touched: Sequence[Iterable[int]], left_out: Sequence[Iterable[int]] = (),
                   bonds: Optional[Sequence[list[tuple[int, int, float]]]] = None,
                   product: Iterable[int] = (), abbreviated: Mapping[int, frozenset[int]] = _NONE_ABBREVIATED,
                   molecules: Optional[Sequence[tuple[tuple[int, ...], ...]]] = None) -> Layout:
    """Positions for the atoms of every state. `moves[k]` are the moves drawn on panel k,
    `touched[k]` the atoms the step leaving panel k changes (empty for the last panel) and
    `left_out[k]` atoms panel k does not draw (a spectator between its turns): a species is
    free to move while it is not drawn. `bonds[k]` are state k's bonds as rdkit_io.bond_list
    reads them (read here when not given). `product` holds atoms of the last state's product
    proper, which the by-products line up after (by default the largest molecule).
    `abbreviated` maps each atom written as a group ("Ph" at a phenyl's ipso carbon) to the atoms
    its label stands for: those are in no panel and laid out as if absent, so their room is free.
    `molecules[k]` are state k's molecules as molecules_of reads them (read here when not given)."""
    if molecules is None:
        molecules = [molecules_of(state) for state in states]
    with _rdkit_depictor():
        builder = _LayoutBuilder(states, moves, touched, left_out, bonds, product, abbreviated=abbreviated,
                                 molecules=molecules)
        layout = builder.build()
        if builder.cramped:
            # Tried again with room kept at the centres where a partner found no clear place:
            # taken if fewer partners are cramped so.
            retry = _LayoutBuilder(states, moves, touched, left_out, bonds, product, frozenset(builder.cramped),
                                   abbreviated, molecules)
            retried = retry.build()
            if len(retry.cramped) < len(builder.cramped):
                return retried
        return layout


class _LayoutBuilder:
    def __init__(self, states: Sequence[ElectronState], moves: Sequence[Sequence[ResolvedMove]],
                 touched: Sequence[Iterable[int]], left_out: Sequence[Iterable[int]] = (),
                 bonds: Optional[Sequence[list[tuple[int, int, float]]]] = None, product: Iterable[int] = (),
                 roomier: frozenset[int] = frozenset(),
                 abbreviated: Mapping[int, frozenset[int]] = _NONE_ABBREVIATED,
                 molecules: Optional[Sequence[tuple[tuple[int, ...], ...]]] = None):
        """`roomier`: atoms whose depiction keeps room for a partner in another cluster, where a
        first try found no clear place round them (_cramped_centre); `abbreviated` and `molecules`:
        as compute_layout's."""
        self.states = list(states)
        self.roomier = roomier
        self.cramped: set[int] = set()   # the atoms _cramped_centre found so, placing
        self.product = frozenset(product)
        self.n = len(self.states)
        self.touched = [set(t) for t in touched] + [set()] * (self.n - len(touched))
        elements = max(self.states, key=lambda s: len(s.elements)).elements
        self.labelled_h = labelled_hydrogens(self.states)
        self.drawn_h = moving_hydrogens(self.states, (m for ms in moves for m in ms)) | self.labelled_h
        self.feeds = _bonds_fed_by_hydrogens(moves, elements)
        # Electron transfers (`.Na1 ~> :C1`): the donor waits beside the atom it gives to, as a
        # molecule about to bond does, though no bond ever joins the two.
        self.transfers = [(k, m.source_atoms[0], m.sink_atoms[0]) for k, panel_moves in enumerate(moves)
                          for m in panel_moves if m.source_kind != "bond" and len(m.sink_atoms) == 1]
        # So does an atom whose lone pair bonds it to another as the two leave together (Br- taking
        # Ag+, silver bromide let go in that step): the bond is never drawn to place them by.
        self.transfers += [(k, m.source_atoms[0], next(a for a in m.sink_atoms if a != m.source_atoms[0]))
                           for k, panel_moves in enumerate(moves[:self.n - 1]) for m in panel_moves
                           if m.source_kind == "lone_pair" and len(m.sink_atoms) == 2
                           and m.source_atoms[0] in m.sink_atoms and set(m.sink_atoms) <= self.states[k + 1].released]
        self.abbreviated = abbreviated
        left_out_everywhere = frozenset().union(*abbreviated.values())
        self.atoms = [i for i, z in enumerate(elements)
                      if (z != 1 or i in self.drawn_h) and i not in left_out_everywhere]
        self.element = {i: elements[i] for i in self.atoms}
        drawn = set(self.atoms)
        absent = [set(a) for a in left_out] + [set()] * (self.n - len(left_out))
        self.exists = [(set(range(len(s.elements))) & drawn) - s.released - gone
                       for s, gone in zip(self.states, absent)]
        self.bonds_in = []      # per panel: set of (i, j) between drawn atoms
        self.orders_in: list[dict[tuple[int, int], float]] = []   # per panel: their bond orders
        self.union: dict[tuple[int, int], int] = {}
        self.holders: list[dict[int, int]] = []   # per panel: hydrogen -> its first neighbour, as RDKit lists them
        for listed in bonds or [bond_list(s.mol) for s in self.states]:
            orders, holders = {}, {}
            for i, j, order in listed:
                if elements[i] == 1:
                    holders.setdefault(i, j)
                if elements[j] == 1:
                    holders.setdefault(j, i)
                if i > j:
                    i, j = j, i
                if i in drawn and j in drawn:
                    orders[(i, j)] = order
                    self.union[(i, j)] = max(self.union.get((i, j), 0), int(order))
            self.orders_in.append(orders)
            self.holders.append(holders)
            self.bonds_in.append(set(orders))
        # Per step: the bonds it breaks and makes (asked for every cluster and every placement).
        self.broken = [self.bonds_in[k] - self.bonds_in[k + 1] for k in range(self.n - 1)]
        self.made = [self.bonds_in[k + 1] - self.bonds_in[k] for k in range(self.n - 1)]
        self.leaving = self._heterolyses(moves)
        # The double bonds a species wrote E or Z for, which the depiction must draw so.
        self.written_double = _written_double_bonds(self.states)
        self.sorted_union = sorted(self.union.items())   # in the order _depict adds bonds to its Mol
        self.neighbours: dict[int, set[int]] = {i: set() for i in self.atoms}
        for i, j in self.union:
            self.neighbours[i].add(j)
            self.neighbours[j].add(i)
        self.hops = self._hydrogen_hops()
        self._changed: dict[int, frozenset[tuple[int, int]]] = {}   # _changed_bonds' answers, by step
        self.sp_atoms: dict[tuple[int, int, int], bool] = {}    # _linear's answers, asked again and again
        # The atoms _bends looks at: two or more heavy partners over the mechanism, with a
        # triple bond or two double bonds among them (a carbonyl carbon, with one, is not). No
        # other atom is straight in any panel: _linear answers for the rest without a look.
        self.may_bend: set[int] = set()
        for atom in self.atoms:
            orders = [self.union[(min(atom, n), max(atom, n))] for n in self.neighbours[atom] if self.element[n] != 1]
            if len(orders) >= 2 and (3 in orders or orders.count(2) >= 2):
                self.may_bend.add(atom)
        # Chain C=C bonds with no written geometry, each with the heavy substituent on either end:
        # drawn trans (the zigzag of common practice) where no ring holds them.
        self.chain_double = self._chain_double_bonds()
        self.positions: list[dict[int, complex]] = [dict() for _ in range(self.n)]
        self.backside = self._backside_substitutions(moves)
        self.molecules = list(molecules) if molecules is not None else [molecules_of(state) for state in self.states]
        self.joining = [_joining(self.states[k], self.molecules[k], self.molecules[k + 1])
                        for k in range(self.n - 1)] + [set()]

    # structure of the problem
    def _heterolyses(self, moves: Sequence[Sequence[ResolvedMove]]) -> dict[int, list[tuple[int, int]]]:
        """atom -> (neighbour, step) for each bond that a step breaks with both electrons going
        onto the atom: a leaving group's bond to the centre it leaves."""
        out: dict[int, list[tuple[int, int]]] = {}
        for k, panel_moves in enumerate(moves[:self.n - 1]):
            for move in panel_moves:
                if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 1:
                    continue
                atom = move.sink_atoms[0]
                bond = tuple(sorted(move.source_atoms))
                if atom in bond and bond in self.bonds_in[k] and bond not in self.bonds_in[k + 1]:
                    out.setdefault(atom, []).append((bond[0] + bond[1] - atom, k))
        return out

    def build(self) -> Layout:
        self._find_clusters()
        self.residences = self._residences()
        self.events = self._events()    # fixed from here on: placing moves clusters, not bonds or hydrogens
        self.events_in_order: dict[tuple[str, ...], list[tuple]] = {}   # _place_by_events's, by the kinds it takes
        for k, cluster in enumerate(self.clusters):
            cluster.segments = self._segments(k)
            cluster.segment_at = {panel: seg for seg in cluster.segments for panel in range(seg[0], seg[1] + 1)}
        main = self.clusters[self.main]
        for start, _ in main.segments:
            main.placement[start] = (1 + 0j, 0j, None, 0.0)
        self._apply(self.main)
        self._open_rings({self.main})
        # The skeleton first, with the molecules that wait to join it; then the partners that
        # hydrogens travel to take the room that is left.
        while self._place_by_events(("bond",)) or self._place_waiting():
            pass
        while self._place_by_events(("bond", "hop", "transfer")) or self._place_waiting() or self._place_leftovers():
            pass
        # Rings of the other molecules open once everything stands where it will (a tin hydride
        # may outweigh the chain that closes a ring).
        self._open_rings(set(range(len(self.clusters))) - {self.main})
        self._leaving_groups_anti_to_shifts()
        self._place_hydrogens()
        self._let_go()
        self._ease_trigonal_centres()
        self._turn_branches_off_bonds()
        self._clear_bystanders()
        self._set_by_products_beside_product()
        panels = []
        for k, state in enumerate(self.states):
            visible = tuple([i for i in visible_atoms(state, self.drawn_h) if i in self.positions[k]])
            panels.append(PanelAtoms(state, visible, {i: self.positions[k][i] for i in visible}))
        return Layout(tuple(panels), self.drawn_h, self.labelled_h)

    def _open_rings(self, clusters: set[int]) -> None:
        """A ring is drawn open until the step that closes it: only the chain end that closes
        the ring moves, swinging about its one other neighbour in the panels before the closing
        step (it is touched by that step, so it may move then). Onto an atom that, over the
        mechanism, meets more partners than it ever holds at once (an acetal carbon that loses
        water and gains the second oxygen) it swings wide, so the crowded atom has room; otherwise
        the forming bond opens to about OPEN_BOND bond lengths, so the arrow into it has room, as
        chemists draw a ring closure. A ring with no chain end stays curled."""
        for k in range(self.n - 1):
            for i, j in sorted(self.made[k]):
                if self.cluster_of.get(i) not in clusters or self.cluster_of[i] != self.cluster_of.get(j):
                    continue
                here = self.positions[k]
                if i in here and j in here and abs(abs(here[i] - here[j]) - 1.0) > 0.02:
                    continue   # not drawn curled: a ring that grows (its own depiction) is not opened
                for end, partner in ((i, j), (j, i)):
                    if self._crowded(partner) and self._swing(end, partner, k):
                        break
                else:
                    for end, partner in ((i, j), (j, i)):
                        if self._swing(end, partner, k, OPEN_BOND):
                            break
                    else:
                        flips = [f for f in (self._flip(i, j, k), self._flip(j, i, k)) if f is not None]
                        if flips:
                            _, placed = max(flips, key=lambda f: f[0])
                            for p, flipped in placed.items():
                                self.positions[p].update(flipped)

    def _crowded(self, atom: int) -> bool:
        """More heavy partners over the whole mechanism than bonded at any one time."""
        heavy = {n for n in self.neighbours[atom] if self.element[n] != 1}
        at_once = max((sum(1 for n in heavy if (min(atom, n), max(atom, n)) in self.bonds_in[k])
                       for k in range(self.n)), default=0)
        return len(heavy) > at_once

    def _swing(self, end: int, partner: int, k: int, target: Optional[float] = None) -> bool:
        """Swing `end` about its one other heavy neighbour in panels first..k, if nothing else
        hangs on it that is drawn there: as far into free space as it goes, or (with `target`)
        to that distance from `partner`, keeping clear of every other atom. Returns whether it
        moved."""
        if end not in self.touched[k] or self.element[end] == 1:
            return False
        # Closing onto a heavy atom, its neighbours at the closing step count (a bromine it lost
        # before hangs on it no more); taking a hydrogen, every neighbour it ever had (an ethoxide
        # just expelled is a base of its own, placed as such, not a chain end to swing).
        others = [n for n in self.neighbours[end] if n != partner
                  and (self.element[partner] == 1 or (min(end, n), max(end, n)) in self.bonds_in[k])]
        heavy = [n for n in others if self.element[n] != 1]
        if len(heavy) != 1 or any(n not in self.bridging for n in others if self.element[n] == 1):
            return False
        pivot = heavy[0]
        first = k
        while first > 0 and end in self.exists[first - 1] and end not in self.touched[first - 1]:
            first -= 1
        panels = [p for p in range(first, k + 1) if end in self.positions[p] and pivot in self.positions[p]]
        if not panels or any(p > first and (min(end, pivot), max(end, pivot)) not in self.bonds_in[p] for p in panels):
            return False
        if self._linear(pivot, range(panels[0], k + 1)):
            return False   # swung about a straight (sp) atom it would bend it (an isocyanide's N)
        # A hydrogen on it moves with it; that may not be seen on both panels around the step
        # (a travelling hydrogen is shown only next to the steps that move it).
        for runs in self.residences.values():
            for r in runs:
                if r.holder == end and r.first == k and r.last == k + 1:
                    return False
        # A molecule that arrives as a whole may wait apart in the early panels (_hold_apart_staged):
        # then the swing is worked out where it closes (panel k) and made in each panel about
        # the pivot as it stands there, so the molecule keeps its shape (a rigid body).
        arm = self.positions[panels[-1]][end] - self.positions[panels[-1]][pivot]
        held_apart = len({self.positions[p][pivot] for p in panels}) > 1 and all(
            abs(self.positions[p][end] - self.positions[p][pivot] - arm) < 1e-9 for p in panels)
        frame = panels[-1] if held_apart else panels[0]
        start = self.positions[frame][end]
        centre = self.positions[frame][pivot]
        crowd = np.array(sorted({p + (centre - self.positions[q][pivot]) for q in panels
                                 for a, p in self.positions[q].items() if a not in (end, pivot)},
                                key=lambda z: (z.real, z.imag)), dtype=complex)
        best, best_score = None, -math.inf
        if target is not None:
            if abs(start - self.positions[frame][partner]) >= target - 0.05:
                return False
            crowd = crowd[np.abs(crowd - self.positions[frame][partner]) > 1e-6]
            for degrees in range(-80, 81, 5):
                spot = centre + (start - centre) * cmath.rect(1.0, math.radians(degrees))
                reach = abs(spot - self.positions[frame][partner])
                score = -abs(reach - target) - 0.001 * abs(degrees)
                if reach < 1.2 or score <= best_score:
                    continue   # the room around a spot that would not win is not measured
                room = float(np.minimum.reduce(np.abs(crowd - spot), axis=None)) if len(crowd) else 9.0
                if room >= 0.95:
                    best, best_score = spot, score
            if best is None:
                return False
        else:
            # A neighbour the crowded partner holds meanwhile that is not placed yet (the acetal
            # carbon's hydroxyl, which leaves as water, in a cluster of its own) will stand in the
            # partner's widest gap: the end keeps clear of that spot too.
            here = self.positions[frame]
            if any(n != end and n not in here and self.element[n] != 1
                   and any((min(partner, n), max(partner, n)) in self.bonds_in[p] for p in panels)
                   for n in self.neighbours[partner]):
                partner_at = here[partner]
                spot = partner_at + free_direction(partner_at, [here[n] for n in self.neighbours[partner]
                                                                if n != end and n in here])
                crowd = np.append(crowd, spot)
            turns = (20, -20, 40, -40, 60, -60, 80, -80)
            spots = [centre + (start - centre) * cmath.rect(1.0, math.radians(degrees)) for degrees in turns]
            # The room around every spot in one numpy call.
            rooms = (np.minimum.reduce(np.abs(crowd[None, :] - np.array(spots)[:, None]), axis=1).tolist()
                     if len(crowd) else [9.0] * len(spots))
            for degrees, spot, room in zip(turns, spots, rooms):
                score = min(room, 1.4) - 0.002 * abs(degrees)
                if score > best_score:
                    best, best_score = spot, score
            if best is None or best_score < 1.0:
                return False
        for p in panels:
            self.positions[p][end] = best + (self.positions[p][pivot] - centre) if held_apart else best
        return True

    def _flip(self, end: int, partner: int, k: int) -> Optional[tuple[float, dict[int, dict[int, complex]]]]:
        """A ring closing at an atom inside the chain (a ketone carbon between the ring and its
        methyl): the atom may be drawn on the other side of the line through its two fixed
        neighbours, taking its touched end groups (the C=O oxygen) with it, in the panels
        before the closing step. Every bond keeps its length and the chain reads as an open
        zigzag, with the closing atoms about APPROACH apart; nothing the step leaves alone
        moves. In earlier panels where its molecule waits apart, shifted as a whole (the
        aminoketone of a Knorr pyrrole before it bonds), the atom is flipped there too, so the
        molecule keeps its shape as it comes in. Returns (room around the moved atoms, new
        positions by panel), or None."""
        if end not in self.touched[k] or self.element[end] == 1:
            return None
        here = self.positions[k]
        # Neighbours of other clusters are not placed yet: they will be placed around it.
        heavy = [n for n in self.neighbours[end] if n != partner and self.element[n] != 1 and n in here]
        if any(n not in self.bridging for n in self.neighbours[end] if self.element[n] == 1):
            return None
        carried = [n for n in heavy if n in self.touched[k]
                   and not [m for m in self.neighbours[n] if m != end and self.element[m] != 1]]
        pivots = [n for n in heavy if n not in carried]
        if len(pivots) != 2 or partner not in here or end not in here:
            return None
        if any(end in ring for ring in self._closed_rings(k)):
            return None   # flipped across its ring neighbours it would fold the ring (an arene's carbon)
        moving = [end] + carried
        first = k
        # Back through the panels where its pivots stand where they do at k, or where the pivots and
        # the moving atoms all stand shifted by one step (_shifted_whole): the flip is worked out
        # there, and a pivot drawn elsewhere earlier (the acid's O10 of a Passerini reaction, placed
        # apart before it bonds) would have its bond to the flipped atom stretched (to 2.15).
        shifts = {k: 0j}
        while first > 0 and all(a in self.exists[first - 1] and a not in self.touched[first - 1] for a in moving) \
                and (shift := self._shifted_whole(pivots, moving, first - 1, k)) is not None:
            first -= 1
            shifts[first] = shift
        panels = range(first, k + 1)
        if any((min(end, n), max(end, n)) not in self.bonds_in[p] for p in panels for n in pivots + carried):
            return None
        a, b = here[pivots[0]], here[pivots[1]]
        along = unit(b - a)
        flipped = {m: a + along * ((here[m] - a) / along).conjugate() for m in moving}
        reach = abs(flipped[end] - here[partner])
        if not 1.5 <= reach <= APPROACH + 0.4:
            return None   # (before the room is measured: most flips fail here)
        crowd = [q - shifts[p] for p in panels for x, q in self.positions[p].items() if x not in moving]
        room = min((abs(f - q) for f in flipped.values() for q in crowd), default=9.0)
        if room < 0.95:
            return None
        return room, {p: {m: z + shifts[p] for m, z in flipped.items()} for p in panels}

    def _shifted_whole(self, pivots: list[int], moving: list[int], p: int, k: int) -> Optional[complex]:
        """The shift that carries `pivots` and `moving` from where panel k draws them to where
        panel p does, if one shift carries them all; 0 where the pivots stand still (the moving
        atoms may be drawn anew there); None otherwise."""
        there, here = self.positions[p], self.positions[k]
        atoms = pivots + moving
        if any(a not in there for a in atoms):
            return None
        if all(there[a] == here[a] for a in pivots):
            return 0j
        shift = there[atoms[0]] - here[atoms[0]]
        return shift if all(abs(there[a] - here[a] - shift) < 1e-9 for a in atoms) else None

    def _permanent(self, i: int, j: int) -> bool:
        """Present in every state that has both atoms (a fragment that leaves is still there)."""
        last = max(i, j)   # (a loop, the larger index taken once: asked of every bond)
        for k in range(self.n):
            if last < len(self.states[k].elements) and (i, j) not in self.bonds_in[k]:
                return False
        return True

    def _ring_between(self, bonds: list[tuple[int, int]]) -> bool:
        """Two of the bonds between two clusters exist together in some panel: the clusters make
        a ring between them. (A bromide that leaves one atom and later bonds to another does not.)"""
        return len(bonds) > 1 and any(sum(b in here for b in bonds) > 1 for here in self.bonds_in)

    def _pinned_together(self, bond: tuple[int, int], groups: _UnionFind, members: dict[int, set[int]]) -> bool:
        """Whether both sides of a bond that forms or breaks keep an untouched atom through
        every step that changes it, and the bond never joins two separate molecules: then
        neither side may move, they sit at bond length in every panel anyway, and one
        depiction of both reads best. `members`: the heavy atoms of each group, by its root."""
        i, j = bond
        sides = [members[groups.find(x)] for x in bond]
        for k in range(self.n - 1):
            if ((i, j) in self.bonds_in[k]) == ((i, j) in self.bonds_in[k + 1]):
                continue
            if {i, j} <= self.joining[k]:
                return False     # two molecules that meet here: one may move as a whole
            for side in sides:
                if not (side & self.exists[k] & self.exists[k + 1]) - self.touched[k]:
                    return False
        return True

    def _find_clusters(self) -> None:
        """Clusters are held together by bonds that never change. A bond that forms or breaks
        between two clusters is drawn by placing one next to the other, unless two such bonds
        join them (a ring made between species, as in a cycloaddition) or neither side could
        move anyway: then they are depicted together, as one molecule already curled into the
        bonds it will make. A travelling hydrogen belongs to a cluster only if every atom it is
        ever bonded to does."""
        heavy_atoms = [i for i in self.atoms if self.element[i] != 1]
        groups = _UnionFind(heavy_atoms)
        heavy_bonds = [(i, j) for i, j in self.union if self.element[i] != 1 and self.element[j] != 1]
        for i, j in heavy_bonds:
            if self._permanent(i, j):
                groups.join(i, j)
        partners: list[tuple[tuple[frozenset[int], frozenset[int]], list[tuple[int, int]]]] = []
        while True:
            links: dict[tuple[int, int], list[tuple[int, int]]] = {}
            for i, j in heavy_bonds:
                a, b = groups.find(i), groups.find(j)
                if a != b:
                    links.setdefault((min(a, b), max(a, b)), []).append((i, j))
            members: dict[int, set[int]] = {}
            for x in heavy_atoms:
                members.setdefault(groups.find(x), set()).add(x)
            joined = [pair for pair, bonds in sorted(links.items())
                      if self._ring_between(bonds) or self._pinned_together(bonds[0], groups, members)]
            if not joined:
                break
            for a, b in joined:
                if self._ring_between(links[(a, b)]):
                    sides = tuple(frozenset(members[g]) for g in (a, b))
                    partners.append((sides, links[(a, b)]))
            for a, b in joined:
                groups.join(a, b)
        while self._join_ring_across_clusters(groups, heavy_bonds, heavy_atoms, partners):
            pass
        # A hydrogen with no heavy neighbour in any panel (a hydride ion used as a base) is a
        # molecule of its own, and a hydrogen passed to it travels like any other.
        free = {h for h in self.drawn_h if all(self.element[n] == 1 for n in self.neighbours[h])}
        self.bridging = {h for h in self.drawn_h - free
                         if len({groups.find(n) if self.element[n] != 1 else n for n in self.neighbours[h]
                                 if self.element[n] != 1 or n in free}) != 1}
        everything = _UnionFind(i for i in self.atoms if i not in self.bridging)
        for i in heavy_atoms:
            everything.join(i, groups.find(i))
        for h in self.drawn_h - self.bridging:
            for n in self.neighbours[h]:
                if n not in self.bridging:
                    everything.join(h, n)
        self.rings: list[list[int]] = []
        self._depictions: dict[tuple, dict[int, complex]] = {}   # _depict's, by what the Mol is made of
        self.rings_bonded: dict[int, list[list[int]]] = {}   # panel -> the rings whose bonds all exist there
        clusters = everything.groups()
        self.room_kept = self._room_to_keep(clusters)
        self.fed_slots = self._slots_for_fed_hydrogens(clusters)
        self.clusters = [_Cluster(g, self._depict(g)) for g in clusters]
        everywhere = range(self.n)
        for cluster in self.clusters:
            own_bonds = self._in_group(cluster.atoms, everywhere)   # (worked out once for the tests below)
            if (not self._even(cluster.local, cluster.atoms, everywhere, own_bonds) or self._bends(cluster.atoms)
                    or self._squeezes_a_ring(cluster.local, cluster.atoms, everywhere, own_bonds)
                    or self._bent_where_straight(cluster.local, cluster.atoms)
                    or not self._shows_written_geometry(cluster.local, cluster.atoms, everywhere)
                    or self._draws_chain_alkene_cis(cluster.local, cluster.atoms, everywhere)
                    or any(self._opens_small_ring(cluster.atoms, k) for k in range(self.n - 1))
                    or self._bonds_cross(cluster.local, own_bonds)):
                cluster.local, cluster.phases = self._phases(cluster.atoms)
        self.cluster_of = {a: k for k, c in enumerate(self.clusters) for a in c.atoms}
        # Partners that meet in one step first (the depiction may be turned for them), then those
        # whose ring forms over several steps.
        staged = [(sides, bonds) for sides, bonds in partners if not self._hold_apart(sides, bonds)]
        for sides, bonds in staged:
            self._hold_apart_staged(sides, bonds)
        for cluster in self.clusters:
            self._hold_off_arrivals(cluster)
        # The largest cluster; of two alike (two tributyltin species), the one the first step
        # touches, so that the other, waiting for a later step, is placed round the action.
        self.main = min(range(len(self.clusters)), key=lambda k: (-len(self.clusters[k].atoms), self._first_touch(k),
                                                                  self.clusters[k].atoms[0]))

    def _first_touch(self, index: int) -> int:
        """The first step that touches an atom of the cluster (the number of steps if none does)."""
        atoms = set(self.clusters[index].atoms)
        return next((k for k, touched in enumerate(self.touched) if touched & atoms), len(self.touched))

    def _room_to_keep(self, clusters: list[list[int]]) -> dict[int, int]:
        """atom -> how many bonds to other clusters its depiction keeps room for: where a bond
        joins two clusters at atoms that each hold three heavy neighbours of their own (the
        ketyl carbons of a pinacol coupling). Drawn trigonal, the two would meet eclipsed, each
        pair of branches on top of the other; drawn with room for the bond, each centre is a
        cross (four bonds at right angles, as chemists draw a quaternary carbon)."""
        cluster_of = {a: k for k, group in enumerate(clusters) for a in group}
        def own_heavy(atom: int) -> int:
            return sum(1 for n in self.neighbours[atom]
                       if self.element[n] != 1 and cluster_of.get(n) == cluster_of[atom])
        room: dict[int, int] = {}
        for i, j in self.union:
            if self.element[i] == 1 or self.element[j] == 1 or cluster_of[i] == cluster_of[j]:
                continue
            if own_heavy(i) >= 3 and own_heavy(j) >= 3:
                room[i] = room.get(i, 0) + 1
                room[j] = room.get(j, 0) + 1
                continue
            # An atom that already holds four heavy neighbours (TiCl4 taking a carbonyl oxygen)
            # keeps room for a fifth: squeezed between two of a cross, the partner stood 45
            # degrees from each, its label on theirs.
            for a in (i, j):
                if any((i, j) in bonds and self._heavy_degree(a, bonds) >= 5 for bonds in self.bonds_in) \
                        or self._lewis_acid_taking_fourth(a, (i, j)) or self._onium_made(a, (i, j)):
                    room[a] = room.get(a, 0) + 1
            # An atom that a first try found no clear place round (_cramped_centre) keeps room
            # for one of its partners in other clusters.
            for a in (i, j):
                if a in self.roomier and a not in room:
                    room[a] = 1
            # A ring atom with three heavy neighbours of its own, one of them a heteroatom that
            # bonds to it to close the ring, keeps room for its fourth too, so that the ring's
            # depiction splays its two bonds out of the ring: drawn trigonal, the group it bonds
            # to (the Paal-Knorr carbonyl oxygen) squeezes into the ring's gap, its label against
            # the closing atom's.
            for a in (i, j):
                if own_heavy(a) >= 3 and any(
                        self.element[n] not in (1, 6) and cluster_of.get(n) == cluster_of[a]
                        and not all((min(a, n), max(a, n)) in bonds for bonds in self.bonds_in)
                        and self._ring_through(a, n) >= 5 for n in self.neighbours[a]):
                    room[a] = room.get(a, 0) + 1
        return room

    def _lewis_acid_taking_fourth(self, atom: int, bond: tuple[int, int]) -> bool:
        """Whether `atom`, beyond the second period and holding three heavy neighbours and no
        lone pair, gains `bond` as a fourth as one of its pi bonds goes onto a neighbour (SO3's
        sulfur bonding to an arene). Drawn trigonal, the new bond went in 60 degrees from two of
        the three: the arenium's hydrogen had no room beside the sulfonyl oxygens. A Lewis acid
        that only takes a lone pair (Al(OiPr)3 holding a ketone for its six-membered hydride
        transfer) keeps two ligands close; an atom with a lone pair is _onium_made's to judge."""
        return self.element[atom] > 10 and any(
            self.states[k].nonbonding[atom] == 0
            and any(self.orders_in[k + 1].get(pair, 0) < order for pair, order in self.orders_in[k].items() if atom in pair)
            for k in self._made_as_fourth(atom, bond))

    def _onium_made(self, atom: int, bond: tuple[int, int]) -> bool:
        """Whether `atom`, holding three heavy neighbours that each stand in a ring and a lone
        pair, gives that pair to make `bond` a fourth (triphenylphosphine taking methyl: the
        phosphonium salt). Drawn trigonal, the new bond went in 60 degrees from two phenyls, and
        the methyl's hydrogen that a base takes next stood on a phenyl ring. (Chains, the ethoxy
        groups of a phosphite, bend out of the way; a "Ph" label, standing for its ring, does not.)"""
        return any(self.states[k].nonbonding[atom] == 2
                   and all(self._in_ring(i + j - atom) or i + j - atom in self.abbreviated
                           for i, j in self.bonds_in[k] if atom in (i, j) and self.element[i + j - atom] != 1)
                   for k in self._made_as_fourth(atom, bond))

    def _made_as_fourth(self, atom: int, bond: tuple[int, int]) -> Iterator[int]:
        """The steps (by the panel before them) that make `bond` at `atom` as its fourth heavy
        neighbour, it holding three before."""
        for k, (before, after) in enumerate(zip(self.bonds_in, self.bonds_in[1:])):
            if (bond in after and bond not in before and atom < len(self.states[k].nonbonding)
                    and self._heavy_degree(atom, before) == 3 and self._heavy_degree(atom, after) == 4):
                yield k

    def _heavy_degree(self, atom: int, bonds: set[tuple[int, int]]) -> int:
        """How many of `bonds` join `atom` to a heavy atom."""
        return sum(1 for i, j in bonds if atom in (i, j) and self.element[i + j - atom] != 1)

    def _slots_for_fed_hydrogens(self, clusters: list[list[int]]) -> dict[int, set[int]]:
        """holder -> the atoms X whose bond to it the pair of its C-H bond goes into, for a
        holder in no ring with three heavy neighbours of its own whose hydrogen travels to
        another species (an E2 at a fully substituted carbon). Its depiction keeps a slot for
        the hydrogen next to X (branches.slot_beside): drawn trigonal, the hydrogen could only
        go 60 degrees from X, too tight for the arrow between the two bonds, or into the gap
        away from X, where that arrow crosses a bond."""
        cluster_of = {a: k for k, group in enumerate(clusters) for a in group}
        slots: dict[int, set[int]] = {}
        for (h, holder), fed in self.feeds.items():
            takers = [n for n in self.neighbours[h] if n != holder]
            if (h not in self.bridging or holder not in cluster_of
                    or any(holder in m and n in m for ms in self.molecules for m in ms for n in takers)):
                continue   # a hydrogen passed within a molecule (an ylide's) waits where its taker reaches it
            own = [n for n in self.neighbours[holder] if self.element[n] != 1 and cluster_of.get(n) == cluster_of[holder]]
            if len(own) >= 3 and fed & set(own) and not self._in_ring(holder):
                slots.setdefault(holder, set()).update(fed & set(own))
        return slots

    def _ring_through(self, a: int, b: int) -> int:
        """Atoms in the smallest ring of the union graph's heavy atoms through the bond a-b (0 when
        the bond is in none)."""
        around = _bonds_between(a, b, self.neighbours,
                                lambda x, n: self.element[n] != 1 and not (x == a and n == b))
        return around + 1 if around else 0

    def _in_ring(self, atom: int) -> bool:
        """Whether a ring of the union graph runs through `atom` (two of its neighbours are
        joined by a path that avoids it). A ring atom's hydrogen has a free side next to each
        of its bonds out of the ring, and its ring bonds cannot turn."""
        heavy = sorted(n for n in self.neighbours[atom] if self.element[n] != 1)
        for start in heavy:
            seen, todo = {atom, start}, [start]
            while todo:
                for n in self.neighbours[todo.pop()]:
                    if n in seen or self.element[n] == 1:
                        continue
                    if n in heavy:
                        return True
                    seen.add(n)
                    todo.append(n)
        return False

    def _join_ring_across_clusters(self, groups: _UnionFind, heavy_bonds: list[tuple[int, int]],
                                   heavy_atoms: list[int], partners: list) -> bool:
        """A ring whose bonds all exist in one panel but run through three or more clusters (the
        oxaphosphetane of a Wittig reaction: each of its bonds forms or breaks at some step) is
        depicted as one piece, so that it is drawn as a ring; placed piece by piece, its bonds
        would cross. When two molecules make the ring between them, they are held apart before
        that step, as for a cycloaddition. Joins one ring; False when there is none."""
        root = {a: groups.find(a) for a in heavy_atoms}   # the groups stay as they are until a ring is joined
        roots = set(root.values())
        # Each panel's bonds; then each step's, before and after together: a ring of five or more
        # atoms that one step goes round, breaking some of its bonds as it makes the others (a
        # zinc enolate adding to a ketone through a six-membered ring, the zinc passed from one
        # oxygen to the other; the six atoms of a Cope or Claisen shift, in two clusters), is
        # drawn as that ring too, its atoms in place on both sides, as chemists draw a pericyclic
        # step. A smaller one is a group shifted to a neighbour.
        # A hydrogen handed between two heavy atoms in the step closes such a ring too, as a link
        # between them (an ester's Ei elimination, a beta-keto acid losing CO2, the carbonyl-ene:
        # six-membered cyclic arrays with the hydrogen at one corner).
        hops = {k: {(min(giver, taker), max(giver, taker)) for _, giver, taker in handed}
                for k, handed in self.hops.items()}
        bond_sets = [(k, self.bonds_in[k], False) for k in range(self.n)]
        bond_sets += [(k + 1, self.bonds_in[k] | self.bonds_in[k + 1] | hops.get(k, set()), True)
                      for k in range(self.n - 1)]
        # Only the bonds between two groups can close a ring of groups: picked out once, in order.
        joins = sorted(set(heavy_bonds) | {pair for pairs in hops.values() for pair in pairs})
        between = [(i, j, root[i], root[j]) for i, j in joins if root[i] != root[j]]
        for k, bonds, over_step in bond_sets:
            panel = _UnionFind(roots)
            links: dict[int, list[tuple[int, int, tuple[int, int]]]] = {}
            for i, j, a, b in between:
                if (i, j) not in bonds:
                    continue
                if panel.find(a) == panel.find(b):
                    ring = self._cluster_path(links, a, b) + [(i, j)]
                    if over_step and self._ring_size(ring, root, bonds) < 5:
                        continue   # a group shifted to a neighbour (a 1,2-shift) is placed where it goes
                    if over_step and hops.get(k - 1, set()) & set(ring) and not any(
                            (bond in self.bonds_in[k - 1]) != (bond in self.bonds_in[k]) for bond in ring):
                        continue   # a proton transfer of its own, not one corner of a cyclic array
                    self._join_ring(groups, ring, k, heavy_atoms, partners)
                    return True
                panel.join(a, b)
                links.setdefault(a, []).append((b, (i, j)))
                links.setdefault(b, []).append((a, (i, j)))
        return False

    def _ring_size(self, ring: list[tuple[int, int]], root: dict[int, int], bonds: set[tuple[int, int]]) -> int:
        """Atoms round a ring given by its bonds between clusters: those bonds, and in each cluster
        the shortest way over `bonds` from the atom the ring enters by to the one it leaves by."""
        ends: dict[int, list[int]] = {}
        for bond in ring:
            for atom in bond:
                ends.setdefault(root[atom], []).append(atom)
        size = len(ring)
        for group, (entry, exit_) in ends.items():
            seen, frontier, steps = {entry}, [entry], 0
            while exit_ not in seen and frontier:
                steps += 1
                reached = {n for a in frontier for n in self.neighbours[a]
                           if n not in seen and root.get(n) == group and (min(a, n), max(a, n)) in bonds}
                seen |= reached
                frontier = list(reached)
            size += steps
        return size

    @staticmethod
    def _cluster_path(links: dict, start: int, goal: int) -> list[tuple[int, int]]:
        """The bonds on the path from cluster `start` to cluster `goal` through `links` (a forest)."""
        came = {start: None}
        queue = [start]
        for here in queue:
            for there, bond in links.get(here, ()):
                if there not in came:
                    came[there] = (here, bond)
                    queue.append(there)
        path = []
        while came.get(goal) is not None:
            goal, bond = came[goal]
            path.append(bond)
        return path

    def _hydrogen_hops(self) -> dict[int, list[tuple[int, int, int]]]:
        """step -> (hydrogen, giver, taker) for each drawn hydrogen handed between two heavy atoms
        in it."""
        hops: dict[int, list[tuple[int, int, int]]] = {}
        for h in sorted(self.drawn_h):
            holders = [[n for n in self.neighbours[h] if self.element[n] != 1 and (min(n, h), max(n, h)) in bonds]
                       for bonds in self.bonds_in]
            for k, (before, after) in enumerate(zip(holders, holders[1:])):
                if len(before) == 1 and len(after) == 1 and before != after:
                    hops.setdefault(k, []).append((h, before[0], after[0]))
        return hops

    def _join_ring(self, groups: _UnionFind, ring: list[tuple[int, int]], k: int, heavy_atoms: list[int],
                   partners: list) -> None:
        members = {groups.find(a) for bond in ring for a in bond}
        first = min((q for q in range(k + 1) if all(b in self.bonds_in[q] for b in ring)), default=k)
        if first > 0:
            # The molecules of the panel before the ring is complete: two of them, bonded to each
            # other by two of the ring's bonds, are partners held apart until they meet.
            molecule = {}
            for number, frag in enumerate(self.molecules[first - 1]):
                molecule.update((a, number) for a in frag)
            ring_atoms = {a for bond in ring for a in bond}
            numbers = sorted({molecule[a] for a in ring_atoms if a in molecule})
            between = [b for b in ring if b[0] in molecule and b[1] in molecule
                       and molecule[b[0]] != molecule[b[1]]]
            if len(numbers) == 2 and len(between) >= 2:
                sides = tuple(frozenset(a for a in heavy_atoms if molecule.get(a) == number
                                        and groups.find(a) in members) for number in numbers)
                partners.append((sides, sorted(between)))
        anchor = next(iter(members))
        for member in members:
            groups.join(anchor, member)

    def _hold_apart(self, sides: tuple[frozenset[int], frozenset[int]], bonds: list[tuple[int, int]]) -> bool:
        """Two species that make a ring between them (a cycloaddition) are drawn facing each
        other with the forming bonds open, about CYCLOADDITION_GAP bond lengths, until the step that
        makes them: the diene s-cis and the dienophile across its termini, as chemists draw it, so
        the arrows into the forming bonds have room. One side moves, as a whole, only if the
        forming step touches every atom of it or it is a separate molecule until then (it slides
        in rigidly); the smaller such side moves, and the depiction is
        turned so that it waits on the right (a dienophile upright beside the diene). A ring
        whose bonds form at different steps (a Michael addition, then the ring-closing aldol of
        an annulation) is left to _hold_apart_staged: False for those, True otherwise."""
        cluster = self.clusters[self.cluster_of[bonds[0][0]]]
        formed = [k for k in range(self.n) if all(b in self.bonds_in[k] for b in bonds)]
        if not formed or formed[0] == 0:
            return True
        step = formed[0] - 1
        if any(b in self.bonds_in[k] for b in bonds for k in range(step + 1)):
            return False
        local = cluster.local
        chosen = self._moving_side(cluster, sides, step)
        if chosen is None:
            return True
        atoms, side = chosen
        ends = [(i, j) if i in side else (j, i) for i, j in bonds]
        # The scheme reads left to right: the whole depiction is turned so that the partner that
        # moves in waits on the right, its forming bonds pointing back at the other across the gap.
        turn = unit(sum(local[i] for i, _ in ends) - sum(local[j] for _, j in ends)).conjugate()
        cluster.local = local = {a: p * turn for a, p in local.items()}
        cluster.phases = [(first, {a: p * turn for a, p in later.items()}) for first, later in cluster.phases]
        # Straight out to the right, unless that sets the moving side on the rest of the cluster
        # (the aldehyde of a Corey-Fuchs oxaphosphetane, drawn from the first panel, landed on a
        # phenyl of the phosphorus): then turned up or down as little as clears it.
        offset = _held_off(local, atoms, ends, 1 + 0j, CYCLOADDITION_GAP, _HELD_APART_ROOM)
        first = min(k for k in range(self.n) if atoms & self.exists[k])
        cluster.openings.append((atoms, first, step, offset))
        return True

    def _hold_apart_staged(self, sides: tuple[frozenset[int], frozenset[int]], bonds: list[tuple[int, int]]) -> None:
        """The partners of a ring made over several steps, in the panels before the first of its
        bonds forms: the molecule that arrives (the enone of a Robinson annulation) waits about
        APPROACH bond lengths out along the bond it makes first, as a separate reagent waits,
        not curled onto its partner where the depiction of the finished ring sets it (the enone's
        CH2 stood 0.5 bond lengths from the hydrogen its partner loses first; its carbonyl carbon
        a bond length from the enolate oxygen). Not turned: the rest of the scheme keeps its
        orientation. Only where, curled so, the molecule stands on the spot of what its partner
        carries meanwhile (_satellite_crowding). The whole molecule moves (every atom of the
        cluster in it), over the panels in which it is that same molecule; not one already held
        apart."""
        cluster = self.clusters[self.cluster_of[bonds[0][0]]]
        first_bonded = min(k for k in range(self.n) if any(b in self.bonds_in[k] for b in bonds))
        if first_bonded == 0:
            return
        step = first_bonded - 1
        chosen = self._moving_side(cluster, sides, step)
        if chosen is None:
            return
        _, side = chosen
        molecule = next((set(m) for m in self.molecules[step] if side & set(m)), set())
        atoms = frozenset(a for a in cluster.atoms if a in molecule)
        if not atoms <= self.joining[step] or any(atoms & held for held, *_ in cluster.openings):
            return
        first = step
        while first > 0 and atoms <= self.exists[first - 1] and any(
                set(m) & atoms == atoms and len(set(m) & set(cluster.atoms)) == len(atoms) for m in self.molecules[first - 1]):
            first -= 1
        local = cluster.local_at(step)
        while first < step and cluster.local_at(first) is not local:
            first += 1   # (from a depiction of its own, a phase, the molecule already stands apart)
        ends = [(i, j) if i in atoms else (j, i) for i, j in bonds if (i, j) in self.bonds_in[first_bonded]]
        if not ends or sum(abs(local[i] - local[j]) for i, j in ends) / len(ends) > _CURLED:
            return   # the depiction of these panels has the partners apart already
        out = unit_or_zero(sum(local[i] for i, _ in ends) - sum(local[j] for _, j in ends))
        if out == 0:
            return
        spots, bases = self._satellites(atoms, bonds, range(first, step + 1), local)
        if min((abs(local[a] - spot) for a in atoms if a in local for spot in spots), default=math.inf) > _TAKEN:
            return   # curled as the ring sets it, it takes no partner's spot: drawn so (a diol beside its ketone)
        offset = _held_off(local, atoms, ends, out, APPROACH, _CLEARANCE, spots + bases)
        cluster.openings.append((atoms, first, step, offset))

    def _hold_off_arrivals(self, cluster: _Cluster) -> None:
        """A molecule that bonds to another piece of its cluster's depiction and carries a group
        of another cluster through that step (tribromomethanide adding to the phosphorus of the
        oxaphosphetane the two end in, with the bromine it loses next) waits about APPROACH bond
        lengths out along the bonds it makes, in the panels before, as a separate reagent waits.
        Drawn where the finished ring sets it, it stood a bond length from its partner, unbonded;
        _open_rings, which opens such a bond by swinging or flipping its end alone, flipped the
        carbon away from that bromine, the bond drawn 1.78 bond lengths long. The smaller side
        moves, as a whole, over the panels in which it is that same molecule; a bond already drawn
        open (a cycloaddition's partners held apart) is left as it is."""
        members = set(cluster.atoms)
        for step in range(self.n - 1):
            molecule = {a: number for number, frag in enumerate(self.molecules[step]) for a in frag}
            made = [(i, j) for i, j in sorted(self.made[step]) if i in members and j in members
                    and molecule.get(i) is not None and molecule.get(j) is not None and molecule[i] != molecule[j]]
            for pair in sorted({tuple(sorted((molecule[i], molecule[j]))) for i, j in made}):
                sides = [frozenset(a for a in members if molecule.get(a) == number) for number in pair]
                atoms = min(sides, key=lambda side: (len(side), sorted(side)))
                local = cluster.held_off_at(step)
                ends = [(i, j) if i in atoms else (j, i) for i, j in made if {molecule[i], molecule[j]} == set(pair)]
                if sum(abs(local[i] - local[j]) for i, j in ends) / len(ends) > _CURLED:
                    continue
                if not self._carries_across(atoms, members, step):
                    continue   # _open_rings swings or flips its end open, later
                first = step
                while first > 0 and atoms <= self.exists[first - 1] and any(
                        set(m) & members == atoms for m in self.molecules[first - 1]):
                    first -= 1
                out = unit_or_zero(sum(local[i] for i, _ in ends) - sum(local[j] for _, j in ends))
                if out == 0:
                    continue
                present = set().union(*self.exists[first:step + 1])
                shown = {a: p for a, p in local.items() if a in present}
                offset = _held_off(shown, atoms, ends, out, APPROACH, _CLEARANCE)
                cluster.openings.append((atoms, first, step, offset))

    def _carries_across(self, atoms: frozenset[int], members: set[int], step: int) -> bool:
        """Whether an atom of `atoms` is bonded to a heavy atom outside its cluster's `members`
        on both sides of `step`, by a bond the step leaves alone."""
        return any(self.element[n] != 1 and n not in members
                   and (min(a, n), max(a, n)) in self.bonds_in[step] and (min(a, n), max(a, n)) in self.bonds_in[step + 1]
                   for a in atoms for n in self.neighbours[a])

    def _satellites(self, atoms: frozenset[int], bonds: list[tuple[int, int]], panels: range,
                    local: dict[int, complex]) -> tuple[list[complex], list[complex]]:
        """Where the still side's ring-bond atoms will carry, in `panels`, what the depiction
        leaves out (an atom of another cluster, such as a ring ketone's oxygen; a drawn hydrogen),
        each estimated in its holder's widest gap; beyond a drawn hydrogen, where the base that
        takes it will stand (TRANSFER_GAP on). (The spots, and the bases' spots.)"""
        spots, beyond = [], []
        holders = sorted({a for bond in bonds for a in bond if a not in atoms})
        for k in panels:
            for holder in holders:
                bonded = [n for n in self.neighbours[holder] if (min(holder, n), max(holder, n)) in self.bonds_in[k]]
                carried = [n for n in bonded if n not in local or n in self.drawn_h and self._drawn_in(n, k)]
                if not carried:
                    continue
                way = free_direction(local[holder], [local[n] for n in bonded if n in local and n not in carried])
                spots.append(local[holder] + way)
                if any(n in self.drawn_h for n in carried):
                    # (within a turn either way: the hydrogen is set in the room left to it)
                    beyond += [local[holder] + way * _rotor(turn, 9) * (1.0 + TRANSFER_GAP) for turn in (-1, 0, 1)]
        return spots, beyond

    def _moving_side(self, cluster: _Cluster, sides: tuple[frozenset[int], frozenset[int]], step: int
                     ) -> Optional[tuple[frozenset[int], frozenset[int]]]:
        """Of two partners held apart before `step`, the smaller that may move as a whole (the
        step touches every atom of it, or it is a separate molecule until then): its atoms (the
        side's heavy atoms and their hydrogens in the cluster) and the side; None if neither may."""
        choices = []
        for side, other in (sides, sides[::-1]):
            atoms = frozenset(a for a in cluster.atoms if a in side or (
                self.element[a] == 1 and any(n in side for n in self.neighbours[a])))
            if atoms <= self.touched[step] or atoms <= self.joining[step]:   # it may move as a whole
                choices.append((len(atoms), sorted(atoms), atoms, side))
        if not choices:
            return None
        _, _, atoms, side = min(choices)
        return atoms, side

    def _in_group(self, group: list[int], panels: Iterable[int]) -> set[tuple[int, int]]:
        members = set(group)
        # Over every panel these are the union's bonds, looked at once each.
        every = self.union if panels == range(self.n) else (b for k in panels for b in self.bonds_in[k])
        return {b for b in every if b[0] in members and b[1] in members}

    def _atom_inside_a_ring(self, local: dict[int, complex], group: list[int], bonds: set[tuple[int, int]]) -> bool:
        """Whether, in `local`, a heavy atom of `group` stands inside a ring made of `bonds` that it
        is not part of (RDKit's depiction of an epoxidised silyl enol ether, its silyloxy oxygen
        inside the cyclohexane)."""
        rings = [ring for ring in self.rings
                 if all((min(a, b), max(a, b)) in bonds for a, b in zip(ring, ring[1:] + ring[:1]))]
        return _any_inside_ring(local, rings, (a for a in group if self.element[a] != 1))

    def _bonds_cross(self, local: dict[int, complex], bonds: set[tuple[int, int]]) -> bool:
        """Whether two bonds between heavy atoms, drawn at `local`, cross (sharing no atom): the
        union of a cluster's bonds over several panels that RDKit could not lay flat (Dess-Martin
        periodinane's iodine with a sixth partner, its acetoxy groups drawn over its ring). A sweep
        along x: only bonds whose spans overlap are compared."""
        element = self.element
        segments = sorted((min(local[i].real, local[j].real), max(local[i].real, local[j].real), i, j)
                          for i, j in bonds if element[i] != 1 and element[j] != 1 and i in local and j in local)
        for k, (x0, x1, i, j) in enumerate(segments):
            p, q = local[i], local[j]
            for y0, y1, a, b in segments[k + 1:]:
                if y0 > x1:
                    break
                if a not in (i, j) and b not in (i, j) and segments_cross(p, q, local[a], local[b]):
                    return True
        return False

    def _squeezes_a_ring(self, local: dict[int, complex], group: list[int], panels: Iterable[int],
                         drawn: set[tuple[int, int]]) -> bool:
        """Whether `local`, depicted from the bonds `drawn`, draws a ring of `group` that exists in
        one of `panels` far from a regular polygon (an angle more than _RING_ANGLE_SLACK off): the
        rim of a bicyclic depiction, as a cyclohexanone drawn where its Favorskii cyclopropanone
        will be, a hexagon bent round the bond that closes later. Only a panel that lacks a drawn
        bond between two of its ring atoms can hold a ring the depiction did not draw as its own."""
        element = self.element
        heavy = {(i, j) for i, j in drawn if element[i] != 1 and element[j] != 1}
        own = None
        for k in panels:
            missing = heavy - self.bonds_in[k]
            if not missing:
                continue   # (most panels: every drawn bond there)
            core = _ring_core(heavy & self.bonds_in[k])
            if not any(i in core and j in core for i, j in missing):
                continue   # a chain that closes later, or a ring that opened: nothing drawn across a ring
            if own is None:
                own = {frozenset(ring) for ring in _smallest_rings(_ring_core(heavy))}
            for ring in _smallest_rings(core):
                if frozenset(ring) in own:
                    continue
                regular = math.pi * (len(ring) - 2) / len(ring)
                for before, at, after in zip(ring[-1:] + ring[:-1], ring, ring[1:] + ring[:1]):
                    angle = abs(cmath.phase((local[before] - local[at]) / (local[after] - local[at])))
                    if abs(angle - regular) > _RING_ANGLE_SLACK:
                        return True
        return False

    def _even(self, local: dict[int, complex], group: list[int], panels: Iterable[int],
              bonds: Optional[set[tuple[int, int]]] = None) -> bool:
        """Every bond among `group` in `panels` within 2% of one bond length in `local`. `bonds`:
        those bonds, where the caller has them already."""
        if bonds is None:
            bonds = self._in_group(group, panels)
        return all(abs(abs(local[i] - local[j]) - 1.0) <= 0.02 for i, j in bonds)

    def _chain_double_bonds(self) -> dict[tuple[int, int], tuple[int, int, list[int]]]:
        """(i, j) -> (a, b, panels): a C=C that is double in `panels`, not written E or Z, in no
        ring there, with one heavy substituent on each end (a on i, b on j; a 1,2-disubstituted
        alkene, whose drawing as cis or trans is a choice). Not one a pericyclic step changes round
        its cyclic array (a [3,3] or [1,5]-hydrogen shift, an electrocyclisation): it is cis there."""
        found: dict[tuple[int, int], tuple[int, int, list[int]]] = {}
        for (i, j), order in self.sorted_union:
            if order != 2 or (i, j) in self.written_double or self.element[i] != 6 or self.element[j] != 6:
                continue
            for k in range(self.n):
                if self.orders_in[k].get((i, j)) != 2:
                    continue
                heavy = [[n for n in self.neighbours[end] if n != other and self.element[n] != 1
                          and (min(end, n), max(end, n)) in self.bonds_in[k]] for end, other in ((i, j), (j, i))]
                # (the substituents counted first: most ring and chain-end bonds stop there, unsearched)
                if len(heavy[0]) != 1 or len(heavy[1]) != 1 or self._in_cyclic_array(i, j, k) \
                        or self._joined_around(i, j, k):
                    continue
                if self._linear(i, range(k, k + 1)) or self._linear(j, range(k, k + 1)):
                    continue   # an allene's end: its neighbours stand in line, neither cis nor trans
                a, b, panels = found.get((i, j), (heavy[0][0], heavy[1][0], []))
                found[(i, j)] = (a, b, panels + [k])
        return found

    def _in_cyclic_array(self, i: int, j: int, k: int) -> bool:
        """Whether i=j, double in panel k, is one of the bonds that the step into or out of panel k
        changes round a cycle (a pericyclic array: a [3,3] shift's alkene, the one a [1,5]-hydrogen
        shift makes): its geometry is the array's, cis, not a choice."""
        for step in (k - 1, k):
            if not 0 <= step < self.n - 1:
                continue
            changed = self._changed_bonds(step)
            if (i, j) in changed and _on_the_way(i, j, _adjacency(changed - {(i, j)})):
                return True
        return False

    def _changed_bonds(self, k: int) -> frozenset[tuple[int, int]]:
        """The bonds the step after panel k makes, breaks or changes the order of (none after the
        last panel); worked out once per step."""
        if k not in self._changed:
            before, after = (self.orders_in[k], self.orders_in[k + 1]) if k + 1 < self.n else ({}, {})
            self._changed[k] = frozenset(pair for pair in before.keys() | after.keys()
                                         if before.get(pair) != after.get(pair))
        return self._changed[k]

    def _joined_around(self, i: int, j: int, k: int) -> bool:
        """Whether i and j are joined in panel k by a path that is not their own bond (a ring)."""
        seen, frontier, bonds = {i}, [i], self.bonds_in[k]
        while frontier:
            atom = frontier.pop()
            for n in self.neighbours[atom]:
                # (their own bond is i-j itself: the search never stands on j, it stops there)
                if n in seen or (atom == i and n == j) or (min(atom, n), max(atom, n)) not in bonds:
                    continue
                if n == j:
                    return True
                seen.add(n)
                frontier.append(n)
        return False

    def _draws_chain_alkene_cis(self, local: dict[int, complex], group: list[int], panels: range) -> bool:
        """Whether `local` draws one of the chain C=C bonds (chain_double) cis in `panels`."""
        members = set(group)
        for (i, j), (a, b, double_in) in self.chain_double.items():
            if {i, j, a, b} <= members and any(k in panels for k in double_in) and _cis(local, i, j, a, b):
                return True
        return False

    def _shows_written_geometry(self, local: dict[int, complex], group: list[int], panels: range) -> bool:
        """Every double bond of `group` written E or Z is drawn so in `local`, in the panels
        where it is double. A union depiction that closes a ring across it (the bromonium ion of
        an E alkene) may not: the substituents are placed for the ring."""
        members = set(group)
        wanted = dict(self.written_double)
        wanted.update({pair: (a, b, False) for pair, (a, b, _) in self.chain_double.items()
                       if panels is not None and any(k in panels for k in _)})
        for (i, j), (a, b, cis) in wanted.items():
            if not {i, j, a, b} <= members or not any(self.orders_in[k].get((i, j)) == 2 for k in panels):
                continue
            drawn = _cis(local, i, j, a, b)
            if drawn is None or drawn != cis:
                return False
        return True

    def _phases(self, group: list[int]) -> tuple[dict[int, complex], list[tuple[int, dict[int, complex]]]]:
        """Depictions of a cluster whose bonds over the whole mechanism cannot be drawn at one
        length (a ring that grows as a bond migrates, as in a Baeyer-Villiger oxidation) or that
        holds an sp atom which later bends or straightens, or that would draw a written E or Z wrongly
        (a ring about to close across the double bond): runs of panels as long as one depiction draws them
        evenly, with every such atom straight or bent throughout, each run drawn from its own bonds (an
        atom with none there takes the bonds it has next), each aligned on the one before by the
        atoms the step between them leaves alone. Chemists redraw a ring that changes size; its
        atoms are the ones that move. A run whose chain closes a ring later (onto a nitrile or an
        alkyne carbon, whose straightening or bending starts a new run) is drawn curled round
        that ring, its closing atoms a gap apart."""
        runs: list[tuple[int, dict[int, complex]]] = []
        sometimes_sp = [a for a in group if self._linear(a)]
        start = 0
        while start < self.n:
            own, ahead = self._run_bonds(group, start, start), self._hop_ahead(group, start)
            bonds = own | ahead
            end, local = start, self._depict(group, bonds, range(start, start + 1))
            if ahead and self._bonds_cross(local, bonds):
                # The cyclic array drawn as a ring crosses bonds (the periodinane's ligands round the
                # iodine as its acetate takes the alcohol's alpha H): the panel's own bonds only.
                bonds = own
                local = self._depict(group, bonds, range(start, start + 1))
            while end + 1 < self.n:
                if any(self._linear(a, range(start, end + 1)) and not self._linear(a, range(start, end + 2))
                       for a in group):
                    break     # an sp atom that bends (a nitronium attacked) is drawn straight, then bent
                if any(self._linear(a, range(end + 1, end + 2)) and not self._linear(a, range(start, end + 2))
                       for a in group):
                    break     # one that straightens (a nitrilium made by a shift) is drawn bent, then straight
                trial_bonds = self._run_bonds(group, start, end + 1) | self._hop_ahead(group, end + 1)
                trial = self._depict(group, trial_bonds, range(start, end + 2))
                if not self._even(trial, group, range(start, end + 2)) or self._atom_inside_a_ring(trial, group, trial_bonds):
                    break
                if self._bonds_cross(trial, trial_bonds):
                    break     # the union of the run's bonds cannot be drawn flat (a periodinane's ligands over its ring)
                if self._squeezes_a_ring(trial, group, range(start, end + 2), trial_bonds):
                    break     # a ring drawn round a bond that closes later (a Favorskii cyclopropanone's rim)
                if any(self._linear(a, range(end, end + 1)) and not self._linear(a, range(end + 1, end + 2))
                       and self._heavy_bonds(a, end) == self._heavy_bonds(a, end + 1) for a in sometimes_sp):
                    break     # one that a lone pair bends, its bonds kept (the azide's N3 as P bonds to N4)
                if not self._shows_written_geometry(trial, group, range(start, end + 2)):
                    break     # an E alkene drawn Z where a ring is about to close across it
                if self._draws_chain_alkene_cis(trial, group, range(start, end + 2)):
                    break     # a new alkene drawn cis where the ring it came from was
                if self._opens_small_ring(group, end):
                    break     # a chain cut out of a three- or four-membered ring is drawn anew
                end, local, bonds = end + 1, trial, trial_bonds
            closing = self._rings_to_close(group, end)
            if closing:
                # A chain that closes a ring later is drawn curled round the ring to be, its two
                # ends facing each other across a gap, not stretched out with the arrow spanning it.
                local = self._straightened(self._depict(group, bonds, range(start, end + 1), closing),
                                           bonds, closing, range(start, end + 1))
            pieces = _UnionFind(group)
            for i, j in bonds:
                pieces.join(i, j)
            if not runs:
                local = self._diene_facing(group, bonds, end, local, pieces)
                local = self._pieces_facing(local, group, bonds, end, pieces)
            if runs:
                # RDKit lays separate pieces side by side at will: each piece is aligned on its own.
                aligned: dict[int, complex] = {}
                for piece in pieces.groups():
                    part, before = {a: local[a] for a in piece}, runs[-1][1]
                    untouched = [a for a in piece if a not in self.touched[start - 1]]
                    # (a hydrogen that hops across the piece would only turn it: the heavy atoms fit it)
                    fitted = _aligned(part, before, untouched, [a for a in piece if self.element[a] != 1])
                    joints = self._joints(piece, group, start - 1)
                    if len(joints) == 1 and abs(fitted[joints[0]] - before[joints[0]]) > 1e-6:
                        # The fit moved the one atom bonded to another cluster, which is placed
                        # once for the run: that bond would stretch (a cycloadduct redrawn on its
                        # iminium's C=N carbon, 2.5 lengths off the nitrogen). The atom stays put,
                        # its own bonds turned as they were, so the bond keeps its angles too.
                        joint = joints[0]
                        spokes = [n for n in self.neighbours[joint] if n in part and n in before
                                  and self._kept_bond(joint, n, start - 1)]
                        if spokes:
                            fitted = _kept_at_joint(part, before, joint, spokes, untouched)
                    aligned.update(fitted)
                local = aligned
            runs.append((start, local))
            start = end + 1
        return runs[0][1], runs[1:]

    def _kept_bond(self, a: int, b: int, k: int) -> bool:
        """Whether a bond between heavy atoms a and b is drawn in panels k and k+1 alike."""
        pair = (min(a, b), max(a, b))
        return self.element[a] != 1 and self.element[b] != 1 and pair in self.bonds_in[k] and pair in self.bonds_in[k + 1]

    def _joints(self, piece: list[int], group: list[int], k: int) -> list[int]:
        """Atoms of `piece` that step k leaves alone, bonded to an atom outside `group` in panels
        k and k+1 alike."""
        members = set(group)
        return [a for a in piece if a not in self.touched[k]
                and any(n not in members and self._kept_bond(a, n, k) for n in self.neighbours[a])]

    def _pieces_facing(self, local: dict[int, complex], group: list[int], bonds: set[tuple[int, int]],
                       last: int, pieces: _UnionFind) -> dict[int, complex]:
        """`local` (the first run's depiction, drawn from `bonds`, its `pieces`) with the smaller of two separate
        pieces that the step after panel `last` bonds together by one bond turned and moved to
        face the other, each atom of the new bond in its free gap (a ketene facing the imine
        nitrogen that adds to it), where RDKit, which lays separate pieces side by side at will,
        turned one of those atoms away from the other or set the piece on the other's atoms or
        behind its bonds (an alcohol over an acetoxy group of the periodinane it adds to).
        Unchanged for anything else."""
        joining = self._joining_pieces(group, last, pieces)
        if len(joining) != 1:
            return local
        small, large = sorted(pieces.groups(), key=len)
        j, i = joining[0] if joining[0][0] in small else joining[0][::-1]   # j in the small piece, i in the large
        adjacent = _adjacency(bonds)
        u = free_direction(local[i], [local[n] for n in adjacent.get(i, ())])
        v = free_direction(local[j], [local[n] for n in adjacent.get(j, ())])
        obstacles, walls = self._around_joining_atom(local, large, bonds, i, u, last)

        def fit(moved: dict[int, complex]) -> tuple[float, bool]:
            """Nearest approach of the small piece to the large one (and to what it carries),
            and whether the way from the small piece's atom to its partner crosses none of
            their bonds."""
            atoms = np.array([moved[a] for a in small], dtype=complex)
            room = float(np.abs(atoms[:, None] - obstacles[None, :]).min())
            clear = not len(walls) or not crosses_any(np.array([moved[j]]), np.array([local[i]]), walls)[0]
            return room, clear

        def facing(d: complex, distance: float) -> dict[int, complex]:
            """`local` with the small piece turned to face the large one from direction d."""
            turn, target = -d / v, local[i] + d * distance
            return {**local, **{a: target + (local[a] - local[j]) * turn for a in small}}

        gap = local[j] - local[i]
        if abs(cmath.phase(gap / u)) <= math.pi / 2 and abs(cmath.phase(-gap / v)) <= math.pi / 2:
            best = local   # RDKit set them facing each other already, more or less
        else:
            best = facing(u, CYCLOADDITION_GAP)
        # Where that is crowded or its arrow would cross a bond (the periodinane's iodine has a
        # ligand in every gap), round the joining atom and further out, nearest the free
        # direction first: the first clear spot, else the roomiest.
        best_fit = fit(best)
        if best_fit[0] >= _CLEARANCE and best_fit[1]:
            return best
        for distance in _FACING_DISTANCES:
            for turn in _FACING_TURNS:
                moved = facing(u * turn, distance)
                room, clear = fit(moved)
                if room >= _CLEARANCE and clear:
                    return moved
                if (clear, min(room, _CLEARANCE)) > (best_fit[1], min(best_fit[0], _CLEARANCE)):
                    best, best_fit = moved, (room, clear)
        return best

    def _diene_facing(self, group: list[int], bonds: set[tuple[int, int]], last: int,
                      local: dict[int, complex], pieces: _UnionFind) -> dict[int, complex]:
        """`local` (the first run's depiction, drawn from `bonds`, its two separate `pieces`) with a diene
        that the step after panel `last` joins to the other piece by both its ends (a Diels-Alder
        whose dienophile, written E, keeps the cluster from being drawn as the adduct's ring)
        redrawn s-cis and set with its ends facing the two atoms they bond to, the forming bonds
        a bond length long (_hold_apart opens them). Chemists draw a diene about to take part in
        a cycloaddition s-cis, its ends towards the dienophile (common practice); RDKit draws
        buta-1,3-diene s-trans. Unchanged for anything else."""
        joining = self._joining_pieces(group, last, pieces)
        if len(joining) != 2:
            return local
        if pieces.find(joining[0][0]) != pieces.find(joining[1][0]):
            joining = [joining[0], joining[1][::-1]]   # (each bond joins the two pieces: now both start in one)
        (d1, e1), (d4, e2) = joining
        if self._heavy_path_length(d1, d4, last, set(group)) == 1:
            (e1, d1), (e2, d4) = joining   # the diene is the other piece
        if self._heavy_path_length(d1, d4, last, set(group)) != 3 or self._heavy_path_length(e1, e2, last, set(group)) != 1:
            return local
        curled = self._depict(group, bonds, range(last, last + 1), frozenset({(min(d1, d4), max(d1, d4))}))
        diene = [a for a in group if pieces.find(a) == pieces.find(d1)]
        rest = {a: p for a, p in local.items() if a not in diene}
        # The diene turned so that d1 -> d4 runs along e1 -> e2, its middle beyond that line.
        turn = unit(local[e2] - local[e1]) / unit(curled[d4] - curled[d1])
        middle = (curled[d1] + curled[d4]) / 2
        shape = {a: (curled[a] - middle) * turn for a in diene}
        axis = unit(local[e2] - local[e1])
        best, best_room = local, -1.0
        for side in (axis * 1j, axis * -1j):
            inner = sum(shape.values()) / len(shape)
            drawn = shape if ((inner / axis).imag > 0) == ((side / axis).imag > 0) else \
                {a: (p / axis).conjugate() * axis for a, p in shape.items()}   # mirrored across the d1-d4 line
            target = (local[e1] + local[e2]) / 2 + side
            placed = {a: target + p for a, p in drawn.items()}
            room = min((abs(p - q) for p in placed.values() for q in rest.values()), default=9.0)
            if room > best_room:
                best, best_room = {**rest, **placed}, room
        return best

    def _joining_pieces(self, group: list[int], last: int, pieces: _UnionFind) -> list[tuple[int, int]]:
        """The bonds the step after panel `last` makes between the two separate `pieces` of
        `group` (none unless there are exactly two)."""
        if last + 1 >= self.n or len(pieces.groups()) != 2:
            return []
        members = set(group)
        return [(i, j) for i, j in self.made[last]
                if i in members and j in members and pieces.find(i) != pieces.find(j)]

    def _around_joining_atom(self, local: dict[int, complex], large: list[int], bonds: set[tuple[int, int]],
                             atom: int, free: complex, last: int) -> tuple[np.ndarray, np.ndarray]:
        """The atoms (as points) and bonds (as rows of two ends) that a piece coming to bond to
        `atom` of the piece `large` must keep clear of in panel `last`: the large piece's, and
        those of another cluster that `atom` carries there (the acetate the periodinane's iodine
        loses as the alcohol comes in), not depicted here, estimated in `atom`'s free direction
        with that cluster's own depiction fanned out beyond it."""
        points = [local[a] for a in large]
        walls = [(local[a], local[b]) for a, b in bonds if a in local and b in local and atom not in (a, b)
                 and a in large]
        for n in sorted(self.neighbours[atom]):
            if n in local or self.element[n] == 1 or (min(atom, n), max(atom, n)) not in self.bonds_in[last]:
                continue
            carried = next((c for c in self.clusters if n in c.atoms), None)
            if carried is None:
                continue
            rest = {a: p - carried.local[n] for a, p in carried.local.items()}
            centre = sum(rest.values()) / len(rest)
            outward = unit(centre).conjugate() if abs(centre) > 1e-9 else 1 + 0j
            # (within a turn either way: its own placement looks for room round the atom too)
            for way in (free * _rotor(turn, 12) for turn in (-1, 0, 1)):
                spot = {a: local[atom] + way * (1 + p * outward) for a, p in rest.items()}
                points += list(spot.values())
                walls += [(spot[a], spot[b]) for a, b in self.union if a in spot and b in spot]
        return np.array(points, dtype=complex), np.array(walls, dtype=complex).reshape(-1, 2)

    def _opens_small_ring(self, group: list[int], k: int) -> bool:
        """Whether the step after panel k breaks one bond of a three- or four-membered ring of
        `group` and leaves the rest of the ring bonded (a cyclobutene opening to a diene). Kept
        where the ring stood, the chain's bonds would meet at 60 or 90 degrees; chemists redraw it
        (common practice). Not while another cluster hangs on the group by a bond the step keeps
        (the methoxide on a Favorskii cyclopropanone): placed once for both panels, it would be
        left behind; nor as the step closes a ring of the group."""
        members = set(group)
        if not any(i in members and j in members for i, j in self.broken[k]):
            return False   # (most steps break no bond of the group: the rest is not asked)
        if any((i in members) != (j in members) and self.element[i] != 1 and self.element[j] != 1
               for i, j in self.bonds_in[k] & self.bonds_in[k + 1]):
            return False
        before, after = self._in_group(group, (k,)), self._in_group(group, (k + 1,))
        if after - before:
            return False    # a ring closes as the small one opens (a Payne rearrangement): drawn curled for it
        around = _adjacency(before)
        for a, b in before - after:
            # Every way round from a to b in two or three bonds, other than the broken bond itself.
            paths = [[a, m, b] for m in around[a] if b in around[m]]
            paths += [[a, m, n, b] for m in around[a] if m != b for n in around[m] if n not in (a, b) and b in around[n]]
            if any(all((min(x, y), max(x, y)) in after for x, y in zip(path, path[1:])) for path in paths):
                return True
        return False

    def _hop_ahead(self, group: list[int], last: int) -> set[tuple[int, int]]:
        """The bonds a hydrogen of `group` makes in the step after panel `last` as one corner of a
        cyclic array (a beta-keto acid's O-H going to the ketone oxygen as CO2 leaves): drawn
        already, so the array is depicted as the ring it is. One corner of a six-membered (or
        larger) ring the step goes round, that is: some other bond of the group changes too. (A
        five-membered one, a Cope elimination's, is left to the hydrogen's own placement: drawn
        as a ring it crowds the substituents of its centres.)"""
        members = set(group)
        # (a bond that only changes order counts: a [1,5]-hydrogen shift makes and breaks no other)
        changed = self._changed_bonds(last)
        return {(min(h, taker), max(h, taker)) for h, giver, taker in self.hops.get(last, ())
                if h in members and taker in members and self._heavy_path_length(giver, taker, last, members) >= 4
                and any(h not in bond and bond[0] in members and bond[1] in members for bond in changed)}

    def _rings_to_close(self, group: list[int], last: int) -> frozenset[tuple[int, int]]:
        """The bonds later steps make between two heavy atoms of `group` that are four or more
        bonds apart in panel `last`: closures of rings of five and more. (A smaller ring, an
        epoxide or a bromonium ion, closes on atoms that stand side by side anyway. A hydrogen passed
        on closes a ring only round a cyclic array of six or more, as in _hop_ahead and _short_hops.)"""
        members = set(group)
        later = set().union(*self.bonds_in[last + 1:]) - self.bonds_in[last]
        return frozenset((i, j) for i, j in later if i in members and j in members and self._heavy_path_length(
            i, j, last, members) >= (5 if self.element[i] == 1 or self.element[j] == 1 else 4))

    def _straightened(self, local: dict[int, complex], bonds: set[tuple[int, int]],
                      closing: frozenset[tuple[int, int]], panels: range) -> dict[int, complex]:
        """`local` with each sp atom round a ring about to close (an alkyne or nitrile carbon,
        depicted bent in the ring to be) made straight again: its smaller side turns about it until
        it carries on the line of the other."""
        adjacent = _adjacency(bonds)
        for i, j in closing:
            for atom in _on_the_way(i, j, adjacent):
                if not self._linear(atom, panels) or len(adjacent.get(atom, ())) != 2:
                    continue
                sides = sorted(((side_beyond(n, atom, adjacent), n) for n in adjacent[atom]), key=lambda side: len(side[0]))
                (branch, outward), (_, inward) = sides
                centre = local[atom]
                turn = unit(centre - local[inward]) / unit(local[outward] - centre)
                for a in branch:
                    local[a] = centre + (local[a] - centre) * turn
        return local

    def _heavy_path_length(self, a: int, b: int, k: int, members: set[int]) -> int:
        """Bonds on the shortest way from a to b over panel k's bonds between heavy atoms of
        `members` (0 when there is none)."""
        return _bonds_between(a, b, self.neighbours, lambda x, n: n in members and self.element[n] != 1
                              and (min(n, x), max(n, x)) in self.bonds_in[k])

    def _run_bonds(self, group: list[int], first: int, last: int) -> set[tuple[int, int]]:
        """The bonds among `group` in panels first..last, and for an atom bonded to none of them, its
        bonds in the next panel that has any (where it is about to be). A hydrogen that hops within
        the run round a five-membered ring keeps only its first holder's bond (_short_hops)."""
        bonds = self._in_group(group, range(first, last + 1))
        bonds -= self._short_hops(group, first, last, bonds)
        bonded = {a for b in bonds for a in b}
        for atom in group:
            if atom in bonded:
                continue
            for k in list(range(last + 1, self.n)) + list(range(first - 1, -1, -1)):
                mine = {b for b in self._in_group(group, (k,)) if atom in b}
                if mine:
                    partners = {a for b in mine for a in b} - {atom}
                    if any({i, j} <= partners for i, j in self.written_double):
                        # Bridging both ends of a written E or Z double bond (the bromine of a
                        # bromonium ion still to come) would draw it cis: it waits by one end.
                        mine = {min(mine)}
                    bonds |= mine
                    break
        return bonds

    def _short_hops(self, group: list[int], first: int, last: int, bonds: set[tuple[int, int]]) -> set[tuple[int, int]]:
        """The bonds of `bonds` (panels first..last) that a hydrogen of `group` makes after the first
        panel it is bonded in, where it hops between two atoms that the run's heavy bonds join by
        three bonds. Drawn together, its old and new bonds close a five-membered ring through it,
        which RDKit fuses onto the skeleton's own ring (a Passerini amide's N drawn 0.6 bond lengths
        from C4, its N-H across the C4 methyl). As for a Cope elimination (_hop_ahead), the
        hydrogen is left to its own placement. (A 1,3-shift's four-membered ring is kept: left
        out, a lactam's amine hydrogen takes the room its ring closure swings into.)"""
        members = set(group)
        heavy = {(i, j) for i, j in bonds if self.element[i] != 1 and self.element[j] != 1}
        dropped: set[tuple[int, int]] = set()
        for step in range(first, last):
            for h, giver, taker in self.hops.get(step, ()):
                if not {h, giver, taker} <= members or _bonds_between(
                        giver, taker, self.neighbours, lambda x, n: (min(x, n), max(x, n)) in heavy) != 3:
                    continue
                held = next(k for k in range(first, last + 1) if any(h in b for b in self.bonds_in[k]))
                dropped |= {b for b in bonds if h in b and b not in self.bonds_in[held]}
        return dropped

    def _depict(self, group: list[int], only: Optional[set[tuple[int, int]]] = None,
                panels: Optional[range] = None, gaps: frozenset[tuple[int, int]] = frozenset()) -> dict[int, complex]:
        """RDKit 2D coordinates of one cluster's union graph (or of the bonds in `only`, drawn in
        `panels`), scaled to unit bond length. Each pair in `gaps` is drawn two bonds apart round
        a ring, as if one more atom stood between them."""
        if len(group) == 1:
            return {group[0]: 0j}
        # What the Mol handed to RDKit is made of, besides what the scheme fixes (its bonds,
        # stand-ins, written E and Z): a run of panels often asks again for one already drawn.
        # (An atom round a gap is not drawn straight: it stands in a ring there.)
        adjacent = _adjacency(only or ()) if gaps else {}
        round_gaps = {a for i, j in gaps for a in _on_the_way(i, j, adjacent)}
        straight = tuple(atom for atom in group if atom not in round_gaps and self._linear(atom, panels))
        chains = tuple(pair for pair, (_, _, at) in self.chain_double.items()
                       if panels is not None and any(k in panels for k in at))
        key = (tuple(group), None if only is None else frozenset(only), straight, chains, gaps)
        known = self._depictions.get(key)
        if known is None:
            known = self._depictions[key] = self._depicted(group, only, panels, straight, gaps)
        return dict(known)

    def _depicted(self, group: list[int], only: Optional[set[tuple[int, int]]], panels: Optional[range],
                  straight: tuple[int, ...], gaps: frozenset[tuple[int, int]]) -> dict[int, complex]:
        """_depict's work: the Mol built and laid out by RDKit, `straight` its sp atoms."""
        index = {atom: k for k, atom in enumerate(group)}
        mol = Chem.RWMol()
        # AddAtom adds a copy: one Chem.Atom of each element serves every atom of it (and one
        # dummy every stand-in below), as making each costs a call into RDKit.
        templates = {0: Chem.Atom(0)}
        for atom in group:
            element = self.element[atom]
            template = templates.get(element)
            if template is None:
                template = templates[element] = Chem.Atom(element)
            mol.AddAtom(template)
        orders = {1: Chem.BondType.SINGLE, 2: Chem.BondType.DOUBLE, 3: Chem.BondType.TRIPLE}
        # (begin, end) of every bond in the order it is added, which is its index in the Mol: kept
        # here, as RDKit's bond iterator costs more than the depiction's own arithmetic.
        all_ends = []
        for (i, j), order in self.sorted_union:
            if i in index and j in index and (only is None or (i, j) in only):
                mol.AddBond(index[i], index[j], orders.get(order, Chem.BondType.SINGLE))
                all_ends.append((index[i], index[j]))
        ends = all_ends[:]   # the cluster's own bonds, which set the scale
        for i, j in gaps:
            # A stand-in between the two, dropped below.
            stand_in = mol.AddAtom(templates[0])
            mol.AddBond(index[i], stand_in, Chem.BondType.SINGLE)
            mol.AddBond(index[j], stand_in, Chem.BondType.SINGLE)
            all_ends += [(index[i], stand_in), (index[j], stand_in)]
        for atom in group:
            for _ in range(self.room_kept.get(atom, 0)):
                # A stand-in for the partner in another cluster, dropped below: the depiction
                # keeps a bond's room for it.
                stand_in = mol.AddAtom(templates[0])
                mol.AddBond(index[atom], stand_in, Chem.BondType.SINGLE)
                all_ends.append((index[atom], stand_in))
        slots = {}   # holder's index -> the stand-in for its travelling hydrogen, dropped below
        for atom in group:
            if atom in self.fed_slots:
                slots[index[atom]] = mol.AddAtom(templates[0])
                mol.AddBond(index[atom], slots[index[atom]], Chem.BondType.SINGLE)
                all_ends.append((index[atom], slots[index[atom]]))
        mol.UpdatePropertyCache(strict=False)
        Chem.FastFindRings(mol)
        rings = mol.GetRingInfo()
        wanted = dict(self.written_double)
        wanted.update({pair: (a, b, False) for pair, (a, b, _) in self.chain_double.items()
                       if panels is not None and any(k in panels for k in _)})
        for (i, j), (a, b, cis) in wanted.items():
            # RDKit's depictor draws a double bond cis or trans when its bond says so.
            bond = mol.GetBondBetweenAtoms(index[i], index[j]) if i in index and j in index else None
            if bond is not None and a in index and b in index and bond.GetBondType() == Chem.BondType.DOUBLE:
                if panels is not None and not any(self.orders_in[k].get((i, j)) == 2 for k in panels):
                    continue   # double only in other panels (a ring opening's new alkene): not this run's to draw
                if (i, j) not in self.written_double and rings.NumBondRings(bond.GetIdx()):
                    continue   # a chain alkene in the ring these bonds close (a triene curled to cyclise): cis
                if not cis and rings.NumBondRings(bond.GetIdx()) and rings.MinBondRingSize(bond.GetIdx()) <= 7:
                    # A trans double bond in a ring of seven or fewer (an E dienophile inside the
                    # ring its adduct closes) cannot be drawn: asked for, RDKit folds the ring. The
                    # panels where it is a chain alkene get a depiction of their own (_phases).
                    continue
                bond.SetStereoAtoms(index[a] if bond.GetBeginAtomIdx() == index[i] else index[b],
                                    index[b] if bond.GetBeginAtomIdx() == index[i] else index[a])
                bond.SetStereo(Chem.BondStereo.STEREOCIS if cis else Chem.BondStereo.STEREOTRANS)
        for atom in straight:   # the depictor draws an atom straight (a nitrile, an alkyne, an allene) only if told
            mol.GetAtomWithIdx(index[atom]).SetHybridization(Chem.HybridizationType.SP)
        # The symmetrised SSSR, which the depictor reads, is also kept in the Mol's ring info:
        # read back from there as tuples, as RDKit's own vector of rings iterates in Python.
        Chem.GetSymmSSSR(mol)
        smallest = [list(r) for r in mol.GetRingInfo().AtomRings()]
        self.rings += [ring for ring in ([group[k] for k in r] for r in smallest if max(r) < len(group))
                       if ring not in self.rings]   # (a ring through a stand-in is not one of the scheme's)
        rdDepictor.Compute2DCoords(mol, canonOrient=True)   # compute_layout chose RDKit's own depictor
        # All positions in one call: asking the conformer atom by atom costs more than the sums.
        xyz = mol.GetConformer().GetPositions().tolist()
        # (Only for one panel's depiction: a longer run whose bonds put an atom inside a ring is
        # cut short in _phases, and the union of every panel's bonds, a cage where a ring grows,
        # is there to be judged uneven and redrawn run by run.)
        own_rings = [r for r in smallest if max(r) < len(group)] if panels is not None and len(panels) == 1 else []
        if own_rings and _any_inside_ring([complex(x, y) for x, y, _ in xyz], own_rings, range(len(group))):
            # RDKit's own depictor sets a substituent of a carbon shared by a three-membered and a
            # larger ring inside the larger one (the silyloxy group of an epoxidised silyl enol
            # ether); coordgen, RDKit's other depictor, draws it outside. Taken only where it
            # draws every bond at one length with no atom inside a ring.
            rdDepictor.SetPreferCoordGen(True)
            try:
                rdDepictor.Compute2DCoords(mol, canonOrient=True)
            finally:
                rdDepictor.SetPreferCoordGen(False)
            other = mol.GetConformer().GetPositions().tolist()
            lengths = [_distance(other[a], other[b]) for a, b in ends]
            mean = sum(lengths) / len(lengths) if lengths else 1.0
            if mean > 1e-9 and all(abs(x / mean - 1.0) <= 0.02 for x in lengths) \
                    and not _any_inside_ring([complex(x, y) for x, y, _ in other], own_rings, range(len(group))):
                xyz = other
        lengths = [_distance(xyz[a], xyz[b]) for a, b in ends]
        scale = 1.0 / (sum(lengths) / len(lengths)) if lengths and sum(lengths) > 1e-9 else 1.0   # (no bond: no scale)
        xs, ys = [p[0] for p in xyz], [p[1] for p in xyz]
        # y is flipped: RDKit's y grows upwards, ours downwards.
        points = np.array([complex(x * scale, -y * scale) for x, y in zip(xs, ys)])
        # A bond lies on a ring exactly when it lies on one of the smallest set of rings (they span
        # every cycle): read off their atom lists, without a call into RDKit per bond.
        in_ring = {(min(a, b), max(a, b)) for r in smallest for a, b in zip(r, r[1:] + r[:1])}
        for centre, slot in slots.items():
            fed = {index[x] for x in self.fed_slots[group[centre]] if x in index
                   and mol.GetBondBetweenAtoms(centre, index[x]) is not None}
            if fed:
                points = slot_beside(points, all_ends, in_ring, centre, slot, fed)
        points = ease_clashes(draw_cages_in_perspective(points, all_ends), all_ends, in_ring).tolist()
        return {atom: points[k] for atom, k in index.items()}

    def _linear(self, atom: int, panels: Optional[range] = None) -> bool:
        """Over `panels` (all by default): two bonds, one of them triple, or both double in one
        state: an sp atom. (An enolate carbon is double-bonded to C and to O, but never at once;
        a nitronium N, straight until an arene bonds to it, is not straight over every panel.)"""
        if atom not in self.may_bend:
            return False
        panels = panels or range(self.n)
        key = (atom, panels.start, panels.stop)
        linear = self.sp_atoms.get(key)
        if linear is None:
            pairs = [(min(atom, n), max(atom, n)) for n in self.neighbours[atom] if self.element[n] != 1]
            if len(pairs) >= 2 and len(panels) < self.n:   # (fewer than two: never straight)
                pairs = [pair for pair in pairs if any(pair in self.bonds_in[k] for k in panels)]
            linear = False
            if len(pairs) == 2:
                # (one loop over the panels, not a generator per test: asked a few hundred times a figure)
                first, second = pairs
                for k in panels:
                    orders = self.orders_in[k]
                    a, b = orders.get(first), orders.get(second)
                    if a == 3 or b == 3 or (a == 2 and b == 2) or (
                            (a, b) in ((2, 1), (1, 2)) and self._vinyl_cation(atom, k)):
                        linear = True
                        break
            self.sp_atoms[key] = linear
        return linear

    def _vinyl_cation(self, atom: int, k: int) -> bool:
        """Whether the atom is a cation with no electrons of its own and no hydrogen in state k:
        beside a double bond and one single bond, a vinyl cation, which is linear (the allenyl
        cation of a Meyer-Schuster rearrangement, C=C=C+-Ph; common practice)."""
        state = self.states[k]
        return (atom < len(state.nonbonding) and state.formal_charge(atom) > 0 and not state.nonbonding[atom]
                and not state.mol.GetAtomWithIdx(atom).GetTotalNumHs(includeNeighbors=True))

    def _bends(self, group: list[int]) -> bool:
        """Whether an atom of the group is straight (sp) in some panel but not over all of them:
        one of `may_bend` with two bonds only in that panel, or one that keeps its two bonds and
        is bent in another panel (the diazonium's inner N, bent by its lone pair in the azo
        compound that the coupling makes)."""
        for atom in self.may_bend.intersection(group):
            pairs = [(min(atom, n), max(atom, n)) for n in self.neighbours[atom] if self.element[n] != 1]
            if len(pairs) == 2:
                straight = [self._linear(atom, range(k, k + 1)) for k in range(self.n)
                            if all(pair in self.bonds_in[k] for pair in pairs)]
                if any(straight) and not all(straight):
                    return True
                continue
            for k in range(self.n):
                here = [pair for pair in pairs if pair in self.bonds_in[k]]
                if len(here) == 2 and self._linear(atom, range(k, k + 1)):
                    return True
        return False

    def _heavy_bonds(self, atom: int, k: int) -> set[tuple[int, int]]:
        return {(min(atom, n), max(atom, n)) for n in self.neighbours[atom] if self.element[n] != 1
                and (min(atom, n), max(atom, n)) in self.bonds_in[k]}

    def _bent_where_straight(self, local: dict[int, complex], group: list[int]) -> bool:
        """Whether `local` bends an atom at its two bonds of a panel in which it is sp: the union
        of all bonds can close a ring through it (the azide's middle nitrogen, in the ring that
        the P-N bonds of a Staudinger reaction make over the mechanism)."""
        members = set(group)
        for atom in group:
            partners = [n for n in self.neighbours[atom] if n in members and self.element[n] != 1]
            if len(partners) < 2 or not self._linear(atom):
                continue
            for k in range(self.n):
                pair = [n for n in partners if (min(atom, n), max(atom, n)) in self.bonds_in[k]]
                if len(pair) == 2 and self._linear(atom, range(k, k + 1)):
                    turn = (local[pair[0]] - local[atom]) / (local[pair[1]] - local[atom])
                    if abs(cmath.phase(turn)) < math.radians(175):
                        return True
        return False

    def _holder(self, k: int, h: int) -> Optional[int]:
        return self.holders[k].get(h)

    def _residences(self) -> dict[int, list[_Residence]]:
        out: dict[int, list[_Residence]] = {}
        for h in sorted(self.bridging):
            runs: list[_Residence] = []
            for k in range(self.n):
                # Released panels count too: a hydrogen that leaves with a fragment still
                # ties the fragment's placement to the step it leaves in.
                if h >= len(self.states[k].elements):
                    continue
                holder = self._holder(k, h)
                if runs and runs[-1].holder == holder and runs[-1].last == k - 1:
                    runs[-1].last = k
                else:
                    runs.append(_Residence(h, holder, k, k))
            out[h] = runs
        return out

    def _segments(self, index: int) -> list[tuple[int, int]]:
        """Runs of panels in which the cluster must stay put: it may move between panels k and
        k+1 only if the step between them touches every atom of it (and every travelling
        hydrogen it holds throughout), or if it joins another molecule in that step."""
        atoms = set(self.clusters[index].atoms)
        present = [k for k in range(self.n) if atoms & self.exists[k]]
        segments: list[tuple[int, int]] = []
        for k in present:
            if segments and segments[-1][1] == k - 1 and not self._movable(atoms, k - 1):
                segments[-1] = (segments[-1][0], k)
            else:
                segments.append((k, k))
        return segments

    def _movable(self, atoms: set[int], k: int) -> bool:
        """A travelling hydrogen held throughout counts only if it is drawn on both panels (it is
        drawn only next to the steps that move it: it arrived at step k-1 and leaves at k+1)."""
        shown = {r.hydrogen for runs in self.residences.values() for r in runs
                 if r.holder in atoms and r.first == k and r.last == k + 1}
        here = (atoms & self.exists[k] & self.exists[k + 1]) | shown
        if not here:
            return False
        if here <= self.touched[k]:
            return True
        # A part of a joining molecule moves with it, as a rigid body: not while it hangs, by a
        # bond the step leaves alone, on an atom of the skeleton that stays put (the chlorine of
        # a Darzens ester whose carbon the ketone bonds to keeps its place).
        return here <= self.joining[k] and not self._held_by_skeleton(atoms, k)

    def _cluster_hops(self, index: int) -> list[tuple[int, int, int, Optional[int]]]:
        """(panel, its atom, the partner's atom, hydrogen) for each proton hop between cluster
        `index` and another cluster, in the order of the events."""
        atoms = set(self.clusters[index].atoms)
        return [(panel, a, b, h) if a in atoms else (panel, b, a, h) for panel, kind, a, b, h in self.events
                if kind == "hop" and (a in atoms) != (b in atoms)]

    def _trader(self, index: int) -> bool:
        """Whether cluster `index` is an acid or base: not the skeleton, it only ever trades
        protons with other clusters (no bond joins it to one in any panel)."""
        atoms = set(self.clusters[index].atoms)
        return index != self.main and all(kind == "hop" for _, kind, a, b, _ in self.events
                                          if (a in atoms) != (b in atoms))

    def _stranded(self, index: int, segment: tuple[int, int], rotation: complex, shift: complex) -> bool:
        """Whether cluster `index`, placed so over `segment`, would stand out of an arrow's reach
        of a partner it trades a proton with there (the two heavy atoms further apart than
        PARTNER_REACH allows by half a bond length), or behind a bond of neither (the line
        between them crosses it)."""
        cluster = self.clusters[index]
        mine_atoms = set(cluster.atoms)
        for panel, mine, other, _ in self._cluster_hops(index):
            if not segment[0] <= panel <= segment[1]:
                continue
            here = self.positions[panel]
            if other not in here:
                continue
            p, q = shift + rotation * cluster.local_at(panel)[mine], here[other]
            if abs(p - q) > PARTNER_REACH[1] + 0.5 or any(
                    segments_cross(p, q, here[i], here[j]) for i, j in self.bonds_in[panel]
                    if i in here and j in here and other not in (i, j) and i not in mine_atoms and j not in mine_atoms):
                return True
        return False

    def _split_at_trades(self, index: int, segment: tuple[int, int]) -> None:
        """Cut the run of panels `segment` of an acid or base after each step in which it trades
        a proton: it is redrawn then, as a rigid body, beside the partner of its next turn (a base
        that takes protons from two far-apart places waits beside each in turn, as chemists draw
        it, instead of halfway between with its arrows across the molecule)."""
        cluster = self.clusters[index]
        cuts = sorted({panel + 1 for panel, _, _, _ in self._cluster_hops(index) if segment[0] <= panel < segment[1]})
        pieces = list(zip([segment[0]] + cuts, [c - 1 for c in cuts] + [segment[1]]))
        at = cluster.segments.index(segment)
        cluster.segments[at:at + 1] = pieces
        cluster.redrawn.update(cuts)
        for piece in pieces:
            for panel in range(piece[0], piece[1] + 1):
                cluster.segment_at[panel] = piece

    def _held_by_skeleton(self, atoms: set[int], k: int) -> bool:
        """Whether an untouched atom of `atoms` (which carries no other cluster) is bonded, in
        panels k and k+1, to an atom of the main cluster that is drawn in one place in both (the
        main cluster is never moved as a whole; a ring redrawn or opened moves its own atoms)."""
        main = self.clusters[self.main]
        if any(n not in atoms and n not in main.atoms and self.element[n] != 1
               and (min(a, n), max(a, n)) in self.bonds_in[k + 1] for a in atoms for n in self.neighbours[a]):
            return False   # it carries another cluster, which is placed on it afresh: it may turn to make room
        for a in atoms - self.touched[k]:
            for n in self.neighbours[a]:
                pair = (min(a, n), max(a, n))
                if n in main.atoms and n not in atoms and pair in self.bonds_in[k] and pair in self.bonds_in[k + 1] \
                        and abs(self._skeleton_at(n, k) - self._skeleton_at(n, k + 1)) < 1e-9:
                    return True
        return False

    def _skeleton_at(self, atom: int, k: int) -> complex:
        """Where the main cluster draws `atom` in panel k, before any ring is opened by a swing."""
        main = self.clusters[self.main]
        where = main.local_at(k)[atom]
        for atoms, first, last, offset in main.openings:
            if first <= k <= last and atom in atoms:
                where += offset
        return where

    # placing clusters
    def _segment_of(self, index: int, k: int) -> Optional[tuple[int, int]]:
        return self.clusters[index].segment_at.get(k)

    def _placed_at(self, index: int, k: int) -> bool:
        cluster = self.clusters[index]   # (_segment_of, in line: asked for every event, again and again)
        seg = cluster.segment_at.get(k)
        return seg is not None and seg[0] in cluster.placement

    def _apply(self, index: int) -> None:
        cluster = self.clusters[index]
        for start, end in cluster.segments:
            if start not in cluster.placement:
                continue
            rotation, shift = cluster.placement[start][:2]
            for k in range(start, end + 1):
                local = cluster.local_at(k)
                for atom in cluster.atoms:
                    if atom in self.exists[k]:
                        self.positions[k][atom] = shift + rotation * local[atom]
                for atoms, first, last, offset in cluster.openings:
                    if first <= k <= last:
                        for atom in atoms & self.exists[k]:
                            self.positions[k][atom] += rotation * offset

    def _events(self) -> list[tuple[int, str, int, int, Optional[int]]]:
        """(panel, kind, atom a, atom b, hydrogen) in the order they happen: a bond to a leaving
        fragment that exists in panel k, or a hydrogen leaving atom a for atom b at step k."""
        events = []
        for k in range(self.n):
            for i, j in sorted(self.bonds_in[k]):
                # (both drawn there: a by-product left out of the last panel places nothing)
                if i in self.cluster_of and j in self.cluster_of and self.cluster_of[i] != self.cluster_of[j] \
                        and i in self.exists[k] and j in self.exists[k]:
                    events.append((k, "bond", i, j, None))
        for h, runs in self.residences.items():
            for before, after in zip(runs, runs[1:]):
                if before.holder is not None and after.holder is not None and after.first == before.last + 1:
                    events.append((before.last, "hop", before.holder, after.holder, h))
        for k, donor, acceptor in self.transfers:
            if donor in self.cluster_of and acceptor in self.cluster_of and self.cluster_of[donor] != self.cluster_of[acceptor]:
                events.append((k, "transfer", acceptor, donor, None))
        return sorted(events, key=lambda e: (e[0], e[1] != "bond", e[2], e[3]))

    def _place_by_events(self, kinds: tuple[str, ...]) -> bool:
        """Place every unplaced run of panels that an event of these kinds ties to a placed
        cluster."""
        progress = False
        # Bonds first: the skeleton decides where there is room; hydrogens and the partners
        # they travel to take what is left. (The events are fixed: sorted once per choice of kinds.)
        if kinds not in self.events_in_order:
            self.events_in_order[kinds] = sorted((e for e in self.events if e[1] in kinds),
                                                 key=lambda e: e[1] != "bond")
        for k, kind, a, b, h in self.events_in_order[kinds]:
            ca, cb = self.cluster_of.get(a), self.cluster_of.get(b)
            if ca is None or cb is None or ca == cb:
                continue
            placed_a, placed_b = self._placed_at(ca, k), self._placed_at(cb, k)
            if placed_a == placed_b:
                continue
            anchor, mover = (a, b) if placed_a else (b, a)
            segment = self._segment_of(self.cluster_of[mover], k)
            self._place_segment(self.cluster_of[mover], segment, k, anchor, mover, kind, h)
            if kind == "transfer":
                self._stay_after_transfer(self.cluster_of[mover], segment)
            # Bonds first again: a run placed by a hop may now tie others to it by their bonds.
            return True
        return progress

    def _stay_after_transfer(self, index: int, segment: tuple[int, int]) -> None:
        """A donor that has handed over an electron (Na+) stays where it gave it in the run of
        panels after, placed now so that the molecules placed later keep clear of it, unless it
        gives another there."""
        cluster = self.clusters[index]
        following = next((seg for seg in cluster.segments if seg[0] == segment[1] + 1), None)
        gives_again = following is not None and any(
            kind == "transfer" and following[0] <= k <= following[1] and self.cluster_of.get(donor) == index
            for k, kind, _, donor, _ in self.events)
        if gives_again:
            return   # a metal that gives its second electron (Mg) goes to the atom that takes it
        if following is not None and following[0] not in cluster.placement:
            cluster.placement[following[0]] = cluster.placement[segment[0]]
            self._apply(index)

    def _roomiest(self, atom: int, k: int, hydrogen: Optional[int] = None, prefer: Optional[complex] = None,
                  reach: float = 1.0, also: Sequence[complex] = ()) -> complex:
        """The direction from `atom` with the most room for a new neighbour at `reach`: away from
        its bonds, promised hydrogens and the directions `also`, out of ring interiors, away from
        nearby atoms."""
        here = self.positions[k]
        centre = here[atom]
        taken = np.array([unit(p - centre) for p in self._occupied_around(atom, k, hydrogen)
                          if abs(p - centre) > 1e-9] + list(also), dtype=complex)
        limit = reach + 1.3
        near = np.array([p for a, p in here.items() if abs(p - centre) < limit and a != atom
                         and not self._one_seen(a, hydrogen, atom, k)], dtype=complex)
        bonded = [unit(here[n] - centre) for n in self.neighbours[atom] if n in here and self.element[n] != 1]
        if prefer is not None and any(abs(cmath.phase(prefer / unit(here[n] - centre))) < _BEHIND_A_BOND
                                      for n in self.neighbours[atom] if n in here
                                      and (min(n, atom), max(n, atom)) in self.bonds_in[k]):
            # The partner lies behind one of the atom's own bonds: leaning toward it would only
            # bend the new bond off its ideal angle (the Ei ester's C-H turned 90 degrees from
            # its C-C), and come no nearer.
            prefer = None
        if prefer is None and len(taken) == 1:
            # Straight on from a lone atom's one other partner (the hydrogen it will take), so
            # the three stand in a line instead of a crooked stack.
            prefer = -complex(taken[0])
        spots = centre + _COMPASS * reach
        # numpy's ufuncs called directly (arctan2 is np.angle, minimum.reduce is .min): these
        # arrays hold a few dozen numbers, and the wrappers cost more than the arithmetic.
        if len(taken):
            turns = _COMPASS_COLUMN / taken
            angle = np.minimum.reduce(np.abs(np.arctan2(turns.imag, turns.real)), axis=1)
            score = np.minimum(angle, _SEVENTY) / _SEVENTY
        else:
            score = np.full(len(_COMPASS), 1.0)
        score = score + 0.6 * (np.minimum(np.minimum.reduce(np.abs(spots[:, None] - near), axis=1), 1.2)
                               if len(near) else 1.2)
        if prefer is not None:
            score = score + 0.15 * (_COMPASS * unit(prefer).conjugate()).real   # (Python's conjugate: no ufunc call on one number)
        shut = np.zeros(len(_COMPASS), dtype=bool)
        if (hydrogen, atom) in self.feeds:   # (most placements move no hydrogen whose bond's pair goes on)
            shut = self._fed_shut(hydrogen, atom, k)(_COMPASS)
            score = score - 10.0 * shut
        ideal = self._zigzag(atom, k, bonded)
        if ideal is not None:
            score = score + 0.3 * np.maximum((_COMPASS * ideal.conjugate()).real, 0.0)
        polygons = [[here[a] for a in ring] for ring in self._closed_rings(k)]
        curled = self._curled_rings(hydrogen, k) if hydrogen is not None else []
        if curled:
            # A hydrogen also keeps out of a ring still to close, wherever a spot out of it that
            # its bond's pair leaves open has room for its label (_untangled asks the same).
            others = np.array([p for a, p in here.items() if abs(p - centre) < limit and a not in (atom, hydrogen)
                               and not self._one_seen(a, hydrogen, atom, k)], dtype=complex)
            room = (np.minimum.reduce(np.abs(spots[:, None] - others), axis=1) if len(others)
                    else np.full(len(_COMPASS), math.inf))
            out = [not fed and space >= _ROOM_OUT_OF_CURL
                   and not any(inside_polygon(complex(spot), poly) for poly in curled)
                   for spot, space, fed in zip(spots.tolist(), room.tolist(), shut.tolist())]
            if any(out):
                polygons += curled
                score = score - 10.0 * ~np.array(out)
        # Best first; the first direction that does not point into a closed ring wins (the
        # best is the first highest score, as the stable sort below puts first).
        best = int(score.argmax())   # (the method: np.argmax's wrapper costs more than the search)
        if not any(inside_polygon(complex(spots[best]), poly) for poly in polygons):
            return complex(_COMPASS[best])
        for index in (-score).argsort(kind="stable"):
            if not any(inside_polygon(complex(spots[index]), poly) for poly in polygons):
                return complex(_COMPASS[index])
        return free_direction(centre, [centre + t for t in taken], prefer)

    def _backside_substitutions(self, moves: Sequence[Sequence[ResolvedMove]]) -> dict[tuple[int, int], tuple[int, int]]:
        """(panel of arrival, entering atom) -> (centre, leaving atom) for each step in which one
        single bond to a heavy atom forms at the centre and one single bond from it breaks, the
        two partners not bonded to each other (an SN2, an epoxide or bromonium opening; not a
        1,2-shift, whose group slides between two bonded atoms; not a centre that keeps the
        broken bond's pair for its new bond, as a Grignard carbon does). The nucleophile is drawn
        coming in opposite the leaving group (backside attack, common practice)."""
        out = {}
        for k in range(self.n - 1):
            kept = {(m.source_atoms, m.sink_atoms) for m in moves[k] if m.source_kind == "bond"
                    and len(m.sink_atoms) == 2} if k < len(moves) else set()
            before, after = self.bonds_in[k], self.bonds_in[k + 1]
            gained: dict[int, list[int]] = {}
            lost: dict[int, list[int]] = {}
            for bonds, into in ((after - before, gained), (before - after, lost)):
                for i, j in bonds:
                    into.setdefault(i, []).append(j)
                    into.setdefault(j, []).append(i)
            for centre, entering in gained.items():
                leaving = lost.get(centre, [])
                if len(entering) != 1 or len(leaving) != 1 or self.element[centre] == 1:
                    continue
                e, l = entering[0], leaving[0]
                pairs = [(min(centre, e), max(centre, e)), (min(centre, l), max(centre, l))]
                if (self.element[e] == 1 or self.element[l] == 1 or self.orders_in[k + 1][pairs[0]] != 1
                        or self.orders_in[k][pairs[1]] != 1 or (min(e, l), max(e, l)) in before | after):
                    continue
                if any({*source} == {centre, l} and {*sink} == {centre, e} for source, sink in kept):
                    continue
                out[(k + 1, e)] = (centre, l)
        return out

    def _backside_axis(self, centre: int, k: int, skip: set[int], entering: Optional[int] = None) -> Optional[complex]:
        """The direction for a leaving group at `centre` in panel k such that it and its opposite,
        where the nucleophile comes in, both keep _BACKSIDE_ROOM from the centre's other
        bonds; the leaving group on the right of two equal choices (the scheme reads left to
        right). Straight away from the `entering` atom where that already stands in panel k
        (the phthalimide nitrogen, fixed, that a benzyl bromide waits beside) and the line
        has the room; where it has not (an alkoxide a ring closure holds beside the carbon), a
        direction turned away from that atom. None when no direction does."""
        here = self.positions[k]
        others = [unit(here[n] - here[centre]) for n in self.neighbours[centre]
                  if n not in skip and n in here and n in self.exists[k]]
        if not others:
            return None
        away = None   # straight away from a nucleophile that already stands
        if entering is not None and entering in here and abs(here[centre] - here[entering]) > 1e-9:
            away = unit(here[centre] - here[entering])
            if all(abs(cmath.phase(d / o)) >= _BACKSIDE_ROOM for o in others for d in (away, -away)):
                return away
        def room_at(directions: np.ndarray) -> np.ndarray:
            turns = directions[:, None] / np.array(others)[None, :]
            return np.minimum.reduce(np.abs(np.arctan2(turns.imag, turns.real)), axis=1)
        own, opposite = room_at(_COMPASS), room_at(-_COMPASS)
        room = np.minimum(own, opposite)
        # The leaving group, drawn a bond length out, takes the roomier side of the line; the
        # nucleophile waits further out on the other.
        score = np.minimum(room, _SEVENTY) + 0.1 * (own > opposite) + 0.05 * _COMPASS.real
        if away is not None:
            # A nucleophile that already stands (its own ring about to close, as in an epoxide
            # from a halohydrin) cannot move opposite: the leaving group turns away from it, so the
            # panel reads as a backside attack, not a front-side one.
            score = score + 2.0 * (((_COMPASS / away).real > 0) & (room >= _BACKSIDE_ROOM))
        best = int(np.argmax(score))
        return complex(_COMPASS[best]) if room[best] >= _BACKSIDE_ROOM else None

    def _shifts_with_leaving_group(self) -> Iterator[tuple[int, int, int, int, int]]:
        """(step, migrating atom, origin, terminus, leaving atom) for each 1,2-shift whose terminus
        loses a heavy leaving group in the same step (Lossen, Curtius, Beckmann, Baeyer-Villiger):
        the migrating atom leaves the origin for the terminus, the two staying bonded."""
        for k in range(self.n - 1):
            made, broken, bonded = self.made[k], self.broken[k], self.bonds_in[k] & self.bonds_in[k + 1]
            for bond in made:
                for terminus, group in (bond, bond[::-1]):
                    for origin in self.neighbours[group]:
                        if (min(origin, group), max(origin, group)) not in broken \
                                or (min(origin, terminus), max(origin, terminus)) not in bonded:
                            continue
                        for leaving in self.neighbours[terminus]:
                            if leaving not in (origin, group) and self.element[leaving] != 1 \
                                    and (min(terminus, leaving), max(terminus, leaving)) in broken:
                                yield k, group, origin, terminus, leaving

    def _leaving_groups_anti_to_shifts(self) -> None:
        """A leaving group drawn on the migrating group's side of the line through the origin and
        the terminus of a 1,2-shift is mirrored across that line, with everything it carries: the
        group then migrates onto the backside of the breaking bond, anti-periplanar to it (common
        practice for the Lossen, Hofmann, Curtius and Beckmann rearrangements). The depiction of
        a molecule does not know it (the Lossen's acetate stood beside the methyl); a leaving
        group placed as a cluster of its own is turned so already (_backside_axis). Only where
        nothing but the leaving branch moves, and the mirrored branch keeps clear of everything
        else in every panel it stands in."""
        for k, group, origin, terminus, leaving in self._shifts_with_leaving_group():
            here = self.positions[k]
            if any(a not in here for a in (group, origin, terminus, leaving)):
                continue
            along = unit(here[terminus] - here[origin])
            sides = [((here[a] - b) / along).imag for a, b in ((group, here[origin]), (leaving, here[terminus]))]
            if sides[0] * sides[1] <= 0 or min(abs(sides[0]), abs(sides[1])) < 0.1:
                continue   # already anti, or on the line (no side to leave from)
            branch = self._branch_beyond(leaving, terminus, k)
            if branch is None or {group, origin} & branch:
                continue   # the leaving group is held in a ring: it cannot turn over alone
            mirrored = {a: here[origin] + along * ((here[a] - here[origin]) / along).conjugate() for a in branch}
            moves = self._carry_mirror(branch, k, leaving, mirrored, (origin, terminus))
            if moves is not None:
                for p, spots in moves.items():
                    self.positions[p].update(spots)

    def _branch_beyond(self, start: int, cut: int, k: int) -> Optional[set[int]]:
        """The placed atoms bonded to `start` in panel k through any way that does not pass `cut`
        (with `start`); None when `cut` is reached again (a ring through both)."""
        here, found, queue = self.positions[k], {start}, [start]
        while queue:
            atom = queue.pop()
            for n in self.neighbours[atom]:
                if n in found or n not in here or (min(atom, n), max(atom, n)) not in self.bonds_in[k]:
                    continue
                if n == cut:
                    if atom != start:
                        return None
                    continue
                found.add(n)
                queue.append(n)
        return found

    def _carry_mirror(self, branch: set[int], k: int, leaving: int, mirrored: dict[int, complex],
                      fixed: tuple[int, int]) -> Optional[dict[int, dict[int, complex]]]:
        """panel -> new positions of `branch` for drawing it `mirrored` in panel k: also in each
        earlier panel that draws it, and the `fixed` atoms, where panel k does (so nothing moves
        across an earlier step), and in each later panel that draws it as a rigid copy of panel
        k's (it stays mirrored as it goes, a by-product set aside). None where another panel
        draws it otherwise, or the mirrored branch comes within _CROWDED_MIRROR of another atom,
        crosses a bond or stands inside a ring."""
        here = self.positions[k]
        moves: dict[int, dict[int, complex]] = {}
        for p in range(self.n):
            there = self.positions[p]
            shown = [a for a in branch if a in there]
            if not shown:
                continue
            if len(shown) < len(branch):
                return None
            if p <= k:
                if p < k and any(abs(there[a] - here[a]) > 1e-9 for a in [*branch, *fixed]):
                    return None
                moves[p] = dict(mirrored)
            else:
                if len(branch) == 1:   # (one atom: carried along as it is)
                    turn = 1
                else:
                    moved = _rigid_move(here, there, [leaving, *sorted(branch - {leaving})])
                    if moved is None:
                        return None
                    turn = moved[0]
                moves[p] = {a: there[leaving] + turn * (mirrored[a] - here[leaving]) for a in branch}
        last = [[i for i in m if i in self.positions[-1]] for m in self.molecules[-1]]
        last = [m for m in last if m]
        # A by-product at the end is set beside the product later: where it stands now is no matter.
        set_aside = len(last) > 1 and branch.isdisjoint(self._product_of(last)) and any(branch <= set(m) for m in last)
        for p, spots in moves.items():
            if set_aside and p == self.n - 1:
                continue
            there = self.positions[p]
            rest = np.array([z for a, z in there.items() if a not in branch], dtype=complex)
            new = np.array(list(spots.values()), dtype=complex)
            if len(rest) and np.abs(new[:, None] - rest[None, :]).min() < _CROWDED_MIRROR:
                return None
            if any_inside_polygons(list(spots.values()), [[there[a] for a in ring] for ring in self._closed_rings(p)
                                                         if not branch & set(ring)]):
                return None
            if self._bonds_cross({**there, **spots}, self.bonds_in[p]):
                return None
        return moves

    def _fed_directions(self, hydrogen: Optional[int], holder: int, k: int) -> list[complex]:
        """From `holder`, the directions to the atoms whose bond to it the pair of its bond to
        `hydrogen` goes into: the arrow between the two bonds needs the open angle between them
        (in a tight angle it is a knot over the holder)."""
        here = self.positions[k]
        return [unit(here[x] - here[holder]) for x in self.feeds.get((hydrogen, holder), ()) if x in here]

    def _fed_shut(self, hydrogen: Optional[int], holder: int, k: int,
                  relax: bool = True) -> Callable[[np.ndarray], np.ndarray]:
        """Which directions from `holder` (an array) are shut to `hydrogen` because the pair of
        their bond goes into the next bond of the holder: nearer that bond than _FED_ANGLE (the
        arrow would be a knot over the holder). Where every such wide spot out of the holder's
        rings either has another bond of the holder between it and the fed bond (the arrow
        crosses it) or stands squeezed against one (_SQUEEZED), as round a carbon with three
        other bonds, the hydrogen goes in the gap beside the fed bond instead (an E1 or an
        arenium ion's proton loss drawn so, common practice): nearer than _NEAR_FED_ANGLE, or
        with a bond in the way, is shut. Only where that gap has a spot with room for the
        hydrogen (_HYDROGEN_ROOM), and the atom that takes it is of another molecule, which can
        come round to it (_taken_within); and not without `relax`."""
        fed = self._fed_directions(hydrogen, holder, k)
        if not fed:
            return lambda directions: np.zeros(len(directions), dtype=bool)
        here = self.positions[k]
        others = np.array([unit(here[x] - here[holder]) for x in self.neighbours[holder]
                           if x != hydrogen and x in here and self.element[x] != 1
                           and (min(x, holder), max(x, holder)) in self.bonds_in[k]
                           and x not in self.feeds[(hydrogen, holder)]], dtype=complex)
        fed_array = np.array(fed, dtype=complex)

        def angles(directions: np.ndarray, to: np.ndarray) -> np.ndarray:
            turns = directions[:, None] / to[None, :]
            return np.arctan2(turns.imag, turns.real)

        def near(directions: np.ndarray, limit: float) -> np.ndarray:
            return (np.abs(angles(directions, fed_array)) < limit).any(axis=1)

        def across(directions: np.ndarray) -> np.ndarray:
            """Another bond of the holder lies in the angle between the direction and a fed bond."""
            if not len(others):
                return np.zeros(len(directions), dtype=bool)
            mine = angles(directions, fed_array)[:, :, None]              # (directions, fed, 1)
            theirs = angles(others, fed_array).T[None, :, :]              # (1, fed, others)
            return ((np.sign(mine) == np.sign(theirs)) & (np.abs(theirs) < np.abs(mine))).any(axis=(1, 2))

        def wide(directions: np.ndarray) -> np.ndarray:
            return near(directions, _FED_ANGLE)

        if not relax or len(others) < 2 or self._taken_within(hydrogen, holder, k):
            return wide
        centre = here[holder]
        polygons = [[here[a] for a in ring] for ring in self._closed_rings(k)]

        def outside(wanted: np.ndarray) -> np.ndarray:
            """`wanted` less the directions into a closed ring (only the wanted ones are tested)."""
            if not polygons:
                return wanted
            return np.array([w and not any(inside_polygon(centre + d, poly) for poly in polygons)
                             for w, d in zip(wanted.tolist(), _COMPASS.tolist())])

        off_bonds = np.abs(angles(_COMPASS, others)).min(axis=1)
        across_compass = across(_COMPASS)
        open_wide = outside(~wide(_COMPASS) & ~across_compass & (off_bonds >= _SQUEEZED))
        if open_wide.any():
            return wide
        # The atoms two bonds off (a label on the next carbon): the hydrogen's own partners
        # are kept off by the angles, other molecules move aside later.
        bonded = [x for x in self.neighbours[holder]
                  if x in here and (min(x, holder), max(x, holder)) in self.bonds_in[k]]
        crowd = np.array([here[y] for x in bonded for y in self.neighbours[x]
                          if y in here and y not in (holder, hydrogen) and y not in bonded and self.element[y] != 1
                          and (min(x, y), max(x, y)) in self.bonds_in[k]], dtype=complex)
        room = (np.abs(centre + _COMPASS[:, None] - crowd[None, :]).min(axis=1) if len(crowd)
                else np.full(len(_COMPASS), math.inf))
        open_near = outside(~near(_COMPASS, _NEAR_FED_ANGLE) & ~across_compass & (off_bonds >= _OFF_A_BOND)
                            & (room >= _HYDROGEN_ROOM))
        if not open_near.any():
            # A ring-fusion carbon (every gap beside the fed bond inside a ring), or a gap too
            # narrow or crowded for the hydrogen's label.
            return wide

        def beside(directions: np.ndarray) -> np.ndarray:
            return near(directions, _NEAR_FED_ANGLE) | across(directions)
        return beside

    def _taken_within(self, hydrogen: Optional[int], holder: int, k: int) -> bool:
        """Whether the atom that takes `hydrogen` from `holder` next belongs to the holder's own
        molecule in panel k (a sulfonium ylide's CH2 taking the H of a Swern oxidation): that
        partner cannot come round to whichever gap the hydrogen stands in."""
        runs = getattr(self, "residences", {}).get(hydrogen, []) if hydrogen is not None else []
        later = [r.holder for r in runs if r.first > k and r.holder is not None]
        now = [r for r in runs if r.first <= k <= r.last and r.holder == holder]
        if not now or not later:
            return False
        return any(holder in m and later[0] in m for m in self.molecules[k])

    def _zigzag(self, atom: int, k: int, taken: Sequence[complex] = ()) -> Optional[complex]:
        """For an atom with one bond: the direction that continues a zigzag chain (parallel to
        the bond before its neighbour), or 120 degrees from that bond if there is no chain; of the
        two, only one that no direction in `taken` (a bond to come, a promised hydrogen) holds."""
        here = self.positions[k]
        bonded = [n for n in self.neighbours[atom] if n in here and (min(atom, n), max(atom, n)) in self.bonds_in[k]
                  and self.element[n] != 1]
        if len(bonded) != 1:
            return None
        neighbour = bonded[0]
        back = unit(here[neighbour] - here[atom])
        before = [n for n in self.neighbours[neighbour] if n != atom and n in here and self.element[n] != 1
                  and (min(neighbour, n), max(neighbour, n)) in self.bonds_in[k]]
        options = [d for d in (back * cmath.rect(1.0, 2 * math.pi / 3), back * cmath.rect(1.0, -2 * math.pi / 3))
                   if all(abs(cmath.phase(d / t)) > _SIXTY for t in taken)]
        if not options:
            return None
        if before:
            chain = unit(here[neighbour] - here[before[0]])
            return max(options, key=lambda d: (d / chain).real)
        return options[0]

    def _closed_rings(self, k: int) -> list[list[int]]:
        """Rings of the depiction whose every bond exists in panel k (an open ring's mouth is
        free space)."""
        if k not in self.rings_bonded:   # the rings and bonds are settled before any placement asks
            self.rings_bonded[k] = [ring for ring in self.rings if all(
                (min(a, b), max(a, b)) in self.bonds_in[k] for a, b in zip(ring, ring[1:] + ring[:1]))]
        return [ring for ring in self.rings_bonded[k] if all(a in self.positions[k] for a in ring)]

    def _curled_rings(self, hydrogen: int, k: int) -> list[list[complex]]:
        """The outlines in panel k of the rings of the depiction that are still open there but
        that the hydrogen's molecule draws curled into shape (a chain drawn as the ring it will
        close): a hydrogen inside points into the ring, and the arrow of the base that takes it
        crosses the chain (common practice: a ring atom's H is drawn outside the ring). Not a
        ring through another atom that holds the hydrogen over the mechanism (a proton passed
        across the ring faces its partner there)."""
        here = self.positions[k]
        closed = self._closed_rings(k)
        holders = {r.holder for r in self.residences.get(hydrogen, ())}
        outlines = []
        for ring in self.rings:
            if (ring in closed or not all(a in here for a in ring) or len(holders & set(ring)) > 1
                    or any(self.element[a] == 1 for a in ring)):
                continue   # (a ring through a hydrogen is one a proton passes round, not a chain's)
            if not any(set(ring) <= set(m) for m in self.molecules[k]):
                continue   # (a ring two species will close: the space between them is the arrows')
            points = [here[a] for a in ring]
            middle = sum(points) / len(points)
            # Curled: every atom near the circle of the regular ring (a zigzag chain is not).
            if max(abs(q - middle) for q in points) <= _CURLED_REACH / (2 * math.sin(math.pi / len(ring))):
                outlines.append(points)
        return outlines

    def _occupied_around(self, atom: int, k: int, hydrogen: Optional[int] = None) -> list[complex]:
        """Positions around `atom` in panel k that a new neighbour must avoid: its union
        neighbours, atoms closer than 1.1 bond lengths, and directions promised to hydrogens."""
        centre = self.positions[k][atom]
        around = [self.positions[k][n] for n in self.neighbours[atom] if n in self.positions[k]
                  and not self._one_seen(n, hydrogen, atom, k)]
        around += [p for a, p in self.positions[k].items() if a != atom and 1e-6 < abs(p - centre) < 1.1
                   and not self._one_seen(a, hydrogen, atom, k)]
        for runs in self.residences.values():
            for r in runs:
                if r.holder == atom and r.direction is not None and r.hydrogen != hydrogen:
                    around.append(centre + r.direction)
        return around

    def _place_segment(self, index: int, segment: tuple[int, int], k: int, anchor: int, mover: int, kind: str,
                       hydrogen: Optional[int]) -> None:
        cluster = self.clusters[index]
        if kind == "bond" and (kept := self._kept_in_place(index, segment)) is not None:
            cluster.placement[segment[0]] = kept
            self._apply(index)
            return
        residence = self._residence_at(hydrogen, anchor, k) if hydrogen is not None else None
        leaves = [e for (arrival, e), (centre, l) in self.backside.items()
                  if kind == "bond" and centre == anchor and l == mover and arrival == segment[1] + 1]
        axis = self._backside_axis(anchor, k, {mover, leaves[0]}, entering=leaves[0]) if leaves else None
        if residence is not None and residence.direction is not None and residence.last == k:
            u = residence.direction
        elif axis is not None:
            u = axis   # the leaving group on a line through the centre that the nucleophile can come in on
        elif kind == "bond" and anchor in self.room_kept and mover in self.room_kept:
            # Straight into the room its depiction kept for this bond (two crosses meet eclipsed,
            # as chemists draw a pinacol: each branch a bond length from its twin).
            u = free_direction(self.positions[k][anchor], [self.positions[k][n] for n in self.neighbours[anchor]
                                                           if n in self.positions[k] and self.element[n] != 1])
        elif kind == "bond" and (across := self._four_centre_side(anchor, mover, k)) is not None:
            u = across
        elif kind == "bond" and len(others := [self.positions[k][n] for n in self.neighbours[anchor]
                                                 if n in self.positions[k] and n != mover]) == 2 \
                and self._shifts_off(anchor, mover, segment[1]):
            # A group about to shift from a trigonal centre to its neighbour stands 120 degrees
            # round from both its bonds, so the arrow of its shift arcs round the outside, as
            # chemists draw a 1,2-shift (it leaned onto the neighbour, the arrow bulging inward).
            u = free_direction(self.positions[k][anchor], others)
        elif kind == "bond" and len(others) == 3 and (target := self._shifts_to(anchor, mover, segment[1])) is not None \
                and target in self.positions[k]:
            # From a tetrahedral centre, into a gap beside the neighbour it shifts to: drawn
            # opposite that neighbour, its arrow had to run round the centre, over a bond (a
            # methyl shifting in a Wagner-Meerwein rearrangement).
            u = gap_beside(self.positions[k][anchor], others, self.positions[k][target])
        elif kind == "bond" and (across := self._crosses_to(anchor, mover, segment)) is not None:
            # A group about to cross from the anchor to an atom of another molecule (the MgBr of a
            # Grignard reagent to the nitrile's nitrogen, through a four-membered ring) stands in
            # the anchor's gap facing that atom, so its arrow and the bond's are short.
            here = self.positions[k]
            u = gap_facing(here[anchor], [here[n] for n in self.neighbours[anchor] if n in here and n != mover
                                          and (min(n, anchor), max(n, anchor)) in self.bonds_in[k]], across)
        elif kind == "bond" and len(cluster.atoms) == 1 and (giver := self._gives_hydrogen_to(mover, segment)) is not None:
            # A lone atom that takes a hydrogen as the run ends (a chloride of AlCl4- taking the
            # arenium's proton) bonds on the side facing the atom it takes it from.
            here = self.positions[k]
            u = gap_facing(here[anchor], [here[n] for n in self.neighbours[anchor] if n in here and n != mover
                                          and (min(n, anchor), max(n, anchor)) in self.bonds_in[k]],
                           self.positions[segment[1]][giver])
        elif kind == "bond" and (middle := self._beside_fed_hydrogen(anchor, mover, k)) is not None:
            u = middle
        else:
            u = self._roomiest(anchor, k, hydrogen, also=self._bonds_while_waiting(anchor, mover, k, kind)
                                                      + self._left_standing_by(anchor, mover, k, kind, cluster.atoms))
        # (with its partners held apart as this panel draws them: an acetal carbon held off the
        # diol it closes a ring with, placed a bond length from the methoxy that leaves it, came
        # out that opening's length further off, its bond drawn 2.38 bond lengths long)
        depicted = cluster.held_off_at(k)
        placed = [self.positions[k][n] for n in self.neighbours[anchor]
                  if n in self.positions[k] and n not in depicted and self.element[n] != 1]
        if kind == "bond" and self._linear(anchor, range(k, k + 1)) and len(placed) == 1:
            u = unit(self.positions[k][anchor] - placed[0])   # straight on through an sp atom
        second = None
        if kind == "bond" and not (self._linear(anchor, range(k, k + 1)) and len(placed) == 1):
            u, second = self._between_partners(anchor, mover, k, depicted, u)
        v = self._joining_side(depicted, mover, u, kind, k, turn=self._turn_to_hop(depicted, anchor, mover, u, kind,
                                                                                 segment))
        if kind == "bond" and self._joins_cis(anchor, mover, u, v, depicted, k):
            # A double bond between the two is drawn trans (below): the chain end bonds on at
            # 120 degrees the other way round, a branched cluster is drawn mirrored.
            if len([n for n in self.neighbours[mover] if n in depicted]) == 1:
                v = self._joining_side(depicted, mover, u, kind, k, turn=-1)
            elif not cluster.placement and not cluster.openings:
                self._mirror(cluster)
                depicted = cluster.local_at(k)
                v = self._joining_side(depicted, mover, u, kind, k)
        distance = 1.0 if kind == "bond" else 1.0 + TRANSFER_GAP
        mine = set(cluster.atoms)
        # Every spot the others take over the run, once each: one that moves between its panels
        # (a cation that waits, then bonds elsewhere) is cleared in each. (Only nearest approaches
        # are asked of them: their order does not matter.)
        skip = mine | {hydrogen, anchor, second}
        near = np.array(list({p for kk in range(segment[0], segment[1] + 1) for a, p in self.positions[kk].items()
                              if a not in skip}), dtype=complex)
        polygons = [[self.positions[kk][a] for a in ring] for kk in range(segment[0], segment[1] + 1)
                    for ring in self._closed_rings(kk)
                    if all(a in self.positions[kk] and a not in mine and a != hydrogen for a in ring)]
        anchor_at = self.positions[k][anchor]
        # An sp atom that bonds on keeps its straight angle: the cluster is not spun about it.
        straight = kind == "bond" and self._linear(mover, range(k, k + 1))
        options = (_STRAIGHT_BOND_OPTIONS if straight else _BOND_OPTIONS) if kind == "bond" else _HOP_OPTIONS
        round_options = _STRAIGHT_ROUND_BOND_OPTIONS if straight else _ROUND_BOND_OPTIONS
        if kind == "bond" and not straight:
            spins = _facing_spins([depicted[n] - depicted[mover] for n in self.neighbours[mover] if n in depicted], v)
            options, round_options = _facing_options(options, spins), _facing_options(round_options, spins)
        hydrogen_on_mover = hydrogen is not None and kind == "hop" and self._holder(k, hydrogen) == mover
        # For a hop or a transfer, a spot from which the arrow to the anchor's side crosses no bond is preferred.
        walls = self._walls(segment, anchor, set(cluster.atoms)) if kind != "bond" else np.zeros((0, 2), dtype=complex)
        placements = _Placements(options, u, v, anchor_at, distance, self._footprint(cluster, segment, k), mover,
                                 near, hydrogen_on_mover, walls)
        if len(walls):
            placements.batch = 1   # most hops settle on their first spot (see _Placements.blocked)
        best = None
        round_about = None
        partners = self._other_hops(index, segment, k, hydrogen) if kind == "hop" else []
        # (None where the hydrogen's bond feeds no bond of the anchor: no direction is shut)
        fed = self._fed_shut(hydrogen, anchor, k) if kind == "hop" and (hydrogen, anchor) in self.feeds else None
        # The hydrogen of a hop stands on the line from its holder toward the partner: not on a
        # bond of the holder, nor on another hydrogen promised to it while this one is there (the
        # two protons an enolate loses in turn, the second held from the first panel on).
        held_along = ([unit(self.positions[k][n] - anchor_at) for n in self.neighbours[anchor]
                       if n in self.positions[k] and self.element[n] != 1
                       and (min(anchor, n), max(anchor, n)) in self.bonds_in[k]]
                      + [r.direction for runs in self.residences.values() for r in runs
                         if r.holder == anchor and r.hydrogen != hydrogen and r.direction is not None
                         and residence is not None and r.first <= residence.last and residence.first <= r.last]
                      if kind == "hop" and not hydrogen_on_mover else [])
        if partners:
            best = self._nearest_to_partners(cluster, mover, placements, polygons, partners, fed, held_along)
        elif kind == "bond" and anchor in self.room_kept and mover in self.room_kept:
            gap, _, moved, direction, rotation, target = placements.at(0)   # turned neither way
            if gap >= 0.95 and not any_inside_polygons(moved, polygons):
                best = ((_CLEARANCE, True), rotation, target - depicted[mover] * rotation, direction)
        elif kind == "bond" and len([n for n in self.neighbours[mover] if n in depicted]) == 1 \
                and not self._linear(mover, range(k, k + 1)):
            for gap, _, moved, direction, rotation, target in placements.like(_CHAIN_END_OPTIONS):
                if gap >= _CLEARANCE and not any_inside_polygons(moved, polygons):
                    best = ((_CLEARANCE, True), rotation, target - depicted[mover] * rotation, direction)
                    break
        # In order of preference; the first that keeps its distance from everything wins.
        for gap, blocked, moved, direction, rotation, target in (placements if best is None else ()):
            if best is not None and (min(gap, _CLEARANCE), not blocked) <= best[0]:
                continue
            if fed is not None and fed(np.array([direction]))[0]:
                continue      # the hydrogen would stand in the angle its bond's pair goes into
            if held_along and any(abs(cmath.phase(direction / b)) < _ALONG_BOND for b in held_along):
                continue      # or on a bond of the atom that holds it
            # (a row of numpy numbers read as Python's, and only where there is a ring to be inside)
            if any_inside_polygons(moved, polygons):
                continue      # never inside someone else's ring
            best = ((min(gap, _CLEARANCE), not blocked), rotation, target - depicted[mover] * rotation, direction)
            if gap >= _CLEARANCE and not blocked:
                break
        if kind == "bond" and best is not None and best[0][0] < _CROWDED:
            roomier = self._bond_round_about(placements.like(round_options), polygons)
            if roomier is not None and roomier[0][0] > best[0][0] + 0.2:
                best = roomier
        if len(walls) and (best is None or best[0] != (_CLEARANCE, True)):
            round_about = self._clear_way_round(cluster, mover, hydrogen, segment, placements, polygons)
            best = round_about or best
        if best is None:
            direction = u
            rotation = unit(-direction / v)
            target = anchor_at + direction * distance
            best = ((0.0, False), rotation, target - depicted[mover] * rotation, direction)
        if kind == "bond" and self._cramped_centre(anchor, best[0][0]):
            self.cramped.add(anchor)
        _, rotation, shift, direction = best
        if kind == "hop" and segment[0] < segment[1] and self._trader(index) \
                and self._stranded(index, segment, rotation, shift):
            self._split_at_trades(index, segment)
            piece = self._segment_of(index, k)
            if piece != segment:
                self._place_segment(index, piece, k, anchor, mover, kind, hydrogen)
                return
        # Before it bonds, a molecule waits further out along its line of approach; a partner of
        # a proton hop is already a comfortable arrow's length away, and waits where it is.
        cluster.placement[segment[0]] = (rotation, shift, direction, APPROACH - 1.0 if kind == "bond" else 0.0)
        self._apply(index)
        if hydrogen is not None:
            self._promise(hydrogen, anchor, k, direction, leave_after=round_about is not None)

    def _footprint(self, cluster: _Cluster, segment: tuple[int, int], k: int) -> dict[int, complex]:
        """The cluster's depiction in panel k with, under keys of their own, its atoms as each other
        depiction in the run `segment` draws them (a cycloadduct hung on the iminium it came from):
        one placement holds for the whole run, so every depiction in it must keep clear."""
        current = cluster.local_at(k)
        footprint, others = dict(cluster.held_off_at(k)), []
        for panel in range(segment[0], segment[1] + 1):
            local = cluster.local_at(panel)
            if local is not current and all(local is not other for other in others):
                others.append(local)
                key = -len(others) * (max(self.atoms) + 1)
                drawn = cluster.held_off_at(panel)   # (with its partners held apart, as that panel draws them)
                footprint.update({key - a: drawn[a] for a in cluster.atoms if a in drawn and a in self.exists[panel]})
        return footprint

    def _cramped_centre(self, atom: int, room: float) -> bool:
        """Whether a cluster bonded to `atom` with only `room` round it (nearer than _CROWDED to
        something) may find more with room kept at `atom` in its own cluster's depiction: an atom
        with two heavy neighbours of its own that holds four in some panel, two of them from other
        clusters (the carbonyl carbon of an acyl substitution whose leaving group and nucleophile
        are separate species). Drawn with its own two bonds only, its depiction may lay the rest
        of its molecule into the gap where those two stand (a Boc carbamate curled round the one
        spot left for the HOBt ester's oxygen)."""
        if room >= _CROWDED or atom in self.roomier:
            return False
        own = sum(1 for n in self.neighbours[atom]
                  if self.element[n] != 1 and self.cluster_of.get(n) == self.cluster_of.get(atom))
        return own == 2 and any(self._heavy_degree(atom, bonds) >= 4 for bonds in self.bonds_in)

    def _bonds_while_waiting(self, anchor: int, mover: int, k: int, kind: str) -> list[complex]:
        """For a bond that forms in the step into panel k, the directions in panel k-1 of the anchor's
        bonds that it keeps in panel k to atoms not yet placed there (an aldehyde's oxygen, a group
        that leaves in a later step, placed after its partner): the mover waits in panel k-1
        along the line it comes in on, and taking that bond's room it would come in through the
        bond (an enolate over the aldehyde's oxygen)."""
        pair = (min(anchor, mover), max(anchor, mover))
        if kind != "bond" or k == 0 or pair in self.bonds_in[k - 1]:
            return []
        before = self.positions[k - 1]
        if anchor not in before:
            return []
        return [unit(before[n] - before[anchor]) for n in self.neighbours[anchor]
                if n != mover and n in before and n not in self.positions[k]
                and (min(anchor, n), max(anchor, n)) in self.bonds_in[k - 1] & self.bonds_in[k]
                and abs(before[n] - before[anchor]) > 1e-9]

    def _beside_fed_hydrogen(self, anchor: int, mover: int, k: int) -> Optional[complex]:
        """For a group that bonds, in the step into panel k, to an atom with two other bonds that
        holds a hydrogen whose pair later goes into its bond to one of them (the electrophile on an
        arenium ion's carbon, which then loses its proton): the middle of the atom's open gap. The
        roomiest spot is the first of a flat plateau, at an edge of that gap (a pyrrole's bromine
        stood in line with its N-C bond, and its hydrogen went beyond it, away from the ring bond
        its pair goes into, that arrow across the N-C bond). From the middle, the hydrogen has
        room between the group and that bond, and the arrow runs clear (common practice: the
        proton lost stands on the side of the bond its pair goes into). None for any other bond,
        and for a group the atom already had (an E2's leaving group, drawn anti to the proton)."""
        here = self.positions[k]
        if k == 0 or (min(anchor, mover), max(anchor, mover)) in self.bonds_in[k - 1]:
            return None
        if not any(holder == anchor and any(r.holder == anchor and r.first <= k <= r.last for r in runs)
                   for h, holder in self.feeds for runs in (self.residences.get(h, ()),)):
            return None
        bonded = [here[n] for n in self.neighbours[anchor] if n != mover and n in here and self.element[n] != 1
                  and (min(n, anchor), max(n, anchor)) in self.bonds_in[k]]
        return free_direction(here[anchor], bonded) if len(bonded) == 2 else None

    def _left_standing_by(self, anchor: int, mover: int, k: int, kind: str, mine: Iterable[int]) -> list[complex]:
        """For a bond that forms anew in the step into panel k, the directions in panel k-1 of the atoms
        of a molecule that has let go of `anchor` in an earlier step, stands within
        _STANDING_BY_REACH of it there and is no longer drawn in panel k (the acetate an
        acylpyridinium let go, kept where it left). The mover waits in panel k-1 along the line it
        comes in on: on their side it would wait behind them, its arrow running over their bonds
        (common practice: a nucleophile comes in from the open side)."""
        if (kind != "bond" or k == 0 or anchor not in self.positions[k - 1]
                or (min(anchor, mover), max(anchor, mover)) in self.bonds_in[k - 1]):
            return []   # (a bond already there, its order changing, keeps its place)
        before, after, mine = self.positions[k - 1], self.positions[k], set(mine)
        centre = before[anchor]
        # (only a group that has left `anchor` itself: the departed leaving group)
        left = {a for j in range(k - 1) for pair in self.bonds_in[j] if anchor in pair for a in pair} - {anchor}
        gone = set().union(*(m for m in self.molecules[k - 1] if left & set(m) and anchor not in m))
        return [unit(p - centre) for a, p in before.items()
                if a in gone and a not in after and a not in mine and 1e-9 < abs(p - centre) < _STANDING_BY_REACH]

    def _crosses_to(self, anchor: int, mover: int, segment: tuple[int, int]) -> Optional[complex]:
        """Where, in the last panel of `segment`, stands the atom that `mover` bonds to in the step
        after it as it leaves `anchor`, when that atom is not `anchor`'s neighbour (a 1,2-shift is
        placed by its own rule) and belongs to another molecule; None otherwise."""
        last = segment[1]
        if last + 1 >= self.n or (min(anchor, mover), max(anchor, mover)) not in self.broken[last]:
            return None
        here = self.positions[last]
        molecule = next((m for m in self.molecules[last] if anchor in m), ())
        target = next((n for n in sorted(self.neighbours[mover])
                       if (min(mover, n), max(mover, n)) in self.made[last]
                       and n in here and n not in molecule), None)
        return None if target is None else here[target]

    def _gives_hydrogen_to(self, taker: int, segment: tuple[int, int]) -> Optional[int]:
        """The atom, placed in the last panel of `segment`, that hands `taker` a hydrogen in the
        step after it; None if there is none."""
        return next((giver for panel, kind, giver, receiver, _ in self.events
                     if kind == "hop" and panel == segment[1] and receiver == taker
                     and giver in self.positions[panel]), None)

    def _kept_in_place(self, index: int, segment: tuple[int, int]) -> Optional[tuple]:
        """The placement of the run of panels before `segment`, if the cluster, left there, keeps
        every bond it has to placed atoms in the segment's first panel at one bond length and it is
        bonded to more than one: placed afresh on one of them, it would stretch the others (the
        sulfur of a chlorosulfite, every bond of which some step changes, turned about its oxygen
        away from the chlorine it keeps). Failing that, the placement of the run next to it (before,
        or after when that one is placed first) carried along with the cluster it hangs on, where
        that moved as a rigid body between the two runs (see _carried_with)."""
        cluster = self.clusters[index]
        first, last = segment
        local = cluster.local_at(first)
        mine = set(cluster.atoms)
        here = self.positions[first]
        links = [(a, n) for a in cluster.atoms if a in self.exists[first] for n in self.neighbours[a]
                 if n not in mine and n in here and (min(a, n), max(a, n)) in self.bonds_in[first]]

        def bonded(placement: tuple) -> bool:
            return all(abs(abs(placement[1] + placement[0] * local[a] - here[n]) - 1.0) <= 0.02 for a, n in links)

        before = cluster.segment_at.get(first - 1)
        if before is not None and before[0] in cluster.placement:
            if any(cluster.local_at(first - 1).get(a) != local.get(a) for a in cluster.atoms):
                return None   # drawn anew from here: its old placement says nothing
            riding = self._rides_with_joining_molecule(mine, first - 1)
            if len(links) < 2 and mine & self.touched[first - 1] and not riding:
                return None
            placement = cluster.placement[before[0]]
            if bonded(placement):
                return placement
            carried = self._carried_with(links, first - 1, first, placement) \
                if links and (riding or not mine & self.touched[first - 1]) else None
            return carried if carried is not None and bonded(carried) else None
        after = cluster.segment_at.get(last + 1)
        if after is not None and after[0] in cluster.placement and links and not mine & self.touched[last] \
                and all(cluster.local_at(last + 1).get(a) == local.get(a) for a in cluster.atoms):
            carried = self._carried_with(links, last + 1, first, cluster.placement[after[0]])
            return carried if carried is not None and bonded(carried) else None
        return None

    def _rides_with_joining_molecule(self, atoms: set[int], k: int) -> bool:
        """Whether `atoms` (a cluster) may move between panels k and k+1 only because its molecule
        joins another there: some atom of it is left alone by the step. Such a cluster keeps its
        place on its molecule (the alkylidene's methyl as its CH2 takes S8), as the rest of the
        molecule keeps its shape."""
        present = atoms & self.exists[k] & self.exists[k + 1]
        return bool(present - self.touched[k]) and present <= self.joining[k]

    def _carried_with(self, links: list[tuple[int, int]], source: int, target: int, placement: tuple) -> Optional[tuple]:
        """`placement`, made for panel `source`, moved as the cluster it hangs on moved, as a rigid
        body, from panel `source` to panel `target` (chromic acid's OH, a cluster of its own, on
        the chromium that waits apart and then takes the alcohol): it keeps its bond and the
        molecule its shape. None when that cluster did not move rigidly."""
        before, here = self.positions[source], self.positions[target]
        partner = self.clusters[self.cluster_of[links[0][1]]]
        if len(partner.atoms) <= len(self.clusters[self.cluster_of[links[0][0]]].atoms):
            return None   # only a smaller group rides on a larger body (DMF is not carried by its oxygen)
        shared = [x for x in partner.atoms if x in before and x in here]
        moved = _rigid_move(before, here, shared)
        if moved is None:
            # Only the molecule it hangs on moved so (the tribromomethanide held off the phosphorus
            # it then bonds to, in the depiction of the ring both end in): carried with that.
            molecule = next((set(m) for m in self.molecules[source] if links[0][1] in m), set())
            moved = _rigid_move(before, here, [x for x in shared if x in molecule])
        if moved is None:
            return None
        turn, a = moved
        rotation, shift = placement[:2]
        return (turn * rotation, here[a] + turn * (shift - before[a])) + tuple(placement[2:])

    def _four_centre_side(self, anchor: int, mover: int, k: int) -> Optional[complex]:
        """Panel k has the new bond between `anchor` and `mover`; if the step that made it also
        moved a group across to the other end of the pi bond it added to, through a four-membered
        ring (a hydroboration: B onto one alkene carbon, its H onto the other; a Grignard reagent
        on a nitrile: the alkyl onto carbon, MgBr onto nitrogen), the direction square to the bond
        on the anchor's side of that ring (anchor to the group's new partner, or anchor to the group
        it gives away) on the side with more room: the mover's side of the ring then lies alongside
        it, as chemists draw the four-centre addition. None for any other approach."""
        bond = (min(anchor, mover), max(anchor, mover))
        if k == 0 or bond in self.bonds_in[k - 1] or bond not in self.bonds_in[k]:
            return None
        here, before = self.positions[k], self.positions[k - 1]
        if anchor not in here:
            return None
        made, broken = self.made[k - 1], self.broken[k - 1]

        def sides() -> Iterator[complex]:
            """The anchor's side of the ring, for each group passed across it."""
            for group in sorted(self.neighbours[mover] | self.neighbours[anchor]):
                for giver, taker in ((mover, anchor), (anchor, mover)):
                    if (min(giver, group), max(giver, group)) not in broken:
                        continue
                    partner = next((x for x in sorted(self.neighbours[group]) if x not in (giver, taker)
                                    and (min(group, x), max(group, x)) in made
                                    and (min(taker, x), max(taker, x)) in self.bonds_in[k - 1]), None)
                    if partner is not None and giver == mover and partner in here:
                        yield here[partner] - here[anchor]     # the group goes to the anchor's neighbour
                    elif partner is not None and giver == anchor and group in before and anchor in before:
                        yield before[group] - before[anchor]   # the group leaves the anchor
        side = next((s for s in sides() if abs(s) > 1e-9), None)
        if side is None:
            return None
        along = unit(side)
        crowd = [p for a, p in here.items() if a not in (anchor, mover)]
        return max((along * 1j, along * -1j),
                   key=lambda d: min((abs(here[anchor] + APPROACH * d - p) for p in crowd), default=9.0))

    def _shifts_off(self, anchor: int, mover: int, last: int) -> bool:
        """Whether the step after panel `last` moves `mover` from `anchor` to an atom bonded to
        `anchor` (a 1,2-shift: the methyl of a Wolff rearrangement, from the carbonyl carbon to C4)."""
        return self._shifts_to(anchor, mover, last) is not None

    def _shifts_to(self, anchor: int, mover: int, last: int) -> Optional[int]:
        """The atom bonded to `anchor` that the step after panel `last` moves `mover` to from
        `anchor` (a 1,2-shift), or None."""
        if last + 1 >= self.n:
            return None
        if (min(anchor, mover), max(anchor, mover)) not in self.broken[last]:
            return None
        return next((n for n in sorted(self.neighbours[mover]) if (min(mover, n), max(mover, n)) in self.made[last]
                     and (min(anchor, n), max(anchor, n)) in self.bonds_in[last]), None)

    def _between_partners(self, anchor: int, mover: int, k: int, depicted: dict[int, complex], u: complex
                          ) -> tuple[complex, Optional[int]]:
        """The direction from `anchor` in which `mover` also sits one bond length from a second
        placed atom it is bonded to in panel k (a carbon between the two fragments it is about
        to fall apart into): where the two unit circles meet, on the side nearer u; and that
        atom, which the mover may come within a bond length of. (u, None) if there is no such
        atom or the two are too far apart for both bonds."""
        here = self.positions[k]
        seconds = [n for n in sorted(self.neighbours[mover]) if n != anchor and n not in depicted and n in here
                   and self.element[n] != 1 and (min(n, mover), max(n, mover)) in self.bonds_in[k]]
        if len(seconds) != 1:
            return u, None
        gap = here[seconds[0]] - here[anchor]
        if not 0.2 < abs(gap) < 1.95:
            return u, None
        half = abs(gap) / 2
        across = unit(gap) * 1j * math.sqrt(1.0 - half * half)
        spots = (gap / 2 + across, gap / 2 - across)
        return unit(max(spots, key=lambda spot: (spot * u.conjugate()).real)), seconds[0]

    def _turn_to_hop(self, depicted: dict[int, complex], anchor: int, mover: int, u: complex, kind: str,
                     segment: tuple[int, int]) -> int:
        """Which way round a chain end bonds on (see _joining_side) when it holds a hydrogen that
        an atom already placed takes while it stays (a methanol that adds to an isocyanate and
        hands its proton to the nitrogen): the way that leaves its free corner, where the
        hydrogen stands, facing that atom, so the arrow that takes the hydrogen has a clear way
        (it crossed the C=O when the methyl faced the nitrogen). Otherwise 1."""
        own = [n for n in self.neighbours[mover] if n in depicted]
        if kind != "bond" or len(own) != 1:
            return 1
        takers = [self.positions[panel][b] for panel, what, a, b, _ in self.events
                  if what == "hop" and a == mover and segment[0] <= panel <= segment[1]
                  and b in self.positions[panel] and b not in depicted]
        if not takers:
            return 1
        target = self.positions[segment[0]][anchor] + u

        def facing(turn: int) -> float:
            v = self._joining_side(depicted, mover, u, kind, segment[0], turn)
            branch = unit(unit(-u / v) * (depicted[own[0]] - depicted[mover]))
            corner = -unit(unit(-u) + branch)    # the third corner of a trigonal centre
            return sum((corner * unit(t - target).conjugate()).real for t in takers)
        return 1 if facing(1) >= facing(-1) else -1

    def _joining_side(self, depicted: dict[int, complex], mover: int, u: complex, kind: str, k: int,
                      turn: int = 1) -> complex:
        """The direction, in the cluster's depiction, from `mover` to the atom it bonds to or
        hops with: into its widest gap; a chain end bonds on at 120 degrees to its one bond
        (`turn` says which way round), as in a zigzag, not straight on (a nitrile does)."""
        own = [depicted[n] for n in self.neighbours[mover] if n in depicted]
        v = free_direction(depicted[mover], own, prefer=-u)
        if len(own) == 1 and kind == "bond" and not self._linear(mover, range(k, k + 1)):
            v = v * cmath.rect(1.0, turn * math.pi / 3)
        return v

    def _joins_cis(self, anchor: int, mover: int, u: complex, v: complex, depicted: dict[int, complex],
                   k: int) -> bool:
        """Whether the C-C bond anchor-mover, double in some panel, would put the largest branches
        of its two ends on one side when the cluster comes in along u with v facing the anchor.
        A chain double bond no species wrote E or Z for is drawn trans (the zigzag of common
        practice, and the E alkene an E1cB or an aldol condensation is drawn as); one written E or
        Z only where it is made (the product line's, final_state_as_written) is drawn so: this
        answers whether the join would draw it otherwise."""
        pair = (min(anchor, mover), max(anchor, mover))
        if self.union.get(pair) != 2 or self.element[anchor] != 6 or self.element[mover] != 6:
            return False   # alkenes only: an imine's or iminium's drawing is left as it comes
        written = self.written_double.get(pair)
        if written is not None and any(self.orders_in[j].get(pair) == 2 for j in range(k + 1)):
            return False   # written in a species already double here: its depiction shows it
        here = self.positions[k]
        sides = []
        for end, other, where in ((anchor, mover, here), (mover, anchor, depicted)):
            if written is not None:
                biggest = written[0] if end == pair[0] else written[1]
                if biggest not in where:
                    return False
            else:
                branches = [n for n in self.neighbours[end] if n != other and n in where and self.element[n] != 1]
                if not branches:
                    return False
                biggest = max(branches, key=lambda n: (self._branch_size(n, end), -n))
            sides.append(where[biggest] - where[end])
        # The cluster is turned so that v faces back along u: its offsets turn by -u / v.
        anchor_side = (sides[0] / u).imag
        mover_side = (sides[1] * (-u / v) / u).imag
        return (anchor_side * mover_side > 0) != (written is not None and written[2])

    def _branch_size(self, start: int, parent: int) -> int:
        """Atoms reached from `start` over the union's bonds without going back through `parent`."""
        seen, todo = {parent, start}, [start]
        while todo:
            for n in self.neighbours[todo.pop()]:
                if n not in seen:
                    seen.add(n)
                    todo.append(n)
        return len(seen) - 1

    @staticmethod
    def _mirror(cluster: _Cluster) -> None:
        """The cluster's depiction reflected (before it is placed anywhere): written configuration
        is drawn from the coordinates in each panel, so it stays right."""
        cluster.local = {a: p.conjugate() for a, p in cluster.local.items()}
        cluster.phases = [(first, {a: p.conjugate() for a, p in later.items()}) for first, later in cluster.phases]

    def _clear_way_round(self, cluster: _Cluster, mover: int, hydrogen: Optional[int], segment: tuple[int, int],
                         placements: _Placements, polygons: list[list[complex]]) -> Optional[tuple]:
        """A partner of a proton hop that finds no clear spot near its preferred side from which
        the arrow would not cross a bond looks all the way round its anchor (the arrow runs clear
        of bonds when a clear side exists); None if there is none either."""
        round_about = placements.like(_ROUND_OPTIONS)
        round_about.batch = 64
        # Travelling hydrogens are placed last: the spots promised to them are kept clear here.
        promised = np.array(self._promised_spots(hydrogen, set(cluster.atoms), range(segment[0], segment[1] + 1)),
                            dtype=complex)
        for gap, blocked, moved, direction, rotation, target in round_about:
            if gap < _CLEARANCE or blocked:
                continue
            hop = target - direction if placements.carries_hydrogen else placements.anchor_at + direction
            if (not (len(promised) and np.abs(hop - promised).min() < _HYDROGEN_ROOM)
                    and not any_inside_polygons(moved, polygons)):
                return (_CLEARANCE, True), rotation, target - placements.mover_at * rotation, direction
        return None

    @staticmethod
    def _bond_round_about(round_about: _Placements, polygons: list[list[complex]]) -> Optional[tuple]:
        """The first of `round_about`, placements all round the anchor, that keeps clear of
        everything (else the roomiest), for a molecule about to bond that found every spot near
        its preferred side crowded (an amine coming in on an anhydride's carbonyl, whose acetate
        arm fills that side)."""
        round_about.batch = 64
        best = None
        for gap, _, moved, direction, rotation, target in round_about:
            if (best is None or min(gap, _CLEARANCE) > best[0][0]) \
                    and not any_inside_polygons(moved, polygons):
                best = (min(gap, _CLEARANCE), True), rotation, target - round_about.mover_at * rotation, direction
                if gap >= _CLEARANCE:
                    break
        return best

    def _promised_spots(self, hydrogen: Optional[int], skip: set[int], panels: Iterable[int]) -> list[complex]:
        """Where the travelling hydrogens other than `hydrogen` whose directions are already
        promised sit in these panels, but those held by atoms in `skip`."""
        return [self.positions[p][r.holder] + r.direction for p in panels for runs in self.residences.values()
                for r in runs if r.hydrogen != hydrogen and r.direction is not None and r.first <= p <= r.last
                and r.holder in self.positions[p] and r.holder not in skip]

    def _walls(self, segment: tuple[int, int], anchor: int, mine: set[int]) -> np.ndarray:
        """The bonds, in the panels of `segment`, that a proton-transfer arrow between `anchor` and
        the cluster being placed should not cross (neither's own bonds)."""
        out = []
        for k in range(segment[0], segment[1] + 1):
            here = self.positions[k]
            out += [(here[i], here[j]) for i, j in self.bonds_in[k]
                    if i in here and j in here and anchor not in (i, j) and i not in mine and j not in mine]
        # A bond that stays put is the same wall in every panel: each is tested once.
        return np.array(list(dict.fromkeys(out)), dtype=complex).reshape(-1, 2)

    def _other_hops(self, index: int, segment: tuple[int, int], k: int, hydrogen: Optional[int]
                    ) -> list[tuple[int, complex]]:
        """The other proton hops a cluster is about to make while it stands still over `segment`,
        and the hop just before it that made it what it is (a water that has just protonated an
        oxygen stays beside that oxygen; not an acid or base redrawn for its next turn): (its
        atom, where the partner atom is)."""
        out = []
        for panel, mine, other, h in self._cluster_hops(index):
            if panel == k and h == hydrogen:
                continue
            if segment[0] <= panel <= segment[1] and other in self.positions[panel]:
                out.append((mine, self.positions[panel][other]))
            elif panel == segment[0] - 1 and segment[0] not in self.clusters[index].redrawn \
                    and other in self.positions[segment[0]]:
                out.append((mine, self.positions[segment[0]][other]))
        return out

    def _nearest_to_partners(self, cluster: _Cluster, mover: int, placements: _Placements,
                             polygons: list[list[complex]], partners: list[tuple[int, complex]],
                             fed: Optional[Callable[[np.ndarray], np.ndarray]] = None,
                             along: list[complex] = ()) -> Optional[tuple]:
        """Among the placements clear of everything (tried further round the anchor than a single
        hop needs) and from which the arrow crosses no wall, the one that also keeps the
        cluster's other hop partners within reach of an arrow (PARTNER_REACH), in order of
        preference otherwise; None when no placement is clear."""
        keys = list(placements.depicted)
        wider = placements.like(_PARTNER_OPTIONS)
        directions, rotations, targets, moved_all = wider.spots(0, len(_PARTNER_OPTIONS))   # (options, atoms)
        # The hop that places it counts as much as the others; squared, so two hops share the
        # stretch rather than one taking all of it. Partner by partner over every option at once,
        # in the order and with the arithmetic of a plain loop (np.hypot is Python's abs).
        miss = np.maximum(0.0, placements.distance + _PARTNER_EXTRA - PARTNER_REACH[1]) ** 2
        room = np.ones(len(_PARTNER_OPTIONS), dtype=bool)
        for atom, where in partners:
            offset = moved_all[:, keys.index(atom)] - where
            reach = np.hypot(offset.real, offset.imag)
            room &= reach >= PARTNER_REACH[0]      # else no room for the hydrogen between them
            miss = miss + np.maximum(0.0, reach - PARTNER_REACH[1]) ** 2
        score = _PARTNER_PREFERENCE + 30.0 * miss
        # The options share a few dozen turns (`spots` turned each once): each direction is
        # measured once, and every option takes its turn's answer.
        distinct, which = _distinct_turns(_PARTNER_OPTIONS, 0, len(_PARTNER_OPTIONS))
        turn_directions = [wider.turned[turn][0] for turn in distinct.tolist()]
        if fed is not None:      # the hydrogen would stand in the angle its bond's pair goes into
            room &= ~fed(np.array(turn_directions, dtype=complex))[which]
        for b in along:    # nor on a bond of the atom that holds it
            room &= np.array([abs(cmath.phase(d / b)) >= _ALONG_BOND for d in turn_directions])[which]
        # The cheapest first (equal scores keep the options' order); the clearance tests cost
        # more, so they run on a few spots at a time, growing as the search goes on.
        order = room.nonzero()[0]   # (the methods, without np.flatnonzero's and np.argsort's wrappers)
        order = order[score[order].argsort(kind="stable")]
        start, size = 0, 8
        while start < len(order):
            batch = order[start:start + size]
            options = batch.tolist()
            gaps = wider.gaps(moved_all[batch], targets[batch], [directions[o] for o in options])
            # Only the spots clear of every atom are asked whether their arrow crosses a bond: all at once.
            clear = [o for o, gap in zip(options, gaps) if gap >= _CLEARANCE]
            blocked = dict(zip(clear, wider.blocked(targets[clear], [directions[o] for o in clear]))) if clear else {}
            for option in clear:
                moved, direction, rotation = moved_all[option], directions[option], rotations[option]
                target = complex(targets[option])   # Python's complex arithmetic from here, as for every placement
                if not blocked[option] and not any_inside_polygons(moved, polygons):
                    return ((_CLEARANCE, True), rotation, target - placements.mover_at * rotation, direction)
            start, size = start + size, 2 * size
        return None

    def _residence_at(self, h: int, holder: int, k: int) -> Optional[_Residence]:
        for r in self.residences.get(h, []):
            if r.holder == holder and (r.first <= k <= r.last or r.first == k + 1):
                return r
        return None

    def _promise(self, h: int, anchor: int, k: int, direction: complex, leave_after: bool = False) -> None:
        """The hydrogen points along `direction` while on the anchor and back along it on the
        partner, around the hop at step k. With `leave_after` (a partner that came round to an
        unusual side) where it lands is left to find its own room: it stays there for panels
        the placement did not look at."""
        runs = self.residences[h]
        for before, after in zip(runs, runs[1:]):
            if before.last == k and after.first == k + 1:
                # The hop a hydrogen is about to make decides where it points; where it came
                # from only matters if it goes nowhere next.
                before.direction = direction if before.holder == anchor else -direction
                if after.direction is None and not leave_after:
                    after.direction = self._straight_on_from_leaving_bond(after) or (
                        -direction if before.holder == anchor else direction)

    def _straight_on_from_leaving_bond(self, r: _Residence) -> Optional[complex]:
        """A hydrogen that comes to a leaving group holding nothing else, just before the group
        leaves (an alcohol protonated, then ionised), and whose bond to the centre is drawn
        nearer upright than level: it points straight on from that bond. The label writes the
        group's own hydrogens to its left or right, which beside an upright bond takes one side
        of it; pointing back toward the acid, the hydrogen took the other, and the half-loop onto
        the group had no room (beside a level bond the written hydrogens sit straight on, and
        the hydrogen keeps its side)."""
        k, atom = r.first, r.holder
        here = self.positions[k]
        for partner, step in self.leaving.get(atom, ()):
            if (step == k and self.element[partner] != 1 and not self.neighbours[atom] - {partner, r.hydrogen}
                    and self.orders_in[k].get((min(atom, partner), max(atom, partner))) == 1
                    and atom in here and partner in here):
                out = unit(here[atom] - here[partner])
                return out if abs(out.imag) > abs(out.real) else None
        return None

    def _waiting(self, index: int, segment: tuple[int, int], following: tuple, arrival: int) -> tuple:
        """Where a cluster waits before the run (from panel `arrival`) in which it is bonded:
        pulled back along the line it comes in on (by `pull`, or further if that is crowded),
        turned neither way, so the atoms about to bond face each other, clear of everything
        else, including the atoms that will hang on it where they hang at its arrival."""
        rotation, shift, direction, pull_back = following
        if direction is None:
            return following
        cluster = self.clusters[index]
        panels = range(segment[0], segment[1] + 1)
        others = [p for k in panels for a, p in self.positions[k].items() if a not in cluster.atoms]
        there = self.positions[arrival]
        # (Only those still bonded to it at its arrival: the MgBr of a Grignard reagent, crossing
        # to the nitrile's nitrogen, hangs elsewhere then.)
        hanging = {(a, n) for k in panels for a in cluster.atoms for n in self.neighbours[a]
                   if n not in cluster.atoms and n in self.exists[k] and n not in self.positions[k]
                   and a in there and n in there and (min(a, n), max(a, n)) in self.bonds_in[k]
                   and (min(a, n), max(a, n)) in self.bonds_in[arrival]}
        depicted = cluster.local_at(segment[0])
        satellites = [there[n] - there[a] + rotation * depicted[a] for a, n in sorted(hanging)]
        local = [rotation * p for p in depicted.values()] + satellites
        polygons = [[self.positions[k][a] for a in ring] for k in range(segment[0], segment[1] + 1)
                    for ring in self._closed_rings(k)]
        # Every spot tried, and its nearest approach to what is already there, in one batch; the
        # wider ring of spots only when none near its line of approach is clear (a spectator
        # waiting out the early steps where another reagent already stands).
        best = None
        for pulls, sides in (((pull_back, 1.0, 1.5, 2.0, 2.5, 3.0), (0.0, 0.6, -0.6, 1.2, -1.2)),
                             ((3.5, 4.0, 4.5, 5.0), (0.0, 0.6, -0.6, 1.2, -1.2, 1.8, -1.8, 2.4, -2.4))):
            tries = [(pull, side) for pull in pulls for side in sides]
            shifts = np.array([shift + direction * pull + direction * 1j * side for pull, side in tries], dtype=complex)
            placed = shifts[:, None] + np.array(local, dtype=complex)                  # (tries, atoms)
            gaps = (np.abs(placed[:, :, None] - np.array(others, dtype=complex)).min(axis=(1, 2)).tolist() if others
                    else [9.0] * len(tries))
            for (pull, side), moved, atoms, gap in zip(tries, shifts.tolist(), placed.tolist(), gaps):
                if any_inside_polygons(atoms, polygons):
                    gap = 0.0
                # Clear of everything first; then a little more room against a longer wait.
                score = (min(gap, _CLEARANCE),
                         min(gap, _WAITING_CLEARANCE) - 0.3 * abs(pull - pull_back) - 0.3 * abs(side))
                if best is None or score > best[0]:
                    best = (score, moved)
            if best[0][0] >= _CLEARANCE:
                break
        return (rotation, best[1], direction, pull_back)

    def _backside_arrival(self, cluster: _Cluster, first: int, placement: tuple) -> tuple:
        """A nucleophile about to displace a leaving group waits on the far side of the centre
        from it (backside attack): its placement at arrival turned about the centre until the
        entering atom stands opposite the leaving group, when that line is clear of the centre's
        other bonds; otherwise `placement` as it is. Only the panel it waits in is affected."""
        rotation, shift, direction, pull_back = placement
        entering = [(e, self.backside[(first, e)]) for e in cluster.atoms if (first, e) in self.backside]
        if direction is None or len(entering) != 1:
            return placement
        e, (centre, leaving) = entering[0]
        before = self.positions[first - 1]
        if centre not in before or leaving not in before or centre not in self.positions[first]:
            return placement
        toward = -unit(before[leaving] - before[centre])
        bonded = [n for n in self.neighbours[centre] if n not in (e, leaving) and n in before
                  and n in self.exists[first - 1] and (min(n, centre), max(n, centre)) in self.bonds_in[first - 1]]
        others = [unit(before[n] - before[centre]) for n in bonded]
        bridged = next((n for n in bonded if (min(n, leaving), max(n, leaving)) in self.bonds_in[first - 1]), None)
        if bridged is not None:
            # A three-membered ring opened (a bromonium ion, an epoxide): the far side is across
            # the ring bond from the bridging atom, in the gap on that side (the face opposite the
            # bridge, as chemists draw the anti opening); straight behind the leaving group lies
            # along the ring.
            axis = unit(before[bridged] - before[centre])
            away = axis * (-1j if ((before[leaving] - before[centre]) / axis).imag > 0 else 1j)
            # (Of the gaps outside every ring: a cyclohexane fused to the bromonium ion fills the
            # far side, and the bromide comes in beside it.)
            rings = [[before[a] for a in ring] for ring in self._closed_rings(first - 1)]
            gaps = [cmath.rect(1.0, (a + b) / 2) for a, b in angular_gaps(0j, others + [unit(before[leaving] - before[centre])])]
            gaps = [d for d in gaps if not any_inside_polygons([before[centre] + 0.5 * d], rings)]
            if not gaps:
                return placement
            toward = max(gaps, key=lambda d: (d * away.conjugate()).real)
        elif any(abs(cmath.phase(toward / o)) < _BACKSIDE_ROOM for o in others):
            # No clear line behind the leaving group (POCl3's three other ligands): the gap
            # nearest it, so that the nucleophile does not wait behind the group it displaces;
            # unless that gap is the inside of a ring (the cyclohexane behind a bromonium ion).
            toward = gap_facing(0j, others + [unit(before[leaving] - before[centre])], toward)
            if any_inside_polygons([before[centre] + 0.5 * toward], [[before[a] for a in ring]
                                                             for ring in self._closed_rings(first - 1)]):
                return placement
        turn = toward / direction
        anchor = self.positions[first][centre]
        return (turn * rotation, anchor + turn * (shift - anchor), toward, pull_back)

    def _place_waiting(self) -> bool:
        """In the run just before a cluster's first placed run it waits a little further out
        along the line it will come in on (only atoms the next step touches may move, and a new
        run starts only where they all are). Earlier runs are left to their own events (a
        proton it gives away first) or, failing those, to the place it waits in."""
        ready = []
        for index, cluster in enumerate(self.clusters):
            acted = [start for start in cluster.placement if start not in cluster.waited]
            if not acted:
                continue
            first = min(acted)
            earlier = [segment for segment in cluster.segments if segment[0] < first]
            if not earlier or earlier[-1][0] in cluster.placement:
                continue
            ready.append((index, first, earlier[-1]))
        if not ready:
            return False
        index, first, (start, end) = ready[0]
        # Of the clusters of one molecule, the one that bonds as the molecule arrives waits first,
        # facing its partner, and the rest hangs on it: hydroperoxide's O- toward the aldehyde
        # carbon, its OH behind, not the OH (which bonds there three steps later) pointing the way.
        if not self._bonds_as_it_arrives(self.clusters[index], first):
            molecule = next(m for m in self.molecules[start] if self.clusters[index].atoms[0] in m)
            index, first, (start, end) = next(
                (c for c in ready if self.clusters[c[0]].atoms[0] in molecule and c[2][0] == start
                 and self._bonds_as_it_arrives(self.clusters[c[0]], c[1])), ready[0])
        cluster = self.clusters[index]
        arrival = self._backside_arrival(cluster, first, cluster.placement[first])
        if not self._bonds_as_it_arrives(cluster, first):
            # Already bonded to the atom that placed it there (an iminium's amine, hidden for a
            # panel and then drawn again): it waits where it will be, not pulled back along a
            # bond it holds all along.
            arrival = arrival[:3] + (0.0,)
        cluster.placement[start] = self._waiting(index, (start, end), arrival, first)
        cluster.waited.add(start)
        self._apply(index)
        return True

    def _bonds_as_it_arrives(self, cluster: _Cluster, first: int) -> bool:
        """Whether a bond of the cluster forms in the step into panel `first`."""
        if first == 0:
            return False
        made = self.made[first - 1]
        return any((min(a, n), max(a, n)) in made for a in cluster.atoms for n in self.neighbours[a])

    @staticmethod
    def _bonds_on_arrival(cluster: _Cluster, start: int) -> bool:
        """Whether the run from panel `start` is placed by a bond it makes there (a bond's
        placement waits back along its line of approach; a hop's does not; a wait is no bond)."""
        placement = cluster.placement.get(start)
        return placement is not None and placement[2] is not None and placement[3] > 0 and start not in cluster.waited

    def _nearest_other(self, index: int, segment: tuple[int, int], placement: Optional[tuple]) -> float:
        """The nearest approach of the cluster, placed so over `segment`, to any atom of another
        cluster placed there (infinite when nothing else is there or no placement is given)."""
        if placement is None:
            return math.inf
        rotation, shift = placement[:2]
        cluster = self.clusters[index]
        mine = set(cluster.atoms)
        local = np.array([shift + rotation * p for p in cluster.local_at(segment[0]).values()], dtype=complex)
        others = np.array([p for k in range(segment[0], segment[1] + 1) for a, p in self.positions[k].items()
                           if a not in mine], dtype=complex)
        return float(np.abs(local[:, None] - others[None, :]).min()) if len(others) and len(local) else math.inf

    def _split_off(self, index: int, segment: tuple[int, int], previous: Optional[tuple]) -> Optional[tuple]:
        """Where a cluster stays after it has acted: where it was, or, when the step before the
        segment split its bond evenly (a homolysis: it now carries the unpaired electron) or
        left a letter on both ends (CH3+ beside HO-, whose labels would run together), a little
        further out along that bond, so the two pieces read as apart. A fragment that leaves
        with the pair stays where it was unless something has taken its place (the nucleophile
        of an SN2 drawn where the leaving group was): then it goes further out along its bond, or a
        little off that line where the straight way meets the next reagent."""
        if previous is None or previous[2] is None or segment[0] == 0:
            return previous
        atoms = set(self.clusters[index].atoms)
        k = segment[0]
        previous = self._carried_by_partner(index, segment, previous)
        mol = self.states[k].mol
        split = [(i, j) for i, j in self.broken[k - 1] if (i in atoms) != (j in atoms)]
        apart = any(mol.GetAtomWithIdx(i if i in atoms else j).GetNumRadicalElectrons()
                    or (self._lettered(i, mol) and self._lettered(j, mol)) for i, j in split)
        rotation, shift, direction, pull_back = previous
        cluster = self.clusters[index]
        local = np.array([rotation * cluster.local_at(segment[0])[a] for a in cluster.atoms], dtype=complex)
        others = np.array([p for kk in range(segment[0], segment[1] + 1) for a, p in self.positions[kk].items()
                           if a not in atoms], dtype=complex)
        ways = self._ways_of_next_step(k, atoms)
        # A lone atom handed to a larger molecule not placed yet (the bromine that a second
        # triphenylphosphine takes off the ylide's carbon) is where that molecule will hang: it
        # moves off with room for it, or the molecule lands on the one it left.
        footprint = self._footprint_of_taker(index, k) if split else None
        if not apart and footprint is None:
            # Only a fragment that took the pair away moves off: the one it left (the carbon of an
            # SN2, where the nucleophile has come in) stays.
            before = self.states[k - 1]
            took = any(before.nonbonding[a] < self.states[k].nonbonding[a]
                       for a in (i if i in atoms else j for i, j in split))
            if (not split or not took or not len(others)
                    or (np.abs(shift + local[:, None] - others[None, :]).min() >= _CLEARANCE
                        and not _near_any_way(shift + local, ways))):
                return previous
        # Straight out along the bond first, then turned off that line where the straight way
        # meets the next reagent (the chloride an acid chloride loses, beside the carbon the next
        # Grignard attacks). A pair of labels split apart first tries a short step straight out
        # (the acetate that mercury lets go goes further where the alkene has come in).
        turns = (1, cmath.rect(1, math.pi / 6), cmath.rect(1, -math.pi / 6), cmath.rect(1, math.pi / 3),
                 cmath.rect(1, -math.pi / 3), cmath.rect(1, math.pi / 2), cmath.rect(1, -math.pi / 2))
        tries = [(1, extra) for extra in (0.7, 0.5, 0.3)] if apart else []

        def fit(at: complex) -> tuple[bool, float]:
            """Clear of the next step's arrows, then the nearest approach to anything (of the
            taker's footprint too, set on the far side from where the atom was)."""
            mine = local
            if footprint is not None:
                outward = unit(at - shift) if abs(at - shift) > 1e-9 else direction
                mine = np.concatenate([local, local[0] + outward * footprint])
            nearest = float(np.abs(at + mine[:, None] - others[None, :]).min()) if len(others) else math.inf
            return not _near_any_way(at + local, ways), min(nearest, _CLEARANCE)
        best, best_fit = shift, fit(shift)
        extras = (1.0, 1.5, 2.0) if footprint is None else (1.0, 1.5, 2.0, 2.5, 3.0)
        for turn, extra in tries + [(turn, extra) for turn in turns for extra in extras]:
            moved = shift + direction * turn * extra
            here = fit(moved)
            if here == (True, _CLEARANCE):
                return (rotation, moved, direction, pull_back)
            if here > best_fit:
                best, best_fit = moved, here
        # Nowhere quite clear: the roomiest of the tries, if it beats staying put.
        return (rotation, best, direction, pull_back)

    def _carried_by_partner(self, index: int, segment: tuple[int, int], previous: tuple) -> tuple:
        """`previous` (where cluster `index` acted in panel k-1, k the segment's first panel)
        carried along with the atom of another cluster it gave a proton to, took one from or
        broke its bond to at step k-1, where that atom moved between the panels and left it
        stranded (nothing heavy within _STRANDED): a by-product stands beside the molecule it
        left (common practice), not where that molecule stood a panel before (the water a
        protonated ketone gave off, left in the row gap once the ketone is redrawn). Turned with
        the partner's heavy bonds kept in both panels, and stepped out from the partner until it
        stands clear; taken only if that is nearer the rest than where it was."""
        k = segment[0]
        atoms = set(self.clusters[index].atoms)
        before, here = self.positions[k - 1], self.positions[k]
        partners = {b if a in atoms else a for kk, kind, a, b, _ in self.events
                    if kk == k - 1 and kind == "hop" and (a in atoms) != (b in atoms)}
        partners |= {j if i in atoms else i for i, j in self.broken[k - 1] if (i in atoms) != (j in atoms)}
        partners = {p for p in partners if p in before and p in here and self.element[p] != 1}
        if len(partners) != 1:
            return previous
        partner = partners.pop()
        if abs(here[partner] - before[partner]) < 0.05:
            return previous
        local = [p for a, p in self.clusters[index].local_at(k).items() if a in self.exists[k]]
        panels = range(segment[0], segment[1] + 1)
        others = [(p, self.element[a] != 1) for kk in panels for a, p in self.positions[kk].items()
                  if a not in atoms and a in self.exists[kk]]
        if not local or not any(heavy for _, heavy in others):
            return previous

        def nearest(placement: tuple, heavy_only: bool) -> float:
            rotation, shift = placement[:2]
            # (heavy atoms, for how far: a travelling hydrogen is drawn on few panels)
            return min(abs(shift + rotation * p - q) for p in local for q, heavy in others if heavy or not heavy_only)
        stranded = nearest(previous, True)
        if stranded <= _STRANDED:
            return previous   # (still beside something: left where it acted)
        arms = [(before[n] - before[partner], here[n] - here[partner]) for n in self.neighbours[partner]
                if n in before and n in here and n not in atoms and self.element[n] != 1
                and (min(n, partner), max(n, partner)) in self.bonds_in[k - 1] & self.bonds_in[k]]
        turns = [unit(after / was) for was, after in arms if abs(was) > 1e-9 and abs(after) > 1e-9]
        turn = unit(sum(turns)) if turns and abs(sum(turns)) > 1e-9 else 1 + 0j
        rotation, shift, direction, pull_back = previous
        carried = here[partner] + turn * (shift - before[partner])
        # Where it stood bonded (a chloride off sulfur), it steps out along that line until clear.
        out = unit(carried + turn * rotation * sum(local) / len(local) - here[partner])
        for extra in (0.0, 0.5, 1.0, 1.5):
            placement = (turn * rotation, carried + out * extra, turn * direction, pull_back)
            if nearest(placement, False) >= _CLEARANCE:
                return placement if nearest(placement, True) < stranded - _CARRIED_NEARER else previous
        return previous

    def _footprint_of_taker(self, index: int, k: int) -> Optional[np.ndarray]:
        """For a cluster of one atom bonded in panel k to an atom of a larger cluster not yet
        placed there: that cluster's atoms relative to the lone atom, with its own bonded atom a
        bond length out along +1 and the rest fanned out beyond it (turned so that they stand
        furthest from the lone atom). None for anything else."""
        cluster = self.clusters[index]
        if len(cluster.atoms) != 1:
            return None
        lone = cluster.atoms[0]
        for n in sorted(self.neighbours[lone]):
            if (min(lone, n), max(lone, n)) not in self.bonds_in[k] or n not in self.cluster_of:
                continue
            taker = self.clusters[self.cluster_of[n]]
            if len(taker.atoms) <= 1 or self._placed_at(self.cluster_of[n], k):
                continue
            local = taker.local_at(k)
            rest = np.array([local[a] - local[n] for a in taker.atoms if a != n], dtype=complex)
            centre = rest.mean() if len(rest) else 1 + 0j
            turn = unit(centre).conjugate() if abs(centre) > 1e-9 else 1 + 0j
            return np.concatenate([[1 + 0j], 1 + rest * turn])
        return None

    def _ways_of_next_step(self, k: int, skip: set[int]) -> list[tuple[complex, complex]]:
        """The straight lines in panel k between the atoms the step after it joins or hands a
        hydrogen between (none of `skip`): where its arrows run."""
        here = self.positions[k]
        pairs = [(a, b) for kk, kind, a, b, _ in self.events if kk == k and kind in ("hop", "transfer")]
        if k + 1 < self.n:
            pairs += list(self.made[k])
        return [(here[a], here[b]) for a, b in pairs
                if a in here and b in here and a not in skip and b not in skip]

    def _place_leftovers(self) -> bool:
        """Runs of panels no event placed after a cluster has acted: it stays where it last
        acted, next to the atoms it acted on, until an event places it again. A cluster that
        never meets another goes to the right of the drawing. The largest such cluster first: a
        small one (an ion) is then placed by its bonds to it, not left where it was; but one about
        to bond to a cluster not yet placed where they meet goes after it (below)."""
        partial = [k for k, c in enumerate(self.clusters) if c.placement and len(c.placement) < len(c.segments)]
        if partial:
            index = min(partial, key=lambda k: (self._bonds_to_unplaced_next(k), -len(self.clusters[k].atoms),
                                                self.clusters[k].atoms[0]))
            cluster = self.clusters[index]
            previous = cluster.placement[min(cluster.placement)]    # before its first event: where it waits
            for (start, end), following in zip(cluster.segments, cluster.segments[1:] + [None]):
                if start in cluster.placement:
                    previous = cluster.placement[start]
                else:
                    stay = self._split_off(index, (start, end), previous)
                    displaces = following is not None and following[0] == end + 1 and any(
                        (following[0], a) in self.backside for a in cluster.atoms)
                    if following is not None and following[0] == end + 1 and self._bonds_on_arrival(cluster, following[0]) and (
                            displaces or self._nearest_other(index, (start, end), stay) < _CROWDED):
                        # (Also when it goes on to displace a leaving group: it waits on the far
                        # side, not where it fell off, beside that group: the bromide of Br2 by
                        # the bromonium ion it opens next.)
                        # Between two acts and about to bond again, where something else now
                        # stands where it was (the bromide of an Appel reaction, off phosphorus
                        # as the oxygen takes its place): it waits facing its next partner.
                        arrival = self._backside_arrival(cluster, following[0], cluster.placement[following[0]])
                        stay = self._waiting(index, (start, end), arrival, following[0])
                    elif following is not None and following[0] in cluster.placement \
                            and self._nearest_other(index, (start, end), stay) < _CROWDED:
                        # Where it will next be, something else stands in these panels (two
                        # reagents of later steps, both shown in the first panel, meet where
                        # each waits): it waits back along its next line of approach instead.
                        stay = self._waiting(index, (start, end), cluster.placement[following[0]], following[0])
                    cluster.placement[start] = stay
            self._apply(index)
            return True
        unplaced = [k for k, c in enumerate(self.clusters) if not c.placement and c.segments]   # (drawn somewhere)
        if not unplaced:
            return False
        index = min(unplaced, key=lambda k: (-len(self.clusters[k].atoms), self.clusters[k].atoms[0]))
        cluster = self.clusters[index]
        everything = [(a, p) for panel in self.positions for a, p in panel.items()]
        # The gap is measured between the ends of the labels, not the atoms' centres: NH3 beside H3O+.
        right = max((p.real + self._label_reach(a) for a, p in everything), default=0.0)
        mid_y = sum(p.imag for _, p in everything) / len(everything) if everything else 0.0
        left = min(p.real - self._label_reach(a) for a, p in cluster.local.items())
        cy = sum(p.imag for p in cluster.local.values()) / len(cluster.local)
        for start, _ in cluster.segments:
            cluster.placement[start] = (1 + 0j, complex(right + LEFTOVER_GAP - left, mid_y - cy), None, 0.0)
        self._apply(index)
        return True

    def _bonds_to_unplaced_next(self, index: int) -> bool:
        """Whether the cluster's first unplaced run is followed by an unplaced run it enters by a
        bond to a cluster not placed in that run either (a benzoate that stood aside while others
        acted, about to attack the carbon of an alkoxyphosphonium ion): left over first, it would
        stay where it last stood, wherever that now is, and its partner come to it; after the
        partner, the bond places it and it waits facing the atom it attacks."""
        cluster = self.clusters[index]
        unplaced = [segment for segment in cluster.segments if segment[0] not in cluster.placement]
        first = unplaced[0][0] if unplaced else None
        following = next((segment for segment in cluster.segments if first is not None and segment[0] > first), None)
        if following is None or following[0] in cluster.placement or not self._bonds_as_it_arrives(cluster, following[0]):
            return False
        k = following[0]
        made = self.made[k - 1]
        return any(n in self.cluster_of and self.cluster_of[n] != index and not self._placed_at(self.cluster_of[n], k)
                   for a in cluster.atoms for n in self.neighbours[a] if (min(a, n), max(a, n)) in made)

    def _clear_bystanders(self) -> None:
        """A molecule that stands by in a run of panels (no step from them touches it) where it
        may move in the first, left where it last acted or waited, may stand on another
        molecule's atoms (the bromide an SN2 pushed out, a bond length from the hydrogen the next
        step takes). It steps off, as a rigid body, the least way that keeps it _CLEARANCE from
        every other atom drawn in the run, on the side it stood on. Not in a run that reaches the
        last panel (the by-products are set there on their own), nor while it waits for its next
        turn in the run (it stands by its partner on purpose): that one is left as it is."""
        for k in range(self.n - 1):
            for molecule in sorted(self.molecules[k], key=len):
                run = self._standing_by(set(molecule), k)
                if run is not None:
                    self._step_clear(set(molecule), run)

    def _standing_by(self, molecule: set[int], k: int) -> Optional[range]:
        """The panels from the one where `molecule` may last move up to the last one it stays
        put in, if it stands by in all of them, is one molecule in each and the run starts at
        panel k and ends before the last panel; else None."""
        if not molecule & self.positions[k].keys() or k > 0 and not self._may_move_into(molecule, k - 1):
            return None
        last = k
        while True:
            if molecule & self.touched[last] or last + 1 >= self.n:
                return None
            if not any(molecule == set(m) for m in self.molecules[last]):
                return None
            if self._may_move_into(molecule, last):
                return range(k, last + 1)
            last += 1

    def _may_move_into(self, molecule: set[int], k: int) -> bool:
        """Whether `molecule` may move between panels k and k+1: the step touches every atom of
        it drawn in both (none, when it is not drawn in panel k), or each cluster it is made of
        starts a run of panels there (it joins another, or trades a proton, as _segments has it)."""
        kept = {a for a in molecule if a in self.positions[k] and a in self.positions[k + 1]}
        if kept <= self.touched[k]:
            return True
        clusters = {self.cluster_of[a] for a in kept if a in self.cluster_of}
        return bool(clusters) and all(self.clusters[c].segment_at.get(k + 1, (None,))[0] == k + 1 for c in clusters)

    def _step_clear(self, molecule: set[int], run: range) -> None:
        """Move `molecule` in the panels of `run` by the shortest shift (tried every 0.05 bond
        lengths up to _STEP_CLEAR_REACH, every 10 degrees within 90 of straight away from what
        crowds it) that keeps it _CLEARANCE from every other atom drawn there."""
        mine, others = [], []
        for k in run:
            here = self.positions[k]
            mine += [here[a] for a in molecule if a in here and self._drawn_in(a, k)]
            others += [p for a, p in here.items() if a not in molecule and self._drawn_in(a, k)]
        if not mine or not others:
            return
        mine_at, others_at = np.array(mine, dtype=complex), np.array(others, dtype=complex)
        apart = mine_at[:, None] - others_at[None, :]
        near = np.abs(apart)
        if near.min() >= _CLEARANCE - 1e-9:
            return
        crowded = near < _CLEARANCE
        push = complex((apart[crowded] / np.maximum(near[crowded], 1e-9)).sum())
        away = unit(push) if abs(push) > 1e-9 else unit(mine_at.mean() - others_at.mean())
        turns = _COMPASS[np.abs(np.angle(_COMPASS)) <= math.pi / 2 + 1e-9]
        turns = turns[np.argsort(np.abs(np.angle(turns)))]     # straight away first
        for distance in np.arange(0.05, _STEP_CLEAR_REACH + 0.01, 0.05):
            shifts = away * turns * distance
            gaps = np.abs(mine_at[None, :, None] + shifts[:, None, None] - others_at[None, None, :]).min(axis=(1, 2))
            clear = np.flatnonzero(gaps >= _CLEARANCE)
            if len(clear):
                shift = complex(shifts[clear[0]])
                for k in run:
                    for a in molecule & self.positions[k].keys():
                        self.positions[k][a] += shift
                return

    def _set_by_products_beside_product(self) -> None:
        """The last panel reads as an equation: the product (`self.product`, else the largest
        molecule), then each by-product of the last step in a row to its right, level with it
        (common practice: "product + MeO-"). Left where it acted, a by-product would hang above or
        below the product, between the rows of the scheme when the product starts a row. Every
        such by-product is one the last step made or changed (an idle species is not drawn
        there), and each moves as a rigid body."""
        k = self.n - 1
        where = self.positions[k]
        drawn = {i for i in visible_atoms(self.states[k], self.drawn_h) if i in where and i in self.exists[k]}
        molecules = [[i for i in molecule if i in drawn] for molecule in self.molecules[k]]
        molecules = [m for m in molecules if m]
        if len(molecules) < 2:
            return
        product = self._product_of(molecules)
        by_products = sorted((m for m in molecules if m is not product),
                             key=lambda m: min(where[i].real for i in m))

        def middle(molecule: list[int]) -> float:
            # Of the heavy atoms: whether a travelling hydrogen shows is the structure's choice.
            heights = [where[i].imag for i in molecule if self.element[i] != 1] or [where[i].imag for i in molecule]
            return (min(heights) + max(heights)) / 2

        def edge(molecule: list[int], side: int) -> float:
            # A label reaches at most two bond lengths: only atoms that far from the edge count.
            far = side * max(side * where[i].real for i in molecule)
            return side * max(side * (where[i].real + side * self._label_reach(i, k)) for i in molecule
                              if abs(where[i].real - far) < 2.0)

        for molecule in by_products:
            atoms = [i for i in molecule if self.element[i] != 1]
            heavy = [where[i] for i in atoms]
            triple = len(atoms) == 2 and self.orders_in[k].get((min(atoms), max(atoms))) == 3
            if (len(heavy) >= 3 or triple) and collinear(heavy):
                # A straight one (CO2, N2) lies level, as it is written: O=C=O.
                ends = sorted(heavy, key=lambda z: (z.real, z.imag))
                turn = unit(ends[-1] - ends[0]).conjugate()
                centre = sum(heavy) / len(heavy)
                for i in molecule:
                    where[i] = centre + (where[i] - centre) * turn
        level = middle(product)
        right = edge(product, 1)
        for molecule in by_products:
            shift = complex(right + LEFTOVER_GAP - edge(molecule, -1), level - middle(molecule))
            for i in molecule:
                where[i] += shift
            right = edge(molecule, 1)

    def _product_of(self, molecules: list[list[int]]) -> list[int]:
        """Of the last panel's molecules, the product: the one holding `self.product`, else the largest."""
        return max(molecules, key=lambda m: (not self.product.isdisjoint(m), sum(self.element[i] != 1 for i in m),
                                             -min(m)))

    def _lettered(self, atom: int, mol: Chem.Mol) -> bool:
        """Whether the heavy atom is drawn as a letter in this state: a heteroatom, or a carbon
        with no heavy neighbour (CH3+, CN-), or an atom written as a group (Ph)."""
        if self.element[atom] == 1:
            return False   # a travelling hydrogen: its hops are placed apart on their own
        return atom in self.abbreviated or self.element[atom] != 6 or all(
            self.element.get(n.GetIdx(), 1) == 1 for n in mol.GetAtomWithIdx(atom).GetNeighbors())

    def _label_reach(self, atom: int, k: Optional[int] = None) -> float:
        """How far an atom's label may reach to either side, in bond lengths (a generous estimate:
        the layout does not know the font): none for a skeletal carbon; else about a third of a
        bond length per character of symbol, hydrogens and charge, the hydrogens on either side
        (of a group's label, "Ph", per character of it).
        As written in state k, or else in the first state that has the atom."""
        if atom in self.abbreviated:
            return 0.15 + 0.33 * _GROUP_LABEL_CHARACTERS
        state = self.states[k] if k is not None else next(s for s in self.states if atom < len(s.elements))
        a = state.mol.GetAtomWithIdx(atom)
        if a.GetAtomicNum() == 6 and a.GetDegree() > 0 and not a.GetFormalCharge():
            return 0.0
        if k is None:
            hydrogens = a.GetTotalNumHs()
        else:   # the label writes every hydrogen of the atom but those drawn as atoms of their own there
            hydrogens = a.GetTotalNumHs(includeNeighbors=True) - sum(
                1 for n in a.GetNeighbors() if n.GetAtomicNum() == 1 and n.GetIdx() in self.positions[k]
                and n.GetIdx() in self.exists[k])
        characters = len(a.GetSymbol()) + (0 if not hydrogens else 1 if hydrogens == 1 else 2) \
            + (1 if a.GetFormalCharge() else 0)
        return 0.15 + 0.33 * characters

    # leaving groups
    def _let_go(self) -> None:
        """A leaving group with an atom the step leaves alone (the ethyl of an ethoxide) may not
        move as a whole, so it stood where it broke off, its oxygen a bond length from the carbon
        it left, reading as still bonded. Only the leaving atom moves (the step touches it): in
        the panels after it leaves, until a step touches it again, it turns about its one other
        heavy neighbour to a spot at least _LET_GO from that carbon: across the line of a chain it
        ends (keeping the angle at its neighbour), or anywhere round a neighbour it alone is bonded
        to, as close to where it was as will do."""
        for atom, left in sorted(self.leaving.items()):
            for centre, k in left:
                if self.element[centre] != 1:   # (a proton taken off is not a group let go)
                    self._let_go_of(atom, centre, k)

    def _let_go_of(self, atom: int, centre: int, k: int) -> None:
        last = k + 1
        while last + 1 < self.n and atom in self.positions[last + 1] and atom not in self.touched[last]:
            last += 1
        panels = [p for p in range(k + 1, last + 1) if atom in self.positions[p]]
        if not panels or atom not in self.positions[k] or atom not in self.positions[k + 1] \
                or abs(self.positions[k + 1][atom] - self.positions[k][atom]) > 1e-9:
            return   # placed apart already (a cluster of its own)
        here = self.positions[panels[0]]
        if centre not in here or abs(here[atom] - here[centre]) >= _LET_GO:
            return

        def bonded(a: int, p: int) -> list[int]:
            return [n for n in self.neighbours[a] if (min(a, n), max(a, n)) in self.bonds_in[p]]

        around = [bonded(atom, p) for p in panels]
        heavy = {tuple(n for n in partners if self.element[n] != 1) for partners in around}
        if len(heavy) != 1 or len(next(iter(heavy))) != 1:
            return
        pivot = next(iter(heavy))[0]
        # Its own hydrogens drawn as atoms (an amine's, taken on earlier) turn with it.
        riders = {h for partners in around for h in partners if self.element[h] == 1}
        if any(self.positions[p].get(h) != here.get(h) for h in riders for p in panels):
            return
        if self.element[pivot] == 1 or any(here[pivot] != self.positions[p].get(pivot) for p in panels) \
                or self._linear(pivot, range(panels[0], panels[-1] + 1)):
            return   # (turned about a straight atom, an alkyne's, it would bend it)
        beyond = {tuple(n for n in bonded(pivot, p) if n != atom) for p in panels}
        if len(beyond) != 1:
            return
        beyond = next(iter(beyond))
        if any(self.element[n] == 1 for n in beyond) or len(beyond) > 1:
            return
        centre_at = here[pivot]
        arm = here[atom] - centre_at
        # Turns about the neighbour that keep the angle at a chain's link near 120 degrees (the
        # zigzag, or a carbonyl's trigonal carbon): near where it was, or mirrored across the chain.
        turns = [d for d in range(-170, 181, 10) if d and (not beyond or abs(abs(math.degrees(cmath.phase(
            arm * cmath.rect(1.0, math.radians(d)) / (here[beyond[0]] - centre_at)))) - 120) <= 15 + 1e-9)]
        # The hydrogen it takes next (placed already, where it stays on its holder) and that
        # hydrogen's holder keep within reach: (place, nearest, furthest, whether that is a limit
        # or a preference).
        partners = []
        if last < self.n - 1:
            protons = self._protons_traded(atom, last, last)
            if protons is None:
                return   # bonding again next (a carbonyl oxide recombining): it waits where it broke off
            for h, holder in protons:
                partners.append((h, TRANSFER_GAP - 0.2, TRANSFER_GAP + 0.5, False))
                if holder is not None:
                    partners.append((holder, *PARTNER_REACH, True))
        crowd = [q for p in panels for a, q in self.positions[p].items() if a != atom and a not in riders]
        walls = [(self.positions[p][i], self.positions[p][j]) for p in panels for i, j in self.bonds_in[p]
                 if atom not in (i, j) and i in self.positions[p] and j in self.positions[p]]
        best, best_score = None, None
        for degrees in turns:
            spot = centre_at + arm * cmath.rect(1.0, math.radians(degrees))
            if abs(spot - here[centre]) < _LET_GO or any(limit and abs(spot - q) > _LET_GO_REACH
                                                          for q, _, _, limit in partners):
                continue
            if any(abs(spot - q) < 0.95 for q in crowd) or any(segments_cross(centre_at, spot, a, b) for a, b in walls):
                continue
            # Within reach of its partner, facing it (its lone pair's arrow leaves on the side away
            # from the neighbour), first; then the least turn.
            facing = sum(max(0.0, math.radians(120) - abs(cmath.phase((q - spot) / (centre_at - spot))))
                         for q, _, _, _ in partners)
            # Then clear of the atoms round it (an atom closer than _LET_GO_CLEAR crowds it).
            crowding = sum(max(0.0, _LET_GO_CLEAR - abs(spot - q)) for q in crowd)
            score = (sum(max(0.0, abs(spot - q) - far, near - abs(spot - q)) for q, near, far, _ in partners) + facing,
                     round(crowding, 1), abs(degrees))
            if best_score is None or score < best_score:
                best, best_score = spot, score
        if best is not None:
            turn = (best - centre_at) / arm
            moved = {h: centre_at + (here[h] - centre_at) * turn for h in riders}
            moved[atom] = best
            for p in panels:
                self.positions[p].update(moved)

    def _protons_traded(self, atom: int, k: int, side: int, keep: Optional[tuple[int, int]] = None
                        ) -> Optional[list[tuple[complex, Optional[complex]]]]:
        """The hydrogens `atom` takes or gives at step k, each as (its place, its holder's place, or
        None for `atom` itself) in panel `side`; None when the step makes or breaks a bond of `atom`
        to a heavy atom other than `keep`, or to a hydrogen not drawn there."""
        traded = []
        here = self.positions[side]
        for bond in self._changed_bonds(k):
            if atom not in bond or bond == keep or (bond in self.bonds_in[k]) == (bond in self.bonds_in[k + 1]):
                continue
            h = bond[0] + bond[1] - atom
            if self.element[h] != 1 or h not in here:
                return None
            holder = self._holder(side, h)
            traded.append((here[h], here.get(holder) if holder is not None and holder != atom else None))
        return traded

    # branches drawn through bonds
    def _turn_branches_off_bonds(self) -> None:
        """Branches drawn through another group's bond turned off it (untangle.py); a hydrogen
        drawn on a turned atom turns with it."""
        heavy = [{a: p for a, p in here.items() if self.element[a] != 1} for here in self.positions]
        hydrogens = [{a: p for a, p in here.items() if self.element[a] == 1} for here in self.positions]
        labelled = frozenset(a for a in self.atoms if self.element[a] not in (1, 6))
        Untangler(heavy, self.bonds_in, self.touched, self.joining, labelled, hydrogens).run()
        for here, turned, turned_h in zip(self.positions, heavy, hydrogens):
            here.update(turned)
            here.update(turned_h)

    # trigonal centres
    def _ease_trigonal_centres(self) -> None:
        """The union's depiction draws an atom with every partner it ever has: a carbonyl carbon
        that a nucleophile adds to is a cross, and in the panels where it holds three partners
        two of them stand 60 or 90 degrees apart. A step that touches a terminal atom (the
        carbonyl oxygen, whose pi bond it makes or breaks) lets it move between that step's
        panels, so in each run of panels where nothing touches it, it turns about its one
        neighbour to the middle of the gap it stands in, as far as the run allows (common
        practice: three bonds at 120 degrees)."""
        # Each atom's drawn partners per panel, counted once: most atoms are no chain end, or end
        # on no centre of three, and are passed over on the count.
        degrees = []
        for bonds in self.bonds_in:
            count: dict[int, int] = {}
            for i, j in bonds:
                count[i] = count.get(i, 0) + 1
                count[j] = count.get(j, 0) + 1
            degrees.append(count)
        # Only an atom that ends a chain in some panel can be eased: the rest are passed over at once.
        ends = {atom for count in degrees for atom, bonded in count.items() if bonded == 1}
        for atom in self.atoms:
            if self.element[atom] == 1 or atom not in ends:
                continue
            k = 0
            while k < self.n:
                if atom not in self.positions[k]:
                    k += 1
                    continue
                first = k
                while k + 1 < self.n and atom in self.positions[k + 1] and atom not in self.touched[k]:
                    k += 1
                if all(degrees[p].get(atom) == 1 for p in range(first, k + 1)):
                    self._ease_terminal(atom, range(first, k + 1), degrees)
                k += 1

    def _ease_terminal(self, atom: int, panels: range, degrees: list[dict[int, int]]) -> None:
        """Turn `atom`, bonded to one centre of three drawn partners in each of `panels`, about
        that centre toward the middle of its gap between the other two, the same turn in every
        panel (it may not move within the run): only where the smallest angle at the centre
        grows by 10 degrees or more, nothing comes nearer it than it allows, an atom of another
        molecule stays _CLEARANCE off (or where it is, if nearer), no bond is crossed, and a
        partner the centre is about to bond stays as far off (up to 100 degrees). The cheap tests
        come first: most atoms of a scheme fail one of them."""
        centre = None
        for p in panels:
            bonds = self.bonds_in[p]
            bonded = [n for n in self.neighbours[atom] if (min(atom, n), max(atom, n)) in bonds]
            if len(bonded) != 1 or (centre is not None and bonded[0] != centre):
                return
            centre = bonded[0]
            if degrees[p].get(centre) != 3 or self.positions[p].get(centre) != self.positions[panels[0]].get(centre):
                return
        if centre not in self.positions[panels[0]]:
            return
        origin = self.positions[panels[0]][centre]
        arm = self.positions[panels[0]][atom] - origin
        others: list[list[complex]] = []    # per panel: the centre's other partners, as unit directions
        for p in panels:
            here = self.positions[p]
            around = [unit(here[n] - origin) for n in self.neighbours[centre]
                      if n != atom and n in here and (min(centre, n), max(centre, n)) in self.bonds_in[p]]
            if len(around) != 2:
                return
            others.append(around)

        def angle(a: complex, b: complex) -> float:
            return abs(cmath.phase(a / b))

        def narrowest(d: complex) -> float:
            return min(min(angle(d, o) for o in around) for around in others)

        def wall_between(a: complex, b: complex) -> bool:   # a partner's direction on the short way from a to b
            turn = cmath.phase(b / a)
            return any(0 < cmath.phase(o / a) * (1 if turn > 0 else -1) < abs(turn)
                       for around in others for o in around)

        start = unit(arm)
        # The angle between the other two bonds bounds what any turn can reach, and so does half
        # the gap it stands in (a turn stays in its gap): most atoms are drawn well already.
        between = min(angle(o[0], o[1]) for o in others)
        wanted = min(narrowest(start), between) + math.radians(10)
        if between < wanted or min(gap_around(start, around) for around in others) / 2 < wanted:
            return
        # The steps at either end of the run may touch it only through its bond to the centre, or
        # by a proton it takes or gives: a bond it makes or breaks to another heavy atom (the ring
        # it closes) placed that partner by where it stands. A proton's partner keeps within
        # reach: (the hydrogen's place, its holder's place) on this side of the step.
        own = (min(atom, centre), max(atom, centre))
        protons: list[tuple[complex, Optional[complex]]] = []
        for k, side in ((panels[0] - 1, panels[0]), (panels[-1], panels[-1])):
            if 0 <= k < self.n - 1:
                traded = self._protons_traded(atom, k, side, own)
                if traded is None:
                    return
                protons += traded
        partners: list[complex] = []         # directions to atoms the centre is about to bond
        for p in panels:
            if p + 1 < self.n:
                here = self.positions[p]
                made = [pair for pair in self.made[p] if centre in pair]
                partners += [unit(here[a + b - centre] - origin) for a, b in made if a + b - centre in here]
        kept_off = [min(angle(start, q), math.radians(100)) for q in partners]
        turns = []   # (score, order, direction) of every turn that would do, widest first
        for order, degrees in enumerate(range(-90, 91, 5)):
            d = start * cmath.rect(1.0, math.radians(degrees))
            if any(angle(d, o) < wanted for around in others for o in around):
                continue   # narrowest(d) < wanted, found without measuring every angle (most turns)
            score = narrowest(d)
            if not wall_between(start, d) \
                    and all(angle(d, q) >= limit - 1e-9 for q, limit in zip(partners, kept_off)):
                turns.append((-score, order, d))
        if not turns or any(self.states[p].mol.GetAtomWithIdx(centre).GetChiralTag() != Chem.ChiralType.CHI_UNSPECIFIED
                            for p in panels):
            return   # (a written configuration: its wedges read the angles as they are)
        crowd = np.array([q for p in panels for a, q in self.positions[p].items() if a not in (atom, centre)],
                         dtype=complex)
        room = min(float(np.abs(crowd - (origin + arm)).min()) if len(crowd) else 9.0, 0.95)
        # Atoms of other molecules keep the clearance of separately placed clusters, or what they
        # have if less: turned to a bond length of one, an atom reads as bonded to it (the urea
        # oxygen just cut from an ester's carbon, turned to 1.0 from that carbon and 0.99 from
        # its C=O oxygen, drew a rhombus with them). Not in the last panel, whose molecules are
        # set apart in a row afterwards (_set_by_products_beside_product). Only an atom squeezed
        # within 60 degrees of another bond of its centre, where the depiction of every partner
        # its centre ever has left it (an ester's C=O oxygen 50 degrees from its OBt oxygen),
        # takes the widest turn that comes nearer one: the lesser fault.
        strangers = np.array([q for p in panels if p < self.n - 1 for molecule in self.molecules[p]
                              if atom not in molecule for a in molecule if a in self.positions[p]
                              for q in (self.positions[p][a],)], dtype=complex)
        distance = min(float(np.abs(strangers - (origin + arm)).min()) if len(strangers) else 9.0, _CLEARANCE)
        squeezed = narrowest(start) < _SIXTY
        walls = [(self.positions[p][i], self.positions[p][j]) for p in panels for i, j in self.bonds_in[p]
                 if atom not in (i, j) and centre not in (i, j)
                 and i in self.positions[p] and j in self.positions[p]]
        here = origin + arm
        nearer_a_stranger = None   # (the widest turn that would do but for the strangers)
        for _, _, d in sorted(turns, key=lambda t: t[:2]):
            spot = origin + d * abs(arm)
            if (len(crowd) and float(np.abs(crowd - spot).min()) < room - 1e-9) \
                    or any(segments_cross(origin, spot, a, b) for a, b in walls):
                continue
            if any(not min(abs(here - h), TRANSFER_GAP - 0.1) <= abs(spot - h) <= max(abs(here - h), TRANSFER_GAP + 0.3)
                   or (holder is not None and abs(spot - holder) > max(abs(here - holder), PARTNER_REACH[1] + 0.4))
                   for h, holder in protons):
                continue   # its proton would be left out of reach, or too near for its arrow
            if len(strangers) and float(np.abs(strangers - spot).min()) < distance - 1e-9:
                if nearer_a_stranger is None:
                    nearer_a_stranger = spot
                continue
            for p in panels:
                self.positions[p][atom] = spot
            return
        if squeezed and nearer_a_stranger is not None:
            for p in panels:
                self.positions[p][atom] = nearer_a_stranger

    # travelling hydrogens
    def _place_hydrogens(self) -> None:
        for h, runs in sorted(self.residences.items()):
            for n, r in enumerate(runs):
                if r.holder is None or r.holder not in self.positions[r.first]:
                    continue
                if r.direction is None:
                    r.direction = self._hydrogen_direction(h, runs, n)
                for k in range(r.first, r.last + 1):
                    if r.holder in self.positions[k]:
                        self.positions[k][h] = self.positions[k][r.holder] + r.direction
            for r in runs:
                if r.holder is None:
                    for k in range(r.first, r.last + 1):
                        if h in self.exists[k]:
                            self.positions[k][h] = self._free_proton(h, k)
        for h, runs in sorted(self.residences.items()):
            for n in range(len(runs)):
                self._untangle(runs, n)
        for h in sorted(self.drawn_h - self.bridging):
            self._turn_from_partner(h)

    def _turn_from_partner(self, h: int) -> None:
        """A hydrogen passed between two atoms of one cluster (a syn elimination through a
        five-membered ring) is drawn by the cluster's depiction, where it may sit nearer the atom
        that takes it than a curved arrow needs to bend: before its hop it is turned about its
        holder, as little as will do, until it is TRANSFER_GAP - 0.1 from that atom (common
        practice: the arrow has room), keeping clear of every other atom and bond and of the
        holder's other bonds. Or it may stand behind its holder from that atom (a C-alpha H drawn
        away from the lysine that takes it, the arrow running round the holder): it turns into the
        gap between the holder's bonds that faces the taker (common practice: the proton a base
        takes is drawn on the side facing the base; _facing_taker). It turns in every panel it
        sits on that holder, so it keeps its place while the steps before leave it alone."""
        holders = [(k, self._holder(k, h)) for k in range(self.n) if h in self.positions[k]]
        for (k, holder), (k_next, partner) in zip(holders, holders[1:]):
            if k_next != k + 1 or holder is None or partner is None or holder == partner:
                continue
            here = self.positions[k]
            if holder not in here or partner not in here:
                continue
            centre = here[holder]
            start = here[h] - centre
            near = abs(here[h] - here[partner]) < TRANSFER_GAP - 0.1
            if not near and abs(cmath.phase(start / (here[partner] - centre))) <= math.pi / 2:
                continue
            if (min(holder, partner), max(holder, partner)) in self.bonds_in[k]:
                continue   # a 1,2-shift: the hydrogen leans toward the atom it moves to
            # The panels before, back to where the holder or the partner stood elsewhere (a ring
            # closed onto the holder, as a lactam's amine adds to its ester): there the hydrogen
            # moves with its holder anyway.
            panels = [k]
            while (panels[0] > 0 and self._holder(panels[0] - 1, h) == holder and h in self.positions[panels[0] - 1]
                   and self.positions[panels[0] - 1].get(holder) == centre
                   and self.positions[panels[0] - 1].get(partner) == here[partner]):
                panels.insert(0, panels[0] - 1)
            # Only the panels that draw it hold it off atoms and bonds (its holder's other
            # hydrogen, taken steps before, stands where it stands while it is hidden).
            seen = [p for p in panels if self._drawn_in(h, p)] or panels
            bonded = [n for n in self.neighbours[holder]
                      if n != h and n in here and (min(n, holder), max(n, holder)) in self.bonds_in[k]]
            bonds = [(self.positions[p][i], self.positions[p][j]) for p in seen for i, j in self.bonds_in[p]
                     if h not in (i, j) and holder not in (i, j) and i in self.positions[p] and j in self.positions[p]]
            own = [unit(here[n] - centre) for n in bonded]
            if near:
                others = [q for p in seen for a, q in self.positions[p].items() if a not in (h, holder)]
                turns = [start * cmath.rect(1.0, math.radians(degrees)) for degrees in (15, -15, 30, -30, 45, -45, 60, -60)]
            else:
                # (the holder's own partners are kept off by the angle to its bonds)
                others = [q for p in seen for a, q in self.positions[p].items() if a not in (h, holder, *bonded)]
                turns = self._facing_taker(h, partner, centre, own, abs(here[h] - here[partner]), others, k)
            for d in turns:
                spot = centre + d
                if abs(spot - here[partner]) < TRANSFER_GAP - 0.1:
                    continue
                if any(abs(spot - q) < _HYDROGEN_ROOM for q in others) \
                        or any(abs(cmath.phase(d / b)) < math.radians(35) for b in own) \
                        or any(segments_cross(centre, spot, a, b) for a, b in bonds):
                    continue
                for p in panels:
                    self.positions[p][h] = spot
                break

    def _facing_taker(self, hydrogen: int, partner: int, centre: complex, own: list[complex], reach: float,
                      others: list[complex], k: int) -> list[complex]:
        """Directions for a hydrogen on the far side of its holder (at `centre`, its bonds along
        `own` in panel k) from the atom `partner` that takes it (now `reach` from the hydrogen):
        every 5 degrees, at least _FACING_OFF_A_BOND from each of the holder's bonds, within 90
        degrees of the taker and nearer it than `reach`, out of every ring, the straight way from
        the taker crossing no bond. First those whose way keeps furthest from the `others` (the
        arrow runs there, not through a label beside it), then the most open, then the nearest the
        taker. The caller keeps them clear of atoms and bonds."""
        here = self.positions[k]
        polygons = [[here[a] for a in ring] for ring in self._closed_rings(k)] + self._curled_rings(hydrogen, k)
        taker = here[partner] - centre
        near = [q - centre for q in others if abs(q - centre) < abs(taker) + 1.0]
        walls = [(here[i] - centre, here[j] - centre) for i, j in self.bonds_in[k]
                 if i in here and j in here and hydrogen not in (i, j) and partner not in (i, j)]
        scored = []
        for step in range(72):
            d = cmath.rect(1.0, step * math.pi / 36)
            off = min((abs(cmath.phase(d / b)) for b in own), default=math.pi)
            if off < _FACING_OFF_A_BOND or abs(cmath.phase(d / taker)) > math.pi / 2 or abs(d - taker) >= reach:
                continue
            if any(inside_polygon(centre + d, polygon) for polygon in polygons):
                continue
            if any(segments_cross(taker, d, a, b) for a, b in walls):
                continue   # its arrow would cross a bond on the way
            way = min((distance_to_segment(q, taker, d) for q in near if abs(q - taker) > 1e-6), default=9.0)
            scored.append((-round(min(way, 1.0), 1), -round(off, 6), abs(d - taker), step, d))
        return [d for *_, d in sorted(scored)]

    def _untangle(self, runs: list[_Residence], n: int) -> None:
        """Turn a travelling hydrogen that lands too close to another atom, or far from (or
        cramped against) the atom it hops to next, to the best direction nearby, the same in
        every panel it stays on its holder: room first, then about TRANSFER_GAP from that
        partner, so the arrow that takes it is neither cramped nor long. Room counts in the
        panels that draw it (next to the steps that move it).

        A hydrogen drawn on the panel after it arrives and again, after panels that fold it into
        its holder's label, on the panel before it leaves (an alcohol protonated, then ionised,
        the water it becomes giving up that proton steps later), for which no one direction is
        clear of every atom and bond in both, is turned for each stretch on its own: the
        holder's surroundings differ between them, and no reader sees it move while it is
        hidden. The stretch before its next hop keeps the direction toward that partner; an
        earlier one starts pointing back the way it came."""
        r = runs[n]
        stay = [k for k in range(r.first, r.last + 1) if r.holder in self.positions[k] and r.hydrogen in self.positions[k]]
        if not stay or r.direction is None:
            return
        shown = [k for k in stay if self._drawn_in(r.hydrogen, k)]
        direction, roomy = self._untangled(runs, n, shown or stay, r.direction, last=True)
        stretches = self._shown_stretches(stay, shown) if not roomy else []
        if len(stretches) > 1:
            for part, seen in stretches[:-1]:
                start = r.direction
                if n > 0 and runs[n - 1].last == r.first - 1 and runs[n - 1].direction is not None:
                    start = -runs[n - 1].direction
                turned, _ = self._untangled(runs, n, seen, start, last=False)
                for k in part:
                    self.positions[k][r.hydrogen] = self.positions[k][r.holder] + turned
            stay, seen = stretches[-1]
            direction, _ = self._untangled(runs, n, seen, r.direction, last=True)
        elif direction == r.direction:
            return
        r.direction = direction
        for k in stay:
            self.positions[k][r.hydrogen] = self.positions[k][r.holder] + direction

    @staticmethod
    def _shown_stretches(stay: list[int], shown: list[int]) -> list[tuple[list[int], list[int]]]:
        """`stay` cut before each shown panel that follows a hidden one: (its panels, those of
        them shown), in order. Hidden panels go with the shown ones before them (those before
        the first shown panel with the first)."""
        out: list[tuple[list[int], list[int]]] = [([], [])]
        drawn = set(shown)
        for previous, k in zip([None] + stay, stay):
            if k in drawn and previous is not None and previous not in drawn and out[-1][1]:
                out.append(([], []))
            out[-1][0].append(k)
            if k in drawn:
                out[-1][1].append(k)
        return out

    def _untangled(self, runs: list[_Residence], n: int, panels: list[int], start: complex, last: bool
                   ) -> tuple[complex, bool]:
        """The best direction for the hydrogen of `runs[n]` over `panels`, from `start`, and whether
        it is clear of every atom and bond there: the search of _untangle. Only the `last`
        stretch looks at the partner it hops to next."""
        r = runs[n]
        # Other atoms relative to the holder, over those panels (duplicates dropped; in no
        # particular order, as only their nearest approach is asked for).
        # (A hydrogen another molecule holds but this panel does not draw takes no room; one of
        # its own cluster keeps its spot, so that the cluster reads alike from panel to panel.)
        # Only those that may stand nearer a spot than the most room scored (_HYDROGEN_ROOM_SCORED):
        # one further out changes no score, and most of the panel is passed over before the tests
        # and the distances to every compass direction.
        own = self.cluster_of.get(r.holder)
        within = max(1.0, abs(start)) + _HYDROGEN_ROOM_SCORED + 0.05   # (directions are unit, or start)
        nearby = set()
        for k in panels:
            centre = self.positions[k][r.holder]
            for a, p in self.positions[k].items():
                if abs(p - centre) < within and a not in (r.hydrogen, r.holder) \
                        and (self._drawn_in(a, k) or self.cluster_of.get(self._holder(k, a)) == own) \
                        and not self._one_seen(a, r.hydrogen, r.holder, k):
                    nearby.add(p - centre)
        relative = np.array(list(nearby), dtype=complex)
        following = runs[n + 1] if n + 1 < len(runs) else None
        moves_on = last and following is not None and following.holder is not None and following.first == r.last + 1
        partner = None
        if (moves_on and r.holder in self.positions[r.last] and r.hydrogen in self.positions[r.last]
                and following.holder in self.positions[r.last]):
            partner = self.positions[r.last][following.holder] - self.positions[r.last][r.holder]

        def room(direction: complex) -> float:
            return float(np.minimum.reduce(np.abs(relative - direction), axis=None)) if len(relative) else math.inf

        # A proton taken for good (no hop from this holder follows) has done its part: where its
        # molecule stands by, it keeps clear of the others, as separately placed molecules do
        # (pointing at an atom another molecule is about to lose, it reads as a transfer).
        aloof = self._others_while_standing_by(r.holder, panels) if not moves_on else np.zeros(0, dtype=complex)

        def clear(direction: complex) -> bool:
            return not len(aloof) or float(np.minimum.reduce(np.abs(aloof - direction))) >= _CLEARANCE

        def miss(direction: complex) -> float:
            """How far the hydrogen is from a comfortable hop to its next partner."""
            if partner is None:
                return 0.0
            reach = abs(partner - direction)
            # Behind its holder from the partner, the arrow that takes it must run round the
            # holder's label (an ammonium's H drawn away from the alkoxide that takes it).
            behind = max(0.0, -(direction * partner.conjugate()).real / abs(partner) - 0.2)
            return max(0.0, TRANSFER_GAP - 0.1 - reach, reach - TRANSFER_GAP - 0.4) + 0.5 * behind

        # Bonds its own bond would cross (relative to the holder): a hydrogen is never drawn
        # across another bond, however much room it has.
        walls = set()
        for k in panels:
            here, centre = self.positions[k], self.positions[k][r.holder]
            for i, j in self.bonds_in[k]:
                if i in here and j in here and r.hydrogen not in (i, j) and r.holder not in (i, j):
                    a, b = here[i] - centre, here[j] - centre
                    # Only a bond that reaches the unit square round the holder can cross its bond.
                    if (max(a.real, b.real) >= -1 and min(a.real, b.real) <= 1
                            and max(a.imag, b.imag) >= -1 and min(a.imag, b.imag) <= 1):
                        walls.add((a, b))
        crossed_now = any(segments_cross(0j, start, a, b) for a, b in walls)
        room_now = room(start)
        fed = self._fed_shut(r.hydrogen, r.holder, panels[0])
        # Each compass direction's miss, worked out once and only where it is asked for: most
        # directions lose on the tests before it.
        misses: list[Optional[float]] = [None] * len(_HYDROGEN_COMPASS)

        def miss_at(index: int) -> float:
            if misses[index] is None:
                misses[index] = miss(_HYDROGEN_COMPASS[index])
            return misses[index]

        if partner is not None:
            # The gap beside the fed bond only where the partner, placed by now, is in reach of
            # it: otherwise the arrow that takes the hydrogen runs long, round the molecule.
            beside = [index for index, shut in enumerate(fed(_HYDROGEN_COMPASS_ARRAY).tolist()) if not shut]
            if beside and all(miss_at(index) > _FAR_FROM_PARTNER for index in beside):
                fed = self._fed_shut(r.hydrogen, r.holder, panels[0], relax=False)

        def cramped(direction: complex) -> bool:
            return bool(fed(np.array([direction]))[0])

        here = self.positions[panels[0]]
        partners = [x for x in self.neighbours[r.holder] if x != r.hydrogen and x in here]
        bonds = [unit(here[x] - here[r.holder]) for x in partners]
        # The holder's one other bond in these panels, if it has just one: the hydrogen keeps an
        # angle from it that a reader sees.
        bonded = [x for x in partners if all((min(r.holder, x), max(r.holder, x)) in self.bonds_in[k] for k in panels)]
        lone = unit(here[bonded[0]] - here[r.holder]) if len(bonded) == 1 else None
        orders = {self.orders_in[k].get((min(r.holder, bonded[0]), max(r.holder, bonded[0])), 0) for k in panels} \
            if lone is not None else set()
        trigonal = any(order >= 2 for order in orders)
        # A carbon drawn as a bare vertex, not straight by nature (HC#N is).
        vertex = lone is not None and self.element[r.holder] == 6 and max(orders) < 3

        def closed(direction: complex) -> bool:
            """Folded onto the double bond that is its holder's one other bond (an N-H drawn 80
            degrees from its C=N): a trigonal centre is drawn at 120 degrees within 15 (VSEPR);
            or, from a carbon vertex, straight on from its one other bond, where the vertex is no
            longer seen (nitromethane's H-C-N drawn as one line from H to N)."""
            if lone is None:
                return False
            turn = abs(cmath.phase(direction / lone))
            return (trigonal and turn < _OPEN_ANGLE) or (vertex and turn > _HIDDEN_VERTEX)

        # Ring outlines relative to the holder, over those panels: a direction into a closed
        # ring is never taken; out of a ring still to close is preferred where it has room.
        polygons = [[self.positions[k][a] - self.positions[k][r.holder] for a in ring]
                    for k in panels for ring in self._closed_rings(k)]
        curled = [[q - self.positions[k][r.holder] for q in outline]
                  for k in panels for outline in self._curled_rings(r.hydrogen, k)]

        def out_of_curl(direction: complex, space: float) -> bool:
            """Outside every curled ring, with room enough that its label is read on its own."""
            return not curled or (space >= _ROOM_OUT_OF_CURL
                                  and not any(inside_polygon(direction, poly) for poly in curled))

        if (room_now >= _HYDROGEN_ROOM and miss(start) == 0.0 and not crossed_now and not cramped(start)
                and not closed(start) and clear(start) and out_of_curl(start, room_now)):
            return start, True
        walls = np.array(sorted(walls, key=lambda w: (w[0].real, w[0].imag)), dtype=complex).reshape(-1, 2)

        def crossing(directions: list[complex]) -> list[bool]:
            if not len(walls):
                return [False] * len(directions)
            return crosses_any(np.zeros(len(directions), dtype=complex), np.array(directions, dtype=complex), walls)

        # Not cramped first, then out of a curled ring, then clear of every atom and bond, then of
        # bonds at least, then not folded, then clear of the molecules its holder's stands
        # beside; among those, room and a comfortable hop.
        start_score = (not cramped(start), out_of_curl(start, room_now), room_now >= _HYDROGEN_ROOM and not crossed_now,
                       not crossed_now, not closed(start), clear(start),
                       min(room_now, _HYDROGEN_ROOM_SCORED) + 0.1 - miss(start))
        best, best_score = start, start_score
        compass = _HYDROGEN_COMPASS
        rooms = (np.minimum.reduce(np.abs(relative - _HYDROGEN_COMPASS_ARRAY[:, None]), axis=1).tolist() if len(relative)
                 else [math.inf] * len(compass))
        # cramped and clear over the whole compass in one call each: numpy's cost is per call.
        shut = fed(_HYDROGEN_COMPASS_ARRAY).tolist()
        clears = ((np.minimum.reduce(np.abs(aloof - _HYDROGEN_COMPASS_ARRAY[:, None]), axis=1) >= _CLEARANCE).tolist()
                  if len(aloof) else [True] * len(compass))
        for index, (d, space, crossed, cramped_d, clear_d) in enumerate(zip(compass, rooms, crossing(compass), shut,
                                                                             clears)):
            tests = (not cramped_d, out_of_curl(d, space), space >= _HYDROGEN_ROOM and not crossed, not crossed,
                     not closed(d), clear_d)
            if tests < best_score[:6]:
                continue   # (lost on the tests: its miss is not worked out)
            score = tests + (min(space, _HYDROGEN_ROOM_SCORED) + 0.1 * (d / start).real - miss_at(index),)
            if not (tests > best_score[:6] or score[6] > best_score[6] + 0.05):
                continue
            # Only a direction that would win is asked whether it is allowed at all.
            if any(abs(cmath.phase(d / b)) < _OFF_A_BOND for b in bonds):
                continue
            if len(bonds) == 1 and score[:6] == start_score[:6] and abs(cmath.phase(d / bonds[0])) < _OPEN_ANGLE:
                continue   # no more room, only a nearer partner: not worth closing a lone bond's angle
            if any(inside_polygon(d, poly) for poly in polygons):
                continue
            best, best_score = d, score
        return best, best_score[2]

    def _others_while_standing_by(self, holder: int, panels: Sequence[int]) -> np.ndarray:
        """Where the atoms of other molecules drawn stand, relative to `holder`, in those of
        `panels` in which the holder's molecule stands by: a step leaves that panel and touches
        no atom of it."""
        spots = set()
        for k in panels:
            if k + 1 >= self.n:
                continue
            own = next((set(m) for m in self.molecules[k] if holder in m), {holder})
            if own & self.touched[k]:
                continue
            centre = self.positions[k][holder]
            spots |= {p - centre for a, p in self.positions[k].items() if a not in own and self._drawn_in(a, k)}
        return np.array(list(spots), dtype=complex)

    def _drawn_in(self, atom: int, k: int) -> bool:
        """Whether panel k draws the atom: a travelling hydrogen only next to the steps that move
        it (elsewhere it is one of its holder's implicit hydrogens, and takes no room of its own)."""
        return (atom not in self.drawn_h or atom in self.labelled_h or atom in self.touched[k]
                or (k > 0 and atom in self.touched[k - 1]))

    def _one_seen(self, a: int, b: int, holder: int, k: int) -> bool:
        """Whether `a` and `b` are two hydrogens on the carbon `holder` in panel k of which it draws
        at most one: they may share a spot, only one being seen (a CH2 whose protons are taken
        steps apart: the one taken first takes the side facing its base, the other is drawn
        later). Not on a heteroatom: its label writes the hidden one, on a side of its own."""
        return (a != b and self.element.get(holder) == 6 and self.element.get(a) == 1 and self.element.get(b) == 1
                and self._holder(k, a) == holder and self._holder(k, b) == holder
                and not (self._drawn_in(a, k) and self._drawn_in(b, k)))

    def _hydrogen_direction(self, h: int, runs: list[_Residence], n: int) -> complex:
        """Toward the partner the hydrogen goes to next (or came from), if that side is free."""
        r = runs[n]
        k = r.first
        centre = self.positions[k][r.holder]
        partner = None
        if n + 1 < len(runs) and runs[n + 1].holder is not None and runs[n + 1].holder in self.positions[r.last]:
            partner = self.positions[r.last][runs[n + 1].holder] - self.positions[r.last][r.holder]
        elif n > 0 and runs[n - 1].holder is not None and runs[n - 1].holder in self.positions[k]:
            partner = self.positions[k][runs[n - 1].holder] - centre
        return self._roomiest(r.holder, k, h, prefer=partner)

    def _free_proton(self, h: int, k: int) -> complex:
        ends = [self.positions[k][n] for n in sorted(self.neighbours[h]) if n in self.positions[k]]
        return sum(ends) / len(ends) if ends else 0j
