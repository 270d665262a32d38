"""Read one catalog file: check it can be imported at all, then yield validated chunks of rows.

Line numbers follow the file: the header is line 1 (after any ``skip_rows``), the first part
line 2. They count CSV records, so a quoted cell spanning two lines counts once.

Two readers give the same rows: a file up to :data:`SMALL_FILE_BYTES` is read with the
standard ``csv`` module, so importing a few parts never loads pandas (about a third of a
second of start-up); a larger one with pandas' C parser in chunks, which is faster per row.
Both hand :func:`_validate` the same columns (object arrays of cell texts, "" for the cells
a short row lacks), and tests/test_import_readers.py checks they agree file by file.
"""

from __future__ import annotations

import csv
import re
import warnings
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from partpick.catalog.cells import ColumnValues, convert_column, extra_json, with_notes
from partpick.catalog.headers import ColumnMatch, HeaderPlan, MapFile, match_headers
from partpick.catalog.inference import SOURCE as INFERRED_FROM
from partpick.catalog.inference import infer_column, inferable_fields
from partpick.catalog.limits import check_column_count
from partpick.catalog.sniff import FileFormat, sniff_file
from partpick.errors import CatalogFormatError, MapFileError
from partpick.fields import KIND_FIELDS, Field, field_of
from partpick.units import unit_multiplier

if TYPE_CHECKING:
    import pandas as pd

_BAD_LINE_RE = re.compile(r"Skipping line (\d+): expected (\d+) fields, saw (\d+)")
WHOLE_ROW = "(whole row)"
TOO_MANY_FIELDS = "this line has more fields than the header"
# Files up to this size are read by the csv module (no pandas import); measured break-even:
# the csv module costs about 3 µs more per row, pandas about 0.2 s to import.
SMALL_FILE_BYTES = 1 << 20


@dataclass(frozen=True)
class Reject:
    """One bad cell (or bad row) of a file, with the reason it was refused."""

    line: int
    column: str
    value: str
    reason: str


@dataclass(frozen=True)
class PreparedFile:
    """A file whose format and header have been checked, ready to be read."""

    path: str
    kind: str
    format: FileFormat
    plan: HeaderPlan
    headers: tuple[str, ...]
    skip_rows: int
    decimal_comma: bool
    constants: dict[str, ColumnValues]
    mpn_header: str
    display: str = ""  # the name the user gave, when ``path`` is a temporary copy (stdin)
    allow_unusual: bool = False  # store implausible values (with a warning) instead of rejecting

    @property
    def name(self) -> str:
        """Return the file's name as the user gave it."""
        return self.display or self.path


@dataclass(frozen=True)
class Chunk:
    """The valid rows of one chunk as columns, and the rejects found in it.

    ``values`` maps field names (and ``extra``) to arrays over the valid rows only; a field
    the file lacks is absent. ``manufacturer`` is always present, "" where unknown.
    """

    values: dict[str, np.ndarray]
    lines: np.ndarray
    rejects: list[Reject]
    row_count: int
    bytes_done: int


def prepare_file(path: str | Path, kind: str, mapping: MapFile | None) -> PreparedFile:
    """Check the file's encoding, delimiter and header; raises CatalogFormatError if unusable."""
    name = str(path)
    skip_rows = mapping.skip_rows if mapping else 0
    fmt = sniff_file(
        path,
        encoding=mapping.encoding if mapping else None,
        delimiter=mapping.delimiter if mapping else None,
        skip_rows=skip_rows,
    )
    headers = _read_header(name, fmt, skip_rows)
    plan = match_headers(headers, kind, mapping, name)
    _require_columns(name, kind, headers, plan)
    mpn_header = next(m.header for m in plan.matches if m.field == "mpn")
    return PreparedFile(
        path=name,
        kind=kind,
        format=fmt,
        plan=plan,
        headers=headers,
        skip_rows=skip_rows,
        decimal_comma=bool(mapping and mapping.decimal == ","),
        constants=_constants(mapping, kind, plan),
        mpn_header=mpn_header,
    )


def _open_reader(source, fmt: FileFormat, skip_rows: int, **options):
    import pandas as pd

    return pd.read_csv(
        source,
        sep=fmt.delimiter,
        encoding=fmt.encoding,
        header=None,
        dtype=str,
        skiprows=skip_rows,
        keep_default_na=False,
        na_filter=False,
        skip_blank_lines=False,
        on_bad_lines="warn",
        engine="c",
        **options,
    )


def _read_header(name: str, fmt: FileFormat, skip_rows: int) -> tuple[str, ...]:
    try:
        with open(name, encoding=fmt.encoding, newline="") as handle:
            records = csv.reader(handle, delimiter=fmt.delimiter, strict=True)
            for _ in range(skip_rows):
                next(records, None)
            first = next(records, None)
    except csv.Error:  # pandas reads what the csv module refuses, or says why it cannot
        first = _pandas_header(name, fmt, skip_rows)
    if not first:  # no record, or a blank first line (as pandas reads it: no columns)
        raise CatalogFormatError(name, "no header row: the file has no lines to read")
    check_column_count(name, len(first))
    cells = [str(cell).strip() for cell in first]
    return _unique_names([cell or f"(column {i + 1})" for i, cell in enumerate(cells)])


def _pandas_header(name: str, fmt: FileFormat, skip_rows: int) -> list[str] | None:
    import pandas as pd

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", pd.errors.ParserWarning)
            first = _open_reader(name, fmt, skip_rows, nrows=1)
    except pd.errors.EmptyDataError:
        return None
    except (pd.errors.ParserError, UnicodeDecodeError, ValueError) as exc:
        raise CatalogFormatError(name, f"not a readable CSV file ({exc})".strip()) from None
    return None if first.empty else first.iloc[0].tolist()


def _unique_names(headers: list[str]) -> tuple[str, ...]:
    """Return the headers with repeats numbered ("Bin", "Bin (2)"), so extra data keeps both."""
    seen: dict[str, int] = {}
    named = []
    for header in headers:
        seen[header] = seen.get(header, 0) + 1
        named.append(header if seen[header] == 1 else f"{header} ({seen[header]})")
    return tuple(named)


def _require_columns(name: str, kind: str, headers: tuple[str, ...], plan: HeaderPlan) -> None:
    found = {m.field for m in plan.matches}
    if "mpn" not in found:
        if _looks_like_values(headers):
            raise CatalogFormatError(name, "no header row: the first line holds values", 1)
        if len(headers) == 1:
            raise CatalogFormatError(
                name, "not a CSV table: the first line has no comma, semicolon or tab", 1
            )
        wordings = ", ".join(repr(s) for s in field_of(kind, "mpn").synonyms[:4])
        raise CatalogFormatError(
            name, f"no part-number column (a header such as {wordings}); map one in a map file", 1
        )
    own = _own_fields(kind)
    if not {f.name for f in own} & found:
        examples = ", ".join(repr(f.synonyms[0]) for f in own[:4])
        article = "an" if kind[0] in "aeiou" else "a"
        raise CatalogFormatError(
            name,
            f"no column holds {article} {kind} value (such as {examples}); is --kind right?",
            1,
        )


def _own_fields(kind: str) -> tuple[Field, ...]:
    """Return the fields only ``kind`` has (tolerance or sizes do not tell kinds apart)."""
    others = {f.name for k, fs in KIND_FIELDS.items() if k != kind for f in fs}
    return tuple(f for f in KIND_FIELDS[kind] if f.name not in others)


def _looks_like_values(headers: tuple[str, ...]) -> bool:
    numeric = sum(bool(re.match(r"^[+-]?\.?\d", h)) for h in headers)
    return numeric * 2 >= len(headers)


def _constants(mapping: MapFile | None, kind: str, plan: HeaderPlan) -> dict[str, ColumnValues]:
    if mapping is None:
        return {}
    constants = {}
    for name, value in mapping.constants.items():
        f = field_of(kind, name)
        scale = unit_multiplier(mapping.units[name], f.unit) if name in mapping.units else 1.0
        text = str(value).lower() if isinstance(value, bool) else str(value)
        converted = convert_column([text], f, scale=scale, decimal_comma=mapping.decimal == ",")
        if converted.bad[0]:
            raise MapFileError(mapping.path, str(converted.reasons[0]), f"constants.{name}")
        constants[name] = converted
    return constants


def read_chunks(item: PreparedFile, chunk_rows: int) -> Iterator[Chunk]:
    """Yield validated chunks of the file's rows; raises CatalogFormatError if it breaks midway."""
    if item.format.size_bytes <= SMALL_FILE_BYTES:
        records = _small_file_rows(item)
        if records is not None:
            yield from _small_file_chunks(item, *records, chunk_rows)
            return
    yield from _pandas_chunks(item, chunk_rows)


def _small_file_rows(item: PreparedFile) -> tuple[list[list[str]], list[int]] | None:
    """Return (rows padded to the header's width, lines of rows with too many fields).

    None when the csv module (strict) refuses the file: pandas then reads it, or says why
    it cannot (an unterminated quote, say), exactly as for a large file.
    """
    width = len(item.headers)
    rows: list[list[str]] = []
    too_long: list[int] = []
    try:
        with open(item.path, encoding=item.format.encoding, newline="") as handle:
            records = csv.reader(handle, delimiter=item.format.delimiter, strict=True)
            for _ in range(item.skip_rows + 1):  # the skipped lines, then the header
                next(records, None)
            for line, record in enumerate(records, start=item.skip_rows + 2):
                if len(record) > width:
                    too_long.append(line)
                else:
                    rows.append(record + [""] * (width - len(record)))
    except csv.Error:
        return None
    return rows, too_long


def _small_file_chunks(
    item: PreparedFile, rows: list[list[str]], too_long: list[int], chunk_rows: int
) -> Iterator[Chunk]:
    """Validate the rows of a small file in chunks, as the pandas reader would give them."""
    numbers = np.arange(len(rows) + len(too_long), dtype=np.int64) + item.skip_rows + 2
    lines = np.setdiff1d(numbers, np.asarray(too_long, dtype=np.int64), assume_unique=True)
    if rows:
        columns = [_object_column(cells) for cells in zip(*rows, strict=True)]
    else:
        columns = [np.empty(0, dtype=object) for _ in item.headers]
    for start in range(0, max(len(rows), 1), chunk_rows):
        stop = start + chunk_rows
        part = [column[start:stop] for column in columns]
        chunk = _validate(item, part, lines[start:stop], item.format.size_bytes)
        if start == 0:
            chunk.rejects.extend(_bad_line_rejects(too_long))
        yield chunk


def _object_column(cells: tuple[str, ...]) -> np.ndarray:
    column = np.empty(len(cells), dtype=object)
    column[:] = cells
    return column


def _pandas_chunks(item: PreparedFile, chunk_rows: int) -> Iterator[Chunk]:
    """Read a large file with pandas' C parser, a chunk at a time."""
    skipped: list[int] = []  # line numbers of rows pandas skipped for having too many fields
    reported = 0
    with open(item.path, "rb") as handle:
        reader = _open_reader(handle, item.format, item.skip_rows, chunksize=chunk_rows)
        offset = 1  # the header row is the first row pandas returns
        with reader:
            while (frame := _next_frame(item.name, reader, skipped)) is not None:
                lines = _line_numbers(frame.index.to_numpy(), sorted(skipped), item)
                columns = [frame[i].to_numpy(dtype=object)[offset:] for i in frame.columns]
                chunk = _validate(item, columns, lines[offset:], handle.tell())
                offset = 0
                chunk.rejects.extend(_bad_line_rejects(skipped[reported:]))
                reported = len(skipped)
                yield chunk


def _next_frame(name: str, reader, skipped: list[int]) -> pd.DataFrame | None:
    import pandas as pd

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", pd.errors.ParserWarning)
        try:
            frame = next(reader, None)
        except (pd.errors.ParserError, UnicodeDecodeError, ValueError) as exc:
            raise CatalogFormatError(name, f"not a readable CSV file ({exc})") from None
    for warning in caught:
        for match in _BAD_LINE_RE.finditer(str(warning.message)):
            skipped.append(int(match.group(1)))
    return frame


def _line_numbers(index: np.ndarray, skipped: list[int], item: PreparedFile) -> np.ndarray:
    """Return the file line of each row index, allowing for the bad lines pandas skipped."""
    first = item.skip_rows + 1
    shifts = np.asarray(skipped, dtype=np.int64) - first - np.arange(len(skipped))
    return first + index + np.searchsorted(shifts, index, side="right")


def _bad_line_rejects(lines: list[int]) -> list[Reject]:
    return [Reject(line, WHOLE_ROW, "", TOO_MANY_FIELDS) for line in lines]


def _validate(item: PreparedFile, frame: list[np.ndarray], lines: np.ndarray, done: int) -> Chunk:
    """Return the chunk of the rows whose cells are ``frame`` (one object array per header)."""
    keep = ~_blank_rows(frame)
    if not keep.all():
        frame, lines = [column[keep] for column in frame], lines[keep]
    count = len(lines)
    values: dict[str, np.ndarray] = {}
    bad = np.zeros(count, dtype=bool)
    rejects: list[Reject] = []
    kept_as_extra = set(item.plan.unrecognised)  # a set: linear in the column count
    extra_columns = [(h, i) for i, h in enumerate(item.headers) if h in kept_as_extra]
    notes: list[tuple[str, np.ndarray]] = []
    for match in item.plan.matches:
        column = _convert(frame, match, item)
        values[match.field] = column.values
        bad |= column.bad
        rejects.extend(_cell_rejects(frame[match.position], column, lines, match.header))
        notes += _condition_note(count, match, column)
    _apply_constants(values, item, count)
    notes += _fill_from_description(values, item.kind, count)
    missing_mpn = _is_none(values["mpn"])
    for row in np.flatnonzero(missing_mpn & ~bad):
        rejects.append(Reject(int(lines[row]), item.mpn_header, "", "the part number is missing"))
    bad |= missing_mpn
    good = ~bad
    values["extra"] = with_notes(extra_json(frame, extra_columns, count), notes)
    values["manufacturer"] = _manufacturer(values.get("manufacturer"), count)
    if good.all():  # the common case: no copy of every column
        return Chunk(values, lines, rejects, count, done)
    kept = {name: column[good] for name, column in values.items()}
    return Chunk(kept, lines[good], rejects, count, done)


def _is_none(column: np.ndarray) -> np.ndarray:
    """Return a mask of the missing values (None) of a converted object or float column."""
    if column.dtype.kind == "f":
        return np.isnan(column)
    return np.equal(column, None)


def _fill_from_description(
    values: dict[str, np.ndarray], kind: str, count: int
) -> list[tuple[str, np.ndarray]]:
    """Fill a diode type or MOSFET channel the file lacks from what the description says;
    return the notes (extra-data key, value per row) marking the parts filled."""
    descriptions = values.get("description")
    if descriptions is None:
        return []
    marked = []
    for name in inferable_fields(kind):
        column = values.get(name)
        lacking = np.ones(count, dtype=bool) if column is None else np.equal(column, None)
        if not lacking.any():
            continue
        stated = infer_column(kind, name, descriptions)
        filled = lacking & ~np.equal(stated, None)
        if not filled.any():
            continue
        column = np.full(count, None, dtype=object) if column is None else column
        column[filled] = stated[filled]
        values[name] = column
        marked.append((f"{name} inferred from", np.where(filled, INFERRED_FROM, None)))
    return marked


def _condition_note(
    count: int, match: ColumnMatch, column: ColumnValues
) -> list[tuple[str, np.ndarray]]:
    """Return the note of what each cell of ``match`` was measured at: the cell's own
    condition ("0.7 V @ 3 A"), else the header's ("RDS(on) @ 10V"); nothing without any."""
    header = match.condition.lstrip("@").strip() or None
    if column.conditions is None and header is None:
        return []
    cells = column.conditions if column.conditions is not None else np.full(count, None)
    if header is not None:
        cells = np.where(np.equal(cells, None), header, cells)
    return [(f"{match.field} condition", cells)]


def _manufacturer(column: np.ndarray | None, count: int) -> np.ndarray:
    """Return the manufacturer column with "" where unknown (identity needs a value)."""
    if column is None:
        return np.full(count, "", dtype=object)
    column[_is_none(column)] = ""
    return column


def _blank_rows(frame: list[np.ndarray]) -> np.ndarray:
    """Return a mask of empty lines; only rows whose first cell is empty are looked at whole."""
    blank = np.equal(frame[0], "") if frame else np.zeros(0, dtype=bool)
    if blank.any():
        for column in frame[1:]:
            blank[blank] = np.equal(column[blank], "")
    return blank


def _convert(frame: list[np.ndarray], match: ColumnMatch, item: PreparedFile) -> ColumnValues:
    f = field_of(item.kind, match.field)
    return convert_column(
        frame[match.position], f, scale=match.scale, decimal_comma=item.decimal_comma
    )


def _cell_rejects(
    cells: np.ndarray, column: ColumnValues, lines: np.ndarray, header: str
) -> list[Reject]:
    rows = np.flatnonzero(column.bad)
    return [Reject(int(lines[r]), header, str(cells[r]), str(column.reasons[r])) for r in rows]


def _apply_constants(values: dict[str, np.ndarray], item: PreparedFile, count: int) -> None:
    for name, constant in item.constants.items():
        value = constant.values[0]
        if name not in values:
            values[name] = np.full(count, value, dtype=constant.values.dtype)
        else:
            column = values[name]
            column[_is_none(column)] = value
