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
        return _flatten_on_white(cairosvg.svg2png(bytestring=data, dpi=dpi), dpi)
    raise ValueError(f"unknown format {fmt!r}")


def _flatten_on_white(png: bytes, dpi: int) -> bytes:
    """An opaque RGB PNG with its resolution recorded: a transparent PNG shows black on black in many
    viewers and slide tools, and the last, partly covered pixel row would stay half transparent."""
    from io import BytesIO

    from PIL import Image

    image = Image.open(BytesIO(png)).convert("RGBA")
    flat = Image.new("RGB", image.size, "white")
    flat.paste(image, mask=image.getchannel("A"))
    out = BytesIO()
    flat.save(out, "PNG", dpi=(dpi, dpi))
    return out.getvalue()
