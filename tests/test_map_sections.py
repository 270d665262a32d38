"""One map file with a section per kind: shared tables, kind tables, and no error for a
field of another kind."""

from __future__ import annotations

import pytest

from partpick.catalog.importer import import_catalog
from partpick.catalog.mapfile import load_map, map_for_kind
from partpick.catalog.query import list_parts
from partpick.errors import MapFileError
from tests.conftest import BUNDLED_CATALOGS

EXAMPLE = BUNDLED_CATALOGS / "maps" / "one_distributor_all_kinds.toml"


def test_the_example_map_reads_each_kind_its_own_way():
    mapping = load_map(EXAMPLE)
    inductor = map_for_kind(mapping, "inductor")
    capacitor = map_for_kind(mapping, "capacitor")
    diode = map_for_kind(mapping, "diode")
    assert inductor.columns["Rated Current"] == "irms_a"
    assert diode.columns["Rated Current"] == "if_avg_a"
    assert "Rated Current" not in capacitor.columns
    assert capacitor.columns["Sell Price (EUR)"] == "unit_price"  # shared
    assert inductor.units == {"dcr_ohm": "mOhm"} and capacitor.units == {"esr_ohm": "mOhm"}
    assert "channel" not in capacitor.constants  # a mosfet field: no error, not used


def test_one_map_imports_an_inductor_and_a_capacitor_export(db_file, write_csv):
    inductors = write_csv(
        "MPN,Vendor,Inductance,Rated Current,Sat. Curr.,DCR,Sell Price (EUR),Warehouse Bin\n"
        "QM-4R7,Quillmark Magnetics,4.7 uH,3 A,4 A,25,0.40,R1\n",
        "inductors.csv",
    )
    capacitors = write_csv(
        "MPN,Vendor,Capacitance,Volt.,ESR,Qty Free\nOP-106,Orrin Passives,10 uF,50 V,5,1200\n",
        "capacitors.csv",
    )
    import_catalog(db_file, [inductors], "inductor", map_file=EXAMPLE)
    import_catalog(db_file, [capacitors], "capacitor", map_file=EXAMPLE)
    (inductor,) = list_parts(db_file, "inductor")
    assert (inductor["irms_a"], inductor["isat_a"]) == (3.0, 4.0)
    assert inductor["dcr_ohm"] == pytest.approx(0.025)  # 25 in the section's mOhm
    assert inductor["lifecycle"] == "active"  # a shared constant
    (capacitor,) = list_parts(db_file, "capacitor")
    assert capacitor["voltage_v"] == 50.0 and capacitor["esr_ohm"] == pytest.approx(0.005)
    assert capacitor["stock"] == 1200


@pytest.mark.parametrize(
    ("text", "key", "reason_part"),
    [
        ("[inductor.columns]\n'X' = 'esr_ohm'", "columns.X", "not a field of an inductor"),
        ("[columns]\n'X' = 'colour'", "columns.X", "not a field of an inductor"),
        ("inductor = 3", "inductor", "must be a table"),
        ("[inductor.colours]\n'X' = 'mpn'", "inductor.colours", "unknown key"),
        ("[inductor]\ncolumns = 'mpn'", "inductor.columns", "must be a table"),
        ("[inductor.constants]\nmanufacturer = ['a']", "inductor.constants.manufacturer",
         "plain value"),
    ],
)  # fmt: skip
def test_bad_sections_name_the_key(db_file, write_csv, tmp_path, text, key, reason_part):
    map_path = tmp_path / "bad.toml"
    map_path.write_text(text + "\n", encoding="utf-8")
    with pytest.raises(MapFileError) as caught:
        import_catalog(db_file, [write_csv("MPN,Inductance\nQM-1,1 uH\n")], "inductor",
                       map_file=map_path)  # fmt: skip
    assert caught.value.key == key and reason_part in caught.value.reason


def test_a_kind_section_column_the_file_lacks_is_still_refused(db_file, write_csv, tmp_path):
    """Shared columns may be absent from one export; a kind's own entry names its file."""
    map_path = tmp_path / "m.toml"
    map_path.write_text(
        '[columns]\n"Qty Free" = "stock"\n[inductor.columns]\n"Sat Curr" = "isat_a"\n',
        encoding="utf-8",
    )
    with pytest.raises(MapFileError) as caught:
        import_catalog(db_file, [write_csv("MPN,Inductance\nQM-1,1 uH\n")], "inductor",
                       map_file=map_path)  # fmt: skip
    assert caught.value.key == "columns.Sat Curr"
