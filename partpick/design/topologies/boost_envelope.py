"""The boost envelope: named worst-case figures, the CCM/DCM verdict, cautions and warnings."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from partpick.design.cautions import (
    QUALIFIED_ENGINEER,
    hazardous_voltage_caution,
    high_duty_warning,
    stored_energy_caution,
    stored_energy_j,
)
from partpick.design.eseries import e_values_between
from partpick.design.spec import Spec
from partpick.design.topologies.base import Caution, Envelope, Figure
from partpick.design.topologies.boost_equations import (
    boost_duty_cycle,
    ccm_conversion_ratio,
    ccm_k_critical,
    ccm_k_factor,
    critical_inductance_h,
    dcm_conversion_ratio,
    dcm_duty_cycle,
    effective_load_resistance_ohm,
    esr_max_ohm,
    inductor_average_current_a,
    input_capacitance_min_f,
    output_capacitance_min_f,
    switch_off_voltage_v,
)
from partpick.design.topologies.boost_model import (
    OperatingGrid,
    inductance_limits_h,
    operating_grid,
    worst_stresses,
)
from partpick.units import format_eng

RECOMMENDED_SERIES = "E12"


class _Figures:
    """Collects figures in display order."""

    def __init__(self) -> None:
        self.items: dict[str, Figure] = {}

    def add(
        self, key: str, value: object, unit: str, group: str, label: str, vin: object = None
    ) -> None:
        """Add one figure; numpy scalars become floats, the Vin where it is worst is optional."""
        number = None if value is None else float(value)  # type: ignore[arg-type]
        worst_vin = None if vin is None else float(vin)  # type: ignore[arg-type]
        self.items[key] = Figure(key, number, unit, group, label, worst_vin)


@dataclass(frozen=True)
class _Conduction:
    ccm: bool
    ccm_light_load: bool | None
    dcm_ratio_light_load: float | None
    warnings: tuple[Caution, ...]


def build_envelope(spec: Spec) -> Envelope:
    """Return the boost envelope of ``spec``: every issue-3 figure plus extras, SI units."""
    grid = operating_grid(spec)
    l_min, l_max, vin_star = inductance_limits_h(spec)
    figures = _Figures()
    _add_converter_and_duty(figures, spec)
    window_warnings = _add_inductor(figures, spec, grid, l_min, l_max, vin_star)
    _add_semiconductors_and_caps(figures, spec, grid, l_min)
    conduction = _add_conduction(figures, spec, grid, l_min)
    duty_max = figures.items["duty_max"].value
    warnings = [w for w in (high_duty_warning(duty_max, spec.vin_min_v),) if w]
    warnings += [*window_warnings, *conduction.warnings]
    return Envelope(
        spec=spec,
        figures=figures.items,
        ccm=conduction.ccm,
        ccm_light_load=conduction.ccm_light_load,
        dcm_ratio_light_load=conduction.dcm_ratio_light_load,
        cautions=_cautions(spec, figures.items),
        warnings=tuple(warnings),
    )


def _add_converter_and_duty(figures: _Figures, spec: Spec) -> None:
    pout_w = spec.vout_v * spec.iout_a
    figures.add("pout_w", pout_w, "W", "converter", "output power")
    figures.add("pin_max_w", pout_w / spec.efficiency, "W", "converter", "input power at η")
    figures.add("loss_budget_w", pout_w * (1 / spec.efficiency - 1), "W", "converter",
                "loss budget at η")  # fmt: skip
    figures.add("r_load_ohm", spec.vout_v / spec.iout_a, "ohm", "converter", "full-load resistance")
    for key, vin, label in (
        ("duty_min", spec.vin_max_v, "duty cycle, lowest"),
        ("duty_max", spec.vin_min_v, "duty cycle, highest"),
    ):
        duty = boost_duty_cycle(vin, spec.vout_v, spec.efficiency)
        figures.add(key, duty, "fraction", "duty", label, vin)


def _add_inductor(
    figures: _Figures, spec: Spec, grid: OperatingGrid, l_min: float, l_max: float, vin_star: float
) -> list[Caution]:
    il_at_vin_min = float(inductor_average_current_a(spec.iout_a, grid.duty[0]))
    recommended = recommended_inductance_h(l_min, l_max, spec.inductor_tolerance)
    add = figures.add
    add("vin_star_v", vin_star, "V", "inductor", "input voltage of largest ripple", vin_star)
    add("l_min_h", l_min, "H", "inductor", "inductance, minimum (ripple hi)", vin_star)
    add("l_max_h", l_max, "H", "inductor", "inductance, maximum (ripple lo)", vin_star)
    add("l_recommended_h", recommended, "H", "inductor",
        f"inductance, recommended E12 (L·(1 − {_pct(spec.inductor_tolerance)}) ≥ l_min)",
        vin_star)  # fmt: skip
    add("il_avg_max_a", il_at_vin_min, "A", "inductor", "average current", spec.vin_min_v)
    worst = worst_stresses(spec, np.array([l_min]))
    for key, name, label in (
        ("il_ripple_max_a", "il_ripple", "ripple p-p at l_min"),
        ("il_peak_max_a", "il_peak", "peak current at l_min"),
        ("il_rms_max_a", "il_rms", "RMS current at l_min"),
    ):
        add(key, worst[name][0][0], "A", "inductor", label, worst[name][1][0])
    # the ripple at l_min is il_ripple_max_a above (hi·IL at vin_min by the sizing): one row
    if recommended is not None:
        low = recommended * (1.0 - spec.inductor_tolerance)
        at_rec = worst_stresses(spec, np.array([low]))
        add("l_recommended_min_h", low, "H", "inductor",
            "recommended L at its tolerance, L·(1 − tol)", vin_star)  # fmt: skip
        add("il_ripple_at_l_recommended_a", at_rec["il_ripple"][0][0], "A", "inductor",
            "ripple p-p at the recommended L·(1 − tol)", at_rec["il_ripple"][1][0])  # fmt: skip
        add("il_peak_at_l_recommended_a", at_rec["il_peak"][0][0], "A", "inductor",
            "peak current at the recommended L·(1 − tol)", at_rec["il_peak"][1][0])  # fmt: skip
        return []
    return [_no_standard_value_warning(l_min, l_max, spec.inductor_tolerance)]


def recommended_inductance_h(l_min_h: float, l_max_h: float, tolerance: float) -> float | None:
    """Return the smallest E12 value L with L·(1 − tol) ≥ l_min and L ≤ l_max, in H (or None).

    l_min_h, l_max_h: the ripple window, in H; tolerance: the part's ± tolerance as a fraction.
    At its low tolerance the part still keeps the ripple, and so the peak, inside the band.
    Values: IEC 60063 (E12); the tolerance rule is common practice, no published source.
    """
    fits = e_values_between(l_min_h / (1.0 - tolerance), l_max_h, RECOMMENDED_SERIES)
    return fits[0] if fits else None


def _pct(fraction: float) -> str:
    return f"{fraction * 100:.3g} %"


def _no_standard_value_warning(l_min: float, l_max: float, tolerance: float) -> Caution:
    return Caution(
        "no-standard-inductance",
        f"No {RECOMMENDED_SERIES} value L has L·(1 − {_pct(tolerance)}) ≥ "
        f"{format_eng(l_min, 'H')} and L ≤ {format_eng(l_max, 'H')}; widen ripple_ratio, "
        "choose a tighter tolerance or use a non-standard inductance.",
    )


def _add_semiconductors_and_caps(
    figures: _Figures, spec: Spec, grid: OperatingGrid, l_min: float
) -> None:
    worst = worst_stresses(spec, np.array([l_min]))
    peak, peak_vin = worst["il_peak"][0][0], worst["il_peak"][1][0]
    v_off = spec.vout_v + spec.vout_ripple_v / 2  # ringing is left to the derating
    v_switch = switch_off_voltage_v(spec.vout_v, spec.vout_ripple_v, spec.diode_vf_v)
    add = figures.add
    add(
        "isw_rms_max_a",
        worst["isw_rms"][0][0],
        "A",
        "switch",
        "RMS current",
        worst["isw_rms"][1][0],
    )
    add("isw_peak_max_a", peak, "A", "switch", "peak current", peak_vin)
    vf_text = format_eng(spec.diode_vf_v, "V")
    add(
        "vsw_max_v", v_switch, "V", "switch", f"off-state voltage, Vout + ripple/2 + VF ({vf_text})"
    )
    add("id_avg_a", spec.iout_a, "A", "diode", "average current")
    add("id_peak_max_a", peak, "A", "diode", "peak current", peak_vin)
    add("id_rms_max_a", worst["id_rms"][0][0], "A", "diode", "RMS current", worst["id_rms"][1][0])
    add("vd_reverse_max_v", v_off, "V", "diode", "reverse voltage")
    duty_max = grid.duty[0]
    cout_min = output_capacitance_min_f(spec.iout_a, duty_max, spec.fsw_hz, spec.vout_ripple_v)
    add("icout_rms_max_a", worst["icout_rms"][0][0], "A", "output-cap", "RMS current",
        worst["icout_rms"][1][0])  # fmt: skip
    add("cout_min_f", cout_min, "F", "output-cap", "capacitance, minimum", spec.vin_min_v)
    add("esr_max_ohm", esr_max_ohm(spec.vout_ripple_v, peak), "ohm", "output-cap",
        "ESR, maximum", peak_vin)  # fmt: skip
    add("vcout_max_v", v_off, "V", "output-cap", "voltage")
    add("cout_energy_j", stored_energy_j(cout_min, spec.vout_v), "J", "output-cap",
        "stored energy at the minimum capacitance")  # fmt: skip
    ripple, ripple_vin = worst["il_ripple"][0][0], worst["il_ripple"][1][0]
    add("icin_rms_max_a", worst["icin_rms"][0][0], "A", "input-cap", "RMS current",
        worst["icin_rms"][1][0])  # fmt: skip
    add("vcin_max_v", spec.vin_max_v, "V", "input-cap", "voltage", spec.vin_max_v)
    if spec.vin_ripple_v is not None:
        cin_min = input_capacitance_min_f(ripple, spec.fsw_hz, spec.vin_ripple_v)
        add("cin_min_f", cin_min, "F", "input-cap", "capacitance, minimum", ripple_vin)


def _add_conduction(
    figures: _Figures, spec: Spec, grid: OperatingGrid, l_min: float
) -> _Conduction:
    """Add the CCM/DCM figures (Erickson & Maksimovic ch. 5) and return the verdicts."""
    kcrit = ccm_k_critical(grid.duty)
    worst = int(np.argmax(kcrit))
    vin_worst = grid.vin_v[worst]
    r_full = effective_load_resistance_ohm(spec.vout_v, spec.iout_a, spec.efficiency)
    k_full = float(ccm_k_factor(l_min, r_full, spec.fsw_hz))
    l_crit = critical_inductance_h(grid.duty[worst], r_full, spec.fsw_hz)
    add = figures.add
    add("k_crit_max", kcrit[worst], "", "inductor", "K_crit = D(1−D)², largest", vin_worst)
    add(
        "k_full_load",
        k_full,
        "",
        "inductor",
        "K = 2L/(R·Ts), R = Vout/(η·Iout), full load at l_min",
    )
    add("l_crit_h", l_crit, "H", "inductor", "critical inductance, full load", vin_worst)
    ccm = bool(k_full > kcrit[worst])
    warnings = () if ccm else (_full_load_dcm_warning(vin_worst),)
    if spec.iout_min_a is None:
        return _Conduction(ccm, None, None, warnings)
    light = _add_light_load(figures, spec, grid, l_min, worst)
    return _Conduction(ccm, light.ccm, light.dcm_ratio_light_load, warnings + light.warnings)


def _add_light_load(
    figures: _Figures, spec: Spec, grid: OperatingGrid, l_min: float, worst: int
) -> _Conduction:
    """Add the iout_min figures and return their verdict (its ``ccm`` is the light-load one).

    ``worst`` indexes the grid point of the largest K_crit. The DCM figures are the worst over
    the whole input grid (:func:`light_load_worst`), each with the Vin where it occurs.
    """
    vin_worst = grid.vin_v[worst]
    add = figures.add
    r_light = effective_load_resistance_ohm(spec.vout_v, spec.iout_min_a, spec.efficiency)
    k_light = float(ccm_k_factor(l_min, r_light, spec.fsw_hz))
    add("k_light_load", k_light, "", "inductor", "K at iout_min and l_min, R = Vout/(η·Iout_min)")
    l_crit_light = critical_inductance_h(grid.duty[worst], r_light, spec.fsw_hz)
    add("l_crit_light_load_h", l_crit_light, "H", "inductor", "critical inductance, iout_min",
        vin_worst)  # fmt: skip
    light = light_load_worst(grid.vin_v, grid.duty, k_light, spec.fsw_hz)
    if light is None:
        return _Conduction(True, None, None, ())
    add("dcm_ratio_light_load", light.ratio_max, "", "duty",
        "DCM ratio M at the CCM duty, iout_min, largest", light.ratio_vin_v)  # fmt: skip
    add("duty_light_load_dcm", light.duty_min, "fraction", "duty",
        "duty needed at iout_min, smallest", light.duty_vin_v)  # fmt: skip
    add("on_time_light_load_min_s", light.on_time_min_s, "s", "duty",
        "on-time needed at iout_min, shortest", light.duty_vin_v)  # fmt: skip
    warning = _light_load_dcm_warning(spec, light)
    return _Conduction(False, None, light.ratio_max, (warning,))


@dataclass(frozen=True)
class LightLoad:
    """The light-load DCM figures, worst over the input grid, and where each occurs."""

    ratio_max: float
    ratio_vin_v: float
    duty_min: float
    duty_vin_v: float
    on_time_min_s: float


def light_load_worst(vin_v, duty, k_factor: float, fsw_hz: float) -> LightLoad | None:
    """Return the light-load figures over the grid, or None where it stays in CCM throughout.

    vin_v, duty: the grid's input voltages (V) and CCM duties; k_factor: K = 2L/(R·Ts) at the
    light load. Where K < K_crit(D) = D(1 − D)² the converter is in DCM: the CCM duty would
    give M = (1 + √(1 + 4D²/K))/2, and the duty needed for the CCM ratio M_ccm = 1/(1 − D)
    is √(K·M_ccm·(M_ccm − 1)); elsewhere the CCM duty holds. The largest M, the smallest
    duty and the shortest on-time D/fsw are taken over every grid point.
    References: Erickson & Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5.
    """
    vin, d = np.asarray(vin_v, dtype=float), np.asarray(duty, dtype=float)
    dcm = k_factor < ccm_k_critical(d)
    if not dcm.any():
        return None
    m_ccm = ccm_conversion_ratio(d)
    needed = np.where(dcm, dcm_duty_cycle(m_ccm, k_factor), d)
    ratio = np.where(dcm, dcm_conversion_ratio(d, k_factor), m_ccm)
    i_ratio, i_duty = int(np.argmax(ratio)), int(np.argmin(needed))
    return LightLoad(
        float(ratio[i_ratio]), float(vin[i_ratio]), float(needed[i_duty]), float(vin[i_duty]),
        float(needed[i_duty] / fsw_hz),
    )  # fmt: skip


def _full_load_dcm_warning(vin_v: float) -> Caution:
    return Caution(
        "full-load-dcm",
        f"At l_min the full load runs into DCM near {format_eng(vin_v, 'V')} in; the CCM "
        "stresses do not hold there: raise the inductance or narrow the input range.",
    )


def _light_load_dcm_warning(spec: Spec, light: LightLoad) -> Caution:
    return Caution(
        "light-load-dcm",
        f"At iout_min ({format_eng(spec.iout_min_a, 'A')}) the converter runs in DCM: the CCM "
        f"duty would give M up to {light.ratio_max:.3g} (at {format_eng(light.ratio_vin_v, 'V')}"
        f" in), so the controller must cut the duty down to {light.duty_min:.3g}, an on-time "
        f"of {format_eng(light.on_time_min_s, 's')} (at {format_eng(light.duty_vin_v, 'V')} "
        "in; Erickson & Maksimovic ch. 5).",
    )


def _cautions(spec: Spec, figures: dict[str, Figure]) -> tuple[Caution, ...]:
    highest_v = max(spec.vin_max_v, figures["vsw_max_v"].value)
    found = [
        hazardous_voltage_caution(highest_v),
        stored_energy_caution(figures["cout_min_f"].value, spec.vout_v),
        QUALIFIED_ENGINEER,
    ]
    return tuple(c for c in found if c is not None)
