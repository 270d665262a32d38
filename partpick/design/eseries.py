"""Preferred number series of IEC 60063 (E6, E12, E24), for standard component values.

The tables are the two-significant-figure values of one decade as listed in IEC 60063:2015,
"Preferred number series for resistors and capacitors"; every decade repeats them.
"""

from __future__ import annotations

import math

from partpick.errors import SpecError

E_SERIES: dict[str, tuple[float, ...]] = {
    "E6": (1.0, 1.5, 2.2, 3.3, 4.7, 6.8),
    "E12": (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2),
    "E24": (
        1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
        3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
    ),
}  # fmt: skip

# A value given as 4.7e-6 is stored as 4.6999999999999995e-06; treat such neighbours as equal.
_RELATIVE_TOLERANCE = 1e-9


def _series(series: str) -> tuple[float, ...]:
    try:
        return E_SERIES[series.upper()]
    except KeyError:
        known = ", ".join(E_SERIES)
        raise SpecError(key="series", reason=f"unknown E series; use one of {known}") from None


def _value(mantissa: float, decade: int) -> float:
    """Return mantissa·10^decade as the float nearest its decimal text (4.7e-06 exactly)."""
    return float(f"{mantissa}e{decade}")


def next_e_value(x: float, series: str = "E12") -> float:
    """Return the smallest value of ``series`` that is at least ``x`` (any positive decade).

    ``x`` in any unit (the series is dimensionless); raises ValueError for x ≤ 0 or not finite.
    """
    if not (math.isfinite(x) and x > 0):
        raise ValueError(f"an E-series lookup needs a positive finite number, got {x!r}")
    table = _series(series)
    decade = math.floor(math.log10(x))
    for step in (decade - 1, decade, decade + 1):
        for mantissa in table:
            candidate = _value(mantissa, step)
            if candidate >= x * (1 - _RELATIVE_TOLERANCE):
                return candidate
    raise AssertionError("unreachable: the next decade always holds a larger value")


def e_values_between(lo: float, hi: float, series: str = "E12") -> list[float]:
    """Return every value of ``series`` in [lo, hi], ascending (empty if none fits)."""
    if not (math.isfinite(lo) and math.isfinite(hi)) or lo <= 0 or hi < lo:
        return []
    table = _series(series)
    values = []
    for decade in range(math.floor(math.log10(lo)), math.floor(math.log10(hi)) + 1):
        for mantissa in table:
            candidate = _value(mantissa, decade)
            if lo * (1 - _RELATIVE_TOLERANCE) <= candidate <= hi * (1 + _RELATIVE_TOLERANCE):
                values.append(candidate)
    return values
