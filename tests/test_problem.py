"""Problem construction and validation."""

import numpy as np
import pytest
import scipy.sparse as sp

from undergrowth.model import Problem, ProblemError


def test_defaults_and_integer_rounding():
    p = Problem.from_arrays(
        [1, 2], [[1, 1]], row_lower=[1], col_upper=[1.5, 2.7], integrality=[1, 0]
    )
    assert p.num_rows == 1 and p.num_cols == 2
    assert p.col_lower.tolist() == [0.0, 0.0]
    # integer bound rounded inward (common practice); the continuous one is untouched
    assert p.col_upper.tolist() == [1.0, 2.7]
    assert p.col_names == ("x0", "x1") and p.row_names == ("r0",)
    assert p.num_binaries == 1


def test_near_integer_bound_is_not_rounded_away():
    p = Problem.from_arrays([1], col_upper=[2.9999999999], integrality=[1])
    assert p.col_upper[0] == 3.0


def test_arrays_are_read_only():
    p = Problem.from_arrays([1.0, 2.0])
    with pytest.raises(ValueError):
        p.c[0] = 5.0
    with pytest.raises(ValueError):
        p.A.data[:] = 1.0


@pytest.mark.parametrize(
    ("kwargs", "fragment"),
    [
        ({"c": [1, 2], "A": [[1, 2, 3]]}, "A: has 3 columns but c has 2"),
        ({"c": [1, float("nan")]}, "c[1] is nan"),
        ({"c": [1, 2], "col_lower": [0, 3], "col_upper": [1, 2]}, "column 1 (x1): col_lower 3.0"),
        ({"c": [1], "A": [[1]], "row_lower": [2], "row_upper": [1]}, "row 0 (r0): row_lower"),
        ({"c": [1], "col_lower": [0.2], "col_upper": [0.8], "integrality": [1]},
         "no integer value"),
        ({"c": [1, 2], "col_upper": [1, 2, 3]}, "col_upper: expected 2 entries, got 3"),
        ({"c": [1, 2], "Q": [[1, 1], [0, 1]]}, "Q: not symmetric at"),
        ({"c": [1], "row_lower": [np.nan]}, "row_lower: expected 0 entries"),
        ({"c": [1], "col_lower": [np.inf]}, "col_lower[0] is inf"),
        ({"c": [1], "sense": "maximize"}, "sense: expected 'min' or 'max'"),
    ],
)
def test_validation_messages_name_field_and_index(kwargs, fragment):
    with pytest.raises(ProblemError) as info:
        Problem.from_arrays(**kwargs)
    assert fragment in str(info.value)


def test_objective_value_includes_quadratic_and_offset():
    q = sp.csr_matrix(np.array([[2.0, 0.0], [0.0, 4.0]]))
    p = Problem.from_arrays([1, 1], Q=q, offset=3.0)
    # c·x + ½ xᵀQx + offset at x = (1, 2): 3 + ½(2 + 16) + 3 = 15 (by hand)
    assert p.objective_value(np.array([1.0, 2.0])) == pytest.approx(15.0)


def test_with_bounds_copies_and_validates():
    p = Problem.from_arrays([1.0, 1.0], [[1.0, 1.0]], row_upper=[3.0], integrality=[1, 1])
    q = p.with_bounds(np.array([1.0, 0.0]), np.array([2.5, 1.0]))
    assert q.col_upper.tolist() == [2.0, 1.0]  # integer bound rounded inward (common practice)
    assert p.col_upper.tolist() == [np.inf, np.inf]
