"""Terminal view of a verification: the stage, one row per operating point, losses, warnings."""

from __future__ import annotations

import math

from rich import box
from rich.console import Console
from rich.panel import Panel
from rich.text import Text

from partpick.render.console import (
    STYLE_CAUTION,
    STYLE_FAIL,
    STYLE_HEADING,
    STYLE_MUTED,
    STYLE_UNVERIFIED,
)
from partpick.render.safe_text import Table
from partpick.units import format_eng
from partpick.verify.stage import Stage
from partpick.verify.sweep import PointResult, VerifyResult, VerifyWarning
from partpick.verify.terms import LOSS_TERMS

LOSS_TITLES = {t.key: t.title for t in LOSS_TERMS}


def stage_summary(stage: Stage) -> Text:
    """Return the one-line description of the stage's figures."""
    bank = f"{stage.output_count} × {format_eng(stage.cout_f, 'F')} effective"
    line = (
        f"L {format_eng(stage.inductance_h, 'H')} (DCR {format_eng(stage.dcr_ohm, 'ohm')}), "
        f"Rds(on) {format_eng(stage.rds_on_ohm, 'ohm')} × {stage.hot_factor:g} hot, "
        f"diode {format_eng(stage.diode_vf_v, 'V')}"
        + (f" + {format_eng(stage.diode_rd_ohm, 'ohm')}" if stage.diode_rd_ohm else "")
        + f", Cout {bank} (ESR {format_eng(stage.esr_ohm, 'ohm')} each), "
        f"{format_eng(stage.fsw_hz, 'Hz')}"
    )
    return Text(line, style=STYLE_HEADING)


def points_table(result: VerifyResult) -> Table:
    """Return one row per operating point: duty, output, ripple, inductor current, efficiency."""
    table = Table(
        box=box.SIMPLE_HEAD, header_style=STYLE_HEADING, pad_edge=False, collapse_padding=True
    )
    for title in ("Vin", "Iout", "Mode", "Duty", "Vout", "Ripple", "iL min", "iL max"):
        table.add_column(title, justify="right", no_wrap=True)
    table.add_column("iL rms", justify="right", no_wrap=True)
    table.add_column("Eff.", justify="right", no_wrap=True)
    flagged = {(w.vin_v, w.iout_a) for w in result.warnings}
    for item in result.points:
        s = item.state
        style = STYLE_UNVERIFIED if (item.point.vin_v, item.point.iout_a) in flagged else None
        table.add_row(
            format_eng(item.point.vin_v, "V"),
            format_eng(item.point.iout_a, "A"),
            s.mode.upper(),
            f"{s.duty:.3f}",
            format_eng(s.vout_avg_v, "V", 4),
            format_eng(s.vout_ripple_v, "V"),
            format_eng(s.il_min_a, "A"),
            format_eng(s.il_max_a, "A"),
            format_eng(s.il_rms_a, "A"),
            efficiency_text(s),
            style=style,
        )
    return table


def _milliwatts(value_w: float) -> str:
    milliwatts = value_w * 1e3
    return f"{milliwatts:.0f}" if abs(milliwatts) >= 999.5 else f"{milliwatts:.3g}"


_LOSS_LABEL_WIDTH = 14  # "D leak (diode)" and the like
_LOSS_POINT_WIDTH = 9  # "≥ 1030" or "800 mA", with the padding between columns


def losses_tables(points: tuple[PointResult, ...], width: int) -> list[Table]:
    """Return the loss of each term (rows) at each operating point (columns), in mW.

    The terms run down the page, so a table of a dozen terms fits an 80-column terminal; the
    points are split over as many tables as the width needs. A term left out for want of data
    shows "—", never a zero that reads as measured.
    """
    per_table = max(1, (width - _LOSS_LABEL_WIDTH) // _LOSS_POINT_WIDTH)
    return [
        _losses_table(points[start : start + per_table])
        for start in range(0, len(points), per_table)
    ]


def _losses_table(points: tuple[PointResult, ...]) -> Table:
    table = Table(
        box=box.SIMPLE_HEAD, header_style=STYLE_HEADING, pad_edge=False, collapse_padding=True
    )
    table.add_column("term (heats)", no_wrap=True)
    for item in points:
        header = f"{format_eng(item.point.vin_v, 'V')}\n{format_eng(item.point.iout_a, 'A')}"
        table.add_column(header, justify="right", no_wrap=True)
    missing = [{gap.term for gap in item.state.not_included} for item in points]
    for term in LOSS_TERMS:
        cells = [
            "—" if term.key in gaps else _milliwatts(item.state.losses_w[term.key])
            for item, gaps in zip(points, missing, strict=True)
        ]
        table.add_row(f"{term.title} ({_HEATS_SHORT.get(term.heats, term.heats)})", *cells)
    totals = [_milliwatts(item.state.total_loss_w) for item in points]
    table.add_row(
        "total",
        *(f"≥ {t}" if gaps else t for t, gaps in zip(totals, missing, strict=True)),
        style=STYLE_HEADING,
    )
    return table


_HEATS_SHORT = {"inductor": "L", "switch": "Q", "diode": "D", "output-cap": "Cout"}


# the verify option that supplies each loss-only figure (verify/stage.py LOSS_PARAMETERS)
_TERM_OPTIONS = {
    "switching": "--qgd",
    "coss": "--coss",
    "diode_cj": "--cj",
    "recovery": "--qrr",
    "gate_drive": "--qg",
}


def warning_sentence(warning: VerifyWarning) -> str:
    """Return the sentence of one warning, naming its operating point."""
    if warning.code == "loss-not-included" and warning.detail:
        gap = warning.detail
        title = LOSS_TITLES.get(gap["term"], gap["term"])
        option = _TERM_OPTIONS.get(gap["term"])
        fill = f" (give {option}, or add it to the catalog)" if option else ""
        return (
            f"every point: the {title} loss is not included, no {gap['figure']} for "
            f"{gap['role']} {gap['part']}{fill}; the efficiency is an upper bound"
        )
    where = f"{format_eng(warning.vin_v, 'V')} in, {format_eng(warning.iout_a, 'A')} out"
    value, limit = warning.value, warning.limit
    if warning.code == "vout-unreachable":
        text = (
            f"the output cannot reach {format_eng(limit, 'V')} (at best "
            f"{format_eng(value, 'V', 4)}): the losses cap the boost ratio"
        )
    elif warning.code == "ripple-above-limit":
        text = (
            f"output ripple {format_eng(value, 'V')} p-p is above the "
            f"{format_eng(limit, 'V')} limit"
        )
    elif warning.code == "dcm-where-ccm-assumed":
        text = (
            "the stage runs in DCM, where the design assumed CCM "
            f"(down to {format_eng(limit, 'A')}); the stress figures assume CCM"
        )
    elif warning.code == "high-duty":
        text = (
            f"the regulated duty {value:.3f} is above {limit:g}; a boost this close to full "
            "duty is hard to control and loses efficiency (common practice)"
        )
    elif warning.code == "efficiency-below-estimate":
        text = (
            f"efficiency {value * 100:.1f} % is below the {limit * 100:.1f} % the design's "
            "currents were computed with, so its stresses are underestimated; rerun the design "
            f"with --efficiency {_floor_percent(value)} or lower"
        )
    elif warning.code == "diode-reconducts":
        text = (
            f"the output falls to {format_eng(value, 'V')}, below Vin − Vf "
            f"({format_eng(limit, 'V')}), while the inductor current rests at zero; the diode "
            "would conduct again, which this model leaves out: the figures here are not reliable"
        )
    else:  # a code added to the core before its sentence: still show the facts
        text = f"{warning.code}: {value:g} (limit {limit})"
    return f"{where}: {text}"


def _floor_percent(efficiency: float) -> str:
    """Return the efficiency rounded down to a tenth of a percent, as option text."""
    return f"{math.floor(efficiency * 1000.0) / 10.0:.1f}%"


def efficiency_text(state) -> str:
    """Return the efficiency as text, "≤ 95.1 %" where a loss term is missing (upper bound)."""
    mark = "≤ " if state.efficiency_is_upper_bound else ""
    return f"{mark}{state.efficiency * 100:.1f} %"


def not_included_lines(points: tuple[PointResult, ...]) -> list[str]:
    """Return one line per loss term left out (the same at every point), naming the part."""
    seen: dict[tuple[str, str], str] = {}
    for item in points:
        for gap in item.state.not_included:
            title = LOSS_TITLES.get(gap.term, gap.term)
            seen.setdefault((gap.term, gap.part), f"{title}: no {gap.figure} for {gap.part}")
    return [f"not included: {text}" for text in seen.values()]


RULE_TITLES = {
    "output-voltage": "output peak vs cap voltage",
    "hazard-voltage": "output above 60 V hazard",
    "drain-voltage": "switch node peak vs VDS",
    "reverse-voltage": "diode reverse vs VRRM",
    "saturation": "peak at L·(1 − tol) vs Isat",
    "switch-thermal": "switch Tj at ambient max",
    "diode-thermal": "diode Tj at ambient max",
    "thermal-runaway": "diode leakage runs away",
}


def _figure_text(value: float, unit: str) -> str:
    if unit == "degC":
        return "no steady value" if math.isinf(value) else f"{value:.1f} °C"
    return format_eng(value, unit)


def _rating_text(violation) -> str:
    """Return the part's rating the limit derives from (Tj max "150 °C", "50 V"), or "—"."""
    if violation.rating is None or violation.rule == "hazard-voltage":
        return "—"
    if violation.unit == "degC":
        return f"{violation.rating:.0f} °C"
    return format_eng(violation.rating, violation.unit)


def violations_table(result: VerifyResult) -> Table:
    """Return one row per rating exceeded: point, part, check, value and limit."""
    table = Table(
        box=box.SIMPLE_HEAD, header_style=STYLE_HEADING, pad_edge=False, collapse_padding=True
    )
    for title in ("Vin", "Iout", "part", "check", "value", "limit", "rating"):
        justify = "left" if title in ("part", "check") else "right"
        table.add_column(title, justify=justify, no_wrap=title != "check")
    for v in result.violations:
        table.add_row(
            format_eng(v.vin_v, "V"),
            format_eng(v.iout_a, "A"),
            v.part,
            RULE_TITLES.get(v.rule, v.rule),
            _figure_text(v.value, v.unit),
            _figure_text(v.limit, v.unit),
            _rating_text(v),
            style=STYLE_FAIL,
        )
    return table


def render_ratings(result: VerifyResult, console: Console) -> None:
    """Print the rating violations (or that there are none) and the checks not made."""
    if not result.ratings_checked:
        return
    if result.violations:
        console.print(Text(f"Ratings exceeded ({len(result.violations)})", style=STYLE_FAIL))
        console.print(violations_table(result))
        console.print(
            Text("limits are the profile's derated figures (use × rating, Tj max − margin)",
                 style=STYLE_MUTED)
        )  # fmt: skip
    else:
        console.print(Text("Ratings: no violation at any point.", style=STYLE_MUTED))
    for gap in result.unchecked:
        console.print(
            Text(
                f"not checked: {RULE_TITLES.get(gap.rule, gap.rule)}: no {gap.figure} for "
                f"{gap.role} {gap.part}",
                style=STYLE_UNVERIFIED,
            )
        )


def render_verify(result: VerifyResult, console: Console) -> None:
    """Print the verification: stage, points, losses and a panel of warnings."""
    console.print(stage_summary(result.stage))
    regime = (
        f"regulated to {format_eng(result.vout_v, 'V')}"
        if result.regulated
        else f"open loop at duty {result.duty:g}"
    )
    console.print(
        Text(
            f"Steady state, {regime}; ripple limit {format_eng(result.vout_ripple_limit_v, 'V')}",
            style=STYLE_MUTED,
        )
    )
    console.print(points_table(result))
    console.print(Text("Losses per term in mW, and the part each heats", style=STYLE_HEADING))
    for table in losses_tables(result.points, console.width):
        console.print(table)
    gaps = not_included_lines(result.points)
    for line in gaps:
        console.print(Text(line, style=STYLE_UNVERIFIED))
    if gaps:
        console.print(
            Text(
                "efficiency marked ≤ is an upper bound: the terms above are not included",
                style=STYLE_MUTED,
            )
        )
    render_ratings(result, console)
    for note in result.stage.notes:
        if "not included" not in note:  # those are warnings below, with their option
            console.print(Text(f"note: {note}", style=STYLE_MUTED))
    if result.warnings:
        body = "\n".join(f"• {warning_sentence(w)}" for w in result.warnings)
        console.print(Panel(body, title="Warnings", border_style=STYLE_CAUTION))
    else:
        console.print(Text("No warnings.", style=STYLE_MUTED))
