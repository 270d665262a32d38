"""Views of a pick: the terminal report, the JSON object, and one part's explanation.

Every sentence about a check is made here from the Check's numbers (the core keeps failures
as data): :func:`check_sentence` gives e.g. "saturation: needs Isat ≥ 3.35 A (2.68 A peak at
10.8 V in, 80 % use); part has 3.22 A".
"""

from __future__ import annotations

import math

from rich.console import Console
from rich.text import Text

from partpick.render.console import (
    STYLE_FAIL,
    STYLE_HEADING,
    STYLE_MUTED,
    STYLE_PASS,
    STYLE_UNVERIFIED,
)
from partpick.render.requirements import fixes_text, requirements_assumptions, requirements_line
from partpick.render.safe_text import Table
from partpick.screening.checks import Check, Outcome, check_load, tightest_check
from partpick.units import format_eng

# rule -> (name of the rating, what the stress is) for "needs X ≥ …" sentences
RATING_WORDS: dict[str, tuple[str, str]] = {
    "saturation": ("Isat", "peak"),
    "rms": ("Irms", "RMS"),
    "voltage": ("rated voltage", "working"),
    "ripple-current": ("ripple rating", "RMS per part"),
    "reverse-voltage": ("VRRM", "reverse"),
    "forward-current": ("IF(AV)", "average"),
    "drain-voltage": ("VDS", "off-state"),
    "drain-current": ("ID", "peak"),
}
# the profile sections each role's rules read
ROLE_SECTIONS: dict[str, tuple[str, ...]] = {
    "inductor": ("inductor",),
    "input-cap": ("capacitor", "max_parallel"),
    "output-cap": ("capacitor", "max_parallel"),
    "diode": ("diode",),
    "switch": ("switch",),
}
# how the figures above turn into each part's own stress, said once under the operating point
ROLE_BASIS: dict[str, str] = {
    "inductor": "Peak and RMS currents are computed at each part's own minimum inductance "
    "L·(1 − tolerance), the worst over the input range.",
    "output-cap": "Each part is counted n times in parallel, the smallest n that meets ripple "
    "voltage and current; capacitance is derated to C·(1 − tolerance)·(DC-bias share at Vout)"
    "·kept fraction.",
    "input-cap": "Each part is counted n times in parallel, the smallest n that meets the ripple "
    "checks; capacitance is derated to C·(1 − tolerance)·(DC-bias share at vin_max)·kept "
    "fraction.",
}
# the part figures, derived by the rules, that --explain shows
DERIVED: tuple[tuple[str, str, str], ...] = (
    ("inductance_min_h", "minimum inductance used", "H"),
    ("il_peak_a", "peak current at that inductance", "A"),
    ("capacitance_eff_f", "effective capacitance per part (C_eff)", "F"),
    ("working_voltage_v", "DC working voltage", "V"),
    ("working_fraction_of_rating", "working voltage as a share of its rating", "fraction"),
    ("dc_bias_kept", "capacitance kept under that DC bias", "fraction"),
    ("kept_fraction_further", "further share kept (profile)", "fraction"),
    ("voltage_use", "voltage use allowed for its dielectric", "fraction"),
)
DIELECTRIC_TABLES = ("capacitor.voltage_use", "capacitor.kept_fraction")
DC_BIAS_HEAD = "capacitor.dc_bias."
STATUS_STYLES = {"pass": STYLE_PASS, "fail": STYLE_FAIL, "unverified": STYLE_UNVERIFIED}


def _q(value: float | None, unit: str) -> str:
    return format_eng(value, unit)


def _q_pair(first: float | None, second: float | None, unit: str) -> tuple[str, str]:
    """Return both values as text, with enough digits that unequal values read unequal."""
    for digits in (3, 4, 5, 6):
        a, b = format_eng(first, unit, digits), format_eng(second, unit, digits)
        if a != b or first == second:
            break
    return a, b


def _pct(value: float | None) -> str:
    """Return a fraction as whole percent with the SI space, e.g. ``"80 %"``."""
    if value is None or not math.isfinite(value):
        return "—"
    return f"{value * 100:.0f} %"


def _at(check: Check) -> str:
    return f" at {_q(check.worst_vin_v, 'V')} in" if check.worst_vin_v is not None else ""


def check_sentence(check: Check, count: int = 1) -> str:
    """Return one sentence saying what ``check`` found, from its numbers alone."""
    if check.status == "unverified":
        if check.rule == "data":
            return f"data: core figure(s) missing: {', '.join(check.missing)}"
        return f"{check.rule}: not checked, missing {', '.join(check.missing) or 'data'}"
    writer = _WRITERS.get(check.rule)
    if writer is not None:
        return writer(check, count)
    if check.rule in RATING_WORDS:
        return _use_sentence(check)
    return _limit_sentence(check)


def _use_sentence(check: Check) -> str:
    label, what = RATING_WORDS[check.rule]
    unit, use = check.unit, check.derating or 1.0
    if check.status == "fail":
        needed = check.stress / use if check.stress is not None else None
        needed_text, rating_text = _q_pair(needed, check.rating, unit)
        return (
            f"{check.rule}: needs {label} ≥ {needed_text} ({_q(check.stress, unit)} "
            f"{what}{_at(check)}, {_pct(use)} use); part has {rating_text}"
        )
    return (
        f"{check.rule}: {label} {_q(check.rating, unit)} vs {_q(check.stress, unit)} {what}"
        f"{_at(check)}: {_pct(check.utilisation)} use, limit {_pct(use)}"
    )


def _limit_sentence(check: Check) -> str:
    word = "exceeds" if check.status == "fail" else "within"
    return (
        f"{check.rule}: {_q(check.stress, check.unit)}{_at(check)} {word} the "
        f"{_q(check.limit, check.unit)} limit"
    )


def _inductance(check: Check, count: int) -> str:
    value, bound = _q_pair(check.stress, check.limit, "H")
    lower = (check.stress or 0) >= (check.limit or 0)
    if check.status == "fail":
        lower = not lower
    if lower:
        what = f"{value} at its tolerance, L·(1 − tol),"
        verdict = "is at least" if check.status == "pass" else "is below"
        return f"inductance: {what} {verdict} the design's minimum {bound}"
    verdict = "is at most" if check.status == "pass" else "is above"
    return f"inductance: {value} nominal {verdict} the design's maximum {bound}"


def _ripple_voltage(check: Check, count: int) -> str:
    parts = f"{count} part{'s' if count > 1 else ''} in parallel"
    verdict = "exceeds" if check.status == "fail" else "within"
    return (
        f"ripple-voltage: {_q(check.stress, 'V')} peak-to-peak with {parts}{_at(check)}, "
        f"{verdict} the {_q(check.limit, 'V')} allowed"
    )


def _thermal(check: Check, count: int) -> str:
    rise = f"{_pct(check.utilisation)} of the allowed rise"
    verdict = "above" if check.status == "fail" else "within"
    sentence = (
        f"thermal: estimated Tj {_q(check.stress, 'degC')}{_at(check)}, {verdict} the "
        f"{_q(check.limit, 'degC')} limit (Tjmax {_q(check.rating, 'degC')}; {rise})"
    )
    if check.fixes:
        sentence += f"; would pass with {fixes_text(check.fixes)}"
    return sentence


def _srf(check: Check, count: int) -> str:
    if check.status == "fail":
        return f"srf: needs SRF ≥ {_q(check.stress, 'Hz')}; part has {_q(check.limit, 'Hz')}"
    return f"srf: SRF {_q(check.limit, 'Hz')} ≥ {_q(check.stress, 'Hz')} needed"


def _temperature(check: Check, count: int) -> str:
    if check.status == "fail":
        return (
            f"temperature: rated to {_q(check.limit, 'degC')}, needs "
            f"{_q(check.stress, 'degC')} (ambient plus margin)"
        )
    return f"temperature: rated to {_q(check.limit, 'degC')} ≥ {_q(check.stress, 'degC')} needed"


def _recovery(check: Check, count: int) -> str:
    if check.status == "fail":
        return (
            f"recovery: a standard-recovery rectifier is limited to {_q(check.limit, 'Hz')}; "
            f"the design switches at {_q(check.stress, 'Hz')}"
        )
    return f"recovery: {_q(check.stress, 'Hz')} is within {_q(check.limit, 'Hz')}"


def _channel(check: Check, count: int) -> str:
    if check.status == "fail":
        return "channel: a p-channel part cannot be the low-side switch of a boost"
    return "channel: n-channel"


def _lifecycle(check: Check, count: int) -> str:
    return "lifecycle: obsolete" if check.status == "fail" else "lifecycle: not obsolete"


_WRITERS = {
    "inductance": _inductance,
    "ripple-voltage": _ripple_voltage,
    "thermal": _thermal,
    "srf": _srf,
    "temperature": _temperature,
    "recovery": _recovery,
    "channel": _channel,
    "lifecycle": _lifecycle,
}


MARGIN_HEADER = "closest to its limit"


def margin_text(outcome: Outcome) -> str:
    """Return the check of a part closest to its limit and the share of the limit it uses."""
    tight = tightest_check(outcome.checks)
    if tight is None:
        return "—"
    return f"{tight.rule} {_pct(check_load(tight))}"


# --- JSON ------------------------------------------------------------------------------------


def _json_number(value: float | None) -> float | None:
    if value is None:
        return None
    value = float(value)
    return value if math.isfinite(value) else None


def _check_json(check: Check) -> dict[str, object]:
    return {
        "rule": check.rule,
        "stress": _json_number(check.stress),
        "limit": _json_number(check.limit),
        "utilisation": _json_number(check.utilisation),
        "worst_vin_v": _json_number(check.worst_vin_v),
    }


def profile_json(profile) -> dict[str, object]:
    """Return the profile's name, origin and every figure (inf as null)."""
    return {
        "name": profile.name,
        "description": profile.description,
        "file": profile.file,
        "extends": profile.extends,
        "figures": {k: _json_number(v) for k, v in sorted(profile.figures.items())},
    }


def operating_point_json(rows) -> dict[str, object]:
    """Return the operating point rows as {key: {value, unit, worst_vin_v}}."""
    return {
        key: {"value": _json_number(value), "unit": unit, "worst_vin_v": _json_number(vin)}
        for key, _label, value, unit, vin in rows
    }


# --- terminal --------------------------------------------------------------------------------


DETAILS = ("brief", "normal", "verbose")


def render_pick(result, console: Console, near_misses: int = 5, detail: str = "normal") -> None:
    """Print the pick report: what was checked, the lists, and what a part would need.

    ``detail`` "brief" leaves out the operating point and policy, "normal" says them in a
    short block, "verbose" prints them in full with the basis of the role's stresses.
    """
    kind_name = result.kind or result.role
    console.print(
        Text(
            f"{result.role}: {result.total} {kind_name} part(s) checked against the "
            f"{result.profile.name} profile, ranked by {result.rank}",
            style=STYLE_HEADING,
        )
    )
    if detail == "verbose":
        console.print(operating_point_table(result.operating_point))
        if result.role in ROLE_BASIS:
            console.print(Text(ROLE_BASIS[result.role], style=STYLE_MUTED))
        console.print(profile_table(result.profile, result.role))
    elif detail == "normal":
        for line in context_lines(result.operating_point, result.profile, result.role):
            console.print(Text(line, style=STYLE_MUTED))
    counts = result.counts
    console.print(
        Text(
            f"{counts.get('passed', 0)} passed, {counts.get('unverified', 0)} unverified, "
            f"{counts.get('failed', 0)} failed"
        )
    )
    if result.passed:
        console.print(passed_table(result.passed, "Passed (best first)"))
    if result.unverified:
        console.print(unverified_table(result.unverified))
    if result.failed:
        console.print(failure_summary(result.fail_counts))
        console.print(near_miss_table(result.failed[:near_misses]))
    if not result.passed and result.requirements:
        render_requirements(result.requirements, console)
    if not result.total:
        console.print(Text(f"The catalog has no {kind_name} parts; import some first."))


def render_requirements(requirements, console: Console, lead: str = "A part would need") -> None:
    """Print the requirements as one pasteable line, then their assumptions."""
    console.print(Text(f"{lead}: ", style=STYLE_HEADING).append(requirements_line(requirements)))
    assumptions = requirements_assumptions(requirements)
    if assumptions:
        console.print(Text(f"({assumptions})", style=STYLE_MUTED))


def context_lines(rows, profile, role: str) -> list[str]:
    """Return the operating point and the role's scalar policy figures as two short lines."""
    used = [
        f"{label} {_q(value, unit)}" + (f" at {_q(vin, 'V')} in" if vin is not None else "")
        for key, label, value, unit, vin in rows
        if key not in _SPEC_KEYS
    ]
    figures = [
        f"{key.split('.', 1)[-1]} {_figure_text(value, profile.unit_of(key))}"
        for key, value in sorted(profile.figures.items())
        if key.split(".")[0] in ROLE_SECTIONS.get(role, ())
        and key.count(".") <= 1
        and not math.isinf(value)
    ]
    lines = ["design: " + design_text({key: value for key, _l, value, _u, _v in rows})]
    if used:
        lines.append("stresses used: " + "; ".join(used))
    lines.append(f"policy {profile.name}: " + ", ".join(figures) + " (--verbose for all)")
    return lines


def design_text(values: dict[str, float | None]) -> str:
    """Return the spec in one line: "6–8.4 V in, 24 V at 800 mA out, 400 kHz, 60 °C ambient"."""
    return (
        f"{values['vin_min_v']:g}–{_q(values['vin_max_v'], 'V')} in, {_q(values['vout_v'], 'V')}"
        f" at {_q(values['iout_a'], 'A')} out, {_q(values['fsw_hz'], 'Hz')}, ambient up to "
        f"{_q(values['ambient_max_degc'], 'degC')}, currents at {_pct(values['efficiency'])} "
        "efficiency"
    )


_SPEC_KEYS = ("vin_min_v", "vin_max_v", "vout_v", "iout_a", "fsw_hz", "ambient_max_degc",
              "efficiency")  # fmt: skip


def operating_point_table(rows) -> Table:
    table = Table(title="Operating point used", title_justify="left", header_style=STYLE_HEADING)
    for column in ("figure", "value", "worst at"):
        table.add_column(column)
    for _key, label, value, unit, vin in rows:
        table.add_row(label, _q(value, unit), _q(vin, "V") if vin is not None else "")
    return table


def profile_table(profile, role: str) -> Table:
    """Return the profile figures the role's rules read, so the policy is visible.

    A table by dielectric becomes one row per figure, its dielectrics grouped by value.
    """
    table = Table(
        title=f"Derating policy: {profile.name}", title_justify="left", header_style=STYLE_HEADING
    )
    table.add_column("figure", no_wrap=True)
    table.add_column("value")
    grouped: dict[str, dict[float, list[str]]] = {}
    curves: dict[str, list[tuple[int, float]]] = {}
    for key, value in sorted(profile.figures.items()):
        if key.split(".")[0] not in ROLE_SECTIONS.get(role, ()):
            continue
        if key.startswith(DC_BIAS_HEAD):
            code, _, percent = key[len(DC_BIAS_HEAD) :].partition(".")
            curves.setdefault(code, []).append((int(percent), value))
            continue
        head, _, code = key.rpartition(".")
        if head in DIELECTRIC_TABLES:
            grouped.setdefault(head, {}).setdefault(value, []).append(code)
            continue
        unit = profile.unit_of(key)
        table.add_row(key, "none" if math.isinf(value) else _figure_text(value, unit))
    for head, by_value in grouped.items():
        parts = [f"{_pct(v)}: {', '.join(codes)}" for v, codes in sorted(by_value.items())]
        note = "; others 100 %" if head.endswith("kept_fraction") else ""
        table.add_row(head, "; ".join(parts) + note)
    by_curve: dict[str, list[str]] = {}
    for code, points in curves.items():
        shown = ", ".join(f"{p} % → {_pct(v)}" for p, v in sorted(points))
        by_curve.setdefault(shown, []).append(code)
    for shown, codes in by_curve.items():
        table.add_row(f"{DC_BIAS_HEAD[:-1]} ({', '.join(codes)})", f"of rating → kept: {shown}")
    return table


def _figure_text(value: float, unit: str) -> str:
    if unit == "flag":
        return "yes" if value else "no"
    if unit == "fraction":
        return _pct(value)
    if unit == "count":
        return f"{value:g}"
    return _q(value, unit)


def passed_table(outcomes: list[Outcome], title: str) -> Table:
    table = Table(title=title, title_justify="left", header_style=STYLE_HEADING)
    table.add_column("#")
    table.add_column("mpn", no_wrap=True)
    for column in ("manufacturer", "n", "loss", "cost", MARGIN_HEADER):
        table.add_column(column)
    with_notes = any(o.notes for o in outcomes)
    if with_notes:
        table.add_column("notes")
    for i, o in enumerate(outcomes, 1):
        cells = [
            str(i),
            Text(o.mpn, style=STYLE_PASS),
            o.manufacturer,
            str(o.count),
            _q(o.loss_w, "W"),
            f"{o.cost:.2f}" if o.cost is not None else "—",
            margin_text(o),
        ]
        if with_notes:
            cells.append(Text("; ".join(o.notes), style=STYLE_MUTED))
        table.add_row(*cells)
    return table


def unverified_table(outcomes: list[Outcome]) -> Table:
    table = Table(
        title="Unverified (nothing fails, a figure is missing)",
        title_justify="left",
        header_style=STYLE_HEADING,
    )
    for column in ("mpn", "manufacturer", "n", "missing", "loss"):
        table.add_column(column)
    for o in outcomes:
        table.add_row(
            Text(o.mpn, style=STYLE_UNVERIFIED),
            o.manufacturer,
            str(o.count),
            ", ".join(o.missing),
            _q(o.loss_w, "W"),
        )
    return table


def failure_summary(fail_counts: dict[str, int]) -> Table:
    table = Table(title="Failures by rule", title_justify="left", header_style=STYLE_HEADING)
    table.add_column("rule")
    table.add_column("parts failing", justify="right")
    for rule, count in sorted(fail_counts.items(), key=lambda kv: (-kv[1], kv[0])):
        if count:
            table.add_row(rule, str(count))
    return table


def near_miss_table(outcomes: list[Outcome]) -> Table:
    table = Table(
        title="Near misses (closest to passing)", title_justify="left", header_style=STYLE_HEADING
    )
    table.add_column("mpn")
    table.add_column("manufacturer")
    table.add_column("why it fails")
    for o in outcomes:
        reasons = "\n".join(check_sentence(c, o.count) for c in o.failing)
        table.add_row(Text(o.mpn, style=STYLE_FAIL), o.manufacturer, reasons)
    return table
