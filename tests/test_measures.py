"""Measures of a run: the per-node trace, root gap, gap closed, primal and dual integral,
tree weight. Hand-made runs have their values worked out in the comments."""

from __future__ import annotations

import itertools
import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from undergrowth.analysis.measures import (
    _cover_min,
    dual_integral,
    gap_closed,
    gap_function,
    measures,
    node_trace,
    primal_integral,
    root_gap,
)
from undergrowth.analysis.table import RunTable
from undergrowth.model import Problem
from undergrowth.record import Recorder
from undergrowth.runlog.writer import RunLogWriter
from undergrowth.samples import depot_siting
from undergrowth.search import Search, SearchSettings


def solve_to_table(problem: Problem, directory, **settings) -> RunTable:
    """Engine → RunLogWriter → RunTable.open, the path every recorded run takes."""
    options = {"gap": 0.0, "absolute_gap": 1e-9, **settings}
    search = Search(problem, SearchSettings(**options))
    path = directory / f"{problem.name}.{options.get('branching', 'x')}.jsonl.gz"
    with RunLogWriter(path, search.header()) as writer:
        for ev in search.events():
            writer.write(ev)
    return RunTable.open(path, use_cache=False)


def ticking(step: float = 1.0):
    counter = itertools.count()
    return lambda: step * next(counter)


def wolsey() -> Problem:
    # from memory: Wolsey, Integer Programming (Wiley, 1998), branch-and-bound chapter example
    return Problem.from_arrays(
        [4, -1], [[7, -2], [0, 1], [2, -2]], row_upper=[14, 3, 3], integrality=[1, 1],
        sense="max", col_names=["x1", "x2"], name="wolsey")


@pytest.fixture(scope="module")
def step_run(tmp_path_factory):
    """A minimisation recorded by hand, times given explicitly:

    t=0 root (bound 5) branched; t=1 node 1 integral 10, incumbent 10;
    t=3 node 2 branched (bound 6); t=3 incumbent 8 from node 3 (integral 8);
    node 4 pruned at t=3.5; the run ends at t=4.
    """
    path = tmp_path_factory.mktemp("measures") / "step.jsonl"
    with Recorder(path, model={"name": "step", "sense": "min"}, progress_every=0,
                  progress_seconds=None, clock=ticking()) as rec:
        rec.node(0, None, "branched", 5.0, time=0.0, branching={"var": 0, "value": 0.5})
        rec.node(1, 0, "integral", 10.0, time=1.0, branch=(0, "down", 0))
        rec.incumbent(10.0, node=1, time=1.0)
        rec.node(2, 0, "branched", 6.0, time=3.0, branch=(0, "up", 1),
                 branching={"var": 1, "value": 0.5})
        rec.node(3, 2, "integral", 8.0, time=3.0, branch=(1, "down", 0))
        rec.incumbent(8.0, node=3, time=3.0)
        rec.node(4, 2, "pruned", 9.0, time=3.5, branch=(1, "up", 1))
        rec.finish(time=4.0)
    return RunTable.open(path, use_cache=False)


def test_primal_integral_of_a_step_function(step_run):
    # by hand (Berthold 2013's definition, reference = best known value 8):
    # gap 1 on [0, 1) (no incumbent), |8 − 10| / 10 = 0.2 on [1, 3), 0 on [3, 4]
    # integral = 1·1 + 0.2·2 + 0·1 = 1.4; average over 4 s = 0.35
    pi = primal_integral(step_run)
    assert pi.value == pytest.approx(1.4)
    assert pi.horizon == pytest.approx(4.0) and pi.average == pytest.approx(0.35)
    # over nodes: incumbents count from processed-node 2 and 4 (orders 1 and 3):
    # 1·2 + 0.2·2 = 2.4 over 5 nodes
    assert primal_integral(step_run, axis="nodes").value == pytest.approx(2.4)


def test_dual_integral_of_a_step_function(step_run):
    # by hand: the dual bound after k nodes is the smallest inherited bound among the
    # waiting nodes, capped by the incumbent: k=0 nothing solved; k=1: nodes 1, 2 wait
    # with the root's 5; k=2: node 2 still waits (5); k=3: nodes 3, 4 wait with 6;
    # k=4: node 4 still waits (6); k=5: nothing waits, so the incumbent 8.
    trace = node_trace(step_run)
    assert trace.dual.tolist() == [-math.inf, 5.0, 5.0, 6.0, 6.0, 8.0]
    # gap function against 8: 1 (k=0), 3/8, 3/8, 2/8, 2/8, 0. Node times: k=1 at 0,
    # k=2 at 1, k=3 and k=4 at 3, k=5 at 3.5, end at 4. Over time:
    # 3/8·(1 − 0) + 3/8·(3 − 1) + 2/8·(3 − 3) + 2/8·(3.5 − 3) + 0 = 1.25
    assert dual_integral(step_run).value == pytest.approx(1.25)
    # over nodes, one unit per k from 0 to 4: 1 + 3/8 + 3/8 + 2/8 + 2/8 = 2.25
    assert dual_integral(step_run, axis="nodes").value == pytest.approx(2.25)


def test_trace_counts_open_nodes_leaves_and_tree_weight(step_run):
    trace = node_trace(step_run)
    # by hand: open after k nodes = created − done: 1, 2, 1, 2, 1, 0
    assert trace.open.tolist() == [1, 2, 1, 2, 1, 0]
    # leaves: node 1 (k=2), node 3 (k=4), node 4 (k=5); weight 1/2, then + 1/4 + 1/4
    assert trace.leaves.tolist() == [0, 0, 1, 1, 2, 3]
    assert trace.weight.tolist() == [0, 0, 0.5, 0.5, 0.75, 1.0]
    assert np.isnan(trace.primal[:2]).all() and trace.primal[2:].tolist() == [10, 10, 8, 8]


def test_gap_function_edge_cases():
    # Berthold 2013: 1 without a value or with opposite signs, 0 when both are 0
    g = gap_function(np.array([np.nan, -1.0, 0.0, 5.0, 4.0]), 4.0)
    np.testing.assert_allclose(g, [1.0, 1.0, 1.0, 0.2, 0.0])
    assert gap_function(np.array([0.0]), 0.0).tolist() == [0.0]


def test_root_gap_of_the_wolsey_example(tmp_path):
    # check value (from memory, Wolsey 1998; CHECK_VALUES.md): root LP 59/7, optimum 7,
    # relative root gap |59/7 − 7| / (59/7) = 10/59
    table = solve_to_table(wolsey(), tmp_path, branching="most-fractional",
                           select="best-bound")
    rg = root_gap(table)
    assert rg.root_bound == pytest.approx(59 / 7) and rg.reference == pytest.approx(7)
    assert rg.gap == pytest.approx(10 / 59)
    closed = gap_closed(table)
    assert np.isnan(closed[0]) and closed[-1] == pytest.approx(1.0)
    assert np.all(np.diff(closed[1:]) >= -1e-12)  # the dual bound never falls back


@pytest.fixture(scope="module")
def depot_reliability(tmp_path_factory):
    return solve_to_table(depot_siting(tight=False), tmp_path_factory.mktemp("depot"),
                          branching="reliability", select="hybrid", progress_every=5)


def test_trace_agrees_with_the_engines_own_snapshots(depot_reliability):
    # the engine's progress events (dual bound, open nodes, tree weight) are written
    # from its own open list; the trace rebuilt from the node table must agree
    table = depot_reliability
    trace = node_trace(table)
    k = table.progress.nodes
    np.testing.assert_allclose(trace.dual[k], table.progress.dual_bound)
    assert trace.open[k].tolist() == table.progress.open.tolist()
    np.testing.assert_allclose(trace.weight[k], table.progress.tree_weight)
    assert trace.weight[-1] == pytest.approx(1.0)  # a finished tree is fully closed
    m = measures(table).to_dict()
    json.dumps(m, allow_nan=False)  # JSON-ready
    assert m["gap"] == 0.0 and m["root"]["gap"] == pytest.approx(0.64696, abs=1e-4)


def test_trace_of_a_million_nodes_is_quick():
    # a path of 10^6 single-child links is the worst case for interval lengths
    size = 1_000_000
    lo = np.arange(size)
    hi = np.minimum(lo + np.arange(size) % 977, size - 1)
    out = _cover_min(lo, hi, np.random.default_rng(0).random(size), size)
    assert out.shape == (size,) and np.isfinite(out).all()


@settings(max_examples=150, deadline=None)
@given(st.lists(st.tuples(st.integers(0, 40), st.integers(0, 40),
                          st.floats(-100, 100, allow_nan=False)), max_size=60),
       st.integers(1, 45))
def test_cover_min_matches_brute_force(intervals, size):
    lo = np.array([min(a, b) for a, b, _ in intervals], dtype=np.int64)
    hi = np.array([max(a, b) for a, b, _ in intervals], dtype=np.int64)
    hi = np.minimum(hi, size - 1)
    val = np.array([v for _, _, v in intervals], dtype=np.float64)
    expected = np.full(size, np.inf)
    for a, b, v in zip(lo, hi, val, strict=True):
        if a <= b:
            expected[a:b + 1] = np.minimum(expected[a:b + 1], v)
    np.testing.assert_array_equal(_cover_min(lo, hi, val, size), expected)
