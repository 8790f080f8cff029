"""The lumber order, checked against the lumber rules, brute force and geometry.

Board measure: one board foot is 144 in³ on nominal thickness × width × length, i.e.
BF = T(in) × W(in) × L(ft) / 12 — North American lumber grading rules (NHLA rules for
hardwood; PS 20, American Softwood Lumber Standard). Everything else here is checked by
computations written out in this file, independent of the solver.
"""

from __future__ import annotations

import itertools
import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stavegen.errors import InputError
from stavegen.layout.lumber import BoardSize, Piece, SizeCount, add_waste, board_feet, order_lumber
from stavegen.model.spar import Stock

IN = 25.4
FT = 12 * IN
TOL = 1e-6  # mm


def stock(widths, lengths, kerf=3.175, nominal_widths=None, thickness=19.05, nominal_thickness=25.4, waste=0.1):
    return Stock(
        thickness=thickness, nominal_thickness=nominal_thickness, widths=tuple(widths),
        nominal_widths=tuple(nominal_widths or widths), lengths=tuple(lengths), kerf=kerf, waste=waste,
    )


def piece(i, length, width, thickness=19.05):
    return Piece(f"S{i}-1", i, 1, length, width, 0.9 * length * width * thickness)


def rule_board_feet(t_in, w_in, l_ft):
    """The lumber rules' board measure: thickness (in) × width (in) × length (ft) / 12."""
    return t_in * w_in * l_ft / 12


# ------------------------------------------------------------------- board measure


def test_board_feet_of_known_boards():
    # lumber rules: 1 in × 12 in × 12 ft = 12 BF; 5/4 × 6 in × 8 ft = 5 BF (nominal sizes)
    assert board_feet(1 * IN, 12 * IN, 12 * FT) == pytest.approx(12.0, rel=1e-12)
    assert board_feet(1.25 * IN, 6 * IN, 8 * FT) == pytest.approx(5.0, rel=1e-12)
    assert rule_board_feet(1.25, 6, 8) == pytest.approx(5.0)


def test_tally_is_on_nominal_sizes():
    # a 5/4 × 6 in × 8 ft board dressed to 1 1/16 × 5 1/2: still 5 BF (lumber rules)
    size = BoardSize(width=5.5 * IN, length=8 * FT, thickness=1.0625 * IN, nominal_width=6 * IN,
                     nominal_thickness=1.25 * IN)
    assert size.board_feet == pytest.approx(5.0, rel=1e-12)
    s = stock([5.5 * IN], [8 * FT], nominal_widths=[6 * IN], thickness=1.0625 * IN, nominal_thickness=1.25 * IN)
    order = order_lumber([piece(1, 7 * FT, 2 * IN, 1.0625 * IN)], s)
    assert order.board_feet == pytest.approx(5.0, rel=1e-12)
    assert order.volume_m3 == pytest.approx(5 * 144 * 0.0254**3, rel=1e-12)  # same measure in m³
    assert order.lower_bound_board_feet <= 5.0 + 1e-9


def _size(width_in, length_ft):
    return BoardSize(width=width_in * IN - 12, length=length_ft * 12 * IN, thickness=0.75 * IN,
                     nominal_width=width_in * IN, nominal_thickness=IN)


def test_waste_is_a_share_of_the_whole_order():
    # 10 boards of 1 × 6 × 12 ft (6 BF each) + 10 % = 66 BF: 11 boards, not 12 (10 × 1.1 is 11.000000000000002).
    one = (SizeCount(_size(6, 12), 10),)
    assert [c.count for c in add_waste(one, 0.10)] == [11]
    assert [c.count for c in add_waste(one, 0.0)] == [10]
    # One board each of two sizes: 10 % on 10 BF is 1 BF more, one spare board, not one spare per size.
    two = (SizeCount(_size(6, 8), 1), SizeCount(_size(6, 12), 1))
    bought = add_waste(two, 0.10)
    assert sum(c.count for c in bought) == 3
    used_bf = sum(c.board_feet for c in two)
    assert sum(c.board_feet for c in bought) >= 1.1 * used_bf - 1e-9


# ------------------------------------------------------------------ an independent checker


def check_order(order, pieces, s):
    """Every rule of the cut, from the placed coordinates alone."""
    kerf = s.kerf
    combos = {(w, nw, L) for w, nw in zip(s.widths, s.nominal_widths) for L in s.lengths}
    placed = []
    for b in order.boards:
        z = b.size
        assert (z.width, z.nominal_width, z.length) in combos
        assert z.nominal_thickness == s.nominal_thickness and z.thickness == s.thickness
        rects = []
        rips = sorted(b.rips, key=lambda r: r.offset)
        assert rips, "a board bought for nothing"
        assert rips[0].offset >= -TOL
        for r1, r2 in zip(rips, rips[1:]):
            assert r2.offset >= r1.offset + r1.width + kerf - TOL  # a kerf between rips
        assert rips[-1].offset + rips[-1].width <= z.width + TOL
        for r in rips:
            cuts = sorted(r.cuts, key=lambda c: c.offset)
            assert cuts
            assert r.width == pytest.approx(max(c.piece.width for c in cuts), abs=1e-9)  # as wide as its widest
            assert cuts[0].offset >= -TOL
            for c1, c2 in zip(cuts, cuts[1:]):
                assert c2.offset >= c1.offset + c1.piece.length + kerf - TOL  # a kerf between cross-cuts
            assert cuts[-1].offset + cuts[-1].piece.length <= z.length + TOL
            for c in cuts:
                assert c.piece.width <= r.width + TOL
                rects.append((r.offset, r.offset + c.piece.width, c.offset, c.offset + c.piece.length))
                placed.append(c.piece.label)
        for a, b2 in itertools.combinations(rects, 2):  # no two pieces share wood
            overlap_x = min(a[1], b2[1]) - max(a[0], b2[0])
            overlap_y = min(a[3], b2[3]) - max(a[2], b2[2])
            assert overlap_x <= TOL or overlap_y <= TOL
    assert sorted(placed) == sorted(p.label for p in pieces)  # each piece exactly once

    tally = sum(rule_board_feet(b.size.nominal_thickness / IN, b.size.nominal_width / IN, b.size.length / FT)
                for b in order.boards)
    assert order.board_feet == pytest.approx(tally, rel=1e-9)
    assert order.volume_m3 == pytest.approx(
        sum(b.size.nominal_thickness * b.size.nominal_width * b.size.length for b in order.boards) * 1e-9, rel=1e-9)
    assert sum(u.count for u in order.used) == len(order.boards)
    assert order.board_feet >= order.lower_bound_board_feet - 1e-9
    assert order.lower_bound_board_feet >= 0
    stave = sum(p.volume for p in pieces)
    assert order.yield_ratio == pytest.approx(stave / (order.board_feet * 144 * IN**3), rel=1e-9)
    assert order.yield_ratio <= 1.0
    for used, buy in zip(order.used, order.to_buy):
        assert buy.size == used.size
        assert buy.count >= used.count
    # The order holds (1 + waste) × the board feet used, and no spare board more than it needs.
    assert order.to_buy_board_feet >= (1 + s.waste) * order.board_feet - 1e-9
    spares = [b for u, b in zip(order.used, order.to_buy) if b.count > u.count]
    if spares:
        largest = max(b.size.board_feet for b in spares)
        assert order.to_buy_board_feet - largest < (1 + s.waste) * order.board_feet - 1e-9


# ------------------------------------------------------------------- random inputs


@st.composite
def jobs(draw, max_pieces=10, min_pieces=1, sizes=(0.05, 1.0)):
    widths = draw(st.lists(st.floats(60, 300), min_size=1, max_size=3, unique=True))
    lengths = draw(st.lists(st.floats(600, 5000), min_size=1, max_size=3, unique=True))
    nominal = [w + draw(st.floats(0, 20)) for w in widths]
    kerf = draw(st.sampled_from([0.0, 2.0, 3.175]))
    waste = draw(st.sampled_from([0.0, 0.1, 0.15, 0.3]))
    s = stock(widths, lengths, kerf, nominal, waste=waste)
    # a few distinct sizes, repeated with jitter under the 0.01 mm grouping tolerance
    # piece sizes as fractions of the largest board; 0.2 to 0.7 makes mixed boards pay
    kinds = draw(st.lists(st.tuples(st.floats(*sizes), st.floats(*sizes)), min_size=1, max_size=4))
    n = draw(st.integers(min_pieces, max_pieces))
    pieces = []
    for i in range(n):
        fl, fw = kinds[draw(st.integers(0, len(kinds) - 1))]
        jitter = draw(st.sampled_from([0.0, 0.004]))
        length = max(1.0, fl * max(lengths) - jitter)
        width = max(1.0, fw * max(widths) - jitter)
        pieces.append(Piece(f"P{i + 1}", i + 1, 1, length, width, draw(st.floats(0, 1)) * length * width * s.thickness))
    return pieces, s


SETTINGS = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@SETTINGS
@given(st.one_of(jobs(), jobs(sizes=(0.2, 0.7))))
def test_every_cut_fits_and_every_piece_is_placed_once(job):
    pieces, s = job
    order = order_lumber(pieces, s)
    check_order(order, pieces, s)


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(jobs())
def test_generated_patterns_meet_the_same_rules_and_bound(job):
    pieces, s = job
    full = order_lumber(pieces, s)
    generated = order_lumber(pieces, s, pattern_limit=0)  # column generation throughout
    check_order(generated, pieces, s)
    if full.bound_is_lp and generated.bound_is_lp:  # both the LP of the same model
        assert generated.lower_bound_board_feet == pytest.approx(full.lower_bound_board_feet, rel=1e-6, abs=1e-9)
    if full.proven_optimal:
        assert generated.board_feet >= full.board_feet - 1e-9


# --------------------------------------------------------------- optimality, brute force


def set_partitions(items):
    if not items:
        yield []
        return
    first, rest = items[0], items[1:]
    for part in set_partitions(rest):
        for i in range(len(part)):
            yield part[:i] + [[first] + part[i]] + part[i + 1:]
        yield [[first]] + part


def cheapest_board(block, s):
    """Least board feet of one board cutting ``block``: every split into rips tried."""
    best = math.inf
    for rips in set_partitions(block):
        along = max(sum(p.length for p in r) + s.kerf * (len(r) - 1) for r in rips)
        across = sum(max(p.width for p in r) for r in rips) + s.kerf * (len(rips) - 1)
        for w, nw in zip(s.widths, s.nominal_widths):
            for L in s.lengths:
                if across <= w + TOL and along <= L + TOL:
                    best = min(best, rule_board_feet(s.nominal_thickness / IN, nw / IN, L / FT))
    return best


def brute_force(pieces, s):
    return min(sum(cheapest_board(block, s) for block in part) for part in set_partitions(list(pieces)))


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(jobs(max_pieces=5, min_pieces=2, sizes=(0.2, 0.7)))
def test_least_board_feet_on_small_jobs(job):
    pieces, s = job
    best = brute_force(pieces, s)
    order = order_lumber(pieces, s)
    assert order.board_feet == pytest.approx(best, rel=1e-9)
    assert order.lower_bound_board_feet <= best + 1e-9
    generated = order_lumber(pieces, s, pattern_limit=0)
    assert generated.board_feet >= best - 1e-9
    assert generated.lower_bound_board_feet <= best + 1e-9


def test_mixed_board_beats_two_plain_ones():
    # two 60 mm pieces of different lengths share one 130 mm board; kerf 3 mm
    s = stock([130.0, 66.0], [2000.0], kerf=3.0)
    pieces = [piece(1, 1900.0, 60.0), piece(2, 1500.0, 60.0)]
    order = order_lumber(pieces, s)
    check_order(order, pieces, s)
    assert len(order.boards) == 1 and order.boards[0].size.width == 130.0
    assert order.board_feet == pytest.approx(brute_force(pieces, s))


@settings(max_examples=15, deadline=None)
@given(
    n=st.integers(1, 72), length=st.floats(300, 4000), width=st.floats(20, 120),
    W=st.floats(130, 300), L=st.floats(4000, 5000), kerf=st.sampled_from([0.0, 3.175]),
)
def test_one_size_of_piece_one_size_of_board(n, length, width, W, L, kerf):
    # each board holds floor((W+k)/(w+k)) rips of floor((L+k)/(l+k)) pieces, no more:
    # the least number of boards is the demand over that, rounded up
    s = stock([W], [L], kerf)
    pieces = [piece(i + 1, length, width) for i in range(n)]
    per_board = math.floor((W + kerf) / (width + kerf)) * math.floor((L + kerf) / (length + kerf))
    order = order_lumber(pieces, s)
    check_order(order, pieces, s)
    assert len(order.boards) == math.ceil(n / per_board)
    assert order.proven_optimal


def test_stave_job_grouped_and_solved():
    # 8 staves of 3 segments, two scarf layouts alternating: 6 kinds of piece
    s = stock([5.5 * IN, 7.25 * IN], [8 * FT, 10 * FT, 12 * FT], nominal_widths=[6 * IN, 8 * IN])
    pieces = []
    for stave in range(1, 9):
        cuts = [0, 5 * FT + (stave % 2) * FT, 11 * FT + (stave % 2) * FT, 16 * FT]
        for seg in range(3):
            length = cuts[seg + 1] - cuts[seg] + 6 * IN
            width = (1.75 - 0.1 * seg) * IN
            pieces.append(Piece(f"S{stave}-{seg + 1}", stave, seg + 1, length, width, 0.8 * length * width * 19.05))
    order = order_lumber(pieces, s)
    check_order(order, pieces, s)
    assert order.proven_optimal and order.method == "enumerated patterns"
    ids = [b.id for b in order.boards]
    assert ids == [f"B{i + 1}" for i in range(len(ids))]


# -------------------------------------------------------------------------- bad input


def test_piece_longer_than_every_board():
    s = stock([140.0], [2438.4, 3048.0])
    with pytest.raises(InputError) as err:
        order_lumber([piece(1, 1000.0, 40.0), Piece("S2-3", 2, 3, 3100.0, 40.0, 0.0)], s)
    assert err.value.key == "stock.lengths"
    assert "S2-3" in err.value.problem and "3100.0 mm" in err.value.problem


def test_piece_wider_than_every_board():
    s = stock([88.9, 139.7], [3048.0])
    with pytest.raises(InputError) as err:
        order_lumber([Piece("S4-1", 4, 1, 1000.0, 150.0, 0.0)], s, units="in")
    assert err.value.key == "stock.widths"
    assert "S4-1" in err.value.problem and '5 29/32"' in err.value.problem  # 150 mm in 32nds


def test_no_pieces_no_boards():
    order = order_lumber([], stock([140.0], [3000.0]))
    assert order.boards == () and order.board_feet == 0 and order.yield_ratio == 0


def test_a_layout_solves_the_same_cutting_problem_once(monkeypatch):
    """Pieces measured twice (on the stave plan, then as cut) that differ by roundoff pose one problem: with a
    shared ``solved`` record the second order reuses the first solve, and its boards still pass every rule of
    ``check_order`` (fit, kerf, each piece once) for the second pieces with the same board feet; pieces that
    differ by half a millimetre are a new problem."""
    import stavegen.layout.lumber as lumber

    calls = []
    real = lumber._solve
    monkeypatch.setattr(lumber, "_solve", lambda *a, **k: calls.append(1) or real(*a, **k))
    s = stock([5.5 * IN, 7.25 * IN], [8 * FT, 12 * FT])
    first = [piece(i, (5 + i % 3) * FT, (1.25 + 0.125 * (i % 2)) * IN) for i in range(1, 9)]
    again = [Piece(p.label, p.stave, p.segment, p.length + 1e-12, p.width * (1 + 1e-13), p.volume) for p in first]
    apart = [Piece(p.label, p.stave, p.segment, p.length, p.width + 0.5, p.volume) for p in first]
    solved: dict = {}
    one = order_lumber(first, s, solved=solved)
    two = order_lumber(again, s, solved=solved)
    assert len(calls) == 1
    check_order(two, again, s)
    assert two.board_feet == pytest.approx(one.board_feet, abs=1e-9)
    assert two.board_feet == pytest.approx(order_lumber(again, s).board_feet, abs=1e-9)  # a fresh solve agrees
    order_lumber(apart, s, solved=solved)
    assert len(calls) == 3


def test_a_solve_that_reached_no_limit_answers_for_higher_limits(monkeypatch):
    """The scarf aiming orders each placement with light limits, then the chosen ones with full limits. A light
    solve that ended no stage on a limit is the full solve (HiGHS and the generation are deterministic): it is
    reused, and its boards are those of a fresh solve with the full limits. A solve a limit did end is not."""
    import stavegen.layout.lumber as lumber

    calls = []
    real = lumber._solve
    monkeypatch.setattr(lumber, "_solve", lambda *a, **k: calls.append(a[1]) or real(*a, **k))
    s = stock([5.5 * IN, 7.25 * IN], [8 * FT, 12 * FT])
    pieces = [piece(i, (5 + i % 3) * FT, (1.25 + 0.125 * (i % 2)) * IN) for i in range(1, 9)]
    light, full = lumber.Work(rounds=20, nodes=200), lumber.Work()
    solved: dict = {}
    first = order_lumber(pieces, s, work=light, solved=solved)
    again = order_lumber(pieces, s, work=full, solved=solved)
    assert calls == [light] and first.proven_optimal
    fresh = order_lumber(pieces, s, work=full)
    assert [(b.size, b.rips) for b in again.boards] == [(b.size, b.rips) for b in fresh.boards]
    # one round of column generation, which this job needs more of: the full limits solve afresh
    calls.clear()
    solved = {}
    one_round = lumber.Work(rounds=1, nodes=200)
    order_lumber(pieces, s, work=one_round, pattern_limit=0, solved=solved)
    assert next(iter(solved.values()))[0].limited
    order_lumber(pieces, s, work=full, pattern_limit=0, solved=solved)
    assert calls == [one_round, full]


def test_the_integer_solve_takes_its_extra_option_without_falling_back(monkeypatch):
    """The HiGHS installed knows the option the integer solves pass (an older one solves without it), and the
    warning scipy gives for an option it does not list is not shown."""
    import warnings

    from stavegen.layout import highs

    seen = []
    real = highs.milp
    monkeypatch.setattr(highs, "milp", lambda *a, **k: seen.append(dict(k["options"])) or real(*a, **k))
    s = stock([5.5 * IN], [8 * FT])
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        order = order_lumber([piece(i, 3 * FT, 1.5 * IN) for i in range(1, 6)], s)
    assert order.proven_optimal and len(seen) == 1 and seen[0].items() >= highs.EXTRA.items()


@pytest.mark.parametrize("refuses", [False, True])
def test_an_older_highs_without_the_option_still_solves(monkeypatch, refuses):
    """An option this HiGHS does not know is ignored with a warning (not shown) or refused with an error; either
    way the order is solved, proven least, with the board feet of the solve with the option."""
    import warnings

    from stavegen.layout import highs

    s = stock([5.5 * IN, 7.25 * IN], [8 * FT, 12 * FT])
    pieces = [piece(i, (5 + i % 3) * FT, (1.25 + 0.125 * (i % 2)) * IN) for i in range(1, 9)]
    with_option = order_lumber(pieces, s)
    monkeypatch.setattr(highs, "EXTRA", {"no_such_highs_option": False})
    if refuses:
        real = highs.milp

        def strict(*a, **k):
            if "no_such_highs_option" in k["options"]:
                raise AttributeError("'HighsOptions' object has no attribute 'no_such_highs_option'")
            return real(*a, **k)
        monkeypatch.setattr(highs, "milp", strict)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        order = order_lumber(pieces, s)
    check_order(order, pieces, s)
    assert order.proven_optimal and order.board_feet == pytest.approx(with_option.board_feet, abs=1e-9)
