"""`undergrowth schema`: print the JSON Schema of a run-log line."""

from __future__ import annotations

import argparse
import json
import sys
from typing import Any


def render() -> str:
    """The schema document as written to docs/run-log.schema.json."""
    from ..runlog.schema import json_schema

    return json.dumps(json_schema(), indent=2, ensure_ascii=False) + "\n"


def register(subparsers: Any) -> None:
    parser = subparsers.add_parser(
        "schema",
        help="print the JSON Schema of the run-log format",
        description="Print the JSON Schema that every line of a run log matches.",
    )
    parser.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of stdout")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    text = render()
    if args.output:
        with open(args.output, "w", encoding="utf-8") as f:
            f.write(text)
    else:
        sys.stdout.write(text)
    return 0
