"""What a step does to the configuration a species wrote (@, @@, / and \\): the bookkeeping
follows electrons, not geometry, so an atom that gains or loses a bond loses its configuration,
except in the steps whose stereochemical course is a textbook rule:

- a concerted backside substitution (SN2, a nucleophile opening an epoxide or a bromonium ion)
  inverts the centre (Walden inversion);
- a 1,2-shift keeps the configuration of the migrating atom (retention);
- a concerted, cyclic addition to both atoms of a double bond of known geometry (written E or
  Z, or in a small ring, where it is cis): epoxidation by a peracid, a bromonium ion,
  hydroboration, a carbene, the dienophile of a Diels-Alder, adds both new bonds on one face
  (suprafacial, syn), and the two new stereocentres get the relative configuration that follows.
  With no other configuration in the state the two faces are alike, so the product is the
  racemate of the configuration drawn (a meso compound where the two centres mirror each other);
  so does a Diels-Alder diene written E or Z at both ends (suprafacial on the diene: its two
  outside groups end up cis). When the dienophile's own centres are configured too, the two
  pairs are each fixed within themselves, but how they stand to each other (endo or exo) is
  open: the diene's pair is marked as one that may turn over together (open_face_groups);
- a concerted elimination across two configured centres (E2, or iodide taking bromine from a
  vicinal dibromide) breaks the two bonds anti-periplanar, and the new double bond gets the
  geometry that follows; when the atom that takes the first group is joined to the second (the
  oxide of a Cope elimination, the carbonyl oxygen of an ester pyrolysis) the two leave from one
  side, syn-periplanar, through a cyclic transition state;
- an electrocyclic ring closure of a polyene whose two terminal double bonds are written E or Z
  turns both termini one way (conrotatory) or opposite ways (disrotatory), as the
  Woodward-Hoffmann rules fix it: under heat 4n electrons conrotatory and 4n+2 disrotatory,
  under light the reverse (Woodward & Hoffmann 1965, 1969; Clayden ch. 35; from memory). The
  two outside groups (trans to the chain) end up cis in the ring after a disrotatory closure,
  trans after a conrotatory one;
- a thermal [3,3] shift (Cope, Claisen, thio-Claisen) along an open chain of C, N, O and divalent
  sulfur goes through a chair, in which a group on a breaking-bond carbon stands equatorial (its
  new double bond E) or axial (Z) and a terminus's group trans to the chain equatorial (Doering &
  Roth 1962; Clayden; from memory; the thio-Claisen takes the Claisen's chair, common practice):
  when the chair and its ring flip give one product from the configuration written, the new
  double bonds and centres get it, read off RDKit 3D models of the chairs.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from itertools import product
from typing import Callable, Iterable, Optional, Sequence

from rdkit import Chem

Pair = tuple[int, int]

_UNSPECIFIED = Chem.ChiralType.CHI_UNSPECIFIED
_TETRAHEDRAL = (Chem.ChiralType.CHI_TETRAHEDRAL_CW, Chem.ChiralType.CHI_TETRAHEDRAL_CCW)
_CIS = (Chem.BondStereo.STEREOZ, Chem.BondStereo.STEREOCIS)
_TRANS = (Chem.BondStereo.STEREOE, Chem.BondStereo.STEREOTRANS)
_DIRECTED = (Chem.BondDir.ENDUPRIGHT, Chem.BondDir.ENDDOWNRIGHT)
_LIGHT = re.compile(r"\bh\s?[vν]\b|light|photo|\buv\b", re.IGNORECASE)


def names_light(*texts: Optional[str]) -> bool:
    """Whether a step's conditions (the text over or under its arrow) name light: a photochemical step."""
    return any(text and _LIGHT.search(text) for text in texts)


_OPEN_FACE = "open_face"   # atom property: the pair of centres it belongs to turns over as one


def open_face_groups(mol: Chem.Mol) -> list[list[int]]:
    """The pairs of centres whose configuration is fixed relative to each other but not to the
    other centres made with them: a Diels-Alder diene's two ends, next to its configured
    dienophile (endo or exo is not in the bookkeeping). Each pair may be inverted as one."""
    groups: dict[int, list[int]] = {}
    for atom in mol.GetAtoms():
        if atom.HasProp(_OPEN_FACE) and atom.GetChiralTag() != _UNSPECIFIED:
            groups.setdefault(atom.GetIntProp(_OPEN_FACE), []).append(atom.GetIdx())
    return [group for group in groups.values() if len(group) > 1]


def turned_over(mol: Chem.Mol, atoms: Iterable[int]) -> Chem.Mol:
    """A copy of `mol` with the chiral tags at `atoms` inverted."""
    work = Chem.RWMol(mol)
    for i in atoms:
        atom = work.GetAtomWithIdx(i)
        if atom.GetChiralTag() in _TETRAHEDRAL:
            atom.SetChiralTag(_TETRAHEDRAL[1] if atom.GetChiralTag() == _TETRAHEDRAL[0] else _TETRAHEDRAL[0])
    return work.GetMol()


def has_configuration(mol: Chem.Mol) -> bool:
    """Whether a species brought a configuration (@, @@, / or \\). Most mechanisms have none, and
    then no step needs to look for one to forget."""
    return (any(mol.GetAtomWithIdx(i).GetChiralTag() != _UNSPECIFIED for i in range(mol.GetNumAtoms()))
            or any(mol.GetBondWithIdx(i).GetStereo() != Chem.BondStereo.STEREONONE for i in range(mol.GetNumBonds())))


def may_configure(changes: dict[Pair, tuple[int, int]]) -> bool:
    """Whether a step in a state with no configuration may make one: only a syn addition can (a
    double bond made single whose two atoms both gain a single bond); the diene and elimination
    rules need a written configuration. Most steps skip carry_configuration on this test."""
    gaining = {i for key, electrons in changes.items() if electrons == (0, 2) for i in key}
    return any(a in gaining and b in gaining for (a, b), electrons in changes.items() if electrons == (4, 2))


def carry_configuration(before: Chem.Mol, after: Chem.RWMol, changes: dict[Pair, tuple[int, int]],
                        shifted: Callable[[int, int], bool], configured: bool,
                        pairs_moved: int = 0, light: bool = False) -> tuple[bool, Optional[ChairModel]]:
    """Set on `after` (the state after a step, being built) the configuration of every atom whose
    bonds the step changed. `changes` maps each changed bond to its electrons (before, after the
    step); `shifted(atom, leaving)` tells whether `atom` moved with the pair of its bond to
    `leaving` (a 1,2-shift); `configured`, whether `before` holds any configuration. Returns
    whether `after` does, and the chair model of a thermal [3,3] shift from a configured state
    (None for any other step), built here once for the checks to read."""
    formed, broken, other = _bond_changes(changes)
    syn = _syn_additions(before, changes, formed, configured)
    dienes = _diene_ends(before, changes, formed) if configured else []
    if not configured and not syn:
        return False, None
    carried = _substitutions(before, formed, broken, other, shifted) if configured else {}
    changed = {i for key in changes for i in key}
    forget_configuration(after, changed - set(carried))
    for i in changed:
        after.GetAtomWithIdx(i).ClearProp(_CHAIR)   # (a rule below may set it again)
    for atom, (leaving, entering, invert) in carried.items():
        substitute_configuration(before, after, atom, leaving, entering, invert=invert)
    made = False
    for addition in syn:
        made |= _set_syn_configuration(before, after, *addition)
    configured_pairs = {_pair(a, b) for a, b, *_ in syn}
    for ends in dienes:
        set_here = _set_diene_end_configuration(before, after, *ends)
        if set_here and _pair(ends[4], ends[5]) in configured_pairs:
            for end in (ends[0], ends[3]):   # endo or exo: this pair may turn over as one
                after.GetAtomWithIdx(end).SetIntProp(_OPEN_FACE, ends[0])
        made |= set_here
    if configured:
        for chain in _electrocyclic_closures(before, changes):
            made |= _set_electrocyclic_configuration(before, after, chain, conrotatory(pairs_moved, light))
    chair = None
    if configured and pairs_moved == 3 and not light:   # three pairs, bond to bond: no lone pair in the array
        chain = three_three_array(before, changes)
        outcomes = chair_outcomes(before, after, chain) if chain is not None else None
        if outcomes:
            chair = ChairModel(tuple(chain), tuple(outcomes))
            made |= _set_chair_configuration(after, chair)
    if configured:
        for elimination in _eliminations(before, changes, formed, broken):
            _set_elimination_geometry(before, after, *elimination)
    return configured or made, chair


def concerted_eliminations(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]]) -> list[tuple[int, int, int, int, bool]]:
    """(a, b, p, q, syn) of each concerted 1,2-elimination of a step between two configured
    carbons (see _eliminations); `changes` as carry_configuration takes them."""
    formed, broken, _ = _bond_changes(changes)
    return _eliminations(mol, changes, formed, broken)


def _bond_changes(changes: dict[Pair, tuple[int, int]]) -> tuple[dict[int, list[int]], dict[int, list[int]], set[int]]:
    """Per atom, the single bonds formed and broken; and the atoms at which any other bond changed."""
    formed: dict[int, list[int]] = {}
    broken: dict[int, list[int]] = {}
    other: set[int] = set()
    for (i, j), electrons in changes.items():
        if electrons == (0, 2):
            kind = formed
        elif electrons == (2, 0):
            kind = broken
        else:
            other.update((i, j))
            continue
        kind.setdefault(i, []).append(j)
        kind.setdefault(j, []).append(i)
    return formed, broken, other


def _substitutions(mol: Chem.Mol, formed, broken, other, shifted) -> dict[int, tuple[int, int, bool]]:
    """The stereocentres at which one single bond forms while one single bond breaks, nothing
    else changing there. Either a concerted substitution: the bond forms with electrons from
    elsewhere and the broken bond's pair goes to the leaving atom; the nucleophile enters opposite
    the leaving group, so the configuration inverts (Walden inversion, textbook). Or the atom
    migrates with its bonding pair (a 1,2-shift: Wagner-Meerwein, pinacol, Baeyer-Villiger,
    Beckmann), taking the new partner on the face the old one held: the configuration is kept
    (retention at the migrating carbon, textbook). A nucleophile the leaving group itself delivers
    (an SNi) keeps it too. Returns atom -> (leaving, entering, inverted)."""
    out = {}
    for atom, entering in formed.items():
        leaving = broken.get(atom, [])
        if len(entering) != 1 or len(leaving) != 1 or atom in other:
            continue
        if mol.GetAtomWithIdx(atom).GetChiralTag() == _UNSPECIFIED:
            continue
        front_side = _delivered_by_leaving_group(mol, atom, entering[0], leaving[0])
        out[atom] = (leaving[0], entering[0], not shifted(atom, leaving[0]) and not front_side)
    return out


def _delivered_by_leaving_group(mol: Chem.Mol, centre: int, entering: int, leaving: int) -> bool:
    """Whether the entering atom is bonded, before the step, to the leaving atom or to one of its
    neighbours (not through the centre): the leaving group delivers it to the face it leaves from,
    through a four-membered cyclic transition state, and the configuration is kept (an SNi: a
    chlorosulfite's chlorine as SO2 leaves, textbook)."""
    near = {n.GetIdx() for n in mol.GetAtomWithIdx(leaving).GetNeighbors() if n.GetIdx() != centre}
    return entering in near or any(mol.GetBondBetweenAtoms(entering, n) is not None for n in near)


def _syn_additions(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]], formed, configured: bool
                   ) -> list[tuple[int, int, int, int, int, int, bool]]:
    """(a, b, x, y, ref_a, ref_b, cis) for each double bond a=b of known geometry that the step
    makes single while a gains one single bond (to x) and b one (to y), nothing else changing at a
    or b: ref_a and ref_b are a neighbour of each, cis or trans to each other. A double bond is of
    known geometry when written E or Z, or in a ring of up to seven atoms (cis within the ring).
    The two new bonds must close a ring through the reagent (x is y, as in an epoxide or a
    bromonium ion, or x and y are joined, as the B-H of a borane or the ends of a diene are): the
    cyclic arrangement is what holds both on one face. Only in a state with no configured atom:
    then the face the step picks makes no diastereomer of its own."""
    out = []
    for (a, b), electrons in changes.items():
        if electrons != (4, 2):
            continue
        if len(formed.get(a, ())) != 1 or len(formed.get(b, ())) != 1:
            continue
        if any((a in key or b in key) and key != (a, b) and before != 0 for key, (before, _) in changes.items()):
            continue
        geometry = _double_bond_geometry(mol, a, b, configured)
        if geometry is None:
            continue
        if configured and any(mol.GetAtomWithIdx(i).GetChiralTag() != _UNSPECIFIED for i in range(mol.GetNumAtoms())):
            continue
        x, y = formed[a][0], formed[b][0]
        if x != y and not 0 < len(Chem.GetShortestPath(mol, x, y)) - 1 <= _CYCLIC_REACH:
            continue   # two separate reagents (a termolecular addition, anti): no cyclic arrangement
        out.append((a, b, x, y, *geometry))
    return out


def _diene_ends(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]], formed) -> list[tuple]:
    """(c1, c2, c3, c4, x, y) for each diene c1=c2-c3=c4, both double bonds written E or Z, whose
    ends bond to x and y as c2=c3 forms, nothing else changing at c1 to c4: the diene of a
    Diels-Alder reaction, which both new bonds reach from one face (suprafacial on the diene,
    textbook). Only in a state with no configured atom, as for the syn rule."""
    if any(mol.GetAtomWithIdx(i).GetChiralTag() != _UNSPECIFIED for i in range(mol.GetNumAtoms())):
        return []
    made_single = [key for key, electrons in changes.items() if electrons == (4, 2)]

    def across(atom: int) -> Optional[int]:
        """The partner of `atom` in a double bond the step makes single."""
        return next((j for key in made_single if atom in key for j in key if j != atom), None)

    out = []
    for (c2, c3), electrons in changes.items():
        if electrons != (2, 4):
            continue
        c1, c4 = across(c2), across(c3)   # the diene c1=c2-c3=c4
        if c1 is None or c4 is None or len(formed.get(c1, ())) != 1 or len(formed.get(c4, ())) != 1:
            continue
        x, y = formed[c1][0], formed[c4][0]
        ends = {c1, c2, c3, c4}
        if len(ends) < 4 or any(set(key) & ends and key not in
                                (_pair(c1, c2), _pair(c2, c3), _pair(c3, c4), _pair(c1, x), _pair(c4, y))
                                for key in changes):
            continue
        if written_geometry(mol, c1, c2) is None or written_geometry(mol, c4, c3) is None:
            continue
        out.append((c1, c2, c3, c4, x, y))
    return out


# An s-cis diene c1=c2-c3=c4 in the plane z = 0, its ends' groups inside (towards each other) or
# outside, the dienophile's atoms above both ends.
_DIENE = ((0.0, 0.0, 0.0), (0.75, 1.3, 0.0), (2.25, 1.3, 0.0), (3.0, 0.0, 0.0))
_INSIDE, _OUTSIDE = {0: (0.75, -1.3, 0.0), 3: (2.25, -1.3, 0.0)}, {0: (-1.5, 0.0, 0.0), 3: (4.5, 0.0, 0.0)}


def _set_diene_end_configuration(before: Chem.Mol, after: Chem.RWMol, c1: int, c2: int, c3: int, c4: int,
                                 x: int, y: int) -> bool:
    """Chiral tags on the diene ends c1 and c4 for x and y bonded to them from one face. In the
    s-cis diene a group on c1 cis to c3 (as the double bond c1=c2 is written) stands inside, the
    other outside; RDKit reads the tags off that model (AssignStereochemistryFrom3D). Returns
    whether both got one."""
    place = dict(zip((c1, c2, c3, c4), _DIENE))
    for slot, end, inner, beyond in ((0, c1, c2, c3), (3, c4, c3, c2)):
        first, second, cis = written_geometry(before, end, inner)
        # `first` is cis to `second`; it stands inside when that puts it cis to `beyond`.
        first_inside = (second == beyond) == cis
        for n in before.GetAtomWithIdx(end).GetNeighbors():
            if n.GetIdx() != inner:
                place[n.GetIdx()] = _INSIDE[slot] if (n.GetIdx() == first) == first_inside else _OUTSIDE[slot]
    if x in place or y in place:
        return False   # the dienophile is part of the diene's own frame: not a plain cycloaddition
    place[x], place[y] = (0.0, 0.0, 1.5), (3.0, 0.0, 1.5)
    model = model_at(after, place)
    if model is None:
        return False
    tags = [model.GetAtomWithIdx(end).GetChiralTag() for end in (c1, c4)]
    if _UNSPECIFIED in tags:
        return False   # two equal groups at an end: no stereocentre there
    for end, tag in zip((c1, c4), tags):
        after.GetAtomWithIdx(end).SetChiralTag(tag)
    return True


_LONGEST_POLYENE = 8   # a tetraene closing to a cyclooctatriene


def conrotatory(pairs_moved: int, light: bool) -> bool:
    """Whether an electrocyclic step of `pairs_moved` pairs turns its termini conrotatory: under heat
    with 4n electrons, under light with 4n+2 (Woodward-Hoffmann rules)."""
    return (pairs_moved % 2 == 0) != light


def electrocyclic_turn(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]], pairs_moved: int,
                       light: bool) -> Optional[str]:
    """"conrotatory" or "disrotatory" for a step whose ring closure carry_configuration sets by
    the Woodward-Hoffmann rules, else None (for the notes that say why a centre is configured)."""
    if not _electrocyclic_closures(mol, changes):
        return None
    return "conrotatory" if conrotatory(pairs_moved, light) else "disrotatory"


def _electrocyclic_closures(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]]) -> list[list[int]]:
    """The chain c1=c2-...=cn of each electrocyclic ring closure: the step makes one bond, c1-cn,
    between the ends of a conjugated chain of 4 to 8 atoms whose end double bonds it makes single
    (the two termini written E or Z), and changes no bond but those of the chain, breaking none: an allowed
    closure whose stereochemical course the Woodward-Hoffmann rules fix (a hexatriene to a
    cyclohexadiene, a pentadienyl cation's Nazarov closure)."""
    made = [key for key, electrons in changes.items() if electrons[0] == 0]
    if len(made) != 1 or changes[made[0]] != (0, 2):
        return []
    c1, cn = made[0]
    chain = _path_around(mol, c1, cn, _LONGEST_POLYENE - 1)
    if chain is None or len(chain) < 4:
        return []
    bonds = {_pair(chain[k], chain[k + 1]) for k in range(len(chain) - 1)} | {made[0]}
    if any(key not in bonds or electrons[1] == 0 for key, electrons in changes.items()):
        return []   # a bond of the chain broken: a [3,3] shift (its chair is three_three_array's), no closure
    if changes.get(_pair(chain[0], chain[1])) != (4, 2) or changes.get(_pair(chain[-2], chain[-1])) != (4, 2):
        return []
    if written_geometry(mol, chain[0], chain[1]) is None or written_geometry(mol, chain[-1], chain[-2]) is None:
        return []
    return [chain]


def _set_electrocyclic_configuration(before: Chem.Mol, after: Chem.RWMol, chain: list[int],
                                     conrotatory: bool) -> bool:
    """Chiral tags on the termini of `chain` as a closure turning them con- or disrotatory sets
    them. At each terminus the group trans to the chain (outside, as its double bond is written)
    goes above the new ring's plane after a disrotatory closure at both ends; after a conrotatory
    one, above at the first end and below at the last. RDKit reads the tags off that model
    (AssignStereochemistryFrom3D). Returns whether both termini got one."""
    size = len(chain)
    place: dict[int, tuple[float, float, float]] = {}
    corner = {}
    for k, atom in enumerate(chain):   # the new ring, flat, its atoms on a circle
        angle = 2 * math.pi * k / size
        corner[atom] = (math.cos(angle), math.sin(angle))
        place[atom] = (1.5 * math.cos(angle), 1.5 * math.sin(angle), 0.0)
    for k, atom in enumerate(chain):
        ux, uy = corner[atom]
        others = [n.GetIdx() for n in before.GetAtomWithIdx(atom).GetNeighbors() if n.GetIdx() not in chain]
        if 0 < k < size - 1:
            for n in others:   # a group on the chain's middle stays in the plane, pointing out
                place[n] = (2.6 * ux, 2.6 * uy, 0.0)
            continue
        inner, beyond = (chain[1], chain[2]) if k == 0 else (chain[-2], chain[-3])
        first, second, cis = written_geometry(before, atom, inner)
        first_outside = (second == beyond) != cis   # trans to the chain: outside
        outside_up = k == 0 or not conrotatory
        for n in others:
            up = outside_up == ((n == first) == first_outside)
            place[n] = (2.2 * ux, 2.2 * uy, 1.2 if up else -1.2)
    if len(place) != len(set(place.values())):
        return False   # two middle groups on one atom: no plain chain
    model = model_at(after, place)
    if model is None:
        return False
    tags = [model.GetAtomWithIdx(end).GetChiralTag() for end in (chain[0], chain[-1])]
    if _UNSPECIFIED in tags:
        return False   # two equal groups at a terminus: no stereocentre there
    for end, tag in zip((chain[0], chain[-1]), tags):
        after.GetAtomWithIdx(end).SetChiralTag(tag)
    return True


# --- a [3,3] shift through a chair ------------------------------------------------------------------

_ARRAY_ELEMENTS = frozenset({6, 7, 8})
_SULFUR = 16
_UNREAD = object()   # a configuration RDKit could not read off a model
_RADIUS, _PUCKER, _REACH = 1.45, 0.25, 1.1   # an ideal cyclohexane chair, in angstroms
_CHAIR = "chair"   # atom property: the atom's configuration was set by a [3,3] shift's chair

# A chair outcome: (centre, chiral tag, its neighbours as neighbours_round gives them) for each new
# stereocentre and (a, b, neighbour of a, neighbour of b, cis) for each new stereogenic double bond,
# by atom indices, which later steps keep.
Outcome = tuple[tuple[tuple[int, Chem.ChiralType, tuple[int, ...]], ...], tuple[tuple[int, int, int, int, bool], ...]]


@dataclass(frozen=True)
class ChairModel:
    """A thermal [3,3] shift's array a1..a6 (three_three_array) and the configuration each of its
    chairs gives (chair_outcomes, never empty). The replay builds it once per step; the checks
    (AR605, AR602's end count) read it off the step's change."""
    chain: tuple[int, ...]
    outcomes: tuple[Outcome, ...]


def step_changes(change) -> dict[Pair, tuple[int, int]]:
    """A replayed step's bond changes (its StepChange's formed, broken and reordered bonds) as
    carry_configuration takes them: each bond's electrons before and after."""
    changes = {key: (0, 2) for key in change.formed}
    changes.update({key: (2, 0) for key in change.broken})
    changes.update({key: (2 * was, 2 * now) for key, was, now in change.reordered})
    return changes


def three_three_array(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]]) -> Optional[list[int]]:
    """The six atoms a1..a6 of a [3,3] shift (a1=a2 and a5=a6 made single, a2=a3 and a4=a5 double,
    a3-a4 broken, a1-a6 made, no other bond changed) of C, N, O and divalent sulfur (_array_atom)
    outside any ring of `mol` (the state before), else None. `changes` as carry_configuration takes
    them; whether the step is thermal is the caller's to say."""
    if len(changes) != 6:
        return None
    made = [key for key, electrons in changes.items() if electrons == (0, 2)]
    gone = [key for key, electrons in changes.items() if electrons == (2, 0)]
    lowered = {frozenset(key) for key, electrons in changes.items() if electrons == (4, 2)}
    raised = {frozenset(key) for key, electrons in changes.items() if electrons == (2, 4)}
    if len(made) != 1 or len(gone) != 1 or len(lowered) != 2 or len(raised) != 2:
        return None
    (a1, a6), (a3, a4) = made[0], gone[0]
    a2 = next((next(iter(b - {a1})) for b in lowered if a1 in b), None)
    a5 = next((next(iter(b - {a6})) for b in lowered if a6 in b), None)
    for first, last in ((a3, a4), (a4, a3)):
        if a2 is not None and a5 is not None and raised == {frozenset((a2, first)), frozenset((last, a5))}:
            chain = [a1, a2, first, last, a5, a6]
            break
    else:
        return None
    if len(set(chain)) != 6 or not all(_array_atom(mol, i, chain) for i in chain):
        return None
    rings = Chem.Mol(mol)
    Chem.FastFindRings(rings)
    if any(rings.GetAtomWithIdx(i).IsInRing() for i in chain):
        return None   # a ring can force a boat (a cis-divinylcyclopropane, a bridged system)
    return chain


def _array_atom(mol: Chem.Mol, atom: int, chain: list[int]) -> bool:
    """Whether `atom` may stand in a judged chair: C, N or O; or a sulfur bonded to nothing off the
    array, uncharged (a thioether's of a thio-Claisen, a thione's at a terminus). A sulfonium or
    sulfoxide sulfur holds a configuration and a lone pair of its own that the chair does not place."""
    found = mol.GetAtomWithIdx(atom)
    if found.GetAtomicNum() == _SULFUR:
        return found.GetFormalCharge() == 0 and found.GetTotalNumHs() == 0 and not _groups(mol, atom, chain)
    return found.GetAtomicNum() in _ARRAY_ELEMENTS


def _set_chair_configuration(after: Chem.RWMol, chair: ChairModel) -> bool:
    """The configuration of the new centres and double bonds of the [3,3] shift `chair` models when
    both chairs give one product: the same stereoisomer (the meso 3,4-dimethylhexa-1,5-diene's two
    chairs each give (E,Z)-octa-2,6-diene, the E and Z ends swapped), or a pair of enantiomers, of
    which the state carries one as a syn addition's does (the racemate). Where the chairs give
    diastereomers (the (3R*,4R*) diene: (E,E) with both methyls equatorial, (Z,Z) with both axial)
    nothing is set: one state holds one configuration, and the minor chair's product is no wrong
    one to write. Returns whether anything was set."""
    outcomes = chair.outcomes
    products = []
    for outcome in outcomes:
        work = Chem.RWMol(after)
        set_chair_outcome(work, outcome)
        products.append(work)
    first = _stereoisomer_name(products[0])
    others = {_stereoisomer_name(work) for work in products[1:]} - {first}
    if first is None or (others and others != {_stereoisomer_name(turned_over(products[0], range(after.GetNumAtoms())))}):
        return False   # diastereomers, or a state RDKit cannot write
    set_here = set_chair_outcome(after, outcomes[0])
    for atom in set_here:   # for the notes, and for AR605 to judge the written product against each chair
        after.GetAtomWithIdx(atom).SetBoolProp(_CHAIR, True)
    return bool(set_here)


def _stereoisomer_name(mol: Chem.Mol) -> Optional[str]:
    """RDKit's canonical SMILES of `mol` with its configuration and without map numbers (a state's
    atoms are numbered), or None when RDKit cannot write the state being built."""
    work = Chem.RWMol(mol)
    for atom in work.GetAtoms():
        atom.SetAtomMapNum(0)
    try:
        work.UpdatePropertyCache(strict=False)
        return Chem.MolToSmiles(work)
    except Exception:
        return None


def set_chair_outcome(work: Chem.RWMol, outcome: Outcome, kept: Optional[set[int]] = None) -> list[int]:
    """Set a chair outcome's configuration on `work` at the elements it leaves unset (and, with
    `kept`, whose atoms no later step touched). Returns the atoms of the elements set."""
    centres, bonds = outcome
    changed = []
    for atom, tag, around in centres:
        if (kept is not None and atom not in kept) or work.GetAtomWithIdx(atom).GetChiralTag() != _UNSPECIFIED:
            continue
        now = tag_kept(tag, list(around), work, atom)
        if now is not None:
            work.GetAtomWithIdx(atom).SetChiralTag(now)
            changed.append(atom)
    for a, b, ref_a, ref_b, cis in bonds:
        bond = work.GetBondBetweenAtoms(a, b)
        if (kept is not None and not {a, b} <= kept) or bond is None or bond.GetStereo() != Chem.BondStereo.STEREONONE \
                or work.GetBondBetweenAtoms(a, ref_a) is None or work.GetBondBetweenAtoms(b, ref_b) is None:
            continue
        if bond.GetBeginAtomIdx() != a:
            ref_a, ref_b = ref_b, ref_a
        bond.SetStereoAtoms(ref_a, ref_b)
        bond.SetStereo(Chem.BondStereo.STEREOCIS if cis else Chem.BondStereo.STEREOTRANS)
        changed += [a, b]
    if changed:
        Chem.SetDoubleBondNeighborDirections(work)   # the / and \\ that SMILES writes the geometry with
    return changed


def chair_configured(mol: Chem.Mol, atom: int) -> bool:
    """Whether a [3,3] shift's chair set the configuration at `atom` (no later step touched it)."""
    return mol.GetAtomWithIdx(atom).HasProp(_CHAIR)


def without_chair_configuration(mol: Chem.Mol) -> Optional[Chem.Mol]:
    """A copy of `mol` with the configuration a chair set cleared (the centres, and the double
    bonds with both atoms marked); None when no chair set any."""
    marked = [i for i in range(mol.GetNumAtoms()) if chair_configured(mol, i)]
    if not marked:
        return None
    work = Chem.RWMol(mol)
    for i in marked:
        atom = work.GetAtomWithIdx(i)
        atom.SetChiralTag(_UNSPECIFIED)
        atom.ClearProp(_CHAIR)
        for bond in atom.GetBonds():
            if bond.GetStereo() != Chem.BondStereo.STEREONONE and bond.GetOtherAtomIdx(i) in marked:
                forget_configuration_of_bond(bond)
    return work.GetMol()


def _corner(k: int, flip: bool) -> tuple[float, float, float]:
    angle = math.pi * k / 3
    up = (k % 2 == 0) != flip
    return _RADIUS * math.cos(angle), _RADIUS * math.sin(angle), _PUCKER if up else -_PUCKER


def _slot(k: int, flip: bool, axial: bool) -> tuple[float, float, float]:
    """Where a group on ring corner k stands: axial (along the chair's axis, on the corner's side)
    or equatorial (outward, tilted a little the other way)."""
    x, y, z = _corner(k, flip)
    side = 1.0 if z > 0 else -1.0
    if axial:
        return x, y, z + _REACH * side
    out = math.hypot(x, y)
    return x + _REACH * 0.94 * x / out, y + _REACH * 0.94 * y / out, z - _REACH * 0.33 * side


def _groups(mol: Chem.Mol, atom: int, chain: list[int]) -> list[int]:
    return [n.GetIdx() for n in mol.GetAtomWithIdx(atom).GetNeighbors() if n.GetIdx() not in chain]


def _placed(k: int, flip: bool, groups: list[int], first_axial: bool) -> dict[int, tuple[float, float, float]]:
    """The groups of corner k (one or two; a hydrogen held as a count takes the other place) with
    the first axial or equatorial, the second in the other place."""
    slots = (True, False) if first_axial else (False, True)
    return {n: _slot(k, flip, axial) for n, axial in zip(groups, slots)}


def chair_outcomes(before: Chem.Mol, after: Chem.Mol, chain: list[int]) -> Optional[list[Outcome]]:
    """Each configuration the two chairs give the new centres (at a1, a6) and new double bonds
    (a2=a3, a4=a5), read by RDKit off a model of the chair (AssignStereochemistryFrom3D), so no
    convention of tag and bond order is ours. A configured a3 or a4 puts its groups where its tag
    says; a terminus written E or Z puts its group trans to the chain equatorial; each position
    left unconfigured is tried both ways. None when the array carries more groups than a chain
    of the kind has, or a model cannot be read."""
    corners = {}
    for k, atom in enumerate(chain):
        groups = _groups(before, atom, chain)
        if len(groups) > (1 if k in (1, 4) else 2):
            return None
        corners[k] = groups
    outcomes: list[Outcome] = []
    for flip in (False, True):
        place = {atom: _corner(k, flip) for k, atom in enumerate(chain)}
        for k in (1, 4):   # the middle atoms' groups point out of the ring
            x, y, z = _corner(k, flip)
            place.update({n: (1.75 * x, 1.75 * y, z) for n in corners[k]})
        options = []
        for k in (0, 2, 3, 5):
            if not corners[k]:
                continue
            first_axial = _set_by_configuration(before, chain, k, corners[k], place, flip)
            if first_axial is _UNREAD:
                return None
            options.append([(k, axial) for axial in ((True, False) if first_axial is None else (first_axial,))])
        for picked in product(*options):
            here = dict(place)
            for k, first_axial in picked:
                here.update(_placed(k, flip, corners[k], first_axial))
            read = _read_outcome(after, chain, here)
            if read is None:
                return None
            if read not in outcomes:
                outcomes.append(read)
    return outcomes


def _set_by_configuration(before: Chem.Mol, chain: list[int], k: int, groups: list[int], place, flip: bool):
    """Whether the first of the groups at corner k is axial, as the starting material's
    configuration sets it: at a terminus written E or Z the group trans to the chain is equatorial;
    at a configured a3 or a4 the tag decides. None when nothing is written there (either place
    is possible), _UNREAD when RDKit cannot read the tag off the model."""
    atom = chain[k]
    if k in (0, 5):
        inner, beyond = (chain[1], chain[2]) if k == 0 else (chain[4], chain[3])
        geometry = written_geometry(before, atom, inner)
        if geometry is None:
            return None
        first, second, cis = geometry
        if first not in groups:
            return None
        trans_to_chain = (second == beyond) != cis   # of `first`
        return (not trans_to_chain) if groups[0] == first else trans_to_chain
    tag = before.GetAtomWithIdx(atom).GetChiralTag()
    if tag == Chem.ChiralType.CHI_UNSPECIFIED:
        return None
    model = model_at(before, {**place, **_placed(k, flip, groups, True)})
    read = None if model is None else model.GetAtomWithIdx(atom).GetChiralTag()
    if read in (None, Chem.ChiralType.CHI_UNSPECIFIED):
        return _UNREAD
    return read == tag


def _read_outcome(after: Chem.Mol, chain: list[int], place) -> Optional[Outcome]:
    """(centres, double bonds) the product gets from the chair `place` holds: the tag of each new
    stereocentre at a1 and a6 (against its neighbours), read by RDKit off the model, and the
    geometry of each new stereogenic double bond a2=a3, a4=a5 against a1 (or a6) and a group of
    a3 (or a4), read off the torsion: the chair's groups stand 60 or 180 degrees round the bond,
    which RDKit's reading of a flat double bond does not take (it answered E for an axial group
    held beside an explicit hydrogen). None when RDKit cannot read the model."""
    model = model_at(after, place)
    if model is None:
        return None
    centres = []
    for atom in (chain[0], chain[5]):
        tag = model.GetAtomWithIdx(atom).GetChiralTag()
        if tag != Chem.ChiralType.CHI_UNSPECIFIED:
            centres.append((atom, tag, tuple(neighbours_round(model, atom))))
    bonds = []
    for end, a, b in ((chain[0], chain[1], chain[2]), (chain[5], chain[4], chain[3])):
        bond = model.GetBondBetweenAtoms(a, b)
        groups = _groups(after, b, chain)
        if bond is None or bond.GetStereo() == Chem.BondStereo.STEREONONE or not groups:
            continue   # RDKit finds the bond not stereogenic (two equal groups on an end)
        bonds.append((a, b, end, groups[0], _cis(*(place[i] for i in (end, a, b, groups[0])))))
    return tuple(centres), tuple(bonds)


def _cis(p0, p1, p2, p3) -> bool:
    """Whether p0 (on p1) and p3 (on p2) stand on one side of the bond p1-p2: the torsion
    p0-p1-p2-p3 under 90 degrees."""
    axis = [q - p for p, q in zip(p1, p2)]
    length = math.sqrt(sum(c * c for c in axis))
    axis = [c / length for c in axis]
    def across(start, tip):
        v = [t - s for s, t in zip(start, tip)]
        along = sum(c * u for c, u in zip(v, axis))
        return [c - along * u for c, u in zip(v, axis)]
    return sum(x * y for x, y in zip(across(p1, p0), across(p2, p3))) > 0


_SMALL_RING = 7   # up to here a ring's double bond is cis: RDKit writes no E/Z for it


def written_geometry(mol: Chem.Mol, a: int, b: int) -> Optional[tuple[int, int, bool]]:
    """(neighbour of a, neighbour of b, cis) for a double bond a=b written E or Z, else None. RDKit
    gives the geometry against one neighbour of each end, the bond's stereo atoms."""
    bond = mol.GetBondBetweenAtoms(a, b)
    if bond is None or bond.GetStereo() not in _CIS + _TRANS:
        return None
    first, second = bond.GetStereoAtoms()
    if bond.GetBeginAtomIdx() != a:
        first, second = second, first
    return first, second, bond.GetStereo() in _CIS


def _double_bond_geometry(mol: Chem.Mol, a: int, b: int, configured: bool) -> Optional[tuple[int, int, bool]]:
    """(neighbour of a, neighbour of b, cis) for the double bond a=b, or None when unknown."""
    written = written_geometry(mol, a, b) if configured else None
    if written is not None:
        return written
    path = _path_around(mol, a, b, _SMALL_RING - 1)
    if path is None:
        return None
    return path[1], path[-2], True


_CYCLIC_REACH = 4   # bonds between the two atoms a reagent adds through: a diene's ends are 3 apart


def _path_around(mol: Chem.Mol, a: int, b: int, most_bonds: int) -> Optional[list[int]]:
    """The atoms of the shortest path from a to b of at most `most_bonds` bonds not through the
    bond a-b itself: the ring it lies in (a state's ring information may not be set, and RDKit's
    shortest path would take the bond)."""
    return _shortest_path(mol, a, b, most_bonds, lambda atom, n: atom == a and n == b)


def _shortest_path(mol: Chem.Mol, start: int, goal: int, most_bonds: int,
                   blocked: Callable[[int, int], bool]) -> Optional[list[int]]:
    """The atoms of a shortest path from start to goal of at most `most_bonds` bonds that takes
    no step atom -> n for which `blocked(atom, n)` holds (breadth first); None when there is none."""
    came_from = {start: start}
    frontier = [start]
    for _ in range(most_bonds):
        following = []
        for atom in frontier:
            for neighbour in mol.GetAtomWithIdx(atom).GetNeighbors():
                n = neighbour.GetIdx()
                if n in came_from or blocked(atom, n):
                    continue
                came_from[n] = atom
                if n == goal:
                    path = [goal]
                    while path[-1] != start:
                        path.append(came_from[path[-1]])
                    return path[::-1]
                following.append(n)
        frontier = following
    return [start] if start == goal else None


def _set_syn_configuration(before: Chem.Mol, after: Chem.RWMol, a: int, b: int, x: int, y: int,
                           ref_a: int, ref_b: int, cis: bool) -> bool:
    """Chiral tags on a and b for x and y added to one face of the double bond a=b, whose
    neighbours ref_a and ref_b are cis or not. RDKit reads the tags off a model: the double bond
    and its substituents in a plane, x and y above it (AssignStereochemistryFrom3D), so no
    convention of tag and bond order is ours. Returns whether both got one."""
    place: dict[int, tuple[float, float, float]] = {a: (0.0, 0.0, 0.0), b: (1.5, 0.0, 0.0)}
    for end, reference, x_off, side in ((a, ref_a, -0.75, 1.0), (b, ref_b, 2.25, 1.0 if cis else -1.0)):
        for neighbour in before.GetAtomWithIdx(end).GetNeighbors():
            n = neighbour.GetIdx()
            if n not in (a, b):
                place[n] = (x_off, 1.3 * (side if n == reference else -side), 0.0)
    new = {x: (0.0, 0.0, 1.5), y: (1.5, 0.0, 1.5)} if x != y else {x: (0.75, 0.0, 1.3)}
    if set(new) & set(place):
        return False   # a partner already beside the double bond: not a plain addition to one face
    place.update(new)
    model = model_at(after, place)
    if model is None:
        return False   # RDKit cannot perceive an odd intermediate: the centres stay unconfigured
    tags = [model.GetAtomWithIdx(end).GetChiralTag() for end in (a, b)]
    if _UNSPECIFIED in tags:
        return False   # RDKit finds no stereocentre there (two equal groups)
    for end, tag in zip((a, b), tags):
        after.GetAtomWithIdx(end).SetChiralTag(tag)
    return True


def _eliminations(mol: Chem.Mol, changes: dict[Pair, tuple[int, int]], formed, broken
                  ) -> list[tuple[int, int, int, int, bool]]:
    """(a, b, p, q, syn) for each single bond a-b that the step makes double while a loses one
    single bond (to p, which one other atom takes) and b one (to q), nothing else changing at a or
    b, both a and b configured: a concerted 1,2-elimination. `syn` when the atom that takes p is
    joined to q within three bonds, not through b (the leaving group takes the hydrogen itself)."""
    out = []
    for (i, j), electrons in changes.items():
        if electrons != (2, 4) or len(broken.get(i, ())) != 1 or len(broken.get(j, ())) != 1:
            continue
        if broken[i][0] == broken[j][0] or any(set(key) & {i, j} and key not in
                                               ((i, j), _pair(i, broken[i][0]), _pair(j, broken[j][0]))
                                               for key in changes):
            continue
        if mol.GetAtomWithIdx(i).GetChiralTag() not in _TETRAHEDRAL or mol.GetAtomWithIdx(j).GetChiralTag() not in _TETRAHEDRAL:
            continue
        # a is the carbon whose group p another atom takes (a base takes the proton); q leaves b
        # with its pair.
        for a, b in ((i, j), (j, i)):
            p, q = broken[a][0], broken[b][0]
            takers = formed.get(p, [])
            if len(takers) == 1:
                syn = _shortest_path(mol, takers[0], q, 3, lambda atom, n: n == b) is not None
                out.append((a, b, p, q, syn))
                break
    return out


def _pair(i: int, j: int) -> Pair:
    return (i, j) if i < j else (j, i)


# A Newman projection along a -> b (x axis) of the eliminating bond, as coordinates: p on a points
# up (+z); q on b points down (anti) or up (syn); the other groups stand 120 degrees round.
_P = (-0.5, 0.0, 1.0)
_BESIDE_P = ((-0.5, -0.866, -0.5), (-0.5, 0.866, -0.5))
_Q_ANTI, _BESIDE_Q_ANTI = (2.0, 0.0, -1.0), ((2.0, 0.866, 0.5), (2.0, -0.866, 0.5))
_Q_SYN, _BESIDE_Q_SYN = (2.0, 0.0, 1.0), ((2.0, -0.866, -0.5), (2.0, 0.866, -0.5))


def _set_elimination_geometry(before: Chem.Mol, after: Chem.RWMol, a: int, b: int, p: int, q: int,
                              syn: bool) -> bool:
    """E/Z on the new double bond a=b of an elimination of p (from a) and q (from b), periplanar
    anti or syn. The groups of a and b are placed round the bond so that RDKit reads the written
    tags back off the model (AssignStereochemistryFrom3D); then, p and q gone, the groups fall
    into the plane of the double bond, and RDKit reads its geometry off that second model. No
    convention of tag and bond order is ours. Returns whether the bond got one."""
    q_at, beside_q = (_Q_SYN, _BESIDE_Q_SYN) if syn else (_Q_ANTI, _BESIDE_Q_ANTI)
    groups = {end: [n.GetIdx() for n in before.GetAtomWithIdx(end).GetNeighbors() if n.GetIdx() not in (a, b, p, q)]
              for end in (a, b)}
    slots = {a: _BESIDE_P, b: beside_q}
    place = {a: (0.0, 0.0, 0.0), b: (1.5, 0.0, 0.0), p: _P, q: q_at}
    for end in (a, b):
        place.update(zip(groups[end], slots[end]))
    read = _tags_read_off(before, place, (a, b))
    if read is None:
        return False
    for end, tag in zip((a, b), read):
        if tag != before.GetAtomWithIdx(end).GetChiralTag():   # the mirror image: the end's two slots swap
            place.update(zip(groups[end], slots[end][::-1]))
    flat = {i: (x, y, 0.0) for i, (x, y, _) in place.items() if i not in (p, q)}
    model = model_at(after, flat)
    if model is None:
        return False
    bond = model.GetBondBetweenAtoms(a, b)
    stereo = bond.GetStereo()
    if stereo not in _CIS + _TRANS:
        return False   # two equal groups at one end: no E or Z
    target = after.GetBondBetweenAtoms(a, b)
    target.SetStereoAtoms(*bond.GetStereoAtoms())
    # Held as cis or trans to the stereo atoms, which stays true whatever RDKit ranks them later.
    target.SetStereo(Chem.BondStereo.STEREOCIS if stereo in _CIS else Chem.BondStereo.STEREOTRANS)
    Chem.SetDoubleBondNeighborDirections(after)   # the / and \\ that SMILES writes the geometry with
    return True


def _tags_read_off(mol: Chem.Mol, place: dict[int, tuple[float, float, float]], atoms) -> Optional[list]:
    model = model_at(mol, place)
    if model is None:
        return None
    tags = [model.GetAtomWithIdx(i).GetChiralTag() for i in atoms]
    return None if _UNSPECIFIED in tags else tags


def model_at(mol: Chem.Mol, place: dict[int, tuple[float, float, float]]) -> Optional[Chem.Mol]:
    """A copy of `mol` with the atoms of `place` at those coordinates, its stereo read off them by
    RDKit; None when RDKit cannot perceive it. The rest stand far off, each at a point of its
    own: on one point, a reagent's other atoms (the oxo groups of OsO4) gave RDKit bonds of zero
    length to read."""
    model = Chem.Mol(mol)
    conformer = Chem.Conformer(model.GetNumAtoms())
    for i in range(model.GetNumAtoms()):
        conformer.SetAtomPosition(i, place.get(i, (50.0 + 3.0 * i, 40.0 + 1.7 * (i % 7), -30.0 - 2.3 * i)))
    model.RemoveAllConformers()
    model.AddConformer(conformer, assignId=True)
    try:
        model.UpdatePropertyCache(strict=False)
        Chem.AssignStereochemistryFrom3D(model, replaceExistingTags=True)
    except Exception:   # an odd intermediate RDKit cannot perceive
        return None
    return model


def forget_configuration(mol: Chem.RWMol, atoms: Iterable[int]) -> None:
    """Clear the configuration written at `atoms`: their chiral tags, and the E/Z of every double
    bond at them, with the / and \\ directions on that bond's neighbouring single bonds (RDKit
    would read the E/Z back from them) unless another configured double bond shares the bond."""
    for i in atoms:
        atom = mol.GetAtomWithIdx(i)
        if atom.GetChiralTag() != _UNSPECIFIED:
            atom.SetChiralTag(_UNSPECIFIED)
        for bond in atom.GetBonds():
            if bond.GetStereo() != Chem.BondStereo.STEREONONE:
                bond.SetStereo(Chem.BondStereo.STEREONONE)
                _clear_directions_beside(bond)


def forget_configuration_of_bond(double: Chem.Bond) -> None:
    """Clear one double bond's E/Z (and the / and \\ beside it that RDKit would read it back from)."""
    double.SetStereo(Chem.BondStereo.STEREONONE)
    _clear_directions_beside(double)


def _clear_directions_beside(double: Chem.Bond) -> None:
    for end in (double.GetBeginAtom(), double.GetEndAtom()):
        for single in end.GetBonds():
            if single.GetIdx() == double.GetIdx() or single.GetBondDir() not in _DIRECTED:
                continue
            other = single.GetOtherAtom(end)
            shared = any(b.GetStereo() != Chem.BondStereo.STEREONONE and b.GetIdx() != double.GetIdx()
                         for a in (end, other) for b in a.GetBonds() if b.GetIdx() != single.GetIdx())
            if not shared:
                single.SetBondDir(Chem.BondDir.NONE)


def substitute_configuration(before: Chem.Mol, after: Chem.RWMol, atom: int, leaving: int, entering: int,
                             invert: bool) -> None:
    """Carry the written configuration at `atom` across a step in which `entering` took the place
    of `leaving`, inverted or not. RDKit reads a chiral tag against the order of the atom's
    bonds, which removing one bond and adding another changes: the tag is flipped once for each
    odd reordering and once more for an inversion. Cleared when the neighbours do not match."""
    tag = before.GetAtomWithIdx(atom).GetChiralTag()
    target = after.GetAtomWithIdx(atom)
    expected = [entering if n == leaving else n for n in (b.GetOtherAtomIdx(atom) for b in before.GetAtomWithIdx(atom).GetBonds())]
    found = [b.GetOtherAtomIdx(atom) for b in target.GetBonds()]
    if tag not in _TETRAHEDRAL or sorted(expected) != sorted(found):
        target.SetChiralTag(_UNSPECIFIED)
        return
    if _odd_permutation(expected, found) != invert:
        tag = _TETRAHEDRAL[1] if tag == _TETRAHEDRAL[0] else _TETRAHEDRAL[0]
    target.SetChiralTag(tag)


def neighbours_round(mol: Chem.Mol, atom: int) -> list[int]:
    """The atom's neighbours in the order its chiral tag is read against, each hydrogen as -1:
    a proton taken and another put back leaves the same neighbours."""
    centre = mol.GetAtomWithIdx(atom)
    return [-1 if b.GetOtherAtom(centre).GetAtomicNum() == 1 else b.GetOtherAtomIdx(atom) for b in centre.GetBonds()]


def tag_kept(tag: Chem.ChiralType, before: list[int], mol: Chem.Mol, atom: int) -> Optional[Chem.ChiralType]:
    """The chiral tag `atom` of `mol` would carry had it kept the configuration `tag` held against
    the neighbours `before` (neighbours_round); None when its neighbours are others, or it has two
    hydrogens."""
    return _tag_against(tag, before, neighbours_round(mol, atom))


def _tag_against(tag: Chem.ChiralType, before: list, after: list) -> Optional[Chem.ChiralType]:
    """The tag read against the neighbours `after` that `tag` is against `before` (the same
    neighbours, each hydrogen -1, in another order); None when they are not the same or two are
    hydrogens."""
    if tag not in _TETRAHEDRAL or sorted(before) != sorted(after) or before.count(-1) > 1:
        return None
    if _odd_permutation(before, after):
        return _TETRAHEDRAL[1] if tag == _TETRAHEDRAL[0] else _TETRAHEDRAL[0]
    return tag


def _round_with_counted_hydrogens(mol: Chem.Mol, atom: int) -> list[int]:
    """neighbours_round, then -1 for each hydrogen held as a count: RDKit reads those last
    (checked on the tags it gives F[C@H](Cl)Br and its AddHs copy)."""
    try:
        counted = mol.GetAtomWithIdx(atom).GetTotalNumHs()
    except RuntimeError:   # an atom whose hydrogens RDKit has not counted: none held as a count
        counted = 0
    return neighbours_round(mol, atom) + [-1] * counted


def fill_in_configuration(target: Chem.RWMol, source: Chem.Mol, partner: Sequence[int]) -> bool:
    """Set on `target` the configuration `source` writes (chiral tags, double bonds E or Z) at each
    element `target` leaves unset; `partner[k]` is the atom of `target` that source atom k is (a
    substructure match of one constitution). A tag is carried against the order of the neighbours,
    a double bond as cis or trans to its stereo atoms. Returns whether any element was set."""
    changed = False
    for k in range(source.GetNumAtoms()):
        tag, centre = source.GetAtomWithIdx(k).GetChiralTag(), partner[k]
        if tag not in _TETRAHEDRAL or target.GetAtomWithIdx(centre).GetChiralTag() != _UNSPECIFIED:
            continue
        written = [n if n == -1 else partner[n] for n in _round_with_counted_hydrogens(source, k)]
        carried = _tag_against(tag, written, _round_with_counted_hydrogens(target, centre))
        if carried is not None:
            target.GetAtomWithIdx(centre).SetChiralTag(carried)
            changed = True
    set_bonds = False
    for bond in source.GetBonds():
        begin, end = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        geometry = written_geometry(source, begin, end)
        double = target.GetBondBetweenAtoms(partner[begin], partner[end])
        if geometry is None or double is None or double.GetStereo() != Chem.BondStereo.STEREONONE:
            continue
        first, second, cis = geometry
        ends = (partner[first], partner[second])
        double.SetStereoAtoms(*(ends if double.GetBeginAtomIdx() == partner[begin] else ends[::-1]))
        double.SetStereo(Chem.BondStereo.STEREOCIS if cis else Chem.BondStereo.STEREOTRANS)
        set_bonds = True
    if set_bonds:
        Chem.SetDoubleBondNeighborDirections(target)   # the / and \\ that SMILES writes the geometry with
    return changed or set_bonds


def _odd_permutation(first: list[int], second: list[int]) -> bool:
    """Whether `second` is an odd rearrangement of `first` (same distinct items)."""
    order = [first.index(x) for x in second]
    odd = False
    for i in range(len(order)):
        for j in range(i + 1, len(order)):
            odd ^= order[i] > order[j]
    return odd
