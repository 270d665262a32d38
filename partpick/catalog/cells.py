"""Turn one CSV column of text into typed values, once per distinct string.

Catalog columns repeat heavily (a thousand parts share a dozen inductance values), so each
column is factorised, each distinct text is read once by :mod:`partpick.units` or the
field's aliases, and the results are spread back with an array take. Only the factorising
touches every cell (one dict lookup each, as fast as pandas' hash table here, measured on
100,000 inductors). Standard library and numpy only: a small import never loads pandas
(pandas' factorize is used only where a large file's reading has loaded it already).
"""

from __future__ import annotations

import itertools
import json
import math
import re
import sys
from dataclasses import dataclass

import numpy as np

from partpick.errors import UnitError
from partpick.fields import Field, fold_text
from partpick.units import (
    MISSING_MARKERS,
    dimension_name,
    is_missing,
    parse_quantity,
    scaled_exactly,
)

# Words that answer a yes/no field such as ``shielded``; folded with fold_text.
# "semi-shielded" is not fully shielded, so a filter asking for shielded parts must not pass it.
BOOL_WORDS: dict[str, bool] = {
    **dict.fromkeys(("yes", "y", "true", "t", "1", "x", "shielded", "magnetic shielded"), True),
    **dict.fromkeys(("no", "n", "false", "f", "0", "unshielded", "none", "non shielded"), False),
    **dict.fromkeys(("semi shielded", "semishielded", "semi", "partial"), False),
}
_BOOL_FOLDED = {fold_text(k): v for k, v in BOOL_WORDS.items()}
_SIGNED_UNITS = frozenset({"degC"})
# Every upper/lower-case spelling of the missing markers, so a text column is checked with
# one hash lookup per cell instead of lower-casing it first.
_MISSING_SPELLINGS = frozenset(
    "".join(letters)
    for marker in MISSING_MARKERS
    for letters in itertools.product(*({c.lower(), c.upper()} for c in marker))
)  # temperatures are the only ratings below zero


@dataclass(frozen=True)
class ColumnValues:
    """A converted column: values (float64 with NaN, or object with None) and bad cells."""

    values: np.ndarray
    bad: np.ndarray  # bool per cell
    reasons: np.ndarray  # object per cell: None or why the cell is not a value
    conditions: np.ndarray | None = None  # object per cell: what "0.7 V @ 3 A" holds at


def factorize(cells) -> tuple[np.ndarray, list]:
    """Return (code per cell, distinct cells in order of first appearance).

    ``cells`` is any sequence of cell texts. Both passes run inside C (``dict.fromkeys`` and
    a ``map`` of a dict lookup). When pandas is loaded anyway (a large file is read with it),
    its hash table factorises an object array in less than half the time (measured, 50,000
    inductor rows: 0.031 s against 0.072 s for 18 columns); it codes None and NaN as -1,
    so a column holding one goes the dict way, which keeps them as values.
    """
    pandas = sys.modules.get("pandas")
    if pandas is not None and isinstance(cells, np.ndarray) and cells.dtype == object:
        codes, distinct = pandas.factorize(cells)
        if not len(codes) or codes.min() >= 0:
            return codes.astype(np.intp, copy=False), distinct.tolist()
    uniques = list(dict.fromkeys(cells))
    index = {cell: code for code, cell in enumerate(uniques)}
    codes = np.fromiter(map(index.__getitem__, cells), dtype=np.intp, count=len(cells))
    return codes, uniques


def convert_column(
    cells, f: Field, *, scale: float = 1.0, decimal_comma: bool = False
) -> ColumnValues:
    """Return the typed values of ``cells`` (a sequence of texts) for field ``f``."""
    if f.type == "text":
        return _texts(cells)
    codes, uniques = factorize(cells)
    texts = ["" if u is None or u != u else str(u) for u in uniques]
    conditions = None
    if f.type in ("float", "int"):
        texts, conditions = split_conditions(texts)
        parsed, reasons = _numbers(texts, f, scale, decimal_comma)
    elif f.type == "enum":
        parsed, reasons = _enums(texts, f)
    else:
        parsed, reasons = _bools(texts, f)
    reason_array = np.asarray(reasons, dtype=object)
    bad_unique = np.asarray([r is not None for r in reasons], dtype=bool)
    return ColumnValues(
        parsed[codes],
        bad_unique[codes],
        reason_array[codes],
        None if conditions is None else conditions[codes],
    )


def split_conditions(texts: list[str]) -> tuple[list[str], np.ndarray | None]:
    """Return each text's quantity part and, per text, the condition after its "@".

    "0.7 V @ 3 A" reads as 0.7 V held at "3 A"; "30 mOhm @ 5 A, 10 V" as 30 mΩ at
    "5 A, 10 V". The conditions array is None when no text has one (the common case).
    """
    if not any("@" in text for text in texts):
        return texts, None
    values, conditions = [], []
    for text in texts:
        value, _, condition = text.partition("@")
        if not value.strip():  # "@SUM(A1)" holds no quantity: read whole, and refused
            value, condition = text, ""
        values.append(value.strip() if condition else text)
        conditions.append(condition.strip() or None)
    return values, _object_array(conditions)


# A plain number and a unit without digits ("4.7 uH", "45 mΩ max", "3.2"): the common cell.
# Its value is number × (value of "1 <unit>"), so each distinct unit text is parsed once.
# Everything else (ranges, letter codes, tolerances, commas, currency signs) goes through
# parse_quantity whole; both paths give the same result (tests/test_import_cells.py).
# The unit is matched greedily and stripped afterwards: a lazy unit group followed by \s*$
# backtracks at every character and cost more than the rest of the reading.
_SIMPLE_RE = re.compile(r"^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\d,]*)$")


def _numbers(
    texts: list[str], f: Field, scale: float, decimal_comma: bool
) -> tuple[np.ndarray, list]:
    parsed, simple = _simple_numbers(texts, f, scale, decimal_comma)
    reasons: list[str | None] = [None] * len(texts)
    for i in np.flatnonzero(~simple):
        try:
            parsed[i] = parse_quantity(texts[i], f.unit, scale=scale, decimal_comma=decimal_comma)
        except UnitError as exc:
            reasons[i] = exc.reason
    return _check_ranges(parsed, reasons, f)


def _simple_numbers(
    texts: list[str], f: Field, scale: float, decimal_comma: bool
) -> tuple[np.ndarray, np.ndarray]:
    """Return values of the plain "number unit" texts and a mask of the texts it read."""
    # A plain loop over the distinct texts: pandas' str.extract costs ten times as much here.
    matches = [_SIMPLE_RE.match(text) for text in texts]
    numbers = np.array([float(m[1]) if m else math.nan for m in matches], dtype=float)
    suffixes = _object_array([m[2].rstrip() if m else "" for m in matches])
    factors = np.full(len(texts), math.nan)
    for suffix in dict.fromkeys(suffixes[~np.isnan(numbers)].tolist()):
        if suffix == "" and f.unit == "fraction":
            continue  # a bare tolerance needs parse_quantity's ambiguity check
        try:
            factor = parse_quantity("1 " + suffix, f.unit, scale=scale, decimal_comma=decimal_comma)
        except UnitError:
            continue  # parse the whole text, for its exact reason
        factors[suffixes == suffix] = factor
    simple = ~np.isnan(numbers) & ~np.isnan(factors)
    values = np.where(simple, numbers, math.nan)
    for i in np.flatnonzero(simple & (factors != 1.0)):  # one rounding, as parse_quantity does
        values[i] = scaled_exactly(matches[i][1], factors[i])
    return values, simple


def _check_ranges(parsed: np.ndarray, reasons: list, f: Field) -> tuple[np.ndarray, list]:
    """Refuse values no real part has; return the values (NaN where refused) and reasons."""
    values = np.abs(parsed) if f.magnitude else parsed
    name = dimension_name(f.unit)
    with np.errstate(invalid="ignore"):
        checks = [
            (np.isinf(values), "not a finite number"),
            (values <= 0 if f.positive else np.zeros(len(values), bool),
             f"{name} must be greater than zero"),
            (values < 0 if f.unit not in _SIGNED_UNITS else np.zeros(len(values), bool),
             f"{name} cannot be negative"),
            ((values != np.floor(values)) & ~np.isnan(values) if f.type == "int"
             else np.zeros(len(values), bool), "must be a whole number"),
        ]  # fmt: skip
    values = values.copy()
    for failed, reason in checks:
        for i in np.flatnonzero(failed):
            if reasons[i] is None:
                reasons[i] = reason
        values[failed] = math.nan
    return values, reasons


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


def _texts(cells) -> ColumnValues:
    """Return a text column stripped, None where it holds a missing marker.

    Python's own ``str.strip`` mapped over the cells: pandas' ``.str.strip`` costs several
    times as much per cell. Cells that are not text (None, or NaN) are missing.
    """
    try:  # both readers give text in every cell: strip them all inside C
        stripped = list(map(str.strip, cells))
    except TypeError:  # a cell that is not text (None, NaN) becomes "", a missing marker
        stripped = [cell.strip() if isinstance(cell, str) else "" for cell in cells]
    values = _object_array(stripped)
    missing = np.fromiter(
        map(_MISSING_SPELLINGS.__contains__, values), dtype=bool, count=len(values)
    )
    values[missing] = None
    count = len(values)
    return ColumnValues(values, np.zeros(count, dtype=bool), np.full(count, None, dtype=object))


def _object_array(items: list) -> np.ndarray:
    """Return ``items`` as a 1-d object array (never a 2-d array of characters)."""
    array = np.empty(len(items), dtype=object)
    array[:] = items
    return array


def extra_json(frame, columns: list[tuple[str, object]], rows: int) -> np.ndarray:
    """Return, per row, JSON text of the unrecognised ``columns`` ((header, frame key) pairs).

    ``frame`` maps each key to the column's cells; ``rows`` is the number of rows.

    None for every row when there are no such columns. Each distinct cell is encoded once,
    with its key and the separators around it, so a row's text is one array take per column
    and one concatenation per further column.
    """
    if not columns:
        return np.full(rows, None, dtype=object)
    joined: np.ndarray | None = None
    last = len(columns) - 1
    for index, (header, key) in enumerate(columns):
        codes, uniques = factorize(frame[key])
        before = ("{" if index == 0 else ", ") + json.dumps(header, ensure_ascii=False) + ": "
        after = "}" if index == last else ""
        encoded = _object_array([before + _json_cell(u) + after for u in uniques])[codes]
        joined = encoded if joined is None else joined + encoded
    return joined


def with_notes(extra: np.ndarray, notes: list[tuple[str, np.ndarray]]) -> np.ndarray:
    """Return the per-row extra JSON with each note's key added where its value is not None.

    A note (what a figure was measured at, where a value was inferred from) is left out of
    a row that has none, so a part's extra data does not depend on which chunk it was in.
    """
    if not notes:
        return extra
    pieces = np.full(len(extra), "", dtype=object)
    for key, values in notes:
        head = json.dumps(key, ensure_ascii=False) + ": "
        codes, uniques = factorize(values)
        encoded = _object_array(
            ["" if u is None else ", " + head + json.dumps(str(u), ensure_ascii=False)
             for u in uniques]
        )  # fmt: skip
        pieces = pieces + encoded[codes]
    out = np.empty(len(extra), dtype=object)
    for i, (text, piece) in enumerate(zip(extra.tolist(), pieces.tolist(), strict=True)):
        if not piece:
            out[i] = text
        elif text is None:
            out[i] = "{" + piece[2:] + "}"
        else:
            out[i] = text[:-1] + piece + "}"
    return out


def _json_cell(value: object) -> str:
    text = "" if value is None else str(value).strip()
    return "null" if is_missing(text) else json.dumps(text, ensure_ascii=False)
