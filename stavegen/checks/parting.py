"""The joint of a two-piece spar, checked from first principles; the verdict at the joint is decided here.

The moment the joint must carry is the one that breaks the plan's solid spar at the parting,
M = MOR·S·F of the plan's round there (:func:`~stavegen.checks.ratios.solid_round`): the joint is then "as
strong as the plan" at that station, with no rig load guessed. Three checks, each with its inputs kept:

1. **The spigot alone** (or the sleeve alone) carries M across the butt, where neither part's wall does:
   its E·I at least the plan's there (times 1 + margin), and its moment capacity at least M (times the
   file's strength target). Beam theory: E·I of the member's own section, I of a regular N-gon
   A(12a² + s²)/48 (Roark, table of section properties), of a tube π(D⁴ − d⁴)/64; the capacity of wood
   MOR·S·F with the form factor of :func:`~stavegen.checks.ratios.form_factor`, of a tube its yield
   stress times S = I/(D/2) (no form factor: a metal tube that yields stays bent).
2. **Bearing**: the moment passes to the bore (or, for a sleeve, to the spar's outside) as a pair of
   forces over the overlap L. Taking the pressure linear along the overlap, from +p at one end to −p at
   the other (a rigid member in an elastic bed, as for a dowel or a short pile: Winkler's model),
   M = p·d·L²/6, so the peak is p = 6M/(d·L²), d the width it bears across. A loose fit first turns
   through its clearance and then bears near the two ends; the same resultant pair, M/L at each end, is
   reported as the force. The peak stays below the wood's compression perpendicular to grain (Wood
   Handbook FPL-GTR-282, table 5-3a, proportional limit; the figures in data/woods.toml are from memory —
   verify), of the softer of the two woods that touch.
3. **Kink**: a radial clearance c over the overlap L lets the head part turn by about 2c/L radians before
   the spigot bears: reported, in degrees (it needs no verdict of its own; a large one is warned of).

Common practice, no published rule: the overlap is 2 to 4 diameters of the spar at the parting. A file
that leaves it out gets the least overlap in that bracket that keeps the bearing allowable (the closed form
L = √(6M/(d·p_allow)) rounded up onto the builder's grid), or 4 diameters when none does.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from shapely import affinity
from shapely.geometry import Polygon, box

from ..model.spar import OVERLAP_DIAMETERS, Parting, Profile, Spar
from ..section.integrals import ring_moments
from ..section.properties import bore_ring
from ..stations.evaluate import SectionCache
from ..units import Way, format_length, system
from .ratios import ROUND_FORM_FACTOR, Stiffness, form_factor, meets, solid_round, targets, within

KINK_WARNED_DEG = 1.0  # a head part that can lean a degree at the joint is visibly crooked (common practice)


@dataclass(frozen=True)
class Spigot:
    """The member that carries the moment across the butt alone: a wooden spigot, a tube or a sleeve.

    ``inertia`` mm⁴, ``ei`` N·mm², ``moment_capacity`` N·mm; ``bearing_width`` (mm) the width d the
    bearing pressure acts across; ``outside``/``inside`` its outside size and its bore (mm, across the
    flats for a wooden spigot, 0 for a solid one); ``ring`` the section's outline at the butt (a wooden
    spigot's polygon, mm about the spar's axis; empty for a round).
    """

    kind: str
    words: str
    inertia: float
    ei: float
    moment_capacity: float
    bearing_width: float
    outside: float
    inside: float = 0.0
    ring: tuple[tuple[float, float], ...] = ()


def polygon_spigot(wood, staves: int, apothem: float) -> Spigot:
    """A solid wooden spigot, the regular N-gon of ``apothem`` (the bore's less the clearance).

    I from the exact polygon integral (equal to A(12a² + s²)/48); S = I over the farthest fibre and Z the
    plastic modulus, each for the two symmetric orientations, the weaker kept.
    """
    ring = tuple(bore_ring(staves, apothem))
    inertia = ring_moments(ring).polar / 2
    capacity = min(_polygon_capacity(Polygon(ring), inertia, turn, wood.mor) for turn in (0.0, math.pi / staves))
    return Spigot(kind="wood-spigot", words=f"{wood.name} spigot", inertia=inertia,
                  ei=wood.moe * inertia, moment_capacity=capacity, bearing_width=2 * apothem, outside=2 * apothem,
                  ring=ring)


def _polygon_capacity(poly: Polygon, inertia: float, turn: float, mor: float) -> float:
    turned = affinity.rotate(poly, -turn, origin=(0, 0), use_radians=True)
    _, ymin, _, ymax = turned.bounds
    half = turned.intersection(box(-1e9, 0.0, 1e9, 1e9))
    plastic = 2 * half.area * half.centroid.y  # ∫|y| dA over both halves (the N-gon is symmetric about y = 0)
    elastic = inertia / max(ymax, -ymin)
    return mor * elastic * form_factor(plastic / elastic)


def round_spigot(wood, diameter: float) -> Spigot:
    """A solid round wooden spigot: I = πD⁴/64, capacity MOR·πD³/32·F with the round's form factor."""
    inertia = math.pi * diameter**4 / 64
    return Spigot(kind="wood-spigot", words=f"{wood.name} round spigot", inertia=inertia, ei=wood.moe * inertia,
                  moment_capacity=wood.mor * math.pi * diameter**3 / 32 * ROUND_FORM_FACTOR,
                  bearing_width=diameter, outside=diameter)


def tube(material, outside: float, inside: float, bears_on: float, kind: str = "tube-spigot") -> Spigot:
    """A tube: I = π(D⁴ − d⁴)/64, capacity strength·I/(D/2). ``bears_on`` is the width d it presses across."""
    inertia = math.pi * (outside**4 - inside**4) / 64
    what = "sleeve" if kind == "sleeve" else "tube"
    return Spigot(kind=kind, words=f"{material.name} {what}", inertia=inertia, ei=material.moe * inertia,
                  moment_capacity=material.strength * inertia / (outside / 2), bearing_width=bears_on,
                  outside=outside, inside=inside)


def bearing_pressure(moment: float, width: float, overlap: float) -> float:
    """Peak pressure (N/mm²) of a moment passed over ``overlap`` as a linear pressure: 6M/(d·L²)."""
    return 6 * moment / (width * overlap**2)


def kink_angle(clearance: float, overlap: float) -> float:
    """The turn (radians) a clearance c all round allows a member over the overlap L: 2c/L."""
    return 2 * clearance / overlap


@dataclass(frozen=True)
class JointCheck:
    """The joint at a parting, with every input of its checks and the verdict of each.

    Positions and lengths mm, moments N·mm, E·I N·mm², pressures N/mm². ``spar_diameter`` is the hollow
    spar's at the parting; ``bore`` its bore across the flats there; ``problem`` a reason the joint cannot be
    made as given (a tube too big for the bore, a plug in the spigot's way), or "".
    """

    parting: Parting
    at: float
    overlap: float
    overlap_chosen: bool
    clearance: float
    spar_diameter: float
    bore: float
    staves: int
    plan: Stiffness
    spigot: Spigot
    bearing_allowable: float
    bearing_wood: str
    ei_target: float = 1.0
    strength_target: float = 1.0
    problem: str = ""
    units: str = "mm"

    @property
    def kind(self) -> str:
        return self.parting.kind

    @property
    def moment(self) -> float:
        """The moment that breaks the plan's solid spar at the parting (MOR·S·F), N·mm."""
        return self.plan.moment_capacity

    @property
    def force(self) -> float:
        """Each force of the pair that passes the moment to the bore, M/L (N)."""
        return self.moment / self.overlap

    @property
    def bearing(self) -> float:
        return bearing_pressure(self.moment, self.spigot.bearing_width, self.overlap)

    @property
    def kink(self) -> float:
        return kink_angle(self.clearance, self.overlap)

    @property
    def kink_deg(self) -> float:
        return math.degrees(self.kink)

    @property
    def ei_ratio(self) -> float:
        return self.spigot.ei / self.plan.ei

    @property
    def strength_ratio(self) -> float:
        return self.spigot.moment_capacity / self.moment

    @property
    def bearing_ratio(self) -> float:
        """Bearing pressure over the allowable: 1 or less passes."""
        return self.bearing / self.bearing_allowable

    @property
    def ei_ok(self) -> bool:
        return meets(self.ei_ratio, self.ei_target)

    @property
    def strength_ok(self) -> bool:
        return meets(self.strength_ratio, self.strength_target)

    @property
    def bearing_ok(self) -> bool:
        return within(self.bearing, self.bearing_allowable)

    @property
    def passed(self) -> bool:
        return not self.problem and self.ei_ok and self.strength_ok and self.bearing_ok

    @property
    def glued(self) -> tuple[float, float]:
        """Where the spigot is glued into the heel part (a sleeve: where it covers the heel part), z mm."""
        return self.at - self.overlap, self.at

    @property
    def sliding(self) -> tuple[float, float]:
        """Where the head part slides over the spigot (or into the sleeve), z mm."""
        return self.at, self.at + self.overlap

    @property
    def binding(self) -> str:
        """The check closest to failing (or failing most): "stiffness", "strength" or "bearing"."""
        margins = {"stiffness": self.ei_ratio / self.ei_target, "strength": self.strength_ratio / self.strength_target,
                   "bearing": 1 / self.bearing_ratio}
        return min(margins, key=margins.get)

    def reasons(self) -> list[str]:
        """One line for each check the joint fails, with its figures, in the spar's units."""
        u = system(self.units)
        here = f"joint at {format_length(self.at, self.units, tape=True)} from the heel"
        out = []
        if self.problem:
            out.append(f"{here}: {self.problem}")
        if not self.ei_ok:
            out.append(f"{here}: the {self.spigot.words}'s E·I is {self.ei_ratio:.3f} of the plan's there "
                       f"(target {self.ei_target:.3f})")
        if not self.strength_ok:
            out.append(f"{here}: the {self.spigot.words} carries {self.strength_ratio:.3f} of the moment that breaks "
                       f"the plan's spar there (target {self.strength_target:.3f})")
        if not self.bearing_ok:
            out.append(f"{here}: bearing pressure {u.stress(self.bearing)} over a {u.length(self.overlap)} overlap is "
                       f"above {u.stress(self.bearing_allowable)}, the {self.bearing_wood}'s strength across the grain")
        return out

    def warnings(self) -> list[str]:
        if self.kink_deg > KINK_WARNED_DEG:
            return [f"joint at {format_length(self.at, self.units, tape=True)} from the heel: the clearance lets the "
                    f"head part lean {self.kink_deg:.2f}° before the spigot bears; fit it closer"]
        return []


def check_joints(spar: Spar, cache: SectionCache | None = None) -> tuple[JointCheck, ...]:
    """The joint of the resolved spar's parting (none for a one-piece spar)."""
    parting = spar.parting
    if parting is None:
        return ()
    cache = cache or SectionCache(spar)
    return (check_joint(spar, parting, cache),)


def _fit_room(spar: Spar, cache: SectionCache, lo: float, hi: float) -> float:
    """The narrowest bore across the flats (mm) between z = lo and hi (the bore is linear between knots)."""
    knots = {lo, hi} | {z for z in spar.hollow.diameter.z if lo < z < hi}
    if isinstance(spar.hollow.wall, Profile):
        knots |= {z for z in spar.hollow.wall.z if lo < z < hi}
    return min(2 * cache.at(z).inner_apothem for z in knots)


def _member(spar: Spar, parting: Parting, cache: SectionCache, at: float) -> tuple[Spigot, str]:
    """The member carrying the moment across the butt, and why it cannot be made ("" when it can)."""
    section = cache.at(at)
    c = parting.clearance
    u = system(spar.units)
    if parting.kind == "wood-spigot":
        apothem = section.inner_apothem - c
        if apothem <= 0:
            return round_spigot(parting.wood, 1e-6), f"the clearance {u.length(c)} leaves no spigot in the bore"
        return polygon_spigot(parting.wood, spar.hollow.staves, apothem), ""
    if parting.kind == "tube-spigot":
        od = parting.outside_diameter
        return tube(parting.material, od, od - 2 * parting.wall, od), ""
    d = float(spar.hollow.diameter.at(at))
    inside = d + 2 * c
    return tube(parting.material, inside + 2 * parting.wall, inside, d, kind="sleeve"), ""


def chosen_overlap(spar: Spar, moment: float, width: float, allowable: float, diameter: float) -> float:
    """The overlap the rule gives: the least of 2 to 4 diameters keeping 6M/(d·L²) within the allowable."""
    low, high = (k * diameter for k in OVERLAP_DIAMETERS)
    needed = math.sqrt(6 * moment / (width * allowable))
    return system(spar.units).on_grid(min(max(needed, low), high), Way.UP)


def check_joint(spar: Spar, parting: Parting, cache: SectionCache) -> JointCheck:
    at = parting.at
    plan = solid_round(spar, float(spar.plan.diameter.at(at)))
    diameter = float(spar.hollow.diameter.at(at))
    woods = [spar.hollow.wood] + ([parting.wood] if parting.kind == "wood-spigot" else [])
    softest = min(woods, key=lambda w: w.compression_perp)
    allowable = softest.compression_perp
    spigot, problem = _member(spar, parting, cache, at)
    u = system(spar.units)
    overlap, chosen = parting.overlap, parting.overlap is None
    if chosen:
        overlap = chosen_overlap(spar, plan.moment_capacity, spigot.bearing_width, allowable, diameter)
        room = min(at, spar.length - at) - 1.0  # the overlap ends inside the spar
        if overlap >= room:
            overlap = u.on_grid(room, Way.DOWN)
            problem = problem or (f"the spar leaves room for an overlap of only {u.length(overlap)} beside the "
                                  "parting")
    if not problem and parting.kind == "tube-spigot":
        room = _fit_room(spar, cache, at - overlap, at + overlap)
        if spigot.outside + 2 * parting.clearance >= room:
            problem = (f"the tube ({u.length(spigot.outside)} across, {u.length(parting.clearance)} clearance) does "
                       f"not fit the bore ({u.length(room)} across the flats where it is narrowest)")
    if not problem and parting.kind != "sleeve":
        for i, plug in enumerate(spar.hollow.plugs, start=1):
            if plug.start < at + overlap and plug.end > at - overlap:
                problem = f"plug {i} fills the bore where the spigot goes"
                break
    ei_target, strength_target = targets(spar)
    return JointCheck(parting=parting, at=at, overlap=overlap, overlap_chosen=chosen, clearance=parting.clearance,
                      spar_diameter=diameter, bore=2 * cache.at(at).inner_apothem, staves=spar.hollow.staves,
                      plan=plan, spigot=spigot, bearing_allowable=allowable, bearing_wood=softest.name,
                      ei_target=ei_target, strength_target=strength_target, problem=problem, units=spar.units)
