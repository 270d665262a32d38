"""Invented MOSFETs: Rds(on) rises steeply with Vds and falls with die area; charge grows."""

from __future__ import annotations

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
    num,
    ohm_text,
    price_column,
    round_sig,
    serials,
    stock_column,
    texts,
)

KIND = "mosfet"

# package: die area (mm^2, largest), current limit of the package (A), theta_ja (degC/W),
# power it can shed at a 25 degC case (W). Rds(on) ~ Vds^2.4 / area (the silicon limit
# of a vertical FET, Baliga's figure: Rds*A ~ BV^2.5): B. J. Baliga, Fundamentals of
# Power Semiconductor Devices, ch. 6 (from memory); the constant is fitted by eye.
# The last number is the highest Vds offered in that package (small packages lack the
# creepage and die area for high voltage).
FET_PACKAGES = [
    ("SOT-23", 0.6, 4, 160, 0.8, 100),
    ("SOT-23-6", 1.0, 7, 95, 1.3, 100),
    ("DFN2x2", 1.2, 8, 80, 1.6, 60),
    ("DFN3x3", 3.0, 20, 55, 2.5, 150),
    ("SO-8", 4.0, 20, 62, 2.5, 200),
    ("DFN5x6", 8.0, 60, 45, 5.0, 250),
    ("TO-252", 8.0, 50, 50, 5.0, 600),
    ("TO-220", 20.0, 120, 62, 10.0, 600),
    ("TO-247", 40.0, 200, 40, 20.0, 600),
]
PACKAGE_NAMES = [p[0] for p in FET_PACKAGES]
FET_VOLTAGES = np.array([20, 30, 40, 60, 80, 100, 150, 200, 250, 600])
RDS_PACKAGE_OHM = 0.4e-3  # bond wires and leadframe: a floor under the silicon resistance
FET_MAKERS = ["Tessaly Semiconductor", "Kestrow Devices", "Ondrel Microsystems"]
FET_PREFIXES = ["TS-Q", "KD-Q", "OM-Q"]  # this project's own scheme
RDS_K = 6.4e-6  # ohm*mm^2 per V^2.4, fitted so a 40 V part on 2.5 mm^2 has about 18 mOhm

# fmt: off
HEADERS = {
    "clean": ["Mfr Part Number", "Manufacturer", "Description", "Channel",
              "Drain-Source Voltage (Vds)", "Continuous Drain Current (Id)", "Rds(on)",
              "Vgs(th)", "Gate Charge (Qg)", "Qgd", "Coss", "Max Junction Temperature",
              "Thermal Resistance Theta JA", "Package", "Unit Price", "Stock", "Lifecycle"],
    "messy": ["MPN", "Maker", "Desc", "Polarity", "VDSS", "Id", "RDS(on)", "Vth", "Qg",
              "Gate-Drain Charge", "Output Capacitance", "Tjmax", "θJA", "Package / Case",
              "Price Each", "Available", "Status"],
}
# fmt: on
# one cell fault per bad row: (field, text) -- a wrong unit, a negative value, plain text
BAD_CELLS = [("rds_on_ohm", "18 mH"), ("qg_c", "-7 nC"), ("coss_f", "small")]


@dataclass(frozen=True)
class _Mosfets:
    """The drawn values of every row, in SI units unless the name says otherwise."""

    package: np.ndarray  # index into FET_PACKAGES
    die_area_mm2: np.ndarray
    vds_v: np.ndarray
    p_channel: np.ndarray  # bool
    rds_on_ohm: np.ndarray
    id_a: np.ndarray
    qg_c: np.ndarray
    qgd_c: np.ndarray
    coss_f: np.ndarray
    vgs_th_v: np.ndarray
    theta_ja_degc_w: np.ndarray
    tj_max_degc: np.ndarray
    maker: np.ndarray
    prefix: tuple[list[str], np.ndarray]


def _draw_values(rng: np.random.Generator, rows: int) -> _Mosfets:
    """Return the values of ``rows`` MOSFETs; Id is the lower of the thermal and package limit."""
    pkg = rng.integers(0, len(FET_PACKAGES), rows)
    table = np.array([p[1:] for p in FET_PACKAGES], dtype=float)
    area = table[pkg, 0] * rng.uniform(0.3, 1.0, rows)
    allowed = np.searchsorted(FET_VOLTAGES, table[pkg, 4], side="right")
    vds = FET_VOLTAGES[np.floor(rng.random(rows) * allowed).astype(int)].astype(float)
    p_channel = rng.random(rows) < 0.12
    rds = RDS_K * vds**2.4 / area * np.where(p_channel, 2.2, 1.0) * jitter(rng, rows, 0.1)
    rds = rds + RDS_PACKAGE_OHM
    id_a = np.minimum(np.sqrt(table[pkg, 3] / rds), table[pkg, 1])
    qg = 3e-9 * area * (vds / 40) ** 0.3 * jitter(rng, rows, 0.15)
    qgd = qg * rng.uniform(0.2, 0.4, rows)
    coss = 60e-12 * area * (40 / vds) ** 0.5 * jitter(rng, rows, 0.15)
    vth = np.where(vds <= 20, rng.uniform(0.6, 1.2, rows), rng.uniform(1.5, 3.5, rows))
    theta = table[pkg, 2] * jitter(rng, rows, 0.08)
    tj = np.where(rng.random(rows) < 0.3, 175.0, 150.0)
    maker, prefix = makers(rng, FET_MAKERS, FET_PREFIXES, rows)
    return _Mosfets(
        pkg, area, vds, p_channel, rds, id_a, qg, qgd, coss, vth, theta, tj, maker, prefix
    )


def _spellings(layout: str) -> dict[str, list]:
    """Return the spellings of each numeric column; the clean layout has one per column."""
    if layout != "messy":
        return {
            "v": [(1.0, " V")],
            "i": [(1.0, " A")],
            "r": [ohm_text],
            "q": [(1e-9, " nC")],
            "c": [(1e-12, " pF")],
            "tj": [(1.0, " °C")],
            "theta": [(1.0, " °C/W")],
            "channel": {"n": ["N-Channel"], "p": ["P-Channel"]},
        }
    return {
        "v": [(1.0, " V"), (1.0, "V")],
        "i": [(1.0, " A"), (1.0, "A")],
        "r": [ohm_text, lambda x: f"{num(x * 1e3)} mΩ", lambda x: f"{num(x)} Ω"],
        "q": [(1e-9, " nC"), (1e-9, "nC"), (1e-12, " pC")],
        "c": [(1e-12, " pF"), (1e-12, "pF"), (1e-9, " nF")],
        "tj": [(1.0, " °C"), (1.0, "°C")],
        "theta": [(1.0, " °C/W"), (1.0, " K/W")],
        "channel": {"n": ["N-Channel", "N", "NCH", "n-channel"], "p": ["P-Channel", "P", "PCH"]},
    }


def _part_numbers(parts: _Mosfets, rows: int, seed: int) -> np.ndarray:
    """Return part numbers such as "TS-Q40-12-SO-8-" (Vds, then Id) plus a unique serial."""
    return join_columns(
        parts.prefix,
        coded(parts.vds_v, lambda x: f"{x:g}"),
        "-",
        coded(round_sig(parts.id_a), lambda v: num(v, 2).replace(".", "R")),
        "-",
        (PACKAGE_NAMES, parts.package),
        "-",
    ) + serials(rows, seed)


def _channel_column(rng: np.random.Generator, parts: _Mosfets, spellings: dict) -> np.ndarray:
    """Return each row's channel text; about 1 % of rows leave it blank."""
    channel = np.where(rng.random(len(parts.p_channel)) < 0.01, 2, parts.p_channel.astype(int))
    return choose_text(rng, (("n", "p", "-"), channel), {**spellings, "-": [""]})


def build_columns(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Return the MOSFET text columns, keyed by canonical field, in ``HEADERS`` order."""
    parts = _draw_values(rng, rows)
    messy = layout == "messy"
    # some messy exports print a p-channel part's ratings negative ("-40 V")
    sign = np.where(parts.p_channel & messy & (rng.random(rows) < 0.5), -1.0, 1.0)
    largest_die_mm2 = np.array([p[1] for p in FET_PACKAGES], dtype=float)[parts.package]
    price = (0.05 + 0.02 * largest_die_mm2 * (parts.vds_v / 40) ** 0.5) * jitter(rng, rows, 0.2)
    sp, miss = _spellings(layout), missing_markers(layout)
    channel_text = np.where(parts.p_channel, "P-channel MOSFET ", "N-channel MOSFET ")
    return {
        "mpn": _part_numbers(parts, rows, seed),
        "manufacturer": parts.maker,
        "description": join_columns(channel_text.astype(object), (PACKAGE_NAMES, parts.package)),
        "channel": _channel_column(rng, parts, sp["channel"]),
        "vds_v": texts(rng, sign * parts.vds_v, sp["v"], miss),
        "id_a": texts(rng, sign * round_sig(parts.id_a), sp["i"], miss),
        "rds_on_ohm": texts(rng, round_sig(parts.rds_on_ohm), sp["r"], miss),
        "vgs_th_v": texts(rng, round_sig(parts.vgs_th_v), sp["v"], miss),
        "qg_c": texts(rng, round_sig(parts.qg_c), sp["q"], miss),
        "qgd_c": texts(rng, blank_some(rng, round_sig(parts.qgd_c), 0.03), sp["q"], miss),
        "coss_f": texts(rng, blank_some(rng, round_sig(parts.coss_f), 0.05), sp["c"], miss),
        "tj_max_degc": texts(rng, parts.tj_max_degc, sp["tj"], miss),
        "theta_ja_degc_w": texts(
            rng, blank_some(rng, round_sig(parts.theta_ja_degc_w), 0.03), sp["theta"], miss
        ),
        "package": np.array(PACKAGE_NAMES, dtype=object)[parts.package],
        "unit_price": price_column(rng, price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }
