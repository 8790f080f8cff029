"""The range of one size (a wall in mm, or a scale factor) over which one point meets every criterion.

Each ratio is taken to be unimodal in the size: monotone, or rising to one
peak and falling. With the flush or bevel joint I_wall = π R⁴/4 − I_bore
exactly, and a plug only adds E_plug · I_bore, so a ratio rises with the
wall unless a plug stiffer than the staves fills the bore (then it falls).
Joints that leave voids (centred with N ≠ 8, the builder's own notch) open
larger voids as the wall thickens, and past some wall I falls again: there
the ratio peaks inside the range. So: where both ends fall short, the peak
is found (bounded Brent, scipy.optimize.minimize_scalar); the bounds are
the roots of ratio − target (Brent's method, scipy.optimize.brentq) on
either side, each moved the last few units in the last place to the side
that meets the target, so the size returned never falls short by roundoff.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable, Sequence, TypeVar

from scipy.optimize import brentq, minimize_scalar

from ..checks.ratios import StationCheck
from ..errors import DesignError
from .targets import Criterion, agrees

P = TypeVar("P")
XTOL = 1e-12  # absolute tolerance of the root (mm, or a scale factor near 1)
NOTCH = "the notch"  # a bound set by where the joint's geometry stops being buildable


@dataclass(frozen=True)
class Window:
    """Sizes from ``lower`` to ``upper`` meet every criterion; ``*_by`` says what sets each bound.

    ``lower_by``/``upper_by`` is a criterion's name or the caller's label of
    a limit. ``lower > upper`` means the limits leave no size.
    """

    lower: float
    upper: float
    lower_by: str
    upper_by: str

    @property
    def empty(self) -> bool:
        return self.lower > self.upper


UPPER, LOWER, INSIDE = "upper", "lower", "inside"
NOTCH_UPPER = "upper, set by the notch"  # the greatest size the joint closes at (a groove opens past it)


@dataclass(frozen=True)
class Miss:
    """No size within the limits reaches ``criterion``: the best ratio found, at ``best_size``.

    ``best_at`` says where that is: at the ``"upper"`` or ``"lower"`` limit, or ``"inside"`` (a peak).
    """

    criterion: Criterion
    best: float
    best_size: float
    best_at: str


def _meeting_side(excess: Callable[[float], float], root: float, toward: float, limit: float) -> float:
    """The size nearest ``root`` on the side ``toward`` (+1 or −1) where excess ≥ 0; ``limit`` is known to meet."""
    step = 4 * math.ulp(max(abs(root), 1.0))
    x = root
    for _ in range(64):
        if (x - limit) * toward >= 0:
            return limit
        if excess(x) >= 0:
            return x
        x = root + toward * step
        step *= 2
    return limit


def _buildable_range(check: Callable[[float], StationCheck], lo: float, hi: float) -> tuple[float, float]:
    """The least and the greatest size in [lo, hi] whose section can be built (bisection on each side).

    A joint may be unbuildable at small sizes (the notch does not fit) and at large ones (a notch too
    shallow for a thick wall leaves a groove at the seams). Raises the geometry's own error when no
    size tried can be built.
    """
    def builds(x: float) -> bool:
        try:
            check(x)
            return True
        except DesignError:
            return False

    inside = next((x for x in [lo, hi] + [lo + (hi - lo) * k / 16 for k in range(1, 16)] if builds(x)), None)
    if inside is None:
        check(hi)  # raises the geometry's own error
    ends = []
    for edge in (lo, hi):
        if builds(edge):
            ends.append(edge)
            continue
        bad, good = edge, inside
        while abs(good - bad) > XTOL * max(1.0, abs(good)):
            mid = (bad + good) / 2
            if builds(mid):
                good = mid
            else:
                bad = mid
        ends.append(good)
    return ends[0], ends[1]


def window(check: Callable[[float], StationCheck], criteria: tuple[Criterion, ...], lo: float, hi: float,
           lo_by: str, hi_by: str, quick: Callable[[float], StationCheck] | None = None,
           trust_quick: bool = False) -> Window | Miss:
    """Where in [lo, hi] the point meets every criterion, or the first criterion no size there reaches.

    ``check(size)`` gives the point's check at a trial size; it may raise
    DesignError where the joint cannot be built (at small sizes, or at large ones).
    ``quick(size)``, if given, is the same check in closed form: the searches
    use it once it agrees with ``check`` at the least buildable size, or
    from the start with ``trust_quick`` (the caller has it agree elsewhere on
    the spar and checks the solution on the exact section: where the joint
    cannot be built at the size found, it searches again without).
    """
    cache: dict[float, StationCheck] = {}

    def at(x: float) -> StationCheck:
        if x not in cache:
            cache[x] = check(x)
        return cache[x]

    if not (trust_quick and quick is not None):
        start, stop = _buildable_range(at, lo, hi)
        if start > lo:
            lo, lo_by = start, NOTCH
        if stop < hi:
            hi, hi_by = stop, NOTCH
    ratios = at
    if quick is not None and (trust_quick or agrees(at(lo), quick(lo), criteria)):
        quick_cache: dict[float, StationCheck] = {}

        def ratios(x: float) -> StationCheck:
            if x not in quick_cache:
                quick_cache[x] = quick(x)
            return quick_cache[x]

    lower, lower_by, upper, upper_by = lo, lo_by, hi, hi_by
    for criterion in criteria:
        def excess(x: float, c: Criterion = criterion) -> float:
            return c.ratio(ratios(x)) - c.target

        low_end, high_end = excess(lo), excess(hi)
        if low_end >= 0 and high_end >= 0:
            continue
        rise_to, fall_from = hi, lo  # where the rising root's bracket ends, where the falling one's starts
        if low_end < 0 and high_end < 0:
            peak = minimize_scalar(lambda x: -excess(x), bounds=(lo, hi), method="bounded",
                                   options={"xatol": XTOL * max(1.0, abs(hi))})
            best = max((excess(lo), lo, LOWER), (excess(hi), hi, NOTCH_UPPER if hi_by == NOTCH else UPPER),
                       (excess(peak.x), peak.x, INSIDE))
            if best[0] < 0:
                return Miss(criterion, criterion.target + best[0], best[1], best[2])
            rise_to = fall_from = best[1]
        if low_end < 0:
            root = brentq(excess, lo, rise_to, xtol=XTOL, maxiter=200)
            x = _meeting_side(excess, root, +1.0, rise_to)
            if x > lower:
                lower, lower_by = x, criterion.name
        if high_end < 0:
            root = brentq(excess, fall_from, hi, xtol=XTOL, maxiter=200)
            x = _meeting_side(excess, root, -1.0, fall_from)
            if x < upper:
                upper, upper_by = x, criterion.name
    return Window(lower, upper, lower_by, upper_by)


def common_windows(points: Sequence[P], window_of: Callable[[P], Window],
                   meets: Callable[[P, float], bool] | None = None) -> list[tuple[P, Window]]:
    """The windows a size common to every point is read from (the largest lower bound, the least upper one).

    With ``meets`` (a cheap test of one size at one point), a point that
    already meets the largest lower bound found so far gets no window of its
    own: its window holds that size, so it can neither raise the common size
    nor cap it below that. The common size only grows; each skipped point is
    tested again at the final one and given its window if it falls short
    there. The windows come back in the points' order, so that ties go where
    they would with every window worked out.
    """
    found: dict[int, Window] = {}
    skipped: dict[int, float] = {}  # point index → the size it was seen to meet
    best: float | None = None
    for i, point in enumerate(points):
        if meets is not None and best is not None and meets(point, best):
            skipped[i] = best
            continue
        found[i] = window_of(point)
        best = found[i].lower if best is None else max(best, found[i].lower)
    while skipped:
        best = max(w.lower for w in found.values())
        short = [i for i, size in skipped.items() if size != best and not meets(points[i], best)]
        if not short:
            break
        for i in short:
            del skipped[i]
            found[i] = window_of(points[i])
        skipped = {i: best for i in skipped}  # met by the size before, and by this one (tested above)
    return [(points[i], found[i]) for i in sorted(found)]
