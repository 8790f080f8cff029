"""Whole-spar figures along a taper: mass, centre of gravity, tip deflection, Euler load.

Each figure works on a list of stretches (z0, zm, z1) with a quantity known
at the two ends and the middle of each stretch, so that a stretch never
straddles a plug end. Integrals use Simpson's rule per stretch, exact for
the quadratic integrands of a uniform spar. Units: mm, N, N·mm², kg.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

import numpy as np

Stretch = tuple[float, float, float]
Triple = tuple[float, float, float]


def simpson(stretches: Sequence[Stretch], values: Sequence[Triple]) -> float:
    """∫ f dz over all stretches, f given at (z0, zm, z1) of each."""
    return sum((z1 - z0) / 6 * (f0 + 4 * fm + f1) for (z0, _, z1), (f0, fm, f1) in zip(stretches, values))


@dataclass(frozen=True)
class MassFigures:
    """Mass (kg) and centre of gravity (mm from the heel)."""

    mass: float
    centre: float


def mass_and_centre(stretches: Sequence[Stretch], mass_per_length: Sequence[Triple]) -> MassFigures:
    """Mass ∫ m dz and centre ∫ z m dz / ∫ m dz, with m in kg/mm."""
    mass = simpson(stretches, mass_per_length)
    moment = simpson(stretches, [(m0 * z0, mm * zm, m1 * z1)
                                 for (z0, zm, z1), (m0, mm, m1) in zip(stretches, mass_per_length)])
    return MassFigures(mass=mass, centre=moment / mass if mass > 0 else 0.0)


def tip_deflection(stretches: Sequence[Stretch], ei: Sequence[Triple], length: float, load: float) -> float:
    """Head deflection (mm) of the spar held fixed at the heel under a lateral head load ``load`` (N).

    By virtual work, δ = ∫ M m / EI dz with M = F (L − z) and m = L − z;
    for a uniform spar δ = F L³ / (3 E I).
    """
    return simpson(stretches, [
        tuple(load * (length - z) ** 2 / e for z, e in zip(stretch, values))
        for stretch, values in zip(stretches, ei)
    ])


def _quadratic(stretch: Stretch, values: Triple, z: np.ndarray) -> np.ndarray:
    """The parabola through the three values of a stretch, at ``z``."""
    z0, zm, z1 = stretch
    f0, fm, f1 = values
    return (f0 * (z - zm) * (z - z1) / ((z0 - zm) * (z0 - z1))
            + fm * (z - z0) * (z - z1) / ((zm - z0) * (zm - z1))
            + f1 * (z - z0) * (z - zm) / ((z1 - z0) * (z1 - zm)))


def euler_load(stretches: Sequence[Stretch], ei: Sequence[Triple], length: float, elements: int = 2000) -> float:
    """Critical axial head load (N) of the tapered flagpole: heel fixed, head free.

    With u = δ − y, the buckled shape obeys u'' + P u / EI(z) = 0 with
    u'(0) = 0 and u(L) = 0. Linear finite elements with a lumped weight 1/EI
    give K u = P M u, whose least eigenvalue is P (:func:`least_eigenvalue`). For a uniform spar P = π² E I / (4 L²).
    """
    nodes = [0.0]
    weights = []  # ∫ 1/EI over each element, by the midpoint of the stretch's parabola
    for stretch, values in zip(stretches, ei):
        z0, _, z1 = stretch
        parts = max(1, math.ceil(elements * (z1 - z0) / length))
        edges = np.linspace(z0, z1, parts + 1)
        mids = (edges[:-1] + edges[1:]) / 2
        weights.extend((np.diff(edges) / _quadratic(stretch, values, mids)).tolist())
        nodes.extend(edges[1:].tolist())
    h = np.diff(np.asarray(nodes))
    w = np.asarray(weights)
    # Lumped "mass" (weight 1/EI) at each node; the head node is held (u = 0) and dropped.
    lumped = np.zeros(len(nodes))
    lumped[:-1] += w / 2
    lumped[1:] += w / 2
    return least_eigenvalue(h, lumped[:-1])


def least_eigenvalue(lengths: np.ndarray, weights: np.ndarray, most_steps: int = 200) -> float:
    """Least P with K u = P M u: K the stiffness of a chain of elements of ``lengths`` h (each 1/h), free at
    its first node and held at its last, M = diag(``weights``) at the nodes but the last.

    Inverse iteration (Golub & Van Loan, Matrix Computations, §8.2) needs
    K⁻¹, which for this chain is known outright: K⁻¹ᵢⱼ = Rₘ with
    m = max(i, j) and Rₘ the sum of the lengths from node m to the held end
    (the flexibility of a chain of springs), so y = K⁻¹b is two running sums,
    yᵢ = Rᵢ Σ_{j≤i} bⱼ + Σ_{j>i} Rⱼ bⱼ, every term positive for the
    one-signed first mode (nothing cancels). The eigenvalue is read off the
    Rayleigh quotient of K⁻¹M, which rises to 1/P with an error falling by
    (P₁/P₂)² a step, 1/81 for a flagpole's first two modes, until it stops
    rising but for roundoff. Linear in the number of elements, in a few
    array operations a step.
    """
    reach = np.cumsum(lengths[::-1])[::-1]
    x = np.ones(len(weights))  # the first buckling mode has one sign: no start is closer to orthogonal
    best = 0.0
    for _ in range(most_steps):
        b = weights * x
        tail = np.cumsum((reach * b)[::-1])[::-1]
        y = reach * np.cumsum(b)
        y[:-1] += tail[1:]
        quotient = float(b @ y) / float(b @ x)  # (x·M K⁻¹ M x) / (x·M x)
        x = y / float(np.max(y))
        if quotient <= best * (1 + 4 * np.finfo(float).eps):
            best = max(best, quotient)
            break
        best = quotient
    return 1 / best
