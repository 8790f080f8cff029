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

from stavegen.layout.machining import Blank, BladeSide, Lean, Side, cutter_settings, replay
from stavegen.model.spar import Joint
from stavegen.section.properties import evaluate_section
from stavegen.units import format_length

from conftest import SAMPLES

RADIUS, ALLOWANCE = 60.0, 1.5
KERF = 3.175  # a full-kerf table-saw blade, 1/8 in (common practice)
STAVES = (6, 8, 10, 12, 16)
THICKNESSES = (12.0, 18.0, 25.0)


def phi_deg(n: int) -> float:
    return 360.0 / n


def custom_joint(n: int, t: float, f: float, share: float) -> Joint:
    """A builder's own notch: apex f·t up, depth a share of the deepest the V allows, (1 − f)·t·tan φ."""
    deepest = (1 - f) * t * math.tan(math.radians(phi_deg(n)))
    return Joint("birdsmouth-custom", depth=share * deepest, apex_fraction=f)


def joints(n: int, t: float) -> list[Joint]:
    return [Joint("birdsmouth-flush"), Joint("birdsmouth-centered"), custom_joint(n, t, 0.4, 0.9),
            custom_joint(n, t, 0.7, 0.9)]


def section(n: int, joint: Joint, t: float = 18.0):
    return evaluate_section(n, joint, RADIUS, t, ALLOWANCE)


def settings_of(sec, kerf: float = KERF, extra: float = 0.0):
    """Cutter settings on a blank ``extra`` mm wider than the stave (the blank the notch is cut on)."""
    return cutter_settings(sec, kerf, Blank(sec.stave_width + extra, sec.thickness))


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
    got = settings_of(section(n, Joint("birdsmouth-flush"))).v_face_angles
    assert got == pytest.approx((inner, outer), abs=1e-9)


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_v_face_angles_from_phi(n, k):
    """φ = 360°/N and 90° − φ, whatever the notch's depth and apex height."""
    sec = section(n, joints(n, 18.0)[k])
    settings = settings_of(sec)
    assert settings.v_face_angles == pytest.approx((phi_deg(n), 90 - phi_deg(n)), abs=1e-9)
    assert settings.notch_depth == pytest.approx(sec.notch.depth, rel=1e-12)
    assert settings.apex_height == pytest.approx(sec.notch.apex_height, rel=1e-12)


# Table saw ------------------------------------------------------------------------


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("t", THICKNESSES)
def test_blade_tilt_within_45(n, t):
    """Common practice: most table saws tilt 0–45°; every pass must fit."""
    for _, sec in buildable(n, t):
        for p in settings_of(sec).saw:
            assert 0.0 <= p.tilt <= 45.0 + 1e-9
            assert p.fence_distance > 0


@pytest.mark.parametrize("n", (6, 8, 10, 12, 16))
@pytest.mark.parametrize("extra", (0.0, 7.5))
def test_flush_passes_against_trigonometry(n, extra):
    """Each pass of a flush birdsmouth, from the flush V's shape and the blade's slab written out.

    The blade is a slab KERF thick; on the pass where the stave lies on the blade's far side the
    fence moves in by KERF / cos(tilt) so the far face, not the fence-side face, makes the stave's
    face, and the fence-side face is KERF·tan(tilt) longer to the blade's square top.
    """
    t = 18.0
    sec = section(n, Joint("birdsmouth-flush"), t)
    blank = sec.stave_width + extra
    phi = math.radians(phi_deg(n))
    h, ft = t * math.sin(phi), t * (1 - math.cos(phi))
    passes = {p.makes: p for p in settings_of(sec, extra=extra).saw}
    inner, outer = passes["inner V face"], passes["outer V face"]

    def moved(p, foot, length):
        """(fence, depth along the fence-side face) for a face meeting the table at foot, length long."""
        if p.stave_side is BladeSide.FAR:
            th = math.radians(p.tilt)
            lean = 1.0 if p.lean is Lean.AWAY_FROM_FENCE else -1.0
            return foot - KERF / math.cos(th), length + lean * KERF * math.tan(th)
        return foot, length

    # Outer V face: from the outer corner of the notched edge to the apex, t long.
    if 90 - phi_deg(n) >= 45:  # face down, outer face on the table, tilt 90° − (90° − φ)
        assert (outer.on_table, outer.on_fence) == (Side.OUTER_FACE, Side.SQUARE_EDGE)
        assert outer.tilt == pytest.approx(phi_deg(n), abs=1e-9)
        assert outer.stave_side is BladeSide.FENCE  # the waste falls away beyond the blade
        fence, depth = moved(outer, blank, t)  # the blade meets the table at the blank's far corner
    else:  # on the notched edge, inner face to the fence: the corner is t from the fence
        assert (outer.on_table, outer.on_fence) == (Side.NOTCHED_EDGE, Side.INNER_FACE)
        assert outer.tilt == pytest.approx(90 - phi_deg(n), abs=1e-9)
        fence, depth = moved(outer, t, t)
    assert outer.fence_distance == pytest.approx(fence, rel=1e-12)
    assert outer.depth_along_blade == pytest.approx(depth, rel=1e-12)

    # Inner V face: from the apex to the inner face, t·tan(π/N) from the notched edge.
    if phi_deg(n) >= 45:  # face down, inner face on the table
        assert inner.on_table is Side.INNER_FACE
        assert inner.tilt == pytest.approx(90 - phi_deg(n), abs=1e-9)
        in_from_edge = t * math.tan(math.pi / n)
        foot = in_from_edge if inner.on_fence is Side.NOTCHED_EDGE else blank - in_from_edge
        fence, depth = moved(inner, foot, ft / math.sin(phi))
    else:  # on the notched edge, outer face to the fence: the line meets the edge's plane h·tan φ below the apex
        assert (inner.on_table, inner.on_fence) == (Side.NOTCHED_EDGE, Side.OUTER_FACE)
        assert inner.tilt == pytest.approx(phi_deg(n), abs=1e-9)
        below_inner_face = h * math.tan(phi) - ft
        fence, depth = moved(inner, t + below_inner_face, h / math.cos(phi))
    assert inner.fence_distance == pytest.approx(fence, rel=1e-12)
    assert inner.depth_along_blade == pytest.approx(depth, rel=1e-12)
    for p in (inner, outer):
        assert not p.through
        expected_lean = Lean.AWAY_FROM_FENCE if p.on_fence is Side.NOTCHED_EDGE else Lean.TOWARD_FENCE
        assert p.lean is expected_lean
        assert p.kerf == KERF


@pytest.mark.parametrize("n", (6, 10, 12, 16))
def test_flush_rides_its_notched_edge_only_before_the_v_comes_free(n):
    """The flush V takes the whole notched edge (outer corner to inner face), so an on-edge pass comes first."""
    settings = settings_of(section(n, Joint("birdsmouth-flush")))
    assert [p.on_table for p in settings.saw].index(Side.NOTCHED_EDGE) == 0
    last = settings.saw[-1]
    assert last.table_contact > 0 and last.fence_contact > 0


@pytest.mark.parametrize("n", STAVES)
def test_only_passes_against_the_square_edge_follow_the_blank(n):
    """A wider blank moves only the passes set against (or standing on) the square edge, by the extra width."""
    sec = section(n, Joint("birdsmouth-flush"))
    narrow, wide = settings_of(sec), settings_of(sec, extra=9.0)
    for a, b in zip(narrow.saw, wide.saw):
        assert (a.on_table, a.on_fence, a.makes) == (b.on_table, b.on_fence, b.makes)
        shift = 9.0 if a.on_fence is Side.SQUARE_EDGE else 0.0
        assert b.fence_distance - a.fence_distance == pytest.approx(shift, abs=1e-9)
        assert a.follows_blank_width == (Side.SQUARE_EDGE in (a.on_table, a.on_fence))


def test_replay_can_fail():
    """A V cut stopped short frees nothing: the blank comes back whole but for a kerf, not the stave."""
    sec = section(8, Joint("birdsmouth-flush"))
    first, second = settings_of(sec).saw
    short = replace(second, depth_along_blade=0.8 * second.depth_along_blade)
    blank = Blank(sec.stave_width, sec.thickness)
    rebuilt = replay((first, short), blank)
    whole = sec.stave_width * sec.thickness
    assert rebuilt.area > whole - 2 * KERF * sec.thickness  # two kerfs at most, no V freed
    assert rebuilt.area > Polygon(sec.stave_outline).area * 1.02


# Router table ---------------------------------------------------------------------


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_router_one_pass_only_for_eight(n, k):
    """A 90° V-bit has both faces at 45°: it fits the V flat only when φ = 90° − φ = 45°, N = 8."""
    sec = section(n, joints(n, 18.0)[k])
    r = settings_of(sec).router
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
    assert settings_of(section(n, Joint("birdsmouth-flush"))).router.wedge_angle == pytest.approx(15.0, abs=1e-9)


@pytest.mark.parametrize("n", STAVES)
@pytest.mark.parametrize("k", range(4))
def test_router_bit_diameter_reaches_the_waste(n, k):
    """Half the least bit diameter is the farthest any corner of the waste lies from the bit's axis.

    The axis is the V's bisector through the apex (the V is 90°, so the bisector is at 45° to each face).
    """
    sec = section(n, joints(n, 18.0)[k])
    r = settings_of(sec).router
    phi = math.radians(phi_deg(n))
    d1, d2 = (-math.cos(phi), -math.sin(phi)), (-math.sin(phi), math.cos(phi))
    axis = ((d1[0] + d2[0]) / math.sqrt(2), (d1[1] + d2[1]) / math.sqrt(2))
    px, py = sec.frame.apex
    waste = box(sec.frame.x_notch_edge, sec.frame.inner, sec.frame.x_square_edge, sec.frame.outer).difference(
        Polygon(sec.stave_outline))
    corners = [p for g in getattr(waste, "geoms", [waste]) for p in g.exterior.coords]
    farthest = max(abs((x - px) * axis[1] - (y - py) * axis[0]) for x, y in corners)
    assert r.least_bit_diameter == pytest.approx(2 * farthest, rel=1e-9)


@pytest.mark.parametrize("n", STAVES)
def test_router_flush_leaves_no_edge_to_ride(n):
    """The flush V runs from the outer corner to the inner face: nothing of the notched edge is left."""
    assert settings_of(section(n, Joint("birdsmouth-flush"))).router.edge_left == 0.0


# Plain bevel staves ---------------------------------------------------------------


@pytest.mark.parametrize("n, bevel", [(8, 22.5), (6, 30.0), (12, 15.0), (16, 11.25)])
def test_bevel_tilt_is_pi_over_n(n, bevel):
    """Bevelled staves: edges π/N off square (22.5° for 8). Edge 1 is bevelled on the parallel blank, face
    down, edge 2 against the fence; edge 2 is bevelled to the tapered line last, off the saw's fence."""
    t = 18.0
    sec = section(n, Joint("bevel"), t)
    settings = settings_of(sec, extra=6.0)
    assert settings.bevel == pytest.approx(bevel, abs=1e-9)
    assert settings.v_face_angles is None and settings.router is None
    (p,) = settings.saw
    assert p.makes == "bevel on edge 1"
    assert p.tilt == pytest.approx(bevel, abs=1e-9)
    assert (p.on_table, p.on_fence) == (Side.INNER_FACE, Side.EDGE_2)
    assert p.through and p.stave_side is BladeSide.FENCE
    # The bevel meets the inner face t·tan(π/N) in from edge 1's outer corner, the blank's width from the fence.
    blank = sec.stave_width + 6.0
    assert p.fence_distance == pytest.approx(blank - t * math.tan(math.pi / n), rel=1e-12)
    assert settings.rip_fence_distance == pytest.approx(blank, rel=1e-12)


# The command ------------------------------------------------------------------------


def test_section_command_prints_the_table_saw_settings(run):
    path = SAMPLES / "yawl-mainmast-metric.toml"
    result = run(["section", path, "--at", "2000 mm"])
    assert result.exit_code == 0, result.output
    out = result.output
    assert "Cutter settings" in out
    assert "table saw, pass 1" in out and "table saw, pass 2" in out
    assert out.count("blade tilt from vertical") == 2
    assert "kerf, on the waste side" in out
    from stavegen.model.loader import load_spar
    from stavegen.pipeline import resolve

    spar, _ = resolve(load_spar(path))
    a_o = float(spar.hollow.diameter.at(2000)) / 2 + spar.hollow.planing_allowance
    width = 2 * a_o * math.tan(math.pi / 12)  # flush: the outer faces make the 12-gon
    # The outer V face, stave on its notched edge, inner face to the fence: the fence-side face on the corner.
    fence_rows = [line for line in out.splitlines() if "fence to blade at the table" in line]
    assert len(fence_rows) == 2
    assert "router table, 90° V-bit" in out
    assert f"{math.floor(width * 10) / 10:.1f}" in out  # the stave's width, rounded down to the 0.1 mm


@pytest.mark.parametrize("n", (8, 10, 12, 16))
def test_a_shallow_custom_notch_that_leaves_a_groove_is_refused(n):
    """Apex 0.4 t up, V only 60 % of the deepest: the neighbour's end face stands out past the notched edge's
    lip, and the groove between them reaches inside the round at every seam."""
    with pytest.raises(DesignError, match="open groove"):
        section(n, custom_joint(n, 18.0, 0.4, 0.6))
