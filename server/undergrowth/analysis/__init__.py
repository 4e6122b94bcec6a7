"""Analysis of recorded runs. `table.RunTable` holds a run as numpy columns.

Submodules load on first use so importing the package stays cheap.
"""

from __future__ import annotations

import importlib
from typing import Any

_EXPORTS = {"RunTable": "table"}


def __getattr__(name: str) -> Any:
    module = _EXPORTS.get(name)
    if module is None:
        raise AttributeError(f"module 'undergrowth.analysis' has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{module}"), name)
