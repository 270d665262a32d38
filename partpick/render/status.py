"""The one set of status words every output uses: passed, unverified, failed, no part.

A part, a BOM line and a check all say it the same way, in the table, Markdown, CSV and JSON.
Inside the core a check keeps its short codes ("pass", "fail"); they become words here.
"""

from __future__ import annotations

PASSED, UNVERIFIED, FAILED, NO_PART = "passed", "unverified", "failed", "no part"
STATUS_WORDS: tuple[str, ...] = (PASSED, UNVERIFIED, FAILED, NO_PART)
_CHECK_WORDS = {"pass": PASSED, "fail": FAILED, "unverified": UNVERIFIED}


def check_status_word(status: str) -> str:
    """Return the status word of a check ("pass" → "passed", "fail" → "failed")."""
    return _CHECK_WORDS.get(status, status)
