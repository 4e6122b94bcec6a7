"""Comparisons: start a group of solves of one model (several branching rules, node
orders, seeds), follow and cancel it, and the comparison table of a group or of any
runs picked from the library.

Each member of a group is an ordinary solve handed to the job manager, so the
server's cap on concurrent worker processes (``max_solves``) and its queue hold for
groups too; a group that would not fit in the queue is refused whole (503) before
any member starts.
"""

from __future__ import annotations

from datetime import UTC, datetime
from typing import Annotated, Any

import anyio
from fastapi import APIRouter, Query
from pydantic import BaseModel, ConfigDict, Field

from ...analysis.compare import (
    ROW_KEYS,
    branched_variables,
    branching_overlap,
    rows_for_tables,
    summary,
)
from ...paths import slug
from ...search import BRANCHING_RULES, NODE_ORDERS
from ..context import Ctx, ServerContext
from ..errors import BadRequest, Busy, Conflict, Invalid
from ..groups import GroupStore, describe, new_group
from ..ids import check_id, fresh_id
from ..schemas import Branching, NodeOrder, SolveRequest
from ._common import errors
from .solves import solvable_model, solve_settings, submit_solve

router = APIRouter(tags=["comparisons"])

MAX_GROUP_RUNS = 12  # members of one group: rules × orders × seeds
MAX_SEEDS = 5
MAX_COMPARE_RUNS = 8  # runs in one ad-hoc comparison table
TOP_VARIABLES = 10  # most-branched variables listed per run


# ------------------------------------------------------------------ shapes
class GroupRequest(BaseModel):
    model_config = ConfigDict(extra="forbid")

    model: str = Field(description="a model id from GET /api/models")
    branching: list[Branching] = Field(
        min_length=1, max_length=len(BRANCHING_RULES),
        description="branching rules to compare (a repeated name counts once)")
    select: list[NodeOrder] = Field(
        default=["hybrid"], min_length=1, max_length=len(NODE_ORDERS),
        description="node orders to compare")
    seeds: int = Field(default=1, ge=1, le=MAX_SEEDS, description="seeds 0 … seeds−1")
    node_limit: int | None = Field(default=None, ge=1, description="per run; capped")
    time_limit: float | None = Field(default=None, gt=0, description="per run, seconds; capped")
    gap: float = Field(default=1e-4, ge=0, le=1e6)
    rounding: bool = True
    name: str | None = Field(default=None, max_length=120, description="a label for people")


class GroupMember(BaseModel):
    run_id: str
    branching: str | None
    select: str | None
    seed: int | None
    state: str = Field(description="the member's job state, or missing")
    log: bool = Field(description="its run log exists (its tree and series can be asked for)")
    end_status: str | None
    nodes: int
    objective: float | None
    dual_bound: float | None
    gap: float | None
    reason: str | None


class GroupOut(BaseModel):
    id: str
    name: str
    created: str | None
    model: str | None
    branching: list[str]
    select: list[str]
    seeds: list[int]
    settings: dict[str, Any]
    state: str = Field(description="running, done, cancelled or incomplete")
    ended: int = Field(description="members no longer queued or running")
    total: int
    members: list[GroupMember]


class BranchedVars(BaseModel):
    run_id: str
    branchings: int
    variables: int
    top: list[dict[str, Any]] = Field(description="[{var, name, count, share}], most first")


class CompareTable(BaseModel):
    group: str | None
    state: str | None
    runs: list[str] = Field(description="run ids, in row order")
    pending: list[str] = Field(description="group members without a run log: queued, "
                                           "cancelled before they began, or failed to start")
    rows: list[dict[str, Any]] = Field(description="the keys of `undergrowth compare --json` "
                                                   "plus run_id")
    marks: list[dict[str, bool]] = Field(description="per row: best value of its problem")
    lower_is_better: list[str]
    problems: int
    means: list[dict[str, Any]]
    shifts: dict[str, float]
    profiles: dict[str, Any]
    branched: list[BranchedVars]
    overlap: dict[str, Any] | None = Field(
        description="overlap of the runs' most-branched variables (runs of one model)")


# ------------------------------------------------------------------ helpers
def _store(ctx: ServerContext) -> GroupStore:
    return GroupStore(ctx.runs_dir)


def _describe(ctx: ServerContext, group: dict[str, Any]) -> dict[str, Any]:
    return describe(group, ctx.jobs, lambda run_id: ctx.library.find(run_id) is not None)


def _unique(values: list[str]) -> list[str]:
    return list(dict.fromkeys(values))


def compare_table(ctx: ServerContext, run_ids: list[str], *, group: str | None = None,
                  state: str | None = None) -> dict[str, Any]:
    """The comparison table of these runs (blocking). A group's members without a run
    log are listed under ``pending``; outside a group such a run is 404, and an
    unreadable run is 422."""
    files, pending = [], []
    for run_id in run_ids:
        rf = ctx.library.find(run_id)
        if rf is None:
            if group is not None:  # queued, cancelled before it began, or never started
                pending.append(run_id)
                continue
            ctx.library.require(run_id)  # 404 naming the run
        files.append(rf)
    tables = [ctx.library.open_table(rf) for rf in files]
    rows = rows_for_tables(tables, run_logs=[rf.path.name for rf in files]) if tables else []
    for row, rf in zip(rows, files, strict=True):
        row["run_id"] = rf.id
        assert set(ROW_KEYS) <= set(row)
    data = summary(rows)
    branched = [{"run_id": rf.id, **branched_variables(t, top=TOP_VARIABLES)}
                for rf, t in zip(files, tables, strict=True)]
    one_model = len({r["model"] for r in rows}) == 1
    overlap = branching_overlap([[v["name"] for v in b["top"]] for b in branched]) \
        if one_model and len(branched) >= 2 else None
    return {"group": group, "state": state, "runs": [rf.id for rf in files],
            "pending": pending, **data, "branched": branched, "overlap": overlap}


# ------------------------------------------------------------------ groups
class GroupDeleted(BaseModel):
    id: str
    deleted: bool
    runs: list[str]  # the member runs deleted with it


@router.post("/api/groups", status_code=202, response_model=GroupOut, responses=errors(503),
             summary="start a comparison: one model under several rules, orders and seeds")
async def start_group(body: GroupRequest, ctx: Ctx) -> dict[str, Any]:
    rules, orders = _unique(list(body.branching)), _unique(list(body.select))
    seeds = list(range(body.seeds))
    combos = [(r, o, s) for r in rules for o in orders for s in seeds]
    if not 2 <= len(combos) <= MAX_GROUP_RUNS:
        raise Invalid(f"a group has 2 to {MAX_GROUP_RUNS} runs (rules × orders × seeds); "
                      f"this one has {len(combos)}", code="invalid-group",
                      detail={"field": "branching", "runs": len(combos),
                              "max": MAX_GROUP_RUNS})
    mf = await solvable_model(ctx, body.model)
    plans = []
    for rule, order, seed in combos:
        one = SolveRequest(model=body.model, branching=rule, select=order,
                           node_limit=body.node_limit, time_limit=body.time_limit,
                           gap=body.gap, seed=seed, rounding=body.rounding)
        plans.append(solve_settings(ctx, one))
    room = ctx.jobs.room()
    if room < len(combos):
        raise Busy(f"this group needs {len(combos)} solve slots or queue places and the "
                   f"server has {room} free; try again when some solves finish",
                   code="queue-full", detail={"runs": len(combos), "room": room})
    stamp = datetime.now(UTC).strftime("%Y%m%dT%H%M%S")
    store = _store(ctx)
    group_id = fresh_id(f"compare-{slug(body.model)[:60]}-{stamp}", set(store.ids()))
    members = []
    for (rule, order, seed), (settings, capped) in zip(combos, plans, strict=True):
        base = f"{slug(body.model)[:60]}.{rule}.{order}.s{seed}.{stamp}"
        record = await submit_solve(ctx, mf, body.model, settings, capped, base=base)
        members.append({"run_id": record.run_id, "branching": rule, "select": order,
                        "seed": seed, "run_log": record.file})
    group = new_group(group_id=group_id, model=body.model, source=mf.path.name,
                      branching=rules, select=orders, seeds=seeds,
                      settings=plans[0][0], members=members, label=body.name)
    store.write(group)
    return _describe(ctx, group)


@router.get("/api/groups", response_model=list[GroupOut], responses=errors(),
            summary="every comparison group of the runs directory, newest first")
async def list_groups(ctx: Ctx) -> list[dict[str, Any]]:
    groups = await anyio.to_thread.run_sync(_store(ctx).all)
    return [_describe(ctx, g) for g in groups]


@router.get("/api/groups/{group_id}", response_model=GroupOut, responses=errors(),
            summary="one group: its plan, each member's state and figures")
async def get_group(group_id: str, ctx: Ctx) -> dict[str, Any]:
    return _describe(ctx, _store(ctx).require(group_id))


@router.post("/api/groups/{group_id}/cancel", response_model=GroupOut, responses=errors(409),
             summary="stop every member still queued or running")
async def cancel_group(group_id: str, ctx: Ctx) -> dict[str, Any]:
    group = _store(ctx).require(group_id)
    ids = [str(r.get("run_id")) for r in group["runs"]]
    active = [i for i in ids if ctx.jobs.is_active(i)]
    if not active:
        raise Conflict(f"group {group_id!r} has no member queued or running",
                       detail={"id": group_id, "state": _describe(ctx, group)["state"]})
    # Queued members first, so a running one that stops does not hand its slot to them.
    for run_id in sorted(active, key=lambda i: ctx.jobs.get(i).state != "queued"):
        if ctx.jobs.is_active(run_id):
            await ctx.jobs.cancel(run_id)
    return _describe(ctx, group)


@router.delete("/api/groups/{group_id}", response_model=GroupDeleted, responses=errors(409),
               summary="delete a finished group: its member runs and its group file")
async def delete_group(group_id: str, ctx: Ctx) -> dict[str, Any]:
    store = _store(ctx)
    group = store.require(group_id)
    ids = [str(r.get("run_id")) for r in group["runs"] if isinstance(r, dict)]
    active = [i for i in ids if ctx.jobs.is_active(i)]
    if active:
        raise Conflict(f"group {group_id!r} still has {len(active)} member(s) queued or "
                       "running; cancel it first", detail={"id": group_id, "active": active})
    deleted = []
    for run_id in ids:
        rf = ctx.library.find(run_id)
        if rf is not None and rf.writable:
            ctx.library.delete(rf)
            deleted.append(run_id)
        ctx.jobs.forget(run_id)
    store.delete(group_id)
    return {"id": group_id, "deleted": True, "runs": deleted}


@router.get("/api/groups/{group_id}/table", response_model=CompareTable, responses=errors(),
            summary="the group's comparison table: rows, best marks, means, variables")
async def group_table(group_id: str, ctx: Ctx) -> dict[str, Any]:
    group = _store(ctx).require(group_id)
    state = _describe(ctx, group)["state"]
    ids = [str(r.get("run_id")) for r in group["runs"]]
    return await anyio.to_thread.run_sync(
        lambda: compare_table(ctx, ids, group=group_id, state=state))


# ------------------------------------------------------------------ any runs
@router.get("/api/compare", response_model=CompareTable, responses=errors(),
            summary="the comparison table of runs picked from the library")
async def compare_runs(
    ctx: Ctx,
    run: Annotated[list[str], Query(description="a run id; repeat for each run (2 to 8)")],
) -> dict[str, Any]:
    ids = _unique(run)
    for run_id in ids:
        check_id(run_id)
    if len(ids) < 2:
        raise BadRequest("a comparison needs at least 2 different runs",
                         code="too-few-runs", detail={"runs": len(ids)})
    if len(ids) > MAX_COMPARE_RUNS:
        raise BadRequest(f"a comparison takes at most {MAX_COMPARE_RUNS} runs, got {len(ids)}",
                         code="too-many-runs", detail={"runs": len(ids),
                                                       "max": MAX_COMPARE_RUNS})
    return await anyio.to_thread.run_sync(lambda: compare_table(ctx, ids))
