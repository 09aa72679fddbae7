"""Text widths for placing labels: measured with cairo's own font machinery, the same that turns
our SVG into PDF and PNG, so a label box in the scene is the box the reader sees.

Widths are the unhinted advances measured here at a large size and scaled (the SVG sets no
text-rendering hint: cairosvg garbles glyphs under geometricPrecision). cairosvg places each letter by its
own advance (no kerning); widths are summed the same way.
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache

_REFERENCE_SIZE = 1000.0


@dataclass(frozen=True)
class FontFace:
    """Per-em metrics of one font: advance widths and the heights used for boxes."""

    family: str
    bold: bool = False
    italic: bool = False

    def width(self, text: str, size: float) -> float:
        return _text_advance(self.family, self.bold, self.italic, text) * size

    @property
    def cap_height(self) -> float:
        """Height of a capital letter, per em."""
        return _heights(self.family)[0]

    @property
    def descent(self) -> float:
        return _heights(self.family)[1]

    def lacks(self, ch: str) -> bool:
        """The font has no glyph for the character: it prints as an empty box. Asked of the font
        itself, as cairo (which prints every figure and page) finds it: glyph 0 is the box."""
        return _lacks(self.family, self.bold, self.italic, ch)

    def wanting(self, texts) -> list[str]:
        """The characters of `texts` the font lacks, sorted, each once."""
        return sorted({c for text in texts for c in text if self.lacks(c)})

    def ink_middle(self, ch: str) -> float:
        """Height of the middle of a character's ink above the baseline, per em (where the stroke
        of a minus sign is)."""
        return _ink_middle(self.family, self.bold, self.italic, ch)


@lru_cache(maxsize=None)
def _context(family: str, bold: bool, italic: bool):
    import cairocffi as cairo
    surface = cairo.RecordingSurface(cairo.CONTENT_COLOR_ALPHA, None)
    context = cairo.Context(surface)
    options = cairo.FontOptions()
    options.set_hint_metrics(cairo.HINT_METRICS_OFF)
    options.set_hint_style(cairo.HINT_STYLE_NONE)
    context.set_font_options(options)
    context.select_font_face(family, cairo.FONT_SLANT_ITALIC if italic else cairo.FONT_SLANT_NORMAL,
                             cairo.FONT_WEIGHT_BOLD if bold else cairo.FONT_WEIGHT_NORMAL)
    context.set_font_size(_REFERENCE_SIZE)
    return context


@lru_cache(maxsize=4096)
def _text_advance(family: str, bold: bool, italic: bool, text: str) -> float:
    """Advance of a whole string, per em: a figure measures the same few labels again and again."""
    return sum(_advance(family, bold, italic, ch) for ch in text)


@lru_cache(maxsize=None)
def _advance(family: str, bold: bool, italic: bool, ch: str) -> float:
    return _context(family, bold, italic).text_extents(ch)[4] / _REFERENCE_SIZE


@lru_cache(maxsize=None)
def _lacks(family: str, bold: bool, italic: bool, ch: str) -> bool:
    glyphs = _context(family, bold, italic).get_scaled_font().text_to_glyphs(0, 0, ch, False)
    return any(index == 0 for index, _, _ in glyphs)


@lru_cache(maxsize=None)
def _ink_middle(family: str, bold: bool, italic: bool, ch: str) -> float:
    _, y_bearing, _, height, _, _ = _context(family, bold, italic).text_extents(ch)
    return -(y_bearing + height / 2) / _REFERENCE_SIZE


@lru_cache(maxsize=None)
def _heights(family: str) -> tuple[float, float]:
    context = _context(family, False, False)
    cap = -context.text_extents("H")[1] / _REFERENCE_SIZE
    descent = context.font_extents()[1] / _REFERENCE_SIZE
    return cap, descent


# A unit after a number stays on the number's line (-78 °C, 2 equiv, 3 h): typesetters tie
# them (common practice).
_UNIT = re.compile(r"^(?:°\S*|K|h|min|s|equiv|eq|mol%|M|mM|atm|bar|kbar|mL|L|mg|g|kg|mmol|mol|%)[,;.)]?$")


def wrap(text: str, face: FontFace, size: float, max_width: float) -> list[str]:
    """Break text at spaces (after commas where possible) into lines no wider than max_width;
    a single word wider than that keeps its own line. A unit stays with the number before it."""
    words: list[str] = []
    for word in text.split():
        if words and _UNIT.match(word) and words[-1][-1:].isdigit():
            words[-1] += " " + word
        else:
            words.append(word)
    lines: list[str] = []
    for word in words:
        if lines and face.width(lines[-1] + " " + word, size) <= max_width:
            lines[-1] += " " + word
        else:
            lines.append(word)
    return lines or [""]
