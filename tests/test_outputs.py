"""The output-path policy: checked before any work, atomic, modes kept, symlinks followed."""

from __future__ import annotations

import os
import shutil
import stat
import subprocess
import sys
import tempfile
from pathlib import Path

import pytest
from typer.testing import CliRunner

from partpick.cli import app
from partpick.errors import OutputPathError
from partpick.outputs import check_own_file, report_plot_path, resolve_output, write_output

INDUCTORS = Path(__file__).parent / "data" / "catalog" / "inductors_small.csv"
BOM_DATA = Path(__file__).parent / "data" / "bom"


def mode_of(path: Path) -> int:
    return stat.S_IMODE(path.stat().st_mode)


def test_a_new_file_follows_the_umask(tmp_path):
    old = os.umask(0o022)
    try:
        written = write_output(tmp_path / "new.csv", "a,b\n")
    finally:
        os.umask(old)
    assert mode_of(written) == 0o644  # 0666 less 022, as a shell redirect would make it


def test_an_existing_file_keeps_its_mode(tmp_path):
    target = tmp_path / "kept.csv"
    target.write_text("old")
    target.chmod(0o640)
    write_output(target, "new")
    assert target.read_text() == "new"
    assert mode_of(target) == 0o640


def test_a_symlink_is_written_through(tmp_path):
    real = tmp_path / "real.md"
    real.write_text("old")
    link = tmp_path / "link.md"
    link.symlink_to(real)
    assert write_output(link, "new") == real
    assert link.is_symlink()
    assert real.read_text() == "new"


@pytest.mark.parametrize("path", ["/dev/null", "/dev/zero"])
def test_a_device_is_refused_and_left_alone(path):
    with pytest.raises(OutputPathError, match="is a device"):
        write_output(path, "x")
    assert stat.S_ISCHR(os.stat(path).st_mode)


def test_a_fifo_a_folder_and_a_missing_folder_are_refused(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    with pytest.raises(OutputPathError, match="FIFO"):
        resolve_output(fifo)
    with pytest.raises(OutputPathError, match="is a folder"):
        resolve_output(tmp_path)
    with pytest.raises(OutputPathError, match="does not exist"):
        resolve_output(tmp_path / "nowhere" / "x.csv")


def test_a_read_only_file_is_refused_even_for_root(tmp_path):
    target = tmp_path / "frozen.csv"
    target.write_text("keep me")
    target.chmod(0o444)
    with pytest.raises(OutputPathError, match="read-only"):
        write_output(target, "new")
    assert target.read_text() == "keep me"


def test_a_file_partpick_did_not_write_is_not_taken_as_its_plot(tmp_path):
    assert report_plot_path(tmp_path / "board.md") == tmp_path / "board.plot.png"
    foreign = tmp_path / "board.plot.png"
    foreign.write_bytes(b"\x89PNG someone else's photo")
    with pytest.raises(OutputPathError, match="not written by partpick"):
        check_own_file(foreign, "--output")


def _imported_db(tmp_path: Path) -> str:
    db = str(tmp_path / "bom.db")
    for kind, name in (("inductor", "inductors"), ("capacitor", "capacitors"),
                       ("diode", "diodes"), ("mosfet", "mosfets")):  # fmt: skip
        result = CliRunner().invoke(
            app, ["import", str(BOM_DATA / f"{name}.csv"), "--kind", kind, "--db", db]
        )
        assert result.exit_code == 0, result.output
    return db


def test_the_report_never_overwrites_its_neighbour(tmp_path):
    db = _imported_db(tmp_path)
    neighbour = tmp_path / "board.png"
    neighbour.write_bytes(b"the board photo")
    foreign_plot = tmp_path / "board.plot.png"
    foreign_plot.write_bytes(b"not ours")
    args = ["bom", str(BOM_DATA / "spec.toml"), "--db", db, "--format", "md"]
    refused = CliRunner().invoke(app, [*args, "--output", str(tmp_path / "board.md")])
    assert refused.exit_code == 2
    assert "not written by partpick" in refused.output
    assert not (tmp_path / "board.md").exists()  # refused before any work
    foreign_plot.unlink()
    done = CliRunner().invoke(app, [*args, "--output", str(tmp_path / "board.md")])
    assert done.exit_code == 0, done.output
    assert neighbour.read_bytes() == b"the board photo"
    assert f"wrote {tmp_path / 'board.md'}" in done.output
    again = CliRunner().invoke(app, [*args, "--output", str(tmp_path / "board.md")])
    assert again.exit_code == 0, again.output  # its own plot may be replaced


@pytest.mark.parametrize("where", ["missing-folder", "folder", "read-only"])
def test_a_bad_rejects_path_stores_nothing(tmp_path, where):
    db = str(tmp_path / "cat.db")
    target = {
        "missing-folder": tmp_path / "nope" / "rejects.csv",
        "folder": tmp_path,
        "read-only": tmp_path / "ro.csv",
    }[where]
    if where == "read-only":
        target.write_text("old")
        target.chmod(0o444)
    result = CliRunner().invoke(
        app,
        ["import", str(INDUCTORS), "--kind", "inductor", "--db", db, "--rejects", str(target)],
    )
    assert result.exit_code == 2, result.output
    assert "--rejects" in result.output
    assert "Traceback" not in result.output
    assert not Path(db).exists()  # refused before the catalog was even opened


def _nobody_can_run_partpick() -> bool:
    if os.geteuid() != 0:
        return False
    probe = subprocess.run(
        ["setpriv", "--reuid=nobody", "--regid=nogroup", "--clear-groups",
         sys.executable, "-c", "import partpick"],
        capture_output=True,
    )  # fmt: skip
    return probe.returncode == 0


needs_nobody = pytest.mark.skipif(
    not _nobody_can_run_partpick(), reason="needs root, setpriv and a venv nobody can read"
)


def run_as_nobody(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    """Run ``partpick ARGS`` as the unprivileged user nobody (root bypasses file modes)."""
    entry = "import sys; from partpick.cli import main; sys.argv[0] = 'partpick'; main()"
    command = [sys.executable, "-c", entry, *args]
    return subprocess.run(
        ["setpriv", "--reuid=nobody", "--regid=nogroup", "--clear-groups", *command],
        capture_output=True, text=True, cwd=cwd, env={**os.environ, "HOME": str(cwd)},
    )  # fmt: skip


@pytest.fixture
def open_tmp():
    """Function scope: a folder the user nobody can reach (pytest's own tmp is 0700)."""
    folder = Path(tempfile.mkdtemp(prefix="partpick-nobody-"))
    folder.chmod(0o777)
    yield folder
    shutil.rmtree(folder, ignore_errors=True)


@needs_nobody
def test_an_output_into_a_read_only_folder_is_a_message(open_tmp):
    tmp_path = open_tmp
    folder = tmp_path / "locked"
    folder.mkdir(mode=0o555)
    spec = tmp_path / "spec.toml"
    spec.write_bytes((BOM_DATA / "spec.toml").read_bytes())
    spec.chmod(0o644)
    result = run_as_nobody(
        "import", str(INDUCTORS), "--kind", "inductor", "--db", str(tmp_path / "x.db"),
        "--rejects", str(folder / "rejects.csv"), cwd=tmp_path,
    )  # fmt: skip
    assert result.returncode == 2, result.stderr
    assert "is not writable" in result.stderr
    assert "Traceback" not in result.stderr
