"""Pseudocosts: the average objective gain per unit change of a branching variable.

Bénichou, Gauthier, Girodet, Hentges, Ribière & Vincent, "Experiments in
mixed-integer linear programming", Mathematical Programming 1 (1971).
"""

from __future__ import annotations

import math

import numpy as np


class Pseudocosts:
    """Per-variable, per-direction running means of gain / fractional change.

    Means and the overall averages are kept up to date on each observation so
    that scoring a node costs only a gather over its candidates.
    """

    def __init__(self, num_cols: int) -> None:
        self.sum = np.zeros((2, num_cols))  # row 0: down, row 1: up
        self.count = np.zeros((2, num_cols), dtype=np.int64)
        self.mean = np.zeros((2, num_cols))
        self._total = [0.0, 0.0]
        self._n = [0, 0]

    def update(self, var: int, direction: int, gain: float, change: float) -> None:
        """Record one observation; ``direction`` 0 = down, 1 = up."""
        if change <= 1e-12 or not math.isfinite(gain):
            return
        unit = max(gain, 0.0) / change
        d = direction
        total = float(self.sum[d, var]) + unit
        n = int(self.count[d, var]) + 1
        self.sum[d, var] = total
        self.count[d, var] = n
        self.mean[d, var] = total / n
        self._total[d] += unit
        self._n[d] += 1

    def average(self, direction: int) -> float:
        n = self._n[direction]
        return self._total[direction] / n if n else 1.0

    def values(self, var: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(ψ⁻, ψ⁺) for ``var``; variables never observed in a direction get the
        average over all observations in that direction (1.0 when there are none)."""
        # One gather for both directions: half the numpy calls of one per direction.
        fill = np.array([[self.average(0)], [self.average(1)]])
        out = np.where(self.count[:, var] > 0, self.mean[:, var], fill)
        return out[0], out[1]

    def reliable(self, var: np.ndarray, threshold: int) -> np.ndarray:
        return np.minimum(self.count[0, var], self.count[1, var]) >= threshold
