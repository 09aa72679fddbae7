"""`arrows collect`, the document as printed: the size its figures' text prints at, the order and
names of its schemes, its outline and metadata, what it says of the source files, PNG figure files.

Outside judges: pypdf reads the document back (the text of each page, and for every piece of text
the font size times the text and drawing matrices in force, i.e. the size it prints at on the
page; the outline; the metadata); Pillow opens the PNG files. The 6 pt floor for text in artwork
is common practice of chemistry journals (references.md, "Figures"; from memory), as is the width
of a double column (171 mm, the two-column preset: 17-17.8 cm).
"""
from __future__ import annotations

import json
import math
import re
import shutil
import subprocess
from html import escape
from pathlib import Path

import pytest
from pypdf import PdfReader

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
MM = 72 / 25.4


def collect(*args, cwd=None) -> subprocess.CompletedProcess:
    return subprocess.run(["arrows", "collect", *map(str, args)], capture_output=True, text=True, cwd=cwd,
                          timeout=600)


def flat(text: str) -> str:
    return " ".join(text.split())


def long_scheme(steps: int = 30) -> str:
    """A proton passed back and forth between hydroxide and acetic acid `steps` times: a scheme
    taller than a page at the one-column size."""
    text = ['title "Long proton shuttle"', 'caption "A proton passed back and forth."',
            'species acid = "[CH3:1][C:2](=[O:3])[OH:4]"', 'species base = "[OH-:5]"']
    for n in range(steps):
        give, take = ("O5", "O4") if n % 2 == 0 else ("O4", "O5")
        text += [f'step "proton transfer {n + 1}" reversible', f":{give} -> H({take})", f"{take}-H -> {take}", "end"]
    return "\n".join(text) + "\n"


def printed_sizes(page) -> list[float]:
    """The size each piece of text on the page prints at, in points: the font size scaled by the
    text matrix and the drawing matrix in force (pypdf reports both)."""
    sizes = []

    def visit(text, cm, tm, font, size):
        if text.strip():
            # the vertical column of tm x cm: how far one unit of font height reaches on the page
            c = tm[2] * cm[0] + tm[3] * cm[2]
            d = tm[2] * cm[1] + tm[3] * cm[3]
            sizes.append(size * math.hypot(c, d))

    page.extract_text(visitor_text=visit)
    return sizes


def scheme_page(reader: PdfReader, label: str):
    return next(p for p in reader.pages if flat(p.extract_text()).startswith(f"Scheme {label}. "))


# --- 1. text printed under 6 pt is said, at the size printed on the page --------------------------------

@pytest.mark.parametrize("style,paper", [("one-column", "a4"), ("slide", "a4"), ("one-column", "letter")])
def test_a_figure_placed_so_small_its_text_prints_under_6_pt_is_noted_with_the_printed_size(tmp_path, style, paper):
    """A 30-step one-column scheme was placed at 74% of its size on the A4 page (its charges and
    subscripts printing at 4.45 pt) and nothing said so; a slide-style scheme's note said 5.3 pt
    (its figure file's size) while the A4 page printed it at 2.65 pt. The note now names the size
    the page prints, on the console, in report.json and in index.html; pypdf measures the page."""
    folder = tmp_path / "s"
    folder.mkdir()
    (folder / "a-long.mech").write_text(long_scheme())
    shutil.copy(GALLERY[7], folder / "b-short.mech")     # 08-sn2-cyanide: fits at its print size
    out = tmp_path / "si.pdf"
    proc = collect("s", "-o", out, "--style", style, "--paper", paper, "-j", "1", "--cache", tmp_path / "cache",
                   "--report", tmp_path / "report.json", cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    reader = PdfReader(out)
    smallest = min(printed_sizes(scheme_page(reader, "S1")))
    assert smallest < 6.0                                   # the judge: the page really prints it small
    notes = [line for line in proc.stderr.splitlines() if line.startswith("S1 s/a-long.mech: note: ")
             and "prints at" in line]
    assert len(notes) == 1, proc.stderr
    stated = float(re.search(r"prints at (\d+\.\d+) pt", notes[0])[1])
    assert stated == pytest.approx(smallest, abs=0.01), (notes[0], smallest)
    assert "below 6 pt" in notes[0] and {"a4": "A4", "letter": "Letter"}[paper] in notes[0]
    placed = int(re.search(r"placed at (\d+)%", notes[0])[1])
    assert 0 < placed < 100
    note = notes[0].split(": note: ", 1)[1]
    report = {s["label"]: s["layout_notes"] for s in json.loads((tmp_path / "report.json").read_text())["schemes"]}
    assert note in report["S1"]
    assert not any("prints at" in n for n in report["S2"])  # the short scheme prints at its size
    assert min(printed_sizes(scheme_page(reader, "S2"))) >= 6.0 - 0.005
    assert f"figure: {escape(note)}" in (tmp_path / "si-figures" / "index.html").read_text()
    again = collect("s", "-o", out, "--style", style, "--paper", paper, "-j", "1", "--cache", tmp_path / "cache",
                    cwd=tmp_path)                            # the whole document from the cache: the note stays
    assert again.returncode == 0 and "0 drawn" in again.stderr and notes[0] in again.stderr.splitlines()


# --- 2. a two-column figure prints at its size on A4 ------------------------------------------------

@pytest.mark.parametrize("paper,size", [("a4", (595, 842)), ("letter", (612, 792))])
def test_a_two_column_figure_prints_at_its_own_size_on_a4_and_letter(tmp_path, paper, size):
    """The A4 text block was 170 mm wide (20 mm margins), the two-column preset 171 mm: every
    two-column figure was placed at 99.42% and its 6 pt text printed at 5.96 pt."""
    out = tmp_path / "si.pdf"
    proc = collect(GALLERY[7], "-o", out, "--style", "two-column", "--paper", paper, "-j", "1",
                   "--cache", tmp_path / "cache", "--report", tmp_path / "r.json")
    assert proc.returncode == 0, proc.stderr
    reader = PdfReader(out)
    page = scheme_page(reader, "S1")
    assert (round(float(page.mediabox.width)), round(float(page.mediabox.height))) == size
    sizes = printed_sizes(page)
    figure_sizes = sorted({round(s, 3) for s in sizes})
    assert min(sizes) == pytest.approx(6.0, abs=0.001), figure_sizes   # the preset's smallest text
    assert "prints at" not in proc.stderr
    # the figure's own file: 171 mm wide (the preset), so the page holds it whole
    svg = (tmp_path / "si-figures" / "S1-08-sn2-cyanide.svg").read_text()
    width = float(re.search(r'<svg[^>]*\swidth="([0-9.]+)pt"', svg)[1])
    assert width == pytest.approx(171 * MM, abs=0.05)


# --- 3. natural order, zero-padded file names ------------------------------------------------------

def test_schemes_are_numbered_in_natural_order_and_file_names_are_zero_padded(tmp_path):
    """`1-sn2, 10-da, 2-sn1` was the order of a plain sort; a person reads 1, 2, 10. Files named on
    the command line keep the order given. With ten or more schemes the figure files are
    S01-..., S10-... (a file listing sorts them as numbered); the printed labels stay S1, S10."""
    folder = tmp_path / "s"
    folder.mkdir()
    names = [f"{n}-{path.stem.split('-', 1)[1]}.mech" for n, path in enumerate(GALLERY[:11], 1)]
    for name, path in zip(names, GALLERY):
        shutil.copy(path, folder / name)
    proc = collect("s", "-o", tmp_path / "si.pdf", "-j", "1", "--cache", tmp_path / "cache",
                   "--report", tmp_path / "r.json", cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    report = json.loads((tmp_path / "r.json").read_text())["schemes"]
    assert [s["file"] for s in report] == [f"s/{name}" for name in names]      # 1, 2, ..., 10, 11
    assert [s["label"] for s in report] == [f"S{n}" for n in range(1, 12)]
    files = sorted(p.name for p in (tmp_path / "si-figures").glob("*.svg"))
    assert files == [f"S{n:02d}-{name[:-5]}.svg" for n, name in enumerate(names, 1)]
    assert [s["figure"] for s in report] == files
    index = (tmp_path / "si-figures" / "index.html").read_text()
    assert 'src="S10-10-' in index and 'id="S10"' in index
    text = " ".join(flat(p.extract_text()) for p in PdfReader(tmp_path / "si.pdf").pages)
    assert "Scheme S10. " in text and "Scheme S01" not in text
    checked = subprocess.run(["arrows", "check", "s"], capture_output=True, text=True, cwd=tmp_path, timeout=300)
    noted = list(dict.fromkeys(re.findall(r"^(s/\S+\.mech):\d+:\d+:", checked.stdout, re.M)))
    assert noted == [f"s/{name}" for name in names if f"s/{name}" in noted]    # `check` walks the same order
    named = collect(folder / names[9], folder / names[1], "-o", tmp_path / "n.pdf", "-j", "1",
                    "--cache", tmp_path / "cache", "--report", tmp_path / "n.json")
    assert named.returncode == 0, named.stderr
    assert [Path(s["file"]).name for s in json.loads((tmp_path / "n.json").read_text())["schemes"]] == \
        [names[9], names[1]]                                                  # as given
    assert sorted(p.name for p in (tmp_path / "n-figures").glob("*.svg"))[0].startswith("S1-")   # one digit


# --- 4. outline entries with titles, and a /Title -----------------------------------------------------

def test_outline_entries_carry_the_scheme_titles_and_the_pdf_has_a_title(tmp_path):
    """The outline read "Scheme S1", "Scheme S2"; flowed pages joined them ("Scheme S1; Scheme
    S2"). Each scheme now has its own entry as its page heads it; without --title the PDF's
    metadata held only /Producer."""
    files = [GALLERY[7], GALLERY[12]]   # 08-sn2-cyanide, 13-diels-alder
    titles = [re.search(r'^title\s+"([^"]*)"', p.read_text(), re.M)[1] for p in files]
    for flow in ([], ["--flow"]):
        out = tmp_path / f"si{len(flow)}.pdf"
        proc = collect(*files, "-o", out, *flow, "-j", "1", "--cache", tmp_path / "cache")
        assert proc.returncode == 0, proc.stderr
        reader = PdfReader(out)
        outline = [item.title for item in reader.outline]
        assert outline == ["Contents", f"Scheme S1. {titles[0]}", f"Scheme S2. {titles[1]}", "Summary of checks"]
        for n, title in enumerate(titles, 1):
            target = reader.get_destination_page_number(reader.outline[n])
            assert flat(reader.pages[target].extract_text()).count(f"Scheme S{n}. {title}") == 1
        assert reader.metadata["/Title"] == "Schemes"
    titled = collect(*files, "-o", tmp_path / "t.pdf", "--title", "SI of a paper", "-j", "1",
                     "--cache", tmp_path / "cache")
    assert titled.returncode == 0
    reader = PdfReader(tmp_path / "t.pdf")
    assert reader.metadata["/Title"] == "SI of a paper" and reader.outline[0].title == "SI of a paper"


# --- 5. the source paths can be left out of the document ------------------------------------------

def test_no_source_paths_leaves_the_paths_out_of_the_document_and_keeps_the_check_status(tmp_path):
    """Every scheme's status line read "Source /home/.../x.mech. Checked: passed" with no way
    to leave the local path out of a document meant for a journal."""
    folder = tmp_path / "private-folder"
    folder.mkdir()
    shutil.copy(GALLERY[7], folder / "a.mech")
    (folder / "b.mech").write_text('species w = "[OH2:1]"\nspecies b = "[OH-:2]"\n'
                                   'step "proton transfer"\n    :O2 -> H(O1)\n    O1-H -> O1\nend\n')  # untitled
    out = tmp_path / "si.pdf"
    proc = collect(folder, "-o", out, "--no-source-paths", "-j", "1", "--cache", tmp_path / "cache",
                   "--report", tmp_path / "r.json")
    assert proc.returncode == 0, proc.stderr
    pages = [flat(p.extract_text()) for p in PdfReader(out).pages]
    assert not any("private-folder" in page or str(tmp_path) in page for page in pages), pages
    assert "Checked: passed" in pages[1] and "Source " not in pages[1]
    assert pages[2].startswith("Scheme S2. b.mech")        # an untitled scheme: its file's own name
    assert any("S1: passed" in page for page in pages)     # the summary of checks
    # the console and the report keep the paths; so does a run without the option
    assert f"{folder}/a.mech" in proc.stderr
    assert json.loads((tmp_path / "r.json").read_text())["schemes"][0]["file"] == f"{folder}/a.mech"
    kept = collect(folder, "-o", tmp_path / "k.pdf", "-j", "1", "--cache", tmp_path / "cache")
    assert kept.returncode == 0 and f"Source {folder}/a.mech." in flat(PdfReader(tmp_path / "k.pdf").pages[1]
                                                                        .extract_text())
    helped = flat(subprocess.run(["arrows", "collect", "--help"], capture_output=True, text=True, timeout=60).stdout)
    assert "--no-source-paths" in helped
    readme = flat((ROOT / "README.md").read_text())
    assert "--no-source-paths" in readme and "--png DPI" in readme


FAULTY_UNTITLED = ('species methane = "[CH4:1]"\nspecies base = "[OH-:2]"\n'
                   'step "impossible addition"\n    :O2 -> C1\nend\n')   # a fifth bond to carbon: AR301, drawn marked


def test_no_source_paths_leaves_the_paths_out_of_the_figures_too(tmp_path):
    """The figure of a faulty scheme listed its errors as "error 1: /.../private-folder/b.mech:4:5
    AR301 ...", and an untitled figure's SVG <title> and PDF title were the path: both went into
    the document and the figure files. The figures now name the file by its own name."""
    folder = tmp_path / "private-folder"
    folder.mkdir()
    shutil.copy(GALLERY[7], folder / "a.mech")
    (folder / "b.mech").write_text(FAULTY_UNTITLED)
    out = tmp_path / "si.pdf"
    proc = collect(folder, "-o", out, "--no-source-paths", "-j", "1", "--cache", tmp_path / "cache")
    assert proc.returncode == 1, proc.stderr
    document = " ".join(flat(p.extract_text()) for p in PdfReader(out).pages)
    assert "error 1: b.mech:4:5 AR301" in document and "private-folder" not in document, document
    figures = tmp_path / "si-figures"
    for svg in sorted(figures.glob("*.svg")):
        assert "private-folder" not in svg.read_text(), svg.name
        assert "private-folder" not in str(PdfReader(svg.with_suffix(".pdf")).metadata.title), svg.name
    assert '<title id="title">b.mech</title>' in (figures / "S2-b.svg").read_text()


def test_a_figure_is_found_in_the_cache_whatever_path_names_its_folder(tmp_path):
    """The cache was keyed by the path as typed: the same folder named by its absolute path, from
    inside it, or copied elsewhere redrew every scheme. The figure shows only the file's own name,
    so that (with the bytes, the style and the tool) is the key; the diagnostics of a cached scheme
    still name the file as this run reaches it."""
    (tmp_path / "mechs").mkdir()
    shutil.copy(GALLERY[7], tmp_path / "mechs" / "a.mech")
    (tmp_path / "mechs" / "b.mech").write_text(FAULTY_UNTITLED)
    cache = tmp_path / "cache"
    first = collect("mechs", "-o", "one/si.pdf", "-j", "1", "--cache", cache, cwd=tmp_path)
    assert "2 drawn, 0 from the cache" in first.stderr, first.stderr
    shutil.copytree(tmp_path / "mechs", tmp_path / "copy")
    for folder, cwd in [(tmp_path / "mechs", tmp_path), (".", tmp_path / "mechs"), ("copy", tmp_path)]:
        again = collect(folder, "-o", tmp_path / "two" / "si.pdf", "-j", "1", "--cache", cache,
                        "--report", tmp_path / "r.json", cwd=cwd)
        assert "0 drawn, 2 from the cache" in again.stderr, (folder, again.stderr)
        named = (Path(folder) / "b.mech").as_posix()   # (from inside the folder: "b.mech")
        assert f"\n{named}:4:5: error AR301" in again.stderr, again.stderr
        scheme = json.loads((tmp_path / "r.json").read_text())["schemes"][1]
        assert scheme["file"] == named and {d["file"] for d in scheme["diagnostics"]} == {named}


def test_a_scheme_with_nothing_to_draw_is_explained_without_a_class_name(tmp_path):
    """An SI page read "the figure could not be drawn: DrawError: the mechanism has no starting
    state ...": the name of an exception class of the program, in a published document."""
    (tmp_path / "empty.mech").write_text("# nothing yet\n")
    out = tmp_path / "si.pdf"
    proc = collect(tmp_path / "empty.mech", "-o", out, "-j", "1", "--cache", tmp_path / "cache",
                   "--report", tmp_path / "r.json")
    assert proc.returncode == 1, proc.stderr
    document = " ".join(flat(p.extract_text()) for p in PdfReader(out).pages)
    report = json.loads((tmp_path / "r.json").read_text())
    problem = report["schemes"][0]["figure_problem"]
    assert problem and "Error:" not in problem and "Error:" not in document and "Error:" not in proc.stderr, problem


# --- 6. PNG figure files on request ------------------------------------------------------------------

def test_png_figure_files_on_request(tmp_path):
    """collect wrote SVG and PDF figure files only. `--png DPI` adds a PNG of each figure, its
    pixels the figure's size at DPI (as `arrows draw --dpi` makes them), opaque, its resolution
    recorded; a warm run takes them from the cache with the same bytes."""
    from PIL import Image
    out = tmp_path / "si.pdf"
    runs = []
    for _ in range(2):
        proc = collect(GALLERY[7], GALLERY[12], "-o", out, "--png", "100", "-j", "1", "--cache", tmp_path / "cache")
        assert proc.returncode == 0, proc.stderr
        folder = tmp_path / "si-figures"
        pngs = sorted(folder.glob("*.png"))
        assert [p.stem for p in pngs] == sorted(p.stem for p in folder.glob("*.svg")) and len(pngs) == 2
        for png in pngs:
            svg = png.with_suffix(".svg").read_text()
            width, height = (float(v) for v in re.search(r'width="([0-9.]+)pt" height="([0-9.]+)pt"', svg).groups())
            with Image.open(png) as image:
                # (cairo's whole pixels: within one of the exact size)
                assert all(abs(got - size * 100 / 72) < 1 for got, size in zip(image.size, (width, height)))
                assert image.mode == "RGB" and round(image.info["dpi"][0]) == 100
        runs.append({p.name: p.read_bytes() for p in pngs})
    assert runs[0] == runs[1]
    assert "0 drawn" in proc.stderr
    plain = collect(GALLERY[7], "-o", tmp_path / "p.pdf", "-j", "1", "--cache", tmp_path / "cache")
    assert plain.returncode == 0 and not list((tmp_path / "p-figures").glob("*.png"))
    bad = collect(GALLERY[7], "-o", tmp_path / "b.pdf", "--png", "5")
    assert bad.returncode == 2 and "--png" in bad.stderr
    # a slide (960 x 540 pt) at 2400 dpi: 576 million pixels, over the limit `arrows draw` refuses
    # (arrows.draw.export.MAX_PNG_PIXELS): no PNG, a note saying why, the rest written
    huge = collect(GALLERY[7], "-o", tmp_path / "h.pdf", "--style", "slide", "--png", "2400", "-j", "1",
                   "--cache", tmp_path / "cache")
    assert huge.returncode == 0, huge.stderr
    assert re.search(r"^S1 \S+: note: no PNG file: .* 2400 dpi .* lower --png to \d+", huge.stderr, re.M), huge.stderr
    assert not list((tmp_path / "h-figures").glob("*.png")) and list((tmp_path / "h-figures").glob("*.svg"))
