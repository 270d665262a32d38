"""The bill of materials on a terminal: short by default, everything with ``--verbose``.

The sentences are shared with the Markdown, CSV and JSON forms (:mod:`partpick.render.bom`).
"""

from __future__ import annotations

from rich import box
from rich.console import Console, Group
from rich.panel import Panel
from rich.text import Text

from partpick.bom import Bom, BomLine
from partpick.render.bom import (
    NO_PART,
    STATUS_STYLES,
    TERMINAL_COLUMNS,
    WIDE_CONSOLE,
    cost_sentence,
    efficiency_sentence,
    efficiency_text,
    eng,
    line_header,
    line_notes,
    line_ratings,
    price,
    recheck_line,
    round_sentence,
    totals_status,
)
from partpick.render.console import (
    STYLE_CAUTION,
    STYLE_FAIL,
    STYLE_HEADING,
    STYLE_MUTED,
    STYLE_UNVERIFIED,
)
from partpick.render.safe_text import Table


def render_bom_table(bom: Bom, console: Console, detail: str = "normal") -> None:
    """Print the BOM to ``console``: spec, lines, notes, losses, totals and cautions.

    ``detail`` "normal" keeps each line's notes to the check closest to its limit and any
    check that did not pass; "verbose" prints every check, the rounds and the full tables;
    "brief" also leaves out the alternates.
    """
    verbose = detail == "verbose"
    for text in _heading_lines(bom, verbose):
        console.print(text)
    wide = console.width >= WIDE_CONSOLE
    console.print(_lines_table(bom) if wide else _lines_list(bom))
    if detail != "brief":
        alternates = _alternates_table(bom) if verbose else _alternates_lines(bom)
        if alternates is not None:
            console.print(alternates)
    console.print(_notes_table(bom, verbose))
    console.print(_summary_table(bom) if verbose else _summary_lines(bom))
    _render_verification(bom, console, verbose)
    console.print(_cautions_panel(bom) if verbose else _cautions_lines(bom))


def _heading_lines(bom: Bom, verbose: bool) -> list[Text]:
    spec = bom.spec
    lines = [
        Text(
            f"bill of materials: {spec.name or 'boost stage'} ({bom.profile.name} profile, "
            f"ranked by {bom.rank})",
            style=STYLE_HEADING,
        ),
        Text(
            f"{spec.vin_min_v:g}–{spec.vin_max_v:g} V in, {spec.vout_v:g} V at "
            f"{eng(spec.iout_a, 'A')} out, {eng(spec.fsw_hz, 'Hz')}, ambient up to "
            f"{spec.ambient_max_degc:g} °C" + (f"; {bom.build_qty} boards" if bom.build_qty > 1
                                               else ""),
        ),
        Text(efficiency_sentence(bom), style=STYLE_MUTED),
    ]  # fmt: skip
    if verbose:
        lines += [Text(f"  {round_sentence(r)}", style=STYLE_MUTED) for r in bom.rounds]
    return lines


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
        status = Text(line.status, style=STATUS_STYLES[line.status])
        ratings = line_ratings(line, separator="\n")
        reference = Text(ref, style=STYLE_HEADING)
        reference.append(f"\n{role}", style=STYLE_MUTED)
        table.add_row(reference, qty, status, part, value, ratings, _price_cell(line, unit, bom))
    return table


def _price_cell(line: BomLine, unit: str, bom: Bom) -> str:
    order = line.order_qty(bom.build_qty)
    if order <= 1 or line.choice is None:
        return unit
    return f"{unit}\n×{order} = {price(line.extended_price_for(bom.build_qty))}"


def _lines_list(bom: Bom) -> Group:
    """Return the lines as two-row blocks, for consoles too narrow for the table."""
    blocks: list[Text] = [Text("parts", style=STYLE_HEADING)]
    for line in bom.lines:
        ref, role, qty, manufacturer, mpn, value, ratings, unit, _ = line_header(line)
        block = Text(f"{ref:<5}", style=STYLE_HEADING)
        block.append(f"{role} ×{qty}  ")
        block.append(line.status, style=STATUS_STYLES[line.status])
        if line.choice is not None:
            block.append(f"  {mpn} ")
            block.append(f"({manufacturer})", style=STYLE_MUTED)
            order = line.order_qty(bom.build_qty)
            total = price(line.extended_price_for(bom.build_qty))
            cost = f"{unit} each" + (f", {total} for {order}" if order > 1 else "")
            block.append(f"\n     {value}; {ratings}; {cost}")
        blocks.append(block)
    return Group(*blocks)


def _alternates_lines(bom: Bom) -> Text | None:
    rows = [line for line in bom.lines if line.alternates]
    if not rows:
        return None
    text = Text("alternates (next passed parts, best first)", style=STYLE_HEADING)
    for line in rows:
        listed = ", ".join(f"{alt.mpn} ×{alt.count} {price(alt.cost)}" for alt in line.alternates)
        text.append(f"\n{line.designator:<5}{listed}", style=None)
    return text


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


def _notes_table(bom: Bom, verbose: bool) -> Table:
    shown = "every check" if verbose else "the check closest to its limit; --verbose for all"
    table = Table(
        title=f"derating notes ({shown})",
        title_justify="left", show_header=False, box=None,
        pad_edge=False,
    )  # fmt: skip
    table.add_column("ref", style=STYLE_HEADING, no_wrap=True)
    table.add_column("note")
    for line in bom.lines:
        for i, note in enumerate(line_notes(line, everything=verbose)):
            failed = "[failed]" in note or line.status == NO_PART
            table.add_row(line.designator if i == 0 else "", Text(note, style=STYLE_FAIL if failed
                                                                  else None))  # fmt: skip
    return table


def loss_line(bom: Bom) -> str:
    """Return the losses per role and their total in one line."""
    each = ", ".join(f"{role} {eng(loss, 'W')}" for role, loss in bom.losses_w.items())
    return f"losses: {each}; total {eng(bom.total_loss_w, 'W')}"


def ripple_line(bom: Bom) -> str | None:
    """Return the ripple of the chosen set in one line, or None without an inductor."""
    r = bom.ripple
    if r is None:
        return None
    output = "" if r.vout_ripple_v is None else (
        f"; output {eng(r.vout_ripple_v, 'V')} with {r.output_count} part(s)")  # fmt: skip
    ccm = "in CCM" if r.ccm_full_load else "NOT in CCM"
    return (
        f"ripple: inductor {eng(r.il_ripple_nominal_a, 'A')} at nominal L, "
        f"{eng(r.il_ripple_min_l_a, 'A')} at minimum L ({eng(r.inductance_min_h, 'H')})"
        f"{output}; full load {ccm}"
    )


def _summary_lines(bom: Bom) -> Text:
    text = Text("losses and totals", style=STYLE_HEADING)
    status = totals_status(bom)
    if status is None:
        text.append(f"\n{loss_line(bom)}", style=None)
        text.append(f"\nefficiency (estimate) {efficiency_text(bom)}; {cost_sentence(bom)}",
                    style=None)  # fmt: skip
    else:
        text.append(f"\n{status}: no efficiency or cost for a design with empty roles",
                    style=STYLE_FAIL)  # fmt: skip
    for note in bom.loss_notes:
        text.append(f"\n{note}", style=STYLE_UNVERIFIED)
    for line in (ripple_line(bom), recheck_line(bom)):
        if line is not None:
            text.append(f"\n{line}", style=None)
    return text


def _summary_table(bom: Bom) -> Table:
    table = Table(title="losses and totals", title_justify="left", show_header=False)
    table.add_column("item")
    table.add_column("value", justify="right")
    status = totals_status(bom)
    if status is not None:
        table.add_row(Text(status, style=STYLE_FAIL), "")
    for role, loss in bom.losses_w.items():
        table.add_row(f"loss, {role}", eng(loss, "W"))
    table.add_row("loss, total", eng(bom.total_loss_w, "W"))
    if status is None:
        table.add_row("efficiency (estimate)", efficiency_text(bom))
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
    recheck = recheck_line(bom)
    if recheck is not None:
        table.add_row(recheck, "")
    if status is None:
        table.add_row("total cost", cost_sentence(bom).removeprefix("total cost "))
    table.add_row("profile", bom.profile.name)
    return table


def _cautions_lines(bom: Bom) -> Text:
    text = Text("cautions", style=STYLE_CAUTION)
    for c in bom.cautions:
        text.append(f"\n• {c.text}", style=None)
    return text


def _cautions_panel(bom: Bom) -> Panel:
    body = Group(*[Text(f"• {c.text}") for c in bom.cautions])
    return Panel(body, title="cautions", title_align="left", border_style=STYLE_CAUTION)


def _render_verification(bom: Bom, console: Console, verbose: bool = True) -> None:
    """Print the verification; the terms it leaves out only with ``verbose`` (the totals above
    already list what the estimate does not include)."""
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
    for line in not_included_lines(result.points) if verbose else ():
        console.print(Text(line, style=STYLE_UNVERIFIED))
    render_ratings(result, console)
    for warning in result.warnings:
        if warning.code == "loss-not-included" and not verbose:
            continue  # the totals above already list the terms not included
        console.print(Text(f"• {warning_sentence(warning)}", style=STYLE_UNVERIFIED))
