"""`arrows collect`: many mechanisms -> one supporting-information PDF, figures and an HTML index.

Outside judges: pypdf reads the document back (page count, text of every page, outline); a real
headless Chromium (Debian's package) loads the HTML index and reports, through its own DevTools
protocol, console errors, every request it made and whether each image decoded; the JUnit file is
parsed with the standard library's XML parser.
"""
from __future__ import annotations

import fcntl
import html
import json
import os
import pty
import re
import select
import shutil
import signal
import struct
import subprocess
import termios
import time
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
import rdkit
from pypdf import PdfReader

import arrows

from textbook_mechanisms import TEXTBOOK

ROOT = Path(__file__).resolve().parent.parent
GALLERY = sorted((ROOT / "gallery").glob("*.mech"))
# A gallery mechanism whose check prints notes (its ring closure's): a file seen as checked.
NOTED = next(p for p in GALLERY if p.name == "04-heptanedione-cyclohexenone.mech")
SCHEMES = 33    # 30 from the gallery and its variations, 3 broken on purpose

BROKEN = {
    # a step without `end`: the file does not parse, so there is no figure
    "zz-broken-syntax.mech": ('title "Unclosed step"\nspecies w = "[OH2:1]"\nspecies b = "[OH-:2]"\n'
                              'step "proton transfer"\n    :O2 -> H(O1)\n    O1-H -> O1\n', "AR101"),
    # an unclosed branch in a SMILES: no starting state, no figure
    "zz-broken-smiles.mech": ('title "Unreadable SMILES"\nspecies dione = "CC(=O"\nstep "none"\nend\n', "AR102"),
    # a fifth bond to carbon (Lewis octet rule, common practice): drawn, with the error marked
    "zz-broken-octet.mech": ('title "Hydroxide onto a saturated carbon"\n'
                             'caption "Broken on purpose: the arrow gives C1 a fifth bond."\n'
                             'species methane = "[CH4:1]"\nspecies base = "[OH-:2]"\n'
                             'step "impossible addition"\n    :O2 -> C1\nend\n', "AR301"),
}


def make_corpus(folder: Path) -> list[tuple[str, str, str]]:
    """Every gallery mechanism, 14 variations (own title, caption and conditions), and the broken
    files; returns (file name, title, caption) in collection order."""
    folder.mkdir(parents=True)
    for path in GALLERY:
        shutil.copy(path, folder / path.name)
    for n, path in enumerate(GALLERY[:30 - len(GALLERY)], 1):
        text = path.read_text()
        text = re.sub(r'^title\s+"([^"]*)"', lambda m: f'title "{m.group(1)}, variation {n}"', text, count=1, flags=re.M)
        if re.search(r"^caption ", text, flags=re.M):
            text = re.sub(r'^caption\s+"([^"]*)"', lambda m: f'caption "Variation {n}. {m.group(1)}"', text,
                          count=1, flags=re.M)
        else:
            text = re.sub(r"^(title .*)$", lambda m: m.group(1) + f'\ncaption "Variation {n}."', text, count=1,
                          flags=re.M)
        text = re.sub(r'under "[^"]*"', 'under "THF, -78 °C"', text)
        (folder / f"{path.stem}-variation-{n}.mech").write_text(text)
    for name, (text, _) in BROKEN.items():
        (folder / name).write_text(text)
    order = []
    for path in sorted(folder.glob("*.mech")):
        text = path.read_text()
        title = re.search(r'^title\s+"([^"]*)"', text, flags=re.M)
        caption = re.search(r'^caption\s+"([^"]*)"', text, flags=re.M)
        order.append((path.name, title.group(1) if title else "", caption.group(1) if caption else ""))
    assert len(order) == SCHEMES
    return order


def collect(*args, cwd=None) -> subprocess.CompletedProcess:
    return subprocess.run(["arrows", "collect", *map(str, args)], capture_output=True, text=True, cwd=cwd,
                          timeout=900)


def snapshot(out: Path) -> dict[str, bytes]:
    """Every file of one output: the PDF and the figures folder."""
    files = {out.name: out.read_bytes()}
    folder = out.with_name(out.stem + "-figures")
    for path in sorted(folder.iterdir()):
        files[f"{folder.name}/{path.name}"] = path.read_bytes()
    return files


def flat(text: str) -> str:
    return " ".join(text.split())


def shown(name: str) -> str:
    """How the batch names a corpus file: as reached from the command line, which gives the
    corpus folder from its parent."""
    return f"schemes/{name}"


@pytest.fixture(scope="module")
def corpus(tmp_path_factory):
    base = tmp_path_factory.mktemp("collect")
    order = make_corpus(base / "schemes")
    out = base / "one" / "si.pdf"
    proc = collect("schemes", "-o", out, "-j", "1", "--title", "Supporting information",
                   "--authors", "A. Chemist, B. Chemist", "--date", "1 March 2026", "--cache", base / "cache",
                   "--report", base / "one" / "report.json", "--junit", base / "one" / "junit.xml", cwd=base)
    return {"base": base, "folder": base / "schemes", "order": order, "out": out, "proc": proc}


def test_the_document_has_every_scheme_numbered_and_captioned(corpus):
    proc = corpus["proc"]
    assert proc.returncode == 1, proc.stderr            # three schemes have errors
    assert "Traceback" not in proc.stderr
    reader = PdfReader(corpus["out"])
    texts = [flat(page.extract_text()) for page in reader.pages]
    summary = [i for i, t in enumerate(texts) if t.startswith("Summary of checks")]
    assert summary and summary == list(range(summary[0], len(texts)))   # the summary closes the document
    # title page, one contents page, one page per scheme, then the summary
    assert len(reader.pages) == 1 + 1 + SCHEMES + len(summary)
    assert "Supporting information" in texts[0] and "A. Chemist, B. Chemist" in texts[0] and "1 March 2026" in texts[0]
    assert texts[1].startswith("Contents")
    for number, (name, title, caption) in enumerate(corpus["order"], 1):
        page = texts[1 + number]
        assert page.startswith(f"Scheme S{number}. "), (number, page[:80])
        if name == "zz-broken-syntax.mech":
            assert page.startswith(f"Scheme S{number}. {shown(name)}")   # unparsed: the file names the scheme
        elif title:
            assert page.startswith(f"Scheme S{number}. {flat(title)}")
        if caption and name != "zz-broken-syntax.mech":
            assert flat(caption) in page
        assert f"Source {shown(name)}." in page
        # the contents gives the page a PDF viewer shows for it
        assert re.search(rf"S{number} .*? {number + 2}\b", texts[1])
    outline = [item.title for item in reader.outline]
    assert outline[:2] == ["Supporting information", "Contents"]
    assert outline[2] == f"Scheme S1. {flat(corpus['order'][0][1])}"   # the scheme as its page heads it
    assert reader.metadata["/Author"] == "A. Chemist, B. Chemist"


def test_progress_is_a_bar_on_a_terminal_and_lines_otherwise(corpus, tmp_path):
    assert "[1/33] S1 schemes/01-enolate-formation-variation-1.mech: passed (drawn)" in corpus["proc"].stderr
    controller, terminal = pty.openpty()
    fcntl.ioctl(terminal, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 100, 0, 0))   # a 100-column terminal
    proc = subprocess.run(["arrows", "collect", str(GALLERY[0]), "-o", str(tmp_path / "one.pdf"), "-j", "1"],
                          stdout=subprocess.PIPE, stderr=terminal, timeout=300)
    os.close(terminal)
    shown = b""
    while True:
        try:
            chunk = os.read(controller, 1 << 16)
        except OSError:      # the terminal is closed and drained
            break
        if not chunk:
            break
        shown += chunk
    os.close(controller)
    assert proc.returncode == 0
    assert b"0/1 [" in shown and b"[1/1]" not in shown     # tqdm's bar, not the plain lines


def test_the_broken_files_are_in_the_summary_with_their_codes(corpus):
    reader = PdfReader(corpus["out"])
    summary = " ".join(flat(p.extract_text()) for p in reader.pages if flat(p.extract_text()).startswith("Summary"))
    assert f"{SCHEMES} schemes: {SCHEMES - 3} passed, 3 with errors" in summary
    for number, (name, _, _) in enumerate(corpus["order"], 1):
        if name in BROKEN:
            code = BROKEN[name][1]
            assert re.search(rf"S{number} {re.escape(shown(name))}: 1 error \({code}\)", summary), name
            assert f"error {code}" in summary
        else:
            assert f"S{number} {shown(name)}: passed" in summary
    assert "zz-broken-syntax.mech: 1 error (AR101)" in corpus["proc"].stderr


def test_report_and_junit_list_every_scheme(corpus):
    report = json.loads((corpus["out"].parent / "report.json").read_text())
    assert report["totals"]["schemes"] == SCHEMES and report["totals"]["failed"] == 3
    # the versions that made the verdicts: arrows's own and RDKit's (rdkit.__version__, asked here)
    assert report["tool"] == {"name": "arrows", "version": arrows.__version__, "rdkit": rdkit.__version__}
    failed = {s["file"] for s in report["schemes"] if s["failed"]}
    assert failed == {shown(name) for name in BROKEN}
    suite = ET.parse(corpus["out"].parent / "junit.xml").getroot().find("testsuite")
    assert suite.get("tests") == str(SCHEMES) and suite.get("failures") == "3"
    failures = {case.get("file"): case.find("failure") for case in suite.iter("testcase")}
    for name, (_, code) in BROKEN.items():
        assert failures[shown(name)] is not None and code in failures[shown(name)].text


def test_a_scheme_with_no_figure_is_not_said_to_be_drawn(corpus):
    """The two files that cannot be read or replayed have no figure: the progress line says so and
    the summary counts them apart (it once said "(drawn)" and counted them among the drawn)."""
    err = corpus["proc"].stderr
    assert re.search(r"zz-broken-syntax\.mech: 1 error \(AR101\) \(no figure\)", err), err
    assert f"{SCHEMES - 2} drawn, 0 from the cache, 2 without a figure" in err, err
    report = json.loads((corpus["out"].parent / "report.json").read_text())
    # the report's words and numbers are the console's (it said 33 "rendered" for 31 drawn)
    assert report["totals"] == {**report["totals"], "drawn": SCHEMES - 2, "from_cache": 0, "without_figure": 2}
    assert [s["file"] for s in report["schemes"] if not s["drawn"]] == [shown(n) for n in
                                                                      ("zz-broken-smiles.mech", "zz-broken-syntax.mech")]


def test_figures_beside_the_document(corpus):
    folder = corpus["out"].with_name("si-figures")
    drawn = [name for name, _, _ in corpus["order"] if name not in ("zz-broken-syntax.mech", "zz-broken-smiles.mech")]
    svgs = sorted(folder.glob("*.svg"))
    assert len(svgs) == len(drawn) == SCHEMES - 2
    for svg in svgs:
        ET.fromstring(svg.read_bytes())                     # well-formed XML
        assert len(PdfReader(svg.with_suffix(".pdf")).pages) == 1
    assert (folder / "index.html").is_file()


def test_a_warm_rerun_draws_nothing_and_gives_the_same_bytes(corpus, tmp_path):
    out, cache = tmp_path / "si.pdf", tmp_path / "cache"
    assert collect(corpus["folder"], "-o", out, "-j", "2", "--title", "SI", "--cache", cache).returncode == 1
    before = snapshot(out)
    again = collect(corpus["folder"], "-o", out, "-j", "2", "--title", "SI", "--cache", cache,
                    "--report", tmp_path / "report.json")
    assert again.returncode == 1
    report = json.loads((tmp_path / "report.json").read_text())
    assert report["totals"] == {**report["totals"], "drawn": 0, "from_cache": SCHEMES - 2, "without_figure": 2}
    assert "0 drawn" in again.stderr
    assert snapshot(out) == before


def test_jobs_2_gives_the_bytes_of_jobs_1(corpus, tmp_path):
    outputs = {}
    for jobs in (1, 2):
        out = tmp_path / f"j{jobs}" / "si.pdf"
        proc = collect(corpus["folder"], "-o", out, "-j", jobs, "--title", "SI", "--cache", tmp_path / f"cache{jobs}")
        assert proc.returncode == 1
        outputs[jobs] = snapshot(out)
    assert outputs[1].keys() == outputs[2].keys()
    for name in outputs[1]:
        assert outputs[1][name] == outputs[2][name], name


def worker_of(pid: int) -> int:
    """A worker process of the run `pid`: a child running the same command line."""
    own = Path(f"/proc/{pid}/cmdline").read_bytes()
    for child in Path(f"/proc/{pid}/task/{pid}/children").read_text().split():
        if Path(f"/proc/{child}/cmdline").read_bytes() == own:
            return int(child)
    raise LookupError("no worker yet")


def ctrl_c(run: subprocess.Popen) -> None:
    run.send_signal(signal.SIGINT)


def kill_a_worker(run: subprocess.Popen) -> None:
    os.kill(worker_of(run.pid), signal.SIGKILL)


@pytest.mark.parametrize("stop,exit_code,message", [(ctrl_c, 130, "interrupted"),
                                                    (kill_a_worker, 1, "worker process stopped")],
                         ids=["ctrl-c", "killed-worker"])
def test_a_stopped_run_keeps_the_old_output_and_the_rerun_resumes(corpus, tmp_path, stop, exit_code, message):
    folder, cache = corpus["folder"], tmp_path / "cache"
    out = tmp_path / "si.pdf"
    assert collect(folder, "-o", out, "--style", "one-column", "-j", "2", "--cache", cache).returncode == 1
    before = snapshot(out)
    entries = lambda: len([p for p in (cache / "figures").iterdir() if not p.name.startswith(".")])
    assert entries() == SCHEMES

    # A new style changes every figure; stop the run after a few have been drawn.
    run = subprocess.Popen(["arrows", "collect", str(folder), "-o", str(out), "--style", "two-column", "-j", "2",
                            "--cache", str(cache)], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    deadline = time.monotonic() + 120
    while entries() < SCHEMES + 4 and run.poll() is None and time.monotonic() < deadline:
        time.sleep(0.01)
    stop(run)
    _, err = run.communicate(timeout=120)             # ends by itself: no hang on a lost task
    drawn_before_stop = entries() - SCHEMES
    figures_before_stop = len([p for p in (cache / "figures").iterdir() if (p / "figure.svg").is_file()]) - (SCHEMES - 2)
    assert run.returncode == exit_code, err
    assert message in err and "is as it was" in err and "Traceback" not in err
    assert 0 < drawn_before_stop < SCHEMES, "the run was not stopped part way"
    assert snapshot(out) == before                                   # the previous output, untouched

    resumed = collect(folder, "-o", out, "--style", "two-column", "-j", "2", "--cache", cache,
                      "--report", tmp_path / "report.json")
    assert resumed.returncode == 1
    report = json.loads((tmp_path / "report.json").read_text())
    figures = [p for p in (cache / "figures").iterdir() if (p / "figure.svg").is_file()]
    assert len(figures) == 2 * (SCHEMES - 2)                          # both styles' figures, each once
    assert report["totals"]["drawn"] == (SCHEMES - 2) - figures_before_stop   # only what was missing
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".arrows-tmp")]

    reference = tmp_path / "reference" / "si.pdf"
    assert collect(folder, "-o", reference, "--style", "two-column", "-j", "1",
                   "--cache", tmp_path / "fresh").returncode == 1
    assert snapshot(out) == snapshot(reference)


def test_fail_fast_stops_without_writing(corpus, tmp_path):
    out = tmp_path / "si.pdf"
    proc = collect(corpus["folder"] / "zz-broken-octet.mech", corpus["folder"] / GALLERY[0].name, "-o", out,
                   "--fail-fast", "-j", "1", "--cache", tmp_path / "cache", "--report", tmp_path / "r.json")
    assert proc.returncode == 1 and "--fail-fast" in proc.stderr
    assert not out.exists()
    report = json.loads((tmp_path / "r.json").read_text())
    assert report["complete"] is False and len(report["schemes"]) == 1


def test_usage_errors(tmp_path):
    assert collect(tmp_path / "nothing-here", "-o", tmp_path / "x.pdf").returncode == 2
    (tmp_path / "empty").mkdir()
    assert collect(tmp_path / "empty", "-o", tmp_path / "x.pdf").returncode == 2
    # a folder of the figures folder's name that arrows did not make is never replaced
    (tmp_path / "x-figures").mkdir()
    (tmp_path / "x-figures" / "thesis.tex").write_text("keep me")
    proc = collect(GALLERY[0], "-o", tmp_path / "x.pdf")
    assert proc.returncode == 2 and "was not made by arrows collect" in proc.stderr
    assert (tmp_path / "x-figures" / "thesis.tex").read_text() == "keep me"


def test_flow_letter_and_prefix(corpus, tmp_path):
    out = tmp_path / "flow.pdf"
    proc = collect(*GALLERY[:6], "-o", out, "--flow", "--paper", "letter", "--prefix", "A", "-j", "1",
                   "--cache", tmp_path / "cache")
    assert proc.returncode == 0, proc.stderr
    reader = PdfReader(out)
    width, height = float(reader.pages[0].mediabox.width), float(reader.pages[0].mediabox.height)
    assert (round(width), round(height)) == (612, 792)              # US Letter in points
    text = " ".join(flat(p.extract_text()) for p in reader.pages)
    for n in range(1, 7):
        assert f"Scheme A{n}." in text
    scheme_pages = [p for p in reader.pages if "Scheme A" in p.extract_text() and "Contents" not in p.extract_text()]
    assert len(scheme_pages) < 6                                    # several schemes share a page


# --- the HTML index in a real browser ----------------------------------------------------------

class DevTools:
    """A minimal Chrome DevTools Protocol client over --remote-debugging-pipe (fds 3 and 4)."""

    def __init__(self, browser: str, profile: Path):
        to_browser_r, self._to_browser = os.pipe()
        self._from_browser, from_browser_w = os.pipe()

        def wire():
            os.dup2(to_browser_r, 3)
            os.dup2(from_browser_w, 4)

        self.proc = subprocess.Popen(
            [browser, "--headless=new", "--remote-debugging-pipe", "--no-sandbox", "--disable-gpu",
             "--no-first-run", "--no-default-browser-check", f"--user-data-dir={profile}", "about:blank"],
            preexec_fn=wire, close_fds=False, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        os.close(to_browser_r)
        os.close(from_browser_w)
        self._buffer = b""
        self._next_id = 0
        self.events: list[dict] = []

    def send(self, method: str, params: dict | None = None, session: str | None = None, timeout: float = 60) -> dict:
        self._next_id += 1
        message = {"id": self._next_id, "method": method, "params": params or {}}
        if session:
            message["sessionId"] = session
        os.write(self._to_browser, json.dumps(message).encode() + b"\0")
        while True:
            reply = self._read(timeout)
            if reply.get("id") == self._next_id:
                if "error" in reply:
                    raise RuntimeError(f"{method}: {reply['error']}")
                return reply.get("result", {})
            self.events.append(reply)

    def wait_for(self, method: str, timeout: float = 60) -> dict:
        for event in self.events:
            if event.get("method") == method:
                return event
        while True:
            event = self._read(timeout)
            self.events.append(event)
            if event.get("method") == method:
                return event

    def _read(self, timeout: float) -> dict:
        deadline = time.monotonic() + timeout
        while b"\0" not in self._buffer:
            left = deadline - time.monotonic()
            if left <= 0 or not select.select([self._from_browser], [], [], left)[0]:
                raise TimeoutError("the browser did not answer")
            chunk = os.read(self._from_browser, 1 << 16)
            if not chunk:
                raise EOFError("the browser closed the pipe")
            self._buffer += chunk
        message, self._buffer = self._buffer.split(b"\0", 1)
        return json.loads(message)

    def close(self) -> None:
        try:
            self.send("Browser.close", timeout=10)
        except (RuntimeError, TimeoutError, EOFError, OSError):
            pass
        try:
            self.proc.wait(timeout=20)
        except subprocess.TimeoutExpired:
            self.proc.kill()
        os.close(self._to_browser)
        os.close(self._from_browser)


def test_the_html_index_shows_every_figure_offline_in_chromium(corpus, tmp_path):
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        pytest.skip("Debian's chromium package is not installed here (.ci/run installs it)")
    index = corpus["out"].with_name("si-figures") / "index.html"
    tools = DevTools(browser, tmp_path / "profile")
    try:
        target = tools.send("Target.createTarget", {"url": "about:blank"})["targetId"]
        session = tools.send("Target.attachToTarget", {"targetId": target, "flatten": True})["sessionId"]
        for domain in ("Page", "Runtime", "Log", "Network"):
            tools.send(f"{domain}.enable", session=session)
        tools.send("Page.navigate", {"url": index.as_uri()}, session=session)
        tools.wait_for("Page.loadEventFired")
        images = tools.send("Runtime.evaluate", {
            "expression": "JSON.stringify(Array.from(document.images, i => [i.getAttribute('src'), i.complete, "
                          "i.naturalWidth]))", "returnByValue": True}, session=session)["result"]["value"]
        shot = tools.send("Page.captureScreenshot", {"format": "png"}, session=session)
        (tmp_path / "index.png").write_bytes(__import__("base64").b64decode(shot["data"]))
    finally:
        tools.close()
    images = json.loads(images)
    figures = sorted(p.name for p in index.parent.glob("*.svg"))
    assert sorted(src for src, _, _ in images) == figures and len(figures) == SCHEMES - 2
    assert all(complete and width > 0 for _, complete, width in images), images
    problems = [e for e in tools.events
                if e.get("method") == "Runtime.exceptionThrown"
                or (e.get("method") == "Runtime.consoleAPICalled" and e["params"]["type"] in ("error", "assert"))
                or (e.get("method") == "Log.entryAdded" and e["params"]["entry"]["level"] == "error")
                or e.get("method") == "Network.loadingFailed"]
    assert not problems, problems
    requested = [e["params"]["request"]["url"] for e in tools.events if e.get("method") == "Network.requestWillBeSent"]
    assert requested and all(url.startswith("file://") for url in requested), requested   # nothing from a network


def test_a_broken_worker_pool_ends_the_map_with_worker_died_at_the_next_submit():
    """A worker killed while none of the map's own tasks waits for a result breaks the pool
    between two submits: the next submit raises concurrent.futures' BrokenProcessPool, which
    escaped as a traceback from `arrows collect` (the killed-worker run above, now and then).
    It ends the map with WorkerDied, as a broken result does."""
    from arrows.batch.parallel import WorkerDied, WorkerPool
    with WorkerPool(2) as pool:
        lost = pool._executor.submit(os._exit, 1)   # a worker that dies outside the map
        assert lost.exception(timeout=60) is not None   # the pool has noticed
        with pytest.raises(WorkerDied):
            list(pool.map(abs, [1, -2, 3]))


def test_the_layout_notes_of_every_figure_are_reported(tmp_path):
    """What `arrows draw` prints as a note when the layout had to compromise ("check the figure")
    is reported by a batch too: on the console, in the index and in the JSON report, scheme by
    scheme, the same notes as the scene's. (The Friedel-Crafts alkylation's arenium H stands 0.26 bond
    lengths from a tert-butyl methyl, a compromise known to the layout; the SN2 of the gallery has
    none.)
    They were once dropped, so a batch of SI figures said nothing of a figure that needs a look."""
    import arrows
    from arrows.draw import STYLES, build_scene
    folder = tmp_path / "schemes"
    folder.mkdir()
    (folder / "a-alkylation.mech").write_text(TEXTBOOK["friedel-crafts alkylation"][0])
    shutil.copy(ROOT / "gallery" / "08-sn2-cyanide.mech", folder / "b-sn2.mech")
    expected = {}
    for path in sorted(folder.glob("*.mech")):
        trace, diags = arrows.check_file(path)
        expected[path.name] = build_scene(trace, STYLES["one-column"].with_options(show_title=False), diags).notes
    assert expected["a-alkylation.mech"] and not expected["b-sn2.mech"]
    out = tmp_path / "si.pdf"
    proc = collect("schemes", "-o", out, "-j", "1", "--style", "one-column", "--cache", tmp_path / "cache",
                   "--report", tmp_path / "report.json", cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    for label, name in (("S1", "a-alkylation.mech"), ("S2", "b-sn2.mech")):
        printed = [line.split(": note: ", 1)[1] for line in proc.stderr.splitlines()
                   if line.startswith(f"{label} {shown(name)}: note: ")]
        assert printed == list(expected[name])
    report = {s["file"]: s["layout_notes"] for s in json.loads((tmp_path / "report.json").read_text())["schemes"]}
    assert report == {shown(name): list(notes) for name, notes in expected.items()}
    index = (tmp_path / "si-figures" / "index.html").read_text()
    for note in expected["a-alkylation.mech"]:
        assert f"figure: {html.escape(note)}" in index   # (a move's -> is written -&gt; in HTML)


def test_a_prefix_with_spaces_or_punctuation_is_bad_usage(tmp_path):
    """The prefix goes into every heading ("Scheme S3.") and figure file name: "Fig. " gave
    "Scheme Fig. 1." and file names with spaces in index.html's links."""
    done = collect(GALLERY[0], "-o", tmp_path / "si.pdf", "--prefix", "Fig. ")
    assert done.returncode == 2 and "--prefix" in done.stderr
    assert not (tmp_path / "si.pdf").exists()


def test_dot_files_and_dot_folders_are_left_out_of_a_folder(tmp_path):
    """A folder's version control, notebook checkpoints and editor files are not schemes (common
    practice of source tools: a walk skips dot-files and dot-folders); they once made S1-S5 of one
    mechanism. `arrows check FOLDER` walks the same way; a dot-file or dot-folder named on the
    command line is still read."""
    folder = tmp_path / "si"
    for name in ("a.mech", ".hidden.mech", ".git/x.mech", ".ipynb_checkpoints/a-checkpoint.mech", ".#a.mech"):
        (folder / name).parent.mkdir(parents=True, exist_ok=True)
        shutil.copy(NOTED, folder / name)
    runs = {"folder": ["si"], "named": ["si", "si/.hidden.mech", "si/.git"]}
    expected = {"folder": ["si/a.mech"], "named": ["si/a.mech", "si/.hidden.mech", "si/.git/x.mech"]}
    for run, inputs in runs.items():
        proc = collect(*inputs, "-o", tmp_path / f"{run}.pdf", "-j", "1", "--cache", tmp_path / "cache",
                       "--report", tmp_path / f"{run}.json", cwd=tmp_path)
        assert proc.returncode == 0, proc.stderr
        report = json.loads((tmp_path / f"{run}.json").read_text())
        assert [s["file"] for s in report["schemes"]] == expected[run]
        checked = subprocess.run(["arrows", "check", *inputs], capture_output=True, text=True, cwd=tmp_path,
                                 timeout=300)
        assert checked.returncode == 0 and f"{len(expected[run])} file" in checked.stderr, checked.stderr
        assert sorted(set(re.findall(r"^(\S+\.mech):\d+:\d+: note", checked.stdout, re.M))) == sorted(expected[run])
    for command in ("collect", "check"):
        helped = subprocess.run(["arrows", command, "--help"], capture_output=True, text=True, timeout=60).stdout
        assert "dot-files and" in flat(helped) and "dot-folders" in helped


def test_files_are_named_as_reached_from_the_command_line(tmp_path):
    """Two folders holding x.mech: console, report, pages and index name each as `arrows check`
    does (two/a/x.mech, two/b/x.mech). Both once said x.mech, and even one folder gave paths
    relative to itself (b/x.mech:7:5) that lead nowhere from where the command ran."""
    for folder, text in (("a", NOTED.read_text()), ("b", BROKEN["zz-broken-octet.mech"][0])):
        (tmp_path / "two" / folder).mkdir(parents=True)
        (tmp_path / "two" / folder / "x.mech").write_text(text)
    checked = subprocess.run(["arrows", "check", "two"], capture_output=True, text=True, cwd=tmp_path, timeout=300)
    error = re.search(r"^(two/b/x\.mech:\d+:\d+): error (AR301)", checked.stdout, re.M)
    assert error, checked.stdout
    for inputs in (["two/a", "two/b"], ["two"]):
        proc = collect(*inputs, "-o", "out/t.pdf", "--report", "out/r.json", "-j", "1", "--cache", "cache",
                       cwd=tmp_path)
        assert proc.returncode == 1, proc.stderr
        assert "S1 two/a/x.mech: passed" in proc.stderr and "S2 two/b/x.mech: 1 error (AR301)" in proc.stderr
        assert f"{error[1]}: error AR301 " in proc.stderr   # the summary writes the diagnostic as `check` does
        report = json.loads((tmp_path / "out" / "r.json").read_text())
        assert [s["file"] for s in report["schemes"]] == ["two/a/x.mech", "two/b/x.mech"]
        assert {d["file"] for s in report["schemes"] for d in s["diagnostics"]} == {"two/a/x.mech", "two/b/x.mech"}
        pages = [flat(page.extract_text()) for page in PdfReader(tmp_path / "out" / "t.pdf").pages]
        assert "Source two/a/x.mech." in pages[1] and "Source two/b/x.mech." in pages[2]
        assert any("S2 two/b/x.mech: 1 error (AR301)" in page for page in pages[3:])
        index = (tmp_path / "out" / "t-figures" / "index.html").read_text()
        assert "<td>two/a/x.mech</td>" in index and "Source two/b/x.mech." in index
        assert sorted(p.name for p in (tmp_path / "out" / "t-figures").glob("*.svg")) == ["S1-x.svg", "S2-x.svg"]


def test_title_page_characters_the_font_has_no_glyphs_for_are_noted(tmp_path):
    """A CJK or Hangul title or author printed as empty boxes on the title page with no word said;
    the figure's own texts already get such a note. The judge of a missing glyph is cairo itself
    (the machinery that prints the page): DejaVu Sans maps the character to glyph 0."""
    import cairocffi as cairo
    context = cairo.Context(cairo.RecordingSurface(cairo.CONTENT_COLOR_ALPHA, None))
    context.select_font_face("DejaVu Sans")
    glyphs = lambda text: [g[0] for g in context.get_scaled_font().text_to_glyphs(0, 0, text, False)]
    assert 0 in glyphs("标题") and 0 in glyphs("김") and 0 not in glyphs("Synthèse Ωμέγα")
    for title, authors, wanting in (("标题", "A. Chemist", "标题"), ("SI", "김 A. Chemist", "김"),
                                    ("Synthèse Ωμέγα", "Ö. Chemist", None)):
        out = tmp_path / "si.pdf"
        proc = collect(GALLERY[0], "-o", out, "-j", "1", "--cache", tmp_path / "cache", "--title", title,
                       "--authors", authors)
        assert proc.returncode == 0, proc.stderr
        notes = [line for line in proc.stderr.splitlines() if line.startswith(f"{out}: note: ")]
        if wanting is None:
            assert not notes, notes
        else:
            assert len(notes) == 1 and f"no glyphs for {wanting} " in notes[0] and "empty boxes" in notes[0]
    untitled = collect(GALLERY[0], "-o", out, "-j", "1", "--cache", tmp_path / "cache", "--authors", "김")
    assert untitled.returncode == 0 and f"{out}: note" not in untitled.stderr   # no title, no title page


def test_a_note_names_only_options_collect_has(tmp_path):
    """A slide drawn larger to fill its page was noted with `(--font-size 18 keeps the slide
    size)`, an option of `arrows draw` that collect refuses: a note printed by collect names none
    but collect's own options."""
    from arrows.commands.collect import collect_command
    own = {opt for param in collect_command.params for opt in getattr(param, "opts", ())}
    shutil.copy(GALLERY[0], tmp_path / "a.mech")
    proc = collect("a.mech", "-o", tmp_path / "si.pdf", "--style", "slide", "-j", "1", "--cache", tmp_path / "cache",
                   cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    notes = [line for line in proc.stderr.splitlines() if ": note: " in line]
    assert any("to fill the page" in note for note in notes), notes
    named = {option for note in notes for option in re.findall(r"--[a-z][a-z-]*", note)}
    assert named <= own, named - own


def test_fail_fast_says_no_pdf_was_written_where_there_was_none(tmp_path):
    """`--fail-fast` said "ffout/x.pdf is as it was" of a PDF that never existed."""
    good, broken = tmp_path / "a.mech", tmp_path / "b.mech"
    shutil.copy(GALLERY[0], good)
    broken.write_text(BROKEN["zz-broken-octet.mech"][0])
    out = tmp_path / "out" / "x.pdf"
    args = ("-o", out, "--fail-fast", "-j", "1", "--cache", tmp_path / "cache")
    proc = collect(broken, *args)
    assert proc.returncode == 1 and not out.exists()
    assert f"(--fail-fast); no PDF was written ({out} does not exist)" in proc.stderr
    assert "is as it was" not in proc.stderr
    assert collect(good, *args).returncode == 0
    proc = collect(good, broken, *args)
    assert proc.returncode == 1 and f"(--fail-fast); {out} is as it was" in proc.stderr


def test_the_default_cache_stays_out_of_the_folder_an_author_ships(tmp_path):
    """The cache went to `.arrows-cache/` beside the document, so zipping `si/` for a journal
    shipped it too (856 KB for 10 schemes). Without --cache it goes to the user's cache folder
    ($XDG_CACHE_HOME/arrows/collect, the XDG base directory convention) and still serves a re-run."""
    (tmp_path / "in").mkdir()
    for path in GALLERY[:2]:
        shutil.copy(path, tmp_path / "in" / path.name)
    cache_home = tmp_path / "cache-home"
    env = {**os.environ, "XDG_CACHE_HOME": str(cache_home)}

    def run():
        return subprocess.run(["arrows", "collect", "in", "-o", "si/supporting.pdf", "-j", "1"], capture_output=True,
                              text=True, cwd=tmp_path, env=env, timeout=900)
    first = run()
    assert first.returncode == 0, first.stderr
    shipped = sorted(str(p.relative_to(tmp_path / "si")) for p in (tmp_path / "si").iterdir())
    assert shipped == ["supporting-figures", "supporting.pdf"], shipped
    assert len(list((cache_home / "arrows" / "collect" / "figures").iterdir())) == 2
    again = run()
    assert again.returncode == 0 and "0 drawn, 2 from the cache" in again.stderr, again.stderr


def test_a_cache_that_cannot_be_made_is_named_and_leaves_nothing(tmp_path):
    """With the cache out of the output's folder, a cache folder that cannot be made (here a file
    stands in its way) must not read "cannot write si/x.pdf", nor leave an empty si/ behind."""
    (tmp_path / "a.mech").write_text(GALLERY[0].read_text())
    (tmp_path / "cache-home").write_text("a file, not a folder\n")
    env = {**os.environ, "XDG_CACHE_HOME": str(tmp_path / "cache-home")}
    done = subprocess.run(["arrows", "collect", "a.mech", "-o", "si/x.pdf", "-j", "1"], capture_output=True, text=True,
                          cwd=tmp_path, env=env, timeout=300)
    assert done.returncode == 2 and "Traceback" not in done.stderr, done.stderr
    assert done.stderr.startswith(f"error: cannot write the cache {tmp_path / 'cache-home' / 'arrows' / 'collect'}: ")
    assert "hint: name a folder that can be written: --cache DIR" in done.stderr
    assert not (tmp_path / "si").exists()
