"""Boat files: several spars, one lumber order, one set of shop papers.

References outside the code under test:
- the lumber rules' board measure, BF = T(in) × W(in) × L(ft) / 12 (NHLA rules; PS 20),
  recomputed here from the JSON's board sizes;
- a geometric replay of the saw (or router) on every board: rips side by side, one gap
  apart, pieces end to end, one gap apart, all inside the board;
- each spar built alone by the single-spar pipeline (the boat must not change it);
- the DXF read back with the test suite's independent group-code reader and measured
  with shapely (outline to outline distances).
"""

from __future__ import annotations

import csv
import io
import json
import shutil
from pathlib import Path

import pytest
import shapely
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from shapely.geometry import Polygon

from stavegen.boat import design_boat
from stavegen.errors import InputError
from stavegen.model.boat import load_boat, parse_boat
from stavegen.model.loader import load_spar
from stavegen.pipeline import design
from stavegen.render.boat_papers import boat_document, to_boat_csv
from stavegen.render.json_doc import document

from conftest import SAMPLES
from test_dxf import CUT, read_dxf

IN = 25.4
BOATS = ("daysailer.toml", "lugyawl.toml")


def rule_board_feet(size: dict) -> float:
    """Lumber rules: nominal thickness (in) × nominal width (in) × length (ft) / 12."""
    return (size["nominal_thickness_mm"] / IN) * (size["nominal_width_mm"] / IN) * (size["length_mm"] / 304.8) / 12


def replay_boards(cutting: list[dict], gap: float) -> None:
    """Every rip and piece lies inside its board, neighbours at least ``gap`` apart (the shop's cuts)."""
    for board in cutting:
        rips = sorted(board["rips"], key=lambda r: r["offset_mm"])
        assert rips[0]["offset_mm"] >= -1e-9
        for a, b in zip(rips, rips[1:]):
            assert b["offset_mm"] >= a["offset_mm"] + a["width_mm"] + gap - 1e-6
        assert rips[-1]["offset_mm"] + rips[-1]["width_mm"] <= board["width_mm"] + 1e-6
        for rip in rips:
            pieces = sorted(rip["pieces"], key=lambda p: p["offset_mm"])
            assert pieces[0]["offset_mm"] >= -1e-9
            for a, b in zip(pieces, pieces[1:]):
                assert b["offset_mm"] >= a["offset_mm"] + a["length_mm"] + gap - 1e-6
            assert pieces[-1]["offset_mm"] + pieces[-1]["length_mm"] <= board["length_mm"] + 1e-6


@pytest.fixture(scope="module", params=BOATS)
def built(request):
    boat = load_boat(SAMPLES / request.param)
    return design_boat(boat, layout=True)


def test_each_spar_in_the_boat_is_the_spar_built_alone(built):
    for bs, d in built.spars:
        alone = design(load_spar(SAMPLES / bs.file), layout=True)
        assert document(d) == document(alone)


def test_every_segment_is_cut_once_under_a_unique_label(built):
    doc = boat_document(built)
    cut = [p["label"] for b in doc["stock"]["cutting"] for r in b["rips"] for p in r["pieces"]]
    assert len(cut) == len(set(cut))
    wanted = {f"{bs.tag}-{seg.label}": seg.length for bs, d in built.spars for seg in d.layout.segments}
    assert sorted(cut) == sorted(wanted)
    for b in doc["stock"]["cutting"]:
        for r in b["rips"]:
            for p in r["pieces"]:
                assert p["length_mm"] == pytest.approx(wanted[p["label"]], abs=1e-9)
    replay_boards(doc["stock"]["cutting"], doc["stock"]["gap_mm"])
    # The cut list names the same board for every segment, and holds each once.
    rows = list(csv.reader(io.StringIO(to_boat_csv(built))))
    head = rows[0]
    label, board = head.index("label"), head.index("board")
    segments = rows[1:rows.index([])] if [] in rows else rows[1:]
    on_board = {p["label"]: b["board"] for b in doc["stock"]["cutting"] for r in b["rips"] for p in r["pieces"]}
    assert sorted(row[label] for row in segments) == sorted(wanted)
    assert all(on_board[row[label]] == row[board] for row in segments)
    assert all(len(row) == len(head) for row in segments)


def test_the_boat_order_against_the_spars_bought_alone(built):
    doc = boat_document(built)
    stock = doc["stock"]
    apart = [s["stock"] for s in doc["spars"]]
    assert stock["separate_board_feet"] == pytest.approx(sum(s["board_feet"] for s in apart), rel=1e-12)
    assert stock["board_feet"] <= stock["separate_board_feet"] + 1e-9
    assert stock["used_board_feet"] <= stock["separate_used_board_feet"] + 1e-9
    assert stock["lower_bound_board_feet"] <= stock["used_board_feet"] + 1e-9
    assert stock["board_feet"] == pytest.approx(sum(rule_board_feet(b) * b["count"] for b in stock["boards"]))
    assert stock["used_board_feet"] == pytest.approx(sum(rule_board_feet(b) for b in stock["cutting"]))
    # Ordering the demo boats together saves wood: the offcuts of one spar serve another.
    assert stock["board_feet"] < stock["separate_board_feet"]


# Random boats --------------------------------------------------------------------------------------


def _toml(data: dict) -> str:
    """A flat TOML writer for the tables used here (strings, numbers, lists, nested [[tables]])."""
    lines = []
    for table, values in data.items():
        if isinstance(values, list):
            for item in values:
                lines.append(f"[[{table}]]")
                lines += [f"{k} = {json.dumps(v)}" for k, v in item.items()]
            continue
        lines.append(f"[{table}]")
        lines += [f"{k} = {json.dumps(v)}" for k, v in values.items()]
    return "\n".join(lines) + "\n"


def _spar(name: str, length: float, diameter: float, staves: int, wall: float) -> dict:
    mm = lambda v: f"{v:.2f} mm"  # noqa: E731
    return {
        "spar": {"name": name, "units": "mm", "length": mm(length)},
        "plan": {"wood": "sitka-spruce", "stations": [[0, mm(diameter)], [mm(length), mm(0.7 * diameter)]]},
        "hollow": {"wood": "sitka-spruce", "staves": staves, "joint": "birdsmouth-flush", "wall": mm(wall),
                   "end_allowance": 50},
    }


@settings(max_examples=5, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(spars=st.lists(st.tuples(st.floats(1500, 6000), st.floats(50, 110), st.sampled_from([6, 8, 12])),
                      min_size=2, max_size=3),
       lengths=st.sampled_from([[2400, 3000], [2400, 3000, 3600], [3000, 4200]]),
       widths=st.sampled_from([[95], [95, 145], [145, 195]]), router=st.booleans())
def test_random_boats_never_buy_more_than_their_spars_bought_alone(tmp_path, spars, lengths, widths, router):
    folder = tmp_path / f"boat{len(list(tmp_path.iterdir()))}"
    folder.mkdir()
    files = []
    for i, (length, diameter, staves) in enumerate(spars):
        name = f"spar{i}.toml"
        (folder / name).write_text(_toml(_spar(f"Spar {i}", length, diameter, staves, 0.18 * 0.7 * diameter)))
        files.append(name)
    stock = {"thickness": 20, "nominal_thickness": 25, "widths": widths, "lengths": lengths, "kerf": 3}
    if router:
        stock.update(separate_with="router", router_bit=6.35)
    boat = {"boat": {"name": "Random boat", "units": "mm", "spars": files}, "stock": stock}
    (folder / "boat.toml").write_text(_toml(boat))
    built = design_boat(load_boat(folder / "boat.toml"), layout=True)
    doc = boat_document(built)
    s = doc["stock"]
    assert s["board_feet"] <= s["separate_board_feet"] + 1e-9
    assert s["used_board_feet"] <= s["separate_used_board_feet"] + 1e-9
    cut = [p["label"] for b in s["cutting"] for r in b["rips"] for p in r["pieces"]]
    wanted = [f"{bs.tag}-{seg.label}" for bs, d in built.spars for seg in d.layout.segments]
    assert sorted(cut) == sorted(wanted) and len(set(cut)) == len(cut)
    assert s["gap_mm"] == (6.35 if router else 3.0)
    replay_boards(s["cutting"], s["gap_mm"])


# The files -------------------------------------------------------------------------------------------


def test_build_a_boat_writes_one_set_of_papers(run, tmp_path):
    out = tmp_path / "out"
    result = run(["build", SAMPLES / "daysailer.toml", "-o", out])
    assert result.exit_code == 0, result.output
    names = sorted(p.name for p in out.iterdir())
    assert names == sorted(["day-sailer.json", "day-sailer-cutlist.csv", "day-sailer-report.pdf",
                            *[f"day-sailer-{s}-{k}" for s in ("mast", "boom", "gaff")
                              for k in ("templates.dxf", "cut.dxf", "fullsize.pdf")]])
    doc = json.loads((out / "day-sailer.json").read_text())
    assert [s["spar"]["name"] for s in doc["spars"]] == ["Day-sailer mast", "Day-sailer boom", "Day-sailer gaff"]
    alone = tmp_path / "alone"
    assert run(["build", SAMPLES / "daysailer-mast.toml", "-o", alone]).exit_code == 0
    assert doc["spars"][0] == json.loads((alone / "day-sailer-mast.json").read_text())
    text = " ".join(result.stdout.split())
    apart, together = doc["stock"]["separate_board_feet"], doc["stock"]["board_feet"]
    assert f"{together:.1f} board feet ordered together against {apart:.1f}" in text
    # The report's first page names every spar with its verdict and the two figures side by side.
    from pypdf import PdfReader

    page1 = " ".join(PdfReader(out / "day-sailer-report.pdf").pages[0].extract_text().split())
    for name in ("Day-sailer mast", "Day-sailer boom", "Day-sailer gaff"):
        assert name in page1
    assert page1.count("PASS") >= 4
    assert f"needs {together:.1f} board feet" in page1 and f"{apart:.1f} board feet in all" in page1


def test_check_and_size_take_a_boat(run):
    result = run(["check", SAMPLES / "lugyawl.toml"])
    assert result.exit_code == 0, result.output
    for name in ("Lug yawl mainmast", "Lug yawl mizzen", "Lug yawl yard"):
        assert name in result.stdout
    doc = json.loads(run(["check", SAMPLES / "lugyawl.toml", "--json"]).stdout)
    assert doc["boat"]["passed"] and len(doc["spars"]) == 3 and "stock" not in doc
    section = run(["section", SAMPLES / "lugyawl.toml", "--at", "1000"])
    assert section.exit_code == 2 and "boat file" in section.stderr


def test_init_writes_a_starter_boat_that_checks(run, tmp_path):
    for units in ("in", "mm"):
        path = tmp_path / units / "my-boat.toml"
        path.parent.mkdir()
        result = run(["init", path, "--boat", "--units", units])
        assert result.exit_code == 0, result.output
        assert sorted(p.name for p in path.parent.iterdir()) == ["my-boat-boom.toml", "my-boat-mast.toml",
                                                                 "my-boat.toml"]
        assert run(["check", path]).exit_code in (0, 1)
        assert run(["init", path, "--boat"]).exit_code == 2  # no overwriting without --force


@pytest.mark.parametrize("change, key", [
    ('spars = ["daysailer-mast.toml", "daysailer-mast.toml"]', "boat.spars[2]"),
    ('spars = [{ file = "daysailer-mast.toml", tag = "M" }, { file = "daysailer-boom.toml", tag = "m" }]',
     "boat.spars[2].tag"),
    ('spars = [{ file = "daysailer-mast.toml", tag = "MAST1" }]', "boat.spars[1].tag"),
    ('spars = ["no-such-spar.toml"]', "boat.spars[1]"),
    ('spars = []', "boat.spars"),
])
def test_bad_boat_files_name_the_key(tmp_path, run, change, key):
    for name in ("daysailer-mast.toml", "daysailer-boom.toml"):
        shutil.copy(SAMPLES / name, tmp_path / name)
    text = (SAMPLES / "daysailer.toml").read_text()
    start, end = text.index("spars = ["), text.index("]\n\n[stock]") + 1
    (tmp_path / "boat.toml").write_text(text[:start] + change + text[end:])
    result = run(["check", tmp_path / "boat.toml"])
    assert result.exit_code == 2, result.output
    assert key in result.stderr and "boat.toml" in result.stderr and "\n" not in result.stderr.strip()


def test_no_scarf_belongs_to_the_spars(tmp_path):
    text = (SAMPLES / "daysailer.toml").read_text().replace("waste = 0.10", 'waste = 0.10\nno_scarf = [[0, 100]]')
    for name in ("daysailer-mast.toml", "daysailer-boom.toml", "daysailer-gaff.toml"):
        shutil.copy(SAMPLES / name, tmp_path / name)
    (tmp_path / "boat.toml").write_text(text)
    with pytest.raises(InputError) as err:
        load_boat(tmp_path / "boat.toml")
    assert err.value.key == "stock.no_scarf"


def test_the_boats_boards_replace_the_spar_files(tmp_path):
    for name in ("daysailer-mast.toml", "daysailer-boom.toml", "daysailer-gaff.toml"):
        shutil.copy(SAMPLES / name, tmp_path / name)
    text = (SAMPLES / "daysailer.toml").read_text().replace('lengths = ["8 ft", "10 ft", "12 ft", "14 ft"]',
                                                            'lengths = ["8 ft", "16 ft"]')
    (tmp_path / "boat.toml").write_text(text)
    boat = load_boat(tmp_path / "boat.toml")
    for bs in boat.spars:
        own = load_spar(tmp_path / bs.file).stock
        assert bs.spar.stock.lengths == (8 * 304.8, 16 * 304.8)
        assert bs.spar.stock.no_scarf == own.no_scarf and bs.spar.stock.scarf_ratio == own.scarf_ratio
        assert bs.own_boards_differ
    built = design_boat(boat)
    assert all(any("boat's boards" in w for w in d.warnings) for d in built.designs)


# Routed boards ------------------------------------------------------------------------------------------


def outline_gaps(path: Path) -> tuple[float, float]:
    """(closest two cut outlines, the file's unit in mm), read back from the DXF."""
    dxf = read_dxf(path)
    unit = {1: IN, 4: 1.0}[int(dxf.header["$INSUNITS"][0][1])]
    polys = [Polygon(e.points) for e in dxf.on(CUT, "LWPOLYLINE")]
    tree = shapely.STRtree(polys)
    least = float("inf")
    for i, p in enumerate(polys):
        for j in tree.query(p.buffer(20.0 / unit)):
            if j != i:
                least = min(least, p.distance(polys[j]))
    return least * unit, unit


def _metric_boat(folder: Path, routed: bool) -> Path:
    for name in ("lugyawl-mainmast.toml", "lugyawl-mizzen.toml", "lugyawl-yard.toml"):
        shutil.copy(SAMPLES / name, folder / name)
    text = (SAMPLES / "lugyawl.toml").read_text().replace("kerf = 3", "kerf = 3" + (
        '\nseparate_with = "router"\nrouter_bit = "1/4 in"' if routed else ""))
    text = text.replace("mark_spacing = 250", "mark_spacing = 250\ntemplates_on_boards = true")
    (folder / "boat.toml").write_text(text)
    return folder / "boat.toml"


@pytest.mark.parametrize("routed", [False, True])
def test_router_bit_keeps_outlines_a_bit_apart(run, tmp_path, routed):
    """A 1/4 in (6.35 mm) bit cutting an outside profile: laid out for the saw, outlines are 6 mm apart across the
    rips (3 mm kerf and two 1.5 mm edge allowances) and one 3 mm kerf apart end to end, so the bit would cut into
    the neighbour; with the router named they are at least the bit apart, on every sheet."""
    bit = 6.35
    boat = _metric_boat(tmp_path, routed)
    out = tmp_path / "out"
    result = run(["build", boat, "-o", out])
    assert result.exit_code == 0, result.output
    least, _ = outline_gaps(out / "lug-yawl-boards.dxf")
    if routed:
        assert least >= bit - 1e-6
        assert least == pytest.approx(bit, abs=1e-3)  # pieces end to end in a rip: exactly the bit apart
    else:
        assert least == pytest.approx(3.0, abs=1e-3) and least < bit  # the saw's kerf: too close for the bit
    for spar in ("mainmast", "mizzen", "yard"):  # each spar's own sheet on the boat's boards
        least, _ = outline_gaps(out / f"lug-yawl-{spar}-templates.dxf")
        assert least >= (bit if routed else 3.0) - 1e-6
    doc = json.loads((out / "lug-yawl.json").read_text())
    assert doc["stock"]["gap_mm"] == pytest.approx(bit if routed else 3.0)


def test_router_on_a_single_spar(tmp_path, run):
    text = (SAMPLES / "daysailer-mast.toml").read_text().replace('kerf = "1/8"', 'kerf = "1/8"\nseparate_with = '
                                                                  '"router"\nrouter_bit = "3/8"')
    text = text.replace("mark_spacing = 12", "mark_spacing = 12\ntemplates_on_boards = true")
    (tmp_path / "mast.toml").write_text(text)
    result = run(["build", tmp_path / "mast.toml", "-o", tmp_path / "out"])
    assert result.exit_code == 0, result.output
    least, _ = outline_gaps(tmp_path / "out" / "day-sailer-mast-templates.dxf")
    assert least >= 3 / 8 * IN - 1e-6
    bad = text.replace('router_bit = "3/8"\n', "")
    (tmp_path / "bad.toml").write_text(bad)
    result = run(["check", tmp_path / "bad.toml"])
    assert result.exit_code == 2 and "stock.router_bit" in result.stderr
