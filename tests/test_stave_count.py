"""Choosing the stave count: every candidate laid out, the least wood bought, a workable stave.

References: the lumber rules' board foot (through the layout's own order),
and the workable stave of common practice (no source; stavegen's shop rule):
width from 1 to 5 times the thickness.
"""

import json

import pytest

from stavegen.model.loader import load_spar
from stavegen.sizing.count import WORKABLE_WIDTH_OVER_THICKNESS, compare_stave_counts

from conftest import SAMPLES


@pytest.fixture(scope="module")
def auto_mast(tmp_path_factory):
    text = (SAMPLES / "daysailer-mast.toml").read_text()
    text = text.replace("staves = 12", 'staves = "auto"          # chosen by stavegen')
    text = text.replace('wall = "5/8"', 'wall = "auto"')
    path = tmp_path_factory.mktemp("auto") / "auto-mast.toml"
    path.write_text(text)
    return path


@pytest.fixture(scope="module")
def comparison(auto_mast):
    return compare_stave_counts(load_spar(auto_mast))


def test_chosen_buys_the_least_wood_of_the_eligible(comparison):
    chosen = comparison.chosen
    assert chosen.eligible
    for c in comparison.candidates:
        if c.eligible:
            assert chosen.board_feet <= c.board_feet + 1e-9
            if c.board_feet == pytest.approx(chosen.board_feet, abs=1e-6):
                assert chosen.staves <= c.staves


def test_candidates_obey_their_labels(comparison):
    low, high = WORKABLE_WIDTH_OVER_THICKNESS
    for c in comparison.candidates:
        if c.refused:
            continue
        ratios = [s.station.section.stave_width / s.station.section.thickness for s in c.assessment.stations]
        assert c.workable == (low <= min(ratios) and max(ratios) <= high)
        if c.fits_stock:
            # The candidate's board feet are its own layout's lumber order, with waste.
            assert c.board_feet == pytest.approx(c.layout.lumber.to_buy_board_feet)
            assert c.layout.lumber.to_buy_board_feet >= c.layout.lumber.board_feet
        assert c.v_bit_one_pass == (c.staves == 8 and c.fits_stock)


def test_auto_staves_and_wall_build_end_to_end(run, auto_mast, tmp_path, comparison):
    result = run(["build", auto_mast, "-o", tmp_path])
    assert result.exit_code == 0, result.output
    doc = json.loads((tmp_path / "day-sailer-mast.json").read_text())
    assert doc["spar"]["staves"] == comparison.chosen.staves
    assert any(line.startswith("staves chosen") for line in doc["spar"]["solved"])
    assert any(line.startswith("wall solved") for line in doc["spar"]["solved"])
    assert doc["check"]["passed"]


def test_size_command_table_and_write_back(run, auto_mast, tmp_path, comparison):
    out = tmp_path / "chosen.toml"
    result = run(["size", auto_mast, "--write", out])
    assert result.exit_code == 0, result.output
    assert "◀ chosen" in result.stdout and "choice:" in result.stdout
    text = out.read_text()
    assert "# chosen by stavegen" in text  # comments kept
    written = load_spar(out)
    assert written.hollow.staves == comparison.chosen.staves
    solved_wall = comparison.chosen.spar.hollow.wall.largest
    assert written.hollow.wall.largest >= solved_wall - 1e-9            # rounded up, never down
    assert written.hollow.wall.largest - solved_wall < 25.4 / 32 + 1e-9  # by less than a 32nd
    assert run(["check", out]).exit_code == 0


def test_no_count_works_exit_2(run, tmp_path):
    text = (SAMPLES / "skiff-boom-too-light.toml").read_text().replace("staves = 6", 'staves = "auto"')
    path = tmp_path / "hopeless.toml"
    path.write_text(text)
    result = run(["check", path])
    assert result.exit_code == 2
    assert "hollow.staves" in result.stderr and "\n" not in result.stderr.strip()
