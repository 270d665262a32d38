"""Plausibility ranges: the values a real part or a real boost design can have.

A value far outside them is almost always a unit slip ("400 mHz" typed for 400 kHz gave a
13 F output capacitor; "1 MH" for 1 mH) and silently ruins every result after it. Outside
a range, a catalog value is a row reject and a spec value a spec error, each naming the
range; ``--allow-unusual`` accepts them with a warning instead.

The bounds are generous on purpose (they catch slips of several decades, not unusual
parts); they are engineering judgement, so each is marked common practice.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from partpick.units import format_eng

# common practice, no published source: every bound below (SI units) is a judgement that
# no power part or boost design of the kind partpick screens falls outside it.
FIELD_RANGES: dict[str, tuple[float, float]] = {
    "inductance_h": (1e-9, 1.0),
    "isat_a": (1e-3, 1e4),
    "irms_a": (1e-3, 1e4),
    "dcr_ohm": (1e-6, 1e3),
    "srf_hz": (1e3, 1e11),
    "capacitance_f": (1e-13, 100.0),
    "capacitance_at_bias_f": (1e-13, 100.0),
    "voltage_v": (0.1, 1e5),
    "bias_v": (0.0, 1e5),
    "esr_ohm": (1e-6, 1e4),
    "ripple_a": (1e-6, 1e4),
    "vrrm_v": (0.1, 1e5),
    "if_avg_a": (1e-4, 1e4),
    "ifsm_a": (1e-4, 1e5),
    "vf_v": (0.01, 10.0),
    "trr_s": (0.0, 1e-3),
    "qrr_c": (0.0, 1e-3),
    "cj_f": (0.0, 1e-6),
    "ir_a": (0.0, 1.0),
    "vds_v": (0.1, 1e5),
    "id_a": (1e-4, 1e4),
    "rds_on_ohm": (1e-6, 1e4),
    "vgs_th_v": (0.0, 50.0),
    "qg_c": (0.0, 1e-5),
    "qgd_c": (0.0, 1e-5),
    "coss_f": (0.0, 1e-6),
    "coss_er_f": (0.0, 1e-6),
    "tj_max_degc": (-60.0, 400.0),
    "temp_max_degc": (-60.0, 400.0),
    "ir_tj_degc": (-60.0, 400.0),
    "theta_ja_degc_w": (0.01, 1e4),
    "unit_price": (0.0, 1e6),
    "length_mm": (0.1, 1e3),
    "width_mm": (0.1, 1e3),
    "height_mm": (0.05, 1e3),
}

# common practice, no published source; fsw 1 kHz-100 MHz as the issue sets it.
SPEC_RANGES: dict[str, tuple[float, float, str]] = {
    "vin_min": (0.1, 2000.0, "V"),
    "vin_max": (0.1, 2000.0, "V"),
    "vout": (0.1, 2000.0, "V"),
    "iout": (1e-6, 1000.0, "A"),
    "fsw": (1e3, 1e8, "Hz"),
    "vout_ripple": (1e-6, 100.0, "V"),
    "vin_ripple": (1e-6, 100.0, "V"),
    "iout_min": (1e-9, 1000.0, "A"),
    "efficiency": (0.1, 1.0, "fraction"),
    "ripple_ratio_lo": (0.01, 1.99, "fraction"),
    "ripple_ratio_hi": (0.01, 1.99, "fraction"),
    "gate_drive_a": (1e-3, 100.0, "A"),
}


@dataclass(frozen=True)
class Unusual:
    """One value outside its plausibility range."""

    name: str  # field or spec key
    value: float
    low: float
    high: float
    unit: str

    def range_text(self) -> str:
        """Return the range as engineering text, e.g. ``"1 nH – 1 H"``."""
        return f"{format_eng(self.low, self.unit)} – {format_eng(self.high, self.unit)}"

    def sentence(self) -> str:
        """Return what is wrong, e.g. "1e+30 H is outside the plausible range 1 nH – 1 H"."""
        shown = format_eng(self.value, self.unit)
        return f"{shown} is outside the plausible range {self.range_text()}"


def outside_field_range(name: str, values: np.ndarray) -> np.ndarray:
    """Return a mask of the finite ``values`` of field ``name`` outside its range."""
    bounds = FIELD_RANGES.get(name)
    if bounds is None or values.dtype.kind != "f":
        return np.zeros(len(values), dtype=bool)
    with np.errstate(invalid="ignore"):
        return np.isfinite(values) & ((values < bounds[0]) | (values > bounds[1]))


def unusual_field_value(name: str, value: float, unit: str) -> Unusual:
    """Return the :class:`Unusual` of one out-of-range catalog value."""
    low, high = FIELD_RANGES[name]
    return Unusual(name, value, low, high, unit)


def unusual_spec_values(values: Mapping[str, float | None]) -> list[Unusual]:
    """Return the spec values (keys of :data:`SPEC_RANGES`) outside their ranges."""
    found = []
    for key, (low, high, unit) in SPEC_RANGES.items():
        value = values.get(key)
        if value is None or not math.isfinite(value):
            continue
        if not low <= value <= high:
            found.append(Unusual(key, float(value), low, high, unit))
    return found
