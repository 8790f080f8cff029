"""``BOAT-report.pdf``: the boat's shop report, composed from the single-spar report's parts.

Page 1 is the boat's: every spar's verdict (read from its check), weight saved and the
boards it would need bought alone, then the boards to buy for the whole boat beside that
sum, and the cautions. Then the boat's board order and cutting diagrams (the single-spar
report's :func:`~stavegen.render.pdf_report.board_order`, drawn from the boat's order).
Then each spar's own pages: verdict, summary, station table, section, E·I plot, cut list
(with the boat's boards), scarf map, cutter settings, plugs — the same section functions
as ``NAME-report.pdf``, nothing worked out here.
"""

from __future__ import annotations

from pathlib import Path

from reportlab.lib import colors
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import PageBreak, Paragraph, SimpleDocTemplate, Spacer, Table, TableStyle

from ..boat import BoatDesign
from ..units import format_mass
from . import pdf_report as parts
from .pdf_common import BOLD, FONT, MM, PAPER, build_date, plain
from .wording import board_feet_words, order_words, volume_words

# The spar's own pages in the boat report, in order (the board order is the boat's, on the pages before).
SPAR_PAGES = (parts.title_and_verdict, parts.summary, parts.station_table, parts.section_drawing, parts.ei_plot,
              parts.cut_list, parts.scarf_map, parts.cutter_settings, parts.plugs)
ORDERLESS = (parts.summary,)  # parts that would print the spar's own order: drawn without one


def boat_page(bd: BoatDesign, r: parts.Report) -> list:
    """Page 1: the boat's verdict, each spar's, the weight saved and the boards to buy."""
    boat, units = bd.boat, bd.boat.units
    failed = [d.spar.name for d in bd.designs if not d.passed]
    if not failed:
        head = (f"<b>{parts.PASS_WORD}</b>: every spar is at least as stiff as its plan at every station, with the "
                f"margin asked, and meets its strength target.")
        colour = parts.PASS_GREEN
    else:
        head = (f"<b>{parts.FAIL_WORD}</b>: {r.t(', '.join(failed))} {'misses' if len(failed) == 1 else 'miss'} "
                f"the target. Do not build {'it' if len(failed) == 1 else 'them'} as drawn; see "
                f"{'its' if len(failed) == 1 else 'their'} pages.")
        colour = parts.FAIL_RED
    verdict = Table([[Paragraph(head, r.styles["verdict"])]], colWidths=[r.width])
    verdict.setStyle(TableStyle([("BACKGROUND", (0, 0), (-1, -1), colour),
                                 ("LEFTPADDING", (0, 0), (-1, -1), 7), ("RIGHTPADDING", (0, 0), (-1, -1), 7),
                                 ("TOPPADDING", (0, 0), (-1, -1), 5), ("BOTTOMPADDING", (0, 0), (-1, -1), 6)]))
    rows = [["spar", "", "verdict", "least E·I\nratio", "least strength\nratio", "weight: plan\n(solid)",
             "hollow", "weight saved", "board feet\nbought alone"]]
    verdicts = []
    plan_total = hollow_total = 0.0
    for bs, d in bd.spars:
        a = d.assessment
        plan_kg, hollow_kg = a.plan.mass.mass, a.hollow.mass.mass
        plan_total, hollow_total = plan_total + plan_kg, hollow_total + hollow_kg
        saved = plan_kg - hollow_kg
        alone = d.layout.lumber.to_buy_board_feet if d.layout is not None else None
        verdicts.append(d.passed)
        rows.append([bs.tag, d.spar.name, parts.PASS_WORD if d.passed else parts.FAIL_WORD,
                     f"{a.weakest_stiffness.ei_ratio:.3f}", f"{a.weakest_strength.strength_ratio:.3f}",
                     format_mass(plan_kg, units), format_mass(hollow_kg, units),
                     f"{format_mass(saved, units)} ({100 * saved / plan_kg:.0f} %)",
                     board_feet_words(alone) if alone is not None else "-"])
    saved_total = plan_total - hollow_total
    rows.append(["", "the boat", "", "", "", format_mass(plan_total, units), format_mass(hollow_total, units),
                 f"{format_mass(saved_total, units)} ({100 * saved_total / plan_total:.0f} %)",
                 board_feet_words(bd.separate_board_feet) if bd.order is not None else "-"])
    widths = [10, 40, 14, 16, 20, 20, 16, 26, 20]
    scale = r.width / (sum(widths) * MM)
    table = parts._table([[plain(c) for c in row] for row in rows], widths=[w * MM * scale for w in widths],
                         align_right_from=3)
    style = [("FONT", (0, -1), (-1, -1), BOLD, 7.5), ("LINEABOVE", (0, -1), (-1, -1), 0.6, colors.black)]
    for i, ok in enumerate(verdicts, start=1):
        style += [("TEXTCOLOR", (2, i), (2, i), parts.PASS_GREEN if ok else parts.FAIL_RED),
                  ("FONT", (2, i), (2, i), BOLD, 7.5)]
    table.setStyle(TableStyle(style))
    sub = (f"{len(bd.designs)} spars from {Path(boat.source).name if boat.source else 'a boat given in code'}, "
           f"built hollow and cut from one order of boards.")
    out = [Paragraph(r.t(f"{boat.name}: boat shop report"), r.styles["title"]), r.p(r.t(sub)), Spacer(1, 6),
           verdict, Spacer(1, 8), r.h2("The spars"), table, Spacer(1, 3),
           r.p(r.t("Each spar's verdict, ratios and weights are its own check's, the same as when it is built "
                   "alone; its pages follow the board order."), "small")]
    if bd.order is not None:
        order = bd.order
        together, apart = order.to_buy_board_feet, bd.separate_board_feet
        saved = apart - together
        figures = f"{board_feet_words(together)} board feet"
        if units != "in":
            figures += f" ({volume_words(order.to_buy_volume_m3)})"
        lines = [
            f"Boards to buy for the whole boat: {order_words(order, units)}.",
            f"Ordered together the boat needs {figures}, waste allowance included; each spar bought alone from the "
            f"same boards would need {board_feet_words(apart)} board feet in all: ordering together saves "
            f"{board_feet_words(saved)} board feet ({100 * saved / apart:.0f} %), as the staves of one spar are "
            f"ripped from the offcuts of another.",
            f"The boat's cutting plan uses {board_feet_words(order.board_feet)} board feet (the spars' own plans "
            f"{board_feet_words(bd.separate_used_board_feet)}); no plan can use less than "
            f"{board_feet_words(order.lower_bound_board_feet)}.",
        ]
        out += [r.h2("Boards to buy")] + [p for line in lines for p in (r.p(r.t(line)), Spacer(1, 3))]
    return out + [Spacer(1, 6)] + parts.cautions(r)


def _spar_pages(bd: BoatDesign, index: int, styles, width: float) -> list:
    framed = parts.Report(design=bd.spar_view(index), styles=styles, width=width)
    orderless = parts.Report(design=bd.spar_view(index, boards=False), styles=styles, width=width)
    story: list = [PageBreak()]
    for part in SPAR_PAGES:
        story += part(orderless if part in ORDERLESS else framed)
    return story


def write_boat_report(bd: BoatDesign, path: str | Path) -> None:
    """Write the boat's shop report to ``path`` on the boat's paper (portrait)."""
    boat = bd.boat
    size = PAPER[boat.output.paper]
    margin = parts.MARGIN
    doc = SimpleDocTemplate(str(path), pagesize=size, leftMargin=margin, rightMargin=margin, topMargin=margin,
                            bottomMargin=margin + 8, title=f"{boat.name} - boat shop report", author="stavegen",
                            subject=f"from {Path(boat.source).name if boat.source else 'a boat given in code'}")
    styles = parts._styles()
    width = size[0] - 2 * margin
    story = boat_page(bd, parts.Report(design=bd.designs[0], styles=styles, width=width))
    if bd.order is not None:
        story += [PageBreak()] + parts.board_order(parts.Report(design=bd.order_view(), styles=styles, width=width))
    for i in range(len(bd.designs)):
        story += _spar_pages(bd, i, styles, width)
    left_words = plain(f"{boat.name}  |  {Path(boat.source).name if boat.source else ''}  |  built {build_date()}")

    def footer(c: Canvas, number: int, total: int) -> None:
        c.saveState()
        c.setFont(FONT, 7)
        c.setStrokeColor(parts.RULE)
        c.setLineWidth(0.4)
        c.line(margin, margin + 2, size[0] - margin, margin + 2)
        c.drawString(margin, margin - 7, left_words)
        c.drawRightString(size[0] - margin, margin - 7, f"page {number} of {total}")
        c.restoreState()

    doc.build(story, canvasmaker=parts._numbered_canvas(footer))
