"""Invented capacitors of every dielectric family; ceramics low ESR, electrolytics high ESR."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .common import (
    E6,
    blank_some,
    cap_text,
    choose_text,
    coded,
    eseries_values,
    iec_code,
    jitter,
    join_columns,
    lifecycle_column,
    makers,
    missing_markers,
    ohm_text,
    pick_per_row,
    price_column,
    round_sig,
    serials,
    size_columns,
    stock_column,
    texts,
    tolerance_column,
    value_code,
)

KIND = "capacitor"

MLCC_PACKAGES = ["0402", "0603", "0805", "1206", "1210", "1812", "2220"]
MLCC_DIMS = np.array(
    [
        (1.0, 0.5, 0.5),
        (1.6, 0.8, 0.8),
        (2.0, 1.25, 1.25),
        (3.2, 1.6, 1.6),
        (3.2, 2.5, 2.5),
        (4.5, 3.2, 2.5),
        (5.7, 5.0, 2.5),
    ]
)
MLCC_ESR_OHM = np.array([0.020, 0.012, 0.008, 0.006, 0.004, 0.003, 0.0025])
MLCC_RIPPLE_A = np.array([0.6, 1.0, 1.6, 2.2, 3.0, 3.6, 4.2])
VOLTAGES = np.array([6.3, 10, 16, 25, 35, 50, 63, 100, 250, 400, 630])
# family: weight, E-series, C range (uF), voltage index range, tolerance choices, temp max
# (degC), log10 density offset of the dielectric (ceramics only; bigger packs more C*V)
# fmt: off
CAP_FAMILIES = {
    "c0g": (0.08, E6, (1e-5, 0.1), (5, 7), (0.05,), 125, 2.0),
    "x5r": (0.18, E6, (0.1, 100), (0, 5), (0.1, 0.2), 85, 0.0),
    "x7r": (0.25, E6, (0.01, 47), (1, 7), (0.1, 0.2), 125, 0.2),
    "x7s": (0.04, E6, (0.1, 47), (1, 5), (0.1, 0.2), 125, 0.1),
    "x6s": (0.04, E6, (0.1, 47), (1, 5), (0.2,), 105, 0.1),
    "x8r": (0.03, E6, (0.01, 10), (3, 7), (0.1,), 150, 0.4),
    "y5v": (0.03, E6, (0.1, 22), (0, 4), (0.2,), 85, -0.5),
    "al-electrolytic": (0.12, E6, (1, 4700), (0, 7), (0.2,), 105, 0),
    "al-polymer": (0.08, E6, (10, 1000), (0, 5), (0.2,), 105, 0),
    "ta-mno2": (0.06, E6, (1, 470), (0, 5), (0.1, 0.2), 125, 0),
    "ta-polymer": (0.05, E6, (4.7, 470), (0, 5), (0.2,), 105, 0),
    "film": (0.04, E6, (0.01, 22), (6, 10), (0.05, 0.1), 105, 0),
}
# how exports spell each family (the clean layout uses the first)
DIELECTRIC_SPELLINGS = {
    "c0g": ["C0G", "NP0", "C0G/NP0", "COG"], "x5r": ["X5R", "x5r"], "x7r": ["X7R", "x7r"],
    "x7s": ["X7S"], "x6s": ["X6S"], "x8r": ["X8R"], "y5v": ["Y5V"],
    "al-electrolytic": ["Aluminum Electrolytic", "Electrolytic", "Al-E", "Aluminium Electrolytic"],
    "al-polymer": ["Aluminum Polymer", "Polymer Aluminum", "Aluminium Polymer"],
    "ta-mno2": ["Tantalum", "Tantalum MnO2", "MnO2"],
    "ta-polymer": ["Tantalum Polymer", "Polymer Tantalum"],
    "film": ["Film", "Polypropylene", "PET Film", "Metallized Film"],
}
# fmt: on
FAMILIES = tuple(CAP_FAMILIES)
# who makes what (maker, part-number prefix)
CAP_MAKERS = {
    "ceramic": [("Orrin Passives", "OPC"), ("Sorrelby Passives", "SP")],
    "al-electrolytic": [("Ambryn Electrolytics", "AE"), ("Dunmere Capacitor", "DM")],
    "al-polymer": [("Belcastle Capacitor", "BCP"), ("Dunmere Capacitor", "DMP")],
    "ta-mno2": [("Kelsing Tantalum", "KT")],
    "ta-polymer": [("Kelsing Tantalum", "KTP"), ("Belcastle Capacitor", "BCT")],
    "film": [("Calderwick Film", "CF")],
}
CERAMICS = ("c0g", "x5r", "x7r", "x7s", "x6s", "x8r", "y5v")
CAN_PACKAGES = {"ta-mno2": "SMD molded", "ta-polymer": "SMD molded", "film": "Box"}
MLCC_SCORE_EDGES = np.array([1.0, 1.9, 2.9, 3.5, 3.9, 4.3])  # case edges of log10(C[uF]*V^1.5)
MLCC_SCORE_MAX = 4.7

# fmt: off
HEADERS = {
    "clean": ["Mfr Part Number", "Manufacturer", "Description", "Capacitance", "Tolerance",
              "Voltage Rating", "Dielectric", "ESR", "Ripple Current", "Operating Temperature",
              "Lifetime", "Package", "Length", "Width", "Height", "Unit Price", "Stock",
              "Lifecycle"],
    "messy": ["MPN", "Maker", "Product Description", "Cap", "Tol", "Voltage - Rated",
              "Temperature Coefficient", "ESR (Max)", "Max Ripple Current",
              "Operating Temperature Range", "Load Life", "Case Code", "Length (mm)",
              "Width (mm)", "Height (mm)", "Price Each", "Qty Available", "Part Status"],
}
# fmt: on
# one cell fault per bad row: (field, text) -- a wrong unit, a negative value, plain text
BAD_CELLS = [("capacitance_f", "4.7 uH"), ("voltage_v", "-16 V"), ("esr_ohm", "low")]


@dataclass(frozen=True)
class _Capacitors:
    """The drawn values of every row, in SI units unless the name says otherwise."""

    family: np.ndarray  # index into FAMILIES
    capacitance_f: np.ndarray
    voltage_v: np.ndarray
    tolerance: np.ndarray  # fraction
    esr_ohm: np.ndarray
    ripple_a: np.ndarray
    dims_mm: np.ndarray  # (rows, 3): length, width, height
    package: np.ndarray
    temp_max_degc: np.ndarray
    life_h: np.ndarray  # NaN where the family has no rated life
    maker: np.ndarray
    prefix: np.ndarray
    price: np.ndarray  # currency


def _capacitor_family_values(rng, fam, n):
    """Return (C in F, rated V, tolerance) for ``n`` parts of one family."""
    _, series, c_range, v_range, tols, _, _ = CAP_FAMILIES[fam]
    c_uf = pick_per_row(rng, [eseries_values(series, *c_range)], np.zeros(n, dtype=int))
    v = VOLTAGES[rng.integers(v_range[0], v_range[1] + 1, n)]
    tol = np.array(tols)[rng.integers(0, len(tols), n)]
    return c_uf * 1e-6, v, tol


def _ceramic_body(fam, c_f, v):
    """Return (rated V, package index, ESR, ripple) of MLCCs: C*V^1.5 sets the case.

    A bigger case holds more C*V (denser dielectrics need less); a value that does not fit
    the largest case gets a lower rated voltage: common practice, no published source.
    """
    offset = CAP_FAMILIES[fam][6]
    v_fit = (10 ** (MLCC_SCORE_MAX - offset) / (c_f * 1e6)) ** (1 / 1.5)
    fits = VOLTAGES[None, :] <= v_fit[:, None]
    largest = VOLTAGES[np.maximum(fits.sum(axis=1) - 1, 0)]
    v = np.minimum(v, largest)
    score = np.log10(c_f * 1e6 * v**1.5) + offset
    pkg = np.searchsorted(MLCC_SCORE_EDGES, score)
    return v, pkg, MLCC_ESR_OHM[pkg], MLCC_RIPPLE_A[pkg]


def _can_body(fam, c_f, v):
    """Return (dims, ESR, ripple) of electrolytic, polymer, tantalum and film parts from C*V."""
    cv = c_f * 1e6 * v  # uF*V
    # ESR and ripple against C*V, fitted by eye to typical catalog spreads: common practice,
    # no published source. Electrolytic ESR is the highest, polymer the lowest.
    esr_k, esr_e, rip_k, rip_e = {
        "al-electrolytic": (8.0, -0.4, 0.008, 0.45),
        "al-polymer": (0.12, -0.25, 0.5, 0.2),
        "ta-mno2": (6.0, -0.35, 0.05, 0.3),
        "ta-polymer": (0.4, -0.35, 0.25, 0.28),
        "film": (0.05, -0.2, 0.6, 0.2),
    }[fam]
    esr = esr_k * cv**esr_e
    ripple = rip_k * cv**rip_e
    # body scale ~ (C*V)^(1/3) (volume ~ stored charge times voltage): common practice
    k, d_min, shape = {
        "al-electrolytic": (0.42, 4.0, (1.0, 1.0, 1.75)),
        "al-polymer": (0.5, 5.0, (1.0, 1.0, 1.3)),
        "ta-mno2": (0.5, 2.0, (1.7, 1.0, 0.7)),
        "ta-polymer": (0.5, 2.0, (1.7, 1.0, 0.7)),
        "film": (2.0, 5.0, (2.0, 1.0, 1.7)),
    }[fam]
    d = np.clip(k * cv ** (1 / 3), d_min, 40.0)
    dims = d[:, None] * np.array(shape)[None, :]
    return dims, esr, ripple


def _draw_bodies(rng: np.random.Generator, rows: int):
    """Return (family, C, V, tolerance, ESR, ripple, dims, package) before the spread."""
    weights = np.array([CAP_FAMILIES[f][0] for f in FAMILIES])
    fam_idx = rng.choice(len(FAMILIES), size=rows, p=weights / weights.sum())
    c_f, v, tol = np.zeros(rows), np.zeros(rows), np.zeros(rows)
    esr, ripple, dims = np.zeros(rows), np.zeros(rows), np.zeros((rows, 3))
    package = np.empty(rows, dtype=object)
    for i, fam in enumerate(FAMILIES):
        rows_f = np.flatnonzero(fam_idx == i)
        c_f[rows_f], v[rows_f], tol[rows_f] = _capacitor_family_values(rng, fam, len(rows_f))
        if fam in CERAMICS:
            v[rows_f], pkg, esr[rows_f], ripple[rows_f] = _ceramic_body(fam, c_f[rows_f], v[rows_f])
            dims[rows_f] = MLCC_DIMS[pkg]
            package[rows_f] = np.array(MLCC_PACKAGES, dtype=object)[pkg]
        else:
            dims[rows_f], esr[rows_f], ripple[rows_f] = _can_body(fam, c_f[rows_f], v[rows_f])
            package[rows_f] = CAN_PACKAGES.get(fam, "Radial")
    return fam_idx, c_f, v, tol, esr, ripple, dims, package


def _temperature_and_life(rng: np.random.Generator, fam_idx: np.ndarray, rows: int):
    """Return (max temperature in degC, rated life in h); only aluminium parts have a life."""
    temp = np.array([CAP_FAMILIES[f][5] for f in FAMILIES], dtype=float)[fam_idx]
    aluminium = np.isin(fam_idx, [FAMILIES.index("al-electrolytic"), FAMILIES.index("al-polymer")])
    hot = aluminium & (rng.random(rows) < 0.3)
    temp = np.where(hot, 125.0, temp)
    life = np.where(
        aluminium,
        np.array([1000.0, 2000, 5000, 10000])[rng.integers(0, 4, rows)],
        np.nan,
    )
    return temp, life


def _draw_makers(rng: np.random.Generator, fam_idx: np.ndarray, rows: int):
    """Return each row's maker and part-number prefix, from the makers of its family."""
    maker, prefix = np.empty(rows, dtype=object), np.empty(rows, dtype=object)
    for i, fam in enumerate(FAMILIES):
        rows_f = np.flatnonzero(fam_idx == i)
        names, prefixes = zip(*CAP_MAKERS["ceramic" if fam in CERAMICS else fam], strict=True)
        maker[rows_f], (pool, which) = makers(rng, names, prefixes, len(rows_f))
        prefix[rows_f] = np.array(pool, dtype=object)[which]
    return maker, prefix


def _draw_values(rng: np.random.Generator, rows: int) -> _Capacitors:
    """Return the values of ``rows`` capacitors; ESR and ripple spread together per part."""
    fam_idx, c_f, v, tol, esr, ripple, dims, package = _draw_bodies(rng, rows)
    spread = jitter(rng, rows, 0.15)
    esr, ripple = round_sig(esr * spread), round_sig(ripple / np.sqrt(spread))
    temp, life = _temperature_and_life(rng, fam_idx, rows)
    maker, prefix = _draw_makers(rng, fam_idx, rows)
    price = (0.01 + 0.02 * np.sqrt(c_f * 1e6 * v) ** 0.6) * jitter(rng, rows, 0.3)
    return _Capacitors(
        fam_idx, c_f, v, tol, esr, ripple, dims, package, temp, life, maker, prefix, price
    )


def _spellings(layout: str) -> dict[str, list]:
    """Return the spellings of each numeric column; the clean layout has one per column."""
    if layout != "messy":
        return {
            "c": [cap_text],
            "v": [(1.0, " V")],
            "esr": [ohm_text],
            "ripple": [(1.0, " A")],
            "temp": [lambda t: f"-55°C ~ {t:g}°C"],
            "life": [(1.0, " h")],
        }
    return {
        "c": [
            cap_text,
            lambda x: cap_text(x).replace(" ", ""),
            lambda x: iec_code(x, "u", 1e-6) if x >= 1e-6 else iec_code(x, "n", 1e-9),
            lambda x: cap_text(x).replace("u", "µ"),
        ],
        "v": [(1.0, " V"), (1.0, "V"), (1.0, " VDC")],
        "esr": [
            ohm_text,
            lambda x: f"{x:.3g} Ω",
            lambda x: f"{x * 1e3:.3g}mΩ",
            lambda x: f"{x:.3g} ohm",
        ],
        "ripple": [(1.0, " A"), (1e-3, " mA")],
        "temp": [lambda t: f"-55°C ~ {t:g}°C", lambda t: f"{t:g} °C", lambda t: f"{t:g}°C"],
        "life": [(1.0, " h"), (1.0, " hours")],
    }


def _part_numbers(parts: _Capacitors, rows: int, seed: int) -> np.ndarray:
    """Return part numbers such as "OPC-105-25V-" (value code in pF) plus a unique serial."""
    c_code = coded(parts.capacitance_f * 1e12, value_code)
    v_code = coded(parts.voltage_v, lambda x: f"{x:g}V")
    return join_columns(parts.prefix, "-", c_code, "-", v_code, "-") + serials(rows, seed)


def build_columns(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Return the capacitor text columns, keyed by canonical field, in ``HEADERS`` order."""
    parts = _draw_values(rng, rows)
    family = (FAMILIES, parts.family)
    mpn = _part_numbers(parts, rows, seed)
    messy = layout == "messy"
    diel_text = {
        f: DIELECTRIC_SPELLINGS[f] if messy else DIELECTRIC_SPELLINGS[f][:1] for f in FAMILIES
    }
    sp, miss = _spellings(layout), missing_markers(layout)
    return {
        "mpn": mpn,
        "manufacturer": parts.maker,
        "description": choose_text(
            rng, family, {f: [DIELECTRIC_SPELLINGS[f][0] + " capacitor"] for f in FAMILIES}
        ),
        "capacitance_f": texts(rng, parts.capacitance_f, sp["c"], miss),
        "tolerance": tolerance_column(rng, parts.tolerance, layout),
        "voltage_v": texts(rng, parts.voltage_v, sp["v"], miss),
        "dielectric": choose_text(rng, family, diel_text),
        "esr_ohm": texts(rng, blank_some(rng, parts.esr_ohm, 0.03), sp["esr"], miss),
        "ripple_a": texts(rng, blank_some(rng, parts.ripple_a, 0.03), sp["ripple"], miss),
        "temp_max_degc": texts(rng, parts.temp_max_degc, sp["temp"], miss),
        "life_h": texts(rng, parts.life_h, sp["life"], miss),
        "package": parts.package,
        **size_columns(rng, parts.dims_mm, layout),
        "unit_price": price_column(rng, parts.price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }
