"""Choosing the number of staves: every candidate N checked, the ones that can win laid out, and compared.

For each N (4 to 24; a birdsmouth needs 5 or more) with the joint asked for,
the wall (or diameters) are solved when the file says ``"auto"``, the spar
is checked, laid out, and its boards ordered by the layout's own lumber
order. The choice: among the candidates that meet the target, come out of
the stock and have a workable stave, the one that buys the least wood;
ties go to fewer staves.

Workable stave (common practice, no source; a shop rule of ours): the
stave's width between 1 and 5 times its thickness everywhere on the
finished spar. Narrower than it is thick, a stave rolls on the saw table and
its notch is hard to cut; wider than five thicknesses, it needs a deep
rounding and bends poorly to the glue-up.

Work saved, none of it changing the answer: each count's sections are
worked out once and shared by its sizing, check and layout; a count whose
least possible order (:func:`board_feet_floor`) is more than the two
smallest orders found so far is not laid out (it could be neither the
choice nor the runner-up the reason names); the laying out goes in rounds,
cheapest floor first, and rounds and counts are shared between this process
and a pool of worker processes (:mod:`.parallel`), each result depending on
its own count only, so the same input gives the same comparison on any
machine, loaded or not.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Callable

from ..checks.assess import Assessment, assess
from ..errors import DesignError, InputError
from ..layout.plan import Layout, lay_out
from ..model.spar import MAX_STAVES, MIN_STAVES, Spar
from ..section.integrals import ring_moments
from ..stations.evaluate import SectionCache
from ..stations.grid import intervals, refuse_too_many
from .parallel import Pool

WORKABLE_WIDTH_OVER_THICKNESS = (1.0, 5.0)  # common practice (no source): see the module's note
BOARD_FEET_TIE = 1e-6
MOST_STATIONS_COMPARED = 1_000  # every count's check is kept: 20 of them stay under 300 MB up to here
BOARD_FOOT_MM3 = 144 * 25.4**3  # 144 in³ (North American lumber grading rules)
Progress = Callable[[int, int, str], None]  # (done, total, words): told as each count's result comes in


@dataclass(frozen=True)
class Candidate:
    """One stave count, laid out (lengths mm, areas mm², volumes mm³) or refused with the reason."""

    staves: int
    refused: str | None = None
    spar: Spar | None = None
    solved: tuple[str, ...] = ()
    assessment: Assessment | None = None
    layout: Layout | None = None
    stock_problem: str | None = None
    widest: float = 0.0
    narrowest: float = 0.0
    width_over_thickness: tuple[float, float] = (0.0, 0.0)
    rips_per_board: int = 0
    planed_away: float = 0.0
    glue_area: float = 0.0
    cuts: int = 0
    v_bit_one_pass: bool = False
    floor: float = 0.0  # board feet no order for this count can go below (:func:`board_feet_floor`)
    outbid: bool = False  # not laid out: its floor is above the two smallest orders of other counts

    @property
    def meets_target(self) -> bool:
        return self.assessment is not None and self.assessment.passed

    @property
    def fits_stock(self) -> bool:
        return self.layout is not None

    @property
    def workable(self) -> bool:
        low, high = WORKABLE_WIDTH_OVER_THICKNESS
        a, b = self.width_over_thickness
        return self.refused is None and low <= a and b <= high

    @property
    def eligible(self) -> bool:
        return self.refused is None and self.meets_target and self.fits_stock and self.workable

    @property
    def board_feet(self) -> float | None:
        """Board feet to buy, waste included, by the layout's lumber order."""
        return self.layout.lumber.to_buy_board_feet if self.layout is not None else None

    def why_not(self) -> str:
        """Why this candidate cannot be chosen, in a few words; empty when it can."""
        if self.refused:
            return self.refused
        if not self.meets_target:
            return "misses the target"
        if not self.workable:
            a, b = self.width_over_thickness
            low, high = WORKABLE_WIDTH_OVER_THICKNESS
            return (f"stave narrower than {low:g} thickness" if a < low
                    else f"stave wider than {high:g} thicknesses")
        if self.outbid:
            return "would buy more wood than the counts laid out, whatever the cutting plan (not laid out)"
        if not self.fits_stock:
            return self.stock_problem or "does not come out of the stock"
        return ""

    def verdict(self) -> str:
        """A few words for a table cell: "ok", or what rules the candidate out."""
        if self.eligible:
            return "ok"
        if self.refused:
            return "cannot be built"
        if not self.meets_target:
            return "misses target"
        if not self.workable:
            return "stave too narrow" if self.width_over_thickness[0] < WORKABLE_WIDTH_OVER_THICKNESS[0] \
                else "stave too wide"
        if self.outbid:
            return "more wood"
        return "not from this stock"


@dataclass(frozen=True)
class Comparison:
    """Every candidate, the chosen one and the one-line reason."""

    candidates: tuple[Candidate, ...]
    chosen: Candidate
    reason: str


def _integral(spar: Spar, cache: SectionCache, per_length) -> float:
    """∫ f(section) dz over the finished spar by Simpson's rule on the stations' stretches."""
    from ..stations.grid import station_marks

    total = 0.0
    for a, m, b in intervals([mark.z for mark in station_marks(spar)]):
        total += (b - a) / 6 * (per_length(cache.at(a)) + 4 * per_length(cache.at(m)) + per_length(cache.at(b)))
    return total


def board_feet_floor(spar: Spar, result: Assessment) -> float:
    """Board feet (waste included) below which no lumber order for this spar can go, from its stations alone.

    Every stave is cut from one strip or more ripped from boards, a strip at
    least as wide as the stave's rough width (finished width + 2 × edge
    allowance) wherever it runs, heel end allowance to head end allowance;
    a board of dressed width W and nominal width W_n, nominal thickness T_n,
    holds strips whose widths sum to no more than W, so a strip of width r
    costs at least T_n · W_n · r / W board feet per unit length, on the
    cheapest board (least W_n / W) wide enough for it. Scarf overlaps, kerfs
    and board ends only add. The order buys at least (1 + waste) times the
    board feet its cutting plan uses (conventions: the boards to buy).
    Widths are straight between stations, so the integral over them is exact.
    """
    stock = spar.stock
    boards = sorted(zip(stock.widths, stock.nominal_widths))
    edge = 2 * stock.edge_allowance
    e = spar.hollow.end_allowance
    zs = [c.station.z for c in result.stations]
    rough = [c.station.section.stave_width + edge for c in result.stations]

    def factor(r: float) -> float:  # nominal board mm² per mm² of strip of rough width r: the cheapest that fits
        fits = [nominal / width for width, nominal in boards if width >= r]
        return stock.nominal_thickness * min(fits) if fits else math.inf

    if factor(max(rough)) == math.inf:
        return math.inf
    # factor(r) never falls as r grows (fewer boards fit), and r is straight between stations: over each
    # stretch the factor of the narrower end times the exact ∫ r dz is a lower bound.
    area = e * (factor(rough[0]) * rough[0] + factor(rough[-1]) * rough[-1])
    for z0, z1, r0, r1 in zip(zs, zs[1:], rough, rough[1:]):
        area += factor(min(r0, r1)) * (z1 - z0) * (r0 + r1) / 2
    return (1 + stock.waste) * spar.hollow.staves * area / BOARD_FOOT_MM3 - 1e-6


def _assessed(spar: Spar, staves: int) -> tuple[Candidate, SectionCache | None]:
    """Stave count ``staves``: solved, checked and measured, not yet laid out; with its sections when it
    is one to lay out."""
    from .solve import Solved, solve

    trial = replace(spar, hollow=replace(spar.hollow, staves=staves))
    try:
        solved = solve(trial) if not trial.resolved else Solved(trial, ())
        trial = solved.spar
        cache = solved.sections or SectionCache(trial)
        result = assess(trial, cache=cache)
    except DesignError as exc:
        return Candidate(staves=staves, refused=exc.in_units(spar.units).problem), None
    stations = [c.station for c in result.stations]
    ratios = [s.section.stave_width / s.section.thickness for s in stations]
    widths = [s.section.stave_width for s in stations]
    planed = _integral(trial, cache, lambda sec: staves * abs(ring_moments(sec.stave_outline).area) - sec.area)
    glue = _integral(trial, cache, lambda sec: staves * sec.glue_line)
    low, high = WORKABLE_WIDTH_OVER_THICKNESS
    layable = result.passed and low <= min(ratios) and max(ratios) <= high
    candidate = Candidate(staves=staves, spar=trial, solved=solved.lines, assessment=result, widest=max(widths),
                          narrowest=min(widths), width_over_thickness=(min(ratios), max(ratios)),
                          planed_away=planed, glue_area=glue, floor=board_feet_floor(trial, result) if layable else 0.0)
    return candidate, (cache if layable else None)


def _laid_out(candidate: Candidate, sections: SectionCache) -> Candidate:
    """The candidate with its layout and lumber order (or the stock's reason it has none)."""
    trial = candidate.spar
    try:
        layout = lay_out(trial, sections)
    except InputError as exc:
        return replace(candidate, stock_problem=exc.in_units(trial.units).problem)
    stock = trial.stock
    rough = max(seg.rough_width for seg in layout.segments)
    rips = int((max(stock.widths) + stock.kerf) // (rough + stock.kerf))
    order = layout.lumber
    passes = len(layout.machining.widest.settings.saw)
    cuts = (sum(len(b.rips) for b in order.boards)            # rips
            + sum(len(r.cuts) for b in order.boards for r in b.rips)  # cross-cuts to length
            + passes * len(layout.segments)                   # notch or bevel passes
            + 2 * layout.scarfs.count)                        # both halves of every scarf
    router = layout.machining.widest.settings.router
    return replace(candidate, layout=layout, rips_per_board=rips, cuts=cuts,
                   v_bit_one_pass=bool(router and router.one_pass_flat))


def _runner_up_limit(done: list[Candidate]) -> float:
    """The second smallest order among the candidates laid out (∞ while there are fewer than two)."""
    orders = sorted(c.board_feet for c in done if c.eligible)
    return orders[1] + BOARD_FEET_TIE if len(orders) > 1 else math.inf


def compare_stave_counts(spar: Spar, pool: Pool | None = None, progress: Progress | None = None) -> Comparison:
    """Check every stave count, lay out those that can win, and choose one; InputError on hollow.staves when
    none will do. ``pool`` shares the work with worker processes (one is made when not given).

    ``progress``, if given, is told (steps done, steps in all, words) as each count's check and each
    layout comes in; the steps in all fall as counts are ruled out before being laid out.
    """
    if spar.stock is None:
        raise InputError('staves = "auto" needs a [stock] table: the choice is by the wood to buy', "hollow.staves")
    first = MIN_STAVES if spar.hollow.joint.kind == "bevel" else MIN_STAVES + 1
    counts = list(range(first, MAX_STAVES + 1))
    if spar.hollow.two_axis:  # an oval needs an even count, symmetric about both axes
        counts = [n for n in counts if n % 2 == 0]
    refuse_too_many(spar, MOST_STATIONS_COMPARED, f" when it compares the {len(counts)} stave counts")
    tell = progress or (lambda done, total, words="": None)
    steps = {"done": 0, "total": 2 * len(counts), "words": f"checking {first} to {MAX_STAVES} staves"}

    def one_more() -> None:
        steps["done"] += 1
        tell(steps["done"], steps["total"], steps["words"])

    tell(0, steps["total"], steps["words"])
    with (pool or Pool()) as workers:
        assessed = workers.map(_assessed, [(spar, n) for n in counts], each=one_more)
        candidates = [c for c, _ in assessed]
        sections = {c.staves: cache for c, cache in assessed if cache is not None}
        del assessed
        waiting = sorted((c for c in candidates if c.staves in sections), key=lambda c: (c.floor, c.staves))
        steps.update(total=len(counts) + len(waiting), words="laying out the counts that can win")
        tell(steps["done"], steps["total"], steps["words"])
        done: list[Candidate] = []
        while waiting:
            limit = _runner_up_limit(done)
            for c in waiting:
                if c.floor > limit:
                    del sections[c.staves]
                    steps["total"] -= 1
            waiting = [c for c in waiting if c.floor <= limit]
            batch, waiting = waiting[:workers.size], waiting[workers.size:]
            done += workers.map(_laid_out, [(c, sections.pop(c.staves)) for c in batch], each=one_more)
        sections.clear()
    laid = {c.staves: c for c in done}
    limit = _runner_up_limit(done)
    candidates = tuple(laid.get(c.staves) or (replace(c, outbid=True) if c.floor > limit else c)
                       for c in candidates)
    eligible = [c for c in candidates if c.eligible]
    if not eligible:
        reasons = sorted({c.why_not() for c in candidates})
        raise DesignError("no stave count from "
                          f"{first} to {MAX_STAVES} meets the target with a workable stave from this stock: "
                          + "; ".join(reasons[:3]), "hollow.staves")
    least = min(c.board_feet for c in eligible)
    tied = [c for c in eligible if c.board_feet <= least + BOARD_FEET_TIE]
    chosen = min(tied, key=lambda c: c.staves)
    others = sorted((c for c in eligible if c is not chosen), key=lambda c: c.board_feet)
    reason = (f"{chosen.staves} staves: the least wood to buy, {chosen.board_feet:.1f} board feet, of the "
              f"{len(eligible)} stave counts that meet the target with a workable stave from this stock")
    outbid = sum(c.outbid for c in candidates)
    if outbid:
        reason += f" and {outbid} more that would need more wood whatever the cutting plan"
    if others:
        reason += f" (next: {others[0].staves} staves, {others[0].board_feet:.1f} board feet)"
    if len(tied) > 1:
        reason += "; tied on board feet, fewer staves chosen"
    return Comparison(candidates=candidates, chosen=chosen, reason=reason)
