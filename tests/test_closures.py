"""`arrows closures`: candidate ring closures of one species, ranked, and the skeletons it writes.

Sources:
- Worked outcomes (textbook chemistry, memory; shared references), compared by RDKit canonical
  SMILES: hexane-2,5-dione -> 3-methylcyclopent-2-en-1-one (C6H8O); heptane-2,6-dione ->
  3-methylcyclohex-2-en-1-one (C7H10O); octane-2,7-dione -> 1-(2-methylcyclopent-1-en-1-yl)ethan-1-one
  (C8H12O).
- Common practice: five- and six-membered closures outcompete three- and four-membered ones; an
  aldehyde is a better electrophile than a ketone.
- Baldwin-Lusch 1982 (memory) for the enolate classes.
"""
import json
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner
from rdkit import Chem
from rdkit.Chem.rdMolDescriptors import CalcMolFormula

from arrows.api import check_file
from arrows.cli import cli
from arrows.judgement.closures import find_closures, with_atom_maps

ROOT = Path(__file__).resolve().parents[1]


def run(*args):
    return CliRunner().invoke(cli, ["closures", *map(str, args)])


def closures_json(smiles: str, *extra) -> list[dict]:
    result = run(smiles, "--format", "json", *extra)
    assert result.exit_code == 0, result.output
    return json.loads(result.output)["closures"]


def same(a: str, b: str) -> bool:
    """RDKit canonical SMILES as the judge of "same structure"."""
    return Chem.MolToSmiles(Chem.MolFromSmiles(a)) == Chem.MolToSmiles(Chem.MolFromSmiles(b))


def test_heptane_2_6_dione_ranks_the_six_membered_closure_first():
    """Textbook: heptane-2,6-dione closes a six-membered ring (to 3-methylcyclohex-2-en-1-one)."""
    rows = closures_json("CC(=O)CCCC(C)=O", "--condense")
    first = rows[0]
    assert first["ring_size"] == 6 and first["class"] == "6-(enolendo)-exo-trig"
    assert first["baldwin"]["verdict"] == "favoured"     # Baldwin-Lusch 1982 (memory): 6-(enolendo)-exo-trig
    assert same(first["product"], "CC1=CC(=O)CCC1")
    assert CalcMolFormula(Chem.MolFromSmiles(first["product"])) == "C7H10O"
    assert {r["ring_size"] for r in rows[1:]} == {4}


def test_hexane_2_5_dione_five_first_three_disfavoured():
    """Textbook: hexane-2,5-dione gives 3-methylcyclopent-2-en-1-one; the three-membered closure
    is marked disfavoured (strain, common practice) even though Baldwin-Lusch allow its class."""
    rows = closures_json("CC(=O)CCC(C)=O", "--condense")
    assert rows[0]["ring_size"] == 5
    assert same(rows[0]["product"], "CC1=CC(=O)CC1")
    assert CalcMolFormula(Chem.MolFromSmiles(rows[0]["product"])) == "C6H8O"
    three = [r for r in rows if r["ring_size"] == 3]
    assert three and all(r["outlook"] == "disfavoured" for r in three)
    assert three[0]["class"] == "3-(enolexo)-exo-trig"


def test_octane_2_7_dione_five_membered_first():
    """Textbook: octane-2,7-dione gives 1-(2-methylcyclopent-1-en-1-yl)ethan-1-one, the
    5-(enolexo)-exo-trig closure, ahead of the seven-membered 7-(enolendo) one."""
    rows = closures_json("CC(=O)CCCCC(C)=O", "--condense")
    assert rows[0]["class"] == "5-(enolexo)-exo-trig"
    assert same(rows[0]["product"], "CC(=O)C1=C(C)CCC1")
    assert CalcMolFormula(Chem.MolFromSmiles(rows[0]["product"])) == "C8H12O"
    assert rows[1]["ring_size"] == 7


@pytest.mark.parametrize("smiles, size", [
    ("O=CCCCCC(C)=O", 5),     # 6-oxoheptanal: five-membered onto aldehyde or onto ketone
    ("O=CCCCCCC(C)=O", 6),    # 7-oxooctanal: six-membered onto aldehyde or onto ketone
])
def test_keto_aldehyde_puts_the_aldehyde_first(smiles, size):
    """Common practice: with the same ring size on offer, the aldehyde is the better electrophile."""
    rows = closures_json(smiles)
    same_size = [r for r in rows if r["ring_size"] == size and r["outlook"] == "favoured"]
    assert {r["electrophile"]["kind"] for r in same_size} == {"aldehyde", "ketone"}
    assert rows[0]["electrophile"]["kind"] == "aldehyde" and rows[0]["ring_size"] == size


def test_6_oxoheptanal_gives_1_acetylcyclopentene():
    """Textbook (memory): 6-oxoheptanal with base gives 1-acetylcyclopentene (the ketone enolate
    adds to the aldehyde, then dehydrates)."""
    rows = closures_json("O=CCCCCC(C)=O", "--condense")
    assert same(rows[0]["product"], "CC(=O)C1=CCCC1")


@pytest.mark.parametrize("smiles, product", [
    ("OCCCCC=O", "OC1CCCCO1"),     # 5-hydroxypentanal -> tetrahydropyran-2-ol (cyclic hemiacetal, common practice)
    ("NCCCCBr", "C1CCNC1"),        # 4-bromobutan-1-amine -> pyrrolidine (5-exo-tet, Baldwin 1976)
])
def test_heteroatom_closures(smiles, product):
    rows = closures_json(smiles)
    assert same(rows[0]["product"], product) and rows[0]["outlook"] == "favoured"


@pytest.mark.parametrize("smiles", ["CC(=O)CCCC(C)=O", "CC(=O)CCC(C)=O", "CC(=O)CCCCC(C)=O", "O=CCCCCC(C)=O",
                                    "O=CCCCCCC(C)=O", "OCCCCC=O", "NCCCCBr", "CC(=O)CCCC=CC(=O)C",
                                    "CCOC(=O)CCCCC(=O)OCC", "N#CCCCCC=O"])
@pytest.mark.parametrize("condense", [False, True])
def test_written_skeleton_passes_check(tmp_path, smiles, condense):
    """The --write skeleton replays without an error, and its product line is what the moves give
    (the checker compares them; RDKit sanitizes every intermediate)."""
    out = tmp_path / "draft.mech"
    result = run(smiles, "--write", out, *(["--condense"] if condense else []))
    assert result.exit_code == 0, result.output
    trace, diags = check_file(out)
    assert [d.to_text() for d in diags if d.severity == "error"] == []
    assert trace.complete and trace.mechanism.product is not None


def test_written_skeleton_for_heptanedione_gives_the_textbook_product(tmp_path):
    """The skeleton's own product line is 3-methylcyclohex-2-en-1-one (textbook outcome)."""
    out = tmp_path / "draft.mech"
    assert run("CC(=O)CCCC(C)=O", "--condense", "--write", out).exit_code == 0
    trace, diags = check_file(out)
    assert not [d for d in diags if d.severity in ("error", "warning")], [d.to_text() for d in diags]
    assert same(trace.mechanism.product.smiles, "CC1=CC(=O)CCC1")


def test_symmetric_closures_are_folded():
    """Heptane-2,6-dione is symmetric: C1 onto C6 and C7 onto C2 are one candidate."""
    rows = closures_json("CC(=O)CCCC(C)=O")
    assert len(rows) == 2 and rows[0]["equivalent"] and rows[1]["equivalent"]


def test_table_output_and_mech_input(tmp_path):
    mech = tmp_path / "dione.mech"
    mech.write_text('species base = "[OH-:20]"\nspecies dione = "[CH3:1][C:2](=[O:8])[CH2:3][CH2:4][CH2:5]'
                    '[C:6](=[O:9])[CH3:7]"\n', encoding="utf-8")
    result = run(mech, "--species", "dione")
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    assert lines[1].split()[:3] == ["#", "nucleophile", "electrophile"]
    assert "C1 enolate" in lines[2] and "C6 ketone" in lines[2] and "6-(enolendo)-exo-trig" in lines[2]


@pytest.mark.parametrize("suffix, magic", [(".png", b"\x89PNG"), (".svg", b"<?xml")])
def test_draw_writes_a_grid(tmp_path, suffix, magic):
    out = tmp_path / f"grid{suffix}"
    result = run("CC(=O)CCCC=CC(=O)C", "--draw", out)
    assert result.exit_code == 0, result.output
    assert out.read_bytes().startswith(magic)


@pytest.mark.parametrize("argument, expected", [
    ("CC(=O)CCC(C", "<SMILES>:1:10: error AR102"),
    ("", "<SMILES>:1:1: error AR102 RDKit cannot read the SMILES: empty SMILES"),   # once read as the folder "."
])
def test_bad_smiles_is_located(argument, expected):
    result = run(argument)
    assert result.exit_code == 2 and expected in result.output and "hint:" in result.output
    assert "Traceback" not in result.output


def test_folder_and_bad_drawing_suffix(tmp_path):
    result = run(tmp_path)
    assert result.exit_code == 2 and "error AR100" in result.output
    result = run("CCO", "--draw", tmp_path / "x.gif")
    assert result.exit_code == 2 and "hint:" in result.output


def test_atoms_are_numbered_along_a_written_chain():
    """Carbons are numbered first, in the order written: a chain written end to end gets its
    locants (heptane-2,6-dione: carbonyl carbons C2 and C6)."""
    mol = with_atom_maps(Chem.MolFromSmiles("CC(=O)CCCC(C)=O"))
    carbonyls = sorted(a.GetAtomMapNum() for a in mol.GetAtoms()
                       if a.GetSymbol() == "C" and any(n.GetSymbol() == "O" for n in a.GetNeighbors()))
    assert carbonyls == [2, 6]
    assert find_closures(mol)[0].size == 6


def test_carboxylate_closes_a_lactone_onto_an_alkyl_bromide_only():
    """5-Bromopentanoic acid with base gives pentan-5-olide (6-exo-tet, Baldwin 1976; textbook
    lactonization, common practice); a carboxylate is not offered onto carbonyls."""
    rows = closures_json("OC(=O)CCCCBr")
    assert [(r["nucleophile"]["kind"], r["electrophile"]["kind"], r["class"]) for r in rows] == [
        ("carboxylate", "alkyl leaving group", "6-exo-tet")]
    assert same(rows[0]["product"], "O=C1CCCCO1")
    assert not closures_json("OC(=O)CCCC=O") or all(r["nucleophile"]["kind"] != "carboxylate"
                                                    for r in closures_json("OC(=O)CCCC=O"))


def test_5_chloropentan_2_one_closes_the_cyclopropane_first():
    """Base on 5-chloropentan-2-one gives cyclopropyl methyl ketone (the Organic Syntheses
    preparation, from memory): the C3 enolate's 3-(enolexo)-exo-tet displacement, which
    Baldwin-Lusch 1982 favour, beats the C1 enolate's 5-(enolendo)-exo-tet, which they call
    disfavoured; a displacement is not undone, as an aldol onto a small ring is (hexane-2,5-dione,
    above, still closes its five-membered ring first). The five-membered closure was ranked first."""
    rows = closures_json("CC(=O)CCCCl", "--condense")
    assert rows[0]["ring_size"] == 3 and rows[0]["class"] == "3-(enolexo)-exo-tet"
    assert rows[0]["outlook"] == "favoured"
    assert same(rows[0]["product"], "CC(=O)C1CC1")


def test_a_missing_file_is_not_read_as_smiles(tmp_path):
    """A name ending .mech is a file (no SMILES ends so): it was parsed as a SMILES."""
    result = run(tmp_path / "nofile.mech")
    assert result.exit_code == 2 and "Traceback" not in result.output
    assert f"{tmp_path / 'nofile.mech'}:1:1: error AR100 cannot read file: no such file or folder" in result.output
    assert "hint:" in result.output


def test_a_map_number_used_twice_is_refused_as_check_refuses_it(tmp_path):
    """AR103, the code `arrows check` gives the same species, located at the second use."""
    result = run("[CH3:1][CH2:1]C=O")
    assert result.exit_code == 2 and "<SMILES>:1:8: error AR103 map number 1 is used twice" in result.output
    assert "hint:" in result.output
    mech = tmp_path / "twice.mech"
    mech.write_text('species s = "[CH3:1][CH2:1]C=O"\n', encoding="utf-8")
    _, diags = check_file(mech)
    assert "AR103" in {d.code for d in diags}


def test_species_option_with_a_smiles_is_refused():
    """--species chooses among a .mech file's species; with a SMILES it was silently ignored."""
    result = run("CC(=O)CCCC(C)=O", "--species", "dione")
    assert result.exit_code == 2 and "<SMILES>:1:1: error: --species dione" in result.output
    assert "hint:" in result.output


def test_a_smi_file_of_two_lines_says_only_the_first_is_studied(tmp_path):
    smi = tmp_path / "two.smi"
    smi.write_text("CC(=O)CCCC(C)=O\nOCCCCC=O\n", encoding="utf-8")
    result = run(smi)
    assert result.exit_code == 0
    assert f"{smi}:2:1: note: the file holds 2 SMILES; only the first (line 1) is studied" in result.output


def test_draw_with_no_candidate_says_nothing_was_written(tmp_path):
    out = tmp_path / "grid.png"
    result = run("CCO", "--draw", out)
    assert result.exit_code == 0 and f"{out}: note: no candidate product to draw; nothing written" in result.output
    assert not out.exists()


def test_pick_out_of_range_is_located_at_the_species(tmp_path):
    """Located at the SMILES as written (<SMILES>, or the species line of a .mech), not at a file
    named after the SMILES."""
    result = run("CC(=O)CCCC(C)=O", "--write", tmp_path / "d.mech", "--pick", 5)
    assert result.exit_code == 2 and "<SMILES>:1:1: error: there are 2 candidate(s); --pick 5" in result.output
    mech = tmp_path / "dione.mech"
    mech.write_text('species base = "[OH-:20]"\nspecies dione = "CC(=O)CCCC(C)=O"\n', encoding="utf-8")
    result = run(mech, "--species", "dione", "--write", tmp_path / "d.mech", "--pick", 5)
    assert result.exit_code == 2 and f"{mech}:2:18: error: there are 2" in result.output


def test_a_draft_never_replaces_a_file(tmp_path):
    """`arrows closures x.mech --write x.mech` replaced the mechanism with the draft, exit 0; any
    existing file is now left alone, as `arrows new` leaves it (exit 2, nothing written)."""
    source = tmp_path / "dione.mech"
    source.write_text((ROOT / "gallery" / "05-octanedione-cyclopentene.mech").read_text(encoding="utf-8"),
                      encoding="utf-8")
    other = tmp_path / "notes.mech"
    other.write_text("# my own notes\n", encoding="utf-8")
    before = (source.read_bytes(), other.read_bytes())
    for target in (source, other):
        done = subprocess.run([sys.executable, "-m", "arrows", "closures", str(source), "--write", str(target)],
                              capture_output=True, text=True, timeout=120)
        assert done.returncode == 2 and "hint:" in done.stderr and "Traceback" not in done.stderr, done.stderr
    assert (source.read_bytes(), other.read_bytes()) == before


def test_a_dieckmann_draft_takes_the_ester_s_own_alkoxide(tmp_path):
    """A Dieckmann condensation is run with the alkoxide of the ester's own alcohol (NaOEt in EtOH
    for an ethyl ester; Clayden, the Claisen and Dieckmann condensations): hydroxide would
    saponify the ester. The draft wrote NaOH in water; an aldol draft keeps hydroxide."""
    from click.testing import CliRunner
    from arrows.cli import cli
    out = tmp_path / "dieckmann.mech"
    result = CliRunner().invoke(cli, ["closures", "CCOC(=O)CCCCC(=O)OCC", "--write", str(out)])
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert 'over "NaOEt" under "EtOH"' in text and "CC[O-:" in text and "NaOH" not in text
    aldol = tmp_path / "aldol.mech"
    result = CliRunner().invoke(cli, ["closures", "CC(=O)CCCCC(C)=O", "--write", str(aldol)])
    assert result.exit_code == 0 and 'over "NaOH" under "H2O"' in aldol.read_text(encoding="utf-8")


def test_an_epoxy_alcohol_closes_5_exo_at_the_near_carbon_first():
    """4,5-Epoxypentan-1-ol with base gives tetrahydrofurfuryl alcohol by the 5-exo-tet opening at
    the near carbon; the far carbon's 6-endo-tet opening (tetrahydropyran-3-ol) usually loses (Baldwin
    1976; Nicolaou et al., J. Am. Chem. Soc. 1989, 111, 5330; memory). `closures` found nothing: an
    epoxide carbon was no electrophile."""
    rows = closures_json("OCCCC1CO1")
    assert [(r["electrophile"]["kind"], r["class"], r["outlook"]) for r in rows] == [
        ("epoxide", "5-exo-tet", "favoured"), ("epoxide", "6-endo-tet", "disfavoured")]
    assert same(rows[0]["product"], "OCC1CCCO1") and same(rows[1]["product"], "OC1CCCOC1")


def test_an_iodonium_ion_is_opened_5_exo_to_the_bicyclic_lactone():
    """Iodolactonisation of cyclohex-3-enecarboxylate: the carboxylate opens the iodonium ion at the
    near carbon, 5-exo-tet, to the [3.2.1] iodolactone (Clayden ch. 20; Corey's iodolactone,
    memory); the far carbon's 6-endo opening ([2.2.2]) comes second."""
    rows = closures_json("[O-]C(=O)C1CC2[I+]C2CC1")
    assert [(r["electrophile"]["kind"], r["class"]) for r in rows] == [
        ("halonium ion", "5-exo-tet"), ("halonium ion", "6-endo-tet")]
    assert same(rows[0]["product"], "O=C1OC2CC1CCC2I")


def test_heptanedinitrile_closes_6_exo_dig_onto_the_other_nitrile():
    """Thorpe-Ziegler: the anion of heptanedinitrile adds to the other nitrile, 6-exo-dig, favoured
    (Baldwin 1976; Kurti-Czako, "Thorpe-Ziegler reaction", memory). `closures` found nothing: a
    nitrile carbon was no electrophile."""
    rows = closures_json("N#CCCCCCC#N")
    assert [(r["nucleophile"]["kind"], r["electrophile"]["kind"], r["class"], r["outlook"]) for r in rows] == [
        ("nitrile anion", "nitrile", "6-exo-dig", "favoured")]
    # The imine the draft stops at (its tautomer, the enaminonitrile, is what is isolated).
    assert same(rows[0]["product"], "N#CC1CCCCC1=N")


@pytest.mark.parametrize("smiles", ["OCCCC1CO1", "N#CCCCCCC#N", "[O-]C(=O)C1CC2[I+]C2CC1"])
def test_epoxide_iodonium_and_nitrile_drafts_pass_check(tmp_path, smiles):
    """Guard: the --write skeleton of the first candidate replays with no error or warning."""
    out = tmp_path / "draft.mech"
    result = run(smiles, "--write", out)
    assert result.exit_code == 0, result.output
    trace, diags = check_file(out)
    assert [d.to_text() for d in diags if d.severity != "note"] == []
    assert trace.complete and trace.mechanism.product is not None


@pytest.mark.parametrize("smiles", ["CCOC(=O)CC(=O)CCC=O", "CCOC(=O)C=C([O-])CCC=O", "CCOC([O-])=CC(=O)CCC=O"])
def test_a_keto_ester_anion_closes_enolexo_whichever_form_is_given(smiles):
    """Ethyl 3,6-dioxohexanoate's C2 closes a five-membered ring onto the aldehyde (common practice:
    doubly stabilised anions close five-membered rings readily). Given as the enolate drawn toward
    the ketone, the closure was 5-(enolendo)-exo-trig, disfavoured; the anion is conjugated with the
    ester outside the ring too, and Baldwin-Lusch 1982 (memory) name the class by the enolate's C=C,
    which can lie there: 5-(enolexo)-exo-trig, favoured, for every form, with the same product."""
    first = closures_json(smiles)[0]
    assert first["ring_size"] == 5 and first["class"] == "5-(enolexo)-exo-trig"
    assert first["baldwin"]["verdict"] == "favoured"
    assert same(first["product"].replace("[O-]", "O"), "CCOC(=O)C1C(=O)CCC1O")
