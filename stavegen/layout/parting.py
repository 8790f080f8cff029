"""The shop side of a two-piece spar: its two parts, where no scarf may fall, the spigot, the joint's plugs.

Each part is glued up as a spar of its own: its staves run from its end of the spar to the parting, plus
the end allowance there (trimmed square after glue-up, as at the heel and head). No scarf may fall
within the overlap or within one spar diameter of its ends (common practice, no source: a scarf is a
change of stiffness, and the overlap is where the joint's bearing forces act), so the joint's range
joins the file's no-scarf ranges for both parts.

A wooden spigot is the bore's polygon less the clearance all round, tapering with the bore from the
glued end (``at − overlap``) to the tip (``at + overlap``); it is glued up from layers of the staves'
boards and goes into the lumber order. A tube or a sleeve is bought: its length is listed, and the plugs
bored for it (tube) or under it (sleeve) are laid out. The wooden spigot's tip bears on a plug in the head
part, one spar diameter long.

Positions z in mm from the heel.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..checks.parting import JointCheck
from ..model.spar import Plug, Spar
from ..section.properties import bore_ring
from ..stations.evaluate import SectionCache
from .plugs import PlugBlock, plug_blocks

LOWER, UPPER = "L", "U"
PART_NAMES = {LOWER: "lower part (heel to the parting)", UPPER: "upper part (the parting to the head)"}
SPIGOT_LABEL = "SP"


@dataclass(frozen=True)
class PartSpan:
    """One part of a two-piece spar: its letter, the z its staves run over (allowances in) and its finished ends."""

    letter: str
    start: float
    end: float
    finished: tuple[float, float]

    @property
    def name(self) -> str:
        return PART_NAMES[self.letter]


@dataclass(frozen=True)
class SpigotBlank:
    """A wooden spigot: its outlines (mm about the axis) at the glued end, the butt and the tip; the blank it is
    shaped from, glued up of ``layers`` pieces of the staves' boards, each ``piece_length`` × ``piece_width``."""

    glued_end: tuple[tuple[float, float], ...]
    butt: tuple[tuple[float, float], ...]
    tip: tuple[tuple[float, float], ...]
    bore_at_butt: tuple[tuple[float, float], ...]
    bore_at_tip: tuple[tuple[float, float], ...]
    across_flats: tuple[float, float, float]  # glued end, butt, tip
    length: float
    layers: int
    layer_thickness: float
    piece_length: float
    piece_width: float
    volume: float

    @property
    def labels(self) -> tuple[str, ...]:
        return tuple(f"{SPIGOT_LABEL}-{k}" for k in range(1, self.layers + 1))


@dataclass(frozen=True)
class JointLayout:
    """The shop plan of the joint: the parts, the range kept clear of scarfs, the spigot, the plugs, the order
    of assembly (each step a sentence with ``{name}`` figures in mm, worded by the renderers)."""

    check: JointCheck
    parts: tuple[PartSpan, PartSpan]
    keep_clear: tuple[float, float]
    spigot: SpigotBlank | None
    bought_length: float | None  # a tube or a sleeve: the length to buy (mm); None for a wooden spigot
    plugs: tuple[PlugBlock, ...]
    steps: tuple[tuple[str, dict[str, float]], ...]
    profile: tuple[tuple[float, float, float], ...] = ()
    """(z, finished radius, half the bore across its flats), mm, from one diameter before the overlap to one past
    it, at its ends and every change of taper: for drawing the joint."""


def part_spans(spar: Spar, check: JointCheck) -> tuple[PartSpan, PartSpan]:
    e = spar.hollow.end_allowance
    at = check.at
    return (PartSpan(LOWER, -e, at + e, (0.0, at)), PartSpan(UPPER, at - e, spar.length + e, (at, spar.length)))


def keep_clear(check: JointCheck) -> tuple[float, float]:
    """The range no scarf may touch: the overlap both ways and one spar diameter past each end of it."""
    return check.at - check.overlap - check.spar_diameter, check.at + check.overlap + check.spar_diameter


def _spigot(spar: Spar, check: JointCheck, cache: SectionCache) -> SpigotBlank:
    n, c = spar.hollow.staves, check.clearance
    lo, at, hi = check.at - check.overlap, check.at, check.at + check.overlap
    flats = tuple(2 * (cache.at(z).inner_apothem - c) for z in (lo, at, hi))
    rings = tuple(tuple(bore_ring(n, f / 2)) for f in flats)
    bores = tuple(tuple(bore_ring(n, cache.at(z).inner_apothem)) for z in (at, hi))
    # The blank covers the widest outline (at the glued end, where the bore is largest) both ways.
    widest = max(flats)
    side = max(max(x for x, _ in ring) - min(x for x, _ in ring) for ring in rings)
    side = max(side, max(max(y for _, y in ring) - min(y for _, y in ring) for ring in rings), widest)
    stock = spar.stock
    layers = max(1, math.ceil(side / stock.thickness - 1e-9))
    # Volume of the tapered polygon: Simpson's rule on its area, exact for a linear taper.
    knots = sorted({lo, hi, at} | {z for z in spar.hollow.diameter.z if lo < z < hi})
    volume = 0.0
    for a, b in zip(knots, knots[1:]):
        areas = [_ngon_area(n, cache.at(z).inner_apothem - c) for z in (a, (a + b) / 2, b)]
        volume += (b - a) / 6 * (areas[0] + 4 * areas[1] + areas[2])
    length = hi - lo
    return SpigotBlank(glued_end=rings[0], butt=rings[1], tip=rings[2], bore_at_butt=bores[0], bore_at_tip=bores[1],
                       across_flats=flats, length=length, layers=layers, layer_thickness=stock.thickness,
                       piece_length=length + 2 * spar.hollow.end_allowance,
                       piece_width=side + 2 * stock.edge_allowance, volume=volume)


def _ngon_area(n: int, apothem: float) -> float:
    return n * apothem**2 * math.tan(math.pi / n)


def _joint_plugs(spar: Spar, check: JointCheck) -> tuple[Plug, ...]:
    wood = spar.hollow.wood
    at, length = check.at, check.overlap
    if check.kind == "wood-spigot":
        tip = at + length
        plugs = (Plug(tip, min(tip + check.spar_diameter, spar.length), wood),)
    else:
        plugs = (Plug(at - length, at, wood), Plug(at, at + length, wood))
    # a plug the file already has in the same place serves
    return tuple(p for p in plugs if not any(q.start < p.end and q.end > p.start for q in spar.hollow.plugs))


def _steps(spar: Spar, check: JointCheck, spigot: SpigotBlank | None,
           plugs: tuple[PlugBlock, ...]) -> tuple[tuple[str, dict[str, float]], ...]:
    at, length, c = check.at, check.overlap, check.clearance
    lo, hi = at - length, at + length
    steps: list[tuple[str, dict[str, float]]] = [
        ("Glue up each part's staves on its own: the lower part from the heel to {at} plus the end allowance, the "
         "upper part from {at} less the end allowance to the head. Keep the parting mark on both.", {"at": at}),
    ]
    for block in plugs:
        steps.append((f"Glue plug {block.index} into the "
                      + ("lower" if block.plug.end <= at else "upper")
                      + " part's staves from {a} to {b} before closing them"
                      + (" (the spigot's tip bears on it)." if check.kind == "wood-spigot" else
                         " (it is bored for the tube later)." if check.kind == "tube-spigot" else
                         " (it carries the sleeve's bearing)."),
                      {"a": block.plug.start, "b": block.plug.end}))
    steps.append(("Trim both parts square at the parting mark ({at}), the lower part's end and the upper part's "
                  "mouth.", {"at": at}))
    if check.kind == "wood-spigot" and spigot is not None:
        steps += [
            ("Glue up the spigot blank from {layers_n} layers of the staves' boards, each {piece} long.",
             {"layers_n": float(spigot.layers), "piece": spigot.piece_length}),
            ("Plane it to the bore's polygon less the clearance: {glued} across the flats at its glued end, {butt} "
             "at the butt, {tip} at the tip, {length} long; check it against the spigot templates.",
             {"glued": spigot.across_flats[0], "butt": spigot.across_flats[1], "tip": spigot.across_flats[2],
              "length": spigot.length}),
            ("Dry fit: the upper part slides over the spigot to the parting mark; check the bore with the bore-fit "
             "templates ({clearance} clearance all round).", {"clearance": c}),
            ("Glue the spigot into the lower part from {lo} to {at}, square to the butt; wax the half that slides.",
             {"lo": lo, "at": at}),
        ]
    elif check.kind == "tube-spigot":
        steps += [
            ("Bore both plugs on the spar's axis for the tube ({od} across): a glue fit in the lower part, "
             "{clearance} clearance all round in the upper part, {length} deep each.",
             {"od": check.spigot.outside, "clearance": c, "length": length}),
            ("Cut the tube {total} long, glue it into the lower part up to the parting mark and dry fit the upper "
             "part over it.", {"total": 2 * length}),
        ]
    else:
        steps += [
            ("Round both parts to {d} for {length} each side of the parting and cut the sleeve {total} long.",
             {"d": check.spar_diameter, "length": length, "total": 2 * length}),
            ("Glue the sleeve over the lower part from {lo} to {at}; the upper part slides into it.",
             {"lo": lo, "at": at}),
        ]
    steps.append(("Mark both parts across the parting so they go together the same way every time, and shape, "
                  "round and finish them as one spar.", {}))
    return tuple(steps)


def _profile(spar: Spar, check: JointCheck, cache: SectionCache) -> tuple[tuple[float, float, float], ...]:
    lo = max(0.0, check.at - check.overlap - check.spar_diameter)
    hi = min(spar.length, check.at + check.overlap + check.spar_diameter)
    knots = {lo, hi, check.at, check.at - check.overlap, check.at + check.overlap}
    knots |= {z for z in spar.hollow.diameter.z if lo < z < hi} | {z for z in spar.hollow.wall.z if lo < z < hi}
    return tuple((z, cache.at(z).radius, cache.at(z).inner_apothem) for z in sorted(knots))


def joint_layout(spar: Spar, check: JointCheck, cache: SectionCache, first_plug: int) -> JointLayout:
    spigot = _spigot(spar, check, cache) if check.kind == "wood-spigot" else None
    plugs = plug_blocks(spar, cache, _joint_plugs(spar, check), first=first_plug)
    return JointLayout(check=check, parts=part_spans(spar, check), keep_clear=keep_clear(check), spigot=spigot,
                       bought_length=None if spigot is not None else 2 * check.overlap, plugs=plugs,
                       steps=_steps(spar, check, spigot, plugs), profile=_profile(spar, check, cache))
