"""Invented rectifier diodes: Schottky parts have low Vf and low Vrrm; Qrr grows with type."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .common import (
    blank_some,
    choose_text,
    coded,
    jitter,
    join_columns,
    lifecycle_column,
    makers,
    missing_markers,
    price_column,
    round_sig,
    serials,
    stock_column,
    texts,
)

KIND = "diode"

# type: weight, Vrrm choices, Vf model (a + b*Vrrm), trr (ns) range, Tj max choices
DIODE_TYPES = {
    "schottky": (0.50, [20, 30, 40, 45, 60, 100, 150, 200], (0.30, 0.0035), None, [125, 150, 175]),
    "fast": (0.25, [100, 200, 400, 600, 800, 1000], (0.85, 0.0005), (20, 75), [150, 175]),
    "standard": (0.12, [50, 100, 200, 400, 600, 800, 1000], (1.00, 0.0001), (1500, 3000), [150]),
    "sic": (0.13, [650, 1200, 1700], (1.35, 0.0001), None, [175]),
}
TYPES = tuple(DIODE_TYPES)
DIODE_TYPE_TEXT = {
    "clean": {
        "schottky": ["Schottky"],
        "fast": ["Fast Recovery"],
        "standard": ["Standard Recovery"],
        "sic": ["SiC Schottky"],
    },
    "messy": {
        "schottky": ["Schottky", "SBD", "Schottky Barrier"],
        "fast": ["Fast Recovery", "Ultrafast", "FRD"],
        "standard": ["Standard Recovery", "General Purpose", "Rectifier"],
        "sic": ["SiC Schottky", "Silicon Carbide", "SiC"],
    },
}
# package by current class: name, max If (A), theta_ja (degC/W, free air, minimum pad)
DIODE_PACKAGES = [
    ("SOD-123F", 1, 180),
    ("SMA", 2, 90),
    ("SMB", 3, 70),
    ("SMC", 5, 55),
    ("TO-252", 10, 45),
    ("TO-220-2", 20, 62),
    ("TO-247-2", 40, 40),
]
DIODE_CURRENTS = np.array([0.5, 1, 1.5, 2, 3, 5, 8, 10, 15, 20, 30, 40])
DIODE_MAKERS = ["Tessaly Semiconductor", "Kestrow Devices", "Ondrel Microsystems"]
DIODE_PREFIXES = ["TS", "KD", "OM"]
PACKAGE_NAMES = np.array([p[0] for p in DIODE_PACKAGES], dtype=object)
# part-number letters, in TYPES order: this project's own scheme, no type code in real use
TYPE_LETTERS = ["ZK", "ZF", "ZG", "ZC"]

# fmt: off
HEADERS = {
    "clean": ["Mfr Part Number", "Manufacturer", "Description", "Diode Type",
              "Reverse Voltage (Vrrm)", "Average Forward Current", "Surge Current",
              "Forward Voltage", "Reverse Recovery Time (trr)", "Reverse Recovery Charge",
              "Max Junction Temperature", "Thermal Resistance Theta JA", "Package",
              "Unit Price", "Stock", "Lifecycle"],
    "messy": ["Part Number", "Mfg", "Desc", "Technology", "Vrrm", "IF(AV)", "IFSM", "VF",
              "trr", "Qrr", "Tj max", "RthJA", "Package / Case", "Price Each", "Qty Available",
              "Status"],
}
# fmt: on
# one cell fault per bad row: (field, text) -- a wrong unit, a negative value, plain text
BAD_CELLS = [("vrrm_v", "40 A"), ("if_avg_a", "-2 A"), ("vf_v", "typ.")]


@dataclass(frozen=True)
class _Diodes:
    """The drawn values of every row, in SI units unless the name says otherwise."""

    diode_type: np.ndarray  # index into TYPES
    vrrm_v: np.ndarray
    vf_v: np.ndarray
    trr_ns: np.ndarray  # NaN for Schottky and SiC parts (no minority-carrier recovery)
    tj_max_degc: np.ndarray
    if_avg_a: np.ndarray
    package: np.ndarray  # index into DIODE_PACKAGES
    theta_ja_degc_w: np.ndarray
    qrr_c: np.ndarray
    maker: np.ndarray
    prefix: tuple[list[str], np.ndarray]


def types_is(index: np.ndarray, names: Sequence[str], name: str) -> np.ndarray:
    return index == list(names).index(name)


def _draw_type_values(rng: np.random.Generator, rows: int):
    """Return (type index, Vrrm in V, Vf in V, trr in ns, Tj max in degC) of each row."""
    w = np.array([DIODE_TYPES[t][0] for t in TYPES])
    t_idx = rng.choice(len(TYPES), size=rows, p=w / w.sum())
    vrrm, vf, trr, tj = np.zeros(rows), np.zeros(rows), np.full(rows, np.nan), np.zeros(rows)
    for i, t in enumerate(TYPES):
        r = np.flatnonzero(t_idx == i)
        _, vrrms, (a, b), trr_range, tjs = DIODE_TYPES[t]
        vrrm[r] = np.array(vrrms, dtype=float)[rng.integers(0, len(vrrms), len(r))]
        vf[r] = (a + b * vrrm[r]) * jitter(rng, len(r), 0.06)
        if trr_range is not None:
            trr[r] = rng.uniform(*trr_range, len(r)) * (1 + vrrm[r] / 2000)
        tj[r] = np.array(tjs, dtype=float)[rng.integers(0, len(tjs), len(r))]
    return t_idx, vrrm, vf, trr, tj


def _draw_values(rng: np.random.Generator, rows: int) -> _Diodes:
    """Return the values of ``rows`` diodes; the package follows the current class."""
    t_idx, vrrm, vf, trr, tj = _draw_type_values(rng, rows)
    if_avg = DIODE_CURRENTS[rng.integers(0, len(DIODE_CURRENTS), rows)]
    pkg = np.searchsorted(np.array([p[1] for p in DIODE_PACKAGES]), if_avg)
    theta = np.array([p[2] for p in DIODE_PACKAGES], dtype=float)[pkg] * jitter(rng, rows, 0.1)
    # Qrr ~ trr * If / 2 for silicon (triangular recovery); Schottky ~0; SiC capacitive only
    qrr = np.where(np.isnan(trr), 0.0, trr * 1e-9 * if_avg * 0.5)
    qrr = np.where(types_is(t_idx, TYPES, "sic"), 3e-9 * if_avg * vrrm / 650, qrr)
    maker, prefix = makers(rng, DIODE_MAKERS, DIODE_PREFIXES, rows)
    return _Diodes(t_idx, vrrm, vf, trr, tj, if_avg, pkg, theta, qrr, maker, prefix)


def _spellings(layout: str) -> dict[str, list]:
    """Return the spellings of each numeric column; the clean layout has one per column."""
    if layout != "messy":
        return {
            "v": [(1.0, " V")],
            "vf": [(1.0, " V")],
            "i": [(1.0, " A")],
            "trr": [(1e-9, " ns")],
            "qrr": [(1e-9, " nC")],
            "tj": [(1.0, " °C")],
            "theta": [(1.0, " °C/W")],
        }
    return {
        "v": [(1.0, " V"), (1.0, "V"), (1e3, " kV")],
        "vf": [(1.0, " V"), (1.0, "V"), (1e-3, " mV")],
        "i": [(1.0, " A"), (1.0, "A"), (1e-3, " mA")],
        "trr": [(1e-9, " ns"), (1e-9, "ns"), (1e-6, " us")],
        "qrr": [(1e-9, " nC"), (1e-6, " uC"), (1e-12, " pC")],
        "tj": [(1.0, " °C"), (1.0, "°C"), (1.0, " degC")],
        "theta": [(1.0, " °C/W"), (1.0, " K/W")],
    }


def _part_numbers(parts: _Diodes, rows: int, seed: int) -> np.ndarray:
    """Return part numbers such as "TS-ZK30-40-" (If in tenths of an ampere) plus a serial."""
    return join_columns(
        parts.prefix,
        "-",
        (TYPE_LETTERS, parts.diode_type),
        coded(parts.if_avg_a * 10, lambda x: f"{x:g}"),
        "-",
        coded(parts.vrrm_v, lambda x: f"{x:g}"),
        "-",
    ) + serials(rows, seed)


def _surge_current_a(rng: np.random.Generator, parts: _Diodes) -> np.ndarray:
    """Return each row's surge rating: 20 to 35 times the average current."""
    return round_sig(parts.if_avg_a * rng.uniform(20, 35, len(parts.if_avg_a)))


def build_columns(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Return the diode text columns, keyed by canonical field, in ``HEADERS`` order."""
    parts = _draw_values(rng, rows)
    types = (TYPES, parts.diode_type)
    sp, miss = _spellings(layout), missing_markers(layout)
    price = (0.03 + 0.02 * parts.if_avg_a * (1 + parts.vrrm_v / 600)) * np.where(
        parts.diode_type == 3, 4.0, 1.0
    )
    return {
        "mpn": _part_numbers(parts, rows, seed),
        "manufacturer": parts.maker,
        "description": choose_text(
            rng, types, {t: [DIODE_TYPE_TEXT["clean"][t][0] + " rectifier"] for t in TYPES}
        ),
        "diode_type": choose_text(rng, types, DIODE_TYPE_TEXT[layout]),
        "vrrm_v": texts(rng, parts.vrrm_v, sp["v"], miss),
        "if_avg_a": texts(rng, parts.if_avg_a, sp["i"], miss),
        "ifsm_a": texts(rng, blank_some(rng, _surge_current_a(rng, parts), 0.05), sp["i"], miss),
        "vf_v": texts(rng, round_sig(parts.vf_v), sp["vf"], miss),
        "trr_s": texts(rng, round_sig(parts.trr_ns * 1e-9), sp["trr"], miss),
        "qrr_c": texts(rng, blank_some(rng, round_sig(parts.qrr_c), 0.03), sp["qrr"], miss),
        "tj_max_degc": texts(rng, blank_some(rng, parts.tj_max_degc, 0.02), sp["tj"], miss),
        "theta_ja_degc_w": texts(
            rng, blank_some(rng, round_sig(parts.theta_ja_degc_w), 0.03), sp["theta"], miss
        ),
        "package": PACKAGE_NAMES[parts.package],
        "unit_price": price_column(rng, price * jitter(rng, rows, 0.2), layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }
