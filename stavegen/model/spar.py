"""The validated spar: frozen dataclasses in millimetres, newtons and kg/m³.

Everything downstream of the loader reads these and nothing else; units
appear only in :attr:`Spar.units`, which says how to print.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Literal, Union

import numpy as np

from .materials import Laminate
from .tubes import TubeMaterial
from .woods import Wood

AUTO = "auto"
AUTO_TAPERED = "auto-tapered"
WALL_SOLVES = (AUTO, AUTO_TAPERED)  # hollow.wall strings the sizing step solves for
JOINTS = ("birdsmouth-flush", "birdsmouth-centered", "birdsmouth-custom", "bevel", "box")
# How a box spar's four pieces meet at the corners (hollow.corner): the sides (port and starboard) glued between
# the faces (fore and aft), set into a rebate along each edge of the faces, or each piece rebated along one edge
# with the next piece's square edge in it, round the section (the square birdsmouth: a 4-stave V is a rebate).
CORNERS = ("sides-between-faces", "rebated", "pinwheel")
REBATED_CORNERS = ("rebated", "pinwheel")  # the corners whose pieces carry rebates (hollow.rebate_depth)
BOX_PIECES = 4  # a box spar: two faces and two sides
TAPERS = ("square-edge", "symmetric")
# How the notch is cut when the wall tapers: once, on staves of the thickest wall ("thickest-wall"), or
# following the wall station by station ("follow-wall": thickness tapered first, a CNC router's job).
NOTCH_CUTS = ("thickest-wall", "follow-wall")
DEFAULT_STRENGTH_TARGET = 1.0  # the hollow spar at least as strong as the plan unless the file accepts less
STRIP_PLACES = ("inner-face", "groove")  # where reinforcing tape lies in each stave
PAPERS = ("letter", "a4")
SHAPES = ("round", "oval", "rectangle")  # plan.shape: a round, an ellipse, a rectangle
HOLLOW_SHAPES = ("round", "oval", "rectangle")  # hollow.shape
SEPARATIONS = ("saw", "router")  # how neighbouring pieces are parted on a board (stock.separate_with)
MIN_STAVES, MAX_STAVES = 4, 24
# How a two-piece spar's parts join ([parting] kind): a wooden spigot shaped to the bore, a bought tube spigot
# in plugs bored for it, or an outside sleeve over the butt.
PARTINGS = ("wood-spigot", "tube-spigot", "sleeve")
# The overlap a builder leaves to stavegen: common practice (no source) brackets 2 to 4 local diameters.
OVERLAP_DIAMETERS = (2.0, 4.0)
SLUG_LONGEST = 60  # characters of the file-name stem made from the spar's name


@dataclass(frozen=True)
class Profile:
    """A length (mm) given at positions along the spar (mm from the heel), linear between."""

    z: tuple[float, ...]
    value: tuple[float, ...]

    @classmethod
    def constant(cls, value: float, length: float) -> "Profile":
        return cls((0.0, float(length)), (float(value), float(value)))

    def at(self, z: float | np.ndarray) -> float | np.ndarray:
        """Value at ``z`` (mm), interpolated linearly between the given positions."""
        return np.interp(z, *self._arrays)

    @cached_property
    def _arrays(self) -> tuple[np.ndarray, np.ndarray]:
        """The positions and values as arrays, made once: converting the tuples on every lookup made a
        lookup cost as much as the profile is long (quadratic work for a wall solved station by station)."""
        return np.asarray(self.z, dtype=float), np.asarray(self.value, dtype=float)

    @property
    def is_constant(self) -> bool:
        return max(self.value) - min(self.value) <= 1e-9 * max(1.0, max(self.value))

    @property
    def largest(self) -> float:
        return max(self.value)

    @property
    def smallest(self) -> float:
        return min(self.value)


@dataclass(frozen=True)
class Joint:
    """How neighbouring staves meet.

    ``kind`` is one of :data:`JOINTS`. For ``birdsmouth-custom`` the builder's
    cutter fixes the notch depth (mm, along the width) and the apex height
    above the inner face, as a length (mm) or as a fraction of the thickness.
    """

    kind: str = "birdsmouth-flush"
    depth: float | None = None
    apex_height: float | None = None
    apex_fraction: float | None = None

    @property
    def is_birdsmouth(self) -> bool:
        return self.kind.startswith("birdsmouth")

    @property
    def is_box(self) -> bool:
        """Four flat pieces of the wall's thickness, square-edged, glued at the corners (a rectangular spar)."""
        return self.kind == "box"


@dataclass(frozen=True)
class Plug:
    """Solid blocking filling the bore from ``start`` to ``end`` (mm from the heel)."""

    start: float
    end: float
    wood: Wood

    def covers(self, z: float) -> bool:
        return self.start <= z <= self.end


def _covers(start: float | None, end: float | None, z: float, length: float, tol: float) -> bool:
    """Whether a stretch from ``start`` to ``end`` (None: the heel, the head) covers ``z``: strictly inside,
    or at a spar end it reaches; at an inner end the other side counts (as at a plug's)."""
    lo = 0.0 if start is None else start
    hi = length if end is None else end
    return (lo + tol < z < hi - tol) or (z <= tol and lo <= tol) or (z >= length - tol and hi >= length - tol)


@dataclass(frozen=True)
class Layer:
    """Sheathing over the rounded wood: a laminate ``thickness`` mm thick (``plies`` of it, when counted so),
    from ``start`` to ``end`` mm from the heel (None: the heel, the head)."""

    material: Laminate
    thickness: float
    plies: int | None = None
    start: float | None = None
    end: float | None = None

    def covers(self, z: float, length: float, tol: float = 0.05) -> bool:
        return _covers(self.start, self.end, z, length, tol)


@dataclass(frozen=True)
class Strip:
    """Reinforcing tape ``width`` × ``thickness`` mm along every stave (``place``: "inner-face" or "groove")."""

    material: Laminate
    width: float
    thickness: float
    plies: int | None = None
    place: str = "inner-face"
    start: float | None = None
    end: float | None = None

    def covers(self, z: float, length: float, tol: float = 0.05) -> bool:
        return _covers(self.start, self.end, z, length, tol)


@dataclass(frozen=True)
class Parting:
    """Where a two-piece spar comes apart and how its parts join (mm).

    The heel part ("lower") carries the spigot glued into its bore from ``at - overlap`` to ``at``; the head
    part ("upper") slides over it from ``at`` to ``at + overlap``. A sleeve instead reaches ``overlap`` along the
    outside of each part. ``overlap`` None: chosen by :mod:`stavegen.checks.parting` (2 to 4 diameters).
    ``clearance`` is all round (radial). ``wood`` makes a wooden spigot; ``material``, ``outside_diameter``
    and ``wall`` a tube spigot or a sleeve (a sleeve's bore is the spar's diameter plus the clearance).
    """

    at: float
    kind: str = "wood-spigot"
    overlap: float | None = None
    clearance: float = 0.4
    wood: Wood | None = None
    material: TubeMaterial | None = None
    outside_diameter: float | None = None
    wall: float | None = None

    @property
    def is_spigot(self) -> bool:
        return self.kind != "sleeve"


@dataclass(frozen=True)
class Plan:
    """The solid spar drawn in the plans: the stiffness and strength target.

    ``diameter`` is the round's diameter, or for an oval or a rectangle (``shape``) the fore-and-aft
    dimension; ``athwartships`` then gives the other (None for a round). ``corner_radius`` rounds a
    rectangle's corners (mm).
    """

    wood: Wood
    diameter: Profile
    shape: str = "round"
    athwartships: Profile | None = None
    corner_radius: float = 0.0

    @property
    def fore_aft(self) -> Profile:
        return self.diameter

    @property
    def athwart(self) -> Profile:
        """The athwartships dimension along the spar (the diameter for a round)."""
        return self.athwartships if self.athwartships is not None else self.diameter


@dataclass(frozen=True)
class Hollow:
    """The stave-built spar to be made.

    ``staves`` may be :data:`AUTO`, ``wall`` one of :data:`WALL_SOLVES` and
    ``diameter`` :data:`AUTO` until the sizing step (:mod:`stavegen.sizing`)
    fills them. ``wall`` is the stave thickness (mm) along the spar;
    ``diameter`` the finished outside diameter (mm). Allowances are in mm.
    """

    wood: Wood
    staves: Union[int, Literal["auto"]]
    joint: Joint
    wall: Union[Profile, Literal["auto", "auto-tapered"]]
    diameter: Union[Profile, Literal["auto"]]
    lamination_factor: float = 1.0
    margin: float = 0.0
    min_strength_ratio: float = DEFAULT_STRENGTH_TARGET
    strength_target_given: bool = False
    min_corner_wall: float | None = None
    planing_allowance: float = 1.5875
    end_allowance: float = 76.2
    taper: str = "square-edge"
    notch_cut: str = "thickest-wall"
    plugs: tuple[Plug, ...] = ()
    diameter_given: bool = False
    layers: tuple[Layer, ...] = ()
    strips: tuple[Strip, ...] = ()
    shape: str = "round"
    athwartships: Union[Profile, Literal["auto"], None] = None
    """For an oval hollow spar, its athwartships dimension along the spar (``diameter`` is then fore-and-aft)."""
    corner: str = "sides-between-faces"
    """A box spar's corner joint (:data:`CORNERS`)."""
    corner_radius: float = 0.0
    """A box spar's finished outside corners rounded to this radius (mm); 0: sharp."""
    rebate_depth: float | None = None
    """A rebated (or pinwheel) box's rebate depth into the piece's thickness (mm); None: half the wall."""

    @property
    def is_box(self) -> bool:
        return self.joint.is_box

    @property
    def two_axis(self) -> bool:
        """True for a hollow spar that is not round (its section differs fore-and-aft and athwartships)."""
        return self.shape != "round"

    @property
    def athwart(self):
        return self.athwartships if self.athwartships is not None else self.diameter

    def plug_at(self, z: float) -> Plug | None:
        for plug in self.plugs:
            if plug.covers(z):
                return plug
        return None

    def layers_at(self, z: float, length: float) -> tuple[Layer, ...]:
        """The sheathing layers over the wood at ``z`` (mm from the heel), innermost first."""
        return tuple(layer for layer in self.layers if layer.covers(z, length))

    def strips_at(self, z: float, length: float) -> tuple[Strip, ...]:
        return tuple(strip for strip in self.strips if strip.covers(z, length))

    def sheath(self, z: float, length: float) -> float:
        """How much the layers at ``z`` add to the radius (mm): the wood is rounded to the finished radius less this."""
        return sum(layer.thickness for layer in self.layers_at(z, length))


@dataclass(frozen=True)
class Stock:
    """The boards staves are ripped from (mm); nominal sizes are for the board-foot tally."""

    thickness: float
    nominal_thickness: float
    widths: tuple[float, ...]
    nominal_widths: tuple[float, ...]
    lengths: tuple[float, ...]
    kerf: float = 3.175
    scarf_ratio: float = 8.0
    scarf_stagger: float = 304.8
    no_scarf: tuple[tuple[float, float], ...] = ()
    waste: float = 0.10
    edge_allowance: float = 1.5875
    separate_with: str = "saw"
    router_bit: float | None = None

    @property
    def gap(self) -> float:
        """Clearance between neighbouring pieces on a board (mm): the saw's kerf, or the diameter of the
        router bit that cuts the pieces out (``separate_with = "router"``)."""
        if self.separate_with == "router" and self.router_bit is not None:
            return self.router_bit
        return self.kerf


@dataclass(frozen=True)
class OutputOptions:
    """Drawing and printing choices: paper for full-size templates, station mark spacing (mm)."""

    paper: str = "letter"
    mark_spacing: float = 304.8
    templates_on_boards: bool = False


@dataclass(frozen=True)
class Spar:
    """One spar file, validated: everything in SI millimetres."""

    name: str
    units: str
    length: float
    plan: Plan
    hollow: Hollow
    stock: Stock | None
    output: OutputOptions = field(default_factory=OutputOptions)
    source: str = ""
    head_load: float | None = None
    """The file's sideways head load (N) for the deflection figures; None: the check's reference load."""
    head_load_given: bool = False
    parting: Parting | None = None
    """Where the spar comes apart, for a two-piece spar ([parting]); None for one piece."""
    notices: tuple[str, ...] = ()
    """Warnings the loader found (unlikely figures), one line each; the pipeline passes them on."""

    @property
    def slug(self) -> str:
        """File-name stem for outputs: lowercase words joined by hyphens, cut at a word to 60 characters."""
        import re

        slug = ""
        for word in re.findall(r"[a-z0-9]+", self.name.lower()):
            joined = f"{slug}-{word}" if slug else word
            if len(joined) > SLUG_LONGEST:
                slug = slug or word[:SLUG_LONGEST]
                break
            slug = joined
        return slug or "spar"

    @property
    def resolved(self) -> bool:
        """True once staves, wall and diameters are numbers, nothing left to solve."""
        h = self.hollow
        return h.staves != AUTO and isinstance(h.wall, Profile) and isinstance(h.diameter, Profile)
