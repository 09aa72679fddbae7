"""Wedges in figures, judged by RDKit from the scene alone.

The judge: each panel's drawn structure (the panel's coordinates and the wedge of each bond, as
the Scene gives them) is rebuilt as an RDKit Mol with those 2D coordinates and bond directions
(BEGINWEDGE for a solid wedge, BEGINDASH for a hashed one, begin atom at the narrow end); RDKit
assigns the configuration from them (Chem.AssignChiralTypesFromBondDirs, as it does for a mol
block) and RDKit's CIP labeller (rdCIPLabeler) names it. That must be the label the same
labeller gives the panel's state, for every stereocentre drawn.

Drawing rules checked on the scene: IUPAC Recommendations 2006, "Graphical representation of
stereochemical configuration", Pure Appl. Chem. 2006, 78, 1897-1970 (references.md), ST-1: the
narrow end of a wedge at the stereocentre, a wedge not shared by two stereocentres, preferably
not along a ring bond; of our own, not on a bond the panel's step forms or breaks when another
bond is left. Textbook outcomes: SN2 inverts the carbon attacked (Walden inversion), an SN1
capture and an enolisation lose the configuration (common practice).
"""
from __future__ import annotations

import dataclasses
from pathlib import Path

import pytest
from rdkit import Chem
from rdkit.Chem import rdCIPLabeler

import arrows
from arrows.draw import STYLES, build_scene
from arrows.draw.scheme import _panel_sources

from small_mechanisms import CORRECT
from textbook_mechanisms import TEXTBOOK

GALLERY = sorted((Path(__file__).resolve().parents[1] / "gallery").glob("*.mech"))

# Demo data of our own, with the textbook outcome each must show.
OWN = {
    # Cyanide at C1 of (2S,3S)-3-bromobutan-2-ol (also in test_stereo.py): two neighbouring
    # stereocentres, one inverted (SN2), the carbinol carbon untouched.
    "two centres, one inverted": 'species substrate = "C[C@H:1]([Br:3])[C@@H:4](C)O"\n'
                                 'species cyanide = "[C-:2]#N"\n'
                                 'step "displacement"\n    :C2 -> C1\n    C1-Br3 -> Br3\nend\n',
    # SN1 at a quaternary centre (four drawn substituents): the cation is planar, the capture
    # racemises, so the product panel carries no wedge.
    "sn1 racemises": 'species substrate = "CC[C@@:1](C)(CC(C)C)[Br:2]"\nspecies water = "[OH2:3]"\n'
                     'step "ionisation"\n    C1-Br2 -> Br2\nend\nstep "capture"\n    :O3 -> C1\nend\n',
    # (R)-3-methylcyclohexanone deprotonated at C6, away from its ring stereocentre, which keeps its
    # configuration: the wedge goes to the methyl, not along the ring.
    "ring centre kept": 'species ketone = "C[C@@H]1C[C:1](=[O:2])[CH2:3]CC1"\nspecies base = "[OH-:4]"\n'
                        'step "enolate"\n    :O4 -> H(C3)\n    C3-H -> C3=C1\n    C1=O2 -> O2\nend\n',
    # (S)-3-methylpentan-2-one loses its alpha hydrogen, which is drawn while it moves: the wedge
    # keeps off that breaking bond; the enolate has no stereocentre left (textbook: base-catalysed
    # racemisation goes through it).
    "alpha proton removed": 'species ketone = "CC[C@H:1](C)[C:2](C)=[O:3]"\nspecies base = "[OH-:4]"\n'
                            'step "enolate"\n    :O4 -> H(C1)\n    C1-H -> C1=C2\n    C2=O3 -> O3\nend\n',
}

STEREO = {name: TEXTBOOK[name][0] for name in ("sn2 inversion", "epoxide opening")} | OWN


def _states(trace):
    return [src.state for src in _panel_sources(trace)]


def _scene(text: str, style: str = "two-column"):
    trace, diags = arrows.check_text(text)
    assert trace is not None and not [d for d in diags if d.severity == "error"], [d.to_text() for d in diags]
    return trace, build_scene(trace, STYLES[style], diags)


def _labels(mol: Chem.Mol) -> dict[int, str]:
    rdCIPLabeler.AssignCIPLabels(mol)
    return {a.GetIdx(): a.GetProp("_CIPCode") for a in mol.GetAtoms() if a.HasProp("_CIPCode")}


def state_labels(state, drawn: set[int]) -> dict[int, str]:
    """RDKit's CIP labels of the state's stereocentres that the panel draws."""
    mol = Chem.Mol(state.mol)
    for atom in mol.GetAtoms():
        atom.SetAtomMapNum(0)
    Chem.SanitizeMol(mol)
    Chem.AssignStereochemistry(mol, cleanIt=True, force=True)
    return {i: label for i, label in _labels(mol).items() if i in drawn}


def drawn_labels(panel, state) -> dict[int, str]:
    """RDKit's CIP labels of the structure as the panel draws it: the state's atoms and bonds with
    every configuration cleared, the atoms not drawn removed (a hydrogen not drawn becomes a count
    on its atom), the panel's coordinates (y up) and its wedges as bond directions."""
    work = Chem.RWMol(state.mol)
    for atom in work.GetAtoms():
        atom.SetChiralTag(Chem.ChiralType.CHI_UNSPECIFIED)
        atom.SetAtomMapNum(0)
    for bond in work.GetBonds():
        bond.SetStereo(Chem.BondStereo.STEREONONE)
        bond.SetBondDir(Chem.BondDir.NONE)
    where = {a.index: a.position for a in panel.atoms}
    for atom in work.GetAtoms():
        if atom.GetIdx() not in where and atom.GetAtomicNum() == 1:
            for n in atom.GetNeighbors():
                n.SetNumExplicitHs(n.GetNumExplicitHs() + 1)
    kept = sorted(where)
    for i in reversed(range(work.GetNumAtoms())):
        if i not in where:
            work.RemoveAtom(i)
    new = {old: k for k, old in enumerate(kept)}
    for bond in panel.bonds:
        if not bond.wedge:
            continue
        narrow = bond.narrow
        wide = bond.atoms[1] if bond.atoms[0] == narrow else bond.atoms[0]
        work.RemoveBond(new[narrow], new[wide])
        work.AddBond(new[narrow], new[wide], Chem.BondType.SINGLE)
        made = work.GetBondBetweenAtoms(new[narrow], new[wide])
        assert made.GetBeginAtomIdx() == new[narrow]
        made.SetBondDir(Chem.BondDir.BEGINWEDGE if bond.wedge == "solid" else Chem.BondDir.BEGINDASH)
    conformer = Chem.Conformer(work.GetNumAtoms())
    for old, k in new.items():
        x, y = where[old]
        conformer.SetAtomPosition(k, (x, -y, 0.0))
    work.AddConformer(conformer, assignId=True)
    mol = work.GetMol()
    Chem.SanitizeMol(mol)
    Chem.AssignChiralTypesFromBondDirs(mol)
    Chem.AssignStereochemistry(mol, cleanIt=True, force=True)
    return {kept[k]: label for k, label in _labels(mol).items()}


def _judged(text: str, style: str = "two-column") -> list[tuple[dict[int, str], dict[int, str]]]:
    """(labels of the state, labels of the drawing) for every panel."""
    trace, scene = _scene(text, style)
    states = _states(trace)
    assert len(states) == len(scene.panels)
    return [(state_labels(state, {a.index for a in panel.atoms}), drawn_labels(panel, state))
            for panel, state in zip(scene.panels, states)]


@pytest.mark.parametrize("style", sorted(STYLES))
@pytest.mark.parametrize("name", sorted(STEREO))
def test_each_panel_draws_the_configuration_of_its_state(name, style):
    judged = _judged(STEREO[name], style)
    assert any(expected for expected, _ in judged), name   # something to judge
    for k, (expected, drawn) in enumerate(judged):
        assert drawn == expected, (name, k)


def _centre_labels(name: str) -> list[list[str]]:
    return [sorted(expected.values()) for expected, _ in _judged(STEREO[name])]


def test_walden_inversion_is_drawn_r_then_s():
    """(R)-2-bromobutane gives (S)-butan-2-ol (textbook SN2)."""
    assert _centre_labels("sn2 inversion") == [["R"], ["S"]]


def test_epoxide_opening_is_drawn_r_until_the_attack_then_s():
    """(R)-methyloxirane; the carbon attacked is inverted: (S)-2-methoxypropan-1-ol (textbook)."""
    assert _centre_labels("epoxide opening") == [["R"], ["R"], ["S"], ["S"]]


def test_racemised_and_planar_centres_have_no_wedge():
    for name, expected in (("sn1 racemises", [1, 0, 0]), ("alpha proton removed", [1, 0])):
        _, scene = _scene(STEREO[name])
        assert [sum(1 for b in p.bonds if b.wedge) for p in scene.panels] == expected, name


def test_the_judge_sees_a_wrong_wedge():
    """The judge can fail: the wedges of the (R)-2-bromobutane panel swapped read as (S)."""
    trace, scene = _scene(STEREO["sn2 inversion"])
    panel, state = scene.panels[0], _states(trace)[0]
    swapped = tuple(dataclasses.replace(b, wedge={"solid": "hashed", "hashed": "solid"}[b.wedge]) if b.wedge else b
                    for b in panel.bonds)
    assert sorted(drawn_labels(panel, state).values()) == ["R"]
    assert sorted(drawn_labels(dataclasses.replace(panel, bonds=swapped), state).values()) == ["S"]


@pytest.mark.parametrize("name", sorted(STEREO))
def test_wedges_follow_the_drawing_rules(name):
    """IUPAC 2006 ST-1 (module docstring): one wedge per configured centre, its narrow end there
    and the point of a solid wedge on the centre; no wedge between two stereocentres, along a
    ring bond, or on a bond the step forms or breaks, where the centre has another bond to wedge."""
    trace, scene = _scene(STEREO[name])
    for panel, state in zip(scene.panels, _states(trace)):
        centres = set(state_labels(state, {a.index for a in panel.atoms}))
        wedges = [b for b in panel.bonds if b.wedge]
        assert sorted(b.narrow for b in wedges) == sorted(centres), panel.index
        mol = Chem.Mol(state.mol)
        Chem.FastFindRings(mol)
        ring = mol.GetRingInfo()
        where = {a.index: a.position for a in panel.atoms}
        for bond in wedges:
            wide = bond.atoms[1] if bond.atoms[0] == bond.narrow else bond.atoms[0]
            if bond.wedge == "solid":
                assert bond.outline[0] == where[bond.narrow]
            others = [b for b in panel.bonds if bond.narrow in b.atoms and b is not bond and b.order == 1]
            assert wide not in centres
            if bond.role != "plain":
                assert all(b.role != "plain" for b in others), (panel.index, bond.atoms)
            if ring.NumBondRings(mol.GetBondBetweenAtoms(*bond.atoms).GetIdx()):
                assert all(ring.NumBondRings(mol.GetBondBetweenAtoms(*b.atoms).GetIdx()) for b in others
                           if b.role == "plain" and not set(b.atoms) - set(where)), (panel.index, bond.atoms)


def test_a_ring_centre_is_wedged_to_its_methyl():
    trace, scene = _scene(STEREO["ring centre kept"])
    methyl = 0   # the first atom of the SMILES
    for panel in scene.panels:
        wedge, = [b for b in panel.bonds if b.wedge]
        assert methyl in wedge.atoms


def _unconfigured():
    out = [pytest.param(p.read_text(encoding="utf-8"), id=p.stem) for p in GALLERY]
    out += [pytest.param(text, id=name) for name, text in CORRECT.items()]
    out += [pytest.param(text, id=name) for name, (text, _, _) in TEXTBOOK.items() if "@" not in text]
    return out


@pytest.mark.parametrize("text", _unconfigured())
def test_no_wedge_without_a_written_configuration(text):
    _, scene = _scene(text)
    assert not [b for p in scene.panels for b in p.bonds if b.wedge or b.outline]
