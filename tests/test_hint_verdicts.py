"""Hints and verdicts that once pointed the wrong way on rearrangements, fragmentations and ring
closures, each beside the drawing the hint asks for (which must check clean) or a correct
mechanism that must keep its verdict. Sources are named per test; textbook outcomes are from
memory. RDKit's canonical SMILES is the judge of what a step makes."""
import sys
from pathlib import Path

from rdkit import Chem

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import TEXTBOOK  # noqa: E402

from arrows import check_text  # noqa: E402
from verdicts import findings, only  # noqa: E402
from arrows.trace import state_smiles  # noqa: E402


_diags, _only = findings, only


def _clean(text: str):
    trace, found = _diags(text)
    assert not found, [d.to_text() for d in found]
    assert trace.complete
    return trace


def _holds(trace, smiles: str) -> bool:
    """Whether the last state holds the molecule `smiles` (RDKit canonical SMILES, maps dropped)."""
    mol = Chem.MolFromSmiles(state_smiles(trace.final))
    for atom in mol.GetAtoms():
        atom.SetAtomMapNum(0)
    parts = set(Chem.MolToSmiles(mol).split("."))
    return Chem.CanonSmiles(smiles) in parts


# --- AR301: the arrow drawn to the wrong atom, not a new bond to a third one ---------------------

CURTIUS_TO_N6 = '''species azide = "[CH3:1][C:2](=[O:3])[N-:5][N+:6]#[N:7]"
step "rearrangement" over "heat"
    C2-C1 -> C1-N6
    N5-N6 -> N6
    :N5 -> C2=N5
    releases N6
end
'''


def test_a_curtius_shift_to_the_wrong_nitrogen_is_sent_to_the_nitrogen_that_loses_n2():
    """Curtius rearrangement (Clayden; March; from memory): the acyl azide's R group migrates to the
    nitrogen bonded to the carbonyl carbon (N5) as N2 (N6#N7) leaves with the N5-N6 pair. Drawn to
    N6, N6 would hold 10 electrons. The hint once proposed `N6#N7 -> N7-N5`, a new N-N bond closing
    a three-membered ring; it names the migration's real terminus, and that drawing checks clean
    with methyl isocyanate made."""
    found = _only(CURTIUS_TO_N6, "AR301")
    assert "N6" in found.message and "`C2-C1 -> C1-N5`" in found.hint
    assert "N7-N5" not in found.hint
    fixed = _clean(CURTIUS_TO_N6.replace("C2-C1 -> C1-N6", "C2-C1 -> C1-N5"))
    assert _holds(fixed, "CN=C=O")


WOLFF_TO_N = '''species diazoketone = "[CH3:1][C:2](=[O:3])[CH-:5][N+:6]#[N:7]"
step "Wolff rearrangement" over "Ag2O, heat"
    C2-C1 -> C1-N6
    C5-N6 -> N6
    :C5 -> C2=C5
    releases N6
end
'''


def test_a_wolff_shift_to_the_diazo_nitrogen_is_sent_to_the_diazo_carbon():
    """Wolff rearrangement (Clayden; March; from memory): the alkyl group migrates from the carbonyl
    carbon to the diazo carbon C5 as N2 leaves, giving a ketene. Drawn to N6, the hint once proposed
    `N6#N7 -> N7-C5`; it names `C2-C1 -> C1-C5`, which checks clean and makes methylketene."""
    found = _only(WOLFF_TO_N, "AR301")
    assert "`C2-C1 -> C1-C5`" in found.hint and "N7-C5" not in found.hint
    fixed = _clean(WOLFF_TO_N.replace("C2-C1 -> C1-N6", "C2-C1 -> C1-C5"))
    assert _holds(fixed, "CC=C=O")


CHLORIDE_TO_IMINIUM = '''species iminium = "[CH2:2]=[N+:1](C)C"
species ester = "C[C:10](=[O:11])OC"
species chloride = "[Cl-:4]"
step "chloride adds to the acyl carbon"
    :Cl4 -> C2
    C10=O11 -> O11
end
'''


def test_a_nucleophile_drawn_to_the_wrong_carbon_is_sent_to_the_one_the_step_opens():
    """A chloride drawn onto the iminium carbon C2 while the step opens the ester's C10=O11 (the
    slip of a Vilsmeier acid-chloride drawing; common practice: the nucleophile adds where the pi
    pair leaves). C2 would hold 10 electrons. The hint once proposed `C2=N1 -> N1-C10`, a bond
    between two molecules no arrow is about; it moves the chloride's arrow to C10."""
    found = _only(CHLORIDE_TO_IMINIUM, "AR301")
    assert "`:Cl4 -> C10`" in found.hint and "N1-C10" not in found.hint
    _clean(CHLORIDE_TO_IMINIUM.replace(":Cl4 -> C2", ":Cl4 -> C10"))


OXALYL_COLLAPSE = '''species adduct = "C[C:1]([O-:2])([Cl:9])[O:3][C:4](=[O:5])[C:6](=[O:7])[Cl:8]"
step "collapse and fragmentation"
    :O2 -> C1=O2
    C1-O3 -> O3=C4
    C4-C6 -> C4
    C6-Cl8 -> Cl8
    :O7 -> C6#O7
end
'''


def test_a_fragmentation_pair_sent_to_the_wrong_carbon_goes_to_the_carbon_it_would_leave_short():
    """The oxalyl-chloride mixed anhydride falls apart to the acid chloride, CO2, CO and chloride
    (Clayden; common practice; from memory): the C4-C6 pair stays on C6, which becomes the carbon
    of CO. Sent to C4, C4 would hold 10 electrons; the hint once proposed `C4=O5 -> O5-C6`, a new
    O-C bond; it sends the pair to C6, and that drawing checks clean with CO2 and CO made."""
    found = _only(OXALYL_COLLAPSE, "AR301")
    assert "`C4-C6 -> C6`" in found.hint and "O5-C6" not in found.hint
    fixed = _clean(OXALYL_COLLAPSE.replace("C4-C6 -> C4\n", "C4-C6 -> C6\n"))
    assert _holds(fixed, "O=C=O") and _holds(fixed, "[C-]#[O+]") and _holds(fixed, "CC(Cl)=O")


# --- AR208: the push starts at the negative oxygen, not the C=O beside it ------------------------

CARBONATE = '''species carbonate = "[O-:5][C:6](=[O:7])[O:8]C(C)(C)C"
step "loss of CO2"
    :O7 -> C6=O7
    C6-O8 -> O8
end
'''


def test_a_carbonate_pushed_from_its_c_o_is_told_to_push_from_the_o_minus():
    """tert-Butyl carbonate loses CO2 with the O- pushing (Boc protection; Greene's Protective
    Groups; Clayden; common practice). Pushed from the C=O oxygen O7 the bond would be C#O+; the
    hint once said to write `C6#O7`. It starts the arrow at O5, and that drawing checks clean."""
    found = _only(CARBONATE, "AR208")
    assert "`:O5 -> C6=O5`" in found.hint and "write the bond as it is" not in found.hint
    fixed = _clean(CARBONATE.replace(":O7 -> C6=O7", ":O5 -> C6=O5"))
    assert _holds(fixed, "O=C=O") and _holds(fixed, "CC(C)(C)[O-]")


def test_an_acylium_written_at_too_low_an_order_is_still_told_to_write_the_triple_bond():
    """An acyl chloride ionising to the acylium ion R-C#O+ (Friedel-Crafts acylation; Clayden; from
    memory) with the bond written `C1=O2`: the triple bond is what the author meant, and no
    negative oxygen is there to push instead."""
    text = '''species chloride = "C[C:1](=[O:2])[Cl:3]"
step "acylium"
    :O2 -> C1=O2
    C1-Cl3 -> Cl3
end
'''
    found = _only(text, "AR208")
    assert "`C1#O2`" in found.hint


# --- AR512: only a molecule the mechanism goes on with excuses a release -------------------------

ADDUCT_RELEASED = '''species ester = "[CH3:1][C:2](=[O:3])[O:4][CH3:5]"
species hydroxide = "[OH-:6]"
{extra}step "addition"
    :O6 -> C2
    C2=O3 -> O3
    releases O4
end
'''


def test_a_spectator_does_not_excuse_releasing_the_molecule_that_reacted():
    """AR512's own example (methoxide released while still bonded to the tetrahedral carbon) with a
    larger molecule that no arrow touches (triphenylphosphine oxide): the release still takes the
    adduct away. It was silent once a larger molecule was anywhere in the drawing."""
    found = _only(ADDUCT_RELEASED.format(extra='species spectator = "O=P(c1ccccc1)(c1ccccc1)c1ccccc1"\n'), "AR512")
    assert "every atom they touch" in found.message and "`C2-O4 -> O4`" in found.hint


def test_a_by_product_of_an_earlier_step_does_not_excuse_the_release():
    """Curtius rearrangement of an acyl azide made with DPPA (Shioiri-Yamada; March; from memory),
    the azide's resonance step left out: `N3-N4 -> N4` takes only the pi pair of N3=N4, the N-N
    bond stays and `releases N4` takes the whole adduct. Diphenyl phosphate, larger and made two
    steps before, is touched by no later arrow: it does not excuse the release."""
    text = '''species acid = "[CH3:10][C:11](=[O:12])[OH:13]"
species base = "CC[N:20](CC)CC"
species dppa = "c1ccccc1O[P:1](=[O:2])(Oc1ccccc1)[N:3]=[N+:4]=[N-:5]"
step "triethylamine takes the acid proton"
    :N20 -> H(O13)
    O13-H -> O13
end
step "carboxylate adds to phosphorus"
    :O13 -> P1
    P1=O2 -> O2
end
step "azide leaves"
    :O2 -> P1=O2
    P1-N3 -> N3
end
step "azide adds to the acyl carbon"
    :N3 -> C11
    C11=O12 -> O12
end
step "diphenyl phosphate leaves"
    :O12 -> C11=O12
    C11-O13 -> O13
end
step "rearrangement" over "heat"
    C11-C10 -> C10-N3
    N3-N4 -> N4
    :N3 -> C11=N3
    releases N4
end
'''
    found = _only(text, "AR512")
    assert "N4" in found.message and "resonance step" in found.hint
    fixed = text.replace('step "rearrangement"', 'step "acyl azide resonance form" resonance\n'
                         '    :N5 -> N4#N5\n    N3=N4 -> N3\nend\nstep "rearrangement"')
    _clean(fixed)


def test_silver_bromide_let_go_as_it_forms_stays_clean():
    """Hunsdiecker reaction (textbook account, from memory): Ag+ and Br- join and the silver bromide
    is let go while the acyl hypobromite, larger, goes on reacting: no AR512."""
    _, found = _diags(TEXTBOOK["hunsdiecker"][0])
    assert "AR512" not in [d.code for d in found], [d.to_text() for d in found]


# --- AR601: a closure that expels a leaving group is polar -----------------------------------------

FAVORSKII_CLOSURE = '''species enolate = "[CH2:3]=[C:2]([O-:5])[CH2:1][Cl:4]"
step "closure"
{push}    C2=C3 -> C3-C1
    C1-Cl4 -> Cl4
end
'''


def test_a_closure_displacing_chloride_is_judged_by_baldwin_not_called_pericyclic():
    """Favorskii rearrangement (Clayden; March; from memory): the enolate closes to the
    cyclopropanone, displacing chloride, a polar 3-(enolendo)-exo-tet closure (Baldwin-Lusch 1982,
    memory: disfavoured, though the textbook route). Drawn without the O- push, the two arrows all
    start at bonds, and the step was called pericyclic ('Baldwin's rules do not apply'). The C-Cl
    pair goes onto the chloride, off the ring: an ion leaves, no cyclic array. Judged like the
    drawing with the push."""
    for push in ("", "    :O5 -> C2=O5\n"):
        trace, found = _diags(FAVORSKII_CLOSURE.format(push=push))
        rings = [d for d in found if d.code in ("AR501", "AR502")]
        assert len(rings) == 1 and "3-(enolendo)-exo-tet" in rings[0].message, [d.to_text() for d in found]
    _, every = check_text(FAVORSKII_CLOSURE.format(push=""), "case.mech")
    assert not any("pericyclic" in d.message for d in every)


def test_true_electrocyclic_closures_stay_pericyclic():
    """A 6-pi electrocyclic closure of hexa-1,3,5-triene and a Nazarov closure (Woodward-Hoffmann;
    Clayden; from memory): every arrow runs from a bond into a bond round the ring, no ion leaves.
    Both keep the AR601 note that Baldwin's rules do not apply."""
    for name in ("triene electrocyclisation", "nazarov"):
        _, diags = check_text(TEXTBOOK[name][0], "case.mech")
        notes = [d for d in diags if d.code == "AR601"]
        assert notes and all("pericyclic" in d.message for d in notes), [d.to_text() for d in diags]
        assert not [d for d in diags if d.code in ("AR501", "AR502")]


# --- AR301 across an arene attacking a nitrilium carbon: the pi bond onto N, not a 4-ring ---------

BISCHLER_NAPIERALSKI_NO_BREAK = """title "Bischler-Napieralski cyclisation"
species amide = "C[O:1][c:2]1[cH:3][c:4]([CH2:8][CH2:9][NH:10][C:11](=[O:12])[CH3:13])[cH:5][cH:6][cH:7]1"
species pocl3 = "[O:14]=[P:15]([Cl:16])(Cl)Cl"
species base = "c1cc[n:17]cc1"
step "amide oxygen attacks phosphorus, chloride leaves"
    :O12 -> P15
    P15-Cl16 -> Cl16
end
step "N-H removed: imidoyl phosphate"
    :N17 -> H(N10)
    N10-H -> N10=C11
    C11=O12 -> O12
end
step "dichlorophosphate leaves: nitrilium ion"
    :N10 -> C11#N10
    C11-O12 -> O12
    releases O12
end
step "arene attacks the nitrilium carbon (6-endo-dig)"
    C5=C6 -> C5-C11
end
step "rearomatisation"
    :Cl16 -> H(C5)
    C5-H -> C5=C6
end
product "COc1ccc2c(c1)CCN=C2C"
"""


def test_an_arene_attacking_a_nitrilium_without_breaking_it_is_sent_to_its_nitrogen():
    """Bischler-Napieralski cyclisation (Clayden; Joule & Mills; from memory): the arene attacks the
    nitrilium carbon C11 and the C#N pi pair goes onto N10. Drawn without that arrow, C11 would hold
    10 electrons; the hint (its concerted bond-to-bond branch, meant for a Diels-Alder missing an
    arrow) proposed `C11#N10 -> N10-C6`, a four-membered ring across the arene. It now names
    `C11#N10 -> N10`, and that drawing has no error."""
    found = _only(BISCHLER_NAPIERALSKI_NO_BREAK, "AR301")
    assert "`C11#N10 -> N10`" in found.hint and "N10-C6" not in found.hint
    fixed = BISCHLER_NAPIERALSKI_NO_BREAK.replace("    C5=C6 -> C5-C11\n", "    C5=C6 -> C5-C11\n    C11#N10 -> N10\n")
    _, every = findings(fixed)
    assert not [d for d in every if d.severity == "error"], [d.to_text() for d in every]


# --- AR301: a pair sent onto a carbon with no bond to give up ----------------------------------

def _walk_file(text: str, old: str, new: str) -> str:
    assert old in text
    return text.replace(old, new)


FISCHER_WRONG_CARBON = '''title "Fischer esterification"
species acid     = "[CH3:2][C:1](=[O:3])[OH:4]"
species methanol = "[CH3:5][OH:6]"
species hydronium = "[OH3+:7]"
step "carbonyl protonation" reversible
    :O3 -> H(O7)
    O7-H -> O7
end
step "addition of methanol" reversible
    :O6 -> C2
    C1=O3 -> O3
end
step "proton transfer" reversible
    :O7 -> H(O6)
    O6-H -> O6
end
step "protonation of OH" reversible
    :O4 -> H(O7)
    O7-H -> O7
end
step "loss of water" reversible
    :O3 -> C1=O3
    C1-O4 -> O4
    releases O4
end
step "deprotonation" reversible
    :O7 -> H(O3)
    O3-H -> O3
end
product "COC(C)=O"
'''


def test_a_nucleophile_sent_to_the_methyl_beside_a_protonated_carbonyl_is_sent_to_the_carbonyl_carbon():
    """Fischer esterification (Clayden; from memory): methanol adds to the carbon of the protonated
    carbonyl, C1. Typed `:O6 -> C2` (the methyl), C2 would hold 10 electrons; the hint once told
    methanol to take a methyl C-H proton (`:O6 -> H(C2)`, an acid's methyl is no acid to methanol:
    pKa ~50 in the acidity table as an alkane C-H). It names C1, which this step leaves short of a
    pair, and that drawing checks clean to methyl acetate."""
    found = _only(FISCHER_WRONG_CARBON, "AR301")
    assert "`:O6 -> C1`" in found.hint and "H(C2)" not in found.hint
    fixed = _clean(_walk_file(FISCHER_WRONG_CARBON, ":O6 -> C2", ":O6 -> C1"))
    assert _holds(fixed, "COC(C)=O")


DIONE_ALPHA_CARBON = '''species dione = "[CH3:1][C:2](=[O:3])[CH2:4][C:5](=[O:6])[CH3:7]"
species base = "[OH-:8]"
step "hydroxide adds to a carbonyl"
    :O8 -> C4
end
'''


def test_a_nucleophile_sent_to_a_dione_s_central_carbon_names_the_carbonyl_then_the_acidic_proton():
    """Pentane-2,4-dione and hydroxide (retro-Claisen cleavage, Clayden; from memory): hydroxide adds
    to a carbonyl carbon (C2, its pi pair going to O3), or takes a proton of the central CH2 (a
    1,3-dicarbonyl C-H, pKa ~9, textbook value in the acidity table). Drawn onto C4, the carbonyl
    carbon beside it is named first with the pi arrow, the proton second; both drawings check with
    no error."""
    hint = _only(DIONE_ALPHA_CARBON, "AR301").hint
    assert "`:O8 -> C2` with `C2=O3 -> O3`" in hint and "`:O8 -> H(C4)`" in hint
    assert hint.index("`:O8 -> C2`") < hint.index("H(C4)")
    for fixed in (":O8 -> C2\n    C2=O3 -> O3", ":O8 -> H(C4)\n    C4-H -> C4"):
        _, every = findings(_walk_file(DIONE_ALPHA_CARBON, ":O8 -> C4", fixed))
        assert not [d for d in every if d.severity == "error"], [d.to_text() for d in every]


def test_no_proton_of_an_alkane_carbon_is_offered_to_a_base():
    """Hydroxide drawn onto a methyl of ethane: an alkane C-H (pKa ~50, textbook value in the
    acidity table) is no acid to hydroxide (water 15.7), and no neighbour is electron-poor. The hint
    once offered `:O3 -> H(C1)`; it now offers no proton."""
    text = '''species ethane = "[CH3:1][CH3:2]"
species base = "[OH-:3]"
step "hydroxide onto a methyl"
    :O3 -> C1
end
'''
    hint = _only(text, "AR301").hint
    assert "H(C1)" not in hint and "C1" in hint


def test_guard_a_base_drawn_onto_an_acidic_carbon_is_still_sent_to_its_proton():
    """Guard: acetonitrile's C-H (pKa ~25, acidity table, from memory) with amide ion (ammonia ~38):
    no carbon beside it is electron-poor by the hint's rule, and the proton is the arrow meant (the
    nitrile anion's formation)."""
    text = '''species nitrile = "[CH3:1][C:2]#[N:3]"
species base = "[NH2-:4]"
step "amide onto the carbon"
    :N4 -> C1
end
'''
    assert "`:N4 -> H(C1)`" in _only(text, "AR301").hint


# --- AR201: an arrow from an atom with no lone pair to an atom it is bonded to -----------------

E1_ARROW_FROM_CARBON = '''title "E1 dehydration of tert-amyl alcohol"
species alcohol   = "[CH3:1][C:2]([CH3:5])([OH:6])[CH2:3][CH3:4]"
species hydronium = "[OH3+:7]"
step "protonation" reversible
    :O6 -> H(O7)
    O7-H -> O7
end
step "ionisation"
    :C2 -> O6
    releases O6
end
step "deprotonation"
    :O7 -> H(C3)
    C3-H -> C2=C3
end
product "CC=C(C)C"
'''


def test_an_arrow_from_a_carbon_to_its_leaving_group_is_read_as_the_bond_breaking():
    """E1 dehydration of 2-methylbutan-2-ol (Clayden; from memory): the protonated alcohol ionises,
    the C2-O6 pair leaving with water. Drawn `:C2 -> O6` (C2 has no lone pair), the hint once
    proposed the reverse, `:O6 -> C2`, a fifth bond to C2 through the bond it already has. It names
    the heterolysis `C2-O6 -> O6`, and that drawing checks clean to 2-methylbut-2-ene."""
    hint = _only(E1_ARROW_FROM_CARBON, "AR201").hint
    assert "`C2-O6 -> O6`" in hint and ":O6 -> C2" not in hint
    fixed = _clean(_walk_file(E1_ARROW_FROM_CARBON, ":C2 -> O6", "C2-O6 -> O6"))
    assert _holds(fixed, "CC=C(C)C")


def test_an_arrow_from_a_carbocation_to_its_ether_oxygen_is_read_as_the_oxygen_s_push():
    """A carbocation beside an ether oxygen is stabilised by the oxygen's lone pair making C=O+ (an
    oxocarbenium ion; common practice). Drawn `:C2 -> O5`, the push `:O5 -> C2=O5` is offered (not
    a new bond through the one there, nor the heterolysis that would leave a dication), and that
    drawing checks clean."""
    text = '''species cation = "[CH3:1][C+:2]([CH3:3])[O:5][CH3:6]"
step "oxygen pushes"
    :C2 -> O5
end
'''
    hint = _only(text, "AR201").hint
    assert "`:O5 -> C2=O5`" in hint and "C2-O5 -> O5" not in hint
    _clean(_walk_file(text, ":C2 -> O5", ":O5 -> C2=O5"))


def test_guard_an_arrow_from_a_carbocation_to_unbonded_water_is_still_reversed():
    """Guard: tert-butyl cation and water (SN1 capture, Clayden; from memory): drawn `:C2 -> O5`
    between atoms not bonded, the hint keeps the reversal `:O5 -> C2`."""
    text = '''species cation = "[CH3:1][C+:2]([CH3:3])[CH3:4]"
species water = "[OH2:5]"
step "capture"
    :C2 -> O5
end
'''
    assert "`:O5 -> C2`" in _only(text, "AR201").hint


# --- AR530: a cation written one hydrogen short -------------------------------------------------

HYDRONIUM_SHORT = '''species alcohol   = "[CH3:1][C:2]([CH3:5])([OH:6])[CH2:3][CH3:4]"
species hydronium = "[OH2+:7]"
step "protonation" reversible
    :O6 -> H(O7)
    O7-H -> O7
end
'''


def test_hydronium_written_one_hydrogen_short_is_offered_the_hydrogen_not_water():
    """Hydronium is H3O+ (textbook). Written [OH2+:7] it is a radical cation (RDKit gives the O one
    radical electron); the AR530 hint once offered `[OH2:7]`, which is water. It offers `[OH3+:7]`,
    which RDKit reads with no radical electron, and with it the file has no AR530."""
    hint = _only(HYDRONIUM_SHORT, "AR530").hint
    assert "`[OH3+:7]`" in hint and "[OH2:7]" not in hint
    fixed = _walk_file(HYDRONIUM_SHORT, "[OH2+:7]", "[OH3+:7]")
    assert Chem.MolFromSmiles("[OH3+:7]").GetAtomWithIdx(0).GetNumRadicalElectrons() == 0
    assert "AR530" not in [d.code for d in findings(fixed)[1]]


def test_an_ammonium_ion_written_one_hydrogen_short_is_offered_the_hydrogen():
    """Ammonium is NH4+ (textbook); [NH3+:3] is the aminium radical cation. RDKit's default valence
    of carbon, isoelectronic with N+, is 4: the hint offers `[NH4+:3]`."""
    text = '''species ammonium = "[NH3+:3]"
species water = "[OH2:9]"
species hydronium = "[OH3+:10]"
step "proton transfer"
    :O9 -> H(O10)
    O10-H -> O10
end
'''
    hint = _only(text, "AR530").hint
    assert "`[NH4+:3]`" in hint and "[NH3:3]" not in hint


# --- AR402: the product the moves give, as SMILES ------------------------------------------------

E1_HOFMANN_PROTON = _walk_file(E1_ARROW_FROM_CARBON, ":C2 -> O6\n", "C2-O6 -> O6\n").replace(
    ":O7 -> H(C3)\n    C3-H -> C2=C3", ":O7 -> H(C1)\n    C1-H -> C1=C2")


def test_a_wrong_product_names_the_smiles_the_moves_give():
    """E1 of 2-methylbutan-2-ol (Clayden; from memory): the proton taken from C1 gives
    2-methylbut-1-ene, C=C(C)CC, not the Zaitsev alkene CC=C(C)C written as the product. AR402 once
    listed only per-atom differences; its hint names the SMILES the moves give (RDKit canonical, no
    map numbers), and that SMILES written as the product checks clean."""
    found = _only(E1_HOFMANN_PROTON, "AR402")
    assert "the moves give `C=C(C)CC`" in found.hint
    _clean(E1_HOFMANN_PROTON.replace('product "CC=C(C)C"', 'product "C=C(C)CC"'))


def test_the_smiles_the_moves_give_carries_no_map_numbers_for_a_mapped_product():
    """The same wrong proton, the product written with map numbers: the derived SMILES is given
    without them (RDKit canonical SMILES of the piece, maps cleared), as it would be pasted."""
    text = E1_HOFMANN_PROTON.replace('product "CC=C(C)C"', 'product "[CH3:1][C:2]([CH3:5])=[CH:3][CH3:4]"')
    hint = _only(text, "AR402").hint
    assert "the moves give `C=C(C)CC`" in hint
    assert ":" not in hint.split("the moves give ")[1].split(", the piece")[0]


def test_a_product_of_other_atoms_is_shown_the_derived_piece_but_not_told_to_write_it():
    """Ammonia and iodomethane (SN2, textbook) give methylammonium; written as methanol, CO, the
    closest derived piece, C[NH3+], has other atoms: its SMILES is shown, but writing it as the
    product is not offered (the written atoms are not the ones the moves hold)."""
    text = '''species ammonia = "[NH3:1]"
species iodomethane = "[CH3:2][I:3]"
step "substitution"
    :N1 -> C2
    C2-I3 -> I3
end
product "CO"
'''
    hint = _only(text, "AR402").hint
    assert "the moves give `C[NH3+]`" in hint and "write the product as" not in hint


def test_the_uphill_proton_hint_writes_one_approximation():
    """AR508's hint named "a pKa near ~50" (two marks of approximation for one value): one is
    enough. Hydroxide on ethane's C-H (an alkane's pKa ~50, textbook, from memory)."""
    text = ('species base = "[OH-:1]"\nspecies ethane = "[CH3:2][CH3:3]"\n'
            'step "deprotonation"\n    :O1 -> H(C2)\n    C2-H -> C2\nend\n')
    d = only(text, "AR508")
    assert "pKa near 50" in d.hint and "near ~" not in d.hint
