"""A cross-section as a set of material regions: staves, plugs, sheathing layers, reinforcement strips.

Every region is a shapely geometry with a material (a :class:`~stavegen.model.woods.Wood` or a
:class:`~stavegen.model.materials.Laminate`: anything with ``key``, ``name``, ``moe``, ``strength``
and ``density``) and a kind (:data:`KINDS`). Its integrals (:class:`~.integrals.Moments`, about the
spar's axis at the origin) are carried exactly: the staves clipped by the true round come from
:mod:`.integrals`, not from a faceted polygon; the geometry is made only when something draws or
measures it.

This is the one place the section's stiffness, strength and weight are computed (transformed
section; Gere & Goodno, Mechanics of Materials, composite beams):

- neutral axis through the modulus-weighted centroid, ȳ = Σ Eᵢ Qᵢ / Σ Eᵢ Aᵢ;
- E·I = Σ Eᵢ Iᵢ, each Iᵢ about that axis (parallel axes);
- weight per length = Σ ρᵢ Aᵢ;
- the moment at which the first material reaches its limit, M = minᵢ σᵢ · EI / (Eᵢ cᵢ), with cᵢ the
  farthest fibre of region i from the neutral axis; for wood (whose modulus of rupture comes from
  rectangular test beams) times the form factor of the wood's own shape (:mod:`stavegen.checks.ratios`).

Eᵢ for stiffness is the material's modulus times the lamination credit where the file gives one
(staves only); strength uses the materials' own moduli (the credit is a stiffness credit, as before).
With every region of one wood this gives the figures of the single-wood section to roundoff.
Units: mm, N, N/mm², kg/m³; E·I in N·mm², moments in N·mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property
from typing import Any, Callable, Iterable

from shapely.geometry.base import BaseGeometry

from .integrals import Moments, polygon_in_disc_moments

STAVE, PLUG, LAYER, STRIP = "stave", "plug", "layer", "strip"
KINDS = (STAVE, PLUG, LAYER, STRIP)


def is_wood(material: Any) -> bool:
    """Whether a material is a wood (rated by modulus of rupture, so the bending form factor applies)."""
    return getattr(material, "family", "wood") == "wood"


@dataclass(frozen=True)
class Region:
    """One material region of a section.

    ``moments``: exact integrals about the spar's axis (mm², mm³, mm⁴). ``reach``: the farthest any of
    its points lies from the axis (mm). ``modulus``: the E it is credited with in stiffness (N/mm²; the
    material's, times the lamination credit for staves). ``plastic``: ∫|y| dA about the diameter the
    section is weakest about (mm³), for the form factor (wood regions). ``shape``: its shapely geometry,
    or a function that makes it (geometries are made only when asked for, by :attr:`geometry`).
    ``label`` tells layers apart ("layer 1"), ``pieces`` how many separate pieces it is (staves, strips).
    """

    kind: str
    material: Any
    moments: Moments
    reach: float
    modulus: float
    plastic: float = 0.0
    shape: BaseGeometry | Callable[[], BaseGeometry] | None = field(default=None, compare=False, repr=False)
    label: str = ""
    pieces: int = 1

    @property
    def geometry(self) -> BaseGeometry | None:
        """The region as a shapely geometry (mm), made on first use."""
        shape = self.shape
        if callable(shape):
            made = shape()
            object.__setattr__(self, "shape", made)
            return made
        return shape

    @property
    def area(self) -> float:
        return self.moments.area

    @property
    def is_wood(self) -> bool:
        return is_wood(self.material)

    @classmethod
    def from_geometry(cls, kind: str, material: Any, geometry: BaseGeometry, modulus: float | None = None,
                      label: str = "", radius: float | None = None) -> "Region":
        """A region from a polygon or multipolygon (mm), its integrals exact for the polygon (clipped by the
        disc of ``radius`` about the axis when given). ``plastic`` is left 0: the form factor reads only
        the section's wood regions, and builders of wood regions of other shapes set it themselves."""
        from shapely.geometry.polygon import orient

        parts = [orient(g, 1.0) for g in getattr(geometry, "geoms", [geometry]) if not g.is_empty]
        rings = [list(r.coords)[:-1] for g in parts for r in (g.exterior, *g.interiors)]
        moments = polygon_in_disc_moments(rings, radius)
        reach = max((math.hypot(x, y) for g in parts for x, y in g.exterior.coords), default=0.0)
        if radius is not None:
            reach = min(reach, radius)
        return cls(kind=kind, material=material, moments=moments, reach=reach,
                   modulus=material.moe if modulus is None else modulus, shape=geometry, label=label,
                   pieces=len(parts))


@dataclass(frozen=True)
class Limit:
    """The bending moment (N·mm) at which one region reaches its material's limit, and the form factor in it."""

    region: Region
    moment: float
    form_factor: float = 1.0


@dataclass(frozen=True)
class RegionSection:
    """A section as a set of regions; every figure of stiffness, strength and weight read from here.

    ``reference`` is the modulus (N/mm²) transformed figures are given in (the staves' wood).
    """

    regions: tuple[Region, ...]
    reference: float

    def of_kind(self, kind: str) -> tuple[Region, ...]:
        return tuple(r for r in self.regions if r.kind == kind)

    @cached_property
    def axial(self) -> float:
        """Σ Eᵢ Aᵢ, N."""
        return sum(r.modulus * r.moments.area for r in self.regions)

    @cached_property
    def centroid(self) -> tuple[float, float]:
        """The modulus-weighted centroid (mm from the axis): where the neutral axis passes."""
        ea = self.axial
        if ea <= 0:
            return 0.0, 0.0
        return (sum(r.modulus * r.moments.qx for r in self.regions) / ea,
                sum(r.modulus * r.moments.qy for r in self.regions) / ea)

    def inertia_of(self, region: Region) -> float:
        """Second moment (mm⁴) of ``region`` about the section's neutral axis (horizontal, through the centroid)."""
        m = region.moments
        y = self.centroid[1]
        if y == 0.0:
            return m.ixx
        return m.ixx - 2 * y * m.qy + y * y * m.area

    def inertia_y_of(self, region: Region) -> float:
        """Second moment (mm⁴) of ``region`` about the vertical axis through the centroid."""
        m = region.moments
        x = self.centroid[0]
        if x == 0.0:
            return m.iyy
        return m.iyy - 2 * x * m.qx + x * x * m.area

    def ei_of(self, region: Region) -> float:
        """What ``region`` adds to the section's E·I (N·mm²)."""
        return region.modulus * self.inertia_of(region)

    @cached_property
    def ei(self) -> float:
        """E·I about the horizontal neutral axis, N·mm² (the transformed section's)."""
        return sum(self.ei_of(r) for r in self.regions)

    @cached_property
    def ei_y(self) -> float:
        """E·I about the vertical axis through the centroid, N·mm²."""
        return sum(r.modulus * self.inertia_y_of(r) for r in self.regions)

    @property
    def inertia(self) -> float:
        """The transformed second moment in the reference modulus, mm⁴."""
        return self.ei / self.reference

    @cached_property
    def mass_per_length(self) -> float:
        """kg per mm of spar: Σ ρᵢ Aᵢ."""
        return sum(r.material.density * 1e-9 * r.moments.area for r in self.regions)

    def mass_of(self, region: Region) -> float:
        return region.material.density * 1e-9 * region.moments.area

    @property
    def area(self) -> float:
        return sum(r.moments.area for r in self.regions)

    @property
    def outer_reach(self) -> float:
        return max((r.reach for r in self.regions), default=0.0)

    @cached_property
    def strength_ei(self) -> float:
        """E·I with each material's own modulus (no lamination credit), N·mm²: strains for the strength check."""
        return sum(r.material.moe * self.inertia_of(r) for r in self.regions)

    def fibre(self, region: Region) -> float:
        """Farthest fibre of ``region`` from the neutral axis (mm); bounded by its reach from the axis."""
        return region.reach + math.hypot(*self.centroid)

    def limits(self, form_factor: Callable[["RegionSection"], float] | None = None) -> tuple[Limit, ...]:
        """For every region, the bending moment at which its material reaches its strength: σ·EI/(E·c).

        ``form_factor`` (a function of this section) gives the factor wood regions are credited with.
        """
        wood_factor = form_factor(self) if form_factor is not None else 1.0
        out = []
        for r in self.regions:
            c = self.fibre(r)
            if c <= 0 or r.material.moe <= 0 or r.moments.area <= 0:
                continue
            factor = wood_factor if r.is_wood else 1.0
            out.append(Limit(r, r.material.strength * self.strength_ei / (r.material.moe * c) * factor, factor))
        return tuple(out)

    def first_limit(self, form_factor: Callable[["RegionSection"], float] | None = None) -> Limit:
        """The region whose material reaches its limit first, and the moment then (N·mm)."""
        return min(self.limits(form_factor), key=lambda limit: limit.moment)

    def wood_shape_factor(self) -> float:
        """Plastic over elastic section modulus, Z/S, of the wood regions transformed to the reference wood
        (the staves' modulus), elastic modulus at the wood's farthest fibre: the shape the form factor reads."""
        wood = [r for r in self.regions if r.is_wood]
        ref = next((r.material.moe for r in wood if r.kind == STAVE), self.reference)
        plastic = sum(r.material.moe / ref * r.plastic for r in wood)
        inertia = sum(r.material.moe / ref * self.inertia_of(r) for r in wood)
        reach = max(self.fibre(r) for r in wood)
        return plastic / (inertia / reach)


def isotropic(m: Moments) -> Moments:
    """The same region's integrals for a shape of N-fold symmetry (N ≥ 3) about the axis: I = J/2 about any
    diameter, centroid on the axis (so roundoff does not make a round section prefer a direction)."""
    half = m.polar / 2
    return Moments(m.area, 0.0, 0.0, half, half, 0.0)


def section_of(regions: Iterable[Region], reference: float) -> RegionSection:
    return RegionSection(tuple(r for r in regions if r.moments.area > 0), reference)
