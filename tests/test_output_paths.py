"""Outputs never destroy inputs, and name what they are: `arrows draw` and `arrows collect` refuse,
before any work, an output that is one of the input mechanisms (however the path reaches it), a
name ending in .mech, a name ending in a slash, and a document that is not a .pdf; each with a
message naming the path (no line:col: nothing was read at a place in a file), a hint and exit
status 2 (bad usage), leaving every file as it was.

They once replaced an input with the PDF, the JSON report or the SVG and exited 0, wrote a PDF
named `folder` for `-o some/folder/`, and a PDF named x.svg for `-o x.svg`.
"""
from __future__ import annotations

import os
import shutil
import subprocess
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))


def arrows(*args, cwd: Path) -> subprocess.CompletedProcess:
    return subprocess.run(["arrows", *map(str, args)], capture_output=True, text=True, cwd=cwd, timeout=120)


@pytest.fixture
def project(tmp_path) -> Path:
    """Two mechanism folders, as an author keeps them, and a symlink to one of the files."""
    for folder, source in (("clob", GALLERY[0]), ("clob2", GALLERY[1])):
        (tmp_path / folder).mkdir()
        shutil.copy(source, tmp_path / folder / "a.mech")
        shutil.copy(GALLERY[2], tmp_path / folder / "b.mech")
    os.symlink(tmp_path / "clob2" / "b.mech", tmp_path / "report-link.json")
    return tmp_path


def files_of(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def refused(done: subprocess.CompletedProcess, at: str) -> None:
    assert done.returncode == 2, done.stderr
    assert done.stderr.startswith("error: ") and at in done.stderr.splitlines()[0], done.stderr
    assert "\n    hint: " in done.stderr and ":1:1:" not in done.stderr, done.stderr
    assert "Traceback" not in done.stderr


@pytest.mark.parametrize("args,at", [
    (["collect", "clob", "-o", "clob/b.mech"], "clob/b.mech"),
    (["collect", "clob", "clob2", "-o", "out/si.pdf", "--report", "clob2/b.mech"], "clob2/b.mech"),
    (["collect", "clob", "-o", "out/si.pdf", "--junit", "./clob/../clob/a.mech"], "./clob/../clob/a.mech"),
    (["collect", "clob2", "-o", "out/si.pdf", "--report", "report-link.json"], "report-link.json"),
    (["draw", "clob/a.mech", "-o", "clob/a.mech", "--format", "svg"], "clob/a.mech"),
    (["draw", "clob/a.mech", "-o", "clob/a.mech"], "clob/a.mech"),
    (["draw", "clob/a.mech", "-o", "clob/a.mech", "--format", "svg", "--watch"], "clob/a.mech"),
], ids=["collect-document", "collect-report", "collect-junit-respelled", "collect-report-symlink", "draw",
        "draw-no-format", "draw-watch"])
def test_an_output_that_is_an_input_is_refused(project, args, at):
    before = files_of(project)
    done = arrows(*args, cwd=project)
    refused(done, at)
    assert "is the input" in done.stderr
    assert files_of(project) == before                        # no input replaced, nothing written


@pytest.mark.parametrize("args,at", [
    (["draw", "clob/a.mech", "-o", "figure.mech", "--format", "svg"], "figure.mech"),
    (["collect", "clob", "-o", "si.pdf", "--report", "report.mech"], "report.mech"),
    (["collect", "clob", "-o", "si.pdf", "--junit", "junit.MECH"], "junit.MECH"),
], ids=["draw", "collect-report", "collect-junit"])
def test_an_output_named_like_a_mechanism_is_refused(project, args, at):
    """A file ending in .mech is what a later `arrows collect FOLDER` reads as a mechanism."""
    before = files_of(project)
    done = arrows(*args, cwd=project)
    refused(done, at)
    assert "ends in .mech" in done.stderr
    assert files_of(project) == before


@pytest.mark.parametrize("args,at,says", [
    (["collect", "clob", "-o", "some/folder/"], "some/folder/", "names a folder"),
    (["collect", "clob", "-o", "x.svg"], "x.svg", "does not end in .pdf"),
    (["collect", "clob", "-o", "si"], "si", "does not end in .pdf"),
    (["collect", "clob", "-o", "si.pdf", "--report", "reports/"], "reports/", "names a folder"),
    (["draw", "clob/a.mech", "-o", "figures/", "--format", "svg"], "figures/", "names a folder"),
], ids=["collect-slash", "collect-svg", "collect-no-extension", "report-slash", "draw-slash"])
def test_an_output_that_is_not_the_file_it_should_be_is_refused(project, args, at, says):
    before = files_of(project)
    done = arrows(*args, cwd=project)
    refused(done, at)
    assert says in done.stderr
    assert files_of(project) == before
    assert not (project / "some").exists()


def test_the_hint_names_the_pdf_to_write(project):
    done = arrows("collect", "clob", "-o", "out/x.svg", cwd=project)
    assert "hint: end the name with .pdf: -o out/x.pdf" in done.stderr


def test_a_mechanism_inside_the_figures_folder_is_refused(project):
    """Every run replaces OUT-figures/ whole: a mechanism kept there (beside the figures of an
    earlier run) would be lost with it."""
    assert arrows("collect", "clob", "-o", "si.pdf", "-j", "1", "--cache", "cache", cwd=project).returncode == 0
    shutil.copy(GALLERY[0], project / "si-figures" / "kept.mech")
    before = files_of(project / "si-figures")
    done = arrows("collect", "clob", "si-figures/kept.mech", "-o", "si.pdf", "-j", "1", "--cache", "cache",
                  cwd=project)
    refused(done, "si-figures/kept.mech")
    assert files_of(project / "si-figures") == before


def test_outputs_beside_the_inputs_are_written(project):
    """The refusals stop only what they name: a report and a document beside the mechanisms are fine."""
    done = arrows("collect", "clob", "-o", "clob/si.pdf", "--report", "clob/report.json", "-j", "1",
                  "--cache", "cache", cwd=project)
    assert done.returncode == 0, done.stderr
    assert (project / "clob" / "si.pdf").is_file() and (project / "clob" / "report.json").is_file()
    done = arrows("draw", "clob/a.mech", "-o", "clob/a.svg", cwd=project)
    assert done.returncode == 0, done.stderr


def test_a_data_set_checked_into_itself_is_refused(tmp_path):
    """`arrows check --jsonl SET -o SET` once replaced the data set with its results."""
    records = tmp_path / "set.jsonl"
    records.write_text('{"id": "r1", "text": "species w = \\"[OH2:1]\\""}\n', encoding="utf-8")
    before = records.read_bytes()
    refused(arrows("check", "--jsonl", "set.jsonl", "-o", "set.jsonl", cwd=tmp_path), "set.jsonl")
    assert records.read_bytes() == before


@pytest.mark.parametrize("args,at,says", [
    (["collect", "clob", "-o", "out/y.pdf", "--junit", "out/y.pdf"], "out/y.pdf", "also given to -o"),
    (["collect", "clob", "-o", "out/y.pdf", "--report", "out/r.json", "--junit", "out/r.json"], "out/r.json",
     "also given to --report"),
    (["collect", "clob", "-o", "out/y.pdf", "--report", "out/y-figures/index.html"], "out/y-figures/index.html",
     "every run replaces whole"),
    (["collect", "clob", "-o", "out/y.pdf", "--report", "nowhere/r.json"], "nowhere/r.json", "does not exist"),
    (["collect", "clob", "-o", "out/y.pdf", "--report", "-"], "-", "standard output"),
    (["collect", "clob", "-o", ".pdf"], ".pdf", "hidden file"),
], ids=["junit over the document", "junit over the report", "report in the figures folder", "missing folder",
        "report to stdout", "nameless document"])
def test_outputs_that_would_replace_each_other_or_cannot_be_written_are_refused_first(project, args, at, says):
    """`--junit out/y.pdf` replaced the document it was given beside (exit 0), `--report` inside the
    figures folder was wiped by the next run, a report into a missing folder failed only after every
    scheme was drawn (the document already replaced), `--report -` wrote a file named `-`. Each is
    refused before any work: nothing is written."""
    (project / "out").mkdir()
    done = arrows(*args, cwd=project)
    refused(done, at)
    assert says in done.stderr
    assert not any((project / "out").iterdir())


def test_a_data_set_read_from_standard_input_is_not_written_over(tmp_path):
    """`arrows check --jsonl - -o set.jsonl < set.jsonl` replaced the data set with its results."""
    records = tmp_path / "set.jsonl"
    records.write_text('{"id": "r1", "text": "species w = \\"[OH2:1]\\""}\n', encoding="utf-8")
    before = records.read_bytes()
    with records.open("rb") as stdin:
        done = subprocess.run(["arrows", "check", "--jsonl", "-", "-o", "set.jsonl"], stdin=stdin,
                              capture_output=True, text=True, cwd=tmp_path, timeout=120)
    refused(done, "set.jsonl")
    assert records.read_bytes() == before


def test_a_folder_walk_reads_an_upper_case_suffix(tmp_path):
    """`arrows draw A.MECH` reads the file, but a folder walk skipped it without a word."""
    (tmp_path / "up").mkdir()
    shutil.copy(GALLERY[0], tmp_path / "up" / "A.MECH")
    shutil.copy(GALLERY[1], tmp_path / "up" / "b.mech")
    done = arrows("check", "up", cwd=tmp_path)
    assert "2 files checked" in done.stdout + done.stderr, done.stdout + done.stderr


@pytest.mark.parametrize("args,at,says", [
    (["draw", "clob/a.mech", "-o", "missing/a.svg"], "missing/a.svg", "the folder missing does not exist"),
    (["export", "clob/a.mech", "--to", "json", "-o", "missing/a.json"], "missing/a.json",
     "the folder missing does not exist"),
    (["check", "--jsonl", "set.jsonl", "-o", "missing/r.jsonl"], "missing/r.jsonl", "the folder missing does not exist"),
    (["number", "CCO", "-o", "missing/n.svg"], "missing/n.svg", "the folder missing does not exist"),
    (["closures", "CC(=O)CCCC(C)=O", "--write", "missing/d.mech"], "missing/d.mech",
     "the folder missing does not exist"),
    (["collect", "clob", "-o", "si.svg"], "si.svg", "does not end in .pdf"),
    (["number", "CCO", "-o", "n.jpg"], "n.jpg", "does not end in .svg or .png"),
    (["closures", "CC(=O)CCCC(C)=O", "--draw", "grid.jpg"], "grid.jpg", "does not end in .svg or .png"),
    (["draw", "clob/a.mech", "-o", "a.jpeg", "--format", "png"], "a.jpeg", "ends in .jpeg but --format says png"),
], ids=["draw-missing-folder", "export-missing-folder", "jsonl-missing-folder", "number-missing-folder",
        "closures-missing-folder", "collect-extension", "number-extension", "closures-extension", "draw-extension"])
def test_an_output_path_error_names_the_path_with_a_hint_and_no_line_and_column(project, args, at, says):
    """Output-path refusals read `out/x.svg:1:1: error: ...`: a line and column of a file that
    was never read (and often does not exist). Now `error: ...` naming the path, and a hint."""
    (project / "set.jsonl").write_text('{"id": "r1", "text": "species w = \\"[OH2:1]\\""}\n', encoding="utf-8")
    before = files_of(project)
    done = arrows(*args, cwd=project)
    refused(done, at)
    assert says in done.stderr.splitlines()[0], done.stderr
    assert files_of(project) == before and not (project / "missing").exists()
