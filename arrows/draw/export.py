"""SVG text -> PDF or PNG with cairosvg. Outputs are written with arrows.atomic."""
from __future__ import annotations

import math
import re
from typing import Optional

# The most pixels a PNG may have: Pillow's own ceiling (Image.MAX_IMAGE_PIXELS, 89,478,485, times
# two), above which it refuses to open the image cairo has drawn, after the whole drawing. Measured
# here: some 9.5 bytes of memory a pixel at the peak (a two-column figure at 2400 dpi, 95 million
# pixels: 7 s and 0.93 GB), so the limit costs at most about 1.7 GB. cairo's image surfaces hold
# at most 32,767 pixels a side.
MAX_PNG_PIXELS = 178_956_970
MAX_PNG_SIDE = 32_767


class ImageTooLarge(ValueError):
    """A PNG too large to draw, found before drawing it."""

    def __init__(self, message: str, hint: str):
        super().__init__(f"{message}; {hint}")
        self.message, self.hint = message, hint


def png_size(width_pt: float, height_pt: float, dpi: int) -> tuple[int, int]:
    """The pixels of a PNG of a figure width_pt x height_pt points at dpi (rounded up)."""
    return math.ceil(width_pt * dpi / 72), math.ceil(height_pt * dpi / 72)


def png_size_problem(width_pt: float, height_pt: float, dpi: int) -> Optional[tuple[str, str]]:
    """(message, hint) when the PNG would be too large to draw; None when it can be drawn."""
    width, height = png_size(width_pt, height_pt, dpi)
    if width * height <= MAX_PNG_PIXELS and max(width, height) <= MAX_PNG_SIDE:
        return None
    fits = math.floor(dpi * min(math.sqrt(MAX_PNG_PIXELS / (width * height)), MAX_PNG_SIDE / max(width, height)))
    message = (f"a PNG of this figure at {dpi} dpi would be {width:,} x {height:,} pixels "
               f"({width * height / 1e6:,.0f} million); the limit is {MAX_PNG_PIXELS / 1e6:,.0f} million pixels "
               f"and {MAX_PNG_SIDE:,} a side")
    return message, (f"lower --dpi to {fits} or less, or write SVG or PDF, which keep every line sharp at "
                     "any size")


def _svg_size(svg: str) -> Optional[tuple[float, float]]:
    found = re.search(r'<svg[^>]*?\swidth="([0-9.]+)pt"\s+height="([0-9.]+)pt"', svg[:2000])
    return (float(found.group(1)), float(found.group(2))) if found else None


def convert(svg: str, fmt: str, dpi: int = 300) -> bytes:
    """PDF pages take their size from the SVG's width and height (points); PNG pixels are that
    size at dpi. A PNG too large to draw raises ImageTooLarge before any drawing."""
    data = svg.encode("utf-8")
    if fmt == "svg":
        return data
    import cairosvg
    if fmt == "pdf":
        return cairosvg.svg2pdf(bytestring=data)
    if fmt == "png":
        size = _svg_size(svg)
        problem = png_size_problem(*size, dpi) if size else None
        if problem:
            raise ImageTooLarge(*problem)
        return _flatten_on_white(cairosvg.svg2png(bytestring=data, dpi=dpi), dpi)
    raise ValueError(f"unknown format {fmt!r}")


def _flatten_on_white(png: bytes, dpi: int) -> bytes:
    """An opaque RGB PNG with its resolution recorded: a transparent PNG shows black on black in many
    viewers and slide tools, and the last, partly covered pixel row would stay half transparent."""
    import warnings
    from io import BytesIO

    from PIL import Image

    with warnings.catch_warnings():
        # The image is the one cairo has just drawn, its size checked beforehand (MAX_PNG_PIXELS):
        # Pillow's warning against images from elsewhere that unpack huge means nothing here.
        warnings.simplefilter("ignore", Image.DecompressionBombWarning)
        image = Image.open(BytesIO(png)).convert("RGBA")
    flat = Image.new("RGB", image.size, "white")
    flat.paste(image, mask=image.getchannel("A"))
    out = BytesIO()
    flat.save(out, "PNG", dpi=(dpi, dpi))
    return out.getvalue()
