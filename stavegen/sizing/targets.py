"""Where the target is held, what it is, and the check of one trial size at one place.

The target is held at every station of the spar (:func:`station_marks`)
and at the middle of every stretch between two stations, where a linear
wall or diameter could otherwise dip below it unseen. Positions mm from the
heel, lengths mm.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..checks.ratios import StationCheck, check_station, targets
from ..model.spar import Plug, Spar
from ..stations.evaluate import Station, hollow_section, plug_at_station, where
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


def check_at(spar: Spar, point: Point, radius: float, wall: float) -> StationCheck:
    """The section of finished ``radius`` and ``wall`` (mm) at ``point``, as it would be built, against the plan.

    As built: staves dressed to the wall rounded up onto the builder's grid, the bore the wall's
    (:func:`~stavegen.stations.evaluate.hollow_section`); for flush and bevel staves that is the
    exact section of the wall itself.
    """
    thickness = system(spar.units).on_grid(wall, Way.UP)
    section = hollow_section(spar, radius, wall, place(spar, point), thickness=thickness)
    station = Station(z=point.z, reasons=point.reasons, plan_diameter=point.plan_diameter, diameter=2 * radius,
                      wall=wall, plug=point.plug, section=section)
    return check_station(spar, station)
