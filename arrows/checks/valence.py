"""Electron counts that are legal but unusual enough to deserve a second look."""
from __future__ import annotations

import re
from itertools import islice
from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ElectronState, nameable
from ..model import Location, Species
from ..rdkit_io import ELECTRONEGATIVITY, rdkit_messages
from ..trace import StepTrace, map_location
from . import Check, Ending

# Metals whose ions routinely carry +2 (Mg2+, Ca2+, Zn2+ ...): no unusual-charge warning for them.
_IONIC_METALS = {3, 4, 11, 12, 19, 20, 30, 37, 38, 55, 56}
# Elements drawn hypervalent as a matter of course (common practice): Si (five-coordinate
# silicates: fluoride on a silyl ether, the Peterson elimination), P, S, Cl, As, Se, Br, Sn, Sb,
# Te, I, Xe.
_HYPERVALENT = {14: "Si", 15: "P", 16: "S", 17: "Cl", 33: "As", 34: "Se", 35: "Br", 50: "Sn", 51: "Sb",
                52: "Te", 53: "I", 54: "Xe"}


# The d-block metals of groups 3-11, whose valence shell holds eighteen electrons (the 18-electron
# rule, common practice in organometallic chemistry; RDKit counts their group number of outer
# electrons, the neutral-ligand count): Pd(PPh3)2 holds 14, Pd(Ar)(Br)(PPh3)2 16. Group 12 (Zn, Cd,
# Hg) keeps its full d shell out of RDKit's count and never nears either limit.
_TRANSITION_METALS = frozenset(range(21, 30)) | frozenset(range(39, 48)) | {57} | frozenset(range(72, 80)) \
    | {89} | frozenset(range(104, 112))
# The whole d block, group 12 (Zn, Cd, Hg) with it.
D_BLOCK = _TRANSITION_METALS | {30, 48, 80, 112}
# The lanthanides and actinides, whose bonding is ionic, the f electrons held in the core: no
# electron count of theirs means a shell filled (a samarium(III) alkoxide made by SmI2 books nine,
# an ordinary species; Molander, Chem. Rev. 1992, from memory).
_F_BLOCK = frozenset(range(58, 72)) | frozenset(range(90, 104))


def shell_limit(atomic_num: int) -> Optional[int]:
    """The valence electrons an atom holds before AR504 asks for a second look: 18 for a d-block
    metal of groups 3-11, none for the f block, 8 otherwise."""
    if atomic_num in _F_BLOCK:
        return None
    return 18 if atomic_num in _TRANSITION_METALS else 8


# Elements that are rarely left with six valence electrons (nitrenium, oxenium, sulfenium and
# halenium ions are fleeting at best; common practice draws a bond forming to them in the same
# step): carbon (carbocations, carbenes), boron and the metals are not among them.
_RARELY_SEXTET = {7: "an N", 8: "an O", 9: "an F", 16: "an S", 17: "a Cl", 35: "a Br", 53: "an I"}   # as read aloud


# Heteroatoms whose lone pair stabilises a cation beside them (an oxocarbenium, an iminium): the
# same elements that rarely keep a sextet themselves.
_DONORS = frozenset(_RARELY_SEXTET)


def unstabilised_primary_cation(mol, i: int) -> bool:
    """Whether carbon i, a carbocation, is methyl or primary (at most one carbon neighbour) with
    nothing beside it to spread the charge: no heteroatom with a lone pair, no pi bond or arene
    (allyl and benzyl cations are stabilised), no CH2 bonded to a d-block metal (the open form of
    an alkene's pi complex, the cation bridged to the metal as the mercurinium ion of an
    oxymercuration is: common practice)."""
    atom = mol.GetAtomWithIdx(i)
    if any(b.GetBondTypeAsDouble() > 1 for b in atom.GetBonds()):
        return False   # an acylium or vinyl cation: not an sp3 primary cation
    carbons = 0
    for n in atom.GetNeighbors():
        z = n.GetAtomicNum()
        if z in _DONORS and n.GetFormalCharge() <= 0:
            return False
        if z == 6:
            carbons += 1
            if n.GetIsAromatic() or any(b.GetBondTypeAsDouble() > 1 for b in n.GetBonds()):
                return False
            if _in_three_ring(mol, n.GetIdx()):
                return False   # a cyclopropylcarbinyl cation: the ring's bent bonds hold the charge (textbook)
            if _bridged_to_metal(n):
                return False
    return carbons <= 1


def _bridged_to_metal(neighbour) -> bool:
    """Whether `neighbour`, the carbon beside a carbocation, is bonded to a d-block metal and to no
    other carbon: the alkene's pi pair written into the metal (the stand-in for an eta-2 complex or
    a mercurinium ion), the cation bridged to the metal. Where the metal's carbon is the more
    substituted one, the charge belongs there and the open form is the wrong way round
    (Markovnikov: the mercurinium ion of propene opens at its inner carbon)."""
    atoms = neighbour.GetNeighbors()
    return any(m.GetAtomicNum() in D_BLOCK for m in atoms) and sum(m.GetAtomicNum() == 6 for m in atoms) == 1


def _in_three_ring(mol, atom: int) -> bool:
    """Whether two neighbours of `atom` are bonded to each other (a cyclopropane through it)."""
    around = [n.GetIdx() for n in mol.GetAtomWithIdx(atom).GetNeighbors()]
    return any(mol.GetBondBetweenAtoms(a, b) is not None for k, a in enumerate(around) for b in around[k + 1:])


def _sextet_hint(st: StepTrace, i: int) -> str:
    """AR505's hint: where the step split a bond of atom i with the pair going to the other atom,
    a less electronegative one (a C-Br pair sent to carbon), or sent i's lone pair onto another
    atom with no bond made (`:O1 -> :C2`), the arrow that was meant."""
    label = st.before.label
    for move in st.change.moves:
        if move.source_kind == "bond" and move.electrons == 2 and i in move.source_atoms \
                and len(move.sink_atoms) == 1 and move.sink_atoms[0] != i and move.sink_atoms[0] in move.source_atoms:
            other = move.sink_atoms[0]
            if ELECTRONEGATIVITY.get(st.after.elements[other], 0.0) < ELECTRONEGATIVITY[st.after.elements[i]]:
                return (f"the pair of {label(other)}-{label(i)} went to {label(other)}; in a heterolysis the more "
                        f"electronegative {label(i)} takes it: `{label(other)}-{label(i)} -> {label(i)}`")
        if move.source_kind == "lone_pair" and move.source_atoms == (i,) and len(move.sink_atoms) == 1:
            # `:O1 -> :C2` hands the pair over with no bond made; `:O1 -> C2` makes the bond.
            other = label(move.sink_atoms[0])
            return (f"`:{other}` as the sink hands {label(i)}'s pair to {other} with no bond made; to make the "
                    f"{label(i)}-{other} bond, end the arrow at the atom: `:{label(i)} -> {other}`")
    returning = _pair_to_return(st, i)
    if returning:
        return returning
    return ("such species are rare: were single-electron arrows (~>) meant, as for a homolysis, or should a bond "
            "form to it in the same step?")


def _pair_to_return(st: StepTrace, i: int) -> Optional[str]:
    """For an atom a bond pair left toward another bond (`C4=N7 -> C3=C4`, a Meisenheimer complex
    giving up its nitro group's share) while a negative neighbour with a lone pair (the nitro
    group's O-) stood by and gave none back: the arrow that re-forms the pi bond (`:O8 -> N7=O8`)."""
    before, label = st.before, st.before.label
    if not any(m.source_kind == "bond" and m.electrons == 2 and i in m.source_atoms and len(m.sink_atoms) == 2
               and i not in m.sink_atoms for m in st.change.moves):
        return None
    giving = {m.source_atoms[0] for m in st.change.moves if m.source_kind == "lone_pair"}
    for n in sorted(a.GetIdx() for a in before.mol.GetAtomWithIdx(i).GetNeighbors()):
        if before.elements[n] in (7, 8) and before.formal_charge(n) < 0 and before.nonbonding[n] >= 2 \
                and n not in giving:
            return (f"a pair left {label(i)} and none came back: the lone pair of {label(n)} should return to make "
                    f"the pi bond again, `:{label(n)} -> {label(i)}={label(n)}`")
    return None


def _pi_pair_pushed_alone(st: StepTrace) -> Iterator[Diagnostic]:
    """AR513: a pi pair sent onto one end of its bond while nothing bonds to the other end, left a
    cation beside the end that took the pair (a C=O pushed onto its oxygen with the nucleophile's
    arrow into the carbon forgotten). Drawn on its own, that is the bond's polarised resonance form,
    not a step; a resonance step is not judged."""
    if st.step.kind == "resonance":
        return
    change, after = st.change, st.after
    moved = {i: new - old for i, old, new in change.charges}
    bonded = {a for bond in change.formed for a in bond}
    for (i, j), old, new in change.reordered:
        if not 0 < new < old:
            continue
        for cation, anion in ((i, j), (j, i)):
            if moved.get(cation) == 1 and moved.get(anion) == -1 and cation not in bonded and anion not in bonded \
                    and after.nonbonding[cation] == 0:
                c, a = after.label(cation), after.label(anion)
                yield Diagnostic("AR513", f"the pi pair of {c}-{a} goes to {a} with nothing bonding to {c}, "
                                 f"which is left a cation beside it", st.step.loc,
                                 hint=f"a nucleophile's arrow into {c} may be missing (`:Nu -> {c}`); the "
                                      f"polarised bond on its own is a resonance form (a `resonance` step)",
                                 atoms=(c, a), step=st.index)


# Anions whose lone pair, beside a carbocation, makes the pi bond at once: an alkoxide's O- (a
# C=O), an amide ion's N- (a C=N), a thiolate's S- (a C=S).
_PUSHING_ANIONS = frozenset({7, 8, 16})


def _cation_beside_an_anion(st: StepTrace) -> Iterator[Diagnostic]:
    """AR528: a step leaves a carbocation (no lone pair) bonded to an O-, N- or S- that keeps its
    lone pair: a hydride or a leaving group gone from a tetrahedral intermediate's carbon with the
    anion's push that re-forms C=O left out (the Cannizzaro and Meerwein-Ponndorf-Verley hydride
    transfers). The anion's pair goes into the C=O as the group leaves, in the same step (common
    practice; Clayden, from memory); C+ beside O- is only the charge-separated resonance form of a
    C=O. A resonance step is not judged, nor a cation there before the step."""
    if st.step.kind == "resonance":
        return
    after = st.after
    for i, old, new in st.change.charges:
        if new != 1 or after.elements[i] != 6 or after.nonbonding[i]:
            continue
        for n in after.mol.GetAtomWithIdx(i).GetNeighbors():
            j = n.GetIdx()
            if after.elements[j] not in _PUSHING_ANIONS or after.formal_charge(j) >= 0 or after.nonbonding[j] < 2:
                continue
            if any({i, j} == set(bond) and new_order < old_order for bond, old_order, new_order in st.change.reordered):
                continue   # the C=O pair itself pushed onto O, nothing bonding to C: AR513's
            c, a = after.label(i), after.label(j)
            symbol = n.GetSymbol()
            named = nameable(after.mol, i) and nameable(after.mol, j)
            # A bond pair this step sent onto the anion (an Al-O pair in a Meerwein-Ponndorf-Verley
            # hydride transfer) is the pair meant to go on into the C=O.
            onto = next((m for m in st.change.moves if m.source_kind == "bond" and m.electrons == 2
                         and m.sink_atoms == (j,) and j in m.source_atoms), None)
            if named and onto is not None:
                fix = (f"let the pair {a} takes go on into the C={symbol}: write `{onto.move.source} -> {c}={a}` in "
                       f"place of `{onto.move}`")
            else:
                push = f"`:{a} -> {c}={a}`" if named else f"{a}'s lone pair into the {c}-{a} bond"
                fix = f"add {push} to this step"
            # At the arrow that took the pair away from the carbon (the hydride's, the leaving group's).
            loc = next((m.move.loc for m in st.change.moves if m.source_kind == "bond" and i in m.source_atoms
                        and i not in m.sink_atoms), st.step.loc)
            yield Diagnostic(
                "AR528", f"{c} is left a carbocation beside {a}, a negative {symbol} with a lone pair that does not "
                f"push in: C+ beside {symbol}- is the charge-separated form of C={symbol}, not an intermediate",
                loc, hint=f"{fix}: the anion's pair makes C={symbol} as {c} gives up its other pair (a tetrahedral "
                f"intermediate collapsing, a hydride pushed out, an enolate's C=C bonding)",
                atoms=(c, a), step=st.index)
            break


# The cation a heteroatom's lone pair makes of the carbon beside it, by element.
_ONIUM_CATION = {7: "an iminium ion", 8: "an oxocarbenium ion", 16: "a thionium ion"}


def _reacted_at_the_donor_end(st: StepTrace) -> Iterator[tuple[int, Diagnostic]]:
    """AR533, with the carbocation it names: a C=C pair takes a proton, or bonds to another
    electrophile (a Michael acceptor's carbon, an alkyl halide's), at the carbon that bears an O, N
    or S with a lone pair (an enol ether, an enamine, a vinyl sulfide), leaving the other carbon a
    bare alkyl cation, where the bond made at that other carbon would leave the cation beside the
    heteroatom, whose lone pair spreads the charge (an oxocarbenium or iminium ion). Such alkenes
    react at the carbon away from the heteroatom (common practice; Clayden, the tetrahydropyranyl
    ether from dihydropyran, the Stork enamine alkylation and Michael addition; from memory). A
    primary cation so left (an acetone enamine's CH2) is AR533's too, not AR511's: its hint names
    the fix. A cation left allylic, benzylic or beside a lone pair is not judged."""
    if st.step.kind == "resonance":
        return
    before, after = st.before, st.after
    elements = after.elements
    for m in st.change.moves:
        if m.electrons != 2 or m.source_kind != "bond" or len(m.sink_atoms) != 2:
            continue
        end = next((k for k in m.sink_atoms if k in m.source_atoms and elements[k] == 6), None)
        if end is None:
            continue
        taker = next(k for k in m.sink_atoms if k != end)
        if taker in m.source_atoms:
            continue   # a pi bond made from a sigma one, or kept: no bond to a new atom
        other = next(k for k in m.source_atoms if k != end)
        if (elements[other] != 6 or before.bond_electrons(end, other) != 4 or after.formal_charge(other) != 1
                or after.nonbonding[other] or not _bare_alkyl_cation(after, other)):
            continue
        # The heteroatom the alkene bore before the step, not the electrophile's own O or N just
        # bonded to it (a C=C pair taking HOCl's oxygen is no enol ether).
        donor = next((n.GetIdx() for n in before.mol.GetAtomWithIdx(end).GetNeighbors()
                      if elements[n.GetIdx()] in _ONIUM_CATION and after.formal_charge(n.GetIdx()) == 0
                      and after.nonbonding[n.GetIdx()] >= 2 and after.bond_electrons(end, n.GetIdx())), None)
        if donor is None:
            continue
        yield other, _donor_end_diagnostic(st, m, end, other, taker, donor)


def _donor_end_diagnostic(st: StepTrace, m, end: int, other: int, taker: int, donor: int) -> Diagnostic:
    """AR533's finding for the C=C pair of move `m` bonded at `end`, beside `donor`, to `taker` (a
    hydrogen as a proton, or an electrophile), leaving `other` a carbocation."""
    before, label = st.before, st.after.label
    c_end, c_other, x = label(end), label(other), label(donor)
    onium = _ONIUM_CATION[st.after.elements[donor]]
    bond = "=".join(label(k) for k in sorted((end, other)))
    if st.after.elements[taker] == 1:
        holder = next((n.GetIdx() for n in before.mol.GetAtomWithIdx(taker).GetNeighbors()), None)
        if holder is not None and all(nameable(before.mol, k) for k in (end, other, holder)):
            fix = f"`{bond} -> {c_other}-H({label(holder)})`, with `:{x} -> {x}={c_end}` in the same step or the next"
        else:
            fix = f"the C=C pair onto a proton at {c_other}, and {x}'s lone pair into {x}={c_end}"
        return Diagnostic(
            "AR533", f"the proton goes to {c_end}, the carbon that bears {x}, leaving {c_other} a carbocation with "
            f"nothing to stabilise it; at {c_other} it would leave the cation on {c_end} beside {x}'s lone pair, "
            f"{onium}", m.move.loc,
            hint=f"protonate the carbon away from the heteroatom: {fix} (an enol ether or enamine takes a proton "
                 f"at its beta carbon)",
            atoms=(c_end, c_other, x), step=st.index)
    e = label(taker)
    if all(nameable(before.mol, k) for k in (end, other, taker, donor)):
        fix = f"`{bond} -> {c_other}-{e}`, with `:{x} -> {x}={c_end}` in the same step"
    else:
        fix = f"the C=C pair into a bond from {c_other} to {e}, and {x}'s lone pair into {x}={c_end}"
    return Diagnostic(
        "AR533", f"{e} bonds to {c_end}, the carbon that bears {x}, leaving {c_other} a carbocation with nothing to "
        f"stabilise it; bonded at {c_other} it would leave the cation on {c_end} beside {x}'s lone pair, {onium}",
        m.move.loc,
        hint=f"an enol ether or enamine reacts with electrophiles at its beta carbon, away from the heteroatom, "
             f"and {onium} results: {fix}",
        atoms=(c_end, c_other, x), step=st.index)


def _bare_alkyl_cation(state: ElectronState, i: int) -> bool:
    """Whether carbocation i has nothing beside it to spread the charge: no multiple bond of its own,
    no neighbour with a lone pair, a multiple bond or an aromatic ring, no cyclopropane beside it."""
    mol = state.mol
    atom = mol.GetAtomWithIdx(i)
    if any(b.GetBondTypeAsDouble() > 1 for b in atom.GetBonds()):
        return False
    for n in atom.GetNeighbors():
        k = n.GetIdx()
        if state.nonbonding[k] or n.GetIsAromatic() or any(b.GetBondTypeAsDouble() > 1 for b in n.GetBonds()):
            return False
        if state.elements[k] == 6 and _in_three_ring(mol, k):
            return False
    return True


# Neighbours that hold a carbanion's pair (common practice): an ylide's onium, phosphorus, sulfur,
# silicon, selenium and boron beside it.
_CARBANION_HOLDERS = frozenset({5, 14, 15, 16, 34})


def _unstabilised_carbanion(mol, i: int) -> bool:
    """Whether carbon i, a carbanion, is sp3 with nothing beside it to take its charge: no pi bond
    or arene, no onium, P, S, Si, Se or B, fewer than two halogens (a trihalomethanide is stable)."""
    atom = mol.GetAtomWithIdx(i)
    if any(b.GetBondTypeAsDouble() > 1 for b in atom.GetBonds()):
        return False   # a vinyl, aryl or acetylide anion, or the carbanion end of an ylide's double bond
    halogens = 0
    for n in atom.GetNeighbors():
        z = n.GetAtomicNum()
        if (z in _CARBANION_HOLDERS or n.GetFormalCharge() > 0 or n.GetIsAromatic()
                or any(b.GetBondTypeAsDouble() > 1 for b in n.GetBonds())):
            return False
        halogens += z in (9, 17, 35, 53)
    return halogens < 2


def _nucleophile_at(change, elements, atom: int, kinds: tuple[int, ...] = (1, 6)) -> Optional[int]:
    """The atom of an element in `kinds` whose own pair makes a new bond to `atom` in this step, if
    any: by default a carbon or hydrogen (a carbanion's lone pair, an organometallic's C-M bond, a
    B-H or Al-H bond)."""
    partner = change.attacker(atom)
    return partner if partner is not None and elements[partner] in kinds else None


def attack_sent_elsewhere(change, nucleophile: int, taken: int, n: str, x: str) -> tuple:
    """The move by which `nucleophile` (labelled n) bonds to `taken` in this step, and that move
    written onto atom x instead (`:n -> x` from a lone pair, `source -> n-x` from a bond): the fix
    AR514 and AR539 give for a nucleophile sent to the wrong end of a polar bond."""
    attack = next(m for m in change.moves if nucleophile in m.source_atoms and set(m.sink_atoms) == {nucleophile, taken})
    return attack, f"`:{n} -> {x}`" if attack.source_kind == "lone_pair" else f"`{attack.move.source} -> {n}-{x}`"


# Nucleophiles judged at the wrong end of a C=O, C=N, C#N or ketene: carbon and hydride (umpolung
# aside, common practice), and the O, N and S nucleophiles (water, an alcohol, an amine, a
# carboxylate, a thiol) that add at the carbon of a nitrilium ion, an iminium ion, an isocyanate,
# a carbodiimide or a ketene (Clayden, from memory). A phosphorus nucleophile is not among them:
# a phosphite bonds to the oxygen of an alpha-dicarbonyl (the Kukhtin-Ramirez adduct, memory).
_WRONG_END_NUCLEOPHILES = (1, 6, 7, 8, 16)


def _cumulated_to(mol, carbon: int, other: int) -> Optional[int]:
    """The O or N that `carbon` is double-bonded to besides `other`: carbon is the centre of a
    ketene (C=C=O) or a ketenimine (C=C=N), left an acyl or imidoyl anion when the C=C pair is
    pushed onto it."""
    for bond in mol.GetAtomWithIdx(carbon).GetBonds():
        far = bond.GetOtherAtomIdx(carbon)
        if far != other and bond.GetBondTypeAsDouble() == 2 and mol.GetAtomWithIdx(far).GetAtomicNum() in (7, 8):
            return far
    return None


def _pi_pair_onto_carbon(st: StepTrace) -> Iterator[Diagnostic]:
    """AR514: a pi pair sent onto a carbon that keeps it as a lone pair, leaving a carbanion with
    nothing to hold its charge: a C=O pair sent to its carbon (the nucleophile drawn onto the
    oxygen), an enone's C=C pair sent to the carbon away from the carbonyl. A polar pi bond gives
    its pair to the more electronegative atom, and a C=C pair goes on into a bond or toward an
    acceptor (common practice). Where a nucleophile (C, H, N, O or S) bonds to the O or N end, or
    to the CH2 end of a ketene, it is judged whatever would hold the carbanion: it adds at the
    carbon. A resonance step is not judged."""
    if st.step.kind == "resonance":
        return
    change, after = st.change, st.after
    gained = {i for i, old, new in change.charges if new == -1 and old > -1}
    for move in change.moves:
        if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 1:
            continue
        carbon = move.sink_atoms[0]
        if carbon not in move.source_atoms or carbon not in gained or after.elements[carbon] != 6:
            continue
        other = move.source_atoms[1] if move.source_atoms[0] == carbon else move.source_atoms[0]
        if after.mol.GetBondBetweenAtoms(carbon, other) is None or after.nonbonding[carbon] != 2:
            continue   # a sigma bond broken (a leaving group: AR510's)
        c, o = after.label(carbon), after.label(other)
        attacker = centre = None
        if after.elements[other] in (7, 8):
            attacker = _nucleophile_at(change, after.elements, other, _WRONG_END_NUCLEOPHILES)
        elif after.elements[other] == 6:
            centre = _cumulated_to(after.mol, carbon, other)
            if centre is not None:
                attacker = _nucleophile_at(change, after.elements, other, _WRONG_END_NUCLEOPHILES)
        if attacker is not None:
            n, bond = st.before.label(attacker), move.move.source
            attack = next(m for m in change.moves if attacker in m.source_atoms and set(m.sink_atoms) == {attacker, other})
            instead = f"`:{n} -> {c}`" if attack.source_kind == "lone_pair" else f"`{attack.move.source} -> {c}-{n}`"
            if centre is not None:
                # A nucleophile bonded to the CH2 end of a ketene (or a ketenimine), the C=C pair
                # sent onto the central carbon, which is left an acyl (imidoyl) anion: an alcohol
                # or an amine adds at the central carbon, the pair going to the CH2 end as an
                # enolate (the Wolff rearrangement's ketene trapped; Clayden, from memory).
                kind, anion, made = (("ketene", "an acyl", "an enolate") if after.elements[centre] == 8
                                     else ("ketenimine", "an imidoyl", "an aza-enolate"))
                yield Diagnostic(
                    "AR514", f"{n} bonds to {o} and the pi pair of {bond} goes onto {c}, making {anion} anion: "
                    f"backwards, a nucleophile adds at the central carbon of a {kind}, {c} (the carbon of "
                    f"{c}={after.label(centre)})", move.move.loc,
                    hint=f"{n} adds at {c}: {instead}, and the pair of {bond} goes to {o} (`{bond} -> {o}`), "
                         f"making {made}",
                    atoms=(c, o, n), step=st.index)
                continue
            # A nucleophile bonded to the O of C=O or the N of C=N / C#N (a carbanion, a hydride,
            # or water, an alcohol, an amine, a carboxylate at the N of a nitrilium or iminium
            # ion, an isocyanate or a carbodiimide), its pi pair sent onto the carbon: the polarity
            # is backwards whatever then holds the carbanion (a benzylic one, an acyl or imidoyl
            # anion, an N+ beside it). Nucleophiles add at the carbon.
            order = st.before.mol.GetBondBetweenAtoms(carbon, other).GetBondTypeAsDouble()
            symbol = ("#" if order == 3 else "=") + after.mol.GetAtomWithIdx(other).GetSymbol()
            yield Diagnostic(
                "AR514", f"{n} bonds to {o} and a pi pair of {c}-{o} goes onto {c}, making a carbanion: backwards, "
                f"a nucleophile adds at the carbon of a C{symbol} bond", move.move.loc,
                hint=f"the pair of a C{symbol} bond goes to {o} (`{bond} -> {o}`), and {n} adds at {c}: {instead}",
                atoms=(c, o, n), step=st.index)
            continue
        if not _unstabilised_carbanion(after.mol, carbon):
            continue   # a carbanion something holds
        polar = ELECTRONEGATIVITY.get(after.elements[other], 0.0) > ELECTRONEGATIVITY[6]
        hint = (f"the pair of a C={after.mol.GetAtomWithIdx(other).GetSymbol()} bond goes to {o} "
                f"(`{move.move.source} -> {o}`), and a nucleophile adds at {c}" if polar else
                "a C=C pair goes on into a bond, or toward the carbonyl of an enone: check where this arrow ends")
        yield Diagnostic("AR514", f"the pi pair of {c}-{o} goes onto {c}, leaving a carbanion with nothing to "
                         f"hold its charge", move.move.loc, hint=hint, atoms=(c, o), step=st.index)


# Central atoms of an X=O bond that are the electrophile when they hold no lone pair: N (the
# nitronium ion, a nitro group), P (a phosphoryl), S (SO3, a sulfonyl).
_OXO_CENTRES = frozenset({7, 15, 16})


def _pi_pair_onto_oxo_centre(st: StepTrace) -> Iterator[Diagnostic]:
    """AR514 for an X=O bond (X = N, P or S with no lone pair before the step: NO2+, SO3): a carbon
    nucleophile (an arene's pi pair, a carbanion) or a hydride bonds to the oxygen while the pi
    pair goes onto X as a lone pair. The electrophilic atom is X, and the nucleophile bonds there,
    the pair going to oxygen (textbook nitration and sulfonation). An X that already holds a lone
    pair (a nitroso N, as in an O-nitroso aldol; a sulfoxide S) is not judged, nor a nucleophile
    that is itself a heteroatom (an enolate's O)."""
    if st.step.kind == "resonance":
        return
    change, before, after = st.change, st.before, st.after
    for move in change.moves:
        if move.source_kind != "bond" or move.electrons != 2 or len(move.sink_atoms) != 1:
            continue
        centre = move.sink_atoms[0]
        if centre not in move.source_atoms or before.elements[centre] not in _OXO_CENTRES:
            continue
        oxygen = move.source_atoms[1] if move.source_atoms[0] == centre else move.source_atoms[0]
        if before.elements[oxygen] != 8 or before.nonbonding[centre] != 0 \
                or after.mol.GetBondBetweenAtoms(centre, oxygen) is None:
            continue   # a sigma bond broken, or a centre that had a lone pair to start with
        attacker = _nucleophile_at(change, after.elements, oxygen)
        if attacker is None:
            continue
        x, o, n = after.label(centre), after.label(oxygen), before.label(attacker)
        symbol = after.mol.GetAtomWithIdx(centre).GetSymbol()
        attack, instead = attack_sent_elsewhere(change, attacker, oxygen, n, x)
        yield Diagnostic(
            "AR514", f"{n} bonds to {o} and the pi pair of {x}={o} goes onto {x}: backwards, the electrophilic atom "
            f"of {'a' if symbol == 'P' else 'an'} {symbol}=O bond with no lone pair is {x}", move.move.loc,
            hint=f"{n} adds at {x}: {instead}, and the pair of {x}={o} goes to {o} (`{move.move.source} -> {o}`)",
            atoms=(x, o, n), step=st.index)


# The pi acceptors whose carbon, bonded to a carbocation, destabilises it: C=O, C=N, C#N.
_ACCEPTOR_ENDS = frozenset({7, 8})


def _acceptor_carbon(state: ElectronState, carbon: int) -> Optional[tuple[int, str]]:
    """(the O or N, the bond written `C=O`, `C=N` or `C#N`) where `carbon` is the carbon of such a
    bond (an aromatic ring's C=N aside: the ring spreads a cation beside it)."""
    atom = state.mol.GetAtomWithIdx(carbon)
    if atom.GetAtomicNum() != 6 or atom.GetIsAromatic():
        return None
    for bond in atom.GetBonds():
        far = bond.GetOtherAtom(atom)
        order = state.bond_electrons(carbon, far.GetIdx())
        if far.GetAtomicNum() in _ACCEPTOR_ENDS and order in (4, 6):
            return far.GetIdx(), f"C{'=' if order == 4 else '#'}{far.GetSymbol()}"
    return None


def _alpha_acceptor_cation(st: StepTrace, i: int) -> Optional[Diagnostic]:
    """AR511 for a carbocation the step makes on a carbon bonded to the carbon of a C=O, C=N or
    C#N, with nothing else beside it to spread the charge (no O, N or S with a lone pair, no pi
    bond, arene or cyclopropane): the acceptor pulls on the sigma bond and its pi bond cannot share
    the charge, so such cations are strongly destabilised and rarely intermediates (Creary, Acc.
    Chem. Res. 1985, alpha-carbonyl cations; from memory). Most often an arrow drawn the wrong way:
    an enone's C=C pair sent to a nucleophile, where the enone is the electrophile (common
    practice). A resonance step is not judged."""
    after, before = st.after, st.before
    atom = after.mol.GetAtomWithIdx(i)
    if st.step.kind == "resonance" or any(after.bond_electrons(i, n.GetIdx()) > 2 for n in atom.GetNeighbors()):
        return None   # a vinyl cation or an acylium ion
    acceptor = None
    for n in atom.GetNeighbors():
        k = n.GetIdx()
        if n.GetAtomicNum() in _DONORS and after.formal_charge(k) <= 0 and after.nonbonding[k] >= 2:
            return None   # an oxocarbenium, iminium or thionium ion
        found = _acceptor_carbon(after, k)
        if found is not None:
            acceptor = acceptor or (k, *found)
        elif n.GetIsAromatic() or any(after.bond_electrons(k, m.GetIdx()) > 2 for m in n.GetNeighbors()) \
                or (n.GetAtomicNum() == 6 and _in_three_ring(after.mol, k)):
            return None   # allylic, benzylic, cyclopropylcarbinyl
    if acceptor is None:
        return None
    k, end, bond = acceptor
    label = after.label
    c, carbon, x = label(i), label(k), label(end)
    # Where the pi pair of a C=C at the cation went to bond a nucleophile to the other carbon: the
    # enone's C=C drawn as the nucleophile, a Michael addition reversed.
    pushed = next((m for m in st.change.moves if m.source_kind == "bond" and m.electrons == 2 and i in m.source_atoms
                   and i not in m.sink_atoms and before.bond_electrons(*m.source_atoms) == 4), None)
    if pushed is not None and len(pushed.sink_atoms) == 2:
        beta = next(a for a in pushed.source_atoms if a != i)
        if all(nameable(before.mol, a) for a in (i, beta, k, end)):
            moves = f"`{pushed.move.source} -> {c}={carbon}` with `{carbon}{bond[1]}{x} -> {x}`"
        else:
            moves = f"the pair of the C=C on into the {bond}"
        hint = (f"a C=C conjugated with a {bond} (an enone's) is the electrophile, not the nucleophile: the arrow "
                f"probably runs the wrong way. The nucleophile's pair bonds to {label(beta)}, the beta carbon, and "
                f"the C=C pair moves on toward {x}: {moves}")
    else:
        hint = (f"a cation beside the carbon of a {bond} is seldom an intermediate: check the direction of the arrows "
                f"(which atom gives the pair), or put the charge where a lone pair, pi bond or alkyl groups hold it")
    loc = pushed.move.loc if pushed is not None else next(
        (m.move.loc for m in st.change.moves if m.source_kind == "bond" and i in m.source_atoms
         and i not in m.sink_atoms), st.step.loc)
    return Diagnostic("AR511", f"{c} is left a carbocation beside {carbon}, the carbon of a {bond}: a cation alpha "
                      f"to a carbonyl, imine or nitrile carbon is strongly destabilised (Creary 1985)", loc,
                      hint=hint, atoms=(c, carbon), step=st.index)


def _bare_silyl_or_sulfonyl(st: StepTrace, i: int) -> Optional[Diagnostic]:
    """AR511 for a silicon or sulfur cation with no lone pair that the step leaves three-coordinate
    by taking a bond pair away: a silylium ion (R3Si+) or a sulfonyl cation (RSO2+). Neither is set
    free in solution (common practice): a silyl or sulfonyl group moves by a nucleophile's attack
    at Si or S (a pentacoordinate silicate, as the alkoxide of a Peterson elimination makes; an
    addition at a sulfonyl S), leaving bonded to that nucleophile."""
    after, label = st.after, st.after.label
    atom = after.mol.GetAtomWithIdx(i)
    if atom.GetDegree() != 3 or any(after.formal_charge(n.GetIdx()) < 0 for n in atom.GetNeighbors()):
        return None   # (an S+ beside its own O- is SO3 written charge-separated, a neutral molecule)
    x = label(i)
    if after.elements[i] == 14:
        kind, group = "a silylium ion (R3Si+)", "silyl"
        example = "the alkoxide of a Peterson elimination bonds to Si first, a pentacoordinate silicate"
    elif sum(n.GetAtomicNum() == 8 for n in atom.GetNeighbors()) >= 2:
        kind, group = "a sulfonyl cation (RSO2+)", "sulfonyl"
        example = ("an alkoxide adds at S, or at the ipso carbon of an aryl sulfone in a Smiles rearrangement, as in "
                   "the Julia-Kocienski olefination")
    else:
        return None
    nucleophile = _oxyanion_near(st.before, i)
    attack = (f" (here `:{label(nucleophile)} -> {x}` in a step of its own)"
              if nucleophile is not None and nameable(st.before.mol, nucleophile) and nameable(st.before.mol, i) else "")
    return Diagnostic("AR511", f"{x} is left as {kind} with nothing bonded to it in place of the group that left",
                      st.step.loc,
                      hint=f"a {group} cation is not set free in solution: the group moves by a nucleophile's attack "
                           f"at {x} first{attack}, or in the same step ({example})",
                      atoms=(x,), step=st.index)


def _oxyanion_near(state, centre: int) -> Optional[int]:
    """An O- with a lone pair within three bonds of `centre` in its own molecule (the alkoxide of a
    beta-hydroxysilane or a beta-alkoxy sulfone), the nucleophile that would bond to it."""
    mol = state.mol
    for k, element in enumerate(state.elements):
        if element == 8 and state.formal_charge(k) < 0 and state.nonbonding[k] >= 2 and k != centre:
            path = Chem.GetShortestPath(mol, centre, k)
            if 0 < len(path) <= 4:
                return k
    return None


def doubly_bonded(state, i: int) -> Optional[int]:
    """An atom bonded to atom i by a double bond in `state` (the O of a P=O), if any."""
    return next((n.GetIdx() for n in state.mol.GetAtomWithIdx(i).GetNeighbors()
                 if state.bond_electrons(i, n.GetIdx()) == 4), None)


def _shell_drawn_with_oxo_bonds(state: ElectronState, i: int) -> int:
    """Atom i's valence electrons counted as chemists draw an oxo centre: each positive charge of it
    paired with an O- neighbour into an X=O bond. Periodate written charge-separated (I+3 and four
    O-, as RDKit holds it and the README asks) holds eight, drawn IO3(O-) fourteen; an alcohol
    bonded to it (I+2) holds ten, drawn with two I=O still fourteen. Otherwise the shell itself."""
    shell = state.nonbonding[i] + 2 * state.bond_sums[i]
    charge = state.formal_charge(i)
    if charge <= 0:
        return shell
    oxides = sum(1 for n in state.mol.GetAtomWithIdx(i).GetNeighbors()
                 if n.GetAtomicNum() == 8 and state.formal_charge(n.GetIdx()) == -1
                 and state.bond_electrons(i, n.GetIdx()) == 2)
    return shell + 2 * min(charge, oxides)


# P and S made tetrahedral with one double bond hold ten valence electrons as chemists draw them.
_TETRAHEDRAL_TEN = frozenset({15, 16})


def _made_tetrahedral_double_bond(st: StepTrace, i: int) -> bool:
    """Whether the step made a double bond to atom i, a P or S it brings to ten electrons with
    four electron domains (sigma partners and lone pairs): a phosphate, phosphonate or
    phosphine oxide P=O, a P=S, an iminophosphorane's P=N (four sigma partners), a sulfoxide's S=O
    (three and a lone pair). Chemists draw these centres so (common practice: Clayden writes the
    phosphate, the Arbuzov phosphonate and Ph3P=O with P=O); the double bond stands for the polar
    P+-O- bond, no expanded octet. A five- or six-coordinate P (an oxaphosphetane, PCl5) has more
    domains and is left to AR504."""
    after = st.after
    if after.elements[i] not in _TETRAHEDRAL_TEN or after.nonbonding[i] + 2 * after.bond_sums[i] != 10:
        return False
    if after.mol.GetAtomWithIdx(i).GetTotalDegree() + after.nonbonding[i] // 2 != 4:
        return False
    made = list(st.change.formed) + [pair for pair, old, new in st.change.reordered if new > old]
    return any(i in pair and after.bond_electrons(*pair) == 4 for pair in made)


def _metal_charge_as_written(state: ElectronState, i: int, charge: int) -> bool:
    """Whether a charge of magnitude two or more on atom i is how its metal is written, not a slip:
    an ionic metal (Mg2+, Zn2+); a bare d- or f-block ion with no bond (Fe3+ of the Fenton reaction,
    Ce4+ of CAN: single-electron oxidants, common practice); a d-block metal whose negative charge
    the onium atoms bonded to it balance (a phosphine or amine ligand written as an onium-ate pair,
    P+ to Pd-, the language's only way to write a dative bond: Pd(PMe3)2 is [Pd-2] between two P+,
    as common practice writes such complexes)."""
    element = state.elements[i]
    if element in _IONIC_METALS:
        return True
    if element not in D_BLOCK and element not in _F_BLOCK:
        return False
    atom = state.mol.GetAtomWithIdx(i)
    if atom.GetDegree() == 0 and atom.GetTotalNumHs() == 0:
        return True
    onium = sum(max(state.formal_charge(n.GetIdx()), 0) for n in atom.GetNeighbors())
    return element in D_BLOCK and charge < 0 and onium >= -charge


# Halogens that expand their octet as anions of even count (I3-, ICl2-) or with fluorine (BrF3).
_HALOGENS = frozenset({17, 35, 53})


class UnusualElectronCounts(Check):
    name = "unusual electron counts"
    codes = ("AR503", "AR504", "AR505", "AR511", "AR513", "AR514", "AR528", "AR533")

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        after, before = st.after, st.before
        if after is None:
            return
        yield from _pi_pair_pushed_alone(st)
        yield from _pi_pair_onto_carbon(st)
        yield from _pi_pair_onto_oxo_centre(st)
        yield from _cation_beside_an_anion(st)
        donor_end_cations = set()
        for cation, finding in _reacted_at_the_donor_end(st):
            donor_end_cations.add(cation)
            yield finding
        for i, old_charge, charge in st.change.charges:
            # As for the shell below: a charge the species was written with and the step keeps
            # (a sulfonyl S written S2+ with two O-) is not the step's doing; nor is one the step
            # lowers (periodate's I+3, written charge-separated as the README asks, taking an
            # alcohol to I+2). A charge raised to two or more, or turned to the other sign, is.
            raised = abs(charge) > abs(old_charge) or charge * old_charge < 0
            if abs(charge) >= 2 and raised and not _metal_charge_as_written(after, i, charge):
                label = after.label(i)
                yield Diagnostic("AR503", f"{label} ends the step with formal charge {charge:+d}", st.step.loc,
                                 hint=f"a formal charge of {charge:+d} on one atom is rare; check the moves onto this atom",
                                 atoms=(label,), step=st.index)
        for i, shell in st.change.shells.items():
            element = after.elements[i]
            old_shell = before.nonbonding[i] + 2 * before.bond_sums[i]
            if shell == 6 and element in _RARELY_SEXTET and old_shell > 6:
                label = after.label(i)
                # Neutral with six (a nitrene, an oxene): named as such, not as a cation.
                # A closed shell short of its octet, not an open shell (that would be a radical).
                kind = (f"{_RARELY_SEXTET[element]} cation short of its octet" if after.formal_charge(i) > 0
                        else f"a neutral {_RARELY_SEXTET[element].split()[-1]} with six electrons"
                             f"{', a nitrene' if element == 7 else ''}")
                yield Diagnostic("AR505", f"{label} is left with six valence electrons ({kind})", st.step.loc,
                                 hint=_sextet_hint(st, i), atoms=(label,), step=st.index)
            made_carbocation = (shell == 6 and element == 6 and old_shell > 6 and after.nonbonding[i] == 0
                                and after.formal_charge(i) == 1)
            if made_carbocation and i not in donor_end_cations and unstabilised_primary_cation(after.mol, i):
                label = after.label(i)
                yield Diagnostic("AR511", f"{label} is left as a primary (or methyl) carbocation with nothing to "
                                 f"stabilise it", st.step.loc,
                                 hint="such cations are not formed in solution: put the charge on the more "
                                      "substituted or stabilised carbon (Markovnikov), or make the step concerted "
                                      "(SN2, E2, a shift as the group leaves)",
                                 atoms=(label,), step=st.index)
            elif made_carbocation and (beside_acceptor := _alpha_acceptor_cation(st, i)) is not None:
                yield beside_acceptor
            if shell < old_shell and element in (14, 16) and after.nonbonding[i] == 0 and after.formal_charge(i) > 0:
                found = _bare_silyl_or_sulfonyl(st, i)
                if found is not None:
                    yield found
            # Only a step that expands the shell: a sulfonyl S substituted (an alcohol onto MsCl)
            # keeps the twelve electrons its species was written with.
            limit = shell_limit(element)
            if limit is not None and shell > limit and element > 10 and shell > old_shell:
                if element in _HYPERVALENT and \
                        _shell_drawn_with_oxo_bonds(after, i) <= _shell_drawn_with_oxo_bonds(before, i):
                    continue   # a charge-separated oxo centre the step only keeps as drawn (an alcohol onto IO4-)
                if _made_tetrahedral_double_bond(st, i):
                    continue   # the P=O of a phosphate, phosphonate or phosphine oxide; a sulfoxide's S=O
                label = after.label(i)
                symbol = _HYPERVALENT.get(element)
                if limit == 18:
                    beyond, hint = "more than the 18 of the 18-electron rule", \
                        "a ligand should leave the metal in the same step"
                elif element == 15 and shell > 10 and (double := doubly_bonded(after, i)) is not None:
                    # Ten is phosphorus's most in a neutral or cationic species (PCl5, an oxaphosphorane);
                    # twelve only in a hexacoordinate anion (PF6-), never beside a P=O still kept.
                    x = after.label(double)
                    move = f"`{label}={x} -> {x}`" if nameable(after.mol, i) and nameable(after.mol, double) else \
                        f"the {label}={x} pair onto {x}"
                    beyond, hint = "expanded octet, twelve beside a double bond", \
                        (f"phosphorus with a double bond holds ten (a phosphonate, a phosphine oxide): a new bond "
                         f"to it sends that pair onto {x}, {move} in the same step (the oxaphosphetane of a "
                         f"Horner-Wadsworth-Emmons), or a bond should break")
                elif element in _HALOGENS and (shell % 2 or after.formal_charge(i) <= -2):
                    # Hypervalent halogens (I3-, ICl2-, BrF3) hold an even count at charge -1 or above;
                    # a ninth electron or a second negative charge is an arrow gone astray.
                    beyond, hint = "expanded octet", \
                        (f"not hypervalent {symbol}: a halogen beyond eight with an odd count or a charge of -2 "
                         f"or less has taken electrons meant for elsewhere; a bond to {label} should break in "
                         f"the same step, or an arrow onto it should end elsewhere")
                elif element == 15 and after.nonbonding[i] and after.formal_charge(i) < 0 <= before.formal_charge(i):
                    # A phosphoranide (P- with its lone pair kept) made by a pair bonding to a P(III):
                    # the phosphine or phosphite attacks (iodine, an alkyl halide), it is not attacked.
                    beyond, hint = "expanded octet", \
                        (f"not hypervalent P: {label} kept its lone pair and became negative as another pair "
                         f"bonded to it; P(III) is a nucleophile here, its lone pair should not stay as another "
                         f"pair bonds (the electrons went astray): let {label}'s lone pair make a bond to the "
                         f"electrophile, or let a group leave {label} in the same step")
                elif symbol:
                    beyond, hint = "expanded octet", \
                        f"fine for hypervalent {symbol} (common practice); otherwise a bond should break"
                else:
                    beyond, hint = "expanded octet", "rare for this element: a bond to it should break in the same step"
                yield Diagnostic("AR504", f"{label} holds {shell} valence electrons ({beyond})", st.step.loc,
                                 hint=hint, atoms=(label,), step=st.index)


# d- and f-block metals, whose unpaired electrons are d or f electrons of the metal itself: the
# paramagnetic salts drawn as Lewis acids or oxidants in polar steps (FeBr3, high-spin iron(III);
# CuCl2; CeCl3) are written so on purpose.
_OPEN_SHELL_METALS = _TRANSITION_METALS | _F_BLOCK
# Metals of groups 1 and 2, whose ions are cations (Li+, Mg2+).
_S_BLOCK_METALS = frozenset({3, 4, 11, 12, 19, 20, 37, 38, 55, 56})


def _radical_as_written(state: ElectronState, i: int) -> bool:
    """Whether atom i carries an unpaired electron (odd N) that AR530 judges: any atom but a d- or
    f-block metal bonded to no carbon (a salt such as FeBr3). An organometallic's metal is written
    with an even count (a cuprate's Cu(I), a Grignard's Mg)."""
    if not state.nonbonding[i] % 2:
        return False
    if state.elements[i] not in _OPEN_SHELL_METALS:
        return True
    return any(n.GetAtomicNum() == 6 for n in state.mol.GetAtomWithIdx(i).GetNeighbors())


def _charge_meant(state: ElectronState, i: int) -> int:
    """The change of charge that pairs atom i's odd electron: +1 for an s-block metal (Li+), else
    -1 where one more electron stays within the atom's shell (a cuprate's Cu-, an alkoxide's O-),
    +1 otherwise."""
    element = state.elements[i]
    if element in _S_BLOCK_METALS:
        return 1
    shell = state.nonbonding[i] + 2 * state.bond_sums[i]
    limit = shell_limit(element)
    return -1 if limit is not None and shell + 1 <= limit else 1   # (an f-block metal: an electropositive cation)


def _hydrogen_meant(state: ElectronState, i: int, sp: Species) -> Optional[str]:
    """For a cation with an unpaired electron, atom i written as it is with one more hydrogen
    (`[OH3+:7]` for hydronium written `[OH2+:7]`), where the usual valence of the element it is
    isoelectronic with (RDKit's periodic table: O+ bonds as N does, three bonds; C+ as B) is one
    more than its bonds; offered only if the species so written parses and leaves the atom no
    unpaired electron. None for an unmapped atom, which the species' text cannot be searched for."""
    atom = state.mol.GetAtomWithIdx(i)
    charge, number = state.formal_charge(i), atom.GetAtomMapNum()
    if charge <= 0 or not number or state.elements[i] - charge < 1:
        return None
    if Chem.GetPeriodicTable().GetDefaultValence(state.elements[i] - charge) != state.bond_sums[i] + 1:
        return None
    written = _written_with_charge(state, i, charge, extra_hydrogens=1)
    smiles = re.sub(rf"\[[^\[\]]*:{number}\]", lambda _: written, sp.smiles, count=1)
    with rdkit_messages():
        mol = Chem.MolFromSmiles(smiles)
    if mol is None:
        return None
    meant = next((a for a in mol.GetAtoms() if a.GetAtomMapNum() == number), None)
    return written if meant is not None and meant.GetNumRadicalElectrons() == 0 else None


def _written_with_charge(state: ElectronState, i: int, charge: int, extra_hydrogens: int = 0) -> str:
    """Atom i as a bracket atom of SMILES carrying `charge` (and `extra_hydrogens` more than it
    holds): `[Cu-:2]`."""
    atom = state.mol.GetAtomWithIdx(i)
    hydrogens = atom.GetTotalNumHs(includeNeighbors=True) + extra_hydrogens
    text = (f"{atom.GetIsotope() or ''}{atom.GetSymbol()}" + ("H" if hydrogens else "")
            + (str(hydrogens) if hydrogens > 1 else "") + ("+" if charge > 0 else "-" if charge < 0 else "")
            + (str(abs(charge)) if abs(charge) > 1 else ""))
    number = atom.GetAtomMapNum()
    return f"[{text}:{number}]" if number else f"[{text}]"


def _written_in(state: ElectronState, i: int, species: tuple[Species, ...]) -> tuple[Species, Location]:
    """The species that writes atom i, and where: at the atom itself when it carries a map number,
    else at the species found by a map number of its molecule (or the one species)."""
    atom = state.mol.GetAtomWithIdx(i)
    own = atom.GetAtomMapNum()
    fragment = next(f for f in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False) if i in f)
    for number in [own] + [state.mol.GetAtomWithIdx(k).GetAtomMapNum() for k in fragment]:
        if not number:
            continue
        for sp in species:
            if re.search(rf"\[[^\[\]]*:{number}\]", sp.smiles):
                return sp, map_location(sp, number, 1) if number == own else sp.smiles_loc
    symbol = atom.GetSymbol()
    sp = next((s for s in species if symbol in s.smiles), species[0])
    return sp, sp.smiles_loc


class UnpairedElectronsInPolarMechanism(Check):
    """AR530: a species written with an atom that carries an unpaired electron (a radical, as
    written) in a mechanism none of whose arrows moves a single electron. Pair arrows cannot change
    an atom's electron parity, so a radical met only by pair arrows is most often an ion whose charge
    was left out of the SMILES: a cuprate written Me2Cu (copper(II), nine d electrons) for Me2Cu-
    with its Li+, an alkoxide written [O] for [O-]. A mechanism with a fishhook is radical chemistry
    (a stannyl radical, sodium's electron) and is not judged; nor a d- or f-block metal bonded to no
    carbon (FeBr3, high-spin iron(III), and CuCl2 are paramagnetic salts drawn as Lewis acids)."""

    name = "unpaired electrons in a polar mechanism"
    codes = ("AR530",)

    def __init__(self) -> None:
        self.fishhooks = False
        self.brought: list[Diagnostic] = []   # for species brought in by `uses`, said only at the end

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.index == 0:
            self.fishhooks, self.brought = False, []
        if any(m.electrons == 1 for m in st.step.moves):
            self.fishhooks = True
        if st.entered and not self.fishhooks:
            self.brought.extend(self._judged(st.before, st.entered, st.step.uses, st.index, None))
        return ()

    def finish(self, end: Ending, context) -> Iterator[Diagnostic]:
        steps = end.mechanism.steps
        if end.initial is None or not steps or self.fishhooks:
            return
        start = end.initial
        found = list(self._judged(start, range(len(start.nonbonding)), end.mechanism.species, None,
                                  Chem.GetFormalCharge(start.mol))) + self.brought
        # The steps after one the replay could not apply are read again only then (a long file streams).
        if found and end.steps_replayed < len(steps) and any(
                m.electrons == 1 for step in islice(steps, end.steps_replayed, None) for m in step.moves):
            return
        yield from found

    @staticmethod
    def _judged(state: ElectronState, atoms, species: tuple[Species, ...], step: Optional[int],
                total: Optional[int]) -> Iterator[Diagnostic]:
        for i in atoms:
            if not _radical_as_written(state, i):
                continue
            label = state.label(i)
            sp, loc = _written_in(state, i, species)
            charge = state.formal_charge(i)
            with_hydrogen = _hydrogen_meant(state, i, sp)
            if with_hydrogen:
                # A cation short of a hydrogen (hydronium written [OH2+]): its charge is right.
                meant = f"if {sp.name} is not a radical, {label} lacks a hydrogen: write `{with_hydrogen}`"
            else:
                change = _charge_meant(state, i)
                written = _written_with_charge(state, i, charge + change)
                balance = ""
                if total and total + change == 0:
                    balance = f", which makes the starting species neutral (as written they carry {total:+d})"
                meant = f"if {sp.name} is an ion, write its charge: `{written}`{balance}"
            yield Diagnostic(
                "AR530", f"{label} in {sp.name} is written with an unpaired electron ({state.nonbonding[i]} "
                f"non-bonding electrons, {f'charge {charge:+d}' if charge else 'neutral'}), but no arrow of this "
                f"mechanism moves a single electron", loc,
                hint=f"{meant}; if it is a radical, its steps move one electron at a time (`~>`)",
                atoms=(label,), step=step)
