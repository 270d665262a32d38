"""Rules for the ``switch`` role (the low-side MOSFET), vectorised over every mosfet.

The rules (profile ``standard`` figures in brackets):

* ``drain-voltage``: vsw_max_v ≤ u·VDS [u = 0.8].
* ``drain-current``: the inductor peak at l_min ≤ u·ID [u = 0.6].
* ``channel``: a ``p`` channel part fails; a part without a channel is unverified (missing
  ``channel``), unless the profile sets ``switch.assume_n_channel = true`` (then it is taken
  as ``n``, with a note). ``standard`` and ``high-rel`` set it false: one policy for a
  missing figure a rule needs.
* ``thermal``: T_amb + P·θJA ≤ min(ceiling, Tjmax − margin) [margin 25 °C, no ceiling], where
  P is the sum of (D. Graovac, M. Pürschel and A. Kiep, *MOSFET Power Losses Calculation
  Using the Data-Sheet Parameters*, 2006, via :mod:`partpick.losses`):

  - conduction, I_sw,rms² · RDS(on) · k_hot [k_hot = 1.5: RDS(on) rises roughly 30–50 % at a
    hot junction; common practice, from memory] (Graovac et al., section 2);
  - switching, ½·V_sw·I_L,avg·(t_r + t_f)·fsw with t_r = t_f = Qgd/I_gate (Graovac et al.,
    section 3, linear overlap, transition times from the Miller charge);
  - output capacitance, ½·Coss·V_sw²·fsw (Graovac et al., section 3);
  - in a BOM, the chosen diode's recovered charge Q_rr·V·fsw and junction capacitance
    ½·C_j·V²·fsw, which the switch dissipates at turn-on (Erickson & Maksimovic,
    *Fundamentals of Power Electronics*, 3rd ed., ch. 4), given as ``spec.switch_extra_loss_w``.
* ``lifecycle``.

A part without Coss has that (usually small) term left out, with a note; without RDS(on) or
Qgd the loss is a lower bound and the part is unverified unless it already fails.
Loss (ranking): P above.
"""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING

import numpy as np

from partpick.losses import (
    switch_conduction_loss_w,
    switch_coss_loss_w,
    switch_switching_loss_w,
    switch_transition_time_s,
)
from partpick.screening.checks import (
    UNVERIFIED,
    RuleNeeds,
    RuleResult,
    Screen,
    flag_rule,
    lifecycle_notes,
    lifecycle_rule,
    missing_masks,
    operating_point,
    thermal_rule,
    use_rule,
)
from partpick.screening.diode import junction_limit_degc, junction_temperature_degc

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology
    from partpick.screening.profiles import Profile

KIND = "mosfet"
FIELDS: tuple[str, ...] = (
    "channel",
    "vds_v",
    "id_a",
    "rds_on_ohm",
    "qgd_c",
    "coss_f",
    "tj_max_degc",
    "theta_ja_degc_w",
    "lifecycle",
)
CORE: tuple[str, ...] = ("theta_ja_degc_w", "tj_max_degc", "qgd_c")
# what each rule reads (the import coverage report says what a file without them costs)
RULES: tuple[RuleNeeds, ...] = (
    RuleNeeds("drain-voltage", ("vds_v",)),
    RuleNeeds("drain-current", ("id_a",)),
    RuleNeeds("channel", ("channel",)),  # optional only with switch.assume_n_channel
    RuleNeeds("thermal", ("theta_ja_degc_w", "tj_max_degc", "rds_on_ohm", "qgd_c")),
    RuleNeeds("lifecycle", ("lifecycle",), optional=True),
)
USES: tuple[str, ...] = ("vsw_max_v", "il_peak_max_a", "il_avg_max_a", "isw_rms_max_a")


def switch_loss_w(
    isw_rms_a: float,
    rds_on_ohm,
    hot_factor: float,
    vsw_v: float,
    il_avg_a: float,
    qgd_c,
    gate_drive_a: float,
    coss_f,
    fsw_hz: float,
) -> np.ndarray:
    """Return P = I²·RDS(on)·k_hot + ½·V·I·(t_r + t_f)·fsw + ½·Coss·V²·fsw, in W.

    t_r = t_f = Qgd / I_gate. Units: A, Ω, dimensionless, V, A, C, A, F, Hz. References:
    Graovac, Pürschel and Kiep, *MOSFET Power Losses Calculation Using the Data-Sheet
    Parameters*, sections 2 and 3.
    """
    t_s = switch_transition_time_s(qgd_c, gate_drive_a)
    return (
        switch_conduction_loss_w(isw_rms_a, rds_on_ohm, hot_factor)
        + switch_switching_loss_w(vsw_v, il_avg_a, t_s, t_s, fsw_hz)
        + switch_coss_loss_w(coss_f, vsw_v, fsw_hz)
    )


def drain_voltage_rule(vsw_v: float, vds_v, use: float) -> RuleResult:
    vds = np.asarray(vds_v, dtype=float)
    return use_rule(
        "drain-voltage", "V", vsw_v, vds, use, None, missing_masks({"vds_v": vds}, ("vds_v",))
    )


def drain_current_rule(il_peak_a: float, il_peak_vin_v, id_a, use: float) -> RuleResult:
    rated = np.asarray(id_a, dtype=float)
    return use_rule(
        "drain-current", "A", il_peak_a, rated, use, il_peak_vin_v,
        missing_masks({"id_a": rated}, ("id_a",)),
    )  # fmt: skip


def channel_rule(channel: np.ndarray, assume_n: bool = False) -> RuleResult:
    """Return the rule: the low-side switch of a boost must be an n-channel part.

    A part without a channel is unverified (missing ``channel``) unless ``assume_n``.
    """
    rule = flag_rule("channel", np.asarray(channel == "p", dtype=bool))
    if assume_n:
        return rule
    missing = np.asarray(channel == None, dtype=bool)  # noqa: E711 - elementwise on objects
    status = rule.status.copy()
    status[missing] = UNVERIFIED
    return replace(rule, status=status, missing=(("channel", missing),))


def thermal_rules(columns, spec, envelope, profile) -> tuple[RuleResult, np.ndarray, list]:
    """Return (thermal rule, loss in W with NaN where unknown, notes)."""
    coss_missing = np.isnan(columns["coss_f"])
    lacking = missing_masks(columns, ("rds_on_ohm", "qgd_c"))
    known = {k: np.where(np.isnan(columns[k]), 0.0, columns[k]) for k in ("rds_on_ohm", "qgd_c")}
    loss = switch_loss_w(
        envelope.value("isw_rms_max_a"), known["rds_on_ohm"], profile.value("switch.hot_factor"),
        envelope.value("vsw_max_v"), envelope.value("il_avg_max_a"), known["qgd_c"],
        spec.gate_drive_a, np.where(coss_missing, 0.0, columns["coss_f"]), spec.fsw_hz,
    )  # fmt: skip
    # the chosen diode's recovered charge and Cj are dissipated here too (set by the BOM)
    heat = loss + getattr(spec, "switch_extra_loss_w", 0.0)
    tj = junction_temperature_degc(spec.ambient_max_degc, heat, columns["theta_ja_degc_w"])
    limit = junction_limit_degc(
        columns["tj_max_degc"],
        profile.value("switch.thermal_margin_degc"),
        profile.value("switch.tj_ceiling_degc"),
    )
    missing = missing_masks(columns, ("theta_ja_degc_w", "tj_max_degc")) + lacking
    rule = thermal_rule(
        "thermal", tj, columns["tj_max_degc"], limit, spec.ambient_max_degc,
        envelope.figures["isw_rms_max_a"].worst_vin_v, missing, lower_bound=True,
    )  # fmt: skip
    incomplete = lacking[0][1] | lacking[1][1]
    notes = [("Coss not given; its switching loss is left out", coss_missing)]
    return rule, np.where(incomplete, np.nan, loss), notes


def screen(
    columns: dict[str, np.ndarray],
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> Screen:
    """Return every switch rule over every mosfet in ``columns``."""
    assume_n = bool(profile.value("switch.assume_n_channel"))
    thermal, loss, notes = thermal_rules(columns, spec, envelope, profile)
    peak = envelope.figures["il_peak_max_a"]
    rules = (
        drain_voltage_rule(
            envelope.value("vsw_max_v"), columns["vds_v"],
            profile.value("switch.drain_voltage_use"),
        ),
        drain_current_rule(
            peak.value, peak.worst_vin_v, columns["id_a"],
            profile.value("switch.drain_current_use"),
        ),
        channel_rule(columns["channel"], assume_n),
        thermal,
        lifecycle_rule(columns["lifecycle"]),
    )  # fmt: skip
    no_channel = np.asarray(columns["channel"] == None, dtype=bool)  # noqa: E711 - object array
    notes += [
        ("channel not given; taken as n (profile assume_n_channel)", no_channel & assume_n),
        *lifecycle_notes(columns["lifecycle"]),
    ]
    count = np.ones(no_channel.shape[0], dtype=np.int64)
    return Screen(
        "switch", KIND, columns, rules, count, loss, tuple(notes),
        operating_point(spec, envelope, USES),
    )  # fmt: skip
