"""The cut list as CSV: one row per stave segment, then the order of operations.

Lengths are in the spar's units, each rounded its safe way (:mod:`.figures`):
tape fractions for an inch spar, each with a decimal twin column so that a
spreadsheet cannot read ``7/8`` as a date; millimetres for a metric spar. The
last columns repeat the figures in mm, unrounded, for scripts. A design that
misses its target says so in the first row, before the header.
"""

from __future__ import annotations

import csv
import io

from ..pipeline import Design
from .figures import Figures
from .wording import steps_words

FAILS_WORD = "FAILS ITS TARGET"


def fails_line(design: Design) -> str:
    """The warning every template output of a failing design carries, in one line."""
    return (f"WARNING: this design {FAILS_WORD} ({'; '.join(design.assessment.shortfalls())}). "
            "Do not build it as drawn.")


def _thickest(plan, seg) -> float:
    """The segment's thickest point (mm): at its ends or at any station between."""
    zs = [seg.start, seg.end] + [st.z for st in plan.between(seg.start, seg.end)]
    return max(plan.thickness_at(z) for z in zs)


def cutlist_rows(design: Design) -> list[list[str]]:
    """(Warning), header and one row per segment, heel to head, stave by stave; then the steps."""
    spar = design.spar
    layout = design.layout
    fig = Figures(spar)
    imperial = fig.units.imperial
    pos_word = fig.units.position_word
    len_word = fig.units.length_word
    m = layout.machining
    width_passes = [k for k, p in enumerate(m.widest.settings.saw, start=1) if p.follows_blank_width]

    columns: list[tuple[str, str, callable]] = []  # (heading, kind, value of a segment)

    def col(heading: str, kind: str, value) -> None:
        columns.append((heading, kind, value))

    plan = layout.plan
    setups = {s.label: s for s in m.segments}
    col(f"from heel ({pos_word})", "position", lambda seg: seg.start)
    col(f"to ({pos_word})", "position", lambda seg: seg.end)
    col(f"length along face, cut ({pos_word})", "cut-length", lambda seg: seg.length)
    col(f"width at heel end ({len_word})", "mark-width", lambda seg: layout.plan_for(seg.stave).width_at(seg.start))
    col(f"width at head end ({len_word})", "mark-width", lambda seg: layout.plan_for(seg.stave).width_at(seg.end))
    col(f"widest ({len_word})", "mark-width", lambda seg: seg.widest)
    col(f"blank width ({len_word})", "dress", lambda seg: setups[seg.label].blank.width)
    col(f"rip width ({len_word})", "dress", lambda seg: setups[seg.label].rough_width)
    col(f"thickness ({len_word})", "dress", lambda seg: _thickest(layout.plan_for(seg.stave), seg))
    for k in width_passes:
        p = m.widest.settings.saw[k - 1]
        kind = "fence-nearer" if p.leaves_wood_when_fence_is == "nearer" else "fence-farther"
        col(f"pass {k} fence ({len_word})", kind,
            lambda seg, k=k: setups[seg.label].settings.saw[k - 1].fence_distance)

    header = ["stave", "segment", "label"]
    for heading, kind, _ in columns:
        header.append(heading)
        if imperial:
            header.append(heading.replace(f"({pos_word})", "(decimal in)").replace(f"({len_word})", "(decimal in)"))
    header += ["heel end", "head end", "board", "from_mm", "to_mm", "length_mm", "rip_width_mm", "thickness_mm"]
    piece_of = ({s.stave: t.box_piece for t in layout.templates for s in t.segments} if layout.box_corner
                else {})
    if piece_of:  # a box: which piece each row is (side, face or rebated face)
        header.append("piece")
    rows = [[fails_line(design)]] if not design.passed else []
    rows.append(header)
    boards = layout.board_of
    for seg in layout.segments:
        row = [str(seg.stave), str(seg.index), seg.label]
        for _, kind, value in columns:
            v = value(seg)
            row.append(fig.cell(kind, v))
            if imperial:
                row.append(fig.decimal(kind, v))
        row += ["scarf" if seg.scarf_at_start else "stave end", "scarf" if seg.scarf_at_end else "stave end",
                boards.get(seg.label, ""), f"{seg.start:.2f}", f"{seg.end:.2f}", f"{seg.length:.2f}",
                f"{setups[seg.label].rough_width:.2f}", f"{_thickest(plan, seg):.2f}"]
        if piece_of:
            row.append(piece_of.get(seg.stave, ""))
        rows.append(row)
    rows.append([])
    rows.append(["order of operations"])
    for line in steps_words(fig, m.steps):
        number, text = line.split(". ", 1)
        rows.append([number, text])
    for note in m.notes:
        rows.append(["note", note])
    for joint in layout.joints:
        rows += _joint_rows(design, joint, fig)
    return rows


def _joint_rows(design: Design, joint, fig: Figures) -> list[list[str]]:
    """A two-piece spar's joint after the steps: the spigot's pieces (or the tube to buy), the order of assembly."""
    from .wording import joint_step_words

    rows: list[list[str]] = [[]]
    boards = design.layout.board_of
    blank = joint.spigot
    if blank is not None:
        rows.append(["spigot", f"glued up from {blank.layers} layers of the staves' boards, planed to "
                               f"{fig.dress(blank.across_flats[1])} across the flats at the parting"])
        rows.append(["label", "length", "rip width", "thickness", "board"])
        for piece in (c.piece for b in design.layout.lumber.boards for r in b.rips for c in r.cuts):
            if piece.stave == 0:
                rows.append([piece.label, fig.cut_length(piece.length), fig.dress(piece.width),
                             fig.dress(blank.layer_thickness), boards.get(piece.label, "")])
    else:
        rows.append([joint.check.kind, f"{joint.check.spigot.words}, buy {fig.cut_length(joint.bought_length)} long"])
    rows.append(["joint: order of assembly"])
    for k, line in enumerate(joint_step_words(fig, joint), start=1):
        rows.append([str(k), line])
    return rows


def to_csv(design: Design) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows(cutlist_rows(design))
    return buffer.getvalue()
