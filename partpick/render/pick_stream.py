"""Write a whole pick as JSON or JSON Lines, a slice of parts at a time, straight from the arrays.

A full ``--format json`` of 250,000 parts is too big to build as one object: a dict per part,
a Check per rule and a sentence per failure cost tens of seconds and gigabytes (measured).
Here each list is written :data:`SLICE` parts at a time: the slice's columns become Python
values once, each part becomes one small dict, and orjson encodes it (NaN and infinity as
null, so the output is valid JSON). Memory stays at the screening arrays plus one slice.

``--format json`` keeps the one-object contract (head fields, then ``passed``,
``unverified`` and ``failed``), one part per line inside the lists. ``--format jsonl`` writes
one part per line with its ``status``, for pipes. The sentence of a failing check is written
only with ``messages=True``: its rule data (stress, limit, utilisation, worst input voltage)
is always there.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import BinaryIO

import numpy as np
import orjson

from partpick.render.exports import tidy_array, tidy_document
from partpick.render.pick import check_sentence, operating_point_json, profile_json
from partpick.screening.checks import FAIL, SKIPPED, UNVERIFIED
from partpick.screening.pick import STATUS_NAMES, RankedRole

SLICE = 4096  # parts converted and written at a time: large enough to amortise numpy calls
_RULE_FIGURES = ("stress", "limit", "utilisation", "worst_vin_v")
# JSON key -> screening column, for the kinds whose rules derive a figure per part
_DERIVED_JSON = (("c_eff_f", "capacitance_eff_f"), ("dc_bias_kept", "dc_bias_kept"))


def write_pick_json(ranked: RankedRole, out: BinaryIO, *, messages: bool = False) -> None:
    """Write the ``partpick pick --format json`` object to the binary stream ``out``."""
    head = orjson.dumps(tidy_document(pick_head(ranked)), option=orjson.OPT_INDENT_2)
    out.write(head[:-2] + b",\n")  # reopen the object after its last field
    for position, name in enumerate(STATUS_NAMES):
        out.write(b'  "' + name.encode() + b'": [')
        first = True
        for entries in part_entries(ranked, name, messages=messages):
            lead = b"\n    " if first else b",\n    "
            out.write(lead + b",\n    ".join(map(orjson.dumps, entries)))
            first = False
        out.write((b"]" if first else b"\n  ]") + (b",\n" if position < 2 else b"\n}\n"))


def write_pick_jsonl(ranked: RankedRole, out: BinaryIO, *, messages: bool = False) -> None:
    """Write one JSON object per line and part (``status`` first), passed first, failed last."""
    for name in STATUS_NAMES:
        for entries in part_entries(ranked, name, messages=messages):
            out.write(b"".join(orjson.dumps({"status": name, **e}) + b"\n" for e in entries))


def pick_head(ranked: RankedRole) -> dict[str, object]:
    """Return the fields of the JSON object that come before the three lists."""
    return {
        "role": ranked.role,
        "profile": profile_json(ranked.profile),
        "stress": ranked.envelope.to_dict(),
        "operating_point": operating_point_json(ranked.screen.operating_point),
        "rank": ranked.rank,
        "max_parallel": ranked.max_parallel,
        "total": ranked.screen.size,
        "counts": dict(ranked.counts),
        "fail_counts": dict(ranked.fail_counts),
        "requirements": [r.to_dict() for r in ranked.screen.requirements],
    }


def part_entries(
    ranked: RankedRole, name: str, *, messages: bool = False
) -> Iterator[list[dict[str, object]]]:
    """Yield the entries of list ``name`` ("passed", "unverified", "failed"), a slice at a time.

    A passed or unverified entry carries its made checks (unverified ones also ``missing``);
    a failed entry carries its failing checks as ``reasons``.
    """
    order = ranked.orders[name]
    for start in range(0, order.size, SLICE):
        part = _Slice(ranked, order[start : start + SLICE], messages)
        yield part.failed_entries() if name == "failed" else part.entries(name == "unverified")


class _Slice:
    """One slice of a list: each part's made (or failing) checks, built rule by rule."""

    def __init__(self, ranked: RankedRole, indices: np.ndarray, messages: bool) -> None:
        screen = ranked.screen
        self.screen, self.indices, self.messages = screen, indices, messages
        self.mpn = screen.columns["mpn"][indices].tolist()
        self.manufacturer = screen.columns["manufacturer"][indices].tolist()
        self.count = screen.count[indices].tolist()

    def checks(self, wanted: Callable[[np.ndarray], np.ndarray]) -> list[list[dict]]:
        """Return per part the check entries of the rules where ``wanted(status)`` holds.

        Each rule's figures are gathered for the parts it concerns only, in one numpy take
        per figure, and the entries are appended in rule order.
        """
        per_part: list[list[dict]] = [[] for _ in range(self.indices.size)]
        for rule in self.screen.rules:
            rows = np.flatnonzero(wanted(rule.status[self.indices]))
            at = self.indices[rows]
            figures = [tidy_array(getattr(rule, key)[at]).tolist() for key in _RULE_FIGURES]
            entries = [
                {"rule": rule.rule, "stress": s, "limit": lim, "utilisation": u, "worst_vin_v": w}
                for s, lim, u, w in zip(*figures, strict=True)
            ]
            positions = rows.tolist()
            if rule.fixes:
                _add_fixes(entries, rule, at)
            if self.messages:
                for entry, check, j in zip(entries, rule.checks_for(at), positions, strict=True):
                    entry["message"] = check_sentence(check, self.count[j])
            for j, entry in zip(positions, entries, strict=True):
                per_part[j].append(entry)
        return per_part

    def missing(self) -> list[list[str]]:
        """Return per part the fields its unverified checks lack, in rule order, once each."""
        per_part: list[list[str]] = [[] for _ in range(self.indices.size)]
        for rule in self.screen.rules:
            unverified = rule.status[self.indices] == UNVERIFIED
            for name, mask in rule.missing:
                for j in np.flatnonzero(unverified & mask[self.indices]).tolist():
                    if name not in per_part[j]:
                        per_part[j].append(name)
        return per_part

    def entries(self, with_missing: bool) -> list[dict[str, object]]:
        screen, at = self.screen, self.indices
        loss = tidy_array(screen.loss_w[at]).tolist()
        price = tidy_array(screen.columns["unit_price"][at]).tolist()
        notes = [(text, mask[at].tolist()) for text, mask in screen.notes]
        checks = self.checks(lambda status: status != SKIPPED)
        missing = self.missing() if with_missing else None
        derived = self.derived()
        out = []
        for j in range(at.size):
            entry = {
                "mpn": self.mpn[j],
                "manufacturer": self.manufacturer[j] or "",
                "count": self.count[j],
                "loss_w": loss[j],
                "unit_price": price[j],
                "checks": checks[j],
                "notes": [text for text, mask in notes if mask[j]],
            }
            if missing is not None:
                entry["missing"] = missing[j]
            entry.update({key: values[j] for key, values in derived.items()})
            out.append(entry)
        return out

    def derived(self) -> dict[str, list]:
        """Return the per-part figures a capacitor's checks used (C_eff and its DC-bias share)."""
        columns = self.screen.columns
        return {
            key: columns[column][self.indices].tolist()
            for key, column in _DERIVED_JSON
            if column in columns
        }

    def failed_entries(self) -> list[dict[str, object]]:
        reasons = self.checks(lambda status: status == FAIL)
        derived = self.derived()
        return [
            {
                "mpn": mpn,
                "manufacturer": manufacturer or "",
                "reasons": failing,
                **{key: values[j] for key, values in derived.items()},
            }
            for j, (mpn, manufacturer, failing) in enumerate(
                zip(self.mpn, self.manufacturer, reasons, strict=True)
            )
        ]


def _add_fixes(entries: list[dict], rule, at: np.ndarray) -> None:
    """Give each failing entry the single figures that would make it pass (``fixes``)."""
    failing = (rule.status[at] == FAIL).tolist()
    columns = [(name, cmp, tidy_array(values[at]).tolist(), unit)
               for name, cmp, values, unit in rule.fixes]  # fmt: skip
    for j, entry in enumerate(entries):
        if failing[j]:
            entry["fixes"] = [
                {"field": name, "comparison": cmp, "value": values[j], "unit": unit}
                for name, cmp, values, unit in columns
                if values[j] == values[j] and values[j] > 0
            ]
