"""The boost CCM model: equations against published values, the envelope and per-part stresses."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.design.linemax import LineEnvelope
from partpick.design.spec import Spec
from partpick.design.topologies import analyse, get_topology
from partpick.design.topologies.boost import (
    boost_duty_cycle,
    ccm_conversion_ratio,
    ccm_k_critical,
    ccm_k_factor,
    critical_inductance_h,
    dcm_conversion_ratio,
    dcm_duty_cycle,
    diode_rms_current_a,
    esr_max_ohm,
    inductance_limits_h,
    inductor_average_current_a,
    inductor_peak_current_a,
    inductor_ripple_current_a,
    inductor_rms_current_a,
    input_capacitance_min_f,
    input_capacitor_rms_current_a,
    output_capacitance_min_f,
    output_capacitor_rms_current_a,
    output_ripple_voltage_v,
    switch_rms_current_a,
    vin_grid_v,
    worst_ripple_input_voltage_v,
)
from partpick.errors import SpecError

ISSUE_3_KEYS = [
    "duty_min", "duty_max", "l_min_h", "l_max_h", "l_recommended_h",
    "il_avg_max_a", "il_ripple_max_a", "il_peak_max_a", "il_rms_max_a",
    "isw_rms_max_a", "vsw_max_v", "id_avg_a", "id_peak_max_a", "vd_reverse_max_v",
    "icout_rms_max_a", "cout_min_f", "esr_max_ohm", "icin_rms_max_a",
]  # fmt: skip


def make_spec(**changes) -> Spec:
    """The invented field-logger spec (6.0-8.4 V to 24 V at 0.8 A, 400 kHz) with changes."""
    values = dict(
        vin_min_v=6.0, vin_max_v=8.4, vout_v=24.0, iout_a=0.8, fsw_hz=400e3,
        vout_ripple_v=0.12, efficiency=0.85, ambient_max_degc=60.0,
    )  # fmt: skip
    values.update(changes)
    return Spec(**values)


# --- Rashid, Power Electronics: Devices, Circuits and Applications, 4th ed., Example 5.6 -----
# Vs = 5 V, Va = 15 V, Ia = 0.5 A, f = 25 kHz, L = 150 µH, C = 220 µF, lossless (η = 1).
# By hand with the book's formulas:
#   k  = 1 - Vs/Va             = 1 - 5/15                 = 0.6667
#   Is = Ia/(1 - k)            = 0.5/0.3333               = 1.5 A
#   ΔI = Vs·k/(f·L)            = 5·0.6667/(25e3·150e-6)   = 3.3333/3.75 = 0.8889 A
#   I2 = Is + ΔI/2             = 1.5 + 0.4444             = 1.9444 A
#   ΔVc = Ia·k/(f·C)           = 0.5·0.6667/(25e3·220e-6) = 0.33333/5.5 = 0.0606 V
RASHID_K = boost_duty_cycle(5.0, 15.0, 1.0)


def test_rashid_5_6_duty_cycle():
    # Rashid, Power Electronics, 4th ed., Example 5.6
    assert RASHID_K == pytest.approx(0.6667, abs=1e-4)


def test_rashid_5_6_average_and_ripple_current():
    # Rashid, Power Electronics, 4th ed., Example 5.6
    assert inductor_average_current_a(0.5, RASHID_K) == pytest.approx(1.5, rel=1e-9)
    ripple = inductor_ripple_current_a(5.0, RASHID_K, 25e3, 150e-6)
    assert ripple == pytest.approx(0.889, abs=5e-4)


def test_rashid_5_6_peak_current():
    # Rashid, Power Electronics, 4th ed., Example 5.6
    ripple = inductor_ripple_current_a(5.0, RASHID_K, 25e3, 150e-6)
    peak = inductor_peak_current_a(inductor_average_current_a(0.5, RASHID_K), ripple)
    assert peak == pytest.approx(1.944, abs=5e-4)


def test_rashid_5_6_capacitor_ripple():
    # Rashid, Power Electronics, 4th ed., Example 5.6: ΔVc ≈ 60.6 mV
    assert output_ripple_voltage_v(0.5, RASHID_K, 25e3, 220e-6) == pytest.approx(60.6e-3, abs=1e-4)
    # The same relation solved for C gives the book's 220 µF back at 60.6 mV.
    ripple_v = 0.5 * (2 / 3) / (25e3 * 220e-6)
    assert output_capacitance_min_f(0.5, RASHID_K, 25e3, ripple_v) == pytest.approx(220e-6)


# --- Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5 ----------------


def test_k_critical_peaks_at_4_27_for_d_one_third():
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5:
    # d/dD [D(1-D)²] = (1-D)(1-3D) = 0 at D = 1/3, where K_crit = (1/3)(2/3)² = 4/27.
    duty = np.linspace(0.0, 1.0, 300_001)
    kcrit = ccm_k_critical(duty)
    assert kcrit.max() == pytest.approx(4 / 27, rel=1e-9)
    assert duty[np.argmax(kcrit)] == pytest.approx(1 / 3, abs=1e-5)
    assert ccm_k_critical(1 / 3) == pytest.approx(4 / 27, rel=1e-12)


@pytest.mark.parametrize("duty", [0.1, 1 / 3, 0.5, 0.633, 0.8, 0.95])
def test_dcm_ratio_meets_the_ccm_ratio_at_the_boundary(duty):
    # Erickson & Maksimovic, 3rd ed., ch. 5: at K = K_crit(D),
    # M = (1 + √(1 + 4D/(1-D)²))/2 = (1 + (1+D)/(1-D))/2 = 1/(1-D).
    at_boundary = dcm_conversion_ratio(duty, ccm_k_critical(duty))
    assert at_boundary == pytest.approx(1 / (1 - duty), rel=1e-12)
    # Deeper in DCM (smaller K) the same duty gives a higher ratio (E&M ch. 5, fig. of M vs D).
    assert dcm_conversion_ratio(duty, ccm_k_critical(duty) / 4) > 1 / (1 - duty)


@pytest.mark.parametrize(("ratio", "k_factor"), [(2.0, 0.05), (3.5, 0.01), (1.2, 0.1)])
def test_dcm_duty_inverts_the_dcm_ratio(ratio, k_factor):
    # Erickson & Maksimovic, 3rd ed., ch. 5: M(D, K) solved for D is D = √(K·M·(M-1)).
    duty = dcm_duty_cycle(ratio, k_factor)
    assert dcm_conversion_ratio(duty, k_factor) == pytest.approx(ratio, rel=1e-12)


def test_boost_critical_inductance_worked_value():
    # Erickson & Maksimovic ch. 5 worked value, from memory: Vs = 110 V, Vo = 300 V,
    # Po = 110 W, f = 50 kHz -> D ≈ 0.633, L_crit ≈ 0.70 mH.
    # By hand: D = 1 - 110/300 = 0.6333; R = 300²/110 = 818.2 Ω;
    # K_crit = 0.6333·0.3667² = 0.08515; L_crit = 0.08515·818.2/(2·50e3) = 0.697 mH.
    duty = boost_duty_cycle(110.0, 300.0, 1.0)
    assert duty == pytest.approx(0.633, abs=5e-4)
    load_ohm = 300.0**2 / 110.0
    assert critical_inductance_h(duty, load_ohm, 50e3) == pytest.approx(0.70e-3, rel=0.01)
    # At L_crit, K = 2L/(R·Ts) equals K_crit by definition (E&M ch. 5).
    l_crit = critical_inductance_h(duty, load_ohm, 50e3)
    assert ccm_k_factor(l_crit, load_ohm, 50e3) == pytest.approx(ccm_k_critical(duty))


# --- The ideal relation Vout = Vin/(1 - D) at η = 1 (common practice, no published source) ---


@pytest.mark.parametrize(("vin", "duty", "vout"), [(12.0, 0.5, 24.0), (3.6, 0.7, 12.0)])
def test_ideal_boost_relation(vin, duty, vout):
    # common practice, no published source: Vout = Vin/(1 - D)
    assert vin * ccm_conversion_ratio(duty) == pytest.approx(vout, rel=1e-12)
    assert boost_duty_cycle(vin, vout, 1.0) == pytest.approx(duty, rel=1e-12)


def test_efficiency_raises_the_duty():
    # Texas Instruments SLVA372: D = 1 - Vin·η/Vout; 12 V to 24 V at η = 0.9:
    # D = 1 - 12·0.9/24 = 1 - 0.45 = 0.55.
    assert boost_duty_cycle(12.0, 24.0, 0.9) == pytest.approx(0.55, rel=1e-12)


# --- RMS identities and brute-force RMS of the sampled piecewise-linear waveforms -----------


def sampled_waveforms(duty: float, il_avg: float, ripple: float, samples: int = 400_000):
    """Return one period of the boost currents (inductor, switch, diode, Cout, Cin), sampled."""
    t = (np.arange(samples) + 0.5) / samples  # midpoints: exact mean of a straight segment
    rising = il_avg - ripple / 2 + ripple * t / duty
    falling = il_avg + ripple / 2 - ripple * (t - duty) / (1 - duty)
    on = t < duty
    inductor = np.where(on, rising, falling)
    iout = (1 - duty) * il_avg  # charge balance on the output capacitor
    diode = np.where(on, 0.0, inductor)
    return {
        "inductor": inductor,
        "switch": np.where(on, inductor, 0.0),
        "diode": diode,
        "cout": diode - iout,
        "cin": inductor - il_avg,
        "iout": iout,
    }


def rms(wave: np.ndarray) -> float:
    return float(np.sqrt(np.mean(wave**2)))


@pytest.mark.parametrize(
    ("duty", "il_avg", "ripple"), [(0.6, 2.5, 1.2), (0.2, 1.0, 1.8), (0.85, 7.0, 0.5)]
)
def test_rms_formulas_match_brute_force(duty, il_avg, ripple):
    # Erickson & Maksimovic, 3rd ed., ch. 2: the RMS of each switched piecewise-linear current,
    # checked against a numeric RMS of the sampled waveform.
    waves = sampled_waveforms(duty, il_avg, ripple)
    iout = waves["iout"]
    assert inductor_rms_current_a(il_avg, ripple) == pytest.approx(rms(waves["inductor"]), 1e-6)
    assert switch_rms_current_a(duty, il_avg, ripple) == pytest.approx(rms(waves["switch"]), 1e-4)
    assert diode_rms_current_a(duty, il_avg, ripple) == pytest.approx(rms(waves["diode"]), 1e-4)
    assert output_capacitor_rms_current_a(duty, il_avg, ripple, iout) == pytest.approx(
        rms(waves["cout"]), 1e-4
    )
    assert input_capacitor_rms_current_a(ripple) == pytest.approx(rms(waves["cin"]), 1e-6)


@pytest.mark.parametrize("duty", [0.25, 0.5, 0.75])
def test_rms_limits_without_ripple(duty):
    # Erickson & Maksimovic, 3rd ed., ch. 2: as ΔIL -> 0 the switch carries IL for D·Ts,
    # so I_sw,rms = √D·IL, and I_Cout,rms = √(D·Iout² + (1-D)(IL - Iout)²) = Iout·√(D/(1-D)).
    iout = 1.5
    il_avg = iout / (1 - duty)
    assert switch_rms_current_a(duty, il_avg, 0.0) == pytest.approx(math.sqrt(duty) * il_avg)
    expected = iout * math.sqrt(duty / (1 - duty))
    assert output_capacitor_rms_current_a(duty, il_avg, 0.0, iout) == pytest.approx(expected)
    waves = sampled_waveforms(duty, il_avg, 1e-9)
    assert rms(waves["cout"]) == pytest.approx(expected, rel=1e-4)
    assert rms(waves["switch"]) == pytest.approx(math.sqrt(duty) * il_avg, rel=1e-4)


# --- SLVA372 forms, hand-worked for the invented field-logger spec --------------------------
# 6.0-8.4 V to 24 V at 0.8 A, 400 kHz, η = 0.85, ripple band [0.2, 0.4], 120 mV ripple:
#   D_max = 1 - 6.0·0.85/24 = 0.7875;  D_min = 1 - 8.4·0.85/24 = 0.7025
#   IL(6 V) = 0.8/0.2125 = 3.7647 A
#   Vin* = 24/(2·0.85) = 14.1 V -> clamped to 8.4 V; Vin*·D* = 8.4·0.7025 = 5.901 V
#   l_min = 5.901/(400e3·0.4·3.7647) = 9.797 µH; l_max = twice that = 19.59 µH
#   ripple at l_min = 0.4·3.7647 = 1.5059 A (at 8.4 V)
#   ΔIL(6 V) = 6·0.7875/(400e3·9.797e-6) = 1.2058 A -> peak(6 V) = 3.7647 + 0.6029 = 4.3676 A
#   C_out,min = 0.8·0.7875/(400e3·0.12) = 13.125 µF; ESR_max = 0.12/4.3676 = 27.47 mΩ
#   V_sw = V_d = 24 + 0.06 = 24.06 V


def test_envelope_of_the_field_logger():
    # Texas Instruments SLVA372 forms, hand-worked above, at the note's own assumptions: an
    # exact inductor (no tolerance) and no diode drop in the switch voltage
    env = analyse(make_spec(inductor_tolerance=0.0, diode_vf_v=0.0))
    expected = {
        "duty_max": 0.7875, "duty_min": 0.7025, "il_avg_max_a": 3.7647,
        "l_min_h": 9.797e-6, "l_max_h": 19.594e-6, "il_ripple_max_a": 1.5059,
        "il_peak_max_a": 4.3676, "cout_min_f": 13.125e-6, "esr_max_ohm": 27.47e-3,
        "vsw_max_v": 24.06, "vd_reverse_max_v": 24.06, "id_avg_a": 0.8, "id_peak_max_a": 4.3676,
        "vin_star_v": 8.4, "l_recommended_h": 10e-6,
    }  # fmt: skip
    for key, value in expected.items():
        assert env.value(key) == pytest.approx(value, rel=2e-4), key
    assert env.figures["il_peak_max_a"].worst_vin_v == pytest.approx(6.0)
    assert env.figures["il_ripple_max_a"].worst_vin_v == pytest.approx(8.4)
    assert env.ccm is True


def test_worst_ripple_point_inside_the_range():
    # Vin·D = Vin - η·Vin²/Vout is largest at Vout/(2η) (SLVA372 duty and ripple forms):
    # 5-15 V to 20 V at η = 1 -> Vin* = 10 V, D = 0.5, Vin·D = 5 V.
    assert worst_ripple_input_voltage_v(5.0, 15.0, 20.0, 1.0) == pytest.approx(10.0)
    spec = make_spec(vin_min_v=5.0, vin_max_v=15.0, vout_v=20.0, efficiency=1.0)
    l_min, _, vin_star = inductance_limits_h(spec)
    # IL(5 V) = 0.8/(5/20) = 3.2 A; l_min = 5/(400e3·0.4·3.2) = 9.766 µH
    assert vin_star == pytest.approx(10.0)
    assert l_min == pytest.approx(5 / (400e3 * 0.4 * 3.2), rel=1e-12)
    assert 10.0 in vin_grid_v(spec)


def test_peak_worst_point_is_not_always_vin_min():
    # Large ripple: 4-20 V to 24 V, 0.1 A, 100 kHz, η = 1, L = 2 µH. By hand,
    # peak(4 V) = 0.6 + (4 - 16/24)/(2·0.2) = 8.93 A, peak(12 V) = 0.2 + 6/0.4 = 15.2 A,
    # so the maximum is inside the range, near 12 V.
    spec = make_spec(vin_min_v=4.0, vin_max_v=20.0, vout_v=24.0, iout_a=0.1, fsw_hz=100e3,
                     efficiency=1.0, vout_ripple_v=0.1)  # fmt: skip
    stress = get_topology("boost").stresses_at(spec, np.array([2e-6]))
    assert 11.0 < stress.il_peak_vin_v[0] < 12.5
    assert stress.il_peak_a[0] > 15.2


def brute_force_peak_and_rms(spec: Spec, inductance_h: np.ndarray):
    """Return maxima over a dense Vin grid from a parts × grid array, independent of the model."""
    vin = np.linspace(spec.vin_min_v, spec.vin_max_v, 20_001)[None, :]
    duty = boost_duty_cycle(vin, spec.vout_v, spec.efficiency)
    il = inductor_average_current_a(spec.iout_a, duty)
    ripple = inductor_ripple_current_a(vin, duty, spec.fsw_hz, inductance_h[:, None])
    return {
        "il_peak_a": inductor_peak_current_a(il, ripple).max(axis=1),
        "il_rms_a": inductor_rms_current_a(il, ripple).max(axis=1),
        "isw_rms_a": switch_rms_current_a(duty, il, ripple).max(axis=1),
        "id_rms_a": diode_rms_current_a(duty, il, ripple).max(axis=1),
        "icout_rms_a": output_capacitor_rms_current_a(duty, il, ripple, spec.iout_a).max(axis=1),
        "icin_rms_a": input_capacitor_rms_current_a(ripple).max(axis=1),
        "il_ripple_a": ripple.max(axis=1),
    }


@pytest.mark.parametrize(
    "changes",
    [{}, dict(vin_min_v=4.0, vin_max_v=20.0, iout_a=0.1, fsw_hz=100e3, efficiency=1.0),
     dict(vin_min_v=3.0, vin_max_v=5.5, vout_v=12.0, iout_a=2.0)],
)  # fmt: skip
def test_stresses_at_match_a_brute_force_grid(changes):
    spec = make_spec(**changes)
    inductance = np.geomspace(0.5e-6, 1e-3, 60)
    stress = get_topology("boost").stresses_at(spec, inductance)
    for name, expected in brute_force_peak_and_rms(spec, inductance).items():
        np.testing.assert_allclose(getattr(stress, name), expected, rtol=1e-6, err_msg=name)


def test_stresses_at_keeps_shape_and_marks_bad_inductance():
    spec = make_spec()
    inductance = np.array([[10e-6, 0.0], [np.nan, -1e-6]])
    stress = get_topology("boost").stresses_at(spec, inductance)
    assert stress.il_peak_a.shape == (2, 2)
    assert np.isfinite(stress.il_peak_a[0, 0])
    assert np.isnan(stress.il_peak_a[[0, 1, 1], [1, 0, 1]]).all()
    assert np.isnan(stress.il_peak_vin_v[0, 1])


def test_envelope_figures_at_l_min_agree_with_stresses_at():
    spec = make_spec()
    env = analyse(spec)
    stress = get_topology("boost").stresses_at(spec, np.array([env.value("l_min_h")]))
    assert env.value("il_peak_max_a") == pytest.approx(stress.il_peak_a[0])
    assert env.value("icout_rms_max_a") == pytest.approx(stress.icout_rms_a[0])


# --- Envelope contents, cautions and warnings -------------------------------------------------


def test_envelope_has_every_issue_3_key_and_a_worst_vin():
    env = analyse(make_spec())
    for key in ISSUE_3_KEYS:
        assert key in env.figures, key
        assert env.figures[key].value is not None and math.isfinite(env.figures[key].value)
    assert env.figures["il_peak_max_a"].group == "inductor"
    assert env.figures["cout_min_f"].unit == "F"


def test_no_e12_value_in_a_narrow_window():
    # Vin = 5 V fixed, 10 V out, 1 A, η = 1: D = 0.5, IL = 2 A, Vin·D = 2.5 V.
    # fsw = 360.75 kHz, band [0.30, 0.33]: l_min = 2.5/(360.75e3·0.33·2) = 10.50 µH,
    # l_max = 2.5/(360.75e3·0.30·2) = 11.55 µH; IEC 60063 E12 has 10 µH and 12 µH only.
    spec = make_spec(vin_min_v=5.0, vin_max_v=5.0, vout_v=10.0, iout_a=1.0, fsw_hz=360.75e3,
                     efficiency=1.0, ripple_ratio_lo=0.30, ripple_ratio_hi=0.33)  # fmt: skip
    env = analyse(spec)
    assert env.value("l_min_h") == pytest.approx(10.50e-6, rel=1e-3)
    assert env.value("l_max_h") == pytest.approx(11.55e-6, rel=1e-3)
    assert env.figures["l_recommended_h"].value is None
    assert "no-standard-inductance" in [w.code for w in env.warnings]


@pytest.mark.parametrize(
    ("vout", "hazardous"), [(24.0, False), (59.0, False), (61.0, True), (100.0, True)]
)
def test_hazardous_voltage_caution_above_60_v(vout, hazardous):
    # IEC 62368-1, ES1 limit 60 V DC (the SELV value used with IEC 61140); the switch node
    # sees vout + 60 mV here, 59.06 V at 59 V out.
    env = analyse(make_spec(vout_v=vout))
    codes = [c.code for c in env.cautions]
    assert ("hazardous-voltage" in codes) is hazardous
    assert "qualified-engineer" in codes


def test_stored_energy_caution_states_half_c_v_squared():
    # E = ½·C·V² = 0.5·13.125e-6·24² = 3.78 mJ (C_out,min hand-worked above)
    env = analyse(make_spec())
    assert env.value("cout_energy_j") == pytest.approx(3.78e-3, rel=1e-9)
    text = next(c.text for c in env.cautions if c.code == "stored-energy")
    assert "3.78 mJ" in text


def test_high_duty_warning():
    # 2 V to 48 V at η = 0.85: D = 1 - 2·0.85/48 = 0.9646 > 0.9 (common practice limit)
    env = analyse(make_spec(vin_min_v=2.0, vin_max_v=3.0, vout_v=48.0))
    assert env.value("duty_max") == pytest.approx(0.96458, rel=1e-4)
    assert "high-duty" in [w.code for w in env.warnings]
    assert "high-duty" not in [w.code for w in analyse(make_spec()).warnings]


def test_envelope_at_tolerance_and_with_the_diode_drop():
    # the same design with a ±20 % inductor and a 0.7 V diode (the spec defaults; common
    # practice, no published source): the switch sees Vout + ΔVout/2 + VF = 24 + 0.06 + 0.7
    # = 24.76 V while the diode still blocks 24.06 V (Erickson & Maksimovic, 3rd ed., ch. 2:
    # the switch node is one diode drop above the output while the diode conducts)
    env = analyse(make_spec())
    assert env.value("vsw_max_v") == pytest.approx(24.76)
    assert env.value("vd_reverse_max_v") == pytest.approx(24.06)
    # smallest E12 L (IEC 60063) with 0.8·L ≥ 9.797 µH: 12 µH gives 9.6 µH (short), 15 µH
    # gives 12 µH; its ripple at 12 µH is Vin·D/(fsw·L) = 5.901/(400e3·12e-6) = 1.229 A
    # (TI SLVA372 ripple form at 8.4 V)
    assert env.value("l_recommended_h") == pytest.approx(15e-6)
    assert env.value("l_recommended_min_h") == pytest.approx(12e-6)
    assert env.value("il_ripple_at_l_recommended_a") == pytest.approx(1.2294, rel=1e-3)


def test_light_load_dcm_report():
    # Erickson & Maksimovic ch. 5 with R = Vout/(η·Iout_min): 50 mA -> R = 24/(0.85·0.05) = 564.7 Ω,
    # K = 2·9.797e-6·400e3/564.7 = 0.01388 < K_crit(0.7025) = 0.7025·0.2975² = 0.06218 -> DCM.
    env = analyse(make_spec(iout_min_a=0.05))
    assert env.ccm_light_load is False
    assert env.value("k_light_load") == pytest.approx(0.01388, rel=1e-3)
    # the largest M is at vin_min, D = 0.7875: M = (1 + √(1 + 4·0.7875²/0.01388))/2
    # = (1 + √179.7)/2 = 7.20
    assert env.dcm_ratio_light_load == pytest.approx(7.203, rel=2e-3)
    assert env.figures["dcm_ratio_light_load"].worst_vin_v == pytest.approx(6.0)
    # the smallest duty is at vin_max: M_ccm = 1/0.2975 = 3.361, D = √(K·M·(M−1))
    # = √(0.01388·3.361·2.361) = 0.332, an on-time of 0.332/400 kHz = 830 ns
    assert env.value("duty_light_load_dcm") == pytest.approx(0.3320, rel=2e-3)
    assert env.figures["duty_light_load_dcm"].worst_vin_v == pytest.approx(8.4)
    assert env.value("on_time_light_load_min_s") == pytest.approx(0.3320 / 400e3, rel=2e-3)
    assert "light-load-dcm" in [w.code for w in env.warnings]
    heavy = analyse(make_spec(iout_min_a=0.5))  # K = 0.1388 > 0.0622 -> still CCM
    assert heavy.ccm_light_load is True and heavy.dcm_ratio_light_load is None
    assert analyse(make_spec()).ccm_light_load is None


def test_full_load_dcm_is_flagged():
    # 2-20 V to 24 V with band [1.0, 1.9]: at 20 V, IL = 0.8·24/(0.85·20) = 1.13 A, while the
    # ripple sized for 1.9·IL(2 V) is far more than 2·IL there, so the valley reaches zero.
    env = analyse(make_spec(vin_min_v=2.0, vin_max_v=20.0, ripple_ratio_lo=1.0,
                            ripple_ratio_hi=1.9))  # fmt: skip
    assert env.ccm is False
    assert "full-load-dcm" in [w.code for w in env.warnings]


def test_unknown_topology():
    with pytest.raises(SpecError) as info:
        get_topology("flyback")
    assert info.value.key == "topology"


def test_to_dict_is_flat_si_json():
    data = analyse(make_spec()).to_dict()
    for key in [*ISSUE_3_KEYS, "ccm", "cautions"]:
        assert key in data, key
    assert data["ccm"] is True
    assert all(isinstance(text, str) for text in data["cautions"])
    assert data["spec"]["fsw_hz"] == 400e3
    assert data["worst_vin_v"]["il_peak_max_a"] == pytest.approx(6.0)


# --- Properties over random valid specs (hypothesis) ------------------------------------------


@st.composite
def valid_specs(draw) -> Spec:
    vin_min = draw(st.floats(1.0, 100.0))
    vin_max = vin_min * draw(st.floats(1.0, 3.0))
    vout = vin_max * draw(st.floats(1.05, 6.0))
    lo = draw(st.floats(0.05, 1.0))
    hi = min(lo * draw(st.floats(1.1, 3.0)), 1.95)
    return Spec(
        vin_min_v=vin_min, vin_max_v=vin_max, vout_v=vout,
        iout_a=draw(st.floats(0.01, 20.0)), fsw_hz=draw(st.floats(10e3, 3e6)),
        vout_ripple_v=vout * draw(st.floats(0.001, 0.05)),
        efficiency=draw(st.floats(0.5, 1.0)), ripple_ratio_lo=lo, ripple_ratio_hi=hi,
        iout_min_a=None,
    )  # fmt: skip


@settings(max_examples=60, deadline=None)
@given(valid_specs())
def test_properties_of_random_specs(spec):
    env = analyse(spec)
    l_min, l_max = env.value("l_min_h"), env.value("l_max_h")
    assert l_min <= l_max
    # The ripple at l_min equals hi·IL(vin_min), by the definition of l_min (issue 3).
    il_at_vin_min = spec.iout_a * spec.vout_v / (spec.efficiency * spec.vin_min_v)
    assert env.value("il_ripple_max_a") == pytest.approx(spec.ripple_ratio_hi * il_at_vin_min)
    assert env.value("il_peak_max_a") >= env.value("il_avg_max_a")
    stress = get_topology("boost").stresses_at(spec, np.array([l_min, l_max, 4 * l_max]))
    assert (stress.il_peak_a >= env.value("il_avg_max_a") * (1 - 1e-12)).all()
    assert (np.diff(stress.il_peak_a) <= 1e-12 * stress.il_peak_a[0]).all()  # more L, less peak


@settings(max_examples=40, deadline=None)
@given(valid_specs())
def test_ccm_verdict_matches_the_valley_current(spec):
    # CCM means the inductor current never reaches zero: IL - ΔIL/2 > 0 over the whole range.
    env = analyse(spec)
    vin = vin_grid_v(spec)
    duty = boost_duty_cycle(vin, spec.vout_v, spec.efficiency)
    il = inductor_average_current_a(spec.iout_a, duty)
    valley = il - inductor_ripple_current_a(vin, duty, spec.fsw_hz, env.value("l_min_h")) / 2
    margin = np.min(valley / il)
    if abs(margin) > 1e-9:
        assert env.ccm is bool(margin > 0)


def test_input_capacitance_with_vin_ripple():
    # Erickson & Maksimovic ch. 2: ΔV = ΔI/(8·f·C). 1.5059 A ripple, 400 kHz, 50 mV:
    # C = 1.5059/(8·400e3·0.05) = 9.41 µF.
    assert input_capacitance_min_f(1.5059, 400e3, 0.05) == pytest.approx(9.412e-6, rel=1e-3)
    env = analyse(make_spec(vin_ripple_v=0.05))
    assert env.value("cin_min_f") == pytest.approx(9.412e-6, rel=1e-3)
    assert "cin_min_f" not in analyse(make_spec()).figures


def test_esr_limit():
    # Texas Instruments SLVA372: ESR = ΔVout/(IL + ΔIL/2); 0.12 V/4.3676 A = 27.47 mΩ
    assert esr_max_ohm(0.12, 4.3676) == pytest.approx(27.475e-3, rel=1e-4)


@settings(max_examples=200, deadline=None)
@given(
    st.lists(st.tuples(st.floats(-10, 10), st.floats(0, 10)), min_size=1, max_size=40),
    st.lists(st.floats(0, 100), min_size=1, max_size=20),
)
def test_line_envelope_is_the_maximum_of_its_lines(lines, points):
    # The maximisation behind stresses_at, checked against evaluating every line.
    p = np.array([line[0] for line in lines])
    q = np.array([line[1] for line in lines])
    u = np.array(points)
    value, x = LineEnvelope.build(p, q, np.arange(len(p), dtype=float)).evaluate(u)
    brute = (p[None, :] + q[None, :] * u[:, None]).max(axis=1)
    np.testing.assert_allclose(value, brute, rtol=1e-12, atol=1e-12)
    chosen = x.astype(int)
    np.testing.assert_allclose(p[chosen] + q[chosen] * u, brute, rtol=1e-12, atol=1e-12)
