"""The words on a template, for the DXF and the full-size PDF alike (:mod:`stavegen.layout.templates`).

Each function words what the layout's template model holds, in the spar's
units through :class:`~stavegen.render.figures.Figures`; the two renderers
place these words, neither makes up its own.
"""

from __future__ import annotations

from ..layout.templates import FeatherLine, Groove, Mark, Template
from .figures import Figures

END_WORDS = {"scarf tip": "scarf tip", "square cut": "square cut end (trim after glue-up)"}


def mark_lines(fig: Figures, mark: Mark, grooves: tuple[Groove, ...] = ()) -> tuple[str, str]:
    """A mark's figures in two lines: where it is (and what it is), and the face's width there; and the depth
    of a groove under the mark when the groove's printed depth changes along the piece (``grooves``: the
    template's)."""
    where = fig.position(mark.z)
    first = {"heel": f"heel {where}", "head": f"head {where}", "scarf centre": f"scarf centre {where}"}.get(
        mark.kind, where)
    width = f"width {fig.mark_width(mark.width)}"
    for g in grooves:
        if g.start - 1e-6 <= mark.x <= g.end + 1e-6 and _varies(fig, g):
            width += f", groove {fig.groove_depth(g.at(mark.x)[1])} deep"
    return first, width + (", plug end" if mark.kind == "plug end" else "")


def mark_line(fig: Figures, mark: Mark, grooves: tuple[Groove, ...] = ()) -> str:
    """A mark's figures on one line."""
    return "  ".join(mark_lines(fig, mark, grooves))


def _varies(fig: Figures, g: Groove) -> bool:
    return fig.groove_depth(g.shallowest) != fig.groove_depth(g.deepest)


def groove_words(fig: Figures, g: Groove) -> str:
    """The note along a groove: which strip it takes, its width and its depth below the stave's outer face."""
    depth = (f"{fig.groove_depth(g.shallowest)} to {fig.groove_depth(g.deepest)} deep (at each mark)"
             if _varies(fig, g) else f"{fig.groove_depth(g.deepest)} deep")
    return f"GROOVE for strip {g.strip}: {fig.at_least(g.width)} wide, {depth} below the outer face, between these lines"


def template_name(t: Template) -> str:
    """The template's name: the pieces it serves and how many to mark out."""
    first, rest = t.labels[0], t.labels[1:]
    also = f" (also {', '.join(rest)})" if rest else ""
    return f"{first}{also}: mark out {len(t.labels)}"


def edge_names(t: Template) -> tuple[str, str]:
    """(the edge along y = 0, the other edge)."""
    straight = "(straight)" if t.straight_notch_edge else "(tapered)"
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
