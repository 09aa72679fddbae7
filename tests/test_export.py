"""Exchange formats: atom-mapped reaction SMILES per step, and JSON in our published schema.

Judges: RDKit's reaction parser (AllChem.ReactionFromSmarts(..., useSmiles=True)) reads every
exported reaction SMILES (Daylight reaction SMILES, an open standard); RDKit counts atoms by element
(hydrogens included) and formal charges on both sides, which must balance because arrows move
electrons, never atoms (common practice). jsonschema (Draft 2020-12) judges the JSON against the
published schema. Textbook outcomes (references.md, "Worked outcomes", memory): buta-1,3-diene +
ethene gives cyclohexene by forming two sigma bonds between the diene ends and the alkene carbons.
"""
from __future__ import annotations

import json
import re
import subprocess
import sys
from collections import Counter
from pathlib import Path

import jsonschema
import pytest
from rdkit import Chem
from rdkit.Chem import AllChem

import arrows
from arrows import mechanism_json

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
IDS = [p.name for p in GALLERY]


def _arrows_main(*args: str) -> subprocess.CompletedProcess:
    """The command line as a user runs it, in a fresh process."""
    return subprocess.run([sys.executable, "-c", "from arrows.cli import main; main()", *args],
                          capture_output=True, text=True)


def _export(path: Path, target: str) -> str:
    done = _arrows_main("export", str(path), "--to", target)
    assert done.returncode == 0, done.stderr
    assert "Traceback" not in done.stderr
    return done.stdout


def _side_counts(templates) -> tuple[Counter, int]:
    """Atoms by element (implicit and explicit hydrogens included) and the total formal charge."""
    elements, charge = Counter(), 0
    for template in templates:
        mol = Chem.Mol(template)
        mol.UpdatePropertyCache(strict=False)
        for atom in mol.GetAtoms():
            elements[atom.GetSymbol()] += 1
            elements["H"] += atom.GetTotalNumHs()
            charge += atom.GetFormalCharge()
    return elements, charge


def _written_maps(mechanism: arrows.Mechanism) -> dict[int, str]:
    """Map number -> element, as written in the species SMILES of the mechanism."""
    written = {}
    for species in list(mechanism.species) + [s for step in mechanism.steps for s in step.uses]:
        for atom in Chem.MolFromSmiles(species.smiles, sanitize=False).GetAtoms():
            if atom.GetAtomMapNum():
                written[atom.GetAtomMapNum()] = atom.GetSymbol()
    return written


# --- reaction SMILES ---------------------------------------------------------------------------

@pytest.mark.parametrize("path", GALLERY, ids=IDS)
def test_each_step_is_a_balanced_fully_mapped_reaction(path):
    mechanism = arrows.load(path)
    lines = _export(path, "rxn-smiles").splitlines()
    assert len(lines) == len(mechanism.steps)
    written = _written_maps(mechanism)
    for line, step in zip(lines, mechanism.steps):
        reaction_smiles, label = line.split("\t")
        assert label == step.label
        reaction = AllChem.ReactionFromSmarts(reaction_smiles, useSmiles=True)
        reactants, products = list(reaction.GetReactants()), list(reaction.GetProducts())
        assert reactants and products, line
        left = [a for m in reactants for a in m.GetAtoms()]
        right = [a for m in products for a in m.GetAtoms()]
        # every atom carries a map, each number once per side, the same numbers on both sides
        assert all(a.GetAtomMapNum() for a in left + right), line
        left_maps = Counter(a.GetAtomMapNum() for a in left)
        assert max(left_maps.values()) == 1
        assert left_maps == Counter(a.GetAtomMapNum() for a in right)
        # a map number keeps its atom: same element on both sides, and as written in the species
        elements = {a.GetAtomMapNum(): a.GetSymbol() for a in left}
        assert all(elements[a.GetAtomMapNum()] == a.GetSymbol() for a in right)
        assert all(written[n] == elements[n] for n in elements if n in written)
        assert _side_counts(reactants) == _side_counts(products), line
        # and every side sanitizes in RDKit
        for template in reactants + products:
            Chem.SanitizeMol(Chem.Mol(template))


def _bonds(templates) -> set[frozenset]:
    return {frozenset((b.GetBeginAtom().GetAtomMapNum(), b.GetEndAtom().GetAtomMapNum()))
            for m in templates for b in m.GetBonds()}


def test_diels_alder_forms_the_two_textbook_sigma_bonds():
    """Cyclohexene from butadiene (C1=C2-C3=C4) and ethene (C5=C6): new sigma bonds C1-C6 and
    C4-C5 (textbook; references.md worked outcome, memory), read by RDKit from our export."""
    line = _export(ROOT / "gallery" / "13-diels-alder.mech", "rxn-smiles").splitlines()[0]
    reaction = AllChem.ReactionFromSmarts(line.split("\t")[0], useSmiles=True)
    formed = _bonds(reaction.GetProducts()) - _bonds(reaction.GetReactants())
    assert formed == {frozenset((1, 6)), frozenset((4, 5))}
    product = Chem.Mol(reaction.GetProducts()[0])
    for atom in product.GetAtoms():
        atom.SetAtomMapNum(0)
    assert Chem.CanonSmiles(Chem.MolToSmiles(product)) == Chem.CanonSmiles("C1=CCCCC1")


def test_export_refuses_a_mechanism_with_errors(tmp_path):
    source = tmp_path / "broken.mech"
    source.write_text((ROOT / "gallery" / "13-diels-alder.mech").read_text().replace("->", "~>", 1))
    out = tmp_path / "out.txt"
    done = _arrows_main("export", str(source), "--to", "rxn-smiles", "-o", str(out))
    assert done.returncode == 1
    assert re.search(r"broken\.mech:\d+:\d+: error AR\d{3}", done.stderr)
    assert not out.exists()


def test_export_of_an_unreadable_file_exits_2(tmp_path):
    done = _arrows_main("export", str(tmp_path / "missing.mech"), "--to", "json")
    assert done.returncode == 2 and "AR100" in done.stderr and "Traceback" not in done.stderr


# --- JSON --------------------------------------------------------------------------------------

@pytest.mark.parametrize("path", GALLERY, ids=IDS)
def test_json_validates_and_reads_back_to_the_same_text(path, tmp_path):
    exported = tmp_path / "m.json"
    done = _arrows_main("export", str(path), "--to", "json", "-o", str(exported))
    assert done.returncode == 0, done.stderr
    document = json.loads(exported.read_text(encoding="utf-8"))
    jsonschema.Draft202012Validator(mechanism_json.schema()).validate(document)
    mechanism = arrows.load(path)
    assert len(document["states"]) == len(mechanism.steps) + 1
    # text -> JSON -> text: the imported text parses to the mechanism we started from
    imported = _arrows_main("import", str(exported))
    assert imported.returncode == 0, imported.stderr
    assert arrows.parse(imported.stdout, mechanism.source_name) == mechanism


@pytest.mark.parametrize("path", GALLERY, ids=IDS)
def test_json_states_agree_with_rdkit(path):
    """Each state's canonical SMILES is what RDKit makes of its mapped SMILES, and its formula is
    RDKit's formula of that SMILES (with isotopes written apart, D for 2H, when a label is there:
    the deuterium exchange's C6H10D3O3-)."""
    from rdkit.Chem.rdMolDescriptors import CalcMolFormula
    mechanism = arrows.load(path)
    document = mechanism_json.document(mechanism, mechanism.trace, mechanism.check())
    for state in document["states"]:
        mol = Chem.MolFromSmiles(state["smiles"])
        labelled = any(atom.GetIsotope() for atom in mol.GetAtoms())
        assert CalcMolFormula(mol, separateIsotopes=labelled, abbreviateHIsotopes=labelled) == state["formula"]
        assert Chem.GetFormalCharge(mol) == state["charge"]
        for atom in mol.GetAtoms():
            atom.SetAtomMapNum(0)
        assert Chem.CanonSmiles(Chem.MolToSmiles(mol)) == Chem.CanonSmiles(state["canonical_smiles"])


def test_json_arrows_name_atoms_of_the_reaction():
    """The resolved arrows use the map numbers of the step's reaction SMILES: a proton transfer's
    lone-pair arrow starts at the base oxygen and ends at a bond to a hydrogen (common practice)."""
    mechanism = arrows.load(ROOT / "gallery" / "05-octanedione-cyclopentene.mech")
    first = mechanism_json.document(mechanism, mechanism.trace)["states"][1]
    reaction = AllChem.ReactionFromSmarts(first["reaction_smiles"], useSmiles=True)
    symbol = {a.GetAtomMapNum(): a.GetSymbol() for m in reaction.GetReactants() for a in m.GetAtoms()}
    lone_pair = first["arrows"][0]
    assert lone_pair["source"] == "lone_pair" and lone_pair["source_atoms"] == [11]
    assert sorted(symbol[n] for n in lone_pair["sink_atoms"]) == ["H", "O"]


def test_a_bad_json_file_is_located(tmp_path):
    mechanism = arrows.load(ROOT / "gallery" / "13-diels-alder.mech")
    good = mechanism_json.dumps(mechanism)
    # A number where a string belongs; located where the string stood (the file's path, which the
    # JSON also holds, may contain any digits).
    where = good.index('"cycloaddition"')
    text = good.replace('"cycloaddition"', "17", 1)
    bad = tmp_path / "bad.json"
    bad.write_text(text, encoding="utf-8")
    line = good.count("\n", 0, where) + 1
    column = where - (good.rfind("\n", 0, where) + 1) + 1
    done = _arrows_main("import", str(bad))
    assert done.returncode == 2
    assert f"bad.json:{line}:{column}: error AR100" in done.stderr
    assert "Traceback" not in done.stderr


def test_a_bad_move_inside_json_is_located_in_its_string(tmp_path):
    mechanism = arrows.load(ROOT / "gallery" / "13-diels-alder.mech")
    first_move = str(mechanism.steps[0].moves[0])
    broken = first_move.replace("->", "-> ->")
    text = mechanism_json.dumps(mechanism).replace(f'"{first_move}"', f'"{broken}"')
    bad = tmp_path / "bad.json"
    bad.write_text(text, encoding="utf-8")
    line = next(i for i, row in enumerate(text.splitlines(), 1) if broken in row)
    column = text.splitlines()[line - 1].index(broken) + broken.index("-> ->") + 4
    done = _arrows_main("import", str(bad))
    assert done.returncode == 2
    assert f"bad.json:{line}:{column}: error AR101" in done.stderr


@pytest.mark.parametrize("path", GALLERY, ids=IDS)
def test_exported_mechanism_is_a_data_set_record(path):
    """The `mechanism` object of the export has the shape of a record of `arrows check --jsonl`
    (arrows/jsonl-input.schema.json), so exported mechanisms can be checked at scale as they are."""
    record_schema = json.loads((ROOT / "arrows" / "jsonl-input.schema.json").read_text(encoding="utf-8"))
    document = mechanism_json.document(arrows.load(path))
    jsonschema.Draft202012Validator(record_schema).validate({"id": path.stem, **document["mechanism"]})


def test_exported_mechanisms_check_clean_as_a_data_set(tmp_path):
    """End to end: the exported `mechanism` objects of the whole gallery, one JSONL record each,
    pass `arrows check --jsonl` without errors."""
    records = tmp_path / "gallery.jsonl"
    with records.open("w", encoding="utf-8") as out:
        for path in GALLERY:
            document = mechanism_json.document(arrows.load(path))
            out.write(json.dumps({"id": path.stem, **document["mechanism"]}, ensure_ascii=False) + "\n")
    done = _arrows_main("check", "--jsonl", str(records))
    assert done.returncode == 0, done.stdout[-2000:] + done.stderr
    results = [json.loads(line) for line in done.stdout.splitlines() if line.strip()]
    assert [r["id"] for r in results] == [p.stem for p in GALLERY]
    assert all(r["errors"] == 0 for r in results)


def test_an_unwritable_output_is_a_message_not_a_traceback(tmp_path):
    target = tmp_path / "no-such-folder" / "out.json"
    done = _arrows_main("export", str(GALLERY[0]), "--to", "json", "-o", str(target))
    assert done.returncode == 2
    assert done.stderr.startswith(f"error: cannot write {target}: ") and "Traceback" not in done.stderr


@pytest.mark.parametrize("constant", ["NaN", "Infinity"])
def test_import_refuses_nan_and_infinity_with_a_location(constant, tmp_path):
    """JSON has no NaN or Infinity, though Python's json module writes them: `arrows import` of
    such a file ended in an AttributeError traceback; it is a located AR100, exit 2."""
    path = tmp_path / "nan.json"
    path.write_text('{"version": 1, "mechanism": {"species": []}, "extra": ' + constant + '}', encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "arrows", "import", str(path)], capture_output=True, text=True,
                          timeout=120)
    assert done.returncode == 2 and f"{constant} is not a JSON value" in done.stderr
    assert "Traceback" not in done.stderr


def _exported(tmp_path) -> str:
    done = _arrows_main("export", str(GALLERY[0]), "--to", "json")
    assert done.returncode == 0, done.stderr
    return done.stdout


@pytest.mark.parametrize("edit, says", [
    (lambda text: text.replace('"version": 1', '"version": 1' + "0" * 5000, 1), "a number of 5001 digits"),
    (lambda text: text.replace('"title": "', '"title": "\\ud800', 1), "half of a surrogate pair"),
    (lambda text: text.replace('"title": "', '"title": "a\\u0000', 1), "does not match"),
], ids=["5001-digit number", "lone surrogate", "NUL in a string"])
def test_import_refuses_valid_but_unwritable_json_with_a_location(edit, says, tmp_path):
    """JSON the decoder takes but no .mech text can come from: a 5,001-digit number (Python's int
    conversion stops at 4,300 and raised a ValueError traceback), half a surrogate pair (a
    UnicodeEncodeError traceback on output), a NUL in a string (written out, then refused by
    `arrows check`). Each is a located AR100, exit 2, and nothing is written."""
    path = tmp_path / "odd.json"
    path.write_text(edit(_exported(tmp_path)), encoding="utf-8")
    target = tmp_path / "odd.mech"
    done = _arrows_main("import", str(path), "-o", str(target))
    assert done.returncode == 2 and "AR100" in done.stderr and says in done.stderr, done.stderr
    assert "Traceback" not in done.stderr and not target.exists()


@pytest.mark.parametrize("command", [["export", "{src}", "--to", "json", "-o", "{src}"], ["import", "{json}", "-o", "{json}"]],
                         ids=["export", "import"])
def test_export_and_import_never_write_over_their_input(command, tmp_path):
    """`arrows export a.mech --to json -o a.mech` replaced the mechanism with its JSON, and import
    likewise its JSON with the text; both are refused (exit 2) and the input is untouched."""
    src = tmp_path / "a.mech"
    src.write_text(GALLERY[0].read_text(encoding="utf-8"), encoding="utf-8")
    js = tmp_path / "a.json"
    js.write_text(_exported(tmp_path), encoding="utf-8")
    args = [a.format(src=src, json=js) for a in command]
    before = (src.read_bytes(), js.read_bytes())
    done = _arrows_main(*args)
    assert done.returncode == 2 and "is the input" in done.stderr and "hint:" in done.stderr
    assert (src.read_bytes(), js.read_bytes()) == before


def test_import_refuses_a_mechanism_too_large_to_check(tmp_path):
    """An import whose .mech text would exceed the size `arrows check` reads (5 MB) was written
    with exit 0, then refused by check; it is refused at import, nothing written."""
    document = json.loads(_exported(tmp_path))
    document["mechanism"]["steps"][0]["label"] = "x" * 5_100_000
    path = tmp_path / "huge.json"
    path.write_text(json.dumps(document), encoding="utf-8")
    target = tmp_path / "huge.mech"
    done = _arrows_main("import", str(path), "-o", str(target))
    assert done.returncode == 2 and "AR100" in done.stderr and "nothing written" in done.stderr, done.stderr
    assert not target.exists()


# --- several files, or a folder: one output -----------------------------------------------------

def _lines(text: str) -> list[str]:
    assert text.endswith("\n") and "\n\n" not in text, text[-200:]
    return text.splitlines()


def _bulk_folder(tmp_path) -> tuple[Path, dict[str, Path]]:
    """A data-set folder: two good mechanisms named so that natural order (2 before 10) differs
    from plain order, one with an error in a subfolder, one in a dot-folder (left out)."""
    folder = tmp_path / "set"
    (folder / "sub").mkdir(parents=True)
    (folder / ".git").mkdir()
    files = {"sn2": folder / "2-sn2.mech", "da": folder / "10-da.mech", "broken": folder / "sub" / "3-broken.mech"}
    files["sn2"].write_text((ROOT / "gallery" / "08-sn2-cyanide.mech").read_text(encoding="utf-8"), encoding="utf-8")
    files["da"].write_text((ROOT / "gallery" / "13-diels-alder.mech").read_text(encoding="utf-8"), encoding="utf-8")
    # A pair arrow written as a fishhook: an AR3xx error (the electron count of two bonds goes wrong).
    files["broken"].write_text((ROOT / "gallery" / "13-diels-alder.mech").read_text(encoding="utf-8")
                               .replace("->", "~>", 1), encoding="utf-8")
    (folder / ".git" / "x.mech").write_text(files["da"].read_text(encoding="utf-8"), encoding="utf-8")
    return folder, files


def test_bulk_json_export_of_the_gallery_is_one_record_per_file_equal_to_its_single_export(tmp_path):
    """`arrows export gallery/ --to json -o OUT`: JSON Lines, one record per .mech file in natural
    order, each the document the single-file export writes for that file (parsed: equal), and
    valid against the published schema."""
    out = tmp_path / "gallery.jsonl"
    done = _arrows_main("export", str(ROOT / "gallery"), "--to", "json", "-o", str(out))
    assert done.returncode == 0, done.stderr
    assert done.stdout == "" and "21 of 21 mechanisms exported" in done.stderr, done.stderr
    records = [json.loads(line) for line in _lines(out.read_text(encoding="utf-8"))]
    assert len(GALLERY) == 21 and len(records) == 21
    assert [r["source"] for r in records] == [str(p) for p in GALLERY]
    validator = jsonschema.Draft202012Validator(mechanism_json.schema())
    for path, record in zip(GALLERY, records):
        validator.validate(record)
        assert record == json.loads(_export(path, "json")), path.name


def test_bulk_rxn_smiles_lines_start_with_the_file(tmp_path):
    """Several FILEs: the step lines of each, in the order the files were given, each line
    `FILE<tab>reaction SMILES<tab>label`; the reaction and label columns are the single-file
    export's lines."""
    given = [GALLERY[12], GALLERY[0], GALLERY[7]]   # not sorted: files named one by one keep their order
    assert [p.name for p in given] == ["13-diels-alder.mech", "01-enolate-formation.mech", "08-sn2-cyanide.mech"]
    done = _arrows_main("export", *map(str, given), "--to", "rxn-smiles")
    assert done.returncode == 0, done.stderr
    expected = [f"{path}\t{line}" for path in given for line in _lines(_export(path, "rxn-smiles"))]
    assert _lines(done.stdout) == expected
    assert all(len(line.split("\t")) == 3 for line in expected)


@pytest.mark.parametrize("target", ["json", "rxn-smiles"])
def test_bulk_export_of_a_folder_with_a_broken_file_exits_1_and_writes_the_others(target, tmp_path):
    folder, files = _bulk_folder(tmp_path)
    out = tmp_path / "out.txt"
    done = _arrows_main("export", str(folder), "--to", target, "-o", str(out))
    assert done.returncode == 1, done.stderr
    assert re.search(rf"^{re.escape(str(files['broken']))}:\d+:\d+: error AR3\d\d ", done.stderr, re.M), done.stderr
    assert "2 of 3 mechanisms exported" in done.stderr and "Traceback" not in done.stderr
    text = out.read_text(encoding="utf-8")
    if target == "json":
        assert [json.loads(line)["source"] for line in _lines(text)] == [str(files["sn2"]), str(files["da"])]
    else:
        expected = [f"{files[k]}\t{line}" for k in ("sn2", "da") for line in _lines(_export(files[k], "rxn-smiles"))]
        assert _lines(text) == expected


def test_bulk_export_of_an_unreadable_file_or_an_empty_folder_exits_2_and_writes_the_others(tmp_path):
    (tmp_path / "empty").mkdir()
    missing = tmp_path / "missing.mech"
    done = _arrows_main("export", str(GALLERY[12]), str(missing), str(tmp_path / "empty"), "--to", "json")
    assert done.returncode == 2, done.stderr
    assert f"{missing}:1:1: error AR100" in done.stderr and f"{tmp_path / 'empty'}:1:1: error AR100" in done.stderr
    assert [json.loads(line)["source"] for line in _lines(done.stdout)] == [str(GALLERY[12])]


def test_bulk_export_output_is_atomic(tmp_path, monkeypatch):
    """-o OUT appears whole or not at all: a run stopped after its first record (Ctrl-C) and a run
    in which every mechanism has errors leave the previous OUT byte for byte, and no temporary file."""
    from click.testing import CliRunner

    from arrows.atomic import TEMP_MARK
    from arrows.cli import cli

    folder, files = _bulk_folder(tmp_path)
    out = tmp_path / "out.jsonl"
    done = _arrows_main("export", str(folder), "--to", "json", "-o", str(out))
    assert done.returncode == 1 and len(_lines(out.read_text(encoding="utf-8"))) == 2, done.stderr
    before = out.read_bytes()

    calls = []
    real = mechanism_json.document

    def stopped_after_one(*args, **kwargs):
        calls.append(1)
        if len(calls) == 2:
            raise KeyboardInterrupt
        return real(*args, **kwargs)

    monkeypatch.setattr(mechanism_json, "document", stopped_after_one)
    result = CliRunner().invoke(cli, ["export", str(files["da"]), str(files["sn2"]), "--to", "json", "-o", str(out)])
    assert result.exit_code != 0 and len(calls) == 2, result.output
    assert out.read_bytes() == before
    monkeypatch.undo()

    done = _arrows_main("export", str(files["broken"]), str(folder / "sub"), "--to", "json", "-o", str(out))
    assert done.returncode == 1 and f"{out} was not written" in done.stderr, done.stderr
    assert out.read_bytes() == before
    assert not [p.name for p in tmp_path.iterdir() if TEMP_MARK in p.name]


def test_bulk_and_single_file_exports_differ_only_as_documented(tmp_path):
    """One FILE keeps the output it always had: the indented document (mechanism_json.dumps) and
    `reaction<tab>label` lines. The same file reached through a folder is bulk output: the same
    document on one line, the file as a first column."""
    from arrows.api import checked

    path = GALLERY[12]
    mechanism = arrows.load(path)
    single_json = _export(path, "json")
    assert single_json == mechanism_json.dumps(mechanism, *checked(mechanism))
    single_rxn = _export(path, "rxn-smiles")
    assert all(len(line.split("\t")) == 2 for line in _lines(single_rxn))

    folder = tmp_path / "one"
    folder.mkdir()
    copy = folder / path.name
    copy.write_text(path.read_text(encoding="utf-8"), encoding="utf-8")
    bulk_json = _export(folder, "json")
    assert len(_lines(bulk_json)) == 1
    assert json.loads(bulk_json) == json.loads(_export(copy, "json"))
    assert _lines(_export(folder, "rxn-smiles")) == [f"{copy}\t{line}" for line in _lines(single_rxn)]


# VmHWM: the peak resident memory of this process image alone. (getrusage's ru_maxrss carries over
# the peak of the process that started it: under pytest, ~100 MiB whatever the export did.)
_PEAK_RSS = """
import sys
from arrows.cli import main
sys.argv = ["arrows", "export", *sys.argv[1:]]
try:
    main()
except SystemExit as done:
    with open("/proc/self/status") as status:
        peak = next(row.split()[1] for row in status if row.startswith("VmHWM:"))
    print(done.code, peak)
"""


@pytest.mark.skipif(not Path("/proc/self/status").exists(), reason="reads the peak from /proc (Linux)")
def test_bulk_export_runs_in_constant_memory(tmp_path):
    """Peak resident memory (the kernel's VmHWM, KiB) of a bulk export of 21 files and of 420 (the
    gallery 20 times over, in subfolders) agree within 8 MiB: each mechanism is let go once written
    (a cache kept every one, 70 KiB a file)."""
    peaks = {}
    for copies in (1, 20):
        folder = tmp_path / f"x{copies}"
        for n in range(copies):
            (folder / str(n)).mkdir(parents=True)
            for path in GALLERY:
                (folder / str(n) / path.name).write_bytes(path.read_bytes())
        out = tmp_path / f"x{copies}.jsonl"
        done = subprocess.run([sys.executable, "-c", _PEAK_RSS, str(folder), "--to", "json", "-o", str(out)],
                              capture_output=True, text=True, timeout=900)
        code, peak = done.stdout.split()
        assert code == "0", done.stderr
        assert len(_lines(out.read_text(encoding="utf-8"))) == 21 * copies
        peaks[copies] = int(peak)
    assert peaks[20] <= peaks[1] + 8 * 1024, peaks


def test_bulk_json_records_stay_one_line_each_for_splitlines(tmp_path):
    """A title may hold U+2028 (the language refuses control characters, not this separator);
    str.splitlines breaks a line there, so the record writes it escaped: still the same JSON."""
    title_with_separator = (ROOT / "gallery" / "13-diels-alder.mech").read_text(encoding="utf-8").replace(
        "Diels-Alder:", "Diels\u2028Alder:", 1)
    (tmp_path / "a.mech").write_text(title_with_separator, encoding="utf-8")
    (tmp_path / "b.mech").write_text(title_with_separator, encoding="utf-8")
    done = _arrows_main("export", str(tmp_path), "--to", "json")
    assert done.returncode == 0, done.stderr
    records = [json.loads(line) for line in done.stdout.splitlines()]
    assert len(records) == 2 and records[0]["mechanism"]["title"].startswith("Diels\u2028Alder:")


def test_import_of_json_lines_says_it_is_json_lines_and_what_to_do(tmp_path):
    """`export FOLDER --to json` writes JSON Lines; import of it was told the file "must be a JSON
    document written by `arrows export --to json`", which it was."""
    folder, _ = _bulk_folder(tmp_path)
    (folder / "sub" / "3-broken.mech").unlink()
    data = tmp_path / "set.jsonl"
    assert _arrows_main("export", str(folder), "--to", "json", "-o", str(data)).returncode == 0
    done = _arrows_main("import", str(data))
    assert done.returncode == 2 and "Traceback" not in done.stderr
    assert "this is JSON Lines, one mechanism per line (2 lines); import takes one JSON document" in done.stderr
    assert "arrows check --jsonl" in done.stderr


def test_a_truncated_json_file_names_the_place_json_gives(tmp_path):
    """json's own message for a string cut off ends "starting at": the place is its line and column."""
    good = mechanism_json.dumps(arrows.load(ROOT / "gallery" / "13-diels-alder.mech"))
    cut = good.index('"title": "') + len('"title": "') + 3
    (tmp_path / "cut.json").write_text(good[:cut], encoding="utf-8")
    line = good.count("\n", 0, cut) + 1
    column = cut - 3 - (good.rfind("\n", 0, cut) + 1)
    done = _arrows_main("import", str(tmp_path / "cut.json"))
    assert done.returncode == 2
    assert f"cut.json:{line}:{column}: error AR100 not JSON: Unterminated string starting at line {line} column {column}" \
        in done.stderr, done.stderr


def test_rxn_smiles_numbers_every_hydrogen_of_an_atom_whose_hydrogen_a_move_names(tmp_path):
    """What the README says of the hydrogens in `--to rxn-smiles`: it said "each hydrogen a move
    names", but both of a CH2's hydrogens are numbered when `H(C3)` names one (the language does not
    say which moves). RDKit reads the reaction: hydrogen neighbours per mapped atom, step 1 of an
    E1 dehydration of 2-methylbutan-2-ol (textbook outcome: the Zaitsev alkene, common practice)."""
    readme = " ".join((ROOT / "README.md").read_text().split())
    assert "on each atom whose hydrogen a move names (`H(C3)` or `C3-H`: all of C3's hydrogens" in readme
    mech = tmp_path / "e1.mech"
    mech.write_text('species alcohol = "[CH3:1][C:2]([CH3:5])([OH:6])[CH2:3][CH3:4]"\n'
                    'species hydronium = "[OH3+:7]"\n'
                    'step "protonation"\n    :O6 -> H(O7)\n    O7-H -> O7\nend\n'
                    'step "ionisation"\n    C2-O6 -> O6\n    releases O6\nend\n'
                    'step "deprotonation"\n    :O7 -> H(C3)\n    C3-H -> C2=C3\nend\n')
    reactants = _export(mech, "rxn-smiles").splitlines()[0].split(">>")[0]
    mol = Chem.MolFromSmiles(reactants, sanitize=False)
    explicit = {a.GetAtomMapNum(): sum(n.GetSymbol() == "H" for n in a.GetNeighbors()) for a in mol.GetAtoms()
                if a.GetSymbol() != "H"}
    assert explicit == {1: 0, 2: 0, 3: 2, 4: 0, 5: 0, 6: 0, 7: 3}
    assert all(a.GetAtomMapNum() > 7 for a in mol.GetAtoms() if a.GetSymbol() == "H")


@pytest.mark.parametrize("written, broken, code", [
    ('"[CH2:1]=[CH:2][CH:3]=[CH2:4]"', '"[CH2:1]=[CH:2][CH:3]=[CH2:4"', "AR102 RDKit cannot read the SMILES of diene"),
    ('"C1=CCCCC1"', '"C1=CCCCC"', "AR102 RDKit cannot read the checkpoint SMILES"),
], ids=["species", "product"])
def test_import_refuses_a_smiles_rdkit_cannot_read_with_its_place_in_the_json(written, broken, code, tmp_path):
    """A SMILES RDKit cannot read (an unclosed bracket, an unclosed ring; RDKit as judge) was
    passed through into the .mech text, exit 0, for `arrows check` to refuse later. It is the
    AR102 that check gives, located on its line of the JSON, at its string (inside it where RDKit
    names a position); nothing is written, to -o or to standard output."""
    good = mechanism_json.dumps(arrows.load(ROOT / "gallery" / "13-diels-alder.mech"))
    text = good.replace(written, broken, 1)   # (the mechanism comes first, before the derived states)
    bad = tmp_path / "bad.json"
    bad.write_text(text, encoding="utf-8")
    row = text[:text.index(broken)].count("\n") + 1
    quote = text.splitlines()[row - 1].index(broken) + 1
    target = tmp_path / "bad.mech"
    for output in ([], ["-o", str(target)]):
        done = _arrows_main("import", str(bad), *output)
        assert done.returncode == 2, done.stderr
        place = re.search(rf"bad\.json:{row}:(\d+): error {re.escape(code)}", done.stderr)
        assert place and quote <= int(place.group(1)) < quote + len(broken), done.stderr
        assert "nothing written" in done.stderr and "Traceback" not in done.stderr
        assert done.stdout == "" and not target.exists()
