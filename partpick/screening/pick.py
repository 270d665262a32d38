"""Pick the parts for one role: check every part of its kind, classify, rank.

Classification and counting run on numpy arrays over every part; :class:`Outcome` objects are
built only for the parts a caller will show (all of them with ``top=None``), so a catalog of
hundreds of thousands of parts is screened without a Python object per part.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING

import numpy as np

from partpick.catalog.columns import describe_parts, mpn_hits, read_columns
from partpick.design.topologies import get_topology
from partpick.errors import NotFoundError, ProfileError
from partpick.fields import fields_of
from partpick.screening import capacitor, diode, inductor, switch
from partpick.screening.checks import (
    FAIL,
    SKIPPED,
    UNVERIFIED,
    Outcome,
    RuleNeeds,
    Screen,
    core_data_rule,
    python_floats,
)
from partpick.screening.profiles import Profile
from partpick.screening.requirements import role_requirements, with_thermal_fixes
from partpick.screening.roles import ROLE_KINDS, ROLES

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope

RANKS: tuple[str, ...] = ("loss", "cost", "size")
# catalog fields read for every role besides the rule fields: identity, price and footprint
_COMMON_FIELDS: tuple[str, ...] = ("mpn", "manufacturer", "unit_price", "length_mm", "width_mm")
_PASSED, _UNVERIFIED, _FAILED = 0, 1, 2
STATUS_NAMES: tuple[str, ...] = ("passed", "unverified", "failed")  # by outcome code
_RULE_WEIGHT = 1e6


@dataclass(frozen=True)
class RoleRules:
    """The one place a role meets its part kind and its rule set."""

    kind: str
    fields: tuple[str, ...]
    core: tuple[str, ...]
    screen: Callable[..., Screen]
    rules: tuple[RuleNeeds, ...] = ()  # what each rule reads, from the rule module


ROLE_RULES: dict[str, RoleRules] = {
    "inductor": RoleRules(
        ROLE_KINDS["inductor"], inductor.FIELDS, inductor.CORE, inductor.screen, inductor.RULES
    ),
    "input-cap": RoleRules(
        ROLE_KINDS["input-cap"], capacitor.FIELDS, capacitor.CORE, capacitor.screen_input,
        capacitor.RULES,
    ),
    "output-cap": RoleRules(
        ROLE_KINDS["output-cap"], capacitor.FIELDS, capacitor.CORE, capacitor.screen_output,
        capacitor.RULES,
    ),
    "diode": RoleRules(ROLE_KINDS["diode"], diode.FIELDS, diode.CORE, diode.screen, diode.RULES),
    "switch": RoleRules(
        ROLE_KINDS["switch"], switch.FIELDS, switch.CORE, switch.screen, switch.RULES
    ),
}  # fmt: skip
__all__ = ["ROLES", "ROLE_RULES", "PickResult", "RankedRole", "Explanation", "Unchecked", "pick",
           "rank_role", "explain"]  # fmt: skip


@dataclass(frozen=True)
class PickResult:
    """The parts of one role, sorted into three ranked lists, and what they were checked at.

    With ``top`` set the lists may be cut, but ``total``, ``counts`` and ``fail_counts``
    count every part. ``operating_point`` lists (key, label, value, unit, worst_vin_v).
    ``requirements`` are the ratings a part of the role needs to pass (see
    :mod:`partpick.screening.requirements`).
    """

    role: str
    profile: Profile
    envelope: Envelope
    rank: str
    total: int
    passed: list[Outcome]
    unverified: list[Outcome]
    failed: list[Outcome]
    fail_counts: dict[str, int]
    counts: dict[str, int] = field(default_factory=dict)
    operating_point: tuple = ()
    max_parallel: int = 4
    kind: str = ""
    requirements: tuple = ()


def role_rules(role: str) -> RoleRules:
    """Return the rules of ``role``; NotFoundError naming the roles for an unknown one."""
    try:
        return ROLE_RULES[role]
    except KeyError:
        raise NotFoundError("role", role, f"Roles are: {', '.join(ROLES)}.") from None


def screen_role(
    db: str | None,
    spec: Spec,
    role: str,
    *,
    profile: Profile,
    max_parallel: int = 4,
    envelope: Envelope | None = None,
) -> tuple[Screen, Envelope]:
    """Return (every rule of ``role`` over every part of its kind, the stress envelope).

    ``envelope`` replaces the spec's own (the BOM passes the one at its chosen parts).
    """
    rules = role_rules(role)
    if max_parallel < 1:
        raise ProfileError(profile.name, "must be a whole number of at least 1", "max_parallel")
    topology = get_topology(spec.topology)
    envelope = topology.envelope(spec) if envelope is None else envelope
    columns = read_role_columns(db, rules)
    screen = rules.screen(columns, spec, envelope, topology, profile, max_parallel)
    screen = with_thermal_fixes(with_core_data(screen, rules.core), spec, envelope, profile)
    needed = role_requirements(role, spec, envelope, topology, profile, max_parallel)
    return replace(screen, requirements=needed), envelope


def with_core_data(screen: Screen, core: tuple[str, ...]) -> Screen:
    """Return ``screen`` plus the ``data`` rule for core fields that no rule of it reads."""
    read = {name for rule in screen.rules for name, _mask in rule.missing}
    unread = tuple(name for name in core if name not in read)
    if not unread:
        return screen
    rules = screen.rules + (core_data_rule(screen.columns, unread),)
    return replace(screen, rules=rules)


def read_role_columns(db: str | None, rules: RoleRules) -> dict[str, np.ndarray]:
    """Return the columns the role needs; a field its kind lacks (a diode has no length_mm)
    comes back all-missing, so every rule module sees the same keys."""
    known = {f.name for f in fields_of(rules.kind)}
    wanted = tuple(dict.fromkeys(_COMMON_FIELDS + rules.fields))
    columns = read_columns(db, rules.kind, [n for n in wanted if n in known])
    size = columns["mpn"].shape[0]
    for name in wanted:
        if name not in columns:
            columns[name] = np.full(size, np.nan)
    return columns


@dataclass(frozen=True)
class RankedRole:
    """Every part of one role classified and ordered, as index arrays into ``screen``.

    ``orders`` maps "passed", "unverified" and "failed" to the parts of each list, best
    first (cut to ``top`` when one was given). Nothing per part is built yet, so a writer can
    stream a list of any length a slice at a time (:mod:`partpick.render.pick_stream`).
    """

    role: str
    profile: Profile
    envelope: Envelope
    rank: str
    max_parallel: int
    screen: Screen
    orders: dict[str, np.ndarray]
    counts: dict[str, int]
    fail_counts: dict[str, int]


def rank_role(
    db: str | None,
    spec: Spec,
    role: str,
    *,
    profile: Profile,
    rank: str = "loss",
    max_parallel: int = 4,
    top: int | None = None,
    envelope: Envelope | None = None,
) -> RankedRole:
    """Return every part of ``role``'s kind classified and ordered (see :func:`pick`)."""
    if rank not in RANKS:
        raise NotFoundError("rank", rank, f"Ranks are: {', '.join(RANKS)}.")
    screen, envelope = screen_role(
        db, spec, role, profile=profile, max_parallel=max_parallel, envelope=envelope
    )
    status = classify(screen)
    keys = ranking_keys(screen, rank)
    mpn = screen.columns["mpn"]
    orders = {
        "passed": ranked(np.flatnonzero(status == _PASSED), keys, mpn, top),
        "unverified": ranked(np.flatnonzero(status == _UNVERIFIED), keys, mpn, top),
        "failed": closest_failures(screen, np.flatnonzero(status == _FAILED), top),
    }
    counts = {name: int((status == code).sum()) for code, name in enumerate(STATUS_NAMES)}
    return RankedRole(
        role=role, profile=profile, envelope=envelope, rank=rank, max_parallel=max_parallel,
        screen=screen, orders=orders, counts=counts, fail_counts=fail_counts(screen),
    )  # fmt: skip


def pick(
    db: str | None,
    spec: Spec,
    role: str,
    *,
    profile: Profile,
    rank: str = "loss",
    max_parallel: int = 4,
    top: int | None = None,
    envelope: Envelope | None = None,
) -> PickResult:
    """Return every part of ``role``'s kind classified as passed, unverified or failed.

    passed and unverified are ranked by ``rank`` (loss, cost or size; ties by cost, then
    mpn); failed are ordered closest to passing first (fewest failing rules, then the
    smallest overshoot of the worst one). With ``top=N`` each list holds at most N parts.
    """
    ranked_role = rank_role(
        db, spec, role, profile=profile, rank=rank, max_parallel=max_parallel, top=top,
        envelope=envelope,
    )  # fmt: skip
    screen = ranked_role.screen
    lists = {
        name: outcomes_at(screen, ranked_role.orders[name], code)
        for code, name in enumerate(STATUS_NAMES)
    }
    return PickResult(
        role=role,
        profile=profile,
        envelope=ranked_role.envelope,
        rank=rank,
        total=screen.size,
        passed=lists["passed"],
        unverified=lists["unverified"],
        failed=lists["failed"],
        fail_counts=ranked_role.fail_counts,
        counts=ranked_role.counts,
        operating_point=screen.operating_point,
        max_parallel=max_parallel,
        kind=screen.kind,
        requirements=screen.requirements,
    )


@dataclass(frozen=True)
class Explanation:
    """Every check of one part for one role, with what it was checked at."""

    role: str
    profile: Profile
    envelope: Envelope
    outcome: Outcome
    operating_point: tuple
    max_parallel: int
    unchecked: tuple[Unchecked, ...] = ()  # the role's rules this part was not checked by


@dataclass(frozen=True)
class Unchecked:
    """A rule of the role that made no check of the part, and why: the fields it lacks
    (an optional rule's data), or that the rule does not apply to it or to this spec."""

    rule: str
    missing: tuple[str, ...]
    reason: str  # "missing", "not applicable" or "not made for this spec"


def explain(
    db: str | None, spec: Spec, role: str, mpn: str, *, profile: Profile, max_parallel: int = 4
) -> Explanation:
    """Return every check of the part ``mpn`` for ``role``; NotFoundError if it is not there."""
    screen, envelope = screen_role(db, spec, role, profile=profile, max_parallel=max_parallel)
    numbers = screen.columns["mpn"]
    hits = mpn_hits(numbers, mpn)
    if hits.size == 0:
        raise NotFoundError(f"{screen.kind} part", mpn, _where_else(db, mpn, screen.kind))
    if hits.size > 1:
        listed = describe_parts(numbers, screen.columns["manufacturer"], hits)
        raise NotFoundError(
            f"single {screen.kind} part", mpn, f"{hits.size} parts match: {listed}."
        )
    i = int(hits[0])
    status = int(classify(screen)[i])
    return Explanation(
        role, profile, envelope, outcomes_at(screen, hits[:1], status)[0], screen.operating_point,
        max_parallel, unchecked_rules(screen, role_rules(role).rules, i),
    )  # fmt: skip


def unchecked_rules(screen: Screen, declared: tuple[RuleNeeds, ...], i: int) -> tuple:
    """Return an Unchecked for every rule of the role that made no check of part ``i``."""
    out = []
    for rule in screen.rules:
        if rule.rule == "data" or int(rule.status[i]) != SKIPPED:
            continue
        missing = tuple(name for name, mask in rule.missing if mask[i])
        out.append(Unchecked(rule.rule, missing, "missing" if missing else "not applicable"))
    made = {rule.rule for rule in screen.rules}
    out += [Unchecked(n.rule, (), "not made for this spec") for n in declared if n.rule not in made]
    return tuple(out)


def _where_else(db: str | None, mpn: str, kind: str) -> str:
    """Return a hint naming the roles that could take ``mpn`` if it is a part of another kind."""
    for other in dict.fromkeys(ROLE_KINDS.values()):
        if other != kind and mpn_hits(read_columns(db, other, ["mpn"])["mpn"], mpn).size:
            roles = [r for r, k in ROLE_KINDS.items() if k == other]
            return f"It is a {other}; use --role {' or --role '.join(roles)}."
    return "Check the mpn (see 'partpick parts')."


def classify(screen: Screen) -> np.ndarray:
    """Return each part's outcome code: 0 passed, 1 unverified, 2 failed."""
    if not screen.rules:
        return np.zeros(screen.size, dtype=np.int8)
    codes = np.vstack([r.status for r in screen.rules])
    failed = (codes == FAIL).any(axis=0)
    unverified = ~failed & (codes == UNVERIFIED).any(axis=0)
    return np.where(failed, _FAILED, np.where(unverified, _UNVERIFIED, _PASSED)).astype(np.int8)


def fail_counts(screen: Screen) -> dict[str, int]:
    """Return rule -> number of parts failing it, for every rule (zero included)."""
    return {r.rule: int((r.status == FAIL).sum()) for r in screen.rules}


def part_cost(screen: Screen) -> np.ndarray:
    """Return count × unit price per part (NaN where the price is unknown)."""
    return screen.count * screen.columns["unit_price"]


def part_area_mm2(screen: Screen) -> np.ndarray:
    """Return the board area, count × length × width, in mm² (NaN where unknown)."""
    return screen.count * screen.columns["length_mm"] * screen.columns["width_mm"]


def ranking_keys(screen: Screen, rank: str) -> tuple[np.ndarray, np.ndarray]:
    """Return (primary key, cost) per part, unknown values as +inf so they sort last."""
    cost = part_cost(screen)
    primary = {"loss": screen.loss_w, "cost": cost, "size": part_area_mm2(screen)}[rank]
    return _inf_for_nan(primary), _inf_for_nan(cost)


def _inf_for_nan(values: np.ndarray) -> np.ndarray:
    return np.where(np.isnan(values), np.inf, values)


def ranked(
    indices: np.ndarray, keys: tuple[np.ndarray, ...], mpn: np.ndarray, top: int | None
) -> np.ndarray:
    """Return ``indices`` ordered by ``keys`` (first key first), then by mpn, cut to ``top``.

    With ``top`` only the parts whose first key is within the top-N value (ties kept) are
    sorted in full, so a long list costs one partition rather than a string sort.
    """
    if indices.size == 0:
        return indices
    first = keys[0][indices]
    if top is not None and top < indices.size:
        if top <= 0:
            return indices[:0]
        cut = np.partition(first, top - 1)[top - 1]
        indices = indices[first <= cut]
    names = np.asarray(mpn[indices], dtype=str)
    order = np.lexsort((names,) + tuple(k[indices] for k in reversed(keys)))
    result = indices[order]
    return result if top is None else result[:top]


def closest_failures(screen: Screen, indices: np.ndarray, top: int | None) -> np.ndarray:
    """Return failed ``indices`` closest to passing first: fewest failing rules, then the
    smallest worst overshoot (load = stress/limit of the worst failing rule), then mpn."""
    if indices.size == 0 or not screen.rules:
        return indices
    # over whole arrays (no gathers): how many rules fail, and the worst overshoot among them
    n_failing = np.zeros(screen.size)
    worst = np.full(screen.size, -np.inf)
    for rule in screen.rules:
        failing = rule.status == FAIL
        n_failing += failing
        load = np.where(np.isnan(rule.load), np.inf, rule.load)
        worst = np.where(failing & (load > worst), load, worst)
    # one key, so that top-N needs a single partition: the failing-rule count dominates and
    # the overshoot (capped well above any real one) orders within it
    closeness = n_failing * _RULE_WEIGHT + np.minimum(worst, _RULE_WEIGHT / 2)
    return ranked(indices, (closeness,), screen.columns["mpn"], top)


def outcomes_at(screen: Screen, indices: np.ndarray, code: int) -> list[Outcome]:
    """Return the Outcome of each part in ``indices``, all with outcome ``code``.

    Each column is converted to Python once for the whole list, so materialising every part
    of a large catalog (``top=None``) costs a few microseconds per check.
    """
    indices = np.asarray(indices, dtype=np.intp)
    per_rule = [rule.checks_for(indices) for rule in screen.rules]
    cols = {name: _python_list(values[indices]) for name, values in screen.columns.items()}
    count = screen.count[indices].tolist()
    loss = python_floats(screen.loss_w[indices])
    area = python_floats(
        screen.columns["length_mm"][indices] * screen.columns["width_mm"][indices]
        * screen.count[indices]
    )  # fmt: skip
    notes = [(text, mask[indices].tolist()) for text, mask in screen.notes]
    names = list(cols)
    rows = zip(*(cols[n] for n in names), strict=True) if names else ()
    status = STATUS_NAMES[code]
    out = []
    for j, row in enumerate(rows):
        checks = tuple(c for c in (r[j] for r in per_rule) if c is not None)
        price = cols["unit_price"][j]
        out.append(
            Outcome(
                mpn=str(cols["mpn"][j]),
                manufacturer=""
                if cols["manufacturer"][j] is None
                else str(cols["manufacturer"][j]),
                role=screen.role,
                status=status,
                count=count[j],
                loss_w=loss[j],
                unit_price=price,
                cost=None if price is None else price * count[j],
                area_mm2=area[j],
                checks=checks,
                notes=tuple(text for text, mask in notes if mask[j]),
                missing=tuple(dict.fromkeys(m for c in checks for m in c.missing)),
                part=dict(zip(names, row, strict=True)),
            )
        )
    return out


def outcome_at(screen: Screen, i: int, code: int) -> Outcome:
    """Return the Outcome of part ``i`` (see :func:`outcomes_at`)."""
    return outcomes_at(screen, np.array([i]), code)[0]


def _python_list(values: np.ndarray) -> list[object]:
    if values.dtype.kind == "f":
        return python_floats(values)
    return values.tolist()  # object, int and bool arrays give Python values already
