"""PDF files of a batch: one SVG to one PDF, and many one-page PDFs to one document.

cairo stamps every PDF it writes with the time of writing; passing the file through pypdf drops
that stamp, so the same picture always gives the same bytes (a re-run, or --jobs 2 against
--jobs 1, produces identical files).
"""
from __future__ import annotations

import io
from dataclasses import dataclass, field
from typing import Optional

# A clickable area on a page: (x0, y0, x1, y1) in PDF points from the page's lower left corner,
# and the index of the page it leads to.
Link = tuple[tuple[float, float, float, float], int]


@dataclass(frozen=True)
class DocumentPage:
    pdf: bytes                                   # a one-page PDF
    bookmarks: tuple[str, ...] = ()              # outline entries for this page
    links: tuple[Link, ...] = field(default=())


def svg_to_pdf(svg: str, title: Optional[str] = None) -> bytes:
    import cairosvg

    return _restamped(cairosvg.svg2pdf(bytestring=svg.encode("utf-8")), {"/Title": title} if title else {})


def merge(pages: list[DocumentPage], metadata: dict[str, str]) -> bytes:
    """One document from one-page PDFs, with bookmarks, links and the given metadata
    (PDF keys such as /Title, /Author)."""
    from pypdf import PdfReader, PdfWriter
    from pypdf.annotations import Link as LinkAnnotation

    writer = PdfWriter()
    for page in pages:
        writer.add_page(PdfReader(io.BytesIO(page.pdf)).pages[0])
    for index, page in enumerate(pages):
        for bookmark in page.bookmarks:
            writer.add_outline_item(bookmark, index)
        for rect, target in page.links:
            writer.add_annotation(index, LinkAnnotation(rect=rect, target_page_index=target))
    writer.add_metadata({"/Producer": "arrows", **{k: v for k, v in metadata.items() if v}})
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def _restamped(pdf: bytes, metadata: dict[str, str]) -> bytes:
    from pypdf import PdfReader, PdfWriter

    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(pdf)))
    writer.metadata = None
    writer.add_metadata({"/Producer": "arrows", **metadata})
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()
