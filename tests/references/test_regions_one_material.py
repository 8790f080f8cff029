"""The region model with one material gives the single-wood figures to 1e-12.

Reference: the transformed section of a wooden wall with solid blocking (Gere & Goodno, Mechanics of
Materials, composite beams; Wood Handbook on the lamination credit, from memory — verify), written out
here by hand from the section's own exact integrals:

    EI   = k · E_wall · I_wall + E_plug · I_bore
    M    = MOR_wall · (I_wall + n · I_bore) / R · F,  n = E_plug / E_wall,
    F    = form factor of Z / S with Z = Z_wall + n · Z_bore, S = (I_wall + n · I_bore) / R
    mass = ρ_wall · A_wall + ρ_plug · A_bore
"""

import math

import pytest

from stavegen.checks.ratios import form_factor
from stavegen.model.loader import load_spar
from stavegen.section.regions import PLUG, STAVE
from stavegen.sizing.targets import rounded_ring
from stavegen.stations.evaluate import regions_at
from stavegen.pipeline import design
from conftest import SPAR_SAMPLES


def by_hand(spar, section, plug, direction=None):
    """As the module says; for an oval, bending in ``direction``: I = ∫x² dA fore-and-aft (∫y² dA athwartships),
    Z its plastic modulus that way, R the oval's half-dimension that way."""
    h = spar.hollow
    wood = h.wood
    i_wall, i_bore = section.wall.polar / 2, section.bore.polar / 2
    if direction is not None:
        across = direction == "fore_aft"
        i_wall = section.wall.iyy if across else section.wall.ixx
        i_bore = section.bore.iyy if across else section.bore.ixx
        z_wall, z_bore = section.plastic_moduli_fore_aft if across else section.plastic_moduli_athwartships
        radius = section.semi_axes[0 if across else 1]
    else:
        z_wall, z_bore = section.plastic_moduli
        radius = section.radius
    ei = h.lamination_factor * wood.moe * i_wall
    transformed, plastic, mass = i_wall, z_wall, wood.density * 1e-9 * section.wall.area
    if plug is not None:
        n = plug.wood.moe / wood.moe
        ei += plug.wood.moe * i_bore
        transformed += n * i_bore
        plastic += n * z_bore
        mass += plug.wood.density * 1e-9 * section.bore.area
    elastic = transformed / radius
    factor = form_factor(plastic / elastic)
    return ei, wood.mor * elastic * factor, mass, factor


@pytest.mark.parametrize("path", SPAR_SAMPLES, ids=lambda p: p.stem)
def test_every_station_of_every_sample(path):
    done = design(load_spar(path))
    spar, result = done.spar, done.assessment
    plugged = 0
    for check in result.stations:
        s = check.station
        if s.regions.of_kind("layer") or s.regions.of_kind("strip"):
            pytest.skip("a sample with sheathing or strips: not one material")
        if spar.hollow.two_axis:  # an oval: each direction by hand
            for way in ("fore_aft", "athwartships"):
                ei, moment, mass, factor = by_hand(spar, s.section, s.plug, way)
                assert check.hollow.ei_in(way) == pytest.approx(ei, rel=1e-12, abs=0)
                assert check.hollow.moment_in(way) == pytest.approx(moment, rel=1e-12, abs=0)
                assert check.hollow.form_factor_in(way) == pytest.approx(factor, rel=1e-12, abs=0)
                assert check.hollow.mass_per_length == pytest.approx(mass, rel=1e-12, abs=0)
            assert check.hollow.first_limit.region.kind == STAVE
            continue
        ei, moment, mass, factor = by_hand(spar, s.section, s.plug)
        assert check.hollow.ei == pytest.approx(ei, rel=1e-12, abs=0)
        assert check.hollow.moment_capacity == pytest.approx(moment, rel=1e-12, abs=0)
        assert check.hollow.mass_per_length == pytest.approx(mass, rel=1e-12, abs=0)
        assert check.hollow.form_factor == pytest.approx(factor, rel=1e-12, abs=0)
        assert check.hollow.first_limit.region.kind == STAVE
        plugged += s.plug is not None
        kinds = [r.kind for r in s.regions.regions]
        assert kinds == ([STAVE, PLUG] if s.plug is not None else [STAVE])


def test_plug_of_the_staves_wood_and_the_closed_form():
    """The sizing's closed form (disc less the N-gon, Roark) goes through the same regions to the same figures."""
    spar = load_spar(next(p for p in SPAR_SAMPLES if "[[hollow.plug]]" in p.read_text(encoding="utf-8")))
    plug = spar.hollow.plugs[0]
    quick = rounded_ring(8, 40.0, 11.0, 1.5)
    regions = regions_at(spar, quick, plug)
    ei, moment, mass, _ = by_hand(spar, quick, plug)
    assert regions.ei == pytest.approx(ei, rel=1e-12)
    assert regions.mass_per_length == pytest.approx(mass, rel=1e-12)
    assert regions.centroid == (0.0, 0.0)
    # Disc of the staves' wood less the bore, plus the bore in the plug's wood (Roark, solid round and N-gon).
    disc = math.pi * 40.0**4 / 4
    assert regions.ei == pytest.approx(spar.hollow.lamination_factor * spar.hollow.wood.moe * (disc - quick.bore_inertia)
                                       + plug.wood.moe * quick.bore_inertia, rel=1e-12)
