"""Column conversion: the vectorised reader agrees with parse_quantity cell by cell.

The importer reads plain "number unit" cells by parsing each distinct unit text once
(partpick.catalog.cells); every other cell goes through partpick.units.parse_quantity. Both
must give the same SI value, or the same refusal, for any text. Prefix factors per the SI
Brochure (BIPM, 9th ed., Table 7); letter codes per IEC 60062:2016.
"""

from __future__ import annotations

import itertools
import math

import numpy as np
import pandas as pd
import pytest
from hypothesis import given
from hypothesis import strategies as st

from partpick.catalog.cells import convert_column
from partpick.errors import UnitError
from partpick.fields import field_of
from partpick.units import format_eng, parse_quantity

NUMBERS = ("4.7", "10", "0.5", ".47", "1e-3", "-3.2", "0", "+22", "1.5E2")
UNITS = ("", "uH", "µH", "nH", "mH", "H", "uF", "mΩ", "Ohm", "A", "mA", "V", "MHz", "%",
         "uH max", "mΩ typ.", "parsecs", "u", "k")  # fmt: skip
OTHERS = ("4u7", "2n2", "1k5", "R47", "4,7 uH", "-55 ~ 125", "±20%", "-", "N/A", "", "see note",
          "$0.42", "12,000", "120 mΩ @ 100 kHz", "inf", "nan", "1/2")  # fmt: skip
CELLS = [f"{n}{sp}{u}" for n, u, sp in itertools.product(NUMBERS, UNITS, ("", " "))] + list(OTHERS)
FIELDS = [("inductor", "inductance_h"), ("inductor", "dcr_ohm"), ("inductor", "isat_a"),
          ("inductor", "tolerance"), ("inductor", "stock"), ("capacitor", "temp_max_degc"),
          ("mosfet", "vds_v"), ("diode", "qrr_c"), ("inductor", "unit_price")]  # fmt: skip


def _expected(text: str, kind: str, name: str, scale: float) -> float | None:
    """Return a cell's value by parse_quantity and the field's limits; None if refused."""
    f = field_of(kind, name)
    try:
        value = parse_quantity(text, f.unit, scale=scale)
    except UnitError:
        return None
    if math.isnan(value):
        return math.nan
    value = abs(value) if f.magnitude else value
    if math.isinf(value) or (f.positive and value <= 0) or (value < 0 and f.unit != "degC"):
        return None
    if f.type == "int" and value != math.floor(value):
        return None
    return value


@pytest.mark.parametrize(("kind", "name"), FIELDS)
@pytest.mark.parametrize("scale", [1.0, 1e-3])
def test_vectorised_reading_matches_parse_quantity(kind, name, scale):
    f = field_of(kind, name)
    cells = pd.Series(CELLS * 2, dtype="str")  # repeated, as catalog columns are
    got = convert_column(cells, f, scale=scale)
    for i, text in enumerate(cells):
        want = _expected(text, kind, name, scale)
        if want is None:
            assert got.bad[i] and got.reasons[i], (text, got.values[i])
            assert math.isnan(got.values[i])
        elif math.isnan(want):
            assert not got.bad[i] and math.isnan(got.values[i]), text
        else:
            assert not got.bad[i], (text, got.reasons[i])
            assert got.values[i] == want, text  # the same single rounding on both paths


@given(
    value=st.floats(min_value=1e-12, max_value=1e9, allow_nan=False),
    unit=st.sampled_from(["H", "F", "ohm", "A", "V", "Hz", "s", "C"]),
)
def test_engineering_text_reads_back_within_its_digits(value, unit):
    # format_eng keeps 3 significant figures, so reading it back is within half a unit of the
    # third figure: at worst 0.5 in 100, i.e. 0.5 %.
    assert parse_quantity(format_eng(value, unit), unit) == pytest.approx(value, rel=5e-3)


@pytest.mark.parametrize(
    ("text", "code"),
    [("C0G", "c0g"), ("NP0", "c0g"), ("C0G (NP0)", "c0g"), ("COG", "c0g"), ("X5R", "x5r"),
     ("x7r", "x7r"), ("X7S", "x7s"), ("X6S", "x6s"), ("X8R", "x8r"), ("Y5V", "y5v"),
     ("Aluminum Electrolytic", "al-electrolytic"), ("Aluminium electrolytic", "al-electrolytic"),
     ("Al-Polymer", "al-polymer"), ("Aluminum Polymer", "al-polymer"), ("Tantalum", "ta-mno2"),
     ("Tantalum MnO2", "ta-mno2"), ("Tantalum Polymer", "ta-polymer"), ("Film", "film"),
     ("Polypropylene", "film"), ("-", None)],
)  # fmt: skip
def test_dielectric_spellings_normalise(text, code):
    got = convert_column(pd.Series([text], dtype="str"), field_of("capacitor", "dielectric"))
    assert got.values[0] == code and not got.bad[0]


@pytest.mark.parametrize(
    ("kind", "name", "text", "value"),
    [("diode", "diode_type", "Schottky Barrier", "schottky"), ("diode", "diode_type", "SiC", "sic"),
     ("diode", "diode_type", "Ultrafast", "fast"), ("diode", "diode_type", "Rectifier", "standard"),
     ("mosfet", "channel", "N-Channel", "n"), ("mosfet", "channel", "P-CH", "p"),
     ("inductor", "lifecycle", "Not Recommended for New Designs", "nrnd"),
     ("inductor", "lifecycle", "Discontinued", "obsolete"),
     ("inductor", "shielded", "Y", True), ("inductor", "shielded", "Unshielded", False),
     ("inductor", "shielded", "semi-shielded", False),  # not fully shielded
     ("inductor", "shielded", "", None)],
)  # fmt: skip
def test_enum_and_yes_no_spellings(kind, name, text, value):
    got = convert_column(pd.Series([text], dtype="str"), field_of(kind, name))
    assert got.values[0] == value and not got.bad[0]


def test_text_columns_are_stripped_and_markers_are_missing():
    cells = pd.Series(["  QM-1 ", "N/a", "none", "—", "Quillmark Magnetics"], dtype="str")
    got = convert_column(cells, field_of("inductor", "manufacturer"))
    assert list(got.values) == ["QM-1", None, None, None, "Quillmark Magnetics"]
    assert not np.any(got.bad)


def test_an_imported_cell_is_the_float_nearest_to_what_was_written():
    # IEEE 754-2019 §5.12.2: float("1e-05") is the nearest float to 10 µH; the importer's
    # vectorised path must land on it, as parse_quantity does ("10" × 1e-6 would not).
    cells = pd.Series(["10 uH", "4.7 uH", "0.33 uH", "22 uH"], dtype="str")
    got = convert_column(cells, field_of("inductor", "inductance_h"))
    assert list(got.values) == [1e-05, 4.7e-06, 3.3e-07, 2.2e-05]
