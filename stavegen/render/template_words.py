"""The words on a template, for the DXF and the full-size PDF alike (:mod:`stavegen.layout.templates`).

Each function words what the layout's template model holds, in the spar's
units through :class:`~stavegen.render.figures.Figures`; the two renderers
place these words, neither makes up its own.
"""

from __future__ import annotations

from ..layout.templates import FeatherLine, Mark, Template
from .figures import Figures

END_WORDS = {"scarf tip": "scarf tip", "square cut": "square cut end (trim after glue-up)"}


def mark_lines(fig: Figures, mark: Mark) -> tuple[str, str]:
    """A mark's figures in two lines: where it is (and what it is), and the face's width there."""
    where = fig.position(mark.z)
    first = {"heel": f"heel {where}", "head": f"head {where}", "scarf centre": f"scarf centre {where}"}.get(
        mark.kind, where)
    width = f"width {fig.mark_width(mark.width)}"
    return first, width + (", plug end" if mark.kind == "plug end" else "")


def mark_line(fig: Figures, mark: Mark) -> str:
    """A mark's figures on one line."""
    return "  ".join(mark_lines(fig, mark))


def template_name(t: Template) -> str:
    """The template's name: the pieces it serves and how many to mark out."""
    first, rest = t.labels[0], t.labels[1:]
    also = f" (also {', '.join(rest)})" if rest else ""
    return f"{first}{also}: mark out {len(t.labels)}"


def edge_names(t: Template) -> tuple[str, str]:
    """(the edge along y = 0, the other edge)."""
    straight = "(straight)" if t.straight_notch_edge else "(tapered)"
    if t.box_piece == "rebated face":
        return (f"EDGE 1 {straight}: square, rebated along the inner side",
                "EDGE 2 (tapered): square, rebated along the inner side once tapered")
    if t.box_piece is not None and t.box_piece.endswith("rebated on edge 1"):
        return (f"EDGE 1 {straight}: square, rebated along the inner side",
                "EDGE 2 (tapered): square, into the next piece's rebate")
    if t.box_piece is not None:
        return f"EDGE 1 {straight}: square", "EDGE 2 (tapered): square"
    if not t.notched:
        return f"BEVEL EDGE {straight}", "BEVEL EDGE (tapered)"
    return f"NOTCH EDGE {straight}: cut the V along this edge", "SQUARE EDGE (tapered)"


def end_words(t: Template) -> tuple[str, str]:
    """What the heel end and the head end of the piece are."""
    return END_WORDS[t.heel_end], END_WORDS[t.head_end]


def feather_note(fig: Figures, t: Template, line: FeatherLine) -> str:
    """The note beside a feather line, pointing to the end the scarf slopes to."""
    note = f"scarf {fig.cut_length(t.segment.scarf_length)}: slope from this line to a feather edge at the tip"
    return f"<-- {note}" if line.tip < line.x else f"{note} -->"
