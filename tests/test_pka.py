"""Proton-transfer plausibility (AR508) and the acidity table behind it.

Source of the values: the textbook aqueous pKa list in the shared references (memory): H3O+ -1.7;
RCO2H ~4.8; 1,3-diketone ~9; phenol ~10; R3NH+ ~10; water 15.7; methanol ~15.5; t-butanol ~18;
aldehyde alpha-H ~17; ketone alpha-H ~19-20; ester alpha-H ~25; terminal alkyne ~25; NH3 ~38;
alkene C-H ~44; alkane ~50. Common practice: hydroxide cannot deprotonate an alkane.
"""
from pathlib import Path

import pytest
from click.testing import CliRunner
from rdkit import Chem

from arrows import check_text
from arrows.api import check_file
from arrows.checks.protons import pka_gap, proton_transfers
from arrows.cli import cli
from arrows.judgement.acidity import AZOLIUM_N_H, TABLE, acidity_of, perceived

from textbook_mechanisms import ACID_ENOLISATION, AZO_COUPLING, ENE_REACTION, WOLFF_KISHNER

GALLERY = sorted((Path(__file__).resolve().parent.parent / "gallery").glob("*.mech"))

# (SMILES, atom index carrying the proton, reference pKa) from the list above (memory).
REFERENCE = [
    ("[OH3+]", 0, -1.7), ("CC(=O)O", 3, 4.8), ("CC(=O)CC(C)=O", 3, 9), ("Oc1ccccc1", 0, 10),
    ("C[NH+](C)C", 1, 10), ("O", 0, 15.7), ("CO", 1, 15.5), ("CC(C)(C)O", 4, 18), ("CC=O", 0, 17),
    ("CC(C)=O", 0, 19.5), ("CC(=O)OC", 0, 25), ("CC#C", 2, 25), ("N", 0, 38), ("C=C", 0, 44), ("CC", 0, 50),
]


@pytest.mark.parametrize("smiles, atom, pka", REFERENCE)
def test_table_agrees_with_the_reference_list(smiles, atom, pka):
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is not None and entry.pka == pytest.approx(pka)


HYDROXIDE_ON_PROPANE = """\
species propane = "[CH3:1]CC"
species base = "[OH-:2]"
step "deprotonation"
    :O2 -> H(C1)
    C1-H -> C1
end
"""


def test_hydroxide_on_an_alkane_is_uphill():
    """Common practice: hydroxide (water 15.7) cannot take a proton from an alkane (~50)."""
    _, diags = check_text(HYDROXIDE_ON_PROPANE, "propane.mech")
    found = [d for d in diags if d.code == "AR508"]
    assert len(found) == 1
    d = found[0]
    assert d.message.startswith("hydroxide (pKa of water 15.7) removing an alkane C-H (~50)")
    assert (d.loc.line, d.loc.column) == (4, 5) and d.severity == "warning" and d.hint


def test_hydroxide_on_an_aldehyde_c_h_is_uphill():
    """An aldehyde's own C-H was matched by no row and left unjudged, hydroxide making an acyl anion
    unsaid: no polar base makes one (it takes an umpolung reagent; common practice), and the
    README reads a C-H the table does not name as an alkane's."""
    text = ('species ald = "[CH3:1][CH:2]=[O:3]"\nspecies base = "[OH-:4]"\nstep "formyl C-H"\n'
            '    :O4 -> H(C2)\n    C2-H -> C2\nend\n')
    _, diags = check_text(text, "formyl.mech")
    (found,) = [d for d in diags if d.code == "AR508"]
    assert "removing an aldehyde C-H (~50)" in found.message and (found.loc.line, found.loc.column) == (4, 5)


def test_threshold_is_configurable():
    with pka_gap(40):
        _, diags = check_text(HYDROXIDE_ON_PROPANE)
    assert not [d for d in diags if d.code == "AR508"]


def test_cli_option_pka_gap(tmp_path):
    path = tmp_path / "propane.mech"
    path.write_text(HYDROXIDE_ON_PROPANE, encoding="utf-8")
    loose = CliRunner().invoke(cli, ["check", "--pka-gap", "40", "--strict", str(path)])
    strict = CliRunner().invoke(cli, ["check", "--strict", str(path)])
    assert loose.exit_code == 0 and "AR508" not in loose.output
    assert strict.exit_code == 1 and "AR508" in strict.output


def test_lda_on_a_ketone_is_downhill():
    """Diisopropylamide (amine N-H ~38, the NH3 value) on a ketone alpha C-H (19-20): downhill."""
    trace, diags = check_file(next(p for p in GALLERY if p.name.startswith("01-")))
    (transfer,) = proton_transfers(trace.steps[0])
    assert transfer.acid.pka == 19.5 and transfer.conjugate_acid.pka == 38 and transfer.uphill < 0
    assert not [d for d in diags if d.code == "AR508"]


@pytest.mark.parametrize("path", GALLERY, ids=lambda p: p.stem)
def test_gallery_is_free_of_uphill_proton_transfers(path):
    _, diags = check_file(path)
    assert not [d.to_text() for d in diags if d.code == "AR508"]


def test_gallery_transfers_are_judged():
    """The gallery test above is not vacuous: most transfers there get both values looked up."""
    judged = total = 0
    for path in GALLERY:
        trace, _ = check_file(path)
        for st in trace.steps:
            for t in proton_transfers(st):
                total += 1
                judged += t.uphill is not None
    assert total >= 20 and judged == total


def test_concerted_elimination_is_not_a_plain_transfer():
    """E2 (gallery 09): tert-butoxide takes a C-H proton as bromide leaves; the C-H is not judged
    as an alkane acid, because another sigma bond breaks in the same step."""
    trace, diags = check_file(next(p for p in GALLERY if p.name.startswith("09-")))
    assert proton_transfers(trace.steps[0]) == []


def test_cli_threshold_does_not_outlive_the_command(tmp_path):
    path = tmp_path / "propane.mech"
    path.write_text(HYDROXIDE_ON_PROPANE, encoding="utf-8")
    CliRunner().invoke(cli, ["check", "--pka-gap", "40", str(path)])
    _, diags = check_text(HYDROXIDE_ON_PROPANE)
    assert [d.code for d in diags if d.code == "AR508"] == ["AR508"]


@pytest.mark.parametrize("path", GALLERY, ids=lambda p: p.stem)
def test_the_shared_hydrogen_free_view_reads_the_same_acidity_as_the_state_itself(path):
    """The checks read acidity on one perceived copy per state with the moving hydrogens folded into
    counts (judgement/perception.py); the table must say the same as on the state with its explicit
    hydrogen atoms, for every heavy atom of every derived state."""
    from arrows.judgement.perception import RecentViews
    trace, _ = check_file(path)
    views = RecentViews()
    for state in trace.states():
        view, whole = views.of(state), perceived(state.mol)
        for atom in range(state.mol.GetNumAtoms()):
            if state.elements[atom] != 1:
                assert acidity_of(view.mol, view.position(atom)) == acidity_of(whole, atom), (path.name, atom)


ENAMINE_FROM_IMINIUM = """\
species iminium = "[CH3:1][C:2](C)=[N+:3](C)C"
species amine = "[NH:4](C)C"
step "deprotonation"
    :N4 -> H(C1)
    C1-H -> C1=C2
    C2=N3 -> N3
end
product "C=C(C)N(C)C.C[NH2+]C"
"""


@pytest.mark.parametrize("text", [ACID_ENOLISATION, ENAMINE_FROM_IMINIUM], ids=["enol", "enamine"])
def test_alpha_c_h_of_a_cationic_carbonyl_is_not_judged_as_a_neutral_ketone(text):
    """Acid-catalysed enolisation (water takes the alpha proton of the O-protonated ketone) and
    enamine formation (an amine takes the alpha proton of an iminium) are textbook steps (common
    practice); that C-H is not the neutral ketone's (19-20) nor an alkane's (~50), so no AR508.
    The steps still end in the textbook products (RDKit judges the product line)."""
    _, diags = check_text(text, "cationic.mech")
    assert not [d.to_text() for d in diags if d.severity == "error" or d.code == "AR508"]


@pytest.mark.parametrize("smiles, atom", [("CC(C)=NN", 4), ("NC=C", 0), ("CC(N)=N", 2)],
                         ids=["hydrazone", "enamine", "amidine"])
def test_an_n_h_beside_a_double_bond_is_not_an_amine_n_h(smiles, atom):
    """The NH3 value (~38) is for an amine: the anion of an N-H beside a double bond spreads onto
    the far atom (common practice), so a hydrazone, enamine or amidine N-H is not judged by it."""
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is None or entry.acid != "an amine N-H"


@pytest.mark.parametrize("smiles, atom", [
    ("CC(c1ccccc1)=NOS(C)(=O)=O", 0),   # the Neber's O-mesyl oxime: its methyl beside the C=N
    ("CC(C)=NC", 0),                    # an imine's alpha C-H
    ("C[N+](=O)[O-]", 0),               # nitromethane (pKa ~10, memory)
    ("CS(C)(=O)=O", 0),                 # dimethyl sulfone (pKa ~31 in DMSO, memory)
])
def test_a_c_h_beside_an_acceptor_is_not_an_alkane_c_h(smiles, atom):
    """A C-H beside a C=N, a nitro or a sulfonyl group is not 'an alkane C-H (~50)': its anion is
    held by the neighbour (common practice; ethoxide is the Neber base, Kurti and Czako 2005,
    memory). Left unjudged rather than given a value the reference list does not hold. The
    Neber's deprotonation by ethoxide was once called uphill by 34 pKa units."""
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is None or entry.acid != "an alkane C-H"


def test_hydroxide_on_a_hydrazone_is_not_flagged():
    """Wolff-Kishner reduction (textbook): hydroxide takes the hydrazone N-H. It was once judged as
    taking an amine N-H (~38), 22 units uphill (AR508)."""
    _, diags = check_text(WOLFF_KISHNER, "wolff-kishner.mech")
    assert not [d.to_text() for d in diags if d.code == "AR508"]


PIPERIDINE_ON_MALONONITRILE = """\
species malononitrile = "N#C[CH2:3]C#N"
species base = "C1CC[NH:4]CC1"
step "deprotonation"
    :N4 -> H(C3)
    C3-H -> C3
end
"""


def test_piperidine_on_malononitrile_is_not_flagged():
    """Knoevenagel condensation (textbook): piperidine (ammonium ~10) deprotonates malononitrile
    (~11, memory). Its C-H was once judged as a plain nitrile alpha C-H (~25), 15 units uphill."""
    _, diags = check_text(PIPERIDINE_ON_MALONONITRILE, "knoevenagel.mech")
    assert not [d.to_text() for d in diags if d.code == "AR508"]
    for smiles in ("N#CCC#N", "N#CCC(=O)OCC"):   # and ethyl cyanoacetate, the other textbook donor
        entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), 2)
        assert entry is not None and entry.pka < 14, smiles


def test_tert_butoxide_on_a_sulfonium_salt_is_not_flagged():
    """Corey-Chaykovsky ylide formation (textbook): tert-butoxide (~18) takes a proton of
    trimethylsulfonium (~18, memory). That C-H was once judged as an alkane's (~50): AR508."""
    text = ('species salt = "C[S+](C)[CH3:2]"\nspecies base = "CC(C)(C)[O-:3]"\n'
            'step "deprotonation"\n    :O3 -> H(C2)\n    C2-H -> C2\nend\n')
    _, diags = check_text(text, "ylide.mech")
    assert not [d.to_text() for d in diags if d.code == "AR508"]


def test_an_ene_reaction_passes_a_hydrogen_without_a_base():
    """The carbonyl-ene reaction of propene with formaldehyde (textbook pericyclic reaction, common
    practice): the allylic hydrogen moves to oxygen as the C-C bond forms, round a six-membered
    cyclic array with no ions made. It was once judged as an alkoxide taking an alkane C-H, uphill
    by 34 (AR508)."""
    trace, diags = check_text(ENE_REACTION)
    assert [d.code for d in diags if d.severity != "note"] == []
    assert proton_transfers(trace.steps[0]) == []


def test_hydroxide_on_chloroform_is_not_flagged():
    """Dichlorocarbene from chloroform and sodium hydroxide (textbook alpha-elimination, as in the
    Reimer-Tiemann reaction; common practice): chloroform's C-H (pKa ~15.5, bromoform ~13.7, memory)
    is about as acidic as water. It was once judged as an alkane C-H (~50), 34 units uphill (AR508)."""
    text = ('species chloroform = "Cl[CH:2](Cl)Cl"\nspecies base = "[OH-:3]"\n'
            'step "deprotonation"\n    :O3 -> H(C2)\n    C2-H -> C2\nend\n')
    _, diags = check_text(text, "carbene.mech")
    assert not [d.to_text() for d in diags if d.code == "AR508"]
    for smiles in ("ClC(Cl)Cl", "BrC(Br)Br"):
        entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), 1)
        assert entry is not None and 13 <= entry.pka <= 16, smiles


def test_a_hydride_base_is_judged_through_h2():
    """A hydride ion's conjugate acid is H2 (pKa ~35, memory; common practice: NaH takes an
    alcohol's proton, not an alkane's). Sodium hydride on ethane is uphill by 15 (AR508), on
    ethanol downhill; hydroxide cannot take a proton of H2. These transfers were once not judged at
    all, H2 having no entry."""
    def uphill(acid: str, base: str, moves: str) -> list[str]:
        text = f'species acid = "{acid}"\nspecies base = "{base}"\nstep "proton transfer"\n{moves}end\n'
        _, diags = check_text(text)
        return [d.code for d in diags if d.code == "AR508"]
    assert uphill("C[CH3:1]", "[H-:2]", "    :H2 -> H(C1)\n    C1-H -> C1\n") == ["AR508"]
    assert uphill("C[OH:1]", "[H-:2]", "    :H2 -> H(O1)\n    O1-H -> O1\n") == []
    assert uphill("[H:3][H:1]", "[OH-:2]", "    :O2 -> H3\n    H1-H3 -> H1\n") == ["AR508"]


def test_a_proton_lost_to_restore_an_aromatic_ring_is_not_judged_as_an_alkane_c_h():
    """Azo coupling of a diazonium ion with phenoxide (textbook electrophilic aromatic substitution;
    common practice: the sigma complex loses its proton fast, as that restores the aromatic ring).
    Water taking the sp3 C-H of the dienone was once judged as removing an alkane C-H (~50),
    uphill by 52 (AR508). The same water on a C-H whose loss makes no ring aromatic (propane's)
    is still uphill."""
    trace, diags = check_text(AZO_COUPLING, "azo.mech")
    assert not [d for d in diags if d.severity == "error"], [d.to_text() for d in diags]
    assert not [d.to_text() for d in diags if d.code == "AR508"]
    assert proton_transfers(trace.steps[1]) == []
    text = ('species propane = "C[CH2:1]C"\nspecies water = "[OH2:2]"\n'
            'step "deprotonation"\n    :O2 -> H(C1)\n    C1-H -> C1\nend\n')
    _, diags = check_text(text, "propane.mech")
    assert [d.code for d in diags if d.code == "AR508"] == ["AR508"]


# The iminium N-H of an S-alkylated thioamide (the Hantzsch thiazole synthesis's intermediate,
# drawn as its C=N+ resonance form), taken by chloride or by water.
_IMINIUM_NH = """\
species iminium = "C[C:1](S[CH3:2])=[NH2+:3]"
species base = "{base}"
step "N-H deprotonation"
    :{atom} -> H(N3)
    N3-H -> N3
end
"""


@pytest.mark.parametrize("base, atom, uphill", [("[Cl-:4]", "Cl4", True), ("[OH2:4]", "O4", False)])
def test_an_iminium_n_h_is_judged_as_an_iminium(base, atom, uphill):
    """A protonated imine's N-H has a pKa of about 7 (aqueous, memory): chloride (HCl ~-7) cannot
    take it, 14 units uphill; water (H3O+ -1.7) may, 8.7 units, under the 12-unit threshold.
    The N-H was once left unjudged, read as a C-H beside a cation (its own C=N+)."""
    _, diags = check_text(_IMINIUM_NH.format(base=base, atom=atom), "iminium.mech")
    found = [d for d in diags if d.code == "AR508"]
    assert len(found) == int(uphill), [d.to_text() for d in diags]
    if uphill:
        assert "an iminium N-H (~7)" in found[0].message


def test_amidinium_and_iminium_n_h_values():
    """Acetamidinium ~12.4 and a protonated imine ~7 (aqueous pKa, memory; not in the shared list)."""
    amidinium = acidity_of(perceived(Chem.MolFromSmiles("CC(N)=[NH2+]")), 3)
    iminium = acidity_of(perceived(Chem.MolFromSmiles("CC(C)=[NH2+]")), 3)
    assert (amidinium.acid, amidinium.pka) == ("an amidinium N-H", 12)
    assert (iminium.acid, iminium.pka) == ("an iminium N-H", 7)


@pytest.mark.parametrize("gap", ["nan", "-3", "inf"])
def test_cli_option_pka_gap_takes_only_a_finite_positive_number(gap, tmp_path):
    """A threshold that is not a number of pKa units is bad usage (exit 2): nan passed every
    comparison and printed "the threshold is nan units", a negative one flagged downhill transfers."""
    path = tmp_path / "propane.mech"
    path.write_text(HYDROXIDE_ON_PROPANE, encoding="utf-8")
    result = CliRunner().invoke(cli, ["check", "--pka-gap", gap, str(path)])
    assert result.exit_code == 2 and "--pka-gap" in result.output, result.output


# Acids the table once left to the alkane entry (~50) or to no entry at all: (SMILES, the atom
# carrying the proton, pKa). Aqueous values, or the DMSO scale where water gives none (memory).
MORE_ACIDS = [
    ("CC=CC(C)=O", 0, 20),          # an enone's gamma C-H: the dienolate
    ("CS(C)=O", 0, 35),             # DMSO (dimsyl anion, made with NaH)
    ("CC(=O)Cl", 0, 16),            # an acyl chloride's alpha C-H (estimated)
    ("C1SCCCS1", 0, 31),            # 1,3-dithiane
    ("C(c1ccccc1)(c1ccccc1)c1ccccc1", 0, 31.5),   # triphenylmethane
    ("Cc1ccccc1", 0, 42),           # toluene's benzylic C-H
    ("Nc1ccccc1", 0, 31),           # aniline's N-H
    ("O=C1CCC(=O)N1", 6, 9),        # succinimide
    ("C[N+](=O)[O-]", 0, 10),       # nitromethane
    ("CS", 1, 10.5),                # methanethiol
    ("S", 0, 7),                    # hydrogen sulfide
    ("Cc1ccc(cc1)S(=O)(=O)O", 10, -2.8),   # TsOH
    ("OC(=O)[O-]", 0, 10.3),        # bicarbonate, not a carboxylic acid
    ("c1cc[nH+]cc1", 3, 5.2),       # pyridinium
    ("c1cc[nH+][nH]1", 3, 2.5),     # pyrazolium, not a pyridinium's 5.2
    ("c1cc[nH+][nH]1", 4, 2.5),     # its other N-H (once unjudged)
    ("c1nc[nH+][nH]1", 3, 2.5),     # 1,2,4-triazolium
    ("c1[nH+]c[nH]n1", 1, 2.5),     # 1,2,4-triazolium protonated at N4, not a pyridinium's 5.2
    ("c1[nH+]c[nH]n1", 3, 2.5),     # its N1-H (once unjudged)
    ("c1c[nH+]n[nH]1", 4, 2.5),     # 1,2,3-triazolium's N1-H, the n+ across N2 (once unjudged; 1.2, memory)
    ("C[n+]1ccc[nH]1", 5, 2.5),     # 1-methylpyrazolium, the charge drawn on the N-methyl (once unjudged)
    ("c1[nH+]nn[nH]1", 1, -3),      # tetrazolium, not a pyrazolium's 2.5
    ("c1[nH+]nn[nH]1", 4, -3),      # its other N-H, not a neutral tetrazole's 4.9
    ("[NH3+]c1ccccc1", 0, 4.6),     # anilinium, not an alkylammonium ion (~10)
    ("CCOC(=O)CC(=O)OCC", 5, 13),   # diethyl malonate, not a 1,3-diketone's 9
    ("CCOC(=O)CC(C)=O", 5, 11),     # ethyl acetoacetate
    ("CCOC(=O)CP(=O)(OCC)OCC", 5, 15),   # triethyl phosphonoacetate, not an ester's 25 (an estimate)
    ("C[NH2+]C(=O)c1ccccc1", 1, -7),   # an amide protonated on nitrogen (an estimate)
    ("[NH3+]O", 0, 6.0),            # hydroxylammonium
    ("CC(N)=[OH+]", 3, -0.5),       # an amide protonated on oxygen, not a ketone's -7
]


@pytest.mark.parametrize("smiles, atom, pka", MORE_ACIDS)
def test_acids_that_are_not_alkanes_have_their_own_entry(smiles, atom, pka):
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is not None and entry.pka == pytest.approx(pka), entry


@pytest.mark.parametrize("base, acid, uphill", [
    ("[Br-:3]", "[CH3:1][N+](=O)[O-]", True),        # bromide on nitromethane: 19 units (-9 vs 10)
    ("C[O-:3]", "[CH3:1]C=CC(C)=O", False),          # methoxide on an enone's gamma C-H: 4.5 units
    ("[H-:3]", "[CH3:1]S(C)=O", False),               # hydride on DMSO: 35 vs 35
    ("[O-:3]C([O-])=O", "[CH3:1]C(C)=O", False),      # carbonate on acetone: 9 units, not 15
])
def test_carbon_acids_are_judged_by_their_own_pka(base, acid, uphill):
    """Each once judged as an alkane C-H (~50, a false alarm) or, beside a nitro group's N+, not
    at all (read as a C-H beside a cation)."""
    text = (f'species acid = "{acid}"\nspecies base = "{base}"\nstep "deprotonation"\n'
            f'    :{"Br" if "Br" in base else "O" if "O" in base else "H"}3 -> H(C1)\n    C1-H -> C1\nend\n')
    _, diags = check_text(text, "carbon-acid.mech")
    assert [d.code for d in diags if d.code == "AR508"] == (["AR508"] if uphill else []), \
        [d.to_text() for d in diags]


TETRAZOLIUM_TO_WATER = """\
species tetrazolium = "[cH:1]1[nH+:2][n:3][n:4][nH:5]1"
species water = "[OH2:6]"
step "water takes the ring N-H proton"
    :O6 -> H(N2)
    N2-H -> N2
end
"""


def test_a_tetrazolium_gives_its_proton_to_water_downhill():
    """1H-Tetrazole's conjugate acid has pKa about -3 (a very weak base; Catalan, Abboud & Elguero's
    review of azole basicity, memory), below H3O+'s -1.7: the transfer runs downhill. It was read
    as a pyrazolium's N-H (2.5): "uphill by 4.2", flagged under a 3-unit threshold."""
    trace, _ = check_text(TETRAZOLIUM_TO_WATER, "tetrazolium.mech")
    (transfer,) = proton_transfers(trace.steps[0])
    assert (transfer.acid.acid, transfer.conjugate_acid.acid) == ("a tetrazolium N-H", "hydronium")
    assert transfer.uphill < 0
    with pka_gap(3):
        _, diags = check_text(TETRAZOLIUM_TO_WATER, "tetrazolium.mech")
    assert [d.code for d in diags if d.code == "AR508"] == []


# An azolium's other N-H: the one on the N the Kekule form leaves neutral, beside the charged N.
# Taken, its pair goes back into the ring as the charged N's C=N (or N=N) pair comes onto that N.
OTHER_N_H = """\
species azolium = "{azolium}"
{base}
step "the N-H beside the charged N is taken"
    :{b} -> H(N5)
    N5-H -> N5={partner}
    {partner}={charged} -> {charged}
end
"""


@pytest.mark.parametrize("azolium, partner, charged, base, b, entry, flagged", [
    # 1,2,3-triazolium (1.2, Joule & Mills, memory) to water: judged, under the threshold.
    ("[cH:1]1=[cH:2][nH+:3]=[n:4][nH:5]1", "N4", "N3", 'species water = "[OH2:6]"', "O6",
     "a pyrazolium or triazolium N-H", False),
    # Tetrazolium (~-3, memory) to water: downhill.
    ("[cH:1]1=[nH+:2][n:3]=[n:4][nH:5]1", "C1", "N2", 'species water = "[OH2:6]"', "O6", "a tetrazolium N-H", False),
    # Imidazolium (7.0, Joule & Mills) to bromide (HBr ~-9): 16 units uphill.
    ("[cH:1]1=[nH+:2][cH:3]=[cH:4][nH:5]1", "C1", "N2", 'species bromide = "[Br-:6]"', "Br6",
     "an imidazolium N-H", True),
], ids=["1,2,3-triazolium", "tetrazolium", "imidazolium"])
def test_an_azolium_n_h_beside_its_charged_n_is_judged(azolium, partner, charged, base, b, entry, flagged):
    """Once passed over as a proton beside a cation (no table entry): now read by the azolium's
    own entry, whichever ring N the charge is drawn on."""
    text = OTHER_N_H.format(azolium=azolium, partner=partner, charged=charged, base=base, b=b)
    trace, diags = check_text(text, "azolium.mech")
    (transfer,) = proton_transfers(trace.steps[0])
    assert transfer.acid.acid == entry
    assert [d.code for d in diags if d.code == "AR508"] == (["AR508"] if flagged else []), \
        [d.to_text() for d in diags]


def test_every_azolium_ring_n_h_entry_is_kept_beside_its_cation():
    """AZOLIUM_N_H picks the table's entries by name: a renamed entry would drop out of it silently."""
    assert sorted(e.acid for e in AZOLIUM_N_H) == sorted(e.acid for e in TABLE if e.smarts.startswith("[nX3;H1;")
                                                         and "n+" in e.smarts)


PROTONATES_N2 = "    :N2 -> H(O6)\n    O6-H -> O6\n"


@pytest.mark.parametrize("other, arrows, said", [
    # Phenol (~10) cannot protonate tetrazole (conjugate acid ~-3, memory): 13 units. Read as a
    # pyrazolium (2.5) it was 7.5, under the threshold.
    ('species phenol = "c1ccccc1[OH:6]"', PROTONATES_N2, "pKa of a tetrazolium N-H ~-3"),
    # Water protonating tetrazole (15.7 vs ~-3): flagged before too, but against a pyrazolium's 2.5.
    # Guard: bromide (HBr ~-9) taking the N-H of neutral 1H-tetrazole (4.9, memory), 14 units: the
    # neutral ring is not read as a tetrazolium.
    ('species water = "[OH2:6]"', PROTONATES_N2, "pKa of a tetrazolium N-H ~-3"),
    ('species bromide = "[Br-:6]"', "    :Br6 -> H(N5)\n    N5-H -> N5\n", "removing a tetrazole N-H (4.9)"),
])
def test_uphill_transfers_to_and_from_tetrazole_are_flagged(other, arrows, said):
    text = f'species tetrazole = "[cH:1]1[n:2][n:3][n:4][nH:5]1"\n{other}\nstep "proton transfer"\n{arrows}end\n'
    _, diags = check_text(text, "tetrazole.mech")
    (found,) = [d for d in diags if d.code == "AR508"]
    assert said in found.message, found.message


ACYLATION_WITHOUT_ADDED_BASE = """\
species chloride = "[C:1](=[O:2])([Cl:3])c1ccccc1"
species amine = "C[NH2:4]"
step "addition"
    :N4 -> C1
    C1=O2 -> O2
end
step "elimination"
    :O2 -> C1=O2
    C1-Cl3 -> Cl3
end
step "deprotonation by chloride"
    :Cl3 -> H(N4)
    N4-H -> N4
end
product "CNC(=O)c1ccccc1.Cl"
"""


def test_chloride_takes_the_proton_of_an_n_acylammonium_ion():
    """Schotten-Baumann-type acylation with no added base (textbook account: the amide is
    protonated on nitrogen as it forms, and HCl is lost): chloride (HCl ~-7) taking the N-H of the
    N-acylammonium ion (an estimate near -7, memory) is not uphill. It was judged as an
    alkylammonium ion (~10): "uphill by about 17"."""
    _, diags = check_text(ACYLATION_WITHOUT_ADDED_BASE, "acylation.mech")
    assert [d.code for d in diags if d.severity in ("error", "warning")] == []


@pytest.mark.parametrize("acid, flagged", [
    ('species methanol = "[CH3:5][OH:6]"', True),   # methanol (~15.5): 26 units over a carbocation's C-H
    ('species water = "[OH2:6]"', True),             # water (15.7)
    ('species acid = "[OH3+:6]"', False),            # hydronium (-1.7): the acid-catalysed hydration
])
def test_only_a_strong_acid_protonates_an_alkene_to_a_carbocation(acid, flagged):
    """Acid-catalysed hydration of 2-methylpropene (Clayden, electrophilic addition to alkenes;
    textbook): the alkene takes H3O+'s proton to give the tert-butyl cation. Water or methanol
    alone does not (common practice), but the transfer went unjudged: a pi pair that leaves a
    cation beside it was passed over. The carbocation's C-H is taken as a strong acid, ~-10
    (an estimate, memory; no tabulated value)."""
    text = (f'species alkene = "[CH2:1]=[C:2]([CH3:3])[CH3:4]"\n{acid}\n'
            'step "protonation"\n    C1=C2 -> C1-H(O6)\n    O6-H -> O6\nend\n')
    _, diags = check_text(text, "alkene.mech")
    found = [d for d in diags if d.code == "AR508"]
    assert bool(found) == flagged, [d.to_text() for d in diags]
    if flagged:
        assert "to make a carbocation" in found[0].message and "strong acid" in found[0].hint


def test_an_enol_protonated_on_carbon_is_not_judged_as_a_carbocation():
    """An enol's C=C taking a proton makes an oxocarbenium ion (a protonated ketone), its charge
    shared by the oxygen's lone pair: not the bare carbocation of an alkene (acid-catalysed
    tautomerism; textbook). Not judged by the carbocation estimate."""
    text = ('species enol = "[CH2:1]=[C:2]([OH:3])[CH3:4]"\nspecies water = "[OH2:6]"\n'
            'step "protonation on carbon"\n    C1=C2 -> C1-H(O6)\n    O6-H -> O6\nend\n')
    _, diags = check_text(text, "enol.mech")
    assert not [d for d in diags if d.code == "AR508" and "carbocation" in d.message]


def test_trifluoroacetic_acid_protonates_an_alkene():
    """TFA adds to 2-methylbut-2-ene through the tert-amyl cation, as in an ionic hydrogenation
    with Et3SiH/TFA (Carey & Sundberg Part B, from memory): TFA's pKa ~0.3 (memory), not a
    carboxylic acid's 4.8, which made it 'uphill by about 15'."""
    text = ('species alkene = "[CH3:1][C:2]([CH3:5])=[CH:3][CH3:4]"\n'
            'species acid = "F[C:11](F)(F)[C:12](=[O:13])[OH:10]"\n'
            'step "TFA protonates the alkene"\n    C2=C3 -> C3-H(O10)\n    O10-H -> O10\nend\n')
    _, diags = check_text(text, "tfa.mech")
    assert not [d for d in diags if d.code == "AR508"], [d.to_text() for d in diags]
    entry = acidity_of(perceived(Chem.MolFromSmiles("OC(=O)C(F)(F)F")), 0)
    assert entry.pka == pytest.approx(0.3)


def test_a_dienamine_protonated_at_its_far_carbon_is_not_a_bare_carbocation():
    """Acetic acid protonating a dienamine at C4 (common practice in amine catalysis) gives a
    vinylogous iminium ion: the nitrogen's lone pair shares the charge through the C=C, so the
    carbocation estimate does not apply (it was 'uphill by about 15')."""
    text = ('species dienamine = "C1CCN(C1)[C:1]=[CH:2][CH:3]=[CH2:4]"\n'
            'species acid = "C[C:21](=O)[OH:22]"\n'
            'step "protonation at C4"\n    C3=C4 -> C4-H(O22)\n    O22-H -> O22\nend\n')
    _, diags = check_text(text, "dienamine.mech")
    assert not [d for d in diags if d.code == "AR508"], [d.to_text() for d in diags]


# A sulfone's alpha C-H: 29-31 on Bordwell's DMSO scale (memory), about 24 in water by the same
# drop acetone shows (26.5 -> 19.3); the Julia olefination's sulfone anion is made with BuLi or
# LDA, the Ramberg-Backlund's with hydroxide (Kurti and Czako 2005, memory).
ET3N_ON_A_SULFONE = """\
species sulfone = "[CH3:1][CH2:2][S:3](=O)(=O)C"
species base = "CC[N:9](CC)CC"
step "deprotonation"
    :N9 -> H(C2)
    C2-H -> C2
end
"""


def test_an_amine_on_a_sulfone_is_uphill():
    found = [d for d in check_text(ET3N_ON_A_SULFONE, "sulfone")[1] if d.code == "AR508"]
    assert len(found) == 1 and "a C-H beside a sulfone (~24)" in found[0].message


def test_hydroxide_on_a_sulfone_is_not_flagged():
    text = ET3N_ON_A_SULFONE.replace('species base = "CC[N:9](CC)CC"', 'species base = "[OH-:9]"').replace(
        ":N9 -> H(C2)", ":O9 -> H(C2)")
    assert [d.code for d in check_text(text, "sulfone")[1] if d.severity != "note"] == []


# A Breslow adduct's alkoxide lets the thiazolium ylide go (the benzoin and Stetter catalysts'
# turnover; Breslow 1958, Kurti and Czako 2005, memory). The thiazolium C2-H has pKa about 18
# (Washabaugh and Jencks 1988, memory): its ylide leaves as a stabilised carbanion, not as the
# vinyl anion (~44) it was read as.
THIAZOLIUM_RELEASED = """\
species adduct = "C[N+:1]1=[C:2]([CH:5]([O-:6])c2ccccc2)[S:3]C=C1"
step "catalyst released"
    :O6 -> C5=O6
    C5-C2 -> C2
end
product "O=Cc1ccccc1"
"""


def test_a_thiazolium_ylide_leaving_its_breslow_adduct_is_not_flagged():
    assert [d.code for d in check_text(THIAZOLIUM_RELEASED, "breslow")[1] if d.severity != "note"] == []


@pytest.mark.parametrize("smiles, atom, pka", [
    ("C[n+]1cscc1", 2, 18),    # 3-methylthiazolium C2-H (Washabaugh and Jencks 1988, memory)
    ("C[n+]1ccn(C)c1", 6, 23),  # 1,3-dimethylimidazolium C2-H (Amyes, Diver, Richard, Rivas 2004, memory)
])
def test_azolium_c2_h(smiles, atom, pka):
    mol = perceived(Chem.MolFromSmiles(smiles))
    assert mol.GetAtomWithIdx(atom).GetTotalNumHs() == 1
    entry = acidity_of(mol, atom)
    assert entry is not None and entry.pka == pka


# The Masamune-Roush conditions for a Horner-Wadsworth-Emmons olefination: DBU (its amidinium ~12)
# with LiCl deprotonates triethyl phosphonoacetate (Blanchette, Choy, Davis, Essenfeld, Masamune,
# Roush and Sakai, Tetrahedron Lett. 1984, 25, 2183; memory). Read as an ester's alpha C-H (~25)
# it was 13 units uphill (AR508, a false alarm); triethylamine on ethyl acetate stays flagged.
DBU_ON_A_PHOSPHONOACETATE = """\
species phosphonate = "CCO[C:1](=[O:2])[CH2:3][P:4](=[O:5])(OCC)OCC"
species dbu = "C1CC[C:6]2=[N:7]CCCN2CC1"
step "deprotonation" reversible over "DBU, LiCl"
    :N7 -> H(C3)
    C3-H -> C1=C3
    C1=O2 -> O2
end
"""


def test_dbu_on_a_phosphonoacetate_is_not_flagged():
    assert [d.code for d in check_text(DBU_ON_A_PHOSPHONOACETATE, "hwe")[1] if d.code == "AR508"] == []
    ester = DBU_ON_A_PHOSPHONOACETATE.replace("[P:4](=[O:5])(OCC)OCC", "[H]").replace(
        'species dbu = "C1CC[C:6]2=[N:7]CCCN2CC1"', 'species amine = "CC[N:7](CC)CC"')
    found = [d for d in check_text(ester, "ester")[1] if d.code == "AR508"]
    assert len(found) == 1 and "an ester alpha C-H (~25)" in found[0].message, [d.to_text() for d in found]


# A neutral azole's ring N-H, in either tautomer, and HOBt's O-H: each once matched by no entry and
# left unjudged. Aqueous values (Joule & Mills, Heterocyclic Chemistry; pyrrole's and indole's
# Yagil's; HOBt's Carpino 1993; all memory): (SMILES, the atom carrying the proton, pKa).
AZOLE_ACIDS = [
    ("On1nnc2ccccc21", 0, 4.6),           # HOBt's O-H
    ("c1ccc2[nH]nnc2c1", 4, 8.2),         # 1H-benzotriazole
    ("c1ccc2n[nH]nc2c1", 5, 8.2),         # its 2H tautomer
    ("c1cn[nH]n1", 3, 9.3),               # 1H-1,2,3-triazole
    ("c1n[nH]nc1", 2, 9.3),               # 2H-1,2,3-triazole
    ("c1nc[nH]n1", 3, 10.3),              # 1H-1,2,4-triazole
    ("c1nnc[nH]1", 4, 10.3),              # 4H-1,2,4-triazole
    ("c1cc[nH]n1", 3, 14.2),              # pyrazole
    ("c1c[nH]cn1", 2, 14.5),              # imidazole
    ("NC(Cc1c[nH]cn1)C(=O)O", 5, 14.5),   # histidine's side chain
    ("c1ccc2[nH]ccc2c1", 4, 16.2),        # indole (21.0 in DMSO, Bordwell)
    ("c1cc[nH]c1", 3, 17.5),              # pyrrole (23.0 in DMSO, Bordwell)
]


@pytest.mark.parametrize("smiles, atom, pka", AZOLE_ACIDS)
def test_a_neutral_azole_n_h_has_its_own_entry(smiles, atom, pka):
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert entry is not None and entry.pka == pytest.approx(pka), entry


@pytest.mark.parametrize("smiles, atom, acid", [
    ("c1c[nH+]c[nH]1", 2, "an imidazolium N-H"),              # the cation keeps its own entries
    ("c1cc[nH+][nH]1", 4, "a pyrazolium or triazolium N-H"),
    ("c1nn[nH]n1", 3, "a tetrazole N-H"),
    ("c1ccc2[nH]cnc2c1", 4, "a benzimidazole N-H"),   # benzo-fused rings have their own entries
    ("c1ccc2[nH]ncc2c1", 4, "an indazole N-H"),
    ("c1cnc2[nH]ccc2c1", 4, None),     # 7-azaindole
    ("c1ccc2c(c1)[nH]c1ccccc12", 6, None),   # carbazole
    ("O=c1[nH]cc[nH]1", 2, None),      # an imidazol-2-one: a cyclic urea's N-H, not an azole's
    ("[O-][n+]1cc[nH]c1", 4, None),    # an imidazole N-oxide: neutral, no imidazolium (value not at hand)
    ("[O-][n+]1c2ccccc2[nH]c1", 8, None),   # a benzimidazole N-oxide, likewise
])
def test_azole_entries_take_no_other_ring_n_h(smiles, atom, acid):
    """Guard: the neutral azole entries neither take an azolium's or a tetrazole's N-H nor read a
    fused or oxo ring's N-H, whose value they do not hold (benzimidazole's and indazole's they do)."""
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    assert (entry.acid if entry else None) == acid


_AZOLE_N_H_TAKEN = """\
species azole = "{azole}"
species base = "{base}"
step "the ring N-H is taken"
    :{b} -> H(N3)
    N3-H -> N3
end
"""
IMIDAZOLE = "[cH:1]1[cH:2][nH:3][cH:4][n:5]1"


@pytest.mark.parametrize("azole, base, b, acid, uphill", [
    # Sodium hydride (H2 ~35) on imidazole (14.5): downhill, the usual way to the sodium imidazolide.
    (IMIDAZOLE, "[H-:6]", "H6", "an imidazole N-H", -20.5),
    # Acetate (acetic acid 4.8) on imidazole: 9.7 units uphill, judged though under the default 12.
    (IMIDAZOLE, "C[C:7](=[O:8])[O-:6]", "O6", "an imidazole N-H", 9.7),
    # Carbonate (bicarbonate 10.3) on benzotriazole (8.2): downhill (K2CO3 before an N-alkylation).
    ("c1ccc2c(c1)[nH:3][n:4][n:5]2", "[O-:6]C([O-])=O", "O6", "a benzotriazole N-H", -2.1),
])
def test_a_base_on_an_azole_n_h_is_judged(azole, base, b, acid, uphill):
    trace, diags = check_text(_AZOLE_N_H_TAKEN.format(azole=azole, base=base, b=b), "azole.mech")
    (transfer,) = proton_transfers(trace.steps[0])
    assert transfer.acid.acid == acid and transfer.uphill == pytest.approx(uphill)
    assert [d.code for d in diags if d.code == "AR508"] == []


def test_acetate_on_imidazole_is_flagged_under_a_tighter_threshold():
    """The 9.7 units judged above pass the default threshold (12) but not a threshold of 8."""
    text = _AZOLE_N_H_TAKEN.format(azole=IMIDAZOLE, base="C[C:7](=[O:8])[O-:6]", b="O6")
    with pka_gap(8):
        _, diags = check_text(text, "azole.mech")
    (found,) = [d for d in diags if d.code == "AR508"]
    assert "removing an imidazole N-H (14.5): uphill by about 10 pKa units" in found.message, found.message


@pytest.mark.parametrize("azole, base, b, said", [
    # Chloride (HCl ~-7) on imidazole (14.5): 21.5 units.
    (IMIDAZOLE, "[Cl-:6]", "Cl6", "chloride (pKa of hydrogen chloride ~-7) removing an imidazole N-H (14.5)"),
    # Acetate (4.8) on pyrrole (17.5): 12.7 units; pyrrole's anion takes a hydride base or an alkoxide.
    ("[cH:1]1[cH:2][nH:3][cH:4][cH:5]1", "C[C:7](=[O:8])[O-:6]", "O6",
     "a carboxylate (pKa of a carboxylic acid ~4.8) removing a pyrrole N-H (17.5)"),
])
def test_a_weak_base_on_an_azole_n_h_is_flagged(azole, base, b, said):
    _, diags = check_text(_AZOLE_N_H_TAKEN.format(azole=azole, base=base, b=b), "azole.mech")
    (found,) = [d for d in diags if d.code == "AR508"]
    assert found.message.startswith(said), found.message


@pytest.mark.parametrize("anion, other, arrows, conjugate, uphill", [
    # The 1,2,3-triazolide (its conjugate acid 9.3) cannot enolise an ester (~25): 15.7 units.
    ("[cH:1]1[cH:2][n-:3][n:4][n:5]1", "[CH3:6][C:7](=[O:8])OC", "    :N3 -> H(C6)\n    C6-H -> C6=C7\n"
     "    C7=O8 -> O8\n", "a 1,2,3-triazole N-H", 15.7),
    # Nor OBt- (HOBt 4.6) a ketone (19-20): 14.9 units.
    ("c1ccc2c(c1)[n:1]([O-:3])[n:4][n:5]2", "[CH3:6][C:7](=[O:8])C", "    :O3 -> H(C6)\n    C6-H -> C6=C7\n"
     "    C7=O8 -> O8\n", "HOBt's O-H", 14.9),
    # Water protonates the indolide (indole 16.2 against water's 15.7): downhill.
    ("c1ccc2c(c1)[cH:1][cH:2][n-:3]2", "[OH2:6]", "    :N3 -> H(O6)\n    O6-H -> O6\n", "an indole N-H", -0.5),
])
def test_an_azolide_base_is_judged_by_its_conjugate_acid(anion, other, arrows, conjugate, uphill):
    """The anion's conjugate acid, read after the step, was matched by no entry: unjudged."""
    text = f'species anion = "{anion}"\nspecies other = "{other}"\nstep "proton transfer"\n{arrows}end\n'
    trace, diags = check_text(text, "azolide.mech")
    (transfer,) = proton_transfers(trace.steps[0])
    assert transfer.conjugate_acid.acid == conjugate and transfer.uphill == pytest.approx(uphill)
    assert [d.code for d in diags if d.code == "AR508"] == (["AR508"] if uphill > 12 else [])


# HOBt in a carbodiimide coupling (Konig & Geiger 1970; common practice with EDC and Et3N): Et3N
# takes HOBt's O-H, OBt- turns the O-acylisourea into the OBt ester, the amine adds to that, and
# OBt- takes the proton of the N-acylammonium ion it leaves.
HOBT_COUPLING = """\
species hobt = "c1ccc2c(c1)[n:31]([OH:30])[n:32][n:33]2"
species triethylamine = "CC[N:40](CC)CC"
species acylisourea = "[CH3:1][C:2](=[O:3])[O:4][C:12](=[N:11][CH3:10])[NH:13][CH3:14]"
species methylamine = "[CH3:20][NH2:21]"
step "triethylamine takes HOBt's O-H" reversible
    :N40 -> H(O30)
    O30-H -> O30
end
step "OBt- adds to the activated carbonyl"
    :O30 -> C2
    C2=O3 -> O3
end
step "the urea's anion leaves"
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "the amine adds to the OBt ester"
    :N21 -> C2
    C2=O3 -> O3
end
step "OBt- leaves"
    :O3 -> C2=O3
    C2-O30 -> O30
end
step "OBt- takes the N-H proton" reversible
    :O30 -> H(N21)
    N21-H -> N21
end
"""


def test_hobt_in_a_carbodiimide_coupling_is_judged_downhill():
    """Et3N (its ammonium ~10) on HOBt (4.6): 5.4 units downhill; OBt- on the N-acylammonium ion
    (~-7, an estimate): 11.6 downhill. Both were unjudged, HOBt's O-H and its anion matched by no entry."""
    trace, diags = check_text(HOBT_COUPLING, "hobt.mech")
    (first,), (last,) = proton_transfers(trace.steps[0]), proton_transfers(trace.steps[5])
    assert (first.acid.acid, first.uphill) == ("HOBt's O-H", pytest.approx(-5.4))
    assert (last.conjugate_acid.acid, last.uphill) == ("HOBt's O-H", pytest.approx(-11.6))
    assert [d.code for d in diags if d.severity in ("error", "warning")] == []
