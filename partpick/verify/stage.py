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

ROLES: tuple[str, ...] = ("inductor", "output-cap", "diode", "switch")


class Parameter(NamedTuple):
    """One figure the model takes from a part: its role, catalog field and override option."""

    role: str
    field: str
    unit: str
    option: str
    example: str


# The figures read from the catalog, in the order they are looked up. ``rd_ohm`` (a diode
# series resistance) is not a catalog field of every file; where absent it is zero.
PARAMETERS: tuple[Parameter, ...] = (
    Parameter("inductor", "inductance_h", "H", "--inductance", "10 uH"),
    Parameter("inductor", "dcr_ohm", "ohm", "--dcr", "45 mOhm"),
    Parameter("output-cap", "capacitance_f", "F", "--capacitance", "22 uF"),
    Parameter("output-cap", "esr_ohm", "ohm", "--esr", "5 mOhm"),
    Parameter("diode", "vf_v", "V", "--vf", "0.45 V"),
    Parameter("diode", "rd_ohm", "ohm", "--rd", "20 mOhm"),
    Parameter("diode", "qrr_c", "C", "--qrr", "15 nC"),
    Parameter("switch", "rds_on_ohm", "ohm", "--rds-on", "18 mOhm"),
    Parameter("switch", "qgd_c", "C", "--qgd", "3 nC"),
    Parameter("switch", "coss_f", "F", "--coss", "150 pF"),
)
OVERRIDE_FIELDS: frozenset[str] = frozenset(p.field for p in PARAMETERS)

# Schottky and SiC Schottky rectifiers are majority-carrier devices with no stored minority
# charge, so a missing Qrr is taken as zero for them (Erickson & Maksimovic, Fundamentals of
# Power Electronics, 3rd ed., ch. 4, on Schottky diodes).
_NO_RECOVERY_TYPES = frozenset({"schottky", "sic"})

# Without a profile object the built-in "standard" profile gives the tolerance default and
# the DC-bias tables (partpick/screening/profiles/standard.toml).
_DEFAULT_PROFILE = "standard"


@dataclass(frozen=True, kw_only=True)
class Stage:
    """A boost power stage in SI units; validated on construction.

    ``rds_on_ohm`` is the catalog figure (25 °C); the model uses ``rds_on_ohm × hot_factor``
    (:attr:`rds_on_hot_ohm`). ``cout_f`` and ``esr_ohm`` are per output capacitor, with
    ``cout_f`` already the effective capacitance; the bank is ``output_count`` equal parts.
    ``qgd_c``, ``coss_f``, ``gate_drive_a`` and ``qrr_c`` feed the formula-based switching,
    output-capacitance and recovery losses of :mod:`partpick.losses`.
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
    qgd_c: float = 0.0
    coss_f: float = 0.0
    gate_drive_a: float = 1.0
    qrr_c: float = 0.0
    notes: tuple[str, ...] = field(default=(), compare=False)

    def __post_init__(self) -> None:
        for name in ("inductance_h", "cout_f", "fsw_hz", "gate_drive_a", "hot_factor"):
            _require(name, getattr(self, name), positive=True)
        for name in ("dcr_ohm", "rds_on_ohm", "diode_vf_v", "esr_ohm", "diode_rd_ohm"):
            _require(name, getattr(self, name), positive=False)
        for name in ("qgd_c", "coss_f", "qrr_c"):
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
        """Drain-voltage transition time Q_gd / I_g, in s (see :mod:`partpick.losses`)."""
        return self.qgd_c / self.gate_drive_a


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
) -> float:
    """Return one figure: the override, else the catalog value, else the documented default."""
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
    if parameter.field == "qrr_c" and part.get("diode_type") in _NO_RECOVERY_TYPES:
        notes.append(f"diode {mpn}: no Qrr in the catalog; a {part['diode_type']} has none, 0 used")
        return 0.0
    raise ParameterError(
        parameter.field,
        "is missing from the catalog",
        role=parameter.role,
        part=mpn,
        option=f'{parameter.option} (e.g. {parameter.option} "{parameter.example}")',
    )


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
    catalog fields. ``overrides`` maps a field of :data:`PARAMETERS` (``"dcr_ohm"``) to an SI
    value that wins over the catalog. ``spec`` gives ``fsw_hz`` and ``gate_drive_a``;
    ``profile`` (optional) the capacitor tolerance default and kept fractions. Raises
    ParameterError naming the field, role and part of a figure that is missing.
    """
    overrides = dict(overrides or {})
    unknown = sorted(set(overrides) - OVERRIDE_FIELDS)
    if unknown:
        raise ParameterError(unknown[0], "is not a figure of the stage that can be overridden")
    notes: list[str] = []
    values = {p.field: _figure(parts, overrides, p, notes) for p in PARAMETERS}
    cap = parts.get("output-cap", {})
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
        coss_f=values["coss_f"],
        gate_drive_a=float(spec.gate_drive_a),
        qrr_c=values["qrr_c"],
        notes=tuple(notes),
    )
