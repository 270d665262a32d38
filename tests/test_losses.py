"""Loss formulas against their published forms, with hand-worked numbers."""

import numpy as np
import pytest

from partpick import losses


def test_dcr_loss_is_i_squared_r():
    # Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 3:
    # the winding resistance dissipates I_rms^2 * R_L. 3 A rms through 40 mOhm:
    # 3^2 * 0.040 = 0.36 W.
    assert losses.inductor_dcr_loss_w(3.0, 0.040) == pytest.approx(0.36)


def test_esr_loss_shares_current_between_parallel_parts():
    # Joule heating, Erickson & Maksimovic, 3rd ed., ch. 3. 2 A rms into two equal 10 mOhm
    # capacitors: each carries 1 A, 1^2 * 0.010 = 10 mW each, 20 mW total = 2^2 * 0.010 / 2.
    assert losses.capacitor_esr_loss_w(2.0, 0.010, 2) == pytest.approx(0.020)
    assert losses.capacitor_esr_loss_w(2.0, 0.010) == pytest.approx(0.040)


def test_diode_conduction_is_drop_times_average_plus_resistive_part():
    # Erickson & Maksimovic, 3rd ed., ch. 3 (diode modelled as V_D plus R_D):
    # 0.45 V * 0.8 A = 0.36 W; with R_D = 50 mOhm and 1.7 A rms: + 0.05 * 2.89 = 0.1445 W.
    assert losses.diode_conduction_loss_w(0.45, 0.8) == pytest.approx(0.36)
    assert losses.diode_conduction_loss_w(0.45, 0.8, 0.05, 1.7) == pytest.approx(0.5045)


def test_recovery_loss_is_charge_times_voltage_times_frequency():
    # Erickson & Maksimovic, 3rd ed., ch. 4, loss from the diode's recovered charge
    # Q_rr * V * f_s: 20 nC * 24 V * 400 kHz = 0.192 W.
    assert losses.diode_recovery_loss_w(20e-9, 24.0, 400e3) == pytest.approx(0.192)


def test_switch_conduction_uses_the_hot_factor():
    # Graovac, Puerschel & Kiep, MOSFET Power Losses Calculation Using the Data-Sheet
    # Parameters (2006), sec. 2: P = R_DS(on)(Tj) * I_rms^2. 3.4 A rms, 20 mOhm, x1.5 hot:
    # 11.56 * 0.020 * 1.5 = 0.3468 W.
    assert losses.switch_conduction_loss_w(3.4, 0.020, 1.5) == pytest.approx(0.3468)


def test_transition_time_from_miller_charge():
    # Graovac, Puerschel & Kiep (2006), sec. 3: the drain voltage swings during the Miller
    # plateau, t = Q_gd / I_G. 5 nC at 1 A gives 5 ns; at 0.5 A, 10 ns.
    assert losses.switch_transition_time_s(5e-9, 1.0) == pytest.approx(5e-9)
    assert losses.switch_transition_time_s(5e-9, 0.5) == pytest.approx(10e-9)


def test_overlap_switching_loss():
    # Graovac, Puerschel & Kiep (2006), sec. 3, linear overlap: 1/2 * V * I * (tr + tf) * f.
    # 24 V, 3.8 A, 5 ns + 5 ns, 400 kHz: 0.5 * 24 * 3.8 * 10e-9 * 400e3 = 0.1824 W.
    assert losses.switch_switching_loss_w(24.0, 3.8, 5e-9, 5e-9, 400e3) == pytest.approx(0.1824)


def test_coss_loss():
    # Graovac, Puerschel & Kiep (2006), sec. 3: 1/2 * C_oss * V^2 * f.
    # 300 pF at 24 V and 400 kHz: 0.5 * 300e-12 * 576 * 400e3 = 34.56 mW.
    assert losses.switch_coss_loss_w(300e-12, 24.0, 400e3) == pytest.approx(0.03456)


@pytest.mark.parametrize(
    ("duty", "rl_over_r", "expected"),
    [
        # Erickson & Maksimovic, 3rd ed., ch. 3, boost with inductor resistance only:
        # eta = 1 / (1 + R_L / ((1 - D)^2 R)).
        (0.5, 0.02, 0.926),  # 1 / (1 + 0.02 / 0.25) = 1 / 1.08 = 0.9259
        (0.8, 0.01, 0.80),  # 1 / (1 + 0.01 / 0.04) = 1 / 1.25 = 0.80
    ],
)
def test_efficiency_from_dcr_loss_matches_the_averaged_model(duty, rl_over_r, expected):
    load_ohm = 10.0
    iout_a = 1.0
    il_a = iout_a / (1.0 - duty)  # inductor current of the ideal boost
    loss_w = losses.inductor_dcr_loss_w(il_a, rl_over_r * load_ohm)
    eta = losses.efficiency_from_losses(iout_a**2 * load_ohm, loss_w)
    assert eta == pytest.approx(expected, abs=5e-4)


def test_formulas_broadcast_over_arrays():
    currents = np.array([1.0, 2.0, 3.0])
    assert losses.inductor_dcr_loss_w(currents, 0.1).tolist() == pytest.approx([0.1, 0.4, 0.9])
