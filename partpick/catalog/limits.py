"""The size limits of a catalog file, refused at once rather than after minutes of work.

A distributor export has tens of columns and short cells. A file far outside that (a
header of a million columns, a "cell" of a gigabyte) is a broken export or a hostile one,
and reading it would take minutes or exhaust memory before anything useful happened.
"""

from __future__ import annotations

from partpick.errors import CatalogFormatError

MAX_COLUMNS = 1000
"""The most columns a catalog file may have."""
MAX_CELL_BYTES = 1 << 20
"""The longest cell (1 MiB). Checked per line, which is stricter: no line may be longer."""


def check_column_count(name: str, count: int) -> None:
    """Refuse a header of more than :data:`MAX_COLUMNS` columns."""
    if count > MAX_COLUMNS:
        raise CatalogFormatError(
            name, f"the header has {count:,} columns; a catalog file may have at most "
            f"{MAX_COLUMNS:,}", 1,
        )  # fmt: skip


class LineGuard:
    """Watch a file's blocks for a line longer than :data:`MAX_CELL_BYTES`, in O(1) a block.

    A block of at most that size can only hold such a line where one runs across block
    boundaries, so only the run since the last newline is carried from block to block.
    """

    def __init__(self, name: str) -> None:
        self.name = name
        self._run = 0  # bytes since the last newline
        self._lines = 0  # newlines seen before the current run

    def feed(self, block: bytes) -> None:
        """Account for the next block; raises CatalogFormatError at the first long line."""
        first = block.find(b"\n")
        if first < 0:
            self._run += len(block)
            self._check()
            return
        self._run += first
        self._check()
        self._lines += block.count(b"\n")
        self._run = len(block) - block.rfind(b"\n") - 1

    def _check(self) -> None:
        if self._run > MAX_CELL_BYTES:
            raise CatalogFormatError(
                self.name,
                f"line {self._lines + 1} is longer than {MAX_CELL_BYTES >> 20} MiB; a cell may "
                "be at most 1 MiB (is this a CSV export?)",
            )
