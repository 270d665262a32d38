"""Every file partpick writes goes through here: checked first, written atomically.

The policy, the same for ``--output``, ``--rejects``, ``--plot``, the report's plot and the
columnar snapshots:

* **Checked before any work.** The folder must exist and be writable; the path must be a
  regular file or nothing. A folder, a device (``/dev/null``), a FIFO or a socket is refused,
  and so is a file whose permission bits allow no one to write it (``chmod 444``), even for
  root, who could write it anyway: someone marked it read-only on purpose.
* **Through a symlink.** A symlink is followed and its target is written; the link stays.
* **Atomic.** The bytes go to a temporary file in the target's folder, are flushed to disk
  and renamed over the target, so a reader sees the old file or the new one, whole.
* **Modes.** An existing file keeps its permission bits (and, where allowed, its owner); a
  new file gets ``0666`` less the umask (``0644`` under the usual ``022``), like any file a
  shell redirect makes. ``mode`` overrides this where a file must follow another one (a
  snapshot follows its catalog file).

The core never prints: callers say which files were written.
"""

from __future__ import annotations

import contextlib
import os
import stat
import tempfile
from pathlib import Path

from partpick.errors import OutputPathError

_KINDS = (
    (stat.S_ISDIR, "a folder"),
    (stat.S_ISCHR, "a device"),
    (stat.S_ISBLK, "a device"),
    (stat.S_ISFIFO, "a FIFO (named pipe)"),
    (stat.S_ISSOCK, "a socket"),
)


def resolve_output(path: str | Path, option: str = "--output") -> Path:
    """Return the file that writing ``path`` would replace or create (symlinks followed).

    Raises :class:`~partpick.errors.OutputPathError` if it cannot be written: a missing or
    read-only folder, a folder, device, FIFO or socket at the path, or a read-only file.
    """
    given = str(path)
    if not given or given.endswith(os.sep):
        raise OutputPathError(given, "is a folder name; give a file name", option)
    target = Path(os.path.realpath(os.path.expanduser(given)))
    try:
        info = os.stat(target)
    except FileNotFoundError:
        info = None
    except OSError as exc:
        raise OutputPathError(given, f"cannot be inspected ({exc.strerror})", option) from None
    if info is not None:
        _check_existing(given, target, info, option)
    _check_folder(given, target.parent, option)
    return target


def _check_existing(given: str, target: Path, info: os.stat_result, option: str) -> None:
    for test, what in _KINDS:
        if test(info.st_mode):
            raise OutputPathError(given, f"is {what}, not a regular file", option)
    if not info.st_mode & 0o222 or not os.access(target, os.W_OK):
        raise OutputPathError(
            given, "is read-only; choose another path or make it writable", option
        )


def _check_folder(given: str, folder: Path, option: str) -> None:
    if not folder.is_dir():
        raise OutputPathError(given, f"the folder {folder} does not exist", option)
    if not os.access(folder, os.W_OK | os.X_OK):
        raise OutputPathError(given, f"the folder {folder} is not writable", option)


PLOT_MARK = "partpick (matplotlib)"
"""Written into every plot's metadata, so a later run knows the file is its own."""
_MARK_SCAN_BYTES = 1 << 16


def report_plot_path(report: str | Path) -> Path:
    """Return the plot file of a Markdown report: ``review.md`` -> ``review.plot.png``."""
    given = Path(report)
    return given.with_name(given.stem + ".plot.png")


def check_own_file(path: Path, option: str, mark: str = PLOT_MARK) -> None:
    """Refuse to replace a file at ``path`` that partpick did not write (it lacks ``mark``).

    A companion file (the report's plot) is named by partpick, not by the user, so an
    existing file of that name may be someone else's; it is replaced only if it is ours.
    """
    target = Path(os.path.realpath(path))
    if not target.exists():
        return
    try:
        with open(target, "rb") as handle:
            head = handle.read(_MARK_SCAN_BYTES)
    except OSError:
        head = b""
    if mark.encode() not in head:
        raise OutputPathError(
            str(path),
            "exists and was not written by partpick; move it away or choose another report name",
            option,
        )


def current_umask() -> int:
    """Return the process umask (read by setting it and putting it straight back)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def new_file_mode() -> int:
    """Return the permission bits of a new file: 0666 less the umask."""
    return 0o666 & ~current_umask()


def write_output(
    path: str | Path,
    data: str | bytes,
    option: str = "--output",
    *,
    mode: int | None = None,
) -> Path:
    """Check ``path`` (see :func:`resolve_output`) and write ``data`` to it atomically.

    Returns the file written (a symlink's target). Text is written as UTF-8. Raises
    OutputPathError, never OSError, when the file cannot be written; the old file, if any,
    is then left as it was.
    """
    target = resolve_output(path, option)
    payload = data.encode("utf-8") if isinstance(data, str) else data
    try:
        with atomic_file(target, mode=mode) as handle:
            handle.write(payload)
    except OSError as exc:
        raise OutputPathError(
            str(path), f"cannot be written ({exc.strerror or exc})", option
        ) from None
    return target


@contextlib.contextmanager
def atomic_file(target: Path, *, mode: int | None = None):
    """Yield a binary file that replaces ``target`` whole when the block ends without error.

    The permission bits are ``mode`` if given, else the existing file's, else the umask's.
    """
    fd, temp = temporary_beside(target)
    try:
        with os.fdopen(fd, "wb") as handle:
            yield handle
            handle.flush()
            os.fsync(handle.fileno())
        replace_with(temp, target, mode=mode)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(temp)
        raise


def temporary_beside(target: Path) -> tuple[int, Path]:
    """Return (descriptor, path) of a new temporary file for ``target``, in its folder.

    Named ``.<name>.<random>.tmp``, which :func:`partpick.catalog.snapshot.sweep_leftovers`
    knows as a half-written file.
    """
    fd, temp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent)
    return fd, Path(temp)


def replace_with(temp: Path, target: Path, *, mode: int | None = None) -> None:
    """Rename the finished (flushed and synced) file ``temp`` over ``target``.

    ``temp`` takes ``mode``, else the permission bits (and where allowed the owner) of the
    file it replaces, else the umask's.
    """
    keep = _existing(target)
    bits = mode if mode is not None else (stat.S_IMODE(keep.st_mode) if keep else new_file_mode())
    os.chmod(temp, bits)
    if keep is not None:
        with contextlib.suppress(OSError):  # only root may give a file to someone else
            os.chown(temp, keep.st_uid, keep.st_gid)
    os.replace(temp, target)


def _existing(target: Path) -> os.stat_result | None:
    try:
        info = os.stat(target)
    except OSError:
        return None
    return info if stat.S_ISREG(info.st_mode) else None
