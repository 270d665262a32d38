"""DC bias of ceramic capacitors: the capacitance a part keeps at its working voltage.

A class II ceramic (X7R, X5R, Y5V, …) loses capacitance as its DC voltage rises, and the
loss depends on the voltage as a share of the part's rating. The profile holds one
piecewise-linear table per dielectric (``capacitor.dc_bias.<code>.<percent>``, see
``profiles/standard.toml``): kept fraction against working voltage / rated voltage.

A catalog point from the part's own datasheet (``capacitance_at_bias_f`` at ``bias_v``) takes
precedence. The table's shape is bent through that point by a power,
kept(x) = g(x)^(ln k_ds / ln g(x_ds)): it equals the datasheet value at the datasheet voltage,
is 1 at no bias and never rises with the voltage, like the table. A dielectric without a table
(C0G, film, electrolytics) keeps 1.0 unless its datasheet point says otherwise; it then bends
the ``unknown`` table's shape. Common practice (interpolating a measured point along a typical
curve), no published source.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, NamedTuple

import numpy as np

from partpick.screening.profiles import DIELECTRICS

if TYPE_CHECKING:
    from partpick.screening.profiles import Profile

# basis codes of each part's kept fraction, for notes and renderers
NO_LOSS, TABLE, DATASHEET, UNRATED = 0, 1, 2, 3
BASIS_TEXT = {
    NO_LOSS: "no DC-bias loss for its dielectric",
    TABLE: "profile DC-bias table",
    DATASHEET: "datasheet point in the catalog",
    UNRATED: "no rated voltage: the table's last point",
}


class DcBias(NamedTuple):
    """Per part: kept fraction at the working voltage, working/rated, and the basis code."""

    kept: np.ndarray
    fraction_of_rating: np.ndarray
    basis: np.ndarray


def table_kept_fraction(fraction_of_rating, volts: tuple[float, ...], kept: tuple[float, ...]):
    """Return the table's kept fraction at each working voltage / rated voltage.

    fraction_of_rating: V_work/V_rated (dimensionless); volts, kept: the table points, sorted.
    Linear between points, held at the end points outside them; no points gives 1.0.
    Source: the profile's table (see the module docstring).
    """
    x = np.asarray(fraction_of_rating, dtype=float)
    if not volts:
        return np.ones_like(x)
    return np.interp(x, np.asarray(volts), np.asarray(kept))


def bent_kept_fraction(table_at_work, table_at_point, kept_at_point):
    """Return the table shape bent through a datasheet point: g_w^(ln k_ds / ln g_ds).

    table_at_work: the table's kept fraction at the working voltage; table_at_point: at the
    datasheet's bias voltage (below 1); kept_at_point: the datasheet's C(V)/C_nominal, in
    (0, 1]. Equal to kept_at_point where the two voltages match. Common practice, no
    published source.
    """
    g_w = np.asarray(table_at_work, dtype=float)
    exponent = np.log(np.asarray(kept_at_point, dtype=float)) / np.log(
        np.asarray(table_at_point, dtype=float)
    )
    return g_w**exponent


def dc_bias(columns: dict[str, np.ndarray], working_v: float, profile: Profile) -> DcBias:
    """Return the DC-bias kept fraction of every capacitor in ``columns`` at ``working_v``.

    Reads ``dielectric``, ``capacitance_f``, ``voltage_v`` and, where present,
    ``capacitance_at_bias_f`` and ``bias_v``. A part without a rated voltage takes its
    table's last (lowest) point.
    """
    diel = np.asarray(columns["dielectric"], dtype=object).astype("U16")
    rated = np.asarray(columns["voltage_v"], dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        x_work = working_v / rated
    n = rated.shape[0]
    kept, basis = np.ones(n), np.full(n, NO_LOSS, dtype=np.int8)
    shape_at_work, shape_at_point = np.ones(n), np.ones(n)
    x_point = _datasheet_fraction(columns, rated)
    unknown = profile.dc_bias_table(None)
    for code in (*DIELECTRICS, "None"):
        mine = diel == code
        if not mine.any():
            continue
        volts, points = profile.dc_bias_table(None if code == "None" else code)
        shape = (volts, points) if volts else unknown
        x = np.where(np.isfinite(x_work[mine]), x_work[mine], np.inf)
        shape_at_work[mine] = table_kept_fraction(x, *shape)
        shape_at_point[mine] = table_kept_fraction(np.nan_to_num(x_point[mine]), *shape)
        if volts:
            kept[mine] = shape_at_work[mine]
            basis[mine] = np.where(np.isfinite(x_work[mine]), TABLE, UNRATED)
    kept, basis = _with_datasheet(columns, kept, basis, shape_at_work, shape_at_point, x_point)
    return DcBias(kept, x_work, basis)


def _datasheet_fraction(columns: dict[str, np.ndarray], rated: np.ndarray) -> np.ndarray:
    """Return bias_v / V_rated where a usable datasheet point is given, else NaN."""
    bias = np.asarray(columns.get("bias_v", np.full(rated.shape, np.nan)), dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = bias / rated
    return np.where((bias > 0) & np.isfinite(x), x, np.nan)


def _with_datasheet(columns, kept, basis, shape_at_work, shape_at_point, x_point):
    """Return (kept, basis) with the datasheet point taking precedence where it is usable."""
    nominal = np.asarray(columns["capacitance_f"], dtype=float)
    at_bias = np.asarray(columns.get("capacitance_at_bias_f", np.full(nominal.shape, np.nan)))
    with np.errstate(divide="ignore", invalid="ignore"):
        k_ds = np.clip(at_bias / nominal, 1e-6, 1.0)
    usable = np.isfinite(k_ds) & np.isfinite(x_point) & (shape_at_point < 1.0)
    if not usable.any():
        return kept, basis
    with np.errstate(divide="ignore", invalid="ignore"):
        bent = bent_kept_fraction(shape_at_work, np.where(usable, shape_at_point, 0.5), k_ds)
    return np.where(usable, bent, kept), np.where(usable, DATASHEET, basis).astype(np.int8)
