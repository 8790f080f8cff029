"""The whole check of a hollow spar against its plan: per station and for the spar as a whole."""

from __future__ import annotations

from dataclasses import dataclass

from ..model.spar import Spar
from ..stations.evaluate import SectionCache, Station, evaluate_stations, where
from ..stations.grid import StationMark, intervals
from .beam import MassFigures, euler_load, mass_and_centre, tip_deflection
from .ratios import StationCheck, Stiffness, check_station, hollow_round, solid_round

REFERENCE_HEAD_LOAD = 1000.0  # N: a lateral head load for comparing deflections (1 kN)


@dataclass(frozen=True)
class SparFigures:
    """Mass (kg), centre of gravity (mm from heel), head deflection under 1 kN (mm), Euler load (N)."""

    mass: MassFigures
    tip_deflection: float
    euler_load: float


@dataclass(frozen=True)
class Assessment:
    """Everything the check found: station by station and for the spar as a whole."""

    spar: Spar
    stations: tuple[StationCheck, ...]
    plan: SparFigures
    hollow: SparFigures
    head_load: float = REFERENCE_HEAD_LOAD

    @property
    def ei_target(self) -> float:
        return 1.0 + self.spar.hollow.margin

    @property
    def weakest_stiffness(self) -> StationCheck:
        return min(self.stations, key=lambda s: s.ei_ratio)

    @property
    def weakest_strength(self) -> StationCheck:
        return min(self.stations, key=lambda s: s.strength_ratio)

    @property
    def stiffness_met(self) -> bool:
        return self.weakest_stiffness.ei_ratio >= self.ei_target - 1e-12

    @property
    def strength_met(self) -> bool:
        target = self.spar.hollow.min_strength_ratio
        return target is None or self.weakest_strength.strength_ratio >= target - 1e-12

    @property
    def passed(self) -> bool:
        return self.stiffness_met and self.strength_met

    def shortfalls(self) -> list[str]:
        """One sentence for each target missed: where, and by how much."""
        out = []
        if not self.stiffness_met:
            s = self.weakest_stiffness
            out.append(f"EI ratio {s.ei_ratio:.3f} at {where(self.spar, s.station.z)} is below the target "
                       f"{self.ei_target:.3f} (short by {100 * (1 - s.ei_ratio / self.ei_target):.1f} %)")
            below = [c for c in self.stations if c.ei_ratio < self.ei_target - 1e-12]
            if len(below) > 1:
                out[-1] += (f"; {len(below)} stations fall short, from {where(self.spar, below[0].station.z)}"
                            f" to {where(self.spar, below[-1].station.z)}")
        if not self.strength_met:
            s = self.weakest_strength
            target = self.spar.hollow.min_strength_ratio
            out.append(f"strength ratio {s.strength_ratio:.3f} at {where(self.spar, s.station.z)} is below the "
                       f"asked minimum {target:.3f} (short by {100 * (1 - s.strength_ratio / target):.1f} %)")
        return out


def _stretch_figures(spar: Spar, cache: SectionCache, marks: tuple[StationMark, ...]):
    """Per stretch between stations: plan and hollow stiffness at its ends and middle, plug per stretch."""
    positions = [m.z for m in marks]
    stretches = intervals(positions)
    plan: list[tuple[Stiffness, Stiffness, Stiffness]] = []
    hollow: list[tuple[Stiffness, Stiffness, Stiffness]] = []
    for stretch in stretches:
        plug = spar.hollow.plug_at(stretch[1])
        plan.append(tuple(solid_round(spar, float(spar.plan.diameter.at(z))) for z in stretch))
        hollow.append(tuple(hollow_round(spar, cache.at(z), plug) for z in stretch))
    return stretches, plan, hollow


def _figures(spar: Spar, stretches, stiffness, load: float) -> SparFigures:
    ei = [tuple(s.ei for s in triple) for triple in stiffness]
    mass = [tuple(s.mass_per_length for s in triple) for triple in stiffness]
    return SparFigures(
        mass=mass_and_centre(stretches, mass),
        tip_deflection=tip_deflection(stretches, ei, spar.length, load),
        euler_load=euler_load(stretches, ei, spar.length),
    )


def assess(spar: Spar, marks: tuple[StationMark, ...] | None = None, cache: SectionCache | None = None) -> Assessment:
    """Check the resolved spar station by station and as a whole (``cache``: sections to share with the layout)."""
    cache = cache or SectionCache(spar)
    stations: tuple[Station, ...] = evaluate_stations(spar, marks, cache)
    checks = tuple(check_station(spar, s) for s in stations)
    used_marks = tuple(StationMark(s.z, s.reasons) for s in stations)
    stretches, plan, hollow = _stretch_figures(spar, cache, used_marks)
    return Assessment(
        spar=spar,
        stations=checks,
        plan=_figures(spar, stretches, plan, REFERENCE_HEAD_LOAD),
        hollow=_figures(spar, stretches, hollow, REFERENCE_HEAD_LOAD),
    )
