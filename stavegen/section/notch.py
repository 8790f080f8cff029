"""The birdsmouth notch: presets, the builder's own cutter, and the closure relation.

Notation as in the section model: N staves, φ = 2π/N, thickness t, notch
depth h (along the width, from the notched edge to the V's apex), apex
height f·t above the stave's inner face, inner apothem a_i. All lengths mm.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import DesignError
from ..model.spar import Joint
from ..units import format_length


@dataclass(frozen=True)
class Notch:
    """A birdsmouth V for one stave thickness: depth h (mm) and apex fraction f (0 < f < 1)."""

    depth: float
    apex_fraction: float
    thickness: float

    @property
    def apex_height(self) -> float:
        """Height of the V's apex above the stave's inner face, mm."""
        return self.apex_fraction * self.thickness


def notch_for(joint: Joint, staves: int, thickness: float, units: str = "mm") -> Notch | None:
    """The notch the joint cuts in a stave of ``thickness`` (mm); None for plain bevel staves.

    ``units`` only says how to print lengths in an error.
    """
    def show(mm: float) -> str:
        return format_length(mm, units)

    phi = 2 * math.pi / staves
    t = thickness
    if joint.kind == "bevel":
        return None
    if staves <= 4:
        raise DesignError("a birdsmouth needs at least 5 staves: with 4 the V's second face lies flat along the "
                          "stave and the notch becomes a full-thickness step; build a four-stave box with "
                          "joint = \"bevel\" (mitred corners)", "hollow.joint")
    if joint.kind == "birdsmouth-flush":
        return Notch(depth=t * math.sin(phi), apex_fraction=1 - math.cos(phi), thickness=t)
    if joint.kind == "birdsmouth-centered":
        return Notch(depth=t / 2 * min(math.tan(phi), 1 / math.tan(phi)), apex_fraction=0.5, thickness=t)
    if joint.kind == "birdsmouth-custom":
        f = joint.apex_fraction if joint.apex_fraction is not None else joint.apex_height / t
        if not 0 < f < 1:
            raise DesignError(f"the apex ({show(joint.apex_height)} up) is not inside a stave {show(t)} thick",
                              "hollow.notch.apex_height")
        if joint.depth <= 0:
            raise DesignError("notch depth must be positive", "hollow.notch.depth")
        deepest = (1 - f) * t * math.tan(phi)
        if joint.depth > deepest * (1 + 1e-9):
            raise DesignError(
                f"notch depth {show(joint.depth)} runs the V out through the stave's outer face (apex "
                f"{show(f * t)} up in a {show(t)} stave allows at most {show(deepest)})", "hollow.notch.depth")
        return Notch(depth=joint.depth, apex_fraction=f, thickness=t)
    raise DesignError(f"unknown joint {joint.kind!r}", "hollow.joint")


def closure_width(staves: int, inner_apothem: float, notch: Notch | None, thickness: float) -> float:
    """Stave width w (mm) before the notch is cut, from the closure relation.

    Birdsmouth: w = h + 2·tan(π/N)·(a_i + f·t/2). Bevel: the outer face,
    2·a_o·tan(π/N) with a_o = a_i + t.
    """
    tan_half = math.tan(math.pi / staves)
    if notch is None:
        return 2 * (inner_apothem + thickness) * tan_half
    return notch.depth + 2 * tan_half * (inner_apothem + notch.apex_height / 2)


def v_face_angles(staves: int) -> tuple[float, float]:
    """Angles (degrees) of the V's two faces to the stave's broad face: φ and 90° − φ.

    The neighbour's inner face lies on the first, its end face on the second.
    """
    phi = 360.0 / staves
    return phi, 90.0 - phi


def bevel_angle(staves: int) -> float:
    """Edge bevel of plain coopered staves, degrees off square: 180°/N."""
    return 180.0 / staves
