"""`arrows check FILE...`: compiler-style diagnostics and an exit code."""
from __future__ import annotations

import math
import sys

import click
from click.core import ParameterSource

from ._args import LocatedPath, with_folders_opened
from ..api import PKA_GAP_RANGE, diagnose_file
from ..diagnostics import ERROR, WARNING, to_json
from .output import cannot_write, refuse_unsafe_outputs


def _a_number(ctx, param, value: float) -> float:
    """FloatRange lets nan through (every comparison with it is false)."""
    if math.isnan(value):
        raise click.BadParameter("nan is not a number of pKa units", ctx=ctx, param=param)
    return value


@click.command("check")
@click.argument("files", nargs=-1, type=LocatedPath())   # a missing file is reported as AR100; a folder, opened
@click.option("--format", "fmt", type=click.Choice(["text", "json"]), default="text", show_default=True,
              help="text: file:line:col: severity CODE message; json: one array of diagnostics.")
@click.option("--strict", is_flag=True, help="Treat warnings as failures (exit 1).")
@click.option("--quiet", "-q", is_flag=True, help="Print only errors (with --jsonl: no summary line).")
@click.option("--jsonl", "jsonl", type=LocatedPath(dir_okay=False, allow_dash=True), metavar="FILE",
              help="Check a data set: one mechanism per line of FILE (- for stdin), one JSON result per line out.")
@click.option("-o", "--output", type=LocatedPath(dir_okay=False, writable=True),
              help="With --jsonl: write the results to this file (atomically) instead of stdout.")
@click.option("-j", "--jobs", type=click.IntRange(min=1), default=None,
              help="With --jsonl: worker processes [default: the machine's cores].")
@click.option("--cluster", metavar="ADDRESS",
              help="With --jsonl: run on the Dask scheduler at ADDRESS (pip install 'arrows[cluster]').")
@click.option("--states", "with_states", is_flag=True,
              help="With --jsonl: each result lists the canonical SMILES of the starting state and of the state "
                   "after each step replayed.")
@click.option("--pka-gap", type=click.FloatRange(*PKA_GAP_RANGE), default=12.0, show_default=True, callback=_a_number,
              help="Warn (AR508) when a proton transfer runs uphill by more than this many pKa units.")
def check_command(files, fmt, strict, quiet, jsonl, output, jobs, cluster, with_states, pka_gap):
    """Replay every electron move in FILES and check every intermediate. A folder stands for
    the .mech files below it, leaving out dot-files and dot-folders (.git, .ipynb_checkpoints,
    editor files); a file named on its own is always read.

    Exit status: 0 clean, 1 errors found (or warnings with --strict), 2 unreadable input (an empty
    data set too) or bad usage, 130 interrupted (Ctrl-C), 143 terminated (SIGTERM).
    """
    if jsonl is not None:
        if files:
            raise click.UsageError("give mechanism FILES or --jsonl FILE, not both")
        if click.get_current_context().get_parameter_source("fmt") is not ParameterSource.DEFAULT:
            raise click.UsageError("--format goes with mechanism FILES: --jsonl writes one JSON result per line")
        refuse_unsafe_outputs({"-o": output}, [jsonl])   # `-`: the file standard input was redirected from
        sys.exit(_check_jsonl(jsonl, output, jobs, cluster, strict, quiet, pka_gap, with_states))
    if not files:
        raise click.UsageError("give at least one mechanism file (or --jsonl FILE)")
    if output or jobs or cluster or with_states:
        raise click.UsageError("-o, --jobs, --cluster and --states go with --jsonl")
    from ..checks.protons import set_pka_gap
    click.get_current_context().call_on_close(set_pka_gap(pka_gap))
    everything, unreadable, failing = [], False, False
    files = with_folders_opened(files)
    for path in files:
        diags = diagnose_file(path) if isinstance(path, str) else [path]
        if any(d.code == "AR100" for d in diags):
            unreadable = True
        if any(d.severity == ERROR or (strict and d.severity == WARNING) for d in diags):
            failing = True
        everything.extend(diags)
        if fmt == "text":
            for d in diags:
                if quiet and d.severity != ERROR:
                    continue
                click.echo(d.to_text())
    if fmt == "json":   # (--quiet: the errors only, as in text)
        click.echo(to_json([d for d in everything if not quiet or d.severity == ERROR]))
    elif not quiet:
        n_err = sum(d.severity == ERROR for d in everything)
        n_warn = sum(d.severity == WARNING for d in everything)
        click.echo(f"{len(files)} file{'s' if len(files) != 1 else ''} checked: "
                   f"{n_err} error{'s' if n_err != 1 else ''}, {n_warn} warning{'s' if n_warn != 1 else ''}", err=True)
    sys.exit(2 if unreadable else 1 if failing else 0)


class _NoRecords(Exception):
    """The data set holds no record: raised inside the results file's block, so none is written."""


def _check_jsonl(path: str, output: str | None, jobs: int | None, cluster: str | None, strict: bool,
                 quiet: bool, pka_gap: float, with_states: bool) -> int:
    """`--jsonl`: stream the data set through the workers; results to stdout or, atomically, to -o."""
    from contextlib import nullcontext

    from ..atomic import atomic_file
    from ..batch.jsonl import check_stream, one_document
    from ..batch.parallel import ClusterPool, ClusterUnavailable, WorkerDied, WorkerPool, default_jobs
    from ..diagnostics import Diagnostic, cannot_read
    from ..model import Location

    source = "<stdin>" if path == "-" else path
    try:
        stream = sys.stdin.buffer if path == "-" else open(path, "rb")
    except OSError as exc:
        click.echo(cannot_read(path, exc).to_text(), err=True)
        return 2
    with stream:
        try:
            lines, records = one_document(stream)
        except OSError as exc:
            click.echo(cannot_read(source, exc).to_text(), err=True)
            return 2
        if lines:
            click.echo(Diagnostic(
                "AR110", f"this is one JSON document over {lines} lines, not JSON Lines (one record per line)",
                Location(source, 1, 1),
                hint="write each record on one line; a document of `arrows export FILE --to json` goes back to "
                     "a .mech file with `arrows import`").to_text(), err=True)
            return 2
        pool = ClusterPool(cluster) if cluster else WorkerPool(jobs or default_jobs())
        sink = atomic_file(output) if output else nullcontext(sys.stdout)
        # A consumer reading results from a pipe gets each as soon as it is made, and a line arriving
        # on a pipe is checked at once (not kept until a chunk of lines is full).
        live_out = not output and not _a_file(sys.stdout)
        live_in = not _a_file(stream)
        try:
            with pool, sink as out:
                write = out.write if not live_out else lambda text: (out.write(text), out.flush())
                tally = check_stream(source, records, write, pool, gap=pka_gap, live=live_in, with_states=with_states)
                if not tally.records:
                    raise _NoRecords()
        except _NoRecords:   # as a folder with no .mech file is (exit 2), and no results file is written
            click.echo(Diagnostic("AR100", "cannot read file: a data set with no records (empty, or blank lines only)",
                                  Location(source, 1, 1),
                                  hint="a data set holds one JSON record per line; was the file that made it "
                                       "left empty?").to_text(), err=True)
            return 2
        except ClusterUnavailable as exc:
            click.echo(f"error: {exc}", err=True)
            return 2
        except WorkerDied as exc:
            unwritten = f" and {output} was not written" if output else ""
            click.echo(f"error: {exc}; the results are incomplete{unwritten}", err=True)
            return 1
        except OSError as exc:   # the results file cannot be written (its folder is missing), or the input failed
            if output:
                cannot_write(output, exc)
            click.echo(cannot_read(source, exc).to_text(), err=True)
            return 2
    if not quiet:
        click.echo(f"{tally.records} record{'s' if tally.records != 1 else ''} checked ({tally.steps} step{'s' if tally.steps != 1 else ''}): "
                   f"{tally.ok} without errors, {tally.with_errors} with errors, "
                   f"{tally.with_warnings} with warnings", err=True)
    failing = tally.with_errors or (strict and tally.with_warnings)
    return 1 if failing else 0


def _a_file(stream) -> bool:
    """The stream is a regular file (not a pipe, FIFO, socket or terminal)."""
    import os
    import stat
    try:
        return stat.S_ISREG(os.fstat(stream.fileno()).st_mode)
    except (OSError, ValueError, AttributeError):   # (a stream with no file descriptor: a test's)
        return False
