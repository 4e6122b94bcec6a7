"""Primal bound, dual bound and gap of a run over nodes or time, reduced for drawing.

Where the figures come from:

- primal: each incumbent event (a step up or down at the node that found it),
- dual: after every processed node, as `measures.node_trace` rebuilds it from the
  node events (the smallest bound among the nodes still waiting, the incumbent and
  failed regions); the progress snapshots (every few hundred nodes, every second,
  after each incumbent, and at the end) agree with it where both exist and fill in
  where the node events cannot say (before the first and after the last solve),
- gap: wherever either changes, from the two step functions, as the event
  contract defines it.

On the ``nodes`` axis, x is the number of nodes processed so far: an incumbent
found at processing order k counts from k + 1, a progress snapshot at its
``nodes`` count. On the ``time`` axis, x is seconds since the search started.

`reduce_minmax` keeps at most N points per series: the first and last point
and, in each of (N - 2) / 2 equal-width x buckets, the lowest and the highest
point, so no extreme disappears however long the run (with N < 4, just the
lowest and the highest).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from ..runlog.codes import SOURCES

if TYPE_CHECKING:
    from .table import RunTable

__all__ = ["AXES", "BoundSeries", "Series", "bound_series", "reduce_minmax"]

AXES = ("nodes", "time")


@dataclass(frozen=True)
class Series:
    x: np.ndarray
    y: np.ndarray

    def __len__(self) -> int:
        return len(self.x)


@dataclass(frozen=True)
class Incumbents:
    """Every improving solution, in the order found (order and node -1 when unknown)."""

    order: np.ndarray
    time: np.ndarray
    objective: np.ndarray
    source: list[str]
    node: np.ndarray


@dataclass(frozen=True)
class BoundSeries:
    axis: str
    primal: Series
    dual: Series
    gap: Series
    incumbents: Incumbents
    raw_points: int  # points before reduction, over the three series


def reduce_minmax(x: np.ndarray, y: np.ndarray, *, points: int) -> Series:
    """At most ``points`` points of (x, y) (x non-decreasing) keeping the first, the last,
    and each bucket's minimum and maximum; NaN values are dropped first."""
    if points < 2:
        raise ValueError(f"points: must be at least 2, got {points}")
    x = np.asarray(x, dtype=np.float64)
    y = np.asarray(y, dtype=np.float64)
    keep = ~np.isnan(y) & ~np.isnan(x)
    x, y = x[keep], y[keep]
    n = len(x)
    if n <= points:
        return Series(x, y)
    # Below 4 points the ends give way: the extremes matter more.
    buckets = max(1, (points - 2) // 2)
    chosen = [np.array([0, n - 1])] if points >= 4 else []
    span = x[-1] - x[0]
    if span > 0:
        b = np.minimum(((x - x[0]) / span * buckets).astype(np.int64), buckets - 1)
    else:
        b = np.zeros(n, dtype=np.int64)
    # Sorted by (bucket, y): a bucket's first entry is its minimum, its last the maximum.
    by = np.lexsort((y, b))
    sb = b[by]
    first = np.flatnonzero(np.r_[True, sb[1:] != sb[:-1]])
    last = np.r_[first[1:] - 1, n - 1]
    chosen += [by[first], by[last]]
    idx = np.unique(np.concatenate(chosen))
    return Series(x[idx], y[idx])


def _gap(primal: np.ndarray, dual: np.ndarray) -> np.ndarray:
    """The contract's relative gap; NaN where either side is unknown."""
    with np.errstate(invalid="ignore"):
        denom = np.maximum(np.maximum(np.abs(primal), np.abs(dual)), 1e-10)
        return np.abs(primal - dual) / denom


def _step_at(x_of: np.ndarray, y_of: np.ndarray, x: np.ndarray) -> np.ndarray:
    """Value of the step function (x_of, y_of) at each x: the last y whose x_of <= x."""
    at = np.searchsorted(x_of, x, side="right") - 1
    out = np.full(len(x), np.nan)
    ok = at >= 0
    out[ok] = y_of[at[ok]]
    return out


def _trace_dual(table: RunTable, axis: str) -> tuple[np.ndarray, np.ndarray]:
    """The global dual bound after each processed node k = 1 … N, where it is finite,
    at x = k (nodes) or the k-th node's time; in the model's own sense."""
    from .measures import node_trace  # late: measures is the heavier module

    if not len(table):
        return np.empty(0), np.empty(0)
    trace = node_trace(table)
    y = trace.dual[1:]
    x = np.arange(1, len(y) + 1, dtype=np.float64) if axis == "nodes" else trace.time[1:]
    ok = np.isfinite(y)
    return x[ok].astype(np.float64), y[ok].astype(np.float64)


def bound_series(table: RunTable, *, axis: str = "nodes", points: int = 1000) -> BoundSeries:
    """Primal, dual and gap of ``table`` over ``axis`` ("nodes" or "time"),
    each reduced to at most ``points`` points."""
    if axis not in AXES:
        raise ValueError(f"axis: must be one of {', '.join(AXES)}, got {axis!r}")
    inc, prog = table.incumbents, table.progress
    if axis == "nodes":
        inc_x = np.where(inc.order >= 0, inc.order + 1, 0).astype(np.float64)
        prog_x = prog.nodes.astype(np.float64)
    else:
        inc_x = inc.time.astype(np.float64)
        prog_x = prog.time.astype(np.float64)
    # Stable sorts: equal x keep the order they were written in, so the last one wins.
    io = np.argsort(inc_x, kind="stable")
    po = np.argsort(prog_x, kind="stable")
    px, py = inc_x[io], inc.objective[io]
    dx, dy = prog_x[po], prog.dual_bound[po]
    # Snapshots come every few hundred nodes: a short run would show a flat dual line
    # until its first incumbent. The per-node trace gives the bound after every node.
    tx, ty = _trace_dual(table, axis)
    if len(tx):
        before, after = dx < tx[0], dx > tx[-1]
        dx = np.r_[dx[before], tx, dx[after]]
        dy = np.r_[dy[before], ty, dy[after]]
    # The primal line runs on to the last snapshot; incumbents keep their own points.
    end_x = max(float(px[-1]) if len(px) else -np.inf, float(dx[-1]) if len(dx) else -np.inf)
    if len(px) and end_x > px[-1]:
        px, py = np.r_[px, end_x], np.r_[py, py[-1]]
    grid = np.unique(np.r_[px, dx])
    gx = grid
    gy = _gap(_step_at(px, py, grid), _step_at(dx, dy, grid)) if len(grid) else grid
    raw = len(px) + len(dx) + len(gx)
    return BoundSeries(
        axis=axis,
        primal=reduce_minmax(px, py, points=points),
        dual=reduce_minmax(dx, dy, points=points),
        gap=reduce_minmax(gx, gy, points=points),
        incumbents=Incumbents(
            order=inc.order, time=inc.time, objective=inc.objective,
            source=[SOURCES[int(s)] for s in inc.source], node=inc.node),
        raw_points=raw,
    )
