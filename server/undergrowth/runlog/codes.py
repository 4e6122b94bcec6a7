"""Names and numeric codes shared by the run-log writer, reader and tables.

Pure constants: importing this module costs nothing, so the search engine may use
it through `undergrowth.runlog.writer`.
"""

from __future__ import annotations

FORMAT = "undergrowth-run"
VERSION = 1  # the run-log major version this code writes and reads
INT64_MAX = 2**63 - 1  # ids and counts are stored in int64 columns

# Node statuses. The position is the uint8 code stored in `RunTable.status`;
# append new statuses at the end so stored codes keep their meaning.
STATUSES: tuple[str, ...] = (
    "branched",  # 0: relaxation solved, fractional, children created
    "integral",  # 1: relaxation solution satisfies integrality
    "pruned",  # 2: bound cannot beat the incumbent
    "infeasible",  # 3: relaxation infeasible
    "discarded",  # 4: never solved, removed from the open list
    "open",  # 5: still waiting when the search stopped
    "failed",  # 6: the relaxation solver gave no usable answer
)
STATUS_CODE: dict[str, int] = {name: code for code, name in enumerate(STATUSES)}
BRANCHED = STATUS_CODE["branched"]
# Statuses whose relaxation was solved, so the node has a processing order.
SOLVED_STATUSES = frozenset({"branched", "integral", "pruned", "infeasible", "failed"})
# Statuses that close a leaf (they count towards the tree weight).
CLOSED_LEAF_STATUSES = frozenset({"integral", "pruned", "infeasible", "discarded", "failed"})

# Direction of the bound change that created a node: 0 none (root or unknown).
DIRECTIONS: tuple[str, ...] = ("none", "down", "up")
DIRECTION_CODE: dict[str | None, int] = {None: 0, "down": 1, "up": 2}

# Where an incumbent came from. "external" is our addition to the event contract
# for solutions found by a user's own code (recorded through `Recorder`).
SOURCES: tuple[str, ...] = ("integral", "rounding", "start", "external")
SOURCE_CODE: dict[str, int] = {name: code for code, name in enumerate(SOURCES)}

LP_STATUSES: tuple[str, ...] = ("optimal", "infeasible", "failed")
END_STATUSES: tuple[str, ...] = (
    "optimal",
    "infeasible",
    "unbounded",
    "gap-reached",
    "node-limit",
    "time-limit",
    "cancelled",
    "incomplete",
)
SENSES: tuple[str, ...] = ("min", "max")
EVENT_KINDS: tuple[str, ...] = ("node", "incumbent", "progress", "end", "note")

# A child's bound may be more optimistic than its parent's by this much,
# relative to max(1, |parent bound|), before the reader reports it.
BOUND_TOLERANCE = 1e-6


def gap(primal: float | None, dual: float | None) -> float | None:
    """Relative gap as the event contract defines it; None while either side is missing."""
    if primal is None or dual is None:
        return None
    if primal != primal or dual != dual:  # NaN: unknown
        return None
    if abs(primal) == float("inf") or abs(dual) == float("inf"):
        return None
    return abs(primal - dual) / max(abs(primal), abs(dual), 1e-10)
