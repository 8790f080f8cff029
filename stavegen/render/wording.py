"""How the cutter settings are worded, once, for every output that prints them.

The ``section`` command's table (:func:`stavegen.render.console.machining_table`)
and the shop report's cutter settings section both print :func:`cutter_rows`;
neither words a setting of its own. Figures come straight from
:class:`~stavegen.layout.machining.CutterSettings`; nothing is computed here.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..layout.machining import CutterSettings, Lean, SawPass
from ..units import format_length

FENCE_NOTE = ("Fence to blade: from the fence to where the blade's fence-side face meets the table.")
GUARD_NOTE = "Use push sticks, featherboards and the guard on narrow staves."


@dataclass(frozen=True)
class Row:
    """One line of the settings: ``label`` and its ``value``; ``heading`` starts a pass or a set-up."""

    label: str
    value: str
    heading: bool = False


def degrees(angle: float) -> str:
    return f"{angle:.2f}°"


def _length(units: str, mm: float | None) -> str:
    return "—" if mm is None else format_length(mm, units)


def _bearing(units: str, mm: float) -> str:
    return _length(units, mm) if mm > 0 else "on a corner"


def saw_rows(units: str, p: SawPass) -> list[Row]:
    """The settings of one table-saw pass (after its heading)."""
    lean = "" if p.lean is Lean.UPRIGHT else f", top leaning {p.lean}"
    end = "through the stave" if p.through else "to the apex"
    return [
        Row("stave down on the table", str(p.on_table)),
        Row("stave against the fence", str(p.on_fence)),
        Row("blade tilt from vertical", degrees(p.tilt) + lean),
        Row("fence to blade at the table", _length(units, p.fence_distance)),
        Row(f"cut along the blade, {end}", _length(units, p.depth_along_blade)),
        Row("top of the cut above the table", _length(units, p.height)),
        Row("stave bearing behind the blade: table / fence",
            f"{_bearing(units, p.table_contact)} / {_bearing(units, p.fence_contact)}"),
    ]


def cutter_rows(units: str, settings: CutterSettings) -> list[Row]:
    """Every line of one section's cutter settings, in the order to read them, lengths in ``units``.

    First the shape (V faces and notch, or the bevel), then each table-saw pass in the
    order to cut it, then the router-table set-up when there is one.
    """
    rows: list[Row] = []
    if settings.v_face_angles:
        inner, outer = settings.v_face_angles
        rows.append(Row("V faces to the broad face", f"inner {degrees(inner)}, outer {degrees(outer)}"))
        rows.append(Row("notch depth / apex above the inner face",
                        f"{_length(units, settings.notch_depth)} / {_length(units, settings.apex_height)}"))
    else:
        rows.append(Row("edge bevel off square", degrees(settings.bevel)))
        rows.append(Row("rip to width: fence to blade", _length(units, settings.rip_fence_distance)))
    for k, p in enumerate(settings.saw, start=1):
        rows.append(Row(f"table saw, pass {k}", f"makes the {p.makes}", heading=True))
        rows += saw_rows(units, p)
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
            Row("bit tip above the riding surface", _length(units, r.bit_height)),
            Row("fence to bit tip", _length(units, r.fence_to_tip)),
            Row("bit at least this wide", _length(units, r.least_bit_diameter)),
            Row("notched edge left to ride on",
                _length(units, r.edge_left) if r.edge_left > 0 else "none: support the outfeed side"),
        ]
    return rows
