"""Find the parts to verify, from the catalog by part number or from a saved BOM, and run.

:func:`verify_selection` is the one core call behind ``partpick verify``: it resolves the
parts, builds the :class:`~partpick.verify.stage.Stage` with the profile's hot factor and the
user's overrides, and solves every operating point.
"""

from __future__ import annotations

import json
import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from partpick.errors import NotFoundError, ParameterError
from partpick.verify.bom_check import check_bom_part, check_efficiency
from partpick.verify.ratings import ratings_from_parts
from partpick.verify.stage import ROLES, stage_from_parts
from partpick.verify.sweep import VerifyResult, default_points, verify_design

MAX_OUTPUT_COUNT = 1000  # common practice, no published source: no bank is larger

ROLE_KINDS: dict[str, str] = {
    "inductor": "inductor",
    "output-cap": "capacitor",
    "diode": "diode",
    "switch": "mosfet",
}


def find_part(db: str | None, role: str, mpn: str) -> dict[str, object]:
    """Return the catalog fields of part ``mpn`` for ``role`` (exact, else case-insensitive).

    Raises NotFoundError when no part, or more than one manufacturer's part, has that number.
    """
    from partpick.catalog.columns import describe_parts, mpn_hits, read_columns

    kind = ROLE_KINDS[role]
    columns = read_columns(db, kind)
    numbers = columns["mpn"]
    hits = mpn_hits(numbers, mpn)  # exact, else ignoring case and surrounding spaces
    if hits.size == 0:
        raise NotFoundError(
            f"{kind}", mpn, "Check the part number, or import its catalog with partpick import."
        )
    if hits.size > 1:
        listed = describe_parts(numbers, columns["manufacturer"], hits)
        raise NotFoundError(f"single {kind}", mpn, f"{hits.size} parts match: {listed}; use --bom.")
    row = int(hits[0])
    return {name: _plain(values[row]) for name, values in columns.items()}


def _plain(value: object) -> object:
    if isinstance(value, np.floating):
        value = float(value)
    if isinstance(value, float) and math.isnan(value):
        return None
    return value


@dataclass(frozen=True)
class BomSelection:
    """The parts of a saved BOM: fields per role, the output count, its efficiency, profile."""

    parts: dict[str, dict[str, object]]
    output_count: int
    efficiency: float | None
    profile: str | None


def parts_from_bom(path: str | Path, db: str | None) -> BomSelection:
    """Return the parts of the BOM JSON at ``path`` (the document ``partpick bom`` writes).

    A line's ``part`` fields are used where present, on top of the part's catalog row where
    the catalog holds it (for the loss-only figures a BOM line does not carry); otherwise its
    ``mpn`` is looked up in the catalog. The output-cap line's ``qty`` is the output count.
    """
    document = _read_bom(path)
    lines = {line.get("role"): line for line in document["lines"] if isinstance(line, dict)}
    parts: dict[str, dict[str, object]] = {}
    for role in ROLES:
        line = lines.get(role)
        if line is None or not line.get("mpn"):
            raise ParameterError(role, "has no part in this BOM", part=str(path))
        if not isinstance(line["mpn"], str):
            mpn = line["mpn"]
            raise ParameterError("mpn", "must be text", role=role, part=str(path), value=mpn)
        part = line.get("part")
        if part is not None and not isinstance(part, dict):
            raise ParameterError("part", "must be a table of fields", role=role, part=str(path))
        if isinstance(part, dict) and part:
            check_bom_part(role, {"mpn": line["mpn"], **part}, str(path))
            parts[role] = full_part(db, role, str(line["mpn"]), part)
        else:
            parts[role] = find_part(db, role, str(line["mpn"]))
    qty = lines["output-cap"].get("qty", 1)
    if isinstance(qty, bool) or not isinstance(qty, int) or not 1 <= qty <= MAX_OUTPUT_COUNT:
        raise ParameterError(
            "qty", f"of the output-cap line must be a whole number 1 to {MAX_OUTPUT_COUNT}",
            value=qty,
        )  # fmt: skip
    efficiency = check_efficiency(document.get("efficiency"), str(path))
    profile = document.get("profile")
    return BomSelection(
        parts=parts,
        output_count=qty,
        efficiency=efficiency,
        profile=profile if isinstance(profile, str) else None,
    )


def full_part(
    db: str | None, role: str, mpn: str, fields: Mapping[str, object]
) -> dict[str, object]:
    """Return ``fields`` of part ``mpn`` on top of its full catalog row (where it has one)."""
    return {**_catalog_row(db, role, mpn), "mpn": mpn, **fields}


def _catalog_row(db: str | None, role: str, mpn: str) -> dict[str, object]:
    """Return the part's full catalog row, or {} where the catalog does not hold it.

    A BOM line keeps only the fields its role's rules read; the loss-only figures (Qg, Cj,
    leakage, core-loss data) come from the catalog where it still lists the part.
    """
    from partpick.errors import PartpickError

    try:
        return {k: v for k, v in find_part(db, role, mpn).items() if v is not None}
    except PartpickError:
        return {}


MAX_BOM_BYTES = 64 << 20  # a BOM with its verification is a few MB; a device never ends


def _bom_bytes(path: str | Path) -> bytes:
    with open(path, "rb") as handle:
        data = handle.read(MAX_BOM_BYTES + 1)
    if len(data) > MAX_BOM_BYTES:
        raise ParameterError(str(path), "is not a BOM JSON file: it is larger than 64 MiB")
    return data


def _read_bom(path: str | Path) -> dict[str, Any]:
    name = str(path)
    try:
        document = json.loads(_bom_bytes(path).decode("utf-8"))
    except OSError as exc:
        raise NotFoundError("BOM file", name, exc.strerror or "") from None
    except RecursionError:
        raise ParameterError(name, "is not a BOM JSON file: it is nested too deeply") from None
    except (json.JSONDecodeError, UnicodeDecodeError) as exc:
        raise ParameterError(name, f"is not a BOM JSON file: {exc}") from None
    if not isinstance(document, dict) or not isinstance(document.get("lines"), list):
        raise ParameterError(name, 'is not a BOM JSON file: it has no "lines" list')
    return document


def verify_selection(
    spec: Any,
    *,
    db: str | None,
    mpns: Mapping[str, str | None] | None = None,
    bom_file: str | Path | None = None,
    output_count: int | None = None,
    profile_name: str | None = None,
    overrides: Mapping[str, float] | None = None,
    extra_vin_v: Iterable[float] = (),
    extra_iout_a: Iterable[float] = (),
    duty: float | None = None,
) -> VerifyResult:
    """Return the verification of the named parts (``mpns``, role → MPN) or a saved BOM.

    Exactly one of ``mpns`` and ``bom_file`` names the parts. ``output_count`` overrides the
    BOM's count (default 1 with named parts). The profile (default: the BOM's, else
    ``standard``) gives the hot factor and the effective-capacitance figures.
    """
    from partpick.screening.profiles import load_profile

    efficiency = None
    if bom_file is not None:
        if mpns and any(mpns.values()):
            raise ParameterError("--bom", "names the parts already; drop the part options")
        selection = parts_from_bom(bom_file, db)
        parts, count = selection.parts, output_count or selection.output_count
        efficiency, profile_name = selection.efficiency, profile_name or selection.profile
    else:
        parts, count = _named_parts(db, mpns or {}), output_count or 1
    profile = load_profile(profile_name or "standard")
    stage = stage_from_parts(
        spec,
        parts,
        hot_factor=profile.value("switch.hot_factor"),
        output_count=count,
        overrides=overrides,
        profile=profile,
    )
    points = default_points(spec, extra_vin_v, extra_iout_a)
    return verify_design(
        spec,
        stage,
        points,
        duty=duty,
        efficiency_estimate=efficiency,
        ccm_assumed_down_to_a=_ccm_floor(spec),
        ratings=ratings_from_parts(spec, parts, profile),
    )


def _named_parts(db: str | None, mpns: Mapping[str, str | None]) -> dict[str, dict[str, object]]:
    missing = [role for role in ROLES if not mpns.get(role)]
    if missing:
        flags = ", ".join(f"--{role}" for role in missing)
        raise ParameterError(
            "parts", f"are incomplete: give {flags} (or the whole set with --bom BOM.json)"
        )
    return {role: find_part(db, role, str(mpns[role])) for role in ROLES}


def _ccm_floor(spec: Any) -> float:
    """Return the lightest load the design assumed to be in CCM (issue 3's envelope)."""
    from partpick.design.topologies import analyse

    envelope = analyse(spec)
    if envelope.ccm_light_load and spec.iout_min_a:
        return float(spec.iout_min_a)
    return float(spec.iout_a)
