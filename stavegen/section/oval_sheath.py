"""Sheathing layers and reinforcing strips on an oval section.

The wood is rounded to an ellipse (semi-axes a, b: the finished ellipse less the layers there); each layer lies
outside it at constant thickness, so its outside is the curve parallel to the ellipse (an offset of an ellipse
is not an ellipse). A layer's integrals are those of the region between two parallel curves, each taken as a
finely sampled polygon inscribed in the curve and extrapolated to the curve (Richardson, the inscribed polygon's
error falling as the square of its step), exact to about 1e-12 of the layer's figures.

A strip lies along each stave's middle (the middle of the stave's side of the glued-up polygon: half-way
between the corners it shares with its neighbours), as on a round spar: on the inner face, from the inner face
into the bore; in a groove, its two outer corners on the wood's ellipse, the groove (and the wood over the
strip) cut away. Each strip is a rectangle, its integrals exact; the wood over a grooved strip is clipped by
the true ellipse (:mod:`.ellipse`). Lengths mm, second moments mm⁴, about the spar's axis; x fore-and-aft,
y athwartships.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shapely.geometry import Polygon

from ..errors import DesignError
from ..units import format_length
from .ellipse import ellipse_moments, ring_in_ellipse_moments
from .integrals import Moments, ring_moments
from .oval import _to_axis, normal_angle

SAMPLES = 2048  # points on each parallel curve (and half as many for the extrapolation)


def parallel_points(a: float, b: float, offset: float, count: int = SAMPLES) -> list[tuple[float, float]]:
    """Points on the curve ``offset`` mm outside the ellipse (a, b), counter-clockwise: each point of the
    ellipse moved out along its normal."""
    out = []
    for i in range(count):
        t = 2 * math.pi * i / count
        c, s = math.cos(t), math.sin(t)
        nx, ny = b * c, a * s
        norm = math.hypot(nx, ny)
        out.append((a * c + offset * nx / norm, b * s + offset * ny / norm))
    return out


def parallel_moments(a: float, b: float, offset: float) -> Moments:
    """The integrals of the region inside the curve ``offset`` mm outside the ellipse (a, b)."""
    if offset == 0:
        return ellipse_moments(a, b)
    fine = ring_moments(parallel_points(a, b, offset, SAMPLES))
    coarse = ring_moments(parallel_points(a, b, offset, SAMPLES // 2))
    return Moments(*((4 * f - c) / 3 for f, c in zip(fine.astuple(), coarse.astuple())))


@dataclass(frozen=True)
class OvalLayer:
    """One layer over the wood's ellipse: between ``inner`` and ``outer`` mm outside it."""

    a: float
    b: float
    inner: float
    outer: float

    @property
    def moments(self) -> Moments:
        return parallel_moments(self.a, self.b, self.outer) - parallel_moments(self.a, self.b, self.inner)

    def reach(self, across: bool) -> float:
        """Its farthest fibre from the bending axis: fore-and-aft (``across``) a + outer, else b + outer."""
        return (self.a if across else self.b) + self.outer

    def shape(self) -> Polygon:
        return Polygon(parallel_points(self.a, self.b, self.outer, 720),
                       [parallel_points(self.a, self.b, self.inner, 720)[::-1]])


@dataclass(frozen=True)
class OvalStrip:
    """A strip in every stave of an oval: the rectangles in the axis frame, where they lie in each stave (bottom,
    top from the axis along the stave's normal, centred ``centre`` along its face) and, for a groove, the wood
    cut away over each strip up to the oval."""

    rings: tuple[tuple[tuple[float, float], ...], ...]
    covers: tuple[tuple[tuple[float, float], ...], ...]
    spans: tuple[tuple[float, float, float], ...]  # (centre along the face, bottom, top) in each stave's frame

    @property
    def moments(self) -> Moments:
        return sum((ring_moments(r) for r in self.rings), Moments())

    def abs_moment(self, across: bool) -> float:
        """∫|x| dA (``across``: bending fore-and-aft) or ∫|y| dA of the strips, each taken at its centroid."""
        total = 0.0
        for ring in self.rings:
            m = ring_moments(ring)
            total += abs(m.qx if across else m.qy)
        return total

    def reach(self, across: bool) -> float:
        return max(abs(p[0] if across else p[1]) for ring in self.rings for p in ring)

    def shape(self):
        import shapely

        return shapely.MultiPolygon([Polygon(r) for r in self.rings])


def _top_in_ellipse(a: float, b: float, theta: float, u: float) -> float:
    """The largest y (along the normal at ``theta``) at which the point u along the face, y out, lies on the
    ellipse (a, b): the positive root of ((u·eu + y·en)ₓ/a)² + (..ᵧ/b)² = 1."""
    en = (math.cos(theta), math.sin(theta))
    eu = (math.sin(theta), -math.cos(theta))
    px, py = u * eu[0], u * eu[1]
    qa = (en[0] / a) ** 2 + (en[1] / b) ** 2
    qb = 2 * (px * en[0] / a**2 + py * en[1] / b**2)
    qc = (px / a) ** 2 + (py / b) ** 2 - 1
    disc = qb * qb - 4 * qa * qc
    if disc < 0:
        return -math.inf
    return (-qb + math.sqrt(disc)) / (2 * qa)


def oval_strip(section, width: float, thickness: float, place: str, at: str = "", units: str = "mm") -> OvalStrip:
    """The strip ``width`` × ``thickness`` mm in every stave of the oval ``section`` (the wood's), on the inner
    face or in a groove (``place``). Raises DesignError where it does not fit."""
    show = lambda mm: format_length(mm, units)  # noqa: E731
    where_ = f" at {at}" if at else ""
    a, b = section.semi_axes
    bore = Polygon(section.bore_outline)
    rings, covers, spans = [], [], []
    for k in range(section.staves):
        theta = normal_angle(section.staves, k)
        frame = section.frames[k]
        c = section.face_middles[k]
        lo, hi = c - width / 2, c + width / 2
        if place == "groove":
            top = min(_top_in_ellipse(a, b, theta, lo), _top_in_ellipse(a, b, theta, hi))
            bottom = top - thickness
            if bottom <= frame.inner:
                raise DesignError(f"the groove for a strip {show(thickness)} thick goes through a stave{where_} "
                                  f"(wall after rounding {show(top - frame.inner)} under it)", "hollow.strip")
            far = max(frame.outer, a, b) + 1.0
            covers.append(tuple(_to_axis([(lo, top), (hi, top), (hi, far), (lo, far)], theta)))
        else:
            top, bottom = frame.inner, frame.inner - thickness
        ring = tuple(_to_axis([(lo, bottom), (hi, bottom), (hi, top), (lo, top)], theta))
        if place != "groove" and not bore.buffer(1e-9).contains(Polygon(ring)):
            raise DesignError(f"strips {show(width)} wide, {show(thickness)} thick do not fit the bore of every "
                              f"stave{where_}", "hollow.strip")
        rings.append(ring)
        spans.append((c, bottom, top))
    return OvalStrip(tuple(rings), tuple(covers), tuple(spans))


def groove_cover_moments(strip: OvalStrip, a: float, b: float) -> Moments:
    """What the grooves take out of the wood over the strips (inside the ellipse)."""
    return sum((ring_in_ellipse_moments(r, a, b) for r in strip.covers), Moments())


def groove_cover_abs_moment(strip: OvalStrip, a: float, b: float, across: bool) -> float:
    """∫|x| dA (``across``) or ∫|y| dA of the wood the grooves take over the strips, each piece at its centroid."""
    total = 0.0
    for ring in strip.covers:
        m = ring_in_ellipse_moments(ring, a, b)
        total += abs(m.qx if across else m.qy)
    return total
