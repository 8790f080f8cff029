"""Lengths, stresses and densities at the edges of the program.

Inside, stavegen works in millimetres, newtons, N/mm² (MPa) and kg/m³.
This module turns what a builder writes ("13 ft 6 in", "4 3/4", "1/8 in",
"6.2 m", "120 mm", or a bare number in the file's unit) into millimetres,
and turns millimetres back into what a builder reads: feet, inches and
32nds where a tape measure is read, millimetres to one decimal otherwise.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from enum import Enum

from .errors import shown

MM_PER_INCH = 25.4
MM_PER_FOOT = 304.8
MPA_PER_PSI = 0.006894757293168361  # 1 lbf/in² in N/mm² (exact by definition of lbf and in)
KG_M3_PER_LB_FT3 = 16.01846337396014  # 1 lb/ft³ in kg/m³
UNIT_SYSTEMS = ("in", "mm")

_UNIT_MM = {
    "ft": MM_PER_FOOT, "feet": MM_PER_FOOT, "foot": MM_PER_FOOT, "'": MM_PER_FOOT,
    "in": MM_PER_INCH, "inch": MM_PER_INCH, "inches": MM_PER_INCH, '"': MM_PER_INCH,
    "mm": 1.0, "cm": 10.0, "m": 1000.0,
}

# One term of a length: a number (whole, decimal, fraction, or whole and
# fraction) followed by an optional unit.
_TERM = re.compile(
    r"""\s*(?:
        (?P<fn>\d+)\s*/\s*(?P<fd>\d+)                               # 3/4
      | (?P<whole>\d+(?:\.\d*)?|\.\d+)(?:[ \t]*[\s-][ \t]*(?P<mn>\d+)\s*/\s*(?P<md>\d+))?  # 4, 4.5, 4 3/4, 4-3/4
    )\s*(?P<unit>feet|foot|ft|inches|inch|in|mm|cm|m|'|")?\s*""",
    re.VERBOSE | re.IGNORECASE,
)
LONGEST_TEXT = 60  # characters: no length, stress or density a builder writes is longer
LARGEST = 1e9  # a number (in any unit) beyond this is no spar dimension
_EXPONENT = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)[eE][-+]?\d+\s*(mm|cm|m|in|ft)?\s*$")


class UnitError(ValueError):
    """A value that is not a length (or stress, or density) as written."""


def _check_finite(value: float, text: object) -> float:
    if not math.isfinite(value):
        raise UnitError(f"not a finite number: {shown(text)}")
    if abs(value) > LARGEST:
        raise UnitError(f"too large to be a spar dimension: {shown(text)}")
    return value


def _as_float(value: int | float) -> float:
    """A TOML number as a float; an integer too large for one is refused as no dimension (not an overflow)."""
    if isinstance(value, int) and abs(value) > LARGEST:
        raise UnitError(f"too large to be a spar dimension: {shown(value)}")
    return float(value)


def _checked_text(value: str, what: str) -> str:
    text = value.strip()
    if len(text) > LONGEST_TEXT:
        raise UnitError(f"not {what}: {shown(value)} is too long to be one")
    return text


def _ratio(numerator: str, denominator: str, original: object) -> float:
    den = int(denominator)
    if den == 0:
        raise UnitError(f"division by zero in {shown(original)}")
    try:
        return int(numerator) / den
    except OverflowError:
        raise UnitError(f"too large to be a spar dimension: {shown(original)}") from None


def parse_length(value: object, units: str) -> float:
    """Millimetres from a bare number (in ``units``) or a string with units.

    ``units`` is the file's unit system, "in" or "mm". Raises UnitError with
    the reason when the value cannot be read as a length.
    """
    if isinstance(value, bool):
        raise UnitError(f"expected a length, got {str(value).lower()}")
    if isinstance(value, (int, float)):
        return _check_finite(_as_float(value) * _UNIT_MM[units], value)
    if not isinstance(value, str):
        raise UnitError(f"expected a length, got {type(value).__name__}")
    text = _checked_text(value, "a length")
    if not text:
        raise UnitError("empty length")
    sign = 1.0
    if text[0] in "+-":
        sign = -1.0 if text[0] == "-" else 1.0
        text = text[1:].lstrip()
    match = _EXPONENT.match(text)
    if match:
        number = float(text.rstrip("mcintf \t"))
        unit = (match.group(2) or units).lower()
        return _check_finite(sign * number * _UNIT_MM[unit], value)
    terms: list[tuple[float, str | None]] = []
    pos = 0
    while pos < len(text):
        term = _TERM.match(text, pos)
        if not term or term.end() == pos:
            raise UnitError(f"not a length: {shown(value)} (write e.g. 4 3/4, \"13 ft 6 in\", \"120 mm\")")
        fraction = bool(term.group("fn") or term.group("mn"))
        if term.group("fn"):
            number = _ratio(term.group("fn"), term.group("fd"), value)
        else:
            number = float(term.group("whole"))
            if term.group("mn"):
                if "." in term.group("whole"):
                    raise UnitError(f"a decimal cannot carry a fraction: {shown(value)}")
                number += _ratio(term.group("mn"), term.group("md"), value)
        unit = term.group("unit")
        if fraction and unit is None and units == "mm":
            raise UnitError(_bare_fraction(value, sign * number))
        terms.append((number, unit.lower() if unit else None))
        pos = term.end()
    return _check_finite(sign * _combine(terms, units, value), value)


def _bare_fraction(value: str, number: float) -> str:
    """Why a fraction without a unit is refused in a millimetre file: it reads two ways."""
    return (f"{shown(value)} is a fraction with no unit in a millimetre file: it would be {number:g} mm, "
            f"or {number * MM_PER_INCH:g} mm if inches were meant; write the unit (\"{value.strip()} in\") "
            "or a decimal number of mm")


def _combine(terms: list[tuple[float, str | None]], units: str, original: object) -> float:
    """Join parsed terms: a single number, or feet followed by inches."""
    if len(terms) == 1:
        number, unit = terms[0]
        return number * _UNIT_MM[unit or units]
    if len(terms) == 2:
        (feet, u1), (inches, u2) = terms
        if _UNIT_MM.get(u1 or "") == MM_PER_FOOT and (u2 is None or _UNIT_MM[u2] == MM_PER_INCH):
            return feet * MM_PER_FOOT + inches * MM_PER_INCH
    raise UnitError(f"not a length: {shown(original)} (combine only feet and inches, as \"13 ft 6 in\")")


def to_unit(mm: float, units: str) -> float:
    """``mm`` expressed in the unit system's base unit (inches or mm)."""
    return mm / _UNIT_MM[units]


def inch_fraction(inches: float, denominator: int = 32) -> tuple[int, int, int, int]:
    """(sign, whole, numerator, denominator) of ``inches`` to the nearest 1/denominator, reduced."""
    sign = -1 if inches < 0 else 1
    total = round(abs(inches) * denominator)
    whole, num = divmod(total, denominator)
    common = math.gcd(num, denominator)  # 0/32 keeps 1 as its denominator below
    return sign if total else 1, whole, num // common, denominator // common if num else 1


def format_inches(mm: float, mark: bool = True, denominator: int = 32) -> str:
    """Inches and a fraction to the nearest 1/32: ``3 7/16"``."""
    sign, whole, num, den = inch_fraction(mm / MM_PER_INCH, denominator)
    text = "-" if sign < 0 else ""
    if num and whole:
        text += f"{whole} {num}/{den}"
    elif num:
        text += f"{num}/{den}"
    else:
        text += f"{whole}"
    return text + ('"' if mark else "")


def format_tape(mm: float, denominator: int = 32) -> str:
    """A position as read off a tape: ``5' 3 7/16"``, or ``9 1/2"`` under a foot."""
    sign, whole, num, den = inch_fraction(mm / MM_PER_INCH, denominator)
    feet, inches = divmod(whole, 12)
    prefix = "-" if sign < 0 else ""
    rest = f"{inches} {num}/{den}" if num and inches else (f"{num}/{den}" if num else f"{inches}")
    if feet == 0:
        return f'{prefix}{rest}"'
    return f"{prefix}{feet}' {rest}\""


def format_mm(mm: float, decimals: int = 1) -> str:
    """Millimetres to one decimal: ``1234.5 mm``."""
    return f"{mm:.{decimals}f} mm"


def format_length(mm: float, units: str, tape: bool = False, way: "Way | None" = None) -> str:
    """A length for people: fractions of an inch (feet too if ``tape``), or mm; rounded ``way`` (nearest)."""
    if way is not None:
        return SYSTEMS[units].length(mm, way, tape=tape)
    if units == "in":
        return format_tape(mm) if tape else format_inches(mm)
    return format_mm(mm)


def format_exact(mm: float, units: str) -> str:
    """A solved length unrounded for the shop: inches to 4 decimals (``0.8134"``) or mm to 3 (``20.662 mm``)."""
    if units == "in":
        return f'{mm / MM_PER_INCH:.4f}"'
    return f"{mm:.3f} mm"


def format_length_up(mm: float, units: str) -> str:
    """``mm`` rounded up, never down, to what :func:`format_length` prints: the next 1/32 in or 0.1 mm.

    For a least wall or a least diameter, where rounding to the nearest could
    fall short. A length already on the grid (within 1e-9 of a step) stays.
    """
    if units == "in":
        steps = math.ceil(mm / MM_PER_INCH * 32 - 1e-9)
        return format_inches(steps * MM_PER_INCH / 32)
    return format_mm(math.ceil(mm * 10 - 1e-9) / 10)


def format_plain(mm: float, units: str) -> str:
    """A length in the file's unit without a unit mark, for spreadsheets: ``3 7/16`` or ``87.3``."""
    if units == "in":
        return format_inches(mm, mark=False)
    return f"{mm:.1f}"


# Stresses (moduli and strengths) and densities -----------------------------

_FORCE_N = {"n": 1.0, "kn": 1000.0, "lbf": 4.4482216152605, "kgf": 9.80665}
_STRESS_MPA = {"psi": MPA_PER_PSI, "ksi": 1000 * MPA_PER_PSI, "mpa": 1.0, "gpa": 1000.0, "n/mm2": 1.0}
_DENSITY = {"kg/m3": 1.0, "lb/ft3": KG_M3_PER_LB_FT3, "pcf": KG_M3_PER_LB_FT3}
_QUANTITY = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([A-Za-z/0-9³²]+)?\s*$")


def _parse_quantity(value: object, table: dict[str, float], default_unit: str, what: str) -> float:
    if isinstance(value, bool):
        raise UnitError(f"expected {what}, got {str(value).lower()}")
    if isinstance(value, (int, float)):
        return _check_finite(_as_float(value) * table[default_unit], value)
    if not isinstance(value, str):
        raise UnitError(f"expected {what}, got {type(value).__name__}")
    match = _QUANTITY.match(_checked_text(value, what))
    if not match:
        raise UnitError(f"not {what}: {shown(value)}")
    unit = (match.group(2) or default_unit).lower().replace("³", "3").replace("²", "2")
    if unit not in table:
        raise UnitError(f"unknown unit {shown(match.group(2))} for {what} (use {', '.join(table)})")
    return _check_finite(float(match.group(1)) * table[unit], value)


def parse_stress(value: object, units: str) -> float:
    """N/mm² from a number (psi for "in" files, MPa for "mm") or "1.6e6 psi", "11 GPa"."""
    return _parse_quantity(value, _STRESS_MPA, "psi" if units == "in" else "mpa", "a stress")


def parse_density(value: object, units: str) -> float:
    """kg/m³ from a number (lb/ft³ for "in" files, kg/m³ for "mm") or "28 lb/ft3", "450 kg/m3"."""
    return _parse_quantity(value, _DENSITY, "lb/ft3" if units == "in" else "kg/m3", "a density")


def parse_force(value: object, units: str) -> float:
    """Newtons from a number (lbf for "in" files, N for "mm") or "225 lbf", "1 kN", "1000 N"."""
    return _parse_quantity(value, _FORCE_N, "lbf" if units == "in" else "n", "a force")


def stress_in(mpa: float, system: str) -> float:
    """A stress from N/mm² into psi ("psi") or MPa ("mpa")."""
    return mpa / MPA_PER_PSI if system == "psi" else mpa


# Mass and force for people ----------------------------------------------------

KG_PER_LB = 0.45359237
N_PER_LBF = 4.4482216152605


def format_mass(kg: float, units: str) -> str:
    """``27.1 lb`` for inch files, ``12.3 kg`` for mm files."""
    return f"{kg / KG_PER_LB:.1f} lb" if units == "in" else f"{kg:.1f} kg"


def format_thin(mm: float, units: str) -> str:
    """A layer's or a ply's thickness, too thin for 32nds: ``0.010 in`` or ``0.25 mm``."""
    return f"{mm / MM_PER_INCH:.3f} in" if units == "in" else f"{mm:.2f} mm"


def format_small_mass(kg: float, units: str) -> str:
    """Resin and cloth: ``1.17 lb`` or ``5.3 oz`` for inch files, ``530 g`` or ``1.27 kg`` for mm files."""
    if units == "in":
        lb = kg / KG_PER_LB
        return f"{lb:.2f} lb" if lb >= 1 else f"{lb * 16:.1f} oz"
    return f"{kg:.2f} kg" if kg >= 1 else f"{kg * 1000:.0f} g"


SQ_FT_PER_M2 = 1 / (0.3048 * 0.3048)


def format_cloth_area(m2: float, units: str) -> str:
    """Cloth and tape: ``28.5 sq ft`` for inch files, ``2.65 m²`` for mm files."""
    return f"{m2 * SQ_FT_PER_M2:.1f} sq ft" if units == "in" else f"{m2:.2f} m²"


def format_force(newtons: float, units: str) -> str:
    """``1,234 lbf`` for inch files, ``5,490 N`` for mm files."""
    return f"{newtons / N_PER_LBF:,.0f} lbf" if units == "in" else f"{newtons:,.0f} N"


# The unit system of a spar file, and rounding the safe way -------------------------------------


class Way(Enum):
    """Which way a printed length is rounded onto the builder's grid (docs/conventions.md)."""

    NEAREST = "nearest"  # a position or a figure that only describes
    UP = "up"  # never less than the exact figure: a thickness to dress to, a length to cut, "at least"
    DOWN = "down"  # never more: a least wall, a depth not to pass, a setting that must leave wood


@dataclass(frozen=True)
class UnitSystem:
    """How one unit system reads and prints: the spar file's ``units`` ("in" or "mm").

    ``step`` is the finest length a builder reads off a tape in this system (mm):
    1/32 in, or 0.1 mm. Every printed length goes through :meth:`on_grid`, which
    rounds it onto that grid in the :class:`Way` the figure calls for.
    """

    key: str
    step: float
    length_word: str  # "in" or "mm": the unit of bare lengths in this system's files and tables
    position_word: str  # "ft-in" or "mm": how positions along the spar are printed

    @property
    def imperial(self) -> bool:
        return self.key == "in"

    def on_grid(self, mm: float, way: Way = Way.NEAREST, step: float | None = None) -> float:
        """``mm`` rounded onto the grid (``step`` mm, default this system's) the way asked; exact grid points stay."""
        g = step or self.step
        k = mm / g
        if way is Way.UP:
            n = math.ceil(k - 1e-9)
        elif way is Way.DOWN:
            n = math.floor(k + 1e-9)
        else:
            n = round(k)
        return n * g

    def fine_step(self, limit: float) -> float:
        """The coarsest grid step, 1/32 in halved down to 1/128 in (or 0.1 mm), not coarser than ``limit`` mm."""
        g = self.step
        while g > limit and self.imperial and g > MM_PER_INCH / 128 + 1e-12:
            g /= 2
        return g

    def length(self, mm: float | None, way: Way = Way.NEAREST, tape: bool = False, step: float | None = None) -> str:
        """A length for people, on the grid: ``3 7/16"`` (feet too with ``tape``) or ``87.3 mm``."""
        if mm is None:
            return "—"
        value = self.on_grid(mm, way, step)
        if self.imperial:
            den = round(MM_PER_INCH / (step or self.step))
            return format_tape(value, den) if tape else format_inches(value, denominator=den)
        return format_mm(value, _decimals(step or self.step))

    def plain(self, mm: float | None, way: Way = Way.NEAREST, step: float | None = None) -> str:
        """A length without a unit mark, for tables and spreadsheets: ``3 7/16`` or ``87.3``."""
        if mm is None:
            return ""
        value = self.on_grid(mm, way, step)
        if self.imperial:
            return format_inches(value, mark=False, denominator=round(MM_PER_INCH / (step or self.step)))
        return f"{value:.{_decimals(step or self.step)}f}"

    def decimal(self, mm: float | None, way: Way = Way.NEAREST, step: float | None = None) -> str:
        """The same grid value as a decimal number in this system's unit (inches to 5 places, or mm)."""
        if mm is None:
            return ""
        value = self.on_grid(mm, way, step)
        return f"{value / MM_PER_INCH:.5f}" if self.imperial else f"{value:.{_decimals(step or self.step)}f}"

    def exact(self, mm: float) -> str:
        """Unrounded: inches to 4 decimals (``0.8134"``) or mm to 3 (``20.662 mm``)."""
        return format_exact(mm, self.key)

    def mass(self, kg: float) -> str:
        return format_mass(kg, self.key)

    def force(self, newtons: float) -> str:
        return format_force(newtons, self.key)

    # Areas, second moments, section moduli, stresses and densities: in², in⁴, in³, psi and lb/ft³ for an
    # inch file, mm², mm⁴, mm³, MPa and kg/m³ for a millimetre file (``si`` forces the latter).

    def area(self, mm2: float, si: bool = False) -> str:
        if si or not self.imperial:
            return _grouped(mm2, "mm²", 2 if abs(mm2) < 100 else 1)
        return _significant(mm2 / MM_PER_INCH**2, "in²")

    def second_moment(self, mm4: float, si: bool = False) -> str:
        return _grouped(mm4, "mm⁴", 0) if si or not self.imperial else _significant(mm4 / MM_PER_INCH**4, "in⁴")

    def section_modulus(self, mm3: float, si: bool = False) -> str:
        return _grouped(mm3, "mm³", 0) if si or not self.imperial else _significant(mm3 / MM_PER_INCH**3, "in³")

    def stress(self, mpa: float) -> str:
        return f"{mpa / MPA_PER_PSI:,.0f} psi" if self.imperial else f"{mpa:,.0f} MPa"

    def density(self, kg_m3: float) -> str:
        return f"{kg_m3 / KG_M3_PER_LB_FT3:.1f} lb/ft³" if self.imperial else f"{kg_m3:,.0f} kg/m³"

    def said(self, value: float, kind: str) -> str:
        """A figure of a message, by its kind: "length" (on the grid; a small one that would read 0 to four
        places), "position" (feet and inches along the spar), "area", "second_moment", "section_modulus",
        "force", "stress" or "density"; the value in mm, N and kg."""
        if kind == "length":
            if value and abs(self.on_grid(value)) < self.step / 2:
                return self.exact(value)
            return self.length(value)
        if kind == "position":
            return self.length(value, tape=True)
        return getattr(self, kind)(value)


def _significant(value: float, unit: str) -> str:
    """Four significant figures (at least one decimal), grouped: ``5.512 in²``, ``1,234.5 in⁴``."""
    if value == 0:
        return f"0 {unit}"
    decimals = max(1, 3 - math.floor(math.log10(abs(value))))
    return f"{value:,.{decimals}f} {unit}"


def _grouped(value: float, unit: str, decimals: int) -> str:
    return f"{value:,.{decimals}f} {unit}"


def _decimals(step: float) -> int:
    return max(0, -math.floor(math.log10(step) + 1e-9))


IMPERIAL = UnitSystem("in", MM_PER_INCH / 32, "in", "ft-in")
METRIC = UnitSystem("mm", 0.1, "mm", "mm")
SYSTEMS = {"in": IMPERIAL, "mm": METRIC}


def system(units: str) -> UnitSystem:
    """The :class:`UnitSystem` of a spar file's ``units``."""
    return SYSTEMS[units]
