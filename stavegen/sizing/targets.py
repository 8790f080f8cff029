"""Where the target is held, what it is, and the check of one trial size at one place.

The target is held at every station of the spar (:func:`station_marks`)
and at the middle of every stretch between two stations, where a linear
wall or diameter could otherwise dip below it unseen. Positions mm from the
heel, lengths mm.

A trial size is checked on the exact section (:func:`check_at`); with the
flush birdsmouth or the bevel joint the staves fill the disc but for the
bore, a regular N-gon, so the same figures have a closed form
(:func:`closed_form_check_at`, GEOMETRY.md): I = π R⁴/4 − I_Ngon(a_i),
A = π R² − A_Ngon(a_i). The root searches use it, a few hundred times
cheaper, at a point only once it has agreed with the exact section there
to :data:`CLOSED_FORM_TOLERANCE`; every solved size is checked again on the
exact section.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

from ..checks.ratios import StationCheck, check_station, targets
from ..errors import DesignError
from ..model.spar import Plug, Profile, Spar
from ..section.integrals import Moments
from ..section.properties import bore_ring
from ..stations.evaluate import Station, hollow_section, plug_at_station, two_axis_section, where, wood_radius
from ..units import Way, system
from ..stations.grid import station_marks

MIDDLE = "between stations"
EI_RATIO = "EI ratio"
STRENGTH_RATIO = "strength ratio"


@dataclass(frozen=True)
class Point:
    """A place the target is held: ``z`` mm from the heel, the plan's diameter there (mm), the plug there."""

    z: float
    reasons: tuple[str, ...]
    plan_diameter: float
    plug: Plug | None

    @property
    def at_station(self) -> bool:
        return MIDDLE not in self.reasons


@dataclass(frozen=True)
class Criterion:
    """One ratio the hollow spar must reach at every point: EI ratio or strength ratio, and its least value."""

    name: str
    target: float

    def ratio(self, check: StationCheck) -> float:
        return check.ei_ratio if self.name == EI_RATIO else check.strength_ratio


def ratio_text(ratio: float, target: float) -> str:
    """A ratio to 3 decimals, or to 6 where 3 would print a shortfall as the target itself."""
    return f"{ratio:.3f}" if f"{ratio:.3f}" != f"{target:.3f}" else f"{ratio:.6f}"


def criteria_of(spar: Spar) -> tuple[Criterion, ...]:
    """EI ratio ≥ 1 + margin and strength ratio ≥ the strength target (1 unless the file accepts less)."""
    ei_target, strength_target = targets(spar)
    return (Criterion(EI_RATIO, ei_target), Criterion(STRENGTH_RATIO, strength_target))


def _point(spar: Spar, z: float, reasons: tuple[str, ...], plugs: bool) -> Point:
    return Point(z=z, reasons=reasons, plan_diameter=float(spar.plan.diameter.at(z)),
                 plug=plug_at_station(spar, z) if plugs else None)


def points_of(spar: Spar, plugs: bool = True) -> tuple[Point, ...]:
    """Every station heel to head, with the middle of each stretch between neighbours in its place.

    ``plugs=False`` leaves the bore open everywhere (no credit for blocking).
    """
    marks = station_marks(spar)
    out: list[Point] = []
    for here, after in zip(marks, marks[1:]):
        out.append(_point(spar, here.z, here.reasons, plugs))
        out.append(_point(spar, (here.z + after.z) / 2, (MIDDLE,), plugs))
    out.append(_point(spar, marks[-1].z, marks[-1].reasons, plugs))
    return tuple(out)


def place(spar: Spar, point: Point) -> str:
    """``7' 0" from the heel``, or ``... from the heel (between stations)`` for a stretch's middle."""
    return where(spar, point.z) + ("" if point.at_station else f" ({MIDDLE})")


def athwartships_share(spar: Spar, z: float) -> float:
    """An oval hollow spar's athwartships dimension over its fore-and-aft one at ``z``: the file's, or the plan's
    when the hollow spar's dimensions are solved (the scale applies to both)."""
    h = spar.hollow
    if isinstance(h.athwartships, Profile) and isinstance(h.diameter, Profile):
        return float(h.athwartships.at(z)) / float(h.diameter.at(z))
    return float(spar.plan.athwart.at(z)) / float(spar.plan.diameter.at(z))


def station_at(spar: Spar, point: Point, radius: float, wall: float, section) -> Station:
    """The Station a trial section makes at ``point``: finished ``radius`` (half the fore-and-aft dimension of an
    oval), ``wall`` (mm)."""
    two = spar.hollow.two_axis
    return Station(z=point.z, reasons=point.reasons, plan_diameter=point.plan_diameter, diameter=2 * radius,
                   wall=wall, plug=point.plug, section=section,
                   plan_athwartships=(float(spar.plan.athwartships.at(point.z)) if spar.plan.athwartships is not None
                                      else None),
                   athwartships=section.athwartships + 2 * (radius - wood_radius(spar, radius, point.z)) if two
                   else None)


def check_at(spar: Spar, point: Point, radius: float, wall: float) -> StationCheck:
    """The section of finished ``radius`` (layers included) and ``wall`` (mm) at ``point``, as it would be built,
    against the plan.

    As built: staves dressed to the wall rounded up onto the builder's grid, the bore the wall's
    (:func:`~stavegen.stations.evaluate.hollow_section`); for flush and bevel staves that is the
    exact section of the wall itself.
    """
    thickness = system(spar.units).on_grid(wall, Way.UP)
    if spar.hollow.two_axis:
        wood = wood_radius(spar, radius, point.z)
        section = two_axis_section(spar, 2 * wood, 2 * radius * athwartships_share(spar, point.z) - 2 * (radius - wood),
                               wall, place(spar, point), thickness=thickness)
    else:
        section = hollow_section(spar, wood_radius(spar, radius, point.z), wall, place(spar, point),
                                 thickness=thickness)
    return check_station(spar, station_at(spar, point, radius, wall, section))


CLOSED_FORM_JOINTS = ("birdsmouth-flush", "bevel")  # joints that leave no voids: wall = disc − bore
CLOSED_FORM_TOLERANCE = 1e-12  # relative: how closely the closed form must match the exact section


@dataclass(frozen=True)
class RoundedRing:
    """The figures of a flush or bevel section that the check's ratios read (mm, mm², mm³, mm⁴), in closed
    form: the disc of ``radius`` less the regular N-gon bore."""

    radius: float
    thickness: float
    area: float
    inertia: float
    bore: Moments
    plastic_moduli: tuple[float, float]  # Z = ∫|y| dA of the wall and of the bore, as Section gives them
    staves: int = 0
    corner_reach: float = 0.0
    inner_apothem: float = 0.0

    @property
    def bore_inertia(self) -> float:
        return self.bore.polar / 2

    @property
    def wall(self) -> Moments:
        """The wall's integrals about the axis (isotropic: disc less a regular N-gon)."""
        return Moments(self.area, 0.0, 0.0, self.inertia, self.inertia, 0.0)

    @property
    def bore_corner_radius(self) -> float:
        """How far the bore's corners reach from the axis (mm): a_i / cos(π/N)."""
        return self.corner_reach


def _abs_first_moment(ring: list[tuple[float, float]]) -> float:
    """∫|y| dA over a convex polygon round the origin (counter-clockwise): triangle by triangle from the
    origin, each split where it crosses y = 0, ∫y dA = area × (sum of the vertices' y) / 3 on each part."""
    total = 0.0
    for (px, py), (qx, qy) in zip(ring, ring[1:] + ring[:1]):
        if py * qy >= 0:
            total += abs((px * qy - qx * py) / 2 * (py + qy) / 3)
            continue
        t = py / (py - qy)
        xx = px + t * (qx - px)  # where the edge crosses y = 0
        total += abs(-xx * py / 2 * py / 3) + abs(xx * qy / 2 * qy / 3)
    return total


def rounded_ring(staves: int, radius: float, wall: float, planing_allowance: float) -> RoundedRing:
    """Disc of ``radius`` less the regular ``staves``-gon bore of apothem a_i = R + p − t.

    Regular N-gon of apothem a (Roark's Formulas for Stress and Strain, table of
    properties of plane areas): side s = 2 a tan(π/N), A = N s a / 2,
    I = A (12 a² + s²) / 48 about any axis through its centre; disc I = π R⁴/4
    and ∫|y| dA = 4 R³/3. The plastic moduli are taken, as the exact section
    takes them, about the diameter through a stave's middle and the one half a
    stave turned, whichever leaves the wall the smaller.
    """
    a = radius + planing_allowance - wall
    tan = math.tan(math.pi / staves)
    side = 2 * a * tan
    bore_area = staves * side * a / 2
    bore_i = bore_area * (12 * a * a + side * side) / 48
    corners = bore_ring(staves, a)
    disc_z = 4 * radius**3 / 3
    best = None
    for turn in (0.0, math.pi / staves):
        c, s = math.cos(-turn), math.sin(-turn)
        bore_z = _abs_first_moment([(c * x - s * y, s * x + c * y) for x, y in corners])
        if best is None or disc_z - bore_z < best[0]:
            best = (disc_z - bore_z, bore_z)
    return RoundedRing(radius=radius, thickness=wall, area=math.pi * radius**2 - bore_area,
                       inertia=math.pi * radius**4 / 4 - bore_i,
                       bore=Moments(bore_area, 0.0, 0.0, bore_i, bore_i, 0.0), plastic_moduli=best,
                       staves=staves, corner_reach=a / math.cos(math.pi / staves), inner_apothem=a)


def closed_form_checker(spar: Spar, point: Point) -> Callable[[float, float], StationCheck]:
    """:func:`check_at` in closed form at ``point``, as a function of (radius, wall) (mm): only for
    :data:`CLOSED_FORM_JOINTS`, inside the range where the section can be built."""
    h = spar.hollow

    def check(radius: float, wall: float) -> StationCheck:
        section = rounded_ring(h.staves, wood_radius(spar, radius, point.z), wall, h.planing_allowance)
        station = Station(z=point.z, reasons=point.reasons, plan_diameter=point.plan_diameter,
                          diameter=2 * radius, wall=wall, plug=point.plug, section=section)  # type: ignore[arg-type]
        return check_station(spar, station)

    return check


def closed_form_check_at(spar: Spar, point: Point, radius: float, wall: float) -> StationCheck:
    """:func:`check_at` in closed form (see :func:`closed_form_checker`)."""
    return closed_form_checker(spar, point)(radius, wall)


def closed_form_trusted(spar: Spar, point: Point, criteria: tuple[Criterion, ...], radius: float,
                        wall: float) -> bool:
    """Whether the closed form may stand in for the exact section on this spar: its joint has one, and at
    ``point`` with this radius and wall (mm) the two agree (:func:`agrees`). Solutions found with it are
    checked on the exact section at every point all the same."""
    if not closed_form_applies(spar):
        return False
    try:
        exact = check_at(spar, point, radius, wall)
    except DesignError:
        return False
    return agrees(exact, closed_form_check_at(spar, point, radius, wall), criteria)


def closed_form_applies(spar: Spar) -> bool:
    return spar.hollow.joint.kind in CLOSED_FORM_JOINTS and not spar.hollow.two_axis


def agrees(exact: StationCheck, quick: StationCheck, criteria: tuple[Criterion, ...]) -> bool:
    """Whether the closed form gives every criterion's ratio within :data:`CLOSED_FORM_TOLERANCE` of the exact."""
    try:
        return all(abs(c.ratio(quick) - c.ratio(exact)) <= CLOSED_FORM_TOLERANCE * abs(c.ratio(exact))
                   for c in criteria)
    except (AttributeError, ArithmeticError, TypeError):  # the check reads a figure the closed form lacks
        return False
