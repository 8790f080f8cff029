"""The built-in woods against the Wood Handbook table they were taken from.

Source of the expected figures: USDA Forest Products Laboratory, Wood Handbook
FPL-GTR-282 (2021), table 5-3a, clear wood at 12 % moisture content — written
here from memory, as in the data file: verify against the published table.
"""

import pytest

from stavegen.model.woods import wood_table
from stavegen.units import MPA_PER_PSI

# key: (specific gravity, MOR psi, MOE 10^6 psi) — Wood Handbook table 5-3a, from memory — verify.
HANDBOOK = {
    "baldcypress": (0.46, 10600, 1.44),
    "douglas-fir-coast": (0.48, 12400, 1.95),
    "douglas-fir-interior-west": (0.50, 12600, 1.83),
    "sitka-spruce": (0.40, 10200, 1.57),
    "red-spruce": (0.40, 10800, 1.61),
    "western-hemlock": (0.45, 11300, 1.63),
    "port-orford-cedar": (0.43, 12700, 1.70),
    "alaska-yellow-cedar": (0.44, 11100, 1.42),
    "western-redcedar": (0.32, 7500, 1.11),
    "eastern-white-pine": (0.35, 8600, 1.24),
    "white-ash": (0.60, 15000, 1.74),
    "white-oak": (0.68, 15200, 1.78),
    "western-larch": (0.52, 13000, 1.87),
    "white-spruce": (0.36, 9400, 1.43),
    "engelmann-spruce": (0.35, 9300, 1.30),
    "noble-fir": (0.39, 10700, 1.72),
    "red-pine": (0.46, 11000, 1.63),
}
# key: (MOR MPa, E MPa, density kg/m³), clear-wood means of European handbooks (e.g. Wagenführ, Holzatlas),
# from memory — verify.
EUROPEAN = {
    "norway-spruce": (78, 10000, 460),
    "european-larch": (93, 12000, 590),
    "scots-pine": (87, 11500, 520),
}
# key: (f_m,k MPa, E_0,mean MPa, mean density kg/m³), EN 338 strength classes of graded softwood, from memory —
# verify. Characteristic values of graded timber, not clear-wood means.
EN338 = {
    "en338-c24": (24, 11000, 420),
    "en338-c30": (30, 12000, 460),
}


def test_every_wood_with_its_source():
    table = wood_table()
    assert set(table) == set(HANDBOOK) | set(EUROPEAN) | set(EN338)
    for key, wood in table.items():
        assert "from memory" in wood.source and "verify" in wood.source
        if key in HANDBOOK:
            assert "FPL-GTR-282" in wood.source and wood.basis == "clear"
        elif key in EN338:
            assert "EN 338" in wood.source and wood.basis == "EN 338"
        else:
            assert wood.basis == "clear"


@pytest.mark.parametrize("key", sorted(EUROPEAN) + sorted(EN338))
def test_metric_rows(key):
    mor, moe, density = {**EUROPEAN, **EN338}[key]
    wood = wood_table()[key]
    assert (wood.mor, wood.moe, wood.density) == (mor, moe, density)


def test_graded_class_far_below_clear_wood():
    """Common practice: a graded class's characteristic bending strength is a fraction of the clear-wood mean of
    the same species (knots, slope of grain, the fifth percentile): C24 against clear Norway spruce."""
    table = wood_table()
    assert table["en338-c24"].mor < table["norway-spruce"].mor / 2.5


@pytest.mark.parametrize("key", sorted(HANDBOOK))
def test_figures_match_the_handbook(key):
    sg, mor_psi, moe_mpsi = HANDBOOK[key]
    wood = wood_table()[key]
    assert wood.specific_gravity == sg
    assert wood.mor / MPA_PER_PSI == pytest.approx(mor_psi, rel=1e-9)
    assert wood.moe / MPA_PER_PSI == pytest.approx(moe_mpsi * 1e6, rel=1e-9)
    # Density at 12 % MC ≈ SG × 1000 kg/m³ × 1.12 (the water held at 12 % MC).
    assert wood.density == pytest.approx(sg * 1120, abs=0.5)


def test_interior_douglas_fir_about_a_quarter_stiffer_than_baldcypress():
    """Common practice (a builder's figure): baldcypress MOE 1.44 × 10⁶ psi, interior-west
    Douglas-fir 1.83 × 10⁶ psi, about 25 % stiffer."""
    table = wood_table()
    cypress = table["baldcypress"].moe / MPA_PER_PSI
    fir = table["douglas-fir-interior-west"].moe / MPA_PER_PSI
    assert cypress == pytest.approx(1.44e6)
    assert fir == pytest.approx(1.83e6)
    assert fir / cypress == pytest.approx(1.25, abs=0.03)
