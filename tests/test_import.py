"""Importing CSV catalogs: values, re-import, update in place, row rejects, strict mode.

Expected SI values are worked by hand from the cells with the SI Brochure prefixes
(BIPM, 9th ed., Table 7): 4.7 uH = 4.7e-6 H, 32 mOhm = 0.032 ohm, 38 MHz = 3.8e7 Hz.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.catalog.store import count_parts, list_batches
from partpick.errors import StrictImportError
from tests.conftest import CATALOG_DATA, sql_rows

SMALL = CATALOG_DATA / "inductors_small.csv"
HEADER = (
    "Part Number,Manufacturer,Inductance,Saturation Current,DCR,Shielded,Tolerance,Stock,Lifecycle"
)
GOOD_ROW = "QM-{n},Quillmark Magnetics,4.7 uH,4.6 A,32 mOhm,yes,±20%,3900,Active"


def _by_mpn(db: str, kind: str = "inductor") -> dict[str, dict]:
    return {p["mpn"]: p for p in list_parts(db, kind)}


def test_small_file_imports_every_row_with_si_values(catalog_db):
    (report,) = import_catalog(catalog_db, [SMALL], "inductor")
    assert (report.rows, report.added, report.updated, report.unchanged, report.rejected) == (
        6, 6, 0, 0, 0,
    )  # fmt: skip
    part = _by_mpn(catalog_db)["QM-4R7-0630"]
    assert part["inductance_h"] == pytest.approx(4.7e-6)  # 4.7 uH
    assert part["tolerance"] == pytest.approx(0.2)  # ±20 %
    assert part["isat_a"] == pytest.approx(4.6)
    assert part["dcr_ohm"] == pytest.approx(0.032)  # 32 mOhm
    assert part["srf_hz"] == pytest.approx(38e6)  # 38 MHz
    assert (part["length_mm"], part["width_mm"], part["height_mm"]) == (7.0, 6.6, 3.0)
    assert part["shielded"] is True and part["unit_price"] == pytest.approx(0.32)
    assert part["stock"] == 3900 and part["lifecycle"] == "active"
    drum = _by_mpn(catalog_db)["BT-470-0805U"]
    assert drum["srf_hz"] is None and drum["stock"] is None  # "-" and "N/A" are missing
    assert drum["shielded"] is False and drum["lifecycle"] == "obsolete"
    assert _by_mpn(catalog_db)["QM-100-0630"]["lifecycle"] == "nrnd"


def test_reimport_duplicates_nothing(catalog_db):
    import_catalog(catalog_db, [SMALL], "inductor")
    (again,) = import_catalog(catalog_db, [SMALL], "inductor")
    assert (again.added, again.updated, again.unchanged) == (0, 0, 6)
    assert count_parts(catalog_db)["inductor"] == 6
    assert [b.added for b in list_batches(catalog_db)] == [6, 0]


def test_changed_values_update_in_place(catalog_db, write_csv):
    import_catalog(catalog_db, [SMALL], "inductor")
    before = read_columns(catalog_db, "inductor", ["isat_a"])
    text = SMALL.read_text(encoding="utf-8").replace("4.7 uH,±20%,4.6 A", "4.7 uH,±20%,4.8 A")
    text += "QM-470-1040,Quillmark Magnetics,Shielded choke 47 uH,47 uH,±20%,3.0 A,2.6 A,"
    text += "120 mOhm,9 MHz,1040,10.5 mm,10.0 mm,4.0 mm,Yes,$0.52,700,Active\n"
    (report,) = import_catalog(catalog_db, [write_csv(text)], "inductor")
    assert (report.added, report.updated, report.unchanged) == (1, 1, 5)
    parts = _by_mpn(catalog_db)
    assert parts["QM-4R7-0630"]["isat_a"] == pytest.approx(4.8)
    assert len(parts) == 7
    after = read_columns(catalog_db, "inductor", ["isat_a"])
    # in place: the updated part keeps its position (row id), the new one comes last
    assert list(after["mpn"][:6]) == list(before["mpn"])
    assert after["mpn"][6] == "QM-470-1040"


def test_unchanged_rows_keep_the_provenance_of_their_last_change(catalog_db, write_csv):
    import_catalog(catalog_db, [SMALL], "inductor")
    text = SMALL.read_text(encoding="utf-8").replace("32 mOhm", "33 mOhm")
    import_catalog(catalog_db, [write_csv(text, "second.csv")], "inductor")
    parts = list_parts(catalog_db, "inductor", provenance=True)
    rows = {p["mpn"]: p["source_file"] for p in parts}
    assert rows["QM-4R7-0630"] == "second.csv"
    assert rows["QM-1R0-0630"] == "inductors_small.csv"


@pytest.mark.parametrize(
    ("column", "cell", "reason_part"),
    [
        ("Inductance", "10 uF", "capacitance"),  # a unit contradicting the column
        ("Saturation Current", "-3 A", "greater than zero"),
        ("DCR", "0", "greater than zero"),
        ("DCR", "see datasheet", "not a number"),
        ("Shielded", "maybe", "yes or no"),
        ("Lifecycle", "zombie", "unknown lifecycle"),
        ("Tolerance", "20", "ambiguous"),
        ("Stock", "-5", "cannot be negative"),
        ("Stock", "1.5", "whole number"),
        ("Inductance", "4,7 uH", "comma"),
        ("Inductance", "inf H", "not a number"),
    ],
)
def test_bad_cell_rejects_its_row_and_the_rest_import(
    catalog_db, write_csv, column, cell, reason_part
):
    headers = HEADER.split(",")
    bad = GOOD_ROW.format(n=2).split(",")
    bad[headers.index(column)] = f'"{cell}"'
    lines = [HEADER, GOOD_ROW.format(n=1), ",".join(bad), GOOD_ROW.format(n=3)]
    (report,) = import_catalog(catalog_db, [write_csv("\n".join(lines) + "\n")], "inductor")
    assert (report.added, report.rejected) == (2, 1)
    (reject,) = report.rejects
    assert (reject.line, reject.column, reject.value) == (3, column, cell)
    assert reason_part in reject.reason
    assert set(_by_mpn(catalog_db)) == {"QM-1", "QM-3"}


def test_line_numbers_survive_blank_and_malformed_lines_across_chunks(catalog_db, write_csv):
    lines = [
        HEADER,  # line 1
        GOOD_ROW.format(n=1),  # 2
        "",  # 3: blank, skipped silently
        GOOD_ROW.format(n=2) + ",surplus",  # 4: more fields than the header
        GOOD_ROW.format(n=3),  # 5
        GOOD_ROW.format(n=4).replace("4.6 A", "lots"),  # 6: bad value
        GOOD_ROW.format(n=5),  # 7
        GOOD_ROW.format(n=6).replace("32 mOhm", "32 mH"),  # 8: wrong unit
    ]
    path = write_csv("\n".join(lines) + "\n")
    for chunk_rows in (2, 3, 1000):
        (report,) = import_catalog(catalog_db, [path], "inductor", chunk_rows=chunk_rows)
        assert [(r.line, r.column) for r in report.rejects] == [
            (4, "(whole row)"), (6, "Saturation Current"), (8, "DCR"),
        ], chunk_rows  # fmt: skip
        assert report.rows == 6 and report.rejected == 3  # the blank line is no row


def test_repeated_part_in_one_file_is_rejected_once(catalog_db, write_csv):
    lines = [HEADER, GOOD_ROW.format(n=1), GOOD_ROW.format(n=2), GOOD_ROW.format(n=1)]
    (report,) = import_catalog(catalog_db, [write_csv("\n".join(lines))], "inductor")
    (reject,) = report.rejects
    assert (reject.line, reject.column, reject.value) == (4, "Part Number", "QM-1")
    assert "line 2" in reject.reason and report.added == 2


def test_repeats_across_chunks_are_found_when_the_catalog_already_has_parts(catalog_db, write_csv):
    import_catalog(catalog_db, [SMALL], "inductor")  # not empty: rows are upserted chunk by chunk
    rows = [GOOD_ROW.format(n=i) for i in (1, 2, 3, 1, 4, 2)]  # lines 2..7
    (report,) = import_catalog(
        catalog_db, [write_csv("\n".join([HEADER, *rows]))], "inductor", chunk_rows=2
    )
    assert [(r.line, r.reason) for r in report.rejects] == [
        (5, "same manufacturer and part number as line 2"),
        (7, "same manufacturer and part number as line 3"),
    ]
    assert (report.added, report.rejected) == (4, 2)


def test_row_without_part_number_is_rejected(catalog_db, write_csv):
    lines = [HEADER, GOOD_ROW.format(n=1), GOOD_ROW.format(n=2).replace("QM-2", " N/A ")]
    (report,) = import_catalog(catalog_db, [write_csv("\n".join(lines))], "inductor")
    assert [(r.line, r.reason) for r in report.rejects] == [(3, "the part number is missing")]


def test_unrecognised_columns_are_listed_and_kept_as_extra(catalog_db, write_csv):
    text = "MPN,Inductance,Bin,Colour code\nQM-1,4.7 uH,R1-02,blue\nQM-2,10 uH,,red\n"
    (report,) = import_catalog(catalog_db, [write_csv(text)], "inductor")
    assert report.unrecognised == ("Bin", "Colour code")
    import json

    rows = dict(sql_rows(catalog_db, "SELECT mpn, extra FROM parts_inductor"))
    assert json.loads(rows["QM-1"]) == {"Bin": "R1-02", "Colour code": "blue"}
    assert json.loads(rows["QM-2"]) == {"Bin": None, "Colour code": "red"}


@pytest.mark.parametrize(
    ("header", "cell", "field", "expected"),
    [
        ("DCR (mΩ)", "45", "dcr_ohm", 0.045),
        ("DCR (mOhm)", "45", "dcr_ohm", 0.045),
        ("Inductance [uH]", "4.7", "inductance_h", 4.7e-6),
        ("Inductance [µH]", "4.7 uH", "inductance_h", 4.7e-6),  # a unit in the cell wins
        ("Inductance [uH]", "4700 nH", "inductance_h", 4.7e-6),
        ("Isat, A", "3.2", "isat_a", 3.2),
        ("Isat (mA)", "3200", "isat_a", 3.2),
        ("SRF [MHz]", "38", "srf_hz", 38e6),
        ("Tolerance (%)", "20", "tolerance", 0.2),
    ],
)
def test_unit_in_header_scales_bare_numbers(catalog_db, write_csv, header, cell, field, expected):
    text = f'MPN,Inductance,"{header}"\nQM-1,4.7 uH,"{cell}"\n'
    if field == "inductance_h":
        text = f'MPN,"{header}"\nQM-1,"{cell}"\n'
    import_catalog(catalog_db, [write_csv(text)], "inductor")
    assert _by_mpn(catalog_db)["QM-1"][field] == pytest.approx(expected)


def test_strict_imports_nothing_when_a_row_is_rejected(catalog_db, write_csv, catalog_dump):
    import_catalog(catalog_db, [SMALL], "inductor")
    before = catalog_dump(catalog_db)
    lines = [HEADER, GOOD_ROW.format(n=1), GOOD_ROW.format(n=2).replace("4.6 A", "4.6 V")]
    with pytest.raises(StrictImportError) as caught:
        import_catalog(catalog_db, [write_csv("\n".join(lines))], "inductor", strict=True)
    assert caught.value.exit_code == 1 and caught.value.rejected == 1
    assert [r.line for r in caught.value.rejects] == [3]
    assert catalog_dump(catalog_db) == before


def test_strict_import_of_a_clean_file_succeeds(catalog_db):
    (report,) = import_catalog(catalog_db, [SMALL], "inductor", strict=True)
    assert report.added == 6


def test_file_without_manufacturer_column_stores_parts_without_one(catalog_db, write_csv):
    import_catalog(catalog_db, [write_csv("MPN,Inductance\nQM-1,4.7 uH\n")], "inductor")
    assert _by_mpn(catalog_db)["QM-1"]["manufacturer"] is None


def test_p_channel_ratings_printed_negative_are_kept_as_magnitudes(catalog_db, write_csv):
    text = "MPN,Channel,Vds,Id,Vgs(th),Rds(on)\nTS-P30,P-Channel,-30 V,-5.2 A,-1.8 V,42 mOhm\n"
    import_catalog(catalog_db, [write_csv(text)], "mosfet")
    part = _by_mpn(catalog_db, "mosfet")["TS-P30"]
    assert (part["channel"], part["vds_v"], part["id_a"], part["vgs_th_v"]) == ("p", 30, 5.2, 1.8)


def test_several_files_go_in_one_call_with_one_batch_each(catalog_db):
    capacitors = CATALOG_DATA / "capacitors_small.csv"
    reports = import_catalog(catalog_db, [SMALL, SMALL], "inductor")
    assert [(r.added, r.unchanged) for r in reports] == [(6, 0), (0, 6)]
    import_catalog(catalog_db, [capacitors], "capacitor")
    assert [b.kind for b in list_batches(catalog_db)] == ["inductor", "inductor", "capacitor"]
    assert count_parts(catalog_db) == {"inductor": 6, "capacitor": 4, "diode": 0, "mosfet": 0}


def test_capacitor_file_normalises_dielectrics_and_ranges(catalog_db):
    import_catalog(catalog_db, [CATALOG_DATA / "capacitors_small.csv"], "capacitor")
    parts = _by_mpn(catalog_db, "capacitor")
    assert {m: p["dielectric"] for m, p in parts.items()} == {
        "OR-106-X7R-50": "x7r", "OR-104-C0G-100": "c0g",
        "VL-221-AE-35": "al-electrolytic", "VL-330-TA-16": "ta-mno2",
    }  # fmt: skip
    assert parts["VL-221-AE-35"]["temp_max_degc"] == 105.0  # "-40 ~ 105 °C" keeps the top
    assert parts["VL-221-AE-35"]["life_h"] == 2000.0
    assert parts["VL-221-AE-35"]["esr_ohm"] == pytest.approx(0.15)
    assert parts["OR-106-X7R-50"]["capacitance_f"] == pytest.approx(10e-6)


def test_progress_hook_sees_the_file_grow(catalog_db, write_csv):
    lines = [HEADER] + [GOOD_ROW.format(n=i) for i in range(50)]
    seen = []
    import_catalog(
        catalog_db, [write_csv("\n".join(lines))], "inductor", progress=seen.append, chunk_rows=10
    )
    assert len(seen) >= 5
    assert [s.rows_done for s in seen] == sorted(s.rows_done for s in seen)
    assert seen[-1].rows_done == 50 and seen[-1].bytes_done <= seen[-1].bytes_total


def test_nan_never_reaches_the_catalog_as_a_number(catalog_db):
    import_catalog(catalog_db, [SMALL], "inductor")
    srf = read_columns(catalog_db, "inductor", ["srf_hz"])["srf_hz"]
    assert sum(math.isnan(v) for v in srf) == 1  # only the drum core lacks an SRF


def test_short_row_reads_its_missing_cells_as_missing(catalog_db, write_csv):
    text = f"{HEADER}\n{GOOD_ROW.format(n=1)}\nQM-2,Quillmark Magnetics,10 uH\n"
    (report,) = import_catalog(catalog_db, [write_csv(text)], "inductor")
    assert (report.added, report.rejected) == (2, 0)
    part = _by_mpn(catalog_db)["QM-2"]
    assert part["inductance_h"] == pytest.approx(10e-6)
    assert part["isat_a"] is None and part["shielded"] is None and part["lifecycle"] is None


@pytest.mark.parametrize("rows", [1, 63, 64, 65, 2 * 64 + 5])
def test_bulk_load_stores_every_row_in_file_order(catalog_db, write_csv, rows):
    # Bulk loads insert rows in groups per statement (merge.ROWS_PER_STATEMENT); counts on
    # both sides of a group boundary must keep every row, its values and its line.
    body = "".join(
        f"QM-{n:04d},Quillmark Magnetics,{n} uH,{n} A,{n} mOhm,yes,±20%,{n},Active\n"
        for n in range(1, rows + 1)
    )
    (report,) = import_catalog(catalog_db, [write_csv(HEADER + "\n" + body)], "inductor")
    assert (report.added, report.rejected) == (rows, 0)
    columns = read_columns(catalog_db, "inductor", ["inductance_h", "isat_a", "dcr_ohm", "stock"])
    n = np.arange(1, rows + 1)
    assert list(columns["mpn"]) == [f"QM-{i:04d}" for i in n]
    np.testing.assert_allclose(columns["inductance_h"], n * 1e-6)  # n uH
    np.testing.assert_allclose(columns["isat_a"], n)  # n A
    np.testing.assert_allclose(columns["dcr_ohm"], n * 1e-3)  # n mOhm
    np.testing.assert_array_equal(columns["stock"], n)
    parts = list_parts(catalog_db, "inductor", provenance=True)
    lines = {p["mpn"]: p["source_line"] for p in parts}
    assert lines == {f"QM-{i:04d}": i + 1 for i in n}  # the header is line 1
