"""The status sidecar of a solve: ``<run id>.status.json`` beside its run log.

The worker process owns the run log; the server owns this small file, so a
worker that dies leaves a log that is still a valid prefix, and the sidecar
says what happened. States::

    queued -> running -> finished | cancelled | failed
    queued | running  -> interrupted   (the server stopped first)
    queued            -> cancelled     (no run log was ever written)
"""

from __future__ import annotations

import contextlib
import json
import os
import secrets
from dataclasses import asdict, dataclass, field
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

__all__ = ["ACTIVE_STATES", "JOB_STATES", "STATUS_SUFFIX", "JobRecord", "now_iso",
           "read_status", "status_path", "write_status"]

JOB_STATES = ("queued", "running", "finished", "failed", "cancelled", "interrupted")
ACTIVE_STATES = frozenset({"queued", "running"})
STATUS_SUFFIX = ".status.json"


def now_iso() -> str:
    return datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%S.%fZ")


@dataclass
class JobRecord:
    """What the server knows about one solve (also what `GET /api/solves` lists)."""

    run_id: str
    model: str
    settings: dict[str, Any]
    state: str = "queued"
    reason: str | None = None
    file: str | None = None  # run-log file name inside the runs directory
    created: str = field(default_factory=now_iso)
    started: str | None = None
    finished: str | None = None
    pid: int | None = None
    nodes: int = 0
    end_status: str | None = None
    objective: float | None = None
    dual_bound: float | None = None
    gap: float | None = None
    capped: list[str] = field(default_factory=list)  # limits lowered to the server's caps

    def to_dict(self) -> dict[str, Any]:
        return asdict(self)

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> JobRecord:
        known = {k: data[k] for k in cls.__dataclass_fields__ if k in data}
        record = cls(**known)
        if record.state not in JOB_STATES:
            raise ValueError(f"unknown job state {record.state!r}")
        return record


def status_path(runs_dir: Path, run_id: str) -> Path:
    return runs_dir / f"{run_id}{STATUS_SUFFIX}"


def read_status(path: Path) -> JobRecord | None:
    """The record in ``path``; None if missing or unreadable (it is only a sidecar)."""
    try:
        return JobRecord.from_dict(json.loads(path.read_text(encoding="utf-8")))
    except (OSError, ValueError, TypeError):
        return None


def write_status(path: Path, record: JobRecord) -> None:
    """Replace ``path`` atomically: a reader never sees half a record."""
    tmp = path.with_name(f".{path.name}.{secrets.token_hex(4)}.tmp")
    try:
        tmp.write_text(json.dumps(record.to_dict(), allow_nan=False, default=_plain),
                       encoding="utf-8")
        os.replace(tmp, path)
    finally:
        with contextlib.suppress(OSError):
            tmp.unlink()


def _plain(value: Any) -> Any:
    tolist = getattr(value, "tolist", None)
    if tolist is not None:
        return tolist()
    raise TypeError(f"cannot store a {type(value).__name__} in a status file")
