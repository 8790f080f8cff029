"""The least stave thickness, with the finished diameters fixed.

Two forms, both exact (nothing rounded; the printed figures are rounded
only where they are printed):

- :func:`solve_constant_wall` (``wall = "auto"``): one thickness for the whole
  spar, the least at which no station and no stretch's middle falls short.
- :func:`solve_tapered_wall` (``wall = "auto-tapered"``): the least thickness
  at each station, linear between them, thickened where a stretch's middle
  would otherwise fall short. Here the plugs get no credit: where blocking
  fills the bore the check's EI hardly depends on the wall, and the least
  wall there would drop to what the round alone needs (a stave planed from
  1" to 1/4" within a foot of the partners). Sized as if the bore were open,
  the taper runs smoothly through the blocking, which then adds margin.

The wall is bounded below by the round: R > a_i / cos(π/N) with
a_i = R + planing allowance − t (and the wall after rounding at the bore's
corners ≥ ``hollow.min_corner_wall`` when set); above by the radius (a wall
as thick as the radius leaves no bore, as the loader rules) and by the
stock's thickness. Lengths mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

import numpy as np

from ..errors import DesignError
from ..model.spar import AUTO_TAPERED, Profile, Spar
from ..units import format_exact, format_length, format_length_up
from ..stations.evaluate import wood_radius
from .roots import INSIDE, NOTCH, NOTCH_UPPER, UPPER, Miss, Window, common_windows, window
from .targets import (Criterion, Point, athwartships_share, check_at, closed_form_applies, closed_form_check_at, closed_form_checker,
                      closed_form_trusted, criteria_of, place, points_of, ratio_text)

KEY = "hollow.wall"
BORE_CLEARANCE = 1e-9  # mm: the least wall stands this far clear of the round reaching the bore's corners
NO_BORE = "no bore"
BORE_CORNERS = "bore corners"
CORNER_MINIMUM = "corner minimum"
MAX_THICKENING_PASSES = 16
THICKENING_REPORTED = 1e-9  # relative: a stretch thickened by less than this (roundoff) is not reported


@dataclass(frozen=True)
class WallSolution:
    """A solved wall: the schedule (mm), the point that sets it, what sets it there, stretches thickened."""

    wall: Profile
    binding: Point
    binding_by: str
    thickened: int = 0


BOX_CORNERS = "box corners"  # a box's wall: at least the corner rounding (or hollow.min_corner_wall) after planing


def box_wall_range(spar: Spar, z: float) -> tuple[float, str, float]:
    """:func:`wall_range` for a box at ``z``: the planed wall must hold the corner rounding and the least corner
    wall (t − allowance ≥ max(r, c_min)), and a rebate must be shallower than the wall; the thickest just under
    the smaller half-dimension plus the allowance (the bore closes there)."""
    h = spar.hollow
    fore_aft = float(h.diameter.at(z))
    athwartships = fore_aft * athwartships_share(spar, z)
    keep = max(h.corner_radius, h.min_corner_wall or 0.0)
    thinnest = h.planing_allowance + keep + BORE_CLEARANCE
    if h.corner in ("rebated", "pinwheel") and h.rebate_depth is not None:
        thinnest = max(thinnest, h.rebate_depth * (1 + 1e-9))
    thinnest = max(thinnest, 1e-6)
    by = CORNER_MINIMUM if h.min_corner_wall and h.min_corner_wall >= h.corner_radius else BOX_CORNERS
    return thinnest, by, (min(fore_aft, athwartships) / 2 + h.planing_allowance) * (1 - 1e-9)


def oval_wall_range(spar: Spar, z: float) -> tuple[float, str, float]:
    """:func:`wall_range` for an oval at ``z``: the thinnest wall whose bore's corners stay inside the finished
    oval (shrunk by hollow.min_corner_wall), found by brentq on the corners' reach, and just under the smaller
    half-dimension."""
    from scipy.optimize import brentq

    from ..section.oval import corner_reach

    h = spar.hollow
    sheath = 2 * h.sheath(z, spar.length) if h.layers else 0.0  # the wood is rounded inside the layers
    fore_aft = float(h.diameter.at(z))
    athwartships = fore_aft * athwartships_share(spar, z) - sheath
    fore_aft -= sheath
    corner = h.min_corner_wall or 0.0
    thickest = min(fore_aft, athwartships) / 2 * (1 - 1e-9)

    def excess(t: float) -> float:
        return corner_reach(h.staves, fore_aft, athwartships, t, h.planing_allowance, corner) - 1.0

    low = 1e-6
    if excess(low) <= 0:
        thinnest = low
    elif excess(thickest) >= 0:
        thinnest = thickest
    else:
        thinnest = brentq(excess, low, thickest, xtol=1e-12, rtol=1e-12) + BORE_CLEARANCE
    return thinnest, (CORNER_MINIMUM if corner else BORE_CORNERS), thickest


def wall_range(spar: Spar, radius: float, z: float | None = None) -> tuple[float, str, float]:
    """Thinnest wall (mm) a finished ``radius`` allows, what sets it, and the thickest (just under the radius).

    Thinnest: t ≥ R + p − (R − c_min)·cos(π/N) + clearance, from the bore's
    corner radius a_i / cos(π/N) ≤ R − c_min (c_min = hollow.min_corner_wall or 0). For an oval (``z``
    given), :func:`oval_wall_range`.
    """
    h = spar.hollow
    if h.is_box and z is not None:
        return box_wall_range(spar, z)
    if h.two_axis and z is not None:
        return oval_wall_range(spar, z)
    if z is not None:
        radius = wood_radius(spar, radius, z)  # the wood under the layers
    cos = math.cos(math.pi / h.staves)
    corner = h.min_corner_wall or 0.0
    thinnest = radius + h.planing_allowance - (radius - corner) * cos + BORE_CLEARANCE
    return thinnest, (CORNER_MINIMUM if corner else BORE_CORNERS), radius * (1 - 1e-9)


def _radius(spar: Spar, z: float) -> float:
    return float(spar.hollow.diameter.at(z)) / 2


def wall_window(spar: Spar, point: Point, criteria: tuple[Criterion, ...], trust: bool = False) -> Window | Miss:
    """The walls (mm) that meet every criterion at ``point``, or what no wall can reach there.

    ``trust``: search on the closed-form section from the start (see :func:`~.roots.window`).
    """
    radius = _radius(spar, point.z)
    lo, lo_by, hi = wall_range(spar, radius, point.z)
    if lo >= hi:
        return Window(lo, hi, lo_by, NO_BORE)
    quick = None
    if closed_form_applies(spar):
        closed = closed_form_checker(spar, point)
        quick = lambda t: closed(radius, t)  # noqa: E731
    return window(lambda t: check_at(spar, point, radius, t), criteria, lo, hi, lo_by, NO_BORE, quick, trust)


def _trusted(spar: Spar, criteria: tuple[Criterion, ...], point: Point) -> bool:
    """Whether the closed form agrees with the exact section at ``point``, mid-way through its range of walls."""
    radius = _radius(spar, point.z)
    lo, _, hi = wall_range(spar, radius, point.z)
    return lo < hi and closed_form_trusted(spar, point, criteria, radius, (lo + hi) / 2)


def meets_wall(spar: Spar, point: Point, criteria: tuple[Criterion, ...], wall: float) -> bool:
    """Whether ``wall`` (mm) meets every criterion at ``point`` and lies in the range the round allows there
    (closed form for flush and bevel joints; every solved wall is checked again on the exact section)."""
    radius = _radius(spar, point.z)
    lo, _, hi = wall_range(spar, radius, point.z)
    if not lo <= wall <= hi:
        return False
    try:
        check = (closed_form_check_at if closed_form_applies(spar) else check_at)(spar, point, radius, wall)
    except DesignError:
        return False
    return all(c.ratio(check) >= c.target for c in criteria)


def _meets(spar: Spar, criteria: tuple[Criterion, ...]) -> Callable[[Point, float], bool]:
    """:func:`meets_wall` for this spar, the closed form at each point made once."""
    if not closed_form_applies(spar):
        return lambda point, wall: meets_wall(spar, point, criteria, wall)
    checkers: dict[float, Callable[[float, float], object]] = {}

    def meets(point: Point, wall: float) -> bool:
        radius = _radius(spar, point.z)
        lo, _, hi = wall_range(spar, radius, point.z)
        if not lo <= wall <= hi:
            return False
        key = (point.z, point.at_station)
        if key not in checkers:
            checkers[key] = closed_form_checker(spar, point)
        check = checkers[key](radius, wall)
        return all(c.ratio(check) >= c.target for c in criteria)

    return meets


def _show(spar: Spar, mm: float) -> str:
    return f"{format_exact(mm, spar.units)} ({format_length_up(mm, spar.units)} rounded up)"


def _need(spar: Spar, point: Point, by: str, criteria: tuple[Criterion, ...]) -> str:
    """What asks for the wall at ``point``, as the subject of a sentence."""
    for c in criteria:
        if c.name == by:
            return f"{c.name} {c.target:.3f} at {place(spar, point)}"
    if by == CORNER_MINIMUM:
        return (f"the least wall after rounding (hollow.min_corner_wall "
                f"{format_length(spar.hollow.min_corner_wall, spar.units)}) at {place(spar, point)}")
    if by == NOTCH:
        return f"the notch ({spar.hollow.joint.kind}) at {place(spar, point)}"
    return f"keeping the round out of the bore's corners at {place(spar, point)}"


def _cap(spar: Spar, point: Point, by: str, limit: float, criteria: tuple[Criterion, ...]) -> str:
    """Why the wall may be no thicker than ``limit`` at ``point``."""
    if by == NO_BORE:
        return (f"at {place(spar, point)} a wall that thick leaves no bore: the staves would meet at the axis "
                f"(finished radius {format_length(_radius(spar, point.z), spar.units)})")
    name = next((c for c in criteria if c.name == by), None)
    if name is None:  # a bound of the geometry, not of a criterion (the notch, the oval's thickest wall)
        what = ("the notch closes no thicker stave at the seams" if by in (NOTCH, NOTCH_UPPER)
                else "the staves' inner faces would cross over" if by == BORE_CORNERS else by)
        return f"at {place(spar, point)} no wall over {format_exact(limit, spar.units)} can be built ({what})"
    why = ("the plug there is stiffer than the staves" if point.plug is not None
           else "thicker walls open larger voids in the notches")
    return (f"at {place(spar, point)} the {name.name} falls below {name.target:.3f} with any wall over "
            f"{format_exact(limit, spar.units)} ({why})")


def _unreachable(spar: Spar, point: Point, miss: Miss) -> DesignError:
    c = miss.criterion
    if miss.best_at == UPPER:
        how = "even staves meeting at the axis (no bore left)"
    elif miss.best_at == NOTCH_UPPER:
        how = (f"even the thickest wall this notch closes at the seams ({format_exact(miss.best_size, spar.units)}; "
               "a thicker stave leaves a groove open between the notched edge and the neighbour)")
    elif miss.best_at == INSIDE:
        how = (f"even the stiffest wall for this joint ({format_exact(miss.best_size, spar.units)}; thicker walls "
               "open larger voids in the notches)")
    else:
        how = "even the thinnest wall the round allows (any thinner and the round breaks into the bore)"
    plugged = ", where the bore is plugged," if point.plug is not None else ""
    return DesignError(f"no wall can reach {c.name} {c.target:.3f} at {place(spar, point)}{plugged}: {how} give only "
                       f"{ratio_text(miss.best, c.target)}; use a stiffer wood for the staves or larger diameters "
                       f"(hollow.stations = \"auto\" finds them)", KEY)


def _window_at(spar: Spar, point: Point, criteria: tuple[Criterion, ...], trust: bool = False) -> Window:
    """The point's window of walls; DesignError when no wall reaches the target there or none fits."""
    found = wall_window(spar, point, criteria, trust)
    if isinstance(found, Miss):
        raise _unreachable(spar, point, found)
    if found.empty:
        raise DesignError(f"no wall fits at {place(spar, point)}: {_need(spar, point, found.lower_by, criteria)}"
                          f" needs at least {_show(spar, found.lower)}, but "
                          f"{_cap(spar, point, found.upper_by, found.upper, criteria)}", KEY)
    return found


def _check_stock(spar: Spar, needs: list[tuple[Point, float, str]], criteria: tuple[Criterion, ...]) -> None:
    """Raise when the thickest wall asked for is more than the stock's thickness."""
    if spar.stock is None or not needs:
        return
    point, wall, by = max(needs, key=lambda n: n[1])
    stock = spar.stock.thickness
    if wall > stock:
        raise DesignError(f"the stock is too thin: boards {format_length(stock, spar.units)} thick give a wall "
                          f"of at most that, but {_need(spar, point, by, criteria)} needs a wall of at least "
                          f"{_show(spar, wall)}; use boards at least that thick (stock.thickness)", KEY)


def solve_constant_wall(spar: Spar, skip: bool = False, trust: bool = False) -> WallSolution:
    """The least constant wall (mm) that meets every criterion at every point.

    ``skip``: points the wall found so far already meets get no root search of their own
    (:func:`~.roots.common_windows`). ``trust``: root searches on the closed-form section from the
    start, where it agrees with the exact one on this spar (:func:`~.roots.window`).
    """
    criteria = criteria_of(spar)
    points = points_of(spar)
    trust = trust and _trusted(spar, criteria, points[0])
    meets = _meets(spar, criteria) if skip else None
    windows = common_windows(points, lambda p: _window_at(spar, p, criteria, trust), meets)
    point, low = max(windows, key=lambda pw: pw[1].lower)
    capped, high = min(windows, key=lambda pw: pw[1].upper)
    if low.lower > high.upper:
        raise DesignError(f"no constant wall works: {_need(spar, point, low.lower_by, criteria)} needs at least "
                          f"{_show(spar, low.lower)}, but {_cap(spar, capped, high.upper_by, high.upper, criteria)};"
                          f" try wall = \"{AUTO_TAPERED}\"", KEY)
    _check_stock(spar, [(point, low.lower, low.lower_by)], criteria)
    return WallSolution(Profile.constant(low.lower, spar.length), point, low.lower_by)


def _raise_to_meet(values: list[float], zs: list[float], k: int, need: float) -> float:
    """Thicken stretch k (stations k, k+1) so its middle gets at least ``need``; the most an end was raised (mm).

    The thinner end is raised until the middle meets; if the middle needs more
    than the thicker end, both ends are raised to ``need``. So no station is
    ever made thicker than the most any point needs.
    """
    a, b = values[k], values[k + 1]
    middle = (zs[k] + zs[k + 1]) / 2

    def at_middle() -> float:
        return float(np.interp(middle, zs[k:k + 2], values[k:k + 2]))

    if at_middle() >= need:
        return 0.0
    if need <= max(a, b):
        low = k if a < b else k + 1
        values[low] = 2 * need - max(a, b)
    else:
        values[k], values[k + 1] = max(a, need), max(b, need)
    low = k if values[k] <= values[k + 1] else k + 1
    while at_middle() < need:  # the last unit in the last place of the interpolation
        values[low] = float(np.nextafter(values[low], math.inf))
    return max(values[k] - a, values[k + 1] - b)


def _settled(zs: list[float], values: list[float], windows: list[tuple[Point, Window | None]],
             meets: Callable[[Point, float], bool]) -> Profile:
    """The schedule, with a station's value moved up by units in the last place wherever the profile's own
    interpolation (which may reach a station from the stretch before it) gives a point less than it needs.
    A point without a window (skipped: met by the line between its stations) is asked with ``meets``."""
    for _ in range(64):
        wall = Profile(tuple(zs), tuple(values))
        short = [(p, w) for p, w in windows
                 if (float(wall.at(p.z)) < w.lower if w is not None else not meets(p, float(wall.at(p.z))))]
        if not short:
            return wall
        for point, _ in short:
            k = int(np.clip(np.searchsorted(zs, point.z), 0, len(zs) - 1))
            if not point.at_station and values[k - 1] < values[k]:
                k -= 1
            values[k] = float(np.nextafter(values[k], math.inf))
    return Profile(tuple(zs), tuple(values))


def _tapered_windows(spar: Spar, criteria: tuple[Criterion, ...], skip: bool,
                     trust: bool) -> list[tuple[Point, Window | None]]:
    """Every point's window, heel to head (stations and stretch middles alternate). With ``skip``, a middle
    that the straight line between its two stations' least walls already meets gets None: thickening only
    raises that line, so its own least wall would never be asked for."""
    points = points_of(spar, plugs=False)
    trust = trust and _trusted(spar, criteria, points[0])
    if not skip:
        return [(p, _window_at(spar, p, criteria, trust)) for p in points]
    meets = _meets(spar, criteria)
    out: list[tuple[Point, Window | None]] = [(points[0], _window_at(spar, points[0], criteria, trust))]
    for i in range(1, len(points), 2):
        middle, after = points[i], points[i + 1]
        try:
            next_window = _window_at(spar, after, criteria, trust)
        except DesignError:
            _window_at(spar, middle, criteria, trust)  # the middle comes first: its error, if any, is the one told
            raise
        before = out[-1]
        line = float(np.interp(middle.z, [before[0].z, after.z], [before[1].lower, next_window.lower]))
        out.append((middle, None if meets(middle, line) else _window_at(spar, middle, criteria, trust)))
        out.append((after, next_window))
    return out


def solve_tapered_wall(spar: Spar, skip: bool = False, trust: bool = False) -> WallSolution:
    """The least wall (mm) at each station for an open bore, linear between.

    Thickened where a stretch's middle would fall short. ``skip``: see :func:`_tapered_windows`;
    ``trust``: see :func:`solve_constant_wall`.
    """
    criteria = criteria_of(spar)
    windows = _tapered_windows(spar, criteria, skip, trust)
    stations = [(p, w) for p, w in windows if p.at_station]
    middles = [(p, w) for p, w in windows if not p.at_station]
    zs = [p.z for p, _ in stations]
    values = [w.lower for _, w in stations]
    thickened: set[int] = set()
    for _ in range(MAX_THICKENING_PASSES):
        changed = False
        for k, (_, w) in enumerate(middles):
            if w is None:
                continue
            raised = _raise_to_meet(values, zs, k, w.lower)
            if raised > 0:
                changed = True
                if raised > THICKENING_REPORTED * w.lower:
                    thickened.add(k)
        if not changed:
            break

    meets = _meets(spar, criteria)
    wall = _settled(zs, values, windows, meets)
    for point, w in windows:
        t = float(wall.at(point.z))
        if w is None:
            if not meets(point, t):  # cannot happen by the argument above; if roundoff says otherwise, ask all
                return solve_tapered_wall(spar, skip=False, trust=trust)
            continue
        if t > w.upper * (1 + 1e-12):
            raise DesignError(f"no wall schedule works: thickened to {_show(spar, t)} to meet the target between "
                              f"stations, {_cap(spar, point, w.upper_by, w.upper, criteria)}", KEY)
    # Thickening never takes a station past the most any point needs, so the needs bound the stock (a skipped
    # middle needs no more than the larger of its stations' least walls).
    _check_stock(spar, [(p, w.lower, w.lower_by) for p, w in windows if w is not None], criteria)
    k = int(np.argmax(values))
    point, w = stations[k]
    grown = values[k] > w.lower * (1 + THICKENING_REPORTED)
    return WallSolution(wall, point, "thickened" if grown else w.lower_by, len(thickened))
