"""Lengths as builders write them, and back (fractions to 1/32 in where a tape is read)."""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stavegen.units import (
    MM_PER_INCH,
    UnitError,
    format_inches,
    format_mm,
    format_tape,
    parse_length,
    parse_stress,
)

# 1 in = 25.4 mm and 1 ft = 12 in exactly (international yard and pound agreement, 1959).


@pytest.mark.parametrize("text, units, mm", [
    ("13 ft 6 in", "in", (13 * 12 + 6) * 25.4),
    ("4 3/4", "in", 4.75 * 25.4),
    ("1/8 in", "in", 3.175),
    ("6.2 m", "in", 6200.0),
    ("120 mm", "in", 120.0),
    ("16 ft", "mm", 16 * 304.8),
    ("3 ft 4 in", "in", 40 * 25.4),
    ("1.2 m", "in", 1200.0),
    ("13' 6\"", "in", 162 * 25.4),
    ("4-3/4\"", "in", 4.75 * 25.4),
    ("13 ft 6 1/2 in", "in", 162.5 * 25.4),
    ("12 cm", "in", 120.0),
    (120, "mm", 120.0),
    (3.5, "in", 3.5 * 25.4),
    ("3/4 mm", "mm", 0.75),
    ("4 3/4 in", "mm", 4.75 * 25.4),
])
def test_parse(text, units, mm):
    assert parse_length(text, units) == pytest.approx(mm, rel=1e-12)


@pytest.mark.parametrize("text, mm_reading, inch_reading", [
    ("1/8", "0.125 mm", "3.175 mm"),
    ("4 3/4", "4.75 mm", "120.65 mm"),
    ("4-3/4", "4.75 mm", "120.65 mm"),
])
def test_bare_fraction_in_a_millimetre_file_is_refused_with_both_readings(text, mm_reading, inch_reading):
    """A fraction is how inches are written (common practice); in a mm file it reads two ways, so say both."""
    with pytest.raises(UnitError) as err:
        parse_length(text, "mm")
    assert mm_reading in str(err.value) and inch_reading in str(err.value)
    assert parse_length(text, "in") == pytest.approx(float(inch_reading.split()[0]), rel=1e-12)


@pytest.mark.parametrize("value", [10 ** 309, "1/" + "9" * 5000, "9" * 400 + "/1", "1" * 61, -(10 ** 400)])
def test_huge_numbers_are_refused_not_overflowed(value):
    with pytest.raises(UnitError):
        parse_length(value, "in")
    with pytest.raises(UnitError):
        parse_stress(value, "in")


@pytest.mark.parametrize("text", ["abc", "3 m 4 cm", "4 ft 3 ft", "1/0", "", "4.5 1/2", "in", "nan", "1e400"])
def test_reject(text):
    with pytest.raises(UnitError):
        parse_length(text, "in")


@pytest.mark.parametrize("value", [float("nan"), float("inf"), True])
def test_reject_non_numbers(value):
    with pytest.raises(UnitError):
        parse_length(value, "mm")


@pytest.mark.parametrize("mm, text", [
    (3.5 * 25.4, '3 1/2"'),
    (25.4 * (3 + 7 / 16), '3 7/16"'),
    (25.4 / 32, '1/32"'),
    (25.4 * 2, '2"'),
    (25.4 * (1 + 1 / 33), '1 1/32"'),  # nearest 32nd
])
def test_format_inches(mm, text):
    assert format_inches(mm) == text


def test_format_tape():
    assert format_tape(25.4 * (5 * 12 + 3 + 7 / 16)) == "5' 3 7/16\""
    assert format_tape(25.4 * 9.5) == '9 1/2"'
    assert format_tape(25.4 * 11.999) == "1' 0\""
    assert format_mm(1234.56) == "1234.6 mm"


@settings(max_examples=300, deadline=None)
@given(st.integers(min_value=0, max_value=32 * 12 * 60))
def test_inch_round_trip(thirty_seconds):
    """Any length on a 1/32 grid prints and parses back exactly."""
    mm = thirty_seconds * MM_PER_INCH / 32
    assert parse_length(format_inches(mm), "in") == pytest.approx(mm, abs=1e-9)
    assert parse_length(format_tape(mm), "in") == pytest.approx(mm, abs=1e-9)


@settings(max_examples=300, deadline=None)
@given(st.floats(min_value=0, max_value=20000, allow_nan=False))
def test_fraction_error_at_most_a_64th(mm):
    """Printing rounds to the nearest 1/32 in: never off by more than 1/64 in."""
    back = parse_length(format_inches(mm), "in")
    assert abs(back - mm) <= MM_PER_INCH / 64 + 1e-9
    assert abs(parse_length(format_mm(mm), "mm") - mm) <= 0.05 + 1e-9


def test_stress_units():
    # 1 psi = 6894.757 Pa (NIST SP 811 conversion factors).
    assert parse_stress("1.6e6 psi", "mm") == pytest.approx(1.6e6 * 6894.757e-6, rel=1e-6)
    assert parse_stress("11 GPa", "in") == pytest.approx(11000)
    assert parse_stress(1000, "in") == pytest.approx(6.894757, rel=1e-6)
    assert math.isclose(parse_stress(70, "mm"), 70)
