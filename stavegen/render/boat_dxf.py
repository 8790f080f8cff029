"""``BOAT-boards.dxf``: every board of the boat's order at true size, with every spar's segments on it.

Written when the boat file asks for ``templates_on_boards``: the router operator loads
one board and cuts everything the order puts on it, whichever spar it belongs to. Each
segment is drawn by its own spar's :class:`~stavegen.render.dxf_templates.TemplateSheet`
(in the boat's units), at the rip and offset the boat's order gives, its outline the
edge allowance in from the rip's upper edge, and labelled with its boat-wide label
("M-S3-2"); boards, rips and captions as on a single spar's sheet. Neighbouring
outlines are at least the order's gap apart (the kerf, or the router bit).
"""

from __future__ import annotations

import textwrap
from pathlib import Path

from ..boat import BoatDesign
from .dxf_templates import CUT, BoardPlace, Part, Pen, TemplateSheet, set_extents, setup_document


def boat_boards_document(bd: BoatDesign):
    """The boards sheet of the boat as an ezdxf document (the boat must be laid out)."""
    if bd.order is None:
        raise ValueError("the boards sheet needs the boat's order: design_boat(boat, layout=True)")
    units = bd.boat.units
    doc = setup_document(units)
    pen = Pen(doc.modelspace(), units)
    sheets = [TemplateSheet(bd.spar_view(i, units=units), pen) for i in range(len(bd.designs))]
    segments = [{seg.label: seg for seg in d.layout.segments} for d in bd.designs]
    gap = sheets[0].style.gap
    top = -gap
    for board in bd.order.boards:
        sheets[0].draw_board(BoardPlace(board, (0.0, top)))
        for rip in board.rips:
            for cut in rip.cuts:
                index, own = bd.owners[cut.piece.label]
                seg = segments[index][own]
                edge = bd.designs[index].layout.plan.edge_allowance
                origin = (cut.offset, top - rip.offset - edge - max(y for _, y in seg.outline))
                sheets[index].draw_part(Part(seg, origin, marks_outside=False, label=cut.piece.label))
        top -= board.size.width + 2 * gap
    _notes(bd, sheets[0], top)
    set_extents(doc, pen)
    return doc


def _notes(bd: BoatDesign, sheet: TemplateSheet, top: float) -> None:
    s, pen = sheet.style, sheet.pen
    check = 304.8 if bd.boat.units == "in" else 300.0
    unit = "inches" if bd.boat.units == "in" else "millimetres"
    gap = bd.order.gap
    parted = ("a router bit" if bd.boat.stock.separate_with == "router" else "a saw kerf")
    spars = "; ".join(f"{bs.tag}: {bs.spar.name}" for bs in bd.boat.spars)
    lines = [
        f"{bd.boat.name}: every board of the boat's order at true size, in {unit}, with every spar's segments on it.",
        f"Cut only the layer {CUT}; boards (BOARD-OUTLINE, BOARD-RIPS) and text are not to cut.",
        f"Segments are {parted} ({sheet.size(gap)}) apart, outlines at least that far apart. Labels: spar tag, "
        f"stave, segment. {spars}.",
        f"Check the scale before cutting: the line below must measure {sheet.size(check)}.",
    ]
    lines = [part for line in lines for part in textwrap.wrap(line, 90)]  # short lines keep the extents tight
    bottom = top - (len(lines) * 1.8 + 4) * s.text
    pen.line((0.0, bottom), (check, bottom), "SHEET-NOTES")
    y = bottom + 2.5 * s.text
    for line in reversed(lines):
        pen.text(line, (0.0, y), s.text, "SHEET-NOTES")
        y += 1.8 * s.text


def write_boat_boards(bd: BoatDesign, path: str | Path) -> None:
    boat_boards_document(bd).saveas(Path(path))
