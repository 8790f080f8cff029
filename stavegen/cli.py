"""The ``stavegen`` command line: build, check, section, woods, init."""

from __future__ import annotations

import functools
import os
import sys
from importlib import resources
from pathlib import Path
from typing import Callable, Optional

import typer
from rich.console import Console
from rich.markup import escape
from rich.text import Text

from .errors import InputError

app = typer.Typer(
    add_completion=False,
    no_args_is_help=True,
    help="Turn the solid wooden spar of a set of plans into a hollow, stave-built one: check it against "
         "the plan's stiffness, then lay out, template and order the wood for it.",
)

DEFAULT_SAMPLE = "daysailer.toml"  # a boat; its spar files lie beside it
DEFAULT_SPAR = "daysailer-mast.toml"  # one spar of that boat, for what takes a spar file only (serve)
EXIT_MISSED = 1
EXIT_BAD_INPUT = 2


def bundled_sample(name: str = DEFAULT_SAMPLE) -> Path:
    """Path of a spar file shipped with stavegen (the repository's samples folder, installed with it)."""
    try:
        return Path(str(resources.files("stavegen.samples").joinpath(name)))
    except ModuleNotFoundError:  # an editable install run from the source tree
        return Path(__file__).resolve().parent.parent / "samples" / name


def _fail(message: str, code: int = EXIT_BAD_INPUT) -> None:
    sys.stderr.write(f"stavegen: {' '.join(message.split())}\n")
    raise typer.Exit(code)


def reports_errors(func: Callable) -> Callable:
    """Turn InputError into one line on stderr and exit code 2; no traceback."""

    @functools.wraps(func)
    def wrapper(*args, **kwargs):
        try:
            return func(*args, **kwargs)
        except InputError as exc:
            if kwargs.get("spar") is not None:
                exc.located(str(kwargs["spar"]))
            _fail(exc.one_line())
        except KeyboardInterrupt:
            _fail("interrupted", 130)
        except (typer.Exit, typer.Abort, SystemExit):
            raise
        except Exception as exc:  # a bug, not bad input: say so in one line unless debugging
            if os.environ.get("STAVEGEN_DEBUG"):
                raise
            _fail(f"internal error ({type(exc).__name__}: {exc}); rerun with STAVEGEN_DEBUG=1 and report it", 3)

    return wrapper


def _console() -> Console:
    """Rich output; a pipe or file gets lines wide enough for the station table."""
    console = Console(highlight=False)
    if not console.is_terminal:
        console = Console(highlight=False, width=120)
    return console


@app.command()
@reports_errors
def check(
    spar: Path = typer.Argument(..., help="The spar file, or a boat file (TOML).", show_default=False),
    json_out: bool = typer.Option(False, "--json", help="Print the JSON document of every figure instead."),
) -> None:
    """Stiffness, strength and weight against the plan, station by station (every spar of a boat)."""
    from .boat_commands import check_boat, is_boat_file
    from .model.loader import load_spar
    from .pipeline import design
    from .render.progress import steps

    if is_boat_file(spar):
        return check_boat(spar, json_out, _console())
    with steps("reading the spar file") as tell:
        result = design(load_spar(spar), step=tell)
    if json_out:
        from .render.json_doc import to_json

        sys.stdout.write(to_json(result))
    else:
        from .render.console import print_check

        print_check(_console(), result)
    if not result.passed:
        raise typer.Exit(EXIT_MISSED)


@app.command()
@reports_errors
def section(
    spar: Path = typer.Argument(..., help="The spar file (TOML).", show_default=False),
    at: str = typer.Option(..., "--at", help='Position from the heel: "7 ft 6 in", "2300 mm", or a bare '
                                             "number in the file's unit.", show_default=False),
    si: bool = typer.Option(False, "--si", help="Areas, second moments and moduli in mm², mm⁴ and mm³ whatever "
                                                "the file's units."),
) -> None:
    """One cross-section in detail: stave width, notch, cutter settings, wall after rounding, voids, I."""
    from .checks.ratios import check_station
    from .layout.machining import cutter_settings
    from .model.loader import load_spar
    from .pipeline import resolve
    from .render.console import machining_table, section_table
    from .errors import position, shown
    from .render.fit import Prose, fit
    from .render.progress import steps
    from .stations.evaluate import evaluate_stations
    from .stations.grid import StationMark
    from .units import UnitError, parse_length

    from .boat_commands import is_boat_file

    if is_boat_file(spar):
        raise InputError("is a boat file; give one of the spar files it lists", source=str(spar))
    with steps("solving what the spar file leaves to stavegen"):
        model, solved = resolve(load_spar(spar))
    try:
        z = parse_length(at, model.units)
    except UnitError as exc:
        raise InputError(str(exc), "--at") from None
    if not 0 <= z <= model.length:
        raise InputError(f"{shown(at)} is not on the spar ({{heel}} to {{head}} from the heel)", "--at",
                         figures={"heel": position(0.0), "head": position(model.length)}, units=model.units)
    try:
        station = evaluate_stations(model, (StationMark(z, ("asked",)),))[0]
    except InputError as exc:
        raise exc.in_units(model.units)
    console = _console()
    for line in solved:
        console.print(Prose(Text("solved: ", style="cyan") + Text(line)))
    for line in model.notices:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    console.print(fit(section_table(model, check_station(model, station), si=si), keys=0))
    kerf = model.stock.kerf if model.stock is not None else (3.175 if model.units == "in" else 3.0)
    cut = station.section
    if model.hollow.is_box:  # a box: the face carries the only cuts (its rebates), the sides are ripped square
        from .section.box import FACE

        cut = cut.kind_section(FACE)
    console.print(fit(machining_table(model, cutter_settings(cut, kerf)), keys=0))


@app.command()
@reports_errors
def size(
    spar: Path = typer.Argument(..., help="The spar file, or a boat file (TOML).", show_default=False),
    write: Optional[Path] = typer.Option(None, "--write", show_default=False,
                                         help='Write the spar file to this file with what it leaves "auto" filled '
                                              "in (comments kept)."),
    set_staves: bool = typer.Option(False, "--set-staves", help="With --write, also replace the file's stave count "
                                                                "with the chosen one."),
    force: bool = typer.Option(False, "--force", help="Let --write overwrite an existing file."),
    sheathing: bool = typer.Option(False, "--sheathing", help="Instead of the stave counts, compare the spar bare "
                                   "(no layers, no strips), with its layers only, and with its layers and strips: "
                                   'what the file leaves "auto" solved for each, side by side.'),
) -> None:
    """Compare every stave count (4 to 24) and show why one is chosen; solve the wall where it is "auto"
    (every spar of a boat). With --sheathing, compare the spar with and without its sheathing instead."""
    from dataclasses import replace as _replace

    from .boat_commands import is_boat_file, size_boat

    if is_boat_file(spar):
        if sheathing:
            raise InputError("--sheathing compares one spar; give one of the spar files the boat file lists",
                             "--sheathing", str(spar))
        return size_boat(spar, write, _console())
    if sheathing:
        if write is not None or set_staves:
            raise InputError("--sheathing writes nothing; leave out --write and --set-staves", "--sheathing",
                             str(spar))
        return _size_sheathing(spar)
    from .model.loader import load_spar, read_spar_text
    from .model.rewrite import solved_values, with_solved_values
    from .outputs import not_replaceable, write_file
    from .render.console import candidate_notes, candidates_table
    from .render.fit import Prose, fit
    from .render.progress import counting
    from .sizing.count import compare_stave_counts

    model = load_spar(spar)
    if write is not None:  # refused before the comparison's seconds of work, not after
        why = not_replaceable(write) or (None if force or not write.exists() else
                                         "already exists; pass --force to overwrite it")
        if why:
            raise InputError(why, "--write", str(write))
    if model.hollow.is_box:  # four pieces, no count to compare: solve what the file leaves "auto"
        return _size_box(spar, model, write, force)
    with counting("sizing and laying out every stave count") as tell:
        comparison = compare_stave_counts(_replace(model, hollow=_replace(model.hollow, staves="auto")), progress=tell)
    console = _console()
    for line in model.notices:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    console.print(fit(candidates_table(model, comparison)))
    for line in candidate_notes(comparison):
        console.print(Prose(line, style="dim"))
    console.print(Prose(Text("choice: ", style="bold") + Text(comparison.reason)))
    asked = model.hollow.staves
    if asked != "auto" and asked != comparison.chosen.staves:
        console.print(Prose(f"The file asks for {asked} staves; the comparison prefers {comparison.chosen.staves}."))
    if write is None:
        return
    if asked == "auto" or set_staves:  # the chosen count, and what the file leaves "auto" solved for it
        original = _replace(model, hollow=_replace(model.hollow, staves="auto"))
        filled = comparison.chosen.spar
    else:  # the file's own count, and what it leaves "auto" solved for that count
        original = model
        own = next(c for c in comparison.candidates if c.staves == asked)
        if own.spar is None:
            raise InputError(f"the file's {asked} staves cannot be built ({own.refused}); pass --set-staves to "
                             f"write the chosen {comparison.chosen.staves}", "hollow.staves", str(spar))
        filled = own.spar
    changes = solved_values(original, filled)
    if not changes:
        console.print(Prose(f'nothing written: {spar} leaves nothing "auto" (pass --set-staves to write the chosen '
                            "stave count)"))
        return
    text = with_solved_values(read_spar_text(spar), original, filled)
    write_file(write, text, force=force, key="--write")
    was = {"staves": model.hollow.staves, "wall": model.hollow.wall, "stations": model.hollow.diameter}
    said = "; ".join(f"hollow.{key} = {value} (was {_as_written(was[key])})" for key, value in changes)
    console.print(Prose(f"wrote {write}: {said}"))


def _size_box(path: Path, model, write: Optional[Path], force: bool) -> None:
    """`stavegen size` on a box spar: no stave count to compare (a box is its four pieces); the wall or stations
    the file leaves "auto" are solved, shown, and with --write written into a copy of the file."""
    from .model.loader import read_spar_text
    from .model.rewrite import solved_values, with_solved_values
    from .outputs import write_file
    from .render.fit import Prose
    from .render.progress import steps
    from .pipeline import resolve

    with steps("solving what the spar file leaves to stavegen"):
        filled, lines = resolve(model)
    console = _console()
    for line in model.notices:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    console.print(Prose("a box spar is built of its 4 pieces (two faces, two sides): no stave count to compare"))
    for line in lines:
        console.print(Prose(Text("solved: ", style="cyan") + Text(line)))
    if write is None:
        return
    changes = solved_values(model, filled)
    if not changes:
        console.print(Prose(f'nothing written: {path} leaves nothing "auto"'))
        return
    write_file(write, with_solved_values(read_spar_text(path), model, filled), force=force, key="--write")
    was = {"wall": model.hollow.wall, "stations": model.hollow.diameter}
    said = "; ".join(f"hollow.{key} = {value} (was {_as_written(was.get(key))})" for key, value in changes)
    console.print(Prose(f"wrote {write}: {said}"))


def _size_sheathing(path: Path) -> None:
    """``size --sheathing``: the spar bare, with its layers, with its layers and strips, side by side."""
    from .model.loader import load_spar
    from .render.console import sheathing_option_notes, sheathing_options_table
    from .render.fit import Prose, fit
    from .render.progress import steps
    from .sheathing_options import compare_sheathing

    model = load_spar(path)
    console = _console()
    if not model.hollow.layers and not model.hollow.strips:
        console.print(Prose(f"{path} has no sheathing layers or strips to compare ([[hollow.layer]], "
                            "[[hollow.strip]])."))
        return
    with steps("sizing the spar bare") as tell:
        comparison = compare_sheathing(model, tell)
    for line in model.notices:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    if not comparison.solves:
        console.print(Prose('The file leaves nothing "auto": the options are compared as drawn.'))
    console.print(fit(sheathing_options_table(comparison)))
    for line in sheathing_option_notes(comparison):
        console.print(Prose(line, style="dim"))


def _as_written(value: object) -> str:
    """A value of the spar file as it reads there: "auto" quoted, a number bare, anything else as the file had it."""
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, int):
        return str(value)
    return "a given value"


@app.command()
@reports_errors
def woods(
    units: str = typer.Option("in", "--units", help='"in" for psi and lb/ft³, "mm" for MPa and kg/m³.'),
) -> None:
    """The built-in wood table, with the source of every figure."""
    from .model.woods import wood_table
    from .render.console import woods_table
    from .render.fit import fit

    if units not in ("in", "mm"):
        raise InputError(f'{units!r} is not "in" or "mm"', "--units")
    _console().print(fit(woods_table(list(wood_table().values()), units)))


@app.command()
@reports_errors
def materials(
    units: str = typer.Option("in", "--units", help='"in" for psi and lb/ft³, "mm" for MPa and kg/m³.'),
) -> None:
    """The built-in laminates for sheathing and reinforcing strips, with the source of every figure."""
    from .model.materials import laminate_table
    from .render.console import laminates_table
    from .render.fit import fit

    if units not in ("in", "mm"):
        raise InputError(f'{units!r} is not "in" or "mm"', "--units")
    _console().print(fit(laminates_table(list(laminate_table().values()), units)))


@app.command()
@reports_errors
def init(
    path: Path = typer.Argument(..., help="Where to write the starter spar file.", show_default=False),
    units: str = typer.Option("in", "--units", help='"in" or "mm".'),
    force: bool = typer.Option(False, "--force", help="Overwrite an existing file."),
    boat: bool = typer.Option(False, "--boat", help="Write a starter boat file and the spar files it lists."),
) -> None:
    """Write a commented starter spar file (with --boat, a starter boat and its spar files) to edit."""
    from .model.starter import starter_text
    from .outputs import write_file

    if units not in ("in", "mm"):
        raise InputError(f'{units!r} is not "in" or "mm"', "--units")
    if path.is_dir() or path.name in ("", ".", ".."):
        raise InputError("is a folder; give the spar file's name, e.g. my-mast.toml", source=str(path))
    if boat:
        from .boat_commands import init_boat

        return init_boat(path, units, force, _console())
    write_file(path, starter_text(units), force=force)
    _console().print(f"wrote {escape(str(path))}: edit it, then run [bold]stavegen check {escape(str(path))}[/]")


@app.command()
@reports_errors
def build(
    spar: Optional[Path] = typer.Argument(None, help="The spar file or boat file (TOML); none builds the "
                                                     "bundled example boat.", show_default=False),
    out: Path = typer.Option(Path("stavegen-out"), "-o", "--out", help="Folder for the outputs."),
) -> None:
    """The whole job: check, lay out, and write every output into the folder (a boat: one order for all)."""
    from .boat_commands import is_boat_file, run_boat_build
    from .build import run_build

    console = _console()
    path = spar if spar is not None else bundled_sample()
    result = run_boat_build(path, out, console) if is_boat_file(path) else run_build(path, out, console)
    if not result.passed:
        raise typer.Exit(EXIT_MISSED)


@app.command()
@reports_errors
def serve(
    spar: Optional[Path] = typer.Argument(None, help="The spar file or boat file (TOML) to open; none opens a spar of the bundled example.",
                                          show_default=False),
    port: int = typer.Option(8471, "--port", help="Port to serve on (0: any free port)."),
    host: str = typer.Option("127.0.0.1", "--host", help="Address to serve on; anything but the loopback "
                                                         "address lets other machines reach the page."),
    no_browser: bool = typer.Option(False, "--no-browser", help="Do not open the browser."),
) -> None:
    """The builder's page: edit the spar in a browser, watch the check and the section, download the papers."""
    from .serve.run import serve as run_server

    run_server(spar, bundled_sample(DEFAULT_SPAR), host=host, port=port, open_browser=not no_browser)


class _ClosedPipeGuard:
    """sys.stdout that survives a reader going away (``stavegen check ... | head -1``).

    When the pipe is closed, further output goes to the null device, so the
    command finishes and exits with its own code (0 or 1), not a traceback.
    """

    def __init__(self, stream) -> None:
        self._stream = stream

    def _silence(self) -> None:
        try:
            null = os.open(os.devnull, os.O_WRONLY)
            os.dup2(null, self._stream.fileno())
            os.close(null)
        except (OSError, ValueError):
            pass

    def write(self, text: str) -> int:
        try:
            return self._stream.write(text)
        except BrokenPipeError:
            self._silence()
            return len(text)

    def flush(self) -> None:
        try:
            self._stream.flush()
        except BrokenPipeError:
            self._silence()

    def __getattr__(self, name: str):
        return getattr(self._stream, name)


def main() -> None:  # console-script entry point
    sys.stdout = _ClosedPipeGuard(sys.stdout)
    try:
        app()
    finally:
        try:
            sys.stdout.flush()
        except (OSError, ValueError):
            pass
