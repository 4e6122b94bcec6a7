"""`undergrowth report RUN [RUN...] -o FILE.html [--model FILE]`: one self-contained
HTML page reviewing one or more runs (summary, findings, forecast, bounds chart,
tree picture, notes and, for two or more runs, a comparison table).

Each run's model (for the model checks among the findings) is ``--model FILE``
when its size matches the run's model, else ``models/<model name>.mps`` beside
the run, as for `undergrowth diagnose`. Notes come from each run's notes sidecar.
Exit status: 0 written, 2 a file could not be read or written.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

EXIT_OK, EXIT_BAD_FILE = 0, 2


def register(subparsers: Any) -> None:
    parser = subparsers.add_parser(
        "report",
        help="write one self-contained HTML review of one or more runs",
        description=(
            "Write a single HTML file that opens offline, without a server: for each run "
            "its summary, findings, tree-size forecast, bounds chart, a picture of the tree "
            "and the reviewers' notes; for two or more runs also a comparison table."),
    )
    parser.add_argument("runs", metavar="RUN", nargs="+",
                        help="run logs (.jsonl, .jsonl.gz) or CSV node tables")
    parser.add_argument("-o", "--output", metavar="FILE.html", required=True,
                        help="where to write the report")
    parser.add_argument("--model", metavar="FILE", default=None,
                        help="the runs' model (MPS, QPS or JSON), used for every run whose "
                             "model has its size; default: models/<model name>.mps beside "
                             "each run, if present")
    parser.add_argument("--title", default=None, help="the page's title")
    parser.set_defaults(run=run)


def _fail(message: str) -> int:
    print(f"undergrowth report: {message}", file=sys.stderr)
    return EXIT_BAD_FILE


def run(args: argparse.Namespace) -> int:
    from ..analysis.layout import layout_for_table
    from ..analysis.table import RunTable
    from ..model import ProblemError, read_model
    from ..report import ReportRun, build_report, write_report
    from ..runlog.errors import RunLogError
    from ..runlog.notes import read_notes
    from .diagnose import _mismatch, _model_beside  # the same model lookup as `diagnose`

    given = None
    if args.model is not None:
        try:
            given = read_model(args.model)
        except (ProblemError, OSError) as exc:  # ModelFormatError is a ProblemError
            return _fail(str(exc))
    runs: list[ReportRun] = []
    used_given = False
    for path in args.runs:
        try:
            table = RunTable.open(path)
        except (RunLogError, OSError) as exc:
            return _fail(str(exc))
        problem, note = None, "model checks skipped: no model given and none found beside " \
                              "the run (models/<model name>.mps)"
        if given is not None and _mismatch(given, table) is None:
            problem, note, used_given = given, f"model checks from {args.model}", True
        else:
            found = _model_beside(path, table)
            if found is not None:
                try:
                    candidate = read_model(str(found))
                except (ProblemError, OSError) as exc:
                    note = f"model beside the run not used: {exc}"
                else:
                    why = _mismatch(candidate, table)
                    if why is None:
                        problem, note = candidate, f"model checks from {found} (found beside " \
                                                   "the run)"
                    else:
                        note = f"model beside the run not used: {why}"
        try:
            notes = read_notes(Path(path))
        except (ValueError, OSError) as exc:  # a damaged sidecar names its file and line
            return _fail(str(exc))
        try:
            layout = layout_for_table(table)
        except ValueError as exc:
            return _fail(f"{path}: {exc}")
        runs.append(ReportRun(table=table, label=Path(path).name, problem=problem,
                              model_note=note, notes=notes, layout=layout))
    if given is not None and not used_given:
        return _fail(f"{args.model}: its size matches none of the runs' models: not their model")
    html = build_report(runs, title=args.title)
    try:
        size = write_report(args.output, html)
    except OSError as exc:
        return _fail(f"{args.output}: cannot write the report ({exc.strerror or exc})")
    print(f"wrote {args.output}: {len(runs)} run{'s' if len(runs) != 1 else ''}, "
          f"{size / 1024:,.0f} KiB")
    return EXIT_OK
