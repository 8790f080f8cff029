"""The words on a template, for the DXF and the full-size PDF alike (:mod:`stavegen.layout.templates`).

Each function words what the layout's template model holds, in the spar's
units through :class:`~stavegen.render.figures.Figures`; the two renderers
place these words, neither makes up its own.
"""

from __future__ import annotations

from ..layout.end_views import EndView
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


def end_view_caption(fig: Figures, view: EndView) -> list[str]:
    """The lines under an end view (:mod:`stavegen.layout.end_views`), worded in the spar's units."""
    where = f"{fig.position(view.z)} from the heel"
    s = view.section
    if view.kind == "stave end":
        lines = [f"STAVE END at the {view.which}, {where}",
                 f"{fig.mark_width(s.stave_width)} wide x {fig.dress(s.thickness)} thick, outer face up"]
        if s.notch is not None:
            a, b = s.v_face_angles
            lines += [f"notch edge at left: V {fig.notch_depth(s.notch.depth)} deep, "
                      f"apex {fig.apex_height(s.notch.apex_height)} up",
                      f"V faces {a:.2f} and {b:.2f} deg to the broad face"]
        elif s.joint == "box":  # a box's piece: square edges, and the rebate its corner joint gives it
            lines += ["edges square" + (f", rebated {fig.dress(s.rebate[0])} deep and {fig.dress(s.rebate[1])} "
                                        "wide on the inner side" if s.rebate else "")]
        else:
            lines += [f"edges bevelled {s.bevel_angle:.2f} deg off square"]
        return lines
    if view.kind == "assembled":
        if s.joint == "box":
            return [f"ASSEMBLED at the {view.which}, {where}",
                    f"a box of 4 pieces ({s.corner}), {fig.describe(s.across_flats)} by "
                    f"{fig.describe(s.across_flats_athwartships)} before planing",
                    f"finished {fig.dress(s.fore_aft)} fore-and-aft (across the sheet) by "
                    f"{fig.dress(s.athwartships)} athwartships"
                    + (f", corners rounded {fig.dress(s.corner_radius)}" if s.corner_radius else ""),
                    "pieces 1 and 3 the sides, 2 and 4 the faces (piece 1 at the top)"]
        if s.shape != "round":
            return [f"ASSEMBLED at the {view.which}, {where}",
                    f"{s.staves} staves, {fig.describe(s.across_flats)} by "
                    f"{fig.describe(s.across_flats_athwartships)} across the flats",
                    f"finished oval {fig.dress(s.fore_aft)} fore-and-aft (across the sheet) by "
                    f"{fig.dress(s.athwartships)} athwartships",
                    "stave 1 at the top, numbered counter-clockwise looking from the heel"]
        return [f"ASSEMBLED at the {view.which}, {where}",
                f"{s.staves} staves, {fig.describe(s.across_flats)} across the flats",
                f"finished round {fig.dress(2 * s.radius)} diameter",
                f"bore {fig.describe(2 * s.inner_apothem)} across the flats"]
    if view.kind == "plug":
        end = view.plug
        first = f"PLUG {view.index}, {view.which} end, {fig.position(end.z)} from the heel"
        if s.shape != "round":
            return [first, f"{s.staves} sides, {fig.dress(end.across_flats)} across the flats fore-and-aft",
                    f"{fig.dress(s.bore_across_flats_athwartships)} athwartships"]
        return [first, f"{s.staves} sides, {fig.dress(end.across_flats)} across the flats",
                f"{fig.dress(end.across_corners)} across the corners"]
    j = view.joint.check
    if view.kind == "spigot":
        which = "butt (the parting)" if view.which == "butt" else view.which
        return [f"SPIGOT, LOWER PART: {which}, {where}",
                f"{j.staves} sides, {fig.dress(view.across)} across the flats"]
    if view.kind == "bore fit":
        return [f"BORE FIT, UPPER PART: {view.which}, {where}",
                f"the bore, {fig.describe(view.across)} across the flats: the spigot goes in",
                f"with {fig.units.length(j.clearance, step=fig.units.fine_step(j.clearance))} all round"]
    part = "LOWER" if view.which == "lower" else "UPPER"
    first = f"TUBE HOLE, {part} PART" + (f": in plug {view.index}" if view.index is not None else "")
    fit = "a glue fit" if view.which == "lower" else "the tube slides in"
    return [first, f"{fig.describe(view.across)} across: {fit}"]
