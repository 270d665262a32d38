"""Terminal view of a stress envelope: figures grouped by component, then warnings and cautions."""

from __future__ import annotations

from rich.console import Console, Group
from rich.panel import Panel
from rich.text import Text

from partpick.design.topologies.base import GROUPS, Caution, Envelope, Figure
from partpick.render.console import STYLE_CAUTION, STYLE_HEADING, STYLE_MUTED, STYLE_UNVERIFIED
from partpick.render.safe_text import Table
from partpick.units import format_eng

WIDE_CONSOLE = 96
"""Console width from which the table also shows each figure's JSON key."""

GROUP_TITLES = {
    "converter": "Converter",
    "duty": "Duty cycle",
    "inductor": "Inductor",
    "switch": "Switch",
    "diode": "Diode",
    "output-cap": "Output capacitor",
    "input-cap": "Input capacitor",
}


def format_figure_value(figure: Figure) -> str:
    """Return a figure's value as text: engineering units, plain numbers for ratios."""
    if figure.value is None:
        return "none fits" if figure.key == "l_recommended_h" else "—"
    if figure.unit == "":
        return f"{figure.value:.4g}"
    return format_eng(figure.value, figure.unit)


def spec_summary(envelope: Envelope) -> Text:
    """Return the one-line description of the spec behind an envelope."""
    spec = envelope.spec
    title = f"{spec.name}: " if spec.name else ""
    vin_range = f"{format_eng(spec.vin_min_v, 'V')}–{format_eng(spec.vin_max_v, 'V')}"
    output = f"{format_eng(spec.vout_v, 'V')} at {format_eng(spec.iout_a, 'A')}"
    line = (
        f"{title}{spec.topology} {vin_range} → {output}, "
        f"{format_eng(spec.fsw_hz, 'Hz')}, η {spec.efficiency:g}, ripple band "
        f"{spec.ripple_ratio_lo:g}–{spec.ripple_ratio_hi:g}, ambient ≤ "
        f"{format_eng(spec.ambient_max_degc, 'degC')}"
    )
    return Text(line, style=STYLE_HEADING)


def figures_table(envelope: Envelope, show_keys: bool = True) -> Table:
    """Return the table of figures under one heading row per component group.

    ``show_keys`` adds the JSON key of each figure (for wide terminals).
    """
    table = Table(show_edge=False, header_style=STYLE_HEADING, pad_edge=False)
    table.add_column("Figure")
    table.add_column("Value", justify="right", no_wrap=True)
    table.add_column("Worst at Vin", justify="right", no_wrap=True)
    if show_keys:
        table.add_column("JSON key", style=STYLE_MUTED, no_wrap=True)
    for group in GROUPS:
        members = [f for f in envelope.figures.values() if f.group == group]
        if not members:
            continue
        table.add_row(Text(GROUP_TITLES.get(group, group), style=STYLE_HEADING))
        for figure in members:
            vin = format_eng(figure.worst_vin_v, "V") if figure.worst_vin_v is not None else ""
            cells = ["  " + figure.label, format_figure_value(figure), vin]
            table.add_row(*cells, *([figure.key] if show_keys else []))
    return table


def conduction_lines(envelope: Envelope) -> Text:
    """Return the CCM/DCM verdicts as text."""
    text = Text()
    full = "CCM" if envelope.ccm else "DCM somewhere in the input range"
    text.append(f"Full load at l_min: {full}.")
    if envelope.ccm_light_load is True:
        text.append("  Lightest load: CCM.")
    elif envelope.ccm_light_load is False:
        ratio = envelope.dcm_ratio_light_load
        text.append(f"  Lightest load: DCM (M = {ratio:.4g} at the CCM duty).")
    return text


def _panel(items: tuple[Caution, ...], title: str, style: str) -> Panel:
    body = Group(*(Text(f"• {item.text}") for item in items))
    return Panel(body, title=title, title_align="left", border_style=style)


def render_stress(envelope: Envelope, console: Console) -> None:
    """Print the envelope: spec line, figures by component, CCM verdict, warnings, cautions."""
    console.print(spec_summary(envelope))
    console.print(figures_table(envelope, show_keys=console.width >= WIDE_CONSOLE))
    console.print(conduction_lines(envelope))
    if envelope.warnings:
        console.print(_panel(envelope.warnings, "Warnings", STYLE_UNVERIFIED))
    console.print(_panel(envelope.cautions, "Cautions", STYLE_CAUTION))
