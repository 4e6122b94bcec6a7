"""The self-contained review report (`undergrowth report`, `GET /api/report`).

`build_report(runs)` lays out one HTML page from the analysis package's figures;
`tree_svg` and `bounds_svg` draw its pictures as inline SVG; `palette` holds the
status colours and shapes shared with the web legend. See docs/report.md.
"""

from __future__ import annotations

import os
import secrets
from pathlib import Path

from .page import ReportRun, build_report

__all__ = ["ReportRun", "build_report", "write_report"]


def write_report(path: str | os.PathLike[str], html: str) -> int:
    """Write the page to ``path`` whole or not at all (a temporary file beside it, then
    a rename); returns the bytes written."""
    target = Path(path)
    data = html.encode("utf-8")
    tmp = target.with_name(f".{target.name}.{secrets.token_hex(4)}.tmp")
    try:
        with open(tmp, "xb") as f:
            f.write(data)
        os.replace(tmp, target)
    finally:
        tmp.unlink(missing_ok=True)
    return len(data)
