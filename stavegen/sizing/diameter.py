"""The least enlargement of the plan's diameters, with the wall fixed (``hollow.stations = "auto"``).

The hollow spar's finished diameters are the plan's times one scale factor
k ≥ 1, the least that meets every criterion at every station and at the
middle of every stretch. A factor rather than an amount added all along:
the EI of a round goes as D⁴, so making up for a less stiff wood (or for the
bore) calls for the same proportional increase at heel and head alike; a
factor keeps the plan's taper in proportion, and with it the shape of the
spar's bend, where an added amount would fatten the slender head (weight
and windage aloft) proportionally more than the heel. k is never below 1:
the plan's diameters are kept when they already meet the target.

Bounds on k at each point, for the wall t there and plan radius r_p:
k·r_p > t (a round no thicker than the wall has no bore: the bore closes),
and k·r_p·(1 − cos(π/N)) ≤ t − p − c_min·cos(π/N) (a larger round breaks
into the bore's corners). Lengths mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import DesignError
from ..model.spar import Profile, Spar
from ..units import format_exact, format_length
from .roots import Miss, Window, common_windows, window
from .targets import (Criterion, Point, athwartships_share, check_at, closed_form_applies, closed_form_check_at, closed_form_checker,
                      closed_form_trusted, criteria_of, place, points_of, ratio_text)
from .wall import BORE_CLEARANCE, BORE_CORNERS, CORNER_MINIMUM

KEY = "hollow.stations"
PLAN = "the plan's diameters"
BORE_CLOSES = "bore closes"


@dataclass(frozen=True)
class DiameterSolution:
    """The solved finished diameters (mm), their scale factor on the plan's, and what sets it where."""

    diameter: Profile
    scale: float
    binding: Point
    binding_by: str


def scale_range(spar: Spar, point: Point) -> tuple[float, str, float, str]:
    """Least and greatest scale factor at ``point`` and what sets each (see the module's bounds)."""
    h = spar.hollow
    if h.is_box:
        return _box_scale_range(spar, point)
    if h.two_axis:
        return _oval_scale_range(spar, point)
    t = float(h.wall.at(point.z))
    plan_radius = point.plan_diameter / 2
    cos = math.cos(math.pi / h.staves)
    corner = h.min_corner_wall or 0.0
    sheath = h.sheath(point.z, spar.length) if h.layers else 0.0  # the wood is rounded this far inside
    bore = (t + sheath) / plan_radius * (1 + 1e-9)
    low, low_by = (1.0, PLAN) if bore <= 1.0 else (bore, BORE_CLOSES)
    high = ((t - h.planing_allowance - corner * cos - BORE_CLEARANCE) / (1 - cos) + sheath) / plan_radius
    return low, low_by, high, (CORNER_MINIMUM if corner else BORE_CORNERS)


BOX_SCALE_CAP = 10.0  # a box's scale is sought up to this many times the least (no bore corner bounds it)
SCALE_CAP = "ten times the least scale"


def _box_scale_range(spar: Spar, point: Point) -> tuple[float, str, float, str]:
    """:func:`scale_range` for a box: k times the plan's smaller half-dimension over the wall less the planing
    allowance (the bore closes below); above, no corner of the bore can break out of a growing rectangle, so the
    search is capped at :data:`BOX_SCALE_CAP` times the least."""
    h = spar.hollow
    t = float(h.wall.at(point.z))
    fore_aft = point.plan_diameter
    athwartships = fore_aft * athwartships_share(spar, point.z)
    bore = max(t - h.planing_allowance, 1e-9) / (min(fore_aft, athwartships) / 2) * (1 + 1e-9)
    low, low_by = (1.0, PLAN) if bore <= 1.0 else (bore, BORE_CLOSES)
    return low, low_by, BOX_SCALE_CAP * low, SCALE_CAP


def _oval_scale_range(spar: Spar, point: Point) -> tuple[float, str, float, str]:
    """:func:`scale_range` for an oval: k times the plan's smaller half-dimension over the wall (the bore closes
    below), and the largest k whose bore's corners stay inside the finished oval (brentq on their reach)."""
    from scipy.optimize import brentq

    from ..section.oval import corner_reach

    h = spar.hollow
    t = float(h.wall.at(point.z))
    fore_aft = point.plan_diameter
    athwartships = fore_aft * athwartships_share(spar, point.z)
    corner = h.min_corner_wall or 0.0
    bore = t / (min(fore_aft, athwartships) / 2) * (1 + 1e-9)
    low, low_by = (1.0, PLAN) if bore <= 1.0 else (bore, BORE_CLOSES)
    high_by = CORNER_MINIMUM if corner else BORE_CORNERS

    sheath = 2 * h.sheath(point.z, spar.length) if h.layers else 0.0  # the wood is rounded inside the layers

    def excess(k: float) -> float:
        return corner_reach(h.staves, k * fore_aft - sheath, k * athwartships - sheath, t, h.planing_allowance,
                            corner) - 1.0

    if excess(low) >= 0:
        return low, low_by, low * (1 - 1e-9), high_by
    top = 2 * low
    while excess(top) < 0 and top < 1e6:
        top *= 2
    high = brentq(excess, low, top, xtol=1e-12, rtol=1e-12) * (1 - 1e-9)
    return low, low_by, high, high_by


def scale_window(spar: Spar, point: Point, criteria: tuple[Criterion, ...], trust: bool = False) -> Window | Miss:
    """The scale factors that meet every criterion at ``point``, or what none can reach there.

    ``trust``: search on the closed-form section from the start (see :func:`~.roots.window`).
    """
    lo, lo_by, hi, hi_by = scale_range(spar, point)
    if lo >= hi:
        return Window(lo, hi, lo_by, hi_by)
    t = float(spar.hollow.wall.at(point.z))
    quick = None
    if closed_form_applies(spar):
        closed = closed_form_checker(spar, point)
        quick = lambda k: closed(k * point.plan_diameter / 2, t)  # noqa: E731
    return window(lambda k: check_at(spar, point, k * point.plan_diameter / 2, t), criteria, lo, hi, lo_by, hi_by,
                  quick, trust)


def meets_scale(spar: Spar, point: Point, criteria: tuple[Criterion, ...], k: float) -> bool:
    """Whether the scale factor ``k`` meets every criterion at ``point`` within the range the wall allows there
    (closed form for flush and bevel joints; every solved size is checked again on the exact section)."""
    lo, _, hi, _ = scale_range(spar, point)
    if not lo <= k <= hi:
        return False
    t = float(spar.hollow.wall.at(point.z))
    radius = k * point.plan_diameter / 2
    try:
        check = (closed_form_check_at if closed_form_applies(spar) else check_at)(spar, point, radius, t)
    except DesignError:
        return False
    return all(c.ratio(check) >= c.target for c in criteria)


def _low_reason(spar: Spar, point: Point, by: str, k: float, criteria: tuple[Criterion, ...]) -> str:
    for c in criteria:
        if c.name == by:
            return f"{c.name} {c.target:.3f} at {place(spar, point)} needs the plan's diameters × {k:.4f}"
    if by == BORE_CLOSES:
        wall = format_length(float(spar.hollow.wall.at(point.z)), spar.units)
        return (f"below × {k:.4f} the bore closes at {place(spar, point)} (a {wall} wall is as thick as the "
                "radius there)")
    return f"the plan's diameters at {place(spar, point)}"


def _high_reason(spar: Spar, point: Point, by: str, k: float) -> str:
    wall = format_length(float(spar.hollow.wall.at(point.z)), spar.units)
    largest = format_length(k * point.plan_diameter, spar.units)
    if by == CORNER_MINIMUM:
        return (f"at {place(spar, point)} a round over {largest} across leaves less than hollow.min_corner_wall "
                f"of the {wall} wall after rounding")
    return (f"at {place(spar, point)} a round over {largest} across (× {k:.4f}) breaks into the bore of the {wall} "
            "wall")


def _conflict(spar: Spar, point: Point, low: Window, capped: Point, high: Window,
              criteria: tuple[Criterion, ...]) -> DesignError:
    """No scale factor is both large enough at ``point`` and small enough at ``capped``."""
    cap = _high_reason(spar, capped, high.upper_by, high.upper)
    if low.lower_by == PLAN:
        return DesignError(f"the wall is too thin even for the plan's diameters: {cap}, and the plan's is "
                           f"{format_length(capped.plan_diameter, spar.units)}; a larger round only makes it "
                           "worse: use a thicker wall", KEY)
    return DesignError(f"no uniform enlargement works: {_low_reason(spar, point, low.lower_by, low.lower, criteria)}"
                       f", but {cap}; use a thicker wall", KEY)


def _window_at(spar: Spar, point: Point, criteria: tuple[Criterion, ...], trust: bool = False) -> Window:
    """The point's window of scale factors; DesignError when none reaches the target there or none fits."""
    found = scale_window(spar, point, criteria, trust)
    if isinstance(found, Miss):
        c = found.criterion
        raise DesignError(f"no diameter reaches {c.name} {c.target:.3f} at {place(spar, point)}: the largest "
                          f"round the wall allows (× {found.best_size:.4f}) gives only "
                          f"{ratio_text(found.best, c.target)} before it breaks into the bore; use a thicker wall",
                          KEY)
    if found.empty:
        raise _conflict(spar, point, found, point, found, criteria)
    return found


def solve_diameter_scale(spar: Spar, skip: bool = False, trust: bool = False) -> DiameterSolution:
    """The least scale factor k ≥ 1 on the plan's diameters that meets the target, with the wall as given.

    ``skip``: points the factor found so far already meets get no root search of their own
    (:func:`~.roots.common_windows`). ``trust``: root searches on the closed-form section from the
    start, where it agrees with the exact one on this spar (:func:`~.roots.window`).
    """
    criteria = criteria_of(spar)
    points = points_of(spar)
    if trust:
        lo, _, hi, _ = scale_range(spar, points[0])
        k = (lo + hi) / 2
        trust = lo < hi and closed_form_trusted(spar, points[0], criteria, k * points[0].plan_diameter / 2,
                                                float(spar.hollow.wall.at(points[0].z)))
    meets = (lambda p, k: meets_scale(spar, p, criteria, k)) if skip else None
    windows = common_windows(points, lambda p: _window_at(spar, p, criteria, trust), meets)
    point, low = max(windows, key=lambda pw: pw[1].lower)
    capped, high = min(windows, key=lambda pw: pw[1].upper)
    if low.lower > high.upper:
        raise _conflict(spar, point, low, capped, high, criteria)
    k = low.lower
    plan = spar.plan.diameter
    return DiameterSolution(Profile(plan.z, tuple(k * d for d in plan.value)), k, point, low.lower_by)


def describe_scale(spar: Spar, solution: DiameterSolution) -> str:
    """The solved factor and the largest diameter, exact: ``the plan's × 1.0573 (5" becomes 5.2865")``."""
    plan = spar.plan.diameter.largest
    return (f"the plan's × {solution.scale:.6f} (its largest, {format_length(plan, spar.units)}, becomes "
            f"{format_exact(solution.scale * plan, spar.units)})")
