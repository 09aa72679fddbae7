"""A charge sign beside an atom label stands at the label's upper right, close to it (common
practice: O+, N+ written with the sign as a superscript, or at the upper right corner where a
bond leaves to the right), where the drawn bonds and hydrogens leave room there.

Measured on the Scene: the middle of the sign's glyph against the atom's label box, in bond
lengths, and its side of the atom's centre (y grows downwards).
"""
from __future__ import annotations

import math

import pytest

from arrows.draw.text import FontFace
from scenes import scene_of as _scene


def _sign_middle(mark, face: FontFace) -> tuple[float, float]:
    """The middle of the sign glyph (the run's last character) of a charge mark."""
    run = mark.runs[-1]
    sign = run.text[-1]
    x = run.x + face.width(run.text, run.size) - face.width(sign, run.size) / 2
    return x, run.y - face.ink_middle(sign) * run.size


def _sign_of(name: str, panel: int, atom: str, style: str):
    """The scene, the panel, the atom's drawing and the middle of its charge sign's glyph."""
    scene = _scene(name, style)
    drawn = scene.panels[panel]
    label = next(a for a in drawn.atoms if a.name == atom)
    sign, = [m for m in drawn.marks if m.kind == "charge" and m.atom == label.index]
    return scene, drawn, label, _sign_middle(sign, FontFace(scene.style.font_family))


@pytest.mark.parametrize("style", ["two-column", "slide"])
@pytest.mark.parametrize("name, panel, atom", [
    # An oxonium O+ whose bond to its drawn H leaves to the right, the C=O to the upper left:
    # the sign stood under the O, 0.42 bond lengths below its centre.
    ("fischer esterification", 4, "O2"),
    ("10-acetal-formation.mech", 5, "O3"),
])
def test_an_oxonium_sign_stands_at_the_upper_right_of_its_label(name, panel, atom, style):
    scene, drawn, label, (x, y) = _sign_of(name, panel, atom, style)
    assert y < label.position[1] and x > label.position[0], ((x, y), label.position)
    assert label.box.distance((x, y)) / scene.bond_length <= 0.25


@pytest.mark.parametrize("style", ["two-column", "slide"])
@pytest.mark.parametrize("name, panel, atom", [
    # The azide's central N+ between two lettered N: at the upper right its sign stood over the
    # N=N bond, 0.54 bond lengths from its own N and 0.73 from the next (a ratio of 1.35).
    ("azide epoxide opening", 0, "N5"),
    # The nitrosamine's O+ in the diazotisation, its sign over the O=N bond likewise.
    ("diazotisation", 3, "O3"),
])
def test_a_sign_between_two_letters_reads_as_its_own_atoms(name, panel, atom, style):
    """A charge sign stands at least 1.4 times as far from any other atom's letter as from its own
    atom's centre: nearer, it reads as the neighbour's (common practice: a sign sits against its
    own symbol)."""
    scene, drawn, label, (x, y) = _sign_of(name, panel, atom, style)
    own = math.dist((x, y), label.position)
    nearest = min(math.dist((x, y), a.position) for a in drawn.atoms if a.index != label.index and a.box is not None)
    assert nearest >= 1.4 * own, (own / scene.bond_length, nearest / scene.bond_length)


@pytest.mark.parametrize("style", ["two-column", "slide"])
def test_a_carbanion_sign_stands_nearer_its_own_vertex(style):
    """The Favorskii ring-opening's carbanion C5, a bare vertex beside the ester-bearing C2: its
    minus sign stood nearer C2 (0.47 bond lengths) than C5 (0.53) and read as C2's. A sign stands
    nearer its own atom than any other where a side allows it (common practice)."""
    scene = _scene("favorskii", style)
    drawn = scene.panels[4]
    vertex = next(a for a in drawn.atoms if a.name == "C5")
    sign, = [m for m in drawn.marks if m.kind == "charge" and m.atom == vertex.index]
    middle = ((sign.box.x0 + sign.box.x1) / 2, (sign.box.y0 + sign.box.y1) / 2)
    own = math.dist(middle, vertex.position)
    assert all(math.dist(middle, a.position) > own for a in drawn.atoms if a.index != vertex.index)


def _sign_box_middle(mark) -> tuple[float, float]:
    return (mark.box.x0 + mark.box.x1) / 2, (mark.box.y0 + mark.box.y1) / 2


def _molecule_of(panel, atom: int) -> set[int]:
    """The atoms joined to `atom` by the panel's drawn bonds."""
    adjacent: dict[int, set[int]] = {a.index: set() for a in panel.atoms}
    for bond in panel.bonds:
        i, j = bond.atoms
        adjacent[i].add(j)
        adjacent[j].add(i)
    seen, todo = {atom}, [atom]
    while todo:
        for n in adjacent[todo.pop()] - seen:
            seen.add(n)
            todo.append(n)
    return seen


@pytest.mark.parametrize("style", ["two-column", "slide"])
def test_a_sign_keeps_off_a_bare_vertex_of_another_molecule(style):
    """The Weinreb ketone synthesis's MgBr+, set free as the propyl carbanion adds to the amide:
    its "+" was written before the Mg, 0.49 bond lengths from a carbon of the new propyl chain,
    where it read as a carbocation there (common practice: a sign sits against its own symbol)."""
    scene = _scene("weinreb ketone", style)
    drawn = scene.panels[1]
    metal = next(a for a in drawn.atoms if a.name.startswith("Mg"))
    sign, = [m for m in drawn.marks if m.kind == "charge" and m.atom == metal.index]
    middle = _sign_box_middle(sign)
    own = _molecule_of(drawn, metal.index)
    vertices = [a for a in drawn.atoms if a.box is None and a.index not in own]
    assert all(math.dist(middle, a.position) >= 0.5 * scene.bond_length for a in vertices)


# Sodium borohydride reducing cyclohexanone in methanol (Clayden, Organic Chemistry, 2nd ed.,
# ch. 6; from memory).
BOROHYDRIDE_IN_METHANOL = """\
species ketone = "[O:1]=[C:2]1CCCCC1"
species borohydride = "[BH4-:3]"
species methanol = "C[OH:4]"
step "hydride transfer" under "MeOH"
    B3-H -> C2-H(B3)
    C2=O1 -> O1
end
step "protonation by methanol"
    :O1 -> H(O4)
    O4-H -> O4
end
step "methoxide to borane"
    :O4 -> B3
end
product "OC1CCCCC1"
"""


@pytest.mark.parametrize("style", ["two-column", "slide"])
def test_a_minus_keeps_off_the_bond_to_the_hydride_it_gives(style):
    """BH4- giving its hydride (above): the "-" of B stood 60 degrees round from the bond to the H
    that moves, beside that H, where it read as a hydride's H- rather than the borate's. It stands
    on the far side of B from that bond, more than 90 degrees round (common practice: a sign on
    its own atom's free side)."""
    import arrows
    from arrows.draw import STYLES, build_scene
    trace, diags = arrows.check_text(BOROHYDRIDE_IN_METHANOL, "borohydride.mech")
    scene = build_scene(trace, STYLES[style], diags)
    drawn = scene.panels[0]
    boron = next(a for a in drawn.atoms if a.name == "B3")
    hydrogen = next(a for a in drawn.atoms if a.name.startswith("H("))
    sign, = [m for m in drawn.marks if m.kind == "charge" and m.atom == boron.index]
    x, y = _sign_box_middle(sign)
    to_sign = complex(x - boron.position[0], y - boron.position[1])
    to_hydrogen = complex(hydrogen.position[0] - boron.position[0], hydrogen.position[1] - boron.position[1])
    assert abs(math.degrees(math.atan2((to_sign / to_hydrogen).imag, (to_sign / to_hydrogen).real))) > 90
