"""Inductor core loss from catalog Steinmetz data, by the iGSE on the piecewise-linear flux.

The flux density of an inductor is proportional to its current, B = L·i/(N·Ae), so the
Steinmetz law P = k·Ve·f^α·B̂^β of the core can be written in the winding current itself:
P = K·f^α·Î^β with K = k·Ve·(L/(N·Ae))^β (W when f is in Hz and the current amplitude Î in
A). The catalog gives K in one of two ways:

* the material's k, α, β with the core's volume Ve, cross-section Ae and turns N;
* the loss P_ref of one sinusoidal reference point (frequency f_ref, peak-to-peak current
  ΔI_ref) with α and β: K = P_ref / (f_ref^α · (ΔI_ref/2)^β).

The waveform model's inductor current is piecewise linear to within its resistive droop, so
its period's vertices (the switching instants) go straight into the piecewise-linear form of
the iGSE of :func:`partpick.losses.igse_piecewise_linear_loss`, with the current in the place
of the flux.

References
----------
.. [VLGS] K. Venkatachalam, C. R. Sullivan, T. Abdallah and H. Tacca, "Accurate prediction of
   ferrite core loss with nonsinusoidal waveforms using only Steinmetz parameters", IEEE
   COMPEL, 2002.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

from partpick import losses

__all__ = ["CoreLoss", "core_loss_from_part", "core_loss_w"]


@dataclass(frozen=True)
class CoreLoss:
    """Steinmetz data referred to the winding current: P = coefficient · f^α · Î^β, in W."""

    coefficient: float
    alpha: float
    beta: float
    source: str  # "material" (k, Ve, Ae, N) or "reference" (one measured point)


def _number(part: Mapping[str, object], name: str) -> float | None:
    value = part.get(name)
    if isinstance(value, bool) or not isinstance(value, int | float):
        return None
    value = float(value)
    return value if math.isfinite(value) and value > 0.0 else None


def core_loss_from_part(part: Mapping[str, object], inductance_h: float) -> CoreLoss | None:
    """Return the part's core-loss data referred to its current, or None where it has none.

    The material form (core_k, core_volume_m3, core_area_m2, turns) wins over the reference
    point (core_loss_ref_w, core_loss_ref_hz, core_loss_ref_ripple_a); both need core_alpha
    and core_beta. inductance_h: the inductance the waveforms use, in H.
    """
    alpha, beta = _number(part, "core_alpha"), _number(part, "core_beta")
    if alpha is None or beta is None:
        return None
    k, volume = _number(part, "core_k"), _number(part, "core_volume_m3")
    area, turns = _number(part, "core_area_m2"), _number(part, "turns")
    if None not in (k, volume, area, turns):
        flux_per_amp_t = inductance_h / (turns * area)  # B = L·i/(N·Ae), in T/A
        return CoreLoss(k * volume * flux_per_amp_t**beta, alpha, beta, "material")
    ref_w, ref_hz = _number(part, "core_loss_ref_w"), _number(part, "core_loss_ref_hz")
    ref_a = _number(part, "core_loss_ref_ripple_a")
    if None not in (ref_w, ref_hz, ref_a):
        return CoreLoss(ref_w / (ref_hz**alpha * (ref_a / 2.0) ** beta), alpha, beta, "reference")
    return None


def core_loss_w(core: CoreLoss, times_s, currents_a) -> float:
    """Return the iGSE core loss of one period of a piecewise-linear inductor current, in W.

    times_s: the vertices' instants over one period (first to last = T), in s; currents_a:
    the inductor current at each vertex (last equal to first), in A. Source: [VLGS].
    """
    return losses.igse_piecewise_linear_loss(
        core.coefficient, core.alpha, core.beta, times_s, currents_a
    )
