"""Cutting templates as DXF: every stave segment at true size, marks and text on their own layers.

The sheet is drawn in the spar's units (inches or millimetres) at 1:1. Only
the stave segments' outlines go on the cutting layer, one closed LWPOLYLINE
each, straight from :attr:`Segment.outline`; everything else (edge marks,
station ticks, scarf feather lines, grain arrows, text, end views) lies on
layers of its own that a router's CAM can switch off. The file holds only
LWPOLYLINE, LINE, CIRCLE and TEXT entities in the standard text style.

Nothing here computes a width, an outline or a section: the figures come
from the layout (:mod:`stavegen.layout`) and the sections it holds. The
renderer only decides where on the sheet each part goes and where its text
stands. Placement is one swappable function (``write_templates(place=...)``):
:func:`parts_in_rows` (the default) lays the segments out one row per stave
with room for every mark; :func:`parts_on_boards` (``output.templates_on_boards
= true``) draws each board of the lumber order at true size on a layer of its
own and puts every segment on it at the rip and offset the order gives, so the
router operator cuts each board as the order says. On boards the segments sit
one kerf apart, so the marks that stand outside an outline (station figures,
scarf notes, the segment's description) are left to the row sheet and the
report; outlines, ticks, feather lines, labels and grain arrows stay.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path
from typing import Callable, Iterable

import ezdxf
import ezdxf.bbox
import ezdxf.zoom
from ezdxf.enums import TextEntityAlignment

from ..layout.lumber import Board
from ..layout.plan import Layout
from ..layout.segments import Segment
from ..pipeline import Design
from ..section.properties import Section
from ..units import to_unit
from .csv_cutlist import fails_line
from .figures import Figures
from .template_words import edge_names, end_view_caption, feather_note, groove_words, mark_line
from .wording import board_words, dressed_size

Point = tuple[float, float]

DXF_VERSION = "R2013"
INSUNITS = {"in": 1, "mm": 4}  # DXF $INSUNITS: 1 inches, 4 millimetres
MEASUREMENT = {"in": 0, "mm": 1}  # DXF $MEASUREMENT: 0 imperial, 1 metric

# Layer name: (ACI colour, lineweight in 1/100 mm, what it holds). Colours and lineweights by layer.
CUT = "STAVE-CUT"
LAYERS: dict[str, tuple[int, int, str]] = {
    CUT: (3, 35, "stave segment outlines: the only lines to cut (green: no other layer has its colour)"),
    "MARK-NOTCH-EDGE": (1, 50, "the edge that takes the birdsmouth V (drawn over the cut line)"),
    "MARK-SQUARE-EDGE": (5, 25, "the square edge (drawn over the cut line)"),
    "MARK-STATIONS": (94, 18, "station ticks across the stave, and their leaders"),
    "MARK-CENTRE": (8, 18, "the centre line of a stave tapered on both edges: both edges are measured from it"),
    "MARK-SCARFS": (6, 35, "scarf feather lines: where each scarf's slope begins"),
    "MARK-GROOVES": (4, 25, "grooves for strips let into the outer face: both edge lines and the ends, to rout to "
                            "the depth given (not to cut through)"),
    "MARK-GRAIN": (30, 25, "grain direction arrows, heel to head"),
    "TEXT-LABELS": (7, 18, "segment labels, edge names, scarf and groove notes"),
    "TEXT-STATIONS": (94, 18, "station positions from the heel and stave widths"),
    "END-STAVE": (5, 25, "end views: stave cross-sections, and the staves of the assembled section"),
    "END-BORE": (8, 18, "end views: the bore"),
    "END-ROUND": (1, 25, "end views: the finished round"),
    "END-PLUG": (34, 25, "end views: plug sections at each plug end"),
    "END-SPIGOT": (40, 25, "a two-piece spar's joint: the wooden spigot's outlines, or the tube's hole in its plugs"),
    "END-FIT": (150, 25, "a two-piece spar's joint: bore-fit gauges of the upper part's bore the spigot slides in"),
    "SHEET-NOTES": (250, 18, "title, notes, captions and the check line"),
    "SHEET-WARNING": (1, 50, "a design that fails its target says so here: do not cut"),
    "BOARD-OUTLINE": (8, 50, "boards of the lumber order at true size (templates on boards): not to cut"),
    "BOARD-RIPS": (8, 18, "the rip lines along each board (templates on boards): not to cut"),
    "TEXT-BOARDS": (8, 18, "board captions: id, size, the segments on it (templates on boards)"),
}
# The layer of each kind of outline in an end view (:data:`stavegen.layout.end_views.ROLES`).
END_LAYERS = {"stave": "END-STAVE", "bore": "END-BORE", "finished": "END-ROUND", "plug": "END-PLUG",
              "spigot": "END-SPIGOT", "fit": "END-FIT"}

CHAR_WIDTH = 0.9  # a generous estimate of a character's advance, in text heights (standard style, txt font)


@dataclass(frozen=True)
class Style:
    """Sizes on the sheet (mm): text heights and clearances."""

    text: float
    label: float
    gap: float

    @classmethod
    def for_units(cls, units: str) -> "Style":
        if units == "in":
            return cls(text=25.4 * 5 / 32, label=25.4 / 4, gap=25.4)
        return cls(text=4.0, label=6.0, gap=25.0)

    def width_of(self, text: str, height: float | None = None) -> float:
        return CHAR_WIDTH * (height or self.text) * len(text)


@dataclass(frozen=True)
class Part:
    """A segment placed on the sheet: its face frame's origin (heel end, notch edge) at ``origin`` (mm).

    ``marks_outside``: whether the marks that stand outside the outline (station
    figures, scarf notes, the description) are drawn; off where parts are packed
    a kerf apart.
    """

    segment: Segment
    origin: Point
    marks_outside: bool = True
    label: str | None = None  # what the part is called on the sheet, if not its segment's label


@dataclass(frozen=True)
class BoardPlace:
    """A board of the lumber order on the sheet: its left end and its offset-0 edge (the top) at ``origin``."""

    board: Board
    origin: Point


Placer = Callable[[Layout, Callable[[Segment], tuple[float, float]], float], list[Part | BoardPlace]]


def parts_in_rows(layout: Layout, clearance: Callable[[Segment], tuple[float, float]], gap: float) -> list[Part]:
    """One row per stave, heel to head, segments in order with ``gap`` (mm) between them.

    ``clearance(segment)`` is the room (below, above) the segment's marks need
    outside its outline. Rows go downwards from y = 0 (the top of stave 1's row).
    """
    parts = []
    top = 0.0
    for stave in layout.staves:
        above = max(clearance(seg)[1] + max(y for _, y in seg.outline) for seg in stave)
        below = max(clearance(seg)[0] - min(y for _, y in seg.outline) for seg in stave)
        y0 = top - above
        x = 0.0
        for seg in stave:
            parts.append(Part(seg, (x, y0)))
            x += seg.length + gap
        top = y0 - below - gap
    return parts


def parts_on_boards(layout: Layout, clearance: Callable[[Segment], tuple[float, float]],
                    gap: float) -> list[Part | BoardPlace]:
    """Each board of the lumber order at true size, its segments where the order cuts them.

    Boards go one under another from y = 0 down, length left to right, each
    board's offset-0 edge at the top with ``gap`` (mm) and a caption's room
    above it. A rip lies ``rip.offset`` below the top edge; a segment lies
    ``cut.offset`` from the board's left end, its outline the edge allowance in
    from the rip's upper edge (the rip width is the segment's finished width
    plus an edge allowance on each edge). ``clearance`` is not used: marks that
    need room outside an outline are left off.
    """
    if layout.lumber is None:
        raise ValueError("templates on boards need the lumber order")
    segments = {seg.label: seg for seg in layout.segments}
    edge = layout.plan.edge_allowance
    out: list[Part | BoardPlace] = []
    top = -gap
    for board in layout.lumber.boards:
        out.append(BoardPlace(board, (0.0, top)))
        for rip in board.rips:
            upper = top - rip.offset - edge
            for cut in rip.cuts:
                seg = segments.get(cut.piece.label)
                if seg is None:  # a piece that is no stave segment (a spigot's layer): its own drawing shows it
                    continue
                out.append(Part(seg, (cut.offset, upper - max(y for _, y in seg.outline)), marks_outside=False))
        top -= board.size.width + 2 * gap
    return out


def placer_for(design: Design) -> Placer:
    """The placement the spar file asks for: on the boards of the order, or in rows (the default)."""
    return parts_on_boards if design.spar.output.templates_on_boards else parts_in_rows


class Pen:
    """Draws into a modelspace in sheet millimetres, writing coordinates in the spar's units."""

    def __init__(self, msp, units: str) -> None:
        self.msp = msp
        self.k = to_unit(1.0, units)
        self.low = [math.inf, math.inf]
        self.high = [-math.inf, -math.inf]

    def _p(self, p: Point) -> tuple[float, float]:
        x, y = p[0] * self.k, p[1] * self.k
        self._reach(x, y, 0.0)
        return (x, y)

    def _reach(self, x: float, y: float, r: float) -> None:
        """Grow the drawing's extents (in file units) to hold a point and ``r`` round it."""
        self.low[0], self.low[1] = min(self.low[0], x - r), min(self.low[1], y - r)
        self.high[0], self.high[1] = max(self.high[0], x + r), max(self.high[1], y + r)

    def poly(self, points: Iterable[Point], layer: str, closed: bool = False) -> None:
        self.msp.add_lwpolyline([self._p(p) for p in points], close=closed, dxfattribs={"layer": layer})

    def line(self, a: Point, b: Point, layer: str) -> None:
        self.msp.add_line(self._p(a), self._p(b), dxfattribs={"layer": layer})

    def circle(self, centre: Point, radius: float, layer: str) -> None:
        c = self._p(centre)
        self._reach(c[0], c[1], radius * self.k)
        self.msp.add_circle(c, radius * self.k, dxfattribs={"layer": layer})

    def text(self, text: str, at: Point, height: float, layer: str,
             align: TextEntityAlignment = TextEntityAlignment.LEFT, rotation: float = 0.0) -> None:
        entity = self.msp.add_text(text, height=height * self.k, rotation=rotation,
                                   dxfattribs={"layer": layer, "style": "Standard"})
        where = self._p(at)
        # Text reaches at most its length in characters times its height from where it is placed.
        self._reach(where[0], where[1], len(text) * height * self.k)
        entity.set_placement(where, align=align)


def _shift(points: Iterable[Point], dx: float, dy: float) -> list[Point]:
    return [(x + dx, y + dy) for x, y in points]


class TemplateSheet:
    """The template sheet of one design: parts, their marks, end views and notes."""

    def __init__(self, design: Design, pen: Pen) -> None:
        self.spar = design.spar
        self.layout: Layout = design.layout
        self.units = self.spar.units
        self.fig = Figures(self.spar)
        self.passed = design.passed
        self.fails = fails_line(design) if not design.passed else ""
        self.style = Style.for_units(self.units)
        self.pen = pen

    # Text ------------------------------------------------------------------
    def pos(self, z: float) -> str:
        return self.fig.position(z)

    def size(self, mm: float) -> str:
        return self.fig.describe(mm)

    def where(self, z: float) -> str:
        """A stave end's position: from the heel, or into an end allowance past the heel or the head."""
        if z < 0:
            return f"{self.pos(-z)} past the heel"
        if z > self.spar.length:
            return f"{self.pos(z - self.spar.length)} past the head"
        return f"{self.pos(z)} from the heel"

    def description(self, seg: Segment) -> str:
        count = sum(1 for s in self.layout.staves[seg.stave - 1] if s.part == seg.part)
        part = {"L": "LOWER PART, ", "U": "UPPER PART, "}.get(seg.part, "")
        return (f"{seg.label}: {part}stave {seg.stave} of {len(self.layout.staves)}, segment {seg.index} of {count}, "
                f"from {self.where(seg.start)} to {self.where(seg.end)}, {self.fig.cut_length(seg.length)} along the "
                f"face; heel end at left")

    def clearance(self, seg: Segment) -> tuple[float, float]:
        """Room (below, above) the segment's marks take outside its outline, mm."""
        s = self.style
        marks = self.layout.template_of[seg.label].marks
        grooves = self.layout.template_of[seg.label].grooves
        longest = max((s.width_of(mark_line(self.fig, m, grooves)) for m in marks if m.labelled), default=0.0)
        return 3 * 1.8 * s.text, s.text + longest + s.text

    # Parts -----------------------------------------------------------------
    def draw_part(self, part: Part) -> None:
        seg, (ox, oy) = part.segment, part.origin
        pen, s = self.pen, self.style

        def at(x: float, y: float) -> Point:
            return (ox + x, oy + y)

        t = self.layout.template_of[seg.label]
        pen.poly(_shift(seg.outline, ox, oy), CUT, closed=True)
        pen.poly(_shift(seg.notch_edge, ox, oy), "MARK-NOTCH-EDGE")
        pen.poly(_shift(seg.square_edge, ox, oy), "MARK-SQUARE-EDGE")
        if t.centre_line is not None:
            pen.poly(_shift(t.centre_line, ox, oy), "MARK-CENTRE")
        top = max(y for _, y in seg.outline)
        bottom = min(y for _, y in seg.outline)

        # The template's marks across the face, the figures of the labelled ones above the part reading upwards.
        last = -math.inf
        for mark in t.marks:
            a, b = seg.edges_at(mark.x)
            pen.line(at(mark.x, a), at(mark.x, b), "MARK-STATIONS")
            if not part.marks_outside or not mark.labelled:
                continue
            tx = max(mark.x, last + 1.6 * s.text)
            last = tx
            base = top + s.text
            pen.poly([at(mark.x, b), at(mark.x, top + 0.3 * s.text), at(tx, base - 0.2 * s.text)], "MARK-STATIONS")
            pen.text(mark_line(self.fig, mark, t.grooves), at(tx + s.text / 2, base), s.text, "TEXT-STATIONS",
                     rotation=90)

        # Grooves for strips let into the outer face: both edges, their ends inside the piece, and a note.
        for groove in t.grooves:
            for edge in groove.edges:
                pen.poly(_shift(edge, ox, oy), "MARK-GROOVES")
            for a, b in groove.ends:
                pen.line(at(*a), at(*b), "MARK-GROOVES")

        # Scarfs: the feather line across the face, a note between it and the scarf's tip.
        for line in t.feather_lines:
            a, b = seg.edges_at(line.x)
            pen.line(at(line.x, a), at(line.x, b), "MARK-SCARFS")
            if not part.marks_outside:
                continue
            pen.text(feather_note(self.fig, t, line), at((line.x + line.tip) / 2, bottom - 1.9 * s.text), s.text,
                     "TEXT-LABELS", align=TextEntityAlignment.MIDDLE_CENTER)
            pen.text("feather line", at(line.x, bottom - 0.9 * s.text), 0.8 * s.text, "TEXT-LABELS",
                     align=TextEntityAlignment.MIDDLE_CENTER)

        # Free stretches between ticks and scarf lines, longest first, for text inside the part.
        cuts = sorted({0.0, seg.length, *[m.x for m in t.marks], *[f.x for f in t.feather_lines]})
        gaps = sorted(zip(cuts, cuts[1:]), key=lambda g: g[1] - g[0], reverse=True)

        def gap(i: int) -> tuple[float, float]:
            return gaps[i % len(gaps)]

        def room(g: tuple[float, float]) -> tuple[float, float]:
            """Lowest square edge and highest notch edge over a stretch: the clear band inside."""
            ends = [seg.edges_at(g[0]), seg.edges_at(g[1])]
            return max(e[0] for e in ends), min(e[1] for e in ends)

        g = gap(0)
        lo, hi = room(g)
        h = min(s.label, 0.45 * (hi - lo))
        pen.text(part.label or seg.label, at((g[0] + g[1]) / 2, (lo + hi) / 2), h, "TEXT-LABELS",
                 align=TextEntityAlignment.MIDDLE_CENTER)
        if self.fails:  # on the part itself, inside its outline: every template of a failing design says so
            pen.text("FAILS ITS TARGET: DO NOT CUT", at((g[0] + g[1]) / 2, lo + 0.15 * (hi - lo)),
                     min(s.text, 0.2 * (hi - lo)), "SHEET-WARNING", align=TextEntityAlignment.MIDDLE_CENTER)

        g = gap(1)
        lo, hi = room(g)
        self.grain_arrow(at, g, lo, hi)

        notch_name, square_name = edge_names(t)
        g = gap(2)
        lo, hi = room(g)
        h = min(s.text, 0.22 * (hi - lo))
        pen.text(square_name, at((g[0] + g[1]) / 2, hi - 0.6 * h), h, "TEXT-LABELS",
                 align=TextEntityAlignment.MIDDLE_CENTER)
        if not t.straight_notch_edge or not part.marks_outside:
            pen.text(notch_name, at((g[0] + g[1]) / 2, lo + 0.6 * h), h, "TEXT-LABELS",
                     align=TextEntityAlignment.MIDDLE_CENTER)
        for groove in t.grooves:
            self.groove_note(at, seg, groove, cuts, (gap(0), gap(1)))
        if not part.marks_outside:
            return

        # Below the notch edge: its name and what the segment is.
        x0 = seg.scarf_length + 6 * s.text if seg.scarf_at_start else s.text  # clear of the "feather line" word
        if t.straight_notch_edge:
            pen.text(notch_name, at(x0, bottom - 1.0 * s.text), s.text, "TEXT-LABELS",
                     align=TextEntityAlignment.TOP_LEFT)
        pen.text(self.description(seg), at(x0, bottom - 3.2 * s.text), s.text, "TEXT-LABELS",
                 align=TextEntityAlignment.TOP_LEFT)

    def draw_board(self, place: BoardPlace) -> None:
        """The board's outline at true size, its rip lines, and its caption above it."""
        board, (x0, top) = place.board, place.origin
        length, width = board.size.length, board.size.width
        pen, s = self.pen, self.style
        pen.poly([(x0, top), (x0 + length, top), (x0 + length, top - width), (x0, top - width)], "BOARD-OUTLINE",
                 closed=True)
        for rip in board.rips:  # the rip's long edges, where they are not the board's own
            for y in (rip.offset, rip.offset + rip.width):
                if 1e-6 < y < width - 1e-6:
                    pen.line((x0, top - y), (x0 + length, top - y), "BOARD-RIPS")
        rips = "; ".join(f"rip {k} {self.fig.dress(rip.width)}: " + ", ".join(c.piece.label for c in rip.cuts)
                         for k, rip in enumerate(board.rips, start=1))
        pen.text(f"{board.id}: {board_words(board.size, self.units)} board, dressed "
                 f"{dressed_size(board.size, self.units)}. {rips}", (x0, top + 0.8 * s.text), s.text,
                 "TEXT-BOARDS")

    def groove_note(self, at: Callable[[float, float], Point], seg: Segment, groove, cuts: list[float],
                    taken: tuple[tuple[float, float], ...]) -> None:
        """The groove's note, along it just above its upper edge, in the longest stretch between marks inside the
        groove's range that the piece's label and grain arrow (``taken``) leave free, if any."""
        s = self.style
        stops = sorted({groove.start, groove.end, *[c for c in cuts if groove.start < c < groove.end]})
        stretches = sorted(zip(stops, stops[1:]), key=lambda g: g[1] - g[0], reverse=True)
        free = [g for g in stretches if g not in taken]
        a, b = (free or stretches)[0]
        top = max(groove.at(a)[0], groove.at(b)[0]) + groove.width / 2
        square = min(seg.edges_at(a)[1], seg.edges_at(b)[1])
        h = min(0.8 * s.text, 0.4 * (square - top))
        if h <= 0:
            return
        self.pen.text(groove_words(self.fig, groove), at(a + s.text, top + 0.3 * h), h, "TEXT-LABELS",
                      align=TextEntityAlignment.BOTTOM_LEFT)

    def grain_arrow(self, at: Callable[[float, float], Point], g: tuple[float, float], lo: float, hi: float) -> None:
        """An arrow along the grain, pointing to the head, in the stretch ``g`` between ``lo`` and ``hi``."""
        s = self.style
        span = g[1] - g[0]
        length = min(0.6 * span, 12 * s.label)
        x0 = (g[0] + g[1]) / 2 - length / 2
        y = lo + 0.4 * (hi - lo)
        head = min(s.text, 0.15 * (hi - lo), length / 4)
        x1 = x0 + length
        self.pen.line(at(x0, y), at(x1 - head, y), "MARK-GRAIN")
        self.pen.poly([at(x1, y), at(x1 - head * 1.6, y + head / 2), at(x1 - head * 1.6, y - head / 2)],
                      "MARK-GRAIN", closed=True)
        h = min(s.text, 0.2 * (hi - lo))
        self.pen.text("GRAIN, heel to head", at(x0, y + 0.5 * h), h, "TEXT-LABELS")

    # End views -------------------------------------------------------------
    def end_views(self, left: float, bottom: float) -> float:
        """The layout's end views (:attr:`Layout.end_views`) in a row whose lowest caption line sits at ``bottom``;
        returns the row's top (mm)."""
        s = self.style
        x = left
        tallest = 0.0
        caption_room = 5 * 1.6 * s.text
        for view in self.layout.end_views:
            x0, y0, x1, y1 = view.bounds
            caption = end_view_caption(self.fig, view)
            width = max(x1 - x0, max(s.width_of(line) for line in caption))
            cx = x + width / 2
            base = bottom + caption_room
            offset = (cx - (x0 + x1) / 2, base - y0)
            for outline in view.outlines:
                self.pen.poly(_shift(list(outline.points), *offset), END_LAYERS[outline.role], closed=True)
            for circle in view.circles:
                self.pen.circle(offset, circle.radius, END_LAYERS[circle.role])
            for i, line in enumerate(caption):
                self.pen.text(line, (cx, bottom + caption_room - (i + 1) * 1.6 * s.text), s.text, "SHEET-NOTES",
                              align=TextEntityAlignment.TOP_CENTER)
            tallest = max(tallest, y1 - y0)
            x += width + s.gap
        return bottom + caption_room + tallest

    # Notes -----------------------------------------------------------------
    def notes(self, left: float, bottom: float, on_boards: bool = False) -> None:
        s, spar = self.style, self.spar
        unit = "inches" if self.units == "in" else "millimetres"
        check = 304.8 if self.units == "in" else 300.0
        joint = spar.hollow.joint.kind
        lines = [
            f"{spar.name}: stave templates at 1:1, in {unit}. {len(self.layout.staves)} staves, {joint}.",
            f"Cut only the layer {CUT}; every other layer is marks, text and end views.",
            "Outlines are the finished stave widths before the notch, with no edge allowance; "
            "stave ends include the end allowance.",
            "Check the scale before cutting: the line below must measure "
            f"{self.size(check)}. Check every figure against the cut list.",
        ]
        if on_boards:
            lines.insert(2, "Each board of the lumber order is drawn at true size (layer BOARD-OUTLINE, not to cut) "
                            "with its segments where the order cuts them; station figures and scarf notes are in "
                            "the report.")
        y = bottom + 2.5 * s.text
        self.pen.line((left, bottom), (left + check, bottom), "SHEET-NOTES")
        for tick_x in (left, left + check):
            self.pen.line((tick_x, bottom - s.text / 2), (tick_x, bottom + s.text / 2), "SHEET-NOTES")
        for line in reversed(lines):
            self.pen.text(line, (left, y), s.text, "SHEET-NOTES")
            y += 1.8 * s.text
        self.pen.text(spar.name.upper(), (left, y + 0.5 * s.text), s.label, "SHEET-NOTES")
        if self.fails:
            self.pen.text(self.fails, (left, y + 0.5 * s.text + 2.5 * s.label), s.label, "SHEET-WARNING")


def setup_document(units: str):
    """A new DXF document with our layers, in the spar's units.

    Identical input gives an identical file: ezdxf's switch for fixed metadata
    (documented for comparing documents) writes constant creation and update
    dates ($TDCREATE, $TDUPDATE), nil $FINGERPRINTGUID/$VERSIONGUID and a
    constant ezdxf marker in place of the clock and random GUIDs; handles are
    handed out in drawing order ($HANDSEED follows them). ezdxf lists the
    object classes in use in the order of a Python set, which follows the
    hash seed; registering them here in sorted order fixes that order.
    """
    ezdxf.options.write_fixed_meta_data_for_testing = True
    doc = ezdxf.new(DXF_VERSION, setup=False)
    for name in sorted(doc.entitydb.dxf_types_in_use()):
        doc.classes.add_class(name)
    doc.units = INSUNITS[units]
    doc.header["$INSUNITS"] = INSUNITS[units]
    doc.header["$MEASUREMENT"] = MEASUREMENT[units]
    doc.header["$LWDISPLAY"] = 1
    # Header sizes in the drawing's own unit (a new document's are metric: 2.5 high text, A3 limits in mm).
    style = Style.for_units(units)
    text = to_unit(style.text, units)
    for name in ("$TEXTSIZE", "$DIMTXT", "$DIMASZ"):
        doc.header[name] = text
    doc.header["$DIMEXO"] = text / 4
    doc.header["$DIMEXE"] = text / 2
    doc.header["$DIMGAP"] = text / 4
    doc.styles.get("Standard").dxf.font = "txt"
    for name, (colour, weight, what) in LAYERS.items():
        layer = doc.layers.add(name, color=colour, lineweight=weight)
        layer.description = what
    return doc


def template_document(design: Design, place: Placer | None = None):
    """The template sheet of ``design`` as an ezdxf document (its layout must be worked out).

    ``place`` defaults to what the spar file asks (:func:`placer_for`).
    """
    if design.layout is None:
        raise ValueError("templates need the layout: design(spar, layout=True)")
    place = place or placer_for(design)
    units = design.spar.units
    doc = setup_document(units)
    pen = Pen(doc.modelspace(), units)
    sheet = TemplateSheet(design, pen)
    items = place(design.layout, sheet.clearance, sheet.style.gap)
    for item in items:
        if isinstance(item, BoardPlace):
            sheet.draw_board(item)
        else:
            sheet.draw_part(item)
    top = sheet.end_views(0.0, 2 * sheet.style.gap)
    sheet.notes(0.0, top + sheet.style.gap, on_boards=any(isinstance(i, BoardPlace) for i in items))
    set_extents(doc, pen)
    return doc


def set_extents(doc, pen: Pen) -> None:
    """$EXTMIN/$EXTMAX (and the opening view) from everything the pen drew.

    The pen keeps the extents as it draws (text counted generously, by its
    length in characters times its height), so nothing is measured twice.
    """
    msp = doc.modelspace()
    low, high = (pen.low[0], pen.low[1], 0.0), (pen.high[0], pen.high[1], 0.0)
    msp.reset_extents(low, high)
    doc.update_extents()
    msp.reset_limits((low[0], low[1]), (high[0], high[1]))  # the drawing's limits: its extents, its own unit
    doc.header["$LIMMIN"] = (low[0], low[1])
    doc.header["$LIMMAX"] = (high[0], high[1])
    ezdxf.zoom.center(msp, ((low[0] + high[0]) / 2, (low[1] + high[1]) / 2),
                      (high[0] - low[0], high[1] - low[1]))


def write_templates(design: Design, path: str | Path, place: Placer | None = None) -> None:
    """Write the DXF cutting templates of ``design`` to ``path`` (placed as the spar file asks, or by ``place``)."""
    template_document(design, place).saveas(Path(path))


def cut_document(design: Design, place: Placer | None = None, full=None):
    """The cut-only sheet: the template sheet with nothing but the outlines to cut (layer STAVE-CUT).

    For a CAM program that cannot switch layers off: the same placement, the
    same outlines at the same coordinates, no marks, text or end views. ``full``:
    the template sheet already made for ``design`` (else it is made here).
    """
    full = full if full is not None else template_document(design, place)
    doc = setup_document(design.spar.units)
    msp = doc.modelspace()
    pen = Pen(msp, design.spar.units)
    for e in full.modelspace().query(f'LWPOLYLINE[layer=="{CUT}"]'):
        points = list(e.get_points("xy"))  # copied as they are, in the sheet's unit
        for x, y in points:
            pen._reach(x, y, 0.0)
        msp.add_lwpolyline(points, close=True, dxfattribs={"layer": CUT})
    set_extents(doc, pen)
    return doc


def write_cut_sheet(design: Design, path: str | Path, place: Placer | None = None) -> None:
    """Write the cut-only DXF sheet of ``design`` to ``path``."""
    cut_document(design, place).saveas(Path(path))

