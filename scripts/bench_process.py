"""Time whole processes for the benchmark scripts: wall time and peak RSS of each child.

What a user waits for is the whole command: interpreter start-up, imports, the work and the
output. So every figure the benchmarks compare comes from a child process, partpick and
baseline alike, timed from spawn to exit. Peak RSS comes from ``os.wait4`` (the kernel's
accounting of that one child, Linux ``ru_maxrss`` in KiB).

On a shared machine timings are noisy: the benchmarks interleave the commands they compare
in one loop (so a busy spell hits both), report the median of several rounds, and print the
spread (min-max) beside it.
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import time
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path


@dataclass
class Timings:
    """Wall times (s) and peak RSS (MiB) of repeated runs of one command."""

    label: str
    seconds: list[float] = field(default_factory=list)
    peak_mib: list[float] = field(default_factory=list)

    @property
    def median(self) -> float:
        return statistics.median(self.seconds)

    def line(self) -> str:
        """Return "label: median s (min-max over n), peak RSS m MiB"."""
        low, high = min(self.seconds), max(self.seconds)
        return (
            f"{self.label:<44s} median {self.median:6.3f} s  (range {low:.3f}-{high:.3f} s, "
            f"n={len(self.seconds)})  peak RSS {max(self.peak_mib):5.0f} MiB"
        )


def run_process(
    args: Sequence[str], stdout: Path | None = None, env: dict | None = None
) -> tuple[float, float]:
    """Run ``args`` to completion; return (wall seconds, peak RSS in MiB).

    Output goes to ``stdout`` (a file, as a user redirecting it would have) or is thrown
    away; stderr is kept and shown if the command fails.
    """
    sink = open(stdout, "wb") if stdout is not None else open(os.devnull, "wb")  # noqa: SIM115
    with sink:
        start = time.perf_counter()
        child = subprocess.Popen(args, stdout=sink, stderr=subprocess.PIPE, env=env)
        err = child.stderr.read() if child.stderr else b""
        _pid, status, usage = os.wait4(child.pid, 0)
        seconds = time.perf_counter() - start
    child.returncode = os.waitstatus_to_exitcode(status)
    if child.returncode != 0:
        raise SystemExit(f"failed ({child.returncode}): {' '.join(args)}\n{err.decode()}")
    return seconds, usage.ru_maxrss / 1024


def python_command(code: str, *args: str) -> list[str]:
    """Return the command running ``code`` with this interpreter (the project's venv)."""
    return [sys.executable, "-c", code, *args]


def partpick_command(*args: str) -> list[str]:
    """Return the command of the installed ``partpick`` console script."""
    return [str(Path(sys.executable).with_name("partpick")), *args]


def ratio_line(what: str, ours: Timings, base: Timings, goal: str) -> str:
    """Return the median/median ratio of two interleaved commands, with its goal."""
    ratio = ours.median / base.median
    faster = f" ({1 / ratio:.1f}x faster)" if ratio < 1 else ""
    return f"ratio {what}: {ratio:.2f}{faster}  goal {goal}"
