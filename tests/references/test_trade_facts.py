"""Facts of the trade, each marked with its source.

Common practice (no source) unless named: scarf slope at least 8:1; end
allowance 2 to 4 in per stave end; planing allowance about 1/16 in on the
radius; classic 8-stave proportions (stave width about 0.4 × OD, thickness
about 0.2 × OD) — a rule of thumb used here only as a sanity check.
"""

import math

import pytest

from stavegen.checks.advice import END_ALLOWANCE_RANGE_MM, MIN_SCARF_RATIO
from stavegen.model.spar import Joint
from stavegen.section.properties import evaluate_section


def test_scarf_and_allowance_rules_of_common_practice():
    assert MIN_SCARF_RATIO == 8.0
    assert END_ALLOWANCE_RANGE_MM == pytest.approx((2 * 25.4, 4 * 25.4))


def test_classic_eight_stave_proportions():
    """Common practice (rule of thumb): 8 staves of thickness 0.2 × OD come out about 0.4 × OD wide."""
    od = 100.0
    sec = evaluate_section(8, Joint("birdsmouth-flush"), od / 2, 0.2 * od, 1.5)
    assert sec.stave_width / od == pytest.approx(0.4, abs=0.05)
    # Exactly: w = 2 a_o tan(22.5°) = 0.414 × (OD + 2 × allowance).
    assert sec.stave_width == pytest.approx((od + 3.0) * math.tan(math.pi / 8), rel=1e-12)


def test_default_planing_allowance_is_a_sixteenth():
    """Common practice: about 1/16 in (1.5 mm) on the radius."""
    from conftest import spar_dict
    from stavegen.model.loader import parse_spar

    data = spar_dict()
    data["hollow"].pop("planing_allowance")
    data["spar"]["units"] = "in"
    data["spar"]["length"] = 120
    data["plan"]["stations"] = [[0, 4], [120, 3]]
    data["hollow"]["wall"] = 0.75
    assert parse_spar(data).hollow.planing_allowance == pytest.approx(25.4 / 16)
