"""Comparisons: performance profiles, shifted geometric means, best marks, the SVG, the
parallel runner and `undergrowth compare`. Hand-made check values are worked out in
the comments ("by hand", from the published definitions)."""

from __future__ import annotations

import json
import math
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from families import knapsack, parity_knapsack, set_cover
from undergrowth.analysis.compare import (
    ROW_KEYS,
    best_marks,
    performance_profile,
    rows_for_tables,
    run_row,
    shifted_geometric_mean,
    solver_means,
)
from undergrowth.analysis.profile_svg import profile_svg
from undergrowth.analysis.table import RunTable
from undergrowth.cli import main
from undergrowth.commands.compare import format_table
from undergrowth.compare_runner import plan, run_comparison
from undergrowth.model import write_model

SVG = "{http://www.w3.org/2000/svg}"


def row(model: str, rule: str, status: str = "optimal", *, seed: int = 0, select="best-bound",
        **values) -> dict:
    base = dict.fromkeys(ROW_KEYS)
    base.update(model=model, branching=rule, select=select, seed=seed, status=status)
    base.update(values)
    return base


# ------------------------------------------------------------------ performance profile
@pytest.fixture
def hand_rows() -> list[dict]:
    """Three solvers on four problems, measure = nodes (None: did not finish).

            p1   p2   p3          p4
        A   10   30   40          time-limit
        B   20   15   node-limit  time-limit
        C   25   45   80          time-limit
    """
    A, B, C = "most-fractional", "pseudocost", "reliability"
    return [
        row("p1", A, nodes=10), row("p1", B, nodes=20), row("p1", C, nodes=25),
        row("p2", A, nodes=30), row("p2", B, nodes=15), row("p2", C, nodes=45),
        row("p3", A, nodes=40), row("p3", B, "node-limit", nodes=50), row("p3", C, nodes=80),
        row("p4", A, "time-limit", nodes=7), row("p4", B, "time-limit", nodes=9),
        row("p4", C, "time-limit", nodes=8),
    ]


def test_performance_profile_matches_a_hand_computed_example(hand_rows):
    # By hand, from the definition in Dolan & Moré, "Benchmarking optimization software
    # with performance profiles", Mathematical Programming 91 (2002): r_ps = t_ps / min_s
    # t_ps, r_ps = ∞ when s failed p, ρ_s(τ) = |{p : r_ps ≤ τ}| / n_p with n_p = 4.
    #   p1: best 10 → A 10/10 = 1,  B 20/10 = 2,  C 25/10 = 2.5
    #   p2: best 15 → A 30/15 = 2,  B 15/15 = 1,  C 45/15 = 3
    #   p3: best 40 (B failed) → A 1, B ∞, C 80/40 = 2
    #   p4: nobody finished → ∞ for all (p4 still counts in n_p)
    #   ρ_A: τ=1 → {p1,p3} = 2/4;  τ=2 → {p1,p2,p3} = 3/4
    #   ρ_B: τ=1 → {p2} = 1/4;     τ=2 → {p1,p2} = 2/4
    #   ρ_C: τ=1 → 0;  τ=2 → {p3} = 1/4;  τ=2.5 → 2/4;  τ=3 → 3/4
    prof = performance_profile(hand_rows, measure="nodes")
    assert prof["solvers"] == ["most-fractional / best-bound", "pseudocost / best-bound",
                               "reliability / best-bound"]
    assert prof["problems"] == ["p1#0", "p2#0", "p3#0", "p4#0"]
    assert prof["ratios"] == [[1.0, 2.0, 1.0, None], [2.0, 1.0, None, None],
                              [2.5, 3.0, 2.0, None]]
    a, b, c = prof["curves"]
    assert a["steps"] == [[1.0, 0.5], [2.0, 0.75]]
    assert b["steps"] == [[1.0, 0.25], [2.0, 0.5]]
    assert c["steps"] == [[1.0, 0.0], [2.0, 0.25], [2.5, 0.5], [3.0, 0.75]]
    assert (a["at_one"], b["at_one"], c["at_one"]) == (0.5, 0.25, 0.0)
    assert (a["solved"], b["solved"], c["solved"]) == (0.75, 0.5, 0.75)
    assert prof["tau_max"] == 3.0
    json.dumps(prof, allow_nan=False)  # JSON-ready: ∞ travels as null


def test_performance_profile_refuses_two_runs_of_one_solver_on_one_problem():
    rows = [row("p1", "random", nodes=3), row("p1", "random", nodes=4)]
    with pytest.raises(ValueError, match="two runs of random / best-bound on p1"):
        performance_profile(rows)
    with pytest.raises(ValueError, match="measure"):
        performance_profile(rows, measure="depth")


# ------------------------------------------------------------------ shifted geometric mean
def test_shifted_geometric_mean_by_hand():
    # By hand: (∏ (v + s))^(1/n) − s.
    # shift 1, values 0, 3, 15: (1 · 4 · 16)^(1/3) − 1 = 64^(1/3) − 1 = 4 − 1 = 3
    assert shifted_geometric_mean([0, 3, 15], shift=1) == pytest.approx(3.0, rel=1e-12)
    # shift 100 (nodes), values 0 and 300: √(100 · 400) − 100 = 200 − 100 = 100
    assert shifted_geometric_mean([0, 300], shift=100) == pytest.approx(100.0, rel=1e-12)
    # shift 10 (seconds), values 0 and 30: √(10 · 40) − 10 = 20 − 10 = 10
    assert shifted_geometric_mean([0.0, 30.0], shift=10) == pytest.approx(10.0, rel=1e-12)
    # shift 0 is the plain geometric mean: √(2 · 8) = 4
    assert shifted_geometric_mean([2, 8], shift=0) == pytest.approx(4.0, rel=1e-12)
    with pytest.raises(ValueError, match="values: need at least one"):
        shifted_geometric_mean([], shift=10)
    with pytest.raises(ValueError, match="shift: must be"):
        shifted_geometric_mean([1.0], shift=-1)
    with pytest.raises(ValueError, match="plus the shift"):
        shifted_geometric_mean([0.0], shift=0)


def test_solver_means_state_their_shifts_and_count_finished_runs(hand_rows):
    means = {m["branching"]: m for m in solver_means(
        [r | {"seconds": 1.0, "lp_iterations": 10} for r in hand_rows])}
    a = means["most-fractional"]
    assert (a["runs"], a["finished"], a["nodes_shift"], a["seconds_shift"]) == (4, 3, 100, 10)
    # by hand: (110 · 130 · 140 · 107)^(1/4) − 100
    want = (110 * 130 * 140 * 107) ** 0.25 - 100
    assert a["nodes"] == pytest.approx(want, rel=1e-12)


# ------------------------------------------------------------------ best marks and table
def test_best_marks_rank_lower_values_within_each_problem():
    rows = [
        row("m", "most-fractional", nodes=50, seconds=2.0, gap=0.0, max_depth=9,
            first_incumbent_seconds=None),
        row("m", "pseudocost", nodes=40, seconds=2.0, gap=0.0, max_depth=7,
            first_incumbent_seconds=0.5),
        # stopped by the limit: fewer nodes only because it gave up, so not "best" effort
        row("m", "reliability", "node-limit", nodes=10, seconds=0.1, gap=0.2, max_depth=3,
            first_incumbent_seconds=0.4),
        row("other", "most-fractional", nodes=99, seconds=9.0, gap=0.0, max_depth=1),
    ]
    marks = best_marks(rows)
    assert marks[1]["nodes"] and not marks[0]["nodes"] and not marks[2]["nodes"]
    assert marks[0]["seconds"] and marks[1]["seconds"]  # a tie marks both
    assert marks[0]["gap"] and marks[1]["gap"] and not marks[2]["gap"]
    assert marks[2]["first_incumbent_seconds"]  # not an effort column: every run competes
    assert not marks[0]["first_incumbent_seconds"]  # missing values are never best
    assert marks[3]["nodes"]  # its own problem
    text = format_table(rows, marks)
    lines = {ln.split()[0]: ln for ln in text.splitlines() if " / best-bound" in ln}
    assert "40*" in lines["pseudocost"] and "50*" not in lines["most-fractional"]
    assert "10*" not in lines["reliability"]
    assert "lower is better in every numeric column" in text


# ------------------------------------------------------------------ SVG
def test_profile_svg_is_well_formed_with_one_polyline_per_solver(hand_rows):
    prof = performance_profile(hand_rows, measure="nodes")
    root = ET.fromstring(profile_svg(prof))
    assert root.tag == f"{SVG}svg"
    lines = root.findall(f".//{SVG}polyline")
    assert [p.get("data-solver") for p in lines] == prof["solvers"]
    for p in lines:
        points = [tuple(map(float, xy.split(","))) for xy in p.get("points").split()]
        xs = [x for x, _ in points]
        assert xs == sorted(xs)  # a step function runs left to right
        ys = [y for _, y in points]
        assert ys == sorted(ys, reverse=True)  # ρ never falls (y grows downwards)
    # C's curve starts at ρ = 0: its first point is on the bottom axis, lower than A's
    assert float(lines[2].get("points").split()[0].split(",")[1]) > \
        float(lines[0].get("points").split()[0].split(",")[1])


# ------------------------------------------------------------------ runner and CLI
@pytest.fixture(scope="module")
def two_models(tmp_path_factory) -> list[str]:
    d = tmp_path_factory.mktemp("models")
    paths = []
    for problem in (knapsack(3), set_cover(2)):
        path = d / f"{problem.name}.json"
        write_model(problem, str(path))
        paths.append(str(path))
    return paths


@pytest.fixture(scope="module")
def cli_json(two_models, tmp_path_factory):
    out = tmp_path_factory.mktemp("cmp") / "group"
    argv = ["compare", *two_models, "--branching", "most-fractional,pseudocost",
            "--select", "best-bound", "--jobs", "2", "--out-dir", str(out), "--json"]
    return argv, out


def test_cli_json_rows_have_every_key_and_parallel_equals_serial(cli_json, two_models,
                                                                  capsys, tmp_path):
    argv, out = cli_json
    assert main(argv) == 0
    captured = capsys.readouterr()
    rows = json.loads(captured.out)
    assert len(rows) == 4
    for r in rows:
        assert set(r) == set(ROW_KEYS)
        assert r["status"] == "optimal" and Path(r["run_log"]).is_file()
        assert r["gap"] is not None and r["first_incumbent_seconds"] <= r["seconds"]
    assert "[4/4]" in captured.err  # progress: k of n, on stderr
    group = json.loads((out / "group.json").read_text())
    assert group["state"] == "done" and len(group["runs"]) == 4
    assert {r["status"] for r in group["runs"]} == {"optimal"}
    for name in ("profile-nodes.svg", "profile-seconds.svg", "profile.json", "profile.csv"):
        assert (out / name).is_file(), name
    root = ET.parse(out / "profile-nodes.svg").getroot()
    assert len(root.findall(f".//{SVG}polyline")) == 2

    # Determinism: the same combinations solved one after another in this process.
    serial = run_comparison(two_models, branching=["most-fractional", "pseudocost"],
                            select=["best-bound"], jobs=1, out_dir=tmp_path / "serial")
    key = lambda r: (r["model"], r["branching"], r["seed"])  # noqa: E731
    assert {key(r): r["nodes"] for r in serial.rows} == {key(r): r["nodes"] for r in rows}
    assert {key(r): r["lp_iterations"] for r in serial.rows} == \
        {key(r): r["lp_iterations"] for r in rows}


def test_cli_table_marks_the_best_and_prints_the_means(two_models, capsys, tmp_path):
    argv = ["compare", *two_models, "--branching", "most-fractional,reliability",
            "--select", "best-bound", "--jobs", "1", "--out-dir", str(tmp_path)]
    assert main(argv) == 0
    text = capsys.readouterr().out
    blocks = [b for b in text.split("\n\n") if "rule / order" in b and "(seed 0)" in b]
    assert len(blocks) == 2
    for block in blocks:
        head, *body = block.splitlines()[1:]
        nodes_at = head.index("nodes") + len("nodes")  # right-aligned under the heading
        marked = [ln for ln in body if ln[nodes_at] == "*"]
        assert marked, block  # somebody has the fewest nodes
        counts = [int(ln[:nodes_at].split()[-1].replace(",", "")) for ln in body]
        assert all(int(ln[:nodes_at].split()[-1].replace(",", "")) == min(counts)
                   for ln in marked)
    assert "shifted geometric means over 2 problems" in text
    assert "shifts: nodes 100, seconds 10" in text
    assert str(tmp_path / "profile-nodes.svg") in text


def test_cli_refuses_an_unknown_rule_before_running(two_models, capsys, tmp_path):
    argv = ["compare", two_models[0], "--branching", "most-fractional,sideways",
            "--out-dir", str(tmp_path / "x")]
    assert main(argv) == 2
    assert "branching: unknown 'sideways'" in capsys.readouterr().err
    assert not (tmp_path / "x").exists()


def test_runner_validates_its_arguments():
    model = knapsack(0)
    with pytest.raises(ValueError, match="seeds: must be at least 1"):
        run_comparison([model], branching=["random"], select=["best-bound"], seeds=0)
    with pytest.raises(ValueError, match="jobs: must be at least 1"):
        run_comparison([model], branching=["random"], select=["best-bound"], jobs=0)
    with pytest.raises(ValueError, match="select: unknown 'widest'"):
        run_comparison([model], branching=["random"], select=["widest"])
    with pytest.raises(ValueError, match="node_limit"):
        run_comparison([model], branching=["random"], select=["best-bound"], node_limit=0)
    with pytest.raises(ValueError, match="settings: 'seed'"):
        run_comparison([model], branching=["random"], select=["best-bound"],
                       settings={"seed": 3})


def test_plan_keeps_models_with_one_name_apart(tmp_path):
    model = knapsack(0)
    specs = plan([(model, None), (model, None)], branching=["random"], select=["depth-first"],
                 seeds=[0, 1], settings={}, directory=tmp_path)
    assert len(specs) == 4 and len({s.run_log for s in specs}) == 4
    assert [s.label for s in specs] == [model.name] * 2 + [f"{model.name} (2)"] * 2


def test_seeds_and_a_shared_primal_integral_reference(tmp_path):
    comparison = run_comparison([knapsack(1)], branching=["random", "most-fractional"],
                                select=["depth-first"], seeds=2, jobs=1, out_dir=tmp_path)
    rows = comparison.rows
    assert [(r["branching"], r["seed"]) for r in rows] == [
        ("random", 0), ("random", 1), ("most-fractional", 0), ("most-fractional", 1)]
    tables = [RunTable.open(r["run_log"]) for r in rows]
    best = max(float(t.incumbents.objective.max()) for t in tables)  # a maximisation
    for r, t in zip(rows, tables, strict=True):
        alone = run_row(t, reference=best)
        assert r["primal_integral"] == pytest.approx(alone["primal_integral"])
        assert r["max_depth"] == int(t.columns["depth"][t.columns["order"] >= 0].max())
    assert rows_for_tables(tables)[0]["primal_integral"] == pytest.approx(
        rows[0]["primal_integral"])


def test_stopping_a_parallel_comparison_keeps_what_ran(tmp_path):
    # parity_knapsack never finishes on its own. Stop once a run log exists (a worker
    # writes the header before its first node): no timing involved.
    def should_stop() -> bool:
        return any(tmp_path.glob("*.jsonl.gz"))

    comparison = run_comparison([parity_knapsack(41)],
                                branching=["most-fractional", "pseudocost", "random"],
                                select=["depth-first"], jobs=2, out_dir=tmp_path,
                                should_stop=should_stop)
    assert comparison.cancelled
    statuses = [r["status"] for r in comparison.rows]
    # two workers: one or two runs had begun; the third never starts
    assert 1 <= len(statuses) <= 2 and set(statuses) == {"cancelled"}
    group = json.loads((tmp_path / "group.json").read_text())
    assert group["state"] == "cancelled"
    assert sum(r["status"] is None for r in group["runs"]) == 3 - len(statuses)
    assert all(math.isfinite(r["seconds"]) for r in comparison.rows)


def test_stopping_a_serial_comparison_before_it_starts(tmp_path):
    comparison = run_comparison([knapsack(0)], branching=["random", "first-index"],
                                select=["best-bound"], jobs=1, out_dir=tmp_path,
                                should_stop=lambda: True)
    assert comparison.cancelled and comparison.rows == []
    assert not any(tmp_path.glob("*.jsonl.gz"))
    assert json.loads((tmp_path / "group.json").read_text())["state"] == "cancelled"
