"""Spreadsheet-safe CSV, JSON without NaN, and atomic writes."""

import csv
import io
import json
import os

import pytest

from partpick.render import exports


@pytest.mark.parametrize(
    ("cell", "expected"),
    [
        # OWASP, "CSV Injection": cells starting with = + - @ tab or CR are formulas to a
        # spreadsheet, so they get a leading apostrophe.
        ("=1+2", "'=1+2"),
        ("+CMD", "'+CMD"),
        ("-2+3", "'-2+3"),
        ("@SUM(A1)", "'@SUM(A1)"),
        ("\tTAB", "'\tTAB"),
        ("\rCR", "'\rCR"),
        ("QM-4R7", "QM-4R7"),  # a dash inside is harmless
        ("", ""),
        (None, ""),
        # numbers stay numbers, negative ones included
        (1.5, 1.5),
        (-0.25, -0.25),
        (3, 3),
    ],
)
def test_neutralise_cell(cell, expected):
    assert exports.neutralise_cell(cell) == expected


def test_csv_text_round_trips_numbers():
    text = exports.csv_text(["mpn", "price"], [["=BAD()", 0.42], ["OK-1", 1.0]])
    rows = list(csv.reader(io.StringIO(text)))
    assert rows == [["mpn", "price"], ["'=BAD()", "0.42"], ["OK-1", "1.0"]]


def test_json_has_no_nan():
    document = json.loads(exports.json_text({"a": float("nan"), "b": [1.0, float("inf")]}))
    assert document == {"a": None, "b": [1.0, None]}


def test_atomic_write_replaces_whole(tmp_path):
    target = tmp_path / "bom.csv"
    target.write_text("old")
    exports.write_atomically(target, "new")
    assert target.read_text() == "new"


def test_atomic_write_leaves_the_old_file_when_it_fails(tmp_path, monkeypatch):
    target = tmp_path / "bom.csv"
    target.write_text("old and complete")

    def broken_replace(src, dst):
        raise OSError("disk full")

    monkeypatch.setattr(os, "replace", broken_replace)
    with pytest.raises(OSError):
        exports.write_atomically(target, "new but never finished")
    assert target.read_text() == "old and complete"
    assert [p.name for p in tmp_path.iterdir()] == ["bom.csv"]


def test_markdown_table_escapes_pipes():
    text = exports.markdown_table(["a", "b"], [["x|y", 1]])
    assert text.splitlines() == ["| a | b |", "|---|---|", "| x\\|y | 1 |"]


# 0.1 + 0.2 is 0.30000000000000004 in IEEE 754 binary64 (the classic example of float noise,
# Goldberg, "What Every Computer Scientist Should Know About Floating-Point Arithmetic", 1991);
# 5.48 summed from 1.42 + 3 × 0.2 + … reaches 5.4799999999999995 the same way.
@pytest.mark.parametrize(
    ("value", "written"),
    [(0.1 + 0.2, "0.3"), (5.4799999999999995, "5.48"), (9.999999999999999e-06, "1e-05"),
     (1 / 3, "0.333333333333"), (123456789012345.0, "123456789012000.0")],
)  # fmt: skip
def test_csv_and_json_numbers_carry_at_most_twelve_significant_digits(value, written):
    assert exports.csv_text(["x"], [[value]]).splitlines()[1] == written
    assert json.loads(exports.json_text({"x": value}))["x"] == float(written)
    assert f'"x": {written}' in exports.json_text({"x": value})


def _significant_digits(value: float) -> int:
    mantissa = repr(value).lower().split("e")[0].replace("-", "").replace(".", "")
    return len(mantissa.strip("0"))


def test_the_vectorised_rounding_leaves_no_float_noise_at_any_magnitude():
    # Same IEEE 754 property as above: the 12-digit decimal's nearest float has a repr of at
    # most 12 significant digits; from 1e-15 to 1e15, through the exact and fallback paths.
    import numpy as np

    rng = np.random.default_rng(3)
    values = rng.uniform(1, 10, 4000) * 10.0 ** rng.integers(-15, 15, 4000)
    tidied = exports.tidy_array(np.concatenate([values, [0.1 + 0.2, 0.0, -5.4799999999999995]]))
    assert max(_significant_digits(v) for v in tidied.tolist()) <= 12
    assert np.allclose(tidied[:4000], values, rtol=1e-11)
    assert tidied[-3:].tolist() == [0.3, 0.0, -5.48]
