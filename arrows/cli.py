"""Command line: argument handling, output formatting and exit codes only. Each command lives in
its own module and is imported only when it runs, so `arrows check` never loads drawing code."""
from __future__ import annotations

import importlib
import os

import click

# command name -> "module:function"
COMMANDS = {
    "check": "arrows.commands.check:check_command",
    "trace": "arrows.commands.trace:trace_command",
    "explain": "arrows.commands.explain:explain_command",
    "collect": "arrows.commands.collect:collect_command",
    "export": "arrows.commands.export:export_command",
    "import": "arrows.commands.import_:import_command",
    "number": "arrows.commands.number:number_command",
    "new": "arrows.commands.new:new_command",
    "draw": "arrows.commands.draw:draw_command",
    "closures": "arrows.commands.closures:closures_command",
}

# One line each for `arrows --help`, written here so that listing the commands imports none of them.
SUMMARIES = {
    "check": "Replay the electron moves and check every intermediate.",
    "trace": "Print every state: SMILES, formula, charge, what changed.",
    "explain": "Say what a diagnostic code means, with an example.",
    "collect": "Check and draw many mechanisms into one SI document.",
    "export": "Write a checked mechanism as JSON or reaction SMILES.",
    "import": "Read a JSON mechanism and print it as .mech text.",
    "number": "Put a map number on every heavy atom of a SMILES.",
    "new": "Start NAME.mech from a SMILES, its atoms numbered.",
    "draw": "Draw a mechanism as one scheme (SVG, PDF or PNG).",
    "closures": "Rank the ring closures a species offers (Baldwin's rules).",
}

EXIT_USAGE = 2   # commands exit 0 clean, 1 findings; the group itself only reports bad usage
EXIT_INTERRUPTED = 130   # the shell's convention for a run stopped by Ctrl-C (128 + SIGINT)
EXIT_TERMINATED = 143    # and by SIGTERM (128 + 15), as a timed-out CI or cluster job is stopped
EXIT_INTERNAL = 70   # a bug in arrows itself (EX_SOFTWARE of BSD's sysexits.h), never the user's input


class LazyGroup(click.Group):
    def list_commands(self, ctx):
        return sorted(COMMANDS)

    def format_commands(self, ctx, formatter):
        with formatter.section("Commands"):
            formatter.write_dl([(name, SUMMARIES[name]) for name in self.list_commands(ctx)])

    def get_command(self, ctx, name):
        target = COMMANDS.get(name)
        if target is None:
            return None
        module, attr = target.split(":")
        return getattr(importlib.import_module(module), attr)


@click.group(cls=LazyGroup, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(package_name="arrows")
def cli():
    """Check curved-arrow mechanisms electron by electron, and draw them."""


def main() -> None:
    from .interrupts import terminate_as_interrupt
    from .rdkit_io import quiet_rdkit   # only the command line silences a library's log
    quiet_rdkit()
    try:
        # SIGTERM unwinds as Ctrl-C does, for every command: temporary outputs (arrows.atomic)
        # are removed, worker pools stopped, and the previous output is left as it was.
        with terminate_as_interrupt():
            cli.main(standalone_mode=False)
    except click.exceptions.Abort as exc:
        # click turns Ctrl-C (KeyboardInterrupt) into Abort; `collect` says more and exits itself
        if isinstance(exc.__cause__ or exc.__context__, KeyboardInterrupt):
            _stopped(exc.__cause__ or exc.__context__)
        click.echo("aborted", err=True)
        raise SystemExit(EXIT_USAGE)
    except KeyboardInterrupt as exc:
        _stopped(exc)
    except click.ClickException as exc:
        exc.show()
        raise SystemExit(EXIT_USAGE)
    except click.exceptions.Exit as exc:
        raise SystemExit(exc.exit_code)
    except Exception as exc:
        # A bug of ours, not a fault of the input: one line saying so instead of a traceback;
        # ARROWS_TRACEBACK=1 shows where it happened.
        if os.environ.get("ARROWS_TRACEBACK"):
            raise
        click.echo(f"arrows: internal error ({type(exc).__name__}: {exc}). This is a bug in arrows, not in the "
                   "input: please report it with the input file (ARROWS_TRACEBACK=1 shows where it happened).",
                   err=True)
        raise SystemExit(EXIT_INTERNAL)


def _stopped(interrupt: KeyboardInterrupt) -> None:
    from .interrupts import Terminated
    if isinstance(interrupt, Terminated):
        click.echo("terminated", err=True)
        raise SystemExit(EXIT_TERMINATED)
    click.echo("interrupted", err=True)
    raise SystemExit(EXIT_INTERRUPTED)
