"""One finished cross-section of the hollow spar: geometry, validity and exact properties.

finished = disc(R) ∩ union(staves). Its second moment comes from exact
integration (:mod:`.integrals`): each stave clipped by the true circle,
times N by the section's N-fold symmetry (about any diameter I = J/2 for
N ≥ 3). The bore is the regular N-gon of apothem a_i; the voids are what
the disc holds besides bore and staves, so I = I_disc − I_bore − I_voids
holds by construction. Lengths mm, areas mm², second moments mm⁴.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

import shapely
from shapely.geometry import Polygon

from ..errors import DesignError
from ..model.spar import Joint
from ..units import format_length
from .integrals import Moments, disc_moments, ring_in_disc_moments, ring_moments, segment_length_in_disc
from .notch import Notch, bevel_angle, closure_width, notch_for, v_face_angles
from .staves import (StaveFrame, check_interference, enclosed_gap_reach, outside_reach, placed_ring, stave_frame,
                     stave_polygon)

VOID_TOLERANCE = 1e-9  # of the disc's area: below this a void is roundoff


@dataclass(frozen=True)
class Section:
    """A finished hollow section at one position (mm, mm², mm⁴)."""

    staves: int
    joint: str
    radius: float
    thickness: float
    outer_apothem: float
    stave_width: float
    notch: Notch | None
    frame: StaveFrame
    stave_outline: tuple[tuple[float, float], ...]
    wall: Moments
    bore: Moments
    voids: Moments
    overlap: float
    glue_line: float
    hollow_reach: float = 0.0
    whole: object = field(default=None, compare=False, repr=False)
    """For one stave of an oval (:meth:`~stavegen.section.oval.OvalSection.kind_section`): the whole oval section
    it belongs to (end views draw that); None for a round's section, which is itself whole."""

    @property
    def assembled(self):
        """The whole section this one's stave belongs to (itself for a round)."""
        return self.whole if self.whole is not None else self

    shape = "round"

    @property
    def fore_aft(self) -> float:
        """The finished outside fore-and-aft (the diameter), mm."""
        return 2 * self.radius

    @property
    def athwartships(self) -> float:
        return 2 * self.radius

    @property
    def inertia_fore_aft(self) -> float:
        return self.inertia

    @property
    def inertia_athwartships(self) -> float:
        return self.inertia

    @property
    def kinds(self) -> tuple:
        """One kind of stave: every stave of a round is the same."""
        from .oval import StaveKind

        return (StaveKind(0, tuple(range(self.staves)), self.stave_width, self.outer_apothem, self.frame),)

    def kind_section(self, j: int = 0) -> "Section":
        return self

    def placed_rings(self) -> list[list[tuple[float, float]]]:
        """Every stave in the axis frame, before rounding."""
        from .staves import placed

        polygon = self.stave_polygon()
        return [list(placed(polygon, self.staves, k).exterior.coords)[:-1] for k in range(self.staves)]

    def bore_points(self) -> list[tuple[float, float]]:
        return bore_ring(self.staves, self.inner_apothem)

    def finished_points(self, count: int = 360) -> list[tuple[float, float]]:
        r = self.radius
        return [(r * math.cos(2 * math.pi * i / count), r * math.sin(2 * math.pi * i / count)) for i in range(count)]

    @property
    def widths(self) -> tuple[float, ...]:
        """Every stave's width before the notch, mm (all the same in a round)."""
        return (self.stave_width,) * self.staves

    @property
    def least_wall(self) -> float:
        """Thinnest wood over the hollow after rounding, mm: R less the farthest reach of the bore or any void."""
        return self.radius - max(self.hollow_reach, self.bore_corner_radius)

    @property
    def inner_apothem(self) -> float:
        return self.outer_apothem - self.thickness

    @property
    def area(self) -> float:
        """Wood in the finished wall, mm²."""
        return self.wall.area

    @property
    def inertia(self) -> float:
        """Second moment of the finished wall about any diameter, mm⁴."""
        return self.wall.polar / 2

    @property
    def bore_inertia(self) -> float:
        return self.bore.polar / 2

    @property
    def void_area(self) -> float:
        return self.voids.area

    @property
    def modulus(self) -> float:
        """Section modulus S = I / R, mm³."""
        return self.inertia / self.radius

    @property
    def across_flats(self) -> float:
        """Across the flats of the glued-up polygon before rounding, mm (2·a_o)."""
        return 2 * self.outer_apothem

    @property
    def bore_corner_radius(self) -> float:
        return self.inner_apothem / math.cos(math.pi / self.staves)

    @property
    def corner_wall(self) -> float:
        """Thinnest wall after rounding, at the bore's corners: R − a_i / cos(π/N), mm."""
        return self.radius - self.bore_corner_radius

    @property
    def flat_wall(self) -> float:
        """Wall after rounding at the middle of a stave: R − a_i, mm."""
        return self.radius - self.inner_apothem

    @property
    def v_face_angles(self) -> tuple[float, float] | None:
        return v_face_angles(self.staves) if self.notch else None

    @property
    def bevel_angle(self) -> float | None:
        return None if self.notch else bevel_angle(self.staves)

    def stave_polygon(self) -> Polygon:
        """Stave 0 (before rounding) as a shapely polygon in the axis frame."""
        return Polygon(self.stave_outline)

    @cached_property
    def plastic_moduli(self) -> tuple[float, float]:
        """Plastic section moduli Z = ∫|y| dA (mm³) of the finished wall and of the bore, about a diameter.

        Exact (polygons clipped by the true circle). The wall's is the smaller of the values about
        the diameter through a stave's middle and the one a half stave turned, taken about the
        centroid (equal to the equal-area axis for an even number of staves).
        """
        best = None
        for turn in (0.0, math.pi / self.staves):
            bore = _half_first_moment(Polygon(bore_ring(self.staves, self.inner_apothem)), turn, None)
            wall = _half_first_moment_wall(self, turn, bore)
            if best is None or wall < best[0]:
                best = (wall, bore)
        return best


def _above_axis(ring: list[tuple[float, float]]) -> list[tuple[float, float]]:
    """The part of a closed ring with y ≥ 0 (Sutherland–Hodgman against one half-plane). For a ring that is
    not convex the result may run along y = 0 there and back; such edges add nothing to an integral taken
    round the boundary (Green's theorem), which is all it is used for."""
    out: list[tuple[float, float]] = []
    n = len(ring)
    for i in range(n):
        p, q = ring[i], ring[(i + 1) % n]
        if p[1] >= 0:
            out.append(p)
        if (p[1] >= 0) != (q[1] >= 0):
            s = p[1] / (p[1] - q[1])
            out.append((p[0] + s * (q[0] - p[0]), 0.0))
    return out


def _half_first_moment(poly: Polygon, turn: float, radius: float | None) -> float:
    """∫|y| dA over ``poly`` (clipped by the disc of ``radius`` when given), y across the diameter at ``turn``:
    twice the first moment of the part above the diameter less the whole's (∫|y| = 2∫_{y>0} y − ∫y)."""
    c, s = math.cos(-turn), math.sin(-turn)
    ring = [(c * x - s * y, s * x + c * y) for x, y in list(poly.exterior.coords)[:-1]]
    if sum(p[0] * q[1] - q[0] * p[1] for p, q in zip(ring, ring[1:] + ring[:1])) < 0:
        ring.reverse()  # counter-clockwise, so the integrals are positive

    def first_moment(r: list[tuple[float, float]]) -> float:
        if len(r) < 3:
            return 0.0
        return (ring_moments(r) if radius is None else ring_in_disc_moments(r, radius)).qy

    return 2 * first_moment(_above_axis(ring)) - first_moment(ring)


def _half_first_moment_wall(section: "Section", turn: float, bore: float) -> float:
    """∫|y| dA over the finished wall: the disc's 4R³/3 less the bore's (``bore``), or with voids the staves'
    own, each clipped by the round."""
    disc = 4 * section.radius**3 / 3
    if section.void_area <= 0:
        return disc - bore
    staves = placed_ring(Polygon(section.stave_outline), section.staves, range(section.staves))
    return sum(_half_first_moment(p, turn, section.radius) for p in staves)


def bore_ring(staves: int, inner_apothem: float) -> list[tuple[float, float]]:
    """The bore: the regular N-gon of apothem a_i, faces normal to each stave's y axis, counter-clockwise."""
    corner = inner_apothem / math.cos(math.pi / staves)
    start = math.pi / 2 - math.pi / staves
    return [(corner * math.cos(start + k * 2 * math.pi / staves), corner * math.sin(start + k * 2 * math.pi / staves))
            for k in range(staves)]


def _ring_of(one: Moments, staves: int) -> Moments:
    """Moments of N copies of one stave turned about the axis (N ≥ 3: isotropic, centroid on the axis)."""
    half_polar = staves * one.polar / 2
    return Moments(staves * one.area, 0.0, 0.0, half_polar, half_polar, 0.0)


def _glue_line(staves: int, frame: StaveFrame, notch: Notch | None, radius: float) -> float:
    """Length (mm) of one glued joint inside the finished round."""
    phi = 2 * math.pi / staves
    if notch is None:
        # Bevelled faces lie on the radial line through the polygon's corners.
        c = math.cos(math.pi / staves)
        start, end = frame.inner / c, frame.outer / c
        return max(0.0, min(end, radius) - start)
    t = frame.outer - frame.inner
    h, ft = notch.depth, notch.apex_height
    sin_p, cos_p = math.sin(phi), math.cos(phi)
    # Face 1 (neighbour's inner face) and face 2 (its end face), each from the apex to where it leaves the stave.
    along_inner = min(h / cos_p if cos_p > 1e-12 else math.inf, ft / sin_p)
    along_end = min(h / sin_p, (t - ft) / cos_p if cos_p > 1e-12 else math.inf, t)
    d1 = (-cos_p, -sin_p)
    d2 = (-sin_p, cos_p)
    return (segment_length_in_disc(frame.apex, d1, along_inner, radius)
            + segment_length_in_disc(frame.apex, d2, along_end, radius))


def evaluate_section(staves: int, joint: Joint, radius: float, thickness: float,
                     planing_allowance: float = 0.0, where: str = "", units: str = "mm") -> Section:
    """The finished section of finished radius R (mm) from staves of ``thickness`` (mm).

    The staves' outer faces stand ``planing_allowance`` (mm) proud of the round.
    Raises DesignError for geometry that cannot be built, naming the key and
    printing lengths in ``units``.
    """
    def show(mm: float) -> str:
        return format_length(mm, units)

    outer = radius + planing_allowance
    inner = outer - thickness
    at = f" at {where}" if where else ""
    if inner <= 0:
        raise DesignError(f"wall {show(thickness)} is too thick for the bore{at}: the staves' inner faces "
                          f"would meet at the axis (outer apothem {show(outer)})", "hollow.wall")
    notch = notch_for(joint, staves, thickness, units)
    key = "hollow.notch" if joint.kind == "birdsmouth-custom" else "hollow.joint"
    width = closure_width(staves, inner, notch, thickness)
    frame = stave_frame(staves, outer, thickness, width, notch)
    if notch is not None and not (0 < notch.depth < width):
        raise DesignError(f"notch depth {show(notch.depth)} does not fit a stave {show(width)} wide{at}", key)
    polygon = stave_polygon(staves, frame, notch, key)
    overlap = check_interference(polygon, staves, at, key)
    corner = inner / math.cos(math.pi / staves)
    if radius <= corner:
        raise DesignError(
            f"rounding breaks into the bore{at}: finished radius {show(radius)} but the bore's corners reach "
            f"{show(corner)}; use a thicker wall or more staves", "hollow.wall")
    reach = corner
    if joint.kind not in ("birdsmouth-flush", "bevel"):
        # The staves' outside must lie outside the round everywhere: a notch that leaves a groove open to the
        # outside at the seams, reaching inside the finished radius, leaves it in the finished surface.
        outside = outside_reach(polygon, staves)
        if outside < radius - 1e-5 - 1e-9 * radius:
            raise DesignError(
                f"rounding leaves an open groove{at} at every seam, {show(radius - outside)} deep into the finished "
                f"surface: the joint does not close out to the round (the square edge does not fill the V, or the V "
                f"is too shallow for the neighbour to close against the notched edge); use the flush birdsmouth",
                key)
        # The hollow is the bore polygon plus whatever voids the notch leaves; rounding must not open it.
        reach = enclosed_gap_reach(polygon, staves)
        if reach is None:
            raise DesignError(f"the staves do not close into a ring round the bore{at}", key)
        if reach >= radius:
            raise DesignError(
                f"rounding opens the wall{at}: the gaps this notch leaves between staves reach {show(reach)} "
                f"from the axis, past the finished radius {show(radius)}; use the flush birdsmouth", key)
    ring = list(polygon.exterior.coords)[:-1]
    wall = _ring_of(ring_in_disc_moments(ring, radius), staves)
    bore = ring_moments(bore_ring(staves, inner))
    voids = disc_moments(radius) - bore - wall
    if abs(voids.area) <= VOID_TOLERANCE * math.pi * radius**2:
        voids = Moments()
    return Section(
        staves=staves,
        joint=joint.kind,
        radius=radius,
        thickness=thickness,
        outer_apothem=outer,
        stave_width=width,
        notch=notch,
        frame=frame,
        stave_outline=tuple(ring),
        wall=wall,
        bore=bore,
        voids=voids,
        overlap=overlap,
        glue_line=_glue_line(staves, frame, notch, radius),
        hollow_reach=reach,
    )
