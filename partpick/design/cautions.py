"""Cautions and warnings every topology attaches to its envelope, as data (code + sentence)."""

from __future__ import annotations

from partpick.design.topologies.base import Caution
from partpick.units import format_eng

ES1_DC_LIMIT_V = 60.0
"""Steady-state DC limit of energy source class ES1 in IEC 62368-1 (the SELV value under
IEC 61140 practice); above it a circuit counts as a potential shock hazard."""

HIGH_DUTY_LIMIT = 0.9
"""Duty above which a single boost stage is rarely practical (common practice, no published
source: controller minimum off-time, steeply rising losses and a low right-half-plane zero)."""

QUALIFIED_ENGINEER = Caution(
    "qualified-engineer",
    "Results are estimates for a qualified engineer; local codes, company derating policy "
    "and licensed practice prevail.",
)


def hazardous_voltage_caution(highest_v: float) -> Caution | None:
    """Return the hazardous-voltage caution when any node exceeds the ES1/SELV DC limit."""
    if highest_v <= ES1_DC_LIMIT_V:
        return None
    return Caution(
        "hazardous-voltage",
        f"The circuit reaches {format_eng(highest_v, 'V')} DC, above the {ES1_DC_LIMIT_V:g} V "
        "DC limit of ES1 (IEC 62368-1) and SELV (IEC 61140): treat it as hazardous and "
        "review insulation, creepage and clearance, guarding and output discharge.",
    )


def stored_energy_caution(capacitance_f: float, voltage_v: float) -> Caution:
    """Return the caution stating the energy ½·C·V² stored in the output capacitor."""
    energy_j = stored_energy_j(capacitance_f, voltage_v)
    return Caution(
        "stored-energy",
        f"The output capacitor stores {format_eng(energy_j, 'J')} (½·C·V² at the minimum "
        f"{format_eng(capacitance_f, 'F')} and {format_eng(voltage_v, 'V')}); more "
        "capacitance stores more, so let it discharge before handling the board.",
    )


def stored_energy_j(capacitance_f: float, voltage_v: float) -> float:
    """Return the energy stored in a capacitor, E = ½·C·V², in J (C in F, V in V)."""
    return 0.5 * capacitance_f * voltage_v**2


def high_duty_warning(duty_max: float, vin_v: float) -> Caution | None:
    """Return a warning when the duty cycle goes above the practical limit of one stage."""
    if duty_max <= HIGH_DUTY_LIMIT:
        return None
    return Caution(
        "high-duty",
        f"The duty cycle reaches {duty_max:.3f} at {format_eng(vin_v, 'V')} in, above "
        f"{HIGH_DUTY_LIMIT:g}: controller minimum off-time, conduction losses and the "
        "right-half-plane zero make this hard in one stage (common practice); consider a "
        "higher input voltage, two stages or a tapped-inductor or transformer topology.",
    )
