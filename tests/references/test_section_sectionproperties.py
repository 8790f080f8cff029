"""Section properties against an independent finite-element section analysis.

Reference: sectionproperties (independent general-purpose section analysis
library, test extra only). The finished section goes to it as a plain polygon:
the staves' union (shapely, snapped to a 1e-6 mm grid so touching faces
merge) clipped by the round drawn as a 2880-sided polygon. The faceted round
understates area by about (2π/2880)²/6 ≈ 8e-7 of the disc, and I by about
twice that, well inside the 1e-4 asked.
"""

import pytest
import shapely
from shapely.geometry import Point, Polygon

from stavegen.model.spar import Joint
from stavegen.section.properties import bore_ring, evaluate_section
from stavegen.section.staves import placed

sp_geometry = pytest.importorskip("sectionproperties.pre.geometry")
sp_section = pytest.importorskip("sectionproperties.analysis.section")


def faceted_round(radius, quad_segs=720):
    """The round as a polygon of 4 × quad_segs sides (its area short of the disc's by about (π/(2·quad_segs))²/6)."""
    return Point(0, 0).buffer(radius, quad_segs=quad_segs)


def staves_union(sec):
    return shapely.union_all([placed(sec.stave_polygon(), sec.staves, k) for k in range(sec.staves)],
                             grid_size=1e-6)


def fe_properties(polygon):
    geometry = sp_geometry.Geometry(polygon)
    geometry.create_mesh(mesh_sizes=[0])
    section = sp_section.Section(geometry)
    section.calculate_geometric_properties()
    ixx, iyy, _ = section.get_ic()
    return section.get_area(), ixx, iyy


@pytest.mark.parametrize("kind", ["birdsmouth-flush", "birdsmouth-centered", "bevel"])
@pytest.mark.parametrize("n", [6, 8, 12, 16])
def test_against_sectionproperties(kind, n):
    sec = evaluate_section(n, Joint(kind), 50.0, 12.0, 1.5)
    finished = shapely.set_precision(faceted_round(sec.radius, 240).intersection(staves_union(sec)), 1e-7)
    assert finished.geom_type == "Polygon"
    area, ixx, iyy = fe_properties(finished)
    assert sec.area == pytest.approx(area, rel=1e-4)
    assert sec.inertia == pytest.approx(ixx, rel=1e-4)
    assert sec.inertia == pytest.approx(iyy, rel=1e-4)


@pytest.mark.parametrize("n", [12, 16])
def test_voids_measured_with_shapely(n):
    """disc − bore − staves, measured on shapely polygons, matches the exact void area."""
    sec = evaluate_section(n, Joint("birdsmouth-centered"), 50.0, 12.0, 1.5)
    voids = faceted_round(sec.radius).difference(Polygon(bore_ring(n, sec.inner_apothem))).difference(
        staves_union(sec))
    assert sec.void_area > 1.0
    assert voids.area == pytest.approx(sec.void_area, rel=1e-3)


@pytest.mark.parametrize("n", [6, 8, 12, 16])
def test_flush_has_no_voids_measured_with_shapely(n):
    sec = evaluate_section(n, Joint("birdsmouth-flush"), 50.0, 12.0, 1.5)
    voids = faceted_round(sec.radius).difference(Polygon(bore_ring(n, sec.inner_apothem))).difference(
        staves_union(sec))
    assert voids.area < 1e-6 * sec.area
    assert sec.void_area == 0.0
