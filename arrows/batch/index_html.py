"""index.html for a reviewer's browser: every scheme's figure with its caption, status and
diagnostics, and links to each figure's SVG and PDF and to the whole document.

The page works offline: no scripts, no fonts or styles from elsewhere; the figures are the SVG
files beside it, and a content security policy forbids fetching anything else.
"""
from __future__ import annotations

from html import escape
from .pages import Front
from .record import SchemeRecord, plural

STYLE = """
body { font-family: "DejaVu Sans", "Helvetica Neue", Arial, sans-serif; margin: 2rem auto; max-width: 60rem;
       padding: 0 1rem; color: #111; line-height: 1.4; }
header p { margin: 0.2rem 0; }
table.summary { border-collapse: collapse; margin: 1rem 0 2rem; width: 100%; }
table.summary th, table.summary td { border-bottom: 1px solid #ccc; padding: 0.25rem 0.5rem; text-align: left;
       vertical-align: top; }
section.scheme { border-top: 1px solid #999; padding: 1rem 0; }
section.scheme h2 { font-size: 1.1rem; margin: 0 0 0.5rem; }
figure { margin: 0.5rem 0; }
figure img { max-width: 100%; height: auto; display: block; margin: 0 auto; }
.no-figure { border: 1px dashed #555; padding: 0.75rem; }
.status { font-size: 0.9rem; }
.failed .status strong, li.error strong { color: #a0004f; }
ul.diagnostics { font-size: 0.85rem; padding-left: 1.2rem; }
ul.diagnostics .hint { color: #444; display: block; }
"""

SCREEN_ZOOM = 1.5
POLICY = "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'"


def index_html(front: Front, records: list[SchemeRecord], pdf_name: str) -> str:
    failed = sum(r.failed for r in records)
    title = front.title or "Schemes"
    head = [f"<h1>{escape(title)}</h1>"]
    if front.authors:
        head.append(f"<p>{escape(front.authors)}</p>")
    if front.date:
        head.append(f"<p>{escape(front.date)}</p>")
    head.append(f"<p>{plural(len(records), 'scheme')}: {len(records) - failed} passed, {failed} with errors. "
                f'The whole document: <a href="../{escape(pdf_name)}">{escape(pdf_name)}</a>.</p>')
    rows = "".join(
        f'<tr><td><a href="#{escape(r.label)}">{escape(r.label)}</a></td><td>{escape(r.name)}</td>'
        f"<td>{escape(r.status())}</td></tr>" for r in records)
    table = f'<table class="summary"><tr><th>Scheme</th><th>File</th><th>Check</th></tr>{rows}</table>'
    sections = "".join(_section(r) for r in records)
    return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            f'<meta http-equiv="Content-Security-Policy" content="{POLICY}">'
            '<meta name="viewport" content="width=device-width, initial-scale=1">'
            f"<title>{escape(title)}</title><style>{STYLE}</style></head>\n<body><header>{''.join(head)}</header>\n"
            f"{table}\n{sections}</body></html>\n")


def _section(record: SchemeRecord) -> str:
    label = escape(record.label)
    drawn = record.has_figure and record.figure_size is not None
    if drawn:
        # CSS px from points, enlarged for reading on a screen (a print-size figure looks small there)
        width, height = (round(length / 0.75 * SCREEN_ZOOM) for length in record.figure_size)
        picture = (f'<img src="{escape(record.file_stem)}.svg" width="{width}" height="{height}" '
                   f'alt="Scheme {label}: {escape(record.heading)}">')
    else:
        picture = f'<div class="no-figure">{escape(record.figure_problem or "no figure")}</div>'
    caption = f"<figcaption>{escape(record.caption)}</figcaption>" if record.caption else ""
    links = ""
    if drawn:
        links = (f' Figure: <a href="{escape(record.file_stem)}.svg">SVG</a>, '
                 f'<a href="{escape(record.file_stem)}.pdf">PDF</a>.')
    status = f"<strong>{escape(record.status())}</strong>" if record.failed else escape(record.status())
    items = "".join(_diagnostic(d) for d in record.diagnostics)
    items += "".join(f'<li class="note">figure: {escape(note)}</li>' for note in record.layout_notes)
    diagnostics = f'<ul class="diagnostics">{items}</ul>' if items else ""
    kind = "scheme failed" if record.failed else "scheme"
    return (f'<section class="{kind}" id="{label}"><h2>Scheme {label}. {escape(record.heading)}</h2>'
            f"<figure>{picture}{caption}</figure>"
            f'<p class="status">Source {escape(record.name)}. Checked: {status}.{links}</p>{diagnostics}</section>\n')


def _diagnostic(d: dict) -> str:
    hint = f'<span class="hint">hint: {escape(d["hint"])}</span>' if d.get("hint") else ""
    return (f'<li class="{escape(d["severity"])}"><code>{d["line"]}:{d["column"]}</code> {escape(d["severity"])} '
            f'<strong>{escape(d["code"])}</strong> {escape(d["message"])}{hint}</li>')
