"""Work shared between this process and worker processes, with results that do not depend on who did what.

:class:`Pool` runs a function over a list of argument tuples and returns
the results in the list's order. Worker processes (one fewer than the
processors this process may use; ``STAVEGEN_WORKERS`` sets the total, 1 for
none) take items from the front of the list while this process works from
the back, so both processors are busy from the first moment, even while the
workers are still starting. Each result depends only on its own arguments,
so the answer is the same whatever the machine's load or the order in which
the work finishes.

Workers start from a server process that has already imported stavegen
(multiprocessing's "forkserver"; "spawn" where there is none): they never
copy a process with threads running (a progress display's), and they start
in milliseconds once the server is up.
"""

from __future__ import annotations

import multiprocessing
import os
from concurrent.futures import ProcessPoolExecutor
from concurrent.futures.process import BrokenProcessPool
from typing import Any, Callable, Sequence

PRELOAD = ["stavegen.sizing.count"]  # what the server imports once for every worker


def processors() -> int:
    """How many processes to use: ``STAVEGEN_WORKERS`` if set, else the processors this process may run on;
    1 inside a daemonic worker process (one of a server's pool), which may not start processes of its own."""
    if multiprocessing.current_process().daemon:
        return 1
    asked = os.environ.get("STAVEGEN_WORKERS", "").strip()
    if asked.isdigit() and int(asked) > 0:
        return int(asked)
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:
        return os.cpu_count() or 1


def _context():
    methods = multiprocessing.get_all_start_methods()
    if "forkserver" in methods:
        context = multiprocessing.get_context("forkserver")
        context.set_forkserver_preload(PRELOAD)
        return context
    return multiprocessing.get_context("spawn")


class Pool:
    """This process and ``size - 1`` worker processes (none when ``size`` is 1); use it in a ``with`` block."""

    def __init__(self, size: int | None = None) -> None:
        self.size = 1 if multiprocessing.current_process().daemon else max(1, size if size is not None else processors())
        self._executor: ProcessPoolExecutor | None = None

    def __enter__(self) -> "Pool":
        return self

    def __exit__(self, *exc) -> None:
        if self._executor is not None:
            self._executor.shutdown(wait=True, cancel_futures=True)
            self._executor = None

    def _workers(self) -> ProcessPoolExecutor:
        if self._executor is None:
            self._executor = ProcessPoolExecutor(max_workers=self.size - 1, mp_context=_context())
        return self._executor

    def map(self, function: Callable[..., Any], items: Sequence[tuple]) -> list:
        """``[function(*item) for item in items]``, shared out; the results in the items' order.

        Where worker processes cannot be started (no process semaphores on some systems), or one dies
        (killed for memory), this process does the work itself: the results are the same.
        """
        if self.size == 1 or len(items) < 2:
            return [function(*item) for item in items]
        try:
            futures = [self._workers().submit(function, *item) for item in items]
        except (OSError, NotImplementedError, ImportError, BrokenProcessPool):
            self.size = 1
            return [function(*item) for item in items]
        results: list = [None] * len(items)
        mine = [False] * len(items)
        for i in reversed(range(len(items))):
            if futures[i].cancel():  # no worker has taken it: this process does it
                results[i] = function(*items[i])
                mine[i] = True
        for i, future in enumerate(futures):
            if not mine[i]:
                try:
                    results[i] = future.result()
                except BrokenProcessPool:
                    results[i] = function(*items[i])
        return results
