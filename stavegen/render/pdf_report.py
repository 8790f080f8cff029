"""``NAME-report.pdf``: the shop document, in the spar's units, drawn from the computed design only.

The report is a list of section functions (:data:`SECTIONS`), each taking a
:class:`Report` and returning flowables, [] when it has nothing to say; a new
part of the report is one more function in that list. The board order and
cutting diagrams draw ``design.layout.lumber`` (boards, rips and cut offsets as
the lumber order placed them); the cutter settings print
``design.layout.machining`` in the words of :mod:`stavegen.render.wording`,
shared with the ``section`` command. Every page carries the spar's name, the
spar file's name, the build date and "page n of m".
"""

from __future__ import annotations

import bisect
import math
import os
from dataclasses import dataclass
from pathlib import Path
from typing import Callable
from xml.sax.saxutils import escape

from reportlab import rl_config

# reportlab checks every attribute set on a graphics shape, "a big help when developing" that "slows down
# shapes" (its words, reportlab/graphics/shapes.py); the drawing is the same either way. Off for stavegen's
# drawings unless RL_shapeChecking, reportlab's own switch, says otherwise (the tests set it on). It must be
# set before reportlab.graphics is first imported.
if "RL_shapeChecking" not in os.environ:
    rl_config.shapeChecking = 0

from reportlab.graphics.charts.lineplots import LinePlot  # noqa: E402
from reportlab.graphics.shapes import Circle, Drawing, Line, Polygon, Rect, String  # noqa: E402
from reportlab.lib import colors
from reportlab.lib.enums import TA_LEFT
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import (CondPageBreak, KeepTogether, PageBreak, Paragraph, SimpleDocTemplate, Spacer,
                                Table, TableStyle)

from ..cautions import CAUTIONS, HEADLINE
from ..checks.assess import REFERENCE_BEND
from ..checks.ratios import StationCheck
from ..pipeline import Design
from ..section.properties import Section, bore_ring
from ..section.staves import placed
from ..stations.grid import MERGE_TOLERANCE
from ..units import MM_PER_FOOT, MM_PER_INCH, N_PER_LBF, format_force, format_mass
from .csv_cutlist import FAILS_WORD, cutlist_rows
from .figures import Figures
from .pdf_common import BOLD, FONT, ITALIC, MM, ask_actual_size, build_date, paper_size, source_name
from .wording import (FENCE_NOTE, GUARD_NOTE, aimed_words, board_feet_words, board_length, board_words, cutter_rows,
                      dressed_size, nominal_size, order_words, steps_words, volume_words)

MARGIN = 15 * MM
WOOD = colors.Color(0.93, 0.87, 0.74)
PALE_WOOD = colors.Color(0.98, 0.96, 0.92)
PASS_GREEN = colors.Color(0.05, 0.45, 0.15)
FAIL_RED = colors.Color(0.75, 0.08, 0.08)
RULE = colors.Color(0.6, 0.6, 0.6)
STRIPE = colors.Color(0.95, 0.95, 0.95)

# The words the verdict uses; tests read them back from the PDF.
PASS_WORD = "PASS"
FAIL_WORD = "FAIL"


def _styles() -> dict[str, ParagraphStyle]:
    base = ParagraphStyle("body", fontName=FONT, bulletFontName=FONT, fontSize=9, leading=11.5, alignment=TA_LEFT)
    return {
        "body": base,
        "small": ParagraphStyle("small", parent=base, fontSize=7.5, leading=9.5),
        "cell": ParagraphStyle("cell", parent=base, fontSize=7.5, leading=9),
        "head": ParagraphStyle("head", parent=base, fontName=BOLD, fontSize=7.5, leading=9),
        "title": ParagraphStyle("title", parent=base, fontName=BOLD, fontSize=17, leading=21, spaceAfter=2),
        "h2": ParagraphStyle("h2", parent=base, fontName=BOLD, fontSize=12, leading=15, spaceBefore=8,
                             spaceAfter=4),
        "verdict": ParagraphStyle("verdict", parent=base, fontSize=10, leading=13, textColor=colors.white),
        "caution_head": ParagraphStyle("caution_head", parent=base, fontName=BOLD, fontSize=11, leading=14,
                                       textColor=FAIL_RED),
        "caution": ParagraphStyle("caution", parent=base, fontSize=9, leading=11.5, leftIndent=10,
                                  bulletIndent=0),
    }


@dataclass
class Report:
    """What every section function gets: the design, its units, the paragraph styles, the frame width."""

    design: Design
    styles: dict[str, ParagraphStyle]
    width: float  # points available across the page

    @property
    def spar(self):
        return self.design.spar

    @property
    def layout(self):
        return self.design.layout

    @property
    def fig(self) -> Figures:
        return Figures(self.spar)

    def length(self, mm: float | None, tape: bool = False) -> str:
        """A length that only describes (nearest on the grid)."""
        if mm is None:
            return "-"
        return self.fig.position(mm) if tape else self.fig.describe(mm)

    def where(self, mm: float) -> str:
        return self.fig.position(mm)

    def cell(self, mm: float | None, kind: str = "describe") -> str:
        """A length for a table column whose header carries the unit, rounded as ``kind`` is."""
        if mm is None:
            return "-"
        if self.spar.units == "in":
            value = self.fig.by_kind(kind, mm)
            return value
        return self.fig.cell(kind, mm)

    @property
    def unit_note(self) -> str:
        """What a table header adds for its unit: " (mm)" in metric, nothing for inches (the marks say it)."""
        return "\n(mm)" if self.spar.units == "mm" else ""

    def p(self, text: str, style: str = "body") -> Paragraph:
        """A paragraph of plain text (escaped), or of markup when the text is already ``<b>``-tagged."""
        return Paragraph(text, self.styles[style])

    def t(self, text: str) -> str:
        return escape(text)

    def h2(self, text: str) -> Paragraph:
        return Paragraph(self.t(text), self.styles["h2"])


Section_ = Callable[[Report], list]


def _table(rows: list[list], widths: list[float] | None = None, header_rows: int = 1, align_right_from: int = 1,
           font_size: float = 7.5, stripes: bool = True) -> Table:
    """A plain table: bold header repeated on every page, thin rules, right-aligned figures."""
    table = Table(rows, colWidths=widths, repeatRows=header_rows, hAlign="LEFT")
    style = [
        ("FONT", (0, 0), (-1, -1), FONT, font_size),
        ("FONT", (0, 0), (-1, header_rows - 1), BOLD, font_size),
        ("LINEBELOW", (0, header_rows - 1), (-1, header_rows - 1), 0.6, colors.black),
        ("LINEBELOW", (0, -1), (-1, -1), 0.4, RULE),
        ("VALIGN", (0, 0), (-1, -1), "BOTTOM"),
        ("ALIGN", (align_right_from, 0), (-1, -1), "RIGHT"),
        ("TOPPADDING", (0, 0), (-1, -1), 1.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 1.5),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
    ]
    if stripes:
        for i in range(header_rows, len(rows)):
            if (i - header_rows) % 2 == 1:
                style.append(("BACKGROUND", (0, i), (-1, i), STRIPE))
    table.setStyle(TableStyle(style))
    return table


# Page 1 -------------------------------------------------------------------------------------------------------


def title_and_verdict(r: Report) -> list:
    spar = r.spar
    h = spar.hollow
    a = r.design.assessment
    wall = h.wall
    fig = r.fig
    wall_text = fig.dress(wall.largest) if wall.is_constant else f"{fig.dress(wall.smallest)} to {fig.dress(wall.largest)}"
    built = (f"a box of {h.wood.name} (two faces, two sides; {h.corner} corners)" if h.is_box
             else f"{h.staves} staves of {h.wood.name}, {h.joint.kind} joint")
    sub = (f"{r.where(spar.length)} long, heel to head.  Plan: solid {spar.plan.wood.name}.  "
           f"Hollow: {built}, wall {wall_text}.")
    w, s = a.weakest_stiffness, a.weakest_strength
    least = (f"Least E·I ratio {w.ei_ratio:.3f} at {r.where(w.station.z)} from the heel (target {a.ei_target:.3f}); "
             f"least strength ratio {s.strength_ratio:.3f} at {r.where(s.station.z)} (target "
             f"{a.strength_target:.3f}).")
    if r.design.passed:
        strong = ("at least as strong" if not a.strength_accepted_below_plan else
                  f"at least {a.strength_target:g} times as strong (the spar file accepts less than the plan's "
                  f"strength)")
        head = (f"<b>{PASS_WORD}</b>: the hollow spar is at least as stiff as the plan at every station, "
                f"with the margin asked, and {r.t(strong)}. ")
        colour = PASS_GREEN
        body = r.t(least)
    else:
        head = f"<b>{FAIL_WORD}</b>: the hollow spar misses its target. Do not build it as drawn. "
        colour = FAIL_RED
        body = r.t(" ".join(x[0].upper() + x[1:] + "." for x in a.shortfalls()) + " " + least)
    verdict = Table([[Paragraph(head + body, r.styles["verdict"])]], colWidths=[r.width])
    verdict.setStyle(TableStyle([("BACKGROUND", (0, 0), (-1, -1), colour),
                                 ("LEFTPADDING", (0, 0), (-1, -1), 7), ("RIGHTPADDING", (0, 0), (-1, -1), 7),
                                 ("TOPPADDING", (0, 0), (-1, -1), 5), ("BOTTOMPADDING", (0, 0), (-1, -1), 6)]))
    out = [Paragraph(r.t(f"{spar.name}: hollow spar shop report"), r.styles["title"]),
           r.p(r.t(sub)), Spacer(1, 6), verdict, Spacer(1, 4)]
    if a.strength_accepted_below_plan:
        out.append(r.p("<b>" + r.t(f"Weaker than the plan by choice: the spar file sets min_strength_ratio = "
                                   f"{a.strength_target:g}, so this spar is accepted with as little as "
                                   f"{100 * a.strength_target:.0f} % of the plan's bending strength. That is the "
                                   f"builder's decision, not stavegen's: ask a qualified designer.") + "</b>"))
    if not r.design.passed:
        out.append(r.p("<b>" + r.t(f"This design {FAILS_WORD}: its templates, full-size pages and cut list are "
                                   "marked so, and must not be cut as they stand.") + "</b>"))
    return out + [Spacer(1, 8)]


def cautions(r: Report) -> list:
    cells = [[Paragraph(r.t(HEADLINE), r.styles["caution_head"])]]
    for line in CAUTIONS:
        cells.append([Paragraph(r.t(line), r.styles["caution"], bulletText="\u2022")])
    cells.append([Paragraph(r.t("These figures compare one spar with another; they are no substitute for a "
                                "designer's judgement. Where in doubt, ask a qualified designer before cutting."),
                            r.styles["small"])])
    box = Table(cells, colWidths=[r.width])
    box.setStyle(TableStyle([("BOX", (0, 0), (-1, -1), 2, FAIL_RED),
                             ("BACKGROUND", (0, 0), (-1, -1), colors.Color(1, 0.96, 0.95)),
                             ("LEFTPADDING", (0, 0), (-1, -1), 8), ("RIGHTPADDING", (0, 0), (-1, -1), 8),
                             ("TOPPADDING", (0, 0), (-1, -1), 2), ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
                             ("TOPPADDING", (0, 0), (-1, 0), 6), ("BOTTOMPADDING", (0, -1), (-1, -1), 6)]))
    return [box, Spacer(1, 8)]


def summary(r: Report) -> list:
    spar, a, lay = r.spar, r.design.assessment, r.layout
    h = spar.hollow
    units = spar.units
    plan_size = "diameter" if spar.plan.shape == "round" else f"{spar.plan.shape}, fore-and-aft"
    hollow_size = "finished diameter" if not h.two_axis else f"finished {h.shape}, fore-and-aft"
    built = (f"a box of {h.wood.name}: two faces and two sides, {h.corner} corners" if h.is_box
             else f"{h.staves} staves of {h.wood.name}, {h.joint.kind} joint")
    rows = [
        ["spar file", source_name(spar)],
        ["length, heel to head", r.where(spar.length)],
        ["plan (the stiffness target)", f"solid {spar.plan.wood.name}, {plan_size} "
                                        f"{r.length(spar.plan.diameter.smallest)} to {r.length(spar.plan.diameter.largest)}"],
        ["hollow spar", f"{built}, {hollow_size} "
                        f"{r.fig.dress(h.diameter.smallest)} to {r.fig.dress(h.diameter.largest)}"],
        ["allowances", f"planing {r.length(h.planing_allowance)} on the radius, {r.length(h.end_allowance)} at "
                       f"each stave end; lamination factor {h.lamination_factor:g}, EI margin {100 * h.margin:g} %"],
    ]
    if lay is not None:
        per = sorted({len(c) for c in lay.scarfs.centres})
        per_text = " or ".join(str(n) for n in per)
        scarf_text = (f"{lay.scarfs.count} in all ({per_text} per stave), each {r.fig.cut_length(lay.scarfs.length)} long"
                      if lay.scarfs.count else "none: every stave is one piece")
        rows += [
            ["scarfs", f"{scarf_text}; {len(lay.segments)} segments to cut{aimed_words(lay.scarf_aim)}"],
            ["stave length", f"{r.where(lay.plan.cut_length)} along the face with end allowances "
                             f"({r.where(lay.plan.finished_length)} finished)"],
        ]
        if lay.lumber is not None and lay.lumber.boards:
            order = lay.lumber
            rows.append(["boards to buy", f"{order_words(order, units)}; {100 * order.waste:g} % waste added to "
                                          f"the {board_feet_words(order.board_feet)} board feet the cutting plan "
                                          f"uses (see the board order)"])
    if h.plugs:
        rows.append(["plugs", "; ".join(f"{r.where(p.start)} to {r.where(p.end)}, {p.wood.name}" for p in h.plugs)])
    facts = Table([[r.p(r.t(k), "head"), r.p(r.t(v), "cell")] for k, v in rows],
                  colWidths=[38 * MM, r.width - 38 * MM], hAlign="LEFT")
    facts.setStyle(TableStyle([("VALIGN", (0, 0), (-1, -1), "TOP"), ("TOPPADDING", (0, 0), (-1, -1), 1),
                               ("BOTTOMPADDING", (0, 0), (-1, -1), 1), ("LEFTPADDING", (0, 0), (-1, -1), 0)]))
    saved = a.weight_saved
    stiff_unit, per = ("lbf/in", MM_PER_INCH / N_PER_LBF) if units == "in" else ("N/mm", 1.0)
    load_words = format_force(a.head_load, units)
    whole = [
        ["the whole spar", "plan (solid)", "hollow", "hollow / plan"],
        ["weight", format_mass(a.plan.mass.mass, units), format_mass(a.hollow.mass.mass, units),
         f"{a.compared('mass'):.3f}"],
        ["centre of gravity from the heel", r.where(a.plan.mass.centre), r.where(a.hollow.mass.centre),
         f"{a.compared('centre'):.3f}"],
        ["head stiffness: sideways load per unit of head deflection, heel held",
         f"{a.plan.head_stiffness * per:,.1f} {stiff_unit}", f"{a.hollow.head_stiffness * per:,.1f} {stiff_unit}",
         f"{a.compared('head_stiffness'):.3f}"],
        [f"head deflection under {load_words} sideways, heel held", r.length(a.plan.tip_deflection),
         r.length(a.hollow.tip_deflection), f"{a.compared('deflection'):.3f}"],
        ["Euler load, heel fixed, head free", format_force(a.plan.euler_load, units),
         format_force(a.hollow.euler_load, units), f"{a.compared('euler'):.3f}"],
    ]
    if a.hollow.direction:  # not round: the beam figures above are the weaker direction's; the other way after
        from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

        words = {FORE_AFT: "fore-and-aft", ATHWARTSHIPS: "athwartships"}
        weak = a.hollow.direction
        other = ATHWARTSHIPS if weak == FORE_AFT else FORE_AFT
        for row in whole[3:]:
            row[0] += f", {words[weak]} (the weaker way)"
        pd, pe = a.plan.in_direction(other)
        hd, he = a.hollow.in_direction(other)
        whole += [[f"head deflection, {words[other]}", r.length(pd), r.length(hd), f"{hd / pd:.3f}"],
                  [f"Euler load, {words[other]}", format_force(pe, units), format_force(he, units),
                   f"{he / pe:.3f}"]]
    saving = (f"Weight saved: {format_mass(saved, units)} ({100 * a.weight_saved_share:.0f} % of the plan's)."
              if saved >= 0 else f"The hollow spar is {format_mass(-saved, units)} heavier than the plan.")
    load_note = (f"The head load, {load_words}, is the one the spar file names (spar.head_load)"
                 if spar.head_load_given else
                 f"The head load, {load_words}, is the reference load, the one that bends the plan's solid spar "
                 f"{100 * REFERENCE_BEND:.0f} % of its length at the head; not a rig load (stavegen computes none; "
                 f"set spar.head_load to use your own)")
    load_note += ("; deflection grows in proportion to it, so the hollow / plan ratios and the head stiffness do "
                  "not depend on it.")
    out = [r.h2("Summary"), facts, Spacer(1, 6),
           _table([list(row) for row in whole], widths=[78 * MM, 30 * MM, 30 * MM, 22 * MM]),
           Spacer(1, 3), r.p(r.t(saving)), r.p(r.t(load_note), "small")]
    notes = [f"solved: {line}" for line in r.design.solved] + [f"warning: {line}" for line in r.design.warnings]
    for note in notes:
        out.append(r.p(r.t(note), "small"))
    return out


# Station table -------------------------------------------------------------------------------------------------


def _rough_width(r: Report, z: float) -> float | None:
    """The rough (rip) width the layout computed at station z, if the layout has that station."""
    if r.layout is None:
        return None
    found = []
    for plan in r.layout.plans or (r.layout.plan,):  # an oval's: the widest stave's
        stations = plan.stations  # heel to head: the first within the tolerance, found by bisection
        i = bisect.bisect_left(stations, z - MERGE_TOLERANCE, key=lambda st: st.z)
        if i < len(stations) and abs(stations[i].z - z) <= MERGE_TOLERANCE:
            found.append(stations[i].rough_width)
    return max(found) if found else None


NOTCH_COLUMNS = (6, 7)  # the station table's notch depth and apex height: left out where no station has a notch
STATION_ROWS_PER_TABLE = 200  # an even number: the stripes run on across blocks


def station_table(r: Report) -> list:
    a = r.design.assessment
    least_ei, least_strength = a.weakest_stiffness, a.weakest_strength
    u = r.unit_note
    head = [f"from heel{u}", "plan\nOD", "finished\nOD", "wall", "stave width\nfinished", "stave width\nrough",
            "notch\ndepth", "apex\nheight", "EI\nratio", "strength\nratio", "plug", "note"]
    if a.two_axis:
        head = [f"from heel{u}", "plan f-a\nx ath", "finished\nf-a x ath", "wall", "staves\nnarrowest to\nwidest",
                "widest\nrough", "notch\ndepth", "apex\nheight", "EI ratio\nf-a / ath",
                "strength\nf-a / ath", "plug", "note"]
    if u:
        head = [head[0]] + [h + (" (mm)" if 0 < i < 8 else "") for i, h in enumerate(head) if i > 0]
    rows: list[list[str]] = [head]
    marks = []
    for i, c in enumerate(a.stations, start=1):
        s = c.station
        sec = s.section
        note = []
        if not c.ei_ok:
            note.append("SHORT: EI")
        if not c.strength_ok:
            note.append("SHORT: strength")
        if c is least_ei:
            note.append("least EI")
        if c is least_strength:
            note.append("least strength")
        if "parting" in s.reasons:
            note.append("parting")
        if a.two_axis:  # both dimensions, the widest and narrowest stave, each ratio fore-and-aft / athwartships
            from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

            rows.append([r.cell(s.z, "position"), f"{r.cell(s.plan_diameter)}\nx {r.cell(s.plan_athwart)}",
                         f"{r.cell(s.fore_aft, 'dress')}\nx {r.cell(s.athwart, 'dress')}",
                         r.cell(s.wall, "dress"),
                         f"{r.cell(min(sec.widths), 'mark-width')} to\n{r.cell(max(sec.widths), 'mark-width')}",
                         r.cell(_rough_width(r, s.z), "dress"),
                         r.cell(sec.notch.depth if sec.notch else None, "notch-depth"),
                         r.cell(sec.notch.apex_height if sec.notch else None, "apex-height"),
                         f"{c.ei_ratio_in(FORE_AFT):.3f}\n{c.ei_ratio_in(ATHWARTSHIPS):.3f}",
                         f"{c.strength_ratio_in(FORE_AFT):.3f}\n{c.strength_ratio_in(ATHWARTSHIPS):.3f}",
                         "yes" if s.plug else "", "\n".join(note)])
        else:
            rows.append([r.cell(s.z, "position"), r.cell(s.plan_diameter), r.cell(s.diameter, "dress"),
                         r.cell(s.wall, "dress"), r.cell(sec.stave_width, "mark-width"),
                         r.cell(_rough_width(r, s.z), "dress"),
                         r.cell(sec.notch.depth if sec.notch else None, "notch-depth"),
                         r.cell(sec.notch.apex_height if sec.notch else None, "apex-height"),
                         f"{c.ei_ratio:.3f}", f"{c.strength_ratio:.3f}", "yes" if s.plug else "",
                         "\n".join(note)])
        if note:
            marks.append((i, not c.ok))
    widths = [18, 14, 15, 13, 17, 17, 14, 14, 12, 14, 9, 24]
    notched = any(c.station.section.notch is not None for c in a.stations)
    keep = [i for i in range(len(widths)) if notched or i not in NOTCH_COLUMNS]  # no notch: no empty columns
    rows = [[row[i] for i in keep] for row in rows]
    widths = [widths[i] for i in keep]
    plug_col = keep.index(10)
    scale = r.width / (sum(widths) * MM)
    tables = []
    # Blocks of rows, each its own table with the header: reportlab measures every row left each time a
    # table breaks over a page, which made one table of thousands of stations quadratic in them.
    for start in range(1, max(len(rows), 2), STATION_ROWS_PER_TABLE):
        table = _table([list(row) for row in [rows[0]] + rows[start:start + STATION_ROWS_PER_TABLE]],
                       widths=[w * MM * scale for w in widths])
        table.setStyle(TableStyle([("ALIGN", (plug_col, 0), (-1, -1), "LEFT"),
                                   ("LEFTPADDING", (plug_col + 1, 0), (plug_col + 1, -1), 6)]))
        for i, short in marks:
            if start <= i < start + STATION_ROWS_PER_TABLE:
                j = i - start + 1
                table.setStyle(TableStyle([("FONT", (0, j), (-1, j), BOLD, 7.5)] +
                                          ([("TEXTCOLOR", (0, j), (-1, j), FAIL_RED)] if short else [])))
        tables.append(table)
    rough = ("Rough width adds the edge allowance jointed off each edge. " if r.layout is not None else "")
    ff = least_strength.hollow.form_factor
    form = (f"Strength ratio compares the moment each section carries at rupture, MOR x S x F, where F is the "
            f"bending form factor: {least_strength.plan.form_factor:.2f} for the plan's solid "
            f"{'round' if r.spar.plan.shape == 'round' else r.spar.plan.shape} (Newlin and "
            f"Trayer, NACA Report 181, 1924, from memory - verify) and, for the hollow section, interpolated on "
            f"its plastic shape factor between the rectangle (1.00) and the solid round, {ff:.3f} at the least "
            f"strength station: a hollow section is credited with less than a solid one"
            + (" (a box below the rectangle's 1.00)." if r.spar.hollow.is_box else "."))
    notch_words = ("Notch depth is along the width from the notched edge to the V's apex; apex height is above the "
                   "stave's inner face. " if notched else "")
    return [PageBreak(), r.h2("Station by station against the plan"),
            r.p(r.t(f"Positions from the heel of the finished spar. Stave widths are across the broad face"
                    f"{' before the notch is cut' if notched else ''}, rounded down (narrower staves close a smaller "
                    f"bore; see the templates for the exact line); walls, diameters and rough widths are rounded up. "
                    f"{rough}{notch_words}"
                    f"EI ratio target {a.ei_target:.3f}; strength ratio target {a.strength_target:.3f}. {form}"),
                "small"), Spacer(1, 4), *tables]


# Section drawing ------------------------------------------------------------------------------------------------


_SCALES = ((2, 1), (1, 1), (1, 2), (1, 4), (1, 5), (1, 10), (1, 20))


def _scale_for(size_mm: float, room_mm: float, largest: tuple[int, int] = (1, 1)) -> tuple[int, int]:
    """The largest drawing scale (a, b) = a:b, no larger than ``largest``, at which ``size_mm`` fits ``room_mm``."""
    for a, b in _SCALES:
        if a / b > largest[0] / largest[1]:
            continue
        if size_mm * a / b <= room_mm:
            return a, b
    return _SCALES[-1]


def _arrow(d: Drawing, x: float, y: float, ux: float, uy: float, size: float = 4.0) -> None:
    """A filled arrowhead with its tip at (x, y) pointing along the unit vector (ux, uy)."""
    px, py = -uy, ux
    d.add(Polygon([x, y, x - size * ux + 0.35 * size * px, y - size * uy + 0.35 * size * py,
                   x - size * ux - 0.35 * size * px, y - size * uy - 0.35 * size * py],
                  fillColor=colors.black, strokeColor=None))


def _dim(d: Drawing, p1: tuple[float, float], p2: tuple[float, float], text: str, text_at: tuple[float, float],
         anchor: str = "middle", size: float = 7.5) -> None:
    """A dimension line with arrowheads at both ends (points) and its figure at ``text_at``."""
    (x1, y1), (x2, y2) = p1, p2
    length = math.hypot(x2 - x1, y2 - y1)
    if length <= 0:
        return
    ux, uy = (x2 - x1) / length, (y2 - y1) / length
    d.add(Line(x1, y1, x2, y2, strokeWidth=0.5))
    _arrow(d, x2, y2, ux, uy)
    _arrow(d, x1, y1, -ux, -uy)
    d.add(String(text_at[0], text_at[1], text, fontName=FONT, fontSize=size, textAnchor=anchor))


def _ext(d: Drawing, x1: float, y1: float, x2: float, y2: float) -> None:
    d.add(Line(x1, y1, x2, y2, strokeWidth=0.3, strokeColor=colors.Color(0.35, 0.35, 0.35)))


def _scale_words(a: int, b: int) -> str:
    return f"{a}:{b}"


def _section_page_head(r, check, d, notes: list[str], height: float) -> list:
    """The section page's heading, its drawing ``d`` and its notes in two columns."""
    half_rows = math.ceil(len(notes) / 2)
    cells = [[r.p(r.t(notes[i]), "small"), r.p(r.t(notes[i + half_rows]), "small") if i + half_rows < len(notes)
              else ""] for i in range(half_rows)]
    table = Table(cells, colWidths=[r.width / 2] * 2, hAlign="LEFT")
    table.setStyle(TableStyle([("LEFTPADDING", (0, 0), (-1, -1), 0), ("TOPPADDING", (0, 0), (-1, -1), 0.5),
                               ("BOTTOMPADDING", (0, 0), (-1, -1), 0.5), ("VALIGN", (0, 0), (-1, -1), "TOP")]))
    return [CondPageBreak(height + 80),
            r.h2(f"Section at the widest stave, {r.where(check.station.z)} from the heel"), d, Spacer(1, 4), table,
            Spacer(1, 8)]


def _check_bar(d: Drawing, x: float, y: float, r: Report, k: float) -> None:
    """A short rule at the drawing's scale (k points per mm): 2 in or 50 mm, labelled."""
    real = 2 * MM_PER_INCH if r.spar.units == "in" else 50.0
    words = '2 in' if r.spar.units == "in" else "50 mm"
    d.add(Rect(x, y, real * k, 3, fillColor=colors.black, strokeColor=colors.black, strokeWidth=0.4))
    d.add(String(x + real * k + 4, y, f"{words} at this scale", fontName=FONT, fontSize=6.5))


SHEATHING = colors.Color(0.55, 0.75, 0.55)  # glass and epoxy over the wood in the section figure


def _oval_section_drawing(r: Report, check: StationCheck) -> list:
    """An oval section: every stave (each kind its own width), the finished oval with its axes named, the bore."""
    sec = check.station.section
    n = sec.staves
    a_mm, b_mm = sec.semi_axes
    rings_mm = sec.placed_rings()
    reach_mm = max(max(abs(x), abs(y)) for ring in rings_mm for x, y in ring)
    sa, sb = _scale_for(2 * reach_mm, min(r.width / MM - 30, 150.0))
    k = MM * sa / sb
    half = reach_mm * k
    kinds = ", ".join(f"{r.fig.mark_width(kind.width)} ({kind.count} staves: "
                      f"{', '.join(str(m + 1) for m in kind.members)})" for kind in sec.kinds)
    box = sec.joint == "box"
    regions = check.hollow.regions
    layers = regions.of_kind("layer") if regions is not None else ()
    strips = regions.of_kind("strip") if regions is not None else ()
    wood_words = (f"the wood rounded to {r.fig.dress(sec.fore_aft)} fore-and-aft by {r.fig.dress(sec.athwartships)} "
                  f"athwartships: the heavy oval (pale: wood taken off in rounding); sheathing (green) to the "
                  f"finished {r.fig.dress(check.station.fore_aft)} by {r.fig.dress(check.station.athwart)}"
                  if layers else
                  f"finished {r.fig.dress(sec.fore_aft)} fore-and-aft by {r.fig.dress(sec.athwartships)} "
                  f"athwartships: the heavy oval (pale: wood taken off in rounding)")
    notes = [
        f"{n} staves, {sec.joint}; {wood_words}",
        f"stave widths before the notch, widest first: {kinds}; stave 1 faces athwartships, numbered "
        f"counter-clockwise looking from the heel",
        f"stave thickness {r.fig.dress(sec.thickness)}, wall {r.fig.dress(check.station.wall)}",
        f"wall after rounding at least {r.fig.least(sec.least_wall)}",
        f"across the flats before rounding {r.length(sec.across_flats)} fore-and-aft, "
        f"{r.length(sec.across_flats_athwartships)} athwartships" + ("; plugged here (grey)" if check.station.plug
                                                                     else ""),
        f"scale {_scale_words(sa, sb)} when printed at 100 %",
    ] + (["reinforcing strips in black"] if strips else [])
    if box:
        from ..section.box import KIND_NAMES

        rounded = (f", corners rounded to {r.fig.dress(sec.corner_radius)}" if sec.corner_radius > 0
                   else ", corners sharp")
        pieces = "; ".join(f"{KIND_NAMES[kind.index]}s (staves {' and '.join(str(m + 1) for m in kind.members)}) "
                           f"{r.fig.mark_width(kind.width)} wide" for kind in sec.kinds)
        joined = ("the sides set into a rebate along each edge of the faces, "
                  f"{r.fig.dress(sec.rebate_depth)} deep" if sec.corner == "rebated"
                  else "each piece rebated along edge 1, "
                  f"{r.fig.dress(sec.rebate_depth)} deep, the next piece's edge 2 in it" if sec.corner == "pinwheel"
                  else "the sides glued between the faces")
        notes[:5] = [
            f"a box of 4 pieces, {joined}; finished {r.fig.dress(sec.fore_aft)} fore-and-aft by "
            f"{r.fig.dress(sec.athwartships)} athwartships{rounded}: the heavy outline (pale: the planing allowance)",
            f"pieces here: {pieces}; the faces face fore and aft, the sides athwartships",
            f"piece thickness {r.fig.dress(sec.thickness)}, wall {r.fig.dress(check.station.wall)}",
            f"wall after planing at least {r.fig.least(sec.least_wall)}",
            f"bore {r.length(sec.bore_across_flats)} fore-and-aft by {r.length(sec.bore_across_flats_athwartships)} "
            "athwartships" + ("; plugged here (grey)" if check.station.plug else ""),
        ]
    height = 2 * half + 30
    d = Drawing(r.width, height)
    cx, cy = r.width / 2, height - half - 8
    rings = [[v for x, y in ring for v in (cx + x * k, cy + y * k)] for ring in rings_mm]
    oval = [v for x, y in sec.finished_points(240) for v in (cx + x * k, cy + y * k)]
    for ring in rings:
        d.add(Polygon(ring, fillColor=PALE_WOOD, strokeColor=None))
    for layer in reversed(layers):  # the sheathing over the rounded wood, outermost first (its outside drawn)
        outside = layer.geometry.exterior.coords
        d.add(Polygon([v for x, y in outside for v in (cx + x * k, cy + y * k)], fillColor=SHEATHING,
                      strokeColor=colors.black, strokeWidth=0.3))
    d.add(Polygon(oval, fillColor=WOOD, strokeColor=None))
    for ring in rings:
        d.add(Polygon(ring, fillColor=None, strokeColor=colors.Color(0.45, 0.35, 0.2), strokeWidth=0.4))
    d.add(Polygon([v for x, y in sec.bore_points() for v in (cx + x * k, cy + y * k)],
                  fillColor=colors.Color(0.82, 0.82, 0.82) if check.station.plug else colors.white,
                  strokeColor=colors.Color(0.45, 0.35, 0.2), strokeWidth=0.4))
    for strip in strips:
        for part in getattr(strip.geometry, "geoms", [strip.geometry]):
            d.add(Polygon([v for x, y in part.exterior.coords for v in (cx + x * k, cy + y * k)],
                          fillColor=colors.Color(0.15, 0.15, 0.15), strokeColor=None))
    d.add(Polygon(oval, fillColor=None, strokeColor=colors.black, strokeWidth=1.1))
    for i, ring in enumerate(rings_mm):  # stave numbers on the outer faces
        mx = sum(x for x, _ in ring) / len(ring)
        my = sum(y for _, y in ring) / len(ring)
        d.add(String(cx + mx * k, cy + my * k - 2, str(i + 1), fontName=FONT, fontSize=6, textAnchor="middle"))
    axis = colors.Color(0.2, 0.3, 0.6)
    d.add(Line(cx - half - 4, cy, cx + half + 4, cy, strokeWidth=0.4, strokeColor=axis, strokeDashArray=(4, 2)))
    d.add(Line(cx, cy - half - 4, cx, cy + half + 4, strokeWidth=0.4, strokeColor=axis, strokeDashArray=(4, 2)))
    d.add(String(cx + half + 6, cy - 2.5, "fore-and-aft", fontName=ITALIC, fontSize=7, fillColor=axis))
    d.add(String(cx + 3, cy + half + 6, "athwartships", fontName=ITALIC, fontSize=7, fillColor=axis))
    _dim(d, (cx - a_mm * k, cy - b_mm * k - 6), (cx + a_mm * k, cy - b_mm * k - 6),
         f"{'wood ' if layers else ''}fore-and-aft {r.fig.dress(sec.fore_aft)}", (cx, cy - b_mm * k - 15))
    _check_bar(d, 0, 4, r, k)
    out = _section_page_head(r, check, d, notes, height)
    for kind in sec.kinds:
        if box:
            from ..section.box import KIND_NAMES

            out.append(r.p(r.t(f"A {KIND_NAMES[kind.index]}, stave {kind.members[0] + 1} (and stave "
                               f"{kind.members[1] + 1}, the same piece):"), "small"))
            out += _stave_detail(r, sec.kind_section(kind.index))
            continue
        out.append(r.p(r.t(f"Stave {kind.members[0] + 1} (and {', '.join(str(m + 1) for m in kind.members[1:])}: "
                           f"the same stave):"
                           if kind.count > 1 else f"Stave {kind.members[0] + 1}:"), "small"))
        out += _stave_detail(r, sec.kind_section(kind.index))
    return out


def section_drawing(r: Report) -> list:
    a = r.design.assessment
    check: StationCheck = max(a.stations, key=lambda c: c.station.section.stave_width)
    sec: Section = check.station.section
    if sec.shape != "round":
        return _oval_section_drawing(r, check)
    regions = check.hollow.regions
    n = sec.staves
    R = sec.radius
    # The whole section, as large as the page allows up to 1:1; notes under it.
    reach_mm = sec.outer_apothem / math.cos(math.pi / n)  # the staves' outer corners before rounding
    sa, sb = _scale_for(2 * reach_mm, min(r.width / MM - 30, 150.0))
    k = MM * sa / sb
    half = reach_mm * k
    notes = [
        f"{n} staves, {sec.joint}; finished OD {r.fig.dress(2 * R)}: the heavy circle (pale: wood taken off in "
        f"rounding)",
        f"across flats before rounding {r.length(sec.across_flats)}",
        f"stave thickness {r.fig.dress(sec.thickness)}, wall {r.fig.dress(check.station.wall)}",
        f"wall after rounding: {r.fig.least(sec.flat_wall)} mid-stave, at least {r.fig.least(sec.least_wall)} over "
        f"the bore's corners and any voids",
        f"bore across flats {r.length(2 * sec.inner_apothem)}" + ("; plugged here (grey)" if check.station.plug else ""),
        f"scale {_scale_words(sa, sb)} when printed at 100 %",
    ]
    sheath = check.station.diameter - 2 * R
    if sheath > 1e-9:
        notes[0] = (f"{n} staves, {sec.joint}; the wood rounded to {r.fig.dress(2 * R)}: the heavy circle (pale: wood "
                    f"taken off in rounding); sheathing (green) to the finished OD {r.fig.dress(check.station.diameter)}")
    if regions is not None and regions.of_kind("strip"):
        notes.append("reinforcing strips in black")
    height = 2 * half + 24
    d = Drawing(r.width, height)
    cx, cy = r.width / 2, height - half - 4
    polygon = sec.stave_polygon()
    rings = [[v for x, y in placed(polygon, n, i).exterior.coords for v in (cx + x * k, cy + y * k)]
             for i in range(n)]
    for ring in rings:  # the glued-up staves, pale where rounding takes the wood off
        d.add(Polygon(ring, fillColor=PALE_WOOD, strokeColor=None))
    layers = regions.of_kind("layer") if regions is not None else ()
    for layer in reversed(layers):  # the sheathing over the rounded wood, outermost first
        d.add(Circle(cx, cy, layer.reach * k, fillColor=SHEATHING, strokeColor=colors.black, strokeWidth=0.3))
    d.add(Circle(cx, cy, R * k, fillColor=WOOD, strokeColor=None))
    for ring in rings:
        d.add(Polygon(ring, fillColor=None, strokeColor=colors.Color(0.45, 0.35, 0.2), strokeWidth=0.4))
    bore = bore_ring(n, sec.inner_apothem)
    d.add(Polygon([v for x, y in bore for v in (cx + x * k, cy + y * k)],
                  fillColor=colors.Color(0.82, 0.82, 0.82) if check.station.plug else colors.white,
                  strokeColor=colors.Color(0.45, 0.35, 0.2), strokeWidth=0.4))
    for strip in (regions.of_kind("strip") if regions is not None else ()):
        for part in getattr(strip.geometry, "geoms", [strip.geometry]):
            d.add(Polygon([v for x, y in part.exterior.coords for v in (cx + x * k, cy + y * k)],
                          fillColor=colors.Color(0.15, 0.15, 0.15), strokeColor=None))
    d.add(Circle(cx, cy, R * k, fillColor=None, strokeColor=colors.black, strokeWidth=1.1))
    d.add(Line(cx - 4, cy, cx + 4, cy, strokeWidth=0.3))
    d.add(Line(cx, cy - 4, cx, cy + 4, strokeWidth=0.3))
    # OD across the centre, the wall through the top stave.
    _dim(d, (cx - R * k, cy), (cx + R * k, cy), f"{'wood ' if sheath > 1e-9 else ''}OD {r.fig.dress(2 * R)}",
         (cx - R * k / 2, cy + 4))
    _dim(d, (cx, cy + sec.inner_apothem * k), (cx, cy + sec.outer_apothem * k),
         f"stave {r.fig.dress(sec.thickness)}", (cx + 4, cy + (sec.inner_apothem + sec.outer_apothem) / 2 * k - 2.5),
         anchor="start")
    _check_bar(d, 0, 4, r, k)
    out = _section_page_head(r, check, d, notes, height)
    out += _stave_detail(r, sec)
    return out


def _stave_detail(r: Report, sec: Section) -> list:
    f = sec.frame
    w, t = f.width, f.outer - f.inner
    sa, sb = _scale_for(max(w, t * (r.width / MM - 75) / 60), r.width / MM - 75, largest=(2, 1))
    k = MM * sa / sb
    height = t * k + 84
    d = Drawing(r.width, height)
    ox, oy = 60 - f.x_notch_edge * k, 44 - f.inner * k

    def P(x: float, y: float) -> tuple[float, float]:
        return ox + x * k, oy + y * k

    pts = [v for x, y in sec.stave_outline for v in P(x, y)]
    d.add(Polygon(pts, fillColor=WOOD, strokeColor=colors.black, strokeWidth=0.7))
    xl, xr = f.x_notch_edge, f.x_square_edge
    top = P(0, f.outer)[1] + 14
    _ext(d, *P(xl, f.outer), P(xl, 0)[0], top + 3)
    _ext(d, *P(xr, f.outer), P(xr, 0)[0], top + 3)
    words = "before the notch" if sec.notch is not None else "outer face"
    _dim(d, (P(xl, 0)[0], top), (P(xr, 0)[0], top), f"stave width {r.fig.mark_width(w)} ({words})",
         ((P(xl, 0)[0] + P(xr, 0)[0]) / 2, top + 4))
    right = P(xr, 0)[0] + 14
    _ext(d, *P(xr, f.outer), right + 3, P(0, f.outer)[1])
    _ext(d, *P(xr, f.inner), right + 3, P(0, f.inner)[1])
    _dim(d, (right, P(0, f.inner)[1]), (right, P(0, f.outer)[1]), f"thickness {r.fig.dress(t)}",
         (right + 5, (P(0, f.inner)[1] + P(0, f.outer)[1]) / 2 - 2.5), anchor="start")
    notes = []
    if sec.notch is not None and f.apex is not None:
        ax, ay = f.apex
        bottom = P(0, f.inner)[1] - 14
        _ext(d, P(xl, 0)[0], P(0, f.outer)[1], P(xl, 0)[0], bottom - 3)
        _ext(d, *P(ax, ay), P(ax, 0)[0], bottom - 3)
        _dim(d, (P(xl, 0)[0], bottom), (P(ax, 0)[0], bottom), f"notch depth {r.fig.notch_depth(sec.notch.depth)}",
             (P(ax, 0)[0] + 6, bottom - 2.5), anchor="start")
        left = P(xl, 0)[0] - 14
        _ext(d, *P(ax, ay), left - 3, P(0, ay)[1])
        _ext(d, *P(xl, f.inner), left - 3, P(0, f.inner)[1])
        _dim(d, (left, P(0, f.inner)[1]), (left, P(0, ay)[1]), f"apex {r.fig.apex_height(sec.notch.apex_height)}",
             (left - 5, (P(0, f.inner)[1] + P(0, ay)[1]) / 2 - 2.5), anchor="end")
        phi, other = sec.v_face_angles
        notes.append(f"The V is 90°: its faces lie at {phi:.2f}° and {other:.2f}° to the broad face. "
                     f"Apex height is above the inner face; notch depth along the width from the notched edge.")
    elif sec.joint == "box":
        if sec.rebate is not None:
            depth, across = sec.rebate
            if sec.assembled.corner == "pinwheel":
                notes.append(f"Square edges, a rebate along edge 1 (left) of its inner side {r.fig.dress(across)} "
                             f"wide and {r.fig.dress(depth)} deep, where the next piece's edge 2 sits.")
            else:
                notes.append(f"A face: square edges, a rebate along each edge of its inner side "
                             f"{r.fig.dress(across)} wide and {r.fig.dress(depth)} deep, where a side's edge sits.")
        else:
            notes.append("Square edges, planed to thickness and ripped to width: no notch, bevel or rebate.")
    else:
        notes.append(f"Plain bevel staves: each edge bevelled {sec.bevel_angle:.2f}° off square; "
                     f"inner face narrower than the outer.")
    d.add(String(ox + (xl + xr) / 2 * k, P(0, f.outer)[1] - 10, "outer face", fontName=ITALIC, fontSize=7,
                 textAnchor="middle"))
    _check_bar(d, 0, 3, r, k)
    where = ", notch on the left" if sec.notch is not None else ""
    return [KeepTogether([r.p(r.t(f"One stave at this station, outer face up{where}; "
                                  f"scale {_scale_words(sa, sb)}."), "small"), d,
                          Spacer(1, 3), r.p(r.t(" ".join(notes)), "small")])]


# E·I along the spar -------------------------------------------------------------------------------------------


def _nice_step(span: float, target: int = 8, feet: bool = False) -> float:
    """A round step near span/target: 1, 2, 2.5 or 5 times a power of ten (no 2.5 when counting feet)."""
    raw = span / target
    mag = 10 ** math.floor(math.log10(raw))
    for m in ((1, 2, 5, 10) if feet else (1, 2, 2.5, 5, 10)):
        if raw <= m * mag:
            return m * mag
    return 10 * mag


def _position_axis(r: Report) -> tuple[float, str]:
    """(mm per axis unit, axis words): feet for inch spars, metres for metric."""
    return (MM_PER_FOOT, "feet from the heel") if r.spar.units == "in" else (1000.0, "metres from the heel")


def _ei_axis(r: Report) -> tuple[float, str]:
    """(N·mm² per axis unit, words): millions of lbf·in², or kN·m²."""
    if r.spar.units == "in":
        return N_PER_LBF * MM_PER_INCH**2 * 1e6, "E·I, million lbf·in²"
    return 1e9, "E·I, kN·m²"


def _plot(r: Report, series: list[tuple[list[tuple[float, float]], colors.Color, float, tuple | None]],
          y_words: str, height: float, y_min: float | None = None, y_max: float | None = None,
          bands: list[tuple[float, float, str]] = (), legend: list[tuple[str, colors.Color, tuple | None]] = ()
          ) -> Drawing:
    unit, x_words = _position_axis(r)
    d = Drawing(r.width, height)
    lp = LinePlot()
    lp.x, lp.y = 46, 30
    lp.width, lp.height = r.width - 60, height - 48
    lp.data = [pts for pts, *_ in series]
    for i, (_, colour, width, dash) in enumerate(series):
        lp.lines[i].strokeColor = colour
        lp.lines[i].strokeWidth = width
        if dash:
            lp.lines[i].strokeDashArray = dash
    xs = [x for pts, *_ in series for x, _ in pts]
    ys = [y for pts, *_ in series for _, y in pts]
    x0, x1 = min(xs), max(xs)
    lo = min(ys) if y_min is None else y_min
    hi = max(ys) if y_max is None else y_max
    step_y = _nice_step(hi - lo or 1, 5)
    lo, hi = math.floor(lo / step_y) * step_y, math.ceil(hi / step_y) * step_y
    step_x = _nice_step(x1 - x0 or 1, 10, feet=r.spar.units == "in")
    lp.xValueAxis.valueMin, lp.xValueAxis.valueMax = x0, x1
    lp.xValueAxis.valueSteps = [k * step_x for k in range(math.ceil(x0 / step_x), math.floor(x1 / step_x) + 1)]
    lp.yValueAxis.valueMin, lp.yValueAxis.valueMax = lo, hi
    lp.yValueAxis.valueStep = step_y
    lp.xValueAxis.labels.fontName = lp.yValueAxis.labels.fontName = FONT
    lp.xValueAxis.labels.fontSize = lp.yValueAxis.labels.fontSize = 7
    lp.xValueAxis.labelTextFormat = lambda v: f"{v:g}"
    lp.yValueAxis.labelTextFormat = lambda v: f"{v:g}"
    lp.yValueAxis.visibleGrid = True
    lp.yValueAxis.gridStrokeColor = colors.Color(0.85, 0.85, 0.85)
    lp.yValueAxis.gridStrokeWidth = 0.3
    for a, b, words in bands:
        px0 = lp.x + (a - x0) / (x1 - x0) * lp.width
        px1 = lp.x + (b - x0) / (x1 - x0) * lp.width
        d.add(Rect(px0, lp.y, px1 - px0, lp.height, fillColor=colors.Color(0.9, 0.9, 0.9), strokeColor=None))
        d.add(String((px0 + px1) / 2, lp.y + 4, words, fontName=FONT, fontSize=6.5,
                     textAnchor="middle", fillColor=colors.Color(0.4, 0.4, 0.4)))
    d.add(lp)
    d.add(String(lp.x + lp.width / 2, 6, x_words, fontName=FONT, fontSize=7.5, textAnchor="middle"))
    d.add(String(lp.x - 4, lp.y + lp.height + 6, y_words, fontName=BOLD, fontSize=7.5, textAnchor="start"))
    lx = lp.x + lp.width
    for words, colour, dash in reversed(list(legend)):
        d.add(String(lx, lp.y + lp.height + 6, words, fontName=FONT, fontSize=7.5,
                     textAnchor="end"))
        from reportlab.pdfbase.pdfmetrics import stringWidth

        lx -= stringWidth(words, FONT, 7.5) + 4
        line = Line(lx - 18, lp.y + lp.height + 8.5, lx, lp.y + lp.height + 8.5, strokeColor=colour, strokeWidth=1.4)
        if dash:
            line.strokeDashArray = dash
        d.add(line)
        lx -= 30
    return d


def ei_plot(r: Report) -> list:
    a = r.design.assessment
    unit, _ = _position_axis(r)
    ei_unit, ei_words = _ei_axis(r)
    z = [c.station.z / unit for c in a.stations]
    target = [(z[0], a.ei_target), (z[-1], a.ei_target)]
    bands = [(p.start / unit, p.end / unit, "plug") for p in r.spar.hollow.plugs]
    blue = colors.Color(0.1, 0.3, 0.7)
    green = colors.Color(0.15, 0.5, 0.2)
    if a.two_axis:
        from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

        ways = ((FORE_AFT, "fore-and-aft", blue), (ATHWARTSHIPS, "athwartships", green))
        lines, legend, ratio_lines, ratio_legend = [], [], [], []
        for way, words, colour in ways:
            lines += [(list(zip(z, [c.plan.ei_in(way) / ei_unit for c in a.stations])), colour, 1.0, (4, 2)),
                      (list(zip(z, [c.hollow.ei_in(way) / ei_unit for c in a.stations])), colour, 1.4, None)]
            legend += [(f"plan {words}", colour, (4, 2)), (f"hollow {words}", colour, None)]
            ratio_lines.append((list(zip(z, [c.ei_ratio_in(way) for c in a.stations])), colour, 1.4, None))
            ratio_legend.append((words, colour, None))
        ratios = [v for line in ratio_lines for _, v in line[0]]
        words = ("E·I of the plan's solid spar (dashed) and of the hollow spar fore-and-aft and athwartships at "
                 "every station; below, the ratio in each direction against the target. Plugged stretches are "
                 "shaded.")
    else:
        plan = list(zip(z, [c.plan.ei / ei_unit for c in a.stations]))
        hollow = list(zip(z, [c.hollow.ei / ei_unit for c in a.stations]))
        ratio = list(zip(z, [c.ei_ratio for c in a.stations]))
        lines = [(plan, colors.black, 1.2, (4, 2)), (hollow, blue, 1.4, None)]
        legend = [("plan (solid)", colors.black, (4, 2)), ("hollow", blue, None)]
        ratio_lines, ratio_legend = [(ratio, blue, 1.4, None)], [("ratio", blue, None)]
        ratios = [v for _, v in ratio]
        words = ("E·I of the plan's solid spar and of the hollow spar at every station; below, their ratio "
                 "against the target. Plugged stretches are shaded; a plug stiffens the spar where it fills "
                 "the bore.")
    top = _plot(r, lines, ei_words, 190, y_min=0, bands=bands, legend=legend)
    lo = min(min(ratios), a.ei_target, 1.0)
    hi = max(max(ratios), a.ei_target)
    pad = 0.05 * (hi - lo or 1)
    series = ratio_lines + [(target, FAIL_RED, 1.0, (3, 2))]
    bottom = _plot(r, series, "E·I ratio, hollow / plan", 170, y_min=lo - pad, y_max=hi + pad, bands=bands,
                   legend=ratio_legend + [(f"target {a.ei_target:.3f}", FAIL_RED, (3, 2))])
    return [CondPageBreak(420), r.h2("Stiffness along the spar"), r.p(r.t(words), "small"), top, Spacer(1, 6),
            bottom]


# Cut list, scarf map, plugs --------------------------------------------------------------------------------------

# Columns of ``cutlist_rows`` the report shows, by the start of their header (the decimal twins are left out).
_CUT_COLUMNS = ("label", "from heel", "to (", "length along face", "width at heel end", "width at head end",
                "widest", "blank width", "rip width", "thickness (", "heel end", "head end")
_BOARD_COLUMN = "board"


def cut_list(r: Report) -> list:
    if r.layout is None:
        return []
    rows = cutlist_rows(r.design)
    if not r.design.passed:
        rows = rows[1:]  # the warning row: page 1 says it
    header = rows[0]
    body = [row for row in rows[1:rows.index([])]]
    wanted = list(_CUT_COLUMNS) + ([_BOARD_COLUMN] if r.layout.lumber is not None else [])
    columns = [next(i for i, h in enumerate(header) if h.startswith(w) and "decimal" not in h) for w in wanted]
    head = [header[i].replace(" (", "\n(").replace("length along face, cut", "length along\nface, cut")
            .replace("width at heel end", "width at\nheel end").replace("width at head end", "width at\nhead end")
            for i in columns]
    table_rows = [head] + [[row[i] for i in columns] for row in body]
    widths = [12, 17, 17, 18, 13, 13, 12, 13, 13, 13, 16, 16] + ([10] if r.layout.lumber is not None else [])
    scale = r.width / (sum(widths) * MM)
    table = _table([list(row) for row in table_rows], widths=[w * MM * scale for w in widths])
    lay = r.layout
    first_rows = [i for i, row in enumerate(body, start=1) if row[1] == "1"]
    table.setStyle(TableStyle([("LINEABOVE", (0, i), (-1, i), 0.4, RULE) for i in first_rows[1:]] +
                              [("ALIGN", (10, 0), (-1, -1), "LEFT"), ("LEFTPADDING", (10, 0), (10, -1), 8)]))
    return [CondPageBreak(200), r.h2("Cut list: every stave segment"),
            r.p(r.t(f"Heel end first, stave by stave. Positions from the heel of the finished spar (negative in "
                    f"the heel's end allowance); lengths along the stave's face, rounded up. Widths are finished, "
                    f"before the notch, rounded down; the blank is the parallel piece the notch is cut on (widest "
                    f"plus {r.length(lay.plan.edge_allowance)} for the square edge), the rip width adds as much again "
                    f"for jointing; thickness is the segment's thickest point; all three rounded up. Scarfed ends "
                    f"are feathered over {r.fig.cut_length(lay.scarfs.length)}. The CSV cut list also gives each "
                    f"segment's fence for the passes set from its square edge."), "small"),
            Spacer(1, 4), table]


def scarf_map(r: Report) -> list:
    lay = r.layout
    if lay is None:
        return []
    spar = r.spar
    n = len(lay.staves)
    row_h, bar_h = 12.0, 8.0
    left, right_pad, top_pad, bottom_pad = 30.0, 8.0, 22.0, 28.0
    height = top_pad + n * row_h + bottom_pad
    d = Drawing(r.width, height)
    z0, z1 = lay.plan.start, lay.plan.end
    span = r.width - left - right_pad

    def X(z: float) -> float:
        return left + (z - z0) / (z1 - z0) * span

    top = height - top_pad
    bottom = top - n * row_h
    shade = colors.Color(0.98, 0.82, 0.78)
    for a, b in (spar.stock.no_scarf if spar.stock else ()):
        d.add(Rect(X(a), bottom, X(b) - X(a), n * row_h, fillColor=shade, strokeColor=None))
        d.add(String((X(a) + X(b)) / 2, top + 3, "no scarf", fontName=FONT, fontSize=6.5, textAnchor="middle",
                     fillColor=FAIL_RED))
    for joint in lay.joints:  # a two-piece spar: the range kept clear of scarfs round the joint, the parting
        a, b = joint.keep_clear
        d.add(Rect(X(a), bottom, X(b) - X(a), n * row_h, fillColor=shade, strokeColor=None))
        d.add(String((X(a) + X(b)) / 2, top + 3, "joint: no scarf", fontName=FONT, fontSize=6.5,
                     textAnchor="middle", fillColor=FAIL_RED))
    for z, words in ((0.0, "heel"), (spar.length, "head")) + tuple((j.check.at, "parting") for j in lay.joints):
        d.add(Line(X(z), bottom - 2, X(z), top + 2, strokeWidth=0.6, strokeDashArray=(2, 2)))
        d.add(String(X(z), top + 12, words, fontName=BOLD, fontSize=7, textAnchor="middle"))
    fills = (colors.Color(0.84, 0.89, 0.95), colors.Color(0.70, 0.80, 0.91))
    over = []
    for k, segs in enumerate(lay.staves):
        y = top - (k + 1) * row_h + (row_h - bar_h) / 2
        d.add(String(left - 4, y + 2, f"S{k + 1}", fontName=BOLD, fontSize=7, textAnchor="end"))
        for i, seg in enumerate(segs):
            d.add(Rect(X(seg.start), y, X(seg.end) - X(seg.start), bar_h, fillColor=fills[i % 2],
                       strokeColor=colors.Color(0.3, 0.3, 0.3), strokeWidth=0.3))
            # Just past the scarf that starts it (or the stave's heel end), clear of the black block.
            at = X(segs[i - 1].end) if i > 0 else X(seg.start)
            d.add(String(at + 3, y + 2, seg.label, fontName=FONT, fontSize=6, textAnchor="start"))
        for prev, nxt in zip(segs, segs[1:]):
            if not prev.scarf_at_end:  # a two-piece spar's parts meet at the parting: no scarf there
                continue
            d.add(Rect(X(nxt.start), y - 1, X(prev.end) - X(nxt.start), bar_h + 2, fillColor=colors.black,
                       strokeColor=None))
        for c in lay.scarfs.centres[k]:
            over.append(Line(X(c), y - 2.5, X(c), y + bar_h + 2.5, strokeColor=FAIL_RED, strokeWidth=0.8))
    for a, b in (spar.stock.no_scarf if spar.stock else ()):
        d.add(Rect(X(a), bottom, X(b) - X(a), n * row_h, fillColor=colors.Color(0.9, 0.2, 0.1), fillOpacity=0.28,
                   strokeColor=FAIL_RED, strokeWidth=0.4))
    for item in over:
        d.add(item)
    unit, x_words = _position_axis(r)
    step = _nice_step((z1 - z0) / unit, 12, feet=r.spar.units == "in")
    v = math.ceil(z0 / unit / step) * step
    d.add(Line(X(z0), bottom - 4, X(z1), bottom - 4, strokeWidth=0.5))
    while v <= z1 / unit + 1e-9:
        d.add(Line(X(v * unit), bottom - 4, X(v * unit), bottom - 7, strokeWidth=0.5))
        d.add(String(X(v * unit), bottom - 15, f"{v:g}", fontName=FONT, fontSize=6.5, textAnchor="middle"))
        v += step
    d.add(String(left + span / 2, bottom - 25, x_words, fontName=FONT, fontSize=7, textAnchor="middle"))
    rows = [["stave", "scarfs: centre from the heel (the scarf runs from ... to ...)"]]
    for k, (centres, segs) in enumerate(zip(lay.scarfs.centres, lay.staves), start=1):
        spans = [(nxt.start, prev.end) for prev, nxt in zip(segs, segs[1:]) if prev.scarf_at_end]
        rows.append([f"S{k}", ";  ".join(f"{r.where(c)} ({r.where(a)} to {r.where(b)})"
                                         for c, (a, b) in zip(centres, spans)) or "none: one piece"])
    table = _table([list(row) for row in rows], widths=[16 * MM, r.width - 16 * MM],
                   align_right_from=9)
    return [CondPageBreak(height + 80), r.h2("Scarf map"),
            r.p(r.t(f"Each bar is one stave, heel to head with its end allowances; the black blocks are the scarfs "
                    f"({lay.scarfs.count} in all, each {r.fig.cut_length(lay.scarfs.length)} long), the red lines their "
                    f"centres. Shaded: ranges where no scarf may fall. Neighbouring staves' scarfs are staggered."),
                "small"), Spacer(1, 4), d, Spacer(1, 4), table]


def plugs(r: Report) -> list:
    lay = r.layout
    if lay is None or not lay.plugs:
        return []
    units = r.spar.units
    n = r.spar.hollow.staves
    u = " (mm)" if units == "mm" else ""
    rows = [["plug", f"from heel\n{u.strip()}".strip(), f"to{u}", f"length{u}", "wood", f"heel end\nacross\nflats{u}",
             f"heel end\nacross\ncorners{u}", f"head end\nacross\nflats{u}", f"head end\nacross\ncorners{u}",
             "weight"]]
    for p in lay.plugs:
        rows.append([str(p.index), r.cell(p.plug.start, "position"), r.cell(p.plug.end, "position"),
                     r.cell(p.length, "cut-length"), p.plug.wood.name, r.cell(p.heel.across_flats, "dress"),
                     r.cell(p.heel.across_corners, "dress"), r.cell(p.head.across_flats, "dress"),
                     r.cell(p.head.across_corners, "dress"), format_mass(p.mass, units)])
    widths = [10, 18, 16, 18, 26, 20, 20, 20, 20, 13]
    scale = r.width / (sum(widths) * MM)
    table = _table([list(row) for row in rows], widths=[w * MM * scale for w in widths])
    table.setStyle(TableStyle([("ALIGN", (4, 0), (4, -1), "LEFT")]))
    return [CondPageBreak(90), r.h2("Plugs (solid blocking)"),
            r.p(r.t(f"Each plug is a tapered {n}-sided block filling the bore; the sizes are the bore's at each end, "
                    f"across its flats and across its corners."), "small"), Spacer(1, 4), table]


def sheathing(r: Report) -> list:
    """Sheathing layers and reinforcing strips: what each adds, and the cloth, tape and resin they take."""
    from .wording import CLOTH_NOTE, REGION_NOTE, cloth_rows, region_rows

    rows = region_rows(r.design)
    if not rows:
        return []
    widths = [40, 22, 30, 36, 24, 18, 14]
    scale = r.width / (sum(widths) * MM)
    out = [CondPageBreak(60), r.h2("Sheathing and reinforcement"),
           _table([[r.p(r.t(c), "cell") for c in row] for row in rows], widths=[w * MM * scale for w in widths]),
           Spacer(1, 3), r.p(r.t(REGION_NOTE), "small")]
    lay = r.layout
    cloth = cloth_rows(r.spar, lay.sheathing) if lay is not None else []
    if cloth:
        widths = [16, 22, 52, 44, 20, 16]
        scale = r.width / (sum(widths) * MM)
        out += [Spacer(1, 6), _table([[r.p(r.t(c), "cell") for c in row] for row in cloth],
                                     widths=[w * MM * scale for w in widths]),
                Spacer(1, 3), r.p(r.t(CLOTH_NOTE), "small")]
    return out


# Board order and cutting diagrams ---------------------------------------------------------------------------


def _order_table(r: Report) -> Table:
    """Boards by size: what the cutting plan uses and what to buy (waste added), with the tallies."""
    order = r.layout.lumber
    metric = r.spar.units != "in"
    used = {c.size: c.count for c in order.used}
    head = ["nominal size", "length", "dressed size", "board feet\neach", "boards the\nplan uses",
            "boards\nto buy", "board feet\nto buy"] + (["m³\nto buy"] if metric else [])
    rows = [head]
    for c in order.to_buy:
        rows.append([nominal_size(c.size, r.spar.units), board_length(c.size.length, r.spar.units),
                     dressed_size(c.size, r.spar.units), board_feet_words(c.size.board_feet),
                     str(used.get(c.size, 0)), str(c.count), board_feet_words(c.board_feet)]
                    + ([f"{c.volume_m3:.3f}"] if metric else []))
    rows.append(["total", "", "", "", str(sum(c.count for c in order.used)), str(sum(c.count for c in order.to_buy)),
                 board_feet_words(order.to_buy_board_feet)] + ([f"{order.to_buy_volume_m3:.3f}"] if metric else []))
    widths = [28, 18, 28, 18, 20, 16, 20] + ([16] if metric else [])
    table = _table([list(row) for row in rows], widths=[w * MM for w in widths], align_right_from=3)
    table.setStyle(TableStyle([("FONT", (0, -1), (-1, -1), BOLD, 7.5),
                               ("LINEABOVE", (0, -1), (-1, -1), 0.6, colors.black)]))
    return table


def board_order(r: Report) -> list:
    lay = r.layout
    if lay is None or lay.lumber is None or not lay.lumber.boards:
        return []
    order, units = lay.lumber, r.spar.units
    thick = order.used[0].size
    measure = ("Board feet are tallied on nominal thickness x nominal width x length, 144 cubic inches to the "
               "board foot (North American lumber rules)")
    measure += "; cubic metres on the same nominal measure." if units != "in" else "."
    used_words = f"{board_feet_words(order.board_feet)} board feet"
    buy_words = f"{board_feet_words(order.to_buy_board_feet)} board feet"
    if units != "in":
        used_words += f" ({volume_words(order.volume_m3)})"
        buy_words += f" ({volume_words(order.to_buy_volume_m3)})"
    n_used = sum(c.count for c in order.used)
    bound_kind = ("the LP relaxation of the cutting model" if order.bound_is_lp else
                  "a weaker bound than the LP relaxation, as the solve stopped early")
    verdict = ("proven the least possible" if order.proven_optimal else
               "not proven the least possible: the solver stopped before it could prove it")
    text = [
        f"Every board {r.length(thick.thickness)} thick dressed ({_nominal_thickness_words(r, thick)} nominal). "
        f"{measure}",
        f"The cutting plan (the diagrams below) uses {n_used} boards, {used_words}. The order adds "
        f"{100 * order.waste:g} % of that as waste allowance (stock.waste in the spar file), in whole boards: "
        f"buy {buy_words}.",
        f"Lower bound: no cutting plan can use less than {board_feet_words(order.lower_bound_board_feet)} board "
        f"feet ({bound_kind}); this plan uses {board_feet_words(order.board_feet)}, {verdict}.",
        f"Yield: the stave wood is {100 * order.yield_ratio:.0f} % of the wood in the boards the plan uses "
        f"(nominal measure, before the waste allowance).",
    ]
    text += [f"Note: {line}." for line in order.notes]
    out = [CondPageBreak(200), r.h2("Board order"), _order_table(r), Spacer(1, 4)]
    out += [p for line in text for p in (r.p(r.t(line), "small"), Spacer(1, 2))]
    return out + [Spacer(1, 6)] + cutting_diagrams(r)


def _nominal_thickness_words(r: Report, size) -> str:
    words = nominal_size(size, r.spar.units).split(" x ")[0]
    return words if r.spar.units == "in" else f"{words} mm"


# Drawing scales for the cutting diagrams, as 1:b. Lengths and widths have a scale each, the same for every board.
_LENGTH_SCALES = (5, 10, 20, 25, 30, 40, 50, 75, 100, 200)
_WIDTH_SCALES = (1, 2, 2.5, 4, 5, 10, 20, 25, 50)
_TALLEST_BOARD_MM = 32.0  # on paper
_RIP_LABEL_ROOM = 44.0  # points right of each board for the rip widths


def diagram_scales(r: Report) -> tuple[float, float]:
    """(b_length, b_width): lengths drawn at 1:b_length, widths at 1:b_width (b_width <= b_length)."""
    boards = r.layout.lumber.boards
    longest = max(b.size.length for b in boards)
    widest = max(b.size.width for b in boards)
    room = (r.width - _RIP_LABEL_ROOM) / MM
    b_len = next((b for b in _LENGTH_SCALES if longest / b <= room), _LENGTH_SCALES[-1])
    b_wid = next((b for b in _WIDTH_SCALES if widest / b <= _TALLEST_BOARD_MM), _WIDTH_SCALES[-1])
    return b_len, min(b_wid, b_len)


def _fit(text: str, size: float, room: float) -> bool:
    from reportlab.pdfbase.pdfmetrics import stringWidth

    return stringWidth(text, FONT, size) <= room


def _board_drawing(r: Report, board, b_len: float, b_wid: float) -> Drawing:
    """One board from above, offset-0 edge at the top: rips one under another, pieces from the left end."""
    units = r.spar.units
    kx, ky = MM / b_len, MM / b_wid
    w_pt, l_pt = board.size.width * ky, board.size.length * kx
    caption_h = 12.0
    height = w_pt + caption_h + 4
    d = Drawing(r.width, height)
    top = height - caption_h
    labels = ", ".join(c.piece.label for rip in board.rips for c in rip.cuts)
    d.add(String(0, top + 3, f"{board.id}:  {board_words(board.size, units)}  (dressed "
                                   f"{dressed_size(board.size, units)})  -  {labels}",
                 fontName=BOLD, fontSize=7.5))
    d.add(Rect(0, top - w_pt, l_pt, w_pt, fillColor=colors.Color(0.86, 0.86, 0.86), strokeColor=colors.black,
               strokeWidth=0.8))
    for k, rip in enumerate(board.rips, start=1):
        y1 = top - rip.offset * ky
        y0 = y1 - rip.width * ky
        d.add(Rect(0, y0, l_pt, y1 - y0, fillColor=None, strokeColor=colors.Color(0.45, 0.35, 0.2),
                   strokeWidth=0.4, strokeDashArray=(2, 1.5)))
        for cut in rip.cuts:
            piece = cut.piece
            x0, x1 = cut.offset * kx, (cut.offset + piece.length) * kx
            d.add(Rect(x0, y1 - piece.width * ky, x1 - x0, piece.width * ky, fillColor=WOOD,
                       strokeColor=colors.black, strokeWidth=0.6))
            words = f"{piece.label}  {r.fig.cut_length(piece.length)}"
            size = min(7.0, 0.6 * piece.width * ky)
            if not _fit(words, size, x1 - x0 - 4):
                words = piece.label
            d.add(String((x0 + x1) / 2, y1 - piece.width * ky / 2 - size * 0.35, words, fontName=FONT,
                         fontSize=size, textAnchor="middle"))
        d.add(String(l_pt + 4, (y0 + y1) / 2 - 2.3, f"rip {k}: {r.fig.dress(rip.width)}", fontName=FONT,
                     fontSize=6.5))
    return d


def cutting_diagrams(r: Report) -> list:
    order = r.layout.lumber
    b_len, b_wid = diagram_scales(r)
    proportion = ("true proportions" if b_wid == b_len else
                  f"widths drawn {b_len / b_wid:g} times their true proportion so the rips can be read")
    intro = (f"Each board seen from above: lengths at 1:{b_len:g}, widths at 1:{b_wid:g} ({proportion}). "
             f"Rips from the top edge down, each as wide as the widest segment in it, one kerf "
             f"({r.length(r.spar.stock.kerf)}) apart; segments from the board's left end, one kerf apart. "
             f"Segment boxes are rip widths (finished width plus {r.length(r.layout.plan.edge_allowance)} on each "
             f"edge); grey is offcut.")
    out = [CondPageBreak(160), r.h2("Cutting diagrams"), r.p(r.t(intro), "small"), Spacer(1, 4)]
    for board in order.boards:
        out += [_board_drawing(r, board, b_len, b_wid), Spacer(1, 6)]
    return out


# Cutter settings ------------------------------------------------------------------------------------------


def order_of_operations(r: Report) -> list:
    lay = r.layout
    if lay is None:
        return []
    m = lay.machining
    out = [CondPageBreak(200), r.h2("Order of operations"),
           r.p(r.t("From the boards to the round spar, in this order; each setting serves a whole segment. The cut "
                   "list gives each segment's blank width and the fence of every pass that follows it. "
                   f"{GUARD_NOTE}"), "small"), Spacer(1, 4)]
    for line in steps_words(r.fig, m.steps):
        number, text = line.split(". ", 1)
        out.append(KeepTogether([Paragraph(r.t(text), r.styles["body"], bulletText=f"{number}."), Spacer(1, 2)]))
    for note in m.notes:
        out.append(r.p("<b>" + r.t(f"Note: {note}") + "</b>"))
    return out + [Spacer(1, 6)]


def _box_cutter_settings(r: Report, m) -> list:
    """A box spar's cutter settings: the rebate passes of a face (the same for every face segment and both of its
    edges), or a line saying that the pieces are only ripped, planed and tapered."""
    faces = [s for s in m.segments if s.settings.saw]
    out = [CondPageBreak(200), r.h2("Cutter settings")]
    if not faces:
        return out + [r.p(r.t("The box's pieces have square edges: they are ripped, planed to thickness and tapered "
                              "to width (cut list, templates); no notch, bevel or rebate is cut."), "small"),
                      Spacer(1, 6)]
    widest = max(faces, key=lambda s: s.blank.width)
    if r.spar.hollow.corner == "pinwheel":
        text = ("The rebate along edge 1 of every piece's inner side, cut on the table saw in two passes set from the "
                f"edge it rebates: the same set-ups for every segment, sides and faces alike. {FENCE_NOTE} "
                f"{GUARD_NOTE}")
        head = f"segment {widest.label} (every piece alike)"
    else:
        text = ("The rebate along each edge of a face's inner side, cut on the table saw in two passes set from the "
                "edge it rebates: the same set-ups for every face segment and for both edges (edge 2's once it is "
                f"tapered). {FENCE_NOTE} {GUARD_NOTE}")
        head = f"face segment {widest.label} (every face alike)"
    rows = [[r.p(r.t("setting"), "head"), r.p(r.t(head), "head")]]
    heading_rows = []
    for row in cutter_rows(r.fig, widest.settings):
        style = "head" if row.heading else "cell"
        if row.heading:
            heading_rows.append(len(rows))
        rows.append([r.p(r.t(row.label), style), r.p(r.t(row.value), style)])
    label_w = 62 * MM
    table = _table(rows, widths=[label_w, r.width - label_w], stripes=False)
    table.setStyle(TableStyle([("ALIGN", (1, 0), (-1, -1), "LEFT"), ("VALIGN", (0, 0), (-1, -1), "TOP")] +
                              [("BACKGROUND", (0, i), (-1, i), colors.Color(0.88, 0.92, 0.97)) for i in heading_rows]))
    return out + [r.p(r.t(text), "small"), Spacer(1, 4), table, Spacer(1, 6)]


def cutter_settings(r: Report) -> list:
    lay = r.layout
    if lay is None or lay.machining is None:
        return []
    m = lay.machining
    stations = (("widest", m.widest), ("narrowest", m.narrowest))
    listed = [cutter_rows(r.fig, at.settings) for _, at in stations]
    first = [["stave at this station" if at.settings.v_face_angles else "stave, outer face",
              f"{r.fig.mark_width(at.section.stave_width)} wide x {r.fig.dress(at.section.thickness)} thick, "
              f"from blank {at.segment}"] for _, at in stations]
    heads = [f"at the widest stave, {r.where(m.widest.z)} from the heel",
             f"at the narrowest stave, {r.where(m.narrowest.z)} from the heel"]
    if r.spar.hollow.is_box:  # a box: the pieces' edges are square; only a rebated face has passes, set once
        return _box_cutter_settings(r, m)
    if m.notch_varies:
        varies = ("The notch changes along the stave with the wall: no fixed set-up cuts it (see the order of "
                  "operations and the station table).")
    elif m.widest.settings.v_face_angles:
        varies = ("The notch is the same all along the spar, set once; only the blank width changes from segment "
                  "to segment, and with it the fence of a pass against the square edge.")
    else:
        varies = ("The bevel is the same all along the spar; only the blank width changes from segment to segment, "
                  "and with it the fence of a pass against edge 2.")
    either = (" Cut the V either on the table saw, pass by pass in the order given, or on the router table in one "
              "pass." if m.widest.settings.router is not None else " Cut the passes in the order given.")
    text = (f"How to cut the notch into the blank of the segment holding the widest and the narrowest station.{either} "
            f"{varies} {FENCE_NOTE} {GUARD_NOTE}")
    out = [CondPageBreak(260), r.h2("Cutter settings"), r.p(r.t(text), "small"), Spacer(1, 4)]
    same = [row.label for row in listed[0]] == [row.label for row in listed[1]]
    label_w = 62 * MM
    if same:
        columns = [(heads, [first[0][1], first[1][1]], list(zip(*listed)))]
    else:  # the two stations need different passes: one table each
        columns = [([head], [top[1]], [(row,) for row in rows_of]) for head, top, rows_of in zip(heads, first, listed)]
    for head, top, lines in columns:
        value_w = (r.width - label_w) / len(head)
        rows = [[r.p(r.t("setting"), "head")] + [r.p(r.t(h), "head") for h in head],
                [r.p(r.t(first[0][0]), "cell")] + [r.p(r.t(v), "cell") for v in top]]
        heading_rows = []
        for group in lines:
            style = "head" if group[0].heading else "cell"
            if group[0].heading:
                heading_rows.append(len(rows))
            rows.append([r.p(r.t(group[0].label), style)] + [r.p(r.t(row.value), style) for row in group])
        table = _table(rows, widths=[label_w] + [value_w] * len(head), stripes=False)
        table.setStyle(TableStyle([("ALIGN", (1, 0), (-1, -1), "LEFT"), ("VALIGN", (0, 0), (-1, -1), "TOP")] +
                                  [s for i in heading_rows for s in (
                                      ("BACKGROUND", (0, i), (-1, i), colors.Color(0.88, 0.92, 0.97)),
                                      ("LINEABOVE", (0, i), (-1, i), 0.4, RULE))]))
        out += [table, Spacer(1, 6)]
    if m.per_station:
        rows = [["from heel", "stave\nthickness", "notch\ndepth", "apex\nheight", "V-bit tip\nfrom fence",
                 "V-bit tip\nabove edge"]]
        for p in m.per_station:
            rows.append([r.cell(p.z, "position"), r.cell(p.thickness, "dress"), r.cell(p.notch_depth, "notch-depth"),
                         r.cell(p.apex_height, "apex-height"), r.cell(p.router.fence_to_tip),
                         r.cell(p.router.bit_height, "blade")])
        out += [r.p(r.t("The notch station by station, for a CNC router with a 90° V-bit (tip from the outer face "
                        "and above the notched edge, along the bit's axis):"), "small"),
                _table([list(row) for row in rows]), Spacer(1, 6)]
    return out


# The report's parts, in order.
# The joint of a two-piece spar -----------------------------------------------------------------------------

JOINT_SOURCES = (
    "How the joint is checked. The moment is the one that breaks the plan's solid spar at the parting, M = MOR·S·F "
    "(S = πD³/32, F = 1.18 for a round: Newlin & Trayer, NACA Report 181, 1924; from memory — verify), so the joint "
    "is as strong as the plan there; no rig load is guessed. Across the butt the spigot (or sleeve) carries it "
    "alone: its E·I and moment capacity must reach the plan's there (section properties from Roark's Formulas for "
    "Stress and Strain). It passes the moment to the bore as a pair of forces over the overlap L: taken as a "
    "pressure linear along L (a rigid member in an elastic bed), the peak is 6M/(d·L²), d the width it bears "
    "across, held below the wood's compression perpendicular to grain at the proportional limit (USDA FPL Wood "
    "Handbook FPL-GTR-282, table 5-3a; from memory — verify). A clearance c all round lets the upper part lean "
    "about 2c/L before the spigot bears. The overlap of 2 to 4 diameters is common practice, not a published "
    "rule. None of this replaces a designer: a two-piece spar is not the plan's spar, and where a class rule or a "
    "survey applies it governs.")


def joint_page(r: Report) -> list:
    """A two-piece spar's joint: the checks with their inputs, a drawing of the overlap, the order of assembly."""
    joints = r.design.assessment.joints
    if not joints:
        return []
    out: list = []
    laid = {round(jl.check.at, 6): jl for jl in (r.layout.joints if r.layout is not None else ())}
    u = r.fig.units
    for j in joints:
        jl = laid.get(round(j.at, 6))
        verdict = PASS_WORD if j.passed else FAIL_WORD
        how = (f"chosen by the rule: the least of 2 to 4 diameters ({r.length(2 * j.spar_diameter)} to "
               f"{r.length(4 * j.spar_diameter)}) that keeps the bearing within the wood's" if j.overlap_chosen
               else "as the spar file gives it")
        shape = {"wood-spigot": f", {j.staves}-sided, shaped to the bore",
                 "tube-spigot": f", {r.length(j.spigot.outside)} across, {r.length((j.spigot.outside - j.spigot.inside) / 2)} wall",
                 "sleeve": f" over the spar, {r.length((j.spigot.outside - j.spigot.inside) / 2)} wall"}[j.kind]
        intro = (f"The spar comes apart {r.where(j.at)} from the heel, joined by a {j.spigot.words}{shape}. Overlap {r.fig.cut_length(j.overlap)} into each part ({how}); clearance "
                 f"{u.length(j.clearance, step=u.fine_step(j.clearance))} all round. The plan's spar there is "
                 f"{r.length(2 * (4 * j.plan.inertia / math.pi) ** 0.25)} across and breaks under "
                 f"{_moment_words(r, j.moment)}; the force pair over the overlap is {format_force(j.force, r.spar.units)} "
                 f"each.")
        rows = [["check", "the joint", "needs", "ratio", "verdict"],
                ["stiffness across the butt: E·I", _ei_words(r, j.spigot.ei), f"{_ei_words(r, j.plan.ei)} × "
                 f"{j.ei_target:.3f}", f"{j.ei_ratio:.3f}", "ok" if j.ei_ok else FAIL_WORD],
                ["strength across the butt: moment", _moment_words(r, j.spigot.moment_capacity),
                 f"{_moment_words(r, j.moment)} × {j.strength_target:.3f}", f"{j.strength_ratio:.3f}",
                 "ok" if j.strength_ok else FAIL_WORD],
                [f"bearing 6M/(d·L²), d = {r.length(j.spigot.bearing_width)}", u.stress(j.bearing),
                 f"at most {u.stress(j.bearing_allowable)} ({j.bearing_wood}, across the grain)",
                 f"{j.bearing_ratio:.3f}", "ok" if j.bearing_ok else FAIL_WORD],
                ["kink the clearance allows, 2c/L", f"{j.kink_deg:.2f}°", "reported", "", ""]]
        if j.problem:
            rows.append(["can it be made?", j.problem, "", "", FAIL_WORD])
        table = _table([[Paragraph(r.t(c), r.styles["cell"]) for c in row] for row in rows],
                       widths=[w * r.width for w in (0.27, 0.19, 0.31, 0.09, 0.14)], align_right_from=3)
        binding = {"stiffness": "stiffness (E·I)", "strength": "strength (moment)", "bearing": "bearing"}[j.binding]
        out += [PageBreak(), r.h2(f"The joint at {r.where(j.at)}: {verdict}"), r.p(r.t(intro), "small"),
                Spacer(1, 4), table, Spacer(1, 3),
                r.p(r.t(f"The check that binds: {binding}. ") + " ".join(r.t(x) + "." for x in j.reasons()), "small")]
        if jl is not None:
            out += [Spacer(1, 6), _joint_drawing(r, jl), Spacer(1, 4)]
            out.append(r.p("<b>Order of assembly</b>"))
            from .wording import joint_step_words

            for k, line in enumerate(joint_step_words(r.fig, jl), start=1):
                out.append(KeepTogether([Paragraph(r.t(line), r.styles["body"], bulletText=f"{k}."), Spacer(1, 2)]))
            if jl.spigot is not None:
                out.append(r.p(r.t(f"The spigot's pieces ({', '.join(jl.spigot.labels)}) are in the board order and "
                                   "the cutting diagrams with the staves; the templates carry the spigot's outlines "
                                   "and the bore-fit gauges, each labelled with its part. Stave segments are "
                                   "lettered L- (lower part) and U- (upper part)."), "small"))
        out += [Spacer(1, 4), r.p(r.t(JOINT_SOURCES), "small")]
    return out


def _moment_words(r: Report, nmm: float) -> str:
    if r.spar.units == "in":
        return f"{nmm / N_PER_LBF / MM_PER_INCH:,.0f} lbf·in"
    return f"{nmm / 1e6:,.2f} kN·m"


def _ei_words(r: Report, nmm2: float) -> str:
    if r.spar.units == "in":
        return f"{nmm2 / N_PER_LBF / MM_PER_INCH ** 2 / 1e6:,.2f} million lbf·in²"
    return f"{nmm2 / 1e9:,.1f} kN·m²"


def _joint_drawing(r: Report, jl) -> Drawing:
    """The overlap in long section, to scale: both parts' walls, the spigot (glued half and sliding half), the
    plugs, the force pair, the overlap dimensioned each way."""
    j = jl.check
    prof = jl.profile
    z0, z1 = prof[0][0], prof[-1][0]
    rmax = max(p[1] for p in prof)
    pad_x, pad_y = 20.0, 34.0
    k = min((r.width - 2 * pad_x) / (z1 - z0), 150.0 / (2 * rmax))
    height = 2 * rmax * k + 2 * pad_y
    d = Drawing(r.width, height)
    cy = height / 2

    def P(z: float, y: float) -> tuple[float, float]:
        return pad_x + (z - z0) * k, cy + y * k

    lower = [p for p in prof if p[0] <= j.at + 1e-9]
    upper = [p for p in prof if p[0] >= j.at - 1e-9]
    gap = 0.6 / k  # a hairline at the butt
    for part, fill, shift in ((lower, WOOD, -gap), (upper, colors.Color(0.86, 0.78, 0.62), gap)):
        for sign in (1, -1):
            outer = [P(z + (shift if abs(z - j.at) < 1e-9 else 0), sign * rad) for z, rad, _ in part]
            inner = [P(z + (shift if abs(z - j.at) < 1e-9 else 0), sign * bore) for z, _, bore in part]
            pts = [c for xy in outer + inner[::-1] for c in xy]
            d.add(Polygon(pts, fillColor=fill, strokeColor=colors.black, strokeWidth=0.5))
    for block in jl.plugs:
        a, b = block.plug.start, block.plug.end
        ya, yb = block.heel.across_flats / 2, block.head.across_flats / 2
        pts = [c for xy in (P(a, ya), P(b, yb), P(b, -yb), P(a, -ya)) for c in xy]
        d.add(Polygon(pts, fillColor=PALE_WOOD, strokeColor=colors.black, strokeWidth=0.4, strokeDashArray=(2, 1)))
        d.add(String(P((a + b) / 2, 0)[0], cy - 3, f"plug {block.index}", fontName=FONT, fontSize=6,
                     textAnchor="middle"))
    lo, hi = j.at - j.overlap, j.at + j.overlap
    if jl.spigot is not None:
        ga, gb, gc = (f / 2 for f in jl.spigot.across_flats)
        glued = [c for xy in (P(lo, ga), P(j.at, gb), P(j.at, -gb), P(lo, -ga)) for c in xy]
        slide = [c for xy in (P(j.at, gb), P(hi, gc), P(hi, -gc), P(j.at, -gb)) for c in xy]
        d.add(Polygon(glued, fillColor=colors.Color(0.55, 0.40, 0.25), strokeColor=colors.black, strokeWidth=0.6))
        d.add(Polygon(slide, fillColor=colors.Color(0.75, 0.60, 0.42), strokeColor=colors.black, strokeWidth=0.6))
    elif j.kind == "tube-spigot":
        ro, ri = j.spigot.outside / 2, j.spigot.inside / 2
        for sign in (1, -1):
            pts = [c for xy in (P(lo, sign * ro), P(hi, sign * ro), P(hi, sign * ri), P(lo, sign * ri)) for c in xy]
            d.add(Polygon(pts, fillColor=colors.Color(0.75, 0.78, 0.82), strokeColor=colors.black, strokeWidth=0.6))
    else:
        ri, ro = j.spigot.inside / 2, j.spigot.outside / 2
        for sign in (1, -1):
            pts = [c for xy in (P(lo, sign * ri), P(hi, sign * ri), P(hi, sign * ro), P(lo, sign * ro)) for c in xy]
            d.add(Polygon(pts, fillColor=colors.Color(0.75, 0.78, 0.82), strokeColor=colors.black, strokeWidth=0.6))
    word_glued = "glued" if j.kind != "sleeve" else "sleeve glued"
    d.add(String(P((lo + j.at) / 2, 0)[0], cy + 3, word_glued, fontName=BOLD, fontSize=6.5, textAnchor="middle",
                 fillColor=colors.white if jl.spigot is not None else colors.black))
    d.add(String(P((j.at + hi) / 2, 0)[0], cy + 3, "slides", fontName=BOLD, fontSize=6.5, textAnchor="middle"))
    # The force pair: at the mouth of the upper part and at the spigot's tip, opposite ways.
    top = rmax * k
    for z, up in ((j.at, True), (hi, False)):
        x = P(z, 0)[0]
        y0, y1 = (cy + top + 16, cy + top + 2) if up else (cy - top - 16, cy - top - 2)
        d.add(Line(x, y0, x, y1, strokeColor=FAIL_RED, strokeWidth=1.2))
        _arrow(d, x, y1, 0, -1 if up else 1, 4)
    d.add(String(P(j.at, 0)[0] + 4, cy + top + 10, f"M/L = {format_force(j.force, r.spar.units)}", fontName=FONT,
                 fontSize=6.5, fillColor=FAIL_RED))
    d.add(String(P(hi, 0)[0] + 4, cy - top - 14, "M/L", fontName=FONT, fontSize=6.5, fillColor=FAIL_RED))
    # Overlap dimensions, each way from the butt.
    yd = cy - top - 26
    for a, b in ((lo, j.at), (j.at, hi)):
        _dim(d, (P(a, 0)[0], yd), (P(b, 0)[0], yd), r.fig.cut_length(j.overlap), ((P(a, 0)[0] + P(b, 0)[0]) / 2, yd + 2))
    d.add(String(P(z0, 0)[0], cy + top + 6, "lower part", fontName=BOLD, fontSize=7, textAnchor="start"))
    d.add(String(P(z1, 0)[0], cy + top + 6, "upper part", fontName=BOLD, fontSize=7, textAnchor="end"))
    d.add(String(P(j.at, 0)[0], height - 8, f"parting {r.where(j.at)}", fontName=FONT, fontSize=6.5,
                 textAnchor="middle"))
    return d


SECTIONS: tuple[Section_, ...] = (title_and_verdict, cautions, summary, station_table, section_drawing, ei_plot,
                                  sheathing, cut_list, board_order, scarf_map, order_of_operations, cutter_settings,
                                  plugs, joint_page)


# Pages ---------------------------------------------------------------------------------------------------------


def _numbered_canvas(footer: Callable[[Canvas, int, int], None]):
    """A canvas class that holds its pages back until the end, so each can say 'page n of m'."""

    class NumberedCanvas(Canvas):
        def __init__(self, *args, **kwargs):
            kwargs["initialFontName"] = kwargs.get("initialFontName") or FONT
            super().__init__(*args, **kwargs)
            self._held: list[dict] = []
            ask_actual_size(self)

        def showPage(self):
            self._held.append(dict(self.__dict__))
            self._startPage()

        def save(self):
            total = len(self._held)
            for number, state in enumerate(self._held, start=1):
                self.__dict__.update(state)
                footer(self, number, total)
                Canvas.showPage(self)
            Canvas.save(self)

    return NumberedCanvas


def write_report(design: Design, path: str | Path) -> None:
    """Write the shop report of ``design`` to ``path`` as a PDF on the spar's paper (portrait)."""
    spar = design.spar
    size = paper_size(spar)
    doc = SimpleDocTemplate(str(path), pagesize=size, leftMargin=MARGIN, rightMargin=MARGIN, topMargin=MARGIN,
                            bottomMargin=MARGIN + 8, title=f"{spar.name} - hollow spar shop report",
                            author="stavegen", subject=f"from {source_name(spar)}")
    report = Report(design=design, styles=_styles(), width=size[0] - 2 * MARGIN)
    story: list = []
    for part in SECTIONS:
        story += part(report)
    date = build_date()
    left_words = f"{spar.name}  |  {source_name(spar)}  |  built {date}"

    def footer(c: Canvas, number: int, total: int) -> None:
        c.saveState()
        c.setFont(FONT, 7)
        c.setStrokeColor(RULE)
        c.setLineWidth(0.4)
        c.line(MARGIN, MARGIN + 2, size[0] - MARGIN, MARGIN + 2)
        c.drawString(MARGIN, MARGIN - 7, left_words)
        c.drawRightString(size[0] - MARGIN, MARGIN - 7, f"page {number} of {total}")
        c.restoreState()

    doc.build(story, canvasmaker=_numbered_canvas(footer))
