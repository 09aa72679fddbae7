"""The library behind the CLI: load or parse a mechanism, replay it, check it."""
from __future__ import annotations

from pathlib import Path

from .checks import run_checks
from .diagnostics import Diagnostic, MechanismError
from .language import load, parse
from .model import Mechanism
from .trace import Trace, replay


def check(mechanism: Mechanism) -> tuple[Trace, list[Diagnostic]]:
    """Replay and check a parsed mechanism."""
    trace = replay(mechanism)
    return trace, run_checks(trace)


def check_text(text: str, name: str = "<text>") -> tuple[Trace | None, list[Diagnostic]]:
    """Parse, replay and check; syntax problems come back as diagnostics, never as exceptions."""
    try:
        mechanism = parse(text, name)
    except MechanismError as exc:
        return None, exc.diagnostics
    return check(mechanism)


def check_file(path: str | Path) -> tuple[Trace | None, list[Diagnostic]]:
    try:
        mechanism = load(path)
    except MechanismError as exc:
        return None, exc.diagnostics
    return check(mechanism)
