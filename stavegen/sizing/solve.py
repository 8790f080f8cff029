"""Fill what the spar file leaves to stavegen: ``hollow.wall`` or ``hollow.stations`` set to ``"auto"``.

(``hollow.wall`` may also be ``"auto-tapered"``.)

:func:`size_spar` returns the resolved spar (the frozen model, replaced)
and one line per solved value for people; every point is checked again at
the solved sizes, and a shortfall there is a bug, not an input problem.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from ..checks.ratios import StationCheck, check_station, meets
from ..errors import DesignError, InputError
from ..model.spar import AUTO, AUTO_TAPERED, Profile, Spar
from ..stations.evaluate import SectionCache, Station
from ..units import format_exact, format_length_up
from .diameter import BORE_CLOSES, PLAN, describe_scale, solve_diameter_scale
from .roots import NOTCH
from .targets import (EI_RATIO, STRENGTH_RATIO, Point, check_at, closed_form_applies, criteria_of, place, points_of,
                      station_at)
from .wall import BORE_CORNERS, CORNER_MINIMUM, WallSolution, solve_constant_wall, solve_tapered_wall

if TYPE_CHECKING:
    from .count import Comparison

class Shortfall(RuntimeError):
    """A solved size falls short at a point when checked again on the exact section (a bug, not bad input)."""


@dataclass(frozen=True)
class Solved:
    """The spar with what was ``auto`` filled in, one line per solved value, and what the solving worked out
    on the way: the exact sections of the solved spar (a SectionCache) and, when the stave count was
    chosen, the comparison (its chosen candidate is checked and laid out)."""

    spar: Spar
    lines: tuple[str, ...]
    sections: SectionCache | None = None
    comparison: "Comparison | None" = None


def _exact_check(spar: Spar, point: Point, sections: SectionCache | None) -> StationCheck:
    """The point checked on the exact section of the solved spar (from ``sections`` when given)."""
    radius, wall = float(spar.hollow.diameter.at(point.z)) / 2, float(spar.hollow.wall.at(point.z))
    if sections is None:
        return check_at(spar, point, radius, wall)
    return check_station(spar, station_at(spar, point, radius, wall, sections.at(point.z)))


def _least(spar: Spar, sections: SectionCache | None = None) -> str:
    """``least EI ratio 1.000 at 7' 0" from the heel`` over the stations, after checking every point again."""
    criteria = criteria_of(spar)
    least: dict[str, tuple[float, str]] = {}
    for point in points_of(spar):
        check = _exact_check(spar, point, sections)
        for c in criteria:
            ratio = c.ratio(check)
            if not meets(ratio, c.target):  # the checks' own rule, roundoff forgiven
                raise Shortfall(f"sizing left {c.name} {ratio!r} below {c.target!r} at {place(spar, point)}")
        if point.at_station:
            for name, ratio in ((EI_RATIO, check.ei_ratio), (STRENGTH_RATIO, check.strength_ratio)):
                if name not in least or ratio < least[name][0]:
                    least[name] = (ratio, place(spar, point))
    parts = [f"least {EI_RATIO} {least[EI_RATIO][0]:.3f} at {least[EI_RATIO][1]}"]
    parts.append(f"least {STRENGTH_RATIO} {least[STRENGTH_RATIO][0]:.3f} at {least[STRENGTH_RATIO][1]}")
    return ", ".join(parts)


def _set_by(spar: Spar, solution: WallSolution) -> str:
    """Why the wall is what it is where it is thickest, when that is not a ratio."""
    at = place(spar, solution.binding)
    return {
        BORE_CORNERS: f", set by keeping the round out of the bore's corners at {at}",
        CORNER_MINIMUM: f", set by hollow.min_corner_wall at {at}",
        NOTCH: f", set by the notch geometry at {at}",
        "thickened": f", set between stations near {at}",
    }.get(solution.binding_by, "")


def _wall_line(spar: Spar, solution: WallSolution, resolved: Spar, least: str) -> str:
    wall = solution.wall
    units = spar.units
    if wall.is_constant:
        t = wall.largest
        text = f"wall solved: {format_exact(t, units)} constant ({format_length_up(t, units)} rounded up)"
    else:
        step = "1/32 in" if units == "in" else "0.1 mm"
        text = (f"wall solved: tapered by station, {format_exact(wall.smallest, units)} to "
                f"{format_exact(wall.largest, units)} (round each station's wall up to the {step} when dressing)")
        if spar.hollow.plugs:
            text += ", sized as if the bore were open where it is plugged"
        if solution.thickened:
            text += (f", {solution.thickened} stretch{'es' if solution.thickened > 1 else ''} thickened to meet "
                     "the target between stations")
    return text + _set_by(spar, solution) + "; " + least


def _diameter_line(spar: Spar, solution, least: str) -> str:
    if solution.binding_by == PLAN:
        head = ("diameters solved: the plan's as drawn (× 1), which this wall already makes stiff enough; "
                "no enlargement needed")
    else:
        head = f"diameters solved: {describe_scale(spar, solution)}"
        if solution.binding_by == BORE_CLOSES:
            head += f", set by leaving a bore at {place(spar, solution.binding)}"
        elif solution.binding_by in (BORE_CORNERS, CORNER_MINIMUM, NOTCH):
            head += f", set by the {solution.binding_by} at {place(spar, solution.binding)}"
    return f"{head}; {least}"


def _solve_size(spar: Spar, skip: bool, trust: bool) -> tuple[Spar, object]:
    """The spar with its auto wall or diameters solved, and the solution (``skip``, ``trust``: see
    :func:`~.wall.solve_constant_wall`)."""
    h = spar.hollow
    if h.diameter == AUTO:
        solution = solve_diameter_scale(spar, skip=skip, trust=trust)
        athwartships = h.athwartships
        if h.two_axis:  # the scale applies to both dimensions
            plan = spar.plan.athwart
            athwartships = Profile(plan.z, tuple(solution.scale * d for d in plan.value))
        return replace(spar, hollow=replace(h, diameter=solution.diameter, diameter_given=True,
                                            athwartships=athwartships)), solution
    solver = solve_constant_wall if h.wall == AUTO else solve_tapered_wall
    solution = solver(spar, skip=skip, trust=trust)
    return replace(spar, hollow=replace(h, wall=solution.wall)), solution


# How sizes are searched, quickest first: (skip points the size found so far meets, trust the closed form).
SEARCHES = ((True, True), (True, False), (False, False))


def solve(spar: Spar) -> Solved:
    """Fill what the spar leaves ``auto``; see :class:`Solved`.

    The first search skips points the size found so far already meets and,
    for flush and bevel joints, runs on the closed-form section once it
    agrees with the exact one on this spar; the solved spar is then checked
    at every point on the exact section (the sections kept for the check
    and the layout). Should the joint prove unbuildable at a size the closed
    form chose, or that check find a shortfall (roundoff at the edge of a
    range), the search is made again on the exact section's terms
    (:data:`SEARCHES`), the last as every point's own full search. For
    flush and bevel joints the answer is the full search's (to roundoff,
    which can move the place named as least where a tapered wall makes a
    ratio equal everywhere). For joints whose sections can be unbuildable
    inside the range searched (a centred notch's grooves and voids), the
    full search can give up at a point whose probes found no buildable wall
    even where the size that binds elsewhere builds and holds there; the
    quick one answers there, or refuses for what binds, checked on the exact
    section at every point.
    """
    h = spar.hollow
    if h.staves == AUTO:
        from .count import compare_stave_counts

        comparison = compare_stave_counts(spar)
        chosen = comparison.chosen
        return Solved(chosen.spar, chosen.solved + (f"staves chosen: {comparison.reason}",), None, comparison)
    if not isinstance(h.wall, Profile) and not isinstance(h.diameter, Profile):
        raise InputError(f'wall = "{h.wall}" and stations = "auto" leave two unknowns; give the wall to solve '
                         "the diameters, or the diameters (or none: the plan's) to solve the wall",
                         "hollow.stations")
    if h.diameter != AUTO and h.wall not in (AUTO, AUTO_TAPERED):
        return Solved(spar, ())
    for i, (skip, trust) in enumerate(SEARCHES):
        last = i == len(SEARCHES) - 1
        try:
            resolved, solution = _solve_size(spar, skip, trust)
        except DesignError:
            if trust and not last:  # the closed form may have searched where the joint cannot be built
                continue
            raise
        # The check's own sections verify the solution, to be kept for the check and the layout, where they
        # have the figures of the sizing's (flush and bevel: the wall's exact section, whatever the staves'
        # dressed thickness); other joints are verified as they were sized.
        sections = SectionCache(resolved) if not last and closed_form_applies(resolved) else None
        try:
            least = _least(resolved, sections)
        except (DesignError, Shortfall):
            if last:
                raise
            continue
        break
    if h.diameter == AUTO:
        line = _diameter_line(resolved, solution, least)
    else:
        line = _wall_line(spar, solution, resolved, least)
    return Solved(resolved, (line,), sections)


def size_spar(spar: Spar) -> tuple[Spar, tuple[str, ...]]:
    """The spar with its ``auto`` wall or diameters solved, and one line per solved value."""
    solved = solve(spar)
    return solved.spar, solved.lines
