"""Where Undergrowth keeps things on disk."""

from __future__ import annotations

import os
import re
from datetime import UTC, datetime
from pathlib import Path

PACKAGE_ROOT = Path(__file__).resolve().parent
# The repository checkout (server/undergrowth -> repo); sample runs live there.
REPO_ROOT = PACKAGE_ROOT.parent.parent
SAMPLE_RUNS = REPO_ROOT / "sample_runs"
WEB_ROOT = REPO_ROOT / "web"


def user_runs_dir() -> Path:
    """The writable runs directory: ``$UNDERGROWTH_RUNS``, else
    ``$XDG_DATA_HOME/undergrowth/runs`` (``~/.local/share/undergrowth/runs``)."""
    env = os.environ.get("UNDERGROWTH_RUNS")
    if env:
        return Path(env).expanduser()
    base = os.environ.get("XDG_DATA_HOME") or str(Path.home() / ".local" / "share")
    return Path(base) / "undergrowth" / "runs"


def slug(text: str) -> str:
    s = re.sub(r"[^A-Za-z0-9._-]+", "-", text).strip("-.")
    return s or "run"


def new_run_path(directory: Path, model_name: str, branching: str, select: str) -> Path:
    """A fresh run-log name: ``<model>.<rule>.<order>.<UTC time>.jsonl.gz``."""
    stamp = datetime.now(UTC).strftime("%Y%m%dT%H%M%S")
    base = f"{slug(model_name)}.{branching}.{select}.{stamp}"
    path = directory / f"{base}.jsonl.gz"
    k = 2
    while path.exists():
        path = directory / f"{base}-{k}.jsonl.gz"
        k += 1
    return path
