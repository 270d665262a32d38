"""Placeholder until its issue lands: registers no command yet."""

import typer


def register(app: typer.Typer) -> None:
    """Add this module's commands to app."""
