"""The hollow spar's finished sections along its length.

At each position: the finished diameter (linear between the file's
stations), the wall there, and the exact section for the stave outer
apothem a_o = R + planing allowance. Positions mm from the heel.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import partial

from ..model.spar import Plug, Profile, Spar, Strip
from ..section.properties import Section, evaluate_section
from ..errors import DesignError
from ..section.integrals import Moments, disc_moments
from ..section.regions import LAYER, PLUG, STAVE, STRIP, Region, RegionSection, isotropic, section_of
from ..units import Way, format_length, system
from .grid import MERGE_TOLERANCE, StationMark, station_marks


@dataclass(frozen=True)
class Station:
    """One evaluated position: diameters and wall (mm), the plug there if any, and the section."""

    z: float
    reasons: tuple[str, ...]
    plan_diameter: float
    diameter: float
    wall: float
    plug: Plug | None
    section: Section
    plan_athwartships: float | None = None
    """The plan's athwartships dimension (mm), for a plan that is not round; ``plan_diameter`` is then fore-and-aft."""
    athwartships: float | None = None
    """The hollow spar's athwartships dimension (mm), when it is oval; ``diameter`` is then fore-and-aft."""
    regions: RegionSection | None = None
    """The section's material regions (staves, plug, layers, strips): :func:`regions_at`, made by
    :func:`evaluate_stations`; None where a caller left it to :func:`regions_of`."""

    @property
    def fore_aft(self) -> float:
        return self.diameter

    @property
    def athwart(self) -> float:
        return self.athwartships if self.athwartships is not None else self.diameter

    @property
    def plan_athwart(self) -> float:
        return self.plan_athwartships if self.plan_athwartships is not None else self.plan_diameter


def _oval_stave_shape(section, grooved: tuple = ()) -> object:
    """An oval's finished staves as shapely polygons: each clipped by the oval drawn as a 720-sided polygon
    (drawing and outside measurement only, the figures are exact), less the grooves (strip and the wood over it)."""
    import shapely
    from shapely.geometry import Polygon

    oval = Polygon(section.finished_points(720))
    cuts = [Polygon(r) for made in grooved for r in (*made.rings, *made.covers)]
    pieces = []
    for ring in section.placed_rings():
        piece = Polygon(ring).intersection(oval)
        for cut in cuts:
            piece = piece.difference(cut)
        pieces += [p for p in getattr(piece, "geoms", [piece]) if not p.is_empty and p.geom_type == "Polygon"]
    return shapely.MultiPolygon(pieces)


def _oval_bore_shape(section, strips: tuple = ()) -> object:
    from shapely.geometry import Polygon

    bore = Polygon(section.bore_points())
    for made in strips:
        for ring in made.rings:
            bore = bore.difference(Polygon(ring))
    return bore


def _turned(m, across: bool):
    """Moments as they are, or with x and y exchanged (``across``): the region bending the other way."""
    from ..section.integrals import Moments

    return Moments(m.area, m.qy, m.qx, m.iyy, m.ixx, m.ixy) if across else m


def oval_regions_at(spar: Spar, section, plug: Plug | None, direction: str = "athwartships",
                    z: float | None = None) -> RegionSection:
    """The material regions of an oval section for bending in ``direction`` ("fore_aft" or "athwartships").

    A RegionSection bends about its horizontal axis (∫y² dA): as drawn, that is bending athwartships; for
    fore-and-aft bending the integrals are turned a quarter (x and y exchanged). Each region's ``reach`` is its
    farthest fibre across that axis (the oval's half-dimension for the staves, the bore's for a plug) and its
    ``plastic`` the plastic modulus that way; the geometry is the oval's as drawn (the staves' and the plug's only
    for bending athwartships, the layers' and strips' both ways, for drawing). ``section`` is the wood's
    (rounded to the finished oval less the layers at ``z``); the strips in every stave and the layers over the
    wood that cover ``z`` are counted (:mod:`stavegen.section.oval_sheath`); ``z`` None: none.
    """
    from ..section.oval_sheath import OvalLayer, groove_cover_abs_moment, groove_cover_moments, oval_strip

    h = spar.hollow
    wood = h.wood
    across = direction == "fore_aft"
    a, b = section.semi_axes
    z_wall, z_bore = section.plastic_moduli_fore_aft if across else section.plastic_moduli_athwartships
    bore_reach = max(abs(x if across else y) for x, y in section.bore_points())
    wall, bore = section.wall, section.bore
    strip_regions, grooved, in_bore = [], [], []
    for strip in (h.strips_at(z, spar.length) if z is not None else ()):
        made = oval_strip(section, strip.width, strip.thickness, strip.place, where(spar, z), spar.units)
        ring = made.moments
        if strip.place == "groove":
            cover = groove_cover_moments(made, a, b)
            wall = wall - ring - cover
            z_wall -= made.abs_moment(across) + groove_cover_abs_moment(made, a, b, across)
            grooved.append(made)
        else:
            bore = bore - ring
            z_bore -= made.abs_moment(across)
            in_bore.append(made)
        strip_regions.append(Region(STRIP, strip.material, _turned(ring, across), made.reach(across),
                                    strip.material.moe, shape=made.shape, pieces=section.staves,
                                    label=f"strip {h.strips.index(strip) + 1}"))
    regions = [Region(STAVE, wood, _turned(wall, across), a if across else b,
                      h.lamination_factor * wood.moe, plastic=z_wall,
                      shape=None if across else partial(_oval_stave_shape, section, tuple(grooved)),
                      pieces=section.staves, label="staves")]
    if plug is not None:
        regions.append(Region(PLUG, plug.wood, _turned(bore, across), bore_reach, plug.wood.moe,
                              plastic=z_bore, shape=None if across else partial(_oval_bore_shape, section,
                                                                                   tuple(in_bore)),
                              label="plug"))
    regions += strip_regions
    inner = 0.0
    for k, layer in enumerate(h.layers):
        if z is None or not layer.covers(z, spar.length):
            continue
        made = OvalLayer(a, b, inner, inner + layer.thickness)
        regions.append(Region(LAYER, layer.material, _turned(made.moments, across), made.reach(across),
                              layer.material.moe, shape=made.shape, label=f"layer {k + 1}"))
        inner += layer.thickness
    return section_of(regions, wood.moe)


def _stave_shape(section, grooves: tuple[tuple[float, float, float], ...] = ()) -> object:
    """The finished staves as one shapely polygon (touching faces merged on a 1e-6 mm grid), clipped by the
    round drawn as a 720-sided polygon: for drawing and measuring, the figures being exact."""
    import shapely
    from shapely.geometry import Point, Polygon

    from ..section.staves import placed_ring

    disc = Point(0.0, 0.0).buffer(section.radius, quad_segs=180)
    ring = placed_ring(Polygon(section.stave_outline), section.staves, range(section.staves))
    staves = shapely.intersection(shapely.union_all(ring, grid_size=1e-6), disc, grid_size=1e-6)
    for width, bottom, top in grooves:  # the strips let into grooves: (width, bottom, top) each
        staves = shapely.difference(staves, _strip_shape(section.staves, width, bottom, top), grid_size=1e-6)
    return staves


def _bore_shape(section, strips: tuple[tuple[float, float, float], ...] = ()) -> object:
    """The bore (a plug fills it), less the strips laid on the staves' inner faces ((width, bottom, top) each)."""
    from shapely.geometry import Polygon

    from ..section.properties import bore_ring

    import shapely

    bore = Polygon(bore_ring(section.staves, section.inner_apothem))
    for width, bottom, top in strips:
        bore = shapely.difference(bore, _strip_shape(section.staves, width, bottom, top), grid_size=1e-6)
    return bore.simplify(0) if strips else bore


def _annulus_shape(inner: float, outer: float) -> object:
    from shapely.geometry import Point

    return Point(0.0, 0.0).buffer(outer, quad_segs=180).difference(Point(0.0, 0.0).buffer(inner, quad_segs=180))


def _strip_shape(staves: int, width: float, bottom: float, top: float) -> object:
    import shapely
    from shapely.geometry import box

    from ..section.staves import placed_ring

    return shapely.MultiPolygon(list(placed_ring(box(-width / 2, bottom, width / 2, top), staves, range(staves))))


def _rectangle_ring(staves: int, width: float, bottom: float, top: float) -> Moments:
    """N rectangles [−w/2, w/2] × [bottom, top], one on each stave's axis, turned by 2π/N each: exact, isotropic
    (Roark, rectangle: I = w h³/12 about its own axis; here integrated about the spar's axis)."""
    h = top - bottom
    ixx = width * (top**3 - bottom**3) / 3
    iyy = h * width**3 / 12
    half = staves * (ixx + iyy) / 2
    return Moments(staves * width * h, 0.0, 0.0, half, half, 0.0)


def _groove_cover(staves: int, radius: float, width: float, top: float) -> Moments:
    """What a groove takes out over its strip, in every stave: [−w/2, w/2] × [top, ∞) inside the round of
    ``radius`` (the sliver between the strip's top and the round, cut away with the groove), exact for the
    polygon clipped by the disc, turned by 2π/N (isotropic, as :func:`_rectangle_ring`)."""
    from ..section.integrals import polygon_in_disc_moments

    w = width / 2
    one = polygon_in_disc_moments([[(-w, top), (w, top), (w, radius + 1.0), (-w, radius + 1.0)]], radius)
    half = staves * one.polar / 2
    return Moments(staves * one.area, 0.0, 0.0, half, half, 0.0)


def cover_centre(radius: float, width: float, top: float) -> float:
    """Roughly where the sliver over a grooved strip lies from the axis (mm): between the strip's top and the
    round, for the plastic modulus (a point at its centroid, as the strips are taken)."""
    return (top + radius) / 2


def _ring_abs_y(staves: int, area: float, centre: float) -> float:
    """∫|y| dA of N small pieces of ``area`` at ``centre`` mm from the axis on each stave's axis (the diameter
    through stave 0's middle, as the wall's plastic modulus is taken): the pieces as points at their centroids."""
    return sum(area * abs(centre * math.cos(2 * math.pi * k / staves)) for k in range(staves))


def strip_span(strip: Strip, staves: int, radius: float, inner_apothem: float, at: str = "",
               units: str = "mm") -> tuple[float, float]:
    """Where a strip lies across its stave (mm from the axis along the stave's middle): (bottom, top).

    On the inner face: from a_i − t to a_i, in the bore. In a groove: its outer corners on the finished round
    of the wood, √(R² − (w/2)²), down by its thickness. Raises DesignError where it does not fit.
    """
    tan = math.tan(math.pi / staves)
    show = lambda mm: format_length(mm, units)  # noqa: E731
    where_ = f" at {at}" if at else ""
    if strip.place == "groove":
        if strip.width / 2 >= radius:
            raise DesignError(f"a strip {show(strip.width)} wide is wider than the spar{where_}", "hollow.strip")
        top = math.sqrt(radius**2 - (strip.width / 2) ** 2)
        bottom = top - strip.thickness
        if bottom <= inner_apothem:
            raise DesignError(f"the groove for a strip {show(strip.thickness)} thick goes through the stave{where_} "
                              f"(wall after rounding {show(top - inner_apothem)} under it)", "hollow.strip")
    else:
        top, bottom = inner_apothem, inner_apothem - strip.thickness
        if bottom <= 0:
            raise DesignError(f"strips {show(strip.thickness)} thick fill the bore{where_}", "hollow.strip")
    if strip.width / 2 > bottom * tan:
        raise DesignError(f"strips {show(strip.width)} wide do not fit {staves} staves{where_}: at most "
                          f"{show(2 * bottom * tan)} there", "hollow.strip")
    return bottom, top


def regions_at(spar: Spar, section: Section, plug: Plug | None, z: float | None = None) -> RegionSection:
    """The material regions of ``section`` at ``z`` (mm from the heel): the staves, the plug filling the bore
    where there is one, the strips in every stave and the sheathing layers over the wood that cover ``z``.
    The one place a section's regions are made; checks, sizing and renderers read them.

    ``section`` is the wood's (its radius the wood's, rounded under the layers); it may be the exact
    :class:`Section` or the sizing's closed form (anything with ``wall`` and ``bore`` moments,
    ``plastic_moduli``, ``radius``, ``inner_apothem``, ``staves`` and ``bore_corner_radius``). ``z`` None: no
    layers or strips.
    """
    if getattr(section, "shape", "round") != "round":  # an oval: its regions as drawn, bending athwartships
        return oval_regions_at(spar, section, plug, z=z)
    h = spar.hollow
    wood = h.wood
    z_wall, z_bore = section.plastic_moduli
    exact = isinstance(section, Section)
    n = section.staves
    wall, bore = isotropic(section.wall), isotropic(section.bore)
    strip_regions = []
    in_bore, grooved = [], []
    for strip in (h.strips_at(z, spar.length) if z is not None else ()):
        bottom, top = strip_span(strip, n, section.radius, section.inner_apothem, where(spar, z), spar.units)
        ring = _rectangle_ring(n, strip.width, bottom, top)
        cut = _ring_abs_y(n, strip.width * (top - bottom), (top + bottom) / 2)
        if strip.place == "groove":  # the groove is cut from the outer face: no wood over the strip either
            cover = _groove_cover(n, section.radius, strip.width, top)
            wall = wall - ring - cover
            z_wall = z_wall - cut - _ring_abs_y(n, cover.area / n, cover_centre(section.radius, strip.width, top))
            grooved.append((strip.width, bottom, section.radius + 1.0))
        else:
            bore, z_bore = bore - ring, z_bore - cut
            in_bore.append((strip.width, bottom, top))
        reach = math.hypot(strip.width / 2, top if strip.place != "groove" else top)
        strip_regions.append(Region(STRIP, strip.material, ring, reach, strip.material.moe,
                                    shape=partial(_strip_shape, n, strip.width, bottom, top), pieces=n,
                                    label=f"strip {h.strips.index(strip) + 1}"))
    regions = [Region(STAVE, wood, wall, section.radius, h.lamination_factor * wood.moe,
                      plastic=z_wall, shape=partial(_stave_shape, section, tuple(grooved)) if exact else None,
                      pieces=n if exact else 1, label="staves")]
    if plug is not None:
        regions.append(Region(PLUG, plug.wood, bore, section.bore_corner_radius, plug.wood.moe,
                              plastic=z_bore, shape=partial(_bore_shape, section, tuple(in_bore)) if exact else None,
                              label="plug"))
    regions += strip_regions
    inner = section.radius
    for k, layer in enumerate(h.layers):
        if z is None or not layer.covers(z, spar.length):
            continue
        outer = inner + layer.thickness
        ring = disc_moments(outer) - disc_moments(inner)
        regions.append(Region(LAYER, layer.material, ring, outer, layer.material.moe,
                              shape=partial(_annulus_shape, inner, outer),
                              label=f"layer {k + 1}"))
        inner = outer
    return section_of(regions, wood.moe)


def regions_of(spar: Spar, station: Station) -> RegionSection:
    """The station's regions: those it carries, else made now (:func:`regions_at`)."""
    if station.regions is not None:
        return station.regions
    return regions_at(spar, station.section, station.plug, station.z)


def wood_radius(spar: Spar, radius: float, z: float) -> float:
    """The radius the wood is rounded to (mm) where the finished radius, layers included, is ``radius``."""
    sheath = spar.hollow.sheath(z, spar.length) if spar.hollow.layers else 0.0
    return radius - sheath


def where(spar: Spar, z: float) -> str:
    """A position for messages: ``5' 3" from the heel`` or ``1600.0 mm from the heel``."""
    return f"{format_length(z, spar.units, tape=True)} from the heel"


def plug_at_station(spar: Spar, z: float) -> Plug | None:
    """The plug filling the bore at ``z``; at a plug's inner end the open bore beside it counts."""
    tol = MERGE_TOLERANCE
    for plug in spar.hollow.plugs:
        inside = plug.start + tol < z < plug.end - tol
        at_heel = z <= tol and plug.start <= tol
        at_head = z >= spar.length - tol and plug.end >= spar.length - tol
        if inside or at_heel or at_head:
            return plug
    return None


def stave_thickness(spar: Spar) -> float | None:
    """The thickness every stave is dressed to (mm), when the notch is cut in one setting; else None.

    It is the thickest wall of the spar rounded up onto the builder's grid (1/32 in or
    0.1 mm): a tapered wall is cut as staves of the thickest wall whose notch is set
    once, the taper being the bore's (see :func:`hollow_section`). None when the file
    asks for the notch to follow a tapered wall station by station (``notch_cut =
    "follow-wall"``).
    """
    wall = spar.hollow.wall
    if not isinstance(wall, Profile):
        return None
    if spar.hollow.notch_cut == "follow-wall" and not wall.is_constant:
        return None
    return system(spar.units).on_grid(wall.largest, Way.UP)


def hollow_section(spar: Spar, radius: float, wall: float, at: str = "", thickness: float | None = None) -> Section:
    """The section as the staves are built: finished ``radius``, the file's ``wall`` there (mm).

    The staves are ``thickness`` thick (default :func:`stave_thickness`, or the wall
    rounded up onto the grid when the notch follows the wall); their inner faces lie
    where the wall puts them (inner apothem R + planing allowance − wall), so any
    thickness over the wall stands proud outside and comes off in rounding (or is
    planed off the outer face first). The bore, and so every figure inside the round,
    is the file's.
    """
    h = spar.hollow
    t = thickness if thickness is not None else stave_thickness(spar)
    if t is None:
        t = system(spar.units).on_grid(wall, Way.UP)
    return evaluate_section(h.staves, h.joint, radius, t, h.planing_allowance + (t - wall), at, spar.units)


def oval_section(spar: Spar, fore_aft: float, athwartships: float, wall: float, at: str = "",
                 thickness: float | None = None):
    """The oval section as the staves are built (see :func:`hollow_section`): finished outside
    ``fore_aft`` × ``athwartships``, the file's ``wall`` there (mm)."""
    from ..section.oval import evaluate_oval

    h = spar.hollow
    t = thickness if thickness is not None else stave_thickness(spar)
    if t is None:
        t = system(spar.units).on_grid(wall, Way.UP)
    return evaluate_oval(h.staves, h.joint, fore_aft, athwartships, t, h.planing_allowance + (t - wall), at,
                         spar.units)


def box_section(spar: Spar, fore_aft: float, athwartships: float, wall: float, at: str = "",
                thickness: float | None = None):
    """The box section as the pieces are built (see :func:`hollow_section`): finished outside
    ``fore_aft`` × ``athwartships``, the file's ``wall`` there (mm); pieces ``thickness`` thick, their inner faces
    where the wall puts them."""
    from ..section.box import evaluate_box

    h = spar.hollow
    t = thickness if thickness is not None else stave_thickness(spar)
    if t is None:
        t = system(spar.units).on_grid(wall, Way.UP)
    return evaluate_box(h.corner, fore_aft, athwartships, t, h.planing_allowance + (t - wall), h.corner_radius,
                        h.rebate_depth, at, spar.units)


def two_axis_section(spar: Spar, fore_aft: float, athwartships: float, wall: float, at: str = "",
                     thickness: float | None = None):
    """The oval or box section (by the hollow spar's shape)."""
    if spar.hollow.is_box:
        return box_section(spar, fore_aft, athwartships, wall, at, thickness)
    return oval_section(spar, fore_aft, athwartships, wall, at, thickness)


class SectionCache:
    """Sections keyed by (radius, wall): tapers often repeat the same section."""

    def __init__(self, spar: Spar) -> None:
        if not spar.resolved:
            raise ValueError("staves and wall must be resolved before sections are evaluated")
        self.spar = spar
        self._thickness = stave_thickness(spar)
        self._cache: dict[tuple[float, float], Section] = {}

    def at(self, z: float, cover: float | None = None) -> Section:
        """The wood's finished section at ``z`` mm from the heel: rounded to the finished radius less the layers
        there (those covering ``cover``, default ``z``: a stretch's middle decides at a layer's end)."""
        spar = self.spar
        radius = wood_radius(spar, float(spar.hollow.diameter.at(z)) / 2, z if cover is None else cover)
        wall = float(spar.hollow.wall.at(z))
        if spar.hollow.two_axis:  # the wood's oval: the finished one less the layers all round
            athwartships = float(spar.hollow.athwartships.at(z)) - 2 * (float(spar.hollow.diameter.at(z)) / 2 - radius)
            key = (round(radius, 9), round(wall, 9), round(athwartships, 9))
            section = self._cache.get(key)
            if section is None:
                section = two_axis_section(spar, 2 * radius, athwartships, wall, where(spar, z), self._thickness)
                self._cache[key] = section
            return section
        key = (round(radius, 9), round(wall, 9))
        section = self._cache.get(key)
        if section is None:
            section = hollow_section(spar, radius, wall, where(spar, z), self._thickness)
            self._cache[key] = section
        return section


def evaluate_stations(spar: Spar, marks: tuple[StationMark, ...] | None = None,
                      cache: SectionCache | None = None) -> tuple[Station, ...]:
    """Every station of the spar (or of ``marks``), heel to head."""
    cache = cache or SectionCache(spar)
    marks = marks if marks is not None else station_marks(spar)
    stations = []
    for mark in marks:
        section = cache.at(mark.z)
        plug = plug_at_station(spar, mark.z)
        stations.append(Station(
            z=mark.z,
            reasons=mark.reasons,
            plan_diameter=float(spar.plan.diameter.at(mark.z)),
            diameter=float(spar.hollow.diameter.at(mark.z)),
            wall=float(spar.hollow.wall.at(mark.z)),
            plug=plug,
            section=section,
            plan_athwartships=(float(spar.plan.athwartships.at(mark.z)) if spar.plan.athwartships is not None
                               else None),
            athwartships=float(spar.hollow.athwartships.at(mark.z)) if spar.hollow.two_axis else None,
            regions=regions_at(spar, section, plug, mark.z),
        ))
    return tuple(stations)

