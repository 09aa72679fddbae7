"""Branches turned off a bond they are drawn through, after the layout has placed every panel.

Molecules that a mechanism assembles from pieces are drawn piece by piece, each kept where it
was: the adduct of two malononitrile units (1,1,3,3-tetracyanopropane) got one nitrile drawn
straight through the other. A chemist draws such a chain as a clean zig-zag, every group clear
of the rest (common practice; IUPAC 2008 graphical representation standards, GR-1: no atom on a
bond that is not its own, no crossing bonds where a drawing without them exists; from memory).

Here a branch hanging on a ring-free bond (the nitrile, or the whole group on the carbon it
hangs on) turns about the atom it hangs on, the same turn in every panel of a run, so that no
atom stays on another's bond. A run starts at a panel whose arrival step touches every atom of
the branch, or brings its molecule in as a whole (a molecule that joins another may move as a
rigid body), and ends where the next such step does: atoms a step leaves alone keep their place.

Units: one bond length.
"""
from __future__ import annotations

import cmath
import math
from functools import cached_property
from typing import Optional, Sequence

import numpy as np

from .branches import may_stand_closer, side_beyond
from .plane import segments_cross

_ON_A_BOND = 0.25     # a skeletal vertex this near a bond not its own reads as lying on it (as scheme's note)
_LABEL_ON_A_BOND = 0.45   # and a label (an N, an O): half its width and a little
_CLEAR = 0.6          # a turned branch wants this much room from every other atom and bond
_ENOUGH = 1.5         # more room than this counts no more
_LEAST_ANGLE = math.radians(60)    # least angle the turned bond keeps from its pivot's other bonds
_TURNS = [math.radians(d) for step in range(1, 19) for d in (10 * step, -10 * step)]


def _adjacent(bonds: set[tuple[int, int]], atoms: set[int]) -> dict[int, set[int]]:
    adjacent: dict[int, set[int]] = {a: set() for a in atoms}
    for i, j in bonds:
        if i in atoms and j in atoms:
            adjacent[i].add(j)
            adjacent[j].add(i)
    return adjacent


def _distances(points: np.ndarray, starts: np.ndarray, ends: np.ndarray) -> np.ndarray:
    """Distance from each point (rows) to each segment (columns); any leading axes (panels) are
    kept."""
    along = ends - starts
    length2 = np.maximum((along * along.conjugate()).real, 1e-18)
    t = np.clip(((points[..., :, None] - starts[..., None, :]) * along.conjugate()[..., None, :]).real
                / length2[..., None, :], 0.0, 1.0)
    return np.abs(points[..., :, None] - (starts[..., None, :] + t * along[..., None, :]))


def _crossing(starts: np.ndarray, ends: np.ndarray) -> np.ndarray:
    """[..., n, m]: whether segments n and m cross, each with the other's ends on either side of its
    line (segments that share an end have a side of exactly 0 there, and cross nothing); any
    leading axes (panels) are kept. Every pair at once: numpy's cost is per call."""
    dx, dy = (ends - starts).real, (ends - starts).imag
    sx, sy, ex, ey = starts.real, starts.imag, ends.real, ends.imag
    start_side = ((sy[..., None, :] - sy[..., :, None]) * dx[..., :, None]
                  - (sx[..., None, :] - sx[..., :, None]) * dy[..., :, None])
    end_side = (ey[..., None, :] - sy[..., :, None]) * dx[..., :, None] - (ex[..., None, :] - sx[..., :, None]) * dy[..., :, None]
    straddles = start_side * end_side < 0        # [n, m]: segment m's ends on either side of segment n's line
    return straddles & np.swapaxes(straddles, -1, -2)


def _first_fault(here: dict[int, complex], bonds: list[tuple[int, int]], labelled: frozenset[int]
                 ) -> Optional[frozenset[int]]:
    """The atoms of the first atom drawn on a bond not its own (the atom and the bond's ends), or
    of two bonds that cross; None if there is neither."""
    if not bonds:
        return None
    atoms = list(here)
    points = np.array([here[a] for a in atoms])
    starts = np.array([here[i] for i, _ in bonds])
    ends = np.array([here[j] for _, j in bonds])
    reach = np.array([_LABEL_ON_A_BOND if a in labelled else _ON_A_BOND for a in atoms])
    near = _distances(points, starts, ends) < reach[:, None]
    for r, c in zip(*np.nonzero(near)):
        a, (i, j) = atoms[r], bonds[c]
        if a != i and a != j:
            return frozenset((a, i, j))
    # The first crossing pair in the order a loop over pairs would meet it.
    for n, m in zip(*np.nonzero(np.triu(_crossing(starts, ends), 1))):
        (i, j), (a, b) = bonds[n], bonds[m]
        if len({i, j, a, b}) == 4:
            return frozenset((i, j, a, b))
    return None


def _fault_reach(here: dict[int, complex], bonds: list[tuple[int, int]]) -> float:
    """How near two atoms of a panel stand if one lies on a bond not its own or two bonds cross:
    an atom within _LABEL_ON_A_BOND of a bond stands within hypot(_LABEL_ON_A_BOND, half the
    bond) of one of its ends, and two crossing bonds have an end of one within the longer's
    length over sqrt(2) of an end of the other (at most where both cross at right angles through
    their middles; by the triangle inequality an end of each lies no further from the crossing
    than half its bond)."""
    longest = max(abs(here[i] - here[j]) for i, j in bonds)
    return max(longest / math.sqrt(2), math.hypot(_LABEL_ON_A_BOND, longest / 2))


def _faultless(positions: Sequence[dict[int, complex]], bonds: Sequence[list[tuple[int, int]]],
               labelled: frozenset[int]) -> list[bool]:
    """For each panel (its atoms' points and drawn bonds): whether _first_fault finds nothing. A
    panel where no two atoms stand within _fault_reach has none (most panels: a sweep tells);
    the others are worked out in one numpy batch (numpy's cost is per call), padded to the
    largest: a padded atom stands far from everything, a padded bond is a point far the other
    way, of no length, which crosses nothing."""
    suspect = [k for k, (here, drawn) in enumerate(zip(positions, bonds))
               if drawn and may_stand_closer([(z.real, z.imag) for z in here.values()], _fault_reach(here, drawn))]
    clean = [True] * len(positions)
    if suspect:
        for k, verdict in zip(suspect, _faultless_batch([positions[k] for k in suspect], [bonds[k] for k in suspect],
                                                        labelled)):
            clean[k] = verdict
    return clean


def _faultless_batch(positions: Sequence[dict[int, complex]], bonds: Sequence[list[tuple[int, int]]],
                     labelled: frozenset[int]) -> list[bool]:
    """_faultless's answer for each panel, worked out for all at once."""
    count, atoms_at, bonds_at = len(positions), max(map(len, positions), default=0), max(map(len, bonds), default=0)
    if not count or not bonds_at:
        return [True] * count
    points = np.full((count, atoms_at), 1e9, dtype=complex)
    ids = np.full((count, atoms_at), -1)
    reach = np.zeros((count, atoms_at))
    starts = np.full((count, bonds_at), -1e9, dtype=complex)
    ends = starts.copy()
    ends_ids = np.full((count, bonds_at, 2), -2)
    for k, (here, drawn) in enumerate(zip(positions, bonds)):
        atoms = list(here)
        points[k, :len(atoms)] = [here[a] for a in atoms]
        ids[k, :len(atoms)] = atoms
        reach[k, :len(atoms)] = [_LABEL_ON_A_BOND if a in labelled else _ON_A_BOND for a in atoms]
        if drawn:
            starts[k, :len(drawn)] = [here[i] for i, _ in drawn]
            ends[k, :len(drawn)] = [here[j] for _, j in drawn]
            ends_ids[k, :len(drawn)] = drawn
    own = (ids[:, :, None] == ends_ids[:, None, :, 0]) | (ids[:, :, None] == ends_ids[:, None, :, 1])
    on_a_bond = ((_distances(points, starts, ends) < reach[:, :, None]) & ~own).any(axis=(1, 2))
    return (~(on_a_bond | _crossing(starts, ends).any(axis=(1, 2)))).tolist()


def _room(here: dict[int, complex], bonds: list[tuple[int, int]], side: set[int]) -> float:
    """The least distance between the branch `side` and the rest: an atom of one from a bond of
    the other, or (less 0.2, as two atoms side by side need more room than an atom beside a line)
    an atom from an atom; 0 if a bond of the branch crosses another. Capped at _ENOUGH."""
    inner = [b for b in bonds if b[0] in side and b[1] in side]
    outer = [b for b in bonds if b[0] not in side and b[1] not in side]
    for i, j in inner + [b for b in bonds if (b[0] in side) != (b[1] in side)]:
        for a, b in outer:
            if len({i, j, a, b}) == 4 and segments_cross(here[i], here[j], here[a], here[b]):
                return 0.0
    mine = np.array([here[a] for a in side])
    rest = np.array([z for a, z in here.items() if a not in side])
    room = _ENOUGH
    if len(rest):
        room = min(room, float(np.abs(mine[:, None] - rest[None, :]).min()) - 0.2)
    for atoms, segments in ((mine, outer), (rest, inner)):
        if len(atoms) and segments:
            starts = np.array([here[i] for i, _ in segments])
            ends = np.array([here[j] for _, j in segments])
            room = min(room, float(_distances(atoms, starts, ends).min()))
    return room


def _straight(here: dict[int, complex], atom: int, partners: set[int]) -> bool:
    """Whether two of the atom's bonds are drawn in line."""
    arms = [here[n] - here[atom] for n in partners]
    return any(abs(cmath.phase(a / b)) > math.radians(170) for k, a in enumerate(arms) for b in arms[k + 1:])


class Untangler:
    """`positions[k]`: heavy atom -> point in panel k (changed in place); `bonds[k]`: the bonds
    drawn between them; `touched[k]`: the atoms the step leaving panel k changes; `joining[k]`:
    the atoms of molecules that become one in that step; `labelled` the atoms drawn as a
    label, not a skeletal vertex; `hydrogens[k]`: hydrogen -> point in panel k (changed in
    place), drawn atoms a turned branch keeps clear of, or turns with when they hang on it."""

    def __init__(self, positions: list[dict[int, complex]], bonds: Sequence[set[tuple[int, int]]],
                 touched: Sequence[set[int]], joining: Sequence[set[int]], labelled: frozenset[int],
                 hydrogens: Optional[list[dict[int, complex]]] = None):
        self.positions, self.bonds, self.touched, self.joining = positions, bonds, touched, joining
        self.labelled = labelled
        self.hydrogens = hydrogens if hydrogens is not None else [{} for _ in positions]
        self.n = len(positions)

    @cached_property
    def holders(self) -> list[dict[int, set[int]]]:
        """Per panel: each drawn hydrogen's bonded partners (asked only once a branch turns)."""
        return [{h: {i if j == h else j for i, j in self.bonds[k] if h in (i, j)} for h in self.hydrogens[k]}
                for k in range(self.n)]

    def run(self) -> None:
        drawn = [[b for b in self.bonds[k] if b[0] in here and b[1] in here] for k, here in enumerate(self.positions)]
        # Most panels have no fault: they are found in one batch, and only the others (or every
        # panel after a turn, which may move the panels of its run) are looked at one by one.
        clean = _faultless(self.positions, drawn, self.labelled)
        turned = False
        for k in range(self.n):
            if clean[k] and not turned:
                continue
            for _ in range(3):   # (a fault or two per panel at most, in practice)
                here = self.positions[k]
                bonds = [b for b in self.bonds[k] if b[0] in here and b[1] in here]
                fault = _first_fault(here, bonds, self.labelled)
                if fault is None or not self._turn_off(k, fault):
                    break
                turned = True

    def _free_at(self, k: int, side: set[int]) -> bool:
        """Whether the step leaving panel k lets the atoms of `side` move: it touches them all, or
        they are the untouched part of molecules that join others in it (moved as one piece)."""
        untouched = side - self.touched[k]
        if not untouched:
            return True
        if not untouched <= self.joining[k]:
            return False
        here = self.positions[k]
        adjacent = _adjacent(self.bonds[k], set(here))
        molecule: set[int] = set()
        for a in untouched & set(here):
            molecule |= side_beyond(a, -1, adjacent)
        return not (molecule - self.touched[k]) - side

    def _run_of(self, k: int, side: set[int]) -> Optional[range]:
        first = k
        while first > 0 and side <= set(self.positions[first - 1]) and not self._free_at(first - 1, side):
            first -= 1
        last = k
        while last + 1 < self.n and side <= set(self.positions[last + 1]) and not self._free_at(last, side):
            last += 1
        if any(not side <= set(self.positions[p]) for p in range(first, last + 1)):
            return None
        return range(first, last + 1)

    def _held_elsewhere(self, panels: range, pivot: int, root: int, side: set[int]) -> bool:
        """Whether, in a panel of the run, `side` is bonded to the rest by more than its bond
        root-pivot (a carbamate's O-tBu bond, broken only in a later panel): a turn about the
        pivot would stretch that bond."""
        for p in panels:
            here = self.positions[p]
            if any((i in side) != (j in side) and {i, j} != {pivot, root} and i in here and j in here
                   for i, j in self.bonds[p]):
                return True
        return False

    def _turn_off(self, k: int, fault: frozenset[int]) -> bool:
        here = self.positions[k]
        adjacent = _adjacent(self.bonds[k], set(here))
        best = None   # (score, panels, pivot, side, turn)
        for pivot in sorted(here):
            if _straight(here, pivot, adjacent[pivot]):
                continue   # an sp atom (a nitrile's carbon) stays straight
            for root in sorted(adjacent[pivot]):
                side = side_beyond(root, pivot, adjacent)
                if pivot in side or not 0 < len(side & fault) < len(fault) \
                        or 2 * len(side) > len(side_beyond(pivot, -1, adjacent)):
                    continue   # a ring bond, a turn that would not part the fault, or the larger half
                panels = self._run_of(k, side)
                if panels is None or self._held_elsewhere(panels, pivot, root, side):
                    continue
                for turn in _TURNS:
                    score = self._score(panels, pivot, root, side, turn)
                    if score is not None and (best is None or score > best[0]):
                        best = (score, panels, pivot, side, turn)
        if best is None:
            return False
        _, panels, pivot, side, turn = best
        spin = cmath.exp(1j * turn)
        for p in panels:
            centre = self.positions[p][pivot]
            for a in side:
                self.positions[p][a] = centre + (self.positions[p][a] - centre) * spin
            for h, z in self.hydrogens[p].items():
                if self.holders[p][h] and self.holders[p][h] <= side:
                    self.hydrogens[p][h] = centre + (z - centre) * spin
        return True

    def _score(self, panels: range, pivot: int, root: int, side: set[int], turn: float) -> Optional[float]:
        spin = cmath.exp(1j * turn)
        least_room, least_angle = _ENOUGH, math.pi
        for p in panels:
            here = dict(self.positions[p])
            centre = here[pivot]
            for a in side:
                here[a] = centre + (here[a] - centre) * spin
            # A hydrogen held by the rest stays where it is drawn: room is kept from it and its bond.
            for h, z in self.hydrogens[p].items():
                if not self.holders[p][h] & side:
                    here[h] = z
            bonds = [b for b in self.bonds[p] if b[0] in here and b[1] in here]
            room = _room(here, bonds, side)
            if room < _CLEAR:
                return None
            least_room = min(least_room, room)
            arm = here[root] - centre
            for n in _adjacent(self.bonds[p], set(here))[pivot] - {root}:
                least_angle = min(least_angle, abs(cmath.phase((here[n] - centre) / arm)))
        if least_angle < _LEAST_ANGLE:
            return None
        # Room first, then an open angle at the pivot, then the smaller turn of the smaller branch.
        return 2 * least_room + 0.5 * min(least_angle, math.radians(120)) - 0.05 * abs(turn) - 0.01 * len(side)
