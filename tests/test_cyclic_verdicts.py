"""Two cyclic arrays a step cannot go round, each beside correct mechanisms that must stay clean:

- AR526, a proton passed inside one molecule between two atoms bonded to one common atom (a
  four-membered cyclic transfer, as in a tautomerisation drawn in one step). Common practice: a
  tautomerisation between 1,3-related heteroatoms goes by way of the solvent or an acid or base;
  computed barriers for formimidic acid to formamide are about 45-50 kcal/mol direct against about
  20 with one water (from memory). A hydrogen passed inside one molecule goes round six atoms (an
  ene reaction, an Ei elimination, a beta-keto acid's decarboxylation: Clayden, from memory).
- AR527, a ring closed onto an arene's para or meta carbon with a short bridge: the ring of an
  [n]paracyclophane or [n]metacyclophane, which with fewer than five bridge atoms is not isolable
  (from memory). A closure onto an arene (Friedel-Crafts, Pictet-Spengler, Skraup) makes a fused
  ring at the carbon ortho to the chain (textbook, Clayden and Joule & Mills, from memory).
"""
from __future__ import annotations

import pytest

from arrows.checks.rings import METACYCLOPHANE_SMALLEST_BRIDGE, PARACYCLOPHANE_SMALLEST_BRIDGE

from textbook_mechanisms import TEXTBOOK
from verdicts import findings, only


def codes(text: str) -> list[str]:
    return [d.code for d in findings(text)[1]]


def at(text: str, snippet: str) -> tuple[int, int]:
    """1-based (line, column) of the first occurrence of snippet."""
    start = text.index(snippet)
    return text.count("\n", 0, start) + 1, start - (text.rfind("\n", 0, start) + 1) + 1


# --- AR526: a four-membered cyclic proton transfer ------------------------------------------------

# An imidic acid's N taking its own O-H proton: imidic acid to amide in one step.
IMIDIC_ONE_STEP = '''species imidic = "C[C:1](=[NH:2])[OH:3]"
step "1,3 shift"
    :N2 -> H(O3)
    O3-H -> C1=O3
    C1=N2 -> N2
end
product "CC(N)=O"
'''

# A beta-keto acid whose own C=O oxygen (O6) takes the O-H proton inside the decarboxylation: the
# ketone oxygen (O3) takes it round the six-membered ring (Clayden, from memory).
DECARBOXYLATION_O6 = '''species acid = "[CH3:1][C:2](=[O:3])[CH2:4][C:5](=[O:6])[OH:7]"
step "concerted decarboxylation"
    :O6 -> H(O7)
    O7-H -> C5=O7
    C4-C5 -> C2=C4
    C2=O3 -> O3
end
step "enolate takes the proton back"
    :O3 -> H(O6)
    O6-H -> O6
    releases C5
end
step "enol protonated at carbon"
    uses h3o = "[OH3+:8]"
    C2=C4 -> C4-H(O8)
    O8-H -> O8
    :O3 -> C2=O3
end
step "oxonium deprotonated"
    :O8 -> H(O3)
    O3-H -> O3
end
product "CC(C)=O"
'''

# The decarboxylation as textbooks draw it, the ketone oxygen taking the proton through the
# six-membered ring, then the enol protonated on carbon (Clayden, from memory).
DECARBOXYLATION_SIX = '''species acid = "[CH3:1][C:2](=[O:3])[CH2:4][C:5](=[O:6])[OH:7]"
step "concerted decarboxylation (6-membered ring)"
    :O3 -> H(O7)
    O7-H -> C5=O7
    C4-C5 -> C2=C4
    C2=O3 -> O3
    releases C5
end
step "enol protonated at carbon"
    uses h3o = "[OH3+:8]"
    C2=C4 -> C4-H(O8)
    O8-H -> O8
    :O3 -> C2=O3
end
step "oxonium deprotonated"
    :O8 -> H(O3)
    O3-H -> O3
end
product "CC(C)=O"
'''


def test_an_imidic_acid_turning_into_its_amide_in_one_step_warns():
    d = only(IMIDIC_ONE_STEP, "AR526")
    assert (d.loc.line, d.loc.column) == at(IMIDIC_ONE_STEP, ":N2 -> H(O3)")
    assert "N2 takes the proton of O3" in d.message and "bonded to C1" in d.message
    assert "four-membered" in d.message and "from memory" in d.message
    assert '`uses water = "[OH2:4]"`' in d.hint and "`:O4 -> H(O3)`" in d.hint and "`:N2 -> H(O4)`" in d.hint


def test_a_carboxylic_acid_oxygen_taking_its_own_proton_in_a_decarboxylation_warns():
    d = only(DECARBOXYLATION_O6, "AR526")
    assert (d.loc.line, d.loc.column) == at(DECARBOXYLATION_O6, ":O6 -> H(O7)")
    assert "O6 takes the proton of O7" in d.message and "bonded to C5" in d.message
    assert "`:O3 -> H(O7)`" in d.hint   # the ketone oxygen, four bonds along: the six-membered ring


# Correct mechanisms, each with a proton or hydrogen passed inside one molecule or between two.
CLEAN = {
    # The imidic acid tautomerised by way of water: water takes the O-H proton, the hydronium ion
    # gives one to N (common practice: two proton transfers).
    "imidic acid by way of water": '''species imidic = "C[C:1](=[NH:2])[OH:3]"
species water = "[OH2:4]"
step "water takes the O-H proton"
    :O4 -> H(O3)
    O3-H -> C1=O3
    C1=N2 -> N2
end
step "the N takes a proton from the hydronium ion"
    :N2 -> H(O4)
    O4-H -> O4
end
product "CC(N)=O"
''',
    # ... and by way of an acid: N protonated first, then water takes the O-H proton.
    "imidic acid by way of an acid": '''species imidic = "C[C:1](=[NH:2])[OH:3]"
species acid = "[OH3+:4]"
step "the N takes a proton from the hydronium ion"
    :N2 -> H(O4)
    O4-H -> O4
end
step "water takes the O-H proton"
    :O4 -> H(O3)
    O3-H -> C1=O3
    C1=N2 -> N2
end
product "CC(N)=O"
''',
    # Thermal ene reaction of propene and ethene: the allylic hydrogen round six atoms (Clayden, memory).
    "ene": '''species ene = "[CH3:3][CH:2]=[CH2:1]"
species enophile = "[CH2:4]=[CH2:5]"
step "ene reaction" under "heat"
    C1=C2 -> C1-C4
    C4=C5 -> C5-H(C3)
    C3-H -> C2=C3
end
product "C=CCCC"
''',
    # Retro-ene of but-3-en-1-ol: propene and formaldehyde, six atoms round (textbook, memory).
    "retro-ene": '''species alcohol = "[CH2:1]=[CH:2][CH2:3][CH2:4][OH:5]"
step "retro-ene" under "heat"
    O5-H -> C4=O5
    C3-C4 -> C2=C3
    C1=C2 -> C1-H(O5)
end
product "C=CC.C=O"
''',
    # Cope elimination of an N-oxide: the oxygen takes a beta hydrogen round five atoms (Clayden, memory).
    "cope elimination": '''species oxide = "[O-:1][N+:2](C)(C)[CH2:3][CH3:4]"
step "syn elimination" under "heat"
    :O1 -> H(C4)
    C4-H -> C3=C4
    C3-N2 -> N2
end
product "C=C.CN(C)O"
''',
    # McLafferty rearrangement's first step: the ketone radical cation's oxygen takes a gamma
    # hydrogen atom round six atoms (fishhooks; mass-spectrometry textbooks, memory).
    "mclafferty hydrogen atom transfer": '''species ion = "[CH3:1][C:2](=[O+:3])[CH2:4][CH2:5][CH2:6][H:7]"
step "gamma-hydrogen transfer"
    .O3 ~> O3-H7
    C6-H7 ~> O3-H7
    C6-H7 ~> C6
end
''',
    "beta-keto acid decarboxylation, six-membered ring": DECARBOXYLATION_SIX,
}
TEXTBOOK_CLEAN = ("ene reaction", "ester pyrolysis", "chugaev", "cope elimination", "beta-keto acid decarboxylation",
                  "eschweiler-clarke", "oxime formation", "fischer esterification", "curtius", "lactam",
                  "stork enamine alkylation", "fmoc removal")


@pytest.mark.parametrize("name", sorted(CLEAN))
def test_correct_transfers_stay_clean(name):
    """Guard: these passed before AR526 and must still pass."""
    assert codes(CLEAN[name]) == [], name


@pytest.mark.parametrize("name", TEXTBOOK_CLEAN)
def test_textbook_transfers_are_not_judged(name):
    """Guard. Six-centre transfers (ene, Ei, Chugaev, a beta-keto acid's decarboxylation), a
    five-centre one (Cope elimination), and the proton transfer across the unchanged sp3 carbon of
    a tetrahedral intermediate or hemiaminal that textbooks write as shorthand for one by way of the
    solvent (common practice): no AR526."""
    assert "AR526" not in codes(TEXTBOOK[name][0]), name


def test_a_two_arrow_13_shift_is_left_to_ar521():
    """Guard: the imidic acid's shift drawn bond to bond is AR521's [1,3]-H shift
    (Woodward-Hoffmann): one warning, not two."""
    text = IMIDIC_ONE_STEP.replace("    :N2 -> H(O3)\n    O3-H -> C1=O3\n    C1=N2 -> N2\n",
                                   "    C1=N2 -> N2-H(O3)\n    O3-H -> C1=O3\n")
    assert codes(text) == ["AR521"]


def test_a_hydride_shift_between_13_atoms_is_not_a_proton_transfer():
    """Guard: a 1,3-hydride shift in a carbocation is AR519's (shifts.py): the hydrogen moves with
    its pair."""
    text = ('species cation = "[CH3:1][CH+:2][CH2:3][CH:4]([CH3:5])[CH3:6]"\n'
            'step "hydride shift"\n    C4-H -> C2-H(C4)\nend\n')
    found = codes(text)
    assert "AR519" in found and "AR526" not in found, found


def test_a_step_under_light_is_not_judged():
    """Guard: a step under light (an excited state) is not judged, as AR521 judges none."""
    assert "AR526" not in codes(IMIDIC_ONE_STEP.replace('step "1,3 shift"', 'step "1,3 shift" over "hv"'))


# --- AR527: a ring closed across an arene's para or meta positions ------------------------------

# A Pictet-Spengler cyclisation of 2-(3-hydroxyphenyl)ethylamine and formaldehyde (Clayden, memory),
# the iminium ion attacked by C5, ortho to the chain (`correct`), or by C7, para to it.
PICTET_SPENGLER = '''species amine = "[OH:1][c:2]1[cH:3][c:4]([CH2:8][CH2:9][NH2:10])[cH:5][cH:6][cH:7]1"
species hcho = "[CH2:11]=[O:12]"
species acid = "[OH3+:13]"
step "amine adds to formaldehyde"
    :N10 -> C11
    C11=O12 -> O12
end
step "alkoxide protonated"
    :O12 -> H(O13)
    O13-H -> O13
end
step "ammonium deprotonated"
    :O13 -> H(N10)
    N10-H -> N10
end
step "hydroxyl protonated"
    uses acid_2 = "[OH3+:14]"
    :O12 -> H(O14)
    O14-H -> O14
end
step "water leaves: iminium ion"
    :N10 -> C11=N10
    C11-O12 -> O12
    releases O12
end
step "arene attacks the iminium carbon"
    {closure}
    C11=N10 -> N10
end
step "rearomatisation"
    :O14 -> H({carbon})
    {carbon}-H -> {pi}
end
product "{product}"
'''
PS_ORTHO = PICTET_SPENGLER.format(closure="C5=C6 -> C5-C11", carbon="C5", pi="C5=C6", product="Oc1ccc2c(c1)CCNC2")
PS_PARA = PICTET_SPENGLER.format(closure="C7=C2 -> C7-C11", carbon="C7", pi="C7=C2", product="Oc1cc2ccc1CNCC2")

# The first steps of a Skraup synthesis (Joule & Mills, memory): aniline's conjugate addition to
# acrolein, then the arene closing onto the protonated aldehyde at C7, ortho to N, or at C5, para.
SKRAUP = '''species aniline = "[NH2:1][c:2]1[cH:3][cH:4][cH:5][cH:6][cH:7]1"
species acrolein = "[CH2:8]=[CH:9][CH:10]=[O:11]"
species acid = "[OH3+:12]"
step "aza-Michael: N adds to the beta carbon"
    :N1 -> C8
    C8=C9 -> C9=C10
    C10=O11 -> O11
end
step "enolate protonated at carbon"
    C9=C10 -> C9-H(O12)
    O12-H -> O12
    :O11 -> C10=O11
end
step "anilinium to aniline"
    :O12 -> H(N1)
    N1-H -> N1
end
step "aldehyde protonated"
    uses acid_2 = "[OH3+:13]"
    :O11 -> H(O13)
    O13-H -> O13
end
step "arene closes onto the protonated aldehyde"
{closure}
    C10=O11 -> O11
end
step "rearomatisation"
    :O13 -> H({carbon})
{rearomatise}
end
product "{product}"
'''
SKRAUP_ORTHO = SKRAUP.format(closure="    :N1 -> N1=C2\n    C2=C7 -> C7-C10", carbon="C7",
                             rearomatise="    C7-H -> C2=C7\n    C2=N1 -> N1", product="OC1CCNc2ccccc21")
SKRAUP_PARA = SKRAUP.format(closure="    C5=C6 -> C5-C10", carbon="C5", rearomatise="    C5-H -> C5=C6",
                            product="OC1CCNc2ccc1cc2")

# Friedel-Crafts closure of protonated 4-phenylbutanal (or a homologue) onto the ring: at C2,
# ortho to the chain (tetralin-1-ol, textbook, memory), at C5 (meta) or at C6 (para).
FRIEDEL_CRAFTS = ('species aldehyde = "[CH:1]1=[CH:2][C:3]({chain}[CH:10]=[OH+:11])=[CH:4][CH:5]=[CH:6]1"\n'
                  'step "ring closure"\n    {move}\n    C10=O11 -> O11\nend\n')
ORTHO, META, PARA = "C1=C2 -> C2-C10", "C5=C6 -> C5-C10", "C5=C6 -> C6-C10"


def test_a_pictet_spengler_closing_onto_the_para_carbon_warns():
    d = only(PS_PARA, "AR527")
    assert (d.loc.line, d.loc.column) == at(PS_PARA, "C7=C2 -> C7-C11")
    assert "[4]paracyclophane" in d.message and "C4 and C7" in d.message and "from memory" in d.message
    assert "C3 or C5" in d.hint and "`C5=C6 -> C5-C11`" in d.hint   # the arrow of the ortho closure


def test_a_skraup_closure_at_the_para_carbon_warns():
    d = only(SKRAUP_PARA, "AR527")
    assert "[4]paracyclophane" in d.message and "C2 and C5" in d.message
    assert "C3 or C7" in d.hint


def test_a_closure_onto_the_meta_carbon_with_a_short_bridge_warns():
    d = only(FRIEDEL_CRAFTS.format(chain="CCC", move=META), "AR527")
    assert "[4]metacyclophane" in d.message and "meta" in d.message and "7-membered" in d.message
    assert "C2 or C4" in d.hint


@pytest.mark.parametrize("text", [PS_ORTHO, SKRAUP_ORTHO, FRIEDEL_CRAFTS.format(chain="CCC", move=ORTHO),
                                  FRIEDEL_CRAFTS.format(chain="CC", move=ORTHO), TEXTBOOK["pictet-spengler"][0]],
                         ids=["pictet-spengler", "skraup", "friedel-crafts 6", "friedel-crafts 5", "textbook"])
def test_an_ortho_closure_makes_a_fused_ring_and_stays_clean(text):
    """Guard: the fused ring, the textbook outcome."""
    assert codes(text) == []


def test_the_smallest_isolable_bridge_is_not_judged():
    """Guard on the thresholds: a bridge of PARACYCLOPHANE_SMALLEST_BRIDGE atoms across para (or
    METACYCLOPHANE_SMALLEST_BRIDGE across meta) carbons is an isolable cyclophane's: the note alone."""
    for smallest, move in ((PARACYCLOPHANE_SMALLEST_BRIDGE, PARA), (METACYCLOPHANE_SMALLEST_BRIDGE, META)):
        text = FRIEDEL_CRAFTS.format(chain="C" * (smallest - 1), move=move)
        assert "AR527" not in codes(text)
        shorter = FRIEDEL_CRAFTS.format(chain="C" * (smallest - 2), move=move)
        assert "AR527" in codes(shorter)
