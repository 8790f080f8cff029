"""Sheathing layers and reinforcing strips on an oval spar, against independent computations.

References:
- sectionproperties (independent finite-element section analysis), each region its own geometry and material
  (its elastic modulus), E·I about both centroidal axes from ``get_eic``. The geometries are built here, not
  taken from stavegen: the wood's ellipse as a 4096-sided polygon, each stave's polygon clipped by it, each
  layer as shapely's buffer (a parallel offset, round joins) of the ellipse, and the strips' rectangles less
  from the staves (for a groove, everything over the strip too).
- The round spar in the limit of equal axes: an oval whose two dimensions are equal is the round spar with
  the same layers and strips (the round's own regions: exact rings and rectangles), to roundoff.
- Geometry the model promises, checked on the polygons: a grooved strip's outer corners on the wood's ellipse,
  an inner-face strip's top on the stave's inner face, every strip on its stave's middle (half-way between the
  corners the stave shares with its neighbours).
"""

import math

import pytest
import shapely
from shapely.geometry import Polygon

from conftest import spar_dict
from stavegen.checks.ratios import ATHWARTSHIPS, FORE_AFT
from stavegen.model.loader import parse_spar
from stavegen.section.oval import normal_angle
from stavegen.section.regions import LAYER, PLUG, STAVE, STRIP
from stavegen.stations.evaluate import SectionCache, oval_regions_at, plug_at_station, regions_at

sp_geometry = pytest.importorskip("sectionproperties.pre.geometry")
sp_pre = pytest.importorskip("sectionproperties.pre.pre")
sp_section = pytest.importorskip("sectionproperties.analysis.section")

Z = 1500.0  # mm: a station inside every layer and strip


def oval_spar(fore_aft=110.0, athwartships=84.0, staves=12, joint="birdsmouth-flush", plug=False,
              place="groove", shape="oval"):
    hollow = {"wood": "sitka-spruce", "staves": staves, "joint": joint, "wall": 16, "planing_allowance": 1.5,
              "layer": [{"material": "glass-6oz", "plies": 2}, {"material": "glass-10oz", "plies": 1}],
              "strip": [{"material": "carbon-ud", "width": 5, "plies": 2, "place": place}]}
    if shape == "oval":
        hollow.update(shape="oval", stations=[[0, fore_aft, athwartships], [3000, fore_aft, athwartships]])
        plan = {"wood": "sitka-spruce", "shape": "oval", "stations": [[0, fore_aft, athwartships],
                                                                     [3000, fore_aft, athwartships]]}
    else:
        hollow.update(stations=[[0, fore_aft], [3000, fore_aft]])
        plan = {"wood": "sitka-spruce", "stations": [[0, fore_aft], [3000, fore_aft]]}
    if plug:
        hollow["plug"] = [{"from": 0, "to": 3000}]
    return parse_spar(spar_dict(hollow=hollow, plan=plan), "t.toml")


def ellipse(a: float, b: float, n: int = 4096) -> Polygon:
    return Polygon([(a * math.cos(2 * math.pi * i / n), b * math.sin(2 * math.pi * i / n)) for i in range(n)])


def fe_eic(parts) -> tuple[float, float]:
    """E·I about both centroidal axes from sectionproperties: ``parts`` is [(geometry, modulus), ...]."""
    geometries = []
    for k, (shape, modulus) in enumerate(parts):
        shape = shapely.set_precision(shape, 1e-6)  # shared edges on one grid, for the mesher
        material = sp_pre.Material(name=f"m{k}", elastic_modulus=modulus, poissons_ratio=0.3, yield_strength=1.0,
                                   density=1.0, color="grey")
        for part in getattr(shape, "geoms", [shape]):
            if part.area > 1e-9:
                geometries.append(sp_geometry.Geometry(part, material=material))
    compound = sp_geometry.CompoundGeometry(geometries)
    compound.create_mesh(mesh_sizes=[0], coarse=True)
    section = sp_section.Section(compound)
    section.calculate_geometric_properties()
    eixx, eiyy, _ = section.get_eic()
    return eixx, eiyy


@pytest.mark.parametrize("place, plug, joint", [("groove", False, "birdsmouth-flush"), ("inner-face", True, "bevel")])
def test_oval_with_layers_and_strips_against_sectionproperties(place, plug, joint):
    spar = oval_spar(place=place, plug=plug, joint=joint)
    section = SectionCache(spar).at(Z)
    a, b = section.semi_axes
    assert 2 * a == pytest.approx(110 - 2 * spar.hollow.sheath(Z, spar.length))  # the wood inside the layers
    plug_here = plug_at_station(spar, Z)
    athwart = oval_regions_at(spar, section, plug_here, ATHWARTSHIPS, Z)
    fore = oval_regions_at(spar, section, plug_here, FORE_AFT, Z)
    assert [r.kind for r in athwart.regions] == [STAVE] + ([PLUG] if plug else []) + [STRIP, LAYER, LAYER]

    # The strips where the model promises them.
    strip = athwart.of_kind(STRIP)[0].geometry
    rings = [list(p.exterior.coords)[:-1] for p in strip.geoms]
    assert len(rings) == section.staves
    for k, ring in enumerate(rings):
        theta = normal_angle(section.staves, k)
        n, u = (math.cos(theta), math.sin(theta)), (math.sin(theta), -math.cos(theta))
        along = sorted(x * u[0] + y * u[1] for x, y in ring)
        out = sorted(x * n[0] + y * n[1] for x, y in ring)
        outer = sorted(x * u[0] + y * u[1] for x, y in section.outlines[k] if
                       abs(x * n[0] + y * n[1] - section.outer_apothems[k]) < 1e-9)
        # the stave's side of the glued-up polygon: its outer face's corners for a flush birdsmouth or a bevel
        assert (along[0] + along[-1]) / 2 == pytest.approx((outer[0] + outer[-1]) / 2, abs=1e-9)
        if place == "groove":
            tops = [(x, y) for x, y in ring if abs(x * n[0] + y * n[1] - out[-1]) < 1e-9]
            assert len(tops) == 2 and min((x / a) ** 2 + (y / b) ** 2 for x, y in tops) <= 1 + 1e-12
            assert max((x / a) ** 2 + (y / b) ** 2 for x, y in tops) == pytest.approx(1, abs=1e-12)
        else:
            assert out[-1] == pytest.approx(section.frames[k].inner, abs=1e-9)

    # Independent geometry: the wood's ellipse, the staves clipped by it, layers as shapely's offsets.
    wood = ellipse(a, b)
    rect = [Polygon(r) for r in rings]
    staves = shapely.union_all([Polygon(o).intersection(wood) for o in section.outlines], grid_size=1e-7)
    if place == "groove":
        reach = a + b
        for k, r in enumerate(rect):  # the groove: the strip and everything over it, out past the oval
            theta = normal_angle(section.staves, k)
            n = (math.cos(theta), math.sin(theta))
            staves = staves.difference(shapely.union_all([r, shapely.affinity.translate(r, reach * n[0], reach * n[1])
                                                          ]).convex_hull)
    parts = [(staves, athwart.regions[0].modulus)]
    if plug:
        bore = Polygon(section.bore_outline)
        for r in rect:
            bore = bore.difference(r)
        parts.append((bore, athwart.regions[1].modulus))
    parts.append((shapely.MultiPolygon(rect), athwart.of_kind(STRIP)[0].modulus))
    inner = wood
    offset = 0.0
    for layer_region, layer in zip(athwart.of_kind(LAYER), spar.hollow.layers):
        offset += layer.thickness
        outer = wood.buffer(offset, quad_segs=256)
        parts.append((outer.difference(inner), layer_region.modulus))
        inner = outer
    eixx, eiyy = fe_eic(parts)
    # Both polygons of the ellipse are inscribed in it (4096 sides): I low by about 1e-6 of the whole.
    assert athwart.ei == pytest.approx(eixx, rel=5e-5)
    assert fore.ei == pytest.approx(eiyy, rel=5e-5)
    # Each layer: its own integrals against its offset polygon's (shapely's buffer).
    for region, (shape, _) in zip(athwart.of_kind(LAYER), parts[-2:]):
        assert region.area == pytest.approx(shape.area, rel=2e-5)


@pytest.mark.parametrize("place", ["groove", "inner-face"])
def test_an_oval_of_equal_axes_is_the_round_spar(place):
    oval = oval_spar(100.0, 100.0, staves=8, place=place, plug=True)
    round_ = oval_spar(100.0, 100.0, staves=8, place=place, plug=True, shape="round")
    o_sec, r_sec = SectionCache(oval).at(Z), SectionCache(round_).at(Z)
    assert o_sec.semi_axes[0] == pytest.approx(r_sec.radius, rel=1e-12)
    plug = plug_at_station(round_, Z)
    r = regions_at(round_, r_sec, plug, Z)
    for way in (ATHWARTSHIPS, FORE_AFT):
        o = oval_regions_at(oval, o_sec, plug, way, Z)
        assert [x.kind for x in o.regions] == [x.kind for x in r.regions]
        for mine, theirs in zip(o.regions, r.regions):
            assert mine.area == pytest.approx(theirs.area, rel=1e-9), mine.label
            assert o.ei_of(mine) == pytest.approx(r.ei_of(theirs), rel=1e-9), mine.label
        assert o.ei == pytest.approx(r.ei, rel=1e-9)
        assert o.mass_per_length == pytest.approx(r.mass_per_length, rel=1e-9)
