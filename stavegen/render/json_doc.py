"""The JSON document of every figure, in SI (mm, N, kg), under the keys users rely on."""

from __future__ import annotations

import json
import math

import numpy as np
from typing import TYPE_CHECKING, Any

from .. import __version__
from ..cautions import CAUTIONS
from ..checks.parting import JointCheck
from ..checks.ratios import ATHWARTSHIPS, DIRECTIONS, FORE_AFT, StationCheck
from ..model.woods import Wood
from ..pipeline import Design
from .figures import Figures
from .wording import step_words

if TYPE_CHECKING:  # for annotations only: the layout loads scipy.optimize, which `check --json` never needs
    from ..layout.lumber import BoardSize, LumberOrder
    from ..layout.operations import Machining, StationSettings
    from ..layout.plan import Layout
    from ..layout.segments import Segment

SCHEMA_VERSION = 1


def _wood(wood: Wood) -> dict[str, Any]:
    return {
        "key": wood.key,
        "name": wood.name,
        "moe_mpa": wood.moe,
        "mor_mpa": wood.mor,
        "density_kg_m3": wood.density,
        "specific_gravity": wood.specific_gravity,
        "compression_perp_mpa": wood.compression_perp,
        "source": wood.source,
    }


def _material(material) -> dict[str, Any]:
    """A wood or a laminate, with the figures the check used and their source."""
    if isinstance(material, Wood):
        return {"family": "wood", **_wood(material), "basis": material.basis}
    return {"family": "laminate", "key": material.key, "name": material.name, "E_mpa": material.moe,
            "strength_mpa": material.strength, "density_kg_m3": material.density,
            "ply_thickness_mm": material.ply_thickness, "fibre_g_m2": material.fibre_g_m2,
            "resin_g_m2": material.resin_g_m2, "source": material.source}


def _regions(check: StationCheck) -> list[dict[str, Any]]:
    """One entry per material region of the station's section: E·I_Nmm2 of the station is the sum of E_mpa × I_mm4."""
    regions = check.hollow.regions
    if regions is None:
        return []
    return [{"material": r.material.key, "kind": r.kind, "label": r.label, "E_mpa": r.modulus,
             "area_mm2": r.moments.area, "I_mm4": regions.inertia_of(r), "EI_Nmm2": regions.ei_of(r),
             "EI_share": regions.ei_of(r) / regions.ei, "mass_kg_per_m": regions.mass_of(r) * 1000,
             "outer_mm": r.reach, "pieces": r.pieces,
             "limit_moment_Nmm": next((x.moment for x in check.hollow.limits if x.region is r), None)}
            for r in regions.regions]


def _station(check: StationCheck) -> dict[str, Any]:
    s = check.station
    sec = s.section
    return {
        "z_mm": s.z,
        "od_mm": s.diameter,
        "wall_mm": s.wall,
        "stave_width_mm": sec.stave_width,
        "notch_depth_mm": sec.notch.depth if sec.notch else None,
        "apex_height_mm": sec.notch.apex_height if sec.notch else None,
        "across_flats_mm": sec.across_flats,
        "area_mm2": sec.area,
        "I_mm4": sec.inertia,
        "EI_Nmm2": check.hollow.ei,
        "plan_od_mm": s.plan_diameter,
        "plan_I_mm4": check.plan.inertia,
        "plan_EI_Nmm2": check.plan.ei,
        "ei_ratio": check.ei_ratio,
        "strength_ratio": check.strength_ratio,
        "ei_ok": check.ei_ok,
        "strength_ok": check.strength_ok,
        "plan_form_factor": check.plan.form_factor,
        "form_factor": check.hollow.form_factor,
        "stave_thickness_mm": sec.thickness,
        "void_mm2": sec.void_area,
        "min_wall_mm": sec.least_wall,
        "bore_corner_wall_mm": sec.corner_wall,
        "plug": s.plug is not None,
        "plug_wood": s.plug.wood.key if s.plug else None,
        "bore_area_mm2": sec.bore.area,
        "bore_I_mm4": sec.bore_inertia,
        "flat_wall_mm": sec.flat_wall,
        "glue_line_mm": sec.glue_line,
        "reasons": list(s.reasons),
        "wood_od_mm": 2 * sec.radius,
        "wood_fore_aft_mm": sec.fore_aft,
        "wood_athwartships_mm": sec.athwartships,
        "regions": _regions(check),
        "first_limit": None if check.hollow.first_limit is None else {
            "kind": check.hollow.first_limit.region.kind, "label": check.hollow.first_limit.region.label,
            "material": check.hollow.first_limit.region.material.key,
            "moment_Nmm": check.hollow.first_limit.moment},
        # both directions (equal pairs for a round); fore_aft resists bending in the fore-and-aft plane
        "fore_aft_mm": s.fore_aft,
        "athwartships_mm": s.athwart,
        "plan_fore_aft_mm": s.plan_diameter,
        "plan_athwartships_mm": s.plan_athwart,
        "I_fore_aft_mm4": sec.inertia_fore_aft,
        "I_athwartships_mm4": sec.inertia_athwartships,
        "EI_fore_aft_Nmm2": check.hollow.ei_in(FORE_AFT),
        "EI_athwartships_Nmm2": check.hollow.ei_in(ATHWARTSHIPS),
        "plan_I_fore_aft_mm4": check.plan.inertia_in(FORE_AFT),
        "plan_I_athwartships_mm4": check.plan.inertia_in(ATHWARTSHIPS),
        "plan_EI_fore_aft_Nmm2": check.plan.ei_in(FORE_AFT),
        "plan_EI_athwartships_Nmm2": check.plan.ei_in(ATHWARTSHIPS),
        "ei_ratio_fore_aft": check.ei_ratio_in(FORE_AFT),
        "ei_ratio_athwartships": check.ei_ratio_in(ATHWARTSHIPS),
        "strength_ratio_fore_aft": check.strength_ratio_in(FORE_AFT),
        "strength_ratio_athwartships": check.strength_ratio_in(ATHWARTSHIPS),
        "ei_ok_fore_aft": check.ei_ok_in(FORE_AFT),
        "ei_ok_athwartships": check.ei_ok_in(ATHWARTSHIPS),
        "strength_ok_fore_aft": check.strength_ok_in(FORE_AFT),
        "strength_ok_athwartships": check.strength_ok_in(ATHWARTSHIPS),
        "stave_widths_mm": list(sec.widths),
        **_box_station(sec),
    }


def _box_station(sec) -> dict[str, Any]:
    """A box's pieces at a station: the faces' and the sides' widths, the rebate, the least wall after planing."""
    if getattr(sec, "joint", "") != "box":
        return {}
    from ..section.box import FACE, SIDE

    return {"face_width_mm": sec.widths[FACE], "side_width_mm": sec.widths[SIDE],
            "rebate_depth_mm": sec.rebate_depth if sec.rebate else None,
            "rebate_width_mm": sec.rebate[1] if sec.rebate else None,
            "corner_radius_mm": sec.corner_radius}


def _joint(j: JointCheck) -> dict[str, Any]:
    """One joint of a two-piece spar: the promised keys first, then the inputs of its checks."""
    return {
        "at_mm": j.at,
        "overlap_mm": j.overlap,
        "spigot_EI_Nmm2": j.spigot.ei,
        "plan_EI_Nmm2": j.plan.ei,
        "bearing_mpa": j.bearing,
        "bearing_allowable_mpa": j.bearing_allowable,
        "kink_deg": j.kink_deg,
        "passed": j.passed,
        "kind": j.kind,
        "overlap_chosen": j.overlap_chosen,
        "clearance_mm": j.clearance,
        "spar_od_mm": j.spar_diameter,
        "bore_across_flats_mm": j.bore,
        "plan_od_mm": 2 * (4 * j.plan.inertia / math.pi) ** 0.25,
        "moment_Nmm": j.moment,
        "force_pair_N": j.force,
        "spigot": {"words": j.spigot.words, "outside_mm": j.spigot.outside, "inside_mm": j.spigot.inside,
                   "I_mm4": j.spigot.inertia, "moment_capacity_Nmm": j.spigot.moment_capacity,
                   "bearing_width_mm": j.spigot.bearing_width},
        "ei_ratio": j.ei_ratio,
        "strength_ratio": j.strength_ratio,
        "bearing_ratio": j.bearing_ratio,
        "ei_ok": j.ei_ok,
        "strength_ok": j.strength_ok,
        "bearing_ok": j.bearing_ok,
        "bearing_wood": j.bearing_wood,
        "binding": j.binding,
        "problem": j.problem or None,
        "glued_mm": list(j.glued),
        "sliding_mm": list(j.sliding),
        "reasons": j.reasons(),
    }


def document(design: Design) -> dict[str, Any]:
    """Every computed figure of ``design`` as plain JSON-ready data."""
    spar = design.spar
    result = design.assessment
    hollow = spar.hollow
    weakest = result.weakest_stiffness
    weakest_strength = result.weakest_strength
    doc: dict[str, Any] = {
        "stavegen": {"version": __version__, "schema": SCHEMA_VERSION},
        "spar": {
            "name": spar.name,
            "length_mm": spar.length,
            "staves": hollow.staves,
            "joint": hollow.joint.kind,
            "shape": hollow.shape,
            "plan_shape": spar.plan.shape,
            "plan_corner_radius_mm": spar.plan.corner_radius,
            **({"corner": hollow.corner, "corner_radius_mm": hollow.corner_radius,
                "pieces": {"sides": [1, 3], "faces": [2, 4]}} if hollow.is_box else {}),
            "units": spar.units,
            "source": spar.source,
            "taper": hollow.taper,
            "lamination_factor": hollow.lamination_factor,
            "margin": hollow.margin,
            "planing_allowance_mm": hollow.planing_allowance,
            "end_allowance_mm": hollow.end_allowance,
            "plugs": [{"from_mm": p.start, "to_mm": p.end, "wood": p.wood.key} for p in hollow.plugs],
            "solved": list(design.solved),
        },
        "woods": {"plan": _wood(spar.plan.wood), "hollow": _wood(hollow.wood),
                  "plugs": [_wood(p.wood) for p in hollow.plugs],
                  "spigot": _wood(spar.parting.wood) if spar.parting and spar.parting.wood else None},
        "stations": [_station(c) for c in result.stations],
        "joints": [_joint(j) for j in result.joints],
        "check": {
            "passed": result.passed,
            "ei_target": result.ei_target,
            "min_ei_ratio": weakest.ei_ratio,
            "min_ei_ratio_z_mm": weakest.station.z,
            "min_strength_ratio": weakest_strength.strength_ratio,
            "min_strength_ratio_z_mm": weakest_strength.station.z,
            "strength_target": result.strength_target,
            "strength_target_given": hollow.strength_target_given,
            "stiffness_met": result.stiffness_met,
            "strength_met": result.strength_met,
            "joints_met": result.joints_met,
            "shortfalls": result.shortfalls(),
            **{f"min_{what}_ratio_{way}{tail}": value
               for way in DIRECTIONS
               for what, weakest_in, ratio in (("ei", result.weakest_stiffness_in, "ei_ratio_in"),
                                               ("strength", result.weakest_strength_in, "strength_ratio_in"))
               for tail, value in (("", getattr(weakest_in(way), ratio)(way)),
                                   ("_z_mm", weakest_in(way).station.z))},
            **{f"{what}_met_{way}": all(getattr(c, ok)(way) for c in result.stations)
               for way in DIRECTIONS for what, ok in (("stiffness", "ei_ok_in"), ("strength", "strength_ok_in"))},
        },
        "mass": {
            "hollow_kg": result.hollow.mass.mass,
            "plan_kg": result.plan.mass.mass,
            "hollow_cg_mm": result.hollow.mass.centre,
            "plan_cg_mm": result.plan.mass.centre,
            "saved_kg": result.weight_saved,
            "saved_share": result.weight_saved_share,
        },
        "beam": {
            "head_load_N": result.head_load,
            "head_load_given": spar.head_load_given,
            "plan_head_stiffness_N_per_mm": result.plan.head_stiffness,
            "hollow_head_stiffness_N_per_mm": result.hollow.head_stiffness,
            "plan_tip_deflection_mm": result.plan.tip_deflection,
            "hollow_tip_deflection_mm": result.hollow.tip_deflection,
            "plan_euler_load_N": result.plan.euler_load,
            "hollow_euler_load_N": result.hollow.euler_load,
            "weaker_direction": result.hollow.direction or None,
            **{f"{who}_{what}_{way}{unit}": figures.in_direction(way)[k]
               for way in DIRECTIONS for who, figures in (("plan", result.plan), ("hollow", result.hollow))
               for k, (what, unit) in enumerate((("tip_deflection", "_mm"), ("euler_load", "_N")))},
        },
        "regions": [{"kind": t.kind, "label": t.label, "material": t.material.key, "mass_kg": t.mass,
                     "ei_added_at_least_ei_ratio": t.ei_added_at_weakest, "ei_added_least": t.ei_added_least,
                     "ei_added_most": t.ei_added_most, "stations": t.stations} for t in result.regions],
        "layers": [{"material": layer.material.key, "plies": layer.plies, "thickness_mm": layer.thickness,
                    "from_mm": layer.start, "to_mm": layer.end} for layer in hollow.layers],
        "strips": [{"material": strip.material.key, "plies": strip.plies, "thickness_mm": strip.thickness,
                    "width_mm": strip.width, "place": strip.place, "from_mm": strip.start, "to_mm": strip.end}
                   for strip in hollow.strips],
        "materials": {m.key: _material(m) for m in _materials_used(spar)},
        "warnings": list(design.warnings),
        "cautions": list(CAUTIONS),
    }
    if design.layout is not None:
        doc.update(_layout(design.layout, Figures(spar)))
    return doc


def _materials_used(spar) -> list:
    found = {}
    for m in [spar.plan.wood, spar.hollow.wood, *(p.wood for p in spar.hollow.plugs),
              *(x.material for x in spar.hollow.layers), *(x.material for x in spar.hollow.strips)]:
        found.setdefault(m.key, m)
    return list(found.values())


def _segment(seg: Segment, board: str | None) -> dict[str, Any]:
    return {
        "index": seg.index,
        "label": seg.label,
        "from_mm": seg.start,
        "to_mm": seg.end,
        "length_mm": seg.length,
        "board": board,
        "widest_mm": seg.widest,
        "narrowest_mm": seg.narrowest,
        "rough_width_mm": seg.rough_width,
        "scarf_at_start": seg.scarf_at_start,
        "scarf_at_end": seg.scarf_at_end,
        "volume_mm3": seg.volume,
    }


def _stave_plan(plan) -> dict[str, Any]:
    return {
        "taper": plan.taper,
        "cut_length_mm": plan.cut_length,
        "finished_length_mm": plan.finished_length,
        "end_allowance_mm": plan.end_allowance,
        "edge_allowance_mm": plan.edge_allowance,
        "stations": [{"z_mm": st.z, "s_mm": st.s, "width_mm": st.width, "rough_width_mm": st.rough_width,
                      "thickness_mm": st.thickness, "notch_depth_mm": st.notch_depth,
                      "apex_height_mm": st.apex_height, "reasons": list(st.reasons)} for st in plan.stations],
    }


def _layout(layout: Layout, fig: Figures) -> dict[str, Any]:
    boards = layout.board_of
    kinds = layout.kinds or (0,) * len(layout.staves)
    return {
        "stave_plan": _stave_plan(layout.plan),  # stave 1's (every stave's for a round)
        # an oval's staves differ: one plan for each kind of stave (staves of one kind are alike)
        "stave_plans": [_stave_plan(p) for p in (layout.plans or (layout.plan,))],
        "staves": [{"index": k, "phase": layout.scarfs.phases[k - 1], "kind": kinds[k - 1],
                    "segments": [_segment(seg, boards.get(seg.label)) for seg in segs]}
                   for k, segs in enumerate(layout.staves, start=1)],
        "scarfs": [{"stave": k, "z_mm": z, "length_mm": layout.scarfs.length}
                   for k, centres in enumerate(layout.scarfs.centres, start=1) for z in centres],
        "plugs": [{"index": p.index, "from_mm": p.plug.start, "to_mm": p.plug.end, "length_mm": p.length,
                   "wood": p.plug.wood.key, "heel_across_flats_mm": p.heel.across_flats,
                   "heel_across_corners_mm": p.heel.across_corners, "head_across_flats_mm": p.head.across_flats,
                   "head_across_corners_mm": p.head.across_corners, "volume_mm3": p.volume, "mass_kg": p.mass}
                  for p in layout.plugs],
        "machining": _machining(layout.machining, fig),
        "sheathing": [{"kind": c.kind, "label": c.label, "material": c.material.key, "plies": c.plies,
                       "from_mm": c.start, "to_mm": c.end, "net_area_m2": c.net_area, "piece_width_mm": c.piece_width,
                       "pieces": c.pieces, "roll_width_mm": c.roll_width, "roll_length_m": c.roll_length,
                       "roll_area_m2": c.roll_area, "resin_kg": c.resin} for c in layout.sheathing],
        "stock": _stock(layout.lumber),
        "scarf_aim": None if layout.scarf_aim is None else {
            "aimed": layout.scarf_aim.aimed, "board_feet": layout.scarf_aim.board_feet,
            "slack_first_board_feet": layout.scarf_aim.slack_first_board_feet,
            "lower_bound_board_feet": layout.scarf_aim.lower_bound_board_feet, "tried": layout.scarf_aim.tried},
    }


def _size(size: BoardSize) -> dict[str, Any]:
    return {"thickness_mm": size.thickness, "width_mm": size.width, "length_mm": size.length,
            "nominal_thickness_mm": size.nominal_thickness, "nominal_width_mm": size.nominal_width,
            "board_feet_each": size.board_feet}


def _stock(order: LumberOrder) -> dict[str, Any]:
    """Boards to buy (waste added) under the promised keys; the boards the layout uses and their cuts beside."""
    return {
        "boards": [dict(_size(c.size), count=c.count) for c in order.to_buy],
        "board_feet": order.to_buy_board_feet,
        "volume_m3": order.to_buy_volume_m3,
        "yield": order.yield_ratio,
        "waste": order.waste,
        "used": [dict(_size(c.size), count=c.count) for c in order.used],
        "used_board_feet": order.board_feet,
        "used_volume_m3": order.volume_m3,
        "lower_bound_board_feet": order.lower_bound_board_feet,
        "bound_is_lp": order.bound_is_lp,
        "proven_optimal": order.proven_optimal,
        "method": order.method,
        "stave_volume_mm3": order.stave_volume,
        "cutting": [{"board": b.id, **_size(b.size),
                     "rips": [{"offset_mm": r.offset, "width_mm": r.width,
                               "pieces": [{"label": c.piece.label, "offset_mm": c.offset, "length_mm": c.piece.length}
                                          for c in r.cuts]} for r in b.rips]} for b in order.boards],
        "notes": list(order.notes),
    }


def _router(r) -> dict[str, Any] | None:
    if r is None:
        return None
    return {"one_pass_flat": r.one_pass_flat, "wedge_angle_deg": r.wedge_angle, "wedge_high_side": r.wedge_high_side,
            "rides_on": str(r.on_table), "against_fence": str(r.on_fence), "bit_height_mm": r.bit_height,
            "fence_to_tip_mm": r.fence_to_tip, "least_bit_diameter_mm": r.least_bit_diameter,
            "edge_left_mm": r.edge_left}


def _pass(p) -> dict[str, Any]:
    return {"makes": p.makes, "face_angle_deg": p.face_angle, "on_table": str(p.on_table),
            "on_fence": str(p.on_fence), "tilt_deg": p.tilt, "lean": str(p.lean),
            "fence_distance_mm": p.fence_distance, "depth_along_blade_mm": p.depth_along_blade,
            "height_mm": p.height, "kerf_mm": p.kerf, "stave_side": str(p.stave_side), "through": p.through,
            "follows_blank_width": p.follows_blank_width, "table_contact_mm": p.table_contact,
            "fence_contact_mm": p.fence_contact}


def _settings(at: StationSettings) -> dict[str, Any]:
    c = at.settings
    return {
        "z_mm": at.z,
        "segment": at.segment,
        "stave_width_mm": at.section.stave_width,
        "blank_width_mm": c.blank.width,
        "thickness_mm": c.blank.thickness,
        "v_face_angles_deg": list(c.v_face_angles) if c.v_face_angles else None,
        "notch_depth_mm": c.notch_depth,
        "apex_height_mm": c.apex_height,
        "bevel_deg": c.bevel,
        "table_saw": [_pass(p) for p in c.saw],
        "router": _router(c.router),
    }


def _machining(m: Machining, fig: Figures) -> dict[str, Any]:
    """The promised keys at the widest station, both stations in full, every segment's blank, the steps."""
    widest = m.widest.settings
    return {
        "v_face_angles_deg": list(widest.v_face_angles) if widest.v_face_angles else None,
        "notch_depth_mm": widest.notch_depth,
        "apex_height_mm": widest.apex_height,
        "bevel_deg": widest.bevel,
        "notch_varies": m.notch_varies,
        "method": m.method,
        "stave_thickness_mm": m.stave_thickness,
        "kerf_mm": m.kerf,
        "widest": _settings(m.widest),
        "narrowest": _settings(m.narrowest),
        "segments": [{"label": s.label, "blank_width_mm": s.blank.width, "thickness_mm": s.blank.thickness,
                      "rough_width_mm": s.rough_width,
                      "fence_distance_mm": [p.fence_distance for p in s.settings.saw]} for s in m.segments],
        "per_station": [{"z_mm": p.z, "thickness_mm": p.thickness, "notch_depth_mm": p.notch_depth,
                         "apex_height_mm": p.apex_height, "router": _router(p.router)} for p in m.per_station],
        "steps": [{"step": k, "action": st.action, "text": step_words(fig, st),
                   "figures": {f.name: {"value": f.value, "kind": f.kind} for f in st.figures}}
                  for k, st in enumerate(m.steps, start=1)],
        "notes": list(m.notes),
    }


def _clean(value: Any) -> Any:
    """JSON has no NaN or infinity: write them as null; numpy scalars become plain numbers."""
    kind = type(value)  # the common kinds first: a long spar's document holds many thousand figures
    if kind is float:
        return value if math.isfinite(value) else None
    if kind is str or kind is int or kind is bool or value is None:
        return value
    if isinstance(value, np.generic):
        return _clean(value.item())
    if isinstance(value, dict):
        return {k: _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def to_json(design: Design) -> str:
    return json.dumps(_clean(document(design)), indent=2, ensure_ascii=False) + "\n"


def write_json(design: Design, path) -> None:
    """:func:`to_json` into the file at ``path``, the same bytes, written as it is encoded (a long spar's
    JSON is never held whole in memory)."""
    with open(path, "w", encoding="utf-8") as out:
        json.dump(_clean(document(design)), out, indent=2, ensure_ascii=False)
        out.write("\n")
