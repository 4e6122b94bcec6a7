"""How far a run got, per processed node: global bounds, gap, open nodes, tree weight,
plus the summary measures built on them (root gap, gap closed, primal and dual
integral).

Everything starts from `node_trace`, which rebuilds the global figures after each
processed node from the node table alone, so they are as fine-grained as the tree
(progress snapshots come only every few hundred nodes). Index k of a trace means
"after k nodes were processed" (k = 0 … N). The rebuild follows the engine's
definitions:

- a node is *open* from the moment its parent is processed until it is processed
  itself, discarded, or the search ends; its bound meanwhile is the parent's (a
  live or cut-off log has no rows yet for waiting children: a branched node with
  fewer than two children in the table counts the rest as waiting);
- the dual bound after k nodes is the smallest such inherited bound over the open
  nodes, capped by the incumbent (minimisation form); a failed node's region is
  never explored, so its inherited bound stays in the dual bound to the end;
  progress snapshots, which also know look-ahead bounds the table does not hold,
  raise it where they are tighter (it never falls, so a running maximum is valid);
- an incumbent found while processing the node of order p counts from k = p + 1.

Values are in the model's own sense; internally we work in minimisation form
(``sign`` = +1 for min, −1 for max).
"""

from __future__ import annotations

import weakref
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from ..runlog.codes import CLOSED_LEAF_STATUSES, STATUS_CODE

if TYPE_CHECKING:
    from .table import RunTable

__all__ = ["Integral", "Measures", "NodeTrace", "RootGap", "dual_integral", "gap_closed",
           "measures", "node_trace", "primal_integral", "relative_gap", "root_gap"]

BRANCHED = STATUS_CODE["branched"]
DISCARDED = STATUS_CODE["discarded"]
OPEN = STATUS_CODE["open"]
FAILED = STATUS_CODE["failed"]
INFEASIBLE = STATUS_CODE["infeasible"]
_LEAF_CODES = np.array(sorted(STATUS_CODE[s] for s in CLOSED_LEAF_STATUSES), dtype=np.uint8)

# The contract's gap formula: |p − d| / max(|p|, |d|, GAP_FLOOR).
GAP_FLOOR = 1e-10


def relative_gap(primal: np.ndarray | float, dual: np.ndarray | float) -> np.ndarray:
    """|p − d| / max(|p|, |d|, 1e-10), elementwise; NaN where either side is not finite."""
    p = np.asarray(primal, dtype=np.float64)
    d = np.asarray(dual, dtype=np.float64)
    with np.errstate(invalid="ignore"):
        out = np.abs(p - d) / np.maximum(np.maximum(np.abs(p), np.abs(d)), GAP_FLOOR)
    return np.where(np.isfinite(p) & np.isfinite(d), out, np.nan)


# ------------------------------------------------------------------ the trace
@dataclass(frozen=True, eq=False)
class NodeTrace:
    """Global figures after k processed nodes, k = 0 … N (arrays of length N + 1).

    ``done_at[row]`` is the k from which the row no longer waits (processed or
    discarded; N + 1 for nodes left open); ``found_at`` the k from which each
    incumbent counts. Minimisation-form arrays end in ``_min``.
    """

    sense: str
    sign: float
    time: np.ndarray  # seconds at which the k-th node was processed (0 at k = 0)
    primal: np.ndarray  # incumbent, NaN before the first
    dual: np.ndarray  # global dual bound (±inf: none yet / nothing left)
    gap: np.ndarray  # relative gap, NaN while unknown
    open: np.ndarray  # nodes waiting
    done: np.ndarray  # tree nodes processed or discarded
    leaves: np.ndarray  # closed leaves among them
    weight: np.ndarray  # Σ 2^-depth over those leaves (Kilby et al. 2006)
    done_at: np.ndarray  # per row
    born_at: np.ndarray  # per row: k from which it waits (its parent was processed)
    open_until: np.ndarray  # per row: last k at which it still holds the dual bound
    waiting_bound_min: np.ndarray  # per row: its bound while waiting (the parent's)
    found_at: np.ndarray  # per incumbent
    end_time: float

    @property
    def processed(self) -> int:
        return len(self.time) - 1

    @property
    def dual_min(self) -> np.ndarray:
        return self.sign * self.dual

    @property
    def primal_min(self) -> np.ndarray:
        return self.sign * self.primal


_TRACES: weakref.WeakKeyDictionary[Any, NodeTrace] = weakref.WeakKeyDictionary()


def node_trace(table: RunTable) -> NodeTrace:
    """The per-node trace of ``table`` (computed once per table, then reused)."""
    trace = _TRACES.get(table)
    if trace is None:
        trace = _build_trace(table)
        _TRACES[table] = trace
    return trace


def _build_trace(table: RunTable) -> NodeTrace:
    c = table.columns
    sign = 1.0 if table.sense == "min" else -1.0
    status = c["status"]
    rows = len(status)
    order = c["order"]
    parent_row = c["parent_row"]
    solved = order >= 0
    n = int(solved.sum())

    # Processing rank 0 … N−1 of each solved row (orders may have gaps in foreign logs).
    rank = np.full(rows, -1, dtype=np.int64)
    by_order = np.flatnonzero(solved)[np.argsort(order[solved], kind="stable")]
    rank[by_order] = np.arange(n)
    times = np.zeros(n + 1)
    times[1:] = c["time"][by_order]
    times[1:] = np.fmax.accumulate(np.nan_to_num(times[1:], nan=0.0))

    # k from which a row stops waiting: processed ranks count from 1; a discarded
    # row goes when it appears (after as many solves as came before it in the log).
    solved_before = np.cumsum(solved) - solved
    done_at = np.where(solved, rank + 1, solved_before).astype(np.int64)
    done_at[status == OPEN] = n + 1
    born_at = np.zeros(rows, dtype=np.int64)
    has_parent = parent_row >= 0
    born_at[has_parent] = done_at[parent_row[has_parent]]

    # A node's bound while it waits is its parent's; fill unknown bounds from above.
    bound_min = sign * _filled_bounds(c["bound"], parent_row)
    waiting_bound = np.full(rows, -np.inf)
    waiting_bound[has_parent] = bound_min[parent_row[has_parent]]
    waiting_bound[np.isnan(waiting_bound)] = -np.inf  # unknown: no bound at all

    # Open during k in [born_at, last]; failed regions stay in the dual bound.
    last = np.where(status == FAILED, n, np.minimum(done_at, n + 1) - 1)
    last = np.minimum(last, n)
    # A live or cut-off log has no rows yet for children still waiting (a node is
    # written when processed): a branched row with fewer than two children has the
    # rest waiting from its own processing to the end, with its bound.
    kids = np.bincount(parent_row[has_parent], minlength=rows)
    unseen = np.repeat(np.arange(rows), np.where(status == BRANCHED,
                                                 np.maximum(2 - kids, 0), 0))
    unseen_born = done_at[unseen]
    unseen_bound = bound_min[unseen]
    unseen_bound[np.isnan(unseen_bound)] = -np.inf
    dual_min = _cover_min(np.r_[born_at, unseen_born], np.r_[last, np.full(unseen.size, n)],
                          np.r_[waiting_bound, unseen_bound], n + 1)

    inc = table.incumbents
    found_at = np.where(inc.order >= 0, np.searchsorted(np.sort(order[solved]), inc.order) + 1,
                        np.searchsorted(times[1:], inc.time, side="right")).astype(np.int64)
    primal_min = np.full(n + 1, np.inf)
    if len(inc):
        np.minimum.at(primal_min, np.minimum(found_at, n), sign * inc.objective)
        primal_min = np.minimum.accumulate(primal_min)
    dual_min = np.minimum(dual_min, primal_min)
    # Strong-branching look-ahead bounds reach the children but not the node table; the
    # engine's snapshots include them. The true dual bound never falls (children bound
    # no lower than their parent), so the running maximum of both stays valid.
    prog = table.progress
    snap = sign * prog.dual_bound
    ok = np.isfinite(snap) & (prog.nodes <= n)
    if ok.any():
        np.maximum.at(dual_min, prog.nodes[ok], snap[ok])
    dual_min = np.maximum.accumulate(dual_min)

    created = np.cumsum(np.bincount(np.minimum(np.r_[born_at, unseen_born], n + 1),
                                    minlength=n + 2))[: n + 1]
    gone = np.cumsum(np.bincount(np.minimum(done_at, n + 1), minlength=n + 2))[: n + 1]
    leaf = np.isin(status, _LEAF_CODES) & (done_at <= n)
    leaves = np.cumsum(np.bincount(done_at[leaf], minlength=n + 1))[: n + 1]
    weight = np.cumsum(np.bincount(done_at[leaf], weights=np.exp2(-c["depth"][leaf].astype(float)),
                                   minlength=n + 1))[: n + 1]

    primal = sign * primal_min
    primal[~np.isfinite(primal_min)] = np.nan
    dual = sign * dual_min
    end = table.end or {}
    end_time = float(end.get("time") or 0.0)
    end_time = max(end_time, float(times[-1]), float(inc.time.max()) if len(inc) else 0.0)
    return NodeTrace(
        sense=table.sense, sign=sign, time=times, primal=primal, dual=dual,
        gap=relative_gap(primal, dual), open=created - gone, done=gone,
        leaves=leaves.astype(np.int64), weight=weight, done_at=done_at, born_at=born_at,
        open_until=last, waiting_bound_min=waiting_bound, found_at=found_at, end_time=end_time,
    )


def _filled_bounds(bound: np.ndarray, parent_row: np.ndarray) -> np.ndarray:
    """Node bounds with unknown (NaN) ones replaced by the nearest known ancestor's.

    Parents come before children, so each pass settles one more level; engine logs
    only have NaN at infeasible or failed nodes and need at most one pass."""
    out = bound.astype(np.float64, copy=True)
    for _ in range(64):
        missing = np.flatnonzero(np.isnan(out) & (parent_row >= 0))
        if not missing.size:
            break
        fill = out[parent_row[missing]]
        known = ~np.isnan(fill)
        if not known.any():
            break
        out[missing[known]] = fill[known]
    return out


def _cover_min(lo: np.ndarray, hi: np.ndarray, value: np.ndarray, size: int) -> np.ndarray:
    """For each k < size, the smallest value over the intervals [lo, hi] that contain k
    (+inf where none does).

    Each interval is written as two overlapping blocks whose length is the largest power
    of two that fits (as in a sparse table), then blocks are pushed down one level at a
    time: O(size · log size) with numpy, no Python loop over intervals."""
    keep = hi >= lo
    lo, hi, value = lo[keep], hi[keep], value[keep]
    cur = np.full(size, np.inf)
    if not lo.size:
        return cur
    length = hi - lo + 1
    level = np.frexp(length.astype(np.float64))[1] - 1  # floor(log2(length)), exact
    top = int(level.max())
    for j in range(top, -1, -1):
        if j < top:
            half = 1 << j
            nxt = cur.copy()
            np.minimum(nxt[half:], cur[:-half], out=nxt[half:])
            cur = nxt
        at = level == j
        if at.any():
            width = 1 << j
            np.minimum.at(cur, lo[at], value[at])
            np.minimum.at(cur, hi[at] - width + 1, value[at])
    return cur


# ------------------------------------------------------------------ root gap
@dataclass(frozen=True)
class RootGap:
    """The root relaxation against the best known value (the final incumbent, or the
    final dual bound when there is none)."""

    root_bound: float
    reference: float
    gap: float  # relative, |reference − root| / max(|reference|, |root|, 1e-10)
    reference_kind: str  # "incumbent" or "dual bound"
    root: int  # node id

    def to_dict(self) -> dict[str, Any]:
        return {"root_bound": self.root_bound, "reference": self.reference, "gap": self.gap,
                "reference_kind": self.reference_kind, "root": self.root}


def root_row(table: RunTable) -> int | None:
    """Row of the solved root with a bound, or None."""
    c = table.columns
    roots = np.flatnonzero(c["parent_row"] < 0)
    if len(roots) != 1 or c["order"][roots[0]] < 0 or np.isnan(c["bound"][roots[0]]):
        return None
    return int(roots[0])


def best_known(table: RunTable) -> tuple[float, str] | None:
    """The best known objective: the last incumbent, else a finite final dual bound."""
    trace = node_trace(table)
    if len(table.incumbents):
        return float(trace.primal[-1]), "incumbent"
    final = float(trace.dual[-1])
    if np.isfinite(final):
        return final, "dual bound"
    return None


def root_gap(table: RunTable) -> RootGap | None:
    """Relative gap between the root bound and the best known value; None if either is
    missing."""
    r = root_row(table)
    ref = best_known(table)
    if r is None or ref is None:
        return None
    bound = float(table.columns["bound"][r])
    return RootGap(bound, ref[0], float(relative_gap(ref[0], bound)), ref[1],
                   int(table.columns["id"][r]))


def gap_closed(table: RunTable) -> np.ndarray:
    """Share of the root gap the dual bound has closed after k nodes, in [0, 1]:
    (d_k − d_root) / (reference − d_root) in minimisation form; 1 when the root had no
    gap, NaN before the root is solved or without a reference."""
    trace = node_trace(table)
    rg = root_gap(table)
    out = np.full(trace.processed + 1, np.nan)
    if rg is None:
        return out
    s = trace.sign
    span = s * (rg.reference - rg.root_bound)
    if span <= 0:
        out[1:] = 1.0
        return out
    with np.errstate(invalid="ignore"):
        closed = (trace.dual_min - s * rg.root_bound) / span
    out[1:] = np.clip(closed[1:], 0.0, 1.0)
    return out


# ------------------------------------------------------------------ integrals
@dataclass(frozen=True)
class Integral:
    """∫ gap(t) dt over [0, horizon] and its average (the integral over the horizon)."""

    value: float
    horizon: float
    axis: str  # "time" (seconds) or "nodes"
    reference: float | None

    @property
    def average(self) -> float | None:
        return self.value / self.horizon if self.horizon > 0 else None

    def to_dict(self) -> dict[str, Any]:
        return {"value": self.value, "horizon": self.horizon, "axis": self.axis,
                "reference": self.reference, "average": self.average}


def gap_function(values: np.ndarray, reference: float | None) -> np.ndarray:
    """Berthold's primal gap function (Berthold, "Measuring the impact of primal
    heuristics", Operations Research Letters 41(6), 2013): 1 where no value is known or
    its sign differs from the reference's, 0 where both are 0, otherwise
    |reference − value| / max(|reference|, |value|)."""
    v = np.asarray(values, dtype=np.float64)
    if reference is None or not np.isfinite(reference):
        return np.ones(v.shape)
    with np.errstate(invalid="ignore", divide="ignore"):
        g = np.abs(reference - v) / np.maximum(np.abs(reference), np.abs(v))
    g = np.where((v == 0) & (reference == 0), 0.0, g)
    return np.where(~np.isfinite(v) | (np.sign(v) * np.sign(reference) < 0), 1.0, g)


def _axis_points(trace: NodeTrace, axis: str) -> tuple[np.ndarray, float]:
    if axis == "time":
        return trace.time, trace.end_time
    if axis == "nodes":
        return np.arange(trace.processed + 1, dtype=np.float64), float(trace.processed)
    raise ValueError(f"axis: must be 'time' or 'nodes', got {axis!r}")


def _step_integral(x: np.ndarray, g: np.ndarray, horizon: float) -> float:
    """∫ of the step function that takes g[i] on [x[i], x[i+1]) up to ``horizon``."""
    ends = np.r_[x[1:], horizon]
    return float(np.sum(g * np.clip(ends - x, 0.0, None)))


def primal_integral(table: RunTable, *, axis: str = "time",
                    reference: float | None = None) -> Integral:
    """Primal integral (Berthold 2013): ∫ of the primal gap function over the run, with
    gap 1 before the first incumbent. ``reference`` defaults to the best known value."""
    trace = node_trace(table)
    ref = reference if reference is not None else _reference(table)
    inc = table.incumbents
    horizon = _axis_points(trace, axis)[1]
    x = inc.time.astype(np.float64) if axis == "time" else trace.found_at.astype(np.float64)
    keep = np.argsort(x, kind="stable")
    x, v = np.r_[0.0, x[keep]], np.r_[np.nan, inc.objective[keep]]
    return Integral(_step_integral(x, gap_function(v, ref), horizon), horizon, axis, ref)


def dual_integral(table: RunTable, *, axis: str = "time",
                  reference: float | None = None) -> Integral:
    """Dual integral: the same integral for the dual bound (gap 1 until the root is
    solved)."""
    trace = node_trace(table)
    ref = reference if reference is not None else _reference(table)
    x, horizon = _axis_points(trace, axis)
    return Integral(_step_integral(x, gap_function(trace.dual, ref), horizon), horizon, axis,
                    ref)


def _reference(table: RunTable) -> float | None:
    known = best_known(table)
    return None if known is None else known[0]


# ------------------------------------------------------------------ summary
@dataclass(frozen=True)
class Measures:
    nodes: int  # processed
    tree_nodes: int  # rows, processed or not
    primal: float | None
    dual: float | None
    gap: float | None
    root: RootGap | None
    tree_weight: float
    primal_integral: Integral
    dual_integral: Integral
    first_incumbent_at: int | None  # processed nodes before the first incumbent counted

    def to_dict(self) -> dict[str, Any]:
        return {"nodes": self.nodes, "tree_nodes": self.tree_nodes,
                "primal": self.primal, "dual": self.dual, "gap": self.gap,
                "root": None if self.root is None else self.root.to_dict(),
                "tree_weight": self.tree_weight,
                "primal_integral": self.primal_integral.to_dict(),
                "dual_integral": self.dual_integral.to_dict(),
                "first_incumbent_at": self.first_incumbent_at}


def _finite(x: float) -> float | None:
    return float(x) if np.isfinite(x) else None


def measures(table: RunTable) -> Measures:
    """The run's summary measures, JSON-ready through `Measures.to_dict`."""
    trace = node_trace(table)
    return Measures(
        nodes=trace.processed, tree_nodes=len(table),
        primal=_finite(trace.primal[-1]), dual=_finite(trace.dual[-1]),
        gap=_finite(trace.gap[-1]), root=root_gap(table),
        tree_weight=float(trace.weight[-1]),
        primal_integral=primal_integral(table), dual_integral=dual_integral(table),
        first_incumbent_at=int(trace.found_at.min()) if len(trace.found_at) else None,
    )
