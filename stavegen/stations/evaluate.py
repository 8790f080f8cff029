"""The hollow spar's finished sections along its length.

At each position: the finished diameter (linear between the file's
stations), the wall there, and the exact section for the stave outer
apothem a_o = R + planing allowance. Positions mm from the heel.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..model.spar import Plug, Profile, Spar
from ..section.properties import Section, evaluate_section
from ..units import Way, format_length, system
from .grid import MERGE_TOLERANCE, StationMark, station_marks


@dataclass(frozen=True)
class Station:
    """One evaluated position: diameters and wall (mm), the plug there if any, and the section."""

    z: float
    reasons: tuple[str, ...]
    plan_diameter: float
    diameter: float
    wall: float
    plug: Plug | None
    section: Section
    plan_athwartships: float | None = None
    """The plan's athwartships dimension (mm), for a plan that is not round; ``plan_diameter`` is then fore-and-aft."""
    athwartships: float | None = None
    """The hollow spar's athwartships dimension (mm), when it is oval; ``diameter`` is then fore-and-aft."""

    @property
    def fore_aft(self) -> float:
        return self.diameter

    @property
    def athwart(self) -> float:
        return self.athwartships if self.athwartships is not None else self.diameter

    @property
    def plan_athwart(self) -> float:
        return self.plan_athwartships if self.plan_athwartships is not None else self.plan_diameter


def where(spar: Spar, z: float) -> str:
    """A position for messages: ``5' 3" from the heel`` or ``1600.0 mm from the heel``."""
    return f"{format_length(z, spar.units, tape=True)} from the heel"


def plug_at_station(spar: Spar, z: float) -> Plug | None:
    """The plug filling the bore at ``z``; at a plug's inner end the open bore beside it counts."""
    tol = MERGE_TOLERANCE
    for plug in spar.hollow.plugs:
        inside = plug.start + tol < z < plug.end - tol
        at_heel = z <= tol and plug.start <= tol
        at_head = z >= spar.length - tol and plug.end >= spar.length - tol
        if inside or at_heel or at_head:
            return plug
    return None


def stave_thickness(spar: Spar) -> float | None:
    """The thickness every stave is dressed to (mm), when the notch is cut in one setting; else None.

    It is the thickest wall of the spar rounded up onto the builder's grid (1/32 in or
    0.1 mm): a tapered wall is cut as staves of the thickest wall whose notch is set
    once, the taper being the bore's (see :func:`hollow_section`). None when the file
    asks for the notch to follow a tapered wall station by station (``notch_cut =
    "follow-wall"``).
    """
    wall = spar.hollow.wall
    if not isinstance(wall, Profile):
        return None
    if spar.hollow.notch_cut == "follow-wall" and not wall.is_constant:
        return None
    return system(spar.units).on_grid(wall.largest, Way.UP)


def hollow_section(spar: Spar, radius: float, wall: float, at: str = "", thickness: float | None = None) -> Section:
    """The section as the staves are built: finished ``radius``, the file's ``wall`` there (mm).

    The staves are ``thickness`` thick (default :func:`stave_thickness`, or the wall
    rounded up onto the grid when the notch follows the wall); their inner faces lie
    where the wall puts them (inner apothem R + planing allowance − wall), so any
    thickness over the wall stands proud outside and comes off in rounding (or is
    planed off the outer face first). The bore, and so every figure inside the round,
    is the file's.
    """
    h = spar.hollow
    t = thickness if thickness is not None else stave_thickness(spar)
    if t is None:
        t = system(spar.units).on_grid(wall, Way.UP)
    return evaluate_section(h.staves, h.joint, radius, t, h.planing_allowance + (t - wall), at, spar.units)


def oval_section(spar: Spar, fore_aft: float, athwartships: float, wall: float, at: str = "",
                 thickness: float | None = None):
    """The oval section as the staves are built (see :func:`hollow_section`): finished outside
    ``fore_aft`` × ``athwartships``, the file's ``wall`` there (mm)."""
    from ..section.oval import evaluate_oval

    h = spar.hollow
    t = thickness if thickness is not None else stave_thickness(spar)
    if t is None:
        t = system(spar.units).on_grid(wall, Way.UP)
    return evaluate_oval(h.staves, h.joint, fore_aft, athwartships, t, h.planing_allowance + (t - wall), at,
                         spar.units)


class SectionCache:
    """Sections keyed by (radius, wall): tapers often repeat the same section."""

    def __init__(self, spar: Spar) -> None:
        if not spar.resolved:
            raise ValueError("staves and wall must be resolved before sections are evaluated")
        self.spar = spar
        self._thickness = stave_thickness(spar)
        self._cache: dict[tuple[float, float], Section] = {}

    def at(self, z: float) -> Section:
        """The finished section at ``z`` mm from the heel."""
        spar = self.spar
        radius = float(spar.hollow.diameter.at(z)) / 2
        wall = float(spar.hollow.wall.at(z))
        if spar.hollow.two_axis:
            athwartships = float(spar.hollow.athwartships.at(z))
            key = (round(radius, 9), round(wall, 9), round(athwartships, 9))
            section = self._cache.get(key)
            if section is None:
                section = oval_section(spar, 2 * radius, athwartships, wall, where(spar, z), self._thickness)
                self._cache[key] = section
            return section
        key = (round(radius, 9), round(wall, 9))
        section = self._cache.get(key)
        if section is None:
            section = hollow_section(spar, radius, wall, where(spar, z), self._thickness)
            self._cache[key] = section
        return section


def evaluate_stations(spar: Spar, marks: tuple[StationMark, ...] | None = None,
                      cache: SectionCache | None = None) -> tuple[Station, ...]:
    """Every station of the spar (or of ``marks``), heel to head."""
    cache = cache or SectionCache(spar)
    marks = marks if marks is not None else station_marks(spar)
    stations = []
    for mark in marks:
        section = cache.at(mark.z)
        stations.append(Station(
            z=mark.z,
            reasons=mark.reasons,
            plan_diameter=float(spar.plan.diameter.at(mark.z)),
            diameter=section.fore_aft if spar.hollow.two_axis else 2 * section.radius,
            wall=float(spar.hollow.wall.at(mark.z)),
            plug=plug_at_station(spar, mark.z),
            section=section,
            plan_athwartships=(float(spar.plan.athwartships.at(mark.z)) if spar.plan.athwartships is not None
                               else None),
            athwartships=section.athwartships if spar.hollow.two_axis else None,
        ))
    return tuple(stations)

