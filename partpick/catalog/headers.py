"""Which CSV column holds which catalog field, and in what unit: header matching and map files.

A header matches a field when its folded text (lower case, no punctuation or spacing) equals
the folded name or a folded synonym of a field of the kind (:mod:`partpick.fields`). A unit in
the header (``"DCR (mΩ)"``, ``"Inductance [uH]"``, ``"Isat, A"``) scales the bare numbers of
that column. A map file (TOML; commented examples in ``catalogs/maps/``) names columns,
gives units per field and sets constant fields.

Map file::

    kind = "inductor"       # optional; --kind wins
    encoding = "cp1252"     # optional; otherwise sniffed
    delimiter = ";"         # optional; otherwise sniffed
    decimal = ","           # optional; "," lets 4,7 mean 4.7
    skip_rows = 0           # optional; lines above the header row
    [columns]               # header text -> field name, or "ignore"
    [units]                 # field -> unit of bare numbers in its column
    [constants]             # field -> value on every row lacking one
"""

from __future__ import annotations

import codecs
import re
import tomllib
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from partpick.errors import CatalogFormatError, MapFileError, UnitError
from partpick.fields import KINDS, Field, fields_of, fold_text, split_header_units
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
_QUALIFIER_TAIL_RE = re.compile(r"(max|maximum|typ|typical|nom|nominal)$")


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


@dataclass(frozen=True)
class ColumnMatch:
    """One CSV column read as a catalog field; ``scale`` multiplies its bare numbers."""

    header: str
    position: int
    field: str
    unit_text: str | None
    scale: float
    via: str  # "synonym", "name" or "map"


@dataclass(frozen=True)
class HeaderPlan:
    """How every column of one file is read."""

    matches: tuple[ColumnMatch, ...]
    unrecognised: tuple[str, ...]
    ignored: tuple[str, ...]


def load_map(path: str | Path) -> MapFile:
    """Read and check a map file; raises :class:`MapFileError` naming the bad key."""
    name = str(path)
    try:
        with open(path, "rb") as handle:
            data = tomllib.load(handle)
    except FileNotFoundError:
        raise MapFileError(name, "file not found") from None
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise MapFileError(name, f"not valid TOML ({exc})") from None
    for key in data:
        if key not in _MAP_KEYS:
            raise MapFileError(name, f"unknown key; expected one of {', '.join(_MAP_KEYS)}", key)
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


def _map_table(name: str, data: dict, key: str, types: type | tuple[type, ...]) -> dict:
    table = data.get(key, {})
    if not isinstance(table, dict):
        raise MapFileError(name, "must be a table, such as [" + key + "]", key)
    for inner, value in table.items():
        if not isinstance(value, types) or isinstance(value, dict | list):
            raise MapFileError(name, "must be a plain value (text or number)", f"{key}.{inner}")
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
        _unit_scale(
            known[name],
            unit_text,
            lambda reason, key=f"units.{name}": MapFileError(map_file.path, reason, key),
        )
    for name in map_file.constants:
        if name not in known:
            raise MapFileError(
                map_file.path, f"{name!r} is not a field of {kind}", f"constants.{name}"
            )


def _unit_scale(f: Field, unit_text: str, error) -> float:
    if f.type not in ("float", "int"):
        raise error(f"{f.name} takes no unit")
    try:
        return unit_multiplier(unit_text, f.unit)
    except UnitError:
        raise error(f"{unit_text!r} is not a unit of {dimension_name(f.unit)}") from None


def synonym_index(kind: str) -> dict[str, tuple[Field, str]]:
    """Return folded header text -> (field, how it matched) for every field of ``kind``."""
    index: dict[str, tuple[Field, str]] = {}
    for f in fields_of(kind):
        for synonym in f.synonyms:
            index.setdefault(fold_text(synonym), (f, "synonym"))
        index[fold_text(f.name)] = (f, "name")
    return index


def match_headers(
    headers: Sequence[str], kind: str, map_file: MapFile | None, file: str
) -> HeaderPlan:
    """Return how each column of ``headers`` is read; raises CatalogFormatError on a conflict."""
    index = synonym_index(kind)
    by_name = {f.name: f for f in fields_of(kind)}
    mapped = _folded_map_columns(map_file)
    matches: list[ColumnMatch] = []
    unrecognised: list[str] = []
    ignored: list[str] = []
    for position, header in enumerate(headers):
        target = mapped.get(header.strip(), mapped.get(fold_text(header)))
        if target == IGNORE:
            ignored.append(header)
            continue
        if target is not None:
            found = (by_name[target], "map", split_header_units(header)[1])
        else:
            found = _match_one(header, index)
        if found is None:
            unrecognised.append(header)
            continue
        matches.append(_column_match(header, position, *found, map_file, file))
    _refuse_double_matches(matches, file)
    return HeaderPlan(tuple(matches), tuple(unrecognised), tuple(ignored))


def _folded_map_columns(map_file: MapFile | None) -> dict[str, str]:
    if map_file is None:
        return {}
    folded = {fold_text(k): v for k, v in map_file.columns.items()}
    folded.update({k.strip(): v for k, v in map_file.columns.items()})
    return folded


def _match_one(header: str, index: dict) -> tuple[Field, str, tuple[str, ...]] | None:
    """Try the whole header, then without its units, then without any bracket or qualifier."""
    words, unit_texts = split_header_units(header)
    bare = re.sub(r"[\(\[\{][^\)\]\}]*[\)\]\}]", " ", words)
    # Units found in the header apply whichever form matched: "Tolerance (%)" folds to a
    # plain "tolerance", and a synonym such as "L (mm)" carries its own (fitting) unit.
    candidates = (
        fold_text(header),
        fold_text(words),
        fold_text(bare),
        _QUALIFIER_TAIL_RE.sub("", fold_text(bare)),
    )
    for key in candidates:
        if key and key in index:
            f, via = index[key]
            return f, via, unit_texts
    return None


def _column_match(
    header: str,
    position: int,
    f: Field,
    via: str,
    unit_texts: tuple[str, ...],
    map_file: MapFile | None,
    file: str,
) -> ColumnMatch:
    unit_text = map_file.units.get(f.name) if map_file is not None else None
    if unit_text is None and unit_texts and f.type in ("float", "int"):
        unit_text = unit_texts[-1]

    def error(reason: str) -> CatalogFormatError:
        return CatalogFormatError(file, f"{reason} (header read as {f.name})", 1, header)

    scale = _unit_scale(f, unit_text, error) if unit_text is not None else 1.0
    return ColumnMatch(header, position, f.name, unit_text, scale, via)


def _refuse_double_matches(matches: list[ColumnMatch], file: str) -> None:
    seen: dict[str, ColumnMatch] = {}
    for match in matches:
        if match.field in seen:
            first = seen[match.field].header
            raise CatalogFormatError(
                file,
                f"columns {first!r} and {match.header!r} both read as {match.field}; "
                'name one "ignore" in a map file [columns] table',
                1,
                match.header,
            )
        seen[match.field] = match
