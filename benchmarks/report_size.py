"""Size of the self-contained report for a long run, and of its parts.

    python benchmarks/report_size.py                  # a 10,000-node run
    python benchmarks/report_size.py --nodes 100000   # longer (about a minute of solving)

The run is a real search by the engine on a seeded strongly correlated knapsack
(tests/families.py `hard_knapsack`, 100 binaries), most-fractional branching,
best-bound order, stopped by the node limit. It is written as a run log, opened
as a table and turned into the report exactly as `undergrowth report` does;
then the script prints the page's size, the bytes of the tree picture and the
bounds chart inside it, and how many single marks and bars the tree needed.
"""

from __future__ import annotations

import argparse
import re
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))
from families import hard_knapsack  # noqa: E402
from undergrowth.analysis.layout import table_layout  # noqa: E402
from undergrowth.analysis.table import RunTable  # noqa: E402
from undergrowth.cli import main as cli  # noqa: E402
from undergrowth.report.tree_svg import tree_picture  # noqa: E402
from undergrowth.runlog.writer import RunLogWriter  # noqa: E402
from undergrowth.search import Search, SearchSettings  # noqa: E402


def record(directory: Path, nodes: int, seed: int) -> Path:
    problem = hard_knapsack(seed, n=100)
    search = Search(problem, SearchSettings(branching="most-fractional", select="best-bound",
                                            node_limit=nodes, gap=0.0, absolute_gap=1e-9))
    path = directory / f"{problem.name}.most-fractional.best-bound.jsonl.gz"
    with RunLogWriter(path, search.header()) as writer:
        for event in search.events():
            writer.write(event)
    return path


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--nodes", type=int, default=10_000, help="node limit of the run")
    parser.add_argument("--seed", type=int, default=1, help="seed of the knapsack")
    args = parser.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        d = Path(tmp)
        t0 = time.perf_counter()
        run = record(d, args.nodes, args.seed)
        solved = time.perf_counter() - t0
        out = d / "report.html"
        t0 = time.perf_counter()
        if cli(["report", str(run), "-o", str(out)]) != 0:
            return 1
        built = time.perf_counter() - t0
        html = out.read_text(encoding="utf-8")
        table = RunTable.open(run)
        pic = tree_picture(table, table_layout(table))
        tree = re.search(r'<svg class="tree-picture".*?</svg>', html, re.S)
        chart = re.search(r'<svg class="bounds-chart".*?</svg>', html, re.S)
        print(f"run: {len(table):,} tree nodes, {int((table.order >= 0).sum()):,} processed, "
              f"end status {(table.end or {}).get('status')}, run log "
              f"{run.stat().st_size / 1024:,.0f} KiB (solved in {solved:.1f} s)")
        print(f"report: {len(html.encode('utf-8')) / 1024:,.0f} KiB "
              f"({len(html.encode('utf-8')):,} bytes), written in {built:.1f} s")
        print(f"  tree picture {len(tree.group(0)) / 1024:,.0f} KiB: {pic.marks:,} single "
              f"marks, {pic.bars:,} bars standing for {pic.hidden:,} nodes, {pic.edges:,} edges")
        print(f"  bounds chart {len(chart.group(0)) / 1024:,.0f} KiB")
        refs = re.findall(r'(?:src|href)\s*=\s*"(?!#)[^"]*"|url\((?!#)', html)
        print(f"  references outside the page: {len(refs)}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
