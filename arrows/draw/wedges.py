"""Which bonds of a panel are drawn as wedges, and which kind, so that the drawing shows the
configuration each stereocentre has in that panel's state.

Rules (IUPAC Recommendations 2006, "Graphical representation of stereochemical configuration",
Pure Appl. Chem. 2006, 78, 1897-1970, references.md; ST-1): a wedge is a single bond with its
narrow end at the stereocentre; one wedge per stereocentre is enough when its other bonds are
drawn in the plane; a bond between two stereocentres is not wedged, so that no wedge is read as
belonging to either; a wedge goes preferably to a terminal atom, or to a substituent bearing
hydrogen, rather than along a ring bond. Of our own: a bond that the step leaving the panel
breaks is wedged only when nothing else is left, as its arrow starts there; a bond the step
arriving at the panel formed may be wedged (the new C-Br bonds of an anti addition are the ones
a chemist wedges).

The kind follows from the geometry: the four substituents are put in three dimensions (the
drawn ones in the plane, the wedged one towards the viewer for a solid wedge, and a hydrogen
that is not drawn where the other three leave room, as their negative sum), and the sign of that
tetrahedron is compared with the centre's chiral tag as RDKit reads it. Positions are a panel's,
so a centre inverted by a step gets the other wedge where its substituents stay put.
"""
from __future__ import annotations

from typing import Callable

from rdkit import Chem

from ..electrons import ElectronState

SOLID, HASHED = "solid", "hashed"
_TILT = 0.8   # height of the wedged substituent over the plane, against an in-plane bond of 1
# A wedge whose tetrahedron is flatter than this (the wedged bond and the hidden hydrogen
# nearly in line) would leave the reader guessing: another bond is taken if there is one.
_FLAT = 0.35

Pair = tuple[int, int]


def configured_centres(state: ElectronState) -> dict[int, tuple[list[int], int]]:
    """The tetrahedral stereocentres of `state` that carry a configuration: for each, its
    neighbours in the order RDKit reads the chiral tag against (the bonded atoms in bond order,
    then -1 for each hydrogen held as a count, which RDKit reads as coming last: checked on the
    tags it gives F[C@H](Cl)Br and [C@H](F)(Cl)Br) and the sign a tetrahedron of those neighbours
    must have (RDKit's CHI_TETRAHEDRAL_CCW gives a negative determinant of v1-v0, v2-v0, v3-v0,
    checked on conformers it embedded). A tag on an atom that RDKit's perception does not find
    stereogenic is not a configuration. tests/test_draw_stereo.py judges the outcome."""
    if not state.configured:
        return {}
    from ..judgement.stereo import CENTRE, state_stereo
    mol = state.mol
    tagged = {}
    for e in state_stereo(state):   # found by the stereo check already when `arrows draw` checked first
        if e.kind != CENTRE:
            continue
        atom = mol.GetAtomWithIdx(e.atoms[0])
        tag = atom.GetChiralTag()
        if tag not in (Chem.ChiralType.CHI_TETRAHEDRAL_CW, Chem.ChiralType.CHI_TETRAHEDRAL_CCW):
            continue
        order = [b.GetOtherAtomIdx(e.atoms[0]) for b in atom.GetBonds()] + [-1] * atom.GetTotalNumHs()
        if len(order) == 4:
            tagged[e.atoms[0]] = (order, -1 if tag == Chem.ChiralType.CHI_TETRAHEDRAL_CCW else 1)
    return tagged


def stereogenic_atoms(state: ElectronState) -> frozenset[int]:
    """Every atom RDKit finds stereogenic in `state`, configured or not: a wedge between two of
    them is avoided even where only one carries a configuration (a norbornene's bridgehead
    beside the ring-fusion carbon a Diels-Alder configures)."""
    from ..judgement.stereo import CENTRE, state_stereo
    return frozenset(e.atoms[0] for e in state_stereo(state) if e.kind == CENTRE)


def choose_wedges(centres: dict[int, tuple[list[int], int]], positions: dict[int, complex],
                  single: set[Pair], breaking: set[Pair], neighbours: dict[int, list[int]],
                  hydrogens: Callable[[int], int], in_ring: Callable[[int, int], bool],
                  stereogenic: frozenset[int] = frozenset()) -> dict[Pair, str]:
    """(stereocentre, other atom) -> SOLID or HASHED for the bonds drawn as wedges. `positions`
    are the drawn atoms (points, y down), `single` the drawn single bonds as sorted pairs,
    `breaking` those the step leaving the panel breaks, `neighbours` each drawn atom's drawn
    neighbours, `hydrogens` how many hydrogens an atom holds, `stereogenic` the atoms that are
    stereocentres whether configured or not."""
    chosen: dict[Pair, str] = {}
    wedged: set[Pair] = set()
    for centre in sorted(centres):
        if centre not in positions:
            continue
        order, sign = centres[centre]
        drawn = [n for n in order if n in positions]
        if len(drawn) < 3:
            continue   # two substituents not drawn: the drawing cannot show the configuration
        best = None
        for n in drawn:
            pair = (min(centre, n), max(centre, n))
            if pair not in single or pair in wedged:
                continue
            volume = _volume(centre, n, order, positions)
            flat = abs(volume) < _FLAT
            preference = (pair in breaking, n in centres or n in stereogenic, flat, in_ring(centre, n),
                          0 if len(neighbours[n]) <= 1 else 1 if hydrogens(n) else 2, -abs(volume), n)
            if best is None or preference < best[0]:
                best = (preference, n, volume)
        if best is None or abs(best[2]) < 1e-6:
            continue
        _, n, volume = best
        wedged.add((min(centre, n), max(centre, n)))
        chosen[(centre, n)] = SOLID if (volume > 0) == (sign > 0) else HASHED
    return chosen


def _volume(centre: int, wedged: int, order: list[int], positions: dict[int, complex]) -> float:
    """The determinant of v1-v0, v2-v0, v3-v0 for the neighbours in `order`, `wedged` lifted
    towards the viewer (x right, y up, z out of the page) and a substituent not drawn at the
    negative sum of the others (where a tetrahedron puts it)."""
    c = positions[centre]
    vectors: list = []
    for n in order:
        if n in positions:
            d = positions[n] - c
            d = d / (abs(d) or 1.0)
            vectors.append((d.real, -d.imag, _TILT if n == wedged else 0.0))
        else:
            vectors.append(None)
    missing = [k for k, v in enumerate(vectors) if v is None]
    if missing:
        k, = missing
        vectors[k] = tuple(-sum(v[axis] for v in vectors if v is not None) for axis in range(3))
    (a, b, c0), (d, e, f), (g, h, i) = [tuple(v[axis] - vectors[0][axis] for axis in range(3)) for v in vectors[1:]]
    return a * (e * i - f * h) - b * (d * i - f * g) + c0 * (d * h - e * g)
