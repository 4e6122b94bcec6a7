"""The outcome of a search: a status word and the figures a user checks."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# The status words and the gap formula are the run log's (stdlib-only constants,
# so the engine stays free of pydantic): one definition for engine, file and API.
from ..runlog.codes import END_STATUSES as STATUSES
from ..runlog.codes import gap as relative_gap

__all__ = ["STATUSES", "SearchResult", "relative_gap"]


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
