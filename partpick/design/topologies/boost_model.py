"""The boost model over the input range: operating grid, inductance window, worst stresses.

Every stress is the maximum over a dense Vin grid that holds both ends, the worst ripple point
Vin* = Vout/(2η) and the K_crit peak at D = 1/3 (each clamped into the range). The maxima are
exact on that grid for any number of inductances, found with the line-envelope method of
:mod:`partpick.design.linemax`: each stress (or its square) is p(Vin) + q(Vin)·u with
u = 1/L (or 1/L²), so the peak current is handled properly where its maximum is not at
vin_min (large ripple), without a parts × grid array.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from partpick.design.linemax import LineEnvelope
from partpick.design.spec import Spec
from partpick.design.topologies.boost_equations import (
    boost_duty_cycle,
    diode_rms_current_a,
    inductance_window_h,
    inductor_average_current_a,
    inductor_peak_current_a,
    inductor_ripple_current_a,
    inductor_rms_current_a,
    input_capacitor_rms_current_a,
    output_capacitor_rms_current_a,
    switch_rms_current_a,
    worst_ripple_input_voltage_v,
)

GRID_POINTS = 1025
"""Evenly spaced input voltages of the grid (plus the analytic points)."""


@dataclass(frozen=True)
class OperatingGrid:
    """The operating points of a spec over its input range (arrays over Vin, SI units)."""

    vin_v: np.ndarray
    duty: np.ndarray
    il_avg_a: np.ndarray

    def ripple_a(self, spec: Spec, inductance_h: float) -> np.ndarray:
        """Return ΔIL over the grid at one inductance, in A."""
        return inductor_ripple_current_a(self.vin_v, self.duty, spec.fsw_hz, inductance_h)


def vin_grid_v(spec: Spec, points: int = GRID_POINTS) -> np.ndarray:
    """Return the input voltages to evaluate, in V: both ends, Vin*, Vout/(3η), evenly between."""
    even = np.linspace(spec.vin_min_v, spec.vin_max_v, points)
    vin_star = worst_ripple_input_voltage_v(
        spec.vin_min_v, spec.vin_max_v, spec.vout_v, spec.efficiency
    )
    # D = 1/3 (K_crit's maximum) falls at Vin = 2·Vout/(3η).
    kcrit_peak = np.clip(2 * spec.vout_v / (3 * spec.efficiency), spec.vin_min_v, spec.vin_max_v)
    return np.unique(np.concatenate([even, [vin_star, kcrit_peak]]))


def operating_grid(spec: Spec) -> OperatingGrid:
    """Return duty and average inductor current over the input grid of ``spec``."""
    vin = vin_grid_v(spec)
    duty = boost_duty_cycle(vin, spec.vout_v, spec.efficiency)
    return OperatingGrid(vin, duty, inductor_average_current_a(spec.iout_a, duty))


def inductance_limits_h(spec: Spec) -> tuple[float, float, float]:
    """Return (l_min, l_max, Vin*) in H, H, V: the inductance window of the ripple band."""
    vin_star = float(
        worst_ripple_input_voltage_v(spec.vin_min_v, spec.vin_max_v, spec.vout_v, spec.efficiency)
    )
    duty_star = boost_duty_cycle(vin_star, spec.vout_v, spec.efficiency)
    duty_max = boost_duty_cycle(spec.vin_min_v, spec.vout_v, spec.efficiency)
    il_at_vin_min = inductor_average_current_a(spec.iout_a, duty_max)
    limits = [
        float(inductance_window_h(vin_star, duty_star, spec.fsw_hz, ratio, il_at_vin_min))
        for ratio in (spec.ripple_ratio_hi, spec.ripple_ratio_lo)
    ]
    return limits[0], limits[1], vin_star


# Each stress as f(grid, ripple, spec) and the power of 1/L it is linear in (1: value, 2: square).
_StressFunction = Callable[[OperatingGrid, np.ndarray, Spec], np.ndarray]
_STRESSES: dict[str, tuple[_StressFunction, int]] = {
    "il_peak": (lambda g, r, s: inductor_peak_current_a(g.il_avg_a, r), 1),
    "il_ripple": (lambda g, r, s: r, 1),
    "il_rms": (lambda g, r, s: inductor_rms_current_a(g.il_avg_a, r), 2),
    "isw_rms": (lambda g, r, s: switch_rms_current_a(g.duty, g.il_avg_a, r), 2),
    "id_rms": (lambda g, r, s: diode_rms_current_a(g.duty, g.il_avg_a, r), 2),
    "icout_rms": (
        lambda g, r, s: output_capacitor_rms_current_a(g.duty, g.il_avg_a, r, s.iout_a),
        2,
    ),
    "icin_rms": (lambda g, r, s: input_capacitor_rms_current_a(r), 1),
}


@lru_cache(maxsize=32)
def _stress_envelopes(spec: Spec) -> dict[str, tuple[LineEnvelope, int]]:
    """Return, per stress, the upper envelope over Vin of its lines in 1/L (or 1/L²)."""
    grid = operating_grid(spec)
    l_ref = inductance_limits_h(spec)[0]  # ripple of order IL keeps the subtraction exact
    ripple_ref = grid.ripple_a(spec, l_ref)
    zero = np.zeros_like(grid.vin_v)
    envelopes = {}
    for name, (stress, power) in _STRESSES.items():
        at_zero = stress(grid, zero, spec) ** power
        slope = (stress(grid, ripple_ref, spec) ** power - at_zero) * l_ref**power
        envelopes[name] = (LineEnvelope.build(at_zero, slope, grid.vin_v), power)
    return envelopes


def worst_stresses(
    spec: Spec, inductance_h: np.ndarray
) -> dict[str, tuple[np.ndarray, np.ndarray]]:
    """Return {stress: (max over Vin, Vin where worst)} at each inductance, SI units.

    Stress names: il_peak, il_ripple, il_rms, isw_rms, id_rms, icout_rms, icin_rms (all A).
    Non-positive or missing inductances give NaN.
    """
    inductance = np.asarray(inductance_h, dtype=float)
    # Catalogs repeat a few hundred standard values, so work once per distinct inductance.
    distinct, back = np.unique(inductance.ravel(), return_inverse=True)
    valid = np.isfinite(distinct) & (distinct > 0)
    inverse = np.where(valid, 1.0 / np.where(valid, distinct, 1.0), 0.0)
    results = {}
    for name, (envelope, power) in _stress_envelopes(spec).items():
        value, vin = envelope.evaluate(inverse**power)
        value = np.sqrt(value) if power == 2 else value
        value, vin = np.where(valid, value, np.nan), np.where(valid, vin, np.nan)
        results[name] = (value[back].reshape(inductance.shape), vin[back].reshape(inductance.shape))
    return results


clear_cache = _stress_envelopes.cache_clear
