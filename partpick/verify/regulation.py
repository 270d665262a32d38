"""Regulation: the duty at which the exact steady state's average output equals vout.

Brent's bracketed method on Vout(D) − vout. The bracket is grown from a first guess (the
smaller of the ideal CCM and DCM duties) in doubling steps; conduction losses give Vout(D) a
peak, so a falling Vout while stepping up means the target is out of reach, which is
reported rather than raised.

References
----------
.. [EM] R. W. Erickson and D. Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
   Springer, 2020: ch. 2 (M = 1/(1 − D)), ch. 3 (the peak of M with losses), ch. 5 (DCM).
"""

from __future__ import annotations

import math

from scipy.optimize import brentq, minimize_scalar

from partpick.verify.orbit import MODE_DCM, Circuit, Orbit, orbit

DUTY_MIN = 1e-4
DUTY_MAX = 0.99
_REGULATION_TOLERANCE = 1e-6


def _first_duty_guess(circuit: Circuit, vout_v: float) -> float:
    """Return a starting duty: the smaller of the ideal CCM and DCM duties for the ratio.

    CCM: M = 1/(1 − D) ([EM] ch. 2); DCM: M = (1 + √(1 + 4D²/K))/2 with K = 2L/(R·Ts), so
    D = √(K·M·(M − 1)) ([EM] ch. 5). The diode drop is added to the output. A start only: the
    solver brackets the true duty from here.
    """
    stage = circuit.stage
    ratio = (vout_v + stage.diode_vf_v) / circuit.vin_v
    if ratio <= 1.0:
        return DUTY_MIN
    k = 2.0 * stage.inductance_h * stage.fsw_hz / circuit.load_ohm
    guess = min(1.0 - 1.0 / ratio, math.sqrt(k * ratio * (ratio - 1.0)))
    return min(max(guess, DUTY_MIN), 0.95)


def regulated_orbit(circuit: Circuit, vout_v: float) -> tuple[Orbit, bool]:
    """Return (orbit, reached) with the duty whose average output equals ``vout_v`` (V).

    The duty is found with Brent's bracketed method. Where no duty in [DUTY_MIN, DUTY_MAX]
    reaches ``vout_v`` (the losses cap the boost ratio, or Vin is already above it), the
    orbit at the duty that comes closest is returned with ``reached`` False.
    """

    solved: dict[float, Orbit] = {}
    last_zero: list[tuple[float, float]] = []  # (duty, zero-current instant) of DCM orbits

    def error(duty: float) -> float:
        if duty not in solved:
            # the zero-current instant scales about with the duty (i₁ ∝ D), so scale the last
            hint = last_zero[-1][1] * duty / last_zero[-1][0] if last_zero else None
            solved[duty] = orbit(circuit, duty, hint)
            if solved[duty].mode == MODE_DCM:
                last_zero.append((duty, solved[duty].segments[1].duration_s))
        return solved[duty].vout_average_v() - vout_v

    bracket = _bracket_duty(error, _first_duty_guess(circuit, vout_v))
    if isinstance(bracket, float):
        error(bracket)
        return solved[bracket], False
    duty = brentq(error, *bracket, xtol=1e-13, rtol=1e-11)
    # a jump in Vout(D) can fool any bracketing method: claim regulation only when it holds
    return solved[duty], abs(error(duty)) <= _REGULATION_TOLERANCE * vout_v


def _bracket_duty(error, guess: float) -> tuple[float, float] | float:
    """Return a duty bracket around the root of ``error``, or the closest duty if none exists.

    Steps away from ``guess`` in doubling steps. Going up, a falling ``error`` means the peak
    of Vout(D) was passed (conduction losses cap the boost ratio); the peak is then found with
    a bounded scalar search and is either the upper end of the bracket or the closest duty.
    """
    previous, at_previous = guess, error(guess)
    direction = 1.0 if at_previous < 0.0 else -1.0
    older, step = guess, 0.01
    while True:
        duty = min(max(previous + direction * step, DUTY_MIN), DUTY_MAX)
        value = error(duty)
        if (value >= 0.0) != (at_previous >= 0.0):
            return (previous, duty) if previous < duty else (duty, previous)
        if direction > 0.0 and value < at_previous:
            return _bracket_at_peak(error, older, duty)
        if duty in (DUTY_MIN, DUTY_MAX):
            return duty
        older, previous, at_previous, step = previous, duty, value, step * 2.0


def _bracket_at_peak(error, low: float, high: float) -> tuple[float, float] | float:
    peak = minimize_scalar(lambda d: -error(d), bounds=(low, high), method="bounded")
    if -peak.fun >= 0.0:
        return low, float(peak.x)
    return float(peak.x)
