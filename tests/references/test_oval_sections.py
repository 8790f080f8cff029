"""Oval and rectangular sections in both directions, against outside references.

References named beside each check:
- Roark's Formulas for Stress and Strain, properties of plane sections (Table A.1): solid ellipse
  A = π a b, I = π a³ b / 4 about the minor axis and π a b³ / 4 about the major; solid rectangle
  I = b d³ / 12; semi-ellipse centroid 4a / (3π) from its straight edge.
- sectionproperties (independent finite-element section analysis, test extra only): the finished oval
  birdsmouth and bevel sections and the rounded rectangle, given to it as plain polygons. The ellipse is
  drawn as a 2880-sided inscribed polygon, which understates area by about (2π/2880)²/6 ≈ 8e-7 and I by
  about twice that, well inside the 1e-4 asked.
- Geometry (shapely): the staves of an oval close with no overlap and no gap, as real polygons.
"""

import math

import pytest
import shapely
from shapely.geometry import Polygon, box

from stavegen.model.spar import Joint
from stavegen.section.ellipse import (ellipse_moments, ring_in_ellipse_moments, rounded_rectangle_half_moment,
                                      rounded_rectangle_moments)
from stavegen.section.oval import evaluate_oval, kind_of, normal_angle, support
from stavegen.section.properties import evaluate_section

sp_geometry = pytest.importorskip("sectionproperties.pre.geometry")
sp_section = pytest.importorskip("sectionproperties.analysis.section")


def faceted_ellipse(a, b, sides=960):
    """The ellipse as a polygon of ``sides`` corners on it: its area short by about (2π/sides)²/6 of the
    whole (7e-6 at 960), far inside the tolerances below."""
    return Polygon([(a * math.cos(2 * math.pi * i / sides), b * math.sin(2 * math.pi * i / sides))
                    for i in range(sides)])


def fe_properties(polygon, plastic=False):
    geometry = sp_geometry.Geometry(shapely.set_precision(polygon, 1e-7))
    geometry.create_mesh(mesh_sizes=[0])
    section = sp_section.Section(geometry)
    section.calculate_geometric_properties()
    ixx, iyy, _ = section.get_ic()
    out = {"area": section.get_area(), "ixx": ixx, "iyy": iyy}
    if plastic:
        section.calculate_plastic_properties()
        out["sxx"], out["syy"] = section.get_s()
    return out


# --- Roark's closed forms -------------------------------------------------------------------------------------

@pytest.mark.parametrize("a, b", [(60.0, 40.0), (40.0, 60.0), (50.0, 50.0), (75.0, 22.5)])
def test_ellipse_clipping_gives_roark_ellipse(a, b):
    """A square holding the whole ellipse, clipped by it: the ellipse itself (Roark Table A.1)."""
    square = [(-2 * a, -2 * b), (2 * a, -2 * b), (2 * a, 2 * b), (-2 * a, 2 * b)]
    m = ring_in_ellipse_moments(square, a, b)
    assert m.area == pytest.approx(math.pi * a * b, rel=1e-12)
    assert m.iyy == pytest.approx(math.pi * a**3 * b / 4, rel=1e-12)  # about the athwartships axis
    assert m.ixx == pytest.approx(math.pi * a * b**3 / 4, rel=1e-12)
    assert abs(m.qx) < 1e-9 * a * a * b and abs(m.ixy) < 1e-9 * a**2 * b**2


@pytest.mark.parametrize("a, b", [(60.0, 40.0), (30.0, 45.0)])
def test_half_ellipse_first_moment_from_its_centroid(a, b):
    """Semi-ellipse x ≥ 0: area π a b / 2, centroid 4a/(3π) from the straight edge (Roark), so ∫x dA = 2a²b/3;
    that is the plastic modulus 4a²b/3 of the whole ellipse by halves."""
    half = [(0.0, -2 * b), (2 * a, -2 * b), (2 * a, 2 * b), (0.0, 2 * b)]
    m = ring_in_ellipse_moments(half, a, b)
    assert m.area == pytest.approx(math.pi * a * b / 2, rel=1e-12)
    assert m.qx / m.area == pytest.approx(4 * a / (3 * math.pi), rel=1e-12)


@pytest.mark.parametrize("w, d", [(100.0, 60.0), (40.0, 90.0)])
def test_rectangle_against_roark(w, d):
    m = rounded_rectangle_moments(w, d, 0.0)
    assert m.area == pytest.approx(w * d, rel=1e-12)
    assert m.ixx == pytest.approx(w * d**3 / 12, rel=1e-12)
    assert m.iyy == pytest.approx(d * w**3 / 12, rel=1e-12)
    assert rounded_rectangle_half_moment(w, d, 0.0) == pytest.approx(d * w * w / 4, rel=1e-12)  # Z = b h² / 4


@pytest.mark.parametrize("w, d, r", [(100.0, 60.0, 12.0), (50.0, 80.0, 24.0)])
def test_rounded_rectangle_against_sectionproperties(w, d, r):
    inner = box(-w / 2 + r, -d / 2 + r, w / 2 - r, d / 2 - r)
    shape = inner.buffer(r, quad_segs=360)
    fe = fe_properties(shape, plastic=True)
    m = rounded_rectangle_moments(w, d, r)
    assert m.area == pytest.approx(fe["area"], rel=1e-5)
    assert m.ixx == pytest.approx(fe["ixx"], rel=1e-5)
    assert m.iyy == pytest.approx(fe["iyy"], rel=1e-5)
    # plastic modulus bending fore-and-aft (in x) is sectionproperties' S about the y axis
    assert rounded_rectangle_half_moment(w, d, r) == pytest.approx(fe["syy"], rel=1e-4)


# --- the oval birdsmouth and bevel sections ------------------------------------------------------------------

@pytest.mark.parametrize("kind", ["birdsmouth-flush", "bevel", "birdsmouth-centered"])
@pytest.mark.parametrize("n, fa, at", [(8, 120.0, 80.0), (12, 110.0, 85.0), (16, 90.0, 140.0)])
def test_oval_against_sectionproperties(kind, n, fa, at):
    sec = evaluate_oval(n, Joint(kind), fa, at, 14.0, 1.5)
    staves = shapely.union_all([Polygon(r) for r in sec.placed_rings()], grid_size=1e-6)
    finished = faceted_ellipse(fa / 2, at / 2).intersection(staves)
    assert finished.geom_type == "Polygon"
    fe = fe_properties(finished)
    assert sec.area == pytest.approx(fe["area"], rel=1e-4)
    assert sec.inertia_athwartships == pytest.approx(fe["ixx"], rel=1e-4)  # ∫y² dA
    assert sec.inertia_fore_aft == pytest.approx(fe["iyy"], rel=1e-4)  # ∫x² dA
    assert sec.inertia_fore_aft != pytest.approx(sec.inertia_athwartships, rel=1e-2)


@pytest.mark.parametrize("n", [8, 12])
def test_oval_plastic_moduli_against_sectionproperties(n):
    sec = evaluate_oval(n, Joint("birdsmouth-flush"), 120.0, 80.0, 14.0, 1.5)
    staves = shapely.union_all([Polygon(r) for r in sec.placed_rings()], grid_size=1e-6)
    fe = fe_properties(faceted_ellipse(60.0, 40.0).intersection(staves), plastic=True)
    assert sec.plastic_moduli_athwartships[0] == pytest.approx(fe["sxx"], rel=2e-4)
    assert sec.plastic_moduli_fore_aft[0] == pytest.approx(fe["syy"], rel=2e-4)


@pytest.mark.parametrize("kind", ["birdsmouth-flush", "bevel"])
@pytest.mark.parametrize("n, fa, at", [(8, 120.0, 80.0), (12, 100.0, 70.0), (14, 64.0, 96.0)])
def test_plugged_oval_is_the_solid_ellipse(kind, n, fa, at):
    """Wall and bore together (a plug of the staves' wood) are the solid ellipse: Roark's figures, exactly."""
    sec = evaluate_oval(n, Joint(kind), fa, at, 12.0, 1.5)
    a, b = fa / 2, at / 2
    whole = sec.wall + sec.bore
    assert sec.void_area == 0.0
    assert whole.area == pytest.approx(math.pi * a * b, rel=1e-12)
    assert whole.iyy == pytest.approx(math.pi * a**3 * b / 4, rel=1e-12)
    assert whole.ixx == pytest.approx(math.pi * a * b**3 / 4, rel=1e-12)
    assert ellipse_moments(a, b).iyy == pytest.approx(math.pi * a**3 * b / 4, rel=1e-15)


@pytest.mark.parametrize("kind", ["birdsmouth-flush", "bevel", "birdsmouth-centered"])
@pytest.mark.parametrize("n, fa, at", [(8, 120.0, 80.0), (12, 110.0, 85.0), (16, 90.0, 140.0), (10, 100.0, 60.0)])
def test_oval_staves_close_with_no_overlap_and_no_gap(kind, n, fa, at):
    """Real geometry: neighbours touch along their joint and overlap nowhere; their union is one ring whose hole is
    the bore (plus the centred notch's voids, which the section reports); the outer faces lie on the tangents to
    the ellipse moved out by the planing allowance."""
    allowance = 1.5
    sec = evaluate_oval(n, Joint(kind), fa, at, 14.0, allowance)
    polys = [Polygon(r) for r in sec.placed_rings()]
    least = min(p.area for p in polys)
    for k in range(n):
        for j in range(k + 1, n):
            assert polys[k].intersection(polys[j]).area <= 1e-9 * least
        neighbour = polys[(k + 1) % n]
        assert polys[k].distance(neighbour) < 1e-9
        assert polys[k].boundary.intersection(neighbour.boundary.buffer(1e-7)).length > 0.2 * sec.thickness
    ring = shapely.union_all(polys, grid_size=1e-6)
    assert ring.geom_type == "Polygon"
    holes = [Polygon(h) for h in ring.interiors]
    around_axis = [h for h in holes if h.contains(shapely.Point(0.0, 0.0))]
    assert len(around_axis) == 1
    hole = around_axis[0]
    bore = Polygon(sec.bore_points())
    assert bore.difference(hole).area < 1e-6 * bore.area  # the staves leave the bore open
    if kind != "birdsmouth-centered":
        assert len(holes) == 1
        assert hole.symmetric_difference(bore).area < 1e-6 * bore.area
        # the outside is the polygon of the outer faces' lines: every stave's outer face on its line
        outer = shapely.Polygon(ring.exterior)
        tangents = [(math.cos(normal_angle(n, k)), math.sin(normal_angle(n, k))) for k in range(n)]
        for x, y in outer.exterior.coords:
            reach = max(nx * x + ny * y - support(fa / 2, at / 2, normal_angle(n, k)) - allowance
                        for k, (nx, ny) in enumerate(tangents))
            assert abs(reach) < 1e-6
    # widths pair off by symmetry about both axes
    for k in range(n):
        assert sec.widths[k] == pytest.approx(sec.widths[kind_of(n, k)], abs=1e-9)
    assert sum(kind.count for kind in sec.kinds) == n


@pytest.mark.parametrize("kind", ["birdsmouth-flush", "bevel", "birdsmouth-centered"])
@pytest.mark.parametrize("n", [8, 12])
def test_an_oval_as_wide_as_deep_is_the_round(kind, n):
    """The oval path at equal dimensions gives the round path's section (itself held to Roark and
    sectionproperties) to roundoff."""
    oval = evaluate_oval(n, Joint(kind), 100.0, 100.0, 12.0, 1.5)
    round_ = evaluate_section(n, Joint(kind), 50.0, 12.0, 1.5)
    assert oval.inertia_fore_aft == pytest.approx(round_.inertia, rel=1e-10)
    assert oval.inertia_athwartships == pytest.approx(round_.inertia, rel=1e-10)
    assert oval.area == pytest.approx(round_.area, rel=1e-10)
    assert all(w == pytest.approx(round_.stave_width, rel=1e-12) for w in oval.widths)
    assert oval.void_area == pytest.approx(round_.void_area, rel=1e-9, abs=1e-9)


def test_flush_oval_widths_are_the_sides_of_the_outer_polygon():
    """Flush birdsmouth: the outer faces make the polygon and each stave spans one side of it (its width before
    the notch is that side), so the staves differ as the sides do: widest where the oval is flattest."""
    n, fa, at, p = 12, 120.0, 80.0, 1.5
    sec = evaluate_oval(n, Joint("birdsmouth-flush"), fa, at, 14.0, p)
    lines = [(math.cos(normal_angle(n, k)), math.sin(normal_angle(n, k)),
              support(fa / 2, at / 2, normal_angle(n, k)) + p) for k in range(n)]

    def meet(l1, l2):
        (a1, b1, c1), (a2, b2, c2) = l1, l2
        det = a1 * b2 - a2 * b1
        return ((c1 * b2 - c2 * b1) / det, (a1 * c2 - a2 * c1) / det)

    corners = [meet(lines[k], lines[(k + 1) % n]) for k in range(n)]
    sides = [math.dist(corners[k - 1], corners[k]) for k in range(n)]
    assert [pytest.approx(s, rel=1e-9) for s in sides] == list(sec.widths)
    assert max(sec.widths) == sec.widths[0]  # stave 1 faces athwartships, on the flat side of a deep oval
