"""The stave layout: widths along the taper, true lengths, segments and scarfs, plugs.

References: the closure relation of the section model (stave width), Pythagoras
for the length along a straight-tapered face, Roark's regular polygon area
A = N s a / 2 for the plug, and the rules of common practice for scarfs
(slope at least 8:1, staggered in neighbouring staves, none where fittings load the spar).
"""

import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stavegen.errors import DesignError, InputError
from stavegen.layout.plan import lay_out
from stavegen.model.loader import parse_spar

from conftest import spar_dict

STOCK = {"thickness": 25, "widths": [100, 150], "lengths": [2400, 3600], "kerf": 3,
         "scarf_ratio": 8, "scarf_stagger": 300}


def layout_of(**changes):
    data = spar_dict(**changes)
    data.setdefault("stock", dict(STOCK))
    return parse_spar(data, "test.toml")


def check_segments(spar, layout):
    """Segments cover each stave end to end, overlapping by one scarf length at each scarf."""
    stock = spar.stock
    scarf = layout.scarfs.length
    for k, segments in enumerate(layout.staves):
        assert segments[0].start == pytest.approx(-spar.hollow.end_allowance)
        assert segments[-1].end == pytest.approx(spar.length + spar.hollow.end_allowance)
        for a, b in zip(segments, segments[1:]):
            assert a.end - b.start == pytest.approx(scarf, rel=1e-9)
        centres = layout.scarfs.centres[k]
        assert len(centres) == len(segments) - 1
        for seg in segments:
            assert seg.length <= max(stock.lengths) - stock.kerf + 1e-6
        for c in centres:
            lo, hi = c - scarf / 2, c + scarf / 2
            assert lo >= -1e-6 and hi <= spar.length + 1e-6
            for a, b in stock.no_scarf:
                assert hi <= a + 1e-6 or lo >= b - 1e-6, (c, a, b)
    n = len(layout.staves)
    for k in range(n):
        for c in layout.scarfs.centres[k]:
            for d in layout.scarfs.centres[(k + 1) % n]:
                assert abs(c - d) >= scarf + stock.scarf_stagger - 1e-6


def test_whole_length_stock_means_no_scarfs():
    spar = layout_of(stock=dict(STOCK, lengths=[3600]))
    layout = lay_out(spar)
    assert layout.scarfs.count == 0
    assert all(len(s) == 1 for s in layout.staves)


def test_long_spar_gets_the_fewest_scarfs_staggered():
    spar = layout_of(spar={"length": 6000}, plan={"stations": [[0, 100], [6000, 100]]},
                     stock=dict(STOCK, no_scarf=[[2500, 3200]]))
    layout = lay_out(spar)
    check_segments(spar, layout)
    # Stave 6150 mm along the face from boards of 3597 mm with 160 mm scarfs: one scarf fits only in
    # 3280..3442 mm (the no-scarf range takes the rest of the window), too narrow for two staggered phases,
    # so one phase takes one scarf and the other two: 4 × 1 + 4 × 2.
    assert layout.scarfs.length == pytest.approx(8 * 20)
    assert sorted(len(c) for c in layout.scarfs.centres) == [1] * 4 + [2] * 4
    open_spar = layout_of(spar={"length": 6000}, plan={"stations": [[0, 100], [6000, 100]]})
    wide_open = lay_out(open_spar)
    check_segments(open_spar, wide_open)
    assert wide_open.scarfs.count == 8


def test_widths_follow_the_closure_relation_and_rough_adds_the_allowance():
    spar = layout_of(plan={"stations": [[0, 120], [3000, 70]]}, hollow={"planing_allowance": 1.5})
    layout = lay_out(spar)
    t, n = 20.0, 8
    for station in layout.plan.stations:
        z = min(max(station.z, 0.0), 3000.0)
        radius = (120 - 50 * z / 3000) / 2
        a_o = radius + 1.5
        # Flush birdsmouth: w = 2 a_o tan(π/N).
        assert station.width == pytest.approx(2 * a_o * math.tan(math.pi / n), rel=1e-12)
        assert station.rough_width == pytest.approx(station.width + 2 * spar.stock.edge_allowance)
        assert station.thickness == t


def test_true_length_along_a_straight_taper():
    """The face of a straight taper is the hypotenuse: √(L² + (Δa_o)²), plus the square ends."""
    spar = layout_of(plan={"stations": [[0, 140], [3000, 60]]}, hollow={"end_allowance": 0})
    plan = lay_out(spar).plan
    assert plan.cut_length == pytest.approx(math.hypot(3000, 40), rel=1e-12)
    uniform = lay_out(layout_of(hollow={"end_allowance": 50})).plan
    assert uniform.cut_length == pytest.approx(3100, rel=1e-12)


def test_outline_width_at_every_tick():
    spar = layout_of(plan={"stations": [[0, 120], [1500, 110], [3000, 70]]}, hollow={"taper": "symmetric"})
    layout = lay_out(spar)
    from shapely.geometry import LineString, Polygon

    for seg in layout.segments:
        poly = Polygon(seg.outline)
        assert poly.is_valid
        assert poly.bounds[2] - poly.bounds[0] == pytest.approx(seg.length, rel=1e-9)
        for tick in seg.ticks:
            cut = poly.intersection(LineString([(tick.x, -1e3), (tick.x, 1e3)]))
            assert cut.length == pytest.approx(tick.width, abs=1e-6)


def test_plug_volume_is_the_bore_prism():
    spar = layout_of(hollow={"plug": [{"from": 0, "to": 500}], "planing_allowance": 0})
    plug = lay_out(spar).plugs[0]
    a = 50 - 20
    s = 2 * a * math.tan(math.pi / 8)
    assert plug.volume == pytest.approx(8 * s * a / 2 * 500, rel=1e-12)
    assert plug.heel.across_flats == pytest.approx(60)
    assert plug.heel.across_corners == pytest.approx(60 / math.cos(math.pi / 8))


def test_blocked_by_no_scarf_ranges():
    spar = layout_of(spar={"length": 6000}, plan={"stations": [[0, 100], [6000, 100]]},
                     stock=dict(STOCK, no_scarf=[[500, 5500]]))
    with pytest.raises(DesignError) as err:
        lay_out(spar)
    assert err.value.key == "stock.no_scarf"


def test_blocked_by_stagger():
    spar = layout_of(spar={"length": 6000}, plan={"stations": [[0, 100], [6000, 100]]},
                     stock=dict(STOCK, lengths=[3300], scarf_stagger=1500))
    with pytest.raises(DesignError) as err:
        lay_out(spar)
    assert err.value.key == "stock.scarf_stagger"


def test_no_stock_table_for_layout():
    spar = parse_spar(spar_dict(), "test.toml")
    with pytest.raises(InputError) as err:
        lay_out(spar)
    assert err.value.key == "stock"


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    length=st.floats(2000, 12000),
    staves=st.integers(4, 24),
    board=st.floats(2400, 5000),
    stagger=st.floats(0, 600),
    no_scarf_at=st.floats(0.1, 0.8),
    no_scarf_len=st.floats(0, 800),
)
def test_random_layouts_keep_every_rule(length, staves, board, stagger, no_scarf_at, no_scarf_len):
    wall = 30 if staves <= 5 else 20
    spar = layout_of(spar={"length": length}, plan={"stations": [[0, 110], [length, 80]]},
                     hollow={"staves": staves, "wall": wall,
                             "joint": "birdsmouth-flush" if staves > 4 else "bevel"},
                     stock=dict(STOCK, thickness=30, lengths=[board], scarf_stagger=stagger,
                                no_scarf=[[no_scarf_at * length, no_scarf_at * length + no_scarf_len + 1]]))
    try:
        layout = lay_out(spar)
    except DesignError as exc:
        assert exc.key in ("stock.no_scarf", "stock.scarf_stagger", "stock.lengths")
        return
    check_segments(spar, layout)


def test_templates_thin_out_marks_too_close_to_read():
    """Spacing marks closer than TICK_GAP give way; stations from the file, plugs and scarfs never do."""
    from stavegen.layout.segments import TICK_GAP

    spar = layout_of(plan={"stations": [[0, 120], [1003, 110], [3000, 70]]},
                     hollow={"plug": [{"from": 0, "to": 407}]}, output={"mark_spacing": 2})
    layout = lay_out(spar)
    for seg in layout.segments:
        xs = [t.x for t in seg.ticks]
        assert xs == sorted(xs)
        marks = [t.x for t in seg.ticks if set(t.reasons) == {"mark"}]
        for a, b in zip(sorted(xs), sorted(xs)[1:]):
            if a in marks or b in marks:
                assert b - a >= TICK_GAP - 1e-9
        zs = {round(t.z, 6) for t in seg.ticks}
        for z in (1003.0, 407.0):
            if seg.start < z < seg.end:
                assert round(z, 6) in zs
    assert sum(len(s.ticks) for s in layout.segments) < 8 * 3150 / TICK_GAP + 100
