"""Turn one CSV column of text into typed values, once per distinct string.

Catalog columns repeat heavily (a thousand parts share a dozen inductance values), so each
column is factorised, each distinct text is read once by :mod:`partpick.units` or the
field's aliases, and the results are spread back with an array take. No per-cell Python loop.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass

import numpy as np
import pandas as pd

from partpick.errors import UnitError
from partpick.fields import Field, fold_text
from partpick.units import dimension_name, is_missing, parse_quantity

# Words that answer a yes/no field such as ``shielded``; folded with fold_text.
# "semi-shielded" is not fully shielded, so a filter asking for shielded parts must not pass it.
BOOL_WORDS: dict[str, bool] = {
    **dict.fromkeys(("yes", "y", "true", "t", "1", "x", "shielded", "magnetic shielded"), True),
    **dict.fromkeys(("no", "n", "false", "f", "0", "unshielded", "none", "non shielded"), False),
    **dict.fromkeys(("semi shielded", "semishielded", "semi", "partial"), False),
}
_BOOL_FOLDED = {fold_text(k): v for k, v in BOOL_WORDS.items()}
_SIGNED_UNITS = frozenset({"degC"})  # temperatures are the only ratings below zero


@dataclass(frozen=True)
class ColumnValues:
    """A converted column: values (float64 with NaN, or object with None) and bad cells."""

    values: np.ndarray
    bad: np.ndarray  # bool per cell
    reasons: np.ndarray  # object per cell: None or why the cell is not a value


def convert_column(
    cells: pd.Series, f: Field, *, scale: float = 1.0, decimal_comma: bool = False
) -> ColumnValues:
    """Return the typed values of ``cells`` (text) for field ``f``."""
    codes, uniques = pd.factorize(cells, use_na_sentinel=False)
    texts = [str(u) for u in uniques]
    if f.type in ("float", "int"):
        parsed, reasons = _numbers(texts, f, scale, decimal_comma)
    elif f.type == "enum":
        parsed, reasons = _enums(texts, f)
    elif f.type == "bool":
        parsed, reasons = _bools(texts, f)
    else:
        parsed, reasons = _texts(texts)
    reason_array = np.asarray(reasons, dtype=object)
    bad_unique = np.asarray([r is not None for r in reasons], dtype=bool)
    return ColumnValues(parsed[codes], bad_unique[codes], reason_array[codes])


def _numbers(
    texts: list[str], f: Field, scale: float, decimal_comma: bool
) -> tuple[np.ndarray, list]:
    parsed = np.full(len(texts), math.nan)
    reasons: list[str | None] = [None] * len(texts)
    for i, text in enumerate(texts):
        try:
            value = parse_quantity(text, f.unit, scale=scale, decimal_comma=decimal_comma)
        except UnitError as exc:
            reasons[i] = exc.reason
            continue
        value, reasons[i] = _check_range(value, f)
        parsed[i] = value
    return parsed, reasons


def _check_range(value: float, f: Field) -> tuple[float, str | None]:
    if math.isnan(value):
        return value, None
    if math.isinf(value):
        return math.nan, "not a finite number"
    if f.magnitude:
        value = abs(value)
    if f.positive and value <= 0:
        return math.nan, f"{dimension_name(f.unit)} must be greater than zero"
    if value < 0 and f.unit not in _SIGNED_UNITS:
        return math.nan, f"{dimension_name(f.unit)} cannot be negative"
    if f.type == "int" and value != math.floor(value):
        return math.nan, "must be a whole number"
    return value, None


def _enums(texts: list[str], f: Field) -> tuple[np.ndarray, list]:
    parsed = np.empty(len(texts), dtype=object)
    reasons: list[str | None] = [None] * len(texts)
    for i, text in enumerate(texts):
        if is_missing(text):
            continue
        choice = f.aliases.get(fold_text(text))
        if choice is None:
            reasons[i] = (
                f"unknown {f.name} {text.strip()!r}; expected one of {', '.join(f.choices)}"
            )
        parsed[i] = choice
    return parsed, reasons


def _bools(texts: list[str], f: Field) -> tuple[np.ndarray, list]:
    parsed = np.empty(len(texts), dtype=object)
    reasons: list[str | None] = [None] * len(texts)
    for i, text in enumerate(texts):
        folded = fold_text(text)
        if folded in _BOOL_FOLDED:
            parsed[i] = _BOOL_FOLDED[folded]
        elif not is_missing(text):
            reasons[i] = f"{f.name} must be yes or no, not {text.strip()!r}"
    return parsed, reasons


def _texts(texts: list[str]) -> tuple[np.ndarray, list]:
    parsed = np.empty(len(texts), dtype=object)
    for i, text in enumerate(texts):
        parsed[i] = None if is_missing(text) else " ".join(text.split())
    return parsed, [None] * len(texts)


def extra_json(frame: pd.DataFrame, columns: list[tuple[str, object]]) -> np.ndarray:
    """Return, per row, JSON text of the unrecognised ``columns`` ((header, frame key) pairs).

    None for every row when there are no such columns. Each distinct cell is encoded once and
    the row texts are joined column by column.
    """
    if not columns:
        return np.full(len(frame), None, dtype=object)
    joined: pd.Series | None = None
    for header, key in columns:
        codes, uniques = pd.factorize(frame[key], use_na_sentinel=False)
        encoded = np.asarray([_json_cell(u) for u in uniques], dtype=object)[codes]
        piece = (
            json.dumps(header, ensure_ascii=False)
            + ": "
            + pd.Series(encoded, index=frame.index, dtype=object)
        )
        joined = piece if joined is None else joined + ", " + piece
    return ("{" + joined + "}").to_numpy(dtype=object)


def _json_cell(value: object) -> str:
    text = "" if value is None else str(value).strip()
    return "null" if is_missing(text) else json.dumps(text, ensure_ascii=False)
