"""The Python API: load/parse -> Mechanism with .check(), .states, .draw(), .to_text(); building a
Mechanism in code; Jupyter displays.

Judges: the parser itself for round trips (printed text must parse to an equal Mechanism), RDKit
canonical SMILES for "same structure", xml.etree for "the SVG/HTML is well-formed", and nbclient
running a real kernel for the notebook display. Textbook outcome (references.md, "Worked outcomes",
memory): octane-2,7-dione with base and heat gives 1-(2-methylcyclopent-1-en-1-yl)ethan-1-one.
Proton transfer from carbon (common practice): the arrow starts at the base's lone pair, never at
the proton, so a broken twin with `H(C3) -> O11` must report AR204.
"""
from __future__ import annotations

import dataclasses
import json
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from rdkit import Chem

import arrows
from arrows import api, build
from arrows.writer import UnprintableMechanism

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))

# A gallery mechanism (demo scenario of our own) that the tests below build in code and break.
SOURCE = ROOT / "gallery" / "05-octanedione-cyclopentene.mech"
TEXT = SOURCE.read_text(encoding="utf-8")
BROKEN = TEXT.replace(":O11 -> H(C3)", "H(C3) -> O11", 1)   # an arrow from a proton: AR204


def _built_in_code() -> arrows.Mechanism:
    species, step = build.species, build.step
    enolate = (":O11 -> H(C3)", "C3-H -> C2=C3", "C2=O9 -> O9")
    return build.mechanism(
        title="Ring closure of octane-2,7-dione to an acetylcyclopentene",
        caption="The internal enolate at C3 closes a five-membered ring onto C7. A second deprotonation at C3 "
                "and loss of hydroxide (E1cB) put the new C=C bond inside the ring, conjugated with the ketone.",
        species=[species("dione", "[CH3:1][C:2](=[O:9])[CH2:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]"),
                 species("base", "[OH-:11]")],
        steps=[step("enolate formation", *enolate, kind="reversible", over="NaOH", under="H2O, heat"),
               step("ring closure", ":O9 -> C2=O9", "C2=C3 -> C3-C7", "C7=O10 -> O10", kind="reversible"),
               step("proton transfer", ":O10 -> H(O11)", "O11-H -> O11", kind="reversible",
                    expect=["CC(=O)C1CCCC1(C)O"]),
               step("enolate of the aldol", *enolate, kind="reversible"),
               step("loss of hydroxide (E1cB)", ":O9 -> C2=O9", "C2=C3 -> C3=C7", "C7-O10 -> O10",
                    releases=["O10"])],
        product="CC(=O)C1=C(C)CCC1")


# --- round trips -------------------------------------------------------------------------------

@pytest.mark.parametrize("path", GALLERY, ids=[p.name for p in GALLERY])
def test_printed_text_parses_to_an_equal_mechanism(path):
    mechanism = arrows.load(path)
    text = mechanism.to_text()
    again = arrows.parse(text, mechanism.source_name)
    assert again == mechanism
    assert again.to_text() == text   # printing is stable


def test_gallery_is_there():
    assert len(GALLERY) >= 10


def test_mechanism_built_in_code_equals_the_parsed_one():
    assert _built_in_code() == arrows.parse(TEXT)
    assert _built_in_code() == dataclasses.replace(arrows.load(SOURCE), source_name="<text>")


def test_moves_as_objects_equal_moves_as_text():
    from arrows.model import AtomRef, BondPair, BondRef, BondSink, HydrogenOn, Move
    c2, c3 = AtomRef("C", 2), AtomRef("C", 3)
    as_objects = Move(BondPair(BondRef(c3, HydrogenOn(c3), 1)), BondSink(BondRef(c2, c3, 2)), 2)
    assert build.move("C3-H -> C2=C3") == as_objects
    assert build.step("x", as_objects) == build.step("x", "C3-H -> C2=C3")


def test_species_from_an_rdkit_mol_gives_the_same_states():
    """A species given as an RDKit Mol replays to the same structures as its SMILES text
    (RDKit canonical SMILES as the judge)."""
    text_built = _built_in_code()
    dione = Chem.MolFromSmiles("[CH3:1][C:2](=[O:9])[CH2:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]")
    mol_built = dataclasses.replace(
        text_built, species=(build.species("dione", dione),) + text_built.species[1:])
    assert mol_built.check().errors == []
    assert [Chem.MolToSmiles(m) for m in mol_built.states] == [Chem.MolToSmiles(m) for m in text_built.states]


def test_bad_move_text_is_a_located_error():
    with pytest.raises(arrows.MechanismError) as caught:
        build.move("C3-H -> -> C2")
    (diag,) = caught.value.diagnostics
    assert (diag.code, diag.loc.line, diag.loc.column) == ("AR101", 1, 9)
    assert diag.hint


@pytest.mark.parametrize("label", ['say "hi"', "two\nlines", "old Mac\rline end"])
def test_text_the_language_cannot_hold_is_refused(label):
    """A quote or a line end (LF, or CR, which the parser reads as one) inside a string."""
    mechanism = build.mechanism(species=[build.species("a", "C")], steps=[build.step(label)])
    with pytest.raises(UnprintableMechanism):
        mechanism.to_text()


# --- check, states, caching --------------------------------------------------------------------

def test_check_states_and_the_textbook_product():
    mechanism = arrows.load(SOURCE)
    assert mechanism.check().errors == []
    states = mechanism.states
    assert len(states) == len(mechanism.steps) + 1
    # references.md worked outcome (memory): 1-(2-methylcyclopent-1-en-1-yl)ethan-1-one
    expected = Chem.CanonSmiles("CC(=O)C1=C(C)CCC1")
    last = Chem.Mol(states[-1])
    for atom in last.GetAtoms():
        atom.SetAtomMapNum(0)
    assert expected in Chem.CanonSmiles(Chem.MolToSmiles(Chem.RemoveHs(last))).split(".")


def test_replay_runs_once_per_mechanism(monkeypatch):
    calls = []
    real = api.replay
    monkeypatch.setattr(api, "replay", lambda m: calls.append(m) or real(m))
    mechanism = arrows.parse(TEXT)
    mechanism.check()
    mechanism.states
    mechanism.check()
    assert len(calls) == 1
    arrows.parse(TEXT).check()   # an equal but separate object replays on its own
    assert len(calls) == 2


def test_a_checked_mechanism_is_freed_with_its_replay():
    """The replay remembered for a Mechanism goes when the Mechanism goes. It was kept in a dict
    keyed by the object and dropped by a finalizer that never ran, as the trace holds the mechanism:
    a data-set script checking thousands of mechanisms grew by about 70 KB a file."""
    import gc
    import weakref
    alive = []
    for _ in range(20):
        mechanism = arrows.parse(TEXT)
        mechanism.check()
        mechanism.states
        alive.append(weakref.ref(mechanism))
    del mechanism
    gc.collect()
    assert [r for r in alive if r() is not None] == []


def test_a_broken_mechanism_reports_instead_of_raising():
    mechanism = arrows.parse(BROKEN)
    codes = [d.code for d in mechanism.check().errors]
    assert codes == ["AR204"]
    assert len(mechanism.states) == 1   # only the starting state could be derived


def test_checking_imports_no_drawing_code():
    script = ("import sys, arrows; m = arrows.parse(open(sys.argv[1]).read()); m.check(); m.states; m.to_text();"
              "bad = [n for n in ('arrows.draw', 'cairosvg') if n in sys.modules]; print(bad); sys.exit(bool(bad))")
    done = subprocess.run([sys.executable, "-c", script, str(SOURCE)], capture_output=True, text=True)
    assert done.returncode == 0, done.stdout + done.stderr


# --- Jupyter displays --------------------------------------------------------------------------

def test_diagnostics_show_as_an_html_table():
    mechanism = arrows.parse(BROKEN)
    table = ET.fromstring(mechanism.check()._repr_html_())
    rows = table.findall("./tbody/tr")
    assert len(rows) == len(mechanism.check())
    assert [td.text for td in rows[0].findall("td")][2] == "AR204"


def test_an_empty_diagnostic_list_says_so():
    assert "no findings" in arrows.Diagnostics()._repr_html_()


def test_repr_svg_is_well_formed_svg():
    svg = arrows.parse(TEXT)._repr_svg_()
    root = ET.fromstring(svg)
    assert root.tag.endswith("svg")


def test_draw_gives_figure_bytes():
    mechanism = arrows.parse(TEXT)
    assert mechanism.draw("png").startswith(b"\x89PNG")
    assert mechanism.draw("pdf").startswith(b"%PDF")


def test_a_broken_mechanism_draws_only_when_forced_and_shows_in_jupyter():
    from arrows.draw import DrawError
    mechanism = arrows.parse(BROKEN)
    with pytest.raises(DrawError):
        mechanism.draw("svg")
    ET.fromstring(mechanism.draw("svg", force=True))
    ET.fromstring(mechanism._repr_svg_())


def _run_notebook(tmp_path: Path, code: str):
    nbformat = pytest.importorskip("nbformat")
    nbclient = pytest.importorskip("nbclient")
    notebook = nbformat.v4.new_notebook()
    notebook.cells.append(nbformat.v4.new_code_cell(code))
    client = nbclient.NotebookClient(notebook, timeout=120, kernel_name="python3",
                                     resources={"metadata": {"path": str(tmp_path)}})
    client.execute()
    return notebook.cells[0].outputs


def test_notebook_shows_the_diagnostic_table(tmp_path):
    source = tmp_path / "broken.mech"
    source.write_text(BROKEN, encoding="utf-8")
    outputs = _run_notebook(tmp_path, "import arrows\narrows.load('broken.mech').check()")
    html = [o["data"]["text/html"] for o in outputs if "text/html" in o.get("data", {})]
    assert html and "AR204" in html[0]


def test_notebook_load_check_draw_cell_shows_svg(tmp_path):
    (tmp_path / "ring.mech").write_text(TEXT, encoding="utf-8")
    outputs = _run_notebook(tmp_path, "import arrows\nm = arrows.load('ring.mech')\nassert not m.check().errors\nm")
    svgs = [o["data"]["image/svg+xml"] for o in outputs if "image/svg+xml" in o.get("data", {})]
    assert svgs
    ET.fromstring(svgs[0])


def test_the_documented_examples_run(monkeypatch, capsys):
    """Every python block of the API documentation runs as written, in order, from the repository root."""
    import re
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    blocks = re.findall(r"```python\n(.*?)```", text, flags=re.S)
    assert len(blocks) >= 2
    monkeypatch.chdir(ROOT)
    session: dict = {}   # one session, as a reader runs the blocks one after another
    for block in blocks:
        exec(compile(block, "README.md", "exec"), session)
    assert "deprotonation" in capsys.readouterr().out


# --- printing any Mechanism the model can hold -------------------------------------------------

def _mechanisms():
    """Random Mechanisms built from model objects (any text the language can quote; a bond joins
    two different atoms, as the language demands)."""
    from hypothesis import strategies as st
    from arrows.model import (AtomRef, AtomSink, BareAtom, BondPair, BondRef, BondSink, Checkpoint, HydrogenOn,
                              LonePair, Mechanism, Move, NonbondingSink, Species, Step, UnpairedElectron)
    # Printable: no control characters (C0 but tab, DEL, C1) or noncharacters, which the language
    # refuses in quoted text (language.UNWRITABLE_CHARACTERS).
    text = st.text(st.characters(blacklist_characters='"\n\r\ufffe\uffff', blacklist_categories=("Cs", "Cc"))
                   | st.just("\t"), max_size=12)
    name = st.from_regex(r"[A-Za-z_][A-Za-z0-9_]{0,6}", fullmatch=True)
    mapped = st.builds(AtomRef, st.sampled_from(["C", "O", "N", "Br", "Si", "H"]), st.integers(1, 999))
    atom = st.one_of(mapped, st.builds(HydrogenOn, mapped))
    bond = st.builds(BondRef, atom, atom, st.sampled_from([1, 2, 3])).filter(lambda b: b.first != b.second)
    source = st.one_of(st.builds(LonePair, atom), st.builds(UnpairedElectron, atom), st.builds(BondPair, bond),
                       st.builds(BareAtom, atom))
    sink = st.one_of(st.builds(AtomSink, atom), st.builds(BondSink, bond), st.builds(NonbondingSink, atom))
    move = st.builds(Move, source, sink, st.sampled_from([1, 2]))
    species = st.builds(Species, name, text)
    checkpoint = st.builds(Checkpoint, text, st.booleans())
    step = st.builds(Step, text, st.sampled_from(["forward", "reversible", "resonance"]), st.none() | text,
                     st.none() | text, st.tuples(species) | st.just(()), st.lists(move, max_size=4).map(tuple),
                     st.lists(mapped, max_size=2).map(tuple), st.lists(checkpoint, max_size=2).map(tuple))
    return st.builds(Mechanism, st.none() | text, st.none() | text, st.lists(species, max_size=3).map(tuple),
                     st.lists(step, max_size=3).map(tuple), st.none() | checkpoint)


def test_any_printable_mechanism_round_trips():
    from hypothesis import given, settings

    @settings(max_examples=200, deadline=None)
    @given(_mechanisms())
    def round_trip(mechanism):
        assert arrows.parse(mechanism.to_text()) == mechanism

    round_trip()


def test_check_text_returns_diagnostics_of_one_type():
    """A text that does not parse gave a plain list, a checked one a Diagnostics: `.errors` failed
    on the first."""
    _, diags = arrows.check_text("species a = \n")
    assert isinstance(diags, api.Diagnostics) and len(diags.errors) == 1


def test_the_library_keeps_off_stderr(capfd):
    """A checkpoint RDKit cannot read is said in the diagnostics; RDKit's own log line ("Explicit
    valence ...") reached stderr from the library, and so did a product SMILES it could not parse
    when drawing."""
    import logging
    import sys as _sys
    from rdkit import rdBase

    text = ('species w = "[OH2:1]"\nspecies b = "[OH-:2]"\nstep "pt"\n    :O2 -> H(O1)\n    O1-H -> O1\n'
            '    expect "C(C)(C)(C)(C)C"\nend\nproduct "C1CC"\n')
    # As in a user's program: RDKit's log goes to stderr (the command line's silencing not in force).
    rdBase.LogToPythonLogger()
    logger = logging.getLogger("rdkit")
    saved = logger.handlers, logger.propagate
    logger.handlers, logger.propagate = [logging.StreamHandler(_sys.stderr)], False
    try:
        _, diags = arrows.check_text(text)
        arrows.parse(text).draw("svg", force=True)
    finally:
        logger.handlers, logger.propagate = saved
    captured = capfd.readouterr()
    assert captured.out == "" and captured.err == "", captured.err
    assert [d.code for d in diags if d.severity == "error"] == ["AR102", "AR102"]


def test_an_unknown_style_is_a_value_error():
    with pytest.raises(ValueError, match="unknown style 'poster'"):
        arrows.parse('species w = "[OH2:1]"\n').draw("svg", style="poster")


@pytest.mark.parametrize("make, says", [
    (lambda: build.mechanism(species=["[OH2:1]"]), "each is a Species"),
    (lambda: build.mechanism(steps=["x"]), "each is a Step"),
    (lambda: build.species("a", None), "a SMILES string or an RDKit Mol, not NoneType"),
    (lambda: build.mechanism(product=5), "not int"),
    (lambda: build.step("s", uses=["[OH2:1]"]), "each is a Species"),
], ids=["species as text", "steps as text", "species None", "product int", "uses as text"])
def test_the_builder_refuses_wrong_types_when_called(make, says):
    """A SMILES string where a Species belongs was accepted and failed later inside check() with
    an AttributeError; None reached RDKit as a Boost.Python error naming RemoveHs. Each is a
    TypeError at the call, saying what belongs there."""
    with pytest.raises(TypeError, match=says):
        make()


def test_the_builder_takes_an_rdkit_mol_as_product():
    """Species took RDKit Mols but a product Mol was a TypeError; both are written as SMILES."""
    from rdkit import Chem
    mechanism = build.mechanism(species=[build.species("w", "[OH2:1]")], product=Chem.MolFromSmiles("O"))
    assert mechanism.product.smiles == Chem.MolToSmiles(Chem.MolFromSmiles("O"))


# --- the command line's options as keywords -----------------------------------------------------

def test_draw_takes_the_options_of_arrows_draw_and_gives_its_bytes(tmp_path):
    """Mechanism.draw took fmt, style and force only; its keywords now give what `arrows draw` with
    the same options writes (one style-building path for both)."""
    out = tmp_path / "cli.svg"
    done = subprocess.run([sys.executable, "-m", "arrows", "draw", str(SOURCE), "-o", str(out), "--style", "one-column",
                           "--color", "--numbers", "--cip", "--step-labels", "--no-title", "--font-size", "9",
                           "--line-width", "1"], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    mechanism = arrows.load(SOURCE)
    svg = mechanism.draw("svg", style="one-column", color=True, numbers=True, cip=True, step_labels=True,
                         title=False, font_size=9, line_width=1)
    assert svg == out.read_bytes() and svg != mechanism.draw("svg", style="one-column")


def test_draw_png_resolution_and_bad_values_are_errors():
    from PIL import Image
    import io
    mechanism = arrows.load(SOURCE)
    at_300, at_150 = (Image.open(io.BytesIO(mechanism.draw("png", dpi=dpi))) for dpi in (300, 150))
    assert abs(at_300.width - 2 * at_150.width) <= 2
    for bad in ({"dpi": 5000}, {"font_size": 1}, {"line_width": float("nan")}, {"style": "double"}):
        with pytest.raises(ValueError):
            mechanism.draw("png", **bad)


def test_check_takes_the_pka_gap_and_diagnostics_have_warnings():
    """`check --pka-gap 0` flags every uphill proton transfer (AR508): so does check(pka_gap=0),
    the same codes as the command line gives; the default is still remembered per object."""
    mechanism = arrows.load(SOURCE)
    plain, zero = mechanism.check(), mechanism.check(pka_gap=0)
    done = subprocess.run([sys.executable, "-m", "arrows", "check", "--pka-gap", "0", "--format", "json", str(SOURCE)],
                          capture_output=True, text=True)
    assert sorted(d.code for d in zero) == sorted(d["code"] for d in json.loads(done.stdout))
    assert [d.code for d in zero.warnings].count("AR508") > [d.code for d in plain.warnings].count("AR508")
    assert zero.warnings == [d for d in zero if d.severity == "warning"]
    assert zero.passed() and not zero.passed(strict=True) and mechanism.check() is plain
    with pytest.raises(ValueError):
        mechanism.check(pka_gap=-1)
