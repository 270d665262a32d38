"""What a part would need to pass: the ratings per role, and the one figure that fixes a failure.

:func:`role_requirements` turns a role's screening limits back into ratings a part must have,
such as ``Isat ≥ 5.4 A``, for a search when nothing in the catalog passes. Each comes from the
same profile figure and the same stress the rule uses, taken where it is hardest: at the
lowest inductance the window allows and at the profile's default tolerance, with the most
parts in parallel the profile allows, and for the strictest voltage use of any dielectric. A
part meeting every requirement of its role therefore passes it (the ripple budget is split in
half between the charge and the ESR terms, which is one way of meeting it, not the only one).

:func:`with_thermal_fixes` adds to each thermal rule, per part, the θJA that alone would make
a failing part pass, and the RDS(on) (switch) or VF (diode) that alone would:

* allowed loss P_a = (T_limit − T_amb) / θJA; the part's loss P = (Tj − T_amb) / θJA;
* θJA needed = (T_limit − T_amb) / P;
* RDS(on) needed = RDS(on) − (P − P_a) / (I_sw,rms² · k_hot), the conduction term being
  I² · RDS(on) · k_hot (Graovac, Pürschel and Kiep, *MOSFET Power Losses Calculation Using
  the Data-Sheet Parameters*, 2006, section 2);
* VF needed = VF − (P − P_a) / I_out, the conduction term being VF · I_out (Erickson &
  Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 3).

The core returns data (:class:`~partpick.screening.checks.Requirement`); renderers write the
line "L 9.8–24.5 µH, Isat ≥ 5.4 A, Irms ≥ 4.2 A".
"""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING

import numpy as np

from partpick.screening.checks import Requirement, Screen

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology
    from partpick.screening.profiles import Profile

# A junction limit needs the part's own Tj max; a search line assumes this common rating.
ASSUMED_TJ_MAX_DEGC = 150.0  # the usual silicon rating; common practice, from memory


def role_requirements(
    role: str,
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> tuple[Requirement, ...]:
    """Return the ratings a part of ``role`` needs to pass every rule (see the module text)."""
    build = {
        "inductor": inductor_requirements,
        "input-cap": input_cap_requirements,
        "output-cap": output_cap_requirements,
        "diode": diode_requirements,
        "switch": switch_requirements,
    }[role]
    return build(spec, envelope, topology, profile, max_parallel)


def inductor_requirements(spec, envelope, topology, profile, max_parallel):
    """Return the L window at tolerance, Isat and Irms for the inductor role.

    The lowest nominal L is l_min/(1 − tol), so that L·(1 − tol) stays at or above l_min;
    Isat and Irms are then needed at l_min, the lowest inductance such a part can have.
    """
    l_min, l_max = envelope.value("l_min_h"), envelope.value("l_max_h")
    tol = profile.value("inductor.tolerance_default")
    low = l_min / (1.0 - tol)
    at_h = l_min
    if low > l_max:  # no room for the tolerance: the window at nominal L, stresses at its low end
        low, at_h = l_min, l_min * (1.0 - tol)
    stress = topology.stresses_at(spec, np.array([at_h]))
    note = f"at ±{tol * 100:g} % tolerance"
    return (
        Requirement("inductance_h", ">=", low, "H", "inductance", note),
        Requirement("inductance_h", "<=", l_max, "H", "inductance"),
        Requirement(
            "isat_a", ">=", float(stress.il_peak_a[0]) / profile.value("inductor.saturation_use"),
            "A", "saturation", note,
        ),
        Requirement(
            "irms_a", ">=", float(stress.il_rms_a[0]) / profile.value("inductor.rms_use"),
            "A", "rms", note,
        ),
    )  # fmt: skip


def _strictest_voltage_use(profile: Profile) -> float:
    section = profile.section("capacitor")
    uses = [v for k, v in section.items() if k.startswith("voltage_use.")]
    return min(uses + [section["voltage_use_unknown"]])


def _capacitor_common(profile, max_parallel, working_v, ripple_rms_a):
    use = _strictest_voltage_use(profile)
    ripple_use = profile.value("capacitor.ripple_current_use")
    return [
        Requirement("voltage_v", ">=", working_v / use, "V", "voltage", f"at {use * 100:g} % use"),
        Requirement("ripple_a", ">=", ripple_rms_a / (max_parallel * ripple_use), "A",
                    "ripple-current", "per part"),
    ]  # fmt: skip


def _ripple_budget(ripple_v, charge_as, current_a, max_parallel):
    """Return C_eff and ESR per part that each use half of the ripple budget ``ripple_v``.

    ``charge_as`` is the charge term's numerator, so that ripple = charge_as/(n·C) + ESR/n·I.
    """
    half = ripple_v / 2.0
    note = "per part, half the ripple budget each"
    return [
        Requirement("c_eff_f", ">=", charge_as / (max_parallel * half), "F",
                    "ripple-voltage", note),
        Requirement("esr_ohm", "<=", max_parallel * half / current_a, "ohm", "ripple-voltage",
                    note),
    ]  # fmt: skip


def output_cap_requirements(spec, envelope, topology, profile, max_parallel):
    """Return voltage, C_eff, ESR, ripple current and count for the output capacitors."""
    found = _capacitor_common(
        profile, max_parallel, spec.vout_v + spec.vout_ripple_v / 2.0,
        envelope.value("icout_rms_max_a"),
    )  # fmt: skip
    charge_as = spec.iout_a * envelope.value("duty_max") / spec.fsw_hz
    found += _ripple_budget(
        spec.vout_ripple_v, charge_as, envelope.value("il_peak_max_a"), max_parallel
    )
    found.append(Requirement("count", "<=", float(max_parallel), "count", "ripple-voltage"))
    return tuple(found)


def input_cap_requirements(spec, envelope, topology, profile, max_parallel):
    """Return voltage, ripple current and count (and C_eff, ESR with an input ripple limit)."""
    found = _capacitor_common(
        profile, max_parallel, spec.vin_max_v, envelope.value("icin_rms_max_a")
    )
    if spec.vin_ripple_v is not None:
        ripple_a = envelope.value("il_ripple_max_a")
        found += _ripple_budget(spec.vin_ripple_v, ripple_a / (8.0 * spec.fsw_hz), ripple_a,
                                max_parallel)  # fmt: skip
    found.append(Requirement("count", "<=", float(max_parallel), "count", "ripple-current"))
    return tuple(found)


def _allowed_rise_degc(spec, profile, section: str) -> float:
    limit = min(
        profile.value(f"{section}.tj_ceiling_degc"),
        ASSUMED_TJ_MAX_DEGC - profile.value(f"{section}.thermal_margin_degc"),
    )
    return limit - spec.ambient_max_degc


def diode_requirements(spec, envelope, topology, profile, max_parallel):
    """Return VRRM, IF(AV) and the VF·θJA budget of a no-stored-charge (Schottky) diode."""
    rise = _allowed_rise_degc(spec, profile, "diode")
    note = f"Tj max {ASSUMED_TJ_MAX_DEGC:g} °C, no recovery charge"
    return (
        Requirement("vrrm_v", ">=",
                    envelope.value("vd_reverse_max_v") / profile.value("diode.reverse_voltage_use"),
                    "V", "reverse-voltage"),
        Requirement("if_avg_a", ">=",
                    envelope.value("id_avg_a") / profile.value("diode.forward_current_use"),
                    "A", "forward-current"),
        Requirement("vf_theta_ja", "<=", rise / spec.iout_a, "V·degC/W", "thermal", note),
    )  # fmt: skip


def switch_requirements(spec, envelope, topology, profile, max_parallel):
    """Return VDS, ID and the RDS(on)·θJA budget of the conduction loss alone."""
    rise = _allowed_rise_degc(spec, profile, "switch")
    i_rms = envelope.value("isw_rms_max_a")
    budget = rise / (i_rms**2 * profile.value("switch.hot_factor"))
    note = f"Tj max {ASSUMED_TJ_MAX_DEGC:g} °C, conduction loss only"
    return (
        Requirement("vds_v", ">=",
                    envelope.value("vsw_max_v") / profile.value("switch.drain_voltage_use"),
                    "V", "drain-voltage"),
        Requirement("id_a", ">=",
                    envelope.value("il_peak_max_a") / profile.value("switch.drain_current_use"),
                    "A", "drain-current"),
        Requirement("rds_on_theta_ja", "<=", budget, "ohm·degC/W", "thermal", note),
    )  # fmt: skip


def with_thermal_fixes(screen: Screen, spec: Spec, envelope: Envelope, profile: Profile) -> Screen:
    """Return ``screen`` whose thermal rule carries, per part, the θJA and the RDS(on) or VF
    that alone would make it pass (see the module text); other roles come back unchanged."""
    if screen.role not in ("diode", "switch"):
        return screen
    rules = []
    for rule in screen.rules:
        if rule.rule == "thermal":
            rule = replace(rule, fixes=_thermal_fixes(screen, rule, spec, envelope, profile))
        rules.append(rule)
    return replace(screen, rules=tuple(rules))


def _thermal_fixes(screen, rule, spec, envelope, profile):
    theta = screen.columns["theta_ja_degc_w"]
    with np.errstate(divide="ignore", invalid="ignore"):
        loss_w = (rule.stress - spec.ambient_max_degc) / theta
        allowed_w = (rule.limit - spec.ambient_max_degc) / theta
        excess_w = loss_w - allowed_w
        theta_needed = (rule.limit - spec.ambient_max_degc) / loss_w
        if screen.role == "switch":
            per_ohm = envelope.value("isw_rms_max_a") ** 2 * profile.value("switch.hot_factor")
            other = ("rds_on_ohm", "<=", screen.columns["rds_on_ohm"] - excess_w / per_ohm, "ohm")
        else:
            other = ("vf_v", "<=", screen.columns["vf_v"] - excess_w / spec.iout_a, "V")
    return (("theta_ja_degc_w", "<=", theta_needed, "degC/W"), other)
