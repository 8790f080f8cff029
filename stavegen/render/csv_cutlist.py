"""The cut list as CSV: one row per stave segment, in the spar's units (fractions for inches)."""

from __future__ import annotations

import csv
import io

from ..pipeline import Design
from ..units import format_length, format_plain


def cutlist_rows(design: Design) -> list[list[str]]:
    """Header and one row per segment, heel to head, stave by stave."""
    spar = design.spar
    layout = design.layout
    units = spar.units
    unit_word = "ft-in" if units == "in" else "mm"
    width_word = "in" if units == "in" else "mm"

    def pos(mm: float) -> str:
        return format_length(mm, units, tape=True)

    def size(mm: float) -> str:
        return format_plain(mm, units)

    header = ["stave", "segment", "label", f"from heel ({unit_word})", f"to ({unit_word})",
              f"length along face ({unit_word})", f"width at heel end ({width_word})",
              f"width at head end ({width_word})", f"widest ({width_word})", f"rip width ({width_word})",
              f"thickness ({width_word})", "heel end", "head end", "board",
              "from_mm", "to_mm", "length_mm", "rip_width_mm"]
    rows = [header]
    plan = layout.plan
    boards = layout.board_of
    for seg in layout.segments:
        rows.append([
            str(seg.stave), str(seg.index), seg.label, pos(seg.start), pos(seg.end), pos(seg.length),
            size(plan.width_at(seg.start)), size(plan.width_at(seg.end)), size(seg.widest), size(seg.rough_width),
            size(max(plan.thickness_at(seg.start), plan.thickness_at(seg.end))),
            "scarf" if seg.scarf_at_start else "stave end", "scarf" if seg.scarf_at_end else "stave end",
            boards.get(seg.label, ""),
            f"{seg.start:.2f}", f"{seg.end:.2f}", f"{seg.length:.2f}", f"{seg.rough_width:.2f}",
        ])
    return rows


def to_csv(design: Design) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows(cutlist_rows(design))
    return buffer.getvalue()
