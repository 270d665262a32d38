"""Check a BOM JSON file field by field before ``verify --bom`` trusts it.

The file is often edited by hand (a part swapped, an ESR corrected), so each value is
checked against the data dictionary: a number where a number belongs (not a string, a
list or ``true``), finite, and inside its plausibility range (:mod:`partpick.ranges`);
text where text belongs; an enum value among its choices; the efficiency a fraction.
Each problem is a :class:`~partpick.errors.ParameterError` naming the role, part and field.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

from partpick.errors import ParameterError
from partpick.fields import fields_of
from partpick.ranges import outside_field_range, unusual_field_value

ROLE_KINDS = {"inductor": "inductor", "output-cap": "capacitor", "diode": "diode",
              "switch": "mosfet"}  # fmt: skip


def check_bom_part(role: str, part: Mapping[str, object], file: str) -> None:
    """Raise ParameterError for the first field of ``part`` that is not a valid value."""
    mpn = part.get("mpn")
    if mpn is not None and not isinstance(mpn, str):
        raise ParameterError("mpn", "must be text", role=role, part=file, value=mpn)
    fields = {f.name: f for f in fields_of(ROLE_KINDS[role])}
    for name, value in part.items():
        f = fields.get(name)
        if f is None or value is None:
            continue  # figures the BOM adds (losses, counts) are not catalog fields
        who = {"role": role, "part": f"{mpn or '?'} in {file}", "value": value}
        if f.type in ("float", "int"):
            _check_number(name, value, f.unit, who)
        elif f.type == "enum" and value not in f.choices:
            raise ParameterError(name, f"must be one of {', '.join(f.choices)}", **who)
        elif f.type == "bool" and not isinstance(value, bool):
            raise ParameterError(name, "must be true or false", **who)
        elif f.type == "text" and not isinstance(value, str):
            raise ParameterError(name, "must be text", **who)


def _check_number(name: str, value: object, unit: str, who: dict) -> None:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ParameterError(name, f"must be a number in SI units ({unit})", **who)
    if not math.isfinite(value):
        raise ParameterError(name, "must be a finite number", **who)
    import numpy as np

    if outside_field_range(name, np.array([float(value)]))[0]:
        unusual = unusual_field_value(name, float(value), unit)
        raise ParameterError(name, f"is implausible: {unusual.sentence()}", **who)


def check_efficiency(value: object, file: str) -> float | None:
    """Return the BOM's efficiency as a fraction; None where absent."""
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, int | float) or not 0 < value <= 1:
        raise ParameterError(
            "efficiency", "must be a fraction in (0, 1], e.g. 0.92", part=file, value=value
        )
    return float(value)
