"""Record your own branch-and-bound search as a run log Undergrowth can open.

    from undergrowth.record import Recorder

    with Recorder("run.jsonl.gz", model={"name": "routes", "sense": "max"}) as rec:
        rec.node(0, None, "branched", 41.5, branching={"var": 3, "value": 0.4})
        rec.node(1, 0, "integral", 40.0, branch={"var": 3, "dir": "down", "value": 0})
        rec.incumbent(40.0, node=1)
        ...

Each call is checked against the tree so far (a `ValueError` names what is
wrong: unknown parent, duplicate id, bad status, a parent that was not
branched). Time, processing order, depth, the relaxation record and progress
snapshots are filled in. On leaving the ``with`` block the end event is
written: its status follows from the tree, or is "cancelled" (Ctrl-C) or
"incomplete" (any other exception, whose text becomes the message).
"""

from __future__ import annotations

import os
import time as _time
from collections.abc import Callable
from datetime import UTC, datetime
from types import TracebackType
from typing import Any

from .. import __version__
from .tracker import TreeTracker
from .writer import RunLogWriter

__all__ = ["Recorder", "make_header"]

_MODEL_DEFAULTS: dict[str, Any] = {
    "name": "model",
    "rows": 0,  # 0 where the size is not known
    "columns": 0,
    "integers": 0,
    "binaries": 0,
    "nonzeros": 0,
    "sense": "min",
    "quadratic": False,
}
_SETTINGS_DEFAULTS: dict[str, Any] = {
    "branching": "custom",
    "select": "custom",
    "seed": 0,
    "node_limit": None,
    "time_limit": None,
    "gap": 0.0,
}


def make_header(
    model: dict[str, Any] | None = None,
    settings: dict[str, Any] | None = None,
    *,
    producer: str,
    started: str | None = None,
) -> dict[str, Any]:
    """A header with contract defaults filled in, validated (ValueError names the field)."""
    from .codes import FORMAT, VERSION
    from .schema import explain

    header = {
        "kind": "header",
        "format": FORMAT,
        "version": VERSION,
        "model": {**_MODEL_DEFAULTS, **(model or {})},
        "settings": {**_SETTINGS_DEFAULTS, **(settings or {})},
        "started": started or datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
        "producer": producer,
    }
    problem = explain(header)
    if problem is not None:
        raise ValueError(f"header field {problem[0]!r}: {problem[1]}")
    return header


class Recorder:
    """Write a run log for a search you run yourself. Use it as a context manager.

    ``progress_every`` (nodes) and ``progress_seconds`` control the automatic
    progress snapshots; 0 / None turns either off. ``clock`` returns seconds
    and is read for every event whose time you do not give.
    """

    def __init__(
        self,
        path: str | os.PathLike[str],
        *,
        model: dict[str, Any] | None = None,
        settings: dict[str, Any] | None = None,
        progress_every: int = 500,
        progress_seconds: float | None = 1.0,
        clock: Callable[[], float] = _time.perf_counter,
    ) -> None:
        header = make_header(model, settings, producer=f"undergrowth {__version__} recorder")
        self.path = os.fspath(path)
        self.header = header
        self._tracker = TreeTracker(
            sense=header["model"]["sense"], rule=str(header["settings"]["branching"])
        )
        self._clock = clock
        self._start = clock()
        self._progress_every = progress_every
        self._progress_seconds = progress_seconds
        self._since_progress = 0
        self._last_progress = self._start
        self._finished = False
        self._writer = RunLogWriter(self.path, header)

    # ---------------------------------------------------------------- recording
    def node(
        self,
        id: int,
        parent: int | None,
        status: str,
        bound: float | None,
        *,
        depth: int | None = None,
        branch: dict[str, Any] | tuple[int, str, float] | None = None,
        lp_objective: float | None = None,
        iterations: int = 0,
        fractional: int = 0,
        branching: dict[str, Any] | None = None,
        lp_status: str | None = None,
        lp_seconds: float = 0.0,
        order: int | None = None,
        time: float | None = None,
        message: str | None = None,
        **extra: Any,
    ) -> dict[str, Any]:
        """Record one node (when processed, discarded or left open); returns its event.

        ``branch`` is the bound change that created the node: ``{"var", "dir"
        ("down"/"up"), "value", optional "name"}`` or a ``(var, dir, value)``
        tuple. ``branching`` (branched nodes only) is the decision taken here:
        ``{"var", "value", optional "name", "score", "rule", "down_bound",
        "up_bound", "runner_up"}``. Extra keyword arguments are stored as extra
        fields of the event.
        """
        self._check_open()
        event = self._tracker.node(
            id,
            parent,
            status,
            bound,
            time=self._now() if time is None else time,
            depth=depth,
            order=order,
            branch=branch,
            lp_objective=lp_objective,
            lp_status=lp_status,
            iterations=iterations,
            lp_seconds=lp_seconds,
            fractional=fractional,
            branching=branching,
            message=message,
            extra=extra,
        )
        self._writer.write(event)
        self._since_progress += 1
        if self._progress_due():
            self.progress()
        return event

    def incumbent(
        self,
        objective: float,
        node: int | None = None,
        source: str | None = None,
        *,
        time: float | None = None,
    ) -> bool:
        """Record a solution; returns False (and writes nothing) if it does not improve.

        ``source`` is one of integral, rounding, start or external; it defaults
        to "integral" when ``node`` is given and "external" (your own
        heuristic) otherwise.
        """
        self._check_open()
        event = self._tracker.incumbent(
            objective, node=node, source=source, time=self._now() if time is None else time
        )
        if event is None:
            return False
        self._writer.write(event)
        return True

    def progress(self, *, time: float | None = None, **figures: Any) -> dict[str, Any]:
        """Write a progress snapshot now; figures you pass (e.g. ``dual_bound``) win."""
        self._check_open()
        event = self._tracker.progress(time=self._now() if time is None else time, **figures)
        self._writer.write(event)
        self._since_progress = 0
        self._last_progress = self._clock()
        return event

    def finish(
        self,
        status: str | None = None,
        *,
        message: str | None = None,
        solution: dict[str, float] | None = None,
        time: float | None = None,
    ) -> dict[str, Any]:
        """Write the final progress snapshot and the end event, then close the file."""
        self._check_open()
        try:
            end_time = max(self._now() if time is None else time, self._tracker.last_time)
            self._writer.write(self._tracker.progress(time=end_time))
            event = self._tracker.end(
                time=end_time, status=status, message=message, solution=solution
            )
            self._writer.write(event)
        finally:
            self._finished = True
            self._writer.close()
        return event

    def close(self) -> None:
        """Finish with the status the tree shows, unless already finished."""
        if not self._finished:
            self.finish()

    # ---------------------------------------------------------------- helpers
    @property
    def best(self) -> float | None:
        """The incumbent objective so far."""
        return self._tracker.best

    @property
    def open(self) -> int:
        """Nodes created but not yet recorded as closed."""
        return self._tracker.open

    def _now(self) -> float:
        return max(0.0, self._clock() - self._start)

    def _check_open(self) -> None:
        if self._finished:
            raise ValueError(f"{self.path}: the recording is finished")

    def _progress_due(self) -> bool:
        if self._progress_every and self._since_progress >= self._progress_every:
            return True
        return (
            self._progress_seconds is not None
            and self._clock() - self._last_progress >= self._progress_seconds
        )

    def __enter__(self) -> Recorder:
        return self

    def __exit__(
        self,
        exc_type: type[BaseException] | None,
        exc: BaseException | None,
        tb: TracebackType | None,
    ) -> None:
        if self._finished:
            return
        if exc_type is None:
            self.finish()
            return
        status = "cancelled" if issubclass(exc_type, KeyboardInterrupt) else "incomplete"
        try:
            self.finish(status, message=f"{exc_type.__name__}: {exc}")
        except Exception:  # noqa: BLE001 - the original exception matters more
            self._writer.close()
