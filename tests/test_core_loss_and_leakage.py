"""Core loss by the iGSE, and a rectifier's leakage that heats its own junction.

References used here:
* K. Venkatachalam, C. R. Sullivan, T. Abdallah and H. Tacca, "Accurate prediction of ferrite
  core loss with nonsinusoidal waveforms using only Steinmetz parameters", IEEE COMPEL 2002:
  the iGSE, its coefficient k_i, its piecewise-linear form, and its defining property that
  for sinusoidal flux it gives back the Steinmetz equation P_v = k·f^α·B̂^β.
* Schottky leakage doubling about every 10 °C (from memory), and the steady junction
  Tj = T_amb + θJA·P (the one-resistor heat path of every data sheet).

Part numbers and figures are invented.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from partpick import losses
from partpick.verify.core_loss import core_loss_from_part, core_loss_w
from partpick.verify.thermal import leakage_with_self_heating

# An invented ferrite: k = 3.0 (W/m³ with f in Hz, B̂ in T), α = 1.45, β = 2.6
K, ALPHA, BETA = 3.0, 1.45, 2.6
FSW_HZ = 100e3


def _sine_vertices(amplitude: float, frequency_hz: float, count: int = 20000):
    times = np.linspace(0.0, 1.0 / frequency_hz, count + 1)
    return times, amplitude * np.sin(2.0 * math.pi * frequency_hz * times)


@pytest.mark.parametrize("peak_t", [0.02, 0.1, 0.25])
def test_igse_of_a_sinusoid_is_the_steinmetz_equation(peak_t):
    # Venkatachalam et al. 2002: k_i is chosen so that the iGSE of a sinusoid equals
    # k·f^α·B̂^β. A sinusoid drawn with 20,000 straight pieces is close enough to 1e-6.
    times, flux = _sine_vertices(peak_t, FSW_HZ)
    got = losses.igse_piecewise_linear_loss(K, ALPHA, BETA, times, flux)
    assert got == pytest.approx(K * FSW_HZ**ALPHA * peak_t**BETA, rel=1e-6)


@pytest.mark.parametrize("duty", [0.5, 0.2, 0.8])
def test_igse_of_a_triangle_is_its_published_closed_form(duty):
    # Venkatachalam et al. 2002, the two-segment piecewise-linear case:
    # P_v = k_i·ΔB^β·f^α·(D^(1−α) + (1 − D)^(1−α)), with
    # k_i = k / ((2π)^(α−1)·∫₀^2π |cos θ|^α·2^(β−α) dθ), the integral by quadrature here.
    integral, _ = quad(lambda theta: abs(math.cos(theta)) ** ALPHA, 0.0, 2.0 * math.pi, limit=200)
    k_i = K / ((2.0 * math.pi) ** (ALPHA - 1.0) * integral * 2.0 ** (BETA - ALPHA))
    swing_t, period = 0.1, 1.0 / FSW_HZ
    shape = duty ** (1 - ALPHA) + (1 - duty) ** (1 - ALPHA)
    expected = k_i * swing_t**BETA * FSW_HZ**ALPHA * shape
    times = [0.0, duty * period, period]
    got = losses.igse_piecewise_linear_loss(K, ALPHA, BETA, times, [0.0, swing_t, 0.0])
    assert got == pytest.approx(expected, rel=1e-9)
    # a flat rest (DCM's idle interval) adds nothing but time: the same swing done in the
    # first half of the period, then held, is the duty-0.5 triangle at twice the frequency
    # averaged over twice the time: the loss per period is the same, so half the power
    rest = losses.igse_piecewise_linear_loss(
        K, ALPHA, BETA, [0.0, 0.25 * period, 0.5 * period, period], [0.0, swing_t, 0.0, 0.0]
    )
    doubled = losses.igse_piecewise_linear_loss(
        K, ALPHA, BETA, [0.0, 0.25 * period, 0.5 * period], [0.0, swing_t, 0.0]
    )
    assert rest == pytest.approx(0.5 * doubled, rel=1e-12)


def test_catalog_material_data_becomes_a_current_referred_law():
    # B = L·i/(N·Ae) (Faraday's law with the flux linkage L·i = N·Ae·B): 15 µH, 12 turns,
    # Ae = 20 mm² gives 0.0625 T/A; a sinusoidal ripple of 1 A peak-to-peak, 0.5 A amplitude,
    # is B̂ = 0.03125 T. Ve = 600 mm³: P = k·Ve·f^α·B̂^β = 3.0·6e-7·(1e5)^1.45·0.03125^2.6
    # (Venkatachalam et al. 2002, the Steinmetz equation).
    part = {"core_k": K, "core_alpha": ALPHA, "core_beta": BETA, "core_volume_m3": 600e-9,
            "core_area_m2": 20e-6, "turns": 12}  # fmt: skip
    core = core_loss_from_part(part, 15e-6)
    times, current = _sine_vertices(0.5, FSW_HZ)
    expected = 3.0 * 6e-7 * 1e5**1.45 * 0.03125**2.6
    assert core_loss_w(core, times, current) == pytest.approx(expected, rel=1e-6)


def test_catalog_reference_point_is_met_at_the_reference_point():
    # the reference form: a part measured at 42 mW with 1.2 A p-p sinusoidal ripple at
    # 300 kHz loses 42 mW there (Steinmetz), and (f ratio)^α·(ripple ratio)^β elsewhere:
    # at 150 kHz and 0.6 A p-p, 42 mW·0.5^1.45·0.5^2.6 = 42·e^(−4.05·ln 2)
    # = 42·0.0603711 = 2.53559 mW
    part = {"core_alpha": ALPHA, "core_beta": BETA, "core_loss_ref_w": 0.042,
            "core_loss_ref_hz": 300e3, "core_loss_ref_ripple_a": 1.2}  # fmt: skip
    core = core_loss_from_part(part, 15e-6)
    assert core_loss_w(core, *_sine_vertices(0.6, 300e3)) == pytest.approx(0.042, rel=1e-6)
    assert core_loss_w(core, *_sine_vertices(0.3, 150e3)) == pytest.approx(2.53559e-3, rel=1e-5)


def test_no_core_data_means_no_core_law():
    assert core_loss_from_part({"core_alpha": ALPHA}, 15e-6) is None
    assert core_loss_from_part({}, 15e-6) is None


# ---------------------------------------------------------------- leakage and runaway

# A hand-built Schottky: 70 °C/W, 0.376 W of conduction loss, blocking 18 V on average,
# at 60 °C ambient; its leakage is given at 25 °C.
HEAT = {"ambient_degc": 60.0, "theta_ja_degc_w": 70.0, "fixed_loss_w": 0.376,
        "ir_tj_degc": 25.0, "blocking_v_s": 18.0 * 2.5e-6, "period_s": 2.5e-6}  # fmt: skip


def _critical_leakage_a() -> float:
    """The leakage at 25 °C above which Tj has no steady value (tangency, by hand).

    Tj = Ta + θ·(P + I₂₅·2^((Tj − 25)/10)·V) has a fixed point as long as the line and the
    exponential touch: slope θ·V·I(Tj)·ln2/10 = 1 there, so I(T*) = 10/(θ·V·ln 2) and
    T* = Ta + θ·P + 10/ln 2.
    """
    theta, volts = 70.0, 18.0
    t_star = 60.0 + theta * 0.376 + 10.0 / math.log(2.0)
    i_star = 10.0 / (theta * volts * math.log(2.0))
    return i_star / 2.0 ** ((t_star - 25.0) / 10.0)


def test_small_leakage_settles_where_the_heat_balance_holds():
    heat = leakage_with_self_heating(ir_a=20e-6, **HEAT)
    assert not heat.runaway
    # the steady junction satisfies Tj = Ta + θ·(P + I_R(Tj)·V), I_R doubling per 10 °C
    leak_a = 20e-6 * 2.0 ** ((heat.tj_degc - 25.0) / 10.0)
    assert heat.tj_degc == pytest.approx(60.0 + 70.0 * (0.376 + leak_a * 18.0), abs=1e-2)
    assert heat.leakage_w == pytest.approx(leak_a * 18.0, rel=1e-3)


@pytest.mark.parametrize(("share", "runaway"), [(0.9, False), (1.1, True), (30.0, True)])
def test_leakage_runs_away_above_the_critical_figure(share, runaway):
    heat = leakage_with_self_heating(ir_a=share * _critical_leakage_a(), **HEAT)
    assert heat.runaway is runaway
