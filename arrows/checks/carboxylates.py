"""A carbon nucleophile adding to a carboxylate's carbon (AR538).

A carboxylate ion (or its metal salt) spreads its negative charge over both oxygens: it is a very
poor electrophile. A Grignard reagent, an enolate or enol, cyanide or an ylide does not add to it:
the magnesium carboxylate of a Grignard carboxylation survives excess reagent until work-up gives
the acid, and a carboxylate is why an ester's saponification stops (common practice; Clayden,
from memory). An organolithium adds, to a lithium carboxylate, giving the gem-dialkoxide dianion
that work-up turns into a ketone (Jorgenson, Org. React. 1970; Clayden; from memory). An
organosodium, -potassium, -rubidium or -caesium reagent is not judged: its C-metal bond is more
ionic than C-Li (Pauling electronegativities Li 0.98, Na 0.93, K 0.82, Cs 0.79; memory) and it is more
reactive than the organolithium (Schlosser, "Organoalkali Chemistry", in Organometallics in
Synthesis: A Manual; memory), and no source at hand says it stops at the carboxylate.

Judged on the state before the step: a new bond from a carbon's own pair (a lone pair, a C=C, a
C-metal bond) to a carbon that holds a C=O and an O- or O-metal and otherwise only carbon or
hydrogen. An organoalkali reagent is a carbon bonded to an alkali metal, or a carbanion with
nothing beside it to hold the charge, written apart from an alkali metal cation. Not judged: an
organoalkali reagent, a hydride (LiAlH4 does reduce a carboxylate) or a heteroatom nucleophile, a
carbonate or carbamate carbon, and CO2.
"""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import nameable
from ..trace import StepTrace
from . import Check

MAGNESIUM = 12
ALKALI_METALS = frozenset({3, 11, 19, 37, 55})   # Li, Na, K, Rb, Cs
# The metals of a carboxylate salt written with its O-metal bond (RCO2Li, RCO2MgBr, RCO2Na).
_SALT_METALS = frozenset({3, 11, 12, 19, 20, 30, 37, 55, 56})


class CarbonNucleophileOnCarboxylate(Check):
    name = "carbon nucleophile on a carboxylate"
    codes = ("AR538",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.change.formed:
            return
        before = st.before
        for pair in st.change.formed:
            for centre in pair:
                if _carboxylate(before, centre) is None:
                    continue
                nucleophile = st.change.attacker(centre)
                if nucleophile is None or before.elements[nucleophile] != 6 or _organoalkali(before, nucleophile):
                    continue
                move = next((m for m in st.change.moves if set(m.sink_atoms) == {nucleophile, centre}
                             and nucleophile in m.source_atoms), None)
                if move is not None:
                    yield _diagnostic(st, move, nucleophile, centre)


def _carboxylate(state, carbon: int) -> Optional[tuple[int, int]]:
    """(the C=O oxygen, the O- or O-metal) when `carbon` is a carboxylate's carbon: a neutral carbon
    whose other neighbours are carbon or hydrogen."""
    if state.elements[carbon] != 6 or state.formal_charge(carbon) != 0 or state.bond_sums[carbon] != 4:
        return None
    mol = state.mol
    oxo = anionic = None
    for n in mol.GetAtomWithIdx(carbon).GetNeighbors():
        k = n.GetIdx()
        if state.elements[k] in (1, 6):
            continue
        if state.elements[k] != 8:
            return None
        if state.bond_electrons(carbon, k) == 4 and oxo is None:
            oxo = k
        elif state.bond_electrons(carbon, k) == 2 and anionic is None and _ionic_oxygen(state, k, carbon):
            anionic = k
        else:
            return None
    return (oxo, anionic) if oxo is not None and anionic is not None else None


def _ionic_oxygen(state, oxygen: int, carbon: int) -> bool:
    """Whether `oxygen` is an O- with no other bond, or bonded only to a salt's metal besides `carbon`."""
    others = [n.GetAtomicNum() for n in state.mol.GetAtomWithIdx(oxygen).GetNeighbors() if n.GetIdx() != carbon]
    if not others:
        return state.formal_charge(oxygen) == -1
    return len(others) == 1 and others[0] in _SALT_METALS


def _organoalkali(state, carbon: int) -> bool:
    """Whether the nucleophilic `carbon` is an organolithium's (or a heavier alkali metal's): bonded
    to the metal, or a carbanion with no multiple bond on it or beside it and no onium beside it
    (not an enolate, cyanide, acetylide or ylide) in a state that holds the metal's cation."""
    mol = state.mol
    atom = mol.GetAtomWithIdx(carbon)
    if any(n.GetAtomicNum() in ALKALI_METALS for n in atom.GetNeighbors()):
        return True
    if state.formal_charge(carbon) != -1 or not state.nonbonding[carbon]:
        return False
    if any(b.GetBondTypeAsDouble() != 1 for b in atom.GetBonds()):
        return False
    for n in atom.GetNeighbors():
        if state.formal_charge(n.GetIdx()) > 0 or any(b.GetBondTypeAsDouble() != 1 for b in n.GetBonds()):
            return False
    return any(e in ALKALI_METALS and state.formal_charge(i) == 1 and mol.GetAtomWithIdx(i).GetDegree() == 0
               for i, e in enumerate(state.elements))


def _diagnostic(st: StepTrace, move, nucleophile: int, centre: int) -> Diagnostic:
    before, label = st.before, st.before.label
    metals = {n.GetAtomicNum() for n in before.mol.GetAtomWithIdx(nucleophile).GetNeighbors()}
    kind = "a Grignard reagent" if MAGNESIUM in metals else "a carbon nucleophile other than an organolithium"
    n, c = label(nucleophile), label(centre)
    ketone = _ketone_beside(st, centre)
    instead = f"add to the ketone or aldehyde carbon {label(ketone)} instead, or " if ketone is not None else ""
    return Diagnostic(
        "AR538", f"{n} adds to {c}, a carboxylate's carbon: its charge spread over both oxygens makes it a very poor "
        f"electrophile, and {kind} does not add to it",
        move.move.loc,
        hint=f"{instead}make the acid an ester, acid chloride or Weinreb amide first; an organolithium adds to a "
             f"lithium carboxylate (the gem-dialkoxide that work-up turns into a ketone); a Grignard carboxylation "
             f"stops at the carboxylate (common practice)",
        atoms=(n, c), step=st.index)


def _ketone_beside(st: StepTrace, centre: int) -> Optional[int]:
    """A nameable aldehyde or ketone carbon of the carboxylate's molecule: the electrophile likely meant."""
    before = st.before
    mol = before.mol
    molecule = next(set(f) for f in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if centre in f)
    for k in sorted(molecule - {centre}):
        if before.elements[k] != 6 or not nameable(mol, k) or _carboxylate(before, k) is not None:
            continue
        atom = mol.GetAtomWithIdx(k)
        oxo = [n.GetIdx() for n in atom.GetNeighbors()
               if n.GetAtomicNum() == 8 and before.bond_electrons(k, n.GetIdx()) == 4]
        others = [n.GetAtomicNum() for n in atom.GetNeighbors() if n.GetIdx() not in oxo]
        if len(oxo) == 1 and all(z in (1, 6) for z in others):
            return k
    return None
