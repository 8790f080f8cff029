"""Stave segments and their outlines in plan view: the shapes templates and routers cut.

A segment's outline lies in its own face frame: x along the stave's face
from the segment's heel end (mm, true length), y across the face (mm) with
the notch edge straight along y = 0 (or the stave centred on y = 0 for a
symmetric taper). Between stations the width is straight, which is exact:
the stave width is linear in the diameter and the wall, and both are linear
between the stations, which include every change of taper.
"""

from __future__ import annotations

import bisect
import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .staves import StavePlan

Point = tuple[float, float]


@dataclass(frozen=True)
class Tick:
    """A station mark on a segment: x along it (mm), its z from the heel (mm), and why it is there."""

    x: float
    z: float
    width: float
    reasons: tuple[str, ...]


@dataclass(frozen=True)
class Segment:
    """One piece of one stave (stave and segment numbered from 1), heel end to head end.

    ``start``/``end`` are z (mm from the heel, end allowances included); ``length``
    is the true length along the face (mm). ``scarf_at_start``/``scarf_at_end``
    say whether that end is a scarf (feathered over ``scarf_length``) or a
    square-cut stave end.
    """

    stave: int
    index: int
    start: float
    end: float
    length: float
    scarf_at_start: bool
    scarf_at_end: bool
    scarf_length: float
    outline: tuple[Point, ...]
    notch_edge: tuple[Point, ...]
    square_edge: tuple[Point, ...]
    ticks: tuple[Tick, ...]
    widest: float
    narrowest: float
    rough_width: float
    volume: float
    part: str = ""
    """The part of a two-piece spar the segment belongs to ("L" lower, "U" upper; "" for a one-piece spar);
    segments are numbered from 1 within their part."""

    @property
    def label(self) -> str:
        return f"{self.part}-S{self.stave}-{self.index}" if self.part else f"S{self.stave}-{self.index}"

    @property
    def feather_lines(self) -> tuple[float, ...]:
        """x (mm) where each scarf's slope begins on this segment: the scarf's far line from its tip."""
        lines = []
        if self.scarf_at_start:
            lines.append(self.scarf_length)
        if self.scarf_at_end:
            lines.append(self.length - self.scarf_length)
        return tuple(lines)

    def edges_at(self, x: float) -> tuple[float, float]:
        """(notch edge, square edge) across the face at ``x`` mm along the segment.

        Read off the segment's own edges, which are straight between the stations.
        """
        (nx, ny), (sx, sy) = self._edge_arrays
        return float(np.interp(x, nx, ny)), float(np.interp(x, sx, sy))

    @cached_property
    def _edge_arrays(self) -> tuple[tuple[np.ndarray, np.ndarray], ...]:
        """Both edges as arrays of x and y, made once (remaking them on every lookup was quadratic)."""
        return tuple((np.array([p[0] for p in edge]), np.array([p[1] for p in edge]))
                     for edge in (self.notch_edge, self.square_edge))


COLLINEAR = 1e-9  # relative: a corner turning less than this is no corner (a station on a straight run)


def without_collinear(ring: tuple[Point, ...]) -> tuple[Point, ...]:
    """A closed outline with the vertices that lie on a straight run between their neighbours left out.

    Stations on a straight stretch of taper put points along an edge that are no
    corner; a router's CAM wants only the corners. Repeated points go too.
    """
    pts = list(ring)
    changed = True
    while changed and len(pts) > 3:
        changed = False
        for i in range(len(pts)):
            a, b, c = pts[i - 1], pts[i], pts[(i + 1) % len(pts)]
            ux, uy, vx, vy = b[0] - a[0], b[1] - a[1], c[0] - b[0], c[1] - b[1]
            lu, lv = math.hypot(ux, uy), math.hypot(vx, vy)
            if lu == 0 or lv == 0 or (abs(ux * vy - uy * vx) <= COLLINEAR * lu * lv and ux * vx + uy * vy > 0):
                del pts[i]
                changed = True
                break
    return tuple(pts)


TICK_GAP = 10.0  # mm: closer station marks would run their labels together on a template


def template_ticks(candidates: list[Tick]) -> tuple[Tick, ...]:
    """The stations marked on a template: every station the file, a plug, a segment or a scarf puts
    there, and the evenly spaced marks that are at least :data:`TICK_GAP` from a marked one."""
    kept = [t.x for t in candidates if set(t.reasons) != {"mark"}]
    kept.sort()
    marked = []
    for tick in candidates:
        if set(tick.reasons) != {"mark"}:
            marked.append(tick)
            continue
        i = bisect.bisect_left(kept, tick.x)
        near = [kept[j] for j in (i - 1, i) if 0 <= j < len(kept)]
        if all(abs(tick.x - k) >= TICK_GAP for k in near):
            bisect.insort(kept, tick.x)
            marked.append(tick)
    return tuple(marked)


def make_segment(plan: StavePlan, stave: int, index: int, start: float, end: float,
                 scarf_at_start: bool, scarf_at_end: bool, scarf_length: float, part: str = "") -> Segment:
    """The segment of ``plan`` from z = start to end (mm) with its outline and marks."""
    s0 = plan.s_at(start)
    inner = plan.between(start, end)
    points_z = [start] + [st.z for st in inner] + [end]
    xs = [plan.s_at(z) - s0 for z in points_z]
    lower, upper = [], []
    for x, z in zip(xs, points_z):
        a, b = plan.edges_at(z)
        lower.append((x, a))
        upper.append((x, b))
    if plan.taper == "symmetric":
        notch_edge, square_edge = tuple(lower), tuple(upper)
    else:
        notch_edge, square_edge = (lower[0], lower[-1]), tuple(upper)
    outline = without_collinear(tuple([lower[0], lower[-1]] if plan.taper != "symmetric" else lower)
                                + tuple(reversed(upper)))
    widths = [b - a for (_, a), (_, b) in zip(lower, upper)]
    # Finished stave wood in the segment: width × thickness, trapezoid rule (exact for straight runs
    # of width when the thickness is constant; within 1e-6 for any realistic wall taper).
    thick = [plan.thickness_at(z) for z in points_z]
    volume = sum((x1 - x0) * (w0 * t0 + w1 * t1) / 2
                 for x0, x1, w0, w1, t0, t1 in zip(xs, xs[1:], widths, widths[1:], thick, thick[1:]))
    ticks = template_ticks([Tick(x=x, z=st.z, width=st.width, reasons=st.reasons)
                            for x, st in zip(xs[1:-1], inner)])
    return Segment(
        stave=stave, index=index, start=start, end=end, length=xs[-1],
        scarf_at_start=scarf_at_start, scarf_at_end=scarf_at_end, scarf_length=scarf_length,
        outline=outline, notch_edge=notch_edge, square_edge=square_edge, ticks=ticks,
        widest=max(widths), narrowest=min(widths), rough_width=max(widths) + 2 * plan.edge_allowance,
        volume=volume, part=part,
    )
