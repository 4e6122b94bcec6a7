"""The job manager: solves in worker processes, a queue, caps, cancel, crash records.

- At most ``max_running`` workers at once; further solves wait in a FIFO queue
  (at most ``max_queued``; more are refused with 503).
- Workers start through the ``forkserver`` (or ``spawn``) method, never by
  forking the server itself; each is watched by one thread that reads its
  pipe and hands messages to the event loop, so nothing here blocks the loop.
- The worker writes the run log; the server writes the status sidecar
  (`status.py`) on every change of state, so a worker that dies leaves a
  readable log and a record saying why it stopped.
- Cancel sets the worker's stop event; the search stops after the current
  node and closes its log. A worker that ignores it for ``grace`` seconds (one
  relaxation that will not end) is terminated. The same happens at the time
  limit plus ``grace``.
- On start, sidecars still saying queued or running belong to a server that
  stopped: they become ``interrupted``.
"""

from __future__ import annotations

import asyncio
import contextlib
import logging
import math
import multiprocessing
import signal
import threading
from collections import deque
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .bus import LiveBus
from .errors import Busy, Conflict, NotFound
from .status import (
    ACTIVE_STATES,
    STATUS_SUFFIX,
    JobRecord,
    now_iso,
    read_status,
    status_path,
    write_status,
)

__all__ = ["JobManager"]

log = logging.getLogger("undergrowth.api")

GRACE = 5.0  # seconds a worker gets to stop by itself before it is terminated
_PRELOAD = ["undergrowth.api._worker"]  # what the forkserver imports once for all workers


def _finite(value: Any) -> Any:
    return value if not isinstance(value, float) or math.isfinite(value) else None


@dataclass(eq=False)
class _Running:
    record: JobRecord
    spec: dict[str, Any]
    stop: Any  # multiprocessing Event
    process: Any = None
    done: dict[str, Any] | None = None
    error: str | None = None
    cancel_requested: bool = False
    forced: bool = False
    timers: list[asyncio.TimerHandle] = field(default_factory=list)


class JobManager:
    """Owns every solve of one runs directory (one server per directory)."""

    def __init__(self, *, runs_dir: Path, bus: LiveBus, max_running: int, max_queued: int,
                 start_method: str = "forkserver", read_only: bool = False,
                 grace: float = GRACE) -> None:
        self.runs_dir = runs_dir
        self.bus = bus
        self.max_running = max_running
        self.max_queued = max_queued
        self.read_only = read_only
        self.grace = grace
        self._ctx = multiprocessing.get_context(start_method)
        if start_method == "forkserver":
            self._ctx.set_forkserver_preload(_PRELOAD)
        self.records: dict[str, JobRecord] = {}
        self._queue: deque[str] = deque()
        self._specs: dict[str, dict[str, Any]] = {}
        self._running: dict[str, _Running] = {}
        self._ended: dict[str, asyncio.Event] = {}
        self._loop: asyncio.AbstractEventLoop | None = None
        self._closing = False
        self._load()

    def warm_up(self) -> None:
        """Start the forkserver (it imports the engine once) in the background, so the
        first solve does not wait for it. Does nothing for 'spawn'."""
        if self._ctx.get_start_method() != "forkserver":
            return

        def start() -> None:
            from multiprocessing import forkserver

            with contextlib.suppress(Exception):  # a failure shows again at the first solve
                forkserver.ensure_running()

        threading.Thread(target=start, name="forkserver-warm-up", daemon=True).start()

    # ---------------------------------------------------------------- records
    def _load(self) -> None:
        if not self.runs_dir.is_dir():
            return
        for path in sorted(self.runs_dir.glob("*" + STATUS_SUFFIX)):
            record = read_status(path)
            if record is None or path.name != record.run_id + STATUS_SUFFIX:
                continue
            if record.state in ACTIVE_STATES:
                was = record.state
                record.state = "interrupted"
                record.reason = (f"the server stopped while this solve was {was}; the run "
                                 "log keeps what was written before")
                record.finished = record.finished or now_iso()
                if not self.read_only:
                    with contextlib.suppress(OSError):
                        write_status(path, record)
            self.records[record.run_id] = record

    def _save(self, record: JobRecord) -> None:
        try:
            write_status(status_path(self.runs_dir, record.run_id), record)
        except OSError as exc:  # the record in memory still holds; say so once
            log.warning("cannot write the status of %s: %s", record.run_id, exc)

    def get(self, run_id: str) -> JobRecord | None:
        return self.records.get(run_id)

    def list(self) -> list[JobRecord]:
        return sorted(self.records.values(), key=lambda r: r.created, reverse=True)

    def is_active(self, run_id: str) -> bool:
        record = self.records.get(run_id)
        return record is not None and record.state in ACTIVE_STATES

    def forget(self, run_id: str) -> None:
        """Drop a finished job's record (its run was deleted)."""
        if not self.is_active(run_id):
            self.records.pop(run_id, None)
            with contextlib.suppress(OSError):
                status_path(self.runs_dir, run_id).unlink()

    # ---------------------------------------------------------------- submit
    def room(self) -> int:
        """How many more solves `submit` would accept now (free slots plus queue places),
        so a group of solves can be refused as a whole instead of half started."""
        if self._closing:
            return 0
        free = max(0, self.max_running - len(self._running))
        return free + max(0, self.max_queued - len(self._queue))

    async def submit(self, record: JobRecord, spec: dict[str, Any]) -> JobRecord:
        """Queue a solve (``record.run_id`` must be fresh) and start it if a slot is free."""
        self._loop = asyncio.get_running_loop()
        if self._closing:
            raise Busy("the server is shutting down")
        if len(self._running) >= self.max_running and len(self._queue) >= self.max_queued:
            raise Busy(f"{len(self._running)} solve(s) running and {len(self._queue)} queued, "
                       "the most this server allows; try again when one finishes",
                       code="queue-full")
        self.records[record.run_id] = record
        self._specs[record.run_id] = spec
        self._ended[record.run_id] = asyncio.Event()
        self._save(record)
        self.bus.open(record.run_id)
        self._queue.append(record.run_id)
        self._pump()
        return record

    def _pump(self) -> None:
        while self._queue and len(self._running) < self.max_running and not self._closing:
            run_id = self._queue.popleft()
            self._start(self.records[run_id], self._specs.pop(run_id))

    def _start(self, record: JobRecord, spec: dict[str, Any]) -> None:
        run = _Running(record=record, spec=spec, stop=self._ctx.Event())
        self._running[record.run_id] = run
        record.state = "running"
        record.started = now_iso()
        self._save(record)
        assert self._loop is not None
        limit = spec["settings"].get("time_limit")
        if limit is not None:
            run.timers.append(self._loop.call_later(limit + self.grace, self._overtime, run))
        threading.Thread(target=self._watch, args=(run,), daemon=True,
                         name=f"watch-{record.run_id}").start()

    # ---------------------------------------------------------------- the watcher thread
    def _post(self, callback: Any, *args: Any) -> None:
        loop = self._loop
        if loop is None:
            return
        with contextlib.suppress(RuntimeError):  # the loop has closed: nobody to tell
            loop.call_soon_threadsafe(callback, *args)

    def _watch(self, run: _Running) -> None:
        receive, send = self._ctx.Pipe(duplex=False)
        try:
            process = self._ctx.Process(
                target=_entry(), args=(run.spec, send, run.stop), daemon=True,
                name=f"undergrowth-solve-{run.record.run_id}")
            process.start()
        except Exception as exc:  # noqa: BLE001 - reported as the job's failure
            send.close()
            receive.close()
            self._post(self._on_exit, run, None, f"could not start a worker process: {exc}")
            return
        send.close()  # the worker holds the other end: EOF here means it has gone
        run.process = process
        self._post(self._on_started, run, process.pid)
        while True:
            try:
                message = receive.recv()
            except (EOFError, OSError):
                break
            except Exception as exc:  # noqa: BLE001 - a garbled message: stop listening
                log.warning("bad message from the worker of %s: %s", run.record.run_id, exc)
                break
            self._post(self._on_message, run, message)
        receive.close()
        process.join()
        self._post(self._on_exit, run, process.exitcode, None)

    # ---------------------------------------------------------------- on the loop
    def _on_started(self, run: _Running, pid: int) -> None:
        run.record.pid = pid
        self._save(run.record)
        if run.cancel_requested:
            run.stop.set()

    def _on_message(self, run: _Running, message: tuple[Any, ...]) -> None:
        kind = message[0]
        record = run.record
        if kind == "events":
            _, first, lines, stats = message
            live = self.bus.get(record.run_id)
            if live is not None:
                live.append(first, lines)
            record.nodes = int(stats.get("nodes", record.nodes))
            for key in ("dual_bound", "gap"):
                if key in stats:
                    setattr(record, key, _finite(stats[key]))
            if "primal_bound" in stats:
                record.objective = _finite(stats["primal_bound"])
        elif kind == "done":
            run.done = message[1]
        elif kind == "error":
            run.error = str(message[1])

    def _on_exit(self, run: _Running, exitcode: int | None, start_error: str | None) -> None:
        record = run.record
        for timer in run.timers:
            timer.cancel()
        if run.done is not None:
            summary = run.done
            record.end_status = summary.get("status")
            record.nodes = int(summary.get("nodes", record.nodes))
            record.objective = _finite(summary.get("objective"))
            record.dual_bound = _finite(summary.get("dual_bound"))
            record.gap = _finite(summary.get("gap"))
            if self._closing and run.cancel_requested:
                record.state = "interrupted"
                record.reason = "the server shut down; the search was stopped cleanly"
            elif run.cancel_requested or record.end_status == "cancelled":
                record.state = "cancelled"
            else:
                record.state = "finished"
        elif run.error is not None or start_error is not None:
            record.state = "failed"
            record.reason = run.error or start_error
        elif run.cancel_requested:
            record.state = "interrupted" if self._closing else "cancelled"
            record.reason = (f"the worker did not stop within {self.grace:g} s of the request "
                             f"and was terminated after {record.nodes} nodes; the run log "
                             "keeps what was written before")
        else:
            record.state = "failed"
            record.reason = _exit_reason(exitcode, record.nodes)
        record.finished = now_iso()
        self._save(record)
        self._running.pop(record.run_id, None)
        self.bus.close(record.run_id, record.state)
        ended = self._ended.pop(record.run_id, None)
        if ended is not None:
            ended.set()
        self._pump()

    def _overtime(self, run: _Running) -> None:
        if run.record.state == "running":
            run.record.reason = "stopped by the server: past its time limit"
            self._request_stop(run)

    def _request_stop(self, run: _Running) -> None:
        run.cancel_requested = True
        run.stop.set()
        assert self._loop is not None
        run.timers.append(self._loop.call_later(self.grace, self._force, run))

    def _force(self, run: _Running) -> None:
        if run.process is not None and run.record.state == "running":
            run.forced = True
            with contextlib.suppress(Exception):
                run.process.terminate()

    # ---------------------------------------------------------------- cancel, wait, close
    async def cancel(self, run_id: str) -> JobRecord:
        record = self.records.get(run_id)
        if record is None:
            raise NotFound(f"no solve {run_id!r}")
        if record.state == "queued":
            with contextlib.suppress(ValueError):
                self._queue.remove(run_id)
            self._specs.pop(run_id, None)
            record.state = "cancelled"
            record.reason = "cancelled before it started; no run log was written"
            record.finished = now_iso()
            self._save(record)
            self.bus.close(run_id, record.state)
            ended = self._ended.pop(run_id, None)
            if ended is not None:
                ended.set()
            return record
        run = self._running.get(run_id)
        if run is None:
            raise Conflict(f"solve {run_id!r} is already {record.state}",
                           detail={"state": record.state})
        if not run.cancel_requested:
            self._request_stop(run)
        return record

    async def wait(self, run_id: str, *, timeout: float | None = None) -> JobRecord:
        """Wait until the job is no longer queued or running."""
        ended = self._ended.get(run_id)
        if ended is not None:
            await asyncio.wait_for(ended.wait(), timeout)
        record = self.records.get(run_id)
        if record is None:
            raise NotFound(f"no solve {run_id!r}")
        return record

    async def close(self, *, timeout: float = 3.0) -> None:
        """Stop everything: queued jobs become interrupted, running ones are asked to
        stop and terminated if they do not within ``timeout`` seconds."""
        self._closing = True
        for run_id in list(self._queue):
            record = self.records[run_id]
            record.state = "interrupted"
            record.reason = "the server shut down before this solve started"
            record.finished = now_iso()
            self._save(record)
            self.bus.close(run_id, record.state)
            ended = self._ended.pop(run_id, None)
            if ended is not None:
                ended.set()
        self._queue.clear()
        running = list(self._running.values())
        for run in running:
            run.cancel_requested = True
            run.stop.set()
        waits = [self._ended[r.record.run_id].wait() for r in running
                 if r.record.run_id in self._ended]
        if waits:
            _, pending = await asyncio.wait([asyncio.ensure_future(w) for w in waits],
                                            timeout=timeout)
            if pending:
                for run in running:
                    if run.process is not None:
                        with contextlib.suppress(Exception):
                            run.process.kill()
                await asyncio.wait(pending, timeout=timeout)


def _entry() -> Any:
    # Imported here so the server process does not load the engine until a solve starts.
    from ._worker import solve_main

    return solve_main


def _exit_reason(exitcode: int | None, nodes: int) -> str:
    if exitcode is not None and exitcode < 0:
        try:
            name = signal.Signals(-exitcode).name
        except ValueError:
            name = f"signal {-exitcode}"
        how = f"was killed by {name}"
    elif exitcode is None:
        how = "vanished"
    else:
        how = f"exited with status {exitcode} without finishing"
    return (f"the worker process {how} after {nodes} nodes; the run log keeps what was "
            "written before")
