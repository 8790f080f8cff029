"""Scarfs aimed at the boards, and lumber orders that depend on the input only.

The scarf rules are checked here on the segments the layout cuts, from the spar file's own
figures (common practice for spars: scarfs at least 8:1 of the stave's thickness,
staggered in neighbouring staves, none where fittings load the spar; every segment cut
from one board): each segment no longer than the longest board less a kerf and at least
two scarf lengths long, each scarf inside the spar and clear of every no-scarf range,
neighbouring staves' scarfs at least a scarf length plus the stagger apart. The board
feet of the aimed scarfs are compared with the method before them (scarfs placed for
slack alone, :func:`stavegen.layout.scarfs.place_scarfs`, then ordered), on the
benchmark jobs and on random spars.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stavegen.layout import lumber
from stavegen.layout.lumber import Work, order_lumber
from stavegen.layout.plan import lay_out
from stavegen.model.loader import parse_spar

from conftest import spar_dict

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "benchmarks"))
import bench_lumber  # noqa: E402

TOL = 1e-6  # mm


def rule_breaks(spar, layout) -> list[str]:
    """Every scarf rule the layout breaks, read off its segments and the spar file's figures."""
    stock = spar.stock
    scarf = stock.scarf_ratio * max(st.thickness for st in layout.plan.stations)
    out = []
    if abs(layout.scarfs.length - scarf) > TOL:
        out.append(f"scarf length {layout.scarfs.length} is not {scarf}")
    longest = max(stock.lengths) - stock.kerf
    n = len(layout.staves)
    centres = []
    for k, segs in enumerate(layout.staves):
        mine = []
        for seg in segs:
            if seg.length > longest + TOL:
                out.append(f"{seg.label} is {seg.length} long, past the longest board less a kerf")
            if len(segs) > 1 and seg.end - seg.start < 2 * scarf - TOL:
                out.append(f"{seg.label} is shorter than two scarf lengths")
        for a, b in zip(segs, segs[1:]):
            lo, hi = b.start, a.end  # the scarf's overlap
            if abs((hi - lo) - scarf) > 1e-6:
                out.append(f"scarf between {a.label} and {b.label} is {hi - lo} long")
            if lo < -TOL or hi > spar.length + TOL:
                out.append(f"scarf {a.label}/{b.label} reaches past the spar's ends")
            for x, y in stock.no_scarf:
                if lo < y - TOL and hi > x + TOL:
                    out.append(f"scarf {a.label}/{b.label} falls in the no-scarf range {x}-{y}")
            mine.append((lo + hi) / 2)
        centres.append(mine)
    for k in range(n):
        nxt = (k + 1) % n
        for c in centres[k]:
            for d in centres[nxt]:
                if abs(c - d) < scarf + stock.scarf_stagger - TOL:
                    out.append(f"staves {k + 1} and {nxt + 1}: scarfs {c:.1f} and {d:.1f} too close")
    return out


@pytest.mark.parametrize("name, spar", bench_lumber.STAVE_JOBS, ids=[n for n, _ in bench_lumber.STAVE_JOBS])
def test_aimed_scarfs_never_need_more_than_slack_first_on_the_benchmark_jobs(name, spar):
    layout = lay_out(spar)
    before = bench_lumber.slack_first_order(spar)
    assert rule_breaks(spar, layout) == []
    assert layout.lumber.board_feet <= before.board_feet + 1e-9
    assert layout.lumber.lower_bound_board_feet <= layout.lumber.board_feet + 1e-9


def test_aiming_saves_wood_on_some_benchmark_jobs():
    """Not a promise for every spar, but the point of aiming: on these jobs it finds shorter or fewer boards."""
    saved = []
    for name, spar in bench_lumber.STAVE_JOBS[:1] + bench_lumber.STAVE_JOBS[4:5]:
        aim = lay_out(spar).scarf_aim
        saved.append(aim.slack_first_board_feet - aim.board_feet)
    assert max(saved) > 1.0


def random_spar(length, diameter, staves, boards, stagger, no_scarf, ratio):
    mm = lambda v: f"{v:.3f} mm"  # noqa: E731
    data = spar_dict(
        spar={"name": "Random spar", "units": "mm", "length": mm(length)},
        plan={"wood": "sitka-spruce", "stations": [[0, mm(diameter)], [mm(0.45 * length), mm(diameter)],
                                                   [mm(length), mm(0.65 * diameter)]]},
        hollow={"wood": "sitka-spruce", "staves": staves, "joint": "birdsmouth-flush", "wall": mm(0.17 * diameter),
                "end_allowance": mm(60)},
        stock={"thickness": mm(0.17 * diameter + 1), "widths": [mm(95), mm(145)], "lengths": [mm(b) for b in boards],
               "kerf": mm(3), "scarf_ratio": ratio, "scarf_stagger": mm(stagger),
               "no_scarf": [[mm(a * length), mm(b * length)] for a, b in no_scarf]},
    )
    return parse_spar(data, "random.toml")


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(length=st.floats(4000, 9000), diameter=st.floats(70, 130), staves=st.sampled_from([6, 7, 8, 12]),
       boards=st.sampled_from([[2400, 3000, 3600], [3000, 3600, 4200, 4800], [2400, 3600], [3000, 4200]]),
       stagger=st.floats(150, 450), ratio=st.sampled_from([8, 10, 12]),
       no_scarf=st.lists(st.tuples(st.floats(0.0, 0.9), st.floats(0.02, 0.08)).map(lambda t: (t[0], t[0] + t[1])),
                         max_size=2))
def test_aimed_scarfs_keep_every_rule(length, diameter, staves, boards, stagger, ratio, no_scarf):
    spar = random_spar(length, diameter, staves, boards, stagger, no_scarf, ratio)
    try:
        layout = lay_out(spar)
    except lumber.InputError:  # the rules leave no placement (the message is tested elsewhere)
        return
    assert rule_breaks(spar, layout) == []
    if layout.scarf_aim is not None:
        assert layout.lumber.board_feet <= layout.scarf_aim.slack_first_board_feet + 1e-9
        assert layout.lumber.board_feet == pytest.approx(layout.scarf_aim.board_feet, abs=1e-9)


# Work limits, not the clock ---------------------------------------------------------------------------------


def test_a_slow_clock_changes_nothing(monkeypatch):
    """The answer depends on the input only: a machine a hundred times slower gets the same boards."""
    name, pieces, stock = bench_lumber.JOBS[5]  # column generation and a branch-and-bound search
    quiet = order_lumber(pieces, stock)
    now = [0.0]

    def slow() -> float:
        now[0] += 0.5  # half a second passes between any two looks at the clock
        return now[0]

    monkeypatch.setattr(lumber.time, "monotonic", slow)
    busy = order_lumber(pieces, stock)
    assert busy.board_feet == quiet.board_feet
    assert busy.lower_bound_board_feet == quiet.lower_bound_board_feet
    assert [(b.size, [[c.piece.label for c in r.cuts] for r in b.rips]) for b in busy.boards] == \
           [(b.size, [[c.piece.label for c in r.cuts] for r in b.rips]) for b in quiet.boards]
    assert not busy.stopped_by_clock and lumber.CLOCK_NOTE not in busy.notes


def test_the_time_guard_says_when_it_decided(monkeypatch):
    name, pieces, stock = bench_lumber.JOBS[5]
    order = order_lumber(pieces, stock, work=Work(time_guard=0.0))
    assert order.stopped_by_clock and lumber.CLOCK_NOTE in order.notes
    assert order.lower_bound_board_feet <= order.board_feet + 1e-9
