"""The pipeline a command runs: spar file → model → sections → checks → layout → outputs."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, Callable

from .checks.advice import warnings_for
from .checks.assess import Assessment, assess
from .errors import InputError
from .model.loader import load_spar
from .model.spar import Spar
from .stations.evaluate import SectionCache

if TYPE_CHECKING:
    from .sizing.solve import Solved


@dataclass(frozen=True)
class Design:
    """What stavegen worked out for one spar; renderers draw from this and compute nothing."""

    spar: Spar
    assessment: Assessment
    warnings: tuple[str, ...] = ()
    layout: Any = None
    solved: tuple[str, ...] = field(default=())

    @property
    def passed(self) -> bool:
        return self.assessment.passed


def resolve(spar: Spar) -> tuple[Spar, tuple[str, ...]]:
    """Solve what the file leaves ``"auto"`` (staves, wall or diameters); return the spar and one line per
    solved value."""
    if spar.resolved:
        return spar, ()
    from .sizing import size_spar

    try:
        return size_spar(spar)
    except InputError as exc:
        raise exc.located(spar.source, spar.units)


def design(spar: Spar, layout: bool = False, step: Callable[[str], None] | None = None) -> Design:
    """Check the spar (solving what is ``auto``); with ``layout``, also make the shop plan.

    ``step``, if given, is told what is being worked out as each step starts (for a progress display).
    Sections are worked out once for the sizing, the check and the layout; when the stave count was
    chosen, the chosen count's check and layout (made to choose it) are the design's.
    """
    tell = step or (lambda words: None)
    try:
        shop = result = None
        lines: tuple[str, ...] = ()
        cache = None
        if not spar.resolved:
            tell("solving what the spar file leaves to stavegen")
            solved = _solve(spar)
            spar, lines, cache = solved.spar, solved.lines, solved.sections
            if solved.comparison is not None:
                result = solved.comparison.chosen.assessment
                shop = solved.comparison.chosen.layout if layout else None
        cache = cache or SectionCache(spar)
        if result is None:
            tell("checking the sections against the plan")
            result = assess(spar, cache=cache)
        if layout and shop is None:
            from .layout.plan import lay_out

            tell("laying out the staves, scarfs and plugs")
            shop = lay_out(spar, cache, step=tell)
    except InputError as exc:
        raise exc.located(spar.source, spar.units)
    warnings = tuple(spar.notices) + tuple(warnings_for(result))  # the loader's first: they concern the figures
    return Design(spar=spar, assessment=result, warnings=warnings, layout=shop, solved=lines)


def _solve(spar: Spar) -> "Solved":
    from .sizing.solve import solve

    try:
        return solve(spar)
    except InputError as exc:
        raise exc.located(spar.source)


def design_file(path: str | Path) -> Design:
    return design(load_spar(path))
