"""How the staves are cut: one setting per segment blank, and the order of operations in the shop.

Every segment is made a parallel *blank* first: its widest finished width
plus the square edge's allowance, rounded up onto the builder's grid, and the
stave thickness. The notch (or a plain stave's first bevel) is cut into the
blank with settings fixed for the whole blank (:mod:`.machining`); then the
segments are scarfed into staves and the square edge (or edge 2's bevel) is
taken to the tapered line. With a tapered wall the notch is cut once, on
staves of the thickest wall, and the taper is the bore's (see
:func:`stavegen.stations.evaluate.hollow_section`); only when the file asks
the notch to follow the wall (``notch_cut = "follow-wall"``) does it change
along the stave, and then no fixed set-up cuts it: the figures are given
station by station for a CNC router, and the steps say so.

Figures in the steps are SI mm with a *kind* naming how they are rounded for
print (see :mod:`stavegen.render.figures`). Lengths mm, angles degrees.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..model.spar import Spar
from ..section.properties import Section
from ..units import Way, system
from .machining import Blank, CutterSettings, Lean, RouterSetup, SawPass, Side, cutter_settings, same_notch
from .segments import Segment
from .staves import StavePlan

STRAIGHT_EDGE = 0.1  # mm: a tapered edge within this of a straight line can ride a fence


@dataclass(frozen=True)
class SegmentSetup:
    """One segment's blank (mm), the rough width to rip it at, and the settings that cut its notch."""

    label: str
    blank: Blank
    rough_width: float
    settings: CutterSettings


@dataclass(frozen=True)
class StationSettings:
    """Cutter settings for the stave at one position z (mm from the heel), on the blank of ``segment``."""

    z: float
    section: Section
    settings: CutterSettings
    segment: str


@dataclass(frozen=True)
class StationNotch:
    """The notch at one station when it follows a tapered wall: for a CNC router with a 90° V-bit (mm)."""

    z: float
    thickness: float
    notch_depth: float
    apex_height: float
    router: RouterSetup


@dataclass(frozen=True)
class Figure:
    """A figure in a step: its ``name`` in the text, its value (mm, or degrees for an angle), how it is rounded."""

    name: str
    value: float
    kind: str  # "dress", "cut-length", "fence-nearer", "fence-farther", "blade", "angle", "describe", "at-least", ...


@dataclass(frozen=True)
class Step:
    """One operation in the shop: ``text`` with ``{name}`` where each figure goes."""

    action: str
    text: str
    figures: tuple[Figure, ...] = ()


@dataclass(frozen=True)
class Machining:
    """How the staves are cut: settings per segment, at the widest and narrowest stations, and the steps."""

    method: str  # "one setting" or "per station"
    stave_thickness: float | None
    kerf: float
    widest: StationSettings
    narrowest: StationSettings
    segments: tuple[SegmentSetup, ...]
    per_station: tuple[StationNotch, ...]
    steps: tuple[Step, ...]
    notes: tuple[str, ...]

    @property
    def notch_varies(self) -> bool:
        """Whether the notch changes along the stave (beyond roundoff): never with one setting."""
        return self.method == "per station"

    def setup_of(self, label: str) -> SegmentSetup:
        for s in self.segments:
            if s.label == label:
                return s
        raise KeyError(label)


def blank_for(spar: Spar, seg: Segment, thickness: float) -> tuple[Blank, float]:
    """The blank (its width rounded up onto the grid) and rough width (mm) of a segment ``thickness`` thick."""
    grid = system(spar.units)
    allowance = spar.stock.edge_allowance
    width = grid.on_grid(seg.widest + allowance, Way.UP)
    return Blank(width, thickness), grid.on_grid(width + allowance, Way.UP)


def _segment_holding(staves: tuple[tuple[Segment, ...], ...], z: float, stave: int = 1) -> Segment:
    """Stave ``stave``'s segment (stave 1's by default) that holds position z (mm from the heel)."""
    for seg in staves[stave - 1]:
        if seg.start <= z <= seg.end:
            return seg
    return staves[stave - 1][-1]


def _edge_bend(plan: StavePlan, seg: Segment) -> float:
    """How far (mm) the notched edge of a symmetric-taper segment strays from the straight line of its ends."""
    zs = [seg.start] + [st.z for st in plan.between(seg.start, seg.end)] + [seg.end]
    xs = np.array([plan.s_at(z) for z in zs])
    ys = np.array([plan.edges_at(z)[0] for z in zs])
    if xs[-1] - xs[0] <= 0:
        return 0.0
    chord = ys[0] + (ys[-1] - ys[0]) * (xs - xs[0]) / (xs[-1] - xs[0])
    return float(np.max(np.abs(ys - chord)))


def machining(spar: Spar, plan: StavePlan, staves: tuple[tuple[Segment, ...], ...], cache,
              plans: tuple[StavePlan, ...] = ()) -> Machining:
    """Settings for every segment's blank, at the widest and narrowest stations, and the order of operations.

    ``plans``, one for each kind of stave when the staves differ (an oval spar): the widest and narrowest
    stations are then the widest and narrowest of any stave, each on a stave of its kind.
    """
    kerf = spar.stock.kerf
    plans = plans or (plan,)
    from .staves import kind_of_stave

    def first_of_kind(kind: int) -> int:
        return next(k for k in range(1, len(staves) + 1) if kind_of_stave(spar, k) == kind)

    inside_of = [[st for st in p.stations if 0 <= st.z <= spar.length] for p in plans]
    widest_kind = max(range(len(plans)), key=lambda j: max(st.width for st in inside_of[j]))
    narrowest_kind = min(range(len(plans)), key=lambda j: min(st.width for st in inside_of[j]))
    inside = inside_of[0]
    widest_st = max(inside_of[widest_kind], key=lambda st: st.width)
    narrowest_st = min(inside_of[narrowest_kind], key=lambda st: st.width)
    extremes = ((widest_st, first_of_kind(widest_kind), widest_kind),
                (narrowest_st, first_of_kind(narrowest_kind), narrowest_kind))

    def section_at(z: float, kind: int):
        return cache.at(z).kind_section(kind)
    thicknesses = [st.thickness for st in plan.stations]
    one_setting = max(thicknesses) - min(thicknesses) <= 1e-9
    notes: list[str] = []
    segments: list[SegmentSetup] = []
    per_station: list[StationNotch] = []
    found: list[StationSettings] = []
    if one_setting:
        reference = section_at(widest_st.z, widest_kind)
        t = reference.thickness
        box = spar.hollow.is_box  # a box's faces and sides are cut differently (a face's rebates): by kind
        firsts: dict[int, CutterSettings] = {}
        # Blanks are on the grid, so segments share them: a kind's settings for one blank (following the
        # kind's first passes) are worked out once. The first blank's own search is kept apart.
        same: dict[tuple[int, Blank], CutterSettings] = {}
        for stave in staves:
            kind = kind_of_stave(spar, stave[0].stave) if box else widest_kind
            own = section_at(widest_st.z, kind) if box else reference
            for seg in stave:
                blank, rough = blank_for(spar, seg, t)
                first = firsts.get(kind)
                if first is None:
                    settings = cutter_settings(own, kerf, blank)
                    firsts[kind] = settings
                else:
                    settings = same.get((kind, blank))
                    if settings is None:
                        settings = same[(kind, blank)] = cutter_settings(own, kerf, blank, plan=first.saw)
                segments.append(SegmentSetup(seg.label, blank, rough, settings))
        for st, stave, kind in extremes:
            seg = _segment_holding(staves, st.z, stave)
            setup = next(s for s in segments if s.label == seg.label)
            section = section_at(st.z, kind)
            settings = cutter_settings(section, kerf, setup.blank, plan=setup.settings.saw)
            if not same_notch(settings, setup.settings):
                raise RuntimeError("one setting was chosen but the notch differs along the stave")
            found.append(StationSettings(st.z, section, settings, seg.label))
        method = "one setting"
    else:
        method = "per station"
        for stave in staves:
            for seg in stave:
                zs = [seg.start, seg.end] + [s.z for s in plan.between(seg.start, seg.end)]
                blank, rough = blank_for(spar, seg, max(plan.thickness_at(z) for z in zs))
                section = section_at(min(max(seg.start, 0.0), spar.length), kind_of_stave(spar, seg.stave))
                settings = cutter_settings(section, kerf, Blank(max(blank.width, section.stave_width),
                                                                section.thickness), saw=False)
                segments.append(SegmentSetup(seg.label, blank, rough, settings))
        for st in inside:
            section = section_at(st.z, 0)
            if section.notch is None:
                continue
            s = cutter_settings(section, kerf, saw=False)
            per_station.append(StationNotch(st.z, section.thickness, s.notch_depth, s.apex_height, s.router))
        for st, stave, kind in extremes:
            seg = _segment_holding(staves, st.z, stave)
            section = section_at(st.z, kind)
            found.append(StationSettings(st.z, section, cutter_settings(section, kerf, saw=False), seg.label))
        notes.append("The notch changes along the stave with the tapered wall (notch_cut = \"follow-wall\"): no fixed "
                     "table-saw or router-table set-up cuts it. Cut it on a CNC router with a 90° V-bit following "
                     "the figures station by station, or build it with notch_cut = \"thickest-wall\" (one setting, "
                     "on staves of the thickest wall) or with a constant wall.")
    if spar.hollow.taper == "symmetric":
        bent = [(seg.label, _edge_bend(plan, seg)) for stave in staves for seg in stave]
        worst = max(bent, key=lambda b: b[1])
        if worst[1] > STRAIGHT_EDGE:
            notes.append(f"With taper = \"symmetric\" the notched edge of segment {worst[0]} bends by "
                         f"{system(spar.units).said(worst[1], 'length')} at the stations inside it: no fence "
                         "follows it. Use taper = "
                         "\"square-edge\" (the notched edge straight) to cut the notch with one setting.")
    result = Machining(method=method, stave_thickness=found[0].section.thickness if one_setting else None,
                       kerf=kerf, widest=found[0], narrowest=found[1], segments=tuple(segments),
                       per_station=tuple(per_station), steps=(), notes=tuple(notes))
    return Machining(**{**result.__dict__, "steps": tuple(steps(spar, plan, result))})


# The order of operations -------------------------------------------------------------------------------


def _pass_step(k: int, p: SawPass, rest: str) -> Step:
    lean = "" if p.lean is Lean.UPRIGHT else f", top leaning {p.lean}"
    fence_kind = "fence-nearer" if p.leaves_wood_when_fence_is == "nearer" else "fence-farther"
    if p.follows_blank_width:
        fence = ("fence at each segment's own figure (cut list, pass "
                 f"{k} fence; {{fence}} on the widest blank)")
    else:
        fence = "fence {fence} to the blade's fence-side face at the table"
    text = (f"Table saw, pass {k}, the {p.makes}: {p.on_table} down on the table, {p.on_fence} against the fence; "
            f"blade {{tilt}} from vertical{lean}; {fence}; blade {{height}} high at its top "
            f"({{depth}} up its fence-side face), the {{kerf}} kerf in the waste{rest}.")
    return Step("saw pass", text, (
        Figure("tilt", p.tilt, "angle"), Figure("fence", p.fence_distance, fence_kind),
        Figure("height", p.height, "blade"), Figure("depth", p.depth_along_blade, "blade"),
        Figure("kerf", p.kerf, "describe")))


def steps(spar: Spar, plan: StavePlan, m: Machining) -> list[Step]:
    """The order of operations, rip to round."""
    h = spar.hollow
    if h.is_box:
        return box_steps(spar, plan, m)
    birdsmouth = h.joint.is_birdsmouth
    symmetric = h.taper == "symmetric"
    tapered_wall = not h.wall.is_constant
    first_edge = "notched edge" if birdsmouth else "edge 1"
    out = [Step("rip", "Rip each segment from its board where the cutting diagrams put it, at its rough width "
                       "(cut list).")]
    if m.method == "one setting":
        out.append(Step("thickness", "Plane every segment to {thickness} thick, faces flat and parallel.",
                        (Figure("thickness", m.stave_thickness, "dress"),)))
    else:
        out.append(Step("thickness", "Plane each segment to the stave thickness at every station (cut list and "
                                     "station table, thickest {thickness}): on a planer sled shimmed to the taper, "
                                     "or by hand to lines gauged on both edges.",
                        (Figure("thickness", max(st.thickness for st in plan.stations), "dress"),)))
    if symmetric:
        out.append(Step("edge", f"Taper the {first_edge} of each segment to its line from the full-size template, "
                                "straight and square: it is the edge the notch is set from."))
    else:
        out.append(Step("edge", f"Joint the {first_edge} of each segment straight and square to the faces: it is "
                                "the edge every setting is taken from."))
    out.append(Step("blank", f"Rip the other edge parallel, {first_edge} against the fence, each segment to its "
                             "blank width (cut list; {widest} for the widest), the kerf outside the blank.",
                    (Figure("widest", max(s.blank.width for s in m.segments), "dress"),)))
    saw = m.widest.settings.saw
    if m.method == "one setting" and saw:
        for k, p in enumerate(saw, start=1):
            rest = ": it frees the waste" if k == len(saw) and len(saw) > 1 else ""
            out.append(_pass_step(k, p, rest))
        r = m.widest.settings.router
        if r is not None:
            ride = "flat on the table" if r.one_pass_flat else (
                f"on a {r.wedge_angle:.2f}° wedge, its high side {r.wedge_high_side}")
            out.append(Step("router", "Or, instead of the saw passes, the router table with a 90° V-bit at least "
                                      "{diameter} across: the stave on its " + f"{r.on_table}, {r.on_fence} against "
                                      f"the fence, {ride}; " + "the bit's tip {bit} above the riding surface and "
                                      "{tip} from the fence; the whole V in one pass.",
                            (Figure("diameter", r.least_bit_diameter, "at-least"), Figure("bit", r.bit_height, "blade"),
                             Figure("tip", r.fence_to_tip, "describe"))))
    elif birdsmouth:
        out.append(Step("cnc", "Cut the notch on a CNC router with a 90° V-bit, the tip at the notch depth from the "
                               "notched edge and the apex height above the inner face at every station (the "
                               "station figures): no fixed table-saw or router-table set-up follows a notch that "
                               "changes along the stave."))
    if spar.stock.scarf_ratio and any(len(s) > 1 for s in plan_staves(m)):
        out.append(Step("scarf", "Cut the scarfs, {ratio}:1, each {length} long, and glue each stave's segments end "
                                 f"to end, the {first_edge}s on one straight line"
                                 + (" and the V's in line (a straight batten in the V)." if birdsmouth else "."),
                        (Figure("ratio", spar.stock.scarf_ratio, "number"),
                         Figure("length", spar.stock.scarf_ratio * max(st.thickness for st in plan.stations),
                                "cut-length"))))
    if birdsmouth:
        out.append(Step("taper", "Taper the square edge of each stave to its line: mark each station's width (cut "
                                 "list, full-size templates) across the outer face from the notched edge's outer "
                                 "corner, spring a batten through the marks, and cut square to the line on a taper "
                                 "sled, or saw off the waste and plane to the line."))
    else:
        out.append(Step("taper", "Bevel edge 2 of each stave to its line at {bevel} off square: mark each station's "
                                 "width across the outer face from edge 1's outer corner, spring a batten through "
                                 "the marks, and cut on a taper sled with the blade tilted, or plane to the line.",
                        (Figure("bevel", 180.0 / h.staves, "angle"),)))
    if tapered_wall and m.method == "one setting":
        out.append(Step("outer face", "The wall tapers in the bore, not in the staves: the staves stay {thickness} "
                                      "thick, and what stands over the wall comes off in rounding. To save "
                                      "rounding, plane the outer face down to the wall at each station first "
                                      "(station table); the notch is untouched and the joint closes as cut.",
                        (Figure("thickness", m.stave_thickness, "dress"),)))
    if h.two_axis:
        out.append(Step("places", "The staves are not all alike: each has its own width along the spar (cut list, "
                                  "templates). Mark every stave with its number, and lay it in its place round the "
                                  "oval as the report's section drawing numbers them (stave 1 athwartships, counter-"
                                  "clockwise looking from the heel); staves of the same width may change places."))
    out.append(Step("dry fit", "Dry-fit the staves round the plugs (plugs table) with bands or hose clamps; number "
                               "the staves and mark the stations across them."))
    if h.strips and any(strip.place == "inner-face" for strip in h.strips):
        out.append(Step("strips", "Lay the reinforcing tape along the middle of each stave's inner face and let it "
                                  "cure before the glue-up (sheathing and reinforcement table)."))
    out += groove_steps(spar, plan)
    out.append(Step("glue", "Glue up, following the glue maker's instructions; check the spar straight before the "
                            "glue sets."))
    if h.layers:
        out.append(Step("round", f"Plane the {h.staves}-sided spar to {2 * h.staves} sides, then {4 * h.staves}, "
                                 "then round, to the wood's diameter at each station: the finished diameter less "
                                 "twice the sheathing (JSON wood_od_mm; the section figure)."))
        out.append(Step("sheathe", "Sheathe the spar in the cloth, ply by ply, as the sheathing table gives it, "
                                   "following the resin maker's instructions."))
        return out
    out.append(Step("round", f"Plane the {h.staves}-sided spar to {2 * h.staves} sides, then {4 * h.staves}, then "
                             "round, to the finished diameter at each station (station table)."))
    return out


def box_steps(spar: Spar, plan: StavePlan, m: Machining) -> list[Step]:
    """The order of operations for a box spar: rip and plane the pieces, a face's rebates on the table saw (the
    passes read off the blank, :mod:`.machining`), taper, glue, plane the outside, round the corners."""
    h = spar.hollow
    rebated = h.corner == "rebated"  # both edges of a face
    pinwheel = h.corner == "pinwheel"  # edge 1 of every piece
    out = [Step("rip", "Rip each segment from its board where the cutting diagrams put it, at its rough width "
                       "(cut list)."),
           Step("thickness", "Plane every segment to {thickness} thick, faces flat and parallel.",
                (Figure("thickness", max(st.thickness for st in plan.stations), "dress"),)),
           Step("edge", "Joint edge 1 of each segment straight and square to the faces: the taper comes off edge 2.")]
    faces = [s for s in m.segments if s.settings.saw]
    if (rebated or pinwheel) and faces:
        which = "every segment" if pinwheel else "each face segment (staves 2 and 4)"
        out.append(Step("blank", f"Rip edge 2 of {which} parallel to edge 1, each to its blank width (cut list; "
                                 "{widest} for the widest), the kerf outside the blank.",
                        (Figure("widest", max(s.blank.width for s in faces), "dress"),)))
        saw = faces[0].settings.saw
        for k, p in enumerate(saw, start=1):
            rest = ": it frees the waste" if k == len(saw) else ""
            step = _pass_step(k, p, rest)
            lead = "Every piece" if pinwheel else "Faces only"
            out.append(Step(step.action, f"{lead}, the rebate along edge 1. " + step.text, step.figures))
    if spar.stock.scarf_ratio and any(len(s) > 1 for s in plan_staves(m)):
        out.append(Step("scarf", "Cut the scarfs, {ratio}:1, each {length} long, and glue each piece's segments end "
                                 "to end, the edge 1s on one straight line.",
                        (Figure("ratio", spar.stock.scarf_ratio, "number"),
                         Figure("length", spar.stock.scarf_ratio * max(st.thickness for st in plan.stations),
                                "cut-length"))))
    out.append(Step("taper", "Taper edge 2 of each piece to its line: mark each station's width (cut list, full-size "
                             "templates) across the face from edge 1, spring a batten through the marks, and cut "
                             "square to the line on a taper sled, or saw off the waste and plane to the line."))
    if rebated and faces:
        out.append(Step("rebate", "Cut the rebate along each face's tapered edge 2 with the same two set-ups, edge 2 "
                                  "where edge 1 was (against the fence, then down on the table): the passes are "
                                  "set from the edge they rebate, so the rebate follows the taper."))
    wide = "" if pinwheel else ", as wide as the spar athwartships"
    out.append(Step("places", f"The faces (staves 2 and 4: fore and aft{wide}) and the "
                              "sides (staves 1 and 3: port and starboard) differ: mark every piece with its number "
                              "and lay it in its place as the report's section drawing shows"
                              + (", each side's edges in the faces' rebates." if rebated
                                 else ", each piece's edge 2 in the next piece's rebate, round the section "
                                      "(counter-clockwise looking from the heel)." if pinwheel
                                 else ", the sides' edges between the faces.")))
    out.append(Step("dry fit", "Dry-fit the four pieces round the plugs (plugs table) with clamps, the box square; "
                               "mark the stations across them."))
    out.append(Step("glue", "Glue up, following the glue maker's instructions; check the spar straight and square "
                            "before the glue sets."))
    tapered = "" if h.wall.is_constant else (
        ", and where the wall is thinner than the pieces (a tapered wall is the bore's) what stands over it")
    out.append(Step("plane", "Plane the outside flat and the corners square to the finished dimensions at each "
                             "station (station table): the planing allowance, {allowance} a side, comes off"
                             + tapered + ".",
                    (Figure("allowance", h.planing_allowance, "describe"),)))
    if h.corner_radius > 0:
        out.append(Step("round", "Round the four outside corners to a {radius} radius (a round-over bit or a "
                                 "corner template), the whole length.",
                        (Figure("radius", h.corner_radius, "describe"),)))
    return out


def groove_steps(spar: Spar, plan: StavePlan) -> list[Step]:
    """One step for each strip let into a groove: the bit's width and depth as figures, and how it is centred.

    The groove lies on the stave's middle (half the face's width from the notched edge for a flush birdsmouth
    or a bevel), whose distance from either edge changes along the taper: no fence set once follows it. Its
    depth below the outer face is the model's at each station (:func:`stavegen.layout.staves.grooves_at`).
    """
    out = []
    for k, strip in enumerate(spar.hollow.strips, start=1):
        if strip.place != "groove":
            continue
        depths = [g.depth for st in plan.stations for g in st.grooves if g.strip == k]
        if not depths:
            continue
        shallow, deep = min(depths), max(depths)
        ranged = system(spar.units).on_grid(deep, Way.UP) != system(spar.units).on_grid(shallow, Way.UP)
        depth_words = "{shallow} to {deep} deep (the depth at each mark on the templates)" if ranged else "{deep} deep"
        figures = (Figure("width", strip.width, "at-least"),) + (
            (Figure("shallow", shallow, "groove-depth"),) if ranged else ()) + (Figure("deep", deep, "groove-depth"),)
        out.append(Step("grooves", f"Rout the groove for strip {k} along each stave's outer face after the taper is "
                                   "cut and before the glue-up: a straight bit (or a dado set) {width} wide, "
                                   f"{depth_words} below the outer face as dressed, over the range drawn on the "
                                   "templates. Centre it on the stave's middle at every station, half the face's width "
                                   "from the notched edge on a flush birdsmouth or a bevel: the face narrows along the "
                                   "taper, so no fence set once follows it; guide the router off a batten sprung "
                                   "through the groove's edge line on the templates (or, where it is centred on the "
                                   "face, a base with two pins riding both edges). Lay the tape in it and let it cure "
                                   "(sheathing and reinforcement table).", figures))
    return out


def plan_staves(m: Machining) -> list[list[str]]:
    """Segment labels stave by stave (``S1-1`` … ), from the setups."""
    staves: dict[str, list[str]] = {}
    for s in m.segments:
        staves.setdefault(s.label.split("-")[0], []).append(s.label)
    return list(staves.values())


__all__ = ["Figure", "Machining", "SegmentSetup", "StationNotch", "StationSettings", "Step", "blank_for",
           "machining", "steps", "Side"]
