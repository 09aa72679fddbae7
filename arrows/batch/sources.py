"""Which mechanism files a batch collects, in which order, and under which names.

A folder contributes every .mech file below it, sorted by path in natural order (a number inside a
name is compared as a number: 2-sn1 before 10-da, as a person reads them), leaving out dot-files and
everything under a dot-folder (version control, notebook checkpoints, editor locks: common practice
of source tools); files named one by one keep the order given, a dot-file too. Each source is shown
by its path as reached from the command line (the folder as given, then the path inside it), as
`arrows check` names it, so two folders holding files of one name stay apart.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass
from pathlib import Path

SUFFIX = ".mech"


@dataclass(frozen=True)
class Source:
    path: Path
    name: str        # how documents and diagnostics name the file

    @property
    def file_name(self) -> str:
        """The file's own name, without its folders: what a figure shows of its source, so that the
        figure (and its cache entry) stays the same wherever the folder is and however it is named."""
        return self.name.replace("\\", "/").rsplit("/", 1)[-1]

    @property
    def slug(self) -> str:
        """A file-name-safe form of the name's stem, for output file names."""
        return re.sub(r"[^A-Za-z0-9._-]+", "_", Path(self.name).stem).strip("_") or "scheme"


class NoSources(Exception):
    """The inputs name no mechanism file (a missing path raises MechanismError: AR100, as every
    command reports it)."""


def mech_files_below(folder: Path) -> list[Path]:
    """The .mech files in `folder` and its subfolders, sorted by path in natural order (how a batch
    orders them: natural_key),
    without dot-files and without descending into dot-folders. The folder itself may be a dot-folder:
    it was named."""
    found = []
    for top, folders, files in os.walk(folder):
        folders[:] = [name for name in folders if not name.startswith(".")]
        # (A.MECH too: the suffix is read without regard to case, as `arrows draw A.MECH` reads it.)
        found += [Path(top, name) for name in files if name.lower().endswith(SUFFIX) and not name.startswith(".")]
    return sorted((p for p in found if p.is_file()), key=natural_key)


_DIGITS = re.compile(r"(\d+)")


def natural_key(path: Path) -> tuple:
    """Folder by folder, each name cut into text and numbers, the numbers compared by value: 1-a,
    2-b, 10-c (a plain sort gives 1-a, 10-c, 2-b). Names equal but for zeros before a number
    (01-a, 1-a) then go in plain order, so no two different paths tie."""
    parts = path.parts
    return tuple(tuple((int(piece) if i % 2 else piece) for i, piece in enumerate(_DIGITS.split(part)))
                 for part in parts), parts


def find_sources(inputs: list[str]) -> list[Source]:
    found: list[Source] = []
    seen: set[Path] = set()
    for text in inputs:
        path = Path(text)
        if path.is_dir():
            files = mech_files_below(path)
            if not files:
                raise NoSources(f"{text}: no {SUFFIX} files in this folder (dot-files and dot-folders are left out)")
            pairs = [(p, p.as_posix()) for p in files]
        elif path.is_file():
            pairs = [(path, text)]
        else:
            from ..diagnostics import MechanismError, cannot_read
            raise MechanismError([cannot_read(text)])
        for file, name in pairs:
            key = file.resolve()
            if key not in seen:
                seen.add(key)
                found.append(Source(file, name))
    if not found:
        raise NoSources("no mechanism files given")
    return found
