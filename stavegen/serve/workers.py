"""Worker processes for the engine, so that a request's time can be capped for real.

A thread cannot be stopped; a process can. Each :class:`Workers` keeps a pool
of ``processes`` started with "spawn" (a fresh interpreter, safe beside the
server's threads); when an answer takes longer than its cap, the pool is
ended and a new one started, and the request is answered 503.
"""

from __future__ import annotations

import multiprocessing
import threading
from typing import Any

from . import engine


class TimeLimit(Exception):
    """The engine took longer than the request's cap."""


class Workers:
    def __init__(self, processes: int = 1) -> None:
        self.processes = processes
        self._context = multiprocessing.get_context("spawn")
        self._lock = threading.Lock()
        self._pool = None

    def _current(self):
        with self._lock:
            if self._pool is None:
                self._pool = self._context.Pool(self.processes, initializer=engine.warm_up)
            return self._pool

    def start(self) -> None:
        """Start the processes now (they import the engine while the page loads)."""
        self._current()

    def call(self, operation: str, kwargs: dict[str, Any], timeout: float) -> tuple:
        """Run ``engine.run(operation, kwargs)`` in a worker; TimeLimit after ``timeout`` seconds."""
        pool = self._current()
        pending = pool.apply_async(engine.run, (operation, kwargs))
        try:
            return pending.get(timeout)
        except multiprocessing.TimeoutError:
            with self._lock:
                if self._pool is pool:
                    self._pool = None
            pool.terminate()
            raise TimeLimit from None

    def close(self) -> None:
        with self._lock:
            pool, self._pool = self._pool, None
        if pool is not None:
            pool.terminate()
            pool.join()
