"""Header matching by meaning: a corpus of trade wordings, the ambiguous ones, and properties.

The wordings in ``tests/data/catalog/header_wordings.csv`` are the ways distributor exports
and datasheets name each figure (symbols, spelled-out names, abbreviations, units in brackets,
conditions after "@", swapped word order); each row names the field it must land in. The rows
of ``header_unread.csv`` must stay unread: wordings that could mean two fields, or that name
a figure the catalog does not keep (θJC, Ciss, leakage current) close to one it does.
"""

from __future__ import annotations

import csv
import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.catalog.headers import match_headers, wording_index
from partpick.catalog.importer import import_catalog
from partpick.catalog.query import list_parts
from partpick.catalog.wording import parse_wording, wording_keys
from partpick.errors import CatalogFormatError
from partpick.fields import KINDS, OTHER, ambiguous_wordings, fields_of
from tests.conftest import CATALOG_DATA

CORPUS_DIR = CATALOG_DATA


def _rows(name: str) -> list[dict[str, str]]:
    with open(CORPUS_DIR / name, encoding="utf-8", newline="") as handle:
        return list(csv.DictReader(handle))


WORDINGS = _rows("header_wordings.csv")
UNREAD = _rows("header_unread.csv")


def _read_as(kind: str, header: str) -> str | None:
    plan = match_headers([header], kind, None, "x.csv")
    return plan.matches[0].field if plan.matches else None


def test_the_corpus_is_large_and_covers_every_field_of_every_kind():
    assert len(WORDINGS) >= 150
    covered = {(row["kind"], row["field"]) for row in WORDINGS}
    for kind in KINDS:
        for f in fields_of(kind):
            assert (kind, f.name) in covered, (kind, f.name)


@pytest.mark.parametrize("row", WORDINGS, ids=lambda r: f"{r['kind']}:{r['header']}")
def test_every_corpus_wording_lands_in_its_field(row):
    assert _read_as(row["kind"], row["header"]) == row["field"]


@pytest.mark.parametrize("row", UNREAD, ids=lambda r: f"{r['kind']}:{r['header']}")
def test_ambiguous_and_foreign_wordings_stay_unread(row):
    plan = match_headers([row["header"]], row["kind"], None, "x.csv")
    assert plan.matches == ()
    (unread,) = plan.unread
    assert unread.header == row["header"]
    if row["candidates"]:
        assert unread.candidates == tuple(row["candidates"].split())


def test_an_ambiguous_header_names_the_fields_and_the_map_line_that_settles_it():
    (unread,) = match_headers(["Rated Current"], "inductor", None, "x.csv").unread
    assert unread.candidates == ("isat_a", "irms_a")
    assert unread.map_line == "'Rated Current' = \"isat_a\""


def test_a_near_miss_gets_a_did_you_mean_with_its_map_line():
    (unread,) = match_headers(["Saturat. Curnt"], "inductor", None, "x.csv").unread
    assert unread.candidates == ("isat_a",)
    assert unread.map_line == "'Saturat. Curnt' = \"isat_a\""


def test_a_map_line_quotes_a_header_with_an_apostrophe():
    (unread,) = match_headers(["Rated Current (Mfr's)"], "inductor", None, "x.csv").unread
    assert unread.map_line.startswith('"Rated Current (Mfr\'s)" = ')


@pytest.mark.parametrize("kind", KINDS)
def test_every_wording_two_fields_share_is_declared_ambiguous(kind):
    """A key shared by two fields makes a header unread; that must be on purpose."""
    declared = {key for w in ambiguous_wordings(kind) for key in wording_keys(w)}
    shared = {key for key, names in wording_index(kind).keys.items() if len(names) > 1}
    # "L" is an inductance and "L (mm)" a length: the header's unit tells them apart
    allowed = {"w:l", "s:l"} if kind == "inductor" else set()
    assert shared - declared - allowed == set()


@pytest.mark.parametrize("kind", KINDS)
def test_declared_ambiguities_name_fields_of_their_kind(kind):
    names = {f.name for f in fields_of(kind)} | {OTHER}
    for wording, candidates in ambiguous_wordings(kind).items():
        assert set(candidates) <= names, wording


@pytest.mark.parametrize(
    ("kind", "header", "unit_text", "scale"),
    [
        ("inductor", "DCR mOhm max", "mOhm", 1e-3),
        ("inductor", "SRF (MHz) min", "MHz", 1e6),
        ("inductor", "Inductance @ 100 kHz", None, 1.0),  # a condition is not a unit
        ("mosfet", "RDS(ON) @ 10V", None, 1.0),
        ("mosfet", "R_DS(on) @ VGS=10V (mΩ)", "mΩ", 1e-3),
        ("mosfet", "Qg (nC)", "nC", 1e-9),
        ("capacitor", "Ripple Current (mA rms)", "mA", 1e-3),  # a unit word in a group
        ("capacitor", "C (pF)", "pF", 1e-12),
        ("diode", "trr (ns)", "ns", 1e-9),
        ("inductor", "L [µH]", "µH", 1e-6),
        ("inductor", "L (mm)", "mm", 1.0),
    ],
)
def test_units_anywhere_in_a_header_scale_its_column(kind, header, unit_text, scale):
    (match,) = match_headers([header], kind, None, "x.csv").matches
    assert (match.unit_text, match.scale) == (unit_text, pytest.approx(scale))


def test_the_unit_tells_an_inductance_from_a_length():
    assert _read_as("inductor", "L (mm)") == "length_mm"
    assert _read_as("inductor", "L [µH]") == "inductance_h"
    assert _read_as("inductor", "L") == "inductance_h"


def test_conditions_are_kept_with_the_match():
    (match,) = match_headers(["ESR @ 100 kHz, 20 °C"], "capacitor", None, "x.csv").matches
    assert match.field == "esr_ohm" and match.condition == "@ 100 kHz, 20 °C"


def test_a_minimum_temperature_is_not_read_as_the_maximum():
    assert _read_as("capacitor", "Operating Temperature Min") is None
    assert _read_as("capacitor", "Operating Temperature Max") == "temp_max_degc"
    assert _read_as("inductor", "SRF min") == "srf_hz"  # a guaranteed minimum SRF is the SRF


def test_a_column_worded_exactly_wins_over_one_read_by_meaning(db_file, write_csv):
    text = "MPN,Ripple Current @ 120 Hz,Ripple Current @ High Frequency\nQM-1,0.5 A,1.2 A\n"
    (report,) = import_catalog(db_file, [write_csv(text)], "capacitor")
    assert [m.header for m in report.columns if m.field == "ripple_a"] == [
        "Ripple Current @ High Frequency"
    ]
    assert "Ripple Current @ 120 Hz" in report.unrecognised
    assert list_parts(db_file, "capacitor")[0]["ripple_a"] == pytest.approx(1.2)


def test_two_columns_read_by_meaning_for_one_field_are_refused(db_file, write_csv):
    text = "MPN,ESR @ 120 Hz,ESR @ 100 kHz\nQM-1,1 ohm,0.1 ohm\n"
    with pytest.raises(CatalogFormatError) as caught:
        import_catalog(db_file, [write_csv(text)], "capacitor")
    assert "both read as esr_ohm" in caught.value.reason


def test_headers_of_a_realistic_export_are_read_by_meaning(db_file, write_csv):
    text = (
        "Mfr. Part #,Mfr.,Drain-Source Voltage,Continuous Drain Current,RDS(ON) @ 10V (mΩ),"
        "Vgs(th) (V),Qg (nC),Miller Charge (nC),Coss (pF),Tj max (°C),"
        "Thermal Resistance Junction-Ambient (°C/W),In Stock,Price Each\n"
        "VX-N40-8,Velmora Devices,40 V,8 A,12,2.1,9.5,2.4,180,150,62,1200,0.31\n"
    )
    (report,) = import_catalog(db_file, [write_csv(text)], "mosfet")
    assert report.unrecognised == ()
    (part,) = list_parts(db_file, "mosfet")
    assert part["rds_on_ohm"] == pytest.approx(0.012)  # 12 in mΩ
    assert part["qgd_c"] == pytest.approx(2.4e-9)
    assert part["coss_f"] == pytest.approx(180e-12)
    assert part["theta_ja_degc_w"] == pytest.approx(62.0)


# --- property: word order, case and bracket style do not change the field ----------------

_BRACKETS = ("()", "[]", "{}")
# Wordings whose words can move freely: no condition ("@", "at") and no comma, whose place
# says which part is the unit.
_MOVABLE = [
    r
    for r in WORDINGS
    if not re.search(r"@|,|\bat\b", r["header"], re.IGNORECASE) and " " in r["header"]
]


def _restyle(header: str, style: str) -> str:
    return header.translate(str.maketrans("()[]{}", (style[0] + style[1]) * 3))


@settings(max_examples=300, deadline=None)
@given(
    row=st.sampled_from(_MOVABLE),
    order=st.randoms(use_true_random=False),
    upper=st.lists(st.booleans(), min_size=60, max_size=60),
    style=st.sampled_from(_BRACKETS),
)
def test_word_order_case_and_brackets_never_change_the_field(row, order, upper, style):
    words = re.findall(r"[\(\[\{][^\)\]\}]*[\)\]\}]|\S+", row["header"])  # a group is a word
    order.shuffle(words)
    text = " ".join(words)
    text = "".join(c.upper() if upper[i % len(upper)] else c.lower() for i, c in enumerate(text))
    assert _read_as(row["kind"], _restyle(text, style)) == row["field"], text


def test_parsing_takes_the_same_steps_for_each_header():
    """Matching is linear in the column count: one parse per header, cached by text."""
    parse_wording.cache_clear()
    headers = [f"Bin {i}" for i in range(500)]
    match_headers(headers, "inductor", None, "x.csv")
    assert parse_wording.cache_info().misses <= len(headers) + 1
