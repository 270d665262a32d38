"""The loss terms of the waveform model: their keys, where each is dissipated, what it needs.

Every term the verifier books is listed here once, in the order the tables show them. A
term whose data-sheet figure is missing is not guessed: its power is 0 W in ``losses_w``, it
is listed in ``not_included`` (a :class:`NotIncluded`, naming the part and the figure), and the
efficiency is labelled an upper bound.

Where a term is dissipated decides which junction it heats. The diode's recovered charge and
the charge of its junction capacitance are both drawn through the switch when it turns on, so
they heat the switch, not the diode (Erickson & Maksimovic, *Fundamentals of Power
Electronics*, 3rd ed., ch. 4, switching loss: diode recovered charge and device
capacitances). The gate drive is dissipated in the driver and gate resistances.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple


class LossTerm(NamedTuple):
    """One loss term: its key, its column title, and the element it heats."""

    key: str
    title: str
    heats: str  # a role of verify/stage.py, "driver" or "controller"
    needs: str | None  # the catalog figure it needs, None where the waveforms give it all


LOSS_TERMS: tuple[LossTerm, ...] = (
    LossTerm("dcr", "DCR", "inductor", None),
    LossTerm("core", "core", "inductor", "core-loss data"),
    LossTerm("switch_conduction", "Q cond", "switch", None),
    LossTerm("switching", "Q sw", "switch", "Qgd (qgd_c)"),
    LossTerm("coss", "Coss", "switch", "Coss (coss_f or coss_er_f)"),
    LossTerm("diode_cj", "D Cj", "switch", "junction capacitance (cj_f)"),
    LossTerm("recovery", "Qrr", "switch", "recovery charge (qrr_c)"),
    LossTerm("gate_drive", "gate", "driver", "gate charge (qg_c)"),
    LossTerm("diode_conduction", "D cond", "diode", None),
    LossTerm("leakage", "D leak", "diode", "reverse leakage (ir_a)"),
    LossTerm("esr", "ESR", "output-cap", None),
    LossTerm("quiescent", "ctrl", "controller", None),
)
LOSS_KEYS: tuple[str, ...] = tuple(t.key for t in LOSS_TERMS)
TERMS_BY_KEY: dict[str, LossTerm] = {t.key: t for t in LOSS_TERMS}


@dataclass(frozen=True)
class NotIncluded:
    """A loss term left out because a part lacks the figure it needs."""

    term: str
    role: str
    part: str
    figure: str

    def to_dict(self) -> dict[str, str]:
        return {"term": self.term, "role": self.role, "part": self.part, "figure": self.figure}


def heat_w(losses_w: dict[str, float], element: str) -> float:
    """Return the sum of the terms that heat ``element`` (a role), in W."""
    return float(sum(losses_w[t.key] for t in LOSS_TERMS if t.heats == element))


def not_included_terms(stage) -> tuple[NotIncluded, ...]:
    """Return the terms of ``stage`` (a :class:`~partpick.verify.stage.Stage`) left out."""
    missing = {
        "core": ("inductor", stage.core is None),
        "switching": ("switch", stage.qgd_c is None),
        "coss": ("switch", stage.coss_f is None),
        "diode_cj": ("diode", stage.cj_f is None),
        "recovery": ("diode", stage.qrr_c is None),
        "gate_drive": ("switch", stage.qg_c is None),
        "leakage": ("diode", stage.ir_a is None),
    }
    return tuple(
        NotIncluded(key, role, stage.part_name(role), TERMS_BY_KEY[key].needs or key)
        for key, (role, absent) in missing.items()
        if absent
    )
