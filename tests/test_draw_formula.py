"""Formulas in condition text and in RDKit formulas, typeset as chemists print them.

Common practice of chemical typesetting (IUPAC Green Book, 3rd ed., memory): in a
formula the count after an element symbol or a closing parenthesis is a subscript and the charge
is a superscript after the formula; ordinary words, numbers and units are set as they are.
"""
from __future__ import annotations

import pytest

import arrows
from arrows.draw import STYLES, build_scene
from arrows.draw.formula import MINUS, condition_pieces, formula_pieces


@pytest.mark.parametrize("text,pieces", [
    ("H2O", [("H", "n"), ("2", "sub"), ("O", "n")]),
    ("H3O+ (cat.)", [("H", "n"), ("3", "sub"), ("O", "n"), ("+", "sup"), (" (cat.)", "n")]),
    ("Et3N", [("Et", "n"), ("3", "sub"), ("N", "n")]),
    ("CH2Cl2", [("CH", "n"), ("2", "sub"), ("Cl", "n"), ("2", "sub")]),
    ("LiAlH4, THF", [("LiAlH", "n"), ("4", "sub"), (", THF", "n")]),
    ("Ca(OH)2", [("Ca(OH)", "n"), ("2", "sub")]),
    ("OH-", [("OH", "n"), (MINUS, "sup")]),
    ("(H2O)", [("(H", "n"), ("2", "sub"), ("O)", "n")]),
    ("-H2O", [("-H", "n"), ("2", "sub"), ("O", "n")]),
    ("H2SO4 (cat.), 25 °C", [("H", "n"), ("2", "sub"), ("SO", "n"), ("4", "sub"), (" (cat.), 25 °C", "n")]),
    # A solvent mixture, each side on its own; a state symbol after a formula stays plain.
    ("MeOH/H2O", [("MeOH/H", "n"), ("2", "sub"), ("O", "n")]),
    ("H2O/THF", [("H", "n"), ("2", "sub"), ("O/THF", "n")]),
    ("NH3(l)", [("NH", "n"), ("3", "sub"), ("(l)", "n")]),
])
def test_formula_words_are_typeset(text, pieces):
    assert condition_pieces(text) == pieces


@pytest.mark.parametrize("text", ["25 °C", "2 equiv", "reflux", "heat, pressure", "NaOH", "MeOH, reflux",
                                  "DMSO, 60 °C", "E1cB", "hv", "pH 7", "1 atm", "and/or", "1/2 equiv", "HCl(aq)"])
def test_plain_words_stay_as_written(text):
    """No count and no charge: nothing to set lower or higher (a word, a number, a unit, or a
    formula without counts such as NaOH)."""
    assert condition_pieces(text) == [(text, "n")]


@pytest.mark.parametrize("text,shown", [
    ("THF, -78 °C", f"THF, {MINUS}78 °C"),
    ("(-10 °C)", f"({MINUS}10 °C)"),
    ("pH 1-2", "pH 1-2"),
    ("MeOH-THF, 0 °C", "MeOH-THF, 0 °C"),
])
def test_a_negative_number_gets_a_minus_sign(text, shown):
    """A hyphen before a number is set as a minus sign (−78 °C), as typesetters set negative
    temperatures (common practice; IUPAC Green Book and journal style guides, memory); a hyphen
    between words or numbers stays a hyphen."""
    assert "".join(p for p, _ in condition_pieces(text)) == shown


def test_every_character_is_kept():
    for text in ["H3O+ (cat.)", "Et3N, CH2Cl2, 0 °C", "  H2O  ", "MeOH/H2O, NH3(l)", "a//b", "/H2O/"]:
        assert "".join(p for p, _ in condition_pieces(text)).replace(MINUS, "-") == text


def test_rdkit_formulas():
    """RDKit's CalcMolFormula writes the charge after the formula, its size after the sign."""
    assert formula_pieces("C2H6O") == [("C", "n"), ("2", "sub"), ("H", "n"), ("6", "sub"), ("O", "n")]
    assert formula_pieces("HO-") == [("HO", "n"), (MINUS, "sup")]
    assert formula_pieces("O4S-2") == [("O", "n"), ("4", "sub"), ("S", "n"), ("2" + MINUS, "sup")]


def test_conditions_over_the_arrow_are_typeset_in_the_scene():
    """The scene the SVG is written from carries the subscript as a smaller, lowered run."""
    text = """\
species alkoxide = "CC[O-:1]"
species water = "[OH2:2]"
step "protonation" over "H2O" under "Et3N, 25 °C"
    :O1 -> H(O2)
    O2-H -> O2
end
"""
    trace, diags = arrows.check_text(text, "conditions.mech")
    scene = build_scene(trace, STYLES["two-column"], diags)
    runs = {t.text: t for t in scene.reaction_arrows[0].texts}
    assert runs["2"].size < runs["H"].size and runs["2"].y > runs["H"].y
    assert runs["3"].size < runs["Et"].size and runs["3"].y > runs["Et"].y
    assert runs["N, 25 °C"].y == runs["Et"].y


def test_small_by_products_are_written_as_chemists_abbreviate_them():
    """Ethanol leaves a Claisen condensation as "EtOH", not C2H6O (common practice abbreviations);
    an unlisted fragment keeps its molecular formula (here bromide, as RDKit writes it)."""
    from rdkit import Chem

    from arrows.draw.scheme import _byproduct_pieces

    def text(pieces):
        return "".join(p[0] for p in pieces)

    assert text(_byproduct_pieces(Chem.MolFromSmiles("CCO"))) == "EtOH"
    assert text(_byproduct_pieces(Chem.AddHs(Chem.MolFromSmiles("CCO")))) == "EtOH"   # explicit H atoms too
    assert text(_byproduct_pieces(Chem.MolFromSmiles("CC(C)NC(C)C"))) == "i-Pr2NH"
    assert text(_byproduct_pieces(Chem.MolFromSmiles("CCCCO"))) == "C4H10O"
    # Sulfonate leaving groups (mesylate, tosylate, triflate) and acetate, as chemists write them
    # (common practice); mesylate was once "CH3O3S-" in Hill order.
    for smiles, written in (("CS(=O)(=O)[O-]", "MsO"), ("Cc1ccc(cc1)S(=O)(=O)[O-]", "TsO"),
                            ("[O-]S(=O)(=O)C(F)(F)F", "TfO"), ("CC([O-])=O", "AcO")):
        assert text(_byproduct_pieces(Chem.MolFromSmiles(smiles))) == written + "\u2212"


def test_a_radical_by_product_is_written_with_its_dot():
    """Br• beside the arrow of a homolysis, not Br (common practice: a radical keeps its dot)."""
    from rdkit import Chem

    from arrows.draw.scheme import _byproduct_pieces
    bromine_atom = Chem.MolFromSmiles("[Br]")          # RDKit: one unpaired electron
    assert "".join(text for text, _ in _byproduct_pieces(bromine_atom)) == "Br\u2022"
    assert "\u2022" not in "".join(text for text, _ in _byproduct_pieces(Chem.MolFromSmiles("[Br-]")))


def test_a_labelled_by_product_keeps_its_label():
    """Heavy water leaves as D2O, labelled methoxide as CH3 18O- with the mass number as a left
    superscript (IUPAC 2005, IR-3.3: nuclide symbols; D for 2H); RDKit's CalcMolFormula with
    separateIsotopes and abbreviateHIsotopes is the judge of the formula."""
    from rdkit import Chem
    from rdkit.Chem.rdMolDescriptors import CalcMolFormula

    from arrows.draw.scheme import _byproduct_pieces
    water = Chem.MolFromSmiles("[2H]O[2H]")
    assert CalcMolFormula(water, True, True) == "D2O"
    assert _byproduct_pieces(water) == [("D", "n"), ("2", "sub"), ("O", "n")]
    methoxide = Chem.MolFromSmiles("C[18O-]")
    assert CalcMolFormula(methoxide, True, True) == "CH3[18O]-"
    assert _byproduct_pieces(methoxide) == [("CH", "n"), ("3", "sub"), ("18", "sup"), ("O", "n"), (MINUS, "sup")]


@pytest.mark.parametrize("smiles, written", [
    ("Cl[Ti](Cl)(Cl)Cl", "TiCl4"), ("O=S=O", "SO2"), ("Br[Mg]Br", "MgBr2"), ("N", "NH3"), ("O", "H2O"),
    ("Cl", "HCl"), ("Br", "HBr"), ("OS(=O)(=O)O", "H2SO4"), ("O=P(Cl)(Cl)Cl", "POCl3"), ("O=S(Cl)Cl", "SOCl2"),
    ("[NH4+]", "NH4+"), ("FB(F)F", "BF3"), ("O=C=O", "CO2"), ("CCCCO", "C4H10O")])
def test_a_by_product_without_carbon_is_written_in_iupac_element_order(smiles, written):
    """Without carbon a formula cites its elements in IUPAC's element sequence (Nomenclature of
    Inorganic Chemistry, Recommendations 2005, IR-4.4.3 and Table VI; from memory): TiCl4, SO2,
    NH3, H2SO4, POCl3, as chemists write them. RDKit's Hill order wrote Cl4Ti, O2S, H3N, H2O4S and
    Cl3OP beside the arrow. With carbon the Hill order stays (CO2, C4H10O)."""
    from rdkit import Chem

    from arrows.draw.scheme import _byproduct_pieces
    text = "".join(p[0] for p in _byproduct_pieces(Chem.MolFromSmiles(smiles)))
    assert text == written


@pytest.mark.parametrize("text,width", [("BuLi (2 equiv), THF, -78 °C", 22), ("heat 3 h, then -78 °C", 10)])
def test_a_unit_stays_on_its_number_s_line(text, width):
    """Condition text wrapped under an arrow never breaks between a number and its unit
    (-78 | °C was seen; typesetters tie them, common practice). Widths are in characters."""
    from arrows.draw.text import wrap

    class Monospace:
        def width(self, line: str, size: float) -> float:
            return float(len(line))

    lines = wrap(text, Monospace(), 1.0, width)
    assert " ".join(lines) == " ".join(text.split())
    for line, following in zip(lines, lines[1:]):
        assert not (line[-1:].isdigit() and following.split()[0] in ("°C", "h", "h,", "equiv", "equiv),")), lines
