"""Solid plugs (blocking): tapered N-sided blocks that fill the bore over a range."""

from __future__ import annotations

from dataclasses import dataclass

from ..model.spar import Plug, Spar
from ..section.properties import Section
from ..stations.evaluate import SectionCache


@dataclass(frozen=True)
class PlugEnd:
    """The bore at one end of a plug (mm): across its flats and across its corners."""

    z: float
    across_flats: float
    across_corners: float
    section: Section


@dataclass(frozen=True)
class PlugBlock:
    """One plug to make: its ends, length along the axis (mm), wood, volume (mm³) and mass (kg)."""

    index: int
    plug: Plug
    heel: PlugEnd
    head: PlugEnd
    volume: float
    mass: float

    @property
    def length(self) -> float:
        return self.plug.end - self.plug.start


def _end(cache: SectionCache, z: float) -> PlugEnd:
    sec = cache.at(z)
    if sec.shape != "round":  # an oval's bore: across its flats fore-and-aft, and its widest reach across corners
        return PlugEnd(z=z, across_flats=sec.bore_across_flats, across_corners=2 * sec.bore_corner_reach, section=sec)
    return PlugEnd(z=z, across_flats=2 * sec.inner_apothem, across_corners=2 * sec.bore_corner_radius, section=sec)


def plug_blocks(spar: Spar, cache: SectionCache, plugs: tuple[Plug, ...] | None = None,
                first: int = 1) -> tuple[PlugBlock, ...]:
    """Every plug of the spar (or ``plugs``, numbered from ``first``) as a block to cut, its volume by
    Simpson's rule on the bore's area.

    The bore's area is quadratic in z where the bore tapers linearly, so the
    rule is exact within a stretch of straight taper.
    """
    blocks = []
    for i, plug in enumerate(spar.hollow.plugs if plugs is None else plugs, start=first):
        heel, head = _end(cache, plug.start), _end(cache, plug.end)
        knots = sorted({plug.start, plug.end, *[z for z in spar.hollow.diameter.z if plug.start < z < plug.end],
                        *([z for z in spar.hollow.wall.z if plug.start < z < plug.end])})
        volume = 0.0
        for a, b in zip(knots, knots[1:]):
            areas = [cache.at(z).bore.area for z in (a, (a + b) / 2, b)]
            volume += (b - a) / 6 * (areas[0] + 4 * areas[1] + areas[2])
        blocks.append(PlugBlock(index=i, plug=plug, heel=heel, head=head, volume=volume,
                                mass=plug.wood.density * 1e-9 * volume))
    return tuple(blocks)
