"""Slips in reductions, olefinations and enol chemistry that `arrows check` once passed (or hinted at
wrongly), each beside the correct mechanism, which must stay clean. Sources are named per test;
textbook outcomes are from memory. The tests named `..._clean`, `..._not_judged` and
`..._has_no_silylium` are guards: they passed before these checks were written too."""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import TEXTBOOK  # noqa: E402

from verdicts import codes, only  # noqa: E402


# --- 1. A carbocation left beside an alkoxide (AR528) --------------------------------------------
# The crossed Cannizzaro reaction (Clayden, from memory): hydroxide adds to formaldehyde and the
# adduct's O- pushes a hydride onto benzaldehyde as it re-forms C=O, all in one step. Without the
# push the hydride leaves a carbocation beside O-, the charge-separated form of formic acid's C=O.

CANNIZZARO = '''species formaldehyde = "[CH2:1]=[O:2]"
species aldehyde = "c1ccccc1[CH:3]=[O:4]"
species base = "[OH-:5]"
step "hydroxide adds to formaldehyde"
    :O5 -> C1
    C1=O2 -> O2
end
step "hydride transfer"
{push}    C1-H -> C3-H(C1)
    C3=O4 -> O4
end
step "proton transfer"
    :O4 -> H(O5)
    O5-H -> O5
end
product "OCc1ccccc1"
'''


def test_a_hydride_leaving_beside_an_alkoxide_without_its_push_is_flagged():
    d = only(CANNIZZARO.format(push=""), "AR528")
    assert (d.loc.line, d.loc.column) == (9, 5)   # at the hydride's arrow
    assert "C1" in d.message and "O2" in d.message
    assert "add `:O2 -> C1=O2` to this step" in d.hint


def test_the_cannizzaro_with_its_push_is_clean():
    """The hinted fix is the textbook step."""
    assert codes(CANNIZZARO.format(push="    :O2 -> C1=O2\n")) == []
    assert codes(TEXTBOOK["cannizzaro"][0]) == []


# The Meerwein-Ponndorf-Verley reduction (Clayden, Kurti-Czako, from memory): in its six-membered
# transition state the Al-O pair goes into acetone's C=O as the hydride leaves. Sent onto the
# oxygen alone, it leaves a cation beside O-.
MPV = '''species alkoxide = "C[CH:1](C)[O:2][Al:3]([O:4]C(C)C)[O:5]C(C)C"
species aldehyde = "c1ccccc1[CH:7]=[O:6]"
step "coordination"
    :O6 -> Al3
end
step "hydride transfer"
    C1-H -> C7-H(C1)
    C7=O6 -> O6
    Al3-O2 -> {sink}
end
step "work-up"
    uses acid = "[OH3+:10]"
    Al3-O6 -> O6-H(O10)
    O10-H -> O10
end
product "OCc1ccccc1"
'''


def test_a_pair_sent_onto_the_alkoxide_instead_of_into_the_c_o_is_flagged():
    d = only(MPV.format(sink="O2"), "AR528")
    assert "write `Al3-O2 -> C1=O2` in place of `Al3-O2 -> O2`" in d.hint


def test_the_meerwein_ponndorf_verley_transfer_is_clean():
    assert codes(MPV.format(sink="C1=O2")) == []
    assert codes(TEXTBOOK["meerwein-ponndorf-verley"][0]) == []


ENOLATE = '''species enolate = "C[C:2]([O-:1])=[CH2:3]"
step "charge-separated form"{kind}
    C2=C3 -> C3
end
'''


def test_a_charge_separated_contributor_drawn_as_resonance_is_not_judged():
    """A `resonance` step draws a contributor on purpose; drawn as a step, the same arrow leaves a
    cation beside O- (and a carbanion: AR514)."""
    assert "AR528" not in codes(ENOLATE.format(kind=" resonance"))
    assert "AR528" in codes(ENOLATE.format(kind=""))


def test_a_cation_beside_an_alkoxide_before_the_step_is_not_judged():
    """Acetone written charge-separated by the author; the step only passes a proton between two
    waters' worth of other species."""
    text = '''species ketone = "C[C+:2]([O-:1])C"
species acid = "[OH3+:5]"
species base = "[OH-:6]"
step "proton transfer"
    :O6 -> H(O5)
    O5-H -> O5
end
'''
    assert "AR528" not in codes(text)


# --- 2. A bare silylium or sulfonyl cation (AR511) -----------------------------------------------
# The Peterson elimination (Clayden, Kurti-Czako, from memory): the alkoxide bonds to silicon (a
# pentacoordinate silicate) before the C-Si pair makes the C=C; in acid a nucleophile takes the
# silyl group as water leaves. R3Si+ and RSO2+ are not free in solution (common practice).

SILYLIUM = '''species silane = "C[Si:1](C)(C)[CH2:2][C:3](C)(C)[OH2+:4]"
step "elimination"
    C2-Si1 -> C2=C3
    C3-O4 -> O4
end
product "C=C(C)C"
'''

PETERSON = '''species silyl = "C[Si:1](C)(C)[CH2:2][Li:9]"
species ketone = "[O:4]=[C:3]1CCCCC1"
step "addition"
    C2-Li9 -> C2-C3
    C3=O4 -> O4
end
{middle}step "syn elimination"
    C2-Si1 -> C2=C3
    C3-O4 -> O4
end
product "C=C1CCCCC1"
'''
SILICATE = 'step "silicate"\n    :O4 -> Si1\nend\n'
PROTONATION = 'step "protonation"\n    uses water = "[OH2:20]"\n    :O4 -> H(O20)\n    O20-H -> O20\nend\n'


def test_a_silylium_ion_made_by_a_step_is_flagged():
    d = only(SILYLIUM, "AR511")
    assert "Si1" in d.message and "silylium" in d.message
    assert "Peterson" in d.hint


def test_the_protonated_peterson_alkoxide_leaving_a_bare_silyl_cation_is_flagged():
    """What AR510's former hint ("protonate O4") led to."""
    d = only(PETERSON.format(middle=PROTONATION), "AR511")
    assert "silylium" in d.message


def test_the_peterson_through_its_silicate_has_no_silylium():
    found = codes(PETERSON.format(middle=SILICATE))
    assert "AR511" not in found and "AR510" not in found
    assert "AR511" not in codes(TEXTBOOK["peterson"][0])


# The Julia-Kocienski olefination (Kurti-Czako, from memory): the alkoxide attacks the
# benzothiazole's ipso carbon (a Smiles rearrangement) before SO2 and the aryloxide leave.
JULIA = '''species sulfone = "[CH3:1][CH2:2][S:3](=[O:4])(=[O:5])[c:6]1[n:7]c2ccccc2[s:8]1"
species base = "C[Si](C)(C)[N-:9][Si](C)(C)C"
species aldehyde = "CC[CH:10]=[O:11]"
step "sulfonyl carbanion"
    :N9 -> H(C2)
    C2-H -> C2
end
step "addition"
    :C2 -> C10
    C10=O11 -> O11
end
{rest}product "CC=CCC"
'''
JULIA_SMILES = '''step "Smiles: ipso attack"
    :O11 -> C6
    C6=N7 -> N7
end
step "Smiles: sulfinate leaves"
    :N7 -> C6=N7
    C6-S3 -> S3
    S3=O4 -> O4
end
step "elimination of SO2 and the aryloxide"
    :O4 -> S3=O4
    C2-S3 -> C2=C10
    C10-O11 -> O11
end
'''
ELIMINATION = 'step "elimination"\n    C2-S3 -> C2=C10\n    C10-O11 -> O11\nend\n'
JULIA_PROTONATION = 'step "protonation"\n    uses water = "[OH2:20]"\n    :O11 -> H(O20)\n    O20-H -> O20\nend\n'


def test_a_sulfonyl_cation_made_by_a_step_is_flagged():
    d = only(JULIA.format(rest=JULIA_PROTONATION + ELIMINATION), "AR511")
    assert "S3" in d.message and "sulfonyl cation" in d.message


def test_the_julia_kocienski_through_its_smiles_rearrangement_is_clean():
    assert codes(JULIA.format(rest=JULIA_SMILES)) == []


# --- 3. AR510's hint for an oxide pushed off by a C-Si or C-S pair -------------------------------

def test_the_oxide_leaving_in_a_peterson_is_told_to_bond_to_silicon_first():
    """"Protonate O4" would lead to the bare silyl cation above; the silicate is the textbook route
    and the hinted fix checks free of AR510 and AR511."""
    d = only(PETERSON.format(middle=""), "AR510")
    assert "`:O4 -> Si1`" in d.hint and "silicate" in d.hint
    assert "protonate O4 in an earlier step" not in d.hint


def test_the_oxide_leaving_a_sulfone_is_told_to_bond_to_sulfur_or_the_ipso_carbon_first():
    d = only(JULIA.format(rest=ELIMINATION), "AR510")
    assert "`:O11 -> S3` with `S3=O4 -> O4`" in d.hint and "C6" in d.hint and "Smiles" in d.hint
    hinted = JULIA.format(rest='step "addition at S"\n    :O11 -> S3\n    S3=O4 -> O4\nend\n' + ELIMINATION)
    found = codes(hinted)
    assert "AR510" not in found and "AR511" not in found and not [c for c in found if c < "AR500"]


# --- 4. AR525's hint where the leaving group is a hydride ----------------------------------------
# The Tishchenko reaction (March, Kurti-Czako, from memory): the alkoxide adds to one aldehyde and
# the tetrahedral intermediate hands a hydride to a second aldehyde as its O- re-forms C=O.

TISHCHENKO = '''species alkoxide = "c1ccccc1[CH2:10][O-:11]"
species aldehyde = "c1ccccc1[CH:1]=[O:2]"
species aldehyde2 = "c1ccccc1[CH:3]=[O:4]"
{steps}product "O=C(OCc1ccccc1)c1ccccc1"
'''
ONE_STEP = 'step "addition with hydride loss"\n    :O11 -> C1\n    C1-H -> C3-H(C1)\n    C3=O4 -> O4\nend\n'
TWO_STEPS = ('step "addition"\n    :O11 -> C1\n    C1=O2 -> O2\nend\n'
             'step "hydride"\n    :O2 -> C1=O2\n    C1-H -> C3-H(C1)\n    C3=O4 -> O4\nend\n')


def test_the_concerted_tishchenko_hint_writes_the_hydride_and_the_acceptor_moves():
    d = only(TISHCHENKO.format(steps=ONE_STEP), "AR525")
    assert ("then `:O2 -> C1=O2` with `C1-H -> C3-H(C1)` and `C3=O4 -> O4` in a step of its own"
            in d.hint), d.hint
    assert "C1-H(C1)" not in d.hint


def test_the_hinted_tishchenko_is_clean():
    assert codes(TISHCHENKO.format(steps=TWO_STEPS)) == []
    assert codes(TEXTBOOK["tishchenko"][0]) == []


# --- 5. A hydridic hydrogen taken as a proton (AR508) --------------------------------------------
# A B-H, Al-H or Si-H hydrogen leaves with its pair (a hydride: the NaBH4 reduction, hydroboration);
# the alkoxide of a reduction is protonated by water, an alcohol or the work-up acid (common practice).

BH_AS_PROTON = '''species alkoxide = "CC([O-:2])c1ccccc1"
species borane = "[{hydride}:4]"
step "protonation"
    :O2 -> H({element}4)
    {element}4-H -> {element}4
end
'''


def test_an_alkoxide_taking_a_borane_hydrogen_as_a_proton_is_flagged():
    d = only(BH_AS_PROTON.format(hydride="BH3", element="B"), "AR508")
    assert (d.loc.line, d.loc.column) == (4, 5)
    assert "hydridic" in d.message and "H(B4)" in d.message
    assert "`:O2 -> H(O5)` with `O5-H -> O5`" in d.hint


def test_silane_and_alane_hydrogens_are_hydridic_too():
    assert "hydridic" in only(BH_AS_PROTON.format(hydride="SiH4", element="Si"), "AR508").message
    assert "hydridic" in only(BH_AS_PROTON.format(hydride="AlH3", element="Al"), "AR508").message


def test_hydride_reductions_and_a_tin_hydrogen_atom_stay_clean():
    """The hydride moves with its pair (hydroboration, LiAlH4), or as an atom by fishhooks (Bu3SnH)."""
    for key in ("hydroboration", "stannane reduction", "meerwein-ponndorf-verley"):
        assert "AR508" not in codes(TEXTBOOK[key][0]), key


# --- 6. A C-H pair bonding an electrophile as a base takes the proton (AR529) --------------------
# The Mannich reaction in acid (Clayden, from memory): the ketone's enol attacks the iminium ion.

MANNICH = '''species ketone = "[CH3:5][C:6](=[OH+:7])C"
species iminium = "C[N+:1](C)=[CH2:2]"
species water = "[OH2:10]"
{steps}product "CN(C)CCC(C)=[OH+]"
'''
SKIPPED = 'step "C-H adds to the iminium ion"\n    :O10 -> H(C5)\n    C5-H -> C5-C2\n    C2=N1 -> N1\nend\n'
THROUGH_ENOL = ('step "enol"\n    :O10 -> H(C5)\n    C5-H -> C5=C6\n    C6=O7 -> O7\nend\n'
                'step "enol adds"\n    :O7 -> C6=O7\n    C5=C6 -> C5-C2\n    C2=N1 -> N1\nend\n')


def test_a_c_h_pair_bonding_as_its_proton_is_taken_is_flagged():
    d = only(MANNICH.format(steps=SKIPPED), "AR529")
    assert (d.loc.line, d.loc.column) == (6, 5)   # at `C5-H -> C5-C2`
    assert ("`:O10 -> H(C5)` with `C5-H -> C5=C6` and `C6=O7 -> O7`" in d.hint
            and "`:O7 -> C6=O7` with `C5=C6 -> C5-C2` and `C2=N1 -> N1`" in d.hint), d.hint


def test_the_mannich_through_its_enol_is_clean():
    assert codes(MANNICH.format(steps=THROUGH_ENOL)) == []
    assert "AR529" not in codes(TEXTBOOK["mannich"][0])


def test_an_ene_reaction_and_a_carbene_insertion_are_not_judged():
    """The ene reaction moves its hydrogen round a ring of six (pericyclic); a singlet carbene
    takes the hydrogen and bonds to the carbon at once (an insertion, common practice)."""
    assert "AR529" not in codes(TEXTBOOK["ene reaction"][0])
    insertion = ('species methane = "[CH4:1]"\nspecies carbene = "F[C:2]F"\n'
                 'step "insertion"\n    :C2 -> H(C1)\n    C1-H -> C1-C2\nend\n')
    assert "AR529" not in codes(insertion)


# --- AR504 at a phosphorus that keeps its P=O as a fifth single bond forms -----------------------
# A phosphonate's P (a P=O and three single bonds) holds ten valence electrons; the Horner-Wadsworth-
# Emmons alkoxide bonding to it makes the oxaphosphetane with the P=O pair going onto O (Clayden,
# Kurti and Czako, memory). Kept, P would hold twelve, which phosphorus reaches only in a
# hexacoordinate anion (PF6-; common practice).
HWE = '''species phosphonate = "CC[O:20][P:1](=[O:2])([O:21]CC)[CH2:3][C:4](=[O:5])OCC"
species base = "CC[O-:6]"
species aldehyde = "CC[CH:7]=[O:8]"
step "phosphonate enolate" reversible
    :O6 -> H(C3)
    C3-H -> C3=C4
    C4=O5 -> O5
end
step "addition" reversible
    :O5 -> C4=O5
    C3=C4 -> C3-C7
    C7=O8 -> O8
end
step "oxaphosphetane"
    :O8 -> P1
{push}end
step "cycloreversion"
{back}    P1-C3 -> C3=C7
    C7-O8 -> O8
end
product "CCOC(=O)C=CCC"
'''


def test_a_phosphonate_p_keeping_its_p_o_as_it_closes_the_oxaphosphetane_is_told_to_move_it():
    d = only(HWE.format(push="", back=""), "AR504")
    assert "12 valence electrons" in d.message and "twelve beside a double bond" in d.message
    assert "`P1=O2 -> O2` in the same step" in d.hint


def test_the_hinted_oxaphosphetane_has_no_expanded_octet_warning():
    text = HWE.format(push="    P1=O2 -> O2\n", back="    :O2 -> P1=O2\n")
    assert "AR504" not in codes(text)
