"""Browse the catalog: ``--where`` conditions and the rows they select.

A condition is ``FIELD OP VALUE`` with OP one of ``= != < <= > >=`` (``==`` also reads as
``=``). FIELD must be a field of the kind in the data dictionary; VALUE is read in that field's
unit (``isat_a>=3A``, ``inductance_h<=10uH``), enum alias (``dielectric=NP0``) or yes/no.
``FIELD=-`` and ``FIELD!=-`` ask for a missing or a present value. The value always travels as a
bound SQL parameter; nothing from the text is ever spliced into SQL or evaluated.
"""

from __future__ import annotations

import json
import math
import operator
import re
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import PurePath

import sqlalchemy as sa

from partpick.catalog.cells import BOOL_WORDS
from partpick.catalog.reader import open_reader
from partpick.catalog.schema import import_batches, parts_table
from partpick.errors import NotFoundError, QueryError, UnitError
from partpick.fields import KINDS, PROVENANCE_COLUMNS, Field, fields_of, fold_text
from partpick.units import is_missing, parse_quantity

_CONDITION_RE = re.compile(r"\s*([A-Za-z_][A-Za-z0-9_]*)\s*(<=|>=|!=|==|=|<|>)\s*(.*?)\s*")
_OPERATORS: dict[str, Callable] = {
    "=": operator.eq,
    "==": operator.eq,
    "!=": operator.ne,
    "<": operator.lt,
    "<=": operator.le,
    ">": operator.gt,
    ">=": operator.ge,
}
_ORDERED = frozenset({"<", "<=", ">", ">="})


@dataclass(frozen=True)
class Condition:
    """One parsed condition; ``value`` is SI for numbers, None for "missing"."""

    text: str
    field: str
    op: str
    value: object


def parse_condition(text: str, kind: str) -> Condition:
    """Return the condition ``text`` reads as for ``kind``; raises QueryError if it is not one."""
    match = _CONDITION_RE.fullmatch(text)
    if match is None:
        raise QueryError(text, "expected FIELD OP VALUE, such as isat_a>=3A or dielectric=x7r")
    name, op, raw = match.groups()
    if not raw:
        raise QueryError(text, f"no value after {op!r}")
    fields = {f.name: f for f in fields_of(kind)}
    if name not in fields:
        article = "an" if kind[0] in "aeiou" else "a"
        listed = ", ".join(fields)
        raise QueryError(text, f"{name!r} is not a field of {article} {kind}; fields: {listed}")
    f = fields[name]
    if is_missing(raw):
        if op not in ("=", "==", "!="):
            raise QueryError(text, "a missing value can only be tested with = or !=")
        return Condition(text, name, op, None)
    if op in _ORDERED and f.type not in ("float", "int"):
        raise QueryError(text, f"{name} is not a number, so only = and != apply")
    return Condition(text, name, op, _condition_value(text, f, raw))


def _condition_value(text: str, f: Field, raw: str) -> object:
    if f.type in ("float", "int"):
        try:
            value = parse_quantity(raw, f.unit)
        except UnitError as exc:
            raise QueryError(text, exc.reason) from None
        if math.isnan(value):
            raise QueryError(text, "no value to compare with")
        return value
    if f.type == "enum":
        choice = f.aliases.get(fold_text(raw))
        if choice is None:
            raise QueryError(text, f"{raw!r} is not one of {', '.join(f.choices)}")
        return choice
    if f.type == "bool":
        folded = {fold_text(k): v for k, v in BOOL_WORDS.items()}
        if fold_text(raw) not in folded:
            raise QueryError(text, f"{f.name} takes yes or no")
        return folded[fold_text(raw)]
    return raw


def _clause(table: sa.Table, condition: Condition) -> sa.ColumnElement[bool]:
    column = table.c[condition.field]
    if condition.value is None:
        return column.is_(None) if condition.op != "!=" else column.is_not(None)
    return _OPERATORS[condition.op](column, sa.bindparam(None, condition.value))


def list_parts(
    db: str | None, kind: str, where: Sequence[str] = (), *, provenance: bool = False
) -> list[dict[str, object]]:
    """Return the parts of ``kind`` meeting every condition, as dicts keyed by field name.

    Values are SI floats (int for counts, bool for yes/no, str for text), None where missing.
    With ``provenance``, each dict also has ``source_file`` (the file's name), ``source_sha256``,
    ``imported_at`` (from the part's import batch) and ``source_line``, after the fields.
    Parts come ordered by manufacturer, then part number.
    """
    if kind not in KINDS:
        raise NotFoundError("part kind", kind, f"Choose one of {', '.join(KINDS)}.")
    conditions = [parse_condition(text, kind) for text in where]
    table = parts_table(kind)
    names = [f.name for f in fields_of(kind)]
    query = sa.select(*(table.c[n] for n in names)).order_by(table.c.manufacturer, table.c.mpn)
    if provenance:
        batches = import_batches.c
        query = query.add_columns(
            batches.file,
            batches.sha256,
            batches.imported_at,
            table.c.source_line,
            table.c.extra,
        ).outerjoin(import_batches, batches.id == table.c.batch_id)
    for condition in conditions:
        query = query.where(_clause(table, condition))
    with open_reader(db).connect() as conn:
        rows = conn.execute(query).all()
    if provenance:
        return [_with_provenance(_row_dict(names, row), row[len(names) :]) for row in rows]
    return [_row_dict(names, row) for row in rows]


def _row_dict(names: list[str], row: Sequence) -> dict[str, object]:
    part = dict(zip(names, row[: len(names)], strict=True))
    part["manufacturer"] = part["manufacturer"] or None  # stored "" only to keep identity unique
    return part


def _with_provenance(part: dict[str, object], source: Sequence) -> dict[str, object]:
    file, sha256, imported_at, line, extra = source
    name = PurePath(file).name if file is not None else None  # the batch keeps the full path
    inferred = _inferred(extra)
    part.update(zip(PROVENANCE_COLUMNS, (name, sha256, imported_at, line, inferred), strict=True))
    return part


_INFERRED_SUFFIX = " inferred from"


def _inferred(extra: str | None) -> dict[str, str] | None:
    """Return field -> where its value was inferred from ("description"), None if nothing was."""
    if not extra or _INFERRED_SUFFIX not in extra:
        return None
    data = json.loads(extra)
    found = {
        key[: -len(_INFERRED_SUFFIX)]: value
        for key, value in data.items()
        if key.endswith(_INFERRED_SUFFIX) and value is not None
    }
    return found or None
