"""Cutter settings for the staves: table-saw passes, the router table, plain bevels.

Everything is read off the section's stave outline (the notch polygon), not
from a table. The stave blank is the rectangle w × t the outline was cut
from; the waste is blank − outline, and each face of the outline that is not
on the blank's boundary is one cut (a V face, or a bevelled edge).

The table-saw model is 2-D, in the cross-section seen along the feed: the
table is the line Y = 0, the fence the line X = 0, and the stave lies on the
table at X ≥ 0 with one side down and one side against the fence. The blade
is a straight line leaving the table at X = fence distance, tilted from
vertical; its fence-side face is the cut, the kerf is on its far side. A
pass is accepted only when the blade leans at most 45° and meets the table
on the stave's side of the fence, and its cut runs from the table to the end
of the cut without entering the wood that stays. The passes run in order: a
V's first pass is a kerf to the apex, the second cuts the V's wedge free. A
pass that cuts a piece free keeps the piece against the fence and must have
the offcut wholly on the blade's far side (away from the fence), so none is
trapped between blade and fence; the stave must still bear on the table.
Replaying the passes on the blank (:func:`stave_from_passes`) must give back
the stave outline.

Lengths mm, angles degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from enum import StrEnum
from itertools import permutations, product

import shapely
from shapely.affinity import affine_transform, translate
from shapely.geometry import LineString, Point, Polygon, box
from shapely.ops import polygonize, unary_union

from ..errors import DesignError
from ..section.properties import Section

MAX_TILT = 45.0  # degrees: common practice, most table saws tilt 0–45°
ROUTER_BIT_ANGLE = 90.0  # included angle of the V-bit, degrees
ANGLE_TOLERANCE = 1e-9  # degrees
LENGTH_TOLERANCE = 1e-9  # of the stave's size (w + t)


class Side(StrEnum):
    """A side of the stave blank, as the builder names it."""

    OUTER_FACE = "outer face"
    INNER_FACE = "inner face"
    NOTCHED_EDGE = "notched edge"
    SQUARE_EDGE = "square edge"
    EDGE_1 = "edge 1"  # plain bevel staves: the edge at smaller x, bevelled first
    EDGE_2 = "edge 2"


class Lean(StrEnum):
    """Which way the top of the blade leans, seen from the fence."""

    TOWARD_FENCE = "toward the fence"
    AWAY_FROM_FENCE = "away from the fence"
    UPRIGHT = "upright"


# Outward normal of each side in the blank's own frame (x across the width from the
# notched edge, y up from the inner face).
_NORMAL = {
    Side.OUTER_FACE: (0.0, 1.0), Side.INNER_FACE: (0.0, -1.0),
    Side.NOTCHED_EDGE: (-1.0, 0.0), Side.SQUARE_EDGE: (1.0, 0.0),
    Side.EDGE_1: (-1.0, 0.0), Side.EDGE_2: (1.0, 0.0),
}


@dataclass(frozen=True)
class SawPass:
    """One table-saw pass, making one face of the stave (lengths mm, angles degrees).

    ``makes``: "inner V face", "outer V face", or "bevel on edge 1/2";
    ``face_angle``: that face to the broad face. ``on_table`` / ``on_fence``:
    the stave's sides down on the table and against the fence. ``tilt``: blade
    from vertical, 0–45°; ``lean``: which way its top leans. ``fence_distance``:
    from the fence to where the blade's fence-side face meets the table. ``depth_along_blade``: from the table to the end of the
    cut, along the blade (the apex for a V face; the top of the stave for a
    through bevel). ``height``: the end of the cut above the table, square to
    it. ``table_contact`` / ``fence_contact``: how much of the stave still
    bears on the table and the fence behind the blade (0 = on a corner only).
    """

    makes: str
    face_angle: float
    on_table: Side
    on_fence: Side
    tilt: float
    lean: Lean
    fence_distance: float
    depth_along_blade: float
    height: float
    through: bool
    table_contact: float
    fence_contact: float


@dataclass(frozen=True)
class RouterSetup:
    """The V cut with a 90° V-bit in a router table (lengths mm, angles degrees).

    The stave rides on its notched edge, outer face against the fence, the bit's
    axis vertical. ``wedge_angle`` is the slope across the feed of the surface
    the stave must ride on so the V's bisector lines up with the bit's axis
    (0: flat on the table, the whole V in one pass, both faces at 45°).
    ``bit_height``: from that riding surface to the bit's tip, along the axis.
    ``fence_to_tip``: from the fence to the tip, square to the fence.
    ``least_bit_diameter``: the bit's cone must be at least this wide at its
    rim to reach from the tip to the farthest corner of the waste along its
    axis. ``edge_left``: notched edge the stave still rides on behind the bit
    (0 = none: support the outfeed side). ``wedge_high_side``: "at the fence"
    or "away from the fence"; None when flat.
    """

    one_pass_flat: bool
    wedge_angle: float
    wedge_high_side: str | None
    on_table: Side
    on_fence: Side
    bit_height: float
    fence_to_tip: float
    least_bit_diameter: float
    edge_left: float


@dataclass(frozen=True)
class CutterSettings:
    """How to cut one stave section: angles degrees, lengths mm.

    ``v_face_angles``: the V's faces to the broad face, (inner V face, outer V
    face) = (φ, 90° − φ); ``notch_depth`` along the width from the notched
    edge to the apex; ``apex_height`` above the inner face. ``bevel``: edge
    bevel off square for plain staves. ``saw``: the table-saw passes in the
    order to cut them. ``router``: the V-bit set-up (birdsmouth only).
    """

    staves: int
    joint: str
    v_face_angles: tuple[float, float] | None
    notch_depth: float | None
    apex_height: float | None
    bevel: float | None
    saw: tuple[SawPass, ...]
    router: RouterSetup | None

    @property
    def rip_fence_distance(self) -> float:
        """Fence distance of the last pass, the one that leaves the stave at its width, mm."""
        return self.saw[-1].fence_distance


# Geometry helpers ----------------------------------------------------------------


@dataclass(frozen=True)
class _Face:
    """One cut face in the blank's own frame: its two ends, the waste it bounds, its angle to the broad face."""

    start: tuple[float, float]
    end: tuple[float, float]
    waste: Polygon
    name: str
    angle: float  # to the broad face, degrees


@dataclass(frozen=True)
class _Placement:
    """Blank frame → saw frame: S = M·p + o, M orthogonal (a turn, or a turn and a flip end for end)."""

    m: tuple[float, float, float, float]  # a, b, d, e of [[a, b], [d, e]]
    o: tuple[float, float]

    def to_saw(self, geom):
        a, b, d, e = self.m
        return affine_transform(geom, (a, b, d, e, self.o[0], self.o[1]))

    def to_blank(self, geom):
        a, b, d, e = self.m  # inverse of an orthogonal map is its transpose
        ox, oy = self.o
        return affine_transform(geom, (a, d, b, e, -(a * ox + d * oy), -(b * ox + e * oy)))

    def vector_to_blank(self, v: tuple[float, float]) -> tuple[float, float]:
        a, b, d, e = self.m
        return (a * v[0] + d * v[1], b * v[0] + e * v[1])


def placement(on_table: Side, on_fence: Side, width: float, thickness: float) -> _Placement:
    """The blank w × t (mm) with ``on_table`` down on Y = 0 and ``on_fence`` against X = 0, at X ≥ 0."""
    nt, nf = _NORMAL[on_table], _NORMAL[on_fence]
    if abs(nt[0] * nf[0] + nt[1] * nf[1]) > 1e-12:
        raise ValueError(f"the {on_table} and the {on_fence} are not neighbouring sides")
    # M·nt = (0, −1), M·nf = (−1, 0); with B = [nt nf] orthogonal, M = A·Bᵀ.
    a = -nf[0]
    b = -nf[1]
    d = -nt[0]
    e = -nt[1]
    corners = [(0.0, 0.0), (width, 0.0), (width, thickness), (0.0, thickness)]
    xs = [a * x + b * y for x, y in corners]
    ys = [d * x + e * y for x, y in corners]
    return _Placement((a, b, d, e), (-min(xs), -min(ys)))


def _size(width: float, thickness: float) -> float:
    return width + thickness


def _on_boundary(rect: Polygon, p, tol: float) -> bool:
    return rect.exterior.distance(Point(p)) <= tol


def _faces(section: Section) -> tuple[Polygon, Polygon, list[_Face]]:
    """The blank and the cut faces of the stave outline, both in the blank's own frame."""
    frame = section.frame
    width, thickness = frame.width, frame.outer - frame.inner
    tol = LENGTH_TOLERANCE * _size(width, thickness)
    rect = box(0.0, 0.0, width, thickness)
    outline = translate(Polygon(section.stave_outline), -frame.x_notch_edge, -frame.inner)
    ring = list(outline.exterior.coords)[:-1]
    n = len(ring)
    # Edges of the outline that leave the blank's boundary are cuts; merge collinear runs.
    cut_edges = []
    for i in range(n):
        p, q = ring[i], ring[(i + 1) % n]
        mid = ((p[0] + q[0]) / 2, (p[1] + q[1]) / 2)
        if not _on_boundary(rect, mid, tol):
            cut_edges.append((p, q))
    merged: list[tuple[tuple[float, float], tuple[float, float]]] = []
    for p, q in cut_edges:
        if merged:
            p0, q0 = merged[-1]
            cross = (q0[0] - p0[0]) * (q[1] - p[1]) - (q0[1] - p0[1]) * (q[0] - p[0])
            if q0 == p and abs(cross) <= tol * _size(width, thickness):
                merged[-1] = (p0, q)
                continue
        merged.append((p, q))
    waste = rect.difference(outline)
    pieces = [g for g in getattr(waste, "geoms", [waste]) if g.area > tol * tol]
    faces = []
    for p, q in merged:
        seg = LineString([p, q])
        touching = [g for g in pieces if g.boundary.intersection(seg.buffer(tol)).length > 0.5 * seg.length]
        if len(touching) != 1:
            raise DesignError("cutter settings: a face of the stave outline borders no single piece of waste",
                              "hollow.joint")
        dx, dy = q[0] - p[0], q[1] - p[1]
        angle = math.degrees(math.atan2(abs(dy), abs(dx)))
        faces.append(_Face(p, q, touching[0], "", angle))
    return rect, outline, faces


def _name_faces(section: Section, faces: list[_Face]) -> list[_Face]:
    """Name the faces, inner V face first (or edge 1's bevel first)."""
    if section.notch is None:
        faces = sorted(faces, key=lambda f: min(f.start[0], f.end[0]))
        return [replace(f, name=f"bevel on {side}") for f, side in zip(faces, (Side.EDGE_1, Side.EDGE_2))]
    apex = _apex(faces)
    if apex is None:
        raise DesignError("cutter settings: the V faces do not meet at an apex inside the stave", "hollow.joint")
    named = []
    for f in faces:
        other = f.end if f.start == apex else f.start
        named.append(replace(f, name="inner V face" if other[1] < apex[1] else "outer V face"))
    return sorted(named, key=lambda f: f.name != "inner V face")


def _apex(faces: list[_Face]) -> tuple[float, float] | None:
    """The end the two V faces share, or None."""
    if len(faces) != 2:
        return None
    a, b = faces
    for e in (a.start, a.end):
        if e in (b.start, b.end):
            return e
    return None


# Table saw -----------------------------------------------------------------------


@dataclass(frozen=True)
class _Candidate:
    face: _Face
    on_table: Side
    on_fence: Side
    tilt: float
    lean: Lean
    fence_distance: float
    depth: float
    height: float
    through: bool


def _sides(section: Section) -> tuple[Side, ...]:
    if section.notch is None:
        return (Side.OUTER_FACE, Side.INNER_FACE, Side.EDGE_1, Side.EDGE_2)
    return (Side.OUTER_FACE, Side.INNER_FACE, Side.NOTCHED_EDGE, Side.SQUARE_EDGE)


def _outer_half_plane(foot: tuple[float, float], tilt: float, lean: Lean, reach: float) -> Polygon:
    """The side of the blade line away from the fence at the table (the kerf and waste side), saw frame."""
    s = -1.0 if lean is Lean.TOWARD_FENCE else 1.0
    th = math.radians(tilt)
    u = (s * math.sin(th), math.cos(th))  # up the blade
    n = (math.cos(th), -s * math.sin(th))  # away from the fence
    fx, fy = foot
    return Polygon([
        (fx - reach * u[0], fy - reach * u[1]), (fx + reach * u[0], fy + reach * u[1]),
        (fx + reach * (u[0] + n[0]), fy + reach * (u[1] + n[1])),
        (fx + reach * (n[0] - u[0]), fy + reach * (n[1] - u[1])),
    ])


def _try_setup(face: _Face, outline: Polygon, on_table: Side, on_fence: Side, width: float,
               thickness: float) -> _Candidate | None:
    """The pass making ``face`` with the stave placed so, or None when that set-up cannot make it."""
    size = _size(width, thickness)
    tol = LENGTH_TOLERANCE * size
    place = placement(on_table, on_fence, width, thickness)
    a = place.to_saw(Point(face.start))
    b = place.to_saw(Point(face.end))
    (ax, ay), (bx, by) = (a.x, a.y), (b.x, b.y)
    if abs(ay - by) <= tol:
        return None  # the face lies flat on the table: no blade makes it
    top, low = ((ax, ay), (bx, by)) if ay > by else ((bx, by), (ax, ay))
    ux, uy = top[0] - low[0], top[1] - low[1]
    tilt = math.degrees(math.atan2(abs(ux), uy))
    if tilt > MAX_TILT + ANGLE_TOLERANCE:
        return None
    foot = (low[0] - low[1] * ux / uy, 0.0)
    if foot[0] <= tol:
        return None  # the blade would meet the table at or behind the fence
    lean = Lean.UPRIGHT if abs(ux) <= tol else (Lean.TOWARD_FENCE if ux < 0 else Lean.AWAY_FROM_FENCE)
    kept = place.to_saw(outline)
    cut = LineString([foot, top])
    if cut.intersection(kept.buffer(-10 * tol)).length > tol:
        return None  # on its way to the end of the cut the blade would run through the stave
    rect = box(0.0, 0.0, width, thickness)
    through = _on_boundary(rect, place.to_blank(Point(top)).coords[0], tol)
    return _Candidate(face, on_table, on_fence, tilt, lean, foot[0], math.dist(foot, top), top[1], through)


def _candidates(section: Section, face: _Face, outline: Polygon, width: float, thickness: float) -> list[_Candidate]:
    """Every placement of the stave from which a blade within 45° of vertical makes ``face``."""
    found = []
    sides = _sides(section)
    for on_table in sides:
        for on_fence in sides:
            nt, nf = _NORMAL[on_table], _NORMAL[on_fence]
            if nt[0] * nf[0] + nt[1] * nf[1] != 0:
                continue
            c = _try_setup(face, outline, on_table, on_fence, width, thickness)
            if c is not None:
                found.append(c)
    if not found:
        raise DesignError(f"no table-saw set-up cuts the {face.name} with the blade within {MAX_TILT:.0f}° of "
                          "vertical", "hollow.joint")
    return found


def _contacts(stock: Polygon, place: _Placement, size: float) -> tuple[float, float]:
    """Lengths (mm) of the stock's sides lying on the table (Y = 0) and on the fence (X = 0)."""
    tol = LENGTH_TOLERANCE * size
    ring = list(place.to_saw(stock).exterior.coords)
    on_table = on_fence = 0.0
    for (x0, y0), (x1, y1) in zip(ring, ring[1:]):
        if abs(y0) <= tol and abs(y1) <= tol:
            on_table += abs(x1 - x0)
        if abs(x0) <= tol and abs(x1) <= tol:
            on_fence += abs(y1 - y0)
    return (on_table if on_table > tol else 0.0), (on_fence if on_fence > tol else 0.0)


def _as_pass(c: _Candidate) -> SawPass:
    return SawPass(makes=c.face.name, face_angle=c.face.angle, on_table=c.on_table, on_fence=c.on_fence,
                   tilt=c.tilt, lean=c.lean, fence_distance=c.fence_distance, depth_along_blade=c.depth,
                   height=c.height, through=c.through, table_contact=0.0, fence_contact=0.0)


def _saw_passes(section: Section, faces: list[_Face], outline: Polygon, width: float,
                thickness: float) -> tuple[SawPass, ...]:
    """The passes, in order, and the set-up of each.

    Required: the passes, run in order, leave exactly the stave outline; a pass
    that cuts a piece free has it on the blade's far side from the fence; the
    stave still bears on the table behind the blade. Then
    preferred, in turn: passes face down (steadier), blades leaning away from the
    fence (common practice), the most bearing on table and fence in the last pass.
    """
    size = _size(width, thickness)
    tol = LENGTH_TOLERANCE * size
    options = [_candidates(section, f, outline, width, thickness) for f in faces]
    best = None
    for order in permutations(range(len(faces))):
        for combo in product(*(options[i] for i in order)):
            done = []
            ok = True
            for k, c in enumerate(combo):
                p = _as_pass(c)
                try:
                    stock = stave_from_passes([_as_pass(x) for x in combo[:k + 1]], width, thickness)
                except ValueError:  # an offcut trapped against the fence, or no clear keeper
                    ok = False
                    break
                table, fence = _contacts(stock, placement(p.on_table, p.on_fence, width, thickness), size)
                if table <= tol:
                    ok = False
                    break
                done.append(replace(p, table_contact=table, fence_contact=fence))
            if not ok or stock.symmetric_difference(outline).area > LENGTH_TOLERANCE * outline.area:
                continue
            last = done[-1]
            score = (sum(p.on_table in (Side.OUTER_FACE, Side.INNER_FACE) for p in done),
                     sum(p.lean is not Lean.TOWARD_FENCE for p in done),
                     round(min(last.table_contact, last.fence_contact) / size, 9),
                     round((last.table_contact + last.fence_contact) / size, 9))
            if best is None or score > best[0]:
                best = (score, tuple(done))
    if best is None:
        raise DesignError("no order of table-saw passes keeps every offcut clear of the fence with the stave "
                          "bearing on the table", "hollow.joint")
    return best[1]


# Router table --------------------------------------------------------------------


def _router(section: Section, faces: list[_Face], outline: Polygon, width: float, thickness: float) -> RouterSetup:
    size = _size(width, thickness)
    apex = _apex(faces)
    on_table, on_fence = Side.NOTCHED_EDGE, Side.OUTER_FACE
    place = placement(on_table, on_fence, width, thickness)
    tip = place.to_saw(Point(apex)).coords[0]
    units = []
    for f in faces:
        other = f.end if f.start == apex else f.start
        q = place.to_saw(Point(other)).coords[0]
        length = math.dist(tip, q)
        units.append(((q[0] - tip[0]) / length, (q[1] - tip[1]) / length))
    included = math.degrees(math.acos(max(-1.0, min(1.0, units[0][0] * units[1][0] + units[0][1] * units[1][1]))))
    if abs(included - ROUTER_BIT_ANGLE) > 1e-6:
        raise DesignError(f"the V is {included:.3f}°, not the {ROUTER_BIT_ANGLE:.0f}° of a V-bit", "hollow.joint")
    bisector = (units[0][0] + units[1][0], units[0][1] + units[1][1])  # out of the V, toward the table
    wedge = math.degrees(math.atan2(abs(bisector[0]), -bisector[1]))
    flat = wedge <= ANGLE_TOLERANCE
    # Bisector leaning toward the fence: turn the stave the other way, so the riding surface
    # rises away from the fence.
    high = None if flat else ("away from the fence" if bisector[0] < 0 else "at the fence")
    # Riding surface: the blank's notched edge, the line Y = 0 in this frame.
    b_len = math.hypot(*bisector)
    along = tip[1] / (-bisector[1] / b_len)
    waste = place.to_saw(faces[0].waste)
    # A 90° cone holds the points no farther from its axis than from its tip's plane, out to its
    # rim (half the diameter from the tip along the axis): the rim must reach the farthest waste.
    bx, by = bisector[0] / b_len, bisector[1] / b_len
    half = max((x - tip[0]) * bx + (y - tip[1]) * by for x, y in waste.exterior.coords)
    table_left, _ = _contacts(outline, place, size)
    return RouterSetup(one_pass_flat=flat, wedge_angle=0.0 if flat else wedge, wedge_high_side=high,
                       on_table=on_table, on_fence=on_fence, bit_height=along, fence_to_tip=tip[0],
                       least_bit_diameter=2 * half, edge_left=table_left)


# Public --------------------------------------------------------------------------


def cutter_settings(section: Section) -> CutterSettings:
    """Table-saw passes, router set-up and angles for the staves of ``section``, read off its outline."""
    _, outline, faces = _faces(section)
    width, thickness = section.frame.width, section.frame.outer - section.frame.inner
    if len(faces) != 2:
        raise DesignError(f"cutter settings: the stave outline has {len(faces)} cut faces, not 2", "hollow.joint")
    faces = _name_faces(section, faces)
    saw = _saw_passes(section, faces, outline, width, thickness)
    if section.notch is None:
        bevel = 90.0 - faces[0].angle  # off square; both edges alike
        return CutterSettings(section.staves, section.joint, None, None, None, bevel, saw, None)
    apex = _apex(faces)
    return CutterSettings(
        staves=section.staves, joint=section.joint,
        v_face_angles=(faces[0].angle, faces[1].angle),
        notch_depth=apex[0], apex_height=apex[1], bevel=None, saw=saw,
        router=_router(section, faces, outline, width, thickness),
    )


class TrappedOffcut(ValueError):
    """A pass would cut a piece free between the blade and the fence."""


def stave_from_passes(passes, width: float, thickness: float,
                      origin: tuple[float, float] = (0.0, 0.0)) -> Polygon:
    """The stave the table-saw ``passes`` leave of a blank ``width`` × ``thickness`` (mm).

    The passes run in order, each set up as it says (side on the table, side on
    the fence), its blade drawn from the table at the fence distance, tilted,
    for the depth along the blade. A pass that cuts a piece free keeps the piece
    riding against the fence, on the blade's fence side; the rest falls away,
    and must lie wholly on the blade's far side (else TrappedOffcut). Returned
    in the blank's frame (x from the notched edge, y up from the inner face),
    moved by ``origin``.
    """
    size = _size(width, thickness)
    eps = LENGTH_TOLERANCE * size
    stock = box(0.0, 0.0, width, thickness)
    kerfs = []
    for p in passes:
        place = placement(p.on_table, p.on_fence, width, thickness)
        s = -1.0 if p.lean is Lean.TOWARD_FENCE else 1.0
        th = math.radians(p.tilt)
        u = (s * math.sin(th), math.cos(th))
        foot = (p.fence_distance, 0.0)
        # The blade reaches a hair past the end of the cut, so cuts that should meet do.
        start = (foot[0] - eps * u[0], -eps * u[1])
        end = (foot[0] + (p.depth_along_blade + eps) * u[0], (p.depth_along_blade + eps) * u[1])
        cut = place.to_blank(LineString([start, end])).intersection(stock)
        if cut.is_empty or cut.length <= eps:
            continue
        kerfs.append(cut)
        pieces = list(polygonize(unary_union([stock.exterior] + [k.intersection(stock) for k in kerfs])))
        if len(pieces) < 2:
            continue  # a kerf that frees nothing yet
        part = max(getattr(cut, "geoms", [cut]), key=lambda g: g.length)
        mid = part.interpolate(0.5, normalized=True)
        toward_fence = place.vector_to_blank((-math.cos(th), s * math.sin(th)))
        probe = Point(mid.x + 1e3 * eps * toward_fence[0], mid.y + 1e3 * eps * toward_fence[1])
        kept = [g for g in pieces if g.contains(probe)]
        if len(kept) != 1:
            raise ValueError("cannot tell which piece rides against the fence")
        far_side = place.to_blank(_outer_half_plane(foot, p.tilt, p.lean, 10 * size))
        for g in pieces:
            if g is not kept[0] and g.difference(far_side).area > eps * size:
                raise TrappedOffcut(f"the pass making the {p.makes} frees a piece between the blade and the fence")
        stock = kept[0]
        kerfs = [k for k in kerfs if k.intersection(stock.buffer(-eps)).length > eps]
    return translate(shapely.normalize(stock), *origin)
