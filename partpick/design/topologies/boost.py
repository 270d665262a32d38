"""The boost converter in CCM: worst-case envelope over the input range and per-part stresses.

The model, with sources, is in :mod:`partpick.design.topologies.boost_equations` (re-exported
here): D(Vin) = 1 − Vin·η/Vout, IL = Iout/(1 − D), ΔIL = Vin·D/(fsw·L). The inductor window is
set at the worst ripple point Vin* = Vout/(2η) (clamped): l_min gives ripple = hi·IL(vin_min),
l_max gives lo·IL(vin_min). :mod:`~partpick.design.topologies.boost_model` maximises each
stress over the input range; :mod:`~partpick.design.topologies.boost_envelope` assembles the
named figures, the CCM/DCM verdict and the cautions.
"""

from __future__ import annotations

import numpy as np

from partpick.design.spec import Spec
from partpick.design.topologies.base import Envelope, PartStress
from partpick.design.topologies.boost_envelope import build_envelope
from partpick.design.topologies.boost_equations import (  # noqa: F401 - the model's API
    boost_duty_cycle,
    ccm_conversion_ratio,
    ccm_k_critical,
    ccm_k_factor,
    critical_inductance_h,
    dcm_conversion_ratio,
    dcm_duty_cycle,
    diode_rms_current_a,
    effective_load_resistance_ohm,
    esr_max_ohm,
    inductance_window_h,
    inductor_average_current_a,
    inductor_peak_current_a,
    inductor_ripple_current_a,
    inductor_rms_current_a,
    input_capacitance_min_f,
    input_capacitor_rms_current_a,
    output_capacitance_min_f,
    output_capacitor_rms_current_a,
    output_ripple_voltage_v,
    switch_rms_current_a,
    worst_ripple_input_voltage_v,
)
from partpick.design.topologies.boost_model import (  # noqa: F401 - the model's API
    inductance_limits_h,
    operating_grid,
    vin_grid_v,
    worst_stresses,
)
from partpick.errors import SpecError


class BoostTopology:
    """The boost converter in CCM (one switch, one diode, one inductor)."""

    name = "boost"

    def validate(self, spec: Spec) -> None:
        """Raise SpecError unless vout is above vin_max: a boost only steps up."""
        if spec.vout_v <= spec.vin_max_v:
            raise SpecError(
                key="vout",
                value=spec.vout_v,
                file=spec.source,
                reason=f"must be above vin_max ({spec.vin_max_v:g} V): a boost cannot step "
                "down; use a buck or a buck-boost/SEPIC topology",
            )

    def envelope(self, spec: Spec) -> Envelope:
        """Return the worst-case envelope of ``spec`` (figures of issue 3 and more)."""
        return build_envelope(spec)

    def stresses_at(self, spec: Spec, inductance_h: np.ndarray) -> PartStress:
        """Return the stresses at each inductance (one per part), maximised over Vin."""
        inductance = np.asarray(inductance_h, dtype=float)
        worst = worst_stresses(spec, inductance)
        return PartStress(
            inductance_h=inductance,
            il_peak_a=worst["il_peak"][0],
            il_peak_vin_v=worst["il_peak"][1],
            il_rms_a=worst["il_rms"][0],
            il_rms_vin_v=worst["il_rms"][1],
            il_ripple_a=worst["il_ripple"][0],
            il_ripple_vin_v=worst["il_ripple"][1],
            isw_rms_a=worst["isw_rms"][0],
            id_rms_a=worst["id_rms"][0],
            icout_rms_a=worst["icout_rms"][0],
            icin_rms_a=worst["icin_rms"][0],
        )

    def ccm_at(self, spec: Spec, inductance_h: float) -> bool:
        """Return True where full load stays in CCM over the whole input range at this inductance.

        CCM holds while K = 2L/(R·Ts) > K_crit(D) = D·(1 − D)² at every input voltage of the
        grid, with the efficiency-corrected load R = Vout/(η·Iout). Reference: Erickson &
        Maksimovic, Fundamentals of Power Electronics, 3rd ed., ch. 5.
        """
        grid = operating_grid(spec)
        load_ohm = effective_load_resistance_ohm(spec.vout_v, spec.iout_a, spec.efficiency)
        k_factor = ccm_k_factor(inductance_h, load_ohm, spec.fsw_hz)
        return bool(np.all(k_factor > ccm_k_critical(grid.duty)))
