"""Every command has help text and is named in the README's tour."""

from pathlib import Path

import pytest
from typer.main import get_command
from typer.testing import CliRunner

from partpick.cli import app

README = (Path(__file__).parents[1] / "README.md").read_text()
COMMANDS = sorted(get_command(app).commands)  # type: ignore[attr-defined]


def test_the_expected_commands_exist():
    assert set(COMMANDS) >= {"import", "parts", "batches", "stress", "pick", "bom", "verify"}


@pytest.mark.parametrize("name", COMMANDS)
def test_command_has_help(name):
    result = CliRunner().invoke(app, [name, "--help"])
    assert result.exit_code == 0, result.output
    assert get_command(app).commands[name].help  # type: ignore[attr-defined]


@pytest.mark.parametrize("name", COMMANDS)
def test_command_is_in_the_readme(name):
    assert f"`partpick {name}" in README


def test_version():
    result = CliRunner().invoke(app, ["--version"])
    assert result.exit_code == 0 and result.output.startswith("partpick ")
