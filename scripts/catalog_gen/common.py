"""Shared pieces of the synthetic catalog generator: E-series, formatters and the writer.

Every column is built with numpy; text is formatted once per distinct value and spelling,
then gathered with an array take, so a million rows take a few seconds.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from pathlib import Path

import numpy as np
import pandas as pd

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


def missing_markers(layout: str) -> np.ndarray:
    """Return the texts a layout writes for a missing cell (one per missing cell, at random)."""
    return MISSING_MESSY if layout == "messy" else np.array([""], dtype=object)


# ---------------------------------------------------------------------------------------
# the file


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
