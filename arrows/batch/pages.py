"""The pages of a supporting-information document, each as one SVG: a title page, the contents,
the schemes (one per page, or flowed several to a page), and a closing summary of every scheme's
diagnostics.

Pages are laid out here in points (y downwards) and only here; cairosvg turns each into a one-page
PDF later. Text is measured with the same cairo font machinery that draws it (arrows.draw.text), so
wrapped lines fit the page they are on.
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field
from html import escape
from typing import Optional

from ..draw.text import FontFace, wrap
from .embed import MM, Figure, parse_figure
from .pdf import Link
from .record import SchemeRecord, diagnostic_line, plural

PAPER = {"a4": (210 * MM, 297 * MM), "letter": (612.0, 792.0)}
PAPER_NAME = {"a4": "A4", "letter": "Letter"}
# Page margins: on A4, 19 mm leave a text block 172 mm wide, so the two-column preset (171 mm, a
# double journal column: references.md, common practice) is placed at its print size; 20 mm left
# 170 mm and every two-column figure was shrunk to 99.4% (its 6 pt text printed at 5.96 pt).
# Letter (215.9 mm) keeps 20 mm: its text block is 175.9 mm wide.
MARGIN = {"a4": 19 * MM, "letter": 20 * MM}
DEFAULT_TITLE = "Schemes"   # the document's title (PDF metadata, index.html) when --title is not given

TITLE_PT, HEADING_PT, BODY_PT, SMALL_PT = 20.0, 11.0, 9.0, 7.5
LEADING = 1.3          # line height / font size
GAP = 6.0              # between the parts of a block
BLOCK_GAP = 22.0       # between two schemes flowed onto one page
INDENT = 14.0
MAX_ERRORS_SHOWN = 5   # on a scheme's own page; the summary lists them all


@dataclass(frozen=True)
class PageSetup:
    paper: str = "a4"
    font_family: str = "DejaVu Sans"
    source_paths: bool = True      # False: the document leaves the source files' paths out

    @property
    def margin(self) -> float:
        return MARGIN[self.paper]

    @property
    def width(self) -> float:
        return PAPER[self.paper][0]

    @property
    def height(self) -> float:
        return PAPER[self.paper][1]

    @property
    def text_width(self) -> float:
        return self.width - 2 * self.margin

    @property
    def text_height(self) -> float:
        return self.height - 2 * self.margin

    def face(self, bold: bool = False) -> FontFace:
        return FontFace(self.font_family, bold=bold)


@dataclass(frozen=True)
class Front:
    """What the title page says; no title, no title page."""

    title: Optional[str] = None
    authors: Optional[str] = None
    date: Optional[str] = None
    subtitle: str = ""


@dataclass
class Page:
    svg: str
    bookmarks: tuple[str, ...] = ()      # outline entries leading to this page
    links: list[Link] = field(default_factory=list)


# --- text -------------------------------------------------------------------------------------

def _text(x: float, y: float, content: str, size: float, bold: bool = False, anchor: str = "start") -> str:
    weight = ' font-weight="bold"' if bold else ""
    align = f' text-anchor="{anchor}"' if anchor != "start" else ""
    return f'<text x="{x:.2f}" y="{y:.2f}" font-size="{size}"{weight}{align}>{escape(content)}</text>'


@dataclass(frozen=True)
class Lines:
    """Wrapped lines of one size and weight; `height` is what they take on the page."""

    lines: tuple[str, ...]
    size: float
    bold: bool = False
    indent: float = 0.0

    @property
    def height(self) -> float:
        return len(self.lines) * self.size * LEADING

    def svg(self, x: float, top: float) -> str:
        step = self.size * LEADING
        return "".join(_text(x + self.indent, top + (i + 0.78) * step, line, self.size, self.bold)
                       for i, line in enumerate(self.lines))


def lines(setup: PageSetup, content: str, size: float, width: float, bold: bool = False,
          indent: float = 0.0) -> Lines:
    return Lines(tuple(wrap(content, setup.face(bold), size, width - indent)), size, bold, indent)


def fitted(setup: PageSetup, content: str, size: float, width: float, bold: bool = False) -> str:
    """Content cut to one line of at most `width`, with an ellipsis when cut."""
    face = setup.face(bold)
    if face.width(content, size) <= width:
        return content
    while content and face.width(content + "…", size) > width:
        content = content[:-1]
    return content.rstrip() + "…"


# --- pages -------------------------------------------------------------------------------------

def page_svg(setup: PageSetup, body: str, number: Optional[int]) -> str:
    footer = ""
    if number is not None:
        footer = _text(setup.width / 2, setup.height - setup.margin / 2, str(number), SMALL_PT, anchor="middle")
    return (f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" '
            f'width="{setup.width:.2f}pt" height="{setup.height:.2f}pt" '
            f'viewBox="0 0 {setup.width:.2f} {setup.height:.2f}" font-family="{escape(setup.font_family)}">'
            f'<rect width="100%" height="100%" fill="#ffffff"/>{body}{footer}</svg>')


def title_page(setup: PageSetup, front: Front) -> Page:
    width = setup.text_width
    parts = [lines(setup, front.title or "", TITLE_PT, width, bold=True)]
    if front.authors:
        parts.append(lines(setup, front.authors, 12.0, width))
    if front.date:
        parts.append(lines(setup, front.date, BODY_PT + 1, width))
    if front.subtitle:
        parts.append(lines(setup, front.subtitle, BODY_PT, width))
    y = setup.height * 0.3
    body = []
    for part in parts:
        for line in part.lines:
            y += part.size * LEADING
            body.append(_text(setup.width / 2, y - 0.22 * part.size * LEADING, line, part.size, part.bold, "middle"))
        y += 2 * GAP
    return Page(page_svg(setup, "".join(body), None), bookmarks=(front.title,) if front.title else ())


def title_page_note(setup: PageSetup, front: Front) -> Optional[str]:
    """A note when the title page's texts hold characters its font has no glyphs for: they print
    as empty boxes, with no word said. The font is asked, as for a scheme's own texts."""
    if not front.title:
        return None
    wanting = sorted(set(setup.face(bold=True).wanting([front.title]))
                     | set(setup.face().wanting([front.authors or "", front.date or ""])))
    if not wanting:
        return None
    shown = "".join(wanting[:8]) + ("..." if len(wanting) > 8 else "")
    return (f"the title page's font ({setup.font_family}) has no glyphs for {shown} in --title, --authors or --date: "
            "they print as empty boxes there (the PDF's metadata and index.html keep them)")


def contents_lines_per_page(setup: PageSetup) -> int:
    return int((setup.text_height - HEADING_PT * LEADING - 2 * GAP) // (BODY_PT * LEADING * 1.15))


def contents_pages(setup: PageSetup, entries: list[tuple[str, str, str, int, int]], first_number: int) -> list[Page]:
    """entries: (label, heading, tag, page number, page index) per line; tag is shown after the
    heading (e.g. "errors")."""
    per_page = contents_lines_per_page(setup)
    step = BODY_PT * LEADING * 1.15
    pages = []
    for start in range(0, max(len(entries), 1), per_page):
        top = setup.margin
        body = [_text(setup.margin, top + HEADING_PT, "Contents" if start == 0 else "Contents (continued)",
                      HEADING_PT, bold=True)]
        y = top + HEADING_PT * LEADING + 2 * GAP
        links: list[Link] = []
        label_width = 42.0
        number_width = 30.0
        for label, heading, tag, number, index in entries[start:start + per_page]:
            baseline = y + 0.78 * step
            body.append(_text(setup.margin, baseline, label, BODY_PT, bold=True))
            room = setup.text_width - label_width - number_width
            text = heading + (f"  [{tag}]" if tag else "")
            body.append(_text(setup.margin + label_width, baseline, fitted(setup, text, BODY_PT, room), BODY_PT))
            body.append(_text(setup.width - setup.margin, baseline, str(number), BODY_PT, anchor="end"))
            pdf_top = setup.height - y
            links.append(((setup.margin, pdf_top - step, setup.width - setup.margin, pdf_top), index))
            y += step
        pages.append(Page(page_svg(setup, "".join(body), first_number + len(pages)),
                          bookmarks=("Contents",) if start == 0 else (), links=links))
    return pages


@dataclass(frozen=True)
class SchemeBlock:
    """One scheme as laid out: heading, figure (or the reason there is none), caption, status."""

    record: SchemeRecord
    heading: Lines
    caption: Optional[Lines]
    status: Lines
    figure: Optional[Figure]
    problem: Optional[Lines]
    scale: float
    heading_text: str = ""

    @property
    def smallest_printed(self) -> Optional[float]:
        """The size in points at which the figure's smallest text (charges, subscripts) prints on
        the page; None without a figure or text."""
        smallest = smallest_text(self.figure) if self.figure is not None else None
        return smallest * self.scale if smallest is not None else None

    @property
    def figure_height(self) -> float:
        if self.figure is not None:
            return self.figure.height * self.scale
        return self.problem.height + 2 * GAP if self.problem is not None else 0.0

    @property
    def height(self) -> float:
        total = self.heading.height + GAP + self.figure_height + GAP + self.status.height
        if self.caption is not None:
            total += self.caption.height + GAP / 2
        return total

    def svg(self, setup: PageSetup, top: float) -> str:
        x, width = setup.margin, setup.text_width
        out = [self.heading.svg(x, top)]
        y = top + self.heading.height + GAP
        if self.figure is not None:
            drawn = self.figure.width * self.scale
            out.append(self.figure.placed(x + (width - drawn) / 2, y, self.scale, f"{self.record.label}-"))
        elif self.problem is not None:
            out.append(f'<rect x="{x:.2f}" y="{y:.2f}" width="{width:.2f}" height="{self.figure_height:.2f}" '
                       f'fill="none" stroke="#000000" stroke-width="0.5" stroke-dasharray="3 2"/>')
            out.append(self.problem.svg(x + GAP, y + GAP))
        y += self.figure_height + GAP
        if self.caption is not None:
            out.append(self.caption.svg(x, y))
            y += self.caption.height + GAP / 2
        out.append(self.status.svg(x, y))
        return "".join(out)


def scheme_block(setup: PageSetup, record: SchemeRecord, figure_svg: Optional[str], max_height: float) -> SchemeBlock:
    """Lay out one scheme so that the whole block is at most max_height tall; the figure keeps its
    print size unless it must shrink to fit the text block."""
    width = setup.text_width
    heading_text = f"Scheme {record.label}. {shown_heading(setup, record)}"
    heading = lines(setup, heading_text, HEADING_PT, width, bold=True)
    caption = lines(setup, record.caption, BODY_PT, width) if record.caption else None
    source = f"Source {record.name}. " if setup.source_paths else ""
    status = lines(setup, f"{source}Checked: {record.status()}{_details(record)}.", SMALL_PT, width)
    figure = parse_figure(figure_svg) if figure_svg is not None else None
    problem = None
    if figure is None:
        # The reason, then the errors that stand in the way, so the page explains itself.
        reasons = [record.figure_problem or "no figure"]
        reasons += [diagnostic_line(d) for d in record.diagnostics if d["severity"] == "error"][:MAX_ERRORS_SHOWN]
        problem = Lines(tuple(line for reason in reasons
                              for line in wrap(reason, setup.face(), SMALL_PT, width - 2 * GAP)), SMALL_PT)
    block = SchemeBlock(record, heading, caption, status, figure, problem, 1.0, heading_text)
    if figure is not None:
        room = max_height - (block.height - figure.height)
        scale = min(1.0, width / figure.width, max(room, 0.0) / figure.height)
        block = SchemeBlock(record, heading, caption, status, figure, problem, scale, heading_text)
    return block


def shown_heading(setup: PageSetup, record: SchemeRecord) -> str:
    """The scheme's title; without one, its file (only the file's own name when the document
    leaves the source paths out)."""
    if record.title or setup.source_paths:
        return record.heading
    return record.name.replace("\\", "/").rsplit("/", 1)[-1]


_FONT_SIZE = re.compile(r'font-size\s*(?:=\s*["\']|:\s*)([0-9]*\.?[0-9]+)\s*(px|pt)?')


def smallest_text(figure: Figure) -> Optional[float]:
    """The smallest font size the figure's SVG sets, in points at the figure's own size (its
    user units scaled by its width over its viewBox width)."""
    sizes = [float(value) * (4 / 3 if unit == "pt" else 1.0) for value, unit in _FONT_SIZE.findall(figure.body)]
    if not sizes:
        return None
    view = [float(v) for v in re.split(r"[\s,]+", figure.attributes.get("viewBox", "").strip()) if v]
    points_per_unit = figure.width / view[2] if len(view) == 4 and view[2] > 0 else 0.75
    return min(sizes) * points_per_unit


def print_size_note(setup: PageSetup, block: SchemeBlock) -> Optional[str]:
    """A note when the page shrinks a figure so far that its smallest text prints under
    SMALLEST_TEXT_PT (journals ask for no text under about 6 pt in artwork: references.md, common
    practice); the size named is the one printed on the page."""
    from ..draw.styles import SMALLEST_TEXT_PT

    printed = block.smallest_printed
    if block.figure is None or printed is None or block.scale >= 1.0 or printed >= SMALLEST_TEXT_PT - 0.005:
        return None
    too_wide = setup.text_width / block.figure.width <= block.scale + 1e-9
    why = "the page's text width" if too_wide else "one page"
    advice = ("--style two-column (171 mm wide) prints at full size on this page" if too_wide
              else "split the mechanism into shorter schemes (files) to print it larger")
    return (f"on the {PAPER_NAME[setup.paper]} page of the document "
            f"the figure is placed at {block.scale:.0%} to fit {why}: its smallest text (charges, subscripts) "
            f"prints at {printed:.2f} pt, below {SMALLEST_TEXT_PT:g} pt; {advice}")


def _details(record: SchemeRecord) -> str:
    if record.failed:
        return "; listed in the summary of checks"
    if record.notes:
        return f" ({plural(record.notes, 'note')} in the summary of checks)"
    return ""


def scheme_pages(setup: PageSetup, blocks: list[SchemeBlock], first_number: int, flow: bool) -> tuple[list[Page], list[int]]:
    """Pages holding the blocks (one per page, or as many as fit when flowing), and for each block
    the 0-based index, among these pages, of the page it starts on."""
    pages: list[Page] = []
    starts: list[int] = []
    body: list[str] = []
    bookmarks: list[str] = []
    y = setup.margin

    def finish() -> None:
        nonlocal body, y, bookmarks
        if body:
            pages.append(Page(page_svg(setup, "".join(body), first_number + len(pages)),
                              bookmarks=tuple(bookmarks)))
        body, bookmarks, y = [], [], setup.margin

    for block in blocks:
        if body and (not flow or y + BLOCK_GAP + block.height > setup.height - setup.margin):
            finish()
        if body:
            y += BLOCK_GAP
        starts.append(len(pages))
        body.append(block.svg(setup, y))
        bookmarks.append(block.heading_text)   # "Scheme S3. Claisen condensation", as the page heads it
        y += block.height
    finish()
    return pages, starts


def _labels(records: list[SchemeRecord]) -> str:
    return f" ({', '.join(r.label for r in records)})" if records else ""


def summary_pages(setup: PageSetup, records: list[SchemeRecord], first_number: int) -> list[Page]:
    """The closing table: every scheme with its status, then each of its diagnostics."""
    width = setup.text_width
    failed = [r for r in records if r.failed]
    warned = [r for r in records if r.warnings]
    totals = (f"{plural(len(records), 'scheme')}: {len(records) - len(failed)} passed, "
              f"{len(failed)} with errors{_labels(failed)}; {plural(sum(r.warnings for r in records), 'warning')} in "
              f"{plural(len(warned), 'scheme')}.")
    rows: list[list[Lines]] = []
    for record in records:
        named = f"{record.label}   {record.name}" if setup.source_paths else record.label
        row = [lines(setup, f"{named}: {record.status()}", BODY_PT, width, bold=True)]
        if record.figure_problem and record.figure_problem not in ("", None) and record.errors == 0:
            row.append(lines(setup, record.figure_problem, SMALL_PT, width, indent=INDENT))
        for d in record.diagnostics:
            row.append(lines(setup, diagnostic_line(d), SMALL_PT, width, indent=INDENT))
        rows.append(row)

    pages: list[Page] = []
    body: list[str] = []
    y = 0.0

    def start_page() -> None:
        nonlocal body, y
        title = "Summary of checks" if not pages else "Summary of checks (continued)"
        body = [_text(setup.margin, setup.margin + HEADING_PT, title, HEADING_PT, bold=True)]
        y = setup.margin + HEADING_PT * LEADING + GAP
        if not pages:
            intro = lines(setup, totals, BODY_PT, width)
            body.append(intro.svg(setup.margin, y))
            y += intro.height + GAP

    def finish_page() -> None:
        pages.append(Page(page_svg(setup, "".join(body), first_number + len(pages)),
                          bookmarks=("Summary of checks",) if not pages else ()))

    bottom = setup.height - setup.margin
    start_page()
    for row in rows:
        row_height = sum(part.height for part in row)
        if y + row_height > bottom and row_height <= bottom - setup.margin - 3 * HEADING_PT:
            finish_page()
            start_page()
        body.append(f'<line x1="{setup.margin:.2f}" x2="{setup.width - setup.margin:.2f}" y1="{y:.2f}" '
                    f'y2="{y:.2f}" stroke="#000000" stroke-width="0.3"/>')
        y += GAP / 2
        for part in row:
            for line in part.lines:   # a row longer than a page goes on line by line
                one = Lines((line,), part.size, part.bold, part.indent)
                if y + one.height > bottom:
                    finish_page()
                    start_page()
                body.append(one.svg(setup.margin, y))
                y += one.height
        y += GAP / 2
    finish_page()
    return pages
