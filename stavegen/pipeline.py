"""The pipeline a command runs: spar file → model → sections → checks → layout → outputs."""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .checks.advice import warnings_for
from .checks.assess import Assessment, assess
from .errors import InputError
from .model.loader import load_spar
from .model.spar import Spar


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


def design(spar: Spar, layout: bool = False) -> Design:
    """Check the spar (solving what is ``auto``); with ``layout``, also make the shop plan."""
    try:
        spar, solved = resolve(spar)
        result = assess(spar)
        shop = None
        if layout:
            from .layout.plan import lay_out

            shop = lay_out(spar)
    except InputError as exc:
        raise exc.located(spar.source)
    return Design(spar=spar, assessment=result, warnings=tuple(warnings_for(result)), layout=shop, solved=solved)


def design_file(path: str | Path) -> Design:
    return design(load_spar(path))
