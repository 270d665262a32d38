"""The bill of materials in the terminal, and the line texts every BOM format shares.

Everything a person reads about a BOM is phrased here or in
:mod:`partpick.render.bom_report` (Markdown, CSV, JSON), from the data in
:class:`partpick.bom.Bom`; the derating notes are built from each check's figures.
"""

from __future__ import annotations

from rich.console import Console

from partpick.bom import Bom, BomLine
from partpick.render.console import STYLE_FAIL, STYLE_PASS, STYLE_UNVERIFIED
from partpick.render.pick import check_sentence
from partpick.render.requirements import requirements_line
from partpick.render.status import NO_PART, PASSED, UNVERIFIED, check_status_word
from partpick.screening.checks import Check, tightest_check
from partpick.units import format_eng

STATUS_STYLES = {PASSED: STYLE_PASS, UNVERIFIED: STYLE_UNVERIFIED, NO_PART: STYLE_FAIL}
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


def check_note(check: Check, count: int = 1) -> str:
    """Return the derating note of ``check``: the pick report's sentence, and its status
    where it did not pass. The profile is named once per BOM, above the notes."""
    verdict = "" if check.status == "pass" else f" [{check_status_word(check.status)}]"
    return f"{check_sentence(check, count)}{verdict}"


def line_notes(line: BomLine, everything: bool = True) -> list[str]:
    """Return the derating notes of a line: its checks, then the part's own notes.

    With ``everything`` False a chosen part shows only the check closest to its limit and the
    checks that did not pass; an empty role always says what came closest and what it needs.
    """
    if line.choice is None:
        return empty_role_notes(line)
    checks = line.choice.checks
    if not everything:
        tight = tightest_check(checks)
        checks = tuple(c for c in checks if c is tight or c.status != "pass")
    notes = [check_note(c, line.qty) for c in checks]
    notes += list(line.choice.notes)
    if line.status == UNVERIFIED:
        notes.append(f"unverified: missing {', '.join(line.choice.missing)}")
        if line.requirements:  # no part passed: say what one that does would need
            notes.append(f"a part would need: {requirements_line(line.requirements)}")
    return notes


def empty_role_notes(line: BomLine) -> list[str]:
    """Return what came closest for a role without a part (once), and what a part needs."""
    notes = []
    if line.closest_failures:
        listed = ", ".join(
            f"{o.mpn} (fails {', '.join(c.rule for c in o.failing)})" for o in line.closest_failures
        )
        notes.append(f"no part passes; closest: {listed}")
        first = line.closest_failures[0]
        notes += [f"{first.mpn}: {check_sentence(c, first.count)}" for c in first.failing]
    else:
        notes.append("no part of this kind in the catalog")
    if line.requirements:
        notes.append(f"a part would need: {requirements_line(line.requirements)}")
    return notes


def efficiency_text(bom: Bom) -> str:
    """Return the BOM's efficiency, "≤ 94.1 % (upper bound)" where a loss term is missing."""
    if bom.efficiency_is_upper_bound:
        return f"≤ {percent(bom.efficiency, 1)} (upper bound)"
    return percent(bom.efficiency, 1)


def recheck_line(bom: Bom) -> str | None:
    """Return one line on the recheck at the chosen inductor and diode, or None without one."""
    r = bom.recheck
    if r is None:
        return None
    vf_from = "the chosen diode's" if r.diode_vf_from == "diode" else "the spec's"
    changed = "; ".join(f"{role} {old or '—'} → {new or 'no part'}" for role, old, new in r.changed)
    return (
        f"one peak: capacitors, diode and switch rechecked at {r.inductor_mpn}'s "
        f"{eng(r.inductance_min_h, 'H')} (its L·(1 − tol)): peak {eng(r.il_peak_a, 'A')} (design "
        f"{eng(r.design_il_peak_a, 'A')}), ripple {eng(r.il_ripple_a, 'A')}; switch "
        f"{eng(r.vsw_v, 'V')} with {vf_from} VF {eng(r.diode_vf_v, 'V')} (design "
        f"{eng(r.design_vsw_v, 'V')}); " + (f"changed: {changed}" if changed else "no change")
    )


def totals_status(bom: Bom) -> str | None:
    """Return "incomplete: n roles without a part (…)", or None for a complete BOM."""
    missing = bom.roles_without_part
    if not missing:
        return None
    noun = "role" if len(missing) == 1 else "roles"
    return f"incomplete: {len(missing)} {noun} without a part ({', '.join(missing)})"


def efficiency_sentence(bom: Bom) -> str:
    """Return how the currents were computed and, for a complete set, what the parts give."""
    used = f"Currents computed at {percent(bom.spec.efficiency, 1)} efficiency"
    if not bom.complete:
        return f"{used}; no efficiency estimate for an incomplete set."
    rounds = len(bom.rounds)
    return (
        f"{used}; the chosen parts' losses give an estimated {efficiency_text(bom)} "
        f"after {rounds} round{'s' if rounds > 1 else ''}."
    )


def round_sentence(r) -> str:
    """Return one loss round as a sentence, for --verbose."""
    return (
        f"round {r.number}: currents computed at {percent(r.efficiency_used, 1)} efficiency; "
        f"the chosen parts lose {eng(sum(r.losses_w.values()), 'W')}, an estimated "
        f"{percent(r.efficiency_estimated, 1)}"
    )


def money(value: float | None, currency: str = "") -> str:
    """Return a price with two decimals and the currency, if one was given."""
    text = price(value)
    return f"{text} {currency}" if currency and value is not None else text


def cost_sentence(bom: Bom) -> str:
    """Return the cost of one board and of the build quantity, or why there is none."""
    status = totals_status(bom)
    if status is not None:
        return status
    currency = bom.spec.currency
    one = bom.total_cost_for(1)
    if one is None:
        return "total cost unknown: a chosen part has no price"
    text = f"total cost {money(one, currency)} per board"
    if bom.build_qty > 1:
        text += f", {money(bom.total_cost_for(bom.build_qty), currency)} for {bom.build_qty}"
    return text


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


def line_header(line: BomLine, build_qty: int = 1) -> list[str]:
    """Return the text cells of a line (qty per board; extended price for ``build_qty``)."""
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
        price(line.extended_price_for(build_qty)),
    ]


def render_bom_table(bom: Bom, console: Console, detail: str = "normal") -> None:
    """Print the BOM to ``console`` (see :func:`partpick.render.bom_terminal.render_bom_table`)."""
    from partpick.render.bom_terminal import render_bom_table as render

    render(bom, console, detail)
