"""`undergrowth model FILE [--json]`: what is in a model file, and what looks wrong."""

from __future__ import annotations

import argparse
import json
import sys

from ..model import Problem, ProblemError
from ..model.checks import (
    ModelWarning,
    ValueRange,
    check_model,
    coefficient_ranges,
    objective_convexity,
    short_number,
)

_GOAL = {"min": "minimise", "max": "maximise"}

# Exit status for a file that cannot be read as a model.
EXIT_BAD_FILE = 2


def register(subparsers: argparse._SubParsersAction) -> None:
    parser = subparsers.add_parser(
        "model",
        help="summarise a model file and check its formulation",
        description="Read a model (MPS, QPS or the JSON model format) and print its size, "
                    "shape, coefficient ranges and formulation warnings.",
    )
    parser.add_argument("file", metavar="FILE", help="model file (.mps, .qps, .json, ...)")
    parser.add_argument("--json", action="store_true",
                        help="print the summary as one JSON object")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    try:
        problem = _read(args.file)
    except (ProblemError, OSError) as exc:  # ModelFormatError is a ProblemError
        print(f"undergrowth model: {exc}", file=sys.stderr)
        return EXIT_BAD_FILE
    report = model_report(problem, file=args.file)
    if args.json:
        print(json.dumps(report, indent=2, ensure_ascii=False))
    else:
        print(format_report(report))
    return 0


def _read(path: str) -> Problem:
    from ..model.io import read_model

    return read_model(path)


def model_report(problem: Problem, *, file: str | None = None) -> dict[str, object]:
    """Everything the command shows, as JSON-ready values (no NaN or inf)."""
    ranges = coefficient_ranges(problem)
    convexity = objective_convexity(problem)
    warnings = check_model(problem)
    report: dict[str, object] = {"file": file}
    report.update(problem.summary())
    report.update(
        general_integers=problem.num_integers - problem.num_binaries,
        continuous=problem.num_cols - problem.num_integers,
        convex=convexity.convex,
        smallest_eigenvalue=convexity.smallest_eigenvalue,
        ranges={
            "matrix": _range(ranges.matrix),
            "objective": _range(ranges.objective),
            "quadratic": _range(ranges.quadratic),
            "bounds": _range(ranges.bounds),
            "row_bounds": _range(ranges.row_bounds),
        },
        warnings=[_warning(w) for w in warnings],
    )
    return report


def _range(r: ValueRange) -> dict[str, object]:
    return {"min": r.min, "max": r.max, "ratio": r.ratio, "count": r.count}


def _warning(w: ModelWarning) -> dict[str, object]:
    return {"code": w.code, "message": w.message, "rows": list(w.rows),
            "columns": list(w.columns)}


def format_report(report: dict[str, object]) -> str:
    """The readable block: one fact a line, labels in a left column."""
    r = report
    title = str(r["name"]) + (f"  ({r['file']})" if r.get("file") else "")
    lines = [title]

    def add(label: str, text: str) -> None:
        lines.append(f"  {label:<11} {text}")

    add("objective", f"{_GOAL[str(r['sense'])]}, {_shape(r)}")
    add("columns", f"{r['columns']}: {r['integers']} integer ({r['binaries']} binary, "
                   f"{r['general_integers']} general), {r['continuous']} continuous")
    add("rows", f"{r['rows']}, with {r['nonzeros']} nonzeros")
    ranges = r["ranges"]
    assert isinstance(ranges, dict)
    labels = (("matrix", "matrix"), ("objective", "objective"), ("quadratic", "quadratic"),
              ("bounds", "col bounds"), ("row_bounds", "row bounds"))
    first = True
    for key, label in labels:
        if key == "quadratic" and not r["quadratic"]:
            continue
        add("|values|" if first else "", f"{label:<10} {_span(ranges[key])}")
        first = False
    warnings = r["warnings"]
    assert isinstance(warnings, list)
    if not warnings:
        add("warnings", "none")
    else:
        add("warnings", str(len(warnings)))
        lines += [f"    {w['code']}: {w['message']}" for w in warnings]
    return "\n".join(lines)


def _shape(r: dict[str, object]) -> str:
    if not r["quadratic"]:
        return "linear"
    want = "convex" if r["sense"] == "min" else "concave"
    if r["convex"]:
        return f"quadratic, {want}"
    of = "Q" if r["sense"] == "min" else "-Q"
    return (f"quadratic, NOT {want} (smallest eigenvalue of {of}: "
            f"{short_number(_float(r['smallest_eigenvalue']))})")


def _span(rng: dict[str, object]) -> str:
    if rng["min"] is None:
        return "(no nonzero finite values)"
    low, high = _float(rng["min"]), _float(rng["max"])
    text = f"{short_number(low)} .. {short_number(high)}"
    if low != high:
        text += f"  (ratio {short_number(_float(rng['ratio']))})"
    return text


def _float(x: object) -> float | None:
    return None if x is None else float(x)  # type: ignore[arg-type]
