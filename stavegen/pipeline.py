"""The pipeline a command runs: spar file → model → sections → checks → layout → outputs."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Callable

from .checks.advice import warnings_for
from .checks.assess import Assessment, assess
from .errors import InputError
from .model.loader import load_spar
from .model.spar import Spar
from .stations.evaluate import SectionCache


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
        raise exc.located(spar.source)


def design(spar: Spar, layout: bool = False, step: Callable[[str], None] | None = None) -> Design:
    """Check the spar (solving what is ``auto``); with ``layout``, also make the shop plan.

    ``step``, if given, is told what is being worked out as each step starts (for a progress display).
    """
    tell = step or (lambda words: None)
    try:
        if not spar.resolved:
            tell("solving what the spar file leaves to stavegen")
        spar, solved = resolve(spar)
        tell("checking the sections against the plan")
        cache = SectionCache(spar)  # one set of sections for the check and the layout
        result = assess(spar, cache=cache)
        shop = None
        if layout:
            from .layout.plan import lay_out

            tell("laying out the staves, scarfs and plugs")
            shop = lay_out(spar, cache, step=tell)
    except InputError as exc:
        raise exc.located(spar.source)
    return Design(spar=spar, assessment=result, warnings=tuple(warnings_for(result)), layout=shop, solved=solved)


def design_file(path: str | Path) -> Design:
    return design(load_spar(path))
