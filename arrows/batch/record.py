"""What a batch knows about one scheme once it is checked and drawn: its number, its names, its
diagnostics and whether its figure exists. The document, the HTML index and the reports are all
written from these records."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Optional

from ..diagnostics import ERROR, NOTE, WARNING


@dataclass(frozen=True)
class SchemeRecord:
    number: int                      # 1-based position in the batch
    label: str                       # "S3": prefix + number
    name: str                        # the source as the batch shows it
    slug: str                        # file-name-safe stem of the source
    title: Optional[str]
    caption: Optional[str]
    steps: int
    diagnostics: tuple[dict, ...]    # Diagnostic.to_dict() entries
    figure_problem: Optional[str]    # why there is no figure, if there is none
    key: Optional[str]               # cache key of the figure
    rendered: bool                   # drawn in this run (False: from the cache)
    figure_size: Optional[tuple[float, float]] = None   # width, height in points
    layout_notes: tuple[str, ...] = ()   # where the layout had to compromise ("check the figure")
    file_label: Optional[str] = None     # the label in file names, zero-padded ("S03"); default: label

    @property
    def drawn(self) -> bool:
        """Its figure was drawn in this run (not taken from the cache, nor missing)."""
        return self.rendered and self.has_figure

    @property
    def cached(self) -> bool:
        return not self.rendered and self.has_figure

    @property
    def heading(self) -> str:
        return self.title or self.name

    @property
    def file_stem(self) -> str:
        return f"{self.file_label or self.label}-{self.slug}"

    def count(self, severity: str) -> int:
        return sum(d["severity"] == severity for d in self.diagnostics)

    @property
    def errors(self) -> int:
        return self.count(ERROR)

    @property
    def warnings(self) -> int:
        return self.count(WARNING)

    @property
    def notes(self) -> int:
        return self.count(NOTE)

    @property
    def failed(self) -> bool:
        return self.errors > 0 or self.figure_problem is not None

    @property
    def has_figure(self) -> bool:
        return self.figure_problem is None

    def codes(self, severity: str) -> list[str]:
        return sorted({d["code"] for d in self.diagnostics if d["severity"] == severity})

    def status(self) -> str:
        """`passed`, or the counts that stop it passing: `2 errors (AR301, AR402), 1 warning (AR501)`."""
        parts = []
        for severity, count in ((ERROR, self.errors), (WARNING, self.warnings)):
            if count:
                parts.append(f"{plural(count, severity)} ({', '.join(self.codes(severity))})")
        if self.figure_problem and not self.errors:
            parts.insert(0, "not drawn")
        return ", ".join(parts) if parts else "passed"


def plural(count: int, word: str) -> str:
    return f"{count} {word}{'' if count == 1 else 's'}"


def diagnostic_line(d: dict) -> str:
    """`12:5 error AR301 octet exceeded ...` (the file is the scheme's own)."""
    return f"{d['line']}:{d['column']} {d['severity']} {d['code']} {d['message']}"
