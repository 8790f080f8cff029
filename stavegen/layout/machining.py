"""Cutter settings for the staves: table-saw passes with a real kerf, the router table, plain bevels.

The shop model (docs/conventions.md, "How the staves are cut"): every stave
segment is first made a *blank*, a parallel piece ``width`` × ``thickness``
(its widest finished width plus the square edge's allowance, and the stave
thickness). The notch (or a plain stave's first bevel) is cut into the blank
with settings fixed for the whole blank; only then is the square edge (or the
second bevel) taken to the tapered line. So every setting here is one setting
for a whole segment, read off the blank and the notch polygon, not a table.

Table saw, 2-D in the cross-section seen along the feed: the table is the
line Y = 0, the fence the line X = 0; the blank lies on the table at X ≥ 0
with one side down and one side against the fence. The blade is a slab
``kerf`` thick (flat-top teeth: its top edge is square to its faces), tilted
``tilt`` from vertical, its top leaning toward or away from the fence.
``fence_distance`` runs from the fence to where the blade's fence-side face
meets the table; ``depth_along_blade`` from the table along that face to the
blade's top edge; ``height`` is the blade's highest point above the table.
Each pass puts the face of the slab that makes the stave's new face on that
face, so the kerf always falls on the waste side. A pass that cuts a piece
free keeps the piece riding against the fence; the offcut must lie wholly on
the blade's far side (none trapped between blade and fence), and the stave
must still bear on the table. :func:`replay` runs the passes on the blank as
slabs, in order, and must give back the stave the section needs.

Router table: a 90° V-bit is a cone; the stave rides on its notched edge with
the outer face against the fence, on a wedge when the V's bisector is not
square to the edge. Lengths mm, angles degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from enum import StrEnum
from itertools import permutations, product

import shapely
from shapely.affinity import affine_transform, translate
from shapely.geometry import Point, Polygon, box

from ..errors import DesignError
from ..section.notch import Notch, bevel_angle, v_face_angles
from ..section.properties import Section

MAX_TILT = 45.0  # degrees: common practice, most table saws tilt 0–45°
ROUTER_BIT_ANGLE = 90.0  # included angle of the V-bit, degrees
ANGLE_TOLERANCE = 1e-9  # degrees
LENGTH_TOLERANCE = 1e-9  # of the blank's size (width + thickness)
SAME_SETTING = 1e-6  # mm: settings closer than this are one setting (they differ by roundoff only)


class Side(StrEnum):
    """A side of the stave blank, as the builder names it."""

    OUTER_FACE = "outer face"
    INNER_FACE = "inner face"
    NOTCHED_EDGE = "notched edge"
    SQUARE_EDGE = "square edge"
    EDGE_1 = "edge 1"  # plain bevel staves: the straight edge, bevelled on the blank
    EDGE_2 = "edge 2"  # plain bevel staves: the tapered edge, bevelled to the line last


class Lean(StrEnum):
    """Which way the top of the blade leans, seen from the fence."""

    TOWARD_FENCE = "toward the fence"
    AWAY_FROM_FENCE = "away from the fence"
    UPRIGHT = "upright"


class BladeSide(StrEnum):
    """On which side of the blade the stave's new face lies (the kerf goes on the other)."""

    FENCE = "fence side"
    FAR = "far side"


# Outward normal of each side in the blank's own frame (x across the width from the
# notched edge, y up from the inner face).
_NORMAL = {
    Side.OUTER_FACE: (0.0, 1.0), Side.INNER_FACE: (0.0, -1.0),
    Side.NOTCHED_EDGE: (-1.0, 0.0), Side.SQUARE_EDGE: (1.0, 0.0),
    Side.EDGE_1: (-1.0, 0.0), Side.EDGE_2: (1.0, 0.0),
}
# The sides whose place depends on the blank's width: a set-up against them changes with the blank.
WIDTH_SIDES = (Side.SQUARE_EDGE, Side.EDGE_2)


@dataclass(frozen=True)
class Blank:
    """The piece the notch passes are made on: parallel, ``width`` × ``thickness`` (mm)."""

    width: float
    thickness: float


@dataclass(frozen=True)
class SawPass:
    """One table-saw pass, making one face of the stave (lengths mm, angles degrees).

    ``makes``: "inner V face", "outer V face", or "bevel on edge 1"; ``face_angle``:
    that face to the broad face. ``on_table`` / ``on_fence``: the blank's sides down on
    the table and against the fence. ``tilt``: blade from vertical, 0–45°; ``lean``:
    which way its top leans. ``fence_distance``: from the fence to where the blade's
    fence-side face meets the table. ``depth_along_blade``: from the table along the
    fence-side face to the blade's top edge. ``height``: the blade's highest point above
    the table. ``kerf``: the blade's thickness. ``stave_side``: the side of the blade the
    stave's new face lies on (the kerf is on the other, in the waste). ``through``: the
    cut runs out through the blank rather than stopping at the apex.
    ``table_contact`` / ``fence_contact``: how much of the stave still bears on the table
    and the fence behind the blade (0 = on a corner only).
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
    kerf: float
    stave_side: BladeSide
    through: bool
    table_contact: float = 0.0
    fence_contact: float = 0.0

    @property
    def follows_blank_width(self) -> bool:
        """True when the set-up is against, or stands on, a side that the blank's width places."""
        return self.on_fence in WIDTH_SIDES or self.on_table in WIDTH_SIDES

    @property
    def leaves_wood_when_fence_is(self) -> str:
        """Which way a fence setting errs safe: "nearer" (blade toward the fence) or "farther"."""
        return "nearer" if self.stave_side is BladeSide.FAR else "farther"


@dataclass(frozen=True)
class RouterSetup:
    """The V cut with a 90° V-bit in a router table (lengths mm, angles degrees).

    The stave rides on its notched edge, outer face against the fence, the bit's
    axis vertical. ``wedge_angle`` is the slope across the feed of the surface
    the stave must ride on so the V's bisector lines up with the bit's axis
    (0: flat on the table, the whole V in one pass, both faces at 45°).
    ``bit_height``: from that riding surface to the bit's tip, along the axis.
    ``fence_to_tip``: from the fence to the tip, square to the fence.
    ``least_bit_diameter``: the bit's rim must be at least this wide to reach
    the waste's corner farthest from its axis (inside the V the cone holds the
    rest; past the rim the bit's body is as wide as the rim). ``edge_left``: notched edge the stave still rides on behind the bit
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
    """How to cut the notch (or the first bevel) into one blank: angles degrees, lengths mm.

    ``v_face_angles``: the V's faces to the broad face, (inner V face, outer V
    face) = (φ, 90° − φ); ``notch_depth`` along the width from the notched
    edge to the apex; ``apex_height`` above the inner face. ``bevel``: edge
    bevel off square for plain staves. ``saw``: the table-saw passes in the
    order to cut them. ``router``: the V-bit set-up (birdsmouth only).
    ``blank``: the piece they are set for.
    """

    staves: int
    joint: str
    v_face_angles: tuple[float, float] | None
    notch_depth: float | None
    apex_height: float | None
    bevel: float | None
    saw: tuple[SawPass, ...]
    router: RouterSetup | None
    blank: Blank

    @property
    def rip_fence_distance(self) -> float:
        """Fence distance of the pass that rips the blank parallel: its width."""
        return self.blank.width


# Geometry in the blank's frame ------------------------------------------------------


@dataclass(frozen=True)
class Cut:
    """What the passes must take off the blank: the notch (V apex and φ) or edge 1's bevel, for N staves."""

    staves: int
    notch: Notch | None
    apex_x: float | None = None  # apex from the notched edge (mm), birdsmouth only
    box: bool = False  # a box spar's piece: square edges, no bevel
    rebate: tuple[float, float] | None = None  # a box face's rebate along edge 1: (depth, width), mm

    @property
    def phi(self) -> float:
        return 2 * math.pi / self.staves

    def stave(self, blank: Blank) -> Polygon:
        """The blank once the notch (or edge 1's bevel) is cut: the blank's frame, counter-clockwise."""
        rect = box(0.0, 0.0, blank.width, blank.thickness)
        if self.box:  # the rebate along edge 1, on the inner side: depth up from the inner face, width from the edge
            if self.rebate is None:
                return shapely.normalize(rect)
            depth, width = self.rebate
            return shapely.normalize(rect.difference(box(0.0, 0.0, width, depth)))
        if self.notch is None:
            run = blank.thickness * math.tan(math.pi / self.staves)
            return shapely.normalize(Polygon([(run, 0.0), (blank.width, 0.0), (blank.width, blank.thickness),
                                              (0.0, blank.thickness)]))
        return shapely.normalize(rect.difference(v_wedge(self.phi, (self.apex_x, self.notch.apex_height),
                                                         blank.width + blank.thickness)))


def cut_of(section: Section) -> Cut:
    """The cut a section's stave needs, in the blank's frame (notched edge at x = 0, inner face at y = 0)."""
    if section.joint == "box":
        return Cut(section.staves, None, box=True, rebate=section.rebate)
    if section.notch is None:
        return Cut(section.staves, None)
    return Cut(section.staves, section.notch, section.frame.apex[0] - section.frame.x_notch_edge)


def v_wedge(phi: float, apex: tuple[float, float], size: float) -> Polygon:
    """The 90° region the neighbour occupies around the apex, large enough to cover a blank of ``size``."""
    px, py = apex
    reach = 4 * size
    d1 = (-math.cos(phi), -math.sin(phi))  # along the neighbour's inner face
    d2 = (-math.sin(phi), math.cos(phi))  # along the neighbour's end face
    return Polygon([
        (px, py), (px + reach * d1[0], py + reach * d1[1]),
        (px + reach * (d1[0] + d2[0]), py + reach * (d1[1] + d2[1])), (px + reach * d2[0], py + reach * d2[1]),
    ])


@dataclass(frozen=True)
class _Face:
    """One cut face in the blank's frame: its two ends and its angle to the broad face (degrees)."""

    start: tuple[float, float]
    end: tuple[float, float]
    name: str
    angle: float


def _size(blank: Blank) -> float:
    return blank.width + blank.thickness


def _on_boundary(rect: Polygon, p, tol: float) -> bool:
    return rect.exterior.distance(Point(p)) <= tol


def _faces(cut: Cut, blank: Blank) -> tuple[Polygon, list[_Face]]:
    """The stave after the cut and its cut faces (edges not on the blank's boundary), in the blank's frame."""
    tol = LENGTH_TOLERANCE * _size(blank)
    rect = box(0.0, 0.0, blank.width, blank.thickness)
    outline = cut.stave(blank)
    ring = list(outline.exterior.coords)[:-1]
    edges = []
    for p, q in zip(ring, ring[1:] + ring[:1]):
        if not _on_boundary(rect, ((p[0] + q[0]) / 2, (p[1] + q[1]) / 2), tol):
            edges.append((p, q))
    merged: list[tuple[tuple[float, float], tuple[float, float]]] = []
    for p, q in edges:
        if merged and merged[-1][1] == p:
            p0, q0 = merged[-1]
            cross = (q0[0] - p0[0]) * (q[1] - p[1]) - (q0[1] - p0[1]) * (q[0] - p[0])
            if abs(cross) <= tol * _size(blank):
                merged[-1] = (p0, q)
                continue
        merged.append((p, q))
    faces = [_Face(p, q, "", math.degrees(math.atan2(abs(q[1] - p[1]), abs(q[0] - p[0])))) for p, q in merged]
    return outline, _name_faces(cut, faces)


def _name_faces(cut: Cut, faces: list[_Face]) -> list[_Face]:
    if cut.box:
        if len(faces) != (2 if cut.rebate else 0):
            raise DesignError(f"cutter settings: the rebate left {len(faces)} cut faces, not 2", "hollow.corner")
        return sorted((replace(f, name="rebate's cheek" if f.angle > 45 else "rebate's floor") for f in faces),
                      key=lambda f: f.name)
    if cut.notch is None:
        if len(faces) != 1:
            raise DesignError(f"cutter settings: edge 1's bevel left {len(faces)} cut faces, not 1", "hollow.joint")
        return [replace(faces[0], name="bevel on edge 1")]
    if len(faces) != 2:
        raise DesignError(f"cutter settings: the notch left {len(faces)} cut faces, not 2", "hollow.joint")
    apex = (cut.apex_x, cut.notch.apex_height)
    named = []
    for f in faces:
        far = f.end if math.dist(f.start, apex) < math.dist(f.end, apex) else f.start
        named.append(replace(f, name="inner V face" if far[1] < apex[1] else "outer V face"))
    return sorted(named, key=lambda f: f.name != "inner V face")


# Placing the blank on the saw --------------------------------------------------------


@dataclass(frozen=True)
class _Placement:
    """Blank frame → saw frame: S = M·p + o, M orthogonal."""

    m: tuple[float, float, float, float]  # a, b, d, e of [[a, b], [d, e]]
    o: tuple[float, float]

    def to_saw(self, geom):
        a, b, d, e = self.m
        return affine_transform(geom, (a, b, d, e, self.o[0], self.o[1]))

    def to_blank(self, geom):
        a, b, d, e = self.m  # the inverse of an orthogonal map is its transpose
        ox, oy = self.o
        return affine_transform(geom, (a, d, b, e, -(a * ox + d * oy), -(b * ox + e * oy)))

    def point(self, p: tuple[float, float]) -> tuple[float, float]:
        a, b, d, e = self.m
        return (a * p[0] + b * p[1] + self.o[0], d * p[0] + e * p[1] + self.o[1])


def placement(on_table: Side, on_fence: Side, blank: Blank) -> _Placement:
    """The blank with ``on_table`` down on Y = 0 and ``on_fence`` against X = 0, at X ≥ 0."""
    nt, nf = _NORMAL[on_table], _NORMAL[on_fence]
    if abs(nt[0] * nf[0] + nt[1] * nf[1]) > 1e-12:
        raise ValueError(f"the {on_table} and the {on_fence} are not neighbouring sides")
    a, b, d, e = -nf[0], -nf[1], -nt[0], -nt[1]  # M·nt = (0, −1), M·nf = (−1, 0)
    corners = [(0.0, 0.0), (blank.width, 0.0), (blank.width, blank.thickness), (0.0, blank.thickness)]
    xs = [a * x + b * y for x, y in corners]
    ys = [d * x + e * y for x, y in corners]
    return _Placement((a, b, d, e), (-min(xs), -min(ys)))


def _lean_sign(lean: Lean) -> float:
    return -1.0 if lean is Lean.TOWARD_FENCE else 1.0


def blade_axes(tilt: float, lean: Lean) -> tuple[tuple[float, float], tuple[float, float]]:
    """(up the blade, away from the fence across the blade), unit vectors in the saw frame."""
    s = _lean_sign(lean)
    th = math.radians(tilt)
    return (s * math.sin(th), math.cos(th)), (math.cos(th), -s * math.sin(th))


def blade_slab(p: SawPass, reach_below: float) -> Polygon:
    """The blade's cross-section in the saw frame: a slab ``kerf`` thick from below the table to its top edge."""
    u, n = blade_axes(p.tilt, p.lean)
    fx = p.fence_distance
    top = p.depth_along_blade
    bottom = -reach_below
    corners = [(fx + bottom * u[0], bottom * u[1]), (fx + top * u[0], top * u[1])]
    corners += [(x + p.kerf * n[0], y + p.kerf * n[1]) for x, y in reversed(corners)]
    return Polygon(corners)


# Table saw ---------------------------------------------------------------------------


def _strip(fence_distance: float, u, n, kerf: float, reach: float) -> Polygon:
    """The band the blade's slab would sweep if it had no top: between its two faces, saw frame."""
    f = (fence_distance, 0.0)
    pts = [(f[0] - reach * u[0], f[1] - reach * u[1]), (f[0] + reach * u[0], f[1] + reach * u[1])]
    pts += [(x + kerf * n[0], y + kerf * n[1]) for x, y in reversed(pts)]
    return Polygon(pts)


def _pass_for(face: _Face, on_table: Side, on_fence: Side, blank: Blank, kerf: float,
              kept: Polygon) -> SawPass | None:
    """The pass making ``face`` with the blank placed so, or None when that set-up cannot make it."""
    size = _size(blank)
    tol = LENGTH_TOLERANCE * size
    place = placement(on_table, on_fence, blank)
    a, b = place.point(face.start), place.point(face.end)
    if abs(a[1] - b[1]) <= tol:
        return None  # the face lies flat on the table: no blade makes it
    top, low = (a, b) if a[1] > b[1] else (b, a)
    ux, uy = top[0] - low[0], top[1] - low[1]
    tilt = math.degrees(math.atan2(abs(ux), uy))
    if tilt > MAX_TILT + ANGLE_TOLERANCE:
        return None
    lean = Lean.UPRIGHT if abs(ux) <= tol else (Lean.TOWARD_FENCE if ux < 0 else Lean.AWAY_FROM_FENCE)
    if lean is Lean.UPRIGHT:
        tilt = 0.0
    foot = low[0] - low[1] * ux / uy  # where the face's line meets the table
    u, n = blade_axes(tilt, lean)
    # Which side of the face the stave lies on: probe a hair off the face's middle, across it.
    saw_kept = place.to_saw(kept)
    mid = ((a[0] + b[0]) / 2, (a[1] + b[1]) / 2)
    probe = Point(mid[0] + 1e3 * tol * n[0], mid[1] + 1e3 * tol * n[1])
    stave_side = BladeSide.FAR if saw_kept.contains(probe) else BladeSide.FENCE
    cos_t = math.cos(math.radians(tilt))
    fence_distance = foot - (kerf / cos_t if stave_side is BladeSide.FAR else 0.0)
    if fence_distance <= tol:
        return None  # the blade would meet the table at or behind the fence
    # The top edge is square to the blade through the end of the cut on the stave's side.
    depth = (top[0] - fence_distance) * u[0] + top[1] * u[1]
    rect = box(0.0, 0.0, blank.width, blank.thickness)
    through = _on_boundary(rect, place.to_blank(Point(top)).coords[0], tol)
    if through:  # a through cut: the blade's top edge just clears the blank where the slab passes
        strip = _strip(fence_distance, u, n, kerf, 4 * size)
        inside = place.to_saw(rect).intersection(strip)
        depth = max(depth, max((x - fence_distance) * u[0] + y * u[1] for x, y in inside.exterior.coords))
    corner_a = (fence_distance + depth * u[0], depth * u[1])
    corner_b = (corner_a[0] + kerf * n[0], corner_a[1] + kerf * n[1])
    trial = SawPass(makes=face.name, face_angle=face.angle, on_table=on_table, on_fence=on_fence, tilt=tilt,
                    lean=lean, fence_distance=fence_distance, depth_along_blade=depth,
                    height=max(corner_a[1], corner_b[1]), kerf=kerf, stave_side=stave_side, through=through)
    if blade_slab(trial, size).intersection(saw_kept.buffer(-10 * tol)).area > tol * tol:
        return None  # the slab would run into the wood that stays
    return trial


def _candidates(face: _Face, sides: tuple[Side, ...], blank: Blank, kerf: float, kept: Polygon) -> list[SawPass]:
    found = []
    for on_table in sides:
        for on_fence in sides:
            nt, nf = _NORMAL[on_table], _NORMAL[on_fence]
            if nt[0] * nf[0] + nt[1] * nf[1] != 0:
                continue
            p = _pass_for(face, on_table, on_fence, blank, kerf, kept)
            if p is not None:
                found.append(p)
    return found


class TrappedOffcut(ValueError):
    """A pass would cut a piece free between the blade and the fence."""


def replay(passes, blank: Blank, stock: Polygon | None = None, ride_fence: bool = False) -> Polygon:
    """The piece the table-saw ``passes`` leave of ``blank`` (or of ``stock``, a piece already cut from it, in the
    blank's frame), in the blank's frame.

    Each pass, set up as it says, removes its blade's slab. When a pass frees a
    piece, the piece on the blade's fence side rides on (it is kept) and the rest
    falls away; a freed piece on the fence side other than the kept one raises
    TrappedOffcut. ``ride_fence`` (a box face's rebate, whose piece reaches over
    the blade's top past its plane): when the blade's plane does not part the
    pieces so, the one piece bearing on the fence is kept, provided every other
    lies wholly on the blade's far side.
    """
    size = _size(blank)
    eps = LENGTH_TOLERANCE * size
    stock = box(0.0, 0.0, blank.width, blank.thickness) if stock is None else stock
    for p in passes:
        place = placement(p.on_table, p.on_fence, blank)
        slab = place.to_blank(blade_slab(p, size))
        rest = stock.difference(slab)
        pieces = [g for g in getattr(rest, "geoms", [rest]) if g.area > eps * size]
        if not pieces:
            raise ValueError(f"the pass making the {p.makes} leaves nothing of the blank")
        if len(pieces) == 1:
            stock = pieces[0]
            continue
        u, n = blade_axes(p.tilt, p.lean)
        fence_side = []
        for g in pieces:
            q = place.point(g.representative_point().coords[0])
            if (q[0] - p.fence_distance) * n[0] + q[1] * n[1] < 0:
                fence_side.append(g)
        if len(fence_side) != 1 and ride_fence:
            fence_side = _riding(pieces, place, p, n, eps)
        if len(fence_side) != 1:
            raise TrappedOffcut(f"the pass making the {p.makes} frees {len(fence_side)} pieces between the blade "
                                "and the fence")
        stock = fence_side[0]
    return shapely.normalize(stock)


def _riding(pieces: list[Polygon], place: _Placement, p: SawPass, n, eps: float) -> list[Polygon]:
    """The piece bearing on the fence (X = 0), when it is the only one and every other piece lies wholly on the
    blade's far side; else none."""
    touching = [g for g in pieces if abs(min(x for x, _ in place.to_saw(g).exterior.coords)) <= eps]
    if len(touching) != 1:
        return []
    for g in pieces:
        if g is touching[0]:
            continue
        if any((x - p.fence_distance) * n[0] + y * n[1] < -eps for x, y in place.to_saw(g).exterior.coords):
            return []
    return touching


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


def _sides(cut: Cut) -> tuple[Side, ...]:
    if cut.notch is None or cut.box:
        return (Side.OUTER_FACE, Side.INNER_FACE, Side.EDGE_1, Side.EDGE_2)
    return (Side.OUTER_FACE, Side.INNER_FACE, Side.NOTCHED_EDGE, Side.SQUARE_EDGE)


def _with_contacts(passes: tuple[SawPass, ...], blank: Blank, target: Polygon,
                   ride_fence: bool = False) -> tuple[SawPass, ...] | None:
    """The passes with their bearing measured, or None when they do not cut ``target`` safely."""
    size = _size(blank)
    tol = LENGTH_TOLERANCE * size
    done = []
    for k, p in enumerate(passes):
        try:
            stock = replay(passes[:k + 1], blank, ride_fence=ride_fence)
        except ValueError:  # an offcut trapped against the fence, or nothing left
            return None
        table, fence = _contacts(stock, placement(p.on_table, p.on_fence, blank), size)
        if table <= tol:
            return None
        done.append(replace(p, table_contact=table, fence_contact=fence))
    if stock.symmetric_difference(target).area > LENGTH_TOLERANCE * target.area:
        return None
    return tuple(done)


def _search(cut: Cut, blank: Blank, kerf: float) -> tuple[SawPass, ...]:
    """The passes, in order, and the set-up of each.

    Required: run in order as slabs, they leave exactly the stave the cut needs;
    every freed offcut is on the blade's far side; the stave still bears on the
    table. Then preferred, in turn: passes face down (steadier), set-ups that do
    not follow the blank's width (one setting for every segment), blades leaning
    away from the fence (common practice), the most bearing in the last pass.
    """
    kept, faces = _faces(cut, blank)
    if not faces:  # a box's side, or any piece of a box with sides between faces: nothing to cut but the blank
        return ()
    size = _size(blank)
    options = [_candidates(f, _sides(cut), blank, kerf, kept) for f in faces]
    for f, found in zip(faces, options):
        if not found:
            raise DesignError(f"no table-saw set-up cuts the {f.name} with the blade within {MAX_TILT:.0f}° of "
                              "vertical and clear of the fence", "hollow.joint")
    best = None
    for order in permutations(range(len(faces))):
        for combo in product(*(options[i] for i in order)):
            done = _with_contacts(tuple(combo), blank, kept, cut.box)
            if done is None:
                continue
            last = done[-1]
            score = (sum(p.on_table in (Side.OUTER_FACE, Side.INNER_FACE) for p in done),
                     -sum(p.follows_blank_width for p in done),
                     sum(p.lean is not Lean.TOWARD_FENCE for p in done),
                     round(min(last.table_contact, last.fence_contact) / size, 9),
                     round((last.table_contact + last.fence_contact) / size, 9))
            if best is None or score > best[0]:
                best = (score, done)
    if best is None:
        raise DesignError("no order of table-saw passes keeps every offcut clear of the fence with the stave "
                          "bearing on the table", "hollow.joint")
    return best[1]


def saw_passes_for(cut: Cut, blank: Blank, kerf: float, plan: tuple[SawPass, ...] | None = None) -> tuple[SawPass, ...]:
    """The passes for ``blank``: searched afresh, or following ``plan`` (the same sides, order and faces)."""
    if plan is None or not plan:
        return _search(cut, blank, kerf)
    kept, faces = _faces(cut, blank)
    by_name = {f.name: f for f in faces}
    passes = []
    for p in plan:
        made = _pass_for(by_name[p.makes], p.on_table, p.on_fence, blank, kerf, kept)
        if made is None:
            return _search(cut, blank, kerf)
        passes.append(made)
    done = _with_contacts(tuple(passes), blank, kept, cut.box)
    return done if done is not None else _search(cut, blank, kerf)


# Router table --------------------------------------------------------------------------


def _router(cut: Cut, blank: Blank) -> RouterSetup:
    size = _size(blank)
    kept, faces = _faces(cut, blank)
    apex = (cut.apex_x, cut.notch.apex_height)
    on_table, on_fence = Side.NOTCHED_EDGE, Side.OUTER_FACE
    place = placement(on_table, on_fence, blank)
    tip = place.point(apex)
    units = []
    for f in faces:
        other = f.end if math.dist(f.start, apex) < math.dist(f.end, apex) else f.start
        q = place.point(other)
        length = math.dist(tip, q)
        units.append(((q[0] - tip[0]) / length, (q[1] - tip[1]) / length))
    included = math.degrees(math.acos(max(-1.0, min(1.0, units[0][0] * units[1][0] + units[0][1] * units[1][1]))))
    if abs(included - ROUTER_BIT_ANGLE) > 1e-6:
        raise DesignError(f"the V is {included:.3f}°, not the {ROUTER_BIT_ANGLE:.0f}° of a V-bit", "hollow.joint")
    bisector = (units[0][0] + units[1][0], units[0][1] + units[1][1])  # out of the V, toward the table
    wedge = math.degrees(math.atan2(abs(bisector[0]), -bisector[1]))
    flat = wedge <= ANGLE_TOLERANCE
    high = None if flat else ("away from the fence" if bisector[0] < 0 else "at the fence")
    b_len = math.hypot(*bisector)
    along = tip[1] / (-bisector[1] / b_len)
    waste = place.to_saw(box(0.0, 0.0, blank.width, blank.thickness).difference(kept))
    bx, by = bisector[0] / b_len, bisector[1] / b_len
    pieces = getattr(waste, "geoms", [waste])
    # Every waste point lies inside the V, so within the cone's surface; past the rim the bit's body is as
    # wide as the rim. So the bit clears the waste when its rim's half-width reaches the waste point
    # farthest from its axis (a convex measure: a corner of the waste).
    half = max(abs((x - tip[0]) * by - (y - tip[1]) * bx) for g in pieces for x, y in g.exterior.coords)
    table_left, _ = _contacts(kept, place, size)
    return RouterSetup(one_pass_flat=flat, wedge_angle=0.0 if flat else wedge, wedge_high_side=high,
                       on_table=on_table, on_fence=on_fence, bit_height=along, fence_to_tip=tip[0],
                       least_bit_diameter=2 * half, edge_left=table_left)


def router_cut(r: RouterSetup, blank: Blank, diameter: float | None = None) -> Polygon:
    """What a 90° V-bit so set removes, in the blank's frame: the cone to its rim, then the bit's body.

    The stave rides on its notched edge, outer face to the fence, on the wedge the
    set-up names: the bit's axis is square to the riding surface, so in the blank's
    frame the cone's axis leans by the wedge angle from the notched edge's normal.
    """
    d = diameter if diameter is not None else r.least_bit_diameter
    place = placement(r.on_table, r.on_fence, blank)
    tip = (r.fence_to_tip, r.bit_height * math.cos(math.radians(r.wedge_angle)))
    tilt = r.wedge_angle if r.wedge_high_side == "at the fence" else -r.wedge_angle
    # In the saw frame (before the wedge): axis from the tip down toward the table, turned by the wedge.
    axis = (math.sin(math.radians(tilt)), -math.cos(math.radians(tilt)))
    side = (-axis[1], axis[0])
    rim = d / 2
    far = 4 * _size(blank)
    cone = Polygon([tip,
                    (tip[0] + rim * (axis[0] + side[0]), tip[1] + rim * (axis[1] + side[1])),
                    (tip[0] + rim * (axis[0] - side[0]), tip[1] + rim * (axis[1] - side[1]))])
    body = Polygon([(tip[0] + rim * (axis[0] + side[0]), tip[1] + rim * (axis[1] + side[1])),
                    (tip[0] + (rim + far) * axis[0] + rim * side[0], tip[1] + (rim + far) * axis[1] + rim * side[1]),
                    (tip[0] + (rim + far) * axis[0] - rim * side[0], tip[1] + (rim + far) * axis[1] - rim * side[1]),
                    (tip[0] + rim * (axis[0] - side[0]), tip[1] + rim * (axis[1] - side[1]))])
    return place.to_blank(cone.union(body))


# Public ------------------------------------------------------------------------------


def cutter_settings(section: Section, kerf: float, blank: Blank | None = None,
                    plan: tuple[SawPass, ...] | None = None, saw: bool = True) -> CutterSettings:
    """Table-saw passes, router set-up and angles for cutting ``section``'s stave from ``blank``.

    ``blank`` defaults to the stave's own width and thickness; ``plan`` fixes the
    sides and order of the passes (as found for another blank of the same stave);
    ``saw=False`` leaves the table-saw passes out (a notch no fixed set-up follows).
    """
    blank = blank or Blank(section.stave_width, section.thickness)
    cut = cut_of(section)
    if cut.notch is not None and blank.width <= cut.apex_x:
        raise ValueError("the blank is narrower than the notch")
    passes = saw_passes_for(cut, blank, kerf, plan) if saw else ()
    if cut.box:
        return CutterSettings(section.staves, section.joint, None, None, None, None, passes, None, blank)
    if section.notch is None:
        return CutterSettings(section.staves, section.joint, None, None, None, bevel_angle(section.staves), passes,
                              None, blank)
    return CutterSettings(
        staves=section.staves, joint=section.joint, v_face_angles=v_face_angles(section.staves),
        notch_depth=cut.apex_x, apex_height=section.notch.apex_height, bevel=None, saw=passes,
        router=_router(cut, blank), blank=blank,
    )


def same_notch(a: CutterSettings, b: CutterSettings) -> bool:
    """Whether two settings cut the same notch (depth and apex within :data:`SAME_SETTING`)."""
    if a.notch_depth is None or b.notch_depth is None:
        return a.notch_depth is None and b.notch_depth is None
    return (abs(a.notch_depth - b.notch_depth) <= SAME_SETTING
            and abs(a.apex_height - b.apex_height) <= SAME_SETTING
            and abs(a.blank.thickness - b.blank.thickness) <= SAME_SETTING)


def final_edge(section: Section, blank: Blank, width: float) -> Polygon:
    """The stave once the square edge (or edge 2's bevel) is taken to the tapered line ``width`` from edge 1.

    In the blank's frame. For a birdsmouth the square edge is cut square at x =
    ``width``; for plain staves edge 2 is bevelled π/N through the outer face's
    line at x = ``width`` (the outer face's width).
    """
    cut = cut_of(section)
    after = cut.stave(blank)
    t = blank.thickness
    if cut.box:  # edge 2 cut square to the line, then (a face) its own rebate along it, as edge 1's
        piece = after.intersection(box(-1.0, -1.0, width, t + 1.0))
        if cut.rebate is not None:
            depth, across = cut.rebate
            piece = piece.difference(box(width - across, -1.0, width + 1.0, depth))
        return shapely.normalize(piece)
    if cut.notch is None:
        run = t * math.tan(math.pi / section.staves)
        keep = Polygon([(-t, 0.0), (width - run, 0.0), (width, t), (-t, t)])
        return shapely.normalize(after.intersection(keep))
    return shapely.normalize(after.intersection(box(-1.0, -1.0, width, t + 1.0)))


def model_stave(section: Section) -> Polygon:
    """The section's stave outline moved into the blank's frame (notched edge x = 0, inner face y = 0)."""
    return shapely.normalize(translate(Polygon(section.stave_outline), -section.frame.x_notch_edge,
                                       -section.frame.inner))


__all__ = ["Blank", "BladeSide", "CutterSettings", "Cut", "Lean", "RouterSetup", "SawPass", "Side",
           "TrappedOffcut", "blade_slab", "cut_of", "cutter_settings", "final_edge", "model_stave", "placement",
           "replay", "router_cut", "same_notch", "v_wedge"]
