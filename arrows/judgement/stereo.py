"""Stereo elements of a state, which a step makes or removes, how many stereoisomers a product
can have, and how two stereo-specified structures relate.

RDKit decides what is stereogenic (Chem.FindPotentialStereo) and enumerates stereoisomers
(EnumerateStereoisomers). Perception runs on a copy without atom maps and hydrogen atoms, so that
a map number or an explicit hydrogen never makes two equal substituents look different; results
are reported with the state's own atom indices.
"""
from __future__ import annotations

from dataclasses import dataclass
from itertools import combinations
from typing import Iterable, Optional

from rdkit import Chem

CENTRE, DOUBLE_BOND = "stereocentre", "stereogenic double bond"
_ORIGINAL = "arrows_index"


@dataclass(frozen=True, order=True)
class StereoElement:
    kind: str
    atoms: tuple[int, ...]     # (centre,) or the two atoms of the double bond, ascending


def _plain(mol: Chem.Mol, clear_stereo_on: Iterable[int] = ()) -> Optional[Chem.Mol]:
    """Copy without maps and hydrogen atoms; each atom remembers its index in `mol`."""
    work = Chem.RWMol(mol)
    clear = set(clear_stereo_on)
    for atom in work.GetAtoms():
        atom.SetAtomMapNum(0)
        atom.SetIntProp(_ORIGINAL, atom.GetIdx())
        if atom.GetIdx() in clear:
            atom.SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
    for bond in work.GetBonds():
        if bond.GetBeginAtomIdx() in clear or bond.GetEndAtomIdx() in clear:
            bond.SetStereo(Chem.BondStereo.STEREONONE)
    try:
        plain = Chem.RemoveHs(work.GetMol(), sanitize=False)
        Chem.SanitizeMol(plain)
    except Exception:   # an intermediate RDKit will not perceive: report nothing rather than guess
        return None
    return plain


def stereo_elements(mol: Chem.Mol) -> frozenset[StereoElement]:
    plain = _plain(mol)
    if plain is None:
        return frozenset()
    original = [a.GetIntProp(_ORIGINAL) for a in plain.GetAtoms()]
    ranks = list(Chem.CanonicalRankAtoms(plain, breakTies=False))
    found = set()
    for info in Chem.FindPotentialStereo(plain, cleanIt=True):
        if info.type == Chem.StereoType.Atom_Tetrahedral:
            found.add(StereoElement(CENTRE, (original[info.centeredOn],)))
        elif info.type == Chem.StereoType.Bond_Double:
            bond = plain.GetBondWithIdx(info.centeredOn)
            if not all(_distinct_ends(plain, ranks, a, bond.GetOtherAtomIdx(a))
                       for a in (bond.GetBeginAtomIdx(), bond.GetEndAtomIdx())):
                continue
            ends = sorted((original[bond.GetBeginAtomIdx()], original[bond.GetEndAtomIdx()]))
            found.add(StereoElement(DOUBLE_BOND, tuple(ends)))
    return frozenset(found)


def _distinct_ends(mol: Chem.Mol, ranks: list[int], atom: int, partner: int) -> bool:
    """An end of a stereogenic double bond carries two different substituents, or one (the other
    place taken by a lone pair, as on an imine nitrogen). RDKit also offers C=O+H with two equal
    groups on carbon (RDKit 2026.09); this filter drops those."""
    a = mol.GetAtomWithIdx(atom)
    others = [ranks[n.GetIdx()] for n in a.GetNeighbors() if n.GetIdx() != partner] + [-1] * a.GetTotalNumHs()
    return len(others) == 1 or len(set(others)) == len(others)


def stereo_changes(before: Chem.Mol, after: Chem.Mol) -> tuple[list[StereoElement], list[StereoElement]]:
    """(made, lost) between two states of one mechanism (atom indices are shared)."""
    old, new = stereo_elements(before), stereo_elements(after)
    return sorted(new - old), sorted(old - new)


def stereoisomer_count(mol: Chem.Mol, uncontrolled: Iterable[int] = ()) -> int:
    """How many stereoisomers of `mol` (one fragment) are possible when the configuration of
    every unspecified element, and of every element at an atom in `uncontrolled`, is left open.
    Meso forms and other coincidences count once (RDKit's unique enumeration)."""
    plain = _plain(mol, uncontrolled)
    if plain is None:
        return 1
    # Imported here: the module pulls in RDKit's embedding code and numpy (~0.1 s), which the
    # start-up of `arrows check` should pay only when a product has stereo elements to count.
    from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions
    options = StereoEnumerationOptions(onlyUnassigned=True, unique=True, tryEmbedding=False)
    return sum(1 for _ in EnumerateStereoisomers(plain, options=options))


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


def has_specified_stereo(smiles: str) -> bool:
    mol = Chem.MolFromSmiles(smiles)
    return mol is not None and any(info.specified == Chem.StereoSpecified.Specified
                                   for info in Chem.FindPotentialStereo(mol))


def relation(first: str, second: str) -> str:
    """How two SMILES relate: identical, enantiomers, diastereomers, constitutional isomers..."""
    a, b = Chem.MolFromSmiles(first), Chem.MolFromSmiles(second)
    if a is None or b is None:
        raise ValueError("RDKit cannot read one of the SMILES")
    if Chem.MolToSmiles(a, isomericSmiles=False) != Chem.MolToSmiles(b, isomericSmiles=False):
        from rdkit.Chem.rdMolDescriptors import CalcMolFormula
        return CONSTITUTIONAL if CalcMolFormula(a) == CalcMolFormula(b) else UNRELATED
    if not (has_specified_stereo(first) and has_specified_stereo(second)):
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
