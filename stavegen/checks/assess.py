"""The whole check of a hollow spar against its plan: per station and for the spar as a whole."""

from __future__ import annotations

from dataclasses import dataclass

from ..model.spar import Spar
from ..stations.evaluate import SectionCache, Station, evaluate_stations, regions_at, where
from ..stations.grid import StationMark, intervals
from .parting import JointCheck, check_joints
from .beam import MassFigures, euler_load, mass_and_centre, tip_deflection
from .ratios import (ATHWARTSHIPS, DIRECTIONS, FORE_AFT, StationCheck, Stiffness, check_station, hollow_round,
                     hollow_stiffness, plan_stiffness, solid_round)

# The reference head load bends the plan's solid spar this share of its length at the head: small enough for the
# linear (small-deflection) figure to hold, large enough to read on a tape; a convention of stavegen's, not a rig
# load.
REFERENCE_BEND = 0.02


@dataclass(frozen=True)
class SparFigures:
    """Mass (kg), centre of gravity (mm from heel), head deflection under the head load (mm), Euler load (N)."""

    mass: MassFigures
    tip_deflection: float
    euler_load: float
    head_load: float
    direction: str = ""
    """For a spar that is not round, the direction of ``tip_deflection`` and ``euler_load``: the weaker
    (:data:`~stavegen.checks.ratios.FORE_AFT` or ``ATHWARTSHIPS``); empty for a round spar."""
    by_direction: tuple[tuple[str, float, float], ...] = ()
    """(direction, head deflection mm, Euler load N) in each direction, for a spar that is not round."""

    def in_direction(self, direction: str) -> tuple[float, float]:
        """(head deflection mm, Euler load N) bending in ``direction`` (the same both ways for a round)."""
        for name, deflection, euler in self.by_direction:
            if name == direction:
                return deflection, euler
        return self.tip_deflection, self.euler_load

    @property
    def head_stiffness(self) -> float:
        """Sideways load at the head per unit deflection there, heel held (N/mm): independent of the load."""
        return self.head_load / self.tip_deflection


@dataclass(frozen=True)
class RegionTotal:
    """One material region along the whole spar: its weight (kg), and what it adds to E·I (its E·I over the
    wood's at the same station: staves and plug) at the station of least EI ratio and at most, least."""

    kind: str
    label: str
    material: object
    mass: float
    ei_added_at_weakest: float | None
    ei_added_least: float
    ei_added_most: float
    stations: int


@dataclass(frozen=True)
class Assessment:
    """Everything the check found: station by station and for the spar as a whole."""

    spar: Spar
    stations: tuple[StationCheck, ...]
    plan: SparFigures
    hollow: SparFigures
    regions: tuple[RegionTotal, ...] = ()
    """Every material region along the spar (staves, plugs, each layer, each strip): weight, E·I added."""
    joints: tuple[JointCheck, ...] = ()
    """The joint of a two-piece spar (:mod:`stavegen.checks.parting`); empty for one piece."""

    @property
    def head_load(self) -> float:
        """The sideways head load the deflections are compared under (N): the file's, or the reference load
        (:data:`REFERENCE_BEND`)."""
        return self.plan.head_load

    @property
    def ei_target(self) -> float:
        return 1.0 + self.spar.hollow.margin

    @property
    def strength_target(self) -> float:
        return self.spar.hollow.min_strength_ratio

    @property
    def weight_saved(self) -> float:
        """kg the hollow spar weighs less than the plan's solid spar (negative when heavier)."""
        return self.plan.mass.mass - self.hollow.mass.mass

    @property
    def weight_saved_share(self) -> float:
        """The weight saved as a share of the plan's weight."""
        return self.weight_saved / self.plan.mass.mass if self.plan.mass.mass > 0 else 0.0

    def compared(self, name: str) -> float:
        """Hollow over plan for a whole-spar figure: "mass", "centre", "deflection", "euler", "head_stiffness"."""
        pick = {"mass": lambda f: f.mass.mass, "centre": lambda f: f.mass.centre,
                "deflection": lambda f: f.tip_deflection, "euler": lambda f: f.euler_load,
                "head_stiffness": lambda f: f.head_stiffness}[name]
        return pick(self.hollow) / pick(self.plan)

    @property
    def two_axis(self) -> bool:
        """True when the hollow spar or the plan is not round: every figure is given in both directions."""
        return self.spar.hollow.two_axis or self.spar.plan.shape != "round"

    def weakest_stiffness_in(self, direction: str) -> StationCheck:
        return min(self.stations, key=lambda s: s.ei_ratio_in(direction))

    def weakest_strength_in(self, direction: str) -> StationCheck:
        return min(self.stations, key=lambda s: s.strength_ratio_in(direction))

    @property
    def weakest_stiffness(self) -> StationCheck:
        return min(self.stations, key=lambda s: s.ei_ratio)

    @property
    def weakest_strength(self) -> StationCheck:
        return min(self.stations, key=lambda s: s.strength_ratio)

    @property
    def stiffness_met(self) -> bool:
        return all(c.ei_ok for c in self.stations)

    @property
    def strength_met(self) -> bool:
        return all(c.strength_ok for c in self.stations)

    @property
    def strength_accepted_below_plan(self) -> bool:
        """True when the spar file accepts a hollow spar weaker than the plan (strength target below 1)."""
        return self.strength_target < 1.0

    @property
    def joints_met(self) -> bool:
        return all(j.passed for j in self.joints)

    @property
    def passed(self) -> bool:
        return self.stiffness_met and self.strength_met and self.joints_met

    def shortfalls(self) -> list[str]:
        """One sentence for each target missed: where, and by how much."""
        strength_words = ("the plan's strength" if self.strength_target == 1.0
                          else f"the least the spar file accepts, {self.strength_target:.3f}")
        missed = (
            ("EI ratio", lambda c: c.ei_ratio, lambda c: c.ei_ok, self.ei_target,
             f"the target {self.ei_target:.3f}", self.weakest_stiffness),
            ("strength ratio", lambda c: c.strength_ratio, lambda c: c.strength_ok, self.strength_target,
             strength_words, self.weakest_strength),
        )
        out = []
        for name, ratio, ok, target, words, weakest in missed:
            below = [c for c in self.stations if not ok(c)]
            if not below:
                continue
            line = (f"{name} {ratio(weakest):.3f} at {where(self.spar, weakest.station.z)} is below {words} "
                    f"(short by {100 * (1 - ratio(weakest) / target):.1f} %)")
            if len(below) > 1:
                line += (f"; {len(below)} stations fall short, from {where(self.spar, below[0].station.z)}"
                         f" to {where(self.spar, below[-1].station.z)}")
            out.append(line)
        for joint in self.joints:
            out += joint.reasons()
        return out


def _stretch_figures(spar: Spar, cache: SectionCache, marks: tuple[StationMark, ...]):
    """Per stretch between stations: plan and hollow stiffness at its ends and middle, plug per stretch."""
    positions = [m.z for m in marks]
    stretches = intervals(positions)
    plan: list[tuple[Stiffness, Stiffness, Stiffness]] = []
    hollow: list[tuple[Stiffness, Stiffness, Stiffness]] = []
    round_plan = spar.plan.shape == "round"
    for stretch in stretches:
        plug = spar.hollow.plug_at(stretch[1])
        plan.append(tuple(solid_round(spar, float(spar.plan.diameter.at(z))) if round_plan
                          else plan_stiffness(spar, z) for z in stretch))
        middle = stretch[1]  # a stretch never straddles a plug's, a layer's or a strip's end: its middle decides
        hollow.append(tuple(hollow_stiffness(spar, cache.at(z, cover=middle), plug, middle) for z in stretch))
    return stretches, plan, hollow


def head_load_for(spar: Spar, stretches, plan, direction: str = "") -> float:
    """The head load the deflections are compared under (N): the file's, or the reference load, the one that
    bends the plan's solid spar :data:`REFERENCE_BEND` of its length at the head (in its weaker direction).
    Deflection is linear in the load, so the plan's deflection under 1 N scales to it."""
    if spar.head_load is not None:
        return spar.head_load
    return REFERENCE_BEND * spar.length / _figures(spar, stretches, plan, 1.0, direction).tip_deflection


def _figures(spar: Spar, stretches, stiffness, load: float, direction: str = "") -> SparFigures:
    """Mass, centre and the beam figures; bending in ``direction`` (empty: a round's single stiffness), with
    both directions' figures kept for a spar that is not round."""
    mass = [tuple(s.mass_per_length for s in triple) for triple in stiffness]

    def beam(way: str) -> tuple[float, float]:
        ei = [tuple((s.ei_in(way) if way else s.ei) for s in triple) for triple in stiffness]
        return tip_deflection(stretches, ei, spar.length, load), euler_load(stretches, ei, spar.length)

    if not direction:
        deflection, euler = beam("")
        return SparFigures(mass=mass_and_centre(stretches, mass), tip_deflection=deflection, euler_load=euler,
                           head_load=load)
    both = tuple((way, *beam(way)) for way in DIRECTIONS)
    _, deflection, euler = next(b for b in both if b[0] == direction)
    return SparFigures(mass=mass_and_centre(stretches, mass), tip_deflection=deflection, euler_load=euler,
                       head_load=load, direction=direction, by_direction=both)


def weaker_direction(stiffness) -> str:
    """The direction the hollow spar bends most easily in: the one with the smaller E·I summed along it."""
    totals = {way: sum(1 / s.ei_in(way) for triple in stiffness for s in triple) for way in DIRECTIONS}
    return max(DIRECTIONS, key=lambda way: totals[way])


def _region_key(region) -> tuple[str, str, str]:
    return (region.kind, region.label, getattr(region.material, "key", ""))


def _wood_ei(regions) -> float:
    return sum(regions.ei_of(r) for r in regions.regions if r.is_wood)


def region_totals(stations: tuple[StationCheck, ...], stretches, hollow) -> tuple[RegionTotal, ...]:
    """Per material region: mass along the spar (Simpson, per stretch) and E·I added at the stations."""
    masses: dict[tuple[str, str, str], float] = {}
    found: dict[tuple[str, str, str], object] = {}
    for (z0, zm, z1), triple in zip(stretches, hollow):
        if any(s.regions is None for s in triple):
            return ()
        per = [{_region_key(r): s.regions.mass_of(r) for r in s.regions.regions} for s in triple]
        for key in set().union(*per):
            f0, fm, f1 = (p.get(key, 0.0) for p in per)
            masses[key] = masses.get(key, 0.0) + (z1 - z0) / 6 * (f0 + 4 * fm + f1)
        for s in triple:
            for r in s.regions.regions:
                found.setdefault(_region_key(r), r)
    weakest = min(stations, key=lambda c: c.ei_ratio)
    out = []
    for key, region in found.items():
        added = []
        at_weakest = None  # the region may not reach the station of least EI ratio
        for c in stations:
            regions = c.hollow.regions
            if regions is None:
                continue
            here = [r for r in regions.regions if _region_key(r) == key]
            if not here:
                continue
            share = regions.ei_of(here[0]) / _wood_ei(regions)
            added.append(share)
            if c is weakest:
                at_weakest = share
        out.append(RegionTotal(kind=region.kind, label=region.label, material=region.material,
                               mass=masses.get(key, 0.0), ei_added_at_weakest=at_weakest,
                               ei_added_least=min(added, default=0.0), ei_added_most=max(added, default=0.0),
                               stations=len(added)))
    return tuple(out)


def assess(spar: Spar, marks: tuple[StationMark, ...] | None = None, cache: SectionCache | None = None) -> Assessment:
    """Check the resolved spar station by station and as a whole (``cache``: sections to share with the layout)."""
    cache = cache or SectionCache(spar)
    stations: tuple[Station, ...] = evaluate_stations(spar, marks, cache)
    checks = tuple(check_station(spar, s) for s in stations)
    used_marks = tuple(StationMark(s.z, s.reasons) for s in stations)
    stretches, plan, hollow = _stretch_figures(spar, cache, used_marks)
    two_axis = spar.hollow.two_axis or spar.plan.shape != "round"
    direction = weaker_direction(hollow) if two_axis else ""
    load = head_load_for(spar, stretches, plan, direction)
    return Assessment(
        spar=spar,
        stations=checks,
        plan=_figures(spar, stretches, plan, load, direction),
        hollow=_figures(spar, stretches, hollow, load, direction),
        regions=region_totals(checks, stretches, hollow),
        joints=check_joints(spar, cache),
    )
