"""partpick: from a DC-DC boost spec to checked, orderable parts from your own catalogs."""

__version__ = "0.1.0"
