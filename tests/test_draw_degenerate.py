"""Inputs the layout cannot lay out sensibly still give a clear outcome, never a renderer crash
(the project's rule: bad input gets a message and a non-zero exit, never a traceback). Both cases
were found by a fuzz run of the command line."""
from __future__ import annotations

import pytest

import arrows
from arrows.draw import STYLES, DrawError, build_scene

# Two carbons joined by 45 ring closures: RDKit's coordgen depictor puts every atom on one point,
# and the bond-length test divided by their mean length, zero.
LADDER = 'species a = "{}"\n'.format("".join(f"C%{n}" for n in range(10, 55)) + "C"
                                      + "".join(f"C%{n}" for n in range(10, 55)) + "C")


def test_a_file_with_no_species_is_refused_by_the_drawing_with_a_reason():
    trace, diags = arrows.check_text("# nothing but a comment\n", "empty.mech")
    with pytest.raises(DrawError, match="no starting state"):
        build_scene(trace, STYLES["two-column"], diags)


def test_a_species_the_depictor_collapses_is_drawn_with_a_note_not_a_crash():
    trace, diags = arrows.check_text(LADDER, "ladder.mech")
    assert trace is not None and not [d for d in diags if d.severity == "error"], [d.to_text() for d in diags]
    scene = build_scene(trace, STYLES["two-column"], diags)
    assert any("check the figure" in note for note in scene.notes)
