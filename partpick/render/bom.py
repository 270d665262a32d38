"""The bill of materials in the terminal, and the line texts every BOM format shares.

Everything a person reads about a BOM is phrased here or in
:mod:`partpick.render.bom_report` (Markdown, CSV, JSON), from the data in
:class:`partpick.bom.Bom`; the derating notes are built from each check's figures.
"""

from __future__ import annotations

from rich.console import Console, Group
from rich.panel import Panel
from rich.table import Table
from rich.text import Text

from partpick.bom import Bom, BomLine
from partpick.render.console import (
    STYLE_CAUTION,
    STYLE_FAIL,
    STYLE_HEADING,
    STYLE_MUTED,
    STYLE_PASS,
    STYLE_UNVERIFIED,
)
from partpick.render.pick import check_sentence
from partpick.screening.checks import Check
from partpick.units import format_eng

STATUS_STYLES = {"passed": STYLE_PASS, "unverified": STYLE_UNVERIFIED, "no-part": STYLE_FAIL}
STATUS_WORDS = {"passed": "passed", "unverified": "UNVERIFIED", "no-part": "NO PART PASSES"}
LINE_COLUMNS = (
    "ref",
    "role",
    "qty",
    "manufacturer",
    "mpn",
    "value",
    "key ratings",
    "unit price",
    "extended",
    "status",
)
"""Columns of a BOM line, in the terminal and in the Markdown report alike."""


def eng(value: float | None, unit: str) -> str:
    return format_eng(value, unit)


def percent(value: float | None, decimals: int = 0) -> str:
    return "—" if value is None else f"{value * 100:.{decimals}f} %"


def check_note(check: Check, profile_name: str, count: int = 1) -> str:
    """Return the derating note of ``check``: the pick report's sentence plus the policy.

    For a diode's reverse voltage, e.g. "reverse-voltage: VRRM 60 V vs 36.1 V stress:
    60% use, limit 80% (standard profile)".
    """
    verdict = "" if check.status == "pass" else f" [{check.status.upper()}]"
    return f"{check_sentence(check, count)} ({profile_name} profile){verdict}"


def line_notes(line: BomLine, profile_name: str) -> list[str]:
    """Return the derating notes of a line: one per check, then the part's own notes."""
    if line.choice is None:
        return [
            f"no part passes; closest: {o.mpn} fails "
            + ", ".join(check_note(c, profile_name) for c in o.failing)
            for o in line.closest_failures
        ]
    notes = [check_note(c, profile_name, line.qty) for c in line.choice.checks]
    notes += list(line.choice.notes)
    if line.status == "unverified":
        notes.append(f"UNVERIFIED: missing {', '.join(line.choice.missing)}")
    return notes


_VALUE_FIELDS: dict[str, tuple[tuple[str, str], ...]] = {
    "inductor": (("inductance_h", "H"),),
    "input-cap": (("capacitance_f", "F"), ("voltage_v", "V")),
    "output-cap": (("capacitance_f", "F"), ("voltage_v", "V")),
    "diode": (("vrrm_v", "V"), ("if_avg_a", "A")),
    "switch": (("vds_v", "V"), ("rds_on_ohm", "ohm")),
}
_RATING_FIELDS: dict[str, tuple[tuple[str, str, str], ...]] = {
    "inductor": (("Isat", "isat_a", "A"), ("Irms", "irms_a", "A"), ("DCR", "dcr_ohm", "ohm")),
    "input-cap": (("ESR", "esr_ohm", "ohm"), ("ripple", "ripple_a", "A")),
    "output-cap": (("ESR", "esr_ohm", "ohm"), ("ripple", "ripple_a", "A")),
    "diode": (("VF", "vf_v", "V"), ("Tj max", "tj_max_degc", "degC")),
    "switch": (("ID", "id_a", "A"), ("Qgd", "qgd_c", "C"), ("Tj max", "tj_max_degc", "degC")),
}


def line_value(line: BomLine) -> str:
    """Return the part's value with engineering prefixes, such as "15 µH" or "10 µF 50 V x7r"."""
    if line.choice is None:
        return ""
    part = line.choice.part
    text = " ".join(eng(_num(part.get(f)), u) for f, u in _VALUE_FIELDS[line.role])
    extra = part.get("dielectric") or part.get("diode_type") or ""
    return f"{text} {extra}".strip()


def line_ratings(line: BomLine) -> str:
    """Return the key ratings of the chosen part, such as "Isat 7.2 A, Irms 6 A, DCR 21 mΩ"."""
    if line.choice is None:
        return ""
    part = line.choice.part
    return ", ".join(
        f"{label} {eng(_num(part.get(f)), u)}" for label, f, u in _RATING_FIELDS[line.role]
    )


def _num(value: object) -> float | None:
    return None if value is None else float(value)


def price(value: float | None) -> str:
    return "—" if value is None else f"{value:.2f}"


def line_header(line: BomLine) -> list[str]:
    choice = line.choice
    return [
        line.designator,
        line.role,
        str(line.qty),
        choice.manufacturer if choice else "",
        choice.mpn if choice else "",
        line_value(line),
        line_ratings(line),
        price(choice.unit_price if choice else None),
        price(line.extended_price),
    ]


# ---------------------------------------------------------------------------------- terminal


def render_bom_table(bom: Bom, console: Console) -> None:
    """Print the BOM to ``console``: spec, lines with notes, losses, totals and cautions."""
    console.print(_spec_panel(bom))
    console.print(_lines_table(bom))
    console.print(_notes_table(bom))
    console.print(_summary_table(bom))
    _render_verification(bom, console)
    console.print(_cautions_panel(bom))


def _spec_panel(bom: Bom) -> Panel:
    spec = bom.spec
    lines = [
        f"{spec.name or 'boost stage'}: {spec.vin_min_v:g}–{spec.vin_max_v:g} V in, "
        f"{spec.vout_v:g} V / {eng(spec.iout_a, 'A')} out at {eng(spec.fsw_hz, 'Hz')}, "
        f"ambient up to {spec.ambient_max_degc:g} °C",
        f"profile: {bom.profile.name}; ranked by {bom.rank}; efficiency used for the currents: "
        f"{percent(spec.efficiency, 1)} after {len(bom.rounds)} round(s)",
    ]
    for r in bom.rounds:
        lines.append(
            f"  round {r.number}: currents at {r.efficiency_used:.3f} → estimated "
            f"{r.efficiency_estimated:.3f} ({sum(r.losses_w.values()):.3f} W lost)"
        )
    return Panel("\n".join(lines), title="bill of materials", title_align="left")


def _lines_table(bom: Bom) -> Table:
    table = Table(title="parts", title_justify="left", show_lines=False)
    for name in LINE_COLUMNS:
        table.add_column(
            name,
            justify="right" if name in ("qty", "unit price", "extended") else "left",
            no_wrap=name in ("ref", "mpn", "status", "qty"),
        )
    for line in bom.lines:
        status = Text(STATUS_WORDS[line.status], style=STATUS_STYLES[line.status])
        table.add_row(*line_header(line), status)
        for alt in line.alternates:
            table.add_row(
                "",
                "  alternate",
                str(alt.count),
                alt.manufacturer,
                alt.mpn,
                "",
                "",
                price(alt.unit_price),
                price(alt.cost),
                "",
                style=STYLE_MUTED,
            )
    return table


def _notes_table(bom: Bom) -> Table:
    table = Table(title="derating notes", title_justify="left", show_header=False)
    table.add_column("ref", style=STYLE_HEADING)
    table.add_column("note")
    for line in bom.lines:
        for i, note in enumerate(line_notes(line, bom.profile.name)):
            style = STYLE_FAIL if "[FAIL]" in note or line.status == "no-part" else None
            table.add_row(line.designator if i == 0 else "", Text(note, style=style))
    return table


def _summary_table(bom: Bom) -> Table:
    table = Table(title="losses and totals", title_justify="left", show_header=False)
    table.add_column("item")
    table.add_column("value", justify="right")
    for role, loss in bom.losses_w.items():
        table.add_row(f"loss, {role}", eng(loss, "W"))
    table.add_row("loss, total", eng(bom.total_loss_w, "W"))
    table.add_row("efficiency (estimate)", percent(bom.efficiency, 1))
    for note in bom.loss_notes:
        table.add_row(Text(note, style=STYLE_UNVERIFIED), "")
    if bom.ripple is not None:
        r = bom.ripple
        table.add_row("inductor ripple at nominal L", eng(r.il_ripple_nominal_a, "A"))
        table.add_row(
            f"inductor ripple at minimum L ({eng(r.inductance_min_h, 'H')})",
            eng(r.il_ripple_min_l_a, "A"),
        )
        table.add_row(f"output ripple with {r.output_count} part(s)", eng(r.vout_ripple_v, "V"))
        table.add_row("full load in CCM with this inductor", "yes" if r.ccm_full_load else "NO")
    table.add_row("total cost", price(bom.total_cost))
    table.add_row("profile", bom.profile.name)
    return table


def _cautions_panel(bom: Bom) -> Panel:
    body = Group(*[Text(f"• {c.text}") for c in bom.cautions])
    return Panel(body, title="cautions", title_align="left", border_style=STYLE_CAUTION)


def _render_verification(bom: Bom, console: Console) -> None:
    if bom.verification is None:
        if bom.verification_note:
            console.print(Text(bom.verification_note, style=STYLE_UNVERIFIED))
        return
    from partpick.render.verify import points_table, warning_sentence

    result = bom.verification
    console.print(
        Text("verification: exact steady state of the chosen set, regulated", style=STYLE_HEADING)
    )
    console.print(points_table(result))
    for warning in result.warnings:
        console.print(Text(f"• {warning_sentence(warning)}", style=STYLE_UNVERIFIED))
