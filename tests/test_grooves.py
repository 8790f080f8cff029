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
from stavegen.render.pdf_fullsize import write_fullsize
from stavegen.section.regions import STAVE, STRIP
from stavegen.stations.evaluate import SectionCache, plug_at_station, regions_at

GRID = 0.1  # mm: the metric builder's grid (docs/conventions.md)


def grooved_spar(joint: str, taper: str):
    """The sheathed sample with its carbon let into grooves instead of the inner faces, the wall given."""
    doc = tomlkit.parse((SAMPLES / "sheathed-mast-metric.toml").read_text(encoding="utf-8"))
    doc["hollow"]["wall"] = 18
    doc["hollow"]["joint"] = joint
    doc["hollow"]["taper"] = taper
    doc["hollow"]["strip"][0]["place"] = "groove"
    return parse_spar(tomlkit.loads(tomlkit.dumps(doc)).unwrap(), "grooved.toml")


def _across(poly, x: float) -> tuple[float, float]:
    """(lowest, highest) y of a geometry along the vertical line at x."""
    ys = [y for _, y in poly.intersection(LineString([(x, -1e6), (x, 1e6)])).coords] if not isinstance(
        poly, Polygon) else list(poly.intersection(LineString([(x, -1e6), (x, 1e6)])).bounds[1::2])
    return min(ys), max(ys)


@pytest.fixture(scope="module", params=[("birdsmouth-flush", "square-edge"), ("birdsmouth-centered", "square-edge"),
                                        ("bevel", "symmetric")])
def built(request, tmp_path_factory):
    folder = tmp_path_factory.mktemp("grooves")
    d = design(grooved_spar(*request.param), layout=True)
    write_templates(d, folder / "t.dxf")
    write_fullsize(d, folder / "t.pdf")
    with pdfplumber.open(folder / "t.pdf") as pdf:
        text = "\n".join(page.extract_text() or "" for page in pdf.pages)
    return d, read_dxf(folder / "t.dxf"), text


def test_the_cut_groove_is_the_strip_the_checks_count(built):
    d, dxf, _ = built
    spar, layout = d.spar, d.layout
    unit = MM_PER[spar.units]
    strip = spar.hollow.strips[0]
    cache = SectionCache(spar)
    outlines = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on(CUT, "LWPOLYLINE")]
    labels = [t for t in dxf.on("TEXT-LABELS", "TEXT") if re.fullmatch(r"S\d+-\d+", t.first(1))]
    edges = [LineString([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on("MARK-GROOVES", "LWPOLYLINE")]
    notes = [t.first(1) for t in dxf.on("TEXT-LABELS", "TEXT") if t.first(1).startswith("GROOVE")]
    assert notes and len(set(notes)) == 1
    (note,) = set(notes)
    printed_width, printed_depth = (float(v) for v in re.search(r"([\d.]+) mm wide, ([\d.]+) mm deep", note).groups())
    replayed = 0
    for poly in outlines:
        label = next(t.first(1) for t in labels if poly.contains(Point(*[c * unit for c in t.anchor])))
        seg = layout.template_of[label].segment
        plan = layout.plan_for(seg.stave)
        x0 = poly.bounds[0]
        mine = [e for e in edges if poly.buffer(1e-6).contains(e)]
        lo, hi = max(seg.start, strip.start or 0.0), min(seg.end, strip.end)
        if hi <= lo:
            assert not mine, label
            continue
        assert len(mine) == 2, label  # the groove's two edge lines
        # The stations the checks count the strip at (strictly inside its range, or a spar end it reaches).
        stations = [st.z for st in plan.stations if lo <= st.z <= hi and strip.covers(st.z, spar.length)]
        for z in {stations[0], stations[len(stations) // 2], stations[-1]}:
            x = x0 + plan.s_at(z) - plan.s_at(seg.start)
            notch = _across(poly, x)[0]  # the notched (or first bevelled) edge: y = its lowest point
            near, far = sorted(_across(e, x)[0] for e in mine)
            near, far = near - notch, far - notch
            assert far - near == pytest.approx(strip.width, abs=1e-6)
            assert printed_width >= strip.width - 1e-9 and printed_width - strip.width < GRID

            # The stave as dressed, in its section frame (stave 0: x across, y outward), and the round.
            section = cache.at(z)
            stave = Polygon(section.stave_outline)
            face, edge = stave.bounds[3], stave.bounds[0]  # outer face; the notched edge (the stave's least x)
            disc = Point(0, 0).buffer(section.radius, quad_segs=180)
            regions = regions_at(spar, section, plug_at_station(spar, z), z)
            counted = next(r for r in regions.regions if r.kind == STRIP).geometry
            counted = next(p for p in counted.geoms if p.centroid.y > 0 and abs(p.centroid.x) < 1e-6 * section.radius)
            wood = regions.of_kind(STAVE)[0].geometry

            def replay(depth: float) -> tuple[Polygon, Polygon]:
                slab = box(edge + near, face - depth, edge + far, face + 1.0)  # the bit's sweep
                tape = box(edge + near, face - depth, edge + far, face - depth + strip.thickness)
                return slab, tape

            t = layout.template_of[label]
            exact = t.grooves[0].at(plan.s_at(z) - plan.s_at(seg.start))[1]  # the template's own depth there
            slab, tape = replay(exact)
            assert tape.symmetric_difference(counted).area <= 1e-6 * counted.area, (label, z)
            # The wood the checks count: the stave rounded, less the groove, and nothing inside the groove.
            left = stave.intersection(disc).difference(slab)
            assert wood.intersection(slab.intersection(disc)).area <= 1e-6 * tape.area
            assert left.difference(wood).area <= 1e-6 * left.area
            # At the printed depth (rounded up): the tape lies lower by less than one grid step, never higher.
            assert exact - 1e-9 <= printed_depth < exact + GRID + 1e-9, (label, z)
            _, printed = replay(printed_depth)
            assert printed.bounds[3] <= counted.bounds[3] + 1e-9
            assert printed.symmetric_difference(counted).area <= 2 * strip.width * GRID
            replayed += 1
    assert replayed >= 3


def test_the_groove_on_every_piece_and_in_both_renderers(built):
    d, dxf, text = built
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
