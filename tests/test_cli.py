"""End to end: `arrows check`, `arrows trace` and `arrows explain` through click's runner and through
a real subprocess of the installed console script. Bad input always gives a located message and
exit status 1 or 2, never a traceback."""
from __future__ import annotations

import json
import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner
from rdkit import Chem
from rdkit.Chem.rdMolDescriptors import CalcMolFormula

from arrows.cli import cli

from small_mechanisms import E1, RING_CLOSURE, SN2

# 2-Bromoethoxide closes an epoxide: a three-membered ring, which draws the small-ring warning.
EPOXIDE = RING_CLOSURE.replace("[O-:1][CH2:2][CH2:3][CH2:4][CH2:5][Br:6]", "[O-:1][CH2:2][CH2:5][Br:6]")

LOCATED = re.compile(r"^(?P<file>[^\n]+?):(?P<line>\d+):(?P<col>\d+): (?P<severity>error|warning|note) "
                     r"(?P<code>AR\d{3}) (?P<message>.+)$")


@pytest.fixture
def write(tmp_path):
    def _write(name: str, content: str | bytes) -> Path:
        path = tmp_path / name
        if isinstance(content, bytes):
            path.write_bytes(content)
        else:
            path.write_text(content, encoding="utf-8")
        return path
    return _write


def run(*args: str):
    return CliRunner().invoke(cli, [str(a) for a in args])


def findings(stdout: str) -> list[dict]:
    """Parse compiler-style output: every finding line is followed by its hint line."""
    lines = stdout.splitlines()
    out = []
    for i, line in enumerate(lines):
        match = LOCATED.match(line)
        if match:
            hint = lines[i + 1] if i + 1 < len(lines) else ""
            assert hint.startswith("    hint: "), f"no hint after {line!r}"
            out.append({**match.groupdict(), "hint": hint[len("    hint: "):]})
        else:
            assert line.startswith("    hint: "), f"not a finding or hint: {line!r}"
    return out


# --- check ---------------------------------------------------------------------------------------

def test_check_clean_file_exits_0_and_prints_only_the_summary(write):
    path = write("sn2.mech", SN2)
    result = run("check", path)
    assert result.exit_code == 0, result.output
    assert result.stdout == ""
    assert "1 file checked: 0 errors, 0 warnings" in result.stderr


def test_check_errors_exit_1_in_compiler_format(write):
    path = write("slip.mech", SN2.replace(":O1 -> C2", ":O1 -> C7"))
    result = run("check", path)
    assert result.exit_code == 1
    (finding,) = findings(result.stdout)
    assert finding["file"] == str(path)
    assert (finding["line"], finding["col"]) == ("4", "12")
    assert (finding["severity"], finding["code"]) == ("error", "AR104")
    assert finding["hint"]


def test_warnings_pass_unless_strict(write):
    path = write("epoxide.mech", EPOXIDE)
    relaxed = run("check", path)
    assert relaxed.exit_code == 0
    assert [f["code"] for f in findings(relaxed.stdout)] == ["AR501"]
    assert run("check", "--strict", path).exit_code == 1


def test_quiet_prints_errors_only(write):
    path = write("epoxide.mech", EPOXIDE)
    result = run("check", "--quiet", path)
    assert result.exit_code == 0 and result.output == ""
    # JSON too: the warning (AR501) left out, as in text (a data-set review found it kept).
    quiet_json = run("check", "--quiet", "--format", "json", path)
    assert quiet_json.exit_code == 0 and json.loads(quiet_json.stdout) == []
    assert [f["code"] for f in json.loads(run("check", "--format", "json", path).stdout)] == ["AR501"]


def test_json_format(write):
    clean, slip = write("sn2.mech", SN2), write("slip.mech", SN2.replace(":O1 -> C2", ":N1 -> C2"))
    result = run("check", "--format", "json", clean, slip)
    assert result.exit_code == 1
    records = json.loads(result.stdout)
    assert [(r["file"], r["line"], r["column"], r["code"], r["severity"]) for r in records] == [
        (str(slip), 4, 6, "AR105", "error")]
    record = records[0]
    assert set(record) >= {"file", "line", "column", "severity", "code", "message", "hint", "atoms", "bonds", "step"}
    assert record["atoms"] == ["N1"] and record["step"] == 0


def test_several_files_one_report(write):
    a, b = write("a.mech", SN2), write("b.mech", EPOXIDE)
    result = run("check", a, b)
    assert result.exit_code == 0
    assert "2 files checked: 0 errors, 1 warning" in result.stderr


def test_check_needs_a_file():
    result = run("check")
    assert result.exit_code == 2


# --- bad input ---------------------------------------------------------------------------------

BAD_INPUT = [
    # (name, content, exit code, code, line, column, words in the message)
    ("empty file", "", 1, "AR112", 1, 1, "no species and no steps"),
    ("comments only", "# a plan for later\n", 1, "AR112", 1, 1, "no species"),
    ("binary garbage", b'title "x"\n  \x89PNG\xff\xfe\x00\x01garbage', 2, "AR100", 2, 3, "not UTF-8"),
    ("NUL bytes", "species w = \"O\"\x00\x00\n", 2, "AR100", 1, 1, "NUL"),
    ("unknown keyword", 'species w = "[OH2:1]"\nreagent x = "O"\n', 1, "AR101", 2, 1, "`reagent`"),
    ("broken SMILES", 'species w = "[OH2:1"\n', 1, "AR102", 1, 19, "RDKit cannot read"),
    ("duplicate map numbers", 'species a = "[OH-:1]"\nspecies b = "[CH3:1]Br"\n', 1, "AR103", 2, 14,
     "map number 1"),
    ("map number in no species", SN2.replace("C2-Br3 -> Br3", "C2-Br9 -> Br9"), 1, "AR104", 5, 8,
     "map number 9"),
    ("move on a released atom", E1.replace('product "C=C(C)C"\n', 'step "again"\n    :Br5 -> C2\nend\n'),
     1, "AR106", 12, 6, "Br5"),
    ("step after product", SN2 + 'step "late"\n    :O1 -> C2\nend\n', 1, "AR107", 8, 1, "after `product`"),
]


@pytest.mark.parametrize("name, content, status, code, line, column, words", BAD_INPUT,
                         ids=[b[0] for b in BAD_INPUT])
def test_bad_input_is_located(write, name, content, status, code, line, column, words):
    path = write("bad.mech", content)
    result = run("check", path)
    assert result.exit_code == status, result.output
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    located = [f for f in findings(result.stdout) if f["code"] == code]
    assert located, result.output
    first = located[0]
    assert (first["file"], first["line"], first["col"]) == (str(path), str(line), str(column))
    assert words in first["message"]
    assert "Traceback" not in result.output


def test_broken_smiles_gives_rdkit_reason_and_nothing_on_stderr(write):
    """RDKit's own words (here: an unclosed bracket atom) come back translated into one located
    finding; RDKit's log does not spill onto stderr."""
    path = write("bad.mech", 'species w = "C(C"\n')
    result = run("check", path)
    (finding,) = findings(result.stdout)
    assert "extra open parentheses" in finding["message"]
    assert (finding["line"], finding["col"]) == ("1", "15")   # RDKit points at the open branch
    assert "SMILES Parse Error" not in result.stderr


def test_ten_megabyte_file(write):
    path = write("huge.mech", "# padding line\n" * 700_000)
    result = run("check", path)
    assert result.exit_code == 2
    (finding,) = findings(result.stdout)
    assert finding["code"] == "AR100" and "limit" in finding["message"]


def test_missing_file(tmp_path):
    path = tmp_path / "nowhere.mech"
    result = run("check", path)
    assert result.exit_code == 2
    (finding,) = findings(result.stdout)
    assert (finding["file"], finding["code"], finding["line"], finding["col"]) == (str(path), "AR100", "1", "1")


@pytest.mark.parametrize("command", ["check", "trace"])
def test_a_folder_is_not_a_mechanism(tmp_path, command):
    result = run(command, tmp_path)
    assert result.exit_code == 2
    assert f"{tmp_path}:1:1: error AR100" in result.output
    assert "Traceback" not in result.output


def test_check_opens_a_folder(tmp_path):
    """`arrows check FOLDER` checks every .mech file below it, in path order, each once: an SI
    set is checked in one command, as `arrows collect` takes it."""
    (tmp_path / "b").mkdir()
    (tmp_path / "a.mech").write_text(_GALLERY_FIRST.read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "b" / "broken.mech").write_text('species s = "[CH4:1]"\nstep "x"\n    :C1 -> C1\nend\n',
                                                encoding="utf-8")
    (tmp_path / "notes.txt").write_text("not a mechanism\n", encoding="utf-8")
    result = run("check", tmp_path, tmp_path / "a.mech")
    assert result.exit_code == 1, result.output
    located = [LOCATED.match(line) for line in result.stdout.splitlines()]
    errors = [m["file"] for m in located if m and m["severity"] == "error"]
    assert errors == [str(tmp_path / "b" / "broken.mech")]
    assert "2 files checked" in result.stderr


_GALLERY_FIRST = Path(__file__).resolve().parents[1] / "gallery" / "01-enolate-formation.mech"


@pytest.mark.parametrize("args,target", [
    (["closures", "CC(=O)CCC(C)=O", "--write", "{missing}/draft.mech"], "{missing}/draft.mech"),
    (["closures", "CC(=O)CCC(C)=O", "--draw", "{missing}/closures.svg"], "{missing}/closures.svg"),
    (["draw", _GALLERY_FIRST, "-o", "{missing}/figure.svg"], "{missing}/figure.svg"),
    (["draw", _GALLERY_FIRST, "-o", "{missing}/figure.svg", "--watch"], "{missing}/figure.svg"),
    (["collect", _GALLERY_FIRST, "-o", "{missing}/si.pdf"], "{missing}/si.pdf"),
    (["collect", _GALLERY_FIRST, "-o", "{tmp}/si.pdf", "--report", "{missing}/report.json"], "{missing}/report.json"),
    (["collect", _GALLERY_FIRST, "-o", "{tmp}/si.pdf", "--junit", "{missing}/junit.xml"], "{missing}/junit.xml"),
    (["new", "{missing}/draft"], "{missing}/draft.mech"),
], ids=["closures-write", "closures-draw", "draw", "draw-watch", "collect", "collect-report", "collect-junit", "new"])
def test_an_output_that_cannot_be_written_is_a_located_message(tmp_path, args, target):
    """Every command that writes a file says which file it cannot write, with a hint, and exits 2,
    never with a traceback (a --watch run stops: its output can never be written). The folder named
    is a plain file, so no command can make it (`collect` makes a missing folder)."""
    blocked = tmp_path / "a-file"
    blocked.write_text("not a folder\n")

    def filled(text) -> str:
        return str(text).format(missing=blocked, tmp=tmp_path)
    done = subprocess.run([sys.executable, "-m", "arrows", *map(filled, args)], capture_output=True, text=True,
                          timeout=300)
    assert done.returncode == 2, done.stderr
    assert f"error: cannot write {filled(target)}: " in done.stderr and "hint: " in done.stderr
    assert ":1:1:" not in done.stderr, done.stderr   # no line:col: nothing was read at a place in a file
    # The same words from every command, naming the file in the way (they once said "File exists",
    # "Not a directory" or "the folder ... does not exist" by turns, or named a temporary file).
    assert f"{blocked} is a file, not a folder" in done.stderr, done.stderr
    assert "Traceback" not in done.stderr


# --- trace -------------------------------------------------------------------------------------

def test_trace_prints_every_state(write):
    """SMILES and formula judged by RDKit; charges and lone pairs are the textbook Lewis structures:
    methanol O with two lone pairs, bromide with four (common practice)."""
    path = write("sn2.mech", SN2)
    result = run("trace", path)
    assert result.exit_code == 0, result.output
    out = result.stdout
    start, step = out.split("\nstep 1: backside attack\n")
    assert start.startswith("start\n")
    smiles = re.findall(r"^  SMILES   (\S+)$", out, re.M)
    expected_start = Chem.MolToSmiles(Chem.MolFromSmiles("[OH-].CBr"))
    expected_after = Chem.MolToSmiles(Chem.MolFromSmiles("CO.[Br-]"))
    assert smiles == [expected_start, expected_after]
    formulas = re.findall(r"^  formula  (\S+)   net charge (\S+)$", out, re.M)
    assert formulas == [(CalcMolFormula(Chem.MolFromSmiles("[OH-].CBr")), "-1")] * 2
    assert "  formed   O1-C2" in step or "  formed   C2-O1" in step
    assert "  broken   C2-Br3" in step
    assert "  atom     O1: charge 0, 2 lone pairs" in step
    assert "  atom     Br3: charge -1, 4 lone pairs" in step


def test_trace_stops_at_a_step_that_cannot_be_applied(write):
    path = write("slip.mech", SN2.replace("    C2-Br3 -> Br3\n", ""))
    result = run("trace", path)
    assert result.exit_code == 1
    assert "not derived" in result.stdout
    assert any(f["code"] == "AR301" for f in findings(result.stdout.split("\n\n")[-1]))


def test_trace_unreadable_file(tmp_path):
    result = run("trace", tmp_path / "nowhere.mech")
    assert result.exit_code == 2
    assert "AR100" in result.output and "Traceback" not in result.output


# --- explain -----------------------------------------------------------------------------------

def test_explain_a_code():
    result = run("explain", "ar204")
    assert result.exit_code == 0
    assert result.stdout.startswith("AR204 (error): arrow starts at a hydrogen")
    assert "Example:" in result.stdout and ":O11 -> H(C3)" in result.stdout


def test_explain_lists_every_code():
    from arrows.diagnostics import CODES
    result = run("explain")
    assert result.exit_code == 0
    assert [line.split()[0] for line in result.stdout.splitlines()] == list(CODES)


def test_explain_unknown_code():
    result = run("explain", "AR999")
    assert result.exit_code == 2 and "unknown code" in result.stderr


# --- the installed console script ----------------------------------------------------------------

def console_script() -> str:
    beside_python = Path(sys.executable).with_name("arrows")
    found = str(beside_python) if beside_python.exists() else shutil.which("arrows")
    assert found, "the console script `arrows` is not installed (pip install -e .)"
    return found


def script(*args, cwd=None) -> subprocess.CompletedProcess:
    return subprocess.run([console_script(), *map(str, args)], capture_output=True, text=True, cwd=cwd,
                          timeout=120)


def test_script_check_exit_codes(write, tmp_path):
    clean, slip = write("sn2.mech", SN2), write("slip.mech", SN2.replace(":O1 -> C2", "H(O1) -> C2"))
    assert script("check", clean).returncode == 0
    failing = script("check", slip)
    assert failing.returncode == 1
    (finding,) = findings(failing.stdout)
    assert (finding["code"], finding["line"], finding["col"]) == ("AR204", "4", "5")
    missing = script("check", tmp_path / "nowhere.mech")
    assert missing.returncode == 2
    for proc in (failing, missing):
        assert "Traceback" not in proc.stderr


def test_python_dash_m_runs_the_same_command_line(write):
    """`python -m arrows` is the console script by another door: same output, same exit codes."""
    slip = write("slip.mech", SN2.replace(":O1 -> C2", "H(O1) -> C2"))
    by_module = subprocess.run([sys.executable, "-m", "arrows", "check", str(slip)], capture_output=True,
                               text=True, timeout=120)
    by_script = script("check", slip)
    assert by_module.returncode == by_script.returncode == 1
    assert by_module.stdout == by_script.stdout and "AR204" in by_module.stdout


def test_script_json_and_trace_from_another_folder(write, tmp_path):
    path = write("sn2.mech", SN2)
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    report = script("check", "--format", "json", "../sn2.mech", cwd=elsewhere)
    assert report.returncode == 0 and json.loads(report.stdout) == []
    traced = script("trace", path, cwd=elsewhere)
    assert traced.returncode == 0 and "  SMILES   CO.[Br-]" in traced.stdout


def test_script_trace_of_a_lone_proton_prints_no_rdkit_noise(write):
    """Heterolysis of H-Br leaves a bare proton; RDKit's warning about removing it stays inside."""
    path = write("proton.mech", 'species hbr = "[Br:1][H:2]"\nstep "ionization"\n    H2-Br1 -> Br1\nend\n')
    proc = script("trace", path)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    assert "[H+]" in proc.stdout
    assert proc.stderr == ""


@pytest.mark.parametrize("name, content, status, code, line, column, words", BAD_INPUT,
                         ids=[b[0] for b in BAD_INPUT])
def test_script_bad_input(write, name, content, status, code, line, column, words):
    path = write("bad.mech", content)
    proc = script("check", path)
    assert proc.returncode == status
    assert code in [f["code"] for f in findings(proc.stdout)]
    assert "Traceback" not in proc.stderr
    assert "SMILES Parse Error" not in proc.stderr


def test_script_usage_errors_exit_2(tmp_path):
    proc = script("check", "--format", "yaml", tmp_path / "x.mech")
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert script("no-such-command").returncode == 2


def test_check_path_imports_no_drawing_code(write):
    """`arrows check` must not pay for drawing: neither arrows.draw nor cairosvg is imported."""
    path = write("sn2.mech", SN2)
    probe = (
        "import sys\n"
        "from arrows.cli import main\n"
        f"sys.argv = ['arrows', 'check', {str(path)!r}]\n"
        "try:\n    main()\nexcept SystemExit:\n    pass\n"
        "drawing = sorted(m for m in sys.modules if m == 'cairosvg' or m.startswith(('arrows.draw', 'cairo')))\n"
        "print('DRAWING', drawing)\n"
    )
    proc = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, timeout=120)
    assert "DRAWING []" in proc.stdout, proc.stdout + proc.stderr


def test_help_lists_every_command_in_one_whole_line():
    """`arrows --help` names every command with a summary that is not cut off mid-sentence, and
    listing them imports none of the command modules."""
    from arrows.cli import COMMANDS
    before = {m for m in sys.modules if m.startswith("arrows.commands.")}
    result = CliRunner().invoke(cli, ["--help"])
    assert result.exit_code == 0
    listed = [line.split(None, 1) for line in result.output.split("Commands:")[1].splitlines() if line.strip()]
    assert sorted(name for name, _ in listed) == sorted(COMMANDS)
    assert all(summary.endswith(".") and "..." not in summary for _, summary in listed)
    assert {m for m in sys.modules if m.startswith("arrows.commands.")} == before


def test_explain_gives_every_code_an_example():
    """`arrows explain CODE` says what the code means and shows a small example, for every code
    (the core issue asks for both); text lines stay within 88 columns."""
    from arrows.diagnostics import CODES
    for code in CODES:
        result = CliRunner().invoke(cli, ["explain", code])
        assert result.exit_code == 0
        assert "\nExample:\n    " in result.output, code
        explanation = result.output.split("\n\n")[1]
        assert max(len(line) for line in explanation.splitlines()) <= 88, code


def _whole_file(example: str) -> bool:
    """An example is a whole .mech file when it leaves nothing out (no `...`) and its first line
    that is not a comment declares a species, or it holds comments only (AR112's empty file)."""
    written = [line for line in example.splitlines() if line.strip() and not line.lstrip().startswith("#")]
    return "..." not in example and (not written or written[0].startswith("species "))


# Examples that cannot be a .mech file: an unreadable file (AR100), lines of a JSONL data set
# (AR110, AR111), and the two safety nets no valid moves can trip (AR403, AR404), described in words.
FRAGMENT_EXAMPLES = {"AR100", "AR110", "AR111", "AR113", "AR403", "AR404"}


def test_whole_mechanism_examples_give_their_own_code():
    """An example written as a whole mechanism gives exactly its own code when checked, and no
    other error or warning (notes allowed); a note's example gives its note and no finding."""
    from arrows import check_text
    from arrows.diagnostics import CODES
    whole = [c for c in CODES.values() if _whole_file(c.example)]
    assert len(whole) >= 43
    for c in whole:
        _, diags = check_text(c.example, "example.mech")
        shown = [d.to_text() for d in diags]
        findings = {d.code for d in diags if d.severity != "note"}
        if c.severity == "note":
            assert findings == set() and c.code in {d.code for d in diags}, (c.code, shown)
        else:
            assert findings == {c.code}, (c.code, shown)


def test_fragment_examples_are_what_they_say(write):
    """Every example is a whole mechanism except the few that cannot be one, and those give their
    code by their own road: a binary file to `arrows check`, a record line to `check --jsonl`.
    Every example line, as `arrows explain` prints it, stays within 88 columns."""
    from arrows.batch.jsonl import check_line
    from arrows.diagnostics import CODES
    assert {c.code for c in CODES.values() if not _whole_file(c.example)} == FRAGMENT_EXAMPLES
    for c in CODES.values():
        assert max(len("    " + line) for line in c.example.splitlines()) <= 88, c.code
    command, _ = CODES["AR100"].example.split("   #")
    assert command.split()[:2] == ["arrows", "check"]
    # Bytes that are not text (NUL bytes, invalid UTF-8), as in a drawing program's binary file.
    drawing = write(command.split()[2], b"\x04\x03\x02\x01\x00\x00\xff\xfe\x00")
    result = run("check", drawing)
    assert result.exit_code == 2 and "AR100" in result.output and "Traceback" not in result.output
    for code in ("AR110", "AR111"):
        record, _ = CODES[code].example.split("   #")
        assert [d["code"] for d in check_line("set.jsonl", 1, record.encode())["diagnostics"]] == [code]
    # A data set of two records (AR113 is the second's, found across records).
    import io
    import json
    from arrows.batch.jsonl import check_stream
    from arrows.batch.parallel import WorkerPool
    records = [line.split("   #")[0] for line in CODES["AR113"].example.splitlines()]
    results: list[str] = []
    with WorkerPool(1) as pool:
        check_stream("set.jsonl", io.BytesIO("\n".join(records).encode() + b"\n"), results.append, pool)
    codes = [[d["code"] for d in json.loads(r)["diagnostics"]] for r in results]
    assert "AR113" not in codes[0] and "AR113" in codes[1], codes


def test_trace_names_what_a_step_releases_by_its_structure():
    """A released fragment is written as its SMILES (RDKit's canonical form, the independent judge)
    with the numbered atoms it holds: `released Br3, C(atom 13), C(atom 14), O4` named ethanol's
    unnumbered carbons by their place in the state."""
    result = run("trace", _GALLERY_FIRST.with_name("20-e2-anti-periplanar.mech"))
    assert result.exit_code == 0, result.output
    (line,) = re.findall(r"^  released (.+)$", result.stdout, re.M)
    bromide, ethanol = (Chem.MolToSmiles(Chem.MolFromSmiles(s)) for s in ("[Br-]", "OCC"))
    assert line == f"{bromide} (Br3); {ethanol} (O4)"


def test_trace_stereo_names_a_centre_a_step_inverts(write):
    """An SN2 at a configured carbon (textbook: backside attack inverts it) printed `stereo no
    change`, the centre being one before and after. The CIP labels before and after are given,
    RDKit's labeller the judge of both."""
    from rdkit.Chem import rdCIPLabeler
    text = ('species cn = "[C-:1]#[N:2]"\nspecies rbr = "[CH3:3][C@@H:4]([Br:5])[CH2:6][CH3:7]"\n'
            'step "sn2"\n    :C1 -> C4\n    C4-Br5 -> Br5\nend\n')
    result = run("trace", "--stereo", write("inv.mech", text))
    assert result.exit_code == 0, result.output

    def cip(smiles: str) -> str:
        mol = Chem.MolFromSmiles(smiles)
        rdCIPLabeler.AssignCIPLabels(mol)
        return next(a.GetProp("_CIPCode") for a in mol.GetAtoms() if a.HasProp("_CIPCode"))
    before, after = cip("C[C@@H](Br)CC"), cip("C[C@H](C#N)CC")   # the nitrile as the inverted carbon gives it
    assert f"configured centre C4: ({before}) before, ({after}) after" in result.output


def test_trace_of_an_empty_file_prints_no_empty_state(write):
    """An empty file printed `start`, a blank SMILES and a blank formula before its AR112."""
    result = run("trace", write("empty.mech", ""))
    assert result.exit_code == 1 and "AR112" in result.output
    lines = result.output.splitlines()
    assert "start" not in lines and not any(line.startswith("  SMILES") for line in lines)


def test_a_dash_reads_the_mechanism_from_standard_input():
    """A pipeline hands the mechanism on standard input (a data-set review found `-` read as a file
    name): diagnostics are located at <stdin>."""
    slip = SN2.replace(":O1 -> C2", ":N1 -> C2")
    clean = CliRunner().invoke(cli, ["check", "-"], input=SN2)
    wrong = CliRunner().invoke(cli, ["check", "-"], input=slip)
    assert clean.exit_code == 0, clean.output
    assert wrong.exit_code == 1 and wrong.output.startswith("<stdin>:"), wrong.output
    traced = CliRunner().invoke(cli, ["trace", "-"], input=SN2)
    assert traced.exit_code == 0 and "SMILES" in traced.output


def test_a_bug_in_a_check_gives_one_line_and_exit_70_not_a_traceback(write):
    """A check that raises (a bug of ours) must not show the user a Python traceback: one line
    says it is an internal error, and the exit status is 70 (EX_SOFTWARE, BSD's sysexits.h);
    ARROWS_TRACEBACK=1 shows the traceback for whoever fixes it."""
    path = write("sn2.mech", SN2)
    probe = (
        "import sys\n"
        "from arrows.checks import valence\n"
        "def broken(self, st, context):\n    raise RuntimeError('a deliberately broken check')\n"
        "valence.UnusualElectronCounts.step = broken\n"
        "from arrows.cli import main\n"
        f"sys.argv = ['arrows', 'check', {str(path)!r}]\n"
        "main()\n"
    )
    proc = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 70, proc.stderr
    assert "Traceback" not in proc.stderr
    assert "internal error (RuntimeError: a deliberately broken check)" in proc.stderr
    shown = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, timeout=120,
                           env={**os.environ, "ARROWS_TRACEBACK": "1"})
    assert shown.returncode != 70 and "Traceback" in shown.stderr
