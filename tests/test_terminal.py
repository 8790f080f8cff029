"""The terminal: at 80 columns nothing is cut, a long step shows that it runs, and `size --write` says what it
fills.

`check` and `size` run as a user runs them, in a pseudo-terminal 80 columns wide (the width of a classic
terminal, and the default of most terminal programs); every figure the JSON (or the comparison) holds must
appear whole in what they print, worded as the figures module words it, and no cell may end in "…".
"""

from __future__ import annotations

import json
import os
import pty
import re
import struct
import sys
import tomllib
from io import StringIO

import pytest
from rich.console import Console
from rich.table import Table

from stavegen.model.loader import load_spar
from stavegen.render.figures import Figures
from stavegen.render.fit import Prose, fit
from stavegen.sizing.count import compare_stave_counts
from stavegen.units import format_mass

from conftest import SAMPLES, SPAR_SAMPLES

ANSI = re.compile(r"\x1b\[[0-9;?]*[A-Za-z]|\x1b\][^\x07]*\x07")


def on_screen(text: str) -> str:
    """What a terminal shows of ``text``: escape sequences dropped, and a carriage return within a line
    going back to its start (a spinner redraws its line that way; what is written last stays)."""
    lines = text.replace("\r\n", "\n").split("\n")
    return "\n".join(ANSI.sub("", line.split("\r")[-1]) for line in lines)


def in_terminal(args: list[str], columns: int = 80) -> tuple[str, str, int]:
    """Run ``python -m stavegen ARGS`` in a pseudo-terminal ``columns`` wide: (raw bytes as text, the text
    without escape sequences, exit code)."""
    import fcntl
    import termios

    env = dict(os.environ, COLUMNS=str(columns), LINES="40", TERM="xterm-256color")
    env.pop("NO_COLOR", None)
    pid, fd = pty.fork()
    if pid == 0:  # the child: a terminal of the asked width, then the command
        fcntl.ioctl(0, termios.TIOCSWINSZ, struct.pack("HHHH", 40, columns, 0, 0))
        os.execvpe(sys.executable, [sys.executable, "-m", "stavegen", *map(str, args)], env)
    raw = b""
    while True:
        try:
            chunk = os.read(fd, 65536)
        except OSError:
            break
        if not chunk:
            break
        raw += chunk
    _, status = os.waitpid(pid, 0)
    text = raw.decode("utf-8", "replace")
    return text, on_screen(text), os.waitstatus_to_exitcode(status)


SPINNER = tuple("⠋⠙⠹⠸⠼⠴⠦⠧⠇⠏")  # rich's "dots" spinner frames


def whole(figure: str, text: str) -> bool:
    """``figure`` printed whole: not touching other characters (so "3/4"" does not count inside "3 3/4"")."""
    return re.search(rf"(?<![\w/'\".]){re.escape(figure)}(?![\w/'\".])", text) is not None


def row_in_order(key: str, figures: list[str], text: str) -> bool:
    """The lines that start with ``key`` (a station, a stave count: a table split in parts repeats it) hold
    ``figures`` in order, each whole (the key repeated at the head of a later part is left out)."""
    lines = [line.strip() for line in text.splitlines() if line.strip().startswith(key + " ")]
    joined = " ".join(lines[:1] + [line[len(key):] for line in lines[1:]])
    pattern = r"\s+".join(re.escape(f) for f in figures)
    return re.search(rf"(?:^|\s){pattern}(?:\s|$)", joined) is not None


@pytest.mark.parametrize("sample", SPAR_SAMPLES, ids=[p.stem for p in SPAR_SAMPLES])
def test_check_at_80_columns_cuts_no_figure(sample, run):
    raw, out, code = in_terminal(["check", sample])
    assert code in (0, 1), out
    assert "…" not in out
    # The spinner's frames overwrite each other on a terminal; with the escapes stripped they run together on
    # one line, as many as the step took tenths of a second: they are not printed lines.
    printed = [line for line in out.splitlines() if not line.startswith(SPINNER)]
    assert all(len(line) <= 80 for line in printed), max(printed, key=len)
    doc = json.loads(run(["check", "--json", sample]).stdout)
    spar = load_spar(sample)
    fig = Figures(spar)
    for s in doc["stations"]:
        key = fig.position(s["z_mm"]) if spar.units == "in" else f"{s['z_mm']:.0f} mm"
        if doc["spar"]["shape"] != "round":  # both dimensions, then each ratio fore-and-aft and athwartships
            figures = [key, fig.describe(s["plan_fore_aft_mm"]), "x", fig.describe(s["plan_athwartships_mm"]),
                       fig.dress(s["fore_aft_mm"]), "x", fig.dress(s["athwartships_mm"]), fig.dress(s["wall_mm"]),
                       f"{s['ei_ratio_fore_aft']:.3f}", f"{s['ei_ratio_athwartships']:.3f}",
                       f"{s['strength_ratio_fore_aft']:.3f}", f"{s['strength_ratio_athwartships']:.3f}"]
            assert row_in_order(key, figures, out), (key, figures)
            continue
        figures = [key, fig.describe(s["plan_od_mm"]), fig.dress(s["od_mm"]), fig.dress(s["wall_mm"]),
                   fig.mark_width(s["stave_width_mm"])]
        if s["notch_depth_mm"] is not None:
            figures.append(fig.notch_depth(s["notch_depth_mm"]))
        figures += [f"{s['ei_ratio']:.3f}", f"{s['strength_ratio']:.3f}"]
        assert row_in_order(key, figures, out), (key, figures)
    for kg in (doc["mass"]["plan_kg"], doc["mass"]["hollow_kg"]):
        assert whole(format_mass(kg, spar.units), out)
    for mm in (doc["mass"]["plan_cg_mm"], doc["mass"]["hollow_cg_mm"]):
        assert whole(fig.position(mm), out)
    assert whole(f"{doc['check']['min_ei_ratio']:.3f}", out)
    assert whole(fig.position(doc["check"]["min_ei_ratio_z_mm"]), out)
    if doc["check"]["passed"]:
        assert whole(format_mass(doc["mass"]["saved_kg"], spar.units), out)


def test_a_boat_check_at_80_columns_cuts_no_figure():
    raw, out, code = in_terminal(["check", SAMPLES / "daysailer.toml"])
    assert code in (0, 1), out
    assert "…" not in out
    for name in ("daysailer-mast", "daysailer-boom", "daysailer-gaff"):
        spar = load_spar(SAMPLES / f"{name}.toml")
        assert whole(spar.name, out)


@pytest.fixture(scope="module")
def gaff_with_auto_wall(tmp_path_factory):
    """The day-sailer gaff with its wall left to stavegen and its own stave count kept (8)."""
    text = (SAMPLES / "daysailer-gaff.toml").read_text(encoding="utf-8")
    text = text.replace('wall = "7/16"', 'wall = "auto"')
    path = tmp_path_factory.mktemp("gaff") / "gaff.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_size_at_80_columns_shows_progress_cuts_nothing_and_fills_only_auto(gaff_with_auto_wall, tmp_path):
    out_file = tmp_path / "written.toml"
    raw, out, code = in_terminal(["size", gaff_with_auto_wall, "--write", out_file])
    assert code == 0, out
    assert "sizing and laying out" in raw  # the progress bar was drawn while the counts were worked out
    assert "…" not in out
    comparison = compare_stave_counts(load_spar(gaff_with_auto_wall))
    for c in comparison.candidates:
        if c.refused:
            continue
        fig = Figures(c.spar)
        figures = [str(c.staves), f"{c.assessment.weakest_stiffness.ei_ratio:.3f}"]
        wall = c.spar.hollow.wall
        if wall.is_constant:
            figures.append(fig.dress(wall.largest))
        figures += [fig.dress(c.widest), f"{c.width_over_thickness[0]:.2f}"]
        if c.fits_stock:
            figures += [str(c.rips_per_board), f"{c.board_feet:.1f}"]
        assert row_in_order(str(c.staves), figures, out), (c.staves, figures)
    # Only the wall was "auto": the file's 8 staves stay, the wall is the one solved for 8 staves.
    written = tomllib.loads(out_file.read_text(encoding="utf-8"))["hollow"]
    assert written["staves"] == 8
    eight = next(c for c in comparison.candidates if c.staves == 8)
    assert load_spar(out_file).hollow.wall.largest >= eight.spar.hollow.wall.largest - 1e-9  # rounded up
    said = f'hollow.wall = {json.dumps(written["wall"]) if isinstance(written["wall"], str) else written["wall"]}'
    assert said in " ".join(out.split()) and '(was "auto")' in out
    assert "hollow.staves" not in out.split("wrote")[-1]


def test_size_write_sets_the_stave_count_only_when_asked(gaff_with_auto_wall, tmp_path, run):
    out_file = tmp_path / "chosen.toml"
    result = run(["size", gaff_with_auto_wall, "--write", out_file, "--set-staves"])
    assert result.exit_code == 0, result.output
    chosen = int(re.search(r"choice: (\d+) staves", result.stdout).group(1))
    written = tomllib.loads(out_file.read_text(encoding="utf-8"))["hollow"]
    assert written["staves"] == chosen
    flat = " ".join(result.stdout.split())
    assert f"hollow.staves = {chosen} (was 8)" in flat and "hollow.wall = " in flat
    assert "…" not in result.stdout  # piped: no cut either


def test_size_write_with_nothing_auto_writes_nothing(run, tmp_path):
    out_file = tmp_path / "same.toml"
    result = run(["size", SAMPLES / "daysailer-gaff.toml", "--write", out_file])
    assert result.exit_code == 0, result.output
    assert not out_file.exists() and "nothing written" in result.stdout


# The layout pieces, at any width -----------------------------------------------------------------------------


def _wide_table() -> Table:
    table = Table(title="Wide", header_style="bold")
    table.add_column("key", no_wrap=True)
    for k in range(9):
        table.add_column(f"figure\n{k}", justify="right", no_wrap=True)
    table.add_column("", no_wrap=False)
    for row in range(6):
        table.add_row(f"{row}' 0\"", *[f"{row + k} {k + 1}/32\"" for k in range(9)], "a note that may wrap")
    return table


@pytest.mark.parametrize("width", [12, 30, 50, 80, 120, 200])  # 12: one block of lines per row
def test_a_fitted_table_cuts_no_cell_at_any_width(width):
    console = Console(file=StringIO(), width=width, color_system=None)
    console.print(fit(_wide_table()))
    text = console.file.getvalue()
    assert "…" not in text
    assert all(len(line) <= width for line in text.splitlines())
    for row in range(6):
        for k in range(9):
            assert whole(f"{row + k} {k + 1}/32\"", text), (width, row, k)


@pytest.mark.parametrize("width", [12, 20, 40])
def test_prose_never_splits_a_figure(width):
    line = "PASS least EI ratio 1.449 at 7' 10 25/32\" from the heel; 9.2 lb lighter; a wall of 15.9 mm (27 %)."
    console = Console(file=StringIO(), width=width, color_system=None)
    console.print(Prose(line))
    text = console.file.getvalue()
    for figure in ("7' 10 25/32\"", "9.2 lb", "15.9 mm", "27 %)."):
        assert figure in text, (width, text)
    assert " ".join(text.split()) == line
