"""A drawn figure's SVG, nested inside a page: its size in points, its root attributes and its
content, with ids made unique so that several figures can share one page."""
from __future__ import annotations

import re
from dataclasses import dataclass
from html import escape
from typing import Optional

MM = 72.0 / 25.4

_ROOT = re.compile(r"<svg\b([^>]*)>", re.S)
_ATTRIBUTE = re.compile(r'([\w:.-]+)\s*=\s*("[^"]*"|\'[^\']*\')', re.S)
_UNITS = {"": 0.75, "px": 0.75, "pt": 1.0, "mm": MM, "cm": 10 * MM, "in": 72.0, "pc": 12.0}
_LENGTH = re.compile(r"\s*([0-9.]+)\s*([a-z]*)\s*$")


@dataclass(frozen=True)
class Figure:
    """A figure's SVG ready to nest in a page: its root tag's attributes and its inner content,
    with its natural size in points."""

    attributes: dict[str, str]
    body: str
    width: float
    height: float

    def placed(self, x: float, y: float, scale: float, id_prefix: str) -> str:
        attrs = {k: v for k, v in self.attributes.items() if k not in ("x", "y", "width", "height")}
        attrs.setdefault("viewBox", f"0 0 {self.width / 0.75:.3f} {self.height / 0.75:.3f}")
        attrs.update(x=f"{x:.2f}", y=f"{y:.2f}", width=f"{self.width * scale:.2f}",
                     height=f"{self.height * scale:.2f}")
        tag = "<svg " + " ".join(f'{k}="{escape(v)}"' for k, v in attrs.items()) + ">"
        return tag + _prefixed_ids(self.body, id_prefix) + "</svg>"


def parse_figure(svg: str) -> Figure:
    match = _ROOT.search(svg)
    if match is None:
        raise ValueError("not an SVG document")
    attributes = {k: v[1:-1] for k, v in _ATTRIBUTE.findall(match.group(1))}
    body = svg[match.end():svg.rindex("</svg>")]
    view = [float(v) for v in re.split(r"[\s,]+", attributes.get("viewBox", "").strip()) if v]
    width = _points(attributes.get("width")) or (view[2] * 0.75 if len(view) == 4 else 300.0)
    height = _points(attributes.get("height")) or (view[3] * 0.75 if len(view) == 4 else 150.0)
    if len(view) != 4:   # without a viewBox the user units are the px of width and height
        attributes["viewBox"] = f"0 0 {width / 0.75:.3f} {height / 0.75:.3f}"
    return Figure(attributes, body, width, height)


def _points(length: Optional[str]) -> Optional[float]:
    match = _LENGTH.match(length or "")
    if not match or match.group(2) not in _UNITS:
        return None
    return float(match.group(1)) * _UNITS[match.group(2)]


def _prefixed_ids(body: str, prefix: str) -> str:
    """Give a figure's ids a prefix of its own, so two figures on one page cannot take each
    other's arrowheads or clip paths."""
    body = re.sub(r'\bid="([^"]+)"', lambda m: f'id="{prefix}{m.group(1)}"', body)
    body = re.sub(r"url\(#([^)]+)\)", lambda m: f"url(#{prefix}{m.group(1)})", body)
    return re.sub(r'((?:xlink:)?href)="#([^"]+)"', lambda m: f'{m.group(1)}="#{prefix}{m.group(2)}"', body)
