"""Approximate X-H bond dissociation enthalpies by substructure, for judging hydrogen-atom
transfers between radicals.

Each entry names the bond, a SMARTS whose first atom is the atom holding the hydrogen, the
enthalpy in kcal/mol (298 K, gas phase) and its source. The first matching entry wins, so specific
entries come before general ones. Values are from S. J. Blanksby and G. B. Ellison, "Bond
dissociation energies of organic molecules", Acc. Chem. Res. 36, 255 (2003), and for the tin
and silicon hydrides from Y.-R. Luo, Comprehensive Handbook of Chemical Bond Energies (2007); all
from memory. They are for spotting a transfer wildly uphill, not for quantitative work.
"""
from __future__ import annotations

from typing import Optional

from rdkit import Chem

from ..model import frozen
from .tables import first_match

BLANKSBY_ELLISON = "Blanksby & Ellison, Acc. Chem. Res. 2003 (memory)"
LUO = "Luo, Comprehensive Handbook of Chemical Bond Energies (memory)"


@frozen
class BondEnergy:
    bond: str        # "a vinylic C-H", "H-Br"
    smarts: str      # first atom: the atom that holds the hydrogen
    kcal: float
    shown: str       # how the value is written in messages: "~111", "87.5"
    source: str


TABLE: tuple[BondEnergy, ...] = (
    BondEnergy("H-F", "[FX1H1]", 136, "136", BLANKSBY_ELLISON),
    BondEnergy("H-Cl", "[ClX1H1]", 103, "103", BLANKSBY_ELLISON),
    BondEnergy("H-Br", "[BrX1H1]", 87.5, "87.5", BLANKSBY_ELLISON),
    BondEnergy("H-I", "[IX1H1]", 71, "71", BLANKSBY_ELLISON),
    # Water 119, an alcohol's O-H 105 (methanol 104.6, tert-butanol 106), a carboxylic acid's ~112,
    # a phenol's ~87-90, a hydroperoxide's ~88 (HOO-H 87.8).
    BondEnergy("water's O-H", "[OX2H2]", 119, "119", BLANKSBY_ELLISON),
    BondEnergy("a hydroperoxide O-H", "[OX2H1][OX2]", 88, "~88", BLANKSBY_ELLISON),
    BondEnergy("a carboxylic acid O-H", "[OX2H1][CX3]=O", 112, "~112", BLANKSBY_ELLISON),
    BondEnergy("a phenol O-H", "[OX2H1]c", 88, "~87-90", BLANKSBY_ELLISON),
    BondEnergy("an alcohol O-H", "[OX2H1][CX4]", 105, "~105", BLANKSBY_ELLISON),
    BondEnergy("a thiol S-H", "[SX2H1][#6]", 87, "~87", BLANKSBY_ELLISON),
    BondEnergy("H-SH", "[SX2H2]", 91, "91", BLANKSBY_ELLISON),
    BondEnergy("ammonia's N-H", "[NX3H3]", 108, "108", BLANKSBY_ELLISON),
    BondEnergy("an amine N-H", "[NX3;!H0;!$(N[c,$(C=*)])]", 100, "~94-100", BLANKSBY_ELLISON),
    # Tributyltin hydride ~74 (the reason it hands its H to any carbon radical), triethylsilane ~90,
    # tris(trimethylsilyl)silane ~79.
    BondEnergy("a tin hydride Sn-H", "[Sn;!H0]", 74, "~74", LUO),
    BondEnergy("a tris(silyl)silane Si-H", "[Si;!H0]([Si])([Si])[Si]", 79, "~79", LUO),
    BondEnergy("a silane Si-H", "[Si;!H0]", 90, "~90", LUO),
    # Carbon, from the strongest: an alkyne's C-H 133, an arene's 113, a vinylic one 111; an
    # aldehyde's C(O)-H 89; an allylic or benzylic C-H 89-90 (propene 88.8, toluene 89.7; a
    # tertiary benzylic one, cumene's, ~85); a C-H beside an ether or alcohol O 92-96 (THF, methanol
    # 96), beside an amine N ~91, beside a ketone's C=O 96; an alkane's tertiary 96.5, secondary
    # 98.6, primary 101; methane 105.
    BondEnergy("an alkyne C-H", "[CX2;!H0]#*", 133, "~133", BLANKSBY_ELLISON),
    BondEnergy("an arene C-H", "[c;!H0]", 113, "~113", BLANKSBY_ELLISON),
    BondEnergy("an aldehyde C-H", "[CX3;!H0]=O", 89, "~89", BLANKSBY_ELLISON),
    BondEnergy("a vinylic C-H", "[CX3;!H0]=[#6]", 111, "~111", BLANKSBY_ELLISON),
    BondEnergy("an allylic or benzylic C-H", "[CX4;!H0;$(C[CX3]=[CX3]),$(Cc)]", 89, "~85-90", BLANKSBY_ELLISON),
    BondEnergy("a C-H beside an ether or alcohol O", "[CX4;!H0][OX2]", 94, "~92-96", BLANKSBY_ELLISON),
    BondEnergy("a C-H beside an amine N", "[CX4;!H0][NX3]", 91, "~91", BLANKSBY_ELLISON),
    BondEnergy("a C-H beside a C=O", "[CX4;!H0][CX3]=O", 96, "~96", BLANKSBY_ELLISON),
    BondEnergy("methane's C-H", "[CX4H4]", 105, "105", BLANKSBY_ELLISON),
    BondEnergy("a tertiary alkyl C-H", "[CX4H1]([#6])([#6])[#6]", 96.5, "96.5", BLANKSBY_ELLISON),
    BondEnergy("a secondary alkyl C-H", "[CX4H2]([#6])[#6]", 98.6, "98.6", BLANKSBY_ELLISON),
    BondEnergy("a primary alkyl C-H", "[CX4H3][#6]", 101, "101", BLANKSBY_ELLISON),
)


def x_h_energy(mol: Chem.Mol, atom: int) -> Optional[BondEnergy]:
    """The table entry for the bond from `atom` of `mol` (perceived) to one of its hydrogens."""
    return first_match(TABLE, mol, atom)
