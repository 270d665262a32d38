"""The roles a part can fill and the catalog kind each one draws from: the one place they meet.

Kept free of numpy so the CLI can list the roles in its help without loading the rules.
"""

from __future__ import annotations

ROLE_KINDS: dict[str, str] = {
    "inductor": "inductor",
    "input-cap": "capacitor",
    "output-cap": "capacitor",
    "diode": "diode",
    "switch": "mosfet",
}
ROLES: tuple[str, ...] = tuple(ROLE_KINDS)
