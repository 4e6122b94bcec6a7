"""The engine's optimum against outside answers, for every branching rule and node order.

Linear models: reference is scipy.optimize.milp (HiGHS MIP). Convex quadratic
integer models: reference is exhaustive enumeration of the integer box.
Every search is also run through the event-stream invariants.
"""

from __future__ import annotations

import functools
import itertools

import numpy as np
import pytest
from scipy.optimize import Bounds, LinearConstraint, linprog, milp

import families
from invariants import check_search
from undergrowth.model import Problem
from undergrowth.search import (
    BRANCHING_RULES,
    NODE_ORDERS,
    NonConvexObjectiveError,
    Search,
    SearchSettings,
)

SEEDS = range(5)
MODELS = {f"{family}-{seed}": (family, seed)
          for family in families.FAMILIES for seed in SEEDS}  # 6 families x 5 seeds = 30


def exact(branching: str, select: str, **extra: object) -> SearchSettings:
    """Settings that only stop on an exhausted tree."""
    return SearchSettings(branching=branching, select=select, gap=0.0, absolute_gap=0.0, **extra)


def run(problem: Problem, settings: SearchSettings, **kwargs: object):
    search = Search(problem, settings, **kwargs)
    events = list(search.events())
    assert search.result is not None
    return search.result, events


def milp_reference(problem: Problem):
    """scipy.optimize.milp on the same data, objective in the model's own sense."""
    sign = 1.0 if problem.sense == "min" else -1.0
    constraints = ([LinearConstraint(problem.A, problem.row_lower, problem.row_upper)]
                   if problem.num_rows else [])
    res = milp(sign * problem.c, constraints=constraints,
               integrality=problem.integrality.astype(int),
               bounds=Bounds(problem.col_lower, problem.col_upper))
    value = None if res.fun is None else sign * res.fun + problem.offset
    return res, value


_optima: dict[str, tuple[Problem, float]] = {}


def model_and_optimum(key: str) -> tuple[Problem, float]:
    if key not in _optima:
        family, seed = MODELS[key]
        problem = families.FAMILIES[family](seed)
        res, value = milp_reference(problem)
        assert res.status == 0, f"{problem.name}: milp says {res.message}"
        _optima[key] = (problem, value)
    return _optima[key]


@pytest.mark.parametrize("select", NODE_ORDERS)
@pytest.mark.parametrize("branching", BRANCHING_RULES)
@pytest.mark.parametrize("key", list(MODELS))
def test_optimum_matches_milp(key: str, branching: str, select: str) -> None:
    problem, optimum = model_and_optimum(key)  # reference: scipy.optimize.milp (HiGHS MIP)
    # a progress snapshot after every node, so the dual-bound invariants see each step
    settings = exact(branching, select, progress_every=1)
    result, events = run(problem, settings)
    assert result.status == "optimal", f"{problem.name}: {result.status} ({result.message})"
    assert result.complete
    assert result.objective == pytest.approx(optimum, rel=1e-6, abs=1e-9)
    assert result.dual_bound == pytest.approx(optimum, rel=1e-6, abs=1e-9)
    check_search(problem, events, settings, optimum=optimum)


def test_families_give_real_trees() -> None:
    """Most models need branching: the root relaxation is fractional."""
    branched = 0
    for key in MODELS:
        problem, _ = model_and_optimum(key)
        _, events = run(problem, exact("most-fractional", "best-bound"))
        branched += events[0]["status"] == "branched"
    assert branched >= 0.8 * len(MODELS)


def test_families_are_reproducible() -> None:
    for make in families.FAMILIES.values():
        a, b, other = make(3), make(3), make(4)
        assert a.name == b.name and "-s3" in a.name and a.name != other.name
        assert np.array_equal(a.c, b.c) and (a.A != b.A).nnz == 0
        assert np.array_equal(a.row_lower, b.row_lower)
        assert np.array_equal(a.row_upper, b.row_upper)
        assert not (np.array_equal(a.c, other.c) and (a.A != other.A).nnz == 0)
        assert 8 <= a.num_cols <= 20


# ---------------------------------------------------------------- every node's relaxation
def node_box(problem: Problem, checked, node: dict) -> tuple[np.ndarray, np.ndarray]:
    """Column bounds at ``node``: the root's, tightened by each branch on its path."""
    lower, upper = problem.col_lower.copy(), problem.col_upper.copy()
    while node["branch"] is not None:
        b = node["branch"]
        if b["dir"] == "down":
            upper[b["var"]] = min(upper[b["var"]], b["value"])
        else:
            lower[b["var"]] = max(lower[b["var"]], b["value"])
        node = checked.nodes[node["parent"]]
    return lower, upper


@pytest.mark.parametrize(("branching", "select"), [
    ("most-fractional", "depth-first"), ("most-fractional", "best-bound"), ("strong", "hybrid"),
    ("reliability", "breadth-first"), ("pseudocost", "best-estimate")])
@pytest.mark.parametrize("key", ["knapsack-1", "multi_knapsack-2", "facility_location-1",
                                 "integer_cover-3", "assignment-3", "set_cover-0"])
def test_each_node_relaxation_matches_an_independent_lp(key: str, branching: str,
                                                        select: str) -> None:
    """The warm-started relaxation at every node equals a cold LP solve over that
    node's box (reference: scipy.optimize.linprog, HiGHS), so bound bookkeeping
    between jumps in the tree loses or keeps no branching decision by mistake."""
    problem, optimum = model_and_optimum(key)
    settings = exact(branching, select)
    _, events = run(problem, settings)
    checked = check_search(problem, events, settings, optimum=optimum)
    sign = 1.0 if problem.sense == "min" else -1.0
    for node in checked.processed:
        lower, upper = node_box(problem, checked, node)
        ref = linprog(sign * problem.c, bounds=list(zip(lower, upper, strict=True)),
                      method="highs", **_rows(problem))
        where = f"{problem.name} node {node['id']} (order {node['order']})"
        if node["lp"]["status"] == "infeasible":
            assert ref.status == 2, f"{where}: reported infeasible, linprog says {ref.message}"
            continue
        assert ref.status == 0, f"{where}: linprog says {ref.message}"
        value = sign * ref.fun
        got = node["lp"]["objective"]
        tol = 1e-7 * max(1.0, abs(value))
        if node["lp"]["iterations"] == 0 and node["message"]:
            # closed by a look-ahead that may stop early at the cutoff: a valid bound
            assert sign * got <= sign * value + tol, f"{where}: {got} passes the LP {value}"
        else:
            assert got == pytest.approx(value, abs=tol), f"{where}: {got}, linprog {value}"


def _rows(problem: Problem) -> dict:
    """The rows l <= A x <= u as linprog's A_ub x <= b_ub and A_eq x = b_eq."""
    A = problem.A.toarray()
    lo, up = problem.row_lower, problem.row_upper
    eq = lo == up
    ub_rows = [A[~eq & np.isfinite(up)], -A[~eq & np.isfinite(lo)]]
    ub_rhs = [up[~eq & np.isfinite(up)], -lo[~eq & np.isfinite(lo)]]
    out: dict = {"A_ub": np.vstack(ub_rows), "b_ub": np.concatenate(ub_rhs)}
    if eq.any():
        out["A_eq"], out["b_eq"] = A[eq], up[eq]
    return out


# ---------------------------------------------------------------- no answer
@pytest.mark.parametrize("select", NODE_ORDERS)
@pytest.mark.parametrize("branching", BRANCHING_RULES)
def test_infeasible_model(branching: str, select: str) -> None:
    problem = families.infeasible_model()
    res, _ = milp_reference(problem)
    assert res.status == 2  # reference: scipy.optimize.milp (HiGHS MIP) says infeasible
    settings = exact(branching, select)
    result, events = run(problem, settings)
    assert result.status == "infeasible"
    assert result.objective is None and result.x is None and result.complete
    checked = check_search(problem, events, settings)
    assert checked.with_status("infeasible"), "the tree ends in infeasible leaves"
    assert len(checked.processed) > 1, "the root relaxation alone is feasible"


@pytest.mark.parametrize("branching", BRANCHING_RULES)
def test_unbounded_model(branching: str) -> None:
    problem = families.unbounded_model()
    res, _ = milp_reference(problem)
    # reference: scipy.optimize.milp (HiGHS MIP) only says "unbounded or infeasible"
    # (status 4); boxing the columns shows the model is feasible and its optimum
    # grows with the box, so it is unbounded.
    assert res.status == 4, res.message
    for box in (10.0, 100.0):
        boxed = Problem.from_arrays(problem.c, problem.A.toarray(),
                                    row_upper=problem.row_upper, col_upper=[box, box],
                                    integrality=problem.integrality, sense=problem.sense)
        _, value = milp_reference(boxed)
        assert value == pytest.approx(2 * box)
    settings = exact(branching, "best-bound")
    result, events = run(problem, settings)
    assert result.status == "unbounded"
    assert not result.complete and result.dual_bound is None
    assert "unbounded" in (result.message or "")
    checked = check_search(problem, events, settings)
    assert len(checked.processed) == 1 and checked.end["status"] == "unbounded"


# ---------------------------------------------------------------- quadratic
def enumerate_miqp(problem: Problem) -> float:
    """Smallest objective over every integer point of the box that satisfies the rows
    (all columns integer, so this is the exact optimum)."""
    axes = [np.arange(lo, up + 1) for lo, up in zip(problem.col_lower, problem.col_upper,
                                                      strict=True)]
    X = np.array(list(itertools.product(*axes)), dtype=float)
    act = (problem.A @ X.T).T
    ok = np.all((act >= problem.row_lower - 1e-9) & (act <= problem.row_upper + 1e-9), axis=1)
    X = X[ok]
    Q = problem.Q.toarray()
    values = X @ problem.c + 0.5 * np.einsum("ij,jk,ik->i", X, Q, X) + problem.offset
    return float(values.min())


@functools.cache
def miqp_optimum(seed: int) -> float:
    return enumerate_miqp(families.small_miqp(seed))  # 5^8 points


MIQP_SETTINGS = [("most-fractional", "best-bound"), ("pseudocost", "depth-first"),
                 ("strong", "hybrid"), ("reliability", "best-estimate"),
                 ("random", "breadth-first")]


def as_maximisation(problem: Problem, offset: float) -> Problem:
    """max −(½xᵀQx + c·x) + offset: the same model seen from the other sense."""
    return Problem.from_arrays(
        -problem.c, problem.A.toarray(), row_lower=problem.row_lower,
        row_upper=problem.row_upper, col_lower=problem.col_lower, col_upper=problem.col_upper,
        integrality=problem.integrality, Q=-problem.Q.toarray(), sense="max", offset=offset,
        name=problem.name + "-max")


@pytest.mark.parametrize("sense", ["min", "max"])
@pytest.mark.parametrize(("branching", "select"), MIQP_SETTINGS)
@pytest.mark.parametrize("seed", range(5))
def test_convex_miqp_matches_enumeration(seed: int, branching: str, select: str,
                                         sense: str) -> None:
    problem = families.small_miqp(seed)
    optimum = miqp_optimum(seed)  # reference: exhaustive enumeration
    if sense == "max":
        problem, optimum = as_maximisation(problem, 2.5), 2.5 - optimum
    settings = exact(branching, select, progress_every=1)
    result, events = run(problem, settings)
    assert result.status == "optimal"
    assert result.objective == pytest.approx(optimum, rel=1e-6, abs=1e-6)
    checked = check_search(problem, events, settings, optimum=optimum)
    assert checked.nodes[0]["status"] == "branched", "the QP relaxation is fractional"


def test_miqp_root_bound_is_below_the_integer_optimum() -> None:
    # The continuous optimum is strictly better than the integer one on every seed
    # used above, so those searches prove something.
    for seed in range(5):
        problem = families.small_miqp(seed)
        _, events = run(problem, exact("most-fractional", "best-bound"))
        assert events[0]["bound"] < miqp_optimum(seed) - 1e-6


@pytest.mark.parametrize("sense", ["min", "max"])
def test_nonconvex_objective_is_refused(sense: str) -> None:
    # min with an indefinite Q, or max with a positive definite one.
    Q = np.array([[2.0, 3.0], [3.0, 1.0]]) if sense == "min" else np.array([[2.0, 0.5],
                                                                            [0.5, 1.0]])
    problem = Problem.from_arrays([1.0, -1.0], Q=Q, col_lower=[-3, -3], col_upper=[3, 3],
                                  integrality=[1, 1], sense=sense, name="bowl-or-saddle")
    smallest = float(np.linalg.eigvalsh(Q if sense == "min" else -Q).min())
    assert smallest < 0
    with pytest.raises(NonConvexObjectiveError) as info:
        Search(problem, exact("most-fractional", "best-bound"))
    assert f"{smallest:.6g}" in str(info.value)
    assert isinstance(info.value, ValueError)
