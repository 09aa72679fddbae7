"""Spectator phenyls on phosphorus are written "Ph": checked on the Scene.

The rule (draw/phenyls.py; common practice in mechanism schemes: Ph3P, Ph3P=O, Ph3P+), with
Style.ph_labels (`arrows draw --ph-labels`, the default): a phenyl ring single-bonded to a
phosphorus, none of whose atoms any step touches, is one label "Ph" at its ipso carbon, and its
other five carbons are in no panel. With `--every-atom` the rings are drawn in full; a phenyl that a
step touches, or one on another atom, is always drawn in full.
"""
from __future__ import annotations

import subprocess
import sys
from dataclasses import replace

from rdkit import Chem

import arrows
from arrows.draw import STYLES, build_scene

from textbook_mechanisms import TEXTBOOK

_TWO_COLUMN = STYLES["two-column"]
_PH = replace(_TWO_COLUMN, ph_labels=True)
_EVERY_ATOM = replace(_TWO_COLUMN, ph_labels=False)


def _scene(text: str, name: str, style=_PH):
    trace, diags = arrows.check_text(text, name)
    return trace, build_scene(trace, style, diags)


def _phenyl_carbons(mol: Chem.Mol, on_element: int) -> dict[int, set[int]]:
    """ipso carbon -> the other five carbons of each benzene ring bonded to an atom of `on_element`,
    found by RDKit's ring search (independent of draw/phenyls.py's walk)."""
    rings = [set(r) for r in Chem.GetSymmSSSR(mol) if len(r) == 6
             and all(mol.GetAtomWithIdx(i).GetAtomicNum() == 6 for i in r)]
    out = {}
    for ring in rings:
        for i in ring:
            if any(n.GetAtomicNum() == on_element for n in mol.GetAtomWithIdx(i).GetNeighbors()):
                out[i] = ring - {i}
    return out


def _label_of(atom) -> str:
    return "".join(run.text for run in atom.runs)


def _labels(panel) -> list[str]:
    return [_label_of(atom) for atom in panel.atoms]


def test_staudinger_draws_triphenylphosphine_as_ph():
    """Staudinger reaction (Clayden, Organic Chemistry, the chapter on phosphorus and sulfur, from
    memory): PPh3 adds to methyl azide's terminal N, then N2 leaves and gives the
    iminophosphorane Ph3P=NMe. No arrow touches a phenyl: every panel writes three "Ph" at the phosphorus and
    draws none of the fifteen other ring carbons. Before "Ph" labels, all 18 carbons were drawn
    and N2 crossed a P-phenyl bond."""
    trace, scene = _scene(TEXTBOOK["staudinger"][0], "staudinger")
    phenyls = _phenyl_carbons(trace.initial.mol, 15)
    assert len(phenyls) == 3
    hidden = set().union(*phenyls.values())
    for panel in scene.panels:
        drawn = {a.index for a in panel.atoms}
        assert not drawn & hidden, f"panel {panel.index} draws ring carbons behind a Ph"
        ipso = [a for a in panel.atoms if a.index in phenyls]
        assert len(ipso) == 3 and all(_label_of(a) == "Ph" for a in ipso)
        # The P-Ph bond is drawn, one bond length long like every other.
        assert sum(1 for b in panel.bonds if set(b.atoms) & set(phenyls)) == 3


def test_the_preset_styles_write_ph():
    """"Ph" is the default: every preset style has ph_labels on, and the two-column preset draws
    the Staudinger scheme as with ph_labels set. (Before, the presets drew every atom.)"""
    assert all(style.ph_labels for style in STYLES.values())
    assert _scene(TEXTBOOK["staudinger"][0], "staudinger", _TWO_COLUMN)[1] == \
        _scene(TEXTBOOK["staudinger"][0], "staudinger")[1]


def test_every_atom_is_drawn_when_asked():
    """The same Staudinger scheme with ph_labels off (`--every-atom`): all 18 phenyl carbons in
    every panel, no "Ph". (A guard: drawn so before "Ph" labels.)"""
    trace, scene = _scene(TEXTBOOK["staudinger"][0], "staudinger", _EVERY_ATOM)
    phenyls = _phenyl_carbons(trace.initial.mol, 15)
    every = set(phenyls).union(*phenyls.values())
    for panel in scene.panels:
        assert every <= {a.index for a in panel.atoms}
        assert "Ph" not in _labels(panel)


def test_phenyl_on_nitrogen_is_drawn_in_full():
    """Aza-Wittig reaction (PhN=PPh3 and propanal give the N-phenyl imine and Ph3P=O; March's
    Advanced Organic Chemistry, from memory): the three phenyls on P are "Ph", the phenyl on N,
    carried into the imine, keeps its six carbons in every panel."""
    trace, scene = _scene(TEXTBOOK["aza-wittig"][0], "aza-wittig")
    on_n = _phenyl_carbons(trace.initial.mol, 7)
    assert len(on_n) == 1
    ring = set(on_n).union(*on_n.values())
    for panel in scene.panels:
        assert ring <= {a.index for a in panel.atoms}
        assert _labels(panel).count("Ph") == 3


# A phenyl a step takes off phosphorus: the aryl leaves the P-C bond's pair as the P=O forms
# (the last step of the alkaline cleavage of a phosphonium salt, which gives a phosphine oxide and
# the arene; Cadogan, Organophosphorus Reagents in Organic Synthesis, from memory).
_PHENYL_LEAVES = '''\
title "aryl leaves phosphorus"
species oxyanion = "[O-:1][P:2](C)(C)(C)[c:3]1ccccc1"
step "P=O forms, the aryl anion leaves"
    :O1 -> O1=P2
    P2-C3 -> C3
end
'''


def test_phenyl_a_step_touches_is_drawn_in_full():
    """The phenyl whose ipso carbon a step takes off phosphorus is drawn with its six carbons in
    both panels, and no "Ph" is written. (A guard: drawn so before "Ph" labels too.)"""
    trace, scene = _scene(_PHENYL_LEAVES, "aryl leaves")
    phenyls = _phenyl_carbons(trace.initial.mol, 15)
    ring = set(phenyls).union(*phenyls.values())
    assert len(ring) == 6
    for panel in scene.panels:
        assert ring <= {a.index for a in panel.atoms}
        assert "Ph" not in _labels(panel)


def test_draw_command_takes_ph_labels(tmp_path):
    """`arrows draw --ph-labels`, as the default, writes Ph; `--every-atom` draws the rings; --help
    names the switch. Mechanism.draw(ph_labels=False) gives the --every-atom figure."""
    source = tmp_path / "staudinger.mech"
    source.write_text(TEXTBOOK["staudinger"][0])
    svgs = []
    for extra in (["--ph-labels"], ["--every-atom"], []):
        out = tmp_path / f"s{len(svgs)}.svg"
        done = subprocess.run([sys.executable, "-m", "arrows", "draw", str(source), "-o", str(out)] + extra,
                              capture_output=True, text=True)
        assert done.returncode == 0, done.stderr
        svgs.append(out.read_text())
    assert ">Ph</text>" in svgs[0] and ">Ph</text>" not in svgs[1] and svgs[2] == svgs[0]
    shown = subprocess.run([sys.executable, "-m", "arrows", "draw", "--help"], capture_output=True, text=True)
    assert "--ph-labels / --every-atom" in shown.stdout
    mechanism = arrows.load(source)
    assert mechanism.draw("svg", ph_labels=False).decode() == svgs[1]
    assert mechanism.draw("svg").decode() == svgs[0]


def test_staudinger_phosphorus_sign_clears_the_arrows_into_the_forming_bond():
    """Staudinger reaction, the phosphazide closing its four-membered ring to lose N2 (Clayden,
    Organic Chemistry, the chapter on phosphorus and sulfur, from memory): P+ has its four bonds
    and the P=N bond about to form, and two arrows head for that gap. Its sign stands clear of
    both arrows, shafts and heads (IUPAC 2008: a charge sits clear of what surrounds it). With the
    phenyls written "Ph" the sign was a superscript in that gap, under both arrows (1 and 6
    points of their shafts, 1 and 2 of their heads); drawn with every atom it was clear."""
    for style in (_PH, replace(STYLES["slide"], ph_labels=True), _EVERY_ATOM):
        _, scene = _scene(TEXTBOOK["staudinger"][0], "staudinger", style)
        panel = scene.panels[1]
        (sign,) = [m for m in panel.marks if m.kind == "charge" and _label_of(
            next(a for a in panel.atoms if a.index == m.atom)) == "P"]
        assert len(panel.arrows) == 4
        for arrow in panel.arrows:
            assert not any(sign.box.contains(p) for p in arrow.path_points(80) + list(arrow.head)), arrow.move
