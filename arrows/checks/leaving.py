"""Leaving groups that depart from carbon, phosphorus or sulfur as very strong bases (AR510),
hydroxide or an alkoxide left to ionise (AR515), pushed out of carbon, nitrogen or an oxo acid's
centre while a strong acid stands by (AR517), or out of an acetal carbon unprotonated (AR534);
substitutions in one step at a tertiary carbon (AR520) or at a carbonyl carbon (AR525).

A pair move from a bond to one of that bond's atoms (`C8-N20 -> N20`) breaks the bond and leaves
the pair on that atom: a leaving group. A good leaving group is a weak base (common practice: the
usual ones are the conjugate bases of acids of pKa below about 16; hydroxide and alkoxides, met in
E1cB eliminations and acyl substitutions, are the poorest that textbooks let leave; displaced from
an sp3 carbon in one step, no small ring opened, they are AR510's too). One that
leaves carbon as an anion whose conjugate acid has a pKa of 35 or more (an amide ion R2N-, an
amine ~38; a vinyl, aryl or alkyl carbanion, ~44-50; a hydride ion, H2 ~35) is almost never
expelled: the group is meant to be protonated first (an amine leaves a carbinolamine as R2NH,
from R2NH2+), or its pair to go on into a bond in the same step. Judged on the state after the
step (arrows.judgement.acidity), and only where the leaving atom is negative there and the bond
broken outright (a pi pair moved onto an atom leaves nothing). A bond of a three- or
four-membered ring is not judged: the strain released drives the opening, as in the Favorskii
rearrangement, where the cyclopropanone's tetrahedral intermediate opens to a carbanion
(textbook).

At phosphorus and sulfur (a sulfonium or phosphonium ion, or its adduct) the same table judges
the group that leaves: an amide ion leaving an aminophosphorane is protonated first (as the
Staudinger reduction's amine leaves, March, from memory), and a carbon leaves a sulfonium ion only
as the centre takes the pair, a nucleophile attacking that carbon (the Corey-Chaykovsky epoxide
closure). A carbanion pushed off phosphorus as P=O forms is not judged: the alkaline cleavage of
a phosphonium salt expels the group most stable as a carbanion so (March, from memory); nor is
an oxygen leaving P or S (an oxide, O2-, is AR503's charge of -2). At nitrogen only AR517 speaks: an oxime's or a
hydroxylamine's OH leaves as water once protonated (the Beckmann rearrangement in acid, Clayden,
from memory). At the P, S, Se or d-block metal of an oxo acid AR517 speaks for oxygen too:
chromic acid's OH leaves as water once protonated, as an alcohol bonds to Cr (Clayden, from memory).
"""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import nameable
from ..judgement.acidity import ALKOXIDE_ACID_PKA, HYDROGEN, Acidity, acidity_of, perceived
from ..trace import StepTrace
from . import Check
from .protons import freed_hydrogens

STRONGEST_LEAVING_BASE = 35.0   # pKa of the conjugate acid from which a leaving group is flagged
_JUDGED = (1, 6, 7, 8)   # H, C, N and O (as oxide, O2-): the elements whose anions can be this basic
# The atoms they are judged leaving: carbon (AR510, AR515, AR517, AR522); the nitrogen of an oxime
# or hydroxylamine (AR517 only); the phosphorus or sulfur of an onium ion or its adduct (AR510 only,
# for carbon, nitrogen and hydrogen leaving).
_CENTRES = (6, 7, 15, 16)
# The centres of oxo acids whose OH or OR leaves in acid as water or an alcohol (AR517): P, S, Se
# and the d-block metals of oxo acids and oxo esters (V, Cr, Mn, Mo, Tc, Ru, W, Re, Os).
_OXO_ACID_CENTRES = frozenset({15, 16, 34, 23, 24, 25, 42, 43, 44, 74, 75, 76})
_HALOGENS = (17, 35, 53)   # Cl, Br, I: a halogen a nucleophile can take as X+ (AR520's hint)


def conjugate_acid(mol: Chem.Mol, atom: int) -> Optional[Acidity]:
    """The acidity table's entry for `atom` of `mol` with one proton added to it."""
    if mol.GetAtomWithIdx(atom).GetAtomicNum() == 1:
        return HYDROGEN
    work = Chem.RWMol(mol)
    target = work.GetAtomWithIdx(atom)
    target.SetNumExplicitHs(target.GetNumExplicitHs() + 1)
    target.SetFormalCharge(target.GetFormalCharge() + 1)
    target.SetNoImplicit(True)
    return acidity_of(perceived(work.GetMol()), atom)


def _small_ring_detour(mol: Chem.Mol, a: int, b: int) -> tuple[int, ...]:
    """The other way round the ring of three or four atoms that the bond a-b lies on, from a to b
    (empty when there is none)."""
    if mol.GetBondBetweenAtoms(a, b) is None:
        return ()
    work = Chem.RWMol(mol)
    work.RemoveBond(a, b)
    detour = tuple(Chem.GetShortestPath(work, a, b))
    return detour if 0 < len(detour) <= 4 else ()


def in_small_ring(mol: Chem.Mol, a: int, b: int) -> bool:
    """Whether the bond a-b lies on a ring of three or four atoms."""
    return bool(_small_ring_detour(mol, a, b))


def _weaker_ring_bond(state, a: int, b: int) -> bool:
    """Whether the three- or four-membered ring through the C-C bond a-b holds a heteroatom (an
    epoxide's O, an aziridine's N): such a ring opens at its bond to the heteroatom, which leaves as
    a far weaker base (common practice: epoxides open at C-O); cutting its C-C to expel a carbanion
    is not the strain-driven opening of an all-carbon ring (the Favorskii's cyclopropanone)."""
    return any(state.elements[i] not in (1, 6) for i in _small_ring_detour(state.mol, a, b))


def _ring_heteroatom(state, a: int, b: int) -> Optional[int]:
    """The heteroatom bonded to `b` in the three- or four-membered ring through the bond a-b, if any."""
    detour = _small_ring_detour(state.mol, a, b)
    beside = detour[-2] if len(detour) >= 2 else None
    return beside if beside is not None and state.elements[beside] not in (1, 6) else None


class StrongBaseLeavingGroups(Check):
    name = "leaving groups"
    codes = ("AR510", "AR515", "AR517", "AR522", "AR534")

    def __init__(self) -> None:
        self.acted: set[int] = set()   # atoms the steps so far have touched (AR517's hint)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.index == 0:
            self.acted = set()
        yield from self._judged(st)
        self.acted |= set(st.change.touched_atoms)

    def _judged(self, st: StepTrace) -> Iterator[Diagnostic]:
        after = st.after
        if after is None:
            return
        elements = after.elements
        broken = {(min(pair), max(pair)) for pair in st.change.broken}
        if not broken:
            return
        for move in st.change.moves:
            relayed = _relayed_leaving_group(st, move, broken)
            if relayed is not None:
                # An O whose pair goes on into a bond as it leaves (an imidate's O making the
                # amide's C=O, its N the anion): judged as the anion it leaves as.
                found = _pushed_out_of_an_acetal(st, move, *relayed)
                if found is not None:
                    yield found
                continue
            if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 1:
                continue
            leaving = move.sink_atoms[0]
            if leaving not in move.source_atoms or elements[leaving] not in _JUDGED:
                continue
            centre = move.source_atoms[1] if move.source_atoms[0] == leaving else move.source_atoms[0]
            if elements[leaving] == 8 and -2 < after.formal_charge(leaving) < 0 and _oxo_acid_centre(st.before, centre) \
                    and (min(leaving, centre), max(leaving, centre)) in broken:
                # Hydroxide or an alkoxide off the centre of an oxo acid or its ester (chromic acid,
                # a sulfonate): AR517 only.
                found = self._pushed_out_in_acid(st, move, leaving, centre, workup=False)
                if found is not None:
                    yield found
                continue
            if (elements[centre] not in _CENTRES or (min(leaving, centre), max(leaving, centre)) not in broken
                    or after.formal_charge(leaving) >= 0):
                continue
            if elements[centre] == 7:
                # An oxime's or hydroxylamine's N-O (the Beckmann, a Lossen): AR517 only.
                if elements[leaving] == 8 and after.formal_charge(leaving) > -2:
                    found = self._pushed_out_in_acid(st, move, leaving, centre, workup=False)
                    if found is not None:
                        yield found
                continue
            if elements[centre] != 6 and (elements[leaving] == 8 or (
                    elements[leaving] == 6 and elements[centre] == 15 and _pushed_into_a_multiple_bond(st, centre))):
                continue   # oxygen off P or S (an oxide is AR503's); a carbanion pushed off P as P=O forms
            if elements[leaving] == 1 and perceived(after.mol).GetAtomWithIdx(centre).GetIsAromatic():
                continue   # a hydride that leaves as the ring turns aromatic again (the Chichibabin amination)
            ionised = after.formal_charge(centre) > 0 and after.nonbonding[centre] == 0
            label = st.before.label
            if elements[leaving] == 8 and after.formal_charge(leaving) > -2 and not ionised:
                # An alkoxide pushed out (an E1cB, a tetrahedral intermediate): judged only where
                # a strong acid stands by, which would have protonated it first, or where a
                # nucleophile displaces it from an sp3 carbon in one step (an SN2).
                found = (self._pushed_out_in_acid(st, move, leaving, centre) or self._pushed_out_by_e2(st, move, leaving, centre)
                         or _pushed_out_of_an_acetal(st, move, leaving, centre)
                         or _displaced_in_one_step(st, move, leaving, centre))
                if found is not None:
                    yield found
                continue
            if in_small_ring(st.before.mol, leaving, centre) and not (
                    elements[leaving] == 6 and _weaker_ring_bond(st.before, leaving, centre)):
                continue   # the strain released drives the opening (the Favorskii's carbanion)
            acid = conjugate_acid(after.mol, leaving)
            if (acid is not None and elements[leaving] == 8 and ALKOXIDE_ACID_PKA <= acid.pka < STRONGEST_LEAVING_BASE
                    and ionised):
                yield Diagnostic(
                    "AR515", f"{label(leaving)} leaves {label(centre)} as {acid.base} (pKa of {acid.acid} {acid.shown}), "
                    f"making a carbocation with nothing pushing it out", move.move.loc,
                    hint=f"protonate {label(leaving)} first, so that it leaves as {_neutral(acid)} (the acid-catalysed "
                         f"route), or push from a neighbour in this step (an E1cB)",
                    atoms=(label(leaving), label(centre)), step=st.index)
                continue
            if acid is None or acid.pka < STRONGEST_LEAVING_BASE:
                continue
            if elements[centre] == 6:
                hint = _beta_centre_hint(st, leaving, centre) or _strong_base_hint(label(leaving), elements[leaving])
            else:
                hint = _onium_hint(st, leaving, centre)
            carbons = elements[leaving] == elements[centre] == 6
            ring_heteroatom = _ring_heteroatom(st.before, leaving, centre) if carbons else None
            if ring_heteroatom is not None:
                het = label(ring_heteroatom)
                hint = (f"a small ring with a heteroatom opens at its bond to it (an epoxide at C-O, common practice): "
                        f"`{label(centre)}-{het} -> {het}`")
            yield Diagnostic(
                "AR510", f"{label(leaving)} leaves {label(centre)} as {acid.base} (pKa of {acid.acid} "
                f"{acid.shown}): a base this strong is almost never a leaving group",
                move.move.loc, hint=hint,
                atoms=(label(leaving), label(centre)), step=st.index)


    def _pushed_out_by_e2(self, st: StepTrace, leaving_move, leaving: int, centre: int) -> Optional[Diagnostic]:
        """AR522: hydroxide or an alkoxide pushed out in the step in which a base takes the proton
        whose C-H pair makes the new C=C (a concerted E2). Hydroxide and alkoxides are too poor
        leaving groups for one step: in base the proton goes first and the carbanion pushes the
        group out (E1cB, as in an aldol dehydration: Clayden, from memory; common practice); in
        acid the group is protonated and leaves as water or an alcohol. A carboxylate or a
        phenoxide, weaker bases, may leave so: not judged."""
        before, after = st.before, st.after
        for move in st.change.moves:   # the C-H pair that goes into the new C=C
            if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 2 \
                    or centre not in move.sink_atoms:
                continue
            beta = next((a for a in move.sink_atoms if a != centre), None)
            h = next((a for a in move.source_atoms if a != beta), None)
            if beta not in move.source_atoms or h is None or before.elements[h] != 1:
                continue
            taker = next((n.GetIdx() for n in after.mol.GetAtomWithIdx(h).GetNeighbors()), None)
            if taker is None:
                continue   # left bare: AR518's
            acid = conjugate_acid(after.mol, leaving)   # (perceived only for a step shaped as an E2)
            if acid is None or acid.pka < ALKOXIDE_ACID_PKA:
                return None
            label = before.label
            stabilised = any(before.mol.GetBondBetweenAtoms(beta, n.GetIdx()) is not None and n.GetIdx() != centre
                             and any(b.GetBondTypeAsDouble() == 2 and b.GetOtherAtom(n).GetAtomicNum() in (7, 8)
                                     for b in n.GetBonds())
                             for n in before.mol.GetAtomWithIdx(beta).GetNeighbors())
            if stabilised:
                hint = (f"take the proton first ({label(taker)} and {label(h)} in a step of their own, giving the "
                        f"enolate), then let the enolate push {label(leaving)} out of {label(centre)} in the next "
                        f"step: an E1cB, as in every aldol dehydration in base")
            else:
                hint = (f"{label(leaving)} leaves only once protonated (in acid, as water or an alcohol: E1 or E2 of "
                        f"the protonated group); in base an alcohol does not eliminate")
            return Diagnostic(
                "AR522", f"{label(leaving)} leaves {label(centre)} as {acid.base} in the same step as {label(taker)} "
                f"takes {label(h)} (a concerted E2): {acid.base} is too poor a leaving group for that",
                leaving_move.move.loc, hint=hint, atoms=(label(leaving), label(centre), label(h)), step=st.index)
        return None

    def _pushed_out_in_acid(self, st: StepTrace, move, leaving: int, centre: int,
                            workup: bool = True) -> Optional[Diagnostic]:
        """AR517 for hydroxide or an alkoxide pushed out of `centre` while a strong acid stands by
        (an epoxide's oxygen too: in acid it opens protonated). A carboxylate or phenoxide, a weak
        base, leaves in acid too: not judged. With `workup`, an acid written among the species and
        untouched so far may be a workup acid (after a Grignard); an oxime's N-O breaks in the acid
        that catalyses it, so there the hint does not ask."""
        touched = set(st.change.touched_atoms)
        strong = _strong_acid(st.before, touched)
        if strong is None:
            # Or one the step itself makes beside the leaving group, in another molecule (H3O+
            # protonating methanol as hydroxide leaves: MeOH2+ and HO- made side by side).
            # A proton this step throws off with no base (AR518's) is the missing base's slip, not
            # an acid standing by.
            strong = _strong_acid(st.after, {leaving} | set(freed_hydrogens(st)), apart_from=centre)
        acid = conjugate_acid(st.after.mol, leaving) if strong is not None else None
        if acid is None or not ALKOXIDE_ACID_PKA <= acid.pka < STRONGEST_LEAVING_BASE:
            return None
        site, kind = strong
        label, mol = st.before.label, st.after.mol
        protonate = f"in acid the oxygen is protonated first and leaves as {_neutral(acid)}"
        if site in st.entered:
            hint = (f"{protonate}: bring the acid in with `uses` at an earlier step in which {label(leaving)} "
                    f"takes its proton")
        elif nameable(mol, site) and nameable(mol, leaving):
            hint = (f"{protonate}: add a step before this one with `:{label(leaving)} -> H({label(site)})` and "
                    f"`{label(site)}-H -> {label(site)}`")
        else:   # a move names only mapped atoms
            unnamed = " and ".join(label(a) for a in (leaving, site) if not nameable(mol, a))
            hint = (f"{protonate}: add a step before this one in which {label(leaving)} takes the proton of "
                    f"{label(site)} (give {unnamed} a map number to name it in a move)")
        if workup and site not in self.acted and site not in st.entered and site in range(st.before.mol.GetNumAtoms()):
            # There from the start, untouched so far: most likely a workup acid written among the species.
            hint = (f"if {label(site)} is a workup acid, bring it in with `uses` in the step where it acts; "
                    f"otherwise {hint[0].lower()}{hint[1:]}")
        return Diagnostic(
            "AR517", f"{label(leaving)} leaves {label(centre)} as {acid.base} (pKa of {acid.acid} "
            f"{acid.shown}) while {kind} {label(site)} is there to protonate it",
            move.move.loc, hint=hint, atoms=(label(leaving), label(centre), label(site)), step=st.index)


def _displaced_in_one_step(st: StepTrace, move, leaving: int, centre: int) -> Optional[Diagnostic]:
    """AR510: hydroxide or an alkoxide displaced from an sp3 carbon by a nucleophile in one step
    (an SN2 of an alcohol or ether), no pi pair pushing it out. Too basic to leave so (conjugate
    acid pKa 15-18): an alcohol is protonated, or made a sulfonate or halide, before it is
    substituted (common practice; Clayden, from memory). Not judged: a three- or four-membered
    ring opened (an epoxide's strain lets its alkoxide go), a step that makes a multiple bond at
    the carbon (a tetrahedral intermediate's collapse, an E1cB), and weaker bases (a phenoxide or
    a carboxylate leaving a methyl group, as thiolate demethylation and LiI ester cleavage do)."""
    before, after = st.before, st.after
    atom = before.mol.GetAtomWithIdx(centre)
    if before.bond_sums[centre] != 4 or before.nonbonding[centre] or after.bond_sums[centre] != 4 \
            or any(b.GetBondTypeAsDouble() != 1 for b in atom.GetBonds()) \
            or any(b.GetBondTypeAsDouble() != 1 for b in after.mol.GetAtomWithIdx(centre).GetBonds()):
        return None   # not an sp3 carbon before and after the step
    nucleophile = st.change.attacker(centre)
    if nucleophile is None or in_small_ring(before.mol, leaving, centre):
        return None
    acid = conjugate_acid(after.mol, leaving)
    if acid is None or not ALKOXIDE_ACID_PKA <= acid.pka < STRONGEST_LEAVING_BASE:
        return None
    label = before.label
    return Diagnostic(
        "AR510", f"{label(nucleophile)} displaces {label(leaving)} from {label(centre)} in one step (an SN2), "
        f"{label(leaving)} leaving as {acid.base} (pKa of {acid.acid} {acid.shown}): too strong a base to "
        f"leave an sp3 carbon so", move.move.loc,
        hint=f"an alcohol or ether is substituted once {label(leaving)} is protonated (it leaves as "
             f"{_neutral(acid)}) or made a sulfonate or halide first; only a small ring's strain (an epoxide) "
             f"lets an alkoxide go in one step",
        atoms=(label(nucleophile), label(centre), label(leaving)), step=st.index)


def _oxo_acid_centre(state, centre: int) -> bool:
    """Whether `centre` is the P, S, Se or d-block metal of an oxo acid, its ester or its anion (a
    double bond to oxygen: chromic acid, a chromate ester, permanganate, a sulfonate, a phosphate).
    An OH or OR on such a centre is protonated in strong acid and leaves as water or an alcohol (the
    chromate ester of a Jones oxidation forms as chromic acid's protonated OH leaves as water:
    Clayden, from memory), as from a carbonyl carbon in a Fischer esterification."""
    if state.elements[centre] not in _OXO_ACID_CENTRES:
        return False
    return any(state.elements[n.GetIdx()] == 8 and state.bond_electrons(centre, n.GetIdx()) == 4
               for n in state.mol.GetAtomWithIdx(centre).GetNeighbors())


def _strong_acid(state, passed_over: set[int], apart_from: Optional[int] = None) -> Optional[tuple[int, str]]:
    """An atom of `state` that carries the proton of a strong acid (pKa below about 0, memory) and
    what the acid is: an oxonium ion (H3O+, ROH2+, R2OH+, C=OH+), a hydrogen halide (HCl, HBr,
    HI, unless a free amine or pyridine in the state makes it that base's salt, as `Et3N.Cl`
    is written), a neutral sulfonic or sulfuric acid's O-H (not hydrogen sulfate), perchloric or
    nitric acid, trifluoroacetic acid, a bare proton. Atoms in `passed_over` (those the step
    itself moves), released ones and, with `apart_from`, those of its molecule are passed over."""
    elements, mol = state.elements, state.mol
    skip = set(passed_over) | set(state.released)
    if apart_from is not None:
        skip |= next(set(f) for f in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if apart_from in f)
    found = []
    for i, element in enumerate(elements):
        if i in skip or element not in (1, 8, 17, 35, 53):
            continue
        atom = mol.GetAtomWithIdx(i)
        charge = state.formal_charge(i)
        if element == 1:
            if charge == 1 and atom.GetDegree() == 0:
                found.append((i, "the proton"))
            continue
        if not atom.GetTotalNumHs(includeNeighbors=True):
            continue
        if element == 8 and charge == 1:
            found.append((i, "the oxonium ion"))
        elif element != 8 and charge == 0 and not any(n.GetAtomicNum() != 1 for n in atom.GetNeighbors()):
            if not _free_base(state):
                found.append((i, "the hydrogen halide"))
        elif element == 8 and charge == 0 and any(_strong_oxo_acid_centre(state, n) for n in atom.GetNeighbors()):
            found.append((i, "the strong acid"))
        elif element == 8 and charge == 0 and any(_trifluoroacetyl(n) for n in atom.GetNeighbors()):
            found.append((i, "trifluoroacetic acid"))   # pKa ~0.3 (memory)
    return found[0] if found else None


def _strong_oxo_acid_centre(state, centre: Chem.Atom) -> bool:
    """Whether `centre` is the S of a neutral sulfonic or sulfuric acid, the Cl of perchloric acid or
    the N of nitric acid (pKa -10 to -1.4, memory): an oxo-acid with no negative oxygen of its own
    (hydrogen sulfate, pKa ~2, is not one)."""
    z = centre.GetAtomicNum()
    oxygens = [n for n in centre.GetNeighbors() if n.GetAtomicNum() == 8]
    doubled = sum(b.GetBondTypeAsDouble() == 2 for b in centre.GetBonds())
    negative = any(state.formal_charge(n.GetIdx()) < 0 for n in oxygens)
    if z == 16:
        return doubled >= 2 and not negative
    if z == 17:   # ClO3(OH), however its Cl-O bonds are written (the state keeps them charge-separated)
        return len(oxygens) == 4 and sum(state.formal_charge(n.GetIdx()) for n in oxygens) + state.formal_charge(
            centre.GetIdx()) == 0
    if z == 7:   # HO-N+(=O)O-, its own N+/O- pair
        return state.formal_charge(centre.GetIdx()) == 1 and doubled == 1 and len(oxygens) == 3
    return False


def _free_base(state) -> bool:
    """Whether `state` holds a neutral amine or pyridine-type nitrogen with its lone pair (a
    hydrogen halide beside it is that base's salt, pKa 5-11, memory: no strong acid)."""
    mol = state.mol
    for i, element in enumerate(state.elements):
        if element != 7 or state.formal_charge(i) != 0 or state.nonbonding[i] < 2:
            continue
        atom = mol.GetAtomWithIdx(i)
        if any(b.GetBondTypeAsDouble() == 3 for b in atom.GetBonds()):
            continue   # a nitrile's nitrogen
        if not any(n.GetAtomicNum() == 6 and any(b.GetBondTypeAsDouble() == 2 and b.GetOtherAtom(n).GetAtomicNum() == 8
                                                   for b in n.GetBonds()) for n in atom.GetNeighbors()):
            return True   # an amine, a pyridine or an imine (not an amide's nitrogen)
    return False


def _trifluoroacetyl(carbon: Chem.Atom) -> bool:
    """Whether `carbon` is the C(=O) of a trifluoroacetyl group."""
    if carbon.GetAtomicNum() != 6 or not any(b.GetBondTypeAsDouble() == 2 and b.GetOtherAtom(carbon).GetAtomicNum() == 8
                                             for b in carbon.GetBonds()):
        return False
    return any(n.GetAtomicNum() == 6 and sum(m.GetAtomicNum() == 9 for m in n.GetNeighbors()) == 3
               for n in carbon.GetNeighbors())


# The conjugate acid's pKa from which a group pushed out of an acetal carbon needs activation:
# a sulfonate, a halide, trifluoroacetate or a phosphate monoanion (pKa below ~2) leaves a glycosyl
# carbon unaided (a glycosyl triflate ionises); a carboxylate (4.8), a phosphate dianion (~6.5: a
# sugar nucleotide's UDP, which a glycosyltransferase's Mg2+ or Mn2+ holds), an amide's anion (a
# trichloroacetimidate donor's leaving group) or an alkoxide leaves only once protonated or bonded
# to a Lewis acid
# (common practice: glycosyl acetates, imidates and phosphates are activated with TMSOTf, TfOH or
# BF3.OEt2; Demchenko, from memory).
_UNAIDED_FROM_ACETAL_PKA = 3.0


def _relayed_leaving_group(st: StepTrace, move, broken) -> Optional[tuple[int, int, int]]:
    """(leaving oxygen, centre, anion) for an arrow that breaks a C-O bond and sends its pair on into
    a bond of the oxygen's (`C1-O3 -> C5=O3`), where an atom of the group a few bonds on (not
    through the centre) ends the step negative, made so by this step: an imidate or ester leaving
    as the anion of an amide or carboxylic acid."""
    if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 2:
        return None
    after = st.after
    leaving = next((a for a in move.source_atoms if a in move.sink_atoms), None)
    if leaving is None or after.elements[leaving] != 8:
        return None
    centre = next(a for a in move.source_atoms if a != leaving)
    if after.elements[centre] != 6 or (min(leaving, centre), max(leaving, centre)) not in broken:
        return None
    for atom, was, now in st.change.charges:
        if now != -1 or was <= now or atom in (leaving, centre):
            continue
        path = Chem.GetShortestPath(after.mol, leaving, atom)
        if path and len(path) <= 4 and centre not in path:
            return leaving, centre, atom
    return None


def _anion_acidity(mol: Chem.Mol, anion: int) -> tuple[Optional[Acidity], int]:
    """The conjugate acid of the anion at `anion`, and the atom that takes the proton; an O- on a
    C=N is read as the amide it is the other form of (an imidate anion is an amidate, protonated
    on N)."""
    acid = conjugate_acid(mol, anion)
    atom = mol.GetAtomWithIdx(anion)
    if acid is not None or atom.GetAtomicNum() != 8 or atom.GetFormalCharge() != -1 or atom.GetDegree() != 1:
        return acid, anion
    carbon = atom.GetNeighbors()[0]
    imine = next((b for b in carbon.GetBonds() if b.GetBondTypeAsDouble() == 2 and b.GetOtherAtom(carbon).GetAtomicNum() == 7), None)
    if carbon.GetAtomicNum() != 6 or imine is None:
        return None, anion
    work = Chem.RWMol(mol)
    nitrogen = imine.GetOtherAtomIdx(carbon.GetIdx())
    work.GetBondWithIdx(imine.GetIdx()).SetBondType(Chem.BondType.SINGLE)
    work.GetBondBetweenAtoms(carbon.GetIdx(), anion).SetBondType(Chem.BondType.DOUBLE)
    work.GetAtomWithIdx(anion).SetFormalCharge(0)
    work.GetAtomWithIdx(nitrogen).SetFormalCharge(work.GetAtomWithIdx(nitrogen).GetFormalCharge() - 1)
    return conjugate_acid(work.GetMol(), nitrogen), nitrogen


def _pushed_out_of_an_acetal(st: StepTrace, move, leaving: int, centre: int,
                             anion: Optional[int] = None) -> Optional[Diagnostic]:
    """AR534: hydroxide or an alkoxide pushed out of a carbon by a neutral oxygen's lone pair, which
    the step makes an oxocarbenium ion (an acetal, ketal, glycoside or hemiacetal opening with its
    leaving oxygen unprotonated). Acetals are stable to base: they open only in acid, the leaving
    oxygen protonated first or as it leaves (a glycosidase's general acid), so that it leaves as an
    alcohol (common practice; Clayden, from memory). So too a glycosyl donor's leaving group that
    leaves as an anion whose conjugate acid has a pKa of _UNAIDED_FROM_ACETAL_PKA or more (a
    carboxylate, a phosphate dianion, a trichloroacetimidate as the amide's anion, at `anion`): it is activated first,
    protonated or bonded to a Lewis acid. A nitrogen's push (a carbinolamine giving an
    iminium ion and hydroxide, real at high pH) and an anion's (a tetrahedral intermediate
    collapsing) are not judged, nor a sulfonate, halide or phosphate monoanion leaving, a carbon with a third
    heteroatom (an ester's or amide's neutral tetrahedral intermediate, drawn so in textbooks) or an
    epoxide opening (its strain drives it: the Rubottom oxidation's siloxy epoxide)."""
    before, after = st.before, st.after
    pusher = next((m.source_atoms[0] for m in st.change.moves if m.source_kind == "lone_pair" and m.electrons == 2
                   and set(m.sink_atoms) == {m.source_atoms[0], centre} and after.elements[m.source_atoms[0]] == 8
                   and before.formal_charge(m.source_atoms[0]) == 0 and after.formal_charge(m.source_atoms[0]) == 1
                   and before.mol.GetBondBetweenAtoms(m.source_atoms[0], centre) is not None),
                  None)   # (a neighbour's push: an oxygen bonding to the carbon anew is a nucleophile)
    if pusher is None or in_small_ring(before.mol, leaving, centre):
        return None   # (an epoxide's strain drives its opening: the siloxy epoxide of a Rubottom oxidation)
    if sorted(n.GetAtomicNum() for n in before.mol.GetAtomWithIdx(centre).GetNeighbors() if n.GetAtomicNum() not in (1, 6)) != [8, 8]:
        return None   # not an acetal carbon: an ester's or amide's tetrahedral intermediate is not judged
    anion = leaving if anion is None else anion
    acid = conjugate_acid(after.mol, anion)
    alkoxide = anion == leaving and acid is not None and acid.pka >= ALKOXIDE_ACID_PKA
    if not alkoxide:
        acid, anion = _anion_acidity(after.mol, anion)
    if acid is None or acid.pka < _UNAIDED_FROM_ACETAL_PKA:
        return None
    label = before.label
    o, c, x = label(leaving), label(centre), label(pusher)
    donor = _acid_at_hand(before, leaving)
    if not alkoxide:
        return _unactivated_donor(st, move, acid, anion, donor, (o, c, x))
    if donor is not None and nameable(before.mol, leaving):
        a = label(donor)
        how = f"as it leaves, `{move.move.source} -> {o}-H({a})` with `{a}-H -> {a}` (a glycosidase's general acid), or first"
    else:
        how = "with an acid (H3O+, TsOH; in an enzyme a general acid such as a Glu or Asp carboxylic acid) first or as it leaves"
    return Diagnostic(
        "AR534", f"{o} leaves {c} as {acid.base} (pKa of {acid.acid} {acid.shown}) pushed out by {x}'s lone pair: "
        f"an acetal carbon gives an oxocarbenium ion and {acid.base} only in acid, its leaving oxygen protonated",
        move.move.loc,
        hint=f"protonate {o} {how}, so that it leaves as {_neutral(acid)}: acetals are stable to base and open only in acid",
        atoms=(o, c, x), step=st.index)


def _unactivated_donor(st: StepTrace, move, acid: Acidity, anion: int, donor: Optional[int],
                       named: tuple[str, str, str]) -> Diagnostic:
    """AR534 for a glycosyl donor's leaving group (an ester, an imidate) that leaves an acetal
    carbon as an anion with no promoter on it: the hint activates the atom that ends negative."""
    label, mol = st.before.label, st.before.mol
    o, c, x = named
    y = label(anion)
    where = f", its pair passed on to {y}," if st.after.formal_charge(anion) < 0 and y != o else ""
    if donor is not None and nameable(mol, anion) and nameable(mol, donor):
        a = label(donor)
        how = f"in a step before this one, `:{y} -> H({a})` with `{a}-H -> {a}`"
    else:
        how = "in a step before this one"
    phosphate = any(n.GetAtomicNum() == 15 for n in st.after.mol.GetAtomWithIdx(anion).GetNeighbors())
    # A phosphate polyanion is activated in an enzyme by a metal ion, and leaves protonated still an anion.
    metal, leaves = ((" or, in an enzyme, a metal ion (Mg2+ or Mn2+, which holds a glycosyltransferase's UDP as it "
                      "leaves)", "as a weaker base") if phosphate else ("", "neutral"))
    return Diagnostic(
        "AR534", f"{o} leaves {c}{where} as {acid.base} (pKa of {acid.acid} {acid.shown}) pushed out by {x}'s lone "
        f"pair with nothing activating it: a glycosyl donor's leaving group this basic departs only once protonated "
        f"or bonded to a Lewis acid",
        move.move.loc,
        hint=f"activate {y} {how}: protonate it or bond the promoter to it (TMSOTf or TfOH, BF3.OEt2: the usual "
             f"activators of glycosyl imidates, esters and phosphates, common practice){metal}, so that the group leaves "
             f"{leaves}",
        atoms=(o, c, x), step=st.index)


_GENERAL_ACID_PKA = 8.0   # the weakest acid a hint offers to protonate a leaving oxygen (an imidazolium, ~7)


def _acid_at_hand(state, apart_from: int) -> Optional[int]:
    """The N, O or S of another molecule of `state` carrying its most acidic proton (by the acidity
    table), if one is at least as acidic as an imidazolium ion (_GENERAL_ACID_PKA): the acid a
    hint names to protonate `apart_from`'s molecule."""
    mol = state.mol
    own = next(set(f) for f in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if apart_from in f)
    seen = perceived(mol)
    best = None
    for i, element in enumerate(state.elements):
        if element not in (7, 8, 16) or i in own or i in state.released:
            continue
        atom = mol.GetAtomWithIdx(i)
        if not atom.GetTotalNumHs(includeNeighbors=True):
            continue
        entry = acidity_of(seen, i)
        if entry is not None and entry.pka <= _GENERAL_ACID_PKA and (best is None or entry.pka < best[0]):
            best = (entry.pka, i)
    return None if best is None else best[1]


def _neutral(acid: Acidity) -> str:
    """What the leaving group is once protonated: water for hydroxide, an alcohol for an alkoxide."""
    return "water" if acid.acid == "water" else "an alcohol"


def _strong_base_hint(leaving: str, element: int) -> str:
    """AR510's hint: an amide ion or oxide is protonated before it leaves; a carbanion cannot be (a
    retro-aldol that expels CH3- was told to protonate the methyl): another bond is meant."""
    if element == 6:
        return (f"a carbanion this basic does not leave: the bond that breaks is usually the one whose pair "
                f"makes a stabilised anion (an enolate), or {leaving}'s pair goes on into a bond in this step")
    return (f"protonate {leaving} in an earlier step so that it leaves {'as hydroxide' if element == 8 else 'neutral'}, "
            f"or let its pair go on into a bond in this step")


# The centres of a beta elimination whose C-X pair makes the new C=C as an oxide leaves the other
# carbon, and what the oxide makes by bonding to them first (common practice; Clayden, Kurti-Czako,
# from memory): Si a pentacoordinate silicate (the Peterson elimination), P an oxaphosphetane (the
# Wittig and Horner-Wadsworth-Emmons), S an adduct at the sulfonyl group.
_BETA_CENTRES = {14: "a pentacoordinate silicate, as in a Peterson elimination",
                 15: "an oxaphosphetane, as in a Wittig or Horner-Wadsworth-Emmons reaction",
                 16: "an addition at the sulfonyl sulfur"}


def _beta_centre_hint(st: StepTrace, leaving: int, centre: int) -> Optional[str]:
    """AR510's hint for an oxide that leaves `centre` as a C-Si, C-P or C-S pair beside it makes the
    new C=C: the oxygen bonds to that Si, P or S first, and stays on it as the C=C forms.
    Protonating it instead (the plain hint) would leave R3Si+ or RSO2+ bare (AR511). With an aryl
    sulfone the oxygen may bond to the aryl's ipso carbon (a Smiles rearrangement, as in the
    Julia-Kocienski olefination)."""
    before, label = st.before, st.before.label
    if before.elements[leaving] != 8:
        return None
    for move in st.change.moves:
        if move.source_kind != "bond" or move.electrons != 2 or centre not in move.sink_atoms \
                or len(move.sink_atoms) != 2:
            continue
        beta = next((a for a in move.sink_atoms if a != centre), None)
        x = next((a for a in move.source_atoms if a != beta), None)
        if beta not in move.source_atoms or x is None or before.elements[x] not in _BETA_CENTRES:
            continue
        if not (nameable(before.mol, leaving) and nameable(before.mol, x)):
            return None
        o, c, xl = label(leaving), label(centre), label(x)
        # A P=O or S=O of the centre gives its pi pair to its oxygen as the new bond forms (the
        # centre would hold too many bonds otherwise).
        oxo = next((b.GetOtherAtomIdx(x) for b in before.mol.GetAtomWithIdx(x).GetBonds()
                    if b.GetBondTypeAsDouble() == 2 and before.elements[b.GetOtherAtomIdx(x)] == 8
                    and nameable(before.mol, b.GetOtherAtomIdx(x))), None)
        attack = f"`:{o} -> {xl}`" + (f" with `{xl}={label(oxo)} -> {label(oxo)}`" if oxo is not None else "")
        ipso = None
        if before.elements[x] == 16:
            aromatic = perceived(before.mol)
            ipso = next((n.GetIdx() for n in aromatic.GetAtomWithIdx(x).GetNeighbors()
                         if n.GetIsAromatic() and n.GetAtomicNum() == 6 and nameable(before.mol, n.GetIdx())), None)
        smiles = (f"; with an aryl sulfone {o} may instead attack {label(ipso)}, the aryl's ipso carbon (a Smiles "
                  f"rearrangement, as in the Julia-Kocienski olefination)" if ipso is not None else "")
        return (f"{o} bonds to {xl} first, in a step of its own ({attack}: {_BETA_CENTRES[before.elements[x]]}), "
                f"then `{move.move}` with `{c}-{o} -> {o}`, {o} leaving bonded to {xl} (protonating {o} instead would "
                f"leave {xl} a bare cation){smiles}")
    return None


def _pushed_into_a_multiple_bond(st: StepTrace, centre: int) -> bool:
    """Whether a bond to `centre` gains order in this step (an oxide's pair making P=O)."""
    return any(centre in bond and new > old for bond, old, new in st.change.reordered)


def _onium_hint(st: StepTrace, leaving: int, centre: int) -> str:
    """AR510's hint for a group that leaves phosphorus or sulfur: an amide ion or oxide is protonated
    first; a carbon leaves a sulfonium or phosphonium ion only with the centre, which takes the pair
    (a nucleophile attacks that carbon: the Corey-Chaykovsky epoxide closure, an SN2 on a
    methylsulfonium, common practice)."""
    label, elements = st.before.label, st.before.elements
    if elements[leaving] != 6:
        return _strong_base_hint(label(leaving), elements[leaving])
    c, x = label(leaving), label(centre)
    nucleophile = st.change.attacker(centre)
    if nucleophile is not None and nameable(st.before.mol, nucleophile) and nameable(st.before.mol, leaving):
        onium = "sulfonium" if elements[centre] == 16 else "phosphonium"
        return (f"a carbanion this basic does not leave {x}: a nucleophile attacks the carbon of a {onium} ion, "
                f"and {x} takes the pair of its bond and leaves neutral: "
                f"`:{label(nucleophile)} -> {c}` with `{x}-{c} -> {x}`")
    return (f"a carbanion this basic does not leave {x}: the bond to {c} breaks the other way, `{x}-{c} -> {x}`, "
            f"{x} leaving neutral as a nucleophile bonds to {c}")


class TertiarySubstitution(Check):
    """AR520: a concerted substitution (SN2) at an sp3 carbon that holds three carbon groups, or
    three groups of any kind and no hydrogen besides the leaving group (a tetrahedral intermediate
    attacked again as if it were an alkyl halide): a
    nucleophile from another molecule bonds to it, its own pair making the bond, while a leaving
    group takes the pair of its bond to the carbon in the same step. The backside of a tertiary
    carbon is too crowded (common practice; Clayden: tertiary halides react by SN1 or E2, not SN2).
    Not judged: the opening of a three-membered ring (an epoxide, an aziridinium, episulfonium or
    bromonium ion opens at its more substituted carbon in acid), a nucleophile of the substrate's
    own molecule (a ring closure, a 1,2-shift, an SNi delivery by the leaving group), a carbon
    with a multiple bond (acyl, vinyl, aryl) or a cation. The hint proposes an SN1, except at a
    carbon that holds three or more halogens (CCl4, CBr4): halogens hold up no cation, and a
    nucleophile takes a halogen from such a carbon (halophilic attack: Ph3P on CCl4 in the Appel
    reaction, from memory)."""
    name = "tertiary substitution"
    codes = ("AR520",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.change.broken or not st.change.formed:
            return
        before, elements = st.before, st.before.elements
        mol = before.mol
        molecules = None
        for move in st.change.moves:
            if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 1:
                continue
            leaving = move.sink_atoms[0]
            if leaving not in move.source_atoms:
                continue
            centre = move.source_atoms[1] if move.source_atoms[0] == leaving else move.source_atoms[0]
            atom = mol.GetAtomWithIdx(centre)
            if elements[centre] != 6 or before.bond_sums[centre] != 4 or before.nonbonding[centre] \
                    or any(b.GetBondTypeAsDouble() != 1 for b in atom.GetBonds()):
                continue   # not an sp3 carbon with four single bonds
            groups = [n.GetIdx() for n in atom.GetNeighbors() if n.GetAtomicNum() != 1 and n.GetIdx() != leaving]
            if len(groups) < 3:
                continue   # a hydrogen on the carbon: primary or secondary, or a methyl
            if _in_three_ring(mol, centre, leaving):
                continue   # an epoxide, aziridinium, episulfonium or bromonium ion opened
            nucleophile = st.change.attacker(centre)
            if nucleophile is None:
                continue
            if molecules is None:
                molecules = {i: k for k, f in enumerate(Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False))
                             for i in f}
            if molecules[nucleophile] == molecules[centre]:
                continue   # a ring closure, a shift, an SNi
            label = before.label
            kind = "a tertiary carbon" if all(elements[g] == 6 for g in groups) else \
                "a carbon with three groups besides the leaving group and no hydrogen"
            alkoxide = next((g for g in groups if elements[g] == 8 and before.formal_charge(g) < 0), None)
            if alkoxide is not None and nameable(mol, alkoxide) and nameable(mol, leaving):
                # A tetrahedral intermediate attacked again: it collapses to the carbonyl first.
                o, c, lg = label(alkoxide), label(centre), label(leaving)
                hint = (f"a tetrahedral intermediate collapses first: `:{o} -> {c}={o}` with `{c}-{lg} -> {lg}` "
                        f"in a step of its own, then {label(nucleophile)} adds to the {c}={o} made")
            elif elements[leaving] in _HALOGENS and sum(elements[g] in (9,) + _HALOGENS for g in groups) >= 2 \
                    and nameable(mol, nucleophile) and nameable(mol, leaving):
                # CCl4, CBr4, C2Cl6, CF3I: no SN1 (halogens do not hold a cation up), the nucleophile takes
                # a halogen (common practice: the Appel reaction, from memory).
                n, c, lg = label(nucleophile), label(centre), label(leaving)
                hint = (f"a carbon that holds three or more halogens is attacked at a halogen, not at the carbon "
                        f"(halophilic attack: Ph3P takes Cl+ from CCl4 in the Appel reaction): `:{n} -> {lg}` with "
                        f"`{c}-{lg} -> {c}`, leaving {c} a carbanion that its halogens stabilise (CCl3- from CCl4)")
            else:
                hint = (f"such a carbon is substituted by SN1: let {label(leaving)} leave first "
                        f"(`{label(centre)}-{label(leaving)} -> {label(leaving)}`, a step of its own) and "
                        f"{label(nucleophile)} add to the carbocation in the next step; with a strong base, E2 "
                        f"(a beta C-H taken) is the usual outcome")
            yield Diagnostic(
                "AR520", f"{label(nucleophile)} displaces {label(leaving)} from {label(centre)} in one step, an SN2 "
                f"at {kind}: its backside is too crowded", move.move.loc, hint=hint,
                atoms=(label(nucleophile), label(centre), label(leaving)), step=st.index)


class ConcertedAcylSubstitution(Check):
    """AR525: a nucleophile bonds to the carbon of a C=O or C=S (an ester, an acid chloride or
    anhydride, an amide, an activated acid, a thioester's or thionoester's C=S) while a leaving
    group departs from that carbon in the same step, the C=O kept: a substitution at a carbonyl
    carbon with no tetrahedral intermediate. Nucleophilic acyl substitution goes by addition to the
    C=O, its pi pair going onto the oxygen, then loss of the leaving group as that pair comes back
    (common practice; Clayden, from memory); a thiocarbonyl adds the same way. Not judged:
    a step that moves the C=O pair (that is the addition or the collapse), a pericyclic step, a
    carbon with two double bonds or a triple bond (a ketene, an isocyanate, CO2, an acylium ion),
    an sp3 carbon (an SN2, AR520's) and a C=N or C=C carbon (an iminium ion, a vinyl halide)."""
    name = "acyl substitution in one step"
    codes = ("AR525",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        change = st.change
        if st.after is None or not change.broken or not change.formed or change.pericyclic:
            return
        before = st.before
        elements = before.elements
        broken = None
        for move in change.moves:
            if move.source_kind != "bond" or move.electrons != 2:
                continue
            for centre, leaving in (move.source_atoms, move.source_atoms[::-1]):
                if elements[centre] != 6 or centre in move.sink_atoms or before.nonbonding[centre] \
                        or before.bond_sums[centre] != 4:
                    continue
                if broken is None:
                    broken = {frozenset(p) for p in change.broken}
                if frozenset((centre, leaving)) not in broken:
                    continue
                oxygen = _carbonyl_chalcogen(before.mol, centre)
                if oxygen is None or oxygen == leaving or _moves_bond(change, centre, oxygen) \
                        or st.after.bond_electrons(centre, oxygen) != 4:
                    continue
                nucleophile = change.attacker(centre)
                if nucleophile is None or nucleophile == leaving:
                    continue
                yield _acyl_diagnostic(st, move, nucleophile, centre, oxygen, leaving)
                return


def _carbonyl_chalcogen(mol: Chem.Mol, carbon: int) -> Optional[int]:
    """The O or S of `carbon`'s C=O or C=S when that is its only multiple bond (a trigonal acyl carbon)."""
    oxygen = None
    for bond in mol.GetAtomWithIdx(carbon).GetBonds():
        order = bond.GetBondTypeAsDouble()
        if order == 1:
            continue
        other = bond.GetOtherAtom(mol.GetAtomWithIdx(carbon))
        if order != 2 or other.GetAtomicNum() not in (8, 16) or oxygen is not None:
            return None
        oxygen = other.GetIdx()
    return oxygen


def _moves_bond(change, a: int, b: int) -> bool:
    """Whether a move of the step starts or ends at the bond a-b."""
    ends = {a, b}
    return any(m.source_kind == "bond" and set(m.source_atoms) == ends or set(m.sink_atoms) == ends
               for m in change.moves)


def _acyl_diagnostic(st: StepTrace, leaving_move, nucleophile: int, centre: int, oxygen: int,
                     leaving: int) -> Diagnostic:
    """AR525's finding, its hint the two steps written out (where the atoms can be named)."""
    label, mol = st.before.label, st.before.mol
    n, c, o, lg = label(nucleophile), label(centre), label(oxygen), label(leaving)
    carbonyl = "carbonyl" if st.before.elements[oxygen] == 8 else "thiocarbonyl"
    if all(nameable(mol, a) for a in (nucleophile, centre, oxygen, leaving)):
        attack = next((m for m in st.change.moves if nucleophile in m.source_atoms
                       and set(m.sink_atoms) == {nucleophile, centre}), None)   # as written: `:O6 -> C2`, `C5-Mg8 -> C5-C2`
        add = f"`{attack.move}` with `{c}={o} -> {o}`" if attack is not None else f"{n} adding to {c} with `{c}={o} -> {o}`"
        loss = " and ".join(f"`{m.move}`" for m in _moves_of_the_loss(st, leaving_move, centre))
        hint = (f"draw the addition and the loss as two steps: {add} (the tetrahedral intermediate), then "
                f"`:{o} -> {c}={o}` with {loss} in a step of its own")
    else:
        hint = (f"draw the addition and the loss as two steps: {n} adds to {c} as the {c}={o} pair goes onto "
                f"{o} (the tetrahedral intermediate), then {o}'s pair re-forms the C=O as {lg} leaves")
    return Diagnostic(
        "AR525", f"{n} bonds to the {carbonyl} carbon {c} as {lg} leaves it, in one step with {c}={o} kept: "
        f"a substitution at a {carbonyl} carbon needs a tetrahedral intermediate", leaving_move.move.loc,
        hint=hint, atoms=(n, c, lg), step=st.index)


def _moves_of_the_loss(st: StepTrace, leaving_move, centre: int) -> list:
    """The leaving group's move as written, and the moves of the step that go on from where it ends
    (a hydride handed to another carbonyl carbon takes that C=O pair's move along: the Tishchenko's
    `C3=O4 -> O4`), found by the atoms they share, the carbonyl carbon aside."""
    reached = set(leaving_move.source_atoms) | set(leaving_move.sink_atoms)
    reached.discard(centre)
    found, others = [leaving_move], [m for m in st.change.moves if m is not leaving_move]
    grew = True
    while grew:
        grew = False
        for m in others:
            atoms = set(m.source_atoms) | set(m.sink_atoms)
            if m not in found and centre not in atoms and atoms & reached:
                found.append(m)
                reached |= atoms
                grew = True
    return found


def _in_three_ring(mol: Chem.Mol, a: int, b: int) -> bool:
    """Whether the bond a-b lies on a three-membered ring (a common neighbour of both)."""
    near = {n.GetIdx() for n in mol.GetAtomWithIdx(a).GetNeighbors()}
    return any(n.GetIdx() in near for n in mol.GetAtomWithIdx(b).GetNeighbors())
