"""One peak for the whole design: recheck the other roles at the chosen inductor and diode.

The roles are first picked against the design's envelope: the peak and ripple at l_min and a
diode drop from the spec. Once an inductor is chosen, its own lowest inductance L·(1 − tol)
fixes the real peak, ripple and RMS currents, and the chosen diode's VF fixes the switch
voltage Vout + ΔVout/2 + VF (Erickson & Maksimovic, *Fundamentals of Power Electronics*, 3rd
ed., ch. 2). :func:`part_envelope` puts those figures into the envelope, and the BOM picks
the capacitors, the switch and the diode again against it, so every line of the BOM holds at
the same, real stresses.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from partpick.design.spec import Spec
from partpick.design.topologies import get_topology
from partpick.design.topologies.base import Envelope, Figure, Topology
from partpick.design.topologies.boost_equations import esr_max_ohm, switch_off_voltage_v
from partpick.screening.pick import pick

RECHECKED_ROLES: tuple[str, ...] = ("input-cap", "output-cap", "diode", "switch")


@dataclass(frozen=True)
class Recheck:
    """The stresses the other roles were rechecked at, against the design's, and what changed.

    ``changed`` lists (role, mpn before, mpn after) where the recheck chose another part;
    ``diode_vf_from`` says whether VF is the chosen diode's or the spec's.
    """

    inductor_mpn: str
    inductance_min_h: float
    il_peak_a: float
    il_peak_vin_v: float | None
    il_ripple_a: float
    design_il_peak_a: float
    diode_vf_v: float
    diode_vf_from: str  # "diode" | "spec"
    vsw_v: float
    design_vsw_v: float
    changed: tuple[tuple[str, str | None, str | None], ...] = ()


def part_envelope(
    spec: Spec, envelope: Envelope, topology: Topology, inductance_min_h: float, vf_v: float
) -> Envelope:
    """Return ``envelope`` with its current figures at ``inductance_min_h`` and VF ``vf_v``.

    inductance_min_h: the chosen inductor's L·(1 − tol), in H; vf_v: the diode drop, in V.
    Peak, ripple and RMS currents are the maxima over the input range at that inductance
    (the topology's ``stresses_at``); the ESR limit follows the peak (TI SLVA372).
    """
    st = topology.stresses_at(spec, np.array([inductance_min_h]))
    peak, peak_vin = float(st.il_peak_a[0]), float(st.il_peak_vin_v[0])
    at_part = {
        "il_peak_max_a": (peak, peak_vin),
        "isw_peak_max_a": (peak, peak_vin),
        "id_peak_max_a": (peak, peak_vin),
        "il_ripple_max_a": (float(st.il_ripple_a[0]), float(st.il_ripple_vin_v[0])),
        "il_rms_max_a": (float(st.il_rms_a[0]), float(st.il_rms_vin_v[0])),
        "isw_rms_max_a": (float(st.isw_rms_a[0]), None),
        "id_rms_max_a": (float(st.id_rms_a[0]), None),
        "icout_rms_max_a": (float(st.icout_rms_a[0]), None),
        "icin_rms_max_a": (float(st.icin_rms_a[0]), None),
        "esr_max_ohm": (float(esr_max_ohm(spec.vout_ripple_v, peak)), peak_vin),
        "vsw_max_v": (float(switch_off_voltage_v(spec.vout_v, spec.vout_ripple_v, vf_v)), None),
    }
    figures = dict(envelope.figures)
    for key, (value, vin) in at_part.items():
        if key in figures:
            figures[key] = _at_part(figures[key], value, vin)
    return replace(envelope, figures=figures)


def _at_part(figure: Figure, value: float, vin: float | None) -> Figure:
    worst = figure.worst_vin_v if vin is None else vin
    return replace(figure, value=value, label=f"{figure.label} (chosen parts)", worst_vin_v=worst)


def chosen_stresses(
    spec: Spec,
    envelope: Envelope,
    inductor: dict[str, object],
    diode: dict[str, object] | None,
    tolerance_default: float,
) -> tuple[float, float, str]:
    """Return (L·(1 − tol) in H, VF in V, where VF came from) of the chosen parts.

    A missing tolerance takes ``tolerance_default``; a chosen diode without VF (or none)
    leaves the spec's ``diode_vf``.
    """
    tol = _number(inductor.get("tolerance"))
    tol = tolerance_default if math.isnan(tol) else tol
    low = _number(inductor.get("inductance_h")) * (1.0 - tol)
    if not (math.isfinite(low) and low > 0):
        low = envelope.value("l_min_h")
    vf = _number((diode or {}).get("vf_v"))
    if math.isfinite(vf) and vf >= 0:
        return low, vf, "diode"
    return low, spec.diode_vf_v, "spec"


def recheck_at_chosen_parts(db, spec, lines, picks, envelope, profile, how, choose_line):
    """Return (lines, picks, Recheck): the capacitor, diode and switch roles picked again at
    the chosen inductor's L·(1 − tol) and the chosen diode's VF (see :mod:`partpick.bom_recheck`).

    Without a chosen inductor nothing is rechecked (Recheck None). ``how`` holds the pick
    options (rank, max_parallel, top); ``choose_line`` turns a PickResult into a BomLine.
    """
    by_role = {line.role: line for line in lines}
    inductor = by_role["inductor"].choice
    if inductor is None:
        return lines, picks, None
    diode = by_role["diode"].choice
    low, vf, vf_from = chosen_stresses(
        spec, envelope, inductor.part, diode.part if diode else None,
        profile.value("inductor.tolerance_default"),
    )  # fmt: skip
    at_parts = part_envelope(spec, envelope, get_topology(spec.topology), low, vf)
    picks = dict(picks)
    for role in RECHECKED_ROLES:
        picks[role] = pick(db, spec, role, profile=profile, envelope=at_parts, **how)
    new_lines = tuple(
        choose_line(picks[line.role]) if line.role in RECHECKED_ROLES else line for line in lines
    )
    changed = tuple(
        (old.role, _mpn(old), _mpn(new))
        for old, new in zip(lines, new_lines, strict=True)
        if (_mpn(old), old.qty) != (_mpn(new), new.qty)
    )
    recheck = Recheck(
        inductor_mpn=inductor.mpn, inductance_min_h=low,
        il_peak_a=at_parts.value("il_peak_max_a"),
        il_peak_vin_v=at_parts.figures["il_peak_max_a"].worst_vin_v,
        il_ripple_a=at_parts.value("il_ripple_max_a"),
        design_il_peak_a=envelope.value("il_peak_max_a"), diode_vf_v=vf, diode_vf_from=vf_from,
        vsw_v=at_parts.value("vsw_max_v"), design_vsw_v=envelope.value("vsw_max_v"),
        changed=changed,
    )  # fmt: skip
    return new_lines, picks, recheck


def _mpn(line) -> str | None:
    return line.choice.mpn if line.choice is not None else None


def _number(value: object) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        return math.nan
    return float(value)
