"""Rectangular hollow (box) spars: the section, the pieces, the rebate's saw passes, the file and the outputs.

References named beside each check: Roark's Formulas for Stress and Strain, Table A.1 (solid rectangle
I = b d³ / 12, hollow rectangle I = (B D³ − b d³) / 12, plastic modulus b d² / 4); sectionproperties (an
independent finite-element section analysis, test extra) for the box in both axes, corners rounded too; shapely
for the pieces tiling the wall; the rebate replayed as blade slabs a kerf wide at the printed settings (the shop
operation, :mod:`stavegen.layout.machining`'s model of the table saw); ezdxf as an independent DXF reader.
"""

import math

import pytest
import shapely
from shapely.affinity import scale as mirror
from shapely.geometry import Polygon, box

from stavegen.checks.assess import assess
from stavegen.checks.ratios import ATHWARTSHIPS, FORE_AFT
from stavegen.errors import DesignError, InputError
from stavegen.layout.machining import Blank, Side, cutter_settings, model_stave, replay
from stavegen.model.loader import load_spar, parse_spar
from stavegen.pipeline import design
from stavegen.render.json_doc import document
from stavegen.section.box import FACE, SIDE, evaluate_box

from conftest import SAMPLES, spar_dict

SAMPLE = SAMPLES / "catboat-box-boom.toml"
sp_geometry = pytest.importorskip("sectionproperties.pre.geometry")
sp_section = pytest.importorskip("sectionproperties.analysis.section")
sp_library = pytest.importorskip("sectionproperties.pre.library")


def box_spar(plan=None, hollow=None, **tables):
    """The uniform test spar as a box: plan 120 × 80 mm solid rectangle, hollow a box 16 mm wall round the same."""
    data = spar_dict(**tables)
    data["plan"].update({"shape": "rectangle", "stations": [[0, 120, 80], [3000, 120, 80]]})
    data["hollow"].pop("staves", None)
    data["hollow"].update({"shape": "rectangle", "joint": "box", "wall": 16})
    data["plan"].update(plan or {})
    data["hollow"].update(hollow or {})
    return parse_spar(data, "test.toml")


# --- Roark's closed forms ------------------------------------------------------------------------------------

@pytest.mark.parametrize("corner", ["sides-between-faces", "rebated", "pinwheel"])
@pytest.mark.parametrize("B, D, t", [(120.0, 80.0, 16.0), (60.0, 110.0, 9.5), (70.0, 70.0, 20.0)])
def test_hollow_rectangle_against_roark(corner, B, D, t):
    """Sharp corners, no planing allowance: I = (B D³ − b d³) / 12 about each axis, A = B D − b d, plastic modulus
    B D² / 4 − b d² / 4 (Roark, Table A.1), whichever way the corners are joined."""
    sec = evaluate_box(corner, B, D, t)
    b, d = B - 2 * t, D - 2 * t
    assert sec.area == pytest.approx(B * D - b * d, rel=1e-12)
    assert sec.inertia_athwartships == pytest.approx((B * D**3 - b * d**3) / 12, rel=1e-12)  # ∫y² dA
    assert sec.inertia_fore_aft == pytest.approx((D * B**3 - d * b**3) / 12, rel=1e-12)  # ∫x² dA
    assert sec.plastic_moduli_fore_aft[0] == pytest.approx(D * B**2 / 4 - d * b**2 / 4, rel=1e-12)
    assert sec.plastic_moduli_athwartships[0] == pytest.approx(B * D**2 / 4 - b * d**2 / 4, rel=1e-12)
    # the bore filled: the solid rectangle, I = b d³ / 12 (Roark)
    assert sec.inertia_athwartships + sec.bore_inertia_athwartships == pytest.approx(B * D**3 / 12, rel=1e-12)


def fe_properties(polygon):
    return fe_figures(sp_geometry.Geometry(shapely.set_precision(polygon, 1e-7)))


def fe_figures(geometry):
    """sectionproperties' area, second moments and plastic moduli of ``geometry``, meshed coarsely (exact for
    straight-sided pieces)."""
    geometry.create_mesh(mesh_sizes=[0])
    section = sp_section.Section(geometry)
    section.calculate_geometric_properties()
    section.calculate_plastic_properties()
    ixx, iyy, _ = section.get_ic()
    sxx, syy = section.get_s()
    return {"area": section.get_area(), "ixx": ixx, "iyy": iyy, "sxx": sxx, "syy": syy}


@pytest.mark.parametrize("corner", ["sides-between-faces", "rebated"])
@pytest.mark.parametrize("B, D, t, r", [(120.0, 80.0, 16.0, 0.0), (120.0, 80.0, 16.0, 10.0),
                                        (64.0, 100.0, 12.0, 12.0)])
def test_box_against_sectionproperties_library(corner, B, D, t, r):
    """sectionproperties' own rectangular hollow section (outer corners rounded r, the bore's sharp when r ≤ t) in
    both axes: area, both second moments and both plastic moduli."""
    sec = evaluate_box(corner, B, D, t, 0.0, r)
    # its d is along y: our athwartships dimension D; b along x: fore-and-aft B
    geometry = sp_library.rectangular_hollow_section(d=D, b=B, t=t, r_out=r, n_r=max(2, 181 if r else 1),
                                                     r_in=0.0)
    fe = fe_figures(geometry.shift_section(x_offset=-B / 2, y_offset=-D / 2))
    assert sec.area == pytest.approx(fe["area"], rel=1e-5)
    assert sec.inertia_athwartships == pytest.approx(fe["ixx"], rel=1e-5)
    assert sec.inertia_fore_aft == pytest.approx(fe["iyy"], rel=1e-5)
    assert sec.plastic_moduli_athwartships[0] == pytest.approx(fe["sxx"], rel=1e-4)
    assert sec.plastic_moduli_fore_aft[0] == pytest.approx(fe["syy"], rel=1e-4)


def test_box_with_allowance_against_sectionproperties_on_its_pieces():
    """The pieces as built (outer faces the planing allowance proud), clipped by the finished outline with its
    rounded corners: sectionproperties on that shapely polygon agrees with the closed form in both axes."""
    sec = evaluate_box("rebated", 110.0, 72.0, 14.0, 1.5, 8.0)
    pieces = shapely.union_all([Polygon(o) for o in sec.outlines], grid_size=1e-9)
    a, b = sec.semi_axes
    finished = box(-a + 8, -b + 8, a - 8, b - 8).buffer(8.0, quad_segs=360)
    fe = fe_properties(pieces.intersection(finished))
    assert sec.area == pytest.approx(fe["area"], rel=1e-5)
    assert sec.inertia_athwartships == pytest.approx(fe["ixx"], rel=1e-5)
    assert sec.inertia_fore_aft == pytest.approx(fe["iyy"], rel=1e-5)
    assert sec.inertia_fore_aft != pytest.approx(sec.inertia_athwartships, rel=1e-2)


# --- the pieces ----------------------------------------------------------------------------------------------

@pytest.mark.parametrize("corner, depth", [("sides-between-faces", None), ("rebated", None), ("rebated", 4.0),
                                           ("rebated", 11.0), ("pinwheel", None), ("pinwheel", 3.0)])
def test_pieces_tile_the_wall(corner, depth):
    """The four pieces overlap nowhere and leave no gap: their union is the outer rectangle (the allowance
    included) less the bore (shapely), each piece one polygon."""
    sec = evaluate_box(corner, 100.0, 64.0, 12.0, 1.0, 0.0, depth)
    polys = [Polygon(o) for o in sec.outlines]
    assert all(p.is_valid and p.geom_type == "Polygon" for p in polys)
    for i in range(4):
        for j in range(i + 1, 4):
            assert polys[i].intersection(polys[j]).area == pytest.approx(0.0, abs=1e-9)
    ox, oy = 51.0, 33.0
    ring = box(-ox, -oy, ox, oy).difference(box(-ox + 12, -oy + 12, ox - 12, oy - 12))
    union = shapely.union_all(polys)
    assert union.symmetric_difference(ring).area == pytest.approx(0.0, abs=1e-6)
    d = 0.0 if corner == "sides-between-faces" else (depth if depth is not None else 6.0)
    if corner == "pinwheel":  # each piece covers one corner and runs into the next piece's rebate at the other
        assert sec.widths[FACE] == pytest.approx(2 * oy - 12 + d, rel=1e-12)
        assert sec.widths[SIDE] == pytest.approx(2 * ox - 12 + d, rel=1e-12)
        return
    # faces span athwartships; sides fit between them (into the rebates)
    assert sec.widths[FACE] == pytest.approx(2 * oy, rel=1e-12)
    assert sec.widths[SIDE] == pytest.approx(2 * (ox - 12 + d), rel=1e-12)


def test_plugged_station_is_the_solid_rectangle():
    """A box plugged solid in its own wood, built to the plan's rectangle with no allowance: at a plugged station
    the transformed section is the solid rectangle exactly (Roark: b d³ / 12 each way), so both ratios are 1 in
    both directions, the strength's form factor being the rectangle's too."""
    wood = "sitka-spruce"
    spar = box_spar(plan={"wood": wood}, hollow={"wood": wood, "planing_allowance": 0,
                                                 "plug": [{"from": 0, "to": 1000}]})
    checks = assess(spar).stations
    plugged = [c for c in checks if c.station.plug is not None]
    assert plugged
    e = spar.hollow.wood.moe
    for c in plugged:
        assert c.hollow.ei_in(FORE_AFT) == pytest.approx(e * 80 * 120**3 / 12, rel=1e-12)
        assert c.hollow.ei_in(ATHWARTSHIPS) == pytest.approx(e * 120 * 80**3 / 12, rel=1e-12)
        for way in (FORE_AFT, ATHWARTSHIPS):
            assert c.ei_ratio_in(way) == pytest.approx(1.0, rel=1e-12)
            assert c.strength_ratio_in(way) == pytest.approx(1.0, rel=1e-12)
    open_ = [c for c in checks if c.station.plug is None]
    assert all(c.ei_ratio_in(FORE_AFT) < 1 and c.strength_ratio_in(FORE_AFT) < 1 for c in open_)


def test_strength_form_factor_of_a_box_is_below_the_rectangle():
    """The strength check's form factor for a hollow rectangle: its plastic shape factor (b d²/4 − …)/(I/c) is below
    the solid rectangle's 1.5 (Roark), so the interpolated factor is below 1: the safe side."""
    spar = box_spar()
    c = assess(spar).stations[0]
    for way in (FORE_AFT, ATHWARTSHIPS):
        assert c.hollow.form_factor_in(way) < 1.0
        assert c.plan.form_factor_in(way) == pytest.approx(1.0, rel=1e-12)


def replayed_face(settings, width: float, blank: Blank) -> Polygon:
    """The face as the shop makes it: the rebate passes on the blank as blade slabs (edge 1), edge 2 ripped square
    to the finished width, then the same passes on the piece turned over end for end so that edge 2 takes edge 1's
    place against the fence and on the table."""
    piece = replay(settings.saw, blank, ride_fence=True)
    piece = piece.intersection(box(-1.0, -1.0, width, blank.thickness + 1.0))  # the taper: a square rip
    turned = mirror(piece, xfact=-1.0, origin=(width / 2, 0.0))
    for p in settings.saw:
        assert not p.follows_blank_width  # set from the rebated edge and a face only: it follows the taper
    turned = replay(settings.saw, Blank(width, blank.thickness), stock=turned, ride_fence=True)  # slabs; offcuts fall off
    return shapely.normalize(mirror(turned, xfact=-1.0, origin=(width / 2, 0.0)))


@pytest.mark.parametrize("t, depth, kerf", [(12.0, None, 3.0), (14.0, 5.0, 3.2), (19.0, 12.0, 2.4)])
def test_rebate_passes_replayed_as_blade_slabs_carve_the_face(t, depth, kerf):
    """Two table-saw passes per rebate, each a slab a kerf wide at the fence and height the settings give: the board
    they leave is the model's face, both rebates cut, the offcuts free on the blade's far side."""
    sec = evaluate_box("rebated", 100.0, 64.0, t, 0.0, 0.0, depth)
    face = sec.kind_section(FACE)
    blank = Blank(face.stave_width + 7.0, t)
    settings = cutter_settings(face, kerf, blank)
    assert len(settings.saw) == 2 and {p.makes for p in settings.saw} == {"rebate's cheek", "rebate's floor"}
    assert all(p.tilt == 0.0 for p in settings.saw)
    carved = replayed_face(settings, face.stave_width, blank)
    model = model_stave(face)
    assert carved.symmetric_difference(model).area < 1e-9 * model.area
    d = t / 2 if depth is None else depth
    cheek = next(p for p in settings.saw if p.makes == "rebate's cheek")
    floor = next(p for p in settings.saw if p.makes == "rebate's floor")
    assert cheek.height == pytest.approx(d, rel=1e-12)  # the blade as high as the rebate is deep
    assert floor.height == pytest.approx(t, rel=1e-12)  # as high as the rebate is wide (the side's thickness)
    assert Side.EDGE_2 not in (cheek.on_fence, cheek.on_table, floor.on_fence, floor.on_table)


@pytest.mark.parametrize("kind", [SIDE, FACE])
def test_pinwheel_piece_is_carved_by_one_rebate_on_edge_1(kind):
    """The square birdsmouth (corner = "pinwheel"): every piece one rebate along edge 1, two passes as blade slabs
    at the printed settings, then edge 2 ripped square to width: the model's piece; the passes do not follow the
    blank's width (one setting for every segment)."""
    sec = evaluate_box("pinwheel", 110.0, 70.0, 14.0, 1.0, 0.0, 5.0)
    piece = sec.kind_section(kind)
    blank = Blank(piece.stave_width + 6.0, 14.0)
    settings = cutter_settings(piece, 3.2, blank)
    assert len(settings.saw) == 2 and not any(p.follows_blank_width for p in settings.saw)
    carved = replay(settings.saw, blank, ride_fence=True).intersection(box(-1.0, -1.0, piece.stave_width, 15.0))
    model = model_stave(piece)
    assert carved.symmetric_difference(model).area < 1e-9 * model.area
    assert {p.makes: p.height for p in settings.saw} == pytest.approx({"rebate's cheek": 5.0, "rebate's floor": 14.0})


def test_sides_and_unrebated_faces_have_no_passes():
    sec = evaluate_box("sides-between-faces", 100.0, 64.0, 12.0)
    for kind in (SIDE, FACE):
        s = cutter_settings(sec.kind_section(kind), 3.0)
        assert s.saw == () and s.bevel is None and s.v_face_angles is None
    rebated = evaluate_box("rebated", 100.0, 64.0, 12.0)
    assert cutter_settings(rebated.kind_section(SIDE), 3.0).saw == ()


def test_rounding_past_the_wall_is_refused():
    with pytest.raises(DesignError) as caught:
        evaluate_box("rebated", 100.0, 64.0, 12.0, 1.0, 11.5)
    assert caught.value.key == "hollow.corner_radius"


# --- the file ------------------------------------------------------------------------------------------------

def test_box_file_reads():
    spar = box_spar(hollow={"corner": "rebated", "corner_radius": 6, "rebate_depth": 7})
    h = spar.hollow
    assert (h.shape, h.joint.kind, h.staves, h.corner) == ("rectangle", "box", 4, "rebated")
    assert (h.corner_radius, h.rebate_depth) == (6.0, 7.0)
    assert h.athwartships.at(0) == pytest.approx(80.0)


@pytest.mark.parametrize("change, key, words", [
    ({"hollow": {"joint": "birdsmouth-flush", "staves": 8}}, "hollow.joint", 'joint = "box"'),
    ({"hollow": {"shape": "oval"}}, "hollow.shape", 'shape = "rectangle"'),
    ({"hollow": {"staves": 8}}, "hollow.staves", "4 pieces"),
    ({"hollow": {"corner_radius": 17}}, "hollow.corner_radius", "finished wall"),
    ({"hollow": {"corner": "rebated", "rebate_depth": 16}}, "hollow.rebate_depth", "not less than the wall"),
    ({"hollow": {"rebate_depth": 6}}, "hollow.rebate_depth", 'corner = "rebated"'),
    ({"hollow": {"corner": "mitred"}}, "hollow.corner", "sides-between-faces"),
    ({"hollow": {"notch_cut": "follow-wall"}}, "hollow.notch_cut", "thickest wall"),
    ({"hollow": {"staves": "auto"}}, "hollow.staves", "4 pieces"),
    ({"hollow": {"layer": [{"material": "glass-6oz", "plies": 1}]}}, "hollow.layer", "a box not yet"),
])
def test_bad_box_input_names_the_key(change, key, words):
    with pytest.raises(InputError) as caught:
        box_spar(**change)
    assert caught.value.key == key
    assert words in str(caught.value)


def test_box_keys_refused_on_a_round_spar():
    data = spar_dict()
    data["hollow"]["corner_radius"] = 5
    with pytest.raises(InputError) as caught:
        parse_spar(data, "test.toml")
    assert caught.value.key == "hollow.corner_radius"


def test_two_piece_box_is_refused():
    with pytest.raises(InputError) as caught:
        box_spar(parting={"at": 1500, "kind": "wood-spigot"})
    assert "two-piece box" in str(caught.value)


# --- sizing and outputs --------------------------------------------------------------------------------------

def test_auto_wall_meets_both_directions_and_holds_the_rounding():
    """wall = "auto" on a box: the solved wall meets both ratios in both directions at every station; one grid
    step thinner (1/32 in or 0.1 mm) misses somewhere, so it is the least that works."""
    spar = box_spar(hollow={"wall": "auto", "stations": [[0, 132, 92], [3000, 132, 92]], "corner_radius": 4})
    d = design(spar)
    wall = d.spar.hollow.wall.largest
    assert d.assessment.passed
    thinner = box_spar(hollow={"wall": wall - 0.1, "stations": [[0, 132, 92], [3000, 132, 92]],
                               "corner_radius": 4})
    assert not assess(thinner).passed


def test_auto_stations_scale_both_dimensions():
    spar = box_spar(hollow={"stations": "auto", "wall": 12})
    d = design(spar)
    h = d.spar.hollow
    k = h.diameter.at(0) / 120.0
    assert k > 1 and h.athwartships.at(0) == pytest.approx(80.0 * k, rel=1e-9)
    assert d.assessment.passed


def test_sample_json_two_directions_and_piece_widths():
    """The sample's JSON: the promised two-direction keys, shape rectangle, and the faces' and sides' widths at
    every station replayed from the finished dimensions (face = athwartships + 2 allowances; side = fore-and-aft +
    2 allowances − 2 walls + 2 rebate depths)."""
    spar = load_spar(SAMPLE)
    d = design(spar, layout=True)
    doc = document(d)
    assert doc["spar"]["shape"] == "rectangle" and doc["spar"]["joint"] == "box"
    h = spar.hollow
    t = h.wall.largest
    for s in doc["stations"]:
        for key in ("fore_aft_mm", "athwartships_mm", "I_fore_aft_mm4", "I_athwartships_mm4", "EI_fore_aft_Nmm2",
                    "EI_athwartships_Nmm2", "plan_EI_fore_aft_Nmm2", "plan_EI_athwartships_Nmm2",
                    "ei_ratio_fore_aft", "ei_ratio_athwartships"):
            assert s[key] > 0
        side, face = s["stave_widths_mm"][0], s["stave_widths_mm"][1]
        p = h.planing_allowance
        assert face == pytest.approx(s["athwartships_mm"] + 2 * p, rel=1e-9)
        assert side == pytest.approx(s["fore_aft_mm"] + 2 * p - 2 * t + 2 * (t / 2), rel=1e-9)
        assert s["EI_fore_aft_Nmm2"] > s["EI_athwartships_Nmm2"]
    layout = d.layout
    assert layout.distinct and len(layout.plans) == 2
    assert layout.plan_for(1) is layout.plan_for(3) and layout.plan_for(2) is layout.plan_for(4)
    assert layout.plan_for(1) is not layout.plan_for(2)


def test_sample_dxf_outlines_have_the_pieces_widths(tmp_path):
    """Every piece's outline in the template DXF, read back with ezdxf, spans the width of its piece (face or side)
    at its widest within a tolerance of the drawing's flattening."""
    ezdxf = pytest.importorskip("ezdxf")
    from stavegen.build import write_outputs

    d = design(load_spar(SAMPLE), layout=True)
    write_outputs(d, tmp_path)
    files = list(tmp_path.glob("*-templates.dxf"))
    assert files
    doc = ezdxf.readfile(files[0])
    per_unit = {1: 25.4, 4: 1.0}[doc.header.get("$INSUNITS")]  # inches or millimetres (DXF $INSUNITS codes)
    spans = []
    for e in doc.modelspace().query("LWPOLYLINE"):
        if e.closed and e.dxf.layer == "STAVE-CUT":
            ys = [p[1] for p in e.get_points("xy")]
            spans.append((max(ys) - min(ys)) * per_unit)
    assert len(spans) == 8  # 4 pieces of 2 segments each
    widest_side = max(st.width for st in d.layout.plan_for(1).stations)
    widest_face = max(st.width for st in d.layout.plan_for(2).stations)
    assert any(abs(s - widest_side) < 0.5 for s in spans)
    assert any(abs(s - widest_face) < 0.5 for s in spans)


def test_sides_between_faces_builds_every_output_with_no_saw_pass(tmp_path):
    """A millimetre box with plain corners: every output written; the order of operations has no table-saw pass
    (square edges only), the cut list names each row's piece, faces as wide as the spar athwartships."""
    from stavegen.build import write_outputs
    from stavegen.render.csv_cutlist import cutlist_rows

    stock = {"thickness": 19, "widths": [90, 140], "lengths": [2400, 3600], "kerf": 3}
    d = design(box_spar(hollow={"planing_allowance": 1.0}, stock=stock), layout=True)
    written = write_outputs(d, tmp_path)
    assert {p.suffix for p in written} >= {".json", ".csv", ".dxf", ".pdf"}
    assert not any(s.action == "saw pass" for s in d.layout.machining.steps)
    rows = cutlist_rows(d)
    header = next(r for r in rows if r and r[0] == "stave")
    pieces = {r[0]: r[header.index("piece")] for r in rows[rows.index(header) + 1:] if r and r[0].isdigit()
              and len(r) == len(header)}
    assert pieces == {"1": "side", "2": "face", "3": "side", "4": "face"}
    assert d.layout.plan_for(2).width_at(1500) == pytest.approx(80 + 2 * 1.0, rel=1e-9)
    assert d.layout.plan_for(1).width_at(1500) == pytest.approx(120 + 2 * 1.0 - 2 * 16, rel=1e-9)


def test_size_writes_the_solved_box_wall_and_it_checks(run, tmp_path):
    """`stavegen size --write` on a box with wall = "auto": no stave count compared; the printed wall (rounded up
    onto the 1/32 in grid) goes back into the spar file, and that file passes `stavegen check`."""
    text = SAMPLE.read_text(encoding="utf-8").replace('wall = "1/2"', 'wall = "auto"')
    source = tmp_path / "boom.toml"
    source.write_text(text, encoding="utf-8")
    written = tmp_path / "solved.toml"
    result = run(["size", source, "--write", written])
    assert result.exit_code == 0, result.output
    assert "no stave count to compare" in result.output
    solved = load_spar(written)
    assert solved.hollow.wall.is_constant and solved.hollow.staves == 4
    assert run(["check", written]).exit_code == 0


from hypothesis import given, settings, strategies as st  # noqa: E402


def second_moments(ring) -> tuple[float, float]:
    """(∫x² dA, ∫y² dA) of a closed counter-clockwise ring by Green's theorem, the textbook polygon formulas:
    ∫x² dA = Σ (x_i² + x_i x_j + x_j²) c / 12 with c = x_i y_j − x_j y_i (and the same in y)."""
    ix = iy = 0.0
    for (x0, y0), (x1, y1) in zip(ring, ring[1:]):
        c = x0 * y1 - x1 * y0
        ix += (x0 * x0 + x0 * x1 + x1 * x1) * c / 12
        iy += (y0 * y0 + y0 * y1 + y1 * y1) * c / 12
    return ix, iy


@settings(max_examples=25, deadline=None)
@given(fore_aft=st.floats(30.0, 300.0), share=st.floats(0.3, 3.0), wall_share=st.floats(0.05, 0.45),
       allowance=st.floats(0.0, 2.0), corner=st.sampled_from(["sides-between-faces", "rebated", "pinwheel"]),
       depth_share=st.floats(0.1, 0.9),
       round_share=st.floats(0.0, 1.0))
def test_any_box_tiles_and_matches_roark_less_its_corners(fore_aft, share, wall_share, allowance, corner,
                                                          depth_share, round_share):
    """Any box: the pieces tile the outer rectangle less the bore (shapely, no overlap, no gap), and the finished
    wall's I each way is Roark's hollow rectangle (B D³ − b d³)/12 less exactly what the rounded corners take:
    four corner squares r × r less four quarter discs, each integrated by shapely on a fine polygon (1e-4)."""
    athwartships = fore_aft * share
    t = wall_share * min(fore_aft, athwartships)
    if t <= allowance + 0.5:
        return
    r = round_share * (t - allowance)
    depth = depth_share * t if corner != "sides-between-faces" else None
    sec = evaluate_box(corner, fore_aft, athwartships, t, allowance, r, depth)
    polys = [Polygon(o) for o in sec.outlines]
    ox, oy = fore_aft / 2 + allowance, athwartships / 2 + allowance
    ring = box(-ox, -oy, ox, oy).difference(box(-ox + t, -oy + t, ox - t, oy - t))
    assert shapely.union_all(polys).symmetric_difference(ring).area <= 1e-9 * ring.area
    assert sum(p.area for p in polys) == pytest.approx(ring.area, rel=1e-9)
    B, D = fore_aft, athwartships
    b, d = 2 * (ox - t), 2 * (oy - t)
    sharp_fa = (D * B**3 - d * b**3) / 12
    sharp_at = (B * D**3 - b * d**3) / 12
    a_, b_ = B / 2, D / 2
    if r > 0:
        corner = box(a_ - r, b_ - r, a_, b_).difference(shapely.Point(a_ - r, b_ - r).buffer(r, quad_segs=256))
        fe = fe_like = 0.0
        from shapely.geometry.polygon import orient

        for g in getattr(corner, "geoms", [corner]):
            xy = list(orient(g, 1.0).exterior.coords)  # counter-clockwise: positive integrals
            fe += second_moments(xy)[0]
            fe_like += second_moments(xy)[1]
        assert sec.inertia_fore_aft == pytest.approx(sharp_fa - 4 * fe, rel=1e-4)
        assert sec.inertia_athwartships == pytest.approx(sharp_at - 4 * fe_like, rel=1e-4)
    else:
        assert sec.inertia_fore_aft == pytest.approx(sharp_fa, rel=1e-12)
        assert sec.inertia_athwartships == pytest.approx(sharp_at, rel=1e-12)
