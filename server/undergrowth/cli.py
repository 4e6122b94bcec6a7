"""The `undergrowth` command. Each subcommand lives in `undergrowth.commands.<name>`
and provides ``register(subparsers)`` and ``run(args) -> int``."""

from __future__ import annotations

import argparse
import importlib
import sys

from . import __version__

# Order is the order shown in `undergrowth --help`.
COMMANDS = ("model", "solve", "check", "schema", "samples", "serve", "diagnose", "compare",
            "report")


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="undergrowth",
        description="Inspect branch-and-bound searches: run, record, check and serve them.",
    )
    parser.add_argument("--version", action="version", version=f"undergrowth {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in COMMANDS:
        try:
            module = importlib.import_module(f"undergrowth.commands.{name}")
        except ModuleNotFoundError as exc:
            if exc.name == f"undergrowth.commands.{name}":
                continue  # not built yet
            raise
        module.register(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "command", None):
        parser.print_help()
        return 2
    try:
        return int(args.run(args) or 0)
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:
        # output piped into `head` or similar: stop quietly, as other tools do
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 0


if __name__ == "__main__":
    sys.exit(main())
