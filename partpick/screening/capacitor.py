"""Rules for the ``output-cap`` and ``input-cap`` roles, vectorised over every capacitor.

Both roles use n identical parts in parallel: the smallest n in 1..max_parallel for which the
ripple checks hold (``max_parallel`` when none does, and then they fail at that count).

Output capacitor (profile ``standard`` figures in brackets):

* ``voltage``: Vout + vout_ripple/2 ≤ u·V_rated, u by dielectric [0.5 class II ceramic …].
* ``ripple-voltage``: Iout·D_max/(fsw·n·C_eff) + (ESR/n)·I_peak(l_min) ≤ vout_ripple.
  Charge term: TI SLVA372, *Basic Calculation of a Boost Converter's Power Stage*, eq. for
  ΔVout; ESR term: the same note, ΔV_ESR = ESR · (Iout/(1 − D) + ΔIL/2).
* ``ripple-current``: I_cout,rms(l_min)/n ≤ u·I_ripple [u = 1.0].

Input capacitor:

* ``voltage``: vin_max ≤ u·V_rated.
* ``ripple-current``: I_cin,rms(l_min)/n ≤ u·I_ripple; I_cin,rms = ΔIL/√12.
* ``ripple-voltage`` (only with ``vin_ripple`` in the spec): ΔIL/(8·fsw·n·C_eff) + (ESR/n)·ΔIL
  ≤ vin_ripple. The charge term is the ripple of a capacitor carrying a triangular current,
  Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 2 (Δv = ΔI/(8fC)).

Both: ``temperature`` (only when temp_max_degc is given): ambient + margin ≤ T_max;
``lifecycle``. C_eff = C·(1 − tol)·k_bias(V_work/V_rated)·kept fraction: k_bias is the DC-bias
share kept at the working voltage (Vout for the output, vin_max for the input capacitor), from
the profile's table or the part's datasheet point (:mod:`partpick.screening.dc_bias`); the kept
fraction is any further share the profile takes off (ageing). Loss (ranking): I_rms²·ESR/n
(:func:`partpick.losses.capacitor_esr_loss_w`).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from partpick.losses import capacitor_esr_loss_w
from partpick.screening.checks import (
    RuleNeeds,
    RuleResult,
    Screen,
    lifecycle_notes,
    lifecycle_rule,
    limit_rule,
    missing_masks,
    operating_point,
    use_rule,
)
from partpick.screening.dc_bias import BASIS_TEXT, DATASHEET, UNRATED, dc_bias

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology
    from partpick.screening.profiles import Profile

KIND = "capacitor"
FIELDS: tuple[str, ...] = (
    "capacitance_f",
    "tolerance",
    "voltage_v",
    "dielectric",
    "esr_ohm",
    "ripple_a",
    "temp_max_degc",
    "lifecycle",
    "capacitance_at_bias_f",
    "bias_v",
)
CORE: tuple[str, ...] = ("esr_ohm", "ripple_a")
# what each rule reads (the import coverage report says what a file without them costs)
RULES: tuple[RuleNeeds, ...] = (
    RuleNeeds("voltage", ("voltage_v",)),
    RuleNeeds("ripple-voltage", ("esr_ohm", "capacitance_f")),
    RuleNeeds("ripple-current", ("ripple_a",)),
    RuleNeeds("temperature", ("temp_max_degc",), optional=True),
    RuleNeeds("lifecycle", ("lifecycle",), optional=True),
)
USES_OUTPUT = ("duty_max", "il_peak_max_a", "icout_rms_max_a", "cout_min_f", "esr_max_ohm")
USES_INPUT = ("il_ripple_max_a", "icin_rms_max_a")
_KELVIN = 273.15


def dielectric_figure(dielectric: np.ndarray, table: dict[str, float], unknown: float):
    """Return the profile figure of each part's dielectric (``unknown`` where None or unlisted)."""
    codes = tuple(table)
    index = dielectric_index(dielectric, codes)
    lookup = np.array([table[c] for c in codes] + [unknown], dtype=float)
    return lookup[index]


def dielectric_index(dielectric: np.ndarray, codes: tuple[str, ...]) -> np.ndarray:
    """Return each part's position in ``codes``, or len(codes) where None or not listed.

    The object array is turned into fixed-width text once (None becomes "None", which is no
    dielectric code), so each comparison runs in C rather than per Python object.
    """
    text = np.asarray(dielectric, dtype=object).astype("U16")
    index = np.full(text.shape[0], len(codes), dtype=np.intp)
    for i, code in enumerate(codes):
        index[text == code] = i
    return index


def effective_capacitance_f(capacitance_f, tolerance, kept_fraction, tolerance_default: float):
    """Return C_eff = C · (1 − tol) · kept fraction, in F.

    capacitance_f: nominal capacitance, in F; tolerance: fraction, NaN where unknown (then
    ``tolerance_default``); kept_fraction: share left after DC bias and ageing, the product
    of the two (1 for stable dielectrics). Definition of a ± tolerance; common practice.
    """
    tol = np.asarray(tolerance, dtype=float)
    tol = np.where(np.isnan(tol), tolerance_default, tol)
    return np.asarray(capacitance_f, dtype=float) * (1.0 - tol) * np.asarray(kept_fraction)


def output_ripple_voltage_v(iout_a, duty_max, fsw_hz, count, c_eff_f, esr_ohm, il_peak_a):
    """Return the boost output ripple, Iout·D/(fsw·n·C) + (ESR/n)·I_peak, peak-to-peak in V.

    iout_a: output current, in A; duty_max: largest duty (at vin_min); fsw_hz: in Hz; count:
    parts in parallel; c_eff_f: effective capacitance of one part, in F; esr_ohm: ESR of one
    part, in Ω; il_peak_a: inductor peak current, in A. The two terms are added (their peaks
    need not coincide, so this is an upper bound). References: TI SLVA372, ΔVout equations.
    """
    n = np.asarray(count, dtype=float)
    charge = iout_a * duty_max / (fsw_hz * n * np.asarray(c_eff_f, dtype=float))
    return charge + np.asarray(esr_ohm, dtype=float) / n * il_peak_a


def input_ripple_voltage_v(il_ripple_a, fsw_hz, count, c_eff_f, esr_ohm):
    """Return the boost input ripple, ΔIL/(8·fsw·n·C) + (ESR/n)·ΔIL, peak-to-peak in V.

    il_ripple_a: inductor ripple, peak-to-peak, in A; the input capacitor carries its AC part,
    a triangle. References: Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd
    ed., ch. 2, Δv = ΔI/(8·f·C) for a capacitor fed a triangular ripple current.
    """
    n = np.asarray(count, dtype=float)
    charge = il_ripple_a / (8.0 * fsw_hz * n * np.asarray(c_eff_f, dtype=float))
    return charge + np.asarray(esr_ohm, dtype=float) / n * il_ripple_a


def smallest_count(meets: np.ndarray) -> np.ndarray:
    """Return, per part, the first n (1-based row of ``meets``) that meets, else the last n.

    meets: bool array of shape (max_parallel, parts).
    """
    first = np.argmax(meets, axis=0) + 1
    return np.where(meets.any(axis=0), first, meets.shape[0]).astype(np.int64)


def voltage_rule(stress_v: float, voltage_v, use) -> RuleResult:
    """Return the rule working voltage ≤ u·V_rated (V), u by dielectric."""
    rated = np.asarray(voltage_v, dtype=float)
    return use_rule(
        "voltage", "V", stress_v, rated, use, None,
        missing_masks({"voltage_v": rated}, ("voltage_v",)),
    )  # fmt: skip


def ripple_current_rule(ic_rms_a: float, count, ripple_a, use: float, worst_vin_v=None):
    """Return the rule I_rms/n ≤ u·I_ripple (A) for ``count`` parts sharing the current."""
    rated = np.asarray(ripple_a, dtype=float)
    return use_rule(
        "ripple-current", "A", ic_rms_a / np.asarray(count, dtype=float), rated, use,
        worst_vin_v, missing_masks({"ripple_a": rated}, ("ripple_a",)),
    )  # fmt: skip


def ripple_voltage_rule(ripple_v, limit_v: float, esr_missing, c_missing, worst_vin_v=None):
    """Return the rule ripple ≤ limit (V). Without an ESR the ripple is a lower bound."""
    n = np.asarray(ripple_v).shape[0]
    return limit_rule(
        "ripple-voltage", "V", ripple_v, limit_v, n, worst_vin_v,
        (("esr_ohm", esr_missing), ("capacitance_f", c_missing)), lower_bound=True,
    )  # fmt: skip


def temperature_rule(temp_max_degc, ambient_degc: float, margin_degc: float) -> RuleResult:
    """Return the optional rule ambient + margin ≤ T_max (°C); load as a ratio of kelvins."""
    t_max = np.asarray(temp_max_degc, dtype=float)
    need = ambient_degc + margin_degc
    load = (need + _KELVIN) / (t_max + _KELVIN)
    return limit_rule(
        "temperature", "degC", need, t_max, t_max.shape[0], None,
        missing_masks({"temp_max_degc": t_max}, ("temp_max_degc",)), load=load, optional=True,
    )  # fmt: skip


def _part_figures(columns, profile, working_v: float):
    """Return (voltage use, C_eff, figures, notes) of every part at its working voltage."""
    diel = columns["dielectric"]
    sec = profile.section("capacitor")
    use = dielectric_figure(diel, _table(sec, "voltage_use."), sec["voltage_use_unknown"])
    further = dielectric_figure(diel, _table(sec, "kept_fraction."), 1.0)
    unknown = np.asarray(diel == None, dtype=bool)  # noqa: E711 - elementwise on an object array
    further[unknown] = sec["kept_fraction_unknown"]
    bias = dc_bias(columns, working_v, profile)
    c_eff = effective_capacitance_f(
        columns["capacitance_f"], columns["tolerance"], bias.kept * further,
        sec["tolerance_default"],
    )  # fmt: skip
    figures = {
        "capacitance_eff_f": c_eff,
        "voltage_use": use,
        "working_voltage_v": np.full(c_eff.shape, float(working_v)),
        "dc_bias_kept": bias.kept,
        "kept_fraction_further": further,
        "working_fraction_of_rating": bias.fraction_of_rating,
    }
    notes = [
        (
            f"dielectric not given; voltage use {sec['voltage_use_unknown']:.0%} and the "
            "'unknown' DC-bias table assumed",
            unknown,
        ),
        (
            f"tolerance not given; taken as ±{sec['tolerance_default']:.0%}",
            np.isnan(columns["tolerance"]),
        ),
        (f"DC bias from the {BASIS_TEXT[DATASHEET]}", bias.basis == DATASHEET),
        (f"DC bias: {BASIS_TEXT[UNRATED]}", bias.basis == UNRATED),
        *lifecycle_notes(columns["lifecycle"]),
    ]
    return use, c_eff, figures, notes


def _part_rules(columns, spec, profile) -> list[RuleResult]:
    """Return the rules of the part itself, the same at the input and the output."""
    return [
        temperature_rule(
            columns["temp_max_degc"], spec.ambient_max_degc,
            profile.value("capacitor.temp_margin_degc"),
        ),
        lifecycle_rule(columns["lifecycle"]),
    ]  # fmt: skip


def _table(section: dict[str, float], prefix: str) -> dict[str, float]:
    return {k[len(prefix) :]: v for k, v in section.items() if k.startswith(prefix)}


def _count_search(ripple_of_n, current_of_n, max_parallel: int) -> np.ndarray:
    """Return the smallest n meeting both ripple checks (unknown figures count as met)."""
    rows = []
    for n in range(1, max_parallel + 1):
        v_ok = ripple_of_n(n)
        i_ok = current_of_n(n)
        rows.append(v_ok & i_ok)
    return smallest_count(np.vstack(rows))


def screen_output(
    columns: dict[str, np.ndarray],
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> Screen:
    """Return every output-capacitor rule over every capacitor in ``columns``."""
    use, c_eff, figures, notes = _part_figures(columns, profile, spec.vout_v)
    esr = columns["esr_ohm"]
    esr_known = np.where(np.isnan(esr), 0.0, esr)
    i_use = profile.value("capacitor.ripple_current_use")
    d_max, i_pk = envelope.value("duty_max"), envelope.value("il_peak_max_a")
    icout = envelope.value("icout_rms_max_a")
    ripple_a = columns["ripple_a"]

    def ripple(n):
        return output_ripple_voltage_v(spec.iout_a, d_max, spec.fsw_hz, n, c_eff, esr_known, i_pk)

    count = _count_search(
        lambda n: ~(ripple(n) > spec.vout_ripple_v),
        lambda n: ~(icout / n > i_use * ripple_a),
        max_parallel,
    )
    vin_worst = envelope.figures["il_peak_max_a"].worst_vin_v
    rules = (
        voltage_rule(spec.vout_v + spec.vout_ripple_v / 2.0, columns["voltage_v"], use),
        ripple_voltage_rule(
            ripple(count), spec.vout_ripple_v, np.isnan(esr), np.isnan(c_eff), vin_worst
        ),
        ripple_current_rule(icout, count, ripple_a, i_use, vin_worst),
        *_part_rules(columns, spec, profile),
    )
    loss = capacitor_esr_loss_w(icout, esr, count)
    return Screen(
        "output-cap", KIND, {**columns, **figures}, rules, count, loss, tuple(notes),
        operating_point(spec, envelope, USES_OUTPUT),
    )  # fmt: skip


def screen_input(
    columns: dict[str, np.ndarray],
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> Screen:
    """Return every input-capacitor rule over every capacitor in ``columns``."""
    use, c_eff, figures, notes = _part_figures(columns, profile, spec.vin_max_v)
    esr = columns["esr_ohm"]
    esr_known = np.where(np.isnan(esr), 0.0, esr)
    i_use = profile.value("capacitor.ripple_current_use")
    d_il, icin = envelope.value("il_ripple_max_a"), envelope.value("icin_rms_max_a")
    vin_worst = envelope.figures["icin_rms_max_a"].worst_vin_v
    ripple_a, limit_v = columns["ripple_a"], spec.vin_ripple_v

    def ripple(n):
        return input_ripple_voltage_v(d_il, spec.fsw_hz, n, c_eff, esr_known)

    count = _count_search(
        lambda n: np.ones_like(c_eff, dtype=bool) if limit_v is None else ~(ripple(n) > limit_v),
        lambda n: ~(icin / n > i_use * ripple_a),
        max_parallel,
    )
    rules = [
        voltage_rule(spec.vin_max_v, columns["voltage_v"], use),
        ripple_current_rule(icin, count, ripple_a, i_use, vin_worst),
    ]
    if limit_v is not None:
        rules.append(
            ripple_voltage_rule(ripple(count), limit_v, np.isnan(esr), np.isnan(c_eff), vin_worst)
        )
    rules += _part_rules(columns, spec, profile)
    loss = capacitor_esr_loss_w(icin, esr, count)
    return Screen(
        "input-cap", KIND, {**columns, **figures}, tuple(rules), count, loss, tuple(notes),
        operating_point(spec, envelope, USES_INPUT),
    )  # fmt: skip
