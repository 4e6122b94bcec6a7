"""Server-Sent Events for one run: batches of events with resumable ids.

Protocol (docs/api.md has the client's side)::

    retry: 2000

    id: 41
    event: batch
    data: [{"kind":"node",...}, ...]

    event: end
    data: {"status": "optimal", "last_id": 41}

A batch's ``id`` is the index of its last event in the run's event sequence
(event 0 is the first line after the header), so a client that reconnects
with ``Last-Event-ID: 41`` gets event 42 onwards: no gap, no repeat.

Where events come from: the run's file, then (for a live run) the live bus.
A viewer whose backlog on a live run grows more than ``viewer_buffer``
events beyond the smallest backlog it has had (a late joiner may catch up at
its own pace; one that reads slower than the search writes may not) gets
``event: resync`` (``data`` carries ``last_id``) and the stream ends;
reconnecting with that id catches up from the file at the client's pace.
Live batches go out at most every ``interval`` seconds; catching up from the
file goes as fast as the client reads.
"""

from __future__ import annotations

import json
import math
import time
from collections.abc import AsyncIterator, Callable
from pathlib import Path
from typing import Any

import anyio
from starlette.responses import StreamingResponse
from starlette.types import Receive, Scope, Send

from .bus import LiveRun
from .eventfile import EventFile

__all__ = ["EventStreamResponse", "event_stream", "sse_message"]

BATCH_EVENTS = 2000  # events per batch at most
KEEPALIVE = 15.0  # seconds of silence before a comment line keeps proxies from timing out
FILE_POLL = 0.25  # seconds between looks at a live run's file while it lags the bus


def sse_message(event: str, data: str, *, id: int | None = None) -> bytes:
    """One SSE message; ``data`` must be a single line (compact JSON is)."""
    head = f"id: {id}\n" if id is not None else ""
    return f"{head}event: {event}\ndata: {data}\n\n".encode()


def _batch(lines: list[str], last: int) -> bytes:
    return sse_message("batch", "[" + ",".join(lines) + "]", id=last)


def _end_status(lines: list[str]) -> str | None:
    """The status of an end event among the last lines of a batch, if there is one."""
    for line in reversed(lines[-8:]):  # the end is last, or followed by a few notes
        if '"end"' in line:
            try:
                event = json.loads(line)
            except ValueError:
                continue
            if isinstance(event, dict) and event.get("kind") == "end":
                return str(event.get("status"))
    return None


class EventStreamResponse(StreamingResponse):
    """A streaming response that always listens for the client leaving, whatever
    ASGI version the server speaks, and closes its generator when it does."""

    media_type = "text/event-stream"

    def __init__(self, content: AsyncIterator[bytes], status_code: int = 200,
                 headers: dict[str, str] | None = None, **kwargs: Any) -> None:
        headers = {"Cache-Control": "no-cache", "X-Accel-Buffering": "no", **(headers or {})}
        super().__init__(content, status_code=status_code, headers=headers, **kwargs)

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        try:
            async with anyio.create_task_group() as group:

                async def body() -> None:
                    await self.stream_response(send)
                    group.cancel_scope.cancel()

                group.start_soon(body)
                await self.listen_for_disconnect(receive)
                group.cancel_scope.cancel()  # the client left: stop producing
        finally:
            aclose = getattr(self.body_iterator, "aclose", None)
            if aclose is not None:
                with anyio.CancelScope(shield=True):
                    await aclose()


async def event_stream(
    *,
    path: Path,
    live: LiveRun | None,
    last_id: int,
    interval: float,
    viewer_buffer: int,
    final_status: Callable[[], str | None],
) -> AsyncIterator[bytes]:
    """The SSE body for one viewer of one run (see the module docstring)."""
    next_index = last_id + 1
    ended: str | None = None  # status of the end event, once it has gone out
    file: EventFile | None = None
    # The backlog this viewer may have: what it started with (catching up is fine)
    # plus `viewer_buffer`, shrinking as it catches up. A backlog that grows past it
    # means the viewer reads slower than the search writes: tell it to resync.
    allowed = math.inf
    last_sent = -math.inf
    if live is not None:
        live.viewers += 1
    try:
        yield b"retry: 2000\n\n"
        while True:
            if live is not None and not live.finished:
                behind = live.end - next_index
                allowed = min(allowed, max(behind, 0) + viewer_buffer)
                if behind > allowed:
                    yield sse_message("resync", json.dumps({
                        "last_id": next_index - 1, "behind": behind,
                        "reason": "this viewer fell behind the live search; reconnect with "
                                  "Last-Event-ID to catch up from the file"}))
                    return
            if live is not None and live.start <= next_index < live.end:
                behind = live.end - next_index
                if behind < BATCH_EVENTS:  # little to send: let a batch gather
                    wait = last_sent + interval - time.monotonic()
                    if wait > 0:
                        await anyio.sleep(wait)
                lines = live.read(next_index, BATCH_EVENTS)
                if not lines:  # evicted while we waited: the file has them
                    continue
                next_index += len(lines)
                last_sent = time.monotonic()
                ended = _end_status(lines) or ended
                yield _batch(lines, next_index - 1)
                continue
            if live is not None and next_index >= live.end:
                if live.finished:
                    break
                if not await live.wait(next_index, timeout=KEEPALIVE):
                    yield b": keep-alive\n\n"
                continue
            # Before the bus window (or no live run): the file has these events.
            if file is None:
                if not path.exists():
                    if live is None or live.finished:
                        break
                    await live.changed(timeout=FILE_POLL)  # queued: no file yet
                    continue
                file = EventFile(path)
            final = live is None or live.finished
            if file.index < next_index:  # a resume point, or back from the bus window
                await anyio.to_thread.run_sync(_skip, file, next_index, final)
                if file.index < next_index:  # the file does not hold that many (yet)
                    if live is None or live.finished:
                        break
                    await live.changed(timeout=FILE_POLL)
                    continue
            lines = await anyio.to_thread.run_sync(_read, file, final)
            if lines:
                next_index += len(lines)
                ended = _end_status(lines) or ended
                yield _batch(lines, next_index - 1)
                continue
            if live is None:
                break  # the whole file has been sent
            if live.finished and next_index < live.start:
                break  # the file ends before the bus window: those events were never written
            await live.changed(timeout=FILE_POLL)  # the writer flushes about every second
        status = ended or (live.status if live is not None and live.finished else None)
        if status is None:  # resumed after the end event, or a run without one
            status = await anyio.to_thread.run_sync(final_status)
        status = status or "incomplete"
        yield sse_message("end", json.dumps({"status": status, "last_id": next_index - 1}))
    finally:
        if live is not None:
            live.viewers -= 1
        if file is not None:
            file.close()


def _skip(file: EventFile, index: int, final: bool) -> None:
    file.skip_to(index, final=final)


def _read(file: EventFile, final: bool) -> list[str]:
    return file.read(BATCH_EVENTS, final=final)
