"""Hydrogen-atom transfers between radicals judged by bond dissociation enthalpies (AR535). Values:
Blanksby & Ellison, Acc. Chem. Res. 36, 255 (2003); Luo, Comprehensive Handbook of Chemical Bond
Energies (2007) for Sn-H; from memory. The tests named `..._guard` passed before the check too."""
import pytest
from rdkit import Chem

from arrows.judgement.acidity import perceived
from arrows.judgement.bond_energies import x_h_energy
from verdicts import at, codes, only

# Allylic bromination of cyclohexene (Wohl-Ziegler; Clayden, from memory): a bromine atom takes the
# allylic C3-H (~89 kcal/mol for H-Br's 87.5). Taking the vinylic C1-H (~111) is 24 uphill.
CYCLOHEXENE = '''species alkene = "[CH:1]1=[CH:2][CH2:3][CH2:4][CH2:5][CH2:6]1"
species br = "[Br:7]"
step "H abstraction"
    .Br7 ~> Br7-H({c})
    {c}-H ~> Br7-H({c})
    {c}-H ~> {c}
end
'''


def test_a_bromine_atom_taking_the_allylic_hydrogen_is_clean_guard():
    assert codes(CYCLOHEXENE.format(c="C3")) == []


def test_a_bromine_atom_taking_a_vinylic_hydrogen_is_flagged_and_the_hint_names_the_allylic_one():
    text = CYCLOHEXENE.format(c="C1")
    d = only(text, "AR535")
    assert (d.loc.line, d.loc.column) == at(text, ".Br7 ~> Br7-H(C1)")
    assert "a vinylic C-H" in d.message and "H-Br" in d.message and "24 kcal/mol" in d.message
    assert "weakest X-H of that molecule is at C3 (an allylic or benzylic C-H" in d.hint


# Tin hydride reductions (Zard, Radical Reactions in Organic Synthesis; from memory): the carbon
# radical takes the weak Sn-H (~74) and makes a C-H (~99); a tin radical does not take a C-H back.
TIN = '''species radical = "[CH:1]1[CH2:2][CH2:3][CH2:4][CH2:5][CH2:6]1"
species tin = "CCCC[SnH:7](CCCC)CCCC"
species alkane = "[CH2:11]1[CH2:12][CH2:13][CH2:14][CH2:15][CH2:16]1"
step "H transfer"
{moves}end
'''


def test_a_carbon_radical_taking_the_tin_hydride_hydrogen_is_clean_guard():
    assert codes(TIN.format(moves="    .C1 ~> C1-H(Sn7)\n    Sn7-H ~> C1-H(Sn7)\n    Sn7-H ~> Sn7\n")) == []


def test_a_tin_radical_taking_a_c_h_is_flagged():
    moves = ("    Sn7-H ~> C1-H(Sn7)\n    Sn7-H ~> Sn7\n    .C1 ~> C1-H(Sn7)\nend\n"
             "step \"back\"\n    .Sn7 ~> Sn7-H(C11)\n    C11-H ~> Sn7-H(C11)\n    C11-H ~> C11\n")
    d = only(TIN.format(moves=moves), "AR535")
    assert "a secondary alkyl C-H" in d.message and "a tin hydride Sn-H" in d.message


@pytest.mark.parametrize("smiles,atom,bond", [
    ("C1=CCCCC1", 0, "a vinylic C-H"), ("C1=CCCCC1", 2, "an allylic or benzylic C-H"),
    ("Cc1ccccc1", 0, "an allylic or benzylic C-H"), ("C1CCOC1", 2, "a C-H beside an ether or alcohol O"),
    ("CC(C)C", 1, "a tertiary alkyl C-H"), ("CC=O", 1, "an aldehyde C-H"), ("OO", 0, "a hydroperoxide O-H"),
])
def test_the_bond_table_reads_each_hydrogen_by_its_own_entry(smiles, atom, bond):
    """The first matching entry wins: the specific ones (allylic, alpha-oxygen, formyl) stand
    before the general alkyl and vinylic ones (Blanksby & Ellison's classes)."""
    assert x_h_energy(perceived(Chem.MolFromSmiles(smiles)), atom).bond == bond
