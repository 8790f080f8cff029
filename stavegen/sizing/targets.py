"""Where the target is held, what it is, and the check of one trial size at one place.

The target is held at every station of the spar (:func:`station_marks`)
and at the middle of every stretch between two stations, where a linear
wall or diameter could otherwise dip below it unseen. Positions mm from the
heel, lengths mm.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..checks.ratios import StationCheck, check_station
from ..model.spar import Plug, Spar
from ..section.properties import evaluate_section
from ..stations.evaluate import Station, plug_at_station, where
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
    """EI ratio ≥ 1 + margin, and strength ratio ≥ ``hollow.min_strength_ratio`` when that is set."""
    out = [Criterion(EI_RATIO, 1.0 + spar.hollow.margin)]
    if spar.hollow.min_strength_ratio is not None:
        out.append(Criterion(STRENGTH_RATIO, spar.hollow.min_strength_ratio))
    return tuple(out)


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
    """The exact section of finished ``radius`` and ``wall`` (mm) at ``point``, set against the plan there."""
    h = spar.hollow
    section = evaluate_section(h.staves, h.joint, radius, wall, h.planing_allowance, place(spar, point),
                               spar.units)
    station = Station(z=point.z, reasons=point.reasons, plan_diameter=point.plan_diameter, diameter=2 * radius,
                      wall=wall, plug=point.plug, section=section)
    return check_station(spar, station)
