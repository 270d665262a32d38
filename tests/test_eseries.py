"""IEC 60063 preferred number series and the standard-value lookups."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from partpick.design.eseries import E_SERIES, e_values_between, next_e_value
from partpick.errors import SpecError

# IEC 60063:2015, "Preferred number series for resistors and capacitors", table of E6/E12/E24.
IEC_60063_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]
IEC_60063_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8]
IEC_60063_E24 = [
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
    3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
]  # fmt: skip


@pytest.mark.parametrize(
    ("series", "published"),
    [("E6", IEC_60063_E6), ("E12", IEC_60063_E12), ("E24", IEC_60063_E24)],
)
def test_series_tables_match_iec_60063(series, published):
    # IEC 60063:2015
    assert list(E_SERIES[series]) == published


def test_each_series_nests_in_the_next():
    # IEC 60063: E6 is every second E12 value, E12 every second E24 value.
    assert list(E_SERIES["E12"][::2]) == IEC_60063_E6
    assert list(E_SERIES["E24"][::2]) == IEC_60063_E12


@pytest.mark.parametrize(
    ("x", "series", "expected"),
    [
        (4.7e-6, "E12", 4.7e-6),  # an exact series value is its own next value
        (4.71e-6, "E12", 5.6e-6),
        (9.797e-6, "E12", 10e-6),  # crosses into the next decade
        (8.3, "E12", 10.0),
        (1.0, "E12", 1.0),
        (0.00099, "E12", 0.001),
        (1.3, "E12", 1.5),
        (1.3, "E24", 1.3),
        (9.11, "E24", 10.0),
        (7.0, "E6", 10.0),
        (150e3, "E12", 150e3),
        (2.01e-12, "e12", 2.2e-12),  # series names are not case sensitive
    ],
)
def test_next_e_value(x, series, expected):
    # IEC 60063 E-series values, repeated in every decade
    assert next_e_value(x, series) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("bad", [0.0, -1.0, math.nan, math.inf])
def test_next_e_value_rejects_non_positive_or_non_finite(bad):
    with pytest.raises(ValueError):
        next_e_value(bad)


def test_unknown_series_is_a_spec_error():
    with pytest.raises(SpecError) as info:
        next_e_value(1.0, "E7")
    assert info.value.key == "series"


@pytest.mark.parametrize(
    ("lo", "hi", "series", "expected"),
    [
        (9.8e-6, 19.6e-6, "E12", [10e-6, 12e-6, 15e-6, 18e-6]),
        (10.5e-6, 11.55e-6, "E12", []),  # falls between 10 µH and 12 µH
        (10.5e-6, 11.55e-6, "E24", [11e-6]),
        (0.8, 1.3, "E6", [1.0]),
        (4.7e-6, 4.7e-6, "E12", [4.7e-6]),
        (2.0, 1.0, "E12", []),  # an inverted window holds nothing
    ],
)
def test_e_values_between(lo, hi, series, expected):
    # IEC 60063 E-series values
    assert e_values_between(lo, hi, series) == pytest.approx(expected, rel=1e-12)


@given(st.floats(min_value=1e-13, max_value=1e9, allow_nan=False))
def test_next_e12_value_is_the_closest_series_value_above(x):
    value = next_e_value(x, "E12")
    mantissa = value / 10 ** math.floor(math.log10(value) + 1e-12)
    assert value >= x * (1 - 1e-9)
    assert any(math.isclose(mantissa, m, rel_tol=1e-9) for m in IEC_60063_E12)
    # The widest E12 step is 1.2 -> 1.5 (IEC 60063), so the next value is within 25 %.
    assert value <= x * 1.25 * (1 + 1e-9)
