"""The commands' boat half: ``check``, ``size``, ``init --boat`` and ``build`` on a boat file.

``stavegen/cli.py`` sends a file here when it has a [boat] table (:func:`is_boat_file`);
each function does what its command does for a spar file, for every spar of the boat.
"""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Optional

import typer
from rich.console import Console
from rich.text import Text

from .errors import InputError

EXIT_MISSED = 1

__all__ = ["is_boat_file", "check_boat", "size_boat", "init_boat", "run_boat_build"]


def is_boat_file(path: Path) -> bool:
    """Whether the file is a boat file; read without loading the layout (and scipy) that `check` never needs."""
    from .model.boat import is_boat
    from .model.loader import read_toml

    return is_boat(read_toml(path))


def run_boat_build(path: Path, folder: Path, console: Console):
    from .boat_build import run_boat_build as run

    return run(path, folder, console)


def check_boat(path: Path, json_out: bool, console: Console) -> None:
    """``check BOAT``: each spar's check and the boat's table; exit 1 if any spar misses its target."""
    from .boat import design_boat
    from .model.boat import load_boat
    from .render.progress import steps

    with steps("reading the boat file") as tell:
        result = design_boat(load_boat(path), step=tell)
    if json_out:
        from .render.boat_papers import to_boat_json

        sys.stdout.write(to_boat_json(result))
    else:
        from .render.boat_console import print_boat_check

        print_boat_check(console, result)
    if not result.passed:
        raise typer.Exit(EXIT_MISSED)


def size_boat(path: Path, write: Optional[Path], console: Console) -> None:
    """``size BOAT``: every spar's stave-count comparison, from the boat's boards."""
    from dataclasses import replace

    from .model.boat import load_boat
    from .render.console import candidate_notes, candidates_table
    from .render.fit import Prose, fit
    from .render.progress import counting
    from .sizing.count import compare_stave_counts

    if write is not None:
        raise InputError("takes a spar file; to write a spar back, run size on that spar's own file", "--write")
    for bs in load_boat(path).spars:
        model = bs.spar
        console.rule(Text(f"{bs.tag}: {model.name} ({bs.file})"))
        with counting(f"{bs.tag}: sizing and laying out every stave count") as tell:
            comparison = compare_stave_counts(replace(model, hollow=replace(model.hollow, staves="auto")), progress=tell)
        console.print(fit(candidates_table(model, comparison)))
        for line in candidate_notes(comparison):
            console.print(Prose(line, style="dim"))
        console.print(Prose(Text("choice: ", style="bold") + Text(comparison.reason)))


def init_boat(path: Path, units: str, force: bool, console: Console) -> None:
    """``init PATH --boat``: a starter boat file and the spar files it lists, beside it."""
    from .model.boat_starter import starter_boat
    from .outputs import OutputSet

    folder = path.parent if str(path.parent) else Path(".")
    files = starter_boat(path.name, units)
    for name in files:
        if (folder / name).exists() and not force:
            raise InputError("already exists; pass --force to overwrite it", source=str(folder / name))
    with OutputSet(folder) as out:
        for name, text in files.items():
            out.add_text(name, text)
        out.commit()
    console.print(f"wrote {', '.join(str(folder / n) for n in files)}: edit them, then run "
                  f"[bold]stavegen check {path}[/]")
