"""Synthetic, invented part catalogs: one module per part kind, all of the same shape.

Each kind module (``inductors``, ``capacitors``, ``diodes``, ``mosfets``) holds its value
tables and offers ``KIND``, ``HEADERS`` (the clean and messy CSV headers), ``BAD_CELLS``
(the faults planted in bad rows) and ``build_columns(rng, rows, seed, layout)``, which
returns the text columns keyed by canonical field in header order. ``common`` holds the
E-series, the vectorised formatters and the CSV writer. ``scripts/gen_catalog.py`` is the
command line.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from . import capacitors, diodes, inductors, mosfets
from .common import texts, write_catalog

# The position of a kind is part of its random seed: append new kinds, never reorder.
KIND_MODULES = {module.KIND: module for module in (inductors, capacitors, diodes, mosfets)}
KINDS = tuple(KIND_MODULES)
LAYOUTS = ("clean", "messy")
EXTRA_COLUMN = "Warehouse Bin"  # unknown to partpick: kept as extra data on import

__all__ = ["EXTRA_COLUMN", "KINDS", "LAYOUTS", "generate", "write_catalog"]


def _plant_bad_rows(rng, columns: dict, kind: str, rows: int, fraction: float) -> np.ndarray:
    """Overwrite one cell in about ``fraction`` of the rows (or blank the part number)."""
    bad = np.flatnonzero(rng.random(rows) < fraction)
    faults = KIND_MODULES[kind].BAD_CELLS + [("mpn", "")]
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
    if kind not in KIND_MODULES:
        raise ValueError(f"unknown kind {kind!r}; expected one of {', '.join(KINDS)}")
    if layout not in LAYOUTS:
        raise ValueError(f"unknown layout {layout!r}; expected clean or messy")
    module = KIND_MODULES[kind]
    rng = np.random.default_rng([seed, KINDS.index(kind), LAYOUTS.index(layout)])
    # the serial seed differs per layout, so a clean and a messy file never share identities
    columns = module.build_columns(rng, rows, 2 * seed + LAYOUTS.index(layout), layout)
    bad = _plant_bad_rows(rng, columns, kind, rows, bad_fraction) if bad_fraction else []
    frame = pd.DataFrame(
        dict(zip(module.HEADERS[layout], columns.values(), strict=True)), dtype=object
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
