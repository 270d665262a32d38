"""The BOM's loss terms beyond each part's own conduction: the ones that need another part.

The BOM's first estimate books each role's conduction and switching loss from that role's own
rule module. The terms here need figures a role's rules do not read, or the figures of two
parts at once, so they are added once the whole set is chosen, from the parts' full catalog
rows:

* the diode's recovered charge Q_rr·V_R·fsw, dissipated in the **switch** when it turns on
  (Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd ed., ch. 4);
* the diode's junction capacitance ½·C_j·V²·fsw, also discharged through the switch (same
  chapter, device capacitances);
* the gate drive Q_g·V_drive·fsw, dissipated in the driver (Graovac, Pürschel and Kiep,
  *MOSFET Power Losses Calculation Using the Data-Sheet Parameters*, section 4);
* the inductor's core loss by the iGSE on its triangular current at the worst ripple
  (Venkatachalam et al., IEEE COMPEL 2002; :mod:`partpick.verify.core_loss`);
* the diode's leakage at its own junction temperature (doubling about every 10 °C, from
  memory; :mod:`partpick.verify.thermal`), blocking the output for the duty;
* the controller's fixed loss, the spec's ``quiescent_w``.

Each is evaluated at its worst input voltage, like the rest of the BOM estimate. A term whose
figure is missing is 0 W and listed as not included, with the part it needs data from.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

from partpick import losses
from partpick.verify.core_loss import core_loss_from_part, core_loss_w
from partpick.verify.terms import TERMS_BY_KEY, NotIncluded
from partpick.verify.thermal import leakage_with_self_heating

# a Schottky or SiC Schottky rectifier has no stored charge (Erickson & Maksimovic ch. 4)
_NO_RECOVERY_TYPES = frozenset({"schottky", "sic"})


def _number(part: Mapping[str, object], name: str) -> float | None:
    value = part.get(name)
    if isinstance(value, bool) or not isinstance(value, int | float):
        return None
    return float(value) if math.isfinite(float(value)) else None


def _first(value: float | None, default: float) -> float:
    return default if value is None else value


def _gap(term: str, role: str, part: Mapping[str, object]) -> NotIncluded:
    return NotIncluded(term, role, str(part.get("mpn") or "?"), TERMS_BY_KEY[term].needs or term)


def cross_part_losses(
    spec, envelope, il_ripple_a: float, figures: Mapping[str, Mapping[str, object]]
) -> tuple[dict[str, float], tuple[NotIncluded, ...], tuple[str, ...]]:
    """Return (watts added per role, terms not included, notes) for the chosen set.

    ``figures`` maps a role to its part's full catalog fields (absent: no part chosen);
    ``il_ripple_a`` is the inductor's peak-to-peak ripple with the chosen inductance, in A.
    The roles added to are ``switch``, ``diode``, ``inductor``, ``gate-drive`` and
    ``controller``.
    """
    added = {"switch": 0.0, "diode": 0.0, "inductor": 0.0, "gate-drive": 0.0}
    added["controller"] = float(spec.quiescent_w)
    gaps: list[NotIncluded] = []
    notes: list[str] = []
    fsw, vsw = spec.fsw_hz, envelope.value("vsw_max_v")
    diode, switch, inductor = (figures.get(r) for r in ("diode", "switch", "inductor"))
    if diode is not None:
        qrr = _number(diode, "qrr_c")
        if qrr is None and diode.get("diode_type") in _NO_RECOVERY_TYPES:
            qrr = 0.0
        if qrr is None:
            gaps.append(_gap("recovery", "diode", diode))
        else:
            v_reverse = envelope.value("vd_reverse_max_v")
            added["switch"] += float(losses.diode_recovery_loss_w(qrr, v_reverse, fsw))
        cj = _number(diode, "cj_f")
        if cj is None:
            gaps.append(_gap("diode_cj", "diode", diode))
        else:
            added["switch"] += float(losses.switch_coss_loss_w(cj, vsw, fsw))
        added["diode"], note = _leakage_w(spec, envelope, diode, gaps)
        notes += note
    if switch is not None:
        qg = _number(switch, "qg_c")
        if qg is None:
            gaps.append(_gap("gate_drive", "switch", switch))
        else:
            added["gate-drive"] = float(losses.gate_drive_loss_w(qg, spec.gate_drive_v, fsw))
        if _number(switch, "coss_f") is None:
            gaps.append(_gap("coss", "switch", switch))
    if inductor is not None:
        added["inductor"] = _core_w(spec, envelope, inductor, il_ripple_a, gaps)
    return added, tuple(gaps), tuple(notes)


def switch_heat_from_diode_w(spec, envelope, diode: Mapping[str, object]) -> float:
    """Return what the diode's Q_rr and C_j dissipate in the switch at turn-on, in W.

    Q_rr·V_R·fsw + ½·C_j·V_sw²·fsw at the worst voltages; a missing figure adds nothing
    (a Schottky's Q_rr is zero). Source: Erickson & Maksimovic ch. 4.
    """
    fsw = spec.fsw_hz
    qrr = _number(diode, "qrr_c") or 0.0
    cj = _number(diode, "cj_f") or 0.0
    return float(
        losses.diode_recovery_loss_w(qrr, envelope.value("vd_reverse_max_v"), fsw)
        + losses.switch_coss_loss_w(cj, envelope.value("vsw_max_v"), fsw)
    )


def _core_w(spec, envelope, inductor, il_ripple_a: float, gaps: list[NotIncluded]) -> float:
    """Return the iGSE core loss of the triangle of ``il_ripple_a`` at the largest duty, W."""
    inductance = _number(inductor, "inductance_h")
    core = core_loss_from_part(inductor, inductance) if inductance is not None else None
    if core is None or not math.isfinite(il_ripple_a):
        gaps.append(_gap("core", "inductor", inductor))
        return 0.0
    period, duty = 1.0 / spec.fsw_hz, envelope.value("duty_max")
    return core_loss_w(core, [0.0, duty * period, period], [0.0, il_ripple_a, 0.0])


def _leakage_w(spec, envelope, diode, gaps: list[NotIncluded]) -> tuple[float, list[str]]:
    """Return the leakage loss at the diode's self-heated junction, W, and any note."""
    ir = _number(diode, "ir_a")
    if ir is None:
        gaps.append(_gap("leakage", "diode", diode))
        return 0.0, []
    vf = _number(diode, "vf_v") or 0.0
    period = 1.0 / spec.fsw_hz
    heat = leakage_with_self_heating(
        ambient_degc=spec.ambient_max_degc,
        theta_ja_degc_w=_number(diode, "theta_ja_degc_w") or 0.0,
        fixed_loss_w=vf * spec.iout_a,
        ir_a=ir,
        ir_tj_degc=_first(_number(diode, "ir_tj_degc"), 25.0),
        blocking_v_s=envelope.value("vd_reverse_max_v") * envelope.value("duty_max") * period,
        period_s=period,
    )
    if heat.runaway:
        return heat.leakage_w, [
            f"diode {diode.get('mpn') or '?'}: thermal runaway, its leakage has no steady "
            "junction temperature at the hottest ambient"
        ]
    return heat.leakage_w, []
