"""`undergrowth check`: 0 valid, 1 valid with warnings, 2 invalid (reason on stderr)."""

from __future__ import annotations

import json

from test_runlog_roundtrip import sample_events, write_run
from undergrowth.cli import main


def test_valid_run_exits_0_with_a_summary(tmp_path, capsys):
    path = tmp_path / "run.jsonl.gz"
    write_run(path, sample_events())
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "valid run log of model 'wolsey' (max)" in out
    assert "branched   2" in out and "infeasible 1" in out
    assert "primal bound 7" in out and "gap          0 %" in out
    assert "end status   optimal" in out


def test_torn_run_exits_1_and_lists_the_warnings(tmp_path, capsys):
    path = tmp_path / "run.jsonl"
    write_run(path, sample_events())
    path.write_bytes(path.read_bytes()[:-30])
    assert main(["check", str(path)]) == 1
    out = capsys.readouterr().out
    assert "line 10 is cut off" in out and "no end event" in out
    # without the end event the bounds come from the last progress snapshot
    assert "dual bound   7" in out and "end status   - (no end event)" in out


def test_invalid_run_exits_2_with_the_reason_on_stderr(tmp_path, capsys):
    path = tmp_path / "run.jsonl"
    events = sample_events()
    events[2]["status"] = "lost"
    write_run(path, events)
    assert main(["check", str(path)]) == 2
    captured = capsys.readouterr()
    assert captured.out == ""
    assert "line 4, field 'status'" in captured.err


def test_lenient_turns_the_bad_line_into_a_warning(tmp_path, capsys):
    path = tmp_path / "run.jsonl"
    events = sample_events()
    events[3]["open"] = -2  # the first progress event, line 5
    write_run(path, events)
    assert main(["check", "--lenient", "--json", str(path)]) == 1
    summary = json.loads(capsys.readouterr().out)
    assert summary["skipped_lines"] == 1 and summary["nodes"] == 5
    assert summary["by_status"]["pruned"] == 1
    assert summary["warnings"][0].startswith("line 5, field 'open'")


def test_missing_file_exits_2(tmp_path, capsys):
    assert main(["check", str(tmp_path / "nowhere.jsonl")]) == 2
    assert "nowhere.jsonl" in capsys.readouterr().err


def test_json_summary_of_a_csv(tmp_path, capsys):
    path = tmp_path / "nodes.csv"
    path.write_text("id,parent,bound,status\n0,,3.5,branched\n1,0,4,integral\n2,0,5,pruned\n")
    assert main(["check", "--json", str(path)]) == 0
    summary = json.loads(capsys.readouterr().out)
    # min sense inferred; incumbent 4 from the integral node; nothing open, so dual = 4
    assert summary["sense"] == "min" and summary["primal_bound"] == 4.0
    assert summary["dual_bound"] == 4.0 and summary["gap"] == 0.0
    assert summary["end_status"] == "optimal"
