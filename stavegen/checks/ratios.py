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
from ..stations.evaluate import Station, regions_at, regions_of

# Form factors relative to a rectangular test beam (Newlin & Trayer 1924, from memory — verify).
ROUND_FORM_FACTOR = 1.18
RECTANGLE_FORM_FACTOR = 1.0
RECTANGLE_SHAPE_FACTOR = 1.5  # Z/S of a rectangle: (bh²/4)/(bh²/6)
ROUND_SHAPE_FACTOR = 16 / (3 * math.pi)  # Z/S of a solid round: (D³/6)/(πD³/32)
TOLERANCE = 1e-12  # relative: a ratio this close below its target is roundoff, not a shortfall
FORE_AFT, ATHWARTSHIPS = "fore_aft", "athwartships"
DIRECTIONS = (FORE_AFT, ATHWARTSHIPS)


def meets(ratio: float, target: float) -> bool:
    """The one rule of every verdict: a ratio meets its target unless it falls below it by more than roundoff."""
    return ratio >= target * (1 - TOLERANCE)


def within(value: float, allowable: float) -> bool:
    """A load or pressure within what is allowed, roundoff above it forgiven (the rule of :func:`meets`, turned)."""
    return value <= allowable * (1 + TOLERANCE)


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
    # Two directions, for a section that is not round: fore-and-aft (bending in the fore-and-aft plane, about the
    # athwartships axis) and athwartships. None: the same as the single figures above (a round). For a section
    # that is not round, the single figures are the weaker direction's.
    inertia_fore_aft: float | None = None
    inertia_athwartships: float | None = None
    ei_fore_aft: float | None = None
    ei_athwartships: float | None = None
    moment_fore_aft: float | None = None
    moment_athwartships: float | None = None
    form_factor_fore_aft: float | None = None
    form_factor_athwartships: float | None = None

    def inertia_in(self, direction: str) -> float:
        value = self.inertia_fore_aft if direction == FORE_AFT else self.inertia_athwartships
        return self.inertia if value is None else value

    def ei_in(self, direction: str) -> float:
        value = self.ei_fore_aft if direction == FORE_AFT else self.ei_athwartships
        return self.ei if value is None else value

    def moment_in(self, direction: str) -> float:
        value = self.moment_fore_aft if direction == FORE_AFT else self.moment_athwartships
        return self.moment_capacity if value is None else value

    def form_factor_in(self, direction: str) -> float:
        value = self.form_factor_fore_aft if direction == FORE_AFT else self.form_factor_athwartships
        return self.form_factor if value is None else value

    @property
    def two_axis(self) -> bool:
        return self.ei_fore_aft is not None


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


def _two_way(fa: Stiffness, at: Stiffness, mass: float) -> Stiffness:
    """One Stiffness holding both directions; its single figures the weaker direction's."""
    weak = fa if fa.ei <= at.ei else at
    return Stiffness(
        inertia=weak.inertia, ei=weak.ei, moment_capacity=min(fa.moment_capacity, at.moment_capacity),
        mass_per_length=mass, form_factor=weak.form_factor, regions=weak.regions, first_limit=weak.first_limit,
        inertia_fore_aft=fa.inertia, inertia_athwartships=at.inertia, ei_fore_aft=fa.ei, ei_athwartships=at.ei,
        moment_fore_aft=fa.moment_capacity, moment_athwartships=at.moment_capacity,
        form_factor_fore_aft=fa.form_factor, form_factor_athwartships=at.form_factor)


def solid_ellipse(spar: Spar, fore_aft: float, athwartships: float) -> Stiffness:
    """The plan's solid ellipse: I = π a³ b / 4 fore-and-aft, π a b³ / 4 athwartships, S = I / (half the depth)
    (Roark, Table A.1); its plastic modulus 4 a² b / 3 gives the round's shape factor 16/(3π), so the round's
    form factor."""
    wood = spar.plan.wood
    a, b = fore_aft / 2, athwartships / 2

    def one(i: float, reach: float) -> Stiffness:
        return Stiffness(inertia=i, ei=wood.moe * i, moment_capacity=wood.mor * i / reach * ROUND_FORM_FACTOR,
                         mass_per_length=0.0, form_factor=ROUND_FORM_FACTOR)

    return _two_way(one(math.pi * a**3 * b / 4, a), one(math.pi * a * b**3 / 4, b),
                    wood.density * 1e-9 * math.pi * a * b)


def solid_rectangle(spar: Spar, fore_aft: float, athwartships: float, corner: float = 0.0) -> Stiffness:
    """The plan's solid rectangle, corners rounded to ``corner``: I = b d³ / 12 without rounding (Roark, Table
    A.1), exact with it; the form factor from its shape factor (1 for a sharp rectangle)."""
    from ..section.ellipse import rounded_rectangle_half_moment, rounded_rectangle_moments

    wood = spar.plan.wood
    m = rounded_rectangle_moments(fore_aft, athwartships, corner)

    def one(i: float, reach: float, plastic: float) -> Stiffness:
        elastic = i / reach
        factor = form_factor(plastic / elastic)
        return Stiffness(inertia=i, ei=wood.moe * i, moment_capacity=wood.mor * elastic * factor,
                         mass_per_length=0.0, form_factor=factor)

    return _two_way(one(m.iyy, fore_aft / 2, rounded_rectangle_half_moment(fore_aft, athwartships, corner)),
                    one(m.ixx, athwartships / 2, rounded_rectangle_half_moment(athwartships, fore_aft, corner)),
                    wood.density * 1e-9 * m.area)


def plan_stiffness(spar: Spar, z: float) -> Stiffness:
    """The plan's solid section at ``z`` mm from the heel, in its shape."""
    plan = spar.plan
    if plan.shape == "round":
        return solid_round(spar, float(plan.diameter.at(z)))
    fore_aft, athwartships = float(plan.diameter.at(z)), float(plan.athwartships.at(z))
    if plan.shape == "oval":
        return solid_ellipse(spar, fore_aft, athwartships)
    return solid_rectangle(spar, fore_aft, athwartships, plan.corner_radius)


def hollow_oval(spar: Spar, section, plug: Plug | None, z: float | None = None) -> Stiffness:
    """The oval hollow section in both directions, each read off the section's material regions for bending that
    way (:func:`stavegen.stations.evaluate.oval_regions_at`), as :func:`hollow_round` reads a round's."""
    from ..stations.evaluate import oval_regions_at

    parts = [hollow_round(spar, oval_regions_at(spar, section, plug, way, z)) for way in DIRECTIONS]
    return _two_way(parts[0], parts[1], parts[0].mass_per_length)


def hollow_stiffness(spar: Spar, section, plug: Plug | None, z: float | None = None) -> Stiffness:
    """The hollow section, round or oval, read off its material regions."""
    if spar.hollow.two_axis:
        return hollow_oval(spar, section, plug, z)
    return hollow_round(spar, regions_at(spar, section, plug, z))


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
    def two_axis(self) -> bool:
        return self.hollow.two_axis or self.plan.two_axis

    def ei_ratio_in(self, direction: str) -> float:
        """Hollow over plan E·I in one direction (:data:`FORE_AFT` or :data:`ATHWARTSHIPS`)."""
        return self.hollow.ei_in(direction) / self.plan.ei_in(direction)

    def strength_ratio_in(self, direction: str) -> float:
        return self.hollow.moment_in(direction) / self.plan.moment_in(direction)

    @property
    def ei_ratio(self) -> float:
        """The EI ratio; for a section that is not round (hollow or plan) the lesser of the two directions'."""
        if not self.two_axis:
            return self.hollow.ei / self.plan.ei
        return min(self.ei_ratio_in(d) for d in DIRECTIONS)

    @property
    def strength_ratio(self) -> float:
        if not self.two_axis:
            return self.hollow.moment_capacity / self.plan.moment_capacity
        return min(self.strength_ratio_in(d) for d in DIRECTIONS)

    def ei_ok_in(self, direction: str) -> bool:
        return meets(self.ei_ratio_in(direction), self.ei_target)

    def strength_ok_in(self, direction: str) -> bool:
        return meets(self.strength_ratio_in(direction), self.strength_target)

    @property
    def ei_ok(self) -> bool:
        return meets(self.ei_ratio, self.ei_target)

    @property
    def strength_ok(self) -> bool:
        return meets(self.strength_ratio, self.strength_target)

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
        plan=(solid_round(spar, station.plan_diameter) if spar.plan.shape == "round"
              else plan_stiffness(spar, station.z)),
        hollow=(hollow_oval(spar, station.section, station.plug, station.z) if spar.hollow.two_axis
                else hollow_round(spar, regions_of(spar, station))),
        ei_target=ei_target,
        strength_target=strength_target,
    )
