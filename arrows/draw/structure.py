"""One panel's structures as drawing parts: atom labels, bond strokes, charges, radical dots, map
numbers and CIP labels, in points.

Conventions (IUPAC 2008 graphical representation recommendations, references.md; common
practice): skeletal carbons are vertices; every other atom is a label centred on its position
with its implicit hydrogens on the side away from its bonds; bonds stop short of labels; a ring
double bond has its second line inside the ring, a chain double bond on the side of its
substituents, a double bond to a terminal atom is centred; charges sit beside the atom where no
bond is.
"""
from __future__ import annotations

import cmath
import math
from dataclasses import dataclass, field
from functools import lru_cache
from itertools import islice
from types import MappingProxyType
from typing import Iterator, Mapping, Optional, Sequence

from rdkit import Chem

from ..electrons import ElectronState
from ..rdkit_io import HYDROGEN_ISOTOPES, bond_list
from .plane import distance_to_segment, unit, unit_or_zero
from .scene import AtomDrawing, BondDrawing, Box, CurvedArrow, Mark, TextRun
from .styles import BROKEN_COLOUR, FORMED_COLOUR, INK, NUMBER_COLOUR, Style
from .formula import MINUS
from .text import FontFace
from .wedges import HASHED, SOLID, choose_wedges, configured_centres, stereogenic_atoms

# Hydrogens of an isolated atom go before the symbol for these elements (H2O, HO-, H2S, HCl):
# common practice in chemical formulas.
_HYDROGEN_FIRST = {8, 9, 16, 17, 34, 35, 53}
_DESCENDERS = frozenset("()gjpqy")   # characters that reach below the baseline
_TOWARD_LETTER = math.radians(30)   # an H written above or below this near another heteroatom points at it
# An H written nearer than this to the bond of a hydrogen drawn as an atom crowds the arrow at that
# bond (at 44-50 degrees a half-loop N-H -> N shrank to a blob; at 60, the hexagonal angle, it reads).
_BY_A_MOVING_HYDROGEN = math.radians(55)
_DOUBLE_GAP = 0.18   # bond lengths between the two lines of a double bond
# A minus sign this near a bond stroke (bond lengths) and this near parallel to it (slope) reads as
# a second line of the bond: about twice a double bond's gap, within 15 degrees (at 20 the two no
# longer look parallel).
_MINUS_STROKE_GAP = 0.4
_SIGN_STROKE_GAP = 0.2   # font sizes of white kept between a superscript charge's ink and any bond stroke
# and for a sign set round its atom, which has fewer places to go: a little less, so that it stays
# beside its own atom rather than drift toward a neighbour's label (the Peterson silicate's minus)
_SIDE_SIGN_STROKE_GAP = 0.16
_MINUS_STROKE_SLOPE = math.tan(math.radians(15))
_LEVEL_WITH_LABEL = math.sin(math.radians(30))   # directions this near the horizontal
_ARROW_SAMPLES = 16   # points along a curved arrow that a map number set after the arrows keeps off
_NO_BONDS: Mapping[tuple[int, int], int] = MappingProxyType({})
_NO_GROUPS: Mapping[int, str] = MappingProxyType({})


@dataclass
class PanelStructure:
    """What structure.py draws for one panel, plus what later placement must avoid."""

    atoms: dict[int, AtomDrawing]
    bonds: list[BondDrawing]
    marks: list[Mark]
    positions: dict[int, complex]                 # points, panel frame
    occupied: dict[int, list[complex]] = field(default_factory=dict)   # unit directions taken around each atom
    bond_directions: dict[int, list[complex]] = field(default_factory=dict)
    bond_extent: dict[tuple[int, int], float] = field(default_factory=dict)  # half-width of each bond's strokes
    bond_lean: dict[tuple[int, int], complex] = field(default_factory=dict)  # a one-sided double's second stroke
    # For a label that writes more than its element symbol (OH, H2O, NH3+): the symbol's own box and
    # the boxes of the rest, where an arrowhead may stop beside the symbol and where it may not.
    label_parts: dict[int, tuple[Box, tuple[Box, ...]]] = field(default_factory=dict)
    # The atoms of each of the state's molecules, read where an atom bears a charge (empty if none does).
    molecules: Sequence[Sequence[int]] = ()

    def label_reach(self, atom: int, direction: complex) -> float:
        """How far the atom's label reaches from its centre along direction (0: no label)."""
        box = self.atoms[atom].box
        if box is None:
            return 0.0
        return ray_exit(self.positions[atom], direction, box)

    def arrival(self, atom: int, direction: complex, gap: float, turn_toward: Optional[complex] = None,
                head: complex = 0j) -> tuple[complex, float]:
        """(side, reach): where an arrowhead arriving at the atom stops, `reach` from its centre
        along `side` (then `gap` further out). Short of the element symbol itself where the rest
        of the label is not in the way, so that a half-loop onto the O of OH points at the O and
        not past its H (common practice: the head touches the atom that takes the electrons);
        where the rest is in the way along `direction`, the side is turned up to 60 degrees
        toward `turn_toward` (if given), no further than finds the symbol clear, the head's base
        (`head` from its tip) included; else short of the whole label along `direction` (reach 0:
        no label)."""
        box = self.atoms[atom].box
        if box is None:
            return direction, 0.0
        centre = self.positions[atom]
        parts = self.label_parts.get(atom)
        if parts is not None:
            symbol, rest = parts
            sides = [direction]
            if turn_toward is not None:
                turn = 1.0 if (turn_toward / direction).imag > 0 else -1.0
                sides += [direction * cmath.rect(1.0, turn * math.radians(a)) for a in (15, 30, 45, 60)]
            best = None
            for side in sides:
                near = ray_exit(centre, side, symbol)
                tip = centre + side * (near + gap)
                point = (tip.real, tip.imag)
                # Clear of the rest of the label, the head read as the symbol's: the first side, in
                # the order turned, where that is plain, else the side whose tip stands furthest
                # from the rest for its nearness to the symbol (the first of equals).
                margin = min(b.distance(point) for b in rest) - symbol.distance(point)
                if margin > 0 and not any(b.contains(point, 0.5 * gap) for b in rest) \
                        and (best is None or margin > best[0] + 1e-6):
                    best = (margin, side, near)
                    # Plainly the symbol's, the head's base too (a base under the H of HO+ read as
                    # pointing at the H): turned no further than needed.
                    base = (tip.real + head.real, tip.imag + head.imag)
                    if margin >= gap and (not head or min(b.distance(base) for b in rest) >= symbol.distance(base)):
                        break
            if best is not None:
                return best[1], best[2]
        return direction, ray_exit(centre, direction, box)

    def arrival_reach(self, atom: int, direction: complex, gap: float) -> float:
        """arrival's reach along `direction` itself."""
        return self.arrival(atom, direction, gap)[1]


def ray_exit(origin: complex, direction: complex, box: Box, pad: float = 0.0) -> float:
    """Distance from origin (inside box, grown by pad) to the box edge along direction."""
    # Each edge written out (no loop over a tuple of two): it is asked about a thousand times a figure.
    best = math.inf
    dx, dy = direction.real, direction.imag
    if dx > 1e-12 or dx < -1e-12:
        x = origin.real
        t = (box.x0 - pad - x) / dx
        if 0 < t < best:
            best = t
        t = (box.x1 + pad - x) / dx
        if 0 < t < best:
            best = t
    if dy > 1e-12 or dy < -1e-12:
        y = origin.imag
        t = (box.y0 - pad - y) / dy
        if 0 < t < best:
            best = t
        t = (box.y1 + pad - y) / dy
        if 0 < t < best:
            best = t
    return 0.0 if best is math.inf else best


def clip_from(p: complex, q: complex, box: Optional[Box], pad: float) -> complex:
    """The point where segment p->q leaves box (grown by pad); p itself when there is no box."""
    if box is None:
        return p
    length = abs(q - p)
    if length == 0:
        return p
    direction = (q - p) / length
    return p + direction * min(ray_exit(p, direction, box, pad), length * 0.45)


def segment_hits_box(p: complex, q: complex, box: Box) -> bool:
    """Whether segment p-q crosses or touches the box (Liang-Barsky clipping)."""
    t0, t1 = 0.0, 1.0
    d = q - p
    for delta, low, high, start in ((d.real, box.x0, box.x1, p.real), (d.imag, box.y0, box.y1, p.imag)):
        if abs(delta) < 1e-12:
            if start < low or start > high:
                return False
            continue
        a, b = (low - start) / delta, (high - start) / delta
        if a > b:
            a, b = b, a
        t0, t1 = max(t0, a), min(t1, b)
        if t0 > t1:
            return False
    return True


def _into_ring(i: int, adjacent, positions: dict[int, complex]) -> Optional[complex]:
    """The direction from atom i into the ring it stands in (between its two ring bonds), or
    None: a charge sign there reads as the ring's, not the atom's (an imidazolium's N+)."""
    ring = [n for n in adjacent[i] if n in positions and closes_cycle(i, n, adjacent)]
    if len(ring) != 2:
        return None
    inward = unit_or_zero(unit_or_zero(positions[ring[0]] - positions[i]) + unit_or_zero(positions[ring[1]] - positions[i]))
    return inward or None


def _with_bonds(adjacent: list[list[int]], pairs) -> list[list[int]]:
    """`adjacent` (each atom's neighbours) with the bonds `pairs` added."""
    joined = [list(n) for n in adjacent]
    for i, j in pairs:
        joined[i].append(j)
        joined[j].append(i)
    return joined


def closes_cycle(i: int, j: int, adjacent) -> bool:
    """Whether bond i-j lies on a ring: j is reached from i without crossing that bond. `adjacent`
    gives each atom's neighbours by its index (a list of lists, or a dict)."""
    if len(adjacent[i]) < 2 or len(adjacent[j]) < 2:
        return False   # a bond to an end atom (the O of a C=O) closes nothing: no search of the molecule
    seen, frontier = {i}, [n for n in adjacent[i] if n != j]
    while frontier:
        a = frontier.pop()
        if a == j:
            return True
        if a not in seen:
            seen.add(a)
            frontier.extend(n for n in adjacent[a] if n not in seen and not (a == i and n == j))
    return False


def _clear_of(box: Box, lines: list[tuple[complex, complex]], limit: float, samples: int = 16) -> bool:
    """Whether every segment p-q of `lines` keeps `limit` from the box, by 17 samples along each
    (a sample inside the box is at distance zero). Stops at the first sample closer than that."""
    x0, y0, x1, y1 = box.x0, box.y0, box.x1, box.y1
    for p, q in lines:
        # The samples p + (q - p) * k / samples, part by part (Python's complex arithmetic by a
        # whole number gives these same parts).
        px, py = p.real, p.imag
        dx, dy = q.real - px, q.imag - py
        for k in range(samples + 1):
            x, y = px + dx * k / samples, py + dy * k / samples
            ax = x0 - x if x < x0 else x - x1 if x > x1 else 0.0
            ay = y0 - y if y < y0 else y - y1 if y > y1 else 0.0
            if (ax * ax + ay * ay) ** 0.5 < limit:
                return False
    return True


def level_and_close(sign: Box, labels: list[Box], size: float, apart: float = 0.5) -> bool:
    """Whether a charge sign stands level with one of `labels` and less than `apart` of its size
    from it across, where it reads as that label's: between two labels, "O- O" reads as O-O, a
    bond; after hydrogens written above an N, "H+" as a proton."""
    return any(sign.y0 < b.y1 and b.y0 < sign.y1 and max(b.x0 - sign.x1, sign.x0 - b.x1) < apart * size
               for b in labels)


def _as_superscript_of(sign: Box, labels: list[Box], size: float) -> bool:
    """Whether a charge sign stands where one of `labels` would write its own charge: just after
    it and raised, its foot above the label's middle (a carbanion's minus there read as "Br-")."""
    return any(b.x1 - 0.1 * size <= sign.x0 < b.x1 + 0.6 * size and sign.y1 < (b.y0 + b.y1) / 2
               and sign.y1 > b.y0 - 0.3 * size for b in labels)


def _nearer_another(box: Box, atom: int, out: PanelStructure, margin: float = 1.25, letters: bool = False) -> bool:
    """Whether the middle of `box` stands less than `margin` times as far from another drawn atom
    (with `letters`, another atom written as a letter) as from `atom`: too near the other to read
    as `atom`'s."""
    middle = complex((box.x0 + box.x1) / 2, (box.y0 + box.y1) / 2)
    own = abs(middle - out.positions[atom])
    return any(abs(middle - out.positions[j]) < margin * own for j, drawn in out.atoms.items()
               if j != atom and (not letters or drawn.box is not None))


# Bond lengths: a stereocentre this near another one whose CIP label is drawn sets its own label
# away from it (two adjacent centres, or across a three-membered ring, are one bond apart).
_LABELLED_NEIGHBOUR = 1.6


def _molecule_of(out: PanelStructure, atom: int) -> Sequence[int]:
    """The atoms of the molecule `atom` (a charged atom: out.molecules is read then) belongs to."""
    return next(m for m in out.molecules if atom in m)


def other_molecules(out: PanelStructure, atom: int) -> list[complex]:
    """Where the panel's drawn atoms of other molecules than charged `atom`'s stand."""
    own = _molecule_of(out, atom)
    return [p for j, p in out.positions.items() if j not in own and j in out.atoms]


def points_at_another(box: Box, vertex: complex, others: Sequence[complex], bond_length: float) -> bool:
    """Whether one of `others` (atoms of other molecules) lies beyond the sign in `box`, within
    _TOWARD_ANOTHER of the line from its `vertex` through the sign's middle and _ANOTHER_WITHIN."""
    toward = complex((box.x0 + box.x1) / 2, (box.y0 + box.y1) / 2) - vertex
    if not toward:
        return False
    return any(0 < abs(p - vertex) < _ANOTHER_WITHIN * bond_length and abs(cmath.phase((p - vertex) / toward)) < _TOWARD_ANOTHER
               for p in others)


def _separation(a: Box, b: Box) -> float:
    """How far apart two boxes are along the axis that separates them most (negative: overlap)."""
    return max(b.x0 - a.x1, a.x0 - b.x1, b.y0 - a.y1, a.y0 - b.y1)


_STRAIGHT = math.cos(math.radians(165))   # two bonds this near opposite run on as one line


def carbons_to_letter(bonds: list[tuple[int, int, int]], positions: dict[int, complex], element: list[int]) -> set[int]:
    """Skeletal carbons that must be written as a letter because a bare vertex would not be seen:
    the middle carbon of cumulated double bonds drawn straight (O=C=O, C=C=C, N=C=O), where the two
    double lines run on as one, and the one carbon of a molecule whose only bond to another heavy
    atom is a multiple bond to a heteroatom (formaldehyde as H2C=O, not a bare "O=" stub; common
    practice in skeletal formulas)."""
    multiple: dict[int, list[tuple[int, int]]] = {}   # carbon -> its (partner, order) of order two or more
    for i, j, order in bonds:
        if order >= 2:
            for a, b in ((i, j), (j, i)):
                if element[a] == 6:
                    multiple.setdefault(a, []).append((b, order))
    letters = set()
    lone = []   # carbons with one multiple bond, to a heteroatom: formaldehyde's, if nothing else is bonded
    for i, partners in multiple.items():
        if len(partners) == 2 and partners[0][1] == partners[1][1] and i in positions \
                and all(j in positions for j, _ in partners):
            a, b = (positions[j] - positions[i] for j, _ in partners)
            if (a.real * b.real + a.imag * b.imag) / (abs(a) * abs(b)) < _STRAIGHT:
                letters.add(i)
        elif len(partners) == 1 and element[partners[0][0]] != 6:
            lone.append(i)
    if lone:
        heavy: dict[int, list[int]] = {}   # atom -> its heavy partners
        for i, j, _ in bonds:
            if element[i] != 1 and element[j] != 1:
                heavy.setdefault(i, []).append(j)
                heavy.setdefault(j, []).append(i)
        letters.update(i for i in lone if len(heavy.get(i, ())) == 1 and _no_other_carbon(i, heavy, element))
    return letters


def _no_other_carbon(carbon: int, heavy: dict[int, list[int]], element: list[int]) -> bool:
    """Whether the molecule of `carbon` (through the bonds in `heavy`) holds no other carbon."""
    seen, todo = {carbon}, [carbon]
    while todo:
        for n in heavy.get(todo.pop(), ()):
            if n not in seen:
                if element[n] == 6:
                    return False
                seen.add(n)
                todo.append(n)
    return True


def minus_along_stroke(x0: float, width: float, y: float, strokes: list[tuple[complex, complex]], bl: float) -> bool:
    """Whether a minus sign from x0 to x0 + width at height y lies along a bond stroke, near enough
    (within _MINUS_STROKE_GAP bond lengths, sharing half its width) to read as the second line of
    a double bond."""
    for a, b in strokes:
        along = b - a
        if abs(along.real) < 1e-9 or abs(along.imag / along.real) > _MINUS_STROKE_SLOPE:
            continue
        low, high = sorted((a.real, b.real))
        shared = min(high, x0 + width) - max(low, x0)
        if shared < 0.5 * width:
            continue
        middle = max(low, x0) + shared / 2
        stroke_y = a.imag + along.imag * (middle - a.real) / along.real
        if abs(stroke_y - y) < _MINUS_STROKE_GAP * bl:
            return True
    return False


def _stroke_paint(order: int, formed_from: Optional[int], kept: Optional[int]) -> tuple[tuple[str, ...], ...]:
    """--color: the colours of each stroke of a bond of `order`, in _strokes' order (the first
    stroke stands for the sigma bond), where the step arriving at the panel formed the strokes
    beyond the first `formed_from` and the step leaving it breaks those beyond the first `kept`
    (None: nothing formed, or nothing broken). Only what changes is coloured: the pi stroke of
    a C=O whose pi pair goes onto O, not its sigma stroke. A stroke formed by the one step and
    broken by the next (an enolate's C=C) takes both colours."""
    paint = []
    for k in range(order):
        colours = ((FORMED_COLOUR,) if formed_from is not None and k >= formed_from else ()) + \
                  ((BROKEN_COLOUR,) if kept is not None and k >= kept else ())
        paint.append(colours or (INK,))
    return tuple(paint)


def _painted(lines: list[tuple[complex, complex]], paint: tuple[tuple[str, ...], ...]
             ) -> tuple[list[tuple[complex, complex]], tuple[str, ...]]:
    """The strokes and the colour of each: a stroke of two colours is drawn as two halves, the
    first (from the bond's first atom) in the colour it was formed in, the second in the colour
    of its breaking."""
    out, colours = [], []
    for (start, end), inks in zip(lines, paint):
        if len(inks) == 1:
            out.append((start, end))
            colours.append(inks[0])
        else:
            middle = (start + end) / 2
            out += [(start, middle), (middle, end)]
            colours += inks
    return out, tuple(colours)


def _sign_near_stroke(box: Box, size: float, strokes: list[tuple[complex, complex]], gap: float) -> bool:
    """Whether a charge sign in `box` (of font size `size`) comes within `gap` font sizes of a bond
    stroke: a stroke passing just under the sign reads as part of it (a "+" over a bond as "±",
    over a double bond's second line as "≠"). The sign's ink is taken as a disc round the box's
    middle."""
    middle = complex((box.x0 + box.x1) / 2, (box.y0 + box.y1) / 2)
    room = 0.5 * (box.x1 - box.x0) + gap * size
    return any(distance_to_segment(middle, a, b) < room for a, b in strokes)


def _angle_gap(a: complex, b: complex) -> float:
    return abs(cmath.phase(a / b)) if a and b else math.pi


def clearance(direction: complex, occupied: list[complex]) -> float:
    """Smallest angle between direction and any occupied direction (pi when none is)."""
    if not direction:
        return math.pi
    room = math.pi
    for o in occupied:
        if o:   # a zero direction leaves pi, which is no less
            gap = abs(cmath.phase(direction / o))
            if gap < room:
                room = gap
    return room


@lru_cache(maxsize=None)
def _compass(steps: int) -> tuple[complex, ...]:
    """`steps` unit directions evenly around the circle, starting along +x."""
    return tuple(cmath.rect(1.0, k * 2 * math.pi / steps) for k in range(steps))


_SIDE_TEXT_CLEARANCE = 0.25   # bond lengths between text beside a skeletal vertex and its bond lines
_ENOUGH_ROOM = math.radians(75)   # more room than this around a direction counts as no better


_FAR_SLIDE = 6     # steps of 0.03 bond lengths: side text slid this far out has left its atom
_BY_THE_LABEL = 0.25   # bond lengths from a label's box to the middle of a charge sign beside it (at most)
# ...and at least this many times as far from another atom's letter as from its own: at the upper
# right a sign over a bond to another label (an azide's N+ over its N=N) read as the neighbour's.
_CLEARLY_ITS_OWN = 1.4
# ...and its middle no nearer than this to a bare vertex of another molecule: a spent H3O+'s "+"
# 0.48 bond lengths from an alkene carbon read as a carbocation there.
_BY_A_VERTEX = 0.5
# Another molecule's atom within this angle of the line from a skeletal vertex through its charge
# sign, and this near the vertex (bond lengths), makes the sign read as a "+" between two species
# (the Boc removal's tert-butyl cation: "tBu + carbamic acid"); common practice sets it in a gap
# facing away from them.
_TOWARD_ANOTHER = math.radians(30)
_ANOTHER_WITHIN = 2.5
# Bonds and bonds about to form round an atom with this many or more leave no gap wide enough for a
# charge sign and the arrows into the forming bonds together (five: 72 degrees apiece at most).
_HEMMED_IN = 5


# A charge beside a label goes in its preferred quarter where a direction there keeps this far
# from the bonds and the rest round the atom (the stroke test then judges the sign's own box).
_UPPER_RIGHT_ROOM = math.radians(40)


@lru_cache(maxsize=None)
def _upper_right_quarter(preferred: complex) -> tuple[complex, ...]:
    """The directions within 45 degrees of `preferred`, 15 degrees apart, nearest it first."""
    turns = sorted(range(-45, 46, 15), key=lambda t: (abs(t), t))
    return tuple(preferred * cmath.rect(1.0, math.radians(t)) for t in turns)


def best_direction(occupied: list[complex], preferred: complex, spread: float = 0.25, steps: int = 24) -> complex:
    """The direction (one of `steps` around the circle) with the most room, leaning to `preferred`."""
    return next(ranked_directions(occupied, preferred, spread, steps))


def ranked_directions(occupied: list[complex], preferred: complex, spread: float = 0.25,
                      steps: int = 24) -> Iterator[complex]:
    """The `steps` directions around the circle, best first by their room (up to _ENOUGH_ROOM)
    less `spread` times their turn from `preferred` (of two nearly equal, the one found first
    around the circle); the rest are ranked only if asked for."""
    best, best_score, scored = preferred, -math.inf, []
    # clearance and _angle_gap written out (no compass direction is zero; a zero occupied
    # direction leaves pi, which is no less): a few dozen directions, each asked of every bond.
    taken = [o for o in occupied if o]
    phase = cmath.phase
    for d in _compass(steps):
        room = math.pi
        for o in taken:
            gap = abs(phase(d / o))
            if gap < room:
                room = gap
        score = min(room, _ENOUGH_ROOM) - spread * (abs(phase(d / preferred)) if preferred else math.pi)
        scored.append((score, d))
        if score > best_score + 1e-9:
            best, best_score = d, score
    yield best
    yield from (d for _, d in sorted(scored, key=lambda item: -item[0]) if d != best)


class StructureDrawer:
    """Turns one panel's state and atom positions into labels, bonds and marks."""

    def __init__(self, style: Style, group_labels: Mapping[int, str] = _NO_GROUPS):
        """`group_labels`: atoms written as the group they stand for ("Ph" at a phenyl's ipso
        carbon, draw/phenyls.py), whatever their element."""
        self.style = style
        self.group_labels = group_labels
        self.face = FontFace(style.font_family)
        self.italic = FontFace(style.font_family, italic=True)
        self.cap = self.face.cap_height * style.font_size
        self.small_cap = self.face.cap_height * style.small_size
        # Single bonds drawn so far, by everything their strokes depend on: consecutive panels
        # share most atoms, positions and labels, so most bonds come again unchanged.
        self._single_bonds: dict[tuple, BondDrawing] = {}
        self._multiple_bonds: dict[tuple, tuple[BondDrawing, float, Optional[complex]]] = {}   # and the rest
        self._labels: dict[tuple, AtomDrawing] = {}   # labels, likewise
        self._vertices: dict[tuple, AtomDrawing] = {}   # and skeletal carbons
        # Each atom's symbol, map number, own hydrogen count, mass number and name (None for an
        # unmapped hydrogen, named after the atom that holds it), read off RDKit once per scheme:
        # they never change over a mechanism (atoms are only appended, a hydrogen that moves is
        # an atom of its own from the start), and each call into RDKit costs more than a lookup.
        self._facts: dict[int, tuple[str, int, int, int, Optional[str]]] = {}

    def draw(self, state: ElectronState, visible: tuple[int, ...], positions: dict[int, complex],
             drawn_hydrogens: frozenset[int], formed: Mapping[tuple[int, int], int] = _NO_BONDS,
             broken: Mapping[tuple[int, int], int] = _NO_BONDS,
             listed_bonds: Optional[list[tuple[int, int, float]]] = None,
             forming: set[tuple[int, int]] = frozenset(), held_back: frozenset[int] = frozenset(),
             molecules: Optional[Sequence[Sequence[int]]] = None) -> PanelStructure:
        """`formed`: the bonds the step arriving at the panel formed or raised in order, each with
        the order it had before (0: formed whole); `broken`: those the step leaving it breaks or
        lowers, each with the order it keeps. `listed_bonds` are the state's bonds as
        rdkit_io.bond_list reads them (read here when not given); `forming` the bonds the step
        leaving the panel makes, whose arrows head for the gap between their atoms: a charge sign
        beside a vertex keeps out of that gap; `held_back` the atoms whose map numbers wait for
        the arrows (place_held_numbers); `molecules` the atoms of each of the state's molecules
        (Chem.GetMolFrags, read here when a charge needs them and they are not given)."""
        mol = state.mol
        shown = set(visible)
        # RDKit is asked once per bond, and about an atom only where the state's own numbers do
        # not tell: each call into it costs more than the geometry it feeds. A bond's index order
        # is the order RDKit lists an atom's neighbours in.
        facts = self._atom_facts(mol, visible)
        bonds, adjacent = [], [[] for _ in range(mol.GetNumAtoms())]
        neighbours: dict[int, list[int]] = {i: [] for i in visible}   # the drawn ones, in RDKit's order too
        for i, j, order in listed_bonds if listed_bonds is not None else bond_list(mol):
            bonds.append((i, j, int(order)))
            adjacent[i].append(j)
            adjacent[j].append(i)
            if i in shown and j in shown:
                neighbours[i].append(j)
                neighbours[j].append(i)
        out = PanelStructure({}, [], [], dict(positions), {i: [] for i in visible})
        for i in visible:
            p = positions[i]
            for n in neighbours[i]:
                d = positions[n] - p
                length = abs(d)
                if length > 1e-9:
                    out.occupied[i].append(d / length)
            out.bond_directions[i] = list(out.occupied[i])
        # Where each atom is about to bond: its hydrogens and charge sign keep out of that gap,
        # where the arrow of the step goes.
        ahead: dict[int, list[complex]] = {i: [] for i in visible}
        for pair in forming:
            for i in pair:
                if i in ahead:
                    ahead[i] += [unit_or_zero(positions[j] - positions[i]) for j in pair if j != i and j in positions]
        lettered = carbons_to_letter(bonds, positions, state.elements)
        for i in visible:
            drawing = out.atoms[i] = self._atom(state, facts[i], adjacent, i, positions, neighbours[i],
                                                drawn_hydrogens, out, ahead[i], i in lettered)
            if len(drawing.runs) > 1:
                # The symbol is the run the label is centred on (its hydrogens and mass number beside it).
                x = positions[i].real
                symbol = next((r for r in drawing.runs if r.x <= x <= r.x + self.face.width(r.text, r.size)), None)
                if symbol is not None:
                    out.label_parts[i] = (self.text_box(symbol),
                                          tuple(self.text_box(r) for r in drawing.runs if r is not symbol))
        # RDKit's ring search costs more than all the strokes: run it only when a drawn double
        # bond lies on a ring (only such a bond asks which ring it is in).
        on_ring = any(order == 2 and i in shown and j in shown and closes_cycle(i, j, adjacent)
                      for i, j, order in bonds)
        rings = [list(r) for r in Chem.GetSymmSSSR(mol)] if on_ring else []
        # Wedges only where a species wrote a configuration: no work per bond otherwise.
        wedges = self._wedges(state, adjacent, neighbours, out, bonds, broken) if state.configured else {}
        for i, j, order in bonds:
            if i in shown and j in shown:
                key = (i, j) if i < j else (j, i)
                role = "broken" if key in broken else "formed" if key in formed else "plain"
                if wedges and ((i, j) in wedges or (j, i) in wedges):
                    narrow, wide = (i, j) if (i, j) in wedges else (j, i)
                    out.bonds.append(self._wedge(narrow, wide, wedges[(narrow, wide)], role, out))
                else:
                    paint = _stroke_paint(order, formed.get(key), broken.get(key)) \
                        if self.style.color and role != "plain" else None
                    out.bonds.append(self._bond(i, j, order, role, out, neighbours, rings, paint))
        nonbonding = state.nonbonding
        for i in visible:
            # (most atoms carry neither a charge nor electrons of their own: no call for them)
            if nonbonding[i] or state.formal_charge(i):
                inward = _into_ring(i, adjacent, positions) if state.formal_charge(i) else None
                # Round an atom with five partners or more (its bonds and those about to form: a
                # phosphorane's P+) no side is left where the arrow planner could move a sign that
                # stands in their way: the sign keeps out of the gaps ahead, and of the ring their
                # bonds close, from the start.
                hemmed = bool(ahead[i]) and len(out.bond_directions[i]) + len(ahead[i]) >= _HEMMED_IN
                closing = _into_ring(i, _with_bonds(adjacent, forming), positions) \
                    if hemmed and state.formal_charge(i) and inward is None else None
                if not out.molecules and state.formal_charge(i):
                    out.molecules = (molecules if molecules is not None
                                     else Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False))
                self._charge_and_radical(state, i, out, ahead[i], inward, closing, hemmed)
        if self.style.numbers:
            for i in visible:
                number = facts[i][1]
                if number and i not in held_back:
                    out.marks.append(self._side_text("number", i, str(number), out, preferred=cmath.rect(1, math.pi / 4)))
        if self.style.cip:
            self._cip_marks(state, visible, out)
        return out

    def place_held_numbers(self, held: Sequence[int], out: PanelStructure, arrows: Sequence[CurvedArrow],
                           dots: Sequence[Mark]) -> None:
        """The map numbers (--numbers) of the `held` atoms, those a half-loop comes into, set after
        the panel's curved arrows and off them and their dots where they can be without reading as
        another atom's. Set before the arrows, such a number took the room of the half-loop, which
        shrank to a tick (the water leaving HO+ in a Fischer esterification)."""
        pad = 0.5 * self.style.line_width
        taken = [m.box for m in dots if m.box is not None]
        for arrow in arrows:
            taken += [Box(x - pad, y - pad, x + pad, y + pad) for x, y in arrow.path_points(_ARROW_SAMPLES)]
            taken.append(Box.enclosing([Box(x, y, x, y) for x, y in arrow.head]))
        for i in held:
            number = self._facts[i][1]
            if number:
                out.marks.append(self._side_text("number", i, str(number), out, preferred=cmath.rect(1, math.pi / 4),
                                                 avoid=taken))

    # atoms and labels
    def _atom_facts(self, mol: Chem.Mol, atoms: tuple[int, ...]) -> dict[int, tuple[str, int, int, int, Optional[str]]]:
        """Symbol, map number, own hydrogen count, mass number (0: natural) and fixed name of each
        of `atoms`, as RDKit reads them. A mapped atom, or an unmapped one other than a hydrogen,
        is named as ElectronState.label names it (symbol and number, or symbol and position)."""
        facts = self._facts
        for i in atoms:
            if i not in facts:
                atom = mol.GetAtomWithIdx(i)
                symbol, number = atom.GetSymbol(), atom.GetAtomMapNum()
                name = f"{symbol}{number}" if number else f"{symbol}(atom {i + 1})" if atom.GetAtomicNum() != 1 else None
                facts[i] = (symbol, number, atom.GetNumExplicitHs(), atom.GetIsotope(), name)
        return facts

    def _atom(self, state: ElectronState, facts: tuple[str, int, int, int, Optional[str]], adjacent: list[list[int]],
              i: int, positions: dict[int, complex], neighbours: list[int], drawn_hydrogens: frozenset[int],
              out: PanelStructure, ahead: list[complex] = (), lettered: bool = False) -> AtomDrawing:
        element = state.elements   # atomic numbers, without a call into RDKit per atom
        p = positions[i]
        symbol, number, own_hydrogens, mass, name = facts
        if name is None:   # an unmapped hydrogen, named after the atom that holds it, by the state
            name = state.label(i)
        point = (p.real, p.imag)
        group = self.group_labels.get(i)
        if group is not None:
            return self._group_label(i, name, symbol, group, p)
        # Skeletal carbons are vertices, charged and radical ones too (the sign or dot sits
        # beside the vertex); only a bare terminal carbon with electrons of its own and no
        # hydrogen, as in cyanide, gets its letter.
        # A labelled atom (13C) is always a letter, with its mass number written before it.
        # A carbon bonded to drawn hydrogens only (methane giving one up) is a letter too: H3C-H, not
        # a stroke from H to nowhere.
        skeletal = element[i] == 6 and not mass and not lettered and any(element[n] != 1 for n in neighbours)
        if skeletal and len(neighbours) > 1:
            return self._vertex(i, name, symbol, p)
        hidden_h = own_hydrogens + sum(1 for n in adjacent[i] if n not in drawn_hydrogens and element[n] == 1)
        bare_end = len(neighbours) == 1 and hidden_h == 0 and (state.formal_charge(i) or state.nonbonding[i])
        if skeletal and not bare_end:
            return self._vertex(i, name, symbol, p)
        fs, ss = self.style.font_size, self.style.small_size
        # D and T (rdkit_io.HYDROGEN_ISOTOPES); any other label as a superscript mass number.
        shown = HYDROGEN_ISOTOPES.get(mass, symbol) if symbol == "H" else symbol
        mass_text = str(mass) if mass and shown == symbol else ""
        w_symbol = self.face.width(shown, fs)
        w_mass = self.face.width(mass_text, ss) if mass_text else 0.0
        side = None
        if hidden_h:
            count = str(hidden_h) if hidden_h > 1 else ""
            w_h, w_n = self.face.width("H", fs), self.face.width(count, ss)
            # Neighbours' labels count as taken too, so the H is written where there is room.
            # Other atoms within reach, each with the room (across, up) its own label may take: a
            # carbon, mostly a bare skeletal vertex or line end, little; a letter more.
            bl = self.style.bond_length
            # Everything below looks no further than 1.75 bond lengths: one pass over the panel.
            around = [(j, q - p) for j, q in positions.items() if j != i and abs(q - p) < 1.75 * bl]
            # A letter further off still counts: its own hydrogens may be written towards this one.
            crowd = [(d, *((0.3 * bl, 0.2 * bl) if element[j] == 6 else (0.55 * bl, 0.3 * bl)))
                     for j, d in around if j not in neighbours
                     and 1e-9 < abs(d) < (1.25 if element[j] == 6 else 1.75) * bl]
            # The other bonds within reach, which the text must not sit on either.
            near = [j for j, d in around if abs(d) < 1.6 * bl]
            walls = [(positions[a] - p, positions[b] - p) for a in near for b in adjacent[a]
                     if b != i and b in positions and (b not in near or a < b)]
            # Other heteroatoms' labels within reach: an H written above or below toward one reads
            # as bonded to both (O-H-O).
            letters = [d for j, d in around if element[j] not in (1, 6) and abs(d) > 1e-9]
            # Its bonds to hydrogens drawn as atoms (one that moves, a D): each runs between two
            # labels and mostly carries an arrow, which an H written beside it crowds.
            drawn_h = [positions[n] - p for n in neighbours if element[n] == 1]
            side = self._hydrogen_side(element[i], out.occupied[i], crowd, walls, w_symbol / 2 + w_mass, w_h + w_n,
                                       [a for a in ahead if a], letters, drawn_h)
            out.occupied[i].append(complex(side) if side in (1, -1) else side)
        # The label is fixed by where it stands (its atom's symbol and mass number with it), its
        # hydrogens and the side they are written on: drawn so in an earlier panel, it is reused.
        key = (i, name, symbol, p, hidden_h, side)
        drawing = self._labels.get(key)
        if drawing is not None:
            return drawing
        baseline = p.imag + self.cap / 2
        runs = [TextRun(shown, p.real - w_symbol / 2, baseline, fs)]
        if mass_text:
            runs.insert(0, TextRun(mass_text, p.real - w_symbol / 2 - w_mass, baseline - 0.45 * fs, ss))
        if hidden_h:
            sub_drop = 0.3 * fs
            if side == 1:
                x = p.real + w_symbol / 2
                runs.append(TextRun("H", x, baseline, fs))
                if count:
                    runs.append(TextRun(count, x + w_h, baseline + sub_drop, ss))
            elif side == -1:
                x = p.real - w_symbol / 2 - w_mass - w_h - w_n
                runs.insert(0, TextRun("H", x, baseline, fs))
                if count:
                    runs.insert(1, TextRun(count, x + w_h, baseline + sub_drop, ss))
            else:
                x = p.real - (w_h + w_n) / 2
                line = baseline + side.imag * 1.1 * fs
                runs.append(TextRun("H", x, line, fs))
                if count:
                    runs.append(TextRun(count, x + w_h, line + sub_drop, ss))
        drawing = self._labels[key] = AtomDrawing(i, name, symbol, point, tuple(runs), self._runs_box(runs))
        return drawing

    def _group_label(self, i: int, name: str, symbol: str, text: str, p: complex) -> AtomDrawing:
        """A group's label ("Ph") centred on its atom, as an element symbol is: its bond stops short of it."""
        key = (i, name, text, p)
        drawing = self._labels.get(key)
        if drawing is None:
            fs = self.style.font_size
            runs = [TextRun(text, p.real - self.face.width(text, fs) / 2, p.imag + self.cap / 2, fs)]
            drawing = self._labels[key] = AtomDrawing(i, name, symbol, (p.real, p.imag), tuple(runs),
                                                      self._runs_box(runs))
        return drawing

    def _vertex(self, i: int, name: str, symbol: str, p: complex) -> AtomDrawing:
        """A skeletal carbon at p: the one drawn there in an earlier panel, if any."""
        key = (i, name, symbol, p)
        drawing = self._vertices.get(key)
        if drawing is None:
            drawing = self._vertices[key] = AtomDrawing(i, name, symbol, (p.real, p.imag))
        return drawing

    def _hydrogen_side(self, element: int, bonds: list[complex], crowd: list[tuple[complex, float, float]],
                       walls: list[tuple[complex, complex]], half_symbol: float, h_width: float,
                       ahead: list[complex] = (), letters: list[complex] = (), drawn_h: list[complex] = ()):
        """1 (right), -1 (left), 1j (below) or -1j (above): the first side beside the symbol where
        the 'H' text keeps 50 degrees from the atom's bonds and from the bonds it is about to
        form (`ahead`), 55 from its bonds to hydrogens drawn as atoms (`drawn_h`: the arrow at
        such a short bond between two labels needs room on one side of it, and the charge sign
        often takes the other), and meets neither the atoms around (`crowd`: each as its offset
        and the room, across and up, that its label may need) nor other bonds (`walls`, as
        offsets of their ends); when neither side does, the side that meets the fewest (a bond
        within 50 degrees counts as one, a drawn hydrogen's within 55 as two more), then the one
        furthest round from bonds and atoms. An atom without bonds tries the side its formula is
        written from first (HO-, H2O; NH3). Above or below, pointing within 30 degrees at another
        heteroatom's label (`letters`, offsets within 1.75 bond lengths), also counts as meeting
        it."""
        h_first = not bonds and element in _HYDROGEN_FIRST
        bonds = bonds + list(ahead)
        occupied = bonds + [unit_or_zero(c) for c, _, _ in crowd]
        if not occupied:
            return -1 if h_first else 1
        limit = math.radians(50)
        half_height, line, pad = 0.5 * self.cap, 1.1 * self.style.font_size, 0.08 * self.style.bond_length

        def meets(side) -> int:
            if side in (1, -1):
                x0, x1 = sorted((side * half_symbol, side * (half_symbol + h_width)))
                y = 0.0
            else:
                x0, x1, y = -h_width / 2, h_width / 2, side.imag * line
            hit = sum(1 for c, across, up in crowd
                      if x0 - across <= c.real <= x1 + across and abs(c.imag - y) <= half_height + up)
            text = Box(x0 - pad, y - half_height - pad, x1 + pad, y + half_height + pad)
            hit += sum(1 for a, b in walls if segment_hits_box(a, b, text))
            if side in (1j, -1j):   # written above or below, pointing at another heteroatom's label
                hit += sum(1 for c in letters if abs(cmath.phase(c / side)) < _TOWARD_LETTER)
            return hit + (clearance(complex(side), bonds) < limit) \
                + 2 * (clearance(complex(side), drawn_h) < _BY_A_MOVING_HYDROGEN)

        for side in ((-1, 1) if h_first else (1, -1)):
            if not meets(side):
                return side
        return min((1j, -1j, 1, -1), key=lambda s: (meets(s), -clearance(complex(s), occupied)))

    def _runs_box(self, runs: list[TextRun]) -> Box:
        return Box.enclosing([self.text_box(r) for r in runs])

    def text_box(self, run: TextRun) -> Box:
        face = self.italic if run.italic else self.face
        cap = face.cap_height * run.size
        width = face.width(run.text, run.size)
        low = run.y + (0.0 if _DESCENDERS.isdisjoint(run.text) else 0.2 * run.size)
        return Box(run.x, run.y - cap, run.x + width, low)

    # bonds
    def _bond(self, i: int, j: int, order: int, role: str, out: PanelStructure,
              neighbours: dict[int, list[int]], rings: list[list[int]],
              paint: Optional[tuple[tuple[str, ...], ...]] = None) -> BondDrawing:
        """`paint`: the colours of each stroke (_stroke_paint), None for all in ink."""
        p, q = out.positions[i], out.positions[j]
        box_i, box_j = out.atoms[i].box, out.atoms[j].box
        pair = (i, j) if i < j else (j, i)
        if order == 1:   # one centred stroke: its ends, labels and role fix it
            key = (i, j, role, p, q, box_i, box_j, paint)
            drawing = self._single_bonds.get(key)
            if drawing is None:
                drawing = self._single_bonds[key] = self._strokes(i, j, order, role, out, neighbours, 0, paint)[0]
            out.bond_extent[pair] = 0.0
            return drawing
        # A double or triple bond's strokes depend as well on the side its second line takes and,
        # at a bare vertex, on the bonds they meet there: with those, it is reused likewise.
        side = self._double_side(i, j, out.positions, neighbours, rings) if order == 2 else 0
        key = (i, j, order, role, p, q, box_i, box_j, side, tuple([(m, out.positions[m]) for m in neighbours[i]]),
               tuple([(m, out.positions[m]) for m in neighbours[j]]), paint)
        known = self._multiple_bonds.get(key)
        if known is None:
            known = self._multiple_bonds[key] = self._strokes(i, j, order, role, out, neighbours, side, paint)
        drawing, extent, lean = known
        if lean is not None:
            out.bond_lean[pair] = lean
        out.bond_extent[pair] = extent
        return drawing

    def _strokes(self, i: int, j: int, order: int, role: str, out: PanelStructure,
                 neighbours: dict[int, list[int]], side: int, paint: Optional[tuple[tuple[str, ...], ...]] = None
                 ) -> tuple[BondDrawing, float, Optional[complex]]:
        """The bond's strokes, clipped at labels, with the second or third line set beside the
        first (a double bond's on `side`, as _double_side chooses), in the colours `paint` gives
        them (None: ink); how far they reach off the bond's axis; and the offset of a one-sided
        double bond's second line (else None)."""
        bl = self.style.bond_length
        p, q = out.positions[i], out.positions[j]
        pad = 0.12 * self.style.font_size
        box_i, box_j = out.atoms[i].box, out.atoms[j].box
        u = (q - p) / (abs(q - p) or 1.0)
        n = u * 1j
        gap = _DOUBLE_GAP * bl

        def line(offset: complex, trim: float = 0.0) -> tuple[complex, complex]:
            """A stroke parallel to the bond, clipped at labels; at a bare vertex a centred
            stroke meets the neighbouring bond on its side, an inner stroke stops short."""
            start = clip_from(p + offset, q + offset, box_i, pad) if box_i is not None else \
                p + offset + u * (trim or self._join(p, u, offset, out.positions, neighbours[i], j))
            end = clip_from(q + offset, p + offset, box_j, pad) if box_j is not None else \
                q + offset - u * (trim or self._join(q, -u, offset, out.positions, neighbours[j], i))
            return start, end

        lean = None
        if order == 2:
            if side == 0:
                lines, extent = [line(n * gap / 2), line(-n * gap / 2)], gap / 2
            else:
                lines, extent = [line(0), line(side * n * gap, trim=0.14 * bl)], gap
                lean = side * n * gap
        elif order == 3:
            lines, extent = [line(0), line(n * gap * 0.8), line(-n * gap * 0.8)], gap * 0.8
        else:
            lines, extent = [line(0)], 0.0
        colour, line_colours = INK, ()
        if paint is not None:
            lines, line_colours = _painted(lines, paint)
            if len(set(line_colours)) == 1:
                colour, line_colours = line_colours[0], ()
        drawing = BondDrawing((i, j), order, tuple([((s.real, s.imag), (e.real, e.imag)) for s, e in lines]), role,
                              colour, line_colours=line_colours)
        return drawing, extent, lean

    def _wedges(self, state: ElectronState, adjacent: list[list[int]],
                neighbours: dict[int, list[int]], out: PanelStructure, bonds: list[tuple[int, int, int]],
                breaking: set[tuple[int, int]]) -> dict[tuple[int, int], str]:
        """(stereocentre, other atom) -> kind, for the bonds wedged on this panel (wedges.py);
        `breaking`: the bonds the step leaving the panel breaks, where its arrows start."""
        centres = configured_centres(state)
        if not centres:
            return {}
        elements, atom = state.elements, state.mol.GetAtomWithIdx

        def hydrogens(n: int) -> int:
            return atom(n).GetTotalNumHs() + sum(1 for m in adjacent[n] if elements[m] == 1)

        single = {(min(i, j), max(i, j)) for i, j, order in bonds
                  if order == 1 and (i in centres or j in centres) and i in out.positions and j in out.positions}
        return choose_wedges(centres, out.positions, single, breaking, neighbours, hydrogens,
                             lambda a, b: closes_cycle(a, b, adjacent), stereogenic_atoms(state))

    def _wedge(self, narrow: int, wide: int, kind: str, role: str, out: PanelStructure) -> BondDrawing:
        """A solid or hashed wedge from a point at `narrow` to its full width at `wide`, each end
        stopping short of a label as other bonds do. The wide end is as broad as a double bond
        drawn here with its two strokes (their gap and one line width): a wedge reads as one bond
        among the others (common practice, memory). Hashes are about as far apart as the lines of
        a double bond, five to eight of them."""
        bl, pad = self.style.bond_length, 0.12 * self.style.font_size
        p, q = out.positions[narrow], out.positions[wide]
        start = clip_from(p, q, out.atoms[narrow].box, pad)
        end = clip_from(q, p, out.atoms[wide].box, pad)
        half = (_DOUBLE_GAP * bl + self.style.line_width) / 2
        across = (q - p) / (abs(q - p) or 1.0) * 1j * half
        colour = INK
        if self.style.color and role in ("formed", "broken"):
            colour = FORMED_COLOUR if role == "formed" else BROKEN_COLOUR
        out.bond_extent[(min(narrow, wide), max(narrow, wide))] = half
        if kind == SOLID:
            corners = (start, end + across, end - across)
            outline = tuple((c.real, c.imag) for c in corners)
            lines = tuple((outline[k], outline[(k + 1) % 3]) for k in range(3))
            return BondDrawing((narrow, wide), 1, lines, role, colour, SOLID, narrow, outline)
        count = max(5, min(8, round(abs(end - start) / (_DOUBLE_GAP * bl))))
        hashes = []
        for k in range(1, count + 1):
            t = k / count
            middle = start + (end - start) * t
            a, b = middle + across * t, middle - across * t
            hashes.append(((a.real, a.imag), (b.real, b.imag)))
        return BondDrawing((narrow, wide), 1, tuple(hashes), role, colour, HASHED, narrow)

    @staticmethod
    def _join(vertex: complex, u: complex, offset: complex, positions: dict[int, complex], neighbours: list[int],
              across: int) -> float:
        """How far along u a stroke offset from the bond axis starts so that it meets the
        neighbouring bond on its side (negative: it starts behind the vertex); `across` is the
        bond's other end."""
        if abs(offset) < 1e-9:
            return 0.0
        best = None
        for m in neighbours:
            if m == across:
                continue
            other = positions[m]
            v = other - vertex
            if abs(v) < 1e-9:
                continue
            v = v / abs(v)
            # Same side of the axis as the offset, and not nearly parallel to it.
            if ((v / u).imag > 0) != ((offset / u).imag > 0) or abs((v / u).imag) < 0.2:
                continue
            # vertex + offset + t*u = vertex + s*v  ->  solve for t.
            det = (u.conjugate() * v).imag
            t = -((offset.conjugate() * v).imag) / det if abs(det) > 1e-9 else 0.0
            if best is None or abs(t) < abs(best):
                best = t
        return 0.0 if best is None else max(min(best, 0.5 * abs(offset) * 4), -abs(offset) * 2)

    def _double_side(self, i: int, j: int, positions: dict[int, complex], neighbours: dict[int, list[int]],
                     rings: list[list[int]]) -> int:
        """+1 / -1: the second line's side (left/right of i->j); 0: centred."""
        p, q = positions[i], positions[j]
        u = q - p
        containing = [r for r in rings if i in r and j in r and all(a in positions for a in r)]
        if containing:
            ring = min(containing, key=len)
            centre = sum(positions[a] for a in ring) / len(ring)
            return 1 if ((centre - p) / u).imag > 0 else -1
        others_i = [n for n in neighbours[i] if n != j]
        others_j = [n for n in neighbours[j] if n != i]
        if not others_i and not others_j:
            return 0
        if not others_i or not others_j:
            # A terminal atom: centred when the other end carries two substituents (C=O of a
            # ketone), else on the side of the one substituent (as in an aldehyde or =CH2).
            if len(others_i) + len(others_j) != 1:
                return 0
        total = sum(((positions[n] - p) / u).imag for n in others_i) + \
            sum(((positions[n] - p) / u).imag for n in others_j)
        if abs(total) < 1e-6:
            return 0
        return 1 if total > 0 else -1

    # marks beside atoms
    def _charge_and_radical(self, state: ElectronState, i: int, out: PanelStructure, ahead: list[complex] = (),
                            inward: Optional[complex] = None, closing: Optional[complex] = None,
                            hemmed: bool = False) -> None:
        """`ahead`: directions to atoms a bond is about to form with, where an arrow's head goes;
        a charge sign set round the atom keeps out of them, and one written as a superscript too
        when the atom is `hemmed` in. `inward`: the direction into the atom's ring, where a sign
        would read as the ring's; `closing`: into the ring the bonds ahead close, where the arrows
        that close it run."""
        charge = state.formal_charge(i)   # V - N - B, as the bookkeeping sets RDKit's
        if charge:
            sign = "+" if charge > 0 else MINUS
            text = (str(abs(charge)) if abs(charge) > 1 else "") + sign
            # Other atoms' labels close by: a sign against one reads as belonging to it.
            centre, bl = out.positions[i], self.style.bond_length
            nearby = [j for j, a in out.atoms.items()
                      if j != i and a.box is not None and abs(out.positions[j] - centre) < 2 * bl]
            # A sign by a bare vertex of another molecule reads as that carbon's (a spent H3O+'s
            # "+" against an alkene carbon, as a carbocation).
            own_molecule = _molecule_of(out, i)
            vertices = [out.positions[j] for j, a in out.atoms.items() if a.box is None and j not in own_molecule
                        and abs(out.positions[j] - centre) < 2 * bl]
            mark = self._superscript(i, text, out, [out.atoms[j].box for j in nearby], inward, vertices,
                                     ahead if hemmed else ())
            if mark is None:
                # Round the atom: clear of its bonds, the gaps ahead, the ring it stands in and the
                # labels nearest.
                labels = [unit_or_zero(out.positions[j] - centre) for j in nearby
                          if abs(out.positions[j] - centre) < 1.3 * bl]
                # A minus beside a bond to a hydrogen drawn as an atom (one that moves) reads as that
                # hydrogen's (BH4-'s, 60 degrees from the H it gives, as a hydride's): the bond's
                # flanks count as taken too, so the sign goes to the free side.
                flanks = [unit_or_zero(out.positions[j] - centre) * cmath.rect(1, turn) for j in nearby
                          if charge < 0 and state.elements[j] == 1 and state.mol.GetBondBetweenAtoms(i, j) is not None
                          for turn in (-math.pi / 4, math.pi / 4)]
                shunned = inward or closing
                avoided = list(ahead) + [d for d in labels if d] + ([shunned] if shunned else []) + flanks
                out.occupied[i] += avoided
                mark = self._side_text("charge", i, text, out, preferred=cmath.rect(1, -math.pi / 4), shunned=shunned)
                for d in avoided:
                    out.occupied[i].remove(d)
            out.marks.append(mark)
        # An unpaired electron is one of the atom's own (N): RDKit is asked only where there are some.
        if state.nonbonding[i] and state.mol.GetAtomWithIdx(i).GetNumRadicalElectrons():
            out.marks.append(self.radical_dot(i, out, preferred=cmath.rect(1, -math.pi / 2)))

    def _superscript(self, i: int, text: str, out: PanelStructure, near: list[Box],
                     inward: Optional[complex] = None, vertices: Sequence[complex] = (),
                     ahead: Sequence[complex] = ()) -> Optional[Mark]:
        """A charge written as a superscript after the label (O-, NH3+), or before it when a
        bond leaves from the upper right; None when neither place is free of bonds (and of the lines
        `ahead` to atoms it is about to bond) and of the `near` labels, lies toward the inside of
        the atom's ring (`inward`) or stands by one of the `vertices` (bare vertices of other
        molecules)."""
        drawing = out.atoms[i]
        if drawing.box is None:
            return None
        # The line the element symbol is on (hydrogens written above or below it do not count).
        baseline_y = out.positions[i].imag + self.cap / 2
        same_line = [self.text_box(r) for r in drawing.runs if abs(r.y - baseline_y) < 0.5 * self.style.font_size]
        # Its own hydrogens written above or below (the H2 over a borate's B): the sign may not
        # touch them either.
        own = [self.text_box(r) for r in drawing.runs if abs(r.y - baseline_y) >= 0.5 * self.style.font_size]
        box = Box.enclosing(same_line)
        size = self.style.small_size
        width = self.face.width(text, size)
        baseline = box.y0 + 0.38 * size
        centre = out.positions[i]
        reach = self.style.bond_length
        strokes = None
        places = [box.x1 + 0.03 * size]
        # Before the label only if the symbol begins it: before "HO" a sign reads as the H's ("-HO").
        parts = out.label_parts.get(i)
        if parts is None or not any(b.x1 <= parts[0].x0 + 1e-6 and b.y1 > parts[0].y0 and b.y0 < parts[0].y1
                                    for b in parts[1]):
            places.append(box.x0 - 0.03 * size - width)
        for x in places:
            run = TextRun(text, x, baseline, size)
            tb = self.text_box(run)
            grown = Box(tb.x0 - 0.1 * size, tb.y0 - 0.1 * size, tb.x1 + 0.1 * size, tb.y1 + 0.1 * size)
            # (The arrows into a bond about to form end on its line: a sign that line runs through
            # lies under their heads, one beside it need not.)
            if any(segment_hits_box(centre + d * out.label_reach(i, d), centre + d * reach, grown)
                   for d in out.bond_directions[i]) or any(grown.overlaps(b, 0.2 * size) for b in near) \
                    or any(segment_hits_box(centre + d * out.label_reach(i, d), centre + d * reach, tb)
                           for d in ahead if d) \
                    or any(tb.overlaps(b) for b in own) or level_and_close(tb, near, size) \
                    or self._by_a_foreign_vertex(tb, vertices):
                continue
            if strokes is None:
                # Strokes of the bonds close by: a sign on a ring bond beside NH2+ reads as
                # neither's, and one on the second or third stroke of the atom's own multiple bond
                # (a nitrilium's N+ beside its C#N) as a smudge. (A stroke is shorter than two bond
                # lengths: one that reaches the sign has an end within that of the atom.)
                near_end = 2 * reach
                strokes = [(start, complex(*b)) for bond in out.bonds
                           for a, b in bond.lines if abs((start := complex(*a)) - centre) < near_end]
            if _sign_near_stroke(tb, size, strokes, _SIGN_STROKE_GAP):
                continue
            if text.endswith(MINUS) and self._minus_beside_stroke(run, strokes):
                continue
            middle = complex((tb.x0 + tb.x1) / 2, (tb.y0 + tb.y1) / 2) - centre
            if inward is not None and abs(middle) > 1e-9 and (middle / abs(middle) * inward.conjugate()).real > 0.5:
                continue   # within 60 degrees of the way into its ring
            out.occupied[i].append(middle / abs(middle))
            return Mark("charge", i, (run,), box=tb)
        return None

    def _by_a_foreign_vertex(self, box: Box, vertices: Sequence[complex]) -> bool:
        """Whether the middle of `box` stands within _BY_A_VERTEX of one of `vertices`."""
        middle = complex((box.x0 + box.x1) / 2, (box.y0 + box.y1) / 2)
        return any(abs(middle - v) < _BY_A_VERTEX * self.style.bond_length for v in vertices)

    def _minus_beside_stroke(self, run: TextRun, strokes: list[tuple[complex, complex]]) -> bool:
        """Whether the minus sign of `run` lies along a bond stroke, near enough to read as the
        second line of a double bond (DMSO's O- written over its O-S bond reads as O=S)."""
        width = self.face.width(MINUS, run.size)
        x0 = run.x + self.face.width(run.text[:-1], run.size)
        y = run.y - self.face.ink_middle(MINUS) * run.size
        return minus_along_stroke(x0, width, y, strokes, self.style.bond_length)

    def _side_text(self, kind: str, i: int, text: str, out: PanelStructure, preferred: complex,
                   italic: bool = False, shunned: Optional[complex] = None, avoid: Sequence[Box] = ()) -> Mark:
        """Small text beside atom i (a charge, a map number, a CIP label): in the roomiest direction
        round the atom, leaning to `preferred`, that keeps the text off other atoms' labels and
        the marks already placed (else the roomiest), and more than 60 degrees from `shunned`
        (the way into the atom's ring) where it can; off the `avoid` boxes too (curved arrows)."""
        size = self.style.small_size
        face = self.italic if italic else self.face
        width = face.width(text, size)
        cap = face.cap_height * size
        pad = 0.05 * self.style.font_size
        others = [a.box for j, a in out.atoms.items() if j != i and a.box is not None] + \
                 [m.box for m in out.marks if m.box is not None]
        best = None
        # A charge keeps near its first choice (the arrows, planned later, avoid it there); a
        # drafting label may go all the way round, and where every direction meets something,
        # takes the one that overlaps least.
        ranked = islice(ranked_directions(out.occupied[i], preferred), 12 if kind == "charge" else 24)
        tried = [(d, False) for d in ranked]
        # A minus level with a label, before or after it, reads as a bond into the label ("-Si").
        labelled = out.atoms[i].box is not None
        # Beside a label a plus goes to its upper right wherever it is clear there and close to the
        # label (within _BY_THE_LABEL; common practice), before the roomiest side: an oxonium O+
        # with its bond to H on the right had its sign under the O, 0.4 bond lengths from its centre.
        # (A minus keeps the roomiest side: at the upper right it came to lie along a shallow bond.)
        if kind == "charge" and labelled and text.endswith("+"):
            tried = [(d, True) for d in self._upper_right(out.occupied[i], preferred)] + tried
        centre, reach = out.positions[i], 2 * self.style.bond_length
        # A charge keeps off the strokes of the bonds round it (the inner stroke of a ring's
        # double bond, which its bond directions alone do not show).
        strokes = [(start, complex(*b)) for bond in out.bonds for a, b in bond.lines
                   if abs((start := complex(*a)) - centre) < reach] if kind == "charge" else []
        # A sign level with the atom's own hydrogens written above or below its symbol, just
        # after or before them, reads as theirs: "H+" over an ammonium N.
        hydrogens = [self.text_box(r) for r in out.atoms[i].runs
                     if abs(r.y - (out.positions[i].imag + self.cap / 2)) >= 0.5 * self.style.font_size] \
            if labelled and kind == "charge" else []
        # Beside a skeletal vertex a sign pointing at another molecule reads as joining the two.
        elsewhere = other_molecules(out, i) if kind == "charge" and not labelled else []
        labels = [a.box for j, a in out.atoms.items() if j != i and a.box is not None]
        for direction, upper_right in tried:
            mark, slid = self._side_text_at(kind, i, text, out, direction, width, cap, size, italic)
            # Slid far out along a crowded direction, the text no longer reads as the atom's.
            gap = min((_separation(mark.box, b) for b in others), default=math.inf)
            if kind == "charge" and level_and_close(mark.box, labels, size):
                gap = min(gap, 0.0)
            on_stroke = _sign_near_stroke(mark.box, size, strokes, _SIDE_SIGN_STROKE_GAP) or (
                text.endswith(MINUS) and (self._minus_beside_stroke(mark.runs[-1], strokes) or (
                    labelled and abs(direction.imag) < _LEVEL_WITH_LABEL))) or level_and_close(
                mark.box, hydrogens, size, apart=0.6)
            inside = shunned is not None and (direction * shunned.conjugate()).real > 0.5
            # A drafting label (a CIP label, a map number) nearly as near another atom as its own
            # reads as either's: between two adjacent stereocentres, "(R)" and "(S)" could not be told apart.
            # (a charge only where it stands nearer another atom than its own: Favorskii's carbanion
            # sign between its C and the ester's)
            ambiguous = _nearer_another(mark.box, i, out, 1.25 if kind != "charge" else 1.0) or (
                kind == "charge" and not labelled and _as_superscript_of(mark.box, labels, size))
            # On an arrow (`avoid`) is the least of the faults (a drafting label's).
            on_arrow = bool(avoid) and min(_separation(mark.box, b) for b in avoid) < pad
            toward_another = bool(elsewhere) and points_at_another(mark.box, centre, elsewhere, self.style.bond_length)
            fault = (gap < pad or on_stroke, ambiguous, inside, toward_another, slid >= _FAR_SLIDE, on_arrow,
                     0.0 if kind == "charge" else -min(gap, pad))
            if upper_right and (any(fault[:6]) or _nearer_another(mark.box, i, out, _CLEARLY_ITS_OWN, letters=True) or
                                self._sign_distance(mark, out.atoms[i].box) > _BY_THE_LABEL * self.style.bond_length):
                continue
            if best is None or fault < best[0]:
                best = (fault, direction, mark)
            if not any(fault[:6]):
                break
        _, direction, mark = best
        out.occupied[i].append(direction)
        return mark

    def _sign_distance(self, mark: Mark, label: Box) -> float:
        """How far the middle of a charge text's glyph nearer the label (the 2 of 2+ after it, the
        sign of +OH before it) stands from the label's box."""
        run = mark.runs[-1]
        face = self.italic if run.italic else self.face
        first, last = run.text[0], run.text[-1]
        x_first = run.x + face.width(first, run.size) / 2
        x_last = run.x + face.width(run.text, run.size) - face.width(last, run.size) / 2
        return min(label.distance((x_first, run.y - face.ink_middle(first) * run.size)),
                   label.distance((x_last, run.y - face.ink_middle(last) * run.size)))

    @staticmethod
    def _upper_right(occupied: list[complex], preferred: complex) -> list[complex]:
        """The directions of the quarter round `preferred` (15 degrees apart, nearest it first)
        that keep _UPPER_RIGHT_ROOM from every direction taken round the atom (its bonds, the
        gaps where bonds form, the labels close by)."""
        return [d for d in _upper_right_quarter(preferred) if clearance(d, occupied) >= _UPPER_RIGHT_ROOM]

    def _side_text_at(self, kind: str, i: int, text: str, out: PanelStructure, direction: complex,
                      width: float, cap: float, size: float, italic: bool) -> tuple[Mark, int]:
        """The mark in `direction`, and how many steps it slid out to clear the atom's bonds."""
        centre = out.positions[i]
        half = max(width, cap) / 2
        reach = out.label_reach(i, direction) or 0.18 * self.style.bond_length
        spot = centre + direction * (reach + half + 0.08 * self.style.font_size)
        run = TextRun(text, spot.real - width / 2, spot.imag + cap / 2, size, italic=italic,
                      colour=NUMBER_COLOUR if kind == "number" else INK)
        bl = self.style.bond_length
        lines = [(centre, centre + d * bl) for d in out.bond_directions.get(i, ())]
        if out.atoms[i].box is None:
            # Beside a skeletal vertex the text slides out until it is clear of the vertex's bond
            # lines, so a sign never reads as part of a bond end.
            def clear(box: Box) -> bool:
                return _clear_of(box, lines, _SIDE_TEXT_CLEARANCE * bl)
            steps = 12
        elif kind == "charge":
            # Beside a crowded label a sign slides out between the bonds it would touch (the minus
            # of a five-bonded silicate, above the Si between its bonds to O and to a methyl).
            def clear(box: Box) -> bool:
                grown = Box(box.x0 - 0.2 * size, box.y0 - 0.2 * size, box.x1 + 0.2 * size, box.y1 + 0.2 * size)
                return not any(segment_hits_box(a, b, grown) for a, b in lines)
            steps = _FAR_SLIDE
        else:
            return Mark(kind, i, (run,), box=self.text_box(run)), 0
        for slid in range(steps):
            if clear(self.text_box(run)):
                break
            run = TextRun(text, run.x + direction.real * 0.03 * bl, run.y + direction.imag * 0.03 * bl, size,
                          italic=italic, colour=run.colour)
        else:
            slid = steps
        return Mark(kind, i, (run,), box=self.text_box(run)), slid

    def radical_dot(self, i: int, out: PanelStructure, preferred: complex) -> Mark:
        direction = best_direction(out.occupied[i], preferred)
        out.occupied[i].append(direction)
        radius = self.dot_radius
        reach = out.label_reach(i, direction) or 0.15 * self.style.bond_length
        spot = out.positions[i] + direction * (reach + radius + 0.1 * self.style.font_size)
        return Mark("radical", i, dots=((spot.real, spot.imag),), radius=radius,
                    box=Box(spot.real - radius, spot.imag - radius, spot.real + radius, spot.imag + radius))

    @property
    def dot_radius(self) -> float:
        return max(0.85 * self.style.line_width, 0.065 * self.style.font_size)

    def _cip_marks(self, state: ElectronState, visible: tuple[int, ...], out: PanelStructure) -> None:
        from ..judgement.stereo import cip_labels
        labels = cip_labels(state.mol, visible)
        reach = _LABELLED_NEIGHBOUR * self.style.bond_length
        for i, code in labels.items():
            # Each label beside its own centre, away from its bonds and from a labelled centre
            # close by (two adjacent stereocentres' "(R)" and "(S)" side by side at their shared
            # bond could not be told apart; common practice sets each on its centre's outer side).
            here = out.positions[i]
            partners = sorted((abs(out.positions[j] - here), j) for j in labels
                              if j != i and abs(out.positions[j] - here) < reach)
            towards = [unit(out.positions[j] - here) for _, j in partners]
            away = -(sum(out.bond_directions.get(i, ())) + sum(towards))
            preferred = unit(away) if abs(away) > 1e-6 else cmath.rect(1, 3 * math.pi / 4)
            out.marks.append(self._side_text("cip", i, f"({code})", out, preferred=preferred, italic=True))
