"""The solve worker: runs in its own process, writes the run log, reports to the server.

Imports only the engine and the run-log writer (no FastAPI, no asyncio), so a
worker forked from the forkserver starts in milliseconds.

Messages on the pipe (worker -> server), each a tuple:

- ``("events", first, lines, stats)``: events ``first, first + 1, ...`` as the
  JSON text of their run-log lines; ``stats`` has ``nodes`` (processed so far)
  and, after a progress event, ``primal_bound``, ``dual_bound`` and ``gap``.
- ``("done", summary)``: the search ended and the log is closed.
- ``("error", message)``: the search could not start or failed; the log (if
  any) holds what was written.

The server asks the worker to stop through a shared event it polls between
nodes (``Search(should_stop=...)``).
"""

from __future__ import annotations

import signal
import threading
import time
from typing import Any

from ..model import read_model
from ..runlog.writer import RunLogWriter, encode_event
from ..search import Search, SearchSettings

__all__ = ["solve_main"]


class _Batcher:
    """Groups events for the pipe: a batch leaves when it is big or old enough, and a
    small thread sends a lingering batch while the search is busy in one relaxation."""

    def __init__(self, conn: Any, *, max_events: int, max_seconds: float) -> None:
        self.conn = conn
        self.max_events = max_events
        self.max_seconds = max_seconds
        self.sent = 0  # index of the first pending event
        self.stats: dict[str, Any] = {"nodes": 0}
        self._pending: list[str] = []
        self._since = 0.0
        self._lock = threading.Lock()
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._tick, name="solve-batcher", daemon=True)
        self._thread.start()

    def add(self, line: str, event: dict[str, Any]) -> None:
        with self._lock:
            if not self._pending:
                self._since = time.monotonic()
            self._pending.append(line)
            kind = event.get("kind")
            if kind == "node" and event.get("order") is not None:
                self.stats["nodes"] = event["order"] + 1
            elif kind == "progress":
                self.stats.update(nodes=event["nodes"], primal_bound=event["primal_bound"],
                                  dual_bound=event["dual_bound"], gap=event["gap"])
            if (len(self._pending) >= self.max_events
                    or time.monotonic() - self._since >= self.max_seconds):
                self._send_locked()

    def close(self) -> None:
        self._stop.set()
        self._thread.join()
        with self._lock:
            self._send_locked()

    def _send_locked(self) -> None:
        if self._pending:
            lines, self._pending = self._pending, []
            self.conn.send(("events", self.sent, lines, dict(self.stats)))
            self.sent += len(lines)

    def _tick(self) -> None:
        while not self._stop.wait(self.max_seconds):
            with self._lock:
                if self._pending and time.monotonic() - self._since >= self.max_seconds:
                    self._send_locked()


def solve_main(spec: dict[str, Any], conn: Any, stop: Any) -> None:
    """Process entry point. ``spec``: model_path, run_path, settings (SearchSettings
    keywords), batch_events, batch_seconds. ``stop``: a multiprocessing Event."""
    # Ctrl-C in the server's terminal reaches the whole process group; the server
    # stops its workers itself, cleanly, through ``stop``.
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    try:
        problem = read_model(spec["model_path"])
        settings = SearchSettings(**spec["settings"])
        search = Search(problem, settings, should_stop=stop.is_set)
    except Exception as exc:  # noqa: BLE001 - every reason goes back to the server
        conn.send(("error", f"the solve could not start: {exc}"))
        conn.close()
        return
    batcher = _Batcher(conn, max_events=int(spec.get("batch_events", 256)),
                       max_seconds=float(spec.get("batch_seconds", 0.05)))
    try:
        with RunLogWriter(spec["run_path"], search.header()) as writer:
            for event in search.events():
                writer.write(event)
                batcher.add(encode_event(event), event)
        batcher.close()
    except Exception as exc:  # noqa: BLE001
        batcher.close()
        conn.send(("error", f"the search failed: {type(exc).__name__}: {exc}"))
        conn.close()
        return
    result = search.result
    summary = result.summary() if result is not None else {}
    conn.send(("done", summary))
    conn.close()
