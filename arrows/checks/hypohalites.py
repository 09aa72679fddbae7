"""A carbon nucleophile bonded to the oxygen of a hypohalite, the halogen leaving as halide (AR539).

In an O-Cl, O-Br or O-I bond (HOCl, HOBr, tert-butyl hypochlorite) the oxygen is the more
electronegative end (Pauling: O 3.44, Cl 3.16, Br 2.96, I 2.66; memory): the halogen is the
electrophile. An alkene takes the halogen, the O-X pair going to oxygen, and water or hydroxide
then opens the halonium ion or catches the cation (halohydrin formation, the Pinnick oxidation's
HOCl scavenged by 2-methylbut-2-ene; common practice, Clayden, from memory). Bonded to the oxygen
with the pair sent to the halogen, the polarity is backwards. Fluorine is not judged: it is the
more electronegative end of O-F, and HOF transfers its oxygen (Rozen's HOF.MeCN; memory).

Judged on the state before the step: a new bond from a carbon's own pair (a C=C, a carbanion's lone
pair) to an oxygen bonded to Cl, Br or I, whose O-X pair this step sends to the halogen. Not
judged: a ring closure (an enolate closing onto its own O-Cl, the epoxide of an enone and
hypochlorite), a heteroatom nucleophile.
"""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..diagnostics import Diagnostic
from ..electrons import ResolvedMove
from ..trace import StepTrace
from . import Check
from .valence import attack_sent_elsewhere

# Halogens less electronegative than oxygen: the electrophilic end of their bond to O.
_ELECTROPHILIC_HALOGENS = frozenset({17, 35, 53})


class CarbonOnHypohaliteOxygen(Check):
    name = "carbon nucleophile on a hypohalite's oxygen"
    codes = ("AR539",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.change.formed:
            return
        before = st.before
        for pair in st.change.formed:
            for oxygen in pair:
                if before.elements[oxygen] != 8:
                    continue
                nucleophile = st.change.attacker(oxygen)
                if nucleophile is None or before.elements[nucleophile] != 6:
                    continue
                if _same_molecule(before.mol, nucleophile, oxygen):
                    continue   # a ring closure: an enolate onto its own O-Cl (an enone's epoxidation)
                split = _halogen_sent_the_pair(st, oxygen)
                if split is not None:
                    yield _diagnostic(st, nucleophile, oxygen, *split)


def _same_molecule(mol: Chem.Mol, i: int, j: int) -> bool:
    """Whether atoms i and j are joined by a path of bonds: a new bond between them closes a ring."""
    return any(i in frag and j in frag for frag in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False))


def _halogen_sent_the_pair(st: StepTrace, oxygen: int) -> Optional[tuple[int, ResolvedMove]]:
    """(the halogen, its move) where this step sends the pair of an O-Cl, O-Br or O-I bond of
    `oxygen` to the halogen."""
    for m in st.change.moves:
        if m.source_kind != "bond" or m.electrons != 2 or len(m.sink_atoms) != 1 or oxygen not in m.source_atoms:
            continue
        halogen = m.sink_atoms[0]
        if halogen in m.source_atoms and halogen != oxygen and st.before.elements[halogen] in _ELECTROPHILIC_HALOGENS:
            return halogen, m
    return None


def _diagnostic(st: StepTrace, nucleophile: int, oxygen: int, halogen: int, split: ResolvedMove) -> Diagnostic:
    before, label = st.before, st.before.label
    n, o, x = label(nucleophile), label(oxygen), label(halogen)
    symbol = before.mol.GetAtomWithIdx(halogen).GetSymbol()
    attack, instead = attack_sent_elsewhere(st.change, nucleophile, oxygen, n, x)
    # An alkene's pair leaves a cation (no enolate's O pushing in), which water or hydroxide then catches.
    cation = any(k != nucleophile and st.after.formal_charge(k) == 1 for k in attack.source_atoms)
    then = "; water or hydroxide then adds to the cation (halohydrin formation)" if cation else ""
    return Diagnostic(
        "AR539", f"{n} bonds to {o} and the pair of {o}-{x} goes to {x}: backwards, the electrophilic end of an "
        f"O-{symbol} bond is {x}, the less electronegative atom", attack.move.loc,
        hint=f"{n} takes {x}: {instead}, and the pair of {split.move.source} goes to {o} (`{split.move.source} -> {o}`)"
             + then, atoms=(n, o, x), step=st.index)
