"""Scene -> SVG text. Writes what the scene says and decides nothing: every position is the
scene's. Numbers are rounded to 0.01 pt so the same scene always gives the same bytes; every
piece of user text is escaped."""
from __future__ import annotations

import re
from functools import lru_cache
from xml.sax.saxutils import escape as _escape, quoteattr as _quoteattr

from .scene import Mark, Panel, ReactionArrow, Scene, TextRun
from .styles import INK


# What XML 1.0 forbids in a document (its Char production): C0 controls but tab, line feed and
# carriage return, lone surrogates, U+FFFE and U+FFFF. The language refuses them in quoted text;
# text from elsewhere (JSON, the API) that holds one is written with U+FFFD in its place, so
# that the SVG stays well-formed.
_NOT_XML = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def escape(text: str) -> str:
    return _escape(_NOT_XML.sub("\ufffd", text))


def quoteattr(text: str) -> str:
    return _quoteattr(_NOT_XML.sub("\ufffd", text))


def _n(v: float) -> str:
    return _trimmed(f"{v:.2f}")


def _trimmed(text: str) -> str:
    """A number written with two decimals, without their trailing zeros (nor the point with both)."""
    if text[-1] != "0":   # (most numbers: nothing to strip, and "-0.00" ends in a zero)
        return text
    text = text.rstrip("0").rstrip(".")
    return "0" if text == "-0" else text


def _pt(p) -> str:
    # Both numbers in one formatting call, trimmed as _n trims them only where one ends in a zero
    # (most points need nothing): a point is written some ten thousand times a figure.
    text = "%.2f %.2f" % (p[0], p[1])
    if text[-1] != "0" and "0 " not in text:
        return text
    x, y = text.split(" ")
    return f"{_trimmed(x)} {_trimmed(y)}"


@lru_cache(maxsize=None)
def _size(size: float) -> str:
    """A font size as _n writes it: a figure has a few sizes, each written hundreds of times."""
    return _n(size)


def _colour_attr(colour: str, attr: str) -> str:
    return "" if colour == INK else f' {attr}="{colour}"'


def _text(run: TextRun) -> str:
    # Both coordinates in one formatting call, as _pt does: _n writes each so unless it ends in a zero.
    xy = 'x="%.2f" y="%.2f"' % (run.x, run.y)
    if '0"' in xy:
        xy = f'x="{_n(run.x)}" y="{_n(run.y)}"'
    attrs = f'{xy} font-size="{_size(run.size)}"'
    if run.bold:
        attrs += ' font-weight="bold"'
    if run.italic:
        attrs += ' font-style="italic"'
    attrs += _colour_attr(run.colour, "fill")
    return f"<text {attrs}>{escape(run.text)}</text>"


def _polygon(points, colour: str) -> str:
    d = "M" + " L".join([_pt(p) for p in points]) + " Z"   # (join reads a list faster than a generator)
    return f'<path d="{d}"{_colour_attr(colour, "fill")}/>'


def _mark(mark: Mark, line_width: float) -> list[str]:
    if mark.kind == "error":
        x, y = (mark.box.x0 + mark.box.x1) / 2, (mark.box.y0 + mark.box.y1) / 2
        return [f'<circle cx="{_n(x)}" cy="{_n(y)}" r="{_n(mark.radius)}" fill="none" stroke="{mark.colour}" '
                f'stroke-dasharray="{_n(2 * line_width)} {_n(1.5 * line_width)}"/>']
    if mark.dots:
        tail = f' r="{_n(mark.radius)}"{_colour_attr(mark.colour, "fill")}/>'
        return [f'<circle cx="{_n(x)}" cy="{_n(y)}"{tail}' for x, y in mark.dots]
    return [_text(r) for r in mark.runs]


def _strokes(d: str, colour: str, cls: str) -> str:
    return f'<path class="{cls}" d="{d}"{_colour_attr(colour, "stroke")}/>'


def _panel(panel: Panel, line_width: float, bond_paths: dict, written: dict) -> list[str]:
    """Strokes (bonds, arrow shafts, error rings) in one group, fills (text, dots, heads) in another.
    `bond_paths` keeps the path of every bond written so far in the figure: an atom that does not
    move has the same coordinates in every panel, so most bonds come again, and are written once.
    `written` keeps the elements of every bond and label drawing met so far, by identity: the
    scene hands the same drawing to every panel where nothing about it changed."""
    strokes, fills = [], []
    for bond in panel.bonds:
        if bond.outline:   # a solid wedge is filled, not stroked
            fills.append(_polygon(bond.outline, bond.colour))
            continue
        element = written.get(id(bond))
        if element is None:
            if bond.line_colours:   # one path per colour, in the order the colours first come
                by_colour: dict[str, list[str]] = {}
                for (p, q), colour in zip(bond.lines, bond.line_colours):
                    by_colour.setdefault(colour, []).append(f"M{_pt(p)} L{_pt(q)}")
                element = "\n".join([_strokes(" ".join(parts), colour, "bond") for colour, parts in by_colour.items()])
            else:
                path = bond_paths.get(bond.lines)
                if path is None:
                    path = bond_paths[bond.lines] = " ".join([f"M{_pt(p)} L{_pt(q)}" for p, q in bond.lines])
                element = _strokes(path, bond.colour, "bond")
            written[id(bond)] = element
        strokes.append(element)
    for arrow in panel.arrows:
        d = f"M{_pt(arrow.start)} C{_pt(arrow.control1)} {_pt(arrow.control2)} {_pt(arrow.end)}"
        strokes.append(_strokes(d, arrow.colour, "move"))
        fills.append(_polygon(arrow.head, arrow.colour))
    for atom in panel.atoms:
        if atom.runs:
            texts = written.get(id(atom))
            if texts is None:
                texts = written[id(atom)] = [_text(r) for r in atom.runs]
            fills += texts
    for mark in panel.marks:
        (strokes if mark.kind == "error" else fills).extend(_mark(mark, line_width))
    fills += [_text(r) for r in panel.placeholder]
    return [f'<g class="panel" transform="translate({_pt(panel.origin)})">',
            '<g fill="none">', *strokes, "</g>", '<g stroke="none">', *fills, "</g>", "</g>"]


def _reaction(arrow: ReactionArrow) -> list[str]:
    d = " ".join(f"M{_pt(p)} L{_pt(q)}" for p, q in arrow.lines)
    return [f'<path class="reaction" d="{d}" fill="none"/>', '<g stroke="none">',
            *[_polygon(h, INK) for h in arrow.heads], *[_text(t) for t in arrow.texts], "</g>"]


def scene_to_svg(scene: Scene) -> str:
    style = scene.style
    lw = style.line_width
    family = quoteattr(f"{style.font_family}, sans-serif")
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="{_n(scene.width)}pt" '
        f'height="{_n(scene.height)}pt" viewBox="0 0 {_n(scene.width)} {_n(scene.height)}" '
        f'role="img" aria-labelledby="title desc">',
        f'<title id="title">{escape(scene.title)}</title>',
        f'<desc id="desc">{escape(scene.description)}</desc>',
        f'<g fill="{INK}" stroke="{INK}" stroke-width="{_n(lw)}" stroke-linecap="round" '
        f'stroke-linejoin="round" font-family={family}>',
        '<g stroke="none">' + "".join(_text(t) for t in scene.texts) + "</g>" if scene.texts else "",
    ]
    bond_paths: dict = {}
    written: dict = {}   # by id: every drawing stays alive in the scene while it is written
    for panel in scene.panels:
        lines += _panel(panel, lw, bond_paths, written)
    for arrow in scene.reaction_arrows:
        lines += _reaction(arrow)
    lines += ["</g>", "</svg>", ""]
    return "\n".join(filter(None, lines))   # (the empty lines left out)
