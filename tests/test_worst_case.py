"""Worst case at the part: inductance at its tolerance, the switch voltage with the diode drop,
and the light-load DCM figures worst over the whole input range.

Specs are invented. Every expected value is worked by hand or by an independent brute-force
scan below, never taken from the code under test.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from partpick.design.spec import Spec
from partpick.design.topologies.boost import build_envelope
from partpick.design.topologies.boost_envelope import recommended_inductance_h
from partpick.errors import SpecError

# IEC 60063 E12 mantissas
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)


def make_spec(**changes) -> Spec:
    values = dict(
        vin_min_v=6.0, vin_max_v=8.4, vout_v=24.0, iout_a=0.8, fsw_hz=400e3,
        vout_ripple_v=0.12, efficiency=0.85, ambient_max_degc=60.0,
    )  # fmt: skip
    values.update(changes)
    return Spec(**values)


# --- the recommended value at its tolerance ---------------------------------------------------


@pytest.mark.parametrize(
    ("l_min_h", "l_max_h", "tolerance", "expected_h"),
    [
        # issue 10: l_min 9.8 µH; ±20 %: 10 µH → 8 µH and 12 µH → 9.6 µH are short, 15 µH → 12 µH
        (9.8e-6, 19.6e-6, 0.2, 15e-6),
        # an exact part: 10 µH itself (the textbook choice, IEC 60063 E12)
        (9.8e-6, 19.6e-6, 0.0, 10e-6),
        # ±10 %: 12 µH → 10.8 µH ≥ 9.8 µH
        (9.8e-6, 19.6e-6, 0.1, 12e-6),
        # ±30 %: needs L ≥ 14 µH → 15 µH (10.5 µH at tolerance)
        (9.8e-6, 19.6e-6, 0.3, 15e-6),
        # ±20 % in a narrow band: needs ≥ 12.25 µH, but 15 µH > 14 µH → none
        (9.8e-6, 14e-6, 0.2, None),
    ],
)
def test_recommended_value_reaches_l_min_at_its_tolerance(l_min_h, l_max_h, tolerance, expected_h):
    got = recommended_inductance_h(l_min_h, l_max_h, tolerance)
    assert got == (None if expected_h is None else pytest.approx(expected_h))


@settings(max_examples=200, deadline=None)
@given(
    l_min_h=st.floats(1e-7, 1e-3),
    width=st.floats(1.05, 4.0),
    tolerance=st.floats(0.0, 0.35),
)
def test_recommended_value_is_the_smallest_e12_that_holds(l_min_h, width, tolerance):
    # brute force over the E12 decades (IEC 60063): the smallest L with L·(1 − tol) ≥ l_min
    # and L ≤ l_max
    l_max_h = l_min_h * width
    values = [m * 10.0**e for e in range(-9, 0) for m in E12]
    fitting = [v for v in values if v * (1 - tolerance) >= l_min_h * (1 - 1e-9) and v <= l_max_h]
    got = recommended_inductance_h(l_min_h, l_max_h, tolerance)
    if not fitting:
        assert got is None
    else:
        assert got == pytest.approx(min(fitting), rel=1e-9)


def test_stress_uses_the_spec_tolerance():
    # inductor_tolerance 0.1: smallest E12 L with 0.9·L ≥ 9.797 µH is 12 µH (10.8 µH)
    env = build_envelope(make_spec(inductor_tolerance=0.1))
    assert env.value("l_recommended_h") == pytest.approx(12e-6)
    assert env.value("l_recommended_min_h") == pytest.approx(10.8e-6)
    # at 10.8 µH the peak is IL + ΔIL/2 at 6 V (TI SLVA372): 3.7647 + 4.725/(400e3·10.8e-6)/2
    assert env.value("il_peak_at_l_recommended_a") == pytest.approx(
        0.8 / 0.2125 + 6.0 * 0.7875 / (400e3 * 10.8e-6) / 2, rel=1e-4
    )


@pytest.mark.parametrize(("key", "value"), [("inductor_tolerance", 1.0), ("diode_vf_v", -0.1)])
def test_bad_tolerance_or_drop_is_refused(key, value):
    with pytest.raises(SpecError):
        make_spec(**{key: value})


# --- the switch voltage with the diode drop ---------------------------------------------------


@pytest.mark.parametrize(
    ("vout_v", "ripple_v", "vf_v", "expected_v"),
    [
        # the switch node is one diode drop above the output while the diode conducts
        # (Erickson & Maksimovic, 3rd ed., ch. 2): 24 + 0.12/2 + 0.47 = 24.53 V (issue 10)
        (24.0, 0.12, 0.47, 24.53),
        # a 5 V rail with a 0.4 V Schottky: 5 + 0.05/2 + 0.4 = 5.425 V, 8 % above 5.025 V
        (5.0, 0.05, 0.4, 5.425),
        # the textbook form without the drop
        (24.0, 0.12, 0.0, 24.06),
    ],
)
def test_switch_voltage_includes_the_diode_drop(vout_v, ripple_v, vf_v, expected_v):
    spec = make_spec(vin_min_v=3.0, vin_max_v=4.2, vout_v=vout_v, vout_ripple_v=ripple_v,
                     diode_vf_v=vf_v)  # fmt: skip
    env = build_envelope(spec)
    assert env.value("vsw_max_v") == pytest.approx(expected_v, rel=1e-12)
    assert env.value("vd_reverse_max_v") == pytest.approx(vout_v + ripple_v / 2, rel=1e-12)


# --- light-load DCM, worst over the grid --------------------------------------------------------


def brute_force_light_load(spec: Spec, l_h: float, points: int = 20001):
    """Scan Vin densely; per point solve the DCM duty by search in D, not by the closed form.

    Erickson & Maksimovic, 3rd ed., ch. 5: with K = 2L/(R·Ts), R = Vout/(η·Iout_min), the
    boost is in DCM where K < D(1 − D)²; there M(D) = (1 + √(1 + 4D²/K))/2. The duty that
    gives the needed ratio M = 1/(1 − D_ccm) is found on a fine D grid (M rises with D).
    """
    vin = np.linspace(spec.vin_min_v, spec.vin_max_v, points)
    d_ccm = 1 - vin * spec.efficiency / spec.vout_v
    r = spec.vout_v / (spec.efficiency * spec.iout_min_a)
    k = 2 * l_h * spec.fsw_hz / r
    dcm = k < d_ccm * (1 - d_ccm) ** 2
    d_grid = np.linspace(0.0, 1.0, 400001)[1:-1]
    m_of_d = (1 + np.sqrt(1 + 4 * d_grid**2 / k)) / 2
    m_needed = 1 / (1 - d_ccm)
    d_dcm = d_grid[np.clip(np.searchsorted(m_of_d, m_needed), 0, d_grid.size - 1)]
    duty = np.where(dcm, d_dcm, d_ccm)
    ratio = np.where(dcm, (1 + np.sqrt(1 + 4 * d_ccm**2 / k)) / 2, m_needed)
    return vin, duty, ratio


@pytest.mark.parametrize(
    "changes",
    [
        # issue 10's shape: a 1-cell lithium pack boosted to 5 V (invented figures)
        dict(vin_min_v=3.0, vin_max_v=4.2, vout_v=5.0, iout_a=1.0, iout_min_a=0.05,
             fsw_hz=500e3, vout_ripple_v=0.05, efficiency=0.9),
        # the field logger at 50 mA
        dict(iout_min_a=0.05),
        # a wide input range that crosses D = 1/3 (K_crit's peak) in the middle
        dict(vin_min_v=9.0, vin_max_v=20.0, vout_v=24.0, iout_a=1.0, iout_min_a=0.02,
             efficiency=0.95),
    ],
)  # fmt: skip
def test_light_load_figures_are_the_worst_over_the_grid(changes):
    spec = make_spec(**changes)
    env = build_envelope(spec)
    vin, duty, ratio = brute_force_light_load(spec, env.value("l_min_h"))
    assert env.ccm_light_load is False
    span = spec.vin_max_v - spec.vin_min_v
    fig_ratio, fig_duty = env.figures["dcm_ratio_light_load"], env.figures["duty_light_load_dcm"]
    assert fig_ratio.value == pytest.approx(ratio.max(), rel=1e-4)
    assert fig_ratio.worst_vin_v == pytest.approx(vin[np.argmax(ratio)], abs=span / 500)
    assert fig_duty.value == pytest.approx(duty.min(), rel=1e-4)
    assert fig_duty.worst_vin_v == pytest.approx(vin[np.argmin(duty)], abs=span / 500)
    on_time = env.figures["on_time_light_load_min_s"]
    assert on_time.value == pytest.approx(duty.min() / spec.fsw_hz, rel=1e-4)


def test_light_load_worst_is_not_at_the_k_crit_peak():
    # issue 10: in a 3-4.2 V -> 5 V design the old figures sat at the K_crit peak; the
    # smallest duty is at 4.2 V and the largest ratio at 3 V (E&M ch. 5: M rises with D
    # at fixed K; the needed duty falls as Vin rises)
    spec = make_spec(vin_min_v=3.0, vin_max_v=4.2, vout_v=5.0, iout_a=1.0, iout_min_a=0.05,
                     fsw_hz=500e3, vout_ripple_v=0.05, efficiency=0.9)  # fmt: skip
    env = build_envelope(spec)
    assert env.figures["duty_light_load_dcm"].worst_vin_v == pytest.approx(4.2)
    assert env.figures["dcm_ratio_light_load"].worst_vin_v == pytest.approx(3.0)
    assert any("4.2 V" in w.text and "3 V" in w.text for w in env.warnings)
