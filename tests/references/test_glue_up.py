"""Glue-up replayed: staves cut as the shop papers say, nested as birdsmouth staves nest, close the section.

A tapered wall is the case that goes wrong in the shop: the notch is set once
for the whole stave, so a stave whose thickness followed the wall would meet
a V cut for another thickness and leave a glue gap. Here every stave is cut
independently of stavegen's machining code (the blade-slab replay of
test_shop_replay): its segment's blank (JSON ``machining.segments``), the
table-saw passes with that segment's fences, the square edge taken to the
station's width, and, as the order of operations allows, the outer face
planed down to the wall. Then the staves are nested the way a birdsmouth
nests, which is physics, not stavegen: the next stave's inner corner sits in
this one's apex, its inner face on the V's inner face, its square edge on the
V's outer face. N such steps turn the staves once round the spar's axis (the
fixed point of the step). Checked at stations along the spar:

- every glue face is covered: the next stave's square edge lies on the V's
  outer face over the V's whole length, with no gap over 0.2 mm (common
  practice: a joint closes to a glue line of a few tenths at most);
- the bore the nested staves enclose is the model's (inner apothem to 1e-6 mm);
- the finished round cut from the nested staves has the model's area and
  second moment (to the faceting of the test's round), so nothing is missing
  inside it: no void, no groove.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
import shapely
from shapely.affinity import affine_transform
from shapely.geometry import LineString, Point, Polygon, box  # noqa: F401

from stavegen.model.loader import load_spar
from stavegen.pipeline import design
from stavegen.render.json_doc import to_json

from conftest import SAMPLES, SPAR_SAMPLES, make_spar
from test_shop_replay import saw

GLUE_GAP = 0.2  # mm


def stave_at(doc: dict, seg_label: str, width: float, wall: float | None) -> Polygon:
    """Stave ``seg_label`` cut from its blank, tapered to ``width``, its outer face planed to ``wall`` if given."""
    m = doc["machining"]
    setup = next(s for s in m["segments"] if s["label"] == seg_label)
    passes = []
    for p, fence in zip(m["widest"]["table_saw"], setup["fence_distance_mm"]):
        passes.append(dict(p, fence_distance_mm=fence))
    blank = (setup["blank_width_mm"], setup["thickness_mm"])
    piece = saw(blank, passes).intersection(box(-1.0, -1.0, width, blank[1] + 1.0))
    if wall is not None:
        piece = piece.intersection(box(-1.0, -1.0, blank[0] + 1.0, wall))
    return piece.simplify(1e-9)  # the slabs leave slivers of vertices a nanometre apart


def apex_of(stave: Polygon) -> tuple[float, float]:
    """The V's apex: the one reflex corner of the notched stave."""
    ring = list(stave.simplify(1e-7).exterior.coords)[:-1]
    if not Polygon(ring).exterior.is_ccw:
        ring.reverse()
    reflex = []
    for i, p in enumerate(ring):
        a, b = ring[i - 1], ring[(i + 1) % len(ring)]
        cross = (p[0] - a[0]) * (b[1] - p[1]) - (p[1] - a[1]) * (b[0] - p[0])
        if cross < -1e-9:
            reflex.append(p)
    assert len(reflex) == 1, reflex
    return reflex[0]


def nesting_step(stave: Polygon, staves: int, width: float):
    """The rigid step that seats the next stave: its inner square corner (width, 0) into the apex, turned by φ."""
    phi = 2 * math.pi / staves
    c, s = math.cos(phi), math.sin(phi)
    ax, ay = apex_of(stave)
    # p ↦ R(φ)·(p − (width, 0)) + apex
    tx = ax - (c * width)
    ty = ay - (s * width)
    return (c, -s, s, c, tx, ty)


def fixed_point(step) -> tuple[float, float]:
    a, b, d, e, tx, ty = step
    m = np.array([[1 - a, -b], [-d, 1 - e]])
    return tuple(np.linalg.solve(m, [tx, ty]))


def moments(poly, centre) -> tuple[float, float]:
    """Area and polar second moment about ``centre`` of a (multi)polygon (signed ring sums, holes taken off)."""
    from shapely.geometry.polygon import orient

    from stavegen.section.integrals import ring_moments

    area = polar = 0.0
    for g in getattr(poly, "geoms", [poly]):
        g = orient(g, 1.0)
        for r in [g.exterior] + list(g.interiors):
            m = ring_moments([(x - centre[0], y - centre[1]) for x, y in r.coords][:-1])
            area += m.area
            polar += m.polar
    return area, polar


def check_glue_up(d, doc, z: float, planed: bool) -> None:
    spar = d.spar
    n = spar.hollow.staves
    plan = d.layout.plan
    seg = next(s for s in d.layout.staves[0] if s.start <= z <= s.end)
    width = plan.width_at(z)
    wall = float(spar.hollow.wall.at(z)) if planed else None
    a = stave_at(doc, seg.label, width, wall)
    step = nesting_step(a, n, width)
    centre = fixed_point(step)
    ring = [a]
    for _ in range(n - 1):
        ring.append(affine_transform(ring[-1], step))
    # Glue faces: the next stave's square edge along this one's outer V face, over its whole length.
    b = ring[1]
    apex = apex_of(a)
    outer_face = [p for p in a.exterior.coords if abs(p[0]) < 1e-9 and p[1] > apex[1]]
    v_end = outer_face[0] if outer_face else min(((x, y) for x, y in a.exterior.coords if y > apex[1] + 1e-9),
                                                 key=lambda p: p[0])
    face = LineString([apex, v_end])
    for t in np.linspace(0, 1, 21):
        q = face.interpolate(t, normalized=True)
        assert b.exterior.distance(q) <= GLUE_GAP, f"glue gap at {z:.0f} mm"
    # No two staves overlap.
    for i in range(n):
        for j in range(i + 1, n):
            # Each shrunk by a micron: GEOS's overlay can misread two polygons that share an edge exactly.
            assert ring[i].buffer(-1e-6).intersection(ring[j].buffer(-1e-6)).area <= 1e-6 * a.area
    # The bore: the inner faces at the model's inner apothem from the fixed point.
    from stavegen.stations.evaluate import SectionCache

    model = SectionCache(spar).at(z)
    inner_apothem = abs(centre[1] - 0.0)  # stave 0's inner face is the line y = 0
    assert inner_apothem == pytest.approx(model.inner_apothem, abs=1e-6)
    # The finished round from the nested staves.
    disc = Point(centre).buffer(model.radius, 4096)
    wood = disc.intersection(shapely.union_all(ring, grid_size=1e-7))
    area, polar = moments(wood, centre)
    assert area == pytest.approx(model.area, rel=2e-5)  # the disc is a 16,384-gon here
    assert polar / 2 == pytest.approx(model.inertia, rel=5e-5)


def _compose(t1, t2):
    """The affine step t1 ∘ t2 (shapely's (a, b, d, e, xoff, yoff) form): t2 first."""
    a1, b1, d1, e1, x1, y1 = t1
    a2, b2, d2, e2, x2, y2 = t2
    return (a1 * a2 + b1 * d2, a1 * b2 + b1 * e2, d1 * a2 + e1 * d2, d1 * b2 + e1 * e2,
            a1 * x2 + b1 * y2 + x1, d1 * x2 + e1 * y2 + y1)


def check_oval_glue_up(d, doc, z: float, planed: bool) -> None:
    """Staves of unequal widths round an oval, each cut by the replay to its own width, nested one into the
    next's V as birdsmouth staves nest: after N steps the chain comes back onto the first stave (the widths
    close the section), every glue face is covered, no two staves overlap, and the oval cut from the nested
    staves round the model's axis has the model's area and second moments both ways."""
    spar = d.spar
    n = spar.hollow.staves
    lay = d.layout
    wall = float(spar.hollow.wall.at(z)) if planed else None
    cut = []
    for k in range(1, n + 1):
        seg = next(s for s in lay.staves[k - 1] if s.start <= z <= s.end)
        cut.append(stave_at(doc, seg.label, lay.plan_for(k).width_at(z), wall))
    widths = [lay.plan_for(k).width_at(z) for k in range(1, n + 1)]
    placement = [(1.0, 0.0, 0.0, 1.0, 0.0, 0.0)]
    for k in range(n):
        step = nesting_step(cut[k], n, widths[(k + 1) % n])
        placement.append(_compose(placement[k], step))
    back = placement[n]  # stave 1 seated into the last stave's V: the chain closes onto where it started
    assert back[:4] == pytest.approx((1.0, 0.0, 0.0, 1.0), abs=1e-9)
    assert back[4:] == pytest.approx((0.0, 0.0), abs=1e-6)
    ring = [affine_transform(cut[k], placement[k]) for k in range(n)]
    for k in range(n):
        b = ring[(k + 1) % n]
        apex = apex_of(cut[k])
        local = [p for p in cut[k].exterior.coords if abs(p[0]) < 1e-9 and p[1] > apex[1]]
        v_end = local[0] if local else min(((x, y) for x, y in cut[k].exterior.coords if y > apex[1] + 1e-9),
                                           key=lambda p: p[0])
        face = affine_transform(LineString([apex, v_end]), placement[k])
        for t in np.linspace(0, 1, 11):
            assert b.exterior.distance(face.interpolate(t, normalized=True)) <= GLUE_GAP, f"glue gap at {z:.0f}"
    for i in range(n):
        for j in range(i + 1, n):
            assert ring[i].buffer(-1e-6).intersection(ring[j].buffer(-1e-6)).area <= 1e-6 * ring[i].area
    from stavegen.stations.evaluate import SectionCache

    model = SectionCache(spar).at(z)
    frame = model.frames[0]
    centre = (-frame.x_notch_edge, -frame.inner)  # the axis in stave 1's blank frame (notched edge x = 0, inner y = 0)
    a, b = model.semi_axes
    oval = Polygon([(centre[0] + a * math.cos(2 * math.pi * i / 16384), centre[1] + b * math.sin(2 * math.pi * i / 16384))
                    for i in range(16384)])
    wood = oval.intersection(shapely.union_all(ring, grid_size=1e-7))
    area = wood.area
    ixx = iyy = 0.0
    from shapely.geometry.polygon import orient

    from stavegen.section.integrals import ring_moments

    for g in getattr(wood, "geoms", [wood]):
        g = orient(g, 1.0)
        for r in [g.exterior] + list(g.interiors):
            m = ring_moments([(x - centre[0], y - centre[1]) for x, y in r.coords][:-1])
            ixx += m.ixx
            iyy += m.iyy
    assert area == pytest.approx(model.area, rel=2e-5)
    assert iyy == pytest.approx(model.inertia_fore_aft, rel=5e-5)
    assert ixx == pytest.approx(model.inertia_athwartships, rel=5e-5)


def stations_to_check(d) -> list[float]:
    spar = d.spar
    zs = {0.0, spar.length, d.layout.machining.widest.z, d.layout.machining.narrowest.z}
    zs |= {z for z in spar.hollow.wall.z}
    zs |= {spar.length * k / 7 for k in range(1, 7)}
    return sorted(zs)


@pytest.mark.parametrize("planed", [False, True], ids=["as cut", "outer face planed to the wall"])
@pytest.mark.parametrize("path", SPAR_SAMPLES, ids=lambda p: p.stem)
def test_samples_glue_up(path, planed):
    spar = load_spar(path)
    if not spar.hollow.joint.is_birdsmouth:
        pytest.skip("plain bevel staves")
    d = design(spar, layout=True)
    doc = json.loads(to_json(d))
    for z in stations_to_check(d):
        (check_oval_glue_up if spar.hollow.two_axis else check_glue_up)(d, doc, z, planed)


@pytest.mark.parametrize("staves", [6, 8, 10, 12, 16])
def test_tapered_wall_glue_up(staves):
    """A wall tapering from 22 to 12 mm, the notch set once: every station closes without a gap."""
    spar = make_spar(
        spar={"length": 3000},
        plan={"stations": [[0, 110], [1200, 120], [3000, 70]]},
        hollow={"staves": staves, "wall": [[0, 22], [1500, 18], [3000, 12]], "planing_allowance": 1.5,
                "min_strength_ratio": 0.1},
        stock={"thickness": 25, "widths": [100, 150], "lengths": [2400, 3600], "kerf": 3.0},
        output={"mark_spacing": 250})
    d = design(spar, layout=True)
    assert d.layout.machining.method == "one setting"
    assert not d.layout.machining.notch_varies
    doc = json.loads(to_json(d))
    for planed in (False, True):
        for z in stations_to_check(d):
            check_glue_up(d, doc, z, planed)


def test_a_notch_set_for_the_thick_end_gaps_at_the_thin_end():
    """The naive shop: staves thickness-tapered, the notch set at the heel. The replay finds the gap."""
    spar = make_spar(
        spar={"length": 3000},
        plan={"stations": [[0, 110], [3000, 80]]},
        hollow={"staves": 8, "wall": [[0, 22], [3000, 14]], "planing_allowance": 1.5, "min_strength_ratio": 0.1,
                "notch_cut": "follow-wall"},
        stock={"thickness": 25, "widths": [100, 150], "lengths": [3600], "kerf": 3.0},
        output={"mark_spacing": 500})
    d = design(spar, layout=True)
    assert d.layout.machining.notch_varies
    assert d.layout.machining.widest.settings.saw == ()  # nothing fixed cuts it: no saw settings printed
    doc = json.loads(to_json(d))
    assert any("CNC" in s["text"] for s in doc["machining"]["steps"])
    # Cut the heel's V (flush at 22 mm) into a head-end stave 14 mm thick: the neighbour cannot seat.
    from stavegen.layout.machining import Blank, cutter_settings
    from stavegen.stations.evaluate import SectionCache

    cache = SectionCache(d.spar)
    heel, head = cache.at(0.0), cache.at(3000.0)
    heel_cut = cutter_settings(heel, 3.0, Blank(heel.stave_width + 2, heel.thickness))
    thin = cutter_settings(head, 3.0, Blank(head.stave_width + 2, head.thickness), plan=heel_cut.saw)
    passes = [dict(makes=p.makes, on_table=str(p.on_table), on_fence=str(p.on_fence), tilt_deg=p.tilt,
                   lean=str(p.lean), fence_distance_mm=q.fence_distance if q.follows_blank_width else p.fence_distance,
                   depth_along_blade_mm=p.depth_along_blade, kerf_mm=p.kerf)
              for p, q in zip(heel_cut.saw, thin.saw)]
    try:
        stave = saw((head.stave_width + 2, head.thickness), passes)
    except AssertionError:
        return  # the heel's settings do not even cut the thin stave cleanly
    stave = stave.intersection(box(-1, -1, head.stave_width, head.thickness + 1))
    from test_shop_replay import model_stave

    assert stave.symmetric_difference(model_stave(head)).area > 0.01 * model_stave(head).area
