"""One part's every check, or several parts side by side: ``partpick pick --explain``.

With one ``--explain MPN`` each check gets its sentence; with several, the table has one row
per rule and one column per part, so two candidates can be compared check by check.
"""

from __future__ import annotations

from rich import box
from rich.console import Console
from rich.text import Text

from partpick.render.console import (
    STYLE_FAIL,
    STYLE_HEADING,
    STYLE_MUTED,
    STYLE_PASS,
    STYLE_UNVERIFIED,
)
from partpick.render.pick import (
    DERIVED,
    _check_json,
    _json_number,
    _pct,
    _q,
    check_sentence,
    context_lines,
    operating_point_json,
    operating_point_table,
)
from partpick.render.safe_text import Table
from partpick.render.status import check_status_word

STATUS_STYLES = {"pass": STYLE_PASS, "fail": STYLE_FAIL, "unverified": STYLE_UNVERIFIED}
OUTCOME_STYLES = {"passed": STYLE_PASS, "failed": STYLE_FAIL}


def explain_json(explanation) -> dict[str, object]:
    """Return one part's outcome with every check in full."""
    o = explanation.outcome
    return {
        "role": explanation.role,
        "profile": explanation.profile.name,
        "mpn": o.mpn,
        "manufacturer": o.manufacturer,
        "status": o.status,
        "count": o.count,
        "loss_w": _json_number(o.loss_w),
        "unit_price": _json_number(o.unit_price),
        "cost": _json_number(o.cost),
        "missing": list(o.missing),
        "notes": list(o.notes),
        "checks": [
            {
                **_check_json(c),
                "rating": _json_number(c.rating),
                "derating": _json_number(c.derating),
                "unit": c.unit,
                "status": check_status_word(c.status),
                "missing": list(c.missing),
                "fixes": [f.to_dict() for f in c.fixes],
                "message": check_sentence(c, o.count),
            }
            for c in o.checks
        ],
        "not_checked": [
            {
                "rule": u.rule,
                "missing": list(u.missing),
                "reason": u.reason,
                "message": unchecked_sentence(u),
            }
            for u in getattr(explanation, "unchecked", ())
        ],
        "operating_point": operating_point_json(explanation.operating_point),
        "derived": {
            key: _json_number(o.part[key])
            for key, _label, _unit in DERIVED
            if isinstance(o.part.get(key), float)
        },
    }


def explanations_json(explanations) -> object:
    """Return one explanation as its object, several as a list of them."""
    documents = [explain_json(e) for e in explanations]
    return documents[0] if len(documents) == 1 else documents


def render_explanations(explanations, console: Console) -> None:
    """Print one part's checks in full, or several parts' checks side by side."""
    if len(explanations) == 1:
        render_explain(explanations[0], console)
    else:
        render_side_by_side(explanations, console)


def render_explain(explanation, console: Console) -> None:
    """Print every check of one part, with its sentence."""
    o = explanation.outcome
    style = {"passed": STYLE_PASS, "failed": STYLE_FAIL}.get(o.status, STYLE_UNVERIFIED)
    console.print(
        Text(
            f"{o.mpn} ({o.manufacturer}) as {explanation.role}: {o.status}, "
            f"{o.count} in parallel; profile {explanation.profile.name}",
            style=style,
        )
    )
    table = Table(header_style=STYLE_HEADING)
    for column in ("rule", "status", "finding"):
        table.add_column(column)
    for c in o.checks:
        table.add_row(
            c.rule,
            Text(check_status_word(c.status), style=STATUS_STYLES[c.status]),
            check_sentence(c, o.count),
        )
    for u in getattr(explanation, "unchecked", ()):
        table.add_row(u.rule, Text("not checked", style=STYLE_MUTED), unchecked_sentence(u))
    console.print(table)
    extra = [f"loss {_q(o.loss_w, 'W')}", f"cost {o.cost:.2f}" if o.cost is not None else ""]
    console.print(Text(", ".join(x for x in extra if x), style=STYLE_MUTED))
    for key, label, unit in DERIVED:
        value = o.part.get(key)
        if isinstance(value, float):
            shown = _pct(value) if unit == "fraction" else _q(value, unit)
            console.print(Text(f"{label}: {shown}", style=STYLE_MUTED))
    for note in o.notes:
        console.print(Text(f"note: {note}", style=STYLE_MUTED))
    if o.missing:
        console.print(Text(f"missing: {', '.join(o.missing)}", style=STYLE_UNVERIFIED))
    console.print(operating_point_table(explanation.operating_point))


def render_side_by_side(explanations, console: Console) -> None:
    """Print one row per rule and one column per part: status word, then the finding."""
    first = explanations[0]
    console.print(
        Text(
            f"{len(explanations)} parts as {first.role}; profile {first.profile.name}",
            style=STYLE_HEADING,
        )
    )
    table = Table(show_lines=True, box=box.SIMPLE_HEAD, header_style=STYLE_HEADING)
    table.add_column("check", no_wrap=True)
    outcomes = [e.outcome for e in explanations]
    for o in outcomes:
        table.add_column(f"{o.mpn}\n{o.manufacturer}")
    table.add_row(
        "result",
        *(Text(f"{o.status}, {o.count} in parallel", style=OUTCOME_STYLES.get(o.status,
          STYLE_UNVERIFIED)) for o in outcomes),
    )  # fmt: skip
    table.add_row("loss, cost", *(f"{_q(o.loss_w, 'W')}, {_cost(o.cost)}" for o in outcomes))
    for rule in dict.fromkeys(c.rule for o in outcomes for c in o.checks):
        table.add_row(rule, *(_cell(o, rule) for o in outcomes))
    console.print(table)
    for line in context_lines(first.operating_point, first.profile, first.role):
        console.print(Text(line, style=STYLE_MUTED))


def unchecked_sentence(unchecked) -> str:
    """Return why a rule of the role made no check of the part."""
    if unchecked.missing:
        return f"{unchecked.rule}: not checked, no {', no '.join(unchecked.missing)} given"
    if unchecked.reason == "not made for this spec":
        return f"{unchecked.rule}: not made; the spec does not ask for it"
    return f"{unchecked.rule}: does not apply to this part"


def _cost(cost: float | None) -> str:
    return "—" if cost is None else f"{cost:.2f}"


def _cell(outcome, rule: str) -> Text:
    """Return the status word and the finding (without the rule name) of one part's check."""
    check = next((c for c in outcome.checks if c.rule == rule), None)
    if check is None:
        return Text("not checked", style=STYLE_MUTED)
    finding = check_sentence(check, outcome.count).removeprefix(f"{rule}: ")
    cell = Text(check_status_word(check.status), style=STATUS_STYLES[check.status])
    return cell.append(f"\n{finding}", style=None)
