"""Stiffness and strength of the hollow section against the solid round of the plans.

EI ratio       = k_lam · E_wall · I_wall + E_plug · I_bore  over  E_plan · I_plan
strength ratio = MOR_wall · S_hollow                       over  MOR_plan · S_plan

A plug (solid blocking) counts as a transformed section: I_bore scaled by
E_plug / E_wall adds to the wall's I. The lamination credit k_lam is given to
the staves' wood only, never to a plug. Units: mm, N, N·mm², N·mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..model.spar import Plug, Spar
from ..section.properties import Section
from ..stations.evaluate import Station


@dataclass(frozen=True)
class Stiffness:
    """Bending stiffness EI (N·mm²), the moment at first rupture MOR·S (N·mm), and mass per length (kg/mm)."""

    inertia: float
    ei: float
    moment_capacity: float
    mass_per_length: float


def solid_round(spar: Spar, diameter: float) -> Stiffness:
    """The plan's solid round spar: I = π D⁴ / 64, S = π D³ / 32."""
    wood = spar.plan.wood
    inertia = math.pi * diameter**4 / 64
    return Stiffness(
        inertia=inertia,
        ei=wood.moe * inertia,
        moment_capacity=wood.mor * math.pi * diameter**3 / 32,
        mass_per_length=wood.density * 1e-9 * math.pi * diameter**2 / 4,
    )


def hollow_round(spar: Spar, section: Section, plug: Plug | None) -> Stiffness:
    """The hollow section, with the plug's transformed section where the bore is blocked."""
    wood = spar.hollow.wood
    ei = spar.hollow.lamination_factor * wood.moe * section.inertia
    transformed = section.inertia
    mass = wood.density * 1e-9 * section.area
    if plug is not None:
        ei += plug.wood.moe * section.bore_inertia
        transformed += plug.wood.moe / wood.moe * section.bore_inertia
        mass += plug.wood.density * 1e-9 * section.bore.area
    return Stiffness(
        inertia=transformed,
        ei=ei,
        moment_capacity=wood.mor * transformed / section.radius,
        mass_per_length=mass,
    )


@dataclass(frozen=True)
class StationCheck:
    """One station of the hollow spar set against the plan."""

    station: Station
    plan: Stiffness
    hollow: Stiffness

    @property
    def ei_ratio(self) -> float:
        return self.hollow.ei / self.plan.ei

    @property
    def strength_ratio(self) -> float:
        return self.hollow.moment_capacity / self.plan.moment_capacity


def check_station(spar: Spar, station: Station) -> StationCheck:
    return StationCheck(
        station=station,
        plan=solid_round(spar, station.plan_diameter),
        hollow=hollow_round(spar, station.section, station.plug),
    )
