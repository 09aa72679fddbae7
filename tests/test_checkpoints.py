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


def _explanation(text: str, code: str) -> str:
    _, diags = check_text(text)
    (found,) = [d for d in diags if d.code == code]
    return found.message.split(" derived state: ", 1)[1]


def test_atoms_joined_otherwise_are_told_as_the_bonds_that_differ():
    """Cyanide displaces iodide through carbon and gives the nitrile (Kolbe nitrile synthesis; a
    secondary amine attacks NO+ at nitrogen and gives the N-nitrosamine: textbook outcomes, Clayden
    and March, from memory). Moves that attack through the other atom make methyl isocyanide and
    an O-bonded isomer (RDKit's canonical SMILES of the derived piece the judge): the same formula,
    joined otherwise. The product written as the textbook one was told only "written atoms with no
    counterpart: 1 C; derived atoms not written: 1 C"; the bond each side makes is named now."""
    from rdkit import Chem
    from arrows.trace import state_smiles
    kolbe = ('species iodomethane = "[CH3:1][I:2]"\nspecies cyanide = "[C-:3]#[N:4]"\n'
             'step "substitution"\n    :N4 -> C1\n    C1-I2 -> I2\nend\nproduct "CC#N.[I-]"\n')
    trace, _ = check_text(kolbe)
    assert Chem.CanonSmiles("C[N+]#[C-]") in state_smiles(trace.final).split(".")
    assert _explanation(kolbe, "AR402") == ("the moves bond C1 to N4; the product bonds C1 to C3 instead; "
                                            "C3: expected charge 0, the moves give -1; "
                                            "N4: expected charge 0, the moves give +1")
    nitrosation = ('species amine = "C[NH:1]C"\nspecies nitrosonium = "[N:2]#[O+:3]"\nspecies water = "[OH2:4]"\n'
                   'step "attack"\n    :N1 -> O3\n    N2#O3 -> N2\nend\n'
                   'step "deprotonation"\n    :O4 -> H(N1)\n    N1-H -> N1\nend\nproduct "CN(C)N=O"\n')
    assert _explanation(nitrosation, "AR402") == ("the moves bond N1 to O3; the product bonds N1 to N2 instead; "
                                                  "N2: expected charge 0, the moves give -1; "
                                                  "O3: expected charge 0, the moves give +1")


RITTER_SLIP = '''species cation  = "C[C+:1](C)C"
species nitrile = "C[C:4]#[N:5]"
step "capture by the nitrile, through its carbon"
    C4#N5 -> C4-C1
    expect "{expect}"
end
'''


def test_a_nitrenium_ion_is_not_explained_as_a_diradical_nor_on_misplaced_atoms():
    """The Ritter reaction's nitrile catches the tert-butyl cation at nitrogen: the N-alkylnitrilium
    CC#[N+]C(C)(C)C (textbook outcome, Clayden and March, from memory). Moves that bond the cation
    to the nitrile's carbon leave N5 with one lone pair, charge +1 (`arrows trace`). RDKit reads a
    bare [N+] with two bonds as a diradical, and the explanation took that reading for the moves'
    ("N5: expected 0 unpaired electron(s), the moves give 2"); it also paired a written methyl
    with C1 ("C1: expected 3 H, the moves give 0", "3 C with no counterpart"). Now it names the
    bond that moved, and an unpaired electron only where one side has an odd count: the neutral
    iminyl radical written instead (RDKit: one unpaired electron) is still told apart."""
    assert _explanation(RITTER_SLIP.format(expect="CC#[N+]C(C)(C)C"), "AR401") == (
        "the moves bond C1 to C4; the checkpoint bonds C1 to N5 instead; "
        "bond C4-N5: expected triple, the moves give double")
    assert _explanation(RITTER_SLIP.format(expect="C[C:4]#[N+:5]C(C)(C)C"), "AR401") == (
        "bond C4-N5: expected triple, the moves give double")
    assert "N5: expected 1 unpaired electron(s), the moves give 0" in _explanation(
        RITTER_SLIP.format(expect="CC(=[N])C(C)(C)C"), "AR401")
