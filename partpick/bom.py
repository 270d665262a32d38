"""One consistent set of parts for the whole power stage.

:func:`build_bom` picks the best passed part of every role, estimates the losses of that real
set, and, where the efficiency comes out below the figure the currents were computed with,
recomputes the stresses with the new efficiency and picks again until the choice and the
efficiency stop changing. It returns data; renderers write the table, CSV, Markdown or JSON.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, replace

import numpy as np

from partpick import losses
from partpick.bom_losses import cross_part_losses, switch_heat_from_diode_w
from partpick.bom_recheck import Recheck, recheck_at_chosen_parts
from partpick.design.cautions import stored_energy_j
from partpick.design.spec import Spec
from partpick.design.topologies import get_topology
from partpick.design.topologies.base import Caution, Envelope
from partpick.screening.checks import Outcome, Requirement
from partpick.screening.pick import ROLES, PickResult, pick
from partpick.screening.profiles import Profile
from partpick.screening.switch import switch_loss_w
from partpick.units import format_eng
from partpick.verify.terms import NotIncluded

DESIGNATORS: dict[str, str] = {
    "inductor": "L1",
    "input-cap": "CIN",
    "output-cap": "COUT",
    "diode": "D1",
    "switch": "Q1",
}

# Two efficiencies closer than this are the same for the purpose of stopping the rounds.
EFFICIENCY_TOLERANCE = 0.002


@dataclass(frozen=True)
class BomLine:
    """The part chosen for one role, its alternates, or the closest failures if none passed."""

    role: str
    designator: str
    status: str  # "passed" | "unverified" | "no part"
    choice: Outcome | None
    alternates: tuple[Outcome, ...] = ()
    closest_failures: tuple[Outcome, ...] = ()
    requirements: tuple[Requirement, ...] = ()  # what a part of the role needs to pass
    purchasing: Mapping[str, object] = field(default_factory=dict)  # description, package, …

    @property
    def qty(self) -> int:
        """Return the number of identical parts in parallel (0 where no part was chosen)."""
        return self.choice.count if self.choice is not None else 0

    @property
    def extended_price(self) -> float | None:
        """Return qty × unit price, or None where the price is unknown."""
        return self.extended_price_for(1)

    def order_qty(self, build_qty: int) -> int:
        """Return the parts to order for ``build_qty`` boards (qty per board × boards)."""
        return self.qty * build_qty

    def extended_price_for(self, build_qty: int) -> float | None:
        """Return the order quantity × unit price for ``build_qty`` boards, None if unpriced."""
        if self.choice is None or self.choice.unit_price is None:
            return None
        return self.order_qty(build_qty) * self.choice.unit_price


@dataclass(frozen=True)
class LossRound:
    """One pass of pick → loss estimate."""

    number: int
    efficiency_used: float
    efficiency_estimated: float
    losses_w: dict[str, float]
    choice: dict[str, str | None]


@dataclass(frozen=True)
class StageRipple:
    """Ripple and conduction mode with the chosen inductor and output capacitors."""

    inductance_h: float
    inductance_min_h: float
    il_ripple_nominal_a: float
    il_ripple_min_l_a: float
    vout_ripple_v: float | None
    output_count: int
    ccm_full_load: bool


@dataclass(frozen=True)
class Bom:
    """The whole bill of materials and the reasons it holds together."""

    spec: Spec
    envelope: Envelope
    profile: Profile
    rank: str
    lines: tuple[BomLine, ...]
    rounds: tuple[LossRound, ...]
    losses_w: dict[str, float]
    efficiency: float
    ripple: StageRipple | None
    loss_notes: tuple[str, ...] = ()
    not_included: tuple[NotIncluded, ...] = ()
    verification: object | None = None  # a partpick.verify VerifyResult
    verification_note: str | None = None
    picks: dict[str, PickResult] = field(default_factory=dict, repr=False)
    build_qty: int = 1
    recheck: Recheck | None = None

    @property
    def efficiency_is_upper_bound(self) -> bool:
        """True where a loss term was left out for want of data: the true efficiency is lower."""
        return bool(self.not_included)

    @property
    def complete(self) -> bool:
        """Return True when every role has a part (passed or unverified)."""
        return all(line.choice is not None for line in self.lines)

    @property
    def roles_without_part(self) -> tuple[str, ...]:
        """Return the roles no catalog part can fill (empty for a complete BOM)."""
        return tuple(line.role for line in self.lines if line.choice is None)

    @property
    def total_cost(self) -> float | None:
        """Return the cost of one board, or None if a role is empty or a price is unknown."""
        return self.total_cost_for(1)

    def total_cost_for(self, build_qty: int) -> float | None:
        """Return the cost of ``build_qty`` boards; None for an incomplete or unpriced BOM.

        A BOM with an empty role has no cost: a sum of the other lines would read as the price
        of a design that cannot be built.
        """
        if not self.complete:
            return None
        prices = [line.extended_price_for(build_qty) for line in self.lines]
        if not prices or any(p is None for p in prices):
            return None
        return float(sum(prices))

    @property
    def total_loss_w(self) -> float:
        """Return the estimated total loss of the stage, in W."""
        return float(sum(self.losses_w.values()))

    @property
    def cautions(self) -> tuple[Caution, ...]:
        """Return the design's cautions, plus the energy the chosen output bank really stores."""
        bank = _chosen_bank_caution(self.spec, self.lines)
        return self.envelope.cautions + ((bank,) if bank is not None else ())


def _chosen_bank_caution(spec: Spec, lines: tuple[BomLine, ...]) -> Caution | None:
    """Return the stored-energy caution for the output capacitors actually chosen."""
    line = next(line for line in lines if line.role == "output-cap")
    capacitance_f = _part_value(line, "capacitance_f")
    if not np.isfinite(capacitance_f):
        return None
    bank_f = line.qty * capacitance_f
    energy_j = stored_energy_j(bank_f, spec.vout_v)
    return Caution(
        "stored-energy-chosen",
        f"The chosen output bank ({line.qty} × {format_eng(capacitance_f, 'F')} nominal) stores "
        f"{format_eng(energy_j, 'J')} at {format_eng(spec.vout_v, 'V')}, and keeps it after the "
        "input is removed: discharge it before touching the output.",
    )


def build_bom(
    db: str | None,
    spec: Spec,
    *,
    profile: Profile,
    rank: str = "loss",
    alternates: int = 2,
    max_parallel: int = 4,
    max_rounds: int = 5,
    verify: bool = False,
    build_qty: int = 1,
) -> Bom:
    """Return the BOM for ``spec`` from the catalog at ``db``.

    Each round picks every role at the efficiency in use, estimates the losses of the chosen
    set, and stops when the estimate is not below the efficiency used (the currents were not
    underestimated) or when neither the choice nor the efficiency changed; at most
    ``max_rounds`` rounds.
    """
    rounds: list[LossRound] = []
    efficiency_used = spec.efficiency
    for number in range(1, max_rounds + 1):
        round_spec = spec.with_efficiency(efficiency_used)
        picks = _pick_roles(db, round_spec, profile, rank, max_parallel, alternates)
        lines = tuple(_choose_line(picks[role], alternates) for role in ROLES)
        lines = with_purchasing(db, lines)
        envelope = picks[ROLES[0]].envelope
        estimate = estimate_stage_losses(
            round_spec, lines, profile, envelope, chosen_figures(db, lines)
        )
        role_losses, notes = estimate.losses_w, estimate.notes
        pout_w = round_spec.vout_v * round_spec.iout_a
        estimated = float(losses.efficiency_from_losses(pout_w, sum(role_losses.values())))
        choice = {line.role: line.choice.mpn if line.choice else None for line in lines}
        rounds.append(LossRound(number, efficiency_used, estimated, role_losses, choice))
        if _rounds_settled(rounds):
            break
        efficiency_used = estimated
    lines, picks, recheck = recheck_at_chosen_parts(
        db, _with_diode_heat(db, round_spec, by_role_line(lines, "diode"), envelope),
        lines, picks, envelope, profile,
        dict(rank=rank, max_parallel=max_parallel, top=max(alternates + 1, 3)),
        lambda result: _choose_line(result, alternates),
    )  # fmt: skip
    lines = with_purchasing(db, lines)  # the rechecked lines carry the checks at the parts
    if recheck is not None and recheck.changed:
        estimate = estimate_stage_losses(
            round_spec, lines, profile, envelope, chosen_figures(db, lines)
        )
        role_losses, notes = estimate.losses_w, estimate.notes
        pout_w = round_spec.vout_v * round_spec.iout_a
        estimated = float(losses.efficiency_from_losses(pout_w, sum(role_losses.values())))
        rounds[-1] = replace(rounds[-1], efficiency_estimated=estimated, losses_w=role_losses)
    verification, verification_note = (
        verify_chosen_set(round_spec, lines, profile, rounds[-1].efficiency_estimated, db=db)
        if verify
        else (None, None)
    )
    return Bom(
        spec=round_spec,
        envelope=envelope,
        profile=profile,
        rank=rank,
        lines=lines,
        rounds=tuple(rounds),
        losses_w=role_losses,
        efficiency=rounds[-1].efficiency_estimated,
        ripple=stage_ripple(round_spec, lines, profile, envelope),
        loss_notes=notes,
        not_included=estimate.not_included,
        picks=picks,
        verification=verification,
        verification_note=verification_note,
        build_qty=build_qty,
        recheck=recheck,
    )


def _pick_roles(db, spec: Spec, profile: Profile, rank: str, max_parallel: int, alternates: int):
    """Return the pick of every role; the switch's thermal check includes the chosen diode's.

    The diode's recovered charge and junction capacitance are discharged through the switch
    at turn-on (Erickson & Maksimovic ch. 4), so the switch is picked after the diode with
    that loss added to its own (``Spec.switch_extra_loss_w``, :mod:`partpick.bom_losses`).
    """
    picks: dict[str, PickResult] = {}
    for role in ROLES:
        role_spec = spec
        if role == "switch" and "diode" in picks:
            diode_line = _choose_line(picks["diode"], 0)
            role_spec = _with_diode_heat(db, spec, diode_line, picks["diode"].envelope)
        picks[role] = pick(db, role_spec, role, profile=profile, rank=rank,
                           max_parallel=max_parallel, top=max(alternates + 1, 3))  # fmt: skip
    return picks


def by_role_line(lines: tuple[BomLine, ...], role: str) -> BomLine | None:
    return next((line for line in lines if line.role == role), None)


def _with_diode_heat(db, spec: Spec, diode_line: BomLine | None, envelope: Envelope) -> Spec:
    """Return ``spec`` carrying the loss the chosen diode dissipates in the switch, in W."""
    if diode_line is None or diode_line.choice is None:
        return spec
    fields = chosen_figures(db, (diode_line,))["diode"]
    return replace(spec, switch_extra_loss_w=switch_heat_from_diode_w(spec, envelope, fields))


def _rounds_settled(rounds: list[LossRound]) -> bool:
    last = rounds[-1]
    if last.efficiency_estimated >= last.efficiency_used - EFFICIENCY_TOLERANCE:
        return True
    if len(rounds) < 2:
        return False
    previous = rounds[-2]
    same_choice = previous.choice == last.choice
    same_efficiency = (
        abs(previous.efficiency_estimated - last.efficiency_estimated) < EFFICIENCY_TOLERANCE
    )
    return same_choice and same_efficiency


def _choose_line(result: PickResult, alternates: int) -> BomLine:
    role, needed = result.role, tuple(result.requirements)
    for status, outcomes in (("passed", result.passed), ("unverified", result.unverified)):
        if outcomes:
            alternatives = tuple(outcomes[1 : 1 + alternates])
            return BomLine(
                role, DESIGNATORS[role], status, outcomes[0], alternatives, requirements=needed
            )
    return BomLine(
        role, DESIGNATORS[role], "no part", None, closest_failures=tuple(result.failed[:3]),
        requirements=needed,
    )  # fmt: skip


PURCHASING_FIELDS: tuple[str, ...] = ("description", "package", "stock", "lifecycle")


def with_purchasing(db: str | None, lines: tuple[BomLine, ...]) -> tuple[BomLine, ...]:
    """Return ``lines`` with each chosen part's description, package, stock and lifecycle.

    Read for the chosen parts only, after screening, so the pick path never carries them.
    """
    from dataclasses import replace

    from partpick.catalog.columns import read_columns
    from partpick.screening.roles import ROLE_KINDS

    out = []
    for line in lines:
        if line.choice is None:
            out.append(line)
            continue
        columns = read_columns(db, ROLE_KINDS[line.role], ["mpn", "manufacturer",
                                                           *PURCHASING_FIELDS])  # fmt: skip
        hits = [
            int(i) for i in np.flatnonzero(columns["mpn"] == line.choice.mpn)
            if (columns["manufacturer"][i] or "") == line.choice.manufacturer
        ]  # fmt: skip
        found = {name: _plain(columns[name][hits[0]]) for name in PURCHASING_FIELDS} if hits else {}
        out.append(replace(line, purchasing=found))
    return tuple(out)


def _plain(value: object) -> object:
    """Return a numpy scalar as a Python value (NaN as None)."""
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not np.isfinite(value):
        return None
    return value


def _part_value(line: BomLine, name: str) -> float:
    """Return a float field of the chosen part, NaN where it is missing."""
    if line.choice is None:
        return float("nan")
    value = line.choice.part.get(name)
    return float("nan") if value is None else float(value)


def estimate_losses(
    spec: Spec,
    lines: tuple[BomLine, ...],
    profile: Profile,
    envelope: Envelope | None = None,
    figures: Mapping[str, Mapping[str, object]] | None = None,
) -> tuple[dict[str, float], tuple[str, ...]]:
    """Return the loss of each role with the chosen parts, in W, and notes on what was left out.

    See :func:`estimate_stage_losses`; this drops the structured list of terms not included
    (each also has a note).
    """
    estimate = estimate_stage_losses(spec, lines, profile, envelope, figures)
    return estimate.losses_w, estimate.notes


@dataclass(frozen=True)
class StageLosses:
    """The BOM's loss estimate: watts per role, notes, and the terms left out for want of data."""

    losses_w: dict[str, float]
    notes: tuple[str, ...]
    not_included: tuple[NotIncluded, ...]


def estimate_stage_losses(
    spec: Spec,
    lines: tuple[BomLine, ...],
    profile: Profile,
    envelope: Envelope | None = None,
    figures: Mapping[str, Mapping[str, object]] | None = None,
) -> StageLosses:
    """Return the loss of each role with the chosen parts, in W, and what was left out.

    The stresses are recomputed at the chosen inductor's nominal inductance, so the capacitor
    ripple currents are those of the real set. Each term is evaluated at its worst input
    voltage, so the total is an upper estimate, but only of the terms included: a term whose
    figure is missing is listed in ``not_included``. The diode's recovered charge and junction
    capacitance are booked to the switch, and gate drive and the controller have rows of their
    own (:mod:`partpick.bom_losses`). ``envelope`` is the spec's, when the caller already has
    it; ``figures`` the chosen parts' full catalog rows by role (default: the lines' fields).
    """
    by_role: Mapping[str, BomLine] = {line.role: line for line in lines}
    topology = get_topology(spec.topology)
    envelope = envelope if envelope is not None else topology.envelope(spec)
    inductance_h = _part_value(by_role["inductor"], "inductance_h")
    if not np.isfinite(inductance_h):
        inductance_h = envelope.value("l_min_h")
    stress = topology.stresses_at(spec, np.array([inductance_h]))
    terms = {
        "inductor": losses.inductor_dcr_loss_w(
            stress.il_rms_a[0], _part_value(by_role["inductor"], "dcr_ohm")
        ),
        "input-cap": losses.capacitor_esr_loss_w(
            stress.icin_rms_a[0],
            _part_value(by_role["input-cap"], "esr_ohm"),
            max(by_role["input-cap"].qty, 1),
        ),
        "output-cap": losses.capacitor_esr_loss_w(
            stress.icout_rms_a[0],
            _part_value(by_role["output-cap"], "esr_ohm"),
            max(by_role["output-cap"].qty, 1),
        ),
        # the recovered charge heats the switch, not the diode (bom_losses)
        "diode": losses.diode_conduction_loss_w(_part_value(by_role["diode"], "vf_v"), spec.iout_a),
        "switch": _switch_loss_w(spec, envelope, by_role["switch"], stress.isw_rms_a[0], profile),
    }
    notes = [
        f"{role}: loss not estimated (a figure is missing or no part was chosen)"
        for role, value in terms.items()
        if not np.isfinite(value)
    ]
    chosen = figures if figures is not None else _line_fields(lines)
    added, gaps, extra_notes = cross_part_losses(
        spec, envelope, float(stress.il_ripple_a[0]), chosen
    )
    watts = {role: float(v) if np.isfinite(v) else 0.0 for role, v in terms.items()}
    for role, value in added.items():
        watts[role] = watts.get(role, 0.0) + value
    notes += extra_notes
    notes += [f"not included: {gap.figure} missing for {gap.part}" for gap in gaps]
    return StageLosses(watts, tuple(notes), gaps)


def _line_fields(lines: tuple[BomLine, ...]) -> dict[str, Mapping[str, object]]:
    return {
        line.role: {"mpn": line.choice.mpn, **line.choice.part}
        for line in lines
        if line.choice is not None
    }


def chosen_figures(db: str | None, lines: tuple[BomLine, ...]) -> dict[str, dict[str, object]]:
    """Return the chosen parts' full catalog rows by role (the lines' fields on top)."""
    from partpick.verify.parts import full_part

    return {
        line.role: full_part(db, line.role, line.choice.mpn, line.choice.part)
        for line in lines
        if line.choice is not None and line.role in ("inductor", "diode", "switch")
    } | {
        line.role: {"mpn": line.choice.mpn, **line.choice.part}
        for line in lines
        if line.choice is not None and line.role not in ("inductor", "diode", "switch")
    }


def _known_or_zero(line: BomLine, name: str) -> float:
    """Return an optional loss figure of the chosen part, 0 where the catalog lacks it."""
    value = _part_value(line, name)
    return value if np.isfinite(value) else 0.0


def _switch_loss_w(
    spec: Spec, envelope: Envelope, line: BomLine, isw_rms_a: float, profile: Profile
) -> float:
    return float(
        switch_loss_w(
            isw_rms_a,
            _part_value(line, "rds_on_ohm"),
            profile.value("switch.hot_factor"),
            envelope.value("vsw_max_v"),
            envelope.value("il_avg_max_a"),
            _part_value(line, "qgd_c"),
            spec.gate_drive_a,
            _known_or_zero(line, "coss_f"),
            spec.fsw_hz,
        )
    )


def stage_ripple(
    spec: Spec, lines: tuple[BomLine, ...], profile: Profile, envelope: Envelope
) -> StageRipple | None:
    """Return the inductor and output ripple of the chosen set, or None without an inductor."""
    by_role = {line.role: line for line in lines}
    inductor = by_role["inductor"]
    inductance_h = _part_value(inductor, "inductance_h")
    if not np.isfinite(inductance_h):
        return None
    tolerance = _part_value(inductor, "tolerance")
    if not np.isfinite(tolerance):
        tolerance = profile.value("inductor.tolerance_default")
    topology = get_topology(spec.topology)
    l_min_part_h = inductance_h * (1.0 - tolerance)
    stress = topology.stresses_at(spec, np.array([inductance_h, l_min_part_h]))
    return StageRipple(
        inductance_h=inductance_h,
        inductance_min_h=l_min_part_h,
        il_ripple_nominal_a=float(stress.il_ripple_a[0]),
        il_ripple_min_l_a=float(stress.il_ripple_a[1]),
        vout_ripple_v=_output_ripple_v(spec, envelope, by_role["output-cap"], stress),
        output_count=by_role["output-cap"].qty,
        ccm_full_load=topology.ccm_at(spec, l_min_part_h),
    )


def _output_ripple_v(spec, envelope, line, stress) -> float | None:
    """Return the output ripple of the chosen bank, with each part's C_eff at Vout."""
    if line.choice is None:
        return None
    count = max(line.qty, 1)
    c_eff_f = _part_value(line, "capacitance_eff_f")  # DC bias at Vout, from the screening
    esr_ohm = _part_value(line, "esr_ohm")
    if not np.isfinite(c_eff_f) or not np.isfinite(esr_ohm):
        return None
    charge_v = spec.iout_a * envelope.value("duty_max") / (spec.fsw_hz * count * c_eff_f)
    return float(charge_v + esr_ohm / count * stress.il_peak_a[1])  # at the part's minimum L


def verify_chosen_set(
    spec: Spec,
    lines: tuple[BomLine, ...],
    profile: Profile,
    efficiency_estimate: float,
    *,
    db: str | None = None,
) -> tuple[object | None, str | None]:
    """Return the steady-state verification of the chosen set at vin_min and vin_max.

    Returns (result, None), or (None, reason) where a role the waveform model needs has no
    part or a chosen part lacks a parasitic the model needs; the BOM stands either way, and
    ``partpick verify`` with an override option can fill the gap.
    """
    from partpick.errors import ParameterError
    from partpick.verify.sweep import verify_parts

    by_role = {line.role: line for line in lines}
    needed = ("inductor", "output-cap", "diode", "switch")
    absent = [role for role in needed if by_role[role].choice is None]
    if absent:
        return None, f"not verified: no part chosen for {', '.join(absent)}"
    from partpick.verify.parts import full_part

    parts = {
        role: full_part(db, role, by_role[role].choice.mpn, by_role[role].choice.part)
        for role in needed
    }
    try:
        result = verify_parts(
            spec,
            parts,
            hot_factor=profile.value("switch.hot_factor"),
            output_count=by_role["output-cap"].qty,
            efficiency_estimate=efficiency_estimate,
            profile=profile,
        )
    except ParameterError as exc:
        return None, f"not verified: {exc}"
    return result, None
