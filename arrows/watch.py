"""Re-running a job each time a mechanism file is saved (`arrows draw --watch`).

Saves are seen through the operating system's file events (inotify, FSEvents, ReadDirectoryChanges)
by way of the watchfiles package: the process sleeps until the file changes, it does not poll.
The folder is watched rather than the file itself, because many editors save by writing a new
file and renaming it over the old one.
"""
from __future__ import annotations

import threading
from pathlib import Path
from typing import Callable, Iterator, Optional, TypeVar

Result = TypeVar("Result")
DEBOUNCE_MS = 150   # one save often comes as several events (truncate, write, rename): count it once


def saves(source: str | Path, stop: Optional[threading.Event] = None, debounce_ms: int = DEBOUNCE_MS) -> Iterator[None]:
    """Yield once per save of `source` until `stop` is set (or Ctrl-C)."""
    import watchfiles

    target = Path(source).resolve()

    def is_target(change: watchfiles.Change, path: str) -> bool:
        return change != watchfiles.Change.deleted and Path(path) == target

    for _ in watchfiles.watch(target.parent, watch_filter=is_target, debounce=debounce_ms, stop_event=stop,
                              recursive=False, raise_interrupt=False):
        yield


def rerun_on_save(source: str | Path, job: Callable[[Path], Result], report: Callable[[Result], None],
                  stop: Optional[threading.Event] = None, debounce_ms: int = DEBOUNCE_MS) -> int:
    """Run job(source) now and after every save of `source`, handing each result to `report`.

    Returns how many times the job ran, once `stop` is set or the user presses Ctrl-C.
    """
    source = Path(source)
    report(job(source))
    runs = 1
    for _ in saves(source, stop, debounce_ms):
        report(job(source))
        runs += 1
    return runs


def render_figure(source: Path, output: Path, fmt: str = "svg", style=None, force: bool = False, dpi: int = 300):
    """Load, check and draw `source` into `output` (written atomically); return the diagnostics.

    When the file does not parse, or has errors and `force` is off, the last figure stays in
    place and the diagnostics say why: the author keeps the last good drawing while editing.
    """
    from .api import Diagnostics, checked
    from .atomic import write_bytes
    from .diagnostics import ERROR, MechanismError
    from .language import load

    try:
        mechanism = load(source)
    except MechanismError as exc:
        return Diagnostics(exc.diagnostics)
    trace, diagnostics = checked(mechanism)
    if trace.initial is None or (not force and any(d.severity == ERROR for d in diagnostics)):
        return diagnostics
    from .draw import render
    write_bytes(output, render(trace, fmt, style=style, dpi=dpi, force=force, diagnostics=diagnostics))
    return diagnostics
