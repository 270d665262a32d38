"""Header matching against the data dictionary, header units, and map files."""

from __future__ import annotations

import pytest

from partpick.catalog.headers import load_map, match_headers
from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.errors import CatalogFormatError, MapFileError
from partpick.fields import KINDS, fields_of, fold_text
from tests.conftest import BUNDLED_CATALOGS

# The trade wordings the catalog must recognise (issue 2, section 3), per kind.
TRADE_HEADERS = [
    ("inductor", "Part Number", "mpn"),
    ("inductor", "Mfr Part Number", "mpn"),
    ("inductor", "MPN", "mpn"),
    ("inductor", "Manufacturer", "manufacturer"),
    ("inductor", "Inductance", "inductance_h"),
    ("inductor", "Saturation Current (Isat)", "isat_a"),
    ("inductor", "RMS Current", "irms_a"),
    ("inductor", "DC Resistance", "dcr_ohm"),
    ("inductor", "DCR", "dcr_ohm"),
    ("inductor", "Tolerance", "tolerance"),
    ("capacitor", "Capacitance", "capacitance_f"),
    ("capacitor", "Voltage Rating", "voltage_v"),
    ("capacitor", "Rated Voltage", "voltage_v"),
    ("capacitor", "Dielectric", "dielectric"),
    ("capacitor", "ESR", "esr_ohm"),
    ("capacitor", "Ripple Current", "ripple_a"),
    ("diode", "Reverse Voltage (Vrrm)", "vrrm_v"),
    ("diode", "Average Forward Current", "if_avg_a"),
    ("diode", "Forward Voltage", "vf_v"),
    ("diode", "Max Junction Temperature", "tj_max_degc"),
    ("diode", "Thermal Resistance Theta JA", "theta_ja_degc_w"),
    ("mosfet", "Drain-Source Voltage (Vds)", "vds_v"),
    ("mosfet", "Continuous Drain Current (Id)", "id_a"),
    ("mosfet", "Rds(on)", "rds_on_ohm"),
    ("mosfet", "Gate Charge (Qg)", "qg_c"),
    ("mosfet", "Qgd", "qgd_c"),
    ("mosfet", "Coss", "coss_f"),
    ("mosfet", "Price", "unit_price"),
    ("mosfet", "Unit Price", "unit_price"),
    ("mosfet", "Stock", "stock"),
    ("mosfet", "Lifecycle", "lifecycle"),
    ("mosfet", "Package", "package"),
    # case, punctuation, spacing and a unit in brackets do not matter
    ("inductor", "  saturation-current (ISAT) [A] ", "isat_a"),
    ("inductor", "D.C. resistance", "dcr_ohm"),
    ("inductor", "isat_a", "isat_a"),  # canonical names always match
    ("inductor", "DC Resistance (DCR) Max (mΩ)", "dcr_ohm"),
    ("inductor", "L (mm)", "length_mm"),  # not inductance in millimetres
    ("mosfet", "RDS(on) (mΩ)", "rds_on_ohm"),
]


@pytest.mark.parametrize(("kind", "header", "field"), TRADE_HEADERS)
def test_trade_header_wordings_match_their_field(kind, header, field):
    plan = match_headers([header], kind, None, "x.csv")
    assert [m.field for m in plan.matches] == [field]


@pytest.mark.parametrize(
    ("header", "unit_text", "scale"),
    [("DCR (mΩ)", "mΩ", 1e-3), ("Inductance [uH]", "uH", 1e-6), ("Isat, A", "A", 1.0),
     ("SRF {MHz}", "MHz", 1e6), ("Tolerance (%)", "%", 0.01), ("DCR", None, 1.0)],
)  # fmt: skip
def test_header_units_give_the_column_scale(header, unit_text, scale):
    (match,) = match_headers([header], "inductor", None, "x.csv").matches
    assert (match.unit_text, match.scale) == (unit_text, pytest.approx(scale))


def test_unknown_headers_are_unrecognised_not_dropped():
    plan = match_headers(["MPN", "Bin", "Colour"], "inductor", None, "x.csv")
    assert plan.unrecognised == ("Bin", "Colour")


@pytest.mark.parametrize("kind", KINDS)
def test_no_folded_wording_reads_as_two_fields_of_one_kind(kind):
    seen: dict[str, str] = {}
    for f in fields_of(kind):
        for wording in (f.name, *f.synonyms):
            key = fold_text(wording)
            assert seen.setdefault(key, f.name) == f.name, (kind, wording)


MAP_DIR_TEXT = """
kind = "inductor"
delimiter = ";"
decimal = ","
skip_rows = 2

[columns]
"Art.Nr" = "mpn"
"L nom" = "inductance_h"
"Widerstand" = "dcr_ohm"
"Lagerort" = "ignore"

[units]
inductance_h = "uH"
dcr_ohm = "mOhm"

[constants]
manufacturer = "Quillmark Magnetics"
tolerance = "±20%"
"""
VENDOR_CSV = (
    "Quillmark stock export\n"
    "generated 2026-11-30\n"
    "Art.Nr;L nom;Widerstand;Lagerort;Isat [A]\n"
    "QM-4R7;4,7;32;R1;4,6\n"
    "QM-100;10 µH;0,068 Ohm;R2;3,1\n"
)


def test_map_file_names_columns_units_constants_and_layout(db_file, write_csv, tmp_path):
    map_path = tmp_path / "vendor.toml"
    map_path.write_text(MAP_DIR_TEXT, encoding="utf-8")
    (report,) = import_catalog(db_file, [write_csv(VENDOR_CSV)], map_file=map_path)
    assert report.kind == "inductor" and report.added == 2 and report.ignored == ("Lagerort",)
    parts = {p["mpn"]: p for p in list_parts(db_file, "inductor")}
    assert parts["QM-4R7"]["inductance_h"] == pytest.approx(4.7e-6)  # 4,7 in uH
    assert parts["QM-4R7"]["dcr_ohm"] == pytest.approx(0.032)  # 32 in mOhm
    assert parts["QM-100"]["dcr_ohm"] == pytest.approx(0.068)  # the cell's own unit wins
    assert parts["QM-100"]["isat_a"] == pytest.approx(3.1)
    assert parts["QM-100"]["manufacturer"] == "Quillmark Magnetics"
    assert parts["QM-100"]["tolerance"] == pytest.approx(0.2)


def test_command_line_kind_wins_over_the_map_file(db_file, write_csv, tmp_path):
    map_path = tmp_path / "vendor.toml"
    map_path.write_text('kind = "capacitor"\n', encoding="utf-8")
    (report,) = import_catalog(
        db_file, [write_csv("MPN,Inductance\nQM-1,1 uH\n")], "inductor", map_file=map_path
    )
    assert report.kind == "inductor"


def test_bundled_messy_inductor_export_reads_through_its_map(db_file):
    root = BUNDLED_CATALOGS
    (report,) = import_catalog(
        db_file,
        [root / "messy" / "vendor_inductors_export.csv"],
        map_file=root / "maps" / "vendor_inductors.toml",
    )
    assert report.encoding == "cp1252" and report.delimiter == ";"
    assert report.added >= 1 and report.rejected >= 1


@pytest.mark.parametrize(
    ("text", "key", "reason_part"),
    [
        ("kind = 'resistor'", "kind", "unknown kind"),
        ("encoding = 'klingon-8'", "encoding", "unknown encoding"),
        ("delimiter = ':'", "delimiter", "delimiter"),
        ("decimal = ';'", "decimal", "must be one of"),
        ("skip_rows = -1", "skip_rows", "whole number"),
        ("skip_rows = 'two'", "skip_rows", "whole number"),
        ("colour = 'blue'", "colour", "unknown key"),
        ("columns = 'mpn'", "columns", "must be a table"),
        ("[columns]\nPN = 'part_no'", "columns.PN", "not a field of an inductor"),
        ("[units]\ndcr_ohm = 'mH'", "units.dcr_ohm", "not a unit of resistance"),
        ("[units]\ncolour = 'mm'", "units.colour", "not a field"),
        ("[units]\nshielded = 'mm'", "units.shielded", "takes no unit"),
        ("[constants]\ncolour = 'blue'", "constants.colour", "not a field"),
        ("[constants]\ntolerance = 'loose'", "constants.tolerance", "not a number"),
        ("[constants]\nmanufacturer = ['a', 'b']", "constants.manufacturer", "plain value"),
        ("kind = ", None, "not valid TOML"),
    ],
)
def test_bad_map_files_name_the_key(db_file, write_csv, tmp_path, text, key, reason_part):
    map_path = tmp_path / "bad.toml"
    map_path.write_text(text + "\n", encoding="utf-8")
    with pytest.raises(MapFileError) as caught:
        import_catalog(
            db_file, [write_csv("MPN,Inductance\nQM-1,1 uH\n")], "inductor", map_file=map_path
        )
    assert caught.value.key == key
    assert reason_part in caught.value.reason
    assert caught.value.file == str(map_path)


def test_missing_map_file(tmp_path):
    with pytest.raises(MapFileError) as caught:
        load_map(tmp_path / "absent.toml")
    assert "not found" in caught.value.reason


def test_two_columns_for_one_field_need_the_map_to_ignore_one(db_file, write_csv, tmp_path):
    text = "MPN,Price,Unit Price,Inductance\nQM-1,0.30,0.28,1 uH\n"
    with pytest.raises(CatalogFormatError) as caught:
        import_catalog(db_file, [write_csv(text)], "inductor")
    assert "both read as unit_price" in caught.value.reason
    map_path = tmp_path / "m.toml"
    map_path.write_text('[columns]\n"Price" = "ignore"\n', encoding="utf-8")
    import_catalog(db_file, [write_csv(text)], "inductor", map_file=map_path)
    assert list_parts(db_file, "inductor")[0]["unit_price"] == pytest.approx(0.28)
