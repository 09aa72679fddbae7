"""The library behind the CLI: load or parse a mechanism, replay it, check it, draw it."""
from __future__ import annotations

from pathlib import Path
from typing import Optional

from .checks import run_checks
from .diagnostics import Diagnostic, MechanismError
from .rdkit_io import rdkit_messages
from .language import load, parse
from .model import Mechanism
from .trace import Trace, replay


class Diagnostics(list):
    """A list of Diagnostic that Jupyter shows as a table (and `print` shows as compiler lines)."""

    _SEVERITY_COLOURS = {"error": "#D55E00", "warning": "#E69F00", "note": "#0072B2"}   # Okabe-Ito

    @property
    def errors(self) -> list[Diagnostic]:
        return [d for d in self if d.severity == "error"]

    @property
    def warnings(self) -> list[Diagnostic]:
        return [d for d in self if d.severity == "warning"]

    def passed(self, strict: bool = False) -> bool:
        """No errors (and, strict, no warnings): what `arrows check [--strict]` exits 0 on."""
        return not self.errors and not (strict and self.warnings)

    def __str__(self) -> str:
        return "\n".join(d.to_text() for d in self) or "no findings"

    def _repr_html_(self) -> str:
        import html   # only notebooks ask for it
        if not self:
            return "<p>no findings</p>"
        rows = []
        for d in self:
            colour = self._SEVERITY_COLOURS.get(d.severity, "inherit")
            cells = [f"{d.loc.line}:{d.loc.column}", f'<span style="color:{colour}">{d.severity}</span>', d.code,
                     html.escape(d.message), html.escape(d.hint or "")]
            rows.append("<tr>" + "".join(f"<td>{c}</td>" for c in cells) + "</tr>")
        head = "".join(f"<th>{h}</th>" for h in ("line:col", "severity", "code", "message", "hint"))
        return f'<table><thead><tr>{head}</tr></thead><tbody>{"".join(rows)}</tbody></table>'


def check(mechanism: Mechanism) -> tuple[Trace, Diagnostics]:
    """Replay and check a parsed mechanism. What RDKit logs on the way (a written structure it
    rejects) is said in the diagnostics, not printed: a library keeps off stderr."""
    with rdkit_messages():
        trace = replay(mechanism)
        return trace, Diagnostics(run_checks(trace))


# One replay per Mechanism object, so that .check(), .states and .draw() on the same Mechanism
# replay it once. Kept on the object itself: a cache held elsewhere (a dict keyed by the object)
# kept every mechanism alive, as the trace holds the mechanism that keys it.
_REPLAYED = "_arrows_replayed"


# What the command line checks and draws can be set to, here and by its options alike.
PKA_GAP_RANGE = (0, 100)        # pKa units (check --pka-gap)
FONT_SIZE_RANGE = (4, 72)       # points (draw --font-size)
LINE_WIDTH_RANGE = (0.1, 10)    # points (draw --line-width)
DPI_RANGE = (30, 2400)          # draw --dpi


def _within(name: str, value, bounds: tuple) -> None:
    if not bounds[0] <= value <= bounds[1]:   # (nan is within no bounds)
        raise ValueError(f"{name}={value!r} is outside {bounds[0]:g} to {bounds[1]:g}")


def checked(mechanism: Mechanism, pka_gap: Optional[float] = None) -> tuple[Trace, Diagnostics]:
    """check(mechanism), remembered for as long as the Mechanism object lives. A pka_gap other than
    the default (12; AR508's uphill threshold) is checked afresh, not remembered."""
    from .checks.protons import DEFAULT_PKA_GAP, pka_gap as gap_set_to
    if pka_gap is not None and pka_gap != DEFAULT_PKA_GAP:
        _within("pka_gap", pka_gap, PKA_GAP_RANGE)
        with gap_set_to(pka_gap):
            return check(mechanism)
    known = mechanism.__dict__.get(_REPLAYED)
    if known is None:
        known = check(mechanism)
        object.__setattr__(mechanism, _REPLAYED, known)   # (a frozen object: set past its guard)
    return known


def derived_mols(mechanism: Mechanism) -> list:
    """The starting state and the state after each derived step, as sanitized RDKit Mols (atom maps
    kept; hydrogens that moves name are explicit atoms). Stops where the replay stopped."""
    from rdkit import Chem
    mols = []
    for state in checked(mechanism)[0].states():
        mol = Chem.Mol(state.mol)
        Chem.SanitizeMol(mol)
        mols.append(mol)
    return mols


def figure_style(style=None, *, color: bool = False, numbers: bool = False, cip: bool = False,
                 step_labels: bool = False, ph_labels: bool = True, title: bool = True, font: Optional[str] = None,
                 font_size: Optional[float] = None, line_width: Optional[float] = None):
    """A style preset (one-column, two-column, slide; or an arrows.draw.Style) with the options of
    `arrows draw` applied, which builds its style here too: colour bonds formed and broken, map
    numbers, CIP labels, step labels under the reaction arrows, every atom drawn (ph_labels=False;
    by default each phenyl on phosphorus that no step touches is "Ph"), the title left out, the
    font family, the label font size and the line width (points)."""
    from .draw import DEFAULT_STYLE, STYLES, Style
    if isinstance(style, Style):
        base = style
    elif (style or DEFAULT_STYLE) in STYLES:
        base = STYLES[style or DEFAULT_STYLE]
    else:
        raise ValueError(f"unknown style {style!r}; use one of {', '.join(STYLES)}")
    if font_size is not None:
        _within("font_size", font_size, FONT_SIZE_RANGE)
    if line_width is not None:
        _within("line_width", line_width, LINE_WIDTH_RANGE)
    return base.with_options(color=color or None, numbers=numbers or None, cip=cip or None,
                             step_labels=step_labels or None, ph_labels=None if ph_labels else False,
                             show_title=None if title else False,
                             font_family=font, font_size=font_size, line_width=line_width)


def draw(mechanism: Mechanism, fmt: str = "svg", style=None, force: bool = False, *, dpi: int = 300,
         **options) -> bytes:
    """The figure of a mechanism as bytes (SVG, PDF or PNG; dpi for PNG); drawing code is imported
    only here. `options` are figure_style's (color, numbers, cip, step_labels, ph_labels, title,
    font, font_size, line_width). A mechanism with errors raises arrows.draw.DrawError unless
    force=True, which marks the errors on the figure; a PNG too large to draw raises
    arrows.draw.export.ImageTooLarge (a ValueError) before any drawing."""
    from .draw import render
    chosen = figure_style(style, **options)
    _within("dpi", dpi, DPI_RANGE)
    trace, diagnostics = checked(mechanism)
    return render(trace, fmt, style=chosen, dpi=dpi, force=force, diagnostics=diagnostics)


def check_text(text: str, name: str = "<text>") -> tuple[Trace | None, Diagnostics]:
    """Parse, replay and check; syntax problems come back as diagnostics, never as exceptions."""
    try:
        mechanism = parse(text, name)
    except MechanismError as exc:
        return None, Diagnostics(exc.diagnostics)   # the same type as a checked file's
    return check(mechanism)


def check_file(path: str | Path) -> tuple[Trace | None, Diagnostics]:
    try:
        mechanism = load(path)
    except MechanismError as exc:
        return None, Diagnostics(exc.diagnostics)   # the same type as a checked file's
    return check(mechanism)


def diagnose_file(path: str | Path) -> list[Diagnostic]:
    """check_file's diagnostics without the trace: a long file's steps and states are each let go
    once checked, so the memory does not grow with the number of steps."""
    from .checks import check_streaming
    try:
        mechanism = load(path, steps_on_demand=True)
    except MechanismError as exc:
        return exc.diagnostics
    return check_streaming(mechanism)
