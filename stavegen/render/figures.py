"""Every printed length, rounded the safe way for what it is: one place for every output.

A builder reads 1/32 in (or 0.1 mm) off a tape, so every length is printed on
that grid, and which way it is rounded depends on what the builder does with
it (docs/conventions.md, "Rounding the safe way"):

- ``dress``: a thickness or width to dress or rip to, a finished diameter to
  round to, a plug to fit: up, so there is wood left to take off (a thicker
  wall and a larger round only add stiffness and strength).
- ``cut_length``: a length to cut (segments, staves, scarfs): up.
- ``at_least``: a least size of a tool ("bit at least"): up.
- ``least``: a least wall, a clearance, a wall after rounding: down, never
  more than there is.
- ``mark_width``: a finished stave width at a station, marked for the taper:
  down. A narrower stave shrinks the glued-up polygon and its bore together
  (the bore shrinks, the wall after rounding grows) as long as the shrink stays
  within the planing allowance; the grid is made finer (1/64, 1/128 in) where
  1/32 in would move the polygon by more than that. The full-size templates are
  exact.
- ``fence``: a fence distance, moved so the blade stands in the waste (the cut
  leaves wood to take off with a second pass); ``blade``: a blade or bit
  height, down (a shallower cut leaves wood).
- ``notch_depth`` down and ``apex_height`` up: the V to check a cut against,
  both on the side that leaves wood.
- ``groove_depth``: a groove's depth below the stave's outer face for a strip let into it: up, so the
  strip lies a little deeper and rounding never cuts into it (the groove's width is ``at_least``: the
  strip must go in).
- ``position`` and ``describe``: nearest, for marks along the spar and for
  figures that only describe (the plan's diameters, deflections).
"""

from __future__ import annotations

import math

from ..model.spar import Spar
from ..units import UnitSystem, Way, system


class Figures:
    """Lengths (mm) of one spar worded for people, each kind rounded its safe way."""

    def __init__(self, spar: Spar) -> None:
        self.spar = spar
        self.units: UnitSystem = system(spar.units)
        n = spar.hollow.staves if isinstance(spar.hollow.staves, int) else 24
        # A width short by one grid step moves the polygon in by step / (2 tan(π/N)); keep that within the
        # planing allowance (or a quarter of a millimetre when there is none).
        room = max(spar.hollow.planing_allowance, 0.25)
        self.width_step = self.units.fine_step(room * 2 * math.tan(math.pi / n))

    # The kinds ------------------------------------------------------------------------------------------

    def dress(self, mm: float | None) -> str:
        return self.units.length(mm, Way.UP)

    def cut_length(self, mm: float | None) -> str:
        return self.units.length(mm, Way.UP, tape=True)

    def at_least(self, mm: float | None) -> str:
        return self.units.length(mm, Way.UP)

    def least(self, mm: float | None) -> str:
        return self.units.length(mm, Way.DOWN)

    def mark_width(self, mm: float | None) -> str:
        return self.units.length(mm, Way.DOWN, step=self.width_step)

    def notch_depth(self, mm: float | None) -> str:
        return self.units.length(mm, Way.DOWN)

    def apex_height(self, mm: float | None) -> str:
        return self.units.length(mm, Way.UP)

    def blade(self, mm: float | None) -> str:
        return self.units.length(mm, Way.DOWN)

    def groove_depth(self, mm: float | None) -> str:
        return self.units.length(mm, Way.UP)

    def fence(self, mm: float | None, nearer: bool) -> str:
        """A fence distance: ``nearer`` when moving the fence toward the blade leaves wood on the stave."""
        return self.units.length(mm, Way.DOWN if nearer else Way.UP)

    def position(self, mm: float | None) -> str:
        return self.units.length(mm, Way.NEAREST, tape=True)

    def describe(self, mm: float | None) -> str:
        return self.units.length(mm, Way.NEAREST)

    def exact(self, mm: float) -> str:
        return self.units.exact(mm)

    # Unit-free cells for tables and spreadsheets ----------------------------------------------------------

    def cell(self, kind: str, mm: float | None) -> str:
        """A table cell without the unit mark, rounded as ``kind`` is."""
        if mm is None:
            return "—"
        way, step = self._way(kind)
        if kind in ("position", "cut-length") and self.units.imperial:
            return self.units.length(mm, way, tape=True, step=step)
        return self.units.plain(mm, way, step)

    def decimal(self, kind: str, mm: float | None) -> str:
        """The same grid value as a plain decimal (inches or mm), for spreadsheets."""
        way, step = self._way(kind)
        return self.units.decimal(mm, way, step)

    def _way(self, kind: str) -> tuple[Way, float | None]:
        return {
            "dress": (Way.UP, None), "cut-length": (Way.UP, None), "at-least": (Way.UP, None),
            "least": (Way.DOWN, None), "mark-width": (Way.DOWN, self.width_step),
            "notch-depth": (Way.DOWN, None), "apex-height": (Way.UP, None), "blade": (Way.DOWN, None),
            "groove-depth": (Way.UP, None),
            "fence-nearer": (Way.DOWN, None), "fence-farther": (Way.UP, None),
            "position": (Way.NEAREST, None), "describe": (Way.NEAREST, None),
        }[kind]

    def by_kind(self, kind: str, value: float) -> str:
        """A figure of a shop step, by its kind: lengths on the grid, angles to 0.01°, plain numbers."""
        if kind == "angle":
            return f"{value:.2f}°"
        if kind == "number":
            return f"{value:g}"
        way, step = self._way(kind)
        return self.units.length(value, way, tape=kind in ("position", "cut-length"), step=step)
