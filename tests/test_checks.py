"""Formulation checks, against values worked out by hand."""

import math

import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg

from undergrowth.model import Problem
from undergrowth.model.checks import (
    BAD_SCALING_RATIO,
    ValueRange,
    check_model,
    coefficient_ranges,
    empty_rows_and_columns,
    integer_bound_issues,
    objective_convexity,
    short_number,
)

inf = math.inf


def codes(problem: Problem) -> list[str]:
    return [w.code for w in check_model(problem)]


def clean(**kw: object) -> Problem:
    """Two bounded columns in one well-scaled row: nothing to report."""
    args: dict[str, object] = {"c": [1, 2], "A": [[1, 3]], "row_upper": [4],
                               "col_upper": [5, 5]}
    args.update(kw)
    return Problem.from_arrays(**args)


def test_clean_model_has_no_warnings():
    assert check_model(clean()) == []


# --------------------------------------------------------------- convexity
def test_indefinite_q_in_a_min_model():
    # det(Q − λI) = (1 − λ)² − 4 = 0  ->  λ = 1 ± 2 = 3, −1 (by hand)
    p = clean(Q=[[1, 2], [2, 1]])
    conv = objective_convexity(p)
    assert conv.quadratic and not conv.convex
    assert conv.smallest_eigenvalue == pytest.approx(-1.0)
    assert conv.tolerance == pytest.approx(-2e-9)  # −1e-9 · max|Q| = −1e-9 · 2
    assert (conv.size, conv.method) == (2, "dense")
    assert codes(p) == ["nonconvex-objective"]
    assert "positive semidefinite" in check_model(p)[0].message


def test_psd_q_in_a_min_model_is_convex():
    # [[2, 1], [1, 2]]: λ = 2 ± 1 = 1, 3 (by hand)
    conv = objective_convexity(clean(Q=[[2, 1], [1, 2]]))
    assert conv.convex and conv.smallest_eigenvalue == pytest.approx(1.0)


def test_singular_psd_q_is_convex_despite_round_off():
    # [[1, 1], [1, 1]]: λ = 0, 2 (by hand); 0 may come out as −1e-17
    conv = objective_convexity(clean(Q=[[1, 1], [1, 1]]))
    assert conv.convex and abs(conv.smallest_eigenvalue) < 1e-12


def test_nsd_q_in_a_max_model_is_convex_and_psd_is_not():
    # −Q = [[2, −1], [−1, 2]]: λ = 2 ± 1 = 1, 3 (by hand)
    conv = objective_convexity(clean(Q=[[-2, 1], [1, -2]], sense="max"))
    assert conv.convex and conv.smallest_eigenvalue == pytest.approx(1.0)
    # the same Q sign-flipped is wrong for max: −Q = [[−2, −1], [−1, −2]], λ = −3, −1
    p = clean(Q=[[2, 1], [1, 2]], sense="max")
    conv = objective_convexity(p)
    assert not conv.convex and conv.smallest_eigenvalue == pytest.approx(-3.0)
    assert "negative semidefinite" in check_model(p)[0].message


def test_only_columns_in_q_count():
    # Q = diag(2, 0, 0): over all columns the smallest eigenvalue is 0, over the one
    # column in Q it is 2 (by hand)
    p = Problem.from_arrays([1, 1, 1], Q=sp.diags([2.0, 0, 0]))
    conv = objective_convexity(p)
    assert conv.size == 1 and conv.smallest_eigenvalue == pytest.approx(2.0)


def test_linear_model_is_convex_with_nothing_computed():
    conv = objective_convexity(clean())
    assert (conv.quadratic, conv.convex, conv.smallest_eigenvalue, conv.method) == \
        (False, True, None, "none")


def tridiagonal(n: int, diag: float) -> sp.csr_matrix:
    return sp.diags([-np.ones(n - 1), np.full(n, diag), -np.ones(n - 1)], [-1, 0, 1],
                    format="csr")


def test_iterative_path_matches_the_closed_form():
    # tridiag(−1, d, −1) of size n has eigenvalues d − 2cos(kπ/(n + 1)), k = 1..n
    # (a standard closed form); with d = 1, n = 50 the smallest is 1 − 2cos(π/51) < 0
    n = 50
    p = Problem.from_arrays(np.zeros(n), Q=tridiagonal(n, 1.0))
    conv = objective_convexity(p, dense_limit=10)
    assert conv.method == "iterative" and not conv.convex
    assert conv.smallest_eigenvalue == pytest.approx(1 - 2 * math.cos(math.pi / 51), abs=1e-7)
    assert objective_convexity(p).smallest_eigenvalue == pytest.approx(
        conv.smallest_eigenvalue, abs=1e-7)


def test_gershgorin_fallback_when_the_iteration_fails(monkeypatch):
    def no_luck(*args, **kwargs):
        raise scipy.sparse.linalg.ArpackNoConvergence("no convergence", [], [])

    monkeypatch.setattr(scipy.sparse.linalg, "eigsh", no_luck)
    # tridiag(−1, 2, −1): discs are 2 − 1 = 1 (end rows) and 2 − 2 = 0 (inner rows),
    # so the bound is 0 (by hand): still convex
    p = Problem.from_arrays(np.zeros(30), Q=tridiagonal(30, 2.0))
    conv = objective_convexity(p, dense_limit=10)
    assert conv.method == "gershgorin" and conv.convex and conv.smallest_eigenvalue == 0.0


# ------------------------------------------------------------------ ranges
def test_badly_scaled_row_and_global_ranges():
    # row 0: |a| from 1e-4 to 1e5, ratio 1e5 / 1e-4 = 1e9 (by hand); row 1 ratio 1;
    # column 0: 1e-4 and 1 -> 1e4; column 1: 1e5 and 1 -> 1e5; neither above 1e6
    p = Problem.from_arrays([0, -3], [[1e-4, 1e5], [1, -1]], row_lower=[-inf, 0],
                            row_upper=[7, 0], col_lower=[-inf, -2], col_upper=[inf, 0])
    r = coefficient_ranges(p)
    assert r.row_ratio[0] == pytest.approx(1e9) and r.row_ratio[1] == 1
    assert r.col_ratio.tolist() == pytest.approx([1e4, 1e5])
    assert r.bad_rows == (0,) and r.bad_columns == ()
    assert (r.matrix.min, r.matrix.max, r.matrix.count) == (1e-4, 1e5, 4)
    assert r.matrix.ratio == pytest.approx(1e9)
    # zeros and infinities are not magnitudes
    assert (r.objective.min, r.objective.max) == (3, 3)
    assert (r.bounds.min, r.bounds.max, r.bounds.count) == (2, 2, 1)
    assert (r.row_bounds.min, r.row_bounds.max) == (7, 7)
    assert r.threshold == BAD_SCALING_RATIO
    warning = check_model(p)[0]
    assert warning.code == "bad-scaling-row" and warning.rows == (0,)
    assert "r0 (1e9)" in warning.message and "above 1e6" in warning.message
    # a looser threshold lets it through
    assert coefficient_ranges(p, threshold=1e10).bad_rows == ()
    assert check_model(p, scaling_threshold=1e10) == []


def test_badly_scaled_column():
    # column 0: 1e-3 and 1e4, ratio 1e7 (by hand)
    p = Problem.from_arrays([1], [[1e-3], [1e4]], row_upper=[1, 1], col_upper=[1])
    r = coefficient_ranges(p)
    assert r.bad_columns == (0,) and r.bad_rows == ()
    assert codes(p) == ["bad-scaling-column"]


def test_empty_lines_have_nan_ranges_and_arrays_are_read_only():
    p = Problem.from_arrays([1, 1], [[0, 0], [2, 0]], row_upper=[1, 1], col_upper=[1, 1])
    r = coefficient_ranges(p)
    assert np.isnan(r.row_ratio[0]) and r.row_min[1] == r.row_max[1] == 2
    assert np.isnan(r.col_min[1])
    with pytest.raises(ValueError):
        r.row_min[0] = 1.0


def test_objective_and_bound_ranges_warn_past_the_threshold():
    # objective 1e-4 .. 1e4 -> 1e8; bounds 1 .. 1e7 -> 1e7 (by hand)
    p = Problem.from_arrays([1e-4, 1e4], [[1, 1]], row_upper=[1], col_upper=[1, 1e7])
    assert codes(p) == ["bad-scaling-objective", "bad-scaling-bounds"]


def test_value_range_of_nothing():
    r = ValueRange.of(np.array([0.0, inf, -inf]))
    assert (r.min, r.max, r.count, r.ratio) == (None, None, 0, None)


# --------------------------------------------------------- integer bounds
def test_unbounded_integers():
    p = Problem.from_arrays(
        [1, 1, 1, 1], [[1, 1, 1, 1]], row_upper=[9],
        col_lower=[-inf, 0, 0, -inf], col_upper=[3, inf, 2, inf], integrality=[1, 1, 1, 0],
    )
    issues = integer_bound_issues(p)
    assert [(u.column, u.name, u.lower, u.upper) for u in issues] == \
        [(0, "x0", -inf, 3), (1, "x1", 0, inf)]  # x3 is unbounded but continuous
    warning = check_model(p)[0]
    assert (warning.code, warning.columns) == ("unbounded-integer", (0, 1))
    assert "x0, x1" in warning.message


# ------------------------------------------------------ empty rows/columns
def test_empty_rows_satisfied_or_infeasible():
    p = Problem.from_arrays(
        [1, 1], [[0, 0], [0, 0], [1, 1], [0, 0]],
        row_lower=[-1, 1, -inf, -inf], row_upper=[2, 2, 3, -1e-12], col_upper=[1, 1],
        row_names=["spare", "impossible", "real", "nearly_zero"],
    )
    e = empty_rows_and_columns(p)
    assert [(r.name, r.satisfied) for r in e.rows] == \
        [("spare", True), ("impossible", False), ("nearly_zero", True)]
    assert e.columns == ()
    ws = check_model(p)
    assert [(w.code, w.rows) for w in ws] == [("infeasible-empty-row", (1,)),
                                               ("empty-row", (0, 3))]


@pytest.mark.parametrize(
    ("sense", "cost", "lower", "upper", "fate"),
    [
        ("min", 2.0, 0, inf, "lower"),       # cost pulls down to 0
        ("min", -1.0, 0, inf, "unbounded"),  # pulls up, no upper bound
        ("min", -1.0, 0, 4, "upper"),
        ("min", 1.0, -inf, 4, "unbounded"),
        ("max", 1.0, 0, 5, "upper"),         # max: a positive cost pulls up
        ("max", -1.0, -inf, 5, "unbounded"),
        ("max", 0.0, -inf, inf, "any"),
    ],
)
def test_empty_column_fate(sense, cost, lower, upper, fate):
    p = Problem.from_arrays([1, cost], [[1, 0]], row_upper=[1], col_lower=[0, lower],
                            col_upper=[1, upper], sense=sense)
    (col,) = empty_rows_and_columns(p).columns
    assert (col.column, col.objective, col.fate) == (1, cost, fate)
    expected = "unbounded-empty-column" if fate == "unbounded" else "empty-column"
    assert codes(p) == [expected]


def test_empty_column_in_q_is_left_to_the_quadratic_terms():
    p = Problem.from_arrays([1, -1], [[1, 0]], row_upper=[1], col_upper=[1, inf],
                            Q=sp.diags([0.0, 2.0]))
    (col,) = empty_rows_and_columns(p).columns
    assert col.fate == "quadratic"
    assert codes(p) == ["empty-column"]


def test_warnings_list_at_most_five_names():
    p = Problem.from_arrays(np.ones(8), np.zeros((1, 8)), row_upper=[1],
                            col_upper=np.ones(8))
    (empty_row, empty_cols) = check_model(p)
    assert empty_row.code == "empty-row"
    assert empty_cols.columns == tuple(range(8))
    assert empty_cols.message.endswith("and 3 more")


def test_short_number():
    assert [short_number(x) for x in (1e6, 1e9, 2.5e-7, 0.001, 24.0, -1.0, None)] == \
        ["1e6", "1e9", "2.5e-7", "0.001", "24", "-1", "none"]
