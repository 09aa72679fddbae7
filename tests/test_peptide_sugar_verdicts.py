"""Slips in peptide, carbohydrate and nucleic-acid mechanisms that `arrows check` once passed, each
beside a correct form, which must stay clean. Sources are named per test; textbook outcomes are
from memory. The tests named `..._clean` or `..._not_judged` are guards: they passed before these
checks were written too."""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from verdicts import at, codes, only  # noqa: E402


# --- 1. A configuration written as kept at a centre the steps racemise (AR603) --------------------
# An aldehyde's alpha stereocentre is lost through its enolate, which is achiral: reprotonation
# from either face gives the racemate (Clayden, enolisation and racemisation, from memory).

ENOLISATION = '''species aldehyde = "[CH3:1][C@H:2](c1ccccc1)[CH:3]=[O:4]"
species base = "[OH-:5]"
step "enolate" reversible
    :O5 -> H(C2)
    C2-H -> C2=C3
    C3=O4 -> O4
end
step "reprotonation at C2 from either face" reversible
    :O4 -> C3=O4
    C2=C3 -> C2-H(O5)
    O5-H -> O5
{expect}end
{product}'''


def test_product_written_as_kept_after_an_enolisation_warns():
    text = ENOLISATION.format(expect="", product='product "C[C@H](c1ccccc1)C=O"\n')
    d = only(text, "AR603")
    assert "C2 written (R), as it was before step 1, but the steps racemise C2" in d.message
    assert "forms as the racemate" in d.message
    assert (d.loc.line, d.loc.column) == at(text, "product")


def test_checkpoint_written_as_kept_after_an_enolisation_warns():
    text = ENOLISATION.format(expect='    expect "C[C@H](c1ccccc1)C=O"\n', product="")
    d = only(text, "AR603")
    assert "checkpoint" in d.message and "C2 written (R)" in d.message
    assert d.loc.line == at(text, "expect")[0]


def test_product_written_without_configuration_after_an_enolisation_clean():
    assert codes(ENOLISATION.format(expect="", product='product "CC(c1ccccc1)C=O"\n')) == []


def test_product_written_as_the_mirror_image_not_judged():
    # A racemase turns one enantiomer into the other in a turnover (mandelate racemase: Gerlt &
    # Gassman, from memory); its chiral site is not in the bookkeeping: a configuration written
    # the other way is not a claim of retention.
    assert codes(ENOLISATION.format(expect="", product='product "C[C@@H](c1ccccc1)C=O"\n')) == []


def test_centre_cleared_beside_a_kept_centre_not_judged():
    # A second configured centre stays in the molecule: the reprotonation's face is substrate
    # controlled and may be selective, which the bookkeeping does not judge.
    text = '''species aldehyde = "C[C@@H](O)[C@H:2](c1ccccc1)[CH:3]=[O:4]"
species base = "[OH-:5]"
step "enolate" reversible
    :O5 -> H(C2)
    C2-H -> C2=C3
    C3=O4 -> O4
end
step "reprotonation" reversible
    :O4 -> C3=O4
    C2=C3 -> C2-H(O5)
    O5-H -> O5
end
product "C[C@@H](O)[C@H](c1ccccc1)C=O"
'''
    assert codes(text) == []


# The oxazolone route: an N-acyl amino acid chloride closes the 5(4H)-oxazolone, whose C4-H is
# taken by Et3N to give the aromatic oxazol-5-olate; the coupled product is racemic (Benoiton,
# Chemistry of Peptide Synthesis ch.4; Montalbetti & Falque, Tetrahedron 2005; from memory).
OXAZOLONE = '''species chloride = "c1ccccc1[C:5](=[O:6])[NH:7][C@@H:4](C)[C:1](=[O:2])[Cl:3]"
species base = "CC[N:50](CC)CC"
species base2 = "CC[N:51](CC)CC"
species amine = "[NH2:30]CC(=O)OC"
step "the amide oxygen adds to the acyl chloride"
    :O6 -> C1
    C1=O2 -> O2
end
step "chloride leaves"
    :O2 -> C1=O2
    C1-Cl3 -> Cl3
end
step "Et3N takes the N-H: the 5(4H)-oxazolone"
    :N50 -> H(N7)
    N7-H -> C5=N7
    C5=O6 -> O6
    expect "C[C@@H]1N=C(c2ccccc2)OC1=O"
end
step "Et3N takes C4-H: aromatic oxazol-5-olate" reversible
    :N51 -> H(C4)
    C4-H -> C1=C4
    C1=O2 -> O2
end
step "reprotonation at C4 from either face" reversible
    :O2 -> C1=O2
    C1=C4 -> C4-H(N51)
    N51-H -> N51
end
step "the amine opens the oxazolone"
    :N30 -> C1
    C1=O2 -> O2
end
step "collapse: the ring oxygen leaves"
    :O2 -> C1=O2
    C1-O6 -> O6
end
step "Et3NH+ protonates the imidate nitrogen"
    :N7 -> H(N50)
    N50-H -> N50
end
step "the benzamide" resonance
    :O6 -> C5=O6
    C5=N7 -> N7
end
step "Et3N takes the N-H proton"
    :N50 -> H(N30)
    N30-H -> N30
end
product "{product}"
'''


def test_dipeptide_written_l_after_oxazolone_racemisation_warns():
    d = only(OXAZOLONE.format(product="c1ccccc1C(=O)N[C@@H](C)C(=O)NCC(=O)OC"), "AR603")
    assert "C4 written (S), as it was before step 4" in d.message


def test_dipeptide_written_racemic_after_oxazolone_racemisation_clean():
    # The oxazolone checkpoint keeps its L configuration (written before the C4-H is taken).
    assert codes(OXAZOLONE.format(product="c1ccccc1C(=O)NC(C)C(=O)NCC(=O)OC")) == []


# --- 2. A glycosyl donor's basic leaving group pushed out unactivated (AR534) --------------------
# Glycosyl trichloroacetimidates, esters and phosphates ionise only once activated: the imidate N
# protonated (TfOH, TMSOTf), the ester's carbonyl bonded to a Lewis acid (BF3.OEt2) (Schmidt &
# Michel, Angew. Chem. 1980; Demchenko, Handbook of Chemical Glycosylation; from memory). A
# glycosyl triflate ionises unaided (common practice).

IMIDATE = '''species donor = "ClC(Cl)(Cl)[C:5](=[NH:6])[O:3][CH:1]1[O:2]CCCC1"
{acid}step "the imidate leaves: oxocarbenium ion"
    :O2 -> C1=O2
    C1-O3 -> C5=O3
    C5=N6 -> N6
end
'''


def test_imidate_leaving_as_the_amide_anion_warns():
    text = IMIDATE.format(acid="")
    d = only(text, "AR534")
    assert "its pair passed on to N6, as an amidate" in d.message
    assert "activate N6" in d.hint and "TMSOTf" in d.hint and "BF3" in d.hint
    assert (d.loc.line, d.loc.column) == at(text, "C1-O3 -> C5=O3")


def test_imidate_hint_names_the_acid_at_hand():
    text = IMIDATE.format(acid='species acid = "[OH:60]S(=O)(=O)C(F)(F)F"\n')
    assert "`:N6 -> H(O60)` with `O60-H -> O60`" in only(text, "AR534").hint


def test_imidate_leaving_as_its_oxygen_anion_warns():
    text = '''species donor = "ClC(Cl)(Cl)[C:5](=[NH:6])[O:3][CH:1]1[O:2]CCCC1"
step "the imidate leaves"
    :O2 -> C1=O2
    C1-O3 -> O3
end
'''
    d = only(text, "AR534")
    assert "as an amidate" in d.message and "activate N6" in d.hint


def test_protonated_imidate_leaving_clean():
    text = '''species donor = "ClC(Cl)(Cl)[C:5](=[NH:6])[O:3][CH:1]1[O:2]CCCC1"
species acid = "[OH:7]S(=O)(=O)C(F)(F)F"
step "TfOH protonates the imidate nitrogen"
    :N6 -> H(O7)
    O7-H -> O7
end
step "trichloroacetamide leaves"
    :O2 -> C1=O2
    C1-O3 -> C5=O3
    C5=N6 -> N6
end
'''
    assert codes(text) == []


ESTER = '''species donor = "C[C:5](=[O:6])[O:3][CH:1]1[O:2]CCCC1"
{promoter}step "acetate leaves"
    :O2 -> C1=O2
{moves}end
'''


def test_glycosyl_acetate_leaving_as_carboxylate_warns():
    d = only(ESTER.format(promoter="", moves="    C1-O3 -> O3\n"), "AR534")
    assert "as a carboxylate (pKa of a carboxylic acid ~4.8)" in d.message


def test_glycosyl_acetate_leaving_through_its_carbonyl_warns():
    d = only(ESTER.format(promoter="", moves="    C1-O3 -> C5=O3\n    C5=O6 -> O6\n"), "AR534")
    assert "its pair passed on to O6" in d.message and "activate O6" in d.hint


def test_glycosyl_acetate_on_bf3_leaving_clean():
    promoter = 'species bf3 = "F[B:7](F)F"\nstep "BF3 binds the carbonyl oxygen"\n    :O6 -> B7\nend\n'
    assert codes(ESTER.format(promoter=promoter, moves="    C1-O3 -> C5=O3\n    C5=O6 -> O6\n")) == []


def test_glycosyl_triflate_ionising_not_judged():
    text = '''species donor = "FC(F)(F)S(=O)(=O)[O:3][CH:1]1[O:2]CCCC1"
step "triflate leaves"
    :O2 -> C1=O2
    C1-O3 -> O3
end
'''
    assert codes(text) == []


def test_oxygen_nucleophile_at_an_acyl_carbon_not_judged():
    # HOBt's oxygen bonding to an O-acylisourea's carbonyl carbon is a nucleophile, not a
    # neighbour's push: AR525 (no tetrahedral intermediate) only (Montalbetti & Falque 2005).
    text = '''species ester = "CC[C:1](=[O:2])[O:3][C:11](=[N:10]C)[NH:12]C"
species hobt = "[OH:20][n:21]1nnc2ccccc21"
step "HOBt displaces the isourea"
    :O20 -> C1
    C1-O3 -> O3
end
'''
    assert codes(text) == ["AR525"]
