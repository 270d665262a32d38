"""Exact samples of an interval's solution, its extremes, and the first zero of a signal.

An interval's state is z(t) = e^{F t} z₀. Samples at t = k·h are exact powers of one step's
exponential e^{F h}. Between two samples, z(t_k + τ) = Σ (F τ)^j z_k / j!; with the step
chosen so that ‖A h‖ ≤ 0.25 (A the state block of F), the series of degree 12 is exact to
rounding, so turning points and zero crossings inside a step are found with Brent's method
on a polynomial, without another matrix exponential.
"""

from __future__ import annotations

import math

import numpy as np
from scipy.linalg import expm
from scipy.optimize import brentq

MIN_STEPS = 24
_MAX_STEP_NORM = 0.25
_TAYLOR_DEGREE = 12


def step_count(system: np.ndarray, duration_s: float) -> int:
    """Return how many equal steps keep ‖A h‖₁ ≤ 0.25 over ``duration_s`` (at least 24)."""
    norm = float(np.abs(system[:-1, :-1]).sum(axis=0).max())
    return max(MIN_STEPS, math.ceil(norm * duration_s / _MAX_STEP_NORM))


def sample_segment(
    system: np.ndarray, z_start: np.ndarray, step_s: float, steps: int
) -> np.ndarray:
    """Return z at 0, h, …, steps·h (shape (steps + 1, 3)), exact by repeated e^{F h}."""
    exp = expm(system * step_s)
    states = np.empty((steps + 1, z_start.size))
    states[0] = z_start
    for k in range(steps):
        states[k + 1] = exp @ states[k]
    return states


def _series(system: np.ndarray, z_sample: np.ndarray, row: np.ndarray) -> np.ndarray:
    """Return the Taylor coefficients of row · z(t_k + τ) in τ, highest power first."""
    term, values = z_sample, [float(row @ z_sample)]
    for j in range(1, _TAYLOR_DEGREE + 1):
        term = system @ term / j
        values.append(float(row @ term))
    return np.array(values[::-1])


def _polynomial(t: float, coefficients: np.ndarray) -> float:
    return float(np.polyval(coefficients, t))


def _turning_value(system, z_sample, row, step_s: float) -> float:
    """Return row · z at its turning point inside a step whose end slopes differ in sign."""
    values = _series(system, z_sample, row)
    slopes = np.polyder(values)
    t_peak = brentq(lambda t: float(np.polyval(slopes, t)), 0.0, step_s, xtol=step_s * 1e-12)
    return float(np.polyval(values, t_peak))


def segment_extremes(
    system: np.ndarray, z_start: np.ndarray, duration_s: float, rows: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """Return the (min, max) of each row · z over one interval, interior extremes refined."""
    steps = step_count(system, duration_s)
    step = duration_s / steps
    states = sample_segment(system, z_start, step, steps)
    values = states @ rows.T
    slopes = states @ (rows @ system).T
    low, high = values.min(axis=0), values.max(axis=0)
    for column, row in enumerate(rows):
        turning = np.nonzero(slopes[:-1, column] * slopes[1:, column] < 0.0)[0]
        for k in turning:
            value = _turning_value(system, states[k], row, step)
            low[column], high[column] = min(low[column], value), max(high[column], value)
    return low, high


def first_fall_below_zero(
    system: np.ndarray, z_start: np.ndarray, duration_s: float, row: np.ndarray
) -> float | None:
    """Return the first instant at which row · z falls to zero inside the interval, or None.

    The signal starts positive. The first sample step whose end is not positive, or whose
    interior dip reaches zero, holds the crossing, which is then found on the step's series.
    """
    steps = step_count(system, duration_s)
    step = duration_s / steps
    states = sample_segment(system, z_start, step, steps)
    values = states @ row
    slopes = states @ (row @ system)
    for k in range(steps):
        dips = slopes[k] < 0.0 < slopes[k + 1]
        if values[k + 1] > 0.0 and not dips:
            continue
        series = _series(system, states[k], row)
        end_t = step
        if values[k + 1] > 0.0:  # a dip inside the step: does its bottom reach zero?
            slope = np.polyder(series)
            end_t = brentq(_polynomial, 0.0, step, args=(slope,), xtol=step * 1e-12)
            if np.polyval(series, end_t) > 0.0:
                continue
        crossing = brentq(_polynomial, 0.0, end_t, args=(series,), xtol=step * 1e-12, rtol=1e-14)
        return k * step + crossing
    return None
