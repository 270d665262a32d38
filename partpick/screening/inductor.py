"""Rules for the ``inductor`` role, vectorised over every inductor in the catalog.

The rules (profile ``standard`` figures in brackets):

* ``inductance``: l_min_h ≤ L·(1 − tolerance) and L ≤ l_max_h: the part's lowest inductance
  keeps the ripple (so the peak) inside the design's band, and its nominal value is not above
  the band's low end (too little ripple is a size and control matter, not a stress, so the
  nominal is used there; common practice, no published source).
* ``saturation``: the peak current at the part's minimum inductance L·(1 − tolerance)
  ≤ u·Isat [u = 0.8]. The minimum L gives the largest ripple, so the largest peak.
* ``rms``: the RMS current at that same minimum L ≤ u·Irms [u = 0.9].
* ``srf`` (only when the SRF is given): SRF ≥ k·fsw [k = 10], so the part stays inductive
  well past the switching frequency (common practice, no published source).
* ``lifecycle``: an obsolete part fails; nrnd passes with a note.

A missing tolerance is taken as the profile's ``inductor.tolerance_default`` [0.2].
Loss (for ranking): I_rms² · DCR at the part's minimum L
(:func:`partpick.losses.inductor_dcr_loss_w`).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, NamedTuple

import numpy as np

from partpick.losses import inductor_dcr_loss_w
from partpick.screening.checks import (
    RuleNeeds,
    RuleResult,
    Screen,
    finish_rule,
    lifecycle_notes,
    lifecycle_rule,
    limit_rule,
    missing_masks,
    operating_point,
    use_rule,
)

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology
    from partpick.screening.profiles import Profile

KIND = "inductor"
FIELDS: tuple[str, ...] = (
    "inductance_h",
    "tolerance",
    "isat_a",
    "irms_a",
    "dcr_ohm",
    "srf_hz",
    "lifecycle",
)
CORE: tuple[str, ...] = ("isat_a", "irms_a")
# what each rule reads (the import coverage report says what a file without them costs)
RULES: tuple[RuleNeeds, ...] = (
    RuleNeeds("inductance", ("inductance_h",)),
    RuleNeeds("saturation", ("isat_a",)),
    RuleNeeds("rms", ("irms_a",)),
    RuleNeeds("srf", ("srf_hz",), optional=True),
    RuleNeeds("lifecycle", ("lifecycle",), optional=True),
)
USES: tuple[str, ...] = ("l_min_h", "l_max_h", "il_avg_max_a", "il_peak_max_a", "il_rms_max_a")


def minimum_inductance_h(inductance_h, tolerance, tolerance_default: float) -> np.ndarray:
    """Return the lowest inductance within tolerance, L·(1 − tol), in H.

    inductance_h: nominal inductance, in H; tolerance: fraction (±20 % is 0.2), NaN where
    unknown, which takes ``tolerance_default``. Source: definition of a ± tolerance.
    """
    tol = np.asarray(tolerance, dtype=float)
    tol = np.where(np.isnan(tol), tolerance_default, tol)
    return np.asarray(inductance_h, dtype=float) * (1.0 - tol)


def window_rule(inductance_h, inductance_min_h, l_min_h: float, l_max_h: float) -> RuleResult:
    """Return the rule l_min_h ≤ L·(1 − tol) and L ≤ l_max_h (H).

    inductance_h: nominal L; inductance_min_h: L·(1 − tol). The stress and limit reported are
    those of the bound the part breaks, or of the nearer one when it is inside (L·(1 − tol)
    against l_min, nominal L against l_max); load = max(l_min/L_low, L/l_max), so a part
    inside has load ≤ 1.
    """
    ind = np.asarray(inductance_h, dtype=float)
    low = np.asarray(inductance_min_h, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        below, above = l_min_h / low, ind / l_max_h
    load = np.maximum(below, above)
    lower_side = below >= above
    limit = np.where(lower_side, l_min_h, l_max_h)
    stress = np.where(lower_side, low, ind)
    passing = (low >= l_min_h) & (ind <= l_max_h)
    return finish_rule(
        "inductance", "H", stress, limit, None, None, None, None, load,
        missing_masks({"inductance_h": ind}, ("inductance_h",)), passing=passing,
    )  # fmt: skip


def saturation_rule(il_peak_a, il_peak_vin_v, isat_a, use: float) -> RuleResult:
    """Return the rule I_peak(L_min) ≤ use · Isat (A). Source: issue 4 ``standard`` profile."""
    isat = np.asarray(isat_a, dtype=float)
    return use_rule(
        "saturation", "A", il_peak_a, isat, use, il_peak_vin_v,
        missing_masks({"isat_a": isat}, ("isat_a",)),
    )  # fmt: skip


def rms_rule(il_rms_a, il_rms_vin_v, irms_a, use: float) -> RuleResult:
    """Return the rule I_rms(L_min) ≤ use · Irms (A), the winding heating limit."""
    irms = np.asarray(irms_a, dtype=float)
    return use_rule(
        "rms", "A", il_rms_a, irms, use, il_rms_vin_v,
        missing_masks({"irms_a": irms}, ("irms_a",)),
    )  # fmt: skip


def srf_rule(srf_hz, fsw_hz: float, ratio: float) -> RuleResult:
    """Return the optional rule ratio · fsw ≤ SRF (Hz); parts without an SRF are skipped."""
    srf = np.asarray(srf_hz, dtype=float)
    return limit_rule(
        "srf", "Hz", ratio * fsw_hz, srf, srf.shape[0],
        missing=missing_masks({"srf_hz": srf}, ("srf_hz",)), optional=True,
    )  # fmt: skip


def stresses_at_each(topology, spec, inductance_h: np.ndarray):
    """Return ``topology.stresses_at`` for each inductance, computed once per distinct value.

    Catalogs repeat a few standard values (IEC 60063 series times a tolerance), so this is
    far less work than one evaluation per part; the result is the same either way.
    """
    distinct, inverse = np.unique(inductance_h, return_inverse=True)
    st = topology.stresses_at(spec, distinct)
    return _Stress(*(getattr(st, name)[inverse] for name in _Stress._fields))


class _Stress(NamedTuple):
    il_peak_a: np.ndarray
    il_peak_vin_v: np.ndarray
    il_rms_a: np.ndarray
    il_rms_vin_v: np.ndarray


def screen(
    columns: dict[str, np.ndarray],
    spec: Spec,
    envelope: Envelope,
    topology: Topology,
    profile: Profile,
    max_parallel: int,
) -> Screen:
    """Return every inductor rule over every part in ``columns`` for ``spec``.

    The stresses come from ``topology.stresses_at`` at each part's own minimum inductance;
    a part without an inductance is evaluated at l_min_h (and is unverified for the window).
    """
    l_min, l_max = envelope.value("l_min_h"), envelope.value("l_max_h")
    nominal = columns["inductance_h"]
    tol_default = profile.value("inductor.tolerance_default")
    l_low = minimum_inductance_h(nominal, columns["tolerance"], tol_default)
    l_part = np.where(np.isfinite(l_low) & (l_low > 0), l_low, l_min)
    st = stresses_at_each(topology, spec, l_part)
    rules = (
        window_rule(nominal, l_low, l_min, l_max),
        saturation_rule(
            st.il_peak_a, st.il_peak_vin_v, columns["isat_a"],
            profile.value("inductor.saturation_use"),
        ),
        rms_rule(
            st.il_rms_a, st.il_rms_vin_v, columns["irms_a"], profile.value("inductor.rms_use")
        ),
        srf_rule(columns["srf_hz"], spec.fsw_hz, profile.value("inductor.srf_min_over_fsw")),
        lifecycle_rule(columns["lifecycle"]),
    )  # fmt: skip
    notes = [
        (f"tolerance not given; taken as ±{tol_default:.0%}", np.isnan(columns["tolerance"])),
        *lifecycle_notes(columns["lifecycle"]),
    ]
    loss = inductor_dcr_loss_w(st.il_rms_a, columns["dcr_ohm"])
    count = np.ones(nominal.shape[0], dtype=np.int64)
    columns = {**columns, "inductance_min_h": l_part, "il_peak_a": st.il_peak_a}
    return Screen(
        "inductor", KIND, columns, rules, count, loss, tuple(notes),
        operating_point(spec, envelope, USES),
    )  # fmt: skip
