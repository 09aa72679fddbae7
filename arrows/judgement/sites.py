"""Reactive sites of one species for polar ring closures under basic (enolate) or acidic (enol)
conditions: where a nucleophile can form, and which atoms accept it.

Nucleophiles: alpha carbons that carry a hydrogen next to a carbonyl or nitrile (or are already
an enolate), hydroxyl and alkoxide oxygens, carboxylates (towards alkyl leaving groups only),
amine nitrogens. Electrophiles: carbonyl carbons
(aldehyde, ketone, ester, amide), nitrile carbons, beta carbons of alpha,beta-unsaturated carbonyls
and nitriles, sp3 carbons bearing a halide or sulfonate leaving group, the carbons of an epoxide,
aziridine or halonium ion. Works on any sanitized Mol; indices are the Mol's own.
"""
from __future__ import annotations

from functools import lru_cache
from typing import Optional

from rdkit import Chem

from .baldwin import THREE_RING_HETEROATOMS, geometry_of
from ..model import frozen

ENOLATE, NITRILE_ANION, OXYGEN, CARBOXYLATE, NITROGEN = "enolate", "nitrile anion", "oxygen", "carboxylate", "amine"

# Electrophile kinds, best first. Carbonyls: aldehyde > ketone > ester > amide (common practice).
# Where conjugate acceptors and alkyl leaving groups sit among them is our own heuristic: an enone
# beta carbon with the ketones (the conjugate adduct is the one that stays), alkylation after them.
# A three-membered ring opened at a carbon ranks with the alkyl leaving groups, a nitrile with the
# amides (the weakest carbonyl-like acceptor: the Thorpe-Ziegler closure needs a strong base;
# common practice).
ALDEHYDE, KETONE, CONJUGATE, ALKYL, ESTER, AMIDE, NITRILE = (
    "aldehyde", "ketone", "enone beta carbon", "alkyl leaving group", "ester", "amide", "nitrile")
EPOXIDE, AZIRIDINE, THIIRANE, HALONIUM = "epoxide", "aziridine", "thiirane", "halonium ion"
THREE_RING_KINDS = {8: EPOXIDE, 7: AZIRIDINE, 16: THIIRANE, 17: HALONIUM, 35: HALONIUM, 53: HALONIUM}
# Kinds whose bond to the attacked carbon breaks as the nucleophile arrives (a displacement).
DISPLACED = frozenset({ALKYL, *THREE_RING_KINDS.values()})
ELECTROPHILE_RANK = {ALDEHYDE: 0, KETONE: 1, CONJUGATE: 1, ALKYL: 2, ESTER: 3, AMIDE: 4, NITRILE: 4,
                     **{kind: 2 for kind in THREE_RING_KINDS.values()}}
NUCLEOPHILE_RANK = {ENOLATE: 0, NITRILE_ANION: 0, OXYGEN: 1, CARBOXYLATE: 1, NITROGEN: 2}


@frozen
class Nucleophile:
    atom: int
    kind: str
    ready: bool = False                       # already an anion or enol: needs no deprotonation
    partners: tuple[tuple[int, int], ...] = ()  # (carbonyl or nitrile carbon, its O or N) it conjugates with
    has_hydrogen: bool = False

    @property
    def via(self) -> str:
        return {ENOLATE: "enolate (base) or enol (acid)", NITRILE_ANION: "nitrile anion (base)",
                OXYGEN: "alkoxide (base) or hydroxyl (acid)", CARBOXYLATE: "carboxylate (base)",
                NITROGEN: "amine lone pair"}[self.kind]


@frozen
class Electrophile:
    atom: int
    kind: str
    broken_partner: int                  # far atom of the bond that breaks when it is attacked
    geometry: str
    relay: tuple[int, ...] = ()          # conjugate acceptors: (alpha C, carbonyl C, carbonyl O or nitrile N)
    leaving_group: Optional[int] = None  # esters: the alkoxy oxygen that leaves after addition
    bridge: Optional[int] = None         # a three-membered ring's other carbon (baldwin.three_ring_bridge)

    @property
    def rank(self) -> int:
        return ELECTROPHILE_RANK[self.kind]


@lru_cache(maxsize=None)
def _smarts(text: str) -> Chem.Mol:
    return Chem.MolFromSmarts(text)


def _matches(mol: Chem.Mol, smarts: str) -> list[tuple[int, ...]]:
    return list(mol.GetSubstructMatches(_smarts(smarts), uniquify=False))


_CARBONYL_NOT_ACID = "[CX3;!$(C-[OX2H1]);!$(C-[OX1-]);!$(C-[F,Cl,Br,I])]=[OX1]"


def nucleophiles(mol: Chem.Mol) -> list[Nucleophile]:
    partners: dict[int, set[tuple[int, int]]] = {}
    kinds: dict[int, str] = {}
    ready: set[int] = set()
    for alpha, carbon, oxygen in _matches(mol, f"[CX4;!H0]-{_CARBONYL_NOT_ACID}"):
        partners.setdefault(alpha, set()).add((carbon, oxygen))
        kinds[alpha] = ENOLATE
    for alpha, carbon, nitrogen in _matches(mol, "[CX4;!H0]-[CX2]#[NX1]"):
        partners.setdefault(alpha, set()).add((carbon, nitrogen))
        kinds.setdefault(alpha, NITRILE_ANION)
    # Enolates and enols already formed, and carbanions drawn next to a carbonyl; an enolate drawn
    # toward one carbonyl of a 1,3-dicarbonyl is conjugated with the other too (one anion).
    for alpha, carbon, oxygen in _matches(mol, "[#6X3]=[#6X3]-[OX1-,OX2H1]") + _matches(
            mol, f"[#6-;!$([#6]=*)]-{_CARBONYL_NOT_ACID}") + _matches(
            mol, f"[#6X3;$([#6]=[#6X3]-[OX1-,OX2H1])]-{_CARBONYL_NOT_ACID}"):
        partners.setdefault(alpha, set()).add((carbon, oxygen))
        kinds[alpha] = ENOLATE
        ready.add(alpha)
    found = [Nucleophile(a, kinds[a], a in ready, tuple(sorted(p))) for a, p in partners.items()]
    hydroxyl = "[OX2H1,OX1-;$(O-[CX4]),$(O-c);!$(O-[#6]=*)]"
    found += [Nucleophile(m[0], OXYGEN, mol.GetAtomWithIdx(m[0]).GetFormalCharge() < 0) for m in _matches(mol, hydroxyl)]
    found += [Nucleophile(m[0], CARBOXYLATE, mol.GetAtomWithIdx(m[0]).GetFormalCharge() < 0)
              for m in _matches(mol, "[OX2H1,OX1-]-[CX3]=[OX1]")]
    amine = "[NX3;+0;!$(N-[#6,#16]=[O,S,N]);!$(N-a);!$(N-[#6]#*)]"
    found += [Nucleophile(m[0], NITROGEN, True, has_hydrogen=mol.GetAtomWithIdx(m[0]).GetTotalNumHs() > 0)
              for m in _matches(mol, amine)]
    return sorted(set(found), key=lambda n: n.atom)


def electrophiles(mol: Chem.Mol) -> list[Electrophile]:
    found: dict[int, Electrophile] = {}
    # The carbonyl of an enolate written as a carbanion holds the charge: it accepts no nucleophile.
    enolate_carbonyls = {m[1] for m in _matches(mol, "[#6-]-[CX3]=[OX1]")}

    def add(atom: int, kind: str, partner: int, **extra) -> None:
        if atom in enolate_carbonyls:
            return
        if atom not in found or ELECTROPHILE_RANK[kind] < found[atom].rank:
            found[atom] = Electrophile(atom, kind, partner, geometry_of(mol, atom), **extra)

    for c, o in _matches(mol, "[CX3H2,CX3H1;!$(C-[O,N,S,F,Cl,Br,I])]=[OX1]"):
        add(c, ALDEHYDE, o)
    for c, o in _matches(mol, "[CX3;$(C(-[#6])-[#6])]=[OX1]"):
        add(c, KETONE, o)
    for c, o, alkoxy, _ in _matches(mol, "[CX3;$(C-[#6,#1])](=[OX1])-[OX2]-[#6]"):
        add(c, ESTER, o, leaving_group=alkoxy)
    for c, o, _ in _matches(mol, "[CX3](=[OX1])-[NX3]"):
        add(c, AMIDE, o)
    for beta, alpha, carbon, acceptor in _matches(
            mol, "[CX3;!$(C-[OX2,OX1-,NX3])]=[CX3]-[CX3]=[OX1]") + _matches(mol, "[CX3;!$(C-[OX2,OX1-,NX3])]=[CX3]-[CX2]#[NX1]"):
        add(beta, CONJUGATE, alpha, relay=(alpha, carbon, acceptor))
    for c, n in _matches(mol, "[CX2;$(C-[#6])]#[NX1]"):
        add(c, NITRILE, n)
    # An epoxide, aziridine or halonium ion: each carbon, its bond to the heteroatom breaking (before
    # the alkyl halides, which a halonium's carbons would match too).
    for ring in mol.GetRingInfo().AtomRings():
        if len(ring) != 3:
            continue
        hetero = [i for i in ring if mol.GetAtomWithIdx(i).GetAtomicNum() in THREE_RING_HETEROATOMS]
        carbons = [i for i in ring if mol.GetAtomWithIdx(i).GetAtomicNum() == 6]
        if len(hetero) == 1 and len(carbons) == 2:
            kind = THREE_RING_KINDS[mol.GetAtomWithIdx(hetero[0]).GetAtomicNum()]
            for c, other in ((carbons[0], carbons[1]), (carbons[1], carbons[0])):
                add(c, kind, hetero[0], bridge=other)
    for c, leaving in _matches(mol, "[CX4]-[Cl,Br,I]") + [m[:2] for m in _matches(mol, "[CX4]-[OX2]-[SX4](=O)(=O)")]:
        add(c, ALKYL, leaving)
    return sorted(found.values(), key=lambda e: e.atom)
