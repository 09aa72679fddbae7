"""Baldwin's rules for ring closure, as data and a pure classifier.

A closure is named n-[(enolendo|enolexo)-]exo|endo-tet|trig|dig:
- n, the size of the ring in the transition state (the shortest path between the two atoms
  that bond, counted in atoms, before the step);
- exo when the bond that breaks at the attacked atom leads out of the new ring, endo when it
  lies inside it;
- tet, trig, dig: the attacked atom is sp3, sp2 or sp before the step;
- enolendo / enolexo (enolate carbon nucleophiles only): both enolate carbons end up in the new
  ring, or only the nucleophilic one. An anion shared with two carbonyls (a beta-keto ester's C2, a
  malonate) is one enolate whichever resonance form is drawn: enolexo when either carbonyl carbon
  stays outside the ring (see enol_partner).

A closure that opens a three-membered ring (an epoxide, an aziridine, a halonium ion) is named, as
chemists name it, by that ring's C-C bond: exo when the nucleophile takes the near carbon, endo
when it takes the far one and both ring carbons end up in the new ring. (By the broken bond alone
both would be exo.) Baldwin 1976 places epoxides between tet and trig; the endo opening of a plain
epoxide loses to the exo opening one ring smaller (K. C. Nicolaou et al., J. Am. Chem. Soc. 1989,
111, 5330, "6-endo vs 5-exo hydroxy epoxide openings"; memory).

Tables: J. E. Baldwin, J. Chem. Soc., Chem. Commun. 1976, 734 (memory); J. E. Baldwin and
M. J. Lusch, Tetrahedron 1982, 38, 2939 (memory). A cell the papers do not state is "not covered".
"""
from __future__ import annotations

from typing import Optional, Sequence

from rdkit import Chem
from ..model import frozen

TET, TRIG, DIG = "tet", "trig", "dig"
EXO, ENDO = "exo", "endo"
ENOLENDO, ENOLEXO = "enolendo", "enolexo"

BALDWIN_1976 = "Baldwin 1976"
BALDWIN_LUSCH_1982 = "Baldwin-Lusch 1982"
NICOLAOU_1989 = "Nicolaou 1989"
CITATIONS = {
    BALDWIN_1976: "J. E. Baldwin, J. Chem. Soc., Chem. Commun. 1976, 734",
    BALDWIN_LUSCH_1982: "J. E. Baldwin and M. J. Lusch, Tetrahedron 1982, 38, 2939",
    NICOLAOU_1989: "K. C. Nicolaou, C. V. C. Prasad, P. K. Somers and C.-K. Hwang, J. Am. Chem. Soc. 1989, 111, 5330",
}


def _cells(favoured: Sequence[int] = (), disfavoured: Sequence[int] = ()) -> dict[int, bool]:
    return {**{n: True for n in favoured}, **{n: False for n in disfavoured}}


# (geometry, mode) -> {ring size: favoured?}. Baldwin 1976 (memory).
RULES_1976: dict[tuple[str, str], dict[int, bool]] = {
    (TET, EXO): _cells(favoured=range(3, 8)),
    (TET, ENDO): _cells(disfavoured=(5, 6)),
    (TRIG, EXO): _cells(favoured=range(3, 8)),
    (TRIG, ENDO): _cells(favoured=(6, 7), disfavoured=(3, 4, 5)),
    (DIG, EXO): _cells(favoured=(5, 6, 7), disfavoured=(3, 4)),
    (DIG, ENDO): _cells(favoured=range(3, 8)),
}

# (enol, geometry, mode) -> {ring size: favoured?}. Baldwin-Lusch 1982 (memory).
RULES_ENOLATE_1982: dict[tuple[str, str, str], dict[int, bool]] = {
    (ENOLENDO, TET, EXO): _cells(favoured=(6, 7), disfavoured=(3, 4, 5)),
    (ENOLEXO, TET, EXO): _cells(favoured=range(3, 8)),
    (ENOLENDO, TRIG, EXO): _cells(favoured=(6, 7), disfavoured=(3, 4, 5)),
    (ENOLEXO, TRIG, EXO): _cells(favoured=range(3, 8)),
}

# Endo openings of a three-membered ring -> {ring size: favoured?}: the exo opening at the near
# carbon, one ring smaller, wins where it closes a five- or six-membered ring (Nicolaou 1989, memory,
# for 5-exo against 6-endo; 6-exo against 7-endo the same, memory). A 5-endo opening's rival is a
# strained four-membered ring (an oxetane): not decided here.
RULES_THREE_RING_ENDO: dict[int, bool] = _cells(disfavoured=(6, 7))

# The atoms whose bond to a carbon of a three-membered ring breaks when a nucleophile opens it: an
# epoxide's O, an aziridine's N, an episulfonium's S, a halonium's halogen.
THREE_RING_HETEROATOMS = frozenset({7, 8, 16, 17, 35, 53})


@frozen
class ClosureClass:
    size: int
    geometry: str
    mode: Optional[str] = None      # None: no bond breaks at the attacked atom (a cation is attacked)
    enol: Optional[str] = None      # enolendo / enolexo for enolate carbon nucleophiles
    three_ring: bool = False        # opens a three-membered ring: mode named by its C-C bond

    @property
    def name(self) -> str:
        enol = f"({self.enol})-" if self.enol else ""
        mode = f"{self.mode}-" if self.mode else ""
        return f"{self.size}-{enol}{mode}{self.geometry}"


@frozen
class Verdict:
    favoured: Optional[bool]        # None: the rules say nothing about this class
    rule: Optional[str] = None      # BALDWIN_1976 or BALDWIN_LUSCH_1982

    @property
    def word(self) -> str:
        return {True: "favoured", False: "disfavoured", None: "not covered"}[self.favoured]


def verdict(closure: ClosureClass) -> Verdict:
    """Baldwin-Lusch for enolate classes that paper states, else Baldwin 1976 for the plain class."""
    if closure.mode is None:
        return Verdict(None)
    if closure.three_ring and closure.mode == ENDO:
        cells = RULES_THREE_RING_ENDO
        return Verdict(cells[closure.size], NICOLAOU_1989) if closure.size in cells else Verdict(None)
    if closure.enol:
        cells = RULES_ENOLATE_1982.get((closure.enol, closure.geometry, closure.mode), {})
        if closure.size in cells:
            return Verdict(cells[closure.size], BALDWIN_LUSCH_1982)
    cells = RULES_1976.get((closure.geometry, closure.mode), {})
    if closure.size in cells:
        return Verdict(cells[closure.size], BALDWIN_1976)
    return Verdict(None)


def classify(ring_path: Sequence[int], geometry: str, broken_partner: Optional[int] = None,
             enol_partner: Optional[int] = None, bridge: Optional[int] = None) -> ClosureClass:
    """The class of a closure from its ring (the atoms from nucleophile to attacked atom), the
    geometry of the attacked atom, the far atom of the bond that breaks at the attacked atom, for
    an enolate carbon the other enolate carbon, and for the opening of a three-membered ring its
    other carbon (`bridge`, see three_ring_bridge)."""
    ring = set(ring_path)
    mode = None if broken_partner is None else (ENDO if broken_partner in ring else EXO)
    enol = None if enol_partner is None else (ENOLENDO if enol_partner in ring else ENOLEXO)
    three_ring = bridge is not None and mode == EXO
    if three_ring:
        mode = ENDO if bridge in ring else EXO
    return ClosureClass(len(ring_path), geometry, mode, enol, three_ring)


def enol_partner(partners: Sequence[int], ring: Sequence[int]) -> Optional[int]:
    """The enolate carbon that names a closure's class, from every carbon the nucleophile's charge
    is shared with (the drawn C=C partner and each carbonyl carbon beside it): the first one outside
    the new ring, else the first. Baldwin-Lusch 1982 name the class by the enolate's C=C (memory);
    a doubly stabilised anion can put that C=C toward its exocyclic carbonyl, and such anions close
    five-membered rings readily (common practice: Knoevenagel and malonate cyclisations)."""
    outside = [p for p in partners if p not in ring]
    return (outside or list(partners) or [None])[0]


def three_ring_bridge(mol: Chem.Mol, attacked: int, broken_partner: Optional[int]) -> Optional[int]:
    """The other carbon of the three-membered ring whose bond attacked-broken_partner breaks (an
    epoxide's, aziridine's or halonium ion's second carbon), when the attacked atom is a carbon and
    the broken partner one of THREE_RING_HETEROATOMS; else None."""
    if broken_partner is None or mol.GetBondBetweenAtoms(attacked, broken_partner) is None \
            or mol.GetAtomWithIdx(attacked).GetAtomicNum() != 6 \
            or mol.GetAtomWithIdx(broken_partner).GetAtomicNum() not in THREE_RING_HETEROATOMS:
        return None
    shared = sorted({n.GetIdx() for n in mol.GetAtomWithIdx(attacked).GetNeighbors()}
                    & {n.GetIdx() for n in mol.GetAtomWithIdx(broken_partner).GetNeighbors()})
    return next((i for i in shared if mol.GetAtomWithIdx(i).GetAtomicNum() == 6), None)


def geometry_of(mol: Chem.Mol, atom: int) -> str:
    """tet, trig or dig from the pi bonds of an atom (a cation with no pi bond is trigonal)."""
    a = mol.GetAtomWithIdx(atom)
    pi = sum(int(b.GetBondTypeAsDouble()) - 1 for b in a.GetBonds() if b.GetBondTypeAsDouble() >= 2)
    if pi >= 2:
        return DIG
    if pi == 1:
        return TRIG
    if a.GetFormalCharge() > 0 and a.GetAtomicNum() == 6 and a.GetDegree() + a.GetTotalNumHs() == 3:
        return TRIG
    return TET


def ring_path(mol: Chem.Mol, first: int, second: int) -> tuple[int, ...]:
    """Atoms on the shortest path between two atoms (both ends included); () if not joined."""
    return tuple(Chem.GetShortestPath(mol, first, second)) if first != second else ()
