"""A rectangular hollow (box) section: two faces and two sides of the wall's thickness.

Axes as for the oval (:mod:`.oval`): x fore-and-aft, y athwartships, the finished outside a rectangle
``fore_aft`` × ``athwartships`` with its corners rounded to ``corner_radius`` (0: sharp). The four pieces are
numbered as the oval's staves of N = 4: piece 0 faces +y (a side, port or starboard), piece 1 faces −x (a
face, fore or aft), piece 2 −y (the other side), piece 3 +x (the other face). So the pieces pair off by
symmetry as an oval's staves do (:func:`stavegen.section.oval.kind_of`): kind 0 the sides, kind 1 the faces.

The faces span the spar athwartships, their outer planes ``planing_allowance`` outside the finished
rectangle (planed off after the glue-up, as a round's staves are rounded); the sides fit between them:

- ``sides-between-faces``: a side's edges glue to the faces' inner faces; a face is 2·(b + allowance) wide,
  a side 2·(a + allowance − t);
- ``rebated``: along each edge of a face's inner side a rebate ``rebate_depth`` (d) deep into the face and
  t wide (the side's thickness) takes the side's edge; a side is 2·(a + allowance − t + d) wide.
- ``pinwheel`` (the square birdsmouth): every piece covers the corner at its edge 1, rebated there d deep and t
  wide on its inner side; the next piece round (counter-clockwise looking from the heel) has its square edge 2 in
  that rebate. A piece whose neighbours' outer faces lie p from the axis is 2p − t + d wide, and the section
  turns into itself by half a turn (pieces 0 and 2 alike, 1 and 3 alike) though not by a mirror.

The bore is the rectangle 2·(a + allowance − t) × 2·(b + allowance − t). The pieces tile the outer rectangle
less the bore exactly, so the finished wall is the rounded rectangle less the bore, in closed form (Roark,
Table A.1 for the rectangle; quarter discs for the rounded corners, :mod:`.ellipse`). Lengths mm, second
moments mm⁴.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import shapely
from shapely.geometry import Polygon, box
from shapely.geometry.polygon import orient

from ..errors import DesignError, area as area_figure
from ..units import format_length
from .ellipse import rounded_rectangle_half_moment, rounded_rectangle_moments
from .integrals import Moments, ring_moments
from .oval import StaveKind, UnequalStaves, _to_axis, kind_count, kind_of, normal_angle
from .staves import INTERFERENCE_TOLERANCE, StaveFrame

PIECES = 4
SIDE, FACE = 0, 1  # the kinds: sides (port and starboard), faces (fore and aft)
KIND_NAMES = ("side", "face")
SIDES_BETWEEN_FACES, REBATED, PINWHEEL = "sides-between-faces", "rebated", "pinwheel"
WITH_REBATES = (REBATED, PINWHEEL)


def rounded_rectangle_points(half_x: float, half_y: float, corner: float, per_quarter: int = 24
                             ) -> list[tuple[float, float]]:
    """The outline of a centred rectangle 2·half_x × 2·half_y with corners rounded to ``corner`` (drawings and
    measuring only; the figures are exact), counter-clockwise."""
    if corner <= 0:
        return [(half_x, -half_y), (half_x, half_y), (-half_x, half_y), (-half_x, -half_y)]
    points = []
    for cx, cy, start in ((half_x - corner, half_y - corner, 0.0), (-half_x + corner, half_y - corner, 90.0),
                          (-half_x + corner, -half_y + corner, 180.0), (half_x - corner, -half_y + corner, 270.0)):
        for i in range(per_quarter + 1):
            t = math.radians(start + 90.0 * i / per_quarter)
            points.append((cx + corner * math.cos(t), cy + corner * math.sin(t)))
    return points


@dataclass(frozen=True)
class BoxSection(UnequalStaves):
    """A finished box section (mm, mm², mm⁴); x fore-and-aft, y athwartships. Read as an oval section is."""

    joint: str
    corner: str
    fore_aft: float
    athwartships: float
    thickness: float
    allowance: float
    corner_radius: float
    rebate_depth: float  # 0 for sides between faces
    outer_apothems: tuple[float, ...]
    widths: tuple[float, ...]
    frames: tuple[StaveFrame, ...]
    outlines: tuple[tuple[tuple[float, float], ...], ...]  # every piece in the axis frame, before planing
    local_outlines: tuple[tuple[tuple[float, float], ...], ...]  # each piece in its own frame (x along its face)
    bore_outline: tuple[tuple[float, float], ...]
    wall: Moments
    bore: Moments
    overlap: float
    staves: int = PIECES
    notch: None = None
    voids: Moments = Moments()
    shape: str = "rectangle"

    # --- as the oval's ------------------------------------------------------------------------------------
    @property
    def inertia_fore_aft(self) -> float:
        """∫x² dA of the finished wall: resists bending in the fore-and-aft plane, mm⁴ (the centroid is the axis)."""
        return self.wall.iyy

    @property
    def inertia_athwartships(self) -> float:
        return self.wall.ixx

    @property
    def bore_half(self) -> tuple[float, float]:
        """The bore's half-dimensions fore-and-aft and athwartships, mm."""
        return self.outer_apothems[3] - self.thickness, self.outer_apothems[0] - self.thickness

    @property
    def finished_wall(self) -> float:
        """The wall after the faces are planed to the finished outside, mm (the same all round)."""
        return self.fore_aft / 2 - self.bore_half[0]

    @property
    def least_wall(self) -> float:
        """Thinnest wood over the bore after planing and rounding, mm: the flat wall, or across a rounded corner
        on the diagonal, √2·(w − r) + r (never less than the flat wall while r ≤ w)."""
        w, r = self.finished_wall, self.corner_radius
        return min(w, math.sqrt(2) * (w - r) + r)

    flat_wall = least_wall
    corner_wall = least_wall

    @cached_property
    def glue_line(self) -> float:
        """The longest glued joint inside the finished outside (for glue estimates), mm."""
        finished = Polygon(self.finished_points(96))
        polys = [Polygon(o) for o in self.outlines]
        a, b = self.semi_axes
        glue = 0.0
        for k in range(PIECES):
            shared = polys[k].boundary.intersection(polys[(k + 1) % PIECES].buffer(1e-7 * (a + b)))
            glue = max(glue, float(shared.intersection(finished).length))
        return glue

    @property
    def inner_apothem(self) -> float:
        return self.outer_apothem - self.thickness

    @property
    def hollow_reach(self) -> float:
        return 0.0

    @property
    def bore_corner_radius(self) -> float:
        return 0.0

    @property
    def void_area(self) -> float:
        return 0.0

    @property
    def across_flats(self) -> float:
        """Across the faces fore-and-aft before planing, mm."""
        return 2 * self.outer_apothems[3]

    @property
    def across_flats_athwartships(self) -> float:
        return 2 * self.outer_apothems[0]

    @property
    def bore_across_flats(self) -> float:
        return 2 * self.bore_half[0]

    @property
    def bore_across_flats_athwartships(self) -> float:
        return 2 * self.bore_half[1]

    @property
    def bore_corner_reach(self) -> float:
        return math.hypot(*self.bore_half)

    @property
    def v_face_angles(self) -> None:
        return None

    @property
    def bevel_angle(self) -> None:
        return None

    @property
    def rebate(self) -> tuple[float, float] | None:
        """(depth into the face, width across it) of the faces' rebates, mm; None with sides between faces."""
        return (self.rebate_depth, self.thickness) if self.corner in WITH_REBATES else None

    @cached_property
    def kinds(self) -> tuple[StaveKind, ...]:
        """Kind 0 the sides (pieces 0 and 2), kind 1 the faces (pieces 1 and 3)."""
        return tuple(StaveKind(j, tuple(k for k in range(PIECES) if kind_of(PIECES, k) == j), self.widths[j],
                               self.outer_apothems[j], self.frames[j]) for j in range(kind_count(PIECES)))

    def kind_section(self, j: int):
        """Piece ``j``'s figures as a round section's stave in its own frame (x along its face from its middle,
        y outward): what the piece's plan and its machining read; a face carries its rebates."""
        from .properties import Section

        return Section(staves=PIECES, joint=self.joint, radius=self.radius, thickness=self.thickness,
                       outer_apothem=self.outer_apothems[j], stave_width=self.widths[j], notch=None,
                       frame=self.frames[j], stave_outline=self.local_outlines[j], wall=Moments(), bore=Moments(),
                       voids=Moments(), overlap=self.overlap, glue_line=self.glue_line, whole=self,
                       rebate=self.rebate if (j == FACE or self.corner == PINWHEEL) else None)

    def placed_rings(self) -> list[list[tuple[float, float]]]:
        return [list(o) for o in self.outlines]

    def bore_points(self) -> list[tuple[float, float]]:
        return list(self.bore_outline)

    def finished_points(self, count: int = 360) -> list[tuple[float, float]]:
        """The finished outline (for drawings; the figures are exact)."""
        a, b = self.semi_axes
        return rounded_rectangle_points(a, b, self.corner_radius, max(2, count // 4))

    def stave_polygon(self, k: int = 0) -> Polygon:
        return Polygon(self.outlines[k])

    def finished_pieces(self) -> list[Polygon]:
        """Every piece as it is in the finished spar: clipped by the finished outline (drawn as a polygon)."""
        finished = Polygon(self.finished_points(720))
        return [Polygon(o).intersection(finished) for o in self.outlines]

    @cached_property
    def plastic_moduli_fore_aft(self) -> tuple[float, float]:
        """∫|x| dA of the finished wall and of the bore (mm³), exact: the rounded rectangle's less the bore's."""
        p, q = self.bore_half
        bore = 2 * q * p * p
        return rounded_rectangle_half_moment(self.fore_aft, self.athwartships, self.corner_radius) - bore, bore

    @cached_property
    def plastic_moduli_athwartships(self) -> tuple[float, float]:
        p, q = self.bore_half
        bore = 2 * p * q * q
        return rounded_rectangle_half_moment(self.athwartships, self.fore_aft, self.corner_radius) - bore, bore


def piece_outlines(corner: str, outer_x: float, outer_y: float, thickness: float, rebate_depth: float
                   ) -> tuple[list[list[tuple[float, float]]], list[float]]:
    """Each piece in its own frame (x along its face, y outward from the axis), counter-clockwise, and its width.

    Pieces 0 and 2 are sides (outer face at ``outer_y``), 1 and 3 faces (outer face at ``outer_x``)."""
    t, d = thickness, rebate_depth if corner in WITH_REBATES else 0.0
    if corner == PINWHEEL:  # x from edge 1 (the corner covered, rebated) to edge 2 (in the next piece's rebate)
        def piece(own: float, across: float) -> list[tuple[float, float]]:
            inner, left, right = own - t, -across, across - t + d
            return [(left + t, inner), (right, inner), (right, own), (left, own), (left, inner + d),
                    (left + t, inner + d)]
        side, face = piece(outer_y, outer_x), piece(outer_x, outer_y)
        ws, wf = 2 * outer_x - t + d, 2 * outer_y - t + d
        return [side, face, side, face], [ws, wf, ws, wf]
    side_half = outer_x - t + d
    side = [(-side_half, outer_y - t), (side_half, outer_y - t), (side_half, outer_y), (-side_half, outer_y)]
    inner = outer_x - t
    if corner == REBATED:
        face = [(-outer_y + t, inner), (outer_y - t, inner), (outer_y - t, inner + d), (outer_y, inner + d),
                (outer_y, outer_x), (-outer_y, outer_x), (-outer_y, inner + d), (-outer_y + t, inner + d)]
    else:
        face = [(-outer_y, inner), (outer_y, inner), (outer_y, outer_x), (-outer_y, outer_x)]
    return [side, face, side, face], [2 * side_half, 2 * outer_y, 2 * side_half, 2 * outer_y]


def evaluate_box(corner: str, fore_aft: float, athwartships: float, thickness: float, planing_allowance: float = 0.0,
                 corner_radius: float = 0.0, rebate_depth: float | None = None, where: str = "",
                 units: str = "mm") -> BoxSection:
    """The finished box section of finished outside ``fore_aft`` × ``athwartships`` (mm), corners rounded to
    ``corner_radius``, from pieces ``thickness`` thick whose outer faces lie ``planing_allowance`` outside it.
    ``rebate_depth`` (rebated corners) defaults to half the thickness."""
    def show(mm: float) -> str:
        return format_length(mm, units)

    at = f" at {where}" if where else ""
    a, b = fore_aft / 2, athwartships / 2
    t = thickness
    ox, oy = a + planing_allowance, b + planing_allowance
    d = (t / 2 if rebate_depth is None else rebate_depth) if corner in WITH_REBATES else 0.0
    if min(ox, oy) - t <= 0:
        raise DesignError(f"wall {show(t)} is too thick for the bore{at}: the faces or the sides would meet",
                          "hollow.wall")
    if corner in WITH_REBATES and not 0 < d < t:
        raise DesignError(f"a rebate {show(d)} deep does not fit a face {show(t)} thick{at}", "hollow.rebate_depth")
    finished = t - planing_allowance
    if finished <= 0:
        raise DesignError(f"wall {show(t)} is all planing allowance{at}", "hollow.wall")
    if corner_radius > finished + 1e-9:
        raise DesignError(f"corner radius {show(corner_radius)} is more than the finished wall {show(finished)}{at}",
                          "hollow.corner_radius")
    local, widths = piece_outlines(corner, ox, oy, t, d)
    thetas = [normal_angle(PIECES, k) for k in range(PIECES)]
    outlines = [tuple(_to_axis(ring, th)) for ring, th in zip(local, thetas)]
    outer = [oy, ox, oy, ox]
    frames = [StaveFrame(min(x for x, _ in ring), max(x for x, _ in ring), o - t, o, None)
              for ring, o in zip(local, outer)]
    polys = [orient(Polygon(o), 1.0) for o in outlines]
    overlap = max(polys[i].intersection(polys[j]).area for i in range(PIECES) for j in range(i + 1, PIECES))
    if overlap > INTERFERENCE_TOLERANCE * min(p.area for p in polys):
        raise DesignError(f"the box's pieces overlap by {{overlap}}{at}", "hollow.corner",
                          figures={"overlap": area_figure(overlap)})
    p, q = ox - t, oy - t
    bore_ring = ((p, -q), (p, q), (-p, q), (-p, -q))
    bore = ring_moments(list(bore_ring))
    wall = rounded_rectangle_moments(fore_aft, athwartships, corner_radius) - bore
    return BoxSection(joint="box", corner=corner, fore_aft=fore_aft, athwartships=athwartships, thickness=t,
                      allowance=planing_allowance, corner_radius=corner_radius, rebate_depth=d,
                      outer_apothems=tuple(outer), widths=tuple(widths), frames=tuple(frames),
                      outlines=tuple(outlines), local_outlines=tuple(tuple(r) for r in local),
                      bore_outline=bore_ring, wall=wall, bore=bore, overlap=overlap)


def union_area(section: BoxSection) -> float:
    """The area the pieces cover together (shapely), for checking that they tile the wall."""
    return float(shapely.union_all([Polygon(o) for o in section.outlines]).area)


__all__ = ["BoxSection", "FACE", "KIND_NAMES", "PIECES", "PINWHEEL", "REBATED", "SIDE", "SIDES_BETWEEN_FACES", "evaluate_box",
           "piece_outlines", "rounded_rectangle_points", "union_area"]
