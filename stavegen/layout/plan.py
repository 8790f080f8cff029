"""The shop plan of a checked spar: stave shape, scarfs, segments, plugs, cutter settings, lumber."""

from __future__ import annotations

from dataclasses import dataclass, replace
from functools import cached_property
from types import SimpleNamespace
from typing import Callable

from ..errors import InputError
from ..model.spar import Spar
from ..section.properties import Section
from ..stations.evaluate import SectionCache
from ..stations.grid import station_marks
from .lumber import LumberOrder, Piece, order_lumber
from .operations import Machining, StationSettings, blank_for, machining  # noqa: F401  (re-exported)
from .parting import JointLayout, PartSpan, joint_layout
from .plugs import PlugBlock, plug_blocks
from .scarfs import ScarfAim, ScarfPlan, ScarfRules, aim_scarfs, segment_bounds
from .sheathing import ClothItem, cloth_and_resin
from .segments import Segment, make_segment
from .staves import StavePlan, StaveStation, kind_count, kind_of_stave, stave_plan
from .end_views import EndView, end_views
from .templates import Template, make_templates


@dataclass(frozen=True)
class Layout:
    """Everything the shop needs, computed once; renderers draw from it."""

    plan: StavePlan
    scarfs: ScarfPlan
    staves: tuple[tuple[Segment, ...], ...]
    plugs: tuple[PlugBlock, ...]
    machining: Machining
    lumber: LumberOrder
    scarf_aim: ScarfAim | None = None  # board feet with the slack-first scarfs and with the chosen ones
    sheathing: tuple[ClothItem, ...] = ()  # cloth, tape and resin for the layers and strips
    joints: tuple[JointLayout, ...] = ()  # a two-piece spar's joint: its parts, spigot, plugs, order of assembly
    plans: tuple[StavePlan, ...] = ()
    """One plan for each kind of stave (an oval spar's staves differ); empty: ``plan`` serves every stave."""
    kinds: tuple[int, ...] = ()
    """The kind of each stave (index 0 = stave 1), into ``plans``."""
    box_corner: str | None = None
    """A box spar's corner joint (hollow.corner): its pieces' edges are square, a rebated face's rebated."""

    def plan_for(self, stave: int) -> StavePlan:
        """The plan of stave number ``stave`` (from 1)."""
        if not self.plans:
            return self.plan
        return self.plans[self.kinds[stave - 1]]

    @property
    def distinct(self) -> bool:
        """True when the staves are not all the same (an oval spar)."""
        return len(self.plans) > 1

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

    @cached_property
    def templates(self) -> tuple[Template, ...]:
        """Every piece's template (identical pieces share one): what the DXF and the full-size PDF draw."""
        box = None
        if self.box_corner is not None:  # kind 1 the faces (rebated or not), kind 0 the sides
            face = "rebated face" if self.box_corner == "rebated" else "face"
            side = "side"
            if self.box_corner == "pinwheel":  # every piece rebated along edge 1 only
                face, side = "face rebated on edge 1", "side rebated on edge 1"
            box = {k: (face if kind == 1 else side) for k, kind in enumerate(self.kinds, start=1)}
        return make_templates(self.staves, self.scarfs.centres, self.plan.taper,
                              notched=self.plan.stations[0].notch_depth is not None, plan_for=self.plan_for,
                              box=box)

    @cached_property
    def end_views(self) -> tuple[EndView, ...]:
        """The end views at 1:1 (stave ends, assembled sections, plug ends, a joint's): the DXF and the full-size
        PDF draw these (:mod:`stavegen.layout.end_views`)."""
        return end_views(self)

    @cached_property
    def template_of(self) -> dict[str, Template]:
        """The template of every segment, by its label."""
        return {label: t for t in self.templates for label in t.labels}


def scarf_rules(spar: Spar, plan: StavePlan, keep_clear: tuple[tuple[float, float], ...] = ()) -> ScarfRules:
    """The scarfs' rules from the stock; ``keep_clear`` adds ranges no scarf may touch (a joint's overlap)."""
    stock = spar.stock
    thickest = max(st.thickness for st in plan.stations)
    return ScarfRules(
        length=stock.scarf_ratio * thickest,
        stagger=stock.scarf_stagger,
        no_scarf=tuple(sorted(stock.no_scarf + keep_clear)),
        longest_piece=max(stock.lengths) - stock.kerf,
        slope_factor=plan.max_slope_factor(),
        units=spar.units,
    )


def lay_out(spar: Spar, cache: SectionCache | None = None, step: Callable[[str], None] | None = None) -> Layout:
    """The shop plan for a resolved spar with a [stock] table.

    ``step``, if given, is told what is being worked out as it starts ("ordering lumber"). The scarfs are
    aimed at the boards (:func:`~stavegen.layout.scarfs.aim_scarfs`); every solve stops on work limits, so the
    plan depends on the spar alone.
    """
    if spar.stock is None:
        raise InputError("missing: build needs the boards the staves are ripped from "
                         "(thickness, widths, lengths)", "stock", spar.source)
    cache = cache or SectionCache(spar)
    marks = station_marks(spar)
    bases = tuple(stave_plan(spar, marks, cache, kind) for kind in range(kind_count(spar)))
    base = max(bases, key=lambda p: p.widest().width)  # scarfs aimed on the widest stave's plan
    if spar.parting is not None:
        return _two_parts(spar, cache, base, step)
    rules = scarf_rules(spar, base)
    if len(bases) > 1:
        rules = replace(rules, slope_factor=max(p.max_slope_factor() for p in bases))
    if step is not None:
        step("placing the scarfs for the boards")
    solved: dict = {}  # cutting problems solved while aiming, reused when the cut segments pose the same one
    choice = aim_scarfs(base, spar.length, spar.hollow.staves, rules, spar.stock, rough=_rough_width(spar),
                        solved=solved)
    for scarfs in dict.fromkeys((choice.plan, choice.slack_first)):
        plans, staves, shop, lumber = cut_and_order(spar, cache, base, scarfs, rules, step, solved=solved)
        plan = plans[0]
        # the aimed scarfs were measured on the plan before its segments were cut: should the cut segments need
        # more than measured, the slack-first scarfs are laid out instead
        if choice.aim is None or lumber.board_feet <= choice.aim.board_feet + 1e-6 or scarfs is choice.slack_first:
            break
    kinds = tuple(kind_of_stave(spar, k) for k in range(1, spar.hollow.staves + 1))
    return Layout(plan=plan, scarfs=scarfs, staves=staves, plugs=plug_blocks(spar, cache), machining=shop,
                  lumber=lumber, scarf_aim=choice.aim if scarfs is choice.plan else None,
                  plans=plans if len(plans) > 1 else (), kinds=kinds if len(plans) > 1 else (),
                  box_corner=spar.hollow.corner if spar.hollow.is_box else None,
                  sheathing=cloth_and_resin(spar, cache))


def cut_and_order(spar: Spar, cache: SectionCache, base: StavePlan, scarfs: ScarfPlan, rules: ScarfRules,
                  step: Callable[[str], None] | None = None, parts: tuple[PartSpan, ...] = (),
                  extra: tuple[Piece, ...] = (), solved: dict | None = None):
    """The segments of ``scarfs``, their cutter settings and the boards they are cut from:
    (stave plans, one for each kind of stave, staves, machining, lumber order). ``parts``: a two-piece spar's
    parts, each cut on its own; ``extra``: further pieces from the same boards (a wooden spigot's layers);
    ``solved``: cutting problems the layout has solved already (lumber.order_lumber)."""
    plans, staves = _segments(spar, cache, base, scarfs, rules, parts)
    if step is not None:
        step("working out the cutter settings")
    shop = machining(spar, plans[0], staves, cache, plans)
    if step is not None:
        step("ordering lumber")
    rough = {s.label: s.rough_width for s in shop.segments}
    pieces = [Piece(label=seg.label, stave=seg.stave, segment=seg.index, length=seg.length,
                    width=rough[seg.label], volume=seg.volume) for stave in staves for seg in stave]
    return plans, staves, shop, order_lumber(pieces + list(extra), spar.stock, units=spar.units, solved=solved)


def part_plan(base: StavePlan, start: float, end: float) -> StavePlan:
    """The stave plan of one part of a two-piece spar: ``base`` cut to run from z = start to end (mm)."""
    def at(z: float, reasons: tuple[str, ...]) -> StaveStation:
        near = min(base.stations, key=lambda st: abs(st.z - z))
        width = base.width_at(z)
        return StaveStation(z=z, s=base.s_at(z), width=width, rough_width=width + 2 * base.edge_allowance,
                            thickness=base.thickness_at(z), notch_depth=near.notch_depth,
                            apex_height=near.apex_height, reasons=reasons)
    inner = tuple(base.between(start, end))
    return replace(base, stations=(at(start, ("part end",)),) + inner + (at(end, ("part end",)),))


def _two_parts(spar: Spar, cache: SectionCache, base: StavePlan, step: Callable[[str], None] | None) -> Layout:
    """The shop plan of a two-piece spar: each part's scarfs placed on its own, clear of the joint; the spigot's
    layers ordered with the staves; the joint's plugs after the file's."""
    from ..checks.parting import check_joints

    check = check_joints(spar, cache)[0]
    joint = joint_layout(spar, check, cache, first_plug=len(spar.hollow.plugs) + 1)
    rules = scarf_rules(spar, base, (joint.keep_clear,))
    if step is not None:
        step("placing the scarfs of each part for the boards")
    staves = spar.hollow.staves
    rough = _rough_width(spar)
    chosen = [aim_scarfs(part_plan(base, p.start, p.end), spar.length, staves, rules, spar.stock, rough=rough).plan
              for p in joint.parts]
    scarfs = ScarfPlan(centres=tuple(tuple(c for plan in chosen for c in plan.centres[k]) for k in range(staves)),
                       phases=chosen[0].phases, length=rules.length)
    plans, cut, shop, lumber = cut_and_order(spar, cache, base, scarfs, rules, step, joint.parts,
                                             _spigot_pieces(spar, joint))
    return Layout(plan=plans[0], scarfs=scarfs, staves=cut, plugs=plug_blocks(spar, cache) + joint.plugs,
                  machining=shop, lumber=lumber, scarf_aim=None, joints=(joint,))


def _spigot_pieces(spar: Spar, joint: JointLayout) -> tuple[Piece, ...]:
    """A wooden spigot's layers, each ripped as one piece, or as strips side by side when no board is wide enough."""
    blank = joint.spigot
    if blank is None:
        return ()
    widest = max(spar.stock.widths)
    edge = spar.stock.edge_allowance
    strips = max(1, -int(-blank.piece_width // widest))
    width = (blank.piece_width - 2 * edge) / strips + 2 * edge
    volume = blank.volume / (blank.layers * strips)
    return tuple(Piece(label=label if strips == 1 else f"{label}{chr(ord('a') + k)}", stave=0, segment=i,
                       length=blank.piece_length, width=width, volume=volume)
                 for i, label in enumerate(blank.labels, start=1) for k in range(strips))


def _rough_width(spar: Spar) -> Callable[[float], float]:
    """The rip width of a segment from its widest finished width (mm), as the machining's blank has it."""
    return lambda widest: blank_for(spar, SimpleNamespace(widest=widest), 0.0)[1]


def _segments(spar: Spar, cache: SectionCache, base: StavePlan, scarfs: ScarfPlan, rules: ScarfRules,
              parts: tuple[PartSpan, ...] = ()) -> tuple[tuple[StavePlan, ...], list[tuple[Segment, ...]]]:
    """The stave plans (one for each kind of stave) with stations at every segment end and scarf, and each
    stave's segments, cut from its own kind's plan (each part's numbered from 1 and lettered with its part, for a
    two-piece spar)."""
    spans = [(p.letter, p.start, p.end) for p in parts] or [("", base.start, base.end)]
    bounds = [[(letter, segment_bounds(a, b, [c for c in centres if a < c < b], rules.length))
               for letter, a, b in spans] for centres in scarfs.centres]
    ends = sorted({z for stave in bounds for _, part in stave for a, b in part for z in (a, b) if 0 <= z <= spar.length})
    centres = sorted({c for stave in scarfs.centres for c in stave})
    marks = station_marks(spar, {"segment end": ends, "scarf": centres})
    plans = tuple(stave_plan(spar, marks, cache, kind) for kind in range(kind_count(spar)))
    staves = []
    for k, stave_bounds in enumerate(bounds, start=1):
        segs = []
        plan = plans[kind_of_stave(spar, k)]
        for letter, part in stave_bounds:
            last = len(part) - 1
            segs += [make_segment(plan, k, i + 1, a, b, scarf_at_start=i > 0, scarf_at_end=i < last,
                                  scarf_length=rules.length, part=letter)
                     for i, (a, b) in enumerate(part)]
        staves.append(tuple(segs))
    return plans, tuple(staves)
