"""Map files: how to read one vendor's CSV layout, in TOML (commented examples in catalogs/maps/).

Top-level keys (all optional)::

    kind = "inductor"       # --kind wins
    encoding = "cp1252"     # otherwise sniffed
    delimiter = ";"         # otherwise sniffed
    decimal = ","           # "," lets 4,7 mean 4.7
    skip_rows = 0           # lines above the header row
    [columns]               # header text -> field name, or "ignore"
    [units]                 # field -> unit of bare numbers in its column
    [constants]             # field -> value on every row lacking one

One file may serve one distributor's exports of several kinds: ``[inductor.columns]``,
``[capacitor.units]``, ``[diode.constants]`` and so on apply to that kind only and win over
the shared tables. A shared entry naming a field of another kind is no error: it applies to
the kind that has the field.
"""

from __future__ import annotations

import codecs
from dataclasses import dataclass, field, replace
from pathlib import Path

from partpick.errors import MapFileError, UnitError
from partpick.fields import KINDS, Field, fields_of
from partpick.textfiles import TextFileError, read_toml
from partpick.units import dimension_name, unit_multiplier

IGNORE = "ignore"
_MAP_KEYS = (
    "kind",
    "encoding",
    "delimiter",
    "decimal",
    "skip_rows",
    "columns",
    "units",
    "constants",
)
_DELIMITERS = {",": ",", ";": ";", "\t": "\t", "tab": "\t", "|": "|"}


@dataclass(frozen=True)
class MapFile:
    """A parsed map file: how to read one vendor's CSV layout."""

    path: str
    kind: str | None = None
    encoding: str | None = None
    delimiter: str | None = None
    decimal: str = "."
    skip_rows: int = 0
    columns: dict[str, str] = field(default_factory=dict)
    units: dict[str, str] = field(default_factory=dict)
    constants: dict[str, object] = field(default_factory=dict)
    # kind -> {"columns": ..., "units": ..., "constants": ...}: the [inductor.columns] tables
    sections: dict[str, dict[str, dict]] = field(default_factory=dict)
    # headers of the shared [columns] of a map with kind sections: one export may lack them
    shared_columns: frozenset[str] = frozenset()


def load_map(path: str | Path) -> MapFile:
    """Read and check a map file; raises :class:`MapFileError` naming the bad key."""
    name = str(path)
    try:
        data = read_toml(path)
    except TextFileError as exc:
        raise MapFileError(name, exc.reason) from None
    for key in data:
        if key not in _MAP_KEYS and key not in KINDS:
            expected = ", ".join((*_MAP_KEYS, *KINDS))
            raise MapFileError(name, f"unknown key; expected one of {expected}", key)
    return MapFile(
        path=name,
        kind=_map_kind(name, data.get("kind")),
        encoding=_map_encoding(name, data.get("encoding")),
        delimiter=_map_delimiter(name, data.get("delimiter")),
        decimal=_map_choice(name, data, "decimal", (".", ","), "."),
        skip_rows=_map_skip_rows(name, data.get("skip_rows", 0)),
        columns=_map_table(name, data, "columns", str),
        units=_map_table(name, data, "units", str),
        constants=_map_table(name, data, "constants", (str, int, float, bool)),
        sections={kind: _map_section(name, data, kind) for kind in KINDS if kind in data},
    )


_SECTION_TYPES: dict[str, type | tuple[type, ...]] = {
    "columns": str,
    "units": str,
    "constants": (str, int, float, bool),
}


def _map_section(name: str, data: dict, kind: str) -> dict[str, dict]:
    """Return the [kind.columns], [kind.units] and [kind.constants] tables of one kind."""
    section = data[kind]
    if not isinstance(section, dict):
        raise MapFileError(name, f"must be a table, such as [{kind}.columns]", kind)
    for key in section:
        if key not in _SECTION_TYPES:
            raise MapFileError(
                name, "unknown key; expected columns, units or constants", f"{kind}.{key}"
            )
    return {
        key: _map_table(name, section, key, types, prefix=f"{kind}.")
        for key, types in _SECTION_TYPES.items()
    }


def map_for_kind(map_file: MapFile, kind: str) -> MapFile:
    """Return the map as it applies to ``kind``: the shared tables, less entries naming a
    field only other kinds have, then the kind's own tables on top."""
    own = {f.name for f in fields_of(kind)}
    others = {f.name for k in KINDS if k != kind for f in fields_of(k)} - own

    def shared(table: dict, by_value: bool) -> dict:
        return {k: v for k, v in table.items() if (v if by_value else k) not in others}

    section = map_file.sections.get(kind, {})
    spread = frozenset(map_file.columns) - set(section.get("columns", {}))
    return replace(
        map_file,
        columns={**shared(map_file.columns, True), **section.get("columns", {})},
        units={**shared(map_file.units, False), **section.get("units", {})},
        constants={**shared(map_file.constants, False), **section.get("constants", {})},
        sections={},
        shared_columns=spread if map_file.sections else frozenset(),
    )


def _map_kind(name: str, kind: object) -> str | None:
    if kind is not None and kind not in KINDS:
        raise MapFileError(
            name, f"unknown kind {kind!r}; expected one of {', '.join(KINDS)}", "kind"
        )
    return kind  # type: ignore[return-value]


def _map_encoding(name: str, encoding: object) -> str | None:
    if encoding is None:
        return None
    try:
        codecs.lookup(str(encoding))
    except LookupError:
        raise MapFileError(name, f"unknown encoding {encoding!r}", "encoding") from None
    return str(encoding)


def _map_delimiter(name: str, delimiter: object) -> str | None:
    if delimiter is None:
        return None
    if delimiter not in _DELIMITERS:
        raise MapFileError(name, 'delimiter must be ",", ";", "\\t" or "|"', "delimiter")
    return _DELIMITERS[delimiter]  # type: ignore[index]


def _map_choice(name: str, data: dict, key: str, choices: tuple[str, ...], default: str) -> str:
    value = data.get(key, default)
    if value not in choices:
        raise MapFileError(name, f"must be one of {', '.join(map(repr, choices))}", key)
    return value


def _map_skip_rows(name: str, value: object) -> int:
    if not isinstance(value, int) or isinstance(value, bool) or value < 0:
        raise MapFileError(name, "must be a whole number of lines, 0 or more", "skip_rows")
    return value


def _map_table(
    name: str, data: dict, key: str, types: type | tuple[type, ...], prefix: str = ""
) -> dict:
    table = data.get(key, {})
    if not isinstance(table, dict):
        raise MapFileError(name, f"must be a table, such as [{prefix}{key}]", prefix + key)
    for inner, value in table.items():
        if not isinstance(value, types) or isinstance(value, dict | list):
            raise MapFileError(
                name, "must be a plain value (text or number)", f"{prefix}{key}.{inner}"
            )
    return dict(table)


def check_map_for_kind(map_file: MapFile, kind: str) -> None:
    """Check that every field the map names exists for ``kind`` and every unit fits its field."""
    known = {f.name: f for f in fields_of(kind)}
    kind = ("an " if kind[0] in "aeiou" else "a ") + kind
    for header, target in map_file.columns.items():
        if target != IGNORE and target not in known:
            raise MapFileError(
                map_file.path, f"{target!r} is not a field of {kind}", f"columns.{header}"
            )
    for name, unit_text in map_file.units.items():
        if name not in known:
            raise MapFileError(map_file.path, f"{name!r} is not a field of {kind}", f"units.{name}")
        unit_scale(
            known[name],
            unit_text,
            lambda reason, key=f"units.{name}": MapFileError(map_file.path, reason, key),
        )
    for name in map_file.constants:
        if name not in known:
            raise MapFileError(
                map_file.path, f"{name!r} is not a field of {kind}", f"constants.{name}"
            )


def unit_scale(f: Field, unit_text: str, error) -> float:
    if f.type not in ("float", "int"):
        raise error(f"{f.name} takes no unit")
    try:
        return unit_multiplier(unit_text, f.unit)
    except UnitError:
        raise error(f"{unit_text!r} is not a unit of {dimension_name(f.unit)}") from None
