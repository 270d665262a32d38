"""The shape every topology module has: a worst-case envelope and per-part stresses.

A topology takes a :class:`~partpick.design.spec.Spec` and returns

* an :class:`Envelope`: named worst-case :class:`Figure` values over the input range, with the
  input voltage where each is worst, the CCM/DCM verdict, and cautions and warnings as data;
* a :class:`PartStress`: the stresses at an array of inductances (one per catalog part), each
  the maximum over the input range, for the screening rules.

Adding a topology means adding one module with a class that satisfies :class:`Topology` and
listing it in :mod:`partpick.design.topologies`; rules, renderers and the CLI stay untouched.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Protocol

import numpy as np

from partpick.design.spec import Spec

GROUPS = ("converter", "duty", "inductor", "switch", "diode", "output-cap", "input-cap")
"""Component groups of the figures, in the order renderers show them."""


@dataclass(frozen=True)
class Figure:
    """One worst-case figure: a value in SI (None where it does not exist) and where it is worst."""

    key: str
    value: float | None
    unit: str
    group: str
    label: str
    worst_vin_v: float | None


@dataclass(frozen=True)
class Caution:
    """A caution or warning: a stable code for programs and one sentence for people."""

    code: str
    text: str


@dataclass(frozen=True)
class Envelope:
    """The worst-case operating envelope of a design, as named figures plus verdicts."""

    spec: Spec
    figures: dict[str, Figure]
    ccm: bool
    ccm_light_load: bool | None
    dcm_ratio_light_load: float | None
    cautions: tuple[Caution, ...]
    warnings: tuple[Caution, ...] = field(default=())

    def value(self, key: str) -> float:
        """Return the SI value of figure ``key``; KeyError if absent or None."""
        value = self.figures[key].value
        if value is None:
            raise KeyError(f"figure {key!r} has no value for this spec")
        return value

    def to_dict(self) -> dict[str, object]:
        """Return the JSON object of ``partpick stress --format json`` (SI units).

        Flat figure keys with their values, ``ccm``, ``ccm_light_load``,
        ``dcm_ratio_light_load``, ``cautions`` and ``warnings`` (lists of strings), plus
        ``worst_vin_v`` and ``units`` (per figure key), ``topology`` and ``spec``.
        """
        data: dict[str, object] = {"topology": self.spec.topology}
        data.update({key: _json_number(fig.value) for key, fig in self.figures.items()})
        data["ccm"] = bool(self.ccm)
        data["ccm_light_load"] = self.ccm_light_load
        data["dcm_ratio_light_load"] = _json_number(self.dcm_ratio_light_load)
        data["cautions"] = [caution.text for caution in self.cautions]
        data["warnings"] = [warning.text for warning in self.warnings]
        data["caution_codes"] = [caution.code for caution in self.cautions]
        data["warning_codes"] = [warning.code for warning in self.warnings]
        data["worst_vin_v"] = {
            key: _json_number(fig.worst_vin_v) for key, fig in self.figures.items()
        }
        data["units"] = {key: fig.unit for key, fig in self.figures.items()}
        data["spec"] = self.spec.to_dict()
        return data


def _json_number(value: float | None) -> float | None:
    """Return a JSON-safe float: None for missing or non-finite values."""
    if value is None:
        return None
    value = float(value)
    return value if math.isfinite(value) else None


@dataclass(frozen=True)
class PartStress:
    """Stresses at one inductance per part, each the maximum over the input-voltage range.

    Every array has one entry per part (the shape of ``inductance_h``), in SI units; the
    ``*_vin_v`` arrays give the input voltage where the stress beside them is worst.
    """

    inductance_h: np.ndarray
    il_peak_a: np.ndarray
    il_peak_vin_v: np.ndarray
    il_rms_a: np.ndarray
    il_rms_vin_v: np.ndarray
    il_ripple_a: np.ndarray
    il_ripple_vin_v: np.ndarray
    isw_rms_a: np.ndarray
    id_rms_a: np.ndarray
    icout_rms_a: np.ndarray
    icin_rms_a: np.ndarray


class Topology(Protocol):
    """What the rest of partpick needs from a converter topology."""

    name: str

    def validate(self, spec: Spec) -> None:
        """Raise SpecError if the spec is impossible for this topology."""

    def envelope(self, spec: Spec) -> Envelope:
        """Return the worst-case envelope of the spec."""

    def stresses_at(self, spec: Spec, inductance_h: np.ndarray) -> PartStress:
        """Return the stresses at each inductance, maximised over the input range."""

    def ccm_at(self, spec: Spec, inductance_h: float) -> bool:
        """Return True where full load stays in CCM over the whole input range at this L."""
