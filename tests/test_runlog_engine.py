"""The engine's own events through the run log: written, read back, tabled.

The same tree written three ways (engine + writer, the Recorder, a CSV node
table) must open as equal RunTables.
"""

from __future__ import annotations

import csv
import json
import math

import numpy as np
import pytest

from families import facility_location, knapsack, small_miqp
from undergrowth.analysis.table import RunTable
from undergrowth.record import Recorder
from undergrowth.runlog import RunLogWriter, read_run
from undergrowth.search import Search, SearchSettings

CASES = [
    ("knapsack", lambda: knapsack(3, 16), "reliability", "hybrid"),
    ("facility", lambda: facility_location(2, 4, 6), "pseudocost", "best-bound"),
    ("miqp", lambda: small_miqp(1, 6), "most-fractional", "depth-first"),
    ("limited", lambda: knapsack(5, 20), "most-fractional", "breadth-first"),
]
# Columns that describe the tree itself; times and the tracker's running
# dual bound depend on how the file was produced.
TREE_COLUMNS = ("id", "parent", "parent_row", "depth", "order", "bound", "status",
                "branch_var", "branch_dir", "branch_value", "fractional")


def _engine_run(tmp_path, make, rule, order, *, node_limit=None):
    problem = make()
    search = Search(problem, SearchSettings(branching=rule, select=order, gap=0,
                                            node_limit=node_limit))
    path = tmp_path / "engine.jsonl.gz"
    events = []
    with RunLogWriter(path, search.header()) as writer:
        for ev in search.events():
            writer.write(ev)
            events.append(ev)
    return problem, search, path, events


def _json_normal(ev):
    """What JSON can hold: non-finite floats become null, tuples lists."""
    return json.loads(json.dumps(ev, default=float).replace("Infinity", "null")
                      .replace("NaN", "null"))


@pytest.mark.parametrize(("name", "make", "rule", "order"), CASES, ids=[c[0] for c in CASES])
def test_every_engine_event_reads_back_identical(tmp_path, name, make, rule, order):
    limit = 15 if name == "limited" else None
    _, search, path, events = _engine_run(tmp_path, make, rule, order, node_limit=limit)
    run = read_run(path)
    assert run.warnings == []
    assert run.header == _json_normal(search.header()) | {"started": run.header["started"]}
    assert run.events == [_json_normal(e) for e in events]
    assert run.end["nodes"] == search.result.nodes


def _node_events(events):
    return [e for e in events if e["kind"] == "node"]


def test_recorder_and_csv_tables_equal_the_engines(tmp_path):
    problem, search, path, events = _engine_run(tmp_path, lambda: knapsack(4, 16),
                                                "most-fractional", "best-bound")
    engine_table = RunTable.open(path, use_cache=False)

    recorded = tmp_path / "recorded.jsonl"
    with Recorder(recorded, model={"name": problem.name, "sense": problem.sense},
                  progress_every=0, progress_seconds=None) as rec:
        for ev in events:
            if ev["kind"] == "node":
                rec.node(ev["id"], ev["parent"], ev["status"], ev["bound"],
                         depth=ev["depth"], order=ev["order"], time=ev["time"],
                         branch=ev["branch"], fractional=ev["fractional"],
                         lp_objective=(ev["lp"] or {}).get("objective"),
                         iterations=(ev["lp"] or {}).get("iterations", 0),
                         branching=ev["branching"])
            elif ev["kind"] == "incumbent":
                rec.incumbent(ev["objective"], node=ev["node"], time=ev["time"])
    recorder_table = RunTable.open(recorded, use_cache=False)

    csv_path = tmp_path / "nodes.csv"
    with open(csv_path, "w", newline="") as fh:
        fh.write(f"# sense: {problem.sense}\n")
        w = csv.writer(fh)
        w.writerow(["id", "parent", "depth", "time", "order", "status", "bound", "objective",
                    "variable", "direction", "value", "iterations", "fractional"])
        for ev in _node_events(events):
            br = ev["branch"] or {}
            lp = ev["lp"] or {}
            w.writerow([ev["id"], "" if ev["parent"] is None else ev["parent"], ev["depth"],
                        repr(ev["time"]), "" if ev["order"] is None else ev["order"],
                        ev["status"], "" if ev["bound"] is None else repr(ev["bound"]),
                        "" if lp.get("objective") is None else repr(lp["objective"]),
                        br.get("var", ""), br.get("dir", ""),
                        "" if "value" not in br else repr(br["value"]),
                        lp.get("iterations", 0), ev["fractional"]])
    csv_table = RunTable.open(csv_path, use_cache=False)

    assert len(engine_table) == len(recorder_table) == len(csv_table) == len(
        _node_events(events))
    for col in TREE_COLUMNS:
        a = engine_table.columns[col]
        np.testing.assert_array_equal(a, recorder_table.columns[col], err_msg=col)
        np.testing.assert_array_equal(a, csv_table.columns[col], err_msg=col)
    best = search.result.objective  # the engine's optimum, same in all three
    for t in (engine_table, recorder_table, csv_table):
        assert t.end["objective"] == pytest.approx(best)
        assert t.end["status"] == "optimal"
        assert not math.isnan(t.columns["bound"][0])
