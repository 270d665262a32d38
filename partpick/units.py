"""Text with units to SI floats, and SI floats back to engineering text.

This is the only place where text becomes a number. Catalog cells, header units, map files
and spec values all go through :func:`parse_quantity`; renderers use :func:`format_eng`.

Units are named by a *dimension key* (``"H"``, ``"F"``, ``"ohm"``, ``"A"``, ``"V"``, ``"W"``,
``"Hz"``, ``"s"``, ``"C"``, ``"degC"``, ``"degC/W"``, ``"mm"``, ``"h"``, ``"fraction"``,
``"currency"``, ``"count"``). Every parsed value is in the SI (or stated) base of its key.

The grammar accepted, in order of application:

* missing markers: empty, ``-``, ``N/A``, ``NA``, ``n/a``, ``none``, ``?``
* trailing qualifiers: ``max``, ``typ``, ``min``, ``nom`` and anything after ``@``
* ranges ``a ~ b``, ``a to b``, ``a ... b``: the largest end is kept
* tolerances ``±20%``, ``+/-20%``, ``20%`` (dimension ``fraction``)
* IEC 60062 letter codes ``4u7``, ``2n2``, ``1k5``, ``4R7``, ``R47``
* a number, optional space, optional SI prefix (p n u µ μ m k K M G), optional unit word

SI prefixes are case sensitive (``m`` is milli, ``M`` mega); unit words are not.
"""

from __future__ import annotations

import math
import re
from decimal import Decimal
from functools import lru_cache

from partpick.errors import UnitError

PREFIXES: dict[str, float] = {
    "p": 1e-12,
    "n": 1e-9,
    "u": 1e-6,
    "m": 1e-3,
    "k": 1e3,
    "K": 1e3,
    "M": 1e6,
    "G": 1e9,
}

# Unit words per dimension key, lower case, after µ/Ω normalisation. Each maps to the factor
# that turns one of it into the key's base.
UNIT_WORDS: dict[str, dict[str, float]] = {
    "H": {"h": 1.0, "henry": 1.0, "henries": 1.0},
    "F": {"f": 1.0, "farad": 1.0, "farads": 1.0},
    "ohm": {"ohm": 1.0, "ohms": 1.0},
    "A": {"a": 1.0, "amp": 1.0, "amps": 1.0, "ampere": 1.0, "amperes": 1.0, "adc": 1.0},
    "V": {"v": 1.0, "vdc": 1.0, "volt": 1.0, "volts": 1.0, "v dc": 1.0},
    "W": {"w": 1.0, "watt": 1.0, "watts": 1.0},
    "Hz": {"hz": 1.0, "hertz": 1.0},
    "s": {"s": 1.0, "sec": 1.0},
    "C": {"c": 1.0, "coulomb": 1.0},
    "degC": {"degc": 1.0, "°c": 1.0, "c": 1.0, "deg c": 1.0, "deg": 1.0, "°": 1.0},
    "degC/W": {"degc/w": 1.0, "°c/w": 1.0, "c/w": 1.0, "k/w": 1.0},
    "mm": {"mm": 1.0},
    "h": {"h": 1.0, "hr": 1.0, "hrs": 1.0, "hour": 1.0, "hours": 1.0},
    "fraction": {"%": 0.01},
    "currency": {"$": 1.0, "usd": 1.0, "€": 1.0, "eur": 1.0, "£": 1.0, "gbp": 1.0, "¥": 1.0},
    "count": {"pcs": 1.0, "pc": 1.0, "pieces": 1.0, "units": 1.0},
    "m2": {"m2": 1.0, "m²": 1.0, "cm2": 1e-4, "cm²": 1e-4, "mm2": 1e-6, "mm²": 1e-6},
    "m3": {"m3": 1.0, "m³": 1.0, "cm3": 1e-6, "cm³": 1e-6, "mm3": 1e-9, "mm³": 1e-9},
    "number": {},
}

# Prefix use that makes sense per dimension; a prefix outside this set is an error.
_NO_PREFIX = {"degC", "degC/W", "mm", "fraction", "currency", "count", "h", "m2", "m3", "number"}

# Lengths have no SI prefix grammar here: "mm" is the base, so list the other lengths whole.
UNIT_WORDS["mm"].update({"cm": 10.0, "in": 25.4, "inch": 25.4, '"': 25.4, "mil": 0.0254})
UNIT_WORDS["h"].update({"kh": 1000.0, "khrs": 1000.0})

MISSING_MARKERS = frozenset({"", "-", "--", "n/a", "na", "none", "?", "nan", "null", "—", "–"})

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_NUMBER_RE = re.compile(rf"^({_NUMBER})\s*(.*)$")
_IEC_RE = re.compile(r"^(\d+)([pnumkKMGR])(\d+)\s*(.*)$")
_R_LEAD_RE = re.compile(r"^R(\d+)\s*(.*)$")
_QUALIFIER_RE = re.compile(
    r"\s*(?:@.*|[\(\[]?\b(?:max|maximum|typ|typical|min|minimum|nom|nominal)\.?[\)\]]?\s*)$",
    re.IGNORECASE,
)
_RANGE_RE = re.compile(r"\s*(?:~|\bto\b|\.\.\.|…)\s*")
_THOUSANDS_RE = re.compile(r"^[+-]?\d{1,3}(?:,\d{3})+(?:\.\d+)?")
_COMMA_DECIMAL_RE = re.compile(r"^[+-]?\d+,\d+")
_TOLERANCE_LEAD_RE = re.compile(r"^(?:±|\+/-|\+-|\+/−)\s*")
_CURRENCY_LEAD_RE = re.compile(r"^(?:\$|€|£|¥|usd|eur|gbp)\s*", re.IGNORECASE)

_DIMENSION_NAMES = {
    "H": "inductance (H)",
    "F": "capacitance (F)",
    "ohm": "resistance (Ω)",
    "A": "current (A)",
    "V": "voltage (V)",
    "W": "power (W)",
    "Hz": "frequency (Hz)",
    "s": "time (s)",
    "C": "charge (C)",
    "degC": "temperature (°C)",
    "degC/W": "thermal resistance (°C/W)",
    "mm": "length (mm)",
    "h": "lifetime (hours)",
    "fraction": "fraction or percent",
    "currency": "price",
    "count": "count",
    "m2": "area (m²)",
    "m3": "volume (m³)",
    "number": "plain number",
}


def dimension_name(unit: str) -> str:
    """Return a readable name for a dimension key, such as ``"inductance (H)"``."""
    return _DIMENSION_NAMES.get(unit, unit)


def normalise_text(text: str) -> str:
    """Return ``text`` with the look-alike micro, ohm and minus signs folded to ASCII."""
    return (
        text.replace("\u00b5", "u")
        .replace("\u03bc", "u")
        .replace("\u2126", "ohm")
        .replace("\u03a9", "ohm")
        .replace("\u2212", "-")
        .replace("\u00ba", "°")
        .replace("\u00a0", " ")
        .strip()
    )


def is_missing(text: object) -> bool:
    """Return True where a cell means "no value" (empty, ``-``, ``N/A`` and the like)."""
    if text is None:
        return True
    if isinstance(text, float) and math.isnan(text):
        return True
    return str(text).strip().lower() in MISSING_MARKERS


def unit_multiplier(unit_text: str, unit: str) -> float:
    """Return the factor that turns one ``unit_text`` (``"mΩ"``, ``"uH"``, ``"%"``) into SI.

    Used for header units and map-file units that scale the bare numbers of a column.
    Raises :class:`UnitError` when the text is not a unit of the ``unit`` dimension.
    """
    text = normalise_text(unit_text)
    factor = _suffix_factor(text, unit)
    if factor is None:
        raise UnitError(unit_text, unit, f"not a unit of {dimension_name(unit)}")
    return factor


def unit_dimensions(unit_text: str) -> tuple[str, ...]:
    """Return the dimension keys of which ``unit_text`` (``"mΩ"``, ``"A"``, ``"%"``) is a unit.

    Empty when the text is no unit at all, such as ``"Isat"`` or ``"on"``.
    """
    text = normalise_text(unit_text)
    if not text or text[0].isdigit():
        return ()
    return tuple(unit for unit in UNIT_WORDS if _suffix_factor(text, unit) is not None)


def _suffix_factor(rest: str, unit: str) -> float | None:
    """Return the factor of a prefix+unit suffix in dimension ``unit``, or None if it is not one."""
    words = UNIT_WORDS.get(unit, {})
    low = rest.lower()
    if low in words:
        return words[low]
    if unit in _NO_PREFIX or not rest:
        return None
    head, tail = rest[0], rest[1:]
    if head in PREFIXES and (tail == "" or tail.lower() in words):
        return PREFIXES[head] * (words.get(tail.lower(), 1.0) if tail else 1.0)
    return None


def _other_dimension(rest: str, unit: str) -> str | None:
    """Return the dimension a suffix belongs to, if it is a unit of some other dimension."""
    for other in UNIT_WORDS:
        if other != unit and other not in ("count", "currency", "fraction"):
            if rest and _suffix_factor(rest, other) is not None:
                return other
    return None


def parse_quantity(
    text: object, unit: str, *, scale: float = 1.0, decimal_comma: bool = False
) -> float:
    """Return the value of ``text`` in the base of dimension ``unit``, or NaN where it is missing.

    ``scale`` multiplies bare numbers (the unit given by a column header or map file).
    ``decimal_comma`` accepts ``4,7`` as 4.7; without it, a comma decimal is an error.
    Raises :class:`UnitError` for text that is not a value of that dimension.
    """
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        return scaled_exactly(repr(float(text)), scale)
    if is_missing(text):
        return math.nan
    if unit == "degC" and _KELVIN_RE.match(str(text)):
        kelvin = float(_KELVIN_RE.match(str(text)).group(1))
        raise UnitError(
            str(text), unit, f"a temperature in kelvin; give it in °C ({kelvin:g} K is "
            f"{kelvin - 273.15:g} °C)",
        )  # fmt: skip
    return _parse_text(str(text), unit, scale, decimal_comma)


_KELVIN_RE = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*(?:K|kelvin)\s*$")


@lru_cache(maxsize=65536)
def _parse_text(raw: str, unit: str, scale: float, decimal_comma: bool) -> float:
    text = normalise_text(raw)
    text = _QUALIFIER_RE.sub("", text).strip()
    parts = [p for p in _RANGE_RE.split(text) if p]
    if len(parts) > 1:
        return max(_parse_single(raw, p, unit, scale, decimal_comma) for p in parts)
    return _parse_single(raw, text, unit, scale, decimal_comma)


def _parse_single(raw: str, text: str, unit: str, scale: float, decimal_comma: bool) -> float:
    if unit == "fraction":
        text = _TOLERANCE_LEAD_RE.sub("", text)
    if unit == "currency":
        text = _CURRENCY_LEAD_RE.sub("", text)
    text = _fold_commas(raw, text, unit, decimal_comma)
    iec = _parse_iec(raw, text, unit)
    if iec is not None:
        return iec
    match = _NUMBER_RE.match(text)
    if match is None:
        raise UnitError(raw, unit, "not a number")
    rest = match.group(2).strip()
    if not rest:
        return _check_bare(raw, scaled_exactly(match.group(1), scale), unit)
    factor = _suffix_factor(rest, unit)
    if factor is not None:
        return scaled_exactly(match.group(1), factor)
    other = _other_dimension(rest, unit)
    if other is not None:
        raise UnitError(raw, unit, f"{rest!r} is a unit of {dimension_name(other)}")
    raise UnitError(raw, unit, f"unknown unit {rest!r} for {dimension_name(unit)}")


def _fold_commas(raw: str, text: str, unit: str, decimal_comma: bool) -> str:
    if "," not in text:
        return text
    if decimal_comma and _COMMA_DECIMAL_RE.match(text):
        return text.replace(",", ".", 1)
    if unit in ("count", "currency") and _THOUSANDS_RE.match(text):
        return text.replace(",", "")
    raise UnitError(
        raw,
        unit,
        'a comma in a number is ambiguous; set decimal = "," in the map file '
        "if this file uses decimal commas",
    )


def _parse_iec(raw: str, text: str, unit: str) -> float | None:
    """Return the value of an IEC 60062 letter code such as ``4u7`` or ``R47``, or None."""
    lead = _R_LEAD_RE.match(text)
    match = _IEC_RE.match(text)
    if lead is not None and unit == "ohm":
        digits, rest = lead.groups()
        value = float(f"0.{digits}")  # an ohm letter code has no prefix to scale by
    elif match is not None:
        whole, letter, frac, rest = match.groups()
        if letter == "R":
            if unit != "ohm":
                return None
            factor = 1.0
        else:
            factor = PREFIXES[letter]
            if unit in _NO_PREFIX:
                return None
        value = scaled_exactly(f"{whole}.{frac}", factor)
    else:
        return None
    rest = rest.strip()
    if rest and _suffix_factor(rest, unit) != 1.0 and rest.lower() not in UNIT_WORDS.get(unit, {}):
        raise UnitError(raw, unit, f"unit {rest!r} after a letter code")
    return value


def scaled_exactly(number_text: str, factor: float) -> float:
    """Return the decimal ``number_text`` times ``factor``, rounded once to the nearest float.

    ``float("10") * 1e-6`` rounds twice and gives 9.999999999999999e-06; the product taken in
    decimal and rounded once gives 1e-05, the number a person wrote as "10 uH".
    """
    if factor == 1.0:
        return float(number_text)
    if not math.isfinite(factor) or factor == 0.0:
        return float(number_text) * factor
    return float(Decimal(number_text) * _decimal(factor))


@lru_cache(maxsize=256)
def _decimal(factor: float) -> Decimal:
    """Return a scale factor as the decimal it was written as (``1e-06`` → ``0.000001``)."""
    return Decimal(repr(factor))


def _check_bare(raw: str, value: float, unit: str) -> float:
    if unit == "fraction" and abs(value) >= 1.0:
        raise UnitError(
            raw, unit, "a bare tolerance of 1 or more is ambiguous; write it with a % sign"
        )
    if unit == "count" and value != int(value):
        raise UnitError(raw, unit, "a count must be a whole number")
    return value


_ENG_PREFIXES = [
    (1e9, "G"),
    (1e6, "M"),
    (1e3, "k"),
    (1.0, ""),
    (1e-3, "m"),
    (1e-6, "µ"),
    (1e-9, "n"),
    (1e-12, "p"),
]
_SYMBOLS = {"ohm": "Ω", "degC": "°C", "degC/W": "°C/W", "fraction": "%"}


def format_eng(value: float | None, unit: str, digits: int = 3) -> str:
    """Return ``value`` (SI) as engineering text with a prefix, such as ``"4.7 µH"``.

    ``digits`` is the number of significant figures. Missing values render as ``"—"``.
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    value = float(value)
    symbol = _SYMBOLS.get(unit, unit)
    if unit == "fraction":
        return f"{value * 100:.{digits}g} %"
    if unit == "count":
        return f"{value:.0f}"
    if unit == "currency":  # the catalog's own currency, which it does not name
        return f"{value:.2f}" if abs(value) >= 0.995 else f"{value:.{digits}g}"
    if unit in _NO_PREFIX or value == 0:
        # no exponent for whole numbers too long for ``digits`` (a 10000 h life, say)
        text = f"{value:.0f}" if abs(value) >= 10**digits else f"{value:.{digits}g}"
        return f"{text} {symbol}".strip()
    magnitude = abs(value)
    for factor, prefix in _ENG_PREFIXES:  # noqa: B007 - prefix is used after the loop
        if magnitude >= factor * 0.9995:
            break
    scaled = value / factor
    return f"{scaled:.{digits}g} {prefix}{symbol}".strip()
