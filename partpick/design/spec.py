"""The converter spec: what the design must meet, read from TOML and/or the command line.

A :class:`Spec` is a frozen dataclass of SI floats that validates itself on construction, so
no code downstream ever sees an impossible spec. :func:`load_spec` reads the flat TOML file of
issue 3 and merges command-line overrides on top; every number may be an SI float or a text
with a unit and prefix (``"400 kHz"``, ``"120 mV"``), parsed by :mod:`partpick.units`.

Example spec file::

    name = "field logger 24 V rail"
    vin_min = "6.0 V"
    vin_max = "8.4 V"
    vout = "24 V"
    iout = "0.8 A"
    fsw = "400 kHz"
    vout_ripple = "120 mV"
    ripple_ratio = [0.2, 0.4]
    ambient_max = 60
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import asdict, dataclass, replace
from pathlib import Path
from typing import NamedTuple

from partpick.errors import SpecError, UnitError
from partpick.textfiles import TextFileError, read_toml
from partpick.units import parse_quantity

REQUIRED = object()
"""Marker default of a key that has none: the spec must give it."""


class SpecKey(NamedTuple):
    """One key of the spec file: where it goes, its unit, its default and its help text.

    ``attribute`` is the :class:`Spec` field; ``ripple_ratio`` fills two fields and names them
    as a pair. ``unit`` is a :mod:`partpick.units` dimension key, or None for text.
    """

    attribute: str | tuple[str, str]
    unit: str | None
    default: object
    help: str


SPEC_KEYS: dict[str, SpecKey] = {
    "topology": SpecKey("topology", None, "boost", "converter topology"),
    "vin_min": SpecKey("vin_min_v", "V", REQUIRED, "lowest input voltage"),
    "vin_max": SpecKey("vin_max_v", "V", REQUIRED, "highest input voltage"),
    "vout": SpecKey("vout_v", "V", REQUIRED, "output voltage"),
    "iout": SpecKey("iout_a", "A", REQUIRED, "full-load output current"),
    "fsw": SpecKey("fsw_hz", "Hz", REQUIRED, "switching frequency"),
    "vout_ripple": SpecKey("vout_ripple_v", "V", REQUIRED, "output ripple limit, peak-to-peak"),
    "efficiency": SpecKey("efficiency", "fraction", 0.85, "efficiency estimate for the duty"),
    "ripple_ratio": SpecKey(
        ("ripple_ratio_lo", "ripple_ratio_hi"),
        "fraction",
        (0.2, 0.4),
        "allowed inductor ripple band lo,hi (ripple / IL at vin_min)",
    ),
    "vin_ripple": SpecKey("vin_ripple_v", "V", None, "input ripple limit, peak-to-peak"),
    "ambient_max": SpecKey("ambient_max_degc", "degC", 50.0, "highest ambient temperature"),
    "iout_min": SpecKey("iout_min_a", "A", None, "lightest load, for the DCM check"),
    "gate_drive_a": SpecKey("gate_drive_a", "A", 1.0, "gate driver current"),
    "gate_drive_v": SpecKey(
        "gate_drive_v", "V", 10.0, "gate drive voltage, for the Qg·V·fsw gate-drive loss"
    ),
    "quiescent_w": SpecKey(
        "quiescent_w", "W", 0.0, "fixed controller loss (quiescent and housekeeping)"
    ),
    "currency": SpecKey(
        "currency", None, "", "currency of the catalog prices, shown in the BOM (e.g. EUR)"
    ),
    "inductor_tolerance": SpecKey(
        "inductor_tolerance",
        "fraction",
        0.2,
        "inductance tolerance (±) for the recommended L and its stresses",
    ),
    "diode_vf": SpecKey(
        "diode_vf_v", "V", 0.7, "diode forward drop the switch sees on top of Vout (stress)"
    ),
    "name": SpecKey("name", None, "", "name of the design"),
    "notes": SpecKey("notes", None, "", "free text"),
}

# Temperatures in °C have no natural zero, so ambient_max is bounded rather than positive.
_AMBIENT_RANGE_DEGC = (-60.0, 200.0)
_POSITIVE_FIELDS = (
    ("vin_min", "vin_min_v"),
    ("vin_max", "vin_max_v"),
    ("vout", "vout_v"),
    ("iout", "iout_a"),
    ("fsw", "fsw_hz"),
    ("vout_ripple", "vout_ripple_v"),
    ("gate_drive_a", "gate_drive_a"),
    ("gate_drive_v", "gate_drive_v"),
)
_OPTIONAL_POSITIVE_FIELDS = (("vin_ripple", "vin_ripple_v"), ("iout_min", "iout_min_a"))


@dataclass(frozen=True)
class Spec:
    """A DC-DC converter spec in SI units (V, A, Hz, °C); validated on construction."""

    vin_min_v: float
    vin_max_v: float
    vout_v: float
    iout_a: float
    fsw_hz: float
    vout_ripple_v: float
    efficiency: float = 0.85
    ripple_ratio_lo: float = 0.2
    ripple_ratio_hi: float = 0.4
    vin_ripple_v: float | None = None
    ambient_max_degc: float = 50.0
    iout_min_a: float | None = None
    gate_drive_a: float = 1.0
    # 10 V: the usual gate drive of a standard-level MOSFET (common practice, no published
    # source); 0 W: no controller loss unless the spec states one
    gate_drive_v: float = 10.0
    quiescent_w: float = 0.0
    # Not a spec key: the loss the rest of the stage dissipates in the switch at turn-on (the
    # chosen diode's recovered charge and junction capacitance), set by the BOM once the
    # diode is chosen, so the switch's thermal check includes it.
    switch_extra_loss_w: float = 0.0
    inductor_tolerance: float = 0.2  # ±20 %: common practice, no published source
    diode_vf_v: float = 0.7  # a conservative silicon drop: common practice, no published source
    topology: str = "boost"
    currency: str = ""
    name: str = ""
    notes: str = ""
    source: str | None = None

    def __post_init__(self) -> None:
        self._coerce_numbers()
        for key, attribute in _POSITIVE_FIELDS:
            self._require_positive(key, getattr(self, attribute))
        for key, attribute in _OPTIONAL_POSITIVE_FIELDS:
            if getattr(self, attribute) is not None:
                self._require_positive(key, getattr(self, attribute))
        self._check_relations()
        object.__setattr__(self, "topology", self.topology.strip().lower())
        # Imported here because topologies import this module.
        from partpick.design.topologies import get_topology

        get_topology(self.topology, source=self.source).validate(self)

    def with_efficiency(self, efficiency: float) -> Spec:
        """Return a copy of this spec with another efficiency estimate (validated)."""
        return replace(self, efficiency=efficiency)

    def to_dict(self) -> dict[str, object]:
        """Return the spec as a plain dict of its fields (SI units), for JSON output."""
        return asdict(self)

    def _fail(self, key: str, reason: str, value: object = None) -> None:
        raise SpecError(key=key, reason=reason, value=value, file=self.source)

    def _coerce_numbers(self) -> None:
        for key, entry in SPEC_KEYS.items():
            names = entry.attribute if isinstance(entry.attribute, tuple) else (entry.attribute,)
            for name in names:
                value = getattr(self, name)
                if entry.unit is None:
                    if not isinstance(value, str):
                        self._fail(key, "must be text", value)
                    continue
                if value is None and entry.default is None:
                    continue
                if isinstance(value, bool) or not isinstance(value, (int, float)):
                    self._fail(key, "must be a number", value)
                if not math.isfinite(value):
                    self._fail(key, "must be a finite number", value)
                object.__setattr__(self, name, float(value))

    def _require_positive(self, key: str, value: float) -> None:
        if value <= 0:
            self._fail(key, "must be positive", value)

    def _check_relations(self) -> None:
        if self.vin_min_v > self.vin_max_v:
            self._fail(
                "vin_min", f"is above vin_max ({self.vin_max_v:g} V); swap them", self.vin_min_v
            )
        if not 0 < self.efficiency <= 1:
            self._fail("efficiency", "must be in (0, 1], e.g. 0.85 or '85 %'", self.efficiency)
        lo, hi = self.ripple_ratio_lo, self.ripple_ratio_hi
        if not (0 < lo < 2 and 0 < hi < 2):
            self._fail("ripple_ratio", "both ends must be inside (0, 2)", [lo, hi])
        if lo >= hi:
            self._fail("ripple_ratio", "lo must be below hi, as [lo, hi]", [lo, hi])
        if self.vout_ripple_v >= self.vout_v:
            self._fail("vout_ripple", "must be well below vout", self.vout_ripple_v)
        if self.vin_ripple_v is not None and self.vin_ripple_v >= self.vin_min_v:
            self._fail("vin_ripple", "must be well below vin_min", self.vin_ripple_v)
        if self.iout_min_a is not None and self.iout_min_a > self.iout_a:
            self._fail("iout_min", f"is above iout ({self.iout_a:g} A)", self.iout_min_a)
        if self.quiescent_w < 0:
            self._fail("quiescent_w", "cannot be negative", self.quiescent_w)
        if not (math.isfinite(self.switch_extra_loss_w) and self.switch_extra_loss_w >= 0):
            raise ValueError(f"switch_extra_loss_w must be ≥ 0 W, got {self.switch_extra_loss_w!r}")
        if not 0 <= self.inductor_tolerance < 1:
            self._fail(
                "inductor_tolerance", "must be in [0, 1), e.g. 0.2 or '20 %'",
                self.inductor_tolerance,
            )  # fmt: skip
        if not 0 <= self.diode_vf_v < self.vout_v:
            self._fail("diode_vf", "must be zero or positive and below vout", self.diode_vf_v)
        low, high = _AMBIENT_RANGE_DEGC
        if not low <= self.ambient_max_degc <= high:
            self._fail(
                "ambient_max", f"must be between {low:g} and {high:g} °C", self.ambient_max_degc
            )


def load_spec(path: str | Path | None, overrides: Mapping[str, object] | None = None) -> Spec:
    """Return the validated spec of a TOML file, with ``overrides`` (TOML keys) winning.

    ``path`` may be None for a spec given entirely as overrides. Override keys may use ``-``
    for ``_``; an override of None means "not given" and is skipped. Raises
    :class:`~partpick.errors.SpecError` naming the key at fault.
    """
    source = str(path) if path is not None else None
    raw: dict[str, object] = _read_toml(Path(path)) if path is not None else {}
    for key, value in (overrides or {}).items():
        if value is not None:
            raw[key.replace("-", "_")] = value
    _reject_unknown(raw, source)
    fields: dict[str, object] = {"source": source}
    for key, entry in SPEC_KEYS.items():
        fields.update(_field_values(key, entry, raw.get(key, entry.default), source))
    return Spec(**fields)  # type: ignore[arg-type]


def _read_toml(path: Path) -> dict[str, object]:
    try:
        return read_toml(path)
    except TextFileError as exc:
        reason = "no such spec file" if exc.reason == "file not found" else exc.reason
        raise SpecError(key="(file)", reason=reason, file=str(path)) from None


def _reject_unknown(raw: Mapping[str, object], source: str | None) -> None:
    for key in raw:
        if key not in SPEC_KEYS:
            known = ", ".join(SPEC_KEYS)
            raise SpecError(key=key, reason=f"unknown key; the keys are: {known}", file=source)


def _field_values(key: str, entry: SpecKey, value: object, source: str | None) -> dict[str, object]:
    if value is REQUIRED:
        option = "--" + key.replace("_", "-")
        raise SpecError(
            key=key, reason=f"missing; give it in the spec file or as {option}", file=source
        )
    if isinstance(entry.attribute, tuple):
        lo, hi = _parse_pair(key, value, source)
        return {entry.attribute[0]: lo, entry.attribute[1]: hi}
    if entry.unit is None:
        if not isinstance(value, str):
            raise SpecError(key=key, reason="must be text", value=value, file=source)
        return {entry.attribute: value}
    if value is None:
        return {entry.attribute: None}
    return {entry.attribute: _parse_number(key, value, entry.unit, source)}


_BARE_NUMBER_RE = re.compile(r"^\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*$")
_PAIR_SPLIT_RE = re.compile(r"\s*(?:,|;|\.\.)\s*")


def _parse_number(key: str, value: object, unit: str, source: str | None) -> float:
    """Return one spec number in SI; bare numeric text counts as SI too."""
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise SpecError(
            key=key, reason="must be a number or a text with a unit", value=value, file=source
        )
    if isinstance(value, (int, float)) and not math.isfinite(value):
        raise SpecError(key=key, reason="must be a finite number", value=value, file=source)
    if isinstance(value, str) and _BARE_NUMBER_RE.match(value):
        return float(value)
    try:
        number = parse_quantity(value, unit)
    except UnitError as exc:
        raise SpecError(key=key, reason=exc.reason, value=value, file=source) from None
    if math.isnan(number):
        raise SpecError(key=key, reason="has no value", value=value, file=source)
    return number


def _parse_pair(key: str, value: object, source: str | None) -> tuple[float, float]:
    """Return ``[lo, hi]`` from a TOML array, a tuple, or text like ``"0.2,0.4"``."""
    items = _PAIR_SPLIT_RE.split(value.strip()) if isinstance(value, str) else value
    if not isinstance(items, (list, tuple)) or len(items) != 2:
        raise SpecError(
            key=key,
            reason="must be two numbers [lo, hi], e.g. [0.2, 0.4]",
            value=value,
            file=source,
        )
    lo, hi = (_parse_number(key, item, "fraction", source) for item in items)
    return lo, hi
