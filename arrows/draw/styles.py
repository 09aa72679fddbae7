"""Figure styles: page size in physical units, fonts in points, line widths, colours.

Presets are named for their use. Sizes follow common practice for chemistry journals: a single
column is about 8.3 cm wide, a double column about 17.1 cm, and no text in artwork is smaller
than about 6 pt at print size (references.md, "Figures"; common practice, memory). A slide is
16:9 (13.33 x 7.5 in).
"""
from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Optional

MM = 72.0 / 25.4          # points per millimetre

# Okabe and Ito, "Color Universal Design" (2002): a palette that colour-blind readers can tell apart.
OKABE_ITO = {
    "black": "#000000", "orange": "#E69F00", "sky blue": "#56B4E9", "bluish green": "#009E73",
    "yellow": "#F0E442", "blue": "#0072B2", "vermillion": "#D55E00", "reddish purple": "#CC79A7",
}
INK = OKABE_ITO["black"]
FORMED_COLOUR = OKABE_ITO["blue"]
BROKEN_COLOUR = OKABE_ITO["vermillion"]
ERROR_COLOUR = OKABE_ITO["reddish purple"]
# Map numbers (--numbers, a drafting aid) in a colour of their own: in black, a number beside a
# label's lower right reads as a subscript (O3 as ozone), at its upper right as a charge.
NUMBER_COLOUR = OKABE_ITO["bluish green"]
SMALLEST_TEXT_PT = 6.0
# The text area of a journal page, which a figure in a column preset must fit: about 24 cm tall
# (common practice, memory: A4 or US letter less the margins, running heads and a caption's lines).
PAGE_TEXT_HEIGHT_MM = 240.0


@dataclass(frozen=True)
class Style:
    """Everything that decides how a scheme looks. Lengths in points unless named otherwise."""

    name: str
    page_width_mm: float
    page_height_mm: Optional[float]   # None: the page is as tall as the scheme
    margin_mm: float
    font_size: float                  # atom labels and text over/under reaction arrows
    bond_length: float
    line_width: float
    font_family: str = "DejaVu Sans"
    small_scale: float = 0.8          # subscripts, charges, map numbers, relative to font_size
    title_scale: float = 1.2
    color: bool = False               # highlight bonds formed and broken
    numbers: bool = False             # map numbers beside atoms (drafting)
    cip: bool = False                 # CIP labels (R/S, E/Z)
    show_title: bool = True
    step_labels: bool = False         # the step's own label under its reaction arrow
    ph_labels: bool = True            # spectator phenyls on phosphorus written "Ph" (draw/phenyls.py)
    # The user chose a font size, bond length or line width (with_options, as `arrows draw
    # --font-size` and `--line-width` do): the figure keeps those sizes, a slide's scheme is not
    # drawn larger to fill its page (scheme.build_scene).
    own_sizes: bool = False

    @property
    def page_width(self) -> float:
        return self.page_width_mm * MM

    @property
    def page_height(self) -> Optional[float]:
        return None if self.page_height_mm is None else self.page_height_mm * MM

    @property
    def margin(self) -> float:
        return self.margin_mm * MM

    @property
    def small_size(self) -> float:
        return self.font_size * self.small_scale

    @property
    def title_size(self) -> float:
        return self.font_size * self.title_scale

    def scaled(self, factor: float) -> "Style":
        """The same style with every drawn length (not the page) multiplied by factor."""
        return replace(self, font_size=self.font_size * factor, bond_length=self.bond_length * factor,
                       line_width=self.line_width * factor)

    def with_options(self, **changes) -> "Style":
        """Override fields; None values are ignored so CLI defaults pass through. A size given
        (font_size, bond_length, line_width) marks the style as sized by its user (own_sizes)."""
        chosen = {k: v for k, v in changes.items() if v is not None}
        if chosen.keys() & _SIZES:
            chosen.setdefault("own_sizes", True)
        return replace(self, **chosen)


_SIZES = frozenset({"font_size", "bond_length", "line_width"})


STYLES: dict[str, Style] = {
    "one-column": Style("one-column", page_width_mm=83.0, page_height_mm=None, margin_mm=1.5,
                        font_size=7.5, bond_length=13.0, line_width=0.6),
    "two-column": Style("two-column", page_width_mm=171.0, page_height_mm=None, margin_mm=2.0,
                        font_size=7.5, bond_length=13.0, line_width=0.6),
    "slide": Style("slide", page_width_mm=13.333 * 25.4, page_height_mm=7.5 * 25.4, margin_mm=10.0,
                   font_size=18.0, bond_length=32.0, line_width=1.5),
}
DEFAULT_STYLE = "two-column"
