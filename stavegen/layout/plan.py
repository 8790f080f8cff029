"""The shop plan of a checked spar: stave shape, scarfs, segments, plugs, cutter settings, lumber."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..errors import InputError
from ..model.spar import Spar
from ..section.properties import Section
from ..stations.evaluate import SectionCache
from ..stations.grid import station_marks
from .plugs import PlugBlock, plug_blocks
from .scarfs import ScarfPlan, ScarfRules, place_scarfs, segment_bounds
from .segments import Segment, make_segment
from .staves import StavePlan, stave_plan


@dataclass(frozen=True)
class Layout:
    """Everything the shop needs, computed once; renderers draw from it."""

    plan: StavePlan
    scarfs: ScarfPlan
    staves: tuple[tuple[Segment, ...], ...]
    plugs: tuple[PlugBlock, ...]
    machining: Any = None
    lumber: Any = None
    widest_section: Section | None = None
    narrowest_section: Section | None = None

    @property
    def segments(self) -> list[Segment]:
        return [seg for stave in self.staves for seg in stave]


def scarf_rules(spar: Spar, plan: StavePlan) -> ScarfRules:
    stock = spar.stock
    thickest = max(st.thickness for st in plan.stations)
    return ScarfRules(
        length=stock.scarf_ratio * thickest,
        stagger=stock.scarf_stagger,
        no_scarf=stock.no_scarf,
        longest_piece=max(stock.lengths) - stock.kerf,
        slope_factor=plan.max_slope_factor(),
    )


def lay_out(spar: Spar, cache: SectionCache | None = None) -> Layout:
    """The shop plan for a resolved spar with a [stock] table."""
    if spar.stock is None:
        raise InputError("missing: build needs the boards the staves are ripped from "
                         "(thickness, widths, lengths)", "stock", spar.source)
    cache = cache or SectionCache(spar)
    marks = station_marks(spar)
    base = stave_plan(spar, marks, cache)
    rules = scarf_rules(spar, base)
    scarfs = place_scarfs(base.start, base.end, base.cut_length, spar.length, spar.hollow.staves, rules)
    bounds = [segment_bounds(base.start, base.end, centres, rules.length) for centres in scarfs.centres]
    ends = sorted({z for stave in bounds for a, b in stave for z in (a, b) if 0 <= z <= spar.length})
    centres = sorted({c for stave in scarfs.centres for c in stave})
    plan = stave_plan(spar, station_marks(spar, {"segment end": ends, "scarf": centres}), cache)
    staves = []
    for k, stave_bounds in enumerate(bounds, start=1):
        last = len(stave_bounds) - 1
        staves.append(tuple(
            make_segment(plan, k, i + 1, a, b, scarf_at_start=i > 0, scarf_at_end=i < last,
                         scarf_length=rules.length)
            for i, (a, b) in enumerate(stave_bounds)))
    # The finished sections at the widest and narrowest stave stations, for end views; a station in an
    # end allowance has the section of the end it runs past.
    def section_at(z: float) -> Section:
        return cache.at(min(max(z, 0.0), spar.length))

    return Layout(plan=plan, scarfs=scarfs, staves=tuple(staves), plugs=plug_blocks(spar, cache),
                  widest_section=section_at(plan.widest().z), narrowest_section=section_at(plan.narrowest().z))
