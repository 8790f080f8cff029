"""Sizing the hollow spar: the least wall (constant or by station) and the least diameter scale.

References named beside each check: Roark's Formulas for Stress and Strain
(regular polygon I = A (12 a² + s²) / 48, A = N s a / 2, s = 2 a tan(π/N);
round I = π R⁴ / 4), solved independently here with scipy.optimize.brentq;
and the project's own check (assess), which the solved spar must pass, and
must fail when the solved size is made 1 % smaller.
"""

from __future__ import annotations

import json
import math
import tomllib
from dataclasses import replace
from functools import lru_cache

import pytest

from stavegen.errors import DesignError
from scipy.optimize import brentq

from stavegen.checks.assess import assess
from stavegen.checks.ratios import check_station
from stavegen.errors import InputError
from stavegen.model.loader import load_spar, parse_spar
from stavegen.model.spar import AUTO, AUTO_TAPERED, Profile
from stavegen.pipeline import resolve
from stavegen.section.properties import evaluate_section
from stavegen.sizing.wall import _raise_to_meet
from stavegen.stations.evaluate import Station, plug_at_station
from stavegen.stations.grid import StationMark, station_marks

from conftest import SAMPLES, make_spar

SAMPLE_NAMES = ("daysailer-mast.toml", "yawl-mainmast-metric.toml")
ROUNDOFF = 1e-12  # the check's own allowance below a target (assess): roundoff of the exact integrals


def sample_data(name: str, **hollow) -> dict:
    data = tomllib.loads((SAMPLES / name).read_text())
    for key, value in hollow.items():
        if value is None:
            data["hollow"].pop(key, None)
        else:
            data["hollow"][key] = value
    return data


@lru_cache(maxsize=None)
def solved_sample(name: str, wall: str):
    """(spar as read, resolved spar, solved lines) for a sample with its wall set to ``wall``."""
    spar = parse_spar(sample_data(name, wall=wall), name)
    resolved, lines = resolve(spar)
    return spar, resolved, lines


def with_wall(spar, wall: Profile):
    return replace(spar, hollow=replace(spar.hollow, wall=wall))


def stations_and_middles(spar) -> tuple[StationMark, ...]:
    """Every station of the spar and the middle of every stretch between two."""
    marks = station_marks(spar)
    middles = [StationMark((a.z + b.z) / 2, ("middle",)) for a, b in zip(marks, marks[1:])]
    return tuple(sorted(marks + tuple(middles), key=lambda m: m.z))


def ngon_inertia(n: int, apothem: float) -> float:
    """Roark: regular polygon of apothem a about a centroidal axis, I = A (12 a² + s²) / 48."""
    s = 2 * apothem * math.tan(math.pi / n)
    area = n * s * apothem / 2
    return area * (12 * apothem**2 + s**2) / 48


# The constant wall --------------------------------------------------------------------------------------------


@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_constant_wall_meets_the_target_exactly_where_it_binds(name):
    spar, resolved, lines = solved_sample(name, AUTO)
    wall = resolved.hollow.wall
    assert wall.is_constant and spar.hollow.wall == AUTO
    result = assess(resolved)
    assert result.passed  # no station falls short of either target
    # Where it binds, the stiffer of the two needs is met exactly: EI or strength, whichever asks more.
    assert binding_share(result) == pytest.approx(1.0, abs=1e-6)
    # 1 % thinner falls short somewhere.
    thinner = assess(with_wall(resolved, Profile.constant(0.99 * wall.largest, spar.length)))
    assert not thinner.passed
    assert len(lines) == 1 and lines[0].startswith("wall solved:") and "constant" in lines[0]


@pytest.mark.parametrize("joint", ["birdsmouth-flush", "bevel"])
@pytest.mark.parametrize("staves", [6, 8, 12, 16])
@pytest.mark.parametrize("units, diameter, allowance", [("mm", 100.0, 1.5), ("in", 3.5, 0.0625)])
def test_flush_wall_against_roark_closed_form(joint, staves, units, diameter, allowance):
    """Uniform spar, outer faces an N-gon: I = π R⁴/4 − I_Ngon(a_i) (Roark), a_i = R + p − t.

    Solved here for t independently: k E_h I(t) = (1 + margin) E_p π R⁴/4.
    """
    length = 3000 if units == "mm" else 120
    spar = make_spar(
        spar={"name": "Uniform", "units": units, "length": length},
        plan={"wood": "sitka-spruce", "stations": [[0, diameter], [length, diameter]]},
        hollow={"wood": "douglas-fir-coast", "staves": staves, "joint": joint, "wall": AUTO,
                "planing_allowance": allowance, "margin": 0.05, "lamination_factor": 0.95,
                "min_strength_ratio": 0.1},  # stiffness alone binds here
        output={"mark_spacing": length},
    )
    resolved, _ = resolve(spar)
    solved = resolved.hollow.wall.largest

    h = spar.hollow
    radius = float(spar.plan.diameter.at(0)) / 2
    p = h.planing_allowance
    plan_ei = spar.plan.wood.moe * math.pi * radius**4 / 4
    needed = (1 + h.margin) * plan_ei / (h.lamination_factor * h.wood.moe)

    def shortfall(t: float) -> float:
        return math.pi * radius**4 / 4 - ngon_inertia(staves, radius + p - t) - needed

    thinnest = p + radius * (1 - math.cos(math.pi / staves))  # the round reaches the bore's corners
    expected = brentq(shortfall, thinnest, radius, xtol=1e-14, rtol=1e-15)
    assert solved > thinnest  # the stiffness binds, not the rounding
    assert solved == pytest.approx(expected, rel=1e-6)


def test_strength_target_binds_when_it_asks_more():
    """Douglas-fir staves for a Sitka spruce plan: strength ratio 12.4/10.2 × I_h/I_p is below the EI ratio
    1.95/1.57 × I_h/I_p (Wood Handbook figures, from memory), so a strength minimum of 1 binds first."""
    spar = make_spar(hollow={"wood": "douglas-fir-coast", "wall": AUTO, "min_strength_ratio": 1.0})
    resolved, lines = resolve(spar)
    result = assess(resolved)
    assert result.weakest_strength.strength_ratio == pytest.approx(1.0, abs=1e-6)
    assert result.weakest_strength.strength_ratio >= 1.0 - ROUNDOFF
    assert result.weakest_stiffness.ei_ratio > 1.0
    thinner = assess(with_wall(resolved, Profile.constant(0.99 * resolved.hollow.wall.largest, spar.length)))
    assert not thinner.strength_met
    assert "strength ratio" in lines[0]


@pytest.mark.parametrize("joint, notch", [("birdsmouth-centered", None),
                                          ("birdsmouth-custom", {"depth": 10.0, "apex_fraction": 0.4})])
def test_joints_with_voids(joint, notch):
    """Joints whose voids grow with the wall: the ratio peaks inside the range; the least wall is still found."""
    hollow = {"wood": "douglas-fir-coast", "staves": 12 if notch is None else 8, "joint": joint, "wall": AUTO,
              "min_strength_ratio": 0.1}  # stiffness alone binds here
    if notch:
        hollow["notch"] = notch
    spar = make_spar(hollow=hollow, output={"mark_spacing": 3000})
    resolved, _ = resolve(spar)
    t = resolved.hollow.wall.largest
    assert assess(resolved).passed
    assert assess(resolved).weakest_stiffness.ei_ratio == pytest.approx(1.0, abs=1e-6)
    assert not assess(with_wall(resolved, Profile.constant(0.99 * t, spar.length))).stiffness_met
    if notch:  # a 10 mm V in a stave 90 % of the radius thick leaves a groove at every seam: refused outright
        with pytest.raises(DesignError, match="open groove"):
            assess(with_wall(resolved, Profile.constant(0.9 * 50.0, spar.length)))


def test_a_notch_too_shallow_for_any_wall_that_meets_the_target_says_so():
    """A 3 mm V closes only on thin staves, too thin to reach the plan's stiffness: the message names the notch."""
    spar = make_spar(hollow={"wood": "douglas-fir-coast", "staves": 8, "joint": "birdsmouth-custom", "wall": AUTO,
                             "min_strength_ratio": 0.1, "notch": {"depth": 3.0, "apex_fraction": 0.4}},
                     output={"mark_spacing": 3000})
    with pytest.raises(DesignError, match="thickest wall this notch closes at the seams"):
        resolve(spar)


def binding_share(result) -> float:
    """The least, over the stations and both targets, of ratio over target: 1 where the sizing binds."""
    return min(min(c.ei_ratio / c.ei_target, c.strength_ratio / c.strength_target) for c in result.stations)


# The wall by station ------------------------------------------------------------------------------------------


@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_tapered_wall_meets_the_target_at_stations_and_between(name):
    spar, tapered, lines = solved_sample(name, AUTO_TAPERED)
    _, constant, _ = solved_sample(name, AUTO)
    target = 1 + spar.hollow.margin
    assert not tapered.hollow.wall.is_constant
    everywhere = assess(tapered, stations_and_middles(tapered))
    assert min(c.ei_ratio for c in everywhere.stations) >= target - ROUNDOFF
    assert assess(tapered).passed
    # Never thicker than the constant wall where the constant wall binds.
    binding = assess(constant).weakest_stiffness.station.z
    assert float(tapered.hollow.wall.at(binding)) <= constant.hollow.wall.largest * (1 + 1e-12)
    assert "tapered" in lines[0]


@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_tapered_wall_is_the_least_at_each_open_station(name):
    """At every station with an open bore, 1 % less wall than the schedule's falls short there."""
    spar, tapered, _ = solved_sample(name, AUTO_TAPERED)
    h = tapered.hollow
    target = 1 + h.margin
    for mark in station_marks(tapered):
        if plug_at_station(tapered, mark.z) is not None:
            continue
        radius = float(h.diameter.at(mark.z)) / 2
        wall = 0.99 * float(h.wall.at(mark.z))
        section = evaluate_section(h.staves, h.joint, radius, wall, h.planing_allowance)
        station = Station(mark.z, mark.reasons, float(tapered.plan.diameter.at(mark.z)), 2 * radius, wall, None,
                          section)
        assert not check_station(tapered, station).ok, mark.z


def test_tapered_wall_sized_as_open_through_the_plugs():
    """Where blocking fills the bore the schedule still follows the open bore's need: no sudden thin wall."""
    spar, tapered, lines = solved_sample("daysailer-mast.toml", AUTO_TAPERED)
    wall = tapered.hollow.wall
    steps = [abs(b - a) for a, b in zip(wall.value, wall.value[1:])]
    assert max(steps) < 0.1 * wall.largest
    assert "as if the bore were open" in lines[0]


def test_thickening_a_stretch_raises_the_thinner_end():
    """The middle of a straight stretch gets the mean of its ends (linear interpolation)."""
    zs = [0.0, 100.0, 200.0]
    values = [10.0, 12.0, 12.0]
    assert _raise_to_meet(values, zs, 0, 10.5) == 0.0  # the middle already has 11
    assert _raise_to_meet(values, zs, 0, 11.5) == pytest.approx(1.0)
    assert values[0] == pytest.approx(11.0) and values[1] == 12.0
    assert (values[0] + values[1]) / 2 >= 11.5
    assert _raise_to_meet(values, zs, 1, 13.0) == pytest.approx(1.0)  # more than either end: both go to 13
    assert values[1:] == [13.0, 13.0]


# The diameters ------------------------------------------------------------------------------------------------


def test_diameter_scale_meets_the_target_and_a_smaller_increase_fails():
    """Yawl mainmast: Sitka spruce staves for a Douglas-fir plan must be larger than the plan."""
    spar = parse_spar(sample_data("yawl-mainmast-metric.toml", stations=AUTO), "yawl.toml")
    resolved, lines = resolve(spar)
    plan = spar.plan.diameter
    scales = [d / p for d, p in zip(resolved.hollow.diameter.value, plan.value)]
    k = scales[0]
    assert all(s == pytest.approx(k, rel=1e-12) for s in scales) and k > 1
    result = assess(resolved)
    assert result.passed
    assert binding_share(result) == pytest.approx(1.0, abs=1e-6)
    smaller = 1 + 0.99 * (k - 1)
    shrunk = replace(resolved, hollow=replace(resolved.hollow,
                                              diameter=Profile(plan.z, tuple(smaller * d for d in plan.value))))
    assert not assess(shrunk).passed
    assert lines[0].startswith("diameters solved:") and f"{k:.6f}" in lines[0]


def test_diameters_kept_when_the_wall_already_meets_the_target():
    spar = make_spar(hollow={"wood": "douglas-fir-coast", "wall": 30, "stations": AUTO})
    resolved, lines = resolve(spar)
    assert resolved.hollow.diameter.value == spar.plan.diameter.value
    assert "as drawn" in lines[0]


# The spar file and the command line ---------------------------------------------------------------------------


def test_loader_accepts_the_solve_values_and_skips_the_stock_check():
    spar = make_spar(hollow={"wall": AUTO}, stock={"thickness": 5, "widths": [95], "lengths": [3000]})
    assert spar.hollow.wall == AUTO and not spar.resolved
    assert make_spar(hollow={"wall": AUTO_TAPERED}).hollow.wall == AUTO_TAPERED
    assert make_spar(hollow={"stations": AUTO}).hollow.diameter == AUTO
    with pytest.raises(InputError) as err:
        make_spar(hollow={"stations": "bigger"})
    assert err.value.key == "hollow.stations"


def test_staves_auto_is_still_refused():
    spar = make_spar(hollow={"staves": AUTO})
    with pytest.raises(InputError) as err:
        resolve(spar)
    assert err.value.key == "hollow.staves"


@pytest.mark.parametrize("case, words", [
    ("wall-auto-stock-too-thin.toml", ["hollow.wall", "the stock is too thin", "needs a wall of at least"]),
    ("wall-auto-no-wall-reaches.toml", ["hollow.wall", "no wall can reach", "staves meeting at the axis"]),
])
def test_unreachable_wall_is_one_line_and_exit_2(run, tmp_path, case, words):
    path = SAMPLES.parent / "tests" / "bad_spars" / case
    result = run(["check", path])
    assert result.exit_code == 2
    message = result.stderr.strip()
    assert "\n" not in message and "Traceback" not in message
    for word in words:
        assert word in message
    out = tmp_path / "out"
    assert run(["build", path, "-o", out]).exit_code == 2
    assert not out.exists() or not any(out.iterdir())


def test_stock_message_says_how_thick_and_where(run):
    """The wall it asks for is more than the stock and is the one the solver finds without stock."""
    path = SAMPLES.parent / "tests" / "bad_spars" / "wall-auto-stock-too-thin.toml"
    message = run(["check", path]).stderr
    data = tomllib.loads(path.read_text())
    del data["stock"]
    free, _ = resolve(parse_spar(data, str(path)))
    inches = free.hollow.wall.largest / 25.4
    assert inches > 0.375
    assert f'{inches:.4f}"' in message and "from the heel" in message


@pytest.fixture
def auto_mast(tmp_path):
    text = (SAMPLES / "daysailer-mast.toml").read_text()
    lines = [('wall = "auto"' if line.startswith("wall = ") else line) for line in text.splitlines()]
    path = tmp_path / "auto-mast.toml"
    path.write_text("\n".join(lines) + "\n")
    return path


def test_check_and_build_with_an_auto_wall(run, tmp_path, auto_mast):
    solved = resolve(load_spar(auto_mast))[0].hollow.wall.largest
    result = run(["check", auto_mast, "--json"])
    assert result.exit_code == 0, result.output
    doc = json.loads(result.stdout)
    assert doc["spar"]["solved"] and doc["spar"]["solved"][0].startswith("wall solved:")
    assert all(s["wall_mm"] == solved for s in doc["stations"])
    text = run(["check", auto_mast])
    assert text.exit_code == 0 and "solved:" in text.stdout and "PASS" in text.stdout
    out = tmp_path / "out"
    built = run(["build", auto_mast, "-o", out])
    assert built.exit_code == 0, built.output
    doc = json.loads((out / "day-sailer-mast.json").read_text())
    assert doc["spar"]["solved"] and all(s["wall_mm"] == solved for s in doc["stations"])
    section = run(["section", auto_mast, "--at", "7 ft"])
    assert section.exit_code == 0 and "solved:" in section.stdout
