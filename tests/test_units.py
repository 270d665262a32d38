"""partpick.units: catalog text to SI floats and back.

Prefix factors are those of the SI Brochure (BIPM, 9th edition 2019, Table 7); letter codes
follow IEC 60062:2016 (marking codes for resistors and capacitors, the "RKM" letter code where
the letter stands for the decimal point and gives the multiplier). Expected values below are
worked by hand from those tables.
"""

from __future__ import annotations

import itertools
import math

import pint
import pytest
from hypothesis import given
from hypothesis import strategies as st

from partpick.errors import UnitError
from partpick.units import (
    format_eng,
    is_missing,
    parse_quantity,
    unit_dimensions,
    unit_multiplier,
)

REL = 1e-12


@pytest.mark.parametrize(
    ("text", "unit", "expected"),
    [
        # SI prefixes, SI Brochure Table 7: p=1e-12, n=1e-9, µ=1e-6, m=1e-3, k=1e3, M=1e6, G=1e9
        ("4.7 uH", "H", 4.7e-6),
        ("4.7µH", "H", 4.7e-6),  # U+00B5 micro sign
        ("4.7 μH", "H", 4.7e-6),  # U+03BC Greek mu
        ("4700 nH", "H", 4.7e-6),
        ("0.01 mH", "H", 1e-5),
        ("100n", "F", 100e-9),
        ("22 pF", "F", 22e-12),
        ("2.2 GHz", "Hz", 2.2e9),
        ("1.5 MHz", "Hz", 1.5e6),
        ("45 mΩ", "ohm", 0.045),  # U+03A9 Greek omega
        ("45 mΩ", "ohm", 0.045),  # U+2126 ohm sign
        ("45 mOhm", "ohm", 0.045),
        ("45 mohm", "ohm", 0.045),
        ("2 ohms", "ohm", 2.0),
        ("6200 mA", "A", 6.2),
        ("50 VDC", "V", 50.0),
        ("1.5 kV", "V", 1500.0),
        ("35 ns", "s", 35e-9),
        ("15 nC", "C", 15e-9),
        ("2 W", "W", 2.0),
        ("125 °C", "degC", 125.0),
        ("125degC", "degC", 125.0),
        ("62 °C/W", "degC/W", 62.0),
        ("1.6 mm", "mm", 1.6),
        ("2000 h", "h", 2000.0),
        ("1e-6 H", "H", 1e-6),
        # IEC 60062 letter code: the letter marks the decimal point and sets the multiplier
        ("4u7", "H", 4.7e-6),  # 4.7 × 1e-6
        ("2n2", "F", 2.2e-9),  # 2.2 × 1e-9
        ("1k5", "ohm", 1500.0),  # 1.5 × 1e3
        ("4k7", "ohm", 4700.0),
        ("4R7", "ohm", 4.7),  # R: decimal point, multiplier 1
        ("R47", "ohm", 0.47),
        ("1M5", "ohm", 1.5e6),
        # qualifiers after the value are dropped
        ("45 mΩ max", "ohm", 0.045),
        ("45 mΩ (max)", "ohm", 0.045),
        ("0.9 V typ.", "V", 0.9),
        ("120 mΩ @ 100 kHz", "ohm", 0.12),
        # ranges keep their largest end
        ("-55°C ~ 125°C", "degC", 125.0),
        ("-40 to +105 °C", "degC", 105.0),
        # tolerances as fractions: ±20 % = 0.2
        ("±20%", "fraction", 0.2),
        ("+/-20%", "fraction", 0.2),
        ("20%", "fraction", 0.2),
        ("5 %", "fraction", 0.05),
        ("0.1", "fraction", 0.1),
        # prices and counts
        ("$0.42", "currency", 0.42),
        ("€1,234.50", "currency", 1234.5),
        ("0.11 USD", "currency", 0.11),
        ("12,000", "count", 12000.0),
        ("1200 pcs", "count", 1200.0),
    ],
)
def test_parse_quantity_reads_trade_spellings(text, unit, expected):
    assert parse_quantity(text, unit) == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize("text", ["", "  ", "-", "N/A", "n/a", "NA", "none", "?", "—"])
def test_missing_markers_give_nan(text):
    assert is_missing(text)
    assert math.isnan(parse_quantity(text, "H"))


@pytest.mark.parametrize(
    ("text", "unit", "reason_part"),
    [
        ("10 uF", "H", "capacitance"),  # a unit that contradicts the column
        ("2.2 uH", "F", "inductance"),
        ("3 V", "A", "voltage"),
        ("see datasheet", "ohm", "not a number"),
        ("4,7 µH", "H", "comma"),  # a decimal comma without decimal="," is refused
        ("3,3", "H", "comma"),
        ("4R7", "H", "unknown unit"),  # R as decimal point belongs to resistance only
        ("20", "fraction", "ambiguous"),  # a bare 20 could be 20 % or 20 as a fraction
        ("1.5", "count", "whole number"),
        ("12 parsecs", "mm", "unknown unit"),
        ("4u7 uH", "H", "letter code"),
    ],
)
def test_parse_quantity_refuses_wrong_text(text, unit, reason_part):
    with pytest.raises(UnitError) as caught:
        parse_quantity(text, unit)
    assert reason_part in caught.value.reason
    assert caught.value.text == text


@pytest.mark.parametrize(
    ("text", "unit", "expected"),
    [
        ("4,7 µH", "H", 4.7e-6),
        ("3,3", "H", 3.3),
        ("0,0116 Ohm", "ohm", 0.0116),
        ("-3,2", "A", -3.2),
    ],
)
def test_decimal_comma_reads_as_point_when_allowed(text, unit, expected):
    assert parse_quantity(text, unit, decimal_comma=True) == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize(
    ("text", "scale", "expected"),
    [
        ("45", 1e-3, 0.045),  # a bare number under a "DCR (mΩ)" header
        ("45 mΩ", 1e-3, 0.045),  # a unit in the cell wins over the header's
        ("0.05 Ω", 1e-3, 0.05),
    ],
)
def test_scale_applies_to_bare_numbers_only(text, scale, expected):
    assert parse_quantity(text, "ohm", scale=scale) == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize(
    ("unit_text", "unit", "expected"),
    [("mΩ", "ohm", 1e-3), ("uH", "H", 1e-6), ("µH", "H", 1e-6), ("A", "A", 1.0),
     ("%", "fraction", 0.01), ("MHz", "Hz", 1e6), ("mOhm", "ohm", 1e-3), ("nC", "C", 1e-9)],
)  # fmt: skip
def test_unit_multiplier(unit_text, unit, expected):
    assert unit_multiplier(unit_text, unit) == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize(("unit_text", "unit"), [("mA", "H"), ("Isat", "A"), ("kg", "V")])
def test_unit_multiplier_refuses_other_dimensions(unit_text, unit):
    with pytest.raises(UnitError):
        unit_multiplier(unit_text, unit)


@pytest.mark.parametrize(
    ("text", "has"), [("mΩ", "ohm"), ("uH", "H"), ("A", "A"), ("%", "fraction"), ("Isat", None)]
)
def test_unit_dimensions(text, has):
    found = unit_dimensions(text)
    assert (has in found) if has else found == ()


@pytest.mark.parametrize(
    ("value", "unit", "text"),
    [(4.7e-6, "H", "4.7 µH"), (0.045, "ohm", "45 mΩ"), (2.2e-9, "F", "2.2 nF"),
     (400e3, "Hz", "400 kHz"), (0.2, "fraction", "20 %"), (125.0, "degC", "125 °C"),
     (None, "A", "—"), (math.nan, "V", "—"), (1.0, "A", "1 A")],
)  # fmt: skip
def test_format_eng(value, unit, text):
    assert format_eng(value, unit) == text


# --- cross-check against pint (a general-purpose units library) -----------------------
# pint reads plain SI spellings correctly, so on normalised strings both must agree. Prefix
# factors: SI Brochure (BIPM, 9th ed.), Table 7. Units: SI Brochure Table 4 (derived units).
_UREG = pint.UnitRegistry()
_PINT_UNITS = {"H": "H", "F": "F", "ohm": "ohm", "A": "A", "V": "V", "W": "W", "Hz": "Hz",
               "s": "s", "C": "C"}  # fmt: skip
_PINT_BASE = {"H": "H", "F": "F", "ohm": "ohm", "A": "A", "V": "V", "W": "W", "Hz": "Hz",
              "s": "s", "C": "C"}  # fmt: skip
_MANTISSAS = ("1", "2.2", "4.7", "10", "33", "68", "100", "470", "0.5", "0.047", "1.5e2")
_SI_PREFIXES = ("", "p", "n", "u", "m", "k", "M", "G")


def _pint_value(text: str, unit: str) -> float:
    return _UREG.Quantity(text).to(_PINT_BASE[unit]).magnitude


def test_parser_agrees_with_pint_over_a_generated_grid():
    checked = 0
    for mantissa, prefix, unit, space in itertools.product(
        _MANTISSAS, _SI_PREFIXES, _PINT_UNITS, ("", " ")
    ):
        text = f"{mantissa}{space}{prefix}{_PINT_UNITS[unit]}"
        assert parse_quantity(text, unit) == pytest.approx(_pint_value(text, unit), rel=1e-9), text
        checked += 1
    assert checked == len(_MANTISSAS) * len(_SI_PREFIXES) * len(_PINT_UNITS) * 2


@given(
    mantissa=st.floats(min_value=1e-3, max_value=1e4, allow_nan=False, allow_infinity=False),
    prefix=st.sampled_from(_SI_PREFIXES),
    unit=st.sampled_from(sorted(_PINT_UNITS)),
)
def test_parser_agrees_with_pint_on_random_values(mantissa, prefix, unit):
    text = f"{mantissa!r} {prefix}{_PINT_UNITS[unit]}"
    assert parse_quantity(text, unit) == pytest.approx(_pint_value(text, unit), rel=1e-9)


# Trade spellings pint misreads or refuses, read here on the IEC 60062 / SI Brochure rules.
def test_pint_misreads_a_decimal_comma_which_partpick_refuses_or_reads_right():
    # pint drops the comma: "4,7 µH" becomes 47 µH, ten times too much.
    assert _UREG.Quantity("4,7 uH").to("uH").magnitude == pytest.approx(47.0)
    with pytest.raises(UnitError):
        parse_quantity("4,7 µH", "H")
    # With decimal="," in the map file it is 4.7 µH = 4.7e-6 H.
    assert parse_quantity("4,7 µH", "H", decimal_comma=True) == pytest.approx(4.7e-6, rel=REL)


@pytest.mark.parametrize(
    ("text", "unit", "expected"),
    [("45 mOhm", "ohm", 0.045), ("4k7", "ohm", 4700.0), ("2n2", "F", 2.2e-9), ("R33", "ohm", 0.33)],
)
def test_pint_refuses_trade_spellings_partpick_reads(text, unit, expected):
    with pytest.raises(pint.errors.UndefinedUnitError):
        _UREG.Quantity(text)
    assert parse_quantity(text, unit) == pytest.approx(expected, rel=REL)


# Python's float() of a decimal string is correctly rounded (IEEE 754-2019 §5.12.2: conversion
# from decimal character sequences rounds once, to nearest). So float("1e-05") is the float
# nearest to 10 µH, and a parsed "10 uH" must be that very float, not 9.999999999999999e-06.
@pytest.mark.parametrize(
    ("text", "unit", "exact"),
    [
        ("10 uH", "H", "1e-05"),
        ("4.7 uH", "H", "4.7e-06"),
        ("4u7", "H", "4.7e-06"),
        ("2n2", "F", "2.2e-09"),
        ("33 mOhm", "ohm", "0.033"),
        ("0.1 uF", "F", "1e-07"),
        ("680 pF", "F", "6.8e-10"),
        ("1.5 kHz", "Hz", "1500"),
    ],
)
def test_a_written_value_parses_to_the_nearest_float(text, unit, exact):
    assert parse_quantity(text, unit) == float(exact)


def test_every_three_digit_value_at_every_prefix_parses_to_the_nearest_float():
    # Every three-digit mantissa (so every E96/E192-style value of IEC 60063) with every SI
    # prefix; the nearest float is float() of the same value in exponent form (IEEE 754-2019
    # §5.12.2). Multiplying float("4.7") by 1e-6 misses it for about a third of them.
    for digits in range(100, 1000):
        for prefix, exponent in [("p", -12), ("n", -9), ("u", -6), ("m", -3), ("k", 3)]:
            text = f"{digits / 100:.2f} {prefix}F"
            assert parse_quantity(text, "F") == float(f"{digits}e{exponent - 2}"), text


def test_a_header_unit_scales_bare_numbers_without_float_noise():
    # "10" in a column headed "L [µH]" is 10 µH, exactly the float nearest 1e-05
    # (IEEE 754-2019 §5.12.2).
    assert parse_quantity("10", "H", scale=1e-6) == 1e-05
    assert parse_quantity(10, "H", scale=1e-6) == 1e-05
