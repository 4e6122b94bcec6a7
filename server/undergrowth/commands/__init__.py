"""Subcommands of the `undergrowth` command line (one module each)."""
