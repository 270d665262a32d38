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
