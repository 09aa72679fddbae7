"""SVG text -> PDF or PNG with cairosvg. Outputs are written with arrows.atomic."""
from __future__ import annotations


def convert(svg: str, fmt: str, dpi: int = 300) -> bytes:
    """PDF pages take their size from the SVG's width and height (points); PNG pixels are that
    size at dpi."""
    data = svg.encode("utf-8")
    if fmt == "svg":
        return data
    import cairosvg
    if fmt == "pdf":
        return cairosvg.svg2pdf(bytestring=data)
    if fmt == "png":
        return cairosvg.svg2png(bytestring=data, dpi=dpi)
    raise ValueError(f"unknown format {fmt!r}")
