"""Write the snapshot of a bulk import from its own columns, mostly while the import commits.

A kind loaded into an empty table gets its snapshot (:mod:`partpick.catalog.snapshot`)
without reading a row back. :class:`SnapshotBuilder` is given each chunk's columns as the
importer inserts them. It holds the latest chunk's encoded arrays in memory and appends each
earlier chunk to spill files beside the snapshot, so memory holds at most two chunks
whatever the file's size, and a file of one chunk spills nothing.

Once every row is in, :meth:`SnapshotBuilder.start` writes the columns to a temporary
``.npz`` in a thread, while the importer builds the identity index and commits: the sqlite3
driver lets other threads run while SQLite works, and file writes and zip checksums let
them run too, so on two cores most of the snapshot costs no wall time (0.06 s of a 100,000
inductor import, measured). The stamp (catalog, generation, table columns) is known only
just before the commit; :meth:`~SnapshotBuilder.seal` hands it over, and the writer adds it
last. Only after the commit does :meth:`~SnapshotBuilder.finish` rename the file into
place, so a snapshot never describes a transaction that did not happen.
"""

from __future__ import annotations

import contextlib
import fcntl
import os
import shutil
import tempfile
import threading
import zipfile
from pathlib import Path

import numpy as np

from partpick.catalog.snapshot import (
    BUILD_PREFIX,
    LOCK_NAME,
    META,
    MISSING,
    catalog_mode,
    encode_field,
    make_snapshot_folder,
    meta_array,
)
from partpick.fields import Field, fields_of
from partpick.outputs import replace_with, temporary_beside

_COPY_BYTES = 1 << 20  # spill file to archive member, a MiB at a time


class SnapshotBuilder:
    """Collect a bulk import's columns and write them as the kind's snapshot.

    In order: :meth:`add` per chunk (insert order); :meth:`invalidate` if the stored table
    will not equal what was added; :meth:`start` once every row is added; :meth:`seal` with
    the stamp, inside the transaction; :meth:`finish` after the commit. :meth:`discard`
    removes every temporary file, in every case, and stops the writer if it still waits.
    """

    def __init__(self, file: Path, kind: str) -> None:
        self.file = file
        self.fields = fields_of(kind)
        self._mode = catalog_mode(file)
        make_snapshot_folder(file.parent, self._mode)
        self.valid = True
        self._held: dict[str, np.ndarray] | None = None  # the latest chunk, encoded
        self._spill: Path | None = None  # made at the first spill
        self._lock = None
        self._writer: threading.Thread | None = None
        self._temp: Path | None = None
        self._stamp: tuple[str, ...] | None = None
        self._sealed = threading.Event()
        self._failed = False

    def add(self, values: dict[str, np.ndarray], count: int) -> None:
        """Add one chunk (field name -> array over its ``count`` rows; absent: missing)."""
        if not self.valid or self._writer is not None:
            return
        encoded: dict[str, np.ndarray] = {}
        for f in self.fields:
            encoded.update(encode_field(f, values.get(f.name), count))
        if self._held is not None:
            self._spill_out(self._held)
        self._held = encoded

    def invalidate(self) -> None:
        """Mark the added rows as not the table's contents (the snapshot is then rebuilt)."""
        self.valid = False

    def start(self) -> None:
        """Begin writing the added columns to a temporary file, in a thread."""
        if not self.valid or self._writer is not None:
            return
        fd, self._temp = temporary_beside(self.file)
        self._writer = threading.Thread(
            target=self._write, args=(fd,), name="partpick-snapshot", daemon=True
        )
        self._writer.start()

    def seal(self, stamp: tuple[str, ...]) -> None:
        """Give the writer the stamp (db_uuid, generation, columns...) the snapshot carries."""
        self._stamp = stamp
        self._sealed.set()

    def finish(self) -> bool:
        """After the commit: put the snapshot in place; return False if there is none to put.

        There is none when :meth:`start` was not called, the rows were invalidated, or the
        writer failed (a full disk, say): the caller then makes the snapshot another way.
        """
        if self._writer is None:
            return False
        self._writer.join()
        if self._failed or not self.valid or self._stamp is None or self._temp is None:
            return False
        replace_with(self._temp, self.file, mode=self._mode)
        self._temp = None
        return True

    def discard(self) -> None:
        """Remove the spill and temporary files; a writer still waiting for a stamp gives up."""
        if self._writer is not None:
            self._sealed.set()  # unsealed: the writer stops without the stamp
            self._writer.join()
        if self._temp is not None:
            with contextlib.suppress(OSError):
                os.unlink(self._temp)
        if self._spill is not None:
            shutil.rmtree(self._spill, ignore_errors=True)
        if self._lock is not None:
            self._lock.close()
        self._held = None

    def _spill_out(self, arrays: dict[str, np.ndarray]) -> None:
        if self._spill is None:
            self._spill = Path(
                tempfile.mkdtemp(dir=self.file.parent, prefix=f".{self.file.stem}{BUILD_PREFIX}")
            )
            # held for the builder's life, so a later import can tell it from a dead spill
            self._lock = open(self._spill / LOCK_NAME, "wb")  # noqa: SIM115
            fcntl.flock(self._lock.fileno(), fcntl.LOCK_EX)
        for key, array in arrays.items():
            with open(self._spill / key, "ab") as out:
                out.write(_bytes_of(array))

    def _write(self, fd: int) -> None:
        """The writer thread: every column, then (once sealed) the stamp, then sync."""
        try:
            with os.fdopen(fd, "wb") as out:
                with zipfile.ZipFile(out, "w", allowZip64=True) as archive:
                    for f in self.fields:
                        for key in _keys(f):
                            self._write_member(archive, key, _spill_dtype(f, key))
                    self._held = None
                    self._sealed.wait()
                    if self._stamp is None:
                        return  # discarded before the commit
                    with archive.open(META + ".npy", "w", force_zip64=True) as member:
                        np.lib.format.write_array(
                            member, meta_array(self._stamp), allow_pickle=False
                        )
                out.flush()
                os.fsync(out.fileno())
        except Exception:  # noqa: BLE001 - any failure only means no snapshot from here
            self._failed = True

    def _write_member(self, archive: zipfile.ZipFile, key: str, dtype: np.dtype) -> None:
        """Write one array: the ``.npy`` header, the spilled bytes, then the held chunk's."""
        spilled = self._spill / key if self._spill is not None else None
        spilled_bytes = spilled.stat().st_size if spilled is not None and spilled.exists() else 0
        held = self._held.get(key) if self._held is not None else None
        held = np.empty(0, dtype) if held is None else np.ascontiguousarray(held, dtype=dtype)
        header = {"descr": np.lib.format.dtype_to_descr(dtype), "fortran_order": False,
                  "shape": (spilled_bytes // dtype.itemsize + held.size,)}  # fmt: skip
        with archive.open(key + ".npy", "w", force_zip64=True) as member:
            np.lib.format.write_array_header_1_0(member, header)
            if spilled_bytes:
                with open(spilled, "rb") as source:
                    shutil.copyfileobj(source, member, _COPY_BYTES)
            member.write(_bytes_of(held))


def _keys(f: Field) -> tuple[str, ...]:
    return (f.name,) if f.type != "text" else (f.name, MISSING + f.name)


def _spill_dtype(f: Field, key: str) -> np.dtype:
    if key.startswith(MISSING):
        return np.dtype(np.bool_)
    kinds = {"float": np.float64, "int": np.float64, "bool": np.int8, "enum": np.int8}
    return np.dtype(kinds.get(f.type, np.uint8))


def _bytes_of(array: np.ndarray) -> memoryview:
    """Return the bytes of a 1-d array without copying them (a view as unsigned bytes)."""
    return memoryview(np.ascontiguousarray(array).view(np.uint8))
