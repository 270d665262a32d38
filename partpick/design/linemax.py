"""The maximum over the input range of a stress that is linear in a per-part parameter.

Every boost stress (or its square) has the form ``s(Vin, u) = p(Vin) + q(Vin)·u`` where ``u``
depends only on the part (``1/L`` for the peak and ripple, ``1/L²`` for the squared RMS
currents) and ``p``, ``q`` only on the spec. For a fixed grid of input voltages each grid point
is a straight line in ``u``, so ``max over Vin`` is the upper envelope of those lines: a convex
piecewise-linear function of ``u``. Building it once per spec (a convex-hull sweep over a dense
grid) and looking parts up with a binary search gives the exact grid maximum for 250,000 parts
in milliseconds, without a parts × grid array and without assuming where the maximum lies.

Source: the upper envelope of lines is the dual of the planar convex hull; see M. de Berg et
al., *Computational Geometry: Algorithms and Applications*, 3rd ed., Springer, 2008, ch. 11.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class LineEnvelope:
    """The upper envelope of lines ``p[i] + q[i]·u`` (u ≥ 0), each tagged with an x value."""

    intercepts: np.ndarray
    slopes: np.ndarray
    xs: np.ndarray
    breakpoints: np.ndarray  # u where line k hands over to line k + 1, ascending

    @classmethod
    def build(cls, intercepts: np.ndarray, slopes: np.ndarray, xs: np.ndarray) -> LineEnvelope:
        """Return the envelope of the given lines (arrays of one shape)."""
        p = np.asarray(intercepts, dtype=float).ravel()
        q = np.asarray(slopes, dtype=float).ravel()
        x = np.asarray(xs, dtype=float).ravel()
        hull = _upper_hull(p, q)
        p, q, x = p[hull], q[hull], x[hull]
        with np.errstate(over="ignore"):  # nearly parallel lines cross at ±inf, which is right
            breakpoints = (p[:-1] - p[1:]) / (q[1:] - q[:-1])
        return cls(p, q, x, breakpoints)

    def evaluate(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Return (max over lines of p + q·u, the x of the maximising line) per entry of ``u``."""
        u = np.asarray(u, dtype=float)
        last = len(self.xs) - 1
        index = np.searchsorted(self.breakpoints, u, side="left")
        best = self.intercepts[index] + self.slopes[index] * u
        chosen = index
        # Rounding at a breakpoint may pick a neighbour; the best of the three is exact.
        for step in (-1, 1):
            other = np.clip(index + step, 0, last)
            value = self.intercepts[other] + self.slopes[other] * u
            better = value > best
            best = np.where(better, value, best)
            chosen = np.where(better, other, chosen)
        return best, self.xs[chosen]


def _upper_hull(p: np.ndarray, q: np.ndarray) -> list[int]:
    """Return the indices of the lines on the upper envelope, by ascending slope."""
    order = np.lexsort((p, q))  # by slope, then intercept
    hull: list[int] = []
    for i in order.tolist():
        if hull and q[hull[-1]] == q[i]:
            hull.pop()  # same slope: the later one has the larger intercept
        while len(hull) >= 2 and _is_hidden(p, q, hull[-2], hull[-1], i):
            hull.pop()
        hull.append(i)
    return hull


def _is_hidden(p: np.ndarray, q: np.ndarray, a: int, b: int, c: int) -> bool:
    """Return True if line b never rises above both a and c (slopes q[a] < q[b] < q[c])."""
    # b is hidden when a and c cross at or before a and b do.
    return (p[a] - p[c]) * (q[b] - q[a]) <= (p[a] - p[b]) * (q[c] - q[a])
