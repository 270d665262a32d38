"""Screening: check catalog parts against a design's stresses under a derating profile.

* :mod:`.profiles`: the derating policies (``standard``, ``high-rel``, company TOML files).
* :mod:`.checks`: Check and Outcome data, and the array form every rule returns.
* :mod:`.inductor`, :mod:`.capacitor`, :mod:`.diode`, :mod:`.switch`: one rule set per part
  kind, each vectorised over every part of that kind.
* :mod:`.pick`: the role table, classification into passed / unverified / failed, ranking.
"""
