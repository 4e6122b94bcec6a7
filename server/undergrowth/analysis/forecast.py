"""How big the search tree will get, and how long that takes, at any prefix of a run.

Estimates of the final number of tree nodes (every node, including those closed
without a solve), each from a published progress measure:

- ``backtrack``: the weighted backtrack estimator 2·leaves/W − 1, W the tree weight
  Σ 2^−depth over closed leaves (Kilby, Slaney, Thiébaux & Walsh, "Estimating search
  tree size", AAAI 2006). Exact on a finished binary tree.
- ``leaf-frequency``: leaves / nodes reaches ½ when a binary tree is finished
  (leaves = (nodes + 1) / 2); the series is extrapolated to ½ by double exponential
  smoothing (Hendel, Anderson, Le Bodic & Pfetsch, "Estimating the size of
  branch-and-bound trees", INFORMS Journal on Computing, 2021).
- ``tree-weight``: the same paper's projection of the tree weight to 1 by double
  exponential smoothing.
- ``gap``: the relative gap extrapolated to the target gap by double exponential
  smoothing (Özaltın, Hunsaker & Schaefer, INFORMS Journal on Computing 23(3), 2011).

The combined estimate is the median of the available ones taken in log space; the
range is their spread, widened to at least a factor 2 either side, and never below
the nodes already in the tree plus those still waiting (each waiting node is at
least one more node). Remaining time = remaining nodes × the
recent seconds per node. `backtest` replays a finished run's prefixes (10%, 25%,
50% of the processed nodes) against its true size. See docs/findings.md.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from .measures import NodeTrace, node_trace

if TYPE_CHECKING:
    from .table import RunTable

__all__ = ["BACKTEST_FRACTIONS", "BacktestPoint", "Forecast", "MethodEstimate", "backtest",
           "forecast", "smooth"]

# Holt's double exponential smoothing: level and trend weights. Moderate values: the
# series are noisy node by node, and the recent trend matters more than the early one.
LEVEL_WEIGHT = 0.3
TREND_WEIGHT = 0.2
# Series are sampled at most this many times over the prefix (evenly in processed
# nodes): enough to see a trend, and cheap at a million nodes.
SAMPLES = 100
# An extrapolation further than this many times the nodes done so far is not a
# forecast but a shrug; it is reported as unavailable.
MAX_EXTRAPOLATION = 1000.0
# Seconds per node are measured over this share of the most recent nodes.
RECENT_SHARE = 0.2
# The range is at least this factor either side of the point: in the back-test
# (benchmarks/forecast_backtest.py) about two thirds of the forecasts made at half the
# nodes landed within a factor of 2, and spreads between methods alone are often narrow.
RANGE_FACTOR = 2.0
BACKTEST_FRACTIONS = (0.10, 0.25, 0.50)
METHODS = ("backtrack", "leaf-frequency", "tree-weight", "gap")


@dataclass(frozen=True)
class MethodEstimate:
    method: str
    total: float | None  # estimated final tree size; None when the method has nothing
    note: str  # why it is missing, or what it rests on

    def to_dict(self) -> dict[str, Any]:
        return {"method": self.method, "total": self.total, "note": self.note}


@dataclass(frozen=True)
class Forecast:
    """A tree-size and time forecast after ``upto`` processed nodes."""

    upto: int  # processed nodes the forecast saw
    processed_total: int  # processed nodes in the whole run (for a replayed prefix)
    done: int  # tree nodes processed or discarded by then
    open: int  # nodes waiting
    finished: bool  # nothing waits: the tree is complete
    total_nodes: float | None  # point estimate of the final tree size
    low: float | None
    high: float | None
    remaining_nodes: float | None
    remaining_seconds: float | None
    remaining_seconds_low: float | None
    remaining_seconds_high: float | None
    seconds_per_node: float | None
    elapsed: float
    methods: list[MethodEstimate] = field(default_factory=list)

    def to_dict(self) -> dict[str, Any]:
        return {
            "upto": self.upto, "processed_total": self.processed_total, "done": self.done,
            "open": self.open, "finished": self.finished, "total_nodes": self.total_nodes,
            "low": self.low, "high": self.high, "remaining_nodes": self.remaining_nodes,
            "remaining_seconds": self.remaining_seconds,
            "remaining_seconds_low": self.remaining_seconds_low,
            "remaining_seconds_high": self.remaining_seconds_high,
            "seconds_per_node": self.seconds_per_node, "elapsed": self.elapsed,
            "methods": [m.to_dict() for m in self.methods],
        }


# ------------------------------------------------------------------ smoothing
def smooth(x: np.ndarray, y: np.ndarray, *, alpha: float = LEVEL_WEIGHT,
           beta: float = TREND_WEIGHT) -> tuple[float, float]:
    """Holt's double exponential smoothing of y over (possibly unevenly spaced) x:
    the final level and the trend per unit of x."""
    x = np.asarray(x, dtype=np.float64)
    y = np.asarray(y, dtype=np.float64)
    level = float(y[0])
    if len(y) < 2:
        return level, 0.0
    trend = float((y[1] - y[0]) / max(x[1] - x[0], 1e-12))
    for i in range(1, len(y)):
        step = float(x[i] - x[i - 1])
        if step <= 0:
            continue
        previous = level
        level = alpha * float(y[i]) + (1.0 - alpha) * (level + trend * step)
        trend = beta * (level - previous) / step + (1.0 - beta) * trend
    return level, trend


def _reach(x_now: float, level: float, trend: float, target: float) -> float | None:
    """Where the smoothed line level + trend·(x − x_now) meets ``target``, if ahead."""
    if (target - level) * trend <= 0:
        return None if abs(target - level) > 1e-12 else x_now
    return x_now + (target - level) / trend


# ------------------------------------------------------------------ the methods
def _sample(upto: int) -> np.ndarray:
    """Processed-node counts at which the series are read (1 … upto, evenly)."""
    return np.unique(np.linspace(1, upto, min(upto, SAMPLES)).round().astype(np.int64))


def _backtrack(trace: NodeTrace, k: int) -> MethodEstimate:
    leaves, w = int(trace.leaves[k]), float(trace.weight[k])
    if leaves == 0 or w <= 0:
        return MethodEstimate("backtrack", None, "no closed leaf yet")
    return MethodEstimate("backtrack", 2.0 * leaves / w - 1.0,
                          f"{leaves} closed leaves, tree weight {w:.4g}")


def _extrapolated(method: str, trace: NodeTrace, k: int, series: np.ndarray, target: float,
                  what: str) -> MethodEstimate:
    at = _sample(k)
    x = trace.done[at].astype(np.float64)
    y = series[at]
    keep = np.isfinite(y)
    if keep.sum() < 3:
        return MethodEstimate(method, None, f"too few points of the {what}")
    level, trend = smooth(x[keep], y[keep])
    now = float(trace.done[k])
    hit = _reach(now, level, trend, target)
    if hit is None:
        return MethodEstimate(method, None, f"the {what} is not moving towards {target:g}")
    if hit > MAX_EXTRAPOLATION * max(now, 1.0):
        return MethodEstimate(method, None, f"the {what} moves too slowly to extrapolate")
    return MethodEstimate(method, hit, f"smoothed {what} {level:.4g}, trend {trend:.3g} per node")


def _leaf_frequency(trace: NodeTrace, k: int) -> MethodEstimate:
    with np.errstate(invalid="ignore", divide="ignore"):
        freq = trace.leaves / trace.done.astype(np.float64)
    return _extrapolated("leaf-frequency", trace, k, freq, 0.5, "leaf frequency")


def _tree_weight(trace: NodeTrace, k: int) -> MethodEstimate:
    return _extrapolated("tree-weight", trace, k, trace.weight, 1.0, "tree weight")


def _gap(trace: NodeTrace, k: int, target: float) -> MethodEstimate:
    if not np.isfinite(trace.gap[k]):
        return MethodEstimate("gap", None, "no incumbent yet")
    return _extrapolated("gap", trace, k, trace.gap, target, "gap")


def _target_gap(table: RunTable) -> float:
    value = (table.header.get("settings") or {}).get("gap")
    try:
        return max(float(value), 0.0)
    except (TypeError, ValueError):
        return 0.0


# ------------------------------------------------------------------ forecast
def forecast(table: RunTable, upto: int | None = None) -> Forecast:
    """The forecast after ``upto`` processed nodes (default: all of them).

    Only what was known after ``upto`` nodes is used, so a prefix of a finished run
    forecasts as it would have live."""
    trace = node_trace(table)
    n = trace.processed
    if upto is None:
        upto = n
    if not isinstance(upto, int | np.integer) or not 0 <= upto <= n:
        raise ValueError(f"upto: must be an integer from 0 to {n}, got {upto!r}")
    k = int(upto)
    done, waiting = int(trace.done[k]), int(trace.open[k])
    elapsed = float(trace.time[k])
    if k == 0:
        return Forecast(0, n, done, waiting, False, None, None, None, None, None, None, None,
                        None, elapsed, [MethodEstimate(m, None, "nothing processed yet")
                                        for m in METHODS])
    if waiting == 0:
        return Forecast(k, n, done, 0, True, float(done), float(done), float(done), 0.0, 0.0,
                        0.0, 0.0, _seconds_per_node(trace, k), elapsed,
                        [MethodEstimate(m, float(done), "the tree is complete")
                         for m in METHODS])
    methods = [_backtrack(trace, k), _leaf_frequency(trace, k), _tree_weight(trace, k),
               _gap(trace, k, _target_gap(table))]
    floor = float(done + waiting)
    values = np.array([m.total for m in methods if m.total is not None], dtype=np.float64)
    point, low, high = combine(np.maximum(values, floor), floor)
    per_node = _seconds_per_node(trace, k)

    def left(total: float | None) -> float | None:
        return None if total is None else max(total - done, 0.0)

    def secs(nodes: float | None) -> float | None:
        return None if nodes is None or per_node is None else nodes * per_node

    rest = left(point)
    return Forecast(k, n, done, waiting, False, point, low, high, rest, secs(rest),
                    secs(left(low)), secs(left(high)), per_node, elapsed, methods)


def combine(values: np.ndarray, floor: float) -> tuple[float, float, float | None]:
    """Point estimate and range from the methods' estimates (each already >= floor).

    The point is the median in log space: the methods err by factors, not by amounts,
    and one wild extrapolation should not drag the answer. The range spans the
    estimates and at least a factor RANGE_FACTOR either side of the point. With no
    estimate at all, the floor is all we know: a lower bound, no upper one."""
    if not values.size:
        return floor, floor, None
    point = float(np.exp(np.median(np.log(values))))
    low = max(floor, min(float(values.min()), point / RANGE_FACTOR))
    high = max(float(values.max()), point * RANGE_FACTOR)
    return point, low, high


def _seconds_per_node(trace: NodeTrace, k: int) -> float | None:
    """Seconds per tree node over the most recent share of the prefix."""
    start = max(0, min(k - 1, int(math.floor(k * (1.0 - RECENT_SHARE)))))
    nodes = int(trace.done[k] - trace.done[start])
    span = float(trace.time[k] - trace.time[start])
    if nodes <= 0:
        return None
    return span / nodes


# ------------------------------------------------------------------ back-test
@dataclass(frozen=True)
class BacktestPoint:
    """The forecast made after ``fraction`` of the processed nodes, against the truth."""

    fraction: float
    upto: int
    forecast: float | None
    low: float | None
    high: float | None
    true_total: int
    ratio: float | None  # forecast / true total
    methods: dict[str, float | None]  # each method's estimate / true total

    def to_dict(self) -> dict[str, Any]:
        return {"fraction": self.fraction, "upto": self.upto, "forecast": self.forecast,
                "low": self.low, "high": self.high, "true_total": self.true_total,
                "ratio": self.ratio, "methods": self.methods}


def backtest(table: RunTable, fractions: tuple[float, ...] = BACKTEST_FRACTIONS
             ) -> list[BacktestPoint]:
    """Forecasts at each fraction of a finished run's processed nodes against the
    final tree size. ValueError if the run left nodes open (its size is unknown)."""
    trace = node_trace(table)
    if trace.processed == 0 or int(trace.open[-1]) != 0:
        raise ValueError(f"{table.path}: the run is not finished (nodes still open), so its "
                         "true tree size is unknown")
    true_total = int(trace.done[-1])
    out = []
    for f in fractions:
        if not 0 < f <= 1:
            raise ValueError(f"fractions: each must be in (0, 1], got {f}")
        k = max(1, int(round(f * trace.processed)))
        fc = forecast(table, k)
        out.append(BacktestPoint(
            f, k, fc.total_nodes, fc.low, fc.high, true_total,
            None if fc.total_nodes is None else fc.total_nodes / true_total,
            {m.method: None if m.total is None else m.total / true_total for m in fc.methods}))
    return out
