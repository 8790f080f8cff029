"""Cloth, tape and resin for the sheathing layers and reinforcing strips (the board order is not changed by them).

Cloth: each ply of a layer wraps the spar at the radius it is laid on (the wood's rounded radius plus the
plies under it), girth 2πr (on an oval, the wood's ellipse's perimeter plus 2π times the plies under it); its net area is ∫ 2πr dz over the layer's stretch, by Simpson's rule between
the stations (exact where the diameter tapers linearly: the girth is linear in z). Plies are cut from the
roll as lengthwise pieces the outermost ply's widest girth plus an overlap wide, as many side by side as the roll's width
takes. Tape: one strip per stave per ply, the strip's width, its length, slit from tape the data's width. Resin: the laminate's coverage,
grams per square metre of one ply (data file), times the net area. Lengths mm, areas m², masses kg.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..model.spar import Spar
from ..stations.evaluate import SectionCache
from ..stations.grid import intervals, station_marks

CLOTH_OVERLAP = 25.0  # mm each ply laps over itself along the spar (common practice: about an inch)


@dataclass(frozen=True)
class ClothItem:
    """One layer's cloth or one strip's tape: what to buy and the resin to wet it out."""

    kind: str  # "layer" or "strip"
    label: str
    material: object
    plies: int | None
    start: float
    end: float
    net_area: float  # m², every ply
    piece_width: float  # mm: a layer's widest girth plus the overlap; a strip's width
    pieces: int  # pieces to cut (plies for a layer; staves × plies for a strip)
    roll_width: float | None  # mm
    roll_length: float  # m of roll (or of tape) to buy, before waste
    resin: float | None  # kg

    @property
    def length(self) -> float:
        return self.end - self.start

    @property
    def roll_area(self) -> float | None:
        """m² of roll bought (roll length × roll width)."""
        return None if self.roll_width is None else self.roll_length * self.roll_width / 1000


def cloth_and_resin(spar: Spar, cache: SectionCache) -> tuple[ClothItem, ...]:
    """Every layer's cloth and every strip's tape, with the resin each takes."""
    h = spar.hollow
    out: list[ClothItem] = []
    positions = [m.z for m in station_marks(spar)]
    for k, layer in enumerate(h.layers):
        start = layer.start if layer.start is not None else 0.0
        end = layer.end if layer.end is not None else spar.length
        zs = [start] + [z for z in positions if start < z < end] + [end]
        plies = layer.plies or 1
        ply = layer.thickness / plies
        under = sum(other.thickness for other in h.layers[:k] if _overlaps(other, start, end, spar.length))
        area = 0.0
        widest = 0.0
        for z0, zm, z1 in intervals(zs):
            girths = []
            for z in (z0, zm, z1):
                wood = _wood_girth(cache.at(z, cover=zm))
                girths.append(sum(wood + 2 * math.pi * (under + (i + 0.5) * ply) for i in range(plies)))
                widest = max(widest, wood + 2 * math.pi * (under + (plies - 0.5) * ply))  # the outermost ply's girth
            area += (z1 - z0) / 6 * (girths[0] + 4 * girths[1] + girths[2])
        net = area / 1e6
        piece = widest + CLOTH_OVERLAP
        roll = layer.material.roll_width
        across = max(1, int(roll // piece)) if roll else 1
        rows = math.ceil(plies / across)
        resin = layer.material.resin_per_ply()
        out.append(ClothItem("layer", f"layer {k + 1}", layer.material, layer.plies, start, end, net, piece, plies,
                             roll, rows * (end - start) / 1000, None if resin is None else resin * net))
    for k, strip in enumerate(h.strips):
        start = strip.start if strip.start is not None else 0.0
        end = strip.end if strip.end is not None else spar.length
        plies = strip.plies or 1
        pieces = h.staves * plies
        net = pieces * strip.width * (end - start) / 1e6
        resin = strip.material.resin_per_ply()
        roll = strip.material.roll_width
        across = max(1, int(roll // strip.width)) if roll else 1
        out.append(ClothItem("strip", f"strip {k + 1}", strip.material, strip.plies, start, end, net, strip.width,
                             pieces, roll, math.ceil(pieces / across) * (end - start) / 1000,
                             None if resin is None else resin * net))
    return tuple(out)


def _wood_girth(section) -> float:
    """The girth of the rounded wood (mm): 2πR for a round; for an oval the ellipse's perimeter, 4a·E(1 − b²/a²)
    (the complete elliptic integral of the second kind, scipy.special.ellipe). A ply ``d`` outside either lies
    on the parallel curve, whose girth is 2πd more (a convex curve's parallel)."""
    if getattr(section, "shape", "round") == "round":
        return 2 * math.pi * section.radius
    from scipy.special import ellipe

    a, b = sorted(section.semi_axes, reverse=True)
    return 4 * a * float(ellipe(1 - (b / a) ** 2))


def _overlaps(layer, start: float, end: float, length: float) -> bool:
    lo = layer.start if layer.start is not None else 0.0
    hi = layer.end if layer.end is not None else length
    return lo < end and hi > start
