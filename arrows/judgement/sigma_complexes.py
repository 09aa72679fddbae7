"""The way back to an aromatic ring from a sigma complex (an arenium ion, a 2H-pyrrolium, a
3H-indolium): a base takes the proton on the sp3 ring carbon the electrophile bonded to, and that
C-H pair flows along the alternating single and double bonds to the atom that holds the cation (a
carbocation, or the far end of an iminium's or oxocarbenium's double bond), as in every textbook's
last step of an electrophilic aromatic substitution (common practice; Clayden, from memory).

A path is read off the state's own Kekulé form: the sp3 carbon first, then a single bond, a double
bond, a single bond... to the end atom, which takes the last pair (its formal charge drops by one).
RDKit's aromaticity perception judges whether the state the path leads to is aromatic there.
"""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..electrons import ElectronState, nameable

_LONGEST = 11   # atoms on a path: a six-membered ring and an exocyclic push (C4 ... C1=N7+) need 7


def sp3_carbon_with_hydrogen(state: ElectronState, atom: int) -> bool:
    """A neutral carbon with four single bonds (no lone pair) and at least one hydrogen."""
    if state.elements[atom] != 6 or state.bond_sums[atom] != 4 or state.nonbonding[atom] or state.formal_charge(atom):
        return False
    a = state.mol.GetAtomWithIdx(atom)
    return a.GetDegree() + a.GetNumExplicitHs() == 4 and (a.GetNumExplicitHs() > 0 or any(
        n.GetAtomicNum() == 1 for n in a.GetNeighbors()))


def _takes_the_last_pair(state: ElectronState, atom: int, by_double: bool, previous: int) -> bool:
    """Whether `atom`, reached from `previous` by a single (carbocation) or double bond (onium), is
    where the pair that started at the sp3 C-H ends: a carbocation (no lone pair, three bonds) at
    the end of a single bond; at the end of a double bond, a positive N, O or S (an iminium or
    oxocarbenium), or a neutral N or O whose partner is positive (an N-oxide's N+=O)."""
    charge = state.formal_charge(atom)
    if not by_double:
        return state.elements[atom] == 6 and charge == 1 and state.nonbonding[atom] == 0
    if state.elements[atom] not in (7, 8, 16):
        return False
    return charge == 1 or (charge == 0 and state.formal_charge(previous) == 1)


def paths_from(state: ElectronState, carbon: int) -> Iterator[tuple[int, ...]]:
    """Every path (carbon, a1, ..., end) that would carry the pair of `carbon`'s C-H to a cation:
    single bond first, then alternating. `carbon` is not checked here."""
    mol, elements = state.mol, state.elements
    stack = [(carbon, False, (carbon,))]   # (atom, whether the next bond is double, path so far)
    while stack:
        atom, double, path = stack.pop()
        if len(path) >= _LONGEST:
            continue
        for n in mol.GetAtomWithIdx(atom).GetNeighbors():
            k = n.GetIdx()
            if elements[k] == 1 or k in path or state.bond_electrons(atom, k) != (4 if double else 2):
                continue
            if _takes_the_last_pair(state, k, double, atom):
                yield path + (k,)
            else:
                stack.append((k, not double, path + (k,)))


def rearomatising_path(state: ElectronState, carbon: int) -> Optional[tuple[int, ...]]:
    """The shortest path from sp3 `carbon` (holding a hydrogen) to a cation of `state`, if any."""
    if not state.cations() or not sp3_carbon_with_hydrogen(state, carbon):
        return None
    return min(paths_from(state, carbon), key=len, default=None)


def rearomatising_path_to(state: ElectronState, cation: int) -> Optional[tuple[int, ...]]:
    """A path from an sp3 C-H carbon to `cation` (or to the far end of its double bond) whose
    proton, taken, makes that carbon aromatic (RDKit judging the state it leads to): the proton a
    sigma complex should lose. Searched from the sp3 carbons near the cation; read only when a hint
    is written."""
    mol = state.mol
    near = Chem.GetDistanceMatrix(mol)[cation]
    for carbon in sorted(range(mol.GetNumAtoms()), key=lambda k: near[k]):
        if near[carbon] >= _LONGEST:
            break
        if not sp3_carbon_with_hydrogen(state, carbon):
            continue
        for path in sorted(paths_from(state, carbon), key=len):
            ends = {path[-1], path[-2]} if state.bond_electrons(path[-2], path[-1]) == 4 else {path[-1]}
            if cation in ends and aromatic_once_lost(state, path):
                return path
    return None


def aromatic_once_lost(state: ElectronState, path: tuple[int, ...]) -> bool:
    """Whether RDKit perceives the path's sp3 carbon as aromatic once its proton is taken and the
    path's bonds are shifted (single to double and back, the end atom's charge one lower)."""
    mol = Chem.RWMol(state.mol)
    for a, b in zip(path, path[1:]):
        bond = mol.GetBondBetweenAtoms(a, b)
        bond.SetBondType(Chem.BondType.DOUBLE if bond.GetBondType() == Chem.BondType.SINGLE else Chem.BondType.SINGLE)
    end = mol.GetAtomWithIdx(path[-1])
    end.SetFormalCharge(end.GetFormalCharge() - 1)
    carbon = mol.GetAtomWithIdx(path[0])
    if carbon.GetNumExplicitHs():
        carbon.SetNumExplicitHs(carbon.GetNumExplicitHs() - 1)
    else:   # the hydrogen is an atom of the state: cut it off (left as a bare atom, outside any ring)
        h = next(n.GetIdx() for n in carbon.GetNeighbors() if n.GetAtomicNum() == 1)
        mol.RemoveBond(path[0], h)
        mol.GetAtomWithIdx(h).SetNoImplicit(True)
        mol.GetAtomWithIdx(h).SetNumRadicalElectrons(1)
    if Chem.SanitizeMol(mol, catchErrors=True) != Chem.SanitizeFlags.SANITIZE_NONE:
        return False
    return mol.GetAtomWithIdx(path[0]).GetIsAromatic()


def rearomatising_moves(state: ElectronState, path: tuple[int, ...], base: Optional[int]) -> Optional[str]:
    """The arrows that take the proton on the path's sp3 carbon and restore the ring, in the
    language (`:O9 -> H(C2)`, `C2-H -> C2=C3`, `C3=C4 -> C4=C5`, `N1=C5 -> N1`); None where an atom
    has no map number to name it. Without a `base`, the arrows after the base's."""
    mol, label = state.mol, state.label
    if not all(nameable(mol, k) for k in path) or (base is not None and not nameable(mol, base)):
        return None
    carbon = label(path[0])
    arrows = [f"`:{label(base)} -> H({carbon})`"] if base is not None else []
    arrows.append(f"`{carbon}-H -> {carbon}={label(path[1])}`")
    last = len(path) - 1
    for i in range(1, last, 2):   # the double bonds path[i]=path[i+1]
        a, b = label(path[i]), label(path[i + 1])
        arrows.append(f"`{a}={b} -> {b}`" if i + 1 == last else f"`{a}={b} -> {b}={label(path[i + 2])}`")
    return ", ".join(arrows)
