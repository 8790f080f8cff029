"""Whole-spar figures against textbook closed forms and an independent ODE solve.

References:
- Cantilever with an end load: δ = F L³ / (3 E I) (Roark's Formulas for Stress and Strain, beam tables).
- Fixed–free column: P = π² E I / (4 L²) (Timoshenko & Gere, Theory of Elastic Stability).
- Centroid of a frustum of a cone of radii r0, r1 and length L, from the wide end:
  L (r0² + 2 r0 r1 + 3 r1²) / (4 (r0² + r0 r1 + r1²)) (any statics text, centroids of solids).
- The tapered flagpole's Euler load against scipy's solve_ivp shooting with brentq on the same EI(z).
"""

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from stavegen.checks.assess import assess
from stavegen.checks.beam import euler_load, tip_deflection

from conftest import make_spar


def test_uniform_spar_closed_forms():
    spar = make_spar()
    result = assess(spar)
    section = result.stations[0].station.section
    ei_hollow = spar.hollow.wood.moe * section.inertia
    ei_plan = spar.plan.wood.moe * math.pi * 100**4 / 64
    L = 3000.0
    for figures, ei in ((result.hollow, ei_hollow), (result.plan, ei_plan)):
        assert figures.tip_deflection == pytest.approx(result.head_load * L**3 / (3 * ei), rel=1e-3)
        assert figures.euler_load == pytest.approx(math.pi**2 * ei / (4 * L**2), rel=1e-3)
        assert figures.mass.centre == pytest.approx(L / 2, rel=1e-9)
        # Head stiffness, load over deflection: 3 E I / L³ whatever the load.
        assert figures.head_stiffness == pytest.approx(3 * ei / L**3, rel=1e-3)
    rho = spar.hollow.wood.density * 1e-9
    assert result.hollow.mass.mass == pytest.approx(rho * section.area * L, rel=1e-9)
    assert result.plan.mass.mass == pytest.approx(rho * math.pi * 50**2 * L, rel=1e-9)


def test_tapered_plan_mass_and_centre_of_a_frustum():
    spar = make_spar(plan={"stations": [[0, 120], [3000, 60]]},
                     hollow={"stations": [[0, 120], [3000, 60]], "wall": 15})
    result = assess(spar)
    r0, r1, L = 60.0, 30.0, 3000.0
    volume = math.pi * L / 3 * (r0**2 + r0 * r1 + r1**2)
    assert result.plan.mass.mass == pytest.approx(spar.plan.wood.density * 1e-9 * volume, rel=1e-6)
    centre = L * (r0**2 + 2 * r0 * r1 + 3 * r1**2) / (4 * (r0**2 + r0 * r1 + r1**2))
    assert result.plan.mass.centre == pytest.approx(centre, rel=1e-6)


def _shooting_euler_load(ei, length):
    """Independent: u'' = −P u / EI(z), u(0) = 1, u'(0) = 0; P is the first root of u(L)."""
    def head(p):
        sol = solve_ivp(lambda z, y: [y[1], -p * y[0] / ei(z)], (0, length), [1.0, 0.0],
                        rtol=1e-10, atol=1e-12)
        return sol.y[0, -1]
    guess = math.pi**2 * ei(length / 2) / (4 * length**2)
    lo, hi = guess / 20, guess / 20
    while head(hi) > 0:
        lo, hi = hi, hi * 1.3
    return brentq(head, lo, hi, xtol=1e-10, rtol=1e-12)


def test_tapered_euler_load_against_ode_shooting():
    """A linearly tapered round, EI ∝ D⁴: the eigenvalue solve agrees with shooting."""
    length, e = 4000.0, 10000.0

    def ei(z):
        d = 110 - 50 * z / length
        return e * math.pi * d**4 / 64

    z = np.linspace(0, length, 41)
    stretches = [(a, (a + b) / 2, b) for a, b in zip(z, z[1:])]
    values = [tuple(ei(x) for x in s) for s in stretches]
    ours = euler_load(stretches, values, length)
    assert ours == pytest.approx(_shooting_euler_load(ei, length), rel=1e-3)
    # Deflection by direct quadrature of the virtual-work integral.
    fine = np.linspace(0, length, 20001)
    direct = np.trapezoid(1000 * (length - fine) ** 2 / np.array([ei(x) for x in fine]), fine)
    assert tip_deflection(stretches, values, length, 1000) == pytest.approx(direct, rel=1e-4)


def test_plug_raises_stiffness_where_it_is():
    bare = assess(make_spar())
    plugged = assess(make_spar(hollow={"plug": [{"from": 0, "to": 600}]}))
    at_heel = plugged.stations[0]
    assert at_heel.station.plug is not None
    sec = at_heel.station.section
    wood = make_spar().hollow.wood
    assert at_heel.hollow.ei == pytest.approx(wood.moe * (sec.inertia + sec.bore_inertia), rel=1e-12)
    assert plugged.hollow.mass.mass > bare.hollow.mass.mass
    mid = [c for c in plugged.stations if c.station.z > 700][0]
    assert mid.ei_ratio == pytest.approx(bare.stations[-1].ei_ratio, rel=1e-12)


def test_head_load_from_the_file_scales_deflection_only():
    """A named head load: deflection in proportion (δ = F L³ / 3EI), the ratios and the head stiffness unchanged."""
    base = assess(make_spar())
    named = assess(make_spar(spar={"head_load": "500 N"}))
    assert named.head_load == 500.0
    assert named.hollow.tip_deflection == pytest.approx(500.0 / base.head_load * base.hollow.tip_deflection,
                                                        rel=1e-12)
    assert named.hollow.head_stiffness == pytest.approx(base.hollow.head_stiffness, rel=1e-12)
    assert named.compared("deflection") == pytest.approx(base.compared("deflection"), rel=1e-12)
