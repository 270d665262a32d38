"""Every error partpick raises on purpose.

Each error keeps its facts as fields and builds its sentence in ``__str__``, so the CLI can
print one clear line and pick an exit code without parsing text. Each also subclasses the
built-in exception it is closest to, so library users can catch ``ValueError`` as usual.
"""

from __future__ import annotations

import re
import urllib.parse
from dataclasses import dataclass, field


class PartpickError(Exception):
    """Base class of every deliberate partpick error."""

    exit_code: int = 2

    def __str__(self) -> str:  # pragma: no cover - subclasses override
        return self.__class__.__name__


@dataclass(eq=False)
class UnitError(PartpickError, ValueError):
    """A piece of text is not a value of the expected unit."""

    text: str
    unit: str
    reason: str

    def __str__(self) -> str:
        return f"{self.text!r} is not a value in {self.unit or 'plain numbers'}: {self.reason}"


@dataclass(eq=False)
class CatalogFormatError(PartpickError, ValueError):
    """A catalog file cannot be imported at all (nothing from it was stored)."""

    file: str
    reason: str
    line: int | None = None
    column: str | None = None
    value: str | None = None

    def __str__(self) -> str:
        where = self.file
        if self.line is not None:
            where += f", line {self.line}"
        if self.column is not None:
            where += f", column {self.column!r}"
        if self.value is not None:
            where += f", value {self.value!r}"
        return f"{where}: {self.reason}"


@dataclass(eq=False)
class StrictImportError(PartpickError, ValueError):
    """``--strict`` was given and at least one row was rejected, so nothing was imported."""

    file: str
    rejected: int
    first: str
    exit_code: int = field(default=1, init=False)
    rejects: tuple = field(default=(), repr=False)  # the rejects, so --rejects can still be written

    def __str__(self) -> str:
        return (
            f"{self.file}: {self.rejected} row(s) rejected, so nothing was imported "
            f"(--strict). First: {self.first}"
        )


@dataclass(eq=False)
class MapFileError(PartpickError, ValueError):
    """A column map file is malformed."""

    file: str
    reason: str
    key: str | None = None

    def __str__(self) -> str:
        key = f", key {self.key!r}" if self.key else ""
        return f"{self.file}{key}: {self.reason}"


@dataclass(eq=False)
class SpecError(PartpickError, ValueError):
    """A converter spec is missing a key or has an impossible value."""

    key: str
    reason: str
    value: object = None
    file: str | None = None

    def __str__(self) -> str:
        where = f"{self.file}: " if self.file else ""
        value = f" (got {self.value!r})" if self.value is not None else ""
        return f"{where}spec key {self.key!r}{value}: {self.reason}"


@dataclass(eq=False)
class ProfileError(PartpickError, ValueError):
    """A derating profile cannot be found or is malformed."""

    profile: str
    reason: str
    key: str | None = None

    def __str__(self) -> str:
        key = f", key {self.key!r}" if self.key else ""
        return f"profile {self.profile}{key}: {self.reason}"


@dataclass(eq=False)
class QueryError(PartpickError, ValueError):
    """A ``--where`` condition or other query cannot be understood."""

    text: str
    reason: str

    def __str__(self) -> str:
        return f"condition {self.text!r}: {self.reason}"


@dataclass(eq=False)
class NotFoundError(PartpickError, LookupError):
    """A named thing (part, kind, role, file) does not exist."""

    what: str
    name: str
    hint: str = ""

    def __str__(self) -> str:
        hint = f" {self.hint}" if self.hint else ""
        return f"no {self.what} {self.name!r}.{hint}"


_URL_PASSWORD_RE = re.compile(
    r"^(?P<head>[A-Za-z][\w+.-]*://[^:@/?#]*):(?P<password>.*)@(?=[^@]*$)"
)
_QUERY_PASSWORD_RE = re.compile(r"(?P<head>[?&]password=)(?P<password>[^&#]*)")


def mask_url(url: str) -> str:
    """Return ``url`` with any password (``user:secret@`` or ``?password=``) shown as ``***``."""
    url = _URL_PASSWORD_RE.sub(r"\g<head>:***@", url, count=1)
    return _QUERY_PASSWORD_RE.sub(r"\g<head>***", url)


def _url_passwords(url: str) -> list[str]:
    found = [m.group("password") for m in _URL_PASSWORD_RE.finditer(url)]
    found += [m.group("password") for m in _QUERY_PASSWORD_RE.finditer(url)]
    return [p for p in found + [urllib.parse.unquote(p) for p in found] if p]


@dataclass(eq=False)
class DatabaseError(PartpickError, RuntimeError):
    """The catalog database cannot be opened or read.

    The message never shows a password: it is masked in the URL and removed from the reason
    (a driver may quote the URL it was given).
    """

    url: str
    reason: str

    def __str__(self) -> str:
        reason = self.reason
        for password in _url_passwords(self.url):
            reason = reason.replace(password, "***")
        return f"catalog database {mask_url(self.url)}: {mask_url(reason)}"


@dataclass(eq=False)
class ParameterError(PartpickError, ValueError):
    """A part lacks a figure the waveform model needs, or a stage figure is impossible.

    ``option`` names the command-line override the user can give instead (``"--dcr"``).
    """

    field: str
    reason: str
    role: str | None = None
    part: str | None = None
    option: str | None = None
    value: object = None

    def __str__(self) -> str:
        who = " ".join(p for p in (self.role, self.part) if p)
        where = f"{who}: " if who else ""
        value = f" (got {self.value!r})" if self.value is not None else ""
        hint = f"; give it with {self.option}" if self.option else ""
        return f"{where}{self.field}{value} {self.reason}{hint}"


@dataclass(eq=False)
class OutputPathError(PartpickError, OSError):
    """A file partpick was asked to write cannot be written there (checked before any work)."""

    path: str
    reason: str
    option: str = "--output"

    def __str__(self) -> str:
        return f"{self.option} {self.path}: {self.reason}"


class ImportInterrupted(KeyboardInterrupt):
    """Ctrl-C stopped an import; ``committed`` says whether its transaction had been committed.

    A KeyboardInterrupt (not a PartpickError), so code that stops on Ctrl-C still does.
    """

    def __init__(self, committed: bool) -> None:
        super().__init__(committed)
        self.committed = committed

    def __str__(self) -> str:
        if self.committed:
            return (
                "interrupted after the import was committed: the catalog holds the new parts "
                "(partpick batches lists it)"
            )
        return "interrupted before the commit; the catalog was not changed"


@dataclass(eq=False)
class NoCatalogError(PartpickError, FileNotFoundError):
    """A reading command was pointed at a catalog that does not exist (only import makes one)."""

    path: str
    detail: str = ""

    def __str__(self) -> str:
        why = f" ({self.detail})" if self.detail else ""
        return (
            f"no catalog at {self.path}{why}; import first: "
            f"partpick import FILE.csv --kind KIND --db {self.path}"
        )
