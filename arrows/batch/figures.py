"""One scheme of a batch: look it up in the cache (in the parent, cheaply), or check it, draw it
and keep it in the cache (in a worker process).

A cached scheme is not read beyond its bytes: the key says whether anything that decides the
figure has changed, so a warm run starts no worker at all. What comes back to the parent is small
(the key and the metadata); the pictures stay in the cache until the document is assembled.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Optional

from ..api import check_file
from ..diagnostics import ERROR
from .cache import Cache, FigureEntry, figure_key
from .embed import parse_figure
from .sources import Source


@dataclass(frozen=True)
class FigureJob:
    source: Source
    key: str
    style_name: str
    cache_root: Path


@dataclass(frozen=True)
class FigureOutcome:
    source: Source
    key: Optional[str]      # None: the file could not be read, nothing was cached
    rendered: bool          # False: taken from the cache
    meta: dict


def look_up(source: Source, style_name: str, fingerprint: str, cache: Cache) -> FigureOutcome | str:
    """The outcome when it needs no drawing (cached, or the file cannot be read); otherwise the
    cache key under which the drawing will be stored."""
    try:
        data = source.path.read_bytes()
    except OSError:
        _, diags = check_file_as(source)   # AR100 with the reason
        return FigureOutcome(source, None, True, _meta(source, None, diags, "no figure: the file could not be read"))
    key = figure_key(data, source.file_name, style_name, fingerprint)
    if cache.has_figure(key):
        return FigureOutcome(source, key, False, _renamed(cache.load_meta(key), source))
    return key


def _renamed(meta: dict, source: Source) -> dict:
    """A cached entry's metadata under the name this run gives the file: the entry may have been
    stored by a run that reached the same bytes by another path (absolute, from another folder,
    a copy of the folder)."""
    stored = meta["name"]
    diagnostics = [dict(d, file=source.name) if d.get("file") == stored else d for d in meta["diagnostics"]]
    return dict(meta, name=source.name, diagnostics=diagnostics)


def make_figure(job: FigureJob) -> FigureOutcome:
    """Worker entry point: draw one scheme and store it under its key."""
    entry = draw_scheme(job.source, job.style_name)
    Cache(job.cache_root).store_figure(job.key, entry)
    return FigureOutcome(job.source, job.key, True, entry.meta)


def draw_scheme(source: Source, style_name: str) -> FigureEntry:
    """Check the mechanism and draw it; errors are drawn marked on the figure, as far as the moves
    could be replayed. A figure that cannot be drawn is reported, not raised."""
    from ..draw import STYLES, build_scene
    from ..draw.scheme import DrawError
    from ..draw.svg import scene_to_svg
    from .pdf import svg_to_pdf

    trace, diags = check_file_as(source)
    svg, problem, notes = None, None, ()
    if trace is None or trace.initial is None:
        problem = "no figure: the mechanism could not be read (see the diagnostics)"
    else:
        try:
            # The page heading and the index carry the title: the figure does not repeat it. Errors
            # are drawn marked, as `arrows draw --force` draws them.
            style = STYLES[style_name].with_options(show_title=False)
            shown_trace, shown_diags = _shown_by_file_name(trace, diags, source)
            scene = build_scene(shown_trace, style, shown_diags)
            svg, notes = scene_to_svg(scene), scene.notes
        except DrawError as exc:   # the mechanism gives nothing to draw: said as the page's reader needs it
            problem = f"the figure could not be drawn: {exc}"
        except Exception as exc:  # any drawing failure is one scheme's failure, not the batch's
            problem = f"the figure could not be drawn (an internal error of arrows: {type(exc).__name__}: {exc})"
    pdf = svg_to_pdf(svg, title=_title(trace, source)) if svg is not None else None
    meta = _meta(source, trace, diags, problem)
    meta["layout_notes"] = list(notes)   # where the layout had to compromise: the figure wants a look
    if svg is not None:
        figure = parse_figure(svg)
        meta["figure_size"] = [figure.width, figure.height]
    return FigureEntry(meta, svg, pdf)


def check_file_as(source: Source):
    """check_file, with diagnostics naming the file as the batch shows it."""
    from dataclasses import replace

    trace, diags = check_file(source.path)
    real = str(source.path)
    return trace, [replace(d, loc=replace(d.loc, file=source.name)) if d.loc.file == real else d for d in diags]


def _shown_by_file_name(trace, diags, source: Source):
    """The trace and diagnostics as the figure shows them: its source by the file's own name, not
    the path (the untitled figure's <title>, the error list under a faulty scheme). The figure is
    then the same wherever the folder is (its cache key holds only the file name), and a document
    made with --no-source-paths carries no path in its figures either."""
    from dataclasses import replace

    shown = source.file_name
    trace = replace(trace, mechanism=replace(trace.mechanism, source_name=shown))
    diags = [replace(d, loc=replace(d.loc, file=shown)) if d.loc.file == source.name else d for d in diags]
    return trace, diags


def _title(trace, source: Source) -> str:
    """The figure PDF's title: the mechanism's, else the file's own name (as in the SVG)."""
    mechanism = trace.mechanism if trace is not None else None
    return (mechanism.title if mechanism is not None and mechanism.title else source.file_name)


def _meta(source: Source, trace, diags, problem: Optional[str]) -> dict:
    mechanism = trace.mechanism if trace is not None else None
    return {
        "name": source.name,
        "title": mechanism.title if mechanism is not None else None,
        "caption": mechanism.caption if mechanism is not None else None,
        "steps": len(mechanism.steps) if mechanism is not None else 0,
        "diagnostics": [d.to_dict() for d in diags],
        "errors": sum(d.severity == ERROR for d in diags),
        "figure_problem": problem,
    }
