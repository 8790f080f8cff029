"""Lumber order solve times on stave jobs of realistic size, and what aiming the scarfs saves
(invented spars, not designs).

Run:  python benchmarks/bench_lumber.py
JOBS: a tapered mast of N staves, each stave in G segments joined by 8:1 scarfs, scarfs
staggered either in two alternating layouts or a different shift on every stave; the
solver orders these fixed pieces.
STAVE_JOBS: the same masts and boards as whole spars, laid out by stavegen: scarfs placed
for slack alone (the method before scarfs were aimed at the boards), against the scarfs
aimed at the boards (:func:`stavegen.layout.scarfs.aim_scarfs`), each with its order's
LP bound. The tests check on these that aiming never needs more board feet.
"""

from __future__ import annotations

import time

from stavegen.layout.lumber import Piece, order_lumber
from stavegen.model.loader import parse_spar
from stavegen.model.spar import Spar, Stock

IN = 25.4
FT = 12 * IN


def stave_job(staves, segments, spar_ft, stagger, wall_in=0.75, width_in=1.6):
    """Pieces for a mast tapering from 40 % of its length to 60 % of its heel width at the head."""
    length = spar_ft * FT
    scarf = 8 * wall_in * IN
    end = 3 * IN
    pieces = []
    for s in range(1, staves + 1):
        shift = {"alternate": (s % 2) * 2 * FT, "every": (s % 4) * FT, "none": 0.0}[stagger]
        cuts = [0.0] + [length * g / segments + shift - FT for g in range(1, segments)] + [length]
        for g in range(segments):
            z0, z1 = cuts[g], cuts[g + 1]
            taper = max(0.0, z0 - 0.4 * length) / (0.6 * length)
            width = width_in * IN * (1 - 0.4 * taper) + 2 * 1.5875
            seg_len = z1 - z0 + (scarf if g > 0 else end) + (scarf if g < segments - 1 else end)
            pieces.append(Piece(f"S{s}-{g + 1}", s, g + 1, seg_len, width, 0.85 * seg_len * width * wall_in * IN))
    return pieces


def board_stock(widths_in, nominal_in, lengths_ft):
    return Stock(thickness=0.75 * IN, nominal_thickness=1.0 * IN, widths=tuple(w * IN for w in widths_in),
                 nominal_widths=tuple(n * IN for n in nominal_in), lengths=tuple(L * FT for L in lengths_ft),
                 kerf=IN / 8)


JOBS = [
    ("8 staves × 3, 24 ft", stave_job(8, 3, 24, "alternate"), board_stock([5.5, 7.25], [6, 8], [8, 10, 12])),
    ("8 staves × 3, every stave shifted", stave_job(8, 3, 24, "every"),
     board_stock([3.5, 5.5, 7.25], [4, 6, 8], [8, 10, 12, 14])),
    ("12 staves × 4, 36 ft", stave_job(12, 4, 36, "alternate", width_in=2.0),
     board_stock([3.5, 5.5, 7.25, 9.25], [4, 6, 8, 10], [8, 10, 12, 14, 16])),
    ("16 staves × 3, 30 ft", stave_job(16, 3, 30, "every", width_in=1.2),
     board_stock([5.5, 7.25, 11.25], [6, 8, 12], [10, 12, 14, 16])),
    ("24 staves × 3, 30 ft", stave_job(24, 3, 30, "alternate", width_in=1.0),
     board_stock([5.5, 11.25], [6, 12], [8, 10, 12, 16])),
    ("18 staves × 4, 40 ft", stave_job(18, 4, 40, "every", width_in=1.3),
     board_stock([3.5, 5.5, 7.25, 11.25], [4, 6, 8, 12], [8, 10, 12, 14, 16])),
]


def mast(name: str, staves: int, length_ft: float, diameter_in: float, wall_in: float, stock: Stock) -> Spar:
    """A tapered mast (full diameter to 40 % of its length, 60 % of it at the head), built of ``stock``."""
    length = length_ft * FT
    d = diameter_in * IN
    mm = lambda v: f"{v:.4f} mm"  # noqa: E731
    data = {
        "spar": {"name": name, "units": "in", "length": mm(length)},
        "plan": {"wood": "sitka-spruce", "stations": [[0, mm(d)], [mm(0.4 * length), mm(d)], [mm(length), mm(0.6 * d)]]},
        "hollow": {"wood": "sitka-spruce", "staves": staves, "joint": "birdsmouth-flush", "wall": mm(wall_in * IN),
                   "end_allowance": 3},
        "stock": {"thickness": mm(stock.thickness), "nominal_thickness": mm(stock.nominal_thickness),
                  "widths": [mm(w) for w in stock.widths], "nominal_widths": [mm(w) for w in stock.nominal_widths],
                  "lengths": [mm(v) for v in stock.lengths], "kerf": mm(stock.kerf), "scarf_ratio": 8,
                  "scarf_stagger": 12},
    }
    return parse_spar(data, f"{name}.toml")


STAVE_JOBS = [
    ("8 staves, 24 ft", mast("mast-8-24", 8, 24, 4.0, 0.75, board_stock([5.5, 7.25], [6, 8], [8, 10, 12]))),
    ("8 staves, 24 ft, 4 widths", mast("mast-8-24b", 8, 24, 4.0, 0.75,
                                        board_stock([3.5, 5.5, 7.25], [4, 6, 8], [8, 10, 12, 14]))),
    ("12 staves, 36 ft", mast("mast-12-36", 12, 36, 6.5, 0.75,
                              board_stock([3.5, 5.5, 7.25, 9.25], [4, 6, 8, 10], [8, 10, 12, 14, 16]))),
    ("16 staves, 30 ft", mast("mast-16-30", 16, 30, 6.0, 0.75, board_stock([5.5, 7.25, 11.25], [6, 8, 12],
                                                                          [10, 12, 14, 16]))),
    ("24 staves, 30 ft", mast("mast-24-30", 24, 30, 7.5, 0.75, board_stock([5.5, 11.25], [6, 12], [8, 10, 12, 16]))),
    ("18 staves, 40 ft", mast("mast-18-40", 18, 40, 7.0, 0.75,
                              board_stock([3.5, 5.5, 7.25, 11.25], [4, 6, 8, 12], [8, 10, 12, 14, 16]))),
]


def slack_first_order(spar: Spar):
    """The method before aiming: scarfs placed for slack alone, then the boards ordered for those segments."""
    from stavegen.layout import plan as layout_plan
    from stavegen.layout.scarfs import place_scarfs
    from stavegen.stations.evaluate import SectionCache
    from stavegen.stations.grid import station_marks

    cache = SectionCache(spar)
    base = layout_plan.stave_plan(spar, station_marks(spar), cache)
    rules = layout_plan.scarf_rules(spar, base)
    scarfs = place_scarfs(base.start, base.end, base.cut_length, spar.length, spar.hollow.staves, rules)
    return layout_plan.cut_and_order(spar, cache, base, scarfs, rules)[3]


def main() -> None:
    from stavegen.layout.plan import lay_out

    print(f"{'job':36} {'pieces':>6} {'sizes':>5} {'s':>6} {'BF':>8} {'bound':>8} {'gap':>6}  method")
    for name, pieces, stock in JOBS:
        start = time.perf_counter()
        order = order_lumber(pieces, stock)
        took = time.perf_counter() - start
        gap = order.board_feet / order.lower_bound_board_feet - 1
        sizes = f"{len(stock.widths)}×{len(stock.lengths)}"
        flag = "optimal" if order.proven_optimal else "not proven"
        print(f"{name:36} {len(pieces):6d} {sizes:>5} {took:6.2f} {order.board_feet:8.2f} "
              f"{order.lower_bound_board_feet:8.2f} {gap:6.1%}  {order.method}, {flag}")
    print()
    print(f"{'stave job':28} {'scarfs':>6} {'slack-first BF':>14} {'aimed BF':>9} {'bound':>8} {'saved':>6} {'s':>6}")
    for name, spar in STAVE_JOBS:
        before = slack_first_order(spar)
        start = time.perf_counter()
        layout = lay_out(spar)
        took = time.perf_counter() - start
        after = layout.lumber
        saved = 1 - after.board_feet / before.board_feet
        print(f"{name:28} {layout.scarfs.count:6d} {before.board_feet:14.2f} {after.board_feet:9.2f} "
              f"{after.lower_bound_board_feet:8.2f} {saved:6.1%} {took:6.2f}")


if __name__ == "__main__":
    main()
