"""Rows of a wrapped scheme: balanced, with no product panel alone on the last row (it reads as an
afterthought; common practice of scheme layout), without drawing the scheme much smaller.

The rule (scheme._chosen_rows): among the wrappings that fit the page (on a journal page, those
within 10% of the least tall), one with no row a lone panel if it is drawn within 10% of the
largest scale any wrapping allows, else one lone only at its head or end if within 5%; then the
most even, then the larger. A journal keeps its type size (every wrapping is drawn at the same
scale); a slide's scheme keeps the rows it is shrunk or enlarged for. Measured on the Scene:
panels per row from the panels' boxes, the scale as the bond length over the preset's.
"""
from __future__ import annotations

import pytest

from arrows.draw import STYLES
from arrows.draw.scene import Box
from scenes import panels_per_row as _panels_per_row, scene_of as _scene


def _scale(scene, style: str) -> float:
    return scene.bond_length / STYLES[style].bond_length


def test_the_acetal_slide_ends_with_more_than_one_panel_at_much_the_same_size():
    """The eight panels of the acetal formation on a slide wrapped as 4 + 3 + 1, the acetal alone
    on the last row, drawn at 86% of the slide size (the rows were chosen again at the shrunk
    size, where 4 + 3 + 1 stood shortest). The rows now end in more than one panel, at no less
    than 95% of that size."""
    scene = _scene("10-acetal-formation.mech", "slide")
    rows = _panels_per_row(scene)
    assert sum(rows) == 8 and rows[-1] > 1, rows
    assert _scale(scene, "slide") >= 0.95 * 0.863


@pytest.mark.parametrize("name, style, rows", [
    ("04-heptanedione-cyclohexenone.mech", "two-column", [5, 1]),   # 3 + 3 would stand 18% taller
    ("14-radical-bromination.mech", "one-column", [3, 1]),          # 2 + 2: 24% taller
    ("bromination", "one-column", [2, 1]),                          # not 1 + 2: no row gains by it
    ("dess-martin", "two-column", [3, 1]),                          # not 1 + 2 + 1
])
def test_a_journal_scheme_keeps_its_height_before_its_balance(name, style, rows):
    """On a journal page, whose type size is fixed and whose height is what the journal counts,
    the rows are balanced only among wrappings within 10% of the least tall: a product alone under
    a full row stays where balancing would stand a tenth taller, and a lone panel is not moved
    from the end to the head or into the middle, which gains nothing."""
    scene = _scene(name, style)
    assert _panels_per_row(scene) == rows
    assert _scale(scene, style) == pytest.approx(1.0)


@pytest.mark.parametrize("name, before", [("mitsunobu", 0.476), ("appel", 0.608), ("fmoc removal", 0.651)])
def test_a_shrunk_slide_scheme_keeps_the_rows_it_was_shrunk_for(name, before):
    """A slide's scheme too tall for the page was shrunk for the rows it had at the preset size,
    then wrapped again into fewer rows at the smaller size, leaving much of the slide empty
    (Mitsunobu: 48% of the preset size, its panels over 55% of the height within the margins).
    It is now shrunk for the rows it is drawn in: they reach across the width or down the height
    within the margins (at least 95% of one), and it is drawn larger than before."""
    style = STYLES["slide"]
    scene = _scene(name, "slide")
    drawn = Box.enclosing([p.box.shifted(*p.origin) for p in scene.panels] + [a.box for a in scene.reaction_arrows])
    across = drawn.width / (style.page_width - 2 * style.margin)
    down = drawn.height / (style.page_height - 2 * style.margin)
    assert max(across, down) >= 0.95, (across, down)
    assert _scale(scene, "slide") > before + 0.05


@pytest.mark.parametrize("name, rows, at_least", [
    ("henry", [2, 2], 0.85),         # one row of four stood at 0.83, more than half the slide empty
    ("boc removal", [3, 3], 0.95),   # three rows of two at the same size: one more break
])
def test_a_slide_takes_the_larger_size_then_the_fewer_rows(name, rows, at_least):
    """On a slide the room decides the size: of the wrappings drawn within 2% of the largest, the
    one in the fewest rows (each row break is a turn in the reading; common practice for slides)."""
    scene = _scene(name, "slide")
    assert _panels_per_row(scene) == rows
    assert _scale(scene, "slide") >= at_least
