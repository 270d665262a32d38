"""What a catalog file without some columns costs: the rules each missing field takes away.

Read from the rule modules' own ``RULES`` declarations (through ``ROLE_RULES`` in
:mod:`partpick.screening.pick`), so a new rule shows up here without a second list. The
importer reports which fields a file has; :func:`coverage_gaps` says, for every field of
the kind that some rule reads and the file lacks, which rules of which roles lose it and
whether that leaves every part unverified or only skips an optional check.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from partpick.fields import KINDS, ambiguous_wordings, fields_of
from partpick.screening.pick import ROLE_RULES


@dataclass(frozen=True)
class RuleGap:
    """One rule of one role that cannot be made without a field."""

    role: str
    rule: str
    optional: bool  # True: the check is skipped; False: the part is unverified for the role


@dataclass(frozen=True)
class FieldGap:
    """A field some rule reads that a file has no column for, and the rules it takes away."""

    field: str
    rules: tuple[RuleGap, ...]
    inferred: int = 0  # parts whose description stated the value the file has no column for

    @property
    def unverified_roles(self) -> tuple[str, ...]:
        """Return the roles for which every part of the file will be unverified."""
        return tuple(dict.fromkeys(g.role for g in self.rules if not g.optional))

    @property
    def skipped(self) -> tuple[RuleGap, ...]:
        """Return the optional checks that are skipped, in roles not left unverified."""
        lost = set(self.unverified_roles)
        return tuple(g for g in self.rules if g.optional and g.role not in lost)


def rule_fields(kind: str) -> dict[str, tuple[RuleGap, ...]]:
    """Return field -> every rule (of every role drawing on ``kind``) that reads it."""
    found: dict[str, list[RuleGap]] = {}
    for role, rules in ROLE_RULES.items():
        if rules.kind != kind:
            continue
        for needs in rules.rules:
            for name in needs.fields:
                found.setdefault(name, []).append(RuleGap(role, needs.rule, needs.optional))
    return {name: tuple(gaps) for name, gaps in found.items()}


def coverage_gaps(
    kind: str, present: Iterable[str], inferred: Iterable[tuple[str, int]] = ()
) -> tuple[FieldGap, ...]:
    """Return a FieldGap for each field of ``kind`` some rule reads that is not ``present``.

    ``inferred`` gives, per field, how many parts had the value filled from their
    description (see :mod:`partpick.catalog.inference`); the gap then costs only the rest.
    Fields come in data-dictionary order; those whose absence leaves parts unverified first.
    """
    have = set(present)
    filled = dict(inferred)
    by_field = rule_fields(kind)
    gaps = [
        FieldGap(f.name, by_field[f.name], filled.get(f.name, 0))
        for f in fields_of(kind)
        if f.name in by_field and f.name not in have
    ]
    return tuple(sorted(gaps, key=lambda g: not g.unverified_roles))


@dataclass(frozen=True)
class FieldEntry:
    """One field of the data dictionary as the ``fields`` command shows it."""

    kind: str
    name: str
    type: str
    unit: str
    description: str
    rules: tuple[RuleGap, ...]  # every rule of every role that reads it
    wordings: tuple[str, ...]  # header wordings read as this field
    choices: tuple[str, ...]  # an enum's values
    ambiguous: tuple[str, ...]  # wordings never read, because they might also be this field


def field_entries(kind: str | None = None) -> list[FieldEntry]:
    """Return the data dictionary of ``kind`` (every kind when None), with the rules that
    use each field and the header wordings it is read from."""
    kinds = KINDS if kind is None else (kind,)
    entries = []
    for each in kinds:
        used = rule_fields(each)
        unclear = ambiguous_wordings(each)
        for f in fields_of(each):
            entries.append(
                FieldEntry(
                    each, f.name, f.type, f.unit, f.description, used.get(f.name, ()),
                    f.synonyms, f.choices,
                    tuple(w for w, names in unclear.items() if f.name in names),
                )
            )  # fmt: skip
    return entries
