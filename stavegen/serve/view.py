"""A Design worded for the page, by the same tables and wordings the command line prints.

Tables come from :mod:`stavegen.render.console` (the rich tables of ``check``,
``section`` and ``size``) and read back cell by cell; board sizes and cutter
settings from :mod:`stavegen.render.wording`. Nothing is computed here.
"""

from __future__ import annotations

from typing import Any

from rich.table import Table
from rich.text import Text

from ..pipeline import Design
from ..render import console
from ..render.wording import board_feet_words, board_length, board_words, cutter_rows, dressed_size, order_words
from ..render.figures import Figures
from ..units import format_length
from . import svg


def _cell(value: Any) -> str:
    return value.plain if isinstance(value, Text) else str(value)


def table_data(table: Table) -> dict[str, Any]:
    """A rich table as headers, rows of plain text and each row's style."""
    columns = [list(column.cells) for column in table.columns]
    rows = [[_cell(column[i]) for column in columns] for i in range(table.row_count)]
    return {
        "title": _cell(table.title or ""),
        "headers": [" ".join(_cell(c.header).split()) for c in table.columns],
        "rows": rows,
        "styles": [str(r.style or "") for r in table.rows],
    }


def _order(design: Design) -> dict[str, Any] | None:
    layout = design.layout
    if layout is None or layout.lumber is None:
        return None
    units = design.spar.units
    order = layout.lumber
    rows = [[board_words(c.size, units), dressed_size(c.size, units), str(c.count),
             board_feet_words(c.board_feet)] for c in order.to_buy]
    boards = [{"id": b.id, "size": board_words(b.size, units), "length": board_length(b.size.length, units),
               "pieces": [cut.piece.label for rip in b.rips for cut in rip.cuts]} for b in order.boards]
    return {
        "summary": order_words(order, units),
        "headers": ["board", "dressed", "count", "board feet"],
        "rows": rows,
        "boards": boards,
        "notes": list(order.notes),
        "svg": svg.boards_svg(design),
    }


def page_view(design: Design) -> dict[str, Any]:
    """Everything the page shows of a checked (and perhaps laid-out) spar, in the file's units."""
    spar = design.spar
    result = design.assessment
    weakest = result.weakest_stiffness.station.z
    positions = [{"z_mm": c.station.z, "label": format_length(c.station.z, spar.units, tape=True),
                  "reasons": list(c.station.reasons)} for c in result.stations]
    return {
        "name": spar.name,
        "slug": spar.slug,
        "units": spar.units,
        "passed": design.passed,
        "verdict": console.verdict(design).plain,
        "solved": list(design.solved),
        "warnings": list(design.warnings),
        "stations": table_data(console.station_table(design)),
        "whole": table_data(console.spar_table(design)),
        "positions": positions,
        "weakest_z_mm": weakest,
        "order": _order(design),
        "stave_svg": svg.stave_length_svg(design) if design.layout is not None else None,
    }


def section_view(design: Design, check) -> dict[str, Any]:
    """One section: the ``section`` command's figures and cutter settings, and its drawings."""
    from ..layout.machining import cutter_settings

    spar = design.spar
    station = check.station
    kerf = spar.stock.kerf if spar.stock is not None else (3.175 if spar.units == "in" else 3.0)
    settings = cutter_settings(station.section, kerf)
    return {
        "z_mm": station.z,
        "position": format_length(station.z, spar.units, tape=True),
        "figures": table_data(console.section_table(spar, check)),
        "cutter": [{"label": r.label, "value": r.value, "heading": r.heading}
                   for r in cutter_rows(Figures(spar), settings)],
        "section_svg": svg.section_svg(spar, station),
        "stave_svg": svg.stave_svg(spar, station.section),
    }


def size_view(spar, comparison) -> dict[str, Any]:
    """The ``size`` command's comparison: its table, its notes and the reason for the choice."""
    table = table_data(console.candidates_table(spar, comparison))
    return {
        "table": table,
        "chosen": comparison.chosen.staves,
        "chosen_row": [c.staves for c in comparison.candidates].index(comparison.chosen.staves),
        "reason": comparison.reason,
        "notes": console.candidate_notes(comparison),
        "asked": spar.hollow.staves,
    }
