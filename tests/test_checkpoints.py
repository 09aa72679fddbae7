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


NAZAROV = '''species dienone = "[CH2:1]=[CH:2][C:3](=[O:4])[CH:5]=[CH2:6]"
species acid = "[OH:10][S:11](=[O:12])(=[O:13])C(F)(F)F"
step "O-protonation" reversible
    :O4 -> H(O10)
    O10-H -> O10
end
step "pentadienyl cation" resonance
    C1=C2 -> C2=C3
    C3=O4 -> O4
end
step "4pi electrocyclisation"
    C5=C6 -> C6-C1
end
step "triflate takes a proton"
    :O10 -> H(C6)
    C6-H -> C5=C6
end
step "enol C-protonation"
    :O4 -> C3=O4
    C2=C3 -> C2-H(O10)
    O10-H -> O10
end
step "deprotonation"
    :O10 -> H(O4)
    O4-H -> O4
end
product "OC1=CC=CC1"
'''


def test_a_ring_is_paired_the_way_round_with_fewest_differences():
    """The Nazarov cyclisation of divinyl ketone gives cyclopent-2-enone (`arrows trace`); the
    product written as its dienol, cyclopenta-1,3-dien-1-ol, differs by one proton moved from the
    oxygen to the ring CH2 beside the C=C (a dienol and its conjugated enone: keto-enol tautomerism
    through the gamma carbon, Clayden, from memory; RDKit's tautomer enumerator puts both in one
    form). The common part of the two rings was matched with the bond orders it was found with,
    so the ring was read one way round only: 8 differences, hydrogens wrong at C2 and C5 as well.
    Read the other way round, only O4 and C1 differ in hydrogens, and the four bonds of the
    conjugated path in order."""
    _, diags = check_text(NAZAROV)
    (found,) = [d for d in diags if d.code == "AR402"]
    assert "a tautomer of the derived O=C1C=CCC1" in found.message
    explained = found.message.split("not the same form: ", 1)[1]
    hydrogens = [part.split(":")[0] for part in explained.split("; ") if " H, the moves give " in part]
    assert sorted(hydrogens) == ["C1", "O4"], explained
    assert explained.count("bond ") == 4 and len(explained.split("; ")) == 6, explained


ACETONIDE = '''species dmp = "[CH3:1][C:2]([CH3:3])([O:4][CH3:5])[O:6][CH3:7]"
species diol = "[OH:10][CH2:11][CH2:12][OH:13]"
species acid = "Cc1ccc(cc1)[S:21](=[O:22])(=[O:23])[OH:20]"
step "protonate a methoxy" reversible
    :O4 -> H(O20)
    O20-H -> O20
end
step "loss of methanol" reversible
    :O6 -> C2=O6
    C2-O4 -> O4
    releases O4
end
step "diol adds" reversible
    :O10 -> C2
    C2=O6 -> O6
end
step "proton to the tosylate" reversible
    :O20 -> H(O10)
    O10-H -> O10
end
step "protonate the second methoxy" reversible
    :O6 -> H(O20)
    O20-H -> O20
end
step "loss of methanol again" reversible
    :O10 -> C2=O10
    C2-O6 -> O6
    releases O6
end
step "ring closure" reversible
    :O13 -> C2
    C2=O10 -> O10
end
step "deprotonation" reversible
    :O20 -> H(O13)
    O13-H -> O13
end
product "{product}"
'''


def test_a_product_is_explained_against_the_derived_piece_most_like_it():
    """Ethane-1,2-diol and 2,2-dimethoxypropane with TsOH give the acetonide 2,2-dimethyl-1,3-dioxolane
    (textbook diol protection, Clayden, from memory; `arrows trace`). The product written as the
    six-membered 1,3-dioxane, or as the open hemiacetal ether, shares more elements with the
    tosyl acid left beside it (six or more C and O) than with the dioxolane, and was explained
    against TsOH ("bond C(atom 15)-C(atom 16): expected single, the moves give aromatic", "1 S").
    RDKit's largest common substructure is the judge of "closest": seven atoms with the dioxolane,
    three with the tosylate."""
    from rdkit import Chem
    from rdkit.Chem import rdFMCS
    for written in ("CC1(C)OCCCO1", "COC(C)(C)OCCO"):
        sizes = [rdFMCS.FindMCS([Chem.MolFromSmiles(written), Chem.MolFromSmiles(derived)],
                                bondCompare=rdFMCS.BondCompare.CompareAny, ringMatchesRingOnly=False).numAtoms
                 for derived in ("CC1(C)OCCO1", "Cc1ccc(S(=O)(=O)[O-])cc1")]
        assert sizes[0] > sizes[1]
        explained = _explanation(ACETONIDE.format(product=written), "AR402")
        assert "aromatic" not in explained and " S" not in explained and "derived atoms not written" not in explained, \
            explained
    assert _explanation(ACETONIDE.format(product="CC1(C)OCCCO1"), "AR402").endswith(
        "written atoms with no counterpart: 1 C")


ARENIUM = '''species chloride = "[CH3:5][CH:1]([CH3:6])[Cl:2]"
species lewis = "[Al:3]([Cl:8])([Cl:9])[Cl:4]"
species arene = "[CH3:20][c:11]1[cH:12][cH:13][cH:14][cH:15][cH:16]1"
step "Lewis acid complex" reversible
    :Cl2 -> Al3
end
step "ionisation" reversible
    C1-Cl2 -> Cl2
end
step "attack by the arene"
    C13=C14 -> C14-C1
    {expect}
end
step "AlCl4- takes the proton"
    :Cl2 -> H(C14)
    C14-H -> C13=C14
    Al3-Cl2 -> Cl2
end
product "{product}"
'''


def test_a_hydrogen_difference_is_told_beside_a_charge_difference():
    """The arenium ion of a Friedel-Crafts alkylation (the Wheland intermediate, Clayden and March,
    from memory) written as the neutral cyclohexadiene differs at C13 in charge and in hydrogens:
    the written CH2 has a hydride more than the derived CH+ (RDKit's hydrogen counts the judge).
    Only the charge was told. So too the primary cation [CH2+]CC written for the isopropyl cation
    the moves make from propene (Markovnikov protonation, textbook): the hydrogens of C1 and C2
    were left out, and the two charge lines read like a resonance form. A charge that differs
    with one proton keeps its single line (the proton transfer hint)."""
    explained = _explanation(ARENIUM.format(expect='expect "CC(C)C1C=CC(C)=CC1"', product="CC(C)c1ccc(C)cc1"),
                             "AR401")
    assert explained == "C13: expected charge 0 and 2 H, the moves give +1 and 1 H", explained
    propene = ('species alkene = "[CH2:1]=[CH:2][CH3:3]"\nspecies hbr = "[BrH:10]"\nstep "protonation"\n'
               '    C1=C2 -> C1-H(Br10)\n    Br10-H -> Br10\n    expect "[CH2+]CC"\nend\n')
    assert _explanation(propene, "AR401") == ("C1: expected charge +1 and 2 H, the moves give 0 and 3 H; "
                                              "C2: expected charge 0 and 2 H, the moves give +1 and 1 H")


def test_a_difference_is_told_at_the_bond_the_arrows_made():
    """Isopropylation of toluene at the para carbon C14 (Friedel-Crafts alkylation; ortho and para
    substitution of toluene, textbook, from memory) checked against the meta isomer written as the
    product: the two readings of the mismatch have four differences each, the methyl moved round the
    ring or the isopropyl moved. The first was told, as "the moves bond C20 to C11", a bond of
    toluene as written that no arrow made. The bond the arrows made is named now, and a derived
    bond no step made is worded as part of the derived state (the ester of a Fischer
    esterification written as its isomer methyl propanoate: the ethyl's own C-C bond)."""
    explained = _explanation(ARENIUM.format(expect="", product="Cc1cccc(C(C)C)c1"), "AR402")
    assert explained.startswith("the moves bond C1 to C14; the product bonds C1 to C13 instead"), explained
    assert "C20" not in explained and "C11" not in explained, explained
    fischer = '''species acid = "[CH3:1][C:2](=[O:3])[OH:4]"
species etoh = "[CH3:6][CH2:5][OH:7]"
species cat = "[OH:20][S:21](=[O:22])(=[O:23])[OH:24]"
step "carbonyl protonation" reversible
    :O3 -> H(O20)
    O20-H -> O20
end
step "ethanol adds" reversible
    :O7 -> C2
    C2=O3 -> O3
end
step "proton off the ethyl oxonium" reversible
    :O20 -> H(O7)
    O7-H -> O7
end
step "protonate a hydroxyl" reversible
    :O4 -> H(O20)
    O20-H -> O20
end
step "loss of water" reversible
    :O3 -> C2=O3
    C2-O4 -> O4
    releases O4
end
step "deprotonation" reversible
    :O20 -> H(O3)
    O3-H -> O3
end
product "CCC(=O)OC"
'''
    explained = _explanation(fischer, "AR402")
    assert explained.startswith("in the derived state C6 is bonded to C5; the product bonds C6 to C1 instead"), \
        explained
    assert "the moves bond" not in explained


def test_a_hint_does_not_ask_for_a_piece_already_written():
    """`expect all` with both bromide and HBr written after the protonation of propene: the moves
    leave one bromine, as bromide. The hint told the author to write `[Br-]`, which is written
    already; it now says the written HBr is the piece one too many (RDKit's canonical SMILES the
    judge of which pieces are alike)."""
    text = ('species alkene = "[CH2:1]=[CH:2][CH3:3]"\nspecies hbr = "[BrH:10]"\nstep "protonation"\n'
            '    C1=C2 -> C1-H(Br10)\n    Br10-H -> Br10\n    expect all "C[CH+]C.[Br-].[BrH]"\nend\n')
    _, diags = check_text(text)
    (found,) = [d for d in diags if d.code == "AR401"]
    assert "write the checkpoint as" not in found.hint and "drop `Br`" in found.hint, found.hint
