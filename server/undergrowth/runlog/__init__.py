"""The run log: an open, versioned JSON Lines format for branch-and-bound searches.

Submodules load on first use, so ``import undergrowth.runlog.writer`` (what the
search engine does) pulls in nothing beyond the standard library.

- `writer.RunLogWriter`: append events to ``.jsonl`` / ``.jsonl.gz``
- `reader.read_run`, `reader.RunLogReader`: validate and read back
- `schema`: pydantic models of every line, `schema.json_schema`
- `csvtable`: import a CSV node table
- `recorder.Recorder`: record your own search
"""

from __future__ import annotations

import importlib
from typing import Any

_EXPORTS = {
    "RunLogWriter": "writer",
    "RunLogError": "errors",
    "RunLogVersionError": "errors",
    "RunLog": "reader",
    "RunLogReader": "reader",
    "read_run": "reader",
    "json_schema": "schema",
    "csv_to_events": "csvtable",
    "import_csv": "csvtable",
    "Recorder": "recorder",
    "FORMAT": "codes",
    "VERSION": "codes",
    "STATUSES": "codes",
}

__all__ = sorted(_EXPORTS)


def __getattr__(name: str) -> Any:
    module = _EXPORTS.get(name)
    if module is None:
        raise AttributeError(f"module 'undergrowth.runlog' has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{module}"), name)
