"""Verdicts on pericyclic steps and on electrophilic attack at an arene, each against an outside
source named in the test: the Woodward-Hoffmann rules (thermal [4n+2] suprafacial steps allowed,
[2s+2s] and the suprafacial [1,3]-H shift forbidden), textbook outcomes (from memory: Clayden,
Organic Chemistry, chapters on pericyclic reactions and aromatic substitution) and common practice."""
from __future__ import annotations

import json
import re
from pathlib import Path

import pytest
from click.testing import CliRunner
from rdkit import Chem
from rdkit.Chem.EnumerateStereoisomers import EnumerateStereoisomers, StereoEnumerationOptions

from arrows import check_file, check_text
from arrows.batch.jsonl import check_line
from arrows.cli import cli
from arrows.trace import state_smiles

from textbook_mechanisms import TEXTBOOK


def codes(text: str) -> list[str]:
    _, diags = check_text(text, "t.mech")
    return [d.code for d in diags]


def only(text: str, code: str):
    _, diags = check_text(text, "t.mech")
    found = [d for d in diags if d.code == code]
    assert len(found) >= 1, [d.to_text() for d in diags]
    return found


# --- AR208: an order the moves give that would overfill an atom is not suggested ------------------

# Each a correct pericyclic step (textbook, from memory) with one arrow sent the wrong way, so two
# pairs enter one bond: writing the order the moves give (the old hint) only trades AR208 for AR301.
WRONG_WAY = {
    # Diels-Alder of butadiene and acrolein with the dienophile's arrow reversed.
    "diels-alder": ('species diene = "[CH2:1]=[CH:2][CH:3]=[CH2:4]"\n'
                    'species dienophile = "[CH2:5]=[CH:6][CH:7]=[O:8]"\n'
                    'step "cycloaddition" under "heat"\n    C1=C2 -> C2=C3\n    C3=C4 -> C4-C5\n'
                    '    C5=C6 -> C5-C4\nend\n', "`C4=C5`"),
    # Cope rearrangement with the breaking sigma pair sent into C2=C3 instead of C4=C5.
    "cope": ('species diene = "[CH2:1]=[CH:2][CH:3](C)[CH2:4][CH:5]=[CH2:6]"\n'
             'step "[3,3] shift" under "heat"\n    C3-C4 -> C2=C3\n    C5=C6 -> C6-C1\n    C1=C2 -> C2=C3\nend\n',
             "`C2#C3`"),
    # Claisen rearrangement with the C-O pair and the vinyl pair both sent into C2=O3.
    "claisen": ('species ether = "[CH2:1]=[CH:2][O:3][CH2:4][CH:5]=[CH2:6]"\n'
                'step "[3,3] shift" under "heat"\n    O3-C4 -> C2=O3\n    C5=C6 -> C6-C1\n    C1=C2 -> C2=O3\nend\n',
                "`C2#O3`"),
    # Hexatriene closure with the middle pi pair sent back into C2=C3.
    "hexatriene": ('species triene = "[CH2:1]=[CH:2][CH:3]=[CH:4][CH:5]=[CH2:6]"\n'
                   'step "closure" under "heat"\n    C1=C2 -> C2=C3\n    C3=C4 -> C2=C3\n    C5=C6 -> C6-C1\nend\n',
                   "`C2#C3`"),
}


@pytest.mark.parametrize("name", sorted(WRONG_WAY))
def test_ar208_does_not_suggest_an_order_that_overfills_an_atom(name):
    """The AR208 hint named the order the moves give (`C2#C3`); followed, it gives AR301 (a carbon
    with 10 valence electrons, beyond the octet: common practice). The hint now names the arrows
    that both enter the bond and says one runs the wrong way."""
    text, overfilling = WRONG_WAY[name]
    for d in only(text, "AR208"):
        assert overfilling not in d.hint, d.to_text()
        assert "runs the wrong way" in d.hint and "10 valence electrons" in d.hint, d.to_text()
        assert "each bond round the ring gains or loses one pair" in d.hint, d.to_text()


def test_ar208_still_gives_the_order_where_it_fits():
    """An E2 (textbook) whose new pi bond is written single: the order the moves give, double,
    overfills nothing, so the hint still gives it."""
    text = ('species bromide = "[CH3:1][CH2:2][CH2:3][Br:4]"\nspecies base = "[OH-:5]"\n'
            'step "E2"\n    :O5 -> H(C2)\n    C2-H -> C2-C3\n    C3-Br4 -> Br4\nend\n')
    (d,) = only(text, "AR208")
    assert "`C2=C3`" in d.hint, d.to_text()


# --- AR521: pericyclic steps forbidden under heat -----------------------------------------------

THERMAL_22 = ('species a = "[CH2:1]=[CH2:2]"\nspecies b = "[CH2:3]=[CH2:4]"\n'
              'step "[2+2]" under "heat"\n    C1=C2 -> C2-C3\n    C3=C4 -> C4-C1\nend\nproduct "C1CCC1"\n')
H13 = ('species propene = "[CH2:1]=[CH:2][CH2:3][H:10]"\n'
       'step "[1,3] H shift" under "heat"\n    C3-H10 -> C2=C3\n    C1=C2 -> C1-H10\nend\n')
# The aromatic Claisen's dienone tautomerised by one four-centre 1,3-H shift from C2 to O7.
KETO_ENOL_13 = ('species ether = "[CH2:10]=[CH:9][CH2:8][O:7][c:1]1[cH:2][cH:3][cH:4][cH:5][cH:6]1"\n'
                'step "[3,3] shift" under "200 C"\n    C1=C2 -> C2-C10\n    C9=C10 -> C8=C9\n    C8-O7 -> C1=O7\nend\n'
                'step "1,3-H shift"\n    C2-H -> C1=C2\n    C1=O7 -> O7-H(C2)\nend\nproduct "C=CCc1ccccc1O"\n')


def test_thermal_2_plus_2_of_two_alkenes_warns():
    """Woodward-Hoffmann: a [2s+2s] cycloaddition is forbidden thermally, allowed photochemically;
    the hint says how to write the light."""
    (d,) = only(THERMAL_22, "AR521")
    assert "[2+2]" in d.message and '`over "hv"`' in d.hint


@pytest.mark.parametrize("conditions", ['over "hv"', 'over "hν"', 'under "UV light, CH2Cl2"'])
def test_photochemical_2_plus_2_is_not_flagged(conditions):
    """Woodward-Hoffmann: the [2s+2s] is allowed photochemically; the step says light."""
    assert "AR521" not in codes(THERMAL_22.replace('under "heat"', conditions))


def test_thermal_suprafacial_13_h_shift_warns():
    """Woodward-Hoffmann: a [1,3]-H shift is forbidden suprafacially under heat, and the
    antarafacial path is out of reach of a three-atom chain (textbook, from memory)."""
    (d,) = only(H13, "AR521")
    assert "[1,3]-shift of hydrogen" in d.message


def test_keto_enol_tautomerisation_in_one_four_centre_step_warns():
    """Common practice: a keto-enol tautomerisation goes by two proton transfers (acid or base),
    not by a concerted 1,3-H shift (Woodward-Hoffmann forbidden); the hint says so."""
    (d,) = only(KETO_ENOL_13, "AR521")
    assert "two proton transfers" in d.hint


ALLOWED = {
    # A ketene's [2+2] with an alkene goes thermally (the ketene's orthogonal pi bond is the
    # antarafacial component, pi2s+pi2a: textbook, from memory).
    "ketene [2+2]": 'species ketene = "[CH2:1]=[C:2]=[O:3]"\nspecies alkene = "[CH2:4]=[CH2:5]"\n'
                    'step "[2+2]" under "heat"\n    C4=C5 -> C4-C2\n    C1=C2 -> C1-C5\nend\nproduct "O=C1CCC1"\n',
    # 4-electron electrocyclic ring opening, conrotatory: thermally allowed.
    "cyclobutene opening": 'species cyclobutene = "[CH:1]1=[CH:2][CH2:3][CH2:4]1"\n'
                           'step "opening" under "heat"\n    C3-C4 -> C2=C3\n    C1=C2 -> C1=C4\nend\n'
                           'product "C=CC=C"\n',
    # [4+2] Diels-Alder, 6 electrons: allowed.
    "diels-alder": 'species diene = "[CH2:1]=[CH:2][CH:3]=[CH2:4]"\nspecies dienophile = "[CH2:5]=[CH:6][CH:7]=[O:8]"\n'
                   'step "cycloaddition" under "heat"\n    C1=C2 -> C2=C3\n    C3=C4 -> C4-C5\n    C5=C6 -> C6-C1\nend\n'
                   'product "O=CC1CCC=CC1"\n',
    # [1,5]-H shift in a cyclopentadiene, suprafacial, 6 electrons: allowed.
    "[1,5]-H shift": 'species cpd = "C[CH:5]1[CH:1]=[CH:2][CH:3]=[CH:4]1"\n'
                     'step "[1,5] H shift" under "25 C"\n    C5-H -> C4=C5\n    C3=C4 -> C2=C3\n'
                     '    C1=C2 -> C1-H(C5)\nend\nproduct "CC1=CC=CC1"\n',
    # Cope [3,3]: allowed.
    "cope": 'species diene = "[CH2:1]=[CH:2][CH:3](C)[CH2:4][CH:5]=[CH2:6]"\n'
            'step "[3,3] shift" under "heat"\n    C3-C4 -> C4=C5\n    C5=C6 -> C6-C1\n    C1=C2 -> C2=C3\nend\n'
            'product "CC=CCCC=C"\n',
    # Ene reaction, 6 electrons: allowed.
    "ene": 'species ene = "[CH2:1]=[CH:2][CH2:3][H:10]"\nspecies enophile = "[CH2:4]=[CH2:5]"\n'
           'step "ene" under "heat"\n    C1=C2 -> C1-C4\n    C4=C5 -> C5-H10\n    C3-H10 -> C2=C3\nend\n'
           'product "C=CCCC"\n',
    # Keto-enol tautomerisation by two proton transfers (common practice).
    "enol by two proton transfers": 'species enol = "[CH2:1]=[C:2]([CH3:3])[OH:4]"\nspecies acid = "[OH3+:5]"\n'
                                    'step "C-protonation"\n    C1=C2 -> C1-H(O5)\n    O5-H -> O5\n    :O4 -> C2=O4\nend\n'
                                    'step "O-deprotonation"\n    :O5 -> H(O4)\n    O4-H -> O4\nend\n'
                                    'product "CC(C)=O.[OH3+]"\n',
}


@pytest.mark.parametrize("name", sorted(ALLOWED))
def test_allowed_pericyclic_and_stepwise_paths_are_not_flagged(name):
    found = codes(ALLOWED[name])
    assert "AR521" not in found, found


def test_no_ar521_over_the_correct_corpus():
    """Every textbook mechanism marked correct and every gallery file: no AR521 (hydroboration,
    a Wittig oxaphosphetane, Cope, Claisen, Diels-Alder, 1,3-dipolar and electrocyclic steps among them)."""
    flagged = []
    for name, (text, _, clean) in TEXTBOOK.items():
        if clean and "AR521" in codes(text):
            flagged.append(name)
    for path in sorted((Path(__file__).resolve().parent.parent / "gallery").glob("*.mech")):
        _, diags = check_file(path)
        if any(d.code == "AR521" for d in diags):
            flagged.append(path.name)
    assert flagged == []


# --- rings: a nitro N+ is not an oxocarbenium or iminium ------------------------------------------

def test_a_ring_closed_onto_a_nitro_nitrogen_is_not_called_an_oxocarbenium():
    """The N+ of a nitro group attacked by a ring carbon (a meta SNAr drawn through the nitro group,
    which has no conjugation path: textbook) is not an oxocarbenium or iminium carbon, where
    Baldwin's rules are routinely broken (common practice): the three-membered ring is AR501's."""
    text = ('species arene = "[F:10][C:1]1=[CH:2][C:3]([N+:7](=[O:8])[O-:9])=[CH:4][CH:5]=[CH:6]1"\n'
            'species methoxide = "C[O-:11]"\n'
            'step "addition"\n    :O11 -> O11-C1\n    C1=C2 -> C2-N7\n    N7=O8 -> O8\nend\n')
    _, diags = check_text(text, "t.mech")
    assert not any("oxocarbenium" in d.message for d in diags), [d.to_text() for d in diags]
    assert any(d.code == "AR501" and "C2-N7" in d.message for d in diags), [d.to_text() for d in diags]


# --- AR514: the arene bonds to N of NO2+ and to S of SO3, not to their oxygen ------------------------

BENZENE = 'species benzene = "[CH:1]1=[CH:2][CH:3]=[CH:4][CH:5]=[CH:6]1"\n'


@pytest.mark.parametrize("electrophile, moves, centre", [
    ('species nitronium = "[O:7]=[N+:8]=[O:9]"\n', "    C1=C2 -> C1-O9\n    N8=O9 -> N8\n", "N8"),
    ('species so3 = "[O:8]=[S:7](=O)=O"\n', "    C1=C2 -> C1-O8\n    S7=O8 -> S7\n", "S7"),
], ids=["nitronium", "SO3"])
def test_arene_bonded_to_the_oxygen_of_nitronium_or_so3_warns(electrophile, moves, centre):
    """Textbook nitration and sulfonation: the arene bonds to the N of NO2+ and to the S of SO3,
    the N=O / S=O pair going to oxygen. The hint names the arrow to the centre."""
    text = BENZENE + electrophile + f'step "attack"\n{moves}end\n'
    (d,) = only(text, "AR514")
    assert f"C1-{centre}" in d.hint and centre in d.message, d.to_text()


def test_correct_nitration_and_enolate_onto_nitroso_oxygen_are_not_flagged():
    """Textbook nitration (arene onto N, N=O pair to O) is clean; an enolate bonding to the O of a
    nitroso group (the O-nitroso aldol, memory: the nitroso N holds a lone pair) is not judged."""
    nitration = BENZENE + ('species nitronium = "[O:7]=[N+:8]=[O:9]"\n'
                           'step "attack"\n    C1=C2 -> C1-N8\n    N8=O9 -> O9\nend\n')
    o_nitroso = ('species enolate = "[CH2-:1][C:2](=[O:3])C"\nspecies nitroso = "c1ccccc1[N:4]=[O:5]"\n'
                 'step "O-attack"\n    :C1 -> C1-O5\n    N4=O5 -> N4\nend\n')
    assert "AR514" not in codes(nitration)
    assert "AR514" not in codes(o_nitroso)


# --- AR505: the nitro group's O- gives its pair back -------------------------------------------------

def test_meisenheimer_collapse_without_the_nitro_oxygen_returning_names_that_arrow():
    """SNAr (textbook addition-elimination): as the Meisenheimer complex expels fluoride, the C4=N7
    pair moves into the ring and the nitro group's O- gives a pair back to N7. Left out, N7 keeps
    six electrons; the hint names the arrow, and with it the mechanism checks clean."""
    text = ('species arene = "[F:10][C:1]1=[CH:2][CH:3]=[C:4]([N+:7](=[O:8])[O-:9])[CH:5]=[CH:6]1"\n'
            'species methoxide = "C[O-:11]"\n'
            'step "addition"\n    :O11 -> O11-C1\n    C1=C2 -> C2=C3\n    C3=C4 -> C4=N7\n    N7=O8 -> O8\nend\n'
            'step "elimination of fluoride"\n    C4=N7 -> C3=C4\n    C2=C3 -> C1=C2\n    C1-F10 -> F10\nend\n')
    (d,) = only(text, "AR505")
    assert "`:O8 -> N7=O8`" in d.hint, d.to_text()
    fixed = text.replace("    C1-F10 -> F10\n", "    C1-F10 -> F10\n    :O8 -> N7=O8\n")
    _, diags = check_text(fixed, "t.mech")
    assert [d for d in diags if d.severity != "note"] == [], [d.to_text() for d in diags]


# --- AR605: an open-chain [3,3] shift goes through a chair -------------------------------------------

# Doering & Roth (Tetrahedron 1962; Clayden, pericyclic rearrangements; from memory): the Cope
# rearrangement of meso-3,4-dimethylhexa-1,5-diene gives (E,Z)-octa-2,6-diene (99.7%), the
# (3R*,4R*) diene (E,E) (about 90%) with some (Z,Z): each a chair; (E,E) from the meso diene, or
# (E,Z) from the racemic one, needs a boat.
_COPE = ('species diene = "{diene}"\nstep "[3,3] shift" over "heat"\n    C1=C2 -> C1-C6\n    C3-C4 -> C2=C3\n'
         '    C5=C6 -> C4=C5\nend\nproduct "{product}"\n')
_MESO = "[CH2:1]=[CH:2][C@@H:3]([CH3:7])[C@@H:4]([CH3:8])[CH:5]=[CH2:6]"    # (3R,4S): RDKit's CIP labels
_RACEMIC = "[CH2:1]=[CH:2][C@@H:3]([CH3:7])[C@H:4]([CH3:8])[CH:5]=[CH2:6]"  # (3R,4R)
_EZ, _EE, _ZZ = "C/C=C/CC/C=C\\\\C", "C/C=C/CC/C=C/C", "C/C=C\\\\CC/C=C\\\\C"
# The same shift run backwards (microscopic reversibility: one chair each way): (E,Z)-octa-2,6-
# diene gives the meso diene, (E,E) the racemic one; the new stereocentres are judged.
_OCTADIENE_EZ = "[CH3:7]/[CH:1]=[CH:2]/[CH2:3][CH2:4]/[CH:5]=[CH:6]\\\\[CH3:8]"
_OCTADIENE_EE = "[CH3:7]/[CH:1]=[CH:2]/[CH2:3][CH2:4]/[CH:5]=[CH:6]/[CH3:8]"
_MESO_DIENE, _RACEMIC_DIENE = "C=C[C@@H](C)[C@@H](C)C=C", "C=C[C@@H](C)[C@H](C)C=C"
# A Claisen rearrangement of (E)-crotyl propenyl ethers through the same chair (Clayden; from
# memory: (E,E) gives the threo 2,3-dimethylpent-4-enal, (E,Z) the erythro; threo is the racemic
# diene's arrangement with the vinyl group made CHO, erythro the meso one's).
_CLAISEN = ('species ether = "{diene}"\nstep "[3,3] shift" over "heat"\n    C1=C2 -> C1-C6\n    O3-C4 -> C2=O3\n'
            '    C5=C6 -> C4=C5\nend\nproduct "{product}"\n')
_ETHER_EE = "[CH3:7]/[CH:1]=[CH:2]/[O:3][CH2:4]/[CH:5]=[CH:6]/[CH3:8]"
_ETHER_EZ = "[CH3:7]/[CH:1]=[CH:2]/[O:3][CH2:4]/[CH:5]=[CH:6]\\\\[CH3:8]"
_THREO, _ERYTHRO = "O=C[C@@H](C)[C@H](C)C=C", "O=C[C@@H](C)[C@@H](C)C=C"

CHAIR_SHIFTS = {
    "meso to (E,Z)": (_COPE, _MESO, _EZ, False),
    "meso to (E,E)": (_COPE, _MESO, _EE, True),
    "meso to (Z,Z)": (_COPE, _MESO, _ZZ, True),
    "racemic to (E,E)": (_COPE, _RACEMIC, _EE, False),
    "racemic to (Z,Z)": (_COPE, _RACEMIC, _ZZ, False),
    "racemic to (E,Z)": (_COPE, _RACEMIC, _EZ, True),
    "(E,Z)-octadiene to meso": (_COPE, _OCTADIENE_EZ, _MESO_DIENE, False),
    "(E,Z)-octadiene to racemic": (_COPE, _OCTADIENE_EZ, _RACEMIC_DIENE, True),
    "(E,E)-octadiene to racemic": (_COPE, _OCTADIENE_EE, _RACEMIC_DIENE, False),
    "(E,E)-octadiene to meso": (_COPE, _OCTADIENE_EE, _MESO_DIENE, True),
    "(E,E)-ether to threo": (_CLAISEN, _ETHER_EE, _THREO, False),
    "(E,E)-ether to erythro": (_CLAISEN, _ETHER_EE, _ERYTHRO, True),
    "(E,Z)-ether to erythro": (_CLAISEN, _ETHER_EZ, _ERYTHRO, False),
    "(E,Z)-ether to threo": (_CLAISEN, _ETHER_EZ, _THREO, True),
}


@pytest.mark.parametrize("name", list(CHAIR_SHIFTS))
def test_a_three_three_shift_product_is_judged_against_the_chair(name):
    """The product of an open-chain Cope or Claisen written with a configuration no chair gives
    draws AR605, naming the chair product; the chair product checks with no warning at all. Before,
    every one passed without a word, or the new centres were set as an electrocyclic closure's
    (disrotatory), the boat's arrangement, and AR603 fired on the chair product."""
    template, diene, product, flagged = CHAIR_SHIFTS[name]
    _, diags = check_text(template.format(diene=diene, product=product), "t.mech")
    findings = [d for d in diags if d.severity != "note"]
    if not flagged:
        assert findings == [], [d.to_text() for d in diags]
        return
    assert [d.code for d in findings] == ["AR605"], [d.to_text() for d in diags]
    assert "no chair transition state" in findings[0].message and "a chair gives" in findings[0].message


def test_the_chair_is_named_in_the_warning():
    """The meso diene written to go to (E,E): the warning names the chair's (E,Z) product, RDKit's
    canonical SMILES of it, and the hint the rule."""
    _, diags = check_text(_COPE.format(diene=_MESO, product=_EE), "t.mech")
    (d,) = [d for d in diags if d.code == "AR605"]
    assert d.message.endswith("a chair gives C/C=C\\CC/C=C/C"), d.to_text()
    assert "equatorial gives an E double bond" in d.hint


@pytest.mark.parametrize("diene, product", [
    # No configuration written in the diene: its two diastereomers give every geometry between them.
    ("[CH2:1]=[CH:2][CH:3]([CH3:7])[CH:4]([CH3:8])[CH:5]=[CH2:6]", _EE),
    # cis-1,2-Divinylcyclopropane opens to cyclohepta-1,4-diene through a boat (textbook, from
    # memory): an array on a ring is not judged.
    ("[CH2:1]=[CH:2][C@@H:3]1C[C@@H:4]1/[CH:5]=[CH:6]/C", "C[C@@H]1C=CCC=CC1"),
], ids=["unconfigured diene", "divinylcyclopropane (boat)"])
def test_a_three_three_shift_the_chair_does_not_fix_is_not_judged(diene, product):
    """Guard: only arrays of C, N and O outside any ring with a configuration written are judged."""
    assert "AR605" not in codes(_COPE.format(diene=diene, product=product))


@pytest.mark.parametrize("checkpoint, product, warned_at", [
    (_THREO, "[O-]C[C@@H](C)[C@H](C)C=C", None),
    (_ERYTHRO, "[O-]C[C@@H](C)[C@H](C)C=C", "checkpoint"),
    (_THREO, "[O-]C[C@@H](C)[C@@H](C)C=C", "product"),
], ids=["threo throughout", "erythro checkpoint", "erythro alkoxide"])
def test_the_chair_outcome_is_carried_to_checkpoints_and_past_later_steps(checkpoint, product, warned_at):
    """The (E,E)-ether's Claisen (threo, as above) with a checkpoint on the shift, then a hydride
    reducing the aldehyde: the reduction touches C2 and O3, not the new centres C1 and C6, so the
    chair still judges the alkoxide the product line writes."""
    text = (f'species ether = "{_ETHER_EE}"\nstep "[3,3] shift" over "heat"\n    C1=C2 -> C1-C6\n'
            f'    O3-C4 -> C2=O3\n    C5=C6 -> C4=C5\n    expect "{checkpoint}"\nend\n'
            'step "hydride transfer"\n    uses hydride = "[AlH4-:9]"\n    Al9-H -> C2-H(Al9)\n    C2=O3 -> O3\nend\n'
            f'product "{product}"\n')
    _, diags = check_text(text, "t.mech")
    findings = [d for d in diags if d.severity != "note"]
    assert [d.code for d in findings] == (["AR605"] if warned_at else []), [d.to_text() for d in diags]
    if warned_at:
        assert findings[0].message.startswith(f"the {warned_at} is written"), findings[0].to_text()


def test_a_three_three_shift_is_no_electrocyclic_closure():
    """The Cope of (E,Z)-octa-2,6-diene makes one bond between the ends of a six-atom chain, as a
    hexatriene's closure does, but breaks the chain's middle bond: no electrocyclic step, so the
    Woodward-Hoffmann turn (disrotatory, the boat's arrangement here) no longer configures C1 and C6."""
    _, diags = check_text(_COPE.format(diene=_OCTADIENE_EZ, product=_MESO_DIENE), "t.mech")
    notes = [d.message for d in diags if d.code == "AR602"]
    assert notes and not any("electrocyclic" in m for m in notes), notes


# --- The replay sets the chair's outcome of a [3,3] shift --------------------------------------------

def _racemate(smiles: str) -> set[str]:
    """RDKit's canonical SMILES of a stereoisomer and of its mirror image."""
    mol = Chem.MolFromSmiles(smiles)
    mirror = Chem.Mol(mol)
    for atom in mirror.GetAtoms():
        if atom.GetChiralTag() == Chem.ChiralType.CHI_TETRAHEDRAL_CW:
            atom.SetChiralTag(Chem.ChiralType.CHI_TETRAHEDRAL_CCW)
        elif atom.GetChiralTag() == Chem.ChiralType.CHI_TETRAHEDRAL_CCW:
            atom.SetChiralTag(Chem.ChiralType.CHI_TETRAHEDRAL_CW)
    return {Chem.MolToSmiles(mol), Chem.MolToSmiles(mirror)}


@pytest.mark.parametrize("template, start, chair_product", [
    (_COPE, _MESO, _EZ),
    (_COPE, _OCTADIENE_EZ, _MESO_DIENE),
    (_COPE, _OCTADIENE_EE, _RACEMIC_DIENE),   # an achiral start: one enantiomer stands for the racemate
    (_CLAISEN, _ETHER_EE, _THREO),
    (_CLAISEN, _ETHER_EZ, _ERYTHRO),
], ids=["meso diene", "(E,Z)-octadiene", "(E,E)-octadiene", "(E,E)-ether", "(E,Z)-ether"])
def test_the_replay_sets_the_one_product_both_chairs_give(template, start, chair_product):
    """Where both chairs give one product (Doering-Roth; the Claisen as above; from memory), the
    state after the shift carries it, as `check --jsonl --states` lists it (RDKit's canonical
    SMILES, compared up to the mirror image), the step's AR602 note says a chair set it, and no
    "no stereocontrol" count is left at the end. Before, the new double bonds and centres stayed
    unset: "CC=CCCC=CC (...): 3 stereoisomers can form"."""
    text = template.format(diene=start, product=chair_product)
    result = check_line("t.jsonl", 1, json.dumps({"id": "shift", "text": text}).encode(), with_states=True)
    after = Chem.MolFromSmiles(result["states"][1])
    assert after is not None and Chem.MolToSmiles(after) in _racemate(chair_product.replace("\\\\", "\\")), result["states"]
    _, diags = check_text(text, "t.mech")
    notes = [d.message for d in diags if d.code == "AR602"]
    assert "a [3,3] shift through a chair transition state" in notes[0], notes
    assert not any("stereocontrol" in note for note in notes), notes


def _every_stereoisomer(smiles: str) -> set[str]:
    """RDKit's EnumerateStereoisomers (the independent count) of a constitution, canonical SMILES."""
    options = StereoEnumerationOptions(unique=True)
    return {Chem.MolToSmiles(m) for m in EnumerateStereoisomers(Chem.MolFromSmiles(smiles), options=options)}


def _end_count(text: str) -> str:
    notes = [d.message for d in check_text(text, "t.mech")[1]
             if d.code == "AR602" and not d.message.startswith(("new ", "no longer"))]   # not a step's note
    assert len(notes) == 1, notes
    return notes[0]


def test_the_replay_leaves_the_racemic_diene_open_and_counts_what_its_chairs_allow():
    """The (3R*,4R*) diene's two chairs give two diastereomers, (E,E) with both methyls equatorial
    (~90%) and (Z,Z) with both axial (Doering-Roth, from memory). One state holds one configuration
    and (Z,Z) is no wrong product to write, so the replay sets neither (a guard); but AR602's end
    count leaves out the (E,Z) no chair gives: 2 of the 3 stereoisomers RDKit enumerates. Before, it
    said "with no stereocontrol, CC=CCCC=CC (...): 3 stereoisomers can form"."""
    trace, diags = check_text(_COPE.format(diene=_RACEMIC, product=_ZZ), "t.mech")
    assert Chem.MolToSmiles(Chem.MolFromSmiles(state_smiles(trace.steps[0].after))) == "CC=CCCC=CC"
    assert [d.code for d in diags if d.severity != "note"] == []
    every = _every_stereoisomer("CC=CCCC=CC")
    chair = {Chem.MolToSmiles(Chem.MolFromSmiles(s.replace("\\\\", "\\"))) for s in (_EE, _ZZ)}
    assert len(every) == 3 and chair < every
    note = _end_count(_COPE.format(diene=_RACEMIC, product=_ZZ))
    assert note == ("a chair [3,3] shift (step 1) allows 2 of the 3 stereoisomers of CC=CCCC=CC (stereogenic "
                    f"double bonds C2=C3, C4=C5): {' and '.join(sorted(chair))}"), note


# The Claisen of an (E)- or (Z)-propenyl ether of (R)-but-3-en-2-ol: the chair with the methyl on the
# configured carbon equatorial gives the E alkene, its ring flip (methyl axial) the Z alkene with the
# new centre inverted (chirality transfer through the chair: Clayden, pericyclic rearrangements; from
# memory). Of the 4 stereoisomers of 2-methylhex-4-enal, 2 can form.
_CHIRAL_ETHER_E = "[CH3:7]/[CH:1]=[CH:2]/[O:3][C@@H:4]([CH3:9])[CH:5]=[CH2:6]"
_CHIRAL_ETHER_Z = "[CH3:7]/[CH:1]=[CH:2]\\\\[O:3][C@@H:4]([CH3:9])[CH:5]=[CH2:6]"
_CLAISEN_ONLY = _CLAISEN.replace('product "{product}"\n', "")


def _geometry_and_centre(smiles: str) -> tuple[str, str]:
    mol = Chem.MolFromSmiles(smiles)
    (bond,) = [b for b in mol.GetBonds() if b.GetStereo() != Chem.BondStereo.STEREONONE]
    Chem.AssignStereochemistry(mol, cleanIt=True, force=True)
    (centre,) = Chem.FindMolChiralCenters(mol)
    return {Chem.BondStereo.STEREOE: "E", Chem.BondStereo.STEREOZ: "Z",
            Chem.BondStereo.STEREOTRANS: "E", Chem.BondStereo.STEREOCIS: "Z"}[bond.GetStereo()], centre[1]


@pytest.mark.parametrize("ether", [_CHIRAL_ETHER_E, _CHIRAL_ETHER_Z], ids=["(E)-propenyl", "(Z)-propenyl"])
def test_a_claisen_end_count_is_what_its_chairs_allow(ether):
    """The chirality-transferring Claisen above: the end count names 2 of the 4 stereoisomers
    (RDKit's EnumerateStereoisomers), one E and one Z, their new centres opposite (R against S).
    Before, it said "with no stereocontrol, CC=CCC(C)C=O (...): 4 stereoisomers can form"."""
    note = _end_count(_CLAISEN_ONLY.format(diene=ether))
    every = _every_stereoisomer("CC=CCC(C)C=O")
    prefix = f"a chair [3,3] shift (step 1) allows 2 of the {len(every)} stereoisomers of CC=CCC(C)C=O ("
    assert len(every) == 4 and note.startswith(prefix), note
    named = note.split("): ")[1].split(" and ")
    assert set(named) < every, named
    assert sorted(_geometry_and_centre(s) for s in named) in ([("E", "R"), ("Z", "S")], [("E", "S"), ("Z", "R")])


@pytest.mark.parametrize("text, count", [
    # No new centre: the chairs give the E and the Z alkene, as free.
    (_CLAISEN_ONLY.format(diene="[CH2:1]=[CH:2][O:3][C@@H:4]([CH3:9])[CH:5]=[CH2:6]"),
     "CC=CCCC=O (stereogenic double bond C4=C5): 2 stereoisomers can form"),
    # The propenyl geometry unwritten: each chair tried both ways gives all four.
    (_CLAISEN_ONLY.format(diene="[CH3:7][CH:1]=[CH:2][O:3][C@@H:4]([CH3:9])[CH:5]=[CH2:6]"),
     "CC=CCC(C)C=O (stereocentre C1 and stereogenic double bond C4=C5): 4 stereoisomers can form"),
    # No configuration written: no chair is judged.
    (_COPE.format(diene="[CH2:1]=[CH:2][CH:3]([CH3:7])[CH:4]([CH3:8])[CH:5]=[CH2:6]", product=_EE),
     "CC=CCCC=CC (stereogenic double bonds C2=C3, C4=C5): 3 stereoisomers can form"),
    # A later step touches one new double bond: the other is E in one chair, Z in the other.
    (_COPE.format(diene=_RACEMIC, product="").replace('product ""\n',
                                                      'step "protonation"\n    uses acid = "[H+:20]"\n'
                                                      '    C2=C3 -> C3-H20\nend\n'),
     "CC=CCC[CH+]CC (stereogenic double bond C4=C5): 2 stereoisomers can form"),
], ids=["vinyl ether", "propenyl geometry unwritten", "unconfigured diene", "a later step"])
def test_an_end_count_the_chairs_do_not_narrow_stays_free(text, count):
    """Guard: where the chairs allow every stereoisomer, or none is judged, the free count stands."""
    assert _end_count(text) == f"with no stereocontrol, {count}"


def _traced_count(tmp_path, text: str) -> str:
    """The count `arrows trace --stereo` prints for the one stereo-bearing piece of the final state."""
    path = tmp_path / "shift.mech"
    path.write_text(text)
    result = CliRunner().invoke(cli, ["trace", "--stereo", str(path)])
    assert result.exit_code == 0, result.output
    lines = result.output.splitlines()
    (line,) = [line for line in lines[lines.index("stereo"):] if "stereoisomer" in line]
    return line.rsplit("; ", 1)[1]


@pytest.mark.parametrize("text, constitution", [
    (_COPE.format(diene=_RACEMIC, product=_ZZ), "CC=CCCC=CC"),
    (_CLAISEN_ONLY.format(diene=_CHIRAL_ETHER_E), "CC=CCC(C)C=O"),
], ids=["racemic diene's Cope", "chirality-transferring Claisen"])
def test_trace_stereo_counts_what_the_chairs_allow_as_the_end_count_does(tmp_path, text, constitution):
    """After a chair [3,3] shift `arrows trace --stereo` gave the free count ("3 stereoisomers with
    no stereocontrol" for the racemic diene's Cope) where AR602's end count says the chairs allow 2
    of the 3 (Doering-Roth; the Claisen's chirality transfer, Clayden; both from memory; RDKit's
    EnumerateStereoisomers counts them all). The two now say one count and name the same isomers."""
    traced = _traced_count(tmp_path, text)
    every = _every_stereoisomer(constitution)
    assert traced.startswith(f"a chair [3,3] shift (step 1) allows 2 of the {len(every)} stereoisomers: "), traced
    assert set(traced.split(": ", 1)[1].split(" and ")) < every, traced
    said = re.fullmatch(r"(.*stereoisomers) of \S+ \([^)]*\)(.*)", _end_count(text))
    assert traced == said[1] + said[2], (traced, said[0])


def test_trace_stereo_keeps_the_free_count_where_no_chair_narrows_it(tmp_path):
    """Guard: the diene written without configuration (no chair judged) keeps the free count, the
    3 stereoisomers RDKit enumerates, as AR602's end count does."""
    text = _COPE.format(diene="[CH2:1]=[CH:2][CH:3]([CH3:7])[CH:4]([CH3:8])[CH:5]=[CH2:6]", product=_EE)
    assert _traced_count(tmp_path, text) == f"{len(_every_stereoisomer('CC=CCCC=CC'))} stereoisomers with no stereocontrol"


def test_a_checkpoint_the_replayed_chair_rules_out_is_the_chairs_to_name():
    """Guard: the meso diene's checkpoint written (E,E) where the replay's state is now the chair's
    (E,Z): one warning, AR605 naming the chair, not AR603 as well; written (E,Z) it draws none."""
    body = _COPE.format(diene=_MESO, product=_EZ)
    wrong = body.replace("\nend\n", f'\n    expect "{_EE}"\nend\n')
    _, diags = check_text(wrong, "t.mech")
    assert [d.code for d in diags if d.severity != "note"] == ["AR605"], [d.to_text() for d in diags]
    right = body.replace("\nend\n", f'\n    expect "{_EZ}"\nend\n')
    assert [d.code for d in check_text(right, "t.mech")[1] if d.severity != "note"] == []


# --- The thio-Claisen: a sulfur in the chair -----------------------------------------------------------

# The thio-Claisen rearrangement (an allyl vinyl sulfide to a gamma,delta-unsaturated thiocarbonyl; an
# S-allyl ketene N,S-acetal to a thioamide) goes through the Claisen's chair: the same rule fixes its
# new double bond and centres (common practice; from memory). So the (E)-propenyl (E)-crotyl sulfide
# gives the threo thioaldehyde as the (E,E)-ether gives the threo aldehyde above, and the ketene
# N,S-acetal with its methyl trans to sulfur (as the (E)-propenyl ether's is to oxygen) the threo
# thioamide; the dimethylamino group on C2 points out of the ring in either chair.
_THIO_CLAISEN = _CLAISEN.replace("O3-C4 -> C2=O3", "S3-C4 -> C2=S3")
_SULFIDE_EE = _ETHER_EE.replace("[O:3]", "[S:3]")
_SULFIDE_EZ = _ETHER_EZ.replace("[O:3]", "[S:3]")
_AMINAL_EE = _ETHER_EE.replace("[CH:2]/[O:3]", "[C:2](N(C)C)/[S:3]")
_THIO_THREO, _THIO_ERYTHRO = _THREO.replace("O=C", "S=C"), _ERYTHRO.replace("O=C", "S=C")
_THIOAMIDE_THREO, _THIOAMIDE_ERYTHRO = _THREO.replace("O=C", "S=C(N(C)C)"), _ERYTHRO.replace("O=C", "S=C(N(C)C)")

THIO_CLAISEN_SHIFTS = {
    "(E,E)-sulfide to threo": (_SULFIDE_EE, _THIO_THREO, False),
    "(E,E)-sulfide to erythro": (_SULFIDE_EE, _THIO_ERYTHRO, True),
    "(E,Z)-sulfide to erythro": (_SULFIDE_EZ, _THIO_ERYTHRO, False),
    "(E,Z)-sulfide to threo": (_SULFIDE_EZ, _THIO_THREO, True),
    "ketene N,S-acetal to threo thioamide": (_AMINAL_EE, _THIOAMIDE_THREO, False),
    "ketene N,S-acetal to erythro thioamide": (_AMINAL_EE, _THIOAMIDE_ERYTHRO, True),
}


@pytest.mark.parametrize("name", list(THIO_CLAISEN_SHIFTS))
def test_a_thio_claisen_product_is_judged_against_the_chair(name):
    """The thio-Claisen's product written with the configuration the Claisen's chair gives checks
    clean; its diastereomer draws AR605 alone. Before, the array was judged only for C, N and O:
    every one passed with "4 stereoisomers can form"."""
    start, product, flagged = THIO_CLAISEN_SHIFTS[name]
    _, diags = check_text(_THIO_CLAISEN.format(diene=start, product=product), "t.mech")
    assert [d.code for d in diags if d.severity != "note"] == (["AR605"] if flagged else []), \
        [d.to_text() for d in diags]


def test_the_thio_claisen_chair_sets_the_product_and_names_sulfur_in_the_array():
    """Both chairs of the (E,E)-sulfide give the threo thioaldehyde (as a racemate: nothing chiral
    goes in), so the replay sets it (RDKit's canonical SMILES, up to the mirror image), and the
    warning on the erythro names the array through S3."""
    text = _THIO_CLAISEN.format(diene=_SULFIDE_EE, product=_THIO_ERYTHRO)
    result = check_line("t.jsonl", 1, json.dumps({"id": "shift", "text": text}).encode(), with_states=True)
    assert Chem.MolToSmiles(Chem.MolFromSmiles(result["states"][1])) in _racemate(_THIO_THREO), result["states"]
    (d,) = [d for d in check_text(text, "t.mech")[1] if d.code == "AR605"]
    assert "(C1-C2-S3-C4-C5-C6)" in d.message and d.message.endswith("(as the racemate)"), d.to_text()


# Chirality transfer: the vinyl sulfide of (E)-pent-3-ene-2-thiol, its C4 configured. In the chair the
# methyl on C4 stands equatorial (the new C4=C5 double bond E) and the (E) terminus's methyl on C6 too
# (brief rule above, common practice; from memory). Two equatorial groups on ring atoms 1,3 apart
# are cis (cyclohexane conformations, textbook), so the configuration C6 gets is read off the ring the
# chair closes (S3, C4, C5, C6, C1, C2, each bond single) with the two methyls cis, written with
# C4's and C6's neighbours in the order the sulfide and the product write them; cis is told by RDKit:
# cis-1,3-dimethylcyclohexane (the ring with CH2 for S) is meso, its SMILES its mirror image's.
_CHIRAL_SULFIDE = "[CH2:1]=[CH:2][S:3][C@@H:4]([CH3:9])/[CH:5]=[CH:6]/[CH3:8]"
_CHAIR_RING = "[S:3]1[C@@H:4]([CH3:9])[CH2:5][C{tag}H:6]([CH3:8])[CH2:1][CH2:2]1"
_TRANSFERRED = "[CH3:9]/[CH:4]=[CH:5]/[C{tag}H:6]([CH3:8])[CH2:1][CH:2]=[S:3]"


def _cis_tag() -> str:
    """The tag of C6 that puts its methyl cis to C4's on _CHAIR_RING, told by RDKit (see above)."""
    def meso(tag: str) -> bool:
        ring = re.sub(r":\d+\]", "]", _CHAIR_RING.format(tag=tag).replace("[S:3]", "[CH2:3]"))
        return len(_racemate(ring)) == 1
    (tag,) = [tag for tag in ("@", "@@") if meso(tag)]
    return tag


def test_a_thio_claisen_transfers_chirality_through_the_chair():
    """The chiral sulfide above: the (E) product with C6 as the chair ring gives it checks clean,
    and the end count's two stereoisomers (of the 4 RDKit's EnumerateStereoisomers gives) hold it;
    its twin with C6 the other way, the (E) alkene no chair gives with that centre, draws AR605.
    Before, sulfur was not judged; and for the oxygen analogue, the new centre unset made the state
    after the shift achiral, so the twin passed as "the racemate" though each chair gives one
    enantiomer."""
    cis = _cis_tag()
    right, twin = (_TRANSFERRED.format(tag=tag) for tag in (cis, "@" if cis == "@@" else "@@"))
    template = _THIO_CLAISEN.replace("species ether", "species sulfide")
    _, diags = check_text(template.format(diene=_CHIRAL_SULFIDE, product=right), "t.mech")
    assert [d.code for d in diags if d.severity != "note"] == [], [d.to_text() for d in diags]
    note = _end_count(template.format(diene=_CHIRAL_SULFIDE, product=right))
    every = _every_stereoisomer("CC=CC(C)CC=S")
    assert len(every) == 4 and note.startswith("a chair [3,3] shift (step 1) allows 2 of the 4 stereoisomers"), note
    named = set(note.split("): ")[1].split(" and "))
    plain = Chem.MolToSmiles(Chem.MolFromSmiles(re.sub(r":\d+\]", "]", right)))
    assert plain in named and named < every, (plain, named)
    _, diags = check_text(template.format(diene=_CHIRAL_SULFIDE, product=twin), "t.mech")
    warned = [d for d in diags if d.severity != "note"]
    assert [d.code for d in warned] == ["AR605"] and "as the racemate" not in warned[0].message, \
        [d.to_text() for d in diags]


def test_the_claisen_twin_of_a_chirality_transfer_warns_too():
    """The oxygen analogue (the Claisen, the same chair): the twin with C6 the other way draws AR605
    after a later step that leaves C4, C5 and C6 alone (a hydride reducing the aldehyde); the chair's
    product does not."""
    cis = _cis_tag()
    ether = _CHIRAL_SULFIDE.replace("[S:3]", "[O:3]")
    for tag, warned in ((cis, []), ("@" if cis == "@@" else "@@", ["AR605"])):
        alkoxide = _TRANSFERRED.format(tag=tag).replace("[CH:2]=[S:3]", "[CH2:2][O-:3]")
        text = (f'species ether = "{ether}"\nstep "[3,3] shift" over "heat"\n    C1=C2 -> C1-C6\n'
                '    O3-C4 -> C2=O3\n    C5=C6 -> C4=C5\nend\n'
                'step "hydride transfer"\n    uses hydride = "[AlH4-:10]"\n    Al10-H -> C2-H(Al10)\n    C2=O3 -> O3\nend\n'
                f'product "{alkoxide}"\n')
        _, diags = check_text(text, "t.mech")
        assert [d.code for d in diags if d.severity != "note"] == warned, [d.to_text() for d in diags]


def test_a_sulfonium_array_is_not_judged():
    """Guard: a sulfonium sulfur (a charge-accelerated shift) holds a configuration and a lone pair
    of its own that the chair does not place: only a sulfur bonded to nothing off the array,
    uncharged, stands in a judged chair. Its erythro product, AR605's were it judged, passes."""
    sulfonium = _SULFIDE_EE.replace("[S:3]", "[S+:3](C)")
    assert "AR605" not in codes(_THIO_CLAISEN.format(diene=sulfonium, product="C" + _THIO_ERYTHRO.replace("S=", "[S+]=")))
