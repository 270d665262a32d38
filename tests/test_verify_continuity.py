"""The loss and the efficiency curve are continuous through the CCM/DCM boundary.

References used here:
* Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 5: at the CCM/DCM
  boundary the idle interval is zero, so every waveform, and every loss computed from them,
  meets its CCM value there; ch. 4: the recovered charge and the device capacitances.
* η = P_out/(P_out + ΣP_loss) (Erickson & Maksimovic ch. 3): a fixed loss P_fix caps the
  efficiency at P_out/(P_out + P_fix), which falls to zero with the load.

The stage is invented.
"""

from __future__ import annotations

import numpy as np
import pytest

from partpick.verify.stage import Stage
from partpick.verify.steady_state import steady_state

# 6 V to 24 V at 400 kHz with every loss term present: a fast diode with recovered charge,
# junction capacitance, gate charge, a controller's fixed loss
STAGE = Stage(
    inductance_h=15e-6, dcr_ohm=0.0165, rds_on_ohm=0.0065, hot_factor=1.5, diode_vf_v=0.47,
    cout_f=4.8e-6, esr_ohm=0.004, output_count=3, fsw_hz=400e3, qgd_c=5e-9, coss_f=420e-12,
    qrr_c=20e-9, diode_if_avg_a=3.0, cj_f=100e-12, qg_c=10e-9, gate_drive_v=10.0,
    quiescent_w=0.02,
)  # fmt: skip
VIN_V, VOUT_V = 6.0, 24.0


def _state(iout_a: float):
    return steady_state(STAGE, VIN_V, VOUT_V / iout_a, vout_v=VOUT_V)


def _boundary_load_a(low_a: float, high_a: float, width_a: float) -> tuple[float, float]:
    """Bisect the load at which the mode changes to ``width_a``."""
    low_mode = _state(low_a).mode
    assert _state(high_a).mode != low_mode
    while high_a - low_a > width_a:
        middle = 0.5 * (low_a + high_a)
        if _state(middle).mode == low_mode:
            low_a = middle
        else:
            high_a = middle
    return low_a, high_a


def test_no_loss_step_at_the_boundary_beyond_what_the_load_step_explains():
    loads = np.linspace(0.05, 0.3, 101)  # 2.5 mA steps through the boundary
    totals = np.array([_state(i).total_loss_w for i in loads])
    modes = {_state(i).mode for i in loads}
    assert modes == {"ccm", "dcm"}
    slope_w_per_a = float(np.max(np.abs(np.diff(totals)) / np.diff(loads)))
    # across a 1 µA load step at the boundary the loss may move by the sweep's steepest slope
    # times that step (ten times it, for the curvature); a step left in the model (the old
    # C_oss clamp or the recovery loss switching off) would be tens of mW
    low_a, high_a = _boundary_load_a(0.05, 0.3, 1e-6)
    below, above = _state(low_a), _state(high_a)
    assert {below.mode, above.mode} == {"ccm", "dcm"}
    allowed_w = 10.0 * slope_w_per_a * (high_a - low_a)
    assert allowed_w < 1e-3
    assert abs(above.total_loss_w - below.total_loss_w) < allowed_w
    for key in ("coss", "diode_cj", "recovery", "switching"):
        assert abs(above.losses_w[key] - below.losses_w[key]) < allowed_w, key


def test_efficiency_falls_towards_light_load_once_fixed_losses_exist():
    # fixed: Qg·V·f = 10 nC·10 V·400 kHz = 40 mW (Graovac, Pürschel and Kiep, section 4)
    # plus the controller's 20 mW, so η ≤ P_out/(P_out + 60 mW)
    for iout_a in (0.01, 0.02, 0.05):
        pout_w = VOUT_V * iout_a
        assert _state(iout_a).efficiency <= pout_w / (pout_w + 0.060) + 1e-9
    curve = [_state(i).efficiency for i in (0.01, 0.02, 0.05, 0.1)]
    assert curve == sorted(curve)
    assert curve[0] < 0.8  # 0.24 W out against 60 mW fixed: at best 80 %, in fact less


@pytest.mark.parametrize("iout_a", [0.8, 0.05])
def test_every_named_term_reaches_the_input(iout_a):
    # energy balance, P_in = P_out + Σ losses, with every term booked (Erickson & Maksimovic
    # ch. 3): nothing a term adds is lost from the account
    state = _state(iout_a)
    assert state.pin_w == pytest.approx(state.pout_w + state.total_loss_w, rel=1e-6)
    assert state.losses_w["gate_drive"] == pytest.approx(0.040)
    assert state.losses_w["quiescent"] == pytest.approx(0.020)
    assert {n.term for n in state.not_included} == {"core", "leakage"}  # no data given here
