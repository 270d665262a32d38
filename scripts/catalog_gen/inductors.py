"""Invented power inductors: E12 values per body size; Isat and Irms fall, DCR rises with L."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .common import (
    E12,
    blank_some,
    choose_text,
    coded,
    eseries_values,
    iec_code,
    jitter,
    join_columns,
    lifecycle_column,
    makers,
    missing_markers,
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

KIND = "inductor"

# name, (l, w, h) mm, shielded, Isat at 10 uH (A), DCR at 10 uH (mOhm), Irms at 10 uH (A),
# SRF at 10 uH (MHz), price (USD), L range (uH). Isat ~ 1/sqrt(L) (stored energy of one
# core is fixed), DCR ~ L (turns squared), Irms ~ 1/sqrt(DCR), SRF ~ 1/sqrt(L): common
# practice, no published source. Bigger bodies carry more current at the same L.
INDUCTOR_SIZES = [
    ("0603", (1.6, 0.8, 0.8), True, 0.25, 1500, 0.20, 60, 0.04, (0.47, 4.7)),
    ("0805", (2.0, 1.25, 1.0), True, 0.45, 520, 0.40, 40, 0.06, (0.47, 10)),
    ("2016", (2.0, 1.6, 1.0), True, 0.90, 280, 0.80, 45, 0.09, (0.47, 10)),
    ("2520", (2.5, 2.0, 1.2), True, 1.30, 160, 1.10, 40, 0.12, (0.47, 22)),
    ("3015", (3.0, 3.0, 1.5), True, 1.70, 100, 1.50, 32, 0.16, (1.0, 47)),
    ("4020", (4.0, 4.0, 2.0), True, 2.10, 62, 1.90, 28, 0.22, (1.0, 100)),
    ("5040", (5.0, 5.0, 4.0), True, 3.60, 40, 3.00, 22, 0.30, (1.0, 220)),
    ("7030", (7.0, 6.6, 3.0), True, 4.40, 38, 3.60, 20, 0.35, (1.0, 220)),
    ("7850", (7.8, 7.0, 5.0), False, 6.10, 24, 4.80, 18, 0.30, (2.2, 470)),
    ("1040", (10.0, 10.0, 4.0), True, 8.40, 19, 7.00, 14, 0.60, (1.0, 470)),
    ("1265", (12.5, 12.5, 6.5), True, 11.5, 11, 9.50, 11, 1.10, (1.0, 1000)),
    ("1770", (17.0, 17.0, 7.0), True, 16.0, 8, 13.0, 8, 1.90, (2.2, 1000)),
]
INDUCTOR_MAKERS = [
    "Quillmark Magnetics",
    "Harrowgate Coil Works",
    "Vantry Components",
    "Pellworth Inductive",
    "Brackwell Windings",
    "Istrel Magnetics",
    "Tarnby Coil Co.",
]
INDUCTOR_PREFIXES = ["QM", "HCW", "VT", "PW", "BW", "IM", "TC"]
SIZE_NAMES = np.array([s[0] for s in INDUCTOR_SIZES], dtype=object)

# fmt: off
HEADERS = {
    "clean": ["Mfr Part Number", "Manufacturer", "Description", "Inductance", "Tolerance",
              "Saturation Current (Isat)", "RMS Current", "DC Resistance", "SRF", "Package",
              "Length", "Width", "Height", "Shielded", "Unit Price", "Stock", "Lifecycle"],
    "messy": ["Part No", "Mfr", "Desc", "Inductance [uH]", "Tol.", "Isat, A", "Irms (A)",
              "DCR (mΩ)", "SRF (MHz)", "Case", "Length (mm)", "Width (mm)", "Height (mm)",
              "Shielding", "Price Each", "Qty Available", "Lifecycle Status"],
}
# fmt: on
# one cell fault per bad row: (field, text) -- a wrong unit, a negative value, plain text
BAD_CELLS = [("inductance_h", "10 uF"), ("isat_a", "-3.2 A"), ("dcr_ohm", "see datasheet")]


@dataclass(frozen=True)
class _Inductors:
    """The drawn values of every row, in SI units unless the name says otherwise."""

    size: np.ndarray  # index into INDUCTOR_SIZES
    inductance_uh: np.ndarray
    isat_a: np.ndarray
    dcr_ohm: np.ndarray
    irms_a: np.ndarray
    srf_hz: np.ndarray
    tolerance: np.ndarray  # fraction
    maker: np.ndarray
    prefix: tuple[list[str], np.ndarray]
    price: np.ndarray  # currency


def _draw_values(rng: np.random.Generator, rows: int) -> _Inductors:
    """Return the values of ``rows`` inductors, scaled from each body's figures at 10 uH."""
    size = rng.integers(0, len(INDUCTOR_SIZES), rows)
    table = [eseries_values(E12, *s[8]) for s in INDUCTOR_SIZES]
    l_uh = pick_per_row(rng, table, size)
    col = {
        k: np.array([s[i] for s in INDUCTOR_SIZES])
        for i, k in ((3, "i10"), (4, "d10"), (5, "r10"), (6, "s10"), (7, "p0"))
    }
    isat = round_sig(col["i10"][size] * np.sqrt(10 / l_uh) * jitter(rng, rows, 0.05))
    dcr = round_sig(col["d10"][size] * (l_uh / 10) * jitter(rng, rows, 0.05), 3) * 1e-3
    irms = round_sig(col["r10"][size] * np.sqrt(10 / l_uh) * jitter(rng, rows, 0.05))
    srf = round_sig(col["s10"][size] * np.sqrt(10 / l_uh) * jitter(rng, rows, 0.08)) * 1e6
    tol = np.where(l_uh < 2.2, 0.3, np.where(rng.random(rows) < 0.2, 0.1, 0.2))
    maker, prefix = makers(rng, INDUCTOR_MAKERS, INDUCTOR_PREFIXES, rows)
    price = col["p0"][size] * (1 + 0.1 * np.log10(l_uh)) * jitter(rng, rows, 0.15)
    return _Inductors(size, l_uh, isat, dcr, irms, srf, tol, maker, prefix, price)


def _part_numbers(parts: _Inductors, rows: int, seed: int) -> np.ndarray:
    """Return part numbers such as "QM-4020-4R7M-" plus a unique serial."""
    tol = parts.tolerance
    tol_letter = (["K", "M", "N"], np.where(tol == 0.3, 2, np.where(tol == 0.1, 0, 1)))
    l_code = coded(parts.inductance_uh, value_code)
    size_name = (SIZE_NAMES, parts.size)
    return join_columns(parts.prefix, "-", size_name, "-", l_code, tol_letter, "-") + serials(
        rows, seed
    )


def _spellings(layout: str) -> dict[str, list]:
    """Return the spellings of each numeric column (messy headers: uH, A, mΩ, MHz)."""
    if layout != "messy":
        return {
            "l": [(1e-6, " uH")],
            "i": [(1.0, " A")],
            "r": [(1e-3, " mOhm")],
            "f": [(1e6, " MHz")],
            "shielded": (["Yes"], ["No"]),
        }
    return {
        "l": [
            (1e-6, ""),
            (1e-6, " uH"),
            (1e-6, "µH"),
            lambda v: iec_code(v, "u", 1e-6),
            (1e-9, " nH"),
            (1e-3, " mH"),
        ],
        "i": [(1.0, ""), (1.0, " A"), (1e-3, " mA"), (1.0, "A")],
        "r": [(1e-3, ""), (1e-3, " mOhm"), (1.0, " Ω"), (1e-3, "mΩ"), (1.0, " ohms")],
        "f": [(1e6, ""), (1e6, " MHz"), (1e3, " kHz")],
        "shielded": (["Yes", "yes", "Y"], ["No", "no", "N"]),
    }


def build_columns(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Return the inductor text columns, keyed by canonical field, in ``HEADERS`` order."""
    parts = _draw_values(rng, rows)
    size = parts.size
    shielded = np.array([s[2] for s in INDUCTOR_SIZES])[size]
    dims = np.array([s[1] for s in INDUCTOR_SIZES])[size]
    sp, miss = _spellings(layout), missing_markers(layout)
    body = np.where(shielded, "Shielded power inductor ", "Unshielded drum inductor ")
    return {
        "mpn": _part_numbers(parts, rows, seed),
        "manufacturer": parts.maker,
        "description": join_columns(body.astype(object), (SIZE_NAMES, size)),
        "inductance_h": texts(rng, parts.inductance_uh * 1e-6, sp["l"], miss),
        "tolerance": tolerance_column(rng, blank_some(rng, parts.tolerance, 0.01), layout),
        "isat_a": texts(rng, blank_some(rng, parts.isat_a, 0.015), sp["i"], miss),
        "irms_a": texts(rng, blank_some(rng, parts.irms_a, 0.015), sp["i"], miss),
        "dcr_ohm": texts(rng, blank_some(rng, parts.dcr_ohm, 0.005), sp["r"], miss),
        "srf_hz": texts(rng, blank_some(rng, parts.srf_hz, 0.2), sp["f"], miss),
        "package": SIZE_NAMES[size],
        **size_columns(rng, dims, layout),
        "shielded": choose_text(
            rng,
            (("n", "y"), shielded.astype(int)),
            {"y": sp["shielded"][0], "n": sp["shielded"][1]},
        ),
        "unit_price": price_column(rng, parts.price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }
