"""`arrows collect` as a library: many mechanism files -> one checked, numbered, captioned PDF
document, each scheme's SVG and PDF, and an HTML index.

The run goes in phases: (1) check and draw every scheme in worker processes, through the cache;
(2) lay out the pages; (3) turn the pages not already cached into PDF, again in workers; (4) merge
them and write everything into a temporary folder beside the output; (5) swap it into place. An
interrupted run stops before (5), so the previous output stays as it was, and whatever was drawn
before the interruption is in the cache for the next run.

Output of `-o DIR/NAME.pdf`: DIR/NAME.pdf and the folder DIR/NAME-figures/ holding index.html and
LABEL-FILE.svg / .pdf for every scheme that has a figure.
"""
from __future__ import annotations

import os
import shutil
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Callable, Optional

from ..atomic import remove_stale_temps, replace_dir, temp_dir_beside
from ..user_cache import user_cache_folder
from .cache import PDF, SVG, Cache, document_key, page_key, tool_fingerprint
from .document import compose, scheme_blocks
from .figures import FigureJob, FigureOutcome, look_up, make_figure
from .index_html import index_html
from .pages import DEFAULT_TITLE, Front, PageSetup, print_size_note, title_page_note
from .parallel import WorkerPool
from .pdf import DocumentPage, merge, svg_to_pdf
from .record import SchemeRecord
from .sources import Source

FOLDER_SUFFIX = "-figures"
DEFAULT_CACHE = "collect"       # the cache's folder in the user's cache folder (arrows.user_cache)
MARKER = ".arrows-collect"      # marks a figures folder as ours, so we never replace anyone else's

# progress(phase, done, total, record): phase "scheme" (record given) or "page" (record None)
Progress = Callable[[str, int, int, Optional[SchemeRecord]], None]


class OutputInUse(Exception):
    """The figures folder's name is taken by a folder that arrows did not make."""


@dataclass(frozen=True)
class CollectSettings:
    output: Path
    style: str
    front: Front = field(default_factory=Front)
    paper: str = "a4"
    flow: bool = False
    prefix: str = "S"
    jobs: int = 1
    cache_dir: Optional[Path] = None    # default: DEFAULT_CACHE in the user's cache folder
    fail_fast: bool = False
    source_paths: bool = True           # False: the document leaves the source files' paths out
    png_dpi: Optional[int] = None       # PNG figure files too, at this resolution

    @property
    def figures_dir(self) -> Path:
        return self.output.with_name(self.output.stem + FOLDER_SUFFIX)

    @property
    def cache_root(self) -> Path:
        """Kept out of the output's folder, which an author ships as it is (zipped for a journal).
        Keys name everything that decides an entry, so one cache serves every project."""
        return self.cache_dir or user_cache_folder() / DEFAULT_CACHE


@dataclass
class CollectResult:
    records: list[SchemeRecord]
    complete: bool                 # False: --fail-fast stopped at a failing scheme, nothing written
    pages: int = 0
    pages_converted: int = 0       # page PDFs made in this run (the rest came from the cache)
    notes: tuple[str, ...] = ()    # what the document's own pages could not show as written

    @property
    def failed(self) -> bool:
        return any(r.failed for r in self.records)


def collect(sources: list[Source], settings: CollectSettings, progress: Progress = lambda *a: None) -> CollectResult:
    output = settings.output
    cache = Cache(settings.cache_root)
    cache.prepare()   # first: a cache that cannot be made leaves no output folder behind
    output.parent.mkdir(parents=True, exist_ok=True)
    _check_folder_is_ours(settings.figures_dir)
    remove_stale_temps(output.parent)
    fingerprint = tool_fingerprint()
    setup = PageSetup(settings.paper, _font_family(settings.style), settings.source_paths)

    found = [look_up(s, settings.style, fingerprint, cache) for s in sources]
    jobs = [FigureJob(s, key, settings.style, cache.root) for s, key in zip(sources, found) if isinstance(key, str)]
    records: list[SchemeRecord] = []
    with WorkerPool(settings.jobs) as pool:     # processes start only when there is work for them
        drawn = pool.map(make_figure, jobs)
        for known in found:
            outcome = next(drawn) if isinstance(known, str) else known
            record = _record(len(records) + 1, settings.prefix, outcome, digits=len(str(len(sources))))
            records.append(record)
            progress("scheme", len(records), len(sources), record)
            if settings.fail_fast and record.failed:
                return CollectResult(records, complete=False)

        document, page_count, converted, page_notes = _document(pool, cache, fingerprint, setup, settings, records,
                                                                progress)
        records = [replace(r, layout_notes=r.layout_notes + (page_notes[r.label],)) if r.label in page_notes else r
                   for r in records]
        pngs: dict[str, Path] = {}
        if settings.png_dpi:
            pngs, problems = _pngs(pool, cache, records, settings.png_dpi)
            records = [replace(r, layout_notes=r.layout_notes + (problems[r.label],)) if r.label in problems else r
                       for r in records]
    _write_output(settings, records, document, cache, pngs)
    notes = tuple(note for note in [title_page_note(setup, settings.front)] if note)
    return CollectResult(records, complete=True, pages=page_count, pages_converted=converted, notes=notes)


def _document(pool: WorkerPool, cache: Cache, fingerprint: str, setup: PageSetup, settings: CollectSettings,
              records: list[SchemeRecord], progress: Progress) -> tuple[bytes, int, int, dict[str, str]]:
    """The merged PDF, its page count, how many pages were converted in this run, and by scheme
    label the notes of the page layout (text printed too small: print_size_note). A document
    whose every part is unchanged comes whole from the cache, its notes with it; otherwise only the
    pages not cached are converted (in the workers) before merging."""
    key = document_key(fingerprint, _document_parts(settings, setup, records))
    stored = cache.load_document(key)
    if stored is not None:
        document, count, notes = stored
        return document, count, 0, notes

    def figure_svg(record: SchemeRecord) -> Optional[str]:
        if not record.has_figure:
            return None
        return cache.figure_file(record.key, SVG).read_text(encoding="utf-8")

    blocks = scheme_blocks(setup, records, figure_svg)
    notes = {block.record.label: note for block in blocks if (note := print_size_note(setup, block))}
    pages = compose(setup, settings.front, records, blocks, settings.flow)
    keys = [page_key(p.svg, fingerprint) for p in pages]
    todo = {k: p.svg for k, p in zip(keys, pages) if not cache.has_page(k)}
    for done, _ in enumerate(pool.map(_convert_page, [(cache.root, k, svg) for k, svg in todo.items()]), 1):
        progress("page", done, len(todo), None)
    document = merge([DocumentPage(cache.page_path(k).read_bytes(), p.bookmarks, tuple(p.links))
                      for k, p in zip(keys, pages)],
                     {"/Title": settings.front.title or DEFAULT_TITLE, "/Author": settings.front.authors})
    cache.store_document(key, document, len(pages), notes)
    return document, len(pages), len(todo), notes


def _document_parts(settings: CollectSettings, setup: PageSetup, records: list[SchemeRecord]) -> list:
    """Everything the document shows, as plain data: a figure enters by its cache key, which
    stands for its source, style and tool."""
    return [[setup.paper, setup.font_family, settings.flow, settings.prefix, list(vars(settings.front).values()),
             setup.source_paths],
            [[r.label, r.name, r.key, r.title, r.caption, list(r.diagnostics), r.figure_problem] for r in records]]


def png_name(dpi: int) -> str:
    return f"figure-{dpi}dpi.png"


def _pngs(pool: WorkerPool, cache: Cache, records: list[SchemeRecord],
          dpi: int) -> tuple[dict[str, Path], dict[str, str]]:
    """Each drawn figure as a PNG at dpi, kept in the cache beside its SVG (made in the workers
    when missing): the cached files by label, and by label why a PNG could not be made (too large)."""
    drawn = [r for r in records if r.has_figure]
    todo = [(cache.root, r.key, dpi) for r in drawn if not cache.figure_file(r.key, png_name(dpi)).is_file()]
    problems_by_key = {key: problem for key, problem in pool.map(_make_png, todo) if problem}
    paths, problems = {}, {}
    for record in drawn:
        if record.key in problems_by_key:
            problems[record.label] = f"no PNG file: {problems_by_key[record.key]}"
        elif (path := cache.figure_file(record.key, png_name(dpi))).is_file():
            paths[record.label] = path
    return paths, problems


def _make_png(job: tuple[Path, str, int]) -> tuple[str, Optional[str]]:
    """Worker: the figure's PNG into the cache (written atomically); the reason when too large."""
    from ..atomic import write_bytes
    from ..draw.export import ImageTooLarge, convert

    root, key, dpi = job
    cache = Cache(root)
    try:
        data = convert(cache.figure_file(key, SVG).read_text(encoding="utf-8"), "png", dpi)
    except ImageTooLarge as exc:
        return key, f"{exc.message}; {exc.hint.replace('--dpi', '--png')}"
    write_bytes(cache.figure_file(key, png_name(dpi)), data)
    return key, None


def _convert_page(job: tuple[Path, str, str]) -> str:
    root, key, svg = job
    Cache(root).store_page(key, svg_to_pdf(svg))
    return key


def _record(number: int, prefix: str, outcome: FigureOutcome, digits: int = 1) -> SchemeRecord:
    """digits: the width of the largest number, to which file names zero-pad theirs (S01-a.svg
    sorts before S10-b.svg in a file listing; the labels printed stay S1, S10)."""
    meta = outcome.meta
    return SchemeRecord(number=number, label=f"{prefix}{number}", file_label=f"{prefix}{number:0{digits}d}",
                        name=outcome.source.name,
                        slug=outcome.source.slug, title=meta["title"], caption=meta["caption"],
                        steps=meta["steps"], diagnostics=tuple(meta["diagnostics"]),
                        figure_problem=meta["figure_problem"], key=outcome.key, rendered=outcome.rendered,
                        figure_size=tuple(meta["figure_size"]) if meta.get("figure_size") else None,
                        layout_notes=tuple(meta.get("layout_notes", ())))


def _font_family(style: str) -> str:
    from ..draw import STYLES

    return STYLES[style].font_family


def _check_folder_is_ours(folder: Path) -> None:
    if folder.exists() and not (folder / MARKER).is_file():
        raise OutputInUse(f"{folder} exists and was not made by arrows collect; move it away or choose "
                          f"another output name")


def _write_output(settings: CollectSettings, records: list[SchemeRecord], document: bytes, cache: Cache,
                  pngs: dict[str, Path]) -> None:
    """Write everything into a temporary folder beside the output, then swap it into place."""
    building = temp_dir_beside(settings.output)
    try:
        folder = building / settings.figures_dir.name
        folder.mkdir()
        (folder / MARKER).write_text("made by arrows collect; replaced as a whole on every run\n")
        for record in records:
            if record.has_figure:
                shutil.copyfile(cache.figure_file(record.key, SVG), folder / f"{record.file_stem}.svg")
                shutil.copyfile(cache.figure_file(record.key, PDF), folder / f"{record.file_stem}.pdf")
            if record.label in pngs:
                shutil.copyfile(pngs[record.label], folder / f"{record.file_stem}.png")
        html = index_html(settings.front, records, settings.output.name)
        (folder / "index.html").write_text(html, encoding="utf-8")
        (building / settings.output.name).write_bytes(document)
        replace_dir(folder, settings.figures_dir)
        os.replace(building / settings.output.name, settings.output)
    finally:
        shutil.rmtree(building, ignore_errors=True)
