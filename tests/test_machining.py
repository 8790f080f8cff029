"""Cutter settings against geometry derived here, independently of the program.

The section model (GEOMETRY.md): φ = 360°/N; the V's inner face is at φ to
the broad face, its outer face at 90° − φ. Flush notch: h = t·sin φ,
apex f·t above the inner face with f = 1 − cos φ; the V runs from the outer
corner of the notched edge (its outer face is t long) to the inner face,
which it meets t·tan(π/N) in from the edge. Plain bevel: π/N off square.
Everything else below is trigonometry written out, or shapely used here.
"""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from stavegen.errors import DesignError
from shapely.geometry import Polygon, box

from stavegen.layout.machining import Lean, Side, cutter_settings, stave_from_passes
from stavegen.model.spar import Joint
from stavegen.section.properties import evaluate_section
from stavegen.units import format_length

from conftest import SAMPLES

RADIUS, ALLOWANCE = 60.0, 1.5
STAVES = (6, 8, 10, 12, 16)
THICKNESSES = (12.0, 18.0, 25.0)


def phi_deg(n: int) -> float:
    return 360.0 / n


def custom_joint(n: int, t: float, f: float, share: float) -> Joint:
    """A builder's own notch: apex f·t up, depth a share of the deepest the V allows, (1 − f)·t·tan φ."""
    deepest = (1 - f) * t * math.tan(math.radians(phi_deg(n)))
    return Joint("birdsmouth-custom", depth=share * deepest, apex_fraction=f)


def joints(n: int, t: float) -> list[Joint]:
    return [Joint("birdsmouth-flush"), Joint("birdsmouth-centered"), custom_joint(n, t, 0.4, 0.6),
            custom_joint(n, t, 0.7, 0.9)]


def section(n: int, joint: Joint, t: float = 18.0):
    return evaluate_section(n, joint, RADIUS, t, ALLOWANCE)


def buildable(n: int, t: float):
    """(joint, section) for each joint at N, t that can be built; a centred or custom notch whose voids
    rounding would open is refused by the section model (it names the joint or notch key) and skipped."""
    for joint in joints(n, t) + [Joint("bevel")]:
        try:
            yield joint, section(n, joint, t)
        except DesignError as exc:
            assert joint.kind in ("birdsmouth-centered", "birdsmouth-custom")
            assert exc.key in ("hollow.joint", "hollow.notch")


def blank_origin(sec) -> tuple[float, float]:
    return (sec.frame.x_notch_edge, sec.frame.inner)


# V faces --------------------------------------------------------------------------


@pytest.mark.parametrize("n, inner, outer", [(8, 45.0, 45.0), (6, 60.0, 30.0), (12, 30.0, 60.0)])
def test_v_face_angles_quoted(n, inner, outer):
    got = cutter_settings(section(n, Joint("birdsmouth-flush"))).v_face_angles
    assert got == pytest.approx((inner, outer), abs=1e-9)


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_v_face_angles_from_phi(n, k):
    """φ = 360°/N and 90° − φ, whatever the notch's depth and apex height."""
    sec = section(n, joints(n, 18.0)[k])
    settings = cutter_settings(sec)
    assert settings.v_face_angles == pytest.approx((phi_deg(n), 90 - phi_deg(n)), abs=1e-9)
    assert settings.notch_depth == pytest.approx(sec.notch.depth, rel=1e-12)
    assert settings.apex_height == pytest.approx(sec.notch.apex_height, rel=1e-12)


# Table saw ------------------------------------------------------------------------


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("t", THICKNESSES)
def test_blade_tilt_within_45(n, t):
    """Common practice: most table saws tilt 0–45°; every pass must fit."""
    for _, sec in buildable(n, t):
        for p in cutter_settings(sec).saw:
            assert 0.0 <= p.tilt <= 45.0 + 1e-9
            assert p.fence_distance > 0


@pytest.mark.parametrize("n", (6, 8, 10, 12, 16))
def test_flush_passes_against_trigonometry(n):
    """Each pass of a flush birdsmouth, from the flush V's shape written out."""
    t = 18.0
    sec = section(n, Joint("birdsmouth-flush"), t)
    w = sec.stave_width
    phi = math.radians(phi_deg(n))
    h, ft = t * math.sin(phi), t * (1 - math.cos(phi))
    passes = {p.makes: p for p in cutter_settings(sec).saw}
    inner, outer = passes["inner V face"], passes["outer V face"]

    # Outer V face: from the outer corner of the notched edge to the apex, t long.
    if 90 - phi_deg(n) >= 45:  # face down, outer face on the table, tilt 90° − (90° − φ)
        assert (outer.on_table, outer.on_fence) == (Side.OUTER_FACE, Side.SQUARE_EDGE)
        assert outer.tilt == pytest.approx(phi_deg(n), abs=1e-9)
        assert outer.fence_distance == pytest.approx(w, rel=1e-12)  # the blade meets the table at the corner
        assert outer.height == pytest.approx(t * math.cos(phi), rel=1e-12)
    else:  # on the notched edge, inner face to the fence: the corner is t from the fence
        assert (outer.on_table, outer.on_fence) == (Side.NOTCHED_EDGE, Side.INNER_FACE)
        assert outer.tilt == pytest.approx(90 - phi_deg(n), abs=1e-9)
        assert outer.fence_distance == pytest.approx(t, rel=1e-12)
        assert outer.height == pytest.approx(h, rel=1e-12)
    assert outer.depth_along_blade == pytest.approx(t, rel=1e-12)

    # Inner V face: from the apex to the inner face, t·tan(π/N) from the notched edge.
    if phi_deg(n) >= 45:  # face down, inner face on the table
        assert inner.on_table is Side.INNER_FACE
        assert inner.tilt == pytest.approx(90 - phi_deg(n), abs=1e-9)
        in_from_edge = t * math.tan(math.pi / n)
        expected = in_from_edge if inner.on_fence is Side.NOTCHED_EDGE else w - in_from_edge
        assert inner.fence_distance == pytest.approx(expected, rel=1e-12)
        assert inner.depth_along_blade == pytest.approx(ft / math.sin(phi), rel=1e-12)
        assert inner.height == pytest.approx(ft, rel=1e-12)
    else:  # on the notched edge, outer face to the fence: the line meets the edge's plane h·tan φ below the apex
        assert (inner.on_table, inner.on_fence) == (Side.NOTCHED_EDGE, Side.OUTER_FACE)
        assert inner.tilt == pytest.approx(phi_deg(n), abs=1e-9)
        below_inner_face = h * math.tan(phi) - ft
        assert inner.fence_distance == pytest.approx(t + below_inner_face, rel=1e-12)
        assert inner.depth_along_blade == pytest.approx(h / math.cos(phi), rel=1e-12)
        assert inner.height == pytest.approx(h, rel=1e-12)
    for p in (inner, outer):
        assert not p.through
        expected_lean = Lean.AWAY_FROM_FENCE if p.on_fence is Side.NOTCHED_EDGE else Lean.TOWARD_FENCE
        assert p.lean is expected_lean


@pytest.mark.parametrize("n", (6, 10, 12, 16))
def test_flush_rides_its_notched_edge_only_before_the_v_comes_free(n):
    """The flush V takes the whole notched edge (outer corner to inner face), so an on-edge pass comes first."""
    settings = cutter_settings(section(n, Joint("birdsmouth-flush")))
    assert [p.on_table for p in settings.saw].index(Side.NOTCHED_EDGE) == 0
    last = settings.saw[-1]
    assert last.table_contact > 0 and last.fence_contact > 0


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("t", THICKNESSES)
def test_round_trip_passes_rebuild_the_stave(n, t):
    """The passes, cut into the blank w × t, give back the section's stave outline (shapely, here)."""
    for joint, sec in buildable(n, t):
        settings = cutter_settings(sec)
        rebuilt = stave_from_passes(settings.saw, sec.stave_width, t, blank_origin(sec))
        outline = Polygon(sec.stave_outline)
        assert rebuilt.symmetric_difference(outline).area < 1e-9 * outline.area, joint


def test_round_trip_can_fail():
    """A V cut stopped short frees nothing: the blank comes back whole, not the stave."""
    sec = section(8, Joint("birdsmouth-flush"))
    first, second = cutter_settings(sec).saw
    short = replace(second, depth_along_blade=0.9 * second.depth_along_blade)
    rebuilt = stave_from_passes((first, short), sec.stave_width, sec.thickness)
    assert rebuilt.area == pytest.approx(sec.stave_width * sec.thickness, rel=1e-12)
    assert rebuilt.symmetric_difference(box(0, 0, sec.stave_width, sec.thickness)).area < 1e-9


# Router table ---------------------------------------------------------------------


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_router_one_pass_only_for_eight(n, k):
    """A 90° V-bit has both faces at 45°: it fits the V flat only when φ = 90° − φ = 45°, N = 8."""
    sec = section(n, joints(n, 18.0)[k])
    r = cutter_settings(sec).router
    assert r.one_pass_flat is (n == 8)
    assert r.wedge_angle == pytest.approx(abs(45 - phi_deg(n)), abs=1e-9)
    # The bit's axis is tilted by the wedge angle from the edge's normal; the apex is h in from the edge.
    assert r.bit_height == pytest.approx(sec.notch.depth / math.cos(math.radians(r.wedge_angle)), rel=1e-12)
    assert r.fence_to_tip == pytest.approx(sec.thickness - sec.notch.apex_height, rel=1e-12)
    if n != 8:
        # The V's faces lean from the bit's by 45° − φ: high side at the fence when φ > 45°.
        assert r.wedge_high_side == ("at the fence" if phi_deg(n) > 45 else "away from the fence")


@pytest.mark.parametrize("n", (6, 12))
def test_router_wedge_fifteen_degrees(n):
    assert cutter_settings(section(n, Joint("birdsmouth-flush"))).router.wedge_angle == pytest.approx(15.0, abs=1e-9)


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_router_bit_diameter_covers_the_v(n, k):
    """The cone of a 90° bit that wide, tip on the apex, axis on the V's bisector, holds all the waste."""
    sec = section(n, joints(n, 18.0)[k])
    r = cutter_settings(sec).router
    phi = math.radians(phi_deg(n))
    d1, d2 = (-math.cos(phi), -math.sin(phi)), (-math.sin(phi), math.cos(phi))
    px, py = sec.frame.apex
    waste = box(sec.frame.x_notch_edge, sec.frame.inner, sec.frame.x_square_edge, sec.frame.outer).difference(
        Polygon(sec.stave_outline))

    def cone(diameter):
        reach = diameter / 2 / math.sin(math.pi / 4)  # along each cutting face to the rim
        return Polygon([(px, py), (px + reach * d1[0], py + reach * d1[1]), (px + reach * d2[0], py + reach * d2[1])])

    assert waste.difference(cone(r.least_bit_diameter)).area < 1e-9 * waste.area
    assert waste.difference(cone(r.least_bit_diameter * (1 - 1e-6))).area > 0


@pytest.mark.parametrize("n", STAVES)
def test_router_flush_leaves_no_edge_to_ride(n):
    """The flush V runs from the outer corner to the inner face: nothing of the notched edge is left."""
    assert cutter_settings(section(n, Joint("birdsmouth-flush"))).router.edge_left == 0.0


# Plain bevel staves ---------------------------------------------------------------


@pytest.mark.parametrize("n, bevel", [(8, 22.5), (6, 30.0), (12, 15.0), (16, 11.25)])
def test_bevel_tilt_is_pi_over_n(n, bevel):
    """Bevelled staves: edges π/N off square (22.5° for 8), cut face down."""
    t = 18.0
    sec = section(n, Joint("bevel"), t)
    settings = cutter_settings(sec)
    assert settings.bevel == pytest.approx(bevel, abs=1e-9)
    assert settings.v_face_angles is None and settings.router is None
    for p in settings.saw:
        assert p.tilt == pytest.approx(bevel, abs=1e-9)
        assert p.on_table in (Side.INNER_FACE, Side.OUTER_FACE)
        assert p.through
        assert p.depth_along_blade == pytest.approx(t / math.cos(math.pi / n), rel=1e-12)
    # Rip to width, inner face down: the bevelled edge touches the fence at its outer corner, the
    # inner face starts t·tan(π/N) out from the fence and is 2·a_i·tan(π/N) wide.
    last = settings.saw[-1]
    a_i = RADIUS + ALLOWANCE - t
    if last.on_table is Side.INNER_FACE:
        expected = t * math.tan(math.pi / n) + 2 * a_i * math.tan(math.pi / n)
    else:
        expected = 2 * (a_i + t) * math.tan(math.pi / n)
    assert settings.rip_fence_distance == pytest.approx(expected, rel=1e-12)


# The command ------------------------------------------------------------------------


def test_section_command_prints_the_table_saw_settings(run):
    result = run(["section", SAMPLES / "daysailer-mast.toml", "--at", "8 ft"])
    assert result.exit_code == 0, result.output
    out = result.output
    assert "Cutter settings" in out
    assert "table saw, pass 1" in out and "table saw, pass 2" in out
    assert out.count("blade tilt from vertical") == 2
    assert out.count("45.00°") >= 2  # eight staves: both faces at 45°, blade at 45°
    # The outer V face pass, face down: the blade meets the table at the stave's full width.
    from stavegen.model.loader import load_spar
    from stavegen.pipeline import resolve

    spar, _ = resolve(load_spar(SAMPLES / "daysailer-mast.toml"))
    t = float(spar.hollow.wall.at(8 * 304.8))
    a_o = float(spar.hollow.diameter.at(8 * 304.8)) / 2 + spar.hollow.planing_allowance
    width = 2 * a_o * math.tan(math.pi / 8)  # flush: the outer faces make the octagon
    fence_rows = [line for line in out.splitlines() if "fence to blade at the table" in line]
    assert any(format_length(width, "in") in line for line in fence_rows)
    assert any(format_length(t, "in") in line for line in out.splitlines() if "cut along the blade" in line)
    assert "router table, 90° V-bit" in out
