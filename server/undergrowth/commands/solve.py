"""`undergrowth solve MODEL`: run the instrumented branch-and-bound and record it."""

from __future__ import annotations

import argparse
import json
import signal
import sys
import time
from pathlib import Path

from ..model import ModelFormatError, ProblemError, read_model
from ..paths import new_run_path, user_runs_dir
from ..search import BRANCHING_RULES, NODE_ORDERS, NonConvexObjectiveError, Search, SearchSettings


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser(
        "solve", help="run branch-and-bound on a model and record every node",
        description="Run Undergrowth's instrumented branch-and-bound on MODEL (MPS, quadratic "
                    "MPS or JSON) and write a run log that the inspector opens.")
    p.add_argument("model", help="model file (.mps, .qps, .mps.gz, .json)")
    p.add_argument("--branching", default="reliability", choices=BRANCHING_RULES,
                   help="branching rule (default: reliability)")
    p.add_argument("--select", default="hybrid", choices=NODE_ORDERS,
                   help="node order (default: hybrid)")
    p.add_argument("--node-limit", type=int, default=None, help="stop after N nodes")
    p.add_argument("--time-limit", type=float, default=None, help="stop after S seconds")
    p.add_argument("--gap", type=float, default=1e-4,
                   help="stop at this relative gap (default: 1e-4)")
    p.add_argument("--seed", type=int, default=0, help="seed for the random rule (default: 0)")
    p.add_argument("--no-rounding", action="store_true", help="switch off the rounding heuristic")
    p.add_argument("--out", default=None,
                   help="run-log path (.jsonl or .jsonl.gz); default: a new file in the "
                        "user runs directory")
    p.add_argument("--quiet", action="store_true", help="no live progress display")
    p.add_argument("--json", action="store_true", help="print the summary as one JSON object")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ..runlog.writer import RunLogWriter

    try:
        problem = read_model(args.model)
        settings = SearchSettings(
            branching=args.branching, select=args.select, node_limit=args.node_limit,
            time_limit=args.time_limit, gap=args.gap, seed=args.seed,
            rounding=not args.no_rounding)
        search = Search(problem, settings)
    except (ModelFormatError, ProblemError, NonConvexObjectiveError, ValueError, OSError) as exc:
        print(f"undergrowth solve: {exc}", file=sys.stderr)
        return 2
    if args.out:
        out = Path(args.out)
    else:
        out = new_run_path(user_runs_dir(), problem.name, args.branching, args.select)
    out.parent.mkdir(parents=True, exist_ok=True)

    show = not args.quiet and not args.json and sys.stderr.isatty()
    display = ProgressLine(sys.stderr) if show else None
    interrupted = {"n": 0}

    def on_sigint(signum: int, frame: object) -> None:
        interrupted["n"] += 1
        if interrupted["n"] > 1:
            raise KeyboardInterrupt
        search.cancel()  # first Ctrl-C: stop cleanly after the current node

    old = signal.signal(signal.SIGINT, on_sigint)
    try:
        with RunLogWriter(out, search.header()) as writer:
            for ev in search.events():
                writer.write(ev)
                if display is not None and ev["kind"] == "progress":
                    display.update(ev)
    finally:
        signal.signal(signal.SIGINT, old)
        if display is not None:
            display.clear()
    result = search.result
    assert result is not None
    summary = result.summary() | {"run_log": str(out)}
    if args.json:
        print(json.dumps(summary))
    else:
        print(format_summary(problem.name, settings, result, out))
    return 0


def _num(v: float | None) -> str:
    return "none" if v is None else f"{v:.10g}"


def format_summary(name: str, settings: SearchSettings, result, out: Path) -> str:
    gap = "none" if result.gap is None else f"{100 * result.gap:.4g}%"
    lines = [
        f"{name}: {result.status}  ({settings.branching}, {settings.select})",
        f"  best solution  {_num(result.objective)}",
        f"  dual bound     {_num(result.dual_bound)}",
        f"  gap            {gap}",
        f"  nodes          {result.nodes:,}   LP iterations {result.lp_iterations:,}",
        f"  time           {result.seconds:.3f} s, of which relaxations "
        f"{result.lp_seconds:.3f} s",
        f"  run log        {out}",
    ]
    if result.message:
        lines.append(f"  note           {result.message}")
    return "\n".join(lines)


class ProgressLine:
    """One self-rewriting terminal line: share of the tree closed (by tree weight)
    as a bar, then the bounds, gap and pace."""

    WIDTH = 24

    def __init__(self, stream) -> None:
        self.stream = stream
        self.t_last = 0.0

    def update(self, ev: dict) -> None:
        t = time.monotonic()
        if t - self.t_last < 0.2:
            return
        self.t_last = t
        closed = min(max(float(ev.get("tree_weight") or 0.0), 0.0), 1.0)
        full = int(round(closed * self.WIDTH))
        bar = "#" * full + "." * (self.WIDTH - full)
        gap = ev.get("gap")
        gap_s = "-" if gap is None else f"{100 * gap:.2f}%"
        nodes = int(ev.get("nodes") or 0)
        secs = float(ev.get("time") or 0.0)
        rate = nodes / secs if secs > 0 else 0.0
        line = (f"\r[{bar}] {100 * closed:5.1f}% closed | best {_num(ev.get('primal_bound'))}"
                f" | bound {_num(ev.get('dual_bound'))} | gap {gap_s} | {nodes:,} nodes"
                f" @ {rate:,.0f}/s | {int(ev.get('open') or 0):,} open")
        self.stream.write(line[:200] + "\x1b[K")
        self.stream.flush()

    def clear(self) -> None:
        self.stream.write("\r\x1b[K")
        self.stream.flush()
