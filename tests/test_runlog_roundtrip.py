"""Round trips: events written by RunLogWriter read back unchanged; Recorder == CSV import.

The sample run is the textbook example in Wolsey, *Integer Programming*
(1998), branch-and-bound chapter (values from memory, re-solved with HiGHS —
see shared CHECK_VALUES.md): max 4 x1 - x2 s.t. 7 x1 - 2 x2 <= 14, x2 <= 3,
2 x1 - 2 x2 <= 3, x integer. Root LP 59/7 at x1 = 20/7; x1 <= 2 gives 7.5 at
x2 = 1/2; x1 >= 3 is infeasible; under x1 <= 2, x2 >= 1 gives the integer
optimum 7 at (2, 1) and x2 <= 0 gives 6 at x1 = 3/2 (by hand), pruned by 7.
"""

from __future__ import annotations

import gzip
import json

import numpy as np
import pytest

from undergrowth.analysis.table import NODE_COLUMNS, RunTable
from undergrowth.record import Recorder
from undergrowth.runlog.csvtable import csv_to_events, import_csv
from undergrowth.runlog.reader import read_run
from undergrowth.runlog.writer import RunLogWriter

ROOT_LP = 59 / 7


def header(sense: str = "max") -> dict:
    return {
        "model": {"name": "wolsey", "rows": 3, "columns": 2, "integers": 2, "binaries": 0,
                  "nonzeros": 5, "sense": sense, "quadratic": False},
        "settings": {"branching": "most-fractional", "select": "depth-first", "seed": 0,
                     "node_limit": None, "time_limit": None, "gap": 0.0},
        "started": "2026-12-02T06:00:00Z",
        "producer": "hand-made test",
    }  # fmt: skip


def _node(nid, parent, depth, order, t, status, bound, *, branch=None, lp=True, branching=None,
          fractional=0):  # fmt: skip
    lp_record = None
    if lp:
        lp_status = "infeasible" if status == "infeasible" else "optimal"
        lp_record = {"status": lp_status, "objective": bound, "iterations": 2, "seconds": 0.001}
    return {"kind": "node", "id": nid, "parent": parent, "depth": depth, "order": order,
            "time": t, "branch": branch, "lp": lp_record, "bound": bound,
            "fractional": fractional, "status": status, "branching": branching,
            "message": None}  # fmt: skip


def _branch(var: int, direction: str, value: float) -> dict:
    return {"var": var, "name": f"x{var + 1}", "dir": direction, "value": value}


def _branching(var: int, value: float) -> dict:
    score = 0.5 - abs(value % 1 - 0.5)  # distance to the nearest integer
    return {"var": var, "name": f"x{var + 1}", "value": value, "score": score,
            "rule": "most-fractional", "down_bound": None, "up_bound": None,
            "runner_up": None}  # fmt: skip


def sample_events() -> list[dict]:
    """The Wolsey search, depth-first taking the up child of x2 first: 5 nodes."""
    return [
        _node(0, None, 0, 0, 0.01, "branched", ROOT_LP, branching=_branching(0, 20 / 7),
              fractional=1),  # fmt: skip
        _node(1, 0, 1, 1, 0.02, "branched", 7.5, branch=_branch(0, "down", 2.0),
              branching=_branching(1, 0.5), fractional=1),  # fmt: skip
        _node(2, 0, 1, 2, 0.03, "infeasible", None, branch=_branch(0, "up", 3.0)),
        {"kind": "progress", "time": 0.03, "nodes": 3, "open": 2, "dual_bound": 7.5,
         "primal_bound": None, "gap": None, "tree_weight": 0.5},  # fmt: skip
        _node(4, 1, 2, 3, 0.04, "integral", 7.0, branch=_branch(1, "up", 1.0)),
        {"kind": "incumbent", "time": 0.04, "node": 4, "order": 3, "objective": 7.0,
         "source": "integral"},  # fmt: skip
        _node(3, 1, 2, 4, 0.05, "pruned", 6.0, branch=_branch(1, "down", 0.0), fractional=1),
        {"kind": "progress", "time": 0.05, "nodes": 5, "open": 0, "dual_bound": 7.0,
         "primal_bound": 7.0, "gap": 0.0, "tree_weight": 1.0},  # fmt: skip
        {"kind": "end", "time": 0.05, "status": "optimal", "objective": 7.0, "dual_bound": 7.0,
         "gap": 0.0, "nodes": 5, "lp_iterations": 10, "lp_seconds": 0.005,
         "other_seconds": 0.045, "complete": True, "message": None,
         "solution": {"x1": 2.0, "x2": 1.0}},  # fmt: skip
    ]


def write_run(path, events: list[dict], *, sense: str = "max", flush_every: int = 0) -> None:
    with RunLogWriter(path, header(sense)) as writer:
        for i, event in enumerate(events, 1):
            writer.write(event)
            if flush_every and i % flush_every == 0:
                writer.flush()


@pytest.mark.parametrize("name", ["run.jsonl", "run.jsonl.gz"])
def test_events_read_back_identical(tmp_path, name):
    path = tmp_path / name
    events = sample_events()
    write_run(path, events)
    run = read_run(path)
    assert run.events == events
    assert run.header["format"] == "undergrowth-run" and run.header["version"] == 1
    assert run.header["model"] == header()["model"]
    assert run.warnings == []
    assert run.end == events[-1]
    # gzip is used exactly when the name says so
    assert (path.read_bytes()[:2] == b"\x1f\x8b") == name.endswith(".gz")


def test_lines_are_compact_json_and_non_finite_floats_become_null(tmp_path):
    path = tmp_path / "run.jsonl"
    events = sample_events()
    events[0]["bound"] = float("inf")
    events[0]["branching"]["score"] = float("nan")
    write_run(path, events)
    lines = path.read_text().splitlines()
    assert ", " not in lines[1] and ": " not in lines[1]  # separators (",", ":")
    first = json.loads(lines[1])
    assert first["bound"] is None and first["branching"]["score"] is None
    assert "Infinity" not in path.read_text() and "NaN" not in path.read_text()


def test_unknown_extra_fields_are_kept(tmp_path):
    path = tmp_path / "run.jsonl"
    events = sample_events()
    events[0]["cuts"] = {"gomory": 3}
    events[0]["branching"]["pseudocost_samples"] = 4
    with RunLogWriter(path, {**header(), "host": "lab-7"}) as writer:
        for event in events:
            writer.write(event)
    run = read_run(path)
    assert run.events[0]["cuts"] == {"gomory": 3}
    assert run.events[0]["branching"]["pseudocost_samples"] == 4
    assert run.header["host"] == "lab-7"
    assert run.warnings == []


def test_writer_takes_numpy_scalars(tmp_path):
    path = tmp_path / "run.jsonl"
    events = sample_events()
    events[0]["id"] = np.int64(0)
    events[0]["bound"] = np.float32(8.5)
    events[1]["bound"] = np.float64(7.5)
    write_run(path, events)
    run = read_run(path)
    assert run.events[0]["id"] == 0 and run.events[0]["bound"] == 8.5
    assert run.events[1]["bound"] == 7.5


def test_writer_close_is_idempotent_and_refuses_later_writes(tmp_path):
    path = tmp_path / "run.jsonl.gz"
    writer = RunLogWriter(path, header())
    writer.write(sample_events()[0])
    writer.close()
    writer.close()
    with pytest.raises(ValueError, match="closed"):
        writer.write(sample_events()[1])
    assert len(gzip.decompress(path.read_bytes()).splitlines()) == 2


def test_header_is_on_disk_as_soon_as_the_writer_exists(tmp_path):
    path = tmp_path / "run.jsonl.gz"
    writer = RunLogWriter(path, header())
    try:
        # a sync-flushed gzip prefix decodes without the trailer
        import zlib

        text = zlib.decompressobj(wbits=31).decompress(path.read_bytes())
        assert json.loads(text.splitlines()[0])["kind"] == "header"
    finally:
        writer.close()


# -------------------------------------------------------------------- Recorder == CSV
CSV_TEXT = """\
id,parent,depth,time,order,status,bound,objective,variable,name,direction,value,iterations,fractional
0,,0,0.01,0,branched,8.428571428571429,8.428571428571429,,,,,2,1
1,0,1,0.02,1,branched,7.5,7.5,0,x1,down,2,2,1
2,0,1,0.03,2,infeasible,,,0,x1,up,3,2,0
4,1,2,0.04,3,integral,7,7,1,x2,up,1,2,0
3,1,2,0.05,4,pruned,6,6,1,x2,down,0,2,1
"""


def _record_sample(path) -> None:
    rec = Recorder(path, model={"name": "wolsey", "sense": "max"}, progress_every=0,
                   progress_seconds=None)  # fmt: skip
    with rec:
        rec.node(0, None, "branched", ROOT_LP, time=0.01, iterations=2, fractional=1,
                 branching={"var": 0, "value": 20 / 7})  # fmt: skip
        rec.node(1, 0, "branched", 7.5, time=0.02, iterations=2, fractional=1,
                 branch={"var": 0, "name": "x1", "dir": "down", "value": 2},
                 branching={"var": 1, "value": 0.5})  # fmt: skip
        rec.node(2, 0, "infeasible", None, time=0.03, iterations=2, branch=(0, "up", 3))
        rec.node(4, 1, "integral", 7.0, time=0.04, iterations=2,
                 branch={"var": 1, "name": "x2", "dir": "up", "value": 1})  # fmt: skip
        assert rec.incumbent(7.0, node=4, time=0.04)
        rec.node(3, 1, "pruned", 6.0, time=0.05, iterations=2, fractional=1,
                 branch={"var": 1, "name": "x2", "dir": "down", "value": 0})  # fmt: skip


def test_recorder_and_csv_import_give_equal_tables(tmp_path):
    recorded = tmp_path / "recorded.jsonl"
    _record_sample(recorded)
    csv_path = tmp_path / "nodes.csv"
    csv_path.write_text("# sense: max\n" + CSV_TEXT)
    a = RunTable.open(recorded, use_cache=False)
    b = RunTable.open(csv_path, use_cache=False)
    for name in NODE_COLUMNS:
        np.testing.assert_array_equal(a.columns[name], b.columns[name], err_msg=name)
    np.testing.assert_array_equal(a.incumbents.objective, b.incumbents.objective)
    assert a.end["status"] == b.end["status"] == "optimal"  # nothing left open
    assert a.end["objective"] == b.end["objective"] == 7.0  # Wolsey's integer optimum
    # the tracker's dual bound falls to the incumbent once every child is closed
    assert a.end["dual_bound"] == b.end["dual_bound"] == 7.0
    assert a.progress.tree_weight[-1] == 1.0  # 1/2 (node 2) + 1/4 + 1/4: all closed
    assert a.warnings == [] and b.warnings == []


def test_csv_import_writes_a_run_log_that_reads_back(tmp_path):
    csv_path = tmp_path / "nodes.csv"
    csv_path.write_text(CSV_TEXT)  # no sense line: inferred from falling bounds
    out = tmp_path / "imported.jsonl.gz"
    lines = import_csv(csv_path, out)
    events = csv_to_events(csv_path)
    run = read_run(out)
    assert lines == len(events)  # header included in both counts
    assert run.header["model"]["sense"] == "max"
    assert [e["id"] for e in run.nodes] == [0, 1, 2, 4, 3]
    assert run.events == events[1:]


def test_gzip_is_recognised_by_its_magic_bytes_not_the_name(tmp_path):
    packed = tmp_path / "run.jsonl.gz"
    write_run(packed, sample_events())
    misnamed = tmp_path / "run.jsonl"
    misnamed.write_bytes(packed.read_bytes())
    assert read_run(misnamed).events == sample_events()
