"""The untangler's search for faulty panels (an atom drawn on a bond not its own, two bonds that
cross) against a plain geometric judge, on random panels: the search passes over a panel where no
two atoms stand near enough for either fault, and that reach must miss none.

The judge: distance from a point to a segment, and a proper crossing as each segment's ends lying
strictly on either side of the other's line (the orientation test of computational geometry,
O'Rourke, Computational Geometry in C, ch. 1; from memory), written out here with no code of the
project. The reaches (0.25 bond lengths for a skeletal vertex, 0.45 for a label) are the
untangler's own, as scheme's notes use them (common practice: a vertex that near a line reads as
a joint of it).
"""
from __future__ import annotations

import math
import random

from arrows.draw.untangle import _faultless

_VERTEX_REACH, _LABEL_REACH = 0.25, 0.45


def _to_segment(p: complex, a: complex, b: complex) -> float:
    along = b - a
    if abs(along) < 1e-12:
        return abs(p - a)
    t = min(1.0, max(0.0, ((p - a) * along.conjugate()).real / abs(along) ** 2))
    return abs(p - (a + t * along))


def _side(a: complex, b: complex, p: complex) -> float:
    return ((b - a) * (p - a).conjugate()).imag


def _faulty(here: dict[int, complex], bonds: list[tuple[int, int]], labelled: frozenset[int]) -> bool:
    for atom, p in here.items():
        reach = _LABEL_REACH if atom in labelled else _VERTEX_REACH
        if any(atom not in (i, j) and _to_segment(p, here[i], here[j]) < reach for i, j in bonds):
            return True
    for n, (i, j) in enumerate(bonds):
        for a, b in bonds[n + 1:]:
            if len({i, j, a, b}) == 4 \
                    and _side(here[i], here[j], here[a]) * _side(here[i], here[j], here[b]) < 0 \
                    and _side(here[a], here[b], here[i]) * _side(here[a], here[b], here[j]) < 0:
                return True
    return False


def _random_panel(rng: random.Random) -> tuple[dict[int, complex], list[tuple[int, int]]]:
    """Atoms scattered on a jittered grid with bonds between near pairs (0.5 to 1.9 long), some
    atoms moved onto or beside a bond and some bonds drawn across others."""
    here: dict[int, complex] = {}
    for atom in range(rng.randint(3, 14)):
        here[atom] = complex(atom % 4 + rng.uniform(-0.3, 0.3), atom // 4 + rng.uniform(-0.3, 0.3)) * rng.uniform(0.8, 1.4)
    atoms = list(here)
    bonds = [(i, j) for n, i in enumerate(atoms) for j in atoms[n + 1:]
             if 0.5 < abs(here[i] - here[j]) < 1.9 and rng.random() < 0.45]
    if bonds and rng.random() < 0.5:   # an atom set near a bond's line, inside or just beyond its reach
        i, j = rng.choice(bonds)
        mover = rng.choice(atoms)
        if mover not in (i, j):
            t = rng.uniform(0.0, 1.0)
            normal = (here[j] - here[i]) * 1j / max(abs(here[j] - here[i]), 1e-9)
            here[mover] = here[i] + t * (here[j] - here[i]) + normal * rng.uniform(-0.5, 0.5)
    return here, bonds


def test_the_panels_passed_over_hold_no_fault():
    rng = random.Random(20261205)
    panels = [_random_panel(rng) for _ in range(3000)]
    labelled = frozenset(range(0, 14, 3))
    found = _faultless([here for here, _ in panels], [bonds for _, bonds in panels], labelled)
    judged = [not _faulty(here, bonds, labelled) for here, bonds in panels]
    assert found == judged
    # The random panels hold both kinds of panel in number, so the comparison means something.
    assert 300 < judged.count(False) < 2700


def test_bonds_crossing_at_right_angles_through_their_middles_are_found():
    # The crossing whose atoms stand furthest apart for their bonds' length: each end 1/sqrt(2)
    # of a bond length from the ends of the other (an exact case of the reach).
    for turn in (0.0, 0.3, 1.1):
        spin = complex(math.cos(turn), math.sin(turn))
        here = {0: -0.5 * spin, 1: 0.5 * spin, 2: -0.5j * spin, 3: 0.5j * spin}
        assert _faultless([here], [[(0, 1), (2, 3)]], frozenset()) == [False]


def test_a_label_beside_the_middle_of_a_short_bond_is_found():
    # An atom on a bond reaches furthest from that bond's ends beside its middle: a label 0.44 off
    # the middle of a bond 0.6 long stands hypot(0.44, 0.3) = 0.53 from either end, beyond the
    # crossing reach of 0.6 / sqrt(2) = 0.42 (the label's term of the reach; an exact case).
    for turn in (0.0, 0.7, 2.0):
        spin = complex(math.cos(turn), math.sin(turn))
        here = {0: -0.3 * spin, 1: 0.3 * spin, 2: 0.44j * spin}
        assert _faultless([here], [[(0, 1)]], frozenset({2})) == [False]
