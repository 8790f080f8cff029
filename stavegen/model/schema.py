"""Every key of the spar file, declared once.

The loader (:mod:`stavegen.model.loader`) reads tables through this schema:
a key that is not declared here is unknown, a declared key's default is
the one written here, and keys with a ``field`` are read and checked by
their ``kind`` with no code of their own. The key reference
(``docs/spar-file.md``, :mod:`stavegen.model.reference`) and the starter
file (:mod:`stavegen.model.starter`) are generated from the same
declarations, so the three cannot drift apart.

Adding a key is one line in its table below, plus the field it fills on
the model's dataclass (``field=``): see DEVELOPERS.md.
"""

from __future__ import annotations

from dataclasses import dataclass
from dataclasses import field as _field
from typing import Any

from .spar import (CORNERS, DEFAULT_STRENGTH_TARGET, HOLLOW_SHAPES, JOINTS, MAX_STAVES, MIN_STAVES, NOTCH_CUTS, PAPERS,
                   PARTINGS, SEPARATIONS, SHAPES, STRIP_PLACES, TAPERS)
from .tubes import tube_table


@dataclass(frozen=True)
class PerUnit:
    """A value as written in an inch file and in a millimetre file."""

    inch: Any
    mm: Any

    def get(self, units: str) -> Any:
        return self.inch if units == "in" else self.mm


@dataclass(frozen=True)
class Words:
    """A default that is not a fixed value, in words (``"the plan's diameters"``)."""

    text: str


def toml_text(value: Any) -> str:
    """A default's value as a TOML file writes it: ``"1/16"``, ``1.5``, ``false``."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        return f'"{value}"'
    return repr(value) if isinstance(value, float) else str(value)


REQUIRED = Words("required")
UNSET = Words("not set")

# What each kind of value accepts, for the reference. Kinds with a reader in the loader's _Table are read
# generically (a key of such a kind needs only its line here and a field on the dataclass); the others are
# read by the loader's own code, named in the key's line.
KINDS: dict[str, str] = {
    "length": "a length: a bare number in the file's unit, or a string with its own: `\"16 ft\"`, "
              "`\"3 ft 4 in\"`, `\"4 3/4\"`, `\"1/8 in\"`, `\"120 mm\"`, `\"1.2 m\"` (a fraction in a "
              "millimetre file needs its unit)",
    "number": "a plain number",
    "text": "a string of plain text (no control characters)",
    "choice": "one of the strings listed",
    "bool": "`true` or `false`",
    "force": "a force: a bare number (lbf in an inch file, N in a millimetre file) or a string with its unit: "
             "`\"225 lbf\"`, `\"1 kN\"`, `\"1000 N\"`",
    "stress": "a stress: a bare number (psi in an inch file, MPa in a millimetre file) or a string with its "
              "unit: `\"1.6e6 psi\"`, `\"11 GPa\"`, `\"80 MPa\"`",
    "density": "a density: a bare number (lb/ft³ in an inch file, kg/m³ in a millimetre file) or a string "
               "with its unit: `\"28 lb/ft3\"`, `\"450 kg/m3\"`",
    "wood": "the key of a built-in wood (`stavegen woods` lists them) or an inline table defining one "
            "(see *A wood of your own*)",
    "stations": "a list of `[position from the heel, diameter]` pairs, heel to head, positions increasing; for "
                "an oval or a rectangle `[position, fore_aft, athwartships]` triples",
    "wall": "a thickness (a length), or `[[position, thickness], ...]` (one pair gives a constant wall; "
            "several run heel to head, linear between), or `\"auto\"` / `\"auto-tapered\"`",
    "staves": f"a whole number from {MIN_STAVES} to {MAX_STAVES}, or `\"auto\"`",
    "lengths": "a list of lengths",
    "ranges": "a list of `[from, to]` pairs of positions from the heel",
    "quarters": "quarters of an inch as a string (`\"5/4\"` is 1 1/4 in, in any file), or a length",
    "table": "a table",
    "materials": "tables `[materials.NAME]`, one for each material of the file's own (see [materials.NAME])",
    "tables": "an array of tables, each written `[[...]]`",
}


@dataclass(frozen=True)
class Key:
    """One key of a table.

    ``default`` is the value as a file would write it (a :class:`PerUnit` where it depends on the unit
    system), :data:`REQUIRED`, :data:`UNSET` (optional, no value) or :class:`Words` for a default the
    loader works out. ``field`` names the dataclass field a generic kind fills (None: read by hand).
    ``low``/``high`` bound a number (``low_open``: strictly above ``low``); a length must be positive, or
    only not negative with ``zero_ok``. ``longest`` caps a text's characters. ``example`` is what the
    starter file writes (a PerUnit of TOML text); without one the starter writes the key commented out,
    at ``aside`` (a value to show, for keys whose default is in words or unset) or else at its default. ``note`` is a longer explanation for the reference, ``choice_notes`` one per choice.
    """

    name: str
    kind: str
    meaning: str
    default: Any = REQUIRED
    field: str | None = None
    choices: tuple[str, ...] = ()
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    zero_ok: bool = False
    longest: int | None = None
    example: PerUnit | None = None
    aside: PerUnit | None = None
    note: str = ""
    choice_notes: dict[str, str] = _field(default_factory=dict)

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    def default_for(self, units: str) -> Any:
        """The default as a file would write it, or None when it has none (required, unset or in words)."""
        if isinstance(self.default, PerUnit):
            return self.default.get(units)
        return None if isinstance(self.default, Words) else self.default


@dataclass(frozen=True)
class Table:
    """One table of the spar file: where it sits, whether it must be there, its keys."""

    path: str
    meaning: str
    keys: tuple[Key, ...]
    required: bool = False
    array: bool = False
    note: str = ""
    short: str = ""  # the comment on the table's line in the starter file

    def __post_init__(self) -> None:
        names = [k.name for k in self.keys]
        assert len(names) == len(set(names)), f"a key declared twice in [{self.path}]"

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(k.name for k in self.keys)

    def get(self, name: str) -> Key:
        for key in self.keys:
            if key.name == name:
                return key
        raise KeyError(f"[{self.path}] declares no key {name!r}")  # a bug in the loader, not bad input


def _u(inch: str, mm: str) -> PerUnit:
    return PerUnit(inch, mm)


SPAR = Table("spar", "What the spar is and the unit the file is written in.", required=True, keys=(
    Key("name", "text", "what the spar is called; it titles every output and names the files", longest=120,
        example=_u('"My mast"', '"My mast"'),
        note="The output files are named by its words in lowercase joined by hyphens, cut at a word to 60 "
             "characters (`\"Day-sailer mast\"` writes `day-sailer-mast.json`); a name with no letters or digits "
             "a file name can carry gives `spar`."),
    Key("units", "choice", "the unit of bare numbers in the file and of printed figures", default="in",
        choices=("in", "mm"), example=_u('"in"', '"mm"'),
        choice_notes={"in": "inches; positions print as feet, inches and 32nds, stresses in psi, densities "
                            "in lb/ft³", "mm": "millimetres; stresses in MPa, densities in kg/m³"}),
    Key("length", "length", "heel to head, finished", example=_u('"16 ft"', '"4.9 m"')),
    Key("head_load", "force", "sideways load at the head for the whole-spar deflection figures",
        default=Words("the reference load: the one that bends the plan's solid spar 2 % of its length at the head"),
        aside=_u('"25 lbf"', '"100 N"'),
        note="Not a rig load (stavegen computes none): the head deflection of the plan and of the hollow spar "
             "are compared under it. Deflection grows in proportion to it, so the hollow / plan ratios and the "
             "head stiffness do not depend on it; the report says which load was used. The reference load "
             "keeps the figure readable on any size of spar (a fixed load bends a dinghy's mast further than "
             "its length and a yacht's not at all)."),
))

PLAN = Table("plan", "The solid spar drawn in the plans: the stiffness and strength target.", required=True,
             short="the solid spar in the plans: the stiffness target", keys=(
    Key("wood", "wood", "the wood the plans specify", example=_u('"sitka-spruce"', '"sitka-spruce"')),
    Key("shape", "choice", "the shape of the plan's section", default="round", choices=SHAPES,
        choice_notes={"round": "a round: each station gives a diameter",
                      "oval": "an ellipse: each station gives `[position, fore_aft, athwartships]`, the "
                              "dimension fore-and-aft and the one athwartships",
                      "rectangle": "a rectangle (a spar drawn square or as glued planks): each station gives "
                                   "`[position, fore_aft, athwartships]`; `corner_radius` rounds its corners"}),
    Key("corner_radius", "length", "radius of a rectangle's rounded corners", default=0, zero_ok=True,
        aside=_u('"3/8"', "10"), note="Only with `shape = \"rectangle\"`; less than half the smaller dimension."),
    Key("stations", "stations", "the plan's diameters (or dimensions), heel (0) to head (the spar's length)",
        example=_u('[[0, 3.5], ["5 ft", 3.5], ["12 ft", 3.0], ["16 ft", 2.0]]',
                   "[[0, 90], [1500, 90], [3700, 76], [4900, 50]]"),
        note="The first position must be 0 and the last the spar's length (within 0.5 mm); diameters are "
             "linear between stations. A diameter 2.5 times or more its neighbour's is refused as a slip "
             "(no spar tapers that fast), and a jump of 1.8 times or more is warned of."),
))

NOTCH = Table("hollow.notch", "Your own cutter's notch, for `joint = \"birdsmouth-custom\"` only.",
              short="your own cutter's notch, with joint = \"birdsmouth-custom\" only", keys=(
    Key("depth", "length", "notch depth: from the notched edge to the V's apex, across the stave's width",
        example=_u('"5/8"', "16")),
    Key("apex_height", "length", "height of the V's apex above the stave's inner face", default=UNSET,
        example=_u('"1/4"', "6")),
    Key("apex_fraction", "number", "the apex height as a fraction of the stave's thickness (instead of "
        "apex_height)", default=UNSET, low=0.0, high=1.0, low_open=True, aside=_u("0.4", "0.4")),
), note="Give `depth` and exactly one of `apex_height` and `apex_fraction`. The V is always 90°; the stave "
        "width follows from the closure of the staves, and the section is refused if the staves would overlap "
        "or a stave would fall apart.")

PLUG = Table("hollow.plug", "Solid blocking filling the bore over a range (heel, partners, masthead): one "
             "`[[hollow.plug]]` table for each.", array=True, short="solid blocking in the bore: heel", keys=(
    Key("from", "length", "where the plug starts, from the heel", zero_ok=True, example=_u("0", "0")),
    Key("to", "length", "where it ends, from the heel", zero_ok=True, example=_u("10", "250")),
    Key("wood", "wood", "the plug's wood", default=Words("the hollow spar's wood"),
        aside=_u('"douglas-fir-coast"', '"douglas-fir-coast"')),
), note="Plugs must not overlap and must end within the spar.")

LAYER = Table("hollow.layer", "Sheathing over the rounded wood: cloth (or any laminate) in epoxy, one "
              "`[[hollow.layer]]` table for each, innermost first.", array=True,
              short="sheathing over the wood: cloth", keys=(
    Key("material", "text", "a built-in laminate (`stavegen materials` lists them) or one of `[materials]`",
        example=_u('"glass-6oz"', '"glass-6oz"')),
    Key("plies", "number", "how many plies", default=Words("1 (or thickness)"), low=1.0, high=50.0,
        example=_u("2", "2")),
    Key("thickness", "length", "the layer's cured thickness, in place of plies", default=UNSET,
        aside=_u('"1/64"', "0.5")),
    Key("from", "length", "where the layer starts, from the heel", default=Words("the heel"), zero_ok=True,
        aside=_u("0", "0")),
    Key("to", "length", "where it ends, from the heel", default=Words("the head"), zero_ok=True,
        aside=_u('"6 ft"', "1800")),
), note="The layers lie outside the wood after rounding. The finished diameters (`hollow.stations`, or the "
        "plan's) are the outside of the finished spar, layers included: the wood is rounded to the diameter "
        "less twice the layers there. Give `plies` (times the laminate's ply thickness) or `thickness`. Over "
        "a stretch (`from`, `to`), a station at the layer's very end is checked without it.")

STRIP = Table("hollow.strip", "Reinforcement: unidirectional tape along every stave, one `[[hollow.strip]]` "
              "table for each.", array=True, short="reinforcing tape in every stave: carbon", keys=(
    Key("material", "text", "a built-in laminate or one of `[materials]`", example=_u('"carbon-ud"', '"carbon-ud"')),
    Key("width", "length", "the tape's width", example=_u('"3/4"', "20")),
    Key("plies", "number", "how many plies of tape", default=Words("1 (or thickness)"), low=1.0, high=50.0,
        example=_u("2", "2")),
    Key("thickness", "length", "the strip's cured thickness, in place of plies", default=UNSET,
        aside=_u('"1/32"', "0.7")),
    Key("place", "choice", "where the tape lies", default="inner-face", choices=STRIP_PLACES,
        example=_u('"inner-face"', '"inner-face"'),
        choice_notes={"inner-face": "laid along the middle of each stave's inner face before glue-up, in the bore",
                      "groove": "let into a groove along the middle of each stave's outer face, its outer corners "
                                "on the finished round (the templates give the groove)"}),
    Key("from", "length", "where the strips start, from the heel", default=Words("the heel"), zero_ok=True,
        aside=_u("0", "0")),
    Key("to", "length", "where they end, from the heel", default=Words("the head"), zero_ok=True,
        aside=_u('"6 ft"', "1800")),
), note="Each stave carries one strip; the section counts them as a region of their own. A strip in the bore "
        "leaves less room for a plug, which is counted less the strips.")

MATERIAL = Table("materials.NAME", "A material of the file's own, used by its NAME wherever a wood or a laminate "
                 "is asked for: a wood (with `mor_mpa`) or a laminate (with `strength_mpa` and `ply_thickness`).",
                 short="materials of your own", keys=(
    Key("name", "text", "what it is called", default=Words("NAME"), longest=80, aside=_u('"Larch"', '"Larch"')),
    Key("E_mpa", "number", "modulus of elasticity along the spar, MPa", low=0.0, low_open=True, high=1e6,
        example=_u("12000", "12000")),
    Key("density_kg_m3", "number", "density, kg/m³ (a wood's at 12 % moisture content)", low=0.0, low_open=True,
        high=25000.0, example=_u("590", "590")),
    Key("mor_mpa", "number", "a wood's modulus of rupture, MPa", default=UNSET, low=0.0, low_open=True,
        aside=_u("93", "93")),
    Key("strength_mpa", "number", "a laminate's strength along the spar (the lesser of tension and "
        "compression), MPa", default=UNSET, low=0.0, low_open=True, aside=_u("500", "500")),
    Key("ply_thickness", "length", "a laminate's cured thickness per ply", default=UNSET, aside=_u('"1/64"', "0.3")),
    Key("source", "text", "where the figures come from", default="defined in the spar file", longest=300,
        example=_u('"the table the figures come from"', '"the table the figures come from"')),
), note="A wood of your own: clear-wood figures at 12 % moisture content from a source you trust. A laminate: "
        "figures for the laminate as you will lay it (by hand they are well below a prepreg's).")

HOLLOW = Table("hollow", "The stave-built spar you will make.", required=True, short="the spar you will build",
               keys=(
    Key("wood", "wood", "the staves' wood", example=_u('"douglas-fir-coast"', '"douglas-fir-coast"')),
    Key("staves", "staves", "how many staves; \"auto\" compares every count and keeps the one that buys the "
        "least wood", default=Words("required (4 for joint = \"box\", and may be left out)"), example=_u("8", "8"),
        note="A birdsmouth needs at least 5. With `\"auto\"`, each count is sized, checked, laid out and its "
             "boards ordered (it needs a `[stock]` table)."),
    Key("joint", "choice", "how neighbouring staves meet", default="birdsmouth-flush", choices=JOINTS,
        example=_u('"birdsmouth-flush"', '"birdsmouth-flush"'),
        choice_notes={
            "birdsmouth-flush": "a 90° V along one edge takes the next stave's square edge, the apex placed so "
                                "that the neighbour's outer corner lies flush with the V's outer tip: the outer "
                                "faces make a true polygon, the joint closes with no voids for any count, and "
                                "thickness only moves the bore (the usual choice)",
            "birdsmouth-centered": "the V's apex at half the stave's thickness, as deep as one lip of the V "
                                   "allows; a symmetric 45°/45° V with no voids at 8 staves, but for other counts "
                                   "the square edge cannot fill the V and open voids remain (they are reported, "
                                   "and warned of)",
            "birdsmouth-custom": "the V your cutter makes, given in `[hollow.notch]`",
            "bevel": "no notch: both edges bevelled 180°/N off square (coopered staves)",
            "box": "a rectangular spar (shape = \"rectangle\") of four flat pieces of the wall's thickness: two "
                   "faces (fore and aft, as wide as the spar is athwartships) and two sides (port and starboard) "
                   "glued at the corners as `corner` says; `staves` is 4 or left out",
        }),
    Key("notch", "table", "your cutter's notch, with joint = \"birdsmouth-custom\" (see [hollow.notch])",
        default=UNSET),
    Key("shape", "choice", "the shape of the hollow spar's section", default=Words("the plan's shape"),
        choices=HOLLOW_SHAPES, aside=_u('"oval"', '"oval"'),
        choice_notes={"round": "round, of identical staves",
                      "oval": "an ellipse, its stations `[position, fore_aft, athwartships]`: staves of unequal "
                              "widths round the polygon that rounds to the ellipse, each width from its own "
                              "closure, the same V and bevel at every joint; needs an even number of staves",
                      "rectangle": "a rectangle, its stations `[position, fore_aft, athwartships]`: a box of two "
                                   "faces and two sides (joint = \"box\"), corners sharp or rounded "
                                   "(`corner_radius`)"},
        note="A round plan's hollow spar may be oval and an oval plan's round (give `stations` then). Stiffness "
             "and strength are checked fore-and-aft and athwartships, each against the plan's."),
    Key("corner", "choice", "how a box spar's pieces meet at its corners (joint = \"box\")",
        default="sides-between-faces", choices=CORNERS, field="corner",
        choice_notes={"sides-between-faces": "the sides (port and starboard) are glued between the faces (fore "
                                             "and aft): a face is as wide as the spar athwartships, a side as "
                                             "the spar fore-and-aft less two walls; square edges, no machining "
                                             "but ripping and planing",
                      "rebated": "a rebate along each edge of a face's inner side takes a side's edge: the "
                                 "rebate as wide as the wall (the side's thickness) and `rebate_depth` deep into "
                                 "the face, so a side is the spar fore-and-aft less two walls plus two rebate "
                                 "depths wide; the rebates are cut on the table saw (two passes each) and "
                                 "locate the sides in the glue-up",
                      "pinwheel": "the square birdsmouth: every piece rebated along one edge (edge 1, the "
                                  "straight one), `rebate_depth` deep and a wall wide, the next piece's square edge "
                                  "in it, round the section; a piece covers the corner at its rebated edge, so a "
                                  "side is the spar fore-and-aft less a wall plus a rebate depth wide and a face the "
                                  "spar athwartships less the same; one rebate per piece, cut before the taper"}),
    Key("rebate_depth", "length", "a rebated or pinwheel box's rebate depth into the piece's thickness",
        default=Words("half the wall"), field="rebate_depth", aside=_u('"3/8"', "9"),
        note="Less than the wall: the face keeps the rest of its thickness over the side's edge."),
    Key("corner_radius", "length", "a box spar's finished outside corners rounded to this radius",
        default=PerUnit(0, 0), field="corner_radius", zero_ok=True, aside=_u('"3/8"', "10"),
        note="0 leaves them sharp. At most the finished wall (the wall less the planing allowance): the "
             "rounding then stays in the face's corner and never reaches the bore or crosses into a side."),
    Key("wall", "wall", "stave thickness before rounding", example=_u('"11/16"', "18"),
        note="`\"auto\"`: the least constant thickness that meets the target at every station and midway "
             "between, within `stock.thickness` and without the round breaking into the bore. "
             "`\"auto-tapered\"`: the least thickness at each station, linear between."),
    Key("stations", "stations", "finished diameters (or dimensions) if not the plan's, or \"auto\"",
        default=Words("the plan's diameters"),
        aside=_u('[[0, 3.6], ["5 ft", 3.6], ["12 ft", 3.1], ["16 ft", 2.1]]', "[[0, 92], [1500, 92], [3700, 78], [4900, 52]]"),
        note="`\"auto\"` (with a wall given): the plan's diameters times the least factor, never below 1, "
             "that meets the target. Checked for slips as `plan.stations` is, and against the plan: a diameter "
             "over 1.5 times or under two thirds of the plan's at the same place is warned of."),
    Key("lamination_factor", "number", "credit on the staves' modulus for laminated construction; 1.0 = none",
        default=1.0, field="lamination_factor", low=0.0, high=2.0, low_open=True, example=_u("1.0", "1.0")),
    Key("margin", "number", "the EI ratio must reach 1 + margin at every station", default=0.0, field="margin",
        low=0.0, high=5.0, example=_u("0.0", "0.0")),
    Key("min_strength_ratio", "number", "least strength ratio (MOR·S of the hollow spar over the plan's) the "
        "check and the sizing demand at every station", default=DEFAULT_STRENGTH_TARGET, field="min_strength_ratio",
        low=0.0, high=10.0, low_open=True,
        note="The verdict needs both stiffness (EI ratio at least 1 + margin) and strength (this ratio) at every "
             "station, and `\"auto\"` walls are sized to meet both. A builder who accepts a spar weaker than the "
             "plan sets it below 1, and page 1 of the report says so."),
    Key("min_corner_wall", "length", "least wall you accept after rounding, at the bore's corners; warned "
        "below, and kept by \"auto\" sizing", default=UNSET, field="min_corner_wall",
        aside=_u('"1/8"', "3")),
    Key("planing_allowance", "length", "on the radius, taken off when rounding", default=PerUnit("1/16", 1.5),
        field="planing_allowance", zero_ok=True, example=_u('"1/16"', "1.5")),
    Key("end_allowance", "length", "extra stave length at each end, trimmed after glue-up",
        default=PerUnit(3, 75), field="end_allowance", zero_ok=True, example=_u("3", "75")),
    Key("taper", "choice", "which edge of a stave takes its taper", default="square-edge", choices=TAPERS,
        field="taper", example=_u('"square-edge"', '"square-edge"'),
        choice_notes={"square-edge": "the notch is cut along a straight edge; the taper comes off the square "
                                     "edge",
                      "symmetric": "the taper is split between both edges"}),
    Key("notch_cut", "choice", "how the notch is cut when the wall tapers", default="thickest-wall",
        choices=NOTCH_CUTS, field="notch_cut",
        choice_notes={"thickest-wall": "once, with one setting, on staves all dressed to the thickest wall; the "
                                       "taper is the bore's",
                      "follow-wall": "following the wall station by station (the thickness tapered first): no "
                                     "fixed table-saw or router-table set-up cuts it, so the figures are given "
                                     "station by station for a CNC router"}),
    Key("plug", "tables", "solid blocking in the bore (see [[hollow.plug]])", default=Words("none")),
    Key("layer", "tables", "sheathing over the wood (see [[hollow.layer]])", default=Words("none")),
    Key("strip", "tables", "reinforcing tape in every stave (see [[hollow.strip]])", default=Words("none")),
))

STOCK = Table("stock", "The boards the staves are ripped from; needed by `build`, `size` and "
              "`staves = \"auto\"`.", short="boards the staves are ripped from", keys=(
    Key("thickness", "length", "dressed thickness (must cover the wall, given or solved)", field="thickness",
        example=_u("0.75", "20")),
    Key("nominal_thickness", "quarters", "nominal thickness, for the board-foot tally",
        default=Words("the dressed thickness"), example=_u('"4/4"', "25")),
    Key("widths", "lengths", "dressed widths you can buy", example=_u("[5.5, 7.25]", "[95, 145]")),
    Key("nominal_widths", "lengths", "their nominal widths, one for each width, for the tally",
        default=Words("the dressed widths"), example=_u("[6, 8]", "[100, 150]")),
    Key("lengths", "lengths", "board lengths you can buy", example=_u('["8 ft", "10 ft", "12 ft"]',
                                                                      "[2400, 3000, 3600]")),
    Key("kerf", "length", "the saw's kerf, between rips and cross-cuts", default=PerUnit("1/8", 3), field="kerf",
        zero_ok=True, example=_u('"1/8"', "3"),
        note="Refused at 1 in (25.4 mm) or more, or as wide as the widest board (a slip: no saw cuts so wide); "
             "warned of above 1/4 in (6.35 mm)."),
    Key("separate_with", "choice", "what parts neighbouring pieces on a board", default="saw", choices=SEPARATIONS,
        field="separate_with", example=_u('"saw"', '"saw"'),
        choice_notes={"saw": "the pieces are ripped and cross-cut a kerf apart",
                      "router": "the outlines are routed out of the board: the pieces are kept a router bit "
                                "apart (router_bit), so the bit cuts into no neighbour"}),
    Key("router_bit", "length", "diameter of the router bit that cuts the pieces out, with separate_with = "
        "\"router\"", default=UNSET, field="router_bit", aside=_u('"1/4"', "6")),
    Key("scarf_ratio", "number", "scarf length = ratio × stave thickness", default=8.0, field="scarf_ratio",
        low=1.0, high=50.0, example=_u("8", "8")),
    Key("scarf_stagger", "length", "least distance between scarfs in neighbouring staves",
        default=PerUnit(12, 300), field="scarf_stagger", zero_ok=True, example=_u("12", "300")),
    Key("no_scarf", "ranges", "ranges where no scarf may fall (partners, hounds)", default=Words("none"),
        example=_u('[["4 ft", "6 ft"]]', "[[1200, 1800]]")),
    Key("waste", "number", "share added to the order for defects and mistakes", default=0.10, field="waste",
        low=0.0, high=0.9, example=_u("0.10", "0.10")),
    Key("edge_allowance", "length", "added to each edge of a stave's rip for jointing", default=PerUnit("1/16", 1.5),
        field="edge_allowance", zero_ok=True,
        note="A rip is the stave's widest finished width plus this on each edge; the cutting diagrams and "
             "templates on boards space segments by it."),
))

OUTPUT = Table("output", "Drawing and printing choices.", short="drawing and printing", keys=(
    Key("paper", "choice", "paper for the full-size templates and the report", default=PerUnit("letter", "a4"),
        choices=PAPERS, field="paper", example=_u('"letter"', '"a4"')),
    Key("mark_spacing", "length", "spacing of the station marks on the templates", default=PerUnit(12, 250),
        field="mark_spacing", example=_u("12", "250")),
    Key("templates_on_boards", "bool", "the DXF draws each board of the order with its segments on it",
        default=False, field="templates_on_boards", example=_u("false", "false")),
))

WOOD = Table("wood", "Wherever a wood is asked for (`plan.wood`, `hollow.wood`, a plug's `wood`), a table in "
             "place of a built-in wood's key: inline, `wood = { name = \"My wood\", moe = \"1.5e6 psi\", "
             "mor = \"12000 psi\", density = \"33 lb/ft3\", source = \"...\" }`, or as a table of its own "
             "(`[hollow.wood]`, its keys on the lines below).", keys=(
    Key("name", "text", "what the wood is called", longest=80, example=_u('"My wood"', '"My wood"')),
    Key("moe", "stress", "modulus of elasticity (1,000 to 40,000 MPa)", example=_u('"1.5e6 psi"', '"10300 MPa"')),
    Key("mor", "stress", "modulus of rupture, far below the modulus", example=_u('"12000 psi"', '"83 MPa"')),
    Key("density", "density", "density at 12 % moisture content (100 to 1,400 kg/m³)",
        example=_u('"33 lb/ft3"', '"530 kg/m3"')),
    Key("source", "text", "where the figures come from", default="defined in the spar file", longest=300,
        example=_u('"the table the figures come from"', '"the table the figures come from"')),
    Key("compression_perp", "stress", "compression perpendicular to the grain (proportional limit): what a "
        "spigot or sleeve of a two-piece spar may press on it", default=UNSET, aside=_u('"600 psi"', '"4 MPa"'),
        note="Needed only where a [parting] bears on this wood; the built-in woods carry the Wood Handbook's "
             "figure."),
), note="Use figures for clear wood at 12 % moisture content from a source you trust, and name it.")

PARTING = Table("parting", "Where a two-piece spar comes apart (for the trailer or the shed) and how its parts "
                "join.", short="a spar that comes apart: where, and how it joins", keys=(
    Key("at", "length", "where the spar parts, from the heel", example=_u('"8 ft"', "2400")),
    Key("kind", "choice", "how the parts join", default="wood-spigot", choices=PARTINGS,
        example=_u('"wood-spigot"', '"wood-spigot"'),
        choice_notes={
            "wood-spigot": "a solid wooden spigot glued into the heel part's bore and sliding into the head part's, "
                           "shaped to the bore: the bore's own polygon less the clearance all round, glued up from "
                           "the same boards as the staves",
            "tube-spigot": "a bought tube (`material`, `outside_diameter`, `wall`) glued into a plug bored for it in "
                           "the heel part and sliding into a plug bored for it in the head part",
            "sleeve": "a tube (`material`, `wall`) over the outside of the butt, its bore the spar's diameter there "
                      "plus the clearance; both parts plugged under it",
        }),
    Key("overlap", "length", "how far the spigot (or sleeve) reaches into each part",
        default=Words("chosen: the least of 2 to 4 diameters that keeps the bearing within the wood's"),
        aside=_u("12", "300"),
        note="Common practice (no published rule) brackets 2 to 4 of the spar's diameters at the parting. Left "
             "out, stavegen takes the least overlap in that bracket at which the bearing pressure 6M/(d·L²) stays "
             "within the wood's compression perpendicular to grain, or 4 diameters when none does (and the check "
             "then fails)."),
    Key("clearance", "length", "gap all round between the spigot and the bore it slides in (or the sleeve and "
        "the spar)", default=PerUnit("1/64", 0.4), zero_ok=True, example=_u('"1/64"', "0.4"),
        note="The head part can kink at the joint by about 2·clearance/overlap radians; the report gives the "
             "angle."),
    Key("wood", "wood", "the wooden spigot's wood", default=Words("the hollow spar's wood"),
        aside=_u('"douglas-fir-coast"', '"douglas-fir-coast"')),
    Key("material", "choice", "the tube's or the sleeve's material", default=UNSET, choices=tuple(tube_table()),
        aside=_u('"aluminium-6061-t6"', '"aluminium-6061-t6"'),
        note="Built-in materials, each with its source (from memory — verify against the supplier's figures)."),
    Key("outside_diameter", "length", "the tube spigot's outside diameter", default=UNSET, aside=_u('"1 3/4"', "45")),
    Key("wall", "length", "the tube's or the sleeve's wall thickness", default=UNSET, aside=_u('"1/8"', "3")),
), note="The checks at the joint take the moment that breaks the plan's solid spar there (MOR·S·F), so the joint "
        "is as strong as the plan at that station: the spigot (or sleeve) alone carries it across the butt, "
        "with E·I and moment capacity at least the plan's; it passes to the bore as a pair of forces over the "
        "overlap, a peak pressure of about 6M/(d·L²) held to the wood's compression perpendicular to grain "
        "(Wood Handbook); the kink the clearance allows is reported. No plug may fill the bore where a spigot "
        "goes; no scarf falls within the overlap or within one diameter of its ends.")

TOP = Table("", "The spar file.", required=True, keys=(
    Key("spar", "table", SPAR.meaning),
    Key("plan", "table", PLAN.meaning),
    Key("hollow", "table", HOLLOW.meaning),
    Key("stock", "table", STOCK.meaning, default=UNSET),
    Key("output", "table", OUTPUT.meaning, default=Words("the defaults below")),
    Key("parting", "table", PARTING.meaning, default=UNSET),
    Key("materials", "materials", MATERIAL.meaning, default=Words("none")),
))

SPAR_FILE: tuple[Table, ...] = (SPAR, PLAN, HOLLOW, NOTCH, PLUG, LAYER, STRIP, STOCK, OUTPUT, PARTING, WOOD,
                                MATERIAL)
"""Every table, in the order the reference and the starter file give them."""

TABLES: dict[str, Table] = {t.path: t for t in (TOP,) + SPAR_FILE}
