"""`undergrowth samples`: list the bundled demo runs, or rebuild them."""

from __future__ import annotations

import argparse
from pathlib import Path

from ..paths import SAMPLE_RUNS


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser(
        "samples", help="list or rebuild the bundled demo models and runs",
        description="The demo scenario (an invented food co-operative) and its recorded runs. "
                    "--rebuild regenerates the models and runs deterministically.")
    p.add_argument("--rebuild", action="store_true", help="regenerate models and runs")
    p.add_argument("--dir", default=str(SAMPLE_RUNS),
                   help=f"where the samples live (default: {SAMPLE_RUNS})")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from ..samples import PLAN, rebuild

    directory = Path(args.dir)
    if args.rebuild:
        rebuild(directory)
        return 0
    for plan in PLAN:
        path = directory / plan.file_name
        mark = "" if path.exists() else "   (missing: run with --rebuild)"
        print(f"{plan.model:<22}{plan.branching:<17}{plan.select:<14}{path.name}{mark}")
    return 0
