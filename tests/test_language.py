"""The mechanism language (shared design: language.md): every construct parses into the model with
its line and column, and the common slips give a located syntax error that names the offending text,
says in words what was expected, and gives a hint."""
from __future__ import annotations

import subprocess
import sys

import pytest

from arrows import MechanismError, parse
from arrows.model import (AtomRef, AtomSink, BareAtom, BondPair, BondSink, HydrogenOn, LonePair, NonbondingSink,
                          UnpairedElectron)

# The worked example of the language (base-mediated ring closure of octane-2,7-dione), with the
# comments it is written with.
EXAMPLE = '''\
# Base-mediated ring closure of octane-2,7-dione
title   "Ring closure of octane-2,7-dione"
caption "Hydroxide forms the C3 enolate, which closes a five-membered ring onto C7."

species dione = "[CH3:1][C:2](=[O:9])[CH2:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]"
species base  = "[OH-:11]"

step "enolate formation" reversible over "NaOH" under "EtOH, 25 °C"
    :O11 -> H(C3)       # a lone pair of O11 takes a proton from C3
    C3-H -> C2=C3       # the C3-H pair becomes the C2=C3 pi bond
    C2=O9 -> O9         # the C=O pi pair moves onto O9
end

step "ring closure"
    :O9 -> C2=O9        # O9 gives a pair back: C=O re-forms
    C2=C3 -> C3-C7      # the enolate pi pair forms the new C3-C7 bond
    C7=O10 -> O10       # the C7=O10 pi pair moves onto O10
end

step "proton transfer"
    uses water = "[OH2:12]"
    :O10 -> H(O12)
    O12-H -> O12
    expect "CC(=O)C1CCCC1(C)O"   # checkpoint: the aldol addition product
end

product "CC(=O)C1CCCC1(C)O"
'''


def where(node) -> tuple[int, int]:
    return node.loc.line, node.loc.column


def test_worked_example_parses_into_the_model():
    m = parse(EXAMPLE, "example.mech")
    assert m.title == "Ring closure of octane-2,7-dione"
    assert m.caption.startswith("Hydroxide forms")
    assert [s.name for s in m.species] == ["dione", "base"]
    assert [s.label for s in m.steps] == ["enolate formation", "ring closure", "proton transfer"]
    first = m.steps[0]
    assert (first.kind, first.over, first.under) == ("reversible", "NaOH", "EtOH, 25 °C")
    assert [str(mv) for mv in first.moves] == [":O11 -> H(C3)", "C3-H -> C2=C3", "C2=O9 -> O9"]
    assert m.steps[2].uses[0].name == "water" and m.steps[2].uses[0].smiles == "[OH2:12]"
    assert m.steps[2].expects[0].smiles == "CC(=O)C1CCCC1(C)O"
    assert m.product.smiles == "CC(=O)C1CCCC1(C)O" and not m.product.whole_state
    assert m.source_name == "example.mech"


def test_locations_on_nodes():
    m = parse(EXAMPLE, "example.mech")
    dione, base = m.species
    assert where(dione) == (5, 1)
    assert (dione.smiles_loc.line, dione.smiles_loc.column) == (5, 18)   # just inside the quote
    assert where(base) == (6, 1)
    step = m.steps[0]
    assert where(step) == (8, 1)
    move = step.moves[1]                      # "    C3-H -> C2=C3"
    assert where(move) == (10, 5)
    assert where(move.source) == (10, 5)
    assert where(move.source.bond.first) == (10, 5)
    assert where(move.source.bond.second) == (10, 8)    # the bare H
    assert where(move.sink) == (10, 13)
    assert where(move.sink.bond.second) == (10, 16)
    lone = step.moves[0]                      # "    :O11 -> H(C3)"
    assert where(lone.source) == (9, 5) and where(lone.source.atom) == (9, 6)
    assert where(lone.sink.atom) == (9, 13) and where(lone.sink.atom.parent) == (9, 15)
    uses = m.steps[2].uses[0]
    assert where(uses) == (21, 5)
    assert where(m.steps[2].expects[0]) == (24, 5)
    assert where(m.product) == (27, 1)
    for node in (dione, step, move, m.product):
        assert node.loc.file == "example.mech"


def test_hash_is_a_comment_after_space_and_a_triple_bond_between_atoms():
    m = parse('''\
# a comment line
species cyanide = "[C-:1]#[N:2]"   # a comment; the # in the SMILES is a triple bond
step "label with # inside"  # trailing comment
    C1#N2 -> N2   # the triple bond C1#N2 gives a pair to N2
end
''')
    assert m.species[0].smiles == "[C-:1]#[N:2]"
    assert m.steps[0].label == "label with # inside"
    source = m.steps[0].moves[0].source
    assert isinstance(source, BondPair) and source.bond.order == 3
    assert len(m.steps[0].moves) == 1


@pytest.mark.parametrize("written, order", [("C1-C2", 1), ("C1=C2", 2), ("C1#C2", 3)])
def test_bond_connectors(written, order):
    m = parse(f'step "s"\n    {written} -> C2\nend\n')
    assert m.steps[0].moves[0].source.bond.order == order
    assert str(m.steps[0].moves[0].source) == written


def test_hydrogen_forms_name_the_same_hydrogen():
    """`H(C3)`, `C3-H` and `H-C3` all name a hydrogen on C3 (language.md, Atoms)."""
    m = parse('step "s"\n    :O1 -> H(C3)\n    C3-H -> C2=C3\n    H-C3 -> C3\nend\n')
    first, second, third = m.steps[0].moves
    assert first.sink.atom == HydrogenOn(AtomRef("C", 3))
    assert second.source.bond.second == HydrogenOn(AtomRef("C", 3))
    assert third.source.bond.first == HydrogenOn(AtomRef("C", 3))
    assert str(second.source) == "C3-H"


def test_two_letter_elements_and_mapped_hydrogens():
    m = parse('step "s"\n    Cl1-Br22 -> Br22\n    :O3 -> H40\nend\n')
    bond = m.steps[0].moves[0].source.bond
    assert (bond.first, bond.second) == (AtomRef("Cl", 1), AtomRef("Br", 22))
    assert m.steps[0].moves[1].sink.atom == AtomRef("H", 40)


@pytest.mark.parametrize("dot", [".", "•"])
def test_unpaired_electron_sources(dot):
    m = parse(f'step "s"\n    {dot}C1 ~> C1-C2\n    {dot}C2 ~> C1-C2\nend\n')
    move = m.steps[0].moves[0]
    assert isinstance(move.source, UnpairedElectron) and move.source.atom == AtomRef("C", 1)
    assert move.electrons == 1
    assert isinstance(move.sink, BondSink)


def test_pair_and_single_electron_arrows():
    m = parse('step "s"\n    :O1 -> C2\n    C3-C4 ~> C4\nend\n')
    pair, single = m.steps[0].moves
    assert (pair.electrons, single.electrons) == (2, 1)
    assert isinstance(pair.source, LonePair) and isinstance(pair.sink, AtomSink)
    assert str(single) == "C3-C4 ~> C4"


def test_an_electron_transfer_ends_on_an_atom_written_with_a_colon():
    m = parse('step "s"\n    .Na1 ~> :O3\n    C2=O3 ~> C2\nend\n')
    transfer = m.steps[0].moves[0]
    assert isinstance(transfer.sink, NonbondingSink) and transfer.sink.atom == AtomRef("O", 3)
    assert (transfer.sink.loc.line, transfer.sink.loc.column) == (2, 13)
    assert str(transfer) == ".Na1 ~> :O3"
    assert isinstance(m.steps[0].moves[1].sink, AtomSink)


def test_bare_atom_source_is_kept_for_the_checker():
    m = parse('step "s"\n    O1 -> C2\nend\n')
    assert isinstance(m.steps[0].moves[0].source, BareAtom)


@pytest.mark.parametrize("options, kind, over, under", [
    ("", "forward", None, None),
    ("reversible", "reversible", None, None),
    ("resonance", "resonance", None, None),
    ('over "H2O"', "forward", "H2O", None),
    ('under "0 °C, 2 h" reversible over "LDA"', "reversible", "LDA", "0 °C, 2 h"),
])
def test_step_options(options, kind, over, under):
    step = parse(f'step "s" {options}\n    :O1 -> C2\nend\n').steps[0]
    assert (step.kind, step.over, step.under) == (kind, over, under)


@pytest.mark.parametrize("text, line, column, says", [
    # `resonance reversible` once kept the last word: the step escaped the resonance checks.
    ('step "s" resonance reversible\n    :O1 -> C2\nend\n', 1, 20, "`resonance` or `reversible`, not both"),
    ('step "s" reversible reversible\n    :O1 -> C2\nend\n', 1, 21, "`reversible` is written twice"),
    ('step "s" over "a" over "b"\n    :O1 -> C2\nend\n', 1, 19, '`over` is written twice: "a" and "b"'),
    ('step "s" under "a" under "b"\n    :O1 -> C2\nend\n', 1, 20, "`under` is written twice"),
    ('title "a"\ntitle "b"\n', 2, 1, '`title` is written twice: "a" and "b"'),
    ('caption "a"\nspecies w = "O"\ncaption "b"\n', 3, 1, "`caption` is written twice"),
])
def test_an_option_or_heading_written_twice_is_an_error(text, line, column, says):
    d = syntax_error(text)
    assert (d.code, d.loc.line, d.loc.column) == ("AR101", line, column) and says in d.message and d.hint


def test_uses_releases_expect_and_expect_all():
    m = parse('''\
step "s"
    uses water = "[OH2:5]"
    uses acid  = "[OH3+:6]"
    :O5 -> C2
    releases Br3
    expect "CO"
    expect all "CO.[Br-]"
end
product all "CO.[Br-]"
''')
    step = m.steps[0]
    assert [(s.name, s.smiles) for s in step.uses] == [("water", "[OH2:5]"), ("acid", "[OH3+:6]")]
    assert (step.uses[0].smiles_loc.line, step.uses[0].smiles_loc.column) == (2, 19)
    assert step.releases == (AtomRef("Br", 3),)
    assert [(c.smiles, c.whole_state) for c in step.expects] == [("CO", False), ("CO.[Br-]", True)]
    assert m.product.whole_state


def test_statements_after_the_product_are_kept_aside():
    m = parse('product "C"\nstep "late"\n    :O1 -> C2\nend\nproduct "CC"\n')
    assert m.steps == () and m.product.smiles == "C"
    assert [(loc.line, loc.column) for loc in m.after_product] == [(2, 1), (5, 1)]


def test_empty_and_comment_only_files_are_empty_mechanisms():
    assert parse("").steps == ()
    assert parse("# nothing yet\n\n   # still nothing\n").species == ()


def test_white_space_only_separates_tokens():
    compact = parse('step "s" :O1->C2 C2-Br3->Br3 end')
    spread = parse('step "s"\n\n    :O1   ->   C2\n\tC2-Br3 -> Br3\nend\n')
    assert compact.steps[0].moves == spread.steps[0].moves


# --- syntax errors -----------------------------------------------------------------------------

def syntax_error(text: str):
    with pytest.raises(MechanismError) as caught:
        parse(text, "slip.mech")
    (d,) = caught.value.diagnostics
    assert d.code == "AR101" and d.severity == "error"
    assert d.loc.file == "slip.mech"
    return d


# (name, text, line, column, offending text, expected (words), hint fragment)
SLIPS = [
    ("a move's sink left out",
     'step "a"\n    :S3 ->\n    C1-Br2 -> Br2\nend\n',
     3, 12, "unexpected `->`", "`end`", "the move on the line before ends at its arrow"),
    ("a step's label left out",
     'step\n    :S3 -> C1\nend\n',
     2, 5, "unexpected `:`", 'a quoted string ("...")', "`step` on line 1 needs its label in double quotes"),
    ("a comment glued to an atom",
     'step "a"\n    C1-Br2 -> Br2#note\nend\n',
     2, 19, "unexpected `note`", "an atom", "a comment needs white space before its `#`"),
    ("missing end before the next step",
     'species w = "[OH2:1]"\nstep "a"\n    :O1 -> C2\nstep "b"\n    :O1 -> C2\nend\n',
     4, 1, "unexpected `step`", "`end`", "the step before this line (line 2) has no `end`"),
    ("missing end at the end of the file",
     'species w = "[OH2:1]"\nstep "a"\n    :O1 -> C2\n',
     3, 14, "unexpected end of file", "`end`", "the step opened on line 2 is still open"),
    ("missing end before the product",
     'step "a"\n    :O1 -> C2\nproduct "CO"\n',
     3, 1, "unexpected `product`", "`end`", "has no `end`"),
    ("- written for = in a species",
     'species w - "[OH2:1]"\n',
     1, 11, "unexpected `-`", "`=`", 'species NAME = "SMILES"'),
    ("= written for an arrow",
     'step "a"\n    :O1 = C2\nend\n',
     2, 9, "unexpected `=`", "an arrow (-> or ~>)", "`=` is a bond between two atoms"),
    ("- written for an arrow",
     'step "a"\n    :O1 - C2\nend\n',
     2, 9, "unexpected `-`", "an arrow (-> or ~>)", "-> (pair) or ~> (single electron)"),
    ("== in a species",
     'species w == "O"\n',
     1, 12, "unexpected `=`", 'a quoted string ("...")', "a single `=`"),
    ("unquoted SMILES",
     'species ethanol = CCO\n',
     1, 19, "unexpected `CCO`", 'a quoted string ("...")', 'write "CCO"'),
    ("unquoted bracket SMILES",
     'species water = [OH2:1]\n',
     1, 17, "unexpected `[OH2:1]`", 'a quoted string ("...")', 'write "[OH2:1]"'),
    ("unquoted checkpoint SMILES",
     'step "a"\n    :O1 -> C2\n    expect CO\nend\n',
     3, 12, "unexpected `CO`", 'a quoted string ("...")', "SMILES goes in double quotes"),
    ("unquoted step label",
     'step deprotonation\nend\n',
     1, 6, "unexpected `deprotonation`", 'a quoted string ("...")', 'write "deprotonation"'),
    ("unclosed string",
     'species w = "[OH2:1]\n',
     1, 13, 'unexpected `"[OH2:1]`', 'a quoted string ("...")', 'no closing `"`'),
    ("atom written without its number (source)",
     'step "a"\n    :O -> C2\nend\n',
     2, 6, "unexpected `O`", "an atom such as C7, or H(C3)", "write O7"),
    ("atom written without its number (sink)",
     'step "a"\n    :O1 -> C\nend\n',
     2, 12, "unexpected `C`", "an atom such as C7, or H(C3)", "write C7"),
    ("atom written without its number (bond)",
     'step "a"\n    C2=C -> C2\nend\n',
     2, 8, "unexpected `C`", "an atom such as C7, or H(C3)", "write C7"),
    ("element in lower case",
     'step "a"\n    :o1 -> C2\nend\n',
     2, 6, "unexpected `o1`", "an atom such as C7, or H(C3)", "capital letter: write O1"),
    ("unknown keyword at the top",
     'reagent w = "O"\n',
     1, 1, "unexpected `reagent`", "a statement (title, caption, species, step or product)",
     "`reagent` is not a keyword"),
    ("unknown keyword in a step",
     'step "a"\n    catalyst "Pd"\nend\n',
     2, 5, "unexpected `catalyst`", "a move, `uses`, `releases`, `expect` or `end`",
     "`catalyst` is not a keyword here"),
    ("end with no step open",
     'species w = "O"\nend\n',
     2, 1, "unexpected `end`", "a statement", "no step is open"),
    ("two arrows in one move",
     'step "a"\n    :O1 -> C2 -> C3\nend\n',
     2, 15, "unexpected `->`", "a move", "one arrow per move"),
    ("typographic arrow",
     'step "a"\n    :O1 → C2\nend\n',
     2, 9, "unexpected `→`", "a move", "type the arrow as ->"),
    ("arrow typed with an en dash (a word processor's autocorrect)",
     'step "a"\n    :O1 \u2013> C2\nend\n',
     2, 9, "unexpected `\u2013>`", "a move", "is a dash, not a hyphen"),
    ("SMILES in curly quotes (a word processor's autocorrect)",
     'species w = \u201c[OH2:1]\u201d\n',
     1, 13, "unexpected `\u201c[OH2:1]\u201d`", "a quoted string", 'type straight double quotes, "[OH2:1]"'),
    ("bond typed with an em dash",
     'step "a"\n    :O1 -> H(C2)\n    C2\u2014H -> C2\nend\n',
     3, 7, "unexpected `\u2014H`", "a move", "is a dash, not a hyphen"),
    ("unclosed hydrogen",
     'step "a"\n    :O1 -> H(C3\nend\n',
     3, 1, "unexpected `end`", "`)`", "H(C3)"),
    ("keyword with its string missing",
     'step "a"\n    :O1 -> C2\n    expect\nend\n',
     4, 1, "unexpected `end`", "a quoted string", "a quoted string is missing"),
    ("uses without a name",
     'step "a"\n    uses "[OH2:5]"\nend\n',
     2, 10, 'unexpected `"[OH2:5]"`', "a name", 'uses water = "[OH2:5]"'),
    ("species name starting with a digit",
     'species 2butanone = "CCC(C)=O"\n',
     1, 9, "unexpected `2butanone`", "a name", "starts with a letter"),
    ("single quotes",
     "species w = 'O'\n",
     1, 13, "unexpected `'O'`", 'a quoted string ("...")', "double quotes"),
    ("keyword with a capital",
     'Step "a"\n    :O1 -> C2\nend\n',
     1, 1, "unexpected `Step`", "a statement", "keywords are written in lower case: `step`"),
    ("end in capitals",
     'step "a"\n    :O1 -> C2\nEND\n',
     3, 1, "unexpected `END`", "a move", "keywords are written in lower case: `end`"),
    # A keyword out of place: the hint says where it goes (it used to say "not a keyword").
    ("step option before the step",
     'resonance step "a"\n    :O1 -> C2=O1\nend\n',
     1, 1, "unexpected `resonance`", "a statement", 'on the `step` line: step "LABEL" resonance'),
    ("conditions before the step",
     'over "heat"\nstep "a"\n    :O1 -> C2\nend\n',
     1, 1, "unexpected `over`", "a statement", 'step "LABEL" over "conditions"'),
    ("checkpoint after the last step",
     'step "a"\n    :O1 -> C2\nend\nexpect "CO"\n',
     4, 1, "unexpected `expect`", "a statement", '`product "SMILES"` checks the final state'),
    # Electrons written after their atom (as some write "O:"): the hint used to point at the README.
    ("lone pair after its atom",
     'step "a"\n    O3: -> C1\nend\n',
     2, 7, "unexpected `:`", "an arrow", "a lone pair is written before its atom: `:O3`"),
    ("unpaired electron after its atom",
     'step "a"\n    C1. ~> C1-C2\nend\n',
     2, 7, "unexpected `.`", "an arrow", "an unpaired electron is written before its atom: `.C1`"),
    # A pi bond's pair marked as a lone pair (as in ":C3=C4 -> H(O6)"): the hint said only that
    # `=` is a bond, not that the mark is the slip.
    ("bond written with a lone pair's mark",
     'step "a"\n    :C3=C4 -> H(O6)\nend\n',
     2, 8, "unexpected `=`", "an arrow", "`:C3` names a lone pair on C3; a bond's electrons are written without "
                                          "the mark: `C3=C4 -> ...`"),
    ("bond written with a radical's mark",
     'step "a"\n    .C1-C2 ~> C2\nend\n',
     2, 8, "unexpected `-`", "an arrow", "`.C1` names an unpaired electron on C1"),
    # Slips found writing mechanisms as an author would (the hints quoted one word, or pointed at
    # the README): a label or SMILES left unquoted is quoted whole, up to the next keyword.
    ("step label of two words unquoted",
     'step backside attack reversible\n    :O1 -> C2\nend\n',
     1, 6, "unexpected `backside`", "a quoted string", 'write "backside attack"'),
    ("product SMILES unquoted",
     'step "a"\n    :O1 -> C2\nend\nproduct CO.[Br-]\n',
     4, 9, "unexpected `CO`", "a quoted string", 'write "CO.[Br-]"'),
    ("comment written as in C",
     'step "a"\n    :O1 -> C2 // attack\nend\n',
     2, 15, "unexpected `//`", "a move", "a comment starts with `#`"),
    ("moves separated by a comma",
     'step "a"\n    :O1 -> C2,\nend\n',
     2, 14, "unexpected `,`", "a move", "leave out the `,`"),
    ("map number in parentheses",
     'step "a"\n    :O(1) -> C2\nend\n',
     2, 6, "unexpected `O`", "an atom", "write O1"),
    ("keyword misspelt",
     'specie water = "[OH2:1]"\n',
     1, 1, "unexpected `specie`", "a statement", "did you mean `species`?"),
    ("keyword with a letter too many",
     'step "a"\n    :O1 -> C2\nend\nproducts "CO"\n',
     4, 8, "unexpected `s`", "a quoted string", "`products` is not a keyword: write `product`"),
    ("atom in parentheses",
     'step "a"\n    :O1 -> (C2)\nend\n',
     2, 12, "unexpected `(`", "an atom", "an atom is written bare, `C2`"),
    ("lone pair marked twice",
     'step "a"\n    ::O1 -> C2\nend\n',
     2, 6, "unexpected `:`", "an atom", "one `:` marks a lone pair"),
    ("arrow with two hyphens",
     'step "a"\n    :O1 --> C2\nend\n',
     2, 9, "unexpected `-`", "an arrow", "an arrow has one hyphen"),
    ("step closed by a brace",
     'step "a" {\n    :O1 -> C2\n}\n',
     1, 10, "unexpected `{`", "the end of the line", "closed by `end`"),
    # An atom left after the sink is read as the start of another move, and the parser stops at `end`.
    ("atom after a move's sink",
     'step "a"\n    C1=C2 -> C2 C1\nend\n',
     3, 1, "unexpected `end`", "an arrow", "ends with `C1`, after its sink"),
    # The hint once wrote "'[OH2:1]'", the single quotes kept inside the double ones.
    ("SMILES in single quotes",
     "species w = '[OH2:1]'\n",
     1, 13, "unexpected `'[OH2:1]'`", "a quoted string", 'write "[OH2:1]"'),
    # A backslash escapes nothing: the string ends at the quote after it.
    ("double quote escaped inside a string",
     'title "The \\"best\\" route"\n',
     1, 14, "unexpected `best`", "a statement", "cannot hold a double quote"),
    # SMILES's aromatic bond `:` between two atoms (once told "a lone pair is written before its atom").
    ("aromatic bond written as in SMILES",
     'step "a"\n    C1:C2 -> C1-Br7\nend\n',
     2, 7, "unexpected `:`", "a bond", "`C1=C2` or `C1-C2`"),
]


@pytest.mark.parametrize("name, text, line, column, found, expected, hint", SLIPS, ids=[s[0] for s in SLIPS])
def test_syntax_slip(name, text, line, column, found, expected, hint):
    d = syntax_error(text)
    assert (d.loc.line, d.loc.column) == (line, column), d.to_text()
    assert d.message.startswith(found + ";"), d.to_text()
    assert expected in d.message.split("; expected ", 1)[1], d.to_text()
    assert hint in d.hint, d.to_text()
    assert d.to_text().startswith(f"slip.mech:{line}:{column}: error AR101 ")


@pytest.mark.parametrize("text, hint", [
    ('step "a"\n    O3-C2 -> O3-O3\nend\n', "the other end"),
    ('step "a"\n    H(C1)-H(C1) -> C1\nend\n', "the other end"),
    ('step "a"\n    H-H -> C1\nend\n', "C3-H"),
    ('step "a"\n    releases H(C1)\nend\n', "releases O9"),
])
def test_shape_slips_found_after_parsing(text, hint):
    d = syntax_error(text)
    assert d.loc.line == 2 and hint in d.hint


def test_every_syntax_error_has_a_specific_hint():
    """No slip above falls back to the generic pointer to the README."""
    for name, text, *_ in SLIPS:
        assert "README" not in syntax_error(text).hint, name


# --- the built parser kept between runs -----------------------------------------------------------

PARSE_IN_A_FRESH_PROCESS = (
    "from arrows import parse\n"
    "m = parse('species w = \"[OH2:1]\"\\nstep \"s\"\\n    :O1 -> H(O1)\\nend\\n')\n"
    "print(len(m.steps), m.steps[0].moves[0].loc.line)\n"
)


def parse_with_cache_home(cache_home) -> str:
    env = {"XDG_CACHE_HOME": str(cache_home), "PATH": "/usr/bin:/bin", "HOME": str(cache_home)}
    proc = subprocess.run([sys.executable, "-c", PARSE_IN_A_FRESH_PROCESS], capture_output=True, text=True,
                          env=env, timeout=120)
    assert proc.returncode == 0, proc.stderr
    assert "Traceback" not in proc.stderr
    return proc.stdout.strip()


def test_parser_cache_is_written_and_reused(tmp_path):
    assert parse_with_cache_home(tmp_path) == "1 3"
    (cache,) = (tmp_path / "arrows").glob("grammar-*.lark-cache")
    assert cache.stat().st_size > 0
    assert parse_with_cache_home(tmp_path) == "1 3"


def test_a_damaged_parser_cache_is_rebuilt(tmp_path):
    parse_with_cache_home(tmp_path)
    (cache,) = (tmp_path / "arrows").glob("grammar-*.lark-cache")
    cache.write_bytes(b"not a parser")
    assert parse_with_cache_home(tmp_path) == "1 3"
    assert cache.read_bytes() != b"not a parser"


def test_no_writable_cache_folder_still_parses(tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("a file where the cache folder would go")
    assert parse_with_cache_home(blocker) == "1 3"


# --- long files are parsed in pieces -------------------------------------------------------------

_CUT_HAZARDS = '''species water = "[OH2:1]"   # a comment that says end
species hydroxide = "[OH-:2]"
step "an end to it" over "end" :O2 -> H(O1)
    O1-H -> O1
end
# end of the first step; the next one starts on the same line as its comment
step "back" :O1 -> H(O2) O2-H -> O2 end step "again" :O2 -> H(O1)
  O1-H -> O1 end
product "[OH2:1].[OH-:2]"
'''


@pytest.mark.parametrize("piece_steps", [1, 2, 64])
def test_a_file_parsed_in_pieces_equals_the_file_parsed_whole(monkeypatch, piece_steps):
    """The pieces are cut after an `end`; the model, locations included, must be the one the whole
    file gives (the whole-file parse is the reference: it is the grammar applied as written)."""
    from pathlib import Path

    from arrows import language
    monkeypatch.setattr(language, "_PIECE_STEPS", piece_steps)
    gallery = sorted((Path(__file__).resolve().parent.parent / "gallery").glob("*.mech"))
    texts = [_CUT_HAZARDS] + [p.read_text(encoding="utf-8") for p in gallery]
    for text in texts:
        assert parse(text, "f.mech") == language._assemble(language._whole(text, "f.mech"), "f.mech")
    assert len(parse(_CUT_HAZARDS).steps) == 3


def test_a_slip_in_a_piece_is_reported_as_in_the_whole_file(monkeypatch):
    from arrows import language
    monkeypatch.setattr(language, "_PIECE_STEPS", 1)
    text = _CUT_HAZARDS.replace("O2-H -> O2 end", "O2-H -> O2", 1)   # the second step is left open
    with pytest.raises(MechanismError) as piecewise:
        parse(text, "f.mech")
    monkeypatch.setattr(language, "_PIECE_STEPS", 10_000)
    with pytest.raises(MechanismError) as whole:
        parse(text, "f.mech")
    assert piecewise.value.diagnostics == whole.value.diagnostics
    assert piecewise.value.diagnostics[0].loc.line == 7


def test_lark_loads_on_re_and_leaves_regex_importable():
    # lark imports the optional `regex` module when installed (~15 ms of start-up); arrows hides it
    # while lark loads. A user's own `import regex` afterwards must still work.
    pytest.importorskip("regex")
    probe = ("import arrows.language, lark.utils, sys; assert 'regex' not in sys.modules; "
             "assert lark.utils._has_regex is False; import regex; print('ok')")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "ok"


@pytest.mark.parametrize("ending", ["\r\n", "\r"], ids=["CR LF", "CR alone"])
def test_line_ends_of_other_systems_read_as_line_ends(ending):
    """A file saved with Windows (CR LF) or old Mac (CR alone) line ends parses as with LF, and a
    fault is located on the line and column the author's editor shows (with CR alone, a comment
    on the first line once swallowed the whole file, and every location said line 1)."""
    clean = parse(EXAMPLE.replace("\n", ending), "example.mech")
    assert [s.name for s in clean.species] == ["dione", "base"]
    assert len(clean.steps) == len(parse(EXAMPLE, "example.mech").steps)
    broken = EXAMPLE.replace("C3-H -> C2=C3 ", "C3-H -> C2=C3 =").replace("\n", ending)
    with pytest.raises(MechanismError) as caught:
        parse(broken, "example.mech")
    loc = caught.value.diagnostics[0].loc
    expected_line = EXAMPLE.splitlines().index(next(l for l in EXAMPLE.splitlines() if "C3-H -> C2=C3" in l)) + 1
    assert loc.line == expected_line


def test_a_misspelt_step_keyword_is_named():
    """`reversable` on a step's line (a newcomer's typo): the hint names the keyword meant and
    where such words go, instead of listing only what goes inside a step."""
    text = 'species a = "[CH3:1][OH:2]"\nstep "x" reversable\n    :O2 -> C1\nend\n'
    with pytest.raises(MechanismError) as info:
        parse(text, "typo.mech")
    d = info.value.diagnostics[0]
    assert d.code == "AR101" and "did you mean `reversible`?" in d.hint


def test_a_keyword_with_two_letters_swapped_is_named():
    """`ned` for `end` (difflib rates it no closer to `end` than 0.67): the same letters in
    another order are named too."""
    text = 'species a = "[CH3:1][OH:2]"\nstep "x"\n    :O2 -> C1\nned\n'
    with pytest.raises(MechanismError) as info:
        parse(text, "typo.mech")
    d = info.value.diagnostics[0]
    assert (d.code, d.loc.line) == ("AR101", 4) and "`ned` is not a keyword (did you mean `end`?)" in d.hint


def test_after_a_step_label_the_options_are_what_is_expected():
    """On the step's own line, after its label, only the options fit (the moves go on the lines
    below): the message listed moves, `uses`, `releases`, `expect` and `end`."""
    text = 'species a = "[CH3:1][OH:2]"\nstep "x" reversable\n    :O2 -> C1\nend\n'
    with pytest.raises(MechanismError) as info:
        parse(text, "typo.mech")
    d = info.value.diagnostics[0]
    assert d.message == ("unexpected `reversable`; expected `reversible`, `resonance`, `over`, `under` "
                         "or the end of the line")
