"""Find how a CSV file is written: its encoding, its delimiter and its SHA-256, in one pass.

Encodings: a byte-order mark names UTF-8, UTF-16 or UTF-32; without one the file must decode
strictly as UTF-8, else as cp1252 (the Windows code page where µ is byte 0xB5). Anything else
is refused, because a wrong guess would turn µ into garbage and "4.7 µH" into an error or worse.
"""

from __future__ import annotations

import codecs
import csv
import hashlib
import io
from dataclasses import dataclass
from pathlib import Path

from partpick.catalog.limits import LineGuard
from partpick.errors import CatalogFormatError

BLOCK_BYTES = 1 << 20
_HEAD_BYTES = 1 << 16
_BOMS = (
    (codecs.BOM_UTF32_LE, "utf-32"),
    (codecs.BOM_UTF32_BE, "utf-32"),
    (codecs.BOM_UTF8, "utf-8-sig"),
    (codecs.BOM_UTF16_LE, "utf-16"),
    (codecs.BOM_UTF16_BE, "utf-16"),
)
_BINARY_SIGNATURES = (
    (b"PK\x03\x04", "a zip archive or .xlsx workbook; export the sheet as CSV"),
    (b"\xd0\xcf\x11\xe0", "an .xls workbook; export the sheet as CSV"),
    (b"%PDF", "a PDF document"),
    (b"SQLite format 3", "an SQLite database"),
)
DELIMITERS = (",", ";", "\t")


@dataclass(frozen=True)
class FileFormat:
    """How one file is written."""

    encoding: str
    delimiter: str
    sha256: str
    size_bytes: int


def sniff_file(
    path: str | Path,
    *,
    encoding: str | None = None,
    delimiter: str | None = None,
    skip_rows: int = 0,
) -> FileFormat:
    """Return the encoding, delimiter and hash of ``path``.

    Raises CatalogFormatError for a file that is missing, empty, binary or undecodable.
    """
    name = str(path)
    try:
        size = Path(path).stat().st_size
        with open(path, "rb") as handle:
            head = handle.read(_HEAD_BYTES)
    except FileNotFoundError:
        raise CatalogFormatError(name, "file not found") from None
    except IsADirectoryError:
        raise CatalogFormatError(name, "is a folder, not a CSV file") from None
    if not head.strip():
        raise CatalogFormatError(name, "the file is empty (no header row)")
    chosen = encoding or _bom_encoding(head)
    if chosen is None:
        _refuse_binary(name, head)
    chosen, digest = _decode_all(path, name, chosen)
    text_head = _decode_head(head, chosen)
    found = delimiter or sniff_delimiter(text_head, skip_rows)
    return FileFormat(chosen, found, digest, size)


def _bom_encoding(head: bytes) -> str | None:
    for bom, name in _BOMS:
        if head.startswith(bom):
            return name
    return None


def _refuse_binary(name: str, head: bytes) -> None:
    for signature, what in _BINARY_SIGNATURES:
        if head.startswith(signature):
            raise CatalogFormatError(name, f"not a CSV file: this is {what}")
    if b"\x00" in head:
        raise CatalogFormatError(name, "not a CSV file: it holds binary data (NUL bytes)")


def _decode_all(path: str | Path, name: str, encoding: str | None) -> tuple[str, str]:
    """Return the encoding that decodes the whole file strictly, and the file's SHA-256."""
    candidates = [encoding] if encoding else ["utf-8", "cp1252"]
    failures = []
    for candidate in candidates:
        digest, error = _try_decode(path, candidate, name)
        if error is None:
            return candidate, digest
        failures.append(f"{candidate} ({error})")
    raise CatalogFormatError(name, "cannot be decoded as " + " or as ".join(failures))


def _try_decode(path: str | Path, encoding: str, name: str = "") -> tuple[str, str | None]:
    decoder = codecs.getincrementaldecoder(encoding)(errors="strict")
    digest = hashlib.sha256()
    guard = LineGuard(name or str(path))  # a huge cell is refused in this same pass
    offset = 0
    with open(path, "rb") as handle:
        while block := handle.read(BLOCK_BYTES):
            digest.update(block)
            guard.feed(block)
            try:
                decoder.decode(block)
            except UnicodeDecodeError as exc:
                return "", f"bad byte 0x{block[exc.start]:02X} at byte {offset + exc.start}"
            offset += len(block)
    try:
        decoder.decode(b"", final=True)
    except UnicodeDecodeError:
        return "", "the file ends in the middle of a character"
    return digest.hexdigest(), None


def _decode_head(head: bytes, encoding: str) -> str:
    # The head may end mid-character; the whole file decoded, so only the tail can fail.
    return codecs.getincrementaldecoder(encoding)(errors="ignore").decode(head)


def sniff_delimiter(text: str, skip_rows: int = 0) -> str:
    """Return the delimiter (comma, semicolon or tab) that splits the first lines most evenly.

    The header decides: the candidate giving it the most fields wins, provided most data lines
    split into the same number. With no candidate splitting the header, a comma is assumed.
    """
    lines = text.splitlines()[skip_rows : skip_rows + 21]
    if len(lines) > 1 and not text.endswith(("\n", "\r")):
        lines = lines[:-1]  # the head may cut the last line short
    best, best_fields = ",", 1
    for candidate in DELIMITERS:
        rows = list(csv.reader(io.StringIO("\n".join(lines)), delimiter=candidate))
        if not rows:
            continue
        header_fields = len(rows[0])
        data = [len(r) for r in rows[1:] if r]
        consistent = not data or sum(n == header_fields for n in data) * 2 >= len(data)
        if consistent and header_fields > best_fields:
            best, best_fields = candidate, header_fields
    return best
