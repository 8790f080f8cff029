"""The commented starter spar file that ``stavegen init`` writes."""

from __future__ import annotations

_INCH = '''# stavegen spar file. Lengths are bare numbers in the file's unit or strings
# that carry their own: "16 ft", "3 ft 4 in", "4 3/4", "1/8 in", "120 mm".
# Replace every figure below with your own plans' figures before you cut wood.

[spar]
name = "My mast"
units = "in"                      # "in" or "mm": bare numbers and printed output
length = "16 ft"                  # heel to head, finished

[plan]                            # the solid spar in the plans: the stiffness target
wood = "sitka-spruce"             # `stavegen woods` lists the built-in woods
stations = [[0, 3.5], ["5 ft", 3.5], ["12 ft", 3.0], ["16 ft", 2.0]]   # [from heel, diameter]

[hollow]                          # the spar you will build
wood = "douglas-fir-coast"
staves = 8                        # 4 to 24 (5 or more for a birdsmouth), or "auto"
joint = "birdsmouth-flush"        # birdsmouth-flush | birdsmouth-centered | birdsmouth-custom | bevel
wall = "11/16"                    # stave thickness, or [[from heel, thickness], ...], or "auto":
                                  # the least constant wall that meets the target ("auto-tapered":
                                  # the least at each station, linear between)
# stations = [[0, 3.6], ...]      # finished diameters if not the plan's, or "auto": the plan's
                                  # enlarged just enough for the wall given (not with an "auto" wall)
lamination_factor = 1.0           # credit on E for laminated construction; 1.0 = none
margin = 0.0                      # EI ratio must reach 1 + margin
planing_allowance = "1/16"        # on the radius, taken off when rounding
end_allowance = 3                 # extra stave length at each end, trimmed after glue-up
taper = "square-edge"             # notch on a straight edge, taper off the square edge; or "symmetric"

[[hollow.plug]]                   # solid blocking in the bore: heel
from = 0
to = 10

[[hollow.plug]]                   # and masthead
from = "15 ft"
to = "16 ft"

[stock]                           # boards the staves are ripped from
thickness = 0.75                  # dressed thickness (must cover the wall, solved or given)
nominal_thickness = "4/4"         # for the board-foot tally
widths = [5.5, 7.25]              # dressed widths you can buy
nominal_widths = [6, 8]           # their nominal widths, for the tally
lengths = ["8 ft", "10 ft", "12 ft"]
kerf = "1/8"
scarf_ratio = 8                   # scarf length = ratio x thickness
scarf_stagger = 12                # least distance between scarfs in neighbouring staves
no_scarf = [["4 ft", "6 ft"]]     # ranges where no scarf may fall (partners, hounds)
waste = 0.10                      # added to the order

[output]
paper = "letter"                  # letter | a4, for the full-size templates
mark_spacing = 12                 # station marks on the templates
templates_on_boards = false       # true: the DXF draws each board of the order with its segments on it
'''

_MM = '''# stavegen spar file. Lengths are bare numbers in the file's unit or strings
# that carry their own: "4.9 m", "120 mm", "16 ft", "4 3/4 in".
# Replace every figure below with your own plans' figures before you cut wood.

[spar]
name = "My mast"
units = "mm"                      # "in" or "mm": bare numbers and printed output
length = "4.9 m"                  # heel to head, finished

[plan]                            # the solid spar in the plans: the stiffness target
wood = "sitka-spruce"             # `stavegen woods` lists the built-in woods
stations = [[0, 90], [1500, 90], [3700, 76], [4900, 50]]   # [from heel, diameter]

[hollow]                          # the spar you will build
wood = "douglas-fir-coast"
staves = 8                        # 4 to 24 (5 or more for a birdsmouth), or "auto"
joint = "birdsmouth-flush"        # birdsmouth-flush | birdsmouth-centered | birdsmouth-custom | bevel
wall = 18                         # stave thickness, or [[from heel, thickness], ...], or "auto":
                                  # the least constant wall that meets the target ("auto-tapered":
                                  # the least at each station, linear between)
# stations = [[0, 92], ...]       # finished diameters if not the plan's, or "auto": the plan's
                                  # enlarged just enough for the wall given (not with an "auto" wall)
lamination_factor = 1.0           # credit on E for laminated construction; 1.0 = none
margin = 0.0                      # EI ratio must reach 1 + margin
planing_allowance = 1.5           # on the radius, taken off when rounding
end_allowance = 75                # extra stave length at each end, trimmed after glue-up
taper = "square-edge"             # or "symmetric"

[[hollow.plug]]                   # solid blocking in the bore: heel
from = 0
to = 250

[[hollow.plug]]                   # and masthead
from = 4600
to = 4900

[stock]                           # boards the staves are ripped from
thickness = 20                    # dressed thickness (must cover the wall, solved or given)
nominal_thickness = 25            # for the tally
widths = [95, 145]
lengths = [2400, 3000, 3600]
kerf = 3
scarf_ratio = 8                   # scarf length = ratio x thickness
scarf_stagger = 300               # least distance between scarfs in neighbouring staves
no_scarf = [[1200, 1800]]         # ranges where no scarf may fall (partners, hounds)
waste = 0.10                      # added to the order

[output]
paper = "a4"                      # letter | a4, for the full-size templates
mark_spacing = 250                # station marks on the templates
templates_on_boards = false       # true: the DXF draws each board of the order with its segments on it
'''


def starter_text(units: str = "in") -> str:
    """A commented, valid spar file in inches or millimetres."""
    return _INCH if units == "in" else _MM
