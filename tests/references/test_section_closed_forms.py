"""Section properties against the closed forms of the mechanics handbooks.

Reference: Roark's Formulas for Stress and Strain, table of properties of
plane sections: solid and hollow round I = π (D⁴ − d⁴) / 64; regular N-gon of
apothem a, side s = 2 a tan(π/N), area A = N s a / 2, I = A (12 a² + s²) / 48.
"""

import math

import pytest

from stavegen.model.spar import Joint
from stavegen.section.integrals import disc_moments, ring_in_disc_moments, ring_moments
from stavegen.section.properties import bore_ring, evaluate_section


def ngon_inertia(n: int, apothem: float) -> float:
    """Roark: regular polygon about a centroidal axis."""
    s = 2 * apothem * math.tan(math.pi / n)
    area = n * s * apothem / 2
    return area * (12 * apothem**2 + s**2) / 48


def test_solid_round_common_practice_figure():
    """Common practice (a builder's figure): a solid round 4.75 in across has I ≈ 25.0 in⁴."""
    d = 4.75
    assert math.pi * d**4 / 64 == pytest.approx(25.0, abs=0.05)
    # The same through the exact disc integrator.
    assert disc_moments(d / 2).ixx == pytest.approx(25.0, abs=0.05)


def test_hollow_round_from_the_integrator():
    """A square ring clipped by two circles: π (D⁴ − d⁴)/64 (Roark, hollow circle)."""
    square = [(-100, -100), (100, -100), (100, 100), (-100, 100)]
    outer = ring_in_disc_moments(square, 60)
    inner = ring_in_disc_moments(square, 35)
    assert (outer - inner).ixx == pytest.approx(math.pi * (120**4 - 70**4) / 64, rel=1e-12)
    assert (outer - inner).iyy == pytest.approx(math.pi * (120**4 - 70**4) / 64, rel=1e-12)
    assert (outer - inner).area == pytest.approx(math.pi * (60**2 - 35**2), rel=1e-12)


@pytest.mark.parametrize("n", [4, 5, 6, 8, 12, 16, 24])
def test_regular_polygon(n):
    m = ring_moments(bore_ring(n, 37.0))
    assert m.ixx == pytest.approx(ngon_inertia(n, 37.0), rel=1e-12)
    assert m.iyy == pytest.approx(ngon_inertia(n, 37.0), rel=1e-12)
    assert abs(m.ixy) < 1e-6 * m.ixx


@pytest.mark.parametrize("n", [6, 8, 12, 16])
@pytest.mark.parametrize("radius, wall, allowance", [(60.0, 15.0, 1.5), (38.1, 19.05, 1.5875), (120.0, 20.0, 0.0)])
def test_flush_equals_disc_minus_bore_polygon(n, radius, wall, allowance):
    """Flush birdsmouth: I = π R⁴/4 − I_Ngon(a_i) while the round does not cut the bore."""
    sec = evaluate_section(n, Joint("birdsmouth-flush"), radius, wall, allowance)
    a_i = radius + allowance - wall
    expected = math.pi * radius**4 / 4 - ngon_inertia(n, a_i)
    assert sec.inertia == pytest.approx(expected, rel=1e-9)
    assert sec.void_area == 0.0


@pytest.mark.parametrize("n, wall", [(5, 20.0), (6, 12.0), (8, 12.0), (12, 12.0), (16, 12.0), (24, 12.0)])
def test_flush_width_is_the_outer_polygon_side(n, wall):
    """Flush staves' outer faces form a perfect N-gon: w = 2 a_o tan(π/N)."""
    sec = evaluate_section(n, Joint("birdsmouth-flush"), 50.0, wall, 1.5)
    assert sec.stave_width == pytest.approx(2 * 51.5 * math.tan(math.pi / n), rel=1e-12, abs=1e-12)


@pytest.mark.parametrize("n", [6, 8, 12, 16])
def test_bevel_staves_same_section_as_flush(n):
    """Plain bevel staves also make outer N-gon minus bore N-gon: same I as flush."""
    flush = evaluate_section(n, Joint("birdsmouth-flush"), 50.0, 12.0, 1.5)
    bevel = evaluate_section(n, Joint("bevel"), 50.0, 12.0, 1.5)
    assert bevel.inertia == pytest.approx(flush.inertia, rel=1e-12)
    assert bevel.bevel_angle == pytest.approx(180 / n)


def test_centered_presets():
    """Centred notch: N = 8 is a symmetric 45°/45° V with no voids; N = 12 and 16 leave voids."""
    eight = evaluate_section(8, Joint("birdsmouth-centered"), 50.0, 12.0, 1.5)
    assert eight.notch.depth == pytest.approx(6.0)
    assert eight.notch.apex_height == pytest.approx(6.0)
    assert eight.void_area == 0.0
    assert eight.v_face_angles == (45.0, 45.0)
    for n in (12, 16):
        sec = evaluate_section(n, Joint("birdsmouth-centered"), 50.0, 12.0, 1.5)
        assert sec.void_area > 1.0
        # I = I_disc − I_bore − I_voids holds with the measured voids.
        assert sec.inertia == pytest.approx(
            math.pi * 50**4 / 4 - ngon_inertia(n, 39.5) - sec.voids.polar / 2, rel=1e-9)


def test_four_staves_take_a_mitred_box_not_a_birdsmouth():
    from stavegen.errors import DesignError

    with pytest.raises(DesignError) as err:
        evaluate_section(4, Joint("birdsmouth-flush"), 50.0, 30.0, 1.5)
    assert err.value.key == "hollow.joint"
    box = evaluate_section(4, Joint("bevel"), 50.0, 30.0, 1.5)
    assert box.bevel_angle == 45.0
    assert box.inertia == pytest.approx(math.pi * 50**4 / 4 - ngon_inertia(4, 21.5), rel=1e-9)


def test_v_face_angles():
    """The V is 90°: one face at φ = 360°/N to the broad face, the other at 90° − φ."""
    assert evaluate_section(6, Joint("birdsmouth-flush"), 50.0, 12.0, 1.5).v_face_angles == (60.0, 30.0)
    assert evaluate_section(8, Joint("birdsmouth-flush"), 50.0, 12.0, 1.5).v_face_angles == (45.0, 45.0)


def test_closure_relation_places_neighbour_corner_on_apex():
    """w = h + 2 tan(π/N)(a_i + f t/2): the neighbour's inner corner, turned by φ, is the apex."""
    for kind in ("birdsmouth-flush", "birdsmouth-centered"):
        for n in (6, 8, 10, 12, 16):
            sec = evaluate_section(n, Joint(kind), 45.0, 11.0, 1.0)
            phi = 2 * math.pi / n
            corner = (sec.frame.x_square_edge, sec.frame.inner)
            turned = (corner[0] * math.cos(phi) - corner[1] * math.sin(phi),
                      corner[0] * math.sin(phi) + corner[1] * math.cos(phi))
            assert turned == pytest.approx(sec.frame.apex, abs=1e-9)
            f, h, t, a_i = sec.notch.apex_fraction, sec.notch.depth, 11.0, sec.inner_apothem
            assert sec.stave_width == pytest.approx(h + 2 * math.tan(math.pi / n) * (a_i + f * t / 2), rel=1e-12)
