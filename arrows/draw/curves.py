"""Curved-arrow geometry: where each move's arrow starts and ends, which way it bends, its head.

A pair arrow starts at the lone-pair dots (drawn here, on the side facing the arrow's target) or
at the midpoint of the source bond, on the side the arrow leaves from. It ends at an atom, short
of its label, or at the midpoint of the bond that forms or gains order (common practice in
organic chemistry texts); across a wide gap (two molecules waiting apart) it stops no more than
_GAP_REACH from the atom the new bond reaches, so the head points at that atom. A new bond made
from a lone pair is shown by pointing at the atom that receives the pair.

Each arrow is a cubic Bezier fixed by its two ends and the directions it leaves and arrives in.
A handful of such curves is tried per arrow (leaving from either side of a bond, arriving at an
atom from any free direction; an arrow to a proton whose cheapest one crosses a bond also
tries wider arcs round the structure) and one is chosen for every arrow of a step
together, by a penalty: passing through a label or an atom is nearly forbidden, crossing a bond
or another arrow is costly, an arc bulging into the molecule costs more than one bulging out,
an S-shaped arc is avoided, so is an arc that loops back on itself or squeezes into the angle
between the two bonds it joins, and two heads of one step never share a position. Where a
group shifts onto an atom whose own pair goes into the bond beside it, that pair's dots sit on
the other side of the bond and its head stops further along it, so the two heads stand apart.
"""
from __future__ import annotations

import cmath
import math
from dataclasses import dataclass, field, replace
from functools import lru_cache
from itertools import chain, repeat
from operator import attrgetter
from typing import Iterator, Optional

import numpy as np

from ..electrons import ElectronState, ResolvedMove
from .formula import MINUS
from .plane import unit
from .scene import Box, CurvedArrow, Mark
from .structure import (PanelStructure, clearance, closes_cycle, level_and_close, minus_along_stroke, other_molecules,
                        points_at_another, ranked_directions, segment_hits_box)
from .styles import Style

_SAMPLES = 16
_ANGLES = (math.radians(34), math.radians(58))
_SHORT_ANGLES = (math.radians(40), math.radians(70), math.radians(105))
# Where the cheapest arc of an arrow to a proton crosses a bond not its own: arcs bending
# further, to go round the obstacle (the alkoxide of a benzilic acid reaching round a phenyl to
# the acid's H), no longer than _WIDE_REACH bond lengths (a longer one reads as a stray loop).
_WIDE_ANGLES = (math.radians(80), math.radians(110))
_WIDE_REACH = 6.5
_KEEP = 4          # candidates per arrow that enter the joint choice
_COST = attrgetter("cost")   # a candidate's cost, read in C when candidates are sorted
_GAP_REACH = 0.45  # bond lengths: farthest a head into a forming bond stops from the atom it reaches
_SHIFT_REACH = 0.22  # bond lengths: where the head of a 1,2-shift stops from the atom the group moves to
_HEAD_ROOM = 0.5     # bond lengths: two heads of one step closer than this read as one place
_SINK_SLIDE = 0.25   # bond lengths: the furthest a head into a bond moves along it to give way (within its middle half)
_MAX_TURN = math.radians(180)   # an arc turning further than this curls back on itself
_CURL_WEIGHT = 0.5              # penalty per degree beyond _MAX_TURN
_LOOP_STANDOFF = 0.45           # bond lengths: a turned-back arc standing further off its chord is a loop
_SELF_CROSSING = math.radians(240)   # an arc turning this far crosses itself
_OFF_SYMBOL = 15.0              # penalty of a hook whose head reads as the label's H's, not its atom's
_LABELLED_HOOK = 0.6            # bond lengths: how deep a hook between two labels stands off its bond
_HEAD_BASE = 0.72                # head lengths from a head's tip back to its base (the notch, _arrow)
_HOOK_LENGTH = 0.9              # bond lengths: the shortest path that reads as an arc from a bond to its own atom
_SHORT_HOOK = 30.0              # penalty per bond length such an arrow falls short of that
# Bond lengths: the shortest path (shaft and head) of an arrow from a bond to one of its own atoms
# that reads as a half-loop; shorter, it prints as a tick beside the bond (the geometry tests'
# measure: 0.56-0.79 read as ticks in a figure review, 0.88 and more as curves; scheme notes it).
LEGIBLE_HOOK = 0.8
# Where every hook of such an arrow is shorter than LEGIBLE_HOOK (its usual half-loop runs into a
# neighbour's label by the bond's middle, the tick left): half-loops turned this far round toward
# the atom, which bulge out beside the atom instead, _TURNED_DEPTH deep.
_HOOK_TURNS = (math.radians(30), math.radians(50))
_TURNED_DEPTH = 0.45            # bond lengths
_TICK = 4.0                     # penalty of a plain arc where a pair goes from a bond to its own atom
_PAIR_ARC = 0.8                 # bond lengths: the shortest path from dots into their own atom's bond
_SHIFT_BULGE = 0.2              # bond lengths a 1,2-shift's arc stands out from its chord, away from the pivot
# Penalty of one that stands out less (or bulges toward the pivot): more than the crowding an
# outward arc meets where the migrating group, the pivot and the new partner stand in a triangle
# (the Hofmann rearrangement's methyl shift to nitrogen, at 5.0, bulged inward).
_TIGHT_SHIFT = 20.0
_WIDE_ANGLE = math.radians(135)   # up to this angle a hook may reach over the neighbour's bond
# Penalty per sample of a bond crossed: one of a named atom's (the arrow's own neighbourhood, where
# some crossing is hard to avoid) weighs a third of any other.
_OWN_CROSSING, _CROSSING = 6.0, 18.0
_CROOK = 1.0                    # penalty of an arc cramped inside the angle of the two bonds it joins
_KNOT = 4.0                     # penalty of one that goes round the outside where other bonds shut the way
# Reductions are called as numpy's ufunc methods (np.add.reduce for .sum, np.minimum.reduce for
# .min) and nonzero as the array's method: the same work without the Python wrappers, which cost
# more than the arithmetic on arrays of a few dozen numbers. Rows are gathered with the array's
# take (x.take(rows, axis=0), a flat array's take for pairs of indices), not by indexing with
# an index array: the same copy, at a third of the cost of setting up numpy's general indexing.
_T = np.linspace(0.0, 1.0, _SAMPLES + 1)
_BERNSTEIN = np.stack([(1 - _T) ** 3, 3 * _T * (1 - _T) ** 2, 3 * _T ** 2 * (1 - _T), _T ** 3])


def bezier(p0: complex, p1: complex, p2: complex, p3: complex, t: float) -> complex:
    s = 1 - t
    return s * s * s * p0 + 3 * s * s * t * p1 + 3 * s * t * t * p2 + t * t * t * p3


def split_before(p0: complex, p1: complex, p2: complex, p3: complex, t: float) -> tuple[complex, ...]:
    """Control points of the part of the curve from 0 to t (de Casteljau)."""
    a, b, c = p0 + (p1 - p0) * t, p1 + (p2 - p1) * t, p2 + (p3 - p2) * t
    d, e = a + (b - a) * t, b + (c - b) * t
    return p0, a, d, d + (e - d) * t


@lru_cache(maxsize=None)
def _handle(theta: float) -> float:
    """Handle length over chord for a cubic close to a circular arc leaving the chord at theta."""
    return (4.0 / 3.0) * math.tan(theta / 2) / (2 * math.sin(theta))


def _units(z: np.ndarray) -> np.ndarray:
    """_unit of every element, with Python's arithmetic: np.hypot is the hypot that abs() of a
    Python complex uses, and each part is divided alone (numpy's own complex abs and division
    may round differently)."""
    size = np.hypot(z.real, z.imag)
    ok = size > 1e-12
    # (np.where rather than a boolean mask: selecting by a mask costs more than dividing all)
    safe = np.where(ok, size, 1.0)
    out = np.empty(z.shape, dtype=complex)
    out.real = np.where(ok, z.real / safe, 1.0)
    out.imag = np.where(ok, z.imag / safe, 0.0)
    return out


@dataclass(slots=True)
class _Anchor:
    """One end of an arrow, before the curve is chosen."""

    kind: str                 # dots, bond, atom, gap
    point: complex            # the source or sink point reported in the scene
    atoms: tuple[int, ...]
    outward: complex = 0j     # dots: the direction from the atom through the dots
    extent: float = 0.0       # bond: half-width of its strokes
    axis: complex = 1 + 0j    # bond or gap: unit vector along it
    pivot: Optional[int] = None   # gap of a 1,2-shift: the atom the group leaves


@dataclass(slots=True)   # (a few hundred a figure, their fields read in every sort and sum)
class _Candidate:
    p0: complex
    p1: complex
    p2: complex
    tip: complex
    row: int = 0               # its row of complex samples along the curve in the scheme's array
    cost: float = 0.0
    length: float = 0.0        # of the polyline through its samples
    handicap: float = 0.0      # a cost known before scoring (a shape that reads poorly)
    crossings: int = 0         # bonds not its own that it crosses
    wide: bool = False         # a wider arc, tried where the cheapest usual one crosses a bond


class _Obstacles:
    """Everything on a panel within a box (the reach of every candidate curve of the panel) that
    an arrow should keep away from, as plain lists: the arrows of a whole scheme are scored
    together, on these lists padded to one size. The box is applied while the lists are built:
    a few dozen Python comparisons cost less than numpy's calls."""

    def __init__(self, panel: PanelStructure, extra_marks: list[Mark], bl: float,
                 x0: float, y0: float, x1: float, y1: float):
        positions = panel.positions
        self.largest_id = max(panel.atoms, default=0)   # sizes the per-atom rows, bonds leaving the box included
        atoms = [i for i in sorted(panel.atoms)
                 if x0 <= positions[i].real <= x1 and y0 <= positions[i].imag <= y1]
        self.atom_ids = atoms
        self.atom_xy = [positions[i] for i in atoms]
        pad = 0.05 * bl
        self.labelled_ids, self.label_boxes, self.bare_ids, self.bare_xy = [], [], [], []
        for i in atoms:
            b = panel.atoms[i].box
            if b is None:
                self.bare_ids.append(i)
                self.bare_xy.append(positions[i])
            else:
                self.labelled_ids.append(i)
                self.label_boxes.append((b.x0 - pad, b.y0 - pad, b.x1 + pad, b.y1 + pad))
        mp = 0.03 * bl
        marks = [(m.atom, (m.box.x0 - mp, m.box.y0 - mp, m.box.x1 + mp, m.box.y1 + mp))
                 for m in list(panel.marks) + extra_marks if m.box is not None]
        marks = [(atom, box) for atom, box in marks if box[2] >= x0 and box[0] <= x1 and box[3] >= y0 and box[1] <= y1]
        self.marks = [box for _, box in marks]
        self.mark_owner = [atom for atom, _ in marks]
        pairs = []
        for bond in panel.bonds:
            i, j = bond.atoms
            if i > j:
                i, j = j, i
            a, b = positions[i], positions[j]
            # The bond's box meets the reach: one end or the other on the inner side of each edge.
            if ((a.real >= x0 or b.real >= x0) and (a.real <= x1 or b.real <= x1)
                    and (a.imag >= y0 or b.imag >= y0) and (a.imag <= y1 or b.imag <= y1)):
                pairs.append((i, j))
        self.bond_ends = pairs                                          # lower atom index first
        self.bond_index = {pair: k for k, pair in enumerate(pairs)}
        self.bond_a = [positions[i] for i, _ in pairs]
        self.bond_b = [positions[j] for _, j in pairs]
        # The strokes of a double or triple bond off its centre line (an arrow can run between
        # the centre line and the second stroke of a one-sided double): each of its own bond.
        self.stroke_of, self.stroke_a, self.stroke_b = [], [], []
        for k, pair in enumerate(pairs):
            lean = panel.bond_lean.get(pair)
            offsets = (lean,) if lean else ()
            if not lean and panel.bond_extent.get(pair, 0.0) > 0.0:
                a, b = positions[pair[0]], positions[pair[1]]
                side = (b - a) / (abs(b - a) or 1.0) * 1j * panel.bond_extent[pair]
                offsets = (side, -side)
            for off in offsets:
                self.stroke_of.append(k)
                self.stroke_a.append(positions[pair[0]] + off)
                self.stroke_b.append(positions[pair[1]] + off)


_NO_BOX = (math.inf, math.inf, -math.inf, -math.inf)   # padding: contains no point
_NOWHERE = complex(math.inf, math.inf)                 # padding: near nothing


def _padded(rows: list[list], filler, dtype=float) -> np.ndarray:
    """Rows of unequal length as one array, each row filled up with `filler`; the fillers are
    chosen so that they never count (an empty box, a point at infinity, a bond of no length).
    Read from one flat iterator of known length: numpy reads that faster than nested lists."""
    width = max(map(len, rows))
    # (chained in C: a Python loop over every item would cost more than numpy's reading of them)
    flat = chain.from_iterable([chain(row, repeat(filler, width - len(row))) for row in rows])
    if isinstance(filler, tuple):   # items are tuples of numbers: one more axis
        depth = len(filler)
        return np.fromiter(chain.from_iterable(flat), dtype, len(rows) * width * depth).reshape(len(rows), width, depth)
    return np.fromiter(flat, dtype, len(rows) * width).reshape(len(rows), width)


@dataclass
class _PanelArrows:
    """One panel's arrows between the stages of planning."""

    step: int
    moves: list[ResolvedMove]
    panel: PanelStructure
    marks: list[Mark]                  # the dots the arrows start from
    sources: list[_Anchor]
    sinks: list[_Anchor]
    tries: list[list[_Candidate]]      # every candidate curve of each arrow
    rows: Optional[slice] = None       # the rows of its candidates in the scheme's sample array
    obstacles: Optional[_Obstacles] = None
    # Charge signs moved out of the way of turned half-loops: (arrow, its candidates that ran over
    # the sign, the sign as it stood, its atom's occupied directions as they were), put back if the
    # arrow is drawn otherwise.
    sign_moves: list = field(default_factory=list)


class ArrowPlanner:
    """Plans the curved arrows of a scheme: for each panel, those of the step that leaves it."""

    def __init__(self, style: Style, dot_radius: float):
        self.style = style
        self.bl = style.bond_length
        self.fs = style.font_size
        self.dot_radius = dot_radius
        self.head_length = max(0.26 * self.bl, 4.5 * style.line_width)
        self.head_width = 0.78 * self.head_length

    def plan(self, panels: list[tuple[int, list[ResolvedMove], ElectronState, PanelStructure]]
             ) -> list[tuple[list[CurvedArrow], list[Mark]]]:
        """The curved arrows of every panel of a scheme (its step, moves, state and structure)
        and the dots they start from. The panels' candidates are sampled and scored in one
        batch: numpy's cost there is per call, and a panel holds only a dozen curves."""
        work = [self._try(step, moves, state, panel) for step, moves, state, panel in panels if moves]
        if not work:
            return [([], []) for _ in panels]
        candidates, controls, points, extent = self._sampled_and_scored(work)
        # An arrow to a proton whose cheapest arc crosses a bond not its own also tries wider
        # arcs, which may go round the obstacle (common practice: round the structure, not
        # across it). Only to a proton: the side an arrow comes into another atom from reads as
        # the side it is attacked from (a nucleophile's backside approach).
        widened = False
        for w in work:
            for k, (move, src, snk) in enumerate(zip(w.moves, w.sources, w.sinks)):
                if (snk.kind == "atom" and w.panel.atoms[snk.atoms[0]].element == "H"
                        and min(w.tries[k], key=_COST).crossings):
                    w.tries[k] = w.tries[k] + self._wide_arcs(src, snk, w.panel)
                    widened = True
        widened = self._turn_short_hooks(work) or widened
        if widened:
            candidates, controls, points, extent = self._sampled_and_scored(work)
            # A wide arc is kept only where it crosses none: elsewhere the usual arcs read better.
            reach = _WIDE_REACH * self.bl
            for w in work:
                w.tries = [[c for c in tries if not c.wide or (not c.crossings and c.length <= reach)]
                           for tries in w.tries]
        kept = [[sorted(tries, key=_COST)[:_KEEP] for tries in w.tries] for w in work]
        pair_costs = self._pair_costs(kept, controls, points, extent)
        for w, options, pairs in zip(work, kept, pair_costs):
            _split_bond_sides(w, options, pairs)
        chosen = [self._choose(options, pairs) for options, pairs in zip(kept, pair_costs)]
        for w, cands in zip(work, chosen):
            _put_back_signs(w, cands)
        chosen = [self._off_signs(w, cands, options, points) for w, cands, options in zip(work, chosen, kept)]
        # A short arrow gets a smaller head, so the head never swallows the curve; where the
        # shaft's end falls on each curve (under the head) is found for all arrows at once.
        curves = [c for cands in chosen for c in cands]
        heads = [min(self.head_length, max(0.32 * c.length, 0.6 * self.head_length)) for c in curves]
        at = _parameters_at_distances(controls.take([c.row for c in curves], axis=0),
                                      np.array([0.65 * h for h in heads]))
        ends = iter(zip(heads, at))
        done = iter(zip(work, chosen))
        out = []
        for _, moves, _, _ in panels:
            if not moves:
                out.append(([], []))
                continue
            w, cands = next(done)
            out.append(([self._arrow(w.step, move, src, snk, cand, w.panel, *next(ends))
                         for move, src, snk, cand in zip(w.moves, w.sources, w.sinks, cands)], w.marks))
        return out

    def _sampled_and_scored(self, work: list[_PanelArrows]
                            ) -> tuple[list[_Candidate], np.ndarray, np.ndarray, _Extent]:
        """Every candidate of every panel sampled (one row each) and scored, with each panel's
        obstacles gathered within the reach of its candidates."""
        candidates = [c for w in work for tries in w.tries for c in tries]
        controls = np.array([[c.p0, c.p1, c.p2, c.tip] for c in candidates], dtype=complex)
        points = controls @ _BERNSTEIN
        for row, c in enumerate(candidates):
            c.row = row
        extent = _Extent(points)
        x0, y0, x1, y1 = (column.ravel().tolist() for column in (extent.x0, extent.y0, extent.x1, extent.y1))
        reach = 1.3 * self.bl     # the crowding term looks this far from a curve
        start = 0
        for w in work:
            end = start + sum(len(tries) for tries in w.tries)
            w.rows = slice(start, end)
            w.obstacles = _Obstacles(w.panel, w.marks, self.bl, min(x0[start:end]) - reach,
                                     min(y0[start:end]) - reach, max(x1[start:end]) + reach,
                                     max(y1[start:end]) + reach)
            start = end
        self._score(work, candidates, controls, points, extent)
        return candidates, controls, points, extent

    def _try(self, step: int, moves: list[ResolvedMove], state: ElectronState, panel: PanelStructure) -> _PanelArrows:
        """One panel's anchors (placing the dots the arrows leave from) and candidate curves."""
        marks: list[Mark] = []
        sinks = [self._sink(move, state, panel) for move in moves]
        self._separate_shared_sinks(moves, sinks, panel)
        self._separate_crowded_heads(sinks)
        # Where other arrows of the step leave a bond: dots beside a bond keep off that side.
        tails = [(panel.positions[m.source_atoms[0]] + panel.positions[m.source_atoms[1]]) / 2
                 for m in moves if m.source_kind == "bond"]
        sources = [self._source(move, panel, sink, marks, tails, [s for s in sinks if s is not sink])
                   for move, sink in zip(moves, sinks)]
        tries = []
        for move, src, snk in zip(moves, sources, sinks):
            hooks = self._hooks(move, src, snk, panel)
            # A fishhook from a bond to its own atom never sets off backwards: that reads as an S.
            # Nor back along the bond, away from that atom (a wide label such as Sn leaves the
            # head near the bond's middle, where an arc forward along the chord can do so).
            arcs = self._candidates(src, snk, panel, forward_only=bool(hooks))
            if hooks:
                along = panel.positions[snk.atoms[0]] - src.point
                arcs = [c for c in arcs if ((c.p1 - c.p0) * along.conjugate()).real >= 0]
            if hooks and move.electrons == 2:
                # A pair from a bond to its own atom: an arc over that short span reads as a tick;
                # it is drawn only where the half-loops are blocked.
                for arc in arcs:
                    arc.handicap = _TICK
            tries.append(arcs + hooks)
        return _PanelArrows(step, moves, panel, marks, sources, sinks, tries)

    # anchors
    def _source(self, move: ResolvedMove, panel: PanelStructure, sink: _Anchor, marks: list[Mark],
                tails: list[complex] = (), others: list[_Anchor] = ()) -> _Anchor:
        if move.source_kind == "bond":
            a, b = move.source_atoms
            mid = (panel.positions[a] + panel.positions[b]) / 2
            extent = panel.bond_extent.get((min(a, b), max(a, b)), 0.0)
            return _Anchor("bond", mid, (a, b), extent=extent, axis=unit(panel.positions[b] - panel.positions[a]))
        atom = move.source_atoms[0]
        centre = panel.positions[atom]
        # Dots sit on a side or a corner of the label, facing where the arrow goes; for a pair
        # that goes into a bond of the same atom they sit in a free gap well round from that
        # bond, so the arrow over to its middle is long enough to read as a curve.
        toward = unit(sink.point - centre)
        if atom in sink.atoms and sink.kind in ("bond", "gap"):
            near = [unit(t - centre) for t in tails if abs(t - centre) < _TAIL_REACH * self.bl]
            # A label close by (a hydrogen on the next atom) leaves no room for the arc either; nor
            # does any atom of the molecule close by (the other groups of a crowded tetrahedral
            # centre). (Another molecule's atoms wait there for arrows of their own.)
            kin = _within_three_bonds(atom, panel.bond_extent)

            def steering(i: int) -> float:   # how near atom i stands before it steers the dots away
                return _CROWDING_REACH if i in kin else _TAIL_REACH if panel.atoms[i].box is not None else 0.0
            labels = [unit(p - centre) for i, p in panel.positions.items() if i != atom and i in panel.atoms
                      and 1e-9 < abs(p - centre) < steering(i) * self.bl]
            occupied = list(panel.occupied[atom])
            # Another arrow's head into a new bond of this atom, nearer it than the bond's middle
            # (a group shifting onto this atom), sets the dots on the other side of the bond, so
            # the two arrows come in from either side.
            landing = [unit(s.point - centre) for s in others
                       if s.kind == "gap" and atom in s.atoms and abs(s.point - centre) < abs(sink.point - centre)]
            sign = next((m for m in panel.marks if m.kind == "charge" and m.atom == atom and m.box is not None), None)
            if sign is not None and (panel.atoms[atom].box is None or landing) and occupied:
                # Beside a skeletal vertex the sign was set before the arrows: the dots may take
                # its gap (the arc over to the bond needs the widest), and the sign moves on
                # (_clear_marks) if it finds a place clear of the bonds. So too beside a label
                # where that gap is the one left on the far side of the bond from another head.
                middle = complex((sign.box.x0 + sign.box.x1) / 2, (sign.box.y0 + sign.box.y1) / 2)
                occupied.remove(min(occupied, key=lambda d: abs(d - unit(middle - centre))))
            ranked = _beside_bond(occupied + labels, toward, near, landing)
        else:
            steps = 8 if panel.atoms[atom].box is not None else 24
            ranked = ranked_directions(panel.occupied[atom], toward, spread=0.35, steps=steps)
        # Never inside the atom's own ring (a ring carbene's pair going into its new C=C, a
        # cyclohexyl radical's electron reaching for a tin hydride's H beyond the ring), where
        # they read as the ring's: the arrow curves round from outside.
        inside = _inside_own_ring(panel, atom)
        ranked = (d for d in ranked if not inside(d))
        if move.source_kind == "unpaired":
            # The structure's radical dot moves to face the arrow.
            panel.marks[:] = [m for m in panel.marks if not (m.kind == "radical" and m.atom == atom)]
        # The dots keep clear of the atom's charge sign and other marks (a sign crowded by dots
        # reads as a smudge): the sign moves round the label if it can, else the dots move on to
        # the best direction whose dots touch no mark.
        pad = _MARK_GAP * self.fs
        placed = (self._dots(move, panel, atom, d) for d in ranked)
        first = next(placed)
        if self._clear_marks(panel, marks, atom, pad, [first[0]], first[3]):
            direction, spot, dots, box = first
        else:
            beside = [m.box for m in panel.marks + marks if m.atom == atom and m.box is not None]
            direction, spot, dots, box = next((p for p in chain([first], placed)
                                               if not any(b.overlaps(p[3], pad) for b in beside)), first)
        panel.occupied[atom].append(direction)
        kind = "radical" if move.source_kind == "unpaired" else "lone_pair"
        marks.append(Mark(kind, atom, dots=tuple((d.real, d.imag) for d in dots),
                          radius=self.dot_radius, box=box))
        return _Anchor("dots", spot, (atom,), outward=direction)

    def _off_signs(self, w: _PanelArrows, chosen: list[_Candidate], options: list[list[_Candidate]],
                   points: np.ndarray) -> list[_Candidate]:
        """The panel's charge signs moved off its chosen arrows (_clear_paths); an arrow still over
        one, which found no clear place (an ylide carbon's minus between its three bonds and the
        pair that leaves it), takes the cheapest of its kept options that keeps clear of every
        sign, else of the one that runs over none: an arrow over a minus reads as a different sign
        (common practice)."""
        self._clear_paths(w, chosen, points)
        signs = [m.box for m in w.panel.marks if m.kind == "charge" and m.box is not None]

        def over_sign(candidate: _Candidate, pad: float = 0.0) -> bool:
            path = points[candidate.row].tolist()
            return any(_on_path(box, path, pad) for box in signs)
        out = []
        for c, tries in zip(chosen, options):
            if over_sign(c):
                ranked = sorted(tries, key=_COST)
                c = next((o for o in ranked if not over_sign(o, _MARK_GAP * self.fs)),
                         next((o for o in ranked if not over_sign(o)), c))
            out.append(c)
        return out

    def _clear_paths(self, w: _PanelArrows, chosen: list[_Candidate], points: np.ndarray) -> None:
        """An arrow that runs over a labelled atom's charge sign (the sign was set before the
        arrows were drawn) moves the sign off every arrow of the panel: the sign of the atom whose
        dots it leaves, or of an atom it passes (the azide's N- under the arrow of the N-N bond
        that leaves)."""
        pad = _MARK_GAP * self.fs
        paths = None
        for src, c in zip(w.sources, chosen):
            path = points[c.row].tolist()
            # The panel's signs as they stand now: a sign moved for one arrow is looked at anew.
            # Its own atom's sign keeps a gap from the arrow; another atom's is moved only if the
            # arrow runs over it.
            for atom, box in [(m.atom, m.box) for m in w.panel.marks if m.kind == "charge" and m.box is not None]:
                own = src.kind == "dots" and atom == src.atoms[0]
                if _on_path(box, path, pad if own else 0.0):
                    if paths is None:
                        paths = [point for other in chosen for point in points[other.row].tolist()]
                    self._clear_marks(w.panel, w.marks, atom, pad, [], None, path, paths)

    def _clear_marks(self, panel: PanelStructure, marks: list[Mark], atom: int, pad: float, taken: list[complex],
                     dots: Optional[Box], path: list[complex] = (), paths: list[complex] = ()) -> bool:
        """Whether the atom's charge sign is clear of `dots` (the dots an arrow leaves from, set
        along the directions `taken` round the atom) and of the points of `path` (an arrow's
        shaft), moving it where it is not: a little further out along its line, or round the
        label to the nearest side clear of the dots, the bonds, other labels and every point of
        `paths` (beside a skeletal vertex, round the vertex clear of its bond lines)."""
        mine = [m for m in chain(panel.marks, marks) if m.atom == atom and m.box is not None]
        crowding = [m for m in mine if (dots is not None and m.box.overlaps(dots, pad))
                    or (m.kind == "charge" and _on_path(m.box, path, pad))]
        if not crowding:
            return True
        if any(m.kind != "charge" for m in crowding):
            return False
        sign, = crowding
        centre = panel.positions[atom]
        middle = complex((sign.box.x0 + sign.box.x1) / 2, (sign.box.y0 + sign.box.y1) / 2)
        occupied = list(panel.occupied[atom])
        occupied.remove(min(occupied, key=lambda d: abs(d - unit(middle - centre))))
        half = max(sign.box.width, sign.box.height) / 2
        others = [m.box for m in mine if m is not sign] + ([dots] if dots is not None else []) + [
            a.box for i, a in panel.atoms.items() if i != atom and a.box is not None]
        bonds = [(complex(*p), complex(*q)) for bond in panel.bonds for p, q in bond.lines]
        was = unit(middle - centre)
        # First a little further out along its line (a superscript stays a superscript); then the
        # nearest free side to where it was.
        outward = 1.0 if middle.real >= centre.real else -1.0
        tries = [(complex(outward * step * 0.05 * self.fs, 0.0), was) for step in range(1, 7)]
        free = [d for d in sorted(_AROUND, key=lambda d: abs(cmath.phase(d / was)))
                if clearance(d, occupied + taken) >= _SIGN_ROOM]
        # Close to the label first; then, where that touches the bonds either side (a narrow gap
        # at a skeletal vertex), a little further out in the same gaps; inside the atom's ring last
        # (a sign there reads as the ring's). Each well clear of other atoms' labels (a sign beside
        # one reads as its); failing all of those, the near places as before, beside a label or not.
        inside = _inside_own_ring(panel, atom)
        near = tries + [(centre + d * (panel.label_reach(atom, d) + half + 0.08 * self.fs) - middle, d) for d in free]
        wider = [(centre + d * (panel.label_reach(atom, d) + half + out * self.fs) - middle, d)
                 for within in (False, True) for out in (0.08, 0.3, 0.5) for d in free if inside(d) == within]
        labels = [a.box for i, a in panel.atoms.items() if i != atom and a.box is not None]
        size = sign.runs[0].size if sign.runs else self.fs
        # Its own label's hydrogens written above or below the symbol: a sign just beside them
        # reads as theirs ("H+" under an ammonium N, a proton), as structure.py keeps it from.
        symbol, rest = panel.label_parts.get(atom, (None, ()))
        hydrogens = [b for b in rest if not (b.y0 < symbol.y1 and symbol.y0 < b.y1)]
        minus = bool(sign.runs) and sign.runs[-1].text.endswith(MINUS)
        # Beside a skeletal vertex, not toward another molecule where it can (it would read as a
        # "+" between them), before anywhere else.
        elsewhere = other_molecules(panel, atom) if panel.atoms[atom].box is None else []
        passes = [(tries + wider, True, True)] * bool(elsewhere) + [(tries + wider, True, False), (near, False, False)]
        for candidates, apart, facing_away in passes:
            for shift, d in candidates:
                box = sign.box.shifted(shift.real, shift.imag)
                grown = Box(box.x0 - pad, box.y0 - pad, box.x1 + pad, box.y1 + pad)
                if (any(box.overlaps(b, pad) for b in others) or any(segment_hits_box(p, q, grown) for p, q in bonds)
                        or _on_path(box, paths, pad)
                        or (minus and minus_along_stroke(box.x0, box.width, (box.y0 + box.y1) / 2, bonds, self.bl))
                        or level_and_close(box, hydrogens, size, apart=0.6)):
                    continue
                if apart and (level_and_close(box, labels, size) or any(box.overlaps(b, 0.3 * size) for b in labels)
                              or (facing_away and points_at_another(box, centre, elsewhere, self.bl))):
                    continue
                moved = Mark(sign.kind, atom, tuple(replace(r, x=r.x + shift.real, y=r.y + shift.imag) for r in sign.runs),
                             box=box, colour=sign.colour)
                panel.marks[panel.marks.index(sign)] = moved
                panel.occupied[atom] = occupied + [d]
                return True
        return False

    def _dots(self, move: ResolvedMove, panel: PanelStructure, atom: int, direction: complex
              ) -> tuple[complex, complex, tuple[complex, ...], Box]:
        """The direction, centre, dots and box of the electrons an arrow leaves from, set beside
        the atom along `direction`: one dot for an unpaired electron, two across it for a pair."""
        r = self.dot_radius
        reach = panel.label_reach(atom, direction) or 0.12 * self.bl
        spot = panel.positions[atom] + direction * (reach + r + 0.14 * self.fs)
        if move.source_kind == "unpaired":
            dots = (spot,)
        else:
            across = direction * 1j * (0.16 * self.fs)
            dots = (spot + across, spot - across)
        box = Box(min(d.real for d in dots) - r, min(d.imag for d in dots) - r,
                  max(d.real for d in dots) + r, max(d.imag for d in dots) + r)
        return direction, spot, dots, box

    def _sink(self, move: ResolvedMove, state: ElectronState, panel: PanelStructure) -> _Anchor:
        pos = panel.positions
        if len(move.sink_atoms) == 1:
            y = move.sink_atoms[0]
            return _Anchor("atom", pos[y], (y,))
        x, y = move.sink_atoms
        bonded = state.mol.GetBondBetweenAtoms(x, y) is not None
        if not bonded and move.source_kind in ("lone_pair", "unpaired"):
            return _Anchor("atom", pos[y], (y,))
        mid = (pos[x] + pos[y]) / 2
        axis = unit(pos[y] - pos[x])
        if bonded:
            # A double bond drawn to one side is aimed at the middle of its two strokes, so a head
            # arriving from the bare side does not stand off as far as the second stroke.
            key = (min(x, y), max(x, y))
            lean = panel.bond_lean.get(key, 0j)
            return _Anchor("bond", mid + lean / 2, (x, y), extent=panel.bond_extent.get(key, 0.0) - abs(lean) / 2,
                           axis=axis)
        reached = [a for a in (x, y) if a not in move.source_atoms]
        pivot = None
        if len(reached) == 1:
            far = reached[0]
            near = y if far == x else x
            reach = min(abs(pos[near] - pos[far]) / 2, _GAP_REACH * self.bl)
            left = [a for a in move.source_atoms if a != near]
            if (move.source_kind == "bond" and near in move.source_atoms and len(left) == 1
                    and state.mol.GetBondBetweenAtoms(far, left[0]) is not None):
                # A 1,2-shift: the group leaves the pivot for the pivot's neighbour, the cationic
                # centre; the head points at that atom (short of its label), so the arrow reads
                # as the whole move.
                label = panel.label_reach(far, unit(pos[near] - pos[far]))
                pivot, reach = left[0], label + 0.12 * self.fs if label else _SHIFT_REACH * self.bl
            mid = pos[far] + unit(pos[near] - pos[far]) * reach
        return _Anchor("gap", mid, (x, y), axis=axis, pivot=pivot)

    def _separate_shared_sinks(self, moves: list[ResolvedMove], sinks: list[_Anchor], panel: PanelStructure) -> None:
        """Arrows ending at one bond midpoint: each stops on the side of the atom its electrons
        come from, so the heads never coincide. Arrows ending at one atom (an electron handed
        over beside a fishhook from its own bond): each but a half-loop from the atom's own bond
        stops on the side it comes from."""
        groups: dict[tuple, list[int]] = {}
        for k, sink in enumerate(sinks):
            if sink.kind in ("gap", "bond") or (sink.kind == "atom" and len(moves[k].sink_atoms) == 1):
                groups.setdefault((sink.kind, tuple(sorted(sink.atoms))), []).append(k)
        pos = panel.positions
        for (kind, ends), members in groups.items():
            if len(members) < 2:
                continue
            towards = {}
            if kind != "atom":
                # Each toward the end nearer the electrons it brings; two that come from one atom
                # (a lone pair and a bond of the azide N4 of a Staudinger reaction, both into
                # N3#N4) take one end each, in their order along the bond.
                def source(k: int) -> complex:
                    return sum(pos[a] for a in moves[k].source_atoms) / len(moves[k].source_atoms)
                towards = {k: min(ends, key=lambda e: abs(pos[e] - source(k))) for k in members}
                if len(members) == 2 and len(set(towards.values())) == 1:
                    axis = pos[ends[1]] - pos[ends[0]]
                    first, second = sorted(members, key=lambda k: ((source(k) - pos[ends[0]]) / axis).real)
                    towards = {first: ends[0], second: ends[1]}
            for k in members:
                sink = sinks[k]
                if kind == "atom":
                    if to_own_atom(moves[k]):
                        continue   # a half-loop onto its own atom keeps its shape; the other gives way
                    along = unit(pos[moves[k].source_atoms[0]] - sink.point)
                else:
                    along = unit(pos[towards[k]] - sink.point)
                sink.point = sink.point + along * 0.16 * self.bl

    def _separate_crowded_heads(self, sinks: list[_Anchor]) -> None:
        """A head into a bond that would stop within _HEAD_ROOM of where another arrow of the
        step ends in a new bond to one of the bond's atoms (a group shifting onto the nitrogen
        whose own pair goes into the bond beside it: the Hofmann, Curtius, Schmidt) stops further
        along the bond, away from that head, so the two read as two places."""
        room = _HEAD_ROOM * self.bl
        for sink in sinks:
            if sink.kind != "bond":
                continue
            crowd = [s.point for s in sinks if s.kind == "gap" and set(s.atoms) & set(sink.atoms)
                     and abs(s.point - sink.point) < room]
            if not crowd:
                continue
            away = sum(((sink.point - p) * sink.axis.conjugate()).real for p in crowd)
            along = sink.axis if away >= 0 else -sink.axis
            # How far along the bond each crowding head is left _HEAD_ROOM behind (a root of
            # |v + t * along| = room, v from that head to the sink), at most _SINK_SLIDE.
            slide = 0.0
            for p in crowd:
                ahead = ((sink.point - p) * along.conjugate()).real
                slide = max(slide, -ahead + math.sqrt(ahead * ahead - abs(sink.point - p) ** 2 + room * room))
            sink.point = sink.point + along * min(slide, _SINK_SLIDE * self.bl)

    # candidate curves
    def _candidates(self, src: _Anchor, snk: _Anchor, panel: PanelStructure, forward_only: bool = False
                    ) -> list[_Candidate]:
        """Near-circular arcs from source to sink, bending to either side by a few angles; with
        `forward_only`, none that leaves at more than a right angle to the chord."""
        chord = abs(snk.point - src.point)
        angles = _SHORT_ANGLES if chord < 0.9 * self.bl else _ANGLES
        if forward_only:
            angles = tuple(theta for theta in angles if theta < math.pi / 2)
        return [self._arc(src, snk, side, theta, panel) for side in (1, -1) for theta in angles]

    def _wide_arcs(self, src: _Anchor, snk: _Anchor, panel: PanelStructure) -> list[_Candidate]:
        """Arcs bending further than _candidates' to either side (_WIDE_ANGLES)."""
        return [replace(self._arc(src, snk, side, theta, panel), wide=True)
                for side in (1, -1) for theta in _WIDE_ANGLES]

    def _turn_short_hooks(self, work: list[_PanelArrows]) -> bool:
        """Whether any arrow from a bond to its own atom whose cheapest candidate is shorter
        than LEGIBLE_HOOK (a tick: its half-loops run into a neighbour's label by the bond's
        middle, as the O of P=O beside the P-Cl of POCl3) was given turned half-loops to try."""
        turned = False
        for w in work:
            for k, (move, src, snk) in enumerate(zip(w.moves, w.sources, w.sinks)):
                if to_own_atom(move) and min(w.tries[k], key=_COST).length < LEGIBLE_HOOK * self.bl:
                    hooks = self._hooks(move, src, snk, w.panel, _HOOK_TURNS)
                    w.tries[k] = w.tries[k] + hooks
                    self._free_sign_for_hooks(w, k, snk.atoms[0], hooks)
                    turned = True
        return turned

    def _free_sign_for_hooks(self, w: _PanelArrows, k: int, atom: int, hooks: list[_Candidate]) -> None:
        """Where the atom's own charge sign lies on every turned half-loop of arrow k (the + over
        the N-H of an aziridinium whose H, written under the N, takes the other side), the sign
        moves round the label clear of them, shaft and head (_clear_marks: beside the label, off
        the bonds and other labels), so they are weighed against the tick without it; it goes
        back (_put_back_signs) if the arrow is drawn otherwise."""
        sign = next((m for m in w.panel.marks if m.kind == "charge" and m.atom == atom and m.box is not None), None)
        if sign is None or not hooks:
            return
        pad = _MARK_GAP * self.fs
        outlines = [self._outline_points(c) for c in hooks]
        if not all(_on_path(sign.box, points, pad) for points in outlines):
            return
        # (the arrow's other candidates that ran over it may be drawn with it moved too)
        freed = [c for c in w.tries[k] if _on_path(sign.box, self._outline_points(c), pad)]
        occupied = list(w.panel.occupied[atom])
        points = [p for points in outlines for p in points]
        if self._clear_marks(w.panel, w.marks, atom, pad, [], None, points, points):
            # Not into the atom's ring, where the sign reads as the ring's (the morpholinium N+
            # of a Gewald reaction's first steps): the tick is left there.
            if _inside_own_ring(w.panel, atom)(w.panel.occupied[atom][-1]):
                _put_sign_back(w.panel, sign, occupied)
            else:
                w.sign_moves.append((k, freed, sign, occupied))

    def _outline_points(self, c: _Candidate) -> list[complex]:
        """Points along a candidate's shaft and at its head's barbs (as _arrow draws them at
        full size)."""
        shaft = (np.array([c.p0, c.p1, c.p2, c.tip]) @ _BERNSTEIN).tolist()
        arrive = unit(c.tip - c.p2)
        back = c.tip - arrive * self.head_length
        return shaft + [back + arrive * 1j * s * self.head_width / 2 for s in (1, -1)]

    def _hooks(self, move: ResolvedMove, src: _Anchor, snk: _Anchor, panel: PanelStructure,
               turns: tuple[float, ...] = ()) -> list[_Candidate]:
        """Electrons leaving a bond for one of its own ends (a heterolysis, or one half of a
        homolysis): a C-shaped arc on either side of the bond, out from its middle and back in to
        the atom from the side, so the arrow reads as a curve and not as a tick on the short span
        between the bond's middle and the label (common practice: C=O to O drawn as a half-loop;
        one fishhook to each atom, on either side of the bond). With `turns`, only half-loops that
        leave the bond turned by those angles toward the atom, so they bulge out beside it."""
        if not to_own_atom(move):
            return []
        out = []
        atom = snk.atoms[0]
        other, = (a for a in src.atoms if a != atom)
        # Between two labels (H-OMe) the bond's stroke is short: a hook of the usual depth under
        # it reads as a tick, a deeper one as a half-loop.
        between_labels = all(panel.atoms[a].box is not None for a in src.atoms)
        h = (_LABELLED_HOOK if between_labels else 0.4) * self.bl
        # The head's base is kept off the rest of the label too, but not between two labels: the
        # stroke there is so short that a head turned that far closes the hook up (H2O+-H: its tip
        # 0.25 bond lengths from its tail, against 0.41-0.48 unturned)
        base = 0j if between_labels else _HEAD_BASE * self.head_length
        along = unit(panel.positions[other] - panel.positions[atom])   # from the atom down its bond
        others = [(complex(*p), complex(*q)) for bond in panel.bonds if set(bond.atoms) != set(src.atoms)
                  for p, q in bond.lines] if turns else []
        for normal in (src.axis * 1j, src.axis * -1j):
            p0 = src.point + normal * (src.extent + 0.05 * self.bl)
            # (turned toward the bond, the side the hook comes from, if the label's hydrogens are in
            # the way of its head, which comes in from `normal`)
            side, reach = panel.arrival(atom, normal, 0.12 * self.fs, turn_toward=along, head=normal * base)
            tip = snk.point + side * (reach + 0.12 * self.fs if reach else 0.2 * self.bl)
            # A head turned toward the bond stops nearer the tail: a hook of the usual depth there
            # is a tick (the water leaving HO+ in a Fischer esterification, 0.75 bond lengths).
            depth = h if side == normal else max(h, _LABELLED_HOOK * self.bl)
            if turns:
                # None whose head's base stands nearer the rest of the label than its symbol (the
                # head of one coming up under NH+ to the N lies on the H), nor one across another
                # bond: a tick reads better than either.
                if not _nearer_the_rest(panel, atom, tip + side * _HEAD_BASE * self.head_length):
                    toward = 1 if (normal / along).imag > 0 else -1   # the turn that brings `normal` round to the atom
                    out += [c for c in (_Candidate(p0, p0 + normal * cmath.rect(_TURNED_DEPTH * self.bl, toward * turn),
                                                   tip + side * _TURNED_DEPTH * self.bl, tip) for turn in turns)
                            if not _curve_crosses(c, others)]
                continue
            plain = _Candidate(p0, p0 + normal * depth, tip + normal * depth, tip)
            out.append(plain)
            # Between the bond and a neighbour's bond less than a right angle round (a C-H between
            # two methyls) that hook crosses the neighbour's bond. This one stays in the angle: it
            # sets off lower down the bond, bulges into the open part of the angle and comes up
            # to the atom through the middle of the angle. In a wider angle (an O-H beside a C=O,
            # 120 degrees) it is offered only where the plain hook reaches over the neighbour's
            # bond: where that crosses nothing it reads better (inside a ring this one is a V).
            side = 1 if (normal / along).imag > 0 else -1
            room, neighbour = min([(t, d) for t, d in ((side * cmath.phase(d / along), d)
                                                       for d in panel.bond_directions[atom]) if t > 1e-6]
                                  + [(math.pi, 0j)], key=lambda pair: pair[0])
            if room < math.pi / 2 or (room < _WIDE_ANGLE and self._reaches_over(plain, atom, neighbour, panel)):
                arrive = along * cmath.rect(1.0, side * room / 2)
                reach = panel.arrival_reach(atom, arrive, 0.12 * self.fs)
                tip = snk.point + arrive * (reach + 0.12 * self.fs if reach else 0.2 * self.bl)
                # (down the bond, but within a quarter bond length of its middle, as a tail must be)
                off = src.extent + 0.05 * self.bl
                start = p0 + along * min(0.2 * self.bl, math.sqrt(max(0.0, (0.24 * self.bl) ** 2 - off ** 2)))
                out.append(_Candidate(start, start + normal * 0.55 * self.bl,
                                      tip + (normal * 0.3 + along * 0.25) * self.bl, tip))
        for hook in out:
            if _nearer_the_rest(panel, atom, hook.tip):
                hook.handicap += _OFF_SYMBOL
        return out

    def _reaches_over(self, c: _Candidate, atom: int, direction: complex, panel: PanelStructure) -> bool:
        """Whether the curve crosses a stroke of the atom's bond going off in `direction` (a
        double bond's second stroke included: its strokes lie within the bond's extent)."""
        centre = panel.positions[atom]
        for (i, j), extent in panel.bond_extent.items():
            if atom in (i, j):
                far = panel.positions[j if i == atom else i]
                if abs(unit(far - centre) - direction) < 1e-6:
                    side = direction * 1j * extent
                    return _curve_crosses(c, [(centre + off, far + off) for off in (0j, side, -side)])
        return False

    def _arc(self, src: _Anchor, snk: _Anchor, side: int, theta: float, panel: PanelStructure) -> _Candidate:
        """Leaves at theta to the chord on one side and arrives at theta on the same side, so
        the curve is close to a circular arc; the ends are refitted twice as the chord moves.
        (The ends and _unit written out here, with what they read of the anchors looked up once:
        a figure refits a few thousand of them.)"""
        turn = cmath.rect(1.0, -side * theta)
        start, end = src.point, snk.point
        p0, tip = start, end
        from_dots, outward = src.kind == "dots", src.outward
        to_atom, to_bond = snk.kind == "atom", snk.kind == "bond"
        # What the refits read of the anchors and the style, worked out once for both.
        tail_n, head_n = src.axis * 1j, snk.axis * 1j   # the bonds' unit normals
        tail_off = self.dot_radius + 0.12 * self.fs if from_dots else src.extent + 0.05 * self.bl
        head_off = snk.extent + 0.08 * self.bl
        label_gap, bare_gap = 0.12 * self.fs, 0.2 * self.bl
        if to_atom:
            atom = snk.atoms[0]
            arrival = panel.arrival_reach
        for _ in range(2):
            chord = tip - p0
            size = abs(chord)
            u = chord / size if size > 1e-12 else 1 + 0j
            leave, arrive = u * turn, u / turn
            # The tail: beside the dots, toward where the arc leaves; or off the source bond on that side.
            if from_dots:
                along = leave + outward
                size = abs(along)
                p0 = start + (along / size if size > 1e-12 else 1 + 0j) * tail_off
            else:   # off the bond, on the side the arrow leaves to
                p0 = start + (tail_n if (leave / tail_n).real >= 0 else -tail_n) * tail_off
            # The tip: short of the sink atom's label, or off the sink bond on the side it comes from.
            if to_atom:
                back = -arrive
                reach = arrival(atom, back, label_gap)
                tip = end + back * (reach + (label_gap if reach else bare_gap))
            elif to_bond:
                tip = end + (head_n if (-arrive / head_n).real >= 0 else -head_n) * head_off
        along = tip - p0
        chord = abs(along)
        u = along / chord if chord > 1e-12 else 1 + 0j   # (_unit, written out)
        leave, arrive = u * turn, u / turn
        # Short hops (a pair moving into the next bond) get a loop big enough to read.
        h = max(_handle(theta) * chord, (0.45 if chord < 0.6 * self.bl else 0.34) * self.bl)
        return _Candidate(p0, p0 + leave * h, tip - arrive * h, tip)

    # penalties
    def _score(self, work: list[_PanelArrows], candidates: list[_Candidate], controls: np.ndarray,
               pts: np.ndarray, extent: _Extent) -> None:
        """Penalties of every candidate of every arrow of every panel, in one batch. `pts` holds
        the candidates' samples, one row each (bounded by `extent`), `controls` their control
        points. Each panel's obstacles are padded to the largest panel's count by fillers that
        never count, so each penalty column means one obstacle of the candidate's own panel (or
        nothing)."""
        bl = self.bl
        moves = [m for w in work for m in w.moves]
        sources = [s for w in work for s in w.sources]
        sinks = [s for w in work for s in w.sinks]
        sizes = [len(tries) for w in work for tries in w.tries]
        owner = np.arange(len(sizes)).repeat(sizes)                        # each candidate's arrow
        panel_of = np.arange(len(work)).repeat([len(w.moves) for w in work])   # each arrow's panel
        where = panel_of.take(owner)                                       # each candidate's panel
        arrow = np.arange(len(moves))[:, None]
        obs = [w.obstacles for w in work]
        arrow_obs = [w.obstacles for w in work for _ in w.moves]   # each arrow's panel's (a list: read one by one)
        p0, tip = pts[:, :1], pts[:, -1:]
        inner = (np.abs(pts - p0) > 0.22 * bl) & (np.abs(pts - tip) > 0.22 * bl)
        # Which atoms each arrow's own move names, as one boolean row per arrow.
        known = max([o.largest_id for o in obs] + [i for m in moves for i in m.source_atoms + m.sink_atoms])
        own = np.zeros((len(moves), known + 1), dtype=bool)
        named = [(k, i) for k, m in enumerate(moves) for i in m.source_atoms + m.sink_atoms]
        own[[k for k, _ in named], [i for _, i in named]] = True
        own_labelled = own[arrow, _padded([o.labelled_ids for o in obs], 0, int).take(panel_of, axis=0)]     # (arrows, labels)
        own_bare = own[arrow, _padded([o.bare_ids for o in obs], 0, int).take(panel_of, axis=0)]             # (arrows, vertices)
        dots_of = np.array([src.atoms[0] if src.kind == "dots" else -1 for src in sources])   # atom indices are >= 0
        mine = _padded([o.mark_owner for o in obs], -2, int).take(panel_of, axis=0) == dots_of[:, None]         # an arrow's own dots
        marks = _padded([o.marks for o in obs], _NO_BOX)
        # Every penalty counted per sample, in one array whose last axis is: label boxes, charge
        # signs and dots, skeletal vertices; then the bonds crossed. numpy's cost here is per call.
        boxes = np.concatenate([_padded([o.label_boxes for o in obs], _NO_BOX), marks], axis=1).take(where, axis=0)
        bare_xy = _padded([o.bare_xy for o in obs], _NOWHERE, complex).take(where, axis=0)
        near = np.where(own_bare, 0.12 * bl, 0.24 * bl).take(owner, axis=0)
        counts = np.concatenate([_inner_samples_in_boxes(pts, inner, extent, boxes),
                                 _inner_samples_near(pts, inner, extent, bare_xy, near)], axis=1)
        ends = _padded([o.bond_ends for o in obs], (0, 0), int).take(panel_of, axis=0)
        own_first, own_second = own[arrow, ends[..., 0]], own[arrow, ends[..., 1]]   # (arrows, bonds): each end named
        crossing = np.where(own_first | own_second, _OWN_CROSSING, _CROSSING)
        for k, anchors in enumerate(zip(sources, sinks)):
            for anchor in anchors:
                if anchor.kind == "bond":   # the bond the arrow starts or ends on is no obstacle
                    bond = arrow_obs[k].bond_index.get(tuple(sorted(anchor.atoms)))
                    if bond is not None:
                        crossing[k, bond] = 0.0
        _weigh_crossings_into_atom(crossing, moves, sinks, arrow_obs)
        weights = np.concatenate([np.where(own_labelled, 40.0, 100.0), np.where(mine, 0.0, 30.0),
                                  np.where(own_bare, 10.0, 30.0), crossing], axis=1)
        # The bonds' centre lines (each panel's padded to the most bonds of any panel) and then
        # the strokes beside them, as the segments' two ends: counted in one batch (whole counts,
        # whatever the columns' order; a padded segment has no length and crosses nothing).
        bonds = max(len(o.bond_ends) for o in obs)
        segment_a = _padded([o.bond_a + [0j] * (bonds - len(o.bond_a)) + o.stroke_a for o in obs],
                            0j, complex).take(where, axis=0)
        segment_b = _padded([o.bond_b + [0j] * (bonds - len(o.bond_b)) + o.stroke_b for o in obs],
                            0j, complex).take(where, axis=0)
        both = _crossing_counts(pts, segment_a, segment_b, extent)
        crossed, strokes = both[:, :bonds], both[:, bonds:]
        if strokes.shape[1]:
            # A bond is crossed once, by whichever of its strokes the curve crosses.
            of = _padded([o.stroke_of for o in obs], 0, int).take(where, axis=0)
            np.maximum.at(crossed, (np.arange(len(pts))[:, None], of), strokes)
        # The bonds each candidate crosses that are not its own (both ends named by its move):
        # whether wider arcs are worth a try.
        foreign = (crossing > 0) & ~(own_first & own_second)
        crossings = np.add.reduce((crossed > 0) & foreign.take(owner, axis=0), axis=1).tolist()
        counts = np.concatenate([counts, crossed], axis=1)
        # Whole counts times whole weights: the sum is exact, whatever the padding and order.
        cost = np.add.reduce(counts * weights.take(owner, axis=0), axis=1)
        # Bulging into the molecule: atoms crowding the middle third of the curve.
        atom_xy = _padded([o.atom_xy for o in obs], _NOWHERE, complex).take(where, axis=0)[:, None, :]
        crowding = np.maximum(1.1 - np.abs(pts[:, _SAMPLES // 3: 2 * _SAMPLES // 3 + 1, None] - atom_xy) / bl, 0)   # (np.clip's work)
        # A sum of fractions depends on its order: each panel sums its own atoms, unpadded and
        # laid out as one block, as if it were scored alone. (The panels' rows follow each other:
        # their sums, joined, line up with the candidates.)
        cost += 3.0 * np.concatenate([
            np.add.reduce(np.ascontiguousarray(crowding[w.rows, :, :len(w.obstacles.atom_xy)]), axis=(1, 2))
            for w in work])
        if marks.shape[1]:
            # The head's barbs spread beyond the shaft: neither may sit on a charge sign or dots.
            arrive = _units(controls[:, 3] - controls[:, 2])[:, None]
            barbs = tip - arrive * self.head_length + arrive * 1j * _BARB_SIDES * self.head_width
            bx, by = barbs.real[:, :, None], barbs.imag[:, :, None]
            at = marks.take(where, axis=0)[:, None]
            hit = (bx >= at[..., 0]) & (bx <= at[..., 2]) & (by >= at[..., 1]) & (by <= at[..., 3])
            cost += 30.0 * np.add.reduce(hit & ~mine.take(owner, axis=0)[:, None, :], axis=(1, 2))
        outward = np.array([src.outward if src.kind == "dots" else 0j for src in sources]).take(owner)
        leave = controls[:, 1] - controls[:, 0]
        leave = leave / np.maximum(np.abs(leave), 1e-9)
        # Leaving the dots back across the atom reads as coming from the wrong place.
        cost += np.where((outward != 0) & ((leave * np.conj(outward)).real < -0.2), 20.0, 0.0)
        steps = pts[:, 1:] - pts[:, :-1]     # np.diff's subtraction, without its wrapper
        sizes = np.abs(steps)
        lengths = np.add.reduce(sizes, axis=1)
        cost += lengths / bl
        # An arrow from a bond to one of its own atoms shorter than _HOOK_LENGTH, or a pair from
        # an atom's dots into a bond of that atom shorter than _PAIR_ARC, reads as a tick rather
        # than an arc (common practice draws a clear half-loop or arc over).
        shortest = np.array([_HOOK_LENGTH if to_own_atom(m) else
                             _PAIR_ARC if src.kind == "dots" and snk.kind == "bond" and src.atoms[0] in snk.atoms else 0.0
                             for m, src, snk in zip(moves, sources, sinks)])
        if shortest.any():
            cost += _SHORT_HOOK * np.maximum(0.0, shortest.take(owner) - lengths / bl)
        # A pair leaving a bond: one clean arc, never a loop.
        from_bond = np.array([src.kind == "bond" for src in sources]).take(owner).nonzero()[0]
        if len(from_bond):
            curl = self._curl(pts.take(from_bond, axis=0), steps.take(from_bond, axis=0),
                              sizes.take(from_bond, axis=0))   # only those rows
            if curl is not None:
                cost[from_bond] += curl
        arrow_panels = [w.panel for w in work for _ in w.moves]
        crooked = _in_crook(pts, lengths / bl, sources, sinks, owner, arrow_obs, arrow_panels)
        if crooked is not None:   # (no arrow of most schemes shifts a pair between two bonds of one atom)
            cost += crooked
        # A 1,2-shift is a clear arc round the outside, away from the atom the group leaves:
        # bulging toward that atom it lies on the bond to the cationic centre, and a flat one
        # reads as a dash between two bonds.
        if any(s.pivot is not None for s in sinks):
            pivots = np.array([w.panel.positions[s.pivot] if s.pivot is not None else _NOWHERE
                               for w in work for s in w.sinks]).take(owner)
            start, chord = pts[:, 0], _units(pts[:, -1] - pts[:, 0])
            standoff = ((pts[:, _SAMPLES // 2] - start) * np.conj(chord)).imag    # off the chord, to its left
            pivot_side = np.sign(((np.where(np.isfinite(pivots), pivots, start) - start) * np.conj(chord)).imag)
            away = -pivot_side * standoff
            cost += np.where(np.isfinite(pivots) & ~(away >= _SHIFT_BULGE * bl), _TIGHT_SHIFT, 0.0)
        for c, value, length, crossing_count in zip(candidates, cost.tolist(), lengths.tolist(), crossings):
            c.cost, c.length, c.crossings = value + c.handicap, length, crossing_count

    def _curl(self, pts: np.ndarray, steps: np.ndarray, sizes: np.ndarray) -> Optional[np.ndarray]:
        """An arc that turns back on itself (through more than _MAX_TURN) and either stands far
        off its chord or crosses itself reads as a loop rather than as one clean arc. `steps`
        are the differences of consecutive samples, `sizes` their lengths. None where no arc
        turns that far (most figures: nothing to add)."""
        steps = np.where(sizes > 1e-12, steps, 1.0)
        turns = steps[:, 1:] / steps[:, :-1]
        turn = np.abs(np.add.reduce(np.arctan2(turns.imag, turns.real), axis=1))   # np.angle's arithmetic
        if not (turn > _MAX_TURN).any():
            return None
        chord = pts[:, -1:] - pts[:, :1]
        chord = chord / np.maximum(np.abs(chord), 1e-9)
        standoff = np.maximum.reduce(np.abs(((pts - pts[:, :1]) * np.conj(chord)).imag), axis=1)
        loop = (turn > _MAX_TURN) & ((standoff > _LOOP_STANDOFF * self.bl) | (turn > _SELF_CROSSING))
        return np.where(loop, _CURL_WEIGHT * np.degrees(turn - _MAX_TURN), 0.0)

    def _pair_costs(self, panels: list[list[list[_Candidate]]], controls: np.ndarray, samples: np.ndarray,
                    extent: _Extent) -> list[dict[tuple[int, int], np.ndarray]]:
        """For each panel (the kept candidates of each of its arrows): the penalty of drawing
        candidate a of arrow i with candidate b of arrow j (i < j), for every such pair: heads
        too close, shafts alongside, shafts crossing. Every such pair of every panel is scored in
        one batch (numpy's cost here is per call), and only those: padding every panel to the
        largest panel's arrows would score many pairs no choice reads."""
        out: list[dict[tuple[int, int], np.ndarray]] = [{} for _ in panels]
        first, second, blocks = [], [], []
        for k, options in enumerate(panels):
            for i in range(len(options) - 1):
                for j in range(i + 1, len(options)):
                    first += [a.row for a in options[i] for _ in options[j]]
                    second += [b.row for _ in options[i] for b in options[j]]
                    blocks.append((k, i, j, len(options[i]), len(options[j])))
        if not blocks:
            return out
        a, b = np.array(first), np.array(second)
        # Most pairs are of arrows far apart. Where the boxes of two candidates' samples (`extent`)
        # stand more than half a bond length apart along x or y, neither their heads (0.45) nor
        # their shafts (0.15) come close, as a complex number is never shorter than its real or
        # imaginary part, and their chords (between samples, inside those boxes) cannot cross:
        # every term stays zero there, and is worked out for the other pairs only.
        gap = 0.5 * self.bl
        # (the four columns as rows of one array: two gatherings instead of eight)
        edges = np.concatenate((extent.x0, extent.x1, extent.y0, extent.y1), axis=1).T
        (x0a, x1a, y0a, y1a), (x0b, x1b, y0b, y1b) = edges.take(a, axis=1), edges.take(b, axis=1)
        close = (~((x0a > x1b + gap) | (x0b > x1a + gap) | (y0a > y1b + gap) | (y0b > y1a + gap))).nonzero()[0]
        cost = np.zeros(len(first))
        if len(close):
            # Both sides in one gathering, then split: numpy's cost here is per call.
            rows = np.concatenate((a.take(close), b.take(close)))
            tips, starts, body = controls[:, 3].take(rows), controls[:, 0].take(rows), samples.take(rows, axis=0)[:, 2:-1:2]
            n = len(close)
            coarse = samples[:, ::4].take(rows, axis=0)     # five chords of each curve
            cost[close] = (self._nearness((tips[:n], starts[:n], body[:n]), (tips[n:], starts[n:], body[n:]))
                           + self._crossings(coarse[:n], coarse[n:]))
        start = 0
        for k, i, j, rows, columns in blocks:
            out[k][(i, j)] = cost[start:start + rows * columns].reshape(rows, columns)
            start += rows * columns
        return out

    def _nearness(self, first: tuple[np.ndarray, ...], second: tuple[np.ndarray, ...]) -> np.ndarray:
        """The penalties of candidates `first` against `second`, pair by pair (one row each), for
        heads too close and shafts alongside; each side given as tips, starts and shaft samples
        without their ends."""
        bl = self.bl
        tips_a, starts_a, body_a = first
        tips_b, starts_b, body_b = second
        cost = np.where(np.abs(tips_a - tips_b) < 0.45 * bl, 150.0, 0.0)
        # Which samples of a's shaft come near some sample of b's: (pairs, s)
        alongside = np.logical_or.reduce(np.abs(body_a[:, :, None] - body_b[:, None, :]) < 0.15 * bl, axis=2)
        # Arrows from one bond may share their start: closeness right at a shared start is fine.
        shared = (np.abs(starts_a - starts_b) < 0.3 * bl)[:, None]
        near_start = np.abs(body_a - starts_a[:, None]) < 0.35 * bl
        cost += 20.0 * np.add.reduce(alongside & ~(shared & near_start), axis=1)
        return cost

    @staticmethod
    def _crossings(coarse_a: np.ndarray, coarse_b: np.ndarray) -> np.ndarray:
        """The penalty of two shafts crossing, pair by pair (one row each), each given as its
        coarse chord points."""
        xa, ya, xb, yb = coarse_a.real, coarse_a.imag, coarse_b.real, coarse_b.imag
        # Which side of each chord of one curve every point of the other lies on; two chords
        # cross where each has the other's ends on opposite sides.
        dxa, dya = (xa[:, 1:] - xa[:, :-1])[:, :, None], (ya[:, 1:] - ya[:, :-1])[:, :, None]
        dxb, dyb = (xb[:, 1:] - xb[:, :-1])[:, :, None], (yb[:, 1:] - yb[:, :-1])[:, :, None]
        of_b = dxa * (yb[:, None, :] - ya[:, :-1, None]) - dya * (xb[:, None, :] - xa[:, :-1, None])
        of_a = dxb * (ya[:, None, :] - yb[:, :-1, None]) - dyb * (xa[:, None, :] - xb[:, :-1, None])
        hit = (of_b[..., :-1] * of_b[..., 1:] < 0) & (of_a[..., :-1] * of_a[..., 1:] < 0).transpose(0, 2, 1)
        return 20.0 * np.add.reduce(hit, axis=(1, 2))

    @staticmethod
    def _choose(options: list[list[_Candidate]], pairs: dict[tuple[int, int], np.ndarray]) -> list[_Candidate]:
        """The combination of one candidate per arrow with the least total penalty (its own
        costs and the `pairs` costs): exhaustive for up to four arrows, coordinate descent beyond."""
        n = len(options)
        if n == 0:
            return []
        # One or two arrows (most panels) in plain Python, without numpy's cost per call: the same
        # sums in the same order, and of equal totals the first in np.argmin's order.
        if n == 1:
            costs = [c.cost for c in options[0]]
            return [options[0][costs.index(min(costs))]]
        if n == 2:
            matrix = pairs[(0, 1)].tolist()
            totals = [(0.0 + a.cost + b.cost + matrix[i][j], a, b) for i, a in enumerate(options[0])
                      for j, b in enumerate(options[1])]
            least = min(total for total, _, _ in totals)
            return list(next((a, b) for total, a, b in totals if total == least))
        single = [np.array([c.cost for c in o]) for o in options]
        if n <= 4:
            total = np.zeros([len(o) for o in options])
            for i in range(n):
                shape = [1] * n
                shape[i] = len(options[i])
                total = total + single[i].reshape(shape)
            for (i, j), matrix in pairs.items():
                shape = [1] * n
                shape[i], shape[j] = matrix.shape
                total = total + matrix.reshape(shape)
            best = np.unravel_index(int(np.argmin(total)), total.shape)
        else:
            best = [int(np.argmin(c)) for c in single]
            for _ in range(4):
                for i in range(n):
                    value = single[i].copy()
                    for j in range(n):
                        if j != i:
                            value += pairs[(i, j)][:, best[j]] if i < j else pairs[(j, i)][best[j], :]
                    best[i] = int(np.argmin(value))
        return [options[i][int(best[i])] for i in range(n)]

    # the final arrow
    def _arrow(self, step: int, move: ResolvedMove, src: _Anchor, snk: _Anchor, c: _Candidate,
               panel: PanelStructure, head: float, t_shaft: float) -> CurvedArrow:
        """The arrow drawn along candidate c: its head `head` long, the shaft ending under the
        head at parameter t_shaft."""
        p0, p1, p2, tip = c.p0, c.p1, c.p2, c.tip
        s0, s1, s2, s3 = split_before(p0, p1, p2, tip, t_shaft)
        # The head points from where the shaft ends (under it) to the tip: taken from the curve's
        # point at the head's base instead, a curve bending under the head left the shaft's end
        # and its round cap standing out beside the head.
        direction = unit(tip - s3)
        normal = direction * 1j
        back = tip - direction * head
        notch = tip - direction * _HEAD_BASE * head
        half = head * self.head_width / self.head_length / 2
        if move.electrons == 2:
            outline = (tip, back + normal * half, notch, back - normal * half)
        else:
            # One barb, on the outside of the bend.
            bulge = bezier(p0, p1, p2, tip, 0.5) - (p0 + tip) / 2
            outside = normal if (bulge / normal).real > 0 else -normal
            outline = (tip, back + outside * half, notch)

        # (each point as its parts in line: a call per point costs more than the tuple)
        return CurvedArrow(
            step=step, move=str(move.move), electrons=move.electrons, source_kind=move.source_kind,
            source_atoms=tuple(move.source_atoms), sink_atoms=tuple(move.sink_atoms), target_atoms=snk.atoms,
            source_point=(src.point.real, src.point.imag), sink_point=(snk.point.real, snk.point.imag),
            sink_box=panel.atoms[snk.atoms[0]].box if snk.kind == "atom" else None,
            start=(s0.real, s0.imag), control1=(s1.real, s1.imag), control2=(s2.real, s2.imag),
            end=(s3.real, s3.imag), tip=(tip.real, tip.imag), head=tuple([(z.real, z.imag) for z in outline]),
            crossings=c.crossings)


_TAIL_REACH = 1.0   # bond lengths: another arrow leaving a bond this close steers the dots away
_CROWDING_REACH = 1.2   # bond lengths: an atom this close steers them away too
_MARK_GAP = 0.12    # font sizes: the least gap between an arrow's dots and another mark of their atom
_SIGN_ROOM = math.radians(40)   # a charge sign moved for the dots keeps this far round from bonds and dots
_DOTS_ROOM = math.radians(45)     # more room than this between dots and a bond counts as no better
_PAIR_TURN = math.radians(60)   # beside another arrow's head, dots stand at least this far round from their bond
_PAIR_ROOM = math.radians(30)   # and at least this far from every bond of the atom
_HEAD_SIDE = 2.0   # what dots lose on the side of their bond where another arrow's head lands (more than facing a tail)
_AROUND = tuple(cmath.rect(1.0, k * math.pi / 12) for k in range(24))


def _inside_own_ring(panel: PanelStructure, atom: int):
    """A test of directions from a ring atom with two ring bonds: whether a direction points into
    the ring (between those bonds, on the side of the smaller angle)."""
    adjacent: dict[int, list[int]] = {}
    for bond in panel.bonds:
        a, b = bond.atoms
        adjacent.setdefault(a, []).append(b)
        adjacent.setdefault(b, []).append(a)
    centre = panel.positions[atom]
    ring = [unit(panel.positions[n] - centre) for n in adjacent.get(atom, ()) if closes_cycle(atom, n, adjacent)]
    if len(ring) != 2:
        return lambda d: False
    first, second = ring
    span = cmath.phase(second / first)   # signed: the interior angle, under 180 degrees

    def inside(d: complex) -> bool:
        turn = cmath.phase(d / first)
        return 0 < turn < span if span > 0 else span < turn < 0
    return inside


def _put_back_signs(w: _PanelArrows, chosen: list[_Candidate]) -> None:
    """Each charge sign moved for an arrow's turned half-loops back where it stood if the
    arrow is drawn as none of the candidates that ran over it: it moved only to make room."""
    for k, freed, sign, occupied in w.sign_moves:
        if not any(chosen[k] is c for c in freed):
            _put_sign_back(w.panel, sign, occupied)


def _put_sign_back(panel: PanelStructure, sign: Mark, occupied: list[complex]) -> None:
    """The atom's charge sign, moved, back as `sign`, and its occupied directions as they were."""
    moved = next(m for m in panel.marks if m.kind == "charge" and m.atom == sign.atom)
    panel.marks[panel.marks.index(moved)] = sign
    panel.occupied[sign.atom] = occupied


def _on_path(box: Box, points: list[complex], pad: float) -> bool:
    """Whether any of `points` lies in `box` grown by `pad`."""
    x0, y0, x1, y1 = box.x0 - pad, box.y0 - pad, box.x1 + pad, box.y1 + pad
    for p in points:   # (a loop, not any() over a generator: thousands of points a figure)
        if x0 <= p.real <= x1 and y0 <= p.imag <= y1:
            return True
    return False


def _within_three_bonds(atom: int, bonds) -> set[int]:
    """The atoms one to three bonds from `atom` over `bonds` (pairs)."""
    reached, frontier = {atom}, {atom}
    for _ in range(3):
        frontier = {j if i in frontier else i for i, j in bonds if (i in frontier) != (j in frontier)} - reached
        reached |= frontier
    return reached - {atom}


def _beside_bond(occupied: list[complex], toward: complex, tails: list[complex] = (),
                 heads: list[complex] = ()) -> Iterator[complex]:
    """Where the dots of a pair that moves into a bond of its own atom sit, best first: in the free gap
    nearest a right angle to that bond (as far round as the room allows), not beside it, so
    the arrow from them to the bond's middle bends visibly (common practice); and on the side
    away from `tails`, the directions to where other arrows of the step leave a bond nearby, so
    the dots do not stand in their way; and on the other side of the bond from `heads`, the
    directions to where other arrows of the step end nearby, in front of the atom's other bonds."""
    # Each direction's score in one loop, clearance and the facing written out (no call per
    # direction and bond: the scores only rank the directions, as a call each would).
    phase, taken, away = cmath.phase, [o for o in occupied if o], [t.conjugate() for t in tails]
    # (the side of the bond each head lies on: the sign of its turn from `toward`)
    head_sides = [(h * toward.conjugate()).imag for h in heads]
    around = _AROUND
    if head_sides:   # (the gap left beside a head may be narrow: its edges are tried as well)
        around = _AROUND + (toward * cmath.rect(1.0, _PAIR_TURN), toward * cmath.rect(1.0, -_PAIR_TURN))
    scores = []
    for d in around:
        turn = abs(phase(d / toward))
        facing = 0.0
        for t in away:
            along = (d * t).real
            if along > facing:
                facing = along
        room = math.pi
        for o in taken:
            gap = abs(phase(d / o))
            if gap < room:
                room = gap
        crowded = 0.0
        if head_sides:
            # On a head's side of the bond; behind another bond of the atom, which the arc round
            # to the bond's far side would cross (the bond the pair goes into, along `toward`,
            # stands between none); or so near a bond that the dots read as its, or the arc
            # from them to the bond as a tick.
            side = (d * toward.conjugate()).imag
            if any(h * side > 0 for h in head_sides):
                crowded += _HEAD_SIDE
            if any((o * toward.conjugate()).imag * side > 0 and 1e-6 < abs(phase(o / toward)) < turn for o in taken):
                crowded += _HEAD_SIDE
            if turn < _PAIR_TURN - 1e-9 or room < _PAIR_ROOM - 1e-9:
                crowded += _HEAD_SIDE
        scores.append(min(room, _DOTS_ROOM) + 0.5 * min(turn, math.pi / 2) - 0.6 * max(0.0, turn - math.pi / 2)
                      - facing - crowded)
    best = max(range(len(around)), key=scores.__getitem__)   # of equals, the first found
    yield around[best]
    # The rest only if asked for; sorted is stable, so equals keep their order round the circle.
    yield from (around[k] for k in sorted(range(len(around)), key=lambda k: -scores[k]) if k != best)


_SAME_SIDE = 40.0   # the two fishhooks of one split bond drawn on one side of it


def _curve_crosses(c: _Candidate, segments: list[tuple[complex, complex]]) -> bool:
    """Whether the candidate's curve, as a polyline through its samples (worked out once),
    crosses one of the segments a-b: each has the other's ends on opposite sides, the signed
    areas ((q - p) * conj(r - p)).imag written out (a hundred of them a curve)."""
    pts = (np.array([c.p0, c.p1, c.p2, c.tip]) @ _BERNSTEIN).tolist()
    for a, b in segments:
        along = b - a
        for p, q in zip(pts, pts[1:]):
            step = q - p
            if ((step * (a - p).conjugate()).imag * (step * (b - p).conjugate()).imag < 0
                    and (along * (p - a).conjugate()).imag * (along * (q - a).conjugate()).imag < 0):
                return True
    return False


def to_own_atom(move: ResolvedMove) -> bool:
    """Electrons going from a bond to one of that bond's own atoms."""
    return move.source_kind == "bond" and len(move.sink_atoms) == 1 and move.sink_atoms[0] in move.source_atoms


def _weigh_crossings_into_atom(crossing: np.ndarray, moves: list[ResolvedMove], sinks: list[_Anchor],
                               obstacles: list[_Obstacles]) -> None:
    """An arrow into an atom (a nucleophile into a carbonyl carbon) that crosses one of that atom's
    other bonds on its way in reads as attacking through the bond (common practice: it comes in
    from the open side): such a bond weighs as another molecule's would, not as a bond of an atom
    the move names. (Row k of `crossing` is arrow k's weight per bond of its panel.)"""
    for k, (move, sink) in enumerate(zip(moves, sinks)):
        if sink.kind != "atom" or to_own_atom(move):
            continue
        atom, named = sink.atoms[0], set(move.source_atoms)
        for (i, j), bond in obstacles[k].bond_index.items():
            if atom in (i, j) and not ({i, j} - {atom}) <= named:
                crossing[k, bond] = _CROSSING


def _is_split(move: ResolvedMove) -> bool:
    """A single electron going from a bond to one of that bond's own atoms (homolysis)."""
    return move.electrons == 1 and to_own_atom(move)


def _split_bond_sides(w: _PanelArrows, options: list[list[_Candidate]],
                      pairs: dict[tuple[int, int], np.ndarray]) -> None:
    """When the two electrons of a bond go their separate ways to its atoms, the two fishhooks run
    on opposite sides of the bond (common practice for the homolysis of Br2 or a peroxide); so too
    where one goes on into a bond the atom already has, as in the Birch radical anion, where two
    short hooks on one side read as one mark. (One that makes a bond to another molecule is a long
    arc that reads apart anyway.) A pair of candidates on one side costs _SAME_SIDE more."""
    split: dict[tuple[int, int], list[int]] = {}
    for k, move in enumerate(w.moves):
        if _is_split(move) or (move.electrons == 1 and move.source_kind == "bond" and w.sinks[k].kind == "bond"):
            split.setdefault(tuple(sorted(move.source_atoms)), []).append(k)
    for (a, b), arrows in split.items():
        if len(arrows) != 2:
            continue
        axis = unit(w.panel.positions[b] - w.panel.positions[a])
        i, j = arrows
        sides = [np.array([((bezier(c.p0, c.p1, c.p2, c.tip, 0.5) - w.sources[k].point) / axis).imag > 0
                           for c in options[k]]) for k in (i, j)]
        if (i, j) in pairs:
            pairs[(i, j)] = pairs[(i, j)] + _SAME_SIDE * (sides[0][:, None] == sides[1][None, :])


def _in_crook(pts: np.ndarray, lengths: np.ndarray, sources: list[_Anchor], sinks: list[_Anchor],
              owner: np.ndarray, obstacles: list[_Obstacles], panels: list[PanelStructure]) -> Optional[np.ndarray]:
    """_CROOK where an arc that shifts a pair between two bonds of one atom has its middle (of
    its samples `pts`) inside the angle those bonds make, cramped between them, else 0.0: such
    an arc reads best round the outside of the bend (common practice). Where the arc leaves a
    bond to a hydrogen (of the arrow's panel, `panels`) and two or more other bonds of the atom
    stand round the outside (a C-H beside the C=C it feeds, on a carbon with three other bonds),
    the way round is shut and the arc reads best through the open angle, bulging away from the
    atom (an E1 drawn so, common practice): _KNOT where its middle is outside the angle or
    nearer the atom than its chord's middle is (a knot over the atom); and, as the angle is
    narrow there, _SHORT_HOOK per bond length it falls short of _PAIR_ARC (of its `lengths`, in
    bond lengths), or it reads as a tick. None where no arrow makes such a shift."""
    where: dict[int, dict[int, complex]] = {}   # each panel's atom positions, looked up once
    angles: dict[int, tuple[complex, complex, float, bool]] = {}   # arrow -> (pivot, bisector, half its angle, shut)
    for k, (src, snk) in enumerate(zip(sources, sinks)):
        if src.kind != "bond" or snk.kind != "bond":
            continue
        shared = set(src.atoms) & set(snk.atoms)
        if len(shared) != 1:
            continue
        pivot, = shared
        ends = [a for a in src.atoms + snk.atoms if a != pivot]
        ob = obstacles[k]   # the obstacles of the arrow's own panel
        at = where.get(id(ob))
        if at is None:
            at = where[id(ob)] = dict(zip(ob.atom_ids, ob.atom_xy))
        if pivot not in at or any(a not in at for a in ends):
            continue
        first, second = (unit(at[a] - at[pivot]) for a in ends)
        bisector, half = unit(first + second), abs(cmath.phase(second / first)) / 2
        bonded = [j if i == pivot else i for i, j in ob.bond_ends if pivot in (i, j)]
        outside = sum(abs(cmath.phase((at[a] - at[pivot]) / bisector)) > half
                      for a in bonded if a not in ends and a in at)
        from_hydrogen = any(panels[k].atoms[a].element == "H" for a in src.atoms)
        angles[k] = (at[pivot], bisector, half, from_hydrogen and outside >= 2)
    if not angles:
        return None
    middles, out = pts[:, _SAMPLES // 2], np.zeros(len(pts))
    # Every such arrow's candidates at once (numpy's element results do not depend on the
    # array's shape, and its cost is per call).
    crooked = np.zeros(len(sources), dtype=bool)
    crooked[list(angles)] = True
    rows = crooked.take(owner).nonzero()[0]
    pivots, bisectors, halves, shut = (np.array(column) for column in
                                       zip(*(angles[k] for k in owner.take(rows).tolist())))
    middle = middles.take(rows)
    inside = np.abs(np.angle((middle - pivots) / bisectors)) < halves
    chord_middle = (pts[:, 0].take(rows) + pts[:, -1].take(rows)) / 2
    bulging_out = np.abs(middle - pivots) > np.abs(chord_middle - pivots)
    short = _SHORT_HOOK * np.maximum(0.0, _PAIR_ARC - lengths.take(rows))
    out[rows] = np.where(shut, np.where(inside & bulging_out, 0.0, _KNOT) + short, np.where(inside, _CROOK, 0.0))
    return out


def _nearer_the_rest(panel: PanelStructure, atom: int, point: complex) -> bool:
    """Whether an arrowhead's tip at `point` lies nearer the rest of the atom's label (its H, a
    charge) than its element symbol: the head would read as pointing at them (NH+'s H)."""
    parts = panel.label_parts.get(atom)
    if parts is None or not parts[1]:
        return False
    symbol, rest = parts
    at = (point.real, point.imag)
    return min(b.distance(at) for b in rest) < symbol.distance(at)


def _parameters_at_distances(controls: np.ndarray, distances: np.ndarray) -> list[float]:
    """For each curve (rows of control points) the parameter t, near its end, where it is
    `distances[row]` from its end point: sixteen halvings, every curve at once."""
    p0, p1, p2, p3 = (controls[:, k] for k in range(4))
    # The curve less its end point as a cubic in t, evaluated by Horner's rule: half the numpy
    # calls of the Bernstein form, and numpy's cost here is per call.
    a, b, c, d = (z[:, None] for z in (p3 - p0 + 3 * (p1 - p2), 3 * (p0 - 2 * p1 + p2), 3 * (p1 - p0), p0 - p3))
    reach = distances[:, None]
    # Four halvings per round: the fifteen points that four halvings from `lo` may try are
    # measured in one batch, and where the halvings lead is looked up from which of them are
    # still too far. Every point is lo plus a sum of powers of two, exactly as one halving at a
    # time finds it, and numpy's element results do not depend on the array's shape.
    # (lo is kept complex, its imaginary parts zero: numpy casts a real operand of a complex
    # product on every call, and the sums of the real parts are the same)
    lo = np.zeros(len(controls), dtype=complex)
    for trials, advances in _rounds():
        far = np.abs(((a * (t := lo[:, None] + trials) + b) * t + c) * t + d) > reach
        lo = lo + advances.take(far @ _BITS)
    return lo.real.tolist()


_BARB_SIDES = np.array([0.5, -0.5], dtype=complex)   # (complex: a real factor is cast on every call)
_SIXTEENTHS = np.arange(1, 16) / 16   # a round's trial points, as fractions of its span
_BITS = 1 << np.arange(15)             # trial point k + 1 too far: bit k of the round's pattern


@lru_cache(maxsize=None)
def _rounds() -> tuple[tuple[np.ndarray, np.ndarray], ...]:
    """Each round's trial points (_SIXTEENTHS of its span, complex) and advances (_halvings in
    sixteenths of its span), the spans 1, 1/16, 1/256 and 1/4096: worked out once, as the same
    products of the same numbers each round would give."""
    spans = (1.0, 1.0 / 16, 1.0 / 256, 1.0 / 4096)
    return tuple(((_SIXTEENTHS * span).astype(complex), _halvings() * (span / 16)) for span in spans)


@lru_cache(maxsize=None)
def _halvings() -> np.ndarray:
    """For each pattern of a round (_BITS), how many sixteenths of its span four halvings
    advance: each halving moves on by its half where the point half-way is still too far."""
    patterns = np.arange(1 << 15)
    advance = np.zeros(1 << 15, dtype=np.int64)
    for half in (8, 4, 2, 1):
        advance += half * ((patterns >> (advance + half - 1)) & 1)
    return advance.astype(float)   # (whole numbers, exact: multiplied by a float span without a cast)


_TOUCH = 1e-6   # points: bounding boxes this close count as meeting, so rounding never hides a crossing


class _Extent:
    """The bounding box of each polyline (rows of samples), as columns: the sample tests below
    look only at an obstacle that comes within reach of a row's box."""

    def __init__(self, pts: np.ndarray):
        self.x0, self.x1 = np.minimum.reduce(pts.real, axis=1)[:, None], np.maximum.reduce(pts.real, axis=1)[:, None]
        self.y0, self.y1 = np.minimum.reduce(pts.imag, axis=1)[:, None], np.maximum.reduce(pts.imag, axis=1)[:, None]


def _inner_samples_in_boxes(pts: np.ndarray, inner: np.ndarray, extent: _Extent, boxes: np.ndarray) -> np.ndarray:
    """For each polyline (rows of pts) and each box (x0, y0, x1, y1) of its row: how many of its
    `inner` samples lie in the box. A box that misses the row's bounding box holds none of
    them: only the others are tested, sample by sample."""
    meet = ((boxes[..., 0] <= extent.x1) & (boxes[..., 2] >= extent.x0)
            & (boxes[..., 1] <= extent.y1) & (boxes[..., 3] >= extent.y0))
    pairs = meet.ravel().nonzero()[0]            # row * boxes + box
    c = pairs // meet.shape[1]
    box = boxes.reshape(-1, 4).take(pairs, axis=0)
    x, y = pts.real.take(c, axis=0), pts.imag.take(c, axis=0)
    hit = ((x >= box[:, 0:1]) & (x <= box[:, 2:3]) & (y >= box[:, 1:2]) & (y <= box[:, 3:4])) & inner.take(c, axis=0)
    out = np.zeros(meet.shape, dtype=int)
    out.put(pairs, np.add.reduce(hit, axis=1))
    return out


def _inner_samples_near(pts: np.ndarray, inner: np.ndarray, extent: _Extent, points: np.ndarray,
                        radius: np.ndarray) -> np.ndarray:
    """For each polyline (rows of pts) and each point of its row: how many of its `inner` samples
    lie closer than radius[row, point]. Only points within reach of the row's bounding box are
    tested (the reach a little wider than the radius, so rounding never hides a sample)."""
    reach = radius * 1.001 + _TOUCH
    meet = ((points.real >= extent.x0 - reach) & (points.real <= extent.x1 + reach)
            & (points.imag >= extent.y0 - reach) & (points.imag <= extent.y1 + reach))
    pairs = meet.ravel().nonzero()[0]            # row * points + point
    c = pairs // meet.shape[1]
    hit = ((np.abs(pts.take(c, axis=0) - points.take(pairs)[:, None]) < radius.take(pairs)[:, None])
           & inner.take(c, axis=0))
    out = np.zeros(meet.shape, dtype=int)
    out.put(pairs, np.add.reduce(hit, axis=1))
    return out


def _crossing_counts(pts: np.ndarray, a: np.ndarray, b: np.ndarray, extent: _Extent) -> np.ndarray:
    """For each polyline (rows of pts, bounded by `extent`) and each segment a[r, e]-b[r, e] of
    its row: how many times they cross."""
    rows, edges = a.shape
    if edges == 0:
        return np.zeros((rows, 0), dtype=int)
    # Only a polyline and a segment whose bounding boxes meet can cross: the rest are not tested.
    left, right = np.minimum(a.real, b.real), np.maximum(a.real, b.real)
    top, bottom = np.minimum(a.imag, b.imag), np.maximum(a.imag, b.imag)
    meet = ((left <= extent.x1 + _TOUCH) & (right >= extent.x0 - _TOUCH)
            & (top <= extent.y1 + _TOUCH) & (bottom >= extent.y0 - _TOUCH))
    pairs = meet.ravel().nonzero()[0]            # row * edges + edge
    c = pairs // edges
    start, end = a.take(pairs), b.take(pairs)
    ax, ay, bx, by = start.real, start.imag, end.real, end.imag
    ex, ey = (bx - ax)[:, None], (by - ay)[:, None]
    px, py = pts.real.take(c, axis=0), pts.imag.take(c, axis=0)
    # Which side of each bond's line every sample lies on; a polyline segment crosses the line
    # where its two ends lie on opposite sides. Few do, so only those are tested further: do
    # the bond's ends lie on opposite sides of that segment?
    side = ey * (ax[:, None] - px) - ex * (ay[:, None] - py)
    steps = (side[:, :-1] * side[:, 1:] < 0).ravel().nonzero()[0]   # pair * (samples - 1) + step
    k = steps // (side.shape[1] - 1)
    first = steps + k                                                # pair * samples + step: the step's first sample
    x0, y0 = px.take(first), py.take(first)
    dx, dy = px.take(first + 1) - x0, py.take(first + 1) - y0
    o1 = dx * (ay.take(k) - y0) - dy * (ax.take(k) - x0)
    o2 = dx * (by.take(k) - y0) - dy * (bx.take(k) - x0)
    hit = o1 * o2 < 0
    return np.bincount(pairs.take(k.compress(hit)), minlength=rows * edges).reshape(rows, edges)
