"""Loss formulas for the parts of a power stage.

Every function takes scalars or numpy arrays (broadcast together) and returns watts, except
where its name says otherwise. The screening rules, the BOM loss rounds and the waveform
verifier all use these, so one formula is written once.

References
----------
.. [EM] R. W. Erickson and D. Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
   Springer, 2020: ch. 3 (conduction losses in the averaged model), ch. 4 (switching loss,
   diode recovered charge).
.. [GPK] D. Graovac, M. Pürschel and A. Kiep, *MOSFET Power Losses Calculation Using the
   Data-Sheet Parameters*, application note, 2006: conduction, switching and output
   capacitance terms.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike


def inductor_dcr_loss_w(il_rms_a: ArrayLike, dcr_ohm: ArrayLike) -> np.ndarray:
    """Return the copper loss of the winding, P = I_rms² · R_dc, in W.

    il_rms_a: inductor RMS current, in A. dcr_ohm: winding DC resistance, in Ω.
    Core loss is not modelled. Source: [EM] ch. 3.
    """
    return np.asarray(il_rms_a, dtype=float) ** 2 * np.asarray(dcr_ohm, dtype=float)


def capacitor_esr_loss_w(
    ic_rms_a: ArrayLike, esr_ohm: ArrayLike, count: ArrayLike = 1
) -> np.ndarray:
    """Return the ESR loss of ``count`` equal capacitors sharing one RMS current, in W.

    P = n · (I_rms/n)² · ESR = I_rms² · ESR / n. ic_rms_a: total RMS current, in A;
    esr_ohm: the ESR of one part, in Ω. Source: Joule heating of a series resistance, [EM] ch. 3.
    """
    ic = np.asarray(ic_rms_a, dtype=float)
    return ic**2 * np.asarray(esr_ohm, dtype=float) / np.asarray(count, dtype=float)


def diode_conduction_loss_w(
    vf_v: ArrayLike, id_avg_a: ArrayLike, rd_ohm: ArrayLike = 0.0, id_rms_a: ArrayLike = 0.0
) -> np.ndarray:
    """Return the diode conduction loss, P = V_F · I_avg + R_D · I_rms², in W.

    vf_v: forward drop modelled as a constant, in V; id_avg_a: average diode current, in A;
    rd_ohm: optional series resistance, in Ω; id_rms_a: diode RMS current, in A.
    Source: [EM] ch. 3 (the diode as a voltage source V_D plus a resistance R_D).
    """
    return (
        np.asarray(vf_v, dtype=float) * np.asarray(id_avg_a, dtype=float)
        + np.asarray(rd_ohm, dtype=float) * np.asarray(id_rms_a, dtype=float) ** 2
    )


def diode_recovery_loss_w(
    qrr_c: ArrayLike, v_reverse_v: ArrayLike, fsw_hz: ArrayLike
) -> np.ndarray:
    """Return the loss of the diode's recovered charge, P = Q_rr · V_r · f_sw, in W.

    qrr_c: reverse recovery charge, in C; v_reverse_v: voltage the diode blocks after
    turn-off, in V; fsw_hz: switching frequency, in Hz. Source: [EM] ch. 4, the switching loss
    caused by the diode's recovered charge.
    """
    return (
        np.asarray(qrr_c, dtype=float)
        * np.asarray(v_reverse_v, dtype=float)
        * np.asarray(fsw_hz, dtype=float)
    )


def switch_conduction_loss_w(
    isw_rms_a: ArrayLike, rds_on_ohm: ArrayLike, hot_factor: ArrayLike = 1.0
) -> np.ndarray:
    """Return the MOSFET conduction loss, P = I_rms² · R_DS(on) · k_hot, in W.

    isw_rms_a: switch RMS current, in A; rds_on_ohm: on resistance at 25 °C, in Ω;
    hot_factor: the rise of R_DS(on) at the operating junction temperature (dimensionless).
    Source: [GPK] section 2 (conduction losses).
    """
    return (
        np.asarray(isw_rms_a, dtype=float) ** 2
        * np.asarray(rds_on_ohm, dtype=float)
        * np.asarray(hot_factor, dtype=float)
    )


def switch_transition_time_s(qgd_c: ArrayLike, gate_drive_a: ArrayLike) -> np.ndarray:
    """Return the drain-voltage transition time, t = Q_gd / I_g, in s.

    qgd_c: gate-drain (Miller) charge, in C; gate_drive_a: gate current during the Miller
    plateau, in A. Source: [GPK] section 3 (rise and fall times from the gate charge).
    """
    return np.asarray(qgd_c, dtype=float) / np.asarray(gate_drive_a, dtype=float)


def switch_switching_loss_w(
    v_switch_v: ArrayLike,
    i_switch_a: ArrayLike,
    t_rise_s: ArrayLike,
    t_fall_s: ArrayLike,
    fsw_hz: ArrayLike,
) -> np.ndarray:
    """Return the hard-switching overlap loss, P = ½ · V · I · (t_r + t_f) · f_sw, in W.

    v_switch_v: drain voltage while off, in V; i_switch_a: drain current at the transitions,
    in A; t_rise_s, t_fall_s: transition times, in s; fsw_hz: switching frequency, in Hz.
    Source: [GPK] section 3, the linear-overlap approximation.
    """
    return (
        0.5
        * np.asarray(v_switch_v, dtype=float)
        * np.asarray(i_switch_a, dtype=float)
        * (np.asarray(t_rise_s, dtype=float) + np.asarray(t_fall_s, dtype=float))
        * np.asarray(fsw_hz, dtype=float)
    )


def switch_coss_loss_w(coss_f: ArrayLike, v_switch_v: ArrayLike, fsw_hz: ArrayLike) -> np.ndarray:
    """Return the loss of discharging the output capacitance, P = ½ · C_oss · V² · f_sw, in W.

    coss_f: output capacitance, in F; v_switch_v: drain voltage while off, in V; fsw_hz:
    switching frequency, in Hz. Source: [GPK] section 3 (output capacitance loss).
    """
    return (
        0.5
        * np.asarray(coss_f, dtype=float)
        * np.asarray(v_switch_v, dtype=float) ** 2
        * np.asarray(fsw_hz, dtype=float)
    )


def efficiency_from_losses(pout_w: ArrayLike, total_loss_w: ArrayLike) -> np.ndarray:
    """Return η = P_out / (P_out + ΣP_loss), dimensionless. Source: [EM] ch. 3."""
    pout = np.asarray(pout_w, dtype=float)
    return pout / (pout + np.asarray(total_loss_w, dtype=float))
