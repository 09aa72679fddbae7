"""The order of a supporting-information document and its page numbers: title page, contents,
schemes, summary of checks. Page numbers are physical (the title page is page 1, unprinted), so
the numbers in the contents are the ones a PDF viewer shows."""
from __future__ import annotations

from typing import Callable, Optional

from .pages import (Front, Page, PageSetup, contents_lines_per_page, contents_pages, scheme_block,
                    scheme_pages, summary_pages, title_page)
from .record import SchemeRecord


def compose(setup: PageSetup, front: Front, records: list[SchemeRecord],
            figure_svg: Callable[[SchemeRecord], Optional[str]], flow: bool) -> list[Page]:
    front_pages = [title_page(setup, front)] if front.title else []
    per_page = contents_lines_per_page(setup)
    entries_count = len(records) + 1                       # every scheme, then the summary
    contents_count = -(-entries_count // per_page)
    first_scheme_index = len(front_pages) + contents_count

    blocks = [scheme_block(setup, r, figure_svg(r), setup.text_height) for r in records]
    body, starts = scheme_pages(setup, blocks, first_scheme_index + 1, flow)
    summary_index = first_scheme_index + len(body)
    summary = summary_pages(setup, records, summary_index + 1)

    entries = []
    for record, start in zip(records, starts):
        index = first_scheme_index + start
        tag = "errors" if record.failed else ""
        entries.append((record.label, record.heading, tag, index + 1, index))
    entries.append(("", "Summary of checks", "", summary_index + 1, summary_index))
    contents = contents_pages(setup, entries, len(front_pages) + 1)
    assert len(contents) == contents_count
    return front_pages + contents + body + summary
