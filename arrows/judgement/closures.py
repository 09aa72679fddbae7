"""Every intramolecular polar closure one species could make, classified by Baldwin's rules and
ranked.

Ranking (common practice, stated in the shared references): five- and six-membered closures
outcompete three- and four-membered ones; an aldehyde is a better electrophile than a ketone
(then ester, then amide). Within that, Baldwin-favoured before disfavoured, carbon nucleophiles
(enolates) before oxygen and nitrogen, a product the base drives on (an aldol that dehydrates, a
beta-keto ester left with a hydrogen between its carbonyls) before one it does not, the more
acidic alpha hydrogen first; remaining ties by canonical atom rank, so the order does not depend
on how the SMILES is written.

Some closures cannot form at all and are kept apart (`barred`): a new ring that takes two or more
bonds of one aromatic ring (a cyclophane), a triple bond in a new ring under eight atoms, a C=C
that would be trans in a ring of eight atoms or fewer (a double bond written E inside the new
ring; a bridgehead alkene, Bredt's rule).
"""
from __future__ import annotations

from dataclasses import field, replace
from typing import Optional

from rdkit import Chem

from .acidity import acidity_of, perceived
from .baldwin import ENDO, ClosureClass, Verdict, classify, enol_partner, ring_path, verdict
from .sites import (ALDEHYDE, AMIDE, CARBOXYLATE, DISPLACED, ENOLATE, ESTER, KETONE, NITRILE, NITRILE_ANION,
                    NITROGEN, NUCLEOPHILE_RANK, Electrophile, Nucleophile, electrophiles, nucleophiles)
from ..model import frozen

FAVOURED, DISFAVOURED, NOT_COVERED = "favoured", "disfavoured", "not covered"

# No closure leaves a C=C trans in a ring of this many atoms or fewer: trans-cyclooctene, the
# smallest isolable trans-cycloalkene, is strained and made by other routes (common practice,
# memory); a bridgehead alkene of a small bicycle is the same strain (Bredt's rule:
# bicyclo[3.3.1]non-1-ene's C=C is trans in its eight-membered ring).
TRANS_RING_MAX = 8
ALKYNE_RING_MIN = 8      # cyclooctyne is the smallest isolable cycloalkyne (common practice, memory)


@frozen
class Closure:
    nucleophile: Nucleophile
    electrophile: Electrophile
    ring: tuple[int, ...]                # atoms of the new ring, nucleophile first
    enol_partner: Optional[int]          # the enolate carbon paired with the nucleophile, if any
    closure: ClosureClass
    verdict: Verdict
    outlook: str                         # favoured / disfavoured / not covered, all things counted
    reason: str
    nucleophile_pka: Optional[float] = None
    equivalent: tuple[tuple[int, int], ...] = field(default=())   # symmetry-equivalent (nucleophile, electrophile)
    driven: bool = False                 # the base pulls it on: an aldol dehydrates, a beta-keto ester loses a proton
    barred: Optional[str] = None         # why the closure cannot form at all, if it cannot
    order: tuple[int, int] = (0, 0)      # canonical ranks of nucleophile and electrophile: the last tie-break

    @property
    def size(self) -> int:
        return self.closure.size

    @property
    def tier(self) -> int:
        """0 favoured 5/6, 1 favoured 7, 2 small rings closed by a displacement Baldwin favours (an
        irreversible step: 5-chloropentan-2-one's enolate closes the cyclopropane, not the
        disfavoured 5-(enolendo) ring), 3 disfavoured 5/6, 4 other 7, 5 other small rings (an aldol
        onto a small ring is undone, and the five-membered ring wins), 6 larger rings."""
        if self.size in (5, 6):
            return 0 if self.outlook == FAVOURED else 3
        if self.size == 7:
            return 1 if self.outlook == FAVOURED else 4
        if self.size in (3, 4):
            return 2 if self.verdict.favoured and self.closure.geometry == "tet" else 5
        return 6

    def rank_key(self) -> tuple:
        pka = self.nucleophile_pka if self.nucleophile_pka is not None else 99.0
        return (self.tier, self.electrophile.rank, NUCLEOPHILE_RANK[self.nucleophile.kind], not self.driven, pka,
                self.size, self.order)


def judge(closure: ClosureClass) -> tuple[Verdict, str, str]:
    """Baldwin's verdict, the overall outlook and the reason in words."""
    v = verdict(closure)
    if closure.size in (3, 4) and v.favoured and closure.geometry == "tet":
        return v, FAVOURED, (f"{closure.size}-membered ring: strained, but closed by a displacement {v.rule} "
                             f"favours, which a five- or six-membered closure the rules forbid does not outrun "
                             f"(common practice: cyclopropanes from 4-halo ketones)")
    if closure.size in (3, 4):
        return v, DISFAVOURED, (f"{closure.size}-membered ring: strained; five- and six-membered closures "
                                f"outcompete it (common practice)")
    opened = ""
    if closure.three_ring and closure.mode == ENDO:
        opened = (f" (the three-membered ring opened at its far carbon; the {closure.size - 1}-exo opening at "
                  f"the near one is the usual rival)")
    if v.favoured is None:
        return v, NOT_COVERED, f"Baldwin's rules do not cover {closure.name}{opened}"
    return v, FAVOURED if v.favoured else DISFAVOURED, f"{v.rule}: {closure.name} {v.word}{opened}"


def closure_between(mol: Chem.Mol, nu: Nucleophile, el: Electrophile) -> Optional[ClosureClass]:
    path = ring_path(mol, nu.atom, el.atom)
    if len(path) < 3:
        return None
    enol_partner = _enol_partner(nu, path)
    return classify(path, el.geometry, el.broken_partner, enol_partner, el.bridge)


def _enol_partner(nu: Nucleophile, path: tuple[int, ...]) -> Optional[int]:
    """The enolate carbon paired with the nucleophilic one; with two (a 1,3-dicarbonyl), the one
    outside the ring when there is one (baldwin.enol_partner)."""
    if nu.kind != ENOLATE or not nu.partners:
        return None
    return enol_partner([c for c, _ in nu.partners], path)


def _compatible(nu: Nucleophile, el: Electrophile) -> bool:
    # Forming the enolate consumes the carbonyl it conjugates with, as a carbonyl or as the end of
    # an enone; a tertiary amine cannot lose a proton to finish an addition to a carbonyl.
    used = {c for c, _ in nu.partners}
    if el.atom in used or (el.relay and el.relay[1] in used):
        return False
    if nu.kind == CARBOXYLATE and el.kind not in DISPLACED:
        return False    # a carboxylate adds to a carbonyl only to fall off again (common practice)
    return not (nu.kind == NITROGEN and el.kind not in DISPLACED and not nu.has_hydrogen)


def find_closures(mol: Chem.Mol, max_ring: int = 7) -> list[Closure]:
    """The closures of one species (a sanitized Mol) that can form, best first; symmetry-equivalent
    pairs are folded into the first one's `equivalent`."""
    return [c for c in candidate_closures(mol, max_ring) if c.barred is None]


def candidate_closures(mol: Chem.Mol, max_ring: int = 7) -> list[Closure]:
    """Every closure between the sites of one species, those that cannot form (`barred`) too, best
    first, symmetry-equivalent pairs folded."""
    work = perceived(mol)
    plain = Chem.Mol(work)
    for atom in plain.GetAtoms():
        atom.SetAtomMapNum(0)
    ranks = list(Chem.CanonicalRankAtoms(plain))
    substrate = _Substrate(work)
    sites = nucleophiles(work)
    # A species already an anion takes no base: a second deprotonation would make a dianion.
    anions = [nu for nu in sites if nu.ready and any(
        work.GetAtomWithIdx(i).GetFormalCharge() < 0 for i in (nu.atom, *(acceptor for _, acceptor in nu.partners)))]
    candidates: list[Closure] = []
    for nu in anions or sites:
        acid = acidity_of(work, nu.atom) if not nu.ready else None
        for el in electrophiles(work):
            if nu.atom == el.atom or work.GetBondBetweenAtoms(nu.atom, el.atom) or not _compatible(nu, el):
                continue
            path = ring_path(work, nu.atom, el.atom)
            if not 3 <= len(path) <= max_ring:
                continue
            partner = _enol_partner(nu, path)
            closure = classify(path, el.geometry, el.broken_partner, partner, el.bridge)
            v, outlook, reason = judge(closure)
            driven, stays = substrate.driven(nu, el, path)
            candidates.append(Closure(nu, el, path, partner, closure, v, outlook, reason + stays,
                                      acid.pka if acid else None, driven=driven,
                                      barred=substrate.barred(nu, el, path), order=(ranks[nu.atom], ranks[el.atom])))
    candidates.sort(key=Closure.rank_key)
    return _fold_symmetric(plain, candidates)


class _Substrate:
    """The heavy-atom graph of one species, its double and triple bonds and their written geometry,
    for what a closure would do to them."""

    def __init__(self, work: Chem.Mol):
        self.work = work
        self.adjacency = {a.GetIdx(): {n.GetIdx() for n in a.GetNeighbors() if n.GetAtomicNum() > 1}
                          for a in work.GetAtoms() if a.GetAtomicNum() > 1}
        self.pi = {frozenset((b.GetBeginAtomIdx(), b.GetEndAtomIdx())): int(b.GetBondTypeAsDouble())
                   for b in work.GetBonds() if b.GetBondType() in (Chem.BondType.DOUBLE, Chem.BondType.TRIPLE)}
        self.written = _written_geometry(work)
        # Strain the species already holds (as drawn) is not the closure's doing.
        self.strained = {bond for bond, order in self.pi.items() if order == 2 and _trans_ring(
            self.adjacency, *sorted(bond), self.written.get(bond)) is not None}

    def barred(self, nu: Nucleophile, el: Electrophile, path: tuple[int, ...]) -> Optional[str]:
        """Why the ring cannot close at all, or None."""
        work = self.work
        bonds = {work.GetBondBetweenAtoms(a, b).GetIdx() for a, b in zip(path, path[1:])}
        for ring in work.GetRingInfo().BondRings():
            if len(bonds.intersection(ring)) >= 2 and all(work.GetBondWithIdx(i).GetIsAromatic() for i in ring):
                return ("the new ring bridges an aromatic ring (a cyclophane): the arene cannot bend to close it "
                        "(common practice)")
        strain = self.strain(nu, el, path, dehydrated=False)
        return None if strain is None else f"the closure would leave {strain}"

    def driven(self, nu: Nucleophile, el: Electrophile, path: tuple[int, ...]) -> tuple[bool, str]:
        """Whether the base drives the product on, and why an aldol that could dehydrate does not."""
        if nu.kind not in (ENOLATE, NITRILE_ANION):
            return False, ""
        # The hydrogen left on the nucleophilic carbon after the addition: the one the base takes next.
        left = self.work.GetAtomWithIdx(nu.atom).GetTotalNumHs() - (0 if nu.ready else 1)
        if el.kind == ESTER:
            return left > 0, ""    # textbook Dieckmann (memory): the beta-keto ester's anion pulls the equilibrium
        if nu.kind != ENOLATE or el.kind not in (ALDEHYDE, KETONE) or left < 1:
            return False, ""
        strain = self.strain(nu, el, path, dehydrated=True)
        return (True, "") if strain is None else (False, f"; stays an aldol: its dehydration would make {strain}")

    def strain(self, nu: Nucleophile, el: Electrophile, path: tuple[int, ...], dehydrated: bool) -> Optional[str]:
        """In words, a triple bond the closure leaves in a new ring under ALKYNE_RING_MIN atoms, or a
        C=C it leaves trans in a ring of TRANS_RING_MAX atoms or fewer (with the E1cB dehydration of
        an aldol if `dehydrated`); else None."""
        adjacency = {atom: set(neighbours) for atom, neighbours in self.adjacency.items()}
        pi = dict(self.pi)
        pi.pop(frozenset((el.atom, el.broken_partner)), None)      # the carbonyl or enone pi bond taken
        for carbon, _ in nu.partners:
            pi.pop(frozenset((nu.atom, carbon)), None)             # an enol's C=C, used up
        for gone in (el.broken_partner if el.kind in DISPLACED else None, el.leaving_group):
            if gone is not None:
                adjacency[el.atom].discard(gone)
                adjacency[gone].discard(el.atom)
        adjacency[nu.atom].add(el.atom)
        adjacency[el.atom].add(nu.atom)
        if dehydrated:
            pi[frozenset((nu.atom, el.atom))] = 2
        for bond, order in pi.items():
            if order == 3 and bond <= set(path) and len(path) < ALKYNE_RING_MIN:
                return (f"a triple bond in {_ring(len(path))} (cyclooctyne is the smallest isolable cycloalkyne: "
                        f"common practice, memory)")
            if order == 2 and bond not in self.strained:
                size = _trans_ring(adjacency, *sorted(bond), self.written.get(bond))
                if size is not None:
                    return (f"a C=C trans in {_ring(size)} (trans-cyclooctene is the smallest isolable "
                            f"trans-cycloalkene: common practice, memory; at a bridgehead, Bredt's rule)")
        return None


def _ring(size: int) -> str:
    return f"{'an' if size in (8, 11) else 'a'} {size}-membered ring"


def _trans_ring(adjacency: dict[int, set[int]], u: int, v: int, written: Optional[tuple[int, int, int, bool]]
                ) -> Optional[int]:
    """The size of the ring (of at most TRANS_RING_MAX atoms) that would hold the double bond u=v
    trans, or None. A ring through p-u=v-q holds p and q cis; two such rings that ask opposite
    geometries put it trans in the larger, and a geometry written with / and \\ (`written`, see
    _written_geometry) fixes it."""
    ends_u, ends_v = sorted(adjacency[u] - {v}), sorted(adjacency[v] - {u})
    if not ends_u or not ends_v:
        return None
    # Geometry as one flag: are the first substituents of u and v cis?
    asked: dict[bool, int] = {}
    for p in ends_u:
        for q in ends_v:
            size = _ring_through(adjacency, p, q, {u, v})
            if size is not None:
                cis = (p == ends_u[0]) == (q == ends_v[0])
                asked[cis] = min(size, asked.get(cis, size))
    if len(asked) == 2:
        return max(asked.values())
    if written is not None and asked:
        begin, p, q, trans = written
        if begin != u:
            p, q = q, p
        cis = ((p == ends_u[0]) == (q == ends_v[0])) != trans
        return asked.get(not cis)
    return None


def _ring_through(adjacency: dict[int, set[int]], p: int, q: int, bond: set[int]) -> Optional[int]:
    """Atoms in the smallest ring through p, the two atoms of `bond` and q (at most TRANS_RING_MAX), or None."""
    seen, frontier, atoms = {p}, {p}, 1
    while frontier and atoms + 2 <= TRANS_RING_MAX:
        if q in frontier:
            return atoms + 2
        frontier = {n for a in frontier for n in adjacency[a] if n not in seen and n not in bond}
        seen |= frontier
        atoms += 1
    return None


def _written_geometry(work: Chem.Mol) -> dict[frozenset[int], tuple[int, int, int, bool]]:
    """For each double bond of written geometry: its first atom, a substituent of that atom and one of
    the other, and whether the two are trans."""
    Chem.SetBondStereoFromDirections(work)
    found = {}
    for b in work.GetBonds():
        stereo = b.GetStereo()
        if stereo in (Chem.BondStereo.STEREOCIS, Chem.BondStereo.STEREOTRANS) and len(b.GetStereoAtoms()) == 2:
            p, q = b.GetStereoAtoms()
            found[frozenset((b.GetBeginAtomIdx(), b.GetEndAtomIdx()))] = (
                b.GetBeginAtomIdx(), p, q, stereo == Chem.BondStereo.STEREOTRANS)
    return found


def _fold_symmetric(plain: Chem.Mol, candidates: list[Closure]) -> list[Closure]:
    """Fold pairs that one symmetry of the molecule maps onto each other: the two atoms marked, the
    canonical SMILES are the same. (Each site equivalent on its own is not enough: the 1,2-diol of
    a symmetric dialdehyde closes a five- and a six-membered lactol.)"""
    kept: dict[str, Closure] = {}
    for c in candidates:
        key = _marked_smiles(plain, c.nucleophile.atom, c.electrophile.atom)
        if key in kept:
            first = kept[key]
            kept[key] = replace(first, equivalent=first.equivalent + ((c.nucleophile.atom, c.electrophile.atom),))
        else:
            kept[key] = c
    return sorted(kept.values(), key=Closure.rank_key)


def _marked_smiles(plain: Chem.Mol, first: int, second: int) -> str:
    for number, atom in enumerate((first, second), 1):
        plain.GetAtomWithIdx(atom).SetAtomMapNum(number)
    try:
        return Chem.MolToSmiles(plain)
    finally:
        for atom in (first, second):
            plain.GetAtomWithIdx(atom).SetAtomMapNum(0)


def between_kinds(c: Closure, nucleophile_kind: str, electrophile_family: str) -> bool:
    """Whether closure `c` joins sites of the given kinds (a nucleophile's kind, an electrophile's
    family)."""
    return c.nucleophile.kind == nucleophile_kind and family(c.electrophile.kind) == electrophile_family


def family(electrophile_kind: str) -> str:
    """carbonyl, nitrile, conjugate or alkyl (a displacement, an epoxide's opening among them): the
    kinds of sites a warning compares."""
    if electrophile_kind in ("aldehyde", "ketone", "ester", AMIDE):
        return "carbonyl"
    if electrophile_kind == NITRILE:
        return "nitrile"
    return "conjugate" if electrophile_kind == "enone beta carbon" else "alkyl"


def with_atom_maps(mol: Chem.Mol) -> Chem.Mol:
    """A copy in which every heavy atom carries a map number: existing maps are kept, the others
    numbered upward from the highest one, carbons first in the order written, then the other
    elements (a chain written end to end, CC(=O)CCCC(C)=O, gets its locants: C1 ... C7)."""
    out = Chem.Mol(mol)
    next_map = max([a.GetAtomMapNum() for a in out.GetAtoms()] + [0]) + 1
    unmapped = [a for a in out.GetAtoms() if a.GetAtomicNum() > 1 and not a.GetAtomMapNum()]
    for atom in sorted(unmapped, key=lambda a: (a.GetAtomicNum() != 6, a.GetIdx())):
        atom.SetAtomMapNum(next_map)
        next_map += 1
    return out
