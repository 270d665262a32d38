"""Import CSV catalogs: sniff, read in chunks, validate column by column, upsert in one transaction.

The core never prints. :func:`import_catalog` returns one :class:`ImportReport` per file and
raises :class:`~partpick.errors.CatalogFormatError` (a file that cannot be read at all) or
:class:`~partpick.errors.StrictImportError` (``strict`` and a row was rejected). Either way,
and on any other error or an interruption, the catalog is left exactly as it was: every file
of one call is merged inside one transaction.

An SQLite catalog file is written through the bare ``sqlite3`` driver
(:mod:`partpick.catalog.sqlite_light`), and a small file is read without pandas
(:mod:`partpick.catalog.reading`), so a small import loads neither pandas nor SQLAlchemy;
other catalogs go through SQLAlchemy. The statements are the same plain SQL either way,
up to the write of the rows: on SQLite the chunks go into the parts table directly
(:mod:`partpick.catalog.merge`), on PostgreSQL through a COPY staging table and one upsert
per file (:mod:`partpick.catalog.pg_merge`), under an advisory lock on the kind, so two
importers of it take turns instead of clashing.
"""

from __future__ import annotations

import contextlib
import dataclasses
import datetime as dt
import gc
import getpass
import sqlite3
import sys
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from partpick.catalog import (
    columns,
    identity,
    merge,
    pg_merge,
    plausible,
    postgres,
    snapshot_patch,
    sqlite_light,
)
from partpick.catalog.headers import ColumnMatch, MapFile, Unread, check_map_for_kind, load_map
from partpick.catalog.inference import inferable_fields
from partpick.catalog.location import generation_key, resolve_db_url, snapshot_file, sqlite_file
from partpick.catalog.mapfile import map_for_kind
from partpick.catalog.reading import (
    WHOLE_ROW,
    Chunk,
    PreparedFile,
    Reject,
    prepare_file,
    read_chunks,
)
from partpick.catalog.snapshot import sweep_leftovers
from partpick.catalog.snapshot_build import SnapshotBuilder
from partpick.catalog.spool import STDIN_NAME, spooled_inputs
from partpick.catalog.tables import table_name
from partpick.errors import (
    CatalogFormatError,
    DatabaseError,
    ImportInterrupted,
    NotFoundError,
    StrictImportError,
)
from partpick.fields import KINDS

if TYPE_CHECKING:
    import sqlalchemy as sa

CHUNK_ROWS = 50_000

__all__ = ["ImportProgress", "ImportReport", "Reject", "import_catalog"]


@dataclass(frozen=True)
class ImportProgress:
    """How far the import of one file has got, for a progress bar."""

    file: str
    bytes_done: int
    bytes_total: int
    rows_done: int


@dataclass(frozen=True)
class ImportReport:
    """What importing one file did."""

    file: str
    kind: str
    sha256: str
    batch_id: int
    encoding: str
    delimiter: str
    rows: int  # data rows read (blank lines not counted)
    added: int
    updated: int
    unchanged: int
    rejected: int  # rows rejected (a row may have several bad cells)
    rejects: tuple[Reject, ...]
    columns: tuple[ColumnMatch, ...]
    unrecognised: tuple[str, ...]
    ignored: tuple[str, ...]
    constants: tuple[str, ...]
    unread: tuple[Unread, ...] = ()  # the unrecognised headers, with what might settle them
    unusual: tuple[Reject, ...] = ()  # implausible values accepted with --allow-unusual
    inferred: tuple[tuple[str, int], ...] = ()  # (field, parts) filled from the description

    @property
    def fields_present(self) -> tuple[str, ...]:
        """Return every field the file gives a value for: its columns and map constants."""
        return tuple(dict.fromkeys([m.field for m in self.columns] + list(self.constants)))


ProgressHook = Callable[[ImportProgress], None]


def import_catalog(
    db: str | None,
    files: Sequence[str | Path],
    kind: str | None = None,
    *,
    map_file: str | Path | MapFile | None = None,
    strict: bool = False,
    progress: ProgressHook | None = None,
    chunk_rows: int = CHUNK_ROWS,
    before_commit: Callable[[list[ImportReport]], None] | None = None,
    allow_unusual: bool = False,
) -> list[ImportReport]:
    """Import ``files`` as parts of ``kind`` into the catalog ``db``; return one report per file.

    ``kind`` falls back to the map file's ``kind``. Every file is checked (encoding, header)
    before the database is touched, and all files are merged in one transaction.
    ``before_commit`` is called with the reports inside the transaction (the CLI writes the
    rejects file there), so its failure leaves the catalog unchanged. A file that is not a
    regular file (a FIFO, ``-`` for stdin) is read once into a temporary copy first.
    A value outside its plausibility range (:mod:`partpick.ranges`) rejects its row, unless
    ``allow_unusual``: then it is stored and listed in the report's ``unusual``.
    An interruption raises :class:`~partpick.errors.ImportInterrupted`, which says whether
    the transaction had been committed.
    """
    mapping = load_map(map_file) if isinstance(map_file, str | Path) else map_file
    kind = _resolve_kind(kind, mapping, files)
    if mapping is not None:
        mapping = map_for_kind(mapping, kind)  # one file may hold a section per kind
        check_map_for_kind(mapping, kind)
    with spooled_inputs(files) as readable:
        prepared = [prepare_file(path, kind, mapping) for path in readable]
        prepared = [_named_as_given(p, f) for p, f in zip(prepared, files, strict=True)]
        prepared = [dataclasses.replace(p, allow_unusual=allow_unusual) for p in prepared]
        return _import_prepared(db, kind, prepared, strict, progress, chunk_rows, before_commit)


def _import_prepared(db, kind, prepared, strict, progress, chunk_rows, before_commit):
    builder = None
    before = _generation(db, kind)
    try:
        load_bytes = sum(item.format.size_bytes for item in prepared)
        with _cycle_collector_paused(), _transaction(db, load_bytes) as conn:
            if conn.dialect.name == "postgresql":
                postgres.lock_kind_for_import(conn, kind)  # a second importer waits here
            builder = _snapshot_builder(db, kind, len(prepared))  # once the catalog is open
            reports = [_import_one(conn, item, strict, progress, chunk_rows, builder)
                       for item in prepared]  # fmt: skip
            stamp = _stamp_after_bump(conn, kind)
            if builder is not None:
                builder.seal(stamp)
            if before_commit is not None:
                before_commit(reports)
        _refresh_snapshot(db, kind, builder, stamp, [r.batch_id for r in reports])
    except _write_errors() as exc:  # locked, disk full, read-only; on a server: no grant
        reason = getattr(exc, "orig", None) or exc
        raise DatabaseError(resolve_db_url(db), f"cannot be written ({reason})") from None
    except KeyboardInterrupt:
        raise ImportInterrupted(committed=_generation(db, kind) != before) from None
    finally:
        if builder is not None:
            builder.discard()
    return reports


def _generation(db: str | None, kind: str) -> str | None:
    """Return the stored generation of ``kind`` (None if it cannot be read)."""
    url = resolve_db_url(db)
    path = sqlite_file(url)
    key = generation_key(kind)
    if path is not None:
        try:
            with contextlib.closing(sqlite3.connect(f"file:{path}?mode=ro", uri=True)) as conn:
                row = conn.execute("SELECT value FROM catalog_meta WHERE key = ?", (key,))
                return (row.fetchone() or (None,))[0]
        except sqlite3.Error:
            return None
    import sqlalchemy as sa

    from partpick.catalog.store import open_engine

    try:
        with open_engine(db).connect() as conn:
            return _run(
                conn, "SELECT value FROM catalog_meta WHERE key = :key", {"key": key}
            ).scalar_one_or_none()
    except sa.exc.SQLAlchemyError:
        return None


def _named_as_given(item: PreparedFile, given: str | Path) -> PreparedFile:
    """Return ``item`` reporting the name the user gave (not a temporary copy's)."""
    name = STDIN_NAME if str(given) == "-" else str(given)
    return item if name == item.path else dataclasses.replace(item, display=name)


@contextlib.contextmanager
def _transaction(db: str | None, load_bytes: int) -> Iterator:
    """Yield the one connection and transaction of an import of ``load_bytes`` of CSV.

    An SQLite file: a bare sqlite3 connection (no SQLAlchemy import), closed at the end;
    a new file is created in the journal mode :func:`sqlite_light.connect` picks for it.
    Anything else (an in-memory catalog, a server): an SQLAlchemy connection from the
    catalog's shared engine.
    """
    url = resolve_db_url(db)
    path = sqlite_file(url)
    if path is None:
        from partpick.catalog.store import open_engine

        with open_engine(db).begin() as conn:
            yield conn
        return
    light = sqlite_light.connect(url, path, first_load_bytes=load_bytes)
    try:
        with light.begin():
            yield light
        light.settle()
    finally:
        light.close()


def _write_errors() -> tuple[type[Exception], ...]:
    """Return the exception types of a catalog that cannot be written, for either driver."""
    errors: tuple[type[Exception], ...] = (sqlite3.OperationalError,)
    if "sqlalchemy" in sys.modules:  # ProgrammingError: a server refused (no INSERT grant)
        exc = sys.modules["sqlalchemy"].exc
        errors += (exc.OperationalError, exc.ProgrammingError)
    return errors


@contextlib.contextmanager
def _cycle_collector_paused() -> Iterator[None]:
    """Pause Python's cyclic garbage collector while the rows are checked and written.

    A chunk makes about a million short-lived objects (a tuple per row, a float per cell).
    Reference counting frees every one of them; the cycle collector only adds passes over
    all live objects, triggered by the allocation bursts, which cost about a third of
    building the rows (measured). It runs again as usual once the import is over.
    """
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def _snapshot_builder(db: str | None, kind: str, files: int) -> SnapshotBuilder | None:
    """Return a builder spilling a one-file import's columns, or None where none applies."""
    path = sqlite_file(resolve_db_url(db))
    if path is None:
        return None
    sweep_leftovers(snapshot_file(path, kind).parent)  # a killed import's spill files
    if files != 1:
        return None  # several files: rebuild from the table after the commit instead
    try:
        return SnapshotBuilder(snapshot_file(path, kind), kind)
    except OSError:
        return None


def _stamp_after_bump(conn: sa.Connection, kind: str) -> tuple[str, ...]:
    """Return (db_uuid, new generation, the table's columns...): what a snapshot is checked by."""
    generation = bump_generation(conn, kind)
    db_uuid = _run(conn, "SELECT value FROM catalog_meta WHERE key = 'db_uuid'").scalar_one()
    columns = []
    if conn.dialect.name == "sqlite":  # snapshots exist for SQLite files only
        columns = [row[1] for row in _run(conn, f"PRAGMA table_info({table_name(kind)})").all()]
    return (db_uuid, str(generation), *columns)


def bump_generation(conn: sa.Connection, kind: str) -> int:
    """Add one to the catalog's and to ``kind``'s generation in the caller's transaction.

    Returns the kind's new generation. Snapshots are stamped per kind, so importing
    capacitors leaves the inductor snapshot fresh. The increment is one UPDATE, so two
    importers (of different kinds) on a server never lose one: the second waits on the row
    and adds one to the value the first committed.
    """
    for key in ("generation", generation_key(kind)):
        _run(conn, "UPDATE catalog_meta SET value = CAST(CAST(value AS INTEGER) + 1 AS TEXT) "
                   "WHERE key = :key", {"key": key})  # fmt: skip
        stored = _run(conn, "SELECT value FROM catalog_meta WHERE key = :key", {"key": key})
        if stored.scalar() is None:  # the kind's first import
            _run(conn, "INSERT INTO catalog_meta (key, value) VALUES (:key, '1')", {"key": key})
    return int(
        _run(conn, "SELECT value FROM catalog_meta WHERE key = :key",
             {"key": generation_key(kind)}).scalar_one()
    )  # fmt: skip


def _importer(conn) -> str | None:
    """Return who is importing: the database user on a server, the login on SQLite."""
    if conn.dialect.name == "postgresql":
        return _run(conn, "SELECT current_user").scalar_one()
    try:
        return getpass.getuser()
    except (KeyError, OSError):
        return None


def _run(conn, sql: str, parameters: dict | None = None):
    """Run ``sql`` with named parameters (``:name``) on either kind of connection."""
    if isinstance(conn, sqlite_light.LightConnection):
        return conn.exec_driver_sql(sql, parameters or {})
    import sqlalchemy as sa

    return conn.execute(sa.text(sql), parameters or {})


def _resolve_kind(kind: str | None, mapping: MapFile | None, files: Sequence) -> str:
    chosen = kind or (mapping.kind if mapping is not None else None)
    if chosen is None:
        first = str(files[0]) if files else "(no file)"
        raise CatalogFormatError(
            first, "say which kind of part it holds: --kind " + "|".join(KINDS)
        )
    if chosen not in KINDS:
        raise NotFoundError("part kind", chosen, f"Choose one of {', '.join(KINDS)}.")
    return chosen


def _import_one(
    conn: sa.Connection,
    item: PreparedFile,
    strict: bool,
    progress: ProgressHook | None,
    chunk_rows: int,
    builder: SnapshotBuilder | None,
) -> ImportReport:
    imported_at = dt.datetime.now(dt.UTC).isoformat(timespec="seconds")
    batch_id = _start_batch(conn, item, imported_at)
    after_id = merge.last_row_id(conn, item.kind)
    if conn.dialect.name == "postgresql":
        written = _copy_chunks(conn, item, batch_id, progress, chunk_rows)
    else:
        written = _write_chunks(conn, item, batch_id, progress, chunk_rows, builder)
    rejects = sorted(written.rejects, key=lambda r: r.line)
    rejected = len({r.line for r in rejects})
    if strict and rejects:
        first = rejects[0]
        raise StrictImportError(
            item.name,
            rejected,
            f"line {first.line}, {first.column}: {first.reason}",
            rejects=tuple(rejects),
        )
    if conn.dialect.name == "postgresql":
        added = pg_merge.count_added(conn, item.kind, after_id)
        counts = merge.MergeCounts(added, written.changed - added, written.kept - written.changed)
    else:
        counts = merge.count_changes(conn, item.kind, after_id, written.changed, written.kept)
    _run(
        conn,
        "UPDATE import_batches SET rows = :rows, added = :added, updated = :updated, "
        "unchanged = :unchanged, rejected = :rejected WHERE id = :id",
        {"rows": written.rows, "added": counts.added, "updated": counts.updated,
         "unchanged": counts.unchanged, "rejected": rejected, "id": batch_id},
    )  # fmt: skip
    return ImportReport(
        file=item.name, kind=item.kind, sha256=item.format.sha256, batch_id=batch_id,
        encoding=item.format.encoding, delimiter=item.format.delimiter, rows=written.rows,
        added=counts.added, updated=counts.updated, unchanged=counts.unchanged,
        rejected=rejected, rejects=tuple(rejects), columns=item.plan.matches,
        unrecognised=item.plan.unrecognised, ignored=item.plan.ignored,
        constants=tuple(item.constants), unread=item.plan.unread,
        unusual=tuple(written.unusual), inferred=tuple(written.inferred.items()),
    )  # fmt: skip


@dataclass
class _Written:
    """Running totals of one file's chunks."""

    rows: int = 0  # data rows read, malformed ones included
    kept: int = 0  # rows upserted
    changed: int = 0  # rows SQLite inserted or changed
    rejects: list[Reject] = field(default_factory=list)
    unusual: list[Reject] = field(default_factory=list)  # accepted with allow_unusual
    inferred: dict[str, int] = field(default_factory=dict)  # field -> rows the description filled


def _write_chunks(
    conn: sa.Connection,
    item: PreparedFile,
    batch_id: int,
    progress: ProgressHook | None,
    chunk_rows: int,
    builder: SnapshotBuilder | None,
) -> _Written:
    written = _Written()
    bulk = merge.is_empty(conn, item.kind)  # nothing to match: plain inserts, index at the end
    if bulk:
        merge.drop_identity_index(conn, item.kind)
    elif builder is not None:
        builder.invalidate()  # the table keeps earlier parts the spill does not hold
    duplicates = merge.DuplicateFinder(item.kind, batch_id)
    for chunk in _checked_chunks(conn, item, chunk_rows, bulk, written):
        if bulk:
            added = merge.insert_rows(conn, item.kind, batch_id, chunk.values, chunk.lines)
            written.changed += added
            written.kept += added
            repeats: list[merge.Duplicate] = []
            if builder is not None:
                builder.add(chunk.values, added)
        else:
            rows, repeats = _unique_rows(conn, item, chunk, duplicates)
            written.changed += merge.upsert_rows(conn, item.kind, batch_id, rows)
            written.kept += len(rows)
        written.rows += chunk.row_count + sum(r.column == WHOLE_ROW for r in chunk.rejects)
        written.rejects += chunk.rejects + _repeat_rejects(item, repeats)
        if progress is not None:
            progress(
                ImportProgress(item.name, chunk.bytes_done, item.format.size_bytes, written.rows)
            )
    if bulk:
        if builder is not None:
            builder.start()  # written while the index is built and the import commits
        _finish_bulk_load(conn, item, batch_id, builder, written)
    variants = identity.remove_case_variants(conn, item.kind, batch_id)
    if variants:
        if builder is not None:
            builder.invalidate()  # the variants were spilled but are gone from the table
        written.kept -= len(variants)
        written.changed -= len(variants)
        written.rejects += [Reject(line, item.mpn_header, mpn, why) for line, mpn, why in variants]
    return written


def _checked_chunks(
    conn: sa.Connection, item: PreparedFile, chunk_rows: int, fresh: bool, written: _Written
) -> Iterator[Chunk]:
    """Yield the file's chunks with clean identities and implausible values screened.

    The same on both back-ends. ``fresh``: the kind's table is empty, so the file's own
    first spelling of each manufacturer is kept (else the catalog's).
    """
    makers = identity.MakerSpellings(None if fresh else identity.stored_makers(conn, item.kind))
    headers = {m.field: m.header for m in item.plan.matches}
    for raw in read_chunks(item, chunk_rows):
        chunk = identity.normalise_chunk(raw, makers, headers)
        chunk, notes = plausible.screen_chunk(chunk, item.kind, headers, item.allow_unusual)
        if item.allow_unusual:
            written.unusual += notes
        _count_inferred(chunk, item, headers, written)
        yield chunk


def _count_inferred(chunk: Chunk, item: PreparedFile, headers: dict, written: _Written) -> None:
    """Add the kept rows whose field the file has no column for, yet the description filled."""
    for name in inferable_fields(item.kind):
        column = chunk.values.get(name)
        if name in headers or name in item.constants or column is None:
            continue
        filled = int(np.count_nonzero(~np.equal(column, None)))
        if filled:
            written.inferred[name] = written.inferred.get(name, 0) + filled


def _copy_chunks(
    conn: sa.Connection,
    item: PreparedFile,
    batch_id: int,
    progress: ProgressHook | None,
    chunk_rows: int,
) -> _Written:
    """PostgreSQL: COPY every chunk into the staging table, drop repeats, upsert once."""
    written = _Written()
    pg_merge.start_staging(conn, item.kind)
    fresh = merge.is_empty(conn, item.kind)
    for chunk in _checked_chunks(conn, item, chunk_rows, fresh, written):
        written.kept += pg_merge.copy_rows(conn, item.kind, chunk.values, chunk.lines)
        written.rows += chunk.row_count + sum(r.column == WHOLE_ROW for r in chunk.rejects)
        written.rejects += chunk.rejects
        if progress is not None:
            progress(
                ImportProgress(item.name, chunk.bytes_done, item.format.size_bytes, written.rows)
            )
    repeats = pg_merge.take_repeats(conn, item.kind)
    written.kept -= len(repeats)
    written.rejects += _repeat_rejects(item, repeats)
    written.changed = pg_merge.upsert_staged(conn, item.kind, batch_id)
    return written


def _finish_bulk_load(
    conn: sa.Connection,
    item: PreparedFile,
    batch_id: int,
    builder: SnapshotBuilder | None,
    written: _Written,
) -> None:
    """Rebuild the identity index; reject and uncount the repeats it had to remove."""
    repeats = merge.rebuild_identity_index(conn, item.kind, batch_id)
    if repeats and builder is not None:
        builder.invalidate()  # the repeats were spilled but are gone from the table
    written.kept -= len(repeats)
    written.changed -= len(repeats)
    written.rejects += _repeat_rejects(item, repeats)


def _unique_rows(conn, item, chunk, duplicates) -> tuple[list[tuple], list]:
    """Return the chunk's upsert tuples without repeats of earlier rows, and the repeats."""
    values = chunk.values
    keep, repeats = duplicates.split(conn, values["manufacturer"], values["mpn"], chunk.lines)
    kept = {name: column[keep] for name, column in values.items()}
    return merge.row_tuples(item.kind, kept, chunk.lines[keep]), repeats


def _repeat_rejects(item: PreparedFile, repeats: list) -> list[Reject]:
    reason = "same manufacturer and part number as line {}"
    return [Reject(d.line, item.mpn_header, d.mpn, reason.format(d.first_line)) for d in repeats]


def _start_batch(conn: sa.Connection, item: PreparedFile, imported_at: str) -> int:
    result = _run(
        conn,
        "INSERT INTO import_batches (file, sha256, imported_at, kind, rows, added, updated, "
        "unchanged, rejected, imported_by) VALUES (:file, :sha256, :imported_at, :kind, "
        "0, 0, 0, 0, 0, :imported_by) RETURNING id",
        {"file": item.display or str(Path(item.path).resolve()), "sha256": item.format.sha256,
         "imported_at": imported_at, "kind": item.kind, "imported_by": _importer(conn)},
    )  # fmt: skip
    return int(result.scalar_one())


def _refresh_snapshot(
    db: str | None,
    kind: str,
    builder: SnapshotBuilder | None,
    stamp: tuple[str, ...],
    batch_ids: list[int],
) -> None:
    """Write the columnar snapshot of ``kind`` after the commit.

    From the import's own columns when it filled an empty table (the builder wrote them
    during the commit); else the previous snapshot patched with the rows this import
    wrote; else (no usable previous snapshot) from the whole table. On a write failure the
    snapshot is left stale; read_columns notices and rebuilds it.
    """
    url = resolve_db_url(db)
    path = sqlite_file(url)
    if path is None:
        return  # in-memory and server catalogs are read through SQL
    with contextlib.suppress(OSError):
        if builder is not None and builder.finish():
            return
        if not _patched(path, kind, batch_ids):
            columns.write_snapshot(url, kind)


def _patched(path: Path, kind: str, batch_ids: list[int]) -> bool:
    try:
        return snapshot_patch.patch_snapshot(path, kind, batch_ids)
    except sqlite3.Error:
        return False
