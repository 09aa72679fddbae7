"""Slips in organometallic, oxidation and condensation mechanisms that `arrows check` once passed,
each beside the correct mechanism, which must stay clean. Sources are named per test; textbook
outcomes are from memory. The tests named `..._clean` and `..._not_judged` are guards: they passed
before these checks were written too."""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import TEXTBOOK  # noqa: E402

from verdicts import at, codes, findings, only  # noqa: E402


# --- 1. A species written with an unpaired electron in a mechanism of pair arrows (AR530) --------
# Lithium dimethylcuprate adds to cyclohex-2-enone at the beta carbon (Clayden, from memory): the
# cuprate is the anion Me2Cu- (copper(I), ten d electrons) beside Li+. Written neutral, its copper
# holds nine non-bonding electrons, one unpaired, and the starting species carry +1.

CUPRATE = '''species cuprate = "[CH3:1][{copper}:2][CH3:3]"
species lithium = "[Li+:4]"
species enone = "[O:5]=[C:6]1[CH:7]=[CH:8]CCC1"
step "conjugate addition"
    C1-Cu2 -> C1-C8
    C7=C8 -> C6=C7
    C6=O5 -> O5
end
step "enolate protonated at carbon"
    uses ammonium = "[NH4+:9]"
    :O5 -> C6=O5
    C6=C7 -> C7-H(N9)
    N9-H -> N9
end
product "CC1CCCC(=O)C1"
'''


def test_a_cuprate_written_without_its_charge_is_flagged_at_its_copper():
    text = CUPRATE.format(copper="Cu")
    d = only(text, "AR530")
    assert (d.loc.line, d.loc.column) == at(text, "[Cu:2]")
    assert "Cu2" in d.message and "unpaired" in d.message
    assert "`[Cu-:2]`" in d.hint and "neutral" in d.hint


def test_the_cuprate_written_as_its_anion_is_clean():
    """The hinted fix: Me2Cu- with its Li+."""
    assert codes(CUPRATE.format(copper="Cu-")) == []


def test_a_radical_brought_in_by_uses_is_flagged_at_its_species():
    text = CUPRATE.format(copper="Cu").replace('species cuprate = "[CH3:1][Cu:2][CH3:3]"\n', "").replace(
        'step "conjugate addition"\n', 'step "conjugate addition"\n    uses cuprate = "[CH3:1][Cu:2][CH3:3]"\n')
    d = only(text, "AR530")
    assert (d.loc.line, d.loc.column) == at(text, "[Cu:2]")
    assert "neutral" not in d.hint   # the starting species alone carry +1 as written: no balance claimed


# An alkoxide written without its charge (a Williamson ether synthesis, Clayden, from memory).
WILLIAMSON = '''species ethoxide = "C[CH2:1][{oxygen}:2]"
species sodium = "[Na+:5]"
species iodomethane = "[CH3:3][I:4]"
step "SN2"
    :O2 -> C3
    C3-I4 -> I4
end
'''


def test_an_alkoxide_written_as_a_radical_is_flagged():
    d = next(d for d in findings(WILLIAMSON.format(oxygen="O"))[1] if d.code == "AR530")
    assert "`[O-:2]`" in d.hint and "neutral" in d.hint


def test_the_williamson_with_its_alkoxide_is_clean():
    assert codes(WILLIAMSON.format(oxygen="O-")) == []


def test_iron_tribromide_in_a_bromination_is_not_judged():
    """Guard: FeBr3 (high-spin iron(III), five d electrons) is a paramagnetic Lewis acid drawn in
    polar steps (Clayden, from memory); a d-block metal bonded to no carbon is not judged."""
    assert "AR530" not in codes(TEXTBOOK["anisole bromination"][0])


def test_a_radical_mechanism_is_not_judged():
    """Guard: a mechanism with fishhooks (the stannyl radical of a Barton-McCombie deoxygenation,
    sodium's electron in a Birch reduction) is radical chemistry."""
    for name in ("barton-mccombie", "birch reduction", "acyloin condensation", "stannane reduction"):
        assert "AR530" not in codes(TEXTBOOK[name][0]), name


# --- 2. Hydroxide pushed off chromium in acid (AR517) ---------------------------------------------
# The Jones oxidation (Clayden, from memory): in sulfuric acid chromic acid's OH is protonated and
# leaves as water as the alcohol bonds to chromium, giving the chromate ester. Pushed off as
# hydroxide beside H3O+, it skips the protonation.

CHROMATE_IN_ACID = '''species alcohol = "C[CH:1](C)[OH:2]"
species chromic = "[O:3]=[Cr:4](=[O:5])([OH:6])[OH:7]"
species acid = "[OH3+:8]"
{protonation}step "substitution at chromium"
    :O2 -> Cr4
    Cr4-O6 -> O6
end
step "proton transfer"
    :O6 -> H(O2)
    O6-H -> O6
end
'''
PROTONATION = '''step "chromic acid protonated"
    :O6 -> H(O8)
    O8-H -> O8
end
'''


def test_hydroxide_pushed_off_chromium_beside_h3o_is_flagged():
    text = CHROMATE_IN_ACID.format(protonation="").replace("    O6-H -> O6\n", "    O2-H -> O2\n")
    d = only(text, "AR517")
    assert (d.loc.line, d.loc.column) == at(text, "Cr4-O6 -> O6")
    assert "O6" in d.message and "Cr4" in d.message and "O8" in d.message
    assert "`:O6 -> H(O8)`" in d.hint


def test_the_chromate_ester_formed_by_way_of_protonated_chromic_acid_is_clean():
    """The hinted fix (Clayden, from memory), and the chromic acid oxidation of the textbook corpus."""
    text = CHROMATE_IN_ACID.format(protonation=PROTONATION).replace("    :O6 -> H(O2)\n    O6-H -> O6\n",
                                                                    "    :O8 -> H(O2)\n    O2-H -> O2\n")
    assert codes(text) == []
    assert "AR517" not in codes(TEXTBOOK["chromic acid oxidation"][0])


# Sulfuric acid esterified by an alcohol (memory): the same at sulfur, the acid's OH leaving as
# hydroxide while H3O+ stands by.
SULFATE_IN_ACID = '''species alcohol = "C[CH2:1][OH:2]"
species sulfuric = "[O:3]=[S:4](=[O:5])([OH:6])[OH:7]"
species acid = "[OH3+:8]"
step "substitution at sulfur"
    :O2 -> S4
    S4-O6 -> O6
end
'''


def test_hydroxide_pushed_off_sulfur_in_acid_is_flagged():
    d = only(SULFATE_IN_ACID, "AR517")
    assert "S4" in d.message


def test_an_alkoxide_leaving_phosphorus_in_base_is_not_judged():
    """Guard: a phosphate triester cleaved by hydroxide (March, from memory), no acid standing by."""
    text = '''species ester = "[O:1]=[P:2]([O:3]C)([O:4]C)[O:5]C"
species base = "[OH-:6]"
step "substitution at phosphorus"
    :O6 -> P2
    P2-O5 -> O5
end
'''
    assert "AR517" not in codes(text)


# --- 3. Water lost round four atoms, the leaving OH taking the alpha proton itself (AR526) -------
# The Claisen-Schmidt condensation (Clayden, from memory): hydroxide takes the aldol's alpha proton
# and the enolate pushes hydroxide out (E1cB). Drawn in one step with the OH taking the proton
# itself, it is a syn elimination round four atoms.

CLAISEN_SCHMIDT = '''species ketone = "c1ccccc1[C:2](=[O:3])[CH3:1]"
species base = "[OH-:5]"
species aldehyde = "COc1ccc(cc1)[CH:6]=[O:7]"
step "enolate" reversible
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "addition" reversible
    :O3 -> C2=O3
    C1=C2 -> C1-C6
    C6=O7 -> O7
end
step "proton transfer" reversible
    :O7 -> H(O5)
    O5-H -> O5
end
{dehydration}product "COc1ccc(C=CC(=O)c2ccccc2)cc1"
'''
FOUR_CENTRE = '''step "four-centre elimination"
    :O7 -> H(C1)
    C1-H -> C1=C6
    C6-O7 -> O7
end
'''
E1CB = '''step "second enolate" reversible
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "E1cB"
    :O3 -> C2=O3
    C1=C2 -> C1=C6
    C6-O7 -> O7
end
'''


def test_water_lost_with_the_leaving_oh_taking_the_alpha_proton_is_flagged():
    text = CLAISEN_SCHMIDT.format(dehydration=FOUR_CENTRE)
    d = only(text, "AR526")
    assert (d.loc.line, d.loc.column) == at(text, ":O7 -> H(C1)")
    assert "O7" in d.message and "C1" in d.message and "C6" in d.message and "hydroxide" in d.message
    assert "`C1-H -> C1=C2`, `C2=O3 -> O3`" in d.hint and "`C6-O7 -> O7`" in d.hint and "E1cB" in d.hint


def test_the_dehydration_by_way_of_the_enolate_is_clean():
    """The hinted fix: the textbook E1cB."""
    assert codes(CLAISEN_SCHMIDT.format(dehydration=E1CB)) == []


def test_a_four_centre_dehydration_without_a_carbonyl_beside_is_flagged():
    text = '''species alcohol = "C[CH2:1][CH:6](C)[OH:7]"
step "four-centre elimination"
    :O7 -> H(C1)
    C1-H -> C1=C6
    C6-O7 -> O7
end
'''
    d = only(text, "AR526")
    assert "protonated" in d.hint and "E1cB" not in d.hint


def test_a_carbonic_acid_monoester_losing_co2_is_not_judged():
    """Guard: the O-H proton taken by the alcohol as it leaves (a carbonic acid monoester losing CO2,
    as reagent guides draw it, from memory) stays the shorthand AR526 leaves alone."""
    text = '''species acid = "CC(C)(C)[O:8][C:6](=[O:7])[OH:5]"
step "loses CO2"
    :O8 -> H(O5)
    O5-H -> C6=O5
    C6-O8 -> O8
end
product "CC(C)(C)O.O=C=O"
'''
    assert "AR526" not in codes(text)


# --- 4. A proton taker left an onium beside an ate (AR531) ----------------------------------------
# The IBX oxidation of propan-2-ol (Kurti-Czako, from memory): ligand exchange at iodine(V), then
# the I=O oxygen takes the alpha C-H proton through a five-membered array as its pi pair returns to
# it. The ring's ester oxygen, bonded to iodine, taking the proton instead is left O+ beside I-.

IBX = '''species ibx = "[O:1]=[I:2]1([OH:3])[O:4]C(=O)c2ccccc21"
species alcohol = "C[CH:5](C)[OH:6]"
step "ligand exchange" under "DMSO, 25 °C"
    :O6 -> I2
    I2-O3 -> O3
end
step "proton transfer"
    :O3 -> H(O6)
    O6-H -> O6
end
step "elimination"
{elimination}end
product "CC(C)=O"
'''
OXO_TAKES_IT = "    :O1 -> H(C5)\n    C5-H -> C5=O6\n    O6-I2 -> I2\n    I2=O1 -> O1\n"
RING_OXYGEN_TAKES_IT = "    :O4 -> H(C5)\n    C5-H -> C5=O6\n    O6-I2 -> I2\n"


def test_the_ring_oxygen_of_ibx_taking_the_proton_is_flagged():
    text = IBX.format(elimination=RING_OXYGEN_TAKES_IT)
    d = only(text, "AR531")
    assert (d.loc.line, d.loc.column) == at(text, ":O4 -> H(C5)")
    assert "O4" in d.message and "I2" in d.message
    assert "`:O1 -> H(C5)` in place of `:O4 -> H(C5)`" in d.hint and "`I2=O1 -> O1`" in d.hint


def test_the_ibx_oxidation_by_its_oxo_oxygen_is_clean():
    """The hinted fix: the textbook step."""
    assert codes(IBX.format(elimination=OXO_TAKES_IT)) == []


def test_a_base_left_an_onium_beside_no_anion_is_not_judged():
    """Guard: water taking a proton in the Jones oxidation's last step ends as H3O+ beside nothing
    negative (Clayden, from memory)."""
    assert "AR531" not in codes(TEXTBOOK["chromic acid oxidation"][0])
