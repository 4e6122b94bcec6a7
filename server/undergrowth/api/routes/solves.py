"""Solves: start one (queued if the slots are full), list them, one job, cancel."""

from __future__ import annotations

from datetime import UTC, datetime
from typing import Any

import anyio
from fastapi import APIRouter

from ...paths import slug
from ...search import SearchSettings
from ..context import Ctx, ServerContext
from ..errors import Invalid, NotFound
from ..ids import check_id, fresh_id
from ..model_files import ModelFile
from ..schemas import Job, SolveAccepted, SolveRequest
from ..status import JobRecord
from ._common import errors

router = APIRouter(prefix="/api/solves", tags=["solves"])


@router.post("", status_code=202, response_model=SolveAccepted, responses=errors(503),
             summary="start a solve of a model; returns the new run's id at once")
async def start_solve(body: SolveRequest,
                      ctx: Ctx) -> dict[str, Any]:
    mf = await solvable_model(ctx, body.model)
    settings, capped = solve_settings(ctx, body)
    record = await submit_solve(ctx, mf, body.model, settings, capped)
    return {"run_id": record.run_id, "state": record.state,
            "node_limit": settings["node_limit"], "time_limit": settings["time_limit"],
            "capped": capped, "job": record.to_dict()}


# The three steps of a solve, shared with the comparison groups (routes/compare.py).
async def solvable_model(ctx: ServerContext, model_id: str) -> ModelFile:
    """The model file; 404 if unknown, 422 ``not-convex`` for a non-convex objective."""
    check_id(model_id, what="model")
    mf = ctx.models.require(model_id)
    report = await anyio.to_thread.run_sync(ctx.models.report, mf)
    if report.get("quadratic") and not report.get("convex"):
        raise Invalid(f"model {model_id!r}: the quadratic objective is not convex, so its "
                      "relaxation gives no valid bound; Undergrowth only searches convex "
                      "objectives", code="not-convex", detail={"model": model_id})
    return mf


def solve_settings(ctx: ServerContext, body: SolveRequest) -> tuple[dict[str, Any], list[str]]:
    """The search settings of a solve with the server's caps applied, and the names of
    the limits that were lowered; 422 ``invalid-settings`` naming the field."""
    s = ctx.settings
    capped = []
    node_limit = body.node_limit or s.node_limit_cap
    if node_limit > s.node_limit_cap:
        node_limit, capped = s.node_limit_cap, [*capped, "node_limit"]
    time_limit = body.time_limit or s.time_limit_cap
    if time_limit > s.time_limit_cap:
        time_limit, capped = s.time_limit_cap, [*capped, "time_limit"]
    settings = {"branching": body.branching, "select": body.select, "node_limit": node_limit,
                "time_limit": float(time_limit), "gap": body.gap, "seed": body.seed,
                "rounding": body.rounding}
    try:
        SearchSettings(**settings)
    except ValueError as exc:
        field = str(exc).split(":", 1)[0]
        raise Invalid(str(exc), code="invalid-settings", detail={"field": field}) from None
    return settings, capped


async def submit_solve(ctx: ServerContext, mf: ModelFile, model_id: str,
                       settings: dict[str, Any], capped: list[str],
                       *, base: str | None = None) -> JobRecord:
    """Hand one solve to the job manager under a fresh run id (``base`` or
    ``<model>.<rule>.<order>.<UTC stamp>``, with ``-2``, ``-3``... if taken)."""
    if base is None:
        stamp = datetime.now(UTC).strftime("%Y%m%dT%H%M%S")
        base = f"{slug(model_id)[:80]}.{settings['branching']}.{settings['select']}.{stamp}"
    run_id = fresh_id(base, ctx.library.taken_ids() | set(ctx.jobs.records))
    record = JobRecord(run_id=run_id, model=model_id, settings=settings,
                       file=f"{run_id}.jsonl.gz", capped=capped)
    spec = {"model_path": str(mf.path), "run_path": str(ctx.runs_dir / record.file),
            "settings": settings}
    await ctx.jobs.submit(record, spec)
    return record


@router.get("", response_model=list[Job], responses=errors(),
            summary="every solve this runs directory has seen, newest first")
async def list_solves(ctx: Ctx) -> list[dict[str, Any]]:
    return [r.to_dict() for r in ctx.jobs.list()]


def _job(ctx: ServerContext, run_id: str) -> JobRecord:
    check_id(run_id)
    record = ctx.jobs.get(run_id)
    if record is None:
        raise NotFound(f"no solve {run_id!r}", detail={"id": run_id})
    return record


@router.get("/{run_id}", response_model=Job, responses=errors(),
            summary="one solve's state")
async def get_solve(run_id: str, ctx: Ctx) -> dict[str, Any]:
    return _job(ctx, run_id).to_dict()


@router.post("/{run_id}/cancel", response_model=Job, responses=errors(409),
             summary="stop a solve: it ends after the current node with a valid run log")
async def cancel_solve(run_id: str,
                       ctx: Ctx) -> dict[str, Any]:
    _job(ctx, run_id)
    record = await ctx.jobs.cancel(run_id)
    return record.to_dict()
