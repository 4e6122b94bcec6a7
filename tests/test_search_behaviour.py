"""How a search behaves around the optimum: determinism, limits, stopping, start
solutions, heuristics, solver failures, and what the engine package imports."""

from __future__ import annotations

import copy
import math
import subprocess
import sys
import threading

import numpy as np
import pytest

import families
from invariants import assert_feasible, check_search, without_times
from test_search_oracle import milp_reference
from undergrowth.search import (
    BRANCHING_RULES,
    NODE_ORDERS,
    Search,
    SearchSettings,
)
from undergrowth.search import relaxation as rx


def exact(branching: str = "most-fractional", select: str = "best-bound",
          **extra: object) -> SearchSettings:
    return SearchSettings(branching=branching, select=select, gap=0.0, absolute_gap=0.0,
                          **extra)


def run(problem, settings, **kwargs):
    search = Search(problem, settings, **kwargs)
    events = list(search.events())
    return search, events


def optimum_of(problem) -> float:
    res, value = milp_reference(problem)  # reference: scipy.optimize.milp (HiGHS MIP)
    assert res.status == 0
    return value


def tree_shape(events: list[dict]) -> list[tuple]:
    return [(e["id"], e["parent"], e["status"], e["branching"] and e["branching"]["var"])
            for e in events if e["kind"] == "node"]


# ------------------------------------------------------------ determinism
@pytest.mark.parametrize("branching", BRANCHING_RULES)
def test_same_settings_same_events(branching: str) -> None:
    problem = families.multi_knapsack(1)
    settings = exact(branching, "hybrid", seed=11)
    a, events_a = run(problem, settings)
    b, events_b = run(problem, settings)
    assert without_times(events_a) == without_times(events_b)
    assert without_times(a.header()) == without_times(b.header())
    assert a.result.nodes == b.result.nodes and a.result.objective == b.result.objective


@pytest.mark.parametrize("select", NODE_ORDERS)
def test_random_rule_is_reproducible(select: str) -> None:
    problem = families.knapsack(1)
    settings = exact("random", select, seed=5)
    _, events_a = run(problem, settings)
    _, events_b = run(problem, settings)
    assert without_times(events_a) == without_times(events_b)


def test_random_rule_seeds_give_different_trees() -> None:
    # (a knapsack relaxation has one fractional column, so the rule would have no choice)
    problem = families.integer_cover(3)
    optimum = optimum_of(problem)
    shapes = set()
    for seed in range(6):
        settings = exact("random", "best-bound", seed=seed)
        search, events = run(problem, settings)
        check_search(problem, events, settings, optimum=optimum)
        assert search.result.objective == pytest.approx(optimum)
        shapes.add(tuple(tree_shape(events)))
    assert len(shapes) >= 2, "six seeds of the random rule all built the same tree"


def test_header_records_settings_and_model() -> None:
    problem = families.knapsack(2)
    settings = exact("random", "depth-first", seed=9)
    head = Search(problem, settings).header()
    assert head["kind"] == "header" and head["version"] == 1
    assert head["model"]["sense"] == "max" and head["model"]["columns"] == problem.num_cols
    assert head["settings"]["branching"] == "random" and head["settings"]["seed"] == 9


# ------------------------------------------------------------ limits
def test_node_limit_leaves_open_nodes_and_a_valid_result() -> None:
    problem = families.knapsack(1)
    optimum = optimum_of(problem)
    settings = exact(node_limit=10)
    search, events = run(problem, settings)
    result = search.result
    checked = check_search(problem, events, settings, optimum=optimum)
    assert result.status == "node-limit" and not result.complete
    assert result.nodes == 10 == len(checked.processed)
    opened = checked.with_status("open")
    assert opened, "a stopped search reports the nodes it left"
    assert all(e["order"] is None and e["lp"] is None for e in opened)
    assert checked.progress[-1]["open"] == len(opened)
    # max model: the dual bound is an upper bound on the optimum, the incumbent a lower one
    assert result.dual_bound >= optimum - 1e-9
    if result.objective is not None:
        assert result.objective <= optimum + 1e-9
        assert_feasible(problem, result.x, "node-limit incumbent")
    assert result.gap == checked.end["gap"]


def test_time_limit_stops_promptly() -> None:
    problem = families.parity_knapsack(31)  # never finishes on its own
    settings = exact(time_limit=0.3)
    search, events = run(problem, settings)
    result = search.result
    checked = check_search(problem, events, settings, optimum=15.0)
    assert result.status == "time-limit" and not result.complete
    assert 0.3 <= result.seconds < 2.0
    assert checked.with_status("open")
    assert result.objective == 15.0 and result.dual_bound == pytest.approx(15.5)


def test_cancel_from_another_thread() -> None:
    problem = families.parity_knapsack(31)
    settings = exact()
    search = Search(problem, settings)
    events: list[dict] = []
    reached = threading.Event()
    cancelled = threading.Event()

    def consume() -> None:
        for ev in search.events():
            events.append(ev)
            if ev["kind"] == "node" and ev["order"] == 2:
                reached.set()
                cancelled.wait(10)  # the search is paused mid-stream until cancel() ran

    worker = threading.Thread(target=consume)
    worker.start()
    assert reached.wait(10)
    search.cancel()
    cancelled.set()
    worker.join(10)
    assert not worker.is_alive()
    result = search.result
    assert result.status == "cancelled" and not result.complete
    assert result.nodes == 3  # the stop is taken before the next node
    checked = check_search(problem, events, settings, optimum=15.0)
    assert checked.with_status("open") and checked.end["status"] == "cancelled"


def test_should_stop_callback_cancels_cleanly() -> None:
    problem = families.parity_knapsack(31)
    calls = []

    def should_stop() -> bool:
        calls.append(1)
        return len(calls) > 6

    settings = exact()
    search, events = run(problem, settings, should_stop=should_stop)
    assert search.result.status == "cancelled"
    assert search.result.nodes == 6
    check_search(problem, events, settings, optimum=15.0)


def test_cancel_before_the_root() -> None:
    problem = families.knapsack(0)
    settings = exact()
    search, events = run(problem, settings, should_stop=lambda: True)
    checked = check_search(problem, events, settings)
    assert search.result.status == "cancelled" and search.result.nodes == 0
    assert [e["status"] for e in checked.nodes.values()] == ["open"]
    assert search.result.objective is None and search.result.dual_bound is None


def test_relative_gap_limit() -> None:
    problem = families.knapsack(1)
    optimum = optimum_of(problem)
    settings = SearchSettings(branching="most-fractional", select="best-bound", gap=0.01,
                              absolute_gap=0.0)
    search, events = run(problem, settings)
    result = search.result
    check_search(problem, events, settings, optimum=optimum)
    assert result.status == "gap-reached" and not result.complete
    assert 0 < result.gap <= 0.01
    assert (optimum - result.objective) / optimum <= 0.01
    assert result.nodes < run(problem, exact())[0].result.nodes


def test_absolute_gap_limit() -> None:
    problem = families.knapsack(1)
    optimum = optimum_of(problem)
    settings = SearchSettings(branching="most-fractional", select="best-bound", gap=0.0,
                              absolute_gap=3.0)
    search, events = run(problem, settings)
    result = search.result
    check_search(problem, events, settings, optimum=optimum)
    assert result.status == "gap-reached"
    assert 0 < result.dual_bound - result.objective <= 3.0
    assert optimum - result.objective <= 3.0


# ------------------------------------------------------------ incumbents
def greedy_start(problem) -> np.ndarray:
    """Take items by index while they fit (a feasible knapsack point)."""
    x = np.zeros(problem.num_cols)
    w = problem.A.toarray()[0]
    room = problem.row_upper[0]
    for j in range(problem.num_cols):
        if w[j] <= room:
            x[j] = 1.0
            room -= w[j]
    return x


def test_start_solution_is_the_first_incumbent() -> None:
    problem = families.knapsack(1)
    optimum = optimum_of(problem)
    start = greedy_start(problem)
    value = problem.objective_value(start)
    assert value < optimum  # so the search has something to improve
    settings = exact()
    search, events = run(problem, settings, start=start)
    checked = check_search(problem, events, settings, optimum=optimum)
    first = events[0]
    assert first["kind"] == "incumbent" and first["source"] == "start"
    assert first["node"] is None and first["order"] is None
    assert first["objective"] == pytest.approx(value)
    assert search.result.status == "optimal"
    assert search.result.objective == pytest.approx(optimum)
    assert checked.incumbents[-1]["source"] != "start"


def test_optimal_start_solution_is_kept() -> None:
    problem = families.knapsack(1)
    res, optimum = milp_reference(problem)  # reference: scipy.optimize.milp (HiGHS MIP)
    start = np.round(res.x)
    settings = exact()
    search, events = run(problem, settings, start=start)
    checked = check_search(problem, events, settings, optimum=optimum)
    assert [i["source"] for i in checked.incumbents] == ["start"]
    assert search.result.status == "optimal"
    assert np.array_equal(search.result.x, start)


def test_infeasible_start_solution_is_refused() -> None:
    problem = families.knapsack(1)
    with pytest.raises(ValueError, match="start"):
        list(Search(problem, exact(), start=np.ones(problem.num_cols)).events())
    with pytest.raises(ValueError, match="start"):
        list(Search(problem, exact(), start=np.zeros(3)).events())


def test_rounding_finds_incumbents() -> None:
    problem = families.knapsack(1)
    optimum = optimum_of(problem)
    settings = exact(rounding=True)
    _, events = run(problem, settings)
    checked = check_search(problem, events, settings, optimum=optimum)
    rounded = [i for i in checked.incumbents if i["source"] == "rounding"]
    assert rounded, "rounding a knapsack relaxation gives feasible points"
    for inc in rounded:
        assert checked.nodes[inc["node"]]["status"] != "integral"
        assert inc["objective"] <= optimum + 1e-9
    assert checked.incumbents[0]["source"] == "rounding"  # the very first one too

    settings = exact(rounding=False)
    _, events = run(problem, settings)
    checked = check_search(problem, events, settings, optimum=optimum)
    assert checked.incumbents and all(i["source"] == "integral" for i in checked.incumbents)


def test_objective_offset_shifts_every_value() -> None:
    base = families.knapsack(2)
    shifted = type(base).from_arrays(
        base.c, base.A.toarray(), row_upper=base.row_upper, col_upper=base.col_upper,
        integrality=base.integrality, sense=base.sense, offset=100.0,
        col_names=base.col_names, name="knapsack-with-offset")
    settings = exact()
    _, events_a = run(base, settings)
    _, events_b = run(shifted, settings)
    check_search(shifted, events_b, settings, optimum=optimum_of(base) + 100.0)
    assert tree_shape(events_a) == tree_shape(events_b)
    for a, b in zip(events_a, events_b, strict=True):
        if a["kind"] == "node" and a["bound"] is not None:
            assert b["bound"] == pytest.approx(a["bound"] + 100.0)
        if a["kind"] == "end":
            assert b["objective"] == pytest.approx(a["objective"] + 100.0)


# ------------------------------------------------------------ solver failure
@pytest.mark.parametrize("forced", [rx.FAILED, rx.ITERATION_LIMIT, rx.UNBOUNDED])
def test_failed_relaxation_is_reported_not_pruned(monkeypatch, forced: str) -> None:
    problem = families.knapsack(0)
    optimum = optimum_of(problem)
    real_solve = rx.Relaxation.solve
    calls = []

    def flaky_solve(self, **kwargs):
        calls.append(1)
        if len(calls) == 2:  # the second relaxation: the root's first child
            return rx.RelaxationResult(forced, math.nan, None, 0, 0.0, "forced by the test")
        return real_solve(self, **kwargs)

    monkeypatch.setattr(rx.Relaxation, "solve", flaky_solve)
    settings = exact()
    search, events = run(problem, settings)
    result = search.result
    checked = check_search(problem, events, settings, optimum=optimum)
    failed = checked.with_status("failed")
    assert [e["order"] for e in failed] == [1]
    assert failed[0]["lp"]["status"] == "failed" and failed[0]["message"]
    assert not checked.children(failed[0]["id"]), "a failed node is not branched on"
    assert result.status == "incomplete" and result.complete is False
    assert "not proven" in result.message
    # The failed node's region is unexplored: the dual bound (an upper bound for
    # this max model) must still cover the true optimum.
    assert result.dual_bound >= optimum - 1e-9
    if result.objective is not None and result.objective < optimum - 1e-9:
        assert result.gap > 0


def test_failed_root_relaxation(monkeypatch) -> None:
    problem = families.knapsack(0)

    def broken_solve(self, **kwargs):
        return rx.RelaxationResult(rx.FAILED, math.nan, None, 0, 0.0, "forced by the test")

    monkeypatch.setattr(rx.Relaxation, "solve", broken_solve)
    settings = exact()
    search, events = run(problem, settings)
    check_search(problem, events, settings)
    assert search.result.status == "incomplete" and not search.result.complete
    assert search.result.objective is None and search.result.dual_bound is None


# ------------------------------------------------------------ settings and packaging
def test_unknown_rule_and_order_are_refused() -> None:
    with pytest.raises(ValueError, match="most-fractional"):
        SearchSettings(branching="fractional")
    with pytest.raises(ValueError, match="best-bound"):
        SearchSettings(select="best")
    with pytest.raises(ValueError, match="node_limit"):
        SearchSettings(node_limit=0)


def test_engine_does_not_import_the_web_stack() -> None:
    code = ("import sys, undergrowth.search; "
            "print(' '.join(m for m in ('fastapi', 'pydantic', 'asyncio') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, timeout=60)
    assert out.stdout.strip() == "", f"undergrowth.search pulled in: {out.stdout.strip()}"


# ------------------------------------------------------------ the checker itself
def _good_stream():
    problem = families.knapsack(2)
    settings = exact()
    _, events = run(problem, settings)
    return problem, settings, events, optimum_of(problem)


def _first(events, **match):
    for k, e in enumerate(events):
        if all(e.get(key) == value for key, value in match.items()):
            return k
    raise AssertionError(f"no event matching {match}")


def _corruptions():
    def drop_end(ev):
        ev.pop()

    def duplicate_order(ev):
        ev[_first(ev, kind="node", order=2)]["order"] = 1

    def loosen_child_bound(ev):
        k = _first(ev, kind="node", order=1)
        ev[k]["bound"] = ev[0]["bound"] + 5.0  # max model: above the parent's bound

    def prune_too_early(ev):
        k = _first(ev, kind="node", status="branched", order=0)
        ev[k]["status"] = "pruned"

    def wrong_node_count(ev):
        ev[-1]["nodes"] += 1

    def dual_bound_up_again(ev):
        k = _first(ev, kind="progress")
        ev.insert(k + 1, dict(ev[k], dual_bound=ev[k]["dual_bound"] + 50.0))

    def unknown_status(ev):
        ev[_first(ev, kind="node", order=1)]["status"] = "skipped"

    def wrong_solution(ev):
        sol = dict(ev[-1]["solution"])
        sol.pop(next(iter(sol)))
        ev[-1]["solution"] = sol

    return [drop_end, duplicate_order, loosen_child_bound, prune_too_early,
            wrong_node_count, dual_bound_up_again, unknown_status, wrong_solution]


@pytest.mark.parametrize("corrupt", _corruptions(), ids=lambda f: f.__name__)
def test_checker_rejects_a_corrupted_stream(corrupt) -> None:
    problem, settings, events, optimum = _good_stream()
    check_search(problem, events, settings, optimum=optimum)  # the real stream passes
    bad = copy.deepcopy(events)
    corrupt(bad)
    with pytest.raises(AssertionError):
        check_search(problem, bad, settings, optimum=optimum)
