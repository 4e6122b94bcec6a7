"""`undergrowth check FILE`: validate a run log or CSV node table and summarise it.

Exit status: 0 valid, 1 valid with warnings, 2 invalid (the reason on stderr).
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from typing import Any

EXIT_VALID, EXIT_WARNINGS, EXIT_INVALID = 0, 1, 2


def register(subparsers: Any) -> None:
    parser = subparsers.add_parser(
        "check",
        help="validate a run log and print a summary",
        description=(
            "Validate a run log (.jsonl, .jsonl.gz) or CSV node table and summarise it. "
            "Exit status: 0 valid, 1 valid with warnings, 2 invalid."
        ),
    )
    parser.add_argument("file", metavar="FILE", help="run log or CSV node table")
    parser.add_argument("--lenient", action="store_true", help="skip bad lines with a warning")
    parser.add_argument("--json", action="store_true", help="print the summary as JSON")
    parser.set_defaults(run=run)


def _number(x: Any) -> float | None:
    if x is None:
        return None
    x = float(x)
    return x if math.isfinite(x) else None


def summarise(table: Any) -> dict[str, Any]:
    """The figures `check` prints, from a `RunTable`."""
    from ..runlog.codes import gap

    end = table.end or {}
    primal = _number(end.get("objective"))
    if primal is None and len(table.incumbents):
        primal = _number(table.incumbents.objective[-1])
    dual = _number(end.get("dual_bound"))
    if dual is None and len(table.progress):
        dual = _number(table.progress.dual_bound[-1])
    return {
        "file": table.path,
        "model": table.header["model"]["name"],
        "sense": table.sense,
        "nodes": len(table),
        "by_status": table.count_by_status(),
        "incumbents": len(table.incumbents),
        "primal_bound": primal,
        "dual_bound": dual,
        "gap": gap(primal, dual),
        "end_status": end.get("status"),
        "warnings": table.warnings,
        "skipped_lines": table.skipped,
    }


def _fmt(x: float | None) -> str:
    return "-" if x is None else f"{x:.10g}"


def _text(summary: dict[str, Any]) -> str:
    lines = [
        f"{summary['file']}: valid run log of model {summary['model']!r} ({summary['sense']})",
        f"  nodes        {summary['nodes']}",
    ]
    for status, count in summary["by_status"].items():
        if count:
            lines.append(f"    {status:<11}{count}")
    gap = summary["gap"]
    lines += [
        f"  incumbents   {summary['incumbents']}",
        f"  primal bound {_fmt(summary['primal_bound'])}",
        f"  dual bound   {_fmt(summary['dual_bound'])}",
        f"  gap          {'-' if gap is None else f'{100 * gap:.4g} %'}",
        f"  end status   {summary['end_status'] or '- (no end event)'}",
    ]
    if summary["skipped_lines"]:
        lines.append(f"  skipped      {summary['skipped_lines']} lines (--lenient)")
    if summary["warnings"]:
        lines.append(f"  warnings     {len(summary['warnings'])}")
        lines += [f"    - {w}" for w in summary["warnings"]]
    return "\n".join(lines)


def run(args: argparse.Namespace) -> int:
    from ..analysis.table import RunTable
    from ..runlog.errors import RunLogError

    try:
        # A check reads the whole file, never a cached table.
        table = RunTable.open(args.file, lenient=args.lenient, use_cache=False)
    except (RunLogError, OSError) as exc:
        print(f"invalid: {exc}", file=sys.stderr)
        return EXIT_INVALID
    summary = summarise(table)
    if args.json:
        print(json.dumps(summary, indent=2))
    else:
        print(_text(summary))
    return EXIT_WARNINGS if summary["warnings"] else EXIT_VALID
