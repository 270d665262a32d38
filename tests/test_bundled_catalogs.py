"""The bundled (invented) catalogs, messy exports and scenarios hold what the README claims.

The claims: E-series values; within one inductor size Isat falls and DCR rises as L rises;
bigger cases carry more current; electrolytics have high ESR and ceramics low; Schottky
diodes have low Vf and low Vrrm; every dielectric family is present; the messy exports are
rejected exactly where rows were spoiled on purpose; the field-logger scenario gives at
least three passing parts per role, some unverified ones and failures for varied reasons.
"""

from __future__ import annotations

import csv
import math
from collections import Counter
from pathlib import Path

import numpy as np
import pytest

from partpick.catalog.columns import read_columns
from partpick.catalog.importer import import_catalog
from partpick.design.spec import load_spec
from partpick.design.topologies import analyse
from partpick.screening.pick import pick
from partpick.screening.profiles import load_profile
from tests.backends import new_catalog

CATALOGS = Path(__file__).parents[1] / "catalogs"
FILES = {
    "inductor": "inductors.csv",
    "capacitor": "capacitors.csv",
    "diode": "diodes.csv",
    "mosfet": "mosfets.csv",
}
# issue 2, section 5: at least 40 inductors, 40 capacitors, 20 diodes, 20 MOSFETs
MINIMUM_COUNTS = {"inductor": 40, "capacitor": 40, "diode": 20, "mosfet": 20}
# IEC 60063:2015, the E6 and E12 series of preferred numbers (one decade)
E6 = (1.0, 1.5, 2.2, 3.3, 4.7, 6.8)
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)
DIELECTRICS = {
    "c0g", "x5r", "x7r", "x7s", "x6s", "x8r", "y5v",
    "al-electrolytic", "al-polymer", "ta-mno2", "ta-polymer", "film",
}  # fmt: skip
CERAMICS = ("c0g", "x5r", "x7r", "x7s", "x6s", "x8r", "y5v")
FIELD_LOGGER = CATALOGS / "scenarios" / "field-logger.toml"


@pytest.fixture(scope="module")
def bundled_db(
    tmp_path_factory: pytest.TempPathFactory, catalog_backend: str
) -> tuple[str, dict]:
    """Module scope: a catalog (each back-end) holding the four bundled CSVs, and the reports."""
    db = new_catalog(catalog_backend, tmp_path_factory.mktemp("bundled"))
    reports = {kind: import_catalog(db, [CATALOGS / name], kind)[0] for kind, name in FILES.items()}
    return db, reports


def columns(bundled_db, kind: str, *names: str) -> dict[str, np.ndarray]:
    return read_columns(bundled_db[0], kind, list(names) or None)


def is_member(value: float, series: tuple[float, ...]) -> bool:
    """Return True when ``value`` is a decade multiple of a member of ``series``."""
    mantissa = value / 10 ** math.floor(math.log10(value) + 1e-9)
    return any(math.isclose(mantissa, s, rel_tol=1e-6) for s in series)


def csv_rows(name: str) -> list[dict[str, str]]:
    with open(CATALOGS / name, encoding="utf-8", newline="") as handle:
        return list(csv.DictReader(handle))


# ---------------------------------------------------------------------------------------
# counts, identities, clean headers


@pytest.mark.parametrize("kind", list(FILES))
def test_bundled_file_imports_cleanly_with_enough_parts(bundled_db, kind):
    report = bundled_db[1][kind]
    assert report.rows >= MINIMUM_COUNTS[kind]
    assert report.added == report.rows
    assert (report.rejected, report.updated, report.unrecognised) == (0, 0, ())


@pytest.mark.parametrize("name", list(FILES.values()))
def test_no_duplicated_identity_in_a_bundled_file(name):
    keys = [(r["Manufacturer"], r["Mfr Part Number"]) for r in csv_rows(name)]
    assert [k for k, n in Counter(keys).items() if n > 1] == []


def test_part_numbers_are_unique_across_all_bundled_files():
    mpns = [r["Mfr Part Number"] for name in FILES.values() for r in csv_rows(name)]
    assert len(mpns) == len(set(mpns))


def test_several_invented_manufacturers_per_kind(bundled_db):
    for kind in FILES:
        assert len(set(columns(bundled_db, kind)["manufacturer"])) >= 3, kind


# ---------------------------------------------------------------------------------------
# E-series values


def test_inductances_are_e12_values(bundled_db):
    values = columns(bundled_db, "inductor", "inductance_h")["inductance_h"]
    assert [v for v in values if not is_member(v, E12)] == []


def test_capacitances_are_e6_values(bundled_db):
    values = columns(bundled_db, "capacitor", "capacitance_f")["capacitance_f"]
    assert [v for v in values if not is_member(v, E6)] == []


@pytest.mark.parametrize(
    ("value", "series", "member"),
    [(4.7e-6, E12, True), (5.6e-6, E12, True), (5.6e-6, E6, False), (5.0e-6, E12, False)],
)
def test_e_series_membership_helper(value, series, member):
    # IEC 60063: 5.6 is in E12 but not in E6; 5.0 is in neither
    assert is_member(value, series) is member


# ---------------------------------------------------------------------------------------
# physical trends


def inductor_series(bundled_db) -> dict[tuple[str, str], dict[str, np.ndarray]]:
    """Return the inductors grouped by (manufacturer, package), each sorted by inductance."""
    cols = columns(bundled_db, "inductor", "package", "inductance_h", "isat_a", "irms_a",
                   "dcr_ohm", "length_mm", "width_mm", "height_mm")  # fmt: skip
    groups: dict[tuple[str, str], dict[str, np.ndarray]] = {}
    for key in sorted(set(zip(cols["manufacturer"], cols["package"], strict=True))):
        rows = (cols["manufacturer"] == key[0]) & (cols["package"] == key[1])
        order = np.argsort(cols["inductance_h"][rows])
        groups[key] = {name: np.asarray(v)[rows][order] for name, v in cols.items()}
    return groups


def test_within_a_size_isat_falls_and_dcr_rises_with_inductance(bundled_db):
    # The energy a given core can store, L*Isat^2/2, is roughly fixed, and more turns raise
    # both L (as N^2) and DCR: common practice, no published source.
    for key, s in inductor_series(bundled_db).items():
        assert len(s["inductance_h"]) >= 4, key
        isat = s["isat_a"][~np.isnan(s["isat_a"])]
        irms = s["irms_a"][~np.isnan(s["irms_a"])]
        assert np.all(np.diff(isat) < 0), (key, isat)
        assert np.all(np.diff(s["dcr_ohm"]) > 0), (key, s["dcr_ohm"])
        assert np.all(np.diff(irms) <= 0), (key, irms)


def test_bigger_inductor_bodies_carry_more_current_at_the_same_inductance(bundled_db):
    # A bigger core stores more energy, so at equal L it saturates at a higher current:
    # common practice, no published source.
    by_l: dict[float, list[tuple[float, float, tuple]]] = {}
    for key, s in inductor_series(bundled_db).items():
        volume = float(s["length_mm"][0] * s["width_mm"][0] * s["height_mm"][0])
        for l_h, isat in zip(s["inductance_h"], s["isat_a"], strict=True):
            if not np.isnan(isat):
                by_l.setdefault(round(float(l_h), 12), []).append((volume, float(isat), key))
    compared = 0
    for l_h, entries in by_l.items():
        entries.sort()
        for (v1, i1, k1), (v2, i2, k2) in zip(entries, entries[1:], strict=False):
            if v2 > v1:
                compared += 1
                assert i2 > i1, (l_h, k1, k2)
    assert compared >= 10


def test_electrolytics_have_higher_esr_than_every_ceramic(bundled_db):
    cols = columns(bundled_db, "capacitor", "dielectric", "esr_ohm")
    esr, diel = cols["esr_ohm"], cols["dielectric"]
    electrolytic = esr[(diel == "al-electrolytic") & ~np.isnan(esr)]
    ceramic = esr[np.isin(diel, CERAMICS) & ~np.isnan(esr)]
    assert len(electrolytic) >= 4 and len(ceramic) >= 20
    assert electrolytic.min() > ceramic.max()
    # polymer parts typically sit between the two (a large polymer can beat a small
    # ceramic, so compare medians): common practice, no published source
    polymer = esr[(diel == "al-polymer") & ~np.isnan(esr)]
    assert np.median(ceramic) < np.median(polymer) < np.median(electrolytic)
    assert polymer.max() < electrolytic.min()


def test_every_dielectric_family_is_present(bundled_db):
    assert set(columns(bundled_db, "capacitor", "dielectric")["dielectric"]) == DIELECTRICS


def test_schottky_diodes_have_low_vf_and_low_vrrm(bundled_db):
    cols = columns(bundled_db, "diode", "diode_type", "vf_v", "vrrm_v")
    schottky = cols["diode_type"] == "schottky"
    assert set(cols["diode_type"]) == {"schottky", "fast", "standard", "sic"}
    assert cols["vf_v"][schottky].max() < cols["vf_v"][~schottky].min()
    # silicon Schottky parts stop at a few hundred volts; SiC starts at 600 V class:
    # common practice, no published source
    assert cols["vrrm_v"][schottky].max() <= 200
    assert cols["vrrm_v"][cols["diode_type"] == "sic"].min() >= 600
    assert np.median(cols["vrrm_v"][schottky]) < np.median(cols["vrrm_v"][~schottky])


def test_mosfet_on_resistance_rises_with_voltage_class_within_a_package(bundled_db):
    # Rds(on)*area grows steeply with breakdown voltage (the silicon limit):
    # Baliga, Fundamentals of Power Semiconductor Devices, ch. 6 (from memory)
    cols = columns(bundled_db, "mosfet", "package", "vds_v", "rds_on_ohm", "channel")
    n_dfn = (cols["package"] == "DFN3x3") & (cols["channel"] != "p")
    by_v = sorted(zip(cols["vds_v"][n_dfn], cols["rds_on_ohm"][n_dfn], strict=True))
    assert len(by_v) >= 4
    lowest_v, highest_v = by_v[0], by_v[-1]
    assert highest_v[1] > lowest_v[1]


def test_a_couple_of_p_channel_parts(bundled_db):
    assert (columns(bundled_db, "mosfet", "channel")["channel"] == "p").sum() >= 2


# ---------------------------------------------------------------------------------------
# commercial fields and gaps


@pytest.mark.parametrize("kind", list(FILES))
def test_lifecycle_is_mostly_active_with_some_nrnd_and_obsolete(bundled_db, kind):
    states = Counter(columns(bundled_db, kind, "lifecycle")["lifecycle"])
    total = sum(states.values())
    assert states["active"] >= 0.7 * total
    assert states["obsolete"] >= 1
    assert states["nrnd"] >= 1
    assert set(states) <= {"active", "nrnd", "obsolete"}


@pytest.mark.parametrize("kind", list(FILES))
def test_prices_and_stock_are_sensible(bundled_db, kind):
    cols = columns(bundled_db, kind, "unit_price", "stock")
    assert np.all((cols["unit_price"] > 0) & (cols["unit_price"] < 10))
    assert np.all(cols["stock"] >= 0) and np.any(cols["stock"] == 0)


@pytest.mark.parametrize(
    ("kind", "core_fields"),
    [
        ("inductor", ("isat_a", "irms_a")),
        ("capacitor", ("esr_ohm",)),
        ("diode", ("theta_ja_degc_w", "tj_max_degc")),
        ("mosfet", ("theta_ja_degc_w", "qgd_c")),
    ],
)
def test_some_parts_lack_each_core_figure(bundled_db, kind, core_fields):
    # so screening has unverified parts to show (issue 4, "Three outcomes")
    cols = columns(bundled_db, kind, *core_fields)
    for name in core_fields:
        missing = int(np.isnan(cols[name]).sum())
        assert 1 <= missing <= 0.2 * len(cols[name]), name  # a few gaps, not a hollow catalog


# ---------------------------------------------------------------------------------------
# messy exports: rejected exactly where spoiled, everything else read right

MESSY_INDUCTORS = CATALOGS / "messy" / "vendor_inductors_export.csv"
MESSY_CAPACITORS = CATALOGS / "messy" / "distributor_capacitors.tsv"


def test_messy_inductor_export_is_cp1252_semicolons_and_decimal_commas():
    raw = MESSY_INDUCTORS.read_bytes()
    assert b"L [\xb5H]" in raw  # µ as the single cp1252 byte 0xB5
    header = raw.splitlines()[2].decode("cp1252")
    assert header.count(";") == 14 and "," not in header
    assert b";3,3;" in raw


def test_messy_capacitor_export_is_utf16_with_bom_and_tabs():
    raw = MESSY_CAPACITORS.read_bytes()
    assert raw[:2] == b"\xff\xfe"
    assert "\t" in raw.decode("utf-16").splitlines()[0]


def test_messy_inductor_export_rejects_exactly_the_planted_rows(tmp_path):
    report = import_catalog(str(tmp_path / "m.db"), [MESSY_INDUCTORS], "inductor",
                            map_file=CATALOGS / "maps" / "vendor_inductors.toml")[0]  # fmt: skip
    planted = {
        ("Isat [A]", "-3,2"),  # a negative current
        ("Item Code", ""),  # no part number
        ("L [µH]", "10 uF"),  # a capacitance unit under inductance
        ("DCR (mOhm)", "see datasheet"),  # text that is not a value
    }
    assert {(r.column, r.value) for r in report.rejects} == planted
    assert (report.rows, report.added, report.rejected) == (14, 10, 4)
    assert set(report.unrecognised) == {"Dim. LxWxH [mm]", "Bin", "Last audit"}


# Values read by hand from the export (see the comments of catalogs/maps/vendor_inductors.toml)
@pytest.mark.parametrize(
    ("mpn", "field", "expected"),
    [
        ("PW-SD86-100M", "inductance_h", 10e-6),  # "0,01 mH"
        ("PW-SD86-100M", "dcr_ohm", 17e-3),  # "17mohm"
        ("PW-SD86-100M", "lifecycle", "nrnd"),  # "LTB"
        ("PW-SD86-6R8M", "dcr_ohm", 11.6e-3),  # "0,0116 Ohm"
        ("PW-SD86-6R8M", "tolerance", 0.2),  # "+/-20%"
        ("PW-SD86-3R3M", "inductance_h", 3.3e-6),  # bare "3,3" under "L [µH]"
        ("PW-SD86-3R3M", "unit_price", 0.62),  # "€0,62"
        ("PW-SD54-4R7N", "inductance_h", 4.7e-6),  # "4u7" (IEC 60062 letter code)
        ("PW-SD54-4R7N", "dcr_ohm", 14.1e-3),  # "14,1 mOhm"
        ("PW-SD54-470N", "lifecycle", "obsolete"),  # "EOL"
        ("PW-SD54-2R2N", "srf_hz", 38e6),  # "38" under "SRF [MHz]"
        ("PW-SD86-150M", "manufacturer", "Pellworth Inductive"),  # [constants] of the map
    ],
)
def test_messy_inductor_cells_read_right(tmp_path, mpn, field, expected):
    db = str(tmp_path / "m.db")
    import_catalog(db, [MESSY_INDUCTORS], "inductor",
                   map_file=CATALOGS / "maps" / "vendor_inductors.toml")  # fmt: skip
    cols = read_columns(db, "inductor", [field])
    value = cols[field][list(cols["mpn"]).index(mpn)]
    assert value == pytest.approx(expected) if isinstance(expected, float) else value == expected


def test_messy_capacitor_export_rejects_exactly_the_planted_rows(tmp_path):
    map_file = CATALOGS / "maps" / "distributor_capacitors.toml"
    report = import_catalog(str(tmp_path / "c.db"), [MESSY_CAPACITORS], "capacitor",
                            map_file=map_file)[0]  # fmt: skip
    planted = {
        ("Rated V", "-16V"),  # a negative voltage rating
        ("Cap.", "2.2 uH"),  # an inductance unit under capacitance
        ("TC / Tech", "unobtainium"),  # not a dielectric code
    }
    assert {(r.column, r.value) for r in report.rejects} == planted
    assert (report.rows, report.added, report.rejected) == (20, 17, 3)
    assert report.unrecognised == ("Note",)


@pytest.mark.parametrize(
    ("mpn", "field", "expected"),
    [
        ("DM-AE-1V102-1020", "esr_ohm", 0.045),  # "R045"
        ("DM-TA-1E106-C", "esr_ohm", 1.2),  # "1R2"
        ("SP-X7R-1206-475-50", "capacitance_f", 4.7e-6),  # "4u7"
        ("SP-C0G-0603-222-50", "capacitance_f", 2.2e-9),  # "2n2"
        ("SP-C0G-0603-222-50", "dielectric", "c0g"),  # "COG"
        ("SP-C0G-1206-104-100", "dielectric", "c0g"),  # "NP0"
        ("SP-X7R-1210-106-50", "temp_max_degc", 125.0),  # "-55 ~ 125 °C"
        ("SP-X7R-1210-106-50", "stock", 12000.0),  # "12,000"
        ("SP-X5R-0805-226-25", "voltage_v", 25.0),  # bare "25", [units] voltage_v = "V"
        ("SP-X5R-0805-226-25", "unit_price", 0.11),  # "0.11 USD"
        ("DM-AE-1C221-0611", "dielectric", "al-electrolytic"),  # "Electrolytic"
        ("DM-FP-2A475-B", "dielectric", "film"),  # "PP Film"
    ],
)
def test_messy_capacitor_cells_read_right(tmp_path, mpn, field, expected):
    db = str(tmp_path / "c.db")
    import_catalog(db, [MESSY_CAPACITORS], "capacitor",
                   map_file=CATALOGS / "maps" / "distributor_capacitors.toml")  # fmt: skip
    cols = read_columns(db, "capacitor", [field])
    value = cols[field][list(cols["mpn"]).index(mpn)]
    assert value == pytest.approx(expected) if isinstance(expected, float) else value == expected


# ---------------------------------------------------------------------------------------
# the field-logger scenario: hand-worked envelope and outcomes


# Hand-worked in the comments of catalogs/scenarios/field-logger.toml from the issue-3
# boost formulas (D = 1 - Vin*eta/Vout, the application-note form of TI SLVA372;
# IL = Iout/(1-D); dIL = Vin*D/(fsw*L)).
@pytest.mark.parametrize(
    ("key", "expected"),
    [
        ("duty_max", 0.7875),  # 1 - 6.0*0.85/24
        ("duty_min", 0.7025),  # 1 - 8.4*0.85/24
        ("il_avg_max_a", 3.7647),  # 0.8/0.2125
        ("l_min_h", 9.797e-6),  # 8.4*0.7025/(400e3*0.4*3.7647)
        ("l_max_h", 19.593e-6),  # same with 0.2
        # smallest E12 value L with L*(1 - 0.2) >= 9.80 uH (spec default tolerance): 15 uH
        ("l_recommended_h", 15e-6),
        ("il_peak_max_a", 4.368),  # 3.7647 + 1.206/2 at 6.0 V
        ("isw_rms_max_a", 3.355),  # sqrt(0.7875*(3.7647^2 + 1.206^2/12))
        ("vsw_max_v", 24.76),  # 24 + 0.12/2 + 0.7 (the spec's default diode VF)
        ("icout_rms_max_a", 1.548),  # at 6.0 V
        ("icin_rms_max_a", 0.4347),  # 1.506/sqrt(12) at 8.4 V
        ("cout_min_f", 13.125e-6),  # 0.8*0.7875/(400e3*0.12)
    ],
)
def test_field_logger_envelope_matches_the_hand_working(key, expected):
    envelope = analyse(load_spec(FIELD_LOGGER))
    assert envelope.value(key) == pytest.approx(expected, rel=1e-3)


@pytest.fixture(scope="module")
def field_logger_picks(bundled_db):
    spec, profile = load_spec(FIELD_LOGGER), load_profile("standard")
    roles = ("inductor", "input-cap", "output-cap", "diode", "switch")
    return {role: pick(bundled_db[0], spec, role, profile=profile) for role in roles}


@pytest.mark.parametrize("role", ["inductor", "input-cap", "output-cap", "diode", "switch"])
def test_field_logger_has_passes_unverified_and_varied_failures(field_logger_picks, role):
    result = field_logger_picks[role]
    assert len(result.passed) >= 3
    assert len(result.unverified) >= 1
    assert len([rule for rule, n in result.fail_counts.items() if n]) >= 2


def outcome_of(field_logger_picks, role: str, mpn: str):
    result = field_logger_picks[role]
    for outcome in [*result.passed, *result.unverified, *result.failed]:
        if outcome.mpn == mpn:
            return outcome
    raise AssertionError(f"{mpn} not in the {role} results")


# Hand-worked against the `standard` profile of issue 4 (values from the bundled CSVs; the
# envelope above: peak 4.368 A at l_min, switch RMS 3.355 A, 24.76 V on the switch with the
# spec's default 0.7 V diode drop, 24.06 V on the diode).
@pytest.mark.parametrize(
    ("role", "mpn", "status", "failing"),
    [
        # 10 uH -20 % = 8 uH < l_min = 9.80 uH: at its tolerance the ripple leaves the band
        # (0.49*IL, issue 10); its currents would fit (peak 4.50 A <= 0.8*8.4 A)
        ("inductor", "QM-1040-100M", "failed", {"inductance"}),
        # 22 uH is above l_max = 19.59 uH
        ("inductor", "QM-1040-220M", "failed", {"inductance"}),
        # at 8 uH the peak is 4.50 A > 0.8*4.4 A; RMS 3.79 A > 0.9*3.6 A; 8 uH < l_min
        ("inductor", "QM-0630-100M", "failed", {"saturation", "rms", "inductance"}),
        # obsolete, and 8 uH at its tolerance is below l_min
        ("inductor", "HCW-PR1265-100M", "failed", {"lifecycle", "inductance"}),
        ("inductor", "VD73-120K", "unverified", set()),  # no Isat given
        # 24.76 V (24.06 V + 0.7 V diode drop) > 0.8*30 V = 24.0 V
        ("switch", "TS-QN30-12Q", "failed", {"drain-voltage"}),
        # 4.368 A > 0.6*7 A = 4.2 A
        ("switch", "TS-QN40-7T", "failed", {"drain-current"}),
        ("switch", "TS-QP40-10Q", "failed", {"channel"}),
        # P = 11.26*0.095*1.5 + 0.5*24.06*3.765*(2*5e-9)*400e3 + 0.5*150e-12*24.06^2*400e3
        #   = 1.604 + 0.181 + 0.017 = 1.80 W; 60 + 1.80*50 = 150 degC > 150 - 25
        ("switch", "KD-QN150-10D", "failed", {"thermal"}),
        # P = 0.304 + 0.091 + 0.017 = 0.41 W; 60 + 0.41*60 = 85 degC <= 125 degC
        ("switch", "TS-QN40-8Q", "passed", set()),
        ("diode", "TS-ZK30-2A0A", "failed", {"reverse-voltage"}),  # 24.06 V > 0.8*30 V
        ("diode", "TS-ZG1000-2A0B", "failed", {"recovery", "thermal"}),  # standard recovery, Qrr
        # 60 + 0.50*0.8*125 = 110 degC > 125 - 25 = 100 degC
        ("diode", "KD-ZK45-2A0L", "failed", {"thermal"}),
        # 60 + (0.95*0.8 + 8e-9*24*400e3)*75 = 60 + 0.837*75 = 122.8 degC <= 125 degC
        ("diode", "TS-ZF100-2A0B", "passed", set()),
        ("diode", "OM-ZK40-2A0A", "unverified", set()),  # no Tj max given
        # 24.06 V > 0.5*35 V = 17.5 V (class II ceramic); at 69 % of its rating it keeps
        # 0.42 - 0.15*18.6/30 = 0.327 (X5R table, from memory): C_eff 2.94 uF, n = 4 gives
        # 0.63/(400e3*4*2.94e-6) = 0.134 V > 0.12 V, so its ripple fails too
        ("output-cap", "OPC-12065-106K35", "failed", {"voltage", "ripple-voltage"}),
        # n = 4: 0.34/4*4.368 = 0.371 V > 0.12 V; 1.548/4 = 0.39 A > 0.29 A
        ("output-cap", "AE-RL1V101-0611", "failed", {"ripple-voltage", "ripple-current"}),
        ("output-cap", "BCP-50V330-0810", "unverified", set()),  # no ESR given
        # 8.4 V > 0.5*16 V = 8.0 V
        ("input-cap", "OPC-08055-106M16", "failed", {"voltage"}),
        ("input-cap", "KT-M476-16C", "failed", {"voltage"}),  # tantalum u = 0.5
    ],
)
def test_field_logger_outcomes_match_the_hand_working(field_logger_picks, role, mpn, status,
                                                      failing):  # fmt: skip
    outcome = outcome_of(field_logger_picks, role, mpn)
    assert outcome.status == status
    assert {c.rule for c in outcome.checks if c.status == "fail"} == failing


@pytest.mark.parametrize(
    ("role", "mpn", "count"),
    [
        # DC-bias kept fractions below: the standard profile's tables (from memory), linear
        # between points. X7R 50 V at 24 V (48 %): 0.78 - 0.28*23/25 = 0.5224, so
        # C_eff = 10 uF*0.9*0.5224 = 4.70 uF; n = 2: 0.63/(400e3*2*4.70e-6) = 0.168 V > 0.12 V;
        # n = 3: 0.1117 + 0.004/3*4.368 = 0.1175 V <= 0.12 V
        ("output-cap", "OPC-12107-106K50", 3),
        # C_eff = 80 uF: 0.63/(400e3*80e-6) + 0.018*4.368 = 0.0197 + 0.0786 = 0.098 V
        ("output-cap", "BCP-35V101-0811", 1),
        # C_eff = 33 uF*0.8 = 26.4 uF; n = 1: 0.060 + 0.175 V fails; n = 2: 0.030 + 0.087 V
        ("output-cap", "KT-P336-35D", 2),
        # X5R 25 V at 8.4 V (33.6 %): 0.70 - 0.28*8.6/25 = 0.6037, C_eff = 22 uF*0.8*0.6037
        # = 10.62 uF: 1.506/(8*400e3*10.62e-6) + 0.005*1.506 = 0.052 V
        ("input-cap", "OPC-12065-226M25", 1),
        # X5R 50 V at 8.4 V (16.8 %): 0.88 - 0.18*6.8/15 = 0.7984, C_eff = 4.7 uF*0.9*0.7984
        # = 3.377 uF; n = 1: 0.139 + 0.011 = 0.150 V fails; n = 2: 0.070 + 0.005 V
        ("input-cap", "OPC-12065-475K50", 2),
        # issue 10: a 100 V X7R at 8.4 V is at 8.4 % of its rating and keeps most of its
        # capacitance: 1 - 0.084*0.08/0.1 = 0.9328 (X7R table, from memory), C_eff = 2.2 uF
        # *0.9*0.9328 = 1.847 uF; n = 2: 0.127 + 0.006 V fails; n = 3: 0.0849 + 0.0040 V.
        # With the old fixed 0.6 it needed 4 (0.099 + 0.003 V).
        ("input-cap", "OPC-12107-225K100", 3),
    ],
)
def test_field_logger_parallel_counts_match_the_hand_working(field_logger_picks, role, mpn,
                                                             count):  # fmt: skip
    outcome = outcome_of(field_logger_picks, role, mpn)
    assert (outcome.status, outcome.count) == ("passed", count)


# ---------------------------------------------------------------------------------------
# the LED-bias scenario (hand-worked in the comments of catalogs/scenarios/led-bias.toml)

LED_BIAS = CATALOGS / "scenarios" / "led-bias.toml"


@pytest.mark.parametrize(
    ("key", "expected"),
    [
        ("duty_max", 0.7875),  # 1 - 3.0*0.85/12
        ("l_min_h", 6.270e-6),  # 4.2*0.7025/(1e6*0.4*1.1765)
        ("l_max_h", 12.540e-6),  # same with 0.2
        ("il_peak_max_a", 1.365),  # 1.1765 + 0.377/2 at 3.0 V
        ("vsw_max_v", 12.75),  # 12 + 0.1/2 + 0.7 (the spec's default diode VF)
        ("cout_min_f", 1.969e-6),  # 0.25*0.7875/(1e6*0.1)
    ],
)
def test_led_bias_envelope_matches_the_hand_working(key, expected):
    assert analyse(load_spec(LED_BIAS)).value(key) == pytest.approx(expected, rel=1e-3)


@pytest.mark.parametrize("role", ["inductor", "input-cap", "output-cap", "diode", "switch"])
def test_led_bias_has_at_least_three_passes_per_role(bundled_db, role):
    result = pick(bundled_db[0], load_spec(LED_BIAS), role, profile=load_profile("standard"))
    assert len(result.passed) >= 3
