"""Findings about the model itself: loose big-M rows, bad scaling, a non-convex
objective. They need the `Problem`; the scaling and convexity figures come from
`undergrowth.model.checks`, so the two never disagree.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import reduce

import numpy as np
import scipy.sparse as sp

from ..model import Problem
from ..model.checks import (
    coefficient_ranges,
    objective_convexity,
    short_number,
)
from .findings import MAX_REFS, Finding

__all__ = ["BIG_M_RATIO", "LooseLink", "ParityRow", "bad_scaling", "loose_big_m",
           "loose_links", "model_findings", "nonconvex_objective", "parity_rows"]

# A binary's coefficient is reported when it is at least this many times the tightest
# valid value: at 2x the relaxation can switch the activity fully on with the binary
# at one half or less, which is where the root bound visibly suffers. Smaller excesses
# are round-off or harmless habit.
BIG_M_RATIO = 2.0
# Coefficients this small are treated as zero (no switch to tighten).
BIG_M_FLOOR = 1e-9
# Scaling worse than this (on top of checks.BAD_SCALING_RATIO) is severe: with the
# usual 1e-9 tolerances there is no digit left to tell a violation from round-off.
BAD_SCALING_HIGH = 1e9
# How many rows a finding's per-item table lists.
DETAILS_SHOWN = 50


def model_findings(problem: Problem) -> list[Finding]:
    out = [f for f in (nonconvex_objective(problem), loose_big_m(problem),
                       bad_scaling(problem)) if f is not None]
    return out


# ------------------------------------------------------------------ big-M rows
@dataclass(frozen=True)
class LooseLink:
    """One binary's coefficient in one row, with the tightest valid value.

    Values are as the row is written (``side`` "<=" uses the upper bound, ">=" the
    lower one). ``complemented``: the binary appears with the sign of ``M·(1 − y)``,
    so tightening also moves the right-hand side to ``new_rhs``."""

    row: int
    row_name: str
    column: int
    column_name: str
    side: str
    coefficient: float
    tightest: float  # the smallest valid |coefficient|, max{0, U − b}
    new_coefficient: float
    rhs: float
    new_rhs: float
    max_activity: float  # U: the other terms' largest value (in "<=" form)
    complemented: bool

    @property
    def ratio(self) -> float:
        return math.inf if self.tightest == 0 else abs(self.coefficient) / self.tightest


def loose_links(problem: Problem, *, ratio: float = BIG_M_RATIO) -> list[LooseLink]:
    """Binary coefficients in inequality rows that exceed the tightest valid value by
    at least ``ratio``.

    The rule (Savelsbergh, "Preprocessing and probing techniques for mixed integer
    programming problems", ORSA Journal on Computing 6(4), 1994): for a row a·x ≤ b and
    a binary y with a_y < 0, let U = Σ_{a>0} a·u + Σ_{a<0} a·l be the maximal activity
    of the other terms. With y = 1 the row allows a·x ≤ b + |a_y|, which is no limit
    once |a_y| ≥ U − b, so |a_y| need not exceed max{0, U − b}. A ≥ row is read
    negated. The same value bounds a binary written as M·(1 − y) (a_y > 0: substitute
    y = 1 − ȳ), where the right-hand side moves with it; those are only reported in rows
    with a continuous or general-integer term, so knapsack rows are left alone. Rows
    whose U is infinite, and equality rows, have no such bound."""
    A = sp.csr_matrix(problem.A)
    m = problem.num_rows
    if m == 0 or A.nnz == 0:
        return []
    row = np.repeat(np.arange(m), np.diff(A.indptr))
    col = A.indices
    lo, up = problem.col_lower[col], problem.col_upper[col]
    binary = problem.integrality[col] & (lo == 0) & (up == 1)
    sizes = np.diff(A.indptr)
    nonbinary_rows = np.bincount(row, weights=(~binary).astype(float), minlength=m) > 0
    inequality = problem.row_lower != problem.row_upper
    out: list[LooseLink] = []
    for side, orient, rhs_all in (("<=", 1.0, problem.row_upper),
                                  (">=", -1.0, -problem.row_lower)):
        a = orient * A.data  # the row in "<=" form: a·x <= b
        b = rhs_all
        use = np.isfinite(b) & inequality
        big = np.where(a > 0, up, lo)
        infinite = ~np.isfinite(big)
        contrib = np.where(infinite, 0.0, a * np.where(infinite, 0.0, big))
        U = np.bincount(row, weights=contrib, minlength=m)
        unbounded = np.bincount(row, weights=infinite.astype(float), minlength=m) > 0
        with np.errstate(invalid="ignore"):
            tight = np.maximum(0.0, U - b)
        ok = use[row] & ~unbounded[row] & binary & (np.abs(a) > BIG_M_FLOOR)
        # a switch (a_y < 0) needs something to switch: another term in the row
        switch = ok & (a < 0) & (sizes[row] > 1)
        complement = ok & (a > 0) & nonbinary_rows[row]
        t = tight[row]
        loose = (switch | complement) & (np.abs(a) >= ratio * t) & (np.abs(a) - t > 1e-9)
        for k in np.flatnonzero(loose):
            i, j, ak, tk = int(row[k]), int(col[k]), float(a[k]), float(t[k])
            new_a = math.copysign(tk, ak)
            new_b = float(b[i]) - ak + new_a if ak > 0 else float(b[i])
            out.append(LooseLink(
                row=i, row_name=problem.row_names[i], column=j,
                column_name=problem.col_names[j], side=side, coefficient=orient * ak,
                tightest=tk, new_coefficient=orient * new_a, rhs=orient * float(b[i]),
                new_rhs=orient * new_b, max_activity=float(U[i]), complemented=ak > 0))
    out.sort(key=lambda link: (-link.ratio, link.row, link.column))
    return out


def loose_big_m(problem: Problem) -> Finding | None:
    links = loose_links(problem)
    if not links:
        return None
    rows = sorted({link.row for link in links})
    ratios = np.array([link.ratio for link in links])
    worst = links[0]
    finite = ratios[np.isfinite(ratios)]
    return Finding(
        code="loose-big-m", severity="medium",
        title=f"{_count(len(rows), 'row')} {'switches' if len(rows) == 1 else 'switch'} an "
              f"activity with a coefficient up to {_times(worst.ratio)} larger than needed",
        evidence={"rows": len(rows), "links": len(links), "largest_ratio": worst.ratio,
                  "median_ratio": float(np.median(finite)) if finite.size else None,
                  "example_row": worst.row_name, "example_coefficient": worst.coefficient,
                  "example_tightest": worst.tightest},
        explanation=(
            "In these rows a binary switches other terms on and off with a coefficient "
            "(a big-M) larger than the other terms can ever need, judged from their "
            "bounds, so the relaxation can switch the activity fully on with the binary at "
            f"a fraction. In {worst.row_name} the coefficient is {_num(worst.coefficient)} "
            f"where {_num(worst.tightest)} is enough (the other terms reach at most "
            f"{_num(worst.tightest)} above the right-hand side): with everything switched on "
            f"the binary needs to be only {_num(worst.tightest / abs(worst.coefficient))} "
            "instead of 1. That weakens the root bound and every node's bound."),
        advice=(
            "Replace each coefficient by the tightest valid value listed (details: "
            "new_coefficient, and new_rhs where the binary appears as M·(1 − y)); it "
            "leaves the integer solutions unchanged. Better still, tighten the bounds of "
            "the switched variables, or disaggregate the row into one link per variable "
            "(x ≤ u·y), which is usually tighter than any single aggregated row."),
        refs={"rows": [problem.row_names[i] for i in rows],
              "variables": sorted({link.column_name for link in links})},
        details=[{"row": link.row_name, "variable": link.column_name, "side": link.side,
                  "coefficient": link.coefficient, "tightest": link.tightest,
                  "new_coefficient": link.new_coefficient, "rhs": link.rhs,
                  "new_rhs": link.new_rhs, "max_activity": link.max_activity,
                  "ratio": link.ratio} for link in links[:DETAILS_SHOWN]],
    )


# ------------------------------------------------------------------ scaling
def bad_scaling(problem: Problem) -> Finding | None:
    """Rows, columns, objective or bounds whose magnitudes span more than
    checks.BAD_SCALING_RATIO (the figures are checks.coefficient_ranges')."""
    r = coefficient_ranges(problem)
    objective = r.objective.ratio or 0.0
    bounds = r.bounds.ratio or 0.0
    if not (r.bad_rows or r.bad_columns or objective > r.threshold or bounds > r.threshold):
        return None
    worst_row = max(r.bad_rows, key=lambda i: r.row_ratio[i]) if r.bad_rows else None
    ratios = [float(r.row_ratio[i]) for i in r.bad_rows] + [
        float(r.col_ratio[j]) for j in r.bad_columns] + [objective, bounds]
    worst = max(ratios)
    parts = []
    if r.bad_rows:
        parts.append(_count(len(r.bad_rows), "row"))
    if r.bad_columns:
        parts.append(_count(len(r.bad_columns), "column"))
    if objective > r.threshold:
        parts.append("the objective")
    if bounds > r.threshold:
        parts.append("the column bounds")
    rows_sorted = sorted(r.bad_rows, key=lambda i: -r.row_ratio[i])
    return Finding(
        code="bad-scaling", severity="high" if worst >= BAD_SCALING_HIGH else "medium",
        title=f"Wide coefficient ranges in {' and '.join(parts)} (up to {short_number(worst)})",
        evidence={"bad_rows": len(r.bad_rows), "bad_columns": len(r.bad_columns),
                  "worst_ratio": worst,
                  "worst_row": problem.row_names[worst_row] if worst_row is not None else None,
                  "matrix_ratio": r.matrix.ratio, "objective_ratio": r.objective.ratio,
                  "bounds_ratio": r.bounds.ratio, "threshold": r.threshold},
        explanation=(
            f"Largest and smallest magnitudes differ by more than {short_number(r.threshold)}"
            " here. LP solvers judge feasibility and optimality with absolute tolerances "
            "(typically 1e-6 to 1e-9); across such a range those tolerances swallow real "
            "digits, so relaxations may be declared infeasible or optimal wrongly, bounds "
            "wobble, and nodes can fail."),
        advice=(
            "Change units so that the numbers in each row and column sit within a few "
            "orders of magnitude (for example thousands of euros instead of cents); "
            "replace huge big-M coefficients by tight ones; drop coefficients that are "
            "round-off noise."),
        refs={"rows": [problem.row_names[i] for i in rows_sorted],
              "variables": [problem.col_names[j] for j in r.bad_columns]},
        details=[{"row": problem.row_names[i], "min": float(r.row_min[i]),
                  "max": float(r.row_max[i]), "ratio": float(r.row_ratio[i])}
                 for i in rows_sorted[:DETAILS_SHOWN]],
    )


# ------------------------------------------------------------------ convexity
def nonconvex_objective(problem: Problem) -> Finding | None:
    """A quadratic objective with the wrong curvature (checks.objective_convexity)."""
    conv = objective_convexity(problem)
    if conv.convex:
        return None
    Q = sp.csr_matrix(problem.Q)
    used = np.flatnonzero(np.diff(Q.indptr) > 0)
    lo, up = problem.col_lower[used], problem.col_upper[used]
    binary_only = bool(np.all(problem.integrality[used] & (lo == 0) & (up == 1)))
    want = "positive" if problem.sense == "min" else "negative"
    shift = -float(conv.smallest_eigenvalue or 0.0)
    advice = ("Reformulate so the objective is convex for a "
              f"{'minimisation' if problem.sense == 'min' else 'maximisation'}: check "
              "the sign of the quadratic terms (a maximisation needs Q negative "
              "semidefinite), or move the non-convex part into constraints with a "
              "linearisation.")
    if binary_only:
        advice += (
            " Every quadratic column here is binary, where x² = x: adding "
            f"λ·(x_j² − x_j) with λ ≥ {short_number(shift / 2)} for each of them "
            f"({'added to' if problem.sense == 'min' else 'subtracted from'} the "
            "objective) leaves every integer point's value unchanged and makes the "
            "objective convex.")
    return Finding(
        code="nonconvex-objective", severity="high",
        title="The quadratic objective is not convex: its relaxations give no valid bound",
        evidence={"smallest_eigenvalue": conv.smallest_eigenvalue,
                  "tolerance": conv.tolerance, "quadratic_columns": conv.size,
                  "method": conv.method, "binary_only": binary_only},
        explanation=(
            f"Branch-and-bound needs Q {want} semidefinite for a {problem.sense}imisation: "
            "only then is the relaxation's optimum a bound on every integer point below "
            "the node. Here the smallest eigenvalue of the "
            f"{'Hessian' if problem.sense == 'min' else 'negated Hessian'} is "
            f"{short_number(conv.smallest_eigenvalue)}, so a relaxation may report a "
            "value worse than an integer point it contains, and pruning by bound could "
            "discard the optimum. Undergrowth refuses to search such a model."
            + (" (The eigenvalue is only a lower estimate: the iterative solve did not "
               "converge.)" if conv.method == "gershgorin" else "")),
        advice=advice,
        refs={"variables": [problem.col_names[j] for j in used[:MAX_REFS]]},
    )


# ------------------------------------------------------------------ parity rows
@dataclass(frozen=True)
class ParityRow:
    """An equality row over integer columns with integral coefficients whose greatest
    common divisor does not divide the right-hand side: no integer point satisfies it."""

    row: int
    row_name: str
    divisor: int
    rhs: float


def parity_rows(problem: Problem) -> list[ParityRow]:
    """Equality rows with no integer solution by divisibility (common practice in
    presolve: a·x = b with integer a and x needs gcd(a) to divide b)."""
    A = sp.csr_matrix(problem.A)
    out = []
    sizes = np.diff(A.indptr)
    smallest = np.full(problem.num_rows, 0.0)
    filled = np.flatnonzero(sizes)
    if filled.size:
        smallest[filled] = np.minimum.reduceat(np.abs(A.data), A.indptr[filled])
    # a divisor above 1 needs every |coefficient| to be at least 2
    equal = np.flatnonzero((problem.row_lower == problem.row_upper)
                           & np.isfinite(problem.row_upper) & (smallest >= 2))
    for i in equal:
        start, stop = A.indptr[i], A.indptr[i + 1]
        vals = A.data[start:stop]
        if not problem.integrality[A.indices[start:stop]].all():
            continue
        if np.any(np.abs(vals - np.round(vals)) > 1e-9) or np.abs(vals).max() > 2**52:
            continue
        g = reduce(math.gcd, (int(abs(v)) for v in np.round(vals)))
        b = float(problem.row_upper[i])
        if g > 1 and abs(b / g - round(b / g)) > 1e-9:
            out.append(ParityRow(int(i), problem.row_names[i], g, b))
    return out


# ------------------------------------------------------------------ wording
def _count(n: int, noun: str) -> str:
    return f"{n} {noun}" if n == 1 else f"{n} {noun}s"


def _num(x: float) -> str:
    return f"{x:.6g}"


def _times(ratio: float) -> str:
    return "infinitely" if math.isinf(ratio) else f"{short_number(ratio)}×"
