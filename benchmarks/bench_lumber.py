"""Lumber order solve times on stave jobs of realistic size (invented spars, not designs).

Run:  python benchmarks/bench_lumber.py
Each job: a tapered mast of N staves, each stave in G segments joined by 8:1 scarfs,
scarfs staggered either in two alternating layouts or a different shift on every stave.
"""

from __future__ import annotations

import time

from stavegen.layout.lumber import Piece, order_lumber
from stavegen.model.spar import Stock

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


def main() -> None:
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


if __name__ == "__main__":
    main()
