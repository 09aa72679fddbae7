"""Bad input on the command line and in quoted text: a located message with a hint and a non-zero
exit, never a traceback; nothing half done (no output written before a refusal, no worker left
running). Each case was found by fuzzing the commands."""
from __future__ import annotations

import dataclasses
import json
import os
import signal
import subprocess
import sys
import time
import warnings
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from click.testing import CliRunner

import arrows
from arrows.cli import cli

ROOT = Path(__file__).resolve().parent.parent
GALLERY = ROOT / "gallery"
DIELS_ALDER = GALLERY / "13-diels-alder.mech"
ARROWS = [sys.executable, "-m", "arrows"]


def run(*args, cwd=None, timeout=300) -> subprocess.CompletedProcess:
    """`arrows ARGS` in a process of its own; bytes arguments pass as they are (not UTF-8)."""
    return subprocess.run([*ARROWS, *args], capture_output=True, cwd=cwd, timeout=timeout)


def slow_mechanism() -> str:
    """Gallery 05 with a 2000-carbon chain beside the hydroxide: some 20 s to draw."""
    text = (GALLERY / "05-octanedione-cyclopentene.mech").read_text()
    assert '"[OH-:11]"' in text
    return text.replace('"[OH-:11]"', '"[OH-:11].' + "C" * 2000 + '"')


# 1. Text options and names that are not text a PDF can hold: tracebacks before.

@pytest.mark.parametrize("title, says", [
    (b"A\x01B", b"U+0001"), (b"A\x1bB", b"U+001B"), ("A\ufffeB".encode(), b"U+FFFE"), (b"A\xffB", b"0xFF"),
])
def test_collect_title_with_a_control_character_or_a_stray_byte_is_refused(title, says, tmp_path):
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "a.mech").write_text(DIELS_ALDER.read_text())
    proc = run("collect", "in", "-o", "out.pdf", "-j", "1", "--title", title, cwd=tmp_path)
    assert proc.returncode == 2, proc.stderr
    assert b"Traceback" not in proc.stderr and says in proc.stderr and b"hint:" in proc.stderr, proc.stderr
    assert not (tmp_path / "out.pdf").exists()


@pytest.mark.parametrize("name", [b"n\xff", b"n\x01"])
def test_new_with_a_name_that_is_not_text_is_refused(name, tmp_path):
    proc = run("new", name, "CCO", cwd=tmp_path)
    assert proc.returncode == 2 and b"Traceback" not in proc.stderr and b"hint:" in proc.stderr, proc.stderr
    assert list(tmp_path.iterdir()) == []


def test_collect_refuses_a_file_name_that_is_not_utf8(tmp_path):
    (tmp_path / os.fsdecode(b"d\xff.mech")).write_text(DIELS_ALDER.read_text())
    proc = run("collect", b"d\xff.mech", "-o", "out.pdf", "-j", "1", cwd=tmp_path)
    assert proc.returncode == 2 and b"Traceback" not in proc.stderr and b"0xFF" in proc.stderr, proc.stderr


# 2. Control characters in quoted text: `check` passed and `draw` wrote SVG that is not XML before.

def _with(old: str, new: str) -> str:
    text = DIELS_ALDER.read_text()
    assert old in text
    return text.replace(old, new, 1)


@pytest.mark.parametrize("old, new, line, column, code_point", [
    ('title   "', 'title   "\x01', 2, 10, "U+0001"),
    ('"heat, pressure"', '"heat,\x1b pressure"', 8, 34, "U+001B"),
    ('step "cycloaddition"', 'step "cyclo\x7faddition"', 8, 12, "U+007F"),
    ('caption "Three', 'caption "Thr\uffffee', 3, 13, "U+FFFF"),
    ('"[CH2:5]=[CH2:6]"', '"[CH2:5]=\x02[CH2:6]"', 6, 32, "U+0002"),
])
def test_a_control_character_in_quoted_text_is_a_located_error(old, new, line, column, code_point, tmp_path):
    mech = tmp_path / "m.mech"
    mech.write_text(_with(old, new), encoding="utf-8")
    proc = run("check", str(mech))
    out = proc.stdout.decode()
    assert proc.returncode == 1, out
    assert f"{mech}:{line}:{column}: error AR101 " in out and code_point in out and "hint: delete" in out, out
    drawn = run("draw", str(mech), "-o", str(tmp_path / "m.svg"))
    assert drawn.returncode == 1 and not (tmp_path / "m.svg").exists(), drawn.stderr


def test_a_control_character_in_a_comment_is_harmless(tmp_path):
    mech = tmp_path / "m.mech"
    mech.write_text(_with("# the diene's first", "# the\x01 diene's first"))
    assert run("check", str(mech)).returncode == 0


def test_the_svg_writer_never_writes_what_xml_forbids():
    """Text that reaches a figure from elsewhere (the API, JSON) with a control character in it."""
    from arrows.draw import STYLES, build_scene
    from arrows.draw.svg import scene_to_svg
    trace, diags = arrows.check_file(DIELS_ALDER)
    scene = build_scene(trace, STYLES["two-column"], diags)
    svg = scene_to_svg(dataclasses.replace(scene, title="A\x01B\x1b\ufffe", description="C\x0bD"))
    ET.fromstring(svg.encode("utf-8"))   # well-formed
    assert "\x01" not in svg and "\ufffe" not in svg


# 3. nan passed click's FloatRange.

@pytest.mark.parametrize("option", ["--font-size", "--line-width"])
@pytest.mark.parametrize("value", ["nan", "NaN", "inf"])
def test_nan_and_inf_sizes_are_bad_usage(option, value, tmp_path):
    result = CliRunner().invoke(cli, ["draw", str(DIELS_ALDER), "-o", str(tmp_path / "x.svg"), option, value])
    assert result.exit_code == 2 and "Traceback" not in result.output, result.output
    assert not (tmp_path / "x.svg").exists()


# 4. A PNG too large: 72 s of drawing, then Pillow's DecompressionBombError, before.

def test_a_png_too_large_is_refused_before_drawing(tmp_path):
    started = time.monotonic()
    proc = run("draw", str(DIELS_ALDER), "-o", "x.png", "--dpi", "2400", "--style", "slide", cwd=tmp_path,
               timeout=60)
    err = proc.stderr.decode()
    assert proc.returncode == 2, err
    assert "error: cannot write x.png: " in err and "million" in err and "hint: lower --dpi to " in err, err
    assert time.monotonic() - started < 30
    assert not (tmp_path / "x.png").exists()
    fits = int(err.split("lower --dpi to ")[1].split()[0])
    from arrows.draw.export import MAX_PNG_PIXELS, png_size
    width, height = png_size(960, 540, fits)   # the slide, in points
    assert width * height <= MAX_PNG_PIXELS


def test_pillow_never_warns_of_a_decompression_bomb(monkeypatch):
    """Pillow warned (DecompressionBombWarning) of a PNG cairo had just drawn, above 89 million
    pixels; its ceiling is lowered here so that a small figure lies in its warning band."""
    from PIL import Image
    from arrows.draw.export import convert, png_size
    from arrows.draw.svg import scene_to_svg
    from arrows.draw import STYLES, build_scene
    trace, diags = arrows.check_file(DIELS_ALDER)
    scene = build_scene(trace, STYLES["one-column"], diags)
    width, height = png_size(scene.width, scene.height, 72)
    monkeypatch.setattr(Image, "MAX_IMAGE_PIXELS", int(width * height * 0.75))
    with warnings.catch_warnings(record=True) as seen:
        warnings.simplefilter("always")
        convert(scene_to_svg(scene), "png", 72)
    assert not [w for w in seen if issubclass(w.category, Image.DecompressionBombWarning)]


# 5. An output that cannot be written, found only after the work.

@pytest.mark.skipif(not os.path.isdir("/proc/self"), reason="needs /proc")
@pytest.mark.parametrize("option", ["--junit", "--report"])
def test_collect_refuses_an_unwritable_report_before_any_work(option, tmp_path):
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "a.mech").write_text(DIELS_ALDER.read_text())
    proc = run("collect", "in", "-o", "out.pdf", "-j", "1", option, "/proc/arrows-test.out", cwd=tmp_path)
    err = proc.stderr.decode()
    assert proc.returncode == 2 and "error: cannot write /proc/arrows-test.out: " in err and "hint:" in err, err
    assert not (tmp_path / "out.pdf").exists()


@pytest.mark.skipif(not os.path.isdir("/proc/self"), reason="needs /proc")
def test_draw_refuses_an_unwritable_output_before_drawing(tmp_path):
    mech = tmp_path / "slow.mech"
    mech.write_text(slow_mechanism())
    started = time.monotonic()
    proc = run("draw", str(mech), "-o", "/proc/arrows-test.svg", timeout=60)
    assert proc.returncode == 2 and b"cannot write" in proc.stderr, proc.stderr
    assert time.monotonic() - started < 10   # drawing takes some 20 s


# 6. Workers left running by a killed collect.

def _children(pid: int) -> list[int]:
    found = []
    for entry in Path("/proc").iterdir():
        if entry.name.isdigit():
            try:
                stat = (entry / "stat").read_text()
            except OSError:
                continue
            if int(stat.rsplit(")", 1)[1].split()[1]) == pid:
                found.append(int(entry.name))
    return found


def _alive(pid: int) -> bool:
    try:
        stat = Path(f"/proc/{pid}/stat").read_text()
    except OSError:
        return False
    return stat.rsplit(")", 1)[1].split()[0] != "Z"


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="reads /proc")
@pytest.mark.parametrize("how", [signal.SIGKILL, signal.SIGTERM])
def test_no_worker_outlives_a_killed_collect(how, tmp_path):
    (tmp_path / "in").mkdir()
    for name in "abc":
        (tmp_path / "in" / f"{name}.mech").write_text(slow_mechanism())
    parent = subprocess.Popen([*ARROWS, "collect", "in", "-o", "out.pdf", "-j", "2", "--cache", "cache"],
                              cwd=tmp_path, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    workers: list[int] = []
    try:
        deadline = time.monotonic() + 60
        while len(workers) < 2 and time.monotonic() < deadline and parent.poll() is None:
            time.sleep(0.2)
            workers = _children(parent.pid)
        assert len(workers) >= 2, "the workers never started"
        time.sleep(1)
        parent.send_signal(how)
        code = parent.wait(timeout=30)
        time.sleep(3)
        survivors = [w for w in workers if _alive(w)]
        assert survivors == []
        if how == signal.SIGTERM:
            assert code == 143 and b"Traceback" not in parent.stderr.read()
            assert not (tmp_path / "out.pdf").exists()
    finally:
        if parent.poll() is None:
            parent.kill()
            parent.wait()
        for worker in workers:   # (left by the code before the fix)
            if _alive(worker):
                os.kill(worker, signal.SIGKILL)


@pytest.mark.skipif(sys.platform == "win32", reason="sends SIGTERM")
@pytest.mark.parametrize("jobs", ["1", "2"])
def test_sigterm_during_a_data_set_leaves_no_temporary_file(jobs, tmp_path):
    """A timed-out CI or cluster job is stopped by SIGTERM: as with Ctrl-C, the results file is
    left as it was and its hidden temporary is removed (before: exit -15 and a .arrows-tmp-* file)."""
    record = json.dumps({"id": "r", "text": (GALLERY / "05-octanedione-cyclopentene.mech").read_text()})
    (tmp_path / "set.jsonl").write_text((record + "\n") * 5000)
    (tmp_path / "out.jsonl").write_text("before\n")
    proc = subprocess.Popen([*ARROWS, "check", "--jsonl", "set.jsonl", "-o", "out.jsonl", "-j", jobs],
                            cwd=tmp_path, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    try:
        deadline = time.monotonic() + 60
        while not list(tmp_path.glob(".arrows-tmp-*")) and time.monotonic() < deadline and proc.poll() is None:
            time.sleep(0.1)
        assert list(tmp_path.glob(".arrows-tmp-*")), "the results were never being written"
        time.sleep(1)
        proc.send_signal(signal.SIGTERM)
        assert proc.wait(timeout=30) == 143
        err = proc.stderr.read()
        assert b"Traceback" not in err and b"terminated" in err, err
        assert sorted(p.name for p in tmp_path.iterdir()) == ["out.jsonl", "set.jsonl"]
        assert (tmp_path / "out.jsonl").read_text() == "before\n"
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()


# 7. Smaller ones.

def test_collect_summary_prints_diagnostics_as_check_does(tmp_path):
    (tmp_path / "bad.mech").write_text("x\n")
    proc = run("collect", "bad.mech", "-o", "out.pdf", "-j", "1", cwd=tmp_path)
    err = proc.stderr.decode()
    assert proc.returncode == 1, err
    assert "\nbad.mech:1:1: error AR101 unexpected `x`" in err and "\n    hint: " in err, err


@pytest.mark.skipif(sys.platform == "win32", reason="sends SIGINT")
def test_ctrl_c_during_draw_exits_130(tmp_path):
    mech = tmp_path / "slow.mech"
    mech.write_text(slow_mechanism())
    proc = subprocess.Popen([*ARROWS, "draw", str(mech), "-o", str(tmp_path / "x.svg")],
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    try:
        time.sleep(4)
        proc.send_signal(signal.SIGINT)
        assert proc.wait(timeout=30) == 130
        assert b"Traceback" not in proc.stderr.read()
        assert not (tmp_path / "x.svg").exists()
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()


@pytest.mark.parametrize("name", ["x.jpeg", "x.svg", "x.v2"])
def test_a_suffix_that_disagrees_with_format_is_refused(name, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(cli, ["draw", str(DIELS_ALDER), "-o", name, "--format", "png"])
    assert result.exit_code == 2, result.output
    assert f"error: -o {name} ends in " in result.output and "hint: name it x.png" in result.output, result.output
    assert list(tmp_path.iterdir()) == []


def test_a_format_given_for_a_name_without_suffix_is_kept(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(cli, ["draw", str(DIELS_ALDER), "-o", "figure", "--format", "svg"])
    assert result.exit_code == 0, result.output
    ET.parse(tmp_path / "figure")


@pytest.mark.parametrize("args", [
    ["draw", str(DIELS_ALDER), "-o", "folder"],
    ["export", str(DIELS_ALDER), "--to", "json", "-o", "folder"],
    ["collect", str(DIELS_ALDER), "-o", "out.pdf", "--report", "folder"],
    ["draw", "folder", "-o", "x.svg"],
])
def test_a_folder_given_for_a_file_is_located_with_a_hint(args, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "folder").mkdir()
    result = CliRunner().invoke(cli, args)
    assert result.exit_code == 2, result.output
    assert result.output.startswith("error: ") and " folder is a folder" in result.output, result.output
    assert "\n    hint: " in result.output and "Usage:" not in result.output, result.output


# A structure too large for RDKit's SMILES writer: a 20,001-atom chain (a fuzzed species) crashed
# the process (a segmentation fault, exit -11, no message) when the checkpoints wrote its SMILES;
# RDKit alone writes 15,000 and crashes at 20,000 (measured). It is refused as it is read.
_HUGE_CHAIN = "C" * 20_001


def test_a_species_too_large_to_write_is_refused_where_it_is_written(tmp_path):
    text = (GALLERY / "05-octanedione-cyclopentene.mech").read_text()
    path = tmp_path / "huge.mech"
    path.write_text(text.replace('"[OH-:11]"', '"[OH-:11].' + _HUGE_CHAIN + '"'))
    done = run("check", str(path))
    err = done.stdout.decode() + done.stderr.decode()
    assert done.returncode == 1, (done.returncode, err[-400:])
    assert "AR102" in err and "20,002 atoms" in err and "hint: write the part the mechanism acts on" in err
    line = next(k for k, row in enumerate(text.splitlines(), 1) if "[OH-:11]" in row)
    assert f"huge.mech:{line}:" in err


@pytest.mark.parametrize("command", ["closures", "number"])
def test_a_smiles_too_large_is_refused_by_the_drafting_commands(command):
    """`arrows closures` also took a SMILES longer than a file name may be for a path to test,
    and Path.is_file raised (a traceback)."""
    done = run(command, _HUGE_CHAIN)
    err = done.stderr.decode()
    assert done.returncode == 2 and "Traceback" not in err, err[-400:]
    assert "<SMILES>:1:1: error AR102" in err and "at most 5,000" in err


# A missing input, as every command that reads one words it.
@pytest.mark.parametrize("args, missing", [
    (["check", "{}"], "nofile.mech"),
    (["check", "--jsonl", "{}"], "nofile.jsonl"),
    (["trace", "{}"], "nofile.mech"),
    (["draw", "{}", "-o", "x.svg"], "nofile.mech"),
    (["export", "{}", "--to", "json"], "nofile.mech"),
    (["import", "{}"], "nofile.json"),
    (["collect", "{}", "-o", "si.pdf"], "nofile.mech"),
    (["collect", "{}", "-o", "si.pdf"], "nofolder/"),
    (["closures", "{}"], "nofile.mech"),
], ids=["check", "check-jsonl", "trace", "draw", "export", "import", "collect-file", "collect-folder", "closures"])
def test_a_missing_input_is_said_in_the_same_words_by_every_command(args, missing, tmp_path):
    """`check` said "cannot read file: No such file or directory" (hint: check the path and
    permissions), `closures` "the file does not exist" (hint: check the path), `collect` a bare
    usage error "no such file or folder": one AR100, worded in one place, at exit status 2."""
    done = run(*[a.format(missing) for a in args], cwd=tmp_path)
    said = done.stdout.decode() + done.stderr.decode()   # (check prints its diagnostics on stdout)
    assert done.returncode == 2 and "Traceback" not in said, said
    assert f"{missing}:1:1: error AR100 cannot read file: no such file or folder\n" \
           "    hint: check the path; a relative path starts from the folder the command runs in\n" in said, said
    assert list(tmp_path.iterdir()) == []
