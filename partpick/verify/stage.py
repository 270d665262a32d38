"""The power stage the waveform model solves: the chosen parts' figures, in SI floats.

A :class:`Stage` holds exactly what the switched model of :mod:`partpick.verify.steady_state`
needs and validates itself, so the solver never meets an impossible figure.
:func:`stage_from_parts` builds one from catalog fields (canonical names of
:mod:`partpick.fields`), the spec and the profile; a figure the catalog lacks is a
:class:`~partpick.errors.ParameterError` naming the field, the part and the option that
supplies it.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any, NamedTuple

from partpick.errors import ParameterError
from partpick.verify.core_loss import CoreLoss, core_loss_from_part

ROLES: tuple[str, ...] = ("inductor", "output-cap", "diode", "switch")


class Parameter(NamedTuple):
    """One figure the model takes from a part: its role, catalog field and override option."""

    role: str
    field: str
    unit: str
    option: str
    example: str


# The figures the waveforms need, in the order they are looked up: a part without one is an
# error naming the override option. ``rd_ohm`` (a diode series resistance) is not a catalog
# field of every file; where absent it is zero.
PARAMETERS: tuple[Parameter, ...] = (
    Parameter("inductor", "inductance_h", "H", "--inductance", "10 uH"),
    Parameter("inductor", "dcr_ohm", "ohm", "--dcr", "45 mOhm"),
    Parameter("output-cap", "capacitance_f", "F", "--capacitance", "22 uF"),
    Parameter("output-cap", "esr_ohm", "ohm", "--esr", "5 mOhm"),
    Parameter("diode", "vf_v", "V", "--vf", "0.45 V"),
    Parameter("diode", "rd_ohm", "ohm", "--rd", "20 mOhm"),
    Parameter("switch", "rds_on_ohm", "ohm", "--rds-on", "18 mOhm"),
)
# The figures only a loss term needs: a part without one still runs, with that term left out
# and listed as not included (:mod:`partpick.verify.terms`).
LOSS_PARAMETERS: tuple[Parameter, ...] = (
    Parameter("diode", "qrr_c", "C", "--qrr", "15 nC"),
    Parameter("diode", "cj_f", "F", "--cj", "80 pF"),
    Parameter("switch", "qgd_c", "C", "--qgd", "3 nC"),
    Parameter("switch", "coss_f", "F", "--coss", "150 pF"),
    Parameter("switch", "qg_c", "C", "--qg", "9 nC"),
)
OVERRIDE_FIELDS: frozenset[str] = frozenset(p.field for p in PARAMETERS + LOSS_PARAMETERS)

# Schottky and SiC Schottky rectifiers are majority-carrier devices with no stored minority
# charge, so a missing Qrr is taken as zero for them (Erickson & Maksimovic, Fundamentals of
# Power Electronics, 3rd ed., ch. 4, on Schottky diodes).
_NO_RECOVERY_TYPES = frozenset({"schottky", "sic"})
# Leakage figures are usually given at 25 °C (common practice, no published source).
DEFAULT_IR_TJ_DEGC = 25.0

# Without a profile object the built-in "standard" profile gives the tolerance default and
# the DC-bias tables (partpick/screening/profiles/standard.toml).
_DEFAULT_PROFILE = "standard"
_OPTIONAL = (
    "qgd_c", "coss_f", "qrr_c", "qg_c", "cj_f", "ir_a", "diode_if_avg_a",
    "diode_theta_ja_degc_w", "diode_tj_max_degc",
)  # fmt: skip


@dataclass(frozen=True, kw_only=True)
class Stage:
    """A boost power stage in SI units; validated on construction.

    ``rds_on_ohm`` is the catalog figure (25 °C); the model uses ``rds_on_ohm × hot_factor``
    (:attr:`rds_on_hot_ohm`). ``cout_f`` and ``esr_ohm`` are per output capacitor, with
    ``cout_f`` already the effective capacitance; the bank is ``output_count`` equal parts.
    The loss-only figures (``qgd_c``, ``coss_f`` energy-equivalent, ``qrr_c`` at the diode's
    rated ``diode_if_avg_a``, ``qg_c``, ``cj_f``, ``ir_a`` at ``ir_tj_degc``, ``core``) are None
    where unknown: their term is then left out and listed as not included. ``ambient_degc`` and
    the diode's ``diode_theta_ja_degc_w`` set the junction temperature of its leakage.
    ``parts`` names the part of each role, for the messages.
    """

    inductance_h: float
    dcr_ohm: float
    rds_on_ohm: float
    diode_vf_v: float
    cout_f: float
    esr_ohm: float
    fsw_hz: float
    hot_factor: float = 1.0
    diode_rd_ohm: float = 0.0
    output_count: int = 1
    qgd_c: float | None = None
    coss_f: float | None = None
    gate_drive_a: float = 1.0
    qrr_c: float | None = None
    qg_c: float | None = None
    gate_drive_v: float = 10.0
    cj_f: float | None = None
    ir_a: float | None = None
    ir_tj_degc: float = DEFAULT_IR_TJ_DEGC
    diode_if_avg_a: float | None = None
    diode_theta_ja_degc_w: float | None = None
    diode_tj_max_degc: float | None = None
    ambient_degc: float = 25.0
    quiescent_w: float = 0.0
    core: CoreLoss | None = None
    parts: dict[str, str] = field(default_factory=dict, compare=False)
    notes: tuple[str, ...] = field(default=(), compare=False)

    def __post_init__(self) -> None:
        positive = ("inductance_h", "cout_f", "fsw_hz", "gate_drive_a", "hot_factor")
        for name in positive + ("gate_drive_v",):
            _require(name, getattr(self, name), positive=True)
        for name in ("dcr_ohm", "rds_on_ohm", "diode_vf_v", "esr_ohm", "diode_rd_ohm"):
            _require(name, getattr(self, name), positive=False)
        for name in ("quiescent_w",):
            _require(name, getattr(self, name), positive=False)
        for name in _OPTIONAL:
            if getattr(self, name) is not None:
                _require(name, getattr(self, name), positive=False)
        count = self.output_count
        if isinstance(count, bool) or not isinstance(count, int) or count < 1:
            raise ParameterError(
                "output_count", "must be a whole number of at least 1", value=count
            )

    @property
    def rds_on_hot_ohm(self) -> float:
        """The switch on-resistance the model uses, R_DS(on) × hot factor, in Ω."""
        return self.rds_on_ohm * self.hot_factor

    @property
    def cout_total_f(self) -> float:
        """Effective capacitance of the whole output bank, n × C_eff, in F."""
        return self.cout_f * self.output_count

    @property
    def esr_total_ohm(self) -> float:
        """ESR of the whole output bank, ESR / n, in Ω (equal parts in parallel)."""
        return self.esr_ohm / self.output_count

    @property
    def transition_time_s(self) -> float:
        """Drain-voltage transition time Q_gd / I_g, in s (0 where Qgd is unknown)."""
        return (self.qgd_c or 0.0) / self.gate_drive_a

    @property
    def node_capacitance_f(self) -> float:
        """Switch-node capacitance C_oss + C_j (the known ones), in F."""
        return (self.coss_f or 0.0) + (self.cj_f or 0.0)

    def part_name(self, role: str) -> str:
        return self.parts.get(role, role)


def _require(name: str, value: object, *, positive: bool) -> None:
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        raise ParameterError(name, "must be a finite number", value=value)
    if positive and value <= 0:
        raise ParameterError(name, "must be positive", value=value)
    if not positive and value < 0:
        raise ParameterError(name, "cannot be negative", value=value)


def effective_capacitance_f(
    capacitance_f: float,
    tolerance: float | None,
    dielectric: str | None,
    profile: Any = None,
    *,
    working_v: float | None = None,
    part: Mapping[str, object] | None = None,
) -> float:
    """Return the capacitance one part keeps in service, C × (1 − tol) × k_bias × kept, in F.

    capacitance_f: nominal capacitance, in F; tolerance: as a fraction (None: the profile's
    default); dielectric: EIA or technology code of :mod:`partpick.fields`; working_v: the DC
    voltage across the part, in V (None: its rated voltage, the table's worst point); part:
    its catalog fields, for ``voltage_v`` and a datasheet DC-bias point. k_bias and kept come
    from the profile (``standard`` without one) through :mod:`partpick.screening.dc_bias`.
    Source: the profile's DC-bias tables (from memory) and the definition of a ± tolerance.
    """
    import numpy as np

    from partpick.screening.dc_bias import dc_bias
    from partpick.screening.profiles import load_profile

    profile = profile if profile is not None else load_profile(_DEFAULT_PROFILE)
    part = part or {}
    columns = {
        "dielectric": np.array([dielectric], dtype=object),
        "capacitance_f": np.array([float(capacitance_f)]),
        **{
            name: np.array([_number_or_nan(part.get(name))])
            for name in ("voltage_v", "capacitance_at_bias_f", "bias_v")
        },
    }
    kept = float(dc_bias(columns, math.inf if working_v is None else working_v, profile).kept[0])
    kept *= profile.kept_fraction(dielectric)
    if tolerance is None or _is_nan(tolerance):
        tolerance = profile.value("capacitor.tolerance_default")
    return float(capacitance_f) * (1.0 - float(tolerance)) * kept


def _number_or_nan(value: object) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        return math.nan
    return float(value)


def _is_nan(value: object) -> bool:
    return isinstance(value, float) and math.isnan(value)


def _present(value: object) -> bool:
    return value is not None and not _is_nan(value)


def _figure(
    parts: Mapping[str, Mapping[str, object]],
    overrides: Mapping[str, float],
    parameter: Parameter,
    notes: list[str],
) -> float | None:
    """Return one figure: the override, else the catalog value, else the documented default.

    A waveform figure that is missing raises ParameterError naming the override option; a
    loss-only figure that is missing is None, with a note.
    """
    if parameter.field in overrides:
        return float(overrides[parameter.field])
    part = parts.get(parameter.role)
    if part is None:
        raise ParameterError(
            parameter.field, "cannot be read: no part was given for this role", role=parameter.role
        )
    value = part.get(parameter.field)
    if _present(value):
        return float(value)  # type: ignore[arg-type]
    mpn = str(part.get("mpn") or "?")
    if parameter.field == "rd_ohm":
        return 0.0
    if parameter.field == "coss_f" and _present(part.get("coss_er_f")):
        return float(part["coss_er_f"])  # type: ignore[arg-type]
    if parameter.field == "qrr_c" and part.get("diode_type") in _NO_RECOVERY_TYPES:
        notes.append(f"diode {mpn}: no Qrr in the catalog; a {part['diode_type']} has none, 0 used")
        return 0.0
    if parameter in LOSS_PARAMETERS:
        notes.append(
            f"{parameter.role} {mpn}: no {parameter.field} in the catalog; its loss term is not "
            f"included (give {parameter.option})"
        )
        return None
    raise ParameterError(
        parameter.field,
        "is missing from the catalog",
        role=parameter.role,
        part=mpn,
        option=f'{parameter.option} (e.g. {parameter.option} "{parameter.example}")',
    )


def _energy_coss_f(part: Mapping[str, object], value: float | None, overridden: bool):
    """Return the energy-equivalent C_oss: Co(er) where the catalog gives it, else C_oss."""
    if not overridden and _present(part.get("coss_er_f")):
        return float(part["coss_er_f"])  # type: ignore[arg-type]
    return value


def _first_known(value: float | None, default: float) -> float:
    return default if value is None else value


def _optional(part: Mapping[str, object], name: str) -> float | None:
    value = part.get(name)
    return float(value) if _present(value) else None  # type: ignore[arg-type]


def stage_from_parts(
    spec: Any,
    parts: Mapping[str, Mapping[str, object]],
    *,
    hot_factor: float,
    output_count: int,
    overrides: Mapping[str, float] | None = None,
    profile: Any = None,
) -> Stage:
    """Return the :class:`Stage` of the parts chosen for each role.

    ``parts`` maps a role (``inductor``, ``output-cap``, ``diode``, ``switch``) to that part's
    catalog fields. ``overrides`` maps a field of :data:`PARAMETERS` or
    :data:`LOSS_PARAMETERS` (``"dcr_ohm"``) to an SI value that wins over the catalog.
    ``spec`` gives ``fsw_hz``, the gate drive, ``quiescent_w`` and ``ambient_max_degc``;
    ``profile`` (optional) the capacitor tolerance default and kept fractions. Raises
    ParameterError naming the field, role and part of a waveform figure that is missing.
    """
    overrides = dict(overrides or {})
    unknown = sorted(set(overrides) - OVERRIDE_FIELDS)
    if unknown:
        raise ParameterError(unknown[0], "is not a figure of the stage that can be overridden")
    notes: list[str] = []
    values = {p.field: _figure(parts, overrides, p, notes) for p in PARAMETERS + LOSS_PARAMETERS}
    cap = parts.get("output-cap", {})
    diode, switch, inductor = parts["diode"], parts["switch"], parts["inductor"]
    core = core_loss_from_part(inductor, values["inductance_h"])
    if core is None:
        mpn = inductor.get("mpn") or "?"
        notes.append(f"inductor {mpn}: no core-loss data in the catalog; core loss not included")
    return Stage(
        inductance_h=values["inductance_h"],
        dcr_ohm=values["dcr_ohm"],
        rds_on_ohm=values["rds_on_ohm"],
        hot_factor=float(hot_factor),
        diode_vf_v=values["vf_v"],
        diode_rd_ohm=values["rd_ohm"],
        cout_f=effective_capacitance_f(
            values["capacitance_f"],
            cap.get("tolerance"),
            cap.get("dielectric"),
            profile,
            working_v=float(spec.vout_v),
            part=cap,
        ),  # fmt: skip
        esr_ohm=values["esr_ohm"],
        output_count=output_count,
        fsw_hz=float(spec.fsw_hz),
        qgd_c=values["qgd_c"],
        coss_f=_energy_coss_f(switch, values["coss_f"], "coss_f" in overrides),
        gate_drive_a=float(spec.gate_drive_a),
        gate_drive_v=float(getattr(spec, "gate_drive_v", 10.0)),
        qrr_c=values["qrr_c"],
        qg_c=values["qg_c"],
        cj_f=values["cj_f"],
        ir_a=_optional(diode, "ir_a"),
        ir_tj_degc=_first_known(_optional(diode, "ir_tj_degc"), DEFAULT_IR_TJ_DEGC),
        diode_if_avg_a=_optional(diode, "if_avg_a"),
        diode_theta_ja_degc_w=_optional(diode, "theta_ja_degc_w"),
        diode_tj_max_degc=_optional(diode, "tj_max_degc"),
        ambient_degc=float(spec.ambient_max_degc),
        quiescent_w=float(getattr(spec, "quiescent_w", 0.0)),
        core=core,
        parts={role: str(part.get("mpn") or "?") for role, part in parts.items()},
        notes=tuple(notes),
    )
