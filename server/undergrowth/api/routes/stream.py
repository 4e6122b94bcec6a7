"""The live stream of one run (Server-Sent Events; the protocol is in `sse.py`)."""

from __future__ import annotations

from typing import Annotated

from fastapi import APIRouter, Header, Query

from ..context import Ctx
from ..errors import ApiError, BadRequest, NotFound
from ..ids import check_id
from ..sse import EventStreamResponse, event_stream
from ..status import ACTIVE_STATES
from ._common import errors

router = APIRouter(prefix="/api/runs", tags=["stream"])

_SSE = {"text/event-stream": {"schema": {"type": "string"}}}


def _resume_point(header: str | None, query: int | None) -> int:
    """The last event the client has (-1: none). The header wins: browsers send it on
    their own when they reconnect."""
    if header is not None and header.strip():
        try:
            value = int(header.strip())
        except ValueError:
            raise BadRequest(f"Last-Event-ID must be an event index, not {header!r}",
                             code="bad-last-event-id") from None
        if value < -1:
            raise BadRequest("Last-Event-ID must be -1 or more", code="bad-last-event-id")
        return value
    return -1 if query is None else query


@router.get("/{run_id}/stream", response_model=None, responses={
    200: {"description": "event stream: batch, end and resync events (docs/api.md)",
          "content": _SSE}, **errors()},
            summary="the run's events as Server-Sent Events, resumable with Last-Event-ID")
async def stream_run(
    run_id: str,
    ctx: Ctx,
    last_event_id: Annotated[str | None, Header(
        alias="Last-Event-ID", description="resume after this event index")] = None,
    last_id: Annotated[int | None, Query(
        ge=-1, description="as Last-Event-ID, for a first connection that cannot set "
        "headers")] = None,
) -> EventStreamResponse:
    check_id(run_id)
    start = _resume_point(last_event_id, last_id)
    rf = ctx.library.find(run_id)
    job = ctx.jobs.get(run_id) if rf is None or rf.writable else None
    if rf is not None:
        path = rf.path
    elif job is not None and job.state in ACTIVE_STATES and job.file:
        path = ctx.runs_dir / job.file
    else:
        raise NotFound(f"no run {run_id!r}", detail={"id": run_id})
    live = ctx.bus.get(run_id) if job is not None else None

    def final_status() -> str | None:
        """How the run ended, for a stream that did not carry its end event (blocking)."""
        record = ctx.jobs.get(run_id) if job is not None else None
        if record is not None and record.state not in ACTIVE_STATES:
            return record.end_status or record.state
        if rf is None:
            return None if record is None else record.state
        try:
            return ctx.library.summary(rf)["end_status"]
        except ApiError:
            return None

    return EventStreamResponse(event_stream(
        path=path, live=live, last_id=start, interval=ctx.settings.stream_interval,
        viewer_buffer=ctx.settings.viewer_buffer_events, final_status=final_status))
