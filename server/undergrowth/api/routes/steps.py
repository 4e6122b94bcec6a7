"""Narrated steps of a run, in processing order (the walkthrough's source).

The narration itself is `analysis.narration.Walk`; this route feeds it the node
fields the table lacks (the cached node extras), the run's notes, and the node
ids its findings point at, and pages through the steps.
"""

from __future__ import annotations

import threading
import weakref
from typing import Annotated, Any

import anyio
from fastapi import APIRouter, Query
from pydantic import BaseModel

from ...analysis.narration import Walk
from ...analysis.table import RunTable
from ..context import Ctx, ServerContext
from ..ids import check_id
from ..library import RunFile
from ..nodeinfo import NodeExtras, node_events
from ._common import errors
from .notes import run_notes

__all__ = ["MAX_STEPS", "router"]

router = APIRouter(prefix="/api/runs", tags=["walkthrough"])
MAX_STEPS = 500  # per request: a page the browser narrates without a pause


class StepOut(BaseModel):
    step: int  # 0-based position in processing order (the UI shows step + 1)
    order: int  # the processing order the log recorded
    node: int
    parent: int | None
    depth: int
    status: str
    sentences: list[str]
    incumbent: float | None  # after the step, model's own sense
    dual_bound: float | None
    gap: float | None
    open: int
    new_incumbent: bool
    prune: bool
    finding: bool
    notes: list[str]  # ids of the notes shown at this step


class StepsOut(BaseModel):
    run: str
    total: int  # steps in the run (relaxations solved)
    start: int
    steps: list[StepOut]
    incumbent_steps: list[int]  # steps that found a new incumbent
    finding_steps: list[int]  # steps whose node a finding refers to
    note_steps: list[int]  # steps a note is attached to
    sense: str
    end_status: str | None


# One base walk per table (the table itself is memoised by the library); notes and
# findings are attached per request to a shallow copy, so requests never share them.
_walks: weakref.WeakKeyDictionary[RunTable, tuple[NodeExtras, Walk]] = \
    weakref.WeakKeyDictionary()
_lock = threading.Lock()


def _base_walk(table: RunTable, extras: NodeExtras) -> Walk:
    with _lock:
        hit = _walks.get(table)
    if hit is not None and hit[0] is extras:
        return hit[1]
    event_of, names = node_events(table, extras)
    walk = Walk(table, event_of, names=names)
    with _lock:
        _walks[table] = (extras, walk)
    return walk


def _finding_nodes(ctx: ServerContext, rf: RunFile) -> frozenset[int]:
    if ctx.library.live(rf):
        return frozenset()  # findings of a growing run change with every batch
    from .findings import _findings_shared  # the panel's memoised computation

    found = _findings_shared(ctx, rf)["findings"]
    return frozenset(int(n) for f in found for n in (f.get("refs") or {}).get("nodes", []))


def _steps(ctx: ServerContext, rf: RunFile, start: int, count: int) -> dict[str, Any]:
    table = ctx.library.open_table(rf)
    base = _base_walk(table, ctx.extras(rf))
    walk = base.with_context(notes=run_notes(ctx, rf), finding_nodes=_finding_nodes(ctx, rf))
    return {"run": rf.id, "total": len(walk), "start": start,
            "steps": walk.steps(start, count),
            "incumbent_steps": walk.incumbent_steps(), "finding_steps": walk.finding_steps(),
            "note_steps": walk.note_steps(), "sense": table.sense,
            "end_status": None if table.end is None else table.end.get("status")}


@router.get("/{run_id}/steps", response_model=StepsOut, responses=errors(),
            summary="the run's processing steps narrated in plain words, a page at a time")
async def get_steps(run_id: str, ctx: Ctx,
                    start: Annotated[int, Query(ge=0, description="first step (0-based)")] = 0,
                    count: Annotated[int, Query(ge=1, le=MAX_STEPS,
                                                description="steps to return")] = 50,
                    ) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_steps, ctx, rf, start, count)
