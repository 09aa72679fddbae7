"""Bicyclo[2.2.2] cages (DABCO, quinuclidine, bicyclo[2.2.2]octane) drawn in perspective.

RDKit's depictor draws two of the three two-atom bridges as a hexagon and squashes the third
onto the line between the bridgeheads, its bonds about 0.6 bond lengths long: the reader sees a
straight bond from bridgehead to bridgehead (an N-N bond across DABCO). Chemists draw such a cage
in perspective, the middle bridge clearly off that line (common practice; IUPAC 2008 graphical
representation standards, GR-1, ask that a drawing not suggest a bond that is not there; from
memory). Here the outer bridges keep RDKit's regular hexagon and the middle bridge crosses it at
a slant, each of its atoms 0.48 bond lengths off the bridgehead axis, on opposite sides: the
cage reads as a hexagon with a Z inside it.

Every bond of the template is one bond length, as the layout keeps every other bond (within
2%). The middle atoms stand 0.38 bond lengths from the nearest outer bond, the most a unit-bond
drawing with the bridgeheads two bond lengths apart allows (a numerical search, SciPy SLSQP,
found 0.384). Bridgeheads sqrt(2) apart would allow 0.50, but the narrower cage moves what
hangs on it: the Baylis-Hillman scheme was laid out afresh, its C2 proton 0.35 bond lengths
from C1 (measured); two apart, as RDKit draws the hexagon, the rest of a scheme keeps its place.

Units: one bond length.
"""
from __future__ import annotations

from itertools import combinations
from typing import Sequence

import numpy as np

from .branches import side_beyond

# Bridgeheads at 0 and _SPAN on the x axis; per bridge, the atom next to the first bridgehead
# and the atom next to the second. The middle bridge's first atom is on the +y side (the side is
# mirrored as the depiction had it), and so is the outer bridge _NEAR; _FAR is on the other side.
# (0.4841 = sqrt(1 - 0.875^2): every bond one length.)
_SPAN = 2.0
_MIDDLE = (complex(0.875, 0.4841), complex(1.125, -0.4841))
_NEAR = (complex(0.5, 0.866), complex(1.5, 0.866))
_FAR = (complex(0.5, -0.866), complex(1.5, -0.866))


def _adjacency(count: int, bonds: Sequence[tuple[int, int]]) -> list[set[int]]:
    adjacent: list[set[int]] = [set() for _ in range(count)]
    for i, j in bonds:
        adjacent[i].add(j)
        adjacent[j].add(i)
    return adjacent


def bicyclo_222_cages(count: int, bonds: Sequence[tuple[int, int]]) -> list[tuple[int, int, list[tuple[int, int]]]]:
    """(bridgehead, bridgehead, three bridges) for each bicyclo[2.2.2] core of the graph: two
    atoms joined by three paths of two atoms each that share no atom, and no bond between the
    paths (a bridge atom bonded to an atom of another bridge is a different cage)."""
    adjacent = _adjacency(count, bonds)
    cages = []
    for a in range(count):
        if len(adjacent[a]) < 3:
            continue
        # Each walk a-x-y-b with x, y and b distinct, grouped by its far end b.
        walks: dict[int, list[tuple[int, int]]] = {}
        for x in adjacent[a]:
            for y in adjacent[x] - {a}:
                for b in adjacent[y] - {a, x}:
                    if b > a and b not in adjacent[a]:
                        walks.setdefault(b, []).append((x, y))
        for b, paths in walks.items():
            for three in combinations(paths, 3):
                atoms = [atom for path in three for atom in path]
                if len(set(atoms)) != 6:
                    continue
                cross = any(u in adjacent[v] for p, q in combinations(three, 2) for u in p for v in q)
                if not cross:
                    cages.append((a, b, list(three)))
                    break
    return cages


def draw_cages_in_perspective(points: np.ndarray, bonds: Sequence[tuple[int, int]]) -> np.ndarray:
    """`points` (complex, unit bond length) with each bicyclo[2.2.2] cage redrawn by the
    template, about the middle of its bridgeheads and along their axis; what hangs on a cage
    atom moves with it. Returns `points` itself when the graph holds no such cage."""
    cages = bicyclo_222_cages(len(points), bonds)
    if not cages:
        return points
    points = points.copy()
    adjacent = _adjacency(len(points), bonds)
    for a, b, bridges in cages:
        centre = (points[a] + points[b]) / 2
        axis = points[b] - points[a]
        if abs(axis) < 1e-9:
            continue
        axis /= abs(axis)

        def across(atom: int) -> float:   # signed distance from the bridgehead axis
            return ((points[atom] - centre) * axis.conjugate()).imag
        # The middle bridge is the one RDKit laid nearest the axis; the outer ones keep their sides.
        middle = min(bridges, key=lambda path: sum(abs(across(atom)) for atom in path))
        outer = [path for path in bridges if path is not middle]
        lean = 1.0 if across(middle[0]) >= 0 else -1.0
        start = centre - axis * _SPAN / 2

        def at(z: complex, side: float) -> complex:
            return start + axis * complex(z.real, side * z.imag)
        targets = {a: at(0j, lean), b: at(complex(_SPAN, 0), lean)}
        # The outer bridge RDKit laid on the middle bridge's lean side takes that side's place.
        near = max(outer, key=lambda path: lean * sum(across(atom) for atom in path))
        far = outer[1] if near is outer[0] else outer[0]
        for path, place in ((near, _NEAR), (far, _FAR)):
            targets[path[0]], targets[path[1]] = at(place[0], lean), at(place[1], lean)
        targets[middle[0]], targets[middle[1]] = at(_MIDDLE[0], lean), at(_MIDDLE[1], lean)
        cage = set(targets)
        for atom, target in targets.items():
            shift = target - points[atom]
            # What hangs on the cage atom (a substituent, a stand-in) moves with it.
            hanging = set()
            for n in adjacent[atom] - cage:
                hanging |= side_beyond(n, atom, adjacent)
            if not hanging & cage:   # (a ring back into the cage stays where RDKit put it)
                for h in hanging:
                    points[h] += shift
            points[atom] = target
    return points
