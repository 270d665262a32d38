"""Operating points, the verification of a whole design, and waveforms for plotting.

:func:`verify_design` solves the steady state of one :class:`~partpick.verify.stage.Stage`
at every operating point and returns the figures and the warnings as data
(:class:`VerifyResult`); renderers write the sentences. :func:`verify_parts` is the entry
the BOM uses for its short verification section.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import asdict, dataclass
from typing import Any

import numpy as np

from partpick.errors import ParameterError
from partpick.verify.orbit import MODE_CCM, MODE_DCM
from partpick.verify.ratings import (
    Ratings,
    Unchecked,
    Violation,
    point_violations,
    ratings_from_parts,
    unchecked_ratings,
)
from partpick.verify.stage import Stage, stage_from_parts
from partpick.verify.steady_state import SteadyState, sample_segment, steady_state
from partpick.verify.terms import not_included_terms

# A regulated duty above 0.9 is impractical for a boost (issue 3; common practice).
HIGH_DUTY = 0.9
# How far the verified efficiency may sit below the estimate the design's currents were
# computed with before it is worth a warning (common practice, no published source). Above
# the estimate is never warned about: the design is then conservative.
EFFICIENCY_TOLERANCE = 0.01

WARNING_CODES: tuple[str, ...] = (
    "vout-unreachable",
    "ripple-above-limit",
    "dcm-where-ccm-assumed",
    "high-duty",
    "efficiency-below-estimate",
    "diode-reconducts",
    "loss-not-included",
)


@dataclass(frozen=True)
class OperatingPoint:
    """An input voltage (V) and a load current (A); the load is R = vout / iout."""

    vin_v: float
    iout_a: float


@dataclass(frozen=True)
class VerifyWarning:
    """One warning: its code (of :data:`WARNING_CODES`), where, the figure and its limit.

    ``vin_v`` and ``iout_a`` are None for a warning about every point (a loss term left out
    for want of data, named in ``detail`` as term, part and figure).
    """

    code: str
    vin_v: float | None
    iout_a: float | None
    value: float
    limit: float | None
    unit: str
    detail: dict[str, str] | None = None

    def to_dict(self) -> dict[str, object]:
        return {
            "code": self.code,
            "vin_v": self.vin_v,
            "iout_a": self.iout_a,
            "value": self.value,
            "limit": self.limit,
            "unit": self.unit,
            "detail": self.detail,
        }


@dataclass(frozen=True)
class PointResult:
    """The steady state at one operating point."""

    point: OperatingPoint
    state: SteadyState

    def to_dict(self) -> dict[str, object]:
        """Return the JSON object of the point (SI units; keys of issue 6 first)."""
        s = self.state
        return {
            "vin_v": self.point.vin_v,
            "iout_a": self.point.iout_a,
            "duty": s.duty,
            "vout_avg_v": s.vout_avg_v,
            "vout_ripple_v": s.vout_ripple_v,
            "il_min_a": s.il_min_a,
            "il_max_a": s.il_max_a,
            "il_rms_a": s.il_rms_a,
            "mode": s.mode,
            "efficiency": s.efficiency,
            "losses_w": dict(s.losses_w),
            "not_included": [n.to_dict() for n in s.not_included],
            "efficiency_is_upper_bound": s.efficiency_is_upper_bound,
            "switch_node_turn_on_v": s.switch_node_turn_on_v,
            "diode_tj_degc": s.diode_tj_degc,
            "thermal_runaway": s.thermal_runaway,
            "regulated": s.regulated,
            "vout_min_v": s.vout_min_v,
            "vout_max_v": s.vout_max_v,
            "il_avg_a": s.il_avg_a,
            "pin_w": s.pin_w,
            "pout_w": s.pout_w,
            "load_ohm": s.load_ohm,
        }


@dataclass(frozen=True)
class VerifyResult:
    """Every operating point of one stage, the warnings, and what they were judged against.

    ``duty`` is the open-loop duty, or None where every point was regulated to ``vout_v``.
    """

    spec: Any
    stage: Stage
    duty: float | None
    vout_v: float
    vout_ripple_limit_v: float
    efficiency_estimate: float
    regulated: bool
    points: tuple[PointResult, ...]
    warnings: tuple[VerifyWarning, ...]
    violations: tuple[Violation, ...] = ()
    unchecked: tuple[Unchecked, ...] = ()
    ratings_checked: bool = False

    def worst_point(self) -> PointResult:
        """Return the point with the largest output ripple (the one to look at first)."""
        return max(self.points, key=lambda p: p.state.vout_ripple_v)

    def to_dict(self) -> dict[str, object]:
        return {
            "points": [p.to_dict() for p in self.points],
            "warnings": [w.to_dict() for w in self.warnings],
            "violations": [v.to_dict() for v in self.violations],
            "not_included": _not_included_union(self.points),
            "unchecked": [u.to_dict() for u in self.unchecked],
            "regulated": self.regulated,
            "duty": self.duty,
            "vout_v": self.vout_v,
            "vout_ripple_limit_v": self.vout_ripple_limit_v,
            "efficiency_estimate": self.efficiency_estimate,
            "stage": {k: v for k, v in asdict(self.stage).items() if k not in ("notes", "parts")},
            "parts": dict(self.stage.parts),
            "notes": list(self.stage.notes),
        }


def _not_included_union(points: Sequence[PointResult]) -> list[dict[str, str]]:
    """Return every loss term left out at any point, once each (term, role, part, figure)."""
    seen: dict[tuple[str, str], dict[str, str]] = {}
    for item in points:
        for gap in item.state.not_included:
            seen.setdefault((gap.term, gap.part), gap.to_dict())
    return list(seen.values())


def default_points(
    spec: Any, extra_vin_v: Iterable[float] = (), extra_iout_a: Iterable[float] = ()
) -> tuple[OperatingPoint, ...]:
    """Return every input voltage at every load: Vin ascending, then load heaviest first.

    Input voltages: vin_min, the midpoint, vin_max and ``extra_vin_v``. Loads: iout,
    iout_min where the spec has one, and ``extra_iout_a``. Duplicates are dropped.
    """
    vins = [spec.vin_min_v, 0.5 * (spec.vin_min_v + spec.vin_max_v), spec.vin_max_v]
    loads = [spec.iout_a] + ([spec.iout_min_a] if spec.iout_min_a else [])
    vins = sorted(set(vins) | {float(v) for v in extra_vin_v})
    loads = sorted(set(loads) | {float(i) for i in extra_iout_a}, reverse=True)
    for name, values in (("--vin", vins), ("--load", loads)):
        for value in values:
            if not (value > 0 and math.isfinite(value)):
                raise ParameterError(name, "must be positive", value=value)
    return tuple(OperatingPoint(v, i) for v in vins for i in loads)


def verify_design(
    spec: Any,
    stage: Stage,
    points: Sequence[OperatingPoint] | None = None,
    *,
    regulated: bool = True,
    duty: float | None = None,
    efficiency_estimate: float | None = None,
    ccm_assumed_down_to_a: float | None = None,
    ratings: Ratings | None = None,
) -> VerifyResult:
    """Return the steady state of ``stage`` at each point, with the warnings.

    Regulated (the default) solves the duty for ``spec.vout_v`` at each point; ``duty`` runs
    every point open loop at that duty instead. ``efficiency_estimate`` is the figure the
    design used (default ``spec.efficiency``, the BOM passes its final estimate); full-load
    points more than :data:`EFFICIENCY_TOLERANCE` below it are warned about (the design's
    currents were then underestimated).
    ``ccm_assumed_down_to_a`` is the lightest load at which the design assumed CCM (default
    the full load ``spec.iout_a``). ``ratings`` (of :mod:`partpick.verify.ratings`) checks
    every point against the parts' derated ratings; without it no rating is checked.
    """
    if duty is not None:
        if not 0.0 < duty < 1.0:
            raise ParameterError("--duty", "must lie between 0 and 1", value=duty)
        regulated = False
    elif not regulated:
        raise ParameterError("--duty", "is needed for an open-loop verification")
    chosen = tuple(points) if points is not None else default_points(spec)
    estimate = spec.efficiency if efficiency_estimate is None else float(efficiency_estimate)
    ccm_floor = spec.iout_a if ccm_assumed_down_to_a is None else ccm_assumed_down_to_a
    results, violations = [], []
    target = {"vout_v": spec.vout_v} if regulated else {"duty": duty}
    for point in chosen:
        state = steady_state(stage, point.vin_v, spec.vout_v / point.iout_a, **target)
        results.append(PointResult(point, state))
        if ratings is not None:
            violations += point_violations(
                ratings, stage, state, point.iout_a, vout_v=target.get("vout_v"),
                duty=target.get("duty"),
            )  # fmt: skip
    warnings = [
        w for r in results for w in _point_warnings(spec, r, regulated, estimate, ccm_floor)
    ]
    warnings += [
        VerifyWarning("loss-not-included", None, None, 0.0, None, "W", gap.to_dict())
        for gap in not_included_terms(stage)
    ]
    return VerifyResult(
        spec=spec,
        stage=stage,
        duty=None if regulated else duty,
        vout_v=spec.vout_v,
        vout_ripple_limit_v=spec.vout_ripple_v,
        efficiency_estimate=estimate,
        regulated=regulated,
        points=tuple(results),
        warnings=tuple(warnings),
        violations=tuple(violations),
        unchecked=unchecked_ratings(ratings) if ratings is not None else (),
        ratings_checked=ratings is not None,
    )


def _point_warnings(
    spec: Any, result: PointResult, regulated: bool, estimate: float, ccm_floor_a: float
) -> list[VerifyWarning]:
    point, s = result.point, result.state

    def warn(code: str, value: float, limit: float | None, unit: str) -> VerifyWarning:
        return VerifyWarning(code, point.vin_v, point.iout_a, float(value), limit, unit)

    found = []
    if regulated and not s.regulated:
        found.append(warn("vout-unreachable", s.vout_avg_v, spec.vout_v, "V"))
    if s.vout_ripple_v > spec.vout_ripple_v:
        found.append(warn("ripple-above-limit", s.vout_ripple_v, spec.vout_ripple_v, "V"))
    if s.mode == MODE_DCM and point.iout_a >= ccm_floor_a * (1.0 - 1e-9):
        found.append(warn("dcm-where-ccm-assumed", point.iout_a, ccm_floor_a, "A"))
    if regulated and s.duty > HIGH_DUTY:
        found.append(warn("high-duty", s.duty, HIGH_DUTY, "fraction"))
    if s.diode_would_reconduct:
        limit = s.vin_v - result.state.orbit.circuit.stage.diode_vf_v
        found.append(warn("diode-reconducts", s.idle_vout_min_v, limit, "V"))
    full_load = point.iout_a >= spec.iout_a * (1.0 - 1e-9)
    if full_load and s.efficiency < estimate - EFFICIENCY_TOLERANCE:
        found.append(warn("efficiency-below-estimate", s.efficiency, estimate, "fraction"))
    return found


def verify_parts(
    spec: Any,
    parts: Mapping[str, Mapping[str, object]],
    *,
    hot_factor: float,
    output_count: int,
    vin_points: Sequence[float] | None = None,
    efficiency_estimate: float | None = None,
    overrides: Mapping[str, float] | None = None,
    profile: Any = None,
) -> VerifyResult:
    """Return the regulated verification of a chosen set of parts at full load.

    ``parts`` maps role to catalog fields as in :func:`stage_from_parts`; ``vin_points``
    defaults to (vin_min, vin_max). Raises ParameterError when a part lacks a figure.
    """
    stage = stage_from_parts(
        spec,
        parts,
        hot_factor=hot_factor,
        output_count=output_count,
        overrides=overrides,
        profile=profile,
    )
    vins = vin_points if vin_points is not None else (spec.vin_min_v, spec.vin_max_v)
    points = [OperatingPoint(float(v), spec.iout_a) for v in vins]
    ratings = ratings_from_parts(spec, parts, profile) if profile is not None else None
    return verify_design(
        spec, stage, points, efficiency_estimate=efficiency_estimate, ratings=ratings
    )


@dataclass(frozen=True)
class Waveforms:
    """Sampled waveforms: time (s), inductor current (A), output voltage (V).

    Each interval is sampled from its own start to its own end, so a switching instant
    appears twice and the ESR step of vo is drawn as a vertical edge.
    """

    time_s: np.ndarray
    il_a: np.ndarray
    vout_v: np.ndarray


def waveforms(state: SteadyState, periods: int = 2, samples: int = 100) -> Waveforms:
    """Return the steady-state waveforms over ``periods`` periods, ``samples`` per interval."""
    solved = state.orbit
    circuit, period = solved.circuit, solved.circuit.period_s
    times, currents, volts = [], [], []
    for n in range(periods):
        for segment in solved.segments:
            system = circuit.systems[segment.name]
            states = sample_segment(system, segment.z_start, segment.duration_s / samples, samples)
            times.append(
                n * period + segment.start_s + np.linspace(0.0, segment.duration_s, samples + 1)
            )
            currents.append(states[:, 0])
            volts.append(states @ circuit.vout_rows[segment.name])
    return Waveforms(np.concatenate(times), np.concatenate(currents), np.concatenate(volts))


def efficiency_curves(
    spec: Any,
    stage: Stage,
    vins_v: Sequence[float],
    loads_a: Sequence[float] | None = None,
    *,
    duty: float | None = None,
) -> dict[float, tuple[np.ndarray, np.ndarray]]:
    """Return {vin: (loads in A, efficiency)} over a load sweep at each input voltage.

    The default loads run from iout_min (or a tenth of iout) to iout in 150 geometric steps,
    dense enough to follow the DCM turn-on ring (its valleys and crests move with the idle
    time, so the efficiency is continuous but not smooth there) through the boundary.
    """
    if loads_a is None:
        lightest = spec.iout_min_a or 0.1 * spec.iout_a
        loads_a = np.geomspace(min(lightest, spec.iout_a), spec.iout_a, 150)
    loads = np.asarray(sorted(set(float(i) for i in loads_a)))
    curves = {}
    for vin in vins_v:
        points = [OperatingPoint(float(vin), float(i)) for i in loads]
        result = verify_design(spec, stage, points, duty=duty)
        curves[float(vin)] = (loads, np.array([p.state.efficiency for p in result.points]))
    return curves


__all__ = [
    "MODE_CCM",
    "MODE_DCM",
    "OperatingPoint",
    "PointResult",
    "VerifyResult",
    "VerifyWarning",
    "Violation",
    "Waveforms",
    "default_points",
    "efficiency_curves",
    "verify_design",
    "verify_parts",
    "waveforms",
]
