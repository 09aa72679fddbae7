"""`arrows check` streams: a long file's steps are parsed again piece by piece instead of kept, and
each state is let go once the checks have seen it. The streamed diagnostics must be exactly those of
the full replay (the reference: every state kept, every check run over the finished trace)."""
from __future__ import annotations

from pathlib import Path

import pytest

from arrows import language, parse
from arrows.api import check_file, diagnose_file
from arrows.checks import check_streaming, run_checks
from arrows.trace import replay

from small_mechanisms import CORRECT
from test_codes import TWINS

GALLERY = sorted((Path(__file__).resolve().parent.parent / "gallery").glob("*.mech"))


def _both_ways(text: str, name: str = "m.mech"):
    mechanism = parse(text, name)
    return run_checks(replay(mechanism)), check_streaming(mechanism)


@pytest.mark.parametrize("path", GALLERY, ids=lambda p: p.stem)
def test_streamed_checks_equal_the_full_replay_on_the_gallery(path):
    full, streamed = _both_ways(path.read_text(encoding="utf-8"), path.name)
    assert streamed == full


@pytest.mark.parametrize("t", TWINS, ids=lambda t: f"{t.code} {t.name}")
def test_streamed_checks_equal_the_full_replay_on_every_broken_twin(t):
    full, streamed = _both_ways(t.text())
    assert streamed == full


def _long_text(base: str, repeats: int) -> str:
    """A correct mechanism followed by its own steps again and again would not check clean; instead
    the same proton goes back and forth between water and hydroxide (demo data)."""
    lines = ['species hydroxide = "[OH-:1]"', 'species water = "[OH2:2]"']
    for k in range(repeats):
        b, a = (1, 2) if k % 2 == 0 else (2, 1)
        lines += [f'step "shuttle {k + 1}"', f"    :O{b} -> H(O{a})", f"    O{a}-H -> O{a}", "end"]
    return "\n".join(lines) + "\n" + base


def test_a_long_file_is_read_step_by_step_and_gives_the_same_findings(tmp_path, monkeypatch):
    monkeypatch.setattr(language, "_PIECE_STEPS", 8)
    # an empty step near the end and a checkpoint that fails: findings that must survive streaming
    text = _long_text('step "nothing"\nend\n', 101).replace(
        'step "shuttle 100"', 'step "shuttle 100"\n    expect "[OH3+:2]"', 1)
    path = tmp_path / "long.mech"
    path.write_text(text)
    on_demand = language.load(path, steps_on_demand=True)
    assert isinstance(on_demand.steps, language.StepsOnDemand)
    assert on_demand == language.load(path)            # the same model, steps read again on demand
    _, full = check_file(path)
    streamed = diagnose_file(path)
    assert streamed == full
    assert {d.code for d in streamed} >= {"AR401", "AR506"}


def test_a_slip_late_in_a_long_file_is_reported_as_in_the_whole_file(tmp_path, monkeypatch):
    monkeypatch.setattr(language, "_PIECE_STEPS", 8)
    path = tmp_path / "broken.mech"
    path.write_text(_long_text('step "open"\n    :O1 -> H(O2)\n', 60))
    _, full = check_file(path)
    assert [d.code for d in diagnose_file(path)] == [d.code for d in full] == ["AR101"]


@pytest.mark.parametrize("name", sorted(CORRECT))
def test_small_correct_mechanisms_stream_clean(name):
    full, streamed = _both_ways(CORRECT[name], f"{name}.mech")
    assert streamed == full


@pytest.mark.parametrize("edit", [
    ('step "shuttle 30"', 'product "[OH2:1].[OH-:2]"\nstep "shuttle 30"'),   # steps after the product
    ('step "shuttle 33"\n', 'step "shuttle 33"\n    uses salt = "[Cl-:8]"\n'),   # a species enters late
    ('step "shuttle 35"\n', 'step "shuttle 35"\n    uses junk = "C(("\n'),       # a late unreadable SMILES
    ('step "shuttle 35"\n', 'step "shuttle 35"\n    uses dup = "[OH-:2]"\n'),    # a late duplicate map number
    ('step "shuttle 37"\n    :O', 'step "shuttle 37"\n    :C'),                     # a late element mismatch
], ids=["after-product", "late-uses", "late-bad-smiles", "late-duplicate-map", "late-element"])
def test_late_statements_stream_as_in_the_whole_file(tmp_path, monkeypatch, edit):
    monkeypatch.setattr(language, "_PIECE_STEPS", 4)
    old, new = edit
    path = tmp_path / "late.mech"
    path.write_text(_long_text("", 40).replace(old, new, 1))
    assert isinstance(language.load(path, steps_on_demand=True).steps, language.StepsOnDemand)
    assert diagnose_file(path) == check_file(path)[1]
