"""A printed size built back into a spar file must still pass: the figures a builder reads are safe ones.

For spars whose wall or diameters stavegen solves, the station table that
``stavegen check`` prints (the wall and the finished diameter at every
station, in the file's units, as a builder reads them) and the stave
thickness the CSV cut list prints are written back into a new spar file,
exactly as printed, and that file is checked again: it must pass. The same
figures rounded to the nearest 1/32 in instead (what the first release
printed) fail, so the test can tell the two apart.
"""

from __future__ import annotations

import math
import re

import pytest

from stavegen.model.loader import parse_spar
from stavegen.pipeline import design, resolve
from stavegen.checks.assess import assess
from stavegen.render.csv_cutlist import to_csv

from conftest import SPAR_SAMPLES, cut_list, spar_dict


def printed_stations(run, path) -> list[tuple[str, str, str]]:
    """(position, finished OD, wall) of every row of the station table ``stavegen check`` prints."""
    result = run(["check", path])
    assert result.exit_code in (0, 1), result.output
    rows = []
    for line in result.stdout.splitlines():
        cells = re.split(r"\s{2,}", line.strip())
        if len(cells) >= 9 and re.match(r"^-?[\d.]", cells[0]) and re.search(r"\d\.\d{3}$", cells[6]):
            rows.append((cells[0], cells[2], cells[3]))
    assert rows, result.stdout
    return rows


def as_file_value(text: str, units: str) -> str:
    """A printed figure as the spar file takes it: ``5 3/8"`` → ``"5 3/8 in"``, ``2' 6"`` → ``"2 ft 6 in"``."""
    text = text.strip()
    if units == "mm":
        return text
    feet = re.match(r"^(\d+)' (.+)\"$", text)
    if feet:
        return f"{feet.group(1)} ft {feet.group(2)} in"
    return text.rstrip('"') + " in"


def rebuilt(data: dict, rows, units: str, wall: bool, diameters: bool) -> dict:
    data = {k: dict(v) for k, v in data.items()}
    if wall:
        data["hollow"]["wall"] = [[as_file_value(z, units), as_file_value(w, units)] for z, _, w in rows]
    if diameters:  # an oval prints "fore-and-aft x athwartships": written back as [position, fore_aft, athwartships]
        data["hollow"]["stations"] = [[as_file_value(z, units)] + [as_file_value(d, units) for d in od.split(" x ")]
                                      for z, od, _ in rows]
    return data


def base(units: str, **hollow) -> dict:
    length = 4000 if units == "mm" else "13 ft"
    stations = ([[0, 95], [1500, 110], [4000, 70]] if units == "mm"
                else [[0, "3 3/4"], ["5 ft", "4 1/4"], ["13 ft", "2 3/4"]])
    data = spar_dict(
        spar={"name": "Round trip", "units": units, "length": length},
        plan={"wood": "sitka-spruce", "stations": stations},
        hollow={"wood": "douglas-fir-coast", "staves": 8, "joint": "birdsmouth-flush", "planing_allowance":
                1.5 if units == "mm" else "1/16", "margin": 0.02, **hollow},
        stock={"thickness": 40 if units == "mm" else "1 1/2", "widths": [100, 150] if units == "mm" else [4, 6],
               "lengths": [3000, 4200] if units == "mm" else ["10 ft", "14 ft"],
               "kerf": 3 if units == "mm" else "1/8 in"},
        output={"mark_spacing": 500 if units == "mm" else 18},
    )
    return data


CASES = [
    ("in", {"wall": "auto"}, True, False),
    ("in", {"wall": "auto-tapered"}, True, False),
    ("mm", {"wall": "auto"}, True, False),
    ("mm", {"wall": 16, "stations": "auto"}, False, True),
    ("in", {"wall": "5/8", "stations": "auto"}, False, True),
]


@pytest.mark.parametrize("units, hollow, wall, diameters", CASES)
def test_printed_sizes_pass_check(run, tmp_path, units, hollow, wall, diameters):
    import tomlkit

    data = base(units, **hollow)
    path = tmp_path / "solve.toml"
    path.write_text(tomlkit.dumps(data))
    rows = printed_stations(run, path)
    again = tmp_path / "printed.toml"
    again.write_text(tomlkit.dumps(rebuilt(data, rows, units, wall, diameters)))
    result = run(["check", again])
    assert result.exit_code == 0, result.stdout


def test_the_cut_list_thickness_is_a_safe_wall(tmp_path):
    """Staves dressed to the CSV's thickness, as a constant wall, pass."""
    for units in ("in", "mm"):
        data = base(units, wall="auto")
        resolved, _ = resolve(parse_spar(data, "x.toml"))
        d = design(resolved, layout=True)
        _, rows, _ = cut_list(to_csv(d))
        column = next(k for k in rows[0] if k.startswith("thickness (") and "decimal" not in k)
        printed = {row[column] for row in rows}
        assert len(printed) == 1  # one thickness for every segment: a constant wall
        again = dict(data, hollow=dict(data["hollow"], wall=as_file_value(printed.pop() + ('"' if units == "in"
                                                                                          else ""), units)))
        assert assess(parse_spar(again, "x.toml")).passed


def test_rounding_to_the_nearest_would_fail():
    """The first release printed the nearest 1/32 in: a solved wall it rounds down fails the check."""
    data = base("in", wall="auto")
    resolved, _ = resolve(parse_spar(data, "x.toml"))
    exact = resolved.hollow.wall.largest / 25.4
    nearest = round(exact * 32) / 32
    assert nearest < exact, "pick a case whose nearest 1/32 lies below the solved wall"
    down = dict(data, hollow=dict(data["hollow"], wall=f"{math.floor(nearest * 32)}/32 in"))
    assert not assess(parse_spar(down, "x.toml")).passed


@pytest.mark.parametrize("path", [p for p in SPAR_SAMPLES if "too-light" not in p.name], ids=lambda p: p.stem)
def test_samples_printed_back_still_pass(run, tmp_path, path):
    """Every passing sample, its walls and diameters replaced by the station table's printed figures, passes."""
    import tomllib

    import tomlkit

    data = tomllib.loads(path.read_text(encoding="utf-8"))
    units = data["spar"].get("units", "in")
    rows = printed_stations(run, path)
    again = tmp_path / path.name
    again.write_text(tomlkit.dumps(rebuilt(data, rows, units, wall=True, diameters=True)))
    result = run(["check", again])
    assert result.exit_code == 0, result.stdout
