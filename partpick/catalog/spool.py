"""Read a stream (``-`` for stdin, a FIFO, ``/dev/stdin``) once into a temporary file.

The import pipeline reads a file more than once (its encoding is checked over the whole
file before a row is stored, then the rows are read in chunks). A regular file can be
reopened; a pipe cannot: the first reader would drain it and the second would wait for ever.
So a stream is copied once, block by block, into a private temporary file, which the
pipeline then reads like any other file; the copy is removed when the import ends.
"""

from __future__ import annotations

import contextlib
import os
import shutil
import stat
import sys
import tempfile
from collections.abc import Iterator, Sequence
from pathlib import Path

from partpick.errors import CatalogFormatError

STDIN_NAME = "(stdin)"
_BLOCK_BYTES = 1 << 20


def is_stream(path: str | Path) -> bool:
    """Return True for ``-`` and any path that is not a regular file (a FIFO, a device)."""
    if str(path) == "-":
        return True
    try:
        mode = os.stat(path).st_mode
    except OSError:
        return False  # the reader reports a missing file with its own message
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        raise CatalogFormatError(str(path), "is a device, not a CSV file")
    return not stat.S_ISREG(mode) and not stat.S_ISDIR(mode)


@contextlib.contextmanager
def spooled_inputs(files: Sequence[str | Path]) -> Iterator[list[str | Path]]:
    """Yield ``files`` with every stream replaced by a temporary copy of what it held."""
    folder: Path | None = None
    readable: list[str | Path] = []
    try:
        for index, given in enumerate(files):
            if not is_stream(given):
                readable.append(given)
                continue
            if folder is None:
                folder = Path(tempfile.mkdtemp(prefix="partpick-stdin-"))
            readable.append(_copy_stream(given, folder / f"input-{index}.csv"))
        yield readable
    finally:
        if folder is not None:
            shutil.rmtree(folder, ignore_errors=True)


def _copy_stream(given: str | Path, copy: Path) -> Path:
    name = STDIN_NAME if str(given) == "-" else str(given)
    try:
        source = sys.stdin.buffer if str(given) == "-" else open(given, "rb")  # noqa: SIM115
        with open(copy, "wb") as out:
            while block := source.read(_BLOCK_BYTES):
                out.write(block)
        if source is not sys.stdin.buffer:
            source.close()
    except OSError as exc:
        raise CatalogFormatError(name, f"cannot be read ({exc.strerror or exc})") from None
    return copy
