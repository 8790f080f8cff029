"""The templates: one model of what is drawn on every piece, for the DXF and the full-size PDF alike.

A template is one outline to cut out, with the segments it serves (identical
outlines and ends share one), the marks square across its face (which
stations, of what kind, and which carry their figures), the feather lines of
its scarfs, what each end is, and which edge is which. Both renderers draw
this model and word it through :mod:`stavegen.render.template_words`; neither
decides for itself what to mark.

Marks kept on a template: the heel and head, the file's stations and the
stations a change of taper or wall puts there, the ends of plugs, this
stave's own scarf centres and the evenly spaced marks. Left off: another
stave's scarf centre or segment end (they fall on this piece only because the
stations are shared by every stave, and would have a builder look for a scarf
that is not there). Marks closer than :data:`LABEL_GAP` to the last one
labelled keep their line and lose their figures, so that labels never run
together.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

import numpy as np

from .segments import Point, Segment
from .staves import StavePlan

LABEL_GAP = 24.0  # mm along the piece between two marks that both carry figures

# What a mark is, from the reasons its station is there (first match wins).
MARK_KINDS = ("heel", "head", "plug end", "station", "scarf centre", "spaced")


@dataclass(frozen=True)
class Mark:
    """A line square across the face ``x`` mm from the template's heel end, at ``z`` mm on the spar, where
    the finished face is ``width`` mm wide; ``kind`` is one of :data:`MARK_KINDS`; ``labelled`` says whether
    its figures (position and width) are printed beside it."""

    x: float
    z: float
    width: float
    kind: str
    labelled: bool


@dataclass(frozen=True)
class FeatherLine:
    """Where a scarf's slope begins (``x``, mm along the piece) and the end it slopes to (``tip``)."""

    x: float
    tip: float


@dataclass(frozen=True)
class GroovePoint:
    """The groove at one place along the piece: ``x`` mm from the template's heel end, ``z`` on the spar, its
    centre line ``centre`` across the face (the template's y) and its ``depth`` below the outer face (mm)."""

    x: float
    z: float
    centre: float
    depth: float


@dataclass(frozen=True)
class Groove:
    """A groove along the outer face for a strip let into it (strip numbered from 1 as the file lists them):
    ``width`` mm wide, centred on the stave's middle at every station, its depth below the outer face at each
    of ``points`` (the groove's ends on this piece and every station between; straight between them, as the
    edges are). ``stops_at_start``/``stops_at_end``: the groove ends inside the piece there (its end is drawn
    across), rather than running out of the piece's end."""

    strip: int
    width: float
    points: tuple[GroovePoint, ...]
    stops_at_start: bool
    stops_at_end: bool

    @property
    def edges(self) -> tuple[tuple[Point, ...], tuple[Point, ...]]:
        """The groove's two edge lines (template coordinates): the one nearer y = 0 first."""
        half = self.width / 2
        return (tuple((p.x, p.centre - half) for p in self.points),
                tuple((p.x, p.centre + half) for p in self.points))

    @property
    def ends(self) -> tuple[tuple[Point, Point], ...]:
        """The lines across the groove where it stops inside the piece."""
        half = self.width / 2
        out = []
        for stops, p in ((self.stops_at_start, self.points[0]), (self.stops_at_end, self.points[-1])):
            if stops:
                out.append(((p.x, p.centre - half), (p.x, p.centre + half)))
        return tuple(out)

    @property
    def start(self) -> float:
        return self.points[0].x

    @property
    def end(self) -> float:
        return self.points[-1].x

    @property
    def deepest(self) -> float:
        return max(p.depth for p in self.points)

    @property
    def shallowest(self) -> float:
        return min(p.depth for p in self.points)

    def at(self, x: float) -> tuple[float, float]:
        """(centre, depth) at ``x`` mm along the piece, straight between the points."""
        xs = [p.x for p in self.points]
        return (float(np.interp(x, xs, [p.centre for p in self.points])),
                float(np.interp(x, xs, [p.depth for p in self.points])))


@dataclass(frozen=True)
class Template:
    """One outline to cut out, the segments (identical in shape and ends) it serves, and its marks."""

    segments: tuple[Segment, ...]
    marks: tuple[Mark, ...]
    feather_lines: tuple[FeatherLine, ...]
    heel_end: str  # "scarf tip" or "square cut"
    head_end: str
    notched: bool  # the edge along y = 0 takes the birdsmouth's V (else a bevel)
    straight_notch_edge: bool  # False for a symmetric taper (both edges tapered, centre line drawn)
    box_piece: str | None = None  # a box spar's piece: "side", "face" or "rebated face" (square edges)
    grooves: tuple[Groove, ...] = ()  # grooves for strips let into the outer face

    @property
    def segment(self) -> Segment:
        return self.segments[0]

    @property
    def labels(self) -> tuple[str, ...]:
        return tuple(s.label for s in self.segments)

    @property
    def outline(self) -> tuple[Point, ...]:
        return self.segment.outline

    @property
    def length(self) -> float:
        return self.segment.length

    @property
    def y_range(self) -> tuple[float, float]:
        ys = [y for _, y in self.segment.outline]
        return min(ys), max(ys)

    @property
    def centre_line(self) -> tuple[Point, Point] | None:
        """The dash-dot line both tapered edges are measured from (a symmetric taper), else None."""
        return None if self.straight_notch_edge else ((0.0, 0.0), (self.length, 0.0))


def mark_kind(reasons: set[str], own_scarf: bool) -> str | None:
    """The kind of mark a station with these reasons makes on a piece; None: not marked on it."""
    if "heel" in reasons:
        return "heel"
    if "head" in reasons:
        return "head"
    if "plug" in reasons:
        return "plug end"
    rest = reasons - {"scarf", "segment end"}
    if rest and rest != {"mark"}:
        return "station"
    if own_scarf:
        return "scarf centre"
    if rest == {"mark"}:
        return "spaced"
    return None  # another stave's scarf or segment end


def _marks(seg: Segment, own_scarfs: tuple[float, ...]) -> tuple[Mark, ...]:
    out = []
    last = -math.inf
    for tick in seg.ticks:
        reasons = set(tick.reasons)
        own = "scarf" in reasons and any(abs(tick.z - c) < 0.05 for c in own_scarfs)
        kind = mark_kind(reasons, own)
        if kind is None:
            continue
        labelled = tick.x - last >= LABEL_GAP
        if labelled:
            last = tick.x
        out.append(Mark(x=tick.x, z=tick.z, width=tick.width, kind=kind, labelled=labelled))
    return tuple(out)


def _feather_lines(seg: Segment) -> tuple[FeatherLine, ...]:
    lines = []
    if seg.scarf_at_start:
        lines.append(FeatherLine(x=seg.scarf_length, tip=0.0))
    if seg.scarf_at_end:
        lines.append(FeatherLine(x=seg.length - seg.scarf_length, tip=seg.length))
    return tuple(lines)


def grooves_on(seg: Segment, plan: StavePlan) -> tuple[Groove, ...]:
    """The grooves on a piece of a stave of ``plan``: each strip's groove where its stations meet the piece,
    from its first to its last station on it (or the piece's ends, interpolated: the groove is straight between
    stations), its centre line measured across the face from the piece's notch edge."""
    s0 = plan.s_at(seg.start)
    by_strip: dict[int, list] = {}
    for st in plan.stations:
        for g in st.grooves:
            by_strip.setdefault(g.strip, []).append((st.z, g))
    out = []
    for strip, rows in by_strip.items():
        zs = [z for z, _ in rows]
        lo, hi = max(zs[0], seg.start), min(zs[-1], seg.end)
        if hi - lo <= 1e-6:
            continue
        inside = [z for z in zs if lo + 1e-9 < z < hi - 1e-9]
        centres, depths = [g.centre for _, g in rows], [g.depth for _, g in rows]
        points = []
        for z in [lo, *inside, hi]:
            x = plan.s_at(z) - s0
            notch_y = plan.edges_at(z)[0]
            points.append(GroovePoint(x=x, z=z, centre=notch_y + _interp(z, zs, centres),
                                      depth=_interp(z, zs, depths)))
        out.append(Groove(strip=strip, width=rows[0][1].width, points=tuple(points),
                          stops_at_start=lo > seg.start + 1e-6, stops_at_end=hi < seg.end - 1e-6))
    return tuple(out)


def _interp(z: float, zs: list[float], values: list[float]) -> float:
    return float(np.interp(z, zs, values))


def _key(seg: Segment, own_scarfs: tuple[float, ...], grooves: tuple[Groove, ...] = ()) -> tuple:
    return (round(seg.start, 6), round(seg.end, 6), seg.scarf_at_start, seg.scarf_at_end,
            tuple((round(x, 6), round(y, 6)) for x, y in seg.outline),
            tuple((m.kind, round(m.x, 6)) for m in _marks(seg, own_scarfs)),
            tuple((g.strip, tuple((round(p.x, 6), round(p.centre, 6), round(p.depth, 6)) for p in g.points))
                  for g in grooves))


def make_templates(staves: tuple[tuple[Segment, ...], ...], scarf_centres: tuple[tuple[float, ...], ...],
                   taper: str, notched: bool,
                   plan_for: Callable[[int], StavePlan] | None = None,
                   box: dict[int, str] | None = None) -> tuple[Template, ...]:
    """Every segment's template, identical pieces (outline, ends, marks and grooves) grouped, in cut-list order
    of their first member. ``notched``: the staves take a birdsmouth V (else they are bevelled); ``plan_for``:
    the plan of a stave by its number (from 1), for the grooves (none without it); ``box``: a box spar's piece
    of each stave (by its number), square-edged (pieces of different kinds never share a template)."""
    groups: dict[tuple, tuple[list[Segment], tuple[Groove, ...]]] = {}
    for stave in staves:
        for seg in stave:
            grooves = grooves_on(seg, plan_for(seg.stave)) if plan_for is not None else ()
            key = (_key(seg, scarf_centres[seg.stave - 1], grooves), box.get(seg.stave) if box else None)
            groups.setdefault(key, ([], grooves))[0].append(seg)
    out = []
    for segs, grooves in groups.values():
        seg = segs[0]
        out.append(Template(
            segments=tuple(segs), marks=_marks(seg, scarf_centres[seg.stave - 1]), feather_lines=_feather_lines(seg),
            heel_end="scarf tip" if seg.scarf_at_start else "square cut",
            head_end="scarf tip" if seg.scarf_at_end else "square cut",
            notched=notched, straight_notch_edge=taper != "symmetric", grooves=grooves,
            box_piece=box.get(seg.stave) if box else None))
    return tuple(out)

