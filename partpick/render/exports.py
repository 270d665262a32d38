"""File exports: spreadsheet-safe CSV, JSON, and atomic writes.

Catalog text comes from outside (distributor exports, vendor files) and is untrusted. A cell
that a spreadsheet would read as a formula is neutralised before it is written, following the
OWASP "CSV Injection" guidance: a text cell that begins with ``=``, ``+``, ``-``, ``@``, a tab
or a carriage return gets a leading apostrophe. Numbers are written as numbers, with at most
:data:`SIGNIFICANT_DIGITS` significant digits so that no float noise (``5.4799999999999995``)
reaches a spreadsheet or a JSON reader.
"""

from __future__ import annotations

import csv
import io
import json
import math
from collections.abc import Iterable, Mapping, Sequence
from pathlib import Path

import numpy as np

from partpick.outputs import write_output
from partpick.render.safe_text import markdown_text

FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")
SIGNIFICANT_DIGITS = 12  # far beyond any catalog figure, well short of float noise


def tidy_number(value: float) -> float:
    """Return ``value`` rounded to 12 significant digits, so its repr carries no float noise."""
    if not math.isfinite(value) or value == 0.0:
        return value
    return float(f"{value:.{SIGNIFICANT_DIGITS}g}")


def tidy_array(values: object) -> np.ndarray:
    """Return an array of floats each rounded to 12 significant digits, like :func:`tidy_number`.

    Vectorised: x is scaled by an exact power of ten, rounded to a whole number and scaled
    back in one correctly rounded division, which lands on the float nearest the 12-digit
    decimal. Magnitudes whose power of ten is not exact in binary64 (below 1e-11 or above
    1e22) fall back to :func:`tidy_number` one by one; they are rare in a catalog.
    """
    a = np.array(values, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        digits = (SIGNIFICANT_DIGITS - 1) - np.floor(np.log10(np.abs(a)))
    up = np.isfinite(digits) & (digits >= 0) & (digits <= 22)
    down = np.isfinite(digits) & (digits < 0) & (digits >= -22)
    a[up] = np.round(a[up] * 10.0 ** digits[up]) / 10.0 ** digits[up]
    a[down] = np.round(a[down] / 10.0 ** -digits[down]) * 10.0 ** -digits[down]
    for i in np.flatnonzero(np.isfinite(digits) & ~up & ~down):
        a[i] = tidy_number(float(a[i]))
    return a


def neutralise_cell(value: object) -> object:
    """Return ``value`` safe for a spreadsheet: text starting like a formula gets a ``'`` lead.

    Numbers (int, float) are returned unchanged so they stay numbers; None becomes "".
    """
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return "" if math.isnan(value) else tidy_number(value)
    if isinstance(value, int):
        return value
    text = str(value)
    if text.startswith(FORMULA_LEADS):
        return "'" + text
    return text


def csv_text(header: Sequence[str], rows: Iterable[Sequence[object]]) -> str:
    """Return CSV text of ``rows`` under ``header``, every cell neutralised."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([neutralise_cell(h) for h in header])
    for row in rows:
        writer.writerow([neutralise_cell(cell) for cell in row])
    return buffer.getvalue()


def json_text(document: object) -> str:
    """Return ``document`` as indented JSON; NaN becomes null, as JSON has no NaN.

    Floats are written with at most 12 significant digits (:func:`tidy_number`).
    """
    return json.dumps(tidy_document(document), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def tidy_document(value: object) -> object:
    """Return a JSON-ready copy of ``value``: NaN and infinity as None, floats tidied."""
    if isinstance(value, float):
        return tidy_number(value) if math.isfinite(value) else None
    if isinstance(value, Mapping):
        return {str(k): tidy_document(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [tidy_document(v) for v in value]
    if hasattr(value, "item") and callable(value.item):  # numpy scalars
        return tidy_document(value.item())
    return value


def write_atomically(path: str | Path, text: str | bytes, option: str = "--output") -> Path:
    """Write ``text`` to ``path`` under the output policy of :mod:`partpick.outputs`.

    The path is checked first (regular file or nothing, writable folder), a symlink is
    written through, the bytes land through a temporary file and a rename, and an existing
    file keeps its mode. Returns the file written.
    """
    return write_output(path, text, option)


def markdown_table(header: Sequence[str], rows: Iterable[Sequence[object]]) -> str:
    """Return a GitHub-flavoured Markdown table; every cell is escaped as text (see
    :func:`partpick.render.safe_text.markdown_text`: pipes, line breaks, HTML, markup)."""

    def cell(value: object) -> str:
        return markdown_text(value)

    lines = [
        "| " + " | ".join(cell(h) for h in header) + " |",
        "|" + "|".join("---" for _ in header) + "|",
    ]
    lines += ["| " + " | ".join(cell(v) for v in row) + " |" for row in rows]
    return "\n".join(lines) + "\n"
