"""Ordered, bounded parallel map: in this process, in a pool of worker processes, or on a Dask
distributed cluster.

Results come back in input order, and at most `window` tasks are in flight at any time, so memory
stays flat however long the input is (multiprocessing's imap and Executor.map read their whole
input ahead; this does not). The work function must be a module-level function so that it can be pickled.
"""
from __future__ import annotations

import os
import signal
import sys
import threading
import time
from collections import deque
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from typing import Callable, Iterable, Iterator, Optional, TypeVar

from ..interrupts import Terminated

T = TypeVar("T")
R = TypeVar("R")


class ClusterUnavailable(Exception):
    """Dask is not installed, or the scheduler at the address cannot be reached."""


def default_jobs() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not every platform has sched_getaffinity
        return max(1, os.cpu_count() or 1)


def _ignore_interrupts() -> None:
    # Ctrl-C is the parent's to handle: it stops the pool. Workers that also caught it would
    # each print a traceback.
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _start_worker(parent: int) -> None:
    """A worker ignores Ctrl-C and ends when its parent does: a parent killed (SIGKILL, or a
    SIGTERM it could not act on) left its workers running under PID 1, drawing for nobody and
    holding the caller's standard error open."""
    _ignore_interrupts()
    # A forked worker inherits the parent's handlers: its SIGTERM (terminate_as_interrupt) would
    # raise in the middle of a task, be caught as the task's failure, and the worker would go on.
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    _end_with_parent(parent)


def _end_with_parent(parent: int) -> None:
    if sys.platform.startswith("linux"):
        try:
            import ctypes
            libc = ctypes.CDLL(None, use_errno=True)
            # PR_SET_PDEATHSIG (1): the kernel sends SIGTERM when the thread that forked this worker
            # ends (the pool forks from the thread that submits, the caller's for the pool's life).
            if libc.prctl(1, int(signal.SIGTERM), 0, 0, 0) == 0:
                if os.getppid() != parent:   # the parent died before the request was made
                    os._exit(1)
                return
        except (OSError, AttributeError):
            pass
    threading.Thread(target=_watch_parent, args=(parent,), daemon=True, name="arrows-parent-watch").start()


def _watch_parent(parent: int, every: float = 0.5) -> None:
    """Where the kernel cannot be asked: end this worker once its parent is gone (it is adopted,
    and its parent's process id changes)."""
    while os.getppid() == parent:
        time.sleep(every)
    os._exit(1)


def _bounded(submit: Callable[[T], object], wait: Callable[[object], R], items: Iterable[T],
             window: int) -> Iterator[R]:
    pending: deque = deque()
    for item in items:
        pending.append(submit(item))
        if len(pending) >= window:
            yield wait(pending.popleft())
    while pending:
        yield wait(pending.popleft())


class WorkerDied(Exception):
    """A worker process ended in the middle of a task (killed, or out of memory)."""


class WorkerPool:
    """Worker processes (none for jobs=1) that map in order with a bounded window.

    Use as a context manager. concurrent.futures notices a worker that dies mid-task (the
    multiprocessing pool would wait for its result for ever); that ends the map with WorkerDied.
    Leaving the block cancels every task not yet started.
    """

    def __init__(self, jobs: int, window_per_job: int = 4):
        self.jobs = max(1, jobs)
        self.window = self.jobs * window_per_job
        self._executor: Optional[ProcessPoolExecutor] = None

    def __enter__(self) -> "WorkerPool":
        if self.jobs > 1:
            self._executor = ProcessPoolExecutor(self.jobs, initializer=_start_worker, initargs=(os.getpid(),))
        return self

    def __exit__(self, kind, value, tb) -> None:
        if self._executor is not None and kind is not None and issubclass(kind, Terminated):
            # Told to stop: the tasks under way are not waited for (shutdown would, as it does
            # for Ctrl-C, so that their figures reach the cache).
            for process in list((getattr(self._executor, "_processes", None) or {}).values()):
                process.terminate()
            self._executor.shutdown(wait=True, cancel_futures=True)
            return
        if self._executor is not None:
            # Tasks still queued are unwanted whichever way the caller left (an error, Ctrl-C, or
            # a map it stopped reading, as --fail-fast does).
            self._executor.shutdown(wait=True, cancel_futures=True)

    def map(self, fn: Callable[[T], R], items: Iterable[T]) -> Iterator[R]:
        if self._executor is None:
            return (fn(item) for item in items)
        executor = self._executor
        return _bounded(lambda item: _submit(executor, fn, item), _result, items, self.window)


_DIED = "a worker process stopped in the middle of its work (killed, or out of memory)"


def _submit(executor: ProcessPoolExecutor, fn, item):
    # A worker that dies breaks the pool: the next submit raises, as the next result does,
    # whichever the map reaches first.
    try:
        return executor.submit(fn, item)
    except BrokenProcessPool:
        raise WorkerDied(_DIED) from None


def _result(future):
    try:
        return future.result()
    except BrokenProcessPool:
        raise WorkerDied(_DIED) from None


class ClusterPool:
    """The same ordered, bounded map on a Dask distributed cluster (`pip install arrows[cluster]`).

    Dask schedules the tasks; this class only submits them in order and collects the results in
    order. Every worker must have arrows installed.
    """

    def __init__(self, address: str, window: Optional[int] = None, timeout: float = 20):
        self.address, self.timeout = address, timeout
        self._window = window
        self._client = None

    def __enter__(self) -> "ClusterPool":
        try:
            from dask.distributed import Client
        except ImportError:
            raise ClusterUnavailable("--cluster needs Dask: pip install 'arrows[cluster]'") from None
        try:
            self._client = Client(self.address, timeout=self.timeout)
        except (OSError, TimeoutError, ValueError) as exc:
            raise ClusterUnavailable(f"cannot reach the Dask scheduler at {self.address}: {exc}") from None
        return self

    def __exit__(self, kind, value, tb) -> None:
        if self._client is not None:
            self._client.close()

    @property
    def window(self) -> int:
        if self._window:
            return self._window
        threads = sum(self._client.nthreads().values()) or 1
        return threads * 4

    def map(self, fn: Callable[[T], R], items: Iterable[T]) -> Iterator[R]:
        client = self._client
        return _bounded(lambda item: client.submit(fn, item, pure=False), lambda fut: fut.result(),
                        items, self.window)
