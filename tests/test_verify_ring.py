"""The DCM switch-node ring and the C_oss loss it sets, against outside references.

References used here:
* Nilsson & Riedel, Electric Circuits, ch. 8: natural and step response of the series RLC
  circuit (α = R/(2L), ω0 = 1/√(LC), ω_d = √(ω0² − α²)).
* Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5: the switch node
  rings about Vin while the inductor current is zero in DCM; with Vout > 2·Vin the ring
  reaches ground and the body diode gives a zero-voltage turn-on.
* scipy.integrate.solve_ivp, a general-purpose reference integrator, on the series RLC
  equations written out below from Kirchhoff's laws.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from partpick.verify.ringing import (
    dcm_clamp_interval_s,
    dcm_ring_first_valley_v,
    dcm_ring_node_voltage_v,
    dcm_turn_on_node_voltage_v,
)
from partpick.verify.stage import Stage
from partpick.verify.steady_state import steady_state

# A ring with visible damping: L = 10 µH, C = 1 nF, R = 20 Ω, so α = R/(2L) = 1e6 1/s,
# ω0 = 1/√(1e-14) = 1e7 rad/s, ω_d = √(1e14 − 1e12) = 9.949874e6 rad/s (ζ = α/ω0 = 0.1).
L_H, C_F, R_OHM = 10e-6, 1e-9, 20.0
OMEGA_D = 9.949874371e6
VIN_V, V0_V = 6.0, 24.4  # node starts at 24.4 V, 18.4 V above the input

# An invented 100 kHz stage with a Schottky (no Qrr) so that the only formula loss that
# depends on the mode is C_oss (SI units).
STAGE = Stage(
    inductance_h=10e-6,
    dcr_ohm=0.05,
    rds_on_ohm=0.02,
    hot_factor=1.5,
    diode_vf_v=0.4,
    diode_rd_ohm=0.02,
    cout_f=10e-6,
    esr_ohm=0.01,
    output_count=2,
    fsw_hz=100e3,
    qgd_c=4e-9,
    coss_f=200e-12,
    gate_drive_a=1.0,
    qrr_c=0.0,
)


def _ring(t_s, resistance_ohm=R_OHM):
    return dcm_ring_node_voltage_v(VIN_V, V0_V, L_H, C_F, resistance_ohm, t_s)


# ---------------------------------------------------------------- hand-worked RLC values


@pytest.mark.parametrize(
    ("t_s", "resistance_ohm", "expected_v"),
    [
        # t = 0: the node is where the diode left it, V0 = 24.4 V
        (0.0, R_OHM, 24.4),
        # t = π/ω_d, the first valley: Vin − ΔV·e^(−απ/ω_d); απ/ω_d = π·1e6/9.949874e6
        # = 0.315742, e^(−0.315742) = 0.729248, 18.4·0.729248 = 13.41816 → 6 − 13.41816
        # = −7.41816 V (the bare ring; no clamp here)
        (math.pi / OMEGA_D, R_OHM, -7.41816),
        # t = 2π/ω_d, the next crest: Vin + ΔV·e^(−2απ/ω_d) = 6 + 18.4·0.531802 = 6 + 9.78516
        # = 15.78516 V
        (2.0 * math.pi / OMEGA_D, R_OHM, 15.78516),
        # t = π/(2ω_d): cos = 0, sin = 1, so v − Vin = ΔV·e^(−απ/(2ω_d))·α/ω_d
        # = 18.4·0.853960·0.100504 = 1.57920 V → 7.57920 V (the term that keeps i(0) = 0)
        (math.pi / (2.0 * OMEGA_D), R_OHM, 7.57920),
        # critically damped, R = 2√(L/C) = 200 Ω, α = ω0 = 1e7: at t = 1/α,
        # v − Vin = ΔV·(1 + 1)·e^(−1) = 18.4·0.735759 = 13.53796 V → 19.53796 V
        (1e-7, 200.0, 19.53796),
        # lossless, R = 0: a pure cosine, at t = π/ω0 = 314.159 ns the node is at
        # Vin − ΔV = 6 − 18.4 = −12.4 V
        (math.pi * 1e-7, 0.0, -12.4),
    ],
)
def test_ring_matches_the_series_rlc_step_response(t_s, resistance_ohm, expected_v):
    # Nilsson & Riedel, Electric Circuits, ch. 8: series RLC step response with v(0) = V0,
    # i(0) = 0: v = Vin + ΔV·e^(−αt)·(cos ω_d t + (α/ω_d)·sin ω_d t), and (1 + αt)·e^(−αt)
    # when critically damped.
    assert float(_ring(t_s, resistance_ohm)) == pytest.approx(expected_v, abs=1e-4)


def test_first_valley_is_the_damped_overshoot():
    # Nilsson & Riedel, Electric Circuits, ch. 8: the first turning point at t = π/ω_d lies
    # ΔV·e^(−απ/ω_d) below Vin: 6 − 13.41816 = −7.41816 V (hand-worked above).
    assert float(dcm_ring_first_valley_v(VIN_V, V0_V, L_H, C_F, R_OHM)) == pytest.approx(
        -7.41816, abs=1e-4
    )
    # overdamped (R = 500 Ω > 2√(L/C) = 200 Ω): no overshoot, the node only settles to Vin
    assert float(dcm_ring_first_valley_v(VIN_V, V0_V, L_H, C_F, 500.0)) == VIN_V


# ---------------------------------------------------------------- against the integrator


def _series_rlc(resistance_ohm: float):
    """Kirchhoff: L di/dt = Vin − R i − v, C dv/dt = i (i flows from Vin into the node)."""

    def laws(_t, x):
        current, node = x
        return [(VIN_V - resistance_ohm * current - node) / L_H, current / C_F]

    return laws


@pytest.mark.parametrize(
    "resistance_ohm",
    [
        0.05,  # a winding resistance: barely damped (ζ = 2.5e-4)
        20.0,  # ζ = 0.1
        200.0,  # critically damped
        500.0,  # overdamped, ζ = 2.5
        5000.0,  # heavily overdamped, ζ = 25
    ],
)
def test_ring_matches_the_reference_integrator(resistance_ohm):
    # scipy.integrate.solve_ivp (DOP853, rtol 1e-11) on the series RLC circuit from
    # v(0) = V0, i(0) = 0, over five undamped periods (2π/ω0 = 628 ns each).
    times = np.linspace(0.0, 5.0 * 2.0 * math.pi * 1e-7, 201)
    reference = solve_ivp(
        _series_rlc(resistance_ohm),
        (0.0, times[-1]),
        [0.0, V0_V],
        method="DOP853",
        rtol=1e-11,
        atol=1e-12,
        t_eval=times,
    )
    assert reference.success
    np.testing.assert_allclose(_ring(times, resistance_ohm), reference.y[1], rtol=0, atol=1e-6)


# ---------------------------------------------------------------- the body-diode clamp


def _clamped_ring_reference(vin_v, v_start_v, inductance_h, capacitance_f, resistance_ohm, t_end_s):
    """Brute force: solve_ivp on the node capacitor with an ideal body-diode clamp at 0 V.

    Kirchhoff as in :func:`_series_rlc`; while the node sits at 0 V the diode carries the
    inductor current, L di/dt = Vin − R i, until that current returns to zero. Events stop
    each stage exactly where the diode starts and stops conducting. Returns v(t_end).
    """

    def ring(_t, x):
        current, node = x
        return [(vin_v - resistance_ohm * current - node) / inductance_h, current / capacitance_f]

    def clamp(_t, x):
        return [(vin_v - resistance_ohm * x[0]) / inductance_h, 0.0]

    def reaches_ground(_t, x):
        return x[1]

    def diode_stops(_t, x):
        return x[0]

    reaches_ground.terminal, reaches_ground.direction = True, -1.0
    diode_stops.terminal, diode_stops.direction = True, 1.0
    options = {"method": "DOP853", "rtol": 1e-11, "atol": 1e-13}
    t, state, clamped = 0.0, [0.0, v_start_v], False
    while t < t_end_s:
        laws, event = (clamp, diode_stops) if clamped else (ring, reaches_ground)
        run = solve_ivp(laws, (t, t_end_s), state, events=event, **options)
        assert run.success
        t, state = float(run.t[-1]), [float(run.y[0, -1]), float(run.y[1, -1])]
        if run.status != 1:  # no event: the end was reached
            break
        state = [0.0, 0.0] if clamped else [state[0], 0.0]
        clamped = not clamped
    return state[1]


@pytest.mark.parametrize(
    "t_s",
    [
        # before the ring reaches ground (a quarter period: 7.579 V, hand-worked above)
        math.pi / (2.0 * OMEGA_D),
        # the first valley (−7.418 V unclamped): the body diode holds the node at 0 V
        math.pi / OMEGA_D,
        # the next crest of the bare ring (15.785 V): by now the clamp has ended and the
        # node rings again about Vin from ground
        2.0 * math.pi / OMEGA_D,
        3.0 * math.pi / OMEGA_D,
        7.3 * math.pi / OMEGA_D,
    ],
)
def test_ring_below_ground_follows_the_clamp_and_rings_again(t_s):
    # Erickson & Maksimovic, ch. 5: with V0 > 2·Vin the first valley Vin − ΔV·e^(−απ/ω_d)
    # (−7.418 V here) is below ground, so the body diode conducts; it conducts only until
    # the reversed inductor current is back at zero, after which the node rings about Vin
    # from 0 V. Reference: scipy.integrate.solve_ivp with an ideal diode clamp.
    expected = _clamped_ring_reference(VIN_V, V0_V, L_H, C_F, R_OHM, t_s)
    got = float(dcm_turn_on_node_voltage_v(VIN_V, V0_V, L_H, C_F, R_OHM, t_s))
    assert got == pytest.approx(expected, abs=1e-5)


def test_turn_on_with_no_idle_time_sees_the_ccm_voltage():
    # Erickson & Maksimovic, ch. 5: at the CCM/DCM boundary the node has not moved from V0
    assert float(dcm_turn_on_node_voltage_v(VIN_V, V0_V, L_H, C_F, R_OHM, 0.0)) == V0_V


def test_clamp_lasts_about_l_times_current_over_vin():
    # the clamp: L di/dt = Vin − R i from i_g < 0 to 0 takes (L/R)·ln(1 + R|i_g|/Vin),
    # ≈ L·|i_g|/Vin for a small R (Erickson & Maksimovic, the resonant-transition analysis)
    t_ground, clamp_s = dcm_clamp_interval_s(VIN_V, V0_V, L_H, C_F, 0.05)
    reference = _clamped_ring_reference(VIN_V, V0_V, L_H, C_F, 0.05, t_ground + 0.5 * clamp_s)
    assert reference == pytest.approx(0.0, abs=1e-9)  # still clamped half-way through
    # the energy the ring had below ground, ½·L·i_g² = ½·C·((V0−Vin)² − Vin²) without loss:
    # i_g = √(C/L)·√(18.4² − 6²) = 0.01·17.394 = 0.17394 A, t_c ≈ 10 µH·0.17394/6 = 289.9 ns
    assert clamp_s == pytest.approx(289.9e-9, rel=0.01)


def test_ring_above_ground_is_not_clamped():
    # Erickson & Maksimovic, ch. 5: with V0 < 2·Vin the valley stays above ground. Vin = 12 V,
    # V0 = 18 V: at t = π/ω_d the node is 12 − 6·0.729248 = 7.62451 V (ζ = 0.1 as above).
    v_on = dcm_turn_on_node_voltage_v(12.0, 18.0, L_H, C_F, R_OHM, math.pi / OMEGA_D)
    assert float(v_on) == pytest.approx(7.62451, abs=1e-4)


def test_turn_on_voltage_takes_arrays():
    # common practice, no published source: equation functions broadcast over numpy arrays
    t_s = np.array([0.0, math.pi / (2.0 * OMEGA_D), math.pi / OMEGA_D])
    v_on = dcm_turn_on_node_voltage_v(VIN_V, V0_V, L_H, C_F, R_OHM, t_s)
    # the three values hand-worked above: V0, the quarter-period value, the clamp
    np.testing.assert_allclose(v_on, [24.4, 7.57920, 0.0], atol=1e-4)
    assert v_on.shape == (3,)


# ---------------------------------------------------------------- in the steady-state model


def _boundary_duty(stage: Stage, vin_v: float, load_ohm: float, low: float, high: float):
    """Bisect the open-loop duty where the mode changes between ``low`` and ``high``."""
    low_mode = steady_state(stage, vin_v, load_ohm, duty=low).mode
    assert steady_state(stage, vin_v, load_ohm, duty=high).mode != low_mode
    for _ in range(40):
        middle = 0.5 * (low + high)
        if steady_state(stage, vin_v, load_ohm, duty=middle).mode == low_mode:
            low = middle
        else:
            high = middle
    return low, high


@pytest.mark.parametrize(
    ("vin_v", "load_ohm", "low", "high"),
    [
        # Erickson & Maksimovic, ch. 5: DCM where K = 2L/(R·Ts) < D(1 − D)². With L = 10 µH,
        # Ts = 10 µs and R = 20.83 Ω, K = 0.096 = 0.6·0.4², so the upper boundary lies near
        # D = 0.6 (Vout ≈ 2.5·Vin: the ring reaches ground) ...
        (12.0, 20.83, 0.5, 0.75),
        # ... and the lower one near D = 0.126 (0.126·0.874² = 0.0962; Vout ≈ 1.15·Vin: the
        # ring stays above ground)
        (12.0, 20.83, 0.05, 0.3),
    ],
)
def test_coss_loss_is_continuous_across_the_ccm_dcm_boundary(vin_v, load_ohm, low, high):
    # Erickson & Maksimovic, ch. 5: at the CCM/DCM boundary the idle interval is zero, so the
    # node has not moved from vo + V_F and the switch discharges C_oss from there in both
    # modes. The old model put the DCM node at Vin and jumped by ½·C_oss·((vo + V_F)² − Vin²)·f;
    # at D ≈ 0.6 that is about ½·200 pF·(30.4² − 12²)·100 kHz ≈ 7.8 mW.
    d_low, d_high = _boundary_duty(STAGE, vin_v, load_ohm, low, high)
    below = steady_state(STAGE, vin_v, load_ohm, duty=d_low)
    above = steady_state(STAGE, vin_v, load_ohm, duty=d_high)
    assert {below.mode, above.mode} == {"ccm", "dcm"}
    node_v = below.vout_avg_v + STAGE.diode_vf_v
    old_jump_w = 0.5 * STAGE.coss_f * (node_v**2 - vin_v**2) * STAGE.fsw_hz
    assert old_jump_w > 1e-4  # the old model's step is a real one at both boundaries
    # P_Coss = ½·C_oss·V²·f (Graovac, Pürschel and Kiep, section 3) on both sides
    assert abs(above.losses_w["coss"] - below.losses_w["coss"]) < 0.01 * old_jump_w
    assert abs(above.total_loss_w - below.total_loss_w) < 0.01 * old_jump_w


# An invented stage close to the demo's: 15 µH, 420 pF of C_oss and 100 pF of diode C_j
DEMO_LIKE = replace(STAGE, inductance_h=15e-6, dcr_ohm=0.0165, coss_f=420e-12, cj_f=100e-12,
                    fsw_hz=400e3, cout_f=4.8e-6, output_count=3)  # fmt: skip


@pytest.mark.parametrize("iout_a", [0.02, 0.035, 0.06])
def test_dcm_turn_on_loss_matches_a_brute_force_ring_at_three_loads(iout_a):
    # Three regulated DCM points, 6 V to 24 V (Vout > 2·Vin, so the ring reaches ground).
    # Reference: scipy.integrate.solve_ivp on the node capacitor C_oss + C_j with an ideal
    # body-diode clamp, run over the idle interval the model solved from V0 = vo + V_F,
    # i = 0 (Erickson & Maksimovic, ch. 5); then ½·C·v_on²·f for each capacitance
    # (Graovac, Pürschel and Kiep, section 3; Erickson & Maksimovic ch. 4, device
    # capacitances).
    result = steady_state(DEMO_LIKE, 6.0, 24.0 / iout_a, vout_v=24.0)
    assert result.mode == "dcm"
    idle = result.orbit.segments[-1]
    v_start = float(result.orbit.circuit.vout_rows["idle"] @ idle.z_start) + DEMO_LIKE.diode_vf_v
    node_f = DEMO_LIKE.coss_f + DEMO_LIKE.cj_f
    v_on = _clamped_ring_reference(
        6.0, v_start, DEMO_LIKE.inductance_h, node_f, DEMO_LIKE.dcr_ohm, idle.duration_s
    )
    assert result.switch_node_turn_on_v == pytest.approx(v_on, abs=1e-4)
    half_v2_f = 0.5 * v_on**2 * DEMO_LIKE.fsw_hz
    assert result.losses_w["coss"] == pytest.approx(
        DEMO_LIKE.coss_f * half_v2_f, rel=1e-4, abs=1e-9
    )
    assert result.losses_w["diode_cj"] == pytest.approx(
        DEMO_LIKE.cj_f * half_v2_f, rel=1e-4, abs=1e-9
    )
    assert result.pin_w == pytest.approx(result.pout_w + result.total_loss_w, rel=1e-3)


def test_a_long_idle_interval_ends_above_ground():
    # Erickson & Maksimovic, ch. 5: the body diode conducts only ≈ L·|i|/Vin, then the node
    # rings between 0 and 2·Vin, so over many idle intervals the switch mostly turns on
    # above 0 V (the old model held 0 V and booked no loss at all).
    turn_on = [
        steady_state(DEMO_LIKE, 6.0, 24.0 / i, vout_v=24.0).switch_node_turn_on_v
        for i in (0.02, 0.03, 0.04, 0.05, 0.06)
    ]
    assert max(turn_on) > 1.0 and max(turn_on) < 2.0 * 6.0 + 1e-6


def test_dcm_coss_loss_uses_the_node_voltage_the_ring_reaches():
    # scipy.integrate.solve_ivp on the series RLC (Vin, L with its DCR, C_oss), run over the
    # idle interval the model solved, from V0 = vo + V_F and i = 0 (Erickson & Maksimovic,
    # ch. 5); then P_Coss = ½·C_oss·v²·f (Graovac, Pürschel and Kiep, section 3). 12 V at
    # D = 0.1 into 200 Ω (K = 0.01 < 0.1·0.9² = 0.081: DCM) gives about 15 V out, below
    # 2·Vin, so the ring stays above ground and the node is neither at Vin nor at V0.
    vin_v = 12.0
    result = steady_state(STAGE, vin_v, 200.0, duty=0.1)
    assert result.mode == "dcm"
    idle = result.orbit.segments[-1]
    v_start = float(result.orbit.circuit.vout_rows["idle"] @ idle.z_start) + STAGE.diode_vf_v
    assert v_start < 2.0 * vin_v

    def laws(_t, x):
        current, node = x
        return [
            (vin_v - STAGE.dcr_ohm * current - node) / STAGE.inductance_h,
            current / STAGE.coss_f,
        ]

    ring = solve_ivp(
        laws, (0.0, idle.duration_s), [0.0, v_start], method="DOP853", rtol=1e-11, atol=1e-12
    )
    v_on = ring.y[1, -1]
    assert abs(v_on - vin_v) > 0.1 and abs(v_on - v_start) > 0.1
    expected_w = 0.5 * STAGE.coss_f * v_on**2 * STAGE.fsw_hz
    assert result.losses_w["coss"] == pytest.approx(expected_w, rel=1e-6)
    # conservation of energy, P_in = P_out + Σ losses, to 0.1 %
    assert result.pin_w == pytest.approx(result.pout_w + result.total_loss_w, rel=1e-3)


def test_no_output_capacitance_means_no_coss_loss():
    # P_Coss = ½·C_oss·V²·f (Graovac, Pürschel and Kiep, section 3): zero for C_oss = 0, in
    # DCM as in CCM, without dividing by the zero capacitance in the ring.
    result = steady_state(replace(STAGE, coss_f=0.0), 12.0, 200.0, duty=0.3)
    assert result.mode == "dcm"
    assert result.losses_w["coss"] == 0.0
