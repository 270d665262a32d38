"""File formats: encodings, delimiters, and files that cannot be imported at all."""

from __future__ import annotations

import pytest

from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.catalog.sniff import sniff_delimiter
from partpick.cli import app
from partpick.errors import CatalogFormatError
from tests.conftest import CATALOG_DATA

BROKEN = CATALOG_DATA / "broken"
SMALL = CATALOG_DATA / "inductors_small.csv"

# cp1252 has µ (0xB5) but no Ω, so the resistance is written "mOhm" in every encoding.
TEXT = "Part Number;Inductance;DCR;Description\nQM-4R7;4.7 µH;32 mOhm;choke, 4.7 µH ±20 %\n"


@pytest.mark.parametrize(
    ("encoding", "sniffed"),
    [
        ("utf-8", "utf-8"),
        ("utf-8-sig", "utf-8-sig"),  # UTF-8 with a byte-order mark
        ("utf-16", "utf-16"),  # Python writes the BOM first (little-endian here)
        ("utf-16-be", "utf-16"),  # written without BOM below, then given one by hand
        ("cp1252", "cp1252"),  # µ is the single byte 0xB5
    ],
)
def test_encodings_are_sniffed(db_file, tmp_path, encoding, sniffed):
    data = TEXT.encode(encoding)
    if encoding == "utf-16-be":
        data = b"\xfe\xff" + data
    if encoding == "cp1252":
        assert b"\xb5" in data
    path = tmp_path / "parts.csv"
    path.write_bytes(data)
    (report,) = import_catalog(db_file, [path], "inductor")
    assert report.encoding == sniffed and report.added == 1
    (part,) = list_parts(db_file, "inductor")
    assert part["inductance_h"] == pytest.approx(4.7e-6)  # 4.7 µH
    assert part["dcr_ohm"] == pytest.approx(0.032)  # 32 mOhm
    assert part["description"] == "choke, 4.7 µH ±20 %"


@pytest.mark.parametrize("delimiter", [",", ";", "\t"])
def test_delimiters_are_sniffed(db_file, write_csv, delimiter):
    rows = [
        ["Part Number", "Inductance", "Saturation Current", "Description"],
        ["QM-1", "4.7 uH", "4.6 A", '"choke; shielded, 4.7 uH"'],
        ["QM-2", "10 uH", "3.1 A", '"choke\tunshielded"'],
    ]
    text = "\n".join(delimiter.join(r) for r in rows) + "\n"
    (report,) = import_catalog(db_file, [write_csv(text)], "inductor")
    assert report.delimiter == delimiter and report.added == 2
    parts = {p["mpn"]: p for p in list_parts(db_file, "inductor")}
    assert parts["QM-1"]["description"] == "choke; shielded, 4.7 uH"


@pytest.mark.parametrize(
    ("head", "expected"),
    [
        ("a,b,c\n1,2,3\n", ","),
        ("a;b;c\n1,5;2,5;3\n", ";"),  # decimal commas in the data do not fool it
        ("a\tb\n1\t2\n", "\t"),
        ('"Isat, A";DCR;L\n1;2;3\n', ";"),
        ("just one column\nvalue\n", ","),
    ],
)
def test_sniff_delimiter(head, expected):
    assert sniff_delimiter(head) == expected


# Every broken example file and the reason its import must give. A new file in the folder
# without an entry here fails test_every_broken_file_has_an_expected_reason.
BROKEN_REASONS = {
    "empty.csv": "empty",
    "blank_lines_only.csv": "empty",
    "no_header.csv": "no header row",
    "no_part_number.csv": "no part-number column",
    "no_kind_values.csv": "no column holds an inductor value",
    "capacitor_columns.csv": "no column holds an inductor value",
    "workbook_saved_as_csv.csv": "xlsx",
    "binary.csv": "binary data",
    "undecodable.csv": "cannot be decoded",
    "prose.csv": "not a CSV table",
    "two_part_number_columns.csv": "both read as mpn",
    "header_unit_of_other_dimension.csv": "not a unit of inductance",
    "unterminated_quote.csv": "not a readable CSV file",
}


def test_every_broken_file_has_an_expected_reason():
    assert {p.name for p in BROKEN.iterdir()} == set(BROKEN_REASONS)


@pytest.mark.parametrize("path", sorted(BROKEN.iterdir()), ids=lambda p: p.name)
def test_broken_file_imports_nothing(db_file, catalog_dump, path):
    import_catalog(db_file, [SMALL], "inductor")
    before = catalog_dump(db_file)
    with pytest.raises(CatalogFormatError) as caught:
        import_catalog(db_file, [path], "inductor")
    assert BROKEN_REASONS[path.name] in caught.value.reason
    assert caught.value.file == str(path)
    assert catalog_dump(db_file) == before


@pytest.mark.parametrize("path", sorted(BROKEN.iterdir()), ids=lambda p: p.name)
def test_broken_file_exits_2_with_one_line_and_no_traceback(runner, db_file, path):
    result = runner.invoke(app, ["import", str(path), "--kind", "inductor", "--db", db_file])
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert result.output.strip().count("\n") == 0
    assert result.output.startswith("error: ") and str(path) in result.output


def test_a_broken_second_file_stops_the_first_too(db_file, catalog_dump):
    before = catalog_dump(db_file)
    with pytest.raises(CatalogFormatError):
        import_catalog(db_file, [SMALL, BROKEN / "no_header.csv"], "inductor")
    assert catalog_dump(db_file) == before


def test_missing_file_is_a_file_error(db_file, tmp_path):
    with pytest.raises(CatalogFormatError) as caught:
        import_catalog(db_file, [tmp_path / "nowhere.csv"], "inductor")
    assert "not found" in caught.value.reason
