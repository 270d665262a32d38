"""Bring a kind's snapshot up to date after an upsert import, without reading the whole table.

Rebuilding the snapshot reads every row back from SQLite: adding one part to a catalog of
250,000 inductors took about 3 s and 400 MB that way (measured), all of it the rebuild. An
import never deletes a stored part; it changes some rows in place and appends new ones, and
every row it added or changed carries its ``batch_id``. So the snapshot of the generation
before the import, patched with those rows (changed ones at their place, new ones at the
end, both in id order) is the snapshot of the table now. :func:`patch_snapshot` checks that
premise (the old snapshot is exactly the previous generation's, and every row past its end
belongs to the import) and otherwise writes nothing, so the caller rebuilds from the table.
"""

from __future__ import annotations

import contextlib
import zipfile
from collections.abc import Sequence
from pathlib import Path

import numpy as np

from partpick.catalog.integrity import connect_read_only
from partpick.catalog.location import generation_key, snapshot_file
from partpick.catalog.snapshot import (
    META,
    MISSING,
    decode_field,
    encode_field,
    encode_rows,
    meta_array,
    save_members,
)
from partpick.fields import Field, fields_of


def patch_snapshot(path: Path, kind: str, batch_ids: Sequence[int]) -> bool:
    """Rewrite the snapshot of ``kind`` from the previous one plus the rows of ``batch_ids``.

    Returns False, having written nothing, when the premise does not hold (no snapshot of
    the previous generation, a column missing, rows not where an import leaves them).
    """
    fields = fields_of(kind)
    table = read_table_state(path, kind, fields, batch_ids)
    if table is None:
        return False
    meta, ids, changed = table
    old = _previous_snapshot(snapshot_file(path, kind), meta)
    if old is None:
        return False
    kept = old[MISSING + "mpn"].shape[0]
    positions = np.searchsorted(ids, [row[0] for row in changed])
    if ids.size < kept or int((positions >= kept).sum()) != ids.size - kept:
        return False  # not the shape an import leaves: rebuild from the table
    fresh = encode_rows(fields, [row[1:] for row in changed])
    members = [(META, np.array(meta))]
    if bool((positions >= kept).all()):  # only new parts: their encoded rows go on the end
        members += [(key, np.concatenate([old[key], fresh[key]])) for key in fresh]
    else:
        for f in fields:
            column = _patched_column(decode_field(old, f), decode_field(fresh, f), ids.size,
                                     positions)  # fmt: skip
            members += encode_field(f, column, ids.size).items()
    save_members(snapshot_file(path, kind), members)
    return True


def read_table_state(
    path: Path, kind: str, fields: Sequence[Field], batch_ids: Sequence[int]
) -> tuple[list[str], np.ndarray, list[tuple]] | None:
    """Return (the snapshot stamp now, every id in order, the batches' rows with their id).

    One read transaction, so the three belong together. None if a field has no column.
    """
    with contextlib.closing(connect_read_only(path)) as conn:
        conn.execute("BEGIN")
        meta = dict(conn.execute("SELECT key, value FROM catalog_meta").fetchall())
        present = [r[1] for r in conn.execute(f"PRAGMA table_info(parts_{kind})")]
        if any(f.name not in present for f in fields):
            conn.execute("COMMIT")
            return None
        rows = conn.execute(f"SELECT id FROM parts_{kind} ORDER BY id").fetchall()
        ids = np.array(rows, dtype=np.int64).reshape(-1)
        names = ", ".join(f'"{f.name}"' for f in fields)
        marks = ", ".join("?" for _ in batch_ids)
        changed = conn.execute(
            f"SELECT id, {names} FROM parts_{kind} WHERE batch_id IN ({marks}) ORDER BY id",
            tuple(batch_ids),
        ).fetchall()
        conn.execute("COMMIT")
    stamp = meta_array((meta["db_uuid"], meta.get(generation_key(kind), "0"), *present)).tolist()
    return stamp, ids, changed


def _previous_snapshot(file: Path, stamp: list[str]) -> dict[str, np.ndarray] | None:
    """Return the snapshot's arrays if it is the one of the generation before ``stamp``'s."""
    try:
        previous = str(int(stamp[1]) - 1)
        with np.load(file, allow_pickle=False) as archive:
            meta = archive[META].tolist()
            if meta != [stamp[0], previous, *stamp[2:]]:
                return None
            return {name: archive[name] for name in archive.files if name != META}
    except (OSError, ValueError, KeyError, EOFError, zipfile.BadZipFile):
        return None


def _patched_column(
    old: np.ndarray, fresh: np.ndarray, size: int, positions: np.ndarray
) -> np.ndarray:
    """Return the old column grown to ``size`` rows with the fresh values at ``positions``."""
    column = np.empty(size, dtype=old.dtype)
    column[: old.shape[0]] = old
    column[positions] = fresh
    return column
