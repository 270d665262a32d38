"""Which CSV column holds which catalog field, and in what unit: header matching and map files.

A header is read by meaning (:mod:`partpick.catalog.wording`): case, punctuation, brackets
and word order do not matter, a unit anywhere in it scales the column's bare numbers, and
conditions ("@ 100 kHz") and qualifiers (max, typ, rated, DC) are dropped before it is
compared with every wording of every field in the data dictionary (:mod:`partpick.fields`).
A header that could mean two fields, or one worded close to a known wording but not as one,
stays unread, with the candidate fields and the map-file line that settles it. A map file
(TOML; commented examples in ``catalogs/maps/``) names columns, gives units per field and
sets constant fields.
The map file itself is read by :mod:`partpick.catalog.mapfile`.
"""

from __future__ import annotations

import difflib
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache

from partpick.catalog.mapfile import (
    IGNORE,
    MapFile,
    check_map_for_kind,
    load_map,
    unit_scale,
)
from partpick.catalog.wording import (
    Segment,
    Wording,
    parse_wording,
    segment_keys,
    toml_key,
    without_units,
    wording_keys,
)
from partpick.errors import CatalogFormatError, MapFileError, UnitError
from partpick.fields import (
    KINDS,
    OTHER,
    Field,
    ambiguous_wordings,
    condition_alternative,
    fields_of,
    fold_text,
    settled_by_condition,
)
from partpick.units import unit_multiplier

__all__ = ["IGNORE", "MapFile", "check_map_for_kind", "load_map", "match_headers"]


@dataclass(frozen=True)
class ColumnMatch:
    """One CSV column read as a catalog field; ``scale`` multiplies its bare numbers."""

    header: str
    position: int
    field: str
    unit_text: str | None
    scale: float
    via: str  # "synonym" (the folded wording), "meaning", or "map"
    condition: str = ""  # what the header says the figure holds at ("@ 100 kHz")


@dataclass(frozen=True)
class HeaderPlan:
    """How every column of one file is read."""

    matches: tuple[ColumnMatch, ...]
    unrecognised: tuple[str, ...]
    ignored: tuple[str, ...]
    unread: tuple[Unread, ...] = ()  # the unrecognised headers, with hints


@dataclass(frozen=True)
class Unread:
    """A header no field was read from, and what might settle it.

    ``candidates`` are the fields it could mean (two or more: ambiguous; one: a near
    wording, the "did you mean"); ``map_line`` is the map-file line that reads it as the
    first candidate; ``reason`` says why it stayed unread.
    """

    header: str
    candidates: tuple[str, ...]
    map_line: str
    reason: str


@dataclass(frozen=True)
class WordingIndex:
    """Every data-dictionary wording of one kind, under each of its keys."""

    kind: str
    keys: dict[str, frozenset[str]]
    fields: dict[str, Field]
    near: dict[str, str]  # folded wording -> field, for suggestions


@lru_cache(maxsize=len(KINDS))
def wording_index(kind: str) -> WordingIndex:
    """Return the index of ``kind``: key -> the fields a wording with that key names.

    A key two fields share (or a wording the dictionary declares ambiguous) names both, so
    a header with that key is never read as either.
    """
    keys: dict[str, set[str]] = {}
    near: dict[str, str] = {}
    for f in fields_of(kind):
        keys.setdefault("f:" + fold_text(f.name), set()).add(f.name)
        for synonym in f.synonyms:
            for key in wording_keys(synonym):
                keys.setdefault(key, set()).add(f.name)
            near.setdefault(parse_wording(synonym).whole.symbol or fold_text(synonym), f.name)
    for wording, candidates in ambiguous_wordings(kind).items():
        for key in wording_keys(wording):
            keys[key] = set(candidates)
    frozen = {key: frozenset(names) for key, names in keys.items()}
    return WordingIndex(kind, frozen, {f.name: f for f in fields_of(kind)}, near)


def synonym_index(kind: str) -> dict[str, tuple[Field, str]]:
    """Return folded header text -> (field, how it matched) for the unambiguous wordings."""
    index = wording_index(kind)
    return {
        key[2:]: (index.fields[next(iter(names))], "synonym")
        for key, names in index.keys.items()
        if key.startswith("f:") and len(names) == 1
    }


def match_headers(
    headers: Sequence[str], kind: str, map_file: MapFile | None, file: str
) -> HeaderPlan:
    """Return how each column of ``headers`` is read; raises CatalogFormatError on a conflict."""
    index = wording_index(kind)
    mapped = _folded_map_columns(map_file)
    matches: list[ColumnMatch] = []
    unread: list[Unread] = []
    ignored: list[str] = []
    for position, header in enumerate(headers):
        target = mapped.get(header.strip(), mapped.get(fold_text(header)))
        if target == IGNORE:
            ignored.append(header)
            continue
        if target is not None:
            wording = parse_wording(header)
            found = (index.fields[target], "map", wording.units, wording.condition)
        else:
            found = _match_one(header, index)
        if isinstance(found, Unread):
            unread.append(found)
            continue
        matches.append(_column_match(header, position, *found, map_file, file))
    matches, unread = _settle_double_matches(matches, unread, file)
    if map_file is not None:
        _check_mapped_columns_exist(map_file, headers, file)
    return HeaderPlan(
        tuple(matches), tuple(u.header for u in unread), tuple(ignored), tuple(unread)
    )


def _check_mapped_columns_exist(map_file: MapFile, headers: Sequence[str], file: str) -> None:
    """Refuse a map file naming a column the file lacks: its field would be lost unsaid."""
    present = {h.strip() for h in headers} | {fold_text(h) for h in headers}
    for header, target in map_file.columns.items():
        if target == IGNORE or header.strip() in present or fold_text(header) in present:
            continue
        if header in map_file.shared_columns:  # a multi-kind map's shared table
            continue
        listed = ", ".join(repr(h) for h in headers[:8]) + (" …" if len(headers) > 8 else "")
        raise MapFileError(
            map_file.path,
            f"maps the column {header!r} to {target}, but {file} has no such column "
            f"(its columns: {listed})",
            f"columns.{header}",
        )


def _folded_map_columns(map_file: MapFile | None) -> dict[str, str]:
    if map_file is None:
        return {}
    folded = {fold_text(k): v for k, v in map_file.columns.items()}
    folded.update({k.strip(): v for k, v in map_file.columns.items()})
    return folded


def _match_one(header: str, index: WordingIndex) -> tuple[Field, str, tuple, str] | Unread:
    """Return (field, how, unit texts, condition) for a header read by meaning, or why it
    stays unread."""
    wording = parse_wording(header)
    names, how, loose_units = _lookup(wording, index)
    settled = settled_by_condition(index.kind, names, wording.condition)
    names = frozenset({settled}) if settled else names
    if len(names) > 1 and OTHER not in names and (wording.units or loose_units):
        # "L (mm)" is a length and "L (µH)" an inductance: the unit tells them apart
        fitting = [n for n in names if _units_fit(index.fields[n], wording.units + loose_units)]
        names = frozenset(fitting) if len(fitting) == 1 else names
    if len(names) == 1:
        f = index.fields[next(iter(names))]
        if wording.minimum and f.unit == "degC":
            return _unread(header, (f.name,), "a minimum, and this field is the maximum")
        other = condition_alternative(index.kind, f.name, wording.condition)
        if other is not None:
            return _unread(header, (f.name, other), "its condition may make it " + other)
        if loose_units and not _units_fit(f, loose_units):
            return _unread(header, (f.name,), "its unit word does not fit this field")
        return f, how, wording.units + loose_units, wording.condition
    if len(names) > 1:
        ordered = tuple(n for n in index.fields if n in names)
        return _unread(header, ordered, "could mean any of these; a map file settles it")
    near = suggest_field(wording, index)
    if near is None:
        return _unread(header, (), "no field of this kind has a wording like it")
    return _unread(header, (near,), "not a known wording, but close to one")


def _lookup(wording: Wording, index: WordingIndex) -> tuple[frozenset[str], str, tuple]:
    """Return the fields the wording names (none, one, or several when ambiguous), how, and
    the unit words that were left out to find them ("DCR mOhm")."""
    keys = index.keys
    if "f:" + wording.folded in keys:
        return keys["f:" + wording.folded], "synonym", ()
    names = _segment_fields(wording.with_condition, keys)
    if names:
        return names, "meaning", ()
    whole = wording.whole
    names = _segment_fields(whole, keys)
    if names:
        return names, "meaning", ()
    names = _segment_fields(without_units(whole), keys)
    if names:
        return names, "meaning", whole.unit_words
    return _segments_agree(wording, keys), "meaning", ()


def _units_fit(f: Field, unit_texts: tuple[str, ...]) -> bool:
    if f.type not in ("float", "int"):
        return False
    try:
        for text in unit_texts:
            unit_multiplier(text, f.unit)
    except UnitError:
        return False
    return True


def _segment_fields(segment: Segment | None, keys: dict) -> frozenset[str]:
    if segment is None:
        return frozenset()
    for key in segment_keys(segment):
        if key in keys:
            return keys[key]
    return _symbol_among_words(segment, keys)


def _symbol_among_words(segment: Segment, keys: dict) -> frozenset[str]:
    """Return the one field named both by a word of the segment and by the rest of it
    ("Continuous Drain Current ID", "Total Gate Charge Qg"), else nothing."""
    if len(segment.words) < 2:
        return frozenset()
    for word in segment.words:
        alone = keys.get("w:" + word, keys.get("s:" + word, frozenset()))
        if not alone:
            continue
        rest = Segment(segment.words - {word}, "")
        common = alone & next((keys[k] for k in segment_keys(rest) if k in keys), frozenset())
        if len(common) == 1 and OTHER not in common:
            return common
    return frozenset()


def _segments_agree(wording: Wording, keys: dict) -> frozenset[str]:
    """Return the one field every segment names ("Rated Current (Isat)" is isat_a), or the
    candidates when they stay several; nothing when any segment names nothing."""
    if len(wording.segments) < 2:
        return frozenset()
    common: frozenset[str] | None = None
    for segment in wording.segments:
        names = _segment_fields(segment, keys) or _segment_fields(without_units(segment), keys)
        if not names:
            return frozenset()
        common = names if common is None else common & names
    return common or frozenset()


def suggest_field(wording: Wording, index: WordingIndex) -> str | None:
    """Return the field whose wording is closest to this one, if one is close enough."""
    probe = wording.whole.symbol or wording.folded
    if len(probe) < 3:
        return None
    close = difflib.get_close_matches(probe, index.near, n=1, cutoff=0.75)
    return index.near[close[0]] if close else None


def _unread(header: str, candidates: tuple[str, ...], reason: str) -> Unread:
    line = f'{toml_key(header)} = "{candidates[0]}"' if candidates else ""
    return Unread(header, candidates, line, reason)


def _column_match(
    header: str,
    position: int,
    f: Field,
    via: str,
    unit_texts: tuple[str, ...],
    condition: str,
    map_file: MapFile | None,
    file: str,
) -> ColumnMatch:
    unit_text = map_file.units.get(f.name) if map_file is not None else None
    if unit_text is None and unit_texts and f.type in ("float", "int"):
        unit_text = unit_texts[-1]

    def error(reason: str) -> CatalogFormatError:
        return CatalogFormatError(file, f"{reason} (header read as {f.name})", 1, header)

    scale = unit_scale(f, unit_text, error) if unit_text is not None else 1.0
    return ColumnMatch(header, position, f.name, unit_text, scale, via, condition)


def _settle_double_matches(
    matches: list[ColumnMatch], unread: list[Unread], file: str
) -> tuple[list[ColumnMatch], list[Unread]]:
    """Return the matches with one column per field.

    Where several columns read as one field, a column named in the map file or worded
    exactly as the dictionary has it wins and the others stay unread (an export with
    "Ripple Current @ 120 Hz" and "Ripple Current @ High Frequency"); with no such winner,
    or two of them, the file is refused.
    """
    by_field: dict[str, list[ColumnMatch]] = {}
    for match in matches:
        by_field.setdefault(match.field, []).append(match)
    kept: list[ColumnMatch] = []
    for name, group in by_field.items():
        exact = [m for m in group if m.via in ("map", "synonym", "name")]
        if len(group) > 1 and len(exact) != 1:
            first, second = (exact if len(exact) > 1 else group)[:2]
            raise CatalogFormatError(
                file,
                f"columns {first.header!r} and {second.header!r} both read as {name}; "
                'name one "ignore" in a map file [columns] table',
                1,
                second.header,
            )
        winner = exact[0] if len(group) > 1 else group[0]
        kept.append(winner)
        for m in group:
            if m is not winner:
                line = f'{toml_key(m.header)} = "{name}" and {toml_key(winner.header)} = "ignore"'
                reason = f"{winner.header!r} is read as {name} already"
                unread.append(Unread(m.header, (name,), line, reason))
    kept.sort(key=lambda m: m.position)
    return kept, unread
