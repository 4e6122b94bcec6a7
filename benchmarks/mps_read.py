"""Time `read_mps` against highspy's own reader on a 10,000-column, 100,000-nonzero file.

Usage: python benchmarks/mps_read.py [--cols N] [--nnz K] [--rows M] [--seed S]
The file is generated with highspy (seeded) in a temporary directory; both
readers are timed side by side in this run, best of 3.
"""

from __future__ import annotations

import argparse
import tempfile
import time
from pathlib import Path

import highspy
import numpy as np

from undergrowth.model.mps import read_mps


def generate(path: Path, cols: int, rows: int, nnz: int, seed: int) -> None:
    rng = np.random.default_rng(seed)
    # distinct (row, col) pairs, column-major, as highspy wants them
    flat = rng.choice(rows * cols, size=nnz, replace=False)
    col, row = np.divmod(flat, rows)
    order = np.lexsort((row, col))
    col, row = col[order], row[order]
    start = np.searchsorted(col, np.arange(cols + 1)).astype(np.int32)
    lp = highspy.HighsLp()
    lp.num_col_, lp.num_row_ = cols, rows
    lp.col_cost_ = np.round(rng.normal(size=cols), 6)
    lp.col_lower_ = np.where(rng.random(cols) < 0.1, -10.0, 0.0)
    lp.col_upper_ = np.where(rng.random(cols) < 0.5, np.round(rng.uniform(1, 100, cols)), np.inf)
    b = np.round(rng.uniform(1, 1000, rows), 3)
    kind = rng.integers(0, 3, rows)
    lp.row_lower_ = np.where(kind == 0, -np.inf, np.where(kind == 1, b, b - 10.0))
    lp.row_upper_ = np.where(kind == 0, b, np.where(kind == 1, np.inf, b))
    lp.a_matrix_.format_ = highspy.MatrixFormat.kColwise
    lp.a_matrix_.start_ = start
    lp.a_matrix_.index_ = row.astype(np.int32)
    values = np.round(rng.normal(size=nnz) * 10, 4)
    values[values == 0.0] = 1.0  # keep every nonzero
    lp.a_matrix_.value_ = values
    lp.integrality_ = [highspy.HighsVarType.kInteger if v else highspy.HighsVarType.kContinuous
                       for v in rng.random(cols) < 0.3]
    lp.col_names_ = [f"x{j}" for j in range(cols)]
    lp.row_names_ = [f"c{i}" for i in range(rows)]
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    h.passModel(lp)
    h.writeModel(str(path))


def best_of(fn, repeats: int = 3) -> float:
    best = float("inf")
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def highs_read(path: Path) -> None:
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    h.readModel(str(path))


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cols", type=int, default=10_000)
    ap.add_argument("--rows", type=int, default=5_000)
    ap.add_argument("--nnz", type=int, default=100_000)
    ap.add_argument("--seed", type=int, default=0)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "bench.mps"
        generate(path, args.cols, args.rows, args.nnz, args.seed)
        p = read_mps(path)
        print(f"file: {path.stat().st_size / 1e6:.1f} MB, {p.num_cols} columns, "
              f"{p.num_rows} rows, {p.nnz} nonzeros, {p.num_integers} integers")
        ours = best_of(lambda: read_mps(path))
        ref = best_of(lambda: highs_read(path))
    print(f"read_mps:        {ours:.3f} s")
    print(f"highspy reader:  {ref:.3f} s")
    print(f"ratio:           {ours / ref:.2f}x")


if __name__ == "__main__":
    main()
