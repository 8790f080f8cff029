"""One stave along its length: widths at every station, true length along its face, the taper.

All N staves of a round spar have the same shape, so one plan serves them all; an oval spar has one plan
for each kind of stave (the staves that pair off by symmetry, :func:`kind_of_stave`).
Positions: z is mm from the heel along the spar's axis (negative in the heel
end allowance, past the length in the head's); s is mm along the stave's
outer face from its cut heel end, s = ∫ √(1 + (da_o/dz)²) dz. Widths are
the stave's width before the notch (from the closure relation) in mm; the
rough width adds the edge allowance jointed off each edge.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from ..model.spar import Spar
from ..stations.evaluate import SectionCache
from ..stations.grid import StationMark


@dataclass(frozen=True)
class GrooveAt:
    """A groove for a strip let into the stave's outer face, at one station (mm): the strip (numbered from 1
    as the file lists them), its width, where the groove's centre line lies across the face (from the notch
    edge, or from the bevel edge of a plain stave: the stave's middle in the glued-up section, half the width
    for a flush birdsmouth or a bevel) and how deep its bottom lies below the stave's outer face as dressed."""

    strip: int
    width: float
    centre: float
    depth: float


@dataclass(frozen=True)
class StaveStation:
    """The stave at one position: widths, thickness and notch (mm)."""

    z: float
    s: float
    width: float
    rough_width: float
    thickness: float
    notch_depth: float | None
    apex_height: float | None
    reasons: tuple[str, ...]
    grooves: tuple[GrooveAt, ...] = ()
    """The grooves cut at this station (strips with ``place = "groove"`` whose range holds it, ends included)."""


@dataclass(frozen=True)
class StavePlan:
    """The shape every stave is cut to, heel end to head end, end allowances included."""

    stations: tuple[StaveStation, ...]
    taper: str
    edge_allowance: float
    end_allowance: float
    spar_length: float

    @property
    def start(self) -> float:
        """z of the stave's heel end (mm): minus the end allowance."""
        return self.stations[0].z

    @property
    def end(self) -> float:
        """z of the stave's head end (mm): the spar's length plus the end allowance."""
        return self.stations[-1].z

    @property
    def cut_length(self) -> float:
        """The stave's true length along its face, end allowances included (mm)."""
        return self.stations[-1].s - self.stations[0].s

    @property
    def finished_length(self) -> float:
        """True length along the face between heel and head of the finished spar (mm)."""
        return self.s_at(self.spar_length) - self.s_at(0.0)

    @cached_property
    def _columns(self) -> dict[str, np.ndarray]:
        """The stations' figures as arrays, built once (the plan is frozen)."""
        names = ("z", "s", "width", "thickness")
        return {n: np.array([getattr(st, n) for st in self.stations]) for n in names}

    def _column(self, name: str) -> np.ndarray:
        return self._columns[name]

    def s_at(self, z: float) -> float:
        """Distance along the face (mm) from the stave's heel end to position z."""
        return float(np.interp(z, self._column("z"), self._column("s")))

    def width_at(self, z: float) -> float:
        """Finished stave width at z (mm), straight between stations."""
        return float(np.interp(z, self._column("z"), self._column("width")))

    def thickness_at(self, z: float) -> float:
        return float(np.interp(z, self._column("z"), self._column("thickness")))

    def widest(self) -> StaveStation:
        return max(self.stations, key=lambda st: st.width)

    def narrowest(self) -> StaveStation:
        return min(self.stations, key=lambda st: st.width)

    def max_slope_factor(self) -> float:
        """Largest ds/dz along the stave (≥ 1): how much longer the face is than the axis."""
        z, s = self._column("z"), self._column("s")
        dz = np.diff(z)
        ok = dz > 0
        return float(np.max(np.diff(s)[ok] / dz[ok])) if ok.any() else 1.0

    def between(self, z0: float, z1: float) -> list[StaveStation]:
        """Stations strictly between z0 and z1."""
        z = self._columns["z"]
        lo, hi = np.searchsorted(z, z0, side="right"), np.searchsorted(z, z1, side="left")
        return list(self.stations[lo:hi])

    def edges_at(self, z: float) -> tuple[float, float]:
        """(notch edge, square edge) across the face at z, mm: the straight edge at 0, or centred."""
        w = self.width_at(z)
        if self.taper == "symmetric":
            return -w / 2, w / 2
        return 0.0, w


def grooves_at(spar: Spar, section, z: float, kind: int = 0) -> tuple[GrooveAt, ...]:
    """The grooves at ``z`` (mm from the heel) in the stave of ``section`` (the wood's, as the regions take it):
    each where :func:`~stavegen.stations.evaluate.strip_span` lays its strip, read in the stave's own frame.

    The strip lies on the stave's middle (x = 0 in the section's frame of stave 0), its bottom ``bottom`` mm
    from the axis; the stave's outer face lies at the outer apothem and its notch edge at
    ``frame.x_notch_edge``. So the groove's centre is −x_notch_edge across the face from the notch edge and
    its depth below the outer face a_o − bottom. A groove runs over its strip's range, ends included; none
    in the end allowances. On an oval (``section`` one kind's stave of it, ``kind`` its index) the strip lies on
    the stave's middle in its own frame (:func:`stavegen.section.oval_sheath.oval_strip`).
    """
    from ..stations.evaluate import strip_span, where

    h = spar.hollow
    out = []
    if not 0.0 <= z <= spar.length:
        return ()
    for k, strip in enumerate(h.strips, start=1):
        if strip.place != "groove":
            continue
        lo = 0.0 if strip.start is None else strip.start
        hi = spar.length if strip.end is None else strip.end
        if not lo - 1e-6 <= z <= hi + 1e-6:
            continue
        if section.whole is not None:  # one stave of an oval
            from ..section.oval_sheath import oval_strip

            middle, bottom, _ = oval_strip(section.whole, strip.width, strip.thickness, strip.place, where(spar, z),
                                           spar.units).spans[kind]
            out.append(GrooveAt(strip=k, width=strip.width, centre=middle - section.frame.x_notch_edge,
                                depth=section.outer_apothem - bottom))
            continue
        bottom, _ = strip_span(strip, section.staves, section.radius, section.inner_apothem, where(spar, z),
                               spar.units)
        out.append(GrooveAt(strip=k, width=strip.width, centre=-section.frame.x_notch_edge,
                            depth=section.outer_apothem - bottom))
    return tuple(out)


def kind_of_stave(spar: Spar, stave: int) -> int:
    """The kind (0-based) of stave number ``stave`` (from 1): 0 for every stave of a round; for an oval the
    symmetry class of its place round the section (:func:`stavegen.section.oval.kind_of`)."""
    if not spar.hollow.two_axis:
        return 0
    from ..section.oval import kind_of

    return kind_of(spar.hollow.staves, stave - 1)


def kind_count(spar: Spar) -> int:
    """How many different staves the spar has: 1 for a round, N // 4 + 1 for an oval."""
    if not spar.hollow.two_axis:
        return 1
    from ..section.oval import kind_count as count

    return count(spar.hollow.staves)


def stave_plan(spar: Spar, marks: tuple[StationMark, ...], cache: SectionCache, kind: int = 0) -> StavePlan:
    """The stave shape at ``marks`` (heel to head), extended by the end allowance at each end.

    In the end allowances the stave keeps the width of the end it runs past. ``kind`` picks the stave of an
    oval spar (every stave of a round is the same).
    """
    hollow = spar.hollow
    allowance = spar.stock.edge_allowance if spar.stock is not None else 0.0
    e = hollow.end_allowance
    rows: list[tuple[float, tuple[str, ...], object]] = []
    for mark in marks:
        rows.append((mark.z, mark.reasons, cache.at(mark.z).kind_section(kind)))
    if e > 0:
        rows.insert(0, (-e, ("heel end",), rows[0][2]))
        rows.append((spar.length + e, ("head end",), rows[-1][2]))
    stations = []
    s = 0.0
    previous = None
    for z, reasons, section in rows:
        if previous is not None:
            dz = z - previous[0]
            da = section.outer_apothem - previous[1].outer_apothem
            s += math.hypot(dz, da)
        stations.append(StaveStation(
            z=z,
            s=s,
            width=section.stave_width,
            rough_width=section.stave_width + 2 * allowance,
            thickness=section.thickness,
            notch_depth=section.notch.depth if section.notch else None,
            apex_height=section.notch.apex_height if section.notch else None,
            reasons=reasons,
            grooves=grooves_at(spar, section, z, kind),
        ))
        previous = (z, section)
    return StavePlan(stations=tuple(stations), taper=hollow.taper, edge_allowance=allowance,
                     end_allowance=e, spar_length=spar.length)
