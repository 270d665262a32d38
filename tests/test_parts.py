"""Browsing with ``partpick parts``: the --where grammar, bound parameters, output formats."""

from __future__ import annotations

import csv
import io
import json

import pytest
from rich.console import Console

from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts, parse_condition
from partpick.cli import app
from partpick.errors import QueryError
from partpick.fields import PROVENANCE_COLUMNS, fields_of
from partpick.render.catalog import render_parts_table
from tests.conftest import CATALOG_DATA

SMALL = CATALOG_DATA / "inductors_small.csv"
CAPS = CATALOG_DATA / "capacitors_small.csv"


@pytest.fixture
def filled(catalog_db):
    """Function scope: a catalog holding the small inductor and capacitor files."""
    import_catalog(catalog_db, [SMALL], "inductor")
    import_catalog(catalog_db, [CAPS], "capacitor")
    return catalog_db


@pytest.mark.parametrize(
    ("kind", "conditions", "expected"),
    [
        # Isat of the small file: 9.5, 6.8, 4.6, 3.1, 4.4, 1.9 A
        ("inductor", ["isat_a>=4.6"], {"QM-1R0-0630", "QM-2R2-0630", "QM-4R7-0630"}),
        ("inductor", ["isat_a>=4.6A"], {"QM-1R0-0630", "QM-2R2-0630", "QM-4R7-0630"}),
        ("inductor", ["isat_a > 4600 mA"], {"QM-1R0-0630", "QM-2R2-0630"}),
        ("inductor", ["inductance_h<=10uH", "isat_a<4"], {"QM-100-0630"}),
        ("inductor", ["inductance_h=4u7"], {"QM-4R7-0630"}),  # IEC 60062 letter code
        ("inductor", ["dcr_ohm<20mOhm"], {"QM-1R0-0630", "QM-2R2-0630"}),
        ("inductor", ["shielded=no"], {"BT-470-0805U"}),
        ("inductor", ["lifecycle!=active"], {"QM-100-0630", "BT-470-0805U"}),
        ("inductor", ["lifecycle=EOL"], {"BT-470-0805U"}),  # alias of obsolete
        ("inductor", ["srf_hz=-"], {"BT-470-0805U"}),  # missing value
        ("inductor", ["stock!=N/A", "stock<1000"], {"QM-220-1040"}),
        ("inductor", ["manufacturer=Brindle Toroids"], {"BT-470-0805U"}),
        ("inductor", ["mpn=QM-4R7-0630"], {"QM-4R7-0630"}),
        ("capacitor", ["dielectric=x7r"], {"OR-106-X7R-50"}),
        ("capacitor", ["dielectric=NP0"], {"OR-104-C0G-100"}),
        ("capacitor", ["voltage_v>=35V", "esr_ohm<=0.1"], {"OR-106-X7R-50", "OR-104-C0G-100"}),
        ("capacitor", ["capacitance_f>=100uF"], {"VL-221-AE-35", "VL-330-TA-16"}),
    ],
)
def test_where_selects_the_right_parts(filled, kind, conditions, expected):
    assert {p["mpn"] for p in list_parts(filled, kind, conditions)} == expected


@pytest.mark.parametrize(
    ("text", "reason_part"),
    [
        ("isat_a", "expected FIELD OP VALUE"),
        ("isat_a>=", "no value"),
        (">=3", "expected FIELD OP VALUE"),
        ("isat>=3", "not a field of an inductor"),
        ("capacitance_f>=1uF", "not a field"),  # a capacitor field asked of inductors
        ("isat_a>=3V", "voltage"),
        ("isat_a>=lots", "not a number"),
        ("dielectric=x7r", "not a field"),
        ("shielded>=yes", "only = and !="),
        ("lifecycle=undead", "not one of"),
        ("shielded=perhaps", "yes or no"),
        ("srf_hz<-", "missing value"),
        ("isat_a=>3", "not a number"),
    ],
)
def test_bad_conditions_raise_query_error(text, reason_part):
    with pytest.raises(QueryError) as caught:
        parse_condition(text, "inductor")
    assert reason_part in caught.value.reason and caught.value.text == text


@pytest.mark.parametrize(
    "attempt",
    [
        "mpn=x' OR '1'='1",
        "mpn=QM-1R0-0630'; DROP TABLE parts_inductor; --",
        'manufacturer=" OR 1=1 --',
    ],
)
def test_injection_in_a_text_value_is_only_a_value(filled, attempt):
    assert list_parts(filled, "inductor", [attempt]) == []
    assert len(list_parts(filled, "inductor")) == 6  # the table is intact


@pytest.mark.parametrize(
    "attempt",
    [
        "isat_a>=1 OR 1=1",
        "isat_a>=1; DROP TABLE parts_inductor",
        "isat_a OR 1=1>=1",
        "1=1",
        "__import__('os')=1",
    ],
)
def test_injection_in_a_field_or_number_is_refused(filled, attempt):
    with pytest.raises(QueryError):
        list_parts(filled, "inductor", [attempt])
    assert len(list_parts(filled, "inductor")) == 6


def test_json_is_keyed_by_canonical_fields_with_si_floats_and_null(runner, filled):
    result = runner.invoke(app, ["parts", "--kind", "inductor", "--format", "json", "--db", filled])
    assert result.exit_code == 0, result.output
    parts = json.loads(result.output)
    assert len(parts) == 6
    keys = [f.name for f in fields_of("inductor")] + list(PROVENANCE_COLUMNS)
    assert all(list(p) == keys for p in parts)
    assert {p["source_file"] for p in parts} == {"inductors_small.csv"}
    part = {p["mpn"]: p for p in parts}["QM-4R7-0630"]
    assert part["inductance_h"] == pytest.approx(4.7e-6)  # 4.7 uH in henries
    assert part["dcr_ohm"] == pytest.approx(0.032)
    assert {p["mpn"]: p for p in parts}["BT-470-0805U"]["srf_hz"] is None


def test_csv_output_reimports_to_the_same_parts(runner, filled, tmp_path):
    result = runner.invoke(app, ["parts", "--kind", "inductor", "--format", "csv", "--db", filled])
    assert result.exit_code == 0, result.output
    exported = tmp_path / "exported.csv"
    exported.write_text(result.output, encoding="utf-8")
    other = str(tmp_path / "other.db")
    (report,) = import_catalog(other, [exported], "inductor")
    assert report.rejected == 0 and report.unrecognised == ()
    assert list_parts(other, "inductor") == list_parts(filled, "inductor")


def test_csv_output_neutralises_formula_text(runner, catalog_db, write_csv):
    import_catalog(catalog_db, [write_csv("MPN,Inductance\n=cmd|x,1 uH\n")], "inductor")
    args = ["parts", "--kind", "inductor", "--format", "csv", "--db", catalog_db]
    result = runner.invoke(app, args)
    (row,) = list(csv.DictReader(io.StringIO(result.output)))
    assert row["mpn"] == "'=cmd|x"


def test_table_shows_engineering_units(filled):
    out = io.StringIO()
    render_parts_table(Console(file=out, width=100, color_system=None), "inductor",
                       list_parts(filled, "inductor", ["mpn=QM-4R7-0630"]))  # fmt: skip
    text = out.getvalue()
    assert "QM-4R7-0630" in text and "Quillmark Magnetics" in text
    for cell in ("4.7 µH", "4.6 A", "32 mΩ", "38 MHz", "yes", "0.32", "3900"):
        assert cell in text


@pytest.mark.parametrize(
    ("args", "code", "message"),
    [
        (["--kind", "inductor", "--where", "isat_a>=3V"], 2, "voltage"),
        (["--kind", "resistor"], 2, "no part kind"),
        (["--kind", "inductor", "--format", "yaml"], 2, "yaml"),
    ],
)
def test_parts_errors_exit_2_without_traceback(runner, filled, args, code, message):
    result = runner.invoke(app, ["parts", *args, "--db", filled])
    assert result.exit_code == code, result.output
    assert message in result.output and "Traceback" not in result.output


def test_parts_table_on_an_empty_catalog(runner, catalog_db):
    from partpick.catalog.store import open_engine

    open_engine(catalog_db)  # a catalog with its tables and no parts
    result = runner.invoke(app, ["parts", "--kind", "diode", "--db", catalog_db])
    assert result.exit_code == 0, result.output
    assert "0 diode part(s)" in result.output


def test_parts_csv_and_json_show_values_as_written(runner, catalog_db, write_csv):
    # IEEE 754-2019 §5.12.2: "1e-05" is the float nearest 10 µH; 4.7 µH and 33 mΩ likewise.
    # A float product would print 9.999999999999999e-06; the export must print what was written.
    text = "MPN,Inductance,DCR\nPP-X1,10 uH,33 mOhm\nPP-X2,4.7 uH,0.33 Ohm\n"
    import_catalog(catalog_db, [write_csv(text)], "inductor")
    args = ["parts", "--kind", "inductor", "--db", catalog_db, "--format"]
    rows = {
        r["mpn"]: r for r in csv.DictReader(io.StringIO(runner.invoke(app, [*args, "csv"]).output))
    }
    assert (rows["PP-X1"]["inductance_h"], rows["PP-X1"]["dcr_ohm"]) == ("1e-05", "0.033")
    assert rows["PP-X2"]["inductance_h"] == "4.7e-06"
    raw = runner.invoke(app, [*args, "json"]).output
    assert '"inductance_h": 1e-05' in raw and "9999999" not in raw
