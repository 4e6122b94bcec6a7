"""Recording your own search: checks as it goes, fills in what it can, always ends."""

from __future__ import annotations

import importlib.util
import itertools
import sys
import time
from pathlib import Path

import pytest

from undergrowth.cli import main
from undergrowth.record import Recorder
from undergrowth.runlog.reader import read_run

EXAMPLE = Path(__file__).resolve().parents[1] / "examples" / "knapsack_own_bnb.py"


def _ticks(step: float = 0.5):
    counter = itertools.count()
    return lambda: step * next(counter)


def _recorder(path, **kwargs) -> Recorder:
    return Recorder(path, model={"name": "toy", "sense": "min"}, progress_every=0,
                    progress_seconds=None, clock=_ticks(), **kwargs)  # fmt: skip


def test_fills_depth_order_time_lp_and_the_end(tmp_path):
    path = tmp_path / "run.jsonl"
    with _recorder(path) as rec:
        rec.node(0, None, "branched", 1.0, branching={"var": 2, "value": 0.5})
        rec.node(1, 0, "integral", 2.0, branch=(2, "down", 0))
        assert rec.incumbent(2.0, node=1)
        assert not rec.incumbent(2.5)  # not an improvement: nothing written
        rec.node(2, 0, "pruned", 2.2, branch=(2, "up", 1))
    run = read_run(path)
    nodes = run.nodes
    assert [n["depth"] for n in nodes] == [0, 1, 1]
    assert [n["order"] for n in nodes] == [0, 1, 2]
    # one clock tick (0.5 s) per call, the two incumbent calls included
    assert [n["time"] for n in nodes] == [0.5, 1.0, 2.5]
    assert nodes[0]["branching"]["name"] == "x2" and nodes[0]["branching"]["rule"] == "custom"
    assert nodes[1]["lp"] == {"status": "optimal", "objective": 2.0, "iterations": 0,
                              "seconds": 0.0}  # fmt: skip
    incumbents = [e for e in run.events if e["kind"] == "incumbent"]
    assert [(i["objective"], i["source"], i["order"]) for i in incumbents] == [
        (2.0, "integral", 1)
    ]
    assert run.end["status"] == "optimal" and run.end["complete"] is True
    assert run.end["objective"] == run.end["dual_bound"] == 2.0 and run.end["gap"] == 0.0
    assert run.warnings == []


@pytest.mark.parametrize(
    ("call", "fragment"),
    [
        (lambda r: r.node(1, 7, "pruned", 1.0), "parent 7 has not been recorded"),
        (lambda r: r.node(0, None, "pruned", 1.0), "node 0 was already recorded"),
        (lambda r: r.node(3, 0, "done", 1.0), "status 'done' is not one of"),
        (lambda r: r.node(3, None, "pruned", 1.0), "the root (node 0) was already recorded"),
        (lambda r: r.node(3, 0, "pruned", 1.0, depth=4), "expected 1"),
        (lambda r: r.node(3, 0, "pruned", 1.0, branch=(1, "left", 0)), "'down' or 'up'"),
        (lambda r: r.node(3, 0, "pruned", 1.0, branching={"var": 1, "value": 0.5}),
         "only for branched nodes"),  # fmt: skip
        (lambda r: r.node(3, 0, "open", None, lp_objective=2.0), "never solved"),
        (lambda r: r.node(3.5, 0, "pruned", 1.0), "id must be an integer"),
        (lambda r: r.incumbent(float("inf")), "finite"),
        (lambda r: r.incumbent(1.0, source="oracle"), "source 'oracle'"),
    ],
)
def test_bad_input_is_a_value_error_with_a_clear_message(tmp_path, call, fragment):
    with _recorder(tmp_path / "run.jsonl") as rec:
        rec.node(0, None, "branched", 1.0)
        with pytest.raises(ValueError) as info:
            call(rec)
        assert fragment in str(info.value)
        rec.node(1, 0, "pruned", 1.0)
        rec.node(2, 0, "pruned", 1.0)


def test_bad_header_is_refused_naming_the_field(tmp_path):
    with pytest.raises(ValueError, match="model.sense"):
        Recorder(tmp_path / "run.jsonl", model={"sense": "down"})


def test_exception_ends_the_run_as_incomplete_with_the_message(tmp_path):
    path = tmp_path / "run.jsonl.gz"
    with pytest.raises(RuntimeError), _recorder(path) as rec:
        rec.node(0, None, "branched", 1.0)
        raise RuntimeError("LP solver lost its licence")
    run = read_run(path)
    assert run.end["status"] == "incomplete"
    assert run.end["message"] == "RuntimeError: LP solver lost its licence"
    assert run.end["complete"] is False  # two children never recorded
    assert run.warnings == []


def test_ctrl_c_ends_the_run_as_cancelled(tmp_path):
    path = tmp_path / "run.jsonl"
    with pytest.raises(KeyboardInterrupt), _recorder(path) as rec:
        rec.node(0, None, "branched", 1.0)
        raise KeyboardInterrupt
    assert read_run(path).end["status"] == "cancelled"


def test_progress_snapshots_track_open_nodes_dual_bound_and_tree_weight(tmp_path):
    path = tmp_path / "run.jsonl"
    with _recorder(path) as rec:
        rec.node(0, None, "branched", 10.0)
        first = rec.progress()
        rec.node(1, 0, "branched", 12.0)
        rec.node(3, 1, "integral", 15.0)
        rec.incumbent(15.0, node=3)
        second = rec.progress()
        rec.node(4, 1, "pruned", 16.0)
        rec.node(2, 0, "discarded", None)  # inherits the root's bound 10
        rec.finish("optimal", solution={"x0": 1.0, "x1": 0.0})
    # by hand: after the root, two children wait at its bound 10
    assert (first["open"], first["dual_bound"], first["gap"]) == (2, 10.0, None)
    # node 2 (bound 10) and node 4 (bound 12) are open; gap |15-10|/15
    assert (second["open"], second["dual_bound"]) == (2, 10.0)
    assert second["gap"] == pytest.approx(5 / 15)
    assert second["tree_weight"] == 0.25  # one closed leaf at depth 2
    run = read_run(path)
    assert run.nodes[-1]["bound"] == 10.0 and run.nodes[-1]["order"] is None
    last = [e for e in run.events if e["kind"] == "progress"][-1]
    assert last["tree_weight"] == 1.0 and last["open"] == 0
    assert run.end["solution"] == {"x0": 1.0}  # non-zero entries only
    assert run.end["nodes"] == 4  # solved nodes; the discarded one never was


def test_automatic_progress_every_n_nodes(tmp_path):
    path = tmp_path / "run.jsonl"
    with Recorder(path, progress_every=2, progress_seconds=None, clock=_ticks()) as rec:
        rec.node(0, None, "branched", 1.0)
        rec.node(1, 0, "pruned", 1.0)
        rec.node(2, 0, "pruned", 1.0)
    kinds = [e["kind"] for e in read_run(path).events]
    assert kinds == ["node", "node", "progress", "node", "progress", "end"]


def _load_example():
    spec = importlib.util.spec_from_file_location("knapsack_own_bnb", EXAMPLE)
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module  # dataclasses look their module up while defining
    try:
        spec.loader.exec_module(module)
    finally:
        del sys.modules[spec.name]
    return module


def test_example_finds_the_enumerated_optimum_quickly_and_passes_check(tmp_path, capsys):
    example = _load_example()
    out = tmp_path / "courier.jsonl.gz"
    start = time.perf_counter()
    best, taken, _ = example.search(str(out))
    assert time.perf_counter() - start < 2.0
    # oracle: enumerate all 2^12 parcel subsets
    fees = [f for _, f, _ in example.PARCELS]
    weights = [w for _, _, w in example.PARCELS]
    optimum = max(
        sum(f for f, keep in zip(fees, pick, strict=True) if keep)
        for pick in itertools.product((0, 1), repeat=len(fees))
        if sum(w for w, keep in zip(weights, pick, strict=True) if keep) <= example.CAPACITY
    )
    assert best == optimum
    assert sum(weights[[p[0] for p in example.PARCELS].index(t)] for t in taken) <= 18.0
    assert main(["check", str(out)]) == 0
    assert "end status   optimal" in capsys.readouterr().out
