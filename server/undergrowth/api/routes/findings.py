"""Findings and the tree-size forecast for one run (the analysis package does the work)."""

from __future__ import annotations

import threading
import time
from collections import OrderedDict
from typing import Any

import anyio
from fastapi import APIRouter
from pydantic import BaseModel

from ...analysis.findings import diagnose
from ...analysis.forecast import backtest, forecast
from ..context import Ctx, ServerContext
from ..ids import check_id
from ..library import RunFile, read_header_line
from ._common import errors

router = APIRouter(prefix="/api/runs", tags=["findings"])


class FindingsOut(BaseModel):
    run: str
    model: str | None  # the model id whose checks were included, if one was found
    findings: list[dict[str, Any]]
    forecast: dict[str, Any] | None
    backtest: list[dict[str, Any]] | None  # finished runs only: forecasts at 10/25/50%


_problems: dict[str, tuple[tuple[int, int] | None, Any]] = {}
_lock = threading.Lock()


def _problem_for(ctx: ServerContext, name: str) -> tuple[str | None, Any]:
    """The run's model from the model library (same id as the header's model name), if
    it is there and readable; models are memoised per file version."""
    from ...model import ProblemError, read_model

    try:
        mf = ctx.models.find(name)
    except Exception:  # an id the library refuses: no model, still a valid answer
        return None, None
    if mf is None:
        return None, None
    stamp = mf.stamp()
    with _lock:
        memo = _problems.get(str(mf.path))
    if memo is not None and memo[0] == stamp:
        return mf.id, memo[1]
    try:
        problem = read_model(str(mf.path))
    except (ProblemError, OSError):
        return None, None
    with _lock:
        _problems[str(mf.path)] = (stamp, problem)
    return mf.id, problem


def _findings(ctx: ServerContext, rf: RunFile) -> dict[str, Any]:
    table = ctx.library.open_table(rf)
    name = str((table.header.get("model") or {}).get("name") or "")
    model_id, problem = _problem_for(ctx, name) if name else (None, None)
    if problem is not None and (problem.num_cols != int(table.header["model"].get("columns") or 0)):
        model_id, problem = None, None  # same name, different model: skip its checks
    found = [f.to_dict() for f in diagnose(table, problem)]
    fc = forecast(table)
    try:
        bt = [p.to_dict() for p in backtest(table)]
    except ValueError:
        bt = None  # unfinished: the true size is unknown
    return {"run": rf.id, "model": model_id, "findings": found,
            "forecast": fc.to_dict() if fc is not None else None, "backtest": bt}


# One computation per run at a time, shared: a live run is read afresh on every request
# (1.8 s of the 2 s a request takes at 220k nodes is reading the growing file), so
# several viewers polling one solve must not each start their own. A request takes
# the result of a computation that started after it arrived, or one made from the
# same file version and model file; otherwise it computes. At most RESULT_MEMO runs.
RESULT_MEMO = 8


class _Shared:
    def __init__(self) -> None:
        self.lock = threading.Lock()
        self.key: tuple[Any, ...] | None = None
        self.started = -1.0
        self.result: dict[str, Any] | None = None


_shared: OrderedDict[str, _Shared] = OrderedDict()
_shared_lock = threading.Lock()


def _version(ctx: ServerContext, rf: RunFile) -> tuple[Any, ...]:
    """What the answer depends on: the run file's version and its model file's."""
    header = read_header_line(rf.path) or {}
    name = str((header.get("model") or {}).get("name") or "")
    model_stamp = None
    if name:
        try:
            mf = ctx.models.find(name)
        except Exception:  # an id the library refuses: no model, as in _problem_for
            mf = None
        model_stamp = (str(mf.path), mf.stamp()) if mf is not None else None
    return rf.stamp(), model_stamp


def _findings_shared(ctx: ServerContext, rf: RunFile) -> dict[str, Any]:
    asked = time.monotonic()
    with _shared_lock:
        entry = _shared.setdefault(str(rf.path), _Shared())
        _shared.move_to_end(str(rf.path))
        while len(_shared) > RESULT_MEMO:
            _shared.popitem(last=False)
    with entry.lock:
        key = _version(ctx, rf)
        if entry.result is not None and (entry.started >= asked or entry.key == key):
            return entry.result
        started = time.monotonic()
        result = _findings(ctx, rf)
        entry.key, entry.started, entry.result = key, started, result
        return result


@router.get("/{run_id}/findings", response_model=FindingsOut, responses=errors(),
            summary="what the search says about the model, and how long it still needs")
async def get_findings(run_id: str, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_findings_shared, ctx, rf)
