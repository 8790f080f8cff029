"""Messages and `section` speak the file's units: an inch file gets inches, in², in⁴ and psi, never "0 mm".

Errors carry their figures in mm (and N/mm², kg/m³) with the key; the edge words them with the file's unit
system. Conversions checked against the definitions: 1 in = 25.4 mm exactly (so 1 in² = 645.16 mm²,
1 in⁴ = 416,231.4256 mm⁴, 1 in³ = 16,387.064 mm³) and 1 psi = 6,894.757 Pa (1 lbf = 4.4482216152605 N).
"""

from __future__ import annotations

import json
import pickle
import re

import pytest

from stavegen.errors import DesignError, InputError, area, length, position, stress
from stavegen.model.loader import parse_spar

from conftest import SAMPLES, spar_dict

IN = 25.4


def test_an_error_words_its_figures_in_the_units_it_is_given():
    err = DesignError("wall {wall} at {z}, overlap {a}, modulus {e}", "hollow.wall",
                      figures={"wall": length(15.875), "z": position(2286.0), "a": area(645.16), "e": stress(11000)})
    assert err.problem == "wall 15.9 mm at 2286.0 mm, overlap 645.2 mm², modulus 11,000 MPa"  # none known: SI
    err.in_units("in")
    assert err.problem == "wall 5/8\" at 7' 6\", overlap 1.000 in², modulus 1,595,415 psi"  # 11,000 / 0.00689476
    assert "mm" not in err.one_line()
    err.in_units("mm")  # the first unit system given stays
    assert "5/8\"" in err.problem
    back = pickle.loads(pickle.dumps(err))  # whole across the stave-count pool's processes
    assert (back.problem, back.key, back.units) == (err.problem, err.key, "in")


def test_a_small_length_is_not_printed_as_zero():
    err = InputError("off by {d}", figures={"d": length(0.2)}, units="in")
    assert err.problem == 'off by 0.0079"'  # 0.2 mm is under half a 32nd: four decimals, not 0"


def test_a_template_without_figures_is_left_alone():
    err = InputError("name {not a figure} and {wall}", units="in")
    assert err.problem == "name {not a figure} and {wall}"


def test_inch_file_messages_have_no_millimetres(run, tmp_path):
    """Every message an inch file can get from these keys, worded in inches (the cases print mm before)."""
    cases = {
        "hollow.plug[1].from": (dict(hollow={"plug": [{"from": -1, "to": 8}]}), "must be zero or more, got -1"),
        "hollow.wall": (dict(hollow={"stations": [[0, 3], ["12 ft", 3]], "wall": 1.75}),
                        'wall 1 3/4" is as thick as the spar\'s radius (1 1/2") at 0" from the heel'),
        "hollow.wood.density": (dict(hollow={"wood": {"name": "Lead", "moe": "1.5e6 psi", "mor": "9000 psi",
                                                      "density": "700 lb/ft3"}}),
                                "density 700.0 lb/ft³ is outside the range of woods (6.2 lb/ft³ to 87.4 lb/ft³)"),
    }
    for key, (changes, words) in cases.items():
        data = spar_dict(**changes)
        data["spar"].update(units="in", length="12 ft")
        data["plan"]["stations"] = [[0, 3], ["12 ft", 3]]
        data["hollow"].setdefault("wall", 0.5)
        data["hollow"]["planing_allowance"] = 0
        with pytest.raises(InputError) as err:
            parse_spar(data, "t.toml")
        assert err.value.key == key
        assert words in err.value.problem, err.value.problem
        assert " mm" not in err.value.one_line()


def test_section_off_the_spar_is_refused_in_the_files_units(run):
    result = run(["section", SAMPLES / "daysailer-boom.toml", "--at", "30 ft"])
    assert result.exit_code == 2
    assert "mm" not in result.stderr and "from the heel" in result.stderr
    assert re.search(r"\(0\" to \d+' \d+\" from the heel\)", result.stderr), result.stderr


def _number(text: str, label: str, unit: str) -> float:
    line = next(line for line in text.splitlines() if label in line)
    return float(re.search(rf"([\d,]+\.?\d*) {unit}", line).group(1).replace(",", ""))


def test_section_prints_inch_areas_and_moments_for_an_inch_spar(run):
    """At a station of the JSON (7 ft on the mast), the section's area, I and modulus in in², in⁴ and in³,
    and the same in mm², mm⁴ and mm³ with --si; both agree with the JSON's mm figures."""
    doc = json.loads(run(["check", "--json", SAMPLES / "daysailer-mast.toml"]).stdout)
    at = next(s for s in doc["stations"] if abs(s["z_mm"] - 7 * 12 * IN) < 1e-6)
    inch = run(["section", SAMPLES / "daysailer-mast.toml", "--at", "7 ft"])
    assert inch.exit_code == 0, inch.output
    out = inch.stdout
    assert "mm²" not in out and "mm⁴" not in out and "mm³" not in out
    assert _number(out, "wood area", "in²") == pytest.approx(at["area_mm2"] / IN**2, rel=5e-3)
    assert _number(out, "I of the wall", "in⁴") == pytest.approx(at["I_mm4"] / IN**4, rel=5e-3)
    si = run(["section", SAMPLES / "daysailer-mast.toml", "--at", "7 ft", "--si"]).stdout
    assert _number(si, "wood area", "mm²") == pytest.approx(at["area_mm2"], rel=1e-4)
    assert _number(si, "I of the wall", "mm⁴") == pytest.approx(at["I_mm4"], rel=1e-4)
    modulus_in = _number(out, "section modulus", "in³")
    assert modulus_in == pytest.approx(_number(si, "section modulus", "mm³") / IN**3, rel=5e-3)


def test_metric_section_keeps_millimetres(run):
    out = run(["section", SAMPLES / "yawl-mainmast-metric.toml", "--at", "2000"]).stdout
    assert "mm²" in out and "mm⁴" in out and "in²" not in out
