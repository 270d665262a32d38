"""Cells and headers with conditions: the quantity is read, the condition is kept as extra data."""

from __future__ import annotations

import json
import sqlite3

import pandas as pd
import pytest

from partpick.catalog.cells import convert_column
from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.fields import field_of


@pytest.mark.parametrize(
    ("kind", "name", "text", "value", "condition"),
    [
        ("diode", "vf_v", "0.7 V @ 3 A", 0.7, "3 A"),
        ("diode", "vf_v", "0.55V@1A", 0.55, "1A"),
        ("mosfet", "rds_on_ohm", "30 mOhm @ 5 A, 10 V", 0.030, "5 A, 10 V"),
        ("mosfet", "rds_on_ohm", "12 mΩ max @ Vgs=10V", 0.012, "Vgs=10V"),
        ("capacitor", "life_h", "10000 Hrs @ 105°C", 10000.0, "105°C"),
        ("diode", "tj_max_degc", "-55 ~ 150 °C", 150.0, None),  # a range keeps its top end
        ("inductor", "isat_a", "3.2 A", 3.2, None),
    ],
)
def test_a_cell_gives_the_quantity_of_its_column_and_its_condition(
    kind, name, text, value, condition
):
    column = convert_column(pd.Series([text, ""]), field_of(kind, name))
    assert column.values[0] == pytest.approx(value)
    assert not column.bad.any()
    conditions = [None, None] if column.conditions is None else list(column.conditions)
    assert conditions == [condition, None]


def _extra(db_file: str, kind: str) -> dict[str, dict]:
    rows = sqlite3.connect(db_file).execute(f"SELECT mpn, extra FROM parts_{kind}")
    return {mpn: json.loads(extra or "{}") for mpn, extra in rows}


def test_conditions_land_in_each_parts_extra_data(db_file, write_csv):
    text = (
        "MPN,Forward Voltage,Reverse Voltage,Average Forward Current\n"
        "TD-1,0.7 V @ 3 A,40 V,3 A\n"
        "TD-2,0.52 V,40 V,3 A\n"
    )
    import_catalog(db_file, [write_csv(text)], "diode")
    parts = {p["mpn"]: p for p in list_parts(db_file, "diode")}
    assert parts["TD-1"]["vf_v"] == pytest.approx(0.7)
    extra = _extra(db_file, "diode")
    assert extra["TD-1"] == {"vf_v condition": "3 A"}
    assert extra["TD-2"] == {}  # no condition, no note


def test_a_header_condition_is_kept_for_every_part(db_file, write_csv):
    text = "MPN,RDS(ON) @ 10V (mΩ),Vds\nTQ-1,12,40 V\nTQ-2,9 @ 4.5 V,40 V\n"
    import_catalog(db_file, [write_csv(text)], "mosfet")
    parts = {p["mpn"]: p for p in list_parts(db_file, "mosfet")}
    assert parts["TQ-1"]["rds_on_ohm"] == pytest.approx(0.012)  # 12 in the header's mΩ
    extra = _extra(db_file, "mosfet")
    assert extra["TQ-1"] == {"rds_on_ohm condition": "10V"}
    assert extra["TQ-2"] == {"rds_on_ohm condition": "4.5 V"}  # the cell's own wins
