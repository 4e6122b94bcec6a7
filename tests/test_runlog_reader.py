"""Reader errors and warnings: each names the file, the line and the field."""

from __future__ import annotations

import json

import pytest

from test_runlog_roundtrip import header, sample_events, write_run
from undergrowth.runlog.errors import RunLogError, RunLogVersionError
from undergrowth.runlog.reader import read_run


def write_lines(path, lines: list) -> None:
    """Write raw lines (dicts become compact JSON; strings go as they are)."""
    text = "".join((json.dumps(x) if isinstance(x, dict) else x) + "\n" for x in lines)
    path.write_text(text)


def full_header(**changes) -> dict:
    return {"kind": "header", "format": "undergrowth-run", "version": 1, **header(), **changes}


def test_a_newer_version_is_refused_naming_both_versions(tmp_path):
    path = tmp_path / "v2.jsonl"
    write_lines(path, [full_header(version=2), *sample_events()])
    with pytest.raises(RunLogVersionError) as info:
        read_run(path)
    message = str(info.value)
    assert "version 2" in message and "supports version 1" in message
    assert info.value.line == 1 and info.value.field == "version"


def test_not_a_run_log_says_which_format_it_found(tmp_path):
    path = tmp_path / "other.jsonl"
    write_lines(path, [{"kind": "header", "format": "something-else", "version": 1}])
    with pytest.raises(RunLogError, match="format 'something-else'"):
        read_run(path)


def test_first_line_must_be_the_header(tmp_path):
    path = tmp_path / "headless.jsonl"
    write_lines(path, sample_events())
    with pytest.raises(RunLogError, match="first line must be the header") as info:
        read_run(path)
    assert info.value.line == 1


def test_header_field_error_names_the_nested_field(tmp_path):
    path = tmp_path / "bad_header.jsonl"
    h = full_header()
    h["model"]["sense"] = "maximise"
    write_lines(path, [h, *sample_events()])
    with pytest.raises(RunLogError) as info:
        read_run(path)
    assert info.value.field == "model.sense" and info.value.line == 1


def test_bad_line_in_the_middle_names_line_and_field(tmp_path):
    path = tmp_path / "bad.jsonl"
    events = sample_events()
    events[1]["branch"]["dir"] = "sideways"  # node 1 is on line 3 (header is line 1)
    write_lines(path, [full_header(), *events])
    with pytest.raises(RunLogError) as info:
        read_run(path)
    err = info.value
    assert (err.line, err.field) == (3, "branch.dir")
    assert str(path) in str(err) and "line 3" in str(err) and "'sideways'" in str(err)


@pytest.mark.parametrize(
    ("mutate", "field"),
    [
        (lambda e: e.pop("time"), "time"),
        (lambda e: e.update(id=-4), "id"),
        (lambda e: e.update(depth=1.0), "depth"),  # integers must be JSON integers
        (lambda e: e.update(status="closed"), "status"),
        (lambda e: e["lp"].update(iterations="7"), "lp.iterations"),
        (lambda e: e.update(bound=True), "bound"),
        (lambda e: e.update(status="pruned", fractional=0), "branching"),  # only when branched
    ],
)
def test_field_errors_name_the_field(tmp_path, mutate, field):
    path = tmp_path / "bad.jsonl"
    events = sample_events()
    mutate(events[1])
    write_lines(path, [full_header(), *events])
    with pytest.raises(RunLogError) as info:
        read_run(path)
    assert (info.value.line, info.value.field) == (3, field)


def test_invalid_json_in_the_middle_is_an_error_with_the_line(tmp_path):
    path = tmp_path / "bad.jsonl"
    lines = [full_header(), *sample_events()]
    lines[4] = '{"kind": "progress", "time": 0.03,,}'
    write_lines(path, lines)
    with pytest.raises(RunLogError, match="not valid JSON") as info:
        read_run(path)
    assert info.value.line == 5


def test_lenient_skips_bad_lines_with_a_warning(tmp_path):
    path = tmp_path / "bad.jsonl"
    events = sample_events()
    lines = [full_header(), *events]
    lines[4] = "{not json"  # the first progress event
    lines[9]["status"] = "finished"  # the end event
    write_lines(path, lines)
    run = read_run(path, lenient=True)
    assert [e for e in run.events] == [e for i, e in enumerate(events, 2) if i not in (5, 10)]
    assert any(w.startswith("line 5:") and "skipped" in w for w in run.warnings)
    assert any(w.startswith("line 10, field 'status'") for w in run.warnings)
    assert run.end is None  # the only end event was the bad one


def test_torn_last_line_loads_the_prefix_with_a_warning(tmp_path):
    path = tmp_path / "torn.jsonl"
    write_run(path, sample_events())
    data = path.read_bytes()
    path.write_bytes(data[: len(data) - 40])  # cut into the end event
    run = read_run(path)
    assert run.events == sample_events()[:-1]
    assert any("line 10 is cut off" in w for w in run.warnings)
    assert any("no end event" in w for w in run.warnings)


def test_blank_lines_bom_and_nan_tokens_are_tolerated(tmp_path):
    path = tmp_path / "hand.jsonl"
    events = sample_events()
    text = "\ufeff" + json.dumps(full_header()) + "\n\n"
    text += "\n".join(json.dumps(e) for e in events[:-1]) + "\n   \n"
    # Python's json writes NaN for a float('nan'): read as an unknown bound
    text += json.dumps(events[-1]).replace('"dual_bound": 7.0', '"dual_bound": NaN')
    path.write_text(text, encoding="utf-8")
    run = read_run(path)
    assert len(run.events) == len(events) and run.warnings == []
    assert run.end["dual_bound"] != run.end["dual_bound"]  # NaN


def test_unknown_kind_is_skipped_with_a_warning(tmp_path):
    path = tmp_path / "future.jsonl"
    write_lines(path, [full_header(), {"kind": "cut", "time": 0.1}, *sample_events()])
    run = read_run(path)
    assert len(run.events) == len(sample_events())
    assert run.warnings == ["line 2: unknown event kind 'cut' ignored"]


def test_second_header_is_an_error(tmp_path):
    path = tmp_path / "joined.jsonl"
    write_lines(path, [full_header(), *sample_events(), full_header()])
    with pytest.raises(RunLogError, match="second header") as info:
        read_run(path)
    assert info.value.line == 11


def test_events_after_the_end_are_warned_about(tmp_path):
    path = tmp_path / "late.jsonl"
    events = sample_events()
    write_lines(path, [full_header(), *events, events[3]])
    run = read_run(path)
    assert run.warnings == ["line 11: progress event after the end event"]


# -------------------------------------------------------------------- consistency
def _nodes_with(tmp_path, change):
    path = tmp_path / "tree.jsonl"
    events = sample_events()
    change(events)
    write_lines(path, [full_header(), *events])
    return path


@pytest.mark.parametrize(
    ("change", "line", "field", "fragment"),
    [
        # node 4's parent 9 never appears
        (lambda ev: ev[4].update(parent=9), 6, "parent", "parent 9 has not appeared"),
        # node 3 reuses id 2
        (lambda ev: ev[6].update(id=2), 8, "id", "duplicate node id 2 (first on line 4)"),
        # node 4 hangs under the infeasible node 2
        (lambda ev: ev[4].update(parent=2), 6, "parent", "parent 2 (line 4) is infeasible"),
        # a second root
        (lambda ev: ev[4].update(parent=None, depth=0, branch=None), 6, "parent",
         "second root"),  # fmt: skip
        # depth does not follow from the parent (node 1 has depth 1)
        (lambda ev: ev[4].update(depth=5), 6, "depth", "expected 2"),
    ],
)
def test_consistency_errors_name_line_and_field(tmp_path, change, line, field, fragment):
    path = _nodes_with(tmp_path, change)
    with pytest.raises(RunLogError) as info:
        read_run(path)
    assert (info.value.line, info.value.field) == (line, field)
    assert fragment in str(info.value)


def test_lenient_skips_an_orphan_and_keeps_the_rest(tmp_path):
    path = _nodes_with(tmp_path, lambda ev: ev[4].update(parent=9))
    run = read_run(path, lenient=True)
    assert [e["id"] for e in run.nodes] == [0, 1, 2, 3]
    assert any("line 6, field 'parent'" in w for w in run.warnings)


def test_child_bound_better_than_parent_is_a_warning_in_the_model_sense(tmp_path):
    # Maximisation: a child's bound may not exceed its parent's 7.5 (by hand).
    path = _nodes_with(tmp_path, lambda ev: ev[4].update(bound=7.6))
    run = read_run(path)
    assert len(run.nodes) == 5
    assert run.warnings == [
        "line 6: node 4's bound 7.6 is better than its parent 1's bound 7.5 "
        "(a child cannot improve on it)"
    ]
    # within the 1e-6 relative tolerance: silent
    path = _nodes_with(tmp_path, lambda ev: ev[4].update(bound=7.5 * (1 + 5e-7)))
    assert read_run(path).warnings == []


def test_same_bounds_in_a_minimisation_are_fine_but_falling_ones_are_not(tmp_path):
    path = tmp_path / "min.jsonl"
    events = sample_events()
    # As a minimisation, 59/7 -> 7.5 falls: node 1 improves on the root.
    write_run(path, events, sense="min")
    warnings = read_run(path).warnings
    assert any("node 1's bound 7.5 is better than its parent 0's" in w for w in warnings)
