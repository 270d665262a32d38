"""Verify a chosen power stage: its exact steady-state waveforms and losses with real parts.

The public entry points:

* :func:`stage_from_parts` turns the catalog fields of the chosen parts into a :class:`Stage`;
* :func:`steady_state` solves one operating point (regulated or open loop);
* :func:`verify_design` solves every operating point of a spec and returns the warnings;
* :func:`verify_parts` does both for the BOM's verification section;
* :func:`waveforms` and :func:`efficiency_curves` feed the plot.

The names load on first use, so importing the package (every ``partpick`` command does, to
register ``verify``) does not pay for scipy.
"""

from __future__ import annotations

import importlib
from typing import Any

_HOMES = {
    "Stage": "stage",
    "effective_capacitance_f": "stage",
    "stage_from_parts": "stage",
    "LOSS_KEYS": "terms",
    "SteadyState": "steady_state",
    "steady_state": "steady_state",
    "OperatingPoint": "sweep",
    "PointResult": "sweep",
    "VerifyResult": "sweep",
    "VerifyWarning": "sweep",
    "Waveforms": "sweep",
    "default_points": "sweep",
    "efficiency_curves": "sweep",
    "verify_design": "sweep",
    "verify_parts": "sweep",
    "waveforms": "sweep",
    "verify_selection": "parts",
}

__all__ = sorted(_HOMES)


def __getattr__(name: str) -> Any:
    if name not in _HOMES:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{_HOMES[name]}"), name)
