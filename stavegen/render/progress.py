"""Signs of life on the terminal while a command works: a spinner with the step, or a bar with a count.

Drawn on standard error, and only when it is a terminal, so a pipe or a file
reading standard output gets the results alone; the display clears itself
when the work is done. Nothing here computes: the pipeline tells what it is
doing (``step``) and how far it is (``done`` of ``total``).
"""

from __future__ import annotations

from contextlib import contextmanager
from typing import Callable, Iterator

from rich.console import Console
from rich.markup import escape
from rich.progress import BarColumn, MofNCompleteColumn, Progress, SpinnerColumn, TextColumn, TimeElapsedColumn


def _terminal() -> Console:
    return Console(stderr=True, highlight=False)


@contextmanager
def steps(first: str) -> Iterator[Callable[[str], None]]:
    """A spinner showing ``first``, then whatever the returned function is told (plain words, not markup)."""
    console = _terminal()
    if not console.is_terminal:
        yield lambda words: None
        return
    with console.status(escape(first)) as status:
        yield lambda words: status.update(escape(words))


@contextmanager
def counting(what: str) -> Iterator[Callable[[int, int, str], None]]:
    """A bar counting work done: the returned function takes (done, total, words for the step)."""
    console = _terminal()
    if not console.is_terminal:
        yield lambda done, total, words="": None
        return
    columns = (SpinnerColumn(), TextColumn("{task.description}"), BarColumn(bar_width=20), MofNCompleteColumn(),
               TimeElapsedColumn())
    with Progress(*columns, console=console, transient=True) as bar:
        task = bar.add_task(escape(what), total=None)

        def tell(done: int, total: int, words: str = "") -> None:
            bar.update(task, completed=done, total=total, description=escape(words or what))

        yield tell
