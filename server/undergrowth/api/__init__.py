"""The Undergrowth server: `create_app(ApiSettings(...))` returns the FastAPI app.

Submodules load on first use, so a solve worker (`api._worker`) imports the
engine without FastAPI.
"""

from __future__ import annotations

import importlib
from typing import Any

_EXPORTS = {"create_app": "app", "ApiSettings": "settings", "settings_table": "settings"}

__all__ = sorted(_EXPORTS)


def __getattr__(name: str) -> Any:
    module = _EXPORTS.get(name)
    if module is None:
        raise AttributeError(f"module 'undergrowth.api' has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{module}"), name)
