"""Leaving groups judged beyond carbon, and substitutions drawn in one step: wrong mechanisms that
`arrows check` once passed (or hinted at wrongly), each beside a correct one that must stay clean.
Sources are named per test; textbook outcomes are from memory."""
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import TEXTBOOK  # noqa: E402

from verdicts import at, codes, findings, only  # noqa: E402


# --- 1. Hydroxide pushed off an oxime's nitrogen in acid (AR517) ---------------------------------
# The Beckmann rearrangement in acid (Clayden, from memory): the oxime's OH is protonated first and
# leaves as water as the anti group moves to nitrogen. Hydroxide leaving beside H3O+ means that
# proton transfer is missing, as AR517 already said at carbon.

OXIME = "[OH:4]/[N:3]=[C:2](\\\\C)[CH3:1]"
ACETYL_OXIME = "CC(=O)[O:4]/[N:3]=[C:2](\\\\C)[CH3:1]"
BECKMANN_SHIFT = '''species oxime = "{oxime}"
species acid = "[OH3+:5]"
{protonation}step "methyl moves anti, the leaving group goes"
    C2-C1 -> C1-N3
    N3-O4 -> O4
    :N3 -> C2#N3
end
'''
PROTONATION = 'step "protonation"\n    :O4 -> H(O5)\n    O5-H -> O5\nend\n'


def test_hydroxide_pushed_off_an_oxime_nitrogen_beside_an_acid_is_flagged():
    d = only(BECKMANN_SHIFT.format(oxime=OXIME, protonation=""), "AR517")
    assert (d.loc.line, d.loc.column) == (5, 5)   # at `N3-O4 -> O4`
    assert "O4 leaves N3 as hydroxide" in d.message and "O5" in d.message
    assert "`:O4 -> H(O5)`" in d.hint and "water" in d.hint
    assert "workup" not in d.hint   # the acid catalyses the Beckmann: it is no work-up acid


def test_the_protonated_oxime_and_an_acetate_leaving_nitrogen_are_clean():
    """Water leaving the protonated oxime (textbook Beckmann); acetate, a weak base (pKa of acetic
    acid 4.8), leaving an O-acetyl oxime's nitrogen beside the acid."""
    assert codes(BECKMANN_SHIFT.format(oxime=OXIME, protonation=PROTONATION)) == []
    assert "AR517" not in codes(BECKMANN_SHIFT.format(oxime=ACETYL_OXIME, protonation=""))


def test_the_textbook_beckmann_stays_clean():
    assert findings(TEXTBOOK["beckmann"][0])[1] == []


# --- 2. Substitution at a carbonyl carbon in one step (AR525) ------------------------------------
# Nucleophilic acyl substitution goes by addition to the C=O (the tetrahedral intermediate), then
# elimination (Clayden, from memory; common practice).

SAPONIFICATION = '''species ester = "[CH3:1][C:2](=[O:3])[O:4][CH3:5]"
species hydroxide = "[OH-:6]"
{steps}'''
ONE_STEP = 'step "substitution"\n    :O6 -> C2\n    C2-O4 -> O4\nend\n'
TWO_STEPS = ('step "addition"\n    :O6 -> C2\n    C2=O3 -> O3\nend\n'
             'step "elimination"\n    :O3 -> C2=O3\n    C2-O4 -> O4\nend\n')

# An acid chloride attacked by an alcohol (Schotten-Baumann type, textbook), in one step.
ACID_CHLORIDE_ONE_STEP = '''species chloride = "C[C:1](=[O:2])[Cl:3]"
species alcohol = "CC[OH:4]"
step "substitution"
    :O4 -> C1
    C1-Cl3 -> Cl3
end
'''

# An alpha-bromo ketone's CH2 substituted by an amine (SN2 at an sp3 carbon beside a carbonyl,
# fast and textbook, from memory): no acyl carbon is attacked.
ALPHA_BROMO_SN2 = '''species ketone = "C[C:1](=[O:2])[CH2:3][Br:4]"
species amine = "C[NH2:5]"
step "SN2"
    :N5 -> C3
    C3-Br4 -> Br4
end
'''


def test_an_ester_substituted_in_one_step_is_flagged():
    d = only(SAPONIFICATION.format(steps=ONE_STEP), "AR525")
    assert (d.loc.line, d.loc.column, d.severity) == (5, 5, "warning")   # at `C2-O4 -> O4`
    assert "carbonyl carbon C2" in d.message and "tetrahedral intermediate" in d.message
    assert "`:O6 -> C2` with `C2=O3 -> O3`" in d.hint and "`:O3 -> C2=O3` with `C2-O4 -> O4`" in d.hint


def test_an_acid_chloride_substituted_in_one_step_is_flagged():
    d = only(ACID_CHLORIDE_ONE_STEP, "AR525")
    assert "O4 bonds to the carbonyl carbon C1 as Cl3 leaves it" in d.message


# A thionoester's C=S carbon attacked by an amine (thionoester aminolysis to a thioamide goes by
# addition to the C=S, the tetrahedral intermediate, then loss of the alkoxide: March, from memory;
# common practice), in one step and in the two steps.
THIONOESTER = '''species thionoester = "C[C:1](=[S:2])[O:3]C"
species amine = "C[NH2:4]"
{steps}'''
THIONO_ONE_STEP = 'step "aminolysis"\n    :N4 -> C1\n    C1-O3 -> O3\nend\n'
THIONO_TWO_STEPS = ('step "addition"\n    :N4 -> C1\n    C1=S2 -> S2\nend\n'
                    'step "elimination"\n    :S2 -> C1=S2\n    C1-O3 -> O3\nend\n')


def test_a_thiocarbonyl_substituted_in_one_step_is_flagged():
    d = only(THIONOESTER.format(steps=THIONO_ONE_STEP), "AR525")
    assert "thiocarbonyl carbon C1" in d.message and "C1=S2 kept" in d.message
    assert "`:N4 -> C1` with `C1=S2 -> S2`" in d.hint and "`:S2 -> C1=S2` with `C1-O3 -> O3`" in d.hint


def test_a_thiocarbonyl_substituted_in_two_steps_is_clean():
    assert "AR525" not in codes(THIONOESTER.format(steps=THIONO_TWO_STEPS))


def test_the_hinted_two_steps_are_clean():
    assert codes(SAPONIFICATION.format(steps=TWO_STEPS)) == []


def test_an_sn2_beside_a_carbonyl_is_not_an_acyl_substitution():
    assert "AR525" not in codes(ALPHA_BROMO_SN2)


@pytest.mark.parametrize("name", ["schotten-baumann", "aminolysis", "transesterification", "fischer esterification",
                                  "dmap acetylation", "imidazole acyl transfer", "lactam", "acid ester hydrolysis",
                                  "thionyl chloride", "swern oxidation", "pummerer", "acyl chloride double grignard"])
def test_textbook_acyl_substitutions_drawn_stepwise_are_not_flagged(name):
    assert "AR525" not in codes(TEXTBOOK[name][0])


# --- 3. A strong base leaving sulfur or phosphorus (AR510) ---------------------------------------

# Corey-Chaykovsky (textbook; Clayden, from memory): the alkoxide attacks the CH2 next to S+ and
# dimethyl sulfide leaves. Drawn at sulfur, a primary carbanion leaves instead.
BETAINE = '''species betaine = "[CH3:10][S+:2](C)[CH2:1][CH2:5][O-:9]"
step "ring closure"
    {moves}
end
'''


def test_a_carbanion_leaving_a_sulfonium_sulfur_is_flagged():
    d = only(BETAINE.format(moves=":O9 -> S2\n    S2-C1 -> C1"), "AR510")
    assert "C1 leaves S2 as an alkyl carbanion" in d.message
    assert "`:O9 -> C1` with `S2-C1 -> S2`" in d.hint


def test_the_epoxide_closure_at_carbon_is_not_flagged():
    assert "AR510" not in codes(BETAINE.format(moves=":O9 -> C1\n    S2-C1 -> S2"))
    assert "AR510" not in codes(TEXTBOOK["corey-chaykovsky"][0])


# Staudinger reduction's last steps (March, from memory): water's hydroxide on the
# aminophosphonium P, a proton moved from O to N, then the amine leaves neutral as P=O forms.
AMINOPHOSPHORANE = '''species adduct = "c1ccccc1[CH2:1][NH:2][P:5](c1ccccc1)(c1ccccc1)(c1ccccc1)[OH:6]"
{transfer}step "amine leaves, P=O forms"
    :O6 -> O6=P5
    P5-N2 -> N2
end
'''
O_TO_N = '''step "proton transfer O to N"
    :N2 -> H(O6)
    O6-H -> O6
end
'''


def test_an_amide_ion_leaving_phosphorus_is_flagged():
    d = only(AMINOPHOSPHORANE.format(transfer=""), "AR510")
    assert "N2 leaves P5 as an amide ion" in d.message and "protonate N2" in d.hint


def test_the_protonated_amine_leaving_phosphorus_is_not_flagged():
    assert "AR510" not in codes(AMINOPHOSPHORANE.format(transfer=O_TO_N))


# Alkaline cleavage of a phosphonium salt (March, from memory): the P-O- of the hydroxyphosphorane
# pushes out the group most stable as a carbanion (benzyl) as P=O forms.
PHOSPHORANE_OXIDE = '''species oxide = "c1ccccc1[CH2:1][P:2](c1ccccc1)(c1ccccc1)(c1ccccc1)[O-:3]"
species water = "[OH2:5]"
step "benzyl anion leaves as P=O forms"
    :O3 -> O3=P2
    P2-C1 -> C1
end
step "water protonates the benzyl anion"
    :C1 -> H(O5)
    O5-H -> O5
end
'''

# Methoxide drawn attacking a methylphosphonium P with a methyl carbanion leaving in the same step.
PHOSPHONIUM_AT_P = '''species salt = "[CH3:1][P+:2](c1ccccc1)(c1ccccc1)c1ccccc1"
species methoxide = "C[O-:3]"
step "methoxide at phosphorus, CH3- leaves"
    :O3 -> P2
    P2-C1 -> C1
end
'''


def test_a_carbanion_pushed_off_phosphorus_as_p_o_forms_is_not_flagged():
    assert "AR510" not in codes(PHOSPHORANE_OXIDE)


def test_a_methyl_carbanion_displaced_from_a_phosphonium_is_flagged():
    d = only(PHOSPHONIUM_AT_P, "AR510")
    assert "C1 leaves P2" in d.message and "`:O3 -> C1` with `P2-C1 -> P2`" in d.hint


@pytest.mark.parametrize("name", ["wittig", "staudinger", "appel", "mitsunobu", "swern oxidation", "aza-wittig",
                                  "sulfonamide", "corey-kim"])
def test_textbook_phosphorus_and_sulfur_chemistry_keeps_clear_of_ar510(name):
    assert "AR510" not in codes(TEXTBOOK[name][0])


# --- 4. AR520's hint at a carbon that holds three halogens ----------------------------------------
# The Appel reaction (March, from memory): Ph3P takes Cl+ from CCl4 (halophilic attack), leaving
# CCl3-; halogens hold up no carbocation, so the SN1 the hint offers for tert-butyl bromide is no
# way for CCl4.

CCL4_AT_CARBON = '''species ccl4 = "[Cl:1][C:2](Cl)(Cl)Cl"
species phosphine = "c1ccccc1[P:5](c1ccccc1)c1ccccc1"
step "phosphine"
    {moves}
end
'''


def test_the_hint_for_ccl4_attacked_at_carbon_is_a_halophilic_attack():
    d = only(CCL4_AT_CARBON.format(moves=":P5 -> C2\n    C2-Cl1 -> Cl1"), "AR520")
    assert "halophilic" in d.hint and "`:P5 -> Cl1` with `C2-Cl1 -> C2`" in d.hint
    assert "SN1" not in d.hint


def test_the_hinted_attack_at_chlorine_is_clean():
    assert codes(CCL4_AT_CARBON.format(moves=":P5 -> Cl1\n    C2-Cl1 -> C2")) == []


def test_tert_butyl_bromide_keeps_the_sn1_hint():
    text = ('species bromide = "C[C:1](C)(C)[Br:2]"\nspecies hydroxide = "[OH-:3]"\n'
            'step "substitution"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n')
    assert "SN1" in only(text, "AR520").hint


# --- An alkoxide pushed out of an acetal carbon with no acid (AR534) ------------------------------
# Lysozyme's oxocarbenium route, a glycoside modelled as 2-methoxytetrahydropyran and Glu35 as
# acetic acid (Berg/Stryer; Voet; from memory): the general acid protonates the glycosidic O, the
# ring O pushes the aglycone out as methanol, water adds with the carboxylate as base. Acetals are
# stable to base (common practice): pushed out unprotonated, the aglycone would leave as methoxide.
LYSOZYME = '''species gly = "[O:6]1[CH2:5][CH2:4][CH2:3][CH2:2][CH:1]1[O:7][CH3:8]"
species glu = "[CH3:30][C:31](=[O:32])[OH:33]"
{first}step "water adds, the carboxylate takes its proton"
    uses water = "[OH2:50]"
    :O33 -> H(O50)
    O50-H -> O50-C1
    C1=O6 -> O6
end
product "OC1CCCCO1"
'''
PROTONATED_FIRST = '''step "glycosidic O protonated" reversible
    :O7 -> H(O33)
    O33-H -> O33
end
step "aglycone leaves: oxocarbenium ion"
    :O6 -> C1=O6
    C1-O7 -> O7
    releases O7
end
'''
UNPROTONATED = '''step "aglycone leaves: oxocarbenium ion"
    :O6 -> C1=O6
    C1-O7 -> O7
    releases O7
end
'''


def test_the_glycoside_opened_by_its_general_acid_is_clean():
    """Guard: the textbook route."""
    assert codes(LYSOZYME.format(first=PROTONATED_FIRST)) == []


def test_an_alkoxide_pushed_out_of_an_acetal_unprotonated_is_flagged_with_the_acid_at_hand():
    text = LYSOZYME.format(first=UNPROTONATED)
    d = only(text, "AR534")
    assert (d.loc.line, d.loc.column) == at(text, "C1-O7 -> O7")
    assert "`C1-O7 -> O7-H(O33)` with `O33-H -> O33`" in d.hint


def test_an_esters_neutral_tetrahedral_intermediate_and_a_siloxy_epoxide_are_not_judged():
    """Guards (textbook corpus): the lactam's neutral tetrahedral intermediate pushes methoxide out
    with its O-H (a carbon with N as well, not an acetal), and the Rubottom oxidation's siloxy
    epoxide opens by the silyl ether O's push (strain drives it)."""
    assert "AR534" not in codes(TEXTBOOK["lactam"][0])
    assert "AR534" not in codes(TEXTBOOK["rubottom oxidation"][0])
