"""The bill of materials as a Markdown design-review report, a CSV export and a JSON document."""

from __future__ import annotations

import dataclasses

from partpick.bom import Bom
from partpick.design.topologies.base import GROUPS
from partpick.render.bom import (
    LINE_COLUMNS,
    STATUS_WORDS,
    eng,
    line_header,
    line_notes,
    line_ratings,
    line_value,
    percent,
    price,
)
from partpick.render.exports import csv_text, json_text, markdown_table
from partpick.render.safe_text import markdown_text
from partpick.render.stress import GROUP_TITLES, format_figure_value
from partpick.screening.checks import Outcome

CSV_HEADER = (
    "designator",
    "role",
    "qty",
    "manufacturer",
    "mpn",
    "value",
    "key_ratings",
    "unit_price",
    "extended_price",
    "status",
    "notes",
)


def bom_csv(bom: Bom) -> str:
    """Return the BOM as spreadsheet-safe CSV, one row per line plus a total row."""
    rows = []
    for line in bom.lines:
        choice = line.choice
        rows.append(
            [
                line.designator,
                line.role,
                line.qty,
                choice.manufacturer if choice else "",
                choice.mpn if choice else "",
                line_value(line),
                line_ratings(line),
                choice.unit_price if choice else None,
                line.extended_price,
                line.status,
                "; ".join(line_notes(line, bom.profile.name)),
            ]
        )
    rows.append(["TOTAL", "", "", "", "", "", "", None, bom.total_cost, "", ""])
    return csv_text(CSV_HEADER, rows)


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
                "mpn": choice.mpn if choice else None,
                "manufacturer": choice.manufacturer if choice else None,
                "unit_price": choice.unit_price if choice else None,
                "extended_price": line.extended_price,
                "value": line_value(line),
                "status": line.status,
                "notes": line_notes(line, bom.profile.name),
                "checks": [dataclasses.asdict(c) for c in choice.checks] if choice else [],
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
        "efficiency": bom.efficiency,
        "efficiency_used": bom.spec.efficiency,
        "rounds": [dataclasses.asdict(r) for r in bom.rounds],
        "ripple": dataclasses.asdict(bom.ripple) if bom.ripple else None,
        "total_cost": bom.total_cost,
        "complete": bom.complete,
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
        markdown_table(
            LINE_COLUMNS,
            [line_header(line) + [STATUS_WORDS[line.status]] for line in bom.lines],
        ),
        "",
    ]
    out += ["## Derating notes", ""]
    for line in bom.lines:
        out.append(f"### {line.designator} ({line.role})")
        out.append("")
        out += [f"- {markdown_text(note)}" for note in line_notes(line, bom.profile.name)]
        out.append("")
    out += ["## Losses and efficiency", "", markdown_table(("item", "value"), _loss_rows(bom)), ""]
    out += _verification_markdown(bom, plot_file)
    out += ["## Cautions", ""] + [f"- {markdown_text(c.text)}" for c in bom.cautions] + [""]
    return "\n".join(out)


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
    rows = [[f"loss, {role}", eng(v, "W")] for role, v in bom.losses_w.items()]
    rows += [
        ["loss, total", eng(bom.total_loss_w, "W")],
        ["efficiency (estimate)", percent(bom.efficiency, 1)],
        ["rounds", str(len(bom.rounds))],
        ["total cost", price(bom.total_cost)],
    ]
    if bom.ripple is not None:
        r = bom.ripple
        rows += [
            ["inductor ripple, nominal L", eng(r.il_ripple_nominal_a, "A")],
            ["inductor ripple, minimum L", eng(r.il_ripple_min_l_a, "A")],
            ["output ripple", eng(r.vout_ripple_v, "V")],
            ["full load in CCM", "yes" if r.ccm_full_load else "no"],
        ]
    return rows
