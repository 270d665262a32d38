"""Draw a verification: the waveforms at the worst point and efficiency against load.

matplotlib runs on its Agg backend, so no display is needed; the format (PNG or SVG) follows
the file's extension, and the file is written through a temporary file and a rename so an
existing plot is never left half-written.
"""

from __future__ import annotations

import io
from pathlib import Path

import matplotlib

matplotlib.use("Agg")  # before pyplot: render off-screen, never open a window

import matplotlib.pyplot as plt  # noqa: E402

from partpick.errors import ParameterError  # noqa: E402
from partpick.outputs import PLOT_MARK  # noqa: E402
from partpick.render.exports import write_atomically  # noqa: E402
from partpick.verify.sweep import VerifyResult, efficiency_curves, waveforms  # noqa: E402

PLOT_FORMATS: dict[str, str] = {".png": "png", ".svg": "svg"}
_DPI = 120


def plot_format(path: str | Path) -> str:
    """Return ``"png"`` or ``"svg"`` from the extension of ``path``; ParameterError otherwise."""
    suffix = Path(path).suffix.lower()
    if suffix not in PLOT_FORMATS:
        raise ParameterError(str(path), "cannot be written: a plot file ends in .png or .svg")
    return PLOT_FORMATS[suffix]


def plot_bytes(result: VerifyResult, file_format: str = "png") -> bytes:
    """Return the figure of ``result`` as PNG or SVG bytes."""
    worst = result.worst_point()
    wave = waveforms(worst.state, periods=2)
    vins = sorted({p.point.vin_v for p in result.points})
    curves = efficiency_curves(result.spec, result.stage, vins, duty=result.duty)
    figure, (ax_il, ax_vo, ax_eff) = plt.subplots(3, 1, figsize=(7.5, 9.0), layout="constrained")
    try:
        time_us = wave.time_s * 1e6
        where = f"{worst.point.vin_v:g} V in, {worst.point.iout_a:g} A out, {worst.state.mode}"
        ax_il.plot(time_us, wave.il_a, color="tab:blue")
        ax_il.set(ylabel="inductor current (A)", title=f"Worst ripple point: {where}")
        ax_vo.plot(time_us, wave.vout_v, color="tab:red")
        ax_vo.set(xlabel="time (µs)", ylabel="output voltage (V)")
        for vin, (loads, efficiency) in curves.items():
            ax_eff.plot(loads, efficiency * 100.0, label=f"{vin:g} V in")
        bound = any(p.state.efficiency_is_upper_bound for p in result.points)
        label = "efficiency (%), upper bound" if bound else "efficiency (%)"
        ax_eff.set(xlabel="load current (A)", ylabel=label)
        if bound:
            ax_eff.set_title("loss terms without catalog data are not included", fontsize=9)
        ax_eff.legend()
        for axis in (ax_il, ax_vo, ax_eff):
            axis.grid(True, alpha=0.3)
        buffer = io.BytesIO()
        # metadata without dates keeps an SVG byte-identical between runs; the maker's mark
        # lets a later run tell its own plot from someone else's file of the same name
        if file_format == "svg":
            metadata = {"Date": None, "Creator": PLOT_MARK}
        else:
            metadata = {"Software": PLOT_MARK}
        figure.savefig(buffer, format=file_format, dpi=_DPI, metadata=metadata)
        return buffer.getvalue()
    finally:
        plt.close(figure)


def save_plot(path: str | Path, result: VerifyResult, option: str = "--plot") -> Path:
    """Write the figure of ``result`` to ``path`` (.png or .svg) atomically; return the path."""
    return write_atomically(path, plot_bytes(result, plot_format(path)), option)
