"""The live bus: recent events of each running solve, shared by all its viewers.

The job manager appends each batch the worker sends (JSON text, already
encoded) to the run's `LiveRun`; viewers keep a cursor into it and never copy
or block it. Only the newest ``capacity`` events are kept: a viewer that joins
late, or falls behind, reads the older events from the run's file, which the
worker writes in full. Everything here runs on the event loop thread.
"""

from __future__ import annotations

import asyncio
import bisect
import contextlib

__all__ = ["LiveBus", "LiveRun"]

_COMPACT = 1024  # drop evicted chunks from the lists in bulk, not one by one


class LiveRun:
    """Events ``start .. end - 1`` of one live run, in the chunks they arrived in."""

    def __init__(self, run_id: str, *, capacity: int) -> None:
        self.run_id = run_id
        self.capacity = capacity
        self.start = 0  # index of the oldest event held
        self.end = 0  # index the next event will get
        self.finished = False
        self.status: str | None = None  # the job's final state once finished
        self.viewers = 0
        self._firsts: list[int] = []
        self._chunks: list[list[str]] = []
        self._dropped = 0  # leading chunks already evicted
        self._held = 0
        self._changed = asyncio.Event()

    def append(self, first: int, lines: list[str]) -> None:
        """Events ``first, first + 1, ...``; repeats are ignored, a gap restarts the window."""
        if first > self.end:  # should not happen; the file still has everything
            self._firsts, self._chunks, self._dropped, self._held = [], [], 0, 0
            self.start = self.end = first
        if first < self.end:
            lines = lines[self.end - first:]
        if not lines:
            return
        self._firsts.append(self.end)
        self._chunks.append(lines)
        self.end += len(lines)
        self._held += len(lines)
        while self._held - len(self._chunks[self._dropped]) >= self.capacity:
            self._held -= len(self._chunks[self._dropped])
            self._chunks[self._dropped] = []
            self._dropped += 1
            self.start = self._firsts[self._dropped]
        if self._dropped >= _COMPACT:
            del self._firsts[: self._dropped], self._chunks[: self._dropped]
            self._dropped = 0
        self._notify()

    def read(self, index: int, max_events: int) -> list[str]:
        """Up to ``max_events`` events from ``index`` on ([] unless start <= index < end)."""
        if not self.start <= index < self.end:
            return []
        i = bisect.bisect_right(self._firsts, index, lo=self._dropped) - 1
        out: list[str] = []
        offset = index - self._firsts[i]
        while i < len(self._chunks) and len(out) < max_events:
            chunk = self._chunks[i]
            out.extend(chunk[offset: offset + max_events - len(out)])
            offset = 0
            i += 1
        return out

    def finish(self, status: str) -> None:
        self.finished = True
        self.status = status
        self._notify()

    async def wait(self, index: int, *, timeout: float | None = None) -> bool:
        """Wait until event ``index`` exists or the run finishes; False on timeout."""
        while self.end <= index and not self.finished:
            changed = self._changed
            try:
                await asyncio.wait_for(changed.wait(), timeout)
            except TimeoutError:
                return False
        return True

    async def changed(self, *, timeout: float) -> None:
        """Wait for the next append or finish, at most ``timeout`` seconds."""
        if self.finished:
            return
        with contextlib.suppress(TimeoutError):
            await asyncio.wait_for(self._changed.wait(), timeout)

    def _notify(self) -> None:
        changed, self._changed = self._changed, asyncio.Event()
        changed.set()


class LiveBus:
    """The `LiveRun` of each run that is queued or running."""

    def __init__(self, *, capacity: int) -> None:
        self.capacity = capacity
        self._runs: dict[str, LiveRun] = {}

    def open(self, run_id: str) -> LiveRun:
        live = self._runs.get(run_id)
        if live is None:
            live = self._runs[run_id] = LiveRun(run_id, capacity=self.capacity)
        return live

    def get(self, run_id: str) -> LiveRun | None:
        return self._runs.get(run_id)

    def close(self, run_id: str, status: str) -> None:
        """Finish the run; viewers already attached drain what is left, new ones read the file."""
        live = self._runs.pop(run_id, None)
        if live is not None:
            live.finish(status)

    def __contains__(self, run_id: str) -> bool:
        return run_id in self._runs
