"""Sheathing layers, reinforcing strips and materials of the file's own, end to end.

References: hand calculations written beside each check (girths 2πr, Roark's thin ring), the rule of
mixtures for a laminate's density (fibre and resin by weight over the ply's thickness; E-glass 2,540 kg/m³,
carbon fibre 1,800 kg/m³, epoxy 1,150 kg/m³: common practice, from memory — verify), and the sample's own
JSON summed independently.
"""

import json
import math

import pytest

from stavegen.errors import InputError
from stavegen.model.loader import load_spar, parse_spar
from stavegen.model.materials import laminate_table
from stavegen.pipeline import design
from stavegen.section.regions import LAYER, STRIP
from stavegen.stations.evaluate import SectionCache
from stavegen.layout.sheathing import cloth_and_resin
from conftest import SAMPLES, spar_dict

SAMPLE = SAMPLES / "sheathed-mast-metric.toml"
FIBRE_DENSITY = {"glass": 2540.0, "carbon": 1800.0}  # kg/m³, common practice, from memory — verify


def test_every_laminate_names_its_source_and_hangs_together():
    for key, m in laminate_table().items():
        assert "from memory" in m.source and "verify" in m.source and "CMH-17" in m.source
        # Fibre volume from the fibre's weight: hand lay-up lands between a quarter and a bit over half.
        fibre = FIBRE_DENSITY["carbon" if key.startswith("carbon") else "glass"]
        vf = m.fibre_g_m2 / fibre / m.ply_thickness  # g/m² over kg/m³ over mm = a fraction
        assert 0.25 < vf < 0.55, key
        # The resin fills the rest of the ply (hand laid: at least that much, a coat of filling at most 30 % more).
        resin_volume = m.resin_g_m2 / 1150
        assert 0.95 * (1 - vf) * m.ply_thickness < resin_volume < 1.3 * (1 - vf) * m.ply_thickness, key
        assert m.density == pytest.approx((m.fibre_g_m2 + m.resin_g_m2) / m.ply_thickness)
        # Along the fibres no laminate is stiffer than its fibres' share by the rule of mixtures.
        fibre_modulus = 230000 if key.startswith("carbon") else 72000  # MPa, from memory — verify
        share = 1.0 if m.kind == "tape" else 0.5  # a woven cloth has half its fibres along the spar
        assert m.moe < (share * vf * fibre_modulus + (1 - vf) * 3200) * 1.01, key


def test_mixed_bases_are_warned_of():
    spar = parse_spar(spar_dict(plan={"wood": "en338-c24"}), "t.toml")
    assert any("different kinds" in n and "EN 338" in n for n in spar.notices)
    assert not parse_spar(spar_dict(), "t.toml").notices


def test_uniform_spar_cloth_and_resin_by_hand():
    """Two plies of 6 oz on a 100 mm spar 3 m long: the wood at 49.5 mm, plies at 49.5–49.75 and 49.75–50 mm.
    Net area 2π·3000·(49.625 + 49.875) mm² = 1.8755 m²; resin 0.2 kg/m² of ply (the data's coverage)."""
    spar = parse_spar(spar_dict(hollow={"layer": [{"material": "glass-6oz", "plies": 2}]}), "t.toml")
    (item,) = cloth_and_resin(spar, SectionCache(spar))
    expected = 2 * math.pi * 3000 * (49.625 + 49.875) / 1e6
    assert item.net_area == pytest.approx(expected, rel=1e-12)
    assert item.resin == pytest.approx(0.2 * expected, rel=1e-12)
    # One piece per ply, each the widest girth plus a 25 mm overlap wide; two fit across a 1270 mm roll.
    assert item.piece_width == pytest.approx(2 * math.pi * 49.875 + 25)
    assert item.pieces == 2 and item.roll_length == pytest.approx(3.0)


@pytest.mark.parametrize("strip, words", [
    ({"material": "carbon-ud", "width": 40, "plies": 1}, "do not fit"),
    ({"material": "carbon-ud", "width": 10, "thickness": 20, "place": "groove"}, "goes through the stave"),
    ({"material": "no-such-tape", "width": 10}, "unknown laminate"),
    ({"material": "carbon-ud", "width": 10, "plies": 2, "thickness": 1}, "not both"),
])
def test_strips_that_cannot_be_made_are_refused(strip, words):
    with pytest.raises(InputError) as err:
        design(parse_spar(spar_dict(hollow={"strip": [strip]}), "t.toml"))
    assert words in err.value.one_line() and "hollow.strip" in err.value.one_line()


def test_own_materials_wherever_a_wood_or_laminate_is_asked():
    data = spar_dict(hollow={"wood": "larch", "layer": [{"material": "my-cloth", "plies": 1}]},
                     materials={"larch": {"E_mpa": 12000, "density_kg_m3": 590, "mor_mpa": 93, "source": "mine"},
                                "my-cloth": {"E_mpa": 12500, "density_kg_m3": 1600, "strength_mpa": 140,
                                             "ply_thickness": 0.3}})
    spar = parse_spar(data, "t.toml")
    assert spar.hollow.wood.moe == 12000 and spar.hollow.wood.source == "mine"
    assert spar.hollow.layers[0].thickness == pytest.approx(0.3)
    bad = spar_dict(hollow={"layer": [{"material": "larch"}]}, materials=data["materials"])
    with pytest.raises(InputError, match="is a wood"):
        parse_spar(bad, "t.toml")


def test_the_sample_builds_and_its_json_adds_up(run, tmp_path):
    result = run(["build", str(SAMPLE), "-o", str(tmp_path)])
    assert result.exit_code == 0, result.stdout
    doc = json.loads(next(tmp_path.glob("*.json")).read_text())
    layers = sum(layer["thickness_mm"] for layer in doc["layers"])
    for station in doc["stations"]:
        regions = station["regions"]
        assert sum(r["E_mpa"] * r["I_mm4"] for r in regions) == pytest.approx(station["EI_Nmm2"], rel=1e-12)
        assert station["od_mm"] - station["wood_od_mm"] == pytest.approx(2 * layers, abs=1e-9)
        assert {"material", "kind", "E_mpa", "area_mm2", "I_mm4"} <= set(regions[0])
    kinds = {r["kind"] for r in doc["stations"][3]["regions"]}
    assert kinds == {"stave", "strip", "layer"}
    assert {c["kind"] for c in doc["sheathing"]} == {"layer", "strip"}
    # The mass of the regions is the hollow spar's.
    assert sum(r["mass_kg"] for r in doc["regions"]) == pytest.approx(doc["mass"]["hollow_kg"], rel=1e-9)


def test_carbon_makes_the_auto_wall_thinner_and_cloth_counts():
    """The sample's wall = "auto" solved with, and without, its strips and its cloth: each lets the wall be thinner
    (the wood under the cloth is smaller, so the cloth must more than make up for it), and every solution is
    verified on the exact sections by the sizing itself."""
    text = SAMPLE.read_text(encoding="utf-8")
    strip_at, stock_at, layer_at = text.index("[[hollow.strip]]"), text.index("[stock]"), text.index("[[hollow.layer]]")
    walls = {}
    for name, body in (("all", text), ("no strips", text[:strip_at] + text[stock_at:]),
                       ("bare", text[:layer_at] + text[stock_at:])):
        import tomllib
        spar = parse_spar(tomllib.loads(body), "t.toml")
        walls[name] = float(design(spar).spar.hollow.wall.largest)
    assert walls["all"] < walls["no strips"] < walls["bare"]


def test_materials_command_lists_every_laminate_with_sources(run):
    result = run(["materials", "--units", "mm"], env={"COLUMNS": "200"})
    assert result.exit_code == 0
    for key in laminate_table():
        assert key in result.stdout
    assert "CMH-17" in result.stdout and "verify" in result.stdout


def test_an_oval_spar_takes_layers_and_strips_end_to_end(run, tmp_path):
    """An oval with cloth and carbon builds; its JSON adds up (E·I the sum of its regions', the wood inside the
    layers on both axes); the cloth is the girth of the parallel curve laid on: the wood ellipse's perimeter by
    Ramanujan's second approximation (Ramanujan, 1914; error below 1e-9 here) plus 2π times the plies under it,
    linear in z where the dimensions are, so Simpson's rule is exact."""
    data = spar_dict(
        plan={"shape": "oval", "stations": [[0, 110, 90], [3000, 80, 64]]},
        hollow={"shape": "oval", "staves": 12, "wall": 18, "planing_allowance": 1.5,
                "stations": [[0, 114, 94], [3000, 84, 68]],
                "layer": [{"material": "glass-6oz", "plies": 2}],
                "strip": [{"material": "carbon-ud", "width": 5, "plies": 2, "place": "inner-face"}]},
        stock={"thickness": 22, "widths": [95, 145], "lengths": [3600], "kerf": 3, "scarf_ratio": 8})
    import tomlkit

    path = tmp_path / "oval.toml"
    path.write_text(tomlkit.dumps(data), encoding="utf-8")
    result = run(["build", str(path), "-o", str(tmp_path / "out")])
    assert result.exit_code in (0, 1), result.stdout
    doc = json.loads(next((tmp_path / "out").glob("*.json")).read_text())
    for station in doc["stations"]:
        assert sum(r["E_mpa"] * r["I_mm4"] for r in station["regions"]) == pytest.approx(station["EI_Nmm2"], rel=1e-9)
        assert station["fore_aft_mm"] - station["wood_fore_aft_mm"] == pytest.approx(1.0, abs=1e-9)
        assert station["athwartships_mm"] - station["wood_athwartships_mm"] == pytest.approx(1.0, abs=1e-9)
        assert {r["kind"] for r in station["regions"]} >= {"stave", "strip", "layer"}

    def ramanujan(a, b):
        h = ((a - b) / (a + b)) ** 2
        return math.pi * (a + b) * (1 + 3 * h / (10 + math.sqrt(4 - 3 * h)))

    def girth(z, offset):
        fa, ath = 114 + (84 - 114) * z / 3000, 94 + (68 - 94) * z / 3000
        return ramanujan(fa / 2 - 0.5, ath / 2 - 0.5) + 2 * math.pi * offset

    # The girth is not quite linear in z (an ellipse's perimeter in its axes), so integrate finely by hand.
    steps = 3000
    expected = sum(girth((i + 0.5) * 3000 / steps, off) for i in range(steps) for off in (0.125, 0.375)) * 1.0
    (cloth,) = [c for c in doc["sheathing"] if c["kind"] == "layer"]
    assert cloth["net_area_m2"] == pytest.approx(expected / 1e6, rel=1e-6)
