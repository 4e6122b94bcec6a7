"""Run-log scale benchmark: write, size, cold and warm load of a synthetic run.

    python benchmarks/runlog_scale.py                 # 1,000,000 nodes
    python benchmarks/runlog_scale.py --nodes 100000  # quicker

The run is synthetic but shaped like a real search (seeded): a minimisation
over 2,000 binaries, nodes chosen by plunging into a child 70 % of the time and
otherwise taking the best bound, children's bounds rising from the parent's,
about 4 % infeasible, 3 % integral, 30 % pruned (bound above the incumbent), progress
every 500 nodes, and the nodes still waiting at the end written as "open".
Floats are written at full precision (times, bounds, scores), which is the
worst case for compression.

Targets on the 2-core development machine: gzip <= 80 bytes/node, cold load
<= 20 s, warm load <= 1.5 s, peak memory of a warm load <= 400 MB. Loads are
timed in a fresh Python process, whose peak resident set size is reported.
"""

from __future__ import annotations

import argparse
import heapq
import json
import os
import random
import subprocess
import sys
import tempfile
import time
from typing import Any

from undergrowth.runlog.writer import RunLogWriter

COLUMNS = 2000
HEADER: dict[str, Any] = {
    "model": {"name": "synthetic", "rows": 1500, "columns": COLUMNS, "integers": COLUMNS,
              "binaries": COLUMNS, "nonzeros": 24000, "sense": "min", "quadratic": False},
    "settings": {"branching": "pseudocost", "select": "hybrid", "seed": 7, "node_limit": None,
                 "time_limit": None, "gap": 1e-4},
    "started": "2026-12-02T06:00:00Z",
    "producer": "undergrowth benchmark",
}  # fmt: skip


def synthetic_run(nodes: int, seed: int) -> Any:
    """Yield the events of a synthetic search with ``nodes`` node events (one more if even:
    every node has zero or two children, so a whole tree has an odd number of nodes)."""
    rng = random.Random(seed)
    best = float("inf")
    clock = 0.0
    order = 0
    next_id = 1
    # open nodes: (bound, id, parent, depth, branch)
    heap: list[tuple[float, int, int | None, int, dict | None]] = [(1000.0, 0, None, 0, None)]
    plunge: list[tuple[float, int, int | None, int, dict | None]] = []
    emitted = 0
    iterations = 0
    while heap or plunge:
        if emitted + len(heap) + len(plunge) >= nodes:
            break  # the rest is written as open
        if plunge and rng.random() < 0.7:
            item = plunge.pop()
        else:
            for waiting in plunge:
                heapq.heappush(heap, waiting)
            plunge = []
            item = heapq.heappop(heap)
        parent_bound, nid, parent, depth, branch = item
        seconds = rng.expovariate(1 / 0.004)
        clock += seconds + rng.expovariate(1 / 0.0005)
        iters = int(rng.expovariate(1 / 12))
        iterations += iters
        u = rng.random()
        bound: float | None = parent_bound + rng.expovariate(1 / 0.4) if depth else parent_bound
        lp = {"status": "optimal", "objective": bound, "iterations": iters, "seconds": seconds}
        branching = None
        fractional = 0
        if depth and u < 0.04:
            status, bound = "infeasible", None
            lp["status"], lp["objective"] = "infeasible", None
        elif depth >= 12 and u < 0.34 and best < float("inf"):
            status = "pruned"  # its bound is made to fail against the incumbent
            bound = max(bound, best + rng.expovariate(1 / 0.2))
            lp["objective"] = bound
            fractional = rng.randrange(1, 30)
        elif depth > 8 and (u < 0.37 or depth >= 60):
            status = "integral"
        else:
            status = "branched"
            fractional = rng.randrange(1, 30)
            var = rng.randrange(COLUMNS)
            other = rng.randrange(COLUMNS)
            score = rng.random() * 3
            branching = {"var": var, "name": f"x{var}", "value": rng.random(), "score": score,
                         "rule": "pseudocost", "down_bound": None, "up_bound": None,
                         "runner_up": {"var": other, "name": f"x{other}",
                                       "score": score * rng.random()}}  # fmt: skip
        yield {"kind": "node", "id": nid, "parent": parent, "depth": depth, "order": order,
               "time": clock, "branch": branch, "lp": lp, "bound": bound,
               "fractional": fractional, "status": status, "branching": branching,
               "message": None}  # fmt: skip
        order += 1
        emitted += 1
        if status == "integral" and bound < best:
            best = bound
            yield {"kind": "incumbent", "time": clock, "node": nid, "order": order - 1,
                   "objective": bound, "source": "integral"}  # fmt: skip
        if status == "branched":
            assert branching is not None and bound is not None
            var = branching["var"]
            for direction, value in (("down", 0.0), ("up", 1.0)):
                child_branch = {"var": var, "name": f"x{var}", "dir": direction, "value": value}
                plunge.append((bound, next_id, nid, depth + 1, child_branch))
                next_id += 1
        if emitted % 500 == 0:
            dual = min([b for b, *_ in heap[:1]] + [b for b, *_ in plunge] + [best])
            yield {"kind": "progress", "time": clock, "nodes": emitted,
                   "open": len(heap) + len(plunge), "dual_bound": dual,
                   "primal_bound": None if best == float("inf") else best, "gap": None,
                   "tree_weight": 0.0}  # fmt: skip
    for parent_bound, nid, parent, depth, branch in heap + plunge:
        yield {"kind": "node", "id": nid, "parent": parent, "depth": depth, "order": None,
               "time": clock, "branch": branch, "lp": None, "bound": parent_bound,
               "fractional": 0, "status": "open", "branching": None, "message": None}  # fmt: skip
    yield {"kind": "end", "time": clock, "status": "node-limit", "objective": best,
           "dual_bound": None, "gap": None, "nodes": order, "lp_iterations": iterations,
           "lp_seconds": 0.0, "other_seconds": clock, "complete": False, "message": None,
           "solution": None}  # fmt: skip


_CHILD = """
import json, resource, sys, time
t0 = time.perf_counter()
from undergrowth.analysis.table import RunTable
t1 = time.perf_counter()
table = RunTable.open(sys.argv[1])
t2 = time.perf_counter()
print(json.dumps({"import": t1 - t0, "open": t2 - t1, "from_cache": table.from_cache,
                  "nodes": len(table), "warnings": len(table.warnings),
                  "maxrss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""


def load_in_child(path: str) -> dict[str, Any]:
    out = subprocess.run(
        [sys.executable, "-c", _CHILD, path], check=True, capture_output=True, text=True
    )
    return json.loads(out.stdout)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--nodes", type=int, default=1_000_000)
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--dir", help="write the files here and keep them (default: a temp dir)")
    args = parser.parse_args(argv)
    workdir = args.dir or tempfile.mkdtemp(prefix="runlog-scale-")
    os.makedirs(workdir, exist_ok=True)
    plain = os.path.join(workdir, "synthetic.jsonl")
    packed = os.path.join(workdir, "synthetic.jsonl.gz")
    for path in (plain, packed):
        for stale in (path, path + ".table.npz"):
            if os.path.exists(stale):
                os.unlink(stale)

    spent = {plain: 0.0, packed: 0.0}
    clock = time.perf_counter
    writers = {path: RunLogWriter(path, HEADER) for path in (plain, packed)}
    for event in synthetic_run(args.nodes, args.seed):
        for path, writer in writers.items():
            t = clock()
            writer.write(event)
            spent[path] += clock() - t
    for path, writer in writers.items():
        t = clock()
        writer.close()
        spent[path] += clock() - t

    rows = []
    for label, path in (("jsonl", plain), ("jsonl.gz", packed)):
        size = os.path.getsize(path)
        cold = load_in_child(path)
        warm = load_in_child(path)
        assert cold["nodes"] in (args.nodes, args.nodes + 1), cold
        assert not cold["from_cache"] and warm["from_cache"]
        rows.append((label, spent[path], size / cold["nodes"], cold, warm))

    count = rows[0][3]["nodes"]
    print(f"run-log scale benchmark: {count:,} nodes, seed {args.seed}, files in {workdir}")
    titles = ("format", "write s", "bytes/node", "cold s", "cold MB", "warm s", "warm MB")
    print(f"{titles[0]:<10}" + "".join(f"{t:>11}" for t in titles[1:]))
    for label, write_s, per_node, cold, warm in rows:
        cells = (write_s, per_node, cold["open"], cold["maxrss_mb"], warm["open"],
                 warm["maxrss_mb"])  # fmt: skip
        print(f"{label:<10}" + "".join(f"{x:>11.2f}" for x in cells))
    print("(cold/warm s: RunTable.open in a fresh process, after ~"
          f"{rows[-1][4]['import']:.2f} s of imports; MB: that process's peak RSS)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
