"""Stave cross-sections as real polygons (shapely), placed by rotation, and checked.

Frame of stave 0: the spar's axis at the origin, x across the stave's width,
y outward, outer face at y = a_o, inner face at y = a_i. The notch is cut in
the edge at smaller x; the neighbour that nests in it is stave 1, stave 0
turned by +φ about the axis. All lengths mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from shapely.affinity import rotate
from shapely.geometry import Polygon, box
from shapely.geometry.polygon import orient

from ..errors import DesignError
from .notch import Notch

INTERFERENCE_TOLERANCE = 1e-9  # of one stave's area


@dataclass(frozen=True)
class StaveFrame:
    """Where stave 0's rectangle lies (mm) and where its V's apex is."""

    x_notch_edge: float
    x_square_edge: float
    inner: float
    outer: float
    apex: tuple[float, float] | None

    @property
    def width(self) -> float:
        return self.x_square_edge - self.x_notch_edge


def stave_frame(staves: int, outer_apothem: float, thickness: float, width: float, notch: Notch | None) -> StaveFrame:
    """Rectangle and apex of stave 0 from the closure geometry (mm)."""
    a_i = outer_apothem - thickness
    if notch is None:
        half = outer_apothem * math.tan(math.pi / staves)
        return StaveFrame(-half, half, a_i, outer_apothem, None)
    phi = 2 * math.pi / staves
    # The neighbour's inner square corner, turned by φ, lands on this stave's apex.
    x_square = a_i * math.tan(math.pi / staves) + notch.apex_height / math.sin(phi)
    x_notch = x_square - width
    apex = (x_notch + notch.depth, a_i + notch.apex_height)
    return StaveFrame(x_notch, x_square, a_i, outer_apothem, apex)


def _v_wedge(staves: int, frame: StaveFrame) -> Polygon:
    """The 90° region the neighbour occupies around the apex, large enough to cover the rectangle."""
    phi = 2 * math.pi / staves
    px, py = frame.apex
    reach = 4 * (frame.width + (frame.outer - frame.inner))
    d1 = (-math.cos(phi), -math.sin(phi))  # along the neighbour's inner face
    d2 = (-math.sin(phi), math.cos(phi))  # along the neighbour's end face
    return Polygon([
        (px, py),
        (px + reach * d1[0], py + reach * d1[1]),
        (px + reach * (d1[0] + d2[0]), py + reach * (d1[1] + d2[1])),
        (px + reach * d2[0], py + reach * d2[1]),
    ])


def stave_polygon(staves: int, frame: StaveFrame, notch: Notch | None, key: str = "hollow.joint") -> Polygon:
    """Stave 0 as a shapely polygon, counter-clockwise: rectangle minus the V, or the bevelled trapezoid."""
    if notch is None:
        t_in = frame.inner * math.tan(math.pi / staves)
        t_out = frame.outer * math.tan(math.pi / staves)
        return orient(Polygon([(-t_in, frame.inner), (t_in, frame.inner), (t_out, frame.outer),
                               (-t_out, frame.outer)]), 1.0)
    rect = box(frame.x_notch_edge, frame.inner, frame.x_square_edge, frame.outer)
    cut = rect.difference(_v_wedge(staves, frame))
    if cut.geom_type != "Polygon" or cut.is_empty:
        pieces = len(getattr(cut, "geoms", [])) or 0
        raise DesignError(
            f"the notch (depth {_mm(frame.apex[0] - frame.x_notch_edge)}, apex {_mm(frame.apex[1] - frame.inner)}"
            f" up) cuts the stave into {pieces} pieces", key)
    return orient(cut, 1.0)


def _mm(v: float) -> str:
    return f"{v:.2f} mm"


def placed(polygon: Polygon, staves: int, index: int) -> Polygon:
    """Stave ``index`` of the assembled section: stave 0 turned by index·φ about the axis."""
    return rotate(polygon, index * 360.0 / staves, origin=(0.0, 0.0))


def placed_ring(polygon: Polygon, staves: int, indices) -> np.ndarray:
    """Staves ``indices`` of the assembled section at once (an array of polygons), turned with one matrix each."""
    ring = np.asarray(polygon.exterior.coords)
    angles = np.asarray(list(indices), dtype=float) * 2 * np.pi / staves
    c, s = np.cos(angles)[:, None], np.sin(angles)[:, None]
    x, y = ring[:, 0][None, :], ring[:, 1][None, :]
    turned = np.stack([c * x - s * y, s * x + c * y], axis=-1)
    return shapely.polygons(turned)


def interference(polygon: Polygon, staves: int) -> float:
    """Largest overlap area (mm²) of stave 0 with any other stave; by symmetry half the ring suffices."""
    others = placed_ring(polygon, staves, range(1, staves // 2 + 1))
    areas = shapely.area(shapely.intersection(polygon, others))
    return float(max(areas)) if len(areas) else 0.0


def check_interference(polygon: Polygon, staves: int, where: str, key: str = "hollow.joint") -> float:
    """Raise when staves overlap by more than 1e-9 of a stave's area; return the overlap (mm²)."""
    overlap = interference(polygon, staves)
    if overlap > INTERFERENCE_TOLERANCE * polygon.area:
        raise DesignError(f"staves overlap by {overlap:.3g} mm² {where}: the notch does not fit its neighbour",
                          key)
    return overlap


def enclosed_gap_reach(polygon: Polygon, staves: int) -> float | None:
    """How far from the axis (mm) the hollow the staves enclose reaches, bore and voids together.

    None when the ring of staves does not close round the axis. Touching faces
    are merged on a 1e-6 mm grid.
    """
    ring = shapely.union_all(placed_ring(polygon, staves, range(staves)), grid_size=1e-6)
    if ring.geom_type != "Polygon":
        return None
    axis = shapely.Point(0.0, 0.0)
    for hole in ring.interiors:
        if Polygon(hole).contains(axis):
            return max(math.hypot(x, y) for x, y in hole.coords)
    return None


def outside_reach(polygon: Polygon, staves: int) -> float:
    """The least distance (mm) from the axis to the outside of the glued-up staves, before rounding.

    Touching faces are merged on a 1e-6 mm grid; a groove left open at a seam
    brings the outside in toward the axis.
    """
    ring = shapely.union_all(placed_ring(polygon, staves, range(staves)), grid_size=1e-6)
    shell = ring if ring.geom_type == "Polygon" else max(ring.geoms, key=lambda g: g.area)
    return float(shell.exterior.distance(shapely.Point(0.0, 0.0)))
