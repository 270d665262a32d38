"""Junction temperatures, and the leakage of a rectifier that heats its own junction.

A Schottky's reverse leakage grows with its junction temperature, and the leakage loss heats
the junction: Tj = T_amb + θJA·(P_fixed + P_leak(Tj)). The right-hand side grows
monotonically with Tj, so iterating from T_amb climbs to the lowest fixed point where one
exists; where none exists (the leakage loss outgrows the heat path) the iteration runs away,
which is a thermal-runaway failure and not a number.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from partpick import losses

# A junction past this is destroyed whatever its rating; the iteration stops there
# (common practice, no published source).
RUNAWAY_DEGC = 400.0
_TOLERANCE_DEGC = 1e-3
_MAX_STEPS = 500


def junction_temperature_degc(ambient_degc: float, loss_w: float, theta_ja_degc_w: float) -> float:
    """Return Tj = T_amb + P·θJA, in °C (steady state, junction-to-ambient path)."""
    return ambient_degc + loss_w * theta_ja_degc_w


@dataclass(frozen=True)
class LeakageHeat:
    """The leakage loss at the junction temperature it sets, in W and °C.

    ``runaway`` is True where no steady temperature exists; ``tj_degc`` is then the
    temperature at which the iteration stopped (at least :data:`RUNAWAY_DEGC`).
    """

    leakage_w: float
    tj_degc: float
    runaway: bool


def leakage_with_self_heating(
    *,
    ambient_degc: float,
    theta_ja_degc_w: float,
    fixed_loss_w: float,
    ir_a: float,
    ir_tj_degc: float,
    blocking_v_s: float,
    period_s: float,
) -> LeakageHeat:
    """Return the leakage loss at the junction's own steady temperature (fixed-point iteration).

    P_leak(Tj) = I_R(Tj) · (∫ v_R dt)/T with I_R(Tj) of
    :func:`partpick.losses.schottky_leakage_a`. ambient_degc: in °C; theta_ja_degc_w: in °C/W;
    fixed_loss_w: the junction's other losses, in W; ir_a at ir_tj_degc: the data-sheet
    leakage, in A at °C; blocking_v_s: the integral of the reverse voltage over the period, in
    V·s; period_s: in s.
    """
    mean_reverse_v = blocking_v_s / period_s
    tj = ambient_degc
    for _ in range(_MAX_STEPS):
        leak_w = float(losses.schottky_leakage_a(ir_a, ir_tj_degc, tj)) * mean_reverse_v
        following = junction_temperature_degc(ambient_degc, fixed_loss_w + leak_w, theta_ja_degc_w)
        if not math.isfinite(following) or following >= RUNAWAY_DEGC:
            return LeakageHeat(leak_w, max(following, RUNAWAY_DEGC), True)
        if abs(following - tj) < _TOLERANCE_DEGC:
            final_w = float(losses.schottky_leakage_a(ir_a, ir_tj_degc, following))
            return LeakageHeat(final_w * mean_reverse_v, following, False)
        tj = following
    return LeakageHeat(leak_w, tj, True)
