"""Which mechanism files a batch collects, in which order, and under which names.

A folder contributes every .mech file below it, sorted by its path inside the folder; files named
one by one keep the order given. Each source is shown by its path relative to the folder it came
from (or as given), so documents do not depend on where the project sits on disk.
"""
from __future__ import annotations

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
    """The .mech files in `folder` and its subfolders, sorted by path (how a batch orders them)."""
    return sorted(p for p in folder.rglob("*" + SUFFIX) if p.is_file())


def find_sources(inputs: list[str]) -> list[Source]:
    found: list[Source] = []
    seen: set[Path] = set()
    for text in inputs:
        path = Path(text)
        if path.is_dir():
            files = mech_files_below(path)
            if not files:
                raise NoSources(f"{text}: no {SUFFIX} files in this folder")
            pairs = [(p, p.relative_to(path).as_posix()) for p in files]
        elif path.is_file():
            pairs = [(path, path.as_posix())]
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
