"""Pseudocosts: the average objective gain per unit change of a branching variable.

Bénichou, Gauthier, Girodet, Hentges, Ribière & Vincent, "Experiments in
mixed-integer linear programming", Mathematical Programming 1 (1971).
"""

from __future__ import annotations

import numpy as np


class Pseudocosts:
    """Per-variable, per-direction running means of gain / fractional change."""

    def __init__(self, num_cols: int) -> None:
        self.sum = np.zeros((2, num_cols))  # row 0: down, row 1: up
        self.count = np.zeros((2, num_cols), dtype=np.int64)

    def update(self, var: int, direction: int, gain: float, change: float) -> None:
        """Record one observation; ``direction`` 0 = down, 1 = up."""
        if change <= 1e-12 or not np.isfinite(gain):
            return
        self.sum[direction, var] += max(gain, 0.0) / change
        self.count[direction, var] += 1

    def values(self, var: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(ψ⁻, ψ⁺) for ``var``; variables never observed in a direction get the
        average over the observed ones (1.0 when there are none)."""
        out = []
        for d in (0, 1):
            cnt = self.count[d]
            seen = cnt > 0
            avg = float(self.sum[d, seen].sum() / cnt[seen].sum()) if seen.any() else 1.0
            c = cnt[var]
            psi = np.where(c > 0, self.sum[d, var] / np.maximum(c, 1), avg)
            out.append(psi)
        return out[0], out[1]

    def reliable(self, var: np.ndarray, threshold: int) -> np.ndarray:
        return np.minimum(self.count[0, var], self.count[1, var]) >= threshold
