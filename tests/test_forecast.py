"""Tree-size forecast: exact where the theory says so, causal on prefixes, back-tested."""

from __future__ import annotations

import gzip
import json
import time

import numpy as np
import pytest

from families import multi_knapsack
from test_measures import solve_to_table, ticking
from undergrowth.analysis.findings import diagnose
from undergrowth.analysis.forecast import backtest, forecast, smooth
from undergrowth.analysis.table import NODE_COLUMNS, IncumbentSeries, ProgressSeries, RunTable
from undergrowth.record import Recorder

DEPTH = 6
SIZE = 2 ** (DEPTH + 1) - 1  # 127 nodes in a complete binary tree of depth 6


def _complete_tree(path, *, breadth_first: bool) -> RunTable:
    """A complete binary tree of depth DEPTH, every leaf pruned, in DFS or BFS order."""
    with Recorder(path, model={"name": "complete", "sense": "min"}, progress_every=0,
                  progress_seconds=None, clock=ticking(0.01)) as rec:
        rec.incumbent(100.0)  # an outside solution: every leaf can be pruned by bound
        next_id = [1]
        queue = [(0, None, 0, None)]
        while queue:
            node, parent, depth, branch = queue.pop(0) if breadth_first else queue.pop()
            if depth == DEPTH:
                rec.node(node, parent, "pruned", 100.0, branch=branch)
                continue
            rec.node(node, parent, "branched", float(depth), branch=branch,
                     branching={"var": depth, "value": 0.5})
            down, up = next_id[0], next_id[0] + 1
            next_id[0] += 2
            children = [(down, node, depth + 1, (depth, "down", 0)),
                        (up, node, depth + 1, (depth, "up", 1))]
            queue += children if breadth_first else children[::-1]
    return RunTable.open(path, use_cache=False)


@pytest.mark.parametrize("breadth_first", [False, True])
def test_backtrack_estimate_is_exact_on_a_complete_binary_tree(tmp_path, breadth_first):
    # Kilby et al. (AAAI 2006): every leaf sits at depth d, so W = leaves·2^-d and
    # 2·leaves/W − 1 = 2^(d+1) − 1, the exact size, from the first leaf on (by hand).
    table = _complete_tree(tmp_path / "tree.jsonl", breadth_first=breadth_first)
    assert len(table) == SIZE
    first_leaf = 7 if not breadth_first else 64  # processed nodes before a leaf exists
    for k in range(first_leaf, SIZE):
        fc = forecast(table, k)
        estimate = {m.method: m.total for m in fc.methods}["backtrack"]
        assert estimate == SIZE, k
        assert fc.low >= fc.done + fc.open  # never below what is already known
    final = forecast(table)
    assert final.finished and final.total_nodes == SIZE and final.remaining_nodes == 0


def test_holt_smoothing_recovers_a_straight_line():
    # by hand: on y = 3 + 2x the one-step forecast is always exact, so the level is the
    # last value (23 at x = 10) and the trend stays 2
    xs = [float(x) for x in range(11)]
    level, trend = smooth(xs, [3 + 2 * x for x in xs])
    assert level == pytest.approx(23.0) and trend == pytest.approx(2.0)
    # uneven spacing: the trend is per unit of x, not per step
    xs = [0.0, 1.0, 5.0, 6.0, 20.0]
    level, trend = smooth(xs, [1 - 0.5 * x for x in xs])
    assert level == pytest.approx(-9.0) and trend == pytest.approx(-0.5)


@pytest.fixture(scope="module")
def knapsack_runs(tmp_path_factory):
    settings = {"branching": "most-fractional", "select": "best-bound"}
    model = multi_knapsack(4, n=60, m=3)
    full = solve_to_table(model, tmp_path_factory.mktemp("full"), **settings)
    limited = solve_to_table(model, tmp_path_factory.mktemp("limited"), node_limit=300,
                             **settings)
    return full, limited


def test_a_prefix_forecasts_as_the_live_run_did(knapsack_runs):
    # the engine is deterministic: a run stopped after 300 nodes saw exactly what the
    # full run had seen after 300 nodes, so their node forecasts must agree
    full, limited = knapsack_runs
    live, replay = forecast(limited), forecast(full, 300)
    assert live.upto == replay.upto == 300
    assert (live.done, live.open) == (replay.done, replay.open)
    assert {m.method: m.total for m in live.methods} == pytest.approx(
        {m.method: m.total for m in replay.methods})
    assert live.total_nodes == pytest.approx(replay.total_nodes)
    assert not live.finished and live.remaining_nodes > 0
    assert live.remaining_seconds is not None and live.remaining_seconds >= 0
    json.dumps(live.to_dict(), allow_nan=False)  # JSON-ready: no NaN or inf


def test_backtest_on_a_finished_run(knapsack_runs):
    full, limited = knapsack_runs
    points = backtest(full)
    true = len(full)
    assert [p.fraction for p in points] == [0.10, 0.25, 0.50]
    assert [p.upto for p in points] == [round(f * 1355) for f in (0.10, 0.25, 0.50)]
    for p in points:
        assert p.true_total == true and p.ratio == pytest.approx(p.forecast / true)
        json.dumps(p.to_dict(), allow_nan=False)
    # a loose sanity bound, not a tuned figure: half-way, within a factor of 4
    assert 0.25 <= points[-1].ratio <= 4.0
    with pytest.raises(ValueError, match="not finished"):
        backtest(limited)


def test_bad_prefix_is_a_value_error(knapsack_runs):
    full, _ = knapsack_runs
    with pytest.raises(ValueError, match="upto"):
        forecast(full, -1)
    with pytest.raises(ValueError, match="upto"):
        forecast(full, 10**9)
    assert forecast(full, 0).total_nodes is None


def _complete_table(depth: int) -> RunTable:
    """A complete binary tree in breadth-first order, built straight as columns."""
    n = 2 ** (depth + 1) - 1
    ids = np.arange(n, dtype=np.int64)
    parent = np.where(ids > 0, (ids - 1) // 2, -1)
    level = np.floor(np.log2(ids + 1)).astype(np.int64)
    cols = {k: np.zeros(n, dtype=v) for k, v in NODE_COLUMNS.items()}
    cols.update(id=ids, parent=parent, parent_row=parent, depth=level, order=ids,
                time=ids * 1e-5, bound=level.astype(float), lp_objective=level.astype(float),
                status=np.where(level < depth, 0, 2).astype(np.uint8),
                branch_var=np.where(ids > 0, level - 1, -1),
                branch_dir=np.where(ids > 0, 1 + (ids % 2 == 0), 0).astype(np.uint8))
    empty = np.zeros(0)
    incumbents = IncumbentSeries(time=np.zeros(1), order=np.full(1, -1), node=np.full(1, -1),
                                 objective=np.full(1, float(depth)), source=np.full(1, 3,
                                                                                   np.uint8))
    progress = ProgressSeries(empty, empty.astype(np.int64), empty.astype(np.int64), empty,
                              empty, empty, empty)
    header = {"model": {"name": "complete", "sense": "min", "integers": depth},
              "settings": {"select": "breadth-first", "gap": 0.0}}
    return RunTable(path="complete", header=header, end=None, warnings=[], columns=cols,
                    incumbents=incumbents, progress=progress)


def test_a_million_node_tree_is_forecast_and_diagnosed_in_seconds():
    # 2^20 − 1 = 1,048,575 nodes; the backtrack estimate is exact (by hand, as above)
    table = _complete_table(19)
    start = time.perf_counter()
    fc = forecast(table, 800_000)
    points = backtest(table)
    found = diagnose(table)
    seconds = time.perf_counter() - start
    assert {m.method: m.total for m in fc.methods}["backtrack"] == len(table)
    # breadth-first: the first leaf is node 2^19 − 1, just before half the nodes
    assert [p.methods["backtrack"] for p in points] == [None, None, 1.0]
    assert isinstance(found, list)
    assert seconds < 10.0  # a few seconds on the 2-core development machine


def test_a_log_still_being_written_counts_its_waiting_children(knapsack_runs, tmp_path):
    # a node is written when processed, so a live log has no rows for waiting children;
    # cut the full log after its first progress snapshot past 400 nodes and compare
    full, _ = knapsack_runs
    with gzip.open(full.path, "rt") as f:
        lines = f.read().splitlines(keepends=True)
    cut, k = next((i, json.loads(line)["nodes"]) for i, line in enumerate(lines)
                  if '"kind":"progress"' in line and json.loads(line)["nodes"] >= 400)
    live_path = tmp_path / "live.jsonl"
    live_path.write_text("".join(lines[:cut + 1]))
    live = RunTable.open(live_path, use_cache=False)
    assert live.end is None and (live.order >= 0).sum() == k
    now, then = forecast(live), forecast(full, k)
    # the engine's own count of waiting nodes at that snapshot
    assert now.open == then.open == int(live.progress.open[-1])
    assert now.done == then.done
    assert {m.method: m.total for m in now.methods} == pytest.approx(
        {m.method: m.total for m in then.methods})
