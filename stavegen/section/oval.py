"""An oval birdsmouth (or bevel) section: staves of unequal widths round an ellipse.

The finished outside is the ellipse of semi-axes a (fore-and-aft, x) and b
(athwartships, y). Stave k's outer face lies on the tangent to that ellipse
whose outward normal points at θ_k = 90° + k·360°/N, moved out by the planing
allowance (the tangent of the curve parallel to the ellipse), so the glued-up
staves make the polygon that rounds to the ellipse. The normals turn by the
same φ = 360°/N from stave to stave, so every joint has the same local
geometry as in a round spar of N staves: the same 90° V, notch depth, apex
height and bevel, and only the widths differ. Each stave's width comes from
its own closure: the length of its outer-face side between the corners it
shares with its neighbours, plus what the joint adds or takes at its two
edges (the same at every corner). With N even the staves at θ and at
180° − θ, −θ, 180° + θ have the same width: they pair off by symmetry
about both axes.

Section properties are exact: each stave clipped by the true ellipse
(:mod:`.ellipse`), the bore the polygon of the staves' inner faces. Lengths
mm, second moments mm⁴.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np
import shapely
from shapely.geometry import Polygon, box
from shapely.geometry.polygon import orient

from ..errors import DesignError, area as area_figure
from ..model.spar import Joint
from ..units import format_length
from .ellipse import ellipse_moments, ring_in_ellipse_moments, rings_in_ellipse_moments
from .integrals import Moments, ring_moments
from .notch import Notch, bevel_angle, closure_width, notch_for, v_face_angles
from .staves import INTERFERENCE_TOLERANCE, StaveFrame, stave_frame, stave_polygon

VOID_TOLERANCE = 1e-9  # of the ellipse's area: below this a void is roundoff
SAME_WIDTH = 1e-6  # mm: staves whose widths differ by less are one kind


def normal_angle(staves: int, k: int) -> float:
    """Direction (radians) of stave k's outward normal: stave 0 faces athwartships (+y), then counter-clockwise."""
    return math.pi / 2 + 2 * math.pi * k / staves


def support(a: float, b: float, theta: float) -> float:
    """Distance from the centre to the ellipse's tangent with outward normal at ``theta``: √(a²cos²θ + b²sin²θ)."""
    return math.hypot(a * math.cos(theta), b * math.sin(theta))


@dataclass(frozen=True)
class StaveKind:
    """Staves of one width profile: which staves (0-based, round the section) and the figures of one of them.

    ``section`` is a round-style :class:`~stavegen.section.properties.Section`-like view in the stave's own
    frame (x along its face, y outward from the axis), for the stave-level consumers (stave plan, cutter
    settings): its ``stave_width``, ``outer_apothem``, ``thickness``, ``notch``, ``frame``.
    """

    index: int
    members: tuple[int, ...]
    width: float
    outer_apothem: float
    frame: StaveFrame

    @property
    def count(self) -> int:
        return len(self.members)


class UnequalStaves:
    """What a section of staves that are not all alike (an oval's, a box's) says of its widest stave and its
    size, for the code that reads one stave (the layout's settings, the figures): read off ``widths``,
    ``outer_apothems``, ``frames`` and ``outlines``, one per stave, and the outside dimensions."""

    @property
    def radius(self) -> float:
        """Half the larger outside dimension, mm (the round section's radius, for figures that need one)."""
        return max(self.fore_aft, self.athwartships) / 2

    @property
    def stave_width(self) -> float:
        """The widest stave's width (before any notch), mm."""
        return max(self.widths)

    @property
    def narrowest_stave(self) -> float:
        return min(self.widths)

    @property
    def outer_apothem(self) -> float:
        """The widest stave's outer apothem, mm."""
        return self.outer_apothems[self.widths.index(max(self.widths))]

    @property
    def frame(self) -> StaveFrame:
        return self.frames[self.widths.index(max(self.widths))]

    @property
    def stave_outline(self) -> tuple[tuple[float, float], ...]:
        return self.outlines[0]

    # the whole section, both ways (``wall`` and ``bore`` are Moments about the spar's axis)
    @property
    def assembled(self):
        return self

    @property
    def semi_axes(self) -> tuple[float, float]:
        return self.fore_aft / 2, self.athwartships / 2

    @property
    def area(self) -> float:
        return self.wall.area

    @property
    def inertia(self) -> float:
        """The smaller of the two, mm⁴ (the direction the section is weaker in)."""
        return min(self.inertia_fore_aft, self.inertia_athwartships)

    @property
    def bore_inertia(self) -> float:
        """The bore's second moment in the weaker direction of the wall, mm⁴."""
        return self.bore.iyy if self.inertia_fore_aft <= self.inertia_athwartships else self.bore.ixx

    @property
    def bore_inertia_fore_aft(self) -> float:
        return self.bore.iyy

    @property
    def bore_inertia_athwartships(self) -> float:
        return self.bore.ixx


@dataclass(frozen=True)
class OvalSection(UnequalStaves):
    """A finished oval section of N staves (mm, mm², mm⁴); x fore-and-aft, y athwartships."""

    staves: int
    joint: str
    fore_aft: float
    athwartships: float
    thickness: float
    notch: Notch | None
    outer_apothems: tuple[float, ...]
    widths: tuple[float, ...]
    frames: tuple[StaveFrame, ...]
    outlines: tuple[tuple[tuple[float, float], ...], ...]  # every stave in the axis frame, before rounding
    bore_outline: tuple[tuple[float, float], ...]
    wall: Moments
    bore: Moments
    voids: Moments
    overlap: float
    shape: str = "oval"
    face_middles: tuple[float, ...] = ()
    """Each stave's middle along its face (x in its own frame): half-way between the corners it shares with its
    neighbours on the glued-up polygon, where a reinforcing strip is centred."""

    @cached_property
    def _finished_polygon(self) -> Polygon:
        """The finished oval as a 720-sided inscribed polygon: inside the true oval, so a wall measured to it is
        on the safe, thin side (for the least wall and the glue line only; the figures are exact)."""
        return Polygon(self.finished_points(720))

    @cached_property
    def least_wall(self) -> float:
        """Thinnest wood over the bore (and any void) after rounding, mm: from the hollow out to the oval."""
        finished = self._finished_polygon
        hollow = Polygon(self.bore_outline)
        if self.voids.area > 0:
            ring = shapely.union_all([Polygon(o) for o in self.outlines], grid_size=1e-6)
            if ring.is_valid:
                hollow = shapely.Polygon(finished.exterior).difference(ring)
        return float(finished.exterior.distance(hollow))

    @cached_property
    def glue_line(self) -> float:
        """The longest glued joint inside the finished oval (for glue estimates), mm: the boundary two
        neighbouring staves share."""
        a, b = self.semi_axes
        polys = [Polygon(o) for o in self.outlines]
        glue = 0.0
        for k in range(self.staves):
            shared = polys[k].boundary.intersection(polys[(k + 1) % self.staves].buffer(1e-6 * (a + b)))
            glue = max(glue, float(shared.intersection(self._finished_polygon).length))
        return glue

    # --- the two directions -------------------------------------------------------------------------------
    @property
    def inertia_fore_aft(self) -> float:
        """∫x² dA of the finished wall about its centroid: resists bending in the fore-and-aft plane, mm⁴."""
        return self.wall.iyy - self.wall.qx**2 / self.wall.area

    @property
    def inertia_athwartships(self) -> float:
        """∫y² dA of the finished wall about its centroid: resists bending athwartships, mm⁴."""
        return self.wall.ixx - self.wall.qy**2 / self.wall.area

    @property
    def inner_apothem(self) -> float:
        """The widest stave's inner apothem, mm."""
        return self.outer_apothem - self.thickness

    @property
    def flat_wall(self) -> float:
        """The wall after rounding at the middle of the thinnest-walled stave (where its face touches the oval), mm."""
        a, b = self.semi_axes
        return min(support(a, b, normal_angle(self.staves, k)) - (self.outer_apothems[k] - self.thickness)
                   for k in range(self.staves))

    @property
    def hollow_reach(self) -> float:
        return 0.0

    @property
    def bore_corner_radius(self) -> float:
        return 0.0

    @property
    def void_area(self) -> float:
        return self.voids.area

    @property
    def across_flats(self) -> float:
        """Across the flats fore-and-aft of the glued-up polygon before rounding, mm."""
        return 2 * max(self.outer_apothems[k] for k in _facing(self.staves, 0.0))

    @property
    def across_flats_athwartships(self) -> float:
        return 2 * max(self.outer_apothems[k] for k in _facing(self.staves, math.pi / 2))

    @property
    def bore_across_flats(self) -> float:
        """The bore across its flats fore-and-aft, mm."""
        return self.across_flats - 2 * self.thickness

    @property
    def bore_across_flats_athwartships(self) -> float:
        return self.across_flats_athwartships - 2 * self.thickness

    @property
    def bore_corner_reach(self) -> float:
        """The bore's farthest corner from the axis, mm."""
        return max(math.hypot(x, y) for x, y in self.bore_outline)

    @property
    def corner_wall(self) -> float:
        return self.least_wall

    @property
    def v_face_angles(self) -> tuple[float, float] | None:
        return v_face_angles(self.staves) if self.notch else None

    @property
    def bevel_angle(self) -> float | None:
        return None if self.notch else bevel_angle(self.staves)

    @cached_property
    def kinds(self) -> tuple[StaveKind, ...]:
        """The staves grouped by symmetry about both axes (:func:`kind_of`): kind j holds stave j, 0 ≤ j ≤ N/4."""
        return tuple(StaveKind(j, tuple(k for k in range(self.staves) if kind_of(self.staves, k) == j),
                               self.widths[j], self.outer_apothems[j], self.frames[j])
                     for j in range(kind_count(self.staves)))

    def kind_section(self, j: int):
        """Stave ``j``'s figures as a round section's stave in its own frame (x along the face, y outward):
        what the stave plan and the cutter settings read (width, outer apothem, thickness, notch, frame)."""
        from .properties import Section

        local = _to_axis(self.outlines[j], math.pi / 2 - (normal_angle(self.staves, j) - math.pi / 2))
        return Section(staves=self.staves, joint=self.joint, radius=self.radius, thickness=self.thickness,
                       outer_apothem=self.outer_apothems[j], stave_width=self.widths[j], notch=self.notch,
                       frame=self.frames[j], stave_outline=tuple(local), wall=Moments(), bore=Moments(),
                       voids=Moments(), overlap=self.overlap, glue_line=self.glue_line, whole=self)

    def placed_rings(self) -> list[list[tuple[float, float]]]:
        """Every stave in the axis frame, before rounding."""
        return [list(o) for o in self.outlines]

    def bore_points(self) -> list[tuple[float, float]]:
        return list(self.bore_outline)

    def finished_points(self, count: int = 360) -> list[tuple[float, float]]:
        """Points on the finished ellipse (for drawings only; the figures use the true curve)."""
        a, b = self.semi_axes
        return [(a * math.cos(2 * math.pi * i / count), b * math.sin(2 * math.pi * i / count)) for i in range(count)]

    def stave_polygon(self, k: int = 0) -> Polygon:
        return Polygon(self.outlines[k])

    @cached_property
    def plastic_moduli_fore_aft(self) -> tuple[float, float]:
        """∫|x| dA of the finished wall and of the bore (mm³): plastic moduli for bending fore-and-aft."""
        return self._half_moments(0)

    @cached_property
    def plastic_moduli_athwartships(self) -> tuple[float, float]:
        return self._half_moments(1)

    def _half_moments(self, axis: int) -> tuple[float, float]:
        """∫|x| dA (axis 0) or ∫|y| dA (axis 1) of the finished wall and of the bore, mm³, exact.

        The section turns into itself by half a turn (stave k + N/2 is stave k turned by 180°), so its
        centroid is the axis and each integral is twice the half on the positive side. Without voids the
        wall is the oval less the bore: 4a²b/3 (or 4ab²/3) less the bore's; with voids the staves are
        clipped by the oval one by one.
        """
        a, b = self.semi_axes
        reach = 4 * (a + b) + 1.0
        half_plane = box(0.0, -reach, reach, reach) if axis == 0 else box(-reach, 0.0, reach, reach)

        def positive(poly: Polygon, clip: bool) -> float:
            total = 0.0
            piece = poly.intersection(half_plane)
            for g in getattr(piece, "geoms", [piece]):
                if g.is_empty or g.geom_type != "Polygon":
                    continue
                g = orient(g, 1.0)
                rings = [list(g.exterior.coords)[:-1]] + [list(r.coords)[:-1] for r in g.interiors]
                m = rings_in_ellipse_moments(rings, a, b) if clip else sum((ring_moments(r) for r in rings),
                                                                           Moments())
                total += m.qx if axis == 0 else m.qy
            return total

        bore = 2 * positive(Polygon(self.bore_outline), False)
        if self.voids.area == 0:
            whole = 4 * a * a * b / 3 if axis == 0 else 4 * a * b * b / 3
            return whole - bore, bore
        wall = 2 * sum(positive(Polygon(o), True) for o in self.outlines)
        return wall, bore


def kind_of(staves: int, k: int) -> int:
    """Stave k's kind: the least of k, −k, N/2 − k, N/2 + k (mod N), the staves its mirror images about the
    two axes fall on (the same width along the whole spar)."""
    half = staves // 2
    return min(k % staves, (-k) % staves, (half - k) % staves, (half + k) % staves)


def kind_count(staves: int) -> int:
    """How many kinds of stave an oval of N (even) staves has: N // 4 + 1."""
    return staves // 4 + 1


def _facing(staves: int, direction: float) -> list[int]:
    """The staves whose normals lie nearest ``direction`` (radians)."""
    def off(k: int) -> float:
        d = (normal_angle(staves, k) - direction) % (2 * math.pi)
        return min(d, 2 * math.pi - d)

    best = min(off(k) for k in range(staves))
    return [k for k in range(staves) if off(k) <= best + 1e-9]


def _line_meet(n1: tuple[float, float], c1: float, n2: tuple[float, float], c2: float) -> tuple[float, float]:
    """The point where n1·X = c1 meets n2·X = c2."""
    det = n1[0] * n2[1] - n1[1] * n2[0]
    return ((c1 * n2[1] - c2 * n1[1]) / det, (n1[0] * c2 - n2[0] * c1) / det)


def _to_axis(points, theta: float) -> list[tuple[float, float]]:
    """Points in a stave's frame (x along its face, y along its outward normal at ``theta``) in the axis frame."""
    turn = theta - math.pi / 2
    c, s = math.cos(turn), math.sin(turn)
    return [(c * x - s * y, s * x + c * y) for x, y in points]


def _bevel_polygon(frame: StaveFrame, staves: int, x_left: float, x_right: float) -> Polygon:
    """A plain bevelled stave between its corners: outer face vertex to vertex, edges on the bisectors."""
    run = (frame.outer - frame.inner) * math.tan(math.pi / staves)
    return orient(Polygon([(x_left + run, frame.inner), (x_right - run, frame.inner), (x_right, frame.outer),
                           (x_left, frame.outer)]), 1.0)


def evaluate_oval(staves: int, joint: Joint, fore_aft: float, athwartships: float, thickness: float,
                  planing_allowance: float = 0.0, where: str = "", units: str = "mm") -> OvalSection:
    """The finished oval section of finished outside ``fore_aft`` × ``athwartships`` (mm) from staves of
    ``thickness`` (mm), their outer faces ``planing_allowance`` (mm) outside the ellipse's tangents."""
    def show(mm: float) -> str:
        return format_length(mm, units)

    at = f" at {where}" if where else ""
    key = "hollow.notch" if joint.kind == "birdsmouth-custom" else "hollow.joint"
    if staves % 2:
        raise DesignError(f"an oval spar needs an even number of staves (not {staves}), so that its section is "
                          "symmetric fore-and-aft and athwartships", "hollow.staves")
    a, b = fore_aft / 2, athwartships / 2
    t = thickness
    notch = notch_for(joint, staves, t, units)
    # The joint's own figures, from a round of N staves: the corner-to-edge offsets are the same at every corner.
    ref_outer = 100.0 * t
    ref_width = closure_width(staves, ref_outer - t, notch, t)
    ref = stave_frame(staves, ref_outer, t, ref_width, notch)
    half_side = ref_outer * math.tan(math.pi / staves)
    to_square = ref.x_square_edge - half_side  # from the corner on the square edge's side
    to_notch = ref.x_notch_edge + half_side  # from the corner on the notched edge's side
    thetas = [normal_angle(staves, k) for k in range(staves)]
    normals = [(math.cos(th), math.sin(th)) for th in thetas]
    outer = [support(a, b, th) + planing_allowance for th in thetas]
    inner = [o - t for o in outer]
    if min(inner) <= 0:
        raise DesignError(f"wall {show(t)} is too thick for the bore{at}: the staves' inner faces would meet at "
                          "the axis", "hollow.wall")
    frames, outlines, widths, middles = [], [], [], []
    for k in range(staves):
        nxt, prv = (k + 1) % staves, (k - 1) % staves
        u = (normals[k][1], -normals[k][0])
        left = _line_meet(normals[k], outer[k], normals[nxt], outer[nxt])  # shared with the next stave (notch side)
        right = _line_meet(normals[k], outer[k], normals[prv], outer[prv])
        x_left, x_right = u[0] * left[0] + u[1] * left[1], u[0] * right[0] + u[1] * right[1]
        middles.append((x_left + x_right) / 2)
        if notch is None:
            frame = StaveFrame(x_left, x_right, inner[k], outer[k], None)
            poly = _bevel_polygon(frame, staves, x_left, x_right)
        else:
            x_notch, x_square = x_left + to_notch, x_right + to_square
            frame = StaveFrame(x_notch, x_square, inner[k], outer[k],
                               (x_notch + notch.depth, inner[k] + notch.apex_height))
            if not 0 < notch.depth < frame.width:
                raise DesignError(f"notch depth {show(notch.depth)} does not fit a stave {show(frame.width)} "
                                  f"wide{at}", key)
            poly = stave_polygon(staves, frame, notch, key)
        frames.append(frame)
        widths.append(frame.width)
        outlines.append(tuple(_to_axis(list(poly.exterior.coords)[:-1], thetas[k])))
    bore_ring = [_line_meet(normals[k], inner[k], normals[(k + 1) % staves], inner[(k + 1) % staves])
                 for k in range(staves)]
    # every inner face must keep a side of the bore: its corners in order round the axis, none crossed over
    for k in range(staves):
        u = (normals[k][1], -normals[k][0])
        left, right = bore_ring[k], bore_ring[k - 1]
        if (u[0] * (right[0] - left[0]) + u[1] * (right[1] - left[1])) <= 0:
            raise DesignError(f"wall {show(t)} is too thick for the bore{at}: the narrow staves' inner faces "
                              "cross over", "hollow.wall")
    polys = np.array([Polygon(o) for o in outlines], dtype=object)
    if not all(p.is_valid for p in polys):
        raise DesignError(f"the staves cannot be built{at}: a notch or bevel runs through a stave", key)
    overlap = 0.0
    for step in (1, 2):
        others = [polys[(k + step) % staves] for k in range(staves)]
        overlap = max(overlap, float(max(shapely.area(shapely.intersection(polys, others)))))
    if overlap > INTERFERENCE_TOLERANCE * min(shapely.area(polys)):
        raise DesignError(f"staves overlap by {{overlap}}{at}: the notch does not fit its neighbour", key,
                          figures={"overlap": area_figure(overlap)})
    outside = max(math.hypot(x / a, y / b) for x, y in bore_ring)
    if outside >= 1.0:
        raise DesignError(f"rounding breaks into the bore{at}: the bore's corners reach past the finished oval "
                          f"({show(fore_aft)} by {show(athwartships)}); use a thicker wall or more staves",
                          "hollow.wall")
    wall = sum((ring_in_ellipse_moments(o, a, b) for o in outlines), Moments())
    bore = ring_moments(bore_ring)
    voids = ellipse_moments(a, b) - bore - wall
    if abs(voids.area) <= VOID_TOLERANCE * math.pi * a * b:
        voids = Moments()
    elif voids.area < 0:
        raise DesignError(f"the staves do not close into a ring round the bore{at}", key)
    return OvalSection(
        staves=staves, joint=joint.kind, fore_aft=fore_aft, athwartships=athwartships, thickness=t, notch=notch,
        outer_apothems=tuple(outer), widths=tuple(widths), frames=tuple(frames), outlines=tuple(outlines),
        bore_outline=tuple(bore_ring), wall=wall, bore=bore, voids=voids, overlap=overlap,
        face_middles=tuple(middles),
    )


def corner_reach(staves: int, fore_aft: float, athwartships: float, wall: float, allowance: float,
                 keep: float = 0.0) -> float:
    """How far out the bore's corners reach, as a share of the finished oval shrunk by ``keep`` (mm) all round:
    the largest (x/(a − keep))² + (y/(b − keep))² over the corners of the staves' inner faces, whose lines lie
    ``allowance − wall`` off the oval's tangents. Below 1 the rounding stays clear of the bore."""
    a, b = fore_aft / 2 - keep, athwartships / 2 - keep
    if a <= 0 or b <= 0:
        return math.inf
    thetas = [normal_angle(staves, k) for k in range(staves)]
    normals = [(math.cos(t), math.sin(t)) for t in thetas]
    inner = [support(fore_aft / 2, athwartships / 2, t) + allowance - wall for t in thetas]
    worst = 0.0
    for k in range(staves):
        x, y = _line_meet(normals[k], inner[k], normals[(k + 1) % staves], inner[(k + 1) % staves])
        worst = max(worst, (x / a) ** 2 + (y / b) ** 2)
    return worst
