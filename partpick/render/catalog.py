"""Render catalog results: import summaries, rejects files, part lists and import batches."""

from __future__ import annotations

import csv
import io
import json
import math
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from pathlib import Path

from rich.console import Console
from rich.markup import escape
from rich.progress import BarColumn, DownloadColumn, Progress, TextColumn, TimeRemainingColumn
from rich.table import Table

from partpick.catalog.importer import ImportProgress, ImportReport, Reject
from partpick.catalog.store import Batch
from partpick.fields import Field, fields_of
from partpick.render.console import STYLE_FAIL, STYLE_HEADING, STYLE_MUTED, STYLE_UNVERIFIED
from partpick.units import format_eng

REJECT_COLUMNS = ("line", "column", "value", "reason")
# OWASP "CSV Injection": a cell starting with one of these may run as a spreadsheet formula.
_FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")
_PROGRESS_MIN_BYTES = 1 << 20
# The terminal table leaves out long text and folds the three body sizes into one column.
_TABLE_SKIPS = frozenset({"description", "length_mm", "width_mm", "height_mm"})
_SIZE_FIELDS = ("length_mm", "width_mm", "height_mm")


def neutralise_cell(text: str) -> str:
    """Return ``text`` safe to open in a spreadsheet: a leading formula character is quoted."""
    return "'" + text if text.startswith(_FORMULA_LEADS) else text


@contextmanager
def import_progress(
    console: Console, total_bytes: int
) -> Iterator[Callable[[ImportProgress], None] | None]:
    """Yield a progress hook drawing a bar on a terminal for big files, else None."""
    if not console.is_terminal or total_bytes < _PROGRESS_MIN_BYTES:
        yield None
        return
    columns = (TextColumn("{task.description}"), BarColumn(), DownloadColumn())
    with Progress(*columns, TimeRemainingColumn(), console=console, transient=True) as bar:
        tasks: dict[str, int] = {}

        def hook(step: ImportProgress) -> None:
            if step.file not in tasks:
                name = Path(step.file).name
                tasks[step.file] = bar.add_task(f"importing {name}", total=step.bytes_total)
            bar.update(tasks[step.file], completed=step.bytes_done)

        yield hook


def render_import_reports(
    console: Console, reports: Sequence[ImportReport], shown: int = 10
) -> None:
    """Print the summary table of an import, then its columns and first rejects."""
    table = Table(title="Import summary", title_style=STYLE_HEADING)
    for name in ("file", "kind", "rows", "added", "updated", "unchanged", "rejected"):
        table.add_column(name, justify="left" if name in ("file", "kind") else "right")
    for r in reports:
        rejected = f"[{STYLE_FAIL}]{r.rejected}[/]" if r.rejected else "0"
        table.add_row(escape(Path(r.file).name), r.kind, str(r.rows), str(r.added), str(r.updated),
                      str(r.unchanged), rejected)  # fmt: skip
    console.print(table)
    for r in reports:
        _render_columns(console, r)
        if r.rejects:
            _render_rejects(console, r, shown)


def _render_columns(console: Console, report: ImportReport) -> None:
    name = Path(report.file).name
    read = ", ".join(
        escape(f"{m.header} → {m.field}" + (f" [{m.unit_text}]" if m.unit_text else ""))
        for m in report.columns
    )
    how = escape(f"{name} ({report.encoding}, {_delimiter_name(report)}): ")
    console.print(f"[{STYLE_MUTED}]{how}{read}[/]")
    if report.constants:
        console.print(f"[{STYLE_MUTED}]  set from the map file: {', '.join(report.constants)}[/]")
    if report.unrecognised:
        listed = escape(", ".join(repr(h) for h in report.unrecognised))
        console.print(
            f"[{STYLE_UNVERIFIED}]  unrecognised columns, kept as extra data: {listed}[/]"
        )
    if report.ignored:
        console.print(
            f"[{STYLE_MUTED}]  ignored by the map file: {escape(', '.join(report.ignored))}[/]"
        )


def _delimiter_name(report: ImportReport) -> str:
    return {",": "comma", ";": "semicolon", "\t": "tab"}.get(report.delimiter, report.delimiter)


def _render_rejects(console: Console, report: ImportReport, shown: int) -> None:
    table = Table(title=f"First rejects of {Path(report.file).name}", title_style=STYLE_HEADING)
    for name in REJECT_COLUMNS:
        table.add_column(name, justify="right" if name == "line" else "left")
    for reject in report.rejects[:shown]:
        cells = (reject.column, reject.value, reject.reason)
        table.add_row(str(reject.line), *(escape(c) for c in cells))
    console.print(table)
    left = len(report.rejects) - shown
    if left > 0:
        console.print(f"[{STYLE_MUTED}]… and {left} more; write them all with --rejects OUT.csv[/]")


def write_rejects_csv(path: str | Path, rejects: Sequence[Reject]) -> None:
    """Write ``rejects`` to ``path`` with the columns line,column,value,reason."""
    with open(path, "w", newline="", encoding="utf-8") as out:
        writer = csv.writer(out)
        writer.writerow(REJECT_COLUMNS)
        for r in rejects:
            writer.writerow([r.line, *(neutralise_cell(t) for t in (r.column, r.value, r.reason))])


def _plain(value: object, f: Field) -> str:
    """Return ``value`` as CSV text: SI numbers in full, text neutralised."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, int | float):
        return repr(value) if f.type == "float" else str(value)
    return neutralise_cell(str(value))


def parts_csv(kind: str, parts: Sequence[dict[str, object]]) -> str:
    """Return the parts as CSV with canonical field names as headers and SI values."""
    fields = fields_of(kind)
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow([f.name for f in fields])
    for part in parts:
        writer.writerow([_plain(part.get(f.name), f) for f in fields])
    return buffer.getvalue()


def parts_json(parts: Sequence[dict[str, object]]) -> str:
    """Return the parts as a JSON array; NaN becomes null."""
    cleaned = [
        {k: (None if isinstance(v, float) and math.isnan(v) else v) for k, v in part.items()}
        for part in parts
    ]
    return json.dumps(cleaned, indent=2, ensure_ascii=False, allow_nan=False)


def _cell(value: object, f: Field) -> str:
    if value is None:
        return "—"
    if f.type == "bool":
        return "yes" if value else "no"
    if f.type == "float":
        return format_eng(float(value), f.unit)
    return str(value)


def _size_cell(part: dict[str, object]) -> str:
    sizes = [part.get(name) for name in _SIZE_FIELDS]
    if all(v is None for v in sizes):
        return "—"
    return "×".join("?" if v is None else f"{float(v):g}" for v in sizes) + " mm"


def render_parts_table(console: Console, kind: str, parts: Sequence[dict[str, object]]) -> None:
    """Print the parts as a table with engineering units (sizes as L×W×H)."""
    fields = [f for f in fields_of(kind) if f.name not in _TABLE_SKIPS]
    has_size = any(f.name in _SIZE_FIELDS for f in fields_of(kind))
    table = Table(title=f"{len(parts)} {kind} part(s)", title_style=STYLE_HEADING)
    for f in fields:
        table.add_column(f.name, justify="right" if f.type in ("float", "int") else "left")
    if has_size:
        table.add_column("size", justify="right")
    for part in parts:
        cells = [escape(_cell(part.get(f.name), f)) for f in fields]
        table.add_row(*cells, *([_size_cell(part)] if has_size else []))
    console.print(table)


def render_batches(console: Console, batches: Sequence[Batch]) -> None:
    """Print the import batches, oldest first."""
    if not batches:
        console.print(
            "No import batches yet; load a catalog with partpick import FILE --kind KIND."
        )
        return
    table = Table(title="Import batches", title_style=STYLE_HEADING)
    names = ("id", "imported_at", "kind", "file", "sha256", "rows", "added", "updated",
             "unchanged", "rejected")  # fmt: skip
    for name in names:
        table.add_column(name, justify="right" if name in ("id", "rows", "added", "updated",
                         "unchanged", "rejected") else "left")  # fmt: skip
    for b in batches:
        table.add_row(str(b.id), b.imported_at, b.kind, escape(b.file), b.sha256[:12], str(b.rows),
                      str(b.added), str(b.updated), str(b.unchanged), str(b.rejected))  # fmt: skip
    console.print(table)
