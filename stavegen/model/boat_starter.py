"""The starter boat that ``stavegen init BOAT.toml --boat`` writes: a boat file and two spar files.

The mast is the starter spar file (:mod:`stavegen.model.starter`); the boom is a short
spar file written here. Both build alone too, as every spar file of a boat does.
"""

from __future__ import annotations

from pathlib import Path

from .starter import starter_text

_BOAT_INCH = '''# stavegen boat file: several spar files built as one job, with one order of boards.
# Replace every figure with your own before you cut wood.

[boat]
name = "{name}"
units = "in"                      # "in" or "mm": bare numbers here and the boat's printed output
spars = [                         # spar files, from this file's folder; each still builds alone
  {{ file = "{mast}", tag = "M" }},   # tag (1 to 4 letters or digits) starts its labels: M-S3-2
  {{ file = "{boom}", tag = "B" }},   # without a tag a spar gets the next free letter A, B, C...
]

[stock]                           # the boards of the boat's one order; replaces the spar files' boards
thickness = 0.75                  # (the spar files keep their own no_scarf ranges, and their
nominal_thickness = "4/4"         #  scarf_ratio and scarf_stagger unless these are given here)
widths = [5.5, 7.25]
nominal_widths = [6, 8]
lengths = ["8 ft", "10 ft", "12 ft"]
kerf = "1/8"
separate_with = "saw"             # "saw": pieces a kerf apart; "router": router_bit apart
# router_bit = "1/4"              # the bit that cuts the pieces out of the boards
waste = 0.10

[output]                          # for every paper of the boat
paper = "letter"
mark_spacing = 12
templates_on_boards = false       # true: also BOAT-boards.dxf, every board with every spar's segments
'''

_BOAT_MM = '''# stavegen boat file: several spar files built as one job, with one order of boards.
# Replace every figure with your own before you cut wood.

[boat]
name = "{name}"
units = "mm"                      # "in" or "mm": bare numbers here and the boat's printed output
spars = [                         # spar files, from this file's folder; each still builds alone
  {{ file = "{mast}", tag = "M" }},   # tag (1 to 4 letters or digits) starts its labels: M-S3-2
  {{ file = "{boom}", tag = "B" }},   # without a tag a spar gets the next free letter A, B, C...
]

[stock]                           # the boards of the boat's one order; replaces the spar files' boards
thickness = 20                    # (the spar files keep their own no_scarf ranges, and their
nominal_thickness = 25            #  scarf_ratio and scarf_stagger unless these are given here)
widths = [95, 145]
lengths = [2400, 3000, 3600]
kerf = 3
separate_with = "saw"             # "saw": pieces a kerf apart; "router": router_bit apart
# router_bit = 6                  # the bit that cuts the pieces out of the boards
waste = 0.10

[output]                          # for every paper of the boat
paper = "a4"
mark_spacing = 250
templates_on_boards = false       # true: also BOAT-boards.dxf, every board with every spar's segments
'''

_BOOM = {
    "in": '''# stavegen spar file: a boom, one spar of the boat file beside it. Replace every figure.

[spar]
name = "My boom"
units = "in"
length = "11 ft"

[plan]
wood = "douglas-fir-coast"
stations = [[0, 2.25], ["4 ft", 2.75], ["11 ft", 2.25]]

[hollow]
wood = "port-orford-cedar"
staves = 8
joint = "birdsmouth-flush"
wall = "1/2"
stations = [[0, "2 15/16"], ["4 ft", "3 9/16"], ["11 ft", "2 15/16"]]
margin = 0.0

[[hollow.plug]]                   # gooseneck
from = 0
to = 8

[[hollow.plug]]                   # outhaul
from = "10 ft 4 in"
to = "11 ft"

[stock]                           # for building it alone; in the boat the boat's boards are used
thickness = 0.75
nominal_thickness = "4/4"
widths = [5.5, 7.25]
nominal_widths = [6, 8]
lengths = ["8 ft", "10 ft", "12 ft"]
kerf = "1/8"
scarf_ratio = 8
scarf_stagger = 12
waste = 0.10
''',
    "mm": '''# stavegen spar file: a boom, one spar of the boat file beside it. Replace every figure.

[spar]
name = "My boom"
units = "mm"
length = 3300

[plan]
wood = "douglas-fir-coast"
stations = [[0, 58], [1200, 70], [3300, 58]]

[hollow]
wood = "port-orford-cedar"
staves = 8
joint = "birdsmouth-flush"
wall = 13
stations = [[0, 75], [1200, 91], [3300, 75]]
margin = 0.0

[[hollow.plug]]                   # gooseneck
from = 0
to = 200

[[hollow.plug]]                   # outhaul
from = 3100
to = 3300

[stock]                           # for building it alone; in the boat the boat's boards are used
thickness = 20
nominal_thickness = 25
widths = [95, 145]
lengths = [2400, 3000, 3600]
kerf = 3
scarf_ratio = 8
scarf_stagger = 300
waste = 0.10
''',
}


def starter_boat(file_name: str, units: str = "in") -> dict[str, str]:
    """File name → text of a starter boat called ``file_name`` and the spar files it lists."""
    stem = Path(file_name).stem or "boat"
    mast, boom = f"{stem}-mast.toml", f"{stem}-boom.toml"
    boat = (_BOAT_INCH if units == "in" else _BOAT_MM).format(name="My boat", mast=mast, boom=boom)
    return {file_name: boat, mast: starter_text(units), boom: _BOOM[units]}
