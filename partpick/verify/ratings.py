"""Ratings checked at every operating point of a verification, and the violations found.

The pick checks each part against the worst case the design *expects*; the verifier checks
the chosen parts against what the solved steady state *does*, at every point it solves,
regulated or open loop, CCM or DCM. The limits are the same derated figures the pick used
(the profile's use factors and junction margins), so a point that passes here passes the
review's derating policy:

* ``output-voltage``: the output peak (ESR step included) ≤ u·V_rated of the output
  capacitor (u of the profile for its dielectric);
* ``hazard-voltage``: an output peak above 60 V DC where the spec's output is below it, so
  the design was not marked hazardous (IEC 61140 / EN 60950 SELV, from memory: 60 V DC);
* ``drain-voltage``: the switch node peak, vo + V_F + R_D·iL at its highest, ≤ u·VDS;
* ``reverse-voltage``: the diode's reverse voltage (the output while the switch is on) ≤
  u·VRRM;
* ``saturation``: the inductor's peak current with its inductance at the low end of its
  tolerance, L·(1 − tol), solved again at the same point, ≤ u·Isat;
* ``switch-thermal`` / ``diode-thermal``: T_amb,max + θJA·P ≤ min(ceiling, Tjmax − margin),
  P the losses that heat that junction (:mod:`partpick.verify.terms`);
* ``thermal-runaway``: the diode's leakage has no steady junction temperature.

A rating the catalog lacks is not guessed: the check is listed in ``unchecked``.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from typing import Any

from partpick.verify.stage import Stage
from partpick.verify.steady_state import SteadyState, steady_state
from partpick.verify.thermal import junction_temperature_degc

# The SELV limit of safety standards (from memory: 60 V DC), as in design/cautions.py.
HAZARD_V = 60.0


@dataclass(frozen=True)
class Ratings:
    """The ratings and derating figures the checks compare against (None: not in catalog)."""

    cap_voltage_v: float | None
    cap_voltage_use: float
    vds_v: float | None
    vds_use: float
    vrrm_v: float | None
    vrrm_use: float
    isat_a: float | None
    isat_use: float
    inductance_tolerance: float
    switch_tj_max_degc: float | None
    switch_theta_ja_degc_w: float | None
    switch_margin_degc: float
    switch_ceiling_degc: float
    diode_tj_max_degc: float | None
    diode_theta_ja_degc_w: float | None
    diode_margin_degc: float
    diode_ceiling_degc: float
    ambient_degc: float
    spec_vout_v: float
    parts: dict[str, str] = field(default_factory=dict)

    def switch_limit_degc(self) -> float | None:
        return _junction_limit(self.switch_tj_max_degc, self.switch_margin_degc,
                               self.switch_ceiling_degc)  # fmt: skip

    def diode_limit_degc(self) -> float | None:
        return _junction_limit(self.diode_tj_max_degc, self.diode_margin_degc,
                               self.diode_ceiling_degc)  # fmt: skip


def _junction_limit(tj_max: float | None, margin: float, ceiling: float) -> float | None:
    """Return min(ceiling, Tjmax − margin), in °C, or None without Tjmax."""
    return None if tj_max is None else min(ceiling, tj_max - margin)


@dataclass(frozen=True)
class Violation:
    """One rating exceeded at one operating point: the figure, its limit and the rating."""

    vin_v: float
    iout_a: float
    rule: str
    role: str
    part: str
    value: float
    limit: float
    unit: str
    rating: float | None = None

    def to_dict(self) -> dict[str, object]:
        return {
            "point": {"vin_v": self.vin_v, "iout_a": self.iout_a},
            "rule": self.rule,
            "role": self.role,
            "part": self.part,
            "value": self.value,
            "limit": self.limit,
            "unit": self.unit,
            "rating": self.rating,
        }


@dataclass(frozen=True)
class Unchecked:
    """A check not made because the part lacks the rating it needs."""

    rule: str
    role: str
    part: str
    figure: str

    def to_dict(self) -> dict[str, str]:
        return {"rule": self.rule, "role": self.role, "part": self.part, "figure": self.figure}


def _number(part: Mapping[str, object], name: str) -> float | None:
    value = part.get(name)
    if isinstance(value, bool) or not isinstance(value, int | float):
        return None
    return float(value) if math.isfinite(float(value)) else None


def ratings_from_parts(
    spec: Any, parts: Mapping[str, Mapping[str, object]], profile: Any
) -> Ratings:
    """Return the ratings of the chosen parts with the profile's derating figures."""
    cap, switch = parts.get("output-cap", {}), parts.get("switch", {})
    diode, inductor = parts.get("diode", {}), parts.get("inductor", {})
    tolerance = _number(inductor, "tolerance")
    dielectric = cap.get("dielectric")
    return Ratings(
        cap_voltage_v=_number(cap, "voltage_v"),
        cap_voltage_use=profile.voltage_use(dielectric if isinstance(dielectric, str) else None),
        vds_v=_number(switch, "vds_v"),
        vds_use=profile.value("switch.drain_voltage_use"),
        vrrm_v=_number(diode, "vrrm_v"),
        vrrm_use=profile.value("diode.reverse_voltage_use"),
        isat_a=_number(inductor, "isat_a"),
        isat_use=profile.value("inductor.saturation_use"),
        inductance_tolerance=(
            tolerance if tolerance is not None else profile.value("inductor.tolerance_default")
        ),
        switch_tj_max_degc=_number(switch, "tj_max_degc"),
        switch_theta_ja_degc_w=_number(switch, "theta_ja_degc_w"),
        switch_margin_degc=profile.value("switch.thermal_margin_degc"),
        switch_ceiling_degc=profile.value("switch.tj_ceiling_degc"),
        diode_tj_max_degc=_number(diode, "tj_max_degc"),
        diode_theta_ja_degc_w=_number(diode, "theta_ja_degc_w"),
        diode_margin_degc=profile.value("diode.thermal_margin_degc"),
        diode_ceiling_degc=profile.value("diode.tj_ceiling_degc"),
        ambient_degc=float(spec.ambient_max_degc),
        spec_vout_v=float(spec.vout_v),
        parts={role: str(part.get("mpn") or "?") for role, part in parts.items()},
    )


def unchecked_ratings(ratings: Ratings) -> tuple[Unchecked, ...]:
    """Return the checks the catalog data does not allow, naming part and figure."""
    needs = (
        ("output-voltage", "output-cap", ratings.cap_voltage_v, "voltage_v"),
        ("drain-voltage", "switch", ratings.vds_v, "vds_v"),
        ("reverse-voltage", "diode", ratings.vrrm_v, "vrrm_v"),
        ("saturation", "inductor", ratings.isat_a, "isat_a"),
        ("switch-thermal", "switch", ratings.switch_tj_max_degc, "tj_max_degc"),
        ("switch-thermal", "switch", ratings.switch_theta_ja_degc_w, "theta_ja_degc_w"),
        ("diode-thermal", "diode", ratings.diode_tj_max_degc, "tj_max_degc"),
        ("diode-thermal", "diode", ratings.diode_theta_ja_degc_w, "theta_ja_degc_w"),
    )
    return tuple(
        Unchecked(rule, role, ratings.parts.get(role, role), figure)
        for rule, role, value, figure in needs
        if value is None
    )


def point_violations(
    ratings: Ratings,
    stage: Stage,
    state: SteadyState,
    iout_a: float,
    *,
    vout_v: float | None,
    duty: float | None,
) -> list[Violation]:
    """Return every rating exceeded at one solved point (see the module docstring).

    ``vout_v`` (regulated) or ``duty`` (open loop) re-solve the point at L·(1 − tol) for the
    saturation check, exactly as the point itself was solved.
    """
    found: list[Violation] = []

    def check(rule: str, role: str, value: float, rating: float | None, use: float, unit: str):
        if rating is not None and value > use * rating:
            part = ratings.parts.get(role, role)
            found.append(
                Violation(state.vin_v, iout_a, rule, role, part, value, use * rating, unit, rating)
            )

    node_peak_v = state.vout_max_v + stage.diode_vf_v + stage.diode_rd_ohm * state.il_max_a
    check("output-voltage", "output-cap", state.vout_max_v, ratings.cap_voltage_v,
          ratings.cap_voltage_use, "V")  # fmt: skip
    if ratings.spec_vout_v <= HAZARD_V:
        check("hazard-voltage", "output-cap", state.vout_max_v, HAZARD_V, 1.0, "V")
    check("drain-voltage", "switch", node_peak_v, ratings.vds_v, ratings.vds_use, "V")
    check("reverse-voltage", "diode", state.vout_max_v, ratings.vrrm_v, ratings.vrrm_use, "V")
    if ratings.isat_a is not None:
        low_l = replace(
            stage, inductance_h=stage.inductance_h * (1.0 - ratings.inductance_tolerance)
        )
        peak_a = steady_state(low_l, state.vin_v, state.load_ohm, vout_v=vout_v, duty=duty).il_max_a
        check("saturation", "inductor", peak_a, ratings.isat_a, ratings.isat_use, "A")
    found += _thermal_violations(ratings, state, iout_a)
    return found


def _thermal_violations(ratings: Ratings, state: SteadyState, iout_a: float) -> list[Violation]:
    found = []
    switch_limit = ratings.switch_limit_degc()
    if switch_limit is not None and ratings.switch_theta_ja_degc_w is not None:
        tj = junction_temperature_degc(
            ratings.ambient_degc, state.heat_w("switch"), ratings.switch_theta_ja_degc_w
        )
        if tj > switch_limit:
            found.append(Violation(state.vin_v, iout_a, "switch-thermal", "switch",
                                   ratings.parts.get("switch", "switch"), tj, switch_limit,
                                   "degC", ratings.switch_tj_max_degc))  # fmt: skip
    diode_limit = ratings.diode_limit_degc()
    part = ratings.parts.get("diode", "diode")
    if state.thermal_runaway:
        limit = diode_limit if diode_limit is not None else math.inf
        found.append(Violation(state.vin_v, iout_a, "thermal-runaway", "diode", part,
                               state.diode_tj_degc or math.inf, limit, "degC",
                               ratings.diode_tj_max_degc))  # fmt: skip
    elif diode_limit is not None and state.diode_tj_degc is not None:
        if state.diode_tj_degc > diode_limit:
            found.append(Violation(state.vin_v, iout_a, "diode-thermal", "diode", part,
                                   state.diode_tj_degc, diode_limit, "degC",
                                   ratings.diode_tj_max_degc))  # fmt: skip
    return found
