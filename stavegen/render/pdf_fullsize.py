"""``NAME-fullsize.pdf``: every stave segment's outline at 1:1, tiled over letter or A4 pages.

How the sheet is made (all model figures in mm, turned into points by
:data:`~.pdf_common.MM` and nothing else):

- Segments of identical shape (same stretch of the spar, so the same
  ``Segment.outline``) share one template, labelled with every segment it
  serves and how many pieces to mark out from it.
- Each template lies along its own shelf of one long imaginary sheet (the
  *canvas*: x along the stave from its heel end, y downward), heel end at
  the left. Shelves are stacked into rows of pages without crossing a row
  where they fit, so a row of pages joins end to end only.
- The canvas is cut into tiles, one per page, each tile the page's window
  inside the printable area less a header. Neighbouring columns overlap by
  :data:`OVERLAP`; registration crosses sit in the overlaps, where two
  pages show the same part of the canvas. Tiles with nothing on them are
  not printed.
- Page 1 is the page map. Every page carries a header with its row and
  column, the spar, file, build date and a scale check bar exactly 4 in or
  100 mm long.
- After the templates, the end views (:attr:`stavegen.layout.plan.Layout.end_views`: stave ends, assembled
  sections, plug ends, a joint's spigot and gauges) at 1:1, packed on pages of
  their own, each whole on one page with its caption; a view larger than a
  page is listed there and left to the DXF.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.pdfgen import canvas as pdfcanvas

from ..layout.end_views import EndView
from ..layout.templates import Template
from ..pipeline import Design
from ..units import MM_PER_INCH, format_length
from .csv_cutlist import fails_line
from .figures import Figures
from .template_words import (edge_names, end_view_caption, end_words, feather_note, groove_words, mark_lines,
                             template_name)
from .pdf_common import BOLD, FONT, MM, ask_actual_size, build_date, draw_scale_bar, paper_size, source_name, \
    scale_bar_length

# Page furniture, mm. Margins keep everything inside what an ordinary printer prints.
MARGIN = {"letter": 0.4 * MM_PER_INCH, "a4": 10.0}
OVERLAP = {"in": 0.5 * MM_PER_INCH, "mm": 12.0}  # neighbouring columns of pages share this much
HEADER = 17.0  # printed band at the top of the printable area
LANE = 8.0  # clear band at the top and bottom of every window, for the registration crosses
LANE_ABOVE = 9.0  # above a template: station positions and widths
LANE_BELOW = 4.5  # below a template: end notes
SHELF_GAP = 4.0
START_X = 10.0  # canvas x of every template's heel end
END_PAD = 8.0  # canvas past a template's head end that still belongs to it
LABEL_REPEAT = 140.0  # the template's name repeats this often along it
CROSS = 3.0  # half the arm of a registration cross


@dataclass(frozen=True)
class Placement:
    """Where a template lies on the canvas: its outline's (x, y) goes to (x0 + x, y0 − y), mm."""

    template: Template
    x0: float
    y0: float
    top: float  # canvas y of the top of its shelf (labels included)
    bottom: float

    def canvas(self, x: float, y: float) -> tuple[float, float]:
        return self.x0 + x, self.y0 - y

    @property
    def right(self) -> float:
        return self.x0 + self.template.segment.length + END_PAD

    @property
    def left(self) -> float:
        return self.x0 - END_PAD


@dataclass(frozen=True)
class Tile:
    """One page's window on the canvas: row and column from 1, its top-left corner and size (mm)."""

    row: int
    col: int
    x: float
    y: float
    width: float
    height: float
    page: int

    @property
    def name(self) -> str:
        return f"R{self.row}-C{self.col}"

    @property
    def bounds(self) -> tuple[float, float, float, float]:
        """(x0, y0, x1, y1) on the canvas, mm (y downward)."""
        return self.x, self.y, self.x + self.width, self.y + self.height


@dataclass(frozen=True)
class Sheet:
    """The whole tiling: paper, where the window sits on every page, templates, tiles."""

    page_size: tuple[float, float]  # points, landscape
    margin: float  # mm
    window: tuple[float, float, float, float]  # (x, y, width, height) on the page, points
    overlap: float  # mm between neighbouring columns
    row_overlap: float  # mm between neighbouring rows (0 when no template crosses a row)
    placements: tuple[Placement, ...]
    tiles: tuple[Tile, ...]

    @property
    def printable(self) -> tuple[float, float, float, float]:
        """(x0, y0, x1, y1) of the printable area on every page, points."""
        w, h = self.page_size
        m = self.margin * MM
        return m, m, w - m, h - m

    @property
    def rows(self) -> int:
        return max(t.row for t in self.tiles)

    def columns(self, row: int) -> int:
        return max(t.col for t in self.tiles if t.row == row)

    def tile_at(self, row: int, col: int) -> Tile | None:
        for t in self.tiles:
            if t.row == row and t.col == col:
                return t
        return None

    def to_page(self, tile: Tile, x: float, y: float) -> tuple[float, float]:
        """Canvas (mm, y down) to page (points, y up) on ``tile``'s page."""
        wx, wy, _, wh = self.window
        return wx + (x - tile.x) * MM, wy + wh - (y - tile.y) * MM


def templates(design: Design) -> tuple[Template, ...]:
    """The layout's templates (:attr:`stavegen.layout.plan.Layout.templates`): identical pieces share one."""
    return design.layout.templates


def sheet(design: Design) -> Sheet:
    """The tiling of every template over the spar's paper (landscape)."""
    spar = design.spar
    page_w, page_h = paper_size(spar, landscape=True)
    margin = MARGIN[spar.output.paper]
    width = page_w / MM - 2 * margin
    height = page_h / MM - 2 * margin - HEADER
    overlap = OVERLAP[spar.units]
    window = (margin * MM, margin * MM, width * MM, height * MM)
    usable = height - 2 * LANE
    items = templates(design)
    heights = [LANE_ABOVE + (t.y_range[1] - t.y_range[0]) + LANE_BELOW for t in items]
    row_overlap = 0.0 if max(heights) <= usable else overlap
    step_y = height - row_overlap
    placements = []
    cursor = LANE
    for t, h in zip(items, heights):
        row = math.floor(cursor / step_y)
        row_end = row * step_y + height - LANE
        if h <= usable and cursor + h > row_end:
            cursor = (row + 1) * step_y + LANE
        top = cursor
        y0 = top + LANE_ABOVE + t.y_range[1]
        placements.append(Placement(template=t, x0=START_X, y0=y0, top=top, bottom=top + h))
        cursor = top + h + SHELF_GAP
    step_x = width - overlap
    tiles: list[Tile] = []
    last_row = math.floor((max(p.bottom for p in placements) - 1e-9) / step_y)
    page = 2  # page 1 is the map
    for r in range(last_row + 1):
        y = r * step_y
        here = [p for p in placements if p.bottom > y and p.top < y + height]
        if not here:
            continue
        right = max(p.right for p in here)
        cols = max(1, math.ceil((right - width) / step_x - 1e-9) + 1)
        for c in range(cols):
            x = c * step_x
            if any(p.left < x + width and p.right > x for p in here):
                tiles.append(Tile(row=r + 1, col=c + 1, x=x, y=y, width=width, height=height, page=page))
                page += 1
    return Sheet(page_size=(page_w, page_h), margin=margin, window=window, overlap=overlap,
                 row_overlap=row_overlap, placements=tuple(placements), tiles=tuple(tiles))


# End views ------------------------------------------------------------------------------------------

CAPTION_LINE = 3.2  # mm between caption lines under an end view
END_GAP = 8.0  # mm between end views


@dataclass(frozen=True)
class EndPlacement:
    """An end view on an end-view page: its origin at (cx, cy) in the page's window (mm from the window's top
    left, y downward), its caption lines below it."""

    view: EndView
    page: int  # from 1 among the end-view pages
    cx: float
    cy: float
    caption: tuple[str, ...]
    caption_top: float


def end_pages(design: Design, sheet_: Sheet) -> tuple[list[EndPlacement], list[EndView]]:
    """The end views packed in rows on pages of the sheet's window (each whole on one page at 1:1), and those
    too large for any page."""
    fig = Figures(design.spar)
    _, _, width, height = (v / MM for v in sheet_.window)
    placed: list[EndPlacement] = []
    too_big: list[EndView] = []
    page, x, y, row = 1, END_GAP, LANE, 0.0
    for view in design.layout.end_views:
        x0, y0, x1, y1 = view.bounds
        caption = tuple(end_view_caption(fig, view))
        text_w = max(stringWidth(line, BOLD if i == 0 else FONT, 6.5) for i, line in enumerate(caption)) / MM
        w = max(x1 - x0, text_w)
        h = (y1 - y0) + 2 + CAPTION_LINE * len(caption)
        if w > width - 2 * END_GAP or h > height - 2 * LANE:
            too_big.append(view)
            continue
        if x + w > width - END_GAP:
            x, y, row = END_GAP, y + row + END_GAP, 0.0
        if y + h > height - LANE:
            page, x, y, row = page + 1, END_GAP, LANE, 0.0
        cx = x + w / 2 - (x0 + x1) / 2
        cy = y + y1  # the view's top edge at y (model y up, window y down)
        placed.append(EndPlacement(view, page, cx, cy, caption, y + (y1 - y0) + 2))
        x += w + END_GAP
        row = max(row, h)
    return placed, too_big


def _end_page(c, design: Design, sheet_: Sheet, placed: list[EndPlacement], too_big: list[EndView],
              number: int, first_page: int, total: int) -> None:
    pages = max(p.page for p in placed) if placed else 1
    _header(c, design, sheet_, f"{design.spar.name}: end views at 1:1", f"E{number}",
            f"end views, page {number} of {pages}  |  page {first_page + number - 1} of {total}  |  "
            "each whole on its page, at actual size")
    wx, wy, ww, wh = sheet_.window

    def pt(x: float, y: float) -> tuple[float, float]:
        return wx + x * MM, wy + wh - y * MM

    c.saveState()
    for place in (p for p in placed if p.page == number):
        for outline in place.view.outlines:
            path = c.beginPath()
            for i, (x, y) in enumerate(outline.points):
                px, py = pt(place.cx + x, place.cy - y)
                path.moveTo(px, py) if i == 0 else path.lineTo(px, py)
            path.close()
            c.setLineWidth(0.3 if outline.role in ("bore", "fit") else 0.5)
            c.setStrokeGray(0.45 if outline.role == "bore" else 0.0)
            c.drawPath(path, stroke=1, fill=0)
        for circle in place.view.circles:
            px, py = pt(place.cx, place.cy)
            c.setLineWidth(0.5)
            c.setStrokeGray(0.0)
            c.circle(px, py, circle.radius * MM, stroke=1, fill=0)
        x0, _, x1, _ = place.view.bounds
        mid = place.cx + (x0 + x1) / 2
        for i, line in enumerate(place.caption):
            c.setFont(BOLD if i == 0 else FONT, 6.5)
            c.drawCentredString(*pt(mid, place.caption_top + (i + 1) * CAPTION_LINE), line)
    if number == 1 and too_big:
        c.setFont(BOLD, 7)
        names = "; ".join(end_view_caption(Figures(design.spar), v)[0] for v in too_big)
        for j, line in enumerate(_wrap(c, f"Larger than a page, drawn at 1:1 in the DXF templates only: {names}.",
                                       ww, BOLD, 7)):
            c.drawString(wx, wy + 4 + 9 * j, line)
    c.restoreState()


# Drawing ---------------------------------------------------------------------------------------------


class _Painter:
    """Draws canvas items onto one page, clipped to its window."""

    def __init__(self, c, sheet_: Sheet, tile: Tile) -> None:
        self.c, self.sheet, self.tile = c, sheet_, tile

    def pt(self, x: float, y: float) -> tuple[float, float]:
        return self.sheet.to_page(self.tile, x, y)

    def visible(self, x0: float, x1: float, y0: float, y1: float) -> bool:
        bx0, by0, bx1, by1 = self.tile.bounds
        return x1 >= bx0 and x0 <= bx1 and y1 >= by0 and y0 <= by1

    def polyline(self, points, close: bool = False, width: float = 0.5, dash=None, gray: float = 0.0) -> None:
        xs, ys = [x for x, _ in points], [y for _, y in points]
        if not self.visible(min(xs) - 1, max(xs) + 1, min(ys) - 1, max(ys) + 1):  # off this page: nothing shows
            return
        c = self.c
        c.saveState()
        c.setLineWidth(width)
        c.setStrokeGray(gray)
        if dash:
            c.setDash(list(dash))
        path = c.beginPath()
        for i, (x, y) in enumerate(points):
            px, py = self.pt(x, y)
            if i == 0:
                path.moveTo(px, py)
            else:
                path.lineTo(px, py)
        if close:
            path.close()
        c.drawPath(path, stroke=1, fill=0)
        c.restoreState()

    def text(self, x: float, y: float, s: str, size: float = 6.5, align: str = "left", font: str = FONT,
             gray: float = 0.0) -> None:
        if not self.visible(x - 80, x + 80, y - 5, y + 5):
            return
        c = self.c
        px, py = self.pt(x, y)
        c.setFont(font, size)
        c.setFillGray(gray)
        {"left": c.drawString, "right": c.drawRightString, "centre": c.drawCentredString}[align](px, py, s)
        c.setFillGray(0)


def _draw_template(p: _Painter, design: Design, place: Placement) -> None:
    t = place.template
    seg = t.segment
    fig = Figures(design.spar)
    if not p.visible(place.left, place.right, place.top, place.bottom):
        return
    lo, hi = t.y_range
    p.polyline([place.canvas(x, y) for x, y in t.outline], close=True, width=0.6)
    if t.centre_line is not None:
        p.polyline([place.canvas(x, y) for x, y in t.centre_line], width=0.3, dash=(6, 2, 1, 2), gray=0.4)
    # The template's marks across the piece, the figures of the labelled ones above it.
    top_y = place.top
    for mark in t.marks:
        x = place.x0 + mark.x
        if not p.visible(x - 80, x + 80, -math.inf, math.inf):  # neither its line nor its figures on this page
            continue
        a, b = seg.edges_at(mark.x)
        p.polyline([place.canvas(mark.x, a - 2), place.canvas(mark.x, b + 2)], width=0.35)
        if mark.labelled and p.visible(x - 80, x + 80, top_y - 2, top_y + 12):  # text() would show a line
            first, second = mark_lines(fig, mark, t.grooves)
            p.text(place.x0 + mark.x, top_y + 3.4, first, size=6.5, align="centre", font=BOLD)
            p.text(place.x0 + mark.x, top_y + 6.6, second, size=6, align="centre")
    # Scarf feather lines: where the slope begins.
    below = place.bottom - 1.2
    for line in t.feather_lines:
        p.polyline([place.canvas(line.x, lo - 2), place.canvas(line.x, hi + 2)], width=0.5, dash=(3, 2))
        note = feather_note(fig, t, line)
        if line.tip < line.x:
            p.text(place.x0 + line.x + 1, below, note, size=6)
        else:
            p.text(place.x0 + line.x - 1, below, note, size=6, align="right")
    # Grooves for strips let into the outer face: both edges dashed, the ends across, a note above the groove.
    for groove in t.grooves:
        for edge in groove.edges:
            p.polyline([place.canvas(x, y) for x, y in edge], width=0.35, dash=(4, 1.5))
        for a, b in groove.ends:
            p.polyline([place.canvas(*a), place.canvas(*b)], width=0.35)
        stops = sorted({groove.start, groove.end, *(m.x for m in t.marks if groove.start < m.x < groove.end)})
        for a, b in zip(stops, stops[1:]):  # the note in every stretch it fits, so each page shows it
            note = groove_words(fig, groove)
            if p.c.stringWidth(note, FONT, 5.5) / MM <= b - a - 4:
                top = max(groove.at(a)[0], groove.at(b)[0]) + groove.width / 2
                p.text(place.x0 + a + 2, place.y0 - top - 1.0, note, size=5.5)
    heel, head = end_words(t)
    p.text(place.x0, below, heel, size=6)
    p.text(place.x0 + t.length, below, head, size=6, align="right")
    # The name, repeated along the piece between marks, just inside the notch edge (or above the
    # centre line), so that every page shows it whole at least once.
    edge = "centre line dash-dot, both edges tapered" if t.centre_line is not None else edge_names(t)[0]
    name = f"{template_name(t)}   |   {edge}   |   head end >"
    size = 7
    long = p.c.stringWidth(name, BOLD, size) / MM
    y_text = 1.2 if t.centre_line is not None else lo + 2.2
    stops = sorted({0.0, t.length, *(f.x for f in t.feather_lines), *(m.x for m in t.marks)})
    first = True
    for a, b in zip(stops, stops[1:]):
        x = a + 3
        while x + long <= b - 3:
            p.text(place.x0 + x, place.y0 - y_text, name, size=size, font=BOLD if first else FONT)
            first = False
            x += LABEL_REPEAT
    if first:  # no gap wide enough: once, from the heel end
        p.text(place.x0 + 3, place.y0 - y_text, name, size=size, font=BOLD)


def crosses(sheet_: Sheet) -> list[tuple[float, float]]:
    """Canvas points of the registration crosses: in every overlap, near the top and bottom of each row."""
    pts = []
    for t in sheet_.tiles:
        right = sheet_.tile_at(t.row, t.col + 1)
        if right is not None:
            x = right.x + sheet_.overlap / 2
            pts += [(x, t.y + LANE / 2), (x, t.y + t.height - LANE / 2)]
        below = sheet_.tile_at(t.row + 1, t.col)
        if below is not None and sheet_.row_overlap > 0:
            y = below.y + sheet_.row_overlap / 2
            pts += [(t.x + LANE / 2 + sheet_.overlap, y), (t.x + t.width / 2, y)]
    return pts


def _draw_cross(p: _Painter, x: float, y: float) -> None:
    if not p.visible(x - CROSS, x + CROSS, y - CROSS, y + CROSS):
        return
    p.polyline([(x - CROSS, y), (x + CROSS, y)], width=0.4)
    p.polyline([(x, y - CROSS), (x, y + CROSS)], width=0.4)
    px, py = p.pt(x, y)
    p.c.setLineWidth(0.4)
    p.c.circle(px, py, CROSS * 0.55 * MM, stroke=1, fill=0)


def _header(c, design: Design, sheet_: Sheet, title: str, right: str, detail: str) -> None:
    spar = design.spar
    x0, _, x1, y1 = sheet_.printable
    c.setFillGray(0)
    c.setFont(BOLD, 11)
    c.drawString(x0, y1 - 11, title)
    c.setFont(FONT, 6.5)
    c.drawString(x0, y1 - 20, detail)
    c.drawString(x0, y1 - 28, f"{spar.name}  |  {source_name(spar)}  |  built {build_date()}")
    if not design.passed:
        c.setFillColorRGB(0.75, 0.08, 0.08)
        c.setFont(BOLD, 7.5)
        c.drawString(x0, y1 - 38, fails_line(design)[:150])
        c.setFillGray(0)
    c.setFont(BOLD, 18)
    c.drawRightString(x1, y1 - 18, right)
    bar, words, _ = scale_bar_length(spar)
    bx = x1 - 84 - bar
    c.setFont(BOLD, 6.5)
    c.drawString(bx, y1 - 9, "PRINT AT ACTUAL SIZE (100 %, no scaling, not 'fit to page').")
    c.setFont(FONT, 6.5)
    c.drawString(bx, y1 - 17, f"This bar must measure exactly {words}; if it does not, do not cut to these pages.")
    draw_scale_bar(c, bx, y1 - 28, spar, height=5)


def _tile_page(c, design: Design, sheet_: Sheet, tile: Tile, total: int,
               marks: list[tuple[float, float]]) -> None:
    """One tile's page; ``marks`` are the sheet's registration crosses (:func:`crosses`)."""
    left = sheet_.tile_at(tile.row, tile.col - 1)
    right = sheet_.tile_at(tile.row, tile.col + 1)
    up = sheet_.tile_at(tile.row - 1, tile.col) if sheet_.row_overlap else None
    down = sheet_.tile_at(tile.row + 1, tile.col) if sheet_.row_overlap else None
    joins = [f"{word} {n.name}" for word, n in (("left", left), ("right", right), ("above", up), ("below", down))
             if n is not None]
    detail = (f"row {tile.row} of {sheet_.rows}, column {tile.col} of {sheet_.columns(tile.row)}  |  "
              f"page {tile.page} of {total}  |  joins: {', '.join(joins) if joins else 'none'}  |  "
              f"templates at 1:1, heel end to the left")
    _header(c, design, sheet_, f"{design.spar.name}: full-size stave templates", tile.name, detail)
    wx, wy, ww, wh = sheet_.window
    c.saveState()
    c.setLineWidth(0.3)
    c.setStrokeGray(0.55)
    c.rect(wx, wy, ww, wh, stroke=1, fill=0)
    path = c.beginPath()
    path.rect(wx, wy, ww, wh)
    c.clipPath(path, stroke=0, fill=0)
    p = _Painter(c, sheet_, tile)
    gray_dash = dict(width=0.3, dash=(2, 3), gray=0.6)
    if left is not None:
        p.polyline([(tile.x + sheet_.overlap, tile.y), (tile.x + sheet_.overlap, tile.y + tile.height)],
                   **gray_dash)
    if right is not None:
        p.polyline([(right.x, tile.y), (right.x, tile.y + tile.height)], **gray_dash)
        p.text(right.x - 1.5, tile.y + LANE / 2 + 0.8, f"{right.name} goes over this strip >",
               size=5.5, align="right", gray=0.4)
    if left is not None:
        p.text(tile.x + sheet_.overlap + 1.5, tile.y + LANE / 2 + 0.8,
               f"< lay this page over {left.name}, crosses on crosses", size=5.5, gray=0.4)
    if up is not None:
        p.polyline([(tile.x, tile.y + sheet_.row_overlap), (tile.x + tile.width, tile.y + sheet_.row_overlap)],
                   **gray_dash)
    if down is not None:
        p.polyline([(tile.x, down.y), (tile.x + tile.width, down.y)], **gray_dash)
    for place in sheet_.placements:
        _draw_template(p, design, place)
    for x, y in marks:
        _draw_cross(p, x, y)
    c.restoreState()


def _map_page(c, design: Design, sheet_: Sheet, total: int) -> None:
    spar = design.spar
    units = spar.units
    _header(c, design, sheet_, f"{spar.name}: full-size stave templates - page map",
            "MAP", f"page 1 of {total}  |  {len(sheet_.tiles)} template pages in {sheet_.rows} "
                   f"row{'s' if sheet_.rows > 1 else ''}")
    x0, y0, x1, y1 = sheet_.printable
    overlap = format_length(sheet_.overlap, units)
    bar = scale_bar_length(spar)[1]
    n_t = len(sheet_.placements)
    edge = ("Both edges taper about the dash-dot centre line." if design.layout.plan.taper == "symmetric"
            else "The notch edge of every piece is straight; the taper comes off the square edge.")
    steps = [
        "Print every page at actual size: choose 100 % / 'actual size' / 'no scaling' in the print dialog, "
        "never 'fit to page'.",
        f"Check the bar at the top of each page with a good rule: it must measure exactly {bar}. "
        "Check one station spacing on a template too. Reprint any page that is off.",
        (f"Each row of the map below is a strip of pages joined end to end. Trim each page, except the "
         f"first of a row, along the left edge of its grey frame, lay it over the page to its left "
         f"(the pages overlap by {overlap}) so the registration crosses meet, and tape it."
         if sheet_.row_overlap == 0 else
         f"The pieces are wider than one page, so pages join both ways. Trim each page along the left and top "
         f"edges of its grey frame (not the first column's left or the first row's top), lay it over its "
         f"neighbours (the pages overlap by {overlap}) so the registration crosses meet, and tape it."),
        f"{n_t} template{'s' if n_t > 1 else ''}: segments of the same shape share one; each says which "
        "segments it serves and how many pieces to mark out. Heel end to the left on every page.",
        "Station lines: position from the heel of the finished spar and the finished stave width there "
        "(before the notch). Check every piece against the cut list in the report before cutting.",
        edge + " Dashed lines across a piece are where a scarf's slope begins.",
        "Before cutting, read the safety notes on page 1 of the shop report (" + design.spar.slug +
        "-report.pdf): among them, table-saw and router cuts on narrow staves call for push sticks, "
        "featherboards and guards.",
    ]
    c.setFont(FONT, 8)
    y = y1 - HEADER * MM - 4
    for i, s in enumerate(steps, start=1):
        for j, line in enumerate(_wrap(c, f"{i}. {s}", x1 - x0, FONT, 8)):
            c.drawString(x0 + (0 if j == 0 else 9), y, line)
            y -= 10
        y -= 2
    # The map: every row of pages as a strip of rectangles, the templates drawn small inside.
    separate = sheet_.row_overlap == 0
    canvas_w = max(t.x + t.width for t in sheet_.tiles)
    height = sheet_.tiles[0].height
    rows = sheet_.rows
    gap = 16.0  # points between strips, for the row's caption
    box_top = y - 6
    avail_w, avail_h = x1 - x0, box_top - y0
    if separate:
        k = min(avail_w / canvas_w, (avail_h - rows * gap) / (rows * height))
    else:
        k = min(avail_w / canvas_w, (avail_h - gap) / max(t.y + t.height for t in sheet_.tiles))

    def m(x: float, yy: float) -> tuple[float, float]:
        row = min(int(yy // height), rows - 1) if separate else 0
        return x0 + x * k, box_top - gap * (row + 1) - yy * k

    c.saveState()
    for r in range(1, rows + 1):
        here = [p for p in sheet_.placements if p.top < r * height and p.bottom > (r - 1) * height]
        if separate or r == 1:
            cx, cy = m(0, (r - 1) * height + 0.01)
            c.setFont(BOLD, 7.5)
            c.setFillGray(0)
            names = ", ".join(p.template.labels[0] for p in (here if separate else sheet_.placements))
            c.drawString(cx, cy + 4, f"Row {r}, top to bottom: template{'s' if len(here) > 1 else ''} {names}"
                                     if separate else f"Rows 1 to {rows}, top to bottom: templates {names}")
    for t in sheet_.tiles:
        ax, ay = m(t.x, t.y + t.height - 1e-6)
        ay -= 1e-6 * k
        c.setStrokeGray(0.35)
        c.setFillGray(1)
        c.setLineWidth(0.6)
        c.rect(ax, ay, t.width * k, t.height * k, stroke=1, fill=1)
    c.setStrokeGray(0.55)
    c.setLineWidth(0.5)
    for place in sheet_.placements:
        path = c.beginPath()
        for i, (x, yy) in enumerate(place.template.segment.outline):
            px, py = m(*place.canvas(x, yy))
            path.moveTo(px, py) if i == 0 else path.lineTo(px, py)
        path.close()
        c.drawPath(path, stroke=1, fill=0)
    size = max(5.0, min(10.0, 0.15 * sheet_.tiles[0].width * k))
    for t in sheet_.tiles:
        cx, cy = m(t.x + t.width / 2, t.y + t.height / 2)
        c.setFillGray(0)
        c.setFont(BOLD, size)
        c.drawCentredString(cx, cy + 0.2 * size, t.name)
        c.setFont(FONT, size * 0.8)
        c.drawCentredString(cx, cy - 0.9 * size, f"page {t.page}")
    c.restoreState()
    last = max(sheet_.tiles, key=lambda t: t.y + t.height)
    _template_table(c, design, sheet_, x0, m(0, last.y + last.height - 1e-6)[1] - 22)


def pages_of(sheet_: Sheet, place: Placement) -> list[Tile]:
    """The tiles a template appears on, in order."""
    return [t for t in sheet_.tiles
            if place.left < t.x + t.width and place.right > t.x and place.top < t.y + t.height and place.bottom > t.y]


def _template_table(c, design: Design, sheet_: Sheet, x: float, y: float) -> None:
    fig = Figures(design.spar)
    cols = [("template", 0), ("serves", 34), ("mark out", 190), ("from heel", 228), ("to", 282),
            ("length along face", 336), ("widest", 410), ("rip width", 456), ("pages", 504)]
    c.setFont(BOLD, 7.5)
    c.drawString(x, y + 12, "Templates")
    for head, dx in cols:
        c.drawString(x + dx, y, head)
    c.setLineWidth(0.4)
    c.line(x, y - 3, x + 640, y - 3)
    c.setFont(FONT, 7.5)
    for place in sheet_.placements:
        y -= 11
        t = place.template
        seg = t.segment
        tiles = pages_of(sheet_, place)
        cells = [seg.label, ", ".join(t.labels), str(len(t.labels)),
                 fig.position(seg.start), fig.position(seg.end), fig.cut_length(seg.length),
                 fig.mark_width(seg.widest), fig.dress(design.layout.machining.setup_of(seg.label).rough_width),
                 f"{tiles[0].name} to {tiles[-1].name} (pages {tiles[0].page} to {tiles[-1].page})"]
        serves = _wrap(c, cells[1], 150, FONT, 7.5)
        for (_, dx), cell in zip(cols, cells):
            if cell is cells[1]:
                for i, line in enumerate(serves):
                    c.drawString(x + dx, y - 9 * i, line)
            else:
                c.drawString(x + dx, y, cell)
        y -= 9 * (len(serves) - 1)


def _wrap(c, text: str, width: float, font: str, size: float) -> list[str]:
    words, lines, line = text.split(), [], ""
    for w in words:
        trial = f"{line} {w}".strip()
        if c.stringWidth(trial, font, size) > width and line:
            lines.append(line)
            line = w
        else:
            line = trial
    return lines + ([line] if line else [])


def write_fullsize(design: Design, path: str | Path) -> None:
    """Write the full-size templates of ``design`` (which must carry a layout) to ``path``."""
    if design.layout is None:
        raise ValueError("the full-size templates need the layout: design(spar, layout=True)")
    sheet_ = sheet(design)
    placed, too_big = end_pages(design, sheet_)
    end_count = max((p.page for p in placed), default=1 if too_big else 0)
    total = 1 + len(sheet_.tiles) + end_count
    c = pdfcanvas.Canvas(str(path), pagesize=sheet_.page_size, initialFontName=FONT)
    c.setTitle(f"{design.spar.name} - full-size stave templates")
    c.setAuthor("stavegen")
    ask_actual_size(c)
    c.setSubject(f"1:1 templates from {source_name(design.spar)}")
    _map_page(c, design, sheet_, total)
    c.showPage()
    marks = crosses(sheet_)
    for tile in sheet_.tiles:
        _tile_page(c, design, sheet_, tile, total, marks)
        c.showPage()
    for number in range(1, end_count + 1):
        _end_page(c, design, sheet_, placed, too_big, number, 2 + len(sheet_.tiles), total)
        c.showPage()
    c.save()
