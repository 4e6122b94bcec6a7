"""The `Problem`: an immutable mixed-integer program held as numpy/scipy arrays.

Objective: ``c·x + ½ xᵀQx + offset``, minimised or maximised (``sense``).
Rows: ``row_lower ≤ A x ≤ row_upper``; columns: ``col_lower ≤ x ≤ col_upper``;
``integrality[j]`` marks integer columns. Infinite bounds are ``±inf``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np
import scipy.sparse as sp

from .errors import ProblemError

Sense = Literal["min", "max"]

# Integer bounds within this distance of an integer are taken as that integer
# before rounding inward, so 2.9999999999 stays 3 rather than becoming 2.
INTEGER_BOUND_TOLERANCE = 1e-9


def _frozen(a: np.ndarray) -> np.ndarray:
    a = np.array(a, copy=True)
    a.setflags(write=False)
    return a


def _first_bad(mask: np.ndarray) -> int:
    return int(np.flatnonzero(mask)[0])


@dataclass(frozen=True, eq=False)
class Problem:
    """A validated mixed-integer program. Build it with `Problem.from_arrays`."""

    c: np.ndarray
    A: sp.csr_matrix
    row_lower: np.ndarray
    row_upper: np.ndarray
    col_lower: np.ndarray
    col_upper: np.ndarray
    integrality: np.ndarray
    sense: Sense = "min"
    offset: float = 0.0
    Q: sp.csr_matrix | None = None
    col_names: tuple[str, ...] = ()
    row_names: tuple[str, ...] = ()
    name: str = "model"
    _validated: bool = field(default=False, repr=False)

    # ------------------------------------------------------------------ build
    @classmethod
    def from_arrays(
        cls,
        c: object,
        A: object | None = None,
        *,
        row_lower: object | None = None,
        row_upper: object | None = None,
        col_lower: object | None = None,
        col_upper: object | None = None,
        integrality: object | None = None,
        sense: Sense = "min",
        offset: float = 0.0,
        Q: object | None = None,
        col_names: list[str] | tuple[str, ...] | None = None,
        row_names: list[str] | tuple[str, ...] | None = None,
        name: str = "model",
    ) -> Problem:
        """Build and validate a problem from plain arrays.

        Missing bounds default to ``row_lower = -inf``, ``row_upper = +inf``,
        ``col_lower = 0``, ``col_upper = +inf``; missing integrality means all
        continuous. ``A`` and ``Q`` may be dense or any scipy sparse format.
        Integer column bounds are rounded inward.
        """
        c_arr = _vector("c", c)
        n = c_arr.size
        if A is None:
            A_mat = sp.csr_matrix((0, n))
        elif sp.issparse(A):
            A_mat = sp.csr_matrix(A, dtype=float)
        else:
            dense = np.asarray(A, dtype=float)
            if dense.ndim != 2:
                raise ProblemError(f"A: expected a 2-D matrix, got {dense.ndim} dimension(s)")
            A_mat = sp.csr_matrix(dense)
        m = A_mat.shape[0]
        rl = np.full(m, -np.inf) if row_lower is None else _vector("row_lower", row_lower)
        ru = np.full(m, np.inf) if row_upper is None else _vector("row_upper", row_upper)
        cl = np.zeros(n) if col_lower is None else _vector("col_lower", col_lower)
        cu = np.full(n, np.inf) if col_upper is None else _vector("col_upper", col_upper)
        if integrality is None:
            integ = np.zeros(n, dtype=bool)
        else:
            integ = np.asarray(integrality)
            if integ.ndim != 1:
                raise ProblemError("integrality: expected a 1-D array")
            integ = integ.astype(bool)
        q_mat = None
        if Q is not None:
            q_mat = sp.csr_matrix(Q, dtype=float) if sp.issparse(Q) else sp.csr_matrix(
                np.asarray(Q, dtype=float)
            )
        return cls(
            c=c_arr,
            A=A_mat,
            row_lower=rl,
            row_upper=ru,
            col_lower=cl,
            col_upper=cu,
            integrality=integ,
            sense=sense,
            offset=float(offset),
            Q=q_mat,
            col_names=tuple(col_names) if col_names is not None else (),
            row_names=tuple(row_names) if row_names is not None else (),
            name=name,
        )

    def __post_init__(self) -> None:
        if self._validated:
            return
        set_ = object.__setattr__
        n = int(np.asarray(self.c).size)
        c = _vector("c", self.c)
        if not sp.issparse(self.A):
            raise ProblemError("A: expected a scipy.sparse matrix (use Problem.from_arrays)")
        A = sp.csr_matrix(self.A, dtype=float, copy=True)  # ours to freeze
        A.sum_duplicates()
        A.eliminate_zeros()
        m = A.shape[0]
        if A.shape[1] != n:
            raise ProblemError(f"A: has {A.shape[1]} columns but c has {n} entries")
        if not np.all(np.isfinite(A.data)):
            bad = _first_bad(~np.isfinite(A.data))
            row = int(np.searchsorted(A.indptr, bad, side="right") - 1)
            raise ProblemError(
                f"A: entry at row {row}, column {int(A.indices[bad])} is {A.data[bad]}"
            )
        _check_finite("c", c)
        if self.sense not in ("min", "max"):
            raise ProblemError(f"sense: expected 'min' or 'max', got {self.sense!r}")
        if not math.isfinite(float(self.offset)):
            raise ProblemError(f"offset: must be finite, got {self.offset}")

        rl = _vector("row_lower", self.row_lower, m)
        ru = _vector("row_upper", self.row_upper, m)
        cl = _vector("col_lower", self.col_lower, n)
        cu = _vector("col_upper", self.col_upper, n)
        for label, arr in (("row_lower", rl), ("row_upper", ru), ("col_lower", cl),
                           ("col_upper", cu)):
            if np.isnan(arr).any():
                raise ProblemError(f"{label}[{_first_bad(np.isnan(arr))}] is NaN")
        for label, arr, bad in (("row_lower", rl, np.inf), ("row_upper", ru, -np.inf),
                                ("col_lower", cl, np.inf), ("col_upper", cu, -np.inf)):
            if (arr == bad).any():
                raise ProblemError(f"{label}[{_first_bad(arr == bad)}] is {bad}")
        integ = np.asarray(self.integrality).astype(bool).ravel()
        if integ.size != n:
            raise ProblemError(f"integrality: expected {n} entries, got {integ.size}")

        col_names = tuple(self.col_names) or tuple(f"x{j}" for j in range(n))
        row_names = tuple(self.row_names) or tuple(f"r{i}" for i in range(m))
        if len(col_names) != n:
            raise ProblemError(f"col_names: expected {n} names, got {len(col_names)}")
        if len(row_names) != m:
            raise ProblemError(f"row_names: expected {m} names, got {len(row_names)}")

        if (rl > ru).any():
            i = _first_bad(rl > ru)
            raise ProblemError(
                f"row {i} ({row_names[i]}): row_lower {rl[i]} > row_upper {ru[i]}"
            )
        if (cl > cu).any():
            j = _first_bad(cl > cu)
            raise ProblemError(
                f"column {j} ({col_names[j]}): col_lower {cl[j]} > col_upper {cu[j]}"
            )
        if integ.any():
            tol = INTEGER_BOUND_TOLERANCE
            cl = np.where(integ, np.ceil(cl - tol), cl)
            cu = np.where(integ, np.floor(cu + tol), cu)
            if (cl > cu).any():
                j = _first_bad(cl > cu)
                raise ProblemError(
                    f"column {j} ({col_names[j]}): integer column has no integer value "
                    f"between its bounds {self.col_lower[j]} and {self.col_upper[j]}"
                )

        Q = self.Q
        if Q is not None:
            if not sp.issparse(Q):
                raise ProblemError("Q: expected a scipy.sparse matrix (use Problem.from_arrays)")
            Q = sp.csr_matrix(Q, dtype=float, copy=True)
            Q.sum_duplicates()
            Q.eliminate_zeros()
            if Q.shape != (n, n):
                raise ProblemError(f"Q: expected shape ({n}, {n}), got {Q.shape}")
            if not np.all(np.isfinite(Q.data)):
                raise ProblemError("Q: contains a NaN or infinite entry")
            asym = abs(Q - Q.T)
            if asym.nnz and asym.max() > 1e-9 * max(1.0, abs(Q).max()):
                coo = sp.coo_matrix(asym)
                k = int(np.argmax(coo.data))
                raise ProblemError(
                    f"Q: not symmetric at ({int(coo.row[k])}, {int(coo.col[k])})"
                )
            if Q.nnz == 0:
                Q = None
        for arr in (A.data, A.indices, A.indptr):
            arr.setflags(write=False)
        if Q is not None:
            for arr in (Q.data, Q.indices, Q.indptr):
                arr.setflags(write=False)

        set_(self, "c", _frozen(c))
        set_(self, "A", A)
        set_(self, "row_lower", _frozen(rl))
        set_(self, "row_upper", _frozen(ru))
        set_(self, "col_lower", _frozen(cl))
        set_(self, "col_upper", _frozen(cu))
        set_(self, "integrality", _frozen(integ))
        set_(self, "offset", float(self.offset))
        set_(self, "Q", Q)
        set_(self, "col_names", col_names)
        set_(self, "row_names", row_names)
        set_(self, "name", str(self.name) or "model")
        set_(self, "_validated", True)

    # -------------------------------------------------------------- queries
    @property
    def num_cols(self) -> int:
        return int(self.c.size)

    @property
    def num_rows(self) -> int:
        return int(self.A.shape[0])

    @property
    def num_integers(self) -> int:
        return int(self.integrality.sum())

    @property
    def num_binaries(self) -> int:
        return int(
            (self.integrality & (self.col_lower == 0) & (self.col_upper == 1)).sum()
        )

    @property
    def nnz(self) -> int:
        return int(self.A.nnz)

    @property
    def is_quadratic(self) -> bool:
        return self.Q is not None

    def objective_value(self, x: np.ndarray) -> float:
        """Objective at ``x`` in the model's own sense (offset included)."""
        x = np.asarray(x, dtype=float)
        val = float(self.c @ x) + self.offset
        if self.Q is not None:
            val += 0.5 * float(x @ (self.Q @ x))
        return val

    def summary(self) -> dict[str, object]:
        """Counts a user checks first; plain JSON-ready values."""
        return {
            "name": self.name,
            "rows": self.num_rows,
            "columns": self.num_cols,
            "integers": self.num_integers,
            "binaries": self.num_binaries,
            "nonzeros": self.nnz,
            "sense": self.sense,
            "quadratic": self.is_quadratic,
        }

    def with_bounds(self, col_lower: np.ndarray, col_upper: np.ndarray) -> Problem:
        """A copy with other column bounds (validated again)."""
        return Problem(
            c=self.c, A=self.A, row_lower=self.row_lower, row_upper=self.row_upper,
            col_lower=col_lower, col_upper=col_upper, integrality=self.integrality,
            sense=self.sense, offset=self.offset, Q=self.Q, col_names=self.col_names,
            row_names=self.row_names, name=self.name,
        )


def _vector(label: str, value: object, size: int | None = None) -> np.ndarray:
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError) as exc:
        raise ProblemError(f"{label}: not numeric ({exc})") from None
    if arr.ndim == 0 and size is not None:
        arr = np.full(size, float(arr))
    if arr.ndim != 1:
        raise ProblemError(f"{label}: expected a 1-D array, got {arr.ndim} dimension(s)")
    if size is not None and arr.size != size:
        raise ProblemError(f"{label}: expected {size} entries, got {arr.size}")
    return arr


def _check_finite(label: str, arr: np.ndarray) -> None:
    if not np.all(np.isfinite(arr)):
        k = _first_bad(~np.isfinite(arr))
        raise ProblemError(f"{label}[{k}] is {arr[k]}")
