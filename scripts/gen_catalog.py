#!/usr/bin/env python3
"""Write synthetic, invented part catalogs of any size, in a clean or a messy CSV layout.

Every manufacturer name and part number is invented. Values follow the IEC 60063 E-series
and the usual physical trends of each kind (see the ``_inductors`` ... ``_mosfets``
docstrings), with a few missing cells, so the catalogs look like real exports to the
importer and the screening engine.

    python scripts/gen_catalog.py --kind inductor --rows 100000 --out /tmp/ind.csv
    python scripts/gen_catalog.py --kind capacitor --rows 1000 --out c.csv --layout clean
    python scripts/gen_catalog.py --all --rows-per-kind 250000 --out-dir /tmp/cat --seed 7

Layouts:

* ``clean``: comma separated UTF-8, one unit spelling per column ("10 uH", "6.2 A").
* ``messy``: semicolon separated UTF-8 with a byte-order mark, units in some headers
  ("DCR (mΩ)", "Isat, A"), mixed cell spellings ("4u7", "4700 nH", "0.028 Ω", "6200 mA"),
  mixed missing markers ("", "-", "N/A"), thousands separators in stock, an extra column
  partpick does not know. Every cell is still a valid value (unless ``bad_fraction`` > 0).

Library use (benchmarks): ``generate(kind, rows, seed, layout) -> pandas.DataFrame`` whose
columns are the CSV headers and whose cells are the CSV text; ``write_catalog`` writes it.

Speed: every column is built with numpy; text is formatted once per distinct value and
spelling, then gathered with an array take, so a million rows take a few seconds.
"""

from __future__ import annotations

import argparse
import sys
import time
from collections.abc import Callable, Sequence
from pathlib import Path

import numpy as np
import pandas as pd

KINDS = ("inductor", "capacitor", "diode", "mosfet")
LAYOUTS = ("clean", "messy")

# IEC 60063 preferred numbers (the E6 and E12 series, one decade).
E6 = np.array([1.0, 1.5, 2.2, 3.3, 4.7, 6.8])
E12 = np.array([1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2])

# A spelling turns an SI value into text: (divisor, suffix) gives f"{v / divisor:g}{suffix}";
# a callable does anything else (letter codes).
Spelling = tuple[float, str] | Callable[[float], str]

MISSING_MESSY = np.array(["", "-", "N/A", "n/a"], dtype=object)
LIFECYCLES = np.array(["active", "nrnd", "obsolete", "unknown"])
LIFECYCLE_P = [0.85, 0.09, 0.04, 0.02]
LIFECYCLE_TEXT = {
    "clean": {
        "active": ["Active"],
        "nrnd": ["NRND"],
        "obsolete": ["Obsolete"],
        "unknown": ["Unknown"],
    },
    "messy": {
        "active": ["Active", "active", "Production", "In Production"],
        "nrnd": ["NRND", "Not Recommended for New Designs", "LTB"],
        "obsolete": ["Obsolete", "EOL", "Discontinued"],
        "unknown": ["Unknown", ""],
    },
}


# ---------------------------------------------------------------------------------------
# small vectorised helpers


def eseries_values(series: np.ndarray, lo: float, hi: float) -> np.ndarray:
    """Return every member of an E-series (one decade given) within [lo, hi], ascending."""
    decades = np.arange(np.floor(np.log10(lo)) - 1, np.ceil(np.log10(hi)) + 1)
    values = (series[None, :] * 10.0 ** decades[:, None]).ravel()
    values = np.round(values, 12 - int(np.floor(np.log10(hi))))
    return np.sort(values[(values >= lo * (1 - 1e-9)) & (values <= hi * (1 + 1e-9))])


def round_sig(x: np.ndarray, digits: int = 2) -> np.ndarray:
    """Return ``x`` rounded to ``digits`` significant figures (NaN and 0 pass through)."""
    x = np.asarray(x, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        exp = np.floor(np.log10(np.abs(np.where(x == 0, 1.0, x))))
    step = 10.0 ** (exp - digits + 1)
    return np.round(x / step) * step


def jitter(rng: np.random.Generator, n: int, sigma: float) -> np.ndarray:
    """Return ``n`` log-normal factors of median 1 (spread between parts of one series)."""
    return np.exp(rng.normal(0.0, sigma, n))


def pick_per_row(rng: np.random.Generator, table: Sequence[np.ndarray], group: np.ndarray):
    """Return, per row, one random member of ``table[group[row]]`` (vectorised)."""
    lengths = np.array([len(t) for t in table])
    padded = np.full((len(table), lengths.max()), np.nan)
    for i, t in enumerate(table):
        padded[i, : len(t)] = t
    index = np.floor(rng.random(len(group)) * lengths[group]).astype(int)
    return padded[group, index]


def spell(value: float, spelling: Spelling) -> str:
    if callable(spelling):
        return spelling(value)
    divisor, suffix = spelling
    return f"{float(f'{value / divisor:.6g}'):g}{suffix}"


def texts(
    rng: np.random.Generator,
    values: np.ndarray,
    spellings: Sequence[Spelling],
    missing_text: np.ndarray,
) -> np.ndarray:
    """Return the cell texts of a numeric column: one spelling per row, NaN as a missing marker.

    Each distinct (value, spelling) pair is formatted once, then gathered (hash-based
    factorisation, so the cost is linear in the rows).
    """
    values = np.asarray(values, dtype=float)
    missing = np.isnan(values)
    codes, uniq = pd.factorize(np.where(missing, 0.0, values))
    n = len(spellings)
    combo = codes * n + rng.integers(0, n, len(values))
    used = np.zeros(len(uniq) * n, dtype=bool)
    used[combo] = True
    combos = np.flatnonzero(used)
    lookup = np.zeros(len(used), dtype=np.int64)
    lookup[combos] = np.arange(len(combos))
    pool = np.array([spell(uniq[c // n], spellings[c % n]) for c in combos], dtype=object)
    out = pool[lookup[combo]]
    if missing.any():
        out[missing] = missing_text[rng.integers(0, len(missing_text), int(missing.sum()))]
    return out


def join_columns(*parts: np.ndarray | str | tuple[np.ndarray, np.ndarray]) -> np.ndarray:
    """Return the row-wise concatenation of text columns that each hold few distinct values.

    A part is a text column, a ``(pool, codes)`` pair (``pool[codes]`` without building it),
    or a plain ``str`` that is the same on every row. Each distinct combination is joined
    once, then gathered.
    """
    factored = []
    for part in parts:
        if isinstance(part, str):
            factored.append(None)
        elif isinstance(part, tuple):
            factored.append((np.asarray(part[1]), np.asarray(part[0], dtype=object)))
        else:
            factored.append(pd.factorize(part))
    rows = len(next(f[0] for f in factored if f is not None))
    combined = np.zeros(rows, dtype=np.int64)
    for f in factored:
        if f is not None:
            combined = combined * len(f[1]) + f[0]
    codes, combos = pd.factorize(combined)
    pool = [_join_combo(int(c), parts, factored) for c in combos]
    return np.array(pool, dtype=object)[codes]


def _join_combo(combo: int, parts, factored) -> str:
    pieces = []
    for part, f in zip(reversed(parts), reversed(factored), strict=True):
        if f is None:
            pieces.append(part)
        else:
            combo, index = divmod(combo, len(f[1]))
            pieces.append(str(f[1][index]))
    return "".join(reversed(pieces))


def blank_some(rng: np.random.Generator, values: np.ndarray, fraction: float) -> np.ndarray:
    """Return ``values`` with about ``fraction`` of them set to NaN (a datasheet gap)."""
    values = np.array(values, dtype=float)
    values[rng.random(len(values)) < fraction] = np.nan
    return values


def choose_text(rng: np.random.Generator, keys, table: dict[str, list[str]]) -> np.ndarray:
    """Return, per row, one of the spellings ``table[key]`` of that row's key.

    ``keys`` is a text column or a ``(names, codes)`` pair meaning ``names[codes]``.
    """
    codes, uniq = (
        (np.asarray(keys[1]), list(keys[0])) if isinstance(keys, tuple) else (pd.factorize(keys))
    )
    out = np.empty(len(codes), dtype=object)
    for i, key in enumerate(uniq):
        rows = np.flatnonzero(codes == i)
        if len(rows):
            options = np.array(table[key], dtype=object)
            out[rows] = options[rng.integers(0, len(options), len(rows))]
    return out


def serials(rows: int, seed: int) -> np.ndarray:
    """Return ``rows`` distinct 6-character base-34 serials (so part numbers are unique).

    ``k * 7919 + offset`` modulo 34**6 is a bijection (7919 is prime and shares no factor
    with 34), so serials never repeat while they look scrambled.
    """
    alphabet = np.frombuffer(b"0123456789ABCDEFGHJKLMNPQRSTUVWXYZ", dtype=np.uint8)
    n = len(alphabet)
    if rows > n**6:
        raise ValueError(f"at most {n**6} rows")
    offset = int(np.random.default_rng(seed + 1).integers(0, n**6))
    code = (np.arange(rows, dtype=np.int64) * 7919 + offset) % (n**6)
    chars = np.empty((rows, 6), dtype=np.uint8)
    for position in range(6):
        chars[:, position] = alphabet[(code // n ** (5 - position)) % n]
    text = chars.tobytes().decode("ascii")
    return np.array([text[i : i + 6] for i in range(0, 6 * rows, 6)], dtype=object)


def iec_code(value_si: float, letter: str, scale: float) -> str:
    """Return the IEC 60062 letter code of a value: 4.7 µH as "4u7", 0.47 µH as "0u47"."""
    text = f"{float(f'{value_si / scale:.6g}'):g}"
    return text.replace(".", letter) if "." in text else text + letter


def value_code(value: float) -> str:
    """Return the three-character value code of a part number: 4.7 -> "4R7", 22 -> "220"."""
    v = float(f"{value:.2g}")
    if v < 1:
        return "R" + f"{v:.2g}"[2:]
    if v < 10:
        return f"{v:.2g}".replace(".", "R") if "." in f"{v:.2g}" else f"{int(v)}R0"
    exponent = len(str(int(v))) - 2
    return f"{int(round(v / 10**exponent))}{exponent}"


def lifecycle_column(rng, rows, layout):
    states = rng.choice(len(LIFECYCLES), size=rows, p=LIFECYCLE_P)
    return choose_text(rng, (LIFECYCLES, states), LIFECYCLE_TEXT[layout])


def stock_column(rng, rows, layout):
    pool = np.unique(round_sig(np.r_[0, 0, np.exp(rng.uniform(np.log(10), np.log(2e5), 300))]))
    stock = pool[rng.integers(0, len(pool), rows)].astype(np.int64)
    if layout == "clean":
        return texts(rng, stock.astype(float), [(1.0, "")], np.array([""], dtype=object))
    return texts(rng, stock.astype(float), [(1.0, ""), lambda v: f"{int(v):,}"], MISSING_MESSY)


def price_column(rng, price, layout):
    price = np.maximum(np.round(round_sig(price, 3), 3), 0.001)
    if layout == "clean":
        return texts(rng, price, [(1.0, "")], np.array([""], dtype=object))
    return texts(
        rng, price, [(1.0, ""), lambda v: f"${v:g}", lambda v: f"{v:g} USD"], MISSING_MESSY
    )


def size_columns(rng, dims: np.ndarray, layout: str) -> dict[str, np.ndarray]:
    """Return length/width/height cells from an (n, 3) array of body dimensions in mm."""
    spellings = [(1.0, " mm")] if layout == "clean" else [(1.0, ""), (1.0, " mm")]
    missing = np.array([""], dtype=object) if layout == "clean" else MISSING_MESSY
    return {
        name: texts(rng, round_sig(dims[:, i], 3), spellings, missing)
        for i, name in enumerate(("length_mm", "width_mm", "height_mm"))
    }


def tolerance_column(rng, tol: np.ndarray, layout: str) -> np.ndarray:
    pct = [lambda v: f"±{v * 100:g}%"]
    if layout == "messy":
        pct += [
            lambda v: f"{v * 100:g}%",
            lambda v: f"+/-{v * 100:g}%",
            lambda v: f"± {v * 100:g} %",
        ]
    return texts(
        rng, tol, pct, np.array([""], dtype=object) if layout == "clean" else MISSING_MESSY
    )


def makers(rng, names: Sequence[str], prefixes: Sequence[str], rows: int):
    """Return each row's maker name and its part-number prefix as a ``(pool, codes)`` pair."""
    which = rng.integers(0, len(names), rows)
    return np.array(names, dtype=object)[which], (list(prefixes), which)


def coded(values: np.ndarray, fmt: Callable[[float], str]) -> tuple[list[str], np.ndarray]:
    """Return ``values`` as a ``(pool, codes)`` text pair, formatting each distinct value once."""
    codes, uniq = pd.factorize(np.asarray(values, dtype=float))
    return [fmt(v) for v in uniq], codes


# ---------------------------------------------------------------------------------------
# inductors

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


def _inductors(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Inductor columns: E12 values per body size; Isat and Irms fall, DCR rises with L."""
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
    names = np.array([s[0] for s in INDUCTOR_SIZES], dtype=object)
    l_code = coded(l_uh, value_code)
    tol_letter = (["K", "M", "N"], np.where(tol == 0.3, 2, np.where(tol == 0.1, 0, 1)))
    mpn = join_columns(prefix, "-", (names, size), "-", l_code, tol_letter, "-") + serials(
        rows, seed
    )
    shielded = np.array([s[2] for s in INDUCTOR_SIZES])[size]
    messy = layout == "messy"
    miss = MISSING_MESSY if messy else np.array([""], dtype=object)
    if messy:  # header units: inductance [uH], Isat, A, DCR (mΩ), SRF (MHz)
        l_sp = [
            (1e-6, ""),
            (1e-6, " uH"),
            (1e-6, "µH"),
            lambda v: iec_code(v, "u", 1e-6),
            (1e-9, " nH"),
            (1e-3, " mH"),
        ]
        i_sp = [(1.0, ""), (1.0, " A"), (1e-3, " mA"), (1.0, "A")]
        r_sp = [(1e-3, ""), (1e-3, " mOhm"), (1.0, " Ω"), (1e-3, "mΩ"), (1.0, " ohms")]
        f_sp = [(1e6, ""), (1e6, " MHz"), (1e3, " kHz")]
    else:
        l_sp, i_sp, r_sp, f_sp = [(1e-6, " uH")], [(1.0, " A")], [(1e-3, " mOhm")], [(1e6, " MHz")]
    dims = np.array([s[1] for s in INDUCTOR_SIZES])[size]
    price = col["p0"][size] * (1 + 0.1 * np.log10(l_uh)) * jitter(rng, rows, 0.15)
    shield_text = (["Yes"], ["No"]) if not messy else (["Yes", "yes", "Y"], ["No", "no", "N"])
    return {
        "mpn": mpn,
        "manufacturer": maker,
        "description": join_columns(
            np.where(shielded, "Shielded power inductor ", "Unshielded drum inductor ").astype(
                object
            ),
            (names, size),
        ),
        "inductance_h": texts(rng, l_uh * 1e-6, l_sp, miss),
        "tolerance": tolerance_column(rng, blank_some(rng, tol, 0.01), layout),
        "isat_a": texts(rng, blank_some(rng, isat, 0.015), i_sp, miss),
        "irms_a": texts(rng, blank_some(rng, irms, 0.015), i_sp, miss),
        "dcr_ohm": texts(rng, blank_some(rng, dcr, 0.005), r_sp, miss),
        "srf_hz": texts(rng, blank_some(rng, srf, 0.2), f_sp, miss),
        "package": names[size],
        **size_columns(rng, dims, layout),
        "shielded": choose_text(
            rng, (("n", "y"), shielded.astype(int)), {"y": shield_text[0], "n": shield_text[1]}
        ),
        "unit_price": price_column(rng, price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }


# ---------------------------------------------------------------------------------------
# capacitors

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


def _capacitor_family_values(rng, fam, n):
    """Return (C in F, rated V, tolerance) for ``n`` parts of one family."""
    _, series, c_range, v_range, tols, _, _ = CAP_FAMILIES[fam]
    c_uf = pick_per_row(rng, [eseries_values(series, *c_range)], np.zeros(n, dtype=int))
    v = VOLTAGES[rng.integers(v_range[0], v_range[1] + 1, n)]
    tol = np.array(tols)[rng.integers(0, len(tols), n)]
    return c_uf * 1e-6, v, tol


MLCC_SCORE_EDGES = np.array([1.0, 1.9, 2.9, 3.5, 3.9, 4.3])  # case edges of log10(C[uF]*V^1.5)
MLCC_SCORE_MAX = 4.7


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


def _capacitors(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Capacitor columns: every dielectric family; ceramics low ESR, electrolytics high ESR."""
    fams = list(CAP_FAMILIES)
    weights = np.array([CAP_FAMILIES[f][0] for f in fams])
    fam_idx = rng.choice(len(fams), size=rows, p=weights / weights.sum())
    c_f, v, tol = np.zeros(rows), np.zeros(rows), np.zeros(rows)
    esr, ripple, dims = np.zeros(rows), np.zeros(rows), np.zeros((rows, 3))
    package = np.empty(rows, dtype=object)
    for i, fam in enumerate(fams):
        rows_f = np.flatnonzero(fam_idx == i)
        c_f[rows_f], v[rows_f], tol[rows_f] = _capacitor_family_values(rng, fam, len(rows_f))
        if fam in CERAMICS:
            v[rows_f], pkg, esr[rows_f], ripple[rows_f] = _ceramic_body(fam, c_f[rows_f], v[rows_f])
            dims[rows_f] = MLCC_DIMS[pkg]
            package[rows_f] = np.array(MLCC_PACKAGES, dtype=object)[pkg]
        else:
            dims[rows_f], esr[rows_f], ripple[rows_f] = _can_body(fam, c_f[rows_f], v[rows_f])
            package[rows_f] = {
                "ta-mno2": "SMD molded",
                "ta-polymer": "SMD molded",
                "film": "Box",
            }.get(fam, "Radial")
    spread = jitter(rng, rows, 0.15)
    esr, ripple = round_sig(esr * spread), round_sig(ripple / np.sqrt(spread))
    temp = np.array([CAP_FAMILIES[f][5] for f in fams], dtype=float)[fam_idx]
    aluminium = np.isin(fam_idx, [fams.index("al-electrolytic"), fams.index("al-polymer")])
    hot = aluminium & (rng.random(rows) < 0.3)
    temp = np.where(hot, 125.0, temp)
    life = np.where(
        aluminium,
        np.array([1000.0, 2000, 5000, 10000])[rng.integers(0, 4, rows)],
        np.nan,
    )
    messy = layout == "messy"
    miss = MISSING_MESSY if messy else np.array([""], dtype=object)
    diel_text = {f: DIELECTRIC_SPELLINGS[f] if messy else DIELECTRIC_SPELLINGS[f][:1] for f in fams}
    maker, prefix = np.empty(rows, dtype=object), np.empty(rows, dtype=object)
    for i, fam in enumerate(fams):
        rows_f = np.flatnonzero(fam_idx == i)
        names, prefixes = zip(*CAP_MAKERS["ceramic" if fam in CERAMICS else fam], strict=True)
        maker[rows_f], (pool, which) = makers(rng, names, prefixes, len(rows_f))
        prefix[rows_f] = np.array(pool, dtype=object)[which]
    mpn = join_columns(
        prefix,
        "-",
        coded(c_f * 1e12, value_code),
        "-",
        coded(v, lambda x: f"{x:g}V"),
        "-",
    ) + serials(rows, seed)
    c_sp = (
        [lambda x: cap_text(x)]
        if not messy
        else [
            lambda x: cap_text(x),
            lambda x: cap_text(x).replace(" ", ""),
            lambda x: iec_code(x, "u", 1e-6) if x >= 1e-6 else iec_code(x, "n", 1e-9),
            lambda x: cap_text(x).replace("u", "µ"),
        ]
    )
    temp_sp = (
        [lambda t: f"-55°C ~ {t:g}°C"]
        if not messy
        else [lambda t: f"-55°C ~ {t:g}°C", lambda t: f"{t:g} °C", lambda t: f"{t:g}°C"]
    )
    price = (0.01 + 0.02 * np.sqrt(c_f * 1e6 * v) ** 0.6) * jitter(rng, rows, 0.3)
    return {
        "mpn": mpn,
        "manufacturer": maker,
        "description": choose_text(
            rng, (fams, fam_idx), {f: [DIELECTRIC_SPELLINGS[f][0] + " capacitor"] for f in fams}
        ),
        "capacitance_f": texts(rng, c_f, c_sp, miss),
        "tolerance": tolerance_column(rng, tol, layout),
        "voltage_v": texts(
            rng, v, [(1.0, " V")] if not messy else [(1.0, " V"), (1.0, "V"), (1.0, " VDC")], miss
        ),
        "dielectric": choose_text(rng, (fams, fam_idx), diel_text),
        "esr_ohm": texts(
            rng,
            blank_some(rng, esr, 0.03),
            [ohm_text]
            if not messy
            else [
                ohm_text,
                lambda x: f"{x:.3g} Ω",
                lambda x: f"{x * 1e3:.3g}mΩ",
                lambda x: f"{x:.3g} ohm",
            ],
            miss,
        ),
        "ripple_a": texts(
            rng,
            blank_some(rng, ripple, 0.03),
            [(1.0, " A")] if not messy else [(1.0, " A"), (1e-3, " mA")],
            miss,
        ),
        "temp_max_degc": texts(rng, temp, temp_sp, miss),
        "life_h": texts(
            rng, life, [(1.0, " h")] if not messy else [(1.0, " h"), (1.0, " hours")], miss
        ),
        "package": package,
        **size_columns(rng, dims, layout),
        "unit_price": price_column(rng, price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }


def ohm_text(r_ohm: float) -> str:
    """Return a resistance as a catalog prints it: 28 mOhm, 1.2 Ohm."""
    return f"{num(r_ohm * 1e3)} mOhm" if r_ohm < 1 else f"{num(r_ohm)} Ohm"


def num(x: float, digits: int = 3) -> str:
    """Return ``x`` to ``digits`` significant figures without exponent notation."""
    return f"{float(f'{x:.{digits}g}'):g}"


def cap_text(c_f: float) -> str:
    """Return a capacitance in the prefix a catalog would print: 2.2 nF, 100 nF, 4.7 uF."""
    c_f = float(f"{c_f:.6g}")
    if c_f < 1e-9:
        return f"{num(c_f * 1e12)} pF"
    if c_f < 1e-6:
        return f"{num(c_f * 1e9)} nF"
    return f"{num(c_f * 1e6)} uF"


# ---------------------------------------------------------------------------------------
# diodes

# type: weight, Vrrm choices, Vf model (a + b*Vrrm), trr (ns) range, Tj max choices
DIODE_TYPES = {
    "schottky": (0.50, [20, 30, 40, 45, 60, 100, 150, 200], (0.30, 0.0035), None, [125, 150, 175]),
    "fast": (0.25, [100, 200, 400, 600, 800, 1000], (0.85, 0.0005), (20, 75), [150, 175]),
    "standard": (0.12, [50, 100, 200, 400, 600, 800, 1000], (1.00, 0.0001), (1500, 3000), [150]),
    "sic": (0.13, [650, 1200, 1700], (1.35, 0.0001), None, [175]),
}
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


def _diodes(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """Diode columns: Schottky parts have low Vf and low Vrrm; recovery charge grows with type."""
    types = list(DIODE_TYPES)
    w = np.array([DIODE_TYPES[t][0] for t in types])
    t_idx = rng.choice(len(types), size=rows, p=w / w.sum())
    vrrm, vf, trr, tj = np.zeros(rows), np.zeros(rows), np.full(rows, np.nan), np.zeros(rows)
    for i, t in enumerate(types):
        r = np.flatnonzero(t_idx == i)
        _, vrrms, (a, b), trr_range, tjs = DIODE_TYPES[t]
        vrrm[r] = np.array(vrrms, dtype=float)[rng.integers(0, len(vrrms), len(r))]
        vf[r] = (a + b * vrrm[r]) * jitter(rng, len(r), 0.06)
        if trr_range is not None:
            trr[r] = rng.uniform(*trr_range, len(r)) * (1 + vrrm[r] / 2000)
        tj[r] = np.array(tjs, dtype=float)[rng.integers(0, len(tjs), len(r))]
    if_avg = DIODE_CURRENTS[rng.integers(0, len(DIODE_CURRENTS), rows)]
    pkg = np.searchsorted(np.array([p[1] for p in DIODE_PACKAGES]), if_avg)
    theta = np.array([p[2] for p in DIODE_PACKAGES], dtype=float)[pkg] * jitter(rng, rows, 0.1)
    # Qrr ~ trr * If / 2 for silicon (triangular recovery); Schottky ~0; SiC capacitive only
    qrr = np.where(np.isnan(trr), 0.0, trr * 1e-9 * if_avg * 0.5)
    qrr = np.where(types_is(t_idx, types, "sic"), 3e-9 * if_avg * vrrm / 650, qrr)
    maker, prefix = makers(rng, DIODE_MAKERS, DIODE_PREFIXES, rows)
    kind_letter = (["SB", "FR", "GP", "SC"], t_idx)
    messy = layout == "messy"
    miss = MISSING_MESSY if messy else np.array([""], dtype=object)
    v_sp = [(1.0, " V")] if not messy else [(1.0, " V"), (1.0, "V"), (1e3, " kV")]
    i_sp = [(1.0, " A")] if not messy else [(1.0, " A"), (1.0, "A"), (1e-3, " mA")]
    price = (0.03 + 0.02 * if_avg * (1 + vrrm / 600)) * np.where(t_idx == 3, 4.0, 1.0)
    return {
        "mpn": join_columns(
            prefix,
            "-",
            kind_letter,
            coded(if_avg * 10, lambda x: f"{x:g}"),
            "-",
            coded(vrrm, lambda x: f"{x:g}"),
            "-",
        )
        + serials(rows, seed),
        "manufacturer": maker,
        "description": choose_text(
            rng,
            (types, t_idx),
            {t: [DIODE_TYPE_TEXT["clean"][t][0] + " rectifier"] for t in types},
        ),
        "diode_type": choose_text(rng, (types, t_idx), DIODE_TYPE_TEXT[layout]),
        "vrrm_v": texts(rng, vrrm, v_sp, miss),
        "if_avg_a": texts(rng, if_avg, i_sp, miss),
        "ifsm_a": texts(
            rng, blank_some(rng, round_sig(if_avg * rng.uniform(20, 35, rows)), 0.05), i_sp, miss
        ),
        "vf_v": texts(rng, round_sig(vf), v_sp[:2] + ([(1e-3, " mV")] if messy else []), miss),
        "trr_s": texts(
            rng,
            round_sig(trr * 1e-9),
            [(1e-9, " ns")] if not messy else [(1e-9, " ns"), (1e-9, "ns"), (1e-6, " us")],
            miss,
        ),
        "qrr_c": texts(
            rng,
            blank_some(rng, round_sig(qrr), 0.03),
            [(1e-9, " nC")] if not messy else [(1e-9, " nC"), (1e-6, " uC"), (1e-12, " pC")],
            miss,
        ),
        "tj_max_degc": texts(
            rng,
            blank_some(rng, tj, 0.02),
            [(1.0, " °C")] if not messy else [(1.0, " °C"), (1.0, "°C"), (1.0, " degC")],
            miss,
        ),
        "theta_ja_degc_w": texts(
            rng,
            blank_some(rng, round_sig(theta), 0.03),
            [(1.0, " °C/W")] if not messy else [(1.0, " °C/W"), (1.0, " K/W")],
            miss,
        ),
        "package": np.array([p[0] for p in DIODE_PACKAGES], dtype=object)[pkg],
        "unit_price": price_column(rng, price * jitter(rng, rows, 0.2), layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }


def types_is(index: np.ndarray, names: Sequence[str], name: str) -> np.ndarray:
    return index == list(names).index(name)


# ---------------------------------------------------------------------------------------
# MOSFETs

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
FET_VOLTAGES = np.array([20, 30, 40, 60, 80, 100, 150, 200, 250, 600])
RDS_PACKAGE_OHM = 0.4e-3  # bond wires and leadframe: a floor under the silicon resistance
FET_MAKERS = ["Tessaly Semiconductor", "Kestrow Devices", "Ondrel Microsystems"]
FET_PREFIXES = ["TSF", "KFN", "OMN"]
RDS_K = 6.4e-6  # ohm*mm^2 per V^2.4, fitted so a 40 V part on 2.5 mm^2 has about 18 mOhm


def _mosfets(rng: np.random.Generator, rows: int, seed: int, layout: str) -> dict:
    """MOSFET columns: Rds(on) rises steeply with Vds and falls with die area; charge grows."""
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
    messy = layout == "messy"
    miss = MISSING_MESSY if messy else np.array([""], dtype=object)
    sign = np.where(p_channel & messy & (rng.random(rows) < 0.5), -1.0, 1.0)  # "-40 V" p-channel
    ch_text = (
        {"n": ["N-Channel"], "p": ["P-Channel"]}
        if not messy
        else {"n": ["N-Channel", "N", "NCH", "n-channel"], "p": ["P-Channel", "P", "PCH"]}
    )
    v_sp = [(1.0, " V")] if not messy else [(1.0, " V"), (1.0, "V")]
    q_sp = [(1e-9, " nC")] if not messy else [(1e-9, " nC"), (1e-9, "nC"), (1e-12, " pC")]
    price = (0.05 + 0.02 * table[pkg, 0] * (vds / 40) ** 0.5) * jitter(rng, rows, 0.2)
    return {
        "mpn": join_columns(
            prefix,
            coded(vds, lambda x: f"{x:g}"),
            "-",
            coded(round_sig(id_a), lambda v: num(v, 2).replace(".", "R")),
            "-",
            ([p[0] for p in FET_PACKAGES], pkg),
            "-",
        )
        + serials(rows, seed),
        "manufacturer": maker,
        "description": join_columns(
            np.where(p_channel, "P-channel MOSFET ", "N-channel MOSFET ").astype(object),
            ([p[0] for p in FET_PACKAGES], pkg),
        ),
        "channel": choose_text(
            rng,
            (("n", "p", "-"), np.where(rng.random(rows) < 0.01, 2, p_channel.astype(int))),
            {**ch_text, "-": [""]},
        ),
        "vds_v": texts(rng, sign * vds, v_sp, miss),
        "id_a": texts(
            rng,
            sign * round_sig(id_a),
            [(1.0, " A")] if not messy else [(1.0, " A"), (1.0, "A")],
            miss,
        ),
        "rds_on_ohm": texts(
            rng,
            round_sig(rds),
            [ohm_text]
            if not messy
            else [ohm_text, lambda x: f"{num(x * 1e3)} mΩ", lambda x: f"{num(x)} Ω"],
            miss,
        ),
        "vgs_th_v": texts(rng, round_sig(vth), v_sp, miss),
        "qg_c": texts(rng, round_sig(qg), q_sp, miss),
        "qgd_c": texts(rng, blank_some(rng, round_sig(qgd), 0.03), q_sp, miss),
        "coss_f": texts(
            rng,
            blank_some(rng, round_sig(coss), 0.05),
            [(1e-12, " pF")] if not messy else [(1e-12, " pF"), (1e-12, "pF"), (1e-9, " nF")],
            miss,
        ),
        "tj_max_degc": texts(
            rng, tj, [(1.0, " °C")] if not messy else [(1.0, " °C"), (1.0, "°C")], miss
        ),
        "theta_ja_degc_w": texts(
            rng,
            blank_some(rng, round_sig(theta), 0.03),
            [(1.0, " °C/W")] if not messy else [(1.0, " °C/W"), (1.0, " K/W")],
            miss,
        ),
        "package": np.array([p[0] for p in FET_PACKAGES], dtype=object)[pkg],
        "unit_price": price_column(rng, price, layout),
        "stock": stock_column(rng, rows, layout),
        "lifecycle": lifecycle_column(rng, rows, layout),
    }


# ---------------------------------------------------------------------------------------
# headers, bad rows, the frame and the file

# fmt: off
HEADERS = {
    "inductor": {
        "clean": ["Mfr Part Number", "Manufacturer", "Description", "Inductance", "Tolerance",
                  "Saturation Current (Isat)", "RMS Current", "DC Resistance", "SRF", "Package",
                  "Length", "Width", "Height", "Shielded", "Unit Price", "Stock", "Lifecycle"],
        "messy": ["Part No", "Mfr", "Desc", "Inductance [uH]", "Tol.", "Isat, A", "Irms (A)",
                  "DCR (mΩ)", "SRF (MHz)", "Case", "Length (mm)", "Width (mm)", "Height (mm)",
                  "Shielding", "Price Each", "Qty Available", "Lifecycle Status"],
    },
    "capacitor": {
        "clean": ["Mfr Part Number", "Manufacturer", "Description", "Capacitance", "Tolerance",
                  "Voltage Rating", "Dielectric", "ESR", "Ripple Current", "Operating Temperature",
                  "Lifetime", "Package", "Length", "Width", "Height", "Unit Price", "Stock",
                  "Lifecycle"],
        "messy": ["MPN", "Maker", "Product Description", "Cap", "Tol", "Voltage - Rated",
                  "Temperature Coefficient", "ESR (Max)", "Max Ripple Current",
                  "Operating Temperature Range", "Load Life", "Case Code", "Length (mm)",
                  "Width (mm)", "Height (mm)", "Price Each", "Qty Available", "Part Status"],
    },
    "diode": {
        "clean": ["Mfr Part Number", "Manufacturer", "Description", "Diode Type",
                  "Reverse Voltage (Vrrm)", "Average Forward Current", "Surge Current",
                  "Forward Voltage", "Reverse Recovery Time (trr)", "Reverse Recovery Charge",
                  "Max Junction Temperature", "Thermal Resistance Theta JA", "Package",
                  "Unit Price", "Stock", "Lifecycle"],
        "messy": ["Part Number", "Mfg", "Desc", "Technology", "Vrrm", "IF(AV)", "IFSM", "VF",
                  "trr", "Qrr", "Tj max", "RthJA", "Package / Case", "Price Each", "Qty Available",
                  "Status"],
    },
    "mosfet": {
        "clean": ["Mfr Part Number", "Manufacturer", "Description", "Channel",
                  "Drain-Source Voltage (Vds)", "Continuous Drain Current (Id)", "Rds(on)",
                  "Vgs(th)", "Gate Charge (Qg)", "Qgd", "Coss", "Max Junction Temperature",
                  "Thermal Resistance Theta JA", "Package", "Unit Price", "Stock", "Lifecycle"],
        "messy": ["MPN", "Maker", "Desc", "Polarity", "VDSS", "Id", "RDS(on)", "Vth", "Qg",
                  "Gate-Drain Charge", "Output Capacitance", "Tjmax", "θJA", "Package / Case",
                  "Price Each", "Available", "Status"],
    },
}
# fmt: on
EXTRA_COLUMN = "Warehouse Bin"  # unknown to partpick: kept as extra data on import
BUILDERS = {"inductor": _inductors, "capacitor": _capacitors, "diode": _diodes, "mosfet": _mosfets}
# one cell fault per bad row: (field, text) -- a wrong unit, a negative value, plain text
BAD_CELLS = {
    "inductor": [("inductance_h", "10 uF"), ("isat_a", "-3.2 A"), ("dcr_ohm", "see datasheet")],
    "capacitor": [("capacitance_f", "4.7 uH"), ("voltage_v", "-16 V"), ("esr_ohm", "low")],
    "diode": [("vrrm_v", "40 A"), ("if_avg_a", "-2 A"), ("vf_v", "typ.")],
    "mosfet": [("rds_on_ohm", "18 mH"), ("qg_c", "-7 nC"), ("coss_f", "small")],
}


def _plant_bad_rows(rng, columns: dict, kind: str, rows: int, fraction: float) -> np.ndarray:
    """Overwrite one cell in about ``fraction`` of the rows (or blank the part number)."""
    bad = np.flatnonzero(rng.random(rows) < fraction)
    faults = BAD_CELLS[kind] + [("mpn", "")]
    which = rng.integers(0, len(faults), len(bad))
    for i, (name, text) in enumerate(faults):
        columns[name][bad[which == i]] = text
    return bad


def generate(
    kind: str, rows: int, seed: int = 0, layout: str = "messy", bad_fraction: float = 0.0
) -> pd.DataFrame:
    """Return ``rows`` invented parts of ``kind`` as a DataFrame of CSV text cells.

    Columns are the CSV headers of ``layout`` ("clean" or "messy"); cells are the text the
    file will hold. The same (kind, rows, seed, layout) always gives the same frame. With
    ``bad_fraction`` > 0 about that share of rows gets one bad cell (a unit of another
    dimension, a negative value, plain text, or an empty part number); their row positions
    are in ``frame.attrs["bad_rows"]``.
    """
    if kind not in BUILDERS:
        raise ValueError(f"unknown kind {kind!r}; expected one of {', '.join(KINDS)}")
    if layout not in LAYOUTS:
        raise ValueError(f"unknown layout {layout!r}; expected clean or messy")
    rng = np.random.default_rng([seed, KINDS.index(kind), LAYOUTS.index(layout)])
    # the serial seed differs per layout, so a clean and a messy file never share identities
    columns = BUILDERS[kind](rng, rows, 2 * seed + LAYOUTS.index(layout), layout)
    bad = _plant_bad_rows(rng, columns, kind, rows, bad_fraction) if bad_fraction else []
    frame = pd.DataFrame(
        dict(zip(HEADERS[kind][layout], columns.values(), strict=True)), dtype=object
    )
    if layout == "messy":
        frame[EXTRA_COLUMN] = texts(
            rng,
            rng.integers(1, 400, rows).astype(float),
            [lambda v: f"A-{int(v):03d}", lambda v: f"B{int(v)}"],
            np.array([""], dtype=object),
        )
    frame.attrs["bad_rows"] = np.asarray(bad, dtype=int)
    return frame


def write_catalog(frame: pd.DataFrame, path: str | Path, layout: str = "messy") -> Path:
    """Write a generated frame as CSV: comma/UTF-8 when clean, semicolon/UTF-8-BOM when messy.

    Rows are joined in chunks without quoting; if any cell holds the delimiter, a quote or
    a line break (counted, not assumed), the frame is written by pandas with quoting instead.
    """
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    delimiter, encoding = (",", "utf-8") if layout == "clean" else (";", "utf-8-sig")
    if not _write_joined(frame, path, delimiter, encoding):
        frame.to_csv(path, index=False, sep=delimiter, encoding=encoding, lineterminator="\n")
    return path


def _write_joined(frame: pd.DataFrame, path: Path, delimiter: str, encoding: str) -> bool:
    """Write rows joined by ``delimiter``; return False (file unfinished) if quoting is needed.

    Each chunk's text is checked by counting: exactly columns-1 delimiters and one newline
    per row, and no double quote, so no cell needed quoting.
    """
    columns = [frame[c].to_numpy(dtype=object).tolist() for c in frame.columns]
    header = delimiter.join(frame.columns)
    if header.count(delimiter) != len(columns) - 1 or '"' in header:
        return False
    with open(path, "w", encoding=encoding, newline="") as handle:
        handle.write(header + "\n")
        for start in range(0, len(frame), 100_000):
            chunk = [col[start : start + 100_000] for col in columns]
            text = "\n".join(map(delimiter.join, zip(*chunk, strict=True))) + "\n"
            rows = len(chunk[0])
            if (
                text.count(delimiter) != rows * (len(columns) - 1)
                or text.count("\n") != rows
                or '"' in text
                or "\r" in text
            ):
                return False
            handle.write(text)
    return True


def _parse_args(argv: Sequence[str] | None) -> argparse.Namespace:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    target = parser.add_mutually_exclusive_group(required=True)
    target.add_argument("--kind", choices=KINDS, help="part kind to generate")
    target.add_argument("--all", action="store_true", help="generate all four kinds")
    parser.add_argument("--rows", type=int, help="rows to write (with --kind)")
    parser.add_argument("--out", help="output CSV file (with --kind)")
    parser.add_argument("--rows-per-kind", type=int, help="rows per kind (with --all)")
    parser.add_argument("--out-dir", help="output folder (with --all): <kind>s.csv inside")
    parser.add_argument("--seed", type=int, default=0, help="random seed (default 0)")
    parser.add_argument("--layout", choices=LAYOUTS, default="messy", help="default messy")
    parser.add_argument(
        "--bad-fraction",
        type=float,
        default=0.0,
        help="share of rows given one bad cell (default 0)",
    )
    args = parser.parse_args(argv)
    if args.kind and (args.rows is None or args.out is None):
        parser.error("--kind needs --rows and --out")
    if args.all and (args.rows_per_kind is None or args.out_dir is None):
        parser.error("--all needs --rows-per-kind and --out-dir")
    if (args.rows or args.rows_per_kind or 0) < 0 or not 0 <= args.bad_fraction <= 1:
        parser.error("rows must be 0 or more and --bad-fraction within [0, 1]")
    return args


def main(argv: Sequence[str] | None = None) -> int:
    args = _parse_args(argv)
    jobs = (
        [(args.kind, args.rows, Path(args.out))]
        if args.kind
        else [(k, args.rows_per_kind, Path(args.out_dir) / f"{k}s.csv") for k in KINDS]
    )
    for kind, rows, path in jobs:
        start = time.perf_counter()
        frame = generate(kind, rows, args.seed, args.layout, args.bad_fraction)
        built = time.perf_counter() - start
        write_catalog(frame, path, args.layout)
        total = time.perf_counter() - start
        print(
            f"{path}: {rows} {kind} rows ({args.layout}); built in {built:.2f} s, "
            f"written in {total - built:.2f} s",
            file=sys.stderr,
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
