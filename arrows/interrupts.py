"""SIGTERM handled as Ctrl-C is. Kept apart from arrows.batch.parallel, which imports the
process-pool machinery: arrows.cli.main sets this up for every command, `arrows check` too."""
from __future__ import annotations

import signal
import threading
from contextlib import contextmanager
from typing import Iterator


class Terminated(KeyboardInterrupt):
    """SIGTERM, raised in the main thread as Ctrl-C is, so that outputs are left as they were
    (arrows.atomic removes its temporaries) and the pool's workers are stopped at once."""


@contextmanager
def terminate_as_interrupt() -> Iterator[None]:
    """While the block runs, SIGTERM raises Terminated (in the main thread only, where Python
    delivers signals); its handler before is put back after."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def raise_terminated(signum, frame):
        raise Terminated()

    before = signal.signal(signal.SIGTERM, raise_terminated)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, before)
