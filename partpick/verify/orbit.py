"""The periodic orbit of a boost power stage with its real parts, solved exactly.

The circuit is switched and piecewise linear. Its states are the inductor current iL and the
voltage vC on the (ideal) capacitance of the output bank, behind the bank's ESR; the output is
vo = vC + ESR · iC. With z = [iL, vC, 1], each interval is the LTI system dz/dt = F z:

* **on** (switch closed): Vin drives L through DCR + R_DS(on)·k_hot; C feeds the load R.
* **off** (diode conducting): L drives C ∥ R through V_F + R_D.
* **idle** (DCM only): iL has reached zero, the diode blocks, C alone feeds R.

An interval of length t maps z(0) to e^{F t} z(0) (the state-transition matrix and forced
response, from the matrix exponential of the augmented system), and its integral
∫ z dt = (∫₀ᵗ e^{F s} ds) z(0) comes from the same exponential of a block matrix [VL]. The
periodic condition x(T) = x(0) is solved directly as a 2 × 2 linear system; in DCM the
inductor current starts each period at zero, so only vC(0) is unknown, and the instant the
current reaches zero is found with a bracketed root finder. Power figures are exact integrals
of quadratic forms of z (one block exponential of F ⊗ I + I ⊗ F, after [VL]), so the energy
balance closes. Regulation, the duty for a target output, is in
:mod:`partpick.verify.regulation`.

References
----------
.. [EM] R. W. Erickson and D. Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
   Springer, 2020: ch. 2-3 (the boost and its steady state), ch. 5 (DCM).
.. [VL] C. F. Van Loan, "Computing integrals involving the matrix exponential", *IEEE Trans.
   Automatic Control* 23(3), 1978.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.linalg import expm
from scipy.optimize import brentq

from partpick.verify.sampling import first_fall_below_zero
from partpick.verify.stage import Stage

_IL_ROW = np.array([1.0, 0.0, 0.0])
MODE_CCM = "ccm"
MODE_DCM = "dcm"
_SCAN_STEPS = 32


@dataclass(frozen=True, eq=False)
class Circuit:
    """The interval systems of one stage at one input voltage and load resistance.

    ``systems[name]`` is the 3 × 3 matrix F of dz/dt = F z, z = [iL (A), vC (V), 1];
    ``vout_rows[name]`` and ``icap_rows[name]`` give vo = row · z (V) and iC = row · z (A).
    """

    stage: Stage
    vin_v: float
    load_ohm: float
    systems: dict[str, np.ndarray]
    vout_rows: dict[str, np.ndarray]
    icap_rows: dict[str, np.ndarray]
    off_ringing_rad_s: float = 0.0

    @property
    def period_s(self) -> float:
        return 1.0 / self.stage.fsw_hz


def boost_circuit(stage: Stage, vin_v: float, load_ohm: float) -> Circuit:
    """Return the on, off and idle systems of a boost stage (circuit laws, [EM] ch. 2).

    vin_v: input voltage, in V; load_ohm: load resistance, in Ω. With R_p = R + ESR:
    on: L diL/dt = Vin − (DCR + R_on) iL, C dvC/dt = −vC/R_p;
    off: L diL/dt = Vin − V_F − (DCR + R_D + R·ESR/R_p) iL − (R/R_p) vC, C dvC/dt = (R iL − vC)/R_p;
    idle: diL/dt = 0 with iL = 0, C dvC/dt = −vC/R_p.
    """
    if not (vin_v > 0 and math.isfinite(vin_v)):
        raise ValueError(f"vin_v must be positive, got {vin_v!r}")
    if not (load_ohm > 0 and math.isfinite(load_ohm)):
        raise ValueError(f"load_ohm must be positive, got {load_ohm!r}")
    inductance, capacitance = stage.inductance_h, stage.cout_total_f
    esr, r_load = stage.esr_total_ohm, load_ohm
    r_par = r_load + esr
    r_on = stage.dcr_ohm + stage.rds_on_hot_ohm
    r_off = stage.dcr_ohm + stage.diode_rd_ohm + r_load * esr / r_par
    decay = -1.0 / (r_par * capacitance)
    on = np.array([[-r_on / inductance, 0.0, vin_v / inductance], [0.0, decay, 0.0], [0, 0, 0]])
    off = np.array(
        [
            [
                -r_off / inductance,
                -r_load / r_par / inductance,
                (vin_v - stage.diode_vf_v) / inductance,
            ],
            [r_load / (r_par * capacitance), decay, 0.0],
            [0.0, 0.0, 0.0],
        ]
    )
    idle = np.array([[0.0, 0.0, 0.0], [0.0, decay, 0.0], [0.0, 0.0, 0.0]])
    blocked_vout = np.array([0.0, r_load / r_par, 0.0])
    blocked_icap = np.array([0.0, -1.0 / r_par, 0.0])
    return Circuit(
        stage=stage,
        vin_v=float(vin_v),
        load_ohm=float(load_ohm),
        off_ringing_rad_s=_ringing_rad_s(off[:2, :2]),
        systems={"on": on, "off": off, "idle": idle},
        vout_rows={
            "on": blocked_vout,
            "off": np.array([r_load * esr / r_par, r_load / r_par, 0.0]),
            "idle": blocked_vout,
        },
        icap_rows={
            "on": blocked_icap,
            "off": np.array([r_load / r_par, -1.0 / r_par, 0.0]),
            "idle": blocked_icap,
        },
    )


def _ringing_rad_s(state_matrix: np.ndarray) -> float:
    """Return the damped natural frequency of a 2 × 2 system (0 when it does not ring), rad/s.

    Eigenvalues λ = τ/2 ± √(τ²/4 − Δ) with τ the trace and Δ the determinant.
    """
    half_trace = 0.5 * float(np.trace(state_matrix))
    discriminant = half_trace**2 - float(np.linalg.det(state_matrix))
    return math.sqrt(-discriminant) if discriminant < 0.0 else 0.0


def propagator(system: np.ndarray, duration_s: float) -> np.ndarray:
    """Return e^{F t}: the state-transition matrix with the forced response in its last column."""
    return expm(system * duration_s)


def propagator_with_integral(
    system: np.ndarray, duration_s: float
) -> tuple[np.ndarray, np.ndarray]:
    """Return (e^{F t}, ∫₀ᵗ e^{F s} ds), both from one exponential of [[F, 0], [I, 0]] ([VL])."""
    n = system.shape[0]
    block = np.zeros((2 * n, 2 * n))
    block[:n, :n] = system
    block[n:, :n] = np.eye(n)
    exp = expm(block * duration_s)
    return exp[:n, :n], exp[n:, :n]


def second_moment(system: np.ndarray, duration_s: float, z_start: np.ndarray) -> np.ndarray:
    """Return ∫₀ᵗ z zᵀ ds for z(s) = e^{F s} z₀ (3 × 3), from one block exponential ([VL]).

    z zᵀ obeys d/ds vec(z zᵀ) = K vec(z zᵀ) with K = F ⊗ I + I ⊗ F, so the integral is
    (∫₀ᵗ e^{K s} ds) vec(z₀ z₀ᵀ), the lower-left block of e^{[[K, 0], [I, 0]] t}. Unlike the
    [[−F, Q], [0, Fᵀ]] form this never exponentiates −F, so it stays accurate for stiff
    intervals (large R/L or long off times).
    """
    n = system.shape[0]
    eye = np.eye(n)
    # F ⊗ I + I ⊗ F by broadcasting (np.kron's overhead is larger than the work here)
    kron = (
        system[:, None, :, None] * eye[None, :, None, :]
        + eye[:, None, :, None] * system[None, :, None, :]
    ).reshape(n * n, n * n)
    _, integral = propagator_with_integral(kron, duration_s)
    moment = (integral @ np.outer(z_start, z_start).ravel()).reshape(n, n)
    return 0.5 * (moment + moment.T)


@dataclass(frozen=True, eq=False)
class Segment:
    """One interval of the periodic orbit: its name, start, length, state at its start, ∫ z dt."""

    name: str
    start_s: float
    duration_s: float
    z_start: np.ndarray
    integral: np.ndarray


@dataclass(frozen=True, eq=False)
class Orbit:
    """The periodic orbit of a circuit at one duty: its mode and its segments in time order."""

    circuit: Circuit
    duty: float
    mode: str
    segments: tuple[Segment, ...]

    def vout_average_v(self) -> float:
        """The exact average of vo over the period, in V."""
        total = sum(self.circuit.vout_rows[s.name] @ s.integral for s in self.segments)
        return float(total / self.circuit.period_s)


def _plan_segments(
    plan: list[tuple[str, float, np.ndarray, np.ndarray]], z_start: np.ndarray
) -> tuple[Segment, ...]:
    """Return the segments of ``plan`` (name, duration, e^{F t}, ∫ e^{F s} ds) from z_start."""
    segments, start, z = [], 0.0, z_start
    for name, duration, exp, integral in plan:
        segments.append(Segment(name, start, duration, z, integral @ z))
        z, start = exp @ z, start + duration
    return tuple(segments)


def _interval(circuit: Circuit, name: str, duration: float):
    exp, integral = propagator_with_integral(circuit.systems[name], duration)
    return name, duration, exp, integral


def _periodic_start(on_map: np.ndarray, off_map: np.ndarray) -> np.ndarray:
    """Return z(0) of the two-interval orbit: solve (I − Φ) x₀ = forced for x₀."""
    period_map = off_map @ on_map
    (a, b), (c, d) = np.eye(2) - period_map[:2, :2]
    forced_i, forced_v = period_map[:2, 2]
    # Cramer's rule: a 2 × 2 system, where a general solver's overhead would dominate
    det = a * d - b * c
    return np.array([(forced_i * d - b * forced_v) / det, (a * forced_v - c * forced_i) / det, 1.0])


def _dcm_state(circuit: Circuit, on_map: np.ndarray, t_zero: float, t_idle: float):
    """Return (vC(0), iL at the end of the off interval) for a trial zero-current instant.

    iL(0) = 0, so vC(T) = a·vC(0) + c is affine for fixed interval lengths and the periodic
    vC(0) = c / (1 − a) follows directly. The idle system is diagonal, so its exponential is
    e^{−t/(R_p C)} on vC and 1 elsewhere.
    """
    off_map = propagator(circuit.systems["off"], t_zero)
    idle_decay = math.exp(circuit.systems["idle"][1, 1] * t_idle)
    through = off_map @ on_map
    vc0 = idle_decay * through[1, 2] / (1.0 - idle_decay * through[1, 1])
    return vc0, float(through[0, 1] * vc0 + through[0, 2])


def orbit(circuit: Circuit, duty: float, zero_hint_s: float | None = None) -> Orbit:
    """Return the periodic steady state at ``duty``, in CCM or, where iL would reverse, DCM.

    ``zero_hint_s`` is an estimate of the zero-current instant (from a nearby duty) that
    lets the DCM search start from a tight bracket.
    """
    period = circuit.period_s
    t_on, t_off = duty * period, (1.0 - duty) * period
    on, off = _interval(circuit, "on", t_on), _interval(circuit, "off", t_off)
    z0 = _periodic_start(on[2], off[2])
    if _current_stays_positive(circuit, on[2], t_off, z0):
        return Orbit(circuit, duty, MODE_CCM, _plan_segments([on, off], z0))
    t_zero, vc0 = _zero_current_time(circuit, on[2], t_on, t_off, zero_hint_s)
    plan = [on, _interval(circuit, "off", t_zero), _idle_interval(circuit, t_off - t_zero)]
    return Orbit(circuit, duty, MODE_DCM, _plan_segments(plan, np.array([0.0, vc0, 1.0])))


def _current_stays_positive(
    circuit: Circuit, on_map: np.ndarray, t_off: float, z0: np.ndarray
) -> bool:
    """Return True when the CCM orbit's inductor current never falls below zero.

    The on interval only drives iL towards Vin/R (it is decoupled), so only the off interval
    can take it below zero. Its solution is a sum of two modes, so while it rings for less
    than half a cycle (ω·t_off < π) iL has at most one turning point there; with iL(T) ≥ 0
    and iL still falling at T, iL cannot have dipped below zero. Otherwise it is sampled.
    """
    if z0[0] < 0.0:
        return False
    off = circuit.systems["off"]
    if circuit.off_ringing_rad_s * t_off < math.pi and float(off[0] @ z0) <= 0.0:
        return True
    return first_fall_below_zero(off, on_map @ z0, t_off, _IL_ROW) is None


def _idle_interval(circuit: Circuit, duration: float):
    """Return the idle interval's (name, t, e^{F t}, ∫ e^{F s} ds) in closed form.

    Its system is diagonal, diag(0, a, 0) with a = −1/(R_p C), so e^{F t} = diag(1, e^{a t}, 1)
    and the integral is diag(t, (e^{a t} − 1)/a, t).
    """
    rate = circuit.systems["idle"][1, 1]
    decay = math.exp(rate * duration)
    exp = np.diag([1.0, decay, 1.0])
    integral = np.diag([duration, (decay - 1.0) / rate, duration])
    return "idle", duration, exp, integral


def _zero_current_time(
    circuit: Circuit, on_map: np.ndarray, t_on: float, t_off: float, hint_s: float | None
) -> tuple[float, float]:
    """Return (instant in the off interval at which iL reaches zero in s, periodic vC(0) in V).

    Brent's method on the end-of-interval current of the periodic DCM orbit. The bracket is
    first tried tight around the hint (1 %) or the estimate (10 %); failing those, the off
    interval is scanned for the first sign change.
    """
    states: dict[float, tuple[float, float]] = {}

    def end_current(t_zero: float) -> float:
        if t_zero not in states:
            states[t_zero] = _dcm_state(circuit, on_map, t_zero, t_off - t_zero)
        return states[t_zero][1]

    floor = t_off * 1e-9
    estimate = _zero_current_estimate(circuit, on_map, t_on, t_off)
    guesses = [(hint_s, 0.01), (estimate, 0.1)]
    for centre, spread in guesses:
        if centre is None or not floor < centre * (1.0 + spread) < t_off:
            continue
        low, high = max(centre * (1.0 - spread), floor), centre * (1.0 + spread)
        if end_current(low) > 0.0 > end_current(high):
            t_zero = _brent_time(end_current, low, high, circuit.period_s)
            return t_zero, states[t_zero][0]
    # No tight bracket: scan the off interval for the first instant the end current is not
    # positive, so a later swing of a ringing current is never taken for the first zero.
    low = floor
    for j in range(1, _SCAN_STEPS + 1):
        high = t_off * j / _SCAN_STEPS
        if end_current(high) <= 0.0:
            t_zero = _brent_time(end_current, low, high, circuit.period_s)
            end_current(t_zero)
            return t_zero, states[t_zero][0]
        low = high
    return t_off, states[t_off][0]  # at the CCM/DCM boundary to numerical precision


def _brent_time(function, low: float, high: float, period_s: float) -> float:
    return brentq(function, low, high, xtol=period_s * 1e-14, rtol=1e-11)


def _zero_current_estimate(
    circuit: Circuit, on_map: np.ndarray, t_on: float, t_off: float
) -> float | None:
    """Return an estimate of the zero-current instant, only to place a tight first bracket.

    vC(0) is taken from the ideal DCM ratio M = (1 + √(1 + 4D²/K))/2 ([EM] ch. 5). Where the
    off interval rings (ω·t_off ≥ π/2) the current may reach zero on a later swing too, so the
    first zero of that trajectory is found by sampling; otherwise the straight line
    i₁·L/(Vo + V_F − Vin) is used.
    """
    stage, period = circuit.stage, circuit.period_s
    k = 2.0 * stage.inductance_h / (circuit.load_ohm * period)
    ratio = (1.0 + math.sqrt(1.0 + 4.0 * (t_on / period) ** 2 / k)) / 2.0
    vout = circuit.vin_v * ratio
    peak = on_map @ np.array([0.0, vout, 1.0])
    if peak[0] <= 0.0:
        return None
    if circuit.off_ringing_rad_s * t_off >= 0.5 * math.pi:
        return first_fall_below_zero(circuit.systems["off"], peak, t_off, _IL_ROW)
    fall_v = vout + stage.diode_vf_v - circuit.vin_v
    return peak[0] * stage.inductance_h / fall_v if fall_v > 0.0 else None


def vout_average_v(circuit: Circuit, duty: float) -> float:
    """Return the exact average output voltage of the steady state at ``duty``, in V."""
    return orbit(circuit, duty).vout_average_v()
