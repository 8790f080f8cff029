"""Stiffness and strength of the hollow section against the solid round of the plans.

EI ratio       = Σ Eᵢ Iᵢ over the section's regions                 over  E_plan · I_plan
strength ratio = minᵢ σᵢ · EI / (Eᵢ cᵢ) (· F for wood)              over  MOR_plan · S_plan · F_round

The section is a set of material regions (staves, plug, sheathing layers,
reinforcement strips; :mod:`stavegen.section.regions` computes every figure
of it). The lamination credit k_lam is given to the staves' wood only, in
stiffness only. Units: mm, N, N·mm², N·mm.

Form factors. Wood's modulus of rupture comes from rectangular test beams; a
beam of another shape breaks at a different extreme-fibre stress. Newlin and
Trayer (NACA Report 181, 1924; the Wood Handbook's discussion of form
factors) give 1.18 for a solid round and 1.414 for a square loaded on its
diagonal, the rectangle being 1 (all from memory — verify). Published
factors for hollow rounds were not found, so stavegen interpolates on the
section's plastic shape factor SF = Z / S (Z = ∫|y| dA): the form factor is
linear in SF through the rectangle (SF = 1.5, F = 1) and the solid round
(SF = 16/(3π), F = 1.18). A hollow round has a smaller shape factor than a
solid one, so it is credited with less (a thin tube, SF → 4/π, about 0.79),
which makes the comparison with a solid plan conservative; a round plugged
solid gets exactly the plan's factor. The same line gives 1.45 for the
square on its diagonal (SF = 2), against 1.414 published: a check of the
interpolation the tests hold.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..model.spar import Plug, Spar
from ..section.regions import Limit, RegionSection
from ..stations.evaluate import Station, regions_of

# Form factors relative to a rectangular test beam (Newlin & Trayer 1924, from memory — verify).
ROUND_FORM_FACTOR = 1.18
RECTANGLE_FORM_FACTOR = 1.0
RECTANGLE_SHAPE_FACTOR = 1.5  # Z/S of a rectangle: (bh²/4)/(bh²/6)
ROUND_SHAPE_FACTOR = 16 / (3 * math.pi)  # Z/S of a solid round: (D³/6)/(πD³/32)
TOLERANCE = 1e-12  # relative: a ratio this close below its target is roundoff, not a shortfall


def form_factor(shape_factor: float) -> float:
    """The bending form factor credited to a section of plastic shape factor Z/S (see the module's note)."""
    slope = (ROUND_FORM_FACTOR - RECTANGLE_FORM_FACTOR) / (ROUND_SHAPE_FACTOR - RECTANGLE_SHAPE_FACTOR)
    return RECTANGLE_FORM_FACTOR + slope * (shape_factor - RECTANGLE_SHAPE_FACTOR)


@dataclass(frozen=True)
class Stiffness:
    """Bending stiffness EI (N·mm²), the moment at rupture MOR·S·F (N·mm), and mass per length (kg/mm).

    ``inertia`` is the transformed second moment (mm⁴, in the section's main wood);
    ``form_factor`` the factor F in the moment at rupture.
    """

    inertia: float
    ei: float
    moment_capacity: float
    mass_per_length: float
    form_factor: float = 1.0
    regions: RegionSection | None = None
    first_limit: Limit | None = None
    limits: tuple[Limit, ...] = ()
    """For the hollow section: its material regions, and the one whose material reaches its limit first."""


def solid_round(spar: Spar, diameter: float) -> Stiffness:
    """The plan's solid round spar: I = π D⁴ / 64, S = π D³ / 32, form factor of the round."""
    wood = spar.plan.wood
    inertia = math.pi * diameter**4 / 64
    return Stiffness(
        inertia=inertia,
        ei=wood.moe * inertia,
        moment_capacity=wood.mor * math.pi * diameter**3 / 32 * ROUND_FORM_FACTOR,
        mass_per_length=wood.density * 1e-9 * math.pi * diameter**2 / 4,
        form_factor=ROUND_FORM_FACTOR,
    )


def hollow_round(spar: Spar, regions: RegionSection) -> Stiffness:
    """The hollow section's figures, read off its material regions (:mod:`stavegen.section.regions`).

    E·I is the transformed section's; the moment at rupture is the least at which any material reaches its
    limit, the wood's credited with the form factor of the wood's own shape (staves and plug).
    """
    limits = regions.limits(lambda r: form_factor(r.wood_shape_factor()))
    first = min(limits, key=lambda limit: limit.moment)
    return Stiffness(
        inertia=regions.strength_ei / regions.reference,
        ei=regions.ei,
        moment_capacity=first.moment,
        mass_per_length=regions.mass_per_length,
        form_factor=first.form_factor if first.region.is_wood else form_factor(regions.wood_shape_factor()),
        regions=regions,
        first_limit=first,
        limits=limits,
    )


@dataclass(frozen=True)
class StationCheck:
    """One station of the hollow spar set against the plan, with the verdict of each target there.

    ``ei_target`` and ``strength_target`` are the least ratios the spar file asks
    for; ``ei_ok`` and ``strength_ok`` are decided here, once, for every output.
    """

    station: Station
    plan: Stiffness
    hollow: Stiffness
    ei_target: float = 1.0
    strength_target: float = 1.0

    @property
    def ei_ratio(self) -> float:
        return self.hollow.ei / self.plan.ei

    @property
    def strength_ratio(self) -> float:
        return self.hollow.moment_capacity / self.plan.moment_capacity

    @property
    def ei_ok(self) -> bool:
        return self.ei_ratio >= self.ei_target * (1 - TOLERANCE)

    @property
    def strength_ok(self) -> bool:
        return self.strength_ratio >= self.strength_target * (1 - TOLERANCE)

    @property
    def ok(self) -> bool:
        return self.ei_ok and self.strength_ok


def targets(spar: Spar) -> tuple[float, float]:
    """(EI ratio target, strength ratio target) the spar file asks for: 1 + margin, and 1 unless it accepts less."""
    return 1.0 + spar.hollow.margin, spar.hollow.min_strength_ratio


def check_station(spar: Spar, station: Station) -> StationCheck:
    ei_target, strength_target = targets(spar)
    return StationCheck(
        station=station,
        plan=solid_round(spar, station.plan_diameter),
        hollow=hollow_round(spar, regions_of(spar, station)),
        ei_target=ei_target,
        strength_target=strength_target,
    )
