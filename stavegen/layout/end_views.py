"""End views: the cross-sections a builder cuts or checks against at 1:1, one model for the DXF and the PDF.

A stave's end (where it is widest and narrowest: the saw and router set-up
is checked against it), the assembled section there (staves, bore and the
finished outside), each plug's end (the polygon to saw the plug to), and a
two-piece spar's joint: the wooden spigot's sections and gauges of the bore
it slides into, or the holes for a tube. Each view is outlines and circles in
mm about its own origin (the spar's axis; a stave's own frame for a stave
end), with what it shows; :mod:`stavegen.render.template_words` words its
caption, and both the DXF sheet and the full-size PDF draw the same views.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from .segments import Point

# What an outline is (the DXF gives each its layer; the PDF its line).
ROLES = ("stave", "bore", "finished", "plug", "spigot", "fit")
# What a view is.
KINDS = ("stave end", "assembled", "plug", "spigot", "bore fit", "tube hole")


@dataclass(frozen=True)
class Outline:
    """A closed outline (mm) of one ``role`` (:data:`ROLES`)."""

    role: str
    points: tuple[Point, ...]


@dataclass(frozen=True)
class Circle:
    """A circle of ``radius`` mm about the view's origin, of one ``role``."""

    role: str
    radius: float


@dataclass(frozen=True)
class EndView:
    """One end view: its ``kind`` (:data:`KINDS`), where it is along the spar (``z`` mm from the heel), which one
    it is (``which``: "widest", "narrowest", a plug's "heel" or "head", the spigot's "glued end", "butt" or "tip",
    a bore gauge's "mouth" or "spigot's tip", a tube hole's "lower" or "upper"), what it draws, and what its
    caption is worded from (``section``: the finished section; ``plug``: the plug block's end; ``joint``: the
    joint's check; ``index``: a plug's number; ``across``: a figure across it, mm)."""

    kind: str
    z: float
    which: str
    outlines: tuple[Outline, ...] = ()
    circles: tuple[Circle, ...] = ()
    section: Any = None
    plug: Any = None
    joint: Any = None
    index: int | None = None
    across: float = 0.0

    @property
    def bounds(self) -> tuple[float, float, float, float]:
        """(x0, y0, x1, y1), mm: a round's or a whole section's square about the origin, else the outline's box."""
        if self.kind == "stave end":
            xs = [x for o in self.outlines for x, _ in o.points]
            ys = [y for o in self.outlines for _, y in o.points]
            return min(xs), min(ys), max(xs), max(ys)
        reach = max([math.hypot(x, y) for o in self.outlines for x, y in o.points]
                    + [c.radius for c in self.circles])
        return -reach, -reach, reach, reach


def end_views(layout) -> tuple[EndView, ...]:
    """Every end view of a layout, in the order the sheets show them."""
    views: list[EndView] = []
    extremes = (("widest", layout.machining.widest), ("narrowest", layout.machining.narrowest))
    for which, at in extremes:
        views.append(EndView("stave end", at.z, which, (Outline("stave", tuple(at.section.stave_outline)),),
                             section=at.section))
    for which, at in extremes:
        whole = at.section.assembled  # an oval's whole section, not the one stave the settings are for
        outlines = [Outline("stave", tuple(map(tuple, ring))) for ring in whole.placed_rings()]
        outlines.append(Outline("bore", tuple(map(tuple, whole.bore_points()))))
        circles: tuple[Circle, ...] = ()
        if whole.shape != "round":
            outlines.append(Outline("finished", tuple(map(tuple, whole.finished_points(360)))))
        else:
            circles = (Circle("finished", whole.radius),)
        views.append(EndView("assembled", at.z, which, tuple(outlines), circles, section=whole))
    for block in layout.plugs:
        for which, end in (("heel", block.heel), ("head", block.head)):
            views.append(EndView("plug", end.z, which, (Outline("plug", tuple(map(tuple, end.section.bore_points()))),),
                                 section=end.section, plug=end, index=block.index))
    for joint in layout.joints:
        views += _joint_views(joint)
    return tuple(views)


def _joint_views(joint) -> list[EndView]:
    """A two-piece spar's joint: the wooden spigot at its glued end, butt and tip (lower part) and gauges of the
    upper part's bore at its mouth and at the spigot's tip; or a tube's hole in the plugs of each part."""
    j = joint.check
    blank = joint.spigot
    out: list[EndView] = []
    if blank is not None:
        lo, hi = j.at - j.overlap, j.at + j.overlap
        for ring, flats, which, z in ((blank.glued_end, blank.across_flats[0], "glued end", lo),
                                      (blank.butt, blank.across_flats[1], "butt", j.at),
                                      (blank.tip, blank.across_flats[2], "tip", hi)):
            out.append(EndView("spigot", z, which, (Outline("spigot", tuple(map(tuple, ring))),), joint=joint,
                               across=flats))
        for ring, which, z in ((blank.bore_at_butt, "mouth", j.at), (blank.bore_at_tip, "spigot's tip", hi)):
            ring = tuple(map(tuple, ring))
            flats = 2 * max(math.hypot(x, y) for x, y in ring) * math.cos(math.pi / j.staves)
            out.append(EndView("bore fit", z, which, (Outline("fit", ring),), joint=joint, across=flats))
    elif j.kind == "tube-spigot":
        od = j.spigot.outside
        out.append(EndView("tube hole", j.at, "lower", circles=(Circle("spigot", od / 2),), joint=joint, across=od,
                           index=joint.plugs[0].index if joint.plugs else None))
        out.append(EndView("tube hole", j.at, "upper", circles=(Circle("spigot", od / 2 + j.clearance),),
                           joint=joint, across=od + 2 * j.clearance,
                           index=joint.plugs[-1].index if joint.plugs else None))
    return out
