"""Formulation checks: things about a model that make a branch-and-bound search slow or
its bounds untrustworthy, found before any solve. Plain functions returning frozen
dataclasses; `check_model` turns them into `ModelWarning`s. Nothing here prints.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sized
from dataclasses import dataclass
from typing import Literal

import numpy as np
import scipy.linalg
import scipy.sparse as sp
import scipy.sparse.linalg

from .problem import Problem

# A row or column whose largest |coefficient| is more than this many times its smallest
# is reported as badly scaled: past about 1e6 the ratio eats the digits that LP
# feasibility and optimality tolerances (commonly 1e-6 to 1e-9) rely on.
BAD_SCALING_RATIO = 1e6

# Hessians with at most this many (involved) columns get a dense eigenvalue solve;
# larger ones an iterative one for the smallest eigenvalue only.
DENSE_EIGEN_LIMIT = 2000

# Eigenvalues down to -CONVEXITY_TOLERANCE·max|Q| still count as >= 0 (round-off).
CONVEXITY_TOLERANCE = 1e-9

# An empty row is satisfied when 0 lies within its bounds up to this much.
EMPTY_ROW_TOLERANCE = 1e-9

# How many names a warning message lists before "and N more".
_NAMES_SHOWN = 5


# ------------------------------------------------------------------ ranges
@dataclass(frozen=True)
class ValueRange:
    """Smallest and largest magnitude among the nonzero finite values of some set."""

    min: float | None  # None when the set has no nonzero finite value
    max: float | None
    count: int

    @property
    def ratio(self) -> float | None:
        return None if self.min is None or self.max is None else self.max / self.min

    @classmethod
    def of(cls, values: np.ndarray) -> ValueRange:
        mags = np.abs(np.asarray(values, dtype=float).ravel())
        mags = mags[np.isfinite(mags) & (mags > 0)]
        if mags.size == 0:
            return cls(None, None, 0)
        return cls(float(mags.min()), float(mags.max()), int(mags.size))


@dataclass(frozen=True, eq=False)
class CoefficientRanges:
    """Magnitude ranges of the model's data, and the rows/columns badly scaled.

    ``row_min[i]``, ``row_max[i]`` and ``row_ratio[i]`` are min |a_ij|, max |a_ij| and
    their ratio over row i's nonzeros (NaN for an empty row); likewise per column.
    """

    matrix: ValueRange
    objective: ValueRange  # linear objective c
    quadratic: ValueRange  # entries of Q
    bounds: ValueRange  # finite column bounds
    row_bounds: ValueRange  # finite row bounds (right-hand sides)
    row_min: np.ndarray
    row_max: np.ndarray
    row_ratio: np.ndarray
    col_min: np.ndarray
    col_max: np.ndarray
    col_ratio: np.ndarray
    threshold: float
    bad_rows: tuple[int, ...]
    bad_columns: tuple[int, ...]


def coefficient_ranges(problem: Problem, *, threshold: float = BAD_SCALING_RATIO
                       ) -> CoefficientRanges:
    """Per-row, per-column and global magnitude ranges; rows/columns whose ratio of
    largest to smallest |coefficient| exceeds ``threshold`` are flagged."""
    A = problem.A  # Problem has dropped explicit zeros, so every stored entry counts
    row_min, row_max = _line_ranges(sp.csr_matrix(A), problem.num_rows)
    col_min, col_max = _line_ranges(sp.csc_matrix(A), problem.num_cols)
    with np.errstate(invalid="ignore"):
        row_ratio = row_max / row_min
        col_ratio = col_max / col_min
    q_data = problem.Q.data if problem.Q is not None else np.zeros(0)
    return CoefficientRanges(
        matrix=ValueRange.of(A.data),
        objective=ValueRange.of(problem.c),
        quadratic=ValueRange.of(q_data),
        bounds=ValueRange.of(np.concatenate([problem.col_lower, problem.col_upper])),
        row_bounds=ValueRange.of(np.concatenate([problem.row_lower, problem.row_upper])),
        row_min=_readonly(row_min), row_max=_readonly(row_max),
        row_ratio=_readonly(row_ratio),
        col_min=_readonly(col_min), col_max=_readonly(col_max),
        col_ratio=_readonly(col_ratio),
        threshold=threshold,
        bad_rows=tuple(int(i) for i in np.flatnonzero(row_ratio > threshold)),
        bad_columns=tuple(int(j) for j in np.flatnonzero(col_ratio > threshold)),
    )


def _line_ranges(M: sp.csr_matrix | sp.csc_matrix, count: int
                 ) -> tuple[np.ndarray, np.ndarray]:
    """Min and max |entry| of each compressed line (row of CSR, column of CSC)."""
    lo = np.full(count, np.nan)
    hi = np.full(count, np.nan)
    mags = np.abs(M.data)
    sizes = np.diff(M.indptr)
    filled = np.flatnonzero(sizes)
    if filled.size:
        # reduceat over the starts of non-empty lines only: each segment then runs
        # exactly over one line's entries, since the empty lines between have none
        starts = M.indptr[filled]
        lo[filled] = np.minimum.reduceat(mags, starts)
        hi[filled] = np.maximum.reduceat(mags, starts)
    return lo, hi


def _readonly(a: np.ndarray) -> np.ndarray:
    a.setflags(write=False)
    return a


# -------------------------------------------------------- integer bounds
@dataclass(frozen=True)
class UnboundedInteger:
    column: int
    name: str
    lower: float
    upper: float


def integer_bound_issues(problem: Problem) -> tuple[UnboundedInteger, ...]:
    """Integer columns with an infinite bound. Branching on such a column can go on
    without end, and bound tightening has nothing to start from.

    Only infinite bounds are reported: `Problem` has already rounded fractional integer
    bounds inward and keeps no copy of the values as written.
    """
    lo, hi = problem.col_lower, problem.col_upper
    mask = problem.integrality & (np.isinf(lo) | np.isinf(hi))
    return tuple(
        UnboundedInteger(int(j), problem.col_names[j], float(lo[j]), float(hi[j]))
        for j in np.flatnonzero(mask)
    )


# ------------------------------------------------------ empty rows/columns
ColumnFate = Literal["lower", "upper", "any", "unbounded", "quadratic"]


@dataclass(frozen=True)
class EmptyRow:
    row: int
    name: str
    satisfied: bool  # 0 lies within the row's bounds; otherwise the model is infeasible


@dataclass(frozen=True)
class EmptyColumn:
    column: int
    name: str
    objective: float  # its linear objective coefficient
    fate: ColumnFate  # where an optimum puts it: at its lower or upper bound, anywhere
    #                   (zero cost), nowhere finite ("unbounded"), or decided by Q


@dataclass(frozen=True)
class EmptyLines:
    rows: tuple[EmptyRow, ...]
    columns: tuple[EmptyColumn, ...]


def empty_rows_and_columns(problem: Problem) -> EmptyLines:
    """Rows without nonzeros and columns that appear in no row.

    An empty row is either always satisfied (its bounds contain 0) or makes the model
    infeasible. A column in no row is set by the objective alone: to the bound its cost
    pushes it to, or, when that bound is infinite, the model is unbounded (if feasible).
    A column that appears in Q is left to the quadratic terms (``fate="quadratic"``).
    """
    A = sp.csr_matrix(problem.A)
    tol = EMPTY_ROW_TOLERANCE
    rows = tuple(
        EmptyRow(int(i), problem.row_names[i],
                 bool(problem.row_lower[i] <= tol and problem.row_upper[i] >= -tol))
        for i in np.flatnonzero(np.diff(A.indptr) == 0)
    )
    col_counts = np.diff(sp.csc_matrix(A).indptr)
    in_q = np.zeros(problem.num_cols, dtype=bool)
    if problem.Q is not None:
        in_q[np.diff(sp.csr_matrix(problem.Q).indptr) > 0] = True
    columns = []
    for j in np.flatnonzero(col_counts == 0):
        cost = float(problem.c[j])
        columns.append(EmptyColumn(int(j), problem.col_names[j], cost,
                                   _fate(problem, int(j), cost, bool(in_q[j]))))
    return EmptyLines(rows, tuple(columns))


def _fate(problem: Problem, j: int, cost: float, in_q: bool) -> ColumnFate:
    if in_q:
        return "quadratic"
    # in the minimisation view a positive cost pulls the column down
    pull = cost if problem.sense == "min" else -cost
    if pull == 0:
        return "any"
    if pull > 0:
        return "unbounded" if math.isinf(problem.col_lower[j]) else "lower"
    return "unbounded" if math.isinf(problem.col_upper[j]) else "upper"


# --------------------------------------------------------------- convexity
@dataclass(frozen=True)
class Convexity:
    """Whether ``½xᵀQx`` has the right curvature for the model's sense.

    ``smallest_eigenvalue`` is that of the sense-adjusted Hessian (Q for min, −Q for
    max) restricted to the ``size`` columns that appear in Q; it must be at least
    ``tolerance`` (a small negative number) for the objective to be convex in the
    minimisation view. A non-convex objective makes relaxation bounds invalid, so
    pruning by bound may cut off the optimum. ``method`` is "none" (no Q), "dense",
    "iterative", or "gershgorin" when the iterative solve did not converge and
    ``smallest_eigenvalue`` is only a lower bound (so ``convex=False`` may be a false
    alarm).
    """

    quadratic: bool
    convex: bool
    smallest_eigenvalue: float | None
    tolerance: float
    size: int
    method: Literal["none", "dense", "iterative", "gershgorin"]


def objective_convexity(problem: Problem, *, dense_limit: int = DENSE_EIGEN_LIMIT
                        ) -> Convexity:
    """Smallest eigenvalue of the sense-adjusted Hessian and the verdict."""
    if problem.Q is None:
        return Convexity(False, True, None, 0.0, 0, "none")
    H = sp.csr_matrix(problem.Q if problem.sense == "min" else -problem.Q)
    used = np.flatnonzero(np.diff(H.indptr) > 0)
    H = H[used][:, used]
    tolerance = -CONVEXITY_TOLERANCE * float(np.abs(H.data).max())
    size = int(used.size)
    if size <= dense_limit:
        smallest = float(scipy.linalg.eigvalsh(H.toarray(), subset_by_index=[0, 0])[0])
        method: Literal["dense", "iterative", "gershgorin"] = "dense"
    else:
        try:
            value = scipy.sparse.linalg.eigsh(H, k=1, which="SA", return_eigenvectors=False,
                                              maxiter=20 * size, tol=1e-10)
            smallest, method = float(value[0]), "iterative"
        except scipy.sparse.linalg.ArpackNoConvergence:
            smallest, method = _gershgorin_lower(H), "gershgorin"
    return Convexity(True, smallest >= tolerance, smallest, tolerance, size, method)


def _gershgorin_lower(H: sp.csr_matrix) -> float:
    """A lower bound on the smallest eigenvalue: min_i (h_ii − Σ_{k≠i} |h_ik|)."""
    diag = H.diagonal()
    off = np.asarray(abs(H).sum(axis=1)).ravel() - np.abs(diag)
    return float((diag - off).min())


# ----------------------------------------------------------------- warnings
@dataclass(frozen=True)
class ModelWarning:
    """One finding. ``code`` is stable (for tests and tools); ``message`` is for people."""

    code: str
    message: str
    rows: tuple[int, ...] = ()
    columns: tuple[int, ...] = ()


def check_model(problem: Problem, *, scaling_threshold: float = BAD_SCALING_RATIO
                ) -> list[ModelWarning]:
    """All formulation findings, most serious first.

    Codes: ``nonconvex-objective``, ``infeasible-empty-row``, ``unbounded-empty-column``,
    ``unbounded-integer``, ``bad-scaling-row``, ``bad-scaling-column``,
    ``bad-scaling-objective``, ``bad-scaling-bounds``, ``empty-row``, ``empty-column``.
    """
    out: list[ModelWarning] = []
    convexity = objective_convexity(problem)
    if not convexity.convex:
        shape = "positive" if problem.sense == "min" else "negative"
        out.append(ModelWarning(
            "nonconvex-objective",
            f"the quadratic objective is not convex for a {problem.sense} model (Q should "
            f"be {shape} semidefinite; smallest eigenvalue of the "
            f"{'Hessian' if problem.sense == 'min' else 'negated Hessian'} is "
            f"{short_number(convexity.smallest_eigenvalue)}); relaxation bounds are not valid",
        ))

    empty = empty_rows_and_columns(problem)
    bad = [r for r in empty.rows if not r.satisfied]
    if bad:
        out.append(ModelWarning(
            "infeasible-empty-row",
            f"{_count(bad, 'empty row')} whose bounds exclude 0, so the model is "
            f"infeasible: {_names(r.name for r in bad)}",
            rows=tuple(r.row for r in bad),
        ))
    loose = [c for c in empty.columns if c.fate == "unbounded"]
    if loose:
        out.append(ModelWarning(
            "unbounded-empty-column",
            f"{_count(loose, 'column')} in no row whose objective pushes toward an "
            f"infinite bound, so the model is unbounded if feasible: "
            f"{_names(c.name for c in loose)}",
            columns=tuple(c.column for c in loose),
        ))

    unbounded = integer_bound_issues(problem)
    if unbounded:
        out.append(ModelWarning(
            "unbounded-integer",
            f"{_count(unbounded, 'integer column')} with an infinite bound (branching "
            f"may not terminate): {_names(u.name for u in unbounded)}",
            columns=tuple(u.column for u in unbounded),
        ))

    ranges = coefficient_ranges(problem, threshold=scaling_threshold)
    limit = short_number(scaling_threshold)
    if ranges.bad_rows:
        out.append(ModelWarning(
            "bad-scaling-row",
            f"{_count(ranges.bad_rows, 'row')} with largest/smallest |coefficient| above "
            f"{limit}: " + _names(f"{problem.row_names[i]} "
                                  f"({short_number(ranges.row_ratio[i])})"
                                  for i in ranges.bad_rows),
            rows=ranges.bad_rows,
        ))
    if ranges.bad_columns:
        out.append(ModelWarning(
            "bad-scaling-column",
            f"{_count(ranges.bad_columns, 'column')} with largest/smallest |coefficient| "
            f"above {limit}: " + _names(f"{problem.col_names[j]} "
                                        f"({short_number(ranges.col_ratio[j])})"
                                        for j in ranges.bad_columns),
            columns=ranges.bad_columns,
        ))
    for code, what, rng in (("bad-scaling-objective", "objective coefficients",
                             ranges.objective),
                            ("bad-scaling-bounds", "finite column bounds", ranges.bounds)):
        if rng.ratio is not None and rng.ratio > scaling_threshold:
            out.append(ModelWarning(
                code, f"{what} range from {short_number(rng.min)} to {short_number(rng.max)} "
                f"(ratio {short_number(rng.ratio)}, above {limit})",
            ))

    fine = [r for r in empty.rows if r.satisfied]
    if fine:
        out.append(ModelWarning(
            "empty-row",
            f"{_count(fine, 'empty row')} (always satisfied; can be dropped): "
            f"{_names(r.name for r in fine)}",
            rows=tuple(r.row for r in fine),
        ))
    settled = [c for c in empty.columns if c.fate != "unbounded"]
    if settled:
        out.append(ModelWarning(
            "empty-column",
            f"{_count(settled, 'column')} in no row (set by the objective alone): "
            + _names(f"{c.name} ({_FATE_WORDS[c.fate]})" for c in settled),
            columns=tuple(c.column for c in settled),
        ))
    return out


_FATE_WORDS = {"lower": "to its lower bound", "upper": "to its upper bound",
               "any": "any value, zero cost", "quadratic": "set by the quadratic terms"}


def _count(items: Sized, noun: str) -> str:
    n = len(items)
    return f"{n} {noun}" if n == 1 else f"{n} {noun}s"


def _names(names: Iterable[str]) -> str:
    shown = []
    extra = 0
    for k, name in enumerate(names):
        if k < _NAMES_SHOWN:
            shown.append(name)
        else:
            extra += 1
    return ", ".join(shown) + (f" and {extra} more" if extra else "")


def short_number(x: float | None) -> str:
    """3 significant digits, exponents without padding: 1e6, 2.5e-7, 0.001."""
    if x is None:
        return "none"
    text = f"{x:.3g}"
    mantissa, e, exponent = text.partition("e")
    if not e:
        return text
    return f"{mantissa}e{int(exponent)}"
