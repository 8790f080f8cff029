"""`stavegen size --sheathing`: the spar bare, with its layers, and with its layers and strips, side by side.

Each option is the file's spar with some of its sheathing taken away (nothing else changes), designed as
:func:`stavegen.pipeline.design` designs any spar: what the file leaves "auto" (staves, wall, diameters) is
solved for that option, then checked. The renderers read the options' designs; nothing is worked out here
but which spars to design.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Callable

from .errors import InputError
from .model.spar import AUTO, WALL_SOLVES, Spar
from .pipeline import Design, design

BARE, LAYERS, STRIPS, BOTH = "bare", "layers only", "strips only", "layers and strips"


@dataclass(frozen=True)
class SheathingOption:
    """One option: its name, and the design of the file's spar with only that sheathing."""

    name: str
    design: Design | None
    refused: str = ""
    """Why this option cannot be built (the one line its design raised), when ``design`` is None."""

    @property
    def spar(self) -> Spar | None:
        return self.design.spar if self.design is not None else None

    @property
    def mass(self) -> float | None:
        """kg, the hollow spar with this option's sheathing (None when it cannot be built)."""
        return self.design.assessment.hollow.mass.mass if self.design is not None else None


@dataclass(frozen=True)
class SheathingComparison:
    """The options, the bare spar first; ``solves``: whether the file leaves a size "auto" (else the
    figures are the spar as drawn, compared)."""

    options: tuple[SheathingOption, ...]
    solves: bool

    @property
    def bare(self) -> SheathingOption:
        return self.options[0]

    def saved(self, option: SheathingOption) -> float | None:
        """kg ``option`` weighs less than the bare spar (negative when heavier); None if either cannot be built."""
        if self.bare.mass is None or option.mass is None:
            return None
        return self.bare.mass - option.mass


def leaves_size_auto(spar: Spar) -> bool:
    """Whether the file leaves the wall, the diameters or the stave count to stavegen."""
    h = spar.hollow
    return h.staves == AUTO or (isinstance(h.wall, str) and h.wall in WALL_SOLVES) or h.diameter == AUTO


def variants(spar: Spar) -> tuple[tuple[str, Spar], ...]:
    """(name, spar) for each option the file's sheathing allows: bare; its layers (if any); its layers and
    strips (its strips alone when it has no layers), if it has strips."""
    h = spar.hollow
    out = [(BARE, replace(spar, hollow=replace(h, layers=(), strips=())))]
    if h.layers:
        out.append((LAYERS, replace(spar, hollow=replace(h, strips=()))))
    if h.strips:
        out.append((BOTH if h.layers else STRIPS, spar))
    return tuple(out)


def compare_sheathing(spar: Spar, tell: Callable[[str], None] | None = None) -> SheathingComparison:
    """Design the file's spar bare, with its layers, and with its layers and strips."""
    options = []
    for name, variant in variants(spar):
        if tell is not None:
            tell(f"sizing the spar {name}" if name != BARE else "sizing the spar bare")
        try:
            options.append(SheathingOption(name, design(variant)))
        except InputError as exc:  # this option cannot be sized or built: say why in its row
            exc.in_units(spar.units)
            options.append(SheathingOption(name, None, f"{exc.key}: {exc.problem}" if exc.key else exc.problem))
    if all(o.design is None for o in options):  # nothing can be built: the file's own option says why, as check would
        raise InputError(options[-1].refused).located(spar.source, spar.units)
    return SheathingComparison(tuple(options), leaves_size_auto(spar))
