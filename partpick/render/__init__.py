"""Renderers: the only package that turns results into text, tables and files.

Every ``rich`` import lives here (a ruff banned-api rule keeps it out of the core).
"""
