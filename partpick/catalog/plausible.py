"""Refuse catalog values no real part has (see :mod:`partpick.ranges`), chunk by chunk."""

from __future__ import annotations

import dataclasses

import numpy as np

from partpick.catalog.reading import Chunk, Reject
from partpick.fields import fields_of
from partpick.ranges import outside_field_range, unusual_field_value


def screen_chunk(
    chunk: Chunk, kind: str, headers: dict[str, str], allow_unusual: bool
) -> tuple[Chunk, list[Reject]]:
    """Return the chunk without rows holding an implausible value, and one note per value.

    With ``allow_unusual`` every row is kept and the notes are warnings; otherwise the notes
    are the rejects of the rows removed (already added to the chunk's rejects).
    """
    units = {f.name: f.unit for f in fields_of(kind)}
    bad = np.zeros(len(chunk.lines), dtype=bool)
    notes: list[Reject] = []
    for name, column in chunk.values.items():
        if name not in units or not isinstance(column, np.ndarray):
            continue
        outside = outside_field_range(name, column)
        for row in np.flatnonzero(outside & ~bad):
            unusual = unusual_field_value(name, float(column[row]), units[name])
            advice = (
                "accepted (--allow-unusual)"
                if allow_unusual
                else ("check the unit, or import with --allow-unusual")
            )
            notes.append(Reject(int(chunk.lines[row]), headers.get(name, name),
                                f"{column[row]:g}", f"{unusual.sentence()}; {advice}"))  # fmt: skip
        bad |= outside
    if allow_unusual or not bad.any():
        return chunk, notes
    good = ~bad
    kept = {name: column[good] for name, column in chunk.values.items()}
    return dataclasses.replace(
        chunk, values=kept, lines=chunk.lines[good], rejects=chunk.rejects + notes
    ), notes
