"""A whole mechanism as a Scene: panels (the starting state, then the state after each step),
the curved arrows of each step on the panel it leaves, reaction arrows with their text, rows
wrapped to the page width, a title, and error marks when a faulty mechanism is drawn anyway.
"""
from __future__ import annotations

import cmath
import math
from collections import Counter
from dataclasses import dataclass, field, replace
from functools import lru_cache
from itertools import combinations, takewhile
from typing import Iterator, Optional, Sequence

import numpy as np
from rdkit import Chem
from rdkit.Chem.rdMolDescriptors import CalcMolFormula

from ..checks.written_stereo import final_state_as_written
from ..diagnostics import Diagnostic, ERROR
from ..electrons import ElectronState, ResolvedMove, bonds_after
from ..rdkit_io import atom_list, bond_list, formula as molecular_formula, fragment
from ..trace import StepTrace, Trace
from .branches import may_stand_closer
from .curves import LEGIBLE_HOOK, ArrowPlanner, to_own_atom
from .layout import Layout, compute_layout, molecules_of
from .phenyls import PHENYL_LABEL, spectator_phenyls
from .plane import distance_to_segment, segments_cross
from .scene import BondDrawing, Box, CurvedArrow, Mark, Panel, ReactionArrow, Scene, TextRun
from .formula import MINUS, Piece, condition_pieces, formula_pieces, inorganic_order
from .structure import PanelStructure, StructureDrawer, segment_hits_box
from .styles import ERROR_COLOUR, MM, PAGE_TEXT_HEIGHT_MM, SMALLEST_TEXT_PT, STYLES, Style
from .text import FontFace, wrap
from .wedges import configured_centres


class DrawError(Exception):
    """The trace cannot be drawn at all (no starting state)."""


@dataclass
class _PanelSource:
    state: ElectronState
    leaving: Optional[StepTrace]       # the step whose arrows are drawn on this panel
    arriving: Optional[StepTrace]      # the step that produced this state
    # The atoms of each molecule of `state` (layout.molecules_of), read once for the sources, the
    # layout and the structure: each would otherwise ask RDKit again.
    molecules: tuple[tuple[int, ...], ...]
    hidden: frozenset[int] = frozenset()   # atoms shown as "+ name" over the arrow instead
    idle: frozenset[int] = frozenset()     # spectators between their parts: not drawn here


@dataclass
class _Item:
    """A panel or a reaction arrow before it is put on the page."""

    width: float
    above: float        # extent above the row's centre line
    below: float
    panel: Optional[Panel] = None
    arrow_index: Optional[int] = None
    centre: float = 0.0  # a panel's centre line (_panel_centre), in its own frame


@dataclass
class _ArrowSpec:
    step: int
    kind: str
    over: list[list[Piece]] = field(default_factory=list)     # lines of pieces
    under: list[list[Piece]] = field(default_factory=list)
    note: list[str] = field(default_factory=list)   # step label, in italics
    marker: str = ""


def _named_hydrogens(step: Optional[StepTrace], drawn_h: frozenset[int]) -> frozenset[int]:
    """The drawn hydrogens an arrow of `step` starts or ends at (the atom or its bond)."""
    if step is None:
        return frozenset()
    return frozenset(i for m in step.change.moves for i in m.source_atoms + m.sink_atoms) & drawn_h


def _stereo_hydrogens(state: ElectronState, arriving: Optional[StepTrace], drawn_h: frozenset[int]
                      ) -> frozenset[int]:
    """The hydrogens the step `arriving` at `state` moved that sit on a configured stereocentre
    of it: drawn, so that the wedge showing which face the hydrogen came to may be its own."""
    arrived = _named_hydrogens(arriving, drawn_h)
    if not arrived or not state.configured:
        return frozenset()
    centres = configured_centres(state)
    mol = state.mol
    return frozenset(h for h in arrived if h < mol.GetNumAtoms()
                     and any(n.GetIdx() in centres for n in mol.GetAtomWithIdx(h).GetNeighbors()))


def _panel_sources(trace: Trace, product: frozenset[int] = frozenset()) -> list[_PanelSource]:
    if trace.initial is None or not trace.initial.elements:
        raise DrawError("the mechanism has no starting state to draw (no species with atoms)")
    steps = trace.steps
    if not steps:
        return [_PanelSource(trace.initial, None, None, molecules_of(trace.initial))]
    out: list[_PanelSource] = []
    for k, st in enumerate(steps):
        molecules = molecules_of(st.before)
        out.append(_PanelSource(st.before, st, steps[k - 1] if k else None, molecules, _unused_entries(st, molecules)))
        if st.after is None:
            return out
    out.append(_PanelSource(steps[-1].after, None, steps[-1], molecules_of(steps[-1].after)))
    return _without_idle_spectators(out, product)


def product_atoms(trace: Trace) -> frozenset[int]:
    """The atoms of the molecule of the last state that the `product` statement names first (the
    product proper: chemists write it before any by-product), matched on its heavy atoms' elements;
    empty without a `product`, or when no molecule matches (the product check says why)."""
    product = trace.mechanism.product
    final = trace.steps[-1].after if trace.steps else trace.initial
    if product is None or final is None:
        return frozenset()
    molecules = Chem.GetMolFrags(final.mol, asMols=False, sanitizeFrags=False)
    if len(molecules) < 2:
        return frozenset()   # nothing to tell the product from
    written = Chem.MolFromSmiles(product.smiles, sanitize=False)
    if written is None or not written.GetNumAtoms():
        return frozenset()
    first = Chem.GetMolFrags(written, asMols=False, sanitizeFrags=False)[0]
    wanted = Counter(written.GetAtomWithIdx(i).GetAtomicNum() for i in first)
    wanted.pop(1, None)
    heavy, elements = sum(wanted.values()), final.elements
    for molecule in molecules:
        atoms = [elements[i] for i in molecule if elements[i] != 1]
        # (a molecule of another size is passed over before its elements are counted)
        if len(atoms) == heavy and Counter(atoms) == wanted:
            return frozenset(molecule)
    return frozenset()


def _bond_lists(sources: list[_PanelSource]) -> list[list[tuple[int, int, float]]]:
    """rdkit_io.bond_list of each panel's state. A state that is the one the step before made
    (no species entered in between) has its bonds worked out from the previous panel's and that
    step's change: reading every bond off RDKit costs four calls a bond."""
    out: list[list[tuple[int, int, float]]] = []
    for k, src in enumerate(sources):
        made = sources[k - 1].leaving if k else None
        if made is not None and made.after is not None and src.state.mol is made.after.mol:
            out.append(bonds_after(out[-1], made.change, src.state.mol))
        else:
            out.append(bond_list(src.state.mol))
    return out


def _without_idle_spectators(sources: list[_PanelSource], product: frozenset[int] = frozenset()
                             ) -> list[_PanelSource]:
    """A species that neither the step into a panel nor the step out of it touches is left out
    of that panel: one that has already taken part (a proton shuttle, a by-product) would only
    wait where it last acted, far from the molecule, in the way of the rows; a reactant waiting
    for a later step (the alcohol and the amine of a Swern oxidation) is drawn in the first
    panel, with every starting material, and again from the panel before its step. The largest
    species of a panel is always drawn (the molecule the scheme is about, as a rule; of two as
    large, the one that takes part), and so is the `product` in the last panel (the atoms
    product_atoms found). Each source (just made by _panel_sources) gets its `idle` atoms in place."""
    for src in sources:
        if src.arriving is None:
            continue   # the first panel draws every starting material
        # Touched by the steps on either side, or just brought in by the step into the panel.
        near = {i for st in (src.arriving, src.leaving) if st is not None for i in st.change.touched_atoms}
        near |= set(src.arriving.entered)
        # The largest last; of two as large, the one a step beside the panel touches.
        fragments = sorted(src.molecules,
                           key=lambda f: (src.leaving is None and not product.isdisjoint(f), len(f),
                                          not near.isdisjoint(f)))
        idle = set()
        for frag in fragments[:-1]:
            atoms = set(frag) - src.state.released
            if atoms and not atoms & near:
                idle |= atoms
        if src.leaving is None:
            # (the last panel writes a small by-product whole: H3O+, not H-OH2+)
            idle |= _hydrogens_of_small_by_products(src.state, src.molecules)
        src.idle = frozenset(idle)
    return sources


def _unused_entries(st: StepTrace, molecules: Sequence[Sequence[int]]) -> frozenset[int]:
    """Atoms of species entering with `uses` that no arrow of the step touches: they are named
    over the reaction arrow instead of drawn. `molecules`: the atoms of each molecule of the state
    before the step (molecules_of)."""
    if not st.entered:
        return frozenset()
    touched = {i for m in st.change.moves for i in m.source_atoms + m.sink_atoms}
    hidden = set()
    for frag in molecules:
        if set(frag) <= set(st.entered) and not set(frag) & touched:
            hidden |= set(frag)
    return frozenset(hidden)


@dataclass(frozen=True)
class _Groundwork:
    """What every drawing of a scheme shares, at whatever size: its panels' sources, their bonds
    and the layout (in bond lengths: the style scales it). A slide's scheme is built several
    times to fit its page (_filling_the_page), each time from this one groundwork."""

    sources: list[_PanelSource]
    moves: list[list[ResolvedMove]]             # each panel's arrows: the moves of the step leaving it
    bonds: list[list[tuple[int, int, float]]]   # rdkit_io.bond_list of each panel's state
    layout: Layout
    group_labels: dict[int, str] = field(default_factory=dict)   # atom -> the group it is written as (Ph)


def _groundwork(trace: Trace, ph_labels: bool) -> _Groundwork:
    product = product_atoms(trace)
    sources = _panel_sources(trace, product)
    if sources[-1].leaving is None and sources[-1].arriving is not None:
        # The product panel draws the configuration the `product` line writes where the steps
        # set none (a conrotatory opening's Z alkene), not a default the reader takes for a claim.
        as_written = final_state_as_written(trace)
        if as_written is not None:
            sources[-1] = replace(sources[-1], state=as_written, molecules=molecules_of(as_written))
    moves = [list(s.leaving.change.moves) if s.leaving else [] for s in sources]
    touched = [set(s.leaving.change.touched_atoms) if s.leaving else set() for s in sources]
    bonds = _bond_lists(sources)   # for layout and structures
    states = [s.state for s in sources]
    phenyls = spectator_phenyls(states, _reached_atoms(trace)) if ph_labels else {}
    layout = compute_layout(states, moves, touched, [s.hidden | s.idle for s in sources], bonds, product, phenyls,
                            [s.molecules for s in sources])
    return _Groundwork(sources, moves, bonds, layout, dict.fromkeys(phenyls, PHENYL_LABEL))


def _reached_atoms(trace: Trace) -> set[int]:
    """Every atom a step's arrows start or end at, or whose bonds or electrons a step changes."""
    reached = set()
    for st in trace.steps:
        reached.update(st.change.touched_atoms)
        reached.update(i for m in st.change.moves for i in m.source_atoms + m.sink_atoms)
    return reached


def build_scene(trace: Trace, style: Style, diagnostics: Sequence[Diagnostic] = ()) -> Scene:
    """Lay out the whole scheme. Shrinks it (and says so in `notes`) if one panel is wider than
    the page, or the slide is too tall; draws a slide's scheme that leaves much of the page empty
    larger, to fill it (_filling_the_page, also noted). A slide's rows are chosen at the preset size
    and kept when it is shrunk or enlarged (re-wrapped at 87%, the acetal's 3 + 3 + 2 panels became
    4 + 3 + 1)."""
    groundwork = _groundwork(trace, style.ph_labels)
    builder = _SceneBuilder(trace, groundwork, style, diagnostics)
    scene, fit = builder.build()
    states = [s.state for s in groundwork.sources]
    uneven = (_uneven_bonds(scene) + _crowded_atoms(scene) + _signs_on_bonds(scene) + _cramped_hooks(scene)
              + _arrows_across_bonds(scene) + _straight_stereo_double_bonds(scene, states) + _heavy_lines(style)
              + _glyphs_wanting(trace, style) + _font_missing(style))
    if fit < 0.999:
        if style.page_height is None:
            smaller = style.scaled(fit * 0.995)
            scene, _ = _SceneBuilder(trace, groundwork, smaller, diagnostics, style).build()
        else:
            fit, smaller, scene = _shrunk_to_the_margins(trace, groundwork, style, diagnostics, fit, builder.wrapping)
        note = f"drawn at {fit:.0%} of the {style.name} size to fit the page"
        if smaller.small_size < SMALLEST_TEXT_PT:
            note += (f"; the smallest text is {smaller.small_size:.1f} pt (below {SMALLEST_TEXT_PT:g} pt): "
                     "try a wider style")
        scene = replace(scene, notes=(note,) + scene.notes)
    elif style.small_size < SMALLEST_TEXT_PT - 1e-9:
        uneven += (f"the smallest text (charges, subscripts) is {style.small_size:.1f} pt at print size, below "
                   f"{SMALLEST_TEXT_PT:g} pt: try --font-size {SMALLEST_TEXT_PT / style.small_scale:g} or more",)
    elif _may_fill(style):
        scene = _filling_the_page(trace, groundwork, style, diagnostics, scene, builder.wrapping)
    uneven += _taller_than_a_page(scene, style)   # (the scheme as drawn, after any shrinking)
    return replace(scene, notes=scene.notes + uneven) if uneven else scene


# A slide's scheme is drawn at most this much larger than the preset to fill the page. At 2x the
# atom labels and the text over the arrows are 36 pt and the bonds 64 pt (23 mm): as large as a
# slide's own heading (commonly 32-44 pt; common practice, from memory) and no larger, so that a
# one-step scheme of a few atoms stays a figure and does not become a poster; the charges and
# subscripts (0.8 em) are then 29 pt. On the gallery, Diels-Alder is held to this cap at 75% of
# the usable width (38% before), its product ring 2.2 in tall on a 7.5 in slide.
_MOST_ENLARGED = 2.0
# Less than this is not worth a size of its own: a scheme that nearly fills the slide is drawn at
# the preset size, as the other slides of a talk drawn at it.
_LEAST_ENLARGED = 1.1
_FIT_TRIES = 4   # layouts tried at a smaller factor when the one worked out does not fit


def _may_fill(style: Style) -> bool:
    """Whether a scheme in this style is drawn larger to fill its page: a page of fixed height (the
    slide; a journal column's figure keeps the journal's type size), at the preset's own sizes (a
    font size, bond length or line width the user gave is kept: own_sizes, which with_options
    sets, or sizes other than the preset's set any other way)."""
    preset = STYLES.get(style.name)
    return (style.page_height is not None and not style.own_sizes and preset is not None
            and (style.font_size, style.bond_length, style.line_width)
            == (preset.font_size, preset.bond_length, preset.line_width))


def _filling_the_page(trace: Trace, groundwork: _Groundwork, style: Style, diagnostics: Sequence[Diagnostic],
                      scene: Scene, wrapping: tuple[int, ...]) -> Scene:
    """The scheme drawn at the largest factor, up to _MOST_ENLARGED, at which it still fits the
    page's width and height within the margins, in the same rows (_enlarged: the title grows less).
    The factor is worked out from the scheme laid out at its own height, then checked by laying
    it out again (the rows are chosen afresh at the larger size, a title may wrap into more
    lines); while it does not fit, a smaller factor is tried. `scene` (at the preset size) is
    returned when no factor of _LEAST_ENLARGED or more fits. `wrapping`: the panels per row of `scene`."""
    natural = _natural(trace, groundwork, style, diagnostics, wrapping)
    rows = _row_starts(natural)
    # (0.995: a row as wide as the page to the last digit may be wrapped by a rounding error)
    factor = min(_MOST_ENLARGED, 0.995 * _room_factor(natural, style, title_kept=True))
    for _ in range(_FIT_TRIES):
        # A bond a whole number of points long, as the presets' (at most 1 pt, 3%, less fill): at
        # 37.53 pt the sulfonamide's hydrogen, set exactly 30 degrees off a neighbour's direction,
        # measured 29.999999999999996 degrees, under the geometry tests' 30; at 37 pt it measures
        # as at the presets.
        factor = math.floor(factor * style.bond_length + 1e-9) / style.bond_length
        if factor < _LEAST_ENLARGED:
            break
        drawn, fit = _SceneBuilder(trace, groundwork, _enlarged(style, factor), diagnostics, style, wrapping).build()
        if fit >= 1.0 and _within_margins(drawn, style) and _row_starts(drawn) == rows:
            # (The command that drew it says how to keep the preset size: it knows its own options.)
            note = f"drawn at {factor:.0%} of the {style.name} size to fill the page"
            return replace(drawn, notes=(note,) + drawn.notes, enlarged=factor)
        factor *= min(0.97, fit)
    return scene


def _shrunk_to_the_margins(trace: Trace, groundwork: _Groundwork, style: Style, diagnostics: Sequence[Diagnostic],
                           fit: float, wrapping: tuple[int, ...]) -> tuple[float, Style, Scene]:
    """A scheme too large for a page of fixed height, shrunk until all of it lies within the
    margins: the factor, the style drawn and the scene. The builder's own factor, `fit` (the page's
    height over the scheme's), is tried first; it left the bottom of the annulation scheme 6 pt in
    the bottom margin, as the margins do not shrink with the scheme. Then the height within the
    margins over the scheme's (in the rows it has at its full size, `wrapping`, which it keeps) is
    tried, then less."""
    factor = fit
    for attempt in range(_FIT_TRIES):
        smaller = style.scaled(factor * 0.995)
        scene, _ = _SceneBuilder(trace, groundwork, smaller, diagnostics, style, wrapping).build()
        if _within_margins(scene, style):
            break
        estimate = (_room_factor(_natural(trace, groundwork, style, diagnostics, wrapping), style, title_kept=False)
                    if attempt == 0 else factor)
        factor = estimate if estimate < factor else 0.97 * factor
    return factor, smaller, scene


def _natural(trace: Trace, groundwork: _Groundwork, style: Style, diagnostics: Sequence[Diagnostic],
             wrapping: tuple[int, ...]) -> Scene:
    """The scheme laid out on a page as wide as the style's and as tall as the scheme needs, in
    `wrapping`'s rows."""
    return _SceneBuilder(trace, groundwork, style, diagnostics, replace(style, page_height_mm=None),
                         wrapping).build()[0]


def _enlarged(style: Style, factor: float) -> Style:
    """`style` with every drawn length `factor` times larger, but the title: it keeps its size until
    the labels outgrow it, then stays as large as they are (at the title's own 1.2 em it read as
    the slide's heading, 43 pt at 2x, and Diels-Alder's wrapped onto a second line; kept at the
    preset's 21.6 pt it stood under the 36 pt text over the arrows as a caption would)."""
    return replace(style.scaled(factor), title_scale=max(style.title_scale / factor, 1.0))


def _room_factor(natural: Scene, page: Style, title_kept: bool) -> float:
    """By how much the scheme of `natural` (laid out at its own height) can be scaled on `page`:
    its widest row to the width within the margins, everything to the height within them. The
    title's lines (on as many lines as now) scale as _enlarged has them (title_kept) or with the
    rest (style.scaled)."""
    margin = page.margin
    width = _drawn_box(natural).width
    across = (page.page_width - 2 * margin) / width if width > 0 else math.inf
    title_end = max((t.y + 0.45 * t.size for t in natural.texts if t.bold), default=margin)
    title, rest = title_end - margin, natural.height - margin - title_end   # (rest: from the title to the bottom margin)
    room = page.page_height - 2 * margin
    down = room / (title + rest)
    if title_kept:
        down = (room - title) / rest
        if down > page.title_scale:   # the title grows too, at factor / title_scale
            down = room / (title / page.title_scale + rest)
    return min(across, down)


def _drawn_box(scene: Scene) -> Box:
    """The union of the placed panels' boxes and the reaction arrows' boxes (with their text)."""
    return Box.enclosing([p.box.shifted(*p.origin) for p in scene.panels] + [a.box for a in scene.reaction_arrows])


def _row_starts(scene: Scene) -> tuple[int, ...]:
    """The reaction arrows that begin a row: those that start left of the end of the panel before
    them. A scheme drawn larger keeps its rows (a row read left to right does not become two)."""
    ends = {p.index: p.origin[0] + p.box.x1 for p in scene.panels}
    return tuple(k for k, a in enumerate(scene.reaction_arrows) if a.start[0] < ends.get(k, -math.inf))


def _within_margins(scene: Scene, page: Style) -> bool:
    """The panels and reaction arrows (with their text) lie within the page's margins (the title
    is written from the top margin, wrapped to the width within them)."""
    margin = page.margin
    box = _drawn_box(scene)
    return (box.x0 >= margin - 1e-6 and box.x1 <= page.page_width - margin + 1e-6
            and box.y0 >= margin - 1e-6 and box.y1 <= page.page_height - margin + 1e-6)


def _glyphs_wanting(trace: Trace, style: Style) -> tuple[str, ...]:
    """A note when the texts the scheme writes (the title, in bold; the conditions over and under
    the arrows) hold characters the font has no glyph for: they print as empty boxes. The font is
    asked (FontFace.lacks), so every script it lacks is noted, whichever font is chosen."""
    mechanism = trace.mechanism
    conditions = [t for st in mechanism.steps for t in (st.over, st.under) if t]
    wanting = sorted(set(FontFace(style.font_family, bold=True).wanting([mechanism.title or ""]))
                     | set(FontFace(style.font_family).wanting(conditions)))
    if not wanting:
        return ()
    shown = "".join(wanting[:8]) + ("..." if len(wanting) > 8 else "")
    return (f"the texts hold characters the font has no glyphs for ({shown}): they print as empty boxes; "
            f"choose a font that has them with --font",)


# A family no system has: what the font machinery falls back to when a family is not installed.
_NO_SUCH_FAMILY = "arrows-no-such-font"
_PROBE = "HONClBrNa+0123456789"
_GENERIC_FAMILIES = frozenset({"sans-serif", "sans", "serif", "monospace", "cursive", "fantasy", "system-ui"})


def _font_missing(style: Style) -> tuple[str, ...]:
    """A note when the family asked for is not installed: the text is measured, and printed, in
    the fallback font the system picks, while the SVG still names the family asked for. Told by
    metrics: a family measured exactly as the fallback is taken for it (a metric twin of the
    fallback would be noted too, harmlessly)."""
    family = style.font_family
    # The first of a list (`DejaVu Sans, Arial`), as written but for quotes, case and spaces; a
    # generic family names no font to be missing (fontconfig picks one), nor does the default.
    first = family.split(",")[0].strip().strip("'\"").strip()
    if first.lower() in _GENERIC_FAMILIES | {Style.font_family.lower()}:
        return ()
    probe, fallback = FontFace(first), FontFace(_NO_SUCH_FAMILY)
    if probe.width(_PROBE, 1.0) != fallback.width(_PROBE, 1.0) or probe.cap_height != fallback.cap_height:
        return ()
    return (f"the font {family!r} is not installed here: the figure is measured and printed in the system's "
            f"fallback font; install it, or choose another with --font",)


# Degrees: a substituent of a configured double bond drawn more than this from the double bond
# stands nearly in line with it, on neither side, so E and Z cannot be told apart (common
# practice, IUPAC 2008 graphical representation from memory: about 120 degrees).
_STRAIGHTER_THAN = 150


def _straight_stereo_double_bonds(scene: Scene, states: Sequence[ElectronState]) -> tuple[str, ...]:
    """A note for each panel where a substituent of a double bond whose E or Z the state
    configures is drawn more than _STRAIGHTER_THAN degrees from it, so that the author looks
    before using the figure. `states`: each panel's state."""
    notes = []
    for panel, state in zip(scene.panels, states):
        if not state.configured:
            continue   # (no configuration written or made: no double bond of it is configured)
        mol = state.mol   # (the panel's double bonds asked: walking every bond of the state costs more)
        doubles = [bond.atoms for bond in panel.bonds if bond.order == 2 and max(bond.atoms) < mol.GetNumAtoms()]
        configured = [(i, j) for i, j in doubles
                      if (b := mol.GetBondBetweenAtoms(i, j)) is not None and b.GetStereo() not in _UNCONFIGURED]
        if not configured:
            continue
        straight = _straightest_substituent(panel, configured)
        if straight is not None:
            names = {a.index: a.name for a in panel.atoms}
            end, other, n, angle = straight
            notes.append(f"panel {panel.index + 1}: {names[end]}-{names[n]} is drawn {angle:.0f} degrees from the "
                         f"double bond {names[other]}={names[end]}, so its E or Z cannot be read; check the figure")
    return tuple(notes)


_UNCONFIGURED = (Chem.BondStereo.STEREONONE, Chem.BondStereo.STEREOANY)


def _straightest_substituent(panel: Panel, double_bonds: list[tuple[int, int]]
                             ) -> Optional[tuple[int, int, int, float]]:
    """(end, its partner across the double bond, the substituent, the angle in degrees) of the
    first substituent of `double_bonds` drawn straighter than _STRAIGHTER_THAN (a 150-degree
    one, as drawn, still reads)."""
    where = {a.index: complex(*a.position) for a in panel.atoms}
    for i, j in double_bonds:
        for end, other in ((i, j), (j, i)):
            if end not in where or other not in where:
                continue
            for bond in panel.bonds:
                if end not in bond.atoms or other in bond.atoms:
                    continue
                n = bond.atoms[0] + bond.atoms[1] - end
                if n not in where:
                    continue
                angle = abs(math.degrees(cmath.phase((where[n] - where[end]) / (where[other] - where[end]))))
                if angle > _STRAIGHTER_THAN + 0.5:
                    return end, other, n, angle
    return None


def _taller_than_a_page(scene: Scene, style: Style) -> tuple[str, ...]:
    """A note when a journal-column scheme (its page as tall as the scheme) is taller than a
    journal page's text: the figure cannot be printed at its size as one piece."""
    if style.page_height is not None or scene.height <= PAGE_TEXT_HEIGHT_MM * MM:
        return ()
    wider = "; or draw it with --style two-column" if style.page_width_mm < STYLES["two-column"].page_width_mm else ""
    return (f"the scheme is {scene.height / MM / 10:.1f} cm tall, taller than a journal page's text (about "
            f"{PAGE_TEXT_HEIGHT_MM / 10:g} cm): split the mechanism into two figures{wider}",)


def _heavy_lines(style: Style) -> tuple[str, ...]:
    """A note when the lines are so heavy against the bond length that bonds, double-bond strokes
    and labels run together (a line a tenth of a bond long already closes a double bond's gap)."""
    if style.line_width <= 0.1 * style.bond_length:
        return ()
    return (f"lines of {style.line_width:g} pt are heavy for bonds {style.bond_length:g} pt long: double bonds and "
            f"labels run together; try --line-width {0.05 * style.bond_length:.1f}",)


def _uneven_bonds(scene: Scene) -> tuple[str, ...]:
    """A note for each panel where the layout could not keep one bond length (within 2%), so that
    the author looks before using the figure. No gallery or test mechanism needs it: it is the
    safety net for structures the layout has not met."""
    notes = []
    for panel in scene.panels:
        where = {a.index: a for a in panel.atoms}
        worst = None
        for bond in panel.bonds:
            a, b = where.get(bond.atoms[0]), where.get(bond.atoms[1])
            if a is None or b is None:
                continue
            ratio = math.dist(a.position, b.position) / scene.bond_length   # (the hypot of the differences)
            if abs(ratio - 1) > 0.02 and (worst is None or abs(ratio - 1) > abs(worst[0] - 1)):
                worst = (ratio, a.name, b.name)
        if worst is not None:
            notes.append(f"panel {panel.index + 1}: the bond {worst[1]}-{worst[2]} is drawn {worst[0]:.2f} bond lengths "
                         f"long: the layout could not keep one bond length here; check the figure")
    return tuple(notes)


# Two labels side by side nearer than a thin space (a sixth of an em, common practice in type
# setting) read as one word: "HN" beside "N" reads "HNN".
_THIN_SPACE = 1 / 6
# A skeletal vertex this near a bond line (bond lengths) reads as a joint of that bond; a label
# this near one has the line run into it.
_ON_A_BOND = 0.25
_LABEL_ON_A_BOND = 0.05
# An atom on a bond, or two bonds that cross, put two atoms nearer than this (bond lengths): two
# unit segments crossing through both middles at right angles have their ends 0.71 apart. Only a
# panel with such a pair is searched further (4% of the corpus's panels).
_CROWDING_REACH = 0.75


def _crowded_atoms(scene: Scene) -> tuple[str, ...]:
    """A note for each panel where two atom labels overlap or run together, two atoms stand nearer
    than half a bond length, an atom or its label lies on a bond not its own, or two bonds cross
    (IUPAC 2008: atoms and labels never overlap), so that the author looks before using the figure.
    The geometry tests hold the gallery and the textbook schemes to this; it is the safety net for
    arrangements of molecules the layout has not met (the Boc NH of an HOBt ester, a benzotriazole
    nitrogen set beside it and its N-O bond across the N-C bond)."""
    notes = []
    bl = scene.bond_length
    thin = _THIN_SPACE * scene.style.font_size
    for panel in scene.panels:
        atoms = panel.atoms
        # Sweep from left to right: a label is compared only with those that start before it ends
        # (and a thin space beyond); of those, one level with it at all is too near.
        labelled = sorted((a for a in atoms if a.box is not None), key=lambda a: a.box.x0)
        clash = next(((a, b) for n, a in enumerate(labelled)
                      for b in takewhile(lambda b, a=a: b.box.x0 < a.box.x1 + thin, labelled[n + 1:])
                      if a.box.y0 < b.box.y1 and b.box.y0 < a.box.y1), None)
        if clash is not None:
            a, b = clash
            how = "overlap" if a.box.overlaps(b.box) else "run together"
            notes.append(f"panel {panel.index + 1}: the labels of {a.name} and {b.name} {how}: "
                         f"the layout found no clear place for them; check the figure")
            continue
        if len(atoms) < 2 or not may_stand_closer([a.position for a in atoms], _CROWDING_REACH * bl):
            continue
        where = np.array([complex(*a.position) for a in atoms])
        apart = np.abs(where[:, None] - where[None, :]) / bl
        # (np.fill_diagonal's and np.argmin's own work, without their Python wrappers)
        apart.flat[::len(atoms) + 1] = np.inf
        i, j = divmod(int(apart.argmin()), len(atoms))
        if apart[i, j] < 0.5:
            notes.append(f"panel {panel.index + 1}: {atoms[i].name} and {atoms[j].name} are drawn {apart[i, j]:.2f} "
                         f"bond lengths apart: the layout found no clear place for them; check the figure")
            continue
        # Only atoms near one another can lie on each other's bonds, or have bonds that cross.
        near: dict[int, list[int]] = {}
        for i, j in zip(*np.nonzero(apart < _CROWDING_REACH)):
            near.setdefault(atoms[i].index, []).append(atoms[j].index)
        lines, names = _lines_at(panel), {a.index: a.name for a in atoms}
        tangle = _atom_on_a_bond(atoms, lines, near, names, bl) or _bonds_crossing(lines, near, names)
        if tangle:
            notes.append(f"panel {panel.index + 1}: {tangle}: the layout found no clear place for them; check the figure")
    return tuple(notes)


def _hooked_atoms(src: _PanelSource, visible: Sequence[int]) -> list[int]:
    """The drawn atoms of a panel that a half-loop comes into (a pair or an electron going from a
    bond to that atom): their map numbers are set after the arrows (place_held_numbers). (The
    numbers of both ends of the bond, so held, left 25 numbers nearer another atom than their
    own over the corpus, against 19.)"""
    if src.leaving is None:
        return []
    shown = set(visible)
    return sorted({m.sink_atoms[0] for m in src.leaving.change.moves if to_own_atom(m)} & shown)


def _cramped_hooks(scene: Scene) -> tuple[str, ...]:
    """A note for each panel where an arrow from a bond to one of its own atoms is shorter than
    LEGIBLE_HOOK, the structure round the bond leaving no room for a half-loop (common practice
    draws it as a clear curve), so that the author looks before using the figure."""
    notes = []
    for panel in scene.panels:
        for arrow in panel.arrows:
            if not to_own_atom(arrow):   # (the arrow carries its move's kind and atoms)
                continue
            points = arrow.path_points(16)   # (within 1% of the length at 40 samples; a quarter of the cost)
            length = sum(math.dist(a, b) for a, b in zip(points, points[1:])) / scene.bond_length
            if length < LEGIBLE_HOOK:
                notes.append(f"panel {panel.index + 1}: the arrow {arrow.move} is a curve of {length:.2f} bond lengths, "
                             f"too short to read as a half-loop: the structure leaves it no room; check the figure")
                break
    return tuple(notes)


def _arrows_across_bonds(scene: Scene) -> tuple[str, ...]:
    """A note for each panel where a curved arrow crosses a bond that is not its own (one whose
    two atoms its move does not both name): the arrow planner tries each arrow on both sides, and
    an arrow to a proton also round the structure, so one left across a bond found no clear side
    (common practice: a curved arrow runs round the structure, not across it), so that the author
    looks before using the figure."""
    notes = []
    for panel in scene.panels:
        # (only where the planner's samples crossed one: the exact path then names the bond)
        crossing = [arrow for arrow in panel.arrows if arrow.crossings]
        if not crossing:
            continue
        names = {a.index: a.name for a in panel.atoms}
        crossed = next(((arrow, bond) for arrow in crossing for bond in _bonds_across(arrow, panel.bonds)), None)
        if crossed is not None:
            arrow, (i, j) = crossed[0], crossed[1].atoms
            notes.append(f"panel {panel.index + 1}: the arrow {arrow.move} crosses the bond {names.get(i, i)}-"
                         f"{names.get(j, j)}: the arrow planner found no clear side for it; check the figure")
    return tuple(notes)


def _bonds_across(arrow: CurvedArrow, bonds: Sequence[BondDrawing]) -> Iterator[BondDrawing]:
    """The bonds not the arrow's own whose lines its path (shaft and head) crosses."""
    own = set(arrow.source_atoms) | set(arrow.sink_atoms)
    path = [complex(*p) for p in arrow.path_points(16)]   # (as finely as the planner samples its curves)
    chords = list(zip(path, path[1:]))
    xs, ys = [p.real for p in path], [p.imag for p in path]
    x0, x1, y0, y1 = min(xs), max(xs), min(ys), max(ys)
    for bond in bonds:
        if set(bond.atoms) <= own:
            continue
        for (ax, ay), (bx, by) in bond.lines:
            # (most bonds lie off the box round the arrow altogether)
            if max(ax, bx) < x0 or min(ax, bx) > x1 or max(ay, by) < y0 or min(ay, by) > y1:
                continue
            a, b = complex(ax, ay), complex(bx, by)
            if any(segments_cross(p, q, a, b) for p, q in chords):
                yield bond
                break


def _lines_at(panel: Panel) -> dict[int, list[tuple[complex, complex, tuple[int, int]]]]:
    """Every line a bond is drawn with (both strokes of a double bond, a wedge's edges or hashes)
    with the bond's two atoms, under each of those atoms (a bond to an atom the panel does not
    draw left out)."""
    drawn_atoms = {a.index for a in panel.atoms}
    lines: dict[int, list[tuple[complex, complex, tuple[int, int]]]] = {}
    for bond in panel.bonds:
        if not drawn_atoms.issuperset(bond.atoms):
            continue
        drawn = [(complex(*p), complex(*q), bond.atoms) for p, q in bond.lines]
        for i in bond.atoms:
            lines.setdefault(i, []).extend(drawn)
    return lines


def _atom_on_a_bond(atoms, lines, near: dict[int, list[int]], names: dict[int, str], bl: float) -> str:
    """'X lies on the bond Y-Z' for the first atom drawn on a bond not its own (a skeletal vertex
    within _ON_A_BOND of its line, a label the line runs into), or ''. An atom on a bond one bond
    length long stands within _CROWDING_REACH of an end of it: only the bonds of the atoms `near`
    it are looked at (`lines` as _lines_at gives them)."""
    pad = _LABEL_ON_A_BOND * bl
    for atom in atoms:
        if atom.index not in near:
            continue
        nearby = [(p, q, ends) for other in near[atom.index] for p, q, ends in lines.get(other, ())
                  if atom.index not in ends]
        if atom.box is None:
            point = complex(*atom.position)
            hit = next((ends for p, q, ends in nearby if distance_to_segment(point, p, q) < _ON_A_BOND * bl), None)
        else:
            box = Box(atom.box.x0 - pad, atom.box.y0 - pad, atom.box.x1 + pad, atom.box.y1 + pad)
            hit = next((ends for p, q, ends in nearby if segment_hits_box(p, q, box)), None)
        if hit is not None:
            return f"{atom.name} lies on the bond {names[hit[0]]}-{names[hit[1]]}"
    return ""


def _bonds_crossing(lines, near: dict[int, list[int]], names: dict[int, str]) -> str:
    """'the bonds W-X and Y-Z cross' for the first two bonds with no atom in common whose lines
    cross, or ''. Two bonds one bond length long that cross have an end of one within
    _CROWDING_REACH of an end of the other: only the bonds of atoms `near` each other are compared."""
    for i, others in near.items():
        for j in others:
            for p, q, mine in lines.get(i, ()):
                for a, b, theirs in lines.get(j, ()):
                    if not set(mine) & set(theirs) and segments_cross(p, q, a, b):
                        return (f"the bonds {names[mine[0]]}-{names[mine[1]]} and {names[theirs[0]]}-"
                                f"{names[theirs[1]]} cross")
    return ""


def _signs_on_bonds(scene: Scene) -> tuple[str, ...]:
    """A note for each panel where a charge sign's ink touches a bond line, where a minus reads as
    a bond and a bond through a plus hides it (IUPAC 2008: a charge sits beside its atom, clear of
    the bonds). The editorial tests hold the gallery to this; it is the safety net for what the
    layout has not met (a larger font on a crowded panel)."""
    notes = []
    face = FontFace(scene.style.font_family)
    for panel in scene.panels:
        ox, oy = panel.origin
        signs = [m for m in panel.marks if m.kind == "charge" and m.runs]
        if not signs:
            continue
        # (the lines' ends on the page; made points only for the few lines near a sign's ink)
        ends = [(a[0] + ox, a[1] + oy, b[0] + ox, b[1] + oy) for bond in panel.bonds for a, b in bond.lines]
        for mark in signs:
            run = mark.runs[-1]   # the sign (a count such as 2 stands before it)
            width = face.width(run.text, run.size)
            sign_width = face.width(run.text[-1], run.size)
            middle = run.y - face.ink_middle(run.text[-1]) * run.size
            # The sign's ink: its stroke across the glyph, as high as a plus is (a minus is thinner).
            half = 0.3 * run.size if run.text.endswith("+") else 0.06 * run.size
            ink = Box(run.x + width - 0.85 * sign_width + ox, middle - half + oy, run.x + width - 0.15 * sign_width + ox,
                      middle + half + oy)
            # (a line wholly to one side of the ink is passed over before the clipping test)
            if any(segment_hits_box(complex(ax, ay), complex(bx, by), ink) for ax, ay, bx, by in ends
                   if min(ax, bx) <= ink.x1 and max(ax, bx) >= ink.x0
                   and min(ay, by) <= ink.y1 and max(ay, by) >= ink.y0):
                name = next((a.name for a in panel.atoms if a.index == mark.atom), "an atom")
                notes.append(f"panel {panel.index + 1}: the charge of {name} touches a bond "
                             f"line, where it reads as part of the structure; check the figure")
                break
    return tuple(notes)


class _SceneBuilder:
    def __init__(self, trace: Trace, groundwork: _Groundwork, style: Style, diagnostics: Sequence[Diagnostic],
                 page_style: Style = None, wrapping: Optional[tuple[int, ...]] = None):
        """`wrapping`: how many panels each row holds, kept as given (None: chosen for the page,
        and told in `wrapping` after build)."""
        self.trace, self.groundwork, self.style, self.diagnostics = trace, groundwork, style, list(diagnostics)
        self.wrapping = wrapping
        self.page = page_style or style
        self.face = FontFace(style.font_family)
        self.bold = FontFace(style.font_family, bold=True)
        self.italic = FontFace(style.font_family, italic=True)
        self.bl = style.bond_length
        self.drawer = StructureDrawer(style, groundwork.group_labels)
        self.planner = ArrowPlanner(style, self.drawer.dot_radius)
        self.errors = [d for d in self.diagnostics if d.severity == ERROR]
        self.fit = 1.0

    # panels
    def build(self) -> tuple[Scene, float]:
        work = self.groundwork
        sources, moves, bonds, layout = work.sources, work.moves, work.bonds, work.layout
        drawn = [self._structure(src, placed, layout, listed)
                 for src, placed, listed in zip(sources, layout.panels, bonds)]
        # The arrows of every panel are planned together (one batch of numpy work for the scheme).
        leaving = [k for k, src in enumerate(sources) if src.leaving is not None]
        planned = self.planner.plan([(sources[k].leaving.index, _drawable(moves[k], drawn[k][1]), sources[k].state,
                                      drawn[k][1]) for k in leaving])
        arrows = dict(zip(leaving, planned))
        if self.style.numbers:
            for k, src in enumerate(sources):
                held = _hooked_atoms(src, drawn[k][0])
                if held:
                    self.drawer.place_held_numbers(held, drawn[k][1], *arrows.get(k, ([], [])))
        panels = [self._panel(k, src, *drawn[k], *arrows.get(k, ([], [])))
                  for k, src in enumerate(sources)]
        specs = [self._arrow_spec(src.leaving, src.hidden) for src in sources if src.leaving is not None]
        failed = sources[-1].leaving is not None and sources[-1].leaving.after is None
        if failed:
            panels.append(self._placeholder(len(panels)))
        return self._compose(panels, specs)

    def _structure(self, src: _PanelSource, placed, layout: Layout, bonds: list[tuple[int, int, float]]
                   ) -> tuple[tuple[int, ...], PanelStructure]:
        """The atoms drawn on a panel and their structure (labels, bonds, marks)."""
        bl = self.bl
        # A travelling hydrogen is drawn where it matters: on the panel whose arrows move it and,
        # mid-scheme, on the panel just after (the reader sees where the proton went); elsewhere it
        # is implicit like every other hydrogen. The product panel is drawn in plain skeletal form
        # (NH2, CH3; not NH-H) unless the hydrogen holds a configuration there, which a wedge to it
        # may be the one to show. A labelled one (D, T) is drawn wherever it is.
        drawn_h = layout.drawn_hydrogens
        if src.leaving is None:
            moved = _stereo_hydrogens(src.state, src.arriving, drawn_h)
        else:
            moved = _named_hydrogens(src.leaving, drawn_h) | _named_hydrogens(src.arriving, drawn_h)
        shown_h = (moved | (layout.labelled_hydrogens & drawn_h)) - src.idle   # (an idle one is written in its label)
        visible = tuple([i for i in placed.visible if i not in src.hidden and i not in src.idle
                         and (i not in drawn_h or i in shown_h)])
        positions = {i: placed.positions[i] * bl for i in visible}
        # Each bond the arriving step formed, with the order it had before; each the leaving step
        # breaks, with the order it keeps (--color colours only the strokes between).
        formed, broken = {}, {}
        if src.arriving is not None:
            change = src.arriving.change
            formed.update((tuple(sorted(b)), 0) for b in change.formed)
            formed.update((tuple(sorted(b)), old) for b, old, new in change.reordered if new > old)
        if src.leaving is not None:
            change = src.leaving.change
            broken.update((tuple(sorted(b)), 0) for b in change.broken)
            broken.update((tuple(sorted(b)), new) for b, old, new in change.reordered if new < old)
        forming = {tuple(sorted(b)) for b in src.leaving.change.formed} if src.leaving is not None else set()
        held = frozenset(_hooked_atoms(src, visible)) if self.style.numbers else frozenset()
        return visible, self.drawer.draw(src.state, visible, positions, shown_h, formed, broken, bonds, forming, held,
                                         src.molecules)

    def _panel(self, k: int, src: _PanelSource, visible: tuple[int, ...], structure: PanelStructure,
               arrows: list[CurvedArrow], dots: list[Mark]) -> Panel:
        step = src.leaving.index if src.leaving is not None else None
        marks = list(structure.marks) + dots + self._error_rings(step, src.state, structure)
        atoms = tuple([structure.atoms[i] for i in visible])
        box = _panel_box(atoms, structure.bonds, marks, arrows, 0.15 * self.bl)
        return Panel(k, step, (0.0, 0.0), box, atoms, tuple(structure.bonds), tuple(marks), tuple(arrows))

    def _error_rings(self, step: Optional[int], state: ElectronState, structure) -> list[Mark]:
        faults = [d for d in self.errors if d.step == step]
        if step is None or not faults:
            return []
        names = {state.label(i): i for i in structure.atoms}
        rings = []
        for d in faults:
            wanted = list(d.atoms) + [a for pair in d.bonds for a in pair]
            for name in wanted:
                i = names.get(name)
                if i is not None and not any(m.atom == i for m in rings):
                    p = structure.positions[i]
                    r = 0.42 * self.bl
                    rings.append(Mark("error", i, radius=r, box=Box(p.real - r, p.imag - r, p.real + r, p.imag + r),
                                      colour=ERROR_COLOUR))
        return rings

    def _placeholder(self, k: int) -> Panel:
        fs = self.style.font_size
        text = "structure not derived"
        w = self.italic.width(text, fs)
        q = self.bold.width("?", 2 * fs)
        runs = (TextRun("?", -q / 2, 0.0, 2 * fs, bold=True, colour=ERROR_COLOUR),
                TextRun(text, -w / 2, 1.4 * fs, fs, italic=True, colour=ERROR_COLOUR))
        box = Box(-w / 2, -2 * fs * self.face.cap_height, w / 2, 1.4 * fs + 0.2 * fs)
        return Panel(k, None, (0.0, 0.0), box, (), (), (), (), placeholder=runs)

    # reaction arrows
    def _arrow_spec(self, st: StepTrace, hidden: frozenset[int]) -> _ArrowSpec:
        step = st.step
        spec = _ArrowSpec(st.index, step.kind)
        limit = max(4.5 * self.bl, 0.2 * self.page.page_width * self.style.bond_length / self.page.bond_length)
        if hidden:
            spec.over += self._formula_lines("+ ", _formulas(st.before.mol, sorted(hidden)), limit)
        if step.over:
            spec.over += [condition_pieces(line) for line in wrap(step.over, self.face, self.style.font_size, limit)]
        if step.under:
            spec.under += [condition_pieces(line) for line in wrap(step.under, self.face, self.style.font_size, limit)]
        if st.released_now and st.after is not None:
            spec.under += self._formula_lines(MINUS, _formulas(st.after.mol, st.released_now), limit)
        if self.style.step_labels and step.label:
            spec.note = wrap(step.label, self.italic, self.style.small_size, limit)
        numbers = [str(k + 1) for k, d in enumerate(self.errors) if d.step == st.index]
        if numbers:
            spec.marker = "error " + ", ".join(numbers)
        return spec

    def _formula_lines(self, prefix: str, formulas: list[list[Piece]], limit: float) -> list[list[Piece]]:
        """Formulas, each after `prefix`, comma-separated, on as few lines as fit `limit`."""
        lines: list[list[Piece]] = []
        for pieces in formulas:
            item = [(prefix, "n")] + pieces
            if lines and self._line_width(lines[-1] + [(", ", "n")] + item) <= limit:
                lines[-1] += [(", ", "n")] + item
            else:
                lines.append(item)
        return lines

    def _piece_size(self, kind: str) -> float:
        return self.style.font_size if kind == "n" else self.style.small_size

    def _line_width(self, pieces: list[Piece]) -> float:
        return sum(self.face.width(text, self._piece_size(kind)) for text, kind in pieces)

    def _line_runs(self, pieces: list[Piece], centre: float, baseline: float) -> list[TextRun]:
        """A line centred on `centre`: subscripts dropped and superscripts raised at the small size."""
        fs = self.style.font_size
        x = centre - self._line_width(pieces) / 2
        runs = []
        for text, kind in pieces:
            size = self._piece_size(kind)
            shift = 0.3 * fs if kind == "sub" else -0.38 * fs if kind == "sup" else 0.0
            # A run that starts with spaces starts after them: SVG renderers drop a text element's
            # leading spaces ("H2SO4 (cat.)" printed as "H2SO4(cat.)").
            stripped = text.lstrip(" ")
            x += self.face.width(text[:len(text) - len(stripped)], size)
            if stripped:
                runs.append(TextRun(stripped, x, baseline + shift, size))
            x += self.face.width(stripped, size)
        return runs

    def _arrow_item(self, spec: _ArrowSpec) -> _Item:
        fs, ss = self.style.font_size, self.style.small_size
        widths = [self._line_width(line) for line in spec.over + spec.under]
        widths += [self.italic.width(t, ss) for t in spec.note]
        if spec.marker:
            widths.append(self.bold.width(spec.marker, ss))
        length = max(2.6 * self.bl, max(widths, default=0.0) + 0.5 * self.bl)
        line = 1.2 * fs
        clear = self._text_clearance(spec)
        above = (clear + 0.25 * fs + self._subscript_lift(spec) + line * (len(spec.over) + (1 if spec.marker else 0))
                 + 0.2 * fs)
        below = clear + line * len(spec.under) + 1.2 * ss * len(spec.note) + 0.3 * fs
        return _Item(length, max(above, 0.4 * self.bl), max(below, 0.4 * self.bl))

    def _subscript_lift(self, spec: _ArrowSpec) -> float:
        """How much higher the text over an arrow stands when its line nearest the arrow has a
        subscript (NH3 over the arrow: the 3 came within a third of a millimetre of the line)."""
        if spec.over and any(kind == "sub" for _, kind in spec.over[-1]):
            return 0.3 * self.style.font_size   # the subscript's drop (_line_runs)
        return 0.0

    def _heads(self) -> tuple[float, float, float]:
        """A reaction arrow's head length, head width and, for an equilibrium, the half gap between its two lines."""
        lw = self.style.line_width
        length = max(0.32 * self.bl, 5.5 * lw)
        return length, 0.62 * length, max(0.09 * self.bl, 2.2 * lw)

    def _text_clearance(self, spec: _ArrowSpec) -> float:
        """How far from the arrow's axis the text over and under it begins: 0.35 em, or clear of an
        equilibrium's barbs by 0.3 em (the lower harpoon's barb stood half a millimetre over the
        first letter of the text under it)."""
        fs = self.style.font_size
        if spec.kind != "reversible":
            return 0.35 * fs
        length, width, gap = self._heads()
        return max(0.35 * fs, gap + 0.8 * width + 0.15 * fs)   # (text under starts 0.15 em below this)

    def _reaction_arrow(self, spec: _ArrowSpec, x0: float, x1: float, y: float) -> ReactionArrow:
        fs, ss = self.style.font_size, self.style.small_size
        L, W, g = self._heads()
        lines, heads = [], []
        if spec.kind == "reversible":
            top, bottom = y - g, y + g
            lines += [((x0, top), (x1 - 0.3 * L, top)), ((x0 + 0.3 * L, bottom), (x1, bottom))]
            heads += [((x1, top), (x1 - L, top - W * 0.8), (x1 - L * 0.75, top)),
                      ((x0, bottom), (x0 + L, bottom + W * 0.8), (x0 + L * 0.75, bottom))]
        else:
            start = x0 + 0.7 * L if spec.kind == "resonance" else x0
            lines.append(((start, y), (x1 - 0.7 * L, y)))
            heads.append(((x1, y), (x1 - L, y - W / 2), (x1 - 0.72 * L, y), (x1 - L, y + W / 2)))
            if spec.kind == "resonance":
                heads.append(((x0, y), (x0 + L, y - W / 2), (x0 + 0.72 * L, y), (x0 + L, y + W / 2)))
        mid = (x0 + x1) / 2
        texts = []
        line = 1.2 * fs
        clear = self._text_clearance(spec)
        baseline = y - clear - 0.25 * fs - self._subscript_lift(spec)
        over = list(spec.over)
        for k, pieces in enumerate(reversed(over)):
            texts += self._line_runs(pieces, mid, baseline - k * line)
        if spec.marker:
            w = self.bold.width(spec.marker, ss)
            texts.append(TextRun(spec.marker, mid - w / 2, baseline - len(over) * line, ss, bold=True,
                                 colour=ERROR_COLOUR))
        baseline = y + clear + self.face.cap_height * fs + 0.15 * fs
        for k, pieces in enumerate(spec.under):
            texts += self._line_runs(pieces, mid, baseline + k * line)
        baseline += len(spec.under) * line
        for k, text in enumerate(spec.note):
            w = self.italic.width(text, ss)
            texts.append(TextRun(text, mid - w / 2, baseline + k * 1.2 * ss, ss, italic=True))
        box = Box.enclosing([Box(x0, y - W, x1, y + W)] + [_run_box(self, t) for t in texts])
        return ReactionArrow(spec.step, spec.kind, (x0, y), (x1, y), tuple(lines), tuple(heads), tuple(texts), box)

    # page
    def _compose(self, panels: list[Panel], specs: list[_ArrowSpec]) -> tuple[Scene, float]:
        style, page = self.style, self.page
        margin = page.margin
        avail = page.page_width - 2 * margin
        gap = 0.35 * self.bl
        items = []
        for k, panel in enumerate(panels):
            if k > 0 and k - 1 < len(specs):
                arrow = self._arrow_item(specs[k - 1])
                arrow.arrow_index = k - 1
                items.append(arrow)
            centre = _panel_centre(panel)
            items.append(_Item(panel.box.width, centre - panel.box.y0, panel.box.y1 - centre, panel=panel,
                               centre=centre))
        # Rows: a reaction arrow always travels with the panel after it.
        units: list[list[_Item]] = [[items[0]]] + [items[k:k + 2] for k in range(1, len(items), 2)]
        widths = [sum(i.width for i in u) + gap * (len(u) - 1) for u in units]
        extents = [(max(i.above for i in u), max(i.below for i in u)) for u in units]

        texts: list[TextRun] = []
        y = margin
        mechanism = self.trace.mechanism
        if style.show_title and mechanism.title:
            ts = style.title_size
            for line in wrap(mechanism.title, self.bold, ts, avail):
                y += self.bold.cap_height * ts
                texts.append(TextRun(line, margin, y, ts, bold=True))
                y += 0.45 * ts
            y += 0.4 * self.bl
        row_gap = 0.5 * self.bl
        if self.wrapping is None:
            # A page of fixed height leaves the rows what the title does not take (the error list
            # of a forced draft is left out: it wraps anew at every size).
            room = page.page_height - margin - y if page.page_height is not None else None
            most = _MOST_ENLARGED if _may_fill(style) else 1.0
            self.wrapping = tuple(len(row) for row in _chosen_rows(widths, extents, gap, avail, row_gap, room, most))
        starts = [sum(self.wrapping[:r]) for r in range(len(self.wrapping) + 1)]
        rows = [[item for unit in units[a:b] for item in unit] for a, b in zip(starts, starts[1:])]
        widest = max(sum(widths[a:b]) + gap * (b - a - 1) for a, b in zip(starts, starts[1:]))
        self.fit = min(1.0, avail / widest)
        placed_panels, arrows = [], []
        for r, row in enumerate(rows):
            above = max(i.above for i in row)
            below = max(i.below for i in row)
            centre_y = y + above
            row_width = sum(i.width for i in row) + gap * (len(row) - 1)
            x = margin + (avail - row_width) / 2
            for item in row:
                if item.panel is not None:
                    p = item.panel
                    origin = (x - p.box.x0, centre_y - item.centre)
                    placed_panels.append(_placed(p, origin))
                else:
                    arrows.append(self._reaction_arrow(specs[item.arrow_index], x, x + item.width, centre_y))
                x += item.width + gap
            y = centre_y + below + (row_gap if r < len(rows) - 1 else 0.0)
        below_scheme = len(texts)   # the error list's lines, which move with the scheme
        if self.errors:
            y += 0.5 * self.bl
            ss = style.small_size
            for k, d in enumerate(self.errors):
                text = f"error {k + 1}: {d.loc} {d.code} {d.message}"
                for line in wrap(text, self.face, ss, avail):
                    y += self.face.cap_height * ss
                    texts.append(TextRun(line, margin, y, ss, colour=ERROR_COLOUR))
                    y += 0.45 * ss
        height = y + margin
        page_height = page.page_height
        if page_height is not None:
            if height > page_height:
                self.fit = min(self.fit, page_height / height)
            shift = max(0.0, (page_height - height) / 2)
            placed_panels = [_placed(p, (p.origin[0], p.origin[1] + shift)) for p in placed_panels]
            arrows = [_shift_arrow(a, shift) for a in arrows]
            texts[below_scheme:] = [replace(t, y=t.y + shift) for t in texts[below_scheme:]]
            height = page_height
        scene = Scene(style=style, width=page.page_width, height=height, bond_length=self.bl,
                      title=mechanism.title or mechanism.source_name, description=_description(self.trace),
                      panels=tuple(placed_panels), reaction_arrows=tuple(arrows), texts=tuple(texts),
                      notes=())
        return scene, self.fit


def _rows_within(widths: list[float], gap: float, limit: float) -> list[list[int]]:
    """The units (by index, in order) packed into rows no wider than `limit`, each row filled
    before the next is begun (a unit wider than the limit has a row of its own)."""
    rows: list[list[int]] = []
    width = 0.0
    for k, unit_width in enumerate(widths):
        if rows and width + gap + unit_width <= limit + 1e-6:
            rows[-1].append(k)
            width += gap + unit_width
        else:
            rows.append([k])
            width = unit_width
    return rows


_MOST_WRAPPINGS = 20_000   # ways of wrapping weighed one by one; a longer scheme is filled row by row
# How much of the largest scale any wrapping allows a wrapping may give up: a split that shrinks
# the drawing much is worse than the lone panel it avoids. For rows of which none is a lone panel
# (balanced), 10%; for moving a lone panel off the last row, 5%; for evenness otherwise, 5%.
_SCALE_GIVEN = {0: 0.9, 1: 0.95, 2: 0.95}
_SLIDE_SCALE_GIVEN = 0.98   # on a slide, a wrapping drawn this much smaller than the largest is not weighed
_HEIGHT_GIVEN = 1.1   # on a page that grows with the scheme, a wrapping this much taller than the least is not weighed


@dataclass
class _Wrapping:
    rows: list[list[int]]
    lone: int           # 0: no row a lone panel; 1: the first or the last only; 2: a middle one
    uneven: float       # the white the rows leave beside them, as a share of as many rows as wide as the widest
    height: float       # the rows' heights together, without the gaps between them
    scale: float        # the largest the page lets the scheme be drawn in these rows (at most the cap)


def _chosen_rows(widths: list[float], extents: list[tuple[float, float]], gap: float, avail: float,
                 row_gap: float = 0.0, room: Optional[float] = None, most: float = 1.0) -> list[list[int]]:
    """The units (by index, in order) wrapped into rows. On a page that grows with the scheme (room
    None: a journal's, whose type size is kept), into as few rows as fit the page's width (as
    filling each row before the next gives), no row wider than it; on a page of fixed height (a
    slide's, which the scheme is shrunk or enlarged up to `most` times to fill: `room` is the
    height the page leaves the rows, `row_gap` the gap between two), into at most that many, each
    drawn at the largest scale the page's width and height allow. On a page that grows, only the
    ones whose rows stand within 10% of the least tall together (page height is what a journal
    counts). Of those, one with no row a lone panel (a product alone on the last row reads as an
    afterthought; common practice), if one is drawn within 10% of the largest scale any is, else
    one lone only at its head or end before one lone in the middle, if drawn within 5% of it; of
    those, on a journal page the ones drawn within 5% of the largest scale among them, on a slide
    those within 2% in the fewest rows; then the most even, least white beside its rows (a scheme of four equal steps
    wraps two and two, not three and one with half a row empty; an editor's first request of a
    wrapped scheme), then the one drawn larger, the earlier rows fuller at a tie. `extents`: each
    unit's height above and below the row's centre line."""
    greedy = _rows_within(widths, gap, avail)
    if len(greedy) == 1:
        return greedy
    if room is not None and room <= 0:
        room = None   # a title taller than the page: the height tells no wrapping from another
    # (more rows than fit at the size drawn would only stand taller; a long scheme weighs as many
    # counts of rows as _MOST_WRAPPINGS allows, the most first, and is filled row by row beyond)
    counts = range(len(greedy), 0 if room is not None else len(greedy) - 1, -1)
    total = sum(widths)
    options, weighed = [], 0
    for count in counts:
        weighed += math.comb(len(widths) - 1, count - 1)
        if weighed > _MOST_WRAPPINGS:
            break
        for cuts in combinations(range(1, len(widths)), count - 1):
            bounds = (0,) + cuts + (len(widths),)
            rows = [list(range(a, b)) for a, b in zip(bounds, bounds[1:])]
            row_widths = [sum(widths[a:b]) + gap * (b - a - 1) for a, b in zip(bounds, bounds[1:])]
            if room is None and any(w > avail + 1e-6 and len(r) > 1 for w, r in zip(row_widths, rows)):
                continue   # wider than the page (a single unit wider than it is shrunk to fit anyway)
            height = sum(max(extents[k][0] for k in r) + max(extents[k][1] for k in r) for r in rows)
            widest = max(row_widths)
            scale = min(most, avail / widest)
            if room is not None:
                scale = min(scale, room / (height + row_gap * (count - 1)))
            uneven = round(1.0 - (total + gap * (len(widths) - count)) / (count * widest), 9)
            options.append(_Wrapping(rows, _lone_panels(rows), uneven, height, scale))
    if not options:
        return greedy
    if room is None:
        # Page height is what a journal counts: balance is sought among the nearly least tall.
        least = min(o.height for o in options)
        options = [o for o in options if o.height <= _HEIGHT_GIVEN * least]
    largest = max(o.scale for o in options)
    lone = min(o.lone for o in options if o.scale >= _SCALE_GIVEN[o.lone] * largest)
    options = [o for o in options if o.lone == lone]
    largest = max(o.scale for o in options)
    if room is None:
        options = [o for o in options if o.scale >= _SCALE_GIVEN[2] * largest]
        return min(options, key=lambda o: (o.uneven, -o.scale, [-len(r) for r in o.rows])).rows
    # On a slide size is what the room gives: of the wrappings drawn nearly as large as the largest,
    # the one in fewest rows (each row break is a turn in the reading), then the most even.
    options = [o for o in options if o.scale >= _SLIDE_SCALE_GIVEN * largest]
    return min(options, key=lambda o: (len(o.rows), o.uneven, -o.scale, [-len(r) for r in o.rows])).rows


def _lone_panels(rows: list[list[int]]) -> int:
    """How a wrapping leaves a panel alone on a row (_Wrapping.lone): a lone panel between two
    fuller rows breaks the scheme's reading more than one at its head or end."""
    if len(rows) == 1 or all(len(r) > 1 for r in rows):
        return 0
    return 2 if any(len(r) == 1 for r in rows[1:-1]) else 1


def _hydrogens_of_small_by_products(state: ElectronState, molecules: Sequence[Sequence[int]]) -> frozenset[int]:
    """The unlabelled hydrogen atoms of the molecules of at most three heavy atoms that are not the
    largest: in the last panel a hydronium or water that took a proton is written H3O+ or H2O, as
    chemists write it, not with that proton drawn out (the product keeps its own, to show where
    it went; a D or T is always drawn). `molecules`: the state's, as its _PanelSource holds them."""
    elements, mol = state.elements, state.mol
    heavy = [sum(1 for i in m if elements[i] != 1) for m in molecules]
    largest = max(heavy, default=0)
    return frozenset(h for m, n in zip(molecules, heavy) if n <= 3 and n < largest for h in m
                     if elements[h] == 1 and not mol.GetAtomWithIdx(h).GetIsotope())


def _drawable(moves: list[ResolvedMove], structure: PanelStructure) -> list[ResolvedMove]:
    """The moves whose atoms are all drawn on the panel."""
    return [m for m in moves if all(i in structure.positions for i in m.source_atoms + m.sink_atoms)]


def _formulas(mol: Chem.Mol, atoms: Sequence[int]) -> list[list[Piece]]:
    """Molecular formulas of the fragments made of `atoms`, as pieces with subscripts and charges."""
    wanted = set(atoms)
    out = []
    # Only the wanted fragments are cut out: about half the cost of cutting every fragment out in
    # one call (the rest of the molecule is the largest part), and the copies that call makes are
    # slower to name afterwards.
    for frag in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False):
        if set(frag) <= wanted:
            sub = fragment(mol, frag)
            sub.UpdatePropertyCache(strict=False)
            out.append(_byproduct_pieces(sub))
    return out


# Small by-products as chemists write them beside an arrow (common practice abbreviations);
# anything else is shown as its molecular formula.
CONDENSED = {"CO": "MeOH", "CCO": "EtOH", "CC(C)O": "i-PrOH", "CC(C)(C)O": "t-BuOH", "CC(=O)O": "AcOH",
             "CC(C)NC(C)C": "i-Pr2NH", "C[O-]": "MeO-", "CC[O-]": "EtO-", "CC(C)(C)[O-]": "t-BuO-",
             # the sulfonate and acetate leaving groups
             "CC(=O)[O-]": "AcO-", "CS(=O)(=O)[O-]": "MsO-", "Cc1ccc(S(=O)(=O)[O-])cc1": "TsO-",
             "O=S(=O)([O-])C(F)(F)F": "TfO-"}


@lru_cache(maxsize=None)
def _condensed_formulas() -> frozenset[str]:
    """Molecular formulas of the CONDENSED by-products: a fragment with any other formula is
    none of them, and is not canonicalised to find out."""
    return frozenset(CalcMolFormula(Chem.MolFromSmiles(smiles)) for smiles in CONDENSED)


def _byproduct_pieces(fragment: Chem.Mol) -> list[Piece]:
    formula = molecular_formula(fragment)   # a labelled fragment keeps its label: D2O, CH3[18O]-
    if formula in _condensed_formulas():
        try:
            work = Chem.Mol(fragment)
            for atom in atom_list(work):
                atom.SetAtomMapNum(0)
            Chem.SanitizeMol(work)
            smiles = Chem.MolToSmiles(Chem.RemoveHs(work, sanitize=False))
        except Exception:  # an odd fragment: its formula says enough
            smiles = ""
        if smiles in CONDENSED:
            text = CONDENSED[smiles]
            if text[1:2] == "-":   # an i- or t- prefix stays plain; the rest is typeset as a formula
                return [(text[:2], "n")] + condition_pieces(text[2:])
            return condition_pieces(text)
    pieces = formula_pieces(inorganic_order(formula))
    unpaired = sum(atom.GetNumRadicalElectrons() for atom in atom_list(fragment))
    if unpaired:   # a radical is written with its dot (Br•), as chemists do (common practice)
        pieces.append(("\u2022" * unpaired, "sup"))
    return pieces


def _panel_centre(panel: Panel) -> float:
    """The row's centre line passes through the middle of the panel's largest molecule, so the
    main structures of a row line up and small partners sit above or below them."""
    if not panel.atoms:
        return (panel.box.y0 + panel.box.y1) / 2
    group = {a.index: a.index for a in panel.atoms}
    # Each molecule's root is its lowest atom index; the roots are looked up in line (a few
    # thousand lookups a figure, a call each would cost more than the lookup).
    for bond in panel.bonds:
        a, b = bond.atoms
        while group[a] != a:
            a = group[a]
        while group[b] != b:
            b = group[b]
        if a < b:
            group[b] = a
        elif b < a:
            group[a] = b
    members: dict[int, list[float]] = {}
    for atom in panel.atoms:
        a = atom.index
        while group[a] != a:
            a = group[a]
        members.setdefault(a, []).append(atom.position[1])
    ys = max(members.values(), key=len)
    return (min(ys) + max(ys)) / 2


_INSIDE = 1e-9   # points: a curve's control points this far inside the box keep its samples inside too


def _panel_box(atoms, bonds, marks, arrows, pad: float) -> Box:
    boxes = [a.box for a in atoms if a.box is not None] + [m.box for m in marks if m.box is not None]
    points = [a.position for a in atoms if a.box is None]
    points += [end for b in bonds for line in b.lines for end in line]
    for a in arrows:
        points += a.head
    if not points and not boxes and not arrows:
        return Box(0, 0, 0, 0)
    # The points' coordinates split in one step (zip), then the boxes' edges: the extremes of
    # all of them, of equals the first met, as one list of everything would give.
    px, py = zip(*points) if points else ((), ())
    x0 = min(min(px, default=math.inf), min((b.x0 for b in boxes), default=math.inf))
    y0 = min(min(py, default=math.inf), min((b.y0 for b in boxes), default=math.inf))
    x1 = max(max(px, default=-math.inf), max((b.x1 for b in boxes), default=-math.inf))
    y1 = max(max(py, default=-math.inf), max((b.y1 for b in boxes), default=-math.inf))
    for a in arrows:
        # A Bezier curve lies within the box of its control points: when that box is well inside
        # what is already there, the curve's samples cannot widen the panel and are not worked out.
        cx, cy = (a.start[0], a.control1[0], a.control2[0], a.end[0]), (a.start[1], a.control1[1], a.control2[1], a.end[1])
        if not (x0 + _INSIDE < min(cx) and max(cx) < x1 - _INSIDE and y0 + _INSIDE < min(cy) and max(cy) < y1 - _INSIDE):
            shaft = a.shaft_points(16)
            sx, sy = [p[0] for p in shaft], [p[1] for p in shaft]
            x0, y0, x1, y1 = min(x0, min(sx)), min(y0, min(sy)), max(x1, max(sx)), max(y1, max(sy))
    return Box(x0 - pad, y0 - pad, x1 + pad, y1 + pad)


def _placed(panel: Panel, origin) -> Panel:
    # (made directly: dataclasses.replace reads every field by name first, at several times the cost)
    return Panel(panel.index, panel.step, (round(origin[0], 4), round(origin[1], 4)), panel.box, panel.atoms,
                 panel.bonds, panel.marks, panel.arrows, panel.placeholder)


def _shift_arrow(arrow: ReactionArrow, dy: float) -> ReactionArrow:
    move = lambda p: (p[0], p[1] + dy)
    return replace(arrow, start=move(arrow.start), end=move(arrow.end),
                   lines=tuple((move(a), move(b)) for a, b in arrow.lines),
                   heads=tuple(tuple(move(p) for p in h) for h in arrow.heads),
                   texts=tuple(replace(t, y=t.y + dy) for t in arrow.texts), box=arrow.box.shifted(0, dy))


def _run_box(builder: _SceneBuilder, run: TextRun) -> Box:
    face = builder.bold if run.bold else builder.italic if run.italic else builder.face
    return Box(run.x, run.y - face.cap_height * run.size, run.x + face.width(run.text, run.size),
               run.y + 0.22 * run.size)


def _description(trace: Trace) -> str:
    """Plain-language summary for screen readers: caption, then the steps."""
    mechanism = trace.mechanism
    parts = []
    if mechanism.caption:
        parts.append(mechanism.caption.rstrip(".") + ".")
    steps = []
    for k, step in enumerate(mechanism.steps):
        extra = []
        if step.kind != "forward":
            extra.append(step.kind)
        if step.over:
            extra.append(step.over)
        if step.under:
            extra.append(step.under)
        moves = "; ".join(str(m) for m in step.moves)
        steps.append(f"step {k + 1}, {step.label}" + (f" ({', '.join(extra)})" if extra else "")
                     + (f": {moves}" if moves else ""))
    if steps:
        parts.append(f"Curved-arrow mechanism in {len(steps)} step{'s' if len(steps) != 1 else ''}: "
                     + "; ".join(steps) + ".")
    return " ".join(parts)
