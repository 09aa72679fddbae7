"""Proton transfers that run far uphill or take a hydride's hydrogen as a proton (AR508), protons
left bare (AR518), a carbon that keeps its C-H pair while losing another bond's, ending as a
carbene (AR524), a proton passed between two atoms of one molecule bonded to one common atom,
round a four-membered ring (AR526), a C-H pair that bonds to an electrophile as a base takes
that hydrogen, the enol or enolate skipped (AR529), and a proton taker left an onium beside an atom
the same step makes an ate (AR531).

A proton transfer is an arrow from a lone pair (or a pi pair) of a base B to a hydrogen on X,
with the X-H bond broken in the same step. The acid given up is judged on X before the step, the
conjugate acid of the base on B after it (arrows.judgement.acidity). A concerted elimination
(E2: another sigma bond breaks in the same step) is not a plain proton transfer and is left alone,
nor is a hydrogen passed round a pericyclic array (an ene reaction, a [1,5]-hydrogen shift), where
no base takes a proton and no ions form. A proton beside a cation has no entry and is not judged
(nor one beside it in another resonance form: a C-H whose pair goes into a C=C that pushes its pi
pair on into the cation, a vinylogous E1), except an azolium's C2-H (a thiazolium's ~18, an
imidazolium's ~23), taken to make the ylide or carbene, and an azolium's ring N-H, read by its own
entry whichever ring N the charge is drawn on.

A C-H whose pair is pushed through a C=O (or C=N) onto its O (or N), which takes a proton from an
acid HA in the same step (concerted general-base, general-acid enolisation, as triose phosphate
isomerase and citrate synthase draw it), makes the enol, not the enolate: the step is judged as a
whole. By the thermodynamic cycle that links a carbon acid's pKa to its keto-enol constant and its
enol's O-H pKa (pKa(C-H) = pK_E + pKa(enol O-H); Kresge; Richard & Amyes; Jencks's account of
concerted general acid-base catalysis; memory), the step's uphill estimate is
[pKa(C-H) - pKa(BH+)] + [pKa(HA) - pKa(enol O-H)], each from the table.
"""
from __future__ import annotations

from contextlib import contextmanager
from contextvars import ContextVar
from typing import Callable, Iterator, NamedTuple, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ResolvedMove, nameable, pair
from ..judgement.acidity import (ALKOXIDE_ACID_PKA, AZOLIUM_C2_H, AZOLIUM_N_H, HYDROGEN, PYRROLE_TYPE_N, Acidity,
                                 acidity_of, pyrrole_type_nitrogen)
from ..judgement.perception import Perceived, RecentViews, aromatic
from ..judgement.sigma_complexes import rearomatising_moves, rearomatising_path_to
from ..rdkit_io import HYDRIDIC
from ..model import Location
from ..trace import StepTrace
from . import Check
from .pericyclic import forbidden_hydrogen_shift, photochemical

DEFAULT_PKA_GAP = 12.0
_gap: ContextVar[float] = ContextVar("pka_gap", default=DEFAULT_PKA_GAP)


def set_pka_gap(value: float) -> Callable[[], None]:
    """Set the uphill threshold (pKa units) for the checks that run after this call; returns the
    function that puts the previous value back."""
    token = _gap.set(value)
    return lambda: _gap.reset(token)


@contextmanager
def pka_gap(value: float) -> Iterator[None]:
    token = _gap.set(value)
    try:
        yield
    finally:
        _gap.reset(token)


class ProtonTransfer(NamedTuple):   # one per proton-transfer arrow: a named tuple is the cheapest record
    base_atom: int
    acid_atom: int
    hydrogen: int
    loc: Location
    acid: Optional[Acidity]            # the acid given up, before the step
    conjugate_acid: Optional[Acidity]  # the base once protonated, after the step
    # The same step's protonation of the atom this C-H's pair is pushed onto (the enol's O): its
    # uphill estimate is added to this one's (the step judged as a whole; see the module's text).
    credited: Optional["ProtonTransfer"] = None

    @property
    def uphill(self) -> Optional[float]:
        if self.acid is None or self.conjugate_acid is None:
            return None
        own = self.acid.pka - self.conjugate_acid.pka
        return own if self.credited is None else own + self.credited.uphill


def proton_transfers(st: StepTrace, views: Optional[RecentViews] = None) -> list[ProtonTransfer]:
    """The plain proton transfers of one step, each with its two acidities; `views` holds the
    perceived views of the states met lately (the state after one step is the state before the next)."""
    if st.after is None or st.change.pericyclic:
        return []
    before, elements, broken = st.before.mol, st.before.elements, st.change.broken
    found = []
    for m in st.change.moves:
        if m.electrons != 2 or len(m.sink_atoms) != 2:
            continue
        base, h = m.sink_atoms   # a new bond is written (the atom the pair stays on, the other)
        if elements[h] != 1 or h in m.source_atoms:
            continue   # not to a hydrogen, or the hydrogen moves with its own pair (a hydride shift)
        given_up = [b for b in broken if h in b]   # the X-H bond this step breaks
        if len(given_up) != 1 or st.before.bond_sums[h] != 1:   # a hydrogen bridging two atoms is no proton
            continue
        x = _other(given_up[0], h)
        if any(b is not given_up[0] and elements[b[0]] != 1 and elements[b[1]] != 1
               and before.GetBondBetweenAtoms(*b).GetBondTypeAsDouble() == 1 for b in broken):
            continue   # a concerted elimination, not a plain proton transfer
        made_cation = False
        if m.source_kind == "bond" and _next_to_cation(st.after, base):
            # A pi pair that takes the proton leaves a cation beside it. Judged only where that is a
            # bare carbocation (an alkene protonated): its C-H, a strong acid, is CARBOCATION's.
            # Beside a lone pair (an enol's oxocarbenium, an enamine's iminium) no entry of our
            # table holds it.
            if not _carbocation_beside(st.after, base):
                continue
            made_cation = True
        beside_cation = _next_to_cation(st.before, x) or _pushed_on_to_cation(st, x, h)
        if beside_cation and elements[x] not in (6, 7):
            # A cation's conjugate acid, or a C-H beta to a cation (E1, or the alpha C-H of a
            # protonated carbonyl or an iminium): no entry in our table. An azolium's C2-H or ring
            # N-H has one, and is kept until its entry is read (below).
            continue
        found.append((base, x, h, m.move.loc, made_cation, beside_cation))
    if not found:
        return []
    views = RecentViews() if views is None else views
    acids, conjugates = views.of(st.before), views.of(st.after)
    # A proton lost from a sigma complex (an arenium ion, or the dienone of an azo coupling or a
    # phenol's substitution) restores the ring's aromaticity: fast and downhill (common practice),
    # though the C-H, read by the table, is an alkane's. The pKa of neither is in the table.
    found = [f for f in found if not _rearomatised(acids, conjugates, f[1])]
    if not found:
        return []
    def acidity(view: Perceived, atom: int) -> Optional[Acidity]:
        return HYDROGEN if elements[atom] == 1 else _acidity(view, atom)   # H2, given up or made

    def conjugate(base: int, made: bool) -> Optional[Acidity]:
        if made:
            return CARBOCATION
        if elements[base] == 7 and _pyrrole_type(acids, base):
            return PYRROLE_TYPE_N   # judged before the step: after it the ring is no longer aromatic
        return acidity(conjugates, base)
    transfers = []
    for b, x, h, loc, made, beside_cation in found:
        given_up = acidity(acids, x)
        if beside_cation and given_up not in AZOLIUM_C2_H + AZOLIUM_N_H:
            continue   # beside a cation, other than an azolium's C2-H or ring N-H: no entry (above)
        transfers.append(ProtonTransfer(b, x, h, loc, given_up, conjugate(b, made)))
    return _credit_enol_protonation(st, transfers)


def _credit_enol_protonation(st: StepTrace, transfers: list[ProtonTransfer]) -> list[ProtonTransfer]:
    """Each C-H transfer whose pair the step pushes onto an O or N that takes a proton in the same
    step, with that protonation credited (the step makes the enol; see the module's text)."""
    if len(transfers) < 2:
        return transfers
    elements = st.before.elements
    by_taker = {(t.base_atom, t.hydrogen): t for t in transfers}
    out = []
    for t in transfers:
        if elements[t.acid_atom] == 6 and t.uphill is not None \
                and t.conjugate_acid not in (PYRROLE_TYPE_N, CARBOCATION):
            end = _protonated_end(st, t.acid_atom, t.hydrogen)
            partner = by_taker.get(end) if end is not None else None
            if partner is not None and partner.uphill is not None:
                t = t._replace(credited=partner)
        out.append(t)
    return out


def _protonated_end(st: StepTrace, carbon: int, hydrogen: int) -> Optional[tuple[int, int]]:
    """(the O or N, the hydrogen it takes) where the pair of `carbon`'s bond to `hydrogen` is pushed
    through a C=O or C=N (and any C=C between) onto that O or N, which takes a proton in the same
    step: `C1-H -> C1=C2` with `C2=O3 -> O3-H(N10)`. None when the pair ends as a lone pair (the
    enolate) or elsewhere."""
    moves, elements = st.change.moves, st.before.elements
    start = next((m for m in moves if m.source_kind == "bond" and m.electrons == 2 and len(m.sink_atoms) == 2
                  and set(m.source_atoms) == {carbon, hydrogen} and carbon in m.sink_atoms
                  and hydrogen not in m.sink_atoms), None)
    if start is None:
        return None
    pushed = _other(start.sink_atoms, carbon)   # gains a bond: one of its own pairs moves on
    used = [start]
    for _ in range(len(moves)):
        m = next((m for m in moves if m.source_kind == "bond" and m.electrons == 2 and pushed in m.source_atoms
                  and all(m is not u for u in used)), None)
        if m is None:
            return None
        far = _other(m.source_atoms, pushed)
        if far not in m.sink_atoms:
            return None
        if len(m.sink_atoms) == 1:   # the pair left on `far`: protonated only by its own lone pair's arrow
            taken = next((n.sink_atoms for n in moves if n.source_kind == "lone_pair" and n.source_atoms == (far,)
                          and len(n.sink_atoms) == 2 and elements[_other(n.sink_atoms, far)] == 1), None)
            return (far, _other(taken, far)) if taken is not None and elements[far] in (7, 8) else None
        partner = _other(m.sink_atoms, far)
        if elements[partner] == 1:
            return (far, partner) if elements[far] in (7, 8) else None
        used.append(m)
        pushed = partner   # a C=C pair moved on along the chain (a vinylogous push)
    return None


def _pushed_on_to_cation(st: StepTrace, atom: int, hydrogen: int) -> bool:
    """Whether the pair of `atom`'s bond to `hydrogen` goes into a pi bond to a neighbour whose own
    pi pair the step moves on, along a chain of pushes, into a cation: a bond made to a carbocation
    (the allyl cation's far end, `C4-H -> C1=C4` with `C1=C2 -> C2=C3` onto C3+) or the pair left
    on the O+ (N+) of a C=O+ (C=N+). That hydrogen is beside the cation in another resonance form of
    it (a vinylogous E1, the proton loss after a Nazarov closure; common practice), as acidic as one
    beside the cation itself, and is not judged either."""
    moves, before = st.change.moves, st.before
    start = next((m for m in moves if m.source_kind == "bond" and m.electrons == 2 and len(m.sink_atoms) == 2
                  and set(m.source_atoms) == {atom, hydrogen} and atom in m.sink_atoms
                  and hydrogen not in m.sink_atoms), None)
    if start is None:
        return False
    pushed = _other(start.sink_atoms, atom)   # gains a bond: its pi pair moves on
    if before.mol.GetBondBetweenAtoms(atom, pushed) is None:
        return False   # a bond made to a new partner (water's O-H pair as the O adds): no neighbour's pi pair
    used = [start]
    for _ in range(len(moves)):
        m = next((m for m in moves if m.source_kind == "bond" and m.electrons == 2 and pushed in m.source_atoms
                  and all(m is not u for u in used)), None)
        if m is None or before.bond_electrons(*m.source_atoms) < 4:
            return False   # no pi pair moves on (a sigma bond broken is another event)
        far = _other(m.source_atoms, pushed)
        if far not in m.sink_atoms:
            return False
        if len(m.sink_atoms) == 1:   # the pair left on `far`: an O+ (N+) neutralised
            return _charged_alone(before, far)
        partner = _other(m.sink_atoms, far)
        if before.elements[partner] == 1:
            return False   # the pair takes a proton (an enol made: judged as a whole, above)
        if _charged_alone(before, partner) and before.nonbonding[partner] == 0:
            return True
        used.append(m)
        pushed = partner
    return False


def _charged_alone(state, atom: int) -> bool:
    """Whether `atom` is positive with no negative neighbour (a nitro group's N+, balanced by its own
    O-, is no cation)."""
    return state.formal_charge(atom) > 0 and not any(
        state.formal_charge(n.GetIdx()) < 0 for n in state.mol.GetAtomWithIdx(atom).GetNeighbors())


def _pyrrole_type(view: Perceived, atom: int) -> bool:
    """Whether state atom `atom` is a pyrrole-type nitrogen in the view (arrows.judgement.acidity)."""
    position = view.position(atom)
    return position is not None and pyrrole_type_nitrogen(view.mol, position)


def _better_site(st: StepTrace, view: Perceived, nitrogen: int, hydrogen: int) -> str:
    """AR508's hint for a proton put on a pyrrole-type nitrogen: the site of the same ring that
    takes it (common practice; values from memory): an azole's pyridine-type N (imidazole's
    conjugate acid 7.0), else a pyrrole's C2 (-3.8, Joule & Mills) or an indole's C3 (about -3.5):
    the carbon next to N, or one further along when the other carbon next to N is a ring fusion."""
    mol, label, before = view.mol, st.before.label, st.before
    position = view.position(nitrogen)
    lead = f"{label(nitrogen)}'s lone pair is part of the aromatic sextet"
    rings = [r for r in mol.GetRingInfo().AtomRings() if position in r and len(r) == 5]
    if not rings:
        return f"{lead}: another site takes the proton"
    ring, state = rings[0], view.original
    h = label(hydrogen) if nameable(before.mol, hydrogen) else None
    for k in ring:
        a = mol.GetAtomWithIdx(k)
        if k != position and a.GetAtomicNum() == 7 and a.GetIsAromatic() and a.GetFormalCharge() == 0 \
                and a.GetTotalDegree() == 2:
            n = state[k]
            where = (f"{label(n)}" + (f", `:{label(n)} -> {h}`" if h else "") if nameable(before.mol, n) else
                     "the ring N with no hydrogen or substituent (give it a map number to draw the arrow)")
            return (f"{lead}. An azole takes a proton at its pyridine-type N (imidazole's conjugate acid has pKa 7.0, "
                    f"memory): {where}")
    info = mol.GetRingInfo()
    alpha = [n.GetIdx() for n in mol.GetAtomWithIdx(position).GetNeighbors() if n.GetIdx() in ring]
    fused = [k for k in alpha if info.NumAtomRings(k) > 1]
    if len(alpha) != 2 or len(fused) == 2 or any(mol.GetAtomWithIdx(k).GetAtomicNum() != 6 for k in alpha):
        return f"{lead}: the ring takes a proton elsewhere, on carbon, and only from a strong acid"
    if fused:   # an indole: the carbon beyond the free alpha carbon, C3
        free = next(k for k in alpha if k not in fused)
        site = next(n.GetIdx() for n in mol.GetAtomWithIdx(free).GetNeighbors()
                    if n.GetIdx() in ring and n.GetIdx() != position)
        kind, number, value, words = "An indole", "C3", "about -3.5", "the five-membered ring's carbon two bonds from"
    else:
        site = min(alpha, key=lambda k: (mol.GetAtomWithIdx(k).GetTotalNumHs() == 0, k))
        kind, number, value, words = "A pyrrole", "C2", "-3.8; Joule & Mills", "the ring carbon next to"
    carbon = state[site]
    partner = next((b.GetOtherAtomIdx(carbon) for b in before.mol.GetAtomWithIdx(carbon).GetBonds()
                    if b.GetBondTypeAsDouble() == 2 and before.elements[b.GetOtherAtomIdx(carbon)] == 6), None)
    if nameable(before.mol, carbon) and partner is not None and nameable(before.mol, partner) and h:
        c, d = label(carbon), label(partner)
        where = f"{c}, with the pi pair of {c}={d}: `{c}={d} -> {c}-{h}`"
    else:
        where = f"{words} {label(nitrogen)} ({number}; give it a map number to draw the arrow)"
    return (f"{lead}. {kind} takes a proton on carbon, and only from a strong acid (its conjugate acid has pKa "
            f"{value}, memory): at {where}")


# The C-H beside a carbocation (a protonated alkene) as an acid: no tabulated aqueous value; an
# estimate of a strong acid's (memory). Only strong acids (H3O+, H2SO4, HX) protonate an alkene
# to a carbocation (common practice: acid-catalysed hydration; water or an alcohol alone does not).
CARBOCATION = Acidity("a carbocation's C-H (a protonated alkene)", "an alkene", "[#6+]", -10, "~-10",
                      "estimate (memory): only strong acids protonate an alkene; no tabulated value")


def _carbocation_beside(state, atom: int) -> bool:
    """Whether a neighbour of `atom` in `state` is a bare carbocation: a carbon with a positive
    charge, no lone pair, and no lone pair beside it or at the far end of a C=C beside it to share
    the charge (a dienamine protonated at its far carbon gives a vinylogous iminium ion)."""
    for n in state.mol.GetAtomWithIdx(atom).GetNeighbors():
        i = n.GetIdx()
        if n.GetAtomicNum() == 6 and state.formal_charge(i) > 0 and state.nonbonding[i] == 0 \
                and not _lone_pair_within_reach(state, n, atom):
            return True
    return False


def _lone_pair_within_reach(state, cation: Chem.Atom, skip: int) -> bool:
    """A lone pair on a neighbour of `cation` (other than `skip`), or on a neighbour of the far
    carbon of a C=C that `cation` is bonded to."""
    for m in cation.GetNeighbors():
        j = m.GetIdx()
        if j == skip:
            continue
        if state.nonbonding[j]:
            return True
        for bond in m.GetBonds():
            far = bond.GetOtherAtom(m)
            if bond.GetBondTypeAsDouble() == 2 and far.GetIdx() != cation.GetIdx() and any(
                    state.nonbonding[x.GetIdx()] for x in far.GetNeighbors() if x.GetIdx() != j):
                return True
    return False


def _acidity(view: Perceived, atom: int) -> Optional[Acidity]:
    """Remembered on the view: a shuttle asks again about the same atom of the same state."""
    position = view.position(atom)
    if position is None:
        return None
    known = view.memo.setdefault("acidity", {})
    if position not in known:
        known[position] = acidity_of(view.mol, position)
    return known[position]


def _rearomatised(before: Perceived, after: Perceived, atom: int) -> bool:
    """Whether `atom` is aromatic after the step and was not before."""
    return aromatic(after, atom) and not aromatic(before, atom)


def _other(pair: tuple[int, ...], atom: int) -> int:
    return pair[1] if pair[0] == atom else pair[0]


def _next_to_cation(state, atom: int) -> bool:
    """Whether a neighbour of `atom` is a cation without lone pairs, or bears the cation in a
    resonance form: the carbon of C=O+ (a protonated carbonyl) or C=N+ (an iminium), whose
    alpha C-H is far more acidic than the neutral carbonyl's (acid-catalysed enolisation,
    enamine formation; common practice)."""
    cations = state.cations()
    if not cations:
        return False   # no cation anywhere (most states): the neighbours need not be read off the Mol
    for n in state.mol.GetAtomWithIdx(atom).GetNeighbors():
        i = n.GetIdx()
        if i in cations and state.nonbonding[i] == 0 and _charged_alone(state, i):
            return True   # (a nitro group's N+, its charge balanced by its own O-, is no cation)
        if any(b.GetBondType() == Chem.BondType.DOUBLE and b.GetOtherAtomIdx(i) in cations
               and b.GetOtherAtomIdx(i) != atom for b in n.GetBonds()):
            return True   # (not the atom itself: an iminium's own N-H is judged as an iminium's)
    return False


def _unused_map_number(state) -> int:
    """One more than the largest map number of `state`: the number a hint gives a species it brings in."""
    return 1 + max((a.GetAtomMapNum() for a in state.mol.GetAtoms()), default=0)


def _units(uphill: float, gap: float) -> str:
    """The gap as a whole number, unless that would read as no more than the threshold ("uphill by
    about 12 ... the threshold is 12"): then with one decimal."""
    return f"{uphill:.0f}" if round(uphill) > gap else f"{uphill:.1f}"


def _hydride_taken_as_a_proton(st: StepTrace, t: ProtonTransfer) -> Diagnostic:
    """AR508 for a base drawn taking a hydrogen off boron, aluminium, silicon or a main-group metal
    as if it were a proton."""
    label = st.before.label
    b, x = label(t.base_atom), label(t.acid_atom)
    h = label(t.hydrogen)
    symbol = st.before.mol.GetAtomWithIdx(t.acid_atom).GetSymbol()
    free = _unused_map_number(st.after)
    take = (f"`:{b} -> H(O{free})` with `O{free}-H -> O{free}`" if nameable(st.before.mol, t.base_atom)
            else f"{b} taking a proton of water")
    return Diagnostic(
        "AR508", f"{b} takes {h} as a proton, but a hydrogen on {symbol} is hydridic: the {x}-H bond's pair "
        f"leaves with the hydrogen (a hydride), and {symbol}-H is no proton source",
        t.loc, hint=f"the proton comes from an O-H or N-H acid: bring water, an alcohol or the workup acid in with "
        f"`uses water = \"[OH2:{free}]\"` and write {take}; the {x}-H pair goes to an electrophile instead "
        f"(a carbonyl carbon: `{x}-H -> C-H({x})` with that carbon's number; or an acid's proton, making H2)",
        atoms=(b, x), step=st.index)


class UphillProtonTransfers(Check):
    name = "proton transfers"
    codes = ("AR508",)

    def __init__(self) -> None:
        self.gap = _gap.get()

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        gap = self.gap
        for t in proton_transfers(st, context.views):
            uphill = t.uphill
            base, acid = t.conjugate_acid, t.acid
            # A proton put on a pyrrole-type N is judged uphill at all, not against the gap: the same
            # ring holds a site that takes it instead (its N3, or C2), far more basic in the gas phase
            # (arrows.judgement.acidity), and -4 is only an upper bound on that cation's pKa.
            if st.before.elements[t.acid_atom] in HYDRIDIC:
                yield _hydride_taken_as_a_proton(st, t)
                continue
            if uphill is None or uphill <= (0.0 if base is PYRROLE_TYPE_N else gap):
                continue
            label_b, label_x = st.before.label(t.base_atom), st.before.label(t.acid_atom)
            if base is PYRROLE_TYPE_N:
                yield Diagnostic(
                    "AR508",
                    f"{label_b}, a pyrrole-type nitrogen whose lone pair is part of the aromatic sextet, taking "
                    f"{acid.site} ({acid.shown}): its N-protonated cation is no longer aromatic, a stronger acid than "
                    f"pyrrole's conjugate acid (-3.8, protonated on carbon): uphill by about {uphill:.0f} pKa "
                    f"units or more ({label_b} takes the proton of {label_x})",
                    t.loc, hint=_better_site(st, context.views.of(st.before), t.base_atom, t.hydrogen),
                    atoms=(label_b, label_x), step=st.index)
                continue
            if base is CARBOCATION:
                yield Diagnostic(
                    "AR508",
                    f"a C=C taking {acid.site} ({acid.shown}) to make a carbocation: uphill by about "
                    f"{_units(uphill, gap)} pKa units against a carbocation's C-H ({base.shown}, an estimate; "
                    f"{label_b} takes the proton of {label_x})",
                    t.loc, hint="only a strong acid (H3O+, H2SO4, a hydrogen halide: pKa below about 0) protonates "
                    "an alkene to a carbocation (common practice: acid-catalysed hydration); take the proton "
                    f"from one, or another step is meant; the threshold is {gap:g} units (`arrows check --pka-gap`)",
                    atoms=(label_b, label_x), step=st.index)
                continue
            if t.credited is not None:
                yield _credited_diagnostic(st, t, gap)
                continue
            yield Diagnostic(
                "AR508",
                f"{base.base} (pKa of {base.acid} {base.shown}) removing {acid.site} ({acid.shown}): "
                f"uphill by about {_units(uphill, gap)} pKa units ({label_b} takes the proton of {label_x})",
                t.loc, hint=_sigma_complex_hint(st, t) or f"a base whose conjugate acid has a pKa near {acid.shown.lstrip('~')} "
                f"is needed, or another proton is meant; the threshold is {gap:g} units (`arrows check --pka-gap`)",
                atoms=(label_b, label_x), step=st.index)


def _sigma_complex_hint(st: StepTrace, t: ProtonTransfer) -> Optional[str]:
    """Where the proton is taken off the cation of a sigma complex (an arenium ion's iminium N-H, a
    3H-indolium's N-H) that holds an sp3 ring C-H whose loss would restore the aromatic ring (RDKit
    judging): that C-H is the proton meant, whatever the base (common practice)."""
    before = st.before
    if before.formal_charge(t.acid_atom) <= 0:
        return None
    path = rearomatising_path_to(before, t.acid_atom)
    if path is None:
        return None
    carbon = before.label(path[0])
    arrows = rearomatising_moves(before, path, t.base_atom)
    written = f": {arrows}, in place of this step's arrows" if arrows else ""
    return (f"the proton meant is the one on {carbon}, the sp3 ring carbon of this sigma complex: taken, it "
            f"restores the aromatic ring{written}")


def _credited_diagnostic(st: StepTrace, t: ProtonTransfer, gap: float) -> Diagnostic:
    """AR508 for a C-H taken as the same step protonates the O (or N) its pair is pushed onto: the
    step judged as a whole, the enol made rather than the enolate (the module's text)."""
    label = st.before.label
    b, x = label(t.base_atom), label(t.acid_atom)
    end, given = t.credited, t.credited.acid
    taker, donor = label(end.base_atom), label(end.acid_atom)
    acid, base, made = t.acid, t.conjugate_acid, end.conjugate_acid
    return Diagnostic(
        "AR508",
        f"{base.base} (pKa of {base.acid} {base.shown}) removing {acid.site} ({acid.shown}) as {taker} takes the "
        f"proton of {donor} ({given.acid} {given.shown}) in the same step: that protonation of {taker} is credited "
        f"(the step makes {made.acid}, {made.shown}, not {acid.base}), and the step is still uphill by about "
        f"{_units(t.uphill, gap)} pKa units ({b} takes the proton of {x})",
        t.loc, hint=f"judged as [pKa(C-H) - pKa(BH+)] + [pKa(HA) - pKa({made.acid})] = ({acid.pka:g} - "
        f"{base.pka:g}) + ({given.pka:g} - {made.pka:g}); a stronger base or a stronger acid is needed, or another "
        f"proton is meant; the threshold is {gap:g} units (`arrows check --pka-gap`)",
        atoms=(b, x), step=st.index)


def freed_hydrogens(st: StepTrace, charge: int = 1) -> list[int]:
    """The hydrogens this step sets free with formal charge `charge`: bonded before it, with no bond
    after it. Charge +1, a bare proton (an X-H pair sent to X or into a new bond, and no base's
    arrow to the hydrogen); 0, a hydrogen atom (the bond split one electron each way)."""
    after = st.after
    if after is None:
        return []
    elements = st.before.elements
    found = []
    for pair_ in st.change.broken:
        for h in pair_:
            if elements[h] == 1 and h not in found and after.formal_charge(h) == charge \
                    and after.mol.GetAtomWithIdx(h).GetDegree() == 0:
                found.append(h)
    return found


# Atoms that take a bare proton, best first (common practice: in an E1 or an oxidation the solvent,
# water or the counter-ion takes it): an anion's lone pair, then an amine's, then an oxygen's; a
# halogen only as a halide ion.
_TAKERS = (7, 8, 16, 17, 35, 53, 9)


def _taker(st: StepTrace, holder: int) -> Optional[int]:
    """An atom of another molecule in the state after the step with a lone pair to take the proton
    the step threw off `holder`: an anion first, then N, then O (water, an alcohol, the counter-ion
    of the acid); none of the proton's own molecule, before or after the step."""
    after = st.after
    mine = set()
    for state in (st.before, after):   # the proton's own molecule, before and after the step
        mine |= next(set(f) for f in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False) if holder in f)
    released = set(after.released)
    found = [i for i, z in enumerate(after.elements)
             if z in _TAKERS and i not in mine and i not in released and after.nonbonding[i] >= 2
             and (after.formal_charge(i) < 0 or (after.formal_charge(i) == 0 and z in (7, 8, 16)))]
    found.sort(key=lambda i: (after.formal_charge(i) >= 0, _TAKERS.index(after.elements[i]),
                              not nameable(after.mol, i)))
    return found[0] if found else None


class BareProtons(Check):
    """AR518: a step breaks an X-H bond, its pair staying with X or going into a new bond, and no
    base's arrow ends at the hydrogen: it is left a bare proton. In solution a proton is always
    handed to a base, the solvent, water or the counter-ion of the acid (common practice); writing
    "-H+" is a shorthand, so a warning that names a base present (or one to bring in) to take it.
    A proton written as `[H+]` and used as an acid, or one a base takes in the same step, is not
    judged."""
    name = "bare protons"
    codes = ("AR518",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        for h in freed_hydrogens(st):
            label = st.before.label
            holder = next(i for pair_ in st.change.broken if h in pair_ for i in pair_ if i != h)
            hydrogen = label(h)
            taker = _taker(st, holder)
            if taker is not None and nameable(st.after.mol, taker) and nameable(st.before.mol, h):
                name = st.after.label(taker)
                hint = (f"let a base take it in this step: {name}, for example, with `:{name} -> "
                        f"{hydrogen}` (water, the solvent or the acid's counter-ion takes the proton)")
            else:
                free = _unused_map_number(st.after)
                taking = f"`:O{free} -> {hydrogen}`" if nameable(st.before.mol, h) else \
                    f"an arrow from O{free} to {hydrogen} (give {label(holder)} a map number to name it)"
                hint = (f"let a base take it in this step: bring one in with `uses base = \"[OH2:{free}]\"` (water, "
                        f"or the solvent or counter-ion the conditions hold) and add {taking}")
            loc = next((m.move.loc for m in st.change.moves if m.source_kind == "bond" and h in m.source_atoms),
                       st.step.loc)
            yield Diagnostic(
                "AR518", f"{hydrogen} leaves {label(holder)} as a bare proton: no base takes it in this step",
                loc, hint=hint, atoms=(hydrogen, label(holder)), step=st.index)


class CarbeneFromCH(Check):
    """AR524: a carbon keeps the pair of one of its C-H bonds (its proton taken or passed on) and in
    the same step loses the pair of another bond, ending neutral with two bonds and a lone pair: a
    carbene made from a carbon that had no lone pair. A carbon that loses a proton becomes a
    carbanion first; only a carbanion (or an ylide's carbon) lets a group go to leave a carbene, as
    CCl3- gives dichlorocarbene (an alpha elimination, stepwise; Clayden, from memory). Drawn in one
    step it is most often a hydrogen taken from the wrong carbon: an ene reaction moves the allylic
    hydrogen, whose pair makes the new pi bond, not a vinylic one. Carbenes made any other way
    (nitrogen lost from a diazo carbanion, a photolysis) and steps under light are not judged."""
    name = "carbenes from C-H"
    codes = ("AR524",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after = st.after
        if after is None or photochemical(st):
            return
        before, elements = st.before, st.before.elements
        kept = {m.sink_atoms[0]: m for m in st.change.moves
                if m.electrons == 2 and m.source_kind == "bond" and len(m.sink_atoms) == 1
                and m.sink_atoms[0] in m.source_atoms and elements[m.sink_atoms[0]] == 6
                and any(elements[a] == 1 for a in m.source_atoms)}
        for carbon, move in kept.items():
            if before.nonbonding[carbon] or after.nonbonding[carbon] != 2 or after.formal_charge(carbon) \
                    or after.bond_sums[carbon] != 2 or after.mol.GetAtomWithIdx(carbon).GetNumRadicalElectrons():
                continue
            label = before.label
            hydrogen = next(a for a in move.source_atoms if a != carbon)
            yield Diagnostic(
                "AR524", f"{label(carbon)} keeps the pair of its bond to {label(hydrogen)} and loses another bond's "
                f"pair in the same step: it ends as a carbene (neutral, two bonds and a lone pair), made from a "
                f"carbon that had no lone pair", move.move.loc,
                hint="a carbon that gives up its proton becomes a carbanion: take the proton in a step of its own, "
                     "then let the group go (an alpha elimination, as CCl3- gives dichlorocarbene); in an ene "
                     "reaction the hydrogen that moves is the allylic one, on the carbon next to the C=C, and its "
                     "pair makes the new pi bond",
                atoms=(label(carbon), label(hydrogen)), step=st.index)


class FourCentre(NamedTuple):
    """A proton taken by `base` from `acid`, both bonded to `corner`: the ring of the transfer."""
    base: int
    acid: int
    hydrogen: int
    corner: int
    move: ResolvedMove   # the arrow to the hydrogen
    leaves: bool = False   # `base` leaves `corner` as it takes the proton of a C-H (a syn elimination)
    adds: bool = False     # `acid` bonds to `corner` as the pi pair of corner=base takes its proton


def four_centre_transfers(st: StepTrace) -> list[FourCentre]:
    """The arrows of one step that move a proton round a four-membered array inside one neutral
    tautomer: a pair (lone or pi) into a new bond to a hydrogen whose bond to its holder breaks, the
    two atoms bonded to one corner atom that the step changes and that both stay bonded to.

    Not judged, as the shorthand textbooks write for a transfer by way of the solvent (common
    practice): a proton handed across a corner the step leaves alone (a tetrahedral intermediate's
    O- taking its own N+-H), or taken off a cation (the oxonium an alcohol makes as it adds to a
    ketene, giving its proton to the enolate carbon). Nor an atom that takes an O-H or N-H proton as
    it leaves the corner (a carbonic acid monoester losing CO2 and the alcohol, as reagent guides
    draw it), a hydride or a hydrogen atom (the hydrogen moves with a pair or one electron of its
    own), a two-arrow [1,3]-H shift, which AR521 judges, or a step under light. An oxygen that takes
    a C-H proton as it leaves the corner, the C-H pair making the C=C (a syn elimination of water
    or an alcohol round four atoms), is returned with `leaves` set; an O, N or S that bonds to one
    end of a C=C as the pi pair takes its proton at the other, with `adds` set."""
    change = st.change
    before = st.before
    elements, broken = before.elements, change.broken
    found = []
    for m in change.moves:
        if m.electrons != 2 or len(m.sink_atoms) != 2:
            continue
        base, h = m.sink_atoms
        if elements[h] != 1 or h in m.source_atoms:
            continue
        given_up = [b for b in broken if h in b]
        if len(given_up) != 1 or before.bond_sums[h] != 1:
            continue
        acid = _other(given_up[0], h)
        if before.formal_charge(acid) > 0:
            continue
        corner = _corner(st, base, acid, h)
        if corner is None:
            corner = _added_across(st, m, acid)
            if corner is not None:
                found.append(FourCentre(base, acid, h, corner, m, adds=True))
            continue
        if pair(base, corner) not in broken:
            found.append(FourCentre(base, acid, h, corner, m))
        elif _eliminated_with_its_own_base(st, base, acid, h, corner):
            found.append(FourCentre(base, acid, h, corner, m, leaves=True))
    if found and (photochemical(st) or forbidden_hydrogen_shift(st) is not None):
        return []
    return found


def _added_across(st: StepTrace, taking: ResolvedMove, acid: int) -> Optional[int]:
    """The carbon `acid` bonds to in this step while the pi pair between that carbon and the
    proton's taker takes the proton (`:O12 -> C2` with `C2=C3 -> C3-H(O12)`): an X-H added
    across a C=C in one four-centre step. None for any other step."""
    if taking.source_kind != "bond" or st.before.elements[acid] not in (7, 8, 16):
        return None
    base = taking.sink_atoms[0]
    corner = _other(taking.source_atoms, base)
    if base not in taking.source_atoms or st.before.bond_electrons(base, corner) < 4 \
            or st.before.elements[corner] != 6 or st.before.elements[base] != 6:
        return None
    return corner if pair(acid, corner) in st.change.formed else None


def _eliminated_with_its_own_base(st: StepTrace, base: int, acid: int, hydrogen: int, corner: int) -> bool:
    """Whether oxygen `base`, leaving carbon `corner`, takes the proton of the neighbouring carbon
    `acid` whose C-H pair makes the new C=C with `corner`: a 1,2-elimination in which the leaving
    group is its own base, round four atoms."""
    elements = st.before.elements
    if elements[base] != 8 or elements[acid] != 6 or elements[corner] != 6:
        return False
    return any(m.source_kind == "bond" and m.electrons == 2 and set(m.source_atoms) == {acid, hydrogen}
               and set(m.sink_atoms) == {acid, corner} for m in st.change.moves)


def _corner(st: StepTrace, base: int, acid: int, hydrogen: int) -> Optional[int]:
    """The atom bonded to both `base` and `acid` (not to each other) whose bonds the step changes:
    the corner round which a tautomerisation moves its pi bond (C1 of an imidic acid turning into
    its amide; the CH2 of a cyclohexa-1,3-diene, beside both ends of its [1,5]-H shift, is none).
    Only the atoms the step touches are asked about: most transfers are between two molecules."""
    before = st.before
    elements, bonded = before.elements, before.mol.GetBondBetweenAtoms
    for corner in st.change.touched_atoms:
        if corner not in (base, acid, hydrogen) and elements[corner] != 1 \
                and bonded(corner, base) is not None and bonded(corner, acid) is not None:
            return None if base == acid or bonded(base, acid) is not None else corner
    return None


class FourCentreProtonTransfers(Check):
    """AR526: a proton handed in one step between two atoms of one molecule that are bonded to one
    common atom: a four-membered cyclic transfer (an imidic acid's N taking its own O-H proton, a
    carboxylic acid's C=O oxygen taking its O-H proton). Such a transfer is strained and slow: a
    tautomerisation between 1,3-related heteroatoms goes by way of the solvent or an acid or base,
    two proton transfers (common practice; computed barriers for formimidic acid to formamide,
    from memory: about 45-50 kcal/mol direct, about 20 with one water). A proton passed inside one
    molecule goes round six atoms (an ene reaction, a beta-keto acid's decarboxylation). An O-H,
    N-H or S-H added across a C=C in one step is a four-centre ring too: it goes by way of an acid,
    the carbon protonated first (common practice); a hydride added so (hydroboration) moves with its
    own pair and is not judged."""
    name = "four-centre proton transfers"
    codes = ("AR526",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None:
            return
        for t in four_centre_transfers(st):
            label = st.before.label
            base, acid, corner = label(t.base), label(t.acid), label(t.corner)
            if t.leaves:
                taken = _acidity(context.views.of(st.after), t.base)   # water or an alcohol, once it holds the proton
                if taken is None or taken.pka < ALKOXIDE_ACID_PKA:
                    continue   # a weaker base (a carboxylate) is not judged
                yield Diagnostic(
                    "AR526", f"{base} leaves {corner} as {taken.base} and takes the proton of {acid} in the same "
                    f"step: a four-membered cyclic (syn) elimination of {taken.acid}, {taken.base} the leaving group "
                    f"and its own base", t.move.move.loc, hint=_elimination_hint(st, t, taken.acid),
                    atoms=(base, acid, corner), step=st.index)
                continue
            if t.adds:
                yield Diagnostic(
                    "AR526", f"{acid} bonds to {corner} and gives its proton to {base} in the same step: {acid}-H "
                    f"added across {corner}={base} round a four-membered ring (a 2+2 of a sigma and a pi bond), "
                    f"strained and slow; an alcohol, amine or thiol adds to a C=C by way of an acid (common "
                    f"practice)", t.move.move.loc, hint=_acid_first_hint(st, t, context.views),
                    atoms=(acid, corner, base), step=st.index)
                continue
            yield Diagnostic(
                "AR526", f"{base} takes the proton of {acid} in one step, and both are bonded to {corner}: a "
                f"four-membered cyclic proton transfer, strained and slow (computed barriers for formimidic acid "
                f"to formamide are about 45-50 kcal/mol direct against about 20 with one water, from memory)",
                t.move.move.loc, hint=_two_steps_hint(st, t), atoms=(base, acid, corner), step=st.index)


def _two_steps_hint(st: StepTrace, t: FourCentre) -> str:
    """The six-membered transfer the step offers (an atom four bonds from the acid that the step
    changes and that holds a lone pair: a beta-keto acid's ketone oxygen), else two proton
    transfers by way of water, written with the step's own atoms where they can be named."""
    before, label = st.before, st.before.label
    base, acid = label(t.base), label(t.acid)
    named = nameable(before.mol, t.hydrogen)
    six = _six_centre_base(st, t)
    if six is not None and named and nameable(before.mol, six):
        return (f"a proton passed inside one molecule goes round six atoms: let {label(six)}, four bonds from {acid} "
                f"and changed by this step, take it, `:{label(six)} -> {label(t.hydrogen)}` (as a beta-keto acid's "
                f"ketone oxygen does in its decarboxylation), or write two proton transfers by way of water brought "
                f"in with `uses`")
    free = _unused_map_number(st.after)
    if named and nameable(before.mol, t.base):
        taking = f"`:O{free} -> {label(t.hydrogen)}` in place of this arrow"
        giving = (f"`:{base} -> H(O{free})` with `O{free}-H -> O{free}`" if t.move.source_kind == "lone_pair"
                  else f"{base} takes a proton from it")
    else:
        taking, giving = f"water taking the proton of {acid}", f"{base} takes a proton from it"
    return (f"write two proton transfers by way of the solvent or an acid or base (common practice): bring water "
            f"in with `uses water = \"[OH2:{free}]\"`, {taking}, and in a step of its own {giving} (or protonate "
            f"{base} first from an acid, then let water take the proton of {acid})")


def _acid_first_hint(st: StepTrace, t: FourCentre, views: RecentViews) -> str:
    """Three steps for X-H added across C=C: the strongest acid of another molecule (pKa below 5,
    by the table) protonates the pi bond's carbon, pushed by a lone pair beside the other carbon
    where there is one (an enol ether's oxocarbenium), X adds to the cation, a base takes X's
    proton (the acid-catalysed addition of an alcohol to dihydropyran; Clayden, from memory)."""
    before, label = st.before, st.before.label
    x, corner, base = label(t.acid), label(t.corner), label(t.base)
    acid = _strongest_acid_apart(before, views.of(before), t.acid)
    if acid is None or not all(nameable(before.mol, k) for k in (t.acid, t.corner, t.base)):
        return (f"protonate {base} first with an acid (the {corner}={base} pi pair takes its proton), let {x} add to "
                f"the cation at {corner}, then let a base take {x}'s proton: three steps")
    a = label(acid)
    donor = next((n.GetIdx() for n in before.mol.GetAtomWithIdx(t.corner).GetNeighbors()
                  if n.GetIdx() not in (t.base, t.acid) and before.elements[n.GetIdx()] in (7, 8, 16)
                  and before.nonbonding[n.GetIdx()] >= 2 and nameable(before.mol, n.GetIdx())), None)
    push, pull = (f"`:{label(donor)} -> {corner}={label(donor)}`, ", f", `{corner}={label(donor)} -> {label(donor)}`") \
        if donor is not None else ("", "")
    return (f"by way of the acid {a}, in three steps: {push}`{corner}={base} -> {base}-H({a})`, `{a}-H -> {a}` "
            f"(the proton to {base} first); then `:{x} -> {corner}`{pull}; then `:{a} -> H({x})`, `{x}-H -> {x}`")


def _strongest_acid_apart(state, view: Perceived, apart: int) -> Optional[int]:
    """The mapped O-H, N-H or S-H of another molecule than `apart`'s with the lowest pKa below 5
    by the table: the acid the conditions hold."""
    mine = next(set(f) for f in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False) if apart in f)
    best = None
    for a in state.mol.GetAtoms():
        k = a.GetIdx()
        if k in mine or a.GetAtomicNum() not in (7, 8, 16) or not a.GetAtomMapNum() or not a.GetTotalNumHs(True):
            continue
        found = _acidity(view, k)
        if found is not None and found.pka < 5 and (best is None or found.pka < best[0]):
            best = (found.pka, k)
    return None if best is None else best[1]


def _elimination_hint(st: StepTrace, t: FourCentre, leaving_as: str) -> str:
    """Two steps for water or an alcohol lost from C-C: in base the enolate first, where a C=O (or
    C=N) beside the acid carbon holds its pair, then the E1cB; in acid, the oxygen protonated first."""
    before, label = st.before, st.before.label
    base, acid, corner, h = label(t.base), label(t.acid), label(t.corner), label(t.hydrogen)
    in_acid = f"in acid, {base} is protonated first and leaves as {leaving_as}, a base taking {h} (E1 or E2)"
    carbonyl = _carbonyl_beside(before, t.acid, t.corner)
    if carbonyl is None:
        return f"{base} leaves only once protonated: {in_acid}; a syn elimination goes round five or six atoms (an Ei)"
    c, o = label(carbonyl[0]), label(carbonyl[1])
    if all(nameable(before.mol, k) for k in (t.acid, t.hydrogen, t.base, t.corner, *carbonyl)):
        enolate = f" (`{acid}-H -> {acid}={c}`, `{c}={o} -> {o}`)"
        push = f" (`:{o} -> {c}={o}`, `{acid}={c} -> {acid}={corner}`, `{corner}-{base} -> {base}`)"
    else:
        enolate = push = ""
    return (f"in base, a base takes {h} in a step of its own, giving the enolate{enolate}, which pushes {base} out "
            f"of {corner} in the next{push}: an E1cB, as in an aldol dehydration; {in_acid}")


def _carbonyl_beside(state, carbon: int, apart_from: int) -> Optional[tuple[int, int]]:
    """A carbon bonded to `carbon` (not `apart_from`) with a double bond to O or N, and that O or N."""
    for n in state.mol.GetAtomWithIdx(carbon).GetNeighbors():
        if n.GetIdx() == apart_from or n.GetAtomicNum() != 6:
            continue
        for b in n.GetBonds():
            other = b.GetOtherAtom(n)
            if b.GetBondTypeAsDouble() == 2 and other.GetAtomicNum() in (7, 8):
                return n.GetIdx(), other.GetIdx()
    return None


def _six_centre_base(st: StepTrace, t: FourCentre) -> Optional[int]:
    """An N or O with a lone pair before the step, changed by it, four bonds from the acid: the
    atom that takes the proton round a six-membered ring."""
    before = st.before
    for k in st.change.touched_atoms:
        if k not in (t.base, t.acid) and before.elements[k] in (7, 8) and before.nonbonding[k] >= 2 \
                and len(Chem.GetShortestPath(before.mol, k, t.acid)) == 5:
            return k
    return None


class OniumBesideAte(Check):
    """AR531: a step in which an atom takes a proton with its lone pair and ends positive, bonded to
    an atom the same step leaves negative: an onium beside an ate, the charge-separated form of the
    bond between them. At a hypervalent centre that loses a ligand's pair (iodine(V) to iodine(III)
    in an IBX oxidation) the proton is taken by the oxygen of its X=O, whose pi pair returns to that
    oxygen in the same step (Kurti-Czako, from memory); a ligand oxygen taking it (the ring's ester
    oxygen of IBX) leaves O+ beside I-. A `resonance` step is not judged."""
    name = "onium beside an ate"
    codes = ("AR531",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or st.step.kind == "resonance":
            return
        before, after = st.before, st.after
        for m in st.change.moves:
            if m.source_kind != "lone_pair" or m.electrons != 2 or len(m.sink_atoms) != 2:
                continue
            taker, h = m.sink_atoms
            if before.elements[h] != 1 or after.formal_charge(taker) <= max(0, before.formal_charge(taker)):
                continue
            for n in after.mol.GetAtomWithIdx(taker).GetNeighbors():
                ate = n.GetIdx()
                made_negative = after.formal_charge(ate) < min(0, before.formal_charge(ate))
                if before.elements[ate] == 1 or not made_negative:
                    continue
                label = before.label
                yield Diagnostic(
                    "AR531", f"{label(taker)} takes {label(h)} and is left positive beside {label(ate)}, which "
                    f"this step leaves negative: an onium beside an ate, the charge-separated form of their bond",
                    m.move.loc, hint=_onium_beside_ate_hint(st, m, taker, ate), atoms=(label(taker), label(ate)),
                    step=st.index)
                break


def _onium_beside_ate_hint(st: StepTrace, move: ResolvedMove, taker: int, ate: int) -> str:
    """The atom double-bonded to the ate centre that takes the proton instead, its pi pair going
    back onto it (an IBX oxidation's I=O oxygen), written in place of the arrow; else the rule."""
    before, label = st.before, st.before.label
    h = label(move.sink_atoms[1])
    for n in before.mol.GetAtomWithIdx(ate).GetNeighbors():
        oxo = n.GetIdx()
        if oxo != taker and before.elements[oxo] in (7, 8, 16) and before.bond_electrons(ate, oxo) == 4 \
                and before.nonbonding[oxo] >= 2 and nameable(before.mol, oxo) and nameable(before.mol, ate):
            a, o = label(ate), label(oxo)
            return (f"let {o}, doubly bonded to {a}, take the proton as its pi pair returns to it: `:{o} -> {h}` "
                    f"in place of `{move.move}`, with `{a}={o} -> {o}`, as the I=O oxygen does in an IBX oxidation")
    return (f"another atom should take {h}: one whose own pi pair or bond pair moves onto it in the same step, "
            f"so that it is not left an onium beside {label(ate)}")


class CHPairBondsAsProtonGoes(Check):
    """AR529: a C-H bond's pair makes a new bond to an electrophile while a base takes that hydrogen
    in the same step: the enol or enolate (or carbanion) that the C-H gives is skipped. A C-H pair
    is no nucleophile; the proton goes first, to a base, and the C=C of the enol or the enolate's
    carbon bonds to the electrophile in a step of its own (common practice: the Mannich, aldol and
    alpha-halogenation go through the enol or enolate; Clayden, from memory). Not judged: a
    pericyclic step (an ene reaction moves its hydrogen round a ring of six), a hydride that moves
    with its own pair, and a carbene that takes the hydrogen and the carbon at once (an insertion
    into the C-H bond)."""
    name = "C-H pair bonding as its proton goes"
    codes = ("AR529",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        change = st.change
        if st.after is None or not change.formed or change.pericyclic:
            return
        elements = st.before.elements
        formed = None
        for m in change.moves:   # a C-H pair into a bond the step makes between C and another atom
            if m.source_kind != "bond" or m.electrons != 2 or len(m.sink_atoms) != 2:
                continue
            first, second = m.source_atoms
            h, carbon = (first, second) if elements[first] == 1 else (second, first)
            if elements[h] != 1 or elements[carbon] != 6 or h in m.sink_atoms or carbon not in m.sink_atoms:
                continue
            electrophile = m.sink_atoms[1] if m.sink_atoms[0] == carbon else m.sink_atoms[0]
            if formed is None:
                formed = {frozenset(p) for p in change.formed}
            if frozenset((carbon, electrophile)) not in formed:
                continue   # a C=C made (an E2, an E1 proton loss, an enolisation)
            taking = next((t for t in change.moves if t.electrons == 2 and h in t.sink_atoms and len(t.sink_atoms) == 2
                           and h not in t.source_atoms), None)
            if taking is None:
                continue
            base = taking.sink_atoms[1] if taking.sink_atoms[0] == h else taking.sink_atoms[0]
            if base == electrophile:
                continue   # a carbene inserting into the C-H bond
            label = st.before.label
            yield Diagnostic(
                "AR529", f"the pair of {label(carbon)}-H bonds {label(carbon)} to {label(electrophile)} as "
                f"{label(base)} takes that hydrogen in the same step: a C-H pair is no nucleophile, and the enol or "
                f"enolate it gives is skipped",
                m.move.loc, hint=_enol_first_hint(st, taking, m, electrophile),
                atoms=(label(carbon), label(electrophile), label(base)), step=st.index)
            return


def _enol_first_hint(st: StepTrace, taking: ResolvedMove, bonding: ResolvedMove, electrophile: int) -> str:
    """AR529's hint: the two steps, through the enol or enolate of the C=O (or C=N) beside the
    carbon where the atoms can be named (the step's other arrows go with the bonding), else in words."""
    before, label = st.before, st.before.label
    mol = before.mol
    hydrogen = next(a for a in bonding.source_atoms if before.elements[a] == 1)
    carbon = next(a for a in bonding.source_atoms if a != hydrogen)
    carbonyl = _carbonyl_beside(before, carbon, electrophile)
    if carbonyl is not None and all(nameable(mol, a) for a in (carbon, *carbonyl, electrophile, hydrogen)):
        k, hetero = carbonyl
        c, o, e, kk = label(carbon), label(hetero), label(electrophile), label(k)
        rest = "".join(f" and `{m.move}`" for m in st.change.moves if m is not taking and m is not bonding)
        return (f"take the proton in a step of its own, `{taking.move}` with `{c}-H -> {c}={kk}` and `{kk}={o} -> {o}` "
                f"(the enol or enolate), then let the C=C bond to {e}: `:{o} -> {kk}={o}` with `{c}={kk} -> {c}-{e}`"
                f"{rest}")
    return (f"take the proton in a step of its own (the enol, enolate or carbanion {label(carbon)} gives), then let "
            f"that pair bond to {label(electrophile)} in the next step")
