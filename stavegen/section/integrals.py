"""Exact area integrals of polygons and of polygons clipped by a circle.

No faceted circle stands in for the round: a polygon's boundary is split
where it crosses the circle, the pieces inside contribute exact triangles
from the origin and the pieces outside contribute exact circular sectors
(Green's theorem on a boundary of straight segments and arcs). Units are
whatever the coordinates are in (mm here): area mm², first moments mm³,
second moments mm⁴, all about the origin (the spar's axis).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterable, Sequence

Point = tuple[float, float]


@dataclass(frozen=True)
class Moments:
    """Integrals over a region: A = ∫dA, qx = ∫x dA, qy = ∫y dA, ixx = ∫y² dA, iyy = ∫x² dA, ixy = ∫xy dA."""

    area: float = 0.0
    qx: float = 0.0
    qy: float = 0.0
    ixx: float = 0.0
    iyy: float = 0.0
    ixy: float = 0.0

    def __add__(self, other: "Moments") -> "Moments":
        return Moments(*(a + b for a, b in zip(self.astuple(), other.astuple())))

    def __sub__(self, other: "Moments") -> "Moments":
        return Moments(*(a - b for a, b in zip(self.astuple(), other.astuple())))

    def scaled(self, factor: float) -> "Moments":
        return Moments(*(factor * a for a in self.astuple()))

    def astuple(self) -> tuple[float, ...]:
        return (self.area, self.qx, self.qy, self.ixx, self.iyy, self.ixy)

    @property
    def polar(self) -> float:
        """∫(x² + y²) dA about the origin, mm⁴."""
        return self.ixx + self.iyy


def disc_moments(radius: float) -> Moments:
    """A full disc of ``radius`` centred on the origin: I = π R⁴ / 4 about any diameter."""
    i = math.pi * radius**4 / 4
    return Moments(math.pi * radius**2, 0.0, 0.0, i, i, 0.0)


def _triangle(p: Point, q: Point) -> tuple[float, ...]:
    """Signed integrals over the triangle (origin, p, q)."""
    cross = p[0] * q[1] - q[0] * p[1]
    area = cross / 2
    return (
        area,
        area * (p[0] + q[0]) / 3,
        area * (p[1] + q[1]) / 3,
        cross * (p[1] ** 2 + p[1] * q[1] + q[1] ** 2) / 12,
        cross * (p[0] ** 2 + p[0] * q[0] + q[0] ** 2) / 12,
        cross * (2 * p[0] * p[1] + p[0] * q[1] + q[0] * p[1] + 2 * q[0] * q[1]) / 24,
    )


def _sector(radius: float, p: Point, q: Point) -> tuple[float, ...]:
    """Signed integrals over the circular sector of ``radius`` swept from direction p to direction q."""
    t1 = math.atan2(p[1], p[0])
    sweep = math.atan2(p[0] * q[1] - p[1] * q[0], p[0] * q[0] + p[1] * q[1])
    t2 = t1 + sweep
    r2, r3, r4 = radius**2, radius**3, radius**4
    s2 = (math.sin(2 * t2) - math.sin(2 * t1)) / 2
    return (
        r2 * sweep / 2,
        r3 / 3 * (math.sin(t2) - math.sin(t1)),
        r3 / 3 * (math.cos(t1) - math.cos(t2)),
        r4 / 8 * (sweep - s2),
        r4 / 8 * (sweep + s2),
        r4 / 8 * (math.sin(t2) ** 2 - math.sin(t1) ** 2),
    )


def ring_moments(ring: Sequence[Point]) -> Moments:
    """Exact signed integrals over a closed polygon ring (counter-clockwise positive)."""
    total = [0.0] * 6
    n = len(ring)
    for i in range(n):
        p, q = ring[i], ring[(i + 1) % n]
        if p == q:
            continue
        for k, v in enumerate(_triangle(p, q)):
            total[k] += v
    return Moments(*total)


def _split_at_circle(p: Point, q: Point, radius: float) -> list[float]:
    """Parameters 0 < s < 1 where the segment p→q crosses the circle."""
    dx, dy = q[0] - p[0], q[1] - p[1]
    a = dx * dx + dy * dy
    b = 2 * (p[0] * dx + p[1] * dy)
    c = p[0] ** 2 + p[1] ** 2 - radius**2
    disc = b * b - 4 * a * c
    if a == 0 or disc <= 0:
        return []
    root = math.sqrt(disc)
    # Numerically stable pair of roots.
    qv = -0.5 * (b + math.copysign(root, b))
    roots = sorted({qv / a, c / qv} if qv != 0 else {0.0})
    return [s for s in roots if 0.0 < s < 1.0]


def _inside(p: Point, dx: float, dy: float, s0: float, s1: float, r2: float) -> bool:
    """Whether the piece s0..s1 of a segment that does not cross the circle lies inside it.

    Three interior points decide, so that a segment tangent to the circle at
    its middle (the round just touching a stave's face) counts as outside.
    """
    for frac in (0.25, 0.5, 0.75):
        s = s0 + frac * (s1 - s0)
        x, y = p[0] + s * dx, p[1] + s * dy
        if x * x + y * y > r2:
            return False
    return True


def ring_in_disc_moments(ring: Sequence[Point], radius: float) -> Moments:
    """Exact signed integrals over (polygon ring) ∩ (disc of ``radius`` at the origin)."""
    total = [0.0] * 6
    n = len(ring)
    r2 = radius * radius
    for i in range(n):
        p, q = ring[i], ring[(i + 1) % n]
        if p == q:
            continue
        cuts = [0.0, *_split_at_circle(p, q, radius), 1.0]
        dx, dy = q[0] - p[0], q[1] - p[1]
        for s0, s1 in zip(cuts, cuts[1:]):
            a = (p[0] + s0 * dx, p[1] + s0 * dy)
            b = (p[0] + s1 * dx, p[1] + s1 * dy)
            piece = _triangle(a, b) if _inside(p, dx, dy, s0, s1, r2) else _sector(radius, a, b)
            for k, v in enumerate(piece):
                total[k] += v
    return Moments(*total)


def polygon_in_disc_moments(rings: Iterable[Sequence[Point]], radius: float | None = None) -> Moments:
    """Sum over oriented rings (exterior counter-clockwise, holes clockwise), clipped by the disc if given."""
    total = Moments()
    for ring in rings:
        total = total + (ring_moments(ring) if radius is None else ring_in_disc_moments(ring, radius))
    return total


def segment_length_in_disc(start: Point, direction: Point, length: float, radius: float) -> float:
    """Length of the segment start + s·direction, 0 ≤ s ≤ length (unit direction), inside the disc."""
    if length <= 0:
        return 0.0
    px, py = start
    dx, dy = direction
    b = px * dx + py * dy
    c = px * px + py * py - radius * radius
    disc = b * b - c
    if disc <= 0:
        return 0.0
    root = math.sqrt(disc)
    lo, hi = max(0.0, -b - root), min(length, -b + root)
    return max(0.0, hi - lo)
