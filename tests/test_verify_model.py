"""The exact steady-state model of partpick.verify against outside references.

References used here:
* scipy.integrate.solve_ivp, a general-purpose reference integrator, run on the switched
  circuit equations written out below from Kirchhoff's laws (independently of the matrices
  in partpick/verify/orbit.py), for many periods until the state repeats.
* Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 3 (averaged model
  with conduction losses) and ch. 5 (ideal DCM conversion ratio).
* Conservation of energy (input power = output power + every loss).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import solve_ivp

from partpick.errors import ParameterError
from partpick.verify.stage import Stage
from partpick.verify.steady_state import LOSS_KEYS, steady_state

# An invented 100 kHz stage with every parasitic present (SI units).
CCM_STAGE = Stage(
    inductance_h=22e-6,
    dcr_ohm=0.05,
    rds_on_ohm=0.02,
    hot_factor=1.5,
    diode_vf_v=0.4,
    diode_rd_ohm=0.02,
    cout_f=5e-6,
    esr_ohm=0.02,
    output_count=2,
    fsw_hz=100e3,
    qgd_c=4e-9,
    coss_f=200e-12,
    gate_drive_a=1.0,
    qrr_c=10e-9,
)
DCM_STAGE = replace(CCM_STAGE, inductance_h=10e-6, cout_f=2e-6)
# L and C resonate at 1/(2π√(1 µH · 1 µF)) = 159 kHz, far above 20 kHz: the current rings in
# the off interval, so only its first zero may end the diode's conduction.
RINGING_STAGE = replace(CCM_STAGE, inductance_h=1e-6, cout_f=0.5e-6, fsw_hz=20e3)


# ---------------------------------------------------------------- the brute-force reference


def _circuit_laws(stage: Stage, vin_v: float, load_ohm: float):
    """Return the right-hand sides of the three topologies, written from KVL and KCL."""
    inductance, cap = stage.inductance_h, stage.cout_f * stage.output_count
    esr = stage.esr_ohm / stage.output_count
    r_on = stage.rds_on_ohm * stage.hot_factor

    def output_v(il: float, vc: float) -> float:
        # vo = vC + ESR·iC and iC = iL − vo/R, solved for vo
        return (vc + esr * il) / (1.0 + esr / load_ohm)

    def on(_t, x):
        il, vc = x
        vo = vc / (1.0 + esr / load_ohm)
        return [(vin_v - (stage.dcr_ohm + r_on) * il) / inductance, -vo / load_ohm / cap]

    def off(_t, x):
        il, vc = x
        vo = output_v(il, vc)
        drop = stage.diode_vf_v + stage.diode_rd_ohm * il
        return [(vin_v - stage.dcr_ohm * il - drop - vo) / inductance, (il - vo / load_ohm) / cap]

    def idle(_t, x):
        vo = x[1] / (1.0 + esr / load_ohm)
        return [0.0, -vo / load_ohm / cap]

    def vout(name: str, il: np.ndarray, vc: np.ndarray) -> np.ndarray:
        return output_v(il, vc) if name == "off" else vc / (1.0 + esr / load_ohm)

    return {"on": on, "off": off, "idle": idle}, vout


def _zero_current(_t, x):
    return x[0]


_zero_current.terminal = True
_zero_current.direction = -1.0


def _one_period(laws, x, t_on, period, dense):
    kwargs = dict(method="DOP853", rtol=1e-11, atol=1e-12, dense_output=dense)
    pieces = []
    on = solve_ivp(laws["on"], (0.0, t_on), x, **kwargs)
    pieces.append(("on", on))
    off = solve_ivp(laws["off"], (t_on, period), on.y[:, -1], events=_zero_current, **kwargs)
    pieces.append(("off", off))
    x_end = off.y[:, -1]
    if off.status == 1:  # the diode current reached zero: the idle interval follows
        t_zero = off.t_events[0][0]
        idle = solve_ivp(laws["idle"], (t_zero, period), [0.0, x_end[1]], **kwargs)
        pieces.append(("idle", idle))
        x_end = idle.y[:, -1]
    return x_end, pieces


def reference_orbit(stage: Stage, vin_v: float, load_ohm: float, duty: float) -> dict:
    """Integrate period after period until x(T) = x(0) to 1e-10, then measure the last one."""
    period = 1.0 / stage.fsw_hz
    laws, vout = _circuit_laws(stage, vin_v, load_ohm)
    # start near the answer (ideal averaged model, [EM] ch. 2) so fewer periods are needed
    v_guess = vin_v / (1.0 - duty)
    x = np.array([v_guess / load_ohm / (1.0 - duty), v_guess])
    for _ in range(20000):
        x_end, _ = _one_period(laws, x, duty * period, period, dense=False)
        settled = abs(x_end[1] - x[1]) < 1e-10 * abs(x[1]) and abs(x_end[0] - x[0]) < 1e-9 * (
            abs(x[0]) + 1e-3
        )
        x = x_end
        if settled:
            break
    else:  # pragma: no cover - the reference itself failed
        raise AssertionError("the reference integration never settled")
    _, pieces = _one_period(laws, x, duty * period, period, dense=True)
    times, currents, volts = [], [], []
    for name, solution in pieces:
        t = np.linspace(solution.t[0], solution.t[-1], 4001)
        il, vc = solution.sol(t)
        times.append(t)
        currents.append(il)
        volts.append(vout(name, il, vc))
    average = sum(np.trapezoid(v, t) for t, v in zip(times, volts, strict=True)) / period
    return {
        "vout_avg_v": average,
        "vout_ripple_v": max(v.max() for v in volts) - min(v.min() for v in volts),
        "il_max_a": max(i.max() for i in currents),
        "il_min_a": max(min(i.min() for i in currents), 0.0),
        "mode": "dcm" if len(pieces) == 3 else "ccm",
    }


# ---------------------------------------------------------------- checks against the reference


@pytest.mark.parametrize(
    ("stage", "vin_v", "load_ohm", "duty", "mode"),
    [
        (CCM_STAGE, 12.0, 12.0, 0.5, "ccm"),
        (CCM_STAGE, 9.0, 20.0, 0.65, "ccm"),
        (DCM_STAGE, 12.0, 100.0, 0.3, "dcm"),
        (DCM_STAGE, 8.0, 60.0, 0.45, "dcm"),
        (RINGING_STAGE, 12.0, 50.0, 0.3, "dcm"),
    ],
)
def test_steady_state_matches_the_reference_integrator(stage, vin_v, load_ohm, duty, mode):
    # scipy.integrate.solve_ivp (DOP853, rtol 1e-11) run to steady state with event detection
    # of the switching instants and of the diode current reaching zero.
    reference = reference_orbit(stage, vin_v, load_ohm, duty)
    result = steady_state(stage, vin_v, load_ohm, duty=duty)
    assert reference["mode"] == mode
    assert result.mode == mode
    assert result.vout_avg_v == pytest.approx(reference["vout_avg_v"], rel=5e-3)
    assert result.vout_ripple_v == pytest.approx(reference["vout_ripple_v"], rel=5e-3)
    assert result.il_max_a == pytest.approx(reference["il_max_a"], rel=5e-3)
    if mode == "ccm":
        assert result.il_min_a == pytest.approx(reference["il_min_a"], rel=5e-3)
    else:
        assert result.il_min_a == 0.0


def test_regulated_duty_reproduces_vout_in_the_reference_integrator():
    # scipy.integrate.solve_ivp run to steady state at the duty the regulation found: the
    # brute-force average output is the target, 24 V, within 0.5 %.
    result = steady_state(CCM_STAGE, 10.0, 24.0 / 1.2, vout_v=24.0)
    reference = reference_orbit(CCM_STAGE, 10.0, 24.0 / 1.2, result.duty)
    assert reference["vout_avg_v"] == pytest.approx(24.0, rel=5e-3)


# ---------------------------------------------------------------- published averaged results


def _ideal(**changes) -> Stage:
    """A stage with every loss zero, big L and C (small ripple), unless changed."""
    base = dict(
        inductance_h=1e-3,
        dcr_ohm=0.0,
        rds_on_ohm=0.0,
        diode_vf_v=0.0,
        cout_f=1e-3,
        esr_ohm=0.0,
        fsw_hz=100e3,
    )
    base.update(changes)
    return Stage(**base)


@pytest.mark.parametrize(
    ("duty", "rl_over_r", "expected_m"),
    [
        # M = (1/(1−D))·1/(1 + RL/((1−D)²R)); D = 0.5, RL/R = 0.02: 2/(1 + 0.08) = 1.85185
        (0.5, 0.02, 1.85185),
        # D = 0.8, RL/R = 0.01: 5/(1 + 0.25) = 4.0
        (0.8, 0.01, 4.0),
        # D = 0.3, RL/R = 0.05: 1.428571/(1 + 0.05/0.49) = 1.428571/1.102041 = 1.296296
        (0.3, 0.05, 1.296296),
    ],
)
def test_inductor_resistance_only_matches_the_averaged_model(duty, rl_over_r, expected_m):
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 3 (eq. 3.x, boost
    # with inductor winding resistance): M = (1/(1−D))·1/(1 + RL/((1−D)²R)), small ripple.
    load_ohm = 10.0
    stage = _ideal(dcr_ohm=rl_over_r * load_ohm)
    result = steady_state(stage, 12.0, load_ohm, duty=duty)
    assert result.vout_avg_v / 12.0 == pytest.approx(expected_m, rel=5e-3)
    # ch. 3 also gives the efficiency of this circuit: η = 1/(1 + RL/((1−D)²R))
    assert result.efficiency == pytest.approx(expected_m * (1.0 - duty), rel=5e-3)


def test_diode_drop_and_switch_resistance_match_the_averaged_model():
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 3, boost with
    # Ron, VD, RD and RL, from volt-second and charge balance:
    # V = R(1−D)(Vg − (1−D)VD) / (R(1−D)² + D·Ron + (1−D)·RD + RL).
    # Vg = 12 V, D = 0.6, R = 20 Ω, Ron = 0.05 Ω, RD = 0.03 Ω, RL = 0.1 Ω, VD = 0.5 V:
    # numerator 20·0.4·(12 − 0.4·0.5) = 94.4; denominator 20·0.16 + 0.6·0.05 + 0.4·0.03 + 0.1
    # = 3.342; V = 28.2465 V.
    stage = _ideal(dcr_ohm=0.1, rds_on_ohm=0.05, diode_vf_v=0.5, diode_rd_ohm=0.03)
    result = steady_state(stage, 12.0, 20.0, duty=0.6)
    assert result.mode == "ccm"
    assert result.vout_avg_v == pytest.approx(28.2465, rel=5e-3)


@pytest.mark.parametrize(
    ("duty", "expected_m"),
    [
        # K = 2L/(R·Ts) = 2·10 µH/(100 Ω · 10 µs) = 0.02.
        # D = 0.3: M = (1 + √(1 + 4·0.09/0.02))/2 = (1 + √19)/2 = 2.67945
        (0.3, 2.67945),
        # D = 0.2: M = (1 + √(1 + 4·0.04/0.02))/2 = (1 + 3)/2 = 2.0
        (0.2, 2.0),
        # D = 0.1: M = (1 + √(1 + 4·0.01/0.02))/2 = (1 + √3)/2 = 1.36603
        (0.1, 1.36603),
    ],
)
def test_ideal_dcm_ratio(duty, expected_m):
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5: ideal boost in
    # DCM, M = (1 + √(1 + 4D²/K))/2 with K = 2L/(R·Ts) below Kcrit = D(1−D)².
    stage = _ideal(inductance_h=10e-6, cout_f=200e-6)
    result = steady_state(stage, 12.0, 100.0, duty=duty)
    assert result.mode == "dcm"
    assert result.vout_avg_v / 12.0 == pytest.approx(expected_m, rel=1e-2)


def test_ideal_ccm_ratio_is_one_over_one_minus_duty():
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 2: M = 1/(1 − D);
    # 12 V at D = 0.5 gives 24 V (K = 2·1 mH/(10 Ω·10 µs) = 20, far above Kcrit, so CCM).
    result = steady_state(_ideal(), 12.0, 10.0, duty=0.5)
    assert result.mode == "ccm"
    assert result.vout_avg_v == pytest.approx(24.0, rel=1e-3)
    assert result.efficiency == pytest.approx(1.0, abs=1e-9)


def test_capacitor_ripple_matches_the_charge_balance_estimate():
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 2 (boost output
    # ripple): with small inductor ripple the capacitor discharges by V·D·Ts/(R·C) peak to
    # peak. V = 24 V, D = 0.5, Ts = 10 µs, R = 10 Ω, C = 100 µF: 24·0.5·1e-5/1e-3 = 0.12 V.
    result = steady_state(_ideal(cout_f=100e-6), 12.0, 10.0, duty=0.5)
    assert result.vout_ripple_v == pytest.approx(0.12, rel=1e-2)


def test_esr_step_sits_between_the_app_note_terms():
    # TI SLVA372 (Basic Calculation of a Boost Converter's Power Stage): the ESR adds
    # ESR·(Iout/(1 − D) + ΔIL/2) and the charge adds Iout·D/(fsw·C). Their sum bounds the
    # ripple from above and the ESR step alone from below. 12 V at D = 0.5 into 10 Ω, with
    # 1 mH (ΔIL = 12·0.5/(100 kHz·1 mH) = 0.06 A) and 1 mF of 50 mΩ: Iout ≈ 2.4 A, so
    # the ESR term is 0.05·(4.8 + 0.03) = 0.24 V and the charge term 2.4·0.5/(1e5·1e-3)
    # = 0.012 V.
    stage = _ideal(esr_ohm=0.05)
    result = steady_state(stage, 12.0, 10.0, duty=0.5)
    iout = result.iout_avg_a
    ripple_a = 12.0 * 0.5 / (100e3 * 1e-3)
    esr_term = 0.05 * (iout / 0.5 + ripple_a / 2.0)
    charge_term = iout * 0.5 / (100e3 * 1e-3)
    assert esr_term * 0.98 <= result.vout_ripple_v <= (esr_term + charge_term) * 1.001


# ---------------------------------------------------------------- conservation and regulation


@pytest.mark.parametrize(
    ("stage", "vin_v", "load_ohm"),
    [(CCM_STAGE, 12.0, 12.0), (CCM_STAGE, 7.0, 30.0), (DCM_STAGE, 12.0, 200.0)],
)
def test_input_power_equals_output_power_plus_losses(stage, vin_v, load_ohm):
    # Conservation of energy over one period of the steady state: P_in = P_out + Σ P_loss,
    # to 0.1 %.
    result = steady_state(stage, vin_v, load_ohm, vout_v=24.0)
    assert set(result.losses_w) == set(LOSS_KEYS)
    assert all(value >= 0.0 for value in result.losses_w.values())
    assert result.pin_w == pytest.approx(result.pout_w + result.total_loss_w, rel=1e-3)


@settings(max_examples=25, deadline=None)
@given(
    vin_v=st.floats(4.0, 20.0),
    iout_a=st.floats(0.01, 3.0),
    inductance_h=st.floats(2e-6, 100e-6),
    dcr_ohm=st.floats(0.0, 0.2),
    esr_ohm=st.floats(0.0, 0.1),
)
def test_energy_balance_holds_everywhere(vin_v, iout_a, inductance_h, dcr_ohm, esr_ohm):
    # Conservation of energy, as above, over random stages and loads in CCM and DCM.
    stage = replace(CCM_STAGE, inductance_h=inductance_h, dcr_ohm=dcr_ohm, esr_ohm=esr_ohm)
    result = steady_state(stage, vin_v, 30.0 / iout_a, vout_v=30.0)
    assert result.pin_w == pytest.approx(result.pout_w + result.total_loss_w, rel=1e-3)
    assert result.il_max_a >= result.il_rms_a >= result.il_avg_a * (1 - 1e-9)
    # a claimed regulation holds; an unreached one falls short (losses cap the ratio)
    if result.regulated:
        assert result.vout_avg_v == pytest.approx(30.0, rel=1e-6)
    else:
        assert result.vout_avg_v < 30.0


@pytest.mark.parametrize(
    ("stage", "vin_v", "load_ohm", "mode"),
    [
        (CCM_STAGE, 6.0, 24.0 / 0.8, "ccm"),
        (CCM_STAGE, 18.0, 24.0 / 1.5, "ccm"),
        (DCM_STAGE, 9.0, 24.0 / 0.02, "dcm"),
    ],
)
def test_regulation_hits_vout(stage, vin_v, load_ohm, mode):
    result = steady_state(stage, vin_v, load_ohm, vout_v=24.0)
    assert result.regulated
    assert result.mode == mode
    assert result.vout_avg_v == pytest.approx(24.0, rel=1e-6)
    # the regulated duty reproduces the same output when run open loop
    again = steady_state(stage, vin_v, load_ohm, duty=result.duty)
    assert again.vout_avg_v == pytest.approx(24.0, rel=1e-6)


def test_unreachable_output_is_reported_not_raised():
    # With RL/R = 0.1 the ideal-averaged maximum of M is 1/(2√(RL/R)) = 1.58 (Erickson &
    # Maksimovic, ch. 3), so 12 V cannot be boosted to 24 V.
    stage = _ideal(dcr_ohm=1.0)
    result = steady_state(stage, 12.0, 10.0, vout_v=24.0)
    assert not result.regulated
    assert result.vout_avg_v < 12.0 * 1.6


def test_a_dcm_output_below_the_input_is_flagged_as_outside_the_model():
    # With the ringing stage at D = 0.02 into 10 Ω the output averages about 2.2 V from 5 V
    # in, so while iL rests at zero vo < Vin − V_F and the diode would conduct again
    # (Kirchhoff: the switch node sits at Vin when the inductor carries no current).
    result = steady_state(RINGING_STAGE, 5.0, 10.0, duty=0.02)
    assert result.mode == "dcm"
    assert result.diode_would_reconduct
    assert not steady_state(DCM_STAGE, 12.0, 100.0, duty=0.3).diode_would_reconduct


# ---------------------------------------------------------------- the stage validates itself


@pytest.mark.parametrize(
    ("field", "value"),
    [
        ("inductance_h", 0.0),
        ("inductance_h", -1e-6),
        ("dcr_ohm", -0.01),
        ("cout_f", 0.0),
        ("esr_ohm", math.nan),
        ("fsw_hz", math.inf),
        ("output_count", 0),
        ("output_count", 1.5),
        ("hot_factor", 0.0),
        ("diode_vf_v", -0.3),
    ],
)
def test_stage_rejects_impossible_figures(field, value):
    with pytest.raises(ParameterError) as caught:
        replace(CCM_STAGE, **{field: value})
    assert caught.value.field == field


def test_stage_bank_figures():
    # two 5 µF parts of 20 mΩ each in parallel: 10 µF and 10 mΩ; 20 mΩ × 1.5 hot = 30 mΩ
    assert CCM_STAGE.cout_total_f == pytest.approx(10e-6)
    assert CCM_STAGE.esr_total_ohm == pytest.approx(0.01)
    assert CCM_STAGE.rds_on_hot_ohm == pytest.approx(0.03)
    # Qgd / Ig: 4 nC / 1 A = 4 ns (Graovac, Pürschel and Kiep, section 3)
    assert CCM_STAGE.transition_time_s == pytest.approx(4e-9)


def test_single_blas_thread_restores_the_thread_counts():
    # common practice, no published source: small-matrix work runs best on one BLAS thread;
    # the setting must not leak out of the solver.
    from partpick.verify.blas import _controls, single_blas_thread

    with single_blas_thread():
        controls = _controls()
        inside = [int(get()) for get, _ in controls]
    if not controls:
        pytest.skip("no OpenBLAS loaded in this process")
    before = [int(get()) for get, _ in controls]
    with single_blas_thread():
        assert inside == [1] * len(controls)
    assert [int(get()) for get, _ in controls] == before
