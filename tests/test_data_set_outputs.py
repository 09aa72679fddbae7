"""What a data-set builder reads: the versions behind derived data, the schema refusing text the
language refuses, and JSONL lines located right. From a review of the exports as a data-set
builder would use them (RDKit as the judge of the version recorded)."""
from __future__ import annotations

import json
from pathlib import Path

import jsonschema
import pytest
import rdkit

import arrows
from arrows import mechanism_json
from arrows.batch.jsonl import check_line
from arrows.diagnostics import MechanismError

ROOT = Path(__file__).resolve().parents[1]
SN2 = ROOT / "gallery" / "08-sn2-cyanide.mech"


def test_derived_data_records_the_versions_that_made_it():
    """A canonical SMILES is RDKit's and may change between its releases (common practice for
    reaction data sets: record the toolkit's version); the export says which made its states."""
    mechanism = arrows.load(SN2)
    trace, diags = arrows.check_file(SN2)
    doc = json.loads(mechanism_json.dumps(mechanism, trace, diags))
    assert doc["made_by"] == {"arrows": arrows.__version__, "rdkit": rdkit.__version__}
    jsonschema.validate(doc, mechanism_json.schema())
    assert "made_by" not in json.loads(mechanism_json.dumps(mechanism))   # the mechanism alone derives nothing


@pytest.mark.parametrize("title", ["a\u0001b", "a\u0085b", "a\ufffeb"])
def test_the_schema_refuses_text_the_language_refuses(title):
    """`arrows import` wrote .mech files that `arrows check` then refused (a control character in
    the title): the schema's text pattern now refuses what the language does, at the value."""
    doc = {"format": "arrows-mechanism", "version": 1,
           "mechanism": {"title": title, "species": {"w": "[OH2:1]"}, "steps": []}}
    with pytest.raises(MechanismError) as caught:
        mechanism_json.loads(json.dumps(doc), "set.json")
    assert caught.value.diagnostics[0].loc.line == 1 and "title" in caught.value.diagnostics[0].message
    with pytest.raises(MechanismError):
        arrows.parse(f'title "{title}"\nspecies w = "[OH2:1]"\n')


def test_a_jsonl_line_cut_short_is_located_at_its_unterminated_string():
    """The line ending stayed on the line, so a string cut short read as holding a control
    character at column 1; it is now unterminated, at the column where it starts."""
    raw = b'{"id": "a", "text": "species w = \\"[OH2:1]\\"\n'
    diag, = check_line("set.jsonl", 3, raw)["diagnostics"]
    assert diag["code"] == "AR110" and "Unterminated string" in diag["message"] and diag["column"] == 21


def test_a_byte_order_mark_before_the_first_jsonl_line_is_no_part_of_the_record():
    raw = '\ufeff{"id": "x", "text": "species w = \\"[OH2:1]\\"\\n"}\n'.encode("utf-8")
    result = check_line("set.jsonl", 1, raw)
    assert result["ok"] and result["id"] == "x", result


def test_jsonl_result_diagnostics_validate_against_the_shipped_diagnostic_schema():
    """Each diagnostic of a JSONL result carries `record_location`, which the shipped schema's
    diagnostic did not allow (a data-set review: all 275 diagnostics of a result file failed it)."""
    schema = mechanism_json.schema()
    diagnostic = {**schema["$defs"]["diagnostic"], "$defs": schema["$defs"]}
    text = SN2.read_text(encoding="utf-8").replace(":C1 -> C2", ":N1 -> C2")
    results = [check_line("set.jsonl", 1, (json.dumps({"id": "slip", "text": text}) + "\n").encode()),
               check_line("set.jsonl", 2, b'{"id": "cut", "text": "x\n')]
    found = [d for r in results for d in r["diagnostics"]]
    assert {d["code"] for d in found} >= {"AR105", "AR110"}, [d["code"] for d in found]
    for d in found:
        jsonschema.validate(d, diagnostic)
