"""Comments survive .mech -> JSON -> .mech: each `#` comment is attached to what it annotates
(model.Comment: a JSON pointer into the mechanism object and a place), carried in the JSON form
(arrows/mechanism.schema.json, `comments`) and printed back by the writer in the same place.
Judges: the text itself (every comment written is found again, word for word) and jsonschema
(Draft 2020-12) for the published schema. No chemistry is judged here."""
from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest

from arrows import MechanismError, mechanism_json, parse
from arrows.model import Comment
from arrows.writer import UnprintableMechanism, to_text
from textbook_mechanisms import TEXTBOOK

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))

# Every place a comment can stand. `uses` is written after the moves: the writer prints it first,
# and its comment goes with it.
COMMENTED = '''\
# Reference: a note on where this comes from
# conditions: NaOH, water

title "Proton transfer"   # the title's note
species water = "[OH2:1]"
# the base
species hydroxide = "[OH-:2]"  # from NaOH

# first step
step "transfer" reversible   # fast
    # the lone pair moves first
    :O2 -> H(O1)   # hydroxide takes a proton
    O1-H -> O1
    uses sodium = "[Na+:3]"   # a spectator
    releases Na3   # it leaves
    expect "[OH-:1]"   # hydroxide again
    # nothing more in this step
end   # of the transfer

product "[OH2:2].[OH-:1]"   # the same pair
# a closing remark
'''

ATTACHED = [
    ("", "above", "Reference: a note on where this comes from"),
    ("", "above", "conditions: NaOH, water"),
    ("/title", "inline", "the title's note"),
    ("/species/hydroxide", "above", "the base"),
    ("/species/hydroxide", "inline", "from NaOH"),
    ("/steps/0", "above", "first step"),
    ("/steps/0", "inline", "fast"),
    ("/steps/0/uses/sodium", "inline", "a spectator"),
    ("/steps/0/moves/0", "above", "the lone pair moves first"),
    ("/steps/0/moves/0", "inline", "hydroxide takes a proton"),
    ("/steps/0/releases/0", "inline", "it leaves"),
    ("/steps/0/expect/0", "inline", "hydroxide again"),
    ("/steps/0", "below", "nothing more in this step"),
    ("/steps/0", "end", "of the transfer"),
    ("/product", "inline", "the same pair"),
    ("", "below", "a closing remark"),
]

PRINTED = '''\
# Reference: a note on where this comes from
# conditions: NaOH, water
title "Proton transfer"  # the title's note

species water = "[OH2:1]"
# the base
species hydroxide = "[OH-:2]"  # from NaOH

# first step
step "transfer" reversible  # fast
    uses sodium = "[Na+:3]"  # a spectator
    # the lone pair moves first
    :O2 -> H(O1)             # hydroxide takes a proton
    O1-H -> O1
    releases Na3             # it leaves
    expect "[OH-:1]"         # hydroxide again
    # nothing more in this step
end  # of the transfer

product "[OH2:2].[OH-:1]"  # the same pair

# a closing remark
'''


def _attached(mechanism) -> list[tuple[str, str, str]]:
    return [(c.at, c.place, c.text) for c in mechanism.comments]


def _comments_written(text: str) -> list[str]:
    """Every comment of a .mech text, read apart from the parser: a `#` after white space, outside
    the quoted strings (the grammar's COMMENT and STRING terminals)."""
    found = re.finditer(r'"[^"\n]*"|(?<![^\s])#[^\n]*', text)
    return [m.group()[1:].removeprefix(" ") for m in found if m.group().startswith("#")]


def test_each_comment_is_attached_to_what_it_annotates():
    assert _attached(parse(COMMENTED)) == ATTACHED
    lines = {c.text: c.loc.line for c in parse(COMMENTED, "c.mech").comments}
    assert lines["the base"] == 6 and lines["of the transfer"] == 18


def test_the_writer_prints_each_comment_in_its_place():
    printed = to_text(parse(COMMENTED))
    assert printed == PRINTED
    assert _attached(parse(printed)) == ATTACHED


def test_json_carries_the_comments_and_import_writes_them_back():
    mechanism = parse(COMMENTED)
    document = mechanism_json.document(mechanism)
    jsonschema.Draft202012Validator(mechanism_json.schema()).validate(document)
    assert [(c["at"], c["place"], c["text"]) for c in document["mechanism"]["comments"]] == ATTACHED
    back = mechanism_json.loads(mechanism_json.dumps(mechanism))
    assert _attached(back) == ATTACHED
    assert to_text(back) == PRINTED


def _corpus() -> dict[str, str]:
    texts = {path.name: path.read_text(encoding="utf-8") for path in GALLERY}
    texts.update({key: entry[0] for key, entry in TEXTBOOK.items()})
    return texts


@pytest.mark.parametrize("name, text", _corpus().items(), ids=list(_corpus()))
def test_gallery_and_textbook_round_trip_through_json_with_every_comment(name, text):
    """.mech -> JSON -> .mech -> JSON gives the same JSON, and every comment written in the file
    is in it, word for word."""
    first = mechanism_json.mechanism_dict(parse(text, name))
    printed = to_text(mechanism_json.loads(mechanism_json.dumps(parse(text, name)), name))
    second = mechanism_json.mechanism_dict(parse(printed, name))
    assert second == first
    assert [c["text"] for c in first.get("comments", [])] == _comments_written(text)
    assert sorted(_comments_written(printed)) == sorted(_comments_written(text))


def test_every_gallery_file_has_comments_to_carry():
    # Guard: the round trip above would prove little on files without comments.
    assert all(parse(path.read_text(encoding="utf-8")).comments for path in GALLERY)


@pytest.mark.parametrize("written, text", [
    ("#x", "x"),
    ("#   three spaces", "  three spaces"),
    ('# "quotes", a \\ backslash, a # hash, C1#N2, ü and a tab\tin it', '"quotes", a \\ backslash, a # hash, '
                                                                       'C1#N2, ü and a tab\tin it'),
    ("#", ""),
    ("# trailing blanks  ", "trailing blanks  "),
])
def test_a_comment_is_kept_verbatim_and_printed_so(written, text):
    mechanism = parse(f'species water = "[OH2:1]"  {written}\n')
    assert _attached(mechanism) == [("/species/water", "inline", text)]
    through_json = mechanism_json.loads(mechanism_json.dumps(mechanism))
    assert _attached(parse(to_text(through_json))) == [("/species/water", "inline", text)]


def test_only_real_comments_are_collected():
    # A `#` inside quotes, or between two atoms (a triple bond), is no comment.
    mechanism = parse('species cyanide = "[C-:1]#[N:2]"\nstep "label # inside"\n    C1#N2 -> N2  # the one\nend\n')
    assert _attached(mechanism) == [("/steps/0/moves/0", "inline", "the one")]


def test_comments_do_not_change_what_the_mechanism_says():
    # Guard: equality (and so every check) ignores comments.
    plain = "\n".join(line.split("  #")[0].split("   #")[0] for line in COMMENTED.splitlines()
                      if not line.lstrip().startswith("#"))
    assert not parse(plain).comments
    assert parse(plain) == parse(COMMENTED)


def test_a_file_without_comments_prints_as_before():
    # Guard: no comment, no change to the printed text.
    text = ('species water = "[OH2:1]"\nspecies hydroxide = "[OH-:2]"\n\n'
            'step "s"\n    :O2 -> H(O1)\n    O1-H -> O1\nend\n')
    assert to_text(parse(text)) == text
    assert "comments" not in mechanism_json.mechanism_dict(parse(text))


_CUT = '''\
# top
species water = "[OH2:1]"   # water
species hydroxide = "[OH-:2]"
step "one" :O2 -> H(O1)
    O1-H -> O1   # first
end   # end of one
# above two
step "two" :O1 -> H(O2) O2-H -> O2 end # end of two
step "three"
    :O2 -> H(O1)
    # below three
end
# the tail
'''


@pytest.mark.parametrize("piece_steps", [1, 2, 64])
def test_a_file_parsed_in_pieces_has_the_comments_of_the_file_parsed_whole(monkeypatch, piece_steps):
    from arrows import language
    monkeypatch.setattr(language, "_PIECE_STEPS", piece_steps)
    whole = language._assemble(language._whole(_CUT, "f.mech"), "f.mech")
    assert [(c.at, c.place, c.text, c.loc) for c in parse(_CUT, "f.mech").comments] == \
        [(c.at, c.place, c.text, c.loc) for c in whole.comments]
    assert ("/steps/0", "end", "end of one") in _attached(whole)
    assert ("/steps/1", "end", "end of two") in _attached(whole)
    assert ("", "below", "the tail") in _attached(whole)
    # Read with its steps on demand (a long file checked in constant memory), the same comments.
    monkeypatch.setattr(language, "_ON_DEMAND_FROM_PIECES", 0)
    assert _attached(parse(_CUT, "f.mech", steps_on_demand=True)) == _attached(whole)


@pytest.mark.parametrize("comment, says", [
    ({"at": "/steps/7", "text": "no such step"}, "points at no part of the mechanism"),
    ({"at": "/species/nobody", "text": "no such species"}, "points at no part of the mechanism"),
    ({"at": "/steps/0/moves/0", "place": "end", "text": "a move has no end"}, "not end"),
    ({"at": "", "place": "inline", "text": "the mechanism has no line"}, "not inline"),
    ({"at": "/steps/0", "text": "two\nlines"}, "does not match"),
    ({"at": "/steps/0/label", "text": "not a part a comment annotates"}, "does not match"),
])
def test_import_refuses_a_comment_it_could_not_write_back_with_its_place(comment, says):
    document = mechanism_json.document(parse('species water = "[OH2:1]"\nstep "s"\n    :O1 -> H(O1)\nend\n'))
    document["mechanism"]["comments"] = [comment]
    text = json.dumps(document, indent=2)
    with pytest.raises(MechanismError) as refused:
        mechanism_json.loads(text, "c.json")
    (diagnostic,) = refused.value.diagnostics
    assert diagnostic.code == "AR100" and says in diagnostic.message
    comments_line = next(i for i, line in enumerate(text.splitlines(), 1) if '"comments"' in line)
    assert comments_line < diagnostic.loc.line <= comments_line + 5   # at the comment (or its field)


def test_json_written_before_comments_were_carried_still_loads():
    # Guard: `comments` is optional; older documents have none.
    document = mechanism_json.document(parse(COMMENTED))
    del document["mechanism"]["comments"]
    assert mechanism_json.loads(json.dumps(document)).comments == ()


def test_the_writer_refuses_a_comment_it_cannot_print():
    mechanism = parse('species water = "[OH2:1]"\n')
    from dataclasses import replace
    with pytest.raises(UnprintableMechanism, match="line break"):
        to_text(replace(mechanism, comments=(Comment("two\nlines", "/species/water", "inline"),)))
    with pytest.raises(UnprintableMechanism, match="has not"):
        to_text(replace(mechanism, comments=(Comment("lost", "/steps/3", "above"),)))


def test_export_then_import_on_the_command_line_keeps_the_comments(tmp_path):
    source = ROOT / "gallery" / "03-acetaldehyde-aldol.mech"
    exported = tmp_path / "m.json"
    run = [sys.executable, "-c", "from arrows.cli import main; main()"]
    done = subprocess.run(run + ["export", str(source), "--to", "json", "-o", str(exported)],
                          capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    imported = subprocess.run(run + ["import", str(exported)], capture_output=True, text=True)
    assert imported.returncode == 0, imported.stderr
    assert imported.stdout.startswith("# Base-catalysed self-condensation of ethanal\ntitle ")
    assert _comments_written(imported.stdout) == _comments_written(source.read_text(encoding="utf-8"))


def test_a_file_written_out_of_order_round_trips_to_the_same_json():
    # The writer prints title, caption, species, steps, product in that order; a comment above the
    # statement it prints first stands at the top of the printed text, the mechanism's place.
    text = ('species water = "[OH2:1]"  # w\n# about the step\nstep "s"\n    :O1 -> H(O1)\nend\n'
            '# a late species\nspecies hydroxide = "[OH-:2]"\n')
    first = mechanism_json.mechanism_dict(parse(text))
    assert first["comments"] == [{"at": "/species/water", "place": "inline", "text": "w"},
                                 {"at": "/species/hydroxide", "place": "above", "text": "a late species"},
                                 {"at": "/steps/0", "place": "above", "text": "about the step"}]
    assert mechanism_json.mechanism_dict(parse(to_text(parse(text)))) == first
    with_title = text + "# the title, written late\ntitle \"T\"\n"
    first = mechanism_json.mechanism_dict(parse(with_title))
    assert first["comments"][0] == {"at": "", "place": "above", "text": "the title, written late"}
    assert mechanism_json.mechanism_dict(parse(to_text(parse(with_title)))) == first


# A statement, a step's head and each kind of part written over several lines, a comment ending
# each line. The writer prints each statement on one line unless comments end lines inside it.
SPREAD = '''\
title      # the title's keyword
    "T"    # its text
species water =  # a name
    "[OH2:1]"    # and its SMILES
step "s"  # the label
    reversible  # the kind
    over "x"    # the reagent
    uses sodium =  # a spectator
        "[Na+:2]"  # with its SMILES
    :O1 ->  # the source
        H(O1)  # the sink
    O1-H(O1)  # a bond written with both ends named
        -> O1
    releases  # the keyword
        Na2   # the atom
    expect all  # a checkpoint
        "O"     # its SMILES
end
product    # the product's keyword
    all    # the whole state
    "O"    # its SMILES
# after the product
'''

SPREAD_ATTACHED = [
    ("/title", "inline", "the title's keyword", 1), ("/title", "inline", "its text", None),
    ("/species/water", "inline", "a name", 3), ("/species/water", "inline", "and its SMILES", None),
    ("/steps/0", "inline", "the label", 2), ("/steps/0", "inline", "the kind", 3),
    ("/steps/0", "inline", "the reagent", None),
    ("/steps/0/uses/sodium", "inline", "a spectator", 3), ("/steps/0/uses/sodium", "inline", "with its SMILES", None),
    ("/steps/0/moves/0", "inline", "the source", 3), ("/steps/0/moves/0", "inline", "the sink", None),
    ("/steps/0/moves/1", "inline", "a bond written with both ends named", 3),
    ("/steps/0/releases/0", "inline", "the keyword", 1), ("/steps/0/releases/0", "inline", "the atom", None),
    ("/steps/0/expect/0", "inline", "a checkpoint", 2), ("/steps/0/expect/0", "inline", "its SMILES", None),
    ("/product", "inline", "the product's keyword", 1), ("/product", "inline", "the whole state", 2),
    ("/product", "inline", "its SMILES", None),
    ("", "below", "after the product", None),
]

SPREAD_PRINTED = '''\
title    # the title's keyword
    "T"  # its text

species water =  # a name
    "[OH2:1]"    # and its SMILES

step "s"            # the label
        reversible  # the kind
        over "x"    # the reagent
    uses sodium =  # a spectator
        "[Na+:2]"  # with its SMILES
    :O1 ->         # the source
        H(O1)      # the sink
    O1-H           # a bond written with both ends named
        -> O1
    releases       # the keyword
        Na2        # the atom
    expect all     # a checkpoint
        "O"        # its SMILES
end

product  # the product's keyword
    all  # the whole state
    "O"  # its SMILES

# after the product
'''


def _attached_lines(mechanism) -> list[tuple]:
    return [(c.at, c.place, c.text, c.break_after) for c in mechanism.comments]


def test_comments_ending_the_lines_of_one_statement_each_keep_their_line():
    # They ran into one on the way back ('# the source  # the sink' read as one comment).
    mechanism = parse(SPREAD)
    assert _attached_lines(mechanism) == SPREAD_ATTACHED
    document = mechanism_json.document(mechanism)
    jsonschema.Draft202012Validator(mechanism_json.schema()).validate(document)
    printed = to_text(mechanism_json.loads(mechanism_json.dumps(mechanism)))
    assert printed == SPREAD_PRINTED
    assert _attached_lines(parse(printed)) == SPREAD_ATTACHED
    assert mechanism_json.mechanism_dict(parse(printed)) == mechanism_json.mechanism_dict(mechanism)
    assert _comments_written(printed) == _comments_written(SPREAD)


def _every_space_a_line_end(text: str) -> str:
    """The text with every run of blanks between two tokens a line end under a comment of its own
    (`# cN`): each statement written one token a line."""
    count = iter(range(1, 10 ** 6))
    pieces = re.split(r'("[^"\n]*"|(?<![^\s])#[^\n]*)', text)
    return "".join(piece if piece.startswith(('"', "#")) else
                   re.sub(r"[ \t]+(?=\S)", lambda _: f"  # c{next(count)}\n    ", piece) for piece in pieces)


@pytest.mark.parametrize("path", GALLERY, ids=[path.name for path in GALLERY])
def test_a_gallery_file_written_one_token_a_line_round_trips_with_every_comment_on_its_line(path):
    text = _every_space_a_line_end(path.read_text(encoding="utf-8"))
    mechanism = parse(text, path.name)
    assert mechanism == parse(path.read_text(encoding="utf-8"), path.name)   # guard: the same mechanism
    printed = to_text(mechanism_json.loads(mechanism_json.dumps(mechanism), path.name))
    assert _comments_written(printed) == _comments_written(text)   # none lost or joined, in their order
    assert mechanism_json.mechanism_dict(parse(printed, path.name)) == mechanism_json.mechanism_dict(mechanism)


def test_comments_on_and_after_the_product_come_back():
    # Guard for the product line: its trailing comment and the lines after it.
    text = ('species water = "[OH2:1]"\nstep "s"\n    :O1 -> H(O1)\nend\n'
            'product "[OH2:1]"  # on the product\n# after it\n# and the last line\n')
    attached = [("/product", "inline", "on the product"), ("", "below", "after it"), ("", "below", "and the last line")]
    assert _attached(parse(text)) == attached
    assert _attached(parse(to_text(mechanism_json.loads(mechanism_json.dumps(parse(text)))))) == attached


@pytest.mark.parametrize("comments, says", [
    ([{"at": "/steps/0/moves/0", "place": "inline", "text": "one"},
      {"at": "/steps/0/moves/0", "place": "inline", "text": "two"}], "the same line as another"),
    ([{"at": "/steps/0/moves/0", "place": "inline", "text": "one", "break_after": 2},
      {"at": "/steps/0/moves/0", "place": "inline", "text": "two", "break_after": 2}], "the same line as another"),
    ([{"at": "/steps/0/moves/0", "place": "inline", "text": "past the last token", "break_after": 7}],
     "after token 7 of 4"),
    ([{"at": "/steps/0", "place": "end", "text": "one"}, {"at": "/steps/0", "place": "end", "text": "two"}],
     "the same line as another"),
    ([{"at": "/steps/0", "place": "below", "text": "a whole line", "break_after": 1}], "only a comment at the end"),
])
def test_import_refuses_comments_that_would_run_into_one_line(comments, says):
    document = mechanism_json.document(parse('species water = "[OH2:1]"\nstep "s"\n    :O1 -> H(O1)\nend\n'))
    document["mechanism"]["comments"] = comments
    text = json.dumps(document, indent=2)
    with pytest.raises(MechanismError) as refused:
        mechanism_json.loads(text, "c.json")
    (diagnostic,) = refused.value.diagnostics
    assert diagnostic.code == "AR100" and says in diagnostic.message
    comments_line = next(i for i, line in enumerate(text.splitlines(), 1) if '"comments"' in line)
    assert comments_line < diagnostic.loc.line
