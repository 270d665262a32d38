"""Render catalog results: import summaries, rejects files, part lists and import batches."""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Callable, Iterator, Sequence
from contextlib import contextmanager
from pathlib import Path
from typing import TYPE_CHECKING

from rich import box
from rich.console import Console
from rich.markup import escape
from rich.progress import BarColumn, DownloadColumn, Progress, TextColumn, TimeRemainingColumn
from rich.text import Text

from partpick.fields import KIND_FIELDS, LOSS_MODEL_FIELDS, Field, fields_of
from partpick.outputs import write_output
from partpick.render.console import STYLE_FAIL, STYLE_HEADING, STYLE_MUTED, STYLE_UNVERIFIED
from partpick.render.exports import json_text, tidy_number
from partpick.render.safe_text import Table
from partpick.units import format_eng

if TYPE_CHECKING:  # the catalog core pulls in pandas and SQLAlchemy; only commands need them
    from partpick.catalog.headers import Unread
    from partpick.catalog.importer import ImportProgress, ImportReport, Reject
    from partpick.catalog.store import Batch
    from partpick.screening.coverage import FieldEntry, FieldGap

_JSON_REJECTS = 100  # the rest are in --rejects OUT.csv
REJECT_COLUMNS = ("line", "column", "value", "reason")
# OWASP "CSV Injection": a cell starting with one of these may run as a spreadsheet formula.
_FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")
_PROGRESS_MIN_BYTES = 1 << 20


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
                label = f"importing {escape(name)}"
                tasks[step.file] = bar.add_task(label, total=step.bytes_total)
            bar.update(tasks[step.file], completed=step.bytes_done)

        yield hook


def render_import_reports(
    console: Console,
    reports: Sequence[ImportReport],
    shown: int = 10,
    gaps: Sequence[Sequence[FieldGap]] | None = None,
) -> None:
    """Print the summary table of an import, then per file its columns, what the missing
    columns cost (``gaps``, one sequence per report) and its first rejects."""
    table = Table(title="Import summary", title_style=STYLE_HEADING)
    for name in ("file", "kind", "rows", "added", "updated", "unchanged", "rejected"):
        table.add_column(name, justify="left" if name in ("file", "kind") else "right")
    for r in reports:
        rejected = Text(str(r.rejected), style=STYLE_FAIL) if r.rejected else "0"
        table.add_row(Path(r.file).name, r.kind, str(r.rows), str(r.added), str(r.updated),
                      str(r.unchanged), rejected)  # fmt: skip
    console.print(table)
    for i, r in enumerate(reports):
        _render_columns(console, r)
        for sentence in coverage_sentences(gaps[i] if gaps else (), parts_of(r)):
            console.print(f"[{STYLE_UNVERIFIED}]  {escape(sentence)}[/]")
        if r.rejects:
            _render_rejects(console, r, shown)
        for note in getattr(r, "unusual", ())[:shown]:
            console.print(Text(f"  warning: line {note.line}, {note.column}: {note.reason}",
                               style=STYLE_UNVERIFIED))  # fmt: skip


def _render_columns(console: Console, report: ImportReport) -> None:
    name = Path(report.file).name
    read = ", ".join(
        escape(f"{m.header} → {m.field}" + (f" [{m.unit_text}]" if m.unit_text else ""))
        for m in report.columns
    )
    how = escape(f"{name} ({report.encoding}, {_delimiter_name(report)}): ")
    console.print(f"[{STYLE_MUTED}]{how}{read}[/]")
    if report.constants:
        constants = escape(", ".join(report.constants))
        console.print(f"[{STYLE_MUTED}]  set from the map file: {constants}[/]")
    if report.unrecognised:
        listed = escape(", ".join(repr(h) for h in report.unrecognised))
        console.print(
            f"[{STYLE_UNVERIFIED}]  unrecognised columns, kept as extra data: {listed}[/]"
        )
    for hint in unread_hints(report.unread):
        console.print(f"[{STYLE_UNVERIFIED}]    {escape(hint)}[/]")
    if report.ignored:
        console.print(
            f"[{STYLE_MUTED}]  ignored by the map file: {escape(', '.join(report.ignored))}[/]"
        )


def parts_of(report: ImportReport) -> int:
    """Return how many parts of the file are in the catalog after the import."""
    return report.added + report.updated + report.unchanged


def coverage_sentences(gaps: Sequence[FieldGap], parts: int) -> list[str]:
    """Return one sentence per missing field: which checks it costs the file's parts.

    Parts whose description stated the value (``FieldGap.inferred``) lose nothing; the
    sentence says so and counts only the rest.
    """
    if parts == 0:
        return []
    out = []
    for gap in gaps:
        rest = max(parts - gap.inferred, 0)
        stated = ""
        if gap.inferred:
            some = "every part" if rest == 0 else f"{gap.inferred} of {parts} parts"
            stated = f"read from the description for {some}"
        if rest == 0:
            out.append(f"no column for {gap.field}: {stated}")
            continue
        out.append(f"no column for {gap.field}: " + "; ".join(
            filter(None, (stated, _lost_checks(gap, rest, others=bool(gap.inferred))))
        ))  # fmt: skip
    return out


def _lost_checks(gap: FieldGap, count: int, others: bool) -> str:
    """Return what ``count`` parts without the field lose: a role left unverified, or checks."""
    if others:
        these = "the other part" if count == 1 else f"the other {count} parts"
        every = these
    else:
        these = "this part" if count == 1 else f"these {count} parts"
        every = "the one part" if count == 1 else f"all {count} parts"
    if gap.unverified_roles:
        roles = " and ".join(gap.unverified_roles)
        rules = ", ".join(dict.fromkeys(g.rule for g in gap.rules if not g.optional))
        noun = "role" if len(gap.unverified_roles) == 1 else "roles"
        return f"{every} will be unverified for the {roles} {noun} ({rules} check)"
    rules = " and ".join(dict.fromkeys(g.rule for g in gap.skipped))
    return f"the {rules} check is skipped for {these}"


def import_json(reports: Sequence[ImportReport], gaps: Sequence[Sequence[FieldGap]]) -> str:
    """Return the import as JSON: per file the header map, the unread headers with their
    hints, the missing fields with the rules they cost, the counts and the first rejects."""
    return json_text([_import_document(r, g) for r, g in zip(reports, gaps, strict=True)])


def _import_document(report: ImportReport, gaps: Sequence[FieldGap]) -> dict[str, object]:
    sentences = coverage_sentences(gaps, parts_of(report)) or [None] * len(gaps)
    return {
        "file": report.file,
        "kind": report.kind,
        "sha256": report.sha256,
        "encoding": report.encoding,
        "delimiter": report.delimiter,
        "counts": {
            "rows": report.rows, "parts": parts_of(report), "added": report.added,
            "updated": report.updated, "unchanged": report.unchanged,
            "rejected": report.rejected,
        },
        "columns": [
            {"header": m.header, "field": m.field, "unit": m.unit_text, "scale": m.scale,
             "matched_by": m.via, "condition": m.condition or None}
            for m in report.columns
        ],
        "unread": [
            {"header": u.header, "candidates": list(u.candidates), "reason": u.reason,
             "map_line": u.map_line or None}
            for u in report.unread
        ],
        "ignored": list(report.ignored),
        "constants": list(report.constants),
        "missing": [
            {"field": g.field, "unverified_roles": list(g.unverified_roles),
             "inferred_parts": g.inferred,
             "rules": [{"role": r.role, "rule": r.rule, "optional": r.optional}
                       for r in g.rules],
             "consequence": sentence}
            for g, sentence in zip(gaps, sentences, strict=True)
        ],
        "rejects": [
            {"line": r.line, "column": r.column, "value": r.value, "reason": r.reason}
            for r in report.rejects[:_JSON_REJECTS]
        ],
    }  # fmt: skip


def unread_hints(unread: Sequence[Unread]) -> list[str]:
    """Return one sentence per unread header that might be a field, with the map-file line."""
    hints = []
    for u in unread:
        if not u.candidates:
            continue
        if len(u.candidates) > 1:
            what = f"{u.header!r} could be {' or '.join(u.candidates)}."
        elif "already" in u.reason:
            what = f"{u.header!r} also reads as {u.candidates[0]}; {u.reason}."
        elif "close" in u.reason:
            what = f"{u.header!r}: did you mean {u.candidates[0]}?"
        else:
            what = f"{u.header!r} looks like {u.candidates[0]} but was not read: {u.reason}."
        hints.append(f"{what} To read it, add {u.map_line} under [columns] in a map file.")
    return hints


def _delimiter_name(report: ImportReport) -> str:
    return {",": "comma", ";": "semicolon", "\t": "tab"}.get(report.delimiter, report.delimiter)


def _render_rejects(console: Console, report: ImportReport, shown: int) -> None:
    table = Table(title=f"First rejects of {Path(report.file).name}", title_style=STYLE_HEADING)
    for name in REJECT_COLUMNS:
        table.add_column(name, justify="right" if name == "line" else "left")
    for reject in report.rejects[:shown]:
        cells = (reject.column, reject.value, reject.reason)
        table.add_row(str(reject.line), *cells)
    console.print(table)
    left = len(report.rejects) - shown
    if left > 0:
        console.print(f"[{STYLE_MUTED}]… and {left} more; write them all with --rejects OUT.csv[/]")


def write_rejects_csv(path: str | Path, rejects: Sequence[Reject]) -> None:
    """Write ``rejects`` to ``path`` (atomically) with the columns line,column,value,reason."""
    buffer = io.StringIO()
    writer = csv.writer(buffer)
    writer.writerow(REJECT_COLUMNS)
    for r in rejects:
        writer.writerow([r.line, *(neutralise_cell(t) for t in (r.column, r.value, r.reason))])
    write_output(path, buffer.getvalue(), "--rejects")


def _plain(value: object, f: Field) -> str:
    """Return ``value`` as CSV text: SI numbers in full, text neutralised."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, int | float):
        return repr(tidy_number(float(value))) if f.type == "float" else str(value)
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
    """Return the parts as a JSON array; NaN becomes null, floats have ≤ 12 significant digits."""
    return json_text(list(parts)).rstrip("\n")


def _cell(value: object, f: Field) -> str:
    if value is None:
        return "—"
    if f.type == "bool":
        return "yes" if value else "no"
    if f.type in ("float", "int"):
        return format_eng(float(value), f.unit)
    return str(value)


_UNIT_SUFFIXES = ("_degc_w", "_degc", "_ohm", "_hz", "_mm", "_h", "_f", "_a", "_v", "_s", "_c")
_LABELS = {"unit_price": "price", "diode_type": "type", "dielectric": "dielectric"}


def column_label(name: str) -> str:
    """Return a short table heading for a field: its name without the unit suffix."""
    if name in _LABELS:
        return _LABELS[name]
    for suffix in _UNIT_SUFFIXES:
        if name.endswith(suffix):
            return name[: -len(suffix)]
    return name


def table_fields(kind: str) -> list[Field]:
    """Return the value fields a terminal table shows: the kind's own fields, price, stock.

    Fields several kinds share (tolerance, sizes, thermal data) are left to the CSV and JSON
    formats, which carry every field, so the table fits a 100-column terminal.
    """
    shared = {f.name for k, fs in KIND_FIELDS.items() if k != kind for f in fs}
    own = [f for f in KIND_FIELDS[kind] if f.name not in shared and f.name not in LOSS_MODEL_FIELDS]
    common = {f.name: f for f in fields_of(kind)}
    return [*own, common["unit_price"], common["stock"]]


def render_parts_table(console: Console, kind: str, parts: Sequence[dict[str, object]]) -> None:
    """Print the parts as a table with engineering units, the maker under each part number."""
    fields = table_fields(kind)
    table = Table(
        title=f"{len(parts)} {kind} part(s)",
        title_style=STYLE_HEADING,
        box=box.SIMPLE_HEAD,
        padding=(0, 1),
        pad_edge=False,
        caption="every field: --format csv or --format json" if parts else None,
        caption_style=STYLE_MUTED,
    )
    table.add_column("part number / maker", no_wrap=True)
    for f in fields:
        numeric = f.type in ("float", "int")
        table.add_column(column_label(f.name), justify="right" if numeric else "left")
    for part in parts:
        maker = part.get("manufacturer") or "—"
        name = Text(str(part["mpn"]))
        name.append("\n" + str(maker), style=STYLE_MUTED)
        table.add_row(name, *(_cell(part.get(f.name), f) for f in fields))
    console.print(table)


def render_batches(console: Console, batches: Sequence[Batch]) -> None:
    """Print the import batches, oldest first (file names; the full path is in the database)."""
    if not batches:
        console.print(
            "No import batches yet; load a catalog with partpick import FILE --kind KIND."
        )
        return
    table = Table(
        title="Import batches",
        title_style=STYLE_HEADING,
        box=box.SIMPLE_HEAD,
        pad_edge=False,
        caption="counts: added/updated/unchanged/rejected rows",
        caption_style=STYLE_MUTED,
    )
    table.add_column("id", justify="right", no_wrap=True)
    table.add_column("imported (UTC)", no_wrap=True)
    table.add_column("kind", no_wrap=True, min_width=9)
    table.add_column("file", overflow="fold", min_width=12)
    table.add_column("sha256", no_wrap=True)
    table.add_column("counts", justify="right", no_wrap=True)
    who = any(b.imported_by for b in batches)  # recorded since schema 5
    if who:
        table.add_column("by", overflow="fold")
    for b in batches:
        when = b.imported_at.replace("T", " ")[:16]
        counts = "/".join(map(str, (b.added, b.updated, b.unchanged, b.rejected)))
        cells = [str(b.id), when, b.kind, Path(b.file).name, b.sha256[:10], counts]
        table.add_row(*cells, *([b.imported_by or "-"] if who else []))
    console.print(table)


def render_fields_table(console: Console, entries: Sequence[FieldEntry]) -> None:
    """Print the data dictionary: per kind, each field with its unit, description, the rules
    that use it and the header wordings it is read from."""
    kind = None
    for e in entries:
        if e.kind != kind:
            kind = e.kind
            console.print(Text(f"{kind} fields", style=STYLE_HEADING))
        console.print(Text.assemble((f"  {e.name}", "bold"), f"  {_unit_text(e)}  ",
                                    (e.description, STYLE_MUTED)))  # fmt: skip
        rules = ", ".join(dict.fromkeys(f"{g.role} {g.rule}" for g in e.rules))
        if rules:
            console.print(Text(f"      used by: {rules}"))
        if e.wordings:
            console.print(Text(f"      headers: {'; '.join(e.wordings)}"))
        if e.ambiguous:
            never = "; ".join(e.ambiguous)
            console.print(Text(f"      never read alone (may be another field): {never}"))


def fields_json(entries: Sequence[FieldEntry]) -> str:
    """Return the data dictionary as a JSON array, one object per field of each kind."""
    return json_text(
        [
            {
                "kind": e.kind, "field": e.name, "type": e.type, "unit": e.unit or None,
                "description": e.description,
                "rules": [{"role": g.role, "rule": g.rule, "optional": g.optional}
                          for g in e.rules],
                "wordings": list(e.wordings), "choices": list(e.choices),
                "ambiguous_wordings": list(e.ambiguous),
            }
            for e in entries
        ]
    )  # fmt: skip


def _unit_text(entry: FieldEntry) -> str:
    if entry.type == "enum":
        return "one of " + ", ".join(entry.choices)
    if entry.type == "bool":
        return "yes/no"
    return entry.unit or entry.type
