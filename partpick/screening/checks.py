"""Check results as data, for one part (:class:`Check`, :class:`Outcome`) and for a whole kind.

The rule modules (``inductor``, ``capacitor``, ``diode``, ``switch``) work on every part of a
kind at once: each rule returns a :class:`RuleResult` of numpy arrays, one element per part.
:mod:`partpick.screening.pick` classifies and ranks on those arrays and turns only the parts
it shows into :class:`Check` and :class:`Outcome` objects. Sentences are made by renderers.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

# status codes of a rule for one part, in the RuleResult.status arrays
PASS, FAIL, UNVERIFIED, SKIPPED = 0, 1, 2, 3
STATUS_TEXT = {PASS: "pass", FAIL: "fail", UNVERIFIED: "unverified"}


@dataclass(frozen=True)
class RuleNeeds:
    """What one rule of a role reads from the catalog, declared beside the rule module's
    FIELDS: a part lacking one of ``fields`` is unverified for the role, or, for an
    ``optional`` rule, simply not checked by it. The import coverage report reads these."""

    rule: str
    fields: tuple[str, ...]
    optional: bool = False


@dataclass(frozen=True, slots=True)
class Requirement:
    """A rating a part must have, such as ``isat_a >= 5.4`` (A): data for a search line.

    ``field`` is a catalog field, ``c_eff_f`` (a capacitor's effective capacitance, as pick
    JSON names it), a product of two (``vf_theta_ja`` = VF·θJA in V·°C/W, ``rds_on_theta_ja``
    = RDS(on)·θJA in Ω·°C/W), or ``count`` (parts in parallel).
    ``comparison`` is ``">="`` or ``"<="``; ``value`` is SI in the dimension key ``unit``;
    ``rule`` names the screening rule it comes from; ``note`` states an assumption.
    """

    field: str
    comparison: str
    value: float
    unit: str
    rule: str
    note: str = ""

    def __post_init__(self) -> None:
        if self.comparison not in (">=", "<="):
            raise ValueError(f"requirement {self.field}: unknown comparison {self.comparison!r}")

    def to_dict(self) -> dict[str, object]:
        """Return the requirement as JSON-ready data (field, comparison, value, unit, ...)."""
        return {
            "field": self.field,
            "comparison": self.comparison,
            "value": self.value,
            "unit": self.unit,
            "rule": self.rule,
            "note": self.note,
        }


@dataclass(frozen=True, slots=True)
class Check:
    """One rule applied to one part. ``limit`` = ``derating`` × ``rating`` for a use rule.

    ``fixes`` lists, for a failing check, single figures that would each make it pass (a
    thermal failure: "θJA ≤ 41 °C/W" or "RDS(on) ≤ 11 mΩ"), with the rest of the part as it is.
    """

    rule: str
    stress: float | None
    limit: float | None
    rating: float | None
    derating: float | None
    utilisation: float | None
    worst_vin_v: float | None
    unit: str
    status: str  # "pass" | "fail" | "unverified"
    missing: tuple[str, ...] = ()
    fixes: tuple[Requirement, ...] = ()

    def __post_init__(self) -> None:
        if self.status not in ("pass", "fail", "unverified"):
            raise ValueError(f"check {self.rule}: unknown status {self.status!r}")


@dataclass(frozen=True, slots=True)
class Outcome:
    """One part for one role: its status, the count in parallel, and every check made."""

    mpn: str
    manufacturer: str
    role: str
    status: str  # "passed" | "unverified" | "failed"
    count: int
    loss_w: float | None
    unit_price: float | None
    cost: float | None
    area_mm2: float | None
    checks: tuple[Check, ...]
    notes: tuple[str, ...]
    missing: tuple[str, ...]
    part: dict[str, object] = field(default_factory=dict)

    def __post_init__(self) -> None:
        if self.status not in ("passed", "unverified", "failed"):
            raise ValueError(f"outcome {self.mpn}: unknown status {self.status!r}")

    @property
    def failing(self) -> tuple[Check, ...]:
        """Return every failing check (all of them, not just the first)."""
        return tuple(c for c in self.checks if c.status == "fail")

    def check(self, rule: str) -> Check:
        """Return the check of ``rule``; KeyError if the part was not checked against it."""
        for c in self.checks:
            if c.rule == rule:
                return c
        raise KeyError(rule)


@dataclass(frozen=True)
class RuleResult:
    """One rule over every part of a kind: arrays with one element per part.

    ``load`` is the stress as a fraction of what the rule allows (above 1 fails); it orders
    the near misses. ``missing`` pairs each field the rule needs with the mask of the parts
    that lack it. ``optional`` rules are made only where their data is present and never
    leave a part unverified. ``fixes`` holds (field, comparison, values, unit): per part,
    the one figure that alone would make a failing part pass (NaN where none would).
    """

    rule: str
    unit: str
    stress: np.ndarray
    limit: np.ndarray
    rating: np.ndarray
    derating: np.ndarray
    utilisation: np.ndarray
    worst_vin_v: np.ndarray
    load: np.ndarray
    status: np.ndarray
    missing: tuple[tuple[str, np.ndarray], ...] = ()
    optional: bool = False
    fixes: tuple[tuple[str, str, np.ndarray, str], ...] = ()

    def fixes_at(self, i: int) -> tuple[Requirement, ...]:
        """Return the fixes of part ``i`` where it fails this rule (none otherwise)."""
        if int(self.status[i]) != FAIL:
            return ()
        found = []
        for name, comparison, values, unit in self.fixes:
            value = float(values[i])
            if np.isfinite(value) and value > 0:
                found.append(Requirement(name, comparison, value, unit, self.rule))
        return tuple(found)

    def check_at(self, i: int) -> Check | None:
        """Return the Check of part ``i``, or None where the rule does not apply to it."""
        code = int(self.status[i])
        if code == SKIPPED:
            return None
        missing = tuple(name for name, mask in self.missing if mask[i])
        return Check(
            rule=self.rule,
            stress=_scalar(self.stress[i]),
            limit=_scalar(self.limit[i]),
            rating=_scalar(self.rating[i]),
            derating=_scalar(self.derating[i]),
            utilisation=_scalar(self.utilisation[i]),
            worst_vin_v=_scalar(self.worst_vin_v[i]),
            unit=self.unit,
            status=STATUS_TEXT[code],
            missing=missing if code == UNVERIFIED else (),
            fixes=self.fixes_at(i),
        )

    def checks_for(self, indices: np.ndarray) -> list[Check | None]:
        """Return the Check of each part in ``indices`` (None where the rule does not apply).

        The same as :meth:`check_at` per part, but converts each array to Python once, so
        materialising every part of a large catalog stays linear and cheap.
        """
        status = self.status[indices].tolist()
        numbers = [
            python_floats(a[indices])
            for a in (
                self.stress, self.limit, self.rating, self.derating, self.utilisation,
                self.worst_vin_v,
            )
        ]  # fmt: skip
        lacking = [(name, mask[indices].tolist()) for name, mask in self.missing]
        out: list[Check | None] = []
        for j, code in enumerate(status):
            if code == SKIPPED:
                out.append(None)
                continue
            missing = tuple(n for n, m in lacking if m[j]) if code == UNVERIFIED else ()
            fixes = self.fixes_at(int(indices[j])) if self.fixes and code == FAIL else ()
            out.append(
                Check(
                    self.rule, numbers[0][j], numbers[1][j], numbers[2][j], numbers[3][j],
                    numbers[4][j], numbers[5][j], self.unit, STATUS_TEXT[code], missing, fixes,
                )
            )  # fmt: skip
        return out


def python_floats(values: np.ndarray) -> list[float | None]:
    """Return a float array as a list of Python floats, None for NaN."""
    return [None if v != v else v for v in values.tolist()]


def _scalar(value: float) -> float | None:
    value = float(value)
    return None if np.isnan(value) else value


def _full(n: int, value: float | np.ndarray | None) -> np.ndarray:
    """Return ``value`` as a float array of ``n`` parts (no copy when it already is one)."""
    if value is None:
        return np.full(n, np.nan)
    array = np.asarray(value, dtype=float)
    if array.shape == (n,):
        return array
    return np.broadcast_to(array, (n,)).copy()


def missing_masks(columns: dict[str, np.ndarray], names: tuple[str, ...]):
    """Return ((name, mask of parts lacking it), ...) for the float fields ``names``."""
    return tuple((name, np.isnan(columns[name])) for name in names)


def use_rule(
    rule: str,
    unit: str,
    stress,
    rating,
    use,
    worst_vin_v=None,
    missing: tuple[tuple[str, np.ndarray], ...] = (),
    **how,
) -> RuleResult:
    """Return the rule stress ≤ use × rating over every part.

    utilisation = stress / rating, limit = use × rating, load = stress / limit. A part whose
    stress or rating is unknown (NaN), or that lacks a field in ``missing``, is unverified.
    ``how`` passes ``optional``, ``applies`` or ``lower_bound`` on (see :func:`finish_rule`).
    """
    rating = np.asarray(rating, dtype=float)
    n = rating.shape[0]
    use_a = _full(n, use)
    limit = use_a * rating
    stress_a = _full(n, stress)
    with np.errstate(divide="ignore", invalid="ignore"):
        utilisation = stress_a / rating
        load = stress_a / limit
    return finish_rule(
        rule, unit, stress_a, limit, rating, use_a, utilisation, worst_vin_v, load, missing, **how
    )


def limit_rule(
    rule: str,
    unit: str,
    stress,
    limit,
    n: int,
    worst_vin_v=None,
    missing: tuple[tuple[str, np.ndarray], ...] = (),
    load=None,
    **how,
) -> RuleResult:
    """Return the rule stress ≤ limit for ``n`` parts, where the limit is the figure itself.

    utilisation = load = stress / limit unless ``load`` is given.
    """
    stress_a, limit_a = _full(n, stress), _full(n, limit)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = stress_a / limit_a
    load = ratio if load is None else _full(n, load)
    return finish_rule(
        rule,
        unit,
        stress_a,
        limit_a,
        limit_a,
        _full(n, 1.0),
        ratio,
        worst_vin_v,
        load,
        missing,
        **how,
    )


def thermal_rule(
    rule: str,
    tj_degc,
    tj_max_degc,
    limit_degc,
    ambient_degc: float,
    worst_vin_v=None,
    missing: tuple[tuple[str, np.ndarray], ...] = (),
    **how,
) -> RuleResult:
    """Return the rule Tj ≤ limit, with utilisation = the share of the allowed rise used.

    utilisation = (Tj − T_amb) / (limit − T_amb); a limit at or below ambient leaves no
    rise at all, so every such part fails.
    """
    tj_max = np.asarray(tj_max_degc, dtype=float)
    n = tj_max.shape[0]
    tj, limit = _full(n, tj_degc), _full(n, limit_degc)
    with np.errstate(divide="ignore", invalid="ignore"):
        allowed = limit - ambient_degc
        load = np.where(allowed > 0, (tj - ambient_degc) / allowed, np.inf)
    load = np.where(np.isnan(tj) | np.isnan(limit), np.nan, load)
    return finish_rule(
        rule, "degC", tj, limit, tj_max, _full(n, None), load, worst_vin_v, load, missing, **how
    )


def finish_rule(
    rule: str,
    unit: str,
    stress: np.ndarray,
    limit: np.ndarray,
    rating,
    derating,
    utilisation,
    worst_vin_v,
    load,
    missing: tuple[tuple[str, np.ndarray], ...] = (),
    *,
    optional: bool = False,
    applies: np.ndarray | None = None,
    lower_bound: bool = False,
    passing: np.ndarray | None = None,
) -> RuleResult:
    """Return the RuleResult with each part's status.

    A part passes where ``passing`` (default stress ≤ limit). A part lacking a field of
    ``missing``, or with an unknown stress or limit, is unverified (skipped if ``optional``).
    With ``lower_bound`` the stress was computed with the missing terms left out, so it is a
    lower bound and a part that already fails on it fails. Parts outside ``applies`` are
    skipped.
    """
    n = stress.shape[0]
    passing = stress <= limit if passing is None else np.asarray(passing, dtype=bool)
    status = np.where(passing, PASS, FAIL).astype(np.int8)
    lacking = np.zeros(n, dtype=bool)
    for _name, mask in missing:
        lacking |= mask
    unknown = np.isnan(stress) | np.isnan(limit)
    unknown |= lacking & passing if lower_bound else lacking
    status[unknown] = SKIPPED if optional else UNVERIFIED
    if applies is not None:
        status[~np.asarray(applies, dtype=bool)] = SKIPPED
    return RuleResult(
        rule,
        unit,
        stress,
        limit,
        _full(n, rating),
        _full(n, derating),
        _full(n, utilisation),
        _full(n, worst_vin_v),
        _full(n, load),
        status,
        missing,
        optional,
    )


def flag_rule(rule: str, failing: np.ndarray, applies: np.ndarray | None = None) -> RuleResult:
    """Return a yes/no rule (no stress figure): ``failing`` parts fail, the rest pass.

    Parts outside ``applies`` are skipped. load is 2 for a failure so a flagged part never
    ranks as a near miss ahead of a part that misses a figure by a little.
    """
    n = failing.shape[0]
    status = np.where(failing, FAIL, PASS).astype(np.int8)
    if applies is not None:
        status[~applies] = SKIPPED
    nan = np.full(n, np.nan)
    load = np.where(failing, 2.0, 0.0)
    return RuleResult(rule, "", nan, nan, nan, nan, nan, nan, load, status)


def core_data_rule(columns: dict[str, np.ndarray], names: tuple[str, ...]) -> RuleResult:
    """Return the ``data`` rule: a part lacking a core field of its kind is unverified.

    Used for core fields no other rule of the role reads (an input capacitor's ESR when the
    spec sets no input ripple still decides its loss); complete parts skip it.
    """
    n = columns["mpn"].shape[0]
    missing = missing_masks(columns, names)
    lacking = np.zeros(n, dtype=bool)
    for _name, mask in missing:
        lacking |= mask
    status = np.where(lacking, UNVERIFIED, SKIPPED).astype(np.int8)
    nan = np.full(n, np.nan)
    return RuleResult("data", "", nan, nan, nan, nan, nan, nan, nan, status, missing)


def lifecycle_rule(lifecycle: np.ndarray) -> RuleResult:
    """Return the lifecycle rule: an ``obsolete`` part fails (any other state passes)."""
    return flag_rule("lifecycle", np.asarray(lifecycle == "obsolete", dtype=bool))


def lifecycle_notes(lifecycle: np.ndarray) -> list[tuple[str, np.ndarray]]:
    """Return the note for parts marked ``nrnd`` (they pass, with a note)."""
    return [("not recommended for new designs (nrnd)", np.asarray(lifecycle == "nrnd"))]


@dataclass(frozen=True)
class Screen:
    """Every rule of one role over every part of its kind, plus count, loss and notes.

    ``operating_point`` lists what the rules used: (key, label, value, unit, worst_vin_v).
    """

    role: str
    kind: str
    columns: dict[str, np.ndarray]
    rules: tuple[RuleResult, ...]
    count: np.ndarray
    loss_w: np.ndarray
    notes: tuple[tuple[str, np.ndarray], ...]
    operating_point: tuple[tuple[str, str, float | None, str, float | None], ...]
    requirements: tuple[Requirement, ...] = ()

    @property
    def size(self) -> int:
        return int(self.columns["mpn"].shape[0])


def operating_point(spec, envelope, keys: tuple[str, ...]):
    """Return (key, label, value, unit, worst_vin_v) for the envelope figures ``keys``."""
    rows = [
        ("vin_min_v", "input voltage, minimum", spec.vin_min_v, "V", None),
        ("vin_max_v", "input voltage, maximum", spec.vin_max_v, "V", None),
        ("vout_v", "output voltage", spec.vout_v, "V", None),
        ("iout_a", "output current", spec.iout_a, "A", None),
        ("fsw_hz", "switching frequency", spec.fsw_hz, "Hz", None),
        ("ambient_max_degc", "ambient, maximum", spec.ambient_max_degc, "degC", None),
        ("efficiency", "efficiency estimate", spec.efficiency, "fraction", None),
    ]
    for key in keys:
        fig = envelope.figures.get(key)
        if fig is not None:
            rows.append((key, fig.label, fig.value, fig.unit, fig.worst_vin_v))
    return tuple(rows)


def check_load(check: Check) -> float | None:
    """Return how much of what the rule allows a check uses (1.0 at the limit, above fails).

    stress/limit for a use or limit rule; the share of the allowed temperature rise for
    ``thermal``; for the two-sided ``inductance`` window, how close L is to the bound it is
    nearest to (or breaks). None for yes/no rules, the optional ``temperature`` rule and
    unmade checks.
    """
    if check.rule == "thermal":
        return check.utilisation
    if check.rule == "temperature":  # an absolute temperature has no natural ratio
        return None
    if check.stress is None or check.limit is None or check.limit == 0:
        return None
    if check.rule == "inductance":
        low, high = sorted((check.stress, check.limit))
        if low <= 0:
            return None
        inside = check.status == "pass"
        return low / high if inside else high / low
    return check.stress / check.limit


def tightest_check(checks: tuple[Check, ...]) -> Check | None:
    """Return the made check with the highest load (the smallest margin), if any.

    The inductance window is left out: being near a bound of the design's ripple band is a
    fit, not a stress margin.
    """
    loaded = [
        (load, c) for c in checks if c.rule != "inductance" and (load := check_load(c)) is not None
    ]
    if not loaded:
        return None
    return max(loaded, key=lambda pair: pair[0])[1]
