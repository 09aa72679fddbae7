"""Ring closures: every bond a step forms between two atoms of one fragment closes a ring. Each
closure gets its Baldwin class (arrows.judgement.baldwin); a ring that bridges the para or meta
positions of an arene with a short bridge (a strained cyclophane) is AR527, a three- or
four-membered ring AR501, a disfavoured class AR502 (naming a favoured closure open to the species
when it offers one: a five- or six-membered one first, then between the same kinds of sites, else
from the same nucleophile; for an epoxide, aziridine or halonium ion opened at its far carbon, the
exo opening at the near one), anything else a note AR601 (a radical's 6-endo closure onto an alkene
naming the 5-exo closure onto the same alkene, which radicals usually prefer). A disfavoured aldol
with nothing better open, written `reversible`, waits: a later step breaking its C-O bond makes it a
note, else the warning stands at the end."""
from __future__ import annotations

from collections import deque
from typing import TYPE_CHECKING, Callable, Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ElectronState, nameable
from ..model import Location, frozen
from ..judgement.baldwin import (BALDWIN_1976, ENDO, TRIG, ClosureClass, Verdict, classify, enol_partner,
                                  geometry_of, ring_path, three_ring_bridge, verdict)
from ..judgement.perception import RecentViews
from ..trace import StepTrace
from . import Check

if TYPE_CHECKING:
    from ..judgement.closures import Closure


@frozen
class StepClosure:
    """One ring closed by one step, by atom index."""

    nucleophile: int
    attacked: int
    ring: tuple[int, ...]
    closure: Optional[ClosureClass]     # None for a pericyclic step
    enol_partner: Optional[int] = None
    broken_partner: Optional[int] = None
    onto_cation: bool = False
    loc: Optional[Location] = None      # the arrow that makes the bond
    between_molecules: bool = False     # two molecules make the ring with two new bonds
    bridge: Optional[int] = None        # an opened epoxide's (aziridine's, halonium's) other carbon


_SMALL_RING_HINT = ("five- and six-membered closures usually win when the substrate offers one (common practice); "
                    "where it offers none, as for an oxaphosphetane, an epoxide from a halohydrin or a Payne shift, "
                    "the small ring is the textbook intermediate and this warning is a reminder only")


def closures_in_step(st: StepTrace) -> list[StepClosure]:
    if st.after is None:
        return []
    mol, elements = st.before.mol, st.before.elements
    pericyclic = st.change.pericyclic
    found = []
    rings_seen: set[frozenset[int]] = set()
    for i, j in st.change.formed:
        if elements[i] == 1 or elements[j] == 1:
            continue   # a hydrogen moving inside one molecule is a transfer, not a ring closure
        path = ring_path(mol, i, j)    # the ring of the transition state, () between two molecules
        cyclic = pericyclic or ((_electrocyclic(st, path) or _sigmatropic(st, i, j, path))
                                and not _migrates(st, i, j, path))
        # Two molecules joined by two new bonds in one step (a bromonium ion, an epoxide from a
        # peracid, a carbene's cyclopropane, an ozone [3+2]): the ring of the state after.
        between = not path and not cyclic and len(st.change.formed) > 1
        ring = _ring_closed(st, i, j, path, cyclic or between)
        if not ring or ((cyclic or between) and frozenset(ring) in rings_seen):
            continue   # no ring in the state after, or one already counted for another bond
        rings_seen.add(frozenset(ring))
        x, y, loc = _nucleophile_and_target(st, i, j)
        ring = ring if ring[0] == x else tuple(reversed(ring))
        if cyclic or between:
            found.append(StepClosure(x, y, ring, None, loc=loc, between_molecules=between))
            continue
        w = _broken_partner(st, x, y)
        z = enol_partner(_enol_partners(st.before, st, x, y), ring)
        geometry = geometry_of(mol, y)
        # An oxocarbenium or iminium pi bond (the far atom positive), or a bare cation, is attacked:
        # at its carbon. A positive N or O attacked itself (the N+ of a nitro group) is no such
        # acceptor, nor is a carbon whose pi partner is a positive carbon.
        cation = geometry != "tet" and elements[y] == 6 and (
            (w is not None and elements[w] in _ONIUM and st.before.formal_charge(w) > 0)
            or st.before.formal_charge(y) > 0)
        bridge = three_ring_bridge(mol, y, w)
        found.append(StepClosure(x, y, ring, classify(ring, geometry, w, z, bridge), z, w, cation, loc,
                                 bridge=bridge))
    return found


# The positive end of an oxocarbenium, iminium or thionium pi bond (N, O, S).
_ONIUM = frozenset({7, 8, 16})


def _chelating_acceptor(st: StepTrace, first: tuple[int, int], second: Optional[tuple[int, int]]) -> Optional[int]:
    """The atom of two new bonds each made from the other end's lone pair (a metal taking both
    oxygens of a Weinreb amide's adduct); None when the bonds share no atom or are made otherwise
    (a bromonium ion's or a carbene's bonds to both ends of one pi bond)."""
    if second is None:
        return None
    shared = set(first) & set(second)
    if len(shared) != 1:
        return None
    acceptor = shared.pop()
    donors = {first[0] + first[1] - acceptor, second[0] + second[1] - acceptor}
    given = {m.source_atoms[0] for m in st.change.moves
             if m.source_kind == "lone_pair" and set(m.sink_atoms) == {m.source_atoms[0], acceptor}}
    return acceptor if donors <= given else None


def _electrocyclic(st: StepTrace, path: tuple[int, ...]) -> bool:
    """Whether every arrow starts at a bond and the step changes every atom of the ring it closes:
    a conjugated array closing on itself, the charge of an ion moved along it (a Nazarov closure of
    a protonated dienone, an allyl to cyclopropyl cation). A C=C pair onto a cation at the end of a
    saturated chain leaves chain atoms untouched: a polar closure. So is a closure that breaks a
    bond to an atom off the ring, its pair left there (a C=C pair displacing chloride, an enolate's
    closure to a cyclopropanone): a leaving group goes as an ion, no cyclic array of electrons."""
    change = st.change
    if not path or not all(m.source_kind == "bond" and m.electrons == 2 for m in change.moves) \
            or not set(path) <= set(change.touched_atoms):
        return False
    broken = {frozenset(b) for b in change.broken}
    return not any(len(m.sink_atoms) == 1 and m.sink_atoms[0] not in path and frozenset(m.source_atoms) in broken
                   for m in change.moves)


def _migrates(st: StepTrace, i: int, j: int, path: tuple[int, ...]) -> bool:
    """A 1,2-shift: the new bond's pair comes from a bond of the path that breaks (the group
    migrates with its pair), so no ring is made."""
    broken_on_path = {frozenset(b) for b in zip(path, path[1:])} & {frozenset(b) for b in st.change.broken}
    return bool(broken_on_path) and any(m.source_kind == "bond" and set(m.sink_atoms) == {i, j}
                                        and frozenset(m.source_atoms) in broken_on_path for m in st.change.moves)


def _sigmatropic(st: StepTrace, i: int, j: int, path: tuple[int, ...]) -> bool:
    """Whether the new bond i-j is made in a sigmatropic shift drawn from a lone pair (an anionic
    [2,3]-Wittig, a Mislow-Evans or ylide [2,3] shift): a sigma bond of the path from i to j breaks
    away from both of them, so the ring exists only in the transition state, a cyclic array of
    electrons like a [3,3] shift's. (In an endo-tet closure the bond that breaks is at the attacked
    atom; in a 1,2-shift it is the migrating group's own bond.)"""
    broken = st.change.broken
    if not broken or not path:
        return False
    on_path = {frozenset(b) for b in zip(path, path[1:])}
    return any(frozenset(b) in on_path and i not in b and j not in b for b in broken)


def _ring_closed(st: StepTrace, i: int, j: int, before: tuple[int, ...], pericyclic: bool) -> tuple[int, ...]:
    """The ring the new bond i-j closes (both ends included), () when it closes none.

    Baldwin's rules judge the ring of the transition state: the path from i to j in the state
    before, even when a bond of it breaks in the same step (an endo-tet closure). Not a closure: a
    1,2-shift, where the new bond's pair comes from a bond of that path that breaks (the group
    migrates with its pair). A pericyclic step closes the rings of the state after (a
    cycloaddition through its second new bond; a [3,3] shift closes none). `before` is the path
    from i to j in the state before."""
    if not pericyclic:
        return () if _migrates(st, i, j, before) else before
    broken = {frozenset(b) for b in st.change.broken}
    if before and len(st.change.formed) == 1 and not {frozenset(pair) for pair in zip(before, before[1:])} & broken:
        return before            # the common case, without a copy of the state
    # (With a second new bond the array may be shorter than the chain: an intramolecular
    # Diels-Alder's C1-C10 closes the six-membered array through C4-C9, not the ten-atom chain.)
    if not before and len(st.change.formed) == 1:
        return ()                # two molecules joined by one bond: no ring
    work = Chem.RWMol(st.after.mol)
    work.RemoveBond(i, j)
    # The ring of the cyclic array, made of the bonds the step makes or changes: a Diels-Alder of
    # cyclopentadiene closes its six-membered array, though its CH2 bridge makes a shorter ring.
    changed = {frozenset(b) for b in st.change.formed} | {frozenset(b) for b, _, _ in st.change.reordered}
    array = Chem.RWMol(work)
    for bond in work.GetBonds():
        if frozenset((bond.GetBeginAtomIdx(), bond.GetEndAtomIdx())) not in changed:
            array.RemoveBond(bond.GetBeginAtomIdx(), bond.GetEndAtomIdx())
    return ring_path(array, i, j) or ring_path(work, i, j)


def _nucleophile_and_target(st: StepTrace, i: int, j: int) -> tuple[int, int, Location]:
    """The atom whose electrons make the bond (a lone pair or unpaired electron first, else the
    atom that keeps a bond pair), the atom it attacks, and where that arrow is written."""
    forming = [m for m in st.change.moves if len(m.sink_atoms) == 2 and set(m.sink_atoms) == {i, j}]
    forming.sort(key=lambda m: m.source_kind == "bond")
    if not forming:
        return i, j, st.step.loc
    m = forming[0]
    x = m.source_atoms[0] if m.source_kind != "bond" else m.sink_atoms[0]
    return x, (j if x == i else i), m.move.loc


def _broken_partner(st: StepTrace, x: int, y: int) -> Optional[int]:
    """The far atom of the bond whose electrons leave the attacked atom y in this step."""
    for m in st.change.moves:
        if m.source_kind != "bond" or y not in m.source_atoms or set(m.source_atoms) == {x, y}:
            continue
        keeps = m.sink_atoms[0]
        if keeps != y:
            return m.source_atoms[0] if m.source_atoms[1] == y else m.source_atoms[1]
    return None


def _enol_partners(state: ElectronState, st: StepTrace, x: int, y: int) -> list[int]:
    """For an enolate (or enol) carbon nucleophile, every carbon its charge is shared with: the
    partner of the C=C pair that makes the new bond, with an oxygen on it, or for a carbanion drawn
    with its lone pair none; then each neighbouring carbonyl carbon (a 1,3-dicarbonyl's anion is one
    enolate whichever resonance form is drawn). Empty for any other nucleophile."""
    mol = state.mol
    if mol.GetAtomWithIdx(x).GetAtomicNum() != 6:
        return []
    found = []
    for m in st.change.moves:
        if m.source_kind == "bond" and len(m.sink_atoms) == 2 and set(m.sink_atoms) == {x, y} and x in m.source_atoms:
            z = m.source_atoms[0] if m.source_atoms[1] == x else m.source_atoms[1]
            if state.bond_electrons(x, z) == 4 and _has_single_donor(mol, z):
                found.append(z)
    if not found and state.formal_charge(x) >= 0:
        return []
    for n in mol.GetAtomWithIdx(x).GetNeighbors():
        if n.GetIdx() not in found and n.GetIdx() != y and n.GetAtomicNum() == 6 and any(
                b.GetBondTypeAsDouble() == 2 and b.GetOtherAtom(n).GetAtomicNum() == 8 for b in n.GetBonds()):
            found.append(n.GetIdx())
    return found


def _has_single_donor(mol: Chem.Mol, atom: int) -> bool:
    """An oxygen (an enolate's or enol's) or a nitrogen (an enamine's) singly bonded to `atom`: the
    enamine is judged as the enolate it stands in for (common practice: the Stork enamine and the
    proline-catalysed aldol are enolate equivalents)."""
    return any(b.GetBondTypeAsDouble() == 1 and b.GetOtherAtom(mol.GetAtomWithIdx(atom)).GetAtomicNum() in (7, 8)
               for b in mol.GetAtomWithIdx(atom).GetBonds())


# How far back a strained or disfavoured closure looks for the neutral form of its fragment.
LOOK_BACK = 64


def _handed_over(st: StepTrace, c: StepClosure) -> bool:
    """Whether the nucleophile also leaves its own neighbour in the ring in this step: it is
    handed from that atom to the attacked one (an SNi's chlorine, from sulfur to carbon), not a
    chain end reaching round."""
    broken = {tuple(sorted(b)) for b in st.change.broken}
    return any(tuple(sorted((c.nucleophile, n))) in broken for n in c.ring if n not in (c.attacked,))


# The shortest bridge of an isolable [n]paracyclophane and of an isolable [n]metacyclophane: [5] of
# each has been bottled, [4] of each seen only as a transient intermediate (from memory).
PARACYCLOPHANE_SMALLEST_BRIDGE = 5
METACYCLOPHANE_SMALLEST_BRIDGE = 5


@frozen
class BridgedArene:
    """A new ring through two atoms of one six-membered aromatic ring that are not neighbours."""

    relation: str                 # "para" or "meta"
    bridge: int                   # atoms of the new ring outside the arene
    ends: tuple[int, int]         # the arene atoms the bridge joins: the one it already held, the other
    ortho: tuple[int, ...]        # arene carbons beside the held end that hold a hydrogen


def bridged_arene(st: StepTrace, c: StepClosure, views: RecentViews) -> Optional[BridgedArene]:
    """The cyclophane a polar or radical closure makes when its ring (the shortest path before the
    step, as Baldwin's rules count it) runs through three or four atoms of one six-membered ring
    aromatic before the step, with a bridge shorter than the smallest isolable one; else None."""
    ring = c.ring
    # (the ring holds the bridge and four arene atoms (para) or three (meta))
    if c.closure is None or len(ring) < 4 or len(ring) >= max(PARACYCLOPHANE_SMALLEST_BRIDGE + 4,
                                                              METACYCLOPHANE_SMALLEST_BRIDGE + 3):
        return None
    view = views.of(st.before)
    mol = view.mol
    positions = [view.position(a) for a in ring]
    if None in positions:
        return None
    for arene in mol.GetRingInfo().AtomRings():
        if len(arene) != 6:
            continue
        run = [k for k, p in enumerate(positions) if p in arene]
        if len(run) not in (3, 4) or run[-1] - run[0] != len(run) - 1 \
                or not all(mol.GetAtomWithIdx(p).GetIsAromatic() for p in arene):
            continue
        relation = "meta" if len(run) == 3 else "para"
        bridge = len(ring) - len(run)
        smallest = METACYCLOPHANE_SMALLEST_BRIDGE if relation == "meta" else PARACYCLOPHANE_SMALLEST_BRIDGE
        if bridge < 1 or bridge >= smallest:
            continue
        # The end the bridge already held is the one the new bond does not reach. Where the new bond
        # joins two atoms of the bridge, neither end is the attacked one: no ortho carbon to propose.
        first, last = run[0], run[-1]
        held, other = (first, last) if first > 0 else (last, first)
        ortho: tuple[int, ...] = ()
        if first == 0 or last == len(ring) - 1:
            ortho = tuple(view.original[n.GetIdx()] for n in mol.GetAtomWithIdx(positions[held]).GetNeighbors()
                          if n.GetIdx() in arene and n.GetAtomicNum() == 6 and n.GetTotalNumHs() > 0)
        return BridgedArene(relation, bridge, (ring[held], ring[other]), ortho)
    return None


def _cyclophane_hint(st: StepTrace, c: StepClosure, bridged: BridgedArene) -> str:
    """Close onto a carbon ortho to the bridge's end: the fused ring such closures make, with the
    arrow when the closing pair was an arene pi bond and the ortho carbon's own pi bond can be named."""
    label, before = st.before.label, st.before
    size = bridged.bridge + 2
    if not bridged.ortho:
        return (f"a bridge of {bridged.bridge} atoms cannot span the {bridged.relation} positions of a benzene ring; "
                f"check which atoms bond: a closure onto the arene makes a fused ring at the carbon ortho to the chain")
    names = " or ".join(label(o) for o in bridged.ortho)
    partner = bridged.ends[1]
    far = c.attacked if partner == c.nucleophile else c.nucleophile
    arrow = ""
    closing = next((m for m in st.change.moves if m.source_kind == "bond" and set(m.sink_atoms) == {c.nucleophile,
                    c.attacked} and partner in m.source_atoms), None)
    if closing is not None and nameable(before.mol, far):
        # The ortho carbon's own pi bond, best one that leaves the cation off the bridge's end.
        bonds = sorted(((o, n.GetIdx()) for o in bridged.ortho for n in before.mol.GetAtomWithIdx(o).GetNeighbors()
                        if before.bond_electrons(o, n.GetIdx()) == 4 and nameable(before.mol, o)
                        and nameable(before.mol, n.GetIdx())), key=lambda b: b[1] == bridged.ends[0])
        if bonds:
            o, pi = bonds[0]
            arrow = f", `{label(o)}={label(pi)} -> {label(o)}-{label(far)}`"
    return (f"close onto the carbon ortho to the chain, {names}{arrow}: the fused {size}-membered ring that a "
            f"closure onto an arene makes (common practice: Friedel-Crafts, Pictet-Spengler and Skraup closures)")


@frozen
class HeldAldol:
    """A disfavoured aldol (or olefination) closure written `reversible`, with no favoured closure
    open: its AR502 waits for a later step that breaks the adduct's C-O bond (an E1cB dehydration,
    an oxaphosphetane's collapse), which makes it a note."""

    warning: Diagnostic
    carbon: int          # the attacked carbonyl carbon
    oxygen: int          # its oxygen, the alkoxide of the adduct
    nucleophile: int


class RingClosures(Check):
    name = "ring closures"
    codes = ("AR501", "AR502", "AR527", "AR601")

    def __init__(self) -> None:
        self.recent: deque[ElectronState] = deque(maxlen=LOOK_BACK)   # states before the current step
        self.held: list[HeldAldol] = []

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        found = self._carried_on(st)
        for c in closures_in_step(st):
            diagnostic = self.judge(st, c, context.views)
            if not (self.held and diagnostic is self.held[-1].warning):
                found.append(diagnostic)
        self.recent.append(st.before)
        return found

    def finish(self, end, context) -> Iterator[Diagnostic]:
        return [h.warning for h in self.held]

    def _carried_on(self, st: StepTrace) -> list[Diagnostic]:
        """The held aldol closures this step carries on, as notes: it breaks the adduct's C-O bond
        while the new ring bond stands. Under reversible conditions a step that removes the adduct
        pulls the equilibrium through the slow closure (thermodynamic control; Baldwin-Lusch 1982
        discuss it, memory; the aldol condensation of hexane-2,5-dione to 3-methylcyclopent-2-enone,
        common practice). A retro-aldol (the new bond broken) lets the warning stand."""
        broken = {frozenset(b) for b in st.change.broken}
        notes, still = [], []
        for h in self.held:
            if frozenset((h.carbon, h.nucleophile)) in broken:
                notes.append(h.warning)      # undone: the warning stands as written
            elif frozenset((h.carbon, h.oxygen)) in broken:
                label = st.before.label
                w = h.warning
                message = (w.message + f", but the step is reversible and step {st.index + 1} (\"{st.step.label}\") "
                           f"carries the adduct on, breaking {label(h.carbon)}-{label(h.oxygen)}: under "
                           f"thermodynamic control a disfavoured closure can still be the route "
                           f"(Baldwin-Lusch 1982 discuss it, memory)")
                notes.append(Diagnostic("AR601", message, w.loc, atoms=w.atoms, bonds=w.bonds, step=w.step))
            else:
                still.append(h)
        self.held = still
        return notes

    def judge(self, st: StepTrace, c: StepClosure, views: RecentViews) -> Diagnostic:
        label = lambda i: st.before.label(i)   # noqa: E731
        a, b = label(c.nucleophile), label(c.attacked)
        where = dict(bonds=((a, b),), step=st.index, atoms=(a, b))
        size = len(c.ring)
        opening = f"{a}-{b} closes {'an' if size in (8, 11, 18) else 'a'} {size}-membered ring"
        if c.broken_partner is not None and c.broken_partner in c.ring \
                and st.after.mol.GetBondBetweenAtoms(c.attacked, c.broken_partner) is None:
            # The bond that breaks at the attacked atom is a bond of that ring (endo): the ring is
            # the transition state's, and the group moves along it (a silyl group passed from one
            # oxygen to another; a methyl transfer).
            opening = (f"{a}-{b} forms through a {size}-membered cyclic transition state ({b}-"
                       f"{label(c.broken_partner)} breaks in it: a group passed along, no ring left)")
        if c.closure is None and c.between_molecules:
            bond = next(((i, j) for i, j in st.change.formed
                         if {i, j} <= set(c.ring) and {i, j} != {c.nucleophile, c.attacked}), None)
            second = f"{label(bond[0])}-{label(bond[1])}" if bond else "a second new bond"
            acceptor = _chelating_acceptor(st, (c.nucleophile, c.attacked), bond) if size > 3 else None
            how = (f"{label(acceptor)} takes a lone pair from each of two atoms of one molecule: a chelate"
                   if acceptor is not None else "an addition across a bond")
            return Diagnostic("AR601", f"{a}-{b} and {second} make a {size}-membered ring between two molecules "
                              f"({how}, not the closure of one chain); Baldwin's rules do not apply",
                              c.loc or st.step.loc, **where)
        if c.closure is None:
            return Diagnostic("AR601", f"{opening} in a pericyclic step (electrons moving round a cyclic array of atoms); "
                              f"Baldwin's rules do not apply", c.loc or st.step.loc, **where)
        bridged = bridged_arene(st, c, views)
        if bridged is not None:
            held, other = (label(e) for e in bridged.ends)
            cyclophane = f"[{bridged.bridge}]{bridged.relation}cyclophane"
            smallest = (PARACYCLOPHANE_SMALLEST_BRIDGE if bridged.relation == "para"
                        else METACYCLOPHANE_SMALLEST_BRIDGE)
            return Diagnostic(
                "AR527", f"{opening} ({c.closure.name}) through {held} and {other}, {bridged.relation} on one "
                f"aromatic ring, with a bridge of {bridged.bridge} atom{'s' if bridged.bridge > 1 else ''}: the "
                f"ring of a {cyclophane}, whose arene must bend out of plane; [n]{bridged.relation}cyclophanes "
                f"with fewer than {smallest} bridge atoms are not isolable, only transient (from memory)",
                c.loc or st.step.loc, hint=_cyclophane_hint(st, c, bridged), **where)
        passed_along = opening.endswith("no ring left)")
        if passed_along and st.before.elements[c.attacked] in _METALS:
            # A metal handed from one atom to the next through a four-centre array (MgBr going off with
            # the methoxide of an ester's Grignard adduct; a lithium or zinc transfer): the usual
            # path of such a transfer, no strained ring made (common practice).
            return Diagnostic("AR601", f"{opening}: a metal passed from atom to atom through a {size}-centre array, "
                              f"as such transfers go", c.loc or st.step.loc, **where)
        if passed_along and size == 4 and st.before.elements[c.attacked] == 6 and _handed_over(st, c):
            # A nucleophile the leaving group itself delivers to the carbon it leaves (an SNi: a
            # chlorosulfite's chlorine as SO2 goes; textbook): the usual drawing of that internal
            # return, no strained ring made (the configuration is kept: configuration.py).
            return Diagnostic("AR601", f"{opening}: the leaving group delivers {a} to the face it leaves "
                              f"(an SNi), as such internal returns are drawn", c.loc or st.step.loc, **where)
        if st.before.elements[c.attacked] > 10:
            # Baldwin's rules are stated for first-row atoms (Baldwin 1976, memory): at a heavier
            # one (the iodine of a cyclic periodate ester, the phosphorus of an oxaphosphetane)
            # longer bonds and other orbitals change the angles the rules rest on.
            uncovered = f"{opening} at {b}, an atom beyond the second period, which Baldwin's rules (stated for " \
                        f"first-row atoms) do not cover"
            if size in (3, 4):
                return Diagnostic("AR501", f"{uncovered}; the ring is strained", c.loc or st.step.loc,
                                  hint=_SMALL_RING_HINT, **where)
            return Diagnostic("AR601", uncovered, c.loc or st.step.loc, **where)
        v = verdict(c.closure)
        said = f"{c.closure.name}, {v.word}" + (f" ({v.rule})" if v.rule else "")
        if c.closure.three_ring and c.closure.mode == ENDO and size >= 5:
            return _endo_opening(st, c, v, opening, where)
        if c.onto_cation and c.closure.mode is None:
            # A bare carbocation: no bond breaks at the attacked atom, so neither exo nor endo applies.
            return Diagnostic("AR601", f"{opening}: {c.closure.name}, onto a carbocation, where no bond breaks at "
                              f"the attacked atom: not covered by Baldwin's rules", c.loc or st.step.loc, **where)
        # Onto an oxocarbenium or iminium cation Baldwin's disfavour is routinely overcome (dioxolane
        # formation, 5-endo-trig; common practice, memory); a three- or four-membered ring's strain is not.
        excused = c.onto_cation and v.favoured is False
        if excused and size >= 5:
            return Diagnostic("AR601", f"{opening}: {said}, but onto an oxocarbenium or iminium cation, where "
                              f"the rule is routinely broken, as in dioxolane formation (common practice, memory)",
                              c.loc or st.step.loc, **where)
        if v.favoured is False or size in (3, 4):
            code = "AR502" if v.favoured is False and not excused else "AR501"
            if excused:
                said += ", onto an oxocarbenium or iminium cation, where the rule is routinely broken"
            message = f"{opening}: {said}" + ("" if code == "AR502" else ", but the ring is strained")
            alternative = self.alternative(st, c)
            if alternative:
                message += f"; {alternative.text}"
            outrun = (self.outrun(st, c) if code == "AR501" and not alternative and v.favoured
                      and c.closure.geometry == "tet" else None)
            if outrun:
                hint = (f"the only five- or six-membered closure of this kind open to the species, {outrun.sites} "
                        f"({outrun.name}), is disfavoured, and it does not outrun a displacement {v.rule} favours "
                        f"(common practice: cyclopropanes from 4-halo ketones; `arrows closures` ranks this closure "
                        f"first): the small ring is the product here and this warning a reminder only")
            elif code == "AR501":
                hint = _SMALL_RING_HINT
            elif alternative:
                hint = (f"draw the favoured closure this species offers instead, {alternative.sites} "
                        f"({alternative.name}): a disfavoured closure is slow (Baldwin's rules); "
                        f"`arrows closures` lists the candidates")
            elif _is_aldol(st, c):
                # Nothing better is open: pointing the author at a favoured ring would send them looking
                # for one that does not exist (hexane-2,5-dione's aldol has only a three-membered rival).
                example = ("the oxaphosphetane's collapse in an intramolecular Horner-Wadsworth-Emmons closure to a "
                           "cyclopentenone" if _olefination_carbon(st.before, c.nucleophile) else
                           "the E1cB dehydration in the aldol condensation of hexane-2,5-dione to "
                           "3-methylcyclopent-2-enone")
                hint = ("no favoured closure is open to this species; a disfavoured closure is slow, not forbidden: "
                        "an addition to a C=O can still be the route where it is reversible and a later step carries "
                        f"the adduct on by breaking that C-O bond ({example}, common practice, memory; thermodynamic "
                        "control, which Baldwin-Lusch 1982 discuss, memory); with the step written `reversible` and "
                        "that later step drawn, this is a note")
            elif size in (3, 4):
                hint = ("no favoured closure is open to this species; a disfavoured closure is slow, not forbidden: "
                        "where nothing faster is open the small ring can be the textbook intermediate (the "
                        "cyclopropanone of a Favorskii rearrangement, common practice) and this warning a reminder")
            else:
                hint = ("no favoured closure is open to this species; a disfavoured closure is slow, not forbidden, "
                        "but a reaction between two molecules (the solvent adding instead) often wins over it "
                        "(Baldwin 1976, memory)")
            diagnostic = Diagnostic(code, message, c.loc or st.step.loc, hint=hint, **where)
            if code == "AR502" and not alternative and _is_aldol(st, c) and st.step.kind == "reversible":
                self.held.append(HeldAldol(diagnostic, c.attacked, c.broken_partner, c.nucleophile))
            return diagnostic
        if v.favoured is None:
            return Diagnostic("AR601", f"{opening}: {c.closure.name}, not covered by Baldwin's rules",
                              c.loc or st.step.loc, **where)
        exo = _radical_exo_option(st, c)
        if exo is not None:
            said += (f"; {a} onto {label(exo)}, the near end of the same alkene, would close a 5-membered ring, "
                     f"5-exo-trig, which radical closures usually prefer (the hex-5-enyl radical closes about 98:2 "
                     f"5-exo to 6-endo; Beckwith, from memory)")
        if size >= 7:
            # A favoured larger ring where a five- or six-membered one was open too (octane-2,7-dione's
            # enolate closing seven atoms instead of five): said, as the faster closure wins (common
            # practice; Baldwin's rules rank only feasibility).
            smaller = self.alternative(st, c, smaller_than=size)
            if smaller:
                said += f"; {smaller.text}, and a five- or six-membered ring closes faster"
        return Diagnostic("AR601", f"{opening}: {said}", c.loc or st.step.loc, **where)

    def species_closures(self, st: StepTrace, c: StepClosure) -> Optional[tuple[list[Closure], Callable[[int], str],
                                                                               int, int]]:
        """The closures open to the species that closes here (the latest neutral form of the
        fragment, before any enolate was made), best first, as `arrows closures` ranks them; a label
        for its atoms; the nucleophile and attacked atom in it. None where it cannot be told."""
        state = _parent_state(list(self.recent) + [st.before], c.nucleophile, c.attacked)
        # The species alone: a base beside it (methoxide) would be taken for its nucleophile.
        species, original = _fragment_of(state.mol, c.nucleophile)
        mine = {atom: k for k, atom in enumerate(original)}
        if c.attacked not in mine:
            return None
        from ..judgement.closures import find_closures
        return find_closures(species), lambda i: state.label(original[i]), mine[c.nucleophile], mine[c.attacked]

    def alternative(self, st: StepTrace, c: StepClosure, smaller_than: Optional[int] = None) -> Optional[Rival]:
        """A favoured closure open to the species that closes here; with `smaller_than`, only a five-
        or six-membered one smaller than that. A five- or six-membered one first, as `arrows closures`
        ranks them (3-methylideneheptane-2,6-dione: the 5-exo aldol before a 7-endo Michael); within
        that, between the same kinds of sites first, else from the same nucleophile (an alkoxide's
        5-exo-trig lactonisation beside its 5-endo-trig oxa-Michael)."""
        kinds = _site_kinds(st.before, c)
        found = self.species_closures(st, c) if kinds is not None else None
        if found is None:
            return None
        options, label, nucleophile, attacked = found
        from ..judgement.closures import FAVOURED, between_kinds
        favoured = [o for o in options if o.outlook == FAVOURED]
        same_kinds = [o for o in favoured if between_kinds(o, *kinds)]
        same_nucleophile = [o for o in favoured if nucleophile in {o.nucleophile.atom, *(n for n, _ in o.equivalent)}]
        ordered = sorted(same_kinds + same_nucleophile, key=lambda o: o.size not in (5, 6))   # a stable sort
        for option in ordered:
            pairs = {(option.nucleophile.atom, option.electrophile.atom), *option.equivalent}
            if (nucleophile, attacked) in pairs:
                continue
            if smaller_than is not None and not (option.size in (5, 6) and option.size < smaller_than):
                continue
            return _describe(label, option)
        return None

    def outrun(self, st: StepTrace, c: StepClosure) -> Optional[Rival]:
        """For a three- or four-membered ring closed by a displacement Baldwin favours, a five- or
        six-membered closure between the same kinds of sites that the rules disfavour, which
        `arrows closures` ranks below it (5-chloropentan-2-one: the C1 enolate's 5-(enolendo)-exo-tet below the C3
        enolate's cyclopropane); else None."""
        kinds = _site_kinds(st.before, c)
        found = self.species_closures(st, c) if kinds is not None else None
        if found is None:
            return None
        options, label, _, _ = found
        from ..judgement.closures import DISFAVOURED, between_kinds
        return next((_describe(label, o) for o in options if o.size in (5, 6) and o.outlook == DISFAVOURED
                     and between_kinds(o, *kinds)), None)


def _radical_exo_option(st: StepTrace, c: StepClosure) -> Optional[int]:
    """For a radical's 6-endo-trig closure onto a C=C (the bond made from its unpaired electron),
    the near carbon of that alkene, onto which the same radical would close 5-exo; else None."""
    closure, ring, near = c.closure, c.ring, c.broken_partner
    if closure is None or (closure.size, closure.mode, closure.geometry) != (6, ENDO, TRIG) \
            or near is None or ring[-2] != near:
        return None
    elements = st.before.elements
    if elements[c.attacked] != 6 or elements[near] != 6 or st.before.bond_electrons(c.attacked, near) != 4:
        return None
    radical = any(m.source_kind == "unpaired" and m.source_atoms == (c.nucleophile,)
                  and set(m.sink_atoms) == {c.nucleophile, c.attacked} for m in st.change.moves)
    return near if radical else None


# Metals that pass from one atom to another through a small cyclic array (Li, Na, Mg, Al, K, Ca, Ti,
# Cu, Zn, Cd, Sn, Hg).
_METALS = frozenset({3, 11, 12, 13, 19, 20, 22, 29, 30, 48, 50, 80})


_HALONIUM = {17: "chloronium ion", 35: "bromonium ion", 53: "iodonium ion"}


def _three_ring_name(state: ElectronState, atom: int) -> str:
    """What a three-membered ring is called after its heteroatom (an epoxide, a bromonium ion)."""
    element, positive = state.elements[atom], state.formal_charge(atom) > 0
    if element in _HALONIUM:
        return _HALONIUM[element]
    names = {8: ("epoxide", "protonated epoxide"), 7: ("aziridine", "aziridinium ion"),
             16: ("thiirane", "episulfonium ion")}
    return names.get(element, ("three-membered ring",) * 2)[positive]


def _endo_opening(st: StepTrace, c: StepClosure, v: Verdict, opening: str, where: dict) -> Diagnostic:
    """A nucleophile opening an epoxide (aziridine, halonium ion) at its far carbon, closing a ring
    of five or more: named endo by the three-membered ring's C-C bond, as epoxide-opening
    cyclisations are (Nicolaou 1989, memory). Where the exo opening at the near carbon closes a
    five- or six-membered ring, that opening usually wins (AR502, naming it); a 5-endo opening's
    rival is a strained four-membered ring (a note)."""
    label = st.before.label
    a, b, near, w = label(c.nucleophile), label(c.attacked), label(c.bridge), label(c.broken_partner)
    name, size = _three_ring_name(st.before, c.broken_partner), len(c.ring)
    article = "an" if name[0] in "aeiou" else "a"
    exo = f"{size - 1}-exo-tet"
    head = (f"{opening}: {c.closure.name}, {v.word}" + (f" ({v.rule}, memory)" if v.rule else "")
            + f": {article} {name} opened at its far carbon, {b}, so that its {near}-{b} bond lies inside the new ring")
    loc = c.loc or st.step.loc
    if v.favoured is False:
        hint = (f"the {exo} opening at the near carbon, `:{a} -> {near}` with `{near}-{w} -> {w}`, usually wins for "
                f"a plain {name} (Baldwin 1976; Nicolaou et al. 1989, memory); the {size}-endo opening is the route "
                f"where the far carbon bears a positive charge better (allylic, benzylic or more substituted: a vinyl "
                f"epoxide, a trisubstituted alkene's halonium ion), or where a template holds the chain (an enzyme, a fused ring already closed: Nicolaou et al. 1989, memory)")
        return Diagnostic("AR502", f"{head}; {a} onto {near}, the near carbon, would close a {size - 1}-membered ring, "
                          f"{exo}, favoured (Baldwin 1976)", loc, hint=hint, **where)
    if size - 1 in (3, 4):
        rival = (f"; the {exo} opening at {near}, the near carbon, would close a strained {size - 1}-membered ring, "
                 f"so the usual preference for the exo opening does not decide it")
    else:
        rival = ""
    return Diagnostic("AR601", head + rival, loc, **where)


def _is_aldol(st: StepTrace, c: StepClosure) -> bool:
    """An enolate (enol, enamine) carbon closing onto a C=O: an aldol addition, which is reversible."""
    return (c.enol_partner is not None and c.closure is not None and c.closure.geometry == TRIG
            and c.broken_partner is not None and st.before.elements[c.broken_partner] == 8)


def _olefination_carbon(state: ElectronState, atom: int) -> bool:
    """A carbanion carbon bearing phosphorus, sulfur or silicon (a phosphonate's, a sulfone's, a
    silane's): its addition to a C=O is the first half of an olefination, not an aldol."""
    return any(n.GetAtomicNum() in (14, 15, 16) for n in state.mol.GetAtomWithIdx(atom).GetNeighbors())


def _site_kinds(state: ElectronState, c: StepClosure) -> Optional[tuple[str, str]]:
    from ..judgement.sites import ENOLATE, NITROGEN, OXYGEN
    mol = state.mol
    element = mol.GetAtomWithIdx(c.nucleophile).GetAtomicNum()
    nucleophile = {8: OXYGEN, 7: NITROGEN}.get(element, ENOLATE if c.enol_partner is not None else None)
    if nucleophile is None or c.broken_partner is None:
        return None
    partner = mol.GetAtomWithIdx(c.broken_partner)
    if c.closure and c.closure.geometry == "trig" and partner.GetAtomicNum() == 8:
        return nucleophile, "carbonyl"
    if c.closure and c.closure.geometry == "trig" and partner.GetAtomicNum() == 6:
        return nucleophile, "conjugate"
    if c.closure and c.closure.geometry == "tet":
        return nucleophile, "alkyl"
    return None


def _parent_state(states: list[ElectronState], x: int, y: int) -> ElectronState:
    """The latest of `states` (oldest first, ending with the state before the closing step) in
    which x and y sit in one uncharged fragment; else the last."""
    for state in reversed(states):
        if x >= state.mol.GetNumAtoms() or y >= state.mol.GetNumAtoms():
            continue
        for fragment in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False):
            if x in fragment and y in fragment and sum(state.formal_charge(i) for i in fragment) == 0:
                return state
    return states[-1]


def _fragment_of(mol: Chem.Mol, atom: int) -> tuple[Chem.Mol, tuple[int, ...]]:
    """The fragment of `mol` holding `atom`, and for each of its atoms the index in `mol`."""
    mapping: list[tuple[int, ...]] = []
    fragments = Chem.GetMolFrags(mol, asMols=True, sanitizeFrags=False, fragsMolAtomMapping=mapping)
    k = next(k for k, atoms in enumerate(mapping) if atom in atoms)
    return fragments[k], tuple(mapping[k])


@frozen
class Rival:
    """A favoured closure open to the species, in words."""

    sites: str      # "O1 oxygen onto C6"
    name: str       # its class, "5-exo-trig"
    text: str       # "O1 oxygen onto C6 would close a 5-membered ring, 5-exo-trig, favoured"


def _describe(label, option: Closure) -> Rival:
    from ..judgement.sites import ENOLATE, NITROGEN, OXYGEN
    nu = label(option.nucleophile.atom)
    el = label(option.electrophile.atom)
    what = "enolate" if option.nucleophile.kind == ENOLATE else {OXYGEN: "oxygen", NITROGEN: "nitrogen"}.get(
        option.nucleophile.kind, option.nucleophile.kind)
    sites = f"{nu} {what} onto {el}"
    return Rival(sites, option.closure.name,
                 f"{sites} would close a {option.size}-membered ring, {option.closure.name}, {option.outlook}")


class StrainedCumulenes(Check):
    """AR523: a step leaves an allene (a carbon with two double bonds) inside a ring of eight or
    fewer atoms. The two pi bonds of an allene stand at right angles and its three carbons in a
    line: a small ring cannot hold them (common practice: cyclohexa-1,2-diene lives for
    microseconds, cyclonona-1,2-diene is the smallest one bottled; from memory). Most often a proton
    taken from the wrong carbon, as when an arenium ion loses the hydrogen beside the sp3 carbon
    rather than the one on it. An allene the species was written with is not the step's doing."""
    name = "strained cumulenes"
    codes = ("AR523",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after = st.after
        if after is None:
            return
        # A new allene's centre gains a bond order in this step: only the carbons at a bond a pair
        # goes into are looked at.
        gaining = sorted({a for m in st.change.moves if len(m.sink_atoms) == 2 for a in m.sink_atoms
                          if after.elements[a] == 6})
        for centre, size in _allenes_in_small_rings(after, gaining):
            if (centre, size) in _allenes_in_small_rings(st.before, [centre]):
                continue
            label = after.label
            yield Diagnostic(
                "AR523", f"{label(centre)} ends the step with two double bonds inside a {size}-membered ring (a "
                f"cyclic allene): its three carbons want a straight line, which a ring this small cannot give",
                st.step.loc, hint=_allene_hint(st, centre), atoms=(label(centre),), step=st.index)


_SMALL_ALLENE_RING = 8


def _allene_hint(st: StepTrace, centre: int) -> str:
    """AR523's hint: where the step took a hydrogen off a ring carbon that was sp2 while a carbon
    of the same ring holds a hydrogen on an sp3 centre, that carbon is named: an arenium ion loses
    its proton there, a 1,4-dihydropyridine (NADH) its hydride from C4 (common practice)."""
    before = st.before
    mol = before.mol
    taken = [next(a for a in m.source_atoms if before.elements[a] != 1) for m in st.change.moves
             if m.source_kind == "bond" and len(m.source_atoms) == 2 and 1 in (before.elements[a] for a in m.source_atoms)
             and any(before.elements[a] != 1 for a in m.source_atoms)]
    ring = next((set(r) for r in Chem.GetSymmSSSR(mol) if centre in r and len(r) <= _SMALL_ALLENE_RING), set())
    sp3 = [a for a in sorted(ring) if before.elements[a] == 6 and a not in taken and before.bond_sums[a] == 4
           and all(before.bond_electrons(a, n.GetIdx()) == 2 for n in mol.GetAtomWithIdx(a).GetNeighbors())
           and mol.GetAtomWithIdx(a).GetTotalNumHs(includeNeighbors=True)]
    off_sp2 = [a for a in taken if a in ring and a not in sp3]
    if off_sp2 and sp3:
        return (f"the step takes the hydrogen of {before.label(off_sp2[0])}, an sp2 carbon; the ring's sp3 carbon "
                f"holding hydrogen is {before.label(sp3[0])}: an arenium ion loses its proton there, a "
                f"1,4-dihydropyridine (NADH) gives its hydride from there, and the ring ends aromatic")
    return ("check which hydrogen or bond the step takes: an arenium ion loses the proton on its sp3 carbon, "
            "restoring the arene; if a strained cyclic allene is meant (made from a silyl triflate), this can stand")


def _allenes_in_small_rings(state: ElectronState, atoms: list[int]) -> set[tuple[int, int]]:
    """(carbon, smallest ring size) for each of `atoms` with two double bonds in a ring of eight or
    fewer."""
    mol = state.mol
    centres = []
    for i in atoms:
        atom = mol.GetAtomWithIdx(i) if i < mol.GetNumAtoms() else None
        # (an allene's centre has two neighbours and no hydrogen: most carbons fail that at once)
        if atom is not None and atom.GetDegree() == 2 and not atom.GetTotalNumHs() and all(
                b.GetBondType() == Chem.BondType.DOUBLE for b in atom.GetBonds()):
            centres.append(i)
    if not centres:
        return set()
    rings = Chem.GetSymmSSSR(mol)
    found = set()
    for centre in centres:
        sizes = [len(r) for r in rings if centre in r]
        if sizes and min(sizes) <= _SMALL_ALLENE_RING:
            found.add((centre, min(sizes)))
    return found


__all__ = ["RingClosures", "StepClosure", "StrainedCumulenes", "closures_in_step", "BALDWIN_1976"]
