"""A diode type or MOSFET channel the description states plainly, marked as inferred."""

from __future__ import annotations

import pytest

from partpick.catalog.importer import import_catalog
from partpick.catalog.inference import infer_value
from partpick.catalog.query import list_parts


@pytest.mark.parametrize(
    ("kind", "name", "description", "value"),
    [
        ("diode", "diode_type", "SCHOTTKY RECT 40V 3A SMA", "schottky"),
        ("diode", "diode_type", "Ultrafast rectifier, 200 V 2 A", "fast"),
        ("diode", "diode_type", "ultra-fast recovery diode", "fast"),
        ("diode", "diode_type", "Fast Recovery Rectifier 600V", "fast"),
        ("diode", "diode_type", "SiC Schottky diode 650 V", "sic"),
        ("diode", "diode_type", "Silicon carbide rectifier", "sic"),
        ("diode", "diode_type", "Rectifier diode 400 V", None),
        ("diode", "diode_type", "Schottky and fast recovery pair", None),  # two answers
        ("diode", "diode_type", "Schottkyless rectifier", None),  # whole words only
        ("mosfet", "channel", "MOSFET N-CH 60V 8A", "n"),
        ("mosfet", "channel", "P-Channel enhancement MOSFET", "p"),
        ("mosfet", "channel", "Trench N channel power MOSFET", "n"),
        ("mosfet", "channel", "Dual N- and P-Channel MOSFET", None),
        ("mosfet", "channel", "Power MOSFET 40 V", None),
        ("mosfet", "channel", "", None),
    ],
)
def test_what_a_description_states(kind, name, description, value):
    assert infer_value(kind, name, description) == value


def test_a_diode_file_without_a_type_column_takes_it_from_the_description(db_file, write_csv):
    text = (
        "MPN,Description,Reverse Voltage,Average Forward Current\n"
        "TD-1,SCHOTTKY RECT 40V 3A,40,3\n"
        "TD-2,Rectifier 400 V,400,1\n"
    )
    import_catalog(db_file, [write_csv(text)], "diode")
    parts = {p["mpn"]: p for p in list_parts(db_file, "diode", provenance=True)}
    assert parts["TD-1"]["diode_type"] == "schottky"
    assert parts["TD-1"]["inferred"] == {"diode_type": "description"}
    assert parts["TD-2"]["diode_type"] is None and parts["TD-2"]["inferred"] is None


def test_a_stated_value_is_never_replaced_and_an_empty_one_is_filled(db_file, write_csv):
    text = (
        "MPN,Description,Channel,Vds\n"
        "TQ-1,MOSFET N-CH 40V,p,40 V\n"  # the column wins, even against the description
        "TQ-2,MOSFET N-CH 40V,,40 V\n"
    )
    import_catalog(db_file, [write_csv(text)], "mosfet")
    parts = {p["mpn"]: p for p in list_parts(db_file, "mosfet", provenance=True)}
    assert (parts["TQ-1"]["channel"], parts["TQ-1"]["inferred"]) == ("p", None)
    assert (parts["TQ-2"]["channel"], parts["TQ-2"]["inferred"]) == (
        "n",
        {"channel": "description"},
    )


def test_nothing_is_inferred_from_a_part_number(db_file, write_csv):
    text = "MPN,Reverse Voltage,Average Forward Current\nTD-SCHOTTKY-40,40,3\n"
    import_catalog(db_file, [write_csv(text)], "diode")
    (part,) = list_parts(db_file, "diode", provenance=True)
    assert part["diode_type"] is None and part["inferred"] is None
