"""The shop plan of a checked spar: stave shape, scarfs, segments, plugs, cutter settings, lumber."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from ..errors import InputError
from ..model.spar import Spar
from ..section.properties import Section
from ..stations.evaluate import SectionCache
from ..stations.grid import station_marks
from .lumber import LumberOrder, Piece, order_lumber
from .operations import Machining, StationSettings, machining  # noqa: F401  (re-exported)
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
    machining: Machining
    lumber: LumberOrder

    @property
    def board_of(self) -> dict[str, str]:
        """Board id (e.g. "B3") of every segment label."""
        return {cut.piece.label: board.id for board in self.lumber.boards for rip in board.rips for cut in rip.cuts}

    @property
    def widest_section(self) -> Section:
        """The finished section where the stave is widest (for end views)."""
        return self.machining.widest.section

    @property
    def narrowest_section(self) -> Section:
        return self.machining.narrowest.section

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
        units=spar.units,
    )


def lay_out(spar: Spar, cache: SectionCache | None = None, step: Callable[[str], None] | None = None,
            lumber_budget: float = 5.0) -> Layout:
    """The shop plan for a resolved spar with a [stock] table.

    ``step``, if given, is told what is being worked out as it starts ("ordering lumber"); the lumber
    solve gets ``lumber_budget`` seconds.
    """
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
    staves = tuple(staves)
    if step is not None:
        step("working out the cutter settings")
    shop = machining(spar, plan, staves, cache)
    if step is not None:
        step("ordering lumber")
    rough = {s.label: s.rough_width for s in shop.segments}
    pieces = [Piece(label=seg.label, stave=seg.stave, segment=seg.index, length=seg.length,
                    width=rough[seg.label], volume=seg.volume) for stave in staves for seg in stave]
    lumber = order_lumber(pieces, spar.stock, units=spar.units, time_budget=lumber_budget)
    return Layout(plan=plan, scarfs=scarfs, staves=staves, plugs=plug_blocks(spar, cache),
                  machining=shop, lumber=lumber)
