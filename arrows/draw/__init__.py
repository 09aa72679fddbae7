"""Publication figures of a mechanism: Trace -> Scene (plain data) -> SVG -> PDF / PNG.

Imported only by code that draws: `arrows check` never loads this package. The heavy parts (layout,
arrow geometry, numpy) load on first use, so a batch that finds every figure in its cache, or a
command that only needs STYLES, does not pay for them.
"""
from __future__ import annotations

from typing import Optional, Sequence

from ..diagnostics import Diagnostic, ERROR
from ..trace import Trace
from .scene import Scene
from .styles import DEFAULT_STYLE, STYLES, Style

__all__ = ["build_scene", "render_svg", "render", "STYLES", "Style", "Scene", "DrawError", "DEFAULT_STYLE",
           "FORMATS"]

FORMATS = ("svg", "pdf", "png")


def _style(style: Optional[Style | str]) -> Style:
    if style is None:
        return STYLES[DEFAULT_STYLE]
    if isinstance(style, str):
        if style not in STYLES:
            raise ValueError(f"unknown style {style!r}; use one of {', '.join(STYLES)}")
        return STYLES[style]
    return style


def build_scene(trace: Trace, style: Optional[Style | str] = None,
                diagnostics: Optional[Sequence[Diagnostic]] = None) -> Scene:
    """The figure as data: panels, atom positions (points), bonds, labels, curved arrows with
    their control points and the source and sink they belong to, reaction arrows, text."""
    from ..rdkit_io import rdkit_messages
    from .scheme import build_scene as _build_scene
    with rdkit_messages():   # a library keeps off stderr (a product SMILES RDKit cannot read)
        return _build_scene(trace, _style(style), diagnostics or ())


def render_svg(trace: Trace, style: Optional[Style | str] = None, force: bool = False,
               diagnostics: Optional[Sequence[Diagnostic]] = None) -> str:
    """SVG text of the scheme. With errors among `diagnostics` (or in the trace) this raises
    DrawError unless force is set; then the errors are marked on the figure."""
    from .scheme import DrawError
    from .svg import scene_to_svg
    diags = list(diagnostics) if diagnostics is not None else list(trace.diagnostics)
    errors = [d for d in diags if d.severity == ERROR]
    if errors and not force:
        raise DrawError(f"the mechanism has {len(errors)} error{'s' if len(errors) != 1 else ''}; "
                        "fix them or draw anyway with force=True")
    return scene_to_svg(build_scene(trace, style, diags))


def render(trace: Trace, fmt: str, style: Optional[Style | str] = None, dpi: int = 300, force: bool = False,
           diagnostics: Optional[Sequence[Diagnostic]] = None) -> bytes:
    """The scheme as bytes in fmt: 'svg', 'pdf' or 'png' (dpi applies to PNG)."""
    from .export import convert
    if fmt not in FORMATS:
        raise ValueError(f"unknown format {fmt!r}; use one of {', '.join(FORMATS)}")
    return convert(render_svg(trace, style, force, diagnostics), fmt, dpi)


def __getattr__(name: str):
    if name == "DrawError":   # defined beside the layout code, loaded with it
        from .scheme import DrawError
        return DrawError
    raise AttributeError(f"module 'arrows.draw' has no attribute {name!r}")
