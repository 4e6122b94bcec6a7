"""Undergrowth: an inspector for branch-and-bound searches."""

__version__ = "0.1.0"
