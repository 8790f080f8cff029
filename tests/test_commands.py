"""The commands as a user runs them: exit codes, JSON keys, files written."""

import json
import os

import pytest

from stavegen.model.loader import load_spar
from stavegen.units import format_mass

from conftest import SAMPLES

STATION_KEYS = {"z_mm", "od_mm", "wall_mm", "stave_width_mm", "notch_depth_mm", "apex_height_mm",
                "across_flats_mm", "area_mm2", "I_mm4", "EI_Nmm2", "plan_od_mm", "plan_I_mm4",
                "plan_EI_Nmm2", "ei_ratio", "strength_ratio", "void_mm2", "min_wall_mm", "plug"}


@pytest.mark.parametrize("name, code", [("daysailer-mast.toml", 0), ("yawl-mainmast-metric.toml", 0),
                                        ("skiff-boom-too-light.toml", 1)])
def test_check_exit_codes_and_json(run, name, code):
    result = run(["check", SAMPLES / name, "--json"])
    assert result.exit_code == code, result.output
    doc = json.loads(result.stdout)
    assert set(doc) >= {"spar", "stations", "check", "mass"}
    assert set(doc["spar"]) >= {"name", "length_mm", "staves", "joint", "units"}
    assert set(doc["check"]) >= {"passed", "min_ei_ratio", "min_ei_ratio_z_mm", "min_strength_ratio"}
    assert set(doc["mass"]) >= {"hollow_kg", "plan_kg", "hollow_cg_mm", "plan_cg_mm"}
    for station in doc["stations"]:
        assert set(station) >= STATION_KEYS
    assert doc["check"]["passed"] is (code == 0)
    least = min(doc["stations"], key=lambda s: s["ei_ratio"])
    assert doc["check"]["min_ei_ratio"] == least["ei_ratio"]
    assert doc["check"]["min_ei_ratio_z_mm"] == least["z_mm"]
    # EI ratio is the quotient of the two EI columns at every station.
    for s in doc["stations"]:
        assert s["ei_ratio"] == pytest.approx(s["EI_Nmm2"] / s["plan_EI_Nmm2"], rel=1e-12)


def test_check_table_names_the_least_station_and_shows_cautions(run):
    result = run(["check", SAMPLES / "skiff-boom-too-light.toml"])
    assert result.exit_code == 1
    assert "FAIL" in result.stdout and "short by" in result.stdout
    assert "does not replace a designer" in result.stdout
    ok = run(["check", SAMPLES / "daysailer-mast.toml"])
    assert ok.exit_code == 0 and "PASS" in ok.stdout and "least" in ok.stdout
    assert "qualified designer" in ok.stdout


def test_stations_include_marks_file_stations_and_plug_ends(run):
    doc = json.loads(run(["check", SAMPLES / "daysailer-mast.toml", "--json"]).stdout)
    z = [s["z_mm"] for s in doc["stations"]]
    assert z == sorted(z) and z[0] == 0 and z[-1] == pytest.approx(17 * 304.8)
    for expected in (0, 1.5 * 304.8, 9 * 304.8, 15.5 * 304.8, 16 * 304.8):  # plan stations, plug ends
        assert any(abs(v - expected) < 0.05 for v in z), expected
    assert all(any(abs(v - k * 304.8) < 0.05 for v in z) for k in range(1, 17))  # every foot
    # The plug at the heel ends at 1 ft 6 in: the station there counts the open bore beside it.
    at_plug_end = next(s for s in doc["stations"] if abs(s["z_mm"] - 457.2) < 0.05)
    assert at_plug_end["plug"] is False


def test_section_command(run):
    result = run(["section", SAMPLES / "daysailer-boom.toml", "--at", "7 ft 6 in"])  # eight staves
    assert result.exit_code == 0, result.output
    assert "stave width" in result.stdout and "45.00°" in result.stdout
    bad = run(["section", SAMPLES / "daysailer-boom.toml", "--at", "30 ft"])
    assert bad.exit_code == 2 and "--at" in bad.stderr


def test_woods_command(run):
    result = run(["woods"])
    assert result.exit_code == 0
    assert "sitka-spruce" in result.stdout and "1,570,000" in result.stdout and "from memory" in result.stdout
    metric = run(["woods", "--units", "mm"])
    assert "MPa" in metric.stdout


@pytest.mark.parametrize("units", ["in", "mm"])
def test_init_writes_a_valid_spar_that_checks(run, tmp_path, units):
    path = tmp_path / "mine.toml"
    assert run(["init", path, "--units", units]).exit_code == 0
    spar = load_spar(path)
    assert spar.units == units
    assert run(["check", path]).exit_code in (0, 1)
    again = run(["init", path])
    assert again.exit_code == 2 and "already exists" in again.stderr
    # The templates-on-boards option is in the file, off; switched on, it loads on.
    text = path.read_text()
    assert not spar.output.templates_on_boards and "templates_on_boards = false" in text
    path.write_text(text.replace("templates_on_boards = false", "templates_on_boards = true"))
    assert load_spar(path).output.templates_on_boards


def test_build_writes_json(run, tmp_path):
    out = tmp_path / "out"
    result = run(["build", SAMPLES / "yawl-mainmast-metric.toml", "-o", out])
    assert result.exit_code == 0, result.output
    doc = json.loads((out / "yawl-mainmast.json").read_text())
    assert doc["spar"]["units"] == "mm"
    assert not [p for p in os.listdir(out) if p.endswith(".part")]


def test_build_without_a_file_builds_the_bundled_example(run, tmp_path):
    result = run(["build", "-o", tmp_path])
    assert result.exit_code == 0, result.output
    assert (tmp_path / "day-sailer.json").exists()


def test_build_into_an_unwritable_place(run, tmp_path):
    blocker = tmp_path / "file"
    blocker.write_text("not a folder")
    result = run(["build", SAMPLES / "daysailer-mast.toml", "-o", blocker / "out"])
    assert result.exit_code == 2
    assert "-o/--out" in result.stderr and "\n" not in result.stderr.strip()


def test_build_ends_with_a_short_summary(run, tmp_path):
    """Pass or fail, boards to buy and board feet, scarfs, weight saved: the JSON's figures, a few lines."""
    for sample, word in (("daysailer-mast.toml", "PASS"), ("skiff-boom-too-light.toml", "FAIL")):
        out = tmp_path / sample
        result = run(["build", SAMPLES / sample, "-o", out])
        assert result.exit_code == (0 if word == "PASS" else 1), result.output
        doc = json.loads(next(out.glob("*.json")).read_text())
        units = doc["spar"]["units"]
        text = " ".join(result.stdout.split())
        assert word in text and ("FAIL" if word == "PASS" else "PASS") not in text
        stock = doc["stock"]
        n = sum(b["count"] for b in stock["boards"])
        assert f"{n} boards, {stock['board_feet']:.1f} board feet" in text
        for b in stock["boards"]:
            assert f"{b['count']} of " in text
        scarfs = f"scarfs {len(doc['scarfs'])}, each" if doc["scarfs"] else "scarfs none"
        assert scarfs in text
        assert f"weight saved {format_mass(doc['mass']['saved_kg'], units)}" in text
        assert f"{len(list(out.iterdir()))} files into" in text
        assert "safety notes" in text
        summary = result.stdout.split("Order of operations")[0]
        assert len(summary.strip().splitlines()) <= 12
        # The order of operations follows, the same steps the JSON (and so the report and CSV) give.
        for step in doc["machining"]["steps"]:
            assert f"{step['step']}. {' '.join(step['text'].split())}" in text
        if word == "FAIL":
            assert "marked: this design fails its target" in text


def test_build_steps_are_reported_in_order(tmp_path):
    """The progress display is told each step, and each file as it is written (the files the folder then holds)."""
    from stavegen.build import write_outputs
    from stavegen.pipeline import design

    steps: list[str] = []
    result = design(load_spar(SAMPLES / "daysailer-mast.toml"), layout=True, step=steps.append)
    wanted = ["checking", "laying out", "ordering lumber"]
    at = [next(i for i, s in enumerate(steps) if s.startswith(w)) for w in wanted]
    assert at == sorted(at)
    names: list[str] = []
    write_outputs(result, tmp_path, step=names.append)
    assert sorted(names) == sorted(p.name for p in tmp_path.iterdir())
