"""`stavegen size --sheathing` and the terminal's sheathing table.

References: the bare option against `stavegen check --json` on a copy of the sample with its layers and strips
deleted and written back as a spar file (tomlkit, an independent TOML writer); the cloth's weight by hand from
the sample's diameters (a ring of 2πr·t per length, the diameters linear between stations, so the trapezoid
rule is exact for the ring's area); the option figures measured by hand on the sample before the option existed
(auto wall 19.337 mm bare, 18.255 mm with cloth, 16.338 mm with cloth and carbon).
"""

import json
import math

import pytest
import tomlkit

from conftest import SAMPLES
from stavegen.model.loader import load_spar
from stavegen.sheathing_options import BARE, BOTH, LAYERS, compare_sheathing

SAMPLE = SAMPLES / "sheathed-mast-metric.toml"


@pytest.fixture(scope="module")
def comparison():
    return compare_sheathing(load_spar(SAMPLE))



def _edited(path, edit):
    """The sample with ``edit`` made to its tomlkit document (comments kept), written to ``path``."""
    doc = tomlkit.parse(SAMPLE.read_text(encoding="utf-8"))
    edit(doc)
    path.write_text(tomlkit.dumps(doc), encoding="utf-8")
    return path

def test_options_solve_the_wall_for_each_sheathing(comparison):
    names = [o.name for o in comparison.options]
    assert names == [BARE, LAYERS, BOTH] and comparison.solves
    wall = {o.name: o.spar.hollow.wall.largest for o in comparison.options}
    # Measured by hand before the option existed (the sizing solved three copies of the file).
    assert wall[BARE] == pytest.approx(19.337, abs=5e-4)
    assert wall[LAYERS] == pytest.approx(18.255, abs=5e-4)
    assert wall[BOTH] == pytest.approx(16.338, abs=5e-4)
    assert wall[BOTH] < wall[LAYERS] < wall[BARE]  # carbon lets the wall be thinner than cloth alone
    for o in comparison.options:
        assert o.design.passed
        assert o.design.assessment.weakest_stiffness.ei_ratio >= 1.0


def test_the_bare_option_is_check_on_the_file_without_its_sheathing(comparison, run, tmp_path):
    bare_file = _edited(tmp_path / "bare.toml", lambda doc: doc["hollow"].remove("layer").remove("strip"))
    result = run(["check", bare_file, "--json"])
    assert result.exit_code == 0, result.stdout
    checked = json.loads(result.stdout)
    bare = comparison.bare.design
    assert bare.spar.hollow.wall.largest == pytest.approx(checked["stations"][0]["wall_mm"], rel=1e-12)
    assert bare.assessment.hollow.mass.mass == pytest.approx(checked["mass"]["hollow_kg"], rel=1e-12)
    assert bare.assessment.weakest_stiffness.ei_ratio == pytest.approx(checked["check"]["min_ei_ratio"], rel=1e-12)
    assert bare.assessment.weakest_strength.strength_ratio == pytest.approx(checked["check"]["min_strength_ratio"],
                                                                            rel=1e-12)
    assert not checked.get("layers") and not any(r["kind"] in ("layer", "strip") for r in checked["regions"])


def test_the_table_prints_each_option_and_what_it_saves(comparison, run):
    result = run(["size", SAMPLE, "--sheathing"])
    assert result.exit_code == 0, result.stdout
    out = result.stdout
    assert "Sheathing compared" in out and "Stave counts" not in out
    lines = {name: next(line for line in out.splitlines() if line.strip().startswith(name + " "))
             for name in (BARE, LAYERS, BOTH)}
    # The wall dressed up onto the 0.1 mm grid (the safe way: thicker), as a builder dresses it.
    for name, wall in ((BARE, "19.4 mm"), (LAYERS, "18.3 mm"), (BOTH, "16.4 mm")):
        assert wall in lines[name]
    heavier = comparison.options[1].mass - comparison.bare.mass
    assert f"{heavier * 1000:.0f} g heavier" in lines[LAYERS]
    assert "passes" in lines[BARE]


def test_nothing_auto_is_said_and_the_sizes_stay_as_drawn(run, tmp_path):
    drawn = _edited(tmp_path / "drawn.toml", lambda doc: doc["hollow"].__setitem__("wall", 19.4))
    result = run(["size", drawn, "--sheathing"])
    assert result.exit_code == 0, result.stdout
    assert 'leaves nothing "auto"' in result.stdout
    comparison = compare_sheathing(load_spar(drawn))
    assert not comparison.solves
    assert {o.spar.hollow.wall.largest for o in comparison.options} == {19.4}


def test_a_spar_without_sheathing_says_so(run):
    result = run(["size", SAMPLES / "yawl-mainmast-metric.toml", "--sheathing"])
    assert result.exit_code == 0 and "no sheathing layers or strips" in result.stdout


def test_check_lists_the_layers_and_strips_with_what_they_add(run):
    result = run(["check", SAMPLE], env={"COLUMNS": "200"})
    assert result.exit_code == 0, result.stdout
    out = result.stdout
    assert "Sheathing and reinforcement" in out
    row = next(line for line in out.splitlines() if "glass-6oz" in line)
    assert "2 × 0.25 mm" in row and "the whole spar" in row
    strip = next(line for line in out.splitlines() if "carbon-ud" in line)
    assert "0.0 mm to 4000.0 mm" in strip
    # The cloth's weight by hand: two plies, 0.5 mm, over the finished diameters (linear between stations);
    # ring area π(R² − (R − t)²) is linear in z where R is, so the trapezoid rule is exact.
    spar = load_spar(SAMPLE)
    (layer,) = spar.hollow.layers
    t, rho = layer.thickness, layer.material.density
    zs, ds = spar.hollow.diameter.z, spar.hollow.diameter.value
    ring = [math.pi * ((d / 2) ** 2 - (d / 2 - t) ** 2) for d in ds]
    volume = sum((b - a) * (p + q) / 2 for a, b, p, q in zip(zs, zs[1:], ring, ring[1:]))  # mm³
    assert f"{rho * volume * 1e-9:.1f} kg" in row
    # What it adds to E·I, least to most over the stations, from the check's own figures.
    assert "+" in row and "%" in row


def test_an_option_that_cannot_be_built_says_why_in_its_row(run, tmp_path):
    """Boards 19 mm thick: the bare spar needs a 19.337 mm wall (measured above), more than the boards give, so
    its row says why (as `check` on the bare file does); with the cloth (18.255 mm) it can be built."""
    thin = _edited(tmp_path / "thin.toml", lambda doc: doc["stock"].__setitem__("thickness", 19))
    result = run(["size", thin, "--sheathing"])
    assert result.exit_code == 0, result.stdout
    bare = next(line for line in result.stdout.splitlines() if line.strip().startswith(BARE + " "))
    assert "cannot be built" in bare and "stock" in " ".join(result.stdout.split())
    comparison = compare_sheathing(load_spar(thin))
    assert comparison.bare.design is None and comparison.saved(comparison.options[1]) is None
    assert comparison.options[1].spar.hollow.wall.largest == pytest.approx(18.255, abs=5e-4)
    thin_bare = _edited(tmp_path / "thin-bare.toml", lambda doc: (doc["stock"].__setitem__("thickness", 19),
                                                                  doc["hollow"].remove("layer").remove("strip")))
    checked = run(["check", thin_bare])
    assert checked.exit_code == 2 and "stock" in checked.stdout + (checked.stderr if checked.stderr_bytes else "")
