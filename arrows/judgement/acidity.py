"""Approximate acidities by substructure, for judging proton transfers.

Each entry names the acid (the site that carries the proton), its conjugate base, a SMARTS whose
first atom is the atom carrying the proton, an approximate aqueous pKa, and the source. The first
matching entry wins, so specific entries come before general ones. Values are textbook aqueous
pKa values as listed in the project's shared references (memory); the few marked "not in the
shared list" are also from memory. They are for spotting transfers that are wildly uphill, not
for quantitative work.
"""
from __future__ import annotations

from typing import Optional

from rdkit import Chem
from ..model import frozen
from .tables import first_match

TEXTBOOK = "textbook aqueous pKa (memory)"
NOT_LISTED = "textbook aqueous pKa (memory; not in the shared list)"
COMMON_PRACTICE = "common practice: between methanol (15.5) and tert-butanol (18)"
PHOSPHATES = "Kumler & Eiler 1943; CRC Handbook (aqueous, memory)"


@frozen
class Acidity:
    acid: str        # "water", "an alkane C-H"
    base: str        # "hydroxide", "an alkyl carbanion"
    smarts: str      # first atom: the atom that carries the proton
    pka: float
    shown: str       # how the value is written in messages: "15.7", "~50", "19-20"
    source: str

    @property
    def site(self) -> str:
        """The proton as the object of "removing ...": an alkane C-H, a proton of water."""
        return self.acid if self.acid.endswith("-H") else f"a proton of {self.acid}"


# The C2-H between the cationic N and the S of a thiazolium ion (thiamine's, the benzoin and Stetter
# catalysts') about 18, and between the two N of an imidazolium ion about 23 (Washabaugh & Jencks
# 1988; Amyes, Diver, Richard & Rivas 2004; memory): its ylide, the catalyst a Breslow adduct lets
# go, is a weak base for a carbanion, not a vinyl anion. The one C-H beside a cation that the table
# names: protons.py judges its removal (the ylide's or carbene's formation) against it.
THIAZOLIUM_C2_H = Acidity("a thiazolium C2-H", "a thiazolium ylide", "[#6X3;!H0](~[#7X3+])~[#16X2]", 18, "~18",
                          NOT_LISTED)
IMIDAZOLIUM_C2_H = Acidity("an imidazolium C2-H", "an N-heterocyclic carbene", "[#6X3;!H0](~[#7X3+])~[#7X3]", 23,
                           "~23", NOT_LISTED)
AZOLIUM_C2_H = (THIAZOLIUM_C2_H, IMIDAZOLIUM_C2_H)


# The end of an azolium N-H's SMARTS: the atom is the n+, or its five-membered ring holds one (next
# to it, or one atom further round) that is no N-oxide's (an n+ beside its own O-).
_RING_CATION = "$([n+]),$(n1:[n+;!$(*[*-])]:a:a:a:1),$(n1:a:[n+;!$(*[*-])]:a:a:1)"


# A sulfonium S bearing an electronegative heteroatom (O, N or a halogen): its S-C-H is unjudged.
_S_HETERO = "$([SX3+][O,N,F,Cl,Br,I])"


# A neutral azole's ring atoms (its N-H entries below): an uncharged N, and a carbon in no other
# ring with no exocyclic double bond (a pyrrolone's or an imidazolone's C=O makes its N-H an
# amide's, not an azole's).
_N = "[n;+0]"
_C = "[c;R1;!$(c=*)]"


TABLE: tuple[Acidity, ...] = (
    Acidity("hydronium", "water", "[OX3H3+]", -1.7, "-1.7", TEXTBOOK),
    Acidity("hydrogen iodide", "iodide", "[IX1H1]", -10, "~-10", NOT_LISTED),
    Acidity("hydrogen bromide", "bromide", "[BrX1H1]", -9, "~-9", NOT_LISTED),
    Acidity("hydrogen chloride", "chloride", "[ClX1H1]", -7, "~-7", NOT_LISTED),
    # An amide takes its proton on oxygen (pKa ~-0.5), far more readily than a ketone (memory).
    Acidity("an O-protonated amide", "an amide", "[OX2H1+]=[#6][NX3]", -0.5, "~-0.5", NOT_LISTED),
    Acidity("a protonated carbonyl", "a carbonyl oxygen", "[OX2H1+]=[#6]", -7, "~-7", NOT_LISTED),
    Acidity("a protonated alcohol or ether", "an alcohol or ether", "[OX3+;!H0]", -2, "~-2", NOT_LISTED),
    # Sulfonic acid ~-2.8 (TsOH), carbonic acid 6.4 and bicarbonate 10.3 (aqueous, memory): before the
    # carboxylic acid, whose pattern both carbonic acids match.
    Acidity("a sulfonic acid", "a sulfonate", "[OX2H1][SX4](=O)=O", -2.8, "~-3", NOT_LISTED),
    # A phosphate's O-H by the charge already on its P: none (phosphoric acid 2.1, a monoester's
    # first proton 1.5, a diester 1.3), one O- (dihydrogen phosphate 7.2, a monoester's second
    # proton 6.3, ADP's or UDP's terminal phosphate), two (hydrogen phosphate 12.3). Aqueous: methyl
    # and dimethyl phosphate from Kumler & Eiler, J. Am. Chem. Soc. 1943, phosphoric acid from the
    # CRC Handbook (memory). Each other O is esterified, an anhydride's or an O-H.
    Acidity("hydrogen phosphate", "phosphate", "[OX2H1][PX4](=O)([OX1-])[OX1-]", 12.3, "12.3", PHOSPHATES),
    Acidity("a phosphate monoanion's O-H", "a phosphate dianion", "[OX2H1][PX4](=O)([OX1-])[OX2]", 6.5, "~6-7",
            PHOSPHATES),
    Acidity("a phosphoric acid or its mono- or diester", "a phosphate monoanion", "[OX2H1][PX4](=O)([OX2])[OX2]", 1.5,
            "~1-2", PHOSPHATES),
    Acidity("bicarbonate", "carbonate", "[OX2H1][CX3](=O)[OX1-]", 10.3, "10.3", NOT_LISTED),
    Acidity("carbonic acid", "bicarbonate", "[OX2H1][CX3](=O)[OX2H1]", 6.4, "6.4", NOT_LISTED),
    # Haloacetic acids (aqueous, memory): trifluoroacetic ~0.3, trichloroacetic ~0.7, chloroacetic
    # 2.9. TFA protonates an alkene or an arene (ionic hydrogenation, protodesilylation).
    Acidity("trifluoroacetic acid", "trifluoroacetate", "[OX2H1][CX3](=O)C(F)(F)F", 0.3, "~0.3", NOT_LISTED),
    Acidity("trichloroacetic acid", "trichloroacetate", "[OX2H1][CX3](=O)C(Cl)(Cl)Cl", 0.7, "~0.7", NOT_LISTED),
    Acidity("a chloroacetic acid", "a chloroacetate", "[OX2H1][CX3](=O)[CH2]Cl", 2.9, "~2.9", NOT_LISTED),
    Acidity("a carboxylic acid", "a carboxylate", "[OX2H1][CX3]=O", 4.8, "~4.8", TEXTBOOK),
    # An imidazolium N-H, either ring N's proton as the Kekule form puts the charge (the aromatic
    # n+ or the n across C2 from it): imidazolium 7.0, 1-methylimidazolium 7.1, a histidine side
    # chain 6.0 (the free amino acid's and the usual value in proteins), benzimidazolium 5.5
    # (aqueous; Joule & Mills, Heterocyclic Chemistry, and the amino acid tables of Lehninger's
    # Principles of Biochemistry; memory). Before the pyridinium entry, which matches the n+-H;
    # C4 and C5 in one ring only (R1), so a benzimidazolium or a purine protonated at N7 is not
    # read as an imidazolium; an N-oxide's n+ makes no imidazolium (its N-H value is not at hand).
    # An azolium C2-H is its own entry (AZOLIUM_C2_H, above).
    Acidity("a histidine side-chain imidazolium N-H", "a histidine imidazole",
            "[nX3;H1;$(n1:c:[n+;!$(*[O-])]:[c;R1]:[c;R1]:1),$([n+]1:c:n:[c;R1]:[c;R1]:1);"
            "$(n1:c:n:c([CH2][CX4][#7]):c:1),$(n1:c:n:c:c:1[CH2][CX4][#7])]", 6.0, "~6", NOT_LISTED),
    Acidity("a benzimidazolium N-H", "a benzimidazole",
            "[nX3;H1;$(n1:c:[n+;!$(*[O-])]:c2:c:c:c:c:c:2:1),$([n+]1:c:n:c2:c:c:c:c:c:2:1)]", 5.5, "5.5", NOT_LISTED),
    Acidity("an imidazolium N-H", "an imidazole",
            "[nX3;H1;$(n1:c:[n+;!$(*[O-])]:[c;R1]:[c;R1]:1),$([n+]1:c:n:[c;R1]:[c;R1]:1)]", 7.0, "7.0", NOT_LISTED),
    # A tetrazolium's N-H, about -3: tetrazole's ring N is a very weak base (1H-tetrazole's conjugate
    # acid; Catalan, Abboud & Elguero's review of azole basicity, Adv. Heterocycl. Chem. 1987; memory).
    # Any N-H of a tetrazole ring that holds an n+ (not an N-oxide's), before the neutral tetrazole's
    # entry (4.9) and the pyrazolium entry, which both match it.
    Acidity("a tetrazolium N-H", "a tetrazole", "[nX3;H1;$(n1:n:n:n:c:1),$(n1:n:n:c:n:1);" + _RING_CATION + "]", -3,
            "~-3", NOT_LISTED),
    # An azolium with two ring N side by side: pyrazolium 2.5, 1,2,4-triazolium 2.2, 1,2,3-triazolium
    # 1.2, indazolium 1.2 (aqueous; Joule & Mills, Heterocyclic Chemistry; memory), any N-H of the
    # ring (the one the Kekule form puts on n+, or another), the ring holding an N-N bond and an n+
    # (not an N-oxide's): far more acidic than an imidazolium (~7), whose N sit apart, or pyridinium,
    # as which they were read.
    Acidity("a pyrazolium or triazolium N-H", "a pyrazole or triazole",
            "[nX3;H1;$(n1:n:a:a:a:1),$(n1:a:n:n:a:1);" + _RING_CATION + "]", 2.5, "~1-2.5", NOT_LISTED),
    # Pyridinium 5.2, a nitroalkane's C-H ~10, a thiol ~10.5, H2S ~7 (aqueous, memory).
    Acidity("a pyridinium ion", "a pyridine", "[nX3+;H1]", 5.2, "5.2", NOT_LISTED),
    # 1H-Tetrazole 4.9 (aqueous, memory), the activator of phosphoramidite couplings: its N-H, in
    # either tautomer (1H or 2H), as acidic as a carboxylic acid.
    Acidity("a tetrazole N-H", "a tetrazolide", "[nX3;H1;$(n1nnnc1),$(n1nncn1)]", 4.9, "4.9", NOT_LISTED),
    # HOBt's O-H, 4.6 (aqueous; Carpino, J. Am. Chem. Soc. 1993, which gives HOAt 3.3; memory): a
    # carboxylic acid's strength, so Et3N or the carboxylate of a coupling takes it. No general entry
    # matches an O-H on a ring N: each additive below has its own.
    Acidity("HOBt's O-H", "a benzotriazol-1-olate (OBt-)", f"[OX2H1]{_N}1:{_N}:{_N}:c2:c:c:c:c:c:2:1", 4.6, "4.6",
            "Carpino 1993, aqueous (memory)"),
    # HOAt's O-H, 3.3 (3.28 aqueous, Carpino 1993 beside HOBt's 4.60; memory): the ring N beside the
    # fusion carbon that holds the N-OH (the 7-aza of benzotriazole's numbering, HATU's additive).
    Acidity("HOAt's O-H", "a 7-azabenzotriazol-1-olate (OAt-)", f"[OX2H1]{_N}1:{_N}:{_N}:c2:c:c:c:n:c:2:1", 3.3,
            "3.3", "Carpino 1993, aqueous (memory)"),
    # N-Hydroxysuccinimide's O-H, 6.0 (aqueous, memory): an NHS ester's leaving group and the
    # additive of carbodiimide couplings. Its ring carbons saturated, so sulfo-NHS (a sulfonate on
    # C3) reads the same (an estimate); N-hydroxyphthalimide, whose value is not at hand, does not.
    Acidity("NHS's O-H", "a 2,5-dioxopyrrolidin-1-olate (NHS-)", "[OX2H1][NX3]1[CX3](=O)[CX4][CX4][CX3]1=O", 6.0,
            "6.0", "aqueous (memory)"),
    # A neutral azole's ring N-H (either tautomer), aqueous: benzotriazole 8.2, 1,2,3-triazole 9.3,
    # 1,2,4-triazole 10.3, pyrazole 14.2, imidazole 14.5, indole 16.2, pyrrole 17.5 (Joule & Mills,
    # Heterocyclic Chemistry; indole's and pyrrole's from Yagil's aqueous measurements; memory). In
    # DMSO indole is 21.0 and pyrrole 23.0 (Bordwell's table, memory): the table's scale is water's.
    # Benzo-fused, benzimidazole 12.8 and indazole 13.9 (aqueous; Joule & Mills; memory), either of
    # indazole's tautomers. Each N-H's ring is neutral (an azolium is read above) with its carbons
    # in no other ring, save the benzo ring of benzotriazole, benzimidazole, indazole and indole: a
    # purine (~8.9), an azaindole or a carbazole, whose value is not at hand for each of its forms,
    # stays unjudged, as does a ring with a C=O (benzimidazol-2-one: a cyclic urea's N-H).
    Acidity("a benzotriazole N-H", "a benzotriazolide",
            f"[nX3;H1;+0;$(n1:{_N}:{_N}:c2:c:c:c:c:c:2:1),$(n1:{_N}:c2:c:c:c:c:c:2:{_N}:1)]", 8.2, "8.2", NOT_LISTED),
    Acidity("a 1,2,3-triazole N-H", "a 1,2,3-triazolide",
            f"[nX3;H1;+0;$(n1:{_N}:{_N}:{_C}:{_C}:1),$(n1:{_N}:{_C}:{_C}:{_N}:1)]", 9.3, "9.3", NOT_LISTED),
    Acidity("a 1,2,4-triazole N-H", "a 1,2,4-triazolide",
            f"[nX3;H1;+0;$(n1:{_N}:{_C}:{_N}:{_C}:1),$(n1:{_C}:{_N}:{_N}:{_C}:1)]", 10.3, "10.3", NOT_LISTED),
    Acidity("a benzimidazole N-H", "a benzimidazolide", f"[nX3;H1;+0;$(n1:{_C}:{_N}:c2:c:c:c:c:c:2:1)]", 12.8, "12.8",
            NOT_LISTED),
    Acidity("an indazole N-H", "an indazolide",
            f"[nX3;H1;+0;$(n1:{_N}:{_C}:c2:c:c:c:c:c:2:1),$(n1:{_N}:c2:c:c:c:c:c:2:{_C}:1)]", 13.9, "13.9", NOT_LISTED),
    Acidity("a pyrazole N-H", "a pyrazolide", f"[nX3;H1;+0;$(n1:{_N}:{_C}:{_C}:{_C}:1)]", 14.2, "14.2", NOT_LISTED),
    Acidity("an imidazole N-H", "an imidazolide", f"[nX3;H1;+0;$(n1:{_C}:{_N}:{_C}:{_C}:1)]", 14.5, "14.5",
            NOT_LISTED),
    Acidity("an indole N-H", "an indolide", f"[nX3;H1;+0;$(n1:{_C}:{_C}:c2:c:c:c:c:c:2:1)]", 16.2, "16.2", NOT_LISTED),
    Acidity("a pyrrole N-H", "a pyrrolide", f"[nX3;H1;+0;$(n1:{_C}:{_C}:{_C}:{_C}:1)]", 17.5, "17.5", NOT_LISTED),
    Acidity("a nitroalkane C-H", "a nitronate", "[CX4;!H0][NX3+](=O)[O-]", 10, "~10", NOT_LISTED),
    Acidity("a thiol", "a thiolate", "[SX2H1][#6]", 10.5, "~10.5", NOT_LISTED),
    Acidity("hydrogen sulfide", "hydrosulfide", "[SX2H2]", 7, "~7", NOT_LISTED),
    # A C-H between a phosphonate's P=O and a carbonyl (a Horner-Wadsworth-Emmons reagent): triethyl
    # phosphonoacetate 18.6 in DMSO (Bordwell, memory), about 15 in water, estimated as diethyl
    # malonate's 16.4 in DMSO falls to 13 in water. DBU with LiCl takes it (the Masamune-Roush
    # conditions, Tetrahedron Lett. 1984; memory); read as an ester's alpha C-H (~25) it was a false alarm.
    Acidity("a C-H between a phosphonate and a carbonyl", "a phosphonate-stabilised enolate",
            "[CX4;!H0]([PX4]=O)[CX3]=O", 15, "~15",
            "estimated aqueous value: 18.6 in DMSO (Bordwell, memory), less malonate's 3-unit drop to water"),
    # A malonate ester ~13, a beta-keto ester ~11 (diethyl malonate, ethyl acetoacetate; aqueous,
    # memory): less acidic than a 1,3-diketone, each ester's oxygen holding back its carbonyl.
    Acidity("a malonate ester C-H", "a malonate enolate", "[CX4;!H0]([CX3](=O)[OX2][#6])[CX3](=O)[OX2][#6]", 13,
            "~13", NOT_LISTED),
    Acidity("a beta-keto ester C-H", "a beta-keto ester enolate", "[CX4;!H0]([CX3](=O)[#6])[CX3](=O)[OX2][#6]", 11,
            "~11", NOT_LISTED),
    Acidity("a 1,3-dicarbonyl C-H", "a 1,3-dicarbonyl enolate", "[CX4;!H0]([CX3]=O)[CX3]=O", 9, "~9", TEXTBOOK),
    Acidity("a C-H beside a nitrile and a carbonyl or nitrile", "a stabilised carbanion",
            "[CX4;!H0](C#N)[$([CX3]=O),$(C#N)]", 11, "~11", NOT_LISTED),   # malononitrile ~11
    Acidity("a phenol", "a phenoxide", "[OX2H1]c", 10, "~10", TEXTBOOK),
    # Not an alkylammonium ion: an N-acylammonium (an amide protonated on nitrogen, an estimate
    # below the O-protonated amide's -0.5), an anilinium ion 4.6, a hydroxylammonium ion 6.0
    # (aqueous, memory). Chloride takes the first's proton as an amine is acylated. (A carbamate
    # protonated on nitrogen, the zwitterion that loses CO2, has no value here: read as an ammonium.)
    Acidity("an N-acylammonium ion", "an amide", "[NX4+;!H0][CX3;!$(C[OX1-])]=O", -7, "~-7", NOT_LISTED),
    Acidity("an anilinium ion", "an aniline", "[NX4+;!H0]c", 4.6, "4.6", NOT_LISTED),
    Acidity("a hydroxylammonium ion", "a hydroxylamine", "[NX4+;!H0][OX2]", 6.0, "6.0", NOT_LISTED),
    Acidity("an ammonium ion", "an amine", "[NX4+;!H0]", 10, "~10", TEXTBOOK),
    # Acetamidinium 12.4; a protonated imine about 7 (aqueous, memory): HCl's chloride takes neither's N-H.
    Acidity("an amidinium N-H", "an amidine", "[NX3+;!H0]=[CX3][NX3]", 12, "~12", NOT_LISTED),
    Acidity("an iminium N-H", "an imine", "[NX3+;!H0]=[#6]", 7, "~7", NOT_LISTED),
    # A nitrilium ion (R-C#N+-H) about -10 (acetonitrile's conjugate acid, aqueous, memory): a nitrile
    # N is protonated only by a superacid or sulfuric acid (the Ritter reaction's nitrile is attacked
    # at N by a carbocation, not protonated).
    Acidity("a nitrilium N-H", "a nitrile", "[NX2+;!H0]#[#6]", -10, "~-10", NOT_LISTED),
    Acidity("an enol", "an enolate oxygen", "[OX2H1][CX3]=[CX3]", 10.5, "~10-11", NOT_LISTED),
    Acidity("water", "hydroxide", "[OX2H2]", 15.7, "15.7", TEXTBOOK),
    Acidity("methanol", "methoxide", "[OX2H1][CH3]", 15.5, "~15.5", TEXTBOOK),
    Acidity("a tertiary alcohol", "a tertiary alkoxide", "[OX2H1][CX4H0]([#6])([#6])[#6]", 18, "~18",
            TEXTBOOK),
    Acidity("an alcohol", "an alkoxide", "[OX2H1][CX4]", 16, "~16", COMMON_PRACTICE),
    # Hydroxide as an acid, ~36 (memory): an alkoxide that leaves as oxide (O2-) lacks a proton.
    Acidity("hydroxide", "oxide", "[OX1H1-]", 36, "~36", NOT_LISTED),
    Acidity("an imide N-H", "an imidate", "[NX3;H1]([CX3]=O)[CX3]=O", 9, "~9", NOT_LISTED),   # succinimide 9.6
    Acidity("an amide N-H", "an amidate", "[NX3;!H0][CX3]=O", 17, "~17", NOT_LISTED),
    # A C-H alpha to a ketone's or aldehyde's C=O and allylic (a beta,gamma-unsaturated ketone): its
    # anion is a dienolate. 5-Androstene-3,17-dione's C4-H, the proton ketosteroid isomerase takes,
    # has pKa 12.7 in water (Pollack and co-workers; memory). An ester's or a carboxylate's C=O holds
    # the pair less well: left to their own entries below.
    Acidity("an allylic ketone or aldehyde alpha C-H", "a dienolate",
            "[CX4;!H0]([$([CX3](=O)([#6])[#6]),$([CX3H1]=O)])[CX3]=[CX3]", 13, "~13",
            "ketosteroid isomerase's substrate, 12.7 (Pollack, memory)"),
    Acidity("an aldehyde alpha C-H", "an aldehyde enolate", "[CX4;!H0][CX3H1]=O", 17, "~17", TEXTBOOK),
    Acidity("a ketone alpha C-H", "a ketone enolate", "[CX4;!H0][CX3](=O)[#6]", 19.5, "19-20", TEXTBOOK),
    Acidity("an ester alpha C-H", "an ester enolate", "[CX4;!H0][CX3](=O)[OX2][#6]", 25, "~25", TEXTBOOK),
    # A thioester's alpha C-H, ~21 (S-ethyl thioacetate; Amyes & Richard; memory), more acidic than an
    # oxygen ester's: acetyl-CoA's, enolised by citrate synthase and thiolase. The ester entry above
    # does not match sulfur.
    Acidity("a thioester alpha C-H", "a thioester enolate", "[CX4;!H0][CX3](=O)[SX2][#6]", 21, "~21",
            "Amyes & Richard (memory)"),
    Acidity("an amide alpha C-H", "an amide enolate", "[CX4;!H0][CX3](=O)[NX3]", 30, "~30", NOT_LISTED),
    # A C-H beside the carbon of a neutral C=N (an imine, oxime or hydrazone; its iminium ion's is
    # left out): its aza-enolate takes LDA where a ketone's enolate takes an alkoxide (Stork's
    # metalloenamines, Corey-Enders hydrazone anions; common practice, memory), so no more acidic
    # than a ketone's alpha C-H. The ketone's 19-20 is a lower bound for it: a base that is far too
    # weak for a ketone (water, chloride taking a hydrazone's C-H before the Fischer [3,3]) is
    # far too weak here.
    # (An imidate's or amidine's C=N carbon, bearing O or N, is left out: no value at hand.)
    Acidity("an imine alpha C-H", "an aza-enolate", "[CX4;!H0][CX3;!$([CX3]([OX2,NX3])=[NX2])]=[NX2]", 20, "~20",
            "common practice: less acidic than a ketone's alpha C-H (19-20, textbook; memory)"),
    # A carboxylate ion's alpha C-H, ~33 (acetate ion, 33.5; Richard, Williams, O'Donoghue & Amyes;
    # memory): its enolate is a dianion. Mandelate's is ~29 (Gerlt & Gassman; memory): a benzylic one
    # is read as ~33 too, not as a bare benzylic C-H (41-43), so this entry comes before that one. Not
    # an amino acid's C-alpha-H on the nitrogen side of an imine (a pyridoxal aldimine's, ~17, whose
    # anion the C=N holds: left unjudged with the alkane entry's exceptions below).
    Acidity("a carboxylate's alpha C-H", "a carboxylate enolate (a dianion)",
            "[CX4;!H0;!$(C[NX2,NX3+]=[CX3])][CX3](=O)[O-]", 33, "~33", "acetate ion, 33.5 (Richard, memory)"),
    Acidity("a nitrile alpha C-H", "a nitrile anion", "[CX4;!H0]C#N", 25, "~25", NOT_LISTED),
    Acidity("a terminal alkyne C-H", "an acetylide", "[CX2H1]#C", 25, "~25", TEXTBOOK),
    # Trimethylsulfonium's C-H ~18 (memory). An S+ that bears an O, N or halogen (an alkoxy- or
    # acyloxysulfonium, a chloro- or succinimidosulfonium: the Swern, Moffatt, Parikh-Doering and
    # Corey-Kim intermediates) pulls harder on its S-CH pair, and a mild amine makes that ylide (common
    # practice), but no measured pKa is at hand: its S-C-H is left unjudged, here and in the alkane
    # entry below, rather than read as trimethylsulfonium's.
    Acidity("a C-H beside a sulfonium", "a sulfonium ylide", f"[CX4;!H0][SX3+;!{_S_HETERO}]", 18, "~18",
            NOT_LISTED),
    # The vinylogous (gamma) C-H of an enone ~20, an acyl chloride's alpha C-H ~16 (estimated), DMSO's
    # C-H 35, 1,3-dithiane 31, Ph3CH 31.5, Ph2CH2 32, a benzylic or allylic C-H 41-43, an aniline N-H
    # 31 (DMSO scale where no aqueous value exists; memory): not alkanes.
    Acidity("an acyl chloride alpha C-H", "an acyl chloride enolate", "[CX4;!H0][CX3](=O)[Cl,Br]", 16, "~16",
            NOT_LISTED),
    Acidity("an enone gamma C-H", "a dienolate", "[CX4;!H0][CX3]=[CX3][CX3]=O", 20, "~20", NOT_LISTED),
    # DMSO's C-H 35 (Bordwell, memory), written S=O or charge-separated, S+-O-.
    Acidity("a C-H beside a sulfoxide", "a sulfinyl carbanion", "[CX4;!H0][$([SX3]=O),$([SX3+][OX1-])]", 35, "~35",
            NOT_LISTED),
    # A sulfone's alpha C-H: 29 (methyl phenyl sulfone) to 31 (dimethyl sulfone) on Bordwell's DMSO
    # scale (memory); about 24 in water, estimated as acetone's falls from 26.5 in DMSO to 19.3 in
    # water. Hydroxide serves (a Ramberg-Backlund), an amine does not (the Julia's anion takes BuLi).
    Acidity("a C-H beside a sulfone", "a sulfonyl carbanion", "[CX4;!H0][SX4](=O)=O", 24, "~24",
            "estimated aqueous value: 29-31 in DMSO (Bordwell, memory), less acetone's 7-unit drop to water"),
    Acidity("a dithiane C-H", "a dithianyl anion", "[CX4;!H0]([SX2])[SX2]", 31, "~31", NOT_LISTED),
    Acidity("a triarylmethane C-H", "a trityl anion", "[CX4H1](c)(c)c", 31.5, "~31.5", NOT_LISTED),
    Acidity("a diarylmethane C-H", "a diarylmethyl anion", "[CX4;!H0](c)c", 32, "~32", NOT_LISTED),
    Acidity("a benzylic or allylic C-H", "a benzylic or allyl anion", "[CX4;!H0][$(c),$([CX3]=[CX3])]", 42,
            "41-43", NOT_LISTED),
    Acidity("an aniline N-H", "an anilide", "[NX3;!H0;!$(N*=*);!$(N=*)]c", 31, "~31", NOT_LISTED),
    # Chloroform ~15.5, bromoform ~13.7 (aqueous, memory): hydroxide makes the trihalomethanide.
    Acidity("a haloform C-H", "a trihalomethanide", "[CX4H1]([Cl,Br,I])([Cl,Br,I])[Cl,Br,I]", 15, "~14-16",
            NOT_LISTED),
    # Not an amine: an N-H beside a double bond (amide, hydrazone, enamine, amidine, sulfonamide),
    # whose anion spreads onto the far atom and is far less basic than NH2-; unjudged unless listed.
    Acidity("an amine N-H", "an amide ion", "[NX3;!H0;!$(N*=*);!$(N=*)]", 38, "~38", TEXTBOOK),
    # An aldehyde's own C-H: no base of a polar mechanism makes the acyl anion (it takes an umpolung
    # reagent: a dithiane, cyanide, a thiazolium; common practice); no tabulated value, so it is
    # read as an alkane's, as the README says of a C-H the table does not name.
    Acidity("an aldehyde C-H", "an acyl anion", "[CX3H1](=O)[#6,#1]", 50, "~50",
            "common practice: not acidic to polar bases; no tabulated value"),
    THIAZOLIUM_C2_H, IMIDAZOLIUM_C2_H,   # thiazolium ~18, imidazolium ~23: defined above the table
    Acidity("an alkene or arene C-H", "a vinyl or aryl anion", "[#6X3;!H0;$([#6]=[#6]),$([c])]", 44, "~44",
            TEXTBOOK),
    # Not an alkane: a C-H beside a C=N (an imine, an oxime or its ester: the Neber's methyl), or on
    # the nitrogen side of one (an aldimine's N-CH, whose anion is a 2-azaallyl anion: pyridoxal's
    # C-alpha-H has pKa about 17, Toth & Richard 2007, memory), a nitro group, a sulfonyl group or
    # a heteroatom-bearing sulfonium, whose anion the neighbour holds; unjudged unless listed.
    Acidity("an alkane C-H", "an alkyl carbanion",
            "[CX4;!H0;!$(C[CX3]=[NX2,NX3+]);!$(C[NX2,NX3+]=[CX3]);!$(C[NX3+](=O)[O-]);!$(C[SX4](=O)=O);"
            f"!$(C[{_S_HETERO}])]",
            50, "~50", TEXTBOOK),
)


# The ring N-H entries of an azolium ion (imidazolium, pyrazolium, triazolium, tetrazolium): the
# proton on the N a Kekule form leaves neutral sits beside the charged N, and protons.py judges it
# all the same, as it does an azolium's C2-H.
AZOLIUM_N_H = tuple(e for e in TABLE if e.acid.endswith(("imidazolium N-H", "triazolium N-H", "tetrazolium N-H")))


# A nitrogen whose lone pair is part of an aromatic sextet (pyrrole's, indole's, the N-H nitrogen of
# imidazole or pyrazole) as a base, judged on the state before the step: its N-protonated cation is
# no longer aromatic, not an ammonium ion. Pyrrole's conjugate acid has pKa -3.8, and that is the
# cation protonated at C2 (Joule & Mills, Heterocyclic Chemistry; memory): the N-protonated one is a
# stronger acid still, so -4 is an upper bound. Computed gas-phase proton affinities put pyrrole's N
# 80 kJ/mol below its C2 and imidazole's N1 217 kJ/mol below its N3 ("Protonation sites in gaseous
# pyrrole and imidazole: a neutralization-reionization and ab initio study", MP2/6-311G(2d,p)).
PYRROLE_TYPE_N = Acidity("an N-protonated pyrrole-type nitrogen", "a pyrrole-type nitrogen", "[nX3+0]", -4,
                         "below -4", "upper bound: pyrrole's conjugate acid, protonated at C2, -3.8 (memory)")


def pyrrole_type_nitrogen(mol: Chem.Mol, atom: int) -> bool:
    """Whether `atom` of `mol` (perceived) is a neutral aromatic nitrogen with three connections
    (hydrogens counted): its lone pair is part of the aromatic sextet, as in pyrrole, indole or the
    N-H nitrogen of an azole, not a pyridine-type nitrogen (two connections) holding its pair in the
    ring's plane."""
    a = mol.GetAtomWithIdx(atom)
    return a.GetAtomicNum() == 7 and a.GetIsAromatic() and a.GetFormalCharge() == 0 and a.GetTotalDegree() == 3


# H2 as an acid (hydride's conjugate acid), judged by element: the perceived view leaves the
# molecule out, and no SMARTS of the table is about a hydrogen atom.
# The pKa of a conjugate acid from which an oxygen anion is hydroxide or an alkoxide (water 15.7, an
# alcohol ~16), not a carboxylate or phenoxide. These leave a carbon only when pushed (an E1cB, a
# tetrahedral intermediate's alkoxide re-forming C=O), else protonated first, as water or an
# alcohol (common practice: the acid-catalysed E1 and SN1 of alcohols): leaving.py's AR515, AR517
# and AR522, protons.py's AR526.
ALKOXIDE_ACID_PKA = 14.0
HYDROGEN = Acidity("H2", "a hydride ion", "[#1][#1]", 35, "~35", NOT_LISTED)


def perceived(mol: Chem.Mol) -> Chem.Mol:
    """A copy with ring information and aromaticity set, for SMARTS matching (indices unchanged)."""
    work = Chem.Mol(mol)
    try:
        Chem.SanitizeMol(work)
    except Exception:  # an odd intermediate: match on what the partial sanitization gives
        work.UpdatePropertyCache(strict=False)
        Chem.FastFindRings(work)
    return work


def acidity_of(mol: Chem.Mol, atom: int) -> Optional[Acidity]:
    """The first table entry whose SMARTS matches with its first atom at `atom` (mol perceived)."""
    return first_match(TABLE, mol, atom)
