"""Exact integrals over polygons clipped by an ellipse, and the closed forms of the plan's shapes.

An ellipse of semi-axes a (along x, fore-and-aft) and b (along y,
athwartships) is the unit disc stretched by (a, b). Stretching the polygon
back by (1/a, 1/b) turns polygon ∩ ellipse into polygon' ∩ unit disc, which
:mod:`.integrals` integrates exactly (straight pieces and true circular
arcs); the integrals come back by the Jacobian ab and the powers of a and b
in each integrand. No faceted ellipse stands in for the finished surface.

Axes: x fore-and-aft, y athwartships. ``iyy`` = ∫x² dA is the second moment
that resists bending in the fore-and-aft plane (about the athwartships
axis): I_fore_aft; ``ixx`` = ∫y² dA is I_athwartships.
"""

from __future__ import annotations

import math
from typing import Iterable, Sequence

from .integrals import Moments, ring_in_disc_moments, ring_moments

Point = tuple[float, float]


def stretch_back(m: Moments, a: float, b: float) -> Moments:
    """Moments of the region stretched by (a, b) from the moments ``m`` of the unstretched region."""
    j = a * b
    return Moments(area=j * m.area, qx=j * a * m.qx, qy=j * b * m.qy, ixx=j * b * b * m.ixx,
                   iyy=j * a * a * m.iyy, ixy=j * a * b * m.ixy)


def ring_in_ellipse_moments(ring: Sequence[Point], a: float, b: float) -> Moments:
    """Exact signed integrals over (polygon ring) ∩ (ellipse of semi-axes a, b at the origin)."""
    squeezed = [(x / a, y / b) for x, y in ring]
    return stretch_back(ring_in_disc_moments(squeezed, 1.0), a, b)


def rings_in_ellipse_moments(rings: Iterable[Sequence[Point]], a: float, b: float) -> Moments:
    total = Moments()
    for ring in rings:
        total = total + ring_in_ellipse_moments(ring, a, b)
    return total


def ellipse_moments(a: float, b: float) -> Moments:
    """A full ellipse: A = π a b, ∫x² dA = π a³ b / 4, ∫y² dA = π a b³ / 4 (Roark, Table A.1)."""
    return Moments(math.pi * a * b, 0.0, 0.0, math.pi * a * b**3 / 4, math.pi * a**3 * b / 4, 0.0)


def rounded_rectangle_moments(width: float, depth: float, corner: float) -> Moments:
    """A rectangle ``width`` along x by ``depth`` along y centred on the origin, corners rounded to ``corner``.

    The cross of two rectangles plus four quarter discs, each exact: a quarter disc of radius r with its
    centre at (cx, cy) adds π r²/4 of area and ∫y² dA = (π r²/4) cy² + 2 cy r³/3 + π r⁴/16 (its first
    moment about its centre is r³/3 along each axis, its second π r⁴/16).
    """
    r = corner
    x_half, y_half = width / 2, depth / 2
    area = width * depth - (4 - math.pi) * r * r
    # cross: the full-depth band of width (width − 2r) and the full-width band of depth (depth − 2r), less their
    # common middle (counted twice)
    bx, by = width - 2 * r, depth - 2 * r
    ixx = bx * depth**3 / 12 + width * by**3 / 12 - bx * by**3 / 12
    iyy = depth * bx**3 / 12 + by * width**3 / 12 - by * bx**3 / 12
    quarter = math.pi * r * r / 4
    cy, cx = y_half - r, x_half - r
    ixx += 4 * (quarter * cy * cy + 2 * cy * r**3 / 3 + math.pi * r**4 / 16)
    iyy += 4 * (quarter * cx * cx + 2 * cx * r**3 / 3 + math.pi * r**4 / 16)
    return Moments(area, 0.0, 0.0, ixx, iyy, 0.0)


def rounded_rectangle_half_moment(width: float, depth: float, corner: float) -> float:
    """∫|x| dA over the rounded rectangle (the plastic modulus for bending in the x direction), exact.

    Bands as in :func:`rounded_rectangle_moments`; a quarter disc centred at cx adds
    (π r²/4) cx + r³/3 on each side of the axis.
    """
    r = corner
    bx, by = width - 2 * r, depth - 2 * r
    # ∫|x| over a centred band of width w and depth d: d w² / 4
    total = depth * bx**2 / 4 + by * width**2 / 4 - by * bx**2 / 4
    cx = width / 2 - r
    total += 4 * (math.pi * r * r / 4 * cx + r**3 / 3)
    return total


def half_moment_of_ellipse(a: float, b: float) -> float:
    """∫|x| dA over the ellipse: 4 a² b / 3 (the plastic modulus for bending in the x direction)."""
    return 4 * a * a * b / 3


def polygon_moments(rings: Iterable[Sequence[Point]]) -> Moments:
    total = Moments()
    for ring in rings:
        total = total + ring_moments(ring)
    return total
