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


def checked(mechanism: Mechanism) -> tuple[Trace, Diagnostics]:
    """check(mechanism), remembered for as long as the Mechanism object lives."""
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


def draw(mechanism: Mechanism, fmt: str = "svg", style: Optional[str] = None, force: bool = False) -> bytes:
    """The figure of a mechanism as bytes (SVG, PDF or PNG); drawing code is imported only here.
    A mechanism with errors raises arrows.draw.DrawError unless force=True, which marks the errors
    on the figure."""
    from .draw import render
    trace, diagnostics = checked(mechanism)
    return render(trace, fmt, style=style, force=force, diagnostics=diagnostics)


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
