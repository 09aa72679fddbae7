"""`arrows check --jsonl`: one mechanism per line in, one JSON result per line out.

Outside judges: RDKit canonicalizes the gallery's written products independently of our code;
the JSON Schema file is applied by the jsonschema library, not by our own validator; peak memory
is the kernel's count (getrusage) for a separate process.
"""
from __future__ import annotations

import json
import os
import re
import subprocess
import sys
import threading
from pathlib import Path

import jsonschema
import pytest
from rdkit import Chem

from arrows.batch.jsonl import check_line
from arrows.batch.parallel import ClusterPool, ClusterUnavailable
from arrows.language import load
from arrows.model import Mechanism

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
SCHEMA = json.loads((ROOT / "arrows" / "jsonl-input.schema.json").read_text())

WATER_PROTON_TRANSFER = {
    "species": {"water": "[OH2:1]", "base": "[OH-:2]"},
    "steps": [{"label": "proton transfer", "moves": [":O2 -> H(O1)", "O1-H -> O1"]}],
    "product": "O.[OH-]",
}


def as_parts(mechanism: Mechanism, ident) -> dict:
    """The structured form of a parsed mechanism (moves written back in the language)."""
    record = {"id": ident, "species": {s.name: s.smiles for s in mechanism.species}, "steps": []}
    for key in ("title", "caption"):
        if getattr(mechanism, key):
            record[key] = getattr(mechanism, key)
    for step in mechanism.steps:
        entry = {"label": step.label, "moves": [str(m) for m in step.moves]}
        if step.kind != "forward":
            entry["kind"] = step.kind
        for key in ("over", "under"):
            if getattr(step, key):
                entry[key] = getattr(step, key)
        if step.uses:
            entry["uses"] = {s.name: s.smiles for s in step.uses}
        if step.releases:
            entry["releases"] = [str(a) for a in step.releases]
        if step.expects:
            entry["expect"] = [{"smiles": c.smiles, "whole_state": c.whole_state} for c in step.expects]
        record["steps"].append(entry)
    if mechanism.product is not None:
        record["product"] = {"smiles": mechanism.product.smiles, "whole_state": mechanism.product.whole_state}
    return record


def line(obj) -> bytes:
    return json.dumps(obj).encode() + b"\n"


def run_cli(*args, stdin: bytes | None = None, cwd=None) -> subprocess.CompletedProcess:
    return subprocess.run(["arrows", *args],
                          input=stdin, capture_output=True, cwd=cwd, timeout=600)


def rdkit_fragments(smiles: str) -> list[str]:
    """Canonical SMILES of each fragment, computed by RDKit alone."""
    mol = Chem.MolFromSmiles(smiles)
    return sorted(Chem.MolToSmiles(frag) for frag in Chem.GetMolFrags(mol, asMols=True))


@pytest.mark.parametrize("path", GALLERY, ids=lambda p: p.stem)
def test_text_and_parts_of_a_gallery_mechanism_give_one_result(path):
    """Both record forms of each gallery mechanism: same verdict, steps and final state, and the
    final state contains the product the gallery file writes down (textbook outcome named in the
    file), compared fragment by fragment after RDKit's own canonicalization."""
    mechanism = load(path)
    text_result = check_line("data.jsonl", 1, line({"id": path.stem, "text": path.read_text()}))
    parts_record = as_parts(mechanism, path.stem)
    jsonschema.validate(parts_record, SCHEMA)
    parts_result = check_line("data.jsonl", 1, line(parts_record))
    assert text_result["ok"] and parts_result["ok"], (text_result["diagnostics"], parts_result["diagnostics"])
    assert text_result["steps"] == parts_result["steps"] == len(mechanism.steps)
    assert text_result["final_smiles"] == parts_result["final_smiles"]
    if mechanism.product is not None:
        final = rdkit_fragments(text_result["final_smiles"])
        for fragment in rdkit_fragments(mechanism.product.smiles):
            assert fragment in final


def test_a_wrong_move_is_located_at_its_field():
    record = {"id": "r9", **WATER_PROTON_TRANSFER,
              "steps": [{"label": "proton transfer", "moves": [":O2 -> H(O1)", "O1=H -> O1"]}]}
    result = check_line("set.jsonl", 12, line(record))
    assert not result["ok"] and result["id"] == "r9" and result["line"] == 12
    codes = {d["code"]: d for d in result["diagnostics"]}
    assert "AR202" in codes   # `=` written on the single O1-H bond
    assert codes["AR202"]["file"] == "set.jsonl" and codes["AR202"]["line"] == 12
    assert codes["AR202"]["record_location"] == {"field": "/steps/0/moves/1"}


def test_a_text_record_keeps_the_line_and_column_inside_its_text(tmp_path):
    text = 'species w = "[OH2:1]"\nstep "x"\n    :O1 -> H(O1\nend\n'
    result = check_line("set.jsonl", 3, line({"id": 1, "text": text}))
    (tmp_path / "same.mech").write_text(text)
    alone = json.loads(run_cli("check", "--format", "json", str(tmp_path / "same.mech")).stdout)
    [diag] = result["diagnostics"]
    assert diag["code"] == alone[0]["code"] == "AR101"
    assert diag["record_location"] == {"field": "/text", "line": alone[0]["line"], "column": alone[0]["column"]}


BAD_RECORDS = [
    ({"id": 1}, "AR111", ""),
    ({"text": "species w = \"O\""}, "AR111", "/id"),
    ({"id": True, "text": "species w = \"O\""}, "AR111", "/id"),
    ({"id": 1, "species": {"w": "[OH2:1]"}}, "AR111", "/steps"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"label": "x"}]}, "AR111", "/steps/0/moves"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"moves": [1]}]}, "AR111", "/steps/0/moves/0"),
    ({"id": 1, "species": {"2w": "[OH2:1]"}, "steps": []}, "AR111", "/species/2w"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"moves": [], "kind": "fast"}]}, "AR111", "/steps/0/kind"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"moves": [], "label": 'say "hi"'}]}, "AR111",
     "/steps/0/label"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"moves": [], "releases": ["water"]}]}, "AR111",
     "/steps/0/releases/0"),
    ({"id": 1, "species": {"w": "[OH2:1]"}, "steps": [{"moves": [], "tempo": 1}]}, "AR111", "/steps/0/tempo"),
    ({"id": 1, "text": "x", "steps": []}, "AR111", ""),
    ([1, 2], "AR111", ""),
]


@pytest.mark.parametrize("record,code,field", BAD_RECORDS, ids=range(len(BAD_RECORDS)))
def test_a_record_off_the_schema_is_a_located_result_and_the_schema_agrees(record, code, field):
    result = check_line("set.jsonl", 5, line(record))
    [diag] = result["diagnostics"]
    assert (diag["code"], diag["record_location"]["field"], diag["line"]) == (code, field, 5)
    assert diag["hint"] and not result["ok"] and result["final_smiles"] is None
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(record, SCHEMA)


def test_the_schema_accepts_both_forms_and_extra_metadata():
    jsonschema.validate({"id": "a", "text": "species w = \"O\"", "source": "lab book 7"}, SCHEMA)
    jsonschema.validate({"id": 3, **WATER_PROTON_TRANSFER}, SCHEMA)


def test_bad_lines_become_results_in_order_and_the_run_exits_1(tmp_path):
    data = tmp_path / "mixed.jsonl"
    data.write_bytes(line({"id": "good", **WATER_PROTON_TRANSFER}) + b"{not json\n" + b"\n"
                     + b'{"id": "latin1", "text": "caf\xe9"}\n' + line({"id": "tail", **WATER_PROTON_TRANSFER}))
    proc = run_cli("check", "--jsonl", str(data), "-j", "2")
    assert proc.returncode == 1 and b"Traceback" not in proc.stderr
    results = [json.loads(x) for x in proc.stdout.splitlines()]
    assert [(r["line"], r["ok"]) for r in results] == [(1, True), (2, False), (4, False), (5, True)]
    not_json = results[1]["diagnostics"][0]
    assert (not_json["code"], not_json["line"], not_json["column"]) == ("AR110", 2, 2)
    assert results[2]["diagnostics"][0]["code"] == "AR110" and "UTF-8" in results[2]["diagnostics"][0]["message"]
    assert results[0]["final_smiles"] == "O.[OH-]" and results[0]["steps"] == 1
    assert b"4 records checked" in proc.stderr


def test_mechanism_text_given_as_jsonl_gets_a_hint_to_drop_the_flag():
    """A .mech file checked with --jsonl by mistake: its statement lines say so in the hint."""
    for text in ('species water = "[OH2:1]"', "step \"deprotonation\"", "# a comment"):
        diag, = check_line("slip.mech", 1, text.encode())["diagnostics"]
        assert diag["code"] == "AR110" and "without --jsonl" in diag["hint"], text
    diag, = check_line("data.jsonl", 1, b"{not json")["diagnostics"]
    assert "without --jsonl" not in diag["hint"]


def test_stdin_and_output_file(tmp_path):
    out = tmp_path / "results.jsonl"
    proc = run_cli("check", "--jsonl", "-", "-o", str(out), "-j", "1",
                   stdin=line({"id": 7, **WATER_PROTON_TRANSFER}))
    assert proc.returncode == 0 and proc.stdout == b""
    assert json.loads(out.read_text())["id"] == 7
    assert [p.name for p in tmp_path.iterdir()] == ["results.jsonl"]   # no temporary file left


def test_output_to_a_pipe_stays_a_pipe(tmp_path):
    """-o onto a FIFO (or a device such as /dev/null) writes into it instead of replacing it."""
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    received = []
    reader = threading.Thread(target=lambda: received.append(fifo.read_bytes()))
    reader.start()
    data = tmp_path / "one.jsonl"
    data.write_bytes(line({"id": 1, **WATER_PROTON_TRANSFER}))
    assert run_cli("check", "--jsonl", str(data), "-o", str(fifo), "-j", "1").returncode == 0
    reader.join(timeout=30)
    assert json.loads(received[0])["ok"] and fifo.is_fifo()


def test_usage_errors_exit_2(tmp_path):
    assert run_cli("check", "--jsonl", str(tmp_path / "missing.jsonl")).returncode == 2
    assert run_cli("check", "--jsonl", "x.jsonl", "a.mech").returncode == 2
    assert run_cli("check", "-j", "2", str(ROOT / "gallery" / "01-enolate-formation.mech")).returncode == 2


def write_data_set(path: Path, count: int) -> None:
    """Gallery mechanisms in both forms, a small structured record and a broken line, repeated."""
    pool = []
    for mech_path in GALLERY:
        pool.append({"text": mech_path.read_text()})
        pool.append({k: v for k, v in as_parts(load(mech_path), 0).items() if k != "id"})
    pool += [dict(WATER_PROTON_TRANSFER)] * 8
    with path.open("wb") as out:
        for i in range(count):
            if i % 97 == 96:
                out.write(b'{"id": %d, "text": \n' % i)
            else:
                out.write(line({"id": i, **pool[i % len(pool)]}))


def test_jobs_2_gives_the_bytes_of_jobs_1(tmp_path):
    data = tmp_path / "set.jsonl"
    write_data_set(data, 400)
    one = run_cli("check", "--jsonl", str(data), "-j", "1")
    two = run_cli("check", "--jsonl", str(data), "-j", "2")
    assert one.returncode == two.returncode == 1
    assert one.stdout == two.stdout and len(one.stdout.splitlines()) == 400


PEAK_RSS = """
import resource, sys
from arrows.cli import main
sys.argv = ["arrows", "check", "--jsonl", sys.argv[1], "-j", "2", "-o", sys.argv[2], "-q"]
try:
    main()
except SystemExit as stop:
    code = stop.code
# This process's own peak: VmHWM where /proc has it (ru_maxrss carries over the peak of the process
# that started it, ~100 MiB under pytest, which hid any growth below that).
try:
    with open("/proc/self/status") as status:
        own = next(row.split()[1] for row in status if row.startswith("VmHWM:"))
except OSError:
    own = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
print(code, own, resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss)
"""


def test_ten_thousand_lines_check_in_constant_memory(tmp_path):
    """Peak resident memory (kernel's count, KiB) of the reading process and of its workers is the
    same for 1,000 and 10,000 lines, within 10% or 8 MiB of noise."""
    peaks = {}
    for count in (1_000, 10_000):
        data = tmp_path / f"set{count}.jsonl"
        write_data_set(data, count)
        out = tmp_path / f"out{count}.jsonl"
        proc = subprocess.run([sys.executable, "-c", PEAK_RSS, str(data), str(out)], capture_output=True,
                              text=True, timeout=900)
        code, parent, workers = proc.stdout.split()
        assert code == "1"   # the broken lines
        assert sum(1 for _ in out.open()) == count
        peaks[count] = int(parent), int(workers)
    for small, large in zip(peaks[1_000], peaks[10_000]):
        assert large <= max(small * 1.10, small + 8 * 1024), peaks


def test_a_dask_local_cluster_gives_the_local_results(tmp_path):
    distributed = pytest.importorskip("distributed", reason="Dask is the optional extra arrows[cluster]")
    data = tmp_path / "set.jsonl"
    write_data_set(data, 300)
    local = run_cli("check", "--jsonl", str(data), "-j", "1")
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                  dashboard_address=None) as cluster:
        remote = run_cli("check", "--jsonl", str(data), "--cluster", cluster.scheduler_address)
    assert remote.returncode == local.returncode == 1
    assert remote.stdout == local.stdout and len(remote.stdout.splitlines()) == 300


def test_an_unreachable_cluster_is_a_clear_error():
    pytest.importorskip("distributed", reason="Dask is the optional extra arrows[cluster]")
    with pytest.raises(ClusterUnavailable, match="cannot reach"):
        with ClusterPool("tcp://127.0.0.1:9", timeout=1):
            pass


def test_the_documented_records_pass_the_schema_and_check_clean():
    block = (ROOT / "README.md").read_text().split("```json", 1)[1].split("```", 1)[0]
    records = [json.loads(text) for text in re.split(r"\n(?=\{\"id\")", block.strip())]
    assert len(records) == 2
    for number, record in enumerate(records, 1):
        jsonschema.validate(record, SCHEMA)
        result = check_line("docs", number, line(record))
        assert result["ok"] and result["final_smiles"] == "O.[OH-]", result


def test_a_record_nested_too_deeply_is_one_rejected_line():
    """A line nested 100,000 levels deep made Python's JSON reader recurse out and the whole batch
    end in a traceback with no results; it is that line's AR110, and NaN (which JSON has not,
    though Python writes it) is one too."""
    deep = ('{"id": "deep", "x": ' + "[" * 100000 + "]" * 100000 + ', "text": "x"}').encode()
    result = check_line("data.jsonl", 3, deep)
    assert not result["ok"] and result["diagnostics"][0]["code"] == "AR110"
    assert "nested too deeply" in result["diagnostics"][0]["message"]
    nan = check_line("data.jsonl", 4, b'{"id": "n", "x": NaN, "text": "title \\"a\\""}')
    assert nan["diagnostics"][0]["code"] == "AR110" and "NaN" in nan["diagnostics"][0]["message"]


def test_results_to_a_missing_folder_are_a_located_message(tmp_path):
    """`-o` into a folder that does not exist was a FileNotFoundError traceback."""
    data = tmp_path / "data.jsonl"
    data.write_text('{"id": "w", "text": "species w = \\"O\\""}\n', encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "arrows", "check", "--jsonl", str(data), "-o",
                           str(tmp_path / "missing" / "out.jsonl")], capture_output=True, text=True, timeout=120)
    assert done.returncode == 2 and "cannot write" in done.stderr and "Traceback" not in done.stderr


@pytest.mark.parametrize("move", ["releases O1", "", "# a comment", "end", "O1", "O1-H -> O1 releases O1",
                                  "O1-H -> O1\freleases O1", "O1-H -> O1 # a comment"])
def test_a_move_that_is_no_move_is_rejected_where_it_stands(move):
    """Each string of `moves` becomes a line of the mechanism: "releases O1" ran as a release with
    ok true, "" and a comment passed, and "end" was reported at a later move."""
    record = {"id": "m", "species": {"w": "[OH2:1]", "b": "[OH-:2]"},
              "steps": [{"moves": [":O2 -> H(O1)", "O1-H -> O1", move]}]}
    result = check_line("data.jsonl", 1, json.dumps(record).encode())
    (d,) = result["diagnostics"]
    assert (d["code"], d["record_location"]["field"]) == ("AR111", "/steps/0/moves/2") and "not an electron move" in d["message"]


def test_a_move_from_a_triple_bond_is_a_move():
    """A structured record's move from a triple bond (`C1#N2 -> N2`, as the JSON export and the
    input schema write it) was refused as no move, the # read as a comment; the same mechanism as
    a .mech file checks clean (a nitrile protonated on N: common practice)."""
    record = {"id": "t", "species": {"nitrile": "C[C:1]#[N:2]", "acid": "[OH3+:3]"},
              "steps": [{"moves": [":N2 -> H(O3)", "O3-H -> O3", "C1#N2 -> N2"]}]}
    result = check_line("data.jsonl", 1, json.dumps(record).encode())
    assert [d["code"] for d in result["diagnostics"] if d["severity"] == "error"] == [], result
    assert result["steps"] == 1


def test_a_key_written_twice_is_rejected():
    """Python's JSON reader keeps the last of two equal keys without a word: a record's id, or a
    species name written twice, silently lost one of them."""
    result = check_line("data.jsonl", 1, b'{"id": "a", "id": "b", "text": "species w = \\"O\\""}')
    (d,) = result["diagnostics"]
    assert d["code"] == "AR110" and "'id' is written twice" in d["message"]


def test_a_structured_record_is_told_fields_not_lines():
    """A record of species and steps has no lines: "map number 1 is already used (line 1)" named a
    line of the text made from it; the field is named instead."""
    record = {"id": "d", "species": {"w": "[OH2:1]", "b": "[OH-:1]"}, "steps": []}
    result = check_line("data.jsonl", 1, json.dumps(record).encode())
    messages = [d["message"] for d in result["diagnostics"] if d["code"] == "AR103"]
    assert messages == ["map number 1 is already used (at /species/w)"], result["diagnostics"]


def _results_validator() -> jsonschema.Draft202012Validator:
    """The shipped results schema, read from the installed package as a user's validator reads it,
    with the mechanism schema it takes the diagnostic from."""
    from importlib import resources

    from referencing import Registry, Resource

    from arrows import mechanism_json

    schema = json.loads(resources.files("arrows").joinpath("check-results.schema.json").read_text(encoding="utf-8"))
    jsonschema.Draft202012Validator.check_schema(schema)
    registry = Registry().with_resources(
        (s["$id"], Resource.from_contents(s)) for s in (schema, mechanism_json.schema()))
    return jsonschema.Draft202012Validator(schema, registry=registry)


def test_every_result_of_a_real_run_validates_against_the_results_schema(tmp_path):
    """`arrows check --jsonl` on the gallery (each mechanism as a text record and as a parts
    record), two explain examples that warn, and lines that are no mechanism: every result line
    validates against arrows/check-results.schema.json; records edited off what the code writes
    do not."""
    from arrows import mechanism_json
    from arrows.diagnostics import CODES

    records = []
    for number, path in enumerate(GALLERY):
        records.append(line({"id": path.stem, "text": path.read_text(encoding="utf-8")}))
        records.append(line({"id": number, **mechanism_json.document(load(path))["mechanism"]}))
    diels_alder = (ROOT / "gallery" / "13-diels-alder.mech").read_text(encoding="utf-8")
    records += [line({"id": code, "text": CODES[code].example}) for code in ("AR506", "AR508")]
    records += [
        line({"id": "fishhook", "text": diels_alder.replace("->", "~>", 1)}),         # AR3xx errors
        line({"id": "syntax", "text": diels_alder.replace("->", "-> ->", 1)}),        # AR101
        line({"id": "map twice", "species": {"w": "[OH2:1]", "b": "[OH-:1]"}, "steps": []}),
        line({"id": "no move", **WATER_PROTON_TRANSFER,
              "steps": [{"label": "x", "moves": ["nonsense"]}]}),                    # AR111 at a move
        line({"id": True, "text": "x"}), line({"text": "x"}), line([1, 2]),          # AR111, id null
        line({"id": "both", "text": "x", "species": {"a": "C"}, "steps": []}),
        b"{not json\n", b"\n", b"[" * 5000 + b"\n",                                   # AR110; a blank line
        b'{"id": "latin1", "text": "caf\xe9"}\n',
    ]
    data = tmp_path / "set.jsonl"
    data.write_bytes(b"".join(records))
    proc = run_cli("check", "--jsonl", str(data), "-j", "2")
    assert proc.returncode == 1 and b"Traceback" not in proc.stderr, proc.stderr[-2000:]
    results = [json.loads(x) for x in proc.stdout.splitlines()]
    assert len(results) == len(records) - 1   # the blank line has no result
    validator = _results_validator()
    for result in results:
        problems = [e.message for e in validator.iter_errors(result)]
        assert not problems, (result["id"], problems[:3])
    # the run had every kind of result the schema describes
    found = {d["code"] for r in results for d in r["diagnostics"]}
    assert {"AR101", "AR103", "AR110", "AR111", "AR506", "AR508"} <= found, found
    assert any(code.startswith("AR3") for code in found) and any(r["id"] is None for r in results)
    assert {type(r["id"]) for r in results} == {str, int, type(None)}
    assert any(r["warnings"] for r in results) and any(r["ok"] for r in results)

    clean = next(r for r in results if r["ok"] and r["diagnostics"])
    failing = next(r for r in results if r["errors"])
    edits = [
        {**clean, "checked_by": "someone"},                      # a field the code never writes
        {k: v for k, v in clean.items() if k != "final_smiles"},  # a field it always writes
        {**clean, "errors": 1},                                   # ok, yet an error counted
        {**clean, "warnings": 1},                                 # a warning counted, none listed
        {**failing, "ok": True},
        {**clean, "line": 0},
        {**clean, "diagnostics": [{k: v for k, v in clean["diagnostics"][0].items() if k != "record_location"}]},
        {**clean, "diagnostics": [{**clean["diagnostics"][0], "code": "E1"}]},   # off the diagnostic schema
    ]
    for edited in edits:
        assert not validator.is_valid(edited), edited


@pytest.mark.parametrize("typo,meant", [("prodcut", "product"), ("spceies", "species"), ("Product", "product"),
                                        ("titel", "title")])
def test_a_misspelt_record_field_is_named_with_the_field_meant(typo, meant):
    """`prodcut` was ignored as metadata, so the product went unchecked: now AR111 names it."""
    record = {"id": 1, **WATER_PROTON_TRANSFER, "title": "t"}
    record[typo] = record.pop(meant)
    result = check_line("set.jsonl", 3, line(record))
    [diag] = result["diagnostics"]
    assert (diag["code"], diag["record_location"]["field"]) == ("AR111", "/" + typo)
    assert f"did you mean `{meant}`?" in diag["message"] and not result["ok"]


@pytest.mark.parametrize("extra", [{"source": "lab book 7"}, {"products": ["water"]}, {"notes": "x", "doi": "y"}])
def test_metadata_fields_stay_ignored(extra):
    """A field far from ours, or near one the record also has (`products` beside `product`), is
    a data set's metadata: the record checks clean."""
    result = check_line("set.jsonl", 1, line({"id": 1, **WATER_PROTON_TRANSFER, **extra}))
    assert result["ok"] and not result["diagnostics"]


def test_one_indented_json_document_is_one_message_not_a_result_per_line(tmp_path):
    """An `arrows export FILE --to json` document, indented over many lines, gave one AR110 result
    per line (108 for the first gallery file): it is one message now, and no results."""
    document = tmp_path / "da.json"
    assert run_cli("export", str(GALLERY[0]), "--to", "json", "-o", str(document)).returncode == 0
    lines = document.read_text().count("\n")
    for args, stdin in (((str(document),), None), (("-",), document.read_bytes())):
        proc = run_cli("check", "--jsonl", *args, stdin=stdin)
        assert proc.returncode == 2 and proc.stdout == b"", proc.stdout[:300]
        [message, hint] = proc.stderr.decode().splitlines()
        assert f"error AR110 this is one JSON document over {lines} lines, not JSON Lines" in message
        assert "arrows import" in hint


def test_a_record_cut_short_names_the_column_json_gives():
    [diag] = check_line("set.jsonl", 4, b'{"id": 1, "text": "species w')["diagnostics"]
    assert diag["message"] == "not JSON: Unterminated string starting at column 19" and diag["column"] == 19


def test_the_summary_counts_one_step_in_the_singular(tmp_path):
    proc = run_cli("check", "--jsonl", "-", stdin=line({"id": 1, **WATER_PROTON_TRANSFER}))
    assert proc.returncode == 0 and "1 record checked (1 step):" in proc.stderr.decode()


# --- what a data-set builder relies on: ids, options, empty sets, live pipes ---------------------

def _text_record(ident) -> str:
    return json.dumps({"id": ident, **WATER_PROTON_TRANSFER})


def test_a_second_record_with_an_id_already_given_is_warned_at_its_id():
    """32 records with one id passed silently, though results are joined back to records by id.
    The second gets AR113 (a warning: --strict fails on it), naming the first one's line; 17 and
    "17" are two ids."""
    data = "\n".join([_text_record("r1"), _text_record("r2"), "", _text_record("r1"), _text_record(17),
                      _text_record("17")]) + "\n"
    proc = run_cli("check", "--jsonl", "-", stdin=data.encode())
    results = [json.loads(line) for line in proc.stdout.decode().splitlines()]
    assert proc.returncode == 0, proc.stderr
    assert [r["warnings"] for r in results] == [0, 0, 1, 0, 0]
    (warning,) = results[2]["diagnostics"]
    assert (warning["code"], warning["severity"], warning["line"]) == ("AR113", "warning", 4)
    assert warning["record_location"] == {"field": "/id"} and "line 1" in warning["message"]
    assert run_cli("check", "--jsonl", "-", "--strict", stdin=data.encode()).returncode == 1


def test_pka_gap_is_honoured_for_a_data_set():
    """`--pka-gap 40 --jsonl` was accepted and ignored. The gap goes with the work to every worker."""
    from test_pka import HYDROXIDE_ON_PROPANE
    data = (json.dumps({"id": "p", "text": HYDROXIDE_ON_PROPANE}) + "\n").encode()
    for jobs in ("1", "2"):
        default = json.loads(run_cli("check", "--jsonl", "-", "-j", jobs, stdin=data).stdout)
        loose = json.loads(run_cli("check", "--jsonl", "-", "-j", jobs, "--pka-gap", "40", stdin=data).stdout)
        assert "AR508" in [d["code"] for d in default["diagnostics"]]
        assert "AR508" not in [d["code"] for d in loose["diagnostics"]]


def test_format_with_a_data_set_is_refused_and_quiet_drops_the_summary():
    data = (_text_record("r1") + "\n").encode()
    refused = run_cli("check", "--jsonl", "-", "--format", "json", stdin=data)
    assert refused.returncode == 2 and b"--format goes with mechanism FILES" in refused.stderr
    quiet = run_cli("check", "--jsonl", "-", "--quiet", stdin=data)
    assert quiet.returncode == 0 and quiet.stderr == b"" and json.loads(quiet.stdout)["ok"]


@pytest.mark.parametrize("content", [b"", b"\n  \n\t\n"])
def test_an_empty_data_set_is_unreadable_input_as_an_empty_folder_is(content, tmp_path):
    """An empty or all-blank data set exited 0 ("0 records checked"), an empty folder 2: a step
    that wrote nothing went unnoticed. Now exit 2, AR100, and no results file."""
    (tmp_path / "set.jsonl").write_bytes(content)
    proc = run_cli("check", "--jsonl", "set.jsonl", "-o", "out.jsonl", cwd=tmp_path)
    assert proc.returncode == 2
    assert proc.stderr.decode().startswith("set.jsonl:1:1: error AR100 cannot read file: a data set with no records")
    assert not (tmp_path / "out.jsonl").exists() and not list(tmp_path.glob(".arrows-tmp-*"))


def test_an_empty_text_derives_no_state_so_its_final_smiles_is_null():
    """`{"text": ""}` gave "final_smiles": "", where the results schema says null when no state
    was derived."""
    result = check_line("set.jsonl", 1, b'{"id": "te", "text": ""}')
    assert result["final_smiles"] is None and result["diagnostics"][0]["code"] == "AR112"


def test_a_record_arriving_on_a_pipe_is_answered_before_the_next_arrives():
    """Results came out 32 records at a time: a consumer that sends one line and waits for its
    result waited for ever. A line on a pipe is checked at once and its result flushed."""
    proc = subprocess.Popen(["arrows", "check", "--jsonl", "-", "-j", "1"], stdin=subprocess.PIPE,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    try:
        answers = []
        for ident in ("a", "b"):
            proc.stdin.write((_text_record(ident) + "\n").encode())
            proc.stdin.flush()
            got: list[bytes] = []
            reader = threading.Thread(target=lambda: got.append(proc.stdout.readline()), daemon=True)
            reader.start()
            reader.join(timeout=60)
            assert got, f"no result for {ident} while the pipe stayed open"
            answers.append(json.loads(got[0])["id"])
        assert answers == ["a", "b"]
        proc.stdin.close()
        assert proc.wait(timeout=60) == 0
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()


@pytest.mark.parametrize("field, value", [("title", "A\u0007B"), ("caption", "x\x1by"), ("title", "a\x85b"),
                                          ("title", "a\ufffeb")])
def test_the_schema_refuses_the_control_characters_the_tool_refuses(field, value):
    """The schema's quoted text forbade only a double quote, CR, LF and NUL, while the tool refuses
    every control character but tab (AR101): 47 records of a data set were valid by the schema
    (judged by the jsonschema library) and refused by the tool. The hint named a line and column of
    the text made from the record; it now names the record's field."""
    record = {"id": "c", **WATER_PROTON_TRANSFER, field: value}
    assert not jsonschema.Draft202012Validator(SCHEMA).is_valid(record)
    result = check_line("set.jsonl", 1, json.dumps(record).encode())
    (diag,) = [d for d in result["diagnostics"] if d["code"] == "AR101"]
    assert diag["record_location"] == {"field": f"/{field}"}
    assert f"delete the invisible character in /{field} " in diag["hint"], diag["hint"]
    assert jsonschema.Draft202012Validator(SCHEMA).is_valid({**record, field: "A\tB \u03b1"})


def test_states_list_the_intermediates_of_the_aldol_of_ethanal(tmp_path):
    """`--states`: each result lists the starting state and the state after each step. Outside
    judges: RDKit canonicalizes the written species and the intermediates spelt here on their
    own; the intermediates are the textbook course of the aldol addition and condensation of
    ethanal (references.md "Worked outcomes": 3-hydroxybutanal, then but-2-enal; the enolate and
    the alkoxide between them, common practice)."""
    text = (ROOT / "gallery" / "03-acetaldehyde-aldol.mech").read_text(encoding="utf-8")
    broken = text.replace("C5-O6 -> O6", "C5-O6 -> C1")   # the last step cannot be replayed
    data = (line({"id": "aldol", "text": text}) + line({"id": "broken", "text": broken})
            + b"{not json\n" + line({"id": "aldol", "text": text}))
    proc = run_cli("check", "--jsonl", "-", "--states", "-j", "2", stdin=data)
    assert b"Traceback" not in proc.stderr, proc.stderr[-2000:]
    aldol, broken_result, rejected, repeated = [json.loads(x) for x in proc.stdout.splitlines()]
    states = aldol["states"]
    assert len(states) == aldol["steps"] + 1 == 6 and states[-1] == aldol["final_smiles"]
    start = Chem.MolFromSmiles("[CH3:1][CH:2]=[O:3].[CH3:4][CH:5]=[O:6].[OH-:7]")
    for atom in start.GetAtoms():
        atom.SetAtomMapNum(0)
    assert states[0] == Chem.MolToSmiles(start)
    # the enolate, the alkoxide, 3-hydroxybutanal, its enolate, but-2-enal
    for after, present in enumerate(["C=C[O-]", "CC([O-])CC=O", "CC(O)CC=O", "CC(O)C=C[O-]", "CC=CC=O"], start=1):
        assert Chem.MolToSmiles(Chem.MolFromSmiles(present)) in rdkit_fragments(states[after]), (after, states[after])
    # a replay that stops lists the states it derived; a line with no record lists none; a
    # repeated id keeps its states beside the warning
    assert not broken_result["ok"] and broken_result["states"] == states[:5]
    assert rejected["states"] == [] and repeated["states"] == states and repeated["warnings"] == 1
    validator = _results_validator()
    for result in (aldol, broken_result, rejected, repeated):
        assert not list(validator.iter_errors(result)), result["id"]
    assert "states" not in json.loads(run_cli("check", "--jsonl", "-", stdin=line({"id": 1, "text": text})).stdout)
    refused = run_cli("check", "--states", str(ROOT / "gallery" / "03-acetaldehyde-aldol.mech"))
    assert refused.returncode == 2 and b"--states go with --jsonl" in refused.stderr
