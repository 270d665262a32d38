"""Requirements as text: the line to paste into a parametric search, and a thermal fix.

A requirement ``isat_a >= 5.4`` (:class:`partpick.screening.checks.Requirement`) reads
"Isat ≥ 5.4 A". Values are rounded *towards safety* to three significant figures: a minimum
up, a maximum down, so a part found with the pasted figure still meets the exact one.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from partpick.screening.checks import Requirement
from partpick.units import format_eng

LABELS: dict[str, str] = {
    "inductance_h": "L",
    "isat_a": "Isat",
    "irms_a": "Irms",
    "voltage_v": "V rated",
    "c_eff_f": "C_eff",
    "esr_ohm": "ESR",
    "ripple_a": "ripple",
    "vrrm_v": "VRRM",
    "if_avg_a": "IF(AV)",
    "vf_theta_ja": "VF·θJA",
    "vds_v": "VDS",
    "id_a": "ID",
    "rds_on_theta_ja": "Rds(on)·θJA",
    "theta_ja_degc_w": "θJA",
    "rds_on_ohm": "Rds(on)",
    "vf_v": "VF",
}
# units of the product budgets, which units.format_eng does not know by key
_SYMBOLS = {"V·degC/W": "V·°C/W", "ohm·degC/W": "Ω·°C/W"}
_SIGNIFICANT = 3


def safe_value(value: float, comparison: str) -> float:
    """Return ``value`` to three significant figures, rounded up for ≥ and down for ≤."""
    if value == 0 or not math.isfinite(value):
        return value
    step = 10 ** (math.floor(math.log10(abs(value))) - (_SIGNIFICANT - 1))
    scaled = value / step  # the tolerance keeps a value already at 3 figures where it is
    whole = math.ceil(scaled - 1e-9) if comparison == ">=" else math.floor(scaled + 1e-9)
    return float(f"{whole * step:.{_SIGNIFICANT}g}")


def quantity(req: Requirement) -> str:
    """Return the requirement's value as engineering text, rounded towards safety."""
    value = safe_value(req.value, req.comparison)
    return format_eng(value, _SYMBOLS.get(req.unit, req.unit))


def requirement_text(req: Requirement) -> str:
    """Return one requirement, such as "Isat ≥ 5.4 A" or "up to 4 in parallel"."""
    if req.field == "count":
        return f"up to {req.value:g} in parallel"
    sign = "≥" if req.comparison == ">=" else "≤"
    return f"{LABELS.get(req.field, req.field)} {sign} {quantity(req)}"


def requirements_line(requirements: Sequence[Requirement]) -> str:
    """Return the requirements as one pasteable line; a ≥ and ≤ pair becomes a range."""
    texts: list[str] = []
    by_field: dict[str, dict[str, Requirement]] = {}
    for req in requirements:
        by_field.setdefault(req.field, {})[req.comparison] = req
    done: set[str] = set()
    for req in requirements:
        if req.field in done:
            continue
        pair = by_field[req.field]
        if len(pair) == 2 and req.field != "count":
            low, high = quantity(pair[">="]), quantity(pair["<="])
            low_number, _, unit = low.rpartition(" ")
            high_number, _, high_unit = high.rpartition(" ")
            same_unit = unit == high_unit
            shown = f"{low_number}–{high}" if same_unit else f"{low}–{high}"
            texts.append(f"{LABELS.get(req.field, req.field)} {shown}")
        else:
            texts.append(requirement_text(req))
        done.add(req.field)
    return ", ".join(texts)


def requirements_assumptions(requirements: Sequence[Requirement]) -> str:
    """Return the distinct notes of the requirements, such as "at ±20 % tolerance"."""
    return "; ".join(dict.fromkeys(r.note for r in requirements if r.note))


def fixes_text(fixes: Sequence[Requirement]) -> str:
    """Return the single figures that would each pass, "θJA ≤ 41 °C/W, or Rds(on) ≤ 11 mΩ"."""
    return ", or ".join(requirement_text(f) for f in fixes)
