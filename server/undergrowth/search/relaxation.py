"""Warm-started continuous relaxations on one `highspy.Highs` object per search.

The model is passed once, in minimisation form. A node changes only the column
bounds that differ from what is loaded; the caller decides when to restore a
stored basis (not when diving into a child of the node just solved).
"""

from __future__ import annotations

import os
import sys
import threading
import time
from dataclasses import dataclass

import highspy
import numpy as np
import scipy.sparse as sp

from ..model import Problem

INF = highspy.kHighsInf

OPTIMAL = "optimal"
INFEASIBLE = "infeasible"
UNBOUNDED = "unbounded"
FAILED = "failed"
CUTOFF = "cutoff"  # dual simplex passed the objective bound: the node cannot beat the incumbent
ITERATION_LIMIT = "iteration-limit"  # objective is still a valid lower bound (dual simplex)

_MS = highspy.HighsModelStatus


@dataclass(slots=True)
class RelaxationResult:
    status: str  # one of the constants above
    objective: float  # minimisation form, without the offset; nan unless optimal/cutoff
    x: np.ndarray | None
    iterations: int
    seconds: float
    message: str = ""


_banner_lock = threading.Lock()
_banner_done = False


def new_highs() -> highspy.Highs:
    """A silent `Highs` object. HiGHS prints a banner on stdout when the first one
    in a process is built, which would corrupt `--json` output; hide it."""
    global _banner_done
    with _banner_lock:
        if _banner_done:
            h = highspy.Highs()
        else:
            sys.stdout.flush()
            saved = os.dup(1)
            devnull = os.open(os.devnull, os.O_WRONLY)
            try:
                os.dup2(devnull, 1)
                h = highspy.Highs()
            finally:
                os.dup2(saved, 1)
                os.close(saved)
                os.close(devnull)
            _banner_done = True
    h.setOptionValue("output_flag", False)
    return h


def _finite(a: np.ndarray) -> np.ndarray:
    """Infinite bounds as HiGHS's own infinity (the same value in current highspy)."""
    return np.clip(np.asarray(a, dtype=float), -INF, INF)


class Relaxation:
    """The continuous relaxation of a problem, re-solved under changing column bounds."""

    def __init__(self, problem: Problem, *, threads: int = 1) -> None:
        self.problem = problem
        self.sign = 1.0 if problem.sense == "min" else -1.0
        self.quadratic = problem.Q is not None
        h = new_highs()
        # One thread: highspy otherwise re-reads the CPU topology on every run()
        # (measured 100 µs -> 27 µs per tiny LP here; see benchmarks/node_throughput.py).
        h.setOptionValue("threads", threads)
        h.setOptionValue("presolve", "off")  # presolve would throw away the warm start
        self._h = h
        n, m = problem.num_cols, problem.num_rows
        lp = highspy.HighsLp()
        lp.num_col_ = n
        lp.num_row_ = m
        lp.col_cost_ = self.sign * np.asarray(problem.c, dtype=float)
        lp.col_lower_ = _finite(problem.col_lower)
        lp.col_upper_ = _finite(problem.col_upper)
        lp.row_lower_ = _finite(problem.row_lower)
        lp.row_upper_ = _finite(problem.row_upper)
        csc = sp.csc_matrix(problem.A)
        lp.a_matrix_.format_ = highspy.MatrixFormat.kColwise
        lp.a_matrix_.start_ = csc.indptr.astype(np.int32)
        lp.a_matrix_.index_ = csc.indices.astype(np.int32)
        lp.a_matrix_.value_ = csc.data.astype(float)
        if self.quadratic:
            model = highspy.HighsModel()
            model.lp_ = lp
            lower = sp.csc_matrix(sp.tril(self.sign * problem.Q))
            hess = highspy.HighsHessian()
            hess.dim_ = n
            hess.format_ = highspy.HessianFormat.kTriangular
            hess.start_ = lower.indptr.astype(np.int32)
            hess.index_ = lower.indices.astype(np.int32)
            hess.value_ = lower.data.astype(float)
            model.hessian_ = hess
            status = h.passModel(model)
        else:
            status = h.passModel(lp)
        if status == highspy.HighsStatus.kError:
            raise ValueError(f"HiGHS refused the model {problem.name!r}")
        self.root_lower = np.array(problem.col_lower, dtype=float)
        self.root_upper = np.array(problem.col_upper, dtype=float)
        # The column bounds loaded in HiGHS right now.
        # Plain lists: the engine reads and compares single entries, which lists do
        # several times faster than numpy's scalar indexing.
        self.lower: list[float] = self.root_lower.tolist()
        self.upper: list[float] = self.root_upper.tolist()
        self.solves = 0

    # ----------------------------------------------------------- bounds
    def change_bounds(self, changes: dict[int, tuple[float, float]]) -> None:
        """Load new bounds for the columns in ``changes``, skipping those already loaded."""
        lower, upper = self.lower, self.upper
        idx: list[int] = []
        los: list[float] = []
        ups: list[float] = []
        for j, (lo, up) in changes.items():
            if lower[j] != lo or upper[j] != up:
                idx.append(j)
                los.append(lo)
                ups.append(up)
                lower[j] = lo
                upper[j] = up
        if not idx:
            return
        if len(idx) == 1:
            self._h.changeColBounds(idx[0], los[0], ups[0])
            return
        self._h.changeColsBounds(len(idx), np.array(idx, dtype=np.int32),
                                 np.array(los, dtype=float), np.array(ups, dtype=float))

    def set_one_bound(self, j: int, lower: float, upper: float) -> None:
        """Temporarily change one column's bounds (strong branching); not tracked."""
        self._h.changeColBounds(j, float(lower), float(upper))

    def restore_one_bound(self, j: int) -> None:
        self._h.changeColBounds(j, float(self.lower[j]), float(self.upper[j]))

    # ------------------------------------------------------------ basis
    def basis(self) -> highspy.HighsBasis | None:
        if self.quadratic:
            return None  # the QP solver does not take a simplex basis
        return self._h.getBasis()

    def set_basis(self, basis: highspy.HighsBasis | None) -> None:
        if basis is not None and not self.quadratic:
            self._h.setBasis(basis)

    # ------------------------------------------------------------ solve
    def set_iteration_limit(self, limit: int | None) -> None:
        self._h.setOptionValue("simplex_iteration_limit", 2**31 - 1 if limit is None else limit)

    def set_cutoff(self, cutoff: float | None) -> None:
        """Let dual simplex stop once the objective passes ``cutoff`` (minimisation form)."""
        if not self.quadratic:
            self._h.setOptionValue("objective_bound", INF if cutoff is None else float(cutoff))

    def solve(self, *, want_x: bool = True) -> RelaxationResult:
        h = self._h
        t0 = time.perf_counter()
        h.run()
        seconds = time.perf_counter() - t0
        self.solves += 1
        # getInfoValue/getObjectiveValue: the full getInfo() copy costs ~15 µs a node.
        iters = h.getInfoValue("qp_iteration_count" if self.quadratic
                               else "simplex_iteration_count")[1]
        iters = max(int(iters), 0)
        ms = h.getModelStatus()
        if ms == _MS.kOptimal:
            x = np.asarray(h.getSolution().col_value, dtype=float) if want_x else None
            return RelaxationResult(OPTIMAL, h.getObjectiveValue(), x, iters, seconds)
        if ms == _MS.kInfeasible:
            return RelaxationResult(INFEASIBLE, float("nan"), None, iters, seconds)
        if ms == _MS.kObjectiveBound:
            return RelaxationResult(CUTOFF, h.getObjectiveValue(), None, iters,
                                    seconds)
        if ms == _MS.kIterationLimit and not self.quadratic:
            return RelaxationResult(ITERATION_LIMIT, h.getObjectiveValue(), None,
                                    iters, seconds, "simplex iteration limit reached")
        if ms in (_MS.kUnbounded, _MS.kUnboundedOrInfeasible):
            return RelaxationResult(UNBOUNDED, float("-inf"), None, iters, seconds,
                                    h.modelStatusToString(ms))
        return RelaxationResult(FAILED, float("nan"), None, iters, seconds,
                                f"HiGHS stopped with status '{h.modelStatusToString(ms)}'")
