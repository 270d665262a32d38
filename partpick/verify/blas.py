"""Run the small-matrix work of the solver with one BLAS thread.

The solver's matrices are 3 × 3 and 6 × 6. A threaded OpenBLAS wakes its worker threads for
every call, and on a busy two-core machine that makes ``scipy.linalg.expm`` of a 3 × 3 matrix
about ten times slower than on one thread (measured here: 184 µs against 17 µs). So the
solver asks every OpenBLAS loaded in the process for one thread while it runs and restores the
previous count afterwards. Where no OpenBLAS is found (another BLAS, another platform) this
does nothing; the results are the same either way, only the time differs.
"""

from __future__ import annotations

import contextlib
import ctypes
from collections.abc import Iterator
from functools import lru_cache

# entry-point names of the OpenBLAS builds numpy and scipy wheels ship (plain and suffixed)
_PREFIXES = ("openblas_", "scipy_openblas_")
_SUFFIXES = ("", "64_")


@lru_cache(maxsize=1)
def _controls() -> tuple[tuple[object, object], ...]:
    """Return (get, set) thread-count functions of every OpenBLAS mapped into this process."""
    try:
        with open("/proc/self/maps", encoding="utf-8") as handle:
            paths = {line.split()[-1] for line in handle if "openblas" in line.lower()}
    except OSError:
        return ()
    controls = []
    for path in sorted(paths):
        try:
            library = ctypes.CDLL(path)
        except OSError:
            continue
        for prefix in _PREFIXES:
            for suffix in _SUFFIXES:
                getter = getattr(library, f"{prefix}get_num_threads{suffix}", None)
                setter = getattr(library, f"{prefix}set_num_threads{suffix}", None)
                if getter is not None and setter is not None:
                    controls.append((getter, setter))
    return tuple(controls)


@contextlib.contextmanager
def single_blas_thread() -> Iterator[None]:
    """Within the block, every loaded OpenBLAS uses one thread; restore the counts after."""
    import scipy.linalg  # noqa: F401 - make sure scipy's own OpenBLAS is loaded and found

    controls = _controls()
    before = [int(getter()) for getter, _ in controls]
    for _, setter in controls:
        setter(1)
    try:
        yield
    finally:
        for (_, setter), count in zip(controls, before, strict=True):
            setter(count)
