"""Stereo elements of a state, which a step makes or removes, how many stereoisomers a product
can have, and how two stereo-specified structures relate.

RDKit decides what is stereogenic (Chem.FindPotentialStereo) and enumerates stereoisomers
(EnumerateStereoisomers). Perception runs on a copy without atom maps and hydrogen atoms, so that
a map number or an explicit hydrogen never makes two equal substituents look different; results
are reported with the state's own atom indices.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from itertools import combinations, product
from typing import Iterable, Optional, Sequence

from rdkit import Chem

from ..configuration import turned_over
from ..electrons import ElectronState
from ..rdkit_io import fragment, potential_stereo
from .perception import Perceived, RecentViews, perceive

CENTRE, DOUBLE_BOND = "stereocentre", "stereogenic double bond"


@dataclass(frozen=True, order=True)
class StereoElement:
    kind: str
    atoms: tuple[int, ...]     # (centre,) or the two atoms of the double bond, ascending


def _plain(mol: Chem.Mol, clear_stereo_on: Iterable[int] = ()) -> tuple[Optional[Chem.Mol], tuple[int, ...]]:
    """A perceived copy without hydrogen atoms and, for each of its atoms, the index in `mol`;
    (None, ()) when RDKit will not perceive it whole."""
    view = perceive(mol, clear_stereo_on)
    return (view.mol, view.original) if view.complete else (None, ())


def stereo_elements(mol: Chem.Mol, view: Optional[Perceived] = None) -> frozenset[StereoElement]:
    """The stereocentres and stereogenic double bonds of a state; `view` is its perceived view
    when the caller has it already."""
    view = perceive(mol) if view is None else view
    if "stereo" not in view.memo:
        view.memo["stereo"] = _elements(view) if view.complete else frozenset()
    return view.memo["stereo"]


def state_stereo(state: ElectronState, views: Optional[RecentViews] = None) -> frozenset[StereoElement]:
    """stereo_elements of a state, found once per state: the stereo check finds them for every
    state it meets, and the drawing of those states (wedges) asks again. `views`, the perceived
    views of the states met lately, when the caller keeps them."""
    found = state.judged.get("stereo")
    if found is None:
        found = state.judged["stereo"] = stereo_elements(state.mol, views.of(state) if views is not None else None)
    return found


def _elements(view: Perceived) -> frozenset[StereoElement]:
    plain, original = view.mol, view.original
    ranked: list[list[int]] = []     # ranked only when an end's two substituents are alike
    def ranks() -> list[int]:
        if not ranked:
            ranked.append(list(Chem.CanonicalRankAtoms(plain, breakTies=False, includeAtomMaps=False)))
        return ranked[0]
    found = set()
    for info in potential_stereo(plain):
        if info.type == Chem.StereoType.Atom_Tetrahedral:
            # RDKit offers an atom of the third period with four implicit hydrogens ([SiH4],
            # [PH4+], [AlH4-]); two equal substituents never make a stereocentre. Nor does an
            # ammonium N-H: it trades its proton with the medium, and the free amine inverts, so
            # chemists do not count it (common practice; a quaternary N+ with four groups is kept).
            centre = plain.GetAtomWithIdx(info.centeredOn)
            hydrogens = centre.GetTotalNumHs()
            if hydrogens < 2 and not (hydrogens and centre.GetAtomicNum() == 7) \
                    and not _three_alike(plain, ranks, info.centeredOn):
                found.add(StereoElement(CENTRE, (original[info.centeredOn],)))
        elif info.type == Chem.StereoType.Bond_Double:
            bond = plain.GetBondWithIdx(info.centeredOn)
            if _cumulated(bond.GetBeginAtom()) or _cumulated(bond.GetEndAtom()):
                continue
            if not all(_distinct_ends(plain, ranks, a, bond.GetOtherAtomIdx(a))
                       for a in (bond.GetBeginAtomIdx(), bond.GetEndAtomIdx())):
                continue
            if _exchangeable_end(bond.GetBeginAtom()) or _exchangeable_end(bond.GetEndAtom()):
                continue
            ends = sorted((original[bond.GetBeginAtomIdx()], original[bond.GetEndAtomIdx()]))
            found.add(StereoElement(DOUBLE_BOND, tuple(ends)))
    centres = [e for e in found if e.kind == CENTRE]
    if centres:
        lost = _lost_by_resonance(plain, [view.position(e.atoms[0]) for e in centres])
        found -= {e for e in centres if view.position(e.atoms[0]) in lost}
    found -= _without_stereoisomers(plain, view, [e for e in found if e.kind == CENTRE], found, ranks)
    return frozenset(found)


def _cumulated(atom: Chem.Atom) -> bool:
    """A double-bond end that is straight (sp): a second double bond or a triple bond on it, as in
    an isocyanate R-N=C=O, a ketene, an azide or an allene. Its partner's substituents lie on the
    axis, so the bond has no E and Z (common practice); an allene's axial chirality is not
    reported either."""
    orders = [b.GetBondTypeAsDouble() for b in atom.GetBonds()]
    return orders.count(2.0) >= 2 or 3.0 in orders


def _three_alike(mol: Chem.Mol, ranks, centre: int) -> bool:
    """Whether three neighbours of `centre` are alike by RDKit's symmetry classes (the cage
    carbons at a nitrogen of DABCO): three equal substituents never make a stereocentre."""
    neighbours = mol.GetAtomWithIdx(centre).GetNeighbors()
    kinds = [(n.GetAtomicNum(), n.GetDegree()) for n in neighbours]
    if max((kinds.count(k) for k in kinds), default=0) < 3:
        return False   # fewer than three of one element and degree: no ranks needed
    rank = ranks()
    classes = [rank[n.GetIdx()] for n in neighbours]
    return max(classes.count(c) for c in classes) >= 3


def _exchangeable_end(atom: Chem.Atom) -> bool:
    """A double-bond end whose only substituent is a hydrogen on a heteroatom (C=OH+ of a
    protonated carbonyl, C=NH of an imine or iminium): its E and Z forms interconvert by proton
    exchange, so the bond is not stereogenic in practice (common practice)."""
    return atom.GetAtomicNum() not in (6, 1) and atom.GetDegree() == 1 and atom.GetTotalNumHs() >= 1


def _without_stereoisomers(plain: Chem.Mol, view: Perceived, centres: list[StereoElement],
                           found: set[StereoElement], ranks) -> set[StereoElement]:
    """The elements of a fragment that has only one stereoisomer after all. RDKit offers a ring
    carbon with two equal ring branches as possibly stereogenic (right for cis- and
    trans-1,4-dimethylcyclohexane, wrong for the Meisenheimer complex of an aromatic substitution,
    whose sp3 carbon has no partner across the ring). Only fragments with such a centre, two of
    whose neighbours RDKit ranks alike, are enumerated (stereoisomer_count): one isomer means none
    of the fragment's elements is stereogenic."""
    if not centres:
        return set()
    suspects = []
    for e in centres:
        position = view.position(e.atoms[0])
        neighbours = plain.GetAtomWithIdx(position).GetNeighbors()
        # RDKit's symmetry classes refine element and degree: neighbours that differ in those are
        # never ranked alike, and the ranks need not be asked for.
        kinds = {(n.GetAtomicNum(), n.GetDegree()) for n in neighbours}
        if len(kinds) == len(neighbours):
            continue
        rank = ranks()
        classes = {rank[n.GetIdx()] for n in neighbours}
        if len(classes) < len(neighbours):
            suspects.append(position)
    dropped: set[StereoElement] = set()
    if not suspects:
        return dropped
    for indices in Chem.GetMolFrags(plain, asMols=False, sanitizeFrags=False):
        if not set(indices) & set(suspects):
            continue
        if stereoisomer_count(fragment(plain, indices)) == 1:
            members = {view.original[i] for i in indices}
            dropped |= {e for e in found if e.atoms[0] in members}
    return dropped


def _may_delocalize(mol: Chem.Mol) -> bool:
    # Atoms by index, as they are needed (most charged states show a charge early): RDKit's Python
    # atom iterator costs several calls per atom.
    atoms = map(mol.GetAtomWithIdx, range(mol.GetNumAtoms()))
    return any(a.GetFormalCharge() or a.GetNumRadicalElectrons() for a in atoms)


_MAX_RESONANCE = 64


def _lost_by_resonance(mol: Chem.Mol, centres: list[int]) -> set[int]:
    """The centres (indices in `mol`) that are not stereocentres in some resonance structure of a
    charged or radical state. In the sigma complex of an aromatic substitution the sp3 carbon
    looks stereogenic with the charge drawn next to it, but the charge is shared by the two ring
    carbons beside it and the one across, and a nitro group there (textbook resonance, common
    practice): in that structure its two ring branches are the same. Only centres with two
    unsaturated or charged neighbours are tested; for the others no charge can move between
    their branches."""
    def unsaturated(atom) -> bool:
        return (atom.GetFormalCharge() != 0 or atom.GetNumRadicalElectrons() > 0 or atom.GetIsAromatic()
                or any(b.GetBondTypeAsDouble() > 1 for b in atom.GetBonds()))
    def tested_centre(centre: int) -> bool:   # two unsaturated neighbours: the rest need not be read
        found = 0
        for n in mol.GetAtomWithIdx(centre).GetNeighbors():
            if unsaturated(n):
                found += 1
                if found == 2:
                    return True
        return False
    tested = [c for c in centres if tested_centre(c)]
    if not tested or not _may_delocalize(mol):
        return set()
    lost: set[int] = set()
    try:
        structures = list(Chem.ResonanceMolSupplier(mol, 0, _MAX_RESONANCE))
    except Exception:   # RDKit cannot enumerate an odd intermediate: keep what it perceived
        return lost
    for structure in structures:
        if structure is None:
            continue
        work = Chem.Mol(structure)
        try:
            Chem.SanitizeMol(work)
        except Exception:   # a structure RDKit will not perceive says nothing either way
            continue
        here = {info.centeredOn for info in potential_stereo(work)
                if info.type == Chem.StereoType.Atom_Tetrahedral}
        lost |= {c for c in tested if c not in here}
        # RDKit still offers a ring carbon whose two ring branches the structure makes equal (the
        # charge moved across the ring, onto the nitro group): one stereoisomer says it is none.
        ranks: list[list[int]] = []
        for c in tested:
            if c in lost:
                continue
            if not ranks:
                ranks.append(list(Chem.CanonicalRankAtoms(work, breakTies=False, includeAtomMaps=False)))
            classes = [ranks[0][n.GetIdx()] for n in work.GetAtomWithIdx(c).GetNeighbors()]
            if len(set(classes)) < len(classes):
                piece = next(f for f in Chem.GetMolFrags(work, asMols=False, sanitizeFrags=False) if c in f)
                if stereoisomer_count(fragment(work, piece)) == 1:
                    lost.add(c)
    return lost


def _distinct_ends(mol: Chem.Mol, ranks, atom: int, partner: int) -> bool:
    """An end of a stereogenic double bond carries two different substituents, or one (the other
    place taken by a lone pair, as on an imine nitrogen). RDKit also offers C=O+H with two equal
    groups on carbon (RDKit 2026.09); this filter drops those. `ranks()` gives RDKit's symmetry
    ranks, asked for only when two substituents are of one element."""
    a = mol.GetAtomWithIdx(atom)
    neighbours = [n for n in a.GetNeighbors() if n.GetIdx() != partner]
    hydrogens = a.GetTotalNumHs()
    if len(neighbours) + hydrogens <= 1:
        return True
    if hydrogens > 1:
        return False
    elements = [n.GetAtomicNum() for n in neighbours] + [1] * hydrogens
    if len(set(elements)) == len(elements):
        return True     # different elements cannot be equal groups
    rank = ranks()
    others = [rank[n.GetIdx()] for n in neighbours] + [-1] * hydrogens
    return len(set(others)) == len(others)


MAX_ENUMERATED = 12     # stereo elements; beyond that the count is the upper bound 2**n


def stereoisomer_count(mol: Chem.Mol, uncontrolled: Iterable[int] = (),
                       turning: Sequence[Sequence[int]] = ()) -> Optional[int]:
    """How many stereoisomers of `mol` (one fragment) are possible: len(stereoisomers(...)), or past
    MAX_ENUMERATED open elements the upper bound 2**n; None when RDKit cannot perceive `mol` or
    refuses an assignment."""
    found, too_many = _enumerated(mol, uncontrolled, turning)
    if found is not None:
        return len(found)
    return None if too_many is None else 2 ** too_many


def stereoisomers(mol: Chem.Mol, uncontrolled: Iterable[int] = (),
                  turning: Sequence[Sequence[int]] = ()) -> Optional[frozenset[str]]:
    """The canonical SMILES (no map numbers) of each stereoisomer stereoisomer_count counts; None
    when it gives an upper bound or no count."""
    return _enumerated(mol, uncontrolled, turning)[0]


def _enumerated(mol: Chem.Mol, uncontrolled: Iterable[int],
                turning: Sequence[Sequence[int]]) -> tuple[Optional[frozenset[str]], Optional[int]]:
    """(the stereoisomers of `mol`, None); (None, the number of open elements) past MAX_ENUMERATED;
    (None, None) when RDKit cannot perceive or assign them. The stereoisomers of `mol` (one
    fragment) possible when the configuration of every unspecified element, and of every element
    at an atom in `uncontrolled`, is left open, and each group of centres in `turning` (configured
    relative to each other only: a Diels-Alder diene's ends, endo or exo open) may be inverted as one.

    Every assignment of the open elements is cleaned up by RDKit's stereo perception (which drops
    the descriptors an assignment makes meaningless: meso and pseudo-asymmetric cases) and written
    as canonical SMILES; the distinct strings are counted. This is what RDKit's EnumerateStereoisomers does with
    unique=True; doing it here spares `arrows check` that module's import of RDKit's embedding
    code and numpy (about 0.3 s of start-up). tests/test_stereo.py holds the two to the same counts.
    """
    plain, original = _plain(mol, uncontrolled)
    if plain is None:
        return None, None     # RDKit cannot perceive this structure: the count is unknown
    position = {old: new for new, old in enumerate(original)}
    groups = [[position[i] for i in group if i in position] for group in turning]
    for i in range(plain.GetNumAtoms()):   # map numbers would keep mirror-image duplicates apart
        plain.GetAtomWithIdx(i).SetAtomMapNum(0)
    ranks = list(Chem.CanonicalRankAtoms(plain, breakTies=False))
    open_elements = [info for info in potential_stereo(plain)
                     if info.specified != Chem.StereoSpecified.Specified
                     and ((info.type == Chem.StereoType.Atom_Tetrahedral
                           and not _three_alike(plain, lambda: ranks, info.centeredOn))
                          or (info.type == Chem.StereoType.Bond_Double and _stereogenic_bond(plain, ranks, info)))]
    if len(open_elements) > MAX_ENUMERATED:
        return None, len(open_elements)
    written = set()
    for bits in product((False, True), repeat=len(open_elements) + len(groups)):
        work = Chem.RWMol(plain)
        for group, turn in zip(groups, bits[len(open_elements):]):
            if turn:
                work = Chem.RWMol(turned_over(work, group))
        try:
            for info, bit in zip(open_elements, bits):
                _assign(work, info, bit)
            # RDKit's clean-up drops the descriptors this assignment makes meaningless (meso and
            # pseudo-asymmetric cases); double bonds need their neighbour directions to survive it.
            Chem.SetDoubleBondNeighborDirections(work)
            work.ClearComputedProps(includeRings=False)
            Chem.AssignStereochemistry(work, cleanIt=True, force=True, flagPossibleStereoCenters=True)
            written.add(Chem.MolToSmiles(work))
        except Exception:   # RDKit refuses an assignment of an odd intermediate: unknown, not a guess
            return None, None
    if any(info.type == Chem.StereoType.Atom_Tetrahedral for info in open_elements) and _bridged(plain):
        written = {smiles for smiles in written if _embeds(smiles)}
    return frozenset(written), None


def _bridged(mol: Chem.Mol) -> bool:
    """Whether two of the smallest rings share more than one bond (a bicyclo[2.2.1] system: fused
    rings share one)."""
    rings = [set(ring) for ring in Chem.GetSymmSSSR(mol)]
    return any(len(a & b) > 2 for a, b in combinations(rings, 2))


@lru_cache(maxsize=256)
def _embeds(smiles: str) -> bool:
    """Whether RDKit's distance geometry finds 3D coordinates for this stereoisomer. A bridged
    ring ties its bridgeheads' configurations together: an assignment it cannot hold (one
    bridgehead of a norbornane inverted) has no coordinates, and is no stereoisomer (as RDKit's
    EnumerateStereoisomers judges with tryEmbedding). Remembered: each state of a mechanism asks
    again about the same product (an embedding costs some 10-40 ms)."""
    from rdkit.Chem import rdDistGeom   # loads numpy: only ever asked for bridged rings
    params = rdDistGeom.ETKDGv3()
    params.randomSeed = 2718   # a fixed seed: the same answer on every run
    params.maxIterations = 10
    return rdDistGeom.EmbedMolecule(Chem.AddHs(Chem.MolFromSmiles(smiles)), params) == 0


def _stereogenic_bond(mol: Chem.Mol, ranks: list[int], info) -> bool:
    """A double bond whose configuration can be written: both ends carry a heavy neighbour to
    refer to (a C=CH- end with only a hydrogen and a lone pair cannot be, as in RDKit's own
    enumeration) and two different substituents."""
    bond = mol.GetBondWithIdx(info.centeredOn)
    a, b = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
    if mol.GetAtomWithIdx(a).GetDegree() < 2 or mol.GetAtomWithIdx(b).GetDegree() < 2:
        return False
    if _cumulated(bond.GetBeginAtom()) or _cumulated(bond.GetEndAtom()):
        return False
    return _distinct_ends(mol, lambda: ranks, a, b) and _distinct_ends(mol, lambda: ranks, b, a)


def _assign(mol: Chem.RWMol, info, bit: bool) -> None:
    if info.type == Chem.StereoType.Atom_Tetrahedral:
        mol.GetAtomWithIdx(info.centeredOn).SetChiralTag(
            Chem.ChiralType.CHI_TETRAHEDRAL_CW if bit else Chem.ChiralType.CHI_TETRAHEDRAL_CCW)
        return
    bond = mol.GetBondWithIdx(info.centeredOn)
    a, b = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
    ref_a = next(n.GetIdx() for n in mol.GetAtomWithIdx(a).GetNeighbors() if n.GetIdx() != b)
    ref_b = next(n.GetIdx() for n in mol.GetAtomWithIdx(b).GetNeighbors() if n.GetIdx() != a)
    bond.SetStereoAtoms(ref_a, ref_b)
    bond.SetStereo(Chem.BondStereo.STEREOCIS if bit else Chem.BondStereo.STEREOTRANS)


def describe(element: StereoElement, label) -> str:
    if element.kind == CENTRE:
        return label(element.atoms[0])
    return f"{label(element.atoms[0])}={label(element.atoms[1])}"


# Relations between two structures written with stereo descriptors.
IDENTICAL, ENANTIOMERS, DIASTEREOMERS = "identical", "enantiomers", "diastereomers"
CONSTITUTIONAL, UNRELATED, UNSPECIFIED = "constitutional isomers", "different compounds", "stereo not specified"


def _mirror(mol: Chem.Mol) -> Chem.Mol:
    out = Chem.Mol(mol)
    swap = {Chem.ChiralType.CHI_TETRAHEDRAL_CW: Chem.ChiralType.CHI_TETRAHEDRAL_CCW,
            Chem.ChiralType.CHI_TETRAHEDRAL_CCW: Chem.ChiralType.CHI_TETRAHEDRAL_CW}
    for atom in out.GetAtoms():
        atom.SetChiralTag(swap.get(atom.GetChiralTag(), atom.GetChiralTag()))
    return out


def is_chiral(smiles: str) -> bool:
    """Whether the structure differs from its mirror image (RDKit canonical SMILES of both): a meso
    compound, or one with no configured centre, is not."""
    mol = Chem.MolFromSmiles(smiles)
    return mol is not None and Chem.MolToSmiles(mol) != Chem.MolToSmiles(_mirror(mol))


def has_specified_stereo(smiles: str) -> bool:
    mol = Chem.MolFromSmiles(smiles)
    return mol is not None and _specified(mol)


def _specified(mol: Chem.Mol) -> bool:
    """Whether some stereo element of `mol` is specified (read without changing `mol`)."""
    return any(info.specified == Chem.StereoSpecified.Specified for info in potential_stereo(mol, clean=False))


def relation(first: str, second: str) -> str:
    """How two SMILES relate: identical, enantiomers, diastereomers, constitutional isomers..."""
    a, b = Chem.MolFromSmiles(first), Chem.MolFromSmiles(second)
    if a is None or b is None:
        raise ValueError("RDKit cannot read one of the SMILES")
    if Chem.MolToSmiles(a, isomericSmiles=False) != Chem.MolToSmiles(b, isomericSmiles=False):
        from rdkit.Chem.rdMolDescriptors import CalcMolFormula
        return CONSTITUTIONAL if CalcMolFormula(a) == CalcMolFormula(b) else UNRELATED
    if not (_specified(a) and _specified(b)):   # the Mols has_specified_stereo would read again
        return UNSPECIFIED
    if Chem.MolToSmiles(a) == Chem.MolToSmiles(b):
        return IDENTICAL
    if Chem.MolToSmiles(_mirror(a)) == Chem.MolToSmiles(b):
        return ENANTIOMERS
    return DIASTEREOMERS


def pairwise_relations(smiles: Iterable[str]) -> list[tuple[str, str, str]]:
    """Relations between every two stereo-specified structures of one constitution."""
    written = [s for s in dict.fromkeys(smiles) if has_specified_stereo(s)]
    out = []
    for a, b in combinations(written, 2):
        r = relation(a, b)
        if r in (IDENTICAL, ENANTIOMERS, DIASTEREOMERS):
            out.append((a, b, r))
    return out


def cip_labels(mol: Chem.Mol, atoms: Iterable[int]) -> dict[int, str]:
    """RDKit's CIP label (R or S, or a double bond's) of each of `atoms` that has one in `mol`;
    none when RDKit cannot label the state. Read for the drawing's --cip labels and for
    `arrows trace --stereo`."""
    codes = cip_codes(mol)
    return {i: codes[("atom", i)] for i in atoms if ("atom", i) in codes}


def cip_codes(mol: Chem.Mol) -> dict[tuple, str]:
    """RDKit's CIP labels of `mol` (a sanitized copy): ("atom", i) -> R or S, ("bond", i, j) -> E
    or Z; none when RDKit cannot label it (an odd intermediate)."""
    from rdkit.Chem import rdCIPLabeler
    work = Chem.Mol(mol)
    try:
        Chem.SanitizeMol(work)
        Chem.AssignStereochemistry(work, cleanIt=True, force=True)
        rdCIPLabeler.AssignCIPLabels(work)
    except Exception:   # an odd intermediate: nothing said about its configuration
        return {}
    out = {("atom", a.GetIdx()): a.GetProp("_CIPCode") for a in work.GetAtoms() if a.HasProp("_CIPCode")}
    out.update({("bond", b.GetBeginAtomIdx(), b.GetEndAtomIdx()): b.GetProp("_CIPCode")
                for b in work.GetBonds() if b.HasProp("_CIPCode")})
    return out
