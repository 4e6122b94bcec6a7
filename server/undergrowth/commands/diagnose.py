"""`undergrowth diagnose RUN [--model FILE] [--json]`: why a search is slow, and how long
it still needs.

Without ``--model``, a model file ``models/<model name>.mps`` next to the run (as in
sample_runs/) is used, and the output says so. A model alone (``--model FILE``
without RUN) gets the model checks only, which is how a model the engine refuses
is explained. Exit status: 0 done (whatever was found), 2 a file could not be read.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
import textwrap
from pathlib import Path
from typing import Any

EXIT_OK, EXIT_BAD_FILE = 0, 2
WIDTH = 88
_TAGS = {"high": "HIGH", "medium": "MED ", "low": "LOW ", "info": "INFO"}


def register(subparsers: Any) -> None:
    parser = subparsers.add_parser(
        "diagnose",
        help="explain why a search is slow, with evidence, and forecast the rest",
        description=(
            "Read a run log (and its model, if available) and list findings: weak root "
            "relaxation, loose big-M rows, dual-bound stalls, late or missing incumbents, "
            "infeasible-heavy trees, branching hot spots, bad scaling, failed nodes, a "
            "non-convex objective; then forecast the tree size and the time still needed."),
    )
    parser.add_argument("run_file", metavar="RUN", nargs="?",
                        help="run log (.jsonl, .jsonl.gz) or CSV node table")
    parser.add_argument("--model", metavar="FILE", default=None,
                        help="the run's model (MPS, QPS or JSON); default: "
                             "models/<model name>.mps beside the run, if present")
    parser.add_argument("--json", action="store_true",
                        help="print the findings as a JSON list (no forecast)")
    parser.set_defaults(run=run)


def _fail(message: str) -> int:
    print(f"undergrowth diagnose: {message}", file=sys.stderr)
    return EXIT_BAD_FILE


def run(args: argparse.Namespace) -> int:
    from ..analysis.findings import diagnose
    from ..analysis.table import RunTable
    from ..model import ProblemError, read_model
    from ..runlog.errors import RunLogError

    if args.run_file is None and args.model is None:
        return _fail("give a run log, a model (--model FILE), or both")
    table = None
    if args.run_file is not None:
        try:
            table = RunTable.open(args.run_file)
        except (RunLogError, OSError) as exc:
            return _fail(str(exc))
    notes: list[str] = []
    model_path = args.model
    if model_path is None and table is not None:
        found = _model_beside(args.run_file, table)
        if found is not None:
            model_path = str(found)
            notes.append(f"model: {model_path} (found beside the run)")
    problem = None
    if model_path is not None:
        try:
            problem = read_model(model_path)
        except (ProblemError, OSError) as exc:  # ModelFormatError is a ProblemError
            if args.model is None:
                notes.append(f"model beside the run not used: {exc}")
            else:
                return _fail(str(exc))
        if problem is not None and table is not None:
            mismatch = _mismatch(problem, table)
            if mismatch and args.model is not None:
                return _fail(f"{model_path}: {mismatch}")
            if mismatch:
                notes.append(f"model beside the run not used: {mismatch}")
                problem = None
        if args.model is not None and problem is not None:
            notes.append(f"model: {model_path}")

    findings = diagnose(table, problem)
    if args.json:
        for note in notes:
            print(note, file=sys.stderr)
        print(json.dumps([f.to_dict() for f in findings], indent=2, ensure_ascii=False))
        return EXIT_OK
    print(_header(args, table, problem))
    for note in notes:
        print(note)
    print()
    print(format_findings(findings))
    if table is not None:
        from ..analysis.forecast import forecast

        print()
        print(format_forecast(forecast(table)))
    return EXIT_OK


def _model_beside(run_path: str, table: Any) -> Path | None:
    name = str((table.header.get("model") or {}).get("name") or "")
    if not name or "/" in name or "\\" in name or name.startswith("."):
        return None
    candidate = Path(run_path).resolve().parent / "models" / f"{name}.mps"
    return candidate if candidate.is_file() else None


def _mismatch(problem: Any, table: Any) -> str | None:
    """Why this model is not the run's, or None when the sizes agree."""
    model = table.header.get("model") or {}
    for key, have in (("columns", problem.num_cols), ("rows", problem.num_rows)):
        want = int(model.get(key) or 0)
        if want and want != have:
            return f"the model has {have} {key}, the run's model {want}: not this run's model"
    return None


# ------------------------------------------------------------------ text output
def _header(args: argparse.Namespace, table: Any, problem: Any) -> str:
    if table is None:
        return (f"{args.model}: model {problem.name!r} ({problem.sense}), "
                f"{problem.num_rows} rows, {problem.num_cols} columns (no run given)")
    end = table.end or {}
    processed = int((table.columns["order"] >= 0).sum())
    return (f"{Path(args.run_file).name}: model {table.header['model']['name']!r} ({table.sense}), "
            f"{processed} nodes processed, end status {end.get('status') or '- (no end event)'}")


def _value(x: Any) -> str:
    if isinstance(x, bool) or x is None:
        return "-" if x is None else str(x).lower()
    if isinstance(x, int):
        return f"{x:,}"
    if isinstance(x, float):
        if math.isnan(x):
            return "-"
        return f"{x:.4g}"
    return str(x)


def format_findings(findings: list[Any]) -> str:
    """One block per finding: severity and title, the evidence in one line, what to try."""
    if not findings:
        return "No findings: nothing in this run (or model) looks like a known cause of slowness."
    blocks = []
    indent = " " * 7
    for f in findings:
        lines = [f"[{_TAGS[f.severity]}] {f.title}  ({f.code})"]
        evidence = ", ".join(f"{k} {_value(v)}" for k, v in f.evidence.items() if v is not None)
        lines += textwrap.wrap("evidence: " + evidence, WIDTH, initial_indent=indent,
                               subsequent_indent=indent + "  ")
        lines += textwrap.wrap("why: " + f.explanation, WIDTH, initial_indent=indent,
                               subsequent_indent=indent + "  ")
        lines += textwrap.wrap("try: " + f.advice, WIDTH, initial_indent=indent,
                               subsequent_indent=indent + "  ")
        refs = [f"{len(v)} {k if len(v) != 1 else k[:-1]}" for k, v in f.refs.items() if v]
        if refs:
            lines.append(f"{indent}refers to: {', '.join(refs)} (see --json)")
        blocks.append("\n".join(lines))
    return "\n\n".join(blocks)


def _nodes(x: float | None) -> str:
    return "-" if x is None else f"{round(x):,}"


def _secs(x: float | None) -> str:
    if x is None:
        return "-"
    if x < 120:
        return f"{x:.3g} s"
    if x < 7200:
        return f"{x / 60:.3g} min"
    return f"{x / 3600:.3g} h"


def format_forecast(fc: Any) -> str:
    """The forecast in two or three lines."""
    if fc.upto == 0:
        return "forecast: nothing processed yet"
    if fc.finished:
        return f"forecast: the tree is complete ({_nodes(fc.done)} nodes in all)"
    top = ("at least " if fc.high is None else "about ") + _nodes(fc.total_nodes)
    span = "" if fc.high is None else f" (range {_nodes(fc.low)} to {_nodes(fc.high)})"
    lines = [f"forecast after {fc.upto:,} processed nodes: {top} tree nodes in all{span};",
             f"  {_nodes(fc.remaining_nodes)} still to go, {fc.open:,} waiting now"]
    if fc.remaining_seconds is not None:
        rest = f"  about {_secs(fc.remaining_seconds)} more"
        if fc.remaining_seconds_high is not None:
            rest += (f" ({_secs(fc.remaining_seconds_low)} to "
                     f"{_secs(fc.remaining_seconds_high)})")
        lines.append(rest + f" at the recent {_secs(fc.seconds_per_node)} per node")
    methods = ", ".join(f"{m.method} {_nodes(m.total)}" if m.total is not None
                        else f"{m.method} - ({m.note})" for m in fc.methods)
    lines += textwrap.wrap("by method: " + methods, WIDTH, initial_indent="  ",
                           subsequent_indent="    ")
    return "\n".join(lines)
