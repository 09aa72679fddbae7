"""`arrows draw --watch` through the installed command: every save redraws and reports."""
import shutil
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
ARROWS = shutil.which("arrows") or str(Path(sys.executable).with_name("arrows"))


def _wait_for(stream_lines: list[str], proc, needle: str, count: int, timeout: float = 60) -> None:
    """Wait until `needle` has appeared `count` times in the lines a reader thread collects."""
    deadline = time.time() + timeout
    while time.time() < deadline:
        if sum(needle in line for line in list(stream_lines)) >= count:
            return
        time.sleep(0.05)
    raise AssertionError(f"waited for {count} x {needle!r}; saw: {stream_lines}")


def _collect(stream, into: list[str]) -> None:
    for line in stream:
        into.append(line)


@pytest.mark.skipif(not Path(ARROWS).exists(), reason="console script not installed")
def test_watch_redraws_on_each_save_and_keeps_the_figure_on_errors(tmp_path):
    source = tmp_path / "m.mech"
    good = (ROOT / "gallery" / "08-sn2-cyanide.mech").read_text()
    source.write_text(good)
    out = tmp_path / "m.svg"
    proc = subprocess.Popen([ARROWS, "draw", str(source), "-o", str(out), "--watch"], stderr=subprocess.PIPE,
                            stdout=subprocess.DEVNULL, text=True, bufsize=1)
    lines: list[str] = []
    threading.Thread(target=_collect, args=(proc.stderr, lines), daemon=True).start()
    try:
        _wait_for(lines, proc, "redrawn", 1)
        first = out.read_bytes()
        # Each save must be seen; a save landing before the watcher is ready is repeated until it is.
        for attempt in range(20):
            source.write_text(good.replace("title", "title  ", 1))
            try:
                _wait_for(lines, proc, "redrawn", 2, timeout=3)
                break
            except AssertionError:
                continue
        source.write_text(good + "\nstep \"broken\"\n    :C77 -> C1\nend\n")
        _wait_for(lines, proc, "not redrawn", 1)
        assert any("AR104" in line or "AR107" in line for line in lines)
        assert out.read_bytes() == first     # the last good figure stays in place
    finally:
        proc.send_signal(signal.SIGINT)
        try:
            proc.wait(timeout=20)
        except subprocess.TimeoutExpired:
            proc.kill()
