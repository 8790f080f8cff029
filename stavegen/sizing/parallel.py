"""Work shared between this process and worker processes, with results that do not depend on who did what.

:class:`Pool` runs a function over a list of argument tuples and returns
the results in the list's order. Worker processes (one fewer than the
processors this process may use and the machine's load leaves free;
``STAVEGEN_WORKERS`` sets the total, 1 for none) take items from the front
of the list, one at a time and only once
they are up; this process works from the back from the first moment. So
nothing waits for a worker to start, and at worst this process does every
item itself. Each result depends only on its own arguments, so the answer
is the same whatever the machine's load or the order in which the work
finishes.

Workers start from a server process that imports stavegen once
(multiprocessing's "forkserver"; "spawn" where there is none): they never
copy a process with threads running (a progress display's).
"""

from __future__ import annotations

import multiprocessing
import os
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from typing import Any, Callable, Sequence

PRELOAD = ["stavegen.sizing.count"]  # what the server imports once for every worker


def processors() -> int:
    """How many processes to use: ``STAVEGEN_WORKERS`` if set; else the processors this process may run on,
    less those the machine's load (one-minute average) already keeps busy, at least 1; 1 inside a daemonic
    worker process (one of a server's pool), which may not start processes of its own. Only the speed
    depends on this, never a result."""
    if multiprocessing.current_process().daemon:
        return 1
    asked = os.environ.get("STAVEGEN_WORKERS", "").strip()
    if asked.isdigit() and int(asked) > 0:
        return int(asked)
    try:
        available = len(os.sched_getaffinity(0))
    except AttributeError:
        available = os.cpu_count() or 1
    try:
        busy = os.getloadavg()[0]
    except (AttributeError, OSError):
        busy = 0.0
    return max(1, min(available, round(available - busy + 1)))


def _context():
    methods = multiprocessing.get_all_start_methods()
    if "forkserver" in methods:
        context = multiprocessing.get_context("forkserver")
        context.set_forkserver_preload(PRELOAD)
        return context
    return multiprocessing.get_context("spawn")


def _ready() -> bool:
    return True


class Pool:
    """This process and ``size - 1`` worker processes (none when ``size`` is 1); use it in a ``with`` block."""

    def __init__(self, size: int | None = None) -> None:
        wanted = max(1, size if size is not None else processors())
        self.size = 1 if multiprocessing.current_process().daemon else wanted
        self._executor: ProcessPoolExecutor | None = None
        self._ready = None  # a trivial task's future: done once a worker has started and imported stavegen

    def __enter__(self) -> "Pool":
        return self

    def __exit__(self, *exc) -> None:
        if self._executor is not None:
            self._executor.shutdown(wait=True, cancel_futures=True)
            self._executor = None

    def _workers(self) -> ProcessPoolExecutor:
        if self._executor is None:
            self._executor = ProcessPoolExecutor(max_workers=self.size - 1, mp_context=_context())
            self._ready = self._executor.submit(_ready)
        return self._executor

    def _workers_ready(self) -> bool:
        return self._ready is not None and self._ready.done() and not self._ready.exception()

    def map(self, function: Callable[..., Any], items: Sequence[tuple], each: Callable[[], None] | None = None) -> list:
        """``[function(*item) for item in items]``, shared out; the results in the items' order. ``each``, if
        given, is called as each result comes in (for a progress display), in whatever order they finish.

        This process works from the back of the list; an item goes to a worker, from the front, only
        when a worker is up and free, so no item ever waits for a worker to start: at worst this process
        does them all. Where workers cannot be started (no process semaphores on some systems), or one
        dies (killed for memory), this process does the work itself: the results are the same.
        """
        got = each or (lambda: None)

        def here(item: tuple) -> Any:
            result = function(*item)
            got()
            return result

        if self.size == 1 or len(items) < 2:
            return [here(item) for item in items]
        try:
            self._workers()
        except (OSError, NotImplementedError, ImportError):
            self.size = 1
            return [here(item) for item in items]
        results: dict[int, Any] = {}
        running: dict[int, Any] = {}  # item index → its future, on a worker
        front, back = 0, len(items) - 1
        while front <= back:
            for i, future in list(running.items()):
                if future.done():
                    del running[i]
                    results[i] = self._result(future, function, items[i])
                    got()
            while self._workers_ready() and len(running) < self.size - 1 and front <= back:
                running[front] = self._executor.submit(function, *items[front])
                front += 1
            if front <= back:
                results[back] = here(items[back])
                back -= 1
        for i, future in running.items():
            results[i] = self._result(future, function, items[i])
            got()
        return [results[i] for i in range(len(items))]

    def _result(self, future, function: Callable[..., Any], item: tuple) -> Any:
        try:
            return future.result()
        except BrokenProcessPool:
            self.size = 1
            return function(*item)
