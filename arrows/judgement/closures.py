"""Every intramolecular polar closure one species could make, classified by Baldwin's rules and
ranked.

Ranking (common practice, stated in the shared references): five- and six-membered closures
outcompete three- and four-membered ones; an aldehyde is a better electrophile than a ketone
(then ester, then amide). Within that, Baldwin-favoured before disfavoured, carbon nucleophiles
(enolates) before oxygen and nitrogen, the more acidic alpha hydrogen first.
"""
from __future__ import annotations

from dataclasses import field, replace
from typing import Optional

from rdkit import Chem

from .acidity import acidity_of, perceived
from .baldwin import ClosureClass, Verdict, classify, ring_path, verdict
from .sites import (ALKYL, AMIDE, CARBOXYLATE, ENOLATE, NITROGEN, NUCLEOPHILE_RANK, Electrophile, Nucleophile,
                    electrophiles, nucleophiles)
from ..model import frozen

FAVOURED, DISFAVOURED, NOT_COVERED = "favoured", "disfavoured", "not covered"


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
        return (self.tier, self.electrophile.rank, NUCLEOPHILE_RANK[self.nucleophile.kind], pka, self.size,
                self.nucleophile.atom, self.electrophile.atom)


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
    if v.favoured is None:
        return v, NOT_COVERED, f"Baldwin's rules do not cover {closure.name}"
    return v, FAVOURED if v.favoured else DISFAVOURED, f"{v.rule}: {closure.name} {v.word}"


def closure_between(mol: Chem.Mol, nu: Nucleophile, el: Electrophile) -> Optional[ClosureClass]:
    path = ring_path(mol, nu.atom, el.atom)
    if len(path) < 3:
        return None
    enol_partner = _enol_partner(nu, path)
    return classify(path, el.geometry, el.broken_partner, enol_partner)


def _enol_partner(nu: Nucleophile, path: tuple[int, ...]) -> Optional[int]:
    """The enolate carbon paired with the nucleophilic one. With two (a 1,3-dicarbonyl), the one
    outside the ring when there is one: the charge can sit on that exocyclic carbonyl."""
    if nu.kind != ENOLATE or not nu.partners:
        return None
    carbons = [c for c, _ in nu.partners]
    outside = [c for c in carbons if c not in path]
    return (outside or carbons)[0]


def _compatible(nu: Nucleophile, el: Electrophile) -> bool:
    # Forming the enolate consumes the carbonyl it conjugates with, as a carbonyl or as the end of
    # an enone; a tertiary amine cannot lose a proton to finish an addition to a carbonyl.
    used = {c for c, _ in nu.partners}
    if el.atom in used or (el.relay and el.relay[1] in used):
        return False
    if nu.kind == CARBOXYLATE and el.kind != ALKYL:
        return False    # a carboxylate adds to a carbonyl only to fall off again (common practice)
    return not (nu.kind == NITROGEN and el.kind != ALKYL and not nu.has_hydrogen)


def find_closures(mol: Chem.Mol, max_ring: int = 7) -> list[Closure]:
    """All candidate closures of one species (a sanitized Mol), best first; symmetry-equivalent
    pairs are folded into the first one's `equivalent`."""
    work = perceived(mol)
    candidates: list[Closure] = []
    for nu in nucleophiles(work):
        acid = acidity_of(work, nu.atom) if not nu.ready else None
        for el in electrophiles(work):
            if nu.atom == el.atom or work.GetBondBetweenAtoms(nu.atom, el.atom) or not _compatible(nu, el):
                continue
            path = ring_path(work, nu.atom, el.atom)
            if not 3 <= len(path) <= max_ring:
                continue
            closure = classify(path, el.geometry, el.broken_partner, _enol_partner(nu, path))
            v, outlook, reason = judge(closure)
            candidates.append(Closure(nu, el, path, _enol_partner(nu, path), closure, v, outlook, reason,
                                      acid.pka if acid else None))
    candidates.sort(key=Closure.rank_key)
    return _fold_symmetric(work, candidates)


def _fold_symmetric(mol: Chem.Mol, candidates: list[Closure]) -> list[Closure]:
    plain = Chem.Mol(mol)
    for atom in plain.GetAtoms():
        atom.SetAtomMapNum(0)
    classes = list(Chem.CanonicalRankAtoms(plain, breakTies=False))
    kept: dict[tuple[int, int], Closure] = {}
    for c in candidates:
        key = (classes[c.nucleophile.atom], classes[c.electrophile.atom])
        if key in kept:
            first = kept[key]
            kept[key] = replace(first, equivalent=first.equivalent + ((c.nucleophile.atom, c.electrophile.atom),))
        else:
            kept[key] = c
    return sorted(kept.values(), key=Closure.rank_key)


def favoured_alternatives(mol: Chem.Mol, nucleophile_kind: str, electrophile_family: str,
                          max_ring: int = 7) -> list[Closure]:
    """Favoured closures in `mol` between sites of the given kinds, best first."""
    return [c for c in find_closures(mol, max_ring) if c.outlook == FAVOURED
            and c.nucleophile.kind == nucleophile_kind and family(c.electrophile.kind) == electrophile_family]


def family(electrophile_kind: str) -> str:
    """carbonyl, conjugate or alkyl: the kinds of sites a warning compares."""
    if electrophile_kind in ("aldehyde", "ketone", "ester", AMIDE):
        return "carbonyl"
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
