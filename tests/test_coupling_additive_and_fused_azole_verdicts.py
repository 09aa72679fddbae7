"""Acids the table once left unjudged, each in a short mechanism that uses it: HOAt and NHS (the
O-H of a coupling additive), a benzimidazole's and an indazole's N-H. Each correct mechanism checks
clean; its twin hands the proton to a base far too weak for it and must warn AR508 (the default
gap, 12 pKa units). Aqueous pKa values, all from memory: HOAt 3.3 (3.28, Carpino, J. Am. Chem. Soc.
1993), NHS 6.0, benzimidazole 12.8 and indazole 13.9 (Joule & Mills, Heterocyclic Chemistry),
hydantoin's N3-H 9.1, and the shared list's RCO2H 4.8, R3NH+ ~10, H3O+ -1.7, NH3 ~38. The tests
named `..._guard` passed before these entries too (hydantoin's N3-H is an imide's, ~9, and an
oxazolidinone's N-H an amide's, ~17: both were judged already)."""
import pytest
from rdkit import Chem

from arrows.checks.protons import proton_transfers
from arrows.judgement.acidity import acidity_of, perceived
from test_pka import HOBT_COUPLING
from textbook_mechanisms import CARBODIIMIDE_COUPLING
from verdicts import codes, findings, only


@pytest.mark.parametrize("smiles, atom, pka", [
    ("On1nnc2cccnc21", 0, 3.3),                        # HOAt
    ("ON1C(=O)CCC1=O", 0, 6.0),                        # NHS
    ("ON1C(=O)CC(S(=O)(=O)[O-])C1=O", 0, 6.0),         # sulfo-NHS, read as NHS (an estimate)
    ("c1ccc2[nH]cnc2c1", 4, 12.8),                     # benzimidazole
    ("Cc1[nH]c2ccccc2n1", 2, 12.8),                    # 2-methylbenzimidazole, read the same
    ("c1ccc2[nH]ncc2c1", 4, 13.9),                     # 1H-indazole
    ("c1ccc2n[nH]cc2c1", 5, 13.9),                     # 2H-indazole, the same anion
])
def test_each_acid_has_its_entry(smiles, atom, pka):
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is not None and entry.pka == pytest.approx(pka), entry


@pytest.mark.parametrize("smiles, atom, acid", [
    ("On1nnc2ccccc21", 0, "HOBt's O-H"),               # HOBt keeps its 4.6
    ("On1nnc2ncccc21", 0, None),                       # the 4-aza isomer: HOAt's value is not its own
    ("ON1C(=O)c2ccccc2C1=O", 0, None),                 # N-hydroxyphthalimide: value not at hand
    ("c1ccc2[nH+]c[nH]c2c1", 4, "a benzimidazolium N-H"),   # the cation keeps its entry (5.5)
    ("c1ccc2[nH]nnc2c1", 4, "a benzotriazole N-H"),    # three N: benzotriazole's 8.2, not indazole's
    ("c1ncc2[nH]cnc2n1", 4, None),                     # purine (~8.9): its six-ring holds N
    ("O=c1[nH]c2ccccc2[nH]1", 2, None),                # benzimidazol-2-one: a cyclic urea's N-H
    ("O=c1[nH][nH]c2ccccc12", 2, None),                # indazol-3-one
    ("O=C1NC(=O)CN1", 2, "an imide N-H"),              # hydantoin's N3-H (9.1): the imide entry's ~9
    ("O=C1NCCO1", 2, "an amide N-H"),                  # oxazolidin-2-one: an amide's ~17
])
def test_neighbouring_rings_keep_their_reading_guard(smiles, atom, acid):
    """The new entries take no ring whose value they do not hold, nor an entry's ring already read."""
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert (entry.acid if entry else None) == acid


def _transfers(text: str):
    """(acid read, conjugate acid read, uphill) of each proton transfer, step by step."""
    trace, _ = findings(text)
    return [(t.acid.acid if t.acid else None, t.conjugate_acid.acid if t.conjugate_acid else None,
             round(t.uphill, 1) if t.uphill is not None else None)
            for st in trace.steps for t in proton_transfers(st)]


# --- NHS ester formation with a carbodiimide ----------------------------------------------------
# The textbook carbodiimide coupling's first two steps (the carbodiimide takes the acid's proton,
# the carboxylate adds to its central carbon: the O-acylisourea), then the isourea's N takes NHS's
# O-H, the NHS anion adds to the activated carbonyl and the tetrahedral intermediate lets the urea
# go (Anderson, Zimmerman & Callahan 1964; common practice with DCC or EDC).
_ACTIVATION = CARBODIIMIDE_COUPLING[:CARBODIIMIDE_COUPLING.index('step "the amine adds')]
NHS_ESTER_WITH_A_CARBODIIMIDE = _ACTIVATION.replace('species amine = "[CH3:20][NH2:21]"',
                                         'species nhs = "O=C1CCC(=O)[N:21]1[OH:20]"') + """\
step "{base_name} takes NHS's O-H"
    :{base} -> H(O20)
    O20-H -> O20
end
step "the NHS anion adds to the activated carbonyl"
    :O20 -> C2
    C2=O3 -> O3
end
step "the urea leaves"
    :O3 -> C2=O3
    C2-O4 -> O4
end
"""
# The isourea's N (its cation an amidinium, ~12) takes NHS's O-H (6.0): 6 units downhill.
NHS_ESTER = NHS_ESTER_WITH_A_CARBODIIMIDE.format(base_name="the isourea's N", base="N13")
# EDC hydrochloride's chloride (HCl ~-7) drawn as the base: 13 units uphill.
NHS_ESTER_CHLORIDE = (NHS_ESTER_WITH_A_CARBODIIMIDE.format(base_name="chloride", base="Cl30")
                      .replace('species nhs', 'species chloride = "[Cl-:30]"\nspecies nhs'))


def test_nhs_ester_formation_with_a_carbodiimide_is_clean():
    assert codes(NHS_ESTER) == []
    assert ("NHS's O-H", "an amidinium N-H", -6.0) in _transfers(NHS_ESTER)


def test_chloride_taking_nhs_o_h_is_flagged():
    """NHS (6.0) was matched by no entry, so chloride taking its proton passed clean."""
    d = only(NHS_ESTER_CHLORIDE, "AR508")
    assert "removing NHS's O-H (6.0): uphill by about 13 pKa units" in d.message, d.message


# --- An NHS ester's aminolysis --------------------------------------------------------------------
# The amine adds to the NHS ester, the NHS anion leaves and takes the N-acylammonium's proton
# (common practice: NHS esters acylate lysine side chains).
NHS_AMINOLYSIS = """\
species ester = "[CH3:1][C:2](=[O:3])[O:20][N:21]1C(=O)CCC1=O"
species amine = "[CH3:30][NH2:31]"
step "the amine adds"
    :N31 -> C2
    C2=O3 -> O3
end
step "the NHS anion leaves"
    :O3 -> C2=O3
    C2-O20 -> O20
end
step "the NHS anion takes the N-H proton"
    :O20 -> H(N31)
    N31-H -> N31
end
"""
# The NHS anion (NHS 6.0) drawn taking the amine's own N-H (~38) so that an amide ion adds: 32 units.
NHS_ANION_ON_AN_AMINE = """\
species anion = "O=C1CCC(=O)[N:21]1[O-:20]"
species amine = "[CH3:30][NH2:31]"
step "the NHS anion takes the amine's N-H"
    :O20 -> H(N31)
    N31-H -> N31
end
"""


def test_nhs_ester_aminolysis_is_clean():
    """The NHS anion on the N-acylammonium ion (~-7, an estimate): 13 units downhill, now judged."""
    assert codes(NHS_AMINOLYSIS) == []
    assert _transfers(NHS_AMINOLYSIS) == [("an N-acylammonium ion", "NHS's O-H", -13.0)]


def test_the_nhs_anion_taking_an_amine_n_h_is_flagged():
    """Its conjugate acid read after the step was matched by no entry: unjudged."""
    d = only(NHS_ANION_ON_AN_AMINE, "AR508")
    assert d.message.startswith("a 2,5-dioxopyrrolidin-1-olate (NHS-) (pKa of NHS's O-H 6.0) removing an amine N-H"), \
        d.message


# --- HOAt as the additive of a carbodiimide coupling ---------------------------------------------
# test_pka's HOBt coupling with HOAt in HOBt's place: triethylamine takes HOAt's O-H, OAt- turns the
# O-acylisourea into the OAt ester, the amine adds to that and OAt- takes the N-acylammonium's
# proton (Carpino 1993; common practice with EDC or HATU).
HOAT_COUPLING = (HOBT_COUPLING
                 .replace('species hobt = "c1ccc2c(c1)[n:31]([OH:30])[n:32][n:33]2"',
                          'species hoat = "c1cnc2c(c1)[n:32][n:33][n:31]2[OH:30]"')
                 .replace("HOBt", "HOAt").replace("OBt", "OAt"))
# OAt- (HOAt 3.3) drawn taking the amine's N-H (~38) so that an amide ion adds: 35 units uphill.
OAT_ON_AN_AMINE = """\
species anion = "c1cnc2c(c1)[n:32][n:33][n:31]2[O-:30]"
species amine = "[CH3:20][NH2:21]"
step "OAt- takes the amine's N-H"
    :O30 -> H(N21)
    N21-H -> N21
end
"""


def test_hoat_coupling_is_clean():
    """Et3N (~10) on HOAt (3.3): 6.7 downhill; OAt- on the N-acylammonium ion (~-7): 10.3 downhill."""
    assert codes(HOAT_COUPLING) == []
    assert _transfers(HOAT_COUPLING) == [("HOAt's O-H", "an ammonium ion", -6.7),
                                         ("an N-acylammonium ion", "HOAt's O-H", -10.3)]


def test_oat_taking_an_amine_n_h_is_flagged():
    d = only(OAT_ON_AN_AMINE, "AR508")
    assert "(pKa of HOAt's O-H 3.3) removing an amine N-H (~38)" in d.message, d.message


# --- N-Methylation of benzimidazole and indazole --------------------------------------------------
# Carbonate (K2CO3, bicarbonate 10.3) takes the ring N-H and the anion displaces iodide from
# iodomethane (common practice for N-alkylating azoles and imides in DMF).
N_METHYLATION = """\
species substrate = "{substrate}"
species base = "{base}"
species iodomethane = "[CH3:7][I:8]"
step "the base takes the N-H"
    :{b} -> H(N1)
    N1-H -> N1
end
step "the anion displaces iodide"
    :N1 -> C7
    C7-I8 -> I8
end
"""
BENZIMIDAZOLE = "c1ccc2c(c1)[nH:1][cH:2][n:3]2"
INDAZOLE = "c1ccc2c(c1)[nH:1][n:2][cH:3]2"
CARBONATE = "[O-:6]C([O-])=O"
WATER = "[OH2:6]"


@pytest.mark.parametrize("azole, acid, uphill", [
    (BENZIMIDAZOLE, "a benzimidazole N-H", 2.5),    # 12.8 - 10.3
    (INDAZOLE, "an indazole N-H", 3.6),             # 13.9 - 10.3
], ids=["benzimidazole", "indazole"])
def test_carbonate_then_iodomethane_is_clean(azole, acid, uphill):
    text = N_METHYLATION.format(substrate=azole, base=CARBONATE, b="O6")
    assert codes(text) == []
    assert _transfers(text) == [(acid, "bicarbonate", uphill)]


@pytest.mark.parametrize("azole, said", [
    (BENZIMIDAZOLE, "removing a benzimidazole N-H (12.8): uphill by about 14 pKa units"),   # 12.8 + 1.7
    (INDAZOLE, "removing an indazole N-H (13.9): uphill by about 16 pKa units"),            # 13.9 + 1.7
], ids=["benzimidazole", "indazole"])
def test_water_taking_the_ring_n_h_is_flagged(azole, said):
    """Water (H3O+ -1.7) is far too weak a base for either N-H; both passed clean."""
    d = only(N_METHYLATION.format(substrate=azole, base=WATER, b="O6"), "AR508")
    assert said in d.message, d.message


# --- Guards: hydantoin and an oxazolidinone, judged before -----------------------------------------
# Hydantoin N3-alkylation with K2CO3 (its imide N-H, 9.1, read as ~9: 1.3 downhill); the Evans
# auxiliary's N-acylation after butyllithium takes its N-H (read as an amide's ~17; Evans 1981,
# memory). Twins: chloride (HCl ~-7) taking either N-H.
HYDANTOIN = "O=C1[NH:1]C(=O)CN1"
OXAZOLIDINONE_ACYLATION = """\
species oxazolidinone = "O=C1[NH:1][CH2]CO1"
species base = "{base}"
species chloride = "[CH3:9][CH2:8][C:7](=[O:10])[Cl:11]"
step "the base takes the N-H"
    :{b} -> H(N1)
    N1-H -> N1
end
step "the anion adds to the acyl chloride"
    :N1 -> C7
    C7=O10 -> O10
end
step "chloride leaves"
    :O10 -> C7=O10
    C7-Cl11 -> Cl11
end
"""


@pytest.mark.parametrize("text", [
    N_METHYLATION.format(substrate=HYDANTOIN, base=CARBONATE, b="O6"),
    OXAZOLIDINONE_ACYLATION.format(base="CCC[CH2-:6]", b="C6"),
], ids=["hydantoin-carbonate", "oxazolidinone-butyllithium"])
def test_a_strong_enough_base_is_clean_guard(text):
    assert codes(text) == []


@pytest.mark.parametrize("text, said", [
    (N_METHYLATION.format(substrate=HYDANTOIN, base="[Cl-:6]", b="Cl6"),
     "removing an imide N-H (~9): uphill by about 16"),
    (OXAZOLIDINONE_ACYLATION.format(base="[Cl-:6]", b="Cl6"), "removing an amide N-H (~17): uphill by about 24"),
], ids=["hydantoin-chloride", "oxazolidinone-chloride"])
def test_chloride_on_either_n_h_is_flagged_guard(text, said):
    d = only(text, "AR508")
    assert said in d.message, d.message
