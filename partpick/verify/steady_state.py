"""Steady-state figures of a boost stage at one operating point: ripple, extremes, losses.

:func:`steady_state` solves the periodic orbit of :mod:`partpick.verify.orbit` (regulated to
``vout_v`` by default, or open loop at ``duty``) and reduces it to what an engineer checks:
the duty, the average and peak-to-peak output (the ESR step included), the inductor current
extremes and RMS, the mode, and the power drawn and lost in each element.

Conduction losses, the output power and the input power drawn by the circuit are exact
integrals over the orbit, so Vin · avg(iL) = P_out + Σ conduction losses holds to rounding.
The switching overlap, C_oss and diode recovery losses come from the data-sheet formulas of
:mod:`partpick.losses` evaluated at the orbit's switching instants; they are energy the source
supplies on top of the circuit's own draw, so they are added to the input power as well as to
the losses and P_in = P_out + Σ losses still holds exactly.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from partpick import losses
from partpick.verify.blas import single_blas_thread
from partpick.verify.core_loss import core_loss_w
from partpick.verify.orbit import (
    MODE_CCM,
    Circuit,
    Orbit,
    boost_circuit,
    orbit,
    second_moment,
)
from partpick.verify.regulation import regulated_orbit
from partpick.verify.ringing import dcm_turn_on_node_voltage_v
from partpick.verify.sampling import sample_segment, segment_extremes
from partpick.verify.stage import Stage
from partpick.verify.terms import LOSS_KEYS, NotIncluded, heat_w, not_included_terms
from partpick.verify.thermal import junction_temperature_degc, leakage_with_self_heating

__all__ = [
    "LOSS_KEYS",
    "SteadyState",
    "analyse_orbit",
    "boost_circuit",
    "sample_segment",
    "steady_state",
]

_IL_ROW = np.array([1.0, 0.0, 0.0])


@dataclass(frozen=True, eq=False)
class SteadyState:
    """The steady state at one operating point, in SI units.

    ``regulated`` is True when the duty was solved for the target output and reached it.
    ``losses_w`` maps each of :data:`LOSS_KEYS` to its power, in W (0 for a term in
    ``not_included``). ``diode_tj_degc`` is the diode junction at the stage's ambient with
    its leakage (None without θJA); ``thermal_runaway`` is True where its leakage has no
    steady temperature. ``orbit`` keeps the solved intervals for waveform sampling.
    """

    vin_v: float
    load_ohm: float
    duty: float
    mode: str
    regulated: bool
    vout_avg_v: float
    vout_min_v: float
    vout_max_v: float
    il_min_a: float
    il_max_a: float
    il_avg_a: float
    il_rms_a: float
    pin_w: float
    pout_w: float
    losses_w: dict[str, float]
    orbit: Orbit = field(repr=False)
    idle_vout_min_v: float | None = None
    not_included: tuple[NotIncluded, ...] = ()
    diode_tj_degc: float | None = None
    thermal_runaway: bool = False
    switch_node_turn_on_v: float = 0.0

    @property
    def diode_would_reconduct(self) -> bool:
        """True where vo falls below Vin − V_F while iL rests at zero (DCM).

        The diode would then conduct again, which the three-interval model leaves out; it
        happens only with an output ripple comparable to Vout − Vin.
        """
        if self.idle_vout_min_v is None:
            return False
        stage = self.orbit.circuit.stage
        return self.idle_vout_min_v < self.vin_v - stage.diode_vf_v

    @property
    def vout_ripple_v(self) -> float:
        """Peak-to-peak output ripple, ESR step included, in V."""
        return self.vout_max_v - self.vout_min_v

    @property
    def iout_avg_a(self) -> float:
        """Average load current, avg(vo)/R, in A."""
        return self.vout_avg_v / self.load_ohm

    @property
    def efficiency(self) -> float:
        """P_out / P_in, dimensionless."""
        return self.pout_w / self.pin_w if self.pin_w > 0 else math.nan

    @property
    def total_loss_w(self) -> float:
        return float(sum(self.losses_w.values()))

    @property
    def efficiency_is_upper_bound(self) -> bool:
        """True where a loss term is missing, so the true efficiency can only be lower."""
        return bool(self.not_included)

    def heat_w(self, element: str) -> float:
        """Return the loss dissipated in ``element`` (a role, ``driver``, ``controller``), W."""
        return heat_w(self.losses_w, element)


def steady_state(
    stage: Stage,
    vin_v: float,
    load_ohm: float,
    *,
    vout_v: float | None = None,
    duty: float | None = None,
) -> SteadyState:
    """Return the steady state at ``vin_v`` (V) into ``load_ohm`` (Ω).

    Give ``vout_v`` (V) to regulate: the duty is solved so the average output equals it.
    Give ``duty`` (0 < D < 1) instead to run open loop. Exactly one of the two is required.
    """
    if (vout_v is None) == (duty is None):
        raise ValueError("give exactly one of vout_v (regulated) or duty (open loop)")
    if duty is not None and not 0.0 < duty < 1.0:
        raise ValueError(f"duty must lie in (0, 1), got {duty!r}")
    circuit = boost_circuit(stage, vin_v, load_ohm)
    with single_blas_thread():
        if duty is not None:
            return analyse_orbit(orbit(circuit, float(duty)), regulated=False)
        solved, reached = regulated_orbit(circuit, float(vout_v))
        return analyse_orbit(solved, regulated=reached)


def analyse_orbit(solved: Orbit, *, regulated: bool) -> SteadyState:
    """Return the figures of a solved orbit (see the module docstring for the power terms)."""
    circuit = solved.circuit
    period = circuit.period_s
    moments = {
        s.name: second_moment(circuit.systems[s.name], s.duration_s, s.z_start)
        for s in solved.segments
    }
    il_mean_sq = sum(m[0, 0] for m in moments.values()) / period
    il_avg = sum(m[0, 2] for m in moments.values()) / period
    vout_avg = sum(circuit.vout_rows[n] @ m[:, 2] for n, m in moments.items()) / period
    pout = sum(_quadratic(circuit.vout_rows[n], m) for n, m in moments.items()) / (
        period * circuit.load_ohm
    )
    conduction = _conduction_losses(circuit, moments)
    formula, v_turn_on = _formula_losses(solved)
    formula["core"] = _core_loss(solved)
    leakage = _leakage(solved, conduction["diode_conduction"])
    formula["leakage"] = leakage.leakage_w if leakage is not None else 0.0
    low, high, idle_low = _extremes(solved)
    return SteadyState(
        vin_v=circuit.vin_v,
        load_ohm=circuit.load_ohm,
        duty=solved.duty,
        mode=solved.mode,
        regulated=regulated,
        vout_avg_v=float(vout_avg),
        vout_min_v=float(low[1]),
        vout_max_v=float(high[1]),
        # in DCM the current rests at exactly zero through the idle interval
        il_min_a=0.0 if solved.mode != MODE_CCM else float(low[0]),
        il_max_a=float(high[0]),
        il_avg_a=float(il_avg),
        il_rms_a=float(math.sqrt(max(il_mean_sq, 0.0))),
        pin_w=float(circuit.vin_v * il_avg + sum(formula.values())),
        pout_w=float(pout),
        losses_w={k: float({**conduction, **formula}[k]) for k in LOSS_KEYS},
        orbit=solved,
        idle_vout_min_v=idle_low,
        not_included=not_included_terms(circuit.stage),
        diode_tj_degc=_diode_tj(circuit.stage, conduction, leakage),
        thermal_runaway=bool(leakage is not None and leakage.runaway),
        switch_node_turn_on_v=v_turn_on,
    )


def _quadratic(row: np.ndarray, moment: np.ndarray) -> float:
    return float(row @ moment @ row)


def _conduction_losses(circuit: Circuit, moments: dict[str, np.ndarray]) -> dict[str, float]:
    """Return the I²R and V_F·I losses, each an exact period average, in W ([EM] ch. 3)."""
    stage, period = circuit.stage, circuit.period_s
    on, off = moments["on"], moments["off"]
    esr_sq = sum(_quadratic(circuit.icap_rows[n], m) for n, m in moments.items()) / period
    return {
        "dcr": float(
            losses.inductor_dcr_loss_w(
                math.sqrt(sum(m[0, 0] for m in moments.values()) / period), stage.dcr_ohm
            )
        ),
        "switch_conduction": float(
            losses.switch_conduction_loss_w(
                math.sqrt(max(on[0, 0], 0.0) / period), stage.rds_on_ohm, stage.hot_factor
            )
        ),
        "diode_conduction": float(
            losses.diode_conduction_loss_w(
                stage.diode_vf_v,
                off[0, 2] / period,
                stage.diode_rd_ohm,
                math.sqrt(max(off[0, 0], 0.0) / period),
            )
        ),
        # the bank's RMS current through n equal parts of ESR each
        "esr": float(
            losses.capacitor_esr_loss_w(
                math.sqrt(max(esr_sq, 0.0)), stage.esr_ohm, stage.output_count
            )
        ),
    }


def _formula_losses(solved: Orbit) -> tuple[dict[str, float], float]:
    """Return the switching-instant losses in W, and the node voltage at turn-on in V.

    Turn-off interrupts iL at the end of the on interval against the diode-clamped node
    (vo + V_F + R_D·iL). In CCM turn-on takes over iL(0) from the conducting diode, which then
    blocks vo and gives up its recovered charge (scaled to the current it carried) through the
    switch; in DCM the switch turns on at zero current after the diode has stopped
    conducting, so neither overlap nor recovery loss occurs at turn-on ([EM] ch. 4-5). At
    turn-on the switch discharges C_oss from the node voltage v_on and charges the diode's
    C_j by the same step from the output, dissipating ½·C·v_on² in each ([EM] ch. 4, device
    capacitances); in DCM v_on is wherever the idle ring has left the node
    (:func:`_dcm_turn_on_v`). Gate drive and the controller's fixed loss close the list.
    """
    circuit, stage = solved.circuit, solved.circuit.stage
    fsw, t_switch = stage.fsw_hz, stage.transition_time_s
    first, off = solved.segments[0], solved.segments[1]
    i_off = off.z_start[0]
    v_off = circuit.vout_rows["off"] @ off.z_start + stage.diode_vf_v + stage.diode_rd_ohm * i_off
    turn_off = losses.switch_switching_loss_w(v_off, i_off, 0.0, t_switch, fsw)
    if solved.mode == MODE_CCM:
        i_on = first.z_start[0]
        v_on = (
            circuit.vout_rows["off"] @ first.z_start + stage.diode_vf_v + stage.diode_rd_ohm * i_on
        )
        turn_on = losses.switch_switching_loss_w(v_on, i_on, t_switch, 0.0, fsw)
        charge = losses.recovered_charge_c(
            stage.qrr_c or 0.0, i_on, stage.diode_if_avg_a or math.nan
        )
        recovery = losses.diode_recovery_loss_w(
            charge, circuit.vout_rows["on"] @ first.z_start, fsw
        )
    else:
        v_on, turn_on, recovery = _dcm_turn_on_v(solved), 0.0, 0.0
    terms = {
        "switching": float(turn_off + turn_on),
        "coss": float(losses.switch_coss_loss_w(stage.coss_f or 0.0, v_on, fsw)),
        "diode_cj": float(losses.switch_coss_loss_w(stage.cj_f or 0.0, v_on, fsw)),
        "recovery": float(recovery),
        "gate_drive": float(losses.gate_drive_loss_w(stage.qg_c or 0.0, stage.gate_drive_v, fsw)),
        "quiescent": float(stage.quiescent_w),
    }
    return terms, float(v_on)


def _core_loss(solved: Orbit) -> float:
    """Return the iGSE core loss on the orbit's switching instants, in W (0 without data)."""
    core = solved.circuit.stage.core
    if core is None:
        return 0.0
    times = [s.start_s for s in solved.segments] + [solved.circuit.period_s]
    currents = [s.z_start[0] for s in solved.segments] + [solved.segments[0].z_start[0]]
    return core_loss_w(core, np.array(times), np.array(currents))


def _leakage(solved: Orbit, diode_conduction_w: float):
    """Return the diode's leakage at its self-heated junction, or None without I_R data.

    The diode blocks vo while the switch is on and vo − v_node (the node ringing about Vin)
    while idle in DCM, so ∫ v_R dt = ∫_on vo dt + ∫_idle vo dt − Vin·t_idle.
    """
    circuit, stage = solved.circuit, solved.circuit.stage
    if stage.ir_a is None:
        return None
    blocking_v_s = 0.0
    for segment in solved.segments:
        if segment.name == "on":
            blocking_v_s += float(circuit.vout_rows["on"] @ segment.integral)
        elif segment.name == "idle":
            idle_v_s = float(circuit.vout_rows["idle"] @ segment.integral)
            blocking_v_s += idle_v_s - circuit.vin_v * segment.duration_s
    return leakage_with_self_heating(
        ambient_degc=stage.ambient_degc,
        theta_ja_degc_w=stage.diode_theta_ja_degc_w or 0.0,
        fixed_loss_w=diode_conduction_w,
        ir_a=stage.ir_a,
        ir_tj_degc=stage.ir_tj_degc,
        blocking_v_s=max(blocking_v_s, 0.0),
        period_s=circuit.period_s,
    )


def _diode_tj(stage: Stage, conduction: dict[str, float], leakage) -> float | None:
    """Return the diode junction temperature at the stage's ambient, in °C (None: no θJA)."""
    if stage.diode_theta_ja_degc_w is None:
        return None
    if leakage is not None and stage.diode_theta_ja_degc_w:
        return float(leakage.tj_degc)
    return junction_temperature_degc(
        stage.ambient_degc, conduction["diode_conduction"], stage.diode_theta_ja_degc_w
    )


def _dcm_turn_on_v(solved: Orbit) -> float:
    """Return the switch-node voltage at turn-on in DCM, in V.

    The node starts the idle interval at V0 = vo + V_F (the diode's drop at zero current)
    and rings about Vin through L, its DCR and C_oss + C_j until the switch turns on: the
    fall, the body-diode clamp where the ring reaches ground, and the ring from ground
    (:mod:`partpick.verify.ringing`). The interval model still keeps iL = 0 through the idle
    interval: the ring only moves ½·C·(V0 − Vin)² back and forth, and here it sets nothing
    but v_on. As the idle interval shrinks to zero v_on tends to V0, the CCM turn-on voltage
    at the boundary, so the turn-on loss is continuous across it.
    """
    circuit, stage = solved.circuit, solved.circuit.stage
    idle = solved.segments[-1]
    v_start = float(circuit.vout_rows["idle"] @ idle.z_start) + stage.diode_vf_v
    if stage.node_capacitance_f <= 0.0:
        return v_start  # no capacitance on the node: nothing rings and nothing is lost
    return float(
        dcm_turn_on_node_voltage_v(
            circuit.vin_v,
            v_start,
            stage.inductance_h,
            stage.node_capacitance_f,
            stage.dcr_ohm,
            idle.duration_s,
        )
    )


def _extremes(solved: Orbit) -> tuple[np.ndarray, np.ndarray, float | None]:
    """Return ([min iL, min vo], [max iL, max vo], min vo while idle or None) over the period.

    Each interval is sampled exactly and every turning point between samples is refined
    (:mod:`partpick.verify.sampling`), so interior peaks (vo peaks inside the off interval
    where iC crosses zero) are found, not sampled.
    """
    circuit = solved.circuit
    lows, highs, idle_low = [], [], None
    for segment in solved.segments:
        rows = np.vstack([_IL_ROW, circuit.vout_rows[segment.name]])
        system = circuit.systems[segment.name]
        low, high = segment_extremes(system, segment.z_start, segment.duration_s, rows)
        lows.append(low)
        highs.append(high)
        if segment.name == "idle":
            idle_low = float(low[1])
    return np.min(lows, axis=0), np.max(highs, axis=0), idle_low
