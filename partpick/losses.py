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
   Data-Sheet Parameters*, application note, 2006: conduction, switching, output
   capacitance and gate-charge terms.
.. [VLGS] K. Venkatachalam, C. R. Sullivan, T. Abdallah and H. Tacca, "Accurate prediction of
   ferrite core loss with nonsinusoidal waveforms using only Steinmetz parameters", *IEEE
   Workshop on Computers in Power Electronics (COMPEL)*, 2002: the improved generalised
   Steinmetz equation (iGSE).
"""

from __future__ import annotations

import math

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


def gate_drive_loss_w(qg_c: ArrayLike, gate_drive_v: ArrayLike, fsw_hz: ArrayLike) -> np.ndarray:
    """Return the gate-drive loss, P = Q_g · V_drive · f_sw, in W.

    qg_c: total gate charge, in C; gate_drive_v: gate drive voltage, in V; fsw_hz: switching
    frequency, in Hz. The driver and the gate resistances dissipate it, not the channel.
    Source: [GPK] section 4 (gate charge losses).
    """
    return (
        np.asarray(qg_c, dtype=float)
        * np.asarray(gate_drive_v, dtype=float)
        * np.asarray(fsw_hz, dtype=float)
    )


def recovered_charge_c(
    qrr_c: ArrayLike, forward_current_a: ArrayLike, rated_current_a: ArrayLike
) -> np.ndarray:
    """Return the charge a diode recovers when turned off at a forward current, in C.

    Q = Q_rr · min(1, I_F / I_F,rated): the stored charge grows with the forward current and is
    zero at zero current, so the recovery loss falls to zero at the CCM/DCM boundary instead
    of stepping (from memory: stored charge about proportional to I_F at a given di/dt).
    qrr_c: the data-sheet Q_rr, taken at the rated current, in C; forward_current_a: current
    at turn-off, in A; rated_current_a: the rating Q_rr refers to, in A (NaN: Q_rr unscaled).
    """
    rated = np.asarray(rated_current_a, dtype=float)
    current = np.maximum(np.asarray(forward_current_a, dtype=float), 0.0)
    share = np.where(rated > 0.0, np.minimum(1.0, current / np.where(rated > 0, rated, 1.0)), 1.0)
    return np.asarray(qrr_c, dtype=float) * share


def schottky_leakage_a(ir_a: ArrayLike, ir_tj_degc: ArrayLike, tj_degc: ArrayLike) -> np.ndarray:
    """Return the reverse leakage at junction temperature tj_degc, in A.

    I_R(Tj) = I_R(T_ref) · 2^((Tj − T_ref)/10): a Schottky's leakage doubles about every 10 °C
    (from memory; data-sheet curves show 7–12 °C per doubling). ir_a: leakage at T_ref, in
    A; ir_tj_degc: T_ref, in °C; tj_degc: junction temperature, in °C.
    """
    rise = np.asarray(tj_degc, dtype=float) - np.asarray(ir_tj_degc, dtype=float)
    return np.asarray(ir_a, dtype=float) * np.exp2(rise / 10.0)


def igse_coefficient(k: float, alpha: float, beta: float) -> float:
    """Return the iGSE coefficient k_i = k / ((2π)^(α−1) · ∫₀^2π |cos θ|^α · 2^(β−α) dθ).

    k, alpha, beta: the Steinmetz parameters of P_v = k·f^α·B̂^β. The integral is
    ∫₀^2π |cos θ|^α dθ = 2√π·Γ((α+1)/2)/Γ(α/2 + 1). Source: [VLGS] (the definition of k_i).
    """
    cos_integral = (
        2.0 * math.sqrt(math.pi) * math.gamma((alpha + 1) / 2) / math.gamma(alpha / 2 + 1)
    )
    return k / ((2.0 * math.pi) ** (alpha - 1.0) * cos_integral * 2.0 ** (beta - alpha))


def igse_piecewise_linear_loss(
    k: float, alpha: float, beta: float, times_s: ArrayLike, flux: ArrayLike
) -> float:
    """Return the iGSE loss of a piecewise-linear flux waveform over one period.

    P = k_i · ΔB^(β−α) · (1/T) · Σ_m |B_(m+1) − B_m|^α · (t_(m+1) − t_m)^(1−α), with ΔB the
    peak-to-peak flux of the period (one major loop, no minor loops) and k_i of
    :func:`igse_coefficient`. times_s: the vertices' instants, first to last spanning the
    period T, in s; flux: the flux at each vertex (the last equal to the first), in the unit k
    is given for (T with k in W/m³ gives W/m³). Flat segments add nothing. Source: [VLGS],
    the piecewise-linear form.
    """
    t = np.asarray(times_s, dtype=float)
    b = np.asarray(flux, dtype=float)
    dt, db = np.diff(t), np.abs(np.diff(b))
    moving = (dt > 0.0) & (db > 0.0)
    swing = float(b.max() - b.min())
    if swing <= 0.0 or not moving.any():
        return 0.0
    period = float(t[-1] - t[0])
    rates = np.sum(db[moving] ** alpha * dt[moving] ** (1.0 - alpha))
    return igse_coefficient(k, alpha, beta) * swing ** (beta - alpha) * float(rates) / period


def steinmetz_loss(k: ArrayLike, alpha: ArrayLike, beta: ArrayLike, fsw_hz, peak) -> np.ndarray:
    """Return the Steinmetz loss of sinusoidal excitation, P = k · f^α · B̂^β.

    k, alpha, beta: Steinmetz parameters; fsw_hz: frequency, in Hz; peak: flux amplitude B̂
    (half the peak-to-peak), in the unit k is given for. Source: [VLGS] (the Steinmetz equation).
    """
    return (
        np.asarray(k, dtype=float)
        * np.asarray(fsw_hz, dtype=float) ** np.asarray(alpha, dtype=float)
        * np.asarray(peak, dtype=float) ** np.asarray(beta, dtype=float)
    )


def efficiency_from_losses(pout_w: ArrayLike, total_loss_w: ArrayLike) -> np.ndarray:
    """Return η = P_out / (P_out + ΣP_loss), dimensionless. Source: [EM] ch. 3."""
    pout = np.asarray(pout_w, dtype=float)
    return pout / (pout + np.asarray(total_loss_w, dtype=float))
