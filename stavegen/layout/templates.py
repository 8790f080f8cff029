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

from .segments import Point, Segment

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


def _key(seg: Segment, own_scarfs: tuple[float, ...]) -> tuple:
    return (round(seg.start, 6), round(seg.end, 6), seg.scarf_at_start, seg.scarf_at_end,
            tuple((round(x, 6), round(y, 6)) for x, y in seg.outline),
            tuple((m.kind, round(m.x, 6)) for m in _marks(seg, own_scarfs)))


def make_templates(staves: tuple[tuple[Segment, ...], ...], scarf_centres: tuple[tuple[float, ...], ...],
                   taper: str, notched: bool, box: dict[int, str] | None = None) -> tuple[Template, ...]:
    """Every segment's template, identical pieces (outline, ends and marks) grouped, in cut-list order of
    their first member. ``notched``: the staves take a birdsmouth V (else they are bevelled); ``box``: a box
    spar's piece of each stave (by its number), square-edged."""
    groups: dict[tuple, list[Segment]] = {}
    for stave in staves:
        for seg in stave:
            groups.setdefault(_key(seg, scarf_centres[seg.stave - 1]), []).append(seg)
    out = []
    for segs in groups.values():
        seg = segs[0]
        out.append(Template(
            segments=tuple(segs), marks=_marks(seg, scarf_centres[seg.stave - 1]), feather_lines=_feather_lines(seg),
            heel_end="scarf tip" if seg.scarf_at_start else "square cut",
            head_end="scarf tip" if seg.scarf_at_end else "square cut",
            notched=notched, straight_notch_edge=taper != "symmetric",
            box_piece=box.get(seg.stave) if box else None))
    return tuple(out)

