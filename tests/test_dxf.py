"""The DXF cutting templates, checked from outside the renderer.

References used here, none of them stavegen's own drawing code:
- ezdxf's ``audit()``, the DXF library's own structural check of a document;
- an independent reader of the file (``read_dxf`` below): a plain group-code
  parser written from the DXF reference's description of the format (pairs
  of lines, a group code and a value; sections HEADER, TABLES, ENTITIES),
  not ezdxf;
- shapely for closure, validity, self-intersection and overlap;
- the stave widths as the section model computes them at each station
  (``SectionCache``), and for flush birdsmouth joints the closed form of the
  geometry reference, w = 2·a_o·tan(π/N) (GEOMETRY.md, flush);
- the regular N-gon: apothem = 2·area / perimeter, area = N·a²·tan(π/N).
"""

from __future__ import annotations

import json
import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import ezdxf
import pytest
import shapely
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from shapely.geometry import LineString, LinearRing, Polygon, box

from stavegen.errors import DesignError
from stavegen.build import output_names, write_outputs
from stavegen.model.loader import load_spar, parse_spar
from stavegen.pipeline import design
from stavegen.render import dxf_templates
from stavegen.render.dxf_templates import CUT, LAYERS, write_templates
from stavegen.render.json_doc import to_json
from stavegen.stations.evaluate import SectionCache

from conftest import SAMPLES, SPAR_SAMPLES, spar_dict

MM_PER = {"in": 25.4, "mm": 1.0}
ALLOWED = {"LWPOLYLINE", "LINE", "CIRCLE", "ARC", "TEXT", "MTEXT"}
WIDTH_TOLERANCE = 0.05  # mm, the brief's tolerance on widths and lengths


# An independent DXF reader -------------------------------------------------------------------

@dataclass
class Entity:
    kind: str
    codes: list[tuple[int, str]] = field(default_factory=list)

    def first(self, code: int, default: str | None = None) -> str | None:
        return next((v for c, v in self.codes if c == code), default)

    def all(self, code: int) -> list[str]:
        return [v for c, v in self.codes if c == code]

    @property
    def layer(self) -> str:
        return self.first(8, "0")

    @property
    def points(self) -> list[tuple[float, float]]:
        return list(zip(map(float, self.all(10)), map(float, self.all(20))))

    @property
    def closed(self) -> bool:
        return bool(int(self.first(70, "0")) & 1)

    @property
    def anchor(self) -> tuple[float, float]:
        """A TEXT's placement: the second alignment point when it is aligned, else the first."""
        if int(self.first(72, "0")) or int(self.first(73, "0")):
            return float(self.first(11)), float(self.first(21))
        return float(self.first(10)), float(self.first(20))


@dataclass
class DxfFile:
    header: dict[str, list[tuple[int, str]]]
    entities: list[Entity]
    layers: dict[str, Entity]

    def on(self, layer: str, kind: str | None = None) -> list[Entity]:
        return [e for e in self.entities if e.layer == layer and (kind is None or e.kind == kind)]


def read_dxf(path: Path) -> DxfFile:
    """Header variables, modelspace entities and layer table records of an ASCII DXF file."""
    lines = path.read_text(encoding="utf-8").splitlines()
    pairs = [(int(lines[i].strip()), lines[i + 1].strip()) for i in range(0, len(lines) - 1, 2)]
    header: dict[str, list[tuple[int, str]]] = {}
    entities: list[Entity] = []
    layers: dict[str, Entity] = {}
    section = None
    current: Entity | None = None
    variable = None
    for i, (code, value) in enumerate(pairs):
        if code == 0 and value == "SECTION":
            section = pairs[i + 1][1]
            current = variable = None
            continue
        if code == 0 and value == "ENDSEC":
            section = current = None
            continue
        if section == "HEADER":
            if code == 9:
                variable = value
                header[variable] = []
            elif variable is not None:
                header[variable].append((code, value))
        elif section in ("ENTITIES", "TABLES"):
            if code == 0:
                current = Entity(value)
                if section == "ENTITIES":
                    entities.append(current)
            elif current is not None:
                current.codes.append((code, value))
                if section == "TABLES" and current.kind == "LAYER" and code == 2:
                    layers[value] = current
    return DxfFile(header, entities, layers)


# Helpers -------------------------------------------------------------------------------------

def templates_of(result, tmp_path: Path) -> tuple[Path, DxfFile]:
    path = tmp_path / "templates.dxf"
    write_templates(result, path)
    return path, read_dxf(path)


def width_across(polygon: Polygon, x: float) -> float:
    """Length of the vertical line x = const inside the polygon (mm)."""
    x0, y0, x1, y1 = polygon.bounds
    return polygon.intersection(LineString([(x, y0 - 10), (x, y1 + 10)])).length


def check_templates(result, path: Path, dxf: DxfFile, on_boards: bool = False) -> float:
    """Every check of a written template file; returns the worst width error found (mm).

    ``on_boards``: the parts lie on the boards of the lumber order, a kerf apart, without the marks that
    stand outside an outline (station figures): they must not overlap rather than keep 10 mm apart.
    """
    spar, layout = result.spar, result.layout
    unit = MM_PER[spar.units]

    # ezdxf's own structural check.
    auditor = ezdxf.readfile(path).audit()
    assert not auditor.has_errors, [str(e) for e in auditor.errors]

    # Units and extents in the header.
    assert int(dxf.header["$INSUNITS"][0][1]) == {"in": 1, "mm": 4}[spar.units]
    assert int(dxf.header["$MEASUREMENT"][0][1]) == {"in": 0, "mm": 1}[spar.units]
    ext_min = [float(v) for c, v in dxf.header["$EXTMIN"] if c in (10, 20)]
    ext_max = [float(v) for c, v in dxf.header["$EXTMAX"] if c in (10, 20)]
    assert ext_min[0] < ext_max[0] and ext_min[1] < ext_max[1]
    # The header's extents hold everything ezdxf's own (exact) bounding box finds in the drawing.
    exact = ezdxf.bbox.extents(ezdxf.readfile(path).modelspace())
    assert ext_min[0] <= exact.extmin.x + 1e-9 and ext_min[1] <= exact.extmin.y + 1e-9
    assert ext_max[0] >= exact.extmax.x - 1e-9 and ext_max[1] >= exact.extmax.y - 1e-9

    # Only the entity kinds CAM reads; colours by layer; our layers carry a colour and a lineweight.
    assert {e.kind for e in dxf.entities} <= ALLOWED
    assert all(e.first(62) is None for e in dxf.entities)
    for name in LAYERS:
        record = dxf.layers[name]
        assert int(record.first(62)) > 0 and int(record.first(370)) > 0
    assert all(e.first(7, "Standard") == "Standard" for e in dxf.entities if e.kind == "TEXT")

    # The cutting layer holds one closed outline per segment and nothing else.
    cut = dxf.on(CUT)
    assert all(e.kind == "LWPOLYLINE" and e.closed for e in cut)
    assert len(cut) == len(layout.segments)
    polygons = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in cut]
    for e, poly in zip(cut, polygons):
        assert LinearRing(poly.exterior.coords).is_simple and poly.is_valid and poly.area > 0
        for x, y in e.points:
            assert ext_min[0] - 1e-9 <= x <= ext_max[0] + 1e-9 and ext_min[1] - 1e-9 <= y <= ext_max[1] + 1e-9
    tree = shapely.STRtree(polygons)
    for i, poly in enumerate(polygons):
        if on_boards:
            for j in tree.query(poly, predicate="intersects"):
                assert j == i or poly.intersection(polygons[j]).area <= 1e-9 * poly.area, "two parts overlap"
        else:
            for j in tree.query(poly, predicate="dwithin", distance=10.0):
                assert j == i, "two parts are closer than 10 mm"

    # Each outline carries its label inside it; match outlines to segments by label.
    # a segment's label; a two-piece spar's are lettered with their part (L-S1-1, U-S1-1)
    labels = [t for t in dxf.on("TEXT-LABELS", "TEXT") if re.fullmatch(r"(?:[LU]-)?S\d+-\d+", t.first(1))]
    by_label = {}
    for poly in polygons:
        inside = [t.first(1) for t in labels if poly.contains(shapely.Point(*[c * unit for c in t.anchor]))]
        assert len(inside) == 1, inside
        by_label[inside[0]] = poly
    assert sorted(by_label) == sorted(seg.label for seg in layout.segments)

    cache = SectionCache(spar)
    worst = 0.0
    n = spar.hollow.staves
    for seg in layout.segments:
        poly = by_label[seg.label]
        x0, _, x1, _ = poly.bounds
        assert x1 - x0 == pytest.approx(seg.length, abs=WIDTH_TOLERANCE)
        checks = [(tick.x, tick.z) for tick in seg.ticks]
        checks += [(0.0, min(max(seg.start, 0.0), spar.length)), (seg.length, min(max(seg.end, 0.0), spar.length))]
        for x, z in checks:
            # An end lies on the outline itself: measure a micrometre inside it (the width there differs by less).
            measured = width_across(poly, min(max(x0 + x, x0 + 1e-3), x1 - 1e-3))
            section = cache.at(z)
            expected = [section.widths[seg.stave - 1]]  # this stave's own (an oval's staves differ)
            if spar.hollow.joint.kind == "birdsmouth-flush" and not spar.hollow.two_axis:
                expected.append(2 * section.outer_apothem * math.tan(math.pi / n))
            for w in expected:
                worst = max(worst, abs(measured - w))
                assert measured == pytest.approx(w, abs=WIDTH_TOLERANCE), (seg.label, z)

    # Marks on their own layers: a line per mark of the piece's template (the model the full-size PDF draws
    # too) and the figures of its labelled marks, a feather line per scarf end.
    marks = [m for seg in layout.segments for m in layout.template_of[seg.label].marks]
    assert len(dxf.on("MARK-STATIONS", "LINE")) == len(marks)
    assert len(dxf.on("TEXT-STATIONS", "TEXT")) == (0 if on_boards else sum(m.labelled for m in marks))
    assert len(dxf.on("MARK-SCARFS", "LINE")) == sum(len(seg.feather_lines) for seg in layout.segments)
    assert len(dxf.on("MARK-NOTCH-EDGE")) == len(dxf.on("MARK-SQUARE-EDGE")) == len(layout.segments)
    for line in dxf.on("MARK-SCARFS", "LINE"):
        (ax, ay), (bx, by) = (float(line.first(10)) * unit, float(line.first(20)) * unit), \
            (float(line.first(11)) * unit, float(line.first(21)) * unit)
        assert ax == pytest.approx(bx, abs=1e-9)
        assert any(poly.buffer(1e-6).contains(LineString([(ax, ay), (bx, by)])) for poly in polygons)

    # End views: the finished round as circles, the staves placed round without overlap, the plug N-gons.
    if spar.hollow.two_axis:  # an oval's finished outline drawn as a polyline: as wide and deep as the section
        ovals = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on("END-ROUND", "LWPOLYLINE")]
        wholes = sorted((s.assembled for s in (layout.widest_section, layout.narrowest_section)),
                        key=lambda s: s.fore_aft)
        for oval, whole in zip(sorted(ovals, key=lambda p: p.bounds[2] - p.bounds[0]), wholes):
            assert oval.bounds[2] - oval.bounds[0] == pytest.approx(whole.fore_aft, rel=1e-9)
            assert oval.bounds[3] - oval.bounds[1] == pytest.approx(whole.athwartships, rel=1e-9)
    else:
        circles = sorted(float(c.first(40)) * unit for c in dxf.on("END-ROUND", "CIRCLE"))
        assert circles == pytest.approx(sorted([layout.widest_section.radius, layout.narrowest_section.radius]))
    rings = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on("END-STAVE", "LWPOLYLINE")]
    assert len(rings) == 2 + 2 * n
    assembled = rings[2:2 + n]
    for a in range(n):
        for b in range(a + 1, n):
            assert assembled[a].intersection(assembled[b]).area <= 1e-6 * assembled[a].area
    if spar.hollow.joint.kind in ("birdsmouth-flush", "bevel") and not spar.hollow.two_axis:
        a_o = layout.widest_section.outer_apothem
        ngon = n * a_o**2 * math.tan(math.pi / n)  # regular N-gon of apothem a_o
        assert shapely.union_all(assembled).convex_hull.area == pytest.approx(ngon, rel=1e-6)
        # No voids in these joints: staves and bore fill the glued-up polygon exactly.
        bore = Polygon([(x * unit, y * unit) for x, y in dxf.on("END-BORE", "LWPOLYLINE")[0].points])
        assert sum(p.area for p in assembled) + bore.area == pytest.approx(ngon, rel=1e-6)
    plugs = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on("END-PLUG", "LWPOLYLINE")]
    ends = [end for block in layout.plugs for end in (block.heel, block.head)]
    assert len(plugs) == len(ends)
    for poly, end in zip(plugs, ends):
        assert len(poly.exterior.coords) - 1 == n
        if spar.hollow.two_axis:  # an oval's bore: its flats facing fore-and-aft bound it across the sheet
            assert poly.bounds[2] - poly.bounds[0] == pytest.approx(end.across_flats, rel=1e-9)
        else:
            assert 4 * poly.area / poly.length == pytest.approx(end.across_flats, rel=1e-9)
    # Nothing drawn for the end views or the notes lies on a part.
    cut_area = shapely.union_all(polygons)
    for e in dxf.entities:
        if e.layer.startswith(("END-", "SHEET-")) and e.kind == "LWPOLYLINE":
            assert not cut_area.intersects(Polygon([(x * unit, y * unit) for x, y in e.points]))
    return worst


# Tests ---------------------------------------------------------------------------------------

@pytest.mark.parametrize("sample", [p.name for p in SPAR_SAMPLES])
def test_every_sample_reads_back_whole(sample, tmp_path):
    result = design(load_spar(SAMPLES / sample), layout=True)
    path, dxf = templates_of(result, tmp_path)
    worst = check_templates(result, path, dxf)
    assert worst < WIDTH_TOLERANCE


@pytest.mark.parametrize("sample, insunits, measurement, word", [
    ("daysailer-mast.toml", 1, 0, '"'), ("yawl-mainmast-metric.toml", 4, 1, " mm")])
def test_units_follow_the_spar_file(sample, insunits, measurement, word, tmp_path):
    result = design(load_spar(SAMPLES / sample), layout=True)
    _, dxf = templates_of(result, tmp_path)
    assert int(dxf.header["$INSUNITS"][0][1]) == insunits
    assert int(dxf.header["$MEASUREMENT"][0][1]) == measurement
    # Drawn at 1:1 in that unit: the longest outline spans the longest segment in the file's own numbers.
    longest = max(max(x for x, _ in e.points) - min(x for x, _ in e.points) for e in dxf.on(CUT))
    assert longest * MM_PER[result.spar.units] == pytest.approx(max(s.length for s in result.layout.segments),
                                                                abs=WIDTH_TOLERANCE)
    # Station figures are written in the spar's unit.
    assert all(word in t.first(1) for t in dxf.on("TEXT-STATIONS", "TEXT"))


def random_spar(units: str, length: float, diameter: float, taper: float, staves: int, joint: str, wall: float,
                board: float, edge: str = "square-edge", on_boards: bool = False):
    mm = lambda v: f"{v:.3f} mm"  # noqa: E731
    head = diameter * taper
    data = spar_dict(
        spar={"name": "Random spar", "units": units, "length": mm(length)},
        plan={"wood": "sitka-spruce", "stations": [[0, mm(diameter)], [mm(length), mm(head)]]},
        hollow={"wood": "sitka-spruce", "staves": staves, "joint": joint, "wall": mm(wall * head),
                "planing_allowance": mm(1.5), "end_allowance": mm(50), "taper": edge},
        stock={"thickness": mm(wall * diameter + 2), "widths": [mm(150)], "lengths": [mm(board)],
               "kerf": mm(3), "scarf_ratio": 8, "scarf_stagger": mm(150)},
        output={"mark_spacing": mm(300), "templates_on_boards": on_boards},
    )
    return parse_spar(data, "random.toml")


@settings(max_examples=5, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(units=st.sampled_from(["in", "mm"]), length=st.floats(1500, 5000), diameter=st.floats(60, 140),
       taper=st.floats(0.6, 1.0), staves=st.sampled_from([6, 8, 10, 12]),
       joint=st.sampled_from(["birdsmouth-flush", "birdsmouth-centered", "bevel"]),
       wall=st.floats(0.18, 0.24), board=st.floats(1800, 3000), edge=st.sampled_from(["square-edge", "symmetric"]))
def test_random_spars_read_back_whole(tmp_path, units, length, diameter, taper, staves, joint, wall, board, edge):
    spar = random_spar(units, length, diameter, taper, staves, joint, wall, board, edge)
    try:
        result = design(spar, layout=True)
    except DesignError as exc:  # a centred notch the section model refuses (voids or grooves rounding opens)
        assert joint == "birdsmouth-centered" and exc.key == "hollow.joint", exc.one_line()
        return
    path, dxf = templates_of(result, tmp_path)
    check_templates(result, path, dxf)


def test_build_writes_the_templates_with_the_other_outputs(run, tmp_path):
    out = tmp_path / "out"
    result = run(["build", SAMPLES / "daysailer-mast.toml", "-o", out])
    assert result.exit_code == 0, result.output
    name = output_names("day-sailer-mast")["templates"]
    assert name == "day-sailer-mast-templates.dxf"
    dxf = read_dxf(out / name)
    assert int(dxf.header["$INSUNITS"][0][1]) == 1 and dxf.on(CUT)


def test_a_failing_template_writer_leaves_no_output(tmp_path, monkeypatch):
    result = design(load_spar(SAMPLES / "daysailer-mast.toml"), layout=True)

    class Broken:
        """A template sheet whose writing fails half-way."""

        def saveas(self, path):
            Path(path).write_text("half a file")
            raise RuntimeError("disk full")

    monkeypatch.setattr(dxf_templates, "template_document", lambda design, place=None: Broken())
    with pytest.raises(RuntimeError):
        write_outputs(result, tmp_path)
    assert list(tmp_path.iterdir()) == []


def test_placement_can_be_swapped(tmp_path):
    """The parts' placement is one function: a different one moves the outlines and nothing breaks."""
    result = design(load_spar(SAMPLES / "yawl-mainmast-metric.toml"), layout=True)

    def in_one_column(layout, clearance, gap):
        parts, top = [], 0.0
        for seg in layout.segments:
            below, above = clearance(seg)
            y = top - above - max(y for _, y in seg.outline)
            parts.append(dxf_templates.Part(seg, (0.0, y)))
            top = y + min(y for _, y in seg.outline) - below - gap
        return parts

    path = tmp_path / "column.dxf"
    write_templates(result, path, place=in_one_column)
    dxf = read_dxf(path)
    assert all(min(x for x, _ in e.points) == 0.0 for e in dxf.on(CUT))
    check_templates(result, path, dxf)


# Templates on boards ----------------------------------------------------------------------------

def on_boards(sample: str, tmp_path: Path):
    """A sample spar file with ``output.templates_on_boards = true`` added, laid out."""
    text = (SAMPLES / sample).read_text(encoding="utf-8")
    assert "templates_on_boards" not in text
    path = tmp_path / sample
    path.write_text(text.replace("[output]\n", "[output]\ntemplates_on_boards = true\n"), encoding="utf-8")
    spar = load_spar(path)
    assert spar.output.templates_on_boards
    return design(spar, layout=True)


def check_boards(result, dxf: DxfFile) -> None:
    """Each board of the order (the JSON's cutting plan) drawn at true size on its own layer, its segments
    inside it at their rip and offset; nothing on the cutting layer but the segment outlines."""
    spar = result.spar
    unit = MM_PER[spar.units]
    cutting = json.loads(to_json(result))["stock"]["cutting"]
    assert LAYERS["BOARD-OUTLINE"] and "BOARD-OUTLINE" != CUT and "BOARD-RIPS" != CUT
    outlines = dxf.on("BOARD-OUTLINE")
    assert all(e.kind == "LWPOLYLINE" and e.closed for e in outlines)
    assert len(outlines) == len(cutting)
    boards = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in outlines]
    for i, a in enumerate(boards):
        for b in boards[i + 1:]:
            assert a.intersection(b).area == 0.0
    captions = dxf.on("TEXT-BOARDS", "TEXT")
    by_id = {}
    for poly in boards:
        x0, _, x1, top = poly.bounds
        above = [t.first(1).split(":")[0] for t in captions
                 if abs(t.anchor[0] * unit - x0) < 1e-6 and 0 < t.anchor[1] * unit - top < 25.0]
        assert len(above) == 1, above
        by_id[above[0]] = poly
    assert sorted(by_id) == sorted(b["board"] for b in cutting)

    cut = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on(CUT)]
    # a segment's label; a two-piece spar's are lettered with their part (L-S1-1, U-S1-1)
    labels = [t for t in dxf.on("TEXT-LABELS", "TEXT") if re.fullmatch(r"(?:[LU]-)?S\d+-\d+", t.first(1))]
    segment = {}
    for poly in cut:
        inside = [t.first(1) for t in labels if poly.contains(shapely.Point(*[c * unit for c in t.anchor]))]
        assert len(inside) == 1
        segment[inside[0]] = poly
    placed_labels = []
    for board in cutting:
        poly = by_id[board["board"]]
        x0, y0, x1, top = poly.bounds
        assert x1 - x0 == pytest.approx(board["length_mm"], abs=1e-6)  # true size
        assert top - y0 == pytest.approx(board["width_mm"], abs=1e-6)
        assert poly.area == pytest.approx(board["length_mm"] * board["width_mm"], rel=1e-9)
        for rip in board["rips"]:
            strip = box(x0, top - rip["offset_mm"] - rip["width_mm"], x1, top - rip["offset_mm"])
            for piece in rip["pieces"]:
                part = segment[piece["label"]]
                assert poly.buffer(1e-6).contains(part), (board["board"], piece["label"])
                assert strip.buffer(1e-6).contains(part), (board["board"], piece["label"])
                assert part.bounds[0] == pytest.approx(x0 + piece["offset_mm"], abs=1e-6)
                assert part.bounds[2] - part.bounds[0] == pytest.approx(piece["length_mm"], abs=WIDTH_TOLERANCE)
                placed_labels.append(piece["label"])
    assert sorted(placed_labels) == sorted(segment) == sorted(seg.label for seg in result.layout.segments)


@pytest.mark.parametrize("sample", ["daysailer-mast.toml", "yawl-mainmast-metric.toml"])
def test_templates_on_boards(sample, tmp_path):
    result = on_boards(sample, tmp_path)
    path, dxf = templates_of(result, tmp_path)
    check_templates(result, path, dxf, on_boards=True)
    check_boards(result, dxf)


@settings(max_examples=4, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(units=st.sampled_from(["in", "mm"]), length=st.floats(1500, 5000), diameter=st.floats(60, 140),
       staves=st.sampled_from([6, 8, 12]), joint=st.sampled_from(["birdsmouth-flush", "bevel"]),
       board=st.floats(1800, 3000), edge=st.sampled_from(["square-edge", "symmetric"]))
def test_random_spars_on_boards(tmp_path, units, length, diameter, staves, joint, board, edge):
    result = design(random_spar(units, length, diameter, 0.7, staves, joint, 0.2, board, edge, on_boards=True),
                    layout=True)
    path, dxf = templates_of(result, tmp_path)
    check_templates(result, path, dxf, on_boards=True)
    check_boards(result, dxf)


def test_build_draws_the_boards_when_the_file_asks(run, tmp_path):
    """Off by default; on, ``build`` itself writes the boards."""
    plain_out, boards_out = tmp_path / "rows", tmp_path / "boards"
    assert run(["build", SAMPLES / "daysailer-mast.toml", "-o", plain_out]).exit_code == 0
    assert not read_dxf(plain_out / "day-sailer-mast-templates.dxf").on("BOARD-OUTLINE")
    on_boards("daysailer-mast.toml", tmp_path)
    result = run(["build", tmp_path / "daysailer-mast.toml", "-o", boards_out])
    assert result.exit_code == 0, result.output
    dxf = read_dxf(boards_out / "day-sailer-mast-templates.dxf")
    assert len(dxf.on("BOARD-OUTLINE")) == len(design(load_spar(tmp_path / "daysailer-mast.toml"),
                                                      layout=True).layout.lumber.boards)


# The sheet in its own unit, the cut layer apart, clean outlines, a cut-only sheet ----------------------------


@pytest.mark.parametrize("name", SPAR_SAMPLES)
def test_cut_only_sheet_and_clean_outlines(tmp_path, name):
    """The cut-only sheet holds the templates' cut outlines and nothing else, at the same coordinates; no outline
    has a vertex on a straight run (a station on a straight stretch is no corner for a router's CAM)."""
    from stavegen.render.dxf_templates import write_cut_sheet

    result = design(load_spar(SAMPLES / name), layout=True)
    _, full = templates_of(result, tmp_path)
    write_cut_sheet(result, tmp_path / "cut.dxf")
    cut = read_dxf(tmp_path / "cut.dxf")
    assert {e.layer for e in cut.entities} == {CUT} and {e.kind for e in cut.entities} == {"LWPOLYLINE"}
    assert sorted(e.points for e in cut.entities) == sorted(e.points for e in full.on(CUT))
    assert len(cut.entities) == len(result.layout.segments)
    for e in cut.entities:
        pts = e.points
        for i in range(len(pts)):
            (ax, ay), (bx, by), (cx, cy) = pts[i - 1], pts[i], pts[(i + 1) % len(pts)]
            cross = (bx - ax) * (cy - by) - (by - ay) * (cx - bx)
            assert abs(cross) > 1e-9 * math.hypot(bx - ax, by - ay) * math.hypot(cx - bx, cy - by)


@pytest.mark.parametrize("name", SPAR_SAMPLES)
def test_header_sizes_in_the_sheets_unit_and_the_cut_layer_apart(tmp_path, name):
    result = design(load_spar(SAMPLES / name), layout=True)
    _, dxf = templates_of(result, tmp_path)
    k = MM_PER[result.spar.units]
    text = float(dxf.header["$TEXTSIZE"][0][1])
    assert text == pytest.approx((5 / 32 if k == 25.4 else 4.0), rel=1e-9)  # a readable height in the sheet's unit
    lo = [float(v) for _, v in dxf.header["$LIMMIN"]]
    hi = [float(v) for _, v in dxf.header["$LIMMAX"]]
    xs = [x for e in dxf.on(CUT) for x, _ in e.points]
    assert lo[0] <= min(xs) and max(xs) <= hi[0]  # limits hold the drawing, in its own unit
    assert hi[0] - lo[0] < 1.5 * (max(xs) - min(xs)) + 1000 / k
    colours = {name: int(layer.first(62)) for name, layer in dxf.layers.items() if name in LAYERS}
    assert all(c != colours[CUT] for n, c in colours.items() if n != CUT)
