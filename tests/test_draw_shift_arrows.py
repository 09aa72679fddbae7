"""The arrows of a concerted 1,2-shift onto an atom, checked on the Scene (the data the SVG is
written from): each arrow of the step reads apart from the others.

Source: curved-arrow notation as drawn in organic chemistry texts (common practice). In the
Hofmann, Curtius, Lossen, Schmidt and Beckmann rearrangements and the Wolff rearrangement, one
step moves three pairs round one atom: the migrating group's bond to that atom, the atom's lone
pair into its bond to the pivot, and the leaving group's bond out to the leaving group. Texts
draw each arrow on its own side of the atom: the migrating bond's arc round the outside to the
atom, the lone pair's from dots on the other side of the bond it goes into, the leaving group's
out to it. Two heads closer than half a bond length, or a shaft over another arrow's head, read
as one arrow (the half bond length is this project's measure, not a published one).
"""
from __future__ import annotations

import math

import pytest

import arrows
from arrows.draw import STYLES, build_scene
from textbook_mechanisms import TEXTBOOK

# The textbook corpus's 1,2-shifts onto a nitrogen (and the Wolff's onto a carbanion), with the
# panel of the shift (0-based). Before the planner set these arrows apart their heads stood
# 0.21-0.34 bond lengths apart (Schmidt, Curtius, Hofmann, Wolff, Lossen; Beckmann 0.48), and
# the Hofmann's and the Wolff's migrating arrows ended on the lone pair's shaft (0.04 and 0.02
# bond lengths off it).
SHIFTS = {"hofmann rearrangement": 1, "curtius": 0, "schmidt": 4, "wolff rearrangement": 0,
          "lossen": 0, "beckmann": 1}
HEAD_ROOM = 0.5    # bond lengths: the least distance between two heads of one step
SHAFT_CLEAR = 0.15  # bond lengths: the least distance from a head to another arrow's shaft


def _shift_panel(name: str, style: str):
    trace, diags = arrows.check_text(TEXTBOOK[name][0], name)
    assert trace is not None and trace.initial is not None, [d.to_text() for d in diags]
    scene = build_scene(trace, STYLES[style], diags)
    return scene, scene.panels[SHIFTS[name]]


def _is_shift(arrow) -> bool:
    """A pair leaving one bond for a new bond of one of its atoms to an atom beyond (the group
    that moves keeps its electrons)."""
    return (arrow.source_kind == "bond" and len(arrow.sink_atoms) == 2
            and len(set(arrow.source_atoms) & set(arrow.sink_atoms)) == 1)


@pytest.mark.parametrize("style", ["two-column", "slide"])
@pytest.mark.parametrize("name", sorted(SHIFTS))
def test_heads_of_a_shift_step_stand_apart(name, style):
    scene, panel = _shift_panel(name, style)
    assert any(_is_shift(a) for a in panel.arrows), [a.move for a in panel.arrows]
    bl = scene.bond_length
    for i, first in enumerate(panel.arrows):
        for second in panel.arrows[i + 1:]:
            apart = math.dist(first.tip, second.tip) / bl
            assert apart >= HEAD_ROOM, (first.move, second.move, round(apart, 2))


@pytest.mark.parametrize("style", ["two-column", "slide"])
@pytest.mark.parametrize("name", sorted(SHIFTS))
def test_no_shaft_runs_over_another_arrows_head(name, style):
    scene, panel = _shift_panel(name, style)
    bl = scene.bond_length
    for head_arrow in panel.arrows:
        head = [head_arrow.tip, *head_arrow.head]
        for other in panel.arrows:
            if other is head_arrow:
                continue
            near = min(math.dist(p, q) for p in head for q in other.shaft_points(40)) / bl
            assert near >= SHAFT_CLEAR, (head_arrow.move, other.move, round(near, 2))
