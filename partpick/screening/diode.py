"""Rules for the ``diode`` role (the boost rectifier), vectorised over every diode.

The rules (profile ``standard`` figures in brackets):

* ``reverse-voltage``: vd_reverse_max_v ≤ u·VRRM [u = 0.8].
* ``forward-current``: Iout ≤ u·IF(AV) [u = 0.7]; in a boost the diode's average current is
  the output current (Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed.,
  ch. 2, charge balance on the output capacitor).
* ``thermal``: T_amb + P·θJA ≤ min(ceiling, Tjmax − margin) [margin 25 °C, no ceiling], with
  P = VF·Iout + Qrr·Vout·fsw: conduction as a constant drop (Erickson & Maksimovic ch. 3) plus
  the recovered-charge loss (same book, ch. 4), via :mod:`partpick.losses`.
* ``recovery``: a ``standard`` recovery rectifier fails above 20 kHz (common practice, no
  published source); other types are not subject to it. A diode without a type is
  unverified above that frequency (missing ``diode_type``), like any missing figure a rule
  needs.
* ``lifecycle``.

A Schottky or SiC Schottky diode with no Qrr is taken as Qrr = 0 (majority-carrier device,
no stored charge), with a note; any other type without Qrr is unverified.
Loss (ranking): P above.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from partpick.losses import diode_conduction_loss_w, diode_recovery_loss_w
from partpick.screening.checks import (
    RuleNeeds,
    RuleResult,
    Screen,
    lifecycle_notes,
    lifecycle_rule,
    limit_rule,
    missing_masks,
    operating_point,
    thermal_rule,
    use_rule,
)

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology
    from partpick.screening.profiles import Profile

KIND = "diode"
FIELDS: tuple[str, ...] = (
    "diode_type",
    "vrrm_v",
    "if_avg_a",
    "vf_v",
    "qrr_c",
    "tj_max_degc",
    "theta_ja_degc_w",
    "lifecycle",
)
CORE: tuple[str, ...] = ("theta_ja_degc_w", "tj_max_degc")
# what each rule reads (the import coverage report says what a file without them costs)
RULES: tuple[RuleNeeds, ...] = (
    RuleNeeds("reverse-voltage", ("vrrm_v",)),
    RuleNeeds("forward-current", ("if_avg_a",)),
    RuleNeeds("thermal", ("theta_ja_degc_w", "tj_max_degc", "vf_v", "qrr_c")),
    RuleNeeds("recovery", ("diode_type",)),  # not needed at or below the recovery limit
    RuleNeeds("lifecycle", ("lifecycle",), optional=True),
)
USES: tuple[str, ...] = ("vd_reverse_max_v", "id_avg_a", "id_peak_max_a")
_NO_STORED_CHARGE = ("schottky", "sic")


def diode_loss_w(vf_v, iout_a: float, qrr_c, vout_v: float, fsw_hz: float) -> np.ndarray:
    """Return P = VF·Iout + Qrr·Vout·fsw, in W (conduction plus recovered charge).

    vf_v: forward drop, in V; iout_a: average diode current, in A; qrr_c: recovered charge, in
    C; vout_v: voltage blocked after turn-off, in V; fsw_hz: in Hz. References: Erickson &
    Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 3 and ch. 4.
    """
    return diode_conduction_loss_w(vf_v, iout_a) + diode_recovery_loss_w(qrr_c, vout_v, fsw_hz)


def junction_temperature_degc(ambient_degc: float, loss_w, theta_ja_degc_w) -> np.ndarray:
    """Return Tj = T_amb + P·θJA, in °C (steady state, junction-to-ambient path)."""
    return ambient_degc + np.asarray(loss_w, dtype=float) * np.asarray(theta_ja_degc_w)


def junction_limit_degc(tj_max_degc, margin_degc: float, ceiling_degc: float) -> np.ndarray:
    """Return the allowed junction temperature, min(ceiling, Tjmax − margin), in °C."""
    return np.minimum(ceiling_degc, np.asarray(tj_max_degc, dtype=float) - margin_degc)


def reverse_voltage_rule(vd_reverse_v: float, vrrm_v, use: float) -> RuleResult:
    vrrm = np.asarray(vrrm_v, dtype=float)
    return use_rule(
        "reverse-voltage", "V", vd_reverse_v, vrrm, use, None,
        missing_masks({"vrrm_v": vrrm}, ("vrrm_v",)),
    )  # fmt: skip


def forward_current_rule(id_avg_a: float, if_avg_a, use: float) -> RuleResult:
    rated = np.asarray(if_avg_a, dtype=float)
    return use_rule(
        "forward-current", "A", id_avg_a, rated, use, None,
        missing_masks({"if_avg_a": rated}, ("if_avg_a",)),
    )  # fmt: skip


def recovery_rule(diode_type: np.ndarray, fsw_hz: float, max_hz: float) -> RuleResult:
    """Return the rule fsw ≤ max_hz, applied to ``standard`` recovery parts only.

    A part without a type might be a standard rectifier: above ``max_hz`` it is unverified
    (missing ``diode_type``); at or below it the rule holds for any type.
    """
    n = diode_type.shape[0]
    untyped = np.asarray(diode_type == None, dtype=bool)  # noqa: E711 - elementwise on objects
    applies = np.asarray(diode_type == "standard", dtype=bool) | untyped
    unknown = untyped & (fsw_hz > max_hz)
    return limit_rule(
        "recovery", "Hz", fsw_hz, max_hz, n, missing=(("diode_type", unknown),), applies=applies
    )


def thermal_rules(columns, spec, profile) -> tuple[RuleResult, np.ndarray, list]:
    """Return (thermal rule, loss in W with NaN where unknown, notes)."""
    qrr = columns["qrr_c"]
    kinds = columns["diode_type"]
    no_charge = np.zeros(kinds.shape[0], dtype=bool)
    for code in _NO_STORED_CHARGE:
        no_charge |= np.asarray(kinds == code, dtype=bool)
    qrr_zero = np.isnan(qrr) & no_charge
    qrr_used = np.where(qrr_zero, 0.0, qrr)
    qrr_missing = np.isnan(qrr_used)
    loss_known = diode_loss_w(
        columns["vf_v"], spec.iout_a, np.where(qrr_missing, 0.0, qrr_used), spec.vout_v,
        spec.fsw_hz,
    )  # fmt: skip
    tj = junction_temperature_degc(spec.ambient_max_degc, loss_known, columns["theta_ja_degc_w"])
    limit = junction_limit_degc(
        columns["tj_max_degc"],
        profile.value("diode.thermal_margin_degc"),
        profile.value("diode.tj_ceiling_degc"),
    )
    missing = missing_masks(columns, ("theta_ja_degc_w", "tj_max_degc", "vf_v"))
    missing += (("qrr_c", qrr_missing),)
    rule = thermal_rule(
        "thermal", tj, columns["tj_max_degc"], limit, spec.ambient_max_degc, None, missing,
        lower_bound=True,
    )  # fmt: skip
    notes = [("Qrr not given; taken as 0 for a Schottky (no stored charge)", qrr_zero)]
    return rule, np.where(qrr_missing, np.nan, loss_known), notes


def screen(
    columns: dict[str, np.ndarray],
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> Screen:
    """Return every diode rule over every diode in ``columns``."""
    thermal, loss, notes = thermal_rules(columns, spec, profile)
    rules = (
        reverse_voltage_rule(
            envelope.value("vd_reverse_max_v"), columns["vrrm_v"],
            profile.value("diode.reverse_voltage_use"),
        ),
        forward_current_rule(
            envelope.value("id_avg_a"), columns["if_avg_a"],
            profile.value("diode.forward_current_use"),
        ),
        thermal,
        recovery_rule(
            columns["diode_type"], spec.fsw_hz, profile.value("diode.standard_recovery_max_hz")
        ),
        lifecycle_rule(columns["lifecycle"]),
    )  # fmt: skip
    untyped = np.asarray(columns["diode_type"] == None, dtype=bool)  # noqa: E711 - object array
    notes += [
        (
            "diode type not given; any type is fast enough at this frequency",
            untyped & (spec.fsw_hz <= profile.value("diode.standard_recovery_max_hz")),
        ),
        *lifecycle_notes(columns["lifecycle"]),
    ]
    count = np.ones(untyped.shape[0], dtype=np.int64)
    return Screen(
        "diode", KIND, columns, rules, count, loss, tuple(notes),
        operating_point(spec, envelope, USES),
    )  # fmt: skip
