"""Checkpoints compare what the moves give with what the author wrote (RDKit canonical SMILES as
the judge of "same structure")."""
from pathlib import Path

from arrows import check_text

CYANOHYDRIN = '''
species ald = "[CH3:1][CH:2]=[O:3]"
species cn = "[C-:4]#[N:5]"
step "cyanide addition"
    :C4 -> C2
    C2=O3 -> O3
    expect "{expect}"
end
'''


def _errors(expect: str):
    _, diags = check_text(CYANOHYDRIN.format(expect=expect))
    return [d for d in diags if d.severity == "error"]


def test_a_checkpoint_written_with_configuration_is_compared_as_its_constitution():
    """Cyanide adds to either face of acetaldehyde (textbook cyanohydrin formation: racemic, memory);
    the engine follows electrons, not configuration, so an @-labelled alkoxide still matches."""
    assert _errors("C[C@H]([O-])C#N") == []
    assert _errors("C[C@@H]([O-])C#N") == []


def test_a_wrong_constitution_still_fails_with_configuration_written():
    errors = _errors("C[C@H](O)C#N")   # the neutral cyanohydrin: the proton transfer has not happened
    assert [d.code for d in errors] == ["AR401"]
    assert "proton transfer" in errors[0].message


LABELLED = '''
species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species deuteroxide = "[2H:7][O-:5]"
species water = "[2H:8][O:6][2H:9]"
step "enolate"
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "deuteration"
    :O3 -> C2=O3
    C1=C2 -> C1-H8
    O6-H8 -> O6
    expect "{expect}"
end
'''


def test_a_checkpoint_keeps_isotope_labels_apart():
    """Deuterium exchange at the alpha carbon of acetone (textbook base-catalysed H/D exchange,
    memory): the ketone the moves give carries one deuterium. RDKit's SMILES reading of [2H] is
    the judge; a checkpoint that leaves the label out is told so in nuclide symbols (IUPAC 2005,
    IR-3.3: D for 2H)."""
    _, diags = check_text(LABELLED.format(expect="[2H]CC(C)=O"))
    assert [d for d in diags if d.severity == "error"] == []
    _, diags = check_text(LABELLED.format(expect="CC(C)=O"))
    (error,) = [d for d in diags if d.severity == "error"]
    assert error.code == "AR401" and "derived atoms not written: 1 D" in error.message, error.message


def test_a_heavy_label_on_the_wrong_atom_is_named():
    """Hydroxide labelled with 18O adds to acetone: the label is on the hydroxyl that came in,
    the charge on the oxygen that was the carbonyl's. A checkpoint with the label on the alkoxide
    differs only by the label (without it the two are one structure to RDKit): the error names
    both oxygens."""
    text = '''
species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species hydroxide = "[18OH-:6]"
step "addition"
    :O6 -> C2
    C2=O3 -> O3
    expect "{expect}"
end
'''
    _, diags = check_text(text.format(expect="CC(C)([18OH])[O-]"))
    assert [d for d in diags if d.severity == "error"] == []
    _, diags = check_text(text.format(expect="CC(C)(O)[18O-]"))
    (error,) = [d for d in diags if d.severity == "error"]
    assert "O3:" in error.message and "O6:" in error.message, error.message
    _, diags = check_text(text.format(expect="CC(C)(O)[O-]"))   # the label left out
    (error,) = [d for d in diags if d.severity == "error"]
    assert "O6: expected O, the moves give 18O" in error.message, error.message


DECARBOXYLATION = '''
species acid = "[CH3:8][C:1](=[O:2])[CH2:3][C:4](=[O:5])[O:6][H:7]"
step "decarboxylation"
    C1=O2 -> O2-H7
    O6-H7 -> C4=O6
    C3-C4 -> C1=C3
end
product "{product}"
'''


def test_a_product_written_as_another_tautomer_is_called_one():
    """A beta-keto acid loses CO2 through a six-membered cyclic array and gives the enol, which
    only later tautomerises to the ketone (textbook decarboxylation of acetoacetic acid, common
    practice). Writing acetone as the product of the one step is named a tautomer of the derived
    enol, with a hint to add the proton transfers; RDKit's tautomer enumerator, which puts both in
    one canonical form, is the judge. A product that is no tautomer (propan-2-ol) is not called one."""
    _, diags = check_text(DECARBOXYLATION.format(product="CC(C)=O.O=C=O"))
    errors = [d for d in diags if d.severity == "error"]
    assert [d.code for d in errors] == ["AR402"]
    assert "tautomer of the derived C=C(C)O" in errors[0].message
    assert "proton transfers" in errors[0].hint
    _, diags = check_text(DECARBOXYLATION.format(product="CC(C)O.O=C=O"))
    errors = [d for d in diags if d.severity == "error"]
    assert [d.code for d in errors] == ["AR402"] and "tautomer" not in errors[0].message
    _, diags = check_text(DECARBOXYLATION.format(product="CC(O)=C.O=C=O"))
    assert not [d for d in diags if d.severity == "error"]


def test_a_mismatch_is_explained_on_the_symmetric_reading_with_fewest_differences():
    """Acetone's enolate checked against its enol: the two differ at the oxygen alone (charge -1
    and no hydrogen, against neutral O-H; textbook keto-enol chemistry). The common part of the
    two sits in the enolate two ways (either methyl as the CH2); the first way RDKit gave read the
    enol's CH2 onto the enolate's untouched methyl, and the explanation listed five differences
    (hydrogens on both methyls, both C-C bonds, the oxygen's charge). It names the oxygen alone."""
    text = '''species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species base = "[OH-:5]"
step "enolate"
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
    expect "CC(O)=C"
end
'''
    _, diags = check_text(text)
    found = [d for d in diags if d.code == "AR401"]
    assert len(found) == 1
    explained = found[0].message.split(": ", 1)[1]
    assert explained == "O3: expected charge 0, the moves give -1 (a proton transfer is missing?)", explained


def test_a_product_written_as_another_resonance_form_is_called_one():
    """Alpha cleavage of a ketone radical cation gives an acylium ion, CH3-C#O+, drawn also as its
    resonance form CH3-C+=O (common practice): the same atoms, bonds and hydrogens, the electrons
    placed otherwise. Written so, the product is named a resonance form of the derived one, with
    the way out (write the derived form, or a `resonance` step); it was told only atom by atom."""
    text = ('species ion = "[CH3:3][CH2:4][C:1](=[O+:2])[CH3:5]"\n'
            'step "alpha cleavage"\n    .O2 ~> C1#O2\n    C1-C4 ~> C1#O2\n    C1-C4 ~> C4\nend\n'
            'product "C[C+]=O.C[CH2]"\n')
    _, diags = check_text(text)
    (d,) = [d for d in diags if d.code == "AR402"]
    assert "is a resonance form of the derived CC#[O+]" in d.message and "`resonance` step" in d.hint


def test_a_label_on_the_wrong_carbon_leaves_the_other_atoms_matched():
    """The deuterium exchange of the gallery with the product's D written one carbon further round:
    the explanation names the two carbons and the D, not the ketone's oxygen (the common part was
    once sought over the D too, and it took the O's place: "written atoms with no counterpart: 1 O")."""
    text = (Path(__file__).resolve().parents[1] / "gallery" / "21-deuterium-exchange.mech").read_text(encoding="utf-8")
    text = text.replace('product "[2H]C1CCCCC1=O"', 'product "[2H]C1CCCC(=O)C1"')
    _, diags = check_text(text)
    (d,) = [d for d in diags if d.code == "AR402"]
    assert "1 D" in d.message and " O" not in d.message.split("derived state:")[1], d.message


def test_a_product_with_some_atoms_numbered_is_not_told_the_others_are_unmatched():
    """Benzoate written with its two oxygens' numbers swapped: compared by map numbers, the numbered
    oxygens are named; the unnumbered ring carbons are not "written atoms with no counterpart"."""
    text = ('species acid = "c1ccc(cc1)[C:2](=[O:3])[OH:5]"\nspecies base = "[OH-:4]"\n'
            'step "deprotonation"\n    :O4 -> H(O5)\n    O5-H -> O5\nend\n'
            'product "c1ccc(C([O-:3])=[O:5])cc1"\n')
    _, diags = check_text(text)
    (d,) = [d for d in diags if d.code == "AR402"]
    assert "O3" in d.message and "no counterpart" not in d.message, d.message


def test_written_pieces_alike_are_each_explained_against_their_own_derived_piece():
    """`expect all "O.O"` after water's autoionisation: both written waters were set against the
    same derived hydroxide, the same AR401 said twice and the hydronium never named (following both
    hints gave [OH-].[OH-]). Each written piece now meets a derived piece of its own: hydroxide
    and hydronium (RDKit's canonical SMILES the judge) are both named."""
    from rdkit import Chem
    text = ('species w1 = "[OH2:1]"\nspecies w2 = "[OH2:2]"\nstep "autoionisation"\n    :O2 -> H(O1)\n'
            '    O1-H -> O1\n    expect all "O.O"\nend\n')
    _, diags = check_text(text, "dup.mech")
    found = [d for d in diags if d.code == "AR401"]
    assert len(found) == 2 and found[0].message != found[1].message
    named = {Chem.MolToSmiles(Chem.MolFromSmiles(s)) for s in ("[OH-]", "[OH3+]")}
    assert {next(s for s in named if f"`{s}`" in d.hint) for d in found} == named
