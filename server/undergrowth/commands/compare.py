"""`undergrowth compare MODEL... [--branching R,...] [--select O,...] [--seeds N]
[--node-limit N] [--time-limit S] [--gap G] [--jobs J] [--out-dir DIR] [--json]`:
solve every model × rule × order × seed in parallel and lay the runs side by side.

Progress goes to stderr (one line per finished run, k of n); the table (or, with
``--json``, the list of rows) to stdout. With two or more problems (model × seed)
it also prints shifted geometric means per rule and order and writes performance
profiles by nodes and by time (SVG images, JSON and CSV data) into the comparison
directory. Exit status: 0 done, 2 bad arguments or an unreadable model, 130 stopped
by Ctrl-C (the runs finished so far are kept and shown).
"""

from __future__ import annotations

import argparse
import csv
import json
import math
import signal
import sys
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

EXIT_OK, EXIT_BAD_INPUT, EXIT_STOPPED = 0, 2, 130
DEFAULT_RULES = "most-fractional,pseudocost,reliability"
DEFAULT_ORDERS = "hybrid"

# (row key, heading) in table order; every numeric column: lower is better.
TABLE_COLUMNS = (
    ("status", "status"),
    ("nodes", "nodes"),
    ("lp_iterations", "LP iters"),
    ("seconds", "seconds"),
    ("first_incumbent_seconds", "1st sol s"),
    ("gap", "gap"),
    ("primal_integral", "primal int"),
    ("max_depth", "depth"),
)


def register(sub: argparse._SubParsersAction) -> None:
    from ..compare_runner import default_jobs

    p = sub.add_parser(
        "compare", help="run several branching rules and node orders side by side",
        description="Solve every combination of MODEL(s), branching rules, node orders and "
                    "seeds in parallel worker processes, save each run log in one comparison "
                    "directory, and print a table of the runs with the best value of each "
                    "column marked (lower is better in every numeric column).")
    p.add_argument("models", metavar="MODEL", nargs="+",
                   help="model files (.mps, .qps, .mps.gz, .json)")
    p.add_argument("--branching", default=DEFAULT_RULES, metavar="R1,R2,...",
                   help=f"comma-separated branching rules (default: {DEFAULT_RULES})")
    p.add_argument("--select", default=DEFAULT_ORDERS, metavar="O1,O2,...",
                   help=f"comma-separated node orders (default: {DEFAULT_ORDERS})")
    p.add_argument("--seeds", type=int, default=1, metavar="N",
                   help="run seeds 0 … N-1 of each combination (default: 1)")
    p.add_argument("--node-limit", type=int, default=None, metavar="N",
                   help="stop each run after N nodes")
    p.add_argument("--time-limit", type=float, default=None, metavar="S",
                   help="stop each run after S seconds")
    p.add_argument("--gap", type=float, default=1e-4,
                   help="stop each run at this relative gap (default: 1e-4)")
    p.add_argument("--jobs", type=int, default=None, metavar="J",
                   help=f"worker processes (default: the number of cores, here "
                        f"{default_jobs()})")
    p.add_argument("--out-dir", default=None, metavar="DIR",
                   help="directory for the run logs, group.json and profiles (default: a "
                        "new compare-<UTC time> folder in the user runs directory)")
    p.add_argument("--json", action="store_true", help="print the rows as a JSON list")
    p.set_defaults(run=run)


def _split(text: str) -> list[str]:
    return [part.strip() for part in text.split(",") if part.strip()]


def run(args: argparse.Namespace) -> int:
    from ..analysis.compare import summary
    from ..compare_runner import run_comparison
    from ..model import ProblemError
    from ..search import NonConvexObjectiveError

    stop = {"n": 0}

    def on_sigint(signum: int, frame: object) -> None:
        stop["n"] += 1
        if stop["n"] > 1:
            raise KeyboardInterrupt
        print("stopping: the running searches end after their current node "
              "(Ctrl-C again to abandon them)", file=sys.stderr)

    def progress(run_done: Any, k: int, n: int) -> None:
        print(f"[{k}/{n}] {run_done.model}  {run_done.branching} / {run_done.select}  "
              f"seed {run_done.seed}: {run_done.status}, {run_done.nodes:,} nodes, "
              f"{run_done.seconds:.3g} s", file=sys.stderr, flush=True)

    old = signal.signal(signal.SIGINT, on_sigint)
    try:
        comparison = run_comparison(
            args.models, branching=_split(args.branching), select=_split(args.select),
            seeds=args.seeds, node_limit=args.node_limit, time_limit=args.time_limit,
            gap=args.gap, jobs=args.jobs,
            out_dir=None if args.out_dir is None else Path(args.out_dir),
            on_done=progress, should_stop=lambda: stop["n"] > 0)
    except (ProblemError, NonConvexObjectiveError, ValueError, OSError) as exc:
        print(f"undergrowth compare: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    finally:
        signal.signal(signal.SIGINT, old)

    rows = comparison.rows
    data = summary(rows)
    written: list[Path] = []
    if data["problems"] >= 2:
        written = write_profiles(comparison.directory, data)
    if args.json:
        print(json.dumps(rows, indent=2))
    else:
        print(f"comparison {comparison.name}: {len(rows)} of {comparison.planned} runs "
              f"({len(comparison.models)} model(s)); run logs and group.json in "
              f"{comparison.directory}")
        print()
        print(format_table(rows, data["marks"]))
        if data["problems"] >= 2:
            print()
            print(format_means(data["means"], data["shifts"], data["problems"]))
            print()
            print("performance profiles (Dolan & Moré 2002; unfinished runs count as "
                  "failures):")
            for path in written:
                print(f"  {path}")
    if comparison.cancelled:
        print(f"undergrowth compare: stopped early; {len(rows)} of {comparison.planned} "
              "runs were made", file=sys.stderr)
        return EXIT_STOPPED
    return EXIT_OK


# ------------------------------------------------------------------ files
def write_profiles(directory: Path, data: Mapping[str, Any]) -> list[Path]:
    """profile-nodes.svg, profile-seconds.svg, profile.json (profiles, means, shifts) and
    profile.csv (the step points) in ``directory``; returns the paths."""
    from ..analysis.compare import profile_rows
    from ..analysis.profile_svg import write_profile_svg

    paths = []
    for measure, profile in data["profiles"].items():
        path = directory / f"profile-{measure}.svg"
        write_profile_svg(path, profile)
        paths.append(path)
    blob = {"profiles": data["profiles"], "means": data["means"], "shifts": data["shifts"]}
    path = directory / "profile.json"
    path.write_text(json.dumps(blob, indent=2) + "\n", encoding="utf-8")
    paths.append(path)
    path = directory / "profile.csv"
    with path.open("w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, fieldnames=["measure", "solver", "tau", "share"])
        writer.writeheader()
        for profile in data["profiles"].values():
            writer.writerows(profile_rows(profile))
    paths.append(path)
    return paths


# ------------------------------------------------------------------ text
def _cell(key: str, value: Any) -> str:
    if value is None:
        return "-"
    if key == "gap":
        return f"{100 * value:.3g}%"
    if key in ("seconds", "first_incumbent_seconds", "primal_integral"):
        return f"{value:.3g}" if value >= 0.001 or value == 0 else f"{value:.1e}"
    if isinstance(value, int):
        return f"{value:,}"
    if isinstance(value, float) and math.isfinite(value):
        return f"{value:.4g}"
    return str(value)


def _solver(row: Mapping[str, Any]) -> str:
    return f"{row['branching']} / {row['select']}"


def format_table(rows: Sequence[Mapping[str, Any]],
                 marks: Sequence[Mapping[str, bool]]) -> str:
    """One block per problem (model and seed), one line per rule and order; ``*`` after
    a value marks the best of that problem's runs in its column."""
    if not rows:
        return "no runs finished"
    cells = []
    for row, mark in zip(rows, marks, strict=True):
        line = [_solver(row)]
        for key, _ in TABLE_COLUMNS:
            text = _cell(key, row.get(key))
            line.append(text + ("*" if mark.get(key) else " ") if key != "status" else text)
        cells.append(line)
    heads = ["rule / order"] + [h + (" " if k != "status" else "") for k, h in TABLE_COLUMNS]
    widths = [max(len(heads[i]), *(len(c[i]) for c in cells)) for i in range(len(heads))]

    def fmt(parts: Sequence[str]) -> str:
        out = [parts[0].ljust(widths[0]), parts[1].ljust(widths[1])]
        out += [p.rjust(w) for p, w in zip(parts[2:], widths[2:], strict=True)]
        return "  " + "  ".join(out).rstrip()

    blocks: list[str] = []
    seen: dict[tuple[str, Any], list[int]] = {}
    for i, row in enumerate(rows):
        seen.setdefault((str(row["model"]), row.get("seed")), []).append(i)
    for (model, seed), members in seen.items():
        lines = [f"{model}  (seed {seed})", fmt(heads)]
        lines += [fmt(cells[i]) for i in members]
        blocks.append("\n".join(lines))
    legend = ("* best run of the model and seed in that column; lower is better in every "
              "numeric column\n  (nodes, LP iters, seconds and depth rank only finished runs "
              "when any finished).\n  gap: final relative gap; primal int: primal integral "
              "in seconds (Berthold 2013),\n  measured against the best solution any run of "
              "the model found.")
    return "\n\n".join(blocks) + "\n\n" + legend


def _mean(x: float) -> str:
    return f"{x:,.0f}" if abs(x) >= 1000 else f"{x:.4g}"


def format_means(means: Sequence[Mapping[str, Any]], shifts: Mapping[str, float],
                 problems: int) -> str:
    """Shifted geometric means per rule and order, best marked."""
    cols = [c for c in ("nodes", "seconds", "lp_iterations") if c in shifts]
    names = {"nodes": "nodes", "seconds": "seconds", "lp_iterations": "LP iters"}
    best = {c: min(m[c] for m in means) for c in cols} if means else {}
    heads = ["rule / order", "finished"] + [names[c] for c in cols]
    lines_cells = []
    for m in means:
        line = [f"{m['branching']} / {m['select']}", f"{m['finished']}/{m['runs']}"]
        line += [_mean(m[c]) + ("*" if m[c] == best[c] else " ") for c in cols]
        lines_cells.append(line)
    widths = [max(len(heads[i]), *(len(c[i]) for c in lines_cells)) for i in range(len(heads))]
    head = "  " + "  ".join([heads[0].ljust(widths[0])]
                            + [h.rjust(w) for h, w in zip(heads[1:], widths[1:], strict=True)])
    body = ["  " + "  ".join([c[0].ljust(widths[0])]
                             + [x.rjust(w) for x, w in zip(c[1:], widths[1:], strict=True)])
            for c in lines_cells]
    stated = ", ".join(f"{names[c]} {shifts[c]:g}" for c in cols)
    return "\n".join([
        f"shifted geometric means over {problems} problems (model × seed)",
        f"  shifts: {stated} (10 s and 100 nodes are common practice in MIP benchmarking)",
        head, *body,
        "  * lowest; a run stopped by a limit enters with what it had spent when it stopped"])
