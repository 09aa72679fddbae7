"""Machine-readable accounts of a batch: a JSON report and a JUnit XML file for CI pipelines.
Both are written atomically; neither carries a time stamp, so a re-run gives the same bytes."""
from __future__ import annotations

import json
import xml.etree.ElementTree as ET
from pathlib import Path

from ..atomic import write_text
from .record import SchemeRecord, diagnostic_line


def report_dict(records: list[SchemeRecord], complete: bool, tool_version: str) -> dict:
    from rdkit import __version__ as rdkit_version
    return {
        # RDKit's version too: aromaticity, valence and stereo perception, and so some verdicts and
        # every depiction, may change with it (a data set's results say which one made them)
        "tool": {"name": "arrows", "version": tool_version, "rdkit": rdkit_version},
        "complete": complete,   # False when --fail-fast stopped the batch
        "totals": {
            "schemes": len(records),
            "passed": sum(not r.failed for r in records),
            "failed": sum(r.failed for r in records),
            "errors": sum(r.errors for r in records),
            "warnings": sum(r.warnings for r in records),
            # the console's words and numbers: "22 drawn, 0 from the cache, 3 without a figure"
            "drawn": sum(r.drawn for r in records),
            "from_cache": sum(r.cached for r in records),
            "without_figure": sum(not r.has_figure for r in records),
        },
        "schemes": [
            {"label": r.label, "number": r.number, "file": r.name, "title": r.title, "caption": r.caption,
             "steps": r.steps, "status": r.status(), "failed": r.failed, "errors": r.errors,
             "warnings": r.warnings, "figure": f"{r.file_stem}.svg" if r.has_figure else None,
             "figure_problem": r.figure_problem, "drawn": r.drawn, "from_cache": r.cached,
             "diagnostics": list(r.diagnostics),
             "layout_notes": list(r.layout_notes)}
            for r in records
        ],
    }


def write_report(path: Path, records: list[SchemeRecord], complete: bool, tool_version: str) -> None:
    write_text(path, json.dumps(report_dict(records, complete, tool_version), indent=2, ensure_ascii=False) + "\n")


def junit_xml(records: list[SchemeRecord]) -> str:
    """One test case per scheme; a scheme with errors (or no figure) is a failure whose text lists
    its diagnostics."""
    suites = ET.Element("testsuites")
    suite = ET.SubElement(suites, "testsuite", name="arrows collect", tests=str(len(records)),
                          failures=str(sum(r.failed for r in records)), errors="0", skipped="0")
    for r in records:
        case = ET.SubElement(suite, "testcase", classname="arrows.collect", name=f"{r.label} {r.name}", file=r.name)
        if r.failed:
            failure = ET.SubElement(case, "failure", message=r.status(), type=(r.codes("error") or ["figure"])[0])
            text = [diagnostic_line(d) for d in r.diagnostics]
            if r.figure_problem:
                text.insert(0, r.figure_problem)
            failure.text = "\n".join(text)
        elif r.diagnostics:
            ET.SubElement(case, "system-out").text = "\n".join(diagnostic_line(d) for d in r.diagnostics)
    ET.indent(suites)
    return '<?xml version="1.0" encoding="utf-8"?>\n' + ET.tostring(suites, encoding="unicode") + "\n"


def write_junit(path: Path, records: list[SchemeRecord]) -> None:
    write_text(path, junit_xml(records))
