"""How cutter settings and board sizes are worded, once, for every output that prints them.

The ``section`` command's table (:func:`stavegen.render.console.machining_table`)
and the shop report's cutter settings section both print :func:`cutter_rows`;
neither words a setting of its own. Board sizes (:func:`board_words` and its
parts) are worded here for the report, the DXF board captions and the build
summary alike. Figures come straight from
:class:`~stavegen.layout.machining.CutterSettings` and
:class:`~stavegen.layout.lumber.BoardSize`; nothing is computed here.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from ..layout.machining import CutterSettings, Lean, SawPass
from ..layout.operations import Step
from ..units import MM_PER_FOOT, MM_PER_INCH, Way, format_inches, format_tape
from .figures import Figures

if TYPE_CHECKING:  # for annotations only: the lumber solver loads scipy.optimize, which `check` never needs
    from ..layout.lumber import BoardSize, LumberOrder

QUARTER_INCH = MM_PER_INCH / 4  # rough thickness is sold in quarters: 4/4 = 1 in, 5/4 = 1 1/4 in (lumber rules)

FENCE_NOTE = ("Fence to blade: from the fence to where the blade's fence-side face meets the table; the kerf "
              "lies on the waste side. Settings are rounded so the cut leaves wood: creep up on the line with "
              "a test piece.")
GUARD_NOTE = "Use push sticks, featherboards and the guard on narrow staves."


@dataclass(frozen=True)
class Row:
    """One line of the settings: ``label`` and its ``value``; ``heading`` starts a pass or a set-up."""

    label: str
    value: str
    heading: bool = False


def degrees(angle: float) -> str:
    return f"{angle:.2f}°"


def _bearing(fig: Figures, mm: float) -> str:
    return fig.least(mm) if mm > 0 else "on a corner"


def saw_rows(fig: Figures, p: SawPass) -> list[Row]:
    """The settings of one table-saw pass (after its heading)."""
    lean = "" if p.lean is Lean.UPRIGHT else f", top leaning {p.lean}"
    end = "through the stave" if p.through else ("to the rebate's corner" if p.makes.startswith("rebate")
                                                 else "to the apex")
    fence = fig.fence(p.fence_distance, nearer=p.leaves_wood_when_fence_is == "nearer")
    if p.follows_blank_width:
        fence += " on this blank (each segment's in the cut list)"
    return [
        Row("stave down on the table", str(p.on_table)),
        Row("stave against the fence", str(p.on_fence)),
        Row("blade tilt from vertical", degrees(p.tilt) + lean),
        Row("fence to blade at the table", fence),
        Row("blade height above the table", fig.blade(p.height)),
        Row(f"blade's fence-side face, table to top, {end}", fig.blade(p.depth_along_blade)),
        Row("kerf, on the waste side", f"{fig.describe(p.kerf)}; the stave's face is on the blade's {p.stave_side}"),
        Row("stave bearing behind the blade: table / fence",
            f"{_bearing(fig, p.table_contact)} / {_bearing(fig, p.fence_contact)}"),
    ]


def cutter_rows(fig: Figures, settings: CutterSettings) -> list[Row]:
    """Every line of one blank's cutter settings, in the order to read them, rounded the safe way.

    First the blank and the shape (V faces and notch, or the bevel), then each table-saw
    pass in the order to cut it, then the router-table set-up when there is one.
    """
    rows: list[Row] = [Row("blank, width x thickness", f"{fig.dress(settings.blank.width)} x "
                                                        f"{fig.dress(settings.blank.thickness)}")]
    if settings.joint == "box":
        rows.append(Row("edges", "square to the faces"))
        if not settings.saw:
            rows.append(Row("table saw", "nothing to cut: rip, plane and taper only", heading=True))
    elif settings.v_face_angles:
        inner, outer = settings.v_face_angles
        rows.append(Row("V faces to the broad face", f"inner {degrees(inner)}, outer {degrees(outer)}"))
        rows.append(Row("notch depth / apex above the inner face",
                        f"{fig.notch_depth(settings.notch_depth)} / {fig.apex_height(settings.apex_height)}"))
    else:
        rows.append(Row("edge bevel off square", degrees(settings.bevel)))
    if not settings.saw and settings.joint != "box":
        rows.append(Row("table saw", "no fixed set-up: the notch changes along the stave", heading=True))
    for k, p in enumerate(settings.saw, start=1):
        rows.append(Row(f"table saw, pass {k}", f"makes the {p.makes}", heading=True))
        rows += saw_rows(fig, p)
    r = settings.router
    if r is not None:
        rows.append(Row("router table, 90° V-bit", "whole V in one pass", heading=True))
        ride = f"{r.on_table}, {r.on_fence} against the fence"
        if r.one_pass_flat:
            ride += ", flat on the table"
        else:
            ride += f", on a {degrees(r.wedge_angle)} wedge, high side {r.wedge_high_side}"
        rows += [
            Row("stave rides on", ride),
            Row("bit tip above the riding surface", fig.blade(r.bit_height)),
            Row("fence to bit tip", fig.describe(r.fence_to_tip)),
            Row("bit at least this wide", fig.at_least(r.least_bit_diameter)),
            Row("notched edge left to ride on",
                fig.least(r.edge_left) if r.edge_left > 0 else "none: support the outfeed side"),
        ]
    return rows


def step_words(fig: Figures, step: Step) -> str:
    """One shop step in words, its figures in the spar's units, each rounded its safe way."""
    return step.text.format(**{f.name: fig.by_kind(f.kind, f.value) for f in step.figures})


def steps_words(fig: Figures, steps: tuple[Step, ...]) -> list[str]:
    """The order of operations, numbered: ``1. Rip each segment ...``."""
    return [f"{k}. {step_words(fig, s)}" for k, s in enumerate(steps, start=1)]


# Board sizes ------------------------------------------------------------------------------------


def _mm(mm: float) -> str:
    """Millimetres to a tenth, without a needless ".0": ``145``, ``37.6``."""
    return f"{round(mm, 1):g}"


def nominal_thickness(mm: float, units: str) -> str:
    """Nominal (rough) thickness as sold: quarters for inch stock (``5/4``), bare mm for metric."""
    if units != "in":
        return _mm(mm)
    quarters = mm / QUARTER_INCH
    if abs(quarters - round(quarters)) < 1e-6 and round(quarters) > 0:
        return f"{round(quarters)}/4"
    return format_inches(mm)


def nominal_size(size: BoardSize, units: str) -> str:
    """Nominal thickness x width: ``5/4 x 8"`` or ``25 x 150 mm``."""
    if units == "in":
        return f"{nominal_thickness(size.nominal_thickness, units)} x {format_inches(size.nominal_width)}"
    return f"{_mm(size.nominal_thickness)} x {_mm(size.nominal_width)} mm"


def dressed_size(size: BoardSize, units: str) -> str:
    """Dressed thickness x width: ``1 x 7 1/4"`` or ``22 x 145 mm``."""
    if units == "in":
        return f"{format_inches(size.thickness, mark=False)} x {format_inches(size.width)}"
    return f"{_mm(size.thickness)} x {_mm(size.width)} mm"


def board_length(mm: float, units: str) -> str:
    """A board's length as sold: ``14 ft`` (or ``13' 6"``), ``4200 mm``."""
    if units == "in":
        feet = mm / MM_PER_FOOT
        return f"{round(feet)} ft" if abs(feet - round(feet)) < 1e-6 else format_tape(mm)
    return f"{_mm(mm)} mm"


def board_words(size: BoardSize, units: str) -> str:
    """The whole size as a builder asks for it: ``5/4 x 8" x 14 ft``, ``25 x 150 x 4200 mm``."""
    if units == "in":
        return f"{nominal_size(size, units)} x {board_length(size.length, units)}"
    return f"{_mm(size.nominal_thickness)} x {_mm(size.nominal_width)} x {_mm(size.length)} mm"


def board_feet_words(board_feet: float) -> str:
    """Board feet to a tenth: ``63.3``."""
    return f"{board_feet:.1f}"


def volume_words(m3: float) -> str:
    """Cubic metres to a thousandth: ``0.153 m³``."""
    return f"{m3:.3f} m³"


def order_words(order: LumberOrder, units: str) -> str:
    """The boards to buy in one line: ``7 boards, 63.3 board feet: 1 of 5/4 x 6" x 10 ft, ...``."""
    count = sum(c.count for c in order.to_buy)
    tally = f"{board_feet_words(order.to_buy_board_feet)} board feet"
    if units != "in":
        tally += f" ({volume_words(order.to_buy_volume_m3)})"
    sizes = ", ".join(f"{c.count} of {board_words(c.size, units)}" for c in order.to_buy)
    return f"{count} board{'s' if count != 1 else ''}, {tally}: {sizes}"


def aimed_words(aim) -> str:
    """What aiming the scarfs at the boards saved (a :class:`~stavegen.layout.scarfs.ScarfAim`), as a clause
    to follow the scarfs' count: empty when the scarfs stayed where the rules alone put them."""
    if aim is None or not aim.aimed:
        return ""
    return (f"; placed for the boards: the cutting plan uses {board_feet_words(aim.board_feet)} board feet, against "
            f"{board_feet_words(aim.slack_first_board_feet)} with the scarfs placed for the rules alone")


def joint_step_words(fig, joint) -> list[str]:
    """A two-piece spar's order of assembly, each step's figures worded in the spar's units (positions as
    positions, sizes as dressed sizes, counts as counts)."""
    out = []
    for text, figures in joint.steps:
        words = {}
        for name, mm in figures.items():
            if name.endswith("_n"):
                words[name] = f"{mm:.0f}"
            elif name in ("at", "lo", "a", "b"):
                words[name] = fig.position(mm)
            elif name == "clearance":  # down, on a grid fine enough to show it (1/64 in)
                words[name] = fig.units.length(mm, Way.DOWN, step=fig.units.fine_step(mm))
            elif name == "od":
                words[name] = fig.describe(mm)
            elif name in ("glued", "butt", "tip", "d"):
                words[name] = fig.dress(mm)  # a plug to fit: wood left to take off
            else:
                words[name] = fig.cut_length(mm)
        out.append(text.format(**words))
    return out


# Sheathing layers and reinforcing strips -------------------------------------------------------------------------


def _span_words(start, end, length: float, units: str) -> str:
    from ..units import format_length

    if start is None and end is None:
        return "the whole spar"
    lo = 0.0 if start is None else start
    hi = length if end is None else end
    return f"{format_length(lo, units, tape=True)} to {format_length(hi, units, tape=True)} from the heel"


def region_rows(design) -> list[list[str]]:
    """What each sheathing layer and reinforcing strip is and adds, one row each (a header first), for the
    report and the terminal: the region, its material and plies, where it lies, what it adds to the wood's E·I
    at the stations it covers (least to most, and at the station of least EI ratio) and its weight."""
    from ..units import format_length, format_mass

    spar, a = design.spar, design.assessment
    units = spar.units
    rows = [["", "material", "plies / thickness", "where", "adds to E·I", "at least EI ratio", "weight"]]
    totals = {(t.kind, t.label): t for t in a.regions}
    for k, layer in enumerate(spar.hollow.layers, start=1):
        t = totals.get(("layer", f"layer {k}"))
        rows.append(_region_row(f"layer {k} (sheathing)", layer, t, spar, units))
    for k, strip in enumerate(spar.hollow.strips, start=1):
        t = totals.get(("strip", f"strip {k}"))
        where = "inner faces" if strip.place == "inner-face" else "grooves"
        rows.append(_region_row(f"strip {k} ({format_length(strip.width, units)} wide, {where})", strip, t, spar,
                                units))
    return rows if len(rows) > 1 else []


def _region_row(name: str, part, total, spar, units: str) -> list[str]:
    from ..units import format_length, format_mass

    from ..units import format_thin

    plies = f"{part.plies} × {format_thin(part.thickness / part.plies, units)}" if part.plies else ""
    thick = f"{plies} = {format_thin(part.thickness, units)}" if plies else format_thin(part.thickness, units)
    if total is None or total.stations == 0:
        return [name, part.material.key, thick, _span_words(part.start, part.end, spar.length, units),
                "at no station", "", ""]
    least, most = 100 * total.ei_added_least, 100 * total.ei_added_most
    adds = f"+{least:.1f} %" if abs(most - least) < 0.05 else f"+{least:.1f} to +{most:.1f} %"
    return [name, part.material.key, thick, _span_words(part.start, part.end, spar.length, units), adds,
            "not there" if total.ei_added_at_weakest is None else f"+{100 * total.ei_added_at_weakest:.1f} %",
            format_mass(total.mass, units)]


REGION_NOTE = ("What a layer or strip adds to E·I is its own E·I over the wood's (staves and plug) at the same "
               "station, about the section's neutral axis; the finished diameter includes the layers, so the wood "
               "under them is rounded that much smaller. The strength check takes the first material to reach its "
               "limit.")


def cloth_rows(spar, sheathing) -> list[list[str]]:
    """Cloth, tape and resin to buy, one row per layer or strip (a header first)."""
    from ..units import format_cloth_area, format_length, format_small_mass

    units = spar.units
    rows = [["", "material", "pieces", "cut from", "net area", "resin"]]
    for c in sheathing:
        if c.kind == "layer":
            pieces = (f"{c.pieces} × {format_length(c.length, units, tape=True)} long, "
                      f"{format_length(c.piece_width, units)} wide")
        else:
            pieces = f"{c.pieces} × {format_length(c.length, units, tape=True)} long"
        roll = (f"{format_length(c.roll_length * 1000, units, tape=True)} of a {format_length(c.roll_width, units)} "
                f"{'roll' if c.kind == 'layer' else 'tape'}" if c.roll_width else
                format_length(c.roll_length * 1000, units, tape=True))
        rows.append([c.label, c.material.key, pieces, roll, format_cloth_area(c.net_area, units),
                     "" if c.resin is None else format_small_mass(c.resin, units)])
    return rows if len(rows) > 1 else []


CLOTH_NOTE = ("Net area: the cloth on the spar, each ply round the girth it is laid on; add the overlap and waste "
              "you usually allow. Resin: the laminate's coverage (data file, from memory — verify) for wetting out "
              "and filling, before sanding and varnish.")
