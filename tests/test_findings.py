"""Findings: each one on a model or run built to trigger it, and a control that must not.

Runs are made fresh: engine → RunLogWriter → RunTable.open in a temporary directory.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from families import knapsack, multi_knapsack
from test_measures import solve_to_table, ticking
from undergrowth.analysis.findings import CODES, Finding, diagnose
from undergrowth.analysis.findings_model import loose_links, parity_rows
from undergrowth.analysis.table import RunTable
from undergrowth.model import Problem
from undergrowth.record import Recorder
from undergrowth.samples import depot_siting, oven_batching, shift_cover

MF_BB = {"branching": "most-fractional", "select": "best-bound"}


def codes(findings: list[Finding]) -> set[str]:
    return {f.code for f in findings}


def by_code(findings: list[Finding], code: str) -> Finding:
    return next(f for f in findings if f.code == code)


def odd_equality(n: int = 9) -> Problem:
    """Σ 2·x_j = n, n odd, x binary: no integer solution, but every relaxation with a
    free column has one."""
    return Problem.from_arrays(
        np.ones(n), np.full((1, n), 2.0), row_lower=[float(n)], row_upper=[float(n)],
        col_upper=np.ones(n), integrality=np.ones(n), row_names=["odd_total"],
        name=f"odd-equality-n{n}")


# ------------------------------------------------------------------ depot siting
@pytest.fixture(scope="module")
def depot(tmp_path_factory):
    d = tmp_path_factory.mktemp("depot")
    loose, tight = depot_siting(tight=False), depot_siting(tight=True)
    return {"loose": (solve_to_table(loose, d, **MF_BB), loose),
            "loose-hybrid": (solve_to_table(loose, d, branching="reliability",
                                            select="hybrid"), loose),
            "tight": (solve_to_table(tight, d, **MF_BB), tight)}


def test_loose_depot_siting_gets_weak_root_and_loose_big_m(depot):
    table, model = depot["loose"]
    found = diagnose(table, model)
    assert {"weak-root", "loose-big-m"} <= codes(found)
    weak = by_code(found, "weak-root")
    # sample_runs/README.md: root bound 716.68, optimum 2030, root gap 64.7%
    assert weak.evidence["root_gap"] == pytest.approx(0.6470, abs=1e-4)
    assert weak.severity == "high" and weak.refs["nodes"] == [0]
    big_m = by_code(found, "loose-big-m")
    # by hand from the activity-bound rule: each link row Σ_v share[d,v] − 100·open[d]
    # ≤ 0 has 24 shares in [0, 1], so U = 24·1 = 24, b = 0 and the tightest
    # coefficient is max{0, 24 − 0} = 24 (ratio 100 / 24 ≈ 4.17) for all 8 depots
    assert big_m.evidence["rows"] == 8 and len(big_m.details) == 8
    assert {d["tightest"] for d in big_m.details} == {24.0}
    assert {d["coefficient"] for d in big_m.details} == {-100.0}
    assert all(d["new_coefficient"] == -24.0 for d in big_m.details)
    assert set(big_m.refs["rows"]) == {r for r in model.row_names if r.startswith("link[")}
    assert big_m.severity == "high"  # raised: the run's root is weak too


def test_tight_depot_siting_gets_neither(depot):
    table, model = depot["tight"]
    found = diagnose(table, model)
    assert not {"weak-root", "loose-big-m"} & codes(found)
    assert loose_links(model) == []  # share − open ≤ 0: U − b = 1 = |−1|, already tight


def test_late_incumbent_under_best_bound_and_not_when_diving(depot):
    # sample_runs/README.md: best-bound finds the first incumbent at node 65 of 111,
    # the reliability/hybrid run at node 9 of 103
    late = by_code(diagnose(depot["loose"][0]), "late-incumbent")
    assert late.evidence["first_at"] == 66 and late.evidence["processed"] == 111
    assert late.refs["nodes"]
    assert "late-incumbent" not in codes(diagnose(depot["loose-hybrid"][0]))


# ------------------------------------------------------------------ big-M by hand
def big_m_rows() -> Problem:
    names = ["x1", "x2", "y1", "x3", "x4", "y2", "x5", "x6", "y3", "x7", "y4", "x8", "y5",
             "x9", "y6", "z", "y7"]
    col = {n: j for j, n in enumerate(names)}
    lower = {"x5": -2.0, "x6": -3.0}
    upper = {"x1": 10, "x2": 3, "x3": 4, "x4": 5, "x5": 6, "x6": 2, "x7": np.inf, "x8": 5,
             "x9": 20, "z": 7}
    rows = [  # (name, {column: coefficient}, lower, upper)
        ("switch_le", {"x1": 1, "x2": 2, "y1": -50}, -np.inf, 4),
        ("switch_ge", {"x3": 2, "x4": 1, "y2": 60}, 20, np.inf),
        ("mixed_signs", {"x5": 1, "x6": -1, "y3": -30}, -np.inf, 1),
        ("unbounded", {"x7": 1, "y4": -1000}, -np.inf, 0),
        ("already_tight", {"x8": 1, "y5": -5}, -np.inf, 0),
        ("complemented", {"x9": 1, "y6": 100}, -np.inf, 105),
        ("equality", {"z": 1, "y7": -40}, 0, 0),
        ("slightly_loose", {"x1": 1, "y5": -15}, -np.inf, 0),
    ]
    A = np.zeros((len(rows), len(names)))
    for i, (_, coefs, _, _) in enumerate(rows):
        for n, a in coefs.items():
            A[i, col[n]] = a
    return Problem.from_arrays(
        np.ones(len(names)), A, row_lower=[r[2] for r in rows], row_upper=[r[3] for r in rows],
        col_lower=[lower.get(n, 0.0) for n in names],
        col_upper=[upper.get(n, 1.0) for n in names],
        integrality=[n.startswith("y") for n in names], col_names=names,
        row_names=[r[0] for r in rows], name="big-m-rows")


def test_tightest_big_m_by_hand_from_the_activity_bound_rule():
    # Savelsbergh, ORSA J. Computing 6(4), 1994: for a·x ≤ b and binary y with a_y < 0,
    # U = Σ_{a>0} a·u + Σ_{a<0} a·l over the other terms; |a_y| need not exceed
    # max{0, U − b}. Worked by hand:
    links = {link.row_name: link for link in loose_links(big_m_rows())}
    # switch_le: x1 + 2·x2 − 50·y1 ≤ 4, x1 ≤ 10, x2 ≤ 3: U = 10 + 2·3 = 16,
    # tightest = 16 − 4 = 12 (ratio 50/12)
    s = links["switch_le"]
    assert (s.coefficient, s.tightest, s.new_coefficient, s.new_rhs) == (-50, 12, -12, 4)
    assert s.ratio == pytest.approx(50 / 12)
    # switch_ge: 2·x3 + x4 + 60·y2 ≥ 20 read as −2·x3 − x4 − 60·y2 ≤ −20: U = 0
    # (both at their lower bound 0), tightest = 0 − (−20) = 20 (ratio 3)
    g = links["switch_ge"]
    assert (g.side, g.coefficient, g.tightest, g.new_coefficient) == (">=", 60, 20, 20)
    # mixed_signs: x5 − x6 − 30·y3 ≤ 1, x5 ∈ [−2, 6], x6 ∈ [−3, 2]:
    # U = 1·6 + (−1)·(−3) = 9, tightest = 9 − 1 = 8 (ratio 3.75)
    assert links["mixed_signs"].tightest == 8 and links["mixed_signs"].max_activity == 9
    # complemented: x9 + 100·y6 ≤ 105 is x9 ≤ 5 + 100·(1 − y6), x9 ≤ 20: with the others'
    # U = 20 and b' = 105 − 100 = 5, tightest = 20 − 5 = 15: x9 + 15·y6 ≤ 20
    c = links["complemented"]
    assert (c.tightest, c.new_coefficient, c.new_rhs, c.complemented) == (15, 15, 20, True)
    # not reported: x7 has no upper bound (U infinite); x8 − 5·y5 ≤ 0 is already tight
    # (U − b = 5); an equality has no slack to trade; x1 − 15·y5 ≤ 0 is 15/10 = 1.5×
    # the tightest value, under the 2× threshold
    assert set(links) == {"switch_le", "switch_ge", "mixed_signs", "complemented"}
    found = diagnose(None, big_m_rows())
    assert by_code(found, "loose-big-m").refs["rows"] == [
        "switch_le", "switch_ge", "mixed_signs", "complemented"]


# ------------------------------------------------------------------ symmetry
@pytest.fixture(scope="module")
def shift(tmp_path_factory):
    model = shift_cover()
    return solve_to_table(model, tmp_path_factory.mktemp("shift"), branching="reliability",
                          select="hybrid"), model


@pytest.fixture(scope="module")
def knapsack_run(tmp_path_factory):
    model = multi_knapsack(4, n=60, m=3)
    return solve_to_table(model, tmp_path_factory.mktemp("mk"), **MF_BB), model


def test_shift_cover_gets_dual_stall_and_branching_hotspot(shift):
    table, model = shift
    found = diagnose(table, model)
    stall = by_code(found, "dual-stall")
    # sample_runs/README.md: the dual bound sits at 78 until the optimum 86 is proven
    assert stall.evidence["dual_bound"] == 78.0 and stall.evidence["moved"] == 0.0
    assert stall.evidence["share"] > 0.99 and stall.severity == "high"
    assert stall.evidence["open_peak"] > 10 * stall.evidence["open_at_start"]
    # refs: the nodes waiting with the stuck bound 78 (their parent's) at the widest point
    rows = [table.row_of(i) for i in stall.refs["nodes"]]
    assert len(rows) > 10
    assert {float(table.bound[table.parent_row[r]]) for r in rows} == {78.0}
    hot = by_code(found, "branching-hotspot")
    # the bakers are interchangeable: the hot variables are hire[...] switches with
    # identical columns (cost 10, a single −5 in their own max_shifts row)
    assert all(v.startswith("hire[") for v in hot.refs["variables"])
    assert hot.evidence["interchangeable"] == hot.evidence["hot_variables"]
    assert hot.evidence["hot_variables"] <= 0.1 * 156
    assert hot.evidence["median_gain_share"] == 0.0


def test_a_knapsack_whose_bound_moves_gets_neither(knapsack_run):
    table, model = knapsack_run
    found = codes(diagnose(table, model))
    assert not {"dual-stall", "branching-hotspot"} & found
    assert found == set()  # and nothing else either


# ------------------------------------------------------------------ infeasible
def test_odd_equality_knapsack_is_infeasible_heavy(tmp_path):
    model = odd_equality()
    table = solve_to_table(model, tmp_path, **MF_BB)
    found = diagnose(table, model)
    heavy = by_code(found, "infeasible-heavy")
    # every leaf of this tree is infeasible: 2·Σx is even, the right-hand side odd
    assert heavy.evidence["share"] == 1.0 and heavy.severity == "high"
    assert heavy.refs["rows"] == ["odd_total"] and heavy.evidence["parity_rows"] == 1
    # by hand: gcd(2, …, 2) = 2 does not divide 9
    assert [(p.row_name, p.divisor, p.rhs) for p in parity_rows(model)] == [
        ("odd_total", 2, 9.0)]
    assert len(heavy.refs["nodes"]) == heavy.evidence["infeasible"]
    assert {int(table.status[table.row_of(i)]) for i in heavy.refs["nodes"]} == {3}
    # the search proved infeasibility: no incumbent, reported as information
    assert by_code(found, "no-incumbent").severity == "info"


def test_a_plain_knapsack_is_not_infeasible_heavy(tmp_path):
    model = knapsack(1, n=25)
    assert "infeasible-heavy" not in codes(diagnose(solve_to_table(model, tmp_path, **MF_BB),
                                                    model))
    assert parity_rows(model) == []


def test_no_incumbent_when_a_limit_stops_the_search_first(tmp_path):
    table = solve_to_table(odd_equality(), tmp_path, node_limit=40, **MF_BB)
    found = by_code(diagnose(table), "no-incumbent")
    assert found.severity == "high" and found.evidence["open"] > 0
    assert found.evidence["end_status"] == "node-limit"


# ------------------------------------------------------------------ failed nodes
def _recorded(path, *, fail: bool) -> RunTable:
    with Recorder(path, model={"name": "own", "sense": "min"}, progress_every=0,
                  progress_seconds=None, clock=ticking()) as rec:
        rec.node(0, None, "branched", 1.0, branching={"var": 0, "value": 0.5})
        if fail:
            rec.node(1, 0, "failed", None, branch=(0, "down", 0),
                     message="simplex iteration limit")
        else:
            rec.node(1, 0, "pruned", 3.0, branch=(0, "down", 0))
        rec.node(2, 0, "integral", 2.0, branch=(0, "up", 1))
        rec.incumbent(2.0, node=2)
    return RunTable.open(path, use_cache=False)


def test_failed_nodes_from_a_recorded_search(tmp_path):
    found = diagnose(_recorded(tmp_path / "failed.jsonl", fail=True))
    failed = by_code(found, "failed-nodes")
    assert failed.severity == "high" and failed.refs["nodes"] == [1]
    assert failed.evidence["failed"] == 1 and found[0].code == "failed-nodes"
    assert "failed-nodes" not in codes(diagnose(_recorded(tmp_path / "ok.jsonl", fail=False)))


# ------------------------------------------------------------------ model checks
def test_indefinite_quadratic_objective_is_explained():
    # by hand: Q = diag(2, −2) has eigenvalues 2 and −2; x binary, so the advice offers
    # the diagonal shift λ ≥ 2/2 = 1
    model = Problem.from_arrays([0.0, 0.0], [[1.0, 1.0]], row_upper=[2.0],
                                col_upper=[1.0, 1.0], integrality=[1, 1],
                                Q=np.diag([2.0, -2.0]), name="saddle")
    found = diagnose(None, model)
    bad = by_code(found, "nonconvex-objective")
    assert bad.severity == "high"
    assert bad.evidence["smallest_eigenvalue"] == pytest.approx(-2.0)
    assert bad.evidence["binary_only"] is True and "λ ≥ 1" in bad.advice
    assert bad.refs["variables"] == ["x0", "x1"]
    # control: the convex oven-batching MIQP
    assert "nonconvex-objective" not in codes(diagnose(None, oven_batching()))


def test_badly_scaled_row():
    # by hand: the row 0.0001·x0 + 10000·x1 ≤ 5 spans 10^4 / 10^-4 = 10^8 > 10^6
    model = Problem.from_arrays([1.0, 1.0], [[1e-4, 1e4], [1.0, 2.0]], row_upper=[5.0, 4.0],
                                col_upper=[10.0, 10.0], row_names=["wide", "fine"])
    bad = by_code(diagnose(None, model), "bad-scaling")
    assert bad.refs["rows"] == ["wide"] and bad.evidence["worst_ratio"] == pytest.approx(1e8)
    assert bad.details[0]["ratio"] == pytest.approx(1e8)
    control = Problem.from_arrays([1.0, 1.0], [[1.0, 20.0], [1.0, 2.0]], row_upper=[5, 4],
                                  col_upper=[10.0, 10.0])
    assert "bad-scaling" not in codes(diagnose(None, control))


# ------------------------------------------------------------------ the shape
def test_findings_are_json_ready_and_ordered(depot, shift):
    for table, model in (depot["loose"], shift):
        found = diagnose(table, model)
        payload = json.dumps([f.to_dict() for f in found], allow_nan=False)
        for item in json.loads(payload):
            assert {"code", "severity", "title", "evidence", "explanation", "advice",
                    "refs"} <= set(item)
            assert set(item["refs"]) == {"nodes", "variables", "rows"}
            assert item["code"] in CODES
        ranks = [("high", "medium", "low", "info").index(f.severity) for f in found]
        assert ranks == sorted(ranks)


def test_model_checks_are_skipped_without_the_model(depot):
    found = codes(diagnose(depot["loose"][0]))
    assert "weak-root" in found and "loose-big-m" not in found


def test_a_finding_refuses_unknown_codes_and_severities():
    with pytest.raises(ValueError, match="code"):
        Finding("slow", "high", "t", {}, "e", "a")
    with pytest.raises(ValueError, match="severity"):
        Finding("weak-root", "urgent", "t", {}, "e", "a")
