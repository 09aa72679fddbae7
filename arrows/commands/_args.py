"""Option and argument types shared by the commands, so that a bad value gets the project's
message form (`error: MESSAGE` and a hint, exit status 2) rather than a traceback or a
bare usage line."""
from __future__ import annotations

import math
import os
from typing import Optional

import click

EXIT_USAGE = 2


class Refused(click.ClickException):
    """Bad usage, said as every other refusal is: `error: MESSAGE` and a hint, exit status 2. The
    message names the path or option at fault; it has no line:col, since nothing was read at a
    place in a file. click shows it (and exits) both under `arrows` and under a test runner."""

    exit_code = EXIT_USAGE

    def __init__(self, message: str, hint: str):
        super().__init__(message)
        self.hint = hint

    def format_message(self) -> str:
        return f"error: {self.message}\n    hint: {self.hint}"

    def show(self, file=None) -> None:
        click.echo(self.format_message(), err=True)


def _shown_name(param: Optional[click.Parameter]) -> str:
    if param is None:
        return "the value"
    if isinstance(param, click.Argument):
        return param.human_readable_name
    return "/".join(param.opts)


class LocatedPath(click.Path):
    """click.Path whose refusals are located at the path and carry a hint."""

    def convert(self, value, param, ctx):
        try:
            return super().convert(value, param, ctx)
        except click.BadParameter as exc:
            name = _shown_name(param)
            path = os.fsdecode(value) if isinstance(value, bytes) else str(value)
            if not self.dir_okay and os.path.isdir(path):
                example = os.path.join(path, "NAME")
                raise Refused(f"{name} {path} is a folder; it takes a file name",
                              f"name a file inside the folder: {example}" if isinstance(param, click.Argument)
                              else f"name a file inside the folder: {name.split('/')[-1]} {example}") from None
            if not self.file_okay and os.path.exists(path) and not os.path.isdir(path):
                raise Refused(f"{name} {path} is a file; it takes a folder",
                              "name a folder, or a new name for one") from None
            raise Refused(f"{name} {path}: {exc.message}",
                          "check the path, and that its folder exists and is writable") from None


class FiniteFloatRange(click.FloatRange):
    """click.FloatRange lets nan through (every comparison with it is false), and inf where a
    bound is open: both are refused here."""

    def convert(self, value, param, ctx):
        number = super().convert(value, param, ctx)
        if not math.isfinite(number):
            low = "" if self.min is None else f"{self.min:g}"
            high = "" if self.max is None else f"{self.max:g}"
            span = f" from {low} to {high}" if low and high else ""
            self.fail(f"{value!r} is not a finite number: give a number{span}", param, ctx)
        return number


def plain_text(ctx, param, value: Optional[str]) -> Optional[str]:
    """A callback for options whose text goes into a figure or a PDF (--title, --authors, --date,
    --font): a control character cannot be written there, and a lone surrogate is a byte of the
    command line that was not UTF-8 (Python keeps it so, as surrogateescape)."""
    if value is None:
        return value
    from ..language import UNWRITABLE_CHARACTERS, character_name   # (loaded only when there is text to check)
    bad = UNWRITABLE_CHARACTERS.search(value)
    if bad is None:
        return value
    name, ch, column = _shown_name(param), bad.group(), bad.start() + 1
    if "\udc80" <= ch <= "\udcff":
        raise Refused(f"{name} holds the byte 0x{ord(ch) - 0xDC00:02X} (character {column}), which is not "
                      "UTF-8 text", "set the terminal or script to UTF-8, or leave that character out")
    raise Refused(f"{name} holds {character_name(ch)} (character {column}), which no figure or PDF can hold",
                  "delete that invisible character from the text")


def with_folders_opened(paths):
    """Each path argument as given, a folder replaced by the .mech files below it (in natural
    order, as `arrows collect` takes them); a folder with none stands as an AR100 diagnostic
    (check and export take folders so)."""
    from pathlib import Path

    from ..diagnostics import Diagnostic
    from ..model import Location

    out, seen = [], set()
    for path in paths:
        if not Path(path).is_dir():
            found = [path]
        else:
            from ..batch.sources import mech_files_below   # only a folder is searched (2 ms of start-up)
            found = [str(p) for p in mech_files_below(Path(path))]
            if not found:
                out.append(Diagnostic("AR100", "cannot read file: a folder with no .mech file below it",
                                      Location(path, 1, 1), hint="a folder is checked by the .mech files in it "
                                                                 "and its subfolders, dot-files and dot-folders left "
                                                                 "out; name a file or another folder"))
        for file in found:   # a file named twice (alone and in its folder) is checked once
            key = Path(file).resolve()
            if key not in seen:
                seen.add(key)
                out.append(file)
    return out
