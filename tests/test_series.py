"""Bound series and their min/max reduction."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from undergrowth.analysis.series import bound_series, reduce_minmax
from undergrowth.analysis.table import RunTable
from undergrowth.runlog import read_run
from undergrowth.runlog.writer import RunLogWriter
from undergrowth.samples import depot_siting
from undergrowth.search import Search, SearchSettings

finite = st.floats(-1e6, 1e6, allow_nan=False)


@settings(max_examples=200, deadline=None)
@given(st.lists(st.tuples(st.floats(0, 1e4), finite), min_size=1, max_size=400),
       st.integers(2, 60))
def test_reduction_keeps_ends_and_extremes_within_the_budget(pairs, points):
    pairs.sort(key=lambda p: p[0])
    x = np.array([p[0] for p in pairs])
    y = np.array([p[1] for p in pairs])
    out = reduce_minmax(x, y, points=points)
    assert len(out) <= points
    if points >= 4:
        assert out.x[0] == x[0] and out.x[-1] == x[-1]
    assert out.y.min() == y.min() and out.y.max() == y.max()
    assert np.all(np.diff(out.x) >= 0)
    original = set(zip(x.tolist(), y.tolist(), strict=True))
    assert set(zip(out.x.tolist(), out.y.tolist(), strict=True)) <= original


def test_each_bucket_keeps_its_own_extremes():
    # 1000 points, a spike up at 250 and down at 750: both survive a 10-point budget.
    x = np.arange(1000.0)
    y = np.zeros(1000)
    y[250], y[750] = 5.0, -5.0
    out = reduce_minmax(x, y, points=10)
    assert 250.0 in out.x and 750.0 in out.x


def test_nan_is_dropped_and_small_input_is_returned_as_is():
    out = reduce_minmax(np.array([0.0, 1, 2]), np.array([np.nan, 1.0, 2.0]), points=5)
    assert out.x.tolist() == [1.0, 2.0]
    with pytest.raises(ValueError, match="points"):
        reduce_minmax(np.array([0.0]), np.array([0.0]), points=1)


@pytest.fixture(scope="module")
def depot_run(tmp_path_factory):
    path = tmp_path_factory.mktemp("series") / "depot.jsonl"
    search = Search(depot_siting(tight=False), SearchSettings(
        branching="most-fractional", select="best-bound", gap=0.0, progress_every=5))
    with RunLogWriter(path, search.header()) as writer:
        for ev in search.events():
            writer.write(ev)
    return RunTable.open(path, use_cache=False)


@pytest.mark.parametrize("axis", ["nodes", "time"])
def test_series_of_a_real_run_end_at_the_end_event(depot_run, axis):
    s = bound_series(depot_run, axis=axis, points=1000)
    end = depot_run.end
    assert s.primal.y[-1] == pytest.approx(end["objective"])
    assert s.dual.y[-1] == pytest.approx(end["dual_bound"])
    assert s.gap.y[-1] == pytest.approx(end["gap"], abs=1e-12)
    # primal points are exactly the incumbent objectives (a minimisation: they fall)
    assert set(s.incumbents.objective.tolist()) <= set(s.primal.y.tolist())
    assert np.all(np.diff(s.primal.y) <= 1e-12)
    if axis == "nodes":
        assert s.dual.x[-1] == end["nodes"]


def test_series_reduced_to_few_points_keep_the_worst_gap(depot_run):
    full = bound_series(depot_run, axis="nodes", points=100_000)
    small = bound_series(depot_run, axis="nodes", points=4)
    assert len(small.gap) <= 4 and len(small.dual) <= 4
    assert np.nanmax(small.gap.y) == np.nanmax(full.gap.y)
    assert small.dual.y.min() == full.dual.y.min()


def test_unknown_axis_is_refused(depot_run):
    with pytest.raises(ValueError, match="axis"):
        bound_series(depot_run, axis="depth")


def replayed_dual(path) -> list[float]:
    """The global dual bound after each processed node, by replaying the log in
    processing order: the smallest bound among waiting nodes (a child waits with its
    parent's bound from the parent's step), capped by the incumbent (minimisation)."""
    log = read_run(path)
    waiting: dict[int, float] = {}
    incumbent = np.inf
    out: list[float | None] = []
    for ev in log.events:
        if ev["kind"] == "incumbent":
            incumbent = min(incumbent, ev["objective"])
        if ev["kind"] != "node":
            continue
        waiting.pop(ev["id"], None)
        if ev["status"] == "branched":
            for child in (n for n in log.nodes if n["parent"] == ev["id"]):
                waiting[child["id"]] = ev["bound"]
        if ev["order"] is not None:
            out.append(None)  # filled once the step's incumbent events are in
        if out:
            out[-1] = min([incumbent, *waiting.values()])
    return out


def test_the_dual_line_is_the_dual_bound_after_every_node(depot_run):
    # Progress snapshots come only every 5th node here: the line must have a point
    # after every node, not only at the snapshots.
    s = bound_series(depot_run, axis="nodes", points=100_000)
    truth = replayed_dual(depot_run.path)
    by_x = dict(zip(s.dual.x.tolist(), s.dual.y.tolist(), strict=True))
    for k, value in enumerate(truth, start=1):
        assert by_x[float(k)] == pytest.approx(value, rel=1e-9), f"after node {k}"
