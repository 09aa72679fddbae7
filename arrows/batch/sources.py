"""Which mechanism files a batch collects, in which order, and under which names.

A folder contributes every .mech file below it, sorted by path, leaving out dot-files and
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
    def slug(self) -> str:
        """A file-name-safe form of the name's stem, for output file names."""
        return re.sub(r"[^A-Za-z0-9._-]+", "_", Path(self.name).stem).strip("_") or "scheme"


class NoSources(Exception):
    """The inputs name no mechanism file, or a path that does not exist."""


def mech_files_below(folder: Path) -> list[Path]:
    """The .mech files in `folder` and its subfolders, sorted by path (how a batch orders them),
    without dot-files and without descending into dot-folders. The folder itself may be a dot-folder:
    it was named."""
    found = []
    for top, folders, files in os.walk(folder):
        folders[:] = [name for name in folders if not name.startswith(".")]
        # (A.MECH too: the suffix is read without regard to case, as `arrows draw A.MECH` reads it.)
        found += [Path(top, name) for name in files if name.lower().endswith(SUFFIX) and not name.startswith(".")]
    return sorted(p for p in found if p.is_file())


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
            raise NoSources(f"{text}: no such file or folder")
        for file, name in pairs:
            key = file.resolve()
            if key not in seen:
                seen.add(key)
                found.append(Source(file, name))
    if not found:
        raise NoSources("no mechanism files given")
    return found
