"""Back-test of the tree-size forecast on finished runs of different models.

For each run, the forecast made after 10%, 25% and 50% of the processed nodes is
compared with the final tree size (ratio forecast / true; 1 is perfect). Runs: the
bundled sample runs (sample_runs/*.jsonl.gz) plus fresh searches of seeded models
from tests/families.py and an all-odd equality knapsack, solved to a zero gap with
Undergrowth's engine and saved with the run-log writer.

    python benchmarks/forecast_backtest.py [--keep DIR] [--json]

``--keep DIR`` writes the generated runs into DIR and reuses them on the next call.
"""

from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))
import families  # noqa: E402
from undergrowth.analysis.forecast import backtest  # noqa: E402
from undergrowth.analysis.table import RunTable  # noqa: E402
from undergrowth.model import Problem  # noqa: E402
from undergrowth.runlog.writer import RunLogWriter  # noqa: E402
from undergrowth.search import Search, SearchSettings  # noqa: E402


def odd_equality(n: int = 11) -> Problem:
    """Σ 2·x_j = n with n odd, x binary: infeasible, but only a full tree shows it."""
    return Problem.from_arrays(
        np.ones(n), np.full((1, n), 2.0), row_lower=[float(n)], row_upper=[float(n)],
        col_upper=np.ones(n), integrality=np.ones(n), name=f"odd-equality-n{n}")


# (label, model factory, branching rule, node order): a few hundred to a few thousand nodes
GENERATED = (
    ("multi-knapsack-60", lambda: families.multi_knapsack(4, n=60, m=3),
     "most-fractional", "best-bound"),
    ("multi-knapsack-60", lambda: families.multi_knapsack(4, n=60, m=3),
     "reliability", "hybrid"),
    ("multi-knapsack-50x5", lambda: families.multi_knapsack(5, n=50, m=5),
     "pseudocost", "depth-first"),
    ("hard-knapsack-30", lambda: families.hard_knapsack(2, n=30), "most-fractional",
     "best-bound"),
    ("hard-knapsack-30", lambda: families.hard_knapsack(2, n=30), "pseudocost", "depth-first"),
    ("knapsack-60", lambda: families.knapsack(13, n=60), "pseudocost", "depth-first"),
    ("set-cover-80", lambda: families.set_cover(7, n=80, m=160, per_element=4),
     "pseudocost", "depth-first"),
    ("integer-cover-20", lambda: families.integer_cover(9, n=20, m=8), "most-fractional",
     "best-bound"),
    ("integer-cover-30", lambda: families.integer_cover(10, n=30, m=10), "reliability",
     "hybrid"),
    ("facility-10x15", lambda: families.facility_location(8, depots=10, customers=15),
     "pseudocost", "depth-first"),
    ("odd-equality-11", lambda: odd_equality(11), "most-fractional", "best-bound"),
)


def generated_runs(directory: Path) -> list[Path]:
    paths = []
    for label, make, rule, order in GENERATED:
        path = directory / f"{label}.{rule}.{order}.jsonl.gz"
        if not path.exists():
            settings = SearchSettings(branching=rule, select=order, gap=0.0, absolute_gap=1e-9)
            search = Search(make(), settings)
            with RunLogWriter(path, search.header()) as writer:
                for ev in search.events():
                    writer.write(ev)
        paths.append(path)
    return paths


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--keep", type=Path, default=None, help="directory for generated runs")
    parser.add_argument("--json", action="store_true", help="print the rows as JSON")
    args = parser.parse_args(argv)

    with tempfile.TemporaryDirectory() as tmp:
        work = args.keep or Path(tmp)
        work.mkdir(parents=True, exist_ok=True)
        t0 = time.perf_counter()
        runs = sorted((ROOT / "sample_runs").glob("*.jsonl.gz")) + generated_runs(work)
        rows = []
        for path in runs:
            table = RunTable.open(path, use_cache=False)
            if len(table) < 50:
                continue  # a tree this small has no 10% prefix worth forecasting from
            points = backtest(table)
            rows.append({"run": path.name.removesuffix(".jsonl.gz"), "nodes": len(table),
                         "points": [p.to_dict() for p in points]})
        seconds = time.perf_counter() - t0

    if args.json:
        print(json.dumps(rows, indent=2))
        return 0
    fractions = [p["fraction"] for p in rows[0]["points"]]
    methods = list(rows[0]["points"][0]["methods"])
    head = f"{'run':<58}{'tree':>7}" + "".join(f"{f'@{int(f * 100)}%':>9}" for f in fractions)
    print(head)
    print("-" * len(head))
    for row in rows:
        cells = "".join(_cell(p["ratio"]) for p in row["points"])
        print(f"{row['run']:<58}{row['nodes']:>7}{cells}")
    print("-" * len(head))
    print(f"{'median ratio forecast / true (combined)':<65}"
          + "".join(_cell(_median([r["points"][i]["ratio"] for r in rows]))
                    for i in range(len(fractions))))
    print(f"{'median |log2 ratio| (combined)':<65}"
          + "".join(_cell(_median([_abslog(r["points"][i]["ratio"]) for r in rows]))
                    for i in range(len(fractions))))
    print(f"{'share within a factor of 2 (combined)':<65}"
          + "".join(_cell(_within([r["points"][i]["ratio"] for r in rows]))
                    for i in range(len(fractions))))
    print(f"{'share whose range holds the true size':<65}"
          + "".join(_cell(_covered([r["points"][i] for r in rows]))
                    for i in range(len(fractions))))
    for m in methods:
        print(f"{'median ratio, ' + m + ' alone (runs where available)':<65}"
              + "".join(_cell(_median([r["points"][i]["methods"][m] for r in rows]))
                        for i in range(len(fractions))))
    print(f"\n{len(rows)} runs, {seconds:.1f} s (including the searches)")
    return 0


def _median(values: list[float | None]) -> float | None:
    vals = [v for v in values if v is not None]
    return float(np.median(vals)) if vals else None


def _abslog(v: float | None) -> float | None:
    return None if v is None or v <= 0 else abs(float(np.log2(v)))


def _within(values: list[float | None]) -> float:
    return float(np.mean([v is not None and 0.5 <= v <= 2.0 for v in values]))


def _covered(points: list[dict]) -> float:
    return float(np.mean([p["low"] is not None and p["low"] <= p["true_total"]
                          and (p["high"] is None or p["true_total"] <= p["high"])
                          for p in points]))


def _cell(v: float | None) -> str:
    return f"{'-':>9}" if v is None else f"{v:>9.2f}"


if __name__ == "__main__":
    sys.exit(main())
