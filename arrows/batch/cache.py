"""A content-addressed cache for batch rendering.

A scheme's figure is stored under a key made of everything that decides it: the source bytes, the
file's own name (an untitled figure and a faulty figure's error list show it; never the folders, so a
moved or copied folder, or one named by another path, finds its figures again), the style, and the tool itself (its version and the text of its code, plus the
versions of RDKit, cairosvg and pypdf). A page's PDF is stored under the hash of the page's SVG
text and the same tool fingerprint. Unchanged inputs are therefore never rendered twice, and a
changed tool never serves a stale picture.

Entries are written under a temporary name and renamed into place, so a run killed mid-write
leaves no half entry; a later run simply renders that scheme again.
"""
from __future__ import annotations

import hashlib
import json
import os
import tempfile
from dataclasses import dataclass
from functools import lru_cache
from importlib import metadata
from pathlib import Path
from typing import Optional

from ..atomic import remove_stale_temps, temp_prefix, write_bytes

META, SVG, PDF = "meta.json", "figure.svg", "figure.pdf"


@lru_cache(maxsize=1)
def tool_fingerprint() -> str:
    """Hash of arrows' version, the text of its code and grammar, and the versions of the
    libraries that shape the output (read from their metadata: importing them costs more than
    a warm run has to spend)."""
    import arrows

    digest = hashlib.sha256(arrows.__version__.encode() + b"\0")
    for library in ("rdkit", "cairosvg", "cairocffi", "pypdf"):
        try:
            version = metadata.version(library)
        except metadata.PackageNotFoundError:
            version = "absent"
        digest.update(f"{library} {version}".encode() + b"\0")
    package = Path(arrows.__file__).resolve().parent
    code = sorted(package.rglob("*.py")) + sorted(package.rglob("*.lark"))
    grammar = package.parent / "grammar"
    if grammar.is_dir():   # a source checkout keeps the grammar beside the package
        code += sorted(grammar.glob("*.lark"))
    for path in code:
        digest.update(path.name.encode() + b"\0" + path.read_bytes() + b"\0")
    return digest.hexdigest()


def figure_key(source: bytes, file_name: str, style: str, fingerprint: str) -> str:
    digest = hashlib.sha256()
    for part in (fingerprint.encode(), style.encode(), file_name.encode(), source):
        digest.update(hashlib.sha256(part).digest())
    return digest.hexdigest()


def page_key(svg: str, fingerprint: str) -> str:
    return hashlib.sha256(fingerprint.encode() + b"\0" + svg.encode()).hexdigest()


def document_key(fingerprint: str, parts: object) -> str:
    """Key of a whole document: `parts` is plain JSON data naming everything the pages show."""
    text = json.dumps(parts, sort_keys=True, ensure_ascii=False)
    return hashlib.sha256(fingerprint.encode() + b"\0" + text.encode()).hexdigest()


@dataclass(frozen=True)
class FigureEntry:
    meta: dict              # title, caption, diagnostics, steps, figure problem (see figures.py)
    svg: Optional[str]      # None when no figure could be drawn
    pdf: Optional[bytes]


class Cache:
    def __init__(self, root: Path):
        self.root = root
        self.figures = root / "figures"
        self.pages = root / "pages"
        self.documents = root / "documents"

    def prepare(self) -> None:
        for folder in (self.figures, self.pages, self.documents):
            folder.mkdir(parents=True, exist_ok=True)
            remove_stale_temps(folder)

    # figures
    def has_figure(self, key: str) -> bool:
        return (self.figures / key / META).is_file()

    def figure_file(self, key: str, name: str) -> Path:
        """SVG or PDF, the files of an entry."""
        return self.figures / key / name

    def load_meta(self, key: str) -> dict:
        return json.loads((self.figures / key / META).read_text(encoding="utf-8"))

    def store_figure(self, key: str, entry: FigureEntry) -> None:
        building = Path(tempfile.mkdtemp(prefix=temp_prefix(key), dir=self.figures))
        if entry.svg is not None:
            (building / SVG).write_text(entry.svg, encoding="utf-8")
        if entry.pdf is not None:
            (building / PDF).write_bytes(entry.pdf)
        (building / META).write_text(json.dumps(entry.meta, ensure_ascii=False, sort_keys=True), encoding="utf-8")
        try:
            os.replace(building, self.figures / key)
        except OSError:
            # Another process stored the same key first: its entry is the same content.
            for leftover in building.iterdir():
                leftover.unlink()
            building.rmdir()

    # pages
    def page_path(self, key: str) -> Path:
        return self.pages / f"{key}.pdf"

    def has_page(self, key: str) -> bool:
        return self.page_path(key).is_file()

    def store_page(self, key: str, pdf: bytes) -> None:
        write_bytes(self.page_path(key), pdf)

    # whole documents: the merged PDF, its page count and the notes its pages gave (by scheme label)
    def load_document(self, key: str) -> Optional[tuple[bytes, int, dict[str, str]]]:
        pdf, count, notes = (self.documents / f"{key}{suffix}" for suffix in (".pdf", ".pages", ".notes.json"))
        if not (pdf.is_file() and count.is_file() and notes.is_file()):
            return None
        return pdf.read_bytes(), int(count.read_text()), json.loads(notes.read_text(encoding="utf-8"))

    def store_document(self, key: str, pdf: bytes, pages: int, notes: dict[str, str]) -> None:
        write_bytes(self.documents / f"{key}.pdf", pdf)
        write_bytes(self.documents / f"{key}.notes.json", json.dumps(notes, ensure_ascii=False).encode())
        write_bytes(self.documents / f"{key}.pages", str(pages).encode())   # written last: marks it complete
