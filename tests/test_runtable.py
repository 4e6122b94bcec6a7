"""RunTable: columns built in one pass from the events, and the cache beside the run."""

from __future__ import annotations

import math
import os

import numpy as np
import pytest

import undergrowth.analysis.table as table_module
from test_runlog_roundtrip import ROOT_LP, sample_events, write_run
from undergrowth.analysis.table import NODE_COLUMNS, RunTable, cache_path
from undergrowth.runlog.codes import DIRECTIONS, SOURCES, STATUSES
from undergrowth.runlog.errors import RunLogError

nan = math.nan


@pytest.fixture
def run_path(tmp_path):
    path = tmp_path / "wolsey.jsonl.gz"
    write_run(path, sample_events())
    return path


def test_code_tables_are_fixed():
    # documented in analysis/table.py and docs/run-log.md; stored codes must not move
    assert STATUSES == ("branched", "integral", "pruned", "infeasible", "discarded", "open",
                        "failed")  # fmt: skip
    assert DIRECTIONS == ("none", "down", "up")
    assert SOURCES == ("integral", "rounding", "start", "external")


def test_columns_of_the_sample_run(run_path):
    t = RunTable.open(run_path, use_cache=False)
    assert len(t) == 5 and set(t.columns) == set(NODE_COLUMNS)
    assert all(t.columns[k].dtype == np.dtype(v) for k, v in NODE_COLUMNS.items())
    # rows in order of appearance: nodes 0, 1, 2, 4, 3 (hand-made run)
    assert t.id.tolist() == [0, 1, 2, 4, 3]
    assert t.parent.tolist() == [-1, 0, 0, 1, 1]
    assert t.parent_row.tolist() == [-1, 0, 0, 1, 1]
    assert t.depth.tolist() == [0, 1, 1, 2, 2]
    assert t.order.tolist() == [0, 1, 2, 3, 4]
    assert t.status.tolist() == [0, 0, 3, 1, 2]  # branched, branched, infeasible, ...
    assert t.branch_var.tolist() == [-1, 0, 0, 1, 1]
    assert t.branch_dir.tolist() == [0, 1, 2, 2, 1]  # none, down, up, up, down
    np.testing.assert_array_equal(t.branch_value, [nan, 2, 3, 1, 0])
    np.testing.assert_array_equal(t.bound, [ROOT_LP, 7.5, nan, 7.0, 6.0])
    np.testing.assert_array_equal(t.lp_objective, [ROOT_LP, 7.5, nan, 7.0, 6.0])
    assert t.iterations.tolist() == [2] * 5 and t.fractional.tolist() == [1, 1, 0, 0, 1]
    # global figures when each node appeared: incumbent 7 comes after node 4's event,
    # the first progress (dual 7.5) after node 2's
    np.testing.assert_array_equal(t.incumbent, [nan, nan, nan, nan, 7.0])
    np.testing.assert_array_equal(t.dual_bound, [nan, nan, nan, 7.5, 7.5])
    assert t.count_by_status() == {"branched": 2, "integral": 1, "pruned": 1, "infeasible": 1,
                                   "discarded": 0, "open": 0, "failed": 0}  # fmt: skip
    assert t.var_names == {0: "x1", 1: "x2"}
    assert t.sense == "max" and t.end["status"] == "optimal" and t.warnings == []


def test_series(run_path):
    t = RunTable.open(run_path, use_cache=False)
    inc = t.incumbents
    assert (len(inc), inc.objective.tolist(), inc.node.tolist()) == (1, [7.0], [4])
    assert inc.order.tolist() == [3] and inc.source.tolist() == [0]  # integral
    p = t.progress
    assert p.nodes.tolist() == [3, 5] and p.open.tolist() == [2, 0]
    np.testing.assert_array_equal(p.primal_bound, [nan, 7.0])
    np.testing.assert_array_equal(p.gap, [nan, 0.0])
    assert p.tree_weight.tolist() == [0.5, 1.0]


def test_best_incumbent_follows_the_sense(tmp_path):
    path = tmp_path / "min.jsonl"
    events = [e for e in sample_events() if e["kind"] == "node"][:3]
    events.insert(1, {"kind": "incumbent", "time": 0.0, "node": None, "order": None,
                      "objective": 20.0, "source": "start"})  # fmt: skip
    events.insert(2, {"kind": "incumbent", "time": 0.0, "node": None, "order": None,
                      "objective": 30.0, "source": "external"})  # fmt: skip
    write_run(path, events, sense="max")
    t = RunTable.open(path, use_cache=False)
    # maximisation: 30 beats 20
    np.testing.assert_array_equal(t.incumbent, [nan, 30.0, 30.0])
    assert t.incumbents.source.tolist() == [2, 3]  # start, external


# -------------------------------------------------------------------- cache
def test_second_open_comes_from_the_cache_with_equal_arrays(run_path):
    first = RunTable.open(run_path)
    assert not first.from_cache and os.path.exists(cache_path(str(run_path)))
    second = RunTable.open(run_path)
    assert second.from_cache
    for name in NODE_COLUMNS:
        np.testing.assert_array_equal(first.columns[name], second.columns[name])
    np.testing.assert_array_equal(first.progress.dual_bound, second.progress.dual_bound)
    assert second.header == first.header and second.end == first.end
    assert second.var_names == first.var_names and second.warnings == first.warnings


def test_a_modified_file_invalidates_the_cache(run_path):
    RunTable.open(run_path)
    events = sample_events()[:4]  # a different run under the same name
    write_run(run_path, events)
    t = RunTable.open(run_path)
    assert not t.from_cache and len(t) == 3
    assert RunTable.open(run_path).from_cache


def test_same_size_same_ends_but_touched_file_is_rebuilt(run_path):
    RunTable.open(run_path)
    st = os.stat(run_path)
    os.utime(run_path, ns=(st.st_atime_ns, st.st_mtime_ns + 1_000_000_000))
    assert not RunTable.open(run_path).from_cache


def test_a_corrupt_cache_is_rebuilt_and_rewritten(run_path):
    RunTable.open(run_path)
    cache = cache_path(str(run_path))
    with open(cache, "r+b") as f:
        f.seek(100)
        f.write(b"\x00garbage\xff" * 20)
    t = RunTable.open(run_path)
    assert not t.from_cache and len(t) == 5
    assert RunTable.open(run_path).from_cache  # the rewritten cache works
    with open(cache, "wb") as f:
        f.write(b"not a zip at all")
    assert not RunTable.open(run_path).from_cache


def test_unwritable_directory_just_skips_the_cache(run_path, monkeypatch):
    def refuse(*args, **kwargs):
        raise PermissionError("read-only directory")

    monkeypatch.setattr(table_module.os, "replace", refuse)
    t = RunTable.open(run_path)
    assert len(t) == 5 and not t.from_cache
    assert not os.path.exists(cache_path(str(run_path)))
    assert [p for p in os.listdir(run_path.parent) if p.endswith(".tmp")] == []


def test_a_lenient_cache_does_not_hide_errors_from_a_strict_open(tmp_path):
    path = tmp_path / "bad.jsonl"
    events = sample_events()
    events[3]["nodes"] = "three"  # a bad progress line
    write_run(path, events)
    lenient = RunTable.open(path, lenient=True)
    assert lenient.skipped == 1 and len(lenient.progress) == 1
    assert RunTable.open(path, lenient=True).from_cache
    with pytest.raises(RunLogError, match="line 5"):
        RunTable.open(path)


def test_cache_file_can_live_elsewhere(run_path, tmp_path):
    elsewhere = tmp_path / "caches" / "wolsey.npz"
    elsewhere.parent.mkdir()
    assert not RunTable.open(run_path, cache_file=elsewhere).from_cache
    assert elsewhere.exists() and not os.path.exists(cache_path(str(run_path)))
    assert RunTable.open(run_path, cache_file=elsewhere).from_cache
