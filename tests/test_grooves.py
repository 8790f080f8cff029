"""Grooves for strips let into the staves' outer faces: drawn on the templates, and cut as the model counts them.

References, none of them stavegen's drawing or region code:
- the DXF read back with the independent group-code reader of tests/test_dxf.py (not ezdxf), the full-size PDF
  with pdfplumber;
- a geometric replay of the shop operation: a straight bit is a slab as wide as the bit, run along the stave's
  outer face at the offset the template's groove lines give (measured from the notched edge in the DXF) and at
  the depth printed beside the groove; cut from the stave as dressed (its polygon from the section model, shapely),
  the tape laid in the groove's bottom, the spar rounded (a disc). The tape so laid must be the strip region the
  checks count (stations/evaluate.py), and the wood left the staves' region, at several stations of every piece;
- the depth's rounding: up onto the 0.1 mm grid (the tape lies lower, rounding never cuts it), so the printed
  groove is at most one grid step deeper than the model's.
"""

from __future__ import annotations

import math
import re

import pdfplumber
import pytest
import shapely
import tomlkit
from shapely.affinity import rotate
from shapely.geometry import LineString, Point, Polygon, box

from conftest import SAMPLES
from test_dxf import MM_PER, read_dxf

from stavegen.model.loader import parse_spar
from stavegen.pipeline import design
from stavegen.render.dxf_templates import CUT, write_templates
from stavegen.render.pdf_fullsize import pages_of, sheet, write_fullsize
from stavegen.section.oval import normal_angle
from stavegen.section.regions import STAVE, STRIP
from stavegen.stations.evaluate import SectionCache, plug_at_station, regions_at

GRID = 0.1  # mm: the metric builder's grid (docs/conventions.md)
PT_PER_MM = 72 / 25.4  # 1 in = 72 pt = 25.4 mm, exactly


def grooved_spar(joint: str, taper: str, oval: bool = False):
    """The sheathed sample with its carbon let into grooves instead of the inner faces, the wall given (and made
    oval: 12 staves, its athwartships dimensions 0.8 of the fore-and-aft, for ``oval``)."""
    doc = tomlkit.parse((SAMPLES / "sheathed-mast-metric.toml").read_text(encoding="utf-8"))
    doc["hollow"]["wall"] = 18
    doc["hollow"]["joint"] = joint
    doc["hollow"]["taper"] = taper
    doc["hollow"]["strip"][0]["place"] = "groove"
    data = tomlkit.loads(tomlkit.dumps(doc)).unwrap()
    if oval:
        for table in ("plan", "hollow"):
            data[table]["shape"] = "oval"
            data[table]["stations"] = [[z, d, round(0.8 * d, 1)] for z, d in data[table]["stations"]]
        data["hollow"]["staves"] = 12
        data["hollow"]["strip"][0]["width"] = 6
    return parse_spar(data, "grooved.toml")


def _across(poly, x: float) -> tuple[float, float]:
    """(lowest, highest) y of a geometry along the vertical line at x."""
    ys = [y for _, y in poly.intersection(LineString([(x, -1e6), (x, 1e6)])).coords] if not isinstance(
        poly, Polygon) else list(poly.intersection(LineString([(x, -1e6), (x, 1e6)])).bounds[1::2])
    return min(ys), max(ys)


@pytest.fixture(scope="module", params=[("birdsmouth-flush", "square-edge"), ("birdsmouth-centered", "square-edge"),
                                        ("bevel", "symmetric"), ("birdsmouth-flush", "square-edge", True)])
def built(request, tmp_path_factory):
    folder = tmp_path_factory.mktemp("grooves")
    d = design(grooved_spar(*request.param), layout=True)
    write_templates(d, folder / "t.dxf")
    write_fullsize(d, folder / "t.pdf")
    with pdfplumber.open(folder / "t.pdf") as pdf:
        text = "\n".join(page.extract_text() or "" for page in pdf.pages)
        curves = [[(c["x0"], c["x1"], c["top"], c["bottom"]) for c in page.curves + page.lines] for page in pdf.pages]
    return d, read_dxf(folder / "t.dxf"), text, curves


def _to_stave(geometry, turn: float):
    """A geometry in the axis frame seen in the frame of the stave whose normal is turned ``turn`` from +y."""
    return rotate(geometry, -turn, origin=(0, 0), use_radians=True)


def test_the_cut_groove_is_the_strip_the_checks_count(built):
    d, dxf, _, _ = built
    spar, layout = d.spar, d.layout
    unit = MM_PER[spar.units]
    strip = spar.hollow.strips[0]
    cache = SectionCache(spar)
    outlines = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on(CUT, "LWPOLYLINE")]
    labels = [t for t in dxf.on("TEXT-LABELS", "TEXT") if re.fullmatch(r"S\d+-\d+", t.first(1))]
    edges = [LineString([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on("MARK-GROOVES", "LWPOLYLINE")]
    notes = [t for t in dxf.on("TEXT-LABELS", "TEXT") if t.first(1).startswith("GROOVE")]
    assert notes
    replayed = 0
    for poly in outlines:
        label = next(t.first(1) for t in labels if poly.contains(Point(*[c * unit for c in t.anchor])))
        seg = layout.template_of[label].segment
        plan = layout.plan_for(seg.stave)
        kind = layout.kinds[seg.stave - 1] if layout.kinds else 0
        x0 = poly.bounds[0]
        mine = [e for e in edges if poly.buffer(1e-6).contains(e)]
        lo, hi = max(seg.start, strip.start or 0.0), min(seg.end, strip.end)
        if hi <= lo:
            assert not mine, label
            continue
        assert len(mine) == 2, label  # the groove's two edge lines
        note = next(t.first(1) for t in notes if poly.contains(Point(*[c * unit for c in t.anchor])))
        width, shallow, deep = re.search(r"([\d.]+) mm wide, ([\d.]+) mm (?:to ([\d.]+) mm )?deep", note).groups()
        printed_width, shallow = float(width), float(shallow)
        deep = float(deep) if deep else shallow
        # The stations the checks count the strip at (strictly inside its range, or a spar end it reaches).
        stations = [st.z for st in plan.stations if lo <= st.z <= hi and strip.covers(st.z, spar.length)]
        for z in {stations[0], stations[len(stations) // 2], stations[-1]}:
            x = x0 + plan.s_at(z) - plan.s_at(seg.start)
            notch = _across(poly, x)[0]  # the notched (or first bevelled) edge: y = its lowest point
            near, far = sorted(_across(e, x)[0] for e in mine)
            near, far = near - notch, far - notch
            assert far - near == pytest.approx(strip.width, abs=1e-6)
            assert printed_width >= strip.width - 1e-9 and printed_width - strip.width < GRID

            # The stave as dressed, in its own frame (x along its face, y outward), and the rounded wood.
            whole = cache.at(z)
            section = whole.kind_section(kind)
            stave = Polygon(section.stave_outline)
            face, edge = stave.bounds[3], stave.bounds[0]  # outer face; the notched edge (the stave's least x)
            regions = regions_at(spar, whole, plug_at_station(spar, z), z)
            strips = next(r for r in regions.regions if r.kind == STRIP).geometry
            if whole.shape == "round":
                turn = 0.0
                outside = Point(0, 0).buffer(whole.radius, quad_segs=180)
                counted = next(p for p in strips.geoms if p.centroid.y > 0 and abs(p.centroid.x) < 1e-6 * whole.radius)
            else:  # stave ``kind`` of the oval: its normal turned from +y, and the wood's ellipse
                turn = normal_angle(whole.staves, kind) - math.pi / 2
                a, b = whole.semi_axes
                outside = Polygon([(a * math.cos(2 * math.pi * i / 4096), b * math.sin(2 * math.pi * i / 4096))
                                   for i in range(4096)])
                counted = strips.geoms[kind]
            counted, outside = _to_stave(counted, turn), _to_stave(outside, turn)
            wood = _to_stave(regions.of_kind(STAVE)[0].geometry, turn)

            def replay(depth: float) -> tuple[Polygon, Polygon]:
                slab = box(edge + near, face - depth, edge + far, face + 1.0)  # the bit's sweep
                tape = box(edge + near, face - depth, edge + far, face - depth + strip.thickness)
                return slab, tape

            t = layout.template_of[label]
            exact = t.grooves[0].at(plan.s_at(z) - plan.s_at(seg.start))[1]  # the template's own depth there
            slab, tape = replay(exact)
            assert tape.symmetric_difference(counted).area <= 1e-6 * counted.area, (label, z)
            # The wood the checks count: the stave rounded, less the groove, and nothing inside the groove.
            left = stave.intersection(outside).difference(slab)
            assert wood.intersection(slab.intersection(outside)).area <= 1e-5 * tape.area
            # (the oval's staves are drawn clipped by a 720-sided polygon, here 4096: 1e-4 covers the difference)
            assert left.difference(wood).area <= (1e-6 if whole.shape == "round" else 1e-4) * left.area
            # At the printed depth (rounded up): the tape lies lower by less than one grid step, never higher.
            assert shallow - GRID - 1e-9 < exact <= deep + 1e-9, (label, z)
            if shallow == deep:
                _, printed = replay(deep)
                assert exact - 1e-9 <= deep < exact + GRID + 1e-9, (label, z)
                assert printed.bounds[3] <= counted.bounds[3] + 1e-9
                assert printed.symmetric_difference(counted).area <= 2 * strip.width * GRID
            replayed += 1
    assert replayed >= 3


def test_the_groove_on_every_piece_and_in_both_renderers(built):
    d, dxf, text, _ = built
    layout = d.layout
    strip = d.spar.hollow.strips[0]
    notes = {t.first(1) for t in dxf.on("TEXT-LABELS", "TEXT") if t.first(1).startswith("GROOVE")}
    flat = " ".join(text.split())
    for note in notes:  # the full-size PDF carries the DXF's words
        assert " ".join(note.split()) in flat
    # The groove ends where the strip ends (4000 mm): one end line across it on the piece that holds it, and
    # one at the heel (its strip starts at the heel, inside the heel's end allowance).
    ends = dxf.on("MARK-GROOVES", "LINE")
    pieces = len(dxf.on(CUT, "LWPOLYLINE"))  # every piece is drawn, alike ones too
    assert pieces == len(layout.segments)
    assert len(ends) == sum(len(g.ends) * len(t.segments) for t in layout.templates for g in t.grooves)
    assert ends and all(abs(float(e.first(10)) - float(e.first(11))) < 1e-9 for e in ends)  # square across
    for e in ends:
        assert abs(float(e.first(21)) - float(e.first(20))) == pytest.approx(strip.width, abs=1e-6)
    # The shop step gives the bit's width and the depth as figures and says how the groove is centred.
    (step,) = [s for s in layout.machining.steps if s.action == "grooves"]
    names = {f.name: f for f in step.figures}
    assert names["width"].value == strip.width and names["width"].kind == "at-least"
    assert names["deep"].kind == "groove-depth"
    assert "middle" in step.text and "batten" in step.text


def test_the_fullsize_pdf_draws_both_edges_at_one_to_one(built):
    """On the first page showing a piece, pdfplumber finds the groove's two edge lines: each as long as the groove
    on the piece and lying the groove's width apart, in points (1 mm = 72/25.4 pt)."""
    d, _, _, curves = built
    s = sheet(d)
    checked = 0
    for place in s.placements:
        for groove in place.template.grooves:
            page = curves[pages_of(s, place)[0].page - 1]
            long = (groove.end - groove.start) * PT_PER_MM
            (lower, upper) = groove.edges
            rise = [(max(y for _, y in e) - min(y for _, y in e)) * PT_PER_MM for e in (lower, upper)]
            found = [c for c in page if abs((c[1] - c[0]) - long) < 0.05 and
                     any(abs((c[3] - c[2]) - r) < 0.05 for r in rise)]
            assert len(found) >= 2, place.template.labels
            tops = sorted(c[2] for c in found)
            width = groove.width * PT_PER_MM
            assert any(abs((b - a) - width) < 0.05 for a in tops for b in tops), place.template.labels
            checked += 1
    assert checked
