"""`arrows collect DIR-or-FILES -o OUT.pdf`: a supporting-information document in one command."""
from __future__ import annotations

import os
import re
import sys
from pathlib import Path

import click

from ._args import LocatedPath, plain_text
from ..draw import STYLES
from ..draw.styles import DEFAULT_STYLE
from .output import cannot_write, refuse, refuse_unsafe_outputs



def _label_prefix(ctx, param, value: str) -> str:
    """The prefix goes into headings ("Scheme S3.") and file names: plain characters only."""
    if not re.fullmatch(r"[A-Za-z0-9_-]*", value):
        raise click.BadParameter(f"{value!r}: use letters, digits, - and _ (headings read \"Scheme {value}1.\" "
                                 "and the figure files are named after the label)", ctx=ctx, param=param)
    return value


@click.command("collect")
@click.argument("inputs", nargs=-1, required=True, type=LocatedPath())
@click.option("-o", "--output", required=True, type=LocatedPath(dir_okay=False),
              help="The PDF document (a name ending in .pdf); its figures and index.html go in the folder "
                   "OUT-figures/ beside it.")
@click.option("--style", type=click.Choice(sorted(STYLES)), default=DEFAULT_STYLE, show_default=True,
              help="Figure style preset, applied to every scheme.")
@click.option("--paper", type=click.Choice(["a4", "letter"]), default="a4", show_default=True)
@click.option("--flow", is_flag=True, help="Put as many schemes on a page as fit (default: one per page).")
@click.option("--prefix", default="S", show_default=True, callback=_label_prefix,
              help="Scheme numbers: PREFIX1, PREFIX2, ... (letters, digits, - and _).")
@click.option("--title", callback=plain_text, help="Document title; with a title the document opens with a title page.")
@click.option("--authors", callback=plain_text, help="Authors, for the title page and the PDF metadata.")
@click.option("--date", "date_text", metavar="TEXT", callback=plain_text, help="Date line for the title page (as written).")
@click.option("--no-source-paths", "no_source_paths", is_flag=True,
              help="Leave the source files' paths out of the PDF document (each scheme's status line says only "
                   "\"Checked: ...\"; an untitled scheme is headed by its file's name). The console, index.html "
                   "and the reports keep them.")
@click.option("--png", "png_dpi", type=click.IntRange(30, 2400), metavar="DPI", default=None,
              help="Also write each figure as a PNG file at DPI (e.g. --png 300) beside its SVG and PDF.")
@click.option("-j", "--jobs", type=click.IntRange(min=1), default=None,
              help="Worker processes [default: the machine's cores].")
@click.option("--cache", "cache_dir", type=LocatedPath(file_okay=False),
              help="Cache folder [default: arrows/collect in $XDG_CACHE_HOME, else in ~/.cache; never "
                   "beside the output].")
@click.option("--report", type=LocatedPath(dir_okay=False), help="Also write a JSON report of every scheme.")
@click.option("--junit", type=LocatedPath(dir_okay=False), help="Also write a JUnit XML file (one test per scheme).")
@click.option("--keep-going/--fail-fast", default=True, show_default=True,
              help="Collect every scheme whatever fails (default), or stop at the first scheme with errors "
                   "without writing the document.")
def collect_command(inputs, output, style, paper, flow, prefix, title, authors, date_text, no_source_paths, png_dpi,
                    jobs, cache_dir, report, junit, keep_going):
    """Check and draw every mechanism in INPUTS and collect them into one PDF: title page,
    contents, one numbered, captioned scheme per page, and a closing summary of every scheme's
    diagnostics. A folder stands for the .mech files below it, leaving out dot-files and
    dot-folders (.git, .ipynb_checkpoints, editor files), in natural order (2-a before 10-b);
    files named on their own are read in the order given.

    Exit status: 0 every scheme passed, 1 a scheme has errors (or a worker process died), 2 bad usage,
    130 interrupted (Ctrl-C), 143 terminated (SIGTERM). An unfinished run leaves the previous output as it was.
    """
    from .. import __version__
    from ..batch.collection import FOLDER_SUFFIX, CollectSettings, OutputInUse, collect
    from ..batch.pages import Front
    from ..batch.parallel import WorkerDied, default_jobs
    from ..interrupts import Terminated
    from ..cli import EXIT_INTERRUPTED, EXIT_TERMINATED
    from ..batch.reports import write_junit, write_report
    from ..batch.sources import NoSources, find_sources
    from ..diagnostics import MechanismError

    try:
        sources = find_sources(list(inputs))
    except NoSources as exc:
        raise click.UsageError(str(exc))
    except MechanismError as exc:   # a path that does not exist: worded as every command words it
        for d in exc.diagnostics:
            click.echo(d.to_text(), err=True)
        sys.exit(2)
    _refuse_unwritable_names(sources)
    refuse_unsafe_outputs({"-o": output, "--report": report, "--junit": junit}, [s.path for s in sources],
                          stdout=False, inside=Path(output).with_name(Path(output).stem + FOLDER_SUFFIX),
                          makes_its_folder=("-o",))
    if Path(output).suffix.lower() != ".pdf":
        refuse(f"-o {output} does not end in .pdf: collect writes one PDF document (the figures' SVG "
               "and PDF files go in the folder beside it)",
               f"end the name with .pdf: -o {Path(output).with_suffix('.pdf')}")
    if cache_dir is None:
        cache_dir = _default_cache()
    n = len(sources)
    front = Front(title, authors, date_text,
                  f"{n} scheme{'s' if n != 1 else ''}, checked and drawn with arrows {__version__} "
                  f"(style {style})")
    settings = CollectSettings(Path(output), style, front, paper, flow, prefix, jobs or default_jobs(),
                               Path(cache_dir), fail_fast=not keep_going,
                               source_paths=not no_source_paths, png_dpi=png_dpi)
    _refuse_inputs_in(settings.figures_dir, sources)
    untouched = (f"{output} is as it was" if Path(output).exists()   # (what a stopped run says of it)
                 else f"no PDF was written ({output} does not exist)")
    progress = _Progress(n)
    try:
        result = collect(sources, settings, progress)   # (SIGTERM raises Terminated: arrows.cli.main)
    except OSError as exc:   # the cache, the figures folder or the document (a read-only folder)
        progress.close()
        if _on_the_way_to(settings.cache_root, exc):
            refuse(f"cannot write the cache {settings.cache_root}: {exc.strerror or exc}",
                   "name a folder that can be written: --cache DIR")
        cannot_write(output, exc)
    except OutputInUse as exc:
        raise click.UsageError(str(exc))
    except KeyboardInterrupt as exc:   # Ctrl-C, or SIGTERM (Terminated, raised so by arrows.cli.main)
        progress.close()
        stopped = "terminated" if isinstance(exc, Terminated) else "interrupted"
        click.echo(f"{stopped}: {untouched}; the schemes drawn so far are cached and will not be "
                   "drawn again", err=True)
        sys.exit(EXIT_TERMINATED if isinstance(exc, Terminated) else EXIT_INTERRUPTED)
    except WorkerDied as exc:
        progress.close()
        click.echo(f"error: {exc}; {untouched}; run again to resume from the cache", err=True)
        sys.exit(1)
    progress.close()

    try:
        if report:
            write_report(Path(report), result.records, result.complete, __version__)
    except OSError as exc:
        cannot_write(report, exc)
    try:
        if junit:
            write_junit(Path(junit), result.records)
    except OSError as exc:
        cannot_write(junit, exc)
    failed = [r for r in result.records if r.failed]
    for note in result.notes:
        click.echo(f"{output}: note: {note}", err=True)
    for record in result.records:
        for note in record.layout_notes:
            click.echo(f"{record.label} {record.name}: note: {note}", err=True)
    for record in failed:
        click.echo(f"{record.label} {record.name}: {record.status()}", err=True)
        for d in record.diagnostics:
            if d["severity"] == "error":   # as `arrows check` prints it, for editors that jump to the place
                hint = f"\n    hint: {d['hint']}" if d.get("hint") else ""
                click.echo(f"{d['file']}:{d['line']}:{d['column']}: error {d['code']} {d['message']}{hint}", err=True)
        if record.figure_problem and not record.errors:
            click.echo(f"    {record.figure_problem}", err=True)
    if not result.complete:
        click.echo(f"stopped at {failed[-1].label} (--fail-fast); {untouched}", err=True)
    else:
        drawn = sum(r.drawn for r in result.records)
        cached = sum(r.cached for r in result.records)
        missing = f", {n - drawn - cached} without a figure" if n - drawn - cached else ""
        click.echo(f"{output}: {result.pages} pages, {n} scheme{'s' if n != 1 else ''} "
                   f"({n - len(failed)} passed, {len(failed)} with errors; {drawn} drawn, {cached} from the "
                   f"cache{missing}); figures and index.html in {settings.figures_dir}", err=True)
    sys.exit(1 if failed else 0)


def _on_the_way_to(folder: Path, exc: OSError) -> bool:
    """The file that failed is `folder`, inside it, or a folder on the way to it."""
    if not exc.filename:
        return False
    failed, folder = Path(os.fsdecode(exc.filename)).absolute(), folder.absolute()
    return failed == folder or folder in failed.parents or failed in folder.parents


def _default_cache() -> Path:
    from ..batch.collection import DEFAULT_CACHE
    from ..user_cache import user_cache_folder
    try:
        return user_cache_folder() / DEFAULT_CACHE
    except RuntimeError:   # no home folder to be found (HOME unset, no user entry)
        refuse("no cache folder: there is no home folder, and XDG_CACHE_HOME is not set",
               "name a cache folder: --cache DIR")


def _refuse_unwritable_names(sources) -> None:
    """A source's name heads its scheme and keys its cache entry: it must be text a PDF can hold
    (a byte of a file name that is not UTF-8 comes through as a lone surrogate)."""
    from ..language import first_unwritable
    for source in sources:
        bad = first_unwritable(source.name)
        if bad is not None:
            _, what = bad
            shown = source.name.encode("utf-8", "backslashreplace").decode()
            refuse(f"the file name {shown} holds {what}",
                   "rename the file with plain UTF-8 characters")


def _refuse_inputs_in(figures_dir: Path, sources) -> None:
    """Every run replaces the figures folder whole: a mechanism kept inside it would be lost."""
    inside = [s for s in sources if figures_dir.resolve() in s.path.resolve().parents]
    if inside:
        refuse(f"{inside[0].name} is inside {figures_dir}, which every run replaces whole",
               "move the mechanism out of that folder, or give -o another name")


class _Progress:
    """A progress bar on a terminal, one plain line per scheme otherwise (logs, CI)."""

    def __init__(self, total: int):
        self.bar = None
        if sys.stderr.isatty():
            from tqdm import tqdm
            self.bar = tqdm(total=total, unit="scheme", file=sys.stderr, leave=False)
        self.total = total
        self.pages_seen = False

    def __call__(self, phase, done, total, record):
        if phase == "scheme":
            if self.bar is not None:
                self.bar.update(1)
                self.bar.set_postfix_str(record.label)
            else:
                source = "drawn" if record.drawn else "cached" if record.cached else "no figure"
                click.echo(f"[{done}/{total}] {record.label} {record.name}: {record.status()} ({source})", err=True)
        elif self.bar is not None:
            if not self.pages_seen:
                self.bar.reset(total=total)
                self.bar.set_description("pages")
                self.pages_seen = True
            self.bar.update(1)
        elif done == total:
            click.echo(f"{total} page{'s' if total != 1 else ''} converted to PDF", err=True)

    def close(self):
        if self.bar is not None:
            self.bar.close()
