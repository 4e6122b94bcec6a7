"""The outcome of a search: a status word and the figures a user checks."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

STATUSES = ("optimal", "infeasible", "unbounded", "gap-reached", "node-limit", "time-limit",
            "cancelled", "incomplete")


def relative_gap(primal: float | None, dual: float | None) -> float | None:
    """|primal − dual| / max(|primal|, |dual|, 1e-10); None while either is missing."""
    if primal is None or dual is None:
        return None
    return abs(primal - dual) / max(abs(primal), abs(dual), 1e-10)


@dataclass(frozen=True, slots=True)
class SearchResult:
    status: str
    objective: float | None  # best solution found, in the model's own sense
    dual_bound: float | None
    gap: float | None
    nodes: int
    lp_iterations: int
    seconds: float
    lp_seconds: float
    complete: bool
    message: str | None = None
    x: np.ndarray | None = None

    def summary(self) -> dict[str, object]:
        return {"status": self.status, "objective": self.objective,
                "dual_bound": self.dual_bound, "gap": self.gap, "nodes": self.nodes,
                "lp_iterations": self.lp_iterations, "seconds": round(self.seconds, 6)}
