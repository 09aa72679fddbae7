"""Wrong mechanisms that `arrows check` once passed, each beside a correct one that must stay clean.
Sources are named per test; textbook outcomes are from memory."""
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import TEXTBOOK  # noqa: E402

from verdicts import findings, only  # noqa: E402


def _codes(text: str) -> list:
    return findings(text)[1]


_only = only


# --- 1. A proton thrown off with no base to take it (AR518) --------------------------------------
# Common practice: in solution a proton is always handed to a base (water, the solvent, the acid's
# counter-ion); "-H+" in an E1 is a shorthand, so a warning, not an error.

E1_LOSS = '''species cation = "[CH3:1][C+:2]([CH3:3])[CH3:4]"
species water = "[OH2:5]"
step "loss of a proton"
{base}    C1-H -> C1=C2
end
'''

HBR_ALONE = '''species hbr = "[Br:1][H:2]"
step "ionisation"
    H2-Br1 -> Br1
end
'''

# The wrong work-up of a Grignard addition to an ester: a methyl C-H thrown off as ethoxide leaves.
GRIGNARD_BARE_PROTON = '''species ester = "[CH3:1][C:2](=[O:3])[O:4]CC"
species grignard = "c1cccc[c:7]1[Mg:5][Br:6]"
step "first addition"
    C7-Mg5 -> C7-C2
    C2=O3 -> O3
end
step "ethoxide leaves as methyl C-H gives a pair"
    C1-H -> C1=C2
    C2-O4 -> O4
end
'''


def test_a_proton_thrown_off_with_water_beside_it_is_handed_to_the_water():
    """E1 of the tert-butyl cation (textbook): water takes the proton. With no arrow to it, AR518
    warns at the C-H move and writes the arrow from the water present; with it, nothing."""
    d = _only(E1_LOSS.format(base=""), "AR518")
    assert (d.loc.line, d.loc.column, d.severity) == (4, 5, "warning")
    assert "`:O5 -> H(C1)`" in d.hint
    assert not [x for x in _codes(E1_LOSS.format(base="    :O5 -> H(C1)\n")) if x.code == "AR518"]


def test_a_proton_with_no_base_anywhere_asks_for_one_with_uses():
    """HBr ionising with nothing to take the proton (common practice: HBr is an acid because water
    takes its proton): the hint brings water in under a free map number."""
    d = _only(HBR_ALONE, "AR518")
    assert 'uses base = "[OH2:3]"' in d.hint and "`:O3 -> H2`" in d.hint


def test_a_declared_proton_used_as_an_acid_is_not_a_released_one():
    """A bare proton written as [H+] and added to an alkene (Markovnikov, textbook) is not flagged,
    and a proton released by AR518's slip is not counted as a workup acid by AR517."""
    text = ('species alkene = "[CH2:1]=[C:2]([CH3:3])[CH3:4]"\nspecies proton = "[H+:5]"\n'
            'step "protonation"\n    C1=C2 -> C1-H5\nend\n')
    assert not [d for d in _codes(text) if d.code == "AR518"]
    found = {d.code for d in _codes(GRIGNARD_BARE_PROTON)}
    assert "AR518" in found and "AR517" not in found, found


# --- 2. A carbon nucleophile (or a hydride) drawn onto the O or N of a C=O / C=N / C#N (AR514) -----
# Common practice (Clayden ch. 6, 9): nucleophiles add to the carbon of a carbonyl, nitrile or
# imine; the pi pair goes to the more electronegative O or N, whatever would hold a carbanion.

WRONG_WAY = {
    "MeMgBr onto benzaldehyde's O": ('species aldehyde = "c1ccccc1[CH:1]=[O:2]"\n'
                                      'species grignard = "[CH3:3][Mg:4][Br:5]"\n'
                                      'step "addition"\n    C3-Mg4 -> C3-O2\n    C1=O2 -> C1\nend\n', 5, "`C3-Mg4 -> C1-C3`"),
    "EtMgBr onto a nitrile's N": ('species nitrile = "c1ccccc1[C:1]#[N:2]"\n'
                                  'species grignard = "C[CH2:3][Mg:4][Br:5]"\n'
                                  'step "addition"\n    C3-Mg4 -> C3-N2\n    C1#N2 -> C1\nend\n', 5, "`C1#N2 -> N2`"),
    "PhMgBr onto CO2's O": ('species grignard = "c1cccc[c:1]1[Mg:2][Br:3]"\nspecies co2 = "[O:4]=[C:5]=[O:6]"\n'
                            'step "addition"\n    C1-Mg2 -> C1-O4\n    C5=O4 -> C5\nend\n', 5, "`C5=O4 -> O4`"),
    "Wittig ylide carbon onto the carbonyl O": (
        'species ylide = "[CH3:7][CH-:1][P+:2](c1ccccc1)(c1ccccc1)c1ccccc1"\n'
        'species aldehyde = "c1ccccc1[CH:3]=[O:4]"\n'
        'step "addition"\n    :C1 -> O4\n    C3=O4 -> C3\nend\n', 5, "`:C1 -> C3`"),
}


@pytest.mark.parametrize("name", WRONG_WAY)
def test_a_carbon_nucleophile_on_the_heteroatom_end_is_backwards(name):
    """The benzylic, imidoyl, acyl or benzylic carbanion each of these leaves is held by something,
    which is why AR514 once let them pass: the polarity is wrong all the same."""
    text, line, fix = WRONG_WAY[name]
    d = _only(text, "AR514")
    assert (d.loc.line, d.loc.column) == (line, 5)
    assert fix in d.hint and "carbanion" in d.message


RIGHT_WAY = {
    "MeMgBr onto benzaldehyde's C": ('species aldehyde = "c1ccccc1[CH:1]=[O:2]"\n'
                                      'species grignard = "[CH3:3][Mg:4][Br:5]"\n'
                                      'step "addition"\n    C3-Mg4 -> C3-C1\n    C1=O2 -> O2\nend\n'),
    "enolate O onto a silyl chloride": ('species enolate = "[CH2:1]=[C:2]([CH3:3])[O-:4]"\n'
                                        'species tmscl = "C[Si:5](C)(C)[Cl:6]"\n'
                                        'step "O-silylation"\n    :O4 -> Si5\n    Si5-Cl6 -> Cl6\nend\n'),
    "Wittig": TEXTBOOK["wittig"][0],
    "Corey-Chaykovsky": TEXTBOOK["corey-chaykovsky"][0],
}


@pytest.mark.parametrize("name", RIGHT_WAY)
def test_additions_at_the_carbon_and_an_enolate_oxygen_stay_clean(name):
    """Guards (they passed before too): a Grignard at the carbonyl carbon, an enolate's O
    silylated (House, memory), the Wittig and Corey-Chaykovsky ylides at the carbonyl carbon."""
    assert not [d for d in _codes(RIGHT_WAY[name]) if d.code == "AR514"]


# --- 3. A shift between atoms that are not neighbours (AR519) -------------------------------------
# Common practice: Wagner-Meerwein and hydride shifts are 1,2; a suprafacial thermal [1,3]-H shift
# is forbidden by the Woodward-Hoffmann rules; a Baeyer-Villiger group migrates to the O bonded to
# the carbonyl carbon as the O-O bond breaks.

FAR_SHIFTS = {
    "1,3-hydride shift": ('species cation = "[CH3:1][CH+:2][CH2:3][CH:4]([CH3:5])[CH3:6]"\n'
                          'step "shift"\n    C4-H -> C2-H(C4)\nend\n', "C3"),
    "1,3-methyl shift": ('species cation = "[CH3:5][C:2]([CH3:3])([CH3:6])[CH2:7][CH+:4][CH3:8]"\n'
                         'step "shift"\n    C2-C3 -> C4-C3\nend\n', "C7"),
    "Baeyer-Villiger to the far O": ('species adduct = "[CH3:7][C:1]([OH:2])([c:3]1ccccc1)[O:13][O:12]C(C)=O"\n'
                                     'step "migration"\n    C1-C3 -> C3-O12\n    O13-O12 -> O13\n'
                                     '    :O2 -> C1=O2\nend\n', "O13"),
}


@pytest.mark.parametrize("name", FAR_SHIFTS)
def test_a_shift_to_an_atom_that_is_not_a_neighbour_is_flagged(name):
    text, between = FAR_SHIFTS[name]
    d = _only(text, "AR519")
    assert d.loc.line == 3 and f"1 atom between: {between}" in d.message and "1,3-shift" in d.message
    assert between in d.hint


def test_one_two_shifts_and_a_sigmatropic_hydrogen_shift_are_not_flagged():
    """Guards: the textbook pinacol rearrangement (1,2-methyl shift) and a thermal suprafacial
    [1,5]-H shift of a 1,3-pentadiene (allowed by the Woodward-Hoffmann rules) draw no AR519."""
    assert not [d for d in _codes(TEXTBOOK["pinacol"][0]) if d.code == "AR519"]
    sigmatropic = ('species diene = "[CH2:1]=[CH:2][CH:3]=[CH:4][CH3:5]"\n'
                   'step "[1,5]-H shift"\n    C5-H -> C1-H(C5)\n    C1=C2 -> C2=C3\n    C3=C4 -> C4=C5\nend\n')
    assert not [d for d in _codes(sigmatropic) if d.code == "AR519"]


# --- 4. SN2 at a tertiary carbon (AR520) -------------------------------------------------------------
# Common practice / Clayden ch. 15: the backside of a tertiary carbon is too crowded for SN2;
# tert-butyl bromide reacts by SN1 or E2.

SN2_TERTIARY = ('species rbr = "C[C:1](C)(C)[Br:2]"\nspecies base = "[OH-:3]"\n'
                'step "SN2"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n')

# A second phenyl Grignard displacing ethoxide from the tetrahedral intermediate (textbook: the
# intermediate collapses to the ketone first, which takes the second equivalent).
SECOND_GRIGNARD_ON_SP3 = '''species ester = "[CH3:1][C:2](=[O:3])[O:4]CC"
species grignard = "c1cccc[c:7]1[Mg:5][Br:6]"
step "first addition"
    C7-Mg5 -> C7-C2
    C2=O3 -> O3
end
step "second addition displacing ethoxide"
    uses grignard2 = "c1cccc[c:10]1[Mg:8][Br:9]"
    C10-Mg8 -> C10-C2
    C2-O4 -> O4
end
'''


def test_sn2_at_a_tertiary_carbon_is_flagged():
    d = _only(SN2_TERTIARY, "AR520")
    assert (d.loc.line, d.loc.column) == (5, 5) and "tertiary" in d.message
    assert "`C1-Br2 -> Br2`" in d.hint
    d = _only(SECOND_GRIGNARD_ON_SP3, "AR520")
    assert d.loc.line == 10 and "`:O3 -> C2=O3`" in d.hint


NOT_SN2_AT_TERTIARY = {
    # A protonated epoxide opened by water at its tertiary carbon (textbook, acid conditions).
    "protonated epoxide": ('species epoxide = "[CH3:1][C:2]1([CH3:3])[CH2:4][OH+:5]1"\nspecies water = "[OH2:6]"\n'
                           'step "opening"\n    :O6 -> C2\n    C2-O5 -> O5\nend\n'),
    # A tertiary halohydrin's alkoxide closing the epoxide (intramolecular, textbook).
    "ring closure": ('species halohydrin = "[O-:1][CH2:2][C:3](C)(C)[Br:4]"\n'
                     'step "closure"\n    :O1 -> C3\n    C3-Br4 -> Br4\nend\n'),
    # SN2 at a secondary carbon, and SN1 at the tertiary one (textbook).
    "secondary SN2": ('species rbr = "CC[CH:1](C)[Br:2]"\nspecies base = "[OH-:3]"\n'
                      'step "SN2"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n'),
    "SN1": ('species rbr = "C[C:1](C)(C)[Br:2]"\nspecies water = "[OH2:3]"\n'
            'step "ionisation"\n    C1-Br2 -> Br2\nend\nstep "capture"\n    :O3 -> C1\nend\n'),
    "textbook SN1 hydrolysis": TEXTBOOK["sn1 hydrolysis"][0],
}


@pytest.mark.parametrize("name", NOT_SN2_AT_TERTIARY)
def test_no_tertiary_sn2_warning_where_none_is_meant(name):
    """Guards: these passed before and must still pass."""
    assert not [d for d in _codes(NOT_SN2_AT_TERTIARY[name]) if d.code == "AR520"]


# --- 5. An epoxide cut at its C-C bond, a carbanion leaving (AR510) ------------------------------------
# Common practice: epoxides open at a C-O bond; the small-ring exemption is for all-carbon rings
# (the Favorskii cyclopropanone, textbook).

EPOXIDE_CC_CUT = ('species epoxide = "[CH3:1][CH:2]1[O:3][CH2:4]1"\nspecies grignard = "[CH3:5][Mg:6][Br:7]"\n'
                  'step "C-C cut"\n    C5-Mg6 -> C5-C4\n    C4-C2 -> C2\nend\n')


def test_an_epoxide_does_not_open_at_its_carbon_carbon_bond():
    d = _only(EPOXIDE_CC_CUT, "AR510")
    assert (d.loc.line, d.loc.column) == (5, 5) and "`C4-O3 -> O3`" in d.hint
    assert not [d for d in _codes(TEXTBOOK["favorskii"][0]) if d.code == "AR510"]


# --- 6. AR301's hint names the leaving group that leaves as the weaker base ---------------------------
# Common practice: the tetrahedral intermediate of an ester expels the alkoxide OEt, never its O-
# as oxide (O2-).

SECOND_HYDRIDE_ON_SP3 = '''species ester = "CC[C:1](=[O:2])[O:3]CC"
species alanate = "[AlH4-:4]"
step "hydride addition"
    Al4-H -> C1-H(Al4)
    C1=O2 -> O2
end
step "second hydride onto the sp3 carbon"
    uses alanate_2 = "[AlH4-:5]"
    Al5-H -> C1-H(Al5)
end
'''


def test_an_overfull_tetrahedral_carbon_is_told_to_expel_the_alkoxy_group_not_its_oxide():
    d = _only(SECOND_HYDRIDE_ON_SP3, "AR301")
    assert "`C1-O3 -> O3`" in d.hint and "O2 -> O2" not in d.hint, d.hint
