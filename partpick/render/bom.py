"""The bill of materials in the terminal, and the line texts every BOM format shares.

Everything a person reads about a BOM is phrased here or in
:mod:`partpick.render.bom_report` (Markdown, CSV, JSON), from the data in
:class:`partpick.bom.Bom`; the derating notes are built from each check's figures.
"""

from __future__ import annotations

from rich import box
from rich.console import Console, Group
from rich.panel import Panel
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
from partpick.render.safe_text import Table
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
"""Columns of a BOM line in the Markdown report."""
TERMINAL_COLUMNS = ("ref / role", "qty", "status", "part", "value", "key ratings", "price")
"""Columns in the terminal, where cells stack (ref over role, mpn over maker) to save width."""
WIDE_CONSOLE = 96
"""Narrower consoles get the lines as stacked blocks instead of a table."""


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


def line_ratings(line: BomLine, separator: str = ", ") -> str:
    """Return the key ratings of the chosen part, such as "Isat 7.2 A, Irms 6 A, DCR 21 mΩ"."""
    if line.choice is None:
        return ""
    part = line.choice.part
    return separator.join(
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
    console.print(_lines_table(bom) if console.width >= WIDE_CONSOLE else _lines_list(bom))
    alternates = _alternates_table(bom)
    if alternates is not None:
        console.print(alternates)
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
    return Panel(Text("\n".join(lines)), title="bill of materials", title_align="left")


def _lines_table(bom: Bom) -> Table:
    """Return the lines; the part cell stacks mpn over manufacturer to fit a terminal."""
    table = Table(
        title="parts", title_justify="left", show_lines=True, box=box.SIMPLE_HEAD, pad_edge=False
    )
    longest_mpn = max((len(line.choice.mpn) for line in bom.lines if line.choice), default=4)
    for name in TERMINAL_COLUMNS:
        table.add_column(
            name,
            justify="right" if name in ("qty", "price") else "left",
            no_wrap=name in ("qty", "price"),
            min_width=longest_mpn if name == "part" else None,
        )
    for line in bom.lines:
        ref, role, qty, manufacturer, mpn, value, _, unit, extended = line_header(line)
        part = Text(mpn, no_wrap=True)
        part.append(f"\n{manufacturer}", style=STYLE_MUTED)
        status = Text(STATUS_WORDS[line.status], style=STATUS_STYLES[line.status])
        ratings = line_ratings(line, separator="\n")
        reference = Text(ref, style=STYLE_HEADING)
        reference.append(f"\n{role}", style=STYLE_MUTED)
        cost = unit if line.qty <= 1 else f"{unit}\n×{qty} = {extended}"
        table.add_row(reference, qty, status, part, value, ratings, cost)
    return table


def _lines_list(bom: Bom) -> Group:
    """Return the lines as short stacked blocks, for consoles too narrow for the table."""
    blocks: list[Text] = [Text("parts", style=STYLE_HEADING)]
    for line in bom.lines:
        ref, role, qty, manufacturer, mpn, value, ratings, unit, extended = line_header(line)
        block = Text(f"{ref} ", style=STYLE_HEADING)
        block.append(f"{role} ×{qty}  ")
        block.append(STATUS_WORDS[line.status], style=STATUS_STYLES[line.status])
        block.append(f"\n  {mpn}  ")
        block.append(manufacturer, style=STYLE_MUTED)
        block.append(f"\n  {value}; {ratings}\n  price {unit} each, {extended} for {qty}")
        blocks.append(block)
    return Group(*blocks)


def _alternates_table(bom: Bom) -> Table | None:
    rows = [(line.designator, alt) for line in bom.lines for alt in line.alternates]
    if not rows:
        return None
    table = Table(title="alternates (next passed parts, best first)", title_justify="left")
    for name in ("ref", "mpn", "manufacturer", "qty", "unit price", "extended"):
        table.add_column(
            name,
            justify="right" if name in ("qty", "unit price", "extended") else "left",
            no_wrap=name in ("ref", "mpn", "qty"),
        )
    for ref, alt in rows:
        table.add_row(
            ref, alt.mpn, alt.manufacturer, str(alt.count), price(alt.unit_price), price(alt.cost)
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
    from partpick.render.verify import (
        not_included_lines,
        points_table,
        render_ratings,
        warning_sentence,
    )

    result = bom.verification
    console.print(
        Text("verification: exact steady state of the chosen set, regulated", style=STYLE_HEADING)
    )
    console.print(points_table(result))
    for line in not_included_lines(result.points):
        console.print(Text(line, style=STYLE_UNVERIFIED))
    render_ratings(result, console)
    for warning in result.warnings:
        console.print(Text(f"• {warning_sentence(warning)}", style=STYLE_UNVERIFIED))
