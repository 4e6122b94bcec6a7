"""`undergrowth model FILE [--json]` through the command-line entry point."""

import json
from pathlib import Path

import pytest

from undergrowth.cli import main

BAKERY = {
    "format": "undergrowth-model",
    "version": 1,
    "name": "bakery-small",
    "sense": "max",
    "objective": {"loaves": 40, "trays": 30, "oven2": -25},
    "quadratic": [{"i": "trays", "j": "trays", "value": -1.5}],
    "variables": {"loaves": {"upper": 8, "integer": True}, "trays": {"integer": True},
                  "oven2": {"binary": True}, "hours": {"upper": 4}},
    "constraints": {"oven": {"terms": {"loaves": 1.5, "trays": 1, "oven2": -6,
                                       "hours": -1}, "upper": 10},
                    "flour": {"terms": {"loaves": 6, "trays": 2}, "upper": 50}},
}


def write(tmp_path: Path, doc: dict | str, name: str = "bakery.json") -> str:
    path = tmp_path / name
    path.write_text(doc if isinstance(doc, str) else json.dumps(doc, indent=2),
                    encoding="utf-8")
    return str(path)


def test_text_summary(tmp_path, capsys):
    path = write(tmp_path, BAKERY)
    assert main(["model", path]) == 0
    out = capsys.readouterr().out
    assert out.splitlines()[0] == f"bakery-small  ({path})"
    assert "objective   maximise, quadratic, concave" in out
    assert "columns     4: 3 integer (1 binary, 2 general), 1 continuous" in out
    assert "rows        2, with 6 nonzeros" in out
    assert "matrix     1 .. 6  (ratio 6)" in out
    assert "objective  25 .. 40  (ratio 1.6)" in out
    assert "quadratic  3 .. 3" in out
    # trays is an integer without an upper bound
    assert "warnings    1" in out
    assert "unbounded-integer: 1 integer column with an infinite bound" in out


def test_json_summary(tmp_path, capsys):
    path = write(tmp_path, BAKERY)
    assert main(["model", path, "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert {k: report[k] for k in ("name", "rows", "columns", "integers", "binaries",
                                   "general_integers", "continuous", "nonzeros", "sense",
                                   "quadratic", "convex")} == {
        "name": "bakery-small", "rows": 2, "columns": 4, "integers": 3, "binaries": 1,
        "general_integers": 2, "continuous": 1, "nonzeros": 6, "sense": "max",
        "quadratic": True, "convex": True,
    }
    # −Q = [[3]] on the one quadratic column (Q_tt = 2·(−1.5)) (by hand)
    assert report["smallest_eigenvalue"] == pytest.approx(3.0)
    assert report["ranges"]["matrix"] == {"min": 1.0, "max": 6.0, "ratio": 6.0, "count": 6}
    assert report["ranges"]["row_bounds"]["min"] == 10
    assert [w["code"] for w in report["warnings"]] == ["unbounded-integer"]
    assert report["warnings"][0]["columns"] == [1]
    assert report["file"] == path


def test_linear_clean_model_says_so(tmp_path, capsys):
    doc = dict(BAKERY, quadratic=[])
    doc["variables"] = dict(BAKERY["variables"], trays={"upper": 9, "integer": True})
    assert main(["model", write(tmp_path, doc)]) == 0
    out = capsys.readouterr().out
    assert "maximise, linear" in out and "warnings    none" in out
    assert "quadratic " not in out


def test_nonconvex_objective_is_shown(tmp_path, capsys):
    doc = dict(BAKERY, quadratic=[{"i": "trays", "j": "trays", "value": 1.5}])
    assert main(["model", write(tmp_path, doc), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert report["convex"] is False
    assert report["warnings"][0]["code"] == "nonconvex-objective"
    assert main(["model", write(tmp_path, doc)]) == 0
    assert "NOT concave (smallest eigenvalue of -Q: -3)" in capsys.readouterr().out


def test_empty_model_has_no_ranges(tmp_path, capsys):
    path = write(tmp_path, {"format": "undergrowth-model", "version": 1, "variables": {}})
    assert main(["model", path, "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert report["ranges"]["matrix"] == {"min": None, "max": None, "ratio": None,
                                          "count": 0}
    assert main(["model", path]) == 0
    assert "(no nonzero finite values)" in capsys.readouterr().out


def test_bad_file_prints_the_error_and_exits_2(tmp_path, capsys):
    doc = json.loads(json.dumps(BAKERY))
    doc["constraints"]["flour"]["terms"]["rye"] = 3
    path = write(tmp_path, doc)
    assert main(["model", path]) == 2
    captured = capsys.readouterr()
    assert captured.out == ""
    assert "token 'constraints.flour.terms.rye'" in captured.err
    assert "unknown variable 'rye'" in captured.err


def test_invalid_json_and_missing_file_exit_2(tmp_path, capsys):
    assert main(["model", write(tmp_path, '{"format": ')]) == 2
    assert "invalid JSON" in capsys.readouterr().err
    assert main(["model", str(tmp_path / "nowhere.json")]) == 2
    assert "nowhere.json" in capsys.readouterr().err
