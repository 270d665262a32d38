"""The columnar snapshot format: one ``.npz`` per kind beside the database, no pickles.

Each field is stored by its type:

* float and int fields: one float64 array, NaN where missing;
* bool fields: one int8 array, 1 / 0, and -1 where missing;
* enum fields: one int8 array, the index of the value in the field's choices, -1 missing;
* text fields: the values' UTF-8 bytes, each ended by a NUL, as one uint8 array,
  plus a bool mask ``__missing__<name>``. Splitting one decoded string is far faster than
  building or reading fixed-width unicode arrays.

``__meta__`` holds (db_uuid, generation, format version, then the parts table's columns) of
the catalog it was made from; a snapshot differing in any of them is stale and rebuilt.
:mod:`partpick.catalog.snapshot_build` writes the snapshot of a freshly loaded kind from
the import's own columns. Standard library and numpy only (no pandas).
"""

from __future__ import annotations

import contextlib
import fcntl
import os
import shutil
import stat
import time
import zipfile
from collections.abc import Iterable, Sequence
from pathlib import Path

import numpy as np

from partpick.fields import Field
from partpick.outputs import atomic_file

SNAPSHOT_VERSION = "3"
META = "__meta__"
MISSING = "__missing__"


def encode_field(
    f: Field, column: Sequence | np.ndarray | None, count: int
) -> dict[str, np.ndarray]:
    """Return the arrays storing ``column`` (None: all missing) of field ``f``."""
    if f.type in ("float", "int"):
        if column is None:
            return {f.name: np.full(count, np.nan)}
        return {f.name: np.asarray(column, dtype=float)}
    values = (
        np.full(count, None, dtype=object) if column is None else np.asarray(column, dtype=object)
    )
    missing = np.equal(values, None)
    if f.type == "bool":
        flags = np.where(missing, -1, np.where(missing, False, values).astype(bool)).astype(np.int8)
        return {f.name: flags}
    if f.type == "enum":  # the choices are fixed by the data dictionary: store their index
        codes = np.full(count, -1, dtype=np.int8)
        for index, choice in enumerate(f.choices):
            codes[values == choice] = index
        return {f.name: codes}
    texts = np.where(missing, "", values).tolist()
    joined = "\x00".join(texts) + "\x00" if texts else ""
    if joined.count("\x00") != len(texts):  # a NUL inside a value would shift every later one
        joined = "\x00".join(t.replace("\x00", "") for t in texts) + "\x00"
    blob = np.frombuffer(joined.encode("utf-8"), dtype=np.uint8)
    return {f.name: blob, MISSING + f.name: missing}


def meta_array(stamp: Sequence[str]) -> np.ndarray:
    """Return the ``__meta__`` array of a snapshot stamped (db_uuid, generation, columns...)."""
    return np.array([stamp[0], stamp[1], SNAPSHOT_VERSION, *stamp[2:]])


def decode_field(arrays: dict[str, np.ndarray], f: Field) -> np.ndarray:
    """Return field ``f`` as read_columns gives it: float64 with NaN, or object with None."""
    raw = arrays[f.name]
    if f.type in ("float", "int"):
        return raw.astype(float, copy=False)
    if f.type == "bool":
        out = (raw == 1).astype(object)
        out[raw < 0] = None
        return out
    if f.type == "enum":
        return np.array([*f.choices, None], dtype=object)[raw]  # code -1 picks the None
    texts = raw.tobytes().decode("utf-8").split("\x00")[:-1] if raw.size else []
    out = np.empty(len(texts), dtype=object)
    out[:] = texts
    out[arrays[MISSING + f.name]] = None
    return out


def encode_rows(fields: Sequence[Field], rows: list[tuple]) -> dict[str, np.ndarray]:
    """Return the snapshot arrays of database rows (tuples in ``fields`` order)."""
    columns = list(zip(*rows, strict=True)) if rows else [None] * len(fields)
    arrays: dict[str, np.ndarray] = {}
    for f, column in zip(fields, columns, strict=True):
        arrays.update(encode_field(f, column, len(rows)))
    return arrays


def save_members(file: Path, members: Iterable[tuple[str, np.ndarray]]) -> None:
    """Write ``members`` as an .npz (one array at a time) and rename it into place.

    The snapshot takes the permission bits of the catalog file it belongs to (and its
    folder those bits plus search rights), so whoever may read the catalog may read it.
    """
    mode = catalog_mode(file)
    make_snapshot_folder(file.parent, mode)
    with atomic_file(file, mode=mode) as out, zipfile.ZipFile(out, "w", allowZip64=True) as archive:
        for name, array in members:
            with archive.open(name + ".npy", "w", force_zip64=True) as member:
                np.lib.format.write_array(member, np.asanyarray(array), allow_pickle=False)


def catalog_mode(snapshot: Path) -> int | None:
    """Return the permission bits of the catalog file a snapshot belongs to (None: unknown)."""
    folder = snapshot.parent
    catalog = folder.with_name(folder.name.removesuffix(".columns"))
    try:
        return stat.S_IMODE(os.stat(catalog).st_mode) & 0o666
    except OSError:
        return None


def make_snapshot_folder(folder: Path, mode: int | None) -> None:
    """Create the snapshot folder; with the catalog's mode, readable where the catalog is."""
    if folder.is_dir():
        return
    folder.mkdir(parents=True, exist_ok=True)
    if mode is not None:
        readable = (mode & 0o444) >> 2  # search right wherever reading is allowed
        with contextlib.suppress(OSError):
            os.chmod(folder, mode | readable | 0o700)


BUILD_PREFIX = "-build-"
LOCK_NAME = ".lock"
_STALE_SECONDS = 60.0


def sweep_leftovers(folder: Path) -> list[Path]:
    """Remove what a killed import left in a snapshot folder; return what was removed.

    A spill folder (``.inductor-build-*``) is removed when no live import holds its lock;
    a half-written snapshot (``.inductor.*.tmp``) when it is over a minute old. Nothing is
    removed where the folder cannot be written (a reader without write rights).
    """
    removed: list[Path] = []
    if not folder.is_dir() or not os.access(folder, os.W_OK):
        return removed
    for entry in folder.iterdir():
        if entry.name.startswith(".") and BUILD_PREFIX in entry.name and entry.is_dir():
            if _spill_is_abandoned(entry):
                shutil.rmtree(entry, ignore_errors=True)
                removed.append(entry)
        elif entry.name.startswith(".") and entry.name.endswith(".tmp") and _is_old(entry):
            with contextlib.suppress(OSError):
                entry.unlink()
                removed.append(entry)
    return removed


def _spill_is_abandoned(spill: Path) -> bool:
    lock = spill / LOCK_NAME
    if not lock.exists():
        return _is_old(spill)
    try:
        with open(lock, "rb") as handle:
            fcntl.flock(handle.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
    except OSError:
        return False  # a running import holds it
    return True


def _is_old(path: Path) -> bool:
    try:
        return time.time() - path.stat().st_mtime > _STALE_SECONDS
    except OSError:
        return False
