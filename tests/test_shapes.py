"""Oval and rectangular plans, oval hollow spars: the file, the two-direction check, and the outputs.

References named beside each check: Roark (cantilever δ = F L³ / 3EI; ellipse and rectangle I, Table A.1),
Timoshenko & Gere (fixed-free Euler load π²EI / 4L²), ezdxf as an independent DXF reader, and the stave's
width replayed from the section at every station.
"""

import json
import math

import pytest

from stavegen.checks.assess import assess
from stavegen.checks.ratios import ATHWARTSHIPS, FORE_AFT, ROUND_FORM_FACTOR
from stavegen.errors import InputError
from stavegen.model.loader import load_spar, parse_spar
from stavegen.pipeline import design
from stavegen.render.json_doc import document

from conftest import SAMPLES, cut_list, spar_dict

SAMPLE = SAMPLES / "sharpie-oval-mast.toml"


def oval_spar(plan=None, hollow=None, **tables):
    """The uniform test spar made oval: plan 120 × 80 mm, hollow 12 staves round the same oval."""
    data = spar_dict(**tables)
    data["plan"].update({"shape": "oval", "stations": [[0, 120, 80], [3000, 120, 80]]})
    data["hollow"].update({"staves": 12, "wall": 16})
    data["plan"].update(plan or {})
    data["hollow"].update(hollow or {})
    return parse_spar(data, "test.toml")


# --- the file -------------------------------------------------------------------------------------------------

def test_oval_plan_reads_two_dimensions():
    spar = oval_spar()
    assert spar.plan.shape == "oval" and spar.hollow.shape == "oval"
    assert spar.plan.diameter.at(1500) == pytest.approx(120.0)
    assert spar.plan.athwartships.at(1500) == pytest.approx(80.0)
    assert spar.hollow.athwartships.at(0) == pytest.approx(80.0)  # the hollow spar defaults to the plan's


@pytest.mark.parametrize("change, key, words", [
    ({"hollow": {"staves": 11}}, "hollow.staves", "even number of staves"),
    ({"plan": {"stations": [[0, 120], [3000, 120]]}}, "plan.stations[1]", "[position, fore_aft, athwartships]"),
    ({"plan": {"corner_radius": 5}}, "plan.corner_radius", "rectangle"),
    ({"plan": {"shape": "rectangle", "corner_radius": 40}}, "plan.corner_radius", "half the smallest"),
    ({"hollow": {"shape": "round"}}, "hollow.stations", "needs its own stations"),
])
def test_bad_two_axis_input_names_the_key(change, key, words):
    with pytest.raises(InputError) as caught:
        oval_spar(**change)
    assert caught.value.key == key
    assert words in str(caught.value)


def test_round_plan_with_three_figures_is_refused():
    data = spar_dict(plan={"stations": [[0, 100, 80], [3000, 100, 80]]})
    with pytest.raises(InputError) as caught:
        parse_spar(data, "test.toml")
    assert 'shape = "oval"' in str(caught.value)


# --- two directions ---------------------------------------------------------------------------------------------

def test_plugged_oval_of_the_plans_wood_matches_the_solid_ellipse_both_ways():
    """Plug of the staves' wood over the whole spar, same wood as the plan: E·I ratio 1 both ways (Roark's
    π a³ b / 4 and π a b³ / 4), strength ratio 1 (the ellipse's form factor is the round's)."""
    spar = oval_spar(hollow={"planing_allowance": 0, "plug": [{"from": 0, "to": 3000}]})
    for c in assess(spar).stations:
        assert c.ei_ratio_in(FORE_AFT) == pytest.approx(1.0, rel=1e-12)
        assert c.ei_ratio_in(ATHWARTSHIPS) == pytest.approx(1.0, rel=1e-12)
        assert c.plan.inertia_in(FORE_AFT) == pytest.approx(math.pi * 60**3 * 40 / 4, rel=1e-12)
        assert c.hollow.form_factor_in(FORE_AFT) == pytest.approx(ROUND_FORM_FACTOR, rel=1e-9)
        assert c.strength_ratio == pytest.approx(1.0, rel=1e-9)


def test_uniform_oval_beam_figures_in_both_directions():
    """Uniform spar: δ = F L³ / (3 E I) and P = π² E I / (4 L²) in each direction (Roark; Timoshenko & Gere);
    the headline figures are the weaker direction's."""
    spar = oval_spar()
    result = assess(spar)
    section = result.stations[0].station.section
    e, L = spar.hollow.wood.moe, 3000.0
    for way, inertia in ((FORE_AFT, section.inertia_fore_aft), (ATHWARTSHIPS, section.inertia_athwartships)):
        deflection, euler = result.hollow.in_direction(way)
        assert deflection == pytest.approx(result.head_load * L**3 / (3 * e * inertia), rel=1e-3)
        assert euler == pytest.approx(math.pi**2 * e * inertia / (4 * L**2), rel=1e-3)
    assert result.hollow.direction == ATHWARTSHIPS  # 80 mm athwartships: the weaker way
    assert result.hollow.euler_load == result.hollow.in_direction(ATHWARTSHIPS)[1]
    plan_i = math.pi * 60 * 40**3 / 4
    assert result.plan.euler_load == pytest.approx(math.pi**2 * spar.plan.wood.moe * plan_i / (4 * L**2), rel=1e-3)


def test_verdict_is_the_least_of_each_direction():
    """A hollow oval turned the other way from its plan (deep athwartships): far short fore-and-aft, over the
    target athwartships; the verdict fails and names the EI ratio, the least of the two."""
    spar = oval_spar(hollow={"stations": [[0, 80, 120], [3000, 80, 120]]})
    result = assess(spar)
    c = result.stations[0]
    assert c.ei_ratio_in(FORE_AFT) < 1 < c.ei_ratio_in(ATHWARTSHIPS)
    assert c.ei_ratio == c.ei_ratio_in(FORE_AFT)
    assert not c.ei_ok and c.ei_ok_in(ATHWARTSHIPS) and not c.ei_ok_in(FORE_AFT)
    assert not result.passed


def test_rectangle_plan_against_roark():
    """A rectangular plan 100 × 60 mm: I = b d³ / 12 each way (Roark), form factor 1 (the rectangle's)."""
    spar = oval_spar(plan={"shape": "rectangle", "stations": [[0, 100, 60], [3000, 100, 60]]},
                     hollow={"shape": "oval", "stations": [[0, 110, 70], [3000, 110, 70]]})
    c = assess(spar).stations[0]
    assert c.plan.inertia_in(FORE_AFT) == pytest.approx(60 * 100**3 / 12, rel=1e-12)
    assert c.plan.inertia_in(ATHWARTSHIPS) == pytest.approx(100 * 60**3 / 12, rel=1e-12)
    assert c.plan.form_factor_in(FORE_AFT) == pytest.approx(1.0, rel=1e-12)
    assert c.plan.moment_in(FORE_AFT) == pytest.approx(spar.plan.wood.mor * 60 * 100**2 / 6, rel=1e-12)


def test_round_spar_pairs_are_equal_and_ei_ratio_unchanged():
    from conftest import make_spar

    doc = document(design(make_spar()))
    for s in doc["stations"]:
        assert s["ei_ratio_fore_aft"] == s["ei_ratio_athwartships"] == s["ei_ratio"]
        assert s["EI_fore_aft_Nmm2"] == s["EI_athwartships_Nmm2"] == s["EI_Nmm2"]
        assert s["fore_aft_mm"] == s["athwartships_mm"] == s["od_mm"]
    assert doc["spar"]["shape"] == "round"


# --- the sample, end to end --------------------------------------------------------------------------------------

@pytest.fixture(scope="module")
def built(tmp_path_factory):
    from typer.testing import CliRunner

    from stavegen.cli import app

    out = tmp_path_factory.mktemp("oval")
    result = CliRunner().invoke(app, ["build", str(SAMPLE), "-o", str(out)])
    assert result.exit_code == 0, result.output
    return out


def test_sample_json_gives_both_directions(built):
    doc = json.loads((built / "sharpie-oval-mainmast.json").read_text())
    assert doc["spar"]["shape"] == "oval"
    keys = ("fore_aft_mm", "athwartships_mm", "I_fore_aft_mm4", "I_athwartships_mm4", "EI_fore_aft_Nmm2",
            "EI_athwartships_Nmm2", "plan_EI_fore_aft_Nmm2", "plan_EI_athwartships_Nmm2", "ei_ratio_fore_aft",
            "ei_ratio_athwartships", "ei_ratio", "od_mm", "EI_Nmm2")
    for s in doc["stations"]:
        assert all(k in s for k in keys)
        assert s["ei_ratio"] == min(s["ei_ratio_fore_aft"], s["ei_ratio_athwartships"])
        assert s["ei_ratio_fore_aft"] == pytest.approx(s["EI_fore_aft_Nmm2"] / s["plan_EI_fore_aft_Nmm2"], rel=1e-12)
        assert s["fore_aft_mm"] > s["athwartships_mm"]
        assert len(set(round(w, 6) for w in s["stave_widths_mm"])) == 4  # 12 staves round an oval: 4 kinds
    check = doc["check"]
    assert check["min_ei_ratio"] == min(check["min_ei_ratio_fore_aft"], check["min_ei_ratio_athwartships"])
    assert doc["beam"]["weaker_direction"] in ("fore_aft", "athwartships")
    assert {"hollow_euler_load_fore_aft_N", "hollow_euler_load_athwartships_N"} <= set(doc["beam"])


def test_sample_templates_carry_each_staves_own_widths(built):
    """Every stave's segments in the DXF (read with ezdxf) have the width its own place in the oval gives it at
    the heel and head of each segment; staves of different kinds differ."""
    ezdxf = pytest.importorskip("ezdxf")
    spar = load_spar(SAMPLE)
    d = design(spar, layout=True)
    layout = d.layout
    assert layout.distinct and len(layout.plans) == 4
    from stavegen.stations.evaluate import SectionCache

    cache = SectionCache(d.spar)
    for stave in layout.staves:
        for seg in stave:
            kind = layout.kinds[seg.stave - 1]
            for z in (max(seg.start, 0.0), min(seg.end, spar.length)):
                a, b = seg.edges_at(layout.plan_for(seg.stave).s_at(z) - layout.plan_for(seg.stave).s_at(seg.start))
                assert b - a == pytest.approx(cache.at(z).widths[kind], abs=1e-6)
    widest = {k: max(seg.widest for seg in layout.staves[layout.kinds.index(k)]) for k in range(4)}
    assert len({round(w, 3) for w in widest.values()}) == 4
    doc = ezdxf.readfile(built / "sharpie-oval-mainmast-templates.dxf")
    outlines = [e for e in doc.modelspace() if e.dxftype() == "LWPOLYLINE" and e.dxf.layer == "STAVE-CUT"]
    assert len(outlines) == len(layout.segments)
    drawn = sorted(max(p[1] for p in e.get_points()) - min(p[1] for p in e.get_points()) for e in outlines)
    factor = 25.4 if doc.header.get("$INSUNITS") == 1 else 1.0  # the sheet is in inches for an inch spar
    assert [w * factor for w in drawn] == pytest.approx(sorted(seg.widest for seg in layout.segments), abs=1e-4)


def test_sample_cut_list_widths_per_stave(built):
    spar = load_spar(SAMPLE)
    text = (built / "sharpie-oval-mainmast-cutlist.csv").read_text()
    warnings, rows, _ = cut_list(text)
    assert not warnings
    staves = {r["stave"] for r in rows}
    assert len(staves) == spar.hollow.staves
    heel_widths = {r["stave"]: r[next(k for k in r if k.startswith("width at heel end (decimal"))]
                   for r in rows if r["segment"] == "1"}
    # staves 1 and 7 face athwartships (the widest), 4 and 10 fore-and-aft (the narrowest)
    assert heel_widths["1"] == heel_widths["7"] and heel_widths["4"] == heel_widths["10"]
    assert float(heel_widths["1"]) > float(heel_widths["2"]) > float(heel_widths["3"]) > float(heel_widths["4"])


# --- sizing: the scale applies to both dimensions -----------------------------------------------------------------

def _passes(spar) -> bool:
    return assess(spar).passed


@pytest.mark.parametrize("wall", ["auto", "auto-tapered"])
def test_oval_wall_auto_is_the_least(wall):
    """The solved wall passes the check in both directions, and 1 % thinner fails it (the solved size is the
    least); the staves' bore corners stay inside the oval."""
    from dataclasses import replace

    from stavegen.model.spar import Profile
    from stavegen.pipeline import resolve

    spar = oval_spar(hollow={"wall": wall, "stations": [[0, 126, 86], [3000, 118, 80]]},
                     plan={"stations": [[0, 120, 80], [3000, 112, 74]]})
    resolved, lines = resolve(spar)
    assert lines and "wall solved" in lines[0]
    assert _passes(resolved)
    thinner = Profile(resolved.hollow.wall.z, tuple(0.99 * v for v in resolved.hollow.wall.value))
    try:
        assert not _passes(replace(resolved, hollow=replace(resolved.hollow, wall=thinner)))
    except Exception as exc:  # a thinner wall may not even build (the round reaching the bore)
        assert "bore" in str(exc)


def test_oval_stations_auto_scales_both_dimensions():
    from dataclasses import replace

    from stavegen.model.spar import Profile
    from stavegen.pipeline import resolve

    spar = oval_spar(hollow={"stations": "auto", "wall": 14, "wood": "western-redcedar"})
    resolved, lines = resolve(spar)
    k = resolved.hollow.diameter.at(0) / 120
    assert k > 1  # a softer wood than the plan's needs a larger oval
    assert resolved.hollow.athwartships.at(0) == pytest.approx(80 * k, rel=1e-12)
    assert _passes(resolved)
    smaller = replace(resolved.hollow, diameter=Profile((0.0, 3000.0), (120 * k * 0.99,) * 2),
                      athwartships=Profile((0.0, 3000.0), (80 * k * 0.99,) * 2))
    assert not _passes(replace(resolved, hollow=smaller))


def test_oval_stations_auto_needs_a_plan_of_two_dimensions():
    data = spar_dict()
    data["hollow"].update({"shape": "oval", "stations": "auto", "staves": 12})
    with pytest.raises(InputError) as caught:
        parse_spar(data, "test.toml")
    assert caught.value.key == "hollow.stations"
