"""The boost converter equations in continuous (CCM) and discontinuous (DCM) conduction.

Every function takes scalars or numpy arrays (broadcast together) and returns a numpy array
(or float) in the unit its name ends with; duty cycles, ratios and K factors are plain numbers.

References
----------
.. [SLVA372] B. Hauke, *Basic Calculation of a Boost Converter's Power Stage*, Texas
   Instruments application report SLVA372C, 2014: duty cycle with efficiency, inductor
   ripple current, maximum switch current, output capacitance and its ESR.
.. [EM] R. W. Erickson and D. Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
   Springer, 2020: ch. 2 (volt-second and charge balance, RMS of the switched waveforms,
   capacitor ripple of a triangular current), ch. 5 (DCM: K = 2L/(R·Ts), K_crit = D(1 − D)²,
   M = (1 + √(1 + 4D²/K))/2).
.. [Rashid] M. H. Rashid, *Power Electronics: Devices, Circuits and Applications*, 4th ed.,
   Pearson, 2014, ch. 5 (boost converter: ripple, peak current, capacitor ripple).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike


def _f(x: ArrayLike) -> np.ndarray:
    return np.asarray(x, dtype=float)


def boost_duty_cycle(vin_v: ArrayLike, vout_v: ArrayLike, efficiency: ArrayLike = 1.0):
    """Return the CCM duty cycle D = 1 − Vin·η/Vout (dimensionless).

    vin_v: input voltage, in V; vout_v: output voltage, in V; efficiency: η in (0, 1].
    At η = 1 this is the ideal relation Vout = Vin/(1 − D).
    References: [SLVA372] (duty cycle); [EM] ch. 2.
    """
    return 1.0 - _f(vin_v) * _f(efficiency) / _f(vout_v)


def ccm_conversion_ratio(duty: ArrayLike):
    """Return the ideal CCM boost ratio M = Vout/Vin = 1/(1 − D) (dimensionless).

    References: [EM] ch. 2 (volt-second balance on the inductor).
    """
    return 1.0 / (1.0 - _f(duty))


def worst_ripple_input_voltage_v(
    vin_min_v: ArrayLike, vin_max_v: ArrayLike, vout_v: ArrayLike, efficiency: ArrayLike = 1.0
):
    """Return Vin* = Vout/(2η) clamped into [vin_min, vin_max], in V: where Vin·D is largest.

    Vin·D = Vin − η·Vin²/Vout is a downward parabola in Vin with its vertex at Vout/(2η), so
    the inductor ripple ΔIL = Vin·D/(fsw·L) peaks there (or at the nearer end of the range).
    References: [SLVA372] (duty cycle and ripple current; differentiate their product).
    """
    return np.clip(_f(vout_v) / (2.0 * _f(efficiency)), _f(vin_min_v), _f(vin_max_v))


def switch_off_voltage_v(vout_v: ArrayLike, vout_ripple_v: ArrayLike, diode_vf_v: ArrayLike):
    """Return the switch's off-state voltage Vout + ΔVout/2 + VF, in V.

    While the switch is off the diode conducts, so the switch node sits one forward drop
    above the output, whose peak is Vout + ΔVout/2. vout_v: output voltage, in V;
    vout_ripple_v: output ripple peak-to-peak, in V; diode_vf_v: diode forward drop, in V.
    The diode's reverse voltage stays Vout + ΔVout/2 (its anode is at ground when the switch
    is on). References: [EM] ch. 2 (switch and diode voltages of the boost); [SLVA372].
    """
    return _f(vout_v) + _f(vout_ripple_v) / 2.0 + _f(diode_vf_v)


def inductor_average_current_a(iout_a: ArrayLike, duty: ArrayLike):
    """Return the average inductor (= input) current IL = Iout/(1 − D), in A.

    iout_a: output current, in A; duty: D. References: [EM] ch. 2 (charge balance on the
    output capacitor); [SLVA372] (maximum switch current, term Iout/(1 − D)).
    """
    return _f(iout_a) / (1.0 - _f(duty))


def inductor_ripple_current_a(
    vin_v: ArrayLike, duty: ArrayLike, fsw_hz: ArrayLike, inductance_h: ArrayLike
):
    """Return the peak-to-peak inductor ripple ΔIL = Vin·D/(fsw·L), in A.

    vin_v: input voltage, in V; duty: D; fsw_hz: switching frequency, in Hz; inductance_h:
    inductance, in H. References: [SLVA372] (inductor ripple current); [Rashid] ch. 5,
    boost ripple ΔI = Vs·k/(f·L).
    """
    return _f(vin_v) * _f(duty) / (_f(fsw_hz) * _f(inductance_h))


def inductor_peak_current_a(il_avg_a: ArrayLike, il_ripple_a: ArrayLike):
    """Return the inductor peak current IL + ΔIL/2, in A (also the switch and diode peak).

    il_avg_a: average inductor current, in A; il_ripple_a: peak-to-peak ripple, in A.
    References: [SLVA372] (maximum switch current); [Rashid] ch. 5.
    """
    return _f(il_avg_a) + _f(il_ripple_a) / 2.0


def _triangle_mean_square(il_avg_a: ArrayLike, il_ripple_a: ArrayLike):
    # A ramp of mean I and peak-to-peak ΔI has mean square I² + ΔI²/12 ([EM] ch. 2 RMS).
    return _f(il_avg_a) ** 2 + _f(il_ripple_a) ** 2 / 12.0


def inductor_rms_current_a(il_avg_a: ArrayLike, il_ripple_a: ArrayLike):
    """Return the inductor RMS current √(IL² + ΔIL²/12), in A.

    il_avg_a: average inductor current, in A; il_ripple_a: peak-to-peak ripple, in A.
    References: [EM] ch. 2, RMS of a triangular ripple on a DC value.
    """
    return np.sqrt(_triangle_mean_square(il_avg_a, il_ripple_a))


def switch_rms_current_a(duty: ArrayLike, il_avg_a: ArrayLike, il_ripple_a: ArrayLike):
    """Return the switch RMS current √(D·(IL² + ΔIL²/12)), in A.

    The switch carries the inductor ramp for the on-time D·Ts. Arguments as in
    :func:`inductor_rms_current_a`, plus duty D. References: [EM] ch. 2.
    """
    return np.sqrt(_f(duty) * _triangle_mean_square(il_avg_a, il_ripple_a))


def diode_rms_current_a(duty: ArrayLike, il_avg_a: ArrayLike, il_ripple_a: ArrayLike):
    """Return the diode RMS current √((1 − D)·(IL² + ΔIL²/12)), in A.

    The diode carries the inductor ramp for the off-time (1 − D)·Ts. References: [EM] ch. 2.
    """
    return np.sqrt((1.0 - _f(duty)) * _triangle_mean_square(il_avg_a, il_ripple_a))


def output_capacitor_rms_current_a(
    duty: ArrayLike, il_avg_a: ArrayLike, il_ripple_a: ArrayLike, iout_a: ArrayLike
):
    """Return the output capacitor RMS current, in A.

    I_Cout,rms = √(D·Iout² + (1 − D)·((IL − Iout)² + ΔIL²/12)): during the on-time the
    capacitor supplies −Iout; during the off-time it takes the diode ramp minus Iout.
    iout_a: output current, in A; other arguments as in :func:`switch_rms_current_a`.
    References: [EM] ch. 2 (capacitor current waveform of the boost).
    """
    d = _f(duty)
    off_mean_square = (_f(il_avg_a) - _f(iout_a)) ** 2 + _f(il_ripple_a) ** 2 / 12.0
    return np.sqrt(d * _f(iout_a) ** 2 + (1.0 - d) * off_mean_square)


def input_capacitor_rms_current_a(il_ripple_a: ArrayLike):
    """Return the input capacitor RMS current ΔIL/√12, in A.

    The input capacitor carries the AC part of the (triangular) inductor current.
    References: [EM] ch. 2, RMS of a triangle wave of peak-to-peak ΔI.
    """
    return _f(il_ripple_a) / np.sqrt(12.0)


def inductance_window_h(
    vin_star_v: ArrayLike,
    duty_star: ArrayLike,
    fsw_hz: ArrayLike,
    ripple_ratio: ArrayLike,
    il_avg_at_vin_min_a: ArrayLike,
):
    """Return the inductance that gives ripple = ratio·IL(vin_min) at Vin*, in H.

    L = Vin*·D(Vin*)/(fsw · r · IL(vin_min)). With r = hi this is l_min, with r = lo l_max.
    vin_star_v: worst ripple input voltage, in V; duty_star: D at Vin*; fsw_hz: in Hz;
    ripple_ratio: r; il_avg_at_vin_min_a: IL at vin_min, in A. References: [SLVA372] (inductor
    ripple current) solved for L, with the ripple taken at its worst input voltage.
    """
    return (
        _f(vin_star_v) * _f(duty_star) / (_f(fsw_hz) * _f(ripple_ratio) * _f(il_avg_at_vin_min_a))
    )


def output_capacitance_min_f(
    iout_a: ArrayLike, duty_max: ArrayLike, fsw_hz: ArrayLike, vout_ripple_v: ArrayLike
):
    """Return the minimum output capacitance Iout·D_max/(fsw·ΔVout), in F.

    During the on-time the capacitor alone feeds the load. iout_a: in A; duty_max: D at
    vin_min; fsw_hz: in Hz; vout_ripple_v: peak-to-peak limit, in V. ESR ripple not included.
    References: [SLVA372] (output capacitor); [Rashid] ch. 5, ΔVc = Ia·k/(f·C).
    """
    return _f(iout_a) * _f(duty_max) / (_f(fsw_hz) * _f(vout_ripple_v))


def output_ripple_voltage_v(
    iout_a: ArrayLike, duty: ArrayLike, fsw_hz: ArrayLike, capacitance_f: ArrayLike
):
    """Return the capacitive output ripple ΔVout = Iout·D/(fsw·C), peak-to-peak, in V.

    References: [Rashid] ch. 5, ΔVc = Ia·k/(f·C); [SLVA372] (output capacitor) solved for ΔVout.
    """
    return _f(iout_a) * _f(duty) / (_f(fsw_hz) * _f(capacitance_f))


def esr_max_ohm(vout_ripple_v: ArrayLike, il_peak_a: ArrayLike):
    """Return the ESR that alone uses up the ripple budget, ΔVout/I_peak, in Ω.

    The diode current steps from 0 to the inductor peak into the capacitor, so the ESR step is
    ESR·(IL + ΔIL/2). vout_ripple_v: in V; il_peak_a: in A.
    References: [SLVA372] (output capacitor ESR).
    """
    return _f(vout_ripple_v) / _f(il_peak_a)


def input_capacitance_min_f(il_ripple_a: ArrayLike, fsw_hz: ArrayLike, vin_ripple_v: ArrayLike):
    """Return the minimum input capacitance ΔIL/(8·fsw·ΔVin), in F.

    A triangular current of peak-to-peak ΔI into C gives ΔV = ΔI·Ts/(8C). il_ripple_a: in A;
    fsw_hz: in Hz; vin_ripple_v: peak-to-peak limit, in V. References: [EM] ch. 2, the
    capacitor ripple of the buck output filter (the same triangular current waveform).
    """
    return _f(il_ripple_a) / (8.0 * _f(fsw_hz) * _f(vin_ripple_v))


def effective_load_resistance_ohm(
    vout_v: ArrayLike, iout_a: ArrayLike, efficiency: ArrayLike = 1.0
):
    """Return R = Vout/(η·Iout), in Ω: the load of the lossless boost equivalent to this one.

    With D = 1 − Vin·η/Vout the converter behaves like an ideal boost making Vout/η into the
    same current, so its CCM boundary (valley current zero) is E&M's with this R; at η = 1 it is
    the load resistance Vout/Iout. References: [EM] ch. 5 with the [SLVA372] duty cycle.
    """
    return _f(vout_v) / (_f(efficiency) * _f(iout_a))


def ccm_k_factor(inductance_h: ArrayLike, load_resistance_ohm: ArrayLike, fsw_hz: ArrayLike):
    """Return K = 2L/(R·Ts) = 2·L·fsw/R (dimensionless); CCM while K > K_crit(D).

    inductance_h: in H; load_resistance_ohm: in Ω; fsw_hz: in Hz. References: [EM] ch. 5.
    """
    return 2.0 * _f(inductance_h) * _f(fsw_hz) / _f(load_resistance_ohm)


def ccm_k_critical(duty: ArrayLike):
    """Return the boost CCM/DCM boundary K_crit = D·(1 − D)², largest (4/27) at D = 1/3.

    References: [EM] ch. 5.
    """
    d = _f(duty)
    return d * (1.0 - d) ** 2


def critical_inductance_h(duty: ArrayLike, load_resistance_ohm: ArrayLike, fsw_hz: ArrayLike):
    """Return the inductance at the CCM/DCM boundary, L_crit = K_crit(D)·R/(2·fsw), in H.

    duty: D; load_resistance_ohm: in Ω; fsw_hz: in Hz. References: [EM] ch. 5 (K = K_crit).
    """
    return ccm_k_critical(duty) * _f(load_resistance_ohm) / (2.0 * _f(fsw_hz))


def dcm_conversion_ratio(duty: ArrayLike, k_factor: ArrayLike):
    """Return the DCM boost ratio M = (1 + √(1 + 4D²/K))/2 (dimensionless).

    It equals the CCM ratio 1/(1 − D) at K = K_crit(D). References: [EM] ch. 5.
    """
    d = _f(duty)
    return (1.0 + np.sqrt(1.0 + 4.0 * d**2 / _f(k_factor))) / 2.0


def dcm_duty_cycle(conversion_ratio: ArrayLike, k_factor: ArrayLike):
    """Return the DCM duty that gives ratio M at K: D = √(K·M·(M − 1)) (dimensionless).

    :func:`dcm_conversion_ratio` solved for D. References: [EM] ch. 5.
    """
    m = _f(conversion_ratio)
    return np.sqrt(_f(k_factor) * m * (m - 1.0))
