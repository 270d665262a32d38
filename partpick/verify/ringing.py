"""The switch node of a boost in DCM: the whole ring while the inductor current rests at zero.

When the diode stops conducting (iL = 0) the switch node is left at V0 ≈ vo + V_F. Neither
semiconductor conducts, so the node is the capacitor of a series RLC circuit driven by Vin:
Vin, the inductor L with its winding resistance R, and the switch-node capacitance C to
ground. C = C_oss + C_j: the switch's output capacitance (its energy-equivalent value, so
½·C·V² is the energy C_oss(v) really stores) and the diode's junction capacitance, whose
other end sits on the output, an AC ground. The non-linearity of C with voltage and every
damping but the winding resistance are neglected (core loss and the input capacitor's ESR
damp a real ring faster).

With i = C dv/dt and L di/dt = Vin − R i − v the node obeys
LC v'' + RC v' + v = Vin, v(0) = V0, v'(0) = 0 (the current starts at zero), whose solution
is the series RLC step response [NR]: with ΔV = V0 − Vin, α = R/(2L), ω0 = 1/√(LC),

* underdamped (α < ω0), ω_d = √(ω0² − α²):
  v(t) = Vin + ΔV·e^(−αt)·(cos ω_d t + (α/ω_d)·sin ω_d t),
  i(t) = C·dv/dt = −C·ΔV·(ω0²/ω_d)·e^(−αt)·sin ω_d t;
* critically damped (α = ω0): v(t) = Vin + ΔV·(1 + αt)·e^(−αt);
* overdamped (α > ω0), β = √(α² − ω0²):
  v(t) = Vin + ΔV·e^(−αt)·(cosh βt + (α/β)·sinh βt).

The idle interval is followed as it is, in three stages (the piecewise, one-state-at-a-time
analysis of a resonant transition, [EM] on resonant and soft switching):

1. **The fall.** The ring above. Where its first valley Vin − ΔV·e^(−απ/ω_d) stays above
   ground (V0 < 2·Vin for light damping) it simply goes on ringing about Vin.
2. **The body-diode clamp.** Otherwise the node reaches 0 V at t_g, with the inductor current
   i_g < 0. The switch's body diode (ideal here) holds the node at 0 V while
   L di/dt = Vin − R i brings the current back to zero, which takes
   t_c = (L/R)·ln(1 + R·|i_g|/Vin) ≈ L·|i_g|/Vin.
3. **The ring from ground.** The node then rings again about Vin from v = 0, i = 0, between
   0 and about 2·Vin, and never reaches ground again (its valleys are damped above 0).

The switch turns on against wherever this leaves the node; at zero idle time that is V0, the
CCM turn-on voltage, so the turn-on loss ½·C·v_on²·f is continuous across the CCM/DCM
boundary. Only the turn-on loss uses this ring; the waveform model of
:mod:`partpick.verify.orbit` keeps iL = 0 through the idle interval.

References
----------
.. [EM] R. W. Erickson and D. Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
   Springer, 2020: ch. 5 (DCM: the ringing of the switch node while the inductor current is
   zero), and the chapters on resonant conversion and soft switching (the piecewise analysis
   of a resonant transition clamped by a diode).
.. [NR] J. W. Nilsson and S. A. Riedel, *Electric Circuits*, ch. 8 (natural and step
   response of the series RLC circuit).
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike
from scipy.optimize import brentq

__all__ = [
    "dcm_clamp_interval_s",
    "dcm_ring_first_valley_v",
    "dcm_ring_node_voltage_v",
    "dcm_turn_on_node_voltage_v",
]


def _ring_rates(
    inductance_h: ArrayLike, capacitance_f: ArrayLike, resistance_ohm: ArrayLike
) -> tuple[np.ndarray, np.ndarray]:
    """Return (α = R/(2L), ω0² = 1/(LC)), in 1/s and rad²/s²."""
    inductance = np.asarray(inductance_h, dtype=float)
    alpha = np.asarray(resistance_ohm, dtype=float) / (2.0 * inductance)
    omega0_sq = 1.0 / (inductance * np.asarray(capacitance_f, dtype=float))
    return alpha, omega0_sq


def dcm_ring_node_voltage_v(
    vin_v: ArrayLike,
    v_start_v: ArrayLike,
    inductance_h: ArrayLike,
    capacitance_f: ArrayLike,
    resistance_ohm: ArrayLike,
    t_s: ArrayLike,
) -> np.ndarray:
    """Return the switch-node voltage t after the diode stopped conducting, in V (no clamp).

    v(t) = Vin + (V0 − Vin)·e^(−αt)·(cos ω_d t + (α/ω_d)·sin ω_d t) with α = R/(2L),
    ω0 = 1/√(LC), ω_d = √(ω0² − α²) when underdamped; (1 + αt)·e^(−αt) and
    e^(−αt)·(cosh βt + (α/β)·sinh βt), β = √(α² − ω0²), replace the damped cosine when
    critically damped and overdamped (see the module docstring).

    vin_v: input voltage, in V; v_start_v: node voltage V0 when iL reached zero, in V;
    inductance_h: L, in H (> 0); capacitance_f: switch-node capacitance C, in F (> 0);
    resistance_ohm: series resistance R (the winding's), in Ω (≥ 0); t_s: time since iL
    reached zero, in s (≥ 0).

    References: Nilsson & Riedel, *Electric Circuits*, ch. 8 (series RLC step response);
    Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 5.
    """
    vin = np.asarray(vin_v, dtype=float)
    step = np.asarray(v_start_v, dtype=float) - vin
    t = np.asarray(t_s, dtype=float)
    alpha, omega0_sq = _ring_rates(inductance_h, capacitance_f, resistance_ohm)
    spread = alpha**2 - omega0_sq
    # each form gets its own rate only where it applies, so the other cannot overflow
    omega_d = np.sqrt(np.where(spread < 0.0, -spread, 0.0))
    beta = np.sqrt(np.where(spread > 0.0, spread, 0.0))
    shape = np.where(
        spread < 0.0, _underdamped_shape(alpha, omega_d, t), _overdamped_shape(alpha, beta, t)
    )
    return vin + step * shape


def _underdamped_shape(alpha: np.ndarray, omega_d: np.ndarray, t: np.ndarray) -> np.ndarray:
    """Return e^(−αt)·(cos ω_d t + (α/ω_d)·sin ω_d t), tending to (1 + αt)·e^(−αt) as ω_d → 0."""
    # sin(ω_d t)/ω_d → t as ω_d → 0 (the critically damped limit)
    phase = omega_d * t
    safe = np.where(phase > 0.0, phase, 1.0)
    sinc_t = np.where(phase > 1e-8, np.sin(phase) / safe, 1.0) * t
    return np.exp(-alpha * t) * (np.cos(phase) + alpha * sinc_t)


def _overdamped_shape(alpha: np.ndarray, beta: np.ndarray, t: np.ndarray) -> np.ndarray:
    """Return e^(−αt)·(cosh βt + (α/β)·sinh βt) (β ≤ α), tending to (1 + αt)·e^(−αt) as β → 0.

    Written with e^((β−α)t) and e^(−(β+α)t), which never overflow since β ≤ α.
    """
    slow, fast = np.exp((beta - alpha) * t), np.exp(-(beta + alpha) * t)
    two_beta_t = 2.0 * beta * t
    # e^(−αt)·sinh βt / β, by expm1 where βt is small so the difference keeps its digits
    small = fast * np.expm1(np.minimum(two_beta_t, 1.0)) * 0.5
    sinh_over_beta = np.where(
        two_beta_t > 1e-8,
        np.where(two_beta_t < 1.0, small, 0.5 * (slow - fast)) / np.where(beta > 0, beta, 1.0),
        t * np.exp(-alpha * t),
    )
    return 0.5 * (slow + fast) + alpha * sinh_over_beta


def dcm_ring_first_valley_v(
    vin_v: ArrayLike,
    v_start_v: ArrayLike,
    inductance_h: ArrayLike,
    capacitance_f: ArrayLike,
    resistance_ohm: ArrayLike,
) -> np.ndarray:
    """Return the node voltage at the ring's first turning point, t = π/ω_d, in V.

    v = Vin − (V0 − Vin)·e^(−απ/ω_d), α = R/(2L), ω_d = √(1/(LC) − α²); the sine term of
    the ring is zero there. A critically damped or overdamped node does not overshoot and
    settles towards Vin, which is returned. Arguments and units as for
    :func:`dcm_ring_node_voltage_v`.

    References: Nilsson & Riedel, *Electric Circuits*, ch. 8 (series RLC step response).
    """
    vin = np.asarray(vin_v, dtype=float)
    step = np.asarray(v_start_v, dtype=float) - vin
    alpha, omega0_sq = _ring_rates(inductance_h, capacitance_f, resistance_ohm)
    spread = omega0_sq - alpha**2
    omega_d = np.sqrt(np.where(spread > 0.0, spread, 1.0))
    overshoot = np.where(spread > 0.0, np.exp(-alpha * np.pi / omega_d), 0.0)
    return vin - step * overshoot


def dcm_turn_on_node_voltage_v(
    vin_v: ArrayLike,
    v_start_v: ArrayLike,
    inductance_h: ArrayLike,
    capacitance_f: ArrayLike,
    resistance_ohm: ArrayLike,
    t_idle_s: ArrayLike,
) -> np.ndarray:
    """Return the node voltage the switch turns on against after an idle interval, in V.

    The fall, the body-diode clamp and the ring from ground of the module docstring: v(t) of
    :func:`dcm_ring_node_voltage_v` until the node first reaches 0 V at t_g (only where the
    first valley lies below ground); 0 V for the clamp t_c = (L/R)·ln(1 + R·|i_g|/Vin)
    (L·|i_g|/Vin for R = 0); then the ring about Vin from v = 0, i = 0. At t_idle = 0 this is
    V0, the CCM turn-on voltage at the CCM/DCM boundary. t_idle_s: the idle interval, in s;
    the other arguments and units as for :func:`dcm_ring_node_voltage_v`.

    References: Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 5
    (DCM ringing) and its chapters on resonant and soft switching; Nilsson & Riedel,
    *Electric Circuits*, ch. 8.
    """
    arrays = np.broadcast_arrays(
        *(np.asarray(a, dtype=float) for a in
          (vin_v, v_start_v, inductance_h, capacitance_f, resistance_ohm, t_idle_s))
    )  # fmt: skip
    flat = [a.ravel() for a in arrays]
    out = np.array([_turn_on_v(*values) for values in zip(*flat, strict=True)], dtype=float)
    return out.reshape(arrays[0].shape)


def dcm_clamp_interval_s(
    vin_v: float, v_start_v: float, inductance_h: float, capacitance_f: float, resistance_ohm: float
) -> tuple[float, float] | None:
    """Return (t_g, t_c): when the ring first reaches ground and how long the clamp lasts, in s.

    None where the ring never reaches ground (first valley ≥ 0, or no overshoot at all).
    Arguments and units as for :func:`dcm_ring_node_voltage_v`.
    """
    ring = (vin_v, v_start_v, inductance_h, capacitance_f, resistance_ohm)
    if float(dcm_ring_first_valley_v(*ring)) >= 0.0:
        return None
    alpha, omega0_sq = (float(x) for x in _ring_rates(*ring[2:]))
    omega_d = math.sqrt(omega0_sq - alpha**2)
    t_ground = brentq(
        lambda t: float(dcm_ring_node_voltage_v(*ring, t)),
        0.0,
        math.pi / omega_d,
        xtol=1e-16,
        rtol=1e-13,
    )
    step = v_start_v - vin_v
    current_a = (
        -capacitance_f * step * (omega0_sq / omega_d) * math.exp(-alpha * t_ground)
        * math.sin(omega_d * t_ground)
    )  # fmt: skip
    if resistance_ohm > 0.0:
        clamp_s = inductance_h / resistance_ohm * math.log1p(resistance_ohm * -current_a / vin_v)
    else:
        clamp_s = inductance_h * -current_a / vin_v
    return t_ground, clamp_s


def _turn_on_v(vin, v_start, inductance, capacitance, resistance, t_idle) -> float:
    ring = (vin, v_start, inductance, capacitance, resistance)
    clamp = dcm_clamp_interval_s(*ring)
    if clamp is None or t_idle <= clamp[0]:
        return float(dcm_ring_node_voltage_v(*ring, t_idle))
    t_ground, clamp_s = clamp
    if t_idle <= t_ground + clamp_s:
        return 0.0
    return float(
        dcm_ring_node_voltage_v(
            vin, 0.0, inductance, capacitance, resistance, t_idle - t_ground - clamp_s
        )
    )
