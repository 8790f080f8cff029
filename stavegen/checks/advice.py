"""Warnings a builder should see: geometry that is legal but poor, and settings outside common practice."""

from __future__ import annotations

from ..stations.evaluate import where
from ..units import Way, format_length, system
from .assess import REFERENCE_BEND, Assessment

# Common practice (no source): scarf slope at least 8:1; end allowance 2 to 4 in per stave end.
MIN_SCARF_RATIO = 8.0
END_ALLOWANCE_RANGE_MM = (50.8, 101.6)
# Beam theory (small deflections): the linear head deflection means little past about a tenth of the length.
LINEAR_DEFLECTION_LIMIT = 0.1


def warnings_for(result: Assessment) -> list[str]:
    """Plain sentences, worst first; empty when nothing needs saying."""
    spar = result.spar
    hollow = spar.hollow
    out: list[str] = []
    voided = [c for c in result.stations if c.station.section.void_area > 0]
    if voided:
        worst = max(voided, key=lambda c: c.station.section.void_area)
        out.append(
            f"The {hollow.joint.kind} notch leaves open voids inside the round "
            f"({system(spar.units).area(worst.station.section.void_area)} at {where(spar, worst.station.z)}): the "
            "square edge "
            "does not fill the V. The flush birdsmouth closes with none; consider joint = \"birdsmouth-flush\".")
    if hollow.min_corner_wall is not None:
        thin = min(result.stations, key=lambda c: c.station.section.least_wall)
        wall = thin.station.section.least_wall
        if wall < hollow.min_corner_wall:
            over = ("the notch's voids" if thin.station.section.hollow_reach > thin.station.section.bore_corner_radius
                    else "the bore's corners")
            out.append(f"After rounding, the wall over {over} is {format_length(wall, spar.units, way=Way.DOWN)} "
                       f"at {where(spar, thin.station.z)}, below the minimum you set "
                       f"({format_length(hollow.min_corner_wall, spar.units)}).")
    if spar.stock is not None and spar.stock.scarf_ratio < MIN_SCARF_RATIO:
        out.append(f"Scarf ratio {spar.stock.scarf_ratio:g}:1 is steeper than the 8:1 least slope of common "
                   "practice for spars; 10:1 to 12:1 is better.")
    low, high = END_ALLOWANCE_RANGE_MM
    if not low <= hollow.end_allowance <= high:
        out.append(f"End allowance {format_length(hollow.end_allowance, spar.units)} per stave end is outside "
                   "the 2 to 4 in of common practice.")
    if hollow.lamination_factor > 1.0:
        out.append(f"A lamination factor of {hollow.lamination_factor:g} credits the staves with more stiffness "
                   "than their wood has; 1.0 takes no credit.")
    bent = result.plan.tip_deflection / spar.length
    if bent > LINEAR_DEFLECTION_LIMIT:
        unit = system(spar.units)
        out.append(f"The head load ({unit.force(result.head_load)}, spar.head_load) bends the plan's spar "
                   f"{unit.length(result.plan.tip_deflection)} at the head, {100 * bent:.0f} % of its length: far "
                   "outside the small deflections the figure is worked for. The hollow / plan ratios and the head "
                   f"stiffness still hold; for readable deflections name a smaller spar.head_load (about "
                   f"{unit.force(result.head_load * REFERENCE_BEND / bent)} bends the plan's head "
                   f"{100 * REFERENCE_BEND:.0f} % of its length), or leave it out for that reference load.")
    for joint in result.joints:
        out += joint.warnings()
    return out
