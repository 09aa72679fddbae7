"""Radical and organometallic slips that `arrows check` once passed or booked wrongly, each beside
the correct mechanism, which must stay clean. Sources are named per test; textbook outcomes are
from memory. The tests named `..._clean`, `..._not_judged` or `..._unchanged` are guards: they
passed before these checks were written too."""
import re
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))

from arrows import check_text  # noqa: E402
from verdicts import at, codes, findings, only  # noqa: E402

README = (Path(__file__).resolve().parent.parent / "README.md").read_text()


def notes(text: str, code: str) -> list[str]:
    _, diags = check_text(text, "case.mech")
    return [d.message for d in diags if d.code == code]


# --- 1. A dative bond in a species SMILES (AR102) --------------------------------------------------
# Oxidative addition of bromobenzene to Pd(PMe3)2 (Hartwig, Organotransition Metal Chemistry ch.6
# and 19, from memory). RDKit writes a phosphine on a metal as a dative bond, P->Pd, a pair that
# phosphorus gives; the bookkeeping books every bond as one electron from each atom (formal charge
# = V - N - B, IUPAC Gold Book), which left each P a radical and Pd 14 - 2 electrons short. The
# charge-separated bond (P+ to Pd-) books the same electrons: Pd(0)L2 at 14, ArPd(Br)L2 at 16.

OXIDATIVE_ADDITION = '''species pd = "{pd}"
species arene = "c1ccc[c:3](c1)[Br:2]"
step "oxidative addition"
    :Pd1 -> C3
    C3-Br2 -> Pd1-Br2
end
product "{product}"
'''
CHARGE_SEPARATED = "C[P+](C)(C)[Pd-2:1][P+](C)(C)C"
CHARGE_SEPARATED_PRODUCT = "C[P+](C)(C)[Pd-2](Br)(c1ccccc1)[P+](C)(C)C"


@pytest.mark.parametrize("pd,arrow", [
    ("CP(C)(C)->[Pd:1]<-P(C)(C)C", "->"),       # as RDKit writes it
    ("[Pd:1](<-P(C)(C)C)<-P(C)(C)C", "<-"),     # the arrow pointing back
])
def test_a_dative_bond_in_a_species_is_refused_at_its_arrow(pd, arrow):
    text = OXIDATIVE_ADDITION.format(pd=pd, product=CHARGE_SEPARATED_PRODUCT)
    d = only(text, "AR102")
    assert (d.loc.line, d.loc.column) == at(text, arrow)
    assert "dative bond" in d.message and "RDKit cannot read" not in d.message
    assert "`C[P+](C)(C)[Pd-]`" in d.hint
    assert codes(text) == ["AR102"]   # no AR530 radical on phosphorus any more


def test_a_coordinate_bond_of_a_cxsmiles_extension_is_refused_at_its_bar():
    text = OXIDATIVE_ADDITION.format(pd="CP(C)(C)[Pd:1]P(C)(C)C |C:1.0,5.4|", product=CHARGE_SEPARATED_PRODUCT)
    d = only(text, "AR102")
    assert (d.loc.line, d.loc.column) == at(text, "|C:")
    assert "dative bond" in d.message


def test_a_dative_bond_in_the_product_is_refused_at_its_arrow():
    product = "CP(C)(C)->[Pd](Br)(c1ccccc1)<-P(C)(C)C"
    text = OXIDATIVE_ADDITION.format(pd=CHARGE_SEPARATED, product=product)
    d = only(text, "AR102")
    assert (d.loc.line, d.loc.column) == at(text, "->[Pd](Br)")
    assert "checkpoint SMILES holds a dative bond" in d.message


def test_the_charge_separated_ligands_the_hint_proposes_are_clean():
    """Guard: the form the hint writes, with Pd at 14 then 16 valence electrons (N + 2B)."""
    trace, found = findings(OXIDATIVE_ADDITION.format(pd=CHARGE_SEPARATED, product=CHARGE_SEPARATED_PRODUCT))
    assert found == [], [d.to_text() for d in found]
    pd = next(a.GetIdx() for a in trace.final.mol.GetAtoms() if a.GetSymbol() == "Pd")
    shell = lambda state: state.nonbonding[pd] + 2 * state.bond_order_sum(pd)   # noqa: E731
    assert (shell(trace.initial), shell(trace.final)) == (14, 16)


# --- 2. A hydrogen atom set free (AR536) -----------------------------------------------------------
# Chlorination of methane (Clayden ch.39; March ch.14; from memory): Cl* takes a hydrogen atom
# from methane (HCl and CH3*), then CH3* takes Cl from Cl2. Written as Cl* bonding to carbon and
# letting H* go (SH2 at carbon), the step sets a hydrogen atom free, which radicals do not do in
# solution (common practice); AR518 already warned on the polar counterpart, a bare proton.

CHLORINATION = '''species chlorine = "[Cl:1][Cl:2]"
species methane = "[CH4:3]"
step "initiation" over "hv"
    Cl1-Cl2 ~> Cl1
    Cl1-Cl2 ~> Cl2
end
step "propagation: H abstraction"
{abstraction}end
step "propagation: Cl transfer"
    uses chlorine2 = "[Cl:4][Cl:5]"
    .C3 ~> C3-Cl4
    Cl4-Cl5 ~> C3-Cl4
    Cl4-Cl5 ~> Cl5
end
step "termination: two radicals combine"
    uses methyl = "[CH3:6]"
    .C6 ~> C6-Cl5
    .Cl5 ~> C6-Cl5
end
product "CCl.CCl"
'''
ABSTRACTION = "    .Cl1 ~> Cl1-H(C3)\n    C3-H ~> Cl1-H(C3)\n    C3-H ~> C3\n    releases Cl1\n"
SUBSTITUTION = "    .Cl1 ~> Cl1-C3\n    C3-H ~> Cl1-C3\n    C3-H ~> H(C3)\n"

SH2_AT_CARBON = '''species methane = "[CH4:1]"
species cl = "[Cl:2]"
step "substitution at carbon"
    .Cl2 ~> Cl2-C1
    C1-H ~> Cl2-C1
    C1-H ~> H(C1)
end
product "CCl.[H]"
'''


def test_the_methane_chlorination_chain_is_clean():
    """Guard: initiation under light, both propagation steps and a termination."""
    assert codes(CHLORINATION.format(abstraction=ABSTRACTION)) == []


def test_a_chlorine_atom_setting_a_hydrogen_atom_free_is_warned_at_its_fishhook():
    text = SH2_AT_CARBON
    d = only(text, "AR536")
    assert (d.loc.line, d.loc.column) == at(text, "C1-H ~> H(C1)")
    assert "H(C1) leaves C1 as a free hydrogen atom" in d.message
    assert "`.Cl2 ~> Cl2-H(C1)`, `C1-H ~> Cl2-H(C1)` and `C1-H ~> C1`" in d.hint
    assert codes(text) == ["AR536"]


def test_the_abstraction_the_hint_writes_is_clean():
    fixed = SH2_AT_CARBON.replace("    .Cl2 ~> Cl2-C1\n    C1-H ~> Cl2-C1\n    C1-H ~> H(C1)\n",
                                  "    .Cl2 ~> Cl2-H(C1)\n    C1-H ~> Cl2-H(C1)\n    C1-H ~> C1\n")
    assert codes(fixed.replace('product "CCl.[H]"', 'product "[CH3].Cl"')) == []


def test_the_substitution_inside_the_chain_is_warned_at_its_step():
    """The whole chain with the SH2 step (a15's twin): the step is flagged, not only the next one."""
    text = CHLORINATION.format(abstraction=SUBSTITUTION)
    d = next(d for d in findings(text)[1] if d.code == "AR536")
    assert (d.loc.line, d.loc.column) == at(text, "C3-H ~> H(C3)")


def test_a_mapped_hydrogen_is_named_by_its_own_number_in_the_hint():
    text = ('species thiol = "C[S:1][H:3]"\nspecies cl = "[Cl:2]"\nstep "substitution at sulfur"\n'
            "    .Cl2 ~> Cl2-S1\n    S1-H3 ~> Cl2-S1\n    S1-H3 ~> H3\nend\n")
    d = only(text, "AR536")
    assert "`.Cl2 ~> Cl2-H3`, `S1-H3 ~> Cl2-H3` and `S1-H3 ~> S1`" in d.hint


HOMOLYSIS = 'species ethane = "[CH3:1][CH3:2]"\nstep "C-H homolysis"{light}\n    C1-H ~> C1\n    C1-H ~> H(C1)\nend\n'


def test_a_thermal_c_h_homolysis_is_warned():
    d = only(HOMOLYSIS.format(light=""), "AR536")
    assert "a radical X take the hydrogen" in d.hint


def test_a_photolysis_is_not_judged():
    assert codes(HOMOLYSIS.format(light=' over "hv"')) == []


def test_a_bare_proton_is_ar518s_unchanged():
    """Guard: an E1's proton thrown off with no base (AR518) is not a hydrogen atom."""
    text = ('species cation = "[CH3:1][C+:2](C)C"\nstep "loss of a proton"\n    C1-H -> C1=C2\nend\n')
    assert codes(text) == ["AR518"]


# --- 3. A radical's 6-endo closure (AR601's note) --------------------------------------------------
# The hex-5-enyl radical closes 5-exo to the cyclopentylmethyl radical, about 98:2 over 6-endo
# (Beckwith; the radical-clock calibration, from memory), though both are Baldwin-favoured.

HEXENYL = '''species radical = "[CH2:1]CCC[CH:5]=[CH2:6]"
step "ring closure"
{closure}end
'''
SIX_ENDO = "    .C1 ~> C1-C6\n    C5=C6 ~> C1-C6\n    C5=C6 ~> C5\n"
FIVE_EXO = "    .C1 ~> C1-C5\n    C5=C6 ~> C1-C5\n    C5=C6 ~> C6\n"


def test_a_radical_6_endo_closure_names_the_5_exo_closure_onto_the_same_alkene():
    [note] = notes(HEXENYL.format(closure=SIX_ENDO), "AR601")
    assert note.startswith("C1-C6 closes a 6-membered ring: 6-endo-trig, favoured (Baldwin 1976); ")
    assert "C1 onto C5, the near end of the same alkene, would close a 5-membered ring, 5-exo-trig" in note
    assert "98:2" in note


def test_the_radical_5_exo_note_is_unchanged():
    assert notes(HEXENYL.format(closure=FIVE_EXO), "AR601") == [
        "C1-C5 closes a 5-membered ring: 5-exo-trig, favoured (Baldwin 1976)"]


def test_a_polar_6_endo_note_is_unchanged():
    """Guard: an alkoxide's 6-endo-trig conjugate addition (the alkene's far end carries the
    aldehyde) is a pair closure; the radical preference says nothing about it."""
    text = ('species alkoxide = "[O-:1]CCC[C:5]([CH:7]=[O:8])=[CH2:6]"\nstep "oxa-Michael closure"\n'
            "    :O1 -> O1-C6\n    C5=C6 -> C5=C7\n    C7=O8 -> O8\nend\n")
    [note] = notes(text, "AR601")
    assert note == "O1-C6 closes a 6-membered ring: 6-endo-trig, favoured (Baldwin 1976)"


# --- 4. What is not judged: chain bookkeeping, metal regiochemistry and geometry (README) -----------
# A "propagation" that joins two radicals ends the chain (Clayden ch.39, from memory); the labels are
# not read, so it checks clean, and the README says so. Likewise a reductive elimination of two
# aryls written trans at square-planar palladium (it needs them cis: Hartwig ch.8, from memory).

TERMINATION_AS_PROPAGATION = '''species radical = "CCCC[CH:1]CC(Cl)(Cl)Cl"
species cl = "[Cl:2]"
step "propagation: Cl transfer"
    .C1 ~> C1-Cl2
    .Cl2 ~> C1-Cl2
end
product "CCCCC(Cl)CC(Cl)(Cl)Cl"
'''
TRANS_ELIMINATION = '''species pd = "C[P+](C)(C)[Pd@SP1-2:1]([c:3]1ccccc1)([P+](C)(C)C)[c:4]1ccccc1"
step "reductive elimination"
    Pd1-C3 -> C3-C4
    Pd1-C4 -> Pd1
end
product "c1ccc(cc1)-c1ccccc1.C[P+](C)(C)[Pd-2][P+](C)(C)C"
'''


def _readme_says(*phrases: str) -> bool:
    flat = re.sub(r"\s+", " ", README)
    return all(p in flat for p in phrases)


def test_chain_bookkeeping_is_not_judged_and_the_readme_says_so():
    assert codes(TERMINATION_AS_PROPAGATION) == []
    assert _readme_says("Initiation, propagation and termination are labels, not judged")


def test_square_planar_geometry_is_not_judged_and_the_readme_says_so():
    assert codes(TRANS_ELIMINATION) == []
    assert _readme_says("`@SP` keeps it through the steps", "stand cis is not judged")


@pytest.mark.parametrize("phrases", [
    ("which end of an alkene an M-H or B-H bond adds to",),
    ("1,2- versus 2,1-insertion",),
    ("1,2- versus 1,4-addition of a cuprate",),
    ("a Suzuki transmetalation from a neutral boronic acid with no base",),
    ("Which hydrogen a radical abstracts is judged only where",),
    ("a SMILES that writes one as RDKit does (`CP(C)(C)->[Pd]`) is refused (AR102)",),
], ids=["M-H end", "insertion", "cuprate", "Suzuki base", "which H", "ligands"])
def test_the_readme_lists_what_is_not_judged(phrases):
    assert _readme_says(*phrases)


# --- 5. Correct radical chains stay clean ----------------------------------------------------------
# Tin hydride reductive cyclisation of 1-allyloxy-2-bromobenzene (Zard, Radical Reactions in Organic
# Synthesis ch.5; Clayden ch.39; from memory), with a mapped tin hydride hydrogen.

ARYL_RADICAL_5_EXO = '''species bromide = "[Br:1][c:2]1[cH:3][cH:4][cH:5][cH:6][c:7]1[O:8][CH2:9][CH:10]=[CH2:11]"
species stannyl = "CCCC[Sn:12](CCCC)CCCC"
step "Br abstraction" under "Bu3SnH, AIBN, benzene, reflux"
    .Sn12 ~> Sn12-Br1
    C2-Br1 ~> Sn12-Br1
    C2-Br1 ~> C2
end
step "5-exo-trig ring closure"
    .C2 ~> C2-C10
    C10=C11 ~> C2-C10
    C10=C11 ~> C11
end
step "H transfer from Bu3SnH"
    uses stannane = "CCCC[Sn:13](CCCC)(CCCC)[H:14]"
    .C11 ~> C11-H14
    Sn13-H14 ~> C11-H14
    Sn13-H14 ~> Sn13
end
product "CC1COc2ccccc21"
'''


def test_the_tin_hydride_cyclisation_is_clean():
    assert codes(ARYL_RADICAL_5_EXO) == []
