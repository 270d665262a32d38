"""The registry of converter topologies: name -> model object satisfying ``Topology``.

Add a topology by writing its module (same shape as :mod:`.boost`) and listing it in
``_FACTORIES``; nothing else changes.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import cache
from typing import TYPE_CHECKING

from partpick.errors import SpecError

if TYPE_CHECKING:
    from partpick.design.spec import Spec
    from partpick.design.topologies.base import Envelope, Topology


def _boost() -> Topology:
    from partpick.design.topologies.boost import BoostTopology

    return BoostTopology()


_FACTORIES: dict[str, Callable[[], Topology]] = {"boost": _boost}

TOPOLOGY_NAMES = tuple(_FACTORIES)


@cache
def _instance(name: str) -> Topology:
    return _FACTORIES[name]()


def get_topology(name: str, *, source: str | None = None) -> Topology:
    """Return the topology called ``name``; SpecError(key="topology") if there is none.

    ``source`` names the spec file for the error message.
    """
    key = name.strip().lower() if isinstance(name, str) else name
    if key not in _FACTORIES:
        known = ", ".join(TOPOLOGY_NAMES)
        raise SpecError(
            key="topology",
            value=name,
            file=source,
            reason=f"unknown topology; partpick knows: {known} (a buck or buck-boost/SEPIC "
            "model is not written yet)",
        )
    return _instance(key)


def analyse(spec: Spec) -> Envelope:
    """Return the worst-case envelope of ``spec`` under its own topology."""
    return get_topology(spec.topology, source=spec.source).envelope(spec)
