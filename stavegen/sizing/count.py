"""Choosing the number of staves: every candidate N laid out in full and compared.

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
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Callable

from ..checks.assess import Assessment, assess
from ..errors import DesignError, InputError
from ..layout.plan import Layout, lay_out
from ..model.spar import MAX_STAVES, MIN_STAVES, Spar
from ..stations.evaluate import SectionCache
from ..stations.grid import intervals

WORKABLE_WIDTH_OVER_THICKNESS = (1.0, 5.0)  # common practice (no source): see the module's note
BOARD_FEET_TIE = 1e-6
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


def _evaluate(spar: Spar, staves: int) -> Candidate:
    from .solve import size_spar

    trial = replace(spar, hollow=replace(spar.hollow, staves=staves))
    try:
        trial, solved = size_spar(trial) if not trial.resolved else (trial, ())
        result = assess(trial)
    except DesignError as exc:
        return Candidate(staves=staves, refused=exc.in_units(spar.units).problem)
    cache = SectionCache(trial)
    stations = [c.station for c in result.stations]
    ratios = [s.section.stave_width / s.section.thickness for s in stations]
    widths = [s.section.stave_width for s in stations]
    planed = _integral(trial, cache, lambda sec: staves * sec.stave_polygon().area - sec.area)
    glue = _integral(trial, cache, lambda sec: staves * sec.glue_line)
    base = dict(staves=staves, spar=trial, solved=solved, assessment=result, widest=max(widths),
                narrowest=min(widths), width_over_thickness=(min(ratios), max(ratios)), planed_away=planed,
                glue_area=glue)
    low, high = WORKABLE_WIDTH_OVER_THICKNESS
    if not result.passed or not (low <= min(ratios) and max(ratios) <= high):
        return Candidate(**base)
    try:
        layout = lay_out(trial, cache)
    except InputError as exc:
        return Candidate(**base, stock_problem=exc.in_units(spar.units).problem)
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
    return Candidate(**base, layout=layout, rips_per_board=rips, cuts=cuts,
                     v_bit_one_pass=bool(router and router.one_pass_flat))


def compare_stave_counts(spar: Spar, progress: Progress | None = None) -> Comparison:
    """Lay out every stave count and choose one; InputError on hollow.staves when none will do.

    ``progress``, if given, is told (counts done, counts in all, words) as each count's result comes in.
    """
    if spar.stock is None:
        raise InputError('staves = "auto" needs a [stock] table: the choice is by the wood to buy', "hollow.staves")
    first = MIN_STAVES if spar.hollow.joint.kind == "bevel" else MIN_STAVES + 1
    tell = progress or (lambda done, total, words="": None)
    counts = range(first, MAX_STAVES + 1)
    results = []
    tell(0, len(counts), f"sizing and laying out {first} to {MAX_STAVES} staves")
    for n in counts:
        results.append(_evaluate(spar, n))
        tell(len(results), len(counts), f"sizing and laying out {first} to {MAX_STAVES} staves: {n} done")
    candidates = tuple(results)
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
    if others:
        reason += f" (next: {others[0].staves} staves, {others[0].board_feet:.1f} board feet)"
    if len(tied) > 1:
        reason += "; tied on board feet, fewer staves chosen"
    return Comparison(candidates=candidates, chosen=chosen, reason=reason)

