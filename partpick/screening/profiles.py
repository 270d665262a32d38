"""Derating profiles: how much of each rating a part may use.

A profile is a TOML file. Two are built in (``standard`` and ``high-rel``, in
``partpick/screening/profiles/``); a company file may say ``extends = "standard"`` and
override single values. Every figure is kept in :attr:`Profile.figures` under its dotted key
(``"inductor.saturation_use"``), so a renderer can show the whole policy a part was checked
against, and the rule modules read them through the typed sections.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from types import MappingProxyType

from partpick.errors import ProfileError
from partpick.textfiles import TextFileError, read_toml

BUILTIN_DIR = Path(__file__).with_name("profiles")
BUILTINS: tuple[str, ...] = ("standard", "high-rel")

DIELECTRICS: tuple[str, ...] = (
    "c0g",
    "x5r",
    "x7r",
    "x7s",
    "x6s",
    "x8r",
    "y5v",
    "al-electrolytic",
    "al-polymer",
    "ta-mno2",
    "ta-polymer",
    "film",
)

# dotted key -> (dimension key, kind of value). "use" values are fractions in (0, 1].
SCHEMA: dict[str, tuple[str, str]] = {
    "max_parallel": ("count", "count"),
    "inductor.saturation_use": ("fraction", "use"),
    "inductor.rms_use": ("fraction", "use"),
    "inductor.tolerance_default": ("fraction", "tolerance"),
    "inductor.srf_min_over_fsw": ("count", "positive"),
    "capacitor.tolerance_default": ("fraction", "tolerance"),
    "capacitor.ripple_current_use": ("fraction", "use"),
    "capacitor.voltage_use_unknown": ("fraction", "use"),
    "capacitor.kept_fraction_unknown": ("fraction", "use"),
    "capacitor.temp_margin_degc": ("degC", "margin"),
    **{f"capacitor.voltage_use.{d}": ("fraction", "use") for d in DIELECTRICS},
    **{f"capacitor.kept_fraction.{d}": ("fraction", "use") for d in DIELECTRICS},
    "diode.reverse_voltage_use": ("fraction", "use"),
    "diode.forward_current_use": ("fraction", "use"),
    "diode.thermal_margin_degc": ("degC", "margin"),
    "diode.tj_ceiling_degc": ("degC", "ceiling"),
    "diode.standard_recovery_max_hz": ("Hz", "positive"),
    "switch.drain_voltage_use": ("fraction", "use"),
    "switch.drain_current_use": ("fraction", "use"),
    "switch.thermal_margin_degc": ("degC", "margin"),
    "switch.tj_ceiling_degc": ("degC", "ceiling"),
    "switch.hot_factor": ("count", "factor"),
    "switch.assume_n_channel": ("flag", "flag"),
}
# keys a complete profile may leave out: a dielectric not listed keeps all its capacitance
_OPTIONAL_PREFIXES = ("capacitor.kept_fraction.",)

# DC-bias tables: ``capacitor.dc_bias.<dielectric or "unknown">.<percent of rated voltage>``
# -> kept fraction. A table replaces the inherited table of its dielectric as a whole.
DC_BIAS_PREFIX = "capacitor.dc_bias."
DC_BIAS_CODES: tuple[str, ...] = (*DIELECTRICS, "unknown")


@dataclass(frozen=True)
class Profile:
    """A complete derating policy. ``figures`` maps each dotted key to its SI value."""

    name: str
    description: str
    file: str
    extends: str | None
    figures: Mapping[str, float]

    def __post_init__(self) -> None:
        object.__setattr__(self, "figures", MappingProxyType(dict(self.figures)))

    def value(self, key: str) -> float:
        """Return the figure ``key`` (dotted), raising ProfileError if the profile lacks it."""
        try:
            return self.figures[key]
        except KeyError:
            raise ProfileError(self.name, "has no such figure", key) from None

    def unit_of(self, key: str) -> str:
        """Return the dimension key of the figure ``key``."""
        if key.startswith(DC_BIAS_PREFIX):
            return "fraction"
        return SCHEMA[key][0]

    @property
    def max_parallel(self) -> int:
        return int(self.figures["max_parallel"])

    def voltage_use(self, dielectric: str | None) -> float:
        """Return the capacitor voltage use for ``dielectric`` (None: the 'unknown' figure)."""
        if dielectric is None:
            return self.figures["capacitor.voltage_use_unknown"]
        return self.figures[f"capacitor.voltage_use.{dielectric}"]

    def kept_fraction(self, dielectric: str | None) -> float:
        """Return the further share kept for ``dielectric`` (ageing; DC bias is separate)."""
        if dielectric is None:
            return self.figures["capacitor.kept_fraction_unknown"]
        return self.figures.get(f"capacitor.kept_fraction.{dielectric}", 1.0)

    def dc_bias_table(self, dielectric: str | None) -> tuple[tuple[float, ...], tuple[float, ...]]:
        """Return (working voltage / rated voltage, kept fraction) points for ``dielectric``.

        None takes the ``unknown`` table; a dielectric without a table gives no points
        (it keeps its capacitance under DC bias). The points are sorted by voltage.
        """
        code = "unknown" if dielectric is None else dielectric
        return dc_bias_points(self.figures, code)

    def section(self, prefix: str) -> dict[str, float]:
        """Return the figures under ``prefix`` (e.g. ``"diode"``), keyed without the prefix."""
        start = prefix + "."
        return {k[len(start) :]: v for k, v in self.figures.items() if k.startswith(start)}


def dc_bias_points(
    figures: Mapping[str, float], code: str
) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """Return the sorted (fraction of rating, kept fraction) points of ``code``'s table."""
    head = f"{DC_BIAS_PREFIX}{code}."
    points = sorted(
        (int(key[len(head) :]) / 100.0, value)
        for key, value in figures.items()
        if key.startswith(head)
    )
    return tuple(p[0] for p in points), tuple(p[1] for p in points)


def load_profile(name_or_file: str = "standard") -> Profile:
    """Return the built-in profile ``name_or_file`` or the profile in that TOML file.

    A file may say ``extends = "standard"`` (or ``"high-rel"``, or a path relative to
    itself) and give only the figures it changes. Raises ProfileError naming the file and the
    key for an unknown profile, an unknown key, a value of the wrong kind or a missing figure.
    """
    raw, label, extends = _load_chain(name_or_file, seen=())
    name = _text(raw.pop("name", Path(label).stem), "name", label)
    description = _text(raw.pop("description", ""), "description", label)
    raw.pop("extends", None)
    figures = _flatten(raw, label)
    _check_complete(figures, label)
    _check_dc_bias(figures, label)
    return Profile(name, description, label, extends, figures)


def _text(value: object, key: str, label: str) -> str:
    if not isinstance(value, str):
        raise ProfileError(label, f"must be text (got {value!r})", key)
    return value


def _resolve(name_or_file: str, relative_to: Path | None) -> Path:
    if name_or_file in BUILTINS:
        return BUILTIN_DIR / f"{name_or_file}.toml"
    path = Path(name_or_file)
    if relative_to is not None and not path.is_absolute():
        path = relative_to.parent / path
    if not path.is_file():
        hint = f"built-in profiles are {', '.join(BUILTINS)}, or give a TOML file"
        raise ProfileError(name_or_file, f"not found; {hint}")
    return path


def _read_toml(path: Path, label: str) -> dict:
    try:
        return read_toml(path)
    except TextFileError as exc:
        raise ProfileError(label, exc.reason) from None


def _load_chain(
    name_or_file: str, seen: tuple[str, ...], relative_to: Path | None = None
) -> tuple[dict, str, str | None]:
    """Return (merged raw table, label of the outermost file, its extends value)."""
    path = _resolve(name_or_file, relative_to)
    label = name_or_file if name_or_file in BUILTINS else str(path)
    if str(path.resolve()) in seen:
        raise ProfileError(label, "extends itself through a loop", "extends")
    data = _read_toml(path, label)
    extends = data.get("extends")
    if extends is None:
        return data, label, None
    if not isinstance(extends, str):
        raise ProfileError(label, "must name a profile or a file", "extends")
    base, _, _ = _load_chain(extends, seen + (str(path.resolve()),), path)
    base.pop("name", None)
    base.pop("description", None)
    return _merge(base, data), label, extends


def _merge(base: dict, override: dict, path: str = "") -> dict:
    merged = dict(base)
    for key, value in override.items():
        dotted = f"{path}{key}"
        whole = f"{dotted}.".startswith(DC_BIAS_PREFIX) and dotted != DC_BIAS_PREFIX[:-1]
        if isinstance(value, dict) and isinstance(merged.get(key), dict) and not whole:
            merged[key] = _merge(merged[key], value, dotted + ".")
        else:
            merged[key] = value
    return merged


def _flatten(raw: Mapping[str, object], label: str, prefix: str = "") -> dict[str, float]:
    figures: dict[str, float] = {}
    for key, value in raw.items():
        dotted = f"{prefix}{key}"
        if isinstance(value, dict):
            figures.update(_flatten(value, label, dotted + "."))
            continue
        if dotted.startswith(DC_BIAS_PREFIX):
            figures[dotted] = _check_dc_bias_point(value, dotted, label)
            continue
        if dotted not in SCHEMA:
            raise ProfileError(label, f"is not a profile figure; {valid_keys_hint(dotted)}", dotted)
        figures[dotted] = _check_value(value, dotted, label)
    return figures


def valid_keys_hint(key: str) -> str:
    """Return the valid keys near ``key``: a close spelling, then its section's keys."""
    import difflib

    close = difflib.get_close_matches(key, list(SCHEMA), n=1, cutoff=0.75)
    lead = f"did you mean {close[0]!r}? " if close else ""
    section = key.partition(".")[0]
    same = sorted(k for k in SCHEMA if k.startswith(f"{section}.") or k == section)
    if same:
        return f"{lead}valid keys in [{section}]: {', '.join(k.partition('.')[2] for k in same)}"
    sections = sorted({k.partition(".")[0] for k in SCHEMA if "." in k})
    top = sorted(k for k in SCHEMA if "." not in k)
    return f"{lead}valid sections: {', '.join(sections)}; valid top-level keys: {', '.join(top)}"


def _check_value(value: object, key: str, label: str) -> float:
    if SCHEMA[key][1] == "flag":
        if not isinstance(value, bool):
            raise ProfileError(label, f"must be true or false (got {value!r})", key)
        return float(value)
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ProfileError(label, f"must be a number (got {value!r})", key)
    number = float(value)
    kind = SCHEMA[key][1]
    bad = {
        "use": not 0.0 < number <= 1.0,
        "tolerance": not 0.0 <= number < 1.0,
        "count": not (number >= 1 and number.is_integer()),
        "margin": not 0.0 <= number < math.inf,
        "ceiling": math.isnan(number),
        "positive": not 0.0 < number < math.inf,
        "factor": not 1.0 <= number < math.inf,
    }[kind]
    if bad:
        raise ProfileError(label, f"{_EXPECTED[kind]} (got {value!r})", key)
    return number


def _check_dc_bias_point(value: object, key: str, label: str) -> float:
    """Check one DC-bias point: ``<dielectric>.<whole percent 0..100>`` = fraction in (0, 1]."""
    code, _, percent = key[len(DC_BIAS_PREFIX) :].partition(".")
    if code not in DC_BIAS_CODES:
        raise ProfileError(label, f"names no dielectric ({', '.join(DC_BIAS_CODES)})", key)
    if not (percent.isdigit() and 0 <= int(percent) <= 100):
        reason = "must be a whole percent of the rated voltage, 0 to 100"
        raise ProfileError(label, reason, key)
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ProfileError(label, f"must be a number (got {value!r})", key)
    if not 0.0 < float(value) <= 1.0:
        raise ProfileError(label, f"{_EXPECTED['use']} (got {value!r})", key)
    return float(value)


def _check_dc_bias(figures: Mapping[str, float], label: str) -> None:
    """Check each DC-bias table: it starts at 0 % and never rises with the voltage."""
    codes = {key[len(DC_BIAS_PREFIX) :].partition(".")[0] for key in figures}
    for code in sorted(c for c in codes if c in DC_BIAS_CODES):
        volts, kept = dc_bias_points(figures, code)
        key = f"{DC_BIAS_PREFIX}{code}"
        if not volts:
            continue
        if volts[0] != 0.0:
            raise ProfileError(label, "must start at 0 (% of the rated voltage)", key)
        if any(b > a for a, b in zip(kept, kept[1:], strict=False)):
            raise ProfileError(label, "must not rise as the voltage rises (DC bias)", key)


_EXPECTED = {
    "use": "must be a fraction in (0, 1]",
    "tolerance": "must be a fraction in [0, 1)",
    "count": "must be a whole number of at least 1",
    "margin": "must be zero or a positive number",
    "ceiling": "must be a temperature or inf",
    "positive": "must be a positive number",
    "factor": "must be a factor of at least 1",
}


def _check_complete(figures: Mapping[str, float], label: str) -> None:
    for key in SCHEMA:
        if key not in figures and not key.startswith(_OPTIONAL_PREFIXES):
            raise ProfileError(label, "is missing; extend a built-in profile to inherit it", key)
