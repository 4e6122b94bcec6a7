"""Findings: why a search is slow, with the numbers behind each claim.

`diagnose(table, problem=None)` runs every check and returns `Finding`s, most
severe first. Checks on the run live in `findings_search`, checks on the model
(they need the `Problem`) in `findings_model`; each code, its thresholds and the
reasons for them are listed in docs/findings.md.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from ..model import Problem
    from .table import RunTable

__all__ = ["CODES", "SEVERITIES", "Finding", "diagnose"]

SEVERITIES = ("high", "medium", "low", "info")
# Every code a finding can carry, in the order they are listed when equally severe.
CODES = ("nonconvex-objective", "failed-nodes", "no-incumbent", "weak-root", "loose-big-m",
         "dual-stall", "branching-hotspot", "infeasible-heavy", "late-incumbent",
         "bad-scaling")
# A finding lists at most this many node ids, variables or rows in its refs (the
# evidence keeps the full counts): enough to select in the inspector, small as JSON.
MAX_REFS = 1000


@dataclass(frozen=True)
class Finding:
    """One diagnosis. ``evidence`` holds plain numbers (and short strings); ``refs``
    the node ids, variable names and row names behind it; ``details`` an optional
    per-item table (for example one entry per loose row)."""

    code: str
    severity: str
    title: str
    evidence: dict[str, Any]
    explanation: str
    advice: str
    refs: dict[str, list[Any]] = field(default_factory=dict)
    details: list[dict[str, Any]] = field(default_factory=list)

    def __post_init__(self) -> None:
        if self.code not in CODES:
            raise ValueError(f"code: unknown finding code {self.code!r}")
        if self.severity not in SEVERITIES:
            raise ValueError(f"severity: must be one of {', '.join(SEVERITIES)}, "
                             f"got {self.severity!r}")
        refs = {k: list(self.refs.get(k, []))[:MAX_REFS] for k in ("nodes", "variables", "rows")}
        object.__setattr__(self, "refs", refs)

    def to_dict(self) -> dict[str, Any]:
        return {"code": self.code, "severity": self.severity, "title": self.title,
                "evidence": {k: _plain(v) for k, v in self.evidence.items()},
                "explanation": self.explanation, "advice": self.advice,
                "refs": {k: [_plain(x) for x in v] for k, v in self.refs.items()},
                "details": [{k: _plain(v) for k, v in d.items()} for d in self.details]}


def _plain(value: Any) -> Any:
    """numpy scalars to Python ones; non-finite floats to None (JSON has neither)."""
    if hasattr(value, "item"):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def diagnose(table: RunTable | None, problem: Problem | None = None) -> list[Finding]:
    """All findings for a run and, when given, its model; most severe first.

    Without ``problem`` the model checks (loose big-M rows, scaling, convexity) are
    skipped; without ``table`` only they run (a model the engine refused has no run)."""
    from . import findings_model, findings_search

    found: list[Finding] = []
    if problem is not None:
        found += findings_model.model_findings(problem)
    if table is not None:
        found += findings_search.search_findings(table, problem)
    found = _linked(found)
    rank = {code: i for i, code in enumerate(CODES)}
    return sorted(found, key=lambda f: (SEVERITIES.index(f.severity), rank[f.code]))


def _linked(found: list[Finding]) -> list[Finding]:
    """Loose big-M rows next to a weak root are the likely cause: say so and raise them."""
    codes = {f.code for f in found}
    if not {"weak-root", "loose-big-m"} <= codes:
        return found
    out = []
    for f in found:
        if f.code == "loose-big-m":
            f = Finding(f.code, "high", f.title, f.evidence,
                        f.explanation + " The run's weak root relaxation (weak-root) is what "
                        "these rows typically cause.", f.advice, f.refs, f.details)
        out.append(f)
    return out
