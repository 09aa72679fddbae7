"""SVG text -> PDF or PNG with cairosvg, and writing any output atomically."""
from __future__ import annotations

import os
import tempfile
from pathlib import Path


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


def write_atomic(path: str | os.PathLike, data: bytes) -> None:
    """Write to a temporary file in the same folder, then rename over path: a reader sees the old
    file or the whole new one, and a failure leaves no partial file."""
    target = Path(path)
    handle, temp = tempfile.mkstemp(dir=target.parent or Path("."), prefix=f".{target.name}.", suffix=".tmp")
    try:
        with os.fdopen(handle, "wb") as out:
            out.write(data)
        os.replace(temp, target)
    except BaseException:
        try:
            os.unlink(temp)
        except FileNotFoundError:
            pass
        raise
