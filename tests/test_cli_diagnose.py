"""`undergrowth diagnose RUN [--model FILE] [--json]`."""

from __future__ import annotations

import json

import numpy as np
import pytest

from test_measures import solve_to_table
from undergrowth.cli import main
from undergrowth.model import Problem, write_model
from undergrowth.samples import depot_siting, project_selection


@pytest.fixture(scope="module")
def run_dir(tmp_path_factory):
    """A run with its model in models/<name>.mps beside it, as in sample_runs/."""
    d = tmp_path_factory.mktemp("runs")
    model = depot_siting(tight=False)
    (d / "models").mkdir()
    write_model(model, str(d / "models" / f"{model.name}.mps"))
    table = solve_to_table(model, d, branching="most-fractional", select="best-bound")
    return d, table.path


def test_text_output_uses_the_model_beside_the_run(run_dir, capsys):
    d, run = run_dir
    assert main(["diagnose", run]) == 0
    out = capsys.readouterr().out
    assert "found beside the run" in out and "depot-siting-loose.mps" in out
    assert "(weak-root)" in out and "(loose-big-m)" in out and "[HIGH]" in out
    assert "evidence:" in out and "try:" in out
    assert "forecast: the tree is complete (149 nodes in all)" in out


def test_json_lists_the_findings_with_the_agreed_keys(run_dir, capsys):
    _, run = run_dir
    assert main(["diagnose", run, "--json"]) == 0
    captured = capsys.readouterr()
    items = json.loads(captured.out)  # stdout is pure JSON; the model note goes to stderr
    assert "found beside the run" in captured.err
    assert [i["code"] for i in items][:2] == ["weak-root", "loose-big-m"]
    for item in items:
        assert {"code", "severity", "title", "evidence", "advice", "refs"} <= set(item)
    big_m = next(i for i in items if i["code"] == "loose-big-m")
    assert {d["tightest"] for d in big_m["details"]} == {24.0}  # by hand: see test_findings


def test_explicit_model_and_a_model_alone(run_dir, tmp_path, capsys):
    d, run = run_dir
    model = str(d / "models" / "depot-siting-loose.mps")
    assert main(["diagnose", run, "--model", model, "--json"]) == 0
    assert "loose-big-m" in {i["code"] for i in json.loads(capsys.readouterr().out)}
    # a model the engine refuses has no run: the model checks alone explain it
    saddle = Problem.from_arrays([0.0, 0.0], None, col_upper=[1.0, 1.0], integrality=[1, 1],
                                 Q=np.diag([1.0, -1.0]), name="saddle")
    path = tmp_path / "saddle.mps"
    write_model(saddle, str(path))
    assert main(["diagnose", "--model", str(path)]) == 0
    out = capsys.readouterr().out
    assert "(nonconvex-objective)" in out and "no run given" in out


def test_an_unfinished_run_gets_a_forecast(tmp_path, capsys):
    table = solve_to_table(project_selection(), tmp_path, branching="most-fractional",
                           select="best-bound", node_limit=400)
    assert main(["diagnose", table.path]) == 0
    out = capsys.readouterr().out
    assert "forecast after 400 processed nodes: about" in out
    assert "still to go" in out and "by method: backtrack" in out


def test_bad_files_exit_2_with_a_message(run_dir, tmp_path, capsys):
    _, run = run_dir
    broken = tmp_path / "broken.jsonl"
    broken.write_text('{"kind": "header", "format": "something-else"}\n')
    assert main(["diagnose", str(broken)]) == 2
    assert "undergrowth diagnose:" in capsys.readouterr().err
    assert main(["diagnose", str(tmp_path / "missing.jsonl")]) == 2
    assert "missing.jsonl" in capsys.readouterr().err
    bad_model = tmp_path / "bad.mps"
    bad_model.write_text("NAME x\nROWS\n Q nonsense\n")
    assert main(["diagnose", run, "--model", str(bad_model)]) == 2
    assert "bad.mps" in capsys.readouterr().err
    other = tmp_path / "other.mps"
    write_model(project_selection(), str(other))
    assert main(["diagnose", run, "--model", str(other)]) == 2
    assert "not this run's model" in capsys.readouterr().err
    assert main(["diagnose"]) == 2
    capsys.readouterr()
