"""The integer solves of the layout (the lumber order's cutting plan, the scarfs' placement), through
``scipy.optimize.milp`` (HiGHS), with the options they share.

HiGHS's feasibility-jump heuristic looks for a first feasible point; a heuristic only, it changes no proof
(a plan proven least is least either way), only the time and, among equal optima, which one is returned. The
lumber model always has a first plan (the one-type rips): on 231 cutting problems gathered from the samples,
generated spars and `size` runs the heuristic took 41 % of the integer solves' CPU and left out it changed no
status, optimum or node count (5 of the 231 returned another plan of the same board feet); the scarf placements
of five samples came out the same. scipy lists a few options and hands the rest to HiGHS as they are (its
documented behaviour, with a warning, silenced here); an older HiGHS that lacks the option ignores it with a
warning (silenced too) or refuses it, and then the solve runs without it.
"""

from __future__ import annotations

import warnings

from scipy.optimize import milp

EXTRA = {"mip_heuristic_run_feasibility_jump": False}


def solve(c, *, constraints, integrality, options: dict, bounds=None):
    """``scipy.optimize.milp(c, ...)`` with :data:`EXTRA` added to ``options``."""
    def run(extra: dict):
        with warnings.catch_warnings():
            warnings.filterwarnings("ignore", "Unrecognized options detected")  # scipy's, HiGHS's wrapper's
            return milp(c, constraints=constraints, integrality=integrality, bounds=bounds,
                        options={**options, **extra})
    try:
        return run(EXTRA)
    except (AttributeError, KeyError, ValueError):  # this HiGHS has no such option
        return run({})
