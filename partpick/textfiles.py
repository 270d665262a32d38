"""Read the small TOML files a user hands partpick: specs, derating profiles, map files.

One reader, so every kind of file gets the same clear sentence for the same problem:
missing, a folder, unreadable, too large, binary, not UTF-8 (with the byte and where it
is), UTF-16, or not valid TOML. A UTF-8 byte-order mark, which Windows editors write, is
accepted. A FIFO or ``/dev/stdin`` works, as the file is read once.
"""

from __future__ import annotations

import codecs
import tomllib
from pathlib import Path

MAX_TOML_BYTES = 4 << 20
"""The largest TOML file read (4 MiB); a spec or a profile is a few kB."""

_WIDE_BOMS = (
    (codecs.BOM_UTF32_LE, "UTF-32"),
    (codecs.BOM_UTF32_BE, "UTF-32"),
    (codecs.BOM_UTF16_LE, "UTF-16"),
    (codecs.BOM_UTF16_BE, "UTF-16"),
)


class TextFileError(ValueError):
    """A TOML file cannot be read; ``reason`` says why. Callers raise their own error."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason


def read_toml(path: str | Path) -> dict:
    """Return the table of the TOML file at ``path``; raises TextFileError with the reason."""
    return parse_toml(read_bytes(path))


def read_bytes(path: str | Path) -> bytes:
    """Return the bytes of a small text file, at most :data:`MAX_TOML_BYTES`."""
    try:
        with open(path, "rb") as handle:
            data = handle.read(MAX_TOML_BYTES + 1)
    except FileNotFoundError:
        raise TextFileError("file not found") from None
    except IsADirectoryError:
        raise TextFileError("is a folder, not a file") from None
    except OSError as exc:
        raise TextFileError(f"cannot be read ({exc.strerror or exc})") from None
    if len(data) > MAX_TOML_BYTES:
        raise TextFileError(f"is too large (over {MAX_TOML_BYTES >> 20} MiB) for a TOML file")
    return data


def parse_toml(data: bytes) -> dict:
    """Return the TOML table of ``data`` (UTF-8, with or without a byte-order mark)."""
    for bom, name in _WIDE_BOMS:
        if data.startswith(bom):
            raise TextFileError(f"is {name} text; save it as UTF-8")
    if b"\x00" in data:
        raise TextFileError("holds binary data (NUL bytes), not TOML text")
    data = data.removeprefix(codecs.BOM_UTF8)
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise TextFileError(
            f"is not UTF-8 text (byte 0x{data[exc.start]:02X} at byte {exc.start}); "
            "save it as UTF-8"
        ) from None
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise TextFileError(f"is not valid TOML: {exc}") from None
    except RecursionError:
        raise TextFileError("is not valid TOML: it is nested too deeply") from None
