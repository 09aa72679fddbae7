"""The order of a supporting-information document and its page numbers: title page, contents,
schemes, summary of checks. Page numbers are physical (the title page is page 1, unprinted), so
the numbers in the contents are the ones a PDF viewer shows."""
from __future__ import annotations

from typing import Callable, Optional

from .pages import (Front, Page, PageSetup, SchemeBlock, contents_lines_per_page, contents_pages, scheme_block,
                    scheme_pages, shown_heading, summary_pages, title_page)
from .record import SchemeRecord


def scheme_blocks(setup: PageSetup, records: list[SchemeRecord],
                  figure_svg: Callable[[SchemeRecord], Optional[str]]) -> list[SchemeBlock]:
    """Every scheme laid out for its page: the scale its figure is placed at is decided here."""
    return [scheme_block(setup, r, figure_svg(r), setup.text_height) for r in records]


def compose(setup: PageSetup, front: Front, records: list[SchemeRecord], blocks: list[SchemeBlock],
            flow: bool) -> list[Page]:
    front_pages = [title_page(setup, front)] if front.title else []
    per_page = contents_lines_per_page(setup)
    entries_count = len(records) + 1                       # every scheme, then the summary
    contents_count = -(-entries_count // per_page)
    first_scheme_index = len(front_pages) + contents_count

    body, starts = scheme_pages(setup, blocks, first_scheme_index + 1, flow)
    summary_index = first_scheme_index + len(body)
    summary = summary_pages(setup, records, summary_index + 1)

    entries = []
    for record, start in zip(records, starts):
        index = first_scheme_index + start
        tag = "errors" if record.failed else ""
        entries.append((record.label, shown_heading(setup, record), tag, index + 1, index))
    entries.append(("", "Summary of checks", "", summary_index + 1, summary_index))
    contents = contents_pages(setup, entries, len(front_pages) + 1)
    assert len(contents) == contents_count
    return front_pages + contents + body + summary
