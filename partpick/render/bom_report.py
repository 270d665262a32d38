"""The bill of materials as a Markdown design-review report, a CSV export and a JSON document."""

from __future__ import annotations

import dataclasses

from partpick.bom import Bom
from partpick.design.topologies.base import GROUPS
from partpick.render.bom import (
    LINE_COLUMNS,
    cost_sentence,
    efficiency_sentence,
    efficiency_text,
    eng,
    line_header,
    line_notes,
    line_ratings,
    line_value,
    percent,
    recheck_line,
    round_sentence,
    totals_status,
)
from partpick.render.exports import csv_text, json_text, markdown_table
from partpick.render.requirements import requirements_line
from partpick.render.safe_text import markdown_text
from partpick.render.status import check_status_word
from partpick.render.stress import GROUP_TITLES, format_figure_value
from partpick.screening.checks import Outcome

CSV_HEADER = (
    "designator",
    "role",
    "qty",
    "manufacturer",
    "mpn",
    "description",
    "package",
    "value",
    "key_ratings",
    "unit_price",
    "currency",
    "extended_price",
    "stock",
    "lifecycle",
    "status",
    "notes",
)
"""The purchasing columns; with a build quantity, ``order_qty`` follows ``qty``."""


def csv_header(bom: Bom) -> tuple[str, ...]:
    """Return the CSV columns: :data:`CSV_HEADER`, plus ``order_qty`` for more than 1 board."""
    if bom.build_qty <= 1:
        return CSV_HEADER
    at = CSV_HEADER.index("qty") + 1
    return CSV_HEADER[:at] + ("order_qty",) + CSV_HEADER[at:]


def bom_csv(bom: Bom) -> str:
    """Return the BOM as spreadsheet-safe CSV for purchasing: one row per line, no totals.

    ``qty`` is per board; ``extended_price`` is for the order (``order_qty`` = qty × build
    quantity). Totals belong in the table, Markdown and JSON, not in a sheet that gets summed.
    """
    header = csv_header(bom)
    rows = []
    for line in bom.lines:
        choice, buy = line.choice, line.purchasing
        cells = {
            "designator": line.designator,
            "role": line.role,
            "qty": line.qty,
            "order_qty": line.order_qty(bom.build_qty),
            "manufacturer": choice.manufacturer if choice else "",
            "mpn": choice.mpn if choice else "",
            "description": buy.get("description") or "",
            "package": buy.get("package") or "",
            "value": line_value(line),
            "key_ratings": line_ratings(line),
            "unit_price": choice.unit_price if choice else None,
            "currency": bom.spec.currency,
            "extended_price": line.extended_price_for(bom.build_qty),
            "stock": buy.get("stock"),
            "lifecycle": buy.get("lifecycle") or "",
            "status": line.status,
            "notes": "; ".join(line_notes(line)),
        }
        rows.append([cells[name] for name in header])
    return csv_text(header, rows)


def _check_json(check) -> dict:
    """Return a check's data with its status in the one set of status words."""
    return {**dataclasses.asdict(check), "status": check_status_word(check.status)}


def _outcome_json(outcome: Outcome) -> dict:
    return {
        "mpn": outcome.mpn,
        "manufacturer": outcome.manufacturer,
        "count": outcome.count,
        "loss_w": outcome.loss_w,
        "unit_price": outcome.unit_price,
    }


def bom_document(bom: Bom) -> dict:
    """Return the BOM as the JSON document (SI units); ``partpick verify --bom`` reads it."""
    lines = []
    for line in bom.lines:
        choice = line.choice
        lines.append(
            {
                "role": line.role,
                "designator": line.designator,
                "qty": line.qty,
                "order_qty": line.order_qty(bom.build_qty),
                "mpn": choice.mpn if choice else None,
                "manufacturer": choice.manufacturer if choice else None,
                **{
                    name: line.purchasing.get(name)
                    for name in ("description", "package", "stock", "lifecycle")
                },
                "unit_price": choice.unit_price if choice else None,
                "extended_price": line.extended_price_for(bom.build_qty),
                "value": line_value(line),
                "key_ratings": line_ratings(line),
                "status": line.status,
                "notes": line_notes(line),
                "requirements": [r.to_dict() for r in line.requirements],
                "requirements_text": requirements_line(line.requirements),
                "checks": [_check_json(c) for c in choice.checks] if choice else [],
                "part": dict(choice.part) if choice else None,
                "alternates": [_outcome_json(o) for o in line.alternates],
                "closest_failures": [
                    {**_outcome_json(o), "failing": [c.rule for c in o.failing]}
                    for o in line.closest_failures
                ],
            }
        )
    document = {
        "spec": bom.spec.to_dict(),
        "stress": bom.envelope.to_dict(),
        "profile": bom.profile.name,
        "profile_figures": dict(bom.profile.figures),
        "rank": bom.rank,
        "lines": lines,
        "losses_w": dict(bom.losses_w),
        "total_loss_w": bom.total_loss_w,
        "efficiency": bom.efficiency if bom.complete else None,
        "efficiency_is_upper_bound": bom.efficiency_is_upper_bound,
        "not_included": [gap.to_dict() for gap in bom.not_included],
        "efficiency_used": bom.spec.efficiency,
        "rounds": [dataclasses.asdict(r) for r in bom.rounds],
        "ripple": dataclasses.asdict(bom.ripple) if bom.ripple else None,
        "recheck": dataclasses.asdict(bom.recheck) if bom.recheck else None,
        "build_qty": bom.build_qty,
        "currency": bom.spec.currency or None,
        "total_cost": bom.total_cost,
        "total_cost_for_build": bom.total_cost_for(bom.build_qty),
        "complete": bom.complete,
        "roles_without_part": list(bom.roles_without_part),
        "totals_status": totals_status(bom) or "complete",
        "cautions": [c.text for c in bom.cautions],
    }
    if bom.verification is not None:
        document["verification"] = bom.verification.to_dict()
    else:
        document["verification"] = {"note": bom.verification_note}
    return document


def bom_json(bom: Bom) -> str:
    """Return :func:`bom_document` as indented JSON text."""
    return json_text(bom_document(bom))


def bom_markdown(bom: Bom, plot_file: str | None = None) -> str:
    """Return a Markdown design-review report: spec, stresses, BOM, notes, losses, cautions."""
    spec = bom.spec
    out = [f"# Design review: {markdown_text(spec.name) or 'boost stage'}", ""]
    if spec.notes:
        out += [markdown_text(spec.notes), ""]
    out += ["## Specification", "", markdown_table(("key", "value"), _spec_rows(bom)), ""]
    out += [
        "## Worst-case stresses",
        "",
        markdown_table(("component", "figure", "value", "worst at"), _stress_rows(bom)),
        "",
    ]
    out += [
        "## Bill of materials",
        "",
        markdown_table(_line_columns(bom), [_line_row(line, bom) for line in bom.lines]),
        "",
    ]
    out += [f"## Derating notes ({markdown_text(bom.profile.name)} profile)", ""]
    for line in bom.lines:
        out.append(f"### {line.designator} ({line.role})")
        out.append("")
        out += [f"- {markdown_text(note)}" for note in line_notes(line)]
        out.append("")
    out += ["## Losses and efficiency", "", efficiency_sentence(bom), ""]
    out += [markdown_table(("item", "value"), _loss_rows(bom)), ""]
    out += _verification_markdown(bom, plot_file)
    out += ["## Cautions", ""] + [f"- {markdown_text(c.text)}" for c in bom.cautions] + [""]
    return "\n".join(out)


def _line_columns(bom: Bom) -> tuple[str, ...]:
    """Return the report's BOM columns; for more than one board, "order qty" follows "qty"."""
    if bom.build_qty <= 1:
        return LINE_COLUMNS
    at = LINE_COLUMNS.index("qty") + 1
    return LINE_COLUMNS[:at] + ("order qty",) + LINE_COLUMNS[at:]


def _line_row(line, bom: Bom) -> list[str]:
    cells = line_header(line, bom.build_qty) + [line.status]
    if bom.build_qty > 1:
        cells.insert(LINE_COLUMNS.index("qty") + 1, str(line.order_qty(bom.build_qty)))
    return cells


def _verification_markdown(bom: Bom, plot_file: str | None) -> list[str]:
    out = ["## Verification", ""]
    if bom.verification is None:
        return out + [markdown_text(bom.verification_note or "not verified"), ""]
    from partpick.render.verify import RULE_TITLES, not_included_lines, warning_sentence

    result = bom.verification
    out += [
        "Exact periodic steady state of the switched circuit with the chosen parts, "
        "regulated to the output voltage.",
        "",
    ]
    rows = [
        [
            eng(p.point.vin_v, "V"),
            eng(p.point.iout_a, "A"),
            p.state.mode,
            f"{p.state.duty:.3f}",
            eng(p.state.vout_ripple_v, "V"),
            eng(p.state.il_min_a, "A"),
            eng(p.state.il_max_a, "A"),
            ("≤ " if p.state.efficiency_is_upper_bound else "") + percent(p.state.efficiency, 1),
        ]
        for p in result.points
    ]
    out.append(
        markdown_table(
            ("Vin", "Iout", "mode", "duty", "ripple p-p", "iL min", "iL max", "efficiency"), rows
        )
    )
    out += [f"- {markdown_text(line)}" for line in not_included_lines(result.points)]
    out += [
        f"- rating exceeded at {eng(v.vin_v, 'V')} in, {eng(v.iout_a, 'A')} out: "
        f"{RULE_TITLES.get(v.rule, v.rule)}, {v.role} {markdown_text(v.part)}: "
        f"{v.value:.4g} vs {v.limit:.4g} {'°C' if v.unit == 'degC' else v.unit}"
        for v in result.violations
    ]
    out += [f"- {markdown_text(warning_sentence(w))}" for w in result.warnings]
    if plot_file:
        out += ["", f"![steady-state waveforms and efficiency]({plot_file})"]
    return out + [""]


def _spec_rows(bom: Bom) -> list[list[str]]:
    s = bom.spec
    return [
        ["input voltage", f"{s.vin_min_v:g} – {s.vin_max_v:g} V"],
        ["output", f"{s.vout_v:g} V at {eng(s.iout_a, 'A')}"],
        ["switching frequency", eng(s.fsw_hz, "Hz")],
        ["output ripple limit", eng(s.vout_ripple_v, "V")],
        ["ambient, maximum", f"{s.ambient_max_degc:g} °C"],
        ["efficiency used for the currents", percent(s.efficiency, 1)],
        ["boards to build", str(bom.build_qty)],
        ["derating profile", bom.profile.name],
        ["ranked by", bom.rank],
    ]


def _stress_rows(bom: Bom) -> list[list[str]]:
    """Return the envelope's figures grouped by component, in the stress report's order."""
    rows = []
    for group in GROUPS:
        for fig in bom.envelope.figures.values():
            if fig.group == group:
                worst = "" if fig.worst_vin_v is None else f"{fig.worst_vin_v:.3g} V in"
                rows.append(
                    [GROUP_TITLES.get(group, group), fig.label, format_figure_value(fig), worst]
                )
    return rows


def _loss_rows(bom: Bom) -> list[list[str]]:
    status = totals_status(bom)
    rows = [["totals", status]] if status is not None else []
    rows += [[f"loss, {role}", eng(v, "W")] for role, v in bom.losses_w.items()]
    rows.append(["loss, total", eng(bom.total_loss_w, "W")])
    if status is None:
        rows.append(["efficiency (estimate)", efficiency_text(bom)])
    rows += [["note", markdown_text(note)] for note in bom.loss_notes]
    rows += [[f"round {r.number}", round_sentence(r).partition(": ")[2]] for r in bom.rounds]
    if status is None:
        rows.append(["total cost", cost_sentence(bom).removeprefix("total cost ")])
    if bom.ripple is not None:
        r = bom.ripple
        rows += [
            ["inductor ripple, nominal L", eng(r.il_ripple_nominal_a, "A")],
            ["inductor ripple, minimum L", eng(r.il_ripple_min_l_a, "A")],
            ["output ripple", eng(r.vout_ripple_v, "V")],
            ["full load in CCM", "yes" if r.ccm_full_load else "no"],
        ]
    recheck = recheck_line(bom)
    if recheck is not None:
        rows.append(["recheck", markdown_text(recheck.removeprefix("one peak: "))])
    return rows
