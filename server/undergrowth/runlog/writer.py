"""Write a run log: JSON Lines, gzip-compressed when the file name ends in ``.gz``.

This module is imported by the search engine, so it depends on the standard
library only (no pydantic, no numpy). Events are plain dicts; the writer does
not validate them — the reader does that once, at the boundary.

Durability: lines are buffered and written in chunks, and everything written is
flushed to the operating system at least every ``flush_interval`` seconds (by
the next `write` or by a small background thread when the search is quiet) and
on `close`. A gzip stream is flushed with ``Z_SYNC_FLUSH``, so the bytes on disk
always decode to a prefix of the log: a killed process leaves a readable file
whose last line at worst is cut short, which the reader tolerates.
"""

from __future__ import annotations

import contextlib
import gzip
import json
import math
import os
import threading
import time
import weakref
import zlib
from types import TracebackType
from typing import Any

from .codes import FORMAT, VERSION

__all__ = ["RunLogWriter"]

_CHUNK_BYTES = 1 << 16  # buffered text written to the file in pieces of about this size


def _default(value: Any) -> Any:
    # numpy scalars and arrays (np.int64, np.float32, np.bool_, ndarray) without importing numpy
    tolist = getattr(value, "tolist", None)
    if tolist is not None:
        return tolist()
    raise TypeError(f"a run-log event cannot hold a {type(value).__name__}")


_encode = json.JSONEncoder(
    separators=(",", ":"),
    ensure_ascii=False,
    allow_nan=False,
    check_circular=False,
    default=_default,
).encode


def _finite(value: Any) -> Any:
    """A copy of ``value`` with every non-finite float replaced by None."""
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, dict):
        return {key: _finite(item) for key, item in value.items()}
    if isinstance(value, list | tuple):
        return [_finite(item) for item in value]
    if isinstance(value, str | bytes | int):
        return value
    tolist = getattr(value, "tolist", None)
    return _finite(tolist()) if tolist is not None else value


def encode_event(event: dict[str, Any]) -> str:
    """One compact JSON line (without the newline); ±inf and NaN become null."""
    try:
        return _encode(event)
    except ValueError:
        # Raised only for non-finite floats: the common case stays one C call.
        return _encode(_finite(event))


def _flush_periodically(
    ref: weakref.ref[RunLogWriter], stop: threading.Event, interval: float
) -> None:
    # Holds only a weak reference so an abandoned writer can still be collected.
    while not stop.wait(interval):
        writer = ref()
        if writer is None:
            return
        writer._flush_if_dirty()
        del writer


class RunLogWriter:
    """Append events to a run-log file.

    ``header`` is the contract's header without ``kind``/``format``/``version``
    (they are filled in; a ``format`` other than ``undergrowth-run`` is refused).
    The header line is written and flushed at once, so the file is readable as
    soon as the writer exists. Use as a context manager or call `close`.
    """

    def __init__(
        self,
        path: str | os.PathLike[str],
        header: dict[str, Any],
        *,
        flush_interval: float = 1.0,
        compresslevel: int = 6,
    ) -> None:
        if header.get("format", FORMAT) != FORMAT:
            raise ValueError(f"header format must be {FORMAT!r}, not {header['format']!r}")
        if flush_interval <= 0:
            raise ValueError(f"flush_interval must be positive, not {flush_interval}")
        self.path = os.fspath(path)
        self.flush_interval = float(flush_interval)
        self.lines_written = 0
        self._lock = threading.Lock()
        self._pending: list[str] = []
        self._pending_chars = 0
        self._dirty = False
        self._closed = False
        self._raw = open(self.path, "wb")  # noqa: SIM115 - closed in close()
        # mtime=0 keeps the gzip bytes reproducible for a reproducible search.
        self._gz = (
            gzip.GzipFile(fileobj=self._raw, mode="wb", compresslevel=compresslevel, mtime=0)
            if self.path.endswith(".gz")
            else None
        )
        self._out = self._gz if self._gz is not None else self._raw
        self._last_flush = time.monotonic()
        line = {"kind": "header", "format": FORMAT, "version": VERSION}
        line.update((k, v) for k, v in header.items() if k != "kind")
        self.write(line)
        self.flush()
        self._stop = threading.Event()
        self._thread = threading.Thread(
            target=_flush_periodically,
            args=(weakref.ref(self), self._stop, self.flush_interval),
            name="runlog-flush",
            daemon=True,
        )
        self._thread.start()

    # ---------------------------------------------------------------- writing
    def write(self, event: dict[str, Any]) -> None:
        """Append one event (a dict with a ``kind``) as one line."""
        line = encode_event(event) + "\n"
        with self._lock:
            if self._closed:
                raise ValueError(f"{self.path}: write to a closed run log")
            self._pending.append(line)
            self._pending_chars += len(line)
            self._dirty = True
            self.lines_written += 1
            if self._pending_chars >= _CHUNK_BYTES:
                self._drain()
            if time.monotonic() - self._last_flush >= self.flush_interval:
                self._flush_locked()

    def flush(self) -> None:
        """Hand everything written so far to the operating system."""
        with self._lock:
            if not self._closed:
                self._flush_locked()

    def close(self) -> None:
        """Flush and close the file; calling it again does nothing."""
        with self._lock:
            if self._closed:
                return
            self._closed = True
            try:
                self._drain()
                if self._gz is not None:
                    self._gz.close()  # writes the gzip trailer
            finally:
                self._raw.close()
        stop = getattr(self, "_stop", None)
        if stop is not None:
            stop.set()
            if self._thread is not threading.current_thread():
                self._thread.join()

    @property
    def closed(self) -> bool:
        return self._closed

    # ---------------------------------------------------------------- helpers
    def _drain(self) -> None:
        if self._pending:
            self._out.write("".join(self._pending).encode("utf-8"))
            self._pending.clear()
            self._pending_chars = 0

    def _flush_locked(self) -> None:
        self._drain()
        if self._gz is not None:
            self._gz.flush(zlib.Z_SYNC_FLUSH)  # also flushes the file underneath
        else:
            self._raw.flush()
        self._dirty = False
        self._last_flush = time.monotonic()

    def _flush_if_dirty(self) -> None:
        with self._lock:
            if self._dirty and not self._closed:
                self._flush_locked()

    def __enter__(self) -> RunLogWriter:
        return self

    def __exit__(
        self,
        exc_type: type[BaseException] | None,
        exc: BaseException | None,
        tb: TracebackType | None,
    ) -> None:
        self.close()

    def __del__(self) -> None:
        with contextlib.suppress(Exception):  # never raise from a finaliser
            self.close()
