"""Turning branches of a 2D depiction about the atom they hang on.

A branch hanging on a bond that is in no ring can turn about the atom it hangs on without
changing any bond length. Two uses:

Easing atoms drawn on top of each other. RDKit's depictor crowds an atom with many acyclic
branches next to a ring (the phosphorus of an oxaphosphetane with its three phenyls) and may lay
two branches over each other: a branch turns just far enough to clear the rest, keeping the
order of the bonds round the atom it hangs on (so a double bond drawn cis or trans keeps its
shape).

Moving a free slot of a crowded centre next to a given neighbour (the slot kept for the
hydrogen whose C-H pair goes into the bond to that neighbour, in an E2 at a fully substituted
carbon): a neighbour between the slot and the bond's partner swaps places with the slot, and
the centre's other branches fan out so that, once the hydrogen is gone, no two heavy bonds are
drawn in line.

Units: one bond length.
"""
from __future__ import annotations

import cmath
import math
from typing import Sequence

import numpy as np

CLASH = 0.5          # atoms nearer than this (bond lengths) read as one atom
_ROOM = 1.0          # a turned branch is content with this much room
_EASED = 0.8         # once a clash is found, branches turn until every atom has this much room
_KEEP_APART = math.radians(20)   # least angle left between the turned bond and its pivot's other bonds
_TURNS = np.radians(np.array([d for step in range(1, 19) for d in (5 * step, -5 * step)], dtype=float))
_ROUNDS = 8          # branches turned at most, one per round
# Where the two branches of a crossed centre after its hydrogen's slot go, in degrees round from
# the partner X that the hydrogen stands beside: 80 for the hydrogen (the least the arrow
# between the C-H and C-X bonds wants), 70 more to the next branch, the last halfway round the
# rest (150 and 105 degrees between the heavy bonds once the hydrogen is gone).
_SLOT_FAN = (150.0, 255.0)


def side_beyond(start: int, cut: int, adjacent) -> set[int]:
    """The atoms reached from `start` without passing through `cut` (`adjacent`: each atom's
    neighbours, a list by index or a dict)."""
    seen, todo = {start}, [start]
    while todo:
        for n in adjacent[todo.pop()]:
            if n != cut and n not in seen:
                seen.add(n)
                todo.append(n)
    return seen


def _adjacency(count: int, bonds: Sequence[tuple[int, int]]) -> list[list[int]]:
    adjacent: list[list[int]] = [[] for _ in range(count)]
    for i, j in bonds:
        adjacent[i].append(j)
        adjacent[j].append(i)
    return adjacent


def may_stand_closer(points: list[tuple[float, float]], reach: float) -> bool:
    """Whether two of `points` (x, y) may stand nearer than `reach`: a sweep along x compares
    each point only with those less than `reach` further right, a few dozen Python comparisons
    that cost less than numpy's matrix of every pair (which then measures only where this finds
    a pair). The slack keeps every pair that numpy's rounding could find nearer."""
    ordered = sorted(points)
    reach *= 1 + 1e-6
    limit = reach * reach
    for k, (x, y) in enumerate(ordered):
        for m in range(k + 1, len(ordered)):
            x2, y2 = ordered[m]
            dx = x2 - x
            if dx >= reach:
                break
            dy = y2 - y
            if dx * dx + dy * dy < limit:
                return True
    return False


def _nearest_pair(points: np.ndarray) -> tuple[float, int, int]:
    gaps = np.abs(points[:, None] - points[None, :])
    np.fill_diagonal(gaps, np.inf)
    flat = int(np.argmin(gaps))
    i, j = divmod(flat, len(points))
    return float(gaps[i, j]), i, j


def _turn_limits(points: np.ndarray, pivot: int, root: int, adjacent: Sequence[Sequence[int]]) -> tuple[float, float]:
    """How far the bond pivot-root may turn anticlockwise and clockwise (radians, in the
    coordinates' own sense) before it comes within _KEEP_APART of another bond of the pivot."""
    bond = points[root] - points[pivot]
    angles = [cmath.phase((points[n] - points[pivot]) / bond) % (2 * math.pi) for n in adjacent[pivot] if n != root]
    if not angles:
        return math.pi, math.pi
    return min(angles) - _KEEP_APART, 2 * math.pi - max(angles) - _KEEP_APART


def ease_clashes(points: np.ndarray, bonds: Sequence[tuple[int, int]], ring_bonds: set[tuple[int, int]]) -> np.ndarray:
    """`points` (complex, unit bond length) with branches turned, where two atoms are nearer
    than CLASH, until no two are nearer than _EASED (or no turn of a branch on a ring-free bond
    parts them further). `ring_bonds` holds
    (i, j) with i < j. Returns `points` itself when nothing is too near."""
    if (len(points) < 3 or not may_stand_closer(list(zip(points.real.tolist(), points.imag.tolist())), CLASH)
            or _nearest_pair(points)[0] >= CLASH):
        return points
    points = points.copy()
    adjacent = _adjacency(len(points), bonds)
    hinges = [(pivot, root) for i, j in bonds if (min(i, j), max(i, j)) not in ring_bonds
              for pivot, root in ((i, j), (j, i))]
    for _ in range(_ROUNDS):
        nearest, a, b = _nearest_pair(points)
        if nearest >= _EASED:
            break
        best = None     # (score, turned points)
        for pivot, root in hinges:
            side = side_beyond(root, pivot, adjacent)
            if (a in side) == (b in side) or pivot in side:
                continue   # the turn would not part the pair, or the bond closes a ring after all
            moved = np.array(sorted(side))
            still = np.array([k for k in range(len(points)) if k not in side])
            anticlockwise, clockwise = _turn_limits(points, pivot, root, adjacent)
            turns = _TURNS[(_TURNS <= anticlockwise) & (-_TURNS <= clockwise)]
            if not len(turns):
                continue
            centre = points[pivot]
            # Every allowed turn at once: rows are turns, columns the moved atoms.
            turned = centre + (points[moved] - centre)[None, :] * np.exp(1j * turns)[:, None]
            rooms = np.abs(turned[:, :, None] - points[still][None, None, :]).min(axis=(1, 2))
            # Small turns and small branches first, among turns that leave enough room.
            scores = np.minimum(rooms, _ROOM) - 0.002 * np.degrees(np.abs(turns)) - 0.001 * len(moved)
            k = int(np.argmax(scores))
            if rooms[k] > nearest and (best is None or scores[k] > best[0]):
                trial = points.copy()
                trial[moved] = turned[k]
                best = (float(scores[k]), trial)
        if best is None:
            break
        points = best[1]
    return points


def _beside(points: np.ndarray, centre: int, slot: int, partners: set[int], adjacent: Sequence[Sequence[int]]) -> bool:
    """Whether `slot` is next to one of `partners` in the order of the centre's bonds round it."""
    around = sorted(adjacent[centre], key=lambda n: cmath.phase(points[n] - points[centre]))
    at = around.index(slot)
    return bool({around[at - 1], around[(at + 1) % len(around)]} & partners)


def slot_beside(points: np.ndarray, bonds: Sequence[tuple[int, int]], ring_bonds: set[tuple[int, int]],
                centre: int, slot: int, partners: set[int]) -> np.ndarray:
    """`points` with the atom `slot` (a stand-in end of a bond of `centre`) next to one of
    `partners` round the centre: if it is not, a neighbour hanging on a ring-free bond of the
    centre trades places with it, its branch turned about the centre (of the trades that put the
    slot beside a partner, the one that leaves the turned branch most room). Unchanged when the
    slot is beside a partner already or no trade does it."""
    adjacent = _adjacency(len(points), bonds)
    if _beside(points, centre, slot, partners, adjacent):
        return points
    best = None   # (room, traded points)
    for branch in adjacent[centre]:
        if branch == slot or branch in partners or (min(centre, branch), max(centre, branch)) in ring_bonds:
            continue
        side = side_beyond(branch, centre, adjacent)
        if centre in side or slot in side:
            continue
        turn = (points[slot] - points[centre]) / (points[branch] - points[centre])
        trial, room = _turned(points, centre, side, turn / abs(turn), slot)
        trial[slot] = points[branch]
        if not _beside(trial, centre, slot, partners, adjacent):
            continue
        if best is None or room > best[0]:
            best = (room, trial)
    return _opened(points if best is None else best[1], adjacent, ring_bonds, centre, slot, partners)


def _opened(points: np.ndarray, adjacent: Sequence[Sequence[int]], ring_bonds: set[tuple[int, int]],
            centre: int, slot: int, partners: set[int]) -> np.ndarray:
    """A centre drawn as a cross with the slot beside a partner X, its two other branches turned
    to _SLOT_FAN round from X (each only if its bond is in no ring and it keeps _EASED room): the
    slot keeps its right angle less a little, and once the hydrogen is gone the three heavy
    bonds are not drawn in a T (two of them in line), which would read as a straight, sp atom
    in the alkene the step makes."""
    around = [n for n in adjacent[centre] if n != slot]
    if len(around) != 3 or len(adjacent[centre]) != 4:
        return points
    here = points[centre]
    x = next(n for n in around if n in partners and _beside(points, centre, slot, {n}, adjacent))
    sense = 1 if math.sin(cmath.phase((points[slot] - here) / (points[x] - here))) > 0 else -1
    def turned_from_x(n: int) -> float:
        return (sense * cmath.phase((points[n] - here) / (points[x] - here))) % (2 * math.pi)
    others = sorted((n for n in around if n != x), key=turned_from_x)
    for branch, target in zip(others, _SLOT_FAN):
        if (min(centre, branch), max(centre, branch)) in ring_bonds:
            continue
        side = side_beyond(branch, centre, adjacent)
        if centre in side or slot in side:
            continue
        turn = cmath.rect(1.0, sense * (math.radians(target) - turned_from_x(branch)))
        trial, room = _turned(points, centre, side, turn, slot)
        if room >= _EASED:
            points = trial
    return points


def _turned(points: np.ndarray, centre: int, side: set[int], turn: complex, slot: int) -> tuple[np.ndarray, float]:
    """`points` with the atoms of `side` turned by `turn` (a unit complex) about `centre`, and the
    least distance from a turned atom to any other atom but `slot`."""
    moved = np.array(sorted(side))
    trial = points.copy()
    trial[moved] = points[centre] + (points[moved] - points[centre]) * turn
    still = np.array([k for k in range(len(points)) if k not in side and k != slot])
    return trial, float(np.abs(trial[moved][:, None] - trial[still][None, :]).min())
