"""Figures a description states plainly: a diode's type, a MOSFET's channel.

A distributor's description often says what a column would ("SCHOTTKY RECT 40V 3A",
"MOSFET N-CH 60V 8A"). Where a file has no value for the field, the description fills it,
and the part's extra data records that the value was inferred and from where. Nothing is
ever inferred from a part number: type codes are a maker's own and mean nothing elsewhere.
A description that names two answers ("Schottky and fast recovery pair", "N+P channel")
gives none.
"""

from __future__ import annotations

import re

import numpy as np

from partpick.catalog.cells import factorize

# field -> ((pattern, value), ...); the first listed wins where two match the same words,
# so "SiC Schottky" is sic, not schottky.
_CLUES: dict[str, dict[str, tuple[tuple[re.Pattern[str], str], ...]]] = {
    "diode": {
        "diode_type": (
            (re.compile(r"\bsic\b|silicon[- ]carbide", re.IGNORECASE), "sic"),
            (re.compile(r"\bschottky\b|\bsbd\b", re.IGNORECASE), "schottky"),
            (
                re.compile(
                    r"\b(?:ultra|hyper|super)[- ]?fast\b|\bfast[- ]recovery\b|\bfred\b|\bfrd\b",
                    re.IGNORECASE,
                ),
                "fast",
            ),
            (re.compile(r"\bstandard[- ]recovery\b", re.IGNORECASE), "standard"),
        ),
    },
    "mosfet": {
        "channel": (
            (re.compile(r"\bn[- ]?(?:channel|ch|chan)\b|\bnmos\b", re.IGNORECASE), "n"),
            (re.compile(r"\bp[- ]?(?:channel|ch|chan)\b|\bpmos\b", re.IGNORECASE), "p"),
        ),
    },
}
# Descriptions that name both answers in one phrase ("N- and P-Channel", "N/P-CH pair").
_BOTH: dict[str, re.Pattern[str]] = {
    "channel": re.compile(r"\bn\s*-?\s*(?:/|\+|&|and)\s*p\b|\bcomplementary\b", re.IGNORECASE),
}
SOURCE = "description"


def inferable_fields(kind: str) -> tuple[str, ...]:
    """Return the fields of ``kind`` a description can fill."""
    return tuple(_CLUES.get(kind, {}))


def infer_value(kind: str, name: str, description: str | None) -> str | None:
    """Return the value of field ``name`` that ``description`` states, or None.

    None also where it names two different values ("N- and P-channel pair").
    """
    if not description:
        return None
    both = _BOTH.get(name)
    if both is not None and both.search(description):
        return None
    clues = _CLUES[kind][name]
    found = [value for pattern, value in clues if pattern.search(description)]
    if kind == "diode" and found[:2] == ["sic", "schottky"]:
        found = ["sic"]  # a SiC Schottky is the sic type
    return found[0] if len(set(found)) == 1 else None


def infer_column(kind: str, name: str, descriptions: np.ndarray) -> np.ndarray:
    """Return, per row, the value the description states (None where it states none).

    Each distinct description is read once.
    """
    codes, uniques = factorize(descriptions)
    values = np.empty(len(uniques), dtype=object)
    values[:] = [infer_value(kind, name, None if u is None else str(u)) for u in uniques]
    return values[codes]
